"""Transformation matrices and their writers: LS-jj against sympy's 9j, orthogonality of
random schemes, entries against direct projection, and the text/CSV/JSON forms."""

from __future__ import annotations

import csv
import io
import math
import random
from fractions import Fraction

import pytest
from scheme_factory import random_tree

from recouple import transformation_matrix
from recouple.numbers.spins import spin_text
from recouple.outputs.table import (
    matrix_blocks,
    matrix_csv,
    matrix_json,
    matrix_text,
    state_text,
)
from recouple.referee.projection import project

sympy = pytest.importorskip("sympy")
wigner = pytest.importorskip("sympy.physics.wigner")

JJ = "((l1,s1)j1,(l2,s2)j2)J"
LS = "((l1,l2)L,(s1,s2)S)J"
P_AND_D = {"l1": 1, "l2": 2, "s1": "1/2", "s2": "1/2"}  # a p and a d orbit, spins 1/2


def _ls_jj_reference(row: dict[str, int], col: dict[str, int]) -> object:
    """<(l1 s1)j1,(l2 s2)j2; J|(l1 l2)L,(s1 s2)S; J> from the 9j.

    Edmonds 1957 eq. 6.4.2 (from memory): the overlap is
    sqrt((2j1+1)(2j2+1)(2L+1)(2S+1)) {l1 s1 j1; l2 s2 j2; L S J}; the 9j from the
    reference library sympy.physics.wigner.wigner_9j (rows in order).
    """
    if row["J"] != col["J"]:
        return sympy.Integer(0)
    h = sympy.Rational
    j1, j2, L, S, J = (h(x, 2) for x in (row["j1"], row["j2"], col["L"], col["S"], row["J"]))
    l1, l2, s = h(1), h(2), h(1, 2)
    dims = (2 * j1 + 1) * (2 * j2 + 1) * (2 * L + 1) * (2 * S + 1)
    return sympy.sqrt(dims) * wigner.wigner_9j(l1, s, j1, l2, s, j2, L, S, J)


@pytest.mark.parametrize("total", [None, "1/2", "3/2", "5/2", "7/2", "9/2", "2", "1", "0"])
def test_ls_jj_matrix_matches_sympy_ninej(total: str | None) -> None:
    values: dict[str, object] = dict(P_AND_D)
    if total is not None:
        values["J"] = total
    m = transformation_matrix(JJ, LS, values)
    if total is not None and Fraction(total).denominator == 2:
        # two spins 1/2 and integer l's give integer J only (common practice)
        assert m.rows == ()
        return
    assert m.rows, "the basis should not be empty"
    assert len(m.rows) == len(m.columns)
    checked = 0
    for r, line in zip(m.rows, m.exact, strict=True):
        for c, entry in zip(m.columns, line, strict=True):
            expected = _ls_jj_reference(dict(r), dict(c))
            # exact: the difference simplifies to zero; floats: agree to 1e-14
            assert sympy.simplify(entry.to_sympy() - expected) == 0, (r, c, entry, expected)
            assert float(entry) == pytest.approx(float(expected), abs=1e-14)
            checked += 1
    assert checked == len(m.rows) ** 2
    assert m.orthogonal
    assert m.orthogonality_error <= 1e-12
    if total is None:
        # j1 in {1/2, 3/2}, j2 in {3/2, 5/2}; each pair allows 2 min(j1, j2) + 1 totals:
        # 2 + 2 + 4 + 4 = 12 states (common practice: counting triangle-allowed J).
        assert len(m.rows) == 12


def test_fixed_total_is_the_block_of_the_full_matrix() -> None:
    full = transformation_matrix(JJ, LS, P_AND_D)
    for t, rows, cols in matrix_blocks(full):
        block = transformation_matrix(JJ, LS, {**P_AND_D, "J": spin_text(t)})
        assert [full.rows[i] for i in rows] == list(block.rows)
        assert [full.columns[j] for j in cols] == list(block.columns)
        for k, i in enumerate(rows):
            assert [full.exact[i][j] for j in cols] == list(block.exact[k])
        # off-block entries are exact zeros
        for i in rows:
            others = [j for j in range(len(full.columns)) if j not in cols]
            assert all(full.exact[i][j] == 0 for j in others)


def _random_case(seed: int) -> tuple[object, object, dict[str, str]]:
    rng = random.Random(seed)
    n = 3 + seed % 3
    leaves = [f"j{i}" for i in range(1, n + 1)]
    a, b = random_tree(leaves, rng), random_tree(leaves, rng)
    choices = ("1/2", "1", "3/2") if n < 5 else ("1/2", "1")
    return a, b, {leaf: rng.choice(choices) for leaf in leaves}


