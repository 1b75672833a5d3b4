"""Genus theta series, Siegel's average and the cusp part.

Outside references: the representation counts r_Q(n) of ``formkit.representation``
(square-root method, independent of the lattice-point tally); Siegel's theorem and the
genus-character Eisenstein series (theorem; Zagier §12, from memory); brute force.
"""

from __future__ import annotations

from fractions import Fraction

import pytest

from formkit import genera, is_fundamental_discriminant
from formkit.classgroups.genus_theta import eisenstein_coefficients, theta_decomposition
from formkit.errors import FormError, FormkitError
from formkit.representation.representations import representation_count


def _discriminants(limit, step):
    return [D for D in range(-3, -limit - 1, -1) if D % 4 in (0, 1)][::step]


def _check_genera(Ds, N):
    for D in Ds:
        for g in genera(D):
            t = theta_decomposition(g.forms[0], N)
            for n in range(1, N + 1):
                mean = Fraction(sum(representation_count(f, n) for f in g.forms), len(g.forms))
                assert t.genus_average(n) == mean, (D, g.symbol, n)
            if is_fundamental_discriminant(D):
                assert t.siegel_agrees, (D, g.symbol)
            else:
                assert t.siegel_agrees is None


def test_genus_averages_sample():
    # a sample of every genus with |D| ≤ 2000 (one discriminant in 23); all of them in the slow test
    _check_genera(_discriminants(2000, 23), 12)


@pytest.mark.slow
def test_genus_averages_all():
    _check_genera(_discriminants(2000, 1), 30)


def _check_siegel(Ds, N):
    # the genus average from lattice points equals the genus-character Eisenstein series
    for D in Ds:
        if not is_fundamental_discriminant(D):
            continue
        for g in genera(D):
            assert theta_decomposition(g.forms[0], N).siegel_agrees, (D, g.symbol)


def test_siegel_sample():
    _check_siegel(_discriminants(2000, 7), 25)


@pytest.mark.slow
def test_siegel_for_every_fundamental_genus_up_to_2000():
    _check_siegel(_discriminants(2000, 1), 60)


def test_cusp_part():
    # genus of one class: θ_Q is its own genus average, the cusp part vanishes
    t = theta_decomposition((1, 0, 5), 200)
    assert t.is_genus_alone and all(c == 0 for c in t.cusp_coefficients(201))
    # D = −23: θ_Q − θ_G for Q = (1, 1, 6) is (2/3)·η(z)η(23z) = (2/3)(q − q² − q³ + q⁶ + …)
    t = theta_decomposition((1, 1, 6), 30)
    assert [str(c) for c in t.cusp_coefficients(7)] == ["0", "4/3", "-4/3", "-4/3", "0", "0", "4/3"]


def test_eta_product_cusp_form():
    # η(z)η(23z) = q∏(1 − qⁿ)(1 − q^{23n}) (Hecke's weight-one form for −23; from memory)
    N = 60
    prod = [0] * (N + 1)
    prod[1] = 1
    for k in range(1, N + 1):
        for step in (k, 23 * k):
            if step > N:
                continue
            for i in range(N, step - 1, -1):
                prod[i] -= prod[i - step]
    t = theta_decomposition((1, 1, 6), N)
    assert [t.cusp_coefficient(n) for n in range(N + 1)] == [Fraction(4, 3) * p for p in prod]


def test_eisenstein_direct():
    num, h = eisenstein_coefficients(-4, (1, 0, 1), 20)
    # r₂(n) = 4 Σ_{d|n} χ₋₄(d) (Jacobi)
    for n in range(1, 21):
        assert Fraction(int(num[n]), h) == 4 * sum(
            (0, 1, 0, -1)[d % 4] for d in range(1, n + 1) if n % d == 0
        )


def test_bad_input():
    with pytest.raises(FormError):
        theta_decomposition((2, 2, 2), 10)
    with pytest.raises(FormError):
        theta_decomposition((1, 0, -2), 10)
    with pytest.raises(FormkitError, match="N must"):
        theta_decomposition((1, 0, 1), 10**9)
    with pytest.raises(FormkitError, match="fundamental"):
        eisenstein_coefficients(-12, (1, 0, 3), 10)
