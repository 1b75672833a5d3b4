"""Tests of formkit.core.discriminants.

Outside references: brute-force definitions (conductor, fundamental discriminants,
units as solutions of norm equations), sympy (kronecker_symbol, factorint and the Pell
solver diop_DN), mpmath for regulators, and classical values named beside each check.
"""

from __future__ import annotations

import math

import mpmath
import pytest
import sympy
from hypothesis import given
from hypothesis import strategies as st
from sympy.functions.combinatorial.numbers import kronecker_symbol
from sympy.solvers.diophantine.diophantine import diop_DN

from formkit import (
    DiscriminantError,
    FormkitError,
    NotAnIntegerError,
    QuadraticUnit,
    conductor,
    discriminant_parts,
    fundamental_discriminant,
    fundamental_unit,
    is_discriminant,
    is_fundamental_discriminant,
    kronecker_character,
    regulator,
    unit_count,
    validate_discriminant,
)

NONSQUARE = [d for d in range(-400, 401) if d % 4 in (0, 1) and not (d >= 0 and math.isqrt(d) ** 2 == d)]


def brute_is_fundamental(D: int) -> bool:
    """Definition (Cohen GTM 138, Def. 5.1.2, from memory): D ≡ 1 mod 4 squarefree, or
    D = 4m with m ≡ 2, 3 mod 4 squarefree."""
    if D % 4 == 1:
        return sympy.ntheory.factor_.core(abs(D)) == abs(D)
    if D % 4 == 0:
        m = D // 4
        return m % 4 in (2, 3) and sympy.ntheory.factor_.core(abs(m)) == abs(m)
    return False


