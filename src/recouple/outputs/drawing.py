"""Drawings of coupling trees and of recoupling paths, with matplotlib.

matplotlib is imported inside the functions that need it, so importing this
module costs nothing.  Figures are plain :class:`matplotlib.figure.Figure`
objects on an Agg canvas: no pyplot, no global state, nothing is shown.

>>> from recouple.outputs.drawing import draw_tree, label_mathtext, tree_svg
>>> label_mathtext("j12"), label_mathtext("J_a"), label_mathtext("j2'")
('$j_{12}$', '$J_a$', "$j'_2$")
>>> fig = draw_tree("((a,b)e,c)J", title="three spins")
>>> type(fig).__name__
'Figure'
>>> tree_svg("((a,b)e,c)J").lstrip().startswith("<?xml")
True
"""

from __future__ import annotations

import io
import os
import textwrap
from collections.abc import Sequence
from contextlib import AbstractContextManager
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Literal, overload

from recouple.errors import BadValue
from recouple.schemes import Coupling, Leaf, Node, check_scheme, is_name, parse

if TYPE_CHECKING:  # type names only; matplotlib itself is imported lazily
    from matplotlib.axes import Axes
    from matplotlib.backend_bases import RendererBase
    from matplotlib.figure import Figure
    from matplotlib.text import Text

__all__ = [
    "FORMATS",
    "MAX_DRAWN_LEAVES",
    "check_mathtext",
    "draw_path",
    "draw_tree",
    "label_mathtext",
    "label_tex",
    "path_svg",
    "save_figure",
    "subscript_split",
    "tree_svg",
]

#: File formats :func:`save_figure` writes, chosen by the file's extension.
FORMATS = (".png", ".svg", ".pdf")

#: The widest tree we draw; beyond this a drawing is unreadable on any page.
MAX_DRAWN_LEAVES = 40

Layers = Literal["depth", "size"]

# ---------------------------------------------------------------------------
# Label text: pure functions, shared with the LaTeX writer.
# ---------------------------------------------------------------------------

# Names that read as Greek letters are typeset as such (common practice:
# ``lambda1`` is written \lambda_1).  Only letters that LaTeX and mathtext both
# know: no \omicron, and capitals that look Latin (Alpha, Beta, ...) are absent.
_GREEK = frozenset(
    {
        "alpha",
        "beta",
        "gamma",
        "delta",
        "epsilon",
        "zeta",
        "eta",
        "theta",
        "iota",
        "kappa",
        "lambda",
        "mu",
        "nu",
        "xi",
        "pi",
        "rho",
        "sigma",
        "tau",
        "upsilon",
        "phi",
        "chi",
        "psi",
        "omega",
        "Gamma",
        "Delta",
        "Theta",
        "Lambda",
        "Xi",
        "Pi",
        "Sigma",
        "Upsilon",
        "Phi",
        "Psi",
        "Omega",
    }
)


def subscript_split(name: str) -> tuple[str, str, int]:
    """Split a leaf or label name into ``(base, subscript, primes)``.

    The subscript is the text after the first ``_`` (``J_a``), or else a run of
    trailing digits (``j12``).  Trailing primes are counted, not kept in the
    strings.  Pure: no matplotlib, usable by any writer.

    >>> subscript_split("j12"), subscript_split("J_a"), subscript_split("l1''")
    (('j', '12', 0), ('J', 'a', 0), ('l', '1', 2))
    >>> subscript_split("J"), subscript_split("_x"), subscript_split("ab3c")
    (('J', '', 0), ('_x', '', 0), ('ab3c', '', 0))
    >>> subscript_split("1j")
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: '1j' is not a leaf or label name (it must start with a letter or '_')
    """
    if not isinstance(name, str) or not is_name(name):
        raise BadValue(f"{name!r} is not a leaf or label name (it must start with a letter or '_')")
    body = name.rstrip("'")
    primes = len(name) - len(body)
    cut = body.find("_", 1)
    if 0 < cut < len(body) - 1:
        return body[:cut], body[cut + 1 :], primes
    stem = body.rstrip("0123456789")
    if stem and stem != body:
        return stem, body[len(stem) :], primes
    return body, "", primes


