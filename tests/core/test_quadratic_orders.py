"""Tests of formkit.core.quadratic_orders: how orders are written, the Order value, numbers of Q(√m).

Sources are named beside each check: the discriminant of Q(√m) (m or 4m, Cox §5/§7,
from memory), the continued fraction of √m and Pell's equation (the fundamental
solution comes from the convergent before the end of the first period and has norm
(−1)^period — Niven–Zuckerman–Montgomery, *An Introduction to the Theory of Numbers*,
§7.8, from memory), and hypothesis round trips.
"""

from __future__ import annotations

import math
from fractions import Fraction

import pytest
from hypothesis import given
from hypothesis import strategies as st

from formkit import DiscriminantError, FormkitError, ParseError
from formkit.core.quadratic_numbers import QuadraticNumber
from formkit.core.quadratic_orders import Order, field_discriminant, parse_discriminant
from formkit.errors import NotInOrderError


@pytest.mark.parametrize(
    "text, D",
    [
        ("-23", -23),
        ("-4*3*10^2", -1200),
        ("-3*4*37^2", -16428),
        ("-12*37^2", -16428),
        ("-(10^40+27)", -(10**40 + 27)),
        ("Q(sqrt(94))", 376),  # 94 ≡ 2 mod 4: d_K = 4·94 (from memory)
        ("Q(√94)", 376),
        ("Q(√(94))", 376),
        ("Q(sqrt(-3))", -3),
        ("Q(sqrt(5))", 5),
        ("Q( sqrt( -1 ) )", -4),
        ("q(SQRT(2))", 8),
        ("Q(√-3), f=6", -108),
        ("Q(sqrt(-1)), conductor=5", -100),
        ("-3, f=2", -12),
        ("Q(sqrt(-(10^2+3)))", -103),
    ],
)
def test_accepted_ways_to_write_an_order(text, D):
    assert parse_discriminant(text) == D
    assert Order.from_text(text).discriminant == D


def test_conductor_option_beside_a_field_or_fundamental_discriminant():
    assert parse_discriminant("Q(sqrt(-3))", conductor=6) == -108
    assert parse_discriminant("-4", conductor="3*2") == -144
    assert parse_discriminant(-4, conductor=1) == -4
    with pytest.raises(DiscriminantError, match="already has conductor 2"):
        parse_discriminant("-12", conductor=3)  # ambiguous: refused
    with pytest.raises(ParseError, match="given twice"):
        parse_discriminant("-3, f=2", conductor=2)
    with pytest.raises(DiscriminantError, match="positive"):
        parse_discriminant("Q(sqrt(5))", conductor=0)


@pytest.mark.parametrize(
    "text, words",
    [
        ("94", "the field Q(√94) has discriminant 376"),  # the issue's example
        ("-5", "the field Q(√-5) has discriminant -20"),
        ("18", "Q(√18) is the field Q(√2), of discriminant 8, and the order Z[√18] has discriminant 72"),
        ("16", "perfect square"),
        ("0", "degenerate"),
        ("Q(sqrt(12))", "Q(√12) is the field Q(√3)"),  # non-square-free m written as a field
        ("Q(sqrt(-8))", "Q(√-8) is the field Q(√-2), of discriminant -8"),
        ("Q(sqrt(4))", "is not a quadratic field"),
        ("Q(sqrt(1))", "is not a quadratic field"),
        ("Q(sqrt(0))", "is not a quadratic field"),
    ],
)
def test_errors_name_the_nearest_meaning(text, words):
    with pytest.raises(DiscriminantError) as info:
        parse_discriminant(text)
    assert words in str(info.value)


@pytest.mark.parametrize(
    "bad",
    [
        "Q(sqrt(5)",
        "Q(sqrt(5)))",
        "Q(5)",
        "Q(sqrt(x))",
        "-3, g=2",
        "-3, f=",
        "1,2,3",
        "__import__('os')",
        "sqrt(5)",
    ],
)
def test_unreadable_text_is_refused(bad):
    with pytest.raises(FormkitError):
        parse_discriminant(bad)


def test_field_discriminant_against_the_rule_m_or_4m():
    # source: d_K = m if m ≡ 1 (mod 4), else 4m, for square-free m (from memory); square-freeness by brute force
    for m in range(-300, 300):
        if m in (0, 1) or any(m % (p * p) == 0 for p in range(2, 18)):
            with pytest.raises(DiscriminantError):
                field_discriminant(m)
            continue
        assert field_discriminant(m) == (m if m % 4 == 1 else 4 * m)


