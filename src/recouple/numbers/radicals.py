"""Exact numbers of the form ``sum_i q_i * sqrt(s_i)``: the value type of recouple.

Every Wigner symbol, phase and ``sqrt(2j+1)`` factor is such a number, with
rational ``q_i`` and square-free positive integers ``s_i``.  Sums of square
roots of distinct square-free integers are linearly independent over the
rationals (a classical result, common practice), so the canonical form
(terms sorted by radicand, no zero coefficients) is unique and ``==`` is exact.

>>> from fractions import Fraction
>>> r = Radical.sqrt(Fraction(3, 10))
>>> print(r, -r, r * r, r + Radical.sqrt(2))
sqrt(3/10) -sqrt(3/10) 3/10 sqrt(2) + sqrt(3/10)
>>> (Radical.sqrt(2) + Radical.sqrt(3)) * (Radical.sqrt(3) - Radical.sqrt(2)) == 1
True
>>> float(Radical.sqrt(2))
1.4142135623730951
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping
from fractions import Fraction
from typing import Any, SupportsIndex

from recouple.errors import BadValue
from recouple.numbers._integers import smallest_prime_factor, squarefree_split

__all__ = ["Radical"]

Term = tuple[int, Fraction]  # (square-free radicand, nonzero coefficient)
_ONE = Fraction(1)


def _as_fraction(value: object) -> Fraction | None:
    """An int or Fraction operand as a Fraction; None for anything else (floats too)."""
    if isinstance(value, Fraction):
        return value
    if isinstance(value, int) and not isinstance(value, bool):
        return Fraction(value)
    return None


class Radical:
    """An immutable exact number ``sum_i q_i * sqrt(s_i)``.

    Build one with ``Radical(3)``, ``Radical(Fraction(1, 2))``,
    ``Radical.sqrt(Fraction(3, 10))`` or ``Radical.from_terms({2: 1, 3: -1})``.
    Arithmetic with ``int``, ``Fraction`` and ``Radical`` stays exact; floats
    are refused (``TypeError``), since mixing them in would hide rounding.

    >>> x = Radical.from_terms({2: 1, 3: Fraction(-1, 2)})
    >>> x
    Radical.from_terms({2: 1, 3: Fraction(-1, 2)})
    >>> print(x * 2, x.is_rational, x.sign())
    2*sqrt(2) - sqrt(3) False 1
    >>> Radical(Fraction(1, 2)) == Fraction(1, 2), hash(Radical(5)) == hash(5)
    (True, True)
    """

    __slots__ = ("_terms",)
    _terms: tuple[Term, ...]

    # -- construction -------------------------------------------------------

    def __new__(cls, value: int | Fraction | Radical = 0) -> Radical:
        if isinstance(value, Radical):
            return value  # immutable, so sharing is safe
        q = _as_fraction(value)
        if q is None:
            raise TypeError(f"Radical() takes an int, Fraction or Radical, got {value!r}")
        return _new(((1, q),) if q else ())

    @classmethod
    def sqrt(cls, x: int | Fraction) -> Radical:
        """The exact square root of a non-negative rational.

        >>> print(Radical.sqrt(12), Radical.sqrt(Fraction(5, 8)), Radical.sqrt(0))
        2*sqrt(3) (1/2)*sqrt(5/2) 0
        """
        q = _as_fraction(x)
        if q is None and isinstance(x, Radical) and x.is_rational:
            q = x.to_fraction()
        if q is None:
            raise TypeError(f"Radical.sqrt() takes an int or Fraction, got {x!r}")
        if q < 0:
            raise BadValue(f"square root of a negative number: {x!r}")
        if not q:
            return _ZERO
        # sqrt(n/d) = (rn / (rd * fd)) * sqrt(fn * fd); fn, fd coprime since n, d are.
        rn, fn = squarefree_split(q.numerator)
        rd, fd = squarefree_split(q.denominator)
        return _new(((fn * fd, Fraction(rn, rd * fd)),))

    @classmethod
    def signed_sqrt(cls, sign: int, x: int | Fraction) -> Radical:
        """``sign * sqrt(x)`` with ``sign`` in ``{-1, 0, 1}``.

        >>> print(Radical.signed_sqrt(-1, Fraction(1, 3)))
        -sqrt(1/3)
        """
        if sign not in (-1, 0, 1):
            raise BadValue(f"sign must be -1, 0 or 1, got {sign!r}")
        root = cls.sqrt(x)
        return -root if sign < 0 else (root if sign else _ZERO)

    @classmethod
    def from_terms(cls, terms: Mapping[int, int | Fraction]) -> Radical:
        """Build ``sum(q * sqrt(s) for s, q in terms.items())``.

        Radicands need not be square-free; square factors are pulled out.

        >>> print(Radical.from_terms({8: 1, 2: -1, 1: Fraction(1, 2)}))
        1/2 + sqrt(2)
        """
        acc: dict[int, Fraction] = {}
        for s, coef in terms.items():
            q = _as_fraction(coef)
            if q is None:
                raise TypeError(
                    f"coefficient of sqrt({s!r}) must be an int or Fraction, got {coef!r}"
                )
            if not isinstance(s, int) or isinstance(s, bool) or s < 1:
                raise BadValue(f"radicand must be a positive integer, got {s!r}")
            root, free = squarefree_split(s)
            acc[free] = acc.get(free, Fraction(0)) + q * root
        return _from_dict(acc)

    @classmethod
    def from_sympy(cls, expr: Any) -> Radical:
        """Convert a sympy number built from rationals and square roots of rationals.

        >>> import sympy
        >>> print(Radical.from_sympy(sympy.sqrt(6) / 4 + sympy.Rational(1, 3)))
        1/3 + (1/2)*sqrt(3/2)
        """
        import sympy

        total = _ZERO
        for term in sympy.Add.make_args(sympy.sympify(expr)):
            part = _ONE_R
            for factor in sympy.Mul.make_args(term):
                if factor.is_Rational:
                    part = part * Fraction(int(factor.p), int(factor.q))
                elif (
                    factor.is_Pow and factor.exp == sympy.Rational(1, 2) and factor.base.is_Rational
                ):
                    base = factor.base
                    part = part * cls.sqrt(Fraction(int(base.p), int(base.q)))
                else:
                    raise BadValue(f"not a sum of square roots of rationals: {expr!r}")
            total = total + part
        return total

    # -- read access ----------------------------------------------------------

    @property
    def terms(self) -> tuple[Term, ...]:
        """The canonical terms ``((s, q), ...)``, sorted by square-free radicand ``s``."""
        return self._terms

    @property
    def is_rational(self) -> bool:
        """True when the value is a rational number (no square roots left)."""
        t = self._terms
        return not t or (len(t) == 1 and t[0][0] == 1)

    def to_fraction(self) -> Fraction:
        """The value as a Fraction; :class:`~recouple.errors.BadValue` if irrational.

        >>> Radical(3).to_fraction()
        Fraction(3, 1)
        """
        t = self._terms
        if not t:
            return Fraction(0)
        if len(t) == 1 and t[0][0] == 1:
            return t[0][1]
        raise BadValue(f"{self} is irrational, not a fraction")

    def sqrt_parts(self) -> tuple[int, int, int, int, int]:
        """For a single term, ``(sign, p, q, a, b)`` with value ``sign*(p/q)*sqrt(a/b)``.

        ``a`` and ``b`` are coprime and square-free: the form the printers use.

        >>> Radical.sqrt(Fraction(3, 10)).sqrt_parts()
        (1, 1, 1, 3, 10)
        """
        t = self._terms
        if not t:
            return (0, 0, 1, 1, 1)
        if len(t) > 1:
            raise BadValue(f"{self} has more than one term")
        s, q = t[0]
        n, d = q.numerator, q.denominator
        # q^2 s = n^2 (s/g) / (g (d/g)^2) with g = gcd(s, d); s/g and g are square-free.
        g = math.gcd(s, d)
        return (1 if n > 0 else -1, abs(n), d // g, s // g, g)

    def sign(self) -> int:
        """-1, 0 or 1, exactly (multi-term sums are bounded rigorously).

        >>> (Radical.sqrt(2) - Radical(Fraction(140, 99))).sign()
        1
        """
        t = self._terms
        if not t:
            return 0
        if len(t) == 1:
            return 1 if t[0][1] > 0 else -1
        total, _ = _scaled_sum(t)
        return 1 if total > 0 else -1

    # -- arithmetic -------------------------------------------------------------

    def __add__(self, other: object) -> Radical:
        if isinstance(other, Radical):
            return _add(self._terms, other._terms)
        q = _as_fraction(other)
        if q is None:
            return NotImplemented
        return _add(self._terms, ((1, q),)) if q else self

    __radd__ = __add__

    def __sub__(self, other: object) -> Radical:
        if isinstance(other, Radical):
            return _add(self._terms, _neg(other._terms))
        q = _as_fraction(other)
        if q is None:
            return NotImplemented
        return _add(self._terms, ((1, -q),)) if q else self

    def __rsub__(self, other: object) -> Radical:
        q = _as_fraction(other)
        if q is None:
            return NotImplemented
        return _add(_neg(self._terms), ((1, q),))

    def __neg__(self) -> Radical:
        return _new(_neg(self._terms))

    def __pos__(self) -> Radical:
        return self

    def __abs__(self) -> Radical:
        return -self if self.sign() < 0 else self

    def __mul__(self, other: object) -> Radical:
        if isinstance(other, Radical):
            return _mul(self._terms, other._terms)
        q = _as_fraction(other)
        if q is None:
            return NotImplemented
        if not q:
            return _ZERO
        return _new(tuple((s, c * q) for s, c in self._terms))

    __rmul__ = __mul__

    def __truediv__(self, other: object) -> Radical:
        if isinstance(other, Radical):
            return _mul(self._terms, _inverse(other._terms))
        q = _as_fraction(other)
        if q is None:
            return NotImplemented
        if not q:
            raise ZeroDivisionError(f"division of {self} by zero")
        return _new(tuple((s, c / q) for s, c in self._terms))

    def __rtruediv__(self, other: object) -> Radical:
        q = _as_fraction(other)
        if q is None:
            return NotImplemented
        return _mul(((1, q),) if q else (), _inverse(self._terms))

    def __pow__(self, exponent: SupportsIndex) -> Radical:
        if isinstance(exponent, bool) or not isinstance(exponent, int):
            return NotImplemented
        base = self._terms
        if exponent < 0:
            base = _inverse(base)
            exponent = -exponent
        out: tuple[Term, ...] = ((1, _ONE),)
        while exponent:
            if exponent & 1:
                out = _mul(out, base)._terms
            exponent >>= 1
            if exponent:
                base = _mul(base, base)._terms
        return _new(out)

    # -- comparison and hashing ---------------------------------------------------

    def __eq__(self, other: object) -> bool:
        if isinstance(other, Radical):
            return self._terms == other._terms
        q = _as_fraction(other)
        if q is None:
            return NotImplemented
        t = self._terms
        if not t:
            return q == 0
        return len(t) == 1 and t[0][0] == 1 and t[0][1] == q

    def __hash__(self) -> int:
        if self.is_rational:
            return hash(self.to_fraction())
        return hash(("Radical", self._terms))

    def _cmp(self, other: object) -> int | None:
        if isinstance(other, Radical):
            return (self - other).sign()
        q = _as_fraction(other)
        if q is None:
            return None
        return (self - q).sign()

    def __lt__(self, other: object) -> bool:
        c = self._cmp(other)
        return NotImplemented if c is None else c < 0

    def __le__(self, other: object) -> bool:
        c = self._cmp(other)
        return NotImplemented if c is None else c <= 0

    def __gt__(self, other: object) -> bool:
        c = self._cmp(other)
        return NotImplemented if c is None else c > 0

    def __ge__(self, other: object) -> bool:
        c = self._cmp(other)
        return NotImplemented if c is None else c >= 0

    def __bool__(self) -> bool:
        return bool(self._terms)

    # -- conversion -------------------------------------------------------------

    def __float__(self) -> float:
        t = self._terms
        if not t:
            return 0.0
        if len(t) == 1:
            s, q = t[0]
            if s == 1:
                return float(q)
            # sqrt(q^2 s) from one correctly rounded division of integers: no cancellation.
            return _float_sqrt_ratio(q.numerator**2 * s, q.denominator**2) * (
                1.0 if q > 0 else -1.0
            )
        total, shift = _scaled_sum(t)
        return float(Fraction(total, 1 << shift)) if shift >= 0 else float(total << -shift)

    def to_sympy(self) -> Any:
        """The value as a sympy expression (sympy is imported here, not at module load).

        >>> Radical.sqrt(Fraction(3, 10)).to_sympy()
        sqrt(30)/10
        """
        import sympy

        return sympy.Add(
            *[sympy.Rational(q.numerator, q.denominator) * sympy.sqrt(s) for s, q in self._terms]
        )

    # -- text -------------------------------------------------------------------

    def __str__(self) -> str:
        t = self._terms
        if not t:
            return "0"
        pieces = [_term_text(s, q) for s, q in t]
        out = pieces[0]
        for piece in pieces[1:]:
            out += f" - {piece[1:]}" if piece.startswith("-") else f" + {piece}"
        return out

    def __repr__(self) -> str:
        t = self._terms
        if self.is_rational:
            return f"Radical({_coef_repr(self.to_fraction())})"
        inner = ", ".join(f"{s}: {_coef_repr(q)}" for s, q in t)
        return f"Radical.from_terms({{{inner}}})"

    # -- immutability and pickling ----------------------------------------------

    def __setattr__(self, name: str, value: object) -> None:
        raise AttributeError(f"Radical is immutable; cannot set {name!r}")

    def __delattr__(self, name: str) -> None:
        raise AttributeError(f"Radical is immutable; cannot delete {name!r}")

    def __reduce__(self) -> tuple[Any, tuple[tuple[Term, ...]]]:
        return (_rebuild, (self._terms,))

    def __copy__(self) -> Radical:
        return self

    def __deepcopy__(self, memo: object) -> Radical:
        return self


# -- private machinery ------------------------------------------------------------

# The slot's descriptor writes past the __setattr__ guard, for our constructors only.
_set_terms: Any = Radical.__dict__["_terms"].__set__


def _new(terms: tuple[Term, ...]) -> Radical:
    """Trusted constructor: ``terms`` must already be canonical (sorted, nonzero)."""
    obj = object.__new__(Radical)
    _set_terms(obj, terms)
    return obj


def _rebuild(terms: Iterable[tuple[int, Fraction]]) -> Radical:
    """Unpickling hook; re-normalises, so a tampered pickle cannot break the invariant."""
    return Radical.from_terms(dict(terms)) if terms else _ZERO


def radical_from_parts(coef: Fraction, radicand: int) -> Radical:
    """Trusted constructor for ``coef * sqrt(radicand)``, ``radicand`` square-free.

    Used by the symbol layer, which knows its radicands are square-free.

    >>> print(radical_from_parts(Fraction(-1, 2), 6))
    -sqrt(3/2)
    """
    return _new(((radicand, coef),)) if coef else _ZERO


def _from_dict(acc: dict[int, Fraction]) -> Radical:
    return _new(tuple(sorted((s, q) for s, q in acc.items() if q)))


def _neg(terms: tuple[Term, ...]) -> tuple[Term, ...]:
    return tuple((s, -q) for s, q in terms)


def _add(a: tuple[Term, ...], b: tuple[Term, ...]) -> Radical:
    if not a:
        return _new(b)
    if not b:
        return _new(a)
    if len(a) == 1 and len(b) == 1 and a[0][0] == b[0][0]:
        q = a[0][1] + b[0][1]
        return _new(((a[0][0], q),)) if q else _ZERO
    acc = dict(a)
    for s, q in b:
        acc[s] = acc[s] + q if s in acc else q
    return _from_dict(acc)


def _mul(a: tuple[Term, ...], b: tuple[Term, ...]) -> Radical:
    if not a or not b:
        return _ZERO
    if len(a) == 1 and len(b) == 1:
        (s1, q1), (s2, q2) = a[0], b[0]
        g = math.gcd(s1, s2)
        # sqrt(s1) sqrt(s2) = g sqrt(s1 s2 / g^2), and s1 s2 / g^2 is square-free.
        return _new((((s1 // g) * (s2 // g), q1 * q2 * g),))
    acc: dict[int, Fraction] = {}
    for s1, q1 in a:
        for s2, q2 in b:
            g = math.gcd(s1, s2)
            s = (s1 // g) * (s2 // g)
            q = q1 * q2 * g
            acc[s] = acc[s] + q if s in acc else q
    return _from_dict(acc)


def _inverse(terms: tuple[Term, ...]) -> tuple[Term, ...]:
    """Terms of ``1/x``, by conjugating away one prime at a time (common practice).

    With ``x = A + B sqrt(p)`` (A, B free of p), ``x (A - B sqrt p) = A^2 - p B^2``
    has no radicand divisible by ``p``; the conjugate is nonzero because distinct
    square-free roots are linearly independent.
    """
    if not terms:
        raise ZeroDivisionError("division by zero")
    if len(terms) == 1:
        s, q = terms[0]
        return ((s, 1 / (q * s)),)
    p = smallest_prime_factor(max(s for s, _ in terms))
    a = tuple((s, q) for s, q in terms if s % p)
    b = tuple((s // p, q) for s, q in terms if not s % p)
    conj = _add(a, _neg(_mul(b, ((p, _ONE),))._terms))._terms  # A - B sqrt(p)
    # A^2 - p B^2: B^2 has no sqrt(p), so multiplying by p only scales coefficients.
    norm = _add(_mul(a, a)._terms, tuple((s, -q * p) for s, q in _mul(b, b)._terms))._terms
    return _mul(conj, _inverse(norm))._terms


def _float_sqrt_ratio(num: int, den: int) -> float:
    """``sqrt(num/den)`` for positive ints, within about one ulp, for any size."""
    try:
        ratio = num / den  # correctly rounded by CPython, even for huge ints
    except OverflowError:
        ratio = math.inf
    if 2.2250738585072014e-308 <= ratio < math.inf:
        return math.sqrt(ratio)
    # Out of double range before the root: scale by an even power of two.
    shift = (den.bit_length() - num.bit_length()) // 2 * 2
    scaled = (num << shift) / den if shift >= 0 else num / (den << -shift)
    return math.ldexp(math.sqrt(scaled), -shift // 2)


def _scaled_sum(terms: tuple[Term, ...]) -> tuple[int, int]:
    """An integer ``N`` and shift ``k`` with ``|value - N / 2**k| <= n / 2**k`` and
    ``|N| >= 2**64 * n``, n the number of terms, so the sign of ``N`` is the sign of
    the value and ``N / 2**k`` has 64 correct bits.  Each term is
    ``floor(sqrt(q^2 s 4^k))`` exactly (integer square root), so cancellation
    between terms costs precision only in the retry loop, never silently.
    """
    n = len(terms)
    # Start with about 80 bits for the largest term.
    big = max(
        q.numerator.bit_length() - q.denominator.bit_length() + s.bit_length() // 2
        for s, q in terms
    )
    k = 80 - big
    while True:
        total = 0
        for s, q in terms:
            num, den = q.numerator * q.numerator * s, q.denominator * q.denominator
            if k >= 0:
                num <<= 2 * k
            else:
                den <<= -2 * k
            root = math.isqrt(num // den)
            total += root if q > 0 else -root
        if abs(total) >= n << 64:
            return total, k
        k += 64 + max(0, (n << 64).bit_length() - abs(total).bit_length())


def _coef_repr(q: Fraction) -> str:
    return str(q.numerator) if q.denominator == 1 else f"Fraction({q.numerator}, {q.denominator})"


def _term_text(s: int, q: Fraction) -> str:
    """``q*sqrt(s)`` written as ``+-(p1/q1)*sqrt(a/b)`` (see Radical.sqrt_parts)."""
    n, d = q.numerator, q.denominator
    sign = "-" if n < 0 else ""
    n = abs(n)
    if s == 1:
        return f"{sign}{n}" if d == 1 else f"{sign}{n}/{d}"
    g = math.gcd(s, d)
    a, b, q1 = s // g, g, d // g
    root = f"sqrt({a})" if b == 1 else f"sqrt({a}/{b})"
    if n == 1 and q1 == 1:
        return f"{sign}{root}"
    if q1 == 1:
        return f"{sign}{n}*{root}"
    return f"{sign}({n}/{q1})*{root}"


_ZERO = _new(())
_ONE_R = _new(((1, _ONE),))
