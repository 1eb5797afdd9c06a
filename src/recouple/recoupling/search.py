"""Shortest paths of Racah moves between coupling trees, as combinatorics on clusters.

A coupling tree of ``n`` angular momenta (leaves ``0 .. n-1``) is stored as the
``frozenset`` of its internal *non-root* clusters, each cluster an ``int`` bitmask of
the leaves below it (exactly ``n - 2`` of them; the root ``(1 << n) - 1`` and the
leaves are implicit).  Exchanging the two parts of a coupling is a phase only and is
invisible here.  One Racah move (one 6j) is a rooted nearest-neighbour interchange:
at a non-root node ``C = X | Y`` whose parent is ``P = C | Z`` it replaces ``C`` by
``X | Z`` or by ``Y | Z`` (CONVENTIONS 5.2), so every move changes exactly one cluster.

>>> source = frozenset({0b011})          # ((0 1) 2)
>>> target = frozenset({0b110})          # (0 (1 2))
>>> result = shortest_path(source, target, 3)
>>> result.steps, result.optimal, result.sums
(1, True, 0)
"""

from __future__ import annotations

import heapq
import random
import time
from bisect import bisect_left
from collections.abc import Callable, Iterable, Iterator
from dataclasses import dataclass, field
from itertools import count
from typing import NamedTuple

from recouple.errors import BadValue, BudgetExceeded

__all__ = [
    "DEFAULT_MAX_EXPANSIONS",
    "DEFAULT_MAX_SECONDS",
    "EXACT_MAX_LEAVES",
    "SearchResult",
    "children",
    "is_move",
    "lower_bound",
    "neighbours",
    "shortest_path",
    "validate_tree",
]

#: Exact search is attempted only up to this many leaves; above it the constructive
#: heuristic answers at once (random pairs there are far beyond any exact budget).
EXACT_MAX_LEAVES = 24

#: Default cap on the states the exact search expands.  Every expansion stores up to
#: 2(n-2) successors (packed key, heap entry, two dict entries: about 400 bytes
#: each), so at n = 16 this keeps the open and closed sets below about 250 MB.
DEFAULT_MAX_EXPANSIONS = 20_000

# Expansions of the first, unpruned exact try (before any heuristic runs).
_QUICK = 300

#: Default wall-clock budget of the exact search, in seconds.
DEFAULT_MAX_SECONDS = 5.0

# Lexicographic cost (moves, sums) as one integer: a move costs _MOVE, plus 1 if it
# introduces a summed label.  Sums per path never reach _MOVE (paths are far shorter).
_MOVE = 1 << 20


class _Default:
    """Marker for 'use the documented default' in keyword arguments."""

    def __repr__(self) -> str:
        return "DEFAULT"


DEFAULT = _Default()


@dataclass(frozen=True, slots=True)
class SearchResult:
    """A path of Racah moves and how it was found.

    ``path`` holds the trees from source to target inclusive; ``steps`` is the number
    of moves; ``lower_bound`` the best admissible bound known for the pair; ``optimal``
    is True only when the exact search proved the path shortest (and, among shortest
    paths, of fewest sums).  ``method`` is ``"exact"`` (A* finished: it found the
    path, or proved that none is cheaper than the heuristic's),
    ``"heuristic"`` (n above :data:`EXACT_MAX_LEAVES`, or the heuristic already met
    the lower bound) or ``"heuristic (exact search out of budget)"``.  ``expanded``,
    ``peak_open`` and ``peak_closed`` describe the exact search (zero when it did not
    run).  ``"exact (heuristic meets the bound)"`` marks a heuristic path whose moves
    and sums meet a proven lower bound on both (see :func:`_astar`).
    ``sums`` counts moves whose new cluster is not a cluster of the target: each
    introduces one summed label in the formula (CONVENTIONS 3.5).
    """

    path: tuple[frozenset[int], ...]
    steps: int
    lower_bound: int
    optimal: bool
    method: str
    expanded: int
    peak_open: int
    peak_closed: int
    sums: int


# ---------------------------------------------------------------------------
# Trees as cluster sets


def validate_tree(tree: Iterable[int], n: int, *, name: str = "tree") -> frozenset[int]:
    """Check that ``tree`` is the non-root cluster set of a binary tree on ``n`` leaves.

    Returns it as a ``frozenset``; raises :class:`~recouple.errors.BadValue` otherwise.

    >>> sorted(validate_tree({0b0011, 0b0111}, 4))
    [3, 7]
    >>> validate_tree({0b0011, 0b0110}, 4)
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: tree: clusters 0b11 and 0b110 overlap without nesting
    """
    if isinstance(n, bool) or not isinstance(n, int) or n < 1:
        raise BadValue(f"{name}: number of leaves must be a positive int, got {n!r}")
    clusters = frozenset(tree)
    root = (1 << n) - 1
    for c in clusters:
        if isinstance(c, bool) or not isinstance(c, int):
            raise BadValue(f"{name}: cluster {c!r} is not an int bitmask")
        if c <= 0 or c & ~root or c == root or c.bit_count() < 2:
            raise BadValue(f"{name}: {c!r} is not a non-root internal cluster of {n} leaves")
    if len(clusters) != max(n - 2, 0):
        raise BadValue(
            f"{name}: a binary tree on {n} leaves has {max(n - 2, 0)} non-root clusters,"
            f" got {len(clusters)}"
        )
    ordered = sorted(clusters)
    for i, a in enumerate(ordered):
        for b in ordered[i + 1 :]:
            if a & b and a & ~b and b & ~a:
                raise BadValue(f"{name}: clusters {bin(a)} and {bin(b)} overlap without nesting")
    return clusters


def _structure(clusters: Iterable[int], n: int) -> dict[int, tuple[int, int, int]]:
    """Map every non-root cluster to (parent, first child, second child).

    The first child is the one holding the lowest leaf of the cluster.  Needs a
    valid tree (laminar, n - 2 clusters), so each cluster has exactly two children.
    """
    root = (1 << n) - 1
    by_size = sorted(clusters, key=lambda c: (c.bit_count(), c))
    by_size.append(root)
    parent: dict[int, int] = {}
    covered: dict[int, int] = {}  # cluster -> union of its child clusters
    kids: dict[int, list[int]] = {}
    for i, c in enumerate(by_size[:-1]):
        for p in by_size[i + 1 :]:
            if p & c == c:
                parent[c] = p
                kids.setdefault(p, []).append(c)
                covered[p] = covered.get(p, 0) | c
                break
    out: dict[int, tuple[int, int, int]] = {}
    for c in by_size[:-1]:
        ks = kids.get(c, [])
        if len(ks) == 2:
            x, y = ks
        elif len(ks) == 1:
            x, y = ks[0], c & ~ks[0]
        else:
            x = c & -c
            y = c & ~x
        low = c & -c
        if not x & low:
            x, y = y, x
        out[c] = (parent[c], x, y)
    return out


