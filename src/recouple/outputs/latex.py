r"""LaTeX for recoupling formulas: a math-mode body to paste, or a whole document.

The reading order mirrors the plain-text writer (:mod:`recouple.outputs.text`):
overall sign, Kronecker deltas, sums, phase, whole factors ``(2x+1)``, one
square root, the 6j symbols, the 9j symbols.  Each symbol is one ``Bmatrix``
(amsmath), rows in the order the formula stores them; labels are subscripted
(``j12`` -> ``j_{12}``).  The same formula always gives the same bytes.

>>> from recouple.recoupling.derive import derive
>>> lhs, rhs = formula_latex(derive("((a,b)e,c)J", "(a,(b,c)f)J").formula).split(" = ")
>>> print(lhs)
\langle ((a,b)e,c)J \,|\, (a,(b,c)f)J \rangle
>>> print(rhs)
(-1)^{a+b+c+J} \sqrt{(2e+1)(2f+1)} \begin{Bmatrix} a & b & e \\ c & J & f \end{Bmatrix}
>>> label_latex("j12"), label_latex("J_a"), label_latex("j2'"), label_latex("Jtot")
('j_{12}', 'J_{a}', "j'_{2}", '\\mathit{Jtot}')
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

from recouple.errors import BadValue
from recouple.outputs.drawing import subscript_split
from recouple.outputs.text import require_formula
from recouple.schemes.tree import Coupling, Leaf, Node

if TYPE_CHECKING:
    from recouple.recoupling.formula import Formula

__all__ = ["CONVENTIONS_NOTE", "formula_latex", "label_latex", "latex_document", "scheme_latex"]

#: The sentence :func:`latex_document` prints above the formula.
CONVENTIONS_NOTE = (
    r"Conventions: Condon--Shortley phases; in $(a,b)c$ the angular momentum $a$ is"
    r" coupled first (it fills the first slot of the Clebsch--Gordan coefficient"
    r" $\langle a\,m_a\,b\,m_b|c\,m_c\rangle$); a sum runs over every value its"
    r" triangle conditions allow; $\begin{Bmatrix} \cdot & \cdot & \cdot \\ \cdot & \cdot"
    r" & \cdot \end{Bmatrix}$ is a Wigner 6j symbol and a $3\times 3$ array a 9j symbol."
)


def label_latex(name: str) -> str:
    r"""A label as math-mode LaTeX: subscript in braces, primes before it.

    The split into base, subscript and primes is the one the drawings use
    (:func:`recouple.outputs.drawing.subscript_split`).  A base of more than one
    character is set in ``\mathit`` so that it does not read as a product;
    underscores left in a name are escaped.  No Greek letters are made.

    >>> [label_latex(n) for n in ("j12", "l1", "J", "J_a", "j'", "x1", "ab_cd_e")]
    ['j_{12}', 'l_{1}', 'J', 'J_{a}', "j'", 'x_{1}', '\\mathit{ab}_{cd\\_e}']
    >>> label_latex("2j")
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: '2j' is not a leaf or label name (it must start with a letter or '_')
    """
    base, sub, primes = subscript_split(name)
    head = base.replace("_", r"\_")
    if len(base) > 1:
        head = rf"\mathit{{{head}}}"
    head += "'" * primes
    if sub:
        head += "_{" + sub.replace("_", r"\_") + "}"
    return head


def scheme_latex(scheme: Node) -> str:
    r"""A coupling scheme in the library's bracket notation, labels as LaTeX.

    >>> from recouple.schemes import parse
    >>> scheme_latex(parse("((j1,j2)j12,j3)J"))
    '((j_{1},j_{2})j_{12},j_{3})J'
    """
    return "".join(_scheme_chunks(scheme))


def formula_latex(formula: Formula, *, overlap: bool = True) -> str:
    r"""The formula as one line of math-mode LaTeX (amsmath, no ``$``).

    With ``overlap=False`` only the right-hand side is returned.  Unknown
    settings raise ``TypeError`` (Python's own keyword check).

    >>> from recouple.recoupling.derive import derive
    >>> f = derive("((a,b)e,(c,d)f)J", "((a,c)g,(b,d)h)J").formula
    >>> print(formula_latex(f, overlap=False).replace(" \\begin", "\n\\begin"))
    \sqrt{(2e+1)(2f+1)(2g+1)(2h+1)}
    \begin{Bmatrix} a & b & e \\ c & d & f \\ g & h & J \end{Bmatrix}
    >>> formula_latex(f, width=3)
    Traceback (most recent call last):
    ...
    TypeError: formula_latex() got an unexpected keyword argument 'width'
    """
    require_formula(formula, "formula_latex")
    body = " ".join(piece.tex for piece in _rhs_pieces(formula))
    if not overlap:
        return body
    return f"{_overlap_tex(formula)} = {body}"


def latex_document(formula: Formula, *, title: str | None = None) -> str:
    r"""A complete LaTeX document (article, amsmath) showing the formula.

    A formula too wide for one line is broken between factors (and, for very
    long schemes, after commas of the bra-ket) in an ``align*`` environment;
    page breaks are allowed inside it.  ``title`` is plain text (special
    characters are escaped).

    >>> from recouple.recoupling.derive import derive
    >>> doc = latex_document(derive("((a,b)e,c)J", "(a,(b,c)f)J").formula, title="A & B")
    >>> doc.splitlines()[0], doc.count("Bmatrix") - 2, doc.rstrip().endswith(r"\end{document}")
    ('\\documentclass[11pt]{article}', 2, True)
    """
    require_formula(formula, "latex_document")
    lines = [
        r"\documentclass[11pt]{article}",
        r"\usepackage[a4paper,margin=2cm]{geometry}",
        r"\usepackage{amsmath}",
        r"\allowdisplaybreaks",
        r"\begin{document}",
    ]
    if title is not None:
        lines.append(r"\section*{" + _escape_text(title) + "}")
    lines += [r"\noindent " + CONVENTIONS_NOTE, ""]
    lines += _display(formula)
    lines += [r"\end{document}", ""]
    return "\n".join(lines)


# ---------------------------------------------------------------------------
# Pieces: one factor (or scheme fragment) with an estimated printed width.
# ---------------------------------------------------------------------------


@dataclass(frozen=True, slots=True)
class _Piece:
    tex: str
    width: float  # estimated, in em of the body font; only used to break lines
    keep_with_next: bool = False  # a sum sign never ends a line


# Rough glyph widths in em (common practice for estimating math; checked by
# compiling the long-formula document in tests/test_latex.py without overfull boxes).
_CHAR = 0.55
_SUB_CHAR = 0.42
_PUNCT = 0.4
_COLSEP = 0.95  # 2 * \arraycolsep (5pt) at 11pt
_BRACES = 1.2


def _label_width(name: str) -> float:
    base, sub, primes = subscript_split(name)
    return _CHAR * len(base) + _SUB_CHAR * len(sub) + 0.25 * primes


def _scheme_chunks(node: Node) -> list[str]:
    """The scheme's LaTeX cut after every comma (the places a long line may break)."""
    if isinstance(node, Leaf):
        return [label_latex(node.name)]
    assert isinstance(node, Coupling)
    left, right = _scheme_chunks(node.left), _scheme_chunks(node.right)
    left[0] = "(" + left[0]
    left[-1] += ","
    right[-1] += ")" + label_latex(node.label)
    return left + right


def _scheme_pieces(node: Node) -> list[_Piece]:
    chunks = _scheme_chunks(node)
    leaves = node.leaves()
    # Every chunk holds exactly one leaf; brackets close in post-order, the
    # order of internal_labels().
    pieces: list[_Piece] = []
    internal = iter(node.internal_labels())
    for chunk, leaf in zip(chunks, leaves, strict=True):
        closes = chunk.count(")")
        width = _label_width(leaf) + _PUNCT * (chunk.count("(") + closes + chunk.count(","))
        width += sum(_label_width(next(internal)) for _ in range(closes))
        pieces.append(_Piece(chunk, width))
    return pieces


def _overlap_tex(formula: Formula) -> str:
    return rf"\langle {scheme_latex(formula.bra)} \,|\, {scheme_latex(formula.ket)} \rangle"


def _exponent(phase: tuple[tuple[str, int], ...]) -> tuple[str, float]:
    """``a+2b-c``: coefficient 3 is written -1, since (-1)^(4j) = 1 (formula.py)."""
    parts: list[str] = []
    width = 0.0
    for label, c in phase:
        c = c if c != 3 else -1
        mag = abs(c)
        parts.append(("-" if c < 0 else "+") + ("" if mag == 1 else str(mag)) + label_latex(label))
        width += 0.8 * (_label_width(label) + _CHAR * (mag != 1) + 0.8)
    text = "".join(parts)
    return (text[1:] if text.startswith("+") else text), width


def _dims(labels: list[tuple[str, int]]) -> tuple[str, float]:
    """``(2e+1)(2f+1)^{2}`` for (label, power) pairs."""
    tex = ""
    width = 0.0
    for label, k in labels:
        tex += f"(2{label_latex(label)}+1)" + (f"^{{{k}}}" if k != 1 else "")
        width += _label_width(label) + 2.9 + 0.4 * (k != 1)
    return tex, width


def _hat_pieces(hats: tuple[tuple[str, int], ...]) -> list[_Piece]:
    r"""``(2x+1)^(p/2)`` factors: whole powers plainly, half powers under one ``\sqrt``.

    Negative powers (not produced by the moves, but allowed by the value type)
    go to a denominator, so the printed value is always the stored one.
    """
    up = [(label, p) for label, p in hats if p > 0]
    down = [(label, -p) for label, p in hats if p < 0]

    def part(items: list[tuple[str, int]]) -> tuple[list[tuple[str, str, float]], str, float]:
        whole = [(label, p // 2) for label, p in items if p // 2]
        root = [(label, 1) for label, p in items if p % 2]
        out: list[tuple[str, str, float]] = []
        for label, k in whole:
            tex, width = _dims([(label, k)])
            out.append((label, tex, width))
        root_tex, root_width = _dims(root)
        return out, (rf"\sqrt{{{root_tex}}}" if root else ""), root_width + 0.9 * bool(root)

    whole_up, root_up, root_up_w = part(up)
    if not down:
        pieces = [_Piece(tex, w) for _, tex, w in whole_up]
        if root_up:
            pieces.append(_Piece(root_up, root_up_w))
        return pieces
    whole_down, root_down, root_down_w = part(down)
    num = " ".join([tex for _, tex, _ in whole_up] + ([root_up] if root_up else [])) or "1"
    den = " ".join([tex for _, tex, _ in whole_down] + ([root_down] if root_down else []))
    width = max(
        sum(w for *_, w in whole_up) + root_up_w, sum(w for *_, w in whole_down) + root_down_w
    )
    return [_Piece(rf"\frac{{{num}}}{{{den}}}", width + 0.5)]


def _symbol_piece(entries: tuple[str, ...]) -> _Piece:
    rows = [entries[i : i + 3] for i in range(0, len(entries), 3)]
    body = r" \\ ".join(" & ".join(label_latex(x) for x in row) for row in rows)
    columns = [max(_label_width(row[k]) for row in rows) for k in range(3)]
    width = sum(columns) + 2 * _COLSEP + _BRACES
    return _Piece(rf"\begin{{Bmatrix}} {body} \end{{Bmatrix}}", width)


def _rhs_pieces(formula: Formula) -> list[_Piece]:
    """The factors in reading order (sign first, glued to the first factor)."""
    pieces: list[_Piece] = []
    for a, b in formula.deltas:
        pieces.append(
            _Piece(
                rf"\delta_{{{label_latex(a)},{label_latex(b)}}}",
                0.6 + 0.7 * (_label_width(a) + _label_width(b)) + 0.3,
            )
        )
    if formula.sums:
        names = ",".join(label_latex(x) for x in formula.sums)
        width = max(1.4, 0.7 * sum(_label_width(x) + 0.3 for x in formula.sums))
        pieces.append(_Piece(rf"\sum_{{{names}}}", width, keep_with_next=True))
    if formula.phase:
        exponent, width = _exponent(formula.phase)
        pieces.append(_Piece(f"(-1)^{{{exponent}}}", 2.0 + width))
    pieces += _hat_pieces(formula.hats)
    pieces += [_symbol_piece(s) for s in formula.sixjs]
    pieces += [_symbol_piece(n) for n in formula.ninejs]
    if not pieces:
        pieces.append(_Piece("1", _CHAR))
    if formula.constant % 2:
        pieces[0] = _Piece("-" + pieces[0].tex, pieces[0].width + 0.8)
    return pieces


# ---------------------------------------------------------------------------
# The display of the standalone document.
# ---------------------------------------------------------------------------

#: Estimated usable line width in em: 17 cm of text at 11pt is about 44 em;
#: the margin covers the roughness of the width estimates.
_LINE = 34.0
_LHS_SHARE = 0.4  # a left-hand side wider than this share of a line gets its own lines


def _fill(pieces: list[_Piece], room: float) -> list[list[_Piece]]:
    """Greedy line filling; a piece wider than ``room`` still gets a line of its own."""
    lines: list[list[_Piece]] = [[]]
    used = 0.0
    for piece in pieces:
        gap = 0.3 if lines[-1] else 0.0
        if lines[-1] and used + gap + piece.width > room:
            lines.append([])
            used, gap = 0.0, 0.0
        lines[-1].append(piece)
        used += gap + piece.width
    return lines


def _glue(pieces: list[_Piece]) -> list[_Piece]:
    """Merge each piece marked ``keep_with_next`` into the piece after it."""
    out: list[_Piece] = []
    for piece in pieces:
        if out and out[-1].keep_with_next:
            last = out.pop()
            piece = _Piece(f"{last.tex} {piece.tex}", last.width + 0.3 + piece.width)
        out.append(piece)
    return out


def _display(formula: Formula) -> list[str]:
    rhs = _glue(_rhs_pieces(formula))
    bra, ket = _scheme_pieces(formula.bra), _scheme_pieces(formula.ket)
    bra_w, ket_w = sum(p.width for p in bra), sum(p.width for p in ket)
    lhs_w = bra_w + ket_w + 2.0
    rhs_w = sum(p.width + 0.3 for p in rhs)
    body = " ".join(p.tex for p in rhs)
    if lhs_w + 1.5 + rhs_w <= _LINE:
        return [r"\begin{equation*}", f"{_overlap_tex(formula)} = {body}", r"\end{equation*}"]

    out = [r"\begin{align*}"]
    if lhs_w <= _LHS_SHARE * _LINE:
        # lhs &= first factors \\ &\quad \times more factors
        first, *rest = _fill(rhs, _LINE - lhs_w - 1.5)
        out.append(f"{_overlap_tex(formula)} &= {_join(first)}")
        rest_lines = _fill([p for line in rest for p in line], _LINE - lhs_w - 2.5)
        out += [rf"\\ &\quad \times {_join(line)}" for line in rest_lines if line]
    else:
        # the bra-ket on lines of its own, broken after commas if it must be
        chunks = [_Piece(r"\langle " + bra[0].tex, bra[0].width + 0.5), *bra[1:]]
        chunks[len(bra) - 1] = _Piece(chunks[len(bra) - 1].tex + r" \,|\, ", bra[-1].width + 0.7)
        chunks += ket[:-1] + [_Piece(ket[-1].tex + r" \rangle", ket[-1].width + 0.5)]
        lhs_lines = _fill(chunks, _LINE)
        out.append("&" + _join(lhs_lines[0], ""))
        out += [rf"\\ &\qquad {_join(line, '')}" for line in lhs_lines[1:]]
        first, *rest = _fill(rhs, _LINE - 2.0)
        out.append(rf"\\ &= {_join(first)}")
        rest_lines = _fill([p for line in rest for p in line], _LINE - 3.0)
        out += [rf"\\ &\quad \times {_join(line)}" for line in rest_lines if line]
    out.append(r"\end{align*}")
    return out


def _join(line: list[_Piece], sep: str = " ") -> str:
    return sep.join(p.tex for p in line)


_TEXT_ESCAPES = {
    "\\": r"\textbackslash{}",
    "{": r"\{",
    "}": r"\}",
    "$": r"\$",
    "&": r"\&",
    "#": r"\#",
    "^": r"\^{}",
    "_": r"\_",
    "%": r"\%",
    "~": r"\textasciitilde{}",
}


def _escape_text(text: str) -> str:
    """Plain text for a LaTeX paragraph; one line only (a title)."""
    if not isinstance(text, str) or "\n" in text or "\r" in text:
        raise BadValue(f"a document title must be one line of text, got {text!r}")
    return "".join(_TEXT_ESCAPES.get(ch, ch) for ch in text)
