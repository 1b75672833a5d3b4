"""L(s, χ_D) and ζ(s) at complex s, and the exact values at s ≤ 0.

Outside references: mpmath's ``zeta`` and ``dirichlet`` (general-purpose library),
sympy's ``bernoulli`` (general-purpose library), Dirichlet's class number formula
(theorem) against class numbers by complete enumeration, the functional equation
(theorem: Davenport, *Multiplicative Number Theory*, Ch. 9).
"""

from __future__ import annotations

import importlib
from fractions import Fraction

import mpmath
import pytest
import sympy
from hypothesis import given, settings
from hypothesis import strategies as st

from formkit import class_number, is_fundamental_discriminant, unit_count
from formkit.analytic.balls import as_complex_argument
from formkit.analytic.l_series import l_series, quadratic_field_zeta, riemann_zeta
from formkit.analytic.special_values import (
    bernoulli_number,
    generalised_bernoulli,
    l_series_at_nonpositive_integer,
)
from formkit.core.arith import kronecker
from formkit.errors import DiscriminantError, FormkitError

# the module (its name is shadowed by the function l_series in formkit.analytic)
# the series itself (its tunables and helpers) lives in the engine module
engine = importlib.import_module("formkit.analytic.theta_split_series")


def _mp(s):
    z = as_complex_argument(s)
    re_ = mpmath.mpf(z.real.numerator) / z.real.denominator
    im_ = mpmath.mpf(z.imag.numerator) / z.imag.denominator
    return mpmath.mpc(re_, im_) if z.imag else re_


def _mp_dirichlet(D, s):
    # mpmath.dirichlet with the period |D| of χ_D (general-purpose reference)
    return mpmath.dirichlet(_mp(s), [kronecker(D, n) for n in range(abs(D))])


@pytest.mark.parametrize(
    "D, s",
    [(-3, 2), (-4, 1), (5, 2), (-23, "1/2"), (12, "0.5+14.13i"), (-7, "-1.5"), (-43, "3/4-2i"), (8, "0.1")],
)
def test_l_series_against_mpmath_dirichlet(D, s):
    L = l_series(D, s, digits=30)
    with mpmath.workdps(45):
        ref = _mp_dirichlet(D, s)
        assert abs(ref - L.value) <= 10**-29 * abs(ref)
        assert abs(ref - L.value) <= L.error_bound * 1.000001 + mpmath.mpf(10) ** -40


@pytest.mark.parametrize("D, s", [(-12, 2), (-63, "1/2+1i"), (45, 3), (-4 * 27, "0.7")])
def test_imprimitive_character_against_mpmath(D, s):
    # χ_D for D = f²·d_K vanishes on n sharing a factor with f: Euler factors
    L = l_series(D, s, digits=25)
    with mpmath.workdps(40):
        ref = _mp_dirichlet(D, s)
        assert abs(ref - L.value) <= 10**-24 * abs(ref)


@pytest.mark.parametrize("s", [2, 3, "1/2", "0.5+14.134725i", "-2.5", "0.99", "1.01", "2-30i"])
def test_riemann_zeta_against_mpmath(s):
    z = riemann_zeta(s, digits=30)
    with mpmath.workdps(45):
        ref = mpmath.zeta(_mp(s))
        assert abs(ref - z.value) <= 10**-29 * abs(ref)


def test_zeta_pole_and_exact_values():
    with pytest.raises(FormkitError, match="pole"):
        riemann_zeta(1)
    # ζ(0) = −1/2, ζ(−1) = −1/12, ζ(−2) = 0, ζ(−3) = 1/120 (classical, from memory)
    assert [riemann_zeta(-n).exact for n in range(4)] == [
        Fraction(-1, 2),
        Fraction(-1, 12),
        0,
        Fraction(1, 120),
    ]


def test_functional_equation():
    # Λ(s) = (q/π)^((s+a)/2) Γ((s+a)/2) L(s, χ) is symmetric under s ↦ 1 − s (root number 1)
    for D in (-23, 13, -84, 41):
        q, a = abs(D), (1 if D < 0 else 0)
        for s in ("0.3+2i", "2.25"):
            L1, L2 = l_series(D, s, digits=25), l_series(D, 1 - as_complex_argument(s), digits=25)
            with mpmath.workdps(35):
                s1 = _mp(s)

                def lam(t, v):
                    return (q / mpmath.pi) ** ((t + a) / 2) * mpmath.gamma((t + a) / 2) * v

                left, right = lam(s1, L1.value), lam(1 - s1, L2.value)
                assert abs(left - right) <= 10**-22 * abs(left)


def _fundamental_negative(limit):
    return [D for D in range(-7, -limit, -1) if is_fundamental_discriminant(D)]


def test_value_at_zero_is_2h_over_w():
    # L(0, χ_D) = 2h/w for fundamental D < −4 (class number formula; h by complete enumeration)
    for D in _fundamental_negative(400):
        assert l_series(D, 0).exact == Fraction(2 * class_number(D), unit_count(D)), D


