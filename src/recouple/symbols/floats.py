"""Wigner symbols as floats, for bulk numerical work.

Same integer Racah sums as :mod:`recouple.symbols.values` (exact, so the
alternating sum cannot lose digits to cancellation), then a single rounding:
a symbol ``S/D * sqrt(P/Q)`` is returned as ``sign(S) * sqrt((S^2 P) / (D^2 Q))``
where the division of two Python integers is correctly rounded.  The relative
error is therefore a few units in the last place (<= 4.5e-16) at every j, with
no square-free split, no ``isqrt`` and no fraction reduction: roughly twice as
fast as the exact path at small j and several times faster at large j.

Where it stops being trustworthy: only where the true value is not a normal
double, i.e. ``|value| < 2.2e-308`` (it then underflows to a subnormal or 0.0).
Up to :data:`FLOAT_SAFE_DOUBLED` (``2j`` of every argument) the relative error
has been checked against the exact values (tests/test_symbol_floats.py); callers
who need exact zeros or values beyond it should use the exact functions.

>>> sixj_float(1, 1, 1, 1, 1, 1)
0.16666666666666666
>>> round(ninej_float(1, 2, 3, 4, 5, 6, 3, 6, 9), 12)
0.000608003665
"""

from __future__ import annotations

from functools import lru_cache

from recouple.numbers.radicals import _float_sqrt_ratio
from recouple.numbers.spins import MAX_SPIN, check_doubled
from recouple.symbols.values import (
    CACHE_SIZE,
    Parts,
    _ninej_parts,
    _projection,
    _sixj_parts,
    _spins,
    _threej_parts,
    _threej_sign,
)

__all__ = [
    "FLOAT_SAFE_DOUBLED",
    "cg_float",
    "cg_float_doubled",
    "ninej_float",
    "ninej_float_doubled",
    "sixj_float",
    "sixj_float_doubled",
    "threej_float",
    "threej_float_doubled",
]

#: Largest ``2j`` for which the float path is documented as trustworthy (relative
#: error <= 1e-12; in fact a few ulp).  The method has no j-dependent error, so this
#: is the package-wide limit ``2 * MAX_SPIN``; the tests check to ``2j = 400``.
FLOAT_SAFE_DOUBLED = 2 * MAX_SPIN


def _to_float(parts: Parts | None) -> float:
    if parts is None:
        return 0.0
    s_num, s_den, p, q, _ = parts
    if not s_num:
        return 0.0
    root = _float_sqrt_ratio(s_num * s_num * p, s_den * s_den * q)
    return root if s_num > 0 else -root


@lru_cache(maxsize=CACHE_SIZE)
def _sixj_float_doubled(a: int, b: int, c: int, d: int, e: int, f: int) -> float:
    """{a b c; d e f} as a float, doubled arguments (DLMF 34.4.2).

    >>> _sixj_float_doubled(1, 1, 2, 1, 1, 0)
    0.5
    """
    return _to_float(_sixj_parts(a, b, c, d, e, f))


@lru_cache(maxsize=CACHE_SIZE)
def _ninej_float_doubled(
    a: int, b: int, c: int, d: int, e: int, f: int, g: int, h: int, i: int
) -> float:
    """{a b c; d e f; g h i} as a float, doubled arguments (DLMF 34.6.2).

    >>> _ninej_float_doubled(1, 1, 2, 1, 1, 2, 2, 2, 4)
    0.1111111111111111
    """
    return _to_float(_ninej_parts(a, b, c, d, e, f, g, h, i))


@lru_cache(maxsize=CACHE_SIZE)
def _cg_float_doubled(j1: int, m1: int, j2: int, m2: int, j: int, m: int) -> float:
    """<j1 m1 j2 m2 | j m> as a float, doubled arguments (CONVENTIONS 1.1).

    >>> _cg_float_doubled(1, 1, 1, -1, 0, 0)
    0.7071067811865476
    """
    return _to_float(_threej_parts(j1, j2, j, m1, m2, -m, True))


@lru_cache(maxsize=CACHE_SIZE)
def _threej_float_doubled(j1: int, j2: int, j3: int, m1: int, m2: int, m3: int) -> float:
    """(j1 j2 j3; m1 m2 m3) as a float, doubled arguments (DLMF 34.2.4).

    >>> round(_threej_float_doubled(2, 2, 0, 0, 0, 0), 15)
    -0.577350269189626
    """
    value = _to_float(_threej_parts(j1, j2, j3, m1, m2, m3, False))
    return -value if _threej_sign(j1, j2, m3) < 0 else value


