"""Fewest summations: the 9j move, the compact search, and formulas checked by projection."""

from __future__ import annotations

import io
import itertools
import random

import networkx as nx
import pytest
from scheme_factory import all_trees, random_tree, random_values

from recouple.recoupling.compact import compact_path
from recouple.recoupling.derive import derive
from recouple.recoupling.moves import ninej_at
from recouple.referee.projection import project
from recouple.schemes import parse

FIVE = all_trees([f"j{i}" for i in range(1, 6)])


def test_ninej_move_coefficient_against_projection() -> None:
    # The 9j move inside a larger tree: <(((a,b)e,(c,d)f)g,k)J | (((a,c)x,(b,d)y)g,k)J>
    # = sqrt((2e+1)(2f+1)(2x+1)(2y+1)) {a b e; c d f; x y g} (Edmonds 1957 §6.4, from memory).
    before = parse("(((a,b)e,(c,d)f)g,k)J")
    move = ninej_at(before, "g", new_labels=("x", "y"))
    assert str(move.after) == "(((a,c)x,(b,d)y)g,k)J"
    from recouple.recoupling.formula import Formula, simplify

    coefficient = move.coefficient()
    labels = list(before.labels()) + ["x", "y"]
    clusters = {**{leaf: frozenset((leaf,)) for leaf in before.leaves()}}
    for tree in (before, move.after):
        for cluster, label in tree.clusters().items():
            clusters[label] = cluster
    f = simplify(
        Formula(
            bra=before,
            ket=move.after,
            sums=(),
            phase=coefficient.phase,
            constant=0,
            hats=tuple((h, 1) for h in coefficient.hats),
            sixjs=(),
            ninejs=coefficient.ninejs,
            deltas=(),
            clusters=tuple(clusters.items()),
            order=tuple(labels),
        )
    )
    rng = random.Random(3)
    checked = 0
    for _ in range(40):
        values = random_values(before, move.after, rng, leaf_doubled=(1, 2, 3))
        if values is None:
            continue
        assert f.evaluate(values) == project(before, move.after, values, exact=True)
        checked += 1
    assert checked >= 30


def _triad_graph(a, b) -> nx.Graph:
    triads = list(a.triads()) + list(b.triads())
    g = nx.Graph()
    g.add_nodes_from(range(len(triads)))
    for i, j in itertools.combinations(range(len(triads)), 2):
        if set(triads[i]) & set(triads[j]):
            g.add_edge(i, j)
    return g


def test_twelve_j_of_the_first_kind_comes_out_with_one_sum() -> None:
    # Two five-leaf schemes with no common coupling whose eight triads form the
    # Moebius ladder (Wagner graph) are related by a 12j symbol of the first kind,
    # which has a single-sum form of four 6j (Yutsis, Levinson & Vanagas 1962;
    # Varshalovich et al. 1988 §10.12; both from memory; CONVENTIONS 3.4).
    wagner = nx.circulant_graph(8, [1, 4])
    rng = random.Random(12)
    seen = 0
    for a in FIVE[:4]:
        for b in FIVE:
            if set(a.clusters()) & set(b.clusters()) != {frozenset(a.leaves())}:
                continue
            if not nx.is_isomorphic(_triad_graph(a, b), wagner):
                continue
            d = derive(a, b)
            assert len(d.formula.sums) == 1, str(d.formula)
            values = random_values(a, b, rng, leaf_doubled=(1, 2, 3))
            assert values is not None
            assert d.formula.evaluate(values) == project(a, b, values, exact=True)
            seen += 1
    assert seen >= 16


# Pairs where the shortest Racah path leaves two sums but a path with a 9j move
# needs only one (found by a seeded random scan; the values are checked below).
SAVING = [
    ("((j1,j2)k12,((j3,j4)k34,(j6,j5)k56)k3456)J", "((j5,j2)k25,((j6,j4)k46,(j3,j1)k13)k1346)J"),
    ("((j5,j2)k25,(j6,(j4,(j3,j1)k13)k134)k1346)J", "((((j1,j6)k16,j5)k156,j3)k1356,(j2,j4)k24)J"),
    (
        "(((j4,(j5,j6)k56)k456,((j7,j2)k27,j1)k127)k124567,j3)J",
        "((((j4,j1)k14,j3)k134,(j2,(j7,j6)k67)k267)k123467,j5)J",
    ),
]


