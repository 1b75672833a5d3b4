"""Tests of formkit.representation.representations against classical theorems, sympy and brute force.

Sources named beside each check: Jacobi's two-square theorem r(n) = 4(d₁(n) − d₃(n));
the rule that n is a sum of two squares iff every prime ≡ 3 (mod 4) divides it to an
even power (common knowledge of the trade); Dirichlet's formula
Σ_Q r_Q(n) = w·Σ_{d|n} χ_D(d) (Dirichlet, Vorlesungen §§ 88–90; Zagier, Zetafunktionen
§8 — from memory); sympy's ``diophantine`` as a general-purpose reference; brute force;
hypothesis properties.  Indefinite forms: tests/test_orbits.py.
"""

from __future__ import annotations

from math import gcd, isqrt

import pytest
import sympy
from hypothesis import given
from hypothesis import strategies as st

from formkit.core.arith import kronecker
from formkit.core.discriminants import conductor, is_discriminant, is_fundamental_discriminant, unit_count
from formkit.core.enumeration import class_representatives
from formkit.core.forms import Form
from formkit.errors import DiscriminantError, FormError, FormkitError, NotAnIntegerError, ParseError
from formkit.representation.representations import (
    dirichlet_count,
    primitive_representation_count,
    represent,
    representation_count,
    representations,
    total_representation_count,
)

# ---------------------------------------------------------------------------
# brute force


