"""Shared helpers of the benchmark scripts: timing, tables, verdicts, seeded inputs.

Every section prints machine-independent ratios first and absolute times second,
and a PASS or MISSED line for each target.  Nothing here is a test: a missed
target is reported, never raised.
"""

from __future__ import annotations

import random
import statistics
import time
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, field
from typing import Any

from recouple.symbols.canonical import canonical_ninej, canonical_sixj

# -- verdicts -------------------------------------------------------------------------


@dataclass
class Verdicts:
    """The PASS / MISSED lines of a whole run, repeated in the summary."""

    lines: list[str] = field(default_factory=list)

    def check(self, name: str, ok: bool, measured: str, target: str) -> None:
        line = f"{'PASS  ' if ok else 'MISSED'}  {name}: {measured} (target {target})"
        self.lines.append(line)
        print(line)

    def report(self, name: str, measured: str) -> None:
        line = f"REPORT  {name}: {measured} (no target)"
        self.lines.append(line)
        print(line)


VERDICTS = Verdicts()


# -- printing ---------------------------------------------------------------------------


def heading(title: str) -> None:
    print()
    print(f"== {title} " + "=" * max(0, 74 - len(title)))


def table(headers: Sequence[str], rows: Iterable[Sequence[object]]) -> None:
    """A small Markdown table (so docs/performance.md can paste it as is)."""
    body = [[_cell(x) for x in row] for row in rows]
    widths = [max([len(h)] + [len(r[k]) for r in body]) for k, h in enumerate(headers)]
    print("| " + " | ".join(h.ljust(w) for h, w in zip(headers, widths, strict=True)) + " |")
    print("|" + "|".join("-" * (w + 2) for w in widths) + "|")
    for r in body:
        print("| " + " | ".join(c.rjust(w) for c, w in zip(r, widths, strict=True)) + " |")


def _cell(x: object) -> str:
    if isinstance(x, float):
        return f"{x:.3g}"
    return str(x)


def fmt_time(seconds: float) -> str:
    """A duration with a sensible unit."""
    if seconds < 1e-3:
        return f"{seconds * 1e6:.1f} us"
    if seconds < 1.0:
        return f"{seconds * 1e3:.1f} ms"
    return f"{seconds:.2f} s"


def fmt_ratio(x: float) -> str:
    return f"{x:.0f}x" if x >= 10 else f"{x:.1f}x"


# -- timing -------------------------------------------------------------------------------


# Timings are CPU seconds of this process (time.process_time): on a shared machine
# other load then slows neither side of a ratio.  Wall-clock totals are printed by run.py.
clock = time.process_time


def per_call(fn: Callable[..., Any], args: Sequence[Sequence[Any]]) -> float:
    """Mean CPU seconds per call of ``fn(*a)`` over the stream ``args`` (one pass)."""
    start = clock()
    for a in args:
        fn(*a)
    return (clock() - start) / max(1, len(args))


def timed(fn: Callable[[], Any]) -> tuple[float, Any]:
    """(CPU seconds, result) of one call."""
    start = clock()
    out = fn()
    return clock() - start, out


def warm_up() -> None:
    """Grow the factorial and prime tables once, outside every timed pass."""
    from recouple.symbols.bulk import ninej_float_many, sixj_float_many
    from recouple.symbols.floats import ninej_float_doubled, sixj_float_doubled
    from recouple.symbols.values import ninej_doubled, sixj_doubled

    for fn in (sixj_doubled, sixj_float_doubled):
        fn(200, 200, 200, 200, 200, 200)
    for fn9 in (ninej_doubled, ninej_float_doubled):
        fn9(200, 200, 200, 200, 200, 200, 200, 200, 200)
    # The bulk path's float factorial table (built once per size, like the ones above).
    sixj_float_many([[200] * 6])
    ninej_float_many([[100] * 9])
    clear_symbol_caches()


def median(xs: Sequence[float]) -> float:
    return statistics.median(xs) if xs else float("nan")


def clear_symbol_caches() -> None:
    """Empty every cache of exact and float symbol values, so nothing is reused."""
    from recouple.symbols import bulk, floats, values

    for cached in (
        bulk._racah_exact_dd,
        values._sixj_doubled,
        values._sixj_canonical,
        values._ninej_doubled,
        values._ninej_canonical,
        values._cg_doubled,
        values._threej_doubled,
        floats._sixj_float_doubled,
        floats._ninej_float_doubled,
        floats._cg_float_doubled,
        floats._threej_float_doubled,
    ):
        cached.cache_clear()


def clear_all_caches() -> None:
    """Symbol caches plus the compiled-formula cache of recoupling.evaluate."""
    from recouple.recoupling import evaluate

    clear_symbol_caches()
    evaluate._plan.cache_clear()


# -- seeded streams of admissible symbol arguments (doubled ints) ---------------------------


def _tri(a: int, b: int, c: int) -> bool:
    """Triangle condition on doubled values (DLMF 34.2.1)."""
    return (a + b + c) % 2 == 0 and abs(a - b) <= c <= a + b


def _pick(rng: random.Random, lo: int, hi: int) -> int:
    return rng.randint(lo, hi)


