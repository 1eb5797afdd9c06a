"""Parsing and checking angular-momentum values (recouple.numbers.spins)."""

from __future__ import annotations

import subprocess
import sys
from fractions import Fraction

import pytest

from recouple.errors import BadValue
from recouple.numbers.spins import (
    MAX_SPIN,
    coupled_range,
    is_triad,
    parse_projection,
    parse_spin,
    projections,
    spin_text,
    to_doubled,
)


@pytest.mark.parametrize(
    ("value", "expected"),
    [
        (0, Fraction(0)),
        (3, Fraction(3)),
        (Fraction(3, 2), Fraction(3, 2)),
        ("3/2", Fraction(3, 2)),
        ("1", Fraction(1)),
        ("1.5", Fraction(3, 2)),
        (" 2 ", Fraction(2)),
        ("6/4", Fraction(3, 2)),
        (2.0, Fraction(2)),
        (0.5, Fraction(1, 2)),
        (MAX_SPIN, Fraction(MAX_SPIN)),
        ("1999/2", Fraction(1999, 2)),
    ],
)
def test_parse_spin_accepts(value: object, expected: Fraction) -> None:
    got = parse_spin(value)
    assert got == expected
    assert type(got) is Fraction


@pytest.mark.parametrize(
    ("value", "match"),
    [
        ("1/3", r"^value of 'j1' must be a non-negative integer or half-integer, got '1/3'$"),
        ("-1", r"^value of 'j1' must be a non-negative integer or half-integer, got '-1'$"),
        (-1, r"got -1$"),
        (0.3, r"got 0\.3$"),
        (Fraction(1, 3), r"got Fraction\(1, 3\)$"),
        ("abc", r"got 'abc'$"),
        ("", r"got ''$"),
        (float("nan"), r"got nan$"),
        (float("inf"), r"got inf$"),
        ("inf", r"got 'inf'$"),
        (True, r"got True$"),
        (False, r"got False$"),
        ("1/0", r"got '1/0'$"),
        (None, r"a number or text such as '3/2'\), got None$"),
        ([1], r"got \[1\]$"),
        (MAX_SPIN + 1, r"^value of 'j1' is 1001, above the limit MAX_SPIN = 1000$"),
        ("2001/2", r"above the limit MAX_SPIN = 1000$"),
        (1e300, r"above the limit"),
    ],
)
def test_parse_spin_refuses(value: object, match: str) -> None:
    with pytest.raises(BadValue, match=match) as info:
        parse_spin(value, name="j1")
    assert "\n" not in str(info.value)  # one line


def test_parse_spin_message_without_name() -> None:
    with pytest.raises(BadValue, match=r"^angular momentum must be a non-negative"):
        parse_spin("1/3")


def test_bad_value_is_a_value_error() -> None:
    with pytest.raises(ValueError, match="half-integer"):
        parse_spin("x")


@pytest.mark.parametrize(
    ("value", "expected"), [("-3/2", Fraction(-3, 2)), (0, Fraction(0)), ("5", Fraction(5))]
)
def test_parse_projection(value: object, expected: Fraction) -> None:
    assert parse_projection(value) == expected


@pytest.mark.parametrize("value", ["1/4", 0.25, True, "m", float("nan"), -1001])
def test_parse_projection_refuses(value: object) -> None:
    with pytest.raises(BadValue, match="'m2'"):
        parse_projection(value, name="m2")


def test_to_doubled_and_text_round_trip() -> None:
    for d in range(0, 2 * MAX_SPIN + 1):
        assert to_doubled(spin_text(d)) == d
    assert spin_text(3) == "3/2"
    assert spin_text(4) == "2"
    assert spin_text(0) == "0"


def test_is_triad_exhaustive() -> None:
    # DLMF 34.2.1: |a - b| <= c <= a + b and a + b + c an integer, checked against a
    # direct enumeration of c = |a-b|, |a-b|+1, ..., a+b (common practice)
    for da in range(9):
        for db in range(9):
            allowed = set(range(abs(da - db), da + db + 1, 2))
            assert set(coupled_range(da, db)) == allowed
            for dc in range(20):
                assert is_triad(da, db, dc) == (dc in allowed)
                # symmetric in its arguments
                assert is_triad(da, db, dc) == is_triad(dc, da, db) == is_triad(db, dc, da)


