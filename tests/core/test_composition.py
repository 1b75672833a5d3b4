"""Tests for formkit.core.composition: Dirichlet composition, NUCOMP/NUDUPL, square, power, inverse.

The reference for the group law is tests/_classgroup_reference.py: composition through
**multiplication of ideals** in the quadratic order (Cox, *Primes of the Form x² + ny²*,
Theorem 7.7, from memory) with a Hermite normal form of the product lattice — a different
algorithm from both methods under test — and canonical class labels from a reduction
written out from the definition.  It runs on integers of any size, so it also checks
composition at |D| ≈ 10^40.
"""

from __future__ import annotations

import math
import random

import pytest
import sympy
from _classgroup_reference import (
    brute_reduced_definite,
    class_key,
    class_product,
    ideal_compose,
    indefinite_cycles,
    is_reduced_indefinite,
    reduce_definite,
)
from _foundation_strategies import act, sl2_matrices
from hypothesis import given
from hypothesis import strategies as st

from formkit import (
    COMPOSITION_METHODS,
    DiscriminantError,
    DiscriminantMismatchError,
    Form,
    FormError,
    FormkitError,
    NotAnIntegerError,
    NotPrimitiveError,
    ParseError,
    compose,
    inverse,
    is_reduced,
    power,
    square,
)


def discriminants(lo: int, hi: int) -> list[int]:
    return [D for D in range(lo, hi + 1) if D % 4 in (0, 1) and not (D >= 0 and math.isqrt(D) ** 2 == D)]


