"""Tests of formkit.tables.hurwitz_relation: the identities it rests on against brute force,
H(n) for n ≡ 7 (mod 8) against remembered values, the reduced-form sweep and formkit's
enumeration, and the pieces of the exact division."""

from __future__ import annotations

import math
from fractions import Fraction

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from formkit import FormkitError, class_number, class_numbers, hurwitz_class_numbers
from formkit.tables.hurwitz_relation import (
    MAX_N,
    PRIME,
    _seven_series,
    _six_c,
    hurwitz_seven,
)
from formkit.tables.sweep import _count_class_seven
from formkit.tables.theta import class_numbers_by_theta


def brute_hurwitz(n: int) -> Fraction:
    """H(n) from its definition: every reduced form (a, b, c) of discriminant −n, any content
    (|b| ≤ a ≤ c, b ≥ 0 if |b| = a or a = c; Cox Thm 2.8), weight 1/2 for a multiple of
    x² + y², 1/3 for a multiple of x² + xy + y²; H(0) = −1/12 (convention, from memory)."""
    if n == 0:
        return Fraction(-1, 12)
    total, a = Fraction(0), 1
    while 3 * a * a <= n:
        for b in range(-a + 1, a + 1):
            if (b * b + n) % (4 * a) == 0:
                c = (b * b + n) // (4 * a)
                if c > a or (c == a and b >= 0):
                    w = Fraction(1, 2) if (b == 0 and a == c) else Fraction(1, 3) if (a == b == c) else 1
                    total += w
        a += 1
    return total


def sigma(n: int) -> int:
    return sum(d for d in range(1, n + 1) if n % d == 0)


