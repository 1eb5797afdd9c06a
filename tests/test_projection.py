"""Tests of the direct-projection referee (recouple.referee.projection).

The referee is what every formula is checked against, so it is checked here
against outside references only: sympy.physics.wigner (a reference library) for
CG, 6j and 9j values, and the recoupling formulas of CONVENTIONS section 3 with
their printed sources.
"""

from __future__ import annotations

import ast
import itertools
import math
import random
from fractions import Fraction
from pathlib import Path

import pytest

from recouple.errors import BadValue, BudgetExceeded, NotationError, SchemeMismatch
from recouple.numbers.radicals import Radical
from recouple.referee import (
    EXACT_LIMIT,
    basis_order,
    coupled_state,
    project,
    why_zero,
)
from recouple.schemes import parse

sympy = pytest.importorskip("sympy")
wigner = pytest.importorskip("sympy.physics.wigner")

HALF = Fraction(1, 2)
SMALL = (HALF, Fraction(1), Fraction(3, 2))  # a, b, c in {1/2, 1, 3/2}


def coupled(a: Fraction, b: Fraction) -> list[Fraction]:
    """Values c that a and b can couple to (DLMF 34.2.1)."""
    return [abs(a - b) + k for k in range(int(a + b - abs(a - b)) + 1)]


def ms(j: Fraction) -> list[Fraction]:
    return [-j + k for k in range(int(2 * j) + 1)]


def sp(x: Fraction) -> object:
    """A Fraction as a sympy Rational, for the reference library."""
    return sympy.Rational(x.numerator, x.denominator)


def sign(x: Fraction) -> int:
    """(-1)**x for an integer x."""
    assert x.denominator == 1
    return -1 if x.numerator % 2 else 1


def close(value: Radical | float, reference: object) -> bool:
    return math.isclose(float(value), float(reference), rel_tol=1e-10, abs_tol=1e-12)


def exactly(value: Radical | float, expected: int) -> bool:
    """Typed exact equality: a Radical equal to an integer (never a float)."""
    return isinstance(value, Radical) and value == Radical(expected)


# ---------------------------------------------------------------------------
# States against the CG coefficient itself
# ---------------------------------------------------------------------------


def test_two_leaf_states_are_cg_coefficients_with_a_in_the_first_slot() -> None:
    # reference: sympy.physics.wigner.clebsch_gordan(j1, j2, j3, m1, m2, m3)
    #   = <j1 m1 j2 m2|j3 m3>; CONVENTIONS section 0 fixes a in the first slot.
    checked = 0
    for a, b in itertools.product([Fraction(d, 2) for d in range(5)], repeat=2):
        for c in coupled(a, b):
            for big_m in ms(c):
                values = {"a": a, "b": b, "c": c}
                ab = coupled_state("(a,b)c", values, big_m)
                ba = coupled_state("(b,a)c", values, big_m)
                for ma, mb in itertools.product(ms(a), ms(b)):
                    key = (int(2 * ma), int(2 * mb))  # basis order: a, b
                    ref_ab = wigner.clebsch_gordan(sp(a), sp(b), sp(c), sp(ma), sp(mb), sp(big_m))
                    ref_ba = wigner.clebsch_gordan(sp(b), sp(a), sp(c), sp(mb), sp(ma), sp(big_m))
                    assert close(ab.get(key, Radical(0)), ref_ab)
                    assert close(ba.get(key, Radical(0)), ref_ba)
                    checked += 1
    # sum_c (2c+1) = (2a+1)(2b+1), so (sum_{2a=0..4} (2a+1)^2)^2 = 55^2 components.
    assert checked == 55**2


def test_singlet_of_two_spin_halves() -> None:
    # Condon-Shortley: <1/2 1/2 1/2 -1/2|0 0> = +1/sqrt(2) (CONVENTIONS 1.3, DLMF 34.1.1;
    # reference: sympy.physics.wigner.clebsch_gordan).
    state = coupled_state("(a,b)c", {"a": "1/2", "b": "1/2", "c": 0})
    assert set(state) == {(1, -1), (-1, 1)}
    assert all(isinstance(v, Radical) for v in state.values())
    assert state[(1, -1)] * state[(1, -1)] == Radical(Fraction(1, 2))
    assert float(state[(1, -1)]) > 0 > float(state[(-1, 1)])


