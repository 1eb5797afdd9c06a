"""Writers for transformation matrices: a terminal table, CSV and a JSON-ready dict.

A basis state is named by its coupling labels, ``j1=1/2 j2=3/2 J=1``.  The
matrix is block diagonal in the total angular momentum (both bases are
eigenbases of the total, common practice), so the terminal table is printed
one block per total value; CSV and JSON hold the whole matrix.

>>> from recouple.recoupling.matrix import transformation_matrix
>>> m = transformation_matrix("((a,b)e,c)J", "(a,(b,c)f)J", {"a": "1/2", "b": "1/2", "c": "1/2"})
>>> [state_text(r) for r in m.rows]
['e=0 J=1/2', 'e=1 J=1/2', 'e=1 J=3/2']
>>> print(matrix_csv(m, exact=False), end="")
FROM \\ TO,f=0 J=1/2,f=1 J=1/2,f=1 J=3/2
e=0 J=1/2,-0.5,0.8660254037844386,0.0
e=1 J=1/2,0.8660254037844386,0.5,0.0
e=1 J=3/2,0.0,0.0,1.0
"""

from __future__ import annotations

import csv
import io
from collections.abc import Sequence
from typing import Any

from recouple.numbers.radicals import Radical
from recouple.numbers.spins import spin_text
from recouple.recoupling.matrix import TransformationMatrix

__all__ = [
    "matrix_blocks",
    "matrix_csv",
    "matrix_json",
    "matrix_text",
    "state_text",
    "state_values",
]

State = Sequence[tuple[str, int]]

#: Width a terminal table aims for; wider blocks are cut into panels of columns.
TABLE_WIDTH = 100


def state_text(state: State, *, skip: str | None = None) -> str:
    """A basis state as ``label=value`` words (values from doubled ints).

    ``skip`` leaves out one label (the total, inside a block that fixes it).

    >>> state_text((("j1", 1), ("j2", 3), ("J", 4)))
    'j1=1/2 j2=3/2 J=2'
    >>> state_text((("j1", 1), ("J", 4)), skip="J")
    'j1=1/2'
    """
    return " ".join(f"{k}={spin_text(v)}" for k, v in state if k != skip)


def state_values(state: State) -> dict[str, str]:
    """A basis state as a mapping from label to value text, as JSON carries it.

    >>> state_values((("e", 2), ("J", 3)))
    {'e': '1', 'J': '3/2'}
    """
    return {k: spin_text(v) for k, v in state}


def matrix_blocks(m: TransformationMatrix) -> list[tuple[int, list[int], list[int]]]:
    """``(doubled total, row indices, column indices)`` of each block, totals ascending.

    >>> from recouple.recoupling.matrix import transformation_matrix
    >>> m = transformation_matrix("((a,b)e,c)J", "(a,(b,c)f)J", {"a": 1, "b": 1, "c": 1})
    >>> [(t, len(r), len(c)) for t, r, c in matrix_blocks(m)]
    [(0, 1, 1), (2, 3, 3), (4, 2, 2), (6, 1, 1)]
    """
    a, b = m.source.total, m.target.total
    totals = sorted({dict(r)[a] for r in m.rows} | {dict(c)[b] for c in m.columns})
    return [
        (
            t,
            [i for i, r in enumerate(m.rows) if dict(r)[a] == t],
            [j for j, c in enumerate(m.columns) if dict(c)[b] == t],
        )
        for t in totals
    ]


def _float_cell(x: Radical) -> str:
    # An exact zero prints as 0, so the pattern of zeros shows at a glance.
    return "0" if x == 0 else f"{float(x):.12f}"


def _panel(corner: str, heads: list[str], rows: list[tuple[str, list[str]]]) -> list[str]:
    """Lines of one table: a corner cell, column heads, labelled rows of cells."""
    left = max([len(corner)] + [len(label) for label, _ in rows])
    widths = [max([len(h)] + [len(cells[j]) for _, cells in rows]) for j, h in enumerate(heads)]
    lines = [
        corner.ljust(left)
        + " | "
        + "  ".join(h.rjust(w) for h, w in zip(heads, widths, strict=True))
    ]
    lines.append("-" * left + "-+-" + "--".join("-" * w for w in widths))
    for label, cells in rows:
        body = "  ".join(c.rjust(w) for c, w in zip(cells, widths, strict=True))
        lines.append(label.ljust(left) + " | " + body)
    return lines


def _panels(
    corner: str, heads: list[str], rows: list[tuple[str, list[str]]], width: int
) -> list[str]:
    """:func:`_panel`, cut into several panels of columns when it is wider than ``width``."""
    left = max([len(corner)] + [len(label) for label, _ in rows]) + 3
    widths = [max([len(h)] + [len(cells[j]) for _, cells in rows]) for j, h in enumerate(heads)]
    groups: list[list[int]] = [[]]
    used = left
    for j, w in enumerate(widths):
        if groups[-1] and used + w + 2 > width:
            groups.append([])
            used = left
        groups[-1].append(j)
        used += w + 2
    lines: list[str] = []
    for n, group in enumerate(groups):
        if n:
            lines.append("")
        lines += _panel(
            corner,
            [heads[j] for j in group],
            [(label, [cells[j] for j in group]) for label, cells in rows],
        )
    return lines


