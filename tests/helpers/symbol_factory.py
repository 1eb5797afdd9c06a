"""Random Wigner-symbol arguments for tests (doubled values, common practice)."""

from __future__ import annotations

import random


def tri(a: int, b: int, c: int) -> bool:
    """Triangle condition on doubled values (DLMF 34.2.1)."""
    return (a + b + c) % 2 == 0 and abs(a - b) <= c <= a + b


def random_ninej(rng: random.Random, lo: int, hi: int) -> tuple[int, ...]:
    """A doubled 9j with its six row and column triads admissible: a, b, d, e drawn
    from [lo, hi], the rest from what the triads allow (the last entry at most 2 hi).

    >>> from random import Random
    >>> len(random_ninej(Random(1), 0, 4))
    9
    """
    while True:
        a, b, d, e = (rng.randint(lo, hi) for _ in range(4))
        c = rng.randrange(abs(a - b), a + b + 1, 2)
        f = rng.randrange(abs(d - e), d + e + 1, 2)
        g = rng.randrange(abs(a - d), a + d + 1, 2)
        h = rng.randrange(abs(b - e), b + e + 1, 2)
        i_s = [i for i in range(0, 2 * hi + 1) if tri(c, f, i) and tri(g, h, i)]
        if i_s:
            return a, b, c, d, e, f, g, h, rng.choice(i_s)
