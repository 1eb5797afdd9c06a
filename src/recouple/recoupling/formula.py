"""The recoupling formula as an immutable value, and the rules that simplify it.

A :class:`Formula` stands for

    <A|B> = prod(deltas) * sum_{sums} (-1)^E * prod (2x+1)^(p_x/2) * prod 6j * prod 9j

where E is an integer-valued linear form in the labels.  Every rewrite here is
valid for *every* allowed assignment of the labels (docs/conventions.md):

* ``(-1)^(4j) = 1`` for any angular momentum j, so coefficients of E live mod 4;
* ``2j`` is an integer, and for every coupled triad ``a+b+c`` is an integer, so
  ``(-1)^(2c) = (-1)^(2a+2b)``: a label's "2" part moves down to the leaves of its
  cluster.  What is left is a canonical form: coupled labels carry 0 or 1, leaves
  carry 0, 1, 2 or 3 (printed -1);
* the 24 symmetries of the 6j (DLMF 34.5.8) carry no phase, so each 6j is kept in
  one standard arrangement; a 9j's 72 arrangements (DLMF §34.7(ii)) carry
  ``(-1)^R`` for odd permutations, which is folded into E.

>>> from recouple.recoupling.derive import derive
>>> f = derive("((a,b)e,c)J", "(a,(b,c)f)J").formula
>>> f.sixjs, f.phase, f.hats
((('a', 'b', 'e', 'c', 'J', 'f'),), (('a', 1), ('b', 1), ('c', 1), ('J', 1)), (('e', 1), ('f', 1)))
"""

from __future__ import annotations

import itertools
from collections import Counter
from collections.abc import Iterable, Iterator, Mapping
from dataclasses import dataclass, field, replace
from itertools import combinations
from typing import TYPE_CHECKING, Any

from recouple.schemes.tree import Coupling
from recouple.symbols.canonical import (
    canonical_ninej,
    canonical_sixj,
    ninej_arrangements,
    sixj_arrangements,
)

if TYPE_CHECKING:
    from recouple.numbers.radicals import Radical

__all__ = [
    "Formula",
    "free_labels",
    "NineJEntries",
    "SixJEntries",
    "normal_phase",
    "simplify",
    "summation_order",
    "symbol_triads",
]

SixJEntries = tuple[str, str, str, str, str, str]
NineJEntries = tuple[str, str, str, str, str, str, str, str, str]
LinearForm = dict[str, int]


@dataclass(frozen=True, slots=True)
class Formula:
    """An exact expression for the overlap ``<bra|ket>`` of two coupling schemes.

    Attributes are plain tuples so that equal formulas compare and hash equal and
    print identically:

    * ``sums``: summation variables, fresh names that no scheme uses;
    * ``phase``: ``(label, coefficient)`` pairs of E in ``(-1)^E``, plus ``constant``;
    * ``hats``: ``(label, p)`` for each factor ``(2x+1)^(p/2)``;
    * ``sixjs``, ``ninejs``: the symbols, as label tuples in standard arrangement;
    * ``deltas``: ``(a, b)`` pairs for Kronecker deltas between two names of one cluster;
    * ``clusters``: the leaves under every label (used for phases and ranges);
    * ``order``: every label in a fixed reading order (standard forms follow it).
    """

    bra: Coupling
    ket: Coupling
    sums: tuple[str, ...]
    phase: tuple[tuple[str, int], ...]
    constant: int
    hats: tuple[tuple[str, int], ...]
    sixjs: tuple[SixJEntries, ...]
    ninejs: tuple[NineJEntries, ...]
    deltas: tuple[tuple[str, str], ...]
    clusters: tuple[tuple[str, frozenset[str]], ...] = field(repr=False)
    order: tuple[str, ...] = field(repr=False)

    # -- queries ---------------------------------------------------------------
    @property
    def free_labels(self) -> tuple[str, ...]:
        """Labels a value must be given for: every label of both schemes."""
        return free_labels(self.bra, self.ket)

    def triads(self) -> tuple[tuple[str, str, str], ...]:
        """The coupling triads of both schemes; a value set breaking one gives zero."""
        seen: dict[tuple[str, str, str], None] = {}
        for scheme in (self.bra, self.ket):
            for triad in scheme.triads():
                seen.setdefault(triad, None)
        return tuple(seen)

    def counts(self) -> dict[str, int]:
        """Summary figures: summations and symbols."""
        return {"sums": len(self.sums), "6j": len(self.sixjs), "9j": len(self.ninejs)}

    # -- evaluation (recoupling.evaluate does the work) --------------------------
    def evaluate(self, values: Mapping[str, object]) -> Radical:
        """The exact value at the given label values (see :func:`evaluate.evaluate`)."""
        from recouple.recoupling.evaluate import evaluate

        return evaluate(self, values)

    def evaluate_float(self, values: Mapping[str, object]) -> float:
        """A float value for bulk work (see :func:`evaluate.evaluate_float`)."""
        from recouple.recoupling.evaluate import evaluate_float

        return evaluate_float(self, values)

    # -- output hooks (the writers live in recouple.outputs) ---------------------
    def __str__(self) -> str:
        from recouple.outputs.text import formula_text

        return formula_text(self)

    def latex(self, **settings: Any) -> str:
        """The formula as LaTeX (amsmath), ``<bra|ket> = ...``."""
        from recouple.outputs.latex import formula_latex

        return formula_latex(self, **settings)

    def _repr_latex_(self) -> str:
        return "$\\displaystyle " + self.latex() + "$"

    def to_sympy(self) -> Any:
        """The formula as a sympy expression with sympy's symbolic 6j/9j."""
        from recouple.outputs.sympy_export import formula_to_sympy

        return formula_to_sympy(self)


