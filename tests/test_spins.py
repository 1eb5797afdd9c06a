"""Parsing and checking angular-momentum values (recouple.numbers.spins)."""

from __future__ import annotations

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
