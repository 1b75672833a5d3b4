"""Tests for the Weber class polynomials and the CM step (formkit.representation.class_invariants,
formkit.representation.cm_method): published polynomials, sympy, brute-force point counts, and
FLINT's own class polynomial routine as an outside check."""

import math
import random

import pytest
import sympy

from formkit import errors
from formkit.core.enumeration import class_number
from formkit.representation.class_invariants import (
    _normalised_form,
    _weber_value,
    weber_invariant_applies,
    weber_polynomial,
    weber_root_to_j,
)
from formkit.representation.class_polynomials import _reduced_forms, class_polynomial
from formkit.representation.cm_method import (
    cm_curve,
    cm_j_invariants,
    cm_prime,
    polynomial_roots_mod_prime,
)

# Weber class polynomials of f(√−m)/√2 (Weber, Lehrbuch III; the tables of Yui–Zagier,
# Math. Comp. 66 (1997); from memory).
PUBLISHED_WEBER = {
    -7: (1, -1),
    -23: (1, 0, -1, -1),
    -31: (1, -1, 0, -1),
    -47: (1, 0, -1, -2, -2, -1),
    -71: (1, -2, -1, 1, 1, 1, -1, -1),
}

# D ≡ 1 (mod 8), 3 ∤ D and 3 | D, fundamental and not (−63 = 3²·(−7), −175 = 5²·(−7))
SAMPLE = [
    -23,
    -31,
    -39,
    -47,
    -55,
    -63,
    -71,
    -79,
    -87,
    -95,
    -103,
    -111,
    -127,
    -175,
    -191,
    -239,
    -311,
    -399,
    -479,
]


@pytest.mark.parametrize("D, coeffs", sorted(PUBLISHED_WEBER.items()))
def test_published_weber_polynomials(D, coeffs):
    assert weber_polynomial(D).coefficients == coeffs


@pytest.mark.parametrize("D", SAMPLE)
def test_integer_irreducible_of_degree_h(D):
    W = weber_polynomial(D)
    assert W.degree == class_number(D)  # class number by enumeration
    assert W.power == (3 if D % 3 == 0 else 1)
    x = sympy.Symbol("x")
    P = sympy.Poly(W.coefficients, x, domain="ZZ")
    assert P.is_irreducible  # sympy's factorisation over Q: the outside check
    assert W.verification is not None and len(W.verification.primes_checked) >= 6


def _split_completely_primes(D, count, bits=24):
    """Primes 4p = t² − D v² (split completely in the ring class field), not dividing disc H_D."""
    out, seed = [], 0
    while len(out) < count:
        p, t, _v = cm_prime(D, bits, seed=seed)
        seed += 1
        if p not in [q for q, _ in out]:
            out.append((p, t))
    return out


@pytest.mark.parametrize("D", SAMPLE)
def test_weber_roots_map_onto_roots_of_H(D):
    # Each root x of W mod p gives j = (1 − 16u)³/u² (u = x^24, or x^8 when 3 | D), and these
    # are exactly the h distinct roots of H_D mod p (H_D from the j-function, independently).
    H = class_polynomial(D)
    W = weber_polynomial(D)
    for p, _t in _split_completely_primes(D, 3):
        xs = polynomial_roots_mod_prime(W.coefficients, p)
        js = polynomial_roots_mod_prime(H.coefficients, p)
        assert len(xs) == len(js) == W.degree
        assert sorted({weber_root_to_j(x, p, D) for x in xs}) == js
        assert all(H(weber_root_to_j(x, p, D)) % p == 0 for x in xs)


@pytest.mark.parametrize("D", [-23, -47, -71, -191, -87])
def test_value_independent_of_representative(D):
    # The conjugate attached to a class must not depend on the representative [A, B, C]
    # (gcd(A, 6) = 1, B ≡ 1 mod 48): compare the chosen one with others of the same class.
    from flint import ctx

    rng = random.Random(D)
    power = 3 if D % 3 == 0 else 1  # for 3 | D only the cube is a class invariant
    with ctx.workprec(200):
        for a, b, c in _reduced_forms(D):
            A, B, _C = _normalised_form(a, b, c, D)
            x = _weber_value(A, B, D, power)
            for _ in range(3):
                # a random SL2(Z) image of (a, b, c), then normalised again
                p, q = rng.randrange(1, 9), rng.randrange(-9, 9)
                while math.gcd(p, q) != 1:
                    p, q = rng.randrange(1, 9), rng.randrange(-9, 9)
                s, t, _g = (int(z) for z in sympy.gcdex(p, q))  # s·p + t·q = 1
                u, v = -t, s
                a2 = a * p * p + b * p * q + c * q * q
                b2 = 2 * a * p * u + b * (p * v + q * u) + 2 * c * q * v
                c2 = (b2 * b2 - D) // (4 * a2)
                A2, B2, _ = _normalised_form(a2, b2, c2, D)
                y = _weber_value(A2, B2, D, power)
                assert abs(x - y) < 1e-40