def free_labels(bra: Coupling, ket: Coupling) -> tuple[str, ...]:
    """Every label of both schemes, the bra's first: the values ``<bra|ket>`` needs.

    Known before any derivation, so values can be checked before a long search.

    >>> from recouple.schemes import parse
    >>> free_labels(parse("((a,b)e,c)J"), parse("(a,(b,c)f)K"))
    ('a', 'b', 'c', 'e', 'J', 'f', 'K')
    """
    labels = list(bra.labels())
    labels += [label for label in ket.labels() if label not in labels]
    return tuple(labels)


# ---------------------------------------------------------------------------
# Summation ranges (shared by the evaluator and the code writers)
# ---------------------------------------------------------------------------


def symbol_triads(formula: Formula) -> list[tuple[str, str, str]]:
    """Every triad of every symbol: the 6j's four (DLMF §34.4), the 9j's rows and columns."""
    triads: list[tuple[str, str, str]] = []
    for j1, j2, j3, l1, l2, l3 in formula.sixjs:
        triads += [(j1, j2, j3), (j1, l2, l3), (l1, j2, l3), (l1, l2, j3)]
    for a, b, c, d, e, f, g, h, i in formula.ninejs:
        triads += [(a, b, c), (d, e, f), (g, h, i), (a, d, g), (b, e, h), (c, f, i)]
    return triads


def summation_order(formula: Formula) -> list[tuple[str, list[tuple[str, str]]]]:
    """Summation variables, outermost first, each with the triads bounding its range.

    A pair ``(p, q)`` listed for ``x`` means the triad ``(x, p, q)`` of some symbol
    must satisfy the triangle condition; ``p`` and ``q`` are free labels or outer
    variables.  At each level the first remaining variable that some triad pins
    down comes next (the order changes the work, never the value).

    >>> from recouple.recoupling.derive import derive
    >>> f = derive("((((a,b)e,c)f,d)g,k)J", "(((a,d)p,(b,k)q)r,c)J").formula
    >>> f.sums, summation_order(f)
    (('x1',), [('x1', [('b', 'p'), ('d', 'e'), ('r', 'k'), ('c', 'g')])])
    """
    triads = symbol_triads(formula)
    known = set(formula.free_labels)
    todo = list(formula.sums)
    out: list[tuple[str, list[tuple[str, str]]]] = []
    while todo:
        for x in todo:
            bounds: list[tuple[str, str]] = []
            for t in triads:
                if t.count(x) == 1:
                    p, q = (o for o in t if o != x)
                    if p in known and q in known and {p, q} not in map(set, bounds):
                        bounds.append((p, q))
            if bounds:
                break
        else:
            raise AssertionError(f"summation variables {todo!r} are bounded by no triangle")
        out.append((x, bounds))
        todo.remove(x)
        known.add(x)
    return out