def label_tex(name: str) -> str:
    r"""A name as math-mode TeX without the dollars, valid in LaTeX and mathtext.

    Primes come before the subscript, so they stack above it.

    >>> label_tex("j12'"), label_tex("lambda2"), label_tex("J_a_b"), label_tex("x_")
    ("j'_{12}", '\\lambda_2', 'J_{a\\_b}', 'x\\_')
    """
    base, sub, primes = subscript_split(name)
    head = f"\\{base}" if base in _GREEK else base.replace("_", r"\_")
    head += "'" * primes
    if not sub:
        return head
    sub = sub.replace("_", r"\_")
    return f"{head}_{sub}" if len(sub) == 1 else f"{head}_{{{sub}}}"


def label_mathtext(name: str) -> str:
    """A name as a matplotlib mathtext string: ``j12`` -> ``$j_{12}$``.

    >>> label_mathtext("l1"), label_mathtext("J"), label_mathtext("s'")
    ('$l_1$', '$J$', "$s'$")
    """
    return f"${label_tex(name)}$"


# ---------------------------------------------------------------------------
# Layout: pure geometry in "leaf units" (x) and levels (y).
# ---------------------------------------------------------------------------

Side = Literal["below", "left", "right", "top"]


@dataclass(frozen=True, slots=True)
class _Spot:
    """One node placed: x in leaf units, a level, and where its label goes."""

    label: str
    x: float
    level: int
    side: Side
    parent: int | None  # index of the parent spot; None for the total


def _layout(scheme: Coupling, layers: Layers) -> tuple[_Spot, ...]:
    """Leaves at 0, 1, 2, ... along the bottom; a coupling above the midpoint of its parts.

    With ``layers="depth"`` a coupling sits one level above its higher part;
    with ``"size"`` at (number of leaves under it) - 1.  Two couplings on one
    level never share a leaf, so their x differ by at least one leaf unit.
    """
    spots: list[_Spot] = []
    raw: list[tuple[str, float, int, Side, int | None]] = []
    next_leaf = 0

    def place(node: Node, side: Side) -> int:
        nonlocal next_leaf
        if isinstance(node, Leaf):
            raw.append((node.name, float(next_leaf), 0, "below", None))
            next_leaf += 1
            return len(raw) - 1
        left = place(node.left, "left")
        right = place(node.right, "right")
        x = (raw[left][1] + raw[right][1]) / 2
        if layers == "depth":
            level = 1 + max(raw[left][2], raw[right][2])
        else:
            level = len(node.leaves()) - 1
        raw.append((node.label, x, level, side, None))
        me = len(raw) - 1
        for child in (left, right):
            name, cx, clevel, cside, _ = raw[child]
            raw[child] = (name, cx, clevel, cside, me)
        return me

    place(scheme, "top")
    for name, x, level, side, parent in raw:
        spots.append(_Spot(name, x, level, side, parent))
    return tuple(spots)


# ---------------------------------------------------------------------------
# The look: one restrained palette, sizes in points.
# ---------------------------------------------------------------------------

_INK = "#3a3d42"  # lines, leaves, coupling rims
_TEXT = "#1f2226"
_ACCENT = "#8c3b2e"  # the total: a muted brick red, the only colour
_SOFT = "#8b9097"  # step numbers, arrows
_MATH = "stix"  # serif math, as in print
_LEAF_PT, _NODE_PT, _TOTAL_PT = 10.5, 10.5, 13.0
_LEAF_MS, _NODE_MS, _TOTAL_MS = 5.5, 7.0, 9.0  # marker diameters (points)
_LINE_W = 1.3

# Label offsets from the node centre, in points.
_OFFSETS: dict[Side, tuple[float, float, str, str]] = {
    "below": (0.0, -7.0, "center", "top"),
    "left": (-5.0, 3.0, "right", "bottom"),
    "right": (5.0, 3.0, "left", "bottom"),
    "top": (0.0, 8.0, "center", "bottom"),
}

_MIN_SX, _MAX_SX = 0.62, 6.0  # inches per leaf unit
_MIN_SY = 0.6  # inches per level
_PAD = 0.12  # inches of white space around a tree
_GAP = 3.0 / 72  # inches between any two labels


@dataclass(frozen=True, slots=True)
class _Box:
    """A box whose x edges are ``a * sx + offset`` (inches) and whose y edges are fixed."""

    al: float
    left: float
    ar: float
    right: float
    bottom: float
    top: float
    owner: int

    def x0(self, sx: float) -> float:
        return self.al * sx + self.left

    def x1(self, sx: float) -> float:
        return self.ar * sx + self.right


