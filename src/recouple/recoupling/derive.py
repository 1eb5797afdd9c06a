"""From two schemes to a verified formula: check, search, walk the path, simplify.

The data flows once: text -> scheme -> path of cluster sets (search) -> ordered
moves with their coefficients (this module) -> simplified :class:`Formula`.

>>> d = derive("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J")
>>> d.steps, d.optimal, d.formula.counts()
(3, True, {'sums': 0, '6j': 0, '9j': 1})
"""

from __future__ import annotations

import math
import re
import time
from collections import Counter
from dataclasses import dataclass

from recouple.errors import BadValue, SchemeMismatch, check_flag
from recouple.recoupling.compact import (
    COMPACT_BOUND_MAX_LEAVES,
    COMPACT_MAX_EXPANSIONS,
    COMPACT_MAX_LEAVES,
    COMPACT_MAX_SECONDS,
    COMPACT_SHORT_EXPANSIONS,
    compact_path,
)
from recouple.recoupling.formula import Formula, simplify
from recouple.recoupling.moves import Move, exchange_at, ninej_at, racah_at
from recouple.recoupling.search import (
    DEFAULT,
    DEFAULT_MAX_SECONDS,
    SearchResult,
    _Default,
    shortest_path,
)
from recouple.schemes.notation import parse
from recouple.schemes.tree import Coupling, Leaf, Node, check_scheme

__all__ = ["Derivation", "as_scheme", "check_pair", "derive"]

# Candidate stems for summation variables; the first whose numbered names clash
# with no label of either scheme is used, so output is the same from run to run.
_SUM_STEMS = ("x", "y", "z", "k", "u", "v", "w", "q")


@dataclass(frozen=True, slots=True)
class Derivation:
    """The result of :func:`derive`: the path of moves and the formula it yields.

    ``steps`` is the length of the shortest path of Racah moves (one 6j each),
    with ``lower_bound`` and ``optimal`` (proven shortest) from the search.
    ``formula`` is the most compact formula found: the plain path's, or, where it
    has fewer summations, that of a path that also uses 9j moves
    (:mod:`recouple.recoupling.compact`); ``path`` and ``moves`` are the path
    behind ``formula`` (``len(moves) + 1`` trees, exchanges included), and
    ``sums_on_plain_path`` counts the summations the plain path needs,
    ``compact_status`` says what the search for fewer sums found, and
    ``sums_lower_bound`` is proven: no path of Racah and 9j moves gives fewer
    summations (0 when that search did not run; never above the formula's own).
    """

    source: Coupling
    target: Coupling
    path: tuple[Coupling, ...]
    moves: tuple[Move, ...]
    steps: int
    lower_bound: int
    optimal: bool
    search: SearchResult
    formula: Formula
    sums_on_plain_path: int
    compact_status: str
    sums_lower_bound: int

    def _repr_svg_(self) -> str:
        """A drawing of the path, for notebooks (the writer lives in recouple.outputs)."""
        from recouple.outputs.drawing import path_svg

        return path_svg(self.path, [m.describe() for m in self.moves])

    @property
    def racah_moves(self) -> int:
        """Racah moves on the path behind ``formula``."""
        return sum(1 for m in self.moves if m.kind == "racah")

    @property
    def ninej_moves(self) -> int:
        """9j moves on the path behind ``formula``."""
        return sum(1 for m in self.moves if m.kind == "ninej")


def as_scheme(scheme: Coupling | str) -> Coupling:
    """A scheme from its text, or a checked scheme as given."""
    if isinstance(scheme, str):
        return parse(scheme)
    if isinstance(scheme, Coupling):
        return check_scheme(scheme)
    raise SchemeMismatch(f"expected a scheme or its text, got {type(scheme).__name__}")


