"""The LaTeX writer: golden strings, one Bmatrix per symbol, and real pdflatex runs."""

from __future__ import annotations

import random
import re
import shutil
import subprocess
from pathlib import Path

import pytest
from scheme_factory import random_tree

from recouple.errors import BadValue
from recouple.outputs.latex import formula_latex, label_latex, latex_document, scheme_latex
from recouple.recoupling.derive import derive
from recouple.recoupling.formula import Formula, NineJEntries, SixJEntries
from recouple.schemes.notation import parse

SIXJ = ("((a,b)e,c)J", "(a,(b,c)f)J")
NINEJ = ("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J")
WITH_SUM = ("((((a,b)e,c)f,d)g,k)J", "(((a,d)p,(b,k)q)r,c)J")
SEVEN = ("((((((j1,j2)a,j3)b,j4)c,j5)d,j6)e,j7)J", "((((((j7,j6)p,j5)q,j4)r,j3)s,j2)t,j1)J")


def make_formula(
    bra: str,
    ket: str,
    *,
    sums: tuple[str, ...] = (),
    phase: tuple[tuple[str, int], ...] = (),
    constant: int = 0,
    hats: tuple[tuple[str, int], ...] = (),
    sixjs: tuple[SixJEntries, ...] = (),
    ninejs: tuple[NineJEntries, ...] = (),
    deltas: tuple[tuple[str, str], ...] = (),
) -> Formula:
    """A formula with exactly the given parts (no simplification): the writer alone is tested."""
    a, b = parse(bra), parse(ket)
    clusters = {leaf: frozenset((leaf,)) for leaf in a.leaves()}
    for scheme in (a, b):
        for cluster, label in scheme.clusters().items():
            clusters[label] = cluster
    order = list(a.labels())
    order += [label for label in b.labels() if label not in order]
    return Formula(
        bra=a,
        ket=b,
        sums=sums,
        phase=phase,
        constant=constant,
        hats=hats,
        sixjs=sixjs,
        ninejs=ninejs,
        deltas=deltas,
        clusters=tuple(clusters.items()),
        order=(*order, *sums),
    )


# -- labels and schemes ---------------------------------------------------------


@pytest.mark.parametrize(
    ("name", "tex"),
    [
        ("j12", "j_{12}"),
        ("l1", "l_{1}"),
        ("J", "J"),
        ("J_a", "J_{a}"),
        ("j'", "j'"),
        ("j''", "j''"),
        ("j2'", "j'_{2}"),
        ("x1", "x_{1}"),
        ("Jtot", r"\mathit{Jtot}"),
        ("J_tot", "J_{tot}"),
        ("J_a_b", r"J_{a\_b}"),
        ("_x", r"\mathit{\_x}"),
        ("lambda1", r"\mathit{lambda}_{1}"),  # no Greek letters are made (by design)
    ],
)
def test_label_latex(name: str, tex: str) -> None:
    assert label_latex(name) == tex


@pytest.mark.parametrize("bad", ["", "1j", "a-b", "j 1"])
def test_label_latex_refuses_non_names(bad: str) -> None:
    with pytest.raises(BadValue, match="is not a leaf or label name"):
        label_latex(bad)


def test_scheme_latex() -> None:
    assert scheme_latex(parse("((j1,j2)j12,(j3,j4)j34)J")) == (
        "((j_{1},j_{2})j_{12},(j_{3},j_{4})j_{34})J"
    )


# -- golden strings (hand-built formulas: the writer alone is under test) --------


def test_golden_sixj() -> None:
    f = make_formula(
        *SIXJ,
        phase=(("a", 1), ("b", 1), ("c", 1), ("J", 1)),
        hats=(("e", 1), ("f", 1)),
        sixjs=(("a", "b", "e", "c", "J", "f"),),
    )
    assert formula_latex(f) == (
        r"\langle ((a,b)e,c)J \,|\, (a,(b,c)f)J \rangle = (-1)^{a+b+c+J} "
        r"\sqrt{(2e+1)(2f+1)} \begin{Bmatrix} a & b & e \\ c & J & f \end{Bmatrix}"
    )


