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
from recouple.symbols.floats import (
    FLOAT_SAFE_DOUBLED,
    cg_float,
    cg_float_doubled,
    ninej_float,
    ninej_float_doubled,
    sixj_float,
    sixj_float_doubled,
    threej_float,
    threej_float_doubled,
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
    "FLOAT_SAFE_DOUBLED",
    "cg_float",
    "cg_float_doubled",
    "ninej_float",
    "ninej_float_doubled",
    "sixj_float",
    "sixj_float_doubled",
    "threej_float",
    "threej_float_doubled",
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
