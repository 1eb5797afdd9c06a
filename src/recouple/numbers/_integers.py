"""Cached integer helpers: factorials, primes, square-free splits.

Everything here is a pure function of its integer arguments.  The tables grow
on demand and are shared; callers must treat the returned sequences as
read-only.

Sizes: the symbol layer needs factorials up to ``4 * MAX_SPIN + 2`` (the
``(s+1)!`` of the Racah sum of a 6j whose doubled entries are all
``2 * MAX_SPIN``), i.e. about 4002 entries.  The full factorial table at that
size holds roughly 10 MB of integers; it is only built as far as asked.

The square-free part of a product of factorials is read off *parity masks*:
bit ``k`` of ``fact_parity_mask(n)`` is set when the ``k``-th prime occurs to
an odd power in ``n!`` (Legendre's formula, common practice), so the mask of a
product is the XOR of the masks and no big integer is ever factored.

>>> factorial_table(5)[5]
120
>>> squarefree_split(72)  # 72 = 6**2 * 2
(6, 2)
>>> primes_of_mask(fact_parity_mask(6))  # 6! = 2**4 * 3**2 * 5
5
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from functools import lru_cache

__all__ = [
    "SQUAREFREE_CACHE",
    "fact_parity_mask",
    "factorial_table",
    "int_parity_mask",
    "primes_of_mask",
    "smallest_prime_factor",
    "squarefree_split",
]

# Growing tables; index n holds the value for n.  Extended by _grow only.
_FACT: list[int] = [1]
_FACT_MASK: list[int] = [0]  # parity mask of n!
_INT_MASK: list[int] = [0, 0]  # parity mask of n itself (n >= 1); index 0 unused
_SPF: list[int] = [0, 1]  # smallest prime factor of n (n >= 2)
_PRIMES: list[int] = []
_PRIME_INDEX: dict[int, int] = {}

#: Largest argument answered by the cached :func:`squarefree_split`.
SQUAREFREE_CACHE = 1 << 16


def _grow_sieve(n: int) -> None:
    """Rebuild the smallest-prime-factor sieve and the prime list to cover ``n``."""
    if n < len(_SPF):
        return
    new = max(n + 1, 2 * len(_SPF))
    spf = [0] * new
    primes: list[int] = []
    for i in range(2, new):
        if spf[i] == 0:
            spf[i] = i
            primes.append(i)
            for k in range(i * i, new, i):
                if spf[k] == 0:
                    spf[k] = i
    # Primes only get appended, so bit positions of existing masks stay valid.
    _SPF[:] = spf
    for p in primes[len(_PRIMES) :]:
        _PRIME_INDEX[p] = len(_PRIMES)
        _PRIMES.append(p)


def _grow(n: int) -> None:
    """Extend the factorial and parity-mask tables to index ``n``."""
    if n < len(_FACT):
        return
    _grow_sieve(n)
    for k in range(len(_FACT), n + 1):
        _FACT.append(_FACT[-1] * k)
        if k >= len(_INT_MASK):
            mask = 0
            m = k
            while m > 1:
                p = _SPF[m]
                e = 0
                while m % p == 0:
                    m //= p
                    e ^= 1
                if e:
                    mask ^= 1 << _PRIME_INDEX[p]
            _INT_MASK.append(mask)
        _FACT_MASK.append(_FACT_MASK[-1] ^ _INT_MASK[k])


def factorial_table(n: int) -> Sequence[int]:
    """The shared table of factorials, long enough to index ``n``.

    >>> factorial_table(10)[10]
    3628800
    """
    if n >= len(_FACT):
        _grow(n)
    return _FACT


def fact_parity_mask(n: int) -> int:
    """Bit ``k`` set when the ``k``-th prime divides ``n!`` an odd number of times.

    >>> bin(fact_parity_mask(5))  # 5! = 2**3 * 3 * 5: primes 2, 3, 5 odd
    '0b111'
    """
    if n >= len(_FACT):
        _grow(n)
    return _FACT_MASK[n]


def fact_parity_masks(n: int) -> Sequence[int]:
    """The shared table of factorial parity masks, long enough to index ``n``."""
    if n >= len(_FACT):
        _grow(n)
    return _FACT_MASK


def int_parity_mask(n: int) -> int:
    """Parity mask of the positive integer ``n`` (same bit layout as above).

    >>> bin(int_parity_mask(12))  # 12 = 2**2 * 3
    '0b10'
    """
    if n >= len(_FACT):
        _grow(n)
    return _INT_MASK[n]


@lru_cache(maxsize=4096)
def primes_of_mask(mask: int) -> int:
    """The product of the primes whose bits are set in ``mask`` (a square-free number).

    >>> primes_of_mask(0b101)  # primes 2 and 5
    10
    """
    out = 1
    while mask:
        low = mask & -mask
        out *= _PRIMES[low.bit_length() - 1]
        mask ^= low
    return out


@lru_cache(maxsize=SQUAREFREE_CACHE)
def _squarefree_small(n: int) -> tuple[int, int]:
    _grow_sieve(n)
    root, free = 1, 1
    m = n
    while m > 1:
        p = _SPF[m]
        m, e = _strip(m, p)
        root *= p ** (e // 2)
        if e % 2:
            free *= p
    return root, free


def _strip(m: int, p: int) -> tuple[int, int]:
    """``m`` with every factor ``p`` divided out, and how many there were."""
    e = 0
    while m % p == 0:
        m //= p
        e += 1
    return m, e


def squarefree_split(n: int) -> tuple[int, int]:
    """Write ``n >= 1`` as ``root**2 * free`` with ``free`` square-free.

    Small ``n`` (up to :data:`SQUAREFREE_CACHE`) use a cached sieve.  Larger
    ``n`` are trial-divided by primes up to a bound; what is left over is either
    a perfect square, known square-free (below the bound cubed, so at most two
    distinct large prime factors), or handed to ``sympy.factorint``.

    >>> squarefree_split(1), squarefree_split(50), squarefree_split(2**40 * 3)
    ((1, 1), (5, 2), (1048576, 3))
    """
    if n < 1:
        raise ValueError(f"squarefree_split needs a positive integer, got {n!r}")
    if n <= SQUAREFREE_CACHE:
        return _squarefree_small(n)
    bound = 1 << 12
    _grow_sieve(bound)
    root, free = 1, 1
    m = n
    certified = False  # True once every prime factor left in m is known to be large
    for p in _PRIMES:
        if p > bound:
            break
        if p * p * p > m:
            certified = True
            break
        if m % p == 0:
            m, e = _strip(m, p)
            root *= p ** (e // 2)
            if e % 2:
                free *= p
    else:
        certified = m < bound**3
    if m == 1:
        return root, free
    r = math.isqrt(m)
    if r * r == m:
        return root * r, free
    if certified or m < bound**3:
        # No prime below the cube root of m divides it, so m has at most two prime
        # factors; it is not a square, so they are distinct and m is square-free.
        return root, free * m
    from sympy import factorint  # only for huge inputs; slow but always right

    for p, e in factorint(m).items():
        root *= int(p) ** (e // 2)
        if e % 2:
            free *= int(p)
    return root, free


def smallest_prime_factor(n: int) -> int:
    """The smallest prime dividing ``n >= 2``.

    >>> smallest_prime_factor(91), smallest_prime_factor(97)
    (7, 97)
    """
    if n < 2:
        raise ValueError(f"smallest_prime_factor needs an integer >= 2, got {n!r}")
    if n <= SQUAREFREE_CACHE:
        _grow_sieve(n)
        return _SPF[n]
    _grow_sieve(SQUAREFREE_CACHE)
    for p in _PRIMES:
        if p * p > n:
            return n
        if n % p == 0:
            return p
    from sympy import factorint  # only for huge inputs

    return int(min(factorint(n)))