# ---------------------------------------------------------------------------
# Phases
# ---------------------------------------------------------------------------


def normal_phase(
    form: Mapping[str, int], constant: int, clusters: Mapping[str, frozenset[str]]
) -> tuple[dict[str, int], int]:
    """Reduce ``(-1)^(form + constant)`` to its canonical form (see the module notes).

    ``clusters`` maps each label to the leaves under it; a leaf maps to itself.

    >>> cl = {"a": frozenset("a"), "b": frozenset("b"), "c": frozenset("ab")}
    >>> normal_phase({"a": 1, "b": 1, "c": -1}, 0, cl)
    ({'a': 3, 'b': 3, 'c': 1}, 0)
    >>> normal_phase({"a": 2, "b": 2, "c": 2}, 1, cl)
    ({}, 1)
    """
    out: Counter[str] = Counter()
    for label, coeff in form.items():
        r = coeff % 4
        if r == 0:
            continue
        leaves = clusters[label]
        is_leaf = leaves == frozenset((label,))
        if is_leaf:
            out[label] += r
            continue
        if r % 2:
            out[label] += 1
            r -= 1
        if r:  # the remaining 2*label moves to the leaves: (-1)^(2c) = (-1)^(2a+2b)
            for leaf in leaves:
                out[leaf] += 2
    reduced = {label: c % 4 for label, c in out.items() if c % 4}
    return reduced, constant % 2


# ---------------------------------------------------------------------------
# Simplification
# ---------------------------------------------------------------------------


def simplify(formula: Formula) -> Formula:
    """Canonical phases and symbols, then sums folded by identities; an equal formula.

    Each summation variable is tried against the 9j expansion (DLMF 34.6.2), the
    Racah sum rule (DLMF 34.5.15) and the Biedenharn-Elliott identity (DLMF
    34.5.16); a match replaces the sum by its closed form.
    """
    formula = _standardise(formula)
    changed = True
    while changed:  # one fold can enable another; folding keeps the phase normal
        changed = False
        summands = _summands(formula)
        for x in formula.sums:
            with_x = summands.get(x)
            if with_x is None:
                continue
            folded = _fold_ninej(formula, x, with_x)
            for identity in _IDENTITIES:
                if folded is None:
                    folded = _fold_identity(formula, x, identity, with_x)
            if folded is not None:
                formula = folded
                changed = True
                summands = _summands(formula)
    return _rename_sums(_standardise(formula))


def _summands(f: Formula) -> dict[str, list[SixJEntries]]:
    """For each summation variable that a fold could remove, the 6j holding it.

    A fold needs ``(2x+1)`` to the first power, x in 6j symbols only (each once),
    and in no delta or 9j; variables failing that are left out.
    """
    hats = dict(f.hats)
    blocked = {label for pair in f.deltas for label in pair}
    blocked |= {label for n in f.ninejs for label in n}
    out: dict[str, list[SixJEntries]] = {
        x: [] for x in f.sums if hats.get(x) == 2 and x not in blocked
    }
    for s in f.sixjs:
        for label in set(s):
            if label in out:
                out[label].append(s)
    return {x: w for x, w in out.items() if w and all(s.count(x) == 1 for s in w)}


@dataclass(frozen=True, slots=True)
class _Identity:
    """``sum_X (-1)^phase (2X+1) prod lhs = prod rhs``, written in letters; X is summed."""

    name: str
    lhs: tuple[tuple[str, ...], ...]
    phase: tuple[str, ...]
    rhs: tuple[tuple[str, ...], ...]
    rhs_hats: tuple[tuple[str, int], ...] = ()  # extra (2y+1)^(p/2) on the right
    rhs_deltas: tuple[tuple[str, str], ...] = ()  # Kronecker deltas on the right
    needs: tuple[tuple[str, str, str], ...] = ()  # triads the formula must already demand


