"""Wigner symbols: exact values, a float fast path, and standard forms under symmetry.

>>> from recouple.symbols import sixj
>>> print(sixj(1, 1, 1, 1, 1, 1))
1/6
"""

from __future__ import annotations

from recouple.symbols.canonical import (
    canonical_ninej,
    canonical_sixj,
    ninej_arrangements,
    ninej_triads,
    sixj_arrangements,
    sixj_triads,
)
from recouple.symbols.values import (
    cg_doubled,
    clebsch_gordan,
    ninej,
    ninej_doubled,
    sixj,
    sixj_doubled,
    threej,
    threej_doubled,
)

__all__ = [
    "canonical_ninej",
    "canonical_sixj",
    "cg_doubled",
    "clebsch_gordan",
    "ninej",
    "ninej_arrangements",
    "ninej_doubled",
    "ninej_triads",
    "sixj",
    "sixj_arrangements",
    "sixj_doubled",
    "sixj_triads",
    "threej",
    "threej_doubled",
]