def check_pair(source: Coupling, target: Coupling) -> None:
    """Raise :class:`SchemeMismatch` unless the schemes can be compared.

    They must couple the same leaves, and a name used in both must name the same
    cluster in both.

    >>> from recouple.schemes import parse
    >>> check_pair(parse("((a,b)e,c)J"), parse("((a,c)e,b)J"))
    Traceback (most recent call last):
    ...
    recouple.errors.SchemeMismatch: label 'e' names (a,b) in the first scheme, (a,c) in the second
    """
    a_leaves, b_leaves = set(source.leaves()), set(target.leaves())
    if a_leaves != b_leaves:
        only_a = ", ".join(sorted(a_leaves - b_leaves)) or "none"
        only_b = ", ".join(sorted(b_leaves - a_leaves)) or "none"
        raise SchemeMismatch(
            "the schemes couple different angular momenta: "
            f"only in the first: {only_a}; only in the second: {only_b}"
        )
    order = {leaf: i for i, leaf in enumerate(source.leaves())}

    def show(cluster: frozenset[str]) -> str:
        return "(" + ",".join(sorted(cluster, key=order.__getitem__)) + ")"

    a_named = {label: cluster for cluster, label in source.clusters().items()}
    for cluster, label in target.clusters().items():
        if label in a_named and a_named[label] != cluster:
            raise SchemeMismatch(
                f"label {label!r} names {show(a_named[label])} in the first scheme, "
                f"{show(cluster)} in the second"
            )
        if label in a_leaves:
            raise SchemeMismatch(
                f"{label!r} is a leaf of the first scheme but a label in the second"
            )


def derive(
    source: Coupling | str,
    target: Coupling | str,
    *,
    max_expansions: int | None | _Default = DEFAULT,
    max_seconds: float | None | _Default = DEFAULT,
    compact: bool = True,
) -> Derivation:
    """Find the cheapest path of moves from ``source`` to ``target`` and its formula.

    The formula is for the overlap ``<source|target>``; both schemes may be given
    as text.  ``max_expansions`` and ``max_seconds`` bound the exact search (the
    defaults are the search's own: 20 000 states and 5 s; ``None`` lifts a limit);
    past them a heuristic path is used and ``optimal`` is False.  ``max_seconds``
    covers the search for fewer sums too: it gets the time the path search left
    (at most its own 5 s safety net).  With
    ``compact`` (the default), a formula with fewer summations than the plain
    path's is looked for and used when found: with
    the full budget up to :data:`~recouple.recoupling.compact.COMPACT_MAX_LEAVES`
    leaves, a short search up to ``COMPACT_BOUND_MAX_LEAVES`` (24), which mostly
    proves a lower bound on sums (``sums_lower_bound``).

    >>> d = derive("((a,b)e,c)J", "(a,(b,c)f)J")
    >>> d.steps, [m.kind for m in d.moves]
    (1, ['racah'])
    """
    check_flag(compact, "compact")
    a, b = as_scheme(source), as_scheme(target)
    check_pair(a, b)
    leaves = a.leaves()
    bit = {leaf: 1 << i for i, leaf in enumerate(leaves)}

    def mask(cluster: frozenset[str]) -> int:
        return sum(bit[leaf] for leaf in cluster)

    full = (1 << len(leaves)) - 1
    a_masks = frozenset(m for m in map(mask, a.clusters()) if m != full)
    b_named = {mask(c): label for c, label in b.clusters().items()}
    b_masks = frozenset(m for m in b_named if m != full)
    _check_budget(max_expansions, max_seconds)
    started = time.monotonic()
    result = shortest_path(
        a_masks, b_masks, len(leaves), max_expansions=max_expansions, max_seconds=max_seconds
    )

    walk = _Walk(a, b, bit, b_named, result.path)
    formula = simplify(walk.formula())
    plain_sums = len(formula.sums)
    status = "no sums on the plain path"
    sums_bound = 0
    if formula.sums and not compact:
        status = "not searched"
    elif formula.sums and len(leaves) > COMPACT_BOUND_MAX_LEAVES:
        status = f"not searched (more than {COMPACT_BOUND_MAX_LEAVES} leaves)"
    elif formula.sums:
        budget = (
            COMPACT_MAX_EXPANSIONS
            if len(leaves) <= COMPACT_MAX_LEAVES
            else COMPACT_SHORT_EXPANSIONS
        )
        found = compact_path(
            a_masks,
            b_masks,
            len(leaves),
            below_sums=plain_sums,
            max_expansions=budget,
            max_seconds=_time_left(max_seconds, started),
        )
        status = "proven: no form with fewer sums" if found.optimal else "search out of budget"
        sums_bound = found.sums_bound
        if found.found:
            other = _Walk(a, b, bit, b_named, found.path, found.kinds)
            other_formula = simplify(other.formula())
            if _size(other_formula) < _size(formula):
                walk, formula = other, other_formula
                status = "fewer sums than the plain path" + (
                    " (proven fewest)" if found.optimal else ""
                )
    return Derivation(
        source=a,
        target=b,
        path=tuple(walk.trees),
        moves=tuple(walk.moves),
        steps=result.steps,
        lower_bound=result.lower_bound,
        optimal=result.optimal,
        search=result,
        formula=formula,
        sums_on_plain_path=plain_sums,
        compact_status=status,
        sums_lower_bound=min(sums_bound, len(formula.sums)),
    )


