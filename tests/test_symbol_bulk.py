"""The bulk (numpy) float path of 6j and 9j symbols, recouple.symbols.bulk.

References, named beside each check:
- recouple's exact path: ``sixj_doubled`` / ``ninej_doubled`` (exact Racah sums,
  DLMF 34.4.2 and 34.6.2; exact zeros) and ``sixj_float_doubled`` /
  ``ninej_float_doubled`` (the same exact sums rounded once, <= 4.5e-16);
- sympy.physics.wigner.wigner_6j / wigner_9j for a few values;
- a plain float64 Racah sum written here, to show what the double-double sum and
  the exact fallback protect against.
"""

from __future__ import annotations

import itertools
import math
import random
from typing import Any

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from symbol_factory import random_ninej, tri
from sympy import Rational
from sympy.physics.wigner import wigner_6j, wigner_9j

from recouple.errors import BadValue
from recouple.numbers.spins import MAX_SPIN
from recouple.symbols.bulk import (
    ninej_float_many,
    ninej_float_many_checked,
    sixj_float_many,
    sixj_float_many_checked,
)
from recouple.symbols.floats import ninej_float_doubled, sixj_float_doubled
from recouple.symbols.values import ninej_doubled, sixj_doubled

PROMISE = 1e-12  # the relative error every returned value must meet (issue 5)


def rel_err(got: float, ref: float) -> float:
    if ref == 0.0:
        return abs(got)
    return abs(got - ref) / abs(ref)


def _check(rows: list[tuple[int, ...]], width: int, bulk: Any, exact: Any, rounded: Any) -> float:
    """Bulk against the exact path row by row; returns the worst relative error."""
    got = bulk(np.array(rows, dtype=np.int64).reshape(-1, width))
    worst = 0.0
    for row, value in zip(rows, got, strict=True):
        if exact(*row) == 0:  # exact zero (triangle or nontrivial): exactly 0.0
            assert value == 0.0, row
            continue
        err = rel_err(float(value), rounded(*row))
        assert err <= PROMISE, (row, value)
        worst = max(worst, err)
    return worst


def check_sixj(rows: list[tuple[int, ...]]) -> float:
    return _check(rows, 6, sixj_float_many, sixj_doubled, sixj_float_doubled)


def check_ninej(rows: list[tuple[int, ...]]) -> float:
    return _check(rows, 9, ninej_float_many, ninej_doubled, ninej_float_doubled)


def random_sixj(rng: random.Random, lo: int, hi: int) -> tuple[int, ...]:
    """A doubled 6j with all four triads admissible, entries in [lo, hi]."""
    while True:
        a, b, d, e = (rng.randint(lo, hi) for _ in range(4))
        cs = [c for c in range(abs(a - b), a + b + 1, 2) if lo <= c <= hi and tri(d, e, c)]
        fs = [f for f in range(abs(a - e), a + e + 1, 2) if lo <= f <= hi and tri(d, b, f)]
        if cs and fs:
            return a, b, rng.choice(cs), d, e, rng.choice(fs)


# -- agreement with the exact path --------------------------------------------------------------


@pytest.mark.slow
def test_sixj_exhaustive_small() -> None:
    # reference: recouple's exact 6j (DLMF 34.4.2); every row with each 2j in 0..6,
    # admissible or not (7^6 rows), so triangle zeros are covered too.
    rows = list(itertools.product(range(7), repeat=6))
    got = sixj_float_many(np.array(rows))
    admissible = 0
    for row, value in zip(rows, got, strict=True):
        a, b, c, d, e, f = row
        if not (tri(a, b, c) and tri(a, e, f) and tri(d, b, f) and tri(d, e, c)):
            assert value == 0.0, row  # DLMF 34.4.2: zero unless all four triads hold
            continue
        admissible += 1
        if sixj_doubled(*row) == 0:
            assert value == 0.0, row
        else:
            assert rel_err(float(value), sixj_float_doubled(*row)) <= PROMISE, row
    assert admissible > 2000


