"""Four spins 3/2 in an invented tetranuclear molecular magnet: pair basis to cross-pair basis.

The four metal ions sit on the corners of a square (a made-up cluster).  The
exchange model couples the spins along one diagonal pair first,
((s1 s2)s12, (s3 s4)s34)S; a second model prefers ((s1 s3)s13, (s2 s4)s24)S.
The change of basis is one 9j symbol.  This script prints the formula, the block
of the transformation matrix at total spin S = 3, and checks one entry against a
direct Clebsch-Gordan projection.

Run:  python examples/spin_cluster.py
"""

from __future__ import annotations

from fractions import Fraction

import recouple
from recouple.outputs.table import matrix_text, state_text

PAIRS = "((s1,s2)s12,(s3,s4)s34)S"
CROSS = "((s1,s3)s13,(s2,s4)s24)S"
SPINS = {"s1": "3/2", "s2": "3/2", "s3": "3/2", "s4": "3/2"}


def main() -> int:
    d = recouple.derive(PAIRS, CROSS)
    print("formula:")
    print(" ", d.formula)
    print(f"  ({d.formula.counts()['9j']} 9j symbol, {d.steps} Racah moves folded into it)")

    m = recouple.transformation_matrix(PAIRS, CROSS, {**SPINS, "S": 3})
    print(f"\nmatrix at S=3 ({len(m.rows)} x {len(m.columns)}):")
    print(matrix_text(m, exact=False))
    print(f"max |M M^T - 1| = {m.orthogonality_error:.1e}")

    # Check the largest entry by projection onto the product basis (no 6j or 9j used).
    i, j = max(
        ((i, j) for i in range(len(m.rows)) for j in range(len(m.columns))),
        key=lambda ij: abs(float(m.exact[ij[0]][ij[1]])),
    )
    values: dict[str, object] = dict(SPINS)
    values.update({k: Fraction(v, 2) for k, v in m.rows[i]})
    values.update({k: Fraction(v, 2) for k, v in m.columns[j]})
    check = recouple.verify(PAIRS, CROSS, values)
    print(f"\nentry <{state_text(m.rows[i])}|{state_text(m.columns[j])}>:")
    print(f"  formula    {check.formula_value}  ({float(check.formula_value):.15f})")
    print(f"  projection {check.projection_value}  ({float(check.projection_value):.15f})")
    print("  agree" if check.agree else "  DISAGREE")
    return 0 if check.agree and m.orthogonal else 1


if __name__ == "__main__":
    raise SystemExit(main())
