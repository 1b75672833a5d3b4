"""Tests for the modular polynomials of double η-quotients (formkit.representation.double_eta_modular)
and the CM step through them (formkit.representation.cm_method): ball arithmetic at random points of
the upper half plane (python-flint's acb η and j, the outside check), FLINT's factorisation, and the
roots of formkit's H_D modulo split primes.

Measured on the development machine (2 shared cores): Ψ for (3, 5), (3, 7), (3, 13), (5, 7) in under
0.1 s each, (5, 13) 1.2 s, (3, 11) 5 s, (3, 17) 6 s, (7, 13) 7 s, (5, 11) 8 s; the CM step for a
256-bit prime well under a second once Ψ and the class polynomial are known.
"""

import math
import random

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from formkit import errors
from formkit.representation.class_polynomials import class_polynomial
from formkit.representation.cm_method import (
    cm_curve,
    cm_j_invariants,
    cm_prime,
    double_eta_cm_pair,
    double_eta_roots_to_j,
    polynomial_roots_mod_prime,
)
from formkit.representation.double_eta import _pair_applies, double_eta_polynomial
from formkit.representation.double_eta_modular import (
    DOUBLE_ETA_MODULAR_PAIRS,
    double_eta_modular_polynomial,
    double_eta_pole_order,
)

FAST = [pair for pair in DOUBLE_ETA_MODULAR_PAIRS if double_eta_pole_order(*pair) <= 2]
SLOW = [pair for pair in DOUBLE_ETA_MODULAR_PAIRS if double_eta_pole_order(*pair) > 2]
DEGREE_TWO = [(2, 3), (2, 5), (2, 7), (2, 13), (3, 5), (3, 7), (3, 13), (5, 7)]


def _pairs(fast):
    return [
        pytest.param(pair, marks=[] if pair in fast else pytest.mark.slow)
        for pair in DOUBLE_ETA_MODULAR_PAIRS
    ]


@pytest.mark.parametrize("pair", _pairs(FAST))
def test_degrees_and_leading_coefficient(pair):
    # degrees from the cusps of X₀(p₁p₂) (module docstring): deg_X = ψ(N) = (p₁ + 1)(p₂ + 1),
    # deg_J = 2e; the coefficient of J^{2e} is exactly X^{p₁+p₂} (the σ_k are Laurent polynomials)
    p1, p2 = pair
    Psi = double_eta_modular_polynomial(p1, p2)
    assert Psi.degree_x == (p1 + 1) * (p2 + 1)
    assert Psi.degree_j == 2 * double_eta_pole_order(p1, p2) == 2 * Psi.exponent * (p1 - 1) * (p2 - 1) // 24
    top = list(Psi.rows[-1])
    assert top[p1 + p2] == 1 and not any(top[: p1 + p2]) and not any(top[p1 + p2 + 1 :])
    assert math.gcd(*(c for r in Psi.rows for c in r)) == 1  # primitive
    assert double_eta_modular_polynomial(p2, p1) is Psi  # either order, cached


@pytest.mark.parametrize("pair", _pairs(FAST))
def test_vanishes_at_random_points_ball_arithmetic(pair):
    # Ψ(w^s(τ), j(τ)) with w and j from python-flint's acb.modular_eta / modular_j (outside check):
    # the ball holds 0 and is tiny beside the largest term (so the test could fail)
    from flint import acb, arb, ctx

    p1, p2 = pair
    Psi = double_eta_modular_polynomial(p1, p2)
    N, s = p1 * p2, Psi.exponent
    rng = random.Random(p1 * p2)
    with ctx.workprec(800):
        for _ in range(3):
            z = acb(arb(rng.randint(-500, 500)) / 1000, arb(rng.randint(700, 1500)) / 1000)
            w = (
                (z / p1).modular_eta() * (z / p2).modular_eta() / (z.modular_eta() * (z / N).modular_eta())
            ) ** s
            j = z.modular_j()
            terms = [c * w**i * j**k for k, row in enumerate(Psi.rows) for i, c in enumerate(row) if c]
            value = sum(terms[1:], terms[0])
            largest = max(abs(t).mid() for t in terms)
            assert value.contains(0)
            assert abs(value).rad() < largest * arb(2) ** -300
            # and a wrong j (j + 1) is not a root: the test can fail
            wrong = sum(
                c * w**i * (j + 1) ** k for k, row in enumerate(Psi.rows) for i, c in enumerate(row) if c
            )
            assert not wrong.contains(0)


