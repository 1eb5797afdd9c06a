"""Exact numbers: angular-momentum values and the :class:`Radical` value type.

>>> from recouple.numbers import Radical, parse_spin
>>> print(Radical.sqrt(parse_spin("3/2") * 2 + 1))
2
"""

from __future__ import annotations

from recouple.numbers.radicals import Radical
from recouple.numbers.spins import (
    MAX_SPIN,
    coupled_range,
    is_triad,
    parse_projection,
    parse_spin,
    projections,
    spin_text,
    to_doubled,
)

__all__ = [
    "MAX_SPIN",
    "Radical",
    "coupled_range",
    "is_triad",
    "parse_projection",
    "parse_spin",
    "projections",
    "spin_text",
    "to_doubled",
]
