"""Exact CG, 3j, 6j and 9j against sympy.physics.wigner, and input validation.

Every random set is drawn from a seeded generator, so failures reproduce.
Reference library: sympy.physics.wigner (argument orders per CONVENTIONS 0).
"""

from __future__ import annotations

import random
from fractions import Fraction

import numpy as np
import pytest
from sympy import Rational
from sympy.physics.wigner import clebsch_gordan as sympy_cg
from sympy.physics.wigner import wigner_3j, wigner_6j, wigner_9j

from recouple.errors import BadValue
from recouple.numbers import Radical
from recouple.symbols import (
    cg_doubled,
    cg_float_doubled,
    clebsch_gordan,
    ninej,
    ninej_doubled,
    ninej_float_doubled,
    sixj,
    sixj_doubled,
    sixj_float_doubled,
    threej,
    threej_doubled,
    threej_float_doubled,
)


def half(d: int) -> Rational:
    return Rational(d, 2)


def sympy_or_zero(fn, *args):  # type: ignore[no-untyped-def]
    """sympy raises ValueError on a triad with a non-integer sum (CONVENTIONS 0
    pitfalls); the symbol is zero there."""
    try:
        return fn(*args)
    except ValueError:
        return 0


def _admissible6(d: list[int]) -> bool:
    a, b, c, e, f, g = d

    def tri(x: int, y: int, z: int) -> bool:
        return (x + y + z) % 2 == 0 and abs(x - y) <= z <= x + y

    return tri(a, b, c) and tri(a, f, g) and tri(e, b, g) and tri(e, f, c)


def test_sixj_matches_sympy_random() -> None:
    # reference: sympy.physics.wigner.wigner_6j; 2j up to 40 (j up to 20), half-integers
    # included, and about a third of the sets violate a triangle or parity rule.
    rng = random.Random(20240601)
    nonzero = zero = 0
    for n in range(600):
        if n % 3:
            # Build an admissible set: pick j1, j2, then j3, l's from the triangles.
            a, b = rng.randint(0, 40), rng.randint(0, 40)
            c = rng.randrange(abs(a - b), a + b + 1, 2)
            e = rng.randint(0, 40)
            f = rng.randrange(abs(e - c), e + c + 1, 2)
            lo, hi = max(abs(a - f), abs(e - b)), min(a + f, e + b)
            parity_ok = (a + f) % 2 == (e + b) % 2
            g = rng.randrange(lo, hi + 1, 2) if lo <= hi and parity_ok else rng.randint(0, 40)
            d = [a, b, c, e, f, g]
        else:
            d = [rng.randint(0, 40) for _ in range(6)]
        ref = sympy_or_zero(wigner_6j, *map(half, d))
        got = sixj_doubled(*d)
        assert got == Radical.from_sympy(ref), d
        if got:
            nonzero += 1
        else:
            zero += 1
    assert nonzero > 300
    assert zero > 100


def test_ninej_matches_sympy_random() -> None:
    # reference: sympy.physics.wigner.wigner_9j; mostly 2j <= 6 (wigner_9j is slow),
    # some up to 2j = 10 and a few up to 2j = 14; includes non-admissible sets.
    rng = random.Random(777)
    nonzero = 0
    for n in range(520):
        top = 6 if n < 440 else (10 if n < 515 else 14)
        if n % 4:
            a, b, d, e = (rng.randint(0, top) for _ in range(4))
            c = rng.randrange(abs(a - b), a + b + 1, 2)
            f = rng.randrange(abs(d - e), d + e + 1, 2)
            g = rng.randrange(abs(a - d), a + d + 1, 2)
            h = rng.randrange(abs(b - e), b + e + 1, 2)
            lo, hi = max(abs(c - f), abs(g - h)), min(c + f, g + h)
            par = (c + f) % 2 == (g + h) % 2
            i = rng.randrange(lo, hi + 1, 2) if lo <= hi and par else rng.randint(0, top)
            args = [a, b, c, d, e, f, g, h, i]
        else:
            args = [rng.randint(0, top) for _ in range(9)]
        ref = sympy_or_zero(wigner_9j, *map(half, args))
        got = ninej_doubled(*args)
        assert got == Radical.from_sympy(ref), args
        nonzero += bool(got)
    assert nonzero > 150


def _random_cg(rng: random.Random, top: int) -> tuple[int, int, int, int, int, int]:
    j1, j2 = rng.randint(0, top), rng.randint(0, top)
    j = rng.randrange(abs(j1 - j2), j1 + j2 + 1, 2) if rng.random() < 0.8 else rng.randint(0, top)
    m1 = rng.randrange(-j1, j1 + 1, 2)
    m2 = rng.randrange(-j2, j2 + 1, 2)
    m = m1 + m2 if rng.random() < 0.85 else m1 + m2 + rng.choice((-2, 2))
    return j1, m1, j2, m2, j, m