# --- the Order value ----------------------------------------------------------------------------


def test_the_issue_example_q_sqrt_94():
    order = Order.from_text("Q(sqrt(94))")
    assert (order.discriminant, order.conductor, order.radicand, order.ring_text) == (376, 1, 94, "Z[√94]")
    # 2143295² − 94·221064² = 1 (checked here by integer arithmetic; the unit is from the issue)
    assert 2143295**2 - 94 * 221064**2 == 1
    assert order.fundamental_unit_text() == "2143295 + 221064√94"
    assert order.fundamental_unit_basis() == (2143295, 221064)
    assert order.fundamental_unit().norm == 1


@pytest.mark.parametrize(
    "D, ring, f",
    [
        (-4, "Z[√-1]", 1),
        (-3, "Z[(1+√-3)/2]", 1),
        (-12, "Z[√-3]", 2),  # Z + 2·Z[(1+√-3)/2] = Z[√-3]
        (-27, "Z[(1+3√-3)/2]", 3),
        (-108, "Z[3√-3]", 6),
        (45, "Z[(1+3√5)/2]", 3),
        (-16, "Z[2√-1]", 2),
    ],
)
def test_rings(D, ring, f):
    # source: O = Z + f·O_K = Z[f·ω_K] (Cox, Lemma 7.2, from memory), written with ω_K shifted by integers
    order = Order(D)
    assert order.ring_text == ring and order.conductor == f
    theta = order.element(ring[2:-1])  # the generator of the ring is in the order, of discriminant D
    assert (theta - theta.conjugate()) ** 2 == D


def test_units_of_imaginary_orders():
    # source: w = 6, 4, 2 for d = −3, −4, others (Cox, Exercise 5.9, from memory); [O_K*:O*] = w_K/w_O
    assert (Order(-3).unit_count, Order(-4).unit_count, Order(-12).unit_count) == (6, 4, 2)
    assert (Order(-12).unit_index, Order(-16).unit_index, Order(-23).unit_index) == (3, 2, 1)


def _pell_by_continued_fraction(n: int) -> tuple[int, int, int]:
    """(x, y, period) with x + y√n the fundamental unit of Z[√n], from the continued fraction of √n."""
    a0 = math.isqrt(n)
    m, d, a = 0, 1, a0
    p0, p1, q0, q1 = 1, a0, 0, 1
    period = 0
    while True:
        m = d * a - m
        d = (n - m * m) // d
        a = (a0 + m) // d
        period += 1
        if a == 2 * a0:  # the end of the first period
            return p1, q1, period
        p0, p1 = p1, a * p1 + p0
        q0, q1 = q1, a * q1 + q0


def test_fundamental_units_of_z_sqrt_n_against_the_continued_fraction():
    # source: the continued fraction of √n (Niven–Zuckerman–Montgomery §7.8, from memory):
    # the fundamental unit of Z[√n] is p + q√n from the convergent before the first period
    # ends, and its norm is (−1)^period
    for n in range(2, 400):
        if math.isqrt(n) ** 2 == n:
            continue
        x, y, period = _pell_by_continued_fraction(n)
        order = Order(4 * n)
        assert order.fundamental_unit_number() == QuadraticNumber(4 * n, 2 * x, y), n
        assert order.fundamental_unit().norm == (-1) ** period, n


def test_regulator_to_any_precision():
    # source: mpmath evaluates log(2143295 + 221064√94) at 80 digits directly
    import mpmath

    R = Order(376).regulator(60)
    with mpmath.workdps(80):
        exact = mpmath.log(2143295 + 221064 * mpmath.sqrt(94))
        assert abs(R - exact) < mpmath.mpf(10) ** -55


def test_order_value_type():
    order = Order.from_text("Q(√-3), f=6")
    assert Order(-108) == order and hash(order) == hash(Order(-108)) and {order: 1}[Order(-108)] == 1
    assert order.maximal_order() == Order(-3)
    assert repr(order) == "Order(D=-108: the order Z[3√-3] of conductor 6 in Q(√-3))"
    assert "conductor f = 6" in order._repr_html_() and r"\mathbb{Z}[3\sqrt{-3}]" in order._repr_latex_()
    assert order.to_dict() == {
        "discriminant": -108,
        "fundamental_discriminant": -3,
        "conductor": 6,
        "field": "Q(√-3)",
        "field_radicand": -3,
        "ring": "Z[3√-3]",
    }
    with pytest.raises(AttributeError):
        order._D = 5  # type: ignore[misc]


