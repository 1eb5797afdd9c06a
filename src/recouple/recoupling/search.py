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
import time
from collections.abc import Iterable, Iterator
from dataclasses import dataclass
from itertools import count

from recouple.errors import BadValue

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
#: 2(n-2) packed successor keys (one ``int`` of about n(n-2) bits each), so at n = 16
#: this keeps the open and closed sets below roughly 300 MB.
DEFAULT_MAX_EXPANSIONS = 100_000

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
    paths, of fewest sums).  ``method`` is ``"exact"`` (A* finished),
    ``"heuristic"`` (n above :data:`EXACT_MAX_LEAVES`, or the heuristic already met
    the lower bound) or ``"heuristic (exact search out of budget)"``.  ``expanded``,
    ``peak_open`` and ``peak_closed`` describe the exact search (zero when it did not
    run).  ``sums`` counts moves whose new cluster is not a cluster of the target:
    each introduces one summed label in the formula (CONVENTIONS 3.5).
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


def _max_matching(left: list[int], right: list[int]) -> int:
    """Maximum matching between clusters of ``left`` and ``right`` that cross."""
    adj = [[j for j, b in enumerate(right) if _crosses(a, b)] for a in left]
    match_r = [-1] * len(right)

    def augment(i: int, seen: list[bool]) -> bool:
        for j in adj[i]:
            if not seen[j]:
                seen[j] = True
                if match_r[j] < 0 or augment(match_r[j], seen):
                    match_r[j] = i
                    return True
        return False

    size = 0
    for i in range(len(left)):
        if augment(i, [False] * len(right)):
            size += 1
    return size


def lower_bound(source: frozenset[int], target: frozenset[int], n: int) -> int:
    """An admissible lower bound on the number of Racah moves from source to target.

    With ``a = |C(source) - C(target)|`` (half the Robinson-Foulds distance,
    CONVENTIONS 5.3) and ``nu`` the size of a maximum matching between the clusters
    to remove and the clusters to create, joining two when they cross, the bound is
    ``2a - nu`` (own argument, checked against brute force in tests/test_search.py):
    every cluster to remove has a first removal, every cluster to create a last
    creation; one move removes one cluster and adds one that crosses it, so a move
    can serve as both only for a crossing pair, and those pairs form a matching.

    >>> lower_bound(frozenset({0b0011, 0b0111}), frozenset({0b1100, 0b1110}), 4)
    2
    """
    gone = sorted(source - target)
    new = sorted(target - source)
    return 2 * len(gone) - _max_matching(gone, new)


# ---------------------------------------------------------------------------
# Exact search (A*)


def _sums_of(path: tuple[frozenset[int], ...], target: frozenset[int]) -> int:
    return sum(1 for a, b in zip(path, path[1:], strict=False) for c in b - a if c not in target)


class _OutOfBudget(Exception):
    pass


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
    upper: int | None,
    stats: _Stats,
) -> tuple[frozenset[int], ...] | None:
    """A* over packed keys; cost (moves, sums) as one int; consistent bound 2a - nu.

    Returns None when every path is longer than ``upper`` moves (pruned), raises
    _OutOfBudget when a budget runs out.
    """
    m = max(n - 2, 0)
    width = n
    fmask = (1 << width) - 1

    def pack(cl: list[int]) -> int:
        key = 0
        for k, c in enumerate(cl):
            key |= c << (width * k)
        return key

    def unpack(key: int) -> list[int]:
        return [(key >> (width * k)) & fmask for k in range(m)]

    start = pack(sorted(source))
    goal = pack(sorted(target))
    tgt = target
    tgt_list = sorted(target)

    def h(cl: list[int]) -> int:
        have = set(cl)
        gone = [c for c in cl if c not in tgt]
        new = [c for c in tgt_list if c not in have]
        return 2 * len(gone) - _max_matching(gone, new)

    counter = count()
    best_g: dict[int, int] = {start: 0}
    came: dict[int, int] = {}
    closed: set[int] = set()
    h0 = h(unpack(start))
    heap: list[tuple[int, int, int, int, int, bool]] = [
        (h0 * _MOVE, 0, next(counter), start, 0, True)
    ]
    while heap:
        f, _neg_moves, _, key, g, exact = heapq.heappop(heap)
        if key in closed or g > best_g.get(key, g):
            continue
        cl = unpack(key)
        if not exact:
            hv = h(cl)
            f2 = g + hv * _MOVE
            if f2 > f:
                heapq.heappush(heap, (f2, _neg_moves, next(counter), key, g, True))
                continue
        if key == goal:
            path = [key]
            while path[-1] != start:
                path.append(came[path[-1]])
            return tuple(frozenset(unpack(k)) for k in reversed(path))
        if max_expansions is not None and stats.expanded >= max_expansions:
            raise _OutOfBudget
        if deadline is not None and stats.expanded % 64 == 0 and time.monotonic() > deadline:
            raise _OutOfBudget
        closed.add(key)
        stats.expanded += 1
        stats.peak_closed = max(stats.peak_closed, len(closed))
        hv = (f - g) // _MOVE
        struct = _structure(cl, n)
        for c in cl:
            p, x, y = struct[c]
            z = p & ~c
            for new in (x | z, y | z):
                g2 = g + _MOVE + (0 if new in tgt else 1)
                moves2 = g2 // _MOVE
                if upper is not None and moves2 + max(hv - 1, 0) > upper:
                    continue
                nl = [d for d in cl if d != c]
                nl.append(new)
                nl.sort()
                k2 = pack(nl)
                if k2 in closed or best_g.get(k2, g2 + 1) <= g2:
                    continue
                best_g[k2] = g2
                came[k2] = key
                est = max(hv - 1, 0)
                heapq.heappush(heap, (g2 + est * _MOVE, -moves2, next(counter), k2, g2, False))
        stats.peak_open = max(stats.peak_open, len(heap))
    return None


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
    :data:`DEFAULT_MAX_EXPANSIONS` = 100 000, a few hundred MB at most at n = 16)
    and ``max_seconds`` (default :data:`DEFAULT_MAX_SECONDS` = 5 s); ``None`` lifts
    a budget.  The result is deterministic.

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
    lb = lower_bound(source, target, n)
    stats = _Stats()
    deadline = None if max_seconds is None else time.monotonic() + max_seconds
    path = _astar(source, target, n, max_expansions, deadline, None, stats)
    assert path is not None
    return SearchResult(
        path=path,
        steps=len(path) - 1,
        lower_bound=lb,
        optimal=True,
        method="exact",
        expanded=stats.expanded,
        peak_open=stats.peak_open,
        peak_closed=stats.peak_closed,
        sums=_sums_of(path, target),
    )
