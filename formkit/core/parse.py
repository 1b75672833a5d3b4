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

__all__ = ["parse_form_text", "parse_integer"]

MAX_TEXT = 1_000_000

# re.ASCII: \d and \s match only ASCII digits and white space (no Unicode digits).
_INT_RE = re.compile(r"[+-]?[0-9]+\Z", re.ASCII)
_TRIPLE_RE = re.compile(
    r"\s*[\[(]?\s*([+-]?\s*[0-9]+)\s*,\s*([+-]?\s*[0-9]+)\s*,\s*([+-]?\s*[0-9]+)\s*[\])]?\s*\Z",
    re.ASCII,
)
_POWER10_RE = re.compile(
    r"([+-]?)(?:([0-9]+)\s*\*\s*)?([0-9]+)\s*(?:\^|\*\*)\s*([0-9]+)(?:\s*([+-])\s*([0-9]+))?", re.ASCII
)
_TOKEN_RE = re.compile(r"(?:([0-9]+)|(\*\*)|([xy])|([-+*^\u2212\u00b2]))", re.ASCII)
_SPACE = " \t\n\r\f\v"


def _digits_to_int(text: str) -> int:
    # int() refuses > 4300 digits by default; arith converts any length.
    return _int_from_digits("".join(text.split()))


def parse_integer(text: object, name: str = "integer") -> int:
    """Parse a decimal integer (optionally signed, underscores or spaces not allowed).

    Also accepts ``10^k`` and ``10**k`` forms of powers of ten with an optional
    leading factor and an optional offset, e.g. ``3*10^20``, ``-10**12`` and
    ``-10^30-3``, because users write large discriminants that way.

    Raises
    ------
    ParseError
        If the text is not an integer.

    Examples
    --------
    >>> parse_integer("-23"), parse_integer("10^6"), parse_integer("-3*10**4")
    (-23, 1000000, -30000)
    >>> parse_integer("-10^12-3"), parse_integer("10^6+1")
    (-1000000000003, 1000001)
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
    if _INT_RE.match(s):
        return _digits_to_int(s)
    m = _POWER10_RE.fullmatch(s)
    if m:
        sign, factor, base, exp, off_sign, offset = m.groups()
        e = int(exp) if len(exp) < 7 else None
        if e is None or e > 100_000:
            raise ParseError(f"{name}: exponent too large in {s!r}")
        value = (_digits_to_int(factor) if factor else 1) * _digits_to_int(base) ** e
        value = -value if sign == "-" else value
        if offset:
            value += -_digits_to_int(offset) if off_sign == "-" else _digits_to_int(offset)
        return value
    raise ParseError(f"{name} must be an integer such as -23, 10^12 or 3*10^20, not {s!r}")


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
        parts = s.strip("[]()").split(",")
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