@dataclass(frozen=True, slots=True)
class _Drawn:
    """One tree drawn into an axes, measured: its scale and its extent in inches."""

    sx: float
    sy: float
    x0: float
    x1: float
    y0: float
    y1: float
    spots: tuple[_Spot, ...]

    @property
    def width(self) -> float:
        return self.x1 - self.x0 + 2 * _PAD

    @property
    def height(self) -> float:
        return self.y1 - self.y0 + 2 * _PAD


def _as_scheme(obj: object, where: str) -> Coupling:
    """Accept a scheme or its notation; refuse anything else with a one-line message."""
    if isinstance(obj, str):
        obj = parse(obj)
    if not isinstance(obj, Coupling | Leaf):
        raise TypeError(f"{where}: expected a coupling scheme or its notation, got {obj!r}")
    scheme = check_scheme(obj)
    if len(scheme.leaves()) > MAX_DRAWN_LEAVES:
        raise BadValue(
            f"{where}: {len(scheme.leaves())} angular momenta are too many to draw"
            f" (at most {MAX_DRAWN_LEAVES})"
        )
    return scheme


def _draw_artists(ax: Axes, spots: tuple[_Spot, ...]) -> list[Text]:
    """Edges, nodes and labels in data coordinates; returns the labels, one per spot."""
    for spot in spots:
        if spot.parent is not None:
            up = spots[spot.parent]
            ax.plot(
                [spot.x, up.x],
                [spot.level, up.level],
                color=_INK,
                lw=_LINE_W,
                solid_capstyle="round",
                zorder=1,
            )
    labels: list[Text] = []
    for spot in spots:
        if spot.side == "below":
            face, size, ms, colour = _INK, _LEAF_PT, _LEAF_MS, _TEXT
        elif spot.side == "top":
            face, size, ms, colour = _ACCENT, _TOTAL_PT, _TOTAL_MS, _ACCENT
        else:
            face, size, ms, colour = "white", _NODE_PT, _NODE_MS, _INK
        edge = _ACCENT if spot.side == "top" else _INK
        ax.plot(
            [spot.x],
            [spot.level],
            marker="o",
            ms=ms,
            mfc=face,
            mec=edge,
            mew=1.2,
            ls="none",
            zorder=3,
        )
        dx, dy, ha, va = _OFFSETS[spot.side]
        labels.append(
            ax.annotate(
                label_mathtext(spot.label),
                xy=(spot.x, spot.level),
                xytext=(dx, dy),
                textcoords="offset points",
                ha=ha,
                va=va,
                fontsize=size,
                color=colour,
                math_fontfamily=_MATH,
                annotation_clip=False,
                zorder=4,
            )
        )
    return labels


def _figure_of(ax: Axes) -> Figure:
    fig = ax.get_figure(root=True)
    if fig is None:
        raise BadValue("the axes to draw into belong to no figure")
    return fig


def _renderer(fig: Figure) -> RendererBase:
    """A renderer to measure text with; it never touches the figure's canvas."""
    from matplotlib.backends.backend_agg import RendererAgg

    return RendererAgg(8, 8, fig.dpi)  # type: ignore[no-untyped-call]


def _relative_extents(
    ax: Axes, labels: list[Text], spots: tuple[_Spot, ...], renderer: RendererBase
) -> list[tuple[float, float, float, float]]:
    """Each label's box relative to its node, in inches: (left, right, bottom, top).

    Offsets are in points and text size is fixed, so these do not depend on the
    axes' limits or the figure's size; one measurement serves every scale.
    """
    dpi = _figure_of(ax).dpi
    out = []
    for text, spot in zip(labels, spots, strict=True):
        box = text.get_window_extent(renderer)
        ox, oy = ax.transData.transform((spot.x, spot.level))
        out.append(
            ((box.x0 - ox) / dpi, (box.x1 - ox) / dpi, (box.y0 - oy) / dpi, (box.y1 - oy) / dpi)
        )
    return out


def _boxes(
    spots: tuple[_Spot, ...], rel: list[tuple[float, float, float, float]], sy: float
) -> tuple[list[_Box], list[_Box]]:
    """Label boxes and node boxes at vertical scale ``sy``."""
    labels = [
        _Box(s.x, le, s.x, ri, s.level * sy + bo, s.level * sy + to, i)
        for i, (s, (le, ri, bo, to)) in enumerate(zip(spots, rel, strict=True))
    ]
    r = _TOTAL_MS / 144  # the largest marker radius, in inches
    nodes = [
        _Box(s.x, -r, s.x, r, s.level * sy - r, s.level * sy + r, i) for i, s in enumerate(spots)
    ]
    return labels, nodes


