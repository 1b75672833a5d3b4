"""Hand-written parser for forms and integers given as text.

Nothing here evaluates user text: it is split into tokens by a small scanner and
checked against a fixed grammar.

Grammar (ASCII white space is ignored between tokens)::

    form     := triple | poly
    triple   := "[" ints "]" | "(" ints ")" | ints
    ints     := [sign] int "," [sign] int "," [sign] int
    poly     := term (sign term)*      with an optional leading sign
    term     := [int ["*"]] mono | mono ["*" int]
    mono     := var [power] [["*"] var [power]]
    power    := "^" int | "**" int | "²"          (the exponent must be 1 or 2)
    var      := "x" | "y"
    sign     := "+" | "-" | "−" (U+2212, the minus sign of typeset text)
    int      := ASCII digits 0-9 only

A monomial must have degree exactly 2 (x², xy, yx, y²).  Repeated monomials add up.
Anything else (other characters, other letters, Unicode digits, more or fewer than
three coefficients, unbalanced brackets, text longer than :data:`MAX_TEXT`) raises
:class:`~formkit.errors.ParseError`.
"""

from __future__ import annotations

import operator
import re

from ..errors import ParseError
from .arith import _int_from_digits

__all__ = ["parse_form_text", "parse_integer", "MAX_INTEGER_BITS"]

MAX_TEXT = 1_000_000

# re.ASCII: \d and \s match only ASCII digits and white space (no Unicode digits).
_INT_RE = re.compile(r"[+-]?[0-9]+\Z", re.ASCII)
_TRIPLE_RE = re.compile(
    r"\s*[\[(]?\s*([+-]?\s*[0-9]+)\s*,\s*([+-]?\s*[0-9]+)\s*,\s*([+-]?\s*[0-9]+)\s*[\])]?\s*\Z",
    re.ASCII,
)
_TOKEN_RE = re.compile(r"(?:([0-9]+)|(\*\*)|([xy])|([-+*^\u2212\u00b2]))", re.ASCII)
_SPACE = " \t\n\r\f\v"


def _digits_to_int(text: str) -> int:
    # int() refuses > 4300 digits by default; arith converts any length.
    return _int_from_digits("".join(text.split()))


#: Bound on the size of any integer the number syntax produces or reads, in bits
#: (about 301 030 decimal digits).  Checked before a power or product is computed.
MAX_INTEGER_BITS = 1_000_000

#: Parentheses may nest this deep in a number expression.
MAX_NESTING = 100

_LOG2_10 = 3.3219280948873626