def brute_definite(f, n):
    """All (x, y) with f(x, y) = n for positive definite f, by scanning the ellipse's box."""
    a, _b, c = f.a, f.b, f.c
    D = -f.discriminant
    if n < 0:
        return []
    ym = isqrt(4 * a * n // D) + 1
    xm = isqrt(4 * c * n // D) + 1
    return sorted((x, y) for x in range(-xm, xm + 1) for y in range(-ym, ym + 1) if f(x, y) == n)


def jacobi(n):
    # Jacobi's two-square theorem: r₂(n) = 4(d₁(n) − d₃(n)).
    d1 = sum(1 for d in range(1, n + 1) if n % d == 0 and d % 4 == 1)
    d3 = sum(1 for d in range(1, n + 1) if n % d == 0 and d % 4 == 3)
    return 4 * (d1 - d3)


NEG = [d for d in range(-3, -120, -1) if is_discriminant(d)]


# ---------------------------------------------------------------------------
# definite forms


@pytest.mark.parametrize("D", NEG)
def test_all_solutions_equal_brute_force(D):
    for f in class_representatives(D):
        for n in range(45):
            got = representations(f, n)
            assert list(got) == brute_definite(f, n), (f, n)
            assert representation_count(f, n) == len(got)
            assert primitive_representation_count(f, n) == sum(1 for x, y in got if gcd(x, y) == 1)


def test_non_reduced_and_transformed_forms():
    # the method must not depend on the form being reduced: compare with brute force
    for f in [Form(10, 37, 35), Form(7, 12, 6), Form(3, -10, 9), Form(29, 42, 16)]:
        for n in range(1, 60):
            assert list(representations(f, n)) == brute_definite(f, n), (f, n)


@pytest.mark.parametrize("n", range(1, 400))
def test_jacobi_two_squares(n):
    # Source: Jacobi's two-square theorem.
    assert representation_count((1, 0, 1), n) == jacobi(n)


def test_sum_of_two_squares_rule():
    # Source: n is a sum of two squares iff every prime ≡ 3 (mod 4) divides n to an even power.
    for n in range(1, 1500):
        rule = all(e % 2 == 0 for p, e in sympy.factorint(n).items() if p % 4 == 3)
        assert (representation_count((1, 0, 1), n) > 0) == rule, n


def test_jacobi_for_large_n():
    # 60-digit n built from known primes ≡ 1 (mod 4) and ≡ 3 (mod 4): Jacobi's formula is
    # 4·Π(e+1) over p ≡ 1 (4), times 0/1 by the parity of the exponents of p ≡ 3 (4).
    primes = {1000000000000000000000000000057: 1, 1000000009: 2, 5: 3, 13: 2, 3: 2}
    n = 1
    for p, e in primes.items():
        n *= p**e
    assert all(sympy.isprime(p) for p in primes)
    expect = 4
    for p, e in primes.items():
        if p % 4 == 1:
            expect *= e + 1
        elif e % 2:
            expect = 0
    assert n > 10**50
    sols = representations((1, 0, 1), n, factors=primes)
    assert len(sols) == expect == representation_count((1, 0, 1), n, factors=primes)
    assert all(x * x + y * y == n for x, y in sols)


def test_dirichlet_formula_fundamental_all_n():
    # Dirichlet: for fundamental D < 0, Σ_Q r_Q(n) = w Σ_{d|n} χ_D(d) for every n ≥ 1
    # (n sharing factors with D included).
    for D in [d for d in NEG if is_fundamental_discriminant(d)]:
        forms = class_representatives(D)
        for n in range(1, 80):
            total = sum(representation_count(f, n) for f in forms)
            assert total == unit_count(D) * sum(kronecker(D, d) for d in range(1, n + 1) if n % d == 0)
            assert total == dirichlet_count(D, n) == total_representation_count(D, n)


def test_dirichlet_formula_non_fundamental():
    # For non-fundamental D the formula holds for n prime to the conductor f; for other n
    # the count by roots b (total_representation_count) is the right statement.
    for D in [d for d in NEG if not is_fundamental_discriminant(d)]:
        forms = class_representatives(D)
        f = conductor(D)
        for n in range(1, 80):
            total = sum(representation_count(g, n) for g in forms)
            assert total == total_representation_count(D, n), (D, n)
            if gcd(n, f) == 1:
                assert total == dirichlet_count(D, n), (D, n)
            else:
                with pytest.raises(DiscriminantError, match="conductor"):
                    dirichlet_count(D, n)
    # the formula really fails there: D = −36, n = 9
    forms = class_representatives(-36)
    assert sum(representation_count(g, 9) for g in forms) != 2 * sum(kronecker(-36, d) for d in (1, 3, 9))


@given(
    st.integers(min_value=1, max_value=40),
    st.integers(min_value=-40, max_value=40),
    st.integers(min_value=1, max_value=60),
    st.lists(st.sampled_from([2, 3, 5, 7, 11, 13, 17, 29, 41, 97, 101, 10007]), max_size=6),
)
def test_properties_random_forms(a, b, c, plist):
    # hypothesis: Q(x, y) = n for every returned pair; counts equal list lengths.
    f = Form(a, b, c)
    if f.discriminant >= 0:
        return
    n = 1
    for p in plist:
        n *= p
    res = represent(f, n)
    assert all(f(x, y) == n for x, y in res.solutions)
    assert res.count == len(res.solutions) == len(set(res.solutions)) == representation_count(f, n)
    assert res.primitive_count == sum(1 for x, y in res.solutions if gcd(x, y) == 1)
    if n < 3000:
        assert list(res.solutions) == brute_definite(f, n)


def test_sympy_diophantine_reference():
    # sympy's general Diophantine solver on sample equations Q(x, y) = n
    x, y = sympy.symbols("x y", integer=True)
    samples = [
        ((1, 0, 5), 29),
        ((1, 0, 1), 325),
        ((2, 1, 3), 6),
        ((1, 1, 1), 49),
        ((3, 2, 7), 1155),
        ((1, 0, 2), 2 * 3 * 11 * 17),
        ((5, 4, 7), 31 * 43),
        ((1, 0, 1), 3),
        ((4, 4, 5), 4 * 13),
    ]
    for (a, b, c), n in samples:
        ref = sympy.diophantine(a * x**2 + b * x * y + c * y**2 - n, syms=(x, y))
        ref = sorted((int(u), int(v)) for u, v in ref)
        assert list(representations((a, b, c), n)) == ref, ((a, b, c), n)


def test_zero_negative_and_sign_conventions():
    assert representations((1, 0, 1), 0) == ((0, 0),)
    assert representation_count((1, 0, 1), 0) == 1
    assert primitive_representation_count((1, 0, 1), 0) == 0
    assert representations((1, 0, 1), -5) == ()
    assert representation_count((2, 1, 3), -(10**30)) == 0
    # negative definite: Q(x, y) = n iff (−Q)(x, y) = −n
    assert representations((-1, 0, -1), -25) == representations((1, 0, 1), 25)
    assert representations((-1, 0, -1), 25) == ()
    assert representation_count((-2, -1, -3), -6) == 2


def test_non_primitive_forms_by_content():
    # content k: Q represents n iff k | n and Q/k represents n/k; compared with brute force
    f = Form(6, 0, 6)
    for n in range(120):
        assert list(representations(f, n)) == brute_definite(f, n)
    assert representation_count((2, 2, 2), 7) == 0
    assert representation_count((3, 3, 3), 21) == representation_count((1, 1, 1), 7) == 12


def test_primitive_and_limit_options():
    r = represent((1, 0, 1), 5**4 * 13, primitive=True, limit=3)
    assert r.primitive_only and r.truncated and len(r.solutions) == 3
    assert r.count == jacobi(5**4 * 13) and all(gcd(x, y) == 1 for x, y in r.solutions)
    full = represent((1, 0, 1), 5**4 * 13, primitive=True)
    assert len(full.solutions) == full.primitive_count and not full.truncated
    assert set(r.solutions) <= set(full.solutions)
    d = full.to_dict()
    assert d["form"] == [1, 0, 1] and d["count"] == r.count and len(d["solutions"]) == d["primitive_count"]


def test_given_factorisation_is_checked():
    with pytest.raises(FormkitError, match="multiply to"):
        representations((1, 0, 1), 65, factors={5: 1, 11: 1})
    with pytest.raises(FormkitError, match="not prime"):
        representations((1, 0, 1), 65, factors={65: 1})
    assert representations((1, 0, 1), 65, factors={5: 1, 13: 1}) == representations((1, 0, 1), 65)
    # with a non-primitive form the factorisation of n is adjusted by the content
    assert representations((3, 0, 3), 3 * 65, factors={3: 1, 5: 1, 13: 1}) == representations((1, 0, 1), 65)


def test_class_sum_for_large_n_and_large_discriminant():
    # D = −100003 (h = 39): for a 40-digit n with known factorisation, Σ over all 39
    # classes of r_Q(n) equals Dirichlet's w·Σ_{d|n} χ_D(d) (D fundamental).
    D = -100003
    primes = [p for p in sympy.primerange(10**9, 10**9 + 2000) if kronecker(D, p) == 1][:4]
    fac = dict.fromkeys(primes, 1)
    fac[3] = 2 if kronecker(D, 3) == 1 else 0
    n = 1
    for p, e in fac.items():
        n *= p**e
    fac = {p: e for p, e in fac.items() if e}
    forms = class_representatives(D)
    assert len(forms) == 39 and len(str(n)) >= 36
    total = sum(representation_count(f, n, factors=fac) for f in forms)
    assert total == dirichlet_count(D, n) == total_representation_count(D, n, factors=fac)
    assert total > 0
    for f in forms[:6]:
        sols = representations(f, n, factors=fac)
        assert all(f(x, y) == n for x, y in sols)


# ---------------------------------------------------------------------------
# bad input


def test_bad_input():
    with pytest.raises(DiscriminantError):
        representations((1, 2, 1), 4)
    with pytest.raises(DiscriminantError):
        represent((1, 0, -4), 4)
    with pytest.raises(NotAnIntegerError):
        representations((1, 0, 1), 2.5)
    with pytest.raises(FormError, match="indefinite"):
        representations((1, 0, -2), 7)
    with pytest.raises(FormError, match="indefinite"):
        representation_count((1, 0, -2), 7)
    with pytest.raises(FormkitError, match="limit"):
        represent((1, 0, 1), 5, limit=-1)
    with pytest.raises(FormkitError, match="n ≥ 1"):
        total_representation_count(-4, 0)
    with pytest.raises(FormkitError, match="n ≥ 1"):
        dirichlet_count(-4, -3)
    with pytest.raises(DiscriminantError):
        dirichlet_count(-5, 3)
    with pytest.raises(ParseError):
        representations("x^2 + ", 5)