def matrix_text(m: TransformationMatrix, *, exact: bool = True, width: int = TABLE_WIDTH) -> str:
    """The matrix for a terminal: one block per total, exact entries and floats.

    Rows are the states of FROM, columns those of TO, each named by its coupling
    labels (the total is the block's heading).  ``exact=False`` leaves out the
    exact table.  Blocks wider than ``width`` are cut into panels of columns.

    >>> from recouple.recoupling.matrix import transformation_matrix
    >>> m = transformation_matrix("((a,b)e,c)J", "(a,(b,c)f)J",
    ...                           {"a": "1/2", "b": "1/2", "c": "1/2", "J": "1/2"})
    >>> print(matrix_text(m))
    J=1/2: 2 x 2
      exact |           f=0            f=1
      ------+-----------------------------
      e=0   |          -1/2  (1/2)*sqrt(3)
      e=1   | (1/2)*sqrt(3)            1/2
    <BLANKLINE>
      floats |             f=0             f=1
      -------+--------------------------------
      e=0    | -0.500000000000  0.866025403784
      e=1    |  0.866025403784  0.500000000000
    """
    a, b = m.source.total, m.target.total
    out: list[str] = []
    for t, rows, cols in matrix_blocks(m):
        if out:
            out.append("")
        out.append(f"{a}={spin_text(t)}: {len(rows)} x {len(cols)}")
        heads = [state_text(m.columns[j], skip=b) or f"{b}={spin_text(t)}" for j in cols]
        labels = [state_text(m.rows[i], skip=a) or f"{a}={spin_text(t)}" for i in rows]
        tables: list[tuple[str, Any]] = [("floats", _float_cell)]
        if exact:
            tables.insert(0, ("exact", str))
        for n, (corner, cell) in enumerate(tables):
            if n:
                out.append("")
            body = [(labels[k], [cell(m.exact[i][j]) for j in cols]) for k, i in enumerate(rows)]
            out += ["  " + line for line in _panels(corner, heads, body, width - 2)]
    return "\n".join(line.rstrip() for line in out)


def matrix_csv(m: TransformationMatrix, *, exact: bool = True) -> str:
    """The whole matrix as CSV: a header of TO's states, one line per FROM state.

    Cells are the exact entries as text (``(1/2)*sqrt(3)``, readable by sympy)
    or, with ``exact=False``, floats written with full precision.  States are
    named as in :func:`state_text`; the first cell of the header is ``FROM \\ TO``.
    """
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(["FROM \\ TO"] + [state_text(c) for c in m.columns])
    for r, line in zip(m.rows, m.exact, strict=True):
        cells = [str(x) if exact else repr(float(x)) for x in line]
        writer.writerow([state_text(r), *cells])
    return buffer.getvalue()


def matrix_json(m: TransformationMatrix, *, exact: bool = True) -> dict[str, Any]:
    """The matrix as a JSON-ready dict.

    Keys: ``from``, ``to`` (scheme text), ``leaves`` (leaf -> value text),
    ``total`` (value text, or None when every total is included), ``formula``
    (the overlap formula as text), ``rows`` and ``columns`` (one object per state,
    label -> value text), ``matrix`` (floats), ``exact`` (entries as text; left
    out when ``exact=False``), ``orthogonal`` (M M^T = 1 to 1e-12) and
    ``orthogonality_error`` (max |M M^T - 1|).

    >>> from recouple.recoupling.matrix import transformation_matrix
    >>> m = transformation_matrix("(a,b)J", "(b,a)J", {"a": "1/2", "b": "1/2"})
    >>> d = matrix_json(m)
    >>> d["rows"], d["exact"], d["orthogonal"]
    ([{'J': '0'}, {'J': '1'}], [['-1', '0'], ['0', '1']], True)
    """
    totals = {dict(r)[m.source.total] for r in m.rows}
    out: dict[str, Any] = {
        "from": str(m.source),
        "to": str(m.target),
        "leaves": state_values(m.leaves),
        "total": spin_text(next(iter(totals))) if len(totals) == 1 else None,
        "formula": str(m.derivation.formula),
        "rows": [state_values(r) for r in m.rows],
        "columns": [state_values(c) for c in m.columns],
        "matrix": m.floats(),
    }
    if exact:
        out["exact"] = [[str(x) for x in line] for line in m.exact]
    out["orthogonal"] = m.orthogonal
    out["orthogonality_error"] = m.orthogonality_error
    return out
