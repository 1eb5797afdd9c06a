"""The exact value type Radical: arithmetic, text, hashing, conversions."""

from __future__ import annotations

import copy
import math
import pickle
import random
from fractions import Fraction

import pytest
import sympy
from hypothesis import given, settings
from hypothesis import strategies as st

from recouple.errors import BadValue
from recouple.numbers import Radical
from recouple.numbers._integers import squarefree_split

S2, S3, S5 = Radical.sqrt(2), Radical.sqrt(3), Radical.sqrt(5)


def test_exact_arithmetic() -> None:
    assert (S2 + S3) * (S3 - S2) == 1
    assert S2 * S2 == 2
    assert Radical.sqrt(6) == S2 * S3
    assert 5 + 2 * Radical.sqrt(6) == (S2 + S3) ** 2
    assert S2 + S3 - S2 == S3
    assert (S2 + S3 + S5).terms == ((2, 1), (3, 1), (5, 1))
    assert S2 / S2 == 1
    assert 1 / S2 == S2 / 2
    assert Radical.sqrt(12) == 2 * S3
    assert Radical.sqrt(Fraction(1, 2)) == S2 / 2
    neg = -S2
    assert -neg == S2
    assert +S2 == S2
    assert Radical(Fraction(1, 3)) * 3 == 1
    assert 3 - S2 == -(S2 - 3)


def test_division_by_multi_term() -> None:
    x = S2 + S3 + S5 + 1
    inv = 1 / x
    assert inv * x == 1
    y = Radical.from_terms({6: 2, 10: Fraction(-1, 3), 15: 5})
    assert (x / y) * y == x
    assert x ** (-2) * x**2 == 1
    with pytest.raises(ZeroDivisionError):
        _ = x / Radical(0)
    with pytest.raises(ZeroDivisionError):
        _ = x / 0


@pytest.mark.parametrize(
    ("value", "text"),
    [
        (Radical(0), "0"),
        (Radical(-2), "-2"),
        (Radical(Fraction(1, 4)), "1/4"),
        (Radical.sqrt(5), "sqrt(5)"),
        (Radical.sqrt(18), "3*sqrt(2)"),
        (-Radical.sqrt(Fraction(3, 10)), "-sqrt(3/10)"),
        (Fraction(2, 7) * Radical.sqrt(Fraction(5, 3)), "(2/7)*sqrt(5/3)"),
        (Radical.sqrt(Fraction(1, 3)), "sqrt(1/3)"),
        (Radical.sqrt(Fraction(5, 8)), "(1/2)*sqrt(5/2)"),
        (Radical.sqrt(Fraction(8, 5)), "2*sqrt(2/5)"),
        (S2 + S3, "sqrt(2) + sqrt(3)"),
        (Radical(Fraction(1, 2)) - S5, "1/2 - sqrt(5)"),
        (-S2 - 3 * S3, "-sqrt(2) - 3*sqrt(3)"),
    ],
)
def test_text_golden(value: Radical, text: str) -> None:
    assert str(value) == text


@pytest.mark.parametrize(
    "value",
    [
        Radical(0),
        Radical(7),
        Radical(Fraction(-3, 4)),
        Radical.sqrt(Fraction(3, 10)),
        S2 - Fraction(1, 2) * S3 + 4,
    ],
)
def test_repr_round_trips(value: Radical) -> None:
    assert eval(repr(value), {"Radical": Radical, "Fraction": Fraction}) == value


def test_immutable_and_slotted() -> None:
    x = S2 + 1
    with pytest.raises(AttributeError):
        x._terms = ()  # type: ignore[misc]
    with pytest.raises(AttributeError):
        x.foo = 1  # type: ignore[attr-defined]
    with pytest.raises(AttributeError):
        del x._terms
    assert not hasattr(x, "__dict__")
    assert x == S2 + 1


def test_hash_and_eq_agree_with_fractions() -> None:
    assert Radical(5) == 5
    assert hash(Radical(5)) == hash(5)
    assert Radical(Fraction(1, 3)) == Fraction(1, 3)
    assert hash(Radical(Fraction(1, 3))) == hash(Fraction(1, 3))
    assert Radical(0) == 0
    assert hash(Radical(0)) == hash(0)
    assert S2 != 1
    assert Fraction(1, 2) != S2
    assert {Radical(2): "a"}[2] == "a"
    assert len({S2, Radical.sqrt(8) / 2, S3}) == 2
    assert (Radical(1) == 1.0) is False  # floats are not exact numbers here


