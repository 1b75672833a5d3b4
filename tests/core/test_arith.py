"""Tests of formkit.core.arith, the integer backend.

Outside references: Python's math module and built-in pow, sympy (isprime, nextprime,
factorint, divisors, kronecker_symbol, jacobi_symbol, sqrt_mod with all_roots=True,
modular.crt), brute force over residues, and classical facts named beside each check.
"""

from __future__ import annotations

import json
import math
import os
import subprocess
import sys
from fractions import Fraction

import pytest
import sympy
from hypothesis import given
from hypothesis import strategies as st
from sympy.functions.combinatorial.numbers import jacobi_symbol, kronecker_symbol
from sympy.ntheory.modular import crt as sympy_crt
from sympy.ntheory.residue_ntheory import sqrt_mod as sympy_sqrt_mod

from formkit.core import arith
from formkit.core.arith import (
    as_int,
    divisors,
    factorint,
    gcd,
    invert,
    is_probable_prime,
    is_square,
    isqrt,
    isqrt_rem,
    kronecker,
    lcm,
    mpz,
    next_prime,
    powmod,
    xgcd,
)
from formkit.core.modular_roots import crt, sqrt_mod, sqrt_mod_prime, sqrt_mod_prime_power
from formkit.errors import FormkitError, NotAnIntegerError, NotPrimeError

big = st.integers(-(10**60), 10**60)


# --- as_int -------------------------------------------------------------------


def test_as_int_accepts_integer_types():
    assert as_int(7) == 7 and type(as_int(7)) is int
    assert as_int(mpz(10) ** 50) == 10**50 and type(as_int(mpz(3))) is int
    assert as_int(sympy.Integer(-12)) == -12

    class Indexable:  # any object with __index__ is an integer (PEP 357)
        def __index__(self):
            return 5

    assert as_int(Indexable()) == 5


def test_as_int_accepts_numpy_integers():
    numpy = pytest.importorskip("numpy")
    assert as_int(numpy.int64(5)) == 5
    with pytest.raises(NotAnIntegerError):
        as_int(numpy.float64(5.0))


@pytest.mark.parametrize(
    "bad", [2.0, 2.5, True, False, "3", b"3", None, Fraction(1, 2), sympy.Rational(1, 2), [1], 1j]
)
def test_as_int_refuses_non_integers(bad):
    with pytest.raises(NotAnIntegerError) as info:
        as_int(bad, "D")
    # NotAnIntegerError is TypeError-compatible and names the value and the argument
    assert isinstance(info.value, TypeError) and isinstance(info.value, FormkitError)
    assert "D must be an integer" in str(info.value) and repr(bad) in str(info.value)


# --- square roots, gcd, inverses ------------------------------------------------


@given(st.integers(0, 10**80))
def test_isqrt_matches_math(n):
    assert int(isqrt(n)) == math.isqrt(n)
    s, r = isqrt_rem(n)
    assert (int(s), int(r)) == (math.isqrt(n), n - math.isqrt(n) ** 2)
    assert is_square(n) == (math.isqrt(n) ** 2 == n)
    assert is_square(n * n)


def test_is_square_small_and_negative():
    # brute force: the squares below 200
    squares = {k * k for k in range(15)}
    assert [n for n in range(-5, 200) if is_square(n)] == sorted(s for s in squares if s < 200)


@given(big, big)
def test_gcd_xgcd_lcm(a, b):
    g, s, t = xgcd(a, b)
    assert int(g) == math.gcd(a, b) >= 0
    assert s * a + t * b == g  # Bezout identity
    assert gcd(a, b) == math.gcd(a, b)
    assert lcm(a, b) == math.lcm(a, b)


def test_gcd_many_arguments():
    assert gcd(12, -18, 27) == 3 and gcd() == 0 and gcd(0, 0) == 0 and gcd(-5) == 5


@given(big, st.integers(2, 10**40))
def test_invert_and_powmod(a, m):
    if math.gcd(a, m) == 1:
        assert int(invert(a, m)) == pow(a, -1, m)
        assert int(powmod(a, -3, m)) == pow(a, -3, m)
    else:
        with pytest.raises(FormkitError, match="no inverse"):
            invert(a, m)
    e = abs(a) % 1000
    assert int(powmod(a, e, m)) == pow(a, e, m)


# --- Kronecker symbol -----------------------------------------------------------


def test_kronecker_against_sympy_small():
    # sympy's kronecker_symbol implements the same definition (including n ≤ 0 and even n)
    for a in range(-40, 41):
        for n in range(-40, 41):
            assert kronecker(a, n) == kronecker_symbol(a, n), (a, n)


@given(big, big)
def test_kronecker_against_sympy_large(a, n):
    assert kronecker(a, n) == kronecker_symbol(a, n)


@given(st.integers(-(10**30), 10**30), st.integers(0, 10**30))
def test_kronecker_is_jacobi_for_odd_positive_n(a, k):
    n = 2 * k + 1
    assert kronecker(a, n) == jacobi_symbol(a, n)


