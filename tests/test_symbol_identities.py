"""Special values and identities of Wigner symbols (DLMF ch. 34), in exact arithmetic.

Each identity is checked at seeded random arguments with the library's own exact
symbols; any phase or factor slip breaks exact equality.
"""

from __future__ import annotations

import random
from itertools import product

import pytest

from recouple.numbers import Radical
from recouple.symbols import cg_doubled, ninej_doubled, sixj_doubled, threej_doubled


def sign(x: int) -> int:
    """(-1)^x for an integer x."""
    return -1 if x % 2 else 1


def rng_for(name: str) -> random.Random:
    return random.Random(name)


def tri(a: int, b: int, c: int) -> bool:
    return (a + b + c) % 2 == 0 and abs(a - b) <= c <= a + b


def common(rng: random.Random, *pairs: tuple[int, int]) -> int | None:
    """A random doubled c admissible with every pair (a, b) given, or None."""
    lo = max(abs(a - b) for a, b in pairs)
    hi = min(a + b for a, b in pairs)
    options = [c for c in range(lo, hi + 1) if all(tri(a, b, c) for a, b in pairs)]
    return rng.choice(options) if options else None


def hat(*ds: int) -> Radical:
    """sqrt(prod(2j+1)) from doubled j."""
    p = 1
    for d in ds:
        p *= d + 1
    return Radical.sqrt(p)