def _edge_boxes(spots: tuple[_Spot, ...], label: _Box, sy: float) -> list[_Box]:
    """The parts of edges (not touching the label's own node) that pass through its band."""
    out = []
    half = _LINE_W / 144
    for i, s in enumerate(spots):
        if s.parent is None or label.owner in (i, s.parent):
            continue
        up = spots[s.parent]
        y_lo, y_hi = s.level * sy, up.level * sy
        a, b = max(label.bottom, y_lo), min(label.top, y_hi)
        if a > b:
            continue
        xa = s.x + (up.x - s.x) * (a - y_lo) / (y_hi - y_lo)
        xb = s.x + (up.x - s.x) * (b - y_lo) / (y_hi - y_lo)
        out.append(_Box(min(xa, xb), -half, max(xa, xb), half, a, b, i))
    return out


def _solve_sx(pairs: list[tuple[_Box, _Box, float]]) -> float:
    """The smallest horizontal scale (inches per leaf unit) that keeps every pair apart.

    For boxes A, B whose bands overlap, "A left of B" reads
    (B.al - A.ar) * sx >= A.right + gap - B.left, and the mirror for "B left of A";
    each pair needs one of the two.  Every threshold is a candidate; take the
    first candidate that satisfies all pairs.
    """
    options: list[list[tuple[float, float]]] = []
    candidates = {_MIN_SX}
    for a, b, gap in pairs:
        opts = [(b.al - a.ar, a.right + gap - b.left), (a.al - b.ar, b.right + gap - a.left)]
        options.append(opts)
        for c, d in opts:
            if c > 0 and _MIN_SX < d / c <= _MAX_SX:
                candidates.add(d / c)

    def ok(sx: float) -> bool:
        return all(any(c * sx >= d - 1e-9 for c, d in opts) for opts in options)

    for sx in sorted(candidates):
        if ok(sx):
            return sx
    return _MAX_SX  # unreachable for trees laid out as above; stay readable anyway


def _measure(ax: Axes, labels: list[Text], spots: tuple[_Spot, ...]) -> _Drawn:
    """Choose the scales that keep labels clear of each other, nodes and edges."""
    rel = _relative_extents(ax, labels, spots, _renderer(_figure_of(ax)))
    # A label sits above its node's level; the next level's nodes must clear it.
    tallest = max(top for (_, _, _, top), s in zip(rel, spots, strict=True) if s.side != "below")
    sy = max(_MIN_SY, tallest + _TOTAL_MS / 144 + _GAP)
    label_boxes, node_boxes = _boxes(spots, rel, sy)

    def crosses(p: _Box, q: _Box) -> bool:
        return p.bottom < q.top + _GAP and q.bottom < p.top + _GAP

    pairs: list[tuple[_Box, _Box, float]] = []
    for i, p in enumerate(label_boxes):
        pairs += [(p, q, _GAP) for q in label_boxes[i + 1 :] if crosses(p, q)]
        pairs += [(p, q, _GAP) for q in node_boxes if q.owner != p.owner and crosses(p, q)]
        pairs += [(p, q, _GAP / 2) for q in _edge_boxes(spots, p, sy)]
    sx = _solve_sx(pairs)
    every = label_boxes + node_boxes
    return _Drawn(
        sx,
        sy,
        min(b.x0(sx) for b in every),
        max(b.x1(sx) for b in every),
        min(b.bottom for b in every),
        max(b.top for b in every),
        spots,
    )


def _place(ax: Axes, drawn: _Drawn, left: float, bottom: float) -> None:
    """Put the axes at (left, bottom) inches with limits that realise the drawn scale."""
    fw, fh = _figure_of(ax).get_size_inches()
    w, h = drawn.width, drawn.height
    ax.set_position((left / fw, bottom / fh, w / fw, h / fh))
    x0 = drawn.x0 - _PAD
    y0 = drawn.y0 - _PAD
    ax.set_xlim(x0 / drawn.sx, (x0 + w) / drawn.sx)
    ax.set_ylim(y0 / drawn.sy, (y0 + h) / drawn.sy)


