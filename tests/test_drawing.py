"""Drawings: label text, files in every format, no label collisions, paths of 2..6 trees."""

from __future__ import annotations

import itertools
import random
import re
import subprocess
import sys
import xml.etree.ElementTree as ET
from pathlib import Path
from typing import Literal

import pytest

from recouple import parse
from recouple.errors import BadValue, NotationError
from recouple.outputs.drawing import (
    FORMATS,
    draw_path,
    draw_tree,
    label_mathtext,
    label_tex,
    path_svg,
    save_figure,
    subscript_split,
    tree_svg,
)
from recouple.schemes import Coupling, Leaf, Node

# ---------------------------------------------------------------------------
# Label text (pure; no matplotlib needed)
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("name", "parts"),
    [
        ("j12", ("j", "12", 0)),
        ("l1", ("l", "1", 0)),
        ("J", ("J", "", 0)),
        ("J_a", ("J", "a", 0)),
        ("J_tot", ("J", "tot", 0)),
        ("j12'", ("j", "12", 1)),
        ("s''", ("s", "", 2)),
        ("J_a_b", ("J", "a_b", 0)),
        ("_x", ("_x", "", 0)),
        ("x_", ("x_", "", 0)),
        ("ab3c", ("ab3c", "", 0)),
        ("lambda2", ("lambda", "2", 0)),
        ("L123", ("L", "123", 0)),
    ],
)
def test_subscript_split(name: str, parts: tuple[str, str, int]) -> None:
    assert subscript_split(name) == parts


@pytest.mark.parametrize(
    ("name", "mathtext"),
    [
        ("j12", "$j_{12}$"),
        ("l1", "$l_1$"),
        ("J", "$J$"),
        ("J_a", "$J_a$"),
        ("J_tot", "$J_{tot}$"),
        ("j'", "$j'$"),
        ("j12'", "$j'_{12}$"),
        ("l1''", "$l''_1$"),
        ("lambda", r"$\lambda$"),
        ("Sigma3", r"$\Sigma_3$"),
        ("Alpha", "$Alpha$"),  # no \Alpha in LaTeX: stays Latin letters
        ("J_a_b", r"$J_{a\_b}$"),
        ("_x", r"$\_x$"),
    ],
)
def test_label_mathtext_golden(name: str, mathtext: str) -> None:
    assert label_mathtext(name) == mathtext
    assert label_tex(name) == mathtext[1:-1]


@pytest.mark.parametrize("bad", ["", "1j", "a b", "j-1", "'j"])
def test_subscript_split_refuses_non_names(bad: str) -> None:
    with pytest.raises(BadValue, match="is not a leaf or label name"):
        subscript_split(bad)


def test_importing_the_module_does_not_import_matplotlib() -> None:
    code = "import sys, recouple.outputs.drawing; print('matplotlib' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "False"


# ---------------------------------------------------------------------------
# Everything below renders with matplotlib's Agg renderer.
# ---------------------------------------------------------------------------

mpl = pytest.importorskip("matplotlib")

if True:  # imports that need matplotlib, after the skip
    from matplotlib.figure import Figure
    from matplotlib.image import imread
    from matplotlib.text import Text
    from matplotlib.transforms import Bbox

FOUR = "((j1,j2)j12,(j3,j4)j34)J"
NAMES = ("j12'", "J_tot", "l1", "s2''", "x", "K", "Lambda", "ab", "J_a", "j123")


def _random_tree(rng: random.Random, n: int) -> Coupling:
    """A random binary tree with n leaves and assorted, distinct names."""
    pool = [*NAMES, *(f"q{i}" for i in range(100))]
    rng.shuffle(pool)
    names = iter(pool)
    parts: list[Node] = [Leaf(next(names)) for _ in range(n)]
    while len(parts) > 1:
        i = rng.randrange(len(parts) - 1)
        parts[i : i + 2] = [Coupling(parts[i], parts[i + 1], next(names))]
    tree = parts[0]
    assert isinstance(tree, Coupling)
    return tree


def _label_boxes(fig: Figure) -> list[tuple[str, Bbox]]:
    """Every non-empty text in the figure with its box in pixels, after a real draw."""
    fig.canvas.draw()
    renderer = fig.canvas.get_renderer()  # type: ignore[attr-defined]
    texts: list[Text] = list(fig.texts)
    for ax in fig.axes:
        texts += ax.texts
    return [(t.get_text(), t.get_window_extent(renderer)) for t in texts if t.get_text()]