def children(tree: frozenset[int], cluster: int, n: int) -> tuple[int, int]:
    """The two parts coupled at ``cluster`` (the root ``(1 << n) - 1`` included).

    The first part is the one holding the lowest leaf of ``cluster``.

    >>> children(frozenset({0b0011, 0b0111}), 0b1111, 4)
    (7, 8)
    >>> children(frozenset({0b0011, 0b0111}), 0b0111, 4)
    (3, 4)
    """
    root = (1 << n) - 1
    if cluster == root:
        if n < 2:
            raise BadValue(f"children: a tree on {n} leaf has no coupling")
        tops = [c for c in tree if not any(c != p and p & c == c for p in tree)]
        covered = 0
        for c in tops:
            covered |= c
        parts = tops + [1 << i for i in range(n) if not covered >> i & 1]
        x, y = sorted(parts, key=lambda c: c & -c)
        return x, y
    if cluster not in tree:
        raise BadValue(f"children: {cluster!r} is not a cluster of the tree")
    _, x, y = _structure(tree, n)[cluster]
    return x, y


def neighbours(tree: frozenset[int], n: int) -> Iterator[tuple[frozenset[int], int, int]]:
    """Every tree one Racah move away, as ``(new tree, removed cluster, added cluster)``.

    The order is fixed: removed clusters in increasing order, and for each the
    cluster joining the sibling to the part with the lowest leaf first.  There are
    2(n - 2) of them (CONVENTIONS 5.2).

    >>> [(sorted(t), old, new) for t, old, new in neighbours(frozenset({0b011}), 3)]
    [([5], 3, 5), ([6], 3, 6)]
    """
    struct = _structure(tree, n)
    for c in sorted(tree):
        p, x, y = struct[c]
        z = p & ~c
        for new in (x | z, y | z):
            yield (tree - {c}) | {new}, c, new


def is_move(before: frozenset[int], after: frozenset[int], n: int) -> bool:
    """Whether ``after`` is one Racah move away from ``before``.

    >>> is_move(frozenset({0b011}), frozenset({0b110}), 3)
    True
    >>> is_move(frozenset({0b011}), frozenset({0b011}), 3)
    False
    """
    gone = before - after
    if len(gone) != 1 or len(after - before) != 1:
        return False
    (c,) = gone
    (new,) = after - before
    p, x, y = _structure(before, n)[c]
    z = p & ~c
    return new in (x | z, y | z)


# ---------------------------------------------------------------------------
# Lower bound


def _crosses(a: int, b: int) -> bool:
    return bool(a & b and a & ~b and b & ~a)


def lower_bound(source: frozenset[int], target: frozenset[int], n: int) -> int:
    """An admissible lower bound on the number of Racah moves from source to target.

    With ``a = |C(source) - C(target)|`` (half the Robinson-Foulds distance,
    CONVENTIONS 5.3) the bound is ``2a - P``, where ``P`` is the largest number of
    clusters to remove that can each be the *last* remaining source cluster crossing
    some cluster to create, over all orders of removal (own argument, below; checked
    against brute force in tests/test_search.py).

    Proof.  Take any path.  Order the clusters ``s`` of ``source - target`` by their
    first removal.  Every target cluster ``t`` to create has a first creation, and
    these ``a`` moves each create a target cluster.  Consider the move that removes
    ``s`` for the first time.  If it creates a target cluster ``t``, then ``t`` crosses
    ``s`` (CONVENTIONS 5.2), so ``t`` was absent at the start and could not have been
    created while ``s`` was present: this is the first creation of ``t``; and every
    other source cluster crossing ``t`` is gone by then, i.e. removed earlier, so
    ``s`` is last among them in the order.  Otherwise the move creates a cluster
    outside the target.  Hence at least ``a - P`` moves create non-target clusters,
    besides the ``a`` moves creating target clusters: at least ``2a - P`` moves.
    ``P`` never exceeds the largest matching of crossing pairs, so this is at least
    the matching bound ``2a - nu``.  ``P`` is found by peeling (see :func:`_peel`)
    and an exact branch and bound over the cluster removed when no removal
    completes a target cluster (past ``_BRANCH_BUDGET``
    nodes a stuck group is charged one idle removal only, still
    admissible).

    Up to :data:`EXACT_MAX_LEAVES` the bound is tightened by what the moves
    creating target clusters need present (:func:`_needs_floor`): the bound is
    ``a + k`` with ``k`` the fewest moves creating non-target clusters, at least
    ``a - P`` and at least the clusters outside both trees that some such move needs.

    >>> lower_bound(frozenset({0b0011, 0b0111}), frozenset({0b1100, 0b1110}), 4)
    2
    """
    # Beyond the exact search's reach the bound is only reported, so it gets a small
    # branching budget: still admissible, and cheap at 100 leaves.
    budget = _BRANCH_BUDGET if n <= EXACT_MAX_LEAVES else _LARGE_BRANCH_BUDGET
    gone, new = sorted(source - target), sorted(target - source)
    moves = _order_bound(gone, new, budget)
    if n > EXACT_MAX_LEAVES:
        return moves
    return len(gone) + _needs_floor(gone, new, source | target, n, moves - len(gone))


# Sub-problems solved per stuck component before the bound settles for a floor there.
_BRANCH_BUDGET = 2000
_LARGE_BRANCH_BUDGET = 20


def _order_bound(
    gone: list[int],
    new: list[int],
    budget: int | None = None,
    memo: dict[tuple[int, ...], tuple[int, bool]] | None = None,
) -> int:
    """``2a - P`` of :func:`lower_bound` for the clusters to remove and to create.

    ``memo`` maps a stuck component (its clusters to remove, sorted) to its exact
    fewest idle removals.  The value depends only on those clusters once the target
    is fixed: a target cluster absent from a tree crosses some cluster of it (a
    binary tree is a maximal laminar family), and present ones cross none, so the
    component's edges are the target clusters crossing its members.  One search
    (one target) can therefore share it across all its states.
    """
    if budget is None:
        budget = _BRANCH_BUDGET
    a = len(gone)
    if a == 0:
        return 0
    edges: list[int] = []  # per target cluster: the removable clusters crossing it
    for t in new:
        e = 0
        for i, s in enumerate(gone):
            if s & t and s & ~t and t & ~s:
                e |= 1 << i
        edges.append(e)
    # 2a - P = a + (fewest removals that complete no target cluster)
    memo = {} if memo is None else memo
    return a + _fewest_idle(tuple(edges), gone, (1 << a) - 1, budget, memo)


