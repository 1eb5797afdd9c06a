"""The recoupling engine: paths, formulas and their values, checked against direct projection.

Direct Clebsch-Gordan projection (recouple.referee) shares no code with the 6j/9j
path, so agreement here is an independent check of every phase and factor.
"""

from __future__ import annotations

import itertools
import random
from fractions import Fraction

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from scheme_factory import all_trees, random_tree, random_values

from recouple import BadValue, SchemeMismatch
from recouple.recoupling.derive import derive
from recouple.recoupling.evaluate import check_values, evaluate, evaluate_float, why_zero
from recouple.referee.projection import project

HALVES = [Fraction(k, 2) for k in range(1, 4)]  # 1/2, 1, 3/2


def _states(scheme, leaf_values):
    """Every allowed value of the coupling labels of ``scheme`` for fixed leaves."""
    out = [dict(leaf_values)]
    for node in scheme.couplings():
        nxt = []
        for v in out:
            a, b = v[node.left.label], v[node.right.label]
            c = abs(a - b)
            while c <= a + b:
                w = dict(v)
                w[node.label] = c
                nxt.append(w)
                c += 1
        out = nxt
    return out


def _joint_values(a, b, leaf_values):
    """All consistent value sets for both schemes (shared labels agree)."""
    for va in _states(a, leaf_values):
        for vb in _states(b, leaf_values):
            if all(va[k] == vb[k] for k in va.keys() & vb.keys()):
                yield {**va, **vb}


# --- three leaves: every ordered pair is one 6j (or a phase) ------------------------


THREE = all_trees(["a", "b", "c"], ordered=True)


@pytest.mark.parametrize(("i", "j"), list(itertools.product(range(len(THREE)), repeat=2)))
def test_every_pair_of_three_leaf_schemes(i: int, j: int) -> None:
    # Reference: direct CG projection; the closed form is the Racah move
    # (Edmonds 1957 eq. 6.1.5, from memory; CONVENTIONS 3.1) plus exchange phases (3.2).
    a, b = THREE[i], THREE[j]
    d = derive(a, b)
    same = a.canonical().clusters() == b.canonical().clusters()
    assert d.steps == (0 if same else 1)
    assert d.optimal
    assert len(d.formula.sixjs) == (0 if same else 1)
    assert not d.formula.sums
    checked = 0
    for leaves in itertools.product(HALVES, repeat=3):
        for values in _joint_values(a, b, dict(zip(("a", "b", "c"), leaves, strict=True))):
            assert d.formula.evaluate(values) == project(a, b, values, exact=True), values
            checked += 1
    assert checked > 20


def test_six_j_closed_form_is_the_textbook_one() -> None:
    # Edmonds 1957 eq. 6.1.5 (from memory): <((a b)e, c)J|(a,(b c)f)J>.
    d = derive("((a,b)e,c)J", "(a,(b,c)f)J")
    assert str(d.formula) == (
        "<((a,b)e,c)J|(a,(b,c)f)J> = (-1)^(a+b+c+J) sqrt((2e+1)(2f+1)) {a b e; c J f}"
    )


# --- four leaves: every pair, no summation left, agrees with projection ------------


FOUR = all_trees(["a", "b", "c", "d"])


@pytest.mark.parametrize(("i", "j"), list(itertools.product(range(len(FOUR)), repeat=2)))
def test_every_pair_of_four_leaf_schemes(i: int, j: int) -> None:
    rng = random.Random(1000 * i + j)
    # Shuffle the part orders so that the exchange phases are exercised too.
    a = random_order(FOUR[i], rng)
    b = random_order(FOUR[j], rng)
    d = derive(a, b)
    f = d.formula
    assert not f.sums, f"a four-leaf change needs no summation: {f}"
    assert len(f.ninejs) <= 1
    for _ in range(3):
        values = random_values(a, b, rng, leaf_doubled=(1, 2, 3, 4))
        assert values is not None
        exact = f.evaluate(values)
        assert exact == project(a, b, values, exact=True), (str(f), values)
        assert abs(f.evaluate_float(values) - float(exact)) < 1e-12


def random_order(tree, rng):
    from recouple.schemes.tree import Coupling

    def walk(node):
        if not isinstance(node, Coupling):
            return node
        left, right = walk(node.left), walk(node.right)
        if rng.random() < 0.5:
            left, right = right, left
        return Coupling(left, right, node.label)

    return walk(tree)


