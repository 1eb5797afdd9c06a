"""Plain-text rendering of formulas, for terminals and logs.

Symbols are written ``{a b e; c J f}`` (6j) and ``{a b e; c d f; g h J}`` (9j),
rows separated by semicolons; phases ``(-1)^(a+b-e)``; factors
``sqrt((2e+1)(2f+1))`` and ``(2x1+1)``; Kronecker deltas ``delta(J,J')``.

>>> from recouple.recoupling.derive import derive
>>> print(formula_text(derive("((a,b)e,c)J", "(a,(b,c)f)J").formula))
<((a,b)e,c)J|(a,(b,c)f)J> = (-1)^(a+b+c+J) sqrt((2e+1)(2f+1)) {a b e; c J f}
"""

from __future__ import annotations

from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from recouple.recoupling.formula import Formula

__all__ = ["exponent_text", "factor_texts", "formula_text"]


def require_formula(value: object, where: str) -> None:
    """Refuse anything but a :class:`Formula` at a writer's door, in one line
    (a wrong object would otherwise fail deep inside with an AttributeError).

    >>> require_formula(None, "latex_document")
    Traceback (most recent call last):
    ...
    TypeError: latex_document needs a Formula (such as derive(...).formula), got NoneType
    """
    from recouple.recoupling.formula import Formula  # writers sit above the formula layer

    if not isinstance(value, Formula):
        raise TypeError(
            f"{where} needs a Formula (such as derive(...).formula), got {type(value).__name__}"
        )


def exponent_text(phase: tuple[tuple[str, int], ...], constant: int = 0) -> str:
    """The exponent of a phase, e.g. ``a+b-e`` (coefficient 3 is written as -1: (-1)^(4j) = 1).

    >>> exponent_text((("a", 1), ("b", 2), ("c", 3)), 1)
    'a+2b-c+1'
    """
    parts: list[str] = []
    for label, c in phase:
        c = c if c != 3 else -1
        sign = "-" if c < 0 else "+"
        mag = abs(c)
        parts.append(f"{sign}{'' if mag == 1 else mag}{label}")
    if constant % 2:
        parts.append("+1")
    text = "".join(parts)
    return text[1:] if text.startswith("+") else text


def factor_texts(formula: Formula) -> list[str]:
    """The factors of one term in print order: phase, (2x+1), sqrt(...), 6j, 9j."""
    out: list[str] = []
    if formula.phase:
        out.append(f"(-1)^({exponent_text(formula.phase)})")
    whole = [label for label, p in formula.hats if p > 0 for _ in range(p // 2)]
    under = [label for label, p in formula.hats if p > 0 and p % 2]
    out += [f"(2{label}+1)" for label in whole]
    if under:
        out.append("sqrt(" + "".join(f"(2{label}+1)" for label in under) + ")")
    # Negative powers (from 6j orthogonality, DLMF 34.5.14) are written as powers.
    out += [
        f"(2{label}+1)^({p // 2})" if p % 2 == 0 else f"(2{label}+1)^({p}/2)"
        for label, p in formula.hats
        if p < 0
    ]
    out += ["{{{} {} {}; {} {} {}}}".format(*s) for s in formula.sixjs]
    out += ["{{{} {} {}; {} {} {}; {} {} {}}}".format(*n) for n in formula.ninejs]
    return out


def formula_text(formula: Formula, *, with_overlap: bool = True) -> str:
    """The whole formula on one line, ``<bra|ket> = ...``."""
    parts: list[str] = []
    parts += [f"delta({a},{b})" for a, b in formula.deltas]
    if formula.sums:
        parts.append("sum_{" + ",".join(formula.sums) + "}")
    parts += factor_texts(formula)
    body = " ".join(parts) if parts else "1"
    if formula.constant % 2:
        body = "-" + body
    if not with_overlap:
        return body
    return f"<{formula.bra}|{formula.ket}> = {body}"