_IDENTITIES = (
    # Racah sum rule, DLMF 34.5.15 (CONVENTIONS 4.2, verified there numerically):
    # sum_j (-1)^(j+p+q) (2j+1) {a b j; c d p}{a b j; d c q} = {a d p; b c q}.
    _Identity(
        "Racah sum rule",
        (("a", "b", "X", "c", "d", "p"), ("a", "b", "X", "d", "c", "q")),
        ("X", "p", "q"),
        (("a", "d", "p", "b", "c", "q"),),
    ),
    # Biedenharn-Elliott identity, DLMF 34.5.16 (CONVENTIONS 4.3, verified there):
    # sum_j (-1)^(S+j) (2j+1) {a b j; c d p}{c d j; e f q}{e f j; b a r}
    #   = {p q r; e a d}{p q r; f b c},  S = a+b+c+d+e+f+p+q+r.
    _Identity(
        "Biedenharn-Elliott identity",
        (
            ("a", "b", "X", "c", "d", "p"),
            ("c", "d", "X", "e", "f", "q"),
            ("e", "f", "X", "b", "a", "r"),
        ),
        ("X", "a", "b", "c", "d", "e", "f", "p", "q", "r"),
        (("p", "q", "r", "e", "a", "d"), ("p", "q", "r", "f", "b", "c")),
    ),
    # Orthogonality of the 6j, DLMF 34.5.14 (CONVENTIONS 4.1, verified there):
    # sum_j (2j+1) {a b j; c d p}{a b j; c d q} = delta_pq / (2p+1), when the triads
    # (a d p) and (c b p) hold (otherwise the left side is 0).  It is applied only
    # when both schemes already demand those triads, so no zero is lost.
    _Identity(
        "orthogonality",
        (("a", "b", "X", "c", "d", "p"), ("a", "b", "X", "c", "d", "q")),
        (),
        (),
        rhs_hats=(("p", -2),),
        rhs_deltas=(("p", "q"),),
        needs=(("a", "d", "p"), ("c", "b", "p")),
    ),
)


def _unify(
    template: tuple[str, ...], actual: tuple[str, ...], x: str, bound: dict[str, str]
) -> dict[str, str] | None:
    """Extend the letter -> label map so that ``template`` reads ``actual``, or None."""
    out = dict(bound)
    for letter, label in zip(template, actual, strict=True):
        if (letter == "X") != (label == x):
            return None
        have = out.get(letter)
        if have is None:
            out[letter] = label
        elif have != label:
            return None
    return out


def _fold_identity(
    f: Formula, x: str, identity: _Identity, with_x: list[SixJEntries]
) -> Formula | None:
    """Replace the sum over ``x`` by the identity's closed form where the pattern fits.

    Every arrangement of every 6j holding x is tried against the identity's
    left-hand side (the 24 symmetries of the 6j carry no phase, DLMF 34.5.8);
    the phase left over must not depend on x.  ``with_x`` are the 6j holding x
    (see :func:`_summands`).
    """
    if len(with_x) != len(identity.lhs):
        return None
    for order in itertools.permutations(with_x):
        for mapping in _match(identity.lhs, order, x, {}):
            phase: Counter[str] = Counter(dict(f.phase))
            for letter in identity.phase:
                phase[mapping[letter]] -= 1
            reduced, constant = normal_phase(phase, f.constant, dict(f.clusters))
            if x in reduced:
                continue
            demanded = {frozenset(t) for t in f.triads()}
            if any(frozenset(mapping[k] for k in t) not in demanded for t in identity.needs):
                continue
            deltas = tuple(
                (mapping[a], mapping[b]) for a, b in identity.rhs_deltas if mapping[a] != mapping[b]
            )
            if any(label in f.sums for pair in deltas for label in pair):
                continue  # a delta may only tie free labels, which every value set fixes
            rhs = tuple(tuple(mapping[letter] for letter in s) for s in identity.rhs)
            folded = _without_sum(f, x, with_x, (reduced, constant), sixjs=rhs)  # type: ignore[arg-type]
            hats_after: Counter[str] = Counter(dict(folded.hats))
            for letter, power in identity.rhs_hats:
                hats_after[mapping[letter]] += power
            for first, second in deltas:  # under delta(p, q) a factor in q is one in p
                hats_after[first] += hats_after.pop(second, 0)
            return replace(
                folded,
                hats=tuple((k, v) for k, v in hats_after.items() if v),
                deltas=(*folded.deltas, *deltas),
            )
    return None


