"""The LS-jj transformation matrix, exact, against the same matrix from sympy.

Two electrons (orbital l1 = l2 = l, spin s = 1/2), all totals J: recouple's
``transformation_matrix`` between ``((l1,l2)L,(s1,s2)S)J`` and
``((l1,s1)j1,(l2,s2)j2)J``, against the textbook route (common practice; e.g. the
LS-jj coefficient as a 9j times four hats, handbook formula, from memory):

    <(l1 l2)L (s1 s2)S; J | (l1 s1)j1 (l2 s2)j2; J>
        = sqrt((2L+1)(2S+1)(2j1+1)(2j2+1)) {l1 l2 L; s1 s2 S; j1 j2 J}

with the 9j from sympy.physics.wigner.wigner_9j, for every pair of states with
the same J (entries between different J vanish: block diagonal).  Every entry is
checked equal, exactly.  recouple's caches are emptied before its timed call, and
its time includes deriving the formula.
"""

from __future__ import annotations

import sys
from typing import Any

from _common import (
    VERDICTS,
    clear_all_caches,
    fmt_ratio,
    fmt_time,
    heading,
    table,
    timed,
    warm_up,
)

from recouple.numbers.radicals import Radical
from recouple.recoupling.matrix import TransformationMatrix, transformation_matrix

LS = "((l1,l2)L,(s1,s2)S)J"
JJ = "((l1,s1)j1,(l2,s2)j2)J"
TARGET = 100.0


def _ours(l_value: int) -> TransformationMatrix:
    values = {"l1": l_value, "l2": l_value, "s1": "1/2", "s2": "1/2"}
    return transformation_matrix(LS, JJ, values)


def _sympy_route(m: TransformationMatrix) -> dict[tuple[int, int], Any]:
    """The same-J entries from sympy's 9j and four hats (doubled values in the states)."""
    from sympy import Rational, sqrt
    from sympy.physics.wigner import wigner_9j

    leaves = dict(m.leaves)
    out: dict[tuple[int, int], Any] = {}
    for i, row in enumerate(m.rows):
        r = dict(row)
        for k, column in enumerate(m.columns):
            c = dict(column)
            if r["J"] != c["J"]:
                continue
            labels = (leaves["l1"], leaves["l2"], r["L"], leaves["s1"], leaves["s2"], r["S"])
            labels += (c["j1"], c["j2"], r["J"])
            ninej = wigner_9j(*(Rational(x, 2) for x in labels))
            out[i, k] = ninej * sqrt((r["L"] + 1) * (r["S"] + 1) * (c["j1"] + 1) * (c["j2"] + 1))
    return out


def run(smoke: bool) -> None:
    warm_up()
    heading("LS-jj transformation matrix, exact, all J, against sympy's 9j times four hats")
    cases = [1] if smoke else [1, 2, 3]
    rows = []
    verdict: tuple[int, float] | None = None
    for l_value in cases:
        clear_all_caches()
        t_cold, m = timed(lambda lv=l_value: _ours(lv))
        t_warm, _ = timed(lambda lv=l_value: _ours(lv))
        t_ref, ref = timed(lambda m=m: _sympy_route(m))
        nonzero = 0
        for i, line in enumerate(m.exact):
            for k, x in enumerate(line):
                expected = Radical.from_sympy(ref[i, k]) if (i, k) in ref else Radical(0)
                assert x == expected, (l_value, m.rows[i], m.columns[k], x, expected)
                nonzero += bool(x)
        assert m.orthogonal
        ratio = t_ref / t_cold
        rows.append(
            (
                l_value,
                f"{len(m.rows)}x{len(m.columns)}",
                len(ref),
                fmt_ratio(ratio),
                fmt_ratio(t_ref / t_warm),
                fmt_time(t_cold),
                fmt_time(t_warm),
                fmt_time(t_ref),
            )
        )
        verdict = (l_value, ratio)
    table(
        (
            "l1 = l2",
            "size",
            "9j entries",
            "sympy/recouple (cold)",
            "sympy/recouple (warm)",
            "recouple cold",
            "recouple warm",
            "sympy route",
        ),
        rows,
    )
    print("every entry equal to sympy's, exactly; matrices orthogonal to 1e-12")
    assert verdict is not None
    l_value, ratio = verdict
    label = f"LS-jj matrix l1 = l2 = {l_value}, s = 1/2, speed-up over the sympy route"
    if l_value == 3:
        VERDICTS.check(label, ratio >= TARGET, fmt_ratio(ratio), f">= {TARGET:.0f}x")
    else:
        VERDICTS.report(label + " (smoke: target is for l = 3)", fmt_ratio(ratio))


if __name__ == "__main__":
    run("--smoke" in sys.argv[1:])
