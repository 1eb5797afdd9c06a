"""Properties of derived formulas over random schemes (hypothesis, derandomized).

Every check compares the engine (6j/9j formulas) against something it shares no
code with: direct Clebsch-Gordan projection (recouple.referee), the formula for
the reversed pair, or the product of two other formulas summed over a complete
basis.  Schemes come from tests/helpers/scheme_factory.py: labels are derived
from clusters, so a label shared by two schemes names the same cluster in both.
"""

from __future__ import annotations

import random
from fractions import Fraction

from hypothesis import HealthCheck, event, given, settings
from hypothesis import strategies as st
from scheme_factory import random_tree, random_values

import recouple
from recouple import Coupling, Leaf, Radical
from recouple.numbers.spins import is_triad
from recouple.recoupling.evaluate import check_values, why_zero
from recouple.recoupling.matrix import basis_states
from recouple.referee import projection
from recouple.schemes.tree import Node


def SETTINGS(max_examples: int) -> settings:  # noqa: N802 - reads as a decorator
    """Fixed-seed settings shared by every property here."""
    return settings(
        max_examples=max_examples,
        derandomize=True,
        deadline=None,
        suppress_health_check=[HealthCheck.too_slow],
    )


def leaves_of(n: int) -> list[str]:
    return [f"j{i}" for i in range(1, n + 1)]


def pair(n: int, seed: int) -> tuple[Coupling, Coupling, random.Random]:
    rng = random.Random(seed)
    return random_tree(leaves_of(n), rng), random_tree(leaves_of(n), rng), rng


def rename(tree: Node, prefix: str, keep: str) -> Node:
    """``tree`` with every coupling label except ``keep`` renamed to ``prefix + label``."""
    if isinstance(tree, Leaf):
        return tree
    label = tree.label if tree.label == keep else prefix + tree.label
    return Coupling(rename(tree.left, prefix, keep), rename(tree.right, prefix, keep), label)


# ---------------------------------------------------------------------------
# formula == direct projection
# ---------------------------------------------------------------------------


@SETTINGS(max_examples=40)
@given(n=st.integers(3, 7), seed=st.integers(0, 10**9))
def test_formula_equals_projection(n: int, seed: int) -> None:
    a, b, rng = pair(n, seed)
    values = random_values(a, b, rng, leaf_doubled=(1, 2, 3) if n <= 5 else (1, 2))
    if values is None:  # no consistent values for this pair: nothing to compare
        event("no consistent values")
        return
    event(f"compared at n = {n}")
    f = recouple.derive(a, b).formula
    if n <= 5:
        # exact: both sides are Radicals, compared as numbers
        assert f.evaluate(values) == projection.project(a, b, values, exact=True), str(f)
    else:
        reference = projection.project(a, b, values, exact=False)
        assert abs(f.evaluate_float(values) - reference) <= 1e-12, str(f)
        assert abs(float(f.evaluate(values)) - reference) <= 1e-12, str(f)


# ---------------------------------------------------------------------------
# transformation matrices are orthogonal
# ---------------------------------------------------------------------------


@SETTINGS(max_examples=15)
@given(
    n=st.integers(3, 5),
    seed=st.integers(0, 10**9),
    doubled=st.lists(st.integers(1, 2), min_size=5, max_size=5),
    fix_total=st.booleans(),
)
def test_transformation_matrix_is_orthogonal(
    n: int, seed: int, doubled: list[int], fix_total: bool
) -> None:
    # common practice: both coupled bases are orthonormal bases of one space
    a, b, _ = pair(n, seed)
    leaf_doubled = dict(zip(a.leaves(), doubled[:n], strict=True))
    values: dict[str, object] = {leaf: Fraction(d, 2) for leaf, d in leaf_doubled.items()}
    if fix_total:
        # the smallest allowed total of the first scheme
        values["J"] = Fraction(basis_states(a, leaf_doubled)[0]["J"], 2)
    m = recouple.transformation_matrix(a, b, values)
    assert len(m.rows) == len(m.columns) > 0
    event(f"{len(m.rows)} x {len(m.columns)}")
    assert m.orthogonality_error <= 1e-12
    assert m.orthogonal


# ---------------------------------------------------------------------------
# <A|B> = <B|A>
# ---------------------------------------------------------------------------