def _fit_into(ax: Axes, drawn: _Drawn) -> None:
    """Fit a drawing into an axes the caller sized: shrink the scales if it is too small.

    Centred across; resting on the bottom, so trees in neighbouring axes share a
    baseline for their leaves (the lowest ink is a leaf name, a fixed offset below
    data y = 0 whatever the scale).
    """
    fw, fh = _figure_of(ax).get_size_inches()
    pos = ax.get_position()
    w, h = pos.width * fw, pos.height * fh
    sx = drawn.sx * min(1.0, max(0.05, (w - 2 * _PAD) / max(drawn.width - 2 * _PAD, 1e-9)))
    sy = drawn.sy * min(1.0, max(0.05, (h - 2 * _PAD) / max(drawn.height - 2 * _PAD, 1e-9)))
    xs = [s.x for s in drawn.spots]
    cx = (min(xs) + max(xs)) / 2
    mid_x = (drawn.x0 + drawn.x1) / 2 - cx * drawn.sx  # text imbalance, inches
    ax.set_xlim(cx + (mid_x - w / 2) / sx, cx + (mid_x + w / 2) / sx)
    low = drawn.y0 - _PAD
    ax.set_ylim(low / sy, (low + h) / sy)


def _new_figure() -> Figure:
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=(4.0, 3.0), dpi=100, facecolor="white")
    FigureCanvasAgg(fig)
    return fig


def _bare_axes(fig: Figure) -> Axes:
    ax = fig.add_axes((0.0, 0.0, 1.0, 1.0))
    ax.set_axis_off()
    return ax


_TITLE_PT = 12.0
_TITLE_H = 0.42  # inches kept for a title line


# ---------------------------------------------------------------------------
# Public drawing functions.
# ---------------------------------------------------------------------------


def check_mathtext(text: object, where: str) -> None:
    """Refuse text matplotlib cannot typeset, now rather than when the file is saved.

    matplotlib reads text with an even number of unescaped ``$`` as mathtext and
    raises a many-line ValueError from deep inside ``savefig`` when that part does
    not parse.  ``where`` starts the message.

    >>> check_mathtext("spin $j_1$", "the title")
    >>> check_mathtext("$x^$", "the title")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: the title '$x^$' is not valid mathtext (the parts between ...
    """
    if not isinstance(text, str):
        return
    from matplotlib import cbook
    from matplotlib.mathtext import MathTextParser

    if not cbook.is_math_text(text):
        return
    try:
        MathTextParser("path").parse(text)
    except ValueError:
        shown = repr(text) if len(text) <= 40 else repr(text[:37] + "...")
        raise BadValue(
            f"{where} {shown} is not valid mathtext (the parts between '$' signs); "
            "write \\$ for a dollar sign"
        ) from None


@overload
def draw_tree(
    scheme: Coupling | str, ax: None = None, *, title: str | None = None, layers: Layers = ...
) -> Figure: ...
@overload
def draw_tree(
    scheme: Coupling | str, ax: Axes, *, title: str | None = None, layers: Layers = ...
) -> Axes: ...
def draw_tree(
    scheme: Coupling | str,
    ax: Axes | None = None,
    *,
    title: str | None = None,
    layers: Layers = "depth",
) -> Figure | Axes:
    """Draw one coupling tree: leaves along the bottom, each coupling above its parts.

    Leaves are small filled dots with their names below; couplings are open
    circles with the label on the outer side; the total sits on top, in the
    accent colour.  Without ``ax`` a new figure is made, wide enough that no
    two labels touch, and returned; with ``ax`` the tree is fitted into it and
    the axes returned.  ``layers`` sets node heights: ``"depth"`` (one level
    above the higher part) or ``"size"`` (number of leaves under the node).

    >>> fig = draw_tree("((j1,j2)j12,(j3,j4)j34)J")
    >>> [round(float(v), 2) for v in fig.get_size_inches()]
    [2.22, 1.98]
    >>> draw_tree("((a,b)e,c)J", layers="height")
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: layers must be 'depth' or 'size', got 'height'
    """
    if layers not in ("depth", "size"):
        raise BadValue(f"layers must be 'depth' or 'size', got {layers!r}")
    check_mathtext(title, "draw_tree: the title")
    tree = _as_scheme(scheme, "draw_tree")
    spots = _layout(tree, layers)
    if ax is not None:
        labels = _draw_artists(ax, spots)
        ax.set_axis_off()
        _fit_into(ax, _measure(ax, labels, spots))
        if title is not None:
            ax.set_title(title, fontsize=_TITLE_PT, color=_TEXT)
        return ax
    fig = _new_figure()
    ax = _bare_axes(fig)
    drawn = _measure(ax, _draw_artists(ax, spots), spots)
    head = _TITLE_H if title else 0.0
    fig.set_size_inches(drawn.width, drawn.height + head)
    _place(ax, drawn, 0.0, 0.0)
    if title:
        fig.text(
            0.5,
            1 - 0.5 * head / (drawn.height + head),
            title,
            ha="center",
            va="center",
            fontsize=_TITLE_PT,
            color=_TEXT,
        )
    return fig


