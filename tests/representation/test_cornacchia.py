"""Tests of formkit.representation.cornacchia: prime decision by reduction and by Cornacchia's algorithm.

Sources: Fermat's two-square theorem (p = x² + y² ⇔ p = 2 or p ≡ 1 mod 4); p = x² + 2y²
⇔ p = 2 or p ≡ 1, 3 (mod 8); p = x² + 3y² ⇔ p = 3 or p ≡ 1 (mod 3) (Fermat, Euler; Cox
§1); p = x² + 5y² ⇔ p ≡ 1, 9 (mod 20) (Lagrange; Cox §2); Gauss: p = x² + 27y² ⇔
p ≡ 1 (mod 3) and 2 is a cubic residue mod p (Cox Theorem 4.15 — number from memory);
x² − 2y² = p ⇔ p = 2 or p ≡ ±1 (mod 8) (classical, from memory); brute force; the
reduction test and Cornacchia cross-checked against each other.
"""

from __future__ import annotations

from math import isqrt

import pytest
import sympy
from hypothesis import given
from hypothesis import strategies as st

from formkit.core.arith import next_prime
from formkit.core.discriminants import is_discriminant
from formkit.core.enumeration import class_representatives
from formkit.core.forms import Form
from formkit.errors import DiscriminantError, FormkitError, NotAnIntegerError, NotPrimeError
from formkit.representation.cornacchia import cornacchia, cornacchia_4p, prime_representation

PRIMES = list(sympy.primerange(2, 3000))


