r"""A recoupling formula as a sympy expression (sympy is imported inside the functions).

Labels become plain :class:`sympy.Symbol` objects with the formula's names (no
assumptions, so ``Symbol("a")`` typed by hand matches).  The factors map one to
one: ``(-1)**(...)``, ``(2*x + 1)**(p/2)``, :class:`sympy.KroneckerDelta`, and
sympy's symbolic Wigner symbols :class:`sympy.physics.quantum.cg.Wigner6j` and
``Wigner9j`` (arguments in the formula's order, 9j row by row).

Summation range convention.  A summation variable ``x`` runs in unit steps over
the values its triangles allow, ``Max(|p - q|, ...) <= x <= Min(p + q, ...)``,
one ``|p - q|`` and one ``p + q`` for every triad ``(x, p, q)`` of its symbols
whose other two labels are free labels or belong to enclosing sums (DLMF
34.2.1); the sums are nested in the order :mod:`recouple.recoupling.evaluate`
uses (see :func:`recouple.outputs.pycode.sum_order`).  When that range is
empty, sympy's reversed-limit convention (Karr's) turns ``Sum(t, (x, lo, hi))``
with ``hi < lo`` into ``-Sum(t, (x, hi + 1, lo - 1))``; every ``x`` there lies
outside one of the bounding triads, so a symbol in each term is 0 and the sum
is 0, as it should be.

The expression equals the overlap for label values that satisfy the triangle
conditions of both schemes; outside them the overlap is zero by definition and
the expression is not meant to be evaluated.

sympy's ``Wigner6j.doit()`` refuses symbolic arguments, so ``Sum.doit()`` over a
symbol fails even after every free label has a number; :func:`sympy_doit`
expands the sums first and then evaluates the symbols.

>>> import sympy
>>> from recouple.recoupling.derive import derive
>>> e = formula_to_sympy(derive("((a,b)e,c)J", "(a,(b,c)f)J").formula)
>>> e
(-1)**(J + a + b + c)*sqrt(2*e + 1)*sqrt(2*f + 1)*Wigner6j(a, b, e, c, J, f)
>>> h = sympy.Rational(1, 2)
>>> values = dict(a=h, b=h, c=h, e=1, f=0, J=h)
>>> sympy_doit(e.subs({sympy.Symbol(k): v for k, v in values.items()}))
sqrt(3)/2
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import TYPE_CHECKING, Any

from recouple.outputs.pycode import sum_order

if TYPE_CHECKING:
    from recouple.recoupling.formula import Formula

__all__ = ["formula_to_sympy", "sympy_doit", "sympy_value"]


def formula_to_sympy(formula: Formula) -> Any:
    """The formula as a sympy expression (see the module notes for the conventions).

    >>> from recouple.recoupling.derive import derive
    >>> formula_to_sympy(derive("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J").formula)
    sqrt(2*e + 1)*sqrt(2*f + 1)*sqrt(2*g + 1)*sqrt(2*h + 1)*Wigner9j(a, b, e, c, d, f, g, h, J)
    """
    import sympy
    from sympy.physics.quantum.cg import Wigner6j, Wigner9j

    sym = {label: sympy.Symbol(label) for label in (*formula.order, *formula.sums)}

    term: Any = sympy.Integer(1)
    if formula.phase:
        # coefficient 3 means -1: (-1)^(4j) = 1 (formula.py, common practice)
        exponent = sympy.Add(*[(c if c != 3 else -1) * sym[label] for label, c in formula.phase])
        term *= sympy.Pow(-1, exponent)
    for label, p in formula.hats:
        term *= (2 * sym[label] + 1) ** sympy.Rational(p, 2)
    for s in formula.sixjs:
        term *= Wigner6j(*(sym[label] for label in s))
    for n in formula.ninejs:
        term *= Wigner9j(*(sym[label] for label in n))

    # Innermost sum first: wrap the term in each sum, last variable of the nesting first.
    for x, triads in reversed(sum_order(formula)):
        lo = sympy.Max(*[sympy.Abs(sym[p] - sym[q]) for p, q in triads])
        hi = sympy.Min(*[sym[p] + sym[q] for p, q in triads])
        term = sympy.Sum(term, (sym[x], lo, hi))

    for a, b in formula.deltas:
        term = sympy.KroneckerDelta(sym[a], sym[b]) * term
    if formula.constant % 2:
        term = -term
    return term


def sympy_doit(expr: Any) -> Any:
    """Evaluate an exported formula once every free label is a number.

    Sums are expanded from the outside in (each with ``doit(deep=False)``, so
    sympy never asks a Wigner symbol with a symbolic argument for its value),
    then everything is evaluated with ``doit()``.

    >>> import sympy
    >>> from sympy.physics.quantum.cg import Wigner6j
    >>> x = sympy.Symbol("x")
    >>> sympy_doit(sympy.Sum((2 * x + 1) * Wigner6j(1, 1, x, 1, 1, 0), (x, 0, 2)))
    1
    """
    import sympy

    def expand(e: Any) -> Any:
        if isinstance(e, sympy.Sum):
            if any(not limit.is_number for _, *limits in e.limits for limit in limits):
                raise ValueError(
                    f"the limits of {e} are not numbers: give every free label a value"
                )
            return expand(e.doit(deep=False))
        if not e.args or not isinstance(e, sympy.Basic):
            return e
        return e.func(*[expand(a) for a in e.args])

    return expand(expr).doit()


def sympy_value(formula: Formula, values: Mapping[str, object]) -> Any:
    """The exported formula at numeric label values, evaluated by sympy.

    Values are checked as :meth:`Formula.evaluate` checks them (every free label,
    each a non-negative integer or half-integer); the rest of the work is sympy's,
    which makes this an independent cross-check of the exact evaluator.

    >>> from recouple.recoupling.derive import derive
    >>> f = derive("((a,b)e,c)J", "(a,(b,c)f)J").formula
    >>> sympy_value(f, {"a": "1/2", "b": "1/2", "c": "1/2", "e": 1, "f": 0, "J": "1/2"})
    sqrt(3)/2
    """
    import sympy

    from recouple.recoupling.evaluate import check_values

    doubled = check_values(formula, values)
    subs = {sympy.Symbol(k): sympy.Rational(d, 2) for k, d in doubled.items()}
    return sympy_doit(formula_to_sympy(formula).subs(subs))