def test_sixj_with_a_zero_entry() -> None:
    # DLMF 34.5.1 (CONVENTIONS 2.4): {j1 j2 j3; 0 j3 j2} = (-1)^(j1+j2+j3)/sqrt((2j2+1)(2j3+1))
    checked = 0
    for j1, j2, j3 in product(range(13), repeat=3):
        if not tri(j1, j2, j3):
            assert sixj_doubled(j1, j2, j3, 0, j3, j2) == 0
            continue
        expected = sign((j1 + j2 + j3) // 2) / hat(j2, j3)
        assert sixj_doubled(j1, j2, j3, 0, j3, j2) == expected
        checked += 1
    assert checked > 300


def test_sixj_zero_in_corner() -> None:
    # CONVENTIONS 2.4 second form: {j1 j2 j3; l1 l2 0} = delta(j1,l2) delta(j2,l1)
    # (-1)^(j1+j2+j3)/sqrt((2j1+1)(2j2+1))
    for j1, j2, j3, l1, l2 in product(range(7), repeat=5):
        got = sixj_doubled(j1, j2, j3, l1, l2, 0)
        if j1 == l2 and j2 == l1 and tri(j1, j2, j3):
            assert got == sign((j1 + j2 + j3) // 2) / hat(j1, j2)
        else:
            assert got == 0


def test_ninej_with_a_zero_entry() -> None:
    # DLMF 34.7.1 (CONVENTIONS 2.7):
    # {j11 j12 j13; j21 j22 j13; j31 j31 0} = (-1)^(j12+j21+j13+j31)
    #     / sqrt((2j13+1)(2j31+1)) {j11 j12 j13; j22 j21 j31}
    rng = rng_for("34.7.1")
    nonzero = 0
    for n in range(300):
        a, b, d, e, c, g = (rng.randint(0, 10) for _ in range(6))
        if n % 3:  # two in three built admissible
            c = rng.randrange(abs(a - b), a + b + 1, 2)
            e = rng.randrange(abs(d - c), d + c + 1, 2)
            g = common(rng, (a, d), (b, e)) or 0
        got = ninej_doubled(a, b, c, d, e, c, g, g, 0)
        expected = sign((b + d + c + g) // 2) / hat(c, g) * sixj_doubled(a, b, c, e, d, g)
        if not (tri(a, b, c) and tri(d, e, c) and tri(a, d, g) and tri(b, e, g)):
            expected = Radical(0)
        assert got == expected, (a, b, c, d, e, g)
        nonzero += bool(got)
    assert nonzero > 100


def _random_pairs(rng: random.Random, top: int) -> tuple[int, ...]:
    """Doubled j1, j2, l1, l2 with j1 + j2 + l1 + l2 even (so sums over j3 exist)."""
    while True:
        v = tuple(rng.randint(0, top) for _ in range(4))
        if sum(v) % 2 == 0:
            return v


def test_sixj_orthogonality() -> None:
    # DLMF 34.5.14 (layout from memory, checked here):
    # sum_j3 (2j3+1)(2l3+1) {j1 j2 j3; l1 l2 l3}{j1 j2 j3; l1 l2 l3'} = delta(l3, l3')
    # for admissible (j1 l2 l3) and (l1 j2 l3)
    rng = rng_for("34.5.14")
    done = 0
    for _ in range(60):
        j1, j2, l1, l2 = _random_pairs(rng, 12)
        l3s = [x for x in range(0, 30) if tri(j1, l2, x) and tri(l1, j2, x)]
        for l3 in l3s:
            for l3p in l3s:
                total = Radical(0)
                for j3 in range(abs(j1 - j2), j1 + j2 + 1, 2):
                    total += (
                        (j3 + 1)
                        * (l3 + 1)
                        * sixj_doubled(j1, j2, j3, l1, l2, l3)
                        * sixj_doubled(j1, j2, j3, l1, l2, l3p)
                    )
                assert total == (1 if l3 == l3p else 0), (j1, j2, l1, l2, l3, l3p)
                done += 1
    assert done > 200


def test_racah_sum_rule() -> None:
    # DLMF 34.5.15 (layout from memory, checked here): Racah's sum rule
    # sum_j (-1)^(j+j'+j'') (2j+1) {j1 j2 j'; j3 j4 j}{j1 j3 j''; j2 j4 j} = {j1 j2 j'; j4 j3 j''}
    rng = rng_for("34.5.15")
    nonzero = 0
    for _ in range(250):
        j1, j2, j3, j4 = (rng.randint(0, 8) for _ in range(4))
        jp = common(rng, (j1, j2), (j3, j4))
        jpp = common(rng, (j1, j3), (j2, j4))
        if jp is None or jpp is None:
            continue
        total = Radical(0)
        for j in range(0, 24):
            term = sixj_doubled(j1, j2, jp, j3, j4, j) * sixj_doubled(j1, j3, jpp, j2, j4, j)
            if term:
                total += sign((j + jp + jpp) // 2) * (j + 1) * term
        expected = sixj_doubled(j1, j2, jp, j4, j3, jpp)
        assert total == expected, (j1, j2, j3, j4, jp, jpp)
        nonzero += bool(expected)
    assert nonzero > 60


def test_biedenharn_elliott() -> None:
    # DLMF 34.5.16 (layout from memory, checked here; also Edmonds 1957 (6.2.12), from memory):
    # sum_x (-1)^(S+x) (2x+1) {a b x; c d p}{c d x; e f q}{e f x; b a r}
    #     = {p q r; e a d}{p q r; f b c},   S = a+b+c+d+e+f+p+q+r
    rng = rng_for("34.5.16")
    nonzero = 0
    tries = 0
    while nonzero < 40 and tries < 4000:
        tries += 1
        a, b, c, d, e, f = (rng.randint(0, 6) for _ in range(6))
        p = common(rng, (a, d), (b, c))
        q = common(rng, (e, d), (f, c))
        if p is None or q is None:
            continue
        r = common(rng, (e, a), (f, b), (p, q))
        if r is None:
            continue
        s_all = a + b + c + d + e + f + p + q + r
        if s_all % 2:
            continue
        total = Radical(0)
        for x in range(0, 16):
            term = (
                sixj_doubled(a, b, x, c, d, p)
                * sixj_doubled(c, d, x, e, f, q)
                * sixj_doubled(e, f, x, b, a, r)
            )
            if term:
                total += sign((s_all + x) // 2) * (x + 1) * term
        expected = sixj_doubled(p, q, r, e, a, d) * sixj_doubled(p, q, r, f, b, c)
        assert total == expected, (a, b, c, d, e, f, p, q, r)
        nonzero += bool(expected)
    assert nonzero == 40


def test_clebsch_gordan_orthogonality() -> None:
    # CONVENTIONS 1.6 (Edmonds 1957 §3.5, from memory): both orthogonality relations
    for j1, j2 in product(range(6), repeat=2):
        js = range(abs(j1 - j2), j1 + j2 + 1, 2)
        for j, jp in product(js, repeat=2):
            for m in range(-min(j, jp), min(j, jp) + 1, 2):
                total = Radical(0)
                for m1 in range(-j1, j1 + 1, 2):
                    m2 = m - m1
                    total += cg_doubled(j1, m1, j2, m2, j, m) * cg_doubled(j1, m1, j2, m2, jp, m)
                assert total == (1 if j == jp else 0)
        for m1, m2, m1p in product(
            range(-j1, j1 + 1, 2), range(-j2, j2 + 1, 2), range(-j1, j1 + 1, 2)
        ):
            m2p = m1 + m2 - m1p
            if abs(m2p) > j2:
                continue
            total = Radical(0)
            for j in js:
                total += cg_doubled(j1, m1, j2, m2, j, m1 + m2) * cg_doubled(
                    j1, m1p, j2, m2p, j, m1 + m2
                )
            assert total == (1 if m1 == m1p else 0)


def test_condon_shortley_sign_rule() -> None:
    # CONVENTIONS 1.3 (Condon & Shortley 1935 via DLMF 34.1; rule from memory, Edmonds 1957
    # §3.5): <j1 j1; j2 (J - j1) | J J> > 0 for every allowed J
    for j1, j2 in product(range(15), repeat=2):
        for j in range(abs(j1 - j2), j1 + j2 + 1, 2):
            assert cg_doubled(j1, j1, j2, j - j1, j, j).sign() == 1, (j1, j2, j)


def test_cg_exchange_phase() -> None:
    # CONVENTIONS 1.5: <j1 m1 j2 m2|J M> = (-1)^(j1+j2-J) <j2 m2 j1 m1|J M>
    rng = rng_for("1.5")
    for _ in range(300):
        j1, j2 = rng.randint(0, 10), rng.randint(0, 10)
        j = rng.randrange(abs(j1 - j2), j1 + j2 + 1, 2)
        m1, m2 = rng.randrange(-j1, j1 + 1, 2), rng.randrange(-j2, j2 + 1, 2)
        lhs = cg_doubled(j1, m1, j2, m2, j, m1 + m2)
        assert lhs == sign((j1 + j2 - j) // 2) * cg_doubled(j2, m2, j1, m1, j, m1 + m2)


def test_threej_special_value() -> None:
    # DLMF 34.3.1 (CONVENTIONS 1.7): (j j 0; m -m 0) = (-1)^(j-m)/sqrt(2j+1)
    for j in range(0, 21):
        for m in range(-j, j + 1, 2):
            assert threej_doubled(j, j, 0, m, -m, 0) == sign((j - m) // 2) / hat(j)


def sixj_from_threej(j1: int, j2: int, j3: int, l1: int, l2: int, l3: int) -> Radical:
    """DLMF 34.4.1 as verified in CONVENTIONS 1.8 (sum over all six m's)."""
    total = Radical(0)
    for m1, m2 in product(range(-j1, j1 + 1, 2), range(-j2, j2 + 1, 2)):
        m3 = -m1 - m2
        if abs(m3) > j3:
            continue
        a = threej_doubled(j1, j2, j3, m1, m2, m3)
        if not a:
            continue
        for m1p, m2p in product(range(-l1, l1 + 1, 2), range(-l2, l2 + 1, 2)):
            # m3' is fixed by the zero-sum rules of the other 3j; loop and let them decide
            for m3p in range(-l3, l3 + 1, 2):
                b = threej_doubled(j1, l2, l3, m1, m2p, -m3p)
                if not b:
                    continue
                c = threej_doubled(l1, j2, l3, -m1p, m2, m3p)
                if not c:
                    continue
                d = threej_doubled(l1, l2, j3, m1p, -m2p, m3)
                if not d:
                    continue
                phase = sign((l1 + m1p + l2 + m2p + l3 + m3p) // 2)
                total += phase * a * b * c * d
    return total


def test_sixj_as_sum_of_four_threej() -> None:
    # DLMF 34.4.1 with the sign placement of CONVENTIONS 1.8
    rng = rng_for("34.4.1")
    nonzero = 0
    for _ in range(40):
        while True:
            d = tuple(rng.randint(0, 6) for _ in range(6))
            j1, j2, j3, l1, l2, l3 = d
            if tri(j1, j2, j3) and tri(j1, l2, l3) and tri(l1, j2, l3) and tri(l1, l2, j3):
                break
        got = sixj_from_threej(*d)
        assert got == sixj_doubled(*d), d
        nonzero += bool(got)
    assert nonzero > 30


def test_ninej_as_sum_of_three_sixj() -> None:
    # DLMF 34.6.2 (CONVENTIONS 2.5), with the (-1)^(2x) factor, from the library's own 6j
    rng = rng_for("34.6.2")
    nonzero = 0
    for _ in range(200):
        a, b, d, e = (rng.randint(0, 8) for _ in range(4))
        c = rng.randrange(abs(a - b), a + b + 1, 2)
        f = rng.randrange(abs(d - e), d + e + 1, 2)
        g = rng.randrange(abs(a - d), a + d + 1, 2)
        h = rng.randrange(abs(b - e), b + e + 1, 2)
        i = common(rng, (c, f), (g, h))
        if i is None:
            continue
        total = Radical(0)
        for x in range(0, 20):
            term = (
                sixj_doubled(a, d, g, h, i, x)
                * sixj_doubled(b, e, h, d, x, f)
                * sixj_doubled(c, f, i, x, a, b)
            )
            if term:
                total += sign(x) * (x + 1) * term
        assert total == ninej_doubled(a, b, c, d, e, f, g, h, i)
        nonzero += bool(total)
    assert nonzero > 100


@pytest.mark.parametrize(
    "d",
    [
        (1, 1, 0, 1, 3, 2, 0, 2, 2),  # CONVENTIONS 2.5 rows
        (3, 2, 1, 3, 2, 3, 4, 2, 2),
        (1, 2, 3, 2, 1, 3, 3, 3, 2),
        (2, 1, 1, 1, 2, 3, 1, 3, 4),
        (2, 2, 2, 2, 2, 2, 2, 2, 2),
        (3, 3, 2, 4, 4, 4, 1, 1, 2),
    ],
)
def test_ninej_as_six_threej(d: tuple[int, ...]) -> None:
    # DLMF 34.6.1 (CONVENTIONS 2.5): product of the three row 3j and the three column 3j,
    # summed over all nine m's, no phase; independent of the 6j route used inside ninej
    a, b, c, dd, e, f, g, h, i = d
    total = Radical(0)
    rngs = [range(-x, x + 1, 2) for x in d]
    for ma, mb, md, me in product(rngs[0], rngs[1], rngs[3], rngs[4]):
        mc, mf, mg, mh = -ma - mb, -md - me, -ma - md, -mb - me
        mi = -mg - mh
        if abs(mc) > c or abs(mf) > f or abs(mg) > g or abs(mh) > h or abs(mi) > i:
            continue
        if mc + mf + mi:
            continue
        total += (
            threej_doubled(a, b, c, ma, mb, mc)
            * threej_doubled(dd, e, f, md, me, mf)
            * threej_doubled(g, h, i, mg, mh, mi)
            * threej_doubled(a, dd, g, ma, md, mg)
            * threej_doubled(b, e, h, mb, me, mh)
            * threej_doubled(c, f, i, mc, mf, mi)
        )
    assert total == ninej_doubled(*d)
