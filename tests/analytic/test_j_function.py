"""Tests for formkit.analytic.j_function: j(τ) at classical points and its modularity."""

import mpmath
import pytest
from hypothesis import given
from hypothesis import strategies as st

from formkit import errors
from formkit.analytic.j_function import j_invariant
from formkit.core.forms import Form


def test_j_at_special_points():
    # j(i) = 1728, j(i√2) = 8000, j(ρ) = 0 (classical, from memory)
    assert abs(j_invariant(1j) - 1728) < 1e-20
    with mpmath.workdps(60):  # the points themselves to 60 digits
        i_sqrt2 = mpmath.mpc(0, mpmath.sqrt(2))
        rho = mpmath.mpc(-0.5, mpmath.sqrt(3) / 2)
        tau = mpmath.mpc(0.5, mpmath.sqrt(163) / 2)
    assert abs(j_invariant(i_sqrt2, digits=40) - 8000) < 1e-25
    assert abs(j_invariant(rho, digits=40)) < 1e-25
    # j((1 + √−163)/2) = −640320³ (classical)
    assert abs(j_invariant(tau, digits=60) + 640320**3) < 1e-30


def test_j_of_discriminant_minus_15_roots():
    # roots of H_{-15}: (−191025 ± 85995√5)/2 (Cox §12, from memory)
    j1 = j_invariant(Form(1, 1, 4), digits=50)
    j2 = j_invariant(Form(2, 1, 2), digits=50)
    with mpmath.workdps(50):
        s5 = mpmath.sqrt(5)
        assert abs(j1 - (-191025 - 85995 * s5) / 2) < 1e-30
        assert abs(j2 - (-191025 + 85995 * s5) / 2) < 1e-30


@given(
    x=st.floats(min_value=-3, max_value=3),
    y=st.floats(min_value=0.3, max_value=2.0),
    n=st.integers(min_value=-3, max_value=3),
)
def test_j_is_modular(x, y, n):
    # j(τ + n) = j(τ) and j(−1/τ) = j(τ): the defining invariance under SL2(Z)
    with mpmath.workdps(40):  # the transformed points exactly as accurate as τ itself
        tau = mpmath.mpc(x, y)
        shifted, inverted = tau + n, -1 / tau
    j0 = j_invariant(tau, digits=30)
    scale = max(1, abs(j0))
    assert abs(j_invariant(shifted, digits=30) - j0) < 1e-20 * scale
    assert abs(j_invariant(inverted, digits=30) - j0) < 1e-20 * scale


def test_bad_j_arguments():
    with pytest.raises(errors.FormError, match="upper half plane"):
        j_invariant(-1j)
    with pytest.raises(errors.FormError, match="positive definite"):
        j_invariant(Form(-1, 0, -1))
    with pytest.raises(errors.FormError):
        j_invariant("tau")
    with pytest.raises(errors.FormError, match="digits"):
        j_invariant(1j, digits=2)
