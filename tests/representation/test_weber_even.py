"""Tests for the Weber class polynomials of D = −4m (formkit.representation.weber_even, served by
formkit.weber_polynomial): Weber's singular values (from memory), sympy's resultants and
factorisation, FLINT's Hilbert class polynomial routine as an outside check, class numbers by
enumeration, brute-force point counts, and Shimura's reciprocity law checked numerically."""

import math
import random

import pytest
import sympy

from formkit import errors
from formkit.core.enumeration import class_number
from formkit.representation.class_invariants import weber_polynomial, weber_root_to_j
from formkit.representation.class_polynomials import _reduced_forms, class_polynomial
from formkit.representation.cm_method import cm_curve, cm_j_invariants, cm_prime, polynomial_roots_mod_prime
from formkit.representation.weber_even import (
    EVEN_WEBER_TABLE,
    _even_weber_value,
    _kronecker_2,
    _lift_sl2,
    even_weber_root_to_j,
    even_weber_shape,
)

# Singular values of Weber's functions (Weber, Lehrbuch der Algebra III, §§ 125–127 tables, as
# recalled in Yui–Zagier 1997 and Cox §12; from memory): f(i) = 2^(1/4), f1(√−2) = 2^(1/4),
# f(√−3) = 2^(1/3), f(√−7) = √2, f(√−5)^4 = 1 + √5, f(√−11) a root of x³ − 2x² + 2x − 2.
PUBLISHED = {
    -4: (1, -1),  # f(i)²/√2 = 1
    -8: (1, -1),  # f1(√−2)²/√2 = 1
    -12: (1, -2),  # f(√−3)³ = 2
    -28: (1, -1),  # f(√−7)/√2 = 1
    -20: (1, -2, -4),  # f(√−5)⁴ = 1 + √5
    -44: (1, -2, 2, -2),  # f(√−11)
}

# every row of the table, with 3 ∤ m and 3 | m, fundamental and not (−4m for m ≡ 3 mod 4, m ≡ 0 mod 4)
SAMPLE = [
    -36,
    -40,
    -44,
    -52,
    -56,
    -60,
    -68,
    -72,
    -80,
    -84,
    -88,
    -92,
    -104,
    -120,
    -128,
    -132,
    -140,
    -164,
    -200,
]
SAMPLE += [-96, -212, -248, -260, -308, -320, -384, -420, -632, -1012]


@pytest.mark.parametrize("D, coeffs", sorted(PUBLISHED.items()))
def test_published_values(D, coeffs):
    assert weber_polynomial(D).coefficients == coeffs


def test_table_covers_every_residue_class():
    assert sorted(EVEN_WEBER_TABLE) == list(range(8))
    for m in range(1, 200):
        _F, k, e = even_weber_shape(-4 * m)
        assert 24 % k == 0 and (12 * e) % k == 0  # F^24 = x^(24/k)·2^(12e/k) with integer exponents


@pytest.mark.parametrize("D", SAMPLE)
def test_integer_irreducible_of_degree_h(D):
    W = weber_polynomial(D)
    assert W.degree == class_number(D)  # class number by enumeration
    P = sympy.Poly(W.coefficients, sympy.Symbol("x"), domain="ZZ")
    assert P.is_irreducible  # sympy's factorisation over Q: the outside check
    assert W.verification is not None and len(W.verification.primes_checked) >= 6
    assert W.shape == even_weber_shape(D) and W.power == W.shape[1]


