"""Tests of formkit.classgroups.genus against the classical theory and brute force.

Sources: Cox, *Primes of the Form x² + ny²* (the table of assigned characters before
Theorem 3.15; Theorem 3.15: 2^(μ−1) genera; Gauss's theorem that the principal genus
is the group of squares); Euler's list of idoneal numbers (Cox Prop. 3.24 and the
remark after it — from memory); the definition of the genus (forms in one genus take the
same values in (Z/DZ)^×) checked by brute force.
"""

from __future__ import annotations

from math import gcd

import pytest
from _foundation_strategies import brute_reduced_definite
from hypothesis import given
from hypothesis import strategies as st

from formkit.classgroups.dispatch import class_group
from formkit.classgroups.genus import (
    assigned_characters,
    genera,
    genus_count,
    genus_symbol,
    principal_genus,
    same_genus,
    value_prime_to,
)
from formkit.classgroups.principal_genus_theorem import principal_genus_is_squares
from formkit.core.arith import kronecker
from formkit.core.discriminants import is_discriminant
from formkit.core.forms import Form
from formkit.core.reduction import reduced, reduced_cycle
from formkit.errors import (
    DiscriminantError,
    DiscriminantMismatchError,
    FormError,
    FormkitError,
    NotAnIntegerError,
    NotPrimitiveError,
)

# ---------------------------------------------------------------------------
# brute force: reduced positive definite forms, and narrow classes for D > 0


def brute_classes_negative(D):
    """All primitive reduced positive definite forms of discriminant D (Gauss's bounds
    |b| ≤ a ≤ c, a ≤ √(|D|/3)); a plain scan."""
    return [Form(*f) for f in brute_reduced_definite(D, primitive=True)]


def brute_classes_positive(D):
    """One form per narrow class for D > 0: scan all forms (a, b, c) with small
    coefficients, reduce, group the reduced forms into cycles."""
    seen = set()
    reps = []
    lim = int(D**0.5) + 1
    for a in range(-lim, lim + 1):
        if a == 0:
            continue
        for b in range(lim + 1):
            if (b * b - D) % (4 * a):
                continue
            c = (b * b - D) // (4 * a)
            f = Form(a, b, c)
            if not f.is_primitive:
                continue
            r = reduced(f)
            if r in seen:
                continue
            cyc = reduced_cycle(r)
            seen.update(cyc.forms)
            reps.append(r)
    return reps


def brute_classes(D):
    return brute_classes_negative(D) if D < 0 else brute_classes_positive(D)


NEG = [d for d in range(-3, -400, -1) if is_discriminant(d)]
POS = [d for d in range(5, 300) if is_discriminant(d)]


def mu(D):
    return len(assigned_characters(D))


# ---------------------------------------------------------------------------
# the table of assigned characters


def cox_table(n):
    """Cox's table (before Theorem 3.15) for D = −4n: the characters at 2 by n mod 8."""
    r = n % 8
    if n % 4 == 3:
        return []
    if r in (1, 5):
        return ["delta"]
    if r == 2:
        return ["delta*epsilon"]
    if r == 6:
        return ["epsilon"]
    if r == 4:
        return ["delta"]
    return ["delta", "epsilon"]  # n ≡ 0 (mod 8)


@pytest.mark.parametrize("n", range(1, 200))
def test_two_adic_characters_follow_cox_table(n):
    # Source: Cox, table before Theorem 3.15, for D = −4n.
    D = -4 * n
    if not is_discriminant(D):
        pytest.skip("square")
    names = [c.name for c in assigned_characters(D) if c.prime == 2]
    assert names == cox_table(n)
    odd = [c.prime for c in assigned_characters(D) if c.prime != 2]
    assert odd == sorted({p for p in range(3, n + 1, 2) if n % p == 0 and all(p % q for q in range(2, p))})


def test_no_two_adic_character_for_odd_discriminants():
    for D in [-3, -7, -15, -23, 5, 13, 21, -99, 45]:
        assert all(c.prime != 2 for c in assigned_characters(D))


