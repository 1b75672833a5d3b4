"""Tests for formkit.representation.class_polynomials against classical values, sympy and brute force."""

import math

import mpmath
import pytest
import sympy
from _foundation_strategies import brute_reduced_definite
from hypothesis import given
from hypothesis import strategies as st
from sympy.polys.domains import ZZ
from sympy.polys.galoistools import gf_factor_sqf, gf_from_int_poly, gf_gcd, gf_pow_mod, gf_sub

from formkit import errors
from formkit.analytic.j_function import j_invariant
from formkit.core.forms import Form
from formkit.core.polynomials_mod_p import is_squarefree_mod_prime, root_count_mod_prime
from formkit.representation.class_polynomials import class_polynomial, class_polynomial_bound

# j-invariants of the thirteen imaginary quadratic orders of class number one
# (classical, from memory: Cox, Primes of the Form x² + ny², §12; -163: j = -640320³).
CLASS_NUMBER_ONE_J = {
    -3: 0,
    -4: 1728,
    -7: -3375,
    -8: 8000,
    -11: -32768,
    -12: 54000,
    -16: 287496,
    -19: -884736,
    -27: -12288000,
    -28: 16581375,
    -43: -884736000,
    -67: -147197952000,
    -163: -262537412640768000,
}

# Class polynomials printed in Cox, §13 (from memory).
COX_POLYNOMIALS = {
    -15: (1, 191025, -121287375),
    -20: (1, -1264000, -681472000),
    -23: (1, 3491750, -5151296875, 12771880859375),
}


def _brute_reduced_count(D):
    """Count primitive reduced forms of discriminant D < 0 by a plain double loop."""
    return len(brute_reduced_definite(D, primitive=True))


