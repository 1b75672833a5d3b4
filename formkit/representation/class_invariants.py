"""Weber class polynomials: the same ring class field as ``H_D``, with coefficients ~72× shorter.

(This module treats ``D ≡ 1 (mod 8)``; the discriminants ``D = −4m``, with the invariants
``f(√−m)^k/√2^e`` and ``f₁(√−m)^k/√2^e``, are in :mod:`formkit.representation.weber_even`,
and :func:`weber_polynomial` serves both.)

For a negative discriminant ``D ≡ 1 (mod 8)`` the classical Weber value
``f(√−m)/√2`` (``m = −D``) is a class invariant: it generates over ``Q(√D)`` the ring class
field of the order of discriminant ``D`` (the order ``Z[√−m]`` of discriminant ``4D`` has
the same ring class field, as ``h(4D) = h(D)`` when ``χ_D(2) = 1``), and when ``3 ∤ D`` its
minimal polynomial over ``Q`` has degree ``h(D)`` and integer coefficients (Weber; Yui and
Zagier [1]; for ``3 | D`` the cube ``(f(√−m)/√2)³`` is used, as in [1]).  Known cases:
``D = −23`` gives ``x³ − x − 1``, ``D = −71`` gives
``x⁷ − 2x⁶ − x⁵ + x⁴ + x³ + x² − x − 1`` ([1], table; from memory).

*The conjugates.*  Write ``w(τ) = η(τ)/η(2τ)``; then
``f(√−m)/√2 = ζ₄₈⁻¹·w(τ₀)/√2`` with ``τ₀ = (−1 + √D)/2`` (from
``f(τ + 1) = ζ₄₈⁻¹f₁(τ)``, ``f₁(2τ)f₂(τ) = √2`` and ``f₂(τ) = √2·η(2τ)/η(τ)``).  Each class
is represented by a form ``[A, B, C]`` with ``gcd(A, 6) = 1`` and ``B ≡ 1 (mod 48)`` (an
"N-system" in the sense of Schertz [2]; it then has ``2 | C``), and its conjugate is

    x_Q = ζ₄₈^(−A) · w(τ_Q) / √2,      τ_Q = (−B + √D)/(2A)

(to the power 3 when ``3 | D``).  The factor ``ζ₄₈^(−A)`` is the one for which the value
does not depend on the representative chosen (η's multiplier on the matrices relating
two such forms); we checked this numerically and, more to the point, every polynomial
returned here is *certified* afresh: its coefficients are balls each holding exactly one
integer, so the wrong root of unity would show up as a failure, not as a wrong answer.
(Checked for all 250 discriminants ``D ≡ 1 (mod 8)``, ``3 ∤ D``, ``−3000 < D < 0``.)

*Relation to j.*  ``x²⁴ = −1/(2¹²·t)`` with ``t = Δ(2τ)/Δ(τ)`` and ``j = (1 + 256t)³/t``,
hence with ``u = x²⁴`` (``u = x⁸`` for the cube)

    j(τ_Q) = (1 − 16u)³ / u²,

a rational map sending the roots of the Weber polynomial to the roots of ``H_D``
(:func:`weber_root_to_j`; used modulo p for the CM method, :mod:`formkit.representation.cm_method`).

*Precision and certificate.*  ``|x_Q| ≈ e^{π√|D|/(24a)}/√2`` for the reduced form
``(a, b, c)`` of the class, so the coefficients have about ``L = Σ π√|D|/(24a ln 2)`` bits
(three times that for the cube); the values are computed in ball arithmetic
(python-flint's ``acb.modular_eta``, rigorous enclosures) at ``L + h + 8⌈log₂(h+2)⌉ + 64``
bits, paired into real quadratic factors (the forms ``(a, ±b, c)`` give complex conjugate
values) and multiplied by a product tree; the result is accepted only when every
coefficient ball holds exactly one integer (else the precision is raised).  *Checks* (on
by default): the root counts modulo split primes against the prime-form classes, as for
``H_D`` (the polynomial generates the same field, so it splits completely modulo
``p ∤ disc`` exactly when the prime form at ``p`` is principal, and has no root when
``p`` splits in ``Q(√D)`` otherwise).

References
----------
.. [1] N. Yui, D. Zagier, "On the singular values of Weber modular functions",
       Math. Comp. 66 (1997), 1645–1662.
.. [2] R. Schertz, "Weber's class invariants revisited", J. Théor. Nombres Bordeaux 14
       (2002), 325–343 (N-systems).
.. [3] H. Weber, *Lehrbuch der Algebra*, vol. III, 1908 (the functions f, f₁, f₂ and
       their relations; as recalled in [1]).
.. [4] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §12 (Weber
       functions), Theorem 12.17 (as recalled).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from functools import lru_cache

from ..analytic.ball_polynomials import certified_integer_coefficients, largest_radius_log2, product_tree
from ..core.discriminants import discriminant_parts
from ..core.forms import Form
from ..core.polynomials_mod_p import root_count_mod_prime
from ..core.progress import announces_slowness, progress_bar
from ..errors import DiscriminantError, FormkitError
from .class_polynomials import _check_negative, _polynomial_text, _reduced_forms, _split_check
from .weber_even import (
    _even_ball_product,
    even_weber_description,
    even_weber_relation,
    even_weber_root_to_j,
    even_weber_shape,
)

__all__ = [
    "WeberPolynomial",
    "weber_polynomial",
    "weber_invariant_applies",
    "weber_root_to_j",
]


def weber_invariant_applies(D: object) -> bool:
    """True when a Weber invariant is available: ``D < 0`` with ``D ≡ 1 (mod 8)``, or
    ``D = −4m`` (:mod:`formkit.representation.weber_even`); not for ``D ≡ 5 (mod 8)``.

    Examples
    --------
    >>> weber_invariant_applies(-23), weber_invariant_applies(-15), weber_invariant_applies(-20)
    (True, True, True)
    >>> weber_invariant_applies(-11), weber_invariant_applies(-96)   # −11 ≡ 5 (mod 8)
    (False, True)
    """
    D = _check_negative(D)
    return D % 8 == 1 or D % 4 == 0


def _weber_power(D: int) -> int:
    """1 when ``3 ∤ D``, else 3 (the cube of the Weber value is the invariant)."""
    return 3 if D % 3 == 0 else 1


def _egcd(x: int, y: int) -> tuple[int, int]:
    """``(s, t)`` with ``s·x + t·y = gcd(x, y)`` (extended Euclid)."""
    s0, s1, t0, t1 = 1, 0, 0, 1
    while y:
        q, r = divmod(x, y)
        x, y = y, r
        s0, s1 = s1, s0 - q * s1
        t0, t1 = t1, t0 - q * t1
    return s0, t0


def _normalised_form(a: int, b: int, c: int, D: int) -> tuple[int, int, int]:
    """A form ``[A, B, C]`` properly equivalent to ``(a, b, c)`` with ``gcd(A, 6) = 1`` and
    ``B ≡ 1 (mod 48)``, ``A`` as small as a search over small ``(x, y)`` finds.

    ``A = Q(x, y)`` for coprime ``(x, y)``; with ``s·x + t·y = 1`` the matrix
    ``[[x, −t], [y, s]]`` (determinant 1) carries ``Q`` to ``[A, B', ·]``, and the
    translations ``B' ↦ B' + 2Ak`` reach ``B ≡ 1 (mod 48)`` since ``2A`` generates ``2Z/48``
    and ``B'`` is odd.
    """
    best: tuple[int, int, int] | None = None
    for r in range(1, 40):
        for y in range(r + 1):
            for x in range(-r, r + 1):
                if max(abs(x), y) != r and r > 1:
                    continue
                if math.gcd(x, y) != 1 or (y == 0 and x != 1):
                    continue
                A = a * x * x + b * x * y + c * y * y
                if A <= 0 or math.gcd(A, 6) != 1 or (best is not None and best[0] <= A):
                    continue
                s, t = _egcd(x, y)
                if s * x + t * y == -1:  # keep the determinant x·s + y·t equal to +1
                    s, t = -s, -t
                u, v = -t, s
                B = 2 * a * x * u + b * (x * v + y * u) + 2 * c * y * v
                k = ((1 - B) // 2 * pow(A, -1, 24)) % 24  # B + 2Ak ≡ 1 (mod 48)
                B += 2 * A * k
                best = (A, B, (B * B - D) // (4 * A))
        if best is not None and r >= 3:
            return best
    if best is None:  # pragma: no cover - a primitive form represents integers prime to 6
        raise RuntimeError(f"no representative with A prime to 6 found for {(a, b, c)}")
    return best


def _weber_value(A: int, B: int, D: int, power: int):
    """``(ζ₄₈^(−A)·η(τ)/(√2·η(2τ)))^power`` at ``τ = (−B + √D)/(2A)``, an acb ball."""
    from flint import acb, arb

    tau = acb(arb(-B) / (2 * A), arb(-D).sqrt() / (2 * A))
    zeta = acb(arb(-(A % 48)) / 24).exp_pi_i()
    x = zeta * tau.modular_eta() / ((2 * tau).modular_eta() * arb(2).sqrt())
    return x**power if power != 1 else x


def weber_root_to_j(x: int, p: int, D: int) -> int:
    """The root ``j = (1 − 16u)³/u²`` of ``H_D`` modulo ``p`` from a root ``x`` of the Weber
    polynomial modulo ``p`` (``u = x²⁴``, or ``x⁸`` when ``3 | D``).

    Parameters
    ----------
    x : int
        A root of :func:`weber_polynomial` ``(D)`` modulo ``p`` (nonzero: the constant term
        is a unit up to sign).
    p : int
        A prime.
    D : int
        The discriminant (decides the power).

    Returns
    -------
    int
        In ``[0, p)``.

    Raises
    ------
    FormkitError
        If ``x ≡ 0 (mod p)``.

    Examples
    --------
    >>> weber_root_to_j(1, 10**9 + 7, -7) == -3375 % (10**9 + 7)   # D = −7: W = x − 1
    True
    >>> weber_root_to_j(1, 10**9 + 7, -28) == 16581375   # D = −28: f(√−7)/√2 = 1, j(√−7) = 255³
    True
    """
    if D % 4 == 0:
        return even_weber_root_to_j(x, p, even_weber_shape(D))
    x %= p
    if x == 0:
        raise FormkitError(f"a root of the Weber polynomial modulo {p} must be nonzero, not {x}")
    u = pow(x, 8 if _weber_power(D) == 3 else 24, p)
    return (1 - 16 * u) ** 3 * pow(u * u, -1, p) % p


@dataclass(frozen=True)
class WeberCheck:
    """How a Weber polynomial was certified and checked (fields as for ``H_D``)."""

    precision_bits: int
    radius_log2: int
    primes_checked: tuple[int, ...]
    principal_primes: tuple[int, ...]

    def to_dict(self) -> dict:
        return {
            "method": "ball arithmetic (every coefficient ball contains exactly one integer)",
            "precision_bits": self.precision_bits,
            "radius_log2": self.radius_log2,
            "primes_checked": list(self.primes_checked),
            "principal_primes": list(self.principal_primes),
        }


@dataclass(frozen=True)
class WeberPolynomial:
    """The Weber class polynomial ``W_D(x)`` (``D ≡ 1 mod 8``, or ``D = −4m``), with provenance.

    Attributes
    ----------
    discriminant : int
    power : int
        The exponent of the Weber function in the invariant: for ``D ≡ 1 (mod 8)`` 1, or 3
        when ``3 | D`` (the roots are the cubes of the Weber values); for ``D = −4m`` the
        exponent ``k`` of ``F(√−m)^k/√2^e`` (see ``shape``).
    coefficients : tuple of int
        Leading coefficient (1) first.
    forms : tuple of Form
        The reduced forms, one per class (the roots are indexed by them).
    working_bits : int
    verification : WeberCheck or None
    shape : tuple or None
        For ``D = −4m`` the triple ``(F, k, e)`` of :func:`~formkit.representation.weber_even.even_weber_shape`
        (the roots are the conjugates of ``F(√−m)^k/√2^e``); ``None`` for ``D ≡ 1 (mod 8)``.
    """

    discriminant: int
    power: int
    coefficients: tuple[int, ...]
    forms: tuple[Form, ...]
    working_bits: int
    verification: WeberCheck | None
    shape: tuple[str, int, int] | None = None

    @property
    def degree(self) -> int:
        """The degree ``h(D)``."""
        return len(self.coefficients) - 1

    @property
    def invariant(self) -> str:
        """The class invariant whose conjugates are the roots, in words."""
        if self.shape is not None:
            return even_weber_description(self.shape)
        base = "f(sqrt(-m))/sqrt(2)"
        return f"({base})^3" if self.power == 3 else base

    @property
    def j_relation(self) -> str:
        """How a root ``x`` gives a root ``j`` of ``H_D``."""
        if self.shape is not None:
            return even_weber_relation(self.shape)
        return f"j = (1 - 16u)^3/u^2, u = x^{8 if self.power == 3 else 24}"

    def root_count_mod(self, p: int) -> int:
        """Number of distinct roots modulo the prime ``p``."""
        return root_count_mod_prime(self.coefficients, p)

    def to_dict(self) -> dict:
        return {
            "discriminant": self.discriminant,
            "invariant": "weber",
            "invariant_value": self.invariant,
            "power": self.power,
            "weber_function": "f" if self.shape is None else self.shape[0],
            "sqrt2_exponent": self.power if self.shape is None else self.shape[2],
            "m": -self.discriminant if self.shape is None else -self.discriminant // 4,
            "j_relation": self.j_relation,
            "degree": self.degree,
            "coefficient_order": "descending",
            "coefficients": list(self.coefficients),
            "kind": "Hilbert" if discriminant_parts(self.discriminant)[1] == 1 else "ring",
            "working_digits": math.floor(self.working_bits * math.log10(2)),
            "verification": None if self.verification is None else self.verification.to_dict(),
        }

    def _text(self, latex: bool = False) -> str:
        return _polynomial_text(self.coefficients, latex)

    def __str__(self) -> str:
        return self._text()

    def __repr__(self) -> str:
        text = self._text()
        if len(text) > 80:
            text = text[:60] + " …"
        return f"WeberPolynomial(D={self.discriminant}, degree={self.degree}: {text})"

    def _how(self) -> str:
        s = f"roots {self.invariant} and conjugates; {self.j_relation}; certified by ball arithmetic at {self.working_bits} bits"
        if self.verification is not None:
            s += "; root counts modulo small primes checked"
        return s

    def _repr_latex_(self) -> str:
        return f"$W_{{{self.discriminant}}}(x) = {self._text(latex=True)}$ ({self._how()})"

    def _repr_html_(self) -> str:
        """Notebook display: the polynomial (shortened past 400 characters) and its provenance."""
        import html

        text = self._text()
        if len(text) > 400:
            text = text[:380] + " …"
        return f"W<sub>{self.discriminant}</sub>(x) = {html.escape(text)}<br><small>{html.escape(self._how())}</small>"


def _weber_ball_product(D: int, forms: Sequence[tuple[int, int, int]], prec: int, power: int):
    """∏(x − x_Q) as a real ball polynomial (conjugate pairs ``(a, ±b, c)`` as quadratics)."""
    from flint import arb_poly, ctx

    factors = []
    with (
        ctx.workprec(prec),
        progress_bar(total=len(forms), desc=f"Weber values (D = {D})", unit="form") as bar,
    ):
        for a, b, c in forms:
            bar.update(1)
            if b < 0:
                continue  # its value is the conjugate of that of (a, −b, c)
            A, B, _C = _normalised_form(a, b, c, D)
            x = _weber_value(A, B, D, power)
            if b == 0 or b == a or a == c:  # an ambiguous class: the value is real
                factors.append(arb_poly([-x.real, 1]))
            else:
                re, im = x.real, x.imag
                factors.append(arb_poly([re * re + im * im, -2 * re, 1]))
        return product_tree(factors)


@lru_cache(maxsize=32)
def _weber_polynomial(D: int, verify: bool) -> WeberPolynomial:
    forms = _reduced_forms(D)
    h = len(forms)
    shape = even_weber_shape(D) if D % 4 == 0 else None
    power = _weber_power(D) if shape is None else shape[1]
    s = power * math.pi * math.sqrt(-D) / (24 * math.log(2))
    prec = math.ceil(sum(s / a for a, _, _ in forms)) + h + 8 * math.ceil(math.log2(h + 2)) + 64
    if shape is not None:
        prec += 32  # room for the SL2(Z) transformation of τ_Q
    for _attempt in range(8):
        if shape is None:
            poly = _weber_ball_product(D, forms, prec, power)
        else:
            poly = _even_ball_product(D, forms, prec, shape)
        coeffs = certified_integer_coefficients(poly)
        if coeffs is not None:
            break
        prec += prec // 4 + 64
    else:  # pragma: no cover - would mean a wrong invariant
        raise RuntimeError(
            f"Weber polynomial of D = {D}: coefficient balls hold no unique integer at {prec} bits"
        )
    check = None
    if verify:
        primes, principal = _split_check(D, coeffs, forms)
        check = WeberCheck(prec, largest_radius_log2(poly), tuple(primes), tuple(principal))
    return WeberPolynomial(D, power, tuple(coeffs), tuple(Form(*f) for f in forms), prec, check, shape)


@announces_slowness(lambda D, **k: f"the Weber class polynomial of discriminant {D}")
def weber_polynomial(D: object, *, verify: bool = True) -> WeberPolynomial:
    """The Weber class polynomial of a discriminant ``D ≡ 1 (mod 8)`` or ``D = −4m``, ``D < 0``.

    For ``D ≡ 1 (mod 8)`` its roots are the conjugates of ``f(√−m)/√2`` (``m = −D``; cubed
    when ``3 | D``; see the module docstring for the conjugates, the relation
    ``j = (1 − 16u)³/u²`` and the certificate); for ``D = −4m`` those of
    ``F(√−m)^k/√2^e`` with ``F ∈ {f, f₁}`` and ``(k, e)`` by ``m mod 8`` (table and
    conjugates in :mod:`formkit.representation.weber_even`).  Either way they generate the
    ring class field of the order of discriminant ``D``, the field of the roots of ``H_D``.
    Results are cached.

    Parameters
    ----------
    D : int
        A negative discriminant with ``D ≡ 1 (mod 8)`` or ``D ≡ 0 (mod 4)``.
    verify : bool
        Check the root counts modulo small split primes (default ``True``); the rounding
        is certified in any case.

    Returns
    -------
    WeberPolynomial

    Raises
    ------
    NotAnIntegerError, DiscriminantError
        If ``D`` is not a negative discriminant, or ``D ≡ 5 (mod 8)`` (there Weber's
        functions give the ring class field of ``4D``).
    RuntimeError
        If a check fails (a bug; please report it).

    Examples
    --------
    >>> weber_polynomial(-23).coefficients     # Weber's x³ − x − 1
    (1, 0, -1, -1)
    >>> W = weber_polynomial(-71)
    >>> W.coefficients
    (1, -2, -1, 1, 1, 1, -1, -1)
    >>> weber_polynomial(-15).power, weber_polynomial(-15).degree   # 3 | D: the cube
    (3, 2)
    >>> W = weber_polynomial(-44)       # f(√−11): Weber's x³ − 2x² + 2x − 2
    >>> W.coefficients, W.invariant
    ((1, -2, 2, -2), 'f(sqrt(-m))')

    References
    ----------
    Yui–Zagier, Math. Comp. 66 (1997) (the invariant and its conditions on D);
    Schertz, JTNB 14 (2002) (N-systems).
    """
    D = _check_negative(D)
    if D % 8 == 5:
        raise DiscriminantError(
            f"the Weber class invariants need D ≡ 1 (mod 8) or D ≡ 0 (mod 4), not D = {D} (≡ 5 mod 8): "
            f"there Weber's functions generate the ring class field of 4D = {4 * D}, of degree 3h(D); "
            "use the class polynomial H_D"
        )
    return _weber_polynomial(D, bool(verify))
