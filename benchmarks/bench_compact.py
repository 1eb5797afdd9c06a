"""Fewest summations: the plain shortest Racah path against the compact search.

For random pairs of schemes with n = 5..8 leaves: summations on the plain path
(after 9j folding) against the formula derive() keeps, how often the compact
search proves there is nothing better, and the evaluation time of both formulas
at a few value sets (fewer sums should also mean faster evaluation).

Run: ``python3 benchmarks/bench_compact.py [--smoke]`` (also a section of run.py).
"""

from __future__ import annotations

import random
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
if str(HERE) not in sys.path:
    sys.path.insert(0, str(HERE))

from _common import VERDICTS, fmt_time, heading, leaf_names, median, random_scheme, table  # noqa: E402

from recouple import derive  # noqa: E402
from recouple.recoupling.evaluate import evaluate_doubled  # noqa: E402
from recouple.recoupling.matrix import basis_states  # noqa: E402


def _value_sets(d: object, rng: random.Random, count: int) -> list[dict[str, int]]:
    """Consistent doubled value sets for both schemes (leaves 1/2 or 1)."""
    a, b = d.source, d.target  # type: ignore[attr-defined]
    out: list[dict[str, int]] = []
    for _ in range(200):
        leaves = {leaf: rng.choice((1, 2)) for leaf in a.leaves()}
        rows = basis_states(a, leaves)
        if not rows:
            continue
        row = rng.choice(rows)
        cols = [
            c
            for c in basis_states(b, leaves, row[a.total])
            if all(row.get(k, c[k]) == c[k] for k in c)
        ]
        if not cols:
            continue
        out.append({**leaves, **row, **rng.choice(cols)})
        if len(out) == count:
            break
    return out


def _time_eval(formula: object, values: list[dict[str, int]]) -> float:
    start = time.process_time()
    for v in values:
        evaluate_doubled(formula, v)  # type: ignore[arg-type]
    return (time.process_time() - start) / max(len(values), 1)


def run(smoke: bool = False) -> None:
    heading("fewest summations: plain Racah path vs compact search (n = 5..8)")
    rng = random.Random(77)
    pairs = 4 if smoke else 30
    rows = []
    never_more = True
    for n in (5, 6, 7, 8):
        leaves = leaf_names(n)
        plain_total = kept_total = improved = proven = 0
        plain_t: list[float] = []
        kept_t: list[float] = []
        for _ in range(pairs):
            a, b = random_scheme(rng, leaves), random_scheme(rng, leaves)
            kept = derive(a, b)
            plain_total += kept.sums_on_plain_path
            kept_total += len(kept.formula.sums)
            never_more &= len(kept.formula.sums) <= kept.sums_on_plain_path
            proven += kept.compact_status.startswith(("proven", "no sums")) or "(proven" in (
                kept.compact_status
            )
            if len(kept.formula.sums) < kept.sums_on_plain_path:
                improved += 1
                plain = derive(a, b, compact=False)
                values = _value_sets(kept, rng, 2 if smoke else 5)
                if values:
                    plain_t.append(_time_eval(plain.formula, values))
                    kept_t.append(_time_eval(kept.formula, values))
        speed = f"{median(plain_t) / median(kept_t):.1f}x" if plain_t and kept_t else "-"
        rows.append(
            (
                n,
                pairs,
                f"{plain_total / pairs:.2f}",
                f"{kept_total / pairs:.2f}",
                improved,
                f"{proven}/{pairs}",
                speed,
                fmt_time(median(plain_t)) if plain_t else "-",
                fmt_time(median(kept_t)) if kept_t else "-",
            )
        )
    table(
        (
            "n",
            "pairs",
            "sums/pair plain",
            "sums/pair kept",
            "pairs improved",
            "settled",
            "eval speed-up",
            "eval plain",
            "eval kept",
        ),
        rows,
    )
    print(
        "settled: the kept formula is proven to have the fewest sums over Racah and 9j "
        "moves, or the plain path already has none"
    )
    VERDICTS.check(
        "compact: never more sums than the plain path",
        never_more,
        "held" if never_more else "VIOLATED",
        "always",
    )


if __name__ == "__main__":
    run("--smoke" in sys.argv[1:])