def test_projections() -> None:
    assert list(projections(0)) == [0]
    assert list(projections(3)) == [-3, -1, 1, 3]
    assert len(projections(10)) == 11


@pytest.mark.parametrize(
    ("value", "expected"),
    [
        ("5e-1", Fraction(1, 2)),
        ("1.5E0", Fraction(3, 2)),
        ("1e3", Fraction(1000)),
        ("0.05e+1", Fraction(1, 2)),
    ],
)
def test_exponent_form_is_read_exactly(value: str, expected: Fraction) -> None:
    got = parse_spin(value)
    assert got == expected
    assert type(got) is Fraction


# Far-out exponents: before the fix Fraction built 10**99999999999 digit by digit and
# never returned, so they run in a child process that a regression cannot hang.
_FAR_EXPONENTS = """
from recouple.errors import BadValue
from recouple.numbers.spins import parse_projection, parse_spin
print(parse_spin("0e99999999999"))
for parse, value in [
    (parse_spin, "1e99999999999"),
    (parse_spin, "-1e99999999999"),
    (parse_spin, "1e-99999999999"),
    (parse_projection, "-1e99999999999"),
    (parse_projection, "1e-99999999999"),
]:
    try:
        parse(value, name="j")
    except BadValue as err:
        print(err.one_line())
"""


def test_exponent_far_out_of_range_is_refused() -> None:
    done = subprocess.run(
        [sys.executable, "-c", _FAR_EXPONENTS],
        capture_output=True,
        text=True,
        timeout=60,
        check=True,
    )
    assert done.stdout.splitlines() == [
        "0",
        "value of 'j' is '1e99999999999', above the limit MAX_SPIN = 1000",
        "value of 'j' must be a non-negative integer or half-integer, got '-1e99999999999'",
        "value of 'j' must be a non-negative integer or half-integer, got '1e-99999999999'",
        "value of 'j' is '-1e99999999999', beyond the limit MAX_SPIN = 1000",
        "value of 'j' must be an integer or half-integer, got '1e-99999999999'",
    ]


@pytest.mark.parametrize(
    "value",
    [10**5000, -(10**5000), Fraction(10**5000, 3), Fraction(1, 10**5000)],
    ids=["int", "negative int", "big Fraction", "tiny Fraction"],
)
def test_number_with_thousands_of_digits_gets_a_short_message(value: object) -> None:
    # repr() of such an int raises ValueError (sys.get_int_max_str_digits), which used
    # to escape instead of the BadValue
    for parse in (parse_spin, parse_projection):
        with pytest.raises(BadValue, match="a number with thousands of digits") as info:
            parse(value, name="j")
        assert len(info.value.one_line()) < 120


def test_other_exact_number_types_are_read_exactly() -> None:
    # numpy floats other than float64 and Decimal were refused although exact; they are
    # read by their exact value (as_integer_ratio, Decimal text), so 0.5 + 1e-19 in long
    # double is still not a half-integer, and NaN or an exponent out of range is refused.
    from decimal import Decimal

    import numpy as np

    for value, expected in (
        (np.float32(0.5), Fraction(1, 2)),
        (np.float16(1.5), Fraction(3, 2)),
        (np.longdouble(2.5), Fraction(5, 2)),
        (Decimal("1.5"), Fraction(3, 2)),
        (Decimal("0.5E+1"), Fraction(5)),
    ):
        assert parse_spin(value) == expected
    assert parse_projection(np.float32(-0.5)) == Fraction(-1, 2)
    off = np.longdouble(0.5) + np.longdouble(2) ** -60
    refused = (np.float32("nan"), np.float32("inf"), Decimal("NaN"), Decimal("0.3"), off)
    for value in refused:
        if value is off and off == np.longdouble(0.5):
            continue  # a platform whose long double is a plain double cannot hold it
        with pytest.raises(BadValue, match="integer or half-integer"):
            parse_spin(value)
    with pytest.raises(BadValue, match="above the limit MAX_SPIN"):
        parse_spin(Decimal("1e99999999999"))
