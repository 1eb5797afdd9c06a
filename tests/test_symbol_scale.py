"""Exactness at large j, and the accuracy of the float path.

Independent reference: the Racah single sums of DLMF 34.4.2 (6j) and 34.6.2 (9j)
written again here with mpmath at high working precision (enough digits to absorb
the cancellation of the alternating sum), plus sympy.physics.wigner.wigner_6j for
two large cases.  Run with ``-s`` to see the worst float errors printed.
"""

from __future__ import annotations

import random

import mpmath
from symbol_factory import random_ninej, tri
from sympy import Rational
from sympy.physics.wigner import wigner_6j

from recouple.numbers import Radical
from recouple.symbols import (
    FLOAT_SAFE_DOUBLED,
    cg_doubled,
    cg_float_doubled,
    ninej_doubled,
    ninej_float_doubled,
    sixj_doubled,
    sixj_float_doubled,
)


def random_sixj(rng: random.Random, lo: int, hi: int) -> tuple[int, ...]:
    """Doubled admissible 6j with entries in [lo, hi]."""
    while True:
        a, b = rng.randint(lo, hi), rng.randint(lo, hi)
        c = rng.randrange(abs(a - b), a + b + 1, 2)
        d = rng.randint(lo, hi)
        e = rng.randrange(abs(d - c), d + c + 1, 2)
        fs = [f for f in range(lo, hi + 1) if tri(a, e, f) and tri(d, b, f)]
        if fs and c <= hi and e <= hi:
            return a, b, c, d, e, rng.choice(fs)


