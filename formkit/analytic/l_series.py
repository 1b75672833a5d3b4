"""L(s, χ_D) and ζ(s) at any complex s, certified, and their exact values at s = 0, −1, −2, ….

**The method** (Riemann's for ζ, Lavrik's for Dirichlet L-series; Cohen, *Advanced
Topics in Computational Number Theory*, §10.3, from memory).  Let ``χ = χ_d`` be the
Kronecker character of a fundamental discriminant ``d ≠ 1``: a real primitive
character of conductor ``q = |d|`` and parity ``a = 0`` (``d > 0``) or ``1`` (``d < 0``),
whose root number is 1.  With ``Λ(s) = (q/π)^((s+a)/2)·Γ((s+a)/2)·L(s, χ)`` the theta
function ``Σ χ(n)·n^a·e^(−πn²t/q)`` and its transformation under ``t ↦ 1/t`` give, for
*every* ``s``,

    Λ(s) = Σ_{n ≥ 1} χ(n)·n^a·[E_{1−σ₁}(x_n) + E_{1−σ₂}(x_n)],
    x_n = πn²/q,  σ₁ = (s + a)/2,  σ₂ = (1 − s + a)/2,

where ``E_p(x) = x^(p−1)·Γ(1−p, x) = ∫_1^∞ e^(−xt)·t^(−p) dt`` is the generalised
exponential integral.  For ζ (``q = 1``, ``a = 0``) the same identity holds with the two
polar terms ``−1/s − 1/(1 − s)`` added.  The functional equation is built in, the
series converges like ``e^(−πn²/q)``, so about ``√(q·digits)`` terms are needed.

**Error bound and blocks** (:mod:`formkit.analytic.theta_split_series`).  The terms
``n > N`` are bounded explicitly through ``|E_{1−σ}(x)| ≤ e^(−x)/(x − c)``, the bound
evaluated in ball arithmetic and added to the radius; for large ``q`` the terms are summed
in blocks by Taylor expansion of ``E`` at the block centre, with exact integer moments (the
high ones in doubles with a proved rounding bound) and an explicit remainder.

All arithmetic is ball arithmetic (python-flint's ``arb``), so rounding errors are
bounded as well; the result is returned only when its radius meets the requested
digits (:mod:`formkit.analytic.balls`), after at most three attempts at rising
working precision.  For imprimitive ``χ_D`` (``D = f²·d_K``) the finite Euler factor
``∏_{p|f}(1 − χ_{d_K}(p)·p^(−s))`` is multiplied in.

**Exact values.**  ``L(1 − k, χ) = −B_{k,χ}/k`` with the generalised Bernoulli number
``B_{k,χ} = F^(k−1)·Σ_{a=1}^{F} χ(a)·B_k(a/F)`` for any period ``F`` of ``χ``, and
``ζ(1 − k) = −B_k/k`` (``B_1 = +1/2`` there, so ``ζ(0) = −1/2``) (Washington,
*Introduction to Cyclotomic Fields*, §4.1, Theorem 4.2; from memory) — in
:mod:`formkit.analytic.special_values`.

References
----------
.. [1] B. Riemann, "Über die Anzahl der Primzahlen unter einer gegebenen Grösse", 1859
       (the theta-function proof of the functional equation).
.. [2] H. Davenport, *Multiplicative Number Theory*, 3rd ed., GTM 74, Ch. 9 (the
       functional equation of L(s, χ); the Gauss sum of a real character).
.. [3] H. Cohen, *Advanced Topics in Computational Number Theory*, GTM 193,
       Springer 2000, §10.3 (computing L-series with incomplete gamma functions).
.. [4] L. C. Washington, *Introduction to Cyclotomic Fields*, 2nd ed., GTM 83, §4.1.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction

from ..core.arith import kronecker
from ..core.discriminants import discriminant_parts, validate_discriminant
from ..core.factorisation import prime_factorisation
from ..errors import FormkitError
from . import theta_split_series as _engine  # its tunables are read where they live
from .balls import (
    CertifiedValue,
    ComplexArgument,
    as_complex_argument,
    ball_lower,
    bits_for,
    certified,
    check_digits,
    meets,
)
from .special_values import _zeta_nonpositive, l_series_at_nonpositive_integer
from .theta_split_series import MAX_SERIES_TERMS as MAX_SERIES_TERMS
from .theta_split_series import _character_table as _character_table  # the older import path
from .theta_split_series import _error_ball as _error_ball  # the older import path
from .theta_split_series import _gamma_factor, _lambda, _log_scale, _terms_needed

__all__ = [
    "MAX_SERIES_TERMS",
    "series_cost",
    "series_terms",
    "l_series",
    "riemann_zeta",
    "quadratic_field_zeta",
    "CriticalLineSamples",
    "critical_line_samples",
]


def series_terms(d: int, s: object, digits: int) -> int:
    """The number ``N`` of terms the theta-split series sums for ``L(s, χ_d)`` to ``digits``.

    The same choice as the evaluation makes on its first attempt (``d`` fundamental, or
    ``1`` for ζ); ``N`` grows like ``√(|d|·digits)``.

    Examples
    --------
    >>> series_terms(1, 2, 30), series_terms(-10**6 - 3, 2, 30) > 1000
    (5, True)
    """
    s = as_complex_argument(s)
    extra = int(math.pi * abs(float(s.imag)) / (4 * math.log(2))) + 10
    bits = bits_for(digits) + extra
    a = 1 if d < 0 else 0
    c1 = max(0.0, float((s + a).real) / 2 - 1)
    c2 = max(0.0, float((1 - s + a).real) / 2 - 1)
    return _terms_needed(abs(d), a, c1, c2, -bits * math.log(2) + _log_scale(d, s) - math.log(2))


def series_cost(d: int, s: object, digits: int) -> tuple[float, float]:
    """``(seconds, bytes)`` estimated for the series of ``L(s, χ_d)`` (or ``ζ``, ``d = 1``) to ``digits``.

    With ``N`` = :func:`series_terms`, ``b`` the working bits and ``K = b/3.9`` the
    Taylor orders of a block: ``N·K·(2·10⁻⁷ + 3·10⁻⁹·K)`` s for the blocks (exact
    moments ``Σ w·v^k``, whose size grows with ``k``), ``min(N, 400)·(10⁻⁴ + 0.06·(b/1000)^2.3)``
    s for the terms summed one by one (two incomplete gammas at ``b`` bits: 1 s a term at
    3400 bits), plus ``1.5·10⁻³·(e/1000)^1.9`` s a term for the ``e = π|Im s|/(4 log 2)``
    bits that cancel in ``Γ`` at large ``|Im s|`` (measured: 0.11 s a term at ``Im s = 10⁴``,
    ``e ≈ 11 300``; 0.028 s at ``5000``), and ``24·N``
    bytes (character and smallest-prime-factor tables).  Measured on the development
    machine (2 cores): N = 5138 … 513733 at 30 digits, 27124 at 1000 digits, within a
    factor 2 (the test ``tests/analytic/test_analytic_cost.py`` checks the count of
    terms and the time).

    Examples
    --------
    >>> t, m = series_cost(-10**12 - 3, 2, 1000)
    >>> t > 36000                       # about 18 h: refused at the default budget
    True
    """
    N = series_terms(d, s, digits)
    bits = bits_for(digits) + 10
    extra = math.pi * abs(float(as_complex_argument(s).imag)) / (4 * math.log(2))
    K = bits / 3.9 + 4
    blocks = max(0, N - _engine._DIRECT_TERMS) * K * (2e-7 + 3e-9 * K)
    direct = min(N, _engine._DIRECT_TERMS) * (
        1e-4 + 0.06 * (bits / 1000) ** 2.3 + 1.5e-3 * (extra / 1000) ** 1.9
    )
    return blocks + direct, 24.0 * N + 2 * 10**6


def _check_series_cost(d: int, s: ComplexArgument, digits: int) -> None:
    from ..core.budget import check_cost, describe_integer

    seconds, memory = series_cost(d, s, digits)
    name = "ζ(s)" if d == 1 else f"L(s, χ_{describe_integer(d)})"
    check_cost(
        f"{name} at s = {s} to {digits} digits ({describe_integer(series_terms(d, s, digits))} series terms)",
        seconds=seconds,
        memory=memory,
        further="fewer --digits reach further (the terms grow like √(|d_K|·digits))",
    )


def _series_value(d: int, s: ComplexArgument, digits: int):
    """A ball for ``L(s, χ_d)`` (``d`` fundamental ≠ 1) or ``ζ(s)`` (``d = 1``) and ``N``."""
    _check_series_cost(d, s, digits)
    extra = int(math.pi * abs(float(s.imag)) / (4 * math.log(2))) + 10
    target_bits = bits_for(digits)
    shortfall = 0
    for _attempt in range(3):
        bits = target_bits + extra + shortfall
        log_tol = -bits * math.log(2) + _log_scale(d, s)
        prec = bits + 2 * max(10, int(math.log2(abs(d) + 1))) + 10
        lam, N = _lambda(d, s, prec, log_tol)
        from flint import ctx

        with ctx.workprec(prec):
            value = lam * _gamma_factor(d, s, prec)
        if meets(value, digits):
            return value, N
        # the value is smaller than the scale assumed: add the missing bits and retry
        lower = ball_lower(value)
        if lower > 0:
            shortfall += int(max(8.0, -math.log2(lower) + 8))
        else:
            shortfall += max(64, target_bits)
    return value, N


def _euler_factor(d_K: int, f: int, s: ComplexArgument, prec: int):
    from flint import arb, ctx

    with ctx.workprec(prec):
        out = arb(1)
        sb = s.ball()
        for p in prime_factorisation(f) if f > 1 else ():
            c = kronecker(d_K, p)
            if c:
                out = out * (1 - c * (-sb * arb(p).log()).exp())
        return out


def _method(N: int) -> str:
    return (
        f"functional equation and incomplete-gamma series (exponential integrals E_p), {N} terms, "
        "Taylor blocks beyond n = 400, ball arithmetic; tail bounded explicitly (unconditional)"
    )


def l_series(D: object, s: object, *, digits: int = 30) -> CertifiedValue:
    """``L(s, χ_D) = Σ_{n ≥ 1} (D/n)·n^(−s)``, continued to all of C, certified to ``digits``.

    Parameters
    ----------
    D : int
        A discriminant (``χ_D`` is the Kronecker character ``n ↦ (D/n)``; for
        ``D = f²·d_K`` it differs from the primitive ``χ_{d_K}`` by the Euler factors at
        the primes dividing ``f``).
    s : number or text
        Any complex number (``"1/2+14.1347i"``, ``2``, ``0.5``, ``complex``).  At
        ``s = 0, −1, −2, …`` the exact rational value is returned (``exact``).
    digits : int
        Significant digits certified (relative error ``≤ 10^−digits``).

    Returns
    -------
    CertifiedValue
        ``value`` (mpmath), ``error_bound``, ``terms`` and ``method``.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a non-square discriminant.
    FormkitError
        If ``digits`` is outside ``[1, 1000]``, the series would need more than
        :data:`MAX_SERIES_TERMS` terms, or the value cannot be certified (too close to 0).

    Examples
    --------
    >>> L = l_series(-4, 1, digits=25)             # π/4
    >>> L.text()
    '0.7853981633974483096156608'
    >>> l_series(-23, 0).exact                     # 2h/w
    Fraction(3, 1)
    >>> l_series(5, 2, digits=20).text()           # 4π²/(25√5)
    '0.70621140325974096993'

    References
    ----------
    Cohen, *Advanced Topics in Computational Number Theory*, §10.3; Davenport Ch. 9.
    """
    D = validate_discriminant(D)
    s = as_complex_argument(s)
    digits = check_digits(digits)
    d_K, f = discriminant_parts(D)
    quantity = f"L(s, χ_{D})"
    if s.is_integer and s.real <= 0:
        exact = l_series_at_nonpositive_integer(D, -int(s.real))
        return _exact_value(
            exact, quantity, s, digits, "generalised Bernoulli number B_{k,χ}: L(1 − k, χ) = −B_{k,χ}/k"
        )
    value, N = _series_value(d_K, s, digits)
    if f > 1:
        from flint import ctx

        prec = bits_for(digits) + 40
        with ctx.workprec(prec):
            value = value * _euler_factor(d_K, f, s, prec)
    return certified(value, digits, quantity=quantity, s=s, method=_method(N), terms=N, discriminant=D)


def _exact_value(exact: Fraction, quantity: str, s: ComplexArgument, digits: int, method: str):
    import mpmath

    with mpmath.workdps(digits):
        value = mpmath.mpf(exact.numerator) / exact.denominator
    return CertifiedValue(quantity, s, value, 0.0, digits, method, 0, exact)


def riemann_zeta(s: object, *, digits: int = 30) -> CertifiedValue:
    """Riemann's ``ζ(s)`` for complex ``s ≠ 1``, certified, by Riemann's own theta-split formula.

    ``π^(−s/2)·Γ(s/2)·ζ(s) = −1/s − 1/(1−s) + Σ_{n≥1} [E_{1−s/2}(πn²) + E_{(1+s)/2}(πn²)]``
    (module docstring with ``q = 1``); exact at ``s = 0, −1, −2, …``.

    Raises
    ------
    FormkitError
        At the pole ``s = 1``, or as :func:`l_series`.

    Examples
    --------
    >>> riemann_zeta(2, digits=20).text()          # π²/6
    '1.6449340668482264365'
    >>> riemann_zeta(-1).exact
    Fraction(-1, 12)
    """
    s = as_complex_argument(s)
    digits = check_digits(digits)
    if s.is_integer and s.real == 1:
        raise FormkitError("s = 1 is the pole of ζ(s) (residue 1); ζ is defined at every other s")
    if s.is_integer and s.real <= 0:
        return _exact_value(
            _zeta_nonpositive(-int(s.real)), "ζ(s)", s, digits, "Bernoulli number: ζ(1 − k) = −B_k/k"
        )
    value, N = _series_value(1, s, digits)
    return certified(value, digits, quantity="ζ(s)", s=s, method=_method(N), terms=N)


def quadratic_field_zeta(D: object, s: object, *, digits: int = 30) -> CertifiedValue:
    """The Dedekind zeta function ``ζ_K(s) = ζ(s)·L(s, χ_{d_K})`` of ``K = Q(√D)``.

    The factorisation (Dirichlet; Zagier, *Zetafunktionen und quadratische Körper*, §11)
    is the method: both factors are certified by :func:`riemann_zeta` and
    :func:`l_series` and multiplied in ball arithmetic.  Only the field matters, so
    ``D`` may be the discriminant of any order of ``K``.

    Raises
    ------
    FormkitError
        At the pole ``s = 1`` (residue ``L(1, χ_{d_K})``), or as :func:`l_series`.

    Examples
    --------
    >>> quadratic_field_zeta(-4, -1).exact       # ζ(−1)·L(−1, χ_−4) = 0 (χ_−4 is odd)
    Fraction(0, 1)
    >>> quadratic_field_zeta(5, -1).exact        # ζ_K(−1) = 1/30 for Q(√5)
    Fraction(1, 30)
    """
    D = validate_discriminant(D)
    s = as_complex_argument(s)
    digits = check_digits(digits)
    d_K, _f = discriminant_parts(D)
    quantity = f"ζ_K(s) for K = Q(√{d_K})"
    if s.is_integer and s.real == 1:
        raise FormkitError(
            f"s = 1 is the pole of ζ_K(s) for K = Q(√{d_K}) (residue L(1, χ_{d_K})); any other s is fine"
        )
    if s.is_integer and s.real <= 0:
        n = -int(s.real)
        exact = _zeta_nonpositive(n) * l_series_at_nonpositive_integer(d_K, n)
        return _exact_value(
            exact,
            quantity,
            s,
            digits,
            "Bernoulli and generalised Bernoulli numbers: ζ_K(1 − k) = ζ(1 − k)·L(1 − k, χ)",
        )
    from flint import ctx

    z, N1 = _series_value(1, s, digits + 2)
    L, N2 = _series_value(d_K, s, digits + 2)
    with ctx.workprec(bits_for(digits) + 40):
        value = z * L
    return certified(
        value,
        digits,
        quantity=quantity,
        s=s,
        method=f"ζ(s)·L(s, χ_{d_K}), each by " + _method(max(N1, N2)),
        terms=N1 + N2,
        discriminant=d_K,
    )


@dataclass(frozen=True)
class CriticalLineSamples:
    """``|L(½ + it, χ_D)|`` (or ``|ζ(½ + it)|`` for ``D = 1``) at equally spaced ``t`` in ``[0, height]``.

    ``heights[i]`` are the exact rationals ``t_i`` (as floats here) and ``values[i]`` the
    certified absolute values rounded to floats; ``error_bound`` is the largest
    certified error of the complex values (before rounding to floats).
    """

    discriminant: int
    heights: tuple[float, ...]
    values: tuple[float, ...]
    digits: int
    error_bound: float
    method: str

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return {
            "discriminant": self.discriminant,
            "t": list(self.heights),
            "abs_value": list(self.values),
            "digits": self.digits,
            "error_bound": f"{self.error_bound:.3e}",
            "method": self.method,
        }

    def __repr__(self) -> str:
        return (
            f"CriticalLineSamples(D={self.discriminant}, {len(self.values)} points on 0 ≤ t ≤ "
            f"{self.heights[-1] if self.heights else 0}, max |L| = {max(self.values, default=0):.6g})"
        )

    def _repr_html_(self) -> str:
        return (
            f"<p>|L(½ + it, χ<sub>{self.discriminant}</sub>)| at {len(self.values)} points, "
            f"0 ≤ t ≤ {self.heights[-1]:g}: max {max(self.values, default=0):.6g}<br>"
            f"<small>each value certified to {self.digits} digits; {self.method}</small></p>"
        )

    def _repr_latex_(self) -> str:
        return (
            rf"$\max_{{0 \le t \le {self.heights[-1]:g}}} |L(\tfrac12 + it, \chi_{{{self.discriminant}}})| "
            rf"\approx {max(self.values, default=0):.6g}$ \quad(\text{{{len(self.values)} certified samples}})"
        )


def critical_line_samples(
    D: object, height: object, *, points: int = 200, digits: int = 10
) -> CriticalLineSamples:
    """``|L(½ + it, χ_D)|`` for ``t = k·height/(points − 1)``, ``k = 0 … points − 1``.

    ``D = 1`` gives ``|ζ(½ + it)|``.  Each value is certified by :func:`l_series`
    (or :func:`riemann_zeta`) to ``digits`` digits.

    Raises
    ------
    FormkitError
        If ``height`` is not a positive number ≤ 10^4 or ``points`` is not in ``[2, 10^5]``.

    Examples
    --------
    >>> c = critical_line_samples(-4, 20, points=5, digits=8)
    >>> [round(v, 5) for v in c.values]
    [0.66769, 1.09321, 0.44393, 2.45837, 2.87431]
    """
    from ..core.arith import as_int

    h = as_complex_argument(height, "height")
    if not h.is_real or not 0 < h.real <= 10**4:
        raise FormkitError(f"height must be a real number in (0, 10^4], not {height!r}")
    points = as_int(points, "points")
    if not 2 <= points <= 10**5:
        raise FormkitError(f"points must lie in [2, 10^5], not {points}")
    digits = check_digits(digits)
    D_int = 1 if D == 1 else validate_discriminant(D)
    from ..core.budget import check_cost, describe_integer
    from ..core.progress import progress_bar

    def point(k: int) -> ComplexArgument:
        return ComplexArgument(Fraction(1, 2), Fraction(h.real * k / (points - 1)))

    # the whole walk priced first: the cost of every 1 in `step` points (it grows with t), scaled
    d_K = 1 if D_int == 1 else discriminant_parts(D_int)[0]
    step = max(1, points // 64)
    sampled = [series_cost(d_K, point(k), digits) for k in range(0, points, step)]
    check_cost(
        f"|L(1/2 + it, χ_{describe_integer(D_int)})| at {points} points up to t = {float(h.real):g} to {digits} digits",
        seconds=step * sum(c[0] for c in sampled),
        memory=max(c[1] for c in sampled),
        further="fewer --points or a smaller --height reach further (the work per point grows like t^1.9)",
    )
    ts, vals, err, method = [], [], 0.0, ""
    with progress_bar(total=points, desc="critical line: points", unit="point") as bar:
        for k in range(points):
            s = point(k)
            v = riemann_zeta(s, digits=digits) if D_int == 1 else l_series(D_int, s, digits=digits)
            ts.append(float(s.imag))
            vals.append(float(abs(complex(v.value))))
            err = max(err, v.error_bound)
            method = v.method
            bar.update(1)
    return CriticalLineSamples(D_int, tuple(ts), tuple(vals), digits, err, method)
