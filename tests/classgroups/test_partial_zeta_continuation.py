"""The analytic continuation of ζ(s, C) and L(s, ψ) for D > 0 (classgroups.partial_zeta_continuation).

Outside references: mpmath's zeta and dirichlet (general-purpose library) for
ζ_K(s) = ζ(s)·L(s, χ_D) and Kronecker's factorisation L(s, ψ_{d₁,d₂}) = L(s, χ_{d₁})L(s, χ_{d₂})
(Zagier §12, from memory); Siegel's formula ζ_K(−1) = (1/60)·Σ_{b² < D, b ≡ D (2)} σ₁((D − b²)/4)
(Siegel 1969 / Zagier, from memory); Euler products over the prime forms (an independent
route at complex s with Re s > 1); formkit's direct summation (an independent algorithm) at
real s > 1.
"""

from __future__ import annotations

import cmath
import math

import mpmath
import pytest

from formkit import class_group
from formkit.analytic.balls import as_complex_argument
from formkit.classgroups import partial_zeta_continuation as cont
from formkit.classgroups.partial_zeta import partial_zeta_values, real_genus_character_l_series
from formkit.classgroups.partial_zeta_continuation import (
    character_signature,
    continued_class_character_l_series,
)
from formkit.core.arith import kronecker


def _dirichlet(d: int, s):
    return mpmath.zeta(s) if d == 1 else mpmath.dirichlet(s, [kronecker(d, n) for n in range(abs(d))])


def _num(s: str):
    """The exact argument as an mpmath number (parts from formkit's exact parser)."""
    a = as_complex_argument(s)
    x = mpmath.mpf(a.real.numerator) / a.real.denominator
    y = mpmath.mpf(a.imag.numerator) / a.imag.denominator
    return x if y == 0 else mpmath.mpc(x, y)


def _total(z):
    with mpmath.workdps(40):
        return sum(mpmath.mpc(v.value) for v in z.values), sum(v.error_bound for v in z.values)


@pytest.mark.parametrize(
    ("D", "s"),
    [(D, s) for D in (5, 8, 12, 13, 21, 40, 229) for s in ("1/2", "1/2+14i", "3+i")]
    + [(5, "-3/2+2i"), (12, "-3/2+2i"), (13, "-5/2-i")],  # mpmath.dirichlet is slow at Re s < 0
)
def test_sum_over_classes_is_dedekind_zeta(D, s):
    z = partial_zeta_values(D, s, digits=20)
    with mpmath.workdps(30):
        sm = _num(s)
        ref = _dirichlet(1, sm) * _dirichlet(D, sm)
        total, err = _total(z)
        assert abs(total - ref) <= err * (1 + 1e-9) + mpmath.mpf(10) ** -25, (D, s, total, ref)


