"""Reversing a coupling chain of four momenta: the formula as LaTeX and as Python.

Four momenta are coupled one after another, (((j1 j2)j12 j3)j123 j4)J, as in a
made-up sequential model; the same states are wanted in the reversed chain
(((j4 j3)j43 j2)j432 j1)J.  The script derives the overlap, prints it as LaTeX
and as a stand-alone Python function, runs that function at invented values, and
checks the number against a direct Clebsch-Gordan projection.

Run:  python examples/three_body_chain.py
"""

from __future__ import annotations

from fractions import Fraction

import recouple
from recouple.outputs.pycode import formula_python

FORWARD = "(((j1,j2)j12,j3)j123,j4)J"
REVERSED = "(((j4,j3)j43,j2)j432,j1)J"
VALUES: dict[str, object] = {
    "j1": Fraction(1, 2), "j2": 1, "j3": Fraction(3, 2), "j4": 1,
    "j12": Fraction(3, 2), "j123": 1, "j43": Fraction(5, 2), "j432": Fraction(3, 2),
    "J": 2,
}  # fmt: skip


def main() -> int:
    d = recouple.derive(FORWARD, REVERSED)
    counts = d.formula.counts()
    print(f"{d.steps} Racah moves; {counts['sums']} sum(s), {counts['6j']} 6j, {counts['9j']} 9j")
    print(d.formula)
    print("\nLaTeX:")
    print(d.formula.latex())

    code = formula_python(d.formula)
    print("\nPython:")
    print(code)
    namespace: dict[str, object] = {}
    exec(compile(code, "<generated>", "exec"), namespace)
    overlap = namespace["overlap"]
    assert callable(overlap)
    value = overlap(**VALUES)

    check = recouple.verify(FORWARD, REVERSED, VALUES)
    print(f"generated function: {float(value):.15f}")
    print(f"formula (exact):    {check.formula_value}")
    print(f"projection:         {float(check.projection_value):.15f}")
    same = abs(float(value) - float(check.projection_value)) <= 1e-12 and value != 0
    print("agree" if check.agree and same else "DISAGREE")
    return 0 if check.agree and same else 1


if __name__ == "__main__":
    raise SystemExit(main())
