"""recouple: exact recoupling coefficients of angular momenta.

>>> import recouple
>>> d = recouple.derive("((a,b)e,c)J", "(a,(b,c)f)J")
>>> print(d.formula)
<((a,b)e,c)J|(a,(b,c)f)J> = (-1)^(a+b+c+J) sqrt((2e+1)(2f+1)) {a b e; c J f}
>>> print(recouple.sixj(1, 2, 3, 2, 1, 2))
(1/5)*sqrt(1/21)
"""

from __future__ import annotations

from recouple.errors import BadValue, BudgetExceeded, NotationError, RecoupleError, SchemeMismatch
from recouple.numbers.radicals import Radical
from recouple.numbers.spins import parse_spin
from recouple.recoupling.derive import Derivation, derive
from recouple.recoupling.formula import Formula
from recouple.recoupling.matrix import TransformationMatrix, transformation_matrix
from recouple.referee.projection import project
from recouple.schemes import Coupling, Leaf, parse
from recouple.symbols.floats import ninej_float, sixj_float
from recouple.symbols.values import clebsch_gordan, ninej, sixj, threej
from recouple.verification import Verification, verify

__version__ = "0.1.0"

__all__ = (
    "BadValue",
    "BudgetExceeded",
    "Coupling",
    "Derivation",
    "Formula",
    "Leaf",
    "NotationError",
    "Radical",
    "RecoupleError",
    "SchemeMismatch",
    "TransformationMatrix",
    "Verification",
    "__version__",
    "clebsch_gordan",
    "derive",
    "ninej",
    "ninej_float",
    "parse",
    "parse_spin",
    "project",
    "sixj",
    "sixj_float",
    "threej",
    "transformation_matrix",
    "verify",
)


def __dir__() -> list[str]:
    return list(__all__)