def sixj_float(a: object, b: object, c: object, d: object, e: object, f: object) -> float:
    """The 6j symbol {a b c; d e f} as a float; arguments as for ``sixj``.

    >>> sixj_float("1/2", "1/2", 1, "1/2", "1/2", 1)
    0.16666666666666666
    """
    return _sixj_float_doubled(*_spins((a, b, c, d, e, f), ("a", "b", "c", "d", "e", "f")))


def ninej_float(
    a: object,
    b: object,
    c: object,
    d: object,
    e: object,
    f: object,
    g: object,
    h: object,
    i: object,
) -> float:
    """The 9j symbol (rows in order) as a float; arguments as for ``ninej``.

    >>> ninej_float("1/2", "1/2", 1, "1/2", "1/2", 1, 1, 1, 2)
    0.1111111111111111
    """
    names = ("a", "b", "c", "d", "e", "f", "g", "h", "i")
    return _ninej_float_doubled(*_spins((a, b, c, d, e, f, g, h, i), names))


def cg_float(j1: object, m1: object, j2: object, m2: object, j: object, m: object) -> float:
    """<j1 m1 j2 m2 | j m> as a float; arguments as for ``clebsch_gordan``.

    >>> cg_float(1, 1, 1, -1, 2, 0) == (1 / 6) ** 0.5
    True
    """
    dj1, dj2, dj = _spins((j1, j2, j), ("j1", "j2", "j"))
    return _cg_float_doubled(
        dj1, _projection(m1, "m1"), dj2, _projection(m2, "m2"), dj, _projection(m, "m")
    )


def threej_float(j1: object, j2: object, j3: object, m1: object, m2: object, m3: object) -> float:
    """(j1 j2 j3; m1 m2 m3) as a float; arguments as for ``threej``.

    >>> round(threej_float(1, 1, 0, 1, -1, 0), 15)
    0.577350269189626
    """
    dj1, dj2, dj3 = _spins((j1, j2, j3), ("j1", "j2", "j3"))
    return _threej_float_doubled(
        dj1, dj2, dj3, _projection(m1, "m1"), _projection(m2, "m2"), _projection(m3, "m3")
    )


# -- checked entry points on doubled arguments (as in recouple.symbols.values) ----------


def sixj_float_doubled(a: int, b: int, c: int, d: int, e: int, f: int) -> float:
    """{a b c; d e f} as a float, doubled arguments, checked.

    >>> sixj_float_doubled(1, 1, 2, 1, 1, 0)
    0.5
    """
    return _sixj_float_doubled(*check_doubled((a, b, c, d, e, f), "a b c d e f", 6))


def ninej_float_doubled(
    a: int, b: int, c: int, d: int, e: int, f: int, g: int, h: int, i: int
) -> float:
    """{a b c; d e f; g h i} as a float, doubled arguments (rows in order), checked.

    >>> ninej_float_doubled(1, 1, 2, 1, 1, 2, 2, 2, 4)
    0.1111111111111111
    """
    args = check_doubled((a, b, c, d, e, f, g, h, i), "a b c d e f g h i", 9)
    return _ninej_float_doubled(*args)


def cg_float_doubled(j1: int, m1: int, j2: int, m2: int, j: int, m: int) -> float:
    """<j1 m1 j2 m2 | j m> as a float, doubled arguments, checked.

    >>> cg_float_doubled(1, 1, 1, -1, 0, 0) == 0.5**0.5
    True
    """
    dj1, dj2, dj, dm1, dm2, dm = check_doubled((j1, j2, j, m1, m2, m), "j1 j2 j m1 m2 m", 3)
    return _cg_float_doubled(dj1, dm1, dj2, dm2, dj, dm)


def threej_float_doubled(j1: int, j2: int, j3: int, m1: int, m2: int, m3: int) -> float:
    """(j1 j2 j3; m1 m2 m3) as a float, doubled arguments, checked.

    >>> round(threej_float_doubled(2, 2, 0, 0, 0, 0), 15)
    -0.577350269189626
    """
    args = check_doubled((j1, j2, j3, m1, m2, m3), "j1 j2 j3 m1 m2 m3", 3)
    return _threej_float_doubled(*args)