def test_ninej_exhaustive_small() -> None:
    # reference: recouple's exact 9j (DLMF 34.6.2); every row with each 2j in 0..2
    # (3^9 rows, admissible or not).
    rows = list(itertools.product(range(3), repeat=9))
    check_ninej(rows)


@pytest.mark.parametrize(("lo", "hi", "count"), [(10, 40, 300), (40, 100, 200)])
def test_sixj_random_medium_and_large(lo: int, hi: int, count: int) -> None:
    # reference: recouple's exact 6j; seeded, 2j from lo to hi (j up to 50).
    rng = random.Random(500 + hi)
    assert check_sixj([random_sixj(rng, lo, hi) for _ in range(count)]) <= PROMISE


@pytest.mark.parametrize(("lo", "hi", "count"), [(0, 6, 300), (10, 30, 40), (40, 100, 6)])
def test_ninej_random_small_medium_large(lo: int, hi: int, count: int) -> None:
    # reference: recouple's exact 9j; seeded, 2j from lo to hi (j up to 50).
    rng = random.Random(900 + hi)
    assert check_ninej([random_ninej(rng, lo, hi) for _ in range(count)]) <= PROMISE


@settings(max_examples=60, deadline=None, derandomize=True)
@given(st.lists(st.lists(st.integers(0, 30), min_size=6, max_size=6), min_size=1, max_size=20))
def test_sixj_hypothesis(rows: list[list[int]]) -> None:
    # reference: recouple's exact 6j; arbitrary rows, mostly not admissible (zeros).
    check_sixj([tuple(r) for r in rows])


@settings(max_examples=30, deadline=None, derandomize=True)
@given(st.lists(st.integers(0, 2**31), min_size=1, max_size=8))
def test_sixj_hypothesis_admissible(seeds: list[int]) -> None:
    # reference: recouple's exact 6j; admissible rows drawn from hypothesis' seeds.
    check_sixj([random_sixj(random.Random(s), 0, 60) for s in seeds])


@settings(max_examples=25, deadline=None, derandomize=True)
@given(st.lists(st.integers(0, 2**31), min_size=1, max_size=5))
def test_ninej_hypothesis_admissible(seeds: list[int]) -> None:
    # reference: recouple's exact 9j.
    check_ninej([random_ninej(random.Random(s), 0, 12) for s in seeds])


@pytest.mark.parametrize(
    "row",
    [(2, 2, 2, 2, 2, 2), (1, 3, 4, 3, 1, 2), (5, 3, 4, 3, 5, 6), (20, 30, 40, 30, 20, 30)],
)
def test_sixj_against_sympy(row: tuple[int, ...]) -> None:
    # reference: sympy.physics.wigner.wigner_6j (arguments j, not 2j)
    ref = float(wigner_6j(*(Rational(x, 2) for x in row)))
    got = float(sixj_float_many(np.array([row]))[0])
    assert rel_err(got, ref) <= PROMISE


@pytest.mark.parametrize(
    "row",
    [
        (3, 3, 2, 4, 4, 4, 1, 1, 2),  # CONVENTIONS 2.5: sqrt(210)/300
        (1, 2, 3, 2, 1, 3, 3, 3, 2),  # CONVENTIONS 2.5: -1/144
        (2, 4, 6, 8, 10, 12, 6, 12, 18),  # CONVENTIONS 2.5: sqrt(15)/6370
    ],
)
def test_ninej_against_sympy(row: tuple[int, ...]) -> None:
    # reference: sympy.physics.wigner.wigner_9j, arguments row by row
    ref = float(wigner_9j(*(Rational(x, 2) for x in row)))
    got = float(ninej_float_many(np.array([row]))[0])
    assert rel_err(got, ref) <= PROMISE


# -- the error bound and the exact fallback ------------------------------------------------------