@SETTINGS(max_examples=25)
@given(n=st.integers(3, 7), seed=st.integers(0, 10**9))
def test_overlap_is_symmetric(n: int, seed: int) -> None:
    # overlaps of real states are real, so <A|B> = <B|A> (common practice)
    a, b, rng = pair(n, seed)
    values = random_values(a, b, rng, leaf_doubled=(1, 2, 3) if n <= 5 else (1, 2))
    if values is None:
        event("no consistent values")
        return
    event(f"compared at n = {n}")
    forward = recouple.derive(a, b).formula.evaluate(values)
    backward = recouple.derive(b, a).formula.evaluate(values)
    assert forward == backward


# ---------------------------------------------------------------------------
# completeness: sum over B of <A|B><B|C> = <A|C>
# ---------------------------------------------------------------------------


@SETTINGS(max_examples=30)
@given(n=st.integers(3, 6), seed=st.integers(0, 10**9))
def test_composition_through_a_complete_basis(n: int, seed: int) -> None:
    # sum_B |B><B| = 1 on the space of fixed leaves and total (common practice), so
    # <A|C> = sum over the intermediate labels of B of <A|B><B|C>.  B's labels are
    # renamed so that they are summed on their own; where A or C has the same
    # cluster, the formula's delta (not the test) makes the sum collapse.
    rng = random.Random(seed)
    leaves = leaves_of(n)
    a, b, c = (random_tree(leaves, rng) for _ in range(3))
    values = random_values(a, c, rng, leaf_doubled=(1, 2) if n > 4 else (1, 2, 3))
    if values is None:
        event("no consistent values")
        return
    bb = rename(b, "m", keep="J")
    assert isinstance(bb, Coupling)
    f_ab = recouple.derive(a, bb).formula
    f_bc = recouple.derive(bb, c).formula
    f_ac = recouple.derive(a, c).formula
    doubled = {leaf: int(2 * values[leaf]) for leaf in leaves}
    states = basis_states(bb, doubled, total=int(2 * values["J"]))
    assert states  # the total is allowed, so B has at least one state
    exact = n <= 4
    total: Radical | float = Radical(0) if exact else 0.0
    for state in states:
        vb = {k: Fraction(v, 2) for k, v in state.items()}
        left = {**{k: values[k] for k in a.labels()}, **vb}
        right = {**vb, **{k: values[k] for k in c.labels()}}
        if exact:
            total = total + f_ab.evaluate(left) * f_bc.evaluate(right)  # type: ignore[operator]
        else:
            total += f_ab.evaluate_float(left) * f_bc.evaluate_float(right)
    direct = f_ac.evaluate(values)
    event(f"{len(states)} intermediate states, {'nonzero' if direct else 'zero'} overlap")
    if exact:
        assert total == direct, (str(a), str(b), str(c))
    else:
        assert abs(float(total) - float(direct)) <= 1e-12, (str(a), str(b), str(c))


# ---------------------------------------------------------------------------
# symbol symmetries through the public functions (Fractions and text)
# ---------------------------------------------------------------------------


@st.composite
def sixj_args(draw: st.DrawFn) -> tuple[Fraction, ...]:
    """Six values (2j <= 8) that satisfy the four triads of a 6j (DLMF §34.4)."""
    a, b, d = (draw(st.integers(0, 8)) for _ in range(3))
    c = draw(st.sampled_from(range(abs(a - b), a + b + 1, 2)))
    e = draw(st.sampled_from(range(abs(d - c), d + c + 1, 2)))
    fs = [f for f in range(0, 17) if is_triad(a, e, f) and is_triad(d, b, f)]
    f = draw(st.sampled_from(fs)) if fs else 0
    return tuple(Fraction(x, 2) for x in (a, b, c, d, e, f))


@SETTINGS(max_examples=80)
@given(sixj_args(), st.permutations(range(3)), st.sampled_from([(), (0, 1), (0, 2), (1, 2)]))
def test_sixj_symmetries_at_the_api(
    args: tuple[Fraction, ...], perm: list[int], swap: tuple[int, ...]
) -> None:
    # DLMF 34.5.8: invariant under any column permutation and under exchanging upper
    # and lower entries in any two columns.  Entries go in as text, once as Fractions.
    top, bottom = list(args[:3]), list(args[3:])
    top, bottom = [top[i] for i in perm], [bottom[i] for i in perm]
    for col in swap:
        top[col], bottom[col] = bottom[col], top[col]
    moved = recouple.sixj(*(str(x) for x in top + bottom))
    assert moved == recouple.sixj(*args)
    assert recouple.sixj_float(*(top + bottom)) == recouple.sixj_float(*args)


