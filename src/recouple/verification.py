"""Check a derived formula against direct Clebsch-Gordan projection.

This sits above both the recoupling engine and the referee, which never import
each other: the check shares no logic with what it checks.

>>> v = verify("((a,b)e,c)J", "(a,(b,c)f)J", {"a": "1/2", "b": "1/2", "c": "1/2",
...                                           "e": 1, "f": 0, "J": "1/2"})
>>> print(v.formula_value, v.projection_value, v.agree)
(1/2)*sqrt(3) (1/2)*sqrt(3) True
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

from recouple.errors import check_flag
from recouple.numbers.radicals import Radical
from recouple.recoupling.derive import Derivation, as_scheme, check_pair, derive
from recouple.recoupling.evaluate import check_labels, check_values, evaluate, why_zero
from recouple.recoupling.formula import free_labels
from recouple.referee.projection import project
from recouple.schemes.tree import Coupling

__all__ = ["TOLERANCE", "Verification", "verify"]

#: Largest difference accepted between a float projection and the formula.
TOLERANCE = 1e-12


@dataclass(frozen=True, slots=True)
class Verification:
    """Both numbers, their difference, and whether they agree.

    ``exact`` tells whether the projection was done in exact arithmetic (then
    agreement means equality); otherwise it agrees to :data:`TOLERANCE`.
    """

    derivation: Derivation
    formula_value: Radical
    projection_value: Radical | float
    difference: float
    exact: bool
    agree: bool
    zero_because: str | None


def verify(
    source: Coupling | str,
    target: Coupling | str,
    values: Mapping[str, object],
    *,
    exact: bool | None = None,
) -> Verification:
    """Evaluate the derived formula and the direct projection at ``values``; compare.

    ``values`` maps every label of both schemes to a value.  ``exact`` is passed
    to the projection (None: exact when the product basis is small).
    """
    check_flag(exact, "exact", none=True)
    a, b = as_scheme(source), as_scheme(target)
    check_pair(a, b)
    check_labels(free_labels(a, b), values)  # bad values fail before the search
    d = derive(a, b)
    value = evaluate(d.formula, values)
    reason = why_zero(d.formula, check_values(d.formula, values))
    reference = project(d.source, d.target, values, exact=exact)
    if isinstance(reference, Radical):
        difference = abs(float(value - reference))
        agree = value == reference
        is_exact = True
    else:
        difference = abs(float(value) - reference)
        agree = difference <= TOLERANCE
        is_exact = False
    return Verification(d, value, reference, difference, is_exact, agree, reason)