@pytest.mark.parametrize("pair", _pairs([(3, 5), (3, 13), (5, 7)]))
def test_irreducible_by_two_specialisations(pair):
    # FLINT's factorisation over Q (outside check).  Ψ(x₀, J) irreducible of degree 2e and Ψ(X, j₀)
    # irreducible of degree ψ(N) force Ψ irreducible: a factorisation Ψ = A·B would make one factor
    # free of J, then (second specialisation) constant, or Ψ = A(X)·B(J), which the first rules out.
    from flint import fmpz_poly

    Psi = double_eta_modular_polynomial(*pair)
    x0, j0 = 7, 11
    in_j = fmpz_poly([sum(c * x0**i for i, c in enumerate(row)) for row in Psi.rows])
    in_x = fmpz_poly(
        [
            sum(row[i] * j0**k for k, row in enumerate(Psi.rows) if i < len(row))
            for i in range(Psi.degree_x + 1)
        ]
    )
    assert in_j.degree() == Psi.degree_j and len(in_j.factor()[1]) == 1 and in_j.factor()[1][0][1] == 1
    assert in_x.degree() == Psi.degree_x and len(in_x.factor()[1]) == 1 and in_x.factor()[1][0][1] == 1


# fundamental and not (−188 = −47·2², −260 = −65·2² ring class polynomials), split and ramified primes
CM_DISCRIMINANTS = [-23, -47, -56, -71, -84, -104, -119, -159, -188, -191, -239, -260, -311, -359, -455, -599]


@pytest.mark.parametrize("D", CM_DISCRIMINANTS)
def test_cm_step_gives_the_roots_of_H_D(D):
    from formkit.representation.double_eta import _NotAGenerator

    H = class_polynomial(D)
    primes = [cm_prime(D, 28, seed=seed)[0] for seed in range(3)]
    expected = {p: polynomial_roots_mod_prime(H.coefficients, p) for p in primes}  # formkit's H_D, apart
    tried = 0
    for pair in DEGREE_TWO:
        if not _pair_applies(D, *pair):
            continue
        try:
            W = double_eta_polynomial(D, pair)
        except _NotAGenerator:
            continue
        tried += 1
        for p in primes:
            assert len(expected[p]) == H.degree  # p splits completely
            assert cm_j_invariants(D, p, invariant="double-eta", primes=pair) == expected[p]
            for x in polynomial_roots_mod_prime(W.coefficients, p)[:3]:
                js = double_eta_roots_to_j(x, p, pair)  # each root x of W gives roots of H_D
                assert js and set(js) <= set(expected[p])
    assert tried >= (1 if D == -188 else 2)  # −188: conductor 2, so no pair with 2


def test_cm_step_at_a_prime_that_does_not_split():
    # any prime: a root x of W modulo p gives roots of Ψ(x, J) that are roots of H_D (docstring)
    D, pair = -191, (3, 13)
    H, W = class_polynomial(D), double_eta_polynomial(D, pair)
    seen = 0
    for p in range(101, 600, 2):
        if not all(p % d for d in range(3, math.isqrt(p) + 1, 2)):
            continue
        for x in polynomial_roots_mod_prime(W.coefficients, p):
            if x:
                js = double_eta_roots_to_j(x, p, pair)
                seen += len(js)
                assert set(js) <= set(polynomial_roots_mod_prime(H.coefficients, p))
    assert seen > 10


