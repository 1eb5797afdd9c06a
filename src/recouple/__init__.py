"""recouple: exact recoupling coefficients of angular momenta."""

from __future__ import annotations

from recouple.errors import BadValue, BudgetExceeded, NotationError, RecoupleError, SchemeMismatch
from recouple.schemes import Coupling, Leaf, parse

__version__ = "0.1.0"

__all__ = (
    "BadValue",
    "BudgetExceeded",
    "Coupling",
    "Leaf",
    "NotationError",
    "RecoupleError",
    "SchemeMismatch",
    "__version__",
    "parse",
)
