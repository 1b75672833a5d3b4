"""Dirichlet series of orders: Σ_C Z_C = w·ζ_K·∏ e_p, genus and ring class characters of orders.

Outside references: mpmath's ζ and Dirichlet L-series (``mpmath.dirichlet``); brute-force
counts of the invertible ideals of an order (the lattices ``m·[a, (−b + √D)/2]``,
``b² ≡ D (mod 4a)``, invertible iff ``gcd(a, b, c) = 1``; Cohen GTM 138 §5.2, from memory);
Dedekind–Kummer factorisation of a cubic polynomial modulo p with sympy (the cubic field
inside the ring class field); the class number formula for orders (Cox, Thm 7.24) against
enumerated class numbers; the classical Σ'(x² + 3y²)^(−s) = 2(1 + 2^(1−2s))ζ(s)L(s, χ₋₃)
(from memory).
"""

from __future__ import annotations

import cmath
import itertools
import math
from fractions import Fraction

import mpmath
import pytest

from formkit.analytic.epstein import epstein_zeta
from formkit.analytic.l_series import l_series
from formkit.classgroups.dispatch import class_group
from formkit.classgroups.genus import value_prime_to
from formkit.classgroups.order_series import (
    _local_factors,
    order_genus_character_discriminants,
    order_genus_character_l_series,
    order_local_factors,
    order_zeta_sum,
    ring_class_l_series,
)
from formkit.core.arith import kronecker
from formkit.core.discriminants import discriminant_parts, is_fundamental_discriminant, unit_count
from formkit.core.forms import Form
from formkit.errors import DiscriminantError, FormkitError

# the discriminants named in the issue, and a few with p^2 | f or two primes in f
ORDERS = [-12, -16, -27, -28, -36, -44, -48, -63, -72, -75, -99, -108, -192, -196, -243, -400]
SAMPLE = [-12, -36, -48, -63, -400]


def _dirichlet(d: int, s):
    """mpmath's L(s, χ_d) (ζ for d = 1)."""
    if d == 1:
        return mpmath.zeta(s)
    return mpmath.dirichlet(s, [kronecker(d, n) for n in range(abs(d))])


def _e_p_value(e, s):
    return sum(complex(c) * complex(e.prime) ** (-s * i) for i, c in enumerate(e.coefficients()))


@pytest.mark.parametrize(
    "D", [pytest.param(D, marks=[] if D in SAMPLE else [pytest.mark.slow]) for D in ORDERS]
)
def test_class_sum_against_mpmath(D):
    # Σ_C Z_C(s) by the Epstein zeta functions of the enumerated classes against
    # w·ζ(s)·L(s, χ_dK) from mpmath times the factors e_p
    s = mpmath.mpf(5) / 2
    G = class_group(D, method="enumeration")
    left = sum(mpmath.mpf(str(epstein_zeta(x.form, "5/2", digits=25).value)) for x in G.elements())
    d_K, _f = discriminant_parts(D)
    with mpmath.workdps(30):
        right = unit_count(D) * mpmath.zeta(s) * _dirichlet(d_K, s)
        for e in order_local_factors(D):
            right *= _e_p_value(e, 2.5).real
    assert abs(left - right) < 1e-13 * abs(left)
    r = order_zeta_sum(D, "5/2", digits=20)
    assert r.agrees


def test_classical_x2_plus_3y2():
    # Σ'(x² + 3y²)^(−s) = 2(1 + 2^(1−2s))ζ(s)L(s, χ₋₃) (classical, from memory), also at a complex s
    for s in ("2", "3/2+2i"):
        z = complex(epstein_zeta((1, 0, 3), s, digits=20).value)
        sv = complex(mpmath.mpmathify(s.replace("i", "j").replace("3/2", "1.5")))
        with mpmath.workdps(25):
            ref = complex(2 * (1 + mpmath.power(2, 1 - 2 * sv)) * mpmath.zeta(sv) * _dirichlet(-3, sv))
        assert abs(z - ref) < 1e-15 * abs(ref)
    (e,) = order_local_factors(-12)
    assert e.text() == "1 + 2X^2"


def _invertible_ideals_by_class(D: int, n: int, G) -> dict:
    """Brute force: the invertible ideals of norm n of the order of discriminant D, counted per class."""
    out: dict = {}
    for m in range(1, math.isqrt(n) + 1):
        if n % (m * m):
            continue
        a = n // (m * m)
        for b in range(2 * a):
            if (b * b - D) % (4 * a):
                continue
            c = (b * b - D) // (4 * a)
            if math.gcd(math.gcd(a, b), c) != 1:
                continue
            x = G(Form(a, b, c))
            out[x] = out.get(x, 0) + 1
    return out