@pytest.mark.parametrize("seed", range(30))
def test_random_matrices_are_orthogonal(seed: int) -> None:
    # Both bases are orthonormal bases of the same space, so M is real orthogonal
    # (common practice); measured in floats as max |M M^T - 1|.
    a, b, values = _random_case(seed)
    m = transformation_matrix(a, b, values)  # type: ignore[arg-type]
    assert len(m.rows) == len(m.columns) > 0
    assert m.orthogonality_error <= 1e-12
    # and independently with M^T M, column by column
    f = m.floats()
    n = len(f)
    for i in range(n):
        for j in range(i, n):
            dot = math.fsum(f[k][i] * f[k][j] for k in range(n))
            assert abs(dot - (i == j)) <= 1e-12


@pytest.mark.parametrize("seed", range(0, 30, 3))
def test_random_entries_match_direct_projection(seed: int) -> None:
    # The referee builds both states from Clebsch-Gordan coefficients alone
    # (recouple.referee.projection), sharing no code with the 6j/9j formula.
    a, b, values = _random_case(seed)
    m = transformation_matrix(a, b, values)  # type: ignore[arg-type]
    rng = random.Random(1000 + seed)
    consistent: list[tuple[int, int]] = []
    for i, r in enumerate(m.rows):
        for j, c in enumerate(m.columns):
            row, col = dict(r), dict(c)
            if all(row[k] == col[k] for k in row if k in col):
                consistent.append((i, j))
            else:
                # A label shared by both schemes names the same cluster; two values
                # of it are orthogonal states (common practice): an exact zero.
                assert m.exact[i][j] == 0
    nonzero = [(i, j) for i, j in consistent if m.exact[i][j] != 0]
    zero = [(i, j) for i, j in consistent if m.exact[i][j] == 0]
    picks = rng.sample(nonzero, min(3, len(nonzero))) + rng.sample(zero, min(1, len(zero)))
    for i, j in picks:
        labels: dict[str, object] = {k: Fraction(v, 2) for k, v in m.leaves}
        labels.update({k: Fraction(v, 2) for k, v in m.rows[i]})
        labels.update({k: Fraction(v, 2) for k, v in m.columns[j]})
        reference = project(m.source, m.target, labels)
        assert float(m.exact[i][j]) == pytest.approx(float(reference), abs=1e-12)


# ---------------------------------------------------------------------------
# Writers
# ---------------------------------------------------------------------------


def test_csv_round_trip() -> None:
    m = transformation_matrix(JJ, LS, P_AND_D)
    for exact in (True, False):
        table = list(csv.reader(io.StringIO(matrix_csv(m, exact=exact))))
        assert table[0][0] == "FROM \\ TO"
        assert table[0][1:] == [state_text(c) for c in m.columns]
        assert [line[0] for line in table[1:]] == [state_text(r) for r in m.rows]
        for line, row in zip(table[1:], m.floats(), strict=True):
            if exact:
                got = [float(sympy.sympify(cell)) for cell in line[1:]]
            else:
                got = [float(cell) for cell in line[1:]]
            assert got == pytest.approx(row, abs=1e-15)


def test_json_form() -> None:
    m = transformation_matrix(JJ, LS, {**P_AND_D, "J": 2})
    d = matrix_json(m)
    assert d["from"] == JJ
    assert d["to"] == LS
    assert d["leaves"] == {"l1": "1", "s1": "1/2", "l2": "2", "s2": "1/2"}
    assert d["total"] == "2"
    assert d["rows"][0] == {"j1": "1/2", "j2": "3/2", "J": "2"}
    assert all(set(c) == {"L", "S", "J"} for c in d["columns"])
    assert d["matrix"] == m.floats()
    assert d["exact"] == [[str(x) for x in line] for line in m.exact]
    assert d["orthogonal"] is True
    assert "exact" not in matrix_json(m, exact=False)


def test_text_table_shows_every_state_and_entry() -> None:
    m = transformation_matrix(JJ, LS, P_AND_D)
    text = matrix_text(m)
    for t, rows, cols in matrix_blocks(m):
        assert f"J={spin_text(t)}: {len(rows)} x {len(cols)}" in text
    for r in m.rows:
        assert state_text(r, skip="J") in text
    for line in m.exact:
        for x in line:
            assert str(x) in text
            if x != 0:
                assert f"{float(x):.12f}" in text
    assert "exact" not in matrix_text(m, exact=False)


def test_wide_blocks_are_cut_into_panels() -> None:
    m = transformation_matrix(JJ, LS, {**P_AND_D, "J": 2})
    narrow = matrix_text(m, width=50)
    assert max(len(line) for line in narrow.splitlines()) <= 50
    wide = matrix_text(m, width=200)
    assert narrow.count("exact") > wide.count("exact") == 1
