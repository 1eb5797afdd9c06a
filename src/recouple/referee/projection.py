r"""Direct projection: coupled states built from Clebsch-Gordan coefficients alone.

This is the referee every recoupling formula is tested against.  It expands the
coupled state of a scheme in the product basis of its momenta, using nothing but
Clebsch-Gordan (CG) coefficients, and takes scalar products.  It never uses a 6j
or 9j symbol and shares no code with :mod:`recouple.recoupling`.

Conventions (docs/conventions.md):

* ``(a b)c`` means :math:`|(a\,b)c\,M\rangle=\sum\langle a\,m_a\,b\,m_b|c\,M\rangle
  |a\,m_a\rangle|b\,m_b\rangle`, with ``a`` in the *first* CG slot
  (Condon-Shortley phases).
* Tensor slots belong to the momenta, not to their written order: ``(b a)c`` is
  expanded in the same product basis as ``(a b)c``.
* A basis state is a tuple of doubled projections :math:`2m`, one per momentum,
  with the momenta in :func:`basis_order` (their names sorted as Python sorts
  strings), so that two schemes over the same momenta share one basis.

>>> from recouple.referee.projection import project, why_zero
>>> v = {"a": "1/2", "b": "1/2", "c": "1/2", "e": 1, "f": 0, "J": "1/2"}
>>> float(project("((a,b)e,c)J", "(a,(b,c)f)J", v))
0.8660254037844386
>>> why_zero("((a,b)e,c)J", "(a,(b,c)f)J", {**v, "e": 2})
'triad (a, b, e) = (1/2, 1/2, 2) of ((a,b)e,c)J breaks the triangle condition'
"""

from __future__ import annotations

import math
import operator
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from fractions import Fraction
from typing import TypeVar

from recouple.errors import BadValue, BudgetExceeded, SchemeMismatch, check_flag
from recouple.numbers.radicals import Radical
from recouple.numbers.spins import (
    is_triad,
    parse_projection,
    projections,
    spin_text,
    to_doubled,
)
from recouple.schemes.notation import parse
from recouple.schemes.tree import Coupling, Leaf, Node, check_scheme
from recouple.symbols.floats import _cg_float_doubled
from recouple.symbols.values import _cg_doubled

__all__ = [
    "EXACT_LIMIT",
    "MAX_DIMENSION",
    "basis_order",
    "check_size",
    "coupled_state",
    "project",
    "why_zero",
]

#: With ``exact=None``, :func:`project` works exactly when the product space of
#: the momenta has at most this many states, and in floating point above.
EXACT_LIMIT = 16384  # 7 spins 3/2; exact takes about 0.05 s there, floats 0.01 s

#: The largest product-space dimension the referee accepts (about two million
#: states).  Time and memory grow with it; beyond this the referee refuses with
#: BudgetExceeded rather than run for minutes.
MAX_DIMENSION = 1 << 21

SchemeLike = Coupling | str
Key = tuple[int, ...]


T = TypeVar("T")

#: An exact coefficient ``n/d * sqrt(s)`` as plain ints, ``s`` square-free and
#: ``d > 0``; ``n/d`` is left unreduced while a state is built (int products are
#: far cheaper than Fraction or Radical ones) and reduced once, when summed.
_Exact = tuple[int, int, int]


# ---------------------------------------------------------------------------
# Public functions
# ---------------------------------------------------------------------------


def basis_order(scheme: SchemeLike) -> tuple[str, ...]:
    """The order of the momenta in the keys of :func:`coupled_state`: sorted names.

    >>> basis_order("(c,(b,a)e)J")
    ('a', 'b', 'c')
    """
    return tuple(sorted(_scheme(scheme).leaves()))


