"""Series over the classes: Σ Z_C = w·ζ_K, class group and genus characters, Chowla–Selberg.

Outside references: the factorisation ζ_K = ζ·L(χ_D) and Kronecker's factorisation of
genus-character L-series (theorems, Zagier, *Zetafunktionen und quadratische Körper*
§11–12, from memory) — each side is computed independently; mpmath's ``zeta`` and
``dirichlet``; |η(i)| = Γ(1/4)/(2π^(3/4)) (from memory); the functional equation of
L(s, ψ) for class group characters (Hecke; from memory).
"""

from __future__ import annotations

import mpmath
import pytest

from formkit.analytic.balls import as_complex_argument
from formkit.classgroups.class_series import (
    chowla_selberg,
    class_character_l_series,
    class_zeta_sum,
    genus_character_discriminants,
    genus_character_l_series,
    prime_discriminants,
)
from formkit.core.arith import kronecker
from formkit.errors import DiscriminantError, FormkitError


@pytest.mark.parametrize("D, s", [(-23, 2), (-84, "0.5+3i"), (-47, "1/2"), (-3, "-1/2"), (-104, "0.8")])
def test_class_zeta_sum(D, s):
    r = class_zeta_sum(D, s, digits=20)
    assert r.agrees
    assert "unconditional" in r.provenance


def test_class_zeta_sum_against_mpmath():
    r = class_zeta_sum(-20, 3, digits=20)
    with mpmath.workdps(30):
        chi = [kronecker(-20, n) for n in range(20)]
        ref = 2 * mpmath.zeta(3) * mpmath.dirichlet(3, chi)
        assert abs(r.left.value - ref) < 10**-18


def test_prime_discriminants():
    # products of prime discriminants (p* ≡ 1 mod 4, and −4, ±8): checked by multiplying out
    for D in (-3, -4, -8, 8, -84, -420, 5, 12, 24, -120, 1365):
        ps = prime_discriminants(D)
        prod = 1
        for p in ps:
            prod *= p
            assert p % 4 in (0, 1)
        assert prod == D
    with pytest.raises(DiscriminantError):
        prime_discriminants(-12 * 4)


@pytest.mark.parametrize("D", [-20, -84, -195])
@pytest.mark.parametrize("s", ["5/2", "0.7+1i", 1])
def test_genus_character_factorisation(D, s):
    _check_factorisation(D, s)


@pytest.mark.slow
@pytest.mark.parametrize("D", [-420, -1155, -1320])
@pytest.mark.parametrize("s", [2, "0.7+1i", 1, "-1/2"])
def test_genus_character_factorisation_more(D, s):
    _check_factorisation(D, s)


def _check_factorisation(D, s):
    pairs = genus_character_discriminants(D)
    assert len(pairs) == 2 ** (len(prime_discriminants(D)) - 1)
    for d1, d2 in pairs:
        if as_complex_argument(s).real == 1 and 1 in (d1, d2):
            continue
        r = genus_character_l_series(D, d1, s, digits=15)
        assert r.agrees, (D, d1, d2, s)


def test_class_group_characters_are_genus_characters_when_two_torsion():
    # Cl(−84) ≅ C2 × C2: its four characters are the genus characters (genus theory)
    D = -84
    products = []
    for d1, _d2 in genus_character_discriminants(D):
        products.append(genus_character_l_series(D, d1, 3, digits=12).right.value)
    for chi in ([0, 0], [1, 0], [0, 1], [1, 1]):
        v = class_character_l_series(D, chi, 3, digits=12).value
        assert any(abs(v - p) < 10**-10 for p in products), chi


@pytest.mark.parametrize("D, chi", [(-23, [1]), (-47, [2]), (-56, [1])])
def test_class_character_functional_equation(D, chi):
    # Λ(s, ψ) = (√|D|/2π)^s Γ(s) L(s, ψ) satisfies Λ(s, ψ) = Λ(1 − s, ψ̄) and L(s, ψ̄) = L(s, ψ)
    s = as_complex_argument("0.3+1i")
    a = class_character_l_series(D, chi, s, digits=18)
    b = class_character_l_series(D, chi, 1 - s, digits=18)
    with mpmath.workdps(30):
        t = mpmath.mpc(0.3, 1)
        c = mpmath.sqrt(-D) / (2 * mpmath.pi)
        left = c**t * mpmath.gamma(t) * a.value
        right = c ** (1 - t) * mpmath.gamma(1 - t) * b.value
        assert abs(left - right) < 10**-15 * abs(left)


def test_class_character_errors():
    with pytest.raises(FormkitError, match="exponents"):
        class_character_l_series(-84, [1], 2)
    with pytest.raises(FormkitError, match="pole"):
        class_character_l_series(-23, [0], 1)
    # D > 0: the message names the function for it
    with pytest.raises(DiscriminantError, match="real_class_zeta_sum"):
        class_zeta_sum(5, 2)
    with pytest.raises(FormkitError, match="split"):  # an order: d1 must split D (order_series' rule)
        genus_character_l_series(-36, 5, 2)
    with pytest.raises(FormkitError, match="split"):
        genus_character_l_series(-84, 5, 2)


@pytest.mark.parametrize("D", [-3, -4, -7, -8, -11, -19, -43, -67, -163])
def test_chowla_selberg_class_number_one(D):
    r = chowla_selberg(D, digits=25)
    assert r.agrees and r.class_number == 1


def test_chowla_selberg_eta_of_i_and_larger_h():
    r = chowla_selberg(-4, digits=25)
    with mpmath.workdps(35):
        eta_i = mpmath.gamma(0.25) / (2 * mpmath.pi**0.75)
        assert abs(r.left.value - eta_i**2) < 10**-24  # Im τ = 1
    for D in (-23, -84, -420):
        assert chowla_selberg(D, digits=20).agrees