class _Num:
    """A scanner and recursive-descent parser over the token list of one number expression."""

    def __init__(self, text: str, name: str) -> None:
        self.text, self.name = text, name
        self.tokens = _number_tokens(text, name)
        self.i = 0
        self.depth = 0

    def fail(self, why: str) -> ParseError:
        return ParseError(f"{self.name}: cannot read {self.text!r} as an integer: {why}{_NUMBER_HINT}")

    def where(self) -> str:
        return f"at position {self.tokens[self.i][1]}" if self.i < len(self.tokens) else "at the end"

    def peek(self) -> str | None:
        return self.tokens[self.i][0] if self.i < len(self.tokens) else None

    def parse(self) -> int:
        if not self.tokens:
            raise self.fail("the text is empty")
        value = self.expr()
        if self.i < len(self.tokens):
            raise self.fail(f"unexpected {self.tokens[self.i][2]!r} {self.where()}")
        return value

    def expr(self) -> int:
        value = self.term()
        while self.peek() in ("+", "-"):
            op = self.tokens[self.i][0]
            self.i += 1
            other = self.term()
            self.check_bits(max(value.bit_length(), other.bit_length()) + 1, f"a sum in {self.text!r}")
            value = value + other if op == "+" else value - other
        return value

    def term(self) -> int:
        value = self.unary()
        while self.peek() == "*":
            self.i += 1
            other = self.unary()
            self.check_bits(value.bit_length() + other.bit_length(), f"a product in {self.text!r}")
            value *= other
        return value

    def unary(self) -> int:
        if self.peek() in ("+", "-"):
            op = self.tokens[self.i][0]
            self.i += 1
            value = self.unary()
            return -value if op == "-" else value
        return self.power()

    def power(self) -> int:
        base = self.atom()
        if self.peek() != "^":
            return base
        self.i += 1
        # the exponent binds to the right (2^3^2 = 2^9) and may carry a sign, which must
        # leave it >= 0: the result has to be an integer
        exponent = self.unary()
        if exponent < 0:
            raise self.fail(f"negative exponent {exponent} (the result would not be an integer)")
        if base == 0 and exponent == 0:
            raise self.fail("0^0 is not given a value here")
        if abs(base) > 1:
            bits = (abs(base).bit_length() - 1) * exponent + 1
            if bits > MAX_INTEGER_BITS:
                raise ParseError(
                    f"{self.name}: {self.text!r} is too large: the power {_short(base)}^{_short(exponent)} "
                    f"has at least {bits if exponent < 10**12 else f'about {float(bits):.3g}'} bits, and "
                    f"integers here have at most {MAX_INTEGER_BITS} bits (about "
                    f"{int(MAX_INTEGER_BITS / _LOG2_10)} decimal digits)"
                )
            return base**exponent
        if base == 1 or exponent == 0:
            return 1
        return 0 if base == 0 else (-1) ** (exponent % 2)

    def atom(self) -> int:
        kind = self.peek()
        if kind == "int":
            digits = self.tokens[self.i][2]
            self.i += 1
            self.check_bits(int((len(digits.lstrip("0")) - 1) * _LOG2_10), f"the literal in {self.text!r}")
            return _digits_to_int(digits)
        if kind == "(":
            self.i += 1
            self.depth += 1
            if self.depth > MAX_NESTING:
                raise self.fail(f"more than {MAX_NESTING} nested parentheses")
            value = self.expr()
            self.depth -= 1
            if self.peek() != ")":
                raise self.fail(f"expected ')' {self.where()}")
            self.i += 1
            return value
        if kind is None:
            raise self.fail("the expression ends too early")
        raise self.fail(f"expected a number or '(' {self.where()}, found {self.tokens[self.i][2]!r}")

    def check_bits(self, bits: int, what: str) -> None:
        if bits > MAX_INTEGER_BITS:
            raise ParseError(
                f"{self.name}: {what} would have about {bits} bits, more than the bound of "
                f"{MAX_INTEGER_BITS} bits (about {int(MAX_INTEGER_BITS / _LOG2_10)} decimal digits)"
            )


_NUMBER_HINT = (
    "; write an integer with + - * ^ (or **) and parentheses, such as -23, -4*3*10^2, 10^12+1 or -(10^40+27)"
)
_NUMBER_TOKEN_RE = re.compile(r"([0-9]+)|(\*\*)|([-+*^()\u2212\u00d7\u00b7])", re.ASCII)
_NUMBER_OPS = {"\u2212": "-", "\u00d7": "*", "\u00b7": "*", "**": "^"}


def _short(n: int) -> str:
    s = str(n)
    return s if len(s) <= 20 else f"{s[:8]}…({len(s)} digits)"


def _number_tokens(text: str, name: str) -> list[tuple[str, int, str]]:
    tokens: list[tuple[str, int, str]] = []
    pos, n = 0, len(text)
    while pos < n:
        if text[pos] in _SPACE:
            pos += 1
            continue
        m = _NUMBER_TOKEN_RE.match(text, pos)
        if not m:
            raise ParseError(
                f"{name}: cannot read {text!r} as an integer: unexpected character {text[pos]!r} "
                f"at position {pos}{_NUMBER_HINT}"
            )
        digits, pow2, op = m.groups()
        if digits is not None:
            tokens.append(("int", pos, digits))
        else:
            sym = pow2 or op
            tokens.append((_NUMBER_OPS.get(sym, sym), pos, sym))
        pos = m.end()
    return tokens