def mp_fact(n2: int) -> mpmath.mpf:
    """(n2/2)! for an even doubled argument."""
    assert n2 % 2 == 0
    return mpmath.factorial(n2 // 2)


def mp_delta(a: int, b: int, c: int) -> mpmath.mpf:
    # DLMF 34.2.5
    return mpmath.sqrt(
        mp_fact(a + b - c) * mp_fact(a - b + c) * mp_fact(-a + b + c) / mp_fact(a + b + c + 2)
    )


def mp_sixj(j1: int, j2: int, j3: int, l1: int, l2: int, l3: int) -> mpmath.mpf:
    """DLMF 34.4.2 on doubled arguments, in mpmath at the current precision."""
    if not (tri(j1, j2, j3) and tri(j1, l2, l3) and tri(l1, j2, l3) and tri(l1, l2, j3)):
        return mpmath.mpf(0)
    alphas = [j1 + j2 + j3, j1 + l2 + l3, l1 + j2 + l3, l1 + l2 + j3]
    betas = [j1 + j2 + l1 + l2, j2 + j3 + l2 + l3, j3 + j1 + l3 + l1]
    total = mpmath.mpf(0)
    for s in range(max(alphas) // 2, min(betas) // 2 + 1):
        den = mpmath.mpf(1)
        for x in alphas:
            den *= mpmath.factorial(s - x // 2)
        for y in betas:
            den *= mpmath.factorial(y // 2 - s)
        total += (-1) ** s * mpmath.factorial(s + 1) / den
    pre = mp_delta(j1, j2, j3) * mp_delta(j1, l2, l3) * mp_delta(l1, j2, l3) * mp_delta(l1, l2, j3)
    return pre * total


def mp_ninej(a: int, b: int, c: int, d: int, e: int, f: int, g: int, h: int, i: int) -> mpmath.mpf:
    """DLMF 34.6.2 from mp_sixj."""
    total = mpmath.mpf(0)
    for x in range(0, 2 * max(a, b, c, d, e, f, g, h, i) + 1):
        term = mp_sixj(a, d, g, h, i, x) * mp_sixj(b, e, h, d, x, f) * mp_sixj(c, f, i, x, a, b)
        total += (-1) ** x * (x + 1) * term
    return total


def mp_value(x: Radical) -> mpmath.mpf:
    return sum((mpmath.mpf(q.numerator) / q.denominator * mpmath.sqrt(s) for s, q in x.terms), 0)


def rel_err(approx: mpmath.mpf | float, exact: mpmath.mpf) -> float:
    if exact == 0:
        return 0.0 if approx == 0 else float("inf")
    return float(abs((mpmath.mpf(approx) - exact) / exact))


def test_exact_sixj_large_j_against_mpmath() -> None:
    # reference: DLMF 34.4.2 re-evaluated with mpmath at 700 digits (the alternating sum
    # loses a few hundred digits to cancellation at j = 200)
    rng = random.Random(200)
    with mpmath.workdps(700):
        for lo, hi in ((100, 200), (200, 300), (300, 400)):
            for _ in range(3):
                d = random_sixj(rng, lo, hi)
                exact = sixj_doubled(*d)
                assert exact.is_rational or len(exact.terms) == 1
                assert rel_err(mp_value(exact), mp_sixj(*d)) < 1e-50, d


def test_exact_sixj_large_j_against_sympy() -> None:
    # reference: sympy.physics.wigner.wigner_6j, exact, two cases with j up to 200
    for d in ((400, 380, 360, 390, 370, 350), (301, 299, 200, 251, 251, 300)):
        ref = wigner_6j(*(Rational(x, 2) for x in d))
        assert sixj_doubled(*d) == Radical.from_sympy(ref)


def test_exact_ninej_large_j_against_mpmath() -> None:
    # reference: DLMF 34.6.2 with the mpmath 6j above, 300 digits; j up to about 60
    rng = random.Random(909)
    with mpmath.workdps(300):
        for lo, hi in ((20, 40), (60, 90), (100, 120)):
            d = random_ninej(rng, lo, hi)
            exact = ninej_doubled(*d)
            assert rel_err(mp_value(exact), mp_ninej(*d)) < 1e-50, d


def test_float_path_accuracy() -> None:
    # The float path against the exact symbols (converted with mpmath at 40 digits).
    # Stated range: 6j with 2j <= 100 (j <= 50) and some to 2j = 400; 9j with 2j <= 40;
    # CG with 2j <= 100.  Requirement: relative error <= 1e-12; observed: a few ulp.
    assert FLOAT_SAFE_DOUBLED >= 400
    rng = random.Random(12)
    worst = {"6j": 0.0, "6j large": 0.0, "9j": 0.0, "cg": 0.0}
    with mpmath.workdps(40):
        for _ in range(400):
            d = random_sixj(rng, 0, 100)
            worst["6j"] = max(
                worst["6j"], rel_err(sixj_float_doubled(*d), mp_value(sixj_doubled(*d)))
            )
        for _ in range(10):
            d = random_sixj(rng, 200, 400)
            err = rel_err(sixj_float_doubled(*d), mp_value(sixj_doubled(*d)))
            worst["6j large"] = max(worst["6j large"], err)
        for _ in range(100):
            d = random_ninej(rng, 0, 20)
            worst["9j"] = max(
                worst["9j"], rel_err(ninej_float_doubled(*d), mp_value(ninej_doubled(*d)))
            )
        for _ in range(400):
            j1, j2 = rng.randint(0, 100), rng.randint(0, 100)
            j = rng.randrange(abs(j1 - j2), j1 + j2 + 1, 2)
            m1 = rng.randrange(-j1, j1 + 1, 2)
            m2s = [m for m in range(-j2, j2 + 1, 2) if abs(m1 + m) <= j]
            m2 = rng.choice(m2s)
            args = (j1, m1, j2, m2, j, m1 + m2)
            worst["cg"] = max(
                worst["cg"], rel_err(cg_float_doubled(*args), mp_value(cg_doubled(*args)))
            )
    print("worst relative error of the float path:", {k: f"{v:.2e}" for k, v in worst.items()})
    assert max(worst.values()) <= 1e-12


def test_float_path_zero_and_cancellation() -> None:
    # exact zeros stay 0.0 (selection rules and accidental zeros), never tiny noise:
    # {1 1 1; 1 1 1} for the 9j is exactly 0 (CONVENTIONS 2.5)
    assert ninej_float_doubled(2, 2, 2, 2, 2, 2, 2, 2, 2) == 0.0
    assert sixj_float_doubled(2, 2, 6, 2, 2, 2) == 0.0
    # nontrivial zeros: admissible 6j whose Racah sum vanishes, e.g. {1 2 2; 3 2 2}
    # (found by exhaustive search over 2j <= 8 with the exact path; the float path must
    # give exactly 0.0 there, and be nonzero wherever the exact value is)
    from itertools import product

    zeros = 0
    for d in product(range(0, 9, 2), repeat=6):
        exact = sixj_doubled(*d)
        assert (sixj_float_doubled(*d) == 0.0) == (exact == 0), d
        if (
            exact == 0
            and all(tri(*t) for t in ((d[0], d[1], d[2]), (d[0], d[4], d[5]), (d[3], d[1], d[5])))
            and tri(d[3], d[4], d[2])
        ):
            zeros += 1
    assert zeros > 0
    assert sixj_doubled(2, 4, 4, 6, 4, 4) == 0