@pytest.mark.parametrize("D", [-12, -16, -27, -48, -63, -99, -192, -243, -400, -176, 48, 45, 32, 72, 180])
def test_local_factor_counts_invertible_ideals(D):
    # the coefficients of Z_p(s, ψ) = e_p(s, ψ)/∏_{𝔭|p}(1 − ψ(𝔭)N𝔭^(−s)) are the ψ-weighted counts of the
    # invertible ideals of norm p^j (brute force), for every character ψ of Cl(D) and p | f
    G = class_group(D, method="enumeration")
    inv = G.invariants
    _d_K, f = discriminant_parts(D)
    for ks in itertools.product(*[range(n) for n in inv]):

        def psi(x, ks=ks):
            e = G.discrete_log(x)
            return cmath.exp(2j * math.pi * sum(k * ei / n for k, ei, n in zip(ks, e, inv)))

        for e in order_local_factors(D, ks):
            p, top = e.prime, 2 * e.exponent + 3
            counts = []
            for j in range(top + 1):
                by_class = _invertible_ideals_by_class(D, p**j, G)
                counts.append(sum(psi(x) * k for x, k in by_class.items()))
            # Z_p as a power series in X: e_p(X) / P(X), P the Euler polynomial of ψ at p
            if e.conductor_exponent:
                P = [1]
            elif e.chi == -1:
                P = [1, 0, -1]
            else:
                z = cmath.exp(2j * math.pi * float(e.prime_phase))
                P = [1, -z] if e.chi == 0 else [1, -(z + 1 / z), 1]
            num = [complex(c) for c in e.coefficients()] + [0] * (top + 1)
            series = []
            for j in range(top + 1):
                v = num[j] - sum(P[i] * series[j - i] for i in range(1, len(P)) if j - i >= 0)
                series.append(v)
            assert all(abs(a - b) < 1e-9 for a, b in zip(series, counts)), (D, ks, p, series, counts)
    assert f > 1


@pytest.mark.parametrize(
    "D",
    [
        D
        for D in range(-500, 0)
        if D % 4 in (0, 1) and not is_fundamental_discriminant(D) and math.isqrt(-D) ** 2 != -D
    ][::7],
)
def test_residue_gives_the_class_number_formula(D):
    # Res_{s=1} Σ_C Z_C = h·2π/√|D| and Res of w·ζ_K·∏ e_p = w·L(1, χ_dK)·∏ e_p(1): so
    # h(D) = w·√|D|·L(1, χ_dK)·∏ e_p(1)/(2π) (Cox Thm 7.24), against the enumerated h
    d_K, _f = discriminant_parts(D)
    L1 = float(l_series(d_K, 1, digits=20).value)
    prod = 1.0
    for e in order_local_factors(D):
        prod *= _e_p_value(e, 1).real
        assert abs(_e_p_value(e, 1) - (1 - kronecker(d_K, e.prime) / e.prime)) < 1e-12
    h = unit_count(D) * math.sqrt(-D) * L1 * prod / (2 * math.pi)
    assert abs(h - class_group(D, method="enumeration").order) < 1e-9


@pytest.mark.parametrize(
    "D", [pytest.param(D, marks=[] if D in SAMPLE else [pytest.mark.slow]) for D in ORDERS]
)
def test_genus_characters_of_orders(D):
    G = class_group(D, method="enumeration")
    for d1, d2 in order_genus_character_discriminants(D):
        # genus theory for orders: χ_d1 is constant on the values prime to D of each class and equals χ_d2 there
        for x in G.elements():
            f = x.form
            vals = {
                kronecker(d1, m)
                for m in (f(u, v) for u in range(-4, 5) for v in range(-4, 5))
                if m > 0 and math.gcd(m, D) == 1
            }
            m0, _, _ = value_prime_to(f, D)
            assert vals == {kronecker(d1, m0)} and kronecker(d1, m0) == kronecker(d2, m0)
        r = order_genus_character_l_series(D, d1, "5/2", digits=20)
        assert r.agrees, (D, d1)
    # the right side once against mpmath: L(s, χ_d1*)·L(s, χ_d2*)·∏ e_p(s, ψ), d* the field discriminants
    d1, d2 = order_genus_character_discriminants(D)[-1]
    r = order_genus_character_l_series(D, d1, 3, digits=20)
    star = [1 if d > 0 and math.isqrt(d) ** 2 == d else discriminant_parts(d)[0] for d in (d1, d2)]

    def phase(x):
        m, _, _ = value_prime_to(x.form, D)
        return Fraction(0) if kronecker(d1, m) == 1 else Fraction(1, 2)

    with mpmath.workdps(25):
        ref = complex(_dirichlet(star[0], 3) * _dirichlet(star[1], 3))
    for e in _local_factors(D, phase):
        ref *= _e_p_value(e, 3)
    assert abs(complex(r.right.value) - ref) < 1e-15 * abs(ref)
    assert abs(complex(r.left.value) - ref) < 1e-15 * abs(ref)


