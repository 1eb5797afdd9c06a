"""Standard forms of 6j and 9j symbols under their symmetries.

Generic over the entry type: the value cache uses doubled integers, the
formula engine uses label strings.  A 6j ``{j1 j2 j3; l1 l2 l3}`` is a tuple
``(j1, j2, j3, l1, l2, l3)``; a 9j is its nine entries row by row.

* 6j: 24 arrangements, no phases: the 3! column permutations times an up/down
  swap in none or two of the three columns (DLMF 34.5.8; CONVENTIONS 2.3).
* 9j: 72 arrangements: 3! row permutations x 3! column permutations x
  transposition; an odd permutation of rows or of columns (not both) multiplies
  the symbol by ``(-1)^R``, R the sum of the nine entries (DLMF §34.7(ii);
  CONVENTIONS 2.6).

>>> canonical_sixj((3, 1, 2, 6, 5, 4))
(1, 2, 3, 5, 4, 6)
>>> len(set(sixj_arrangements(tuple("abcdef")))), len(ninej_arrangements(tuple("abcdefghi")))
(24, 72)
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from itertools import permutations
from typing import Any, TypeAlias, TypeVar, cast

__all__ = [
    "SIXJ_INDEX_MAPS",
    "NINEJ_INDEX_MAPS",
    "canonical_ninej",
    "canonical_sixj",
    "ninej_arrangements",
    "ninej_triads",
    "sixj_arrangements",
    "sixj_triads",
]

T = TypeVar("T")
#: The six entries of a 6j, row by row.
Six: TypeAlias = tuple[T, T, T, T, T, T]
#: The nine entries of a 9j, row by row.
Nine: TypeAlias = tuple[T, T, T, T, T, T, T, T, T]


def _parity(perm: Sequence[int]) -> int:
    """0 for an even permutation of range(n), 1 for an odd one."""
    seen = [False] * len(perm)
    odd = 0
    for i in range(len(perm)):
        if not seen[i]:
            j, length = i, 0
            while not seen[j]:
                seen[j] = True
                j = perm[j]
                length += 1
            odd ^= (length - 1) & 1
    return odd


def _sixj_maps() -> tuple[tuple[int, ...], ...]:
    # Position k < 3 is the top of column k, position k + 3 its bottom.
    swaps = ((), (0, 1), (0, 2), (1, 2))
    maps = []
    for cols in permutations(range(3)):
        for swap in swaps:
            top = [cols[k] for k in range(3)]
            bottom = [cols[k] + 3 for k in range(3)]
            for k in swap:
                top[k], bottom[k] = bottom[k], top[k]
            maps.append(tuple(top + bottom))
    return tuple(maps)


def _ninej_maps() -> tuple[tuple[tuple[int, ...], bool], ...]:
    maps = []
    for transpose in (False, True):
        for rows in permutations(range(3)):
            for cols in permutations(range(3)):
                odd = bool(_parity(rows) ^ _parity(cols))
                idx = []
                for r in range(3):
                    for c in range(3):
                        # Entry (r, c) of the new array comes from (rows[r], cols[c]) of
                        # the original, read transposed when asked (transposition is even).
                        rr, cc = rows[r], cols[c]
                        idx.append(cc * 3 + rr if transpose else rr * 3 + cc)
                maps.append((tuple(idx), odd))
    return tuple(maps)


#: Index maps of the 24 arrangements of a 6j (identity first).
SIXJ_INDEX_MAPS: tuple[tuple[int, ...], ...] = _sixj_maps()
#: Index maps of the 72 arrangements of a 9j, each with its ``odd`` flag (identity first).
NINEJ_INDEX_MAPS: tuple[tuple[tuple[int, ...], bool], ...] = _ninej_maps()


def _identity(x: Any) -> Any:
    return x


def sixj_arrangements(entries: Six[T]) -> tuple[Six[T], ...]:
    """All 24 arrangements of a 6j with the same value (DLMF 34.5.8).

    >>> sixj_arrangements((1, 2, 3, 4, 5, 6))[:3]
    ((1, 2, 3, 4, 5, 6), (4, 5, 3, 1, 2, 6), (4, 2, 6, 1, 5, 3))
    """
    if len(entries) != 6:
        raise ValueError(f"a 6j has six entries, got {len(entries)}")
    return tuple(cast("Six[T]", tuple(entries[i] for i in m)) for m in SIXJ_INDEX_MAPS)


def canonical_sixj(entries: Six[T], key: Callable[[Six[T]], Any] | None = None) -> Six[T]:
    """The arrangement minimal under ``key`` (applied to whole arrangements;
    default: the tuple itself), so equal symbols get equal standard forms.

    >>> canonical_sixj(("e", "f", "d", "c", "a", "b"))
    ('a', 'b', 'e', 'f', 'd', 'c')
    """
    arrangements = sixj_arrangements(entries)
    if key is None:
        return min(arrangements, key=_identity)
    return min(arrangements, key=key)


def sixj_triads(entries: Six[T]) -> frozenset[tuple[T, ...]]:
    """The four triads (j1 j2 j3), (j1 l2 l3), (l1 j2 l3), (l1 l2 j3) as sorted tuples.

    Two 6j with the same triads are the same symbol (CONVENTIONS 2.3,
    practical rule).  With a repeated triad the set has fewer than four elements.

    >>> sorted(sixj_triads(("a", "b", "c", "d", "e", "f")))
    [('a', 'b', 'c'), ('a', 'e', 'f'), ('b', 'd', 'f'), ('c', 'd', 'e')]
    """
    j1, j2, j3, l1, l2, l3 = entries
    return frozenset(
        tuple(sorted(t))  # type: ignore[type-var]
        for t in ((j1, j2, j3), (j1, l2, l3), (l1, j2, l3), (l1, l2, j3))
    )


def ninej_arrangements(entries: Nine[T]) -> tuple[tuple[Nine[T], bool], ...]:
    """All 72 arrangements of a 9j, each with ``odd`` = True when it carries ``(-1)^R``.

    >>> arr = ninej_arrangements(tuple("abcdefghi"))
    >>> arr[1]
    (('a', 'c', 'b', 'd', 'f', 'e', 'g', 'i', 'h'), True)
    """
    if len(entries) != 9:
        raise ValueError(f"a 9j has nine entries, got {len(entries)}")
    return tuple(
        (cast("Nine[T]", tuple(entries[i] for i in m)), odd) for m, odd in NINEJ_INDEX_MAPS
    )


def canonical_ninej(
    entries: Nine[T], key: Callable[[Nine[T]], Any] | None = None
) -> tuple[Nine[T], bool]:
    """The arrangement minimal under ``key`` and its ``odd`` flag.

    The symbol equals ``(-1)^R`` times the returned arrangement when the flag is
    set (DLMF §34.7(ii)).  Among equal arrangements the even one wins.

    >>> canonical_ninej(tuple("ihgfedcba"))
    (('a', 'b', 'c', 'd', 'e', 'f', 'g', 'h', 'i'), False)
    """
    arrangements = ninej_arrangements(entries)
    k = _identity if key is None else key
    return min(arrangements, key=lambda a: (k(a[0]), a[1]))


def ninej_triads(entries: Nine[T]) -> tuple[tuple[T, T, T], ...]:
    """The six triads of a 9j: its three rows, then its three columns.

    >>> ninej_triads(tuple("abcdefghi"))[2:4]
    (('g', 'h', 'i'), ('a', 'd', 'g'))
    """
    a, b, c, d, e, f, g, h, i = entries
    return ((a, b, c), (d, e, f), (g, h, i), (a, d, g), (b, e, h), (c, f, i))