def test_kronecker_pure_python_against_sympy():
    # the plain-Python implementation kept for FORMKIT_INTEGER_BACKEND=python
    for a in range(-30, 31):
        for n in range(-30, 31):
            assert arith._kronecker_python(a, n) == kronecker_symbol(a, n), (a, n)


def test_kronecker_classical_values():
    # (−1/p) = 1 iff p ≡ 1 mod 4; (2/p) = 1 iff p ≡ ±1 mod 8 (supplementary laws, from memory)
    for p in sympy.primerange(3, 400):
        assert kronecker(-1, p) == (1 if p % 4 == 1 else -1)
        assert kronecker(2, p) == (1 if p % 8 in (1, 7) else -1)


# --- primes and factorisation ------------------------------------------------------


def test_is_probable_prime_against_sympy():
    for n in range(-5, 3000):
        assert is_probable_prime(n) == sympy.isprime(n), n


def test_primality_classical_values():
    # 2^127 − 1 is prime (Lucas 1876); 2^67 − 1 = 193707721 · 761838257287 (Cole 1903);
    # 561 is the least Carmichael number — all from memory
    assert is_probable_prime(2**127 - 1)
    assert not is_probable_prime(2**67 - 1) and 193707721 * 761838257287 == 2**67 - 1
    assert not is_probable_prime(561)


def test_next_prime_against_sympy():
    for n in list(range(-3, 200)) + [10**20, 2**64]:
        assert int(next_prime(n)) == sympy.nextprime(max(n, 1) if n >= 2 else 1)


@pytest.mark.parametrize("n", [1, -1, 2, 360, -360, 2**10 * 3**5 * 101, 999983 * 1000003])
def test_factorint_and_divisors(n):
    assert factorint(n) == sympy.factorint(abs(n))
    assert divisors(n) == sympy.divisors(abs(n))


# --- square roots modulo n ----------------------------------------------------------


def brute_roots(a, n):
    return [x for x in range(n) if (x * x - a) % n == 0]


def test_sqrt_mod_prime_brute_force():
    for p in sympy.primerange(2, 120):
        for a in range(-3, 2 * p):
            roots = brute_roots(a, p)
            if roots:
                r = int(sqrt_mod_prime(a, p))
                assert r == min(roots)  # the smaller of the two roots
            else:
                with pytest.raises(FormkitError, match="not a square"):
                    sqrt_mod_prime(a, p)


@given(st.sampled_from([10**9 + 7, 2**61 - 1, 998244353, 2**89 - 1, 1000000009]), big)
def test_sqrt_mod_prime_large(p, a):
    # 2^61−1, 2^89−1 Mersenne primes (from memory); 998244353 = 119·2^23 + 1 (a prime ≡ 1 mod 8)
    if kronecker(a, p) == -1:
        with pytest.raises(FormkitError):
            sqrt_mod_prime(a, p)
    else:
        r = int(sqrt_mod_prime(a, p))
        assert (r * r - a) % p == 0 and 0 <= r <= p // 2


def test_sqrt_mod_prime_power_brute_force():
    for p in (2, 3, 5, 7):
        k = 1
        while p**k <= 300:
            n = p**k
            for a in range(-2, n + 2):
                assert sqrt_mod_prime_power(a, p, k) == brute_roots(a, n), (a, p, k)
            k += 1


@given(st.sampled_from([(2, 20), (3, 12), (5, 9), (13, 6), (10007, 3)]), st.integers(-(10**12), 10**12))
def test_sqrt_mod_prime_power_against_sympy(pk, a):
    p, k = pk
    n = p**k
    assert sqrt_mod_prime_power(a, p, k) == sorted(sympy_sqrt_mod(a % n, n, all_roots=True))


def test_sqrt_mod_brute_force():
    for n in range(1, 181):
        for a in range(n):
            assert sqrt_mod(a, n) == brute_roots(a, n), (a, n)


@given(st.integers(2, 10**9), st.integers(-(10**9), 10**9))
def test_sqrt_mod_against_sympy(n, a):
    ours = sqrt_mod(a, n)
    theirs = sorted(sympy_sqrt_mod(a % n, n, all_roots=True)) if n > 1 else [0]
    assert ours == theirs
    assert sqrt_mod(a, n, factors=sympy.factorint(n)) == ours


@given(st.lists(st.tuples(st.integers(-(10**6), 10**6), st.integers(1, 10**6)), max_size=6))
def test_crt_against_sympy(pairs):
    residues, moduli = [], []
    for r, m in pairs:
        if all(math.gcd(m, other) == 1 for other in moduli):
            residues.append(r)
            moduli.append(m)
    x, M = crt(residues, moduli)
    assert math.prod(moduli) == M and 0 <= x < M
    assert all((x - r) % m == 0 for r, m in zip(residues, moduli))
    if moduli:
        assert x == int(sympy_crt(moduli, residues)[0]) % M


def test_crt_small_brute_force():
    for m1 in range(1, 12):
        for m2 in range(1, 12):
            if math.gcd(m1, m2) != 1:
                continue
            for r1 in range(m1):
                for r2 in range(m2):
                    x, _M = crt([r1, r2], [m1, m2])
                    assert x == next(y for y in range(m1 * m2) if y % m1 == r1 and y % m2 == r2)


