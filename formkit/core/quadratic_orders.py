"""Quadratic orders and fields as values: ``Order``, numbers of ``Q(√m)``, and how users write them.

An order ``O`` of a quadratic field ``K = Q(√m)`` (``m`` square-free, ``m ≠ 0, 1``) is
determined by its discriminant ``D = f²·d_K``, where ``d_K`` is the discriminant of ``K``
(``m`` if ``m ≡ 1 (mod 4)``, else ``4m``) and ``f`` the conductor: ``O = Z + f·O_K =
Z[f·ω_K]`` with ``ω_K = (1 + √m)/2`` or ``√m`` (Cox, *Primes of the Form x² + ny²*,
§7.A, Lemma 7.2).  This module gives

* :func:`parse_discriminant`: every way a user writes "the order I mean" — an integer
  expression (:func:`formkit.core.parse.parse_integer`), a field ``Q(sqrt(m))`` /
  ``Q(√m)`` (its maximal order), and a conductor (``, f=F`` after the text, or the
  ``conductor`` argument) — with errors that name the nearest meaning (``94`` → "the
  field Q(√94) has discriminant 376");
* :class:`Order`, the value type, with its unit group (``w`` for ``D < 0``; the
  fundamental unit written in ``Z[√m]`` or ``Z[(1+√m)/2]`` terms, its norm and the
  regulator to any precision for ``D > 0``) and the unit index ``[O_K* : O*]``;
* :meth:`Order.number` and :meth:`Order.element`, giving exact numbers of ``K``
  (:class:`formkit.core.quadratic_numbers.QuadraticNumber`); they read ``3 + 2√-5``, ``(1+sqrt(5))/2``, ``7*sqrt(-1)``…
  by hand and checks that the number lies in the order.

The numbers printed in field terms use ``√m`` (``2143295 + 221064√94``); internally
every number of ``K`` is ``(x + y√D)/(2z)`` with the order's own ``√D = s·√m``
(``s = f`` if ``d_K = m``, ``s = 2f`` if ``d_K = 4m``).

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §7.A (orders,
       conductor, Lemma 7.2) and Theorem 7.24 (the unit index in the class number formula).
.. [2] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993, §5.1–5.2 (discriminants and orders) and §5.7 (fundamental units).
"""

from __future__ import annotations

import re
from fractions import Fraction

from ..errors import DiscriminantError, NotInOrderError, ParseError
from .arith import as_int, gcd, is_square, isqrt
from .discriminants import (
    QuadraticUnit,
    discriminant_parts,
    fundamental_unit,
    squarefree_decomposition,
    unit_count,
    unit_index,
    validate_discriminant,
)
from .parse import MAX_TEXT, parse_integer
from .quadratic_numbers import QuadraticNumber, _ElementParser

__all__ = [
    "Order",
    "parse_discriminant",
    "field_discriminant",
]


_SPACE = " \t\n\r\f\v"


# -- fields -----------------------------------------------------------------------------------
def field_discriminant(m: object) -> int:
    """The discriminant of ``Q(√m)`` for a square-free ``m ≠ 0, 1``: ``m`` or ``4m``.

    Raises
    ------
    DiscriminantError
        If ``m`` is 0, 1 or not square-free (the message names ``Q(√m)`` written with
        the square-free part).

    Examples
    --------
    >>> field_discriminant(94), field_discriminant(-3), field_discriminant(5)
    (376, -3, 5)
    >>> field_discriminant(12)
    Traceback (most recent call last):
    ...
    formkit.errors.DiscriminantError: Q(√m) needs a square-free m ≠ 0, 1, not m = 12 = 2²·3: Q(√12) is the field Q(√3), of discriminant 12
    """
    m = as_int(m, "m")
    if m in (0, 1) or (m > 0 and is_square(m)):
        raise DiscriminantError(
            f"Q(√m) needs a square-free m ≠ 0, 1, not m = {m}: "
            + ("Q(√0) = Q" if m == 0 else f"√{m} = {int(isqrt(m))} is rational, so Q(√{m}) = Q")
            + " is not a quadratic field"
        )
    r, core = squarefree_decomposition(m)
    if r != 1:
        if core == 1:  # pragma: no cover - squares were refused above
            raise DiscriminantError(f"Q(√{m}) = Q is not a quadratic field")
        d = core if core % 4 == 1 else 4 * core
        raise DiscriminantError(
            f"Q(√m) needs a square-free m ≠ 0, 1, not m = {m} = {r}²·{core}: Q(√{m}) is the field "
            f"Q(√{core}), of discriminant {d}"
        )
    return m if m % 4 == 1 else 4 * m