def coupled_state(
    scheme: SchemeLike,
    values: Mapping[str, object],
    m: object = None,
    *,
    exact: bool = True,
) -> dict[Key, Radical] | dict[Key, float]:
    r"""The coupled state :math:`|\text{scheme}\;J\,M\rangle` in the product basis.

    Parameters
    ----------
    scheme
        A :class:`~recouple.schemes.tree.Coupling` or its text, e.g. ``"((a,b)e,c)J"``.
    values
        A value for every label of the scheme (momenta, couplings, total) and
        nothing else: ints, ``Fraction``, or text such as ``"3/2"``.
    m
        The projection :math:`M` of the total (default: :math:`M=J`).
    exact
        ``True`` for exact :class:`~recouple.numbers.radicals.Radical`
        coefficients, ``False`` for floats.

    Returns
    -------
    dict
        Nonzero components only, keyed by the doubled projections :math:`2m` of
        the momenta in :func:`basis_order`.  The state does not exist when a
        coupling breaks its triad's triangle condition: the result is then ``{}``.

    Raises
    ------
    BadValue
        A missing, unknown or invalid value, or an ``m`` that is no projection of the total.

    Examples
    --------
    >>> s = coupled_state("(a,b)c", {"a": "1/2", "b": "1/2", "c": 0})
    >>> {k: float(v) for k, v in sorted(s.items())}
    {(-1, 1): -0.7071067811865476, (1, -1): 0.7071067811865476}
    >>> coupled_state("(a,b)c", {"a": "1/2", "b": "1/2"})
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: no value for label 'c' of (a,b)c
    """
    tree = _scheme(scheme)
    doubled = _doubled_values((tree,), values)
    dm = _projection(m, (tree,), doubled)
    if _broken_triad(tree, doubled) is not None:
        return {}
    _check_budget(tree, doubled)
    if exact:
        state = _state(tree, doubled, dm, _exact_cg, _exact_mul, (1, 1, 1))
        return {key: _exact_radical(value) for key, value in state.items()}
    return _state(tree, doubled, dm, _float_cg, operator.mul, 1.0)


def project(
    a: SchemeLike,
    b: SchemeLike,
    values: Mapping[str, object],
    *,
    exact: bool | None = None,
    m: object = None,
) -> Radical | float:
    r"""The overlap :math:`\langle A|B\rangle` of two schemes, by direct CG projection.

    Both coupled states are built at the same projection :math:`M` in the
    product basis of the momenta (:func:`coupled_state`) and their scalar product
    is returned.  Overlaps are real, so :math:`\langle A|B\rangle=\langle B|A\rangle`.

    Parameters
    ----------
    a, b
        Schemes (:class:`~recouple.schemes.tree.Coupling` or text) over the same momenta.
    values
        A value for every label of *both* schemes and nothing else.  A label
        that appears in both schemes takes one value.
    exact
        ``True``: an exact :class:`~recouple.numbers.radicals.Radical`;
        ``False``: a float; ``None`` (default): exact when the product space has
        at most :data:`EXACT_LIMIT` states, float otherwise.
    m
        The projection :math:`M` (default :math:`M=J`).  The overlap does not depend on it.

    Returns
    -------
    Radical or float
        The overlap.  When a selection rule forces it to vanish (a triad that
        breaks the triangle condition, different totals, or one cluster of
        momenta coupled to different values in the two schemes) the result is
        an exact ``Radical`` zero whatever ``exact`` says; :func:`why_zero`
        names the rule.

    Raises
    ------
    SchemeMismatch
        The schemes couple different momenta.
    BadValue
        A missing, unknown or invalid value, or an ``m`` that is no projection of a total.
    BudgetExceeded
        The product space has more than :data:`MAX_DIMENSION` states.

    Examples
    --------
    >>> v = {"a": 1, "b": 1, "c": 1}
    >>> project("(a,b)c", "(b,a)c", v)  # the exchange phase (-1)^(a+b-c)
    Radical(-1)
    >>> project("(a,b)c", "(b,a)c", {"a": 1, "b": 1, "c": 1, "d": 0})
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: unknown label 'd' in values: not in (a,b)c or (b,a)c
    """
    check_flag(exact, "exact", none=True)
    case = _prepare(a, b, values, m)
    if case.reason is not None:
        return _exact_zero()
    _check_budget(case.a, case.doubled)
    if exact is None:
        exact = _dimension(case.a, case.doubled) <= EXACT_LIMIT
    if exact:
        one = (1, 1, 1)
        sa = _state(case.a, case.doubled, case.dm, _exact_cg, _exact_mul, one)
        sb = _state(case.b, case.doubled, case.dm, _exact_cg, _exact_mul, one)
        return _exact_dot(sa, sb)
    fa = _state(case.a, case.doubled, case.dm, _float_cg, operator.mul, 1.0)
    fb = _state(case.b, case.doubled, case.dm, _float_cg, operator.mul, 1.0)
    return _float_dot(fa, fb)