def _without_sum(
    f: Formula,
    x: str,
    removed: list[SixJEntries],
    phase: tuple[dict[str, int], int],
    *,
    sixjs: tuple[SixJEntries, ...] = (),
    ninejs: tuple[NineJEntries, ...] = (),
) -> Formula:
    """``f`` with the sum over ``x`` replaced: its 6j ``removed``, the closed form added."""
    remaining = list(f.sixjs)
    for s in removed:
        remaining.remove(s)
    reduced, constant = phase
    return replace(
        f,
        sums=tuple(s for s in f.sums if s != x),
        order=tuple(label for label in f.order if label != x),
        phase=tuple(reduced.items()),
        constant=constant,
        hats=tuple((label, p) for label, p in f.hats if label != x),
        sixjs=(*remaining, *sixjs),
        ninejs=(*f.ninejs, *ninejs),
    )


def _match(
    templates: tuple[tuple[str, ...], ...],
    actual: tuple[SixJEntries, ...],
    x: str,
    bound: dict[str, str],
) -> Iterator[dict[str, str]]:
    """Every letter map under which the templates read the actual 6j symbols in order."""
    if not templates:
        yield bound
        return
    for arrangement in sixj_arrangements(actual[0]):
        mapping = _unify(templates[0], arrangement, x, bound)
        if mapping is not None:
            yield from _match(templates[1:], actual[1:], x, mapping)


def _rank(order: tuple[str, ...]) -> dict[str, int]:
    return {label: i for i, label in enumerate(order)}


def _standardise(f: Formula) -> Formula:
    """Normal phase, merged hats, each symbol in its standard arrangement, fixed orders."""
    rank = _rank(f.order)
    clusters = dict(f.clusters)
    phase: Counter[str] = Counter(dict(f.phase))
    constant = f.constant

    def key(entries: tuple[str, ...]) -> tuple[int, ...]:
        return tuple(rank[label] for label in entries)

    sixjs = tuple(sorted((canonical_sixj(s, key=key) for s in f.sixjs), key=key))
    ninejs_list: list[NineJEntries] = []
    for entries in f.ninejs:
        best, odd = canonical_ninej(entries, key=key)
        if odd:  # an odd permutation of rows or columns costs (-1)^R, R = sum of entries
            for label in entries:
                phase[label] += 1
        ninejs_list.append(best)
    ninejs = tuple(sorted(ninejs_list, key=key))
    reduced, constant = normal_phase(phase, constant, clusters)
    ordered_phase = tuple(sorted(reduced.items(), key=lambda kv: rank[kv[0]]))
    hats = tuple(sorted(((k, v) for k, v in dict(f.hats).items() if v), key=lambda kv: rank[kv[0]]))
    return replace(f, phase=ordered_phase, constant=constant, hats=hats, sixjs=sixjs, ninejs=ninejs)


def _triads6(s: SixJEntries) -> list[frozenset[str]]:
    """The four triads of ``{j1 j2 j3; l1 l2 l3}`` (DLMF 34.4 text) as label sets."""
    j1, j2, j3, l1, l2, l3 = s
    return [frozenset(t) for t in ((j1, j2, j3), (j1, l2, l3), (l1, j2, l3), (l1, l2, j3))]


def _sixj_signature(s: tuple[str, ...]) -> frozenset[frozenset[str]]:
    """Two 6j with equal triads are equal (CONVENTIONS 2.3, practical rule)."""
    j1, j2, j3, l1, l2, l3 = s
    return frozenset(frozenset(t) for t in ((j1, j2, j3), (j1, l2, l3), (l1, j2, l3), (l1, l2, j3)))