def test_character_values_match_formulas():
    # δ(n) = (−1)^((n−1)/2), ε(n) = (−1)^((n²−1)/8) (Cox §3); Legendre symbols by Euler's criterion.
    chars = {c.name: c for c in assigned_characters(-4 * 8 * 3)}  # n = 24 ≡ 0 mod 8: δ, ε and (·/3)
    for m in range(-41, 42, 2):
        if m % 3 == 0:
            continue
        assert chars["delta"](m) == (-1) ** (((m - 1) // 2) % 2)
        assert chars["epsilon"](m) == (-1) ** (((m * m - 1) // 8) % 2)
        assert chars["(n/3)"](m) == (1 if pow(m % 3, 1, 3) == 1 else -1)
    de = next(c for c in assigned_characters(-8) if c.name == "delta*epsilon")
    assert [de(m) for m in (1, 3, 5, 7)] == [1, 1, -1, -1]  # x² + 2y² takes 1, 3 mod 8
    with pytest.raises(FormkitError, match="prime to 2"):
        chars["delta"](4)


# ---------------------------------------------------------------------------
# the genus symbol is well defined (every value prime to D gives it)


@pytest.mark.parametrize("D", [-20, -56, -84, -96, -128, -135, -231, -420, 12, 40, 60, 105, 136, 221, 480])
def test_symbol_is_constant_on_values_prime_to_D(D):
    # Gauss / Cox Lemma 3.? : the assigned characters are constant on the values of a
    # form prime to D.  Brute force over a box.
    chars = assigned_characters(D)
    for f in brute_classes(D):
        s = genus_symbol(f)
        for x in range(-7, 8):
            for y in range(-7, 8):
                m = f(x, y)
                if m and gcd(m, D) == 1:
                    assert tuple(c(m) for c in chars) == s, (f, x, y)


def test_value_prime_to_large_modulus_uses_crt():
    # a form all of whose small values share primes with M
    M = 3 * 5 * 7 * 11 * 13 * 17 * 19 * 23
    f = Form(3 * 5 * 7 * 11, 1, 13 * 17 * 19 * 23)
    m, x, y = value_prime_to(f, M)
    assert m == f(x, y) and gcd(m, M) == 1


# ---------------------------------------------------------------------------
# number of genera, sizes, principal genus, definition by values mod D


@pytest.mark.parametrize("D", NEG + POS)
def test_number_of_genera_is_two_to_mu_minus_one(D):
    # Cox Theorem 3.15 (D = −4n) and its analogue for all D: the symbol map is onto a
    # subgroup of index 2 of {±1}^μ; all genera have the same number of classes.
    P = genera(D, forms=brute_classes(D))
    assert P.count == 2 ** (mu(D) - 1) == P.expected_count == genus_count(D)
    sizes = {len(g) for g in P}
    assert len(sizes) == 1
    assert P.principal.is_principal
    assert genus_symbol(Form.principal(D)) == P.principal.symbol


@pytest.mark.parametrize("D", NEG[::3] + POS[::3])
def test_genera_from_class_representatives_agree_with_brute_force(D):
    P = genera(D)
    Q = genera(D, forms=brute_classes(D))
    assert {g.symbol: len(g) for g in P} == {g.symbol: len(g) for g in Q}
    assert P.class_number == class_group(D).order


@pytest.mark.parametrize("D", [-20, -84, -56, -135, -231, -96, 40, 60, 105])
def test_genus_is_the_set_of_values_mod_D(D):
    # Definition (Gauss; Cox §3): forms are in the same genus iff they represent the same
    # values in (Z/DZ)^×; genera take disjoint sets of values.  Brute force in a box.
    N = abs(D)
    values = {}
    for f in brute_classes(D):
        vs = set()
        for x in range(-2 * N, 2 * N + 1):
            for y in range(-3, 4):
                m = f(x, y)
                if gcd(m, N) == 1:
                    vs.add(m % N)
        values[f] = frozenset(vs)
    for f in values:
        for g in values:
            if same_genus(f, g):
                assert values[f] == values[g]
            else:
                assert not (values[f] & values[g])


@pytest.mark.parametrize("D", [d for d in range(-3, -700, -1) if is_discriminant(d)][::2] + POS[::2])
def test_gauss_principal_genus_is_squares(D):
    # Gauss's theorem (Cox Theorem 3.15 proof / Theorem 6.1): principal genus = C(D)².
    assert principal_genus_is_squares(D)


@given(st.integers(min_value=3, max_value=5000))
def test_gauss_theorem_and_genus_is_homomorphism(absD):
    D = -absD
    if not is_discriminant(D):
        return
    G = class_group(D)
    els = list(G.elements())[:12]
    for x in els:
        for y in els:
            sx, sy, sxy = genus_symbol(x.form), genus_symbol(y.form), genus_symbol((x * y).form)
            assert sxy == tuple(u * v for u, v in zip(sx, sy))


def test_euler_idoneal_numbers():
    # Source (from memory): Euler's 65 idoneal numbers; n is idoneal iff every genus of
    # forms of discriminant −4n has a single class (Cox Prop. 3.24 and §3).
    idoneal = {
        1,
        2,
        3,
        4,
        5,
        6,
        7,
        8,
        9,
        10,
        12,
        13,
        15,
        16,
        18,
        21,
        22,
        24,
        25,
        28,
        30,
        33,
        37,
        40,
        42,
        45,
        48,
        57,
        58,
        60,
        70,
        72,
        78,
        85,
        88,
        93,
        102,
        105,
        112,
        120,
        130,
        133,
        165,
        168,
        177,
        190,
        210,
        232,
        240,
        253,
        273,
        280,
        312,
        330,
        345,
        357,
        385,
        408,
        462,
        520,
        760,
        840,
        1320,
        1365,
        1848,
    }
    assert len(idoneal) == 65
    found = set()
    for n in range(1, 1900):
        D = -4 * n
        if not is_discriminant(D):
            continue
        P = genera(D)
        if P.class_number == P.count:
            found.add(n)
    assert found == idoneal


def test_classical_examples():
    # Cox §2–3: D = −20: p = x² + 5y² iff p ≡ 1, 9 (mod 20); 2x² + 2xy + 3y² the other genus.
    P = genera(-20)
    assert [g.forms for g in P] == [(Form(1, 0, 5),), (Form(2, 2, 3),)]
    assert [c.name for c in P.characters] == ["(n/5)", "delta"]
    # D = −56: genera {x²+14y², 2x²+7y²}, {3x²±2xy+5y²} (Cox §3 example)
    assert set(principal_genus(-56).forms) == {Form(1, 0, 14), Form(2, 0, 7)}
    # D = −23: one genus of 3 classes
    assert genera(-23).count == 1 and genera(-23).class_number == 3
    d = genera(-84).to_dict()
    assert d["discriminant"] == -84 and d["characters"] == ["(n/3)", "(n/7)", "delta"]
    assert d["genera"][0] == {"symbol": [1, 1, 1], "forms": [[1, 0, 21]]}


def test_non_fundamental_discriminants():
    # D = −36 (conductor 3): x² + 9y² and 2x² + 2xy + 5y² are in different genera; the
    # product of the characters is not 1 here (unlike fundamental D) — still 2^(μ−1) genera.
    P = genera(-36)
    assert P.count == 2 and [c.name for c in P.characters] == ["(n/3)", "delta"]
    assert genus_symbol((2, 2, 5)) == (-1, 1)
    # D = −4·25, −27, −75·4 and D = 4·45 > 0
    for D in (-100, -27, -300, -108, 180, 125):
        assert genera(D, forms=brute_classes(D)).count == genus_count(D)


def test_same_genus_and_genus_of():
    P = genera(-56)
    assert P.genus_of((3, 2, 5)).symbol == (-1, -1)
    assert P.genus_of((14, 0, 1)).is_principal
    assert same_genus((3, 2, 5), (3, -2, 5))
    assert not same_genus((1, 0, 14), (3, 2, 5))
    assert repr(assigned_characters(-8)[0]) == "GenusCharacter(delta*epsilon)"
    assert "Legendre" in assigned_characters(-20)[0].formula


# ---------------------------------------------------------------------------
# bad input


def test_bad_input():
    with pytest.raises(DiscriminantError):
        assigned_characters(-22)
    with pytest.raises(DiscriminantError):
        genera(16)
    with pytest.raises(NotAnIntegerError):
        genus_count(2.5)
    with pytest.raises(NotPrimitiveError, match="content 2"):
        genus_symbol((2, 2, 6))
    with pytest.raises(FormError, match="negative definite"):
        genus_symbol((-1, 0, -5))
    with pytest.raises(DiscriminantError):
        genus_symbol((1, 2, 1))
    with pytest.raises(DiscriminantMismatchError):
        same_genus((1, 0, 5), (1, 0, 6))
    with pytest.raises(DiscriminantMismatchError):
        genera(-20, forms=[(1, 0, 6)])
    with pytest.raises(DiscriminantMismatchError):
        genera(-20).genus_of((1, 0, 6))
    with pytest.raises(NotPrimitiveError):
        value_prime_to((3, 3, 3), 7)


def test_kronecker_sanity():
    # the odd characters are Legendre symbols (Euler's criterion as reference)
    for p in (3, 5, 7, 11, 13):
        for m in range(1, 3 * p):
            if m % p:
                assert kronecker(m, p) == (1 if pow(m, (p - 1) // 2, p) == 1 else -1)
