"""Generated Python functions: exec them and compare with the exact evaluator.

The comparison is exact (``Radical`` equality) against :meth:`Formula.evaluate`;
the generated code shares no loop or phase code with it (it re-derives the
ranges and signs from the formula's data) and calls the public ``sixj``/``ninej``.
"""

from __future__ import annotations

import ast
import random
from collections.abc import Callable
from fractions import Fraction
from typing import Any

import pytest
from scheme_factory import random_tree

import recouple
from recouple.errors import BadValue
from recouple.numbers.radicals import Radical
from recouple.outputs.pycode import formula_python, python_names
from recouple.recoupling.derive import derive
from recouple.recoupling.formula import Formula


@pytest.fixture(autouse=True)
def public_symbols(monkeypatch: pytest.MonkeyPatch) -> None:
    """The generated code does ``from recouple import sixj, ninej``.

    Until the package re-exports them, take them from recouple.symbols.values
    (the generated source itself is not changed).
    """
    from recouple.symbols import values

    for name in ("sixj", "ninej"):
        if not hasattr(recouple, name):
            monkeypatch.setattr(recouple, name, getattr(values, name), raising=False)


def compile_function(f: Formula, name: str = "overlap") -> Callable[..., Any]:
    namespace: dict[str, Any] = {}
    exec(compile(formula_python(f, name=name), f"<{name}>", "exec"), namespace)
    fn = namespace[name]
    assert callable(fn)
    return fn


def _consistent_values(
    f: Formula, rng: random.Random, leaf_doubled: tuple[int, ...] = (1, 2, 3)
) -> dict[str, Fraction]:
    """Random values: leaves first, then every coupling of each scheme.

    A label naming a cluster the other scheme names differently (a delta) gets
    the same value most of the time, a different allowed one otherwise.
    """
    d: dict[str, int] = {leaf: rng.choice(leaf_doubled) for leaf in f.bra.leaves()}
    by_cluster: dict[frozenset[str], int] = {}
    for scheme in (f.bra, f.ket):
        for node in scheme.couplings():
            cluster = frozenset(node.leaves())
            lo = abs(d[node.left.label] - d[node.right.label])
            options = list(range(lo, d[node.left.label] + d[node.right.label] + 1, 2))
            if node.label in d:
                continue
            if cluster in by_cluster and rng.random() < 0.8:
                d[node.label] = by_cluster[cluster]
            else:
                d[node.label] = rng.choice(options)
            by_cluster.setdefault(cluster, d[node.label])
    return {label: Fraction(v, 2) for label, v in d.items()}


def _check(f: Formula, trials: int, seed: int) -> int:
    fn = compile_function(f)
    names = python_names(f)
    rng = random.Random(seed)
    nonzero = 0
    for _ in range(trials):
        values = _consistent_values(f, rng)
        exact = f.evaluate(values)
        got = fn(**{names[label]: v for label, v in values.items()})
        assert type(got) is Radical
        assert got == exact, (values, got, exact)
        nonzero += bool(exact)
    return nonzero


CASES = {
    "6j": ("((a,b)e,c)J", "(a,(b,c)f)J"),
    "9j": ("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J"),
    "two-6j": ("(((a,b)e,c)f,d)J", "((a,d)g,(b,c)h)J"),
    "sum": ("((((a,b)e,c)f,d)g,k)J", "(((a,d)p,(b,k)q)r,c)J"),
    "deltas": ("((a,b)e,c)J'", "(c,(b,a)e')J'"),
    "primes-and-keywords": ("((j1',lambda)in,j2')J", "(j1',(lambda,j2')x1)J"),
    "mirror-chain": ("(((a,b)e,c)f,d)J", "(d,(c,(b,a)p)q)J"),
}


@pytest.mark.parametrize("pair", CASES.values(), ids=CASES.keys())
def test_generated_function_equals_evaluate(pair: tuple[str, str]) -> None:
    f = derive(*pair).formula
    assert _check(f, trials=12, seed=11) >= 3  # not a comparison of zeros