# --- bad input at every entry point --------------------------------------------------

ONE_ARG = [isqrt, isqrt_rem, is_square, is_probable_prime, next_prime, factorint, divisors]
TWO_ARGS = [xgcd, lcm, invert, kronecker, sqrt_mod_prime, sqrt_mod]


@pytest.mark.parametrize("fn", ONE_ARG)
@pytest.mark.parametrize("bad", [2.0, "7", None, sympy.Rational(3, 2)])
def test_one_argument_functions_refuse_non_integers(fn, bad):
    with pytest.raises(NotAnIntegerError):
        fn(bad)


@pytest.mark.parametrize("fn", TWO_ARGS)
@pytest.mark.parametrize("bad", [2.5, "7", None])
def test_two_argument_functions_refuse_non_integers(fn, bad):
    with pytest.raises(NotAnIntegerError):
        fn(bad, 7)
    with pytest.raises(NotAnIntegerError):
        fn(3, bad)


def test_other_bad_inputs():
    with pytest.raises(NotAnIntegerError):
        gcd(4, 6.0)
    with pytest.raises(NotAnIntegerError):
        powmod(2, 3.0, 7)
    with pytest.raises(NotAnIntegerError):
        sqrt_mod_prime_power(2.0, 7, 2)
    with pytest.raises(NotAnIntegerError):
        crt([1.5, 2], [3, 5])
    with pytest.raises(FormkitError, match="non-negative"):
        isqrt(-1)
    with pytest.raises(FormkitError, match="non-negative"):
        isqrt_rem(-4)
    with pytest.raises(FormkitError, match="non-zero"):
        invert(3, 0)
    with pytest.raises(FormkitError, match="modulus"):
        powmod(2, 3, 0)
    with pytest.raises(FormkitError, match="no inverse"):
        powmod(2, -1, 4)
    with pytest.raises(FormkitError, match="cannot factor 0"):
        factorint(0)
    with pytest.raises(NotPrimeError, match="15"):
        sqrt_mod_prime(4, 15)
    with pytest.raises(NotPrimeError, match="6"):
        sqrt_mod_prime_power(4, 6, 2)
    with pytest.raises(FormkitError, match=">= 1"):
        sqrt_mod_prime_power(4, 5, 0)
    with pytest.raises(FormkitError, match=">= 1"):
        sqrt_mod(4, 0)
    with pytest.raises(FormkitError, match="pairwise coprime"):
        crt([1, 2], [4, 6])
    with pytest.raises(FormkitError, match="as many"):
        crt([1, 2], [5])
    with pytest.raises(FormkitError, match="positive"):
        crt([1], [-5])


# --- the plain-Python backend gives the same values -------------------------------------

_BACKEND_SCRIPT = r"""
import json
from formkit.core import arith, modular_roots
assert arith.BACKEND == "python" and arith.mpz is int
out = {
    "isqrt": [int(arith.isqrt(n)) for n in (0, 1, 10**41 + 7, 2**200)],
    "xgcd": [list(map(int, arith.xgcd(a, b))) for a, b in ((240, 46), (-7, 3), (5, -3), (0, 9))],
    "kronecker": [arith.kronecker(a, n) for a in range(-12, 13) for n in range(-12, 13)],
    "prime": [arith.is_probable_prime(n) for n in range(60)],
    "sqrt_mod": [modular_roots.sqrt_mod(a, 360) for a in range(40)],
    "sqrt_p": [int(modular_roots.sqrt_mod_prime(k * k, p)) for p in (13, 10**9 + 7, 998244353) for k in (2, 3, 12345)],
    "crt": list(modular_roots.crt([2, 3, 2], [3, 5, 7])),
    "next": int(arith.next_prime(10**12)),
}
print(json.dumps(out))
"""


def test_python_backend_agrees_with_gmpy2():
    env = dict(os.environ, FORMKIT_INTEGER_BACKEND="python")
    proc = subprocess.run(
        [sys.executable, "-c", _BACKEND_SCRIPT], env=env, capture_output=True, text=True, timeout=120
    )
    assert proc.returncode == 0, proc.stderr
    theirs = json.loads(proc.stdout)
    theirs_xgcd = theirs.pop("xgcd")
    assert theirs == {
        "isqrt": [int(isqrt(n)) for n in (0, 1, 10**41 + 7, 2**200)],
        "kronecker": [kronecker(a, n) for a in range(-12, 13) for n in range(-12, 13)],
        "prime": [is_probable_prime(n) for n in range(60)],
        "sqrt_mod": [sqrt_mod(a, 360) for a in range(40)],
        "sqrt_p": [int(sqrt_mod_prime(k * k, p)) for p in (13, 10**9 + 7, 998244353) for k in (2, 3, 12345)],
        "crt": list(crt([2, 3, 2], [3, 5, 7])),
        "next": int(next_prime(10**12)),
    }
    # xgcd's Bezout coefficients may differ between backends; the identity must hold
    for (a, b), (g, s, t) in zip(((240, 46), (-7, 3), (5, -3), (0, 9)), theirs_xgcd):
        assert s * a + t * b == g == math.gcd(a, b)