def test_clebsch_gordan_matches_sympy_random() -> None:
    # reference: sympy.physics.wigner.clebsch_gordan(j1, j2, j3, m1, m2, m3)
    rng = random.Random(99)
    nonzero = 0
    for _ in range(600):
        j1, m1, j2, m2, j, m = _random_cg(rng, 24)
        ref = sympy_or_zero(sympy_cg, *map(half, (j1, j2, j, m1, m2, m)))
        got = cg_doubled(j1, m1, j2, m2, j, m)
        assert got == Radical.from_sympy(ref), (j1, m1, j2, m2, j, m)
        nonzero += bool(got)
    assert nonzero > 300


def test_threej_matches_sympy_random() -> None:
    # reference: sympy.physics.wigner.wigner_3j(j1, j2, j3, m1, m2, m3)
    rng = random.Random(3)
    nonzero = 0
    for _ in range(600):
        j1, m1, j2, m2, j3, m = _random_cg(rng, 24)
        args = (j1, j2, j3, m1, m2, -m)
        ref = sympy_or_zero(wigner_3j, *map(half, args))
        got = threej_doubled(*args)
        assert got == Radical.from_sympy(ref), args
        nonzero += bool(got)
    assert nonzero > 300


@pytest.mark.parametrize(
    ("args", "text"),
    [
        # CONVENTIONS 2.5 table (verified there against wigner_9j and Wigner9j)
        (("1/2", "1/2", 0, "1/2", "3/2", 1, 0, 1, 1), "1/6"),
        (("3/2", "3/2", 1, 2, 2, 2, "1/2", "1/2", 1), "sqrt(7/30)/10"),
        ((1, 1, 1, 1, 1, 1, 1, 1, 1), "0"),
        ((1, 2, 3, 4, 5, 6, 3, 6, 9), "(1/1274)*sqrt(3/5)"),
        (("1/2", "1/2", 1, "1/2", "1/2", 1, 1, 1, 2), "1/9"),
        (("1/2", 1, "3/2", 1, "1/2", "3/2", "3/2", "3/2", 1), "-1/144"),
        (("3/2", 1, "1/2", "3/2", 1, "3/2", 2, 1, 1), "-(1/24)*sqrt(1/15)"),
        ((1, "1/2", "1/2", "1/2", 1, "3/2", "1/2", "3/2", 2), "1/24"),
    ],
)
def test_ninej_table_conventions(args: tuple[object, ...], text: str) -> None:
    value = ninej(*args)
    if text == "sqrt(7/30)/10":  # sqrt(210)/300 as listed in CONVENTIONS 2.5
        assert value == Radical.sqrt(210) / 300
    else:
        assert str(value) == text


def test_public_functions_accept_text_and_fractions() -> None:
    # DLMF 34.3.1 / CONVENTIONS 1.7: (j j 0; m -m 0) = (-1)^(j-m)/sqrt(2j+1)
    assert threej("3/2", Fraction(3, 2), 0, "1/2", "-1/2", 0) == -Radical.sqrt(Fraction(1, 4))
    assert sixj("1/2", "1/2", 1, "1/2", "1/2", 0) == Fraction(1, 2)
    assert clebsch_gordan("1/2", "1/2", "1/2", "1/2", 1, 1) == 1


@pytest.mark.parametrize(
    ("call", "match"),
    [
        (lambda: sixj(1, 1, 1, 1, 1, "1/3"), r"value of 'f' must be a non-negative"),
        (lambda: sixj(-1, 1, 1, 1, 1, 1), r"value of 'a' must be a non-negative"),
        (lambda: ninej(1, 1, 1, 1, 1, 1, 1, 1, "x"), r"value of 'i'"),
        (lambda: clebsch_gordan(1, "1/4", 1, 0, 1, 0), r"value of 'm1' must be an integer"),
        (lambda: threej(1, 1, 1, 0, 0, 0.3), r"value of 'm3'"),
        (lambda: sixj(1, 1, 1, 1, 1, 1001), r"MAX_SPIN = 1000"),
        (lambda: threej(1, 1, True, 0, 0, 0), r"value of 'j3'.*True"),
    ],
)
def test_bad_input_is_refused(call, match: str) -> None:  # type: ignore[no-untyped-def]
    with pytest.raises(BadValue, match=match):
        call()