@pytest.mark.parametrize(("a", "b"), SAVING)
def test_compact_forms_save_a_sum_and_agree_with_projection(a: str, b: str) -> None:
    d = derive(a, b)
    assert d.sums_on_plain_path == 2
    assert len(d.formula.sums) == 1
    assert any(m.kind == "ninej" for m in d.moves)
    assert d.compact_status.startswith("fewer sums")
    rng = random.Random(len(a))
    checked = 0
    for _ in range(6):
        values = random_values(d.source, d.target, rng, leaf_doubled=(1, 2))
        if values is None:
            continue
        reference = float(project(d.source, d.target, values, exact=False))
        assert abs(d.formula.evaluate_float(values) - reference) < 1e-12, str(d.formula)
        checked += 1
    assert checked >= 3


def test_never_more_sums_than_the_plain_path() -> None:
    rng = random.Random(2026)
    for n in (5, 6, 7):
        leaves = [f"j{i}" for i in range(1, n + 1)]
        for _ in range(12):
            a, b = random_tree(leaves, rng), random_tree(leaves, rng)
            d = derive(a, b)
            assert len(d.formula.sums) <= d.sums_on_plain_path


def test_ls_jj_stays_one_nine_j_and_two_six_j_stay_a_product() -> None:
    d = derive("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J")
    assert d.formula.counts() == {"sums": 0, "6j": 0, "9j": 1}
    d = derive("(((a,b)e,c)f,d)J", "(a,(b,(c,d)h)g)J")
    assert d.formula.counts() == {"sums": 0, "6j": 2, "9j": 0}
    assert d.compact_status == "no sums on the plain path"


def test_compact_search_reports_proof_or_budget() -> None:
    paired = frozenset({0b0011, 0b1100})
    swapped = frozenset({0b0101, 0b1010})
    r = compact_path(paired, swapped, 4)
    assert r.found
    assert r.optimal
    assert r.kinds == ("ninej",)
    none_better = compact_path(paired, swapped, 4, below_sums=0)
    assert not none_better.found
    assert none_better.optimal
    starved = compact_path(
        frozenset({0b000011, 0b000111, 0b001111, 0b011111}),
        frozenset({0b110000, 0b111000, 0b111100, 0b111110}),
        6,
        max_expansions=1,
    )
    assert not starved.optimal


def _ref_parts(tree: frozenset[int], n: int) -> dict[int, tuple[int, int]]:
    """The two parts of every coupling (root included), found from the laminar
    family directly: the maximal clusters inside it, and the leaves left over."""
    root = (1 << n) - 1
    parts = {}
    for c in [*tree, root]:
        inner = [d for d in tree if d != c and d & c == d]
        top = [d for d in inner if not any(e != d and e & d == d for e in inner)]
        covered = 0
        for d in top:
            covered |= d
        kids = top + [1 << i for i in range(n) if c >> i & 1 and not covered >> i & 1]
        assert len(kids) == 2
        parts[c] = (kids[0], kids[1])
    return parts


def _fewest_sums_reference(source: frozenset[int], target: frozenset[int], n: int) -> int:
    """Fewest sums over paths of Racah and 9j moves, by Dijkstra over every tree; a sum
    is a removed coupling that the source does not have (CONVENTIONS 3.5)."""
    import heapq

    best = {source: 0}
    heap = [(0, sorted(source), source)]
    while heap:
        cost, _, tree = heapq.heappop(heap)
        if tree == target:
            return cost
        if cost > best[tree]:
            continue
        parts = _ref_parts(tree, n)
        steps = []
        for u, v in parts.values():
            for c, z in ((u, v), (v, u)):
                if c in tree:  # Racah move at c under its parent
                    x, y = parts[c]
                    steps += [((tree - {c}) | {x | z}, {c}), ((tree - {c}) | {y | z}, {c})]
            if u in tree and v in tree:  # 9j move of the four grandchildren
                (a, b), (c, d) = parts[u], parts[v]
                gone = {u, v}
                steps += [
                    ((tree - gone) | {a | c, b | d}, gone),
                    ((tree - gone) | {a | d, b | c}, gone),
                ]
        for new, removed in steps:
            new = frozenset(new)
            c2 = cost + sum(1 for r in removed if r not in source)
            if c2 < best.get(new, c2 + 1):
                best[new] = c2
                heapq.heappush(heap, (c2, sorted(new), new))
    raise AssertionError("target not reached")