@pytest.mark.parametrize("D", [5, 8, 12, 13, 21, 24, 28, 40, 60, 229])
def test_siegel_formula_at_minus_one(D):
    # ζ_K(−1) = (1/60)·Σ_{b² < D, b ≡ D mod 2} σ₁((D − b²)/4)  (Siegel/Zagier, from memory)
    from sympy import divisor_sigma

    b0 = D % 2
    siegel = sum(
        int(divisor_sigma((D - b * b) // 4))
        for b in range(-math.isqrt(D), math.isqrt(D) + 1)
        if b % 2 == b0 and b * b < D
    )
    z = partial_zeta_values(D, -1, digits=25)
    total, err = _total(z)
    with mpmath.workdps(30):
        assert abs(total - mpmath.mpf(siegel) / 60) <= err * (1 + 1e-9), (D, total, siegel)
    # and ζ(−1)·L(−1, χ_D) = −L(−1, χ_D)/12 by mpmath
    with mpmath.workdps(30):
        assert abs(total - _dirichlet(1, -1) * _dirichlet(D, -1)) <= err * (1 + 1e-9) + 1e-25


@pytest.mark.parametrize("D", [5, 12, 13, 229])
@pytest.mark.parametrize("n", [2, 3])
def test_negative_integers(D, n):
    z = partial_zeta_values(D, -n, digits=20)
    total, err = _total(z)
    with mpmath.workdps(30):
        ref = _dirichlet(1, -n) * _dirichlet(D, -n)  # 0 for even n (trivial zeros of ζ)
        assert abs(total - ref) <= err * (1 + 1e-9) + 1e-25


@pytest.mark.parametrize("D", [12, 20, 45, 229, 316])
def test_against_direct_summation(D):
    # per class, at s = 4: the continuation and the direct sum (explicit tail bound) overlap
    a = partial_zeta_values(D, 4, digits=25)
    b = partial_zeta_values(D, 4, bound=3000, digits=25)
    assert a.classes == b.classes
    for u, v in zip(a.values, b.values):
        assert abs(mpmath.mpf(u.value) - mpmath.mpf(v.value)) <= u.error_bound + v.error_bound
        assert u.digits == 25


def _euler_product(D: int, k: list[int], s: complex, P: int = 5000) -> complex:
    """L(s, ψ) = ∏_p local factors, ψ(𝔭) from the prime forms of formkit's class group."""
    from sympy import primerange

    G = class_group(D, method="enumeration")
    inv = G.invariants
    out = 1.0 + 0j
    for p in primerange(2, P):
        c = kronecker(D, p)
        if c == -1:
            out /= 1 - p ** (-2.0 * s)
            continue
        e = G.discrete_log(G.prime_form(p))
        psi = cmath.exp(2j * math.pi * sum(ki * ei / ni for ki, ei, ni in zip(k, e, inv)))
        if c == 0:
            out /= 1 - psi * p ** (-s)
        else:
            out /= (1 - psi * p ** (-s)) * (1 - psi.conjugate() * p ** (-s))
    return out


@pytest.mark.parametrize(("D", "k"), [(229, [1]), (229, [2]), (316, [1]), (12, [1]), (145, [1])])
def test_complex_characters_against_euler_products(D, k):
    # Re s = 5: the product over p < 5000 is good to ~1e-14
    v = continued_class_character_l_series(D, k, "5+3i", digits=20)
    ref = _euler_product(D, k, 5 + 3j)
    assert abs(complex(v) - ref) < 1e-12, (D, k, complex(v), ref)


@pytest.mark.parametrize(("D", "d1"), [(12, -3), (21, -3), (40, 5), (60, -4)])
@pytest.mark.parametrize("s", ["1/2+3i", "1", "-2"])
def test_genus_characters(D, d1, s):
    r = real_genus_character_l_series(D, d1, s, digits=20)
    assert r.agrees
    with mpmath.workdps(30):
        sm = _num(s)
        ref = _dirichlet(d1, sm) * _dirichlet(D // d1, sm)
        assert abs(mpmath.mpc(r.left.value) - ref) <= r.left.error_bound * (1 + 1e-9) + 1e-25


def test_signature_and_trivial_zeros():
    # Nε = −1 (D = 5, 13, 29): every character is even; ε = 2 + √3 (D = 12) and (5 + √21)/2
    # (D = 21) have norm +1 and Cl(D) = 1 < Cl⁺(D) = C2: the non-trivial character is odd
    assert character_signature(13, []) == 0
    assert character_signature(12, [1]) == 1 and character_signature(21, [1]) == 1
    assert all(character_signature(229, [k]) == 0 for k in range(3))
    # odd ψ: trivial zeros at s = −1, −3, …; even ψ at s = 0, −2, …
    assert continued_class_character_l_series(12, [1], -1).exact == 0
    assert continued_class_character_l_series(229, [1], -2).exact == 0
    assert continued_class_character_l_series(12, [1], -2).exact is None


def test_functional_equation_check_catches_a_wrong_signature(monkeypatch):
    # with the gamma factor of the wrong type the sums at t = 1 and t = 6/5 disagree
    monkeypatch.setattr(cont, "character_signature", lambda D, k: 0)
    with pytest.raises(ArithmeticError, match="disagree"):
        continued_class_character_l_series(12, [1], "1/2+i", digits=15)


@pytest.mark.slow
def test_larger_discriminant():
    z = partial_zeta_values(10001, "1/2+3i", digits=30)
    total, err = _total(z)
    with mpmath.workdps(40):
        ref = _dirichlet(1, mpmath.mpc(0.5, 3)) * _dirichlet(10001, mpmath.mpc(0.5, 3))
        assert abs(total - ref) <= err * (1 + 1e-9) + 1e-35
    assert all(v.digits == 30 for v in z.values)
