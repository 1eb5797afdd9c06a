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
import operator
from decimal import Decimal, InvalidOperation
from fractions import Fraction

from recouple.errors import BadValue

__all__ = [
    "MAX_SPIN",
    "check_doubled",
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

# A value written with an exponent whose size is beyond this (|x| >= 10^7 or
# 0 < |x| < 10^-6) is out of every range here, whatever its digits.
_EXPONENT_REACH = 6


def _shown(value: object) -> str:
    """``value`` as a message shows it: its repr, cut to about 40 characters.

    Never fails: the repr of an int with thousands of digits is refused by Python
    (``sys.get_int_max_str_digits``), so such a value is described instead.
    """
    if isinstance(value, str):
        return repr(value) if len(value) <= 40 else repr(value[:37] + "...")
    try:
        text = repr(value)
    except ValueError:
        return "a number with thousands of digits"
    return text if len(text) <= 40 else text[:37] + "..."


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
    if isinstance(value, Decimal):
        # through its text: an exponent far out of range is refused without building it
        return _exponent_form(str(value), where=where, rule=rule, shown=_shown(value))
    if isinstance(value, numbers.Real) and hasattr(value, "as_integer_ratio"):
        # other binary floats (numpy float32, longdouble, ...): their exact value
        try:
            num, den = value.as_integer_ratio()
        except (ValueError, OverflowError):  # nan, inf
            raise BadValue(f"{where} must be {rule}, got {_shown(value)}") from None
        return Fraction(num, den)
    if isinstance(value, str):
        text = value.strip()
        shown = _shown(value)
        # Only plain ASCII numerals: Fraction would also read "1_0" or other scripts' digits.
        if not text or any(ch not in _NUMERAL for ch in text):
            raise BadValue(f"{where} must be {rule}, got {shown}")
        digits = text.lstrip("+").lstrip("0")
        if digits.isdigit() and len(digits) > 6:  # also beyond Python's int-from-text limit
            raise BadValue(f"{where} is {shown}, above the limit MAX_SPIN = {MAX_SPIN}")
        if "e" in text or "E" in text:
            return _exponent_form(text, where=where, rule=rule, shown=shown)
        try:
            out = Fraction(text)
        except (ValueError, ZeroDivisionError):
            raise BadValue(f"{where} must be {rule}, got {shown}") from None
        return out
    raise BadValue(f"{where} must be {rule} (a number or text such as '3/2'), got {_shown(value)}")


def _exponent_form(text: str, *, where: str, rule: str, shown: str) -> Fraction:
    """Text such as ``5e-1`` or ``1e400`` as an exact number, in bounded time.

    ``Fraction("1e99999999999")`` builds 10**99999999999 in full and never
    returns; ``Decimal`` keeps the exponent apart, so its size is looked at
    first.  A value far out of range becomes a stand-in of the same sign that
    is out of range too (10^7 or 10^-7), so the callers' own checks word the
    message as they do for any other value.
    """
    try:
        dec = Decimal(text)
    except InvalidOperation:
        raise BadValue(f"{where} must be {rule}, got {shown}") from None
    if not dec.is_finite():  # a Decimal NaN or Infinity given as such
        raise BadValue(f"{where} must be {rule}, got {shown}")
    if dec.is_zero():
        return Fraction(0)
    sign = -1 if dec.is_signed() else 1
    if dec.adjusted() > _EXPONENT_REACH:
        return Fraction(sign * 10 ** (_EXPONENT_REACH + 1))
    if dec.adjusted() < -_EXPONENT_REACH:
        return Fraction(sign, 10 ** (_EXPONENT_REACH + 1))
    return Fraction(dec)


_DOUBLED_LIMIT = 2 * MAX_SPIN


def check_doubled(values: tuple[object, ...], names: str, spins: int) -> tuple[int, ...]:
    """Doubled arguments (``2j``, then ``2m``) as plain ints, or a one-line error.

    ``names`` are the argument names, space-separated; the first ``spins`` are
    angular momenta (``0 <= 2j <= 2 MAX_SPIN``), the rest projections
    (``|2m| <= 2 MAX_SPIN``).  Any integer type (numpy's included) is read by its
    value; ``bool``, floats and text are refused, since a doubled argument is a
    count, not a value to round.  The common case (plain ints in range) costs one
    pass.

    >>> check_doubled((2, 1, -1), "j m1 m2", 1)
    (2, 1, -1)
    >>> check_doubled((2, -2), "a b", 2)
    Traceback (most recent call last):
    ...
    recouple.errors.BadValue: doubled argument 'b' (2j) must be >= 0, got -2
    """
    limit = _DOUBLED_LIMIT
    for k, x in enumerate(values):
        if type(x) is not int or not (0 if k < spins else -limit) <= x <= limit:
            break
    else:
        return values  # type: ignore[return-value]  # every entry checked to be an int
    out = []
    for k, (x, name) in enumerate(zip(values, names.split(), strict=True)):
        what = f"doubled argument {name!r} ({'2j' if k < spins else '2m'})"
        if isinstance(x, bool) or not hasattr(type(x), "__index__"):
            raise BadValue(f"{what} must be an int, got {_shown(x)}")
        v = operator.index(x)  # type: ignore[arg-type]  # has __index__, checked above
        if k < spins and v < 0:
            raise BadValue(f"{what} must be >= 0, got {v}")
        if abs(v) > limit:
            raise BadValue(f"{what} is {_shown(v)}, above the limit 2 MAX_SPIN = {limit}")
        out.append(v)
    return tuple(out)


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
        raise BadValue(f"{_where(name, 'angular momentum')} must be {rule}, got {_shown(value)}")
    if out > MAX_SPIN:
        raise BadValue(
            f"{_where(name, 'angular momentum')} is {_shown(value)}, "
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
        raise BadValue(f"{_where(name, 'projection')} must be {rule}, got {_shown(value)}")
    if abs(out) > MAX_SPIN:
        raise BadValue(
            f"{_where(name, 'projection')} is {_shown(value)}, "
            f"beyond the limit MAX_SPIN = {MAX_SPIN}"
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