def _peel(edges: tuple[int, ...], alive: int) -> tuple[int, int]:
    """Remove every cluster that now completes a target cluster, repeatedly.

    Returns (alive after peeling, idle removals forced: clusters left in no edge).
    Peeling first loses nothing: a cluster that alone is left crossing some target
    cluster scores whenever it goes, and removing it earlier only shrinks the others'
    remaining sets.
    """
    while True:
        single = 0
        used = 0
        for e in edges:
            r = e & alive
            used |= r
            if r and r & (r - 1) == 0:
                single |= r
        if not single:
            idle = alive & ~used  # in no open edge: removing them never scores
            return alive & used, idle.bit_count()
        alive &= ~single


def _fewest_idle(
    edges: tuple[int, ...],
    labels: list[int],
    alive: int,
    budget: int,
    memo: dict[tuple[int, ...], tuple[int, bool]],
) -> int:
    """Fewest removals that complete no target cluster, over all removal orders.

    After peeling, the clusters split into components (clusters linked by sharing
    an open edge) that evolve independently, so the answer is the sum over them.  A
    stuck component costs ``1 + min`` over the cluster removed idle of the value of
    what remains (peeled and split again): an exact recursion, memoised per
    component in ``memo`` (keys are the clusters ``labels`` of its members) and
    pruned by the floor of one idle removal per component.  Past ``budget``
    sub-problems per top component, an unsolved component counts its floor of one:
    still admissible, and such inexact values are never stored.
    """
    nbr = [0] * len(labels)  # per cluster: every cluster sharing an edge with it
    degree = [0] * len(labels)
    for e in edges:
        r = e
        while r:
            b = r & -r
            r ^= b
            nbr[b.bit_length() - 1] |= e
            degree[b.bit_length() - 1] += 1
    # clusters in most edges first (a good incumbent early prunes more); inside a
    # peeled component every edge through a cluster is open, so this order is fixed
    rank = [1 << i for _, i in sorted((-d, i) for i, d in enumerate(degree))]

    def components(alive: int) -> list[int]:
        out = []
        rest = alive
        while rest:
            comp = frontier = rest & -rest
            while frontier:
                b = frontier & -frontier
                frontier ^= b
                grow = nbr[b.bit_length() - 1] & alive & ~comp
                comp |= grow
                frontier |= grow
            rest &= ~comp
            out.append(comp)
        return out

    left = [0]

    def value(comp: int, cap: int) -> tuple[int, bool]:
        """(v, exact) for a peeled connected component: its fewest idle removals
        when exact, else a lower bound (at least ``cap`` unless out of budget)."""
        key = []
        r = comp
        while r:
            b = r & -r
            r ^= b
            key.append(labels[b.bit_length() - 1])
        k = tuple(key)
        lo_known, exact_known = memo.get(k, (1, False))
        if exact_known or lo_known >= cap:
            return lo_known, exact_known
        left[0] -= 1
        if left[0] < 0:  # give up exactness here: keep the floor
            return lo_known, False
        local = tuple(e & comp for e in edges if e & comp)
        best = comp.bit_count()  # removing everything idle is always possible
        lo = best  # least lower bound over the first removals tried
        for b in rank:
            if not b & comp:
                continue
            bound = min(best, cap)
            rest, idle = _peel(local, comp & ~b)
            subs = components(rest)
            total = 1 + idle + len(subs)  # each sub-component costs at least one
            exact = True
            for c in subs:
                if total >= bound:
                    exact = False  # cut off: total is only a lower bound
                    break
                v, ok = value(c, bound - total + 1)
                exact = exact and ok
                total += v - 1
            if exact and total < best:
                best = total  # all parts exact: this removal order is achievable
            lo = min(lo, total)
            if best <= 1:  # one idle removal per stuck component is the floor
                lo = 1
                break
        lo = max(lo, lo_known)
        exact = lo >= best
        memo[k] = (best, True) if exact else (lo, False)
        return (best, True) if exact else (lo, False)

    alive, total = _peel(edges, alive)
    for comp in components(alive):
        left[0] = budget
        total += value(comp, comp.bit_count())[0]
    return total


def _needs_floor(gone: list[int], new: list[int], known: frozenset[int], n: int, floor: int) -> int:
    """Fewest moves creating non-target clusters, at least ``floor``: ``k`` of the proof.

    ``known`` holds the clusters of the current tree and of the target.  A move that
    removes ``s = X | Y`` (sibling ``Z``, parent ``P``) and creates ``t = X | Z`` needs
    ``X = s & t``, ``Y = s - t``, ``Z = t - s`` and ``P = s | t`` present at that
    moment (CONVENTIONS 5.2).  Those that are neither leaves, the root, nor in
    ``known`` exist only if some earlier move created them, and that move creates a
    non-target cluster.  With the pairs ``M`` of the proof of :func:`lower_bound`
    (first removal of ``s`` creating ``t``: a matching of crossing pairs), every path
    has ``k >= a - |M|`` (the other first removals each create a non-target cluster)
    and ``k >= |N(M)|``, the distinct clusters needed by the pairs of ``M`` (each is
    created at least once, by a move creating a non-target cluster).  So ``k`` is at
    least the least ``max(a - |M|, |N(M)|)`` over all matchings ``M``, found here by
    branch and bound (own argument; checked against brute force in
    tests/test_search.py).  Past ``_NEEDS_BUDGET`` units of work it returns ``floor``,
    the order bound's ``a - P``, which is admissible on its own.

    Sharper: count created clusters as instances.  One instance per cluster of
    ``N(M)``; ``E`` others.  Each of the ``a - |M|`` other first removals creates its
    own instance, crossing the removed cluster, and each target cluster left out of
    ``M`` is first created by removing its own instance, crossing it; at most a
    matching of them can be instances of ``N(M)``, so ``E`` is at least ``a - |M|``
    minus either matching.  And if ``E = 0`` every present cluster is a leaf, the
    root, known or in ``N(M)``, so both assignments must exist with the four sets of
    each of their moves among those: else ``E >= 1``.  So ``k >= |N(M)| + E``, which
    is at least ``max(a - |M|, |N(M)|)`` (see :func:`_extra_instances`).

    Only matchings whose pairs can happen in some order count.  When the pair
    ``(s, t)`` fires, ``t`` (just after), ``X``, ``Y``, ``Z`` and ``P`` are present,
    so no cluster crossing one of them is (a tree's clusters never cross); a cluster
    ``c`` of ``gone`` other than ``s`` crossing one of them has therefore had its first
    removal already.  If ``c`` is in a pair of ``M`` too, that pair's move (the first
    removal of ``c``) comes first.  A cycle of such "comes first" relations is
    impossible, so ``M`` of every path is free of them (own argument; the brute force
    of tests/test_search.py states it independently).
    """
    a = len(gone)
    if a == 0:
        return 0
    problem = _needs_options(gone, new, known, n)
    # k <= v iff some matching leaves at most v of the a target clusters unmatched
    # (a - |M| <= v) and needs at most v clusters; try v upwards from the floor.
    left = [_NEEDS_BUDGET]  # shared by the tests: one budget per bound
    for v in range(max(floor, 0), a):
        found = _needs_fit(problem, v, left)
        if found is None:
            return max(floor, v)  # every smaller v was refuted: still a bound
        if found:
            return v
    return a