def _check_discriminant(D: int, name: str) -> int:
    return validate_discriminant(D, name)


_FIELD_RE = re.compile(r"(?:Q|ℚ)\s*\(\s*(?:sqrt\s*\(|√)", re.ASCII | re.IGNORECASE)
_COND_RE = re.compile(r"\s*(?:f|conductor)\s*=\s*", re.ASCII)


def _split_top_level(text: str, sep: str) -> list[str]:
    parts, depth, start = [], 0, 0
    for i, ch in enumerate(text):
        if ch == "(":
            depth += 1
        elif ch == ")":
            depth -= 1
        elif ch == sep and depth == 0:
            parts.append(text[start:i])
            start = i + 1
    parts.append(text[start:])
    return parts


def _closing(text: str, start: int) -> int:
    """Index of the ')' closing the parenthesis opened just before ``start``, or -1."""
    depth = 1
    for i in range(start, len(text)):
        if text[i] == "(":
            depth += 1
        elif text[i] == ")":
            depth -= 1
            if depth == 0:
                return i
    return -1


def _parse_field(text: str, name: str) -> int:
    """``m`` from ``Q(sqrt(m))`` / ``Q(√m)`` / ``Q(√(m))`` (``m`` any integer expression)."""
    m = _FIELD_RE.match(text)
    if not m:  # pragma: no cover - callers check the prefix
        raise ParseError(f"{name}: {text!r} is not a field Q(sqrt(m))")
    rest = m.end()
    if text[m.end() - 1] == "(":  # sqrt( … )
        close = _closing(text, rest)
        if close < 0:
            raise ParseError(f"{name}: unbalanced parentheses in {text!r}")
        inner, after = text[rest:close], close + 1
    else:  # √ …  up to the ')' of Q(
        close = _closing(text, rest)
        if close < 0:
            raise ParseError(f"{name}: unbalanced parentheses in {text!r}")
        inner, after = text[rest:close], close
    tail = text[after:].strip(_SPACE)
    if tail != ")":
        raise ParseError(
            f"{name}: cannot read {text!r} as a field: expected ')' after the radicand, found {tail!r}; "
            "write Q(sqrt(m)) or Q(√m)"
        )
    return parse_integer(inner, f"{name} (the m of Q(√m))")