# The entry points on doubled ints check their arguments too: before, a negative
# 2j gave a zero, a float a raw TypeError, and 2j far above the limit ran on.
_DOUBLED_FUNCTIONS = [
    (sixj_doubled, 6, 6),
    (ninej_doubled, 9, 9),
    (threej_doubled, 6, 3),
    (cg_doubled, 6, 3),
    (sixj_float_doubled, 6, 6),
    (ninej_float_doubled, 9, 9),
    (threej_float_doubled, 6, 3),
    (cg_float_doubled, 6, 3),
]


def _cg_order(args: list[object]) -> list[object]:
    """(j1 j2 j m1 m2 m) in the argument order of the CG functions (j1 m1 j2 m2 j m)."""
    j1, j2, j, m1, m2, m = args
    return [j1, m1, j2, m2, j, m]


@pytest.mark.parametrize(("fn", "width", "spins"), _DOUBLED_FUNCTIONS)
@pytest.mark.parametrize(
    ("bad", "match"),
    [
        (-2, r"\(2j\) must be >= 0, got -2"),
        (2.0, r"must be an int, got 2.0"),
        (True, r"must be an int, got True"),
        ("2", r"must be an int, got '2'"),
        (2002, r"above the limit 2 MAX_SPIN = 2000"),
        (10**40, r"above the limit 2 MAX_SPIN = 2000"),
    ],
)
def test_doubled_entry_points_refuse_bad_arguments(fn, width, spins, bad, match) -> None:  # type: ignore[no-untyped-def]
    for k in range(spins):
        args: list[object] = [2] * width
        args[k] = bad
        if fn in (cg_doubled, cg_float_doubled):
            args = _cg_order(args)
        with pytest.raises(BadValue, match=match):
            fn(*args)


@pytest.mark.parametrize(("fn", "width", "spins"), _DOUBLED_FUNCTIONS)
def test_doubled_entry_points_read_numpy_ints_by_value(fn, width, spins) -> None:  # type: ignore[no-untyped-def]
    # Arguments large enough that int64 products would overflow inside the sums.
    rng = random.Random(width * 10 + spins)
    for _ in range(5):
        if width == 9:
            x = [rng.randrange(0, 60) for _ in range(4)]
            plain = [x[0], x[1], x[0] + x[1], x[2], x[3], x[2] + x[3],
                     x[0] + x[2], x[1] + x[3], x[0] + x[1] + x[2] + x[3]]  # fmt: skip
        elif spins == 6:
            a, b, d = (rng.randrange(100, 400, 2) for _ in range(3))
            plain = [a, b, a + b, d, a + b + d, b + d]
        else:
            j1, j2 = rng.randrange(100, 400), rng.randrange(100, 400)
            m1, m2 = j1 - 2 * rng.randrange(0, j1 + 1), j2 - 2 * rng.randrange(0, j2 + 1)
            plain = [j1, j2, j1 + j2, m1, m2, -(m1 + m2)]
            if fn in (cg_doubled, cg_float_doubled):
                plain[5] = m1 + m2  # <j1 m1 j2 m2 | j m> has m = m1 + m2
                plain = _cg_order(plain)
        wide = [np.int64(v) for v in plain]
        assert fn(*wide) == fn(*plain)
        # stretched couplings (c = a + b) never give zero (from memory: their closed
        # forms are single products), so a value is compared, not two zeros
        assert fn(*plain) != 0


@pytest.mark.parametrize(
    "args",
    [
        (1, 2, 1, 0, 1, 2),  # m sum: 2 + 0 != 2? no, m = m1 + m2 = 2 but j = 1 < |m|
        (1, 1, 1, 0, 3, 1),  # m != m1 + m2
        (1, 0, 1, 0, 4, 0),  # triangle broken
        (1, "1/2", 1, 0, 1, "1/2"),  # j + m not an integer
        (1, 0, 1, 0, 1, 0),  # j1 + j2 + j odd with all m = 0: zero by symmetry (1.5)
    ],
)
def test_selection_rules_give_exact_zero(args: tuple[object, ...]) -> None:
    value = clebsch_gordan(*args)
    assert value == 0
    assert isinstance(value, Radical)


def test_selection_rules_six_nine() -> None:
    # DLMF 34.2.1: the triangle condition and integer sums; zero, not an error
    assert sixj(1, 1, 3, 1, 1, 1) == 0
    assert sixj(1, "1/2", "3/2", "1/2", 1, "1/2") == 0  # triad (1, 1, 1/2) has a half sum
    assert ninej(1, 1, 3, 1, 1, 1, 1, 1, 1) == 0