def plain_float_racah(row: tuple[int, ...]) -> float:
    """DLMF 34.4.2 summed in plain float64 (lgamma-free, via math.factorial floats):
    what a naive vectorised sum would give."""
    a, b, c, d, e, f = row
    alpha = [(a + b + c) // 2, (a + e + f) // 2, (d + b + f) // 2, (d + e + c) // 2]
    beta = [(a + b + d + e) // 2, (b + c + e + f) // 2, (c + a + f + d) // 2]

    def fact(n: int) -> float:
        return float(math.factorial(n))

    def delta_sq(x: int, y: int, z: int) -> float:
        return (fact((x + y - z) // 2) * fact((x - y + z) // 2) * fact((-x + y + z) // 2)) / fact(
            (x + y + z) // 2 + 1
        )

    total = 0.0
    for s in range(max(alpha), min(beta) + 1):
        den = math.prod(fact(s - x) for x in alpha) * math.prod(fact(y - s) for y in beta)
        total += (-1) ** s * fact(s + 1) / den
    pre = delta_sq(a, b, c) * delta_sq(a, e, f) * delta_sq(d, b, f) * delta_sq(d, e, c)
    return math.sqrt(pre) * total


def test_double_double_sum_where_plain_floats_fail() -> None:
    # reference: recouple's exact 6j.  At j ~ 40 Racah's sum cancels ~10 digits, so
    # a plain float64 sum misses 1e-12; the bulk path does not.
    rng = random.Random(11)
    rows = [random_sixj(rng, 70, 90) for _ in range(60)]
    plain = max(rel_err(plain_float_racah(r), sixj_float_doubled(*r)) for r in rows)
    assert plain > 1e-10  # the naive sum really is wrong here
    got = sixj_float_many_checked(np.array(rows))
    assert not got.recomputed.any()  # ... and the vectorised path vouches for itself
    assert check_sixj(rows) <= PROMISE


def test_nontrivial_zeros_at_small_j_are_exact_without_recompute() -> None:
    # reference: recouple's exact 6j gives exact zero for {2 3/2 3/2; 3/2 2 2}
    # although all four triads hold, and the 9j with all j = 1 is 0 (CONVENTIONS
    # 2.5).  The exact integer path proves them zero (bound 0.0), so they are not
    # recomputed, and they are +0.0, not rounding noise or -0.0.
    row = (4, 3, 3, 3, 4, 4)
    assert sixj_doubled(*row) == 0
    got = sixj_float_many_checked(np.array([row, (2, 2, 2, 2, 2, 2)]))
    assert got.values[0] == 0.0
    assert not np.signbit(got.values[0])
    assert got.bound.tolist() == [0.0, 8 * 2.0**-53]
    assert got.recomputed.tolist() == [False, False]
    nine = ninej_float_many_checked(np.array([[2] * 9]))
    assert ninej_doubled(*[2] * 9) == 0
    assert nine.values[0] == 0.0
    assert not np.signbit(nine.values[0])
    assert nine.bound[0] == 0.0
    assert not bool(nine.recomputed[0])


@pytest.mark.parametrize(
    ("row", "width"),
    [
        ((13, 18, 19, 17, 10, 5), 6),  # every column sum above 38: the general path
        ((12, 14, 4, 23, 21, 19), 6),
        ((9, 11, 8, 10, 12, 6, 7, 17, 10), 9),  # a+d+h+i = 46: the general path
        ((6, 12, 16, 5, 6, 3, 11, 10, 19), 9),
    ],
)
def test_nontrivial_zero_beyond_the_integer_path_is_recomputed(
    row: tuple[int, ...], width: int
) -> None:
    # reference: recouple's exact 6j / 9j give exact zero for these rows (found by a
    # seeded search); the double-double bound cannot vouch for a zero sum, so the
    # entry goes to the exact path and comes back as 0.0.
    exact = sixj_doubled if width == 6 else ninej_doubled
    bulk = sixj_float_many_checked if width == 6 else ninej_float_many_checked
    assert exact(*row) == 0
    got = bulk(np.array([row]))
    assert got.values[0] == 0.0
    assert bool(got.recomputed[0])


def _admissible_ninej(top: int) -> list[tuple[int, ...]]:
    """Every 9j (doubled, rows in order) with each 2j in 0..top and its six row and
    column triads admissible (DLMF 34.2.1)."""
    span = range(top + 1)
    out = []
    for a, b, d, e in itertools.product(span, repeat=4):
        for c, f, g, h in itertools.product(span, repeat=4):
            if not (tri(a, b, c) and tri(d, e, f) and tri(a, d, g) and tri(b, e, h)):
                continue
            out += [(a, b, c, d, e, f, g, h, i) for i in span if tri(c, f, i) and tri(g, h, i)]
    return out


@pytest.mark.slow
def test_ninej_exhaustive_admissible_up_to_2j_5() -> None:
    # reference: recouple's exact 9j (DLMF 34.6.2): every admissible 9j with each 2j
    # in 0..5, all on the exact integer path (bound 8 u, or 0.0 for a proven zero),
    # nontrivial zeros exactly 0.0, nothing recomputed.
    rows = _admissible_ninej(5)
    assert len(rows) > 30000
    assert check_ninej(rows) <= 8 * 2.0**-53 + 4.5e-16  # 8 u plus the reference's rounding
    got = ninej_float_many_checked(np.array(rows))
    assert not got.recomputed.any()
    assert (got.bound <= 8 * 2.0**-53).all()
    zeros = got.bound == 0.0
    assert zeros.sum() > 100  # nontrivial zeros are among them, proven exact
    assert (got.values[zeros] == 0.0).all()


@pytest.mark.parametrize("top_sum", [36, 38, 40, 42])
def test_sixj_at_the_edge_of_the_integer_path(top_sum: int) -> None:
    # reference: recouple's exact 6j.  Rows whose smallest column sum is near the
    # integer path's limit of 38 (doubled), where its integers are largest (up to
    # about 20!): exact agreement below the limit, the general path above it.
    rng = random.Random(top_sum)
    rows: list[tuple[int, ...]] = []
    while len(rows) < 60:
        a, b, c, d, e, f = random_sixj(rng, 6, 14)
        if min(a + b + d + e, b + c + e + f, c + a + f + d) == top_sum:
            rows.append((a, b, c, d, e, f))
    assert check_sixj(rows) <= PROMISE
    got = sixj_float_many_checked(np.array(rows))
    on_integer_path = got.bound <= 8 * 2.0**-53
    assert on_integer_path.all() == (top_sum <= 38)
    assert on_integer_path.any() == (top_sum <= 38)


def test_ninej_integer_check_and_its_fallback() -> None:
    # reference: recouple's exact 9j.  At 2j from 6 to 10 the inner column sums are
    # within the integer path's limit, but many x-terms are too large for its check,
    # so those symbols go to the double-double path; both kinds must be right.
    rng = random.Random(77)
    rows = [random_ninej(rng, 6, 10) for _ in range(120)]
    assert check_ninej(rows) <= PROMISE
    got = ninej_float_many_checked(np.array(rows))
    on_integer_path = got.bound <= 8 * 2.0**-53
    assert 10 <= on_integer_path.sum() <= len(rows) - 10


def test_ill_conditioned_large_j_are_recomputed() -> None:
    # reference: recouple's exact 6j.  At 2j ~ 400 the alternating sum cancels
    # beyond double-double; those entries must be recomputed, and still be right.
    rng = random.Random(3)
    rows = [random_sixj(rng, 380, 420) for _ in range(6)]
    got = sixj_float_many_checked(np.array(rows))
    assert got.recomputed.sum() >= 1
    for row, value, redo, bound in zip(rows, got.values, got.recomputed, got.bound, strict=True):
        assert redo == (not bound <= 1e-13)
        assert rel_err(float(value), sixj_float_doubled(*row)) <= PROMISE


def test_bounds_hold_where_vouched() -> None:
    # reference: recouple's exact 6j and 9j.  Where the bulk path kept its own value,
    # the observed error is within the proven bound (plus the reference's rounding).
    rng = random.Random(21)
    six = [random_sixj(rng, 0, 80) for _ in range(150)]
    got = sixj_float_many_checked(np.array(six))
    for row, value, bound in zip(six, got.values, got.bound, strict=True):
        ref = sixj_float_doubled(*row)
        if ref:
            assert rel_err(float(value), ref) <= bound + 5e-16, row
    nine = [random_ninej(rng, 0, 16) for _ in range(40)]
    got9 = ninej_float_many_checked(np.array(nine))
    for row, value, bound in zip(nine, got9.values, got9.bound, strict=True):
        ref = ninej_float_doubled(*row)
        if ref:
            assert rel_err(float(value), ref) <= bound + 5e-16, row


def test_tolerance_zero_recomputes_everything() -> None:
    # reference: the exact path rounded once (floats.py); with tolerance 0 every
    # admissible entry is recomputed, so the values are bit-identical to it.
    rng = random.Random(5)
    rows = [random_sixj(rng, 0, 20) for _ in range(20)] + [(2, 2, 6, 2, 2, 2)]
    got = sixj_float_many_checked(np.array(rows), tolerance=0.0)
    assert got.recomputed[:-1].all()
    assert not got.recomputed[-1]  # the last is a triangle zero
    assert got.values.tolist() == [sixj_float_doubled(*r) for r in rows]


def test_shapes_and_dtypes() -> None:
    assert sixj_float_many(np.zeros((0, 6), dtype=np.int64)).shape == (0,)
    assert ninej_float_many([[1, 1, 2, 1, 1, 2, 2, 2, 4]]).dtype == np.float64  # a list is fine
    as_int32 = sixj_float_many(np.array([[2, 2, 2, 2, 2, 2]], dtype=np.int32))
    assert as_int32.tolist() == [sixj_float_doubled(2, 2, 2, 2, 2, 2)]
    # a batch larger than one vectorised chunk
    rows = np.tile(np.array([[4, 4, 4, 4, 4, 4], [3, 3, 2, 1, 1, 2]]), (20000, 1))
    got = sixj_float_many(rows)
    assert got[0::2].tolist() == [got[0]] * 20000
    assert got[1::2].tolist() == [got[1]] * 20000


# -- bad input: one clear line, a BadValue -------------------------------------------------------


@pytest.mark.parametrize(
    ("call", "match"),
    [
        (
            lambda: sixj_float_many(np.array([1, 1, 1, 1, 1, 1])),
            r"shape \(N, 6\).*got shape \(6,\)",
        ),
        (lambda: sixj_float_many(np.ones((2, 5), dtype=int)), r"shape \(N, 6\)"),
        (lambda: ninej_float_many(np.ones((2, 6), dtype=int)), r"shape \(N, 9\)"),
        (lambda: sixj_float_many(np.ones((1, 6)) * 0.5), "dtype float64"),
        (lambda: sixj_float_many(np.ones((1, 6), dtype=bool)), "dtype bool"),
        (lambda: sixj_float_many([[1, 1, 1, 1, 1, "x"]]), "dtype <U"),
        (lambda: sixj_float_many([[1, 1, 1, 1, -2, 1]]), r"row 0, column 'e' is -2.*>= 0"),
        (
            lambda: ninej_float_many([[0] * 9, [0] * 8 + [2 * MAX_SPIN + 1]]),
            rf"row 1, column 'i' is {2 * MAX_SPIN + 1}.*MAX_SPIN",
        ),
        (lambda: sixj_float_many([[1] * 6], tolerance=1e-9), "tolerance must be between"),
        (lambda: sixj_float_many([[1] * 6], tolerance="small"), "tolerance must be a number"),
        (lambda: sixj_float_many([[1, 2], [3]]), "cannot read|shape"),
    ],
)
def test_bad_input(call, match: str) -> None:  # type: ignore[no-untyped-def]
    with pytest.raises(BadValue, match=match) as info:
        call()
    assert "\n" not in str(info.value)