def test_nine_j_change_of_four_is_one_nine_j() -> None:
    # Edmonds 1957 §6.4 (from memory); CONVENTIONS 3.3.
    d = derive("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J")
    assert d.steps == 3
    assert str(d.formula) == (
        "<((a,b)e,(c,d)f)J|((a,c)g,(b,d)h)J> = sqrt((2e+1)(2f+1)(2g+1)(2h+1)) {a b e; c d f; g h J}"
    )


def test_nine_j_recognised_through_exchanges() -> None:
    # The same change with parts written in other orders: still one 9j, no sum.
    d = derive("((b,a)e,(d,c)f)J", "((c,a)g,(d,b)h)J")
    assert d.formula.counts() == {"sums": 0, "6j": 0, "9j": 1}
    rng = random.Random(5)
    for _ in range(20):
        values = random_values(d.source, d.target, rng, leaf_doubled=(1, 2, 3))
        assert values is not None
        assert d.formula.evaluate(values) == project(d.source, d.target, values, exact=True)


def test_product_of_two_six_j() -> None:
    # Two Racah moves in a row (Edmonds 6.1.5 twice, from memory): no sum, two 6j.
    d = derive("(((a,b)e,c)f,d)J", "(a,(b,(c,d)h)g)J")
    assert d.steps == 2
    assert d.formula.counts() == {"sums": 0, "6j": 2, "9j": 0}
    rng = random.Random(7)
    for _ in range(30):
        values = random_values(d.source, d.target, rng, leaf_doubled=(1, 2, 3))
        assert values is not None
        assert d.formula.evaluate(values) == project(d.source, d.target, values, exact=True)


# --- five to seven leaves: random pairs against projection -----------------------


@settings(
    max_examples=40, deadline=None, derandomize=True, suppress_health_check=[HealthCheck.too_slow]
)
@given(n=st.integers(5, 7), seed=st.integers(0, 10**6))
def test_random_pairs_agree_with_projection(n: int, seed: int) -> None:
    rng = random.Random(seed)
    leaves = [f"j{i}" for i in range(1, n + 1)]
    a, b = random_tree(leaves, rng), random_tree(leaves, rng)
    d = derive(a, b)
    assert d.steps >= d.lower_bound
    values = random_values(a, b, rng, leaf_doubled=(1, 2, 3) if n < 7 else (1, 2))
    if values is None:
        return
    value = d.formula.evaluate_float(values)
    assert abs(value - float(project(a, b, values, exact=False))) < 1e-12, str(d.formula)


def test_exact_agreement_at_five_leaves() -> None:
    rng = random.Random(11)
    leaves = [f"j{i}" for i in range(1, 6)]
    for _ in range(15):
        a, b = random_tree(leaves, rng), random_tree(leaves, rng)
        d = derive(a, b)
        values = random_values(a, b, rng, leaf_doubled=(1, 2))
        assert values is not None
        assert d.formula.evaluate(values) == project(a, b, values, exact=True), str(d.formula)


# --- names, deltas, zeros ---------------------------------------------------------


def test_same_cluster_other_name_gives_a_delta() -> None:
    d = derive("((a,b)e,c)J", "((a,b)e',c)K")
    assert d.formula.deltas == (("e", "e'"), ("J", "K"))
    v = {"a": 1, "b": 1, "c": 1, "e": 1, "e'": 1, "J": 2, "K": 2}
    assert d.formula.evaluate(v) == 1
    v2 = dict(v, K=1)
    assert d.formula.evaluate(v2) == 0
    assert "same coupling" in str(why_zero(d.formula, check_values(d.formula, v2)))


def test_triangle_violation_is_exact_zero_with_a_reason() -> None:
    d = derive("((a,b)e,c)J", "(a,(b,c)f)J")
    v = {"a": "1/2", "b": "1/2", "c": "1/2", "e": 2, "f": 0, "J": "1/2"}
    assert d.formula.evaluate(v) == 0
    assert evaluate_float(d.formula, v) == 0.0
    reason = why_zero(d.formula, check_values(d.formula, v))
    assert reason == "triad (a, b, e) = (1/2, 1/2, 2) breaks the triangle condition"


