"""Class polynomials of imaginary quadratic orders, from j-invariants, verified.

For a negative discriminant ``D`` the *class polynomial*

    H_D(x) = ∏_Q (x − j(τ_Q)),     τ_Q = (−b + √D) / (2a),

runs over the primitive reduced forms ``Q = (a, b, c)`` of discriminant ``D`` (one per
proper class).  For fundamental ``D`` this is the Hilbert class polynomial, whose
roots generate the Hilbert class field of ``Q(√D)``; for ``D = f²·d_K`` it is the ring
class polynomial of the order of conductor ``f``, whose roots generate the ring class
field of that order.  In both cases ``H_D`` is monic with integer coefficients and
irreducible over ``Q`` of degree ``h(D)`` (Cox, *Primes of the Form x² + ny²*,
Theorem 11.1 and Proposition 13.2; numbers as recalled).

*Computation.*  ``j(τ)`` is evaluated from the eta quotient
``t = Δ(2τ)/Δ(τ) = q·(P(q²)/P(q))²⁴`` with ``P(q) = ∏(1 − qⁿ) = Σ_k (−1)^k q^{k(3k−1)/2}``
(Euler's pentagonal number theorem) and ``j = (1 + 256 t)³ / t``; the pentagonal series
is summed in fixed-point integer arithmetic (all its terms have modulus < 1).  Complex
conjugate roots (the forms ``(a, ±b, c)``) are paired into real quadratic factors
``x² − 2Re(j)x + |j|²``, and the product of the factors is formed over the reals in
fixed point with ``⌈digits·log₂10⌉ + 8`` fractional bits, which gives the same absolute
accuracy ``≈ 10^(B − digits)`` as floating point at ``digits`` significant digits.

*Precision.*  For ``τ`` in the closure of the standard fundamental domain,
``|j(τ) − 1/q| ≤ 2079`` (A. Enge, "The complexity of class polynomial computation via
floating point approximations", Math. Comp. 78 (2009), Lemma 1; from memory), so
``1 + |j(τ_Q)| ≤ 2081·e^{π√|D|/a}``.  Every coefficient of a monic polynomial is
bounded by ``∏(1 + |root|)``, whence the stated bound

    log₁₀ max |coefficient| ≤ B(D) = Σ_Q π√|D| / (a·ln 10) + h·log₁₀ 2081,

which :func:`class_polynomial_bound` returns.  The product is computed with
``⌈B⌉ + 2⌈log₁₀(h + 2)⌉ + 25`` significant digits and rounded to integers.

*Verification* (on by default): (1) the computation is repeated with more digits
and the rounded coefficients must agree; (2) every coefficient must be within
``10⁻¹⁰`` of its rounding in both runs; (3) every coefficient must obey the bound
``B``; (4) for several primes ``p ∤ D`` with ``χ_D(p) = 1`` at which ``H_D`` is
squarefree modulo ``p`` (so ``p ∤ disc H_D``), ``H_D`` must have ``h`` roots modulo
``p`` when the prime form at ``p`` is principal and none otherwise — the splitting
behaviour that the theory predicts (Cox Theorem 9.2 for ``x² + ny²`` and
Theorem 9.4 for orders, numbers as recalled; ``p`` splits completely in the ring class
field iff it is represented by the principal form).  A failed check raises
:class:`RuntimeError` after one retry at higher precision.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §9 (Theorems 9.2,
       9.4), §11 (Theorem 11.1), §13 (class polynomials, Proposition 13.2, the examples
       for D = −15, −20, −23 at the end of §13); numbers as recalled.
.. [2] A. Enge, "The complexity of class polynomial computation via floating point
       approximations", Math. Comp. 78 (2009), 1089–1107.
.. [3] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §7.6 (computing class polynomials from q-expansions).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Sequence

import mpmath

from .core.arith import as_int, gcd, is_probable_prime, kronecker, mpz, next_prime
from .core.discriminants import discriminant_parts, validate_discriminant
from .core.polynomials_mod_p import is_squarefree_mod_prime, root_count_mod_prime
from .core.enumeration import _reduced_forms_cached
from .errors import DiscriminantError, FormError
from .core.forms import Form
from .core.raw_reduction import _reduce_definite_raw

__all__ = [
    "ClassPolynomial",
    "PolynomialDiscriminant",
    "class_polynomial",
    "class_polynomial_discriminant",
    "class_polynomial_bound",
    "j_invariant",
]

# |j(τ) − 1/q| ≤ 2079 on the fundamental domain (Enge 2009, Lemma 1; from memory).
_J_TAIL = 2079
_RESIDUAL_LIMIT = mpmath.mpf(10) ** -10


# ---------------------------------------------------------------------------
# the j-function


def _fixed(x, bits: int) -> int:
    """``round(x·2^bits)`` for an mpf ``x``, as an integer."""
    return int(mpmath.nint(mpmath.ldexp(x, bits)))


def _euler_product(q):
    """``∏(1 − qⁿ)`` for ``|q| < 1`` by Euler's pentagonal series ``Σ (−1)^k q^{k(3k∓1)/2}``.

    The series is summed in fixed point (integers scaled by ``2^P`` with ``P`` twenty
    bits beyond the current mpmath precision; every term has modulus < 1, so absolute
    accuracy is what matters) and returned as an mpc.  Summation stops when the next
    term is below ``2^{−P+2}``.
    """
    P = mpmath.mp.prec + 20
    qr, qi = _fixed(q.real, P), _fixed(q.imag, P)
    qr, qi = mpz(qr), mpz(qi)

    def mul(ar, ai, br, bi):
        return (ar * br - ai * bi) >> P, (ar * bi + ai * br) >> P

    sr, si = mpz(1) << P, mpz(0)
    kr, ki = qr, qi  # q^k
    cr, ci = qr, qi  # q^{k(3k−1)/2}
    k = 1
    while abs(cr) + abs(ci) > 4:
        tr, ti = mul(cr, ci, kr, ki)  # q^{k(3k+1)/2}
        if k & 1:
            sr -= cr + tr
            si -= ci + ti
        else:
            sr += cr + tr
            si += ci + ti
        k1r, k1i = mul(kr, ki, qr, qi)
        cr, ci = mul(*mul(tr, ti, kr, ki), k1r, k1i)  # exponent grows by 2k + 1
        kr, ki = k1r, k1i
        k += 1
    return mpmath.mpc(mpmath.ldexp(mpmath.mpf(int(sr)), -P), mpmath.ldexp(mpmath.mpf(int(si)), -P))


def _j_from_q(q):
    u = _euler_product(q * q) / _euler_product(q)
    u2 = u * u
    u8 = (u2 * u2) ** 2
    t = q * u8 * u8 * u8  # q·u²⁴
    v = 1 + 256 * t
    return v * v * v / t


def _j_of_form(a: int, b: int, D: int):
    """j((−b + √D)/2a) at the current precision (q = e^{−π√|D|/a}·e^{−πib/a})."""
    r = mpmath.exp(-mpmath.pi * mpmath.sqrt(-D) / a)
    q = r * mpmath.expjpi(mpmath.mpf(-b) / a)
    return _j_from_q(q)


def j_invariant(tau: object, *, digits: int = 30):
    """The modular invariant ``j(τ)`` (normalised so that ``j(i) = 1728``).

    Parameters
    ----------
    tau : complex, mpmath.mpc or Form
        A point of the upper half plane, or a positive definite form ``(a, b, c)``,
        standing for its root ``τ = (−b + √D)/(2a)`` in the upper half plane.
    digits : int
        Decimal digits of working precision (the result is accurate to about that
        many significant digits, relative to ``max(1, |j|)``).

    Returns
    -------
    mpmath.mpc

    Raises
    ------
    FormError
        If ``tau`` is not in the upper half plane or the form is not positive definite.

    Examples
    --------
    >>> j_invariant(1j).real
    mpf('1728.0')
    >>> round(float(j_invariant(Form(1, 1, 2)).real))
    -3375

    References
    ----------
    Cox, *Primes of the Form x² + ny²*, §11 (the j-function); Euler's pentagonal theorem.
    """
    digits = as_int(digits, "digits")
    if digits < 5:
        raise FormError(f"digits must be at least 5, not {digits}")
    with mpmath.workdps(digits + 10):
        if isinstance(tau, Form):
            if not tau.is_positive_definite:
                raise FormError(f"j_invariant needs a positive definite form, not {tau!r}")
            a, b, c = _reduce_definite_raw(tau.a, tau.b, tau.c)
            value = _j_of_form(a, b, tau.discriminant)
        else:
            try:
                z = mpmath.mpc(tau)
            except (TypeError, ValueError) as exc:
                raise FormError(f"tau must be a complex number or a Form, not {tau!r}") from exc
            if not z.imag > 0:
                raise FormError(f"tau must lie in the upper half plane (Im τ > 0), not {tau!r}")
            # move τ to the fundamental domain (τ ↦ τ + n, τ ↦ −1/τ)
            for _ in range(10_000):
                z -= mpmath.nint(z.real)
                if abs(z) < 1:
                    z = -1 / z
                else:
                    break
            value = _j_from_q(mpmath.exp(2j * mpmath.pi * z))
    with mpmath.workdps(digits):
        return +value


# ---------------------------------------------------------------------------
# reduced forms


def _reduced_forms(D: int) -> list[tuple[int, int, int]]:
    """All primitive reduced forms (a, b, c) of discriminant D < 0 (one per class)."""
    return [tuple(map(int, f)) for f in _reduced_forms_cached(D)]


def _check_negative(D: object) -> int:
    D = validate_discriminant(D)
    if D > 0:
        raise DiscriminantError(
            f"class polynomials are defined here for negative discriminants, not {D} "
            "(for D > 0 the class fields are not generated by values of j)"
        )
    return D


def class_polynomial_bound(D: object) -> float:
    """The bound ``B(D)`` on ``log₁₀`` of the largest coefficient of ``H_D``.

    ``B(D) = Σ_Q π√|D|/(a·ln 10) + h·log₁₀ 2081`` over the primitive reduced forms
    ``Q = (a, b, c)``; see the module docstring for the derivation.

    Parameters
    ----------
    D : int
        A negative discriminant.

    Returns
    -------
    float

    Raises
    ------
    DiscriminantError
        If ``D`` is not a negative discriminant.

    Examples
    --------
    >>> round(class_polynomial_bound(-23), 2)  # H_{-23} has coefficients up to ~1.3·10^13
    23.04

    References
    ----------
    Enge, Math. Comp. 78 (2009), Lemma 1 (|j − 1/q| ≤ 2079; from memory).
    """
    D = _check_negative(D)
    forms = _reduced_forms(D)
    s = math.sqrt(-D) * math.pi / math.log(10)
    return sum(s / a for a, _, _ in forms) + len(forms) * math.log10(_J_TAIL + 2)


# ---------------------------------------------------------------------------
# the polynomial


@dataclass(frozen=True)
class ClassPolynomialCheck:
    """How a class polynomial was verified.

    ``recomputed_digits``: digits of the second, independent computation;
    ``residual_exponent``: every coefficient was within ``10^residual_exponent`` of its
    rounding in both runs; ``bound_digits``: the bound ``B(D)`` (rounded up) that all
    coefficients obey; ``primes_checked``: primes at which the root count modulo p
    matched the prime-form class; ``principal_primes``: those among them represented by
    the principal form (where ``H_D`` splits into linear factors).
    """

    recomputed_digits: int
    residual_exponent: int
    bound_digits: int
    primes_checked: tuple[int, ...]
    principal_primes: tuple[int, ...]

    def to_dict(self) -> dict:
        return {
            "recomputed_digits": self.recomputed_digits,
            "residual_exponent": self.residual_exponent,
            "bound_digits": self.bound_digits,
            "primes_checked": list(self.primes_checked),
            "principal_primes": list(self.principal_primes),
        }


@dataclass(frozen=True)
class ClassPolynomial:
    """The class polynomial ``H_D(x)`` of a negative discriminant, with provenance.

    Attributes
    ----------
    discriminant : int
    coefficients : tuple of int
        Leading coefficient (1) first, constant term last.
    forms : tuple of Form
        The primitive reduced forms whose roots ``τ_Q`` give the roots ``j(τ_Q)``.
    working_digits : int
        Significant decimal digits used.
    verification : ClassPolynomialCheck or None
        ``None`` when computed with ``verify=False``.
    """

    discriminant: int
    coefficients: tuple[int, ...]
    forms: tuple[Form, ...]
    working_digits: int
    verification: "ClassPolynomialCheck | None"

    @property
    def degree(self) -> int:
        """The degree, equal to the class number ``h(D)``."""
        return len(self.coefficients) - 1

    @property
    def kind(self) -> str:
        """``"Hilbert"`` for fundamental ``D``, ``"ring"`` for an order of conductor > 1."""
        return "Hilbert" if discriminant_parts(self.discriminant)[1] == 1 else "ring"

    def __call__(self, x: int) -> int:
        v = 0
        for c in self.coefficients:
            v = v * x + c
        return v

    def root_count_mod(self, p: int) -> int:
        """Number of distinct roots of ``H_D`` modulo the prime ``p``."""
        return root_count_mod_prime(self.coefficients, p)

    def to_dict(self) -> dict:
        return {
            "discriminant": self.discriminant,
            "degree": self.degree,
            "coefficients": list(self.coefficients),
            "kind": self.kind,
            "working_digits": self.working_digits,
            "verification": None if self.verification is None else self.verification.to_dict(),
        }

    def _text(self, latex: bool = False) -> str:
        n = self.degree
        out = ""
        for i, c in enumerate(self.coefficients):
            e = n - i
            if c == 0:
                continue
            mono = "" if e == 0 else "x" if e == 1 else (f"x^{{{e}}}" if latex else f"x^{e}")
            body = (str(abs(c)) if (abs(c) != 1 or e == 0) else "") + mono
            if not out:
                out = ("-" if c < 0 else "") + body
            else:
                out += f" {'-' if c < 0 else '+'} {body}"
        return out or "0"

    def __str__(self) -> str:
        return self._text()

    def __repr__(self) -> str:
        text = self._text()
        if len(text) > 80:
            text = text[:60] + " …"
        return f"ClassPolynomial(D={self.discriminant}, degree={self.degree}: {text})"

    def _repr_latex_(self) -> str:
        return f"$H_{{{self.discriminant}}}(x) = {self._text(latex=True)}$"


def _product(D: int, forms: Sequence[tuple[int, int, int]], digits: int):
    """Integer coefficients (leading first) of ∏(x − j(τ_Q)) and the largest rounding residual.

    The j-values are computed with ``digits`` significant digits; the product is then
    formed in fixed point with ``P = ⌈digits·log₂10⌉`` fractional bits (exact integer
    arithmetic apart from one truncation per step), which keeps the same absolute
    accuracy ``≈ 10^{B − digits}`` as a floating-point product at ``digits`` digits.
    """
    P = math.ceil(digits * math.log2(10)) + 8
    one = mpz(1) << P
    poly = [one]  # leading first, fixed point
    with mpmath.workdps(digits):
        for a, b, c in forms:
            if b < 0:
                continue  # paired with (a, −b, c)
            j = _j_of_form(a, b, D)
            if b == 0 or b == a or a == c:  # real root: factor x − j
                s = mpz(_fixed(-j.real, P))
                new = poly + [mpz(0)]
                for i in range(1, len(new)):
                    new[i] += (s * poly[i - 1]) >> P
            else:  # conjugate pair: x² − 2 Re(j) x + |j|²
                s = mpz(_fixed(-2 * j.real, P))
                t = mpz(_fixed(j.real * j.real + j.imag * j.imag, P))
                n = len(poly)
                new = poly + [mpz(0), mpz(0)]
                for i in range(1, n + 2):
                    if i - 1 < n:
                        new[i] += (s * poly[i - 1]) >> P
                    if i >= 2:
                        new[i] += (t * poly[i - 2]) >> P
            poly = new
    half = one >> 1
    rounded = [int((x + half) >> P) for x in poly]
    worst = max(abs(x - (r << P)) for x, r in zip(poly, rounded))
    residual = mpmath.ldexp(mpmath.mpf(int(worst)), -P)
    return rounded, residual


def _working_digits(bound: float, h: int) -> int:
    return math.ceil(bound) + 2 * math.ceil(math.log10(h + 2)) + 25


@lru_cache(maxsize=64)
def _class_polynomial(D: int, verify: bool) -> ClassPolynomial:
    forms = _reduced_forms(D)
    h = len(forms)
    bound = class_polynomial_bound(D)
    digits = _working_digits(bound, h)
    for attempt in range(2):
        coeffs, res1 = _product(D, forms, digits)
        if not verify:
            break
        digits2 = digits + 20 + digits // 8
        coeffs2, res2 = _product(D, forms, digits2)
        residual = max(res1, res2)
        if coeffs == coeffs2 and residual < _RESIDUAL_LIMIT:
            break
        digits = digits2 + 20 + digits // 4  # one retry with more room
    else:
        raise RuntimeError(
            f"class polynomial of D = {D}: two computations at {digits} and {digits2} digits "
            f"disagree or do not round cleanly (largest residual {mpmath.nstr(residual, 5)})"
        )
    check = None
    if verify:
        limit = 10 ** math.ceil(bound)
        worst = max(abs(c) for c in coeffs)
        if worst > limit:
            raise RuntimeError(
                f"class polynomial of D = {D}: a coefficient of {len(str(worst))} digits exceeds "
                f"the bound 10^{math.ceil(bound)}"
            )
        primes, principal = _split_check(D, coeffs, forms)
        exp = math.floor(mpmath.log10(residual)) + 1 if residual > 0 else -digits
        check = ClassPolynomialCheck(
            recomputed_digits=digits2,
            residual_exponent=int(exp),
            bound_digits=math.ceil(bound),
            primes_checked=tuple(primes),
            principal_primes=tuple(principal),
        )
    return ClassPolynomial(
        discriminant=D,
        coefficients=tuple(coeffs),
        forms=tuple(Form(*f) for f in forms),
        working_digits=digits,
        verification=check,
    )


def _prime_form_is_principal(D: int, p: int) -> bool:
    """True if the prime form of discriminant D at the split prime p is principal."""
    f = Form.prime_form(D, p)
    return _reduce_definite_raw(f.a, f.b, f.c) == _reduce_definite_raw(*Form.principal(D).coefficients)


def _split_check(D: int, coeffs: list[int], forms, want: int = 6, want_principal: int = 2):
    """Check the root count of H_D modulo primes against the prime-form class.

    Uses ``want`` primes scanned upward from 3 and ``want_principal`` primes of the
    form Q₀(x, y) (principal form, found by scanning y = 1, 2 and x ≥ 0).
    """
    h = len(forms)
    checked: list[int] = []
    principal: list[int] = []

    def check(p: int) -> bool:
        if p == 2 or D % p == 0 or kronecker(D, p) != 1 or p in checked:
            return False
        if not is_squarefree_mod_prime(coeffs, p):
            return False  # p divides disc(H_D): the criterion says nothing
        n = root_count_mod_prime(coeffs, p)
        is_pr = _prime_form_is_principal(D, p)
        if n != (h if is_pr else 0):
            raise RuntimeError(
                f"class polynomial of D = {D} has {n} roots modulo {p}, but the prime form at "
                f"{p} is {'principal' if is_pr else 'not principal'} (expected {h if is_pr else 0})"
            )
        checked.append(p)
        if is_pr:
            principal.append(p)
        return True

    p = 2
    found = 0
    while found < want and p < 10**5:
        p = int(next_prime(p))
        found += check(p)
    # primes represented by the principal form: values x² + bxy + cy² with y ≥ 1
    a0, b0, c0 = Form.principal(D).coefficients
    found = 0
    x, y = 0, 1
    while found < want_principal and y <= 4:
        v = a0 * x * x + b0 * x * y + c0 * y * y
        if gcd(x, y) == 1 and is_probable_prime(v):
            found += check(int(v))
        x += 1
        if x > 60:
            x, y = 0, y + 1
    return checked, principal


def class_polynomial(D: object, *, verify: bool = True) -> ClassPolynomial:
    """The class polynomial ``H_D(x)`` of a negative discriminant ``D``.

    The Hilbert class polynomial when ``D`` is fundamental, the ring class polynomial
    of the order of discriminant ``D`` otherwise: ``∏ (x − j(τ_Q))`` over the primitive
    reduced forms ``Q`` of discriminant ``D``, computed with mpmath at a precision
    derived from :func:`class_polynomial_bound`, rounded to integers and verified as
    described in the module docstring.  Results are cached.

    Parameters
    ----------
    D : int
        A negative discriminant (``D ≡ 0, 1 mod 4``).
    verify : bool
        Run the verification (second computation at higher precision, rounding
        residuals, coefficient bound, root counts modulo primes).  Default ``True``.

    Returns
    -------
    ClassPolynomial

    Raises
    ------
    NotAnIntegerError, DiscriminantError
        If ``D`` is not a negative discriminant.
    RuntimeError
        If a verification check fails (this would be a bug; please report it).

    Examples
    --------
    >>> class_polynomial(-4).coefficients
    (1, -1728)
    >>> H = class_polynomial(-15)
    >>> H.coefficients, H.kind
    ((1, 191025, -121287375), 'Hilbert')
    >>> class_polynomial(-16).coefficients, class_polynomial(-16).kind
    ((1, -287496), 'ring')

    References
    ----------
    Cox, *Primes of the Form x² + ny²*, §13 (Theorem 13.2 / Proposition 13.2 as
    recalled; the worked examples for D = −15, −20, −23).
    """
    D = _check_negative(D)
    return _class_polynomial(D, bool(verify))


@dataclass(frozen=True)
class PolynomialDiscriminant:
    """``disc(H_D)`` and its prime factors up to a trial-division bound.

    ``value`` is the exact discriminant; ``factors`` the pairs ``(p, e)`` found by trial
    division by the primes ``≤ trial_bound``; ``cofactor = |value|/∏ p^e`` is what is
    left (1 when the factorisation is complete, see :attr:`complete`).
    """

    discriminant: int
    value: int
    factors: tuple[tuple[int, int], ...]
    cofactor: int
    trial_bound: int

    @property
    def complete(self) -> bool:
        """True when ``|value|`` is the product of ``factors``."""
        return self.cofactor == 1

    @property
    def primes(self) -> tuple[int, ...]:
        """The primes found dividing ``disc(H_D)``."""
        return tuple(p for p, _e in self.factors)

    def to_dict(self) -> dict:
        """JSON-ready dictionary (the value itself as an exact integer)."""
        return {"discriminant": self.discriminant, "value": self.value, "digits": len(str(abs(self.value))),
                "factors": [list(f) for f in self.factors], "cofactor": self.cofactor,
                "complete": self.complete, "trial_bound": self.trial_bound}


def class_polynomial_discriminant(D: object, *, trial_bound: "int | None" = None) -> PolynomialDiscriminant:
    """The discriminant of the class polynomial ``H_D`` and its prime factors.

    For monic ``H`` of degree ``h``, ``disc(H) = (−1)^(h(h−1)/2)·Res(H, H')``, computed
    exactly over the integers (sympy's resultant).  A prime ``p`` divides it exactly when
    ``H`` has a repeated root modulo ``p``, which is where the class-polynomial criterion
    for primes ``p = x² + ny²`` needs ``p ∤ D·disc(H)`` (Cox Thm 9.2, as recalled).  The
    prime factors are found by trial division up to ``trial_bound`` (default ``|D|``; in
    every case we tried they were all below ``|D|`` — small primes, as the theory of
    singular moduli of Gross and Zagier leads one to expect — but no bound is assumed:
    whatever is left is reported as ``cofactor``).

    Parameters
    ----------
    D : int
        A negative discriminant.
    trial_bound : int, optional
        Largest prime tried (default ``|D|``).

    Returns
    -------
    PolynomialDiscriminant

    Raises
    ------
    NotAnIntegerError, DiscriminantError
        If ``D`` is not a negative discriminant.
    FormkitError
        If ``trial_bound`` is not an integer in ``[2, 10^9]``.

    Examples
    --------
    >>> d = class_polynomial_discriminant(-15)     # H = x² + 191025x − 121287375
    >>> d.value == 191025**2 + 4 * 121287375, d.complete, d.primes
    (True, True, (3, 5, 7, 13))
    >>> class_polynomial_discriminant(-4).value   # degree 1: the empty product
    1

    References
    ----------
    Cox, *Primes of the Form x² + ny²*, Theorem 9.2 (as recalled); B. Gross, D. Zagier,
    "On singular moduli", J. reine angew. Math. 355 (1985).
    """
    import sympy

    from .errors import FormkitError

    D = _check_negative(D)
    bound = abs(D) if trial_bound is None else as_int(trial_bound, "trial_bound")
    if not 2 <= bound <= 10**9:
        raise FormkitError(f"trial_bound must be an integer in [2, 10^9], not {bound}")
    coeffs = class_polynomial(D).coefficients
    x = sympy.Symbol("x")
    value = int(sympy.discriminant(sympy.Poly(coeffs, x, domain="ZZ")))
    rest = abs(value)
    factors = []
    for p in sympy.primerange(2, bound + 1):
        if rest == 1:
            break
        e = 0
        while rest % p == 0:
            rest //= p
            e += 1
        if e:
            factors.append((int(p), e))
    return PolynomialDiscriminant(D, value, tuple(factors), rest, bound)
