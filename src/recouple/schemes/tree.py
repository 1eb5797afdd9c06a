"""Coupling schemes as immutable binary trees.

A leaf is one angular momentum (``Leaf("j1")``); a :class:`Coupling` couples two
parts to a labelled resultant, ``(left, right)label``, with ``left`` in the first
slot of the Clebsch-Gordan coefficient (docs/conventions.md).  A *scheme* is a
:class:`Coupling` at the root; its label is the total angular momentum.

>>> from recouple.schemes.tree import Leaf, Coupling
>>> t = Coupling(Coupling(Leaf("a"), Leaf("b"), "e"), Leaf("c"), "J")
>>> str(t)
'((a,b)e,c)J'
>>> t.leaves()
('a', 'b', 'c')
>>> sorted(t.clusters().values())
['J', 'e']
"""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass
from typing import TYPE_CHECKING, TypeAlias

from recouple.errors import SchemeMismatch

if TYPE_CHECKING:  # networkx is only needed by to_networkx
    import networkx as nx

__all__ = ["MAX_LEAVES", "Coupling", "Leaf", "Node", "check_scheme", "is_name", "to_networkx"]

#: The largest number of angular momenta a scheme may couple.  Deep trees are
#: walked recursively, and no practical recoupling has more momenta than this.
MAX_LEAVES = 256


def is_name(text: str) -> bool:
    """True when ``text`` is a valid leaf or label name.

    >>> is_name("j12"), is_name("J_a"), is_name("j'"), is_name("1j"), is_name("a-b")
    (True, True, True, False, False)
    """
    if not text or not (_is_start(text[0])):
        return False
    body = text.rstrip("'")
    return all(_is_body(ch) for ch in body)


def _is_start(ch: str) -> bool:
    return ch == "_" or ("a" <= ch <= "z") or ("A" <= ch <= "Z")


def _is_body(ch: str) -> bool:
    return _is_start(ch) or ("0" <= ch <= "9")


@dataclass(frozen=True, slots=True)
class Leaf:
    """One angular momentum, named by an identifier such as ``j1`` or ``s``."""

    name: str

    @property
    def label(self) -> str:
        """A leaf's label is its name."""
        return self.name

    def leaves(self) -> tuple[str, ...]:
        """The leaf names in left-to-right order."""
        return (self.name,)

    def internal_labels(self) -> tuple[str, ...]:
        """Labels of the couplings (none for a leaf)."""
        return ()

    def labels(self) -> tuple[str, ...]:
        """All labels: leaves first, then couplings bottom-up."""
        return (self.name,)

    def nodes(self) -> Iterator[Node]:
        """Every node, children before parents."""
        yield self

    def clusters(self) -> dict[frozenset[str], str]:
        """The leaf set under each coupling, mapped to its label (none here)."""
        return {}

    def canonical(self) -> Leaf:
        """The canonical form of a leaf is itself."""
        return self

    def format(self, sep: str = ",") -> str:
        """The textbook notation."""
        return self.name

    def __str__(self) -> str:
        return self.name


@dataclass(frozen=True, slots=True)
class Coupling:
    """Two parts coupled to ``label``: ``(left, right)label``."""

    left: Node
    right: Node
    label: str

    def leaves(self) -> tuple[str, ...]:
        """The leaf names in left-to-right order."""
        return tuple(node.name for node in self.nodes() if isinstance(node, Leaf))

    def internal_labels(self) -> tuple[str, ...]:
        """Labels of the couplings, children before parents; the total comes last."""
        return tuple(node.label for node in self.nodes() if isinstance(node, Coupling))

    def labels(self) -> tuple[str, ...]:
        """All labels: the leaves in order, then the couplings bottom-up."""
        return self.leaves() + self.internal_labels()

    @property
    def total(self) -> str:
        """The label of the root: the total angular momentum."""
        return self.label

    def nodes(self) -> Iterator[Node]:
        """Every node, children before parents (post-order), left part first."""
        # An explicit stack: nested generators would cost O(depth) per node, and the
        # engine walks trees of a hundred leaves thousands of times.
        out: list[Node] = []
        stack: list[tuple[Node, bool]] = [(self, False)]
        while stack:
            node, expanded = stack.pop()
            if isinstance(node, Leaf) or expanded:
                out.append(node)
            else:
                stack.append((node, True))
                stack.append((node.right, False))
                stack.append((node.left, False))
        return iter(out)

    def couplings(self) -> Iterator[Coupling]:
        """Every coupling node, children before parents."""
        for node in self.nodes():
            if isinstance(node, Coupling):
                yield node

    def clusters(self) -> dict[frozenset[str], str]:
        """The leaf set under each coupling (the root included), mapped to its label."""
        return {frozenset(c.leaves()): c.label for c in self.couplings()}

    def triads(self) -> tuple[tuple[str, str, str], ...]:
        """``(left, right, label)`` for every coupling: the triangles the scheme needs."""
        return tuple((c.left.label, c.right.label, c.label) for c in self.couplings())

    def canonical(self) -> Coupling:
        """The same scheme with the parts of every coupling in a fixed order.

        The part holding the alphabetically smallest leaf goes first, so two
        schemes that differ only by exchanges have equal canonical forms.

        >>> from recouple.schemes.notation import parse
        >>> str(parse("(c,(b,a)e)J").canonical())
        '((a,b)e,c)J'
        """
        left, right = self.left.canonical(), self.right.canonical()
        if min(right.leaves()) < min(left.leaves()):
            left, right = right, left
        return Coupling(left, right, self.label)

    def format(self, sep: str = ",") -> str:
        """The textbook notation, with ``sep`` between the two parts."""
        return f"({self.left.format(sep)}{sep}{self.right.format(sep)}){self.label}"

    def __str__(self) -> str:
        return self.format()

    def __len__(self) -> int:
        return len(self.leaves())

    def _repr_svg_(self) -> str:
        """A drawing of the tree, for notebooks (the writer lives in recouple.outputs)."""
        from recouple.outputs.drawing import tree_svg

        return tree_svg(self)


