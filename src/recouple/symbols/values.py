"""Exact Clebsch-Gordan coefficients and 3j, 6j, 9j symbols.

Each public function takes ints, Fractions or text such as ``"3/2"``; bad
input raises :class:`~recouple.errors.BadValue`; a valid input that breaks a
selection rule (triangle, integer sums, ``m`` sum, ``|m| > j``, ``j + m`` not an
integer) gives exact zero.  The ``*_doubled`` entry points take ``2j`` and ``2m``
as ints (any integer type, numpy's included) with a quick range check; the
library's own hot loops call the cached, unchecked ``_*_doubled`` versions.

Method: Racah's single sums evaluated in Python integers on doubled arguments.
The alternating sum is scaled by a common factorial denominator (a term
recurrence keeps every partial value an integer), and the square root of the
product of triangle factorials is split into square and square-free parts from
parity masks of prime exponents (Legendre's formula), so no big integer is
factored and one :class:`~recouple.numbers.Radical` is built at the end.

>>> print(clebsch_gordan("1/2", "1/2", "1/2", "-1/2", 1, 0))
sqrt(1/2)
>>> print(sixj(1, 1, 1, 1, 1, 1), ninej("1/2", "1/2", 1, "1/2", "1/2", 1, 1, 1, 2))
1/6 1/9
>>> print(threej(1, 1, 2, 1, -1, 0))
sqrt(1/30)
"""

from __future__ import annotations

import math
from fractions import Fraction
from functools import lru_cache
from operator import itemgetter

from recouple.numbers._integers import (
    fact_parity_masks,
    factorial_table,
    int_parity_mask,
    primes_of_mask,
)
from recouple.numbers.radicals import Radical, radical_from_parts
from recouple.numbers.spins import check_doubled, parse_projection, parse_spin
from recouple.symbols.canonical import NINEJ_INDEX_MAPS, SIXJ_INDEX_MAPS

# itemgetters build each symmetric arrangement in C: the standard-form key of a
# symbol otherwise costs more than its Racah sum at small j.
_SIXJ_GETTERS = tuple(itemgetter(*m) for m in SIXJ_INDEX_MAPS)
_NINEJ_GETTERS = tuple(itemgetter(*m) for m, _ in NINEJ_INDEX_MAPS)
_NINEJ_ODD = tuple(odd for _, odd in NINEJ_INDEX_MAPS)

__all__ = [
    "CACHE_SIZE",
    "cg_doubled",
    "clebsch_gordan",
    "ninej",
    "ninej_doubled",
    "sixj",
    "sixj_doubled",
    "threej",
    "threej_doubled",
]

#: Bound of each lru_cache below (entries); a 6j entry is a few hundred bytes
#: at small j, so a full cache is some tens of MB at most.
CACHE_SIZE = 1 << 16

_ZERO = Radical(0)

# Parts of a symbol, value = S/D * sqrt(P/Q): (S, D, P, Q, mask), where ``mask`` is
# the parity mask of P*Q (bit k set when the k-th prime divides P*Q to an odd power).
Parts = tuple[int, int, int, int, int]


def _tri(a: int, b: int, c: int) -> bool:
    """Triangle condition on doubled values (DLMF 34.2.1)."""
    return not (a + b + c) & 1 and abs(a - b) <= c <= a + b


# -- exact assembly ----------------------------------------------------------------