def why_zero(a: SchemeLike, b: SchemeLike, values: Mapping[str, object]) -> str | None:
    """Why :func:`project` gives zero by a selection rule, or ``None`` if no rule applies.

    The rules, in the order checked: a triad of either scheme breaks the
    triangle condition (or has a half-integer sum); the two totals differ; a
    cluster of momenta coupled in both schemes has different values.  ``None``
    does not promise a nonzero overlap: a 6j can vanish by accident.

    Bad input raises exactly as in :func:`project`.

    >>> why_zero("((a,b)e,c)J", "((a,b)e',c)J'", {"a": 1, "b": 1, "c": 1,
    ...          "e": 1, "e'": 1, "J": 1, "J'": 2})
    "the totals differ: J = 1 in ((a,b)e,c)J but J' = 2 in ((a,b)e',c)J'"
    """
    return _prepare(a, b, values, None).reason


# ---------------------------------------------------------------------------
# Input checks
# ---------------------------------------------------------------------------


@dataclass(frozen=True, slots=True)
class _Case:
    """Two checked schemes, their doubled values, the doubled M, and a zero reason."""

    a: Coupling
    b: Coupling
    doubled: dict[str, int]
    dm: int
    reason: str | None


def _scheme(value: SchemeLike) -> Coupling:
    """A checked scheme from a tree or its text (bad text raises NotationError)."""
    if isinstance(value, Coupling):
        return check_scheme(value)
    return parse(value)


def _prepare(a: SchemeLike, b: SchemeLike, values: Mapping[str, object], m: object) -> _Case:
    ta, tb = _scheme(a), _scheme(b)
    la, lb = set(ta.leaves()), set(tb.leaves())
    if la != lb:
        raise SchemeMismatch(
            "the schemes couple different momenta: "
            + "; ".join(
                f"only in {tree}: {', '.join(sorted(extra))}"
                for tree, extra in ((ta, la - lb), (tb, lb - la))
                if extra
            )
        )
    doubled = _doubled_values((ta, tb), values)
    dm = _projection(m, (ta, tb), doubled)
    return _Case(ta, tb, doubled, dm, _zero_reason(ta, tb, doubled))


def _doubled_values(trees: tuple[Coupling, ...], values: Mapping[str, object]) -> dict[str, int]:
    """Doubled values of every label of ``trees``; missing or unknown labels raise."""
    if not isinstance(values, Mapping):
        raise BadValue(f"values must map each label to its value, got {values!r}")
    labels: dict[str, Coupling] = {}
    for tree in trees:
        for label in tree.labels():
            labels.setdefault(label, tree)
    unknown = [key for key in values if key not in labels]
    if unknown:
        where = " or ".join(str(t) for t in trees)
        names = ", ".join(repr(k) for k in unknown)
        what = "label" if len(unknown) == 1 else "labels"
        raise BadValue(f"unknown {what} {names} in values: not in {where}")
    missing = [label for label in labels if label not in values]
    if missing:
        names = ", ".join(repr(k) for k in missing)
        what = "label" if len(missing) == 1 else "labels"
        raise BadValue(f"no value for {what} {names} of {labels[missing[0]]}")
    return {label: to_doubled(values[label], name=label) for label in labels}


def _projection(m: object, trees: tuple[Coupling, ...], doubled: Mapping[str, int]) -> int:
    """The doubled M: ``2J`` of the first tree by default, else ``m`` checked against each J."""
    if m is None:
        return doubled[trees[0].total]
    dm = int(2 * parse_projection(m, name="m"))
    for tree in trees:
        dj = doubled[tree.total]
        if abs(dm) > dj or (dj - dm) % 2:
            raise BadValue(
                f"m = {spin_text(dm)} is not a projection of {tree.total} = {spin_text(dj)} "
                f"in {tree} (need |m| <= {tree.total} and {tree.total} - m an integer)"
            )
    return dm


