"""A search whose objective is the formula, not the path: fewest summations first.

A shortest path of Racah moves can leave more summation variables than the
overlap needs.  Here the moves are the Racah move (one 6j, one new coupling)
and the 9j move ``((A B)e, (C D)f)g -> ((A C)x, (B D)y)g`` (one 9j, two new
couplings, no sum; CONVENTIONS 3.3), and a path costs, in this order:

1. summations: every coupling the path creates and later destroys is summed
   over (CONVENTIONS 3.5), counted here when it is destroyed;
2. symbols: 6j and 9j symbols in the formula;
3. Racah moves.

The search is A* over trees as cluster bitmask sets (as in
:mod:`recouple.recoupling.search`), exact within its budget.  The sums have the
admissible bound of the couplings alive in neither scheme (each must still be
destroyed, one sum each), so creating one costs at once; the symbol count has
the admissible bound ceil(|source - target| / 2), since a move replaces at most
two clusters.  It is run for schemes of up to :data:`COMPACT_MAX_LEAVES`
leaves; :func:`~recouple.recoupling.derive.derive` keeps whichever formula,
this one or the plain path's, has fewer sums.

>>> paired = frozenset({0b0011, 0b1100})              # ((0 1) (2 3))
>>> swapped = frozenset({0b0101, 0b1010})             # ((0 2) (1 3))
>>> r = compact_path(paired, swapped, 4)
>>> r.found, r.kinds, r.cost, r.optimal
(True, ('ninej',), (0, 1, 0), True)
"""

from __future__ import annotations

import heapq
import itertools
import time
from collections.abc import Iterator
from dataclasses import dataclass

from recouple.recoupling.search import _structure as structure
from recouple.recoupling.search import children

__all__ = [
    "COMPACT_BOUND_MAX_LEAVES",
    "COMPACT_MAX_EXPANSIONS",
    "COMPACT_MAX_LEAVES",
    "COMPACT_MAX_SECONDS",
    "COMPACT_SHORT_EXPANSIONS",
    "CompactResult",
    "compact_path",
]

#: Largest number of leaves for which derive() runs the compact search by default
#: (it settles every random pair tried at 8 leaves and about half at 10 within its
#: budget; beyond, call compact_path directly).
COMPACT_MAX_LEAVES = 10
#: Up to this many leaves derive() still runs a short compact search
#: (:data:`COMPACT_SHORT_EXPANSIONS` states, a fraction of a second at 24 leaves),
#: for the lower bound on sums it proves and any saving it finds on the way.
COMPACT_BOUND_MAX_LEAVES = 24
COMPACT_SHORT_EXPANSIONS = 500
#: Default budget of expanded states (n = 8 has 135 135 trees in all; CONVENTIONS 5.1).
#: The budget is a count, so results do not depend on machine load; the time limit
#: (``max_seconds``) is only a safety net.
COMPACT_MAX_EXPANSIONS = 5_000
#: Default time limit of the compact search, in seconds (a safety net; derive() gives
#: it the time left of its own budget when that is less).
COMPACT_MAX_SECONDS = 5.0

Tree = frozenset[int]


@dataclass(frozen=True, slots=True)
class CompactResult:
    """A path of Racah and 9j moves with its cost ``(sums, symbols, racah moves)``.

    ``kinds[i]`` is ``"racah"`` or ``"ninej"`` for the move from ``path[i]`` to
    ``path[i + 1]``; ``optimal`` is True when the search finished within budget.
    When nothing was found (``found`` False), ``optimal`` tells whether that is
    proven (the whole pruned space was searched) or the budget ran out.
    ``sums_bound`` is proven: no path of Racah and 9j moves has fewer sums (the
    found path's sums; ``below_sums`` when none below it exists; out of budget, the
    least bound left open).
    """

    found: bool
    path: tuple[Tree, ...]
    kinds: tuple[str, ...]
    cost: tuple[int, int, int]
    optimal: bool
    expanded: int
    sums_bound: int


