"""The Epstein zeta function Z_Q(s) = Σ'_{(x,y)} Q(x, y)^(−s) of a positive definite form, certified.

**Expansion** (Chowla–Selberg 1949/1967, Bateman–Grosswald 1964; derived here by
Poisson summation over ``x`` for each ``y ≠ 0``, with
``∫(1 + u²)^(−s)e^(−iωu)du = 2√π/Γ(s)·(|ω|/2)^(s−½)·K_{s−½}(|ω|)``).  For a reduced form
``Q = (a, b, c)`` of discriminant ``D < 0``:

    Z_Q(s) = 2ζ(2s)·a^(−s)
           + √π·4^s·a^(s−1)·|D|^(½−s)·Γ(s−½)ζ(2s−1)/Γ(s)
           + 2^(s+5/2)·π^s·a^(−½)·|D|^((1−2s)/4)/Γ(s)
               · Σ_{n≥1} n^(s−½)·σ_{1−2s}(n)·cos(πnb/a)·K_{s−½}(πn√|D|/a),

with ``σ_z(n) = Σ_{d|n} d^z``.  The expansion holds for every ``s``: it is the analytic
continuation, with its only pole at ``s = 1`` (residue ``2π/√|D|``, from ``ζ(2s−1)``).
For ``Re s < ½`` the middle term is evaluated through ζ's functional equation,
``Γ(s−½)ζ(2s−1) = π^(2s−3/2)·Γ(1−s)·ζ(2−2s)``; at ``s = ½`` the first two terms have
opposite poles and together equal ``a^(−½)·(2γ + log(|D|/(64π²a²)))``;
``Z_Q(0) = −1`` and ``Z_Q(−k) = 0`` for ``k ≥ 1`` (exact).

**Tail bound.**  ``|K_ν(x)| ≤ K_μ(x) ≤ √(2π/x)·e^(−x + μ²/(2x))`` with ``μ = |Re ν|``
(``cosh t ≥ 1 + t²/2`` and ``cosh(μt) ≤ e^(μt)`` in ``K_μ(x) = ∫_0^∞ e^(−x cosh t)cosh(μt)dt``)
and ``|n^(s−½)σ_{1−2s}(n)| ≤ n^(μ+1)`` bound the terms ``n > N``; since
``πn√|D|/a ≥ π√3·n`` for a reduced form, about ``digits/2.4`` terms are needed.  The
ζ-values come from :func:`formkit.analytic.l_series.riemann_zeta`'s series; everything
is ball arithmetic (python-flint) and certified as in :mod:`formkit.analytic.balls` —
the tail bound and the widening of flint's ``K_ν`` for the radii of its arguments too
(floating point only chooses the number of terms).

**Kronecker's first limit formula.**  With ``τ_Q = (−b + i√|D|)/(2a)``,

    Z_Q(s) = (2π/√|D|)/(s − 1) + C_Q + O(s − 1),
    C_Q = (2π/√|D|)·(2γ − log(2√|D|) − 2·log(√(Im τ_Q)·|η(τ_Q)|²)),

obtained from ``E(τ, s) = Σ' y^s/|mτ + n|^(2s) = π/(s−1) + 2π(γ − log 2 − log(√y|η(τ)|²)) + …``
(Kronecker; Siegel, *Lectures on Advanced Analytic Number Theory*, Ch. I, from memory)
since ``Z_Q(s) = (√|D|/2)^(−s)·E(τ_Q, s)``.  :func:`kronecker_limit` computes ``C_Q``
through η and checks it against the constant term of the expansion above,
``2ζ(2)/a + (4π/√|D|)(γ + ½log(a/|D|)) + (third term at s = 1)``.

References
----------
.. [1] S. Chowla, A. Selberg, "On Epstein's zeta-function", J. reine angew. Math. 227
       (1967), 86–110.
.. [2] P. T. Bateman, E. Grosswald, "On Epstein's zeta function", Acta Arith. 9
       (1964), 365–373.
.. [3] C. L. Siegel, *Lectures on Advanced Analytic Number Theory*, Tata Institute,
       1961, Ch. I (Kronecker's limit formulas).
.. [4] D. Zagier, *Zetafunktionen und quadratische Körper*, Springer 1981, §10.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction
from typing import Any

from ..core.arith import divisors
from ..core.forms import Form, FormLike, as_form
from ..core.reduction import reduced
from ..errors import FormError, FormkitError
from .balls import (
    CertifiedValue,
    ComplexArgument,
    as_complex_argument,
    ball_upper,
    bits_for,
    certified,
    check_digits,
    meets,
)
from .l_series import _error_ball, _series_value

__all__ = ["epstein_cost", "epstein_zeta", "KroneckerLimit", "kronecker_limit"]


def _definite(form: FormLike) -> Form:
    Q = as_form(form)
    D = Q.discriminant
    if D >= 0 or not Q.is_positive_definite:
        what = "indefinite" if D > 0 else ("degenerate" if D == 0 else Q.kind)
        raise FormError(
            f"the Epstein zeta function Σ' Q(x, y)^(−s) is defined for positive definite forms; "
            f"{Q!r} (D = {D}) is {what}"
        )
    return Q


def _zeta_ball(u: ComplexArgument, digits: int):
    from flint import arb, fmpq

    if u.is_integer and u.real <= 0:
        from .special_values import _zeta_nonpositive

        z = _zeta_nonpositive(-int(u.real))
        return arb(fmpq(z.numerator, z.denominator))
    return _series_value(1, u, digits)[0]


def _bessel_tail_ball(absD: int, a: int, mu: Fraction, N: int):
    """The bound ``b(N+1)/(1 − ρ)`` for ``Σ_{n>N}`` of the K-Bessel terms, in ball arithmetic.

    ``b(n) = n^E·√(2π/x)·e^(−x + μ²/(2x))``, ``x = nα``, ``α = π√|D|/a``, ``E = μ + 1``, and
    ``b(n+1)/b(n) ≤ ρ = (1 + 1/(N+1))^E·e^(−α)`` for ``n > N`` (the exponent
    ``−x − ½log x + μ²/(2x)`` decreases); ``None`` if ``ρ < 1`` is not certain.
    """
    from flint import arb, fmpq

    mu_b = arb(fmpq(mu.numerator, mu.denominator))
    E = mu_b + 1
    alpha = arb.pi() * arb(absD).sqrt() / a
    n1 = N + 1
    x = alpha * n1
    b = (E * arb(n1).log()).exp() * (2 * arb.pi() / x).sqrt() * (-x + mu_b * mu_b / (2 * x)).exp()
    rho = (E * (1 + arb(1) / n1).log()).exp() * (-alpha).exp()
    if not rho < 1:  # pragma: no cover - alpha ≥ π√3 and N chosen with ρ < 0.9
        return None
    return b / (1 - rho)


def _bessel_terms_needed(alpha: float, mu: float, log_tol: float) -> tuple[int, float]:
    """``(N, tail)`` with the bound for ``Σ_{n>N}`` below ``e^log_tol`` (floats: they only choose
    ``N``; the bound added to the value is :func:`_bessel_tail_ball`)."""
    E = mu + 1

    def log_b(n: int) -> float:
        x = n * alpha
        return E * math.log(n) + 0.5 * math.log(2 * math.pi / x) - x + mu * mu / (2 * x)

    N = 1
    while True:
        rho = (1 + 1 / (N + 1)) ** E * math.exp(-alpha)
        if rho < 0.9:
            log_tail = log_b(N + 1) - math.log(1 - rho)  # in logs: e^(−745) underflows
            if log_tail < log_tol:
                return N, math.exp(log_tail) * (1 + 1e-9)
        N += 1
        if N > 100_000:  # pragma: no cover - alpha ≥ π√3 makes this impossible
            raise ArithmeticError("Bessel series does not converge")


def _bessel_k(x, nu):
    """``K_ν(x)`` as a ball: flint's value at the exact midpoints of ``x`` and ``ν``, widened.

    flint's ``K_ν`` magnifies the radii of its arguments by about ``e^(2x)``; instead it
    is evaluated at the (exact) midpoints and the effect of the radii is bounded with
    ``|∂K_ν/∂x| ≤ √(2π/x)·e^(−x + (μ+1)²/(2x))`` and
    ``|∂K_ν/∂ν| ≤ √(2π/x)·e^(−x + μ²/(2x))·(μ/x + √(2/(πx)))``, ``μ ≥ |Re ν|`` (from
    ``K_ν(x) = ∫_0^∞ e^(−x cosh t)·cosh(νt) dt`` and ``cosh t ≥ 1 + t²/2``).
    """
    from flint import acb, arb, ctx

    xm = arb(x.mid())
    x_rad_b = arb(x.rad())
    num: acb | arb
    if isinstance(nu, acb):
        num = acb(arb(nu.real.mid()), arb(nu.imag.mid()))
        nu_rad_b = arb(nu.real.rad()) + arb(nu.imag.rad())
        mu_b = abs(arb(nu.real.mid())) + nu_rad_b
    else:
        num = arb(nu.mid())
        nu_rad_b = arb(nu.rad())
        mu_b = abs(arb(nu.mid())) + nu_rad_b

    def k_at(bits: int):
        # K_ν(x) = √π·(2x)^ν·e^(−x)·U(ν + ½, 2ν + 1, 2x) (DLMF 10.39.6): flint's own K_ν
        # runs for minutes at some (precision, x) (e.g. 1400 bits at x ≈ 300), its U does not
        with ctx.workprec(bits):
            n = acb(num)
            two_x = acb(2 * xm)
            k = arb.pi().sqrt() * two_x**n * (-xm).exp() * two_x.hypgeom_u(n + arb(1) / 2, 2 * n + 1)
            return k if isinstance(num, acb) else k.real

    value = k_at(ctx.prec)
    if value.rel_accuracy_bits() < ctx.prec - 12:
        value = k_at(2 * ctx.prec - value.rel_accuracy_bits() + 20)
    # the bounds decrease in x: evaluate them (in ball arithmetic) at the left end x_lo of the ball
    x_lo = xm - x_rad_b
    if not x_lo > 0:  # pragma: no cover - x ≥ π√3
        raise ArithmeticError("K-Bessel argument ball reaches 0")
    if x_rad_b == 0 and nu_rad_b == 0:
        return value
    base = (2 * arb.pi() / x_lo).sqrt() * (-x_lo).exp()
    widen = x_rad_b * base * ((mu_b + 1) ** 2 / (2 * x_lo)).exp()
    widen += (
        nu_rad_b * base * (mu_b * mu_b / (2 * x_lo)).exp() * (mu_b / x_lo + (2 / (arb.pi() * x_lo)).sqrt())
    )
    return value + _error_ball(widen, isinstance(value, acb))


def _third_term(a: int, b: int, absD: int, s: ComplexArgument, prec: int, log_tol: float):
    """The K-Bessel part (third line of the module docstring) and the number of terms."""
    from flint import acb, arb, ctx, fmpq

    with ctx.workprec(prec):
        sb = s.ball()
        sb = acb(sb) if s.is_real is False else sb
        mu = abs(float(s.real) - 0.5)
        alpha_f = math.pi * math.sqrt(absD) / a
        coeff = (
            (sb + arb(5) / 2) * arb(2).log()
            + sb * arb.pi().log()
            - arb(a).log() / 2
            + (1 - 2 * sb) / 4 * arb(absD).log()
        ).exp() * sb.rgamma()
        scale = max(ball_upper(coeff), 1e-300)
        N, _tail = _bessel_terms_needed(alpha_f, mu, log_tol - math.log(scale))
        tail = _bessel_tail_ball(absD, a, abs(s.real - Fraction(1, 2)), N)
        if tail is None:  # pragma: no cover
            raise ArithmeticError(f"the K-Bessel tail bound does not apply at N = {N}")
        total = arb(0) if s.is_real else acb(0)
        one_minus_2s = 1 - 2 * sb
        for n in range(1, N + 1):
            sig = sum(((arb(d).log() * one_minus_2s).exp() for d in divisors(n)), arb(0) * sb)
            x = arb.pi() * arb(absD).sqrt() * n / a
            k = _bessel_k(x, (s - Fraction(1, 2)).ball())
            total += ((sb - arb(1) / 2) * arb(n).log()).exp() * sig * arb.cos_pi_fmpq(fmpq(n * b, a)) * k
        total += _error_ball(tail, isinstance(total, acb))
        return coeff * total, N


def _epstein_ball(a: int, b: int, c: int, s: ComplexArgument, digits: int, extra_bits: int):
    from flint import arb, ctx

    absD = 4 * a * c - b * b
    half = ComplexArgument(Fraction(1, 2))
    near_half = abs(complex(float((s - half).real), float((s - half).imag)))
    extra = extra_bits + int(math.pi * abs(float(s.imag)) / (2 * math.log(2))) + 10
    if 0 < near_half < 1:
        extra += int(-math.log2(near_half)) + 4
    bits = bits_for(digits) + extra
    zeta_digits = digits + math.ceil(extra / 3.3) + 2
    prec = bits + 20
    with ctx.workprec(prec):
        sb = s.ball()
        euler = arb.const_euler()
        if s == half:
            first_two = (2 * euler + (arb(absD) / (64 * arb.pi() ** 2 * a * a)).log()) / arb(a).sqrt()
        else:
            first = 2 * _zeta_ball(s * 2, zeta_digits) * (-sb * arb(a).log()).exp()
            common = (
                arb.pi().sqrt()
                * (sb * arb(4).log() + (sb - 1) * arb(a).log() + (arb(1) / 2 - sb) * arb(absD).log()).exp()
                * sb.rgamma()
            )
            if s.real >= Fraction(1, 2):
                second = common * (sb - arb(1) / 2).gamma() * _zeta_ball(s * 2 - 1, zeta_digits)
            else:
                second = (
                    common
                    * ((2 * sb - arb(3) / 2) * arb.pi().log()).exp()
                    * (1 - sb).gamma()
                    * _zeta_ball(2 - s * 2, zeta_digits)
                )
            first_two = first + second
        log_tol = -bits * math.log(2) + math.log(max(ball_upper(first_two), 1e-300))
        third, N = _third_term(a, b, absD, s, prec, log_tol)
        return first_two + third, N


def epstein_cost(form: FormLike, s: object, digits: int) -> tuple[float, float, int]:
    """``(seconds, bytes, N)`` estimated for :func:`epstein_zeta`, ``N`` its K-Bessel terms.

    The two ζ-values are priced by :func:`formkit.analytic.l_series.series_cost`; each
    K-Bessel term costs about ``10⁻⁴ + 4·10⁻⁹·b²`` s at ``b`` bits (one confluent
    hypergeometric ``U`` and the divisor sum: 0.05 s at 3400 bits), and ``N`` is the
    count :func:`epstein_zeta` chooses (about ``b·log 2/(π√|D|/a)``, fewer for larger
    ``|D|``).  Checked against an instrumented run in
    ``tests/analytic/test_analytic_cost.py``.

    Examples
    --------
    >>> t, m, N = epstein_cost((1, 1, 6), 2, 1000)
    >>> 100 < N < 200, t < 1800
    (True, True)
    """
    from .l_series import series_cost

    R = reduced(_definite(form))
    s = as_complex_argument(s)
    digits = check_digits(digits)
    absD = -R.discriminant
    bits = bits_for(digits) + int(math.pi * abs(float(s.imag)) / (2 * math.log(2))) + 30
    mu = abs(float(s.real) - 0.5)
    alpha = math.pi * math.sqrt(absD) / R.a
    N, _tail = _bessel_terms_needed(alpha, mu, -bits * math.log(2))
    seconds = N * (1e-4 + 4e-9 * bits * bits)
    memory = 10.0**6
    for u in (s * 2, s * 2 - 1 if s.real >= Fraction(1, 2) else 2 - s * 2):
        if not (u.is_integer and u.real <= 1):
            t, m = series_cost(1, u, digits + bits // 30)
            seconds, memory = seconds + t, max(memory, m)
    return seconds, memory, N


def epstein_zeta(form: FormLike, s: object, *, digits: int = 30) -> CertifiedValue:
    """The Epstein zeta function ``Z_Q(s) = Σ_{(x,y) ≠ (0,0)} Q(x, y)^(−s)``, continued to ``s ≠ 1``.

    Parameters
    ----------
    form : FormLike
        A positive definite form (any content; it is reduced first, ``Z_Q`` being an
        invariant of the class).
    s : number or text
        Any complex ``s ≠ 1``.
    digits : int
        Significant digits certified.

    Returns
    -------
    CertifiedValue

    Raises
    ------
    FormError
        If the form is not positive definite.
    FormkitError
        At the pole ``s = 1`` (use :func:`kronecker_limit`), or when the value cannot be
        certified.

    Examples
    --------
    >>> epstein_zeta((1, 0, 1), 2, digits=20).text()     # 4ζ(2)β(2) = 4·(π²/6)·G
    '6.0268120396919401235'
    >>> epstein_zeta((1, 1, 1), 0).exact
    Fraction(-1, 1)

    References
    ----------
    Chowla–Selberg (1967); Bateman–Grosswald (1964).
    """
    Q = _definite(form)
    s = as_complex_argument(s)
    digits = check_digits(digits)
    quantity = f"Z_Q(s), Q = ({Q.a}, {Q.b}, {Q.c})"
    if s.is_integer and s.real == 1:
        D = Q.discriminant
        raise FormkitError(
            f"s = 1 is the pole of Z_Q(s) for Q = ({Q.a}, {Q.b}, {Q.c}) (residue 2π/√{-D}); "
            "the constant term there is given by kronecker_limit (formkit epstein Q --limit-formula)"
        )
    if s.is_integer and s.real <= 0:
        import mpmath

        exact = Fraction(-1) if s.real == 0 else Fraction(0)
        return CertifiedValue(
            quantity,
            s,
            mpmath.mpf(int(exact)),
            0.0,
            digits,
            "value 2ζ(2s)·a^(−s) of the expansion, the other terms vanishing with 1/Γ(s)",
            0,
            exact,
        )
    from ..core.budget import check_cost

    seconds, memory, terms = epstein_cost(Q, s, digits)
    check_cost(
        f"Z_Q(s) for Q = ({Q.a}, {Q.b}, {Q.c}) at s = {s} to {digits} digits ({terms} K-Bessel terms and two ζ-values)",
        seconds=seconds,
        memory=memory,
        further="fewer --digits reach further",
    )
    R = reduced(Q)
    a, b, c = R.a, R.b, R.c
    extra = 0
    for _attempt in range(3):
        value, N = _epstein_ball(a, b, c, s, digits, extra)
        if meets(value, digits):
            break
        extra += 64
    return certified(
        value,
        digits,
        quantity=quantity,
        s=s,
        method=(
            f"Chowla–Selberg expansion (ζ-terms and {N} K-Bessel terms, explicit tail bound), "
            "ball arithmetic (unconditional)"
        ),
        terms=N,
        form=Q.to_list(),
    )


@dataclass(frozen=True)
class KroneckerLimit:
    """``Z_Q(s) = residue/(s − 1) + constant_term + O(s − 1)`` (Kronecker's first limit formula).

    ``constant_term`` comes from ``η(τ_Q)``; ``constant_term_series`` is the same number
    from the Chowla–Selberg expansion, and ``agrees`` says whether the two balls overlap
    at the working precision (a built-in check).
    """

    form: Form
    tau: Any
    eta: CertifiedValue
    residue: CertifiedValue
    constant_term: CertifiedValue
    constant_term_series: CertifiedValue
    agrees: bool

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return {
            "form": self.form.to_list(),
            "tau": [str(self.tau.real), str(self.tau.imag)],
            "eta": self.eta.to_dict(),
            "residue": self.residue.to_dict(),
            "constant_term": self.constant_term.to_dict(),
            "constant_term_series": self.constant_term_series.to_dict(),
            "agrees": self.agrees,
        }

    def __repr__(self) -> str:
        c = self.constant_term.text()
        return (
            f"KroneckerLimit(Q=({self.form.a}, {self.form.b}, {self.form.c}): Z_Q(s) = {self.residue.text()}/(s−1) "
            f"{'−' if c.startswith('-') else '+'} {c.lstrip('-')} + O(s−1); "
            f"η-value and series {'agree' if self.agrees else 'DISAGREE'})"
        )

    def _repr_html_(self) -> str:
        return (
            f"<p>Kronecker's limit formula for Q = ({self.form.a}, {self.form.b}, {self.form.c}):<br>"
            f"residue 2π/√|D| = <code>{self.residue.text()}</code>, constant term "
            f"<code>{self.constant_term.text()}</code> (through η(τ_Q)); series check: "
            f"{'agrees' if self.agrees else 'DISAGREES'}</p>"
        )

    def _repr_latex_(self) -> str:
        return (
            rf"$Z_Q(s) = \frac{{{self.residue.text()}}}{{s-1}} + {self.constant_term.text()} + O(s-1)$"
            rf"\quad\text{{(through $\eta(\tau_Q)$; series check {'agrees' if self.agrees else 'fails'})}}"
        )


def kronecker_limit(form: FormLike, *, digits: int = 30) -> KroneckerLimit:
    """Residue and constant term of ``Z_Q(s)`` at ``s = 1``, through Dedekind's η at ``τ_Q``.

    Raises
    ------
    FormError
        If the form is not positive definite.

    Examples
    --------
    >>> k = kronecker_limit((1, 0, 1), digits=20)
    >>> k.residue.text(), k.agrees          # 2π/√4 = π
    ('3.1415926535897932385', True)
    """
    from flint import arb, ctx

    from .eta import _eta_ball, dedekind_eta, form_root

    Q = _definite(form)
    digits = check_digits(digits)
    R = reduced(Q)
    a, b, c = R.a, R.b, R.c
    absD = 4 * a * c - b * b
    s1 = as_complex_argument(1)
    eta = dedekind_eta(R, digits=digits + 10)
    prec = bits_for(digits + 10) + 20
    with ctx.workprec(prec):
        import mpmath

        tau = form_root(R)
        eta_abs2 = abs(_eta_ball(tau, prec)) ** 2
        root_d = arb(absD).sqrt()
        residue = 2 * arb.pi() / root_d
        euler = arb.const_euler()
        y = root_d / (2 * a)
        constant = residue * (2 * euler - (2 * root_d).log() - 2 * (y.sqrt() * eta_abs2).log())
        # the same constant from the expansion
        series_first = 2 * (arb.pi() ** 2 / 6) / a + 4 * arb.pi() / root_d * (
            euler + (arb(a) / absD).log() / 2
        )
        third, N = _third_term(a, b, absD, s1, prec, -prec * math.log(2) + 2)
        series = series_first + third
        agrees = bool(constant.overlaps(series))
    method = "Kronecker's first limit formula through η(τ_Q) (pentagonal series), ball arithmetic"
    return KroneckerLimit(
        Q,
        mpmath.mpc(float(tau.real.mid()), float(tau.imag.mid())),
        eta,
        certified(residue, digits, quantity="residue of Z_Q at s = 1", s=s1, method="2π/√|D|", terms=0),
        certified(constant, digits, quantity="constant term of Z_Q at s = 1", s=s1, method=method, terms=0),
        certified(
            series,
            digits,
            quantity="constant term of Z_Q at s = 1",
            s=s1,
            method=f"Chowla–Selberg expansion at s = 1 ({N} K-Bessel terms)",
            terms=N,
        ),
        agrees,
    )