def _broken_triad(tree: Coupling, doubled: Mapping[str, int]) -> str | None:
    """The first coupling of ``tree`` whose triad is not admissible, described."""
    for left, right, label in tree.triads():
        dl, dr, dc = doubled[left], doubled[right], doubled[label]
        if is_triad(dl, dr, dc):
            continue
        shown = f"({left}, {right}, {label}) = ({spin_text(dl)}, {spin_text(dr)}, {spin_text(dc)})"
        # DLMF 34.2.1: admissible means the triangle inequalities and an integer sum.
        rule = "has a half-integer sum" if (dl + dr + dc) % 2 else "breaks the triangle condition"
        return f"triad {shown} of {tree} {rule}"
    return None


def _zero_reason(a: Coupling, b: Coupling, doubled: Mapping[str, int]) -> str | None:
    for tree in (a, b):
        broken = _broken_triad(tree, doubled)
        if broken is not None:
            return broken
    ja, jb = doubled[a.total], doubled[b.total]
    if ja != jb:
        return (
            f"the totals differ: {a.total} = {spin_text(ja)} in {a} "
            f"but {b.total} = {spin_text(jb)} in {b}"
        )
    # Coupled states of one cluster with different values are orthogonal
    # (CG orthogonality; CONVENTIONS 1.6, Edmonds 1957 section 3.5 from memory).
    b_clusters = b.clusters()
    for cluster, la in a.clusters().items():
        lb = b_clusters.get(cluster)
        if lb is None or doubled[la] == doubled[lb]:
            continue
        return (
            f"momenta {', '.join(sorted(cluster))} are coupled to {la} = "
            f"{spin_text(doubled[la])} in {a} but to {lb} = {spin_text(doubled[lb])} in {b}"
        )
    return None


def check_size(a: SchemeLike, b: SchemeLike, values: Mapping[str, object]) -> None:
    """Raise what :func:`project` would raise for these arguments, without projecting:
    bad values, or a product space above :data:`MAX_DIMENSION` (so a caller can fail
    before slow work that would end in the projection anyway).

    >>> check_size("(a,b)c", "(b,a)c", {"a": 1, "b": 1, "c": 1})  # 9 states: fine
    >>> check_size("(a,b)c", "(b,a)c", {"a": 800, "b": 800, "c": 0})
    Traceback (most recent call last):
    ...
    recouple.errors.BudgetExceeded: the product space of (a,b)c has 2563201 states, ...
    """
    case = _prepare(a, b, values, None)
    if case.reason is None:  # a selection-rule zero is never projected
        _check_budget(case.a, case.doubled)


def _dimension(tree: Coupling, doubled: Mapping[str, int]) -> int:
    return math.prod(doubled[leaf] + 1 for leaf in tree.leaves())


def _check_budget(tree: Coupling, doubled: Mapping[str, int]) -> None:
    dim = _dimension(tree, doubled)
    if dim > MAX_DIMENSION:
        raise BudgetExceeded(
            f"the product space of {tree} has {dim} states, more than the referee's "
            f"limit of {MAX_DIMENSION}"
        )


# ---------------------------------------------------------------------------
# The state builder
# ---------------------------------------------------------------------------


def _exact_zero() -> Radical:
    return Radical(0)


def _exact_cg(dj1: int, dm1: int, dj2: int, dm2: int, dj: int, dm: int) -> _Exact | None:
    """``cg_doubled`` as ``(s, n, d)``; a CG coefficient is one term ``q*sqrt(s)``."""
    value = _cg_doubled(dj1, dm1, dj2, dm2, dj, dm)
    if not value:
        return None
    ((radicand, q),) = value.terms
    return (radicand, q.numerator, q.denominator)