def test_some_cases_really_have_sums_deltas_and_ninejs() -> None:
    formulas = {k: derive(*v).formula for k, v in CASES.items()}
    assert formulas["sum"].sums
    assert formulas["deltas"].deltas
    assert formulas["9j"].ninejs
    assert formulas["mirror-chain"].deltas


def test_random_derived_formulas() -> None:
    rng = random.Random(5)
    for _ in range(8):
        n = rng.randint(3, 5)
        leaves = [f"j{i}" for i in range(1, n + 1)]
        a, b = random_tree(leaves, rng), random_tree(leaves, rng)
        _check(derive(a, b).formula, trials=4, seed=rng.randint(0, 10**6))


def test_broken_triangle_gives_exact_zero() -> None:
    fn = compile_function(derive(*CASES["6j"]).formula)
    zero = fn(a="1/2", b="1/2", c="1/2", e=2, f=0, J="1/2")  # (a, b, e) fails
    assert type(zero) is Radical
    assert zero == 0
    parity = fn(a="1/2", b="1/2", c="1/2", e="1/2", f=0, J="1/2")  # a+b+e not an integer
    assert parity == 0


def test_different_names_of_one_coupling_give_zero() -> None:
    fn = compile_function(derive(*CASES["deltas"]).formula)
    values = {"a": "1/2", "b": 1, "c": "1/2", "e": "3/2", "J_p": 1}
    assert fn(**values, e_p="3/2") != 0
    assert fn(**values, e_p="1/2") == 0


@pytest.mark.parametrize(
    ("value", "message"),
    [
        ("-1", "is not a non-negative integer or half-integer"),
        ("1/3", "is not a non-negative integer or half-integer"),
        ("one", "is not a number"),
        (True, "is not an angular momentum"),
    ],
)
def test_bad_values_raise(value: object, message: str) -> None:
    fn = compile_function(derive(*CASES["6j"]).formula)
    with pytest.raises(ValueError, match=message):
        fn(a=value, b="1/2", c="1/2", e=1, f=0, J="1/2")


def test_primes_and_keywords_are_renamed_and_documented() -> None:
    f = derive(*CASES["primes-and-keywords"]).formula
    names = python_names(f)
    assert names["j1'"] == "j1_p"
    assert names["lambda"] == "lambda_"
    assert names["in"] == "in_"
    source = formula_python(f)
    assert "j1' is passed as j1_p" in source
    assert "lambda is passed as lambda_" in source


def test_summation_name_clash_with_argument_names() -> None:
    # a label d_x1 must not collide with the doubled name of the summation variable
    pair = ("((((a,b)e,c)f,d_x1)g,k)J", "(((a,d_x1)p,(b,k)q)r,c)J")
    f = derive(*pair).formula
    assert f.sums
    _check(f, trials=6, seed=3)


def test_generated_code_imports_only_fractions_and_recouple() -> None:
    for pair in CASES.values():
        tree = ast.parse(formula_python(derive(*pair).formula))
        modules = set()
        for node in ast.walk(tree):
            if isinstance(node, ast.ImportFrom):
                modules.add(node.module)
            elif isinstance(node, ast.Import):
                modules.update(alias.name for alias in node.names)
        assert modules <= {"fractions", "recouple", "recouple.numbers"}
        symbols = {
            alias.name
            for node in ast.walk(tree)
            if isinstance(node, ast.ImportFrom) and node.module == "recouple"
            for alias in node.names
        }
        assert symbols <= {"sixj", "ninej"}


def test_same_formula_same_source() -> None:
    a = formula_python(derive(*CASES["sum"]).formula)
    assert a == formula_python(derive(*CASES["sum"]).formula)


@pytest.mark.parametrize(
    ("name", "message"),
    [
        ("two words", "is not a Python identifier"),
        ("class", "is not a Python identifier"),
        ("sixj", "is used inside the generated code"),
        ("a", "is also a label's argument name"),
    ],
)
def test_bad_function_names(name: str, message: str) -> None:
    with pytest.raises(BadValue, match=message):
        formula_python(derive(*CASES["6j"]).formula, name=name)


def test_custom_function_name() -> None:
    fn = compile_function(derive(*CASES["6j"]).formula, name="racah_w_demo")
    assert fn.__name__ == "racah_w_demo"