def test_golden_ninej_with_subscripts() -> None:
    f = make_formula(
        "((j1,j2)j12,(j3,j4)j34)J",
        "((j1,j3)j13,(j2,j4)j24)J",
        hats=(("j12", 1), ("j34", 1), ("j13", 1), ("j24", 1)),
        ninejs=(("j1", "j2", "j12", "j3", "j4", "j34", "j13", "j24", "J"),),
    )
    assert formula_latex(f, overlap=False) == (
        r"\sqrt{(2j_{12}+1)(2j_{34}+1)(2j_{13}+1)(2j_{24}+1)} "
        r"\begin{Bmatrix} j_{1} & j_{2} & j_{12} \\ j_{3} & j_{4} & j_{34} \\ "
        r"j_{13} & j_{24} & J \end{Bmatrix}"
    )


def test_golden_sum_with_phase_coefficients_and_sign() -> None:
    # coefficient 3 is printed as -1 ((-1)^(4j) = 1, formula.py); 2 stays 2
    f = make_formula(
        *WITH_SUM,
        sums=("x1",),
        phase=(("c", 2), ("d", 3), ("x1", 1)),
        constant=1,
        hats=(("e", 1), ("x1", 2), ("k", 4)),
        sixjs=(("a", "b", "e", "x1", "d", "p"), ("c", "g", "x1", "k", "r", "J")),
    )
    assert formula_latex(f, overlap=False) == (
        r"-\sum_{x_{1}} (-1)^{2c-d+x_{1}} (2x_{1}+1) (2k+1)^{2} \sqrt{(2e+1)} "
        r"\begin{Bmatrix} a & b & e \\ x_{1} & d & p \end{Bmatrix} "
        r"\begin{Bmatrix} c & g & x_{1} \\ k & r & J \end{Bmatrix}"
    )


def test_golden_deltas_and_primes() -> None:
    f = make_formula(
        "((a,b)e,c)J'",
        "(c,(b,a)e')J'",
        deltas=(("e", "e'"),),
        phase=(("a", 1), ("b", 1), ("c", 1), ("J'", 3), ("e", 1)),
    )
    assert formula_latex(f) == (
        r"\langle ((a,b)e,c)J' \,|\, (c,(b,a)e')J' \rangle = "
        r"\delta_{e,e'} (-1)^{a+b+c-J'+e}"
    )


def test_golden_negative_hat_power_goes_to_a_denominator() -> None:
    f = make_formula(*SIXJ, hats=(("e", -1), ("f", 2)))
    assert formula_latex(f, overlap=False) == r"\frac{(2f+1)}{\sqrt{(2e+1)}}"


def test_empty_product_is_one() -> None:
    f = make_formula(*SIXJ)
    assert formula_latex(f, overlap=False) == "1"
    assert formula_latex(make_formula(*SIXJ, constant=1), overlap=False) == "-1"


def test_derived_sixj_matches_the_hook_and_is_stable() -> None:
    f = derive(*SIXJ).formula
    assert f.latex() == formula_latex(f) == formula_latex(derive(*SIXJ).formula)
    assert f._repr_latex_() == "$\\displaystyle " + formula_latex(f) + "$"


def test_unknown_setting_is_a_type_error() -> None:
    with pytest.raises(TypeError, match="unexpected keyword argument 'breqn'"):
        derive(*SIXJ).formula.latex(breqn=True)


# -- one Bmatrix per symbol, on random derived formulas ---------------------------


def _random_formulas(count: int, seed: int) -> list[Formula]:
    rng = random.Random(seed)
    out = []
    for _ in range(count):
        n = rng.randint(3, 6)
        leaves = [f"j{i}" for i in range(1, n + 1)]
        out.append(derive(random_tree(leaves, rng), random_tree(leaves, rng)).formula)
    return out