def parse_integer(text: object, name: str = "integer") -> int:
    """Parse an integer written with the number syntax of formkit.

    The syntax (the same for every integer argument of the library's text parser and
    of the command line)::

        expr   := term (("+" | "-") term)*
        term   := unary ("*" unary)*
        unary  := ("+" | "-") unary | power
        power  := atom ["^" unary]          ("**" is a synonym of "^")
        atom   := digits | "(" expr ")"

    ``^`` binds tighter than unary minus and to the right: ``-3^2 = -9``,
    ``2^3^2 = 2^9``; ``*`` binds tighter than ``+`` and ``-``.  Digits are ASCII
    ``0``–``9``; ``−`` (U+2212) is read as ``-`` and ``×``, ``·`` as ``*``.  White space
    between tokens is ignored.  Exponents must be ``>= 0`` (``0^0`` is refused).
    Nothing else is accepted: no decimal points, no ``e`` notation, no ``_``, no
    implicit multiplication.  Every literal, product, sum and power is checked against
    :data:`MAX_INTEGER_BITS` *before* it is computed, so ``10^10^10`` is refused at once.
    The text is never evaluated by Python: it is scanned into tokens and parsed by hand.

    Parameters
    ----------
    text : str or int
        The text; an ``int`` (or an object with ``__index__``) is returned as it is.
    name : str
        The argument's name, used in error messages.

    Returns
    -------
    int

    Raises
    ------
    ParseError
        If the text is not in the syntax or a value would exceed :data:`MAX_INTEGER_BITS`.

    Examples
    --------
    >>> parse_integer("-23"), parse_integer("10^6"), parse_integer("-3*10**4")
    (-23, 1000000, -30000)
    >>> parse_integer("-4*3*10^2"), parse_integer("-3*4*37^2"), parse_integer("-(10^2+27)")
    (-1200, -16428, -127)
    >>> parse_integer("-10^12-3"), parse_integer("2^3^2"), parse_integer("-3^2")
    (-1000000000003, 512, -9)
    >>> parse_integer("10^10^10", "D")
    Traceback (most recent call last):
    ...
    formkit.errors.ParseError: D: '10^10^10' is too large: the power 10^10000000000 has at least 30000000001 bits, and integers here have at most 1000000 bits (about 301029 decimal digits)
    """
    if not isinstance(text, (str, bool, float)):
        try:
            return operator.index(text)  # type: ignore[arg-type]
        except TypeError:
            pass
    if not isinstance(text, str):
        raise ParseError(f"{name} must be text or an integer, not {text!r}")
    s = text.strip(_SPACE)
    if len(s) > MAX_TEXT:
        raise ParseError(f"{name} is too long ({len(s)} characters, at most {MAX_TEXT})")
    if _INT_RE.match(s):  # the common case, without the token list
        if (len(s) - 2) * _LOG2_10 > MAX_INTEGER_BITS:
            return _Num(s, name).parse()  # the literal check gives the message
        return _digits_to_int(s)
    return _Num(s, name).parse()


def parse_form_text(text: object) -> tuple[int, int, int]:
    """Parse the text of a form into ``(a, b, c)``.

    Raises
    ------
    ParseError
        With a message naming the text and what was expected.

    Examples
    --------
    >>> parse_form_text("x**2+x*y+6*y**2")
    (1, 1, 6)
    >>> parse_form_text("-x^2 + 13 y^2")
    (-1, 0, 13)
    >>> parse_form_text("(2, -1, 3)")
    (2, -1, 3)
    >>> parse_form_text("1, 0, 10^30")
    (1, 0, 1000000000000000000000000000000)
    >>> parse_form_text("__import__('os')")
    Traceback (most recent call last):
    ...
    formkit.errors.ParseError: cannot read "__import__('os')" as a form: unexpected character '_' at position 0; write a,b,c or a polynomial such as 3x^2 + 7xy - 5y^2
    """
    if not isinstance(text, str):
        raise ParseError(f"a form must be given as text here, not {text!r}")
    if len(text) > MAX_TEXT:
        raise ParseError(f"form text is too long ({len(text)} characters, at most {MAX_TEXT})")
    s = text.strip(_SPACE)
    if not s:
        raise ParseError("cannot read an empty text as a form")
    m = _TRIPLE_RE.match(s.replace("\u2212", "-"))
    if m:
        opening, closing = s[0], s[-1]
        pairs = {"[": "]", "(": ")"}
        if (opening in pairs) != (closing in pairs.values()) or (
            opening in pairs and pairs[opening] != closing
        ):
            raise ParseError(f"cannot read {s!r} as a form: unbalanced brackets")
        return tuple(_digits_to_int(g) for g in m.groups())  # type: ignore[return-value]
    if "," in s:
        inner = s
        if len(s) >= 2 and {"[": "]", "(": ")"}.get(s[0]) == s[-1]:
            inner = s[1:-1]
        parts = inner.split(",")
        if len(parts) == 3:
            # coefficients written in the integer syntax of parse_integer ("1,0,10^30"),
            # with its size bound checked before anything is computed
            coefficients = []
            for name, part in zip("abc", parts):
                try:
                    coefficients.append(parse_integer(part, f"coefficient {name}"))
                except ParseError as exc:
                    raise ParseError(f"cannot read {s!r} as a form: {exc}") from None
            return coefficients[0], coefficients[1], coefficients[2]
        raise ParseError(
            f"cannot read {s!r} as a form: expected exactly three integers a,b,c "
            f"(optionally in [ ] or ( )), found {len(parts)} comma-separated parts"
        )
    # positions in error messages count from the first non-blank character
    return _parse_poly(s)