def brute_represents(f, p):
    a, _b, c = f.a, f.b, f.c
    D = -f.discriminant
    ym = isqrt(4 * a * p // D) + 1
    xm = isqrt(4 * c * p // D) + 1
    return any(f(x, y) == p for x in range(-xm, xm + 1) for y in range(-ym, ym + 1))


def decide(form, p, **kw):
    d = prime_representation(form, p, **kw)
    if d.represented:
        assert Form(*form)(*d.solution) == p
    return d.represented


def test_fermat_two_squares():
    # Fermat: p = x² + y² iff p = 2 or p ≡ 1 (mod 4)
    for p in PRIMES:
        assert decide((1, 0, 1), p) == (p == 2 or p % 4 == 1)
        assert decide((1, 0, 1), p, method="reduction") == (p == 2 or p % 4 == 1)


def test_x2_plus_2y2_and_3y2():
    # p = x² + 2y² iff p = 2 or p ≡ 1, 3 (mod 8); p = x² + 3y² iff p = 3 or p ≡ 1 (mod 3)
    for p in PRIMES:
        assert decide((1, 0, 2), p) == (p == 2 or p % 8 in (1, 3))
        assert decide((1, 0, 3), p) == (p == 3 or p % 3 == 1)
        assert decide((1, 0, 3), p, method="reduction") == (p == 3 or p % 3 == 1)


def test_x2_plus_5y2_and_27y2():
    # Lagrange: p = x² + 5y² iff p = 5 or p ≡ 1, 9 (mod 20); Gauss: p = x² + 27y² iff p ≡ 1 (mod 3)
    # and 2 is a cubic residue modulo p.
    for p in PRIMES:
        assert decide((1, 0, 5), p) == (p == 5 or p % 20 in (1, 9))
        cubic = p % 3 == 1 and pow(2, (p - 1) // 3, p) == 1
        assert decide((1, 0, 27), p) == cubic
        assert decide((1, 0, 27), p, method="reduction") == cubic


def test_indefinite_prime_criteria():
    # x² − 2y² = p iff p = 2 or p ≡ ±1 (mod 8); x² − 3y² = p iff p ≡ 1 (mod 12),
    # −x² + 3y² = p iff p = 2, 3 or p ≡ 11 (mod 12) (narrow class number of 12 is 2).
    for p in PRIMES[:300]:
        assert decide((1, 0, -2), p) == (p == 2 or p % 8 in (1, 7))
        assert decide((1, 0, -3), p) == (p % 12 == 1)
        assert decide((-1, 0, 3), p) == (p in (2, 3) or p % 12 == 11)


@pytest.mark.parametrize("D", [d for d in range(-3, -160, -1) if is_discriminant(d)][::2])
def test_reduction_test_against_brute_force(D):
    for f in class_representatives(D):
        for p in PRIMES[:40]:
            assert decide(f, p) == brute_represents(f, p), (f, p)


def test_cornacchia_cross_check():
    # Cornacchia (Cohen Alg. 1.5.2) and the reduction test must agree, and on
    # x² + xy + ky² the modified algorithm (Cohen Alg. 1.5.3) as well.
    for n in range(1, 40):
        for p in PRIMES[:200]:
            c = cornacchia(n, p)
            r = prime_representation((1, 0, n), p, method="reduction")
            assert (c is not None) == r.represented, (n, p)
            if c:
                assert c[0] ** 2 + n * c[1] ** 2 == p
    for k in range(1, 30):
        D = 1 - 4 * k
        for p in PRIMES[:200]:
            c4 = cornacchia_4p(D, p)
            r = prime_representation((1, 1, k), p, method="reduction")
            a = prime_representation((1, 1, k), p)
            assert a.method in ("cornacchia", "character")
            assert (c4 is not None) == r.represented == a.represented, (k, p)
            if c4:
                assert c4[0] ** 2 - D * c4[1] ** 2 == 4 * p


def test_cornacchia_4p_even_discriminants():
    for D in (-4, -8, -20, -56, -84):
        for p in PRIMES[:100]:
            sol = cornacchia_4p(D, p)
            brute = any(
                x * x - D * y * y == 4 * p
                for x in range(2 * isqrt(p) + 2)
                for y in range(isqrt(4 * p // -D) + 2)
            )
            assert (sol is not None) == brute, (D, p)


@pytest.mark.parametrize("digits", [100, 300])
def test_huge_primes(digits):
    # Fermat's criterion on big primes; the solution is checked exactly.
    p = int(next_prime(10 ** (digits - 1)))
    while p % 4 != 1:
        p = int(next_prime(p))
    d = prime_representation((1, 0, 1), p)
    assert d.represented and d.solution[0] ** 2 + d.solution[1] ** 2 == p
    d2 = prime_representation((1, 0, 1), p, method="reduction")
    assert d2.represented and d2.solution[0] ** 2 + d2.solution[1] ** 2 == p
    q = int(next_prime(p))
    while q % 4 != 3:
        q = int(next_prime(q))
    assert not prime_representation((1, 0, 1), q).represented
    # a form of discriminant ≈ −10^5 (h > 1): the solution must be exact
    f = Form(13, 11, 1925)  # D = 121 − 100100 = −99979
    for r in (p, q, int(next_prime(q))):
        d = prime_representation(f, r)
        if d.represented:
            assert f(*d.solution) == r


@given(st.integers(min_value=1, max_value=200), st.integers(min_value=2, max_value=10**6))
def test_property_decision_consistent(k, m):
    p = int(next_prime(m))
    f = Form(1, 0, k)
    a = prime_representation(f, p, method="cornacchia")
    b = prime_representation(f, p, method="reduction")
    assert a.represented == b.represented
    for d in (a, b):
        if d.represented:
            assert f(*d.solution) == p


def test_non_primes_are_routed_to_general_method():
    d = prime_representation((1, 0, 1), 25)
    assert d.method == "square-root method" and d.represented and not d.prime
    assert prime_representation((1, 0, 1), 21).represented is False
    assert prime_representation((1, 0, 1), 1).solution is not None
    d = prime_representation((1, 0, -2), 7 * 17)
    assert d.represented and d.method == "square-root method"
    assert prime_representation((2, 0, 2), 2).represented  # non-primitive: general method
    assert prime_representation((-1, 0, -1), -5).represented  # negative definite: general
    assert prime_representation((1, 0, 1), 0).solution == (0, 0)
    d = prime_representation((1, 0, 1), 10**40 + 1)  # composite, factorable
    assert d.method == "square-root method" and not d.prime


def test_character_shortcut_and_dict():
    d = prime_representation((2, 1, 3), 5)
    assert d.method == "character" and not d.represented
    d = prime_representation((1, 0, 1), 13).to_dict()
    assert d == {
        "form": [1, 0, 1],
        "n": 13,
        "represented": True,
        "solution": [3, 2],
        "method": "cornacchia",
        "prime": True,
    }
    # assume_prime skips the test: on a prime the answer is the same
    p = 10**100 + 949
    assert prime_representation((1, 0, 1), p, assume_prime=True) == prime_representation((1, 0, 1), p)


def test_ramified_primes():
    # p | D: (p, b, ·) with b ≡ 0 (mod p); compare brute force
    for f in [Form(1, 0, 5), Form(2, 2, 3), Form(1, 0, 3), Form(3, 0, 7), Form(1, 1, 6), Form(5, 0, 1)]:
        for p in PRIMES[:25]:
            assert decide(f, p, method="reduction") == brute_represents(f, p), (f, p)


def test_bad_input():
    with pytest.raises(NotPrimeError):
        cornacchia(1, 15)
    with pytest.raises(FormkitError, match="n ≥ 1"):
        cornacchia(0, 13)
    with pytest.raises(NotAnIntegerError):
        cornacchia(1.0, 13)
    with pytest.raises(NotPrimeError):
        cornacchia_4p(-3, 21)
    with pytest.raises(DiscriminantError):
        cornacchia_4p(5, 11)
    with pytest.raises(DiscriminantError):
        cornacchia_4p(-5, 11)
    with pytest.raises(FormkitError, match="method"):
        prime_representation((1, 0, 1), 5, method="fast")
    with pytest.raises(FormkitError, match="Cornacchia"):
        prime_representation((2, 1, 3), 5, method="cornacchia")
    with pytest.raises(NotPrimeError):
        prime_representation((1, 0, 1), 25, method="cornacchia")
    with pytest.raises(DiscriminantError):
        prime_representation((1, 2, 1), 5)
    with pytest.raises(NotAnIntegerError):
        prime_representation((1, 0, 1), "13")