def parse_discriminant(text: object, name: str = "discriminant", *, conductor: object = None) -> int:
    """The discriminant ``D = f²·d_K`` of the order a user means by ``text``.

    Accepted (never evaluated, parsed by hand):

    * an integer expression in the number syntax of
      :func:`formkit.core.parse.parse_integer`: ``-23``, ``-4*3*10^2``, ``-3*4*37^2``,
      ``-(10^40+27)``; it must be a discriminant (≡ 0, 1 mod 4, not a square), and a
      number that is not gets an error naming the nearest meaning;
    * a field ``Q(sqrt(m))``, ``Q(√m)`` or ``Q(√(m))`` with a square-free integer
      expression ``m ≠ 0, 1``: its maximal order, of discriminant ``d_K``;
    * either of these followed by ``, f=F`` (or ``, conductor=F``): the order of
      conductor ``F`` in that field, discriminant ``F²·d_K``.  The first part must then
      be a field or a fundamental discriminant, so that ``F`` is the conductor itself.

    Parameters
    ----------
    text : str or int
        The text (an ``int`` is taken as a discriminant).
    name : str
        The argument's name in error messages.
    conductor : int or str, optional
        A conductor given separately (the command line's ``--conductor``); the same
        rule as ``, f=F``, which it must not be combined with.

    Returns
    -------
    int
        A validated discriminant.

    Raises
    ------
    ParseError
        If the text is in no accepted notation.
    DiscriminantError
        If the value is not a discriminant, ``m`` is not square-free, or a conductor is
        combined with a non-fundamental discriminant.

    Examples
    --------
    >>> parse_discriminant("-4*3*10^2"), parse_discriminant("Q(sqrt(94))"), parse_discriminant("Q(√-3), f=6")
    (-1200, 376, -108)
    >>> parse_discriminant("Q(sqrt(-1))", conductor=5), parse_discriminant(-23)
    (-100, -23)
    >>> parse_discriminant("94")
    Traceback (most recent call last):
    ...
    formkit.errors.DiscriminantError: discriminant must be ≡ 0 or 1 (mod 4), not 94 (≡ 2); the field Q(√94) has discriminant 376 (write Q(sqrt(94)) or 376)
    """
    if not isinstance(text, str):
        if conductor is None:
            return _check_discriminant(as_int(text, name), name)
        text = str(as_int(text, name))
    if len(text) > MAX_TEXT:
        raise ParseError(f"{name} is too long ({len(text)} characters, at most {MAX_TEXT})")
    parts = _split_top_level(text.strip(_SPACE), ",")
    if len(parts) > 2:
        raise ParseError(
            f"{name}: cannot read {text!r}: expected a discriminant, a field Q(sqrt(m)), "
            "optionally followed by ', f=F'"
        )
    base_text = parts[0].strip(_SPACE)
    f_text: object = None
    if len(parts) == 2:
        m = _COND_RE.match(parts[1])
        if not m:
            raise ParseError(
                f"{name}: cannot read {parts[1].strip()!r} in {text!r}: after the comma write f=F "
                "(the conductor), as in 'Q(sqrt(-3)), f=6'"
            )
        f_text = parts[1][m.end() :]
    if f_text is not None and conductor is not None:
        raise ParseError(f"{name}: the conductor is given twice ({text!r} and --conductor {conductor})")
    if conductor is not None:
        f_text = conductor
    if _FIELD_RE.match(base_text):
        m_value = _parse_field(base_text, name)
        d_K = field_discriminant(m_value)
        base_is_field = True
    else:
        try:
            value = parse_integer(base_text, name)
        except ParseError as exc:
            raise ParseError(
                f"{exc}; a discriminant may also be written as a field Q(sqrt(m)) or Q(√m), "
                "optionally followed by ', f=F'"
            ) from None
        d_K = _check_discriminant(value, name)
        base_is_field = False
    if f_text is None:
        return d_K
    f = parse_integer(f_text, "conductor") if isinstance(f_text, str) else as_int(f_text, "conductor")
    if f < 1:
        raise DiscriminantError(f"the conductor must be a positive integer, not {f}")
    if not base_is_field:
        fund, f0 = discriminant_parts(d_K)
        if f0 != 1:
            raise DiscriminantError(
                f"a conductor needs a field or a fundamental discriminant beside it, not {d_K} = "
                f"{f0}²·({fund}) (which already has conductor {f0}); write {fund}, f={f * f0} for the order "
                f"of conductor {f * f0}, or give the discriminant {f * f * d_K} itself"
            )
    return d_K * f * f


