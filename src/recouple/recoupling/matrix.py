"""Whole transformation matrices between two coupling schemes.

For fixed leaf values (and optionally a fixed total), every allowed basis state
of a scheme is one assignment of its coupling labels.  The matrix holds
``<row state of FROM | column state of TO>``; it is real orthogonal (common
practice: both bases are orthonormal bases of the same space), which
:attr:`TransformationMatrix.orthogonality_error` measures.

>>> m = transformation_matrix("((a,b)e,c)J", "(a,(b,c)f)J", {"a": "1/2", "b": "1/2", "c": "1/2"})
>>> len(m.rows), m.orthogonal
(3, True)
>>> [str(x) for x in m.exact[0]]
['-1/2', '(1/2)*sqrt(3)', '0']
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

from recouple.errors import BadValue
from recouple.numbers.radicals import Radical
from recouple.numbers.spins import coupled_range, to_doubled
from recouple.recoupling.derive import Derivation, as_scheme, check_pair, derive
from recouple.recoupling.evaluate import _plan
from recouple.schemes.tree import Coupling

__all__ = [
    "MAX_STATES",
    "TransformationMatrix",
    "basis_states",
    "matrix_values",
    "transformation_matrix",
]

#: The largest basis a matrix may have; a larger request is refused up front.
MAX_STATES = 5000


@dataclass(frozen=True, slots=True)
class TransformationMatrix:
    """Overlaps of every basis state of ``source`` with every one of ``target``.

    ``rows`` and ``columns`` give, for each state, the doubled value (2j) of each
    coupling label; ``exact`` holds the entries.
    """

    source: Coupling
    target: Coupling
    leaves: tuple[tuple[str, int], ...]
    rows: tuple[tuple[tuple[str, int], ...], ...]
    columns: tuple[tuple[tuple[str, int], ...], ...]
    exact: tuple[tuple[Radical, ...], ...]
    derivation: Derivation

    def floats(self) -> list[list[float]]:
        """The entries as floats."""
        return [[float(x) for x in row] for row in self.exact]

    @property
    def orthogonality_error(self) -> float:
        """max |(M M^T - 1)_ij|, computed in floats."""
        m = self.floats()
        worst = 0.0
        for i, ri in enumerate(m):
            for j, rj in enumerate(m):
                dot = math.fsum(x * y for x, y in zip(ri, rj, strict=True))
                worst = max(worst, abs(dot - (1.0 if i == j else 0.0)))
        return worst

    @property
    def orthogonal(self) -> bool:
        """True when M M^T = 1 to 1e-12."""
        return len(self.rows) == len(self.columns) and self.orthogonality_error <= 1e-12


def basis_states(
    scheme: Coupling, leaves: Mapping[str, int], total: int | None = None
) -> list[dict[str, int]]:
    """Every allowed assignment (doubled values) of the coupling labels of ``scheme``.

    >>> from recouple.schemes import parse
    >>> basis_states(parse("((a,b)e,c)J"), {"a": 1, "b": 1, "c": 1})
    [{'e': 0, 'J': 1}, {'e': 2, 'J': 1}, {'e': 2, 'J': 3}]
    """
    states: list[dict[str, int]] = [{}]
    for node in scheme.couplings():  # children before parents
        grown: list[dict[str, int]] = []
        for state in states:
            known = {**leaves, **state}
            options = coupled_range(known[node.left.label], known[node.right.label])
            for value in options:
                if node is scheme and total is not None and value != total:
                    continue
                grown.append({**state, node.label: value})
                if len(grown) > MAX_STATES:
                    raise BadValue(
                        f"the basis of {str(scheme)!r} has more than {MAX_STATES} states; "
                        "fix the total or use smaller values"
                    )
        states = grown
    return states


def matrix_values(
    source: Coupling, target: Coupling, values: Mapping[str, object]
) -> tuple[dict[str, int], int | None]:
    """The doubled leaf values and total (None: all totals) a matrix is built for.

    Checks the schemes against each other and ``values`` against them, with no
    search, so bad input fails at once.

    >>> from recouple.schemes import parse
    >>> matrix_values(parse("(a,b)J"), parse("(b,a)K"), {"a": 1, "b": "1/2", "K": "3/2"})
    ({'a': 2, 'b': 1}, 3)
    >>> matrix_values(parse("(a,b)J"), parse("(b,a)J"), None)
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: values must map each leaf to its value, got None
    """
    check_pair(source, target)
    if not isinstance(values, Mapping):
        raise BadValue(f"values must map each leaf to its value, got {values!r}")
    leaf_names = source.leaves()
    allowed = set(leaf_names) | {source.total, target.total}
    for name in values:
        if name not in allowed:
            raise BadValue(
                f"{name!r} cannot be set for a matrix: give the leaves "
                f"({', '.join(leaf_names)}) and optionally the total {source.total!r}"
            )
    missing = [leaf for leaf in leaf_names if leaf not in values]
    if missing:
        raise BadValue(f"no value given for leaf {', '.join(repr(m) for m in missing)}")
    leaves = {leaf: to_doubled(values[leaf], name=leaf) for leaf in leaf_names}
    names = (source.total, target.total)
    totals = {to_doubled(values[k], name=k) for k in names if k in values}
    if len(totals) > 1:
        raise BadValue(f"{source.total!r} and {target.total!r} are given different values")
    return leaves, (totals.pop() if totals else None)


def transformation_matrix(
    source: Coupling | str,
    target: Coupling | str,
    values: Mapping[str, object],
) -> TransformationMatrix:
    """The matrix ``<FROM state|TO state>`` for the leaf values (and total) in ``values``.

    ``values`` gives every leaf and, optionally, the total (under either scheme's
    name for it); without a total, all totals are included and the matrix is
    block diagonal in the total.
    """
    # Schemes and values are checked before the search, which may take seconds.
    a, b = as_scheme(source), as_scheme(target)
    leaves, total = matrix_values(a, b, values)
    rows = basis_states(a, leaves, total)
    cols = basis_states(b, leaves, total)
    d = derive(a, b)
    exact = _entries(d, leaves, rows, cols)
    return TransformationMatrix(
        source=a,
        target=b,
        leaves=tuple(leaves.items()),
        rows=tuple(tuple(r.items()) for r in rows),
        columns=tuple(tuple(c.items()) for c in cols),
        exact=tuple(exact),
        derivation=d,
    )


def _entries(
    d: Derivation,
    leaves: Mapping[str, int],
    rows: list[dict[str, int]],
    cols: list[dict[str, int]],
) -> list[tuple[Radical, ...]]:
    """Every entry <row|column>, the formula compiled once for all of them.

    Basis states satisfy the triads of their own scheme by construction, so the
    only entries that vanish before any symbol is looked at are those where a
    cluster of both schemes (the total, a shared label, or a delta pair under two
    names) has different values in the row and the column: such states are
    orthogonal (common practice).  Rows and columns are grouped by the values of
    those clusters, so incompatible pairs are never visited and no entry is
    re-checked; the rest go straight to the compiled plan.
    """
    a, b = d.source, d.target
    b_clusters = b.clusters()
    pairs = [(la, b_clusters[c]) for c, la in a.clusters().items() if c in b_clusters]
    plan = _plan(d.formula)
    zero = Radical(0)
    by_key: dict[tuple[int, ...], list[int]] = {}
    for k, c in enumerate(cols):
        by_key.setdefault(tuple(c[lb] for _, lb in pairs), []).append(k)
    exact: list[tuple[Radical, ...]] = []
    for r in rows:
        line = [zero] * len(cols)
        for k in by_key.get(tuple(r[la] for la, _ in pairs), ()):
            doubled = {**leaves, **r, **cols[k]}
            line[k] = plan.exact([doubled[label] for label in plan.free])
        exact.append(tuple(line))
    return exact