class _Needs(NamedTuple):
    """One needs problem (see :func:`_needs_floor`).  ``options[j]`` lists, for the
    target cluster ``new[j]``, its crossing clusters to remove (bits of ``gone``) with
    the bitmask of the clusters that pair needs (bits of ``needed``); ``before[j]``
    maps each such removal bit to the clusters of ``gone`` (bits) that must be
    removed before that pair's move."""

    options: list[list[tuple[int, int]]]
    before: list[dict[int, int]]
    needed: list[int]
    gone: list[int]
    new: list[int]
    known: frozenset[int]
    root: int


def _needs_options(gone: list[int], new: list[int], known: frozenset[int], n: int) -> _Needs:
    """The needs problem of a tree (clusters ``known`` with the target's)."""
    root = (1 << n) - 1
    ids: dict[int, int] = {}
    options: list[list[tuple[int, int]]] = []
    before: list[dict[int, int]] = []
    for t in new:
        opts = []
        first: dict[int, int] = {}
        for i, s in enumerate(gone):
            if s & t and s & ~t and t & ~s:
                need = 0
                here = [t]  # present at the move (besides leaves and the root)
                for w in (s & t, s & ~t, t & ~s, s | t):
                    if w & (w - 1) and w != root:
                        here.append(w)
                        if w not in known:
                            need |= 1 << ids.setdefault(w, len(ids))
                opts.append((1 << i, need))
                early = 0
                for c, g in enumerate(gone):
                    if c != i:
                        for w in here:
                            if g & w and g & ~w and w & ~g:
                                early |= 1 << c
                                break
                first[1 << i] = early
        opts.sort(key=lambda o: o[1].bit_count())
        options.append(opts)
        before.append(first)
    return _Needs(options, before, list(ids), gone, new, known, root)


def _needs_fit(
    problem: _Needs, v: int, left: list[int] | None = None, deadline: float | None = None
) -> bool | None:
    """Whether ``k <= v`` is possible: some matching leaves at most ``v`` target
    clusters unmatched, needs at most ``v`` clusters, and passes
    :func:`_extra_instances`; None when out of budget (``left[0]`` units of work,
    :data:`_NEEDS_BUDGET` if not given, or past the ``time.monotonic()`` ``deadline``).

    The test without the instance count runs first: it prunes harder and often
    settles the question alone."""
    if left is None:
        left = [_NEEDS_BUDGET]
    loose = _needs_search(problem, v, left, False, deadline)
    if not loose:
        return loose
    # the instance count refutes more but costs more: a smaller share of the budget
    share = [min(left[0], _COUNT_BUDGET)]
    found = _needs_search(problem, v, share, True, deadline)
    left[0] -= min(left[0], _COUNT_BUDGET) - share[0]
    return found