def test_summation_names_never_collide() -> None:
    # The user already uses x1 and y1: the summation variable gets another stem.
    a = "((((j1,j2)x1,j3)y1,j4)k,j5)J"
    b = "(((j1,j4)p,(j2,j5)q)r,j3)J"
    d = derive(a, b)
    labels = set(d.source.labels()) | set(d.target.labels())
    assert d.formula.sums
    assert not labels & set(d.formula.sums)
    assert d.formula.sums == ("z1",)


# --- bad input ----------------------------------------------------------------------


def test_different_leaves() -> None:
    with pytest.raises(SchemeMismatch, match="only in the first: c; only in the second: d"):
        derive("((a,b)e,c)J", "((a,b)e,d)J")


def test_label_names_different_clusters() -> None:
    with pytest.raises(SchemeMismatch, match="label 'e' names \\(a,b\\) in the first"):
        derive("((a,b)e,c)J", "((b,c)e,a)J")


def test_missing_value() -> None:
    f = derive("((a,b)e,c)J", "(a,(b,c)f)J").formula
    with pytest.raises(BadValue, match="no value given for 'f'"):
        evaluate(f, {"a": 1, "b": 1, "c": 1, "e": 1, "J": 1})


def test_unknown_label() -> None:
    f = derive("((a,b)e,c)J", "(a,(b,c)f)J").formula
    with pytest.raises(BadValue, match="'z' is not a label"):
        evaluate(f, {"a": 1, "b": 1, "c": 1, "e": 1, "f": 1, "J": 1, "z": 1})


def test_value_not_a_half_integer() -> None:
    f = derive("((a,b)e,c)J", "(a,(b,c)f)J").formula
    with pytest.raises(BadValue, match="'a'"):
        evaluate(f, {"a": "1/3", "b": 1, "c": 1, "e": 1, "f": 1, "J": 1})


def test_budgets_pass_through_and_none_lifts_a_limit(monkeypatch: pytest.MonkeyPatch) -> None:
    # derive() hands its budgets to the search unchanged: omitted means the search's
    # defaults, None means no limit (docs/limits.md); a regression test for a
    # derive() that once turned None into the default.
    from recouple.recoupling import derive as derive_module
    from recouple.recoupling.search import DEFAULT

    seen: list[tuple[object, object]] = []
    real = derive_module.shortest_path

    def spy(*args: object, **kwargs: object) -> object:
        seen.append((kwargs["max_expansions"], kwargs["max_seconds"]))
        return real(*args, **kwargs)  # type: ignore[arg-type]

    monkeypatch.setattr(derive_module, "shortest_path", spy)
    three = ("((a,b)e,c)J", "(a,(b,c)f)J")
    derive_module.derive(*three)
    derive_module.derive(*three, max_expansions=None, max_seconds=None)
    derive_module.derive(*three, max_expansions=7, max_seconds=0.5)
    assert seen == [(DEFAULT, DEFAULT), (None, None), (7, 0.5)]


def test_the_time_budget_covers_the_search_for_fewer_sums(monkeypatch: pytest.MonkeyPatch) -> None:
    # max_seconds bounds the whole derivation (docs/limits.md): the fewer-sums search
    # gets what the path search left, never more than its own safety net; None lifts it.
    import math

    from recouple.recoupling import derive as derive_module
    from recouple.recoupling.compact import COMPACT_MAX_SECONDS

    seen: list[float] = []
    real = derive_module.compact_path

    def spy(*args: object, **kwargs: object) -> object:
        seen.append(kwargs["max_seconds"])  # type: ignore[arg-type]
        return real(*args, **kwargs)  # type: ignore[arg-type]

    monkeypatch.setattr(derive_module, "compact_path", spy)
    # a 5-leaf pair whose shortest path leaves a sum, so the fewer-sums search runs
    pair = ("(((a,b)e,c)f,(d,g)h)J", "((a,(c,g)p)q,(b,d)r)J")
    derive_module.derive(*pair, max_seconds=0.75)
    derive_module.derive(*pair)
    derive_module.derive(*pair, max_seconds=None)
    derive_module.derive(*pair, max_seconds=0)
    assert len(seen) == 4, "the pair must leave a sum on the plain path"
    assert 0 < seen[0] <= 0.75
    assert 0 < seen[1] <= COMPACT_MAX_SECONDS
    assert seen[2] == math.inf
    assert seen[3] == 0.0
