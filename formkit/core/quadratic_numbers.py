"""Exact numbers ``(x + y√D)/(2z)`` of a quadratic field, and a hand-written reader for them.

A number of ``K = Q(√m)`` is kept in the coordinates of an order of discriminant
``D = f²·d_K``: ``(x + y√D)/(2z)`` with integers ``x, y`` and ``z > 0`` in lowest terms,
so that the elements of the order are exactly those with ``z = 1`` and ``x ≡ yD (mod 2)``
(the order is ``Z[(D + √D)/2]``; Cohen GTM 138, §5.1, from memory).  Printing uses the
field's ``√m`` (``3 + 2√-5``, ``(1 + √5)/2``).  The reader (:class:`_ElementParser`,
used by :meth:`formkit.core.quadratic_orders.Order.number`) parses ``+ - * / ^ ( )``,
integers and square roots ``√n`` / ``sqrt(n)`` with ``n = r²·m`` by recursive descent;
it never evaluates text.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993, §5.1 (quadratic orders and their elements).
"""

from __future__ import annotations

import re
from fractions import Fraction
from functools import total_ordering

from ..errors import FormkitError, NotInOrderError, ParseError
from .arith import as_int, gcd, is_square, isqrt
from .discriminants import discriminant_parts, validate_discriminant
from .parse import parse_integer

__all__ = ["QuadraticNumber"]

_SPACE = " \t\n\r\f\v"