def _represented_brute(form, n):
    """Does the positive definite form represent n? (exhaustive search over a box)."""
    a, b, c = form
    D = b * b - 4 * a * c
    ymax = math.isqrt(4 * a * n // -D) + 1
    for y in range(-ymax, ymax + 1):
        # a x² + b y x + (c y² − n) = 0
        disc = b * b * y * y - 4 * a * (c * y * y - n)
        if disc < 0:
            continue
        s = math.isqrt(disc)
        if s * s == disc:
            for num in (-b * y + s, -b * y - s):
                if num % (2 * a) == 0:
                    return True
    return False


def _sympy_root_count(coeffs, p):
    """deg gcd(f, x^p − x) over GF(p), with sympy's galoistools (independent reference)."""
    f = gf_from_int_poly(list(coeffs), p)
    xp = gf_pow_mod([1, 0], p, f, p, ZZ)
    g = gf_gcd(f, gf_sub(xp, [1, 0], p, ZZ), p, ZZ)
    return len(g) - 1


@pytest.mark.parametrize("D,j", sorted(CLASS_NUMBER_ONE_J.items()))
def test_class_number_one_j_values(D, j):
    H = class_polynomial(D)
    assert H.coefficients == (1, -j)
    assert H.degree == 1
    # the same value straight from j at the root of the principal form
    value = j_invariant(Form.principal(D), digits=40)
    assert abs(value - j) < mpmath.mpf(10) ** -20 * max(1, abs(j))


@pytest.mark.parametrize("D,coeffs", sorted(COX_POLYNOMIALS.items()))
def test_cox_polynomials(D, coeffs):
    H = class_polynomial(D)
    assert H.coefficients == coeffs
    assert H.kind == "Hilbert"


@pytest.mark.parametrize("D,coeffs", sorted(COX_POLYNOMIALS.items()))
def test_cox_polynomials_by_root_criterion(D, coeffs):
    # Independent of the j computation: for odd p ∤ D·disc(H) the published polynomial
    # has a root mod p exactly when x² + bxy + cy² (principal) represents p
    # (Cox Thm 9.2 / 9.4); representation by brute force, roots by sympy.
    principal = Form.principal(D).coefficients
    disc = int(sympy.discriminant(sympy.Poly(coeffs, sympy.Symbol("x"))))
    checked = hits = 0
    for p in sympy.primerange(3, 1500):
        if D % p == 0 or disc % p == 0 or sympy.jacobi_symbol(D % p, p) != 1:
            continue
        has_root = _sympy_root_count(coeffs, p) > 0
        assert has_root == _represented_brute(principal, p), p
        checked += 1
        hits += has_root
    assert checked > 50 and hits > 5


@pytest.mark.parametrize("D", [-56, -71, -84, -95, -104, -108, -4 * 27, -4 * 65, -23 * 9, -399])
def test_root_count_matches_prime_form_class(D):
    # For split p ∤ disc(H): H splits mod p into factors of degree = order of the class of
    # the prime ideal above p (Cox §9, Artin reciprocity for the ring class field);
    # factor degrees from sympy, class orders from the class group module.
    from formkit.classgroups.dispatch import class_group

    H = class_polynomial(D)
    G = class_group(D)
    assert H.degree == G.order == _brute_reduced_count(D)
    n = 0
    for p in sympy.primerange(3, 400):
        if D % p == 0 or sympy.jacobi_symbol(D % p, p) != 1:
            continue
        if not is_squarefree_mod_prime(H.coefficients, p):
            continue
        f = gf_from_int_poly(list(H.coefficients), p)
        _, factors = gf_factor_sqf(f, p, ZZ)
        degrees = {len(g) - 1 for g in factors}
        assert degrees == {G.prime_form(p).order}, p
        assert root_count_mod_prime(H.coefficients, p) == (H.degree if degrees == {1} else 0)
        n += 1
    assert n >= 10


@pytest.mark.parametrize("D", [-15, -20, -23, -56, -71, -108, -255, -399, -4 * 30])
def test_irreducible_with_class_number_degree(D):
    # H_D is irreducible over Q of degree h(D) (Cox Thm 11.1 / 13.2, as recalled); sympy factors.
    H = class_polynomial(D)
    assert H.degree == _brute_reduced_count(D)
    x = sympy.Symbol("x")
    poly = sympy.Poly(list(H.coefficients), x)
    assert poly.is_irreducible


def test_published_class_numbers_give_degrees():
    # class numbers from memory (Cox §2 tables; Gauss's lists)
    known = {-23: 3, -47: 5, -71: 7, -56: 4, -84: 4, -199: 9, -4 * 14: 4, -4 * 17: 4}
    for D, h in known.items():
        assert class_polynomial(D).degree == h


def test_ring_class_polynomials_of_orders():
    # Orders of conductor > 1: D = −12, −16, −27, −28 (class number one, values above), and
    # D = −36 (conductor 3 over Q(i), h = 2; no published value recalled): checked by the
    # root criterion (Cox Thm 9.4, as recalled) against brute-force representation by x² + 9y².
    for D in (-12, -16, -27, -28):
        assert class_polynomial(D).kind == "ring"
    H = class_polynomial(-36)
    assert H.kind == "ring" and H.degree == 2
    for p in sympy.primerange(5, 800):
        if sympy.jacobi_symbol(-36 % p, p) != 1 or not is_squarefree_mod_prime(H.coefficients, p):
            continue
        assert (root_count_mod_prime(H.coefficients, p) > 0) == _represented_brute((1, 0, 9), p)


def test_verification_record():
    H = class_polynomial(-455)  # h = 20
    v = H.verification
    assert H.degree == 20
    assert v.precision_bits >= H.working_digits  # bits ≥ digits
    assert v.radius_log2 <= -10  # every coefficient ball far narrower than 1/2
    assert len(v.primes_checked) >= 6 and len(v.principal_primes) >= 1
    for p in v.principal_primes:
        assert _represented_brute(Form.principal(-455).coefficients, p)
    # the stated coefficient bound holds, and the unverified computation agrees
    assert max(len(str(abs(c))) for c in H.coefficients) <= v.bound_digits + 1
    assert class_polynomial(-455, verify=False).coefficients == H.coefficients


@pytest.mark.parametrize("D", [-15, -23, -47, -104, -455, -1003])
def test_bound_dominates_coefficients(D):
    H = class_polynomial(D)
    biggest = max(abs(c) for c in H.coefficients)
    assert math.log10(biggest) <= class_polynomial_bound(D)


@given(
    coeffs=st.lists(st.integers(min_value=-(10**6), max_value=10**6), min_size=1, max_size=12),
    p=st.sampled_from([2, 3, 5, 7, 101, 1009, 10007, 65537, 1000003]),
)
def test_root_count_against_sympy(coeffs, p):
    coeffs = [1] + coeffs
    assert root_count_mod_prime(coeffs, p) == _sympy_root_count(coeffs, p)


@given(
    coeffs=st.lists(st.integers(min_value=-50, max_value=50), min_size=1, max_size=8),
    p=st.sampled_from([2, 3, 5, 7, 11, 13]),
)
def test_squarefree_against_sympy(coeffs, p):
    coeffs = [1] + coeffs
    x = sympy.Symbol("x")
    poly = sympy.Poly(coeffs, x, modulus=p)
    expected = poly.degree() <= 0 or poly.gcd(poly.diff(x)).degree() == 0
    assert is_squarefree_mod_prime(coeffs, p) == expected


def test_text_and_dict():
    H = class_polynomial(-23)
    assert str(H) == "x^3 + 3491750x^2 - 5151296875x + 12771880859375"
    assert H._repr_latex_().startswith("$H_{-23}(x) = x^{3}")
    d = H.to_dict()
    assert d["coefficients"] == list(COX_POLYNOMIALS[-23]) and d["degree"] == 3
    assert H(0) == COX_POLYNOMIALS[-23][-1]
    assert "ClassPolynomial(D=-23" in repr(H)


@pytest.mark.parametrize(
    "bad,exc",
    [
        (5, errors.DiscriminantError),
        (-22, errors.DiscriminantError),
        (-4 * 4 + 16, errors.DiscriminantError),
        ("x", errors.NotAnIntegerError),
        (-23.0, errors.NotAnIntegerError),
        (True, errors.NotAnIntegerError),
    ],
)
def test_bad_discriminants(bad, exc):
    with pytest.raises(exc):
        class_polynomial(bad)
    with pytest.raises(exc):
        class_polynomial_bound(bad)


def test_bad_polynomial_arguments():
    with pytest.raises(errors.NotPrimeError, match="prime"):
        root_count_mod_prime([1, 0, 1], 4)
    with pytest.raises(errors.FormError, match="monic"):
        root_count_mod_prime([2, 0, 1], 5)
    with pytest.raises(errors.NotPrimeError):
        is_squarefree_mod_prime([1, 0, 1], 1)
    with pytest.raises(errors.NotAnIntegerError):
        root_count_mod_prime([1, 0.5], 5)


@pytest.mark.slow
@pytest.mark.parametrize("D", [-1799, -7991])
def test_large_class_numbers_verify(D):
    # h = 50 and h = 100: full verification (second computation, residuals, root counts)
    H = class_polynomial(D)
    assert H.degree == _brute_reduced_count(D)
    assert H.verification.radius_log2 <= -10


# ---------------------------------------------------------------------------
# disc(H_D)


@pytest.mark.parametrize("D", [-23, -56, -71, -84, -3 * 49, -4 * 105])
def test_discriminant_primes_are_the_repeated_root_primes(D):
    # algebra (common practice): for monic H, p | disc(H) iff H mod p has a repeated root,
    # i.e. gcd(H, H') mod p is not constant — checked with sympy's polynomials over GF(p)
    import sympy

    from formkit.representation.class_polynomials import class_polynomial, class_polynomial_discriminant

    d = class_polynomial_discriminant(D)
    assert d.complete
    x = sympy.Symbol("x")
    H = class_polynomial(D).coefficients
    for p in sympy.primerange(2, 600):
        f = sympy.Poly(H, x, modulus=p)
        repeated = sympy.gcd(f, f.diff(x)).degree() > 0
        assert repeated == (d.value % p == 0), (D, p)


@pytest.mark.parametrize("D", [-23, -56, -31])
def test_discriminant_against_numerical_roots(D):
    # independent: ∏_{i<j} (r_i − r_j)² over the complex roots (mpmath.polyroots, 60 digits)
    import mpmath

    from formkit.representation.class_polynomials import class_polynomial, class_polynomial_discriminant

    H = class_polynomial(D).coefficients
    with mpmath.workdps(120):
        roots = mpmath.polyroots([mpmath.mpf(c) for c in H], maxsteps=400, extraprec=400)
        prod = mpmath.mpf(1)
        for i in range(len(roots)):
            for j in range(i + 1, len(roots)):
                prod *= (roots[i] - roots[j]) ** 2
        exact = class_polynomial_discriminant(D).value
        assert abs(prod.imag) < abs(exact) * mpmath.mpf(10) ** -30
        assert abs(prod.real - exact) < abs(exact) * mpmath.mpf(10) ** -30


def test_discriminant_partial_factorisation_and_bad_bound():
    from formkit.errors import FormkitError
    from formkit.representation.class_polynomials import class_polynomial_discriminant

    full = class_polynomial_discriminant(-56)
    part = class_polynomial_discriminant(-56, trial_bound=7)
    assert part.value == full.value and not part.complete
    prod = part.cofactor
    for p, e in part.factors:
        prod *= p**e
    assert prod == abs(full.value) and all(p <= 7 for p in part.primes)
    with pytest.raises(FormkitError, match="trial_bound"):
        class_polynomial_discriminant(-56, trial_bound=1)
    with pytest.raises(FormkitError, match="trial_bound"):
        class_polynomial_discriminant(-56, trial_bound=10**10)