def _fold_ninej(f: Formula, x: str, with_x: list[SixJEntries]) -> Formula | None:
    """Replace ``sum_x (-1)^(2x) (2x+1) 6j 6j 6j`` by one 9j where the pattern fits.

    The pattern is DLMF 34.6.2:
    ``{a b c; d e f; g h i} = sum_x (-1)^(2x) (2x+1) {a d g; h i x}{b e h; d x f}{c f i; x a b}``.
    The six triads of the three 6j that do not hold x are the rows and columns
    of the 9j; every one of its 72 arrangements is tried so that any symmetric
    form of the three 6j is recognised.  ``with_x`` are the 6j holding x.
    """
    if len(with_x) != 3:
        return None
    phase = dict(f.phase)
    if phase.get(x, 0) != 0:  # after normal_phase, (-1)^(2x) leaves no x in the form
        return None
    triads = [t for s in with_x for t in _triads6(s) if x not in t]
    if len(triads) != 6 or any(len(t) != 3 for t in triads):
        return None
    grid = _grid_from_triads(triads)
    if grid is None:
        return None
    target = Counter(_sixj_signature(s) for s in with_x)
    for entries, odd in ninej_arrangements(grid):
        a, b, c, d, e, ff, g, h, i = entries
        expansion = ((a, d, g, h, i, x), (b, e, h, d, x, ff), (c, ff, i, x, a, b))
        if Counter(_sixj_signature(s) for s in expansion) != target:
            continue
        # sum_x (-1)^E ... = (-1)^(E - 2x) * [sum_x (-1)^(2x) ...] = (-1)^(E - 2x) * 9j(entries)
        clusters = dict(f.clusters)
        new_phase: Counter[str] = Counter(phase)
        new_phase[x] -= 2
        del odd  # the 9j is kept in this very arrangement: no phase from symmetry here
        reduced, constant = normal_phase(new_phase, f.constant, clusters)
        if x in reduced:
            return None
        return _without_sum(f, x, with_x, (reduced, constant), ninejs=(entries,))
    return None


def _grid_from_triads(triads: list[frozenset[str]]) -> NineJEntries | None:
    """Arrange six triads as the three rows and three columns of a 9j, if they fit."""
    labels: Counter[str] = Counter(label for t in triads for label in t)
    if len(labels) != 9 or any(n != 2 for n in labels.values()):
        return None
    for rows in combinations(range(6), 3):
        if 0 not in rows:  # rows and columns are interchangeable: fix triad 0 as a row
            continue
        cols = [k for k in range(6) if k not in rows]
        r = [triads[k] for k in rows]
        c = [triads[k] for k in cols]
        cells: list[str] = []
        ok = True
        for ri in r:
            for ci in c:
                common = ri & ci
                if len(common) != 1:
                    ok = False
                    break
                cells.append(next(iter(common)))
            if not ok:
                break
        if ok:
            return (
                cells[0],
                cells[1],
                cells[2],
                cells[3],
                cells[4],
                cells[5],
                cells[6],
                cells[7],
                cells[8],
            )
    return None


def _rename_sums(f: Formula) -> Formula:
    """Number the summation variables 1, 2, ... in order of appearance."""
    if not f.sums:
        return f
    base = f.sums[0].rstrip("0123456789")
    taken = {label for label in f.order if label not in f.sums}
    mapping: dict[str, str] = {}
    for k, old in enumerate(f.sums, start=1):
        new = f"{base}{k}"
        if new in taken:
            return f
        mapping[old] = new
    if all(k == v for k, v in mapping.items()):
        return f

    def ren(label: str) -> str:
        return mapping.get(label, label)

    def ren_all(items: Iterable[str]) -> tuple[str, ...]:
        return tuple(ren(label) for label in items)

    return replace(
        f,
        sums=ren_all(f.sums),
        phase=tuple((ren(k), v) for k, v in f.phase),
        hats=tuple((ren(k), v) for k, v in f.hats),
        sixjs=tuple(ren_all(s) for s in f.sixjs),  # type: ignore[misc]
        ninejs=tuple(ren_all(n) for n in f.ninejs),  # type: ignore[misc]
        clusters=tuple((ren(k), v) for k, v in f.clusters),
        order=ren_all(f.order),
    )