def test_basis_order_is_sorted_leaf_names() -> None:
    assert basis_order("((zeta,b)e,(A,a)f)J") == ("A", "a", "b", "zeta")
    state = coupled_state("(b,a)c", {"a": 1, "b": 0, "c": 1}, 0)
    assert list(state) == [(0, 0)]  # keys: (2 m_a, 2 m_b)
    state = coupled_state("(b,a)c", {"a": 1, "b": 0, "c": 1}, -1)
    assert list(state) == [(-2, 0)]


def test_float_states_are_floats() -> None:
    state = coupled_state("((a,b)e,c)J", {"a": 1, "b": 1, "c": 1, "e": 1, "J": 1}, exact=False)
    assert state
    assert all(type(v) is float for v in state.values())
    assert math.isclose(sum(v * v for v in state.values()), 1.0)


# ---------------------------------------------------------------------------
# Norm, symmetry, independence of M
# ---------------------------------------------------------------------------

SCHEMES_3 = ("((a,b)e,c)J", "(a,(b,c)e)J", "((a,c)e,b)J", "(c,(b,a)e)J")


def three_leaf_values(dmax: int = 3) -> list[dict[str, Fraction]]:
    out = []
    spins = [Fraction(d, 2) for d in range(dmax + 1)]
    for a, b, c in itertools.product(spins, repeat=3):
        for e in coupled(a, b):
            for big_j in coupled(e, c):
                out.append({"a": a, "b": b, "c": c, "e": e, "J": big_j})
    return out


def test_norm_is_one_exhaustive() -> None:
    # <A|A> = 1: CG orthogonality (CONVENTIONS 1.6, Edmonds 1957 section 3.5, from memory).
    count = 0
    for text in ("((a,b)e,c)J", "(c,(b,a)e)J"):
        for values in three_leaf_values():
            # The cluster of e depends on the scheme; a value set admissible for one
            # scheme may break a triad of the other, so skip those here.
            if why_zero(text, text, values) is not None:
                continue
            assert exactly(project(text, text, values, exact=True), 1), (text, values)
            count += 1
    assert count == 502


def test_norm_four_leaves_all_m() -> None:
    # <A|A> = 1 at every M (CG orthogonality, CONVENTIONS 1.6).
    scheme = "((a,b)e,(c,d)f)J"
    count = 0
    for a, b, c, d in itertools.product((HALF, Fraction(1)), repeat=4):
        for e, f in itertools.product(coupled(a, b), coupled(c, d)):
            for big_j in coupled(e, f):
                values = {"a": a, "b": b, "c": c, "d": d, "e": e, "f": f, "J": big_j}
                for big_m in ms(big_j):
                    assert exactly(project(scheme, scheme, values, m=big_m), 1)
                    count += 1
    assert count == 625


def test_overlap_independent_of_m_and_symmetric() -> None:
    # Overlaps are real, M-independent and symmetric (CONVENTIONS section 3, 3c).
    count = 0
    a, b = "((a,b)e,c)J", "(a,(b,c)f)J"
    for values in three_leaf_values(dmax=3):
        for f in coupled(values["b"], values["c"]):
            v = {**values, "f": f}
            if why_zero(a, b, v) is not None:
                continue
            at_top = project(a, b, v, exact=True)
            for big_m in ms(v["J"]):
                assert project(a, b, v, exact=True, m=big_m) == at_top
                assert project(b, a, v, exact=True, m=big_m) == at_top
                count += 1
    assert count == 1688


# ---------------------------------------------------------------------------
# Recoupling formulas of CONVENTIONS section 3, against sympy's 6j and 9j
# ---------------------------------------------------------------------------