@total_ordering
class QuadraticNumber:
    """An exact number ``(x + y√D)/(2z)`` of the field of the order of discriminant ``D``.

    ``z > 0`` and ``gcd(x, y, z)`` is 1 (kept in lowest terms).  Arithmetic with
    numbers of the same ``D`` and with integers is exact; ``norm`` and ``trace`` are
    :class:`fractions.Fraction`.

    Examples
    --------
    >>> a = QuadraticNumber(-20, 6, 2)      # (6 + 2√-20)/2 = 3 + 2√-5
    >>> a, a.norm, a.conjugate()
    (QuadraticNumber(D=-20, 3 + 2√-5), Fraction(29, 1), QuadraticNumber(D=-20, 3 - 2√-5))
    >>> a * a.conjugate() == 29
    True
    """

    __slots__ = ("_D", "_x", "_y", "_z")
    _D: int
    _x: int
    _y: int
    _z: int

    def __init__(self, D: object, x: object, y: object, z: object = 1) -> None:
        D = validate_discriminant(D)
        x, y, z = as_int(x, "x"), as_int(y, "y"), as_int(z, "z")
        if z == 0:
            raise FormkitError("the denominator z of (x + y√D)/(2z) must not be 0")
        if z < 0:
            x, y, z = -x, -y, -z
        g = gcd(gcd(x, y), z)
        if g > 1:
            x, y, z = x // g, y // g, z // g
        object.__setattr__(self, "_D", D)
        object.__setattr__(self, "_x", int(x))
        object.__setattr__(self, "_y", int(y))
        object.__setattr__(self, "_z", int(z))

    def __setattr__(self, name: str, value: object) -> None:
        raise AttributeError("QuadraticNumber is immutable")

    @property
    def discriminant(self) -> int:
        """The discriminant ``D`` whose ``√D`` the coordinates use."""
        return self._D

    @property
    def coordinates(self) -> tuple[int, int, int]:
        """``(x, y, z)`` with the number ``(x + y√D)/(2z)``."""
        return (self._x, self._y, self._z)

    @property
    def norm(self) -> Fraction:
        """``N(α) = α·ᾱ = (x² − D y²)/(4z²)``."""
        return Fraction(self._x * self._x - self._D * self._y * self._y, 4 * self._z * self._z)

    @property
    def trace(self) -> Fraction:
        """``α + ᾱ = x/z``."""
        return Fraction(self._x, self._z)

    def conjugate(self) -> QuadraticNumber:
        """``ᾱ = (x − y√D)/(2z)``."""
        return QuadraticNumber(self._D, self._x, -self._y, self._z)

    def is_rational(self) -> bool:
        """True when ``y = 0``."""
        return self._y == 0

    def in_order(self) -> bool:
        """True when the number lies in the order of discriminant ``D``: ``z = 1`` and ``x ≡ yD (mod 2)``."""
        return self._z == 1 and (self._x - self._y * self._D) % 2 == 0

    def _coerce(self, other: object) -> QuadraticNumber:
        if isinstance(other, QuadraticNumber):
            if other._D != self._D:
                raise FormkitError(
                    f"numbers written over √{self._D} and √{other._D} cannot be combined; "
                    "use one order's coordinates"
                )
            return other
        n = as_int(other, "number")
        return QuadraticNumber(self._D, 2 * n, 0, 1)

    def __add__(self, other: object) -> QuadraticNumber:
        o = self._coerce(other)
        return QuadraticNumber(
            self._D, self._x * o._z + o._x * self._z, self._y * o._z + o._y * self._z, self._z * o._z
        )

    __radd__ = __add__

    def __neg__(self) -> QuadraticNumber:
        return QuadraticNumber(self._D, -self._x, -self._y, self._z)

    def __sub__(self, other: object) -> QuadraticNumber:
        return self + (-self._coerce(other))

    def __rsub__(self, other: object) -> QuadraticNumber:
        return self._coerce(other) - self

    def __mul__(self, other: object) -> QuadraticNumber:
        o = self._coerce(other)
        # (x1 + y1√D)(x2 + y2√D)/(4 z1 z2) = (X + Y√D)/(2Z) with Z = 2 z1 z2
        X = self._x * o._x + self._D * self._y * o._y
        Y = self._x * o._y + self._y * o._x
        return QuadraticNumber(self._D, X, Y, 2 * self._z * o._z)

    __rmul__ = __mul__

    def inverse(self) -> QuadraticNumber:
        """``1/α = ᾱ/N(α)``."""
        n = self.norm
        if n == 0:
            raise ZeroDivisionError("0 has no inverse")
        c = self.conjugate()
        return QuadraticNumber(self._D, c._x * n.denominator, c._y * n.denominator, c._z * n.numerator)

    def __truediv__(self, other: object) -> QuadraticNumber:
        return self * self._coerce(other).inverse()

    def __pow__(self, k: int) -> QuadraticNumber:
        k = as_int(k, "exponent")
        base = self if k >= 0 else self.inverse()
        result, k = QuadraticNumber(self._D, 2, 0, 1), abs(k)
        while k:
            if k & 1:
                result = result * base
            base = base * base
            k >>= 1
        return result

    def __eq__(self, other: object) -> bool:
        if isinstance(other, int):
            return self._y == 0 and self._x == 2 * other * self._z
        if not isinstance(other, QuadraticNumber):
            return NotImplemented
        return (self._D, self._x, self._y, self._z) == (other._D, other._x, other._y, other._z)

    def __lt__(self, other: QuadraticNumber) -> bool:  # an order for sorting only
        return (self._D, self._z, self._x, self._y) < (other._D, other._z, other._x, other._y)

    def __hash__(self) -> int:
        return hash(("QuadraticNumber", self._D, self._x, self._y, self._z))

    def field_terms(self) -> tuple[Fraction, Fraction, int]:
        """``(p, q, m)`` with the number ``p + q√m``, ``m`` square-free (``K = Q(√m)``)."""
        d_K, f = discriminant_parts(self._D)
        m = d_K if d_K % 4 == 1 else d_K // 4
        s = f if d_K % 4 == 1 else 2 * f  # √D = s·√m
        return Fraction(self._x, 2 * self._z), Fraction(self._y * s, 2 * self._z), m

    def text(self) -> str:
        """The number written with ``√m``: ``3 + 2√-5``, ``(1 + √5)/2``, ``-7√-1``."""
        p, q, m = self.field_terms()
        den = p.denominator * q.denominator // gcd(p.denominator, q.denominator)
        P, Q = int(p * den), int(q * den)
        body = _linear_text(P, Q, m)
        if den == 1:
            return body
        return f"({body})/{den}" if (P and Q) else f"{body}/{den}"

    def __str__(self) -> str:
        return self.text()

    def __repr__(self) -> str:
        return f"QuadraticNumber(D={self._D}, {self.text()})"

    def _repr_latex_(self) -> str:
        p, q, m = self.field_terms()
        den = p.denominator * q.denominator // gcd(p.denominator, q.denominator)
        P, Q = int(p * den), int(q * den)
        body = _linear_text(P, Q, m, latex=True)
        return f"${body}$" if den == 1 else rf"$\frac{{{body}}}{{{den}}}$"

    def _repr_html_(self) -> str:
        import html

        m = self.field_terms()[2]
        return f"{html.escape(self.text())} in Q(√{m}) (order of discriminant {self._D})"