def _size(formula: Formula) -> tuple[int, int]:
    """How compact a formula is: summations first, then symbols."""
    return len(formula.sums), len(formula.sixjs) + len(formula.ninejs)


def _time_left(max_seconds: float | None | _Default, started: float) -> float:
    """Seconds the search for fewer sums may take: what the caller's budget has left
    (the whole derivation is bounded, not only the path search), at most the
    compact search's own safety net."""
    if max_seconds is None:
        return math.inf
    budget = DEFAULT_MAX_SECONDS if isinstance(max_seconds, _Default) else max_seconds
    return min(COMPACT_MAX_SECONDS, max(budget - (time.monotonic() - started), 0.0))


def _check_budget(max_expansions: object, max_seconds: object) -> None:
    """Refuse budgets that would silently mean something else (a negative count, NaN)."""
    if (
        max_expansions is not None
        and not isinstance(max_expansions, _Default)
        and (
            isinstance(max_expansions, bool)
            or not isinstance(max_expansions, int)
            or max_expansions < 0
        )
    ):
        raise BadValue(f"max_expansions must be a whole number >= 0, got {max_expansions!r}")
    if (
        max_seconds is not None
        and not isinstance(max_seconds, _Default)
        and (
            isinstance(max_seconds, bool)
            or not isinstance(max_seconds, int | float)
            or not math.isfinite(max_seconds)
            or max_seconds < 0
        )
    ):
        raise BadValue(f"max_seconds must be a finite number >= 0, got {max_seconds!r}")


def _node_masks(tree: Coupling, bit: dict[str, int]) -> dict[int, Node]:
    """Every node of ``tree`` by the bitmask of its leaves."""
    out: dict[int, Node] = {}

    def walk(node: Node) -> int:
        mask = bit[node.label] if isinstance(node, Leaf) else walk(node.left) | walk(node.right)
        out[mask] = node
        return mask

    walk(tree)
    return out


def _parent_of(tree: Coupling, label: str) -> Coupling:
    stack: list[Node] = [tree]
    while stack:
        node = stack.pop()
        if isinstance(node, Coupling):
            if label in (node.left.label, node.right.label):
                return node
            stack += (node.left, node.right)
    raise AssertionError(f"{label!r} has no parent")  # the search only moves non-root clusters


