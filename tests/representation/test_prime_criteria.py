"""Tests for formkit.representation.prime_criteria, .prime_decision and .genus_congruences against classical theorems, Euler's list and brute force."""

import functools
import math
from fractions import Fraction

import numpy as np
import pytest
import sympy
from hypothesis import given
from hypothesis import strategies as st

from formkit import errors
from formkit.classgroups.dispatch import class_group
from formkit.core.forms import Form
from formkit.representation.genus_congruences import genus_residues, is_idoneal, one_class_per_genus
from formkit.representation.prime_criteria import (
    density_count,
    prime_criterion,
    prime_density,
    represented_primes,
)
from formkit.representation.prime_decision import primes_up_to, represents_prime

# Euler's 65 idoneal numbers (from memory; Euler 1778, Cox §3 / Exercise on idoneal numbers).
EULER_IDONEAL = [
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
]


@functools.cache
def _prime_set(N):
    return frozenset(sympy.primerange(2, N + 1))


def brute_primes_definite(form, N):
    """Primes ≤ N of the form Q(x, y), by listing every value ≤ N (numpy)."""
    a, b, c = form
    D = b * b - 4 * a * c
    seen = set()
    ymax = math.isqrt(4 * a * N // -D) + 1
    for y in range(ymax + 1):
        # Q(x, y) ≤ N  ⇒  |2ax + by| ≤ √(4aN + D y²)
        r = 4 * a * N + D * y * y
        if r < 0:
            continue
        s = math.isqrt(r)
        x = np.arange((-b * y - s) // (2 * a) - 1, (-b * y + s) // (2 * a) + 2, dtype=np.int64)
        v = a * x * x + b * x * y + c * y * y
        seen.update(int(t) for t in v[(v >= 2) & (v <= N)])
    return sorted(seen & _prime_set(N))


def brute_unit_values(form, m):
    """{Q(x, y) mod m : x, y mod m, gcd(Q(x, y), m) = 1} — the definition, by brute force."""
    a, b, c = form
    x = np.arange(m, dtype=np.int64)[:, None]
    y = np.arange(m, dtype=np.int64)[None, :]
    v = (a * x * x + b * x * y + c * y * y) % m
    return tuple(sorted(int(r) for r in np.unique(v) if math.gcd(int(r), m) == 1))


# positive definite forms of many kinds: principal and not, fundamental and not,
# one class per genus and not, classes of order 2 and of higher order
DEFINITE_FORMS = [
    (1, 0, 1),
    (1, 1, 1),
    (1, 0, 5),
    (2, 2, 3),
    (1, 0, 14),
    (2, 0, 7),
    (3, 2, 5),
    (1, 1, 6),
    (2, 1, 3),
    (1, 0, 27),
    (4, 2, 7),
    (1, 0, 26),
    (3, 2, 9),
    (5, 4, 6),
    (1, 1, 17),
    (3, 1, 6),
    (1, 0, 21),
    (3, 0, 7),
    (2, 2, 11),
    (1, 0, 64),
    (5, 2, 13),
    (1, 1, 41),
]


@pytest.mark.parametrize("form", DEFINITE_FORMS)
def test_represented_primes_brute_force(form):
    # all primes below 10^5 for a third of the forms, below 2·10^4 for the rest (all at 10^5: slow test)
    N = 10**5 if DEFINITE_FORMS.index(form) % 3 == 0 else 2 * 10**4
    expected = brute_primes_definite(form, N)
    assert represented_primes(form, N) == expected
    assert represented_primes(form, N, method="classes") == expected


@pytest.mark.slow
@pytest.mark.parametrize("form", DEFINITE_FORMS)
def test_represented_primes_brute_force_1e5(form):
    N = 10**5
    expected = brute_primes_definite(form, N)
    assert represented_primes(form, N) == expected
    assert represented_primes(form, N, method="classes") == expected


def test_gauss_criterion_x2_plus_27y2():
    # Gauss: p = x² + 27y² iff p ≡ 1 (mod 3) and 2 is a cubic residue mod p (Cox Thm 4.15,
    # as recalled); cubic residue test by Euler's criterion 2^((p−1)/3) ≡ 1.
    got = set(represented_primes((1, 0, 27), 10**5))
    expected = {p for p in primes_up_to(10**5) if p % 3 == 1 and pow(2, (p - 1) // 3, p) == 1}
    assert got == expected
    c = prime_criterion((1, 0, 27))
    assert c.kind == "class_polynomial" and len(c.polynomial) == 4  # h(−108) = 3


def test_fermat_and_euler_congruences():
    # Fermat/Euler (classical): p = x² + y² iff p = 2 or p ≡ 1 mod 4; x² + 2y²: p = 2 or p ≡ 1, 3 mod 8;
    # x² + 3y²: p = 3 or p ≡ 1 mod 3; x² + 5y²: p = 5 or p ≡ 1, 9 mod 20 (Cox §1–§2).
    assert genus_residues((1, 0, 1)) == (4, (1,))
    assert genus_residues((1, 0, 2)) == (8, (1, 3))
    assert genus_residues((1, 0, 3)) == (12, (1, 7))  # ≡ 1 mod 3 and odd
    assert genus_residues((1, 0, 5)) == (20, (1, 9))
    assert genus_residues((2, 2, 3)) == (20, (3, 7))  # 2x² + 2xy + 3y²: p = 2 or p ≡ 3, 7 mod 20
    for form, exc in [
        ((1, 0, 1), (2,)),
        ((1, 0, 2), (2,)),
        ((1, 0, 3), (3,)),
        ((1, 0, 5), (5,)),
        ((2, 2, 3), (2,)),
    ]:
        c = prime_criterion(form)
        assert c.kind == "congruence" and c.exceptions == exc


@pytest.mark.parametrize(
    "form", DEFINITE_FORMS + [(1, 1, -1), (1, 0, -3), (3, 3, -1), (1, 4, -1), (2, 4, -3), (1, 1, -7)]
)
def test_genus_residues_against_definition(form):
    m = abs(Form(*form).discriminant)
    assert genus_residues(form) == (m, brute_unit_values(form, m))


@given(a=st.integers(1, 12), b=st.integers(-12, 12), c=st.integers(-12, 12))
def test_genus_residues_property(a, b, c):
    f = Form(a, b, c)
    D = f.discriminant
    if D == 0 or (sympy.sqrt(abs(D)).is_integer and D > 0) or not f.is_primitive or abs(D) > 400:
        return
    if D < 0 and c < 0:
        return
    assert genus_residues(f) == (abs(D), brute_unit_values(f.coefficients, abs(D)))


@pytest.mark.parametrize("D", [-20, -84, -56, -80, -4 * 30, -4 * 13 * 4, -23, 60, 8 * 17, 12, 4 * 35])
def test_genus_residues_match_genus_characters(D):
    # cross-check with the genus module (assigned characters of Gauss, Cox table before Thm 3.15)
    from formkit.classgroups.genus import assigned_characters, genus_symbol

    chars = assigned_characters(D)
    for f in class_group(D).forms():
        m, res = genus_residues(f)
        sym = genus_symbol(f)
        expected = tuple(
            r for r in range(1, m) if math.gcd(r, m) == 1 and tuple(ch(r) for ch in chars) == sym
        )
        assert res == expected


def test_congruence_equals_class_method_on_idoneal_discriminants():
    # one class per genus: the congruence gives exactly what the prime-form classes give
    for n in (5, 6, 13, 21, 30, 60, 210, 1848):
        for f in class_group(-4 * n).forms()[:4]:
            assert represented_primes(f, 5000, method="congruence") == represented_primes(
                f, 5000, method="classes"
            )
    for D in (-15, -35, -51, 8, 12, 60, 4 * 35):  # odd and positive discriminants too
        assert one_class_per_genus(D)
        for f in class_group(D).forms():
            assert represented_primes(f, 5000, method="congruence") == represented_primes(
                f, 5000, method="classes"
            )


def test_no_congruence_when_genus_has_several_classes():
    # x² + 14y² and 2x² + 7y² lie in one genus (Cl(−56) ≅ Z/4, principal genus = squares):
    # both represent primes in the same residue classes mod 56, so no congruence can separate them.
    assert not one_class_per_genus(-56)
    c = prime_criterion((1, 0, 14))
    assert c.kind == "class_polynomial" and c.modulus is None and c.residues == ()
    assert "no congruence criterion" in c.statement
    r1 = {p % 56 for p in represented_primes((1, 0, 14), 5000)}
    r2 = {p % 56 for p in represented_primes((2, 0, 7), 5000)}
    assert r1 & r2 - {2, 7}
    with pytest.raises(errors.FormkitError, match="its genus has 2 classes"):
        represented_primes((1, 0, 14), 100, method="congruence")


# A sample of n ≤ 1848 by default: all idoneal numbers up to 100 and the large ones, and
# the non-idoneal numbers among 1..100 and around the large ones.
SAMPLE = sorted(set(range(1, 101)) | {1320, 1365, 1848, 1319, 1321, 1364, 1366, 1847, 1849, 840, 841, 999})


def test_idoneal_sample():
    got = [n for n in SAMPLE if is_idoneal(n)]
    assert got == [n for n in SAMPLE if n in EULER_IDONEAL]
    assert len(EULER_IDONEAL) == 65


@pytest.mark.slow
def test_idoneal_numbers_are_eulers_65():
    # Euler's 65 idoneal numbers are exactly the n ≤ 1848 with one class per genus for x² + ny²
    assert [n for n in range(1, 1849) if is_idoneal(n)] == EULER_IDONEAL


@pytest.mark.slow
def test_no_idoneal_number_beyond_1848_in_range():
    # none beyond 1848 is known (Weinberger: at most one more, none if GRH holds)
    assert not [n for n in range(1849, 5001) if is_idoneal(n)]


def test_densities():
    # Chebotarev: 1/(2h) for classes of order ≤ 2, 1/h otherwise (Cox §9, as recalled)
    assert prime_density((1, 0, 5)) == Fraction(1, 4)  # h = 2
    assert prime_density((1, 1, 6)) == Fraction(1, 6)  # h = 3, principal
    assert prime_density((2, 1, 3)) == Fraction(1, 3)  # order 3
    assert prime_density((1, 0, 14)) == Fraction(1, 8)  # h = 4, principal
    assert prime_density((2, 0, 7)) == Fraction(1, 8)  # order 2
    assert prime_density((3, 2, 5)) == Fraction(1, 4)  # order 4
    assert prime_density((1, 1, -1)) == Fraction(1, 2)  # D = 5, h⁺ = 1


@pytest.mark.parametrize("D", [-23, -56, -71, -84, -4 * 27, -399, 5, 12, 4 * 79])
def test_densities_add_up_to_half(D):
    # every split prime lies in exactly one pair {C, C⁻¹}: the densities over the pairs add up
    # to 1/2, the density of primes with χ_D(p) = 1
    G = class_group(D)
    pairs = {frozenset({x, x.inverse()}) for x in G.elements()}
    total = sum(prime_density(next(iter(pair)).form) for pair in pairs)
    assert total == Fraction(1, 2)


@pytest.mark.parametrize("form", [(2, 1, 3), (1, 1, 6), (3, 2, 5), (3, 2, -2)])
def test_empirical_density_close_to_prediction(form):
    d = density_count(form, 10**5)
    assert d.prime_count == 9592  # π(10^5), classical
    assert abs(d.ratio - 1) < 0.05
    assert d.to_dict()["represented"] == len(represented_primes(form, 10**5))


@pytest.mark.parametrize("form", DEFINITE_FORMS)
def test_exceptions_brute_force(form):
    D = Form(*form).discriminant
    expected = tuple(p for p in sympy.primefactors(-D) if p in brute_primes_definite(form, p))
    assert prime_criterion(form, polynomial=False).exceptions == expected


INDEFINITE_FORMS = [
    (1, 0, -2),
    (1, 0, -3),
    (-1, 0, 3),
    (1, 1, -1),
    (3, 2, -2),
    (1, 0, -10),
    (2, 0, -5),
    (1, 0, -79),
    (3, 4, -5),
    (1, 0, -34),
    (2, 2, -5),
]


@pytest.mark.parametrize("form", INDEFINITE_FORMS)
def test_indefinite_against_search_and_represent(form):
    # every prime found by a direct search is listed; every listed prime is confirmed by the
    # representation module (an independent implementation)
    from formkit.representation.representations import represent

    a, b, c = form
    N = 3000
    listed = represented_primes(form, N)
    x = np.arange(-400, 401, dtype=np.int64)[:, None]
    y = np.arange(-400, 401, dtype=np.int64)[None, :]
    v = a * x * x + b * x * y + c * y * y
    found = {int(t) for t in np.unique(v[(v >= 2) & (v <= N)])} & _prime_set(N)
    assert found <= set(listed)
    assert len(found) >= len(listed) // 2  # the box is big enough to see most of them
    for p in listed[:60]:
        assert represent(form, p).represented
    for p in sympy.primerange(2, 400):
        if p not in listed:
            assert not represent(form, p).represented


def test_indefinite_criteria():
    c = prime_criterion((1, 0, -2))  # Fermat/Euler: p = x² − 2y² iff p = 2 or p ≡ ±1 mod 8
    assert (c.kind, c.modulus, c.residues, c.exceptions) == ("congruence", 8, (1, 7), (2,))
    # narrow h⁺(4·79) = 6, cyclic; wide h = 3 (the fundamental unit 80 + 9√79 has norm +1; from memory)
    c = prime_criterion((1, 0, -79))
    assert c.kind == "ideal_class" and c.class_number_narrow == 6 and c.density == Fraction(1, 12)
    assert c.class_number == 3


def test_represents_prime_matches_list():
    for form in [(1, 0, 14), (3, 2, 5), (1, 0, -79)]:
        listed = set(represented_primes(form, 2000))
        for p in primes_up_to(2000):
            assert represents_prime(form, p) == (p in listed)


def test_criterion_dict_shape():
    d = prime_criterion((1, 0, 5)).to_dict()
    assert d["form"] == [1, 0, 5] and d["discriminant"] == -20 and d["density"] == "1/4"
    assert d["criterion"]["kind"] == "congruence" and d["criterion"]["modulus"] == 20
    d = prime_criterion((1, 1, 6)).to_dict()
    assert d["criterion"]["polynomial"] == [1, 3491750, -5151296875, 12771880859375]  # Cox §13 (from memory)


def test_primes_up_to_against_sympy():
    assert primes_up_to(10**5) == list(sympy.primerange(2, 10**5 + 1))
    assert primes_up_to(0) == primes_up_to(1) == []
    assert primes_up_to(2) == [2]


@pytest.mark.parametrize(
    "call,exc,match",
    [
        (lambda: prime_criterion((2, 2, 2)), errors.NotPrimitiveError, "content 2"),
        (lambda: prime_criterion((-1, 0, -5)), errors.FormError, "negative definite"),
        (lambda: prime_criterion((1, 0, -1)), errors.DiscriminantError, "square"),
        (lambda: prime_criterion("x^2 + "), errors.ParseError, "expected a term"),
        (lambda: represented_primes((1, 0, 5), -1), errors.FormkitError, "≥ 0"),
        (lambda: represented_primes((1, 0, 5), 10**9), errors.FormkitError, "at most"),
        (lambda: represented_primes((1, 0, 5), 10, method="fast"), errors.FormkitError, "method"),
        (lambda: represented_primes((1, 0, 5), 10.0), errors.NotAnIntegerError, "integer"),
        (lambda: represents_prime((1, 0, 5), 21), errors.NotPrimeError, "21"),
        (lambda: genus_residues((4, 4, 4)), errors.NotPrimitiveError, "content 4"),
        (lambda: is_idoneal(0), errors.FormkitError, "positive"),
        (lambda: prime_density((2, 0, 2)), errors.NotPrimitiveError, "content 2"),
        (lambda: density_count((1, 0, 5), -3), errors.FormkitError, "≥ 0"),
        (lambda: one_class_per_genus(-5), errors.DiscriminantError, "-5"),
    ],
)
def test_bad_input(call, exc, match):
    with pytest.raises(exc, match=match):
        call()
