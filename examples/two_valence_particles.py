"""Two valence particles in a p and a d orbit: the LS-jj transformation matrix.

An invented two-particle configuration, one particle with l1 = 1 and one with
l2 = 2, both of spin 1/2.  The jj basis ((l1 s1)j1, (l2 s2)j2)J and the LS basis
((l1 l2)L, (s1 s2)S)J are related by one 9j symbol per entry.  The script prints
the formula, the matrix for every J (exact entries and floats), and its
orthogonality.

Run:  python examples/two_valence_particles.py
"""

from __future__ import annotations

import recouple
from recouple.outputs.table import matrix_text

JJ = "((l1,s1)j1,(l2,s2)j2)J"
LS = "((l1,l2)L,(s1,s2)S)J"
VALUES = {"l1": 1, "l2": 2, "s1": "1/2", "s2": "1/2"}


def main() -> int:
    m = recouple.transformation_matrix(JJ, LS, VALUES)
    print(m.derivation.formula)
    print(f"\nrows: jj states; columns: LS states ({len(m.rows)} x {len(m.columns)} in all)\n")
    print(matrix_text(m))
    error = m.orthogonality_error
    print(f"\nmax |M M^T - 1| = {error:.1e}: {'orthogonal' if m.orthogonal else 'NOT orthogonal'}")
    return 0 if m.orthogonal else 1


if __name__ == "__main__":
    raise SystemExit(main())