def _h_from_resultant(D):
    """∏_x (F(x)·X − (F(x) ∓ 16)³) / ∏ F(x) over the roots x of W: Res_x(W, F·X − (F ∓ 16)³)/Res_x(W, F)."""
    F, k, e = even_weber_shape(D)
    x, X = sympy.symbols("x X")
    W = sympy.Poly(weber_polynomial(D).coefficients, x)
    F24 = x ** (24 // k) * 2 ** (12 * e // k)
    num = sympy.resultant(W.as_expr(), F24 * X - (F24 - 16 if F == "f" else F24 + 16) ** 3, x)
    den = sympy.resultant(W.as_expr(), F24, x)
    return sympy.Poly(sympy.cancel(num / den), X)


@pytest.mark.parametrize("D", [-20, -40, -44, -52, -56, -60, -68, -84, -88, -92, -128, -132])
def test_images_are_exactly_the_roots_of_H(D):
    # Exact, over Z (sympy's resultant): the images j(x) of the roots x of W are the roots of H_D.
    # H_D from FLINT's Hilbert class polynomial routine — OUTSIDE CHECK only, never used by formkit.
    from flint import fmpz_poly

    H = tuple(int(c) for c in reversed(fmpz_poly.hilbert_class_poly(D).coeffs()))
    assert tuple(int(c) for c in _h_from_resultant(D).all_coeffs()) == H


def _split_completely_primes(D, count, bits=24):
    out, seed = [], 0
    while len(out) < count:
        p, t, _v = cm_prime(D, bits, seed=seed)
        seed += 1
        if p not in [q for q, _ in out]:
            out.append((p, t))
    return out


@pytest.mark.parametrize("D", SAMPLE)
def test_roots_mod_p_map_onto_roots_of_H(D):
    # p = (t² + |D|v²)/4 splits completely in the ring class field: W and H_D both have h roots,
    # and the images of the roots of W are exactly the roots of H_D (H_D from j, independently).
    H = class_polynomial(D)
    W = weber_polynomial(D)
    for p, _t in _split_completely_primes(D, 3):
        xs = polynomial_roots_mod_prime(W.coefficients, p)
        js = polynomial_roots_mod_prime(H.coefficients, p)
        assert len(xs) == len(js) == W.degree
        assert sorted({weber_root_to_j(x, p, D) for x in xs}) == js


@pytest.mark.parametrize("D", [-56, -84, -104, -140, -260, -420])
def test_every_root_maps_to_a_root_at_other_primes(D):
    # At primes p = x² + my² (and any other p ∤ disc), every root of W mod p maps to a root of H_D.
    H = class_polynomial(D)
    W = weber_polynomial(D)
    m = -D // 4
    for p in [x * x + m * y * y for x in range(1, 40) for y in (1, 2)][:40]:
        if not sympy.isprime(p) or p < 5:
            continue
        for x in polynomial_roots_mod_prime(W.coefficients, p):
            if x:
                assert H(weber_root_to_j(x, p, D)) % p == 0


def _conjugate_at(form, D, prec=300):
    """The conjugate for the form, as a pair of mpmath numbers at 80 digits (from a 300-bit ball)."""
    from flint import ctx

    with ctx.workprec(prec):
        x = _even_weber_value(*form, D, even_weber_shape(D))
        return _to_mpc(x)


def _to_mpc(x, digits=60):
    """A complex ball as an mpmath number (its radius checked below 10^−digits)."""
    import mpmath

    assert x.rad() < 10.0**-digits
    mpmath.mp.dps = digits + 20
    return mpmath.mpc(
        mpmath.mpf(x.real.mid().str(digits + 20, radius=False)),
        mpmath.mpf(x.imag.mid().str(digits + 20, radius=False)),
    )


@pytest.mark.parametrize("D", [-44, -56, -68, -80, -84, -104, -120, -260])
def test_value_depends_only_on_the_class(D):
    # Gee–Stevenhagen's formula applied to other forms of the same class gives the same conjugate.
    rng = random.Random(D)
    for a, b, c in _reduced_forms(D):
        x = _conjugate_at((a, b, c), D)
        for _ in range(3):
            p, q = rng.randrange(1, 7), rng.randrange(-7, 7)
            while math.gcd(p, q) != 1:
                p, q = rng.randrange(1, 7), rng.randrange(-7, 7)
            s, t, _g = (int(z) for z in sympy.gcdex(p, q))
            u, v = -t, s
            a2 = a * p * p + b * p * q + c * q * q
            b2 = 2 * a * p * u + b * (p * v + q * u) + 2 * c * q * v
            y = _conjugate_at((a2, b2, (b2 * b2 - D) // (4 * a2)), D)
            assert abs(x - y) < 1e-50


@pytest.mark.parametrize("D", [-56, -84, -116, -260])
def test_inverse_class_gives_the_complex_conjugate(D):
    # The pairing of (a, ±b, c) into real quadratic factors (common practice, no source: follows
    # from x(θ) real and complex conjugation inverting the Artin symbols).
    import mpmath

    for a, b, c in _reduced_forms(D):
        x, y = _conjugate_at((a, b, c), D), _conjugate_at((a, -b, c), D)
        assert abs(x - mpmath.conj(y)) < 1e-50


def _shimura_value(D, F, k, e, t, s):
    """x^M(θ), θ = √−m, for M = [[t, −ms], [s, t]] (Shimura reciprocity, as in the module)."""
    from flint import acb, arb, ctx

    m = -D // 4
    with ctx.workprec(300):
        M = (t, -m * s, s, t)
        det = (t * t + m * s * s) % 48
        inv = pow(det, -1, 48)
        A, B, C, Dd = _lift_sl2((M[0], M[1], M[2] * inv, M[3] * inv), 48)
        theta = acb(0, arb(m).sqrt())
        z = (A * theta + B) / (C * theta + Dd)
        if F == "f":
            w = acb(arb(-1) / 24).exp_pi_i() * ((z + 1) / 2).modular_eta() / z.modular_eta()
        else:
            w = (z / 2).modular_eta() / z.modular_eta()
        x = w**k / arb(2).sqrt() ** e
        return _to_mpc(-x if e % 2 and _kronecker_2(det) == -1 else x, 40)


@pytest.mark.parametrize("m", [5, 6, 10, 11, 13, 14, 15, 17, 20, 21, 22, 23, 24, 29, 32, 40, 48])
def test_shimura_reciprocity_invariance_and_minimal_exponent(m):
    # The derivation of the table: x(θ) is fixed by every M = [[t, −ms], [s, t]] of (O/48O)^*
    # (so it lies in the ring class field), and the next smaller divisor of k is not.
    D = -4 * m
    F, k, e = even_weber_shape(D)
    rng = random.Random(m)
    units = []
    while len(units) < 10:
        t, s = rng.randrange(48), rng.randrange(48)
        if math.gcd(t * t + m * s * s, 6) == 1:
            units.append((t, s))
    x0 = _shimura_value(D, F, k, e, 1, 0)
    assert all(abs(_shimura_value(D, F, k, e, t, s) - x0) < 1e-35 for t, s in units)
    smaller = [d for d in (1, 2, 3, 4, 6, 8, 12) if k % d == 0 and d < k]
    assert smaller or k == 1
    for d in smaller:
        for e2 in (0, 1):
            y0 = _shimura_value(D, F, d, e2, 1, 0)
            assert any(abs(_shimura_value(D, F, d, e2, t, s) - y0) > 1e-20 for t, s in units)


def _brute_count(a4, a6, p):
    n = 1
    for x in range(p):
        r = (x * x * x + a4 * x + a6) % p
        n += 1 if r == 0 else (2 if pow(r, (p - 1) // 2, p) == 1 else 0)
    return n


@pytest.mark.parametrize("D", [-20, -40, -44, -56, -84, -88, -128])
def test_cm_curves_from_weber_roots(D):
    # Brute-force point counts of the curves made from the images of the Weber roots.
    for seed in range(2):
        p, t, _v = cm_prime(D, 12, seed=seed)
        js = cm_j_invariants(D, p, invariant="weber")
        assert js == cm_j_invariants(D, p, invariant="j")
        for j in js:
            E = cm_curve(D, p, t, j)
            assert _brute_count(E.a4, E.a6, p) == p + 1 - t


def test_cm_at_256_bits():
    D = -260
    p, _t, _v = cm_prime(D, 256, seed=2)
    js = cm_j_invariants(D, p)
    H = class_polynomial(D)
    assert len(js) == class_number(D) and all(H(j) % p == 0 for j in js)


def test_errors_and_display():
    with pytest.raises(errors.DiscriminantError):
        even_weber_shape(-23)
    with pytest.raises(errors.FormkitError):
        even_weber_root_to_j(0, 101, ("f", 1, 0))
    W = weber_polynomial(-56)
    d = W.to_dict()
    assert d["weber_function"] == "f1" and d["power"] == 2 and d["sqrt2_exponent"] == 0 and d["m"] == 14
    assert W.invariant == "f1(sqrt(-m))^2" and "F + 16" in W.j_relation
    assert "f1(sqrt(-m))^2" in W._repr_html_()
