"""Tests for formkit.analytic.class_number_formula: class numbers from Dirichlet's class number formula.

The analytic value (a finite character sum for D < 0, a log-sine sum with the regulator
for D > 0; Davenport, *Multiplicative Number Theory*, Ch. 6; Cohen GTM 138 §5.3, §5.6)
is compared with **complete enumeration** (formkit.core.enumeration), with the **brute-force**
counts of tests/_classgroup_reference.py, and with classical values (from memory).
"""

from __future__ import annotations

import math
import random

import pytest
import sympy
from _classgroup_reference import brute_class_number, is_fundamental, wide_class_number

from formkit import (
    MAX_ANALYTIC_DISCRIMINANT,
    DiscriminantError,
    FormkitError,
    NotAnIntegerError,
    class_group,
    class_number,
    class_number_dirichlet,
)


def discriminants(lo: int, hi: int) -> list[int]:
    return [D for D in range(lo, hi + 1) if D % 4 in (0, 1) and not (D >= 0 and math.isqrt(D) ** 2 == D)]


def test_negative_against_brute_force():
    # source: brute force, every D in [−700, −3] (fundamental or not)
    for D in discriminants(-700, -3):
        assert class_number_dirichlet(D) == brute_class_number(D), D


def test_negative_against_enumeration_random_sample():
    # source: complete enumeration, 20 random D with |D| up to 10^5
    rng = random.Random(11)
    for D in rng.sample(discriminants(-100000, -1000), 20):
        assert class_number_dirichlet(D) == class_number(D), D


def test_positive_against_brute_force():
    # source: brute force wide class number (orbits of ρ-cycles), every D in [5, 260]
    for D in discriminants(5, 260):
        assert class_number_dirichlet(D) == wide_class_number(D), D


def test_positive_against_enumeration_random_sample():
    # source: complete enumeration (narrow) and the unit norm, 6 random D up to 5000
    rng = random.Random(12)
    for D in rng.sample(discriminants(300, 5000), 6):
        assert class_number_dirichlet(D) == class_group(D).class_number_wide, D


@pytest.mark.slow
def test_against_enumeration_wide_range():
    for D in discriminants(-10000, -3):
        assert class_number_dirichlet(D) == class_number(D), D
    for D in discriminants(5, 2000):
        assert class_number_dirichlet(D) == class_group(D).class_number_wide, D


def test_classical_values():
    # source: Baker–Heegner–Stark (h = 1); Watkins 2004 Table 4, largest |d| with
    # h = 2…7 (from memory); real quadratic fields Q(√79), Q(√229), Q(√82) (from memory)
    for d in (-3, -4, -7, -8, -11, -19, -43, -67, -163):
        assert class_number_dirichlet(d) == 1
    for d, h in {-427: 2, -907: 3, -1555: 4, -2683: 5, -3763: 6, -5923: 7}.items():
        assert is_fundamental(d)
        assert class_number_dirichlet(d) == h, d
    assert class_number_dirichlet(4 * 79) == 3
    assert class_number_dirichlet(229) == 3
    assert class_number_dirichlet(4 * 82) == 4
    assert class_number_dirichlet(5) == 1 and class_number_dirichlet(8) == 1


def test_huge_conductor_over_small_field():
    # the analytic part only needs d_K; D = −4·(10^6)² has d_K = −4, f = 10^6 and
    # h = (1/2)·f·(1 − 0/2)(1 − 1/5) = 400000 (Cox Thm 7.24 with w(−4)/w = 2, χ_{−4}(5) = 1)
    assert class_number_dirichlet(-4 * 10**12) == 400000


def test_bad_input():
    for bad, exc in [
        (-5, DiscriminantError),
        (16, DiscriminantError),
        (0, DiscriminantError),
        ("x", NotAnIntegerError),
        (-23.0, NotAnIntegerError),
    ]:
        with pytest.raises(exc):
            class_number_dirichlet(bad)
    # a fundamental discriminant beyond the limit of the finite sums
    p = sympy.nextprime(MAX_ANALYTIC_DISCRIMINANT)
    while p % 4 != 3:
        p = sympy.nextprime(p)
    with pytest.raises(DiscriminantError, match=str(p)) as info:
        class_number_dirichlet(-p)
    assert isinstance(info.value, FormkitError)
