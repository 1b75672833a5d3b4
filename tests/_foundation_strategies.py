"""Hypothesis strategies and brute-force references shared by the foundation tests.

The brute-force functions here use only the definitions (the reduction inequalities,
b² − 4ac = D), never formkit's algorithms, so tests can compare the two.
"""

from __future__ import annotations

import math
import random

from hypothesis import assume
from hypothesis import strategies as st

from formkit import Form

T = ((1, 1), (0, 1))
S = ((0, -1), (1, 0))
J = ((1, 0), (0, -1))


def mul(m, n):
    """2×2 product, written out here so the tests do not rely on formkit.mat_mul."""
    (p, q), (r, s) = m
    (e, f), (g, h) = n
    return ((p * e + q * g, p * f + q * h), (r * e + s * g, r * f + s * h))


def det(m):
    return m[0][0] * m[1][1] - m[0][1] * m[1][0]


def act(form, m):
    """(Q·M)(x, y) = Q(px + qy, rx + sy), written out from the definition."""
    a, b, c = form
    (p, q), (r, s) = m
    return (
        a * p * p + b * p * r + c * r * r,
        2 * a * p * q + b * (p * s + q * r) + 2 * c * r * s,
        a * q * q + b * q * s + c * s * s,
    )


@st.composite
def sl2_matrices(draw, max_factors: int = 8, max_shift: int = 30):
    """Random elements of SL2(Z) as products of T^k and S (which generate SL2(Z))."""
    m = ((1, 0), (0, 1))
    for k in draw(st.lists(st.integers(-max_shift, max_shift), max_size=max_factors)):
        m = mul(mul(m, ((1, k), (0, 1))), S)
    if draw(st.booleans()):
        m = ((-m[0][0], -m[0][1]), (-m[1][0], -m[1][1]))
    return m


@st.composite
def gl2_matrices(draw, max_factors: int = 8, max_shift: int = 30):
    """Random elements of GL2(Z) (determinant +1 or −1)."""
    m = draw(sl2_matrices(max_factors, max_shift))
    if draw(st.booleans()):
        m = mul(m, J)
    return m


@st.composite
def improper_matrices(draw, max_factors: int = 8, max_shift: int = 30):
    """Random matrices of determinant −1."""
    return mul(draw(sl2_matrices(max_factors, max_shift)), J)


@st.composite
def reduced_definite_forms(draw, max_a: int = 60, max_c: int = 400):
    """Random reduced positive definite forms (|b| ≤ a ≤ c, b ≥ 0 if |b| = a or a = c)."""
    a = draw(st.integers(1, max_a))
    c = draw(st.integers(a, max(a, max_c)))
    b = draw(st.integers(-a + 1, a))
    if a == c and b < 0:
        b = -b
    return Form(a, b, c)


@st.composite
def definite_forms(draw):
    """Random positive or negative definite forms (not necessarily reduced or primitive)."""
    f = draw(reduced_definite_forms())
    m = draw(sl2_matrices())
    g = Form(*act(f, m))
    if draw(st.booleans()):
        g = -g
    return g


def is_square(n: int) -> bool:
    return n >= 0 and math.isqrt(n) ** 2 == n


@st.composite
def indefinite_forms(draw, bound: int = 10**4):
    """Random indefinite forms: non-square D > 0."""
    a = draw(st.integers(-bound, bound).filter(bool))
    b = draw(st.integers(-bound, bound))
    c = draw(st.integers(-bound, bound).filter(bool))
    D = b * b - 4 * a * c
    assume(D > 0 and not is_square(D))
    return Form(a, b, c)


def brute_reduced_definite(D: int, primitive: bool = False) -> list[tuple[int, int, int]]:
    """All reduced positive definite forms of discriminant D < 0, from the inequalities."""
    out = []
    a = 1
    while 3 * a * a <= -D:
        for b in range(-a + 1, a + 1):
            num = b * b - D
            if num % (4 * a):
                continue
            c = num // (4 * a)
            if c < a or (a == c and b < 0):
                continue
            if primitive and math.gcd(math.gcd(a, b), c) != 1:
                continue
            out.append((a, b, c))
        a += 1
    return sorted(out)


def brute_reduced_indefinite(D: int, primitive: bool = False) -> list[tuple[int, int, int]]:
    """All reduced indefinite forms of non-square D > 0: 0 < b < √D, √D − b < 2|a| < √D + b.

    The inequalities are tested exactly with s = ⌊√D⌋ (√D is irrational): b ≤ s,
    2|a| + b > s and 2|a| − b ≤ s.
    """
    s = math.isqrt(D)
    out = []
    for b in range(1, s + 1):
        for a_abs in range(1, s + 1):
            if not (2 * a_abs + b > s and 2 * a_abs - b <= s):
                continue
            for a in (a_abs, -a_abs):
                num = b * b - D
                if num % (4 * a):
                    continue
                c = num // (4 * a)
                if primitive and math.gcd(math.gcd(a, b), c) != 1:
                    continue
                out.append((a, b, c))
    return sorted(out)


def random_sl2(rng: random.Random, digits: int) -> tuple[tuple[int, int], tuple[int, int]]:
    """A random SL2(Z) matrix whose entries have about ``digits`` decimal digits.

    Built as a product of T^k·S with random k until the entries are large enough.
    """
    m = ((1, 0), (0, 1))
    while max(abs(v) for row in m for v in row) < 10**digits:
        k = rng.randint(1, 10**3) * rng.choice((1, -1))
        m = mul(mul(m, ((1, k), (0, 1))), S)
    return m