def brute_conductor(D: int) -> int:
    """The largest f with D/f² ≡ 0, 1 (mod 4) (then D/f² is fundamental)."""
    return max(
        f for f in range(1, math.isqrt(abs(D)) + 1) if D % (f * f) == 0 and (D // (f * f)) % 4 in (0, 1)
    )


# --- validation ----------------------------------------------------------------------


def test_validate_accepts_discriminants():
    for D in NONSQUARE:
        assert validate_discriminant(D) == D and is_discriminant(D)
    assert validate_discriminant(sympy.Integer(-23)) == -23


@pytest.mark.parametrize("D", [-22, -21, -1, -2, 2, 3, 6, 7, 10**50 + 2, 10**50 + 3])
def test_validate_refuses_wrong_residue(D):
    with pytest.raises(DiscriminantError, match=r"≡ 0 or 1 \(mod 4\)") as info:
        validate_discriminant(D)
    assert str(D) in str(info.value)
    assert not is_discriminant(D)


@pytest.mark.parametrize("D", [0, 1, 4, 9, 16, 25, 36, 10**40])
def test_validate_refuses_squares(D):
    with pytest.raises(DiscriminantError, match="perfect square"):
        validate_discriminant(D)
    assert not is_discriminant(D)


@pytest.mark.parametrize("bad", [-23.0, "-23", None, sympy.Rational(-23, 1) / 2, True])
def test_validate_refuses_non_integers(bad):
    with pytest.raises(NotAnIntegerError):
        validate_discriminant(bad)
    assert not is_discriminant(bad)


# --- fundamental discriminant and conductor -------------------------------------------


def test_parts_against_brute_force():
    for D in NONSQUARE:
        dK, f = discriminant_parts(D)
        assert f * f * dK == D
        assert f == brute_conductor(D) == conductor(D)
        assert dK == fundamental_discriminant(D)
        assert brute_is_fundamental(dK)
        assert is_fundamental_discriminant(D) == brute_is_fundamental(D)


def test_fundamental_discriminants_published_lists():
    # OEIS A003657 (negative fundamental discriminants, absolute values) and A003658
    # (positive ones), initial terms from memory
    assert [-d for d in range(-60, 0) if is_fundamental_discriminant(d)][::-1] == [
        3,
        4,
        7,
        8,
        11,
        15,
        19,
        20,
        23,
        24,
        31,
        35,
        39,
        40,
        43,
        47,
        51,
        52,
        55,
        56,
        59,
    ]
    assert [d for d in range(1, 62) if is_fundamental_discriminant(d)] == [
        5,
        8,
        12,
        13,
        17,
        21,
        24,
        28,
        29,
        33,
        37,
        40,
        41,
        44,
        53,
        56,
        57,
        60,
        61,
    ]


@given(st.integers(-(10**12), 10**12))
def test_parts_large(D):
    if not is_discriminant(D):
        return
    dK, f = discriminant_parts(D)
    assert f * f * dK == D and brute_is_fundamental(dK)


def test_parts_of_known_orders():
    # Z[√−3]: D = −12 = 2²·(−3); Z[3i]: D = −36 = 3²·(−4); Z[√5]: 20 = 2²·5 (Cox §7, from memory)
    assert discriminant_parts(-12) == (-3, 2)
    assert discriminant_parts(-36) == (-4, 3)
    assert discriminant_parts(20) == (5, 2)
    assert discriminant_parts(-4 * 10**6) == (-4, 1000)


@pytest.mark.parametrize("fn", [discriminant_parts, fundamental_discriminant, conductor, kronecker_character])
@pytest.mark.parametrize("bad", [-22, 0, 49, -23.0, "5"])
def test_parts_bad_input(fn, bad):
    with pytest.raises(FormkitError):
        fn(bad)


def test_is_fundamental_on_non_discriminants():
    assert not is_fundamental_discriminant(-22)
    assert not is_fundamental_discriminant(1)
    assert not is_fundamental_discriminant(2.5)


# --- the Kronecker character ------------------------------------------------------------


def test_kronecker_character_against_sympy():
    for D in (-3, -4, -23, -56, -108, 5, 12, 40, 229, 1000):
        chi = kronecker_character(D)
        for n in range(-30, 60):
            assert chi(n) == kronecker_symbol(D, n)


@pytest.mark.parametrize("D", [-3, -4, -7, -8, -15, -20, -84, 5, 8, 12, 13, 28, 60, 65])
def test_kronecker_character_is_a_character_mod_D(D):
    # for fundamental D, χ_D is a primitive character mod |D| with χ_D(−1) = sign(D)
    # (Cohen GTM 138, §5.1, from memory); check multiplicativity and periodicity directly
    chi = kronecker_character(D)
    N = abs(D)
    for m in range(1, 40):
        for n in range(1, 40):
            assert chi(m * n) == chi(m) * chi(n)
        assert chi(m + N) == chi(m)
    assert chi(-1) == (1 if D > 0 else -1)


def test_kronecker_character_bad_argument():
    with pytest.raises(NotAnIntegerError):
        kronecker_character(-23)(2.0)


# --- units of imaginary orders ------------------------------------------------------------


def brute_unit_count(D: int) -> int:
    """Units of Z[(D + √D)/2] are the solutions of N(x + yω) = 1, i.e. representations of 1
    by the principal form x² + bxy + cy² (b = D mod 2)."""
    b = D % 2
    c = (b - D) // 4
    return sum(1 for x in range(-3, 4) for y in range(-3, 4) if x * x + b * x * y + c * y * y == 1)


def test_units_of_gaussian_and_eisenstein_integers():
    # Z[i] has the 4 units ±1, ±i; Z[ω] has the 6 units ±1, ±ω, ±ω² (classical, from memory)
    assert unit_count(-4) == 4 == brute_unit_count(-4)
    assert unit_count(-3) == 6 == brute_unit_count(-3)
    gaussian = {(x, y) for x in range(-2, 3) for y in range(-2, 3) if x * x + y * y == 1}
    assert gaussian == {(1, 0), (-1, 0), (0, 1), (0, -1)}


def test_unit_count_brute_force():
    for D in NONSQUARE:
        if D < 0:
            assert unit_count(D) == brute_unit_count(D), D


@pytest.mark.parametrize("bad", [5, 12, -22, 0, -3.0])
def test_unit_count_bad_input(bad):
    with pytest.raises(FormkitError):
        unit_count(bad)


# --- fundamental units of real orders and Pell's equation ---------------------------------

# Fundamental solutions of x² − d y² = ±1 (classical values, from memory; e.g. the tables
# in Cohen GTM 138 §5.7 and in texts on Pell's equation).
PELL = {
    # d: ((x, y) for +1, (x, y) for −1 or None)
    2: ((3, 2), (1, 1)),
    3: ((2, 1), None),
    7: ((8, 3), None),
    13: ((649, 180), (18, 5)),
    29: ((9801, 1820), (70, 13)),
    34: ((35, 6), None),  # 34 has no solution of x² − 34y² = −1 (classical example)
    61: ((1766319049, 226153980), (29718, 3805)),
    109: ((158070671986249, 15140424455100), (8890182, 851525)),
    991: ((379516400906811930638014896080, 12055735790331359447442538767), None),
}


@pytest.mark.parametrize("d", sorted(PELL))
def test_pell_classical_values(d):
    plus, minus = PELL[d]
    e = fundamental_unit(4 * d)  # the order Z[√d]: ε = t/2 + u√d
    assert e.t % 2 == 0
    x, y = e.t // 2, e.u
    if minus is None:
        assert e.norm == 1 and (x, y) == plus
    else:
        assert e.norm == -1 and (x, y) == minus
        # the +1 solution is ε²
        assert (x * x + d * y * y, 2 * x * y) == plus
    assert x * x - d * y * y == e.norm


def test_pell_against_sympy_diop_DN():
    # sympy's diop_DN(d, ±1) returns the fundamental solutions (continued fractions)
    for d in range(2, 400):
        if math.isqrt(d) ** 2 == d:
            continue
        e = fundamental_unit(4 * d)
        x, y = e.t // 2, e.u
        minus = diop_DN(d, -1)
        if e.norm == -1:
            assert minus == [(x, y)], d
        else:
            assert minus == [] and diop_DN(d, 1) == [(x, y)], d


def brute_fundamental_unit(D: int, u_max: int) -> tuple[int, int] | None:
    """Smallest u in [1, u_max] (then t ≥ 1) with t² − D u² = ±4, or None."""
    for u in range(1, u_max + 1):
        for sign in (-4, 4):
            t2 = D * u * u + sign
            if t2 > 0 and math.isqrt(t2) ** 2 == t2:
                return math.isqrt(t2), u
    return None


def test_fundamental_unit_brute_force():
    # brute force up to u = 3000: equal when the unit is that small, else no smaller solution
    for D in NONSQUARE:
        if 0 < D <= 400:
            e = fundamental_unit(D)
            assert e.t * e.t - D * e.u * e.u == 4 * e.norm
            found = brute_fundamental_unit(D, min(e.u, 3000))
            if e.u <= 3000:
                assert found == (e.t, e.u), D
            else:
                assert found is None, D


def test_golden_ratio_and_silver_ratio():
    # Z[(1+√5)/2]: ε = (1 + √5)/2 of norm −1; Z[√2]: ε = 1 + √2 (classical)
    assert fundamental_unit(5) == QuadraticUnit(5, 1, 1) and fundamental_unit(5).norm == -1
    assert fundamental_unit(8) == QuadraticUnit(8, 2, 1)


def test_fundamental_unit_with_thousands_of_digits():
    # p = 10000141 is prime, ≡ 1 mod 4; the unit of Z[√p] has 2456 digits (found by search;
    # checked exactly here and against sympy's diop_DN)
    p = 10000141
    assert sympy.isprime(p)
    e = fundamental_unit(4 * p)
    x, y = e.t // 2, e.u
    assert len(str(x)) >= 2000
    assert e.t * e.t - 4 * p * e.u * e.u == -4  # exact: t² − D u² = −4
    assert x * x - p * y * y == -1
    assert diop_DN(p, -1) == [(x, y)]


def test_fundamental_unit_with_norm_plus_one_and_many_digits():
    p = 10000139  # prime ≡ 3 mod 4: no unit of norm −1 in Z[√p]
    e = fundamental_unit(4 * p)
    assert e.norm == 1 and len(str(e.t)) > 1000
    assert e.t * e.t - 4 * p * e.u * e.u == 4
    assert diop_DN(p, 1) == [(e.t // 2, e.u)]


@pytest.mark.parametrize("bad", [-23, -4, 0, 4, 10, 11, 2.0, "5"])
def test_fundamental_unit_bad_input(bad):
    with pytest.raises(FormkitError):
        fundamental_unit(bad)
    with pytest.raises(FormkitError):
        regulator(bad)


# --- regulators ---------------------------------------------------------------------------


def test_regulator_classical_values():
    # log((1+√5)/2) = 0.48121182505960344749775891342436842313518433438566...,
    # log(1+√2) = 0.88137358701954302523260932497979230902816032826163... (from memory)
    R5 = regulator(5, digits=50)
    R8 = regulator(8, digits=50)
    with mpmath.workdps(60):
        assert (
            abs(R5 - mpmath.mpf("0.48121182505960344749775891342436842313518433438566"))
            < mpmath.mpf(10) ** -49
        )
        assert (
            abs(R8 - mpmath.mpf("0.88137358701954302523260932497979230902816032826163"))
            < mpmath.mpf(10) ** -49
        )


@pytest.mark.parametrize("D", [5, 12, 13, 61 * 4, 229, 991 * 4, 4 * 10000141, 4 * 10000139])
@pytest.mark.parametrize("digits", [15, 40])
def test_regulator_precision_verified_independently(D, digits):
    # independent formula: ε = (t + √(t² − 4N))/2, so R = acosh(t/2) for N = +1 and
    # asinh(t/2) for N = −1; evaluated here at 30 more digits
    e = fundamental_unit(D)
    R = regulator(D, digits=digits)
    with mpmath.workdps(digits + 30):
        ref = mpmath.acosh(mpmath.mpf(e.t) / 2) if e.norm == 1 else mpmath.asinh(mpmath.mpf(e.t) / 2)
        assert abs(R - ref) <= mpmath.mpf(10) ** (-digits + 1) * abs(ref)


def test_regulator_large_unit_size_matches_digits():
    # the regulator of the 2456-digit unit is about 2456·log(10)
    e = fundamental_unit(4 * 10000141)
    R = regulator(4 * 10000141, digits=20)
    assert abs(R / mpmath.log(10) - (len(str(e.t // 2)) - 0.5)) < 1


@pytest.mark.parametrize("bad", [0, -3, 2.5, "30"])
def test_regulator_bad_digits(bad):
    with pytest.raises(FormkitError):
        regulator(5, digits=bad)


def test_unit_value_type():
    e = fundamental_unit(13)
    assert e == QuadraticUnit(13, 3, 1) and hash(e) == hash(QuadraticUnit(13, 3, 1))
    assert repr(e) == "QuadraticUnit(D=13, t=3, u=1, norm=-1)"
    assert "\\sqrt{13}" in e._repr_latex_()
    with pytest.raises(AttributeError):
        e.t = 5  # frozen


@pytest.mark.parametrize(
    "args, err",
    [
        ((5, 2, 1), FormkitError),  # 4 − 5 = −1: t² − D u² must be ±4
        ((-3, 1, 1), DiscriminantError),
        ((7, 1, 1), DiscriminantError),
        ((5, 1.0, 1), NotAnIntegerError),
        ((5, 1, "1"), NotAnIntegerError),
    ],
)
def test_unit_value_type_bad_input(args, err):
    with pytest.raises(err):
        QuadraticUnit(*args)