def _needs_search(
    problem: _Needs, v: int, left: list[int], count: bool, deadline: float | None = None
) -> bool | None:
    """The branch and bound of :func:`_needs_fit`; ``count``: apply
    :func:`_extra_instances` to each complete matching."""
    options = problem.options
    before = problem.before
    failed: set[tuple[int, int, int]] = set()
    a = len(problem.gone)
    chosen: dict[int, int] = {}  # removal bit of each pair so far -> its `before` mask

    def in_order(bit: int, early: int, used: int) -> bool:
        """Whether the pair (removal ``bit``, removals ``early`` before it) keeps the
        pairs chosen so far free of a cycle of "removed before"."""
        preds = early & used
        if not preds:
            return True
        # from the chosen pairs that must come after this one, follow "after" edges
        todo = [q for q, e in chosen.items() if e & bit]
        seen = 0
        while todo:
            q = todo.pop()
            if q & preds:
                return False
            if not seen & q:
                seen |= q
                todo.extend(r for r, e in chosen.items() if e & q and not seen & r)
        return True

    def complete(used: int, need: int, matched: int) -> bool | None:
        """Whether a complete matching passes (``k <= v`` with its ``E``)."""
        room = v - need.bit_count()
        idle = a - used.bit_count()
        if not count or idle <= room:  # E never exceeds the idle removals
            return True
        left[0] -= a * (need.bit_count() + 1)  # the matchings of _extra_instances
        if left[0] < 0:
            return None
        return _extra_instances(problem, used, matched, need) <= room

    def fits(rest: int, used: int, skips: int, need: int, matched: int, pairs: int) -> bool | None:
        """Whether the target clusters in ``rest`` can be matched with at most
        ``v - skips`` more skipped; branches on the one with the fewest options that fit.
        ``pairs`` encodes the pairs so far (which removal each target took): the order
        test depends on them, not only on ``used`` and ``matched``."""
        if not rest:
            return complete(used, need, matched)
        key = (rest, need, pairs)
        if key in failed:
            return False
        left[0] -= rest.bit_count()  # the work of one branch grows with what is left
        if left[0] < 0 or (deadline is not None and time.monotonic() > deadline):
            return None  # one test can take a second at 16 leaves: keep to the clock
        best_fit: list[tuple[int, int]] | None = None
        best_t = 0
        dead = skips  # clusters with no option that fits must be skipped
        costly: list[list[tuple[int, int]]] = []  # options of clusters with no free one
        r = rest
        while r:
            b = r & -r
            r ^= b
            fit = [
                (bit, more | need)
                for bit, more in options[b.bit_length() - 1]
                if not used & bit and (more | need).bit_count() <= v
            ]
            if not fit:
                dead += 1
                if dead > v:
                    failed.add(key)
                    return False
                rest ^= b
                continue
            if best_fit is None or len(fit) < len(best_fit):
                best_fit, best_t = fit, b
            for _, more in fit:
                if more == need:
                    break
            else:
                costly.append(fit)
        if best_fit is None:  # every remaining cluster skipped, within the allowance
            return complete(used, need, matched)
        if len(costly) > v - dead:
            # Each costly cluster is skipped or matched by an option adding new needed
            # clusters (room for v - |need| of them).  Charge a matched cluster 1/m to
            # each of the m clusters its option adds: a new cluster w then carries at
            # most the sum over costly clusters of their best 1/m through w, so the
            # number matched is at most the sum of the largest `room` such capacities.
            capacity: dict[int, int] = {}
            for fit in costly:
                shares: dict[int, int] = {}  # new cluster -> best share of this cluster
                for _, more in fit:
                    extra = more & ~need
                    share = _SHARE[extra.bit_count()]
                    while extra:
                        w = extra & -extra
                        extra ^= w
                        if shares.get(w, 0) < share:
                            shares[w] = share
                for w, share in shares.items():
                    capacity[w] = capacity.get(w, 0) + share
            room = v - need.bit_count()
            served = sum(sorted(capacity.values(), reverse=True)[:room])
            if (len(costly) - (v - dead)) * _SHARE[1] > served:
                failed.add(key)
                return False
        j = best_t.bit_length() - 1
        first = before[j]
        for bit, more in best_fit:
            early = first[bit]
            if not in_order(bit, early, used):
                continue  # the pairs would have to happen before each other
            chosen[bit] = early
            found = fits(
                rest ^ best_t,
                used | bit,
                dead,
                more,
                matched | best_t,
                pairs | (j + 1) << (_PAIR_BITS * (bit.bit_length() - 1)),
            )
            del chosen[bit]
            if found is not False:
                return found
        if dead < v:
            found = fits(rest ^ best_t, used, dead + 1, need, matched, pairs)
            if found is not False:
                return found
        failed.add(key)
        return False

    return fits((1 << len(options)) - 1, 0, 0, 0, 0, 0)


def _extra_instances(problem: _Needs, used: int, matched: int, need: int) -> int:
    """A lower bound on ``E`` of :func:`_needs_floor` for one matching ``M``.

    ``used`` and ``matched`` are its removed and created clusters (bits of ``gone``
    and ``new``), ``need`` its needed clusters (bits of ``needed``).
    """
    gone, new, needed = problem.gone, problem.new, problem.needed
    idle = [s for i, s in enumerate(gone) if not used >> i & 1]
    if not idle:
        return 0
    x = len(idle)
    made = [w for i, w in enumerate(needed) if need >> i & 1]
    lone = [t for j, t in enumerate(new) if not matched >> j & 1]
    # loose: an idle removal creates, and a lone target is made from, a crossing cluster
    extra = max(x - _assign(idle, made, _crosses), x - _assign(lone, made, _crosses))
    if extra >= 1:
        return extra
    # E = 0 would need both assignments with every set of their moves present
    present = set(made) | problem.known
    root = problem.root

    def fine(s: int, w: int) -> bool:
        if not _crosses(s, w):
            return False
        for q in (s & w, s & ~w, w & ~s, s | w):
            if q & (q - 1) and q != root and q not in present:
                return False
        return True

    if _assign(idle, made, fine) < x or _assign(lone, made, fine) < x:
        return 1
    return 0


def _assign(left: list[int], right: list[int], ok: Callable[[int, int], bool]) -> int:
    """Size of a maximum matching between ``left`` and ``right`` along ``ok``.

    >>> _assign([1, 2], [3], lambda a, b: True)
    1
    """
    owner: dict[int, int] = {}  # right index -> left index

    def augment(i: int, seen: set[int]) -> bool:
        for j, r in enumerate(right):
            if j not in seen and ok(left[i], r):
                seen.add(j)
                if j not in owner or augment(owner[j], seen):
                    owner[j] = i
                    return True
        return False

    return sum(1 for i in range(len(left)) if augment(i, set()))


# Bits per removal in the pairing key of _needs_search (target index + 1 < 32).
_PAIR_BITS = 5

# 1/m in units of 1/12 (an option adds at most 4 clusters), for exact integer sums.
_SHARE = (0, 12, 6, 4, 3)

# Work of _needs_floor per bound (target clusters looked at, summed over branches)
# before it settles for the order bound's floor: about 10 000 branches at 12 leaves.
_NEEDS_BUDGET = 100_000
# Of which the instance count of _needs_fit may use at most this much per test.
_COUNT_BUDGET = 15_000


# ---------------------------------------------------------------------------
# Exact search (A*)


def _sums_of(path: tuple[frozenset[int], ...], target: frozenset[int]) -> int:
    return sum(1 for a, b in zip(path, path[1:], strict=False) for c in b - a if c not in target)


class _OutOfBudget(Exception):
    """The exact search ran out of budget; ``cost`` (packed moves and sums, see
    :func:`_astar`) is a proven lower bound on the cost, ``bound`` its moves."""

    def __init__(self, cost: int) -> None:
        super().__init__(cost)
        self.cost = cost
        self.bound = cost // _MOVE


@dataclass(slots=True)
class _BoundCache:
    """Bounds towards one target, keyed by the clusters still to remove: the best
    proven bound on the moves (raised lazily by :func:`_astar`), the order bound, and
    component values of :func:`_fewest_idle`."""

    trees: dict[tuple[int, ...], int] = field(default_factory=dict)
    orders: dict[tuple[int, ...], int] = field(default_factory=dict)
    parts: dict[tuple[int, ...], tuple[int, bool]] = field(default_factory=dict)


@dataclass(slots=True)
class _Stats:
    expanded: int = 0
    peak_open: int = 0
    peak_closed: int = 0


