"""Tests for formkit.classgroups.baby_step_giant_step (baby-step giant-step class groups, D > 0 method).

Outside references: complete enumeration (formkit.core.enumeration / class_group(method=
"enumerate"), unconditional); the independent finite character sums of formkit.analytic.class_number_formula
(Davenport Ch. 6); the lists of imaginary quadratic fields of class number 1 and 2
(Heegner–Baker–Stark; from memory); genus theory (the 2-rank of Cl(D) is
log2(number of genera), Gauss; Cox §3–§6) checked at 20- and 25-digit D where nothing
can be enumerated; Rédei's 4-rank theorem (1934, from memory; tests/_redei.py, checked
here against enumeration first) at 20- to 28-digit D built from known primes; the exact
fundamental unit (formkit.core.discriminants) for regulators.
"""

import itertools
import random

import pytest
from _discriminants import built_discriminant, random_discriminants

from formkit.analytic.class_number_formula import class_number_dirichlet
from formkit.classgroups import dispatch as cg
from formkit.classgroups.baby_step_giant_step import (
    bach_bound,
    class_group_bsgs,
    last_statistics,
    order_of_class,
)
from formkit.classgroups.dispatch import class_group
from formkit.classgroups.genus import genus_count
from formkit.classgroups.infrastructure import real_class_number
from formkit.core.arith import factorint
from formkit.core.discriminants import (
    fundamental_unit,
    is_discriminant,
    is_fundamental_discriminant,
    regulator,
)
from formkit.core.forms import Form
from formkit.errors import DiscriminantError, FormError, FormkitError, NotPrimitiveError


def _random_elements(G, rng, k):
    """Random classes built from prime forms (not from the structure being tested)."""
    primes = [p for p in range(2, 400) if all(p % q for q in range(2, p))]
    forms = []
    for p in primes:
        try:
            forms.append(G.prime_form(p))
        except FormkitError:
            continue
    out = []
    for _ in range(k):
        x = G.identity
        for _ in range(4):
            x = x * rng.choice(forms) ** rng.randrange(-50, 50)
        out.append(x)
    return out


def _check_against_enumeration(D, rng, n_elements=4):
    G = class_group_bsgs(D)
    E = class_group(D, method="enumeration")
    assert G.invariants == E.invariants, (D, G.invariants, E.invariants)
    assert G.order == E.order
    for x in _random_elements(G, rng, n_elements):
        ex = G.discrete_log(x)
        assert G.element(ex) == x
    xs = _random_elements(G, rng, n_elements)
    for x, y in itertools.pairwise(xs):
        ex, ey, exy = G.discrete_log(x), G.discrete_log(y), G.discrete_log(x * y)
        assert all((a + b - c) % n == 0 for a, b, c, n in zip(ex, ey, exy, G.invariants))
    return G


