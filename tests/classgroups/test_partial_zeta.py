"""Partial zeta functions of the narrow classes of D > 0 and the L-series built from them.

Outside references: mpmath's ζ and Dirichlet L-series (general-purpose library) for
ζ_K(s) = ζ(s)·L(s, χ_D) (Dirichlet/Dedekind, theorem); the count of ideals of norm n,
Σ_{d | n} χ_D(d) (theorem, from memory); Euler products of class group characters through
formkit's prime forms and composition (an independent route to the same L-series);
Kronecker's factorisation of genus character L-series (Zagier §12, from memory).
"""

from __future__ import annotations

import cmath
import math

import mpmath
import pytest

from formkit import class_group
from formkit.classgroups.partial_zeta import (
    partial_zeta,
    partial_zeta_values,
    real_class_character_l_series,
    real_class_zeta_sum,
    real_genus_character_l_series,
)
from formkit.core.arith import kronecker
from formkit.errors import DiscriminantError, FormkitError


def _dedekind_zeta(D: int, s: int) -> mpmath.mpf:
    chi = [kronecker(D, n) for n in range(D)]
    return mpmath.zeta(s) * mpmath.dirichlet(s, chi)


@pytest.mark.parametrize("D", [5, 8, 12, 13, 21, 40, 60, 229, 316])
def test_sum_over_classes_is_dedekind_zeta(D):
    z = partial_zeta_values(D, 3, bound=2000, digits=20)
    ref = _dedekind_zeta(D, 3)
    total = sum(mpmath.mpf(v.value) for v in z.values)
    err = sum(v.error_bound for v in z.values)
    assert abs(total - ref) <= err * (1 + 1e-9), (D, total, ref, err)
    assert len(z.values) == class_group(D, method="enumeration").order
    r = real_class_zeta_sum(D, 3, bound=2000, digits=20, values=z)
    assert r.agrees


def test_ideal_counts_against_dirichlet():
    # primitive ideals of norm ≤ X in all classes: Σ_m μ(m)·A(X/m²), A(t) = Σ_{n ≤ t} Σ_{d | n} χ(d)
    from sympy import mobius

    for D in (5, 13, 28, 229):
        X = 600
        z = partial_zeta_values(D, 3, bound=X, digits=5)
        A = [0] * (X + 1)
        for n in range(1, X + 1):
            A[n] = A[n - 1] + sum(kronecker(D, d) for d in range(1, n + 1) if n % d == 0)
        want = sum(int(mobius(m)) * A[X // (m * m)] for m in range(1, math.isqrt(X) + 1))
        assert sum(z.ideal_counts) == want, D


def _euler_product(D: int, k: list[int], s: int, P: int = 20000) -> complex:
    """L(s, ψ) = ∏_p local factors, ψ(𝔭) from the prime forms of formkit's class group."""
    G = class_group(D, method="enumeration")
    inv = G.invariants
    from sympy import primerange

    out = 1.0 + 0j
    for p in primerange(2, P):
        c = kronecker(D, p)
        if c == -1:
            out /= 1 - p ** (-2.0 * s)
            continue
        e = G.discrete_log(G.prime_form(p))
        psi = cmath.exp(2j * math.pi * sum(ki * ei / ni for ki, ei, ni in zip(k, e, inv)))
        if c == 0:
            out /= 1 - psi * p ** (-s)
        else:
            out /= (1 - psi * p ** (-s)) * (1 - psi.conjugate() * p ** (-s))
    return out


@pytest.mark.parametrize(("D", "k"), [(229, [1]), (316, [1]), (316, [3]), (79 * 4, [2]), (145, [1])])
def test_class_character_against_euler_product(D, k):
    G = class_group(D, method="enumeration")
    if len(k) != len(G.invariants):
        pytest.skip("character shape")
    v = real_class_character_l_series(D, k, 3, bound=3000, digits=15)
    ref = _euler_product(D, k, 3)
    assert abs(complex(v) - ref) <= v.error_bound + 1e-9, (D, k, complex(v), ref)


@pytest.mark.parametrize(("D", "d1"), [(12, -3), (60, 5), (60, -4), (60, -3), (85, 5), (24, -3)])
def test_genus_characters(D, d1):
    r = real_genus_character_l_series(D, d1, 3, bound=2000, digits=15)
    d2 = D // d1
    ref = mpmath.mpf(1)
    for d in (d1, d2):
        ref *= mpmath.dirichlet(3, [kronecker(d, n) for n in range(abs(d))])
    assert r.agrees
    assert abs(mpmath.mpf(r.left.value) - ref) <= r.left.error_bound * (1 + 1e-9)


def test_single_class_and_larger_s():
    # h⁺(5) = 1: ζ(s, C) = ζ_K(s); at s = 6 the tail bound leaves many digits
    v = partial_zeta((1, 1, -1), 6, bound=3000, digits=30)
    assert v.digits >= 15
    assert abs(mpmath.mpf(v.value) - _dedekind_zeta(5, 6)) <= v.error_bound


def test_bad_input():
    with pytest.raises(DiscriminantError, match="D > 0"):
        partial_zeta_values(-23, 3)
    with pytest.raises(FormkitError, match="pole"):
        partial_zeta_values(5, 1)
    with pytest.raises(FormkitError, match="real s > 1"):  # a bound selects direct summation
        partial_zeta_values(5, "2+i", bound=100)
    with pytest.raises(FormkitError, match="Im s"):
        partial_zeta_values(5, "2+101i")
    with pytest.raises(FormkitError, match="bound"):
        partial_zeta_values(5, 2, bound=0)
    with pytest.raises(FormkitError, match="no certified"):  # an order goes to order_zeta_sum, same rules
        real_class_zeta_sum(45, 3, bound=100)
    with pytest.raises(FormkitError, match="no certified"):
        partial_zeta_values(5, "1.01", bound=10)
    with pytest.raises(FormkitError, match="split"):
        real_genus_character_l_series(60, 7, 3, bound=100)
    with pytest.raises(FormkitError, match="exponents"):
        real_class_character_l_series(229, [1, 1], 3, bound=100)


def test_chowla_selberg_refuses_real_discriminants():
    from formkit.classgroups.class_series import chowla_selberg

    with pytest.raises(DiscriminantError, match="CM points"):
        chowla_selberg(5)
