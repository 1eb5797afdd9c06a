"""Wigner 6j and 9j symbols as float64 arrays, many at a time (numpy).

For bulk numerical work: one call evaluates a whole batch of symbols given as
an integer array of DOUBLED arguments (``2j``), shape ``(N, 6)`` for 6j and
``(N, 9)`` for 9j (rows in order), and returns a float64 array of shape ``(N,)``.
A row that breaks a triangle condition (DLMF 34.2.1) gives exactly ``0.0``.

Every returned value is within relative error ``tolerance`` (default
:data:`BULK_TOLERANCE` = 1e-13, never looser than 1e-12) of the exact value:
each entry carries a proven error bound, and an entry whose bound is not below
the tolerance is recomputed from the exact integer sums of
:mod:`recouple.symbols.floats` (one rounding).  So nontrivial zeros come out as
``0.0`` and the answer is never worse than 1e-12, at any j up to ``MAX_SPIN``;
only the speed depends on how many entries need the exact path (in random
samples: none at small j, where the integer path below settles zeros too; only
exact zeros beyond it up to 2j = 200; every 6j at 2j ~ 400 and beyond, where
the alternating sums cancel more than double-double can vouch for).

Method (small arguments, exact integers).  Used for a 6j when one of its column
sums ``a+b+d+e``, ``b+c+e+f``, ``c+a+f+d`` (doubled) is at most 38, and for a 9j
when each of its three inner 6j has such a sum (so for every 6j and 9j with all
2j <= 9).  Each term of Racah's sum (DLMF 34.4.2) is (s+1) times a multinomial
coefficient, so the sum R is an integer, and so is ``N = 1 / Delta^2 =
(J+1)! / (k1! k2! k3!)`` (DLMF 34.2.5); with every factorial argument at most 20
(20! < 2^63) they are computed exactly in int64, with no overflow (the argument
is in ``_racah_ints``).  The 6j is ``R / sqrt(N1 N2 N3 N4)``: relative error
<= 8 u (u = 2^-53), and exactly ``0.0`` when R = 0.  For the 9j (DLMF 34.6.2)
the x-term ``(-1)^(2x) (2x+1) R1 R2 R3 / Q_x`` (Q_x the product of the three
x-dependent N) is used as an integer only where that is verified, by rounding
it from float64 and checking the product exactly modulo 2^64 (``_ninej_ints``);
the x-sum is then an exact integer S and the 9j is ``S / sqrt(M)``, M the
product of the six row and column N: <= 8 u, and exactly ``0.0`` when S = 0.
A 9j whose check fails takes the general path below.

Method (6j, DLMF 34.4.2, general path).  Racah's sum is taken relative to its first term:
``{...} = (-1)^smin * sqrt(prod Delta^2) * t(smin) * sum_k rho_k`` with
``rho_0 = 1`` and ``rho_(k+1) = rho_k * (-num_k / den_k)``, where ``num_k`` and
``den_k`` are products of four small integers, exact in float64 (below 2^53 for
every j <= MAX_SPIN).  The ``rho_k`` and their sum are carried in double-double
arithmetic (pairs of float64 with error-free transformations; Dekker 1971,
common practice), because the sum cancels: the ratio ``sum|rho| / |sum rho|``
is typically 1e4 at j ~ 40 and up to 1e14 at j ~ 100, far too much for plain
float64.  The prefactor ``sqrt(prod Delta^2) * t(smin)`` has no cancellation and
is built in float64 from a table of factorials stored as mantissa and binary
exponent (each entry correctly rounded from the exact integer ``n!``, so the
table does not overflow at 171!).

Method (9j, DLMF 34.6.2, general path).  ``sum_x (-1)^(2x) (2x+1) {a d g; h i x} {b e h; d x f}
{c f i; x a b}``, vectorised over all (symbol, x) pairs.  The six row and column
triangle coefficients leave the sum as one square root; the x-dependent ones
come in squares, so each term is rational and is built in double-double, then
summed per symbol in double-double with the same cancellation guard.

>>> import numpy as np
>>> sixj_float_many(np.array([[2, 2, 2, 2, 2, 2], [1, 1, 2, 1, 1, 0], [2, 2, 6, 2, 2, 2]]))
array([0.16666667, 0.5       , 0.        ])
>>> round(float(ninej_float_many(np.array([[1, 1, 2, 1, 1, 2, 2, 2, 4]]))[0]), 15)  # 1/9
0.111111111111111
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache
from typing import Any

import numpy as np
import numpy.typing as npt

from recouple.errors import BadValue
from recouple.numbers._integers import factorial_table
from recouple.numbers.spins import MAX_SPIN
from recouple.symbols.floats import _ninej_float_doubled, _sixj_float_doubled
from recouple.symbols.values import _racah_sum6

__all__ = [
    "BULK_TOLERANCE",
    "BulkFloats",
    "ninej_float_many",
    "ninej_float_many_checked",
    "sixj_float_many",
    "sixj_float_many_checked",
]

FArr = npt.NDArray[np.float64]
IArr = npt.NDArray[np.int64]
BArr = npt.NDArray[np.bool_]

#: Default bound on the relative error of every returned value: an entry whose
#: proven bound is above it is recomputed exactly.  Ten times below the 1e-12
#: promise, so the promise holds with room for anything the analysis missed.
BULK_TOLERANCE = 1e-13
_LOOSEST = 1e-12

_U = 2.0**-53  # unit roundoff of float64 (round to nearest)
_U2 = _U * _U
_SPLIT = 134217729.0  # 2^27 + 1, Veltkamp's splitter (common practice)
_DMAX = 2 * MAX_SPIN  # largest doubled argument accepted
_TINY = 2.0**-1000  # results below this are near the subnormal range: recompute
# Chunk sizes (entries per vectorised pass): big enough to amortise numpy's
# per-call overhead, small enough to keep the working arrays in cache.
_CHUNK6 = 1 << 15
_CHUNK_PAIRS = 1 << 15


@dataclass(frozen=True, slots=True)
class BulkFloats:
    """Values of a bulk call with their audit trail.

    ``values``: the float64 results.  ``bound``: the proven relative error bound of
    the vectorised float computation of each entry (``inf`` where it proved
    nothing, ``0.0`` for triangle zeros and for zeros proven by the exact integer
    path).  ``recomputed``: True where the entry was recomputed from the exact sums
    because its bound exceeded the tolerance.
    """

    values: FArr
    bound: FArr
    recomputed: BArr


# -- input validation ---------------------------------------------------------------------


def _check_tolerance(tolerance: object, where: str) -> float:
    if isinstance(tolerance, bool) or not isinstance(tolerance, (int, float)):
        raise BadValue(f"{where}: tolerance must be a number, got {tolerance!r}")
    tol = float(tolerance)
    if not 0.0 <= tol <= _LOOSEST:
        raise BadValue(f"{where}: tolerance must be between 0 and {_LOOSEST:g}, got {tolerance!r}")
    return tol


def _doubled_rows(args: object, width: int, where: str) -> IArr:
    """The batch as an int64 array of shape (N, width), or a one-line BadValue."""
    names = "abcdefghi"[:width]
    try:
        arr = np.asarray(args)
    except (TypeError, ValueError) as exc:
        raise BadValue(f"{where}: cannot read the arguments as an array ({exc})") from None
    if arr.ndim != 2 or arr.shape[1] != width:
        raise BadValue(
            f"{where}: expected an integer array of shape (N, {width}) (rows of doubled "
            f"2j values {' '.join(names)}), got shape {arr.shape}"
        )
    if not np.issubdtype(arr.dtype, np.integer):
        if arr.size == 0:
            return np.zeros((0, width), dtype=np.int64)
        raise BadValue(
            f"{where}: arguments must be doubled angular momenta 2j as integers, "
            f"got an array of dtype {arr.dtype}"
        )
    low = arr < 0
    high = arr > _DMAX
    if low.any() or high.any():
        row, col = (int(k) for k in np.argwhere(low | high)[0])
        value = int(arr[row, col])
        rule = ">= 0" if value < 0 else f"<= 2*MAX_SPIN = {_DMAX}"
        raise BadValue(
            f"{where}: row {row}, column {names[col]!r} is {value}; a doubled angular "
            f"momentum 2j must be {rule}"
        )
    return arr.astype(np.int64, copy=False)


# -- the factorial table ------------------------------------------------------------------


@lru_cache(maxsize=4)
def _factorials(size: int) -> FArr:
    """Rows (hi, lo, exp) for n < size: n! = (hi + lo) * 2^exp, hi in [1, 2).

    From the exact integers of ``factorial_table``: ``hi`` is n!/2^exp correctly
    rounded (CPython's int / int true division is correctly rounded) and ``lo``
    the correctly rounded remainder, so hi + lo is within u^2 hi of n!/2^exp.
    Stored as one read-only (3, size) float64 array so that a batch of
    factorials is a single gather (the exponents are integers below 2^53).
    """
    exact = factorial_table(size - 1)
    table = np.empty((3, size))
    for n in range(size):
        f = exact[n]
        e = f.bit_length() - 1
        h = f / (1 << e)
        m = int(h * 2.0**52)  # h = m / 2^52 exactly
        table[0, n] = h
        table[1, n] = (f * (1 << 52) - m * (1 << e)) / (1 << (e + 52))
        table[2, n] = e
    table.setflags(write=False)
    return table


def _table_for(top: int) -> FArr:
    """A table indexing 0..top; sizes are powers of two so few tables are ever built."""
    size = 64
    while size <= top:
        size *= 2
    return _factorials(min(size, 2 * _DMAX + 8))


# -- double-double kernels (Dekker 1971; Knuth's TwoSum; common practice) -----------------


def _split(a: FArr) -> tuple[FArr, FArr]:
    c = _SPLIT * a
    big = c - (c - a)
    return big, a - big


def _two_prod(a: FArr, b: FArr) -> tuple[FArr, FArr]:
    """p + e == a * b exactly (no overflow or underflow)."""
    p = a * b
    ab, as_ = _split(a)
    bb, bs = _split(b)
    e = ((ab * bb - p) + ab * bs + as_ * bb) + as_ * bs
    return p, e


def _two_sum(a: FArr, b: FArr) -> tuple[FArr, FArr]:
    """s + e == a + b exactly, in any order of magnitude."""
    s = a + b
    bb = s - a
    e = (a - (s - bb)) + (b - bb)
    return s, e


def _dd_add(ah: FArr, al: FArr, bh: FArr, bl: FArr) -> tuple[FArr, FArr]:
    """(a + b) with absolute error <= 3 u^2 (|a| + |b|) (own argument: the only
    roundings are the two additions of the low parts)."""
    s, e = _two_sum(ah, bh)
    e = e + (al + bl)
    return _two_sum(s, e)


def _dd_mul(ah: FArr, al: FArr, bh: FArr, bl: FArr) -> tuple[FArr, FArr]:
    """(a * b) with relative error <= 6 u^2 (own argument, first order)."""
    p, e = _two_prod(ah, bh)
    e = e + (ah * bl + al * bh)
    s = p + e
    return s, e - (s - p)


def _dd_mul_exact(ah: FArr, al: FArr, k: FArr) -> tuple[FArr, FArr]:
    """(a * k) for a float64 k, relative error <= 3 u^2."""
    p, e = _two_prod(ah, k)
    e = e + al * k
    s = p + e
    return s, e - (s - p)


def _dd_div_exact(ah: FArr, al: FArr, k: FArr) -> tuple[FArr, FArr]:
    """(a / k) for a float64 k, relative error <= 5 u^2.  The remainder
    ah - q1 k is exact (the remainder of a correctly rounded division is a
    float; Sterbenz), so only ``+ al`` and the second quotient round."""
    q1 = ah / k
    p, e = _two_prod(q1, k)
    q2 = (((ah - p) - e) + al) / k
    s = q1 + q2
    return s, q2 - (s - q1)


def _dd_div(ah: FArr, al: FArr, bh: FArr, bl: FArr) -> tuple[FArr, FArr]:
    """(a / b), relative error <= 16 u^2 (generous; own argument as above)."""
    q1 = ah / bh
    p, e = _two_prod(q1, bh)
    r = (((ah - p) - e) + al) - q1 * bl
    q2 = r / bh
    s = q1 + q2
    return s, q2 - (s - q1)


def _dd_tree_product(hi: FArr, lo: FArr) -> tuple[FArr, FArr]:
    """The product over axis 0 of double-double rows, multiplied pairwise.

    K rows take K - 1 double-double products (<= 6 u^2 each), so the relative
    error is at most 6 (K - 1) u^2 plus the rows' own errors, to first order.
    """
    while hi.shape[0] > 1:
        half = hi.shape[0] // 2
        ph, pl = _dd_mul(hi[:half], lo[:half], hi[half : 2 * half], lo[half : 2 * half])
        if hi.shape[0] % 2:
            ph = np.concatenate([ph, hi[-1:]])
            pl = np.concatenate([pl, lo[-1:]])
        hi, lo = ph, pl
    return hi[0], lo[0]


def _gather(table: FArr, idx: list[IArr]) -> FArr:
    """Table rows for a list of index arrays: shape (3, len(idx), n)."""
    return np.take(table, np.stack(idx), axis=1)


def _float_factorial_ratio(table: FArr, num: list[IArr], den: list[IArr]) -> tuple[FArr, IArr]:
    """prod num! / prod den! as mantissa * 2^exp in plain float64.

    Relative error <= (len(num) + len(den)) u (table entries) + (len(num) +
    len(den) - 1) u (operations), to first order.
    """
    g = _gather(table, num + den)
    k = len(num)
    m = g[0, :k].prod(axis=0) / g[0, k:].prod(axis=0)
    ex = g[2, :k].sum(axis=0) - g[2, k:].sum(axis=0)
    return m, ex.astype(np.int64)


def _delta_indices(x: IArr, y: IArr, z: IArr) -> tuple[list[IArr], list[IArr]]:
    """Factorial arguments of Delta^2(x y z) (DLMF 34.2.5), doubled inputs."""
    return (
        [(x + y - z) >> 1, (x - y + z) >> 1, (-x + y + z) >> 1],
        [((x + y + z) >> 1) + 1],
    )


def _tri(x: IArr, y: IArr, z: IArr) -> BArr:
    """Triangle condition on doubled values (DLMF 34.2.1)."""
    ok: BArr = ((x + y + z) % 2 == 0) & (np.abs(x - y) <= z) & (z <= x + y)
    return ok


# -- Racah's sum, relative to its first term ------------------------------------------------


def _racah_terms(a: IArr, b: IArr, c: IArr, d: IArr, e: IArr, f: IArr) -> tuple[IArr, IArr]:
    """(alpha, beta): the triad half-sums (4, n) and the column sums (3, n) of
    DLMF 34.4.2 for {a b c; d e f}, doubled inputs with admissible triads (even,
    non-negative sums, so a shift halves them)."""
    alpha = np.stack([(a + b + c) >> 1, (a + e + f) >> 1, (d + b + f) >> 1, (d + e + c) >> 1])
    beta = np.stack([(a + b + d + e) >> 1, (b + c + e + f) >> 1, (c + a + f + d) >> 1])
    return alpha, beta


def _racah_sums(alpha: IArr, beta: IArr) -> tuple[IArr, FArr, FArr, FArr]:
    """sum_k rho_k in double-double, with rho_0 = 1 at s = smin (DLMF 34.4.2).

    Returns (smin, hi, lo, bound), where bound is a proven relative error bound of
    hi + lo (inf when nothing is proven, e.g. an exact zero or an overflow).

    Error analysis (own argument).  Write n for the number of terms and A for
    sum |rho_k|.  The step ratio -num/den is two exact integers; one step costs a
    multiplication by num (<= 3 u^2) and a division by den (<= 5 u^2), so rho_k
    carries a relative error <= 8 k u^2 (1 + O(n u^2)).  Each double-double
    addition errs by <= 3 u^2 (|partial sum| + |rho_k|) <= 6 u^2 A.  Hence
    |error of the sum| <= E = 14 n u^2 A; we use 64 n u^2 A_computed (A_computed
    is within a factor 1 + n u of A) plus n 2^-900 for any underflow in the low
    parts (A >= 1, so that term is negligible but keeps the bound honest).  The
    relative error is then <= E / (|sum| - E) when |sum| > E: it is the
    cancellation ratio A / |sum| times 64 n u^2.
    """
    smin = alpha.max(axis=0)
    count = beta.min(axis=0) - smin + 1
    size = smin.shape[0]
    sh = np.ones(size)
    sl = np.zeros(size)
    bound = np.full(size, np.inf)
    if size == 0:
        return smin, sh, sl, bound
    # Longest sums first, so every step works on a prefix (a view, no gather).
    order = np.argsort(-count, kind="stable")
    ns = count[order]
    s2 = (smin + 2)[order].astype(np.float64)
    bs = (beta - smin)[:, order].astype(np.float64)
    as_ = (smin + 1 - alpha)[:, order].astype(np.float64)
    rh = np.ones(size)
    rl = np.zeros(size)
    hi = np.ones(size)
    lo = np.zeros(size)
    total_abs = np.ones(size)
    neg = -ns
    for k in range(1, int(ns[0])):
        m = int(np.searchsorted(neg, -k, side="left"))  # entries with more than k terms
        t = float(k - 1)
        num = -(s2[:m] + t) * (bs[0, :m] - t) * (bs[1, :m] - t) * (bs[2, :m] - t)
        den = (as_[0, :m] + t) * (as_[1, :m] + t) * (as_[2, :m] + t) * (as_[3, :m] + t)
        ph, pl = _dd_mul_exact(rh[:m], rl[:m], num)
        qh, ql = _dd_div_exact(ph, pl, den)
        rh[:m] = qh
        rl[:m] = ql
        hs, ls = _dd_add(hi[:m], lo[:m], qh, ql)
        hi[:m] = hs
        lo[:m] = ls
        total_abs[:m] += np.abs(qh)
    err = 64.0 * ns * _U2 * total_abs + ns * 2.0**-900
    margin = np.abs(hi) - err
    rel = np.where(margin > 0, err / np.where(margin > 0, margin, 1.0), np.inf)
    rel[~np.isfinite(rel)] = np.inf
    sh[order] = hi
    sl[order] = lo
    bound[order] = rel
    return smin, sh, sl, bound


@lru_cache(maxsize=1 << 14)
def _racah_exact_dd(alpha: tuple[int, ...], beta: tuple[int, ...]) -> tuple[float, float]:
    """sum_k rho_k from the exact integer sum of values.py, rounded to double-double
    (hi correctly rounded, lo the correctly rounded rest: error <= 2 u^2).  Cached:
    at small j the same near-zero inner sums recur across a 9j batch."""
    a1, a2, a3, a4 = alpha
    b1, b2, b3 = beta
    # _racah_sum6 takes the doubled entries of {a b c; d e f}; they follow from the
    # sums: a = a1 + a2 - b2, b = a1 + a3 - b3, c = a1 + a4 - b1, d = a3 + a4 - b2,
    # e = a2 + a4 - b3, f = a2 + a3 - b1 (see _racah_terms).
    entries = (
        a1 + a2 - b2,
        a1 + a3 - b3,
        a1 + a4 - b1,
        a3 + a4 - b2,
        a2 + a4 - b3,
        a2 + a3 - b1,
    )
    s_num, s_den = _racah_sum6(*entries)
    smin = max(alpha)
    f = factorial_table(max(beta) + 2)
    first_den = f[smin - a1] * f[smin - a2] * f[smin - a3] * f[smin - a4]
    first_den *= f[b1 - smin] * f[b2 - smin] * f[b3 - smin]
    exact = Fraction(s_num * first_den, s_den * f[smin + 1])
    if smin & 1:
        exact = -exact
    hi = float(exact)
    return hi, float(exact - Fraction(hi))


# -- small arguments: exact integer sums ----------------------------------------------------

# n! for n <= 20 as int64 (20! < 2^63 < 21!).
_FACT_INT = np.array([math.factorial(n) for n in range(21)], dtype=np.int64)
#: Largest doubled sum of four 6j entries (a column sum beta of DLMF 34.4.2, doubled)
#: for the exact integer path: then every factorial it needs is at most 20!.
_INT_BETA = 38


def _racah_ints(alpha: IArr, beta: IArr) -> IArr:
    """Racah's sum of DLMF 34.4.2, ``sum_s (-1)^s (s+1)! / (prod (s-alpha)! prod
    (beta-s)!)``, as exact int64, for admissible 6j with ``min(beta) <= 19``.

    Every term is an integer: the seven factorial arguments below add up to s
    (sum alpha = sum beta, the sum of the six entries), so the term is (s+1) times
    a multinomial coefficient (own argument from the formula; common practice).
    The first term is (s+1)! over the product of the seven factorials, a product
    at most smin! (a multinomial coefficient is >= 1), so it fits; and
    t(s+1) = -t(s) (s+2) prod (beta-s) / prod (s+1-alpha) is an exact division.
    No overflow: |t(s)| times the numerator equals |t(s+1)| times the
    denominator, which is (s+2)! / (prod (s-alpha)! prod (beta-s-1)!) <= (smax+1)!
    <= 20!, and the sum of the terms is below 1.1 * 20! < 2^62.  Past smax the
    numerator holds the factor min(beta) - s = 0, so the term stays 0 and every
    entry can run the same number of steps.
    """
    smin = alpha.max(axis=0)
    steps = beta.min(axis=0) - smin
    fact = _FACT_INT
    den = fact[smin - alpha[0]] * fact[smin - alpha[1]] * fact[smin - alpha[2]]
    den *= fact[smin - alpha[3]] * fact[beta[0] - smin]
    den *= fact[beta[1] - smin] * fact[beta[2] - smin]
    t = fact[smin + 1] // den
    t = np.where(smin & 1 == 1, -t, t)
    total: IArr = t.copy()
    for k in range(int(steps.max()) if steps.size else 0):
        s = smin + k
        num = (s + 2) * (beta[0] - s) * (beta[1] - s) * (beta[2] - s)
        den = (s + 1 - alpha[0]) * (s + 1 - alpha[1]) * (s + 1 - alpha[2]) * (s + 1 - alpha[3])
        t = -(t * num) // den
        total += t
    return total


def _triad_ints(x: IArr, y: IArr, z: IArr) -> IArr:
    """1 / Delta^2(x y z) = (J+1)! / (k1! k2! k3!) as exact int64 (DLMF 34.2.5), for
    J + 1 <= 20; k1 + k2 + k3 = J, so the denominator is at most J! and divides."""
    fact = _FACT_INT
    den = fact[(x + y - z) >> 1] * fact[(x - y + z) >> 1] * fact[(-x + y + z) >> 1]
    out: IArr = fact[((x + y + z) >> 1) + 1] // den
    return out


def _sixj_ints(a: IArr, b: IArr, c: IArr, d: IArr, e: IArr, f: IArr) -> tuple[FArr, FArr]:
    """Admissible 6j with a column sum ``a+b+d+e``, ``b+c+e+f`` or ``c+a+f+d``
    (doubled) at most ``_INT_BETA``: value R / sqrt(N1 N2 N3 N4), R the exact Racah
    sum and N_k the exact 1 / Delta^2 of the four triads (each triad half-sum is an
    alpha, so at most smax <= 19)."""
    alpha, beta = _racah_terms(a, b, c, d, e, f)
    r = _racah_ints(alpha, beta)
    prod = _triad_ints(a, b, c).astype(np.float64)
    for x, y, z in ((a, e, f), (d, b, f), (d, e, c)):
        prod *= _triad_ints(x, y, z)
    # Roundings: R and the four N to float (5 u at most: N can pass 2^53 and round),
    # three products (3 u), the square root (half of the product's 7 u, plus u), the
    # division (u): 6.5 u to first order; 8 u claimed.
    value = r.astype(np.float64) / np.sqrt(prod)
    return value, np.where(r == 0, 0.0, 8.0 * _U)


# -- 6j -------------------------------------------------------------------------------------


def _sixj_chunk(rows: IArr) -> tuple[FArr, FArr]:
    """Values and proven relative bounds for admissible-or-not 6j rows."""
    out = np.zeros(rows.shape[0])
    bound = np.zeros(rows.shape[0])
    a, b, c, d, e, f = (rows[:, k] for k in range(6))
    ok = _tri(a, b, c) & _tri(a, e, f) & _tri(d, b, f) & _tri(d, e, c)
    # Small arguments: the exact integer sums (any column sum within reach will do,
    # since it bounds smax).
    small = ok & (np.minimum(np.minimum(a + b + d + e, b + c + e + f), c + a + f + d) <= _INT_BETA)
    sel = np.flatnonzero(small)
    if sel.size:
        out[sel], bound[sel] = _sixj_ints(*(rows[sel, k] for k in range(6)))
    idx = np.flatnonzero(ok & ~small)
    if idx.size == 0:
        return out, bound
    a, b, c, d, e, f = (rows[idx, k] for k in range(6))
    alpha, beta = _racah_terms(a, b, c, d, e, f)
    smin, sh, _, rel = _racah_sums(alpha, beta)
    tab = _table_for(int(beta.max()) + 2)
    num: list[IArr] = []
    den: list[IArr] = []
    for x, y, z in ((a, b, c), (a, e, f), (d, b, f), (d, e, c)):
        nn, dd = _delta_indices(x, y, z)
        num += nn
        den += dd
    # prod Delta^2 * t(smin)^2 in one pass: 32 table entries and 31 operations,
    # <= 63 u; its square root <= 32 u.  t(smin) = (smin+1)! / (prod (smin-alpha)!
    # prod (beta-smin)!), the first term of the sum without its sign.
    first_den = [smin - alpha[k] for k in range(4)] + [beta[k] - smin for k in range(3)]
    pm, pexp = _float_factorial_ratio(tab, num + [smin + 1, smin + 1], den + first_den + first_den)
    odd = pexp & 1
    root = np.sqrt(pm * np.where(odd == 1, 2.0, 1.0))
    sign = np.where(smin & 1 == 1, -1.0, 1.0)
    # Prefactor 32 u, the rounding of hi + lo and the last product: <= 34 u to
    # first order; 40 u covers the second-order terms.
    value = np.ldexp(sign * root * sh, (pexp - odd) // 2)
    out[idx] = value
    bound[idx] = rel + 40.0 * _U
    return out, bound


def _vouched(
    rows: IArr, values: FArr, bound: FArr, tol: float, exact: Callable[..., float]
) -> BulkFloats:
    """Recompute, with ``exact`` (the per-call path), every entry whose proven bound
    is not within ``tol`` or whose value is too small to trust; the audit trail."""
    redo = ~(bound <= tol) | (np.abs(values) < _TINY) & (bound > 0)
    for k in np.flatnonzero(redo):
        values[k] = exact(*(int(x) for x in rows[k]))
    return BulkFloats(values, bound, redo)


def sixj_float_many_checked(args: object, *, tolerance: float = BULK_TOLERANCE) -> BulkFloats:
    """Bulk 6j with the audit trail (:class:`BulkFloats`); see :func:`sixj_float_many`.

    >>> import numpy as np
    >>> got = sixj_float_many_checked(np.array([[2, 2, 2, 2, 2, 2], [4, 4, 4, 4, 4, 4]]))
    >>> bool(got.recomputed.any()), bool((got.bound < 1e-14).all())
    (False, True)
    """
    where = "sixj_float_many"
    tol = _check_tolerance(tolerance, where)
    rows = _doubled_rows(args, 6, where)
    values = np.zeros(rows.shape[0])
    bound = np.zeros(rows.shape[0])
    with np.errstate(all="ignore"):
        for start in range(0, rows.shape[0], _CHUNK6):
            v, bd = _sixj_chunk(rows[start : start + _CHUNK6])
            values[start : start + _CHUNK6] = v
            bound[start : start + _CHUNK6] = bd
    return _vouched(rows, values, bound, tol, _sixj_float_doubled)


def sixj_float_many(args: object, *, tolerance: float = BULK_TOLERANCE) -> FArr:
    """Many 6j symbols {a b c; d e f} at once, from an (N, 6) array of doubled ints.

    Racah's sum (DLMF 34.4.2) in vectorised double-double arithmetic; each value
    within relative error ``tolerance`` (<= 1e-12) of the exact one, triangle
    failures exactly 0.0; entries the error bound cannot vouch for are
    recomputed from the exact sums (:func:`~recouple.symbols.floats.sixj_float_doubled`).

    >>> import numpy as np
    >>> got = sixj_float_many(np.array([[1, 1, 2, 1, 1, 0], [100, 100, 100, 100, 100, 100]]))
    >>> [round(float(v), 15) for v in got]  # {1/2 1/2 1; 1/2 1/2 0} and all j = 50
    [0.5, -0.000112137492363]
    """
    return sixj_float_many_checked(args, tolerance=tolerance).values


# -- 9j -------------------------------------------------------------------------------------


def _x_pairs(lo_x: IArr, hi_x: IArr) -> tuple[IArr, IArr, IArr, IArr]:
    """The (symbol, x) pairs of DLMF 34.6.2, x from lo_x to hi_x in steps of 2
    (doubled): (counts, starts, seg, x), where seg[k] is the symbol of pair k and
    starts[n] the first pair of symbol n."""
    counts = (hi_x - lo_x) // 2 + 1
    starts = np.concatenate([[0], np.cumsum(counts)[:-1]])
    seg = np.repeat(np.arange(counts.size), counts)
    x = lo_x[seg] + 2 * (np.arange(seg.size) - starts[seg])
    return counts, starts, seg, x


def _ninej_inner(*entries: IArr) -> tuple[IArr, IArr]:
    """(alpha, beta) of the three 6j {a d g; h i x} {b e h; d x f} {c f i; x a b} of
    DLMF 34.6.2, stacked: shapes (4, 3m) and (3, 3m) for m (symbol, x) pairs."""
    a, b, c, d, e, f, g, h, i, x = entries
    sixes = ((a, d, g, h, i, x), (b, e, h, d, x, f), (c, f, i, x, a, b))
    parts = [_racah_terms(*s) for s in sixes]
    alpha = np.concatenate([p[0] for p in parts], axis=1)
    return alpha, np.concatenate([p[1] for p in parts], axis=1)


def _ninej_ints(rows: IArr, lo_x: IArr, hi_x: IArr) -> tuple[FArr, FArr, BArr]:
    """Admissible 9j whose inner column sums are at most ``_INT_BETA``, from exact
    integers: (values, bounds, done); ``done`` is False where the check below failed.

    DLMF 34.6.2 with each 6j written as R / sqrt(N1 N2 N3 N4) (``_sixj_ints``): the
    x-dependent triads (a i x), (h d x), (b f x) occur twice, so ``9j = S / sqrt(M)``,
    M the product of the six row and column N, and ``S = sum_x P_x / Q_x`` with
    ``P_x = (-1)^(2x) (2x+1) R1 R2 R3`` and Q_x the product of the three x-dependent N.

    In every case we have met, each P_x / Q_x is an integer T_x; the path relies on
    that only where it is checked (own argument).  T = rint(P / Q) is taken from
    float64: nine roundings, so within 10 u |P / Q| <= 0.32 of P / Q while
    |P / Q| < 2^48, and rint gives P / Q whenever that is an integer.  Then
    ``T Q == P`` is tested in uint64, whose conversions and products are taken
    modulo 2^64 (numpy's uint64 is C's unsigned arithmetic; C11 6.2.5 and
    6.3.1.3, from memory).
    With Q < 2^62 the integer D = T Q - P has |D| <= 0.82 Q < 2^63, so D = 0
    modulo 2^64 means D = 0 and P / Q = T exactly.  A symbol with a term that
    fails (or is too large) is left to the double-double path; otherwise
    S = sum_x T_x is exact, and a nontrivial zero is S == 0.
    """
    a, b, c, d, e, f, g, h, i = (rows[:, k] for k in range(9))
    _, starts, seg, x = _x_pairs(lo_x, hi_x)
    m = seg.size
    A, B, D, F, H, I_ = (v[seg] for v in (a, b, d, f, h, i))
    r = _racah_ints(*_ninej_inner(A, B, c[seg], D, e[seg], F, g[seg], H, I_, x))
    n1, n2, n3 = _triad_ints(A, I_, x), _triad_ints(H, D, x), _triad_ints(B, F, x)
    fq = n1.astype(np.float64) * n2 * n3
    signed = np.where(x & 1 == 1, -(x + 1), x + 1)  # (-1)^(2x) (2x+1), x doubled
    ratio = signed * r[:m].astype(np.float64) * r[m : 2 * m] * r[2 * m :] / fq
    fits = (fq < 2.0**62) & (np.abs(ratio) < 2.0**48)
    t = np.rint(np.where(fits, ratio, 0.0)).astype(np.int64)
    # The check modulo 2^64 (uint64: casts and products wrap by definition).
    ru = r.astype(np.uint64)
    p_mod = signed.astype(np.uint64) * ru[:m] * ru[m : 2 * m] * ru[2 * m :]
    q_mod = n1.astype(np.uint64) * n2.astype(np.uint64) * n3.astype(np.uint64)
    done = np.logical_and.reduceat(fits & (t.astype(np.uint64) * q_mod == p_mod), starts)
    # At most 10 terms (x <= min(a+i, d+h) <= 19, doubled), each below 2^48.
    total = np.add.reduceat(t, starts)

    prod = _triad_ints(a, b, c).astype(np.float64)
    for y, z, w in ((d, e, f), (g, h, i), (a, d, g), (b, e, h), (c, f, i)):
        prod *= _triad_ints(y, z, w)
    # Roundings: the exact sum (below 10 * 2^48 < 2^53) to float is exact; the six N
    # to float (6 u: N can pass 2^53 and round) and five products (5 u), the square
    # root (half of those 11 u, plus u), the division (u): 7.5 u to first order; 8 u
    # claimed.
    value = total.astype(np.float64) / np.sqrt(prod)
    return value, np.where(total == 0, 0.0, 8.0 * _U), done


def _ninej_chunk(rows: IArr) -> tuple[FArr, FArr]:
    """Values and proven relative bounds of 9j rows (DLMF 34.6.2)."""
    n_rows = rows.shape[0]
    out = np.zeros(n_rows)
    bound = np.zeros(n_rows)
    a, b, c, d, e, f, g, h, i = (rows[:, k] for k in range(9))
    ok = _tri(a, b, c) & _tri(d, e, f) & _tri(g, h, i)
    ok &= _tri(a, d, g) & _tri(b, e, h) & _tri(c, f, i)
    lo_x = np.maximum(np.maximum(np.abs(a - i), np.abs(d - h)), np.abs(b - f))
    hi_x = np.minimum(np.minimum(a + i, d + h), b + f)
    ok &= (hi_x >= lo_x) & ((a + i + lo_x) % 2 == 0) & ((d + h + lo_x) % 2 == 0)
    ok &= (b + f + lo_x) % 2 == 0
    # Small arguments: the exact integer sums.  The three inner 6j have the column
    # sums a+d+h+i, b+d+f+h and a+b+f+i whatever x is, and those bound every smax.
    small = ok & (a + d + h + i <= _INT_BETA) & (b + d + f + h <= _INT_BETA)
    small &= a + b + f + i <= _INT_BETA
    sel = np.flatnonzero(small)
    if sel.size:
        v, bd, done = _ninej_ints(rows[sel], lo_x[sel], hi_x[sel])
        sel = sel[done]
        out[sel] = v[done]
        bound[sel] = bd[done]
        ok[sel] = False  # the rest (a term not proven an integer) take the path below
    idx = np.flatnonzero(ok)
    if idx.size == 0:
        return out, bound
    a, b, c, d, e, f, g, h, i = (rows[idx, k] for k in range(9))
    counts, starts, seg, x = _x_pairs(lo_x[idx], hi_x[idx])
    A, B, C, D, E, F, G, H, I_ = (v[seg] for v in (a, b, c, d, e, f, g, h, i))

    # The three 6j of each term, Racah sums stacked into one vectorised pass.
    alpha, beta = _ninej_inner(A, B, C, D, E, F, G, H, I_, x)
    smin, rh, rl, rel = _racah_sums(alpha, beta)
    # Inner sums the bound cannot vouch for (near zero, or overflowing at very
    # large j): take them from the exact integer sum instead (error <= 2 u^2).
    for bad in np.flatnonzero(~(rel <= 1e-20)):
        rh[bad], rl[bad] = _racah_exact_dd(
            tuple(int(v) for v in alpha[:, bad]), tuple(int(v) for v in beta[:, bad])
        )
        rel[bad] = 2.0 * _U2 if math.isfinite(rh[bad]) else np.inf

    m = seg.size
    tab = _table_for(int(beta.max()) + 2)
    num: list[IArr] = []
    den: list[IArr] = []
    for y, z in ((A, I_), (H, D), (B, F)):  # the squared, x-dependent Delta^2
        nn, dd = _delta_indices(y, z, x)
        num += nn
        den += dd
    for k in range(3):
        sl_ = slice(k * m, (k + 1) * m)
        sm = smin[sl_]
        num.append(sm + 1)
        den += [sm - alpha[j, sl_] for j in range(4)] + [beta[j, sl_] - sm for j in range(3)]
    # Each term's magnitude: (2x+1) * prod num! * Sigma_1 Sigma_2 Sigma_3 / prod den!,
    # numerator rows multiplied pairwise in double-double, one division.
    gt = _gather(tab, num + den)
    k_num = len(num)
    nh = np.concatenate([gt[0, :k_num], rh.reshape(3, m), (x + 1)[None, :].astype(np.float64)])
    nl = np.concatenate([gt[1, :k_num], rl.reshape(3, m), np.zeros((1, m))])
    nh, nl = _dd_tree_product(nh, nl)
    dh, dl = _dd_tree_product(gt[0, k_num:], gt[1, k_num:])
    th, tl = _dd_div(nh, nl, dh, dl)
    texp = (gt[2, :k_num].sum(axis=0) - gt[2, k_num:].sum(axis=0)).astype(np.int64)
    # Table entries u^2 each, 6 u^2 per product, 16 u^2 for the division.
    t_err = (len(num) + len(den) + 6.0 * (k_num + 4 + len(den)) + 16.0) * _U2
    flip = (x + smin[:m] + smin[m : 2 * m] + smin[2 * m :]) & 1  # (-1)^(2x) and the smin
    th = np.where(flip == 1, -th, th)
    tl = np.where(flip == 1, -tl, tl)
    # Per-term relative bound: the three inner sums and the products above; the
    # (1 + 1e-10) covers the second-order products of small relative errors.
    term_rel = (rel[:m] + rel[m : 2 * m] + rel[2 * m :] + t_err) * (1 + 1e-10)

    # Bring the terms of each symbol to a common binary exponent (the largest).
    _, ex = np.frexp(th)
    texp = texp + ex
    th = np.ldexp(th, -ex)
    tl = np.ldexp(tl, -ex)
    top = np.maximum.reduceat(texp, starts)
    shift = texp - top[seg]
    th = np.ldexp(th, shift)
    tl = np.ldexp(tl, shift)

    # Segment sums in double-double, column by column of a padded (symbols, x) table.
    width = int(counts.max())
    col = np.arange(m) - starts[seg]
    pad_h = np.zeros((width, idx.size))
    pad_l = np.zeros((width, idx.size))
    pad_h[col, seg] = th
    pad_l[col, seg] = tl
    sh = pad_h[0].copy()
    sl = pad_l[0].copy()
    for k in range(1, width):
        sh, sl = _dd_add(sh, sl, pad_h[k], pad_l[k])
    abs_sum = np.add.reduceat(np.abs(th), starts) * (1 + 2 * width * _U)
    term_err = np.add.reduceat(np.abs(th) * term_rel, starts) * (1 + 2 * width * _U)
    # Error (own argument): each term's own bound, the additions (<= 6 u^2 A
    # each, as in _racah_sums, doubled for margin), and terms that underflowed
    # when aligned (each < 2^-1074 while A >= 1/2).
    err = term_err + 12.0 * counts * _U2 * abs_sum + counts * 2.0**-1070
    margin = np.abs(sh) - err
    rel9 = np.where(margin > 0, err / np.where(margin > 0, margin, 1.0), np.inf)
    rel9[~np.isfinite(rel9)] = np.inf

    # The square root of the six row and column Delta^2 (DLMF 34.2.5): <= 24 u.
    fnum: list[IArr] = []
    fden: list[IArr] = []
    for y, z, w in ((a, b, c), (d, e, f), (g, h, i), (a, d, g), (b, e, h), (c, f, i)):
        nn, dd = _delta_indices(y, z, w)
        fnum += nn
        fden += dd
    fm, fexp = _float_factorial_ratio(tab, fnum, fden)
    odd = fexp & 1
    root = np.sqrt(fm * np.where(odd == 1, 2.0, 1.0))
    out[idx] = np.ldexp(root * sh, (fexp - odd) // 2 + top)
    # sqrt prefactor 24 u, rounding of the sum and the product 2 u: 30 u with margin.
    bound[idx] = rel9 + 30.0 * _U
    return out, bound


def _pairs_of(rows: IArr) -> Any:
    """Number of (symbol, x) pairs of each 9j row (for chunking; 1 when none)."""
    a, b, d, f, h, i = (rows[:, k] for k in (0, 1, 3, 5, 7, 8))
    lo_x = np.maximum(np.maximum(np.abs(a - i), np.abs(d - h)), np.abs(b - f))
    hi_x = np.minimum(np.minimum(a + i, d + h), b + f)
    return np.maximum((hi_x - lo_x) // 2 + 1, 1)


def ninej_float_many_checked(args: object, *, tolerance: float = BULK_TOLERANCE) -> BulkFloats:
    """Bulk 9j with the audit trail (:class:`BulkFloats`); see :func:`ninej_float_many`.

    >>> import numpy as np
    >>> got = ninej_float_many_checked(np.array([[2, 2, 2, 2, 2, 2, 2, 2, 2]]))
    >>> float(got.values[0]), float(got.bound[0])  # a nontrivial zero, proven exact
    (0.0, 0.0)
    """
    where = "ninej_float_many"
    tol = _check_tolerance(tolerance, where)
    rows = _doubled_rows(args, 9, where)
    values = np.zeros(rows.shape[0])
    bound = np.zeros(rows.shape[0])
    with np.errstate(all="ignore"):
        ends = np.cumsum(_pairs_of(rows))
        start = 0
        while start < rows.shape[0]:
            # Chunks of about _CHUNK_PAIRS (symbol, x) pairs, at least one symbol.
            base = int(ends[start - 1]) if start else 0
            stop = max(start + 1, int(np.searchsorted(ends, base + _CHUNK_PAIRS, "right")))
            v, bd = _ninej_chunk(rows[start:stop])
            values[start:stop] = v
            bound[start:stop] = bd
            start = stop
    return _vouched(rows, values, bound, tol, _ninej_float_doubled)


def ninej_float_many(args: object, *, tolerance: float = BULK_TOLERANCE) -> FArr:
    """Many 9j symbols {a b c; d e f; g h i} at once, from an (N, 9) array of
    doubled ints (rows in order).

    DLMF 34.6.2 vectorised over (symbol, x) pairs in double-double arithmetic;
    each value within relative error ``tolerance`` (<= 1e-12) of the exact one,
    selection-rule zeros exactly 0.0; entries the error bound cannot vouch for
    are recomputed from the exact sums
    (:func:`~recouple.symbols.floats.ninej_float_doubled`).

    >>> import numpy as np
    >>> got = ninej_float_many(np.array([[2, 4, 6, 8, 10, 12, 6, 12, 18]]))
    >>> round(float(got[0]) / (15**0.5 / 6370), 12)  # CONVENTIONS 2.5: sqrt(15)/6370
    1.0
    """
    return ninej_float_many_checked(args, tolerance=tolerance).values