# --- numbers of the field -----------------------------------------------------------------------


@pytest.mark.parametrize(
    "D, text, coords",
    [
        (-20, "3 + 2√-5", (6, 2, 1)),  # √-20 = 2√-5, so 3 + 2√-5 = (6 + 2√D)/2
        (-20, "3+2*sqrt(-5)", (6, 2, 1)),
        (-20, "sqrt(-20)", (0, 2, 1)),
        (5, "(1+√5)/2", (1, 1, 1)),
        (5, "((1+√5)/2)^2", (3, 1, 1)),
        (-4, "7*sqrt(-1) - 2", (-4, 7, 1)),  # √-4 = 2√-1
        (-12, "(1+√-3)/2", (2, 1, 2)),  # (2 + √-12)/4: not in Z[√-3], but a number of the field
        (-4, "−3√-1 × 2", (0, -6, 1)),
    ],
)
def test_reading_numbers(D, text, coords):
    # source: the arithmetic of √D = s·√m done by hand (comments); coordinates (x + y√D)/(2z)
    assert Order(D).number(text) == QuadraticNumber(D, *coords)


def test_elements_must_lie_in_the_order():
    with pytest.raises(NotInOrderError, match=r"\(1 \+ √-3\)/2 is not in the order Z\[√-3\]"):
        Order(-12).element("(1+√-3)/2")
    with pytest.raises(NotInOrderError, match="not a number of the field"):
        Order(-4).number("√-2")
    with pytest.raises(ParseError):
        Order(-4).number("√-1 + x")
    with pytest.raises(ParseError):
        Order(-4).number("1/√-1")  # division only by rational numbers


coords = st.integers(-(10**30), 10**30)


@given(st.sampled_from([-4, -3, -20, -108, 5, 12, 376, 45, 4 * 94 * 9]), coords, coords, st.integers(1, 50))
def test_numbers_print_and_read_back(D, x, y, z):
    # source: round trip (common practice); text() writes √m with the field's m
    a = QuadraticNumber(D, x, y, z)
    assert Order(D).number(a.text()) == a


@given(st.sampled_from([-4, -23, -20, 5, 376]), coords, coords, coords, coords)
def test_norm_is_multiplicative(D, x1, y1, x2, y2):
    # source: N(αβ) = N(α)N(β) (algebra, common practice)
    a, b = QuadraticNumber(D, x1, y1), QuadraticNumber(D, x2, y2)
    assert (a * b).norm == a.norm * b.norm
    if a.norm:
        assert a * a.inverse() == 1 and (b / a) * a == b
    assert a.trace == Fraction(x1)


def test_unit_index_of_real_orders_against_powers_of_the_unit():
    # brute force: the least k with ε_K^k = (T + U√d_K)/2 in O (f | U and T ≡ (U/f)·D mod 2),
    # multiplying the unit out, for every real non-fundamental D < 6000
    from formkit.core.discriminants import discriminant_parts, fundamental_unit, unit_index

    for D in range(5, 6000):
        if D % 4 not in (0, 1) or math.isqrt(D) ** 2 == D:
            continue
        d_K, f = discriminant_parts(D)
        if f == 1:
            continue
        e = fundamental_unit(d_K)
        T, U, k = e.t, e.u, 1
        while not (U % f == 0 and (T - (U // f) * D) % 2 == 0):
            T, U, k = (T * e.t + U * e.u * d_K) // 2, (T * e.u + U * e.t) // 2, k + 1
        assert unit_index(D) == k, D


def test_unit_index_of_z_phi_orders_is_the_fibonacci_rank_of_apparition():
    # φ^k = F_(k−1) + F_k·φ lies in Z + pZ[φ] iff p | F_k: the index of the order of conductor p
    # in Q(√5) is the least k with p | F_k (sympy's Fibonacci numbers as the outside reference)
    import sympy

    from formkit.core.discriminants import unit_index

    for p in (2, 3, 7, 11, 29, 89, 101, 1009):
        rank = next(k for k in range(1, 2 * p + 3) if sympy.fibonacci(k) % p == 0)
        assert unit_index(5 * p * p) == rank, p
    # a conductor far beyond any walk of the unit (index 1000004 = p + 1, found modulo p)
    assert unit_index(5 * 1000003**2) == 1000004
