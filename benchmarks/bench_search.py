"""Benchmark of the Racah-move search: random pairs and structured families.

Run ``python3 benchmarks/bench_search.py`` (a few minutes) or with ``--smoke`` (a few
seconds).  Seeded; machine-independent figures (counts, ratios) come first, absolute
times last.
"""

from __future__ import annotations

import argparse
import random
import statistics
import time

from recouple.recoupling.search import (
    SearchResult,
    _heuristic,
    lower_bound,
    shortest_path,
)


def random_tree(n: int, rng: random.Random) -> frozenset[int]:
    """Uniform random tree: insert leaf k above a uniformly chosen node (common practice)."""
    parent: dict[int, int | None] = {0: None}
    kids: dict[int, list[int]] = {}
    root, nxt = 0, n
    for k in range(1, n):
        v = rng.choice(sorted(parent))
        w, nxt = nxt, nxt + 1
        p = parent[v]
        parent[w], parent[v], parent[k] = p, w, w
        kids[w] = [v, k]
        if p is None:
            root = w
        else:
            kids[p] = [w if c == v else c for c in kids[p]]
    out: set[int] = set()
    masks: dict[int, int] = {}
    order = [root]
    for u in order:
        order.extend(kids.get(u, []))
    for u in reversed(order):
        masks[u] = 1 << u if u < n else masks[kids[u][0]] | masks[kids[u][1]]
        if u != root and u >= n:
            out.add(masks[u])
    return frozenset(out)


def jj_to_ls(k: int) -> tuple[frozenset[int], frozenset[int], int]:
    """((l1 s1)j1 ((l2 s2)j2 ...))J -> ((l1 (l2 ...))L (s1 (s2 ...))S)J; l_i = 2i, s_i = 2i+1."""
    n = 2 * k
    source = {0b11 << (2 * i) for i in range(k)}
    tail = 0
    for i in range(k - 1, 0, -1):  # right-nested chain of the pairs
        tail |= 0b11 << (2 * i)
        if i < k - 1:
            source.add(tail)
    ls = [sum(1 << (2 * j + side) for j in range(i, k)) for side in (0, 1) for i in range(k - 1)]
    target = set(ls) | {
        sum(1 << (2 * j) for j in range(k)),
        sum(1 << (2 * j + 1) for j in range(k)),
    }
    return frozenset(source), frozenset(target), n


def literal_reversal(n: int) -> tuple[frozenset[int], frozenset[int], int]:
    """((((j1 j2) j3) ...) jn) -> (jn (... (j3 (j2 j1)))): the same clusters, only
    exchanges (phases), so 0 Racah moves."""
    source = frozenset((1 << (k + 1)) - 1 for k in range(1, n - 1))
    return source, source, n


def reversal(n: int) -> tuple[frozenset[int], frozenset[int], int]:
    """Left chain ((((j1 j2) j3) ...) jn) -> right chain (j1 (j2 (... (j(n-1) jn)))): the
    clusters {j1..jk} become {jk..jn}, k = 2..n-1."""
    source = frozenset((1 << (k + 1)) - 1 for k in range(1, n - 1))
    root = (1 << n) - 1
    target = frozenset(root & ~((1 << k) - 1) for k in range(1, n - 1))
    return source, target, n


def fmt(x: float) -> str:
    return f"{x:.3g}"


def run_random(
    sizes: list[int], pairs: int, seed: int, compare: bool
) -> list[tuple[int, list[float]]]:
    print(f"Random pairs (uniform trees, seed {seed})")
    head = (
        "  n  pairs  proven  mean(steps/lb)  mean(steps-lb)  heur/opt  expanded(med,max)"
        "  peak open  peak closed"
    )
    print(head)
    times: list[tuple[int, list[float]]] = []
    for n in sizes:
        rng = random.Random(seed + n)
        rs: list[SearchResult] = []
        ts: list[float] = []
        ratios: list[float] = []
        for _ in range(pairs):
            s, t = random_tree(n, rng), random_tree(n, rng)
            t0 = time.perf_counter()
            r = shortest_path(s, t, n)
            ts.append(time.perf_counter() - t0)
            rs.append(r)
            if compare and r.optimal and r.steps:
                h = _heuristic(s, t, n)
                ratios.append((len(h) - 1) / r.steps)
        proven = sum(r.optimal for r in rs)
        static = [max(lower_bound(r.path[0], r.path[-1], n), 1) for r in rs]
        ratio = statistics.mean(r.steps / lb for r, lb in zip(rs, static, strict=True))
        gap = statistics.mean(r.steps - r.lower_bound for r in rs)
        ex = [r.expanded for r in rs]
        hr = fmt(statistics.mean(ratios)) if ratios else "-"
        print(
            f"{n:3d} {pairs:6d} {proven:5d}/{pairs:<3d} {fmt(ratio):>10} {fmt(gap):>15} {hr:>9}"
            f" {statistics.median(ex):>9.0f},{max(ex):<8d} {max(r.peak_open for r in rs):9d}"
            f" {max(r.peak_closed for r in rs):11d}"
        )
        times.append((n, ts))
    return times


def run_family(
    name: str, cases: list[tuple[frozenset[int], frozenset[int], int]]
) -> list[tuple[int, float]]:
    print(f"\n{name}")
    print("  n  steps  static lb  proven  sums  method")
    times = []
    for s, t, n in cases:
        t0 = time.perf_counter()
        r = shortest_path(s, t, n)
        times.append((n, time.perf_counter() - t0))
        print(
            f"{n:3d} {r.steps:6d} {lower_bound(s, t, n):10d} {str(r.optimal):>7}"
            f" {r.sums:5d}  {r.method}"
        )
    return times


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--smoke", action="store_true", help="a few seconds in total")
    args = ap.parse_args()
    if args.smoke:
        exact_sizes, exact_pairs, big_sizes, big_pairs = [4, 8], 5, [30], 2
        ks, chain = range(2, 4), range(4, 8)
    else:
        exact_sizes, exact_pairs, big_sizes, big_pairs = [4, 8, 12, 16], 6, [30, 60, 100], 3
        ks, chain = range(2, 9), range(4, 17)
    times = run_random(exact_sizes, exact_pairs, 2024, compare=True)
    times += run_random(big_sizes, big_pairs, 2025, compare=False)
    ftimes = run_family("jj -> LS, k particles (n = 2k)", [jj_to_ls(k) for k in ks])
    ftimes += run_family(
        "chain reversal, literal (same clusters)", [literal_reversal(n) for n in chain]
    )
    ftimes += run_family("left chain -> right chain", [reversal(n) for n in chain])
    print("\nTimes (s)")
    for n, ts in times:
        print(f"  random n={n:3d}: median {fmt(statistics.median(ts))}, worst {fmt(max(ts))}")
    for n, t in ftimes:
        print(f"  family n={n:3d}: {fmt(t)}")


if __name__ == "__main__":
    main()
