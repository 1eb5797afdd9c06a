"""The sympy export: structure, and values that agree with the exact evaluator.

Reference library for every value check: sympy.physics.quantum.cg (``Wigner6j`` /
``Wigner9j`` ``.doit()``, which call sympy.physics.wigner), against
:meth:`Formula.evaluate` (recouple's own exact 6j/9j).
"""

from __future__ import annotations

import random
from fractions import Fraction

import pytest
from scheme_factory import random_values

from recouple.errors import BadValue
from recouple.numbers.radicals import Radical
from recouple.outputs.sympy_export import formula_to_sympy, sympy_doit, sympy_value
from recouple.recoupling.derive import derive
from recouple.recoupling.formula import Formula, SixJEntries
from recouple.schemes.notation import parse

sympy = pytest.importorskip("sympy")
cg = pytest.importorskip("sympy.physics.quantum.cg")

SIXJ = ("((a,b)e,c)J", "(a,(b,c)f)J")
NINEJ = ("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J")
WITH_SUM = ("((((a,b)e,c)f,d)g,k)J", "(((a,d)p,(b,k)q)r,c)J")


def test_structure_of_a_sixj_formula() -> None:
    e = derive(*SIXJ).formula.to_sympy()
    a, b, c, e_, f, J = sympy.symbols("a b c e f J")
    expected = (
        (-1) ** (a + b + c + J)
        * sympy.sqrt(2 * e_ + 1)
        * sympy.sqrt(2 * f + 1)
        * cg.Wigner6j(a, b, e_, c, J, f)
    )
    assert e == expected


def test_structure_of_a_ninej_formula() -> None:
    e = formula_to_sympy(derive(*NINEJ).formula)
    assert e.atoms(cg.Wigner9j) == {cg.Wigner9j(*sympy.symbols("a b e c d f g h J"))}
    assert not e.atoms(cg.Wigner6j)


def test_sum_has_triangle_limits() -> None:
    f = derive(*WITH_SUM).formula
    e = formula_to_sympy(f)
    (total,) = e.atoms(sympy.Sum)
    ((x, lo, hi),) = total.limits
    assert x == sympy.Symbol("x1")
    b, c, d, e_, g, k, p, r = sympy.symbols("b c d e g k p r")
    assert lo == sympy.Max(*(sympy.Abs(u - v) for u, v in ((b, p), (d, e_), (r, k), (c, g))))
    assert hi == sympy.Min(b + p, d + e_, r + k, c + g)


def test_deltas_and_overall_sign() -> None:
    f = derive("((a,b)e,c)J'", "(c,(b,a)e')J'").formula
    e = formula_to_sympy(f)
    assert e.atoms(sympy.KroneckerDelta) == {
        sympy.KroneckerDelta(sympy.Symbol("e"), sympy.Symbol("e'"))
    }


def _agree(f: Formula, values: dict[str, Fraction]) -> Radical:
    exact = f.evaluate(values)
    got = sympy_value(f, values)
    # exact comparison: the sympy number read back into a Radical
    assert Radical.from_sympy(got) == exact, (values, got, exact)
    return exact


@pytest.mark.parametrize("pair", [SIXJ, NINEJ, WITH_SUM], ids=["6j", "9j", "sum"])
def test_values_agree_with_the_exact_evaluator(pair: tuple[str, str]) -> None:
    # reference: sympy.physics.quantum.cg Wigner6j/Wigner9j .doit()
    a, b = parse(pair[0]), parse(pair[1])
    f = derive(a, b).formula
    rng = random.Random(7)
    nonzero = 0
    for _ in range(6):
        values = random_values(a, b, rng, leaf_doubled=(1, 2))
        assert values is not None
        nonzero += bool(_agree(f, values))
    assert nonzero >= 2  # the check is not a comparison of zeros


def test_kronecker_delta_values() -> None:
    f = derive("((a,b)e,c)J'", "(c,(b,a)e')J'").formula
    same = {"a": Fraction(1, 2), "b": Fraction(1), "c": Fraction(1, 2)}
    same |= {"e": Fraction(3, 2), "e'": Fraction(3, 2), "J'": Fraction(1)}
    assert _agree(f, same) != 0
    assert _agree(f, same | {"e'": Fraction(1, 2)}) == 0


def test_empty_summation_range_gives_zero() -> None:
    # A sum whose triangle range is empty (x1 <= a+b = 1 but x1 >= |c-e| = 3) is
    # zero; sympy's reversed-limit convention sums x1 = 2, where the 6j vanishes.
    f = _hand_sum_formula(("a", "b", "x1", "c", "e", "f"))
    values = {"a": Fraction(1, 2), "b": Fraction(1, 2), "e": Fraction(0)}
    values |= {"c": Fraction(3), "J": Fraction(3), "f": Fraction(5, 2)}
    assert sympy_value(f, values) == 0


def _hand_sum_formula(sixj: SixJEntries) -> Formula:
    a, b = parse(SIXJ[0]), parse(SIXJ[1])
    clusters = {leaf: frozenset((leaf,)) for leaf in a.leaves()}
    for scheme in (a, b):
        for cluster, label in scheme.clusters().items():
            clusters[label] = cluster
    order = (*a.labels(), "f", "x1")
    return Formula(
        bra=a,
        ket=b,
        sums=("x1",),
        phase=(),
        constant=0,
        hats=(("x1", 2),),
        sixjs=(sixj,),
        ninejs=(),
        deltas=(),
        clusters=tuple(clusters.items()),
        order=order,
    )


def test_sympy_doit_needs_every_label() -> None:
    e = formula_to_sympy(derive(*WITH_SUM).formula)
    with pytest.raises(ValueError, match="give every free label a value"):
        sympy_doit(e)


def test_sympy_value_checks_values_like_evaluate() -> None:
    f = derive(*SIXJ).formula
    with pytest.raises(BadValue, match="no value given for 'J'"):
        sympy_value(f, {"a": 1, "b": 1, "c": 1, "e": 1, "f": 1})