def _moves(tree: Tree, n: int) -> Iterator[tuple[Tree, str, frozenset[int]]]:
    """Every tree one Racah or 9j move away: (new tree, kind, removed clusters).

    The tree's structure is read once; Racah moves replace a cluster C = X+Y
    under P = C+Z by X+Z or Y+Z (CONVENTIONS 5.2); 9j moves replace the two
    coupled parts E = A+B, F = C+D of one node by A+C, B+D or A+D, B+C.
    """
    root = (1 << n) - 1
    parts = {c: (x, y) for c, (_, x, y) in structure(tree, n).items()}
    parts[root] = children(tree, root, n)
    for c in sorted(tree):
        x, y = parts[c]
        parent = next(p for p, kids in parts.items() if c in kids)
        z = parent & ~c
        rest = tree - {c}
        yield rest | {x | z}, "racah", frozenset((c,))
        yield rest | {y | z}, "racah", frozenset((c,))
    for g in sorted(parts):
        e, f = parts[g]
        if e not in tree or f not in tree:
            continue
        a, b = parts[e]
        c, d = parts[f]
        rest = tree - {e, f}
        yield rest | {a | c, b | d}, "ninej", frozenset((e, f))
        yield rest | {a | d, b | c}, "ninej", frozenset((e, f))


def compact_path(
    source: Tree,
    target: Tree,
    n: int,
    *,
    max_expansions: int = COMPACT_MAX_EXPANSIONS,
    max_seconds: float = COMPACT_MAX_SECONDS,
    below_sums: int | None = None,
) -> CompactResult:
    """The cheapest path by (sums, symbols, Racah moves).

    With ``below_sums``, only paths with fewer summations are looked for, which
    keeps the search small (paths at or above it are pruned).  The result says
    whether a path was found and whether the search finished.
    """
    deadline = time.monotonic() + max_seconds
    ends = source | target

    def bound(tree: Tree) -> int:
        return (len(tree - target) + 1) // 2

    def alive(tree: Tree) -> int:
        """Sums still owed: every cluster in neither scheme must be destroyed later."""
        return len(tree - ends)

    counter = itertools.count()
    start_cost = (0, 0, 0)
    heap: list[tuple[tuple[int, int, int], int, tuple[int, int, int], Tree]] = [
        ((0, bound(source), 0), next(counter), start_cost, source)
    ]
    best: dict[Tree, tuple[int, int, int]] = {source: start_cost}
    back: dict[Tree, tuple[Tree, str]] = {}
    expanded = 0
    while heap:
        priority, _, cost, tree = heapq.heappop(heap)
        if best.get(tree) != cost:
            continue
        if tree == target:
            return _result(source, target, back, cost, True, expanded)
        expanded += 1
        if expanded > max_expansions or time.monotonic() > deadline:
            # the bound is consistent, so every open path owes at least this many sums
            return CompactResult(False, (), (), (0, 0, 0), False, expanded, priority[0])
        sums, symbols, racah = cost
        for new, kind, removed in _moves(tree, n):
            new_sums = sum(1 for r in removed if r not in source)
            step_cost = (sums + new_sums, symbols + 1, racah + (kind == "racah"))
            owed = step_cost[0] + alive(new)
            if below_sums is not None and owed >= below_sums:
                continue
            old = best.get(new)
            if old is not None and old <= step_cost:
                continue
            best[new] = step_cost
            back[new] = (tree, kind)
            rank = (owed, step_cost[1] + bound(new), step_cost[2])
            heapq.heappush(heap, (rank, next(counter), step_cost, new))
    # nothing below below_sums (the target is always reachable without the cut-off)
    return CompactResult(False, (), (), (0, 0, 0), True, expanded, below_sums or 0)


def _result(
    source: Tree,
    target: Tree,
    back: dict[Tree, tuple[Tree, str]],
    cost: tuple[int, int, int],
    optimal: bool,
    expanded: int,
) -> CompactResult:
    trees = [target]
    kinds: list[str] = []
    while trees[-1] != source:
        previous, kind = back[trees[-1]]
        trees.append(previous)
        kinds.append(kind)
    trees.reverse()
    kinds.reverse()
    return CompactResult(True, tuple(trees), tuple(kinds), cost, optimal, expanded, cost[0])