def _fail(text: str, why: str) -> ParseError:
    return ParseError(
        f"cannot read {text!r} as a form: {why}; write a,b,c or a polynomial such as 3x^2 + 7xy - 5y^2"
    )


def _tokenize(text: str) -> list[tuple[str, str, int]]:
    tokens: list[tuple[str, str, int]] = []
    pos = 0
    n = len(text)
    while pos < n:
        if text[pos] in _SPACE:
            pos += 1
            continue
        m = _TOKEN_RE.match(text, pos)
        if not m:
            raise _fail(text, f"unexpected character {text[pos]!r} at position {pos}")
        num, pow_, var, op = m.groups()
        start = m.start()
        if num is not None:
            tokens.append(("int", num, start))
        elif pow_ is not None:
            tokens.append(("^", "**", start))
        elif var is not None:
            tokens.append(("var", var, start))
        elif op == "\u00b2":  # superscript two: "^" "2"
            tokens.append(("^", op, start))
            tokens.append(("int", "2", start))
        elif op == "\u2212":  # typeset minus sign
            tokens.append(("-", op, start))
        else:
            tokens.append((op, op, start))
        pos = m.end()
    return tokens


def _parse_poly(text: str) -> tuple[int, int, int]:
    tokens = _tokenize(text)
    i = 0
    coeffs = {"xx": 0, "xy": 0, "yy": 0}

    def peek(kind: str | None = None) -> tuple[str, str, int] | None:
        if i < len(tokens) and (kind is None or tokens[i][0] == kind):
            return tokens[i]
        return None

    def where() -> str:
        return f"at position {tokens[i][2]}" if i < len(tokens) else "at the end"

    first = True
    while i < len(tokens) or first:
        sign = 1
        if peek("+") or peek("-"):
            sign = -1 if tokens[i][0] == "-" else 1
            i += 1
        elif not first:
            raise _fail(text, f"expected + or - {where()}")
        first = False
        coeff = None
        if peek("int"):
            coeff = _digits_to_int(tokens[i][1])
            i += 1
            if peek("*"):
                i += 1
        variables: list[str] = []
        while peek("var"):
            v = tokens[i][1]
            i += 1
            power = 1
            if peek("^"):
                i += 1
                if not peek("int"):
                    raise _fail(text, f"expected an exponent {where()}")
                power = int(tokens[i][1]) if len(tokens[i][1]) < 4 else 99
                i += 1
            if power not in (1, 2):
                raise _fail(text, f"exponent {power} of {v} is not 1 or 2")
            variables.extend([v] * power)
            if peek("*") and i + 1 < len(tokens) and tokens[i + 1][0] == "var":
                i += 1
        if coeff is None and peek("*") and i + 1 < len(tokens) and tokens[i + 1][0] == "int":
            i += 1
            coeff = _digits_to_int(tokens[i][1])
            i += 1
        if not variables:
            if coeff is None:
                raise _fail(text, f"expected a term {where()}")
            raise _fail(text, f"constant term {coeff} (a form has only x², xy and y² terms)")
        if len(variables) != 2:
            raise _fail(text, f"term of degree {len(variables)} (only x², xy and y² are allowed)")
        key = "".join(sorted(variables))
        coeffs[key] += sign * (1 if coeff is None else coeff)
        if i < len(tokens) and tokens[i][0] not in "+-":
            raise _fail(text, f"unexpected {tokens[i][1]!r} {where()}")
    return coeffs["xx"], coeffs["xy"], coeffs["yy"]