def lam(n: int) -> int:
    return sum(min(d, n // d) for d in range(1, n + 1) if n % d == 0)


def test_kronecker_hurwitz_relation_by_brute_force():
    # Σ_{t² ≤ 4n} H(4n − t²) = 2σ(n) − λ(n) (Hurwitz 1885; Zagier 1975; statement from
    # memory) with H from its definition, n ≤ 60; and the worked case n = 1 by hand.
    H = [brute_hurwitz(m) for m in range(4 * 60 + 1)]
    assert H[4] + 2 * H[3] + 2 * H[0] == 1 == 2 * sigma(1) - lam(1)
    for n in range(1, 61):
        r = math.isqrt(4 * n)
        s = sum(H[4 * n - t * t] for t in range(-r, r + 1))
        assert s == 2 * sigma(n) - lam(n), n


def test_jacobi_four_squares_by_brute_force():
    # r₄(n) = 8σ(n) − 32σ(n/4) (Jacobi; from memory), used in the derivation
    N = 200
    r4 = [0] * (N + 1)
    R = math.isqrt(N)
    for x in range(-R, R + 1):
        for y in range(-R, R + 1):
            for z in range(-R, R + 1):
                for w in range(-R, R + 1):
                    s = x * x + y * y + z * z + w * w
                    if s <= N:
                        r4[s] += 1
    for n in range(1, N + 1):
        assert r4[n] == 8 * sigma(n) - (32 * sigma(n // 4) if n % 4 == 0 else 0), n


def test_right_side_sieve_against_the_divisor_sums():
    # 6c(k) = 4σ(2k) − 3λ(2k) − [2|k](4σ(k/2) − 6λ(k/2)) by direct divisor sums, on
    # segments that start at odd and even k (the sieve's index arithmetic)
    want = [0] + [
        4 * sigma(2 * k) - 3 * lam(2 * k) - (4 * sigma(k // 2) - 6 * lam(k // 2) if k % 2 == 0 else 0)
        for k in range(1, 1200)
    ]
    assert _six_c(0, 1200).tolist() == want
    for lo, hi in ((1, 7), (2, 9), (333, 1200), (500, 501), (999, 1000)):
        assert _six_c(lo, hi).tolist() == want[lo:hi], (lo, hi)


def test_the_relation_for_8k_minus_1_by_brute_force():
    # Σ_j H(8(k − T_j) − 1) = c(k), the identity derived in the module docstring, with H from
    # its definition (k ≤ 150)
    K = 150
    G = [0] + [brute_hurwitz(8 * k - 1) for k in range(1, K + 1)]
    c = _six_c(0, K + 1).tolist()
    for k in range(1, K + 1):
        s = sum(G[k - t] for t in (j * (j + 1) // 2 for j in range(2 * math.isqrt(k) + 2)) if t < k)
        assert 6 * s == c[k], k


def test_published_values_for_n_7_mod_8():
    # H(7), H(15), …, H(47) = 1, 2, 3, 3, 4, 5 (the table of Hurwitz class numbers, from
    # memory; each also h(−n) plus non-primitive classes, re-derived by hand)
    assert hurwitz_seven(50) == {7: 1, 15: 2, 23: 3, 31: 3, 39: 4, 47: 5}
    H = hurwitz_class_numbers(50)
    assert H.seven == "relation" and "Kronecker–Hurwitz" in H.provenance
    S = hurwitz_class_numbers(50, seven="sweep")
    assert S.values == H.values and "counting reduced forms" in S.provenance


def test_against_the_sweep_for_every_n_7_mod_8_to_a_million():
    # the two methods for H(m), m ≡ 7 (mod 8), m ≤ 10^6: the relation and counting reduced forms
    N = 1_000_000
    G, err = _seven_series((N + 1) // 8)
    assert err < 0.25
    assert G[1:].tolist() == _count_class_seven(7, N).tolist()


def test_leaf_and_segment_sizes_do_not_matter():
    # the divide and conquer, the modular leaves and the sieve segments at several sizes
    ref, _ = _seven_series(20_000, leaf=1 << 15)
    for leaf, segment, K in (
        (2, 2, 3000),
        (16, 48, 20_000),
        (256, 1 << 10, 20_000),
        (1 << 12, 1 << 13, 20_000),
    ):
        G, err = _seven_series(K, leaf=leaf, segment=segment)
        assert (ref[: K + 1] == G).all() and err < 0.25, (leaf, segment)


@settings(max_examples=40, deadline=None)
@given(st.integers(1, 40_000))
def test_random_values_against_enumeration(k):
    # H(n) = Σ_{g² | n} h(−n/g²) for n = 8k − 1 (odd, so every n/g² ≡ 7 mod 8 is a
    # discriminant and no class is weighted), h by formkit's complete enumeration
    n = 8 * k - 1
    want = sum(class_number(-(n // (g * g))) for g in range(1, math.isqrt(n) + 1) if n % (g * g) == 0)
    assert hurwitz_seven(n)[n] == want


def test_exactness_bound_and_prime():
    # the residues mod p determine H(n) for n ≤ MAX_N: A(A+3)/2 < p, A = ⌊√(n/3)⌋ (module
    # docstring); p prime (sympy's isprime as an outside check); the bound is at least the
    # number of reduced forms (brute force, n ≤ 3000)
    from sympy import isprime

    assert isprime(PRIME)
    A = math.isqrt(MAX_N // 3)
    assert A * (A + 3) // 2 < PRIME
    for n in range(3, 3000, 4):
        A = math.isqrt(n // 3)
        assert brute_hurwitz(n) <= A * (A + 3) // 2


def test_class_numbers_with_either_method_for_the_seventh():
    # every D in [−2·10^5, −3] and a window far out: theta + relation against theta + sweep
    # and against counting reduced forms
    N = 200_000
    rel = class_numbers_by_theta(-N, -3)
    assert rel == class_numbers_by_theta(-N, -3, seven="sweep") == class_numbers(-N, -3, engine="numpy")


def test_bad_input():
    with pytest.raises(FormkitError, match="bound"):
        hurwitz_seven(-1)
    with pytest.raises(FormkitError, match="6·10"):
        hurwitz_seven(MAX_N + 1)
    with pytest.raises(FormkitError, match="seven"):
        class_numbers_by_theta(-100, -3, seven="count")
    with pytest.raises(FormkitError, match="seven"):
        hurwitz_class_numbers(10, seven="")