def test_racah_move_matches_6j() -> None:
    # <((a b)e, c)J | (a,(b c)f)J> = (-1)^(a+b+c+J) sqrt((2e+1)(2f+1)) {a b e; c J f}
    # CONVENTIONS 3.1: Edmonds 1957 eq. 6.1.5 (from memory), = DLMF 34.5.23.
    # reference: sympy.physics.wigner.wigner_6j.
    count = 0
    for a, b, c in itertools.product(SMALL, repeat=3):
        for e in coupled(a, b):
            for big_j in coupled(e, c):
                for f in coupled(b, c):
                    if big_j not in coupled(a, f):
                        continue
                    values = {"a": a, "b": b, "c": c, "e": e, "f": f, "J": big_j}
                    got = project("((a,b)e,c)J", "(a,(b,c)f)J", values)
                    assert isinstance(got, Radical)
                    six = wigner.wigner_6j(sp(a), sp(b), sp(e), sp(c), sp(big_j), sp(f))
                    ref = sign(a + b + c + big_j) * sympy.sqrt((2 * e + 1) * (2 * f + 1)) * six
                    assert close(got, ref), values
                    count += 1
    assert count == 342  # as in CONVENTIONS 3.1 (3a)


def test_other_nni_move_matches_6j() -> None:
    # <((a b)e, c)J | ((a c)g, b)J> = (-1)^(b+c+e+g) sqrt((2e+1)(2g+1)) {a b e; J c g}
    # CONVENTIONS 3.1' (derived there from 3.1 and 3.2).
    # reference: sympy.physics.wigner.wigner_6j.
    count = 0
    for a, b, c in itertools.product(SMALL, repeat=3):
        for e in coupled(a, b):
            for big_j in coupled(e, c):
                for g in coupled(a, c):
                    if big_j not in coupled(g, b):
                        continue
                    values = {"a": a, "b": b, "c": c, "e": e, "g": g, "J": big_j}
                    got = project("((a,b)e,c)J", "((a,c)g,b)J", values)
                    six = wigner.wigner_6j(sp(a), sp(b), sp(e), sp(big_j), sp(c), sp(g))
                    ref = sign(b + c + e + g) * sympy.sqrt((2 * e + 1) * (2 * g + 1)) * six
                    assert close(got, ref), values
                    count += 1
    assert count == 342


def test_exchange_phase() -> None:
    # <(a b)c | (b a)c> = (-1)^(a+b-c) at every M (CONVENTIONS 3.2, from the CG
    # exchange symmetry 1.5, Edmonds 1957 section 3.5, from memory).
    count = 0
    for a, b in itertools.product([Fraction(d, 2) for d in range(5)], repeat=2):
        for c in coupled(a, b):
            for big_m in ms(c):
                values = {"a": a, "b": b, "c": c}
                got = project("(a,b)c", "(b,a)c", values, m=big_m)
                assert exactly(got, sign(a + b - c)), values
                count += 1
    # sum_c (2c+1) = (2a+1)(2b+1): (sum_{2a=0..4} (2a+1))^2 = 15^2 cases.
    assert count == 15**2


def test_exchange_inside_a_larger_scheme() -> None:
    # Exchange at the inner node only: (-1)^(a+b-e) (CONVENTIONS 3.2 applied to a subtree).
    for values in three_leaf_values(dmax=2):
        got = project("((a,b)e,c)J", "((b,a)e,c)J", values)
        assert exactly(got, sign(values["a"] + values["b"] - values["e"]))


def nine_j_cases() -> list[dict[str, Fraction]]:
    cases = []
    for a, b, c, d in itertools.product(SMALL, repeat=4):
        for e, f, g, h in itertools.product(
            coupled(a, b), coupled(c, d), coupled(a, c), coupled(b, d)
        ):
            for big_j in coupled(e, f):
                if big_j in coupled(g, h):
                    cases.append(
                        {"a": a, "b": b, "c": c, "d": d, "e": e, "f": f, "g": g, "h": h, "J": big_j}
                    )
    return cases


def test_nine_j_recoupling_sample() -> None:
    # <((a b)e,(c d)f)J | ((a c)g,(b d)h)J> = sqrt((2e+1)(2f+1)(2g+1)(2h+1)) {a b e; c d f; g h J}
    # CONVENTIONS 3.3: Edmonds 1957 section 6.4 (from memory).
    # reference: sympy.physics.wigner.wigner_9j (entries row by row).
    cases = nine_j_cases()
    assert len(cases) == 6477  # as counted in CONVENTIONS 3.3 (3e)
    rng = random.Random(20240611)
    for v in rng.sample(cases, 60):
        got = project("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J", v)
        back = project("((a,c)g,(b,d)h)J", "((a,b)e,(c,d)f)J", v)
        nine = wigner.wigner_9j(*(sp(v[k]) for k in "abecdfghJ"))
        hats = sympy.sqrt(math.prod(2 * v[k] + 1 for k in "efgh"))
        assert close(got, hats * nine), v
        assert got == back