def _linear_text(P: int, Q: int, m: int, *, latex: bool = False) -> str:
    root = rf"\sqrt{{{m}}}" if latex else f"√{m}"
    if Q == 0:
        return str(P)
    q = "" if abs(Q) == 1 else str(abs(Q))
    if P == 0:
        return f"{'-' if Q < 0 else ''}{q}{root}"
    return f"{P} {'-' if Q < 0 else '+'} {q}{root}"


_ELEM_TOKEN = re.compile(r"([0-9]+)|(\*\*)|(sqrt\s*\(|√)|([-+*/^()\u2212\u00d7\u00b7])", re.ASCII)


class _ElementParser:
    """Recursive descent over ``+ - * / ^ ( )``, integers and square roots; values ``p + q√m``."""

    def __init__(self, text: str, m: int, name: str) -> None:
        self.text, self.m, self.name = text, m, name
        self.tokens: list[tuple[str, str, int]] = []
        pos = 0
        while pos < len(text):
            if text[pos] in _SPACE:
                pos += 1
                continue
            mt = _ELEM_TOKEN.match(text, pos)
            if not mt:
                raise self.fail(f"unexpected character {text[pos]!r} at position {pos}")
            num, pw, root, op = mt.groups()
            if num is not None:
                self.tokens.append(("int", num, pos))
            elif pw is not None:
                self.tokens.append(("^", pw, pos))
            elif root is not None:
                self.tokens.append(("sqrt(" if root.endswith("(") else "√", root, pos))
            else:
                self.tokens.append(({"\u2212": "-", "\u00d7": "*", "\u00b7": "*"}.get(op, op), op, pos))
            pos = mt.end()
        self.i = 0
        self.depth = 0

    def fail(self, why: str) -> ParseError:
        return ParseError(
            f"{self.name}: cannot read {self.text!r} as a number of Q(√{self.m}): {why}; write it as "
            f"x + y√{self.m}, (x + y*sqrt({self.m}))/2 and the like"
        )

    def peek(self) -> str | None:
        return self.tokens[self.i][0] if self.i < len(self.tokens) else None

    def parse(self) -> tuple[Fraction, Fraction]:
        if not self.tokens:
            raise self.fail("the text is empty")
        v = self.expr()
        if self.i < len(self.tokens):
            raise self.fail(f"unexpected {self.tokens[self.i][1]!r} at position {self.tokens[self.i][2]}")
        return v

    def expr(self) -> tuple[Fraction, Fraction]:
        v = self.term()
        while self.peek() in ("+", "-"):
            op = self.tokens[self.i][0]
            self.i += 1
            w = self.term()
            v = (v[0] + w[0], v[1] + w[1]) if op == "+" else (v[0] - w[0], v[1] - w[1])
        return v

    def term(self) -> tuple[Fraction, Fraction]:
        v = self.unary()
        while self.peek() in ("*", "/", "√", "sqrt("):
            op = self.tokens[self.i][0]
            if op in ("*", "/"):
                self.i += 1
            else:  # 3√5: a coefficient written before a square root
                op = "*"
            w = self.unary()
            if op == "*":
                v = self.mul(v, w)
            else:
                if w[1] != 0 or w[0] == 0:
                    raise self.fail("division only by a non-zero rational number")
                v = (v[0] / w[0], v[1] / w[0])
        return v

    def mul(self, v, w):
        self.check_size(v, w)
        return (v[0] * w[0] + self.m * v[1] * w[1], v[0] * w[1] + v[1] * w[0])

    def check_size(self, *values) -> None:
        bits = sum(
            max(abs(c.numerator).bit_length() + c.denominator.bit_length() for c in v) + 4 for v in values
        )
        if bits > 4 * 10**5:
            raise self.fail("the number is too large (more than about 120 000 digits)")

    def unary(self) -> tuple[Fraction, Fraction]:
        if self.peek() in ("+", "-"):
            op = self.tokens[self.i][0]
            self.i += 1
            v = self.unary()
            return (-v[0], -v[1]) if op == "-" else v
        return self.power()

    def power(self) -> tuple[Fraction, Fraction]:
        v = self.atom()
        if self.peek() != "^":
            return v
        self.i += 1
        if self.peek() != "int":
            raise self.fail("an exponent must be a non-negative integer")
        e = int(self.tokens[self.i][1]) if len(self.tokens[self.i][1]) < 6 else 10**6
        self.i += 1
        if e > 10**4:
            raise self.fail(f"exponent {e} is larger than 10000")
        result = (Fraction(1), Fraction(0))
        base = v
        while e:
            if e & 1:
                result = self.mul(result, base)
            e >>= 1
            if e:
                base = self.mul(base, base)
        return result

    def atom(self) -> tuple[Fraction, Fraction]:
        kind = self.peek()
        if kind == "int":
            v = (Fraction(parse_integer(self.tokens[self.i][1], self.name)), Fraction(0))
            self.i += 1
            return v
        if kind == "(":
            self.i += 1
            self.depth += 1
            if self.depth > 100:
                raise self.fail("more than 100 nested parentheses")
            v = self.expr()
            if self.peek() != ")":
                raise self.fail("expected ')'")
            self.i += 1
            self.depth -= 1
            return v
        if kind in ("√", "sqrt("):
            self.i += 1
            if kind == "sqrt(":
                n = self.radicand_until_close()
            elif self.peek() == "(":
                self.i += 1
                n = self.radicand_until_close()
            else:
                sign = 1
                if self.peek() in ("-", "+"):
                    sign = -1 if self.tokens[self.i][0] == "-" else 1
                    self.i += 1
                if self.peek() != "int":
                    raise self.fail("√ must be followed by an integer or a parenthesis")
                n = sign * parse_integer(self.tokens[self.i][1], self.name)
                self.i += 1
            return self.root(n)
        raise self.fail("expected a number, √ or '('" if kind is None else f"unexpected {kind!r}")

    def radicand_until_close(self) -> int:
        # the radicand: an integer expression up to the matching ')'
        start = self.i
        depth = 1
        while self.i < len(self.tokens):
            t = self.tokens[self.i][0]
            if t in ("(", "sqrt("):
                depth += 1
            elif t == ")":
                depth -= 1
                if depth == 0:
                    break
            self.i += 1
        if self.i == len(self.tokens):
            raise self.fail("unbalanced parentheses")
        lo = self.tokens[start][2] if start < self.i else self.tokens[self.i][2]
        hi = self.tokens[self.i][2]
        self.i += 1
        return parse_integer(self.text[lo:hi], f"{self.name} (radicand)")

    def root(self, n: int) -> tuple[Fraction, Fraction]:
        if n == 0:
            return (Fraction(0), Fraction(0))
        if n > 0 and is_square(n):
            return (Fraction(int(isqrt(n))), Fraction(0))
        if n % self.m or not is_square(n // self.m) or n // self.m <= 0:
            raise NotInOrderError(f"{self.name}: √{n} is not a number of the field Q(√{self.m})")
        return (Fraction(0), Fraction(int(isqrt(n // self.m))))
