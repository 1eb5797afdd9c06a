"""Evaluate a :class:`Formula` at given label values, exactly or in floats.

Values are checked first (every free label present, no unknown ones, each a
non-negative integer or half-integer).  A value set that breaks a triangle of
either scheme, or a Kronecker delta, gives exact zero; :func:`why_zero` says why.
Summation variables run over the values the triangle conditions of their
symbols allow (DLMF 34.2.1 and the triads listed in DLMF §34.4 and §34.6).

>>> from recouple.recoupling.derive import derive
>>> f = derive("((a,b)e,c)J", "(a,(b,c)f)J").formula
>>> v = {"a": "1/2", "b": "1/2", "c": "1/2", "e": 1, "f": 0, "J": "1/2"}
>>> print(evaluate(f, v))
(1/2)*sqrt(3)
"""

from __future__ import annotations

import math
from collections.abc import Iterator, Mapping
from fractions import Fraction

from recouple.errors import BadValue
from recouple.numbers.radicals import Radical
from recouple.numbers.spins import coupled_range, is_triad, spin_text, to_doubled
from recouple.recoupling.formula import Formula
from recouple.symbols.floats import ninej_float_doubled, sixj_float_doubled
from recouple.symbols.values import ninej_doubled, sixj_doubled

__all__ = ["check_values", "evaluate", "evaluate_doubled", "evaluate_float", "why_zero"]


def check_values(formula: Formula, values: Mapping[str, object]) -> dict[str, int]:
    """The doubled value of every free label, or a :class:`BadValue` naming the problem."""
    free = formula.free_labels
    unknown = [name for name in values if name not in free]
    if unknown:
        raise BadValue(
            f"{unknown[0]!r} is not a label of either scheme (labels: {', '.join(free)})"
        )
    missing = [name for name in free if name not in values]
    if missing:
        raise BadValue(
            f"no value given for {', '.join(repr(m) for m in missing)} "
            f"(every label of both schemes needs one: {', '.join(free)})"
        )
    return {name: to_doubled(values[name], name=name) for name in free}


def why_zero(formula: Formula, doubled: Mapping[str, int]) -> str | None:
    """Why the overlap vanishes at these (checked, doubled) values, or None.

    >>> from recouple.recoupling.derive import derive
    >>> f = derive("((a,b)e,c)J", "(a,(b,c)f)J").formula
    >>> why_zero(f, {"a": 1, "b": 1, "c": 1, "e": 4, "f": 0, "J": 1})
    'triad (a, b, e) = (1/2, 1/2, 2) breaks the triangle condition'
    """
    for triad in formula.triads():
        ds = [doubled[label] for label in triad]
        if not is_triad(*ds):
            shown = ", ".join(spin_text(d) for d in ds)
            rule = "triangle condition" if sum(ds) % 2 == 0 else "integer-sum rule"
            return f"triad ({', '.join(triad)}) = ({shown}) breaks the {rule}"
    for first, second in formula.deltas:
        if doubled[first] != doubled[second]:
            return (
                f"{first} and {second} name the same coupling but have different values "
                f"({spin_text(doubled[first])} and {spin_text(doubled[second])})"
            )
    return None


def evaluate(formula: Formula, values: Mapping[str, object]) -> Radical:
    """The exact value of ``formula`` at ``values`` (a map from every free label)."""
    doubled = check_values(formula, values)
    if why_zero(formula, doubled) is not None:
        return Radical(0)
    return evaluate_doubled(formula, doubled)


def evaluate_doubled(formula: Formula, doubled: Mapping[str, int]) -> Radical:
    """The exact value at checked doubled values (2j) that satisfy every triad."""
    total = Radical(0)
    for assignment in _assignments(formula, doubled):
        total = total + _term_exact(formula, assignment)
    return total


def evaluate_float(formula: Formula, values: Mapping[str, object]) -> float:
    """The value of ``formula`` at ``values`` in floating point, for bulk work."""
    doubled = check_values(formula, values)
    if why_zero(formula, doubled) is not None:
        return 0.0
    return math.fsum(_term_float(formula, a) for a in _assignments(formula, doubled))


def _sign(formula: Formula, d: Mapping[str, int]) -> int:
    """(-1)^E for E = sum c*label + constant; E is an integer for allowed values."""
    twice = sum(c * d[label] for label, c in formula.phase)
    assert twice % 2 == 0, "phase exponent is not an integer: a formula bug"
    return -1 if (twice // 2 + formula.constant) % 2 else 1


def _hat_square(formula: Formula, d: Mapping[str, int]) -> int:
    """The square of prod (2x+1)^(p/2): an integer (dimension 2x+1 = doubled + 1)."""
    out = 1
    for label, power in formula.hats:
        out *= (d[label] + 1) ** power
    return out


def _term_exact(formula: Formula, d: Mapping[str, int]) -> Radical:
    value = Radical.sqrt(Fraction(_hat_square(formula, d)))
    for s in formula.sixjs:
        sym = sixj_doubled(*(d[label] for label in s))
        if not sym:
            return Radical(0)
        value = value * sym
    for n in formula.ninejs:
        sym = ninej_doubled(*(d[label] for label in n))
        if not sym:
            return Radical(0)
        value = value * sym
    return value if _sign(formula, d) > 0 else -value


def _term_float(formula: Formula, d: Mapping[str, int]) -> float:
    value = math.sqrt(_hat_square(formula, d)) * _sign(formula, d)
    for s in formula.sixjs:
        value *= sixj_float_doubled(*(d[label] for label in s))
    for n in formula.ninejs:
        value *= ninej_float_doubled(*(d[label] for label in n))
    return value


def _symbol_triads(formula: Formula) -> list[tuple[str, str, str]]:
    """Every triad of every symbol: the 6j's four (DLMF §34.4), the 9j's rows and columns."""
    triads: list[tuple[str, str, str]] = []
    for j1, j2, j3, l1, l2, l3 in formula.sixjs:
        triads += [(j1, j2, j3), (j1, l2, l3), (l1, j2, l3), (l1, l2, j3)]
    for a, b, c, d, e, f, g, h, i in formula.ninejs:
        triads += [(a, b, c), (d, e, f), (g, h, i), (a, d, g), (b, e, h), (c, f, i)]
    return triads


def _assignments(formula: Formula, free: Mapping[str, int]) -> Iterator[dict[str, int]]:
    """Every assignment of the summation variables the symbols' triangles allow."""
    triads = _symbol_triads(formula)
    yield from _fill(list(formula.sums), dict(free), triads)


def _fill(
    todo: list[str], known: dict[str, int], triads: list[tuple[str, str, str]]
) -> Iterator[dict[str, int]]:
    if not todo:
        yield known
        return
    # Pick the first variable that some triad pins down through two known labels.
    for x in todo:
        ranges = [
            coupled_range(*(known[o] for o in t if o != x))
            for t in triads
            if x in t and t.count(x) == 1 and all(o in known for o in t if o != x)
        ]
        if ranges:
            break
    else:
        raise AssertionError("a summation variable is bounded by no triangle: a formula bug")
    allowed = _intersect(ranges)
    rest = [y for y in todo if y != x]
    for value in allowed:
        known[x] = value
        yield from _fill(rest, known, triads)
    known.pop(x, None)


def _intersect(ranges: list[range]) -> Iterator[int]:
    lo = max(r.start for r in ranges)
    hi = min(r.stop for r in ranges)
    for v in range(lo, hi):
        if all(v in r for r in ranges):
            yield v
