"""The analytic cost estimates against counted work, and the high precision they price.

The estimates (:func:`formkit.analytic.l_series.series_cost`,
:func:`formkit.analytic.epstein.epstein_cost`,
:func:`formkit.analytic.special_values.generalised_bernoulli_cost`) only decide whether
to start; these tests check that the counts they are built on match an instrumented run
within a stated factor (common practice, no source), and that the values at high
precision agree with mpmath's independent ζ, Catalan's constant and Bernoulli numbers.
"""

from __future__ import annotations

import importlib
import math

import mpmath
import pytest

from formkit.analytic.balls import as_complex_argument, bits_for
from formkit.analytic.epstein import epstein_cost, epstein_zeta
from formkit.analytic.l_series import l_series, riemann_zeta, series_terms
from formkit.analytic.special_values import generalised_bernoulli, generalised_bernoulli_cost
from formkit.core.budget import budget
from formkit.errors import BudgetError

L = importlib.import_module("formkit.analytic.l_series")
engine = importlib.import_module("formkit.analytic.theta_split_series")  # the series and its blocks


@pytest.mark.parametrize(
    ("d", "s", "digits"),
    [(-(10**6) - 3, 2, 30), (-4, 2, 300), (1, 3, 100), (5, "1/2+3i", 40), (-(10**8) - 7, 2, 30)],
)
def test_series_terms_and_block_work_match_an_instrumented_run(d, s, digits, monkeypatch):
    # record the Taylor order K of every block actually summed (passed to _remainder_ball)
    orders: list[int] = []
    original = engine._remainder_ball

    def recording(lo, hi, n0, q, sr, K):
        orders.append(K)
        return original(lo, hi, n0, q, sr, K)

    monkeypatch.setattr(engine, "_remainder_ball", recording)
    _value, N = L._series_value(d, as_complex_argument(s), digits)
    estimate = series_terms(d, s, digits)
    assert estimate <= N <= 2 * estimate  # the first attempt's N, or a retry with more bits
    if N > engine._DIRECT_TERMS:
        K_estimate = (bits_for(digits) + 10) / 3.9 + 4
        assert orders and max(orders) <= 2 * K_estimate and K_estimate <= 2 * max(orders)


def test_epstein_terms_match_the_run():
    for Q, s, digits in (
        ((1, 1, 6), 2, 30),
        ((1, 1, 6), 2, 200),
        ((2, 1, 3), "3/2", 50),
        ((1, 0, 10**30), 2, 30),
    ):
        _t, _m, N = epstein_cost(Q, s, digits)
        v = epstein_zeta(Q, s, digits=digits)
        assert N / 2 <= v.terms <= 2 * N, (Q, s, digits, N, v.terms)  # within a factor 2


def test_bernoulli_cost_grows_like_d_times_k_and_refuses():
    small = generalised_bernoulli_cost(-23, 11)[0]
    assert generalised_bernoulli_cost(-(10**6) - 3, 11)[0] > 1000 * small
    with budget("10s"), pytest.raises(BudgetError, match=r"B_\{11,χ\}"):
        generalised_bernoulli(-(10**12) - 3, 11)
    # the counted work: the power sums take F·(k+1) multiply-adds at most (one per residue
    # and power), the model's F·(k+1) term
    F, k = 1003, 20
    ops = sum(k + 1 for a in range(1, F + 1) if math.gcd(a, F) == 1)
    assert ops <= F * (k + 1) <= 2 * ops


def test_refusals_name_the_cost_before_any_work():
    with budget("30m"), pytest.raises(BudgetError, match="27123609 series terms"):
        l_series(-(10**12) - 3, 2, digits=1000)
    with budget("1s"), pytest.raises(BudgetError, match="K-Bessel") as refused:
        epstein_zeta((1, 1, 6), 2, digits=1000)
    assert "Q = (1, 1, 6)" in str(refused.value)  # forms are written (a, b, c) in sentences


def test_high_precision_values_agree_with_mpmath():
    # ζ(3) at 320 digits (flint's E_p alone lost 170 bits here) against mpmath's ζ
    with mpmath.workdps(340):
        z = riemann_zeta(3, digits=320)
        assert abs(z.value - mpmath.zeta(3)) <= 10 ** (-318)
        # L(2, χ_-4) is Catalan's constant (from memory)
        c = l_series(-4, 2, digits=320)
        assert abs(c.value - mpmath.catalan) <= 10 ** (-318)
        # Z_Q(2) for x² + y² is 4ζ(2)β(2) = 4·(π²/6)·G (Hardy–Wright §16.9, from memory)
        e = epstein_zeta((1, 0, 1), 2, digits=320)
        assert abs(e.value - 4 * mpmath.zeta(2) * mpmath.catalan) <= 10 ** (-316)


def test_bernoulli_value_against_mpmath():
    # L(1 − k, χ_1) = ζ(1 − k) = −B_k/k, and mpmath's Bernoulli numbers are independent
    z = riemann_zeta(-99)
    assert (
        z.exact == -mpmath.mpf(mpmath.bernoulli(100)) / 100
        or abs(float(z.exact) + float(mpmath.bernoulli(100)) / 100) <= abs(float(z.exact)) * 1e-12
    )


def test_theta_points_against_the_lattice_points_counted():
    # counted: Σ_{n ≤ N} r_Q(n) is the number of (x, y) with Q(x, y) ≤ N (origin included), the
    # work of the count; theta_points (area of the ellipse plus its boundary rows) bounds it
    # from above and within a factor 2 once the ellipse holds a few hundred points
    from formkit.analytic.theta_series import theta_points, theta_series

    for (a, b, c), N in (
        ((1, 0, 1), 10**5),
        ((1, 1, 6), 10**5),
        ((2, 1, 3), 3000),
        ((5, 4, 7), 10**4),
        ((1, 0, 97), 10**5),
    ):
        counted = int(theta_series((a, b, c), N).coefficients.sum())
        estimate = theta_points(a, b, c, N)
        assert counted <= estimate <= 2 * counted, ((a, b, c), N, counted, estimate)


def test_critical_line_walk_is_priced_as_a_whole():
    # every point is a series at s = 1/2 + it; their sum (growing with t: the bits that cancel in
    # Γ at large t) is checked before the first point, so a long walk is refused at once
    from formkit.analytic.l_series import critical_line_samples, series_cost

    assert series_cost(-23, "1/2+10000i", 10)[0] > 100 * series_cost(-23, "1/2+10i", 10)[0]
    with budget("20s"), pytest.raises(BudgetError, match=r"at 50 points up to t = 10000"):
        critical_line_samples(-23, 10**4, points=50)