def _assert_apart_and_inside(fig: Figure) -> int:
    boxes = _label_boxes(fig)
    width, height = fig.canvas.get_width_height()
    for (s, a), (t, b) in itertools.combinations(boxes, 2):
        apart = a.x1 <= b.x0 or b.x1 <= a.x0 or a.y1 <= b.y0 or b.y1 <= a.y0
        assert apart, f"labels {s!r} {a.bounds} and {t!r} {b.bounds} overlap"
    for s, a in boxes:
        inside = a.x0 >= 0 and a.y0 >= 0 and a.x1 <= width and a.y1 <= height
        assert inside, f"{s!r} is cut off"
    return len(boxes)


@pytest.mark.parametrize("ext", FORMATS)
def test_save_every_format(tmp_path: Path, ext: str) -> None:
    target = save_figure(draw_tree(FOUR, title="four spins"), tmp_path / f"tree{ext}")
    assert target.is_file()
    assert target.stat().st_size > 1000
    head = target.read_bytes()[:8]
    magic = {".png": b"\x89PNG", ".svg": b"<?xml", ".pdf": b"%PDF"}[ext]
    assert head.startswith(magic)


def test_png_is_a_sensible_non_blank_image(tmp_path: Path) -> None:
    target = save_figure(draw_tree(FOUR), tmp_path / "tree.png")
    pixels = imread(target)
    height, width = pixels.shape[:2]
    assert 150 <= width <= 3000
    assert 150 <= height <= 3000
    grey = pixels[..., :3].mean(axis=2)
    assert grey.var() > 1e-3  # not one flat colour
    inked = (grey < 0.8).mean()
    assert 0.005 < inked < 0.4  # some ink, mostly white page


def _svg_strings(svg: str) -> list[str]:
    """The text of every <text> element, its glyph spans joined in order."""
    root = ET.fromstring(svg)
    return [
        "".join(p.strip() for p in el.itertext())
        for el in root.iter("{http://www.w3.org/2000/svg}text")
    ]


def _glyphs(name: str) -> str:
    """What a label looks like as characters once typeset: base, primes, subscript."""
    base, sub, primes = subscript_split(name)
    return base + "\u2032" * primes + sub


@pytest.mark.parametrize("text", [FOUR, "((j12',J_a)x,(s'',j123)K)J_tot", "(a,b)c"])
def test_every_label_is_text_in_the_svg(tmp_path: Path, text: str) -> None:
    scheme = parse(text)
    target = save_figure(draw_tree(scheme), tmp_path / "tree.svg")
    strings = _svg_strings(target.read_text(encoding="utf-8"))
    for name in scheme.labels():
        assert _glyphs(name) in strings, f"{name!r} is not searchable text in the SVG"
    assert tree_svg(scheme) == tree_svg(scheme)  # same input, same bytes


def test_path_svg_has_the_annotations() -> None:
    svg = path_svg([FOUR, "(((j1,j2)j12,j3)j123,j4)J"], ["six-j step"])
    assert "six-j step" in _svg_strings(svg)


@pytest.mark.parametrize("layers", ["depth", "size"])
def test_no_labels_overlap_on_random_trees(layers: Literal["depth", "size"]) -> None:
    rng = random.Random(20240611)
    for n in [2, 4, 7, 10, 12, 12, 12, 12]:
        tree = _random_tree(rng, n)
        fig = draw_tree(tree, layers=layers)
        assert _assert_apart_and_inside(fig) == 2 * n - 1, str(tree)


def test_width_grows_with_the_number_of_leaves() -> None:
    rng = random.Random(7)
    widths = [draw_tree(_random_tree(rng, n)).get_size_inches()[0] for n in (2, 6, 12)]
    assert widths[0] < widths[1] < widths[2]


def test_nodes_sit_where_the_layout_says() -> None:
    """x of a coupling is the midpoint of its parts; leaves keep their order."""
    fig = draw_tree("((a,b)e,c)J")
    ax = fig.axes[0]
    anchors = {t.get_text(): t.xy for t in ax.texts}  # type: ignore[attr-defined]
    assert [anchors[f"${n}$"][0] for n in "abc"] == [0.0, 1.0, 2.0]
    assert anchors["$e$"] == (0.5, 1)
    assert anchors["$J$"] == (1.25, 2)