_ARROW_MIN = 0.85  # inches: the shortest arrow cell between two trees
_NOTE_PT = 9.5
_ROW_GAP = 0.3


def draw_path(
    trees: Sequence[Coupling | str],
    annotations: Sequence[str],
    *,
    title: str | None = None,
    per_row: int = 4,
) -> Figure:
    """Draw a recoupling path: the trees in a row, an annotated arrow between each pair.

    ``annotations[i]`` is a short text for the step from ``trees[i]`` to
    ``trees[i + 1]`` (plain text, long ones wrapped), shown above its arrow with
    the step number below.  More than ``per_row`` trees wrap onto further rows,
    each new row opening with the arrow that leads into its first tree.

    >>> fig = draw_path(["((a,b)e,c)J", "(a,(b,c)f)J"], ["6j {a b e; c J f}"])
    >>> len(fig.axes)
    2
    >>> draw_path(["((a,b)e,c)J", "(a,(b,c)f)J"], [])
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: draw_path needs one annotation per step: 2 trees take 1, got 0
    """
    check_mathtext(title, "draw_path: the title")
    schemes = [_as_scheme(t, f"draw_path tree {i}") for i, t in enumerate(trees)]
    notes = list(annotations)
    if not schemes:
        raise BadValue("draw_path needs at least one tree, got none")
    if len(notes) != len(schemes) - 1:
        raise BadValue(
            f"draw_path needs one annotation per step: {len(schemes)} trees take"
            f" {len(schemes) - 1}, got {len(notes)}"
        )
    for i, note in enumerate(notes):
        if not isinstance(note, str):
            raise TypeError(f"draw_path annotation {i}: expected a string, got {note!r}")
        check_mathtext(note, f"draw_path: annotation {i}")
    if not isinstance(per_row, int) or per_row < 1:
        raise BadValue(f"per_row must be a positive whole number, got {per_row!r}")

    fig = _new_figure()
    drawn: list[tuple[Axes, _Drawn]] = []
    for tree in schemes:
        ax = _bare_axes(fig)
        spots = _layout(tree, "depth")
        drawn.append((ax, _measure(ax, _draw_artists(ax, spots), spots)))

    renderer = _renderer(fig)
    cells: list[tuple[Text, Text, float]] = []  # note, step number, cell width
    for i, note in enumerate(notes):
        wrapped = "\n".join(textwrap.fill(line, 26) for line in note.splitlines() or [""])
        text = fig.text(
            0, 0, wrapped, ha="center", va="bottom", fontsize=_NOTE_PT, color=_TEXT,
            parse_math=False, linespacing=1.25,
        )  # fmt: skip
        step = fig.text(
            0, 0, f"step {i + 1}", ha="center", va="top", fontsize=8, color=_SOFT,
            parse_math=False,
        )  # fmt: skip
        width = text.get_window_extent(renderer).width / fig.dpi
        cells.append((text, step, max(_ARROW_MIN, width + 0.3)))

    # Rows of at most per_row trees; a row's height is its tallest tree.
    rows = [list(range(k, min(k + per_row, len(schemes)))) for k in range(0, len(schemes), per_row)]
    widths = []
    for row in rows:
        widths.append(sum(drawn[i][1].width + (cells[i - 1][2] if i else 0.0) for i in row))
    # Leaves of one row share a baseline: everything is measured from data y = 0.
    below = [max(_PAD - drawn[i][1].y0 for i in row) for row in rows]
    above = [max(drawn[i][1].y1 + _PAD for i in row) for row in rows]
    note_h = max((c[0].get_window_extent(renderer).height / fig.dpi for c in cells), default=0)
    head = _TITLE_H if title else 0.0
    fig_w = max(widths) + 2 * _PAD
    fig_h = sum(b + a for b, a in zip(below, above, strict=True)) + _ROW_GAP * (len(rows) - 1)
    fig_h += head + 2 * _PAD
    fig.set_size_inches(fig_w, fig_h)

    from matplotlib.patches import FancyArrowPatch

    top = fig_h - head - _PAD
    for row, b, a in zip(rows, below, above, strict=True):
        base = top - a  # inches from the figure's bottom to data y = 0 of this row
        x = _PAD  # rows start at the left margin and read like lines of text
        for i in row:
            ax, d = drawn[i]
            if i:
                label, step, cell = cells[i - 1]
                # The arrow sits a little above mid-height, clear of the leaf names.
                y = base + max(0.45 * a, 0.35, note_h * 0.5)
                fig.add_artist(
                    FancyArrowPatch(
                        (x + 0.1, y),
                        (x + cell - 0.1, y),
                        transform=fig.dpi_scale_trans,
                        arrowstyle="-|>",
                        mutation_scale=13,
                        lw=1.2,
                        color=_SOFT,
                    )
                )
                label.set_transform(fig.dpi_scale_trans)
                label.set_position((x + cell / 2, y + 0.07))
                step.set_transform(fig.dpi_scale_trans)
                step.set_position((x + cell / 2, y - 0.07))
                x += cell
            _place(ax, d, x, base + d.y0 - _PAD)
            x += d.width
        top = base - b - _ROW_GAP
    if title:
        fig.text(
            0.5,
            1 - (0.5 * head + _PAD / 2) / fig_h,
            title,
            ha="center",
            va="center",
            fontsize=_TITLE_PT,
            color=_TEXT,
        )
    return fig