@pytest.mark.parametrize("n", [5, 6])
def test_fewest_sums_and_its_bound_against_dijkstra(n: int) -> None:
    # The compact search's sums (A* with the bound of couplings still owed) equal an
    # independent Dijkstra over all trees, and a starved search's bound never exceeds it.
    rng = random.Random(500 + n)
    for _ in range(25):
        source, target = _random_masks(n, rng), _random_masks(n, rng)
        want = _fewest_sums_reference(source, target, n)
        full = compact_path(source, target, n, max_expansions=10**6)
        assert full.found
        assert full.optimal
        assert full.cost[0] == full.sums_bound == want
        for budget in (1, 5, 20):
            starved = compact_path(source, target, n, max_expansions=budget)
            assert starved.sums_bound <= want
            if starved.found:
                assert starved.cost[0] == want


def _random_masks(n: int, rng: random.Random) -> frozenset[int]:
    """A random tree of the test helpers, as its non-root cluster bitmasks."""
    leaves = [f"j{i}" for i in range(n)]
    tree = random_tree(leaves, rng)
    full = frozenset(leaves)
    return frozenset(
        sum(1 << int(leaf[1:]) for leaf in cluster)
        for cluster in tree.clusters()
        if cluster != full
    )


def test_compact_search_settles_eight_leaf_pairs() -> None:
    # Issue target: fewest sums proven over Racah and 9j moves at 8 leaves.
    rng = random.Random(88)
    leaves = [f"j{i}" for i in range(1, 9)]
    settled = 0
    while settled < 6:
        a, b = random_tree(leaves, rng), random_tree(leaves, rng)
        d = derive(a, b)
        if not d.sums_on_plain_path:
            continue
        assert d.compact_status in (
            "proven: no form with fewer sums",
            "fewer sums than the plain path (proven fewest)",
        ), d.compact_status
        assert d.sums_lower_bound == len(d.formula.sums)
        settled += 1


def test_beyond_the_full_budget_a_short_search_proves_a_bound_on_sums() -> None:
    # 14 leaves: the short compact search rarely settles, but its bound is proven
    # (every open path still owes that many sums) and is reported, also by the CLI.
    from recouple.cli import main

    rng = random.Random(1414)
    leaves = [f"j{i}" for i in range(1, 15)]
    a, b = random_tree(leaves, rng), random_tree(leaves, rng)
    # no exact path search (its states budget is 0), so the time budget is left to
    # the fewer-sums search, whose own budget of states then ends it
    d = derive(a, b, max_expansions=0)
    assert d.formula.sums
    assert 0 < d.sums_lower_bound < len(d.formula.sums)
    assert d.compact_status == "search out of budget"
    out = io.StringIO()
    assert main(["derive", str(a), str(b), "--max-expansions", "0"], out=out) == 0
    line = next(x for x in out.getvalue().splitlines() if "fewer sums not ruled out" in x)
    assert line.startswith("# fewer sums not ruled out: paths of Racah and 9j moves need at least")
    assert line.endswith("(search out of budget)")


@pytest.mark.parametrize("compact", [True, False])
def test_switching_the_compact_search_off(compact: bool) -> None:
    a = "(j1,(j2,(j3,(j4,j5)k45)k345)k2345)J"
    b = "((((j1,j5)k15,j2)k125,j4)k1245,j3)J"
    d = derive(a, b, compact=compact)
    assert len(d.formula.sums) == 1
    assert d.compact_status == ("proven: no form with fewer sums" if compact else "not searched")


# --- identities that fold sums: checked on formulas of deliberately long paths -----


