"""Elementary recoupling moves on ordered coupling trees, each with its exact coefficient.

Two moves suffice to go from any scheme to any other over the same leaves:

* :class:`Exchange` swaps the two parts of one coupling; it costs a phase only,
  ``<(a b)c|(b a)c> = (-1)^(a+b-c)`` (CONVENTIONS 3.2, from CG exchange symmetry,
  Edmonds 1957 §3.5, from memory).
* :class:`RacahMove` re-associates three parts; it costs one 6j,
  ``<((X Y)e, Z)f | (X, (Y Z)g)f> = (-1)^(x+y+z+f) sqrt((2e+1)(2g+1)) {x y e; z f g}``
  (Edmonds 1957 eq. 6.1.5, from memory; equivalent to DLMF 34.5.23).

Each coefficient is an overlap of two real orthonormal bases, so it is the same
read in either direction.  Parts X, Y, Z may be whole subtrees; they enter only
through their labels x, y, z.

>>> from recouple.schemes import parse
>>> before = parse("((a,b)e,c)J")
>>> move = racah_at(before, "J", new_label="g")
>>> str(move.after)
'(a,(b,c)g)J'
>>> move.coefficient().sixjs
(('a', 'b', 'e', 'c', 'J', 'g'),)
"""

from __future__ import annotations

from dataclasses import dataclass, field

from recouple.errors import SchemeMismatch
from recouple.schemes.tree import Coupling, Node

__all__ = [
    "COSTS",
    "Coefficient",
    "Exchange",
    "Move",
    "NineJMove",
    "RacahMove",
    "exchange_at",
    "ninej_at",
    "racah_at",
]

#: Declared cost of each move: the symbols it puts into the formula and the new
#: coupling labels it creates (each created label that does not survive to the
#: end is a summation variable).  Exchanges are free.
COSTS = {
    "exchange": {"symbols": 0, "new_labels": 0},
    "racah": {"symbols": 1, "new_labels": 1},
    "ninej": {"symbols": 1, "new_labels": 2},
}


@dataclass(frozen=True, slots=True)
class Coefficient:
    """An overlap factor as data: (-1)^phase * prod sqrt(2x+1) * prod 6j.

    ``phase`` holds (label, integer coefficient) pairs of the exponent; ``hats``
    the labels whose sqrt(2x+1) appears; ``sixjs`` the 6j symbols, each as its six
    labels in textbook order ``{j1 j2 j3; l1 l2 l3}``.
    """

    phase: tuple[tuple[str, int], ...] = ()
    hats: tuple[str, ...] = ()
    sixjs: tuple[tuple[str, str, str, str, str, str], ...] = ()
    ninejs: tuple[tuple[str, str, str, str, str, str, str, str, str], ...] = ()


@dataclass(frozen=True, slots=True)
class Exchange:
    """Swap the two parts of the coupling labelled ``node``: ``(a b)c -> (b a)c``."""

    before: Coupling
    after: Coupling
    node: str
    first: str
    second: str

    kind = "exchange"

    def coefficient(self) -> Coefficient:
        """``(-1)^(a+b-c)`` with a, b the parts before the exchange (CONVENTIONS 3.2)."""
        return Coefficient(phase=((self.first, 1), (self.second, 1), (self.node, -1)))

    def describe(self) -> str:
        """A short human description, e.g. ``exchange in e``."""
        return f"exchange the parts of {self.node}"


@dataclass(frozen=True, slots=True)
class RacahMove:
    """Re-associate ``((X Y)e, Z)f`` into ``(X, (Y Z)g)f`` (or back).

    ``x, y, z`` are the labels of the three parts, ``e`` the label of the
    coupling that disappears and ``g`` the one that is created, ``f`` the parent.
    ``left_to_right`` tells which of the two shapes ``before`` has.
    """

    before: Coupling
    after: Coupling
    x: str
    y: str
    z: str
    e: str
    f: str
    g: str
    left_to_right: bool = field(default=True)

    kind = "racah"

    def coefficient(self) -> Coefficient:
        """``(-1)^(x+y+z+f) sqrt((2e+1)(2g+1)) {x y e; z f g}`` (Edmonds 6.1.5, from memory)."""
        return Coefficient(
            phase=((self.x, 1), (self.y, 1), (self.z, 1), (self.f, 1)),
            hats=(self.e, self.g),
            sixjs=((self.x, self.y, self.e, self.z, self.f, self.g),),
        )

    def describe(self) -> str:
        """A short human description naming the 6j it costs."""
        return f"6j {{{self.x} {self.y} {self.e}; {self.z} {self.f} {self.g}}}"