def _check_structure(G):
    n = 1
    for ni in G.invariants:
        n *= ni
        assert ni > 1
    assert n == G.order
    for a, b in zip(G.invariants, G.invariants[1:]):
        assert b % a == 0
    for g, ni in zip(G.generators, G.invariants):
        assert (g**ni).is_identity()
        for p in factorint(ni):
            assert not (g ** (ni // p)).is_identity()


def test_agrees_with_enumeration_random():
    rng = random.Random(61)
    for D in random_discriminants(rng, 20, 10**8):
        G = _check_against_enumeration(D, rng)
        _check_structure(G)


@pytest.mark.slow
def test_agrees_with_enumeration_random_large():
    rng = random.Random(62)
    for D in random_discriminants(rng, 60, 10**10):
        _check_against_enumeration(D, rng, 10)


@pytest.mark.parametrize(
    "D",
    [-4004, -4 * 5 * 7 * 11 * 13 * 17, -3 * 4 * 5 * 7 * 11 * 13 + 0, -(10**6) - 3, -(3**8) * 4, -4 * 3**10],
)
def test_structured_examples(D):
    if not is_discriminant(D):
        D *= 4
    _check_against_enumeration(D, random.Random(D))


def test_class_number_one_and_two():
    # Heegner–Baker–Stark (from memory): the fundamental D < 0 with h = 1 and h = 2
    h1 = [-3, -4, -7, -8, -11, -19, -43, -67, -163]
    h2 = [-15, -20, -24, -35, -40, -51, -52, -88, -91, -115, -123, -148, -187, -232, -235, -267, -403, -427]
    for D in h1:
        assert class_group_bsgs(D).order == 1
    for D in h2:
        assert class_group_bsgs(D).invariants == (2,)


def test_against_character_sums():
    for D in (-1003, -4 * 2503, -9995, -3 * 49 * 4, -7 * 121):
        assert class_group_bsgs(D).order == class_number_dirichlet(D)


@pytest.mark.parametrize(
    "digits", [18, pytest.param(20, marks=pytest.mark.slow), pytest.param(25, marks=pytest.mark.slow)]
)
def test_genus_theory_at_large_discriminants(digits):
    # the 2-rank is fixed by genus theory: 2^(2-rank) = number of genera (Gauss)
    rng = random.Random(digits)
    for _ in range(1 if digits == 18 else 3):
        while True:
            D = -rng.randrange(10 ** (digits - 1), 10**digits)
            if is_fundamental_discriminant(D):
                break
        G = class_group_bsgs(D)
        assert 2**G.two_rank == genus_count(D)
        _check_structure(G)
        # a random class has order dividing h, and its discrete log round-trips
        x = G.prime_form(next(p for p in range(3, 500) if _split(D, p)))
        assert (x**G.order).is_identity()
        assert G.element(G.discrete_log(x)) == x
        assert order_of_class(x.form) == x.order


def _split(D, p):
    from formkit.core.arith import kronecker

    return all(p % q for q in range(2, p)) and kronecker(D, p) == 1


def test_non_fundamental_large_uses_field_class_number():
    d = -(10**8) - 7  # fundamental (10^8 + 7 is prime and ≡ 3 mod 4)
    assert is_fundamental_discriminant(d)
    G = class_group_bsgs(9 * d)
    h_K = class_group(d, method="enumeration").order
    # Cox Thm 7.24: h(f²d) = h(d)·f·∏(1 − χ(p)/p); here f = 3
    from formkit.core.arith import kronecker

    assert G.order == h_K * (3 - kronecker(d, 3))
    assert G.provenance.certified and G.provenance.assumption is None
    _check_structure(G)


def test_provenance_and_statistics():
    G = class_group_bsgs(-(10**12) - 3)
    p = G.provenance
    assert (p.method, p.certified, p.assumption) == ("bsgs", False, "GRH")
    assert p.bound == bach_bound(G.discriminant)
    d = G.to_dict()
    assert d["method"] == "bsgs" and d["certified"] is False and d["bound"] == p.bound
    st = last_statistics()
    assert st.operations > 0 and st.generators_used > 0


def test_class_group_dispatch(monkeypatch):
    G = class_group(-(10**8) - 7, method="bsgs")
    assert G.provenance.method == "bsgs"
    monkeypatch.setattr(cg, "ENUMERATION_LIMIT", 10**6)
    H = class_group(-(10**7) - 1 if is_discriminant(-(10**7) - 1) else -(10**7) - 3)
    assert H.provenance.method == "bsgs"


def test_order_of_class_small():
    assert order_of_class((2, 1, 3)) == 3
    assert order_of_class(Form(1, 0, 5)) == 1
    E = class_group(-4004)
    for x in E.elements():
        assert order_of_class(x.form) == x.order


def test_bad_input():
    with pytest.raises(DiscriminantError):
        class_group_bsgs(5)
    with pytest.raises(FormkitError):
        class_group_bsgs(-5)
    with pytest.raises(FormkitError):
        class_group_bsgs(2.5)
    with pytest.raises(FormError):
        order_of_class((1, 1, -1))
    with pytest.raises(NotPrimitiveError):
        order_of_class((2, 2, 4))
    with pytest.raises(DiscriminantError):
        real_class_number(-23)
    with pytest.raises(FormkitError):
        real_class_number(16)
    with pytest.raises(FormkitError):
        bach_bound(7)


# ---------------------------------------------------------------------------
# D > 0


def test_real_against_enumeration_random():
    rng = random.Random(5)
    for D in random_discriminants(rng, 25, 10**6, negative=False):
        r = real_class_number(D)
        E = class_group(D, method="enumeration")
        assert (r.class_number_narrow, r.class_number) == (E.order, E.class_number), D
        assert abs(r.regulator - float(regulator(D))) <= 1e-9 * r.regulator
        assert r.unit_norm == fundamental_unit(D).norm
        assert r.provenance.certified is False


def test_real_against_character_sums():
    for D in (5, 13, 1001, 4 * 1009, 8 * 97):
        assert real_class_number(D).class_number_wide == class_number_dirichlet(D)


def test_real_large_regulator_consistency():
    # 10^12-size D: R from the infrastructure must be a regulator: h·R matches the
    # analytic value and (t, u) from the exact unit agrees where the cycle is short enough
    rng = random.Random(12)
    for _ in range(3):
        while True:
            D = rng.randrange(10**12, 2 * 10**12)
            if is_fundamental_discriminant(D):
                break
        r = real_class_number(D)
        assert r.class_number_narrow in (r.class_number, 2 * r.class_number)
        assert r.class_number_narrow % genus_count(D) == 0
        if r.regulator < 2000:
            assert abs(r.regulator - float(regulator(D))) < 1e-8 * r.regulator


@pytest.mark.slow
def test_real_against_enumeration_large():
    rng = random.Random(55)
    for D in random_discriminants(rng, 40, 10**8, negative=False):
        r = real_class_number(D)
        E = class_group(D, method="enumeration")
        assert (r.class_number_narrow, r.class_number) == (E.order, E.class_number), D


@pytest.mark.parametrize("D", [-12, -16, -27, -48, -64, -75, -4 * 49, -3 * 121, -3 * 4 * 25])
def test_orders_of_the_units_fields(D):
    # d_K = −3, −4 have extra units: [O_K*:O*] = 3 or 2 in the class number formula for orders
    _check_against_enumeration(D, random.Random(-D))


def test_non_fundamental_with_field_beyond_enumeration_limit(monkeypatch):
    import formkit.classgroups.baby_step_giant_step as ld

    monkeypatch.setattr(ld, "FIELD_ENUMERATION_LIMIT", 10**4)
    d = -(10**6) - 3  # 10^6 + 3 is prime, ≡ 3 mod 4: fundamental
    assert is_fundamental_discriminant(d)
    G = class_group_bsgs(25 * d)
    assert G.provenance.assumption == "GRH" and not G.provenance.certified
    assert G.invariants == class_group(25 * d, method="enumeration").invariants


# Euler's 65 idoneal numbers (from memory; Cox, Primes of the form x² + ny², §3.C): n is
# idoneal iff every genus of forms of discriminant −4n is a single class, i.e. iff Cl(−4n)
# has exponent ≤ 2.  Complete below 10^4 at least (any further one would be far larger).
IDONEAL = [
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


def test_idoneal_numbers():
    assert len(IDONEAL) == 65
    for n in IDONEAL:
        G = class_group_bsgs(-4 * n)
        assert G.exponent <= 2, n
        assert G.order == genus_count(-4 * n)
    assert class_group_bsgs(-4 * 1848).invariants == (2, 2, 2, 2)
    rng = random.Random(1848)
    for n in rng.sample([m for m in range(1, 2000) if m not in IDONEAL], 15):
        assert class_group_bsgs(-4 * n).exponent > 2, n


@pytest.mark.slow
def test_idoneal_numbers_complete_below_3000():
    found = [n for n in range(1, 3000) if class_group_bsgs(-4 * n).exponent <= 2]
    assert found == IDONEAL


def test_group_operations_match_formkit_composition():
    # the inlined NUCOMP/NUDUPL (all gcd cases) against formkit.core.composition.compose/square
    from formkit.classgroups.baby_step_giant_step import BSGSStatistics, _Ops
    from formkit.core.composition import compose, square

    rng = random.Random(17)
    for D in (
        -3,
        -4,
        -23,
        -4 * 3 * 5 * 7 * 11,
        -(10**9) - 7,
        -4 * (10**19 + 1),
        -(10**31) - 3 * 9,
        -(3**40) * 4,
    ):
        if not is_discriminant(D):
            continue
        ops = _Ops(D, BSGSStatistics())
        G = class_group_bsgs(D) if abs(D) < 10**12 else None
        gens = []
        for p in range(2, 200):
            try:
                f = Form.prime_form(D, p)
            except FormkitError:
                continue
            gens.append(_Ops.reduce(f.a, f.b, f.c))
        elts = list(gens)
        for _ in range(60):
            x, y = rng.choice(elts), rng.choice(gens + elts)
            assert ops.mul(x, y) == compose(x, y).coefficients
            assert ops.sqr(x) == square(x).coefficients
            elts.append(ops.mul(x, y))
        if G is not None:
            assert all((G(x) ** G.exponent).is_identity() for x in elts[:10])


# ---------------------------------------------------------------------------
# Rédei's 4-rank (tests/_redei.py) at discriminants far beyond enumeration


def test_redei_formula_as_recalled_matches_enumeration():
    from _redei import redei_four_rank

    from formkit.core.discriminants import is_fundamental_discriminant

    for D in [d for d in range(-3000, 3000) if d not in (0, 1) and is_fundamental_discriminant(d)]:
        G = class_group(D, method="enumeration")
        assert sum(1 for n in G.invariants if n % 4 == 0) == redei_four_rank(D), D


@pytest.mark.parametrize("seed", [1, 3, 4])  # Rédei 4-ranks 1, 0 and 2
def test_two_and_four_ranks_at_20_digits(seed):
    # genus theory (2-rank t − 1, Gauss) and Rédei's 4-rank, both from the factorisation
    from _redei import prime_discriminants, redei_four_rank

    rng = random.Random(seed)
    D, fac = built_discriminant(rng, 4, 5, -1)
    G = class_group_bsgs(D)
    t = len(prime_discriminants(D, fac))
    assert G.two_rank == t - 1
    assert sum(1 for n in G.invariants if n % 4 == 0) == redei_four_rank(D, fac)


@pytest.mark.parametrize("primes, digits", [(5, 5), (4, 7), (6, 5)])
def test_two_and_four_ranks_at_25_to_30_digits(primes, digits):
    from _redei import prime_discriminants, redei_four_rank

    rng = random.Random(primes * digits)
    D, fac = built_discriminant(rng, primes, digits, -1)
    G = class_group_bsgs(D)
    assert G.two_rank == len(prime_discriminants(D, fac)) - 1
    assert sum(1 for n in G.invariants if n % 4 == 0) == redei_four_rank(D, fac)