# -- the order ----------------------------------------------------------------------------------
class Order:
    """The quadratic order ``O = Z + f·O_K`` of discriminant ``D = f²·d_K`` in ``K = Q(√m)``.

    A small immutable, hashable value.  Build it from a discriminant, from text
    (:meth:`from_text`, the syntax of :func:`parse_discriminant`) or from a field
    (:meth:`of_field`).  The unit group is available without any class-group work:
    :attr:`unit_count` (``w``, ``D < 0``), :meth:`fundamental_unit`, :meth:`regulator`
    and :attr:`unit_index` ``[O_K* : O*]``.  The class number formula, the class group
    and the map ``Cl(O) → Cl(O_K)`` live one layer up
    (:func:`formkit.classgroups.orders.order_class_number`).

    Examples
    --------
    >>> O = Order.from_text("Q(sqrt(94))")
    >>> O
    Order(D=376: the maximal order Z[√94] of Q(√94))
    >>> O.fundamental_unit_text(), O.fundamental_unit().norm
    ('2143295 + 221064√94', 1)
    >>> Order(-108).ring_text, Order(-108).conductor, Order(-108).unit_index
    ('Z[3√-3]', 6, 3)
    """

    __slots__ = ("_D", "_dK", "_f", "_m")
    _D: int
    _dK: int
    _f: int
    _m: int

    def __init__(self, D: object) -> None:
        D = _check_discriminant(as_int(D, "discriminant"), "discriminant")
        d_K, f = discriminant_parts(D)
        object.__setattr__(self, "_D", D)
        object.__setattr__(self, "_dK", d_K)
        object.__setattr__(self, "_f", f)
        object.__setattr__(self, "_m", d_K if d_K % 4 == 1 else d_K // 4)

    def __setattr__(self, name: str, value: object) -> None:
        raise AttributeError("Order is immutable")

    def __reduce__(self):
        return (Order, (self._D,))

    @classmethod
    def from_text(cls, text: object, *, conductor: object = None) -> Order:
        """The order written as ``text`` (see :func:`parse_discriminant`)."""
        return cls(parse_discriminant(text, conductor=conductor))

    @classmethod
    def of_field(cls, m: object, conductor: object = 1) -> Order:
        """The order of conductor ``conductor`` in ``Q(√m)`` (``m`` square-free)."""
        f = as_int(conductor, "conductor")
        if f < 1:
            raise DiscriminantError(f"the conductor must be a positive integer, not {f}")
        return cls(field_discriminant(m) * f * f)

    # -- invariants -------------------------------------------------------------------------------
    @property
    def discriminant(self) -> int:
        """``D = f²·d_K``."""
        return self._D

    @property
    def fundamental_discriminant(self) -> int:
        """``d_K``, the discriminant of the field."""
        return self._dK

    @property
    def conductor(self) -> int:
        """``f = [O_K : O]``."""
        return self._f

    @property
    def radicand(self) -> int:
        """The square-free ``m`` with ``K = Q(√m)``."""
        return self._m

    @property
    def field_text(self) -> str:
        """``'Q(√m)'``."""
        return f"Q(√{self._m})"

    @property
    def is_maximal(self) -> bool:
        """True when ``f = 1`` (``O = O_K``)."""
        return self._f == 1

    @property
    def is_imaginary(self) -> bool:
        """True when ``D < 0``."""
        return self._D < 0

    def maximal_order(self) -> Order:
        """``O_K``."""
        return Order(self._dK)

    @property
    def ring_text(self) -> str:
        """The order as ``Z[θ]``: ``Z[√94]``, ``Z[(1+√5)/2]``, ``Z[3√-3]``, ``Z[(1+3√-3)/2]``."""
        f, m = self._f, self._m
        if self._dK % 4 == 1:
            if f % 2 == 0:  # f(1+√m)/2 ≡ (f/2)√m mod Z
                return f"Z[{_coef(f // 2)}√{m}]"
            return f"Z[(1+{_coef(f)}√{m})/2]"
        return f"Z[{_coef(f)}√{m}]"

    def describe(self) -> str:
        """One line: ``'the order Z[3√-3] of conductor 6 in Q(√-3)'``."""
        if self.is_maximal:
            return f"the maximal order {self.ring_text} of {self.field_text}"
        return f"the order {self.ring_text} of conductor {self._f} in {self.field_text}"

    # -- units ------------------------------------------------------------------------------------
    @property
    def unit_count(self) -> int:
        """``w``: the number of units (``D < 0`` only: 6, 4 or 2)."""
        return unit_count(self._D)

    @property
    def unit_index(self) -> int:
        """``[O_K* : O*]`` (Cox, Theorem 7.24; for ``D > 0`` the least ``k`` with ``ε_K^k ∈ O``)."""
        return unit_index(self._D)

    def fundamental_unit(self) -> QuadraticUnit:
        """The fundamental unit ``ε > 1`` of ``O`` (``D > 0``), as ``(t + u√D)/2``."""
        return fundamental_unit(self._D)

    def fundamental_unit_number(self) -> QuadraticNumber:
        """The fundamental unit as a :class:`QuadraticNumber`."""
        e = self.fundamental_unit()
        return QuadraticNumber(self._D, e.t, e.u)

    def fundamental_unit_text(self) -> str:
        """The fundamental unit written in ``√m``: ``'2143295 + 221064√94'``, ``'(1 + √5)/2'``."""
        return self.fundamental_unit_number().text()

    def fundamental_unit_basis(self) -> tuple[int, int]:
        """``(a, b)`` with ``ε = a + b·ω_K`` (``ω_K = (1+√m)/2`` or ``√m``): ``Z[ω_K]`` coordinates."""
        p, q, _m = self.fundamental_unit_number().field_terms()
        if self._dK % 4 == 1:  # p + q√m = (p − q) + 2q·(1+√m)/2
            return int(p - q), int(2 * q)
        return int(p), int(q)

    def regulator(self, digits: int = 30):
        """``R = log ε`` to ``digits`` significant digits (mpmath, verified at higher precision)."""
        return self.fundamental_unit().regulator(digits)

    # -- elements ---------------------------------------------------------------------------------
    def number(self, text: object, name: str = "number") -> QuadraticNumber:
        """A number of ``K`` read from text (``3 + 2√-5``, ``(1+sqrt(5))/2``) or an integer.

        Square roots ``√n`` may use any ``n = r²·m``; ``^`` takes small non-negative
        integer exponents; ``/`` divides by rational numbers only.  Parsed by hand.
        """
        if isinstance(text, QuadraticNumber):
            if text.discriminant != self._D:
                p, q, _m = text.field_terms()
                return self._from_field_terms(p, q, name)
            return text
        if not isinstance(text, str):
            n = as_int(text, name)
            return QuadraticNumber(self._D, 2 * n, 0)
        if len(text) > MAX_TEXT:
            raise ParseError(f"{name} is too long ({len(text)} characters, at most {MAX_TEXT})")
        p, q = _ElementParser(text.strip(_SPACE), self._m, name).parse()
        return self._from_field_terms(p, q, name)

    def _from_field_terms(self, p: Fraction, q: Fraction, name: str) -> QuadraticNumber:
        s = self._f if self._dK % 4 == 1 else 2 * self._f  # √m = √D / s
        X, Y = 2 * p, Fraction(2 * q, s)
        den = X.denominator * Y.denominator // gcd(X.denominator, Y.denominator)
        return QuadraticNumber(self._D, int(X * den), int(Y * den), den)

    def element(self, text: object, name: str = "element") -> QuadraticNumber:
        """Like :meth:`number`, and the number must lie in the order.

        Raises
        ------
        NotInOrderError
            If it does not, naming the number, the order and the rule.

        Examples
        --------
        >>> Order(-12).element("1 + √-3")
        QuadraticNumber(D=-12, 1 + √-3)
        >>> Order(-12).element("(1 + √-3)/2")
        Traceback (most recent call last):
        ...
        formkit.errors.NotInOrderError: element (1 + √-3)/2 is not in the order Z[√-3] of conductor 2 in Q(√-3): its coordinates on 1, √-3 are 1/2, 1/2, not integers
        """
        a = self.number(text, name)
        if not a.in_order():
            raise NotInOrderError(f"{name} {a.text()} is not in {self.describe()}: {self._why_not(a)}")
        return a

    def _why_not(self, a: QuadraticNumber) -> str:
        p, q, _m = a.field_terms()
        f = self._f
        theta = self.ring_text[2:-1]
        if self._dK % 4 == 1 and f % 2 == 1:  # θ = (1 + f√m)/2: p + q√m = (p − q/f) + (2q/f)·θ
            v = 2 * q / f
            cu, cv = p - v / 2, v
        else:  # θ = s·√m with s = f/2 or f
            s = f // 2 if self._dK % 4 == 1 else f
            cu, cv = p, q / s
        return f"its coordinates on 1, {theta} are {_frac(cu)}, {_frac(cv)}, not integers"

    # -- output -----------------------------------------------------------------------------------
    def to_dict(self) -> dict:
        """JSON-ready: ``discriminant``, ``fundamental_discriminant``, ``conductor``, ``field``, ``ring``."""
        return {
            "discriminant": self._D,
            "fundamental_discriminant": self._dK,
            "conductor": self._f,
            "field": self.field_text,
            "field_radicand": self._m,
            "ring": self.ring_text,
        }

    def __repr__(self) -> str:
        return f"Order(D={self._D}: {self.describe()})"

    def _repr_latex_(self) -> str:
        ring = self.ring_text.replace("√", r"\sqrt{").replace("Z[", r"\mathbb{Z}[")
        ring = re.sub(r"\\sqrt\{(-?[0-9]+)", r"\\sqrt{\1}", ring)
        text = rf"\mathcal{{O}} = {ring} \subseteq \mathbb{{Q}}(\sqrt{{{self._m}}}),\ D = {self._D} = "
        text += rf"{self._f}^2 \cdot ({self._dK})" if self._f > 1 else r"d_K"
        return f"${text}$"

    def _repr_html_(self) -> str:
        import html

        return (
            f"<b>order</b> {html.escape(self.ring_text)} in {html.escape(self.field_text)}: "
            f"discriminant D = {self._D}, conductor f = {self._f}, field discriminant d<sub>K</sub> = {self._dK}"
        )

    def __eq__(self, other: object) -> bool:
        if isinstance(other, Order):
            return self._D == other._D
        return NotImplemented

    def __hash__(self) -> int:
        return hash(("Order", self._D))


def _coef(n: int) -> str:
    return "" if n == 1 else str(n)


def _frac(x: Fraction) -> str:
    return str(x.numerator) if x.denominator == 1 else f"{x.numerator}/{x.denominator}"