# ---------------------------------------------------------------------------
# Completeness: the recoupling matrix is orthogonal
# ---------------------------------------------------------------------------


def test_completeness_three_leaves() -> None:
    # sum_f <A|B_f>^2 = 1: the states (a,(b c)f)J over f span the same space as
    # the ((a b)e, c)J over e (CG completeness, CONVENTIONS 1.6; 6j orthogonality 4.1).
    count = 0
    for values in three_leaf_values(dmax=3):
        a, b, c, e, big_j = (values[k] for k in "abceJ")
        total = Radical(0)
        for f in coupled(b, c):
            if big_j in coupled(a, f):
                overlap = project("((a,b)e,c)J", "(a,(b,c)f)J", {**values, "f": f}, exact=True)
                total = total + overlap * overlap
        assert total == Radical(1), values
        count += 1
    assert count == 251


def test_completeness_four_leaves() -> None:
    # sum_{g,h} <((a b)e,(c d)f)J | ((a c)g,(b d)h)J>^2 = 1 (9j orthogonality,
    # CONVENTIONS 4.4, DLMF 34.7.2).
    count = 0
    one = Fraction(1)
    for a, b, c, d in [(HALF,) * 4, (HALF, one, one, HALF), (one, one, HALF, HALF), (one,) * 4]:
        for e, f in itertools.product(coupled(a, b), coupled(c, d)):
            for big_j in coupled(e, f):
                v = {"a": a, "b": b, "c": c, "d": d, "e": e, "f": f, "J": big_j}
                total = Radical(0)
                for g, h in itertools.product(coupled(a, c), coupled(b, d)):
                    if big_j in coupled(g, h):
                        x = project("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J", {**v, "g": g, "h": h})
                        total = total + x * x
                assert total == Radical(1), v
                count += 1
    assert count == 45


# ---------------------------------------------------------------------------
# Exact and float paths
# ---------------------------------------------------------------------------


def test_exact_and_float_agree() -> None:
    # The two arithmetic paths of the referee must give the same overlaps
    # (common practice: exact rational-radical arithmetic vs double precision).
    a, b = "((a,b)e,(c,d)f)J", "(((a,c)g,b)x,d)J"
    rng = random.Random(7)
    count = 0
    for v in rng.sample(nine_j_cases(), 40):
        for x in coupled(v["g"], v["b"]):
            if v["J"] not in coupled(x, v["d"]):
                continue
            w = {k: v[k] for k in "abcdefgJ"} | {"x": x}
            exact = project(a, b, w, exact=True)
            approx = project(a, b, w, exact=False)
            assert isinstance(exact, Radical)
            assert type(approx) is float
            assert math.isclose(float(exact), approx, abs_tol=1e-12)
            count += 1
    assert count == 86


def test_default_mode_switches_on_dimension() -> None:
    small = {"a": 1, "b": 1, "c": 1, "e": 1, "J": 1}  # dimension 27
    assert isinstance(project("((a,b)e,c)J", "(a,(b,c)e)J", small), Radical)
    big = {k: 4 for k in ("a", "b", "c", "d", "p", "e", "f", "J", "J2")}  # 9^5 = 59049 states
    assert EXACT_LIMIT < 9**5
    assert type(project("(((a,b)e,(c,d)f)J,p)J2", "(((a,c)e,(b,d)f)J,p)J2", big)) is float