@SETTINGS(max_examples=80)
@given(
    j1=st.integers(0, 8),
    j2=st.integers(0, 8),
    data=st.data(),
)
def test_threej_and_cg_exchange_at_the_api(j1: int, j2: int, data: st.DataObject) -> None:
    j = data.draw(st.sampled_from(range(abs(j1 - j2), j1 + j2 + 1, 2)))
    m1 = data.draw(st.sampled_from(range(-j1, j1 + 1, 2)))
    m2 = data.draw(st.sampled_from(range(-j2, j2 + 1, 2)))
    h = [Fraction(x, 2) for x in (j1, j2, j, m1, m2)]
    sign = -1 if ((j1 + j2 + j) // 2) % 2 else 1  # (-1)^(j1+j2+j3)
    cg_sign = -1 if ((j1 + j2 - j) // 2) % 2 else 1  # (-1)^(j1+j2-J)
    # DLMF 34.3.9 (from CONVENTIONS 1.4): an odd column permutation costs (-1)^(j1+j2+j3)
    three = recouple.threej(h[0], h[1], h[2], h[3], h[4], -h[3] - h[4])
    swapped = recouple.threej(h[1], h[0], h[2], h[4], h[3], -h[3] - h[4])
    assert swapped == (three if sign > 0 else -three)
    # CONVENTIONS 1.5 (Edmonds 1957 section 3.5, from memory): CG exchange phase
    cg = recouple.clebsch_gordan(h[0], h[3], h[1], h[4], h[2], h[3] + h[4])
    cg_swapped = recouple.clebsch_gordan(h[1], h[4], h[0], h[3], h[2], h[3] + h[4])
    assert cg_swapped == (cg if cg_sign > 0 else -cg)


@SETTINGS(max_examples=30)
@given(st.lists(st.integers(0, 4), min_size=4, max_size=4), st.data())
def test_ninej_transpose_and_row_swap_at_the_api(corner: list[int], data: st.DataObject) -> None:
    a, b, d, e = corner
    c = data.draw(st.sampled_from(range(abs(a - b), a + b + 1, 2)))
    f = data.draw(st.sampled_from(range(abs(d - e), d + e + 1, 2)))
    g = data.draw(st.sampled_from(range(abs(a - d), a + d + 1, 2)))
    h = data.draw(st.sampled_from(range(abs(b - e), b + e + 1, 2)))
    i_s = [i for i in range(0, 17) if is_triad(c, f, i) and is_triad(g, h, i)]
    i = data.draw(st.sampled_from(i_s)) if i_s else 0
    x = [Fraction(v, 2) for v in (a, b, c, d, e, f, g, h, i)]
    value = recouple.ninej(*x)
    # DLMF 34.7 (9j symmetries; CONVENTIONS 2): transposition leaves it unchanged,
    # exchanging two rows multiplies it by (-1)^R, R the sum of all nine entries
    assert recouple.ninej(x[0], x[3], x[6], x[1], x[4], x[7], x[2], x[5], x[8]) == value
    r = sum(x)
    assert r.denominator == 1 or value == 0
    swapped = recouple.ninej(*x[3:6], *x[0:3], *x[6:9])
    assert swapped == (value if r.denominator == 1 and int(r) % 2 == 0 else -value)


# ---------------------------------------------------------------------------
# exact zero exactly where a triangle fails
# ---------------------------------------------------------------------------


@SETTINGS(max_examples=60)
@given(n=st.integers(3, 5), seed=st.integers(0, 10**9))
def test_zero_exactly_where_a_triangle_fails(n: int, seed: int) -> None:
    # Values that may break a triad (DLMF 34.2.1): a broken triad means
    # an exact zero with a reason; all triads intact means no reason and the
    # formula equals the projection (which may still vanish by accident).
    a, b, rng = pair(n, seed)
    base = random_values(a, b, rng, leaf_doubled=(1, 2, 3))
    if base is None:
        event("no consistent values")
        return
    # consistent values with one label changed at random: sometimes still consistent
    doubled = {k: int(2 * v) for k, v in base.items()}
    doubled[rng.choice(sorted(doubled))] = rng.randint(0, 6)
    values = {k: Fraction(v, 2) for k, v in doubled.items()}
    broken = [t for s in (a, b) for t in s.triads() if not is_triad(*(doubled[k] for k in t))]
    f = recouple.derive(a, b).formula
    value = f.evaluate(values)
    reason = why_zero(f, check_values(f, values))
    event("a triad broken" if broken else "all triads hold")
    if broken:
        assert value == Radical(0)
        assert f.evaluate_float(values) == 0.0
        assert reason is not None
        assert reason.startswith("triad (")
        assert projection.why_zero(a, b, values) is not None
    else:
        assert reason is None
        assert projection.why_zero(a, b, values) is None
        assert value == projection.project(a, b, values, exact=True)
