"""Tests for the double η-quotient class polynomials (formkit.representation.double_eta): class
numbers by enumeration, sympy's factorisation, root counts modulo primes against the prime-form
classes, and the certificate failing for an exponent the theorem does not allow."""

import math
import random

import pytest
import sympy

from formkit import errors
from formkit.core.enumeration import class_number
from formkit.representation.class_polynomials import _reduced_forms, class_polynomial
from formkit.representation.cm_method import cm_prime, polynomial_roots_mod_prime
from formkit.representation.double_eta import (
    _PAIRS,
    _ball_product,
    _certified_from_complex,
    _double_eta_value,
    _n_system_form,
    _pair_applies,
    _square_root_mod,
    double_eta_gain,
    double_eta_pair,
    double_eta_polynomial,
)

CASES = [(-23, (3, 13)), (-71, (3, 5)), (-47, (3, 7)), (-191, (3, 13)), (-1151, (5, 7)), (-119, (5, 7))]
CASES += [
    (-84, (5, 7)),
    (-260, (3, 13)),
    (-120, (5, 13)),
    (-399, (3, 13)),
    (-455, (3, 13)),
    (-56, (5, 7)),
    (-104, (3, 13)),
]


@pytest.mark.parametrize("D, pair", CASES)
def test_integer_irreducible_of_degree_h(D, pair):
    assert _pair_applies(D, *pair)
    P = double_eta_polynomial(D, pair)
    assert P.degree == class_number(D)  # class number by enumeration
    assert sympy.Poly(
        P.coefficients, sympy.Symbol("x"), domain="ZZ"
    ).is_irreducible  # sympy: the outside check
    assert len(P.primes_checked) >= 6  # root counts modulo split primes matched the prime-form classes


@pytest.mark.parametrize("D", [-23, -71, -191, -455, -104])
def test_splits_completely_where_H_does(D):
    # p = (t² + |D|v²)/4 splits completely in the ring class field: both W and H_D have h roots mod p.
    P = double_eta_polynomial(D)
    H = class_polynomial(D)
    for seed in range(3):
        p, _t, _v = cm_prime(D, 30, seed=seed)
        assert len(polynomial_roots_mod_prime(P.coefficients, p)) == P.degree
        assert len(polynomial_roots_mod_prime(H.coefficients, p)) == P.degree


def test_wrong_exponent_is_not_certified():
    # s = 24/gcd(24, 2·4) = 3 for (3, 5); w_{3,5} itself is not a class invariant for D = −71, and
    # the certificate (every coefficient ball holds an integer) must then fail, not round wrongly.
    forms = _reduced_forms(-71)
    assert _certified_from_complex(_ball_product(-71, forms, 400, 3, 5, 1)) is None
    assert _certified_from_complex(_ball_product(-71, forms, 400, 3, 5, 3)) is not None