def test_pickle_and_copy() -> None:
    for x in (Radical(0), Radical(3), S2 - Fraction(2, 3) * S5):
        assert pickle.loads(pickle.dumps(x)) == x
        assert copy.copy(x) is x
        assert copy.deepcopy(x) is x


@pytest.mark.parametrize(
    "op",
    [
        lambda x: x + 1.0,
        lambda x: 1.0 + x,
        lambda x: x * 0.5,
        lambda x: x - 2.0,
        lambda x: x / 2.0,
        lambda x: 2.0 / x,
        lambda x: x < 1.0,
    ],
)
def test_floats_refused(op) -> None:  # type: ignore[no-untyped-def]
    with pytest.raises(TypeError):
        op(S2)


def test_constructor_refuses_bad_input() -> None:
    with pytest.raises(TypeError):
        Radical(1.5)  # type: ignore[arg-type]
    with pytest.raises(BadValue, match="negative"):
        Radical.sqrt(-2)
    with pytest.raises(BadValue, match="irrational"):
        S2.to_fraction()
    with pytest.raises(BadValue, match="radicand"):
        Radical.from_terms({0: 1})


def test_float_accuracy_on_cancelling_sums() -> None:
    # 140/99 is a continued-fraction convergent of sqrt(2): the difference is ~ 7e-5 and
    # larger convergents cancel ever more strongly; reference: mpmath at 60 digits.
    import mpmath

    mpmath.mp.dps = 60
    p, q = 1, 1
    for _ in range(30):  # convergents of sqrt(2): p/q -> (p + 2q)/(p + q)
        p, q = p + 2 * q, p + q
        x = S2 - Fraction(p, q)
        ref = mpmath.sqrt(2) - mpmath.mpf(p) / q
        assert abs(float(x) - float(ref)) <= 2e-16 * abs(float(ref))
        assert x.sign() == (1 if ref > 0 else -1)
    y = Radical.sqrt(10**40 + 1) - 10**20  # ~ 5e-21
    ref = mpmath.sqrt(mpmath.mpf(10**40 + 1)) - mpmath.mpf(10**20)
    assert abs(float(y) - float(ref)) <= 2e-16 * abs(float(ref))


def test_to_sympy_round_trip() -> None:
    rng = random.Random(5)
    for _ in range(50):
        x = Radical.from_terms(
            {rng.randint(1, 60): Fraction(rng.randint(-9, 9), rng.randint(1, 9)) for _ in range(3)}
        )
        e = x.to_sympy()
        assert Radical.from_sympy(e) == x
        # reference: sympy's own evaluation of the expression
        assert abs(float(e.evalf(30)) - float(x)) <= 1e-15 * max(1.0, abs(float(x)))
    assert Radical.sqrt(Fraction(3, 10)).to_sympy() == sympy.sqrt(30) / 10


def test_comparisons_and_sign() -> None:
    assert S2 < S3 < 2
    assert Fraction(7, 5) < S2
    assert abs(-S2) == S2
    assert abs(S2 - S3) == S3 - S2
    assert sorted([S3, Radical(1), S2]) == [1, S2, S3]
    assert Radical(0).sign() == 0
    assert (-S5).sign() == -1


def test_squarefree_split_large() -> None:
    rng = random.Random(11)
    for _ in range(40):
        n = rng.randrange(1, 10**16) * rng.randrange(1, 1000) ** 2
        root, free = squarefree_split(n)
        assert root * root * free == n
        # reference: sympy.factorint
        assert all(e == 1 for e in sympy.factorint(free).values())


small = st.integers(min_value=1, max_value=50)
coef = st.fractions(min_value=-5, max_value=5, max_denominator=7)
radicals = st.dictionaries(small, coef, max_size=3).map(Radical.from_terms)


@settings(derandomize=True, max_examples=150, deadline=None)
@given(radicals, radicals, radicals)
def test_field_laws(x: Radical, y: Radical, z: Radical) -> None:
    # commutative-ring laws of the real numbers, checked in exact arithmetic
    assert x + y == y + x
    assert x * y == y * x
    assert (x + y) + z == x + (y + z)
    assert (x * y) * z == x * (y * z)
    assert x * (y + z) == x * y + x * z
    assert x - x == 0
    if y:
        assert (x / y) * y == x
    # float() agrees with the float sum of the terms where no cancellation happens
    approx = sum(float(q) * math.sqrt(s) for s, q in x.terms)
    assert math.isclose(float(x), approx, rel_tol=1e-9, abs_tol=1e-9)