def test_value_at_one_gives_class_number():
    # h = w√|D| L(1, χ_D)/(2π) (Dirichlet's class number formula) against enumeration
    for D in (-23, -47, -71, -84, -199, -4004 // 4 * 4, -10007):
        if not is_fundamental_discriminant(D) and D != -4004:
            continue
        L = l_series(D, 1, digits=20)
        with mpmath.workdps(30):
            h = unit_count(D) * mpmath.sqrt(-D) * L.value / (2 * mpmath.pi)
            assert abs(h - class_number(D)) < 10**-15


def test_bernoulli_numbers_against_sympy():
    for k in (0, 2, 3, 4, 10, 12, 30):
        assert bernoulli_number(k) == Fraction(str(sympy.bernoulli(k))), k
    assert bernoulli_number(1) == Fraction(-1, 2)
    # every B_k to 400 (the tangent-number algorithm) against sympy's, an outside reference
    for k in range(2, 401):
        assert bernoulli_number(k) == Fraction(str(sympy.bernoulli(k))), k


def test_tangent_numbers_against_the_taylor_series_of_tan():
    # T_k = (2k − 1)!·[x^(2k−1)] tan x; 1, 2, 16, 272, 7936, 353792 (from memory), and sympy's series
    from formkit.analytic.special_values import _tangent_numbers

    T = _tangent_numbers(12)
    assert T[1:7] == [1, 2, 16, 272, 7936, 353792]
    x = sympy.Symbol("x")
    series = sympy.series(sympy.tan(x), x, 0, 24).removeO()
    for k in range(1, 13):
        assert T[k] == series.coeff(x, 2 * k - 1) * sympy.factorial(2 * k - 1), k


def test_generalised_bernoulli_two_ways_and_mpmath():
    # the period definition (|D| terms) against the primitive one with Euler factors
    for D in (-3, -4, 5, -20, 12, -12, 28, -44):
        for n in range(4):
            by_period = -generalised_bernoulli(D, n + 1) / (n + 1)
            assert by_period == l_series_at_nonpositive_integer(D, n), (D, n)
            with mpmath.workdps(30):
                ref = _mp_dirichlet(D, -n)
                assert abs(ref - mpmath.mpf(by_period.numerator) / by_period.denominator) < 10**-20


def test_quadratic_field_zeta():
    # ζ_K(−1) = 1/30 for Q(√5) (classical value, from memory; also ζ(−1)·L(−1, χ_5))
    assert quadratic_field_zeta(5, -1).exact == Fraction(1, 30)
    assert quadratic_field_zeta(20, -1).exact == Fraction(1, 30)  # only the field matters
    z = quadratic_field_zeta(-7, "2+1i", digits=20)
    with mpmath.workdps(30):
        s = mpmath.mpc(2, 1)
        ref = mpmath.zeta(s) * _mp_dirichlet(-7, "2+1i")
        assert abs(ref - z.value) < 10**-19 * abs(ref)
    with pytest.raises(FormkitError, match="pole"):
        quadratic_field_zeta(-7, 1)


def test_blocks_agree_with_term_by_term(monkeypatch):
    # the Taylor blocks against the plain sum (common practice: two evaluations of one series)
    D = -20011
    blocked = l_series(D, "0.5+1i", digits=30)
    monkeypatch.setattr(engine, "_DIRECT_TERMS", 10**9)
    plain = l_series(D, "0.5+1i", digits=30)
    assert abs(blocked.value - plain.value) <= blocked.error_bound + plain.error_bound


@pytest.mark.parametrize(
    "D,s,digits",
    [(-(10**7) - 3, "1", 30), (10**7 + 1, "1/2+10i", 30), (-(10**6) - 3, "2", 60), (-20011, "1/3", 40)],
)
def test_double_moments_agree_with_integer_moments(monkeypatch, D, s, digits):
    # the Taylor blocks with high moments in doubles (proved error bound) against the all-integer
    # moments with the narrower blocks of the previous path (common practice: two evaluations of one series)
    calls = []
    pairwise = engine._pairwise_sum
    monkeypatch.setattr(engine, "_pairwise_sum", lambda x: calls.append(1) or pairwise(x))
    fast = l_series(D, s, digits=digits)
    assert calls  # the doubles were used
    monkeypatch.setattr(engine, "_FLOAT_MOMENTS", False)
    monkeypatch.setattr(engine, "_BLOCK_DIVISOR", 16)
    exact = l_series(D, s, digits=digits)
    assert abs(fast.value - exact.value) <= fast.error_bound + exact.error_bound
    assert fast.error_bound < 10.0**-digits * abs(fast.value)


def test_pairwise_sum():
    # against math.fsum (correctly rounded) on sums whose terms are exact in binary (common practice)
    import math

    import numpy as np

    for n in (1, 2, 3, 7, 8, 1000, 4097):
        x = np.arange(1, n + 1, dtype=np.float64) / 8
        assert engine._pairwise_sum(x) == math.fsum(x.tolist())


@settings(max_examples=3, deadline=None)
@given(
    D=st.sampled_from([-3, -4, -8, 5, 8, -7, 12, -15, 13, -20, 21, -24]),
    re=st.fractions(min_value=-3, max_value=4, max_denominator=8),
    im=st.fractions(min_value=-4, max_value=4, max_denominator=4),
)
def test_error_bound_holds(D, re, im):
    # the certified bound against mpmath at higher precision (property, common practice)
    s = as_complex_argument(re) + as_complex_argument(im) * as_complex_argument("1i")
    if s.is_integer and s.real <= 0:
        return
    L = l_series(D, s, digits=20)
    with mpmath.workdps(30):
        ref = _mp_dirichlet(D, s)
        assert abs(ref - L.value) <= L.error_bound


def test_bad_input():
    with pytest.raises(FormkitError, match="digits"):
        l_series(-4, 2, digits=0)
    with pytest.raises(FormkitError, match="digits"):
        l_series(-4, 2, digits=5000)
    with pytest.raises(DiscriminantError):
        l_series(9, 2)
    with pytest.raises(FormkitError, match="s must be a number"):
        l_series(-4, "2+")
    with pytest.raises(FormkitError, match="s must be a number"):
        l_series(-4, "__import__('os')")


def test_too_many_terms_refused(monkeypatch):
    monkeypatch.setattr(engine, "MAX_SERIES_TERMS", 1000)
    with pytest.raises(FormkitError, match="terms"):
        l_series(-(10**8) - 7, 1, digits=30)


def test_parse_argument():
    assert str(as_complex_argument("1/2+14.134725i")) == "1/2+565389/40000i"
    assert str(as_complex_argument("-3i")) == "-3i"
    assert as_complex_argument("2.5e-1").real == Fraction(1, 4)
    assert as_complex_argument(mpmath.mpf(-0.5)).real == Fraction(-1, 2)


def test_tail_bounds_in_ball_arithmetic_bound_the_true_tails():
    # the bound for Σ_{n>N} χ(n)·n^a·[E_{1−σ₁}(x_n) + E_{1−σ₂}(x_n)] against the sum itself,
    # evaluated with mpmath's generalised exponential integral E_p (general-purpose library)
    from fractions import Fraction

    import mpmath
    from flint import ctx

    from formkit.analytic.theta_split_series import _tail_bound_ball
    from formkit.core.arith import kronecker

    for d, s in ((-4, Fraction(2)), (5, Fraction(3)), (-23, Fraction(1, 2)), (13, Fraction(7, 2))):
        q, a = abs(d), 1 if d < 0 else 0
        s1, s2 = (s + a) / 2, (1 - s + a) / 2
        c1, c2 = max(Fraction(0), s1 - 1), max(Fraction(0), s2 - 1)
        for N in (3, 6, 10):
            with ctx.workprec(80):
                bound = _tail_bound_ball(N, q, a, c1, c2)
            if bound is None:
                continue
            with mpmath.workdps(30):
                true = mpmath.mpf(0)
                for n in range(N + 1, N + 80):
                    x = mpmath.pi * n * n / q
                    e = mpmath.expint(1 - s1, x) + mpmath.expint(1 - s2, x)
                    true += kronecker(d, n) * n**a * e
                assert abs(true) <= float(bound.upper()), (d, s, N)


def test_epstein_tail_ball_bounds_the_bessel_series():
    # Σ_{n>N} n^(s−½)σ_{1−2s}(n)·K_{s−½}(πn√|D|/a) (absolute values) against the ball bound; mpmath's besselk
    from fractions import Fraction

    import mpmath
    from flint import ctx

    from formkit.analytic.epstein import _bessel_tail_ball

    for (a, absD), s in (((1, 4), Fraction(2)), ((2, 23), Fraction(1, 3)), ((1, 3), Fraction(5))):
        mu = abs(s - Fraction(1, 2))
        for N in (1, 2, 4):
            with ctx.workprec(80):
                bound = _bessel_tail_ball(absD, a, mu, N)
            with mpmath.workdps(30):
                sv = mpmath.mpf(s.numerator) / s.denominator
                true = mpmath.mpf(0)
                for n in range(N + 1, N + 40):
                    sig = sum(mpmath.mpf(d) ** (1 - 2 * sv) for d in range(1, n + 1) if n % d == 0)
                    k = mpmath.besselk(sv - mpmath.mpf(1) / 2, mpmath.pi * n * mpmath.sqrt(absD) / a)
                    true += abs(n ** (sv - mpmath.mpf(1) / 2) * sig * k)
                assert true <= float(bound.upper()), (a, absD, s, N)
