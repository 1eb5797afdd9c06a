"""Symmetries of the 6j and 9j, and the standard forms built on them.

The symmetry checks evaluate every arrangement through the *uncached* Racah
sums, so the canonical-form cache cannot make them pass by construction.
"""

from __future__ import annotations

from hypothesis import given, settings
from hypothesis import strategies as st

from recouple.numbers import Radical
from recouple.symbols import (
    canonical_ninej,
    canonical_sixj,
    ninej_arrangements,
    ninej_doubled,
    ninej_triads,
    sixj_arrangements,
    sixj_doubled,
    sixj_triads,
)
from recouple.symbols.values import _ninej_parts, _radical, _sixj_parts


def direct_sixj(d: tuple[int, ...]) -> Radical:
    return _radical(_sixj_parts(*d))


def direct_ninej(d: tuple[int, ...]) -> Radical:
    return _radical(_ninej_parts(*d))


def _pick(draw: st.DrawFn, lo: int, hi: int) -> int:
    """A doubled value in range(lo, hi + 1, 2)."""
    return lo + 2 * draw(st.integers(min_value=0, max_value=(hi - lo) // 2))


@st.composite
def admissible_sixj(draw: st.DrawFn, top: int = 14) -> tuple[int, int, int, int, int, int]:
    """Doubled {a b c; d e f} with all four triads admissible (DLMF 34.2.1)."""
    a = draw(st.integers(0, top))
    b = draw(st.integers(0, top))
    c = _pick(draw, abs(a - b), a + b)
    d = draw(st.integers(0, top))
    e = _pick(draw, abs(d - c), d + c)
    # f closes the triads (a e f) and (d b f)
    lo, hi = max(abs(a - e), abs(d - b)), min(a + e, d + b)
    if (a + e + lo) % 2 or (d + b + lo) % 2 or lo > hi:
        lo = hi = abs(a - e)  # not admissible then; kept as a zero case
    f = _pick(draw, lo, hi)
    return a, b, c, d, e, f


@st.composite
def admissible_ninej(draw: st.DrawFn, top: int = 6) -> tuple[int, ...]:
    """Doubled 9j, rows and columns admissible when the last entry can close them."""
    a, b, d, e = (draw(st.integers(0, top)) for _ in range(4))
    c = _pick(draw, abs(a - b), a + b)
    f = _pick(draw, abs(d - e), d + e)
    g = _pick(draw, abs(a - d), a + d)
    h = _pick(draw, abs(b - e), b + e)
    lo, hi = max(abs(c - f), abs(g - h)), min(c + f, g + h)
    if (c + f + lo) % 2 or (g + h + lo) % 2 or lo > hi:
        lo = hi = abs(c - f)
    i = _pick(draw, lo, hi)
    return a, b, c, d, e, f, g, h, i


def test_arrangement_counts() -> None:
    # DLMF 34.5.8: 24 arrangements; DLMF §34.7(ii): 72 arrangements
    assert len(set(sixj_arrangements(tuple("abcdef")))) == 24
    assert len({a for a, _ in ninej_arrangements(tuple("abcdefghi"))}) == 72
    # transposition is even; a single row swap or column swap is odd
    flags = dict(ninej_arrangements(tuple("abcdefghi")))
    assert flags[tuple("adgbehcfi")] is False  # transpose
    assert flags[tuple("defabcghi")] is True  # rows 1 <-> 2
    assert flags[tuple("bacedfhgi")] is True  # columns 1 <-> 2
    assert flags[tuple("ghiabcdef")] is False  # cyclic rows
    assert flags[tuple("edfbachgi")] is False  # rows 1<->2 and columns 1<->2


def test_arrangements_keep_triads() -> None:
    # CONVENTIONS 2.3 practical rule: the 24 arrangements are exactly those with the same
    # four triads (among arrangements of six distinct labels)
    from itertools import permutations

    base = tuple("abcdef")
    same = {p for p in permutations(base) if sixj_triads(p) == sixj_triads(base)}
    assert same == set(sixj_arrangements(base))
    rows = {frozenset(t) for t in ninej_triads(tuple("abcdefghi"))}
    for arr, _ in ninej_arrangements(tuple("abcdefghi")):
        assert {frozenset(t) for t in ninej_triads(arr)} == rows


@settings(derandomize=True, max_examples=120, deadline=None)
@given(admissible_sixj())
def test_sixj_24_symmetries(d: tuple[int, ...]) -> None:
    # DLMF 34.5.8 (CONVENTIONS 2.3): all 24 arrangements have the same value
    value = direct_sixj(d)
    for arr in sixj_arrangements(d):
        assert direct_sixj(arr) == value, arr
        assert sixj_doubled(*arr) == value  # the cached path agrees


@settings(derandomize=True, max_examples=60, deadline=None)
@given(admissible_ninej())
def test_ninej_72_symmetries(d: tuple[int, ...]) -> None:
    # DLMF §34.7(ii) (CONVENTIONS 2.6): phase (-1)^R for an odd permutation of rows or
    # of columns, R = sum of the nine entries
    value = direct_ninej(d)
    r = sum(d) // 2  # an integer whenever the symbol can be nonzero
    for arr, odd in ninej_arrangements(d):
        expected = -value if odd and r % 2 else value
        assert direct_ninej(arr) == expected, (arr, odd)
        assert ninej_doubled(*arr) == expected


def test_ninej_phase_is_needed() -> None:
    # A case with odd R and nonzero value, so a missing phase would show (DLMF §34.7(ii))
    d = (3, 2, 1, 3, 2, 3, 4, 2, 2)  # {3/2 1 1/2; 3/2 1 3/2; 2 1 1}, CONVENTIONS 2.5
    assert sum(d) // 2 % 2 == 1  # R = 11
    assert direct_ninej(d) == -Radical.sqrt(15) / 360
    swapped = (d[1], d[0], d[2], d[4], d[3], d[5], d[7], d[6], d[8])  # columns 1 <-> 2
    assert direct_ninej(swapped) == Radical.sqrt(15) / 360


@settings(derandomize=True, max_examples=100, deadline=None)
@given(admissible_sixj(top=12))
def test_regge_symmetry(d: tuple[int, ...]) -> None:
    # DLMF 34.5.9 (CONVENTIONS 2.3): {j1 j2 j3; l1 l2 l3} =
    # {j1 (j2+l2+j3-l3)/2 (j2-l2+j3+l3)/2; l1 (j2+l2-j3+l3)/2 (-j2+l2+j3+l3)/2}
    j1, j2, j3, l1, l2, l3 = d
    new = (j2 + l2 + j3 - l3, j2 - l2 + j3 + l3, j2 + l2 - j3 + l3, -j2 + l2 + j3 + l3)
    if any(x % 2 or x < 0 for x in new):
        return  # new entries must be integers or half-integers (doubled: even sums)
    n1, n2, n3, n4 = (x // 2 for x in new)
    assert direct_sixj((j1, n1, n2, l1, n3, n4)) == direct_sixj(d)


def test_canonical_forms_are_invariant() -> None:
    labels = tuple("pqrstu")
    first = canonical_sixj(labels)
    assert all(canonical_sixj(a) == first for a in sixj_arrangements(labels))
    nine = tuple("abcdefghi")
    best, odd = canonical_ninej(nine)
    for arr, arr_odd in ninej_arrangements(nine):
        b2, o2 = canonical_ninej(arr)
        assert b2 == best
        # phases compose: value(arr) = (-1)^(R arr_odd) value(nine) = (-1)^(R (arr_odd ^ o2))
        # value(best), so o2 must equal arr_odd ^ odd
        assert o2 == (arr_odd ^ odd)


def test_canonical_with_key() -> None:
    rank = {name: k for k, name in enumerate("zyxwvu")}

    def key(t: tuple[str, ...]) -> tuple[int, ...]:
        return tuple(rank[x] for x in t)

    assert canonical_sixj(tuple("uvwxyz"), key=key)[0] == "z"
    best, _ = canonical_ninej(tuple("abcdefghi"), key=lambda t: tuple(reversed(t)))
    assert best[-1] == "a"