@pytest.mark.parametrize("f", _random_formulas(25, seed=2024))
def test_one_bmatrix_per_symbol(f: Formula) -> None:
    tex = formula_latex(f)
    symbols = len(f.sixjs) + len(f.ninejs)
    assert tex.count(r"\begin{Bmatrix}") == symbols
    assert tex.count(r"\end{Bmatrix}") == symbols
    # a 6j has one row break, a 9j two
    bodies = re.findall(r"\\begin\{Bmatrix\}(.*?)\\end\{Bmatrix\}", tex)
    assert sorted(b.count(r"\\") for b in bodies) == sorted(
        [1] * len(f.sixjs) + [2] * len(f.ninejs)
    )
    assert tex.count("{") == tex.count("}")
    doc = latex_document(f)
    assert doc.count(r"\begin{Bmatrix}") == symbols + 1  # + the one in the conventions note


# -- the standalone document --------------------------------------------------------


def test_document_title_is_escaped_and_must_be_one_line() -> None:
    doc = latex_document(derive(*SIXJ).formula, title="50% of a_b & {c}")
    assert r"\section*{50\% of a\_b \& \{c\}}" in doc
    with pytest.raises(BadValue, match="one line"):
        latex_document(derive(*SIXJ).formula, title="two\nlines")


def test_document_states_the_conventions() -> None:
    doc = latex_document(derive(*SIXJ).formula)
    assert "Condon--Shortley" in doc
    assert "coupled first" in doc


def test_long_formula_is_broken_into_lines() -> None:
    f = derive(*SEVEN).formula
    assert len(f.sixjs) >= 5
    doc = latex_document(f)
    assert r"\begin{align*}" in doc
    body = doc[doc.index(r"\begin{align*}") : doc.index(r"\end{align*}")]
    assert body.count(r"\\ &") >= 3
    # every factor of the one-line form appears, in the same order
    flat = " ".join(body.replace(r"\\ &\quad \times", " ").split())
    for symbol in re.findall(r"\\begin\{Bmatrix\}.*?\\end\{Bmatrix\}", formula_latex(f)):
        assert symbol in flat


def _pdflatex() -> str:
    exe = shutil.which("pdflatex")
    if exe is None:
        pytest.skip("pdflatex not installed: the standalone document cannot be compiled here")
    return exe


def _compile(tmp_path: Path, source: str) -> str:
    exe = _pdflatex()
    (tmp_path / "formula.tex").write_text(source, encoding="utf-8")
    run = subprocess.run(
        [exe, "-interaction=nonstopmode", "-halt-on-error", "-no-shell-escape", "formula.tex"],
        cwd=tmp_path,
        capture_output=True,
        text=True,
        timeout=120,
        check=False,
    )
    log = (tmp_path / "formula.log").read_text(encoding="latin-1")
    assert run.returncode == 0, log[-3000:]
    assert (tmp_path / "formula.pdf").stat().st_size > 0
    return log


@pytest.mark.parametrize(
    ("pair", "title"),
    [(SIXJ, "One 6j"), (NINEJ, "One 9j"), (WITH_SUM, "A sum"), (SEVEN, "Seven, reversed")],
    ids=["6j", "9j", "sum", "seven-leaf-reversal"],
)
def test_document_compiles_without_overfull_lines(
    tmp_path: Path, pair: tuple[str, str], title: str
) -> None:
    log = _compile(tmp_path, latex_document(derive(*pair).formula, title=title))
    assert "Overfull \\hbox" not in log, log[-3000:]


def test_document_with_deltas_primes_and_underscores_compiles(tmp_path: Path) -> None:
    f = derive("((j_a,j_b)e,c')J", "(c',(j_b,j_a)e')J").formula
    assert f.deltas
    log = _compile(tmp_path, latex_document(f, title="Primes & deltas"))
    assert "Overfull \\hbox" not in log


def test_short_bra_ket_long_product_compiles(tmp_path: Path) -> None:
    # a short left-hand side keeps its place: lhs &= ... \\ &\quad \times ...
    six = ("a", "b", "e", "c", "J", "f")
    f = make_formula(*SIXJ, hats=(("e", 1), ("f", 1)), sixjs=(six,) * 9)
    doc = latex_document(f)
    assert r"\rangle &= " in doc
    assert doc.count(r"\\ &\quad \times") >= 2
    log = _compile(tmp_path, doc)
    assert "Overfull \\hbox" not in log