def _between(x: int, y: int, lo: int, hi: int) -> list[int]:
    """Doubled values that x and y couple to, kept within [2 lo, 2 hi]."""
    return [z for z in range(abs(x - y), x + y + 1, 2) if 2 * lo <= z <= 2 * hi]


def sixj_stream(seed: int, count: int, lo: int, hi: int) -> list[tuple[int, ...]]:
    """``count`` distinct admissible 6j (doubled), all four triads satisfied, each
    entry ``2j`` in ``[2 lo, 2 hi]`` (j from lo to hi).

    Distinct means distinct up to the 24 symmetries (DLMF 34.5.8), so no value
    can come from a cache filled by an earlier member of the stream.
    """
    rng = random.Random(seed)
    seen: set[tuple[int, ...]] = set()
    out: list[tuple[int, ...]] = []
    tries = 0
    while len(out) < count and tries < 200 * count:
        tries += 1
        a, b, d, e = (_pick(rng, 2 * lo, 2 * hi) for _ in range(4))
        cs = [c for c in _between(a, b, lo, hi) if _tri(d, e, c)]
        fs = [f for f in _between(a, e, lo, hi) if _tri(d, b, f)]
        if not cs or not fs:
            continue
        args = (a, b, rng.choice(cs), d, e, rng.choice(fs))
        key = canonical_sixj(args)
        if key in seen:
            continue
        seen.add(key)
        out.append(args)
    return out


def ninej_stream(seed: int, count: int, lo: int, hi: int) -> list[tuple[int, ...]]:
    """``count`` distinct admissible 9j (doubled, rows in order), every entry
    ``2j`` in ``[2 lo, 2 hi]``; distinct up to the 72 symmetries (DLMF §34.7(ii))."""
    rng = random.Random(seed)
    seen: set[tuple[int, ...]] = set()
    out: list[tuple[int, ...]] = []
    tries = 0
    top = 2 * hi
    while len(out) < count and tries < 500 * count:
        tries += 1
        a, b, d, e = (_pick(rng, 2 * lo, top) for _ in range(4))
        options = [_between(x, y, lo, hi) for x, y in ((a, b), (d, e), (a, d), (b, e))]
        if not all(options):
            continue
        c, f, g, h = (rng.choice(o) for o in options)
        lo_i, hi_i = max(abs(g - h), abs(c - f), 2 * lo), min(g + h, c + f, top)
        if lo_i > hi_i or (g + h + lo_i) % 2 or (c + f + lo_i) % 2:
            continue
        args = (a, b, c, d, e, f, g, h, rng.choice(range(lo_i, hi_i + 1, 2)))
        key = canonical_ninej(args)[0]
        if key in seen:
            continue
        seen.add(key)
        out.append(args)
    return out


# -- seeded coupling schemes ----------------------------------------------------------------


def random_scheme(rng: random.Random, leaves: Sequence[str], total: str = "J") -> str:
    """A random coupling scheme over ``leaves`` in the textbook notation.

    Built by merging two random parts until one is left (every merge order equally
    likely).  Each coupling is named after its leaf set (``k`` plus the bitmask in
    hex), so two schemes that share a cluster share its name, as a physicist would
    write them.
    """
    index = {leaf: i for i, leaf in enumerate(sorted(leaves))}
    parts: list[tuple[str, int]] = [(leaf, 1 << index[leaf]) for leaf in leaves]
    while len(parts) > 1:
        i, j = sorted(rng.sample(range(len(parts)), 2))
        (left, lm), (right, rm) = parts[i], parts[j]
        if rng.random() < 0.5:
            left, right = right, left
        mask = lm | rm
        name = total if len(parts) == 2 else f"k{mask:x}"
        del parts[j], parts[i]
        parts.append((f"({left},{right}){name}", mask))
    return parts[0][0]


def leaf_names(n: int) -> list[str]:
    return [f"j{i + 1}" for i in range(n)]


def chain(leaves: Sequence[str], total: str = "J", prefix: str = "c") -> str:
    """The chain ((((l1, l2) c2, l3) c3, ...) J."""
    text = leaves[0]
    for k, leaf in enumerate(leaves[1:], start=2):
        name = total if k == len(leaves) else f"{prefix}{k}"
        text = f"({text},{leaf}){name}"
    return text


def scheme_text(clusters: frozenset[int], n: int, names: Sequence[str] | None = None) -> str:
    """The scheme text of a tree given as the search's non-root cluster bitmasks.

    Leaf ``i`` is named ``names[i]`` (default ``j{i+1}``), a coupling ``k`` plus its
    bitmask in hex (shared clusters of two trees share a name), the root ``J``.
    """
    from recouple.recoupling.search import children

    leaf = list(names) if names is not None else leaf_names(n)
    root = (1 << n) - 1

    def text(mask: int) -> str:
        if mask & (mask - 1) == 0:
            return leaf[mask.bit_length() - 1]
        left, right = children(clusters, mask, n)
        return f"({text(left)},{text(right)})" + ("J" if mask == root else f"k{mask:x}")

    return text(root)
