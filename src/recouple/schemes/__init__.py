"""Coupling schemes: the tree type and the textbook notation."""

from __future__ import annotations

from recouple.schemes.notation import is_name, parse
from recouple.schemes.tree import MAX_LEAVES, Coupling, Leaf, Node, check_scheme, to_networkx

__all__ = [
    "MAX_LEAVES",
    "Coupling",
    "Leaf",
    "Node",
    "check_scheme",
    "is_name",
    "parse",
    "to_networkx",
]