@pytest.mark.parametrize("D, pair", [(-191, (3, 13)), (-1151, (5, 7)), (-431, (3, 5))])
def test_value_depends_only_on_the_class(D, pair):
    from flint import ctx

    p1, p2 = pair
    N, s = p1 * p2, 24 // math.gcd(24, (p1 - 1) * (p2 - 1))
    B0 = _square_root_mod(D, N)
    rng = random.Random(D)
    with ctx.workprec(300):
        for a, b, c in _reduced_forms(D):
            x = _double_eta_value(*_n_system_form(a, b, c, D, N, B0), D, p1, p2, s)
            for _ in range(2):
                p, q = rng.randrange(1, 6), rng.randrange(-6, 6)
                while math.gcd(p, q) != 1:
                    p, q = rng.randrange(1, 6), rng.randrange(-6, 6)
                s0, t0, _g = (int(z) for z in sympy.gcdex(p, q))  # s0·p + t0·q = 1
                u, v = -t0, s0
                a2 = a * p * p + b * p * q + c * q * q
                b2 = 2 * a * p * u + b * (p * v + q * u) + 2 * c * q * v
                A, B = _n_system_form(a2, b2, (b2 * b2 - D) // (4 * a2), D, N, B0)
                assert (B - B0) % (2 * N) == 0 and math.gcd(A, N) == 1
                y = _double_eta_value(A, B, D, p1, p2, s)
                assert abs(x - y) < 1e-60


def test_pairs_and_gain():
    # gains 12(p1+1)(p2+1)/(s(p1−1)(p2−1)): 28 for w_{3,13}, 24 for w_{5,7} (Enge–Morain 2002; from memory)
    assert double_eta_gain(3, 13) == 28 and double_eta_gain(5, 7) == 24
    gains = [double_eta_gain(*q) for q in _PAIRS]
    assert gains == sorted(gains, reverse=True)
    with pytest.raises(errors.DiscriminantError):
        double_eta_polynomial(-71, (5, 7))  # 7 is inert in Q(√−71)
    with pytest.raises(errors.DiscriminantError):
        double_eta_polynomial(-455, (5, 7))  # both ramified
    with pytest.raises(errors.FormkitError):
        double_eta_polynomial(-71, (3, 3))
    with pytest.raises(errors.FormkitError, match="only the pairs"):
        double_eta_polynomial(-71, (2, 11))  # 2 only with 3, 5, 7, 13
    with pytest.raises(errors.FormkitError, match="two distinct primes"):
        double_eta_polynomial(-71, (2, 2))
    with pytest.raises(errors.DiscriminantError):
        double_eta_pair(-88)  # every pair of the list has an inert prime or two ramified ones
    for D in (-43, -88, -163):  # brute force over the list, by the Kronecker symbol (sympy)
        assert not any(
            all(sympy.jacobi_symbol(D % p, p) != -1 for p in q) and not all(D % p == 0 for p in q)
            for q in _PAIRS
        )


def test_repeated_values_are_refused():
    # D = −160 with w_{7,13}: the certified polynomial is (x² + 3x + 1)² (found here; the
    # squarefreeness test is exact), so the pair is refused and the default choice moves on.
    with pytest.raises(errors.DiscriminantError, match="repeat"):
        double_eta_polynomial(-160, (7, 13))
    P = double_eta_polynomial(-160)
    assert (P.p1, P.p2) != (7, 13) and P.degree == class_number(-160)
    assert sympy.Poly(P.coefficients, sympy.Symbol("x")).is_irreducible


def test_dict_says_how_j_follows():
    d = double_eta_polynomial(-23).to_dict()
    assert d["invariant"] == "double-eta" and d["primes"] == [3, 13] and "are roots of H_D" in d["j_relation"]
    # (5, 13): Ψ has degree 4 in J, and the step to j is not taken (said so)
    assert "does not choose" in double_eta_polynomial(-120, (5, 13)).to_dict()["j_relation"]
    assert d["coefficients"] == [1, -1, 0, 1] and d["verification"]["radius_log2"] < -1


# p₁ = 2 (module docstring, "The prime 2"): 2 split (D ≡ 1 mod 8) or ramified (D even, conductor odd)
CASES_WITH_2 = [(-104, (2, 3)), (-47, (2, 3)), (-20, (2, 3)), (-84, (2, 5)), (-71, (2, 5)), (-36, (2, 5))]
CASES_WITH_2 += [(-40, (2, 7)), (-63, (2, 7)), (-31, (2, 7)), (-56, (2, 13)), (-191, (2, 13)), (-79, (2, 13))]


@pytest.mark.parametrize("D, pair", CASES_WITH_2)
def test_pairs_with_two(D, pair):
    assert _pair_applies(D, *pair)
    P = double_eta_polynomial(D, pair)
    assert P.exponent == 24 // math.gcd(24, pair[1] - 1) and P.degree == class_number(D)  # enumeration
    assert sympy.Poly(P.coefficients, sympy.Symbol("x"), domain="ZZ").is_irreducible  # sympy (outside)
    assert len(P.primes_checked) >= 6  # root counts modulo split primes matched the prime-form classes