def _radical(parts: Parts | None) -> Radical:
    """``S/D * sqrt(P/Q)`` as one Radical: sqrt(P/Q) = r sqrt(sf) / Q, r^2 sf = P Q."""
    if parts is None:
        return _ZERO
    s_num, s_den, p, q, mask = parts
    if not s_num:
        return _ZERO
    sf = primes_of_mask(mask)
    r = math.isqrt(p * q // sf)
    return radical_from_parts(Fraction(s_num * r, s_den * q), sf)


# -- 3j and Clebsch-Gordan ------------------------------------------------------------


def _threej_parts(
    j1: int, j2: int, j3: int, m1: int, m2: int, m3: int, with_dim: bool
) -> Parts | None:
    """Racah's formula for the 3j (DLMF 34.2.4, 34.2.5), without its phase.

    Doubled arguments.  With ``with_dim`` the factor ``2 j3 + 1`` joins P, as
    the Clebsch-Gordan coefficient needs (CONVENTIONS 1.1).
    """
    if m1 + m2 + m3 or not _tri(j1, j2, j3):
        return None
    if abs(m1) > j1 or abs(m2) > j2 or abs(m3) > j3 or (j1 + m1) & 1 or (j2 + m2) & 1:
        return None  # (j3 + m3) parity follows from the others
    # Undoubled integers of the sum (DLMF 34.2.4):
    k1 = (j1 + j2 - j3) // 2
    k2 = (j1 - m1) // 2
    k3 = (j2 + m2) // 2
    n1 = (j3 - j2 + m1) // 2
    n2 = (j3 - j1 - m2) // 2
    smin = max(0, -n1, -n2)
    smax = min(k1, k2, k3)
    if smax < smin:
        return None
    t12, t13, t23 = k1, (j1 - j2 + j3) // 2, (-j1 + j2 + j3) // 2
    big = (j1 + j2 + j3) // 2 + 1
    f = factorial_table(big + 1)
    fm = fact_parity_masks(big + 1)
    jm = ((j1 + m1) // 2, (j1 - m1) // 2, (j2 + m2) // 2, (j2 - m2) // 2)
    jm3 = ((j3 + m3) // 2, (j3 - m3) // 2)
    # Sum_s (-1)^s / (s! (k1-s)! (k2-s)! (k3-s)! (n1+s)! (n2+s)!), times the common
    # denominator D = smax! (k1-smin)! (k2-smin)! (k3-smin)! (n1+smax)! (n2+smax)!;
    # u stays an integer: u(s+1) = -u(s) (k1-s)(k2-s)(k3-s) / ((s+1)(n1+s+1)(n2+s+1)).
    u = (f[smax] // f[smin]) * (f[n1 + smax] // f[n1 + smin]) * (f[n2 + smax] // f[n2 + smin])
    total = 0
    s = smin
    while True:
        total += -u if s & 1 else u
        if s == smax:
            break
        u = u * (k1 - s) * (k2 - s) * (k3 - s) // ((s + 1) * (n1 + s + 1) * (n2 + s + 1))
        s += 1
    den = f[smax] * f[k1 - smin] * f[k2 - smin] * f[k3 - smin] * f[n1 + smax] * f[n2 + smax]
    p = f[t12] * f[t13] * f[t23]
    mask = fm[t12] ^ fm[t13] ^ fm[t23] ^ fm[big]
    for x in jm + jm3:
        p *= f[x]
        mask ^= fm[x]
    if with_dim:
        p *= j3 + 1
        mask ^= int_parity_mask(j3 + 1)
    return total, den, p, f[big], mask


def _threej_sign(j1: int, j2: int, m3: int) -> int:
    """(-1)^(j1 - j2 - m3) on doubled values (an integer exponent when admissible)."""
    return -1 if ((j1 - j2 - m3) // 2) & 1 else 1


@lru_cache(maxsize=CACHE_SIZE)
def _threej_doubled(j1: int, j2: int, j3: int, m1: int, m2: int, m3: int) -> Radical:
    """The 3j symbol (j1 j2 j3; m1 m2 m3) from doubled ints (DLMF 34.2.4).

    >>> print(_threej_doubled(2, 2, 0, 2, -2, 0))  # DLMF 34.3.1: (-1)^(j-m)/sqrt(2j+1)
    sqrt(1/3)
    """
    value = _radical(_threej_parts(j1, j2, j3, m1, m2, m3, False))
    return -value if value and _threej_sign(j1, j2, m3) < 0 else value


@lru_cache(maxsize=CACHE_SIZE)
def _cg_doubled(j1: int, m1: int, j2: int, m2: int, j: int, m: int) -> Radical:
    """<j1 m1 j2 m2 | j m> (Condon-Shortley) from doubled ints.

    From CONVENTIONS 1.1 (DLMF 34.1.1): the phases (-1)^(j1-j2+m) of the
    conversion and (-1)^(j1-j2+m) of the 3j (34.2.4, with m3 = -m) multiply to
    (-1)^(2(j1-j2+m)) = 1, so only Racah's sum and sqrt(2j+1) remain.

    >>> print(_cg_doubled(2, 2, 1, -1, 3, 1))
    sqrt(1/3)
    """
    return _radical(_threej_parts(j1, j2, j, m1, m2, -m, True))


# -- 6j ------------------------------------------------------------------------------


def _racah_sum6(a: int, b: int, c: int, d: int, e: int, f: int) -> tuple[int, int]:
    """The sum of Racah's 6j formula (DLMF 34.4.2) as ``(S, D)``, value S/D.

    Doubled arguments of {a b c; d e f}; all four triads must be admissible.
    """
    a1 = (a + b + c) // 2
    a2 = (a + e + f) // 2
    a3 = (d + b + f) // 2
    a4 = (d + e + c) // 2
    b1 = (a + b + d + e) // 2
    b2 = (b + c + e + f) // 2
    b3 = (c + a + f + d) // 2
    smin = max(a1, a2, a3, a4)
    smax = min(b1, b2, b3)
    if smax < smin:
        return 0, 1
    fa = factorial_table(smax + 1)
    # Common denominator D = prod_i (smax - a_i)! prod_k (b_k - smin)!; the scaled
    # term u(s) = (s+1)! D / (prod (s-a_i)! prod (b_k-s)!) stays an integer and
    # u(s+1) = u(s) (s+2) prod (b_k - s) / prod (s + 1 - a_i).
    u = fa[smin + 1]
    for ai in (a1, a2, a3, a4):
        u *= fa[smax - ai] // fa[smin - ai]
    total = 0
    s = smin
    while True:
        total += -u if s & 1 else u
        if s == smax:
            break
        u = (
            u
            * (s + 2)
            * (b1 - s)
            * (b2 - s)
            * (b3 - s)
            // ((s + 1 - a1) * (s + 1 - a2) * (s + 1 - a3) * (s + 1 - a4))
        )
        s += 1
    den = (
        fa[smax - a1]
        * fa[smax - a2]
        * fa[smax - a3]
        * fa[smax - a4]
        * fa[b1 - smin]
        * fa[b2 - smin]
        * fa[b3 - smin]
    )
    return total, den


def _delta_sq(
    triads: tuple[tuple[int, int, int], ...],
) -> tuple[int, int, int]:
    """prod of Delta^2 over admissible doubled triads (DLMF 34.2.5) as (P, Q, mask)."""
    big = max(sum(t) for t in triads) // 2 + 1
    f = factorial_table(big)
    fm = fact_parity_masks(big)
    p = q = 1
    mask = 0
    for x, y, z in triads:
        n1, n2, n3, n4 = (x + y - z) // 2, (x - y + z) // 2, (-x + y + z) // 2, (x + y + z) // 2 + 1
        p *= f[n1] * f[n2] * f[n3]
        q *= f[n4]
        mask ^= fm[n1] ^ fm[n2] ^ fm[n3] ^ fm[n4]
    return p, q, mask


def _sixj_parts(a: int, b: int, c: int, d: int, e: int, f: int) -> Parts | None:
    """{a b c; d e f} (doubled) as parts; None when a triad fails (DLMF 34.4.2)."""
    triads = ((a, b, c), (a, e, f), (d, b, f), (d, e, c))
    for x, y, z in triads:
        if not _tri(x, y, z):
            return None
    s_num, s_den = _racah_sum6(a, b, c, d, e, f)
    p, q, mask = _delta_sq(triads)
    return s_num, s_den, p, q, mask


@lru_cache(maxsize=CACHE_SIZE)
def _sixj_canonical(key: tuple[int, int, int, int, int, int]) -> Radical:
    return _radical(_sixj_parts(*key))


@lru_cache(maxsize=CACHE_SIZE)
def _sixj_doubled(a: int, b: int, c: int, d: int, e: int, f: int) -> Radical:
    """{a b c; d e f} from doubled ints (DLMF 34.4.2), cached under its standard
    form among the 24 symmetric arrangements (DLMF 34.5.8).

    >>> print(_sixj_doubled(2, 2, 2, 2, 2, 2))
    1/6
    """
    entries = (a, b, c, d, e, f)
    for x, y, z in ((a, b, c), (a, e, f), (d, b, f), (d, e, c)):
        if not _tri(x, y, z):
            return _ZERO
    key = min([get(entries) for get in _SIXJ_GETTERS])
    return _sixj_canonical(key)


# -- 9j ------------------------------------------------------------------------------


def _ninej_sum(
    a: int, b: int, c: int, d: int, e: int, f: int, g: int, h: int, i: int
) -> tuple[Fraction, tuple[tuple[int, int, int], ...]] | None:
    """The rational part of the 9j and its six row/column triads.

    DLMF 34.6.2: 9j = sum_x (-1)^(2x) (2x+1) {a d g; h i x} {b e h; d x f} {c f i; x a b}.
    Of the twelve triangle coefficients of the three 6j, the x-dependent triads
    (a i x), (h d x), (b f x) each occur twice, so their Delta^2 is rational; the
    other six are the rows and columns of the 9j and come out of the sum.
    """
    triads = ((a, b, c), (d, e, f), (g, h, i), (a, d, g), (b, e, h), (c, f, i))
    for x, y, z in triads:
        if not _tri(x, y, z):
            return None
    lo = max(abs(a - i), abs(d - h), abs(b - f))
    hi = min(a + i, d + h, b + f)
    if (a + i + lo) & 1 or (d + h + lo) & 1 or (b + f + lo) & 1:
        return None
    total = Fraction(0)
    fa = factorial_table((max(a + i, d + h, b + f) + hi) // 2 + 1)
    for x in range(lo, hi + 1, 2):
        s1, d1 = _racah_sum6(a, d, g, h, i, x)
        if not s1:
            continue
        s2, d2 = _racah_sum6(b, e, h, d, x, f)
        if not s2:
            continue
        s3, d3 = _racah_sum6(c, f, i, x, a, b)
        if not s3:
            continue
        num = (x + 1) * s1 * s2 * s3
        den = d1 * d2 * d3
        for y, z in ((a, i), (h, d), (b, f)):
            num *= fa[(y + z - x) // 2] * fa[(y - z + x) // 2] * fa[(-y + z + x) // 2]
            den *= fa[(y + z + x) // 2 + 1]
        if x & 1:  # (-1)^(2x) with 2x = the doubled x
            num = -num
        total += Fraction(num, den)
    return total, triads


def _ninej_parts(
    a: int, b: int, c: int, d: int, e: int, f: int, g: int, h: int, i: int
) -> Parts | None:
    got = _ninej_sum(a, b, c, d, e, f, g, h, i)
    if got is None:
        return None
    total, triads = got
    p, q, mask = _delta_sq(triads)
    return total.numerator, total.denominator, p, q, mask


@lru_cache(maxsize=CACHE_SIZE)
def _ninej_canonical(key: tuple[int, ...]) -> Radical:
    return _radical(_ninej_parts(*key))


@lru_cache(maxsize=CACHE_SIZE)
def _ninej_doubled(
    a: int, b: int, c: int, d: int, e: int, f: int, g: int, h: int, i: int
) -> Radical:
    """The 9j {a b c; d e f; g h i} from doubled ints (rows in order; DLMF 34.6.2),
    cached under its standard form among the 72 arrangements (DLMF §34.7(ii)).

    >>> print(_ninej_doubled(1, 1, 2, 1, 1, 2, 2, 2, 4))
    1/9
    """
    entries = (a, b, c, d, e, f, g, h, i)
    for x, y, z in ((a, b, c), (d, e, f), (g, h, i), (a, d, g), (b, e, h), (c, f, i)):
        if not _tri(x, y, z):
            return _ZERO
    keys = [get(entries) for get in _NINEJ_GETTERS]
    key = min(keys)
    odd = _NINEJ_ODD[keys.index(key)]
    value = _ninej_canonical(key)
    # (-1)^R with R = sum of the entries (an integer: each row triad has an integer sum).
    if odd and (sum(entries) // 2) & 1:
        return -value
    return value


# -- public, validating entry points ----------------------------------------------------


def _spins(values: tuple[object, ...], names: tuple[str, ...]) -> list[int]:
    return [int(2 * parse_spin(v, name=n)) for v, n in zip(values, names, strict=True)]


def _projection(value: object, name: str) -> int:
    return int(2 * parse_projection(value, name=name))


def clebsch_gordan(j1: object, m1: object, j2: object, m2: object, j: object, m: object) -> Radical:
    """The Clebsch-Gordan coefficient <j1 m1 j2 m2 | j m>, Condon-Shortley phases.

    CONVENTIONS 1.1 (DLMF 34.1.1).  Arguments in bra-ket order.

    >>> print(clebsch_gordan(1, 1, "1/2", "-1/2", "3/2", "1/2"))
    sqrt(1/3)
    >>> clebsch_gordan(1, 0, 1, 0, 1, 0)  # j1 + j2 + j odd: zero
    Radical(0)
    """
    dj1, dj2, dj = _spins((j1, j2, j), ("j1", "j2", "j"))
    return _cg_doubled(
        dj1, _projection(m1, "m1"), dj2, _projection(m2, "m2"), dj, _projection(m, "m")
    )


def threej(j1: object, j2: object, j3: object, m1: object, m2: object, m3: object) -> Radical:
    """The Wigner 3j symbol (j1 j2 j3; m1 m2 m3) (DLMF 34.2.4).

    >>> print(threej("1/2", "1/2", 1, "1/2", "-1/2", 0))
    sqrt(1/6)
    """
    dj1, dj2, dj3 = _spins((j1, j2, j3), ("j1", "j2", "j3"))
    return _threej_doubled(
        dj1, dj2, dj3, _projection(m1, "m1"), _projection(m2, "m2"), _projection(m3, "m3")
    )


def sixj(a: object, b: object, c: object, d: object, e: object, f: object) -> Radical:
    """The Wigner 6j symbol {a b c; d e f} (DLMF 34.4.2).

    >>> print(sixj("1/2", "1/2", 1, "1/2", "1/2", 0))
    1/2
    """
    return _sixj_doubled(*_spins((a, b, c, d, e, f), ("a", "b", "c", "d", "e", "f")))


def ninej(
    a: object,
    b: object,
    c: object,
    d: object,
    e: object,
    f: object,
    g: object,
    h: object,
    i: object,
) -> Radical:
    """The Wigner 9j symbol {a b c; d e f; g h i}, rows in order (DLMF 34.6.2).

    >>> print(ninej(1, 2, 3, 4, 5, 6, 3, 6, 9))
    (1/1274)*sqrt(3/5)
    """
    names = ("a", "b", "c", "d", "e", "f", "g", "h", "i")
    return _ninej_doubled(*_spins((a, b, c, d, e, f, g, h, i), names))


# -- checked entry points on doubled arguments -------------------------------------------
# The cached functions above trust their arguments (the library's own callers pass
# checked ints); these public ones read any integer type and refuse the rest, so a
# negative, float or out-of-range argument is an error, never a zero or a hang.


def threej_doubled(j1: int, j2: int, j3: int, m1: int, m2: int, m3: int) -> Radical:
    """The 3j symbol (j1 j2 j3; m1 m2 m3) from doubled ints (``2j``, ``2m``), checked.

    >>> print(threej_doubled(2, 2, 0, 2, -2, 0))
    sqrt(1/3)
    """
    args = check_doubled((j1, j2, j3, m1, m2, m3), "j1 j2 j3 m1 m2 m3", 3)
    return _threej_doubled(*args)


def cg_doubled(j1: int, m1: int, j2: int, m2: int, j: int, m: int) -> Radical:
    """<j1 m1 j2 m2 | j m> (Condon-Shortley) from doubled ints, checked.

    >>> print(cg_doubled(2, 2, 1, -1, 3, 1))
    sqrt(1/3)
    """
    dj1, dj2, dj, dm1, dm2, dm = check_doubled((j1, j2, j, m1, m2, m), "j1 j2 j m1 m2 m", 3)
    return _cg_doubled(dj1, dm1, dj2, dm2, dj, dm)


def sixj_doubled(a: int, b: int, c: int, d: int, e: int, f: int) -> Radical:
    """{a b c; d e f} from doubled ints, checked.

    >>> print(sixj_doubled(2, 2, 2, 2, 2, 2))
    1/6
    """
    return _sixj_doubled(*check_doubled((a, b, c, d, e, f), "a b c d e f", 6))


def ninej_doubled(
    a: int, b: int, c: int, d: int, e: int, f: int, g: int, h: int, i: int
) -> Radical:
    """The 9j {a b c; d e f; g h i} from doubled ints (rows in order), checked.

    >>> print(ninej_doubled(1, 1, 2, 1, 1, 2, 2, 2, 4))
    1/9
    """
    return _ninej_doubled(*check_doubled((a, b, c, d, e, f, g, h, i), "a b c d e f g h i", 9))
