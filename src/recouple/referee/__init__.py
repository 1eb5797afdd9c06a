"""The independent referee: overlaps of coupling schemes by direct CG projection.

Nothing here uses a 6j or 9j symbol or imports :mod:`recouple.recoupling`, so
every derived formula can be checked against it.

>>> from recouple.referee import project
>>> project("(a,b)c", "(b,a)c", {"a": "1/2", "b": "1/2", "c": 1})
Radical(1)
"""

from __future__ import annotations

from recouple.referee.projection import (
    EXACT_LIMIT,
    MAX_DIMENSION,
    basis_order,
    coupled_state,
    project,
    why_zero,
)

__all__ = [
    "EXACT_LIMIT",
    "MAX_DIMENSION",
    "basis_order",
    "coupled_state",
    "project",
    "why_zero",
]
