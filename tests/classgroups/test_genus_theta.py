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
            # Eisenstein series: genus characters (fundamental D) or Siegel's local densities (any D)
            assert t.siegel_agrees is True, (D, g.symbol)
            assert ("genus characters" in t.eisenstein_method) == is_fundamental_discriminant(D)


def test_genus_averages_sample():
    # a sample of every genus with |D| ≤ 2000 (one discriminant in 23); all of them in the slow test
    _check_genera(_discriminants(2000, 23), 12)


@pytest.mark.slow
def test_genus_averages_all():
    _check_genera(_discriminants(2000, 1), 30)


def _check_siegel(Ds, N):
    # the genus average from lattice points equals the Eisenstein series: from the genus characters
    # for fundamental D, from Siegel's formula with exact local densities for orders (non-fundamental D)
    for D in Ds:
        for g in genera(D):
            t = theta_decomposition(g.forms[0], N)
            assert t.siegel_agrees is True and t.eisenstein_bound == N, (D, g.symbol)


def test_siegel_sample():
    _check_siegel(_discriminants(2000, 7), 25)


@pytest.mark.slow
def test_siegel_for_every_genus_up_to_2000():
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


def test_local_densities_against_brute_force():
    # α_p(n) against a direct count modulo p^k and p^(k+1), k = v_p(n) + v_p(D) + 1 (+3 at p = 2): the
    # two counts agree (the limit is reached) and equal the computed density; the Hensel cases too
    from formkit.analytic.local_densities import local_density

    def count(Q, p, n, k):
        a, b, c = Q
        m = p**k
        hits = sum(1 for x in range(m) for y in range(m) if (a * x * x + b * x * y + c * y * y - n) % m == 0)
        return Fraction(hits, m)

    def val(n, p):
        v = 0
        while n % p == 0:
            n, v = n // p, v + 1
        return v

    checked = 0
    for Q in [
        (1, 0, 1),
        (1, 1, 1),
        (1, 0, 4),
        (1, 1, 7),
        (2, 2, 5),
        (1, 0, 9),
        (1, 0, 5),
        (2, 1, 3),
        (1, 0, 2),
        (3, 2, 3),
        (1, 1, 2),
        (1, 0, 3),
        (2, 0, 3),
        (1, 0, 27),
        (4, 2, 7),
    ]:
        D = Q[1] ** 2 - 4 * Q[0] * Q[2]
        for p in (2, 3, 5, 7):
            for n in range(1, 20):
                k = val(n, p) + val(D, p) + (3 if p == 2 else 1)
                if p ** (k + 1) > 300:
                    continue
                assert local_density(Q, p, n) == count(Q, p, n, k) == count(Q, p, n, k + 1), (Q, p, n)
                checked += 1
    assert checked > 300


def test_dirichlet_convolution_against_brute_force_and_its_counted_work():
    # a(n) = Σ_{d|n} χ_{d1}(d)χ_{d2}(n/d) by the hyperbola method, against the divisor sum
    # itself (brute force, sympy's divisors and kronecker_symbol as outside references)
    import math

    import sympy

    from formkit.classgroups.genus_theta import _dirichlet_convolution

    for d1, d2, N in ((1, -20, 500), (-4, 5, 500), (-3, -7, 401), (5, -3, 2)):
        a = _dirichlet_convolution(d1, d2, N)
        for n in range(1, N + 1):
            want = sum(
                sympy.kronecker_symbol(d1, d) * sympy.kronecker_symbol(d2, n // d) for d in sympy.divisors(n)
            )
            assert a[n] == want, (d1, d2, n)
    # the multiply-adds the cost model prices as N·(ln N + 1): the two hyperbola halves
    for N in (10, 1000, 10**6):
        r = math.isqrt(N)
        work = sum(N // d for d in range(1, r + 1)) + sum(max(0, N // e - r) for e in range(1, r + 1))
        assert work <= N * (math.log(N) + 1) <= 2 * work


def test_genus_decomposition_is_priced_and_refused_past_the_budget():
    from formkit.classgroups.genus_theta import genus_theta_cost
    from formkit.core.budget import budget
    from formkit.errors import BudgetError

    small, _ = genus_theta_cost((1, 0, 5), 10**4)
    large, memory = genus_theta_cost((1, 0, 5), 10**8)
    assert large > 5000 * small and memory > 8 * 10**8  # about N·log N, 5 arrays of N int64
    with (
        budget("1s"),
        pytest.raises(BudgetError, match=r"genus decomposition .* \(1, 0, 5\) up to q\^100000000"),
    ):
        theta_decomposition((1, 0, 5), 10**8)
