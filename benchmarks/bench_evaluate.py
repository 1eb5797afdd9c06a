"""Derived formulas: deriving them (search + formula), their memory, and evaluating them.

* derivation: ``derive()`` on seeded random pairs of schemes (n leaves) and on two
  structured families, with the search's own time beside the full time (the rest
  is walking the path and simplifying the formula);
* memory: the search's peak open/closed sets, and the tracemalloc peak of one
  16-leaf derivation;
* evaluation: a derived formula evaluated exactly against the referee (direct
  Clebsch-Gordan projection, recouple.referee) at n = 4..7 equal spins.

Random trees and the structured families are bench_search.py's (uniform random
trees, seeded; jj -> LS of k particles; left chain -> right chain), turned into
scheme text; the search owner's own figures are in that script's section, these
time the whole ``derive``.
"""

from __future__ import annotations

import random
import sys
import tracemalloc

from _common import (
    VERDICTS,
    clear_all_caches,
    fmt_ratio,
    fmt_time,
    heading,
    leaf_names,
    median,
    random_scheme,
    scheme_text,
    table,
    timed,
    warm_up,
)
from bench_search import jj_to_ls, random_tree, reversal

from recouple.numbers.spins import coupled_range
from recouple.recoupling.derive import Derivation, derive
from recouple.recoupling.evaluate import evaluate
from recouple.recoupling.search import SearchResult, shortest_path
from recouple.referee.projection import EXACT_LIMIT, project
from recouple.schemes.tree import Coupling

# (n, pairs in a full run, pairs in a smoke run)
RANDOM_SIZES = [
    (4, 20, 5),
    (8, 20, 3),
    (12, 10, 0),
    (16, 5, 0),
    (30, 3, 1),
    (60, 2, 0),
    (100, 2, 0),
]


def _search_only(d: Derivation) -> tuple[float, SearchResult]:
    """Time the search alone on the pair ``d`` was derived from (derive's own masks)."""
    leaves = d.source.leaves()
    bit = {leaf: 1 << i for i, leaf in enumerate(leaves)}
    full = (1 << len(leaves)) - 1

    def masks(scheme_clusters: dict[frozenset[str], str]) -> frozenset[int]:
        out = (sum(bit[x] for x in c) for c in scheme_clusters)
        return frozenset(m for m in out if m != full)

    a, b = masks(d.source.clusters()), masks(d.target.clusters())
    return timed(lambda: shortest_path(a, b, len(leaves)))


def derivation_section(smoke: bool) -> None:
    heading("derive(): search + formula, random pairs (seeded)")
    rows = []
    for n, full_count, smoke_count in RANDOM_SIZES:
        count = smoke_count if smoke else full_count
        if not count:
            continue
        rng = random.Random(1000 + n)
        times, search_times, excess, expanded, opt = [], [], [], [], 0
        peak_open = peak_closed = 0
        for _ in range(count):
            a = scheme_text(random_tree(n, rng), n)
            b = scheme_text(random_tree(n, rng), n)
            t, d = timed(lambda a=a, b=b: derive(a, b))
            ts, _ = _search_only(d)
            times.append(t)
            search_times.append(ts)
            excess.append(d.steps - d.lower_bound)
            expanded.append(d.search.expanded)
            opt += d.optimal
            peak_open = max(peak_open, d.search.peak_open)
            peak_closed = max(peak_closed, d.search.peak_closed)
        rows.append(
            (
                n,
                count,
                f"{opt}/{count}",
                f"{median(excess):g} / {max(excess)}",
                f"{median(expanded):g} / {max(expanded)}",
                f"{peak_open} / {peak_closed}",
                fmt_time(median(search_times)),
                fmt_time(median(times)),
                fmt_time(max(times)),
            )
        )
        med = median(times)
        if n <= 12:
            VERDICTS.check(
                f"derive n = {n}: every random pair proven optimal",
                opt == count,
                f"{opt}/{count}",
                "all",
            )
            VERDICTS.check(f"derive n = {n}: median time", med < 0.1, fmt_time(med), "< 100 ms")
        elif n == 16:
            VERDICTS.check(f"derive n = {n}: median time", med < 2.0, fmt_time(med), "< 2 s")
        elif n == 100:
            worst = max(times)
            VERDICTS.check(
                f"derive n = {n} (heuristic): worst time", worst < 5.0, fmt_time(worst), "< 5 s"
            )
    table(
        (
            "n",
            "pairs",
            "proven optimal",
            "steps - bound (med / max)",
            "expanded (med / max)",
            "peak open / closed",
            "search (med)",
            "derive (med)",
            "derive (worst)",
        ),
        rows,
    )
    _families(smoke)


