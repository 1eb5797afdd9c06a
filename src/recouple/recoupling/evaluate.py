"""Evaluate a :class:`Formula` at given label values, exactly or in floats.

Values are checked first (every free label present, no unknown ones, each a
non-negative integer or half-integer).  A value set that breaks a triangle of
either scheme, or a Kronecker delta, gives exact zero; :func:`why_zero` says why.
Summation variables run over the values the triangle conditions of their
symbols allow (DLMF 34.2.1 and the triads listed in DLMF §34.4 and §34.6).

How it is made fast (docs/performance.md has the figures):

* each formula is compiled once into a :class:`_Plan` (cached per formula): the
  labels become slots of one list of doubled values, the summation order and the
  triads bounding each summation variable are fixed, and every factor that
  depends on free labels only (their phase, their hats ``sqrt(2x+1)``, symbols
  without a summation variable) is taken out of the sum and computed once;
* inside the sum all arithmetic is on doubled ints: the phase is a sum of
  ``coefficient * 2j`` ints, and a term ``q1 sqrt(s1) * q2 sqrt(s2) * ...`` of
  single-radicand factors is multiplied as ``(num, den, radicand)`` ints, using
  ``s1 s2 = g^2 (s1/g)(s2/g)`` with ``g = gcd(s1, s2)`` for square-free s1, s2
  (common practice), so no integer is ever factored;
* symbol values come from the symbol layer's caches, so evaluating one formula
  at many value sets (a matrix, a table) computes each distinct symbol once.

>>> from recouple.recoupling.derive import derive
>>> f = derive("((a,b)e,c)J", "(a,(b,c)f)J").formula
>>> v = {"a": "1/2", "b": "1/2", "c": "1/2", "e": 1, "f": 0, "J": "1/2"}
>>> print(evaluate(f, v))
(1/2)*sqrt(3)
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache

from recouple.errors import BadValue
from recouple.numbers._integers import squarefree_split
from recouple.numbers.radicals import Radical, radical_from_parts
from recouple.numbers.spins import MAX_SPIN, spin_text, to_doubled
from recouple.recoupling.formula import Formula, summation_order
from recouple.symbols.floats import _ninej_float_doubled, _sixj_float_doubled
from recouple.symbols.values import _ninej_doubled, _sixj_doubled

__all__ = [
    "check_labels",
    "check_values",
    "evaluate",
    "evaluate_doubled",
    "evaluate_float",
    "why_zero",
]

# An exact single-radicand number num/den * sqrt(rad): den > 0, rad square-free.
_Exact = tuple[int, int, int]
Slots = tuple[int, ...]


def check_values(formula: Formula, values: Mapping[str, object]) -> dict[str, int]:
    """The doubled value of every free label, or a :class:`BadValue` naming the problem."""
    return check_labels(formula.free_labels, values)


def check_labels(free: Sequence[str], values: Mapping[str, object]) -> dict[str, int]:
    """The doubled value of each label in ``free``: every one present, no other.

    The schemes' labels (:func:`~recouple.recoupling.formula.free_labels`) are known
    before a derivation, so callers check values first and fail at once.

    >>> check_labels(("a", "b", "J"), {"a": 1, "b": "1/2", "J": "1/2"})
    {'a': 2, 'b': 1, 'J': 1}
    >>> check_labels(("a", "J"), {"a": 1})
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: no value given for 'J' (every label of both schemes needs one: a, J)
    """
    if not isinstance(values, Mapping):
        raise BadValue(f"values must map each label to its value, got {values!r}")
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
    return {name: _doubled(values[name], name) for name in free}


def _doubled(value: object, name: str) -> int:
    """2j of one value; plain ints in range skip the parser (same result, same checks)."""
    if type(value) is int and 0 <= value <= MAX_SPIN:
        return 2 * value
    return to_doubled(value, name=name)


def why_zero(formula: Formula, doubled: Mapping[str, int]) -> str | None:
    """Why the overlap vanishes at these (checked, doubled) values, or None.

    >>> from recouple.recoupling.derive import derive
    >>> f = derive("((a,b)e,c)J", "(a,(b,c)f)J").formula
    >>> why_zero(f, {"a": 1, "b": 1, "c": 1, "e": 4, "f": 0, "J": 1})
    'triad (a, b, e) = (1/2, 1/2, 2) breaks the triangle condition'
    """
    # The triads and deltas come from the compiled plan, so no tree is walked here.
    plan = _plan(formula)
    for triad in plan.triads:
        x, y, z = doubled[triad[0]], doubled[triad[1]], doubled[triad[2]]
        if (x + y + z) & 1 or not abs(x - y) <= z <= x + y:
            ds = (x, y, z)
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
    """The exact value at checked doubled values (2j) that satisfy every triad.

    >>> from recouple.recoupling.derive import derive
    >>> f = derive("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J").formula
    >>> print(evaluate_doubled(f, dict(a=1, b=1, c=1, d=1, e=2, f=2, g=2, h=2, J=4)))
    1
    """
    plan = _plan(formula)
    return plan.exact([doubled[label] for label in plan.free])


def evaluate_float(formula: Formula, values: Mapping[str, object]) -> float:
    """The value of ``formula`` at ``values`` in floating point, for bulk work."""
    doubled = check_values(formula, values)
    if why_zero(formula, doubled) is not None:
        return 0.0
    plan = _plan(formula)
    return plan.float([doubled[label] for label in plan.free])


# ---------------------------------------------------------------------------
# The compiled form of a formula
# ---------------------------------------------------------------------------


@lru_cache(maxsize=512)
def _hat_root(dim: int) -> _Exact:
    """sqrt(dim) as (root, 1, free) with root^2 free = dim."""
    root, free = squarefree_split(dim)
    return root, 1, free


def _mul(x: _Exact, q: Fraction, s: int) -> _Exact:
    """(num/den sqrt(rad)) * (q sqrt(s)) for square-free rad and s, without factoring."""
    num, den, rad = x
    g = math.gcd(rad, s)
    return num * q.numerator * g, den * q.denominator, (rad // g) * (s // g)


@dataclass(frozen=True, slots=True)
class _Part:
    """One group of factors of a term: phase, hats and symbols, as slot indices."""

    phase: tuple[tuple[int, int], ...]  # (slot, coefficient of the label in E)
    hats: tuple[tuple[int, int], ...]  # (slot, p) for (2x+1)^(p/2)
    sixjs: tuple[Slots, ...]
    ninejs: tuple[Slots, ...]

    def twice_phase(self, d: Sequence[int]) -> int:
        """2 * (this part of E), an integer (the doubled values make it one)."""
        return sum(c * d[k] for k, c in self.phase)

    def exact(self, d: Sequence[int]) -> _Exact | None:
        """The hats and symbols as num/den sqrt(rad), or None when a symbol vanishes."""
        x: _Exact = (1, 1, 1)
        for k, p in self.hats:
            dim = d[k] + 1
            num, den, rad = x
            if p >= 2 or p <= -2:  # the even part of the power: an integer or its inverse
                whole = dim ** (abs(p) // 2)
                num, den = (num * whole, den) if p > 0 else (num, den * whole)
            if p & 1:
                r, _, f = _hat_root(dim)
                g = math.gcd(rad, f)
                if p > 0:
                    num, rad = num * r * g, (rad // g) * (f // g)
                else:  # dim^(-1/2) = sqrt(f) / (r f)
                    num, den, rad = num * g, den * r * f, (rad // g) * (f // g)
            x = (num, den, rad)
        for s in self.sixjs:
            terms = _sixj_doubled(d[s[0]], d[s[1]], d[s[2]], d[s[3]], d[s[4]], d[s[5]]).terms
            if not terms:
                return None
            (rad, q), *_ = terms
            x = _mul(x, q, rad)
        for n in self.ninejs:
            terms = _ninej_doubled(*(d[k] for k in n)).terms
            if not terms:
                return None
            (rad, q), *_ = terms
            x = _mul(x, q, rad)
        return x

    def float(self, d: Sequence[int]) -> float:
        """The hats and symbols in floating point."""
        value = 1.0
        for k, p in self.hats:
            value *= (d[k] + 1) ** (p / 2)
        for s in self.sixjs:
            value *= _sixj_float_doubled(d[s[0]], d[s[1]], d[s[2]], d[s[3]], d[s[4]], d[s[5]])
        for n in self.ninejs:
            value *= _ninej_float_doubled(*(d[k] for k in n))
        return value


@dataclass(frozen=True, slots=True)
class _Plan:
    """A formula compiled for repeated evaluation (see the module notes).

    Slots ``0 .. len(free) - 1`` hold the free labels, then one slot per summation
    variable in ``loops`` order.  ``loops[i]`` is ``(slot, bounds)``: the variable
    in that slot runs over the values allowed by every triad in ``bounds`` (pairs of
    slots filled earlier), i.e. DLMF 34.2.1 for each triad.
    """

    free: tuple[str, ...]
    triads: tuple[tuple[str, str, str], ...]  # of both schemes (Formula.triads)
    loops: tuple[tuple[int, tuple[tuple[int, int], ...]], ...]
    outer: _Part  # depends on free labels only: once per evaluation
    inner: _Part  # depends on summation variables: once per term
    constant: int
    # Single-symbol hot paths need no sum machinery.
    has_sums: bool

    def _values(self, free: list[int]) -> list[int]:
        return free + [0] * len(self.loops)

    def _terms(self, d: list[int], depth: int = 0) -> list[list[int]]:
        """Every assignment of the summation variables (the list ``d`` is reused)."""
        if depth == len(self.loops):
            return [d]
        slot, bounds = self.loops[depth]
        lo, hi, parity = 0, 1 << 62, -1
        for k1, k2 in bounds:
            a, b = d[k1], d[k2]
            lo = max(lo, abs(a - b))
            hi = min(hi, a + b)
            parity = (a + b) & 1  # every bound must agree on it, checked below
            if (lo - parity) & 1:
                return []
        out: list[list[int]] = []
        for v in range(lo, hi + 1, 2):
            d[slot] = v
            out.extend(self._terms(d, depth + 1) if depth + 1 < len(self.loops) else [d[:]])
        return out

    def exact(self, free: list[int]) -> Radical:
        d = self._values(free)
        outer = self.outer.exact(d)
        if outer is None:
            return Radical(0)
        twice_outer = self.outer.twice_phase(d)
        if not self.has_sums:
            num, den, rad = outer
            if (twice_outer // 2 + self.constant) & 1:
                num = -num
            return radical_from_parts(Fraction(num, den), rad)
        # Sum over the variables, accumulating num/den per radicand (one as a rule).
        acc: dict[int, tuple[int, int]] = {}
        for t in self._terms(d):
            x = self.inner.exact(t)
            if x is None:
                continue
            num, den, rad = x
            if ((twice_outer + self.inner.twice_phase(t)) // 2 + self.constant) & 1:
                num = -num
            if rad in acc:
                n0, d0 = acc[rad]
                g = math.gcd(d0, den)
                acc[rad] = (n0 * (den // g) + num * (d0 // g), d0 // g * den)
            else:
                acc[rad] = (num, den)
        total = Radical(0)
        num_o, den_o, rad_o = outer
        for rad, (num, den) in acc.items():
            if num:
                n, dd, r = _mul((num, den, rad), Fraction(num_o, den_o), rad_o)
                total = total + radical_from_parts(Fraction(n, dd), r)
        return total

    def float(self, free: list[int]) -> float:
        d = self._values(free)
        outer = self.outer.float(d)
        twice_outer = self.outer.twice_phase(d)
        if not outer:
            return 0.0
        if not self.has_sums:
            return -outer if (twice_outer // 2 + self.constant) & 1 else outer
        parts = []
        for t in self._terms(d):
            v = self.inner.float(t)
            parts.append(
                -v if ((twice_outer + self.inner.twice_phase(t)) // 2 + self.constant) & 1 else v
            )
        return outer * math.fsum(parts)


@lru_cache(maxsize=256)
def _plan(formula: Formula) -> _Plan:
    """Compile ``formula`` (cached: a matrix or a table reuses one plan)."""
    free = formula.free_labels
    slot = {label: k for k, label in enumerate(free)}
    # Summation order and bounds are shared with the code writers
    # (formula.summation_order); here they become slots.
    loops: list[tuple[int, tuple[tuple[int, int], ...]]] = []
    for x, pairs in summation_order(formula):
        slot[x] = len(slot)
        ends = [(slot[p], slot[q]) for p, q in pairs]
        bounds = tuple(dict.fromkeys((min(e), max(e)) for e in ends))
        loops.append((slot[x], bounds))
    sums = set(formula.sums)

    def part(inner: bool) -> _Part:
        def wanted(labels: tuple[str, ...]) -> bool:
            return any(label in sums for label in labels) == inner

        return _Part(
            phase=tuple((slot[k], c) for k, c in formula.phase if wanted((k,))),
            hats=tuple((slot[k], p) for k, p in formula.hats if wanted((k,))),
            sixjs=tuple(tuple(slot[k] for k in s) for s in formula.sixjs if wanted(s)),
            ninejs=tuple(tuple(slot[k] for k in n) for n in formula.ninejs if wanted(n)),
        )

    return _Plan(
        free=free,
        triads=formula.triads(),
        loops=tuple(loops),
        outer=part(False),
        inner=part(True),
        constant=formula.constant,
        has_sums=bool(loops),
    )