def test_seven_spins_three_halves_float() -> None:
    # Product dimension 4^7 = 16384, on the float path and the exact one.  The two
    # schemes differ in one cluster: ((X j6)x6, j7)J against ((X j7)y, j6)J with
    # X = the first five momenta coupled to x5.  Each overlap is CONVENTIONS 3.1'
    # (-1)^(j6+j7+x6+y) sqrt((2x6+1)(2y+1)) {x5 j6 x6; J j7 y}, and the squares sum to 1
    # over y (completeness).  reference: sympy.physics.wigner.wigner_6j.
    head = "((((j1,j2)x2,j3)x3,j4)x4,j5)x5"
    a, b = f"(({head},j6)x6,j7)J", f"(({head},j7)y,j6)J"
    j = Fraction(3, 2)
    values: dict[str, object] = {f"j{i}": j for i in range(1, 8)}
    values |= {"x2": 1, "x3": j, "x4": 2, "x5": j, "x6": 2, "J": Fraction(5, 2)}
    assert math.isclose(float(project(a, a, values)), 1.0, rel_tol=1e-12)
    x5, x6, big_j = Fraction(3, 2), Fraction(2), Fraction(5, 2)
    total = 0.0
    count = 0
    for y in coupled(x5, j):
        if big_j not in coupled(y, j):
            continue
        got = project(a, b, {**values, "y": y}, exact=False)
        assert type(got) is float
        exact = project(a, b, {**values, "y": y}, exact=True)
        assert isinstance(exact, Radical)
        assert math.isclose(float(exact), got, rel_tol=1e-12)
        six = wigner.wigner_6j(sp(x5), sp(j), sp(x6), sp(big_j), sp(j), sp(y))
        ref = sign(j + j + x6 + y) * sympy.sqrt((2 * x6 + 1) * (2 * y + 1)) * six
        assert close(got, ref), y
        total += got * got
        count += 1
    assert count == 3  # y = 1, 2, 3
    assert math.isclose(total, 1.0, rel_tol=1e-12)


# ---------------------------------------------------------------------------
# Selection-rule zeros and their reasons
# ---------------------------------------------------------------------------

V3 = {"a": HALF, "b": HALF, "c": HALF, "e": 1, "f": 0, "J": HALF}


def test_broken_triangle_gives_exact_zero_and_reason() -> None:
    values = {**V3, "e": 2}
    for exact in (None, True, False):
        assert exactly(project("((a,b)e,c)J", "(a,(b,c)f)J", values, exact=exact), 0)
    assert why_zero("((a,b)e,c)J", "(a,(b,c)f)J", values) == (
        "triad (a, b, e) = (1/2, 1/2, 2) of ((a,b)e,c)J breaks the triangle condition"
    )
    assert coupled_state("((a,b)e,c)J", {"a": HALF, "b": HALF, "c": HALF, "e": 2, "J": HALF}) == {}


def test_half_integer_sum_gives_zero_and_reason() -> None:
    values = {**V3, "f": HALF, "J": 1}
    assert exactly(project("((a,b)e,c)J", "(a,(b,c)f)J", values), 0)
    reason = why_zero("((a,b)e,c)J", "(a,(b,c)f)J", values)
    assert reason == "triad (e, c, J) = (1, 1/2, 1) of ((a,b)e,c)J has a half-integer sum"


def test_different_totals_give_zero() -> None:
    values = {"a": 1, "b": 1, "c": 1, "e": 1, "f": 1, "J": 1, "K": 2}
    assert exactly(project("((a,b)e,c)J", "(a,(b,c)f)K", values), 0)
    assert why_zero("((a,b)e,c)J", "(a,(b,c)f)K", values) == (
        "the totals differ: J = 1 in ((a,b)e,c)J but K = 2 in (a,(b,c)f)K"
    )


def test_same_cluster_different_values_give_zero() -> None:
    values = {"a": 1, "b": 1, "c": 1, "e": 1, "g": 2, "J": 1}
    assert exactly(project("((a,b)e,c)J", "(c,(b,a)g)J", values), 0)
    assert why_zero("((a,b)e,c)J", "(c,(b,a)g)J", values) == (
        "momenta a, b are coupled to e = 1 in ((a,b)e,c)J but to g = 2 in (c,(b,a)g)J"
    )
    # Equal values under different names are the same state up to the exchange phases.
    same = {**values, "g": 1}
    assert why_zero("((a,b)e,c)J", "(c,(b,a)g)J", same) is None
    # (-1)^(a+b-e) (-1)^(e+c-J) from two exchanges (CONVENTIONS 3.2).
    assert exactly(project("((a,b)e,c)J", "(c,(b,a)g)J", same), 1)


def test_no_reason_for_an_allowed_case() -> None:
    assert why_zero("((a,b)e,c)J", "(a,(b,c)f)J", V3) is None