# ---------------------------------------------------------------------------
# Files and Jupyter.
# ---------------------------------------------------------------------------


def _rc() -> AbstractContextManager[None]:
    import matplotlib

    # Text stays text in SVG (searchable, editable); TrueType in PDF for the
    # same reason; a fixed hash salt keeps SVG ids the same from run to run.
    return matplotlib.rc_context(
        {"svg.fonttype": "none", "svg.hashsalt": "recouple", "pdf.fonttype": 42}
    )


def _metadata(fmt: str) -> dict[str, str | None]:
    # No creation date, so the same drawing gives the same bytes (common practice
    # for reproducible builds).
    if fmt == "png":
        return {"Software": None}
    return {"Date": None} if fmt == "svg" else {"CreationDate": None}


def save_figure(fig: Figure, path: str | os.PathLike[str]) -> Path:
    """Write ``fig`` to ``path``; the extension picks the format (.png, .svg or .pdf).

    SVG keeps text as text, so labels can be searched and edited.

    >>> save_figure(draw_tree("(a,b)J"), "tree.jpg")
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: cannot save a drawing as '.jpg' ('tree.jpg'); use .png, .svg or .pdf
    """
    target = Path(path)
    ext = target.suffix.lower()
    if ext not in FORMATS:
        shown = repr(ext) if ext else "a file without an extension"
        raise BadValue(
            f"cannot save a drawing as {shown} ({str(target)!r}); use .png, .svg or .pdf"
        )
    fmt = ext[1:]
    with _rc():
        fig.savefig(target, format=fmt, dpi=200 if fmt == "png" else "figure",
                    metadata=_metadata(fmt))  # fmt: skip
    return target


def _svg_text(fig: Figure) -> str:
    buffer = io.StringIO()
    with _rc():
        fig.savefig(buffer, format="svg", metadata=_metadata("svg"))
    return buffer.getvalue()


def tree_svg(scheme: Coupling | str) -> str:
    """SVG text of :func:`draw_tree`, for ``_repr_svg_`` hooks in notebooks.

    >>> "<svg" in tree_svg("(a,b)J")
    True
    """
    return _svg_text(draw_tree(scheme))


def path_svg(trees: Sequence[Coupling | str], annotations: Sequence[str]) -> str:
    """SVG text of :func:`draw_path`, for ``_repr_svg_`` hooks in notebooks.

    >>> "<svg" in path_svg(["(a,b)J", "(b,a)J"], ["exchange"])
    True
    """
    return _svg_text(draw_path(trees, annotations))