def _formula_along(a_text: str, b_text: str, path_clusters: list[list[str]]):
    """The simplified formula of the path through the given trees (cluster lists)."""
    from recouple.recoupling.derive import _Walk

    a, b = parse(a_text), parse(b_text)
    bit = {leaf: 1 << i for i, leaf in enumerate(a.leaves())}
    full = (1 << len(bit)) - 1

    def mask(cluster: frozenset[str] | str) -> int:
        return sum(bit[leaf] for leaf in cluster)

    b_named = {mask(c): label for c, label in b.clusters().items()}
    path = tuple(frozenset(mask(c.split()) for c in tree) for tree in path_clusters)
    assert all(full not in t for t in path)
    walk = _Walk(a, b, bit, b_named, path)
    from recouple.recoupling.formula import simplify

    return a, b, walk.formula(), simplify(walk.formula())


def _check_against_projection(formula, a, b, *, seed: int) -> None:
    """The formula equals direct projection, exactly, at 30+ random consistent values."""
    rng = random.Random(seed)
    checked = 0
    for _ in range(40):
        values = random_values(a, b, rng, leaf_doubled=(1, 2, 3))
        if values is None:
            continue
        assert formula.evaluate(values) == project(a, b, values, exact=True)
        checked += 1
    assert checked >= 30


def test_racah_sum_rule_folds_a_two_move_detour() -> None:
    # ((a,b)e,c)J -> ((a,c)x,b)J -> (a,(b,c)f)J: two moves where one suffices; the
    # sum over x of two 6j collapses by the Racah sum rule (DLMF 34.5.15) to one 6j.
    a, b, raw, folded = _formula_along("((a,b)e,c)J", "(a,(b,c)f)J", [["a b"], ["a c"], ["b c"]])
    assert len(raw.sums) == 1
    assert len(raw.sixjs) == 2
    assert folded.counts() == {"sums": 0, "6j": 1, "9j": 0}
    _check_against_projection(folded, a, b, seed=34515)


def test_biedenharn_elliott_folds_the_long_way_round_the_pentagon() -> None:
    # (((a,b)e,c)f,d)J -> ((a,(b,c)x)f,d)J -> (a,((b,c)x,d)g)J -> (a,(b,(c,d)h)g)J:
    # three moves where two suffice; the sum over x of three 6j is the left side of
    # the Biedenharn-Elliott identity (DLMF 34.5.16) and folds to two 6j.
    a, b, raw, folded = _formula_along(
        "(((a,b)e,c)f,d)J",
        "(a,(b,(c,d)h)g)J",
        [["a b", "a b c"], ["b c", "a b c"], ["b c", "b c d"], ["c d", "b c d"]],
    )
    assert len(raw.sums) == 1
    assert len(raw.sixjs) == 3
    assert folded.counts() == {"sums": 0, "6j": 2, "9j": 0}
    _check_against_projection(folded, a, b, seed=34516)


def test_orthogonality_folds_a_detour_that_comes_back() -> None:
    # ((a,b)e,c)J -> ((a,(b,c)x)J -> ((a,b)e',c)J: out and back; the sum over x of
    # (2x+1) {..e..}{..e'..} is 6j orthogonality (DLMF 34.5.14): delta(e,e').
    a, b, raw, folded = _formula_along("((a,b)e,c)J", "((a,b)e',c)J", [["a b"], ["b c"], ["a b"]])
    assert len(raw.sums) == 1
    assert folded.counts() == {"sums": 0, "6j": 0, "9j": 0}
    assert folded.deltas == (("e", "e'"),)
    assert folded.hats == ()
    assert str(folded) == "<((a,b)e,c)J|((a,b)e',c)J> = delta(e,e')"
    _check_against_projection(folded, a, b, seed=34514)


def test_command_line_reports_the_saving() -> None:
    import io
    import json

    from recouple.cli import main

    a, b = SAVING[0]
    out, err = io.StringIO(), io.StringIO()
    assert main(["derive", a, b, "--json"], out=out, err=err) == 0
    data = json.loads(out.getvalue())
    assert data["sums_on_plain_path"] == 2
    assert len(data["sums"]) == 1
    assert data["fewer_sums_search"].startswith("fewer sums than the plain path")
    assert data["ninej_moves_used"] >= 1
    out = io.StringIO()
    assert main(["derive", a, b], out=out, err=err) == 0
    assert "a form with fewer sums than the shortest Racah path: 1 instead of 2" in out.getvalue()
