"""Tests of formkit.analytic.averages: lattice-point counts, class totals, L(1, χ_D).

Sources: brute-force point counts; the Gauss circle problem values N(r) for the disc of
radius r (OEIS A000328: 1, 5, 13, 29, 49, 81, 113, 149, 197, 253, 317 — from memory);
Dirichlet's formula Σ_Q r_Q(n) = w Σ_{d|n} χ_D(d) (fundamental D) summed up to X;
Dirichlet's class number formula h = w√|D| L(1, χ_D)/(2π) against class numbers by
enumeration; Leibniz's series L(1, χ_{−4}) = π/4; mpmath's own summation as reference.
"""

from __future__ import annotations

from math import isqrt

import mpmath
import pytest
from hypothesis import given
from hypothesis import strategies as st

from formkit.analytic.averages import class_lattice_total, l_value_at_one, lattice_point_count
from formkit.core.arith import kronecker
from formkit.core.discriminants import is_discriminant, is_fundamental_discriminant, unit_count
from formkit.core.enumeration import class_number
from formkit.core.forms import Form
from formkit.errors import DiscriminantError, FormError, FormkitError, NotAnIntegerError
from formkit.representation.representations import representation_count


def brute_points(f, X):
    # the ellipse Q ≤ X lies in |x| ≤ √(4cX/|D|), |y| ≤ √(4aX/|D|)
    D = -f.discriminant
    bx = isqrt(4 * f.c * X // D) + 1
    by = isqrt(4 * f.a * X // D) + 1
    return sum(1 for x in range(-bx, bx + 1) for y in range(-by, by + 1) if f(x, y) <= X)


def test_gauss_circle_values():
    # OEIS A000328 (from memory): lattice points in x² + y² ≤ r².
    expected = [1, 5, 13, 29, 49, 81, 113, 149, 197, 253, 317]
    assert [lattice_point_count((1, 0, 1), r * r).count for r in range(11)] == expected


@pytest.mark.parametrize(
    "f",
    [
        Form(1, 0, 1),
        Form(2, 1, 3),
        Form(10, 37, 35),
        Form(3, 2, 7),
        Form(1, 1, 1),
        Form(2, 0, 2),
        Form(7, 12, 6),
        Form(5, -3, 11),
    ],
)
def test_count_equals_brute_force_and_sum_of_r(f):
    for X in (0, 1, 2, 7, 30, 61, 100):
        r = lattice_point_count(f, X)
        assert r.count == brute_points(f, X)
        # N_Q(X) = Σ_{0 ≤ n ≤ X} r_Q(n)
        assert r.count == sum(representation_count(f, n) for n in range(X + 1))


@given(st.integers(1, 30), st.integers(-30, 30), st.integers(1, 30), st.integers(0, 300))
def test_property_count(a, b, c, X):
    f = Form(a, b, c)
    if f.discriminant >= 0:
        return
    r = lattice_point_count(f, X)
    assert r.count == brute_points(f, X)
    # error = count − main term, to the stated precision
    with mpmath.workdps(30):
        assert abs(r.error - (r.count - 2 * mpmath.pi * X / mpmath.sqrt(-f.discriminant))) < 1e-20


def test_error_is_small_compared_with_main_term():
    r = lattice_point_count((2, 1, 3), 10**8)
    assert abs(r.error) < 10 * (10**8) ** 0.5  # O(√X) (Gauss), generous constant
    assert abs(float(r.error) / float(r.main_term)) < 1e-3


@pytest.mark.parametrize("D", [d for d in range(-3, -200, -1) if is_fundamental_discriminant(d)])
def test_class_total_equals_dirichlet_sum(D):
    # Σ_Q N_Q(X) = h (origins) + Σ_{1 ≤ n ≤ X} w Σ_{d|n} χ_D(d) = h + w Σ_{d ≤ X} χ_D(d)⌊X/d⌋
    X = 500
    t = class_lattice_total(D, X)
    w = unit_count(D)
    expect = t.class_number + w * sum(kronecker(D, d) * (X // d) for d in range(1, X + 1))
    assert t.count == expect
    assert t.class_number == class_number(D)


def test_class_number_estimate_from_counting():
    # With X large the estimate count·√|D|/(2πX) rounds to h (error O(√X)/X).
    for D in (-23, -47, -71, -56, -84, -4 * 27, -3 * 49):
        t = class_lattice_total(D, 10**6)
        assert round(float(t.class_number_estimate)) == class_number(D)
        assert abs(float(t.error)) < 50 * 1000 * t.class_number


@pytest.mark.parametrize("D", [d for d in range(-3, -300, -1) if is_discriminant(d)][::3])
def test_class_number_formula(D):
    # Dirichlet's class number formula for every negative discriminant (orders included):
    # h(D) = w(D)·√|D|·L(1, χ_D)/(2π), h by enumeration.
    L = l_value_at_one(D, digits=20)
    with mpmath.workdps(25):
        h = unit_count(D) * mpmath.sqrt(-D) * L / (2 * mpmath.pi)
        assert abs(h - class_number(D)) < mpmath.mpf(10) ** -15


def test_l_value_references():
    # Leibniz: L(1, χ_{−4}) = π/4; L(1, χ_{−3}) = π/(3√3); for D = 5: L(1, χ_5) = 2 log φ/√5
    with mpmath.workdps(30):
        assert abs(l_value_at_one(-4, digits=25) - mpmath.pi / 4) < mpmath.mpf(10) ** -24
        assert abs(l_value_at_one(-3, digits=25) - mpmath.pi / (3 * mpmath.sqrt(3))) < mpmath.mpf(10) ** -24
        phi = (1 + mpmath.sqrt(5)) / 2
        assert (
            abs(l_value_at_one(5, digits=25) - 2 * mpmath.log(phi) / mpmath.sqrt(5)) < mpmath.mpf(10) ** -24
        )
    # against the series Σ χ(n)/n summed period by period with mpmath.nsum (the terms
    # of the outer sum decay like 1/k², so nsum's extrapolation converges)
    for D in (-23, -20, 13):
        q = abs(D)
        chi = [kronecker(D, a) for a in range(q + 1)]
        with mpmath.workdps(25):
            ref = mpmath.nsum(
                lambda k: mpmath.fsum(chi[a] / (q * k + a) for a in range(1, q + 1)), [0, mpmath.inf]
            )
            assert abs(l_value_at_one(D) - ref) < mpmath.mpf(10) ** -15


def test_to_dict_and_fields():
    r = lattice_point_count((1, 0, 1), 100)
    d = r.to_dict()
    assert d["count"] == 317 and d["bound"] == 100 and d["form"] == [1, 0, 1]
    assert d["main_term"].startswith("314.159265358979")
    t = class_lattice_total(-20, 1000).to_dict()
    assert t["class_number"] == 2 and t["discriminant"] == -20


def test_bad_input():
    with pytest.raises(FormError, match="positive definite"):
        lattice_point_count((1, 0, -2), 10)
    with pytest.raises(FormError, match="positive definite"):
        lattice_point_count((-1, 0, -2), 10)
    with pytest.raises(FormkitError, match="X must be"):
        lattice_point_count((1, 0, 1), -1)
    with pytest.raises(NotAnIntegerError):
        lattice_point_count((1, 0, 1), 10.5)
    with pytest.raises(DiscriminantError):
        class_lattice_total(5, 10)
    with pytest.raises(FormkitError, match="X must be"):
        class_lattice_total(-4, -1)
    with pytest.raises(DiscriminantError):
        l_value_at_one(-5)
    with pytest.raises(FormkitError, match="too large"):
        l_value_at_one(-4 * 10**6 - 4)