def test_cm_curve_256_bits():
    D = -191
    p, t, v = cm_prime(D, 256, seed=3)
    js = cm_j_invariants(D, p, invariant="double-eta")
    assert js == polynomial_roots_mod_prime(class_polynomial(D).coefficients, p)  # formkit's H_D
    E = cm_curve(D, p, t, js[0])
    assert E.order == p + 1 - t and p.bit_length() == 256 and 4 * p == t * t - D * v * v
    # an independent point check: [order]·P = O for fresh random points (our own group law is the
    # one in cm_method; the order is prime to a random point's order only if the curve is wrong)
    from formkit.representation.cm_method import _kills

    assert _kills(E.order, E.a4, E.a6, p, random.Random(99), 4)
    assert not _kills(E.order + 2, E.a4, E.a6, p, random.Random(99), 2)


def test_default_pair_and_refusals():
    assert double_eta_cm_pair(-23) == (3, 13)
    assert double_eta_cm_pair(-71) == (3, 5)  # 13 inert in Q(√−71) (Kronecker symbol, by hand)
    with pytest.raises(errors.FormkitError, match="not computed here"):
        double_eta_modular_polynomial(3, 19)
    with pytest.raises(errors.FormkitError, match="degree 4 in j"):
        double_eta_roots_to_j(5, 101, (5, 13))
    with pytest.raises(errors.FormkitError, match="x = 0"):
        double_eta_roots_to_j(0, 101, (3, 13))
    with pytest.raises(errors.FormkitError, match="primes are for"):
        cm_j_invariants(-23, 59, invariant="j", primes=(3, 13))
    with pytest.raises(errors.DiscriminantError):
        double_eta_cm_pair(-88)
    with pytest.raises(errors.FormkitError, match="invariant must be"):
        cm_j_invariants(-23, 59, invariant="gamma")


def test_display_and_dict():
    Psi = double_eta_modular_polynomial(3, 13)
    assert "degree 56 in X, 2 in J" in repr(Psi)
    assert "q^" in Psi._repr_html_() and "$" in Psi._repr_latex_()
    d = Psi.to_dict()
    assert d["primes"] == [3, 13] and d["degree_x"] == 56 and d["degree_j"] == 2


@settings(max_examples=15, deadline=None)
@given(
    x=st.integers(-500, 500),
    y=st.integers(600, 2000),
    pair=st.sampled_from(DEGREE_TWO),
)
def test_both_forms_of_the_relation_hypothesis(x, y, pair):
    # hypothesis over τ: Ψ(w^s(τ), j(τ)) = 0 and, by the Fricke invariance of g = w(N·), also
    # Ψ(g^s(τ), j(τ)) = 0 (acb values: the outside check)
    from flint import acb, arb, ctx

    p1, p2 = pair
    Psi = double_eta_modular_polynomial(p1, p2)
    N, s = p1 * p2, Psi.exponent
    with ctx.workprec(600):
        z = acb(arb(x) / 1000, arb(y) / 1000)
        eta = [(z * d).modular_eta() for d in (1, p1, p2, N)]
        g = eta[1] * eta[2] / (eta[0] * eta[3])
        w = (z / p1).modular_eta() * (z / p2).modular_eta() / (z.modular_eta() * (z / N).modular_eta())
        j = z.modular_j()
        for value in (w**s, g**s):
            terms = [c * value**i * j**k for k, row in enumerate(Psi.rows) for i, c in enumerate(row) if c]
            total = sum(terms[1:], terms[0])
            assert total.contains(0) and abs(total).rad() < max(abs(t).mid() for t in terms) * arb(2) ** -200


def test_series_check_rejects_a_changed_coefficient():
    # the exact q-expansion check (the proof of Ψ(f, j) = 0) fails when one coefficient is off by 1
    from formkit.representation.double_eta_modular import _series_check

    Psi = double_eta_modular_polynomial(3, 13)
    assert _series_check(3, 13, Psi.rows) == Psi.series_check_terms == 56 + 2 * (39 + 16)
    rows = [list(r) for r in Psi.rows]
    rows[1][20] += 1
    with pytest.raises(RuntimeError, match="non-zero term"):
        _series_check(3, 13, tuple(tuple(r) for r in rows))