@dataclass(frozen=True, slots=True)
class NineJMove:
    """Recouple four parts at once: ``((A B)e, (C D)f)g -> ((A C)x, (B D)y)g``.

    Coefficient ``sqrt((2e+1)(2f+1)(2x+1)(2y+1)) {a b e; c d f; x y g}``, one 9j
    and no phase (Edmonds 1957 §6.4, from memory; CONVENTIONS 3.3).
    """

    before: Coupling
    after: Coupling
    a: str
    b: str
    c: str
    d: str
    e: str
    f: str
    g: str
    x: str
    y: str

    kind = "ninej"

    def coefficient(self) -> Coefficient:
        """``sqrt((2e+1)(2f+1)(2x+1)(2y+1)) {a b e; c d f; x y g}``."""
        return Coefficient(
            hats=(self.e, self.f, self.x, self.y),
            ninejs=((self.a, self.b, self.e, self.c, self.d, self.f, self.x, self.y, self.g),),
        )

    def describe(self) -> str:
        """A short human description naming the 9j it costs."""
        return (
            f"9j {{{self.a} {self.b} {self.e}; {self.c} {self.d} {self.f}; "
            f"{self.x} {self.y} {self.g}}}"
        )


Move = Exchange | RacahMove | NineJMove


def _replace(root: Node, label: str, new: Node) -> Node:
    """``root`` with the subtree labelled ``label`` replaced by ``new``."""
    if root.label == label:
        return new
    if isinstance(root, Coupling):
        return Coupling(
            _replace(root.left, label, new), _replace(root.right, label, new), root.label
        )
    return root


def _find(root: Node, label: str) -> Coupling:
    for node in root.nodes():
        if node.label == label and isinstance(node, Coupling):
            return node
    raise SchemeMismatch(f"no coupling labelled {label!r} in {str(root)!r}")


def _as_scheme(node: Node) -> Coupling:
    assert isinstance(node, Coupling)  # replacing inside a coupling keeps a coupling
    return node


def exchange_at(tree: Coupling, label: str) -> Exchange:
    """The exchange of the two parts of the coupling ``label``.

    >>> from recouple.schemes import parse
    >>> m = exchange_at(parse("((a,b)e,c)J"), "e")
    >>> str(m.after), m.coefficient().phase
    ('((b,a)e,c)J', (('a', 1), ('b', 1), ('e', -1)))
    """
    node = _find(tree, label)
    swapped = Coupling(node.right, node.left, node.label)
    after = _as_scheme(_replace(tree, label, swapped))
    return Exchange(tree, after, label, node.left.label, node.right.label)


def racah_at(tree: Coupling, label: str, *, new_label: str, first: bool | None = None) -> RacahMove:
    """The Racah move at the coupling ``label``, which must be ``((X Y)e, Z)f`` or ``(X,(Y Z)g)f``.

    ``first=True`` re-associates the first part, ``((X Y)e, Z)f -> (X,(Y Z)g)f``;
    ``first=False`` the second, ``(X,(Y Z)g)f -> ((X Y)e, Z)f``.  Left as None,
    the first part is taken when it is a coupling.  Use :func:`exchange_at` first
    to bring the parts into one of these shapes.

    >>> from recouple.schemes import parse
    >>> str(racah_at(parse("(a,(b,c)g)J"), "J", new_label="e").after)
    '((a,b)e,c)J'
    """
    node = _find(tree, label)
    if first is None:
        first = isinstance(node.left, Coupling)
    if first and isinstance(node.left, Coupling):
        inner = node.left
        x, y, z = inner.left, inner.right, node.right
        new = Coupling(x, Coupling(y, z, new_label), node.label)
        after = _as_scheme(_replace(tree, node.label, new))
        return RacahMove(
            tree, after, x.label, y.label, z.label, inner.label, node.label, new_label, True
        )
    if not first and isinstance(node.right, Coupling):
        inner = node.right
        x, y, z = node.left, inner.left, inner.right
        new = Coupling(Coupling(x, y, new_label), z, node.label)
        after = _as_scheme(_replace(tree, node.label, new))
        # Read right to left, this is ((X Y)new, Z)f -> (X,(Y Z)inner)f: same 6j, e and g swapped.
        return RacahMove(
            tree, after, x.label, y.label, z.label, new_label, node.label, inner.label, False
        )
    which = "first" if first else "second"
    raise SchemeMismatch(f"no Racah move at {label!r}: its {which} part is not a coupling")


def ninej_at(tree: Coupling, label: str, *, new_labels: tuple[str, str]) -> NineJMove:
    """The 9j move at ``label``, which must read ``((A B)e, (C D)f)g``.

    >>> from recouple.schemes import parse
    >>> m = ninej_at(parse("((a,b)e,(c,d)f)J"), "J", new_labels=("g", "h"))
    >>> str(m.after), m.describe()
    ('((a,c)g,(b,d)h)J', '9j {a b e; c d f; g h J}')
    """
    node = _find(tree, label)
    left, right = node.left, node.right
    if not (isinstance(left, Coupling) and isinstance(right, Coupling)):
        raise SchemeMismatch(f"no 9j move at {label!r}: both its parts must be couplings")
    x, y = new_labels
    new = Coupling(
        Coupling(left.left, right.left, x), Coupling(left.right, right.right, y), node.label
    )
    after = _as_scheme(_replace(tree, label, new))
    return NineJMove(
        tree,
        after,
        left.left.label,
        left.right.label,
        right.left.label,
        right.right.label,
        left.label,
        right.label,
        node.label,
        x,
        y,
    )
