"""Behaviour at the edges of size: search budgets, many leaves, large j.

tests/test_symbol_scale.py already checks exact 6j to j = 200 and 9j to j = 60
against mpmath, and the float symbols to 2j = 400.  This file extends that:
6j up to MAX_SPIN, 9j with entries up to j = 205, the float symbols up to
FLOAT_SAFE_DOUBLED, the float path of whole formulas (sums of products), and the
search under a tiny budget and at 60 leaves.  Run with ``-s`` to see the worst
errors and the times printed.  ``python3 tests/test_scale.py`` prints the memory
figures quoted in docs/limits.md.
"""

from __future__ import annotations

import random
import time
import tracemalloc

import mpmath
from scheme_factory import random_tree, random_values

import recouple
from recouple.numbers.spins import MAX_SPIN
from recouple.recoupling.search import is_move
from recouple.referee.projection import project
from recouple.symbols import FLOAT_SAFE_DOUBLED, ninej_doubled, sixj_doubled, sixj_float_doubled


def tri(a: int, b: int, c: int) -> bool:
    """DLMF 34.2.1 on doubled values."""
    return (a + b + c) % 2 == 0 and abs(a - b) <= c <= a + b


def racah_sixj(j1: int, j2: int, j3: int, l1: int, l2: int, l3: int) -> mpmath.mpf:
    """DLMF 34.4.2 (Racah single sum, Delta of DLMF 34.2.5), doubled arguments, in mpmath.

    Written here independently of the package and of tests/test_symbol_scale.py.  At
    large j the alternating sum cancels heavily, so the caller sets the precision and
    checks it by evaluating twice (see :func:`stable`).
    """
    triads = ((j1, j2, j3), (j1, l2, l3), (l1, j2, l3), (l1, l2, j3))
    if not all(tri(*t) for t in triads):
        return mpmath.mpf(0)
    f = mpmath.factorial

    def delta(a: int, b: int, c: int) -> mpmath.mpf:
        return mpmath.sqrt(
            f((a + b - c) // 2)
            * f((a - b + c) // 2)
            * f((-a + b + c) // 2)
            / f((a + b + c) // 2 + 1)
        )

    alphas = [sum(t) // 2 for t in triads]
    betas = [(j1 + j2 + l1 + l2) // 2, (j2 + j3 + l2 + l3) // 2, (j3 + j1 + l3 + l1) // 2]
    total = mpmath.mpf(0)
    for s in range(max(alphas), min(betas) + 1):
        den = mpmath.mpf(1)
        for x in alphas:
            den *= f(s - x)
        for y in betas:
            den *= f(y - s)
        total += (-1) ** s * f(s + 1) / den
    pre = mpmath.mpf(1)
    for t in triads:
        pre *= delta(*t)
    return pre * total


def racah_ninej(
    a: int, b: int, c: int, d: int, e: int, f: int, g: int, h: int, i: int
) -> mpmath.mpf:
    """DLMF 34.6.2: the 9j as a sum over x of three 6j, doubled arguments."""
    total = mpmath.mpf(0)
    for x in range(0, 2 * max(a, b, c, d, e, f, g, h, i) + 1):
        if not (tri(a, i, x) and tri(d, h, x) and tri(b, f, x)):
            continue
        term = racah_sixj(a, d, g, h, i, x) * racah_sixj(b, e, h, d, x, f)
        total += (-1) ** x * (x + 1) * term * racah_sixj(c, f, i, x, a, b)
    return total


def stable(fn: object, args: tuple[int, ...], dps: int) -> mpmath.mpf:
    """fn(*args) at ``dps`` digits, checked against ``dps + 150`` digits to 1e-60."""
    with mpmath.workdps(dps):
        low = fn(*args)  # type: ignore[operator]
    with mpmath.workdps(dps + 150):
        high = fn(*args)  # type: ignore[operator]
        assert abs(low - high) <= mpmath.mpf(10) ** -60 * abs(high), "raise dps"
    return high


def as_mp(x: recouple.Radical) -> mpmath.mpf:
    return mpmath.fsum(mpmath.mpf(q.numerator) / q.denominator * mpmath.sqrt(s) for s, q in x.terms)


def rel(approx: object, exact: mpmath.mpf) -> float:
    return float(abs((mpmath.mpf(approx) - exact) / exact))  # type: ignore[arg-type]


# ---------------------------------------------------------------------------
# exact symbols beyond test_symbol_scale.py
# ---------------------------------------------------------------------------

SIXJ_TO_MAX_SPIN = [
    # doubled entries; j up to MAX_SPIN = 1000 (2j = 2000), all four triads admissible
    (2000, 1990, 1980, 1995, 1985, 1975),
    (2000, 2000, 2000, 2000, 2000, 2000),
    (1501, 1203, 1000, 1311, 1111, 1400),
]


def test_exact_sixj_up_to_max_spin() -> None:
    # reference: DLMF 34.4.2 in mpmath above; 250 digits, confirmed against 400 (the
    # cancellation costs far fewer digits than that here; stable() would catch it)
    assert max(max(d) for d in SIXJ_TO_MAX_SPIN) == 2 * MAX_SPIN
    with mpmath.workdps(400):
        for d in SIXJ_TO_MAX_SPIN:
            reference = stable(racah_sixj, d, 250)
            exact = sixj_doubled(*d)
            assert rel(as_mp(exact), reference) < 1e-60, d
            assert rel(sixj_float_doubled(*d), reference) <= 1e-15, d


NINEJ_LARGE = [
    # doubled entries, j up to 205; chosen so that the sum over x of DLMF 34.6.2 is short
    (400, 400, 20, 390, 380, 30, 410, 400, 40),
    (300, 310, 20, 400, 402, 10, 380, 400, 30),
    (401, 399, 10, 351, 349, 4, 400, 400, 14),
]


def test_exact_ninej_to_j_205() -> None:
    # reference: DLMF 34.6.2 over the DLMF 34.4.2 6j above, 300 digits confirmed at 450
    for d in NINEJ_LARGE:
        rows = (d[0:3], d[3:6], d[6:9], d[0::3], d[1::3], d[2::3])
        assert all(tri(*t) for t in rows), d
        reference = stable(racah_ninej, d, 300)
        assert reference != 0
        with mpmath.workdps(450):
            assert rel(as_mp(ninej_doubled(*d)), reference) < 1e-60, d


# ---------------------------------------------------------------------------
# the float path: symbols to FLOAT_SAFE_DOUBLED, whole formulas with sums
# ---------------------------------------------------------------------------


def test_float_sixj_up_to_float_safe_doubled() -> None:
    # Stated range: 6j with every 2j in [400, FLOAT_SAFE_DOUBLED = 2000] (test_symbol_scale
    # covers 2j <= 400).  Requirement: relative error <= 1e-12 against the exact value.
    rng = random.Random(2000)
    worst = 0.0
    checked = 0
    with mpmath.workdps(60):
        while checked < 8:
            a, b = rng.randint(400, FLOAT_SAFE_DOUBLED), rng.randint(400, FLOAT_SAFE_DOUBLED)
            c = rng.randrange(abs(a - b), a + b + 1, 2)
            d = rng.randint(400, FLOAT_SAFE_DOUBLED)
            e = rng.randrange(abs(d - c), d + c + 1, 2)
            f_lo = max(abs(a - e), abs(d - b), 400)
            f_hi = min(a + e, d + b, FLOAT_SAFE_DOUBLED)
            fs = [f for f in range(f_lo, f_hi + 1) if tri(a, e, f) and tri(d, b, f)]
            if not fs or max(c, e) > FLOAT_SAFE_DOUBLED or min(c, e) < 400:
                continue
            args = (a, b, c, d, e, rng.choice(fs))
            exact = sixj_doubled(*args)
            if exact == 0:
                continue
            worst = max(worst, rel(sixj_float_doubled(*args), as_mp(exact)))
            checked += 1
    print(f"6j float path, 2j in [400, {FLOAT_SAFE_DOUBLED}]: worst relative error {worst:.2e}")
    assert worst <= 1e-12


def test_float_formulas_with_sums() -> None:
    # evaluate_float sums rounded terms (math.fsum); a sum that cancels can lose
    # relative accuracy.  Stated range: random 5-leaf pairs, leaf values up to j = 6.
    # The absolute error stays at rounding level (the overlaps are at most 1 in size);
    # the worst relative error is printed.
    rng = random.Random(55)
    worst_abs = worst_rel = 0.0
    with_sums = 0
    leaves = [f"j{i}" for i in range(1, 6)]
    for _ in range(40):
        a, b = random_tree(leaves, rng), random_tree(leaves, rng)
        f = recouple.derive(a, b).formula
        values = random_values(a, b, rng, leaf_doubled=tuple(range(6, 13)))
        if values is None or not f.sums:
            continue
        with_sums += 1
        exact = f.evaluate(values)
        fast = f.evaluate_float(values)
        with mpmath.workdps(40):
            err = abs(mpmath.mpf(fast) - as_mp(exact))
            worst_abs = max(worst_abs, float(err))
            if exact != 0:
                worst_rel = max(worst_rel, float(err / abs(as_mp(exact))))
    print(
        f"formula float path, {with_sums} formulas with sums, 2j <= 12: "
        f"worst absolute error {worst_abs:.2e}, worst relative {worst_rel:.2e}"
    )
    assert with_sums >= 10
    assert worst_abs <= 1e-13


# ---------------------------------------------------------------------------
# the search: tiny budget, many leaves
# ---------------------------------------------------------------------------


def _check_path(d: recouple.Derivation) -> None:
    """Every tree on the path is one Racah move (or an exchange) from the next."""
    assert d.path[0] == d.source
    assert d.path[-1] == d.target
    leaves = d.source.leaves()
    bit = {leaf: 1 << i for i, leaf in enumerate(leaves)}
    full = (1 << len(leaves)) - 1

    def clusters(tree: recouple.Coupling) -> frozenset[int]:
        masks = (sum(bit[x] for x in c) for c in tree.clusters())
        return frozenset(m for m in masks if m != full)

    racah = 0
    for before, after in zip(d.path, d.path[1:], strict=False):
        cb, ca = clusters(before), clusters(after)
        if cb != ca:
            assert is_move(cb, ca, len(leaves))
            racah += 1
    assert racah == d.steps >= d.lower_bound


def test_tiny_budget_gives_a_valid_path_marked_not_optimal() -> None:
    leaves = [f"j{i}" for i in range(1, 11)]
    found = None
    for seed in range(30):
        rng = random.Random(seed)
        a, b = random_tree(leaves, rng), random_tree(leaves, rng)
        d = recouple.derive(a, b, max_expansions=5)
        if not d.optimal:
            found = (a, b, d, rng)
            break
    assert found is not None, "every 10-leaf pair was solved within 5 expansions"
    a, b, d, rng = found
    assert d.search.method == "heuristic (exact search out of budget)"
    _check_path(d)
    assert d.steps >= d.lower_bound
    # the formula on this path is still right: compare with direct projection
    values = random_values(a, b, rng, leaf_doubled=(1,))
    assert values is not None
    reference = project(a, b, values, exact=False)
    assert abs(d.formula.evaluate_float(values) - reference) <= 1e-12
    # with the default budget the same pair is at least as short
    assert recouple.derive(a, b).steps <= d.steps


def test_heuristic_at_sixty_leaves() -> None:
    leaves = [f"j{i}" for i in range(1, 61)]
    rng = random.Random(60)
    a, b = random_tree(leaves, rng), random_tree(leaves, rng)
    start = time.perf_counter()
    d = recouple.derive(a, b)
    elapsed = time.perf_counter() - start
    print(f"60 leaves: {d.steps} moves (lower bound {d.lower_bound}), {elapsed:.2f} s")
    assert not d.optimal or d.steps == d.lower_bound
    _check_path(d)


# ---------------------------------------------------------------------------
# memory of the search (printed, not asserted): python3 tests/test_scale.py
# ---------------------------------------------------------------------------


def measure_search_memory(
    n: int, seeds: range, **budget: float | None
) -> list[tuple[int, int, bool, int, float]]:
    """(seed, expansions, optimal, tracemalloc peak in bytes, seconds) per random pair."""
    leaves = [f"j{i}" for i in range(1, n + 1)]
    out = []
    for seed in seeds:
        rng = random.Random(seed)
        a, b = random_tree(leaves, rng), random_tree(leaves, rng)
        tracemalloc.start()
        start = time.perf_counter()
        d = recouple.derive(a, b, **budget)  # type: ignore[arg-type]
        seconds = time.perf_counter() - start
        _, peak = tracemalloc.get_traced_memory()
        tracemalloc.stop()
        out.append((seed, d.search.expanded, d.optimal, peak, seconds))
    return out


if __name__ == "__main__":
    for n, seeds, budget in (
        (12, range(5), {}),
        (16, range(5), {}),
        (12, range(1), {"max_seconds": None, "max_expansions": 50}),
        (16, range(1), {"max_seconds": None, "max_expansions": 10}),
    ):
        for seed, expanded, optimal, peak, seconds in measure_search_memory(n, seeds, **budget):
            print(
                f"n={n} seed={seed} {budget or 'default budget'}: expanded {expanded}, "
                f"optimal {optimal}, peak {peak / 2**20:.1f} MiB, {seconds:.1f} s"
            )
