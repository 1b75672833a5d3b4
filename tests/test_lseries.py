"""Tests for formkit.lseries: L(1, χ_D) by the Euler product and the class-number estimates.

Outside references: classical closed forms of L(1, χ) for D = −4, −3, 5, 8 (Dirichlet's
class number formula with h = 1, from memory); exact class numbers from formkit's
enumeration and from the independent finite character sums of formkit.analytic
(Davenport, Multiplicative Number Theory, Ch. 6); regulators from the exact
fundamental unit (formkit.discriminants).
"""

import math
import random

import pytest
from hypothesis import given, strategies as st

from formkit.analytic import class_number_dirichlet
from formkit.classgroup import class_group
from formkit.discriminants import is_discriminant, is_fundamental_discriminant, regulator
from formkit.enumeration import class_number
from formkit.errors import DiscriminantError, FormkitError, NotAnIntegerError
from formkit.lseries import (
    _log_euler_product,
    class_number_estimate,
    class_number_upper_bound,
    default_prime_bound,
    l_value_estimate,
)

# Classical values (from memory; each is Dirichlet's formula with h = 1):
#   L(1, χ_{-4}) = π/4,  L(1, χ_{-3}) = π/(3√3),
#   L(1, χ_5) = 2·log((1+√5)/2)/√5,  L(1, χ_8) = log(1+√2)/√2.
CLASSICAL = [
    (-4, math.pi / 4),
    (-3, math.pi / (3 * math.sqrt(3))),
    (5, 2 * math.log((1 + math.sqrt(5)) / 2) / math.sqrt(5)),
    (8, math.log(1 + math.sqrt(2)) / math.sqrt(2)),
]


@pytest.mark.parametrize("D, value", CLASSICAL)
def test_classical_values_inside_interval(D, value):
    for P in (10**3, 10**5):
        est = l_value_estimate(D, P)
        assert est.lower <= value <= est.upper
        assert abs(est.value - value) < 5 / math.sqrt(P)
        assert est.proven_upper >= value


def test_vectorised_and_plain_python_agree():
    for D in (-4, -3, 5, -10**30 - 3, 10**25 + 1, -8 * 10**12 - 4):
        if not is_discriminant(D):
            continue
        a = _log_euler_product(D, 10**4)
        b = _log_euler_product(D, 10**4, "python")
        assert abs(a[0] - b[0]) < 1e-9


def test_non_fundamental_discriminant_uses_order_formula():
    # h(-4·9) = 2·h(-4)·(3 − χ(3))/3 / [O_K*:O*] with [..] = 2: h(−36) = 2 (enumeration below)
    for D in (-36, -4 * 25, -3 * 49, -23 * 121, 5 * 9, 8 * 49):
        est = class_number_estimate(D, 10**5)
        if D < 0:
            assert est.lower <= class_number(D) <= est.upper
        else:
            h_wide = class_group(D).class_number_wide
            R = float(regulator(D))
            assert est.lower <= h_wide * R <= est.upper


def test_estimate_contains_class_number_random_negative():
    rng = random.Random(2024)
    done = 0
    while done < 40:
        D = -rng.randrange(3, 10**7)
        if not is_discriminant(D):
            continue
        est = class_number_estimate(D)
        h = class_number(D)
        assert est.lower <= h <= est.upper, (D, h, est)
        assert h <= est.proven_upper and h <= class_number_upper_bound(D)
        done += 1


def test_estimate_contains_h_times_regulator_random_positive():
    rng = random.Random(7)
    done = 0
    while done < 15:
        D = rng.randrange(5, 10**5)
        if not is_discriminant(D):
            continue
        est = class_number_estimate(D)
        hR = class_group(D).class_number_wide * float(regulator(D))
        assert est.lower <= hR <= est.upper, (D, hR, est)
        done += 1


def test_against_independent_character_sums():
    # formkit.analytic evaluates Dirichlet's finite sums: no code shared with the Euler product
    for D in (-3, -4, -7, -1003, -9995, -4 * 2503, 13, 1001, 1009 * 4):
        if not is_discriminant(D):
            continue
        h = class_number_dirichlet(D)
        est = class_number_estimate(D, 10**5)
        if D < 0:
            assert est.lower <= h <= est.upper
        else:
            assert est.lower <= class_group(D).class_number_wide * float(regulator(D)) <= est.upper
            assert h == class_group(D).class_number_wide


@given(st.integers(min_value=3, max_value=10**6))
def test_proven_upper_bound_holds(n):
    D = -n
    if not is_discriminant(D):
        return
    assert class_number(D) <= class_number_upper_bound(D)


def test_default_prime_bound_monotone():
    values = [default_prime_bound(-(10**k) - 3 if (10**k + 3) % 4 == 3 else -(10**k) - 1) for k in range(4, 40, 4)]
    assert values == sorted(values)
    assert 10**4 <= values[0] and values[-1] <= 3 * 10**7


@pytest.mark.parametrize("bad", [0, 2, 9, -1, 1.5, "x"])
def test_bad_discriminant(bad):
    with pytest.raises(FormkitError):
        l_value_estimate(bad)
    with pytest.raises(FormkitError):
        class_number_estimate(bad)


@pytest.mark.parametrize("P", [1, 0, -5, 10**9])
def test_bad_prime_bound(P):
    with pytest.raises(FormkitError, match="prime_bound"):
        l_value_estimate(-23, P)


def test_prime_bound_not_integer():
    with pytest.raises(NotAnIntegerError):
        l_value_estimate(-23, 1000.0)


def test_upper_bound_refuses_positive():
    with pytest.raises(FormkitError):
        class_number_upper_bound(5)
    with pytest.raises(DiscriminantError):
        class_number_upper_bound(-5)


@pytest.mark.slow
def test_calibration_of_heuristic_width():
    # the heuristic width must hold with margin on a large sample (module docstring)
    rng = random.Random(1)
    worst = 0.0
    n = 0
    while n < 600:
        D = -rng.randrange(10**5, 10**9)
        if not is_fundamental_discriminant(D):
            continue
        n += 1
        h = class_number(D)
        logL = math.log(h * 2 * math.pi / ({-3: 6, -4: 4}.get(D, 2) * math.sqrt(-D)))
        for P in (10**3, 10**4, 10**5):
            lp, _ = _log_euler_product(D, P)
            worst = max(worst, abs(logL + lp) * math.sqrt(P * math.log(P)))
    assert worst < 6.0