class _Walk:
    """Turn a sequence of cluster sets into ordered moves on real trees.

    ``kinds[i]`` says which move leads from ``path[i]`` to ``path[i + 1]``:
    ``"racah"`` (one cluster replaced) or ``"ninej"`` (two replaced).
    """

    def __init__(
        self,
        a: Coupling,
        b: Coupling,
        bit: dict[str, int],
        b_named: dict[int, str],
        path: tuple[frozenset[int], ...],
        kinds: tuple[str, ...] | None = None,
    ) -> None:
        self.a, self.b, self.bit = a, b, bit
        self.trees: list[Coupling] = [a]
        self.moves: list[Move] = []
        self.sums: list[str] = []
        self.sum_clusters: dict[str, frozenset[str]] = {}
        stem = _sum_stem(set(a.labels()) | set(b.labels()))
        kinds = kinds or ("racah",) * (len(path) - 1)
        steps = [(path[i] - path[i + 1], path[i + 1] - path[i]) for i in range(len(path) - 1)]
        for i, (removed, added) in enumerate(steps):
            labels: dict[int, str] = {}
            for cluster in sorted(added):
                # A cluster keeps the target's name only if it survives to the end;
                # anything created and destroyed later is summed over.
                survives = all(cluster not in later for later, _ in steps[i + 1 :])
                if cluster in b_named and survives:
                    labels[cluster] = b_named[cluster]
                else:
                    labels[cluster] = f"{stem}{len(self.sums) + 1}"
                    self.sums.append(labels[cluster])
            if kinds[i] == "ninej":
                self._ninej(sorted(removed), sorted(added), labels)
            else:
                (old,), (new,) = removed, added
                self._racah(old, new, labels[new])
            for cluster, label in labels.items():
                if label in self.sums:
                    self.sum_clusters[label] = frozenset(self._node(cluster).leaves())
        self._order_like(b)
        self.deltas: list[tuple[str, str]] = []
        here = {mask: node.label for mask, node in _node_masks(self.trees[-1], bit).items()}
        there = {mask: node.label for mask, node in _node_masks(b, bit).items()}
        for mask, label in there.items():
            if here[mask] != label:
                self.deltas.append((here[mask], label))

    @property
    def current(self) -> Coupling:
        return self.trees[-1]

    def _node(self, mask: int) -> Node:
        return _node_masks(self.current, self.bit)[mask]

    def _mask(self, node: Node) -> int:
        return sum(self.bit[leaf] for leaf in node.leaves())

    def _apply(self, move: Move) -> None:
        self.moves.append(move)
        self.trees.append(move.after)

    def _racah(self, removed: int, added: int, label: str) -> None:
        node = self._node(removed)
        assert isinstance(node, Coupling)
        parent = _parent_of(self.current, node.label)
        # ((X Y)e, Z)f -> (X,(Y Z)g)f when e is the first part, and
        # (Z,(Y X)e)f -> ((Z Y)g, X)f when it is the second: the part Y that joins Z
        # must stand next to Z, which one exchange inside e arranges if needed.
        first = parent.left.label == node.label
        joining = node.right if first else node.left
        if not self._mask(joining) & added:
            self._apply(exchange_at(self.current, node.label))
        self._apply(racah_at(self.current, parent.label, new_label=label, first=first))

    def _ninej(self, removed: list[int], added: list[int], labels: dict[int, str]) -> None:
        """((A B)e, (C D)f)g -> ((A C)x, (B D)y)g, with exchanges first where needed."""
        first = self._node(removed[0])
        g = _parent_of(self.current, first.label)
        x_mask, y_mask = added
        for part in (g.left, g.right):
            assert isinstance(part, Coupling)
            if not self._mask(part.left) & x_mask:  # the part joining x must come first
                self._apply(exchange_at(self.current, part.label))
        g = _parent_of(self.current, first.label)
        new_labels = (labels[x_mask], labels[y_mask])
        self._apply(ninej_at(self.current, g.label, new_labels=new_labels))

    def _order_like(self, b: Coupling) -> None:
        """Exchange parts until every coupling has its parts in the target's order."""
        for target_node in b.couplings():
            mask = self._mask(target_node)
            node = self._node(mask)
            assert isinstance(node, Coupling)
            if self._mask(node.left) != self._mask(target_node.left):
                self._apply(exchange_at(self.current, node.label))

    def formula(self) -> Formula:
        """The raw product of the move coefficients, before simplification."""
        phase: Counter[str] = Counter()
        hats: Counter[str] = Counter()
        sixjs: list[tuple[str, str, str, str, str, str]] = []
        ninejs: list[tuple[str, str, str, str, str, str, str, str, str]] = []
        for move in self.moves:
            coefficient = move.coefficient()
            for label, c in coefficient.phase:
                phase[label] += c
            hats.update(coefficient.hats)
            sixjs.extend(coefficient.sixjs)
            ninejs.extend(coefficient.ninejs)
        clusters: dict[str, frozenset[str]] = {leaf: frozenset((leaf,)) for leaf in self.a.leaves()}
        for scheme in (self.a, self.b):
            for cluster, label in scheme.clusters().items():
                clusters[label] = cluster
        clusters.update(self.sum_clusters)
        order = list(self.a.labels())
        order += [label for label in self.b.labels() if label not in order]
        order += self.sums
        return Formula(
            bra=self.a,
            ket=self.b,
            sums=tuple(self.sums),
            phase=tuple(phase.items()),
            constant=0,
            hats=tuple(hats.items()),
            sixjs=tuple(sixjs),
            ninejs=tuple(ninejs),
            deltas=tuple(self.deltas),
            clusters=tuple(clusters.items()),
            order=tuple(order),
        )


def _sum_stem(taken: set[str]) -> str:
    """A stem s such that no label of either scheme looks like s1, s2, ..."""
    for stem in _SUM_STEMS:
        pattern = re.compile(re.escape(stem) + r"\d+")
        if not any(pattern.fullmatch(label) for label in taken):
            return stem
    stem = "x_"
    while any(label.startswith(stem) for label in taken):
        stem += "_"
    return stem