def test_draw_into_given_axes() -> None:
    fig = Figure(figsize=(8, 3))
    left, right = fig.subplots(1, 2)
    assert draw_tree(FOUR, left, title="left") is left
    assert draw_tree("((a,b)e,c)J", ax=right) is right
    assert {t.get_text() for t in right.texts} == {"$a$", "$b$", "$c$", "$e$", "$J$"}
    assert left.get_title() == "left"


@pytest.mark.parametrize("k", [2, 3, 4, 5, 6])
def test_draw_path_of_k_trees(k: int) -> None:
    trees = [_random_tree(random.Random(seed), 4) for seed in range(k)]
    notes = ["6j {a b e; c J f}" if i % 2 else "exchange" for i in range(k - 1)]
    fig = draw_path(trees, notes, title="a path")
    assert len(fig.axes) == k
    texts = [t.get_text() for t in fig.texts]
    assert texts.count("exchange") == len([n for n in notes if n == "exchange"])
    assert [f"step {i}" for i in range(1, k)] == [t for t in texts if t.startswith("step")]
    _assert_apart_and_inside(fig)
    # Up to four trees share one row (their boxes overlap vertically); more wrap.
    boxes = [ax.get_position() for ax in fig.axes]
    first_row = [b for b in boxes if b.y1 > boxes[0].y0]
    assert len(first_row) == min(k, 4)
    assert all(b.y1 <= boxes[0].y0 for b in boxes[4:])


def test_single_tree_path_and_long_annotations() -> None:
    fig = draw_path([FOUR], [])
    assert len(fig.axes) == 1
    long = "recouple the second pair, then exchange inside it, then again " * 2
    _assert_apart_and_inside(draw_path([FOUR, FOUR], [long]))


@pytest.mark.parametrize(
    ("trees", "notes", "message"),
    [
        ([FOUR, FOUR], [], "2 trees take 1, got 0"),
        ([FOUR], ["x"], "1 trees take 0, got 1"),
        ([], [], "at least one tree"),
    ],
)
def test_draw_path_bad_arguments(trees: list[str], notes: list[str], message: str) -> None:
    with pytest.raises(BadValue, match=message):
        draw_path(trees, notes)


@pytest.mark.parametrize("name", ["tree.jpg", "tree.PNGX", "tree", "tree.eps"])
def test_bad_extension(tmp_path: Path, name: str) -> None:
    with pytest.raises(BadValue, match=r"cannot save a drawing as .*use \.png, \.svg or \.pdf"):
        save_figure(draw_tree(FOUR), tmp_path / name)
    assert not (tmp_path / name).exists()


def test_upper_case_extension_is_fine(tmp_path: Path) -> None:
    assert save_figure(draw_tree(FOUR), tmp_path / "tree.SVG").is_file()


def test_bad_trees() -> None:
    with pytest.raises(NotationError):
        draw_tree("((a,b),c)J")
    with pytest.raises(TypeError, match="expected a coupling scheme"):
        draw_tree(42)  # type: ignore[call-overload]
    with pytest.raises(BadValue, match="layers must be"):
        draw_tree(FOUR, layers="height")  # type: ignore[call-overload]
    with pytest.raises(BadValue, match="too many to draw"):
        draw_tree(_random_tree(random.Random(1), 41))


@pytest.mark.parametrize("title", ["$x^$", "$\\frac{$", "two $j_1$ and $y^$"])
def test_bad_mathtext_is_refused_when_drawing(tmp_path: Path, title: str) -> None:
    # matplotlib used to raise a many-line ValueError from inside savefig (an
    # internal error, exit 1, on the command line); now the drawing call says which
    # text is wrong, before anything is drawn.
    shown = re.escape(repr(title))
    message = r" is not valid mathtext \(the parts between '\$' signs\)"
    with pytest.raises(BadValue, match="draw_tree: the title " + shown + message) as info:
        draw_tree(FOUR, title=title)
    assert "\n" not in str(info.value)
    with pytest.raises(BadValue, match="draw_path: the title " + shown + message):
        draw_path([FOUR], [], title=title)
    with pytest.raises(BadValue, match="draw_path: annotation 0 " + shown + message):
        draw_path([FOUR, FOUR], [title])


@pytest.mark.parametrize("title", ["spin $j_1$", "costs $5", "a \\$ sign", "plain"])
def test_good_titles_still_draw(tmp_path: Path, title: str) -> None:
    # valid mathtext, or a lone '$' (matplotlib prints it as it is)
    assert save_figure(draw_tree(FOUR, title=title), tmp_path / "t.png").is_file()
    assert save_figure(draw_path([FOUR], [], title=title), tmp_path / "p.png").is_file()