# ---------------------------------------------------------------------------
# Bad input
# ---------------------------------------------------------------------------


def test_missing_value() -> None:
    values = {k: v for k, v in V3.items() if k != "f"}
    with pytest.raises(BadValue, match=r"no value for label 'f' of \(a,\(b,c\)f\)J"):
        project("((a,b)e,c)J", "(a,(b,c)f)J", values)


def test_unknown_label() -> None:
    with pytest.raises(BadValue, match=r"unknown labels 'g', 'K' in values: not in "):
        project("((a,b)e,c)J", "(a,(b,c)f)J", {**V3, "g": 1, "K": 0})


def test_different_leaves() -> None:
    with pytest.raises(SchemeMismatch, match=r"only in \(\(a,b\)e,c\)J: c; only in .*: d"):
        project("((a,b)e,c)J", "(a,(b,d)f)J", {**V3, "d": HALF})


def test_not_a_half_integer() -> None:
    with pytest.raises(BadValue, match=r"value of 'e' must be a non-negative integer .* '1/3'"):
        project("((a,b)e,c)J", "(a,(b,c)f)J", {**V3, "e": "1/3"})
    with pytest.raises(BadValue, match=r"value of 'a' must be .*got -1"):
        coupled_state("(a,b)c", {"a": -1, "b": 1, "c": 0})


def test_bad_projection() -> None:
    with pytest.raises(BadValue, match=r"m = 3/2 is not a projection of J = 1/2"):
        project("((a,b)e,c)J", "(a,(b,c)f)J", V3, m="3/2")
    with pytest.raises(BadValue, match=r"m = 0 is not a projection of J = 1/2"):
        project("((a,b)e,c)J", "(a,(b,c)f)J", V3, m=0)
    with pytest.raises(BadValue, match=r"value of 'm' must be an integer or half-integer"):
        project("((a,b)e,c)J", "(a,(b,c)f)J", V3, m="x")
    assert project("((a,b)e,c)J", "(a,(b,c)f)J", V3, m="-1/2") == project(
        "((a,b)e,c)J", "(a,(b,c)f)J", V3
    )


def test_bad_scheme_text() -> None:
    with pytest.raises(NotationError, match=r"missing label"):
        project("((a,b),c)J", "(a,(b,c)f)J", V3)


def test_values_not_a_mapping() -> None:
    with pytest.raises(BadValue, match=r"values must map each label"):
        project("(a,b)c", "(b,a)c", [1, 1, 1])  # type: ignore[arg-type]


def test_budget() -> None:
    leaves = [f"j{i}" for i in range(1, 12)]
    text = leaves[0]
    for i, name in enumerate(leaves[1:], start=2):
        text = f"({text},{name})x{i}"
    values: dict[str, object] = {name: "3/2" for name in leaves}  # 4^11 states
    values.update({f"x{i}": ("3/2" if i % 2 else 1) for i in range(2, 12)})
    with pytest.raises(BudgetExceeded, match=r"has 4194304 states"):
        project(text, text, values)


def test_tree_objects_accepted() -> None:
    a, b = parse("((a,b)e,c)J"), parse("(a,(b,c)f)J")
    assert project(a, b, V3) == project("((a,b)e,c)J", "(a,(b,c)f)J", V3)


# ---------------------------------------------------------------------------
# Independence from the formula path
# ---------------------------------------------------------------------------


def test_referee_never_uses_the_formula_path() -> None:
    # The referee must share no logic with what it checks (RULES: referee/ never
    # imports recoupling/); it uses CG coefficients only, never 6j or 9j.
    source = Path(__file__).parents[1] / "src" / "recouple" / "referee" / "projection.py"
    tree = ast.parse(source.read_text())
    imported: list[str] = []
    names: list[str] = []
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom) and node.module:
            imported.append(node.module)
            names += [alias.name for alias in node.names]
        elif isinstance(node, ast.Import):
            imported += [alias.name for alias in node.names]
    assert imported, "no imports found: the check would be empty"
    assert not [m for m in imported if m.startswith("recouple.recoupling")]
    assert not [n for n in names if "6j" in n or "9j" in n or "sixj" in n or "ninej" in n]
