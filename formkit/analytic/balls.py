"""Ball arithmetic for the analytic functions: exact arguments, certified values, precision limits.

The L-series, Epstein zeta functions and η-values of this layer are computed in
*ball arithmetic* (python-flint's ``arb``/``acb`` types: a midpoint and a radius that
provably contains the exact value after every operation, including the special
functions Γ, incomplete Γ and the Bessel function ``K``).  A series is cut after finitely
many terms with an explicit bound for the rest, which is added to the radius; the
result is accepted only when the final radius meets the requested number of digits.
This module holds the pieces every such function shares:

* :func:`as_complex_argument` — a complex argument ``s`` kept *exactly*, as two
  :class:`fractions.Fraction` (parsed by hand from text such as ``"1/2+14.1347i"``;
  nothing is evaluated);
* :func:`certified` — the verdict on a ball: midpoint as an mpmath number at the
  requested digits, an upper bound for the error, or a :class:`~formkit.errors.FormkitError`
  when the ball is too wide;
* :class:`CertifiedValue` — the value type returned by the analytic functions, with
  the way it was obtained (``method``) shown in ``repr``, HTML and LaTeX.

References
----------
.. [1] F. Johansson, "Arb: efficient arbitrary-precision midpoint-radius interval
       arithmetic", IEEE Trans. Computers 66 (2017), 1281–1292.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, field
from fractions import Fraction
from typing import Any

from ..errors import FormkitError

__all__ = [
    "MAX_DIGITS",
    "ComplexArgument",
    "as_complex_argument",
    "CertifiedValue",
    "as_ball",
]

#: The largest number of decimal digits any analytic function of formkit certifies.
MAX_DIGITS = 1000

#: ``log2(10)``.
BITS_PER_DIGIT = math.log2(10)


@dataclass(frozen=True)
class ComplexArgument:
    """An exact complex number ``real + imag·i`` with rational parts (the argument ``s``)."""

    real: Fraction
    imag: Fraction = Fraction(0)

    @property
    def is_real(self) -> bool:
        """True when the imaginary part is 0."""
        return self.imag == 0

    @property
    def is_integer(self) -> bool:
        """True for a real integer."""
        return self.imag == 0 and self.real.denominator == 1

    def ball(self):
        """The argument as an ``arb`` (real) or ``acb`` ball at the current precision."""
        from flint import acb, arb, fmpq

        re_ = arb(fmpq(self.real.numerator, self.real.denominator))
        if self.is_real:
            return re_
        return acb(re_, arb(fmpq(self.imag.numerator, self.imag.denominator)))

    def __add__(self, other: object) -> ComplexArgument:
        o = as_complex_argument(other)
        return ComplexArgument(self.real + o.real, self.imag + o.imag)

    def __rsub__(self, other: object) -> ComplexArgument:
        o = as_complex_argument(other)
        return ComplexArgument(o.real - self.real, o.imag - self.imag)

    def __sub__(self, other: object) -> ComplexArgument:
        o = as_complex_argument(other)
        return ComplexArgument(self.real - o.real, self.imag - o.imag)

    def __mul__(self, other: object) -> ComplexArgument:
        o = as_complex_argument(other)
        return ComplexArgument(
            self.real * o.real - self.imag * o.imag, self.real * o.imag + self.imag * o.real
        )

    __rmul__ = __mul__

    def __str__(self) -> str:
        def part(x: Fraction) -> str:
            return str(x.numerator) if x.denominator == 1 else f"{x.numerator}/{x.denominator}"

        if self.is_real:
            return part(self.real)
        sign = "-" if self.imag < 0 else "+"
        im = part(abs(self.imag))
        if self.real == 0:
            return f"{'-' if self.imag < 0 else ''}{im}i"
        return f"{part(self.real)}{sign}{im}i"

    def __repr__(self) -> str:
        return f"ComplexArgument({self})"


_REAL = r"[0-9]+(?:\.[0-9]*)?(?:[eE][+-]?[0-9]+)?(?:/[0-9]+)?|\.[0-9]+(?:[eE][+-]?[0-9]+)?"
_TERM = re.compile(rf"([+-]?)\s*({_REAL})?\s*(\*?\s*[ij])?")


def _fraction(text: str, whole: str) -> Fraction:
    num, _, den = text.partition("/")
    try:
        value = Fraction(num)
        if den:
            if int(den) == 0:
                raise ZeroDivisionError
            value /= int(den)
    except (ValueError, ZeroDivisionError) as exc:
        raise FormkitError(
            f"s must be a number such as 2, -3, 0.5, 1/2 or 1/2+14.13i; {whole.strip()!r} is not"
        ) from exc
    return value


def _parse(text: str) -> ComplexArgument:
    t = text.strip().replace(" ", "")
    if not t or len(t) > 2000:
        raise FormkitError(
            f"s must be a number such as 2, -3, 0.5, 1/2 or 1/2+14.13i; {text.strip()!r} is not"
        )
    re_part, im_part = Fraction(0), Fraction(0)
    pos, seen_re, seen_im = 0, False, False
    while pos < len(t):
        m = _TERM.match(t, pos)
        if not m or m.end() == pos or (pos > 0 and not m.group(1)):
            raise FormkitError(
                f"s must be a number such as 2, -3, 0.5, 1/2 or 1/2+14.13i; {text.strip()!r} is not"
            )
        sign, number, unit = m.groups()
        if number is None and unit is None:
            raise FormkitError(
                f"s must be a number such as 2, -3, 0.5, 1/2 or 1/2+14.13i; {text.strip()!r} is not"
            )
        value = _fraction(number, text) if number else Fraction(1)
        if sign == "-":
            value = -value
        if unit:
            if seen_im:
                raise FormkitError(f"s has two imaginary parts in {text!r}")
            im_part, seen_im = value, True
        else:
            if seen_re:
                raise FormkitError(f"s has two real parts in {text!r}")
            re_part, seen_re = value, True
        pos = m.end()
    return ComplexArgument(re_part, im_part)


def as_complex_argument(s: object, name: str = "s") -> ComplexArgument:
    """``s`` as an exact :class:`ComplexArgument`.

    Integers, :class:`~fractions.Fraction`, floats (taken at their exact binary value),
    complex numbers, mpmath numbers and text are accepted.  Text is parsed by hand:
    an optional real part and an optional imaginary part ending in ``i`` (or ``j``),
    each written in digits, as a decimal or as a fraction ``p/q``.

    Raises
    ------
    FormkitError
        If ``s`` is not a finite number or the text does not parse.

    Examples
    --------
    >>> str(as_complex_argument("1/2+14.134725i")), str(as_complex_argument(-3))
    ('1/2+565389/40000i', '-3')
    >>> as_complex_argument(0.25 + 1j).imag
    Fraction(1, 1)
    """
    if isinstance(s, ComplexArgument):
        return s
    if isinstance(s, bool):
        raise FormkitError(f"{name} must be a number, not {s!r}")
    if isinstance(s, (int, Fraction)):
        return ComplexArgument(Fraction(s))
    if isinstance(s, str):
        return _parse(s)
    try:
        import mpmath

        if isinstance(s, (mpmath.mpf, mpmath.mpc)):
            z = mpmath.mpc(s)
            parts = []
            for x in (z.real, z.imag):
                if not mpmath.isfinite(x):
                    raise FormkitError(f"{name} must be finite, not {s!r}")
                man, exp = _signed_man_exp(mpmath.mpf(x))
                parts.append(Fraction(man) * Fraction(2) ** exp if man else Fraction(0))
            return ComplexArgument(*parts)
    except ImportError:  # pragma: no cover - mpmath is a dependency
        pass
    if isinstance(s, (float, complex)):
        z = complex(s)
        if not (math.isfinite(z.real) and math.isfinite(z.imag)):
            raise FormkitError(f"{name} must be finite, not {s!r}")
        return ComplexArgument(Fraction(z.real), Fraction(z.imag))
    raise FormkitError(f"{name} must be a number (int, Fraction, float, complex or text), not {s!r}")


def check_digits(digits: object) -> int:
    """``digits`` as an int in ``[1, MAX_DIGITS]`` or a :class:`FormkitError`."""
    from ..core.arith import as_int

    d = as_int(digits, "digits")
    if not 1 <= d <= MAX_DIGITS:
        raise FormkitError(f"digits must lie in [1, {MAX_DIGITS}] (the most this library certifies), not {d}")
    return d


def bits_for(digits: int) -> int:
    """Working bits for ``digits`` decimal digits, with a guard of 20 bits."""
    return int(digits * BITS_PER_DIGIT) + 20


def ball_upper(x) -> float:
    """An upper bound (float) for ``|x|``, ``x`` an ``arb`` or ``acb``."""
    from flint import acb

    if isinstance(x, acb):
        return float(x.abs_upper()) * (1 + 2.0**-40)
    return float(abs(x).upper()) * (1 + 2.0**-40)


def ball_lower(x) -> float:
    """A lower bound (float) for ``|x|``."""
    from flint import acb

    if isinstance(x, acb):
        return float(x.abs_lower()) * (1 - 2.0**-40)
    return float(abs(x).lower()) * (1 - 2.0**-40)


def _signed_man_exp(x) -> tuple[int, int]:
    """``(m, e)`` with ``x = m·2^e`` for a finite mpmath mpf (``man_exp`` drops the sign)."""
    sign, man, exp, _bc = x._mpf_
    return (-int(man) if sign else int(man)), int(exp)


def _arb_to_mpf(x):
    import mpmath

    man, exp = x.mid().man_exp()
    return mpmath.mpf((int(man), int(exp))) if int(man) else mpmath.mpf(0)


def _radius(x) -> float:
    from flint import acb

    if isinstance(x, acb):
        r = float(x.real.rad()) + float(x.imag.rad())
    else:
        r = float(x.rad())
    return r * (1 + 2.0**-40)


def meets(x, digits: int) -> bool:
    """True when the radius of ``x`` is at most ``10^-digits·|x|`` (or ``x`` is exactly 0)."""
    r = _radius(x)
    if r == 0:
        return True
    return r <= 10.0 ** (-digits) * ball_lower(x)


@dataclass(frozen=True)
class CertifiedValue:
    """A number computed in ball arithmetic, with a proved error bound and its method.

    ``value`` is an mpmath number (``digits`` + 5 significant digits kept; ``text()``
    rounds to ``digits``); the exact value lies within ``error_bound`` of ``value``
    (absolute).  ``exact`` holds an exact rational
    value where one is known (values at non-positive integers), else ``None``.
    ``quantity`` names what was computed (``"L(s, χ_-23)"``), ``method`` how, and
    ``terms`` how many terms of the series were summed.
    """

    quantity: str
    s: ComplexArgument
    value: Any
    error_bound: float
    digits: int
    method: str
    terms: int
    exact: Fraction | None = None
    details: dict = field(default_factory=dict, compare=False, hash=False)

    def __complex__(self) -> complex:
        return complex(self.value)

    def __float__(self) -> float:
        import mpmath

        if isinstance(self.value, mpmath.mpc):
            if self.value.imag != 0:
                raise TypeError(f"{self.quantity} = {self.value} is not real")
            return float(self.value.real)
        return float(self.value)

    @property
    def is_real(self) -> bool:
        """True when the value is real (an mpf, or an mpc with imaginary part 0)."""
        import mpmath

        return not isinstance(self.value, mpmath.mpc) or self.value.imag == 0

    def _parts(self) -> tuple[str, str]:
        import mpmath

        with mpmath.workdps(self.digits + 5):
            z = mpmath.mpc(self.value)
            return (mpmath.nstr(z.real, self.digits), mpmath.nstr(z.imag, self.digits))

    def text(self) -> str:
        """The value as text with ``digits`` significant digits (``a + bi`` if complex)."""
        if self.exact is not None:
            return str(self.exact)
        re_, im_ = self._parts()
        if self.is_real:
            return re_
        sign = "-" if im_.startswith("-") else "+"
        return f"{re_} {sign} {im_.lstrip('-')}i"

    def to_dict(self) -> dict:
        """JSON-ready dictionary: numbers as decimal strings, the exact value as ``"p/q"`` or null."""
        re_, im_ = self._parts()
        out = {
            "quantity": self.quantity,
            "s": str(self.s),
            "value": {"real": re_, "imag": im_},
            "error_bound": f"{self.error_bound:.3e}",
            "digits": self.digits,
            "exact": None if self.exact is None else str(self.exact),
            "method": self.method,
            "terms": self.terms,
        }
        out.update(self.details)
        return out

    def __repr__(self) -> str:
        return f"{self.quantity} = {self.text()}  (s = {self.s}; ±{self.error_bound:.1e}; {self.method})"

    def _repr_html_(self) -> str:
        import html

        return (
            f"<p><b>{html.escape(self.quantity)}</b> at s = {html.escape(str(self.s))}: "
            f"<code>{html.escape(self.text())}</code><br>"
            f"<small>error ≤ {self.error_bound:.1e}; {html.escape(self.method)}; {self.terms} terms</small></p>"
        )

    def _repr_latex_(self) -> str:
        value = self.text().replace("i", r"\,i")
        return (
            rf"$\text{{{self.quantity}}} = {value}$"
            rf"\quad\text{{(error $\le$ {self.error_bound:.1e}; {self.method})}}"
        )


def as_ball(value: CertifiedValue):
    """A ball (acb) containing the exact value behind a :class:`CertifiedValue`, at the current precision."""
    import mpmath
    from flint import acb, arb

    with mpmath.workdps(value.digits + 10):
        z = mpmath.mpc(value.value)
        parts = []
        for x in (z.real, z.imag):
            man, exp = _signed_man_exp(mpmath.mpf(x))
            parts.append(arb(0) if not man else arb(man) * arb(2) ** exp)
    r = value.error_bound * (1 + 1e-9)
    return acb(parts[0] + arb(0, r), parts[1] + arb(0, r))


def certified(
    ball, digits: int, *, quantity: str, s: ComplexArgument, method: str, terms: int, **details: Any
) -> CertifiedValue:
    """Turn a ball into a :class:`CertifiedValue`, or raise if it is not accurate enough."""
    import mpmath
    from flint import acb

    if not meets(ball, digits):
        raise FormkitError(
            f"{quantity} at s = {s}: could not certify {digits} digits "
            f"(ball radius {_radius(ball):.2e}, |value| ≥ {ball_lower(ball):.2e}); "
            "the value may be too close to 0 or the precision beyond what the method certifies"
        )
    with mpmath.workdps(digits + 5):
        if isinstance(ball, acb):
            value = mpmath.mpc(_arb_to_mpf(ball.real), _arb_to_mpf(ball.imag))
        else:
            value = _arb_to_mpf(ball)
    # the midpoint is kept with 5 guard digits (its rounding adds at most |value|·10^-(digits+4))
    err = _radius(ball) + float(abs(value)) * 10.0 ** (-digits - 4)
    return CertifiedValue(quantity, s, value, err, digits, method, terms, None, details)
