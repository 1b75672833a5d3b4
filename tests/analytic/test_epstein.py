"""Epstein zeta functions, Kronecker's limit formula and Dedekind's η.

Outside references: the classical identities Z(s) = 4ζ(s)β(s) for x² + y² and
Z(s) = 6ζ(s)L(s, χ₋₃) for x² + xy + y² (classical, from memory) with mpmath's ``zeta`` and
``dirichlet``; brute-force lattice sums; |η(i)| = Γ(1/4)/(2π^(3/4)) (from memory); η from
mpmath's q-Pochhammer symbol ``qp`` (general-purpose library); η(−1/τ) = √(−iτ)·η(τ)
(Apostol, *Modular Functions and Dirichlet Series*, Thm 3.1, from memory).
"""

from __future__ import annotations

from fractions import Fraction

import mpmath
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from formkit import Form
from formkit.analytic.balls import as_complex_argument
from formkit.analytic.epstein import epstein_zeta, kronecker_limit
from formkit.analytic.eta import dedekind_eta
from formkit.errors import FormError, FormkitError


def _mp(s):
    z = as_complex_argument(s)
    re_ = mpmath.mpf(z.real.numerator) / z.real.denominator
    im_ = mpmath.mpf(z.imag.numerator) / z.imag.denominator
    return mpmath.mpc(re_, im_) if z.imag else re_


S_VALUES = [2, "3/2", "1/2", "0.3", "-1/2", "-7/2", "0.5+2i", "-1/3+1i", "1.0001", "3+20i"]


@pytest.mark.parametrize("s", S_VALUES)
def test_sum_of_two_squares(s):
    z = epstein_zeta((1, 0, 1), s, digits=30)
    with mpmath.workdps(45):
        t = _mp(s)
        ref = 4 * mpmath.zeta(t) * mpmath.dirichlet(t, [0, 1, 0, -1])
        assert abs(ref - z.value) <= 10**-29 * abs(ref)


@pytest.mark.parametrize("s", S_VALUES[:6])
def test_hexagonal_form(s):
    z = epstein_zeta((1, 1, 1), s, digits=30)
    with mpmath.workdps(45):
        t = _mp(s)
        ref = 6 * mpmath.zeta(t) * mpmath.dirichlet(t, [0, 1, -1])
        assert abs(ref - z.value) <= 10**-29 * abs(ref)


@settings(max_examples=5, deadline=None)
@given(a=st.integers(1, 6), b=st.integers(-6, 6), c=st.integers(1, 9))
def test_against_brute_force_lattice_sum(a, b, c):
    # Z_Q(4) against Σ over |x|, |y| ≤ R with the tail of the sum bounded (brute force)
    if b * b - 4 * a * c >= 0:
        return
    Q = Form(a, b, c)
    z = epstein_zeta(Q, 4, digits=15)
    R = 40
    with mpmath.workdps(25):
        total = mpmath.fsum(
            mpmath.mpf(Q(x, y)) ** -4 for x in range(-R, R + 1) for y in range(-R, R + 1) if x or y
        )
        # every omitted point has Q ≥ λ·R² with λ the least eigenvalue; the tail is below this
        lam = ((a + c) - mpmath.sqrt((a - c) ** 2 + b * b)) / 2
        tail = 2 * mpmath.pi / (lam * 2 * (lam * R * R) ** 3) * 4
        assert abs(total - z.value) <= tail + 10**-14


def test_class_invariance():
    # Z depends only on the (proper or improper) class
    a = epstein_zeta((2, 1, 3), "2.5", digits=25)
    b = epstein_zeta((2, -1, 3), "2.5", digits=25)
    c = epstein_zeta(Form(2, 1, 3).transform(((3, 1), (5, 2))), "2.5", digits=25)
    assert abs(a.value - b.value) <= a.error_bound + b.error_bound
    assert abs(a.value - c.value) <= a.error_bound + c.error_bound


def test_exact_values_and_errors():
    assert epstein_zeta((3, 2, 5), 0).exact == Fraction(-1)
    assert epstein_zeta((3, 2, 5), -2).exact == 0
    with pytest.raises(FormkitError, match="pole"):
        epstein_zeta((1, 0, 1), 1)
    with pytest.raises(FormError, match="positive definite"):
        epstein_zeta((1, 0, -2), 2)
    with pytest.raises(FormError, match="positive definite"):
        epstein_zeta((-1, 0, -1), 2)


@pytest.mark.parametrize("form", [(1, 0, 1), (1, 1, 1), (2, 1, 3), (5, 4, 5), (3, 0, 7)])
def test_kronecker_limit_formula(form):
    # the constant term through η against the expansion (built-in) and a symmetric difference
    k = kronecker_limit(form, digits=25)
    assert k.agrees
    eps = Fraction(1, 10**12)
    up = epstein_zeta(form, 1 + eps, digits=30).value
    down = epstein_zeta(form, 1 - eps, digits=30).value
    with mpmath.workdps(35):
        # (Z(1+ε) + Z(1−ε))/2 = C + O(ε²)
        assert abs((up + down) / 2 - k.constant_term.value) < 10**-20
        D = Form(*form).discriminant
        assert abs(k.residue.value - 2 * mpmath.pi / mpmath.sqrt(-D)) < 10**-24


def test_eta_at_i():
    e = dedekind_eta(Form(1, 0, 1), digits=30)
    with mpmath.workdps(40):
        assert abs(e.value - mpmath.gamma(0.25) / (2 * mpmath.pi**0.75)) < 10**-29


@pytest.mark.parametrize("tau", ["1/3+1/5i", "-2/7+1/20i", "7/2+2i", "1i", "1/2+3/4i"])
def test_eta_against_q_pochhammer(tau):
    e = dedekind_eta(tau, digits=25)
    with mpmath.workdps(60):
        t = _mp(tau)
        q = mpmath.exp(2j * mpmath.pi * t)
        ref = mpmath.exp(1j * mpmath.pi * t / 12) * mpmath.qp(q)
        assert abs(ref - e.value) <= 10**-24 * abs(ref)


def test_eta_transformation_law():
    tau = as_complex_argument("1/5+2/3i")
    inv = as_complex_argument("-1") * as_complex_argument(1)  # −1/τ computed exactly below
    t = mpmath.mpc(0.2, Fraction(2, 3).numerator / 3)
    den = tau.real**2 + tau.imag**2
    inv = as_complex_argument(-tau.real / den) + as_complex_argument(tau.imag / den) * as_complex_argument(
        "1i"
    )
    e1, e2 = dedekind_eta(tau, digits=25), dedekind_eta(inv, digits=25)
    with mpmath.workdps(35):
        t = mpmath.mpc(mpmath.mpf(1) / 5, mpmath.mpf(2) / 3)
        assert abs(e2.value - mpmath.sqrt(-1j * t) * e1.value) < 10**-23


def test_eta_bad_input():
    with pytest.raises(FormkitError, match="upper half plane"):
        dedekind_eta("1-1i")
    with pytest.raises(FormError):
        dedekind_eta(Form(1, 3, 1))