def _astar(
    source: frozenset[int],
    target: frozenset[int],
    n: int,
    max_expansions: int | None,
    deadline: float | None,
    limit: int | None,
    stats: _Stats,
    cache: _BoundCache | None = None,
) -> tuple[frozenset[int], ...] | None:
    """A* on the lexicographic cost (moves, sums), packed as ``moves * _MOVE + sums``.

    States are packed keys: the sorted clusters, n bits each, in one int.  The bound
    of :func:`lower_bound` is admissible but not known to be consistent, so a closed
    state is reopened when reached more cheaply (A* stays optimal with reopening).
    A successor's bound is first estimated as its parent's minus one (pathmax:
    admissible, since neighbours' distances differ by at most one) and the real
    bound is computed only when it reaches the top of the heap; the larger is used.
    The bound covers sums too: with ``h`` moves at least (``lower_bound``), at least
    ``h - a`` of them create a non-target cluster, ``a = |C(tree) - C(target)|``
    (the idle removals in the proof of :func:`lower_bound`), and each such move is
    one sum; so ``h * _MOVE + h - a`` is admissible for the packed cost.  Paths of
    packed cost ``limit`` or more are pruned; None means there is no cheaper path.
    Raises :class:`_OutOfBudget` with the smallest open f, a proven lower bound.
    ``cache`` keeps bounds for later searches towards the same target.
    """
    m = max(n - 2, 0)
    width = n
    fmask = (1 << width) - 1
    shifts = [width * k for k in range(m)]

    def pack(cl: list[int]) -> int:
        key = 0
        for sh, c in zip(shifts, cl, strict=False):
            key |= c << sh
        return key

    def unpack(key: int) -> list[int]:
        return [(key >> sh) & fmask for sh in shifts]

    start = pack(sorted(source))
    goal = pack(sorted(target))
    tgt = target
    tgt_list = sorted(target)
    known = frozenset(target)

    if cache is None:
        cache = _BoundCache()
    parts = cache.parts  # component values shared by all states
    bounds = cache.trees  # clusters to remove -> proven bound on the moves
    orders = cache.orders  # clusters to remove -> the order bound (moves)

    def raise_bound(cl: list[int], need: int) -> int:
        """A proven bound on the moves from ``cl``, above ``need`` when the order or
        needs bound shows it (else the state may be expanded at this f).

        Bounds are raised lazily: A* only asks whether a state's bound exceeds the
        value that would let it be expanded now, and each question is one test of
        :func:`_needs_fit` (the costly part) rather than the whole bound.
        """
        gone_key = tuple(c for c in cl if c not in tgt)
        lo = bounds.get(gone_key)
        if lo is not None and lo > need:
            return lo
        a = len(gone_key)
        have = set(cl)
        new = [c for c in tgt_list if c not in have]
        gone = list(gone_key)
        # cheapest first: the order bound with one idle removal per stuck group, then
        # one test of the needs bound, then the full order bound
        if lo is None:
            lo = _order_bound(gone, new, 0, parts)
        # is k <= need - a possible?  If not, the bound exceeds need.
        fits: bool | None = None
        if lo <= need and need - a < a:
            problem = _needs_options(gone, new, known | have, n)
            fits = _needs_fit(problem, need - a, None, deadline)
            if fits is False:
                lo = need + 1
        # A matching that passes the needs test is ordered, so its pairs can each be the
        # last source cluster crossing their target (idle removals first): P >= a - k,
        # and the full order bound 2a - P cannot exceed need.  Skip it then.
        if lo <= need and fits is not True:
            order = orders.get(gone_key)
            if order is None:
                order = orders[gone_key] = _order_bound(gone, new, _BRANCH_BUDGET, parts)
            lo = max(lo, order)
        bounds[gone_key] = lo
        return lo

    def packed(moves: int, a: int) -> int:
        return moves * _MOVE + moves - a

    counter = count()
    best_g: dict[int, int] = {start: 0}
    came: dict[int, int] = {}
    closed: set[int] = set()
    closed_g: dict[int, int] = {}
    # the start's bound is raised lazily like any other state's
    a0 = len(source - target)
    h0 = packed(_order_bound(sorted(source - target), sorted(target - source), 0, parts), a0)
    if limit is not None and h0 >= limit:
        return None
    # entries: f, -moves, tie, state, g, checked (the bound was tested at this f)
    heap: list[tuple[int, int, int, int, int, bool]] = [(h0, 0, next(counter), start, 0, False)]
    push = heapq.heappush
    pop = heapq.heappop
    while heap:
        f, neg_moves, _, key, g, checked = pop(heap)
        if deadline is not None and time.monotonic() > deadline:  # a pop can cost 100 ms
            raise _OutOfBudget(f)
        if g > best_g[key] or (key in closed and g == closed_g[key]):
            continue
        cl = unpack(key)
        if not checked:
            # pathmax: the estimate (parent's bound minus the step) is admissible too;
            # need: the most moves a bound may show with g + bound still <= f
            a = sum(1 for c in cl if c not in tgt)
            moves = raise_bound(cl, (f - g + a) // (_MOVE + 1))
            f2 = g + packed(moves, a)
            if f2 > f:
                if limit is None or f2 < limit:
                    push(heap, (f2, neg_moves, next(counter), key, g, False))
                continue
        if key == goal:
            path = [key]
            while path[-1] != start:
                path.append(came[path[-1]])
            return tuple(frozenset(unpack(k)) for k in reversed(path))
        if max_expansions is not None and stats.expanded >= max_expansions:
            raise _OutOfBudget(f)
        closed.add(key)
        closed_g[key] = g
        stats.expanded += 1
        stats.peak_closed = len(closed)
        struct = _structure(cl, n)
        for i, c in enumerate(cl):
            p, x, y = struct[c]
            z = p & ~c
            rest = cl[:i] + cl[i + 1 :]
            for new in (x | z, y | z):
                g2 = g + (_MOVE if new in tgt else _MOVE + 1)
                f2 = f if f > g2 else g2  # their bound is at least this one minus the step
                if limit is not None and f2 >= limit:
                    continue
                j = bisect_left(rest, new)
                k2 = pack(rest[:j] + [new] + rest[j:])
                if best_g.get(k2, g2 + 1) <= g2:
                    continue  # a closed state is reopened when reached more cheaply
                best_g[k2] = g2
                came[k2] = key
                push(heap, (f2, neg_moves - 1, next(counter), k2, g2, False))
        if len(heap) > stats.peak_open:
            stats.peak_open = len(heap)
    return None


# ---------------------------------------------------------------------------
# Constructive heuristic


class _Work:
    """A mutable tree (parent and children of every node) for the constructive heuristic.

    Nodes are bitmasks: leaves ``1 << i``, internal clusters, and the root.
    """

    __slots__ = ("kids", "moves", "n", "parent", "root", "target", "tkids")

    def __init__(self, tree: frozenset[int], target: frozenset[int], n: int) -> None:
        self.n = n
        self.root = (1 << n) - 1
        self.target = target
        self.parent: dict[int, int] = {}
        self.kids: dict[int, tuple[int, int]] = {}
        for c, (p, x, y) in _structure(tree, n).items():
            self.parent[c] = p
            self.kids[c] = (x, y)
        self.kids[self.root] = children(tree, self.root, n)
        for c, (x, y) in list(self.kids.items()):
            self.parent[x] = c
            self.parent[y] = c
        tk = {c: (x, y) for c, (p, x, y) in _structure(target, n).items()}
        tk[self.root] = children(target, self.root, n)
        self.tkids = tk
        self.moves: list[tuple[int, int]] = []

    def apply(self, c: int, new: int) -> None:
        p = self.parent[c]
        x, y = self.kids[c]
        a, b = self.kids[p]
        z = b if a == c else a
        if new == x | z:
            keep, stay = x, y
        else:
            keep, stay = y, x
        del self.kids[c]
        del self.parent[c]
        self.kids[new] = (keep, z)
        self.parent[keep] = new
        self.parent[z] = new
        self.parent[new] = p
        self.kids[p] = (new, stay)
        self.parent[stay] = p
        self.moves.append((c, new))

    def undo(self) -> None:
        c, new = self.moves.pop()
        p = self.parent[new]
        keep, z = self.kids[new]
        a, b = self.kids[p]
        stay = b if a == new else a
        del self.kids[new]
        del self.parent[new]
        self.kids[c] = (keep, stay)
        self.parent[keep] = c
        self.parent[stay] = c
        self.parent[c] = p
        self.kids[p] = (c, z)
        self.parent[z] = p

    def perfect_moves(self) -> list[tuple[int, int]]:
        """Moves that remove a non-target cluster and create a target cluster."""
        out = []
        tgt = self.target
        root = self.root
        for c, (x, y) in self.kids.items():
            if c == root or c in tgt:
                continue
            p = self.parent[c]
            a, b = self.kids[p]
            z = b if a == c else a
            if x | z in tgt:
                out.append((c, x | z))
            elif y | z in tgt:
                out.append((c, y | z))
        return out

    def join_path(self, d: int) -> list[int]:
        """Internal nodes strictly between the two target parts of ``d``, LCA excluded."""
        d1, d2 = self.tkids[d]
        up1 = [d1]
        while up1[-1] != self.root:
            up1.append(self.parent[up1[-1]])
        on1 = set(up1)
        up2 = [d2]
        while up2[-1] not in on1:
            up2.append(self.parent[up2[-1]])
        lca = up2[-1]
        return up1[1 : up1.index(lca)] + up2[1:-1]


def _heuristic_run(
    source: frozenset[int], target: frozenset[int], n: int, rng_seed: int
) -> list[tuple[int, int]]:
    """One greedy construction of the target, bottom-up; returns the moves."""
    rng = random.Random(rng_seed)
    lookahead = n <= 40
    w = _Work(source, target, n)
    while True:
        perfect = w.perfect_moves()
        if perfect:
            if rng_seed and len(perfect) > 1:
                c, new = perfect[rng.randrange(len(perfect))]
            else:
                c, new = min(perfect)
            w.apply(c, new)
            continue
        # Target clusters whose two target parts are both present, not yet formed.
        ready = [
            d
            for d, (d1, d2) in w.tkids.items()
            if d != w.root and d not in w.kids and d1 in w.parent and d2 in w.parent
        ]
        if not ready:  # every target cluster is formed: the tree is the target
            break
        # The target part pair closest together in the current tree goes first.
        lengths = {d: w.join_path(d) for d in ready}
        d = min(ready, key=lambda e: (len(lengths[e]), rng.random() if rng_seed else e))
        best: tuple[tuple[int, float], int, int] | None = None
        d1, d2 = w.tkids[d]
        for u in lengths[d]:
            x, y = w.kids[u]
            # u holds exactly one of d1, d2; its other part leaves the path
            off = y if (x & d1 == d1 or x & d2 == d2) else x
            p = w.parent[u]
            a, b = w.kids[p]
            z = b if a == u else a
            new = off | z
            gain = 0
            if lookahead:  # how many target clusters become one move away
                w.apply(u, new)
                gain = len(w.perfect_moves())
                w.undo()
            score = (-gain, rng.random() if rng_seed else 0.0)
            if best is None or score < best[0]:
                best = (score, u, new)
        assert best is not None
        _, u, new = best
        w.apply(u, new)
        if len(w.moves) > 4 * n * n:  # cannot happen: every move removes a non-target cluster
            raise BudgetExceeded(f"heuristic: no path after {len(w.moves)} moves (n={n})")
    return w.moves


def _trees_of(source: frozenset[int], moves: list[tuple[int, int]]) -> list[frozenset[int]]:
    trees = [source]
    for c, new in moves:
        trees.append((trees[-1] - {c}) | {new})
    return trees


def _shorten(trees: list[frozenset[int]], n: int) -> list[frozenset[int]]:
    """Local improvement: cut cycles, then replace windows of the path by exact shortcuts.

    Each window ``trees[i] .. trees[i + w]`` is searched exactly for a path of at
    most ``w - 1`` moves with a small budget; a hit is spliced in and the scan
    restarts.  The work is capped by a count of window searches, not by the clock,
    so the path does not depend on how busy the machine is (a fraction of a
    second at 24 leaves).
    """
    trees = _cut_cycles(trees)
    # wider windows pay off where the bound prunes them quickly (up to 16 leaves)
    widths = (3, 4, 5, 6, 7, 8, 10, 12) if n <= 16 else (3, 4, 5, 6, 7, 8)
    searches = 0
    improved = True
    while improved:
        improved = False
        for w in widths:
            i = 0
            while i + w < len(trees):
                searches += 1
                if searches > _SHORTEN_SEARCHES:
                    return trees
                try:
                    sub = _astar(trees[i], trees[i + w], n, 300, None, w * _MOVE, _Stats())
                except _OutOfBudget:
                    sub = None
                if sub is not None:
                    trees = _cut_cycles(trees[:i] + list(sub) + trees[i + w + 1 :])
                    improved = True
                i += 1
    return trees


# Window searches of _shorten at most (a few thousand suffice at 24 leaves).
_SHORTEN_SEARCHES = 5000


def _cut_cycles(trees: list[frozenset[int]]) -> list[frozenset[int]]:
    """Drop the stretch between two visits of the same tree."""
    last = {t: i for i, t in enumerate(trees)}
    out: list[frozenset[int]] = []
    i = 0
    while i < len(trees):
        out.append(trees[i])
        i = last[trees[i]] + 1
    return out


def _heuristic(source: frozenset[int], target: frozenset[int], n: int) -> list[frozenset[int]]:
    """Best of a few greedy constructions, then local improvement (up to 40 leaves).

    The construction also runs from the target back to the source (moves are
    reversible), and the shorter path (then the one of fewer sums) is kept: the two
    directions often differ by several moves (by 10-25 % at 30 leaves).  A fixed
    amount of work, not a time budget: the same pair always gets the same path.
    """
    forward = _one_way(source, target, n)
    backward = list(reversed(_one_way(target, source, n)))

    def cost(path: list[frozenset[int]]) -> tuple[int, int]:
        return len(path), _sums_of(tuple(path), target)

    return backward if cost(backward) < cost(forward) else forward


def _one_way(source: frozenset[int], target: frozenset[int], n: int) -> list[frozenset[int]]:
    """The greedy constructions from ``source`` towards ``target``, the best shortened."""
    runs = 8 if n <= 24 else 4 if n <= 40 else 1
    best: list[tuple[int, int]] | None = None
    for seed in range(runs):
        moves = _heuristic_run(source, target, n, seed)
        if best is None or len(moves) < len(best):
            best = moves
    assert best is not None
    trees = _trees_of(source, best)
    if n <= _SHORTEN_MAX_LEAVES:
        trees = _shorten(trees, n)
    return trees


# Local improvement runs up to this many leaves: it costs about 0.5 s a direction at 40
# leaves for a few per cent, 4 s at 100 leaves for 3 %.
_SHORTEN_MAX_LEAVES = 40


def shortest_path(
    source: frozenset[int],
    target: frozenset[int],
    n: int,
    *,
    max_expansions: int | None | _Default = DEFAULT,
    max_seconds: float | None | _Default = DEFAULT,
) -> SearchResult:
    """Fewest Racah moves from ``source`` to ``target``; among those, fewest sums.

    Exact A* with the bound of :func:`lower_bound` for ``n <= EXACT_MAX_LEAVES``
    (24), within ``max_expansions`` expanded states (default
    :data:`DEFAULT_MAX_EXPANSIONS` = 20 000, about 250 MB at most at n = 16)
    and ``max_seconds`` (default :data:`DEFAULT_MAX_SECONDS` = 5 s); ``None`` lifts
    a budget.  The result is deterministic.

    A short unpruned try comes first; if it does not finish, the constructive
    heuristic (a fixed amount of work, so its path never depends on the clock)
    gives a path, and A* then looks only for strictly cheaper paths (moves, then
    sums): finding none proves the heuristic path optimal.  Bounds cover sums as
    well as moves (see :func:`_astar`).

    >>> chain = frozenset({0b0011, 0b0111})      # (((0 1) 2) 3)
    >>> rev = frozenset({0b1100, 0b1110})        # (0 (1 (2 3)))
    >>> r = shortest_path(chain, rev, 4)
    >>> r.steps, r.optimal, r.method, [sorted(t) for t in r.path]
    (2, True, 'exact', [[3, 7], [3, 12], [12, 14]])
    """
    source = validate_tree(source, n, name="source")
    target = validate_tree(target, n, name="target")
    if isinstance(max_expansions, _Default):
        max_expansions = DEFAULT_MAX_EXPANSIONS
    if isinstance(max_seconds, _Default):
        max_seconds = DEFAULT_MAX_SECONDS
    start = time.monotonic()
    lb = lower_bound(source, target, n)
    # packed (moves, sums) lower bound: at least lb - a of the moves are sums (_astar)
    lb_cost = lb * _MOVE + lb - len(source - target)
    deadline = None if max_seconds is None else start + max_seconds
    stats = _Stats()
    cache = _BoundCache()  # both exact tries search towards the same target
    cache.trees[tuple(sorted(source - target))] = lb  # the start's bound, already paid for
    path: tuple[frozenset[int], ...] | None = None
    optimal = False
    method = "heuristic"
    if n <= EXACT_MAX_LEAVES:
        # Most small cases finish at once; a short unbounded try avoids the heuristic.
        quick = _QUICK if max_expansions is None else min(_QUICK, max_expansions)
        # at most half the time: the heuristic and the pruned search come after it
        early = None if deadline is None else start + (deadline - start) / 2
        try:
            path = _astar(source, target, n, quick, early, None, stats, cache)
            optimal, method = True, "exact"
        except _OutOfBudget as out:
            lb = max(lb, out.bound)
            lb_cost = max(lb_cost, out.cost)
    heuristic_path = list(path) if path is not None else _heuristic(source, target, n)
    ub = len(heuristic_path) - 1
    ub_cost = ub * _MOVE + _sums_of(tuple(heuristic_path), target)
    if path is None and ub_cost <= lb_cost:
        # meets the proven bound on (moves, sums): optimal
        path, optimal, method = tuple(heuristic_path), True, "exact (heuristic meets the bound)"
    if path is None and n <= EXACT_MAX_LEAVES:
        rest = None if max_expansions is None else max(max_expansions - stats.expanded, 0)
        stats2 = _Stats()
        try:
            # only strictly cheaper paths are searched: none found proves the heuristic's
            found = _astar(source, target, n, rest, deadline, ub_cost, stats2, cache)
            path = tuple(heuristic_path) if found is None else found
            optimal, method = True, "exact"
        except _OutOfBudget as out:
            lb = max(lb, min(out.bound, ub))
            method = "heuristic (exact search out of budget)"
        stats = _Stats(
            stats.expanded + stats2.expanded,
            max(stats.peak_open, stats2.peak_open),
            max(stats.peak_closed, stats2.peak_closed),
        )
    if path is None:
        path = tuple(heuristic_path)
    return SearchResult(
        path=path,
        steps=len(path) - 1,
        lower_bound=lb if not optimal else len(path) - 1,
        optimal=optimal,
        method=method,
        expanded=stats.expanded,
        peak_open=stats.peak_open,
        peak_closed=stats.peak_closed,
        sums=_sums_of(path, target),
    )