def _exact_mul(x: _Exact, y: _Exact) -> _Exact:
    # sqrt(s1) sqrt(s2) = g sqrt(s1 s2 / g^2) with g = gcd(s1, s2); for square-free
    # s1, s2 the new radicand is square-free again (common practice).
    s1, n1, d1 = x
    s2, n2, d2 = y
    g = math.gcd(s1, s2)
    return ((s1 // g) * (s2 // g), n1 * n2 * g, d1 * d2)


def _exact_radical(x: _Exact) -> Radical:
    s, n, d = x
    return Radical.from_terms({s: Fraction(n, d)})


def _float_cg(dj1: int, dm1: int, dj2: int, dm2: int, dj: int, dm: int) -> float | None:
    return _cg_float_doubled(dj1, dm1, dj2, dm2, dj, dm) or None


def _state(
    tree: Coupling,
    doubled: Mapping[str, int],
    dm: int,
    cg: Callable[[int, int, int, int, int, int], T | None],
    mul: Callable[[T, T], T],
    one: T,
) -> dict[Key, T]:
    """The coupled state of ``tree`` at doubled M, keyed in :func:`basis_order`."""
    vector = _node_states(tree, doubled, {dm}, cg, mul, one)[dm]
    # Keys come out in the tree's left-to-right leaf order; the slots belong to
    # the momenta, so reorder them into the shared basis order.
    written = tree.leaves()
    slot = {name: i for i, name in enumerate(written)}
    perm = [slot[name] for name in sorted(written)]
    if perm == list(range(len(perm))):
        return vector
    return {tuple(key[i] for i in perm): value for key, value in vector.items()}


def _node_states(
    node: Node,
    doubled: Mapping[str, int],
    needed: set[int],
    cg: Callable[[int, int, int, int, int, int], T | None],
    mul: Callable[[T, T], T],
    one: T,
) -> dict[int, dict[Key, T]]:
    """The states of ``node`` at each doubled projection in ``needed``.

    A leaf at projection m is the basis vector (m,) with coefficient 1.  A
    coupling combines its parts with the CG expansion of CONVENTIONS section 0,
    its left part in the first slot.  Only the part projections that can reach
    a needed M are built (|M - m1| <= j_right), so a state at one M never
    builds the whole product space.
    """
    if isinstance(node, Leaf):
        return {dmj: {(dmj,): one} for dmj in needed}
    dl, dr, dc = doubled[node.left.label], doubled[node.right.label], doubled[node.label]
    left_needed = {m1 for m1 in projections(dl) if any(abs(big - m1) <= dr for big in needed)}
    right_needed = {big - m1 for big in needed for m1 in left_needed if abs(big - m1) <= dr}
    left = _node_states(node.left, doubled, left_needed, cg, mul, one)
    right = _node_states(node.right, doubled, right_needed, cg, mul, one)
    result: dict[int, dict[Key, T]] = {}
    for big in sorted(needed):
        vector: dict[Key, T] = {}
        for m1, left_vector in sorted(left.items()):
            m2 = big - m1
            right_vector = right.get(m2)
            if right_vector is None or abs(m2) > dr:
                continue
            coefficient = cg(dl, m1, dr, m2, dc, big)
            if coefficient is None:
                continue
            # The parts cover disjoint momenta, so concatenated keys never collide.
            for left_key, left_value in left_vector.items():
                factor = mul(coefficient, left_value)
                for right_key, right_value in right_vector.items():
                    vector[left_key + right_key] = mul(factor, right_value)
        result[big] = vector
    return result


def _float_dot(sa: dict[Key, float], sb: dict[Key, float]) -> float:
    """The real scalar product of two sparse float states."""
    if len(sb) < len(sa):
        sa, sb = sb, sa
    return math.fsum(value * sb[key] for key, value in sa.items() if key in sb)


def _exact_dot(sa: dict[Key, _Exact], sb: dict[Key, _Exact]) -> Radical:
    """The exact scalar product: integer numerators are summed per (radicand,
    denominator), and each group becomes one Fraction at the end."""
    if len(sb) < len(sa):
        sa, sb = sb, sa
    groups: dict[tuple[int, int], int] = {}
    for key, x in sa.items():
        y = sb.get(key)
        if y is None:
            continue
        s, n, d = _exact_mul(x, y)
        groups[s, d] = groups.get((s, d), 0) + n
    terms: dict[int, Fraction] = {}
    for (s, d), n in groups.items():
        terms[s] = terms.get(s, Fraction(0)) + Fraction(n, d)
    return Radical.from_terms(terms) if terms else _exact_zero()