def test_conditions_on_D():
    assert weber_invariant_applies(-23) and weber_invariant_applies(-20)
    assert not weber_invariant_applies(-11) and weber_invariant_applies(-96)
    for bad in (-3, -11, -19, -35):  # D ≡ 5 (mod 8): Weber gives the ring class field of 4D
        with pytest.raises(errors.DiscriminantError, match="mod 8"):
            weber_polynomial(bad)
    with pytest.raises(errors.DiscriminantError):
        weber_polynomial(17)
    with pytest.raises(errors.FormkitError):
        weber_root_to_j(0, 101, -23)


def test_outside_check_against_flints_class_polynomial_routine():
    # OUTSIDE CHECK: FLINT's own Hilbert class polynomial routine (fmpz_poly.hilbert_class_poly),
    # used here only to check formkit's H_D, never by formkit itself.
    from flint import fmpz_poly

    for D in (-71, -455, -1799, -7991, -100015):
        assert class_polynomial(D).coefficients == tuple(
            int(c) for c in reversed(fmpz_poly.hilbert_class_poly(D).coeffs())
        )


def test_dict_and_text():
    W = weber_polynomial(-23)
    d = W.to_dict()
    assert d["coefficients"] == [1, 0, -1, -1] and d["power"] == 1 and d["invariant"] == "weber"
    assert str(W) == "x^3 - x - 1"
    assert "certified" in W._repr_html_() and "W_{-23}" in W._repr_latex_()


# ---------------------------------------------------------------------------
# the CM step


def _brute_count(a4, a6, p):
    """#E(F_p) for y² = x³ + a4 x + a6 by counting square roots (Euler's criterion), plus O."""
    n = 1
    for x in range(p):
        r = (x * x * x + a4 * x + a6) % p
        n += 1 if r == 0 else (2 if pow(r, (p - 1) // 2, p) == 1 else 0)
    return n


@pytest.mark.parametrize("D", [-23, -31, -47, -71, -87, -175, -20, -56, -84, -15])
def test_cm_curves_have_the_right_number_of_points(D):
    # Small p: every root j of H_D mod p gives a curve with exactly p + 1 − t points (brute force).
    for seed in range(2):
        p, t, v = cm_prime(D, 12, seed=seed)
        assert 4 * p == t * t - D * v * v
        invariant = "weber" if D % 8 == 1 else "j"
        js = cm_j_invariants(D, p, invariant=invariant)
        assert js == cm_j_invariants(D, p, invariant="j")
        for j in js:
            E = cm_curve(D, p, t, j)
            assert _brute_count(E.a4, E.a6, p) == p + 1 - t
            # the curve's j-invariant is j (Washington §2.7)
            assert 1728 * 4 * E.a4**3 * pow(4 * E.a4**3 + 27 * E.a6**2, -1, p) % p == j


@pytest.mark.parametrize("D", [-23, -191, -399])
def test_cm_at_256_bits(D):
    p, t, v = cm_prime(D, 256, seed=1)
    assert p.bit_length() == 256 and sympy.isprime(p) and 4 * p == t * t - D * v * v
    js = cm_j_invariants(D, p)
    assert len(js) == class_number(D)
    H = class_polynomial(D)
    assert all(H(j) % p == 0 for j in js)  # roots of H_D, not only images of Weber roots
    E = cm_curve(D, p, t, js[0], tries=4)
    # consistency: [p + 1 − t]P = O for random P was checked; the other sign fails
    from formkit.representation.cm_method import _kills

    assert not _kills(p + 1 + t, E.a4, E.a6, p, random.Random(5), 2)


def test_cm_errors():
    with pytest.raises(errors.DiscriminantError):
        cm_prime(-4, 64)
    with pytest.raises(errors.FormkitError):
        cm_prime(-23, 3)
    with pytest.raises(errors.FormkitError):
        polynomial_roots_mod_prime([1, 1], 91)
    with pytest.raises(errors.FormkitError, match="t = "):
        cm_curve(-23, 59, 13, 20)
    with pytest.raises(errors.FormkitError):
        cm_j_invariants(-23, 59, invariant="gamma2")
    # a j that is no root of H_{-23} nor of H_{-92} (the other order with t² − 4p = −92):
    # neither twist has p + 1 − t points
    js = cm_j_invariants(-23, 59) + cm_j_invariants(-92, 59, invariant="j")
    other = next(j for j in range(2, 59) if j not in js and j != 1728 % 59)
    with pytest.raises(errors.FormkitError, match="no twist"):
        cm_curve(-23, 59, 12, other)