def _families(smoke: bool) -> None:
    heading("derive(): structured families")
    rows = []
    ks = [2, 3] if smoke else list(range(2, 9))
    for k in ks:
        source, target, n = jj_to_ls(k)
        names = [f"{x}{i + 1}" for i in range(k) for x in ("l", "s")]  # l_i = 2i, s_i = 2i+1
        jj, ls = scheme_text(source, n, names), scheme_text(target, n, names)
        t, d = timed(lambda jj=jj, ls=ls: derive(jj, ls))
        rows.append(_family_row(f"jj -> LS, k = {k}", 2 * k, t, d))
    ns = [4, 6] if smoke else list(range(4, 17, 2))
    for n in ns:
        source, target, _ = reversal(n)
        src, dst = scheme_text(source, n), scheme_text(target, n)
        t, d = timed(lambda src=src, dst=dst: derive(src, dst))
        rows.append(_family_row(f"left chain -> right chain, n = {n}", n, t, d))
    table(
        ("family", "leaves", "steps", "bound", "optimal", "expanded", "sums", "6j / 9j", "derive"),
        rows,
    )


def _family_row(name: str, n: int, t: float, d: Derivation) -> tuple[object, ...]:
    c = d.formula.counts()
    return (
        name,
        n,
        d.steps,
        d.lower_bound,
        "yes" if d.optimal else "no",
        d.search.expanded,
        c["sums"],
        f"{c['6j']} / {c['9j']}",
        fmt_time(t),
    )


def memory_section(smoke: bool) -> None:
    heading("memory of the search")
    n = 10 if smoke else 16
    rng = random.Random(2000 + n)
    a = scheme_text(random_tree(n, rng), n)
    b = scheme_text(random_tree(n, rng), n)
    tracemalloc.start()
    d = derive(a, b)
    _, peak = tracemalloc.get_traced_memory()
    tracemalloc.stop()
    s = d.search
    table(
        ("leaves", "method", "expanded", "peak open", "peak closed", "tracemalloc peak"),
        [(n, s.method, s.expanded, s.peak_open, s.peak_closed, f"{peak / 2**20:.1f} MiB")],
    )
    VERDICTS.report(f"tracemalloc peak of one {n}-leaf derivation", f"{peak / 2**20:.1f} MiB")


def evaluation_section(smoke: bool) -> None:
    heading("evaluation of derived formulas against direct projection (referee)")
    rows = []
    cases = [(n, j) for j in ("3/2", "5/2") for n in (4, 5, 6, 7)]
    if smoke:
        cases = [(4, "3/2"), (5, "3/2")]
    for n, j in cases:
        rng = random.Random(3000 + n)
        leaves = leaf_names(n)
        d, values = _nonzero_case(rng, leaves, j)
        clear_all_caches()
        t_cold, value = timed(lambda d=d, values=values: evaluate(d.formula, values))
        t_warm, _ = timed(lambda d=d, values=values: evaluate(d.formula, values))
        dim = (int(2 * _half(j)) + 1) ** n
        exact = dim <= EXACT_LIMIT
        t_ref, ref = timed(lambda d=d, values=values: project(d.source, d.target, values))
        if exact:
            assert value == ref, (n, j, values)  # reference: recouple.referee (CG projection)
        else:
            assert abs(float(value) - float(ref)) < 1e-10, (n, j, values)
        c = d.formula.counts()
        rows.append(
            (
                n,
                j,
                f"{c['sums']} / {c['6j']} / {c['9j']}",
                dim,
                "exact" if exact else "float",
                fmt_ratio(t_ref / t_cold),
                fmt_time(t_cold),
                fmt_time(t_warm),
                fmt_time(t_ref),
            )
        )
    table(
        (
            "n",
            "j",
            "sums / 6j / 9j",
            "product dim",
            "referee",
            "referee/evaluate",
            "evaluate cold",
            "evaluate warm",
            "referee",
        ),
        rows,
    )
    print("every value equal to the referee's (exactly where the referee is exact)")


def _half(text: str) -> float:
    num, _, den = text.partition("/")
    return int(num) / int(den or 1)


def _nonzero_case(
    rng: random.Random, leaves: list[str], j: str
) -> tuple[Derivation, dict[str, object]]:
    """A seeded pair of schemes and a value set (all leaves ``j``) with a nonzero overlap."""
    doubled = int(2 * _half(j))
    while True:
        d = derive(random_scheme(rng, leaves), random_scheme(rng, leaves))
        if not d.steps:
            continue
        lv = dict.fromkeys(leaves, doubled)
        for _ in range(200):
            known = _random_state(rng, d.source, dict(lv))
            if known is None:
                continue
            known = _random_state(rng, d.target, known)
            if known is None:
                continue
            values: dict[str, object] = {k: f"{v}/2" for k, v in known.items()}
            if d.formula.evaluate_float(values) != 0.0:
                return d, values


def _random_state(
    rng: random.Random, scheme: Coupling, known: dict[str, int]
) -> dict[str, int] | None:
    """Random allowed values for the couplings of ``scheme`` (children first), keeping
    values already known (shared clusters); None if a known value breaks a triangle."""
    for node in scheme.couplings():
        options = coupled_range(known[node.left.label], known[node.right.label])
        if node.label in known:
            if known[node.label] not in options:
                return None
        else:
            known[node.label] = rng.choice(options)
    return known


def run(smoke: bool) -> None:
    warm_up()
    derivation_section(smoke)
    memory_section(smoke)
    evaluation_section(smoke)


if __name__ == "__main__":
    run("--smoke" in sys.argv[1:])