def _cubic_l_value(coeffs: tuple[int, ...], s: int, P: int) -> float:
    """ζ_F(s)/ζ(s) for the cubic field F = Q[x]/(g) by its Euler product over p < P (Dedekind–Kummer with
    sympy's factorisation mod p; g has index 1, so every p is allowed)."""
    import sympy

    x = sympy.symbols("x")
    g = sum(c * x**i for i, c in enumerate(coeffs))
    val = 1.0
    for p in sympy.primerange(2, P):
        degs = [
            sympy.Poly(h, x, modulus=p).degree() for h, _e in sympy.Poly(g, x, modulus=p).factor_list()[1]
        ]
        loc = 1.0 - p**-s
        for d in degs:
            loc /= 1.0 - p ** (-s * d)
        val *= loc
    return val


def test_ring_class_characters_against_cubic_fields():
    # the cubic ring class characters of Q(√−11) (conductor 2) and Q(√−3) (conductor 6): L(s, ψ) = ζ_F(s)/ζ(s)
    # for the cubic fields of discriminant −44 (x³ − x² + x + 1) and −108 (x³ − 2) (from memory; their
    # discriminants are checked with sympy)
    import sympy

    x = sympy.symbols("x")
    assert sympy.discriminant(x**3 - x**2 + x + 1, x) == -44 and sympy.discriminant(x**3 - 2, x) == -108
    cubic = {-44: (1, 1, -1, 1), -108: (-2, 0, 0, 1)}
    ref = {d: _cubic_l_value(c, 4, 3000) for d, c in cubic.items()}
    for D, field, conductor in ((-44, -44, 2), (-176, -44, 2), (-108, -108, 6), (-432, -108, 6)):
        G = class_group(D, method="enumeration")
        k = [G.invariants[0] // 3] + [0] * (len(G.invariants) - 1)
        r = ring_class_l_series(D, k, 4, digits=15)
        assert r.conductor == conductor and r.character_discriminant == field
        assert abs(float(r.primitive.value.real) - ref[field]) < 1e-9
    # the order of conductor 4 in Q(√−11): e_2 = 1 + 2X² for the character of conductor 2
    r = ring_class_l_series(-176, [2], 4, digits=15)
    (e,) = r.factors
    assert e.text() == "1 + 2X^2"


def test_positive_discriminants():
    for D in (32, 48, 45):
        assert order_zeta_sum(D, 4, bound=2000, digits=12).agrees
        for d1, _d2 in order_genus_character_discriminants(D):
            assert order_genus_character_l_series(D, d1, 4, bound=2000, digits=12).agrees


def test_errors():
    with pytest.raises(DiscriminantError, match="fundamental"):
        order_zeta_sum(-23, 2)
    with pytest.raises(FormkitError, match="split"):
        order_genus_character_l_series(-63, 5, 2)
    with pytest.raises(FormkitError, match="pole"):
        order_zeta_sum(-12, 1)
    with pytest.raises(FormkitError, match="pole"):
        order_genus_character_l_series(-36, -4, 1)  # (−4, 9) is the trivial character of Cl(−36)
    with pytest.raises(FormkitError, match="exponents"):
        order_local_factors(-63, [1, 0])
    with pytest.raises(FormkitError, match="real s > 1"):  # a bound selects direct summation
        order_genus_character_l_series(48, -3, "1/2", bound=1000)


def test_real_orders_continued_to_complex_s():
    # D > 0 without a bound: the analytic continuation; the sum over the narrow classes of the
    # order equals ζ_K(s)·∏ e_p(s) and the genus identity holds at complex s and s < 0
    # (two independent routes: the continued partial zeta values and mpmath-checked ζ_K)
    assert order_zeta_sum(20, "1/2+2i", digits=15).agrees
    assert order_zeta_sum(45, -1, digits=15).agrees
    assert order_genus_character_l_series(48, -3, "1/2", digits=15).agrees