def principal(D: int) -> tuple[int, int, int]:
    return (1, D % 2, (D % 2 - D) // 4)


def is_reduced_definite(f) -> bool:
    a, b, c = f
    return -a < b <= a <= c and not (a == c and b < 0)


# ---------------------------------------------------------------------------
# exhaustive agreement with ideal multiplication on small discriminants


def test_compose_all_pairs_negative_against_ideal_product():
    # source: ideal multiplication (Cox Thm 7.7) — every ordered pair of classes for
    # every D in [−260, −3]; both methods; results reduced.  Includes non-fundamental D,
    # self-composition and leading coefficients sharing factors with each other and with D.
    for D in discriminants(-260, -3):
        reps = brute_reduced_definite(D)
        for F in reps:
            for G in reps:
                ref = class_product(F, G, D)
                for method in COMPOSITION_METHODS:
                    H = compose(F, G, method=method)
                    assert H.discriminant == D
                    assert is_reduced_definite(H.coefficients), (D, F, G, method, H)
                    assert H.coefficients == ref, (D, F, G, method, H)


def test_compose_all_pairs_positive_against_ideal_product():
    # source: ideal multiplication on narrow classes; every pair of reduced forms of D ≤ 100
    for D in discriminants(5, 100):
        forms = sorted(indefinite_cycles(D))
        for F in forms:
            for G in forms:
                H = compose(F, G)
                assert H.discriminant == D
                assert is_reduced_indefinite(H.a, H.b, D), (D, F, G, H)
                assert class_key(H.coefficients, D) == class_product(F, G, D), (D, F, G, H)


@pytest.mark.slow
def test_compose_all_pairs_wide_range():
    # source: ideal multiplication, larger ranges
    for D in discriminants(-1000, -3):
        reps = brute_reduced_definite(D)
        for F in reps:
            for G in reps:
                ref = class_product(F, G, D)
                for method in COMPOSITION_METHODS:
                    assert compose(F, G, method=method).coefficients == ref, (D, F, G, method)
    for D in discriminants(5, 400):
        forms = sorted(indefinite_cycles(D))
        for F in forms:
            for G in forms:
                assert class_key(compose(F, G).coefficients, D) == class_product(F, G, D), (D, F, G)


def _equivalent_forms_with_values(F, D, count, rng):
    """Forms properly equivalent to F with leading coefficient F(x, y) for small coprime (x, y)."""
    out = []
    for _ in range(200):
        x, y = rng.randint(-6, 6), rng.randint(-6, 6)
        if math.gcd(x, y) != 1:
            continue
        # (x, y) extends to [[x, −v], [y, u]] with x·u + y·v = 1
        u, v, g = sympy.gcdex(x, y)
        assert g == 1
        M = ((x, -int(v)), (y, int(u)))
        G = act(F, M)
        if D < 0 and G[0] < 0:
            continue
        out.append(G)
        if len(out) >= count:
            break
    return out


def test_compose_leading_coefficients_not_coprime():
    # source: ideal multiplication.  Forms are moved to equivalent ones whose leading
    # coefficients share factors (with each other and with D); the composite class must
    # not depend on the representatives.
    rng = random.Random(1234)
    tested = 0
    for D in [-20, -56, -84, -96, -180, -231, -420, -3 * 49, -8 * 9, 40, 136, 4 * 79, 12 * 25]:
        reps = brute_reduced_definite(D) if D < 0 else sorted(indefinite_cycles(D))
        for F in reps[:6]:
            for G in reps[:6]:
                ref = class_product(F, G, D)
                for F2 in _equivalent_forms_with_values(F, D, 3, rng):
                    for G2 in _equivalent_forms_with_values(G, D, 3, rng):
                        if math.gcd(F2[0], G2[0]) == 1 and math.gcd(F2[0], D) == 1:
                            continue
                        tested += 1
                        methods = COMPOSITION_METHODS if D < 0 else ("dirichlet",)
                        for method in methods:
                            H = compose(F2, G2, method=method)
                            assert class_key(H.coefficients, D) == ref, (D, F2, G2, method)
    assert tested > 150


def test_compose_with_itself_and_with_inverse():
    # source: ideal multiplication (F·F) and the group law (F·F⁻¹ = principal)
    for D in discriminants(-300, -3) + discriminants(5, 150):
        reps = brute_reduced_definite(D) if D < 0 else sorted(indefinite_cycles(D))
        one = class_key(principal(D), D)
        for F in reps:
            assert class_key(square(F).coefficients, D) == class_product(F, F, D)
            assert class_key(compose(F, inverse(F)).coefficients, D) == one
            assert class_key(inverse(F).coefficients, D) == class_key((F[0], -F[1], F[2]), D)


# ---------------------------------------------------------------------------
# random large discriminants: NUCOMP = Dirichlet = ideal product


@st.composite
def large_negative_discriminant_with_forms(draw, max_digits=40):
    """D < 0 with |D| up to 10^max_digits and primitive forms (p, b, ·), p prime, χ_D(p) = 1."""
    digits = draw(st.integers(4, max_digits))
    n = draw(st.integers(10 ** (digits - 1), 10**digits))
    D = -n
    while D % 4 not in (0, 1):
        D -= 1
    seed = draw(st.integers(0, 2**32))
    rng = random.Random(seed)
    forms = []
    root = math.isqrt(-D)
    while len(forms) < 3:
        size = rng.choice([10, 1000, root // 7 + 11, root * 5 + 3, rng.randrange(3, 10 * root + 4)])
        p = sympy.nextprime(rng.randrange(2, size + 3))
        if p == 2 or sympy.jacobi_symbol(D % p, p) != 1:
            continue
        r = sympy.sqrt_mod(D, p)  # reference library for the square root
        b = r if (r - D) % 2 == 0 else p - r
        forms.append((p, b, (b * b - D) // (4 * p)))
    return D, forms


@given(large_negative_discriminant_with_forms(), sl2_matrices(max_factors=4, max_shift=5))
def test_nucomp_equals_dirichlet_on_large_discriminants(data, M):
    # source: ideal multiplication as the reference; NUCOMP, Dirichlet and the reference
    # agree on reduced results for |D| up to 10^40, on reduced and non-reduced inputs.
    D, (F, G, K) = data
    G2 = act(G, M)  # a non-reduced representative of G's class
    if G2[0] < 0:
        G2 = G
    for X, Y in ((F, G), (F, G2), (F, F), (G2, G2), (F, K)):
        ref = reduce_definite(ideal_compose(X, Y, D))
        d = compose(X, Y, method="dirichlet")
        n = compose(X, Y, method="nucomp")
        assert d.coefficients == ref, (D, X, Y)
        assert n.coefficients == ref, (D, X, Y)
    assert square(F).coefficients == reduce_definite(ideal_compose(F, F, D))
    assert square(F, method="dirichlet") == square(F, method="nucomp")


@given(
    large_negative_discriminant_with_forms(max_digits=60),
    st.integers(-(10**30), 10**30),
    st.integers(-(10**6), 10**6),
)
def test_power_laws_on_large_discriminants(data, j, k):
    # source: the group law — F^(j+k) = F^j·F^k, F^(jk) = (F^j)^k, F^(−k) = (F^k)^(−1),
    # F^1 = reduced F, F^0 = principal; both powering methods agree
    D, (F, _G, _K) = data
    Fj, Fk = power(F, j), power(F, k)
    assert power(F, j + k) == compose(Fj, Fk) == compose(Fj, Fk, method="nucomp")
    assert power(F, j * k) == power(Fj, k)
    assert power(F, -k) == inverse(Fk)
    assert power(F, j, method="dirichlet") == Fj
    assert power(F, 1).coefficients == reduce_definite(F)
    assert power(F, 0) == Form(*principal(D))
    assert power(F, 2) == square(F)


def test_power_against_repeated_ideal_products():
    # source: ideal multiplication, F^k by repeated products for −25 ≤ k ≤ 25
    rng = random.Random(7)
    for D in rng.sample(discriminants(-5000, -3), 25) + rng.sample(discriminants(5, 800), 15):
        reps = brute_reduced_definite(D) if D < 0 else sorted(indefinite_cycles(D))
        F = rng.choice(reps)
        Finv = (F[0], -F[1], F[2])
        x = principal(D)
        y = principal(D)
        assert class_key(power(F, 0).coefficients, D) == class_key(x, D)
        for k in range(1, 26):
            x = ideal_compose(x, F, D)
            y = ideal_compose(y, Finv, D)
            assert class_key(power(F, k).coefficients, D) == class_key(x, D), (D, F, k)
            assert class_key(power(F, -k).coefficients, D) == class_key(y, D), (D, F, -k)


def test_power_huge_exponent_reduces_modulo_the_order():
    # the class of (2, 1, 3) has order 3 in Cl(−23) (from memory: h(−23) = 3)
    k = 3 * 10**200 + 1
    assert power((2, 1, 3), k) == power((2, 1, 3), k % 3) == Form(2, 1, 3)
    assert power((2, 1, 3), -k) == Form(2, -1, 3)
    # Cl(4·79) is cyclic of order 6 (narrow; see test_classgroup); F^6 is principal
    F = (3, 14, -10)
    one = class_key(principal(316), 316)
    assert class_key(power(F, 6 * 10**50).coefficients, 316) == one
    assert class_key(power(F, -(6 * 10**50 + 1)).coefficients, 316) == class_key(inverse(F).coefficients, 316)


def test_results_are_reduced_for_nonreduced_inputs():
    rng = random.Random(3)
    for _ in range(200):
        D = rng.choice(discriminants(-3000, -3))
        reps = brute_reduced_definite(D)
        F, G = rng.choice(reps), rng.choice(reps)
        F2 = (F[0], F[1] + 2 * F[0] * 7, F[0] * 49 + F[1] * 7 + F[2])  # F·[[1,7],[0,1]]
        for method in COMPOSITION_METHODS:
            H = compose(F2, G, method=method)
            assert is_reduced(H) and H.coefficients == class_product(F, G, D)


# ---------------------------------------------------------------------------
# doc examples checked by hand and bad input


def test_small_examples_by_hand():
    # (2, 1, 3) generates Cl(−23) ≅ C3 (from memory): squares to (2, −1, 3), cubes to 1
    assert compose((2, 1, 3), (2, 1, 3)) == Form(2, -1, 3)
    assert compose((2, 1, 3), (2, -1, 3)) == Form(1, 1, 6)
    assert power((2, 1, 3), 3) == Form(1, 1, 6)
    # accepts text and Form objects
    assert compose("2x^2+xy+3y^2", Form(2, 1, 3)) == Form(2, -1, 3)


@pytest.mark.parametrize("method", COMPOSITION_METHODS)
def test_compose_bad_input(method):
    with pytest.raises(DiscriminantMismatchError, match="-23"):
        compose((2, 1, 3), (1, 1, 1), method=method)
    with pytest.raises(NotPrimitiveError, match="content 2"):
        compose((2, 2, 6), (2, 2, 6), method=method)
    with pytest.raises(FormError, match="negative definite"):
        compose((-2, 1, -3), (-2, 1, -3), method=method)
    with pytest.raises(DiscriminantError, match="square"):
        compose((1, 2, 1), (1, 2, 1), method=method)
    with pytest.raises(ParseError):
        compose("x", (2, 1, 3), method=method)


def test_method_errors():
    with pytest.raises(FormError, match="gauss"):
        compose((2, 1, 3), (2, 1, 3), method="gauss")
    with pytest.raises(FormError, match="definite"):
        compose((1, 1, -3), (1, 1, -3), method="nucomp")  # NUCOMP is for D < 0
    with pytest.raises(FormError, match="foo"):
        square((2, 1, 3), method="foo")
    with pytest.raises(FormError, match="'x'"):
        power((2, 1, 3), 3, method="x")


def test_power_and_inverse_bad_input():
    for k in (2.5, "3", None):
        with pytest.raises(NotAnIntegerError):
            power((2, 1, 3), k)
    with pytest.raises(NotPrimitiveError):
        inverse((2, 2, 6))
    with pytest.raises(NotPrimitiveError):
        power((2, 2, 6), 2)
    with pytest.raises(FormError):
        power((-2, 1, -3), 2)
    with pytest.raises(FormkitError):
        square((1, 2, 1))


# Issue 15, one representative per class: compose/power return the form that the class
# list (class_representatives, i.e. `formkit group`) holds.  Reference: brute force —
# the result must be properly equivalent to the unreduced Dirichlet composite and be one
# of the enumerated representatives (Buchmann–Vollmer §6.3: one cycle per proper class).
@pytest.mark.parametrize("D", [5, 12, 316, 148, 229, 4 * 82, 8 * 17 * 3, -56, -4620])
def test_compose_and_power_return_the_listed_representative(D):
    from formkit.core.composition import _compose_raw
    from formkit.core.enumeration import class_representatives
    from formkit.core.equivalence import are_properly_equivalent
    from formkit.core.reduction import class_representative

    reps = class_representatives(D)
    listed = set(reps)
    for F in reps[:6]:
        assert class_representative(F) == F
        for G in reps[:6]:
            H = compose(F, G)
            assert H in listed
            raw = Form(*(int(v) for v in _compose_raw(F.a, F.b, F.c, G.a, G.b, G.c, D)))
            assert are_properly_equivalent(H, raw)
        for k in (-3, 0, 2, 5):
            assert power(F, k) in listed
