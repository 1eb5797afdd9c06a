"""Angular-momentum values: parsing, checking, and the doubled-integer form.

Internally every angular momentum ``j`` is carried as the integer ``2j``
("doubled"), so that half-integers need no fractions; the public face is a
:class:`~fractions.Fraction`.

>>> parse_spin("3/2"), to_doubled(1.5), spin_text(3)
(Fraction(3, 2), 3, '3/2')
>>> is_triad(2, 2, 4), is_triad(2, 1, 2), list(coupled_range(1, 2))
(True, False, [1, 3])
>>> parse_spin("1/3", name="j1")
Traceback (most recent call last):
...
recouple.errors.BadValue: value of 'j1' must be a non-negative integer or half-integer, got '1/3'
"""

from __future__ import annotations

import math
import numbers
from fractions import Fraction

from recouple.errors import BadValue

__all__ = [
    "MAX_SPIN",
    "coupled_range",
    "is_triad",
    "parse_projection",
    "parse_spin",
    "projections",
    "spin_text",
    "to_doubled",
]

#: The largest angular momentum accepted anywhere.  Exact symbols at this size
#: take seconds and factorial tables of several megabytes; nothing in practice
#: needs more.
MAX_SPIN = 1000


def _where(name: str | None, what: str) -> str:
    return f"value of {name!r}" if name is not None else what


_NUMERAL = frozenset("0123456789+-./eE")


def _to_fraction(value: object, *, name: str | None, what: str, rule: str) -> Fraction:
    """Read ``value`` as an exact number, refusing anything that is not one."""
    where = _where(name, what)
    if isinstance(value, bool):
        raise BadValue(f"{where} must be {rule}, got {value!r}")
    if isinstance(value, numbers.Rational):
        return Fraction(int(value.numerator), int(value.denominator))
    if isinstance(value, float):
        if not math.isfinite(value):
            raise BadValue(f"{where} must be {rule}, got {value!r}")
        return Fraction(value)
    if isinstance(value, str):
        text = value.strip()
        shown = repr(value) if len(value) <= 40 else repr(value[:37] + "...")
        # Only plain ASCII numerals: Fraction would also read "1_0" or other scripts' digits.
        if not text or any(ch not in _NUMERAL for ch in text):
            raise BadValue(f"{where} must be {rule}, got {shown}")
        digits = text.lstrip("+").lstrip("0")
        if digits.isdigit() and len(digits) > 6:  # also beyond Python's int-from-text limit
            raise BadValue(f"{where} is {shown}, above the limit MAX_SPIN = {MAX_SPIN}")
        try:
            out = Fraction(text)
        except (ValueError, ZeroDivisionError):
            raise BadValue(f"{where} must be {rule}, got {shown}") from None
        return out
    raise BadValue(f"{where} must be {rule} (a number or text such as '3/2'), got {value!r}")


def parse_spin(value: object, *, name: str | None = None) -> Fraction:
    """Read an angular momentum: a non-negative integer or half-integer.

    Accepts ``int``, ``Fraction``, text such as ``"3/2"``, ``"1.5"`` or
    ``" 2 "``, and a ``float`` only when it is exactly an integer or
    half-integer.  Refuses ``bool``, negative values, other fractions, NaN,
    infinities and values above :data:`MAX_SPIN`, with a one-line
    :class:`~recouple.errors.BadValue` naming ``name`` when given.

    >>> parse_spin(2), parse_spin("5/2"), parse_spin(" 0.5 ")
    (Fraction(2, 1), Fraction(5, 2), Fraction(1, 2))
    >>> parse_spin(-1, name="L")
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: value of 'L' must be a non-negative integer or half-integer, got -1
    """
    rule = "a non-negative integer or half-integer"
    out = _to_fraction(value, name=name, what="angular momentum", rule=rule)
    if out < 0 or out.denominator > 2:
        raise BadValue(f"{_where(name, 'angular momentum')} must be {rule}, got {value!r}")
    if out > MAX_SPIN:
        raise BadValue(
            f"{_where(name, 'angular momentum')} is {value!r}, "
            f"above the limit MAX_SPIN = {MAX_SPIN}"
        )
    return out


def parse_projection(value: object, *, name: str | None = None) -> Fraction:
    """Read a magnetic quantum number m: an integer or half-integer of either sign.

    Whether ``|m| <= j`` and ``j + m`` is an integer is a selection rule, checked
    by the symbols (which then give zero), not here.

    >>> parse_projection("-3/2"), parse_projection(0)
    (Fraction(-3, 2), Fraction(0, 1))
    >>> parse_projection("1/4", name="m1")
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: value of 'm1' must be an integer or half-integer, got '1/4'
    """
    rule = "an integer or half-integer"
    out = _to_fraction(value, name=name, what="projection", rule=rule)
    if out.denominator > 2:
        raise BadValue(f"{_where(name, 'projection')} must be {rule}, got {value!r}")
    if abs(out) > MAX_SPIN:
        raise BadValue(
            f"{_where(name, 'projection')} is {value!r}, beyond the limit MAX_SPIN = {MAX_SPIN}"
        )
    return out


def to_doubled(value: object, *, name: str | None = None) -> int:
    """``2j`` as an ``int``, after :func:`parse_spin`.

    >>> to_doubled("3/2"), to_doubled(4)
    (3, 8)
    """
    return int(2 * parse_spin(value, name=name))


def spin_text(doubled: int) -> str:
    """The usual written form of ``j = doubled / 2``.

    >>> spin_text(3), spin_text(4), spin_text(0), spin_text(-1)
    ('3/2', '2', '0', '-1/2')
    """
    if doubled % 2:
        return f"{doubled}/2"
    return str(doubled // 2)


def is_triad(da: int, db: int, dc: int) -> bool:
    """Triangle condition on doubled values (DLMF 34.2.1).

    ``|a - b| <= c <= a + b`` and ``a + b + c`` an integer.

    >>> is_triad(1, 1, 2), is_triad(1, 1, 1), is_triad(2, 2, 6)
    (True, False, False)
    """
    return (da + db + dc) % 2 == 0 and abs(da - db) <= dc <= da + db


def coupled_range(da: int, db: int) -> range:
    """Doubled values of ``c`` that ``a`` and ``b`` can couple to (step 2).

    >>> list(coupled_range(2, 3))
    [1, 3, 5]
    """
    return range(abs(da - db), da + db + 1, 2)


def projections(dj: int) -> range:
    """Doubled projections ``2m`` for ``m = -j, ..., j``.

    >>> list(projections(3))
    [-3, -1, 1, 3]
    """
    return range(-dj, dj + 1, 2)
