"""Tests for formkit.analytic.lseries: L(1, χ_D) with its GRH interval and the class-number bounds.

Outside references: classical closed forms of L(1, χ) for D = −4, −3, 5, 8 (Dirichlet's
class number formula with h = 1, from memory); exact class numbers from formkit's
enumeration and from the independent finite character sums of formkit.analytic.class_number_formula
(Davenport, Multiplicative Number Theory, Ch. 6); regulators from the exact
fundamental unit (formkit.core.discriminants); sympy's primerange and mpmath's digamma for
the pieces of the bound (docs/l_value_interval.md).  The interval is a theorem under
GRH, so an exact value outside it would refute GRH or (far likelier) reveal a bug: the
containment tests below can fail.
"""

import math
import random

import pytest
from hypothesis import given
from hypothesis import strategies as st

from formkit.analytic.class_number_formula import class_number_dirichlet
from formkit.analytic.lseries import (
    GRH_CONSTANT,
    SIGMAS,
    _sums,
    class_number_estimate,
    class_number_upper_bound,
    default_prime_bound,
    l_value_estimate,
)
from formkit.classgroups.dispatch import class_group
from formkit.core.arith import kronecker
from formkit.core.discriminants import is_discriminant, is_fundamental_discriminant, regulator
from formkit.core.enumeration import class_number
from formkit.errors import DiscriminantError, FormkitError, NotAnIntegerError

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
    for D in (-4, -3, 5, -(10**30) - 3, 10**25 + 1, -8 * 10**12 - 4):
        if not is_discriminant(D):
            continue
        a = l_value_estimate(D, 10**4)
        b = l_value_estimate(D, 10**4, backend="python")
        assert abs(a.value - b.value) < 1e-12 * a.value
        assert abs(a.log_radius - b.log_radius) < 1e-9 * a.log_radius


def test_smoothed_sum_by_hand():
    # S(x) written out from its definition with sympy's primes (an independent prime list)
    from sympy import primerange

    D, P = -23, 200
    x = P / 2
    S = 0.0
    for p in primerange(2, P + 1):
        c = kronecker(D, p)
        k, pk = 1, p
        while pk <= P:
            w = 1.0 if pk <= x else 2.0 - pk / x
            S += c**k * w / (k * pk)
            k, pk = k + 1, pk * p
    got, _T, _N = _sums(D, P)
    assert abs(got.value - S) < 1e-13


def test_zero_sum_bound_pieces():
    # Z = min over σ of 4(σ−½)(½ log(q/π) + ½ψ((σ+a)/2) + upper bound of L'/L(σ)); recompute
    # one σ with mpmath's digamma and an explicit tail ∫_N^∞ log t·t^(−σ) dt (mpmath quad)
    import mpmath

    D, P = -23, 10**4
    est = l_value_estimate(D, P)
    _S, T, N = _sums(D, P)
    s = est.sigma
    assert s in SIGMAS
    tail = float(mpmath.quad(lambda t: mpmath.log(t) * t ** (-s), [N, mpmath.inf]))
    xi = 0.5 * math.log(23 / math.pi) + 0.5 * float(mpmath.digamma((s + 1) / 2)) - T[s].value + tail
    assert abs(est.zero_sum_bound - 4 * (s - 0.5) * xi) < 1e-6
    x = P / 2
    expected = GRH_CONSTANT * est.zero_sum_bound / (math.sqrt(x) * math.log(x))
    assert expected < est.log_radius < expected + 2 / (x * math.log(x))


def test_interval_contains_exact_values_small_prime_bounds():
    # exact L(1, χ_D) from h (enumeration) and, for D > 0, the regulator of the exact unit
    rng = random.Random(99)
    done = 0
    while done < 60:
        D = rng.choice([-1, 1]) * rng.randrange(3, 10**6)
        if not is_discriminant(D) or (D > 0 and math.isqrt(D) ** 2 == D):
            continue
        done += 1
        if D < 0:
            L = class_number(D) * 2 * math.pi / ({-3: 6, -4: 4}.get(D, 2) * math.sqrt(-D))
        else:
            L = class_group(D).class_number_wide * float(regulator(D)) * 2 / math.sqrt(D)
        for P in (16, 100, 1000, 10**4):
            est = l_value_estimate(D, P)
            assert est.lower <= L <= est.upper, (D, P, L, est)


def test_interval_shrinks_like_the_bound_says():
    # the radius is C₀·Z/(√x log x) + O(1/x): a hundred times more primes divide it by
    # 10·log(x₂)/log(x₁) ≈ 15.4, and a little more because Z drops with the tail of L'/L
    r1 = l_value_estimate(-(10**9) - 7, 10**4).log_radius
    r2 = l_value_estimate(-(10**9) - 7, 10**6).log_radius
    assert 15 < r1 / r2 < 25


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
    # formkit.analytic.class_number_formula evaluates Dirichlet's finite sums: no code shared with the Euler product
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
    values = [
        default_prime_bound(-(10**k) - 3 if (10**k + 3) % 4 == 3 else -(10**k) - 1) for k in range(4, 40, 4)
    ]
    assert values == sorted(values)
    assert values[0] >= 10**4 and values[-1] <= 3 * 10**7


@pytest.mark.parametrize("bad", [0, 2, 9, -1, 1.5, "x"])
def test_bad_discriminant(bad):
    with pytest.raises(FormkitError):
        l_value_estimate(bad)
    with pytest.raises(FormkitError):
        class_number_estimate(bad)


@pytest.mark.parametrize("P", [1, 0, -5, 15, 10**9])
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
def test_grh_interval_on_a_large_sample():
    # 600 random fundamental D < 0 up to 10^9 (exact h by enumeration), three prime bounds
    rng = random.Random(1)
    worst = 0.0
    n = 0
    while n < 600:
        D = -rng.randrange(10**5, 10**9)
        if not is_fundamental_discriminant(D):
            continue
        n += 1
        h = class_number(D)
        L = h * 2 * math.pi / ({-3: 6, -4: 4}.get(D, 2) * math.sqrt(-D))
        for P in (10**3, 10**4, 10**5):
            est = l_value_estimate(D, P)
            assert est.lower <= L <= est.upper, (D, P)
            worst = max(worst, abs(math.log(L / est.value)) / est.log_radius)
    assert worst < 1