Node: TypeAlias = "Leaf | Coupling"


def check_scheme(node: Node) -> Coupling:
    """Check that ``node`` is a valid scheme and return it.

    A scheme couples at least two leaves, and every name in it (leaf or label)
    is used once.

    >>> check_scheme(Coupling(Leaf("a"), Leaf("a"), "J"))
    Traceback (most recent call last):
    ...
    recouple.errors.SchemeMismatch: leaf 'a' is used twice in '(a,a)J'
    """
    if not isinstance(node, Coupling):
        raise SchemeMismatch(
            f"a scheme needs at least two angular momenta coupled in brackets, got {node!s}"
        )
    # A tree built by hand may hold anything; the walks below assume Leaf and Coupling.
    stack: list[object] = [node]
    while stack:
        part = stack.pop()
        if isinstance(part, Coupling):
            stack += (part.left, part.right)
        elif not isinstance(part, Leaf):
            shown = repr(part) if len(repr(part)) <= 40 else repr(part)[:37] + "..."
            raise SchemeMismatch(
                f"a scheme is built of Leaf and Coupling parts, got {type(part).__name__} {shown}"
            )
    for part in node.nodes():
        name = part.label
        if not isinstance(name, str) or not is_name(name):
            raise SchemeMismatch(
                f"{name!r} is not a valid name (a letter or '_', then letters, digits, '_', "
                "and trailing primes)"
            )
    leaves = node.leaves()
    if len(leaves) > MAX_LEAVES:
        raise SchemeMismatch(
            f"a scheme may couple at most {MAX_LEAVES} angular momenta, got {len(leaves)}"
        )
    seen: set[str] = set()
    for name in leaves:
        if name in seen:
            raise SchemeMismatch(f"leaf {name!r} is used twice in {str(node)!r}")
        seen.add(name)
    for name in node.internal_labels():
        if name in seen:
            what = "both a leaf and a coupling label" if name in leaves else "used twice as a label"
            raise SchemeMismatch(f"{name!r} is {what} in {str(node)!r}")
        seen.add(name)
    return node


def to_networkx(scheme: Coupling) -> nx.DiGraph:
    """The scheme as a ``networkx.DiGraph``: edges point from a coupling to its parts.

    Nodes are the labels; each carries ``kind`` (``"leaf"`` or ``"coupling"``),
    ``cluster`` (the leaves under it) and, on edges, ``slot`` (0 for the first part).

    >>> from recouple.schemes.notation import parse
    >>> g = to_networkx(parse("((a,b)e,c)J"))
    >>> sorted(g.successors("J")), g.nodes["e"]["cluster"]
    (['c', 'e'], ('a', 'b'))
    """
    import networkx as nx

    graph = nx.DiGraph(total=scheme.label)
    for node in scheme.nodes():
        kind = "leaf" if isinstance(node, Leaf) else "coupling"
        graph.add_node(node.label, kind=kind, cluster=node.leaves())
        if isinstance(node, Coupling):
            graph.add_edge(node.label, node.left.label, slot=0)
            graph.add_edge(node.label, node.right.label, slot=1)
    return graph
