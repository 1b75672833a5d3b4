"""Tests for formkit.classgroups.infrastructure: regulator, class numbers and Cl⁺(D) for D > 0.

Outside references: complete enumeration (formkit.class_group method="enumeration",
unconditional, an independent algorithm); Dirichlet's finite character sums of
formkit.analytic.class_number_formula (Davenport Ch. 6); the exact fundamental unit (formkit.core.discriminants);
the theorems of Biró (2003) settling the conjectures of Chowla (h(4m²+1) = 1 only for
m = 1, 2, 3, 5, 7, 13) and of Yokoi (h(m²+4) = 1 only for m = 1, 3, 5, 7, 13, 17), from
memory; classical small fields Q(√34) (h = 2, h⁺ = 4 although 34 = 3² + 5²) and Q(√229)
(the first prime p ≡ 1 mod 4 with h > 1, h = 3), from memory; genus theory (Gauss) and
Rédei's 4-rank theorem (tests/_redei.py, from memory, checked against enumeration in
test_large_discriminants.py) at 12- and 20-digit D built from known primes.
"""

import math
import random

import pytest
from _discriminants import built_discriminant, random_discriminants
from hypothesis import given, settings
from hypothesis import strategies as st

import formkit.classgroups.infrastructure as infra
from formkit.analytic.class_number_formula import class_number_dirichlet
from formkit.classgroups.abelian_groups import BSGSStatistics
from formkit.classgroups.dispatch import class_group, class_number_summary
from formkit.classgroups.genus import genus_count
from formkit.classgroups.infrastructure import _intersect, _progression, real_class_group, real_class_number
from formkit.core.arith import factorint
from formkit.core.discriminants import fundamental_unit, is_discriminant, regulator
from formkit.errors import DiscriminantError, FormkitError


def _squarefree(n):
    return all(e == 1 for e in factorint(n).values())


# ---------------------------------------------------------------------------
# class numbers and regulator


@pytest.mark.parametrize("start", [None, 100])
def test_against_enumeration_random(start):
    # start=100: a very short Euler product, so the candidates must be cut down by the
    # orders of classes and by lengthening the product
    rng = random.Random(2026 if start is None else 7)
    for D in random_discriminants(rng, 40, 10**6, negative=False):
        r = real_class_number(D, prime_bound=start)
        E = class_group(D, method="enumeration")
        assert (r.class_number_narrow, r.class_number) == (E.order, E.class_number), D
        assert abs(r.regulator - float(regulator(D))) <= 1e-9 * r.regulator
        assert r.unit_norm == fundamental_unit(D).norm
        assert r.provenance.assumption == "GRH" and r.provenance.certified is False


@settings(max_examples=25, deadline=None)
@given(st.integers(min_value=5, max_value=10**5))
def test_against_character_sums(D):
    if not is_discriminant(D) or math.isqrt(D) ** 2 == D:
        return
    assert real_class_number(D).class_number_wide == class_number_dirichlet(D)


def test_chowla_and_yokoi_theorems():
    # Biró 2003 (from memory): for squarefree 4m²+1 (m ≥ 1) h = 1 iff m ∈ {1,2,3,5,7,13};
    # for squarefree m²+4 (m odd) h = 1 iff m ∈ {1,3,5,7,13,17}
    chowla = [
        m
        for m in range(1, 60)
        if _squarefree(4 * m * m + 1) and real_class_number(4 * m * m + 1).class_number_wide == 1
    ]
    yokoi = [
        m
        for m in range(1, 60, 2)
        if _squarefree(m * m + 4) and real_class_number(m * m + 4).class_number_wide == 1
    ]
    assert chowla == [1, 2, 3, 5, 7, 13]
    assert yokoi == [1, 3, 5, 7, 13, 17]


def test_small_classical_fields():
    r = real_class_number(4 * 34)  # Q(√34): h = 2, h⁺ = 4, N(ε) = +1 (from memory)
    assert (r.class_number, r.class_number_narrow, r.unit_norm) == (2, 4, 1)
    r = real_class_number(229)  # Q(√229): h = 3 (from memory)
    assert r.class_number_wide == 3


def test_large_values_are_consistent():
    # 10^12+1 and 10^20+1 (unit of norm −1, tiny regulator, huge h) and 4·(10^12+3):
    # genus theory, h⁺ ∈ {h, 2h}, and h·R inside the GRH interval recomputed independently
    from formkit.analytic.lseries import class_number_estimate

    for D in (10**12 + 1, 10**20 + 1, 4 * (10**12 + 3)):
        r = real_class_number(D)
        assert r.class_number_narrow % genus_count(D) == 0
        assert r.class_number_narrow == r.class_number * (1 if r.unit_norm == -1 else 2)
        est = class_number_estimate(D, 10**6)
        assert est.lower <= r.class_number_wide * r.regulator <= est.upper


def test_unit_of_n_squared_plus_one():
    # D = n² + 1 ≡ 1 mod 4 has the unit n + √D of norm −1; for 10^20+1 = (10^10)²+1 it is
    # fundamental unless D has a square factor; here R = log(10^10 + √D) (from the unit)
    D = 10**20 + 1
    r = real_class_number(D)
    assert r.unit_norm == -1
    assert abs(r.regulator - math.log(10**10 + math.sqrt(D))) < 1e-9


@pytest.mark.parametrize("knob, value", [("CLASSES_PER_ROUND", 0), ("SIEVE_CANDIDATE_LIMIT", 1)])
def test_not_determined_is_reported(monkeypatch, knob, value):
    # with no class orders and no longer Euler product the candidates stay: an honest error
    monkeypatch.setattr(infra, knob, value)
    monkeypatch.setattr(infra, "MAX_PRIME_BOUND", 100)
    with pytest.raises(FormkitError, match="not determined"):
        real_class_number(10**12 + 1, prime_bound=100)


def test_bad_input():
    with pytest.raises(DiscriminantError):
        real_class_number(-23)
    with pytest.raises(FormkitError):
        real_class_number(16)
    with pytest.raises(FormkitError):
        real_class_number(7)
    with pytest.raises(FormkitError, match="prime_bound"):
        real_class_number(13, prime_bound=10**9)
    with pytest.raises(DiscriminantError):
        real_class_group(-23)


# ---------------------------------------------------------------------------
# candidates as arithmetic progressions


@given(
    st.integers(1, 500), st.integers(1, 20), st.integers(0, 60), st.integers(-50, 600), st.integers(0, 600)
)
def test_intersect_against_brute_force(k0, step, count, lo, width):
    a = (k0, step, count)
    b = (lo, 1, width)
    got = _intersect(a, b)
    want = [k0 + i * step for i in range(count) if lo <= k0 + i * step <= lo + width - 1]
    assert [got[0] + i * got[1] for i in range(got[2])] == want


def test_progression_respects_genera_and_unit_norm():
    class Est:
        lower, upper = 95.0, 205.0

    k0, step, count = _progression(Est, 1.0, 2, 8)  # h ∈ [95, 205], h⁺ = 2h, 8 | h⁺
    assert [k0 + i * step for i in range(count)] == [2 * h for h in range(95, 206) if (2 * h) % 8 == 0]


# ---------------------------------------------------------------------------
# the narrow class group


def test_class_group_against_enumeration_random():
    rng = random.Random(31)
    for D in random_discriminants(rng, 40, 10**6, negative=False):
        G = real_class_group(D)
        E = class_group(D, method="enumeration")
        assert G.invariants == E.invariants, D
        assert G.class_number_wide == E.class_number_wide
        assert G.provenance.method == "bsgs" and G.provenance.assumption == "GRH"
        for x in list(E)[:12]:
            y = G(x.form)
            assert y.form == x.form  # the same canonical representative as enumeration
            assert G.element(G.discrete_log(y)) == y
        gens = G.generators
        assert [g.order for g in gens] == list(G.invariants)


def test_elementary_two_group_from_genera():
    # h⁺ = number of genera: Cl⁺ ≅ C2^r read off the genus characters (Gauss)
    D = 4 * 1155  # 1155 = 3·5·7·11
    E = class_group(D, method="enumeration")
    assert E.order == genus_count(D)
    G = real_class_group(D)
    assert "genera is one class" in G.provenance.detail
    assert G.invariants == E.invariants
    for x in E:
        assert G.element(G.discrete_log(G(x.form))) == G(x.form)


def test_cycle_limit_gives_a_clear_error(monkeypatch):
    monkeypatch.setattr(infra, "CYCLE_LIMIT", 10)
    with pytest.raises(FormkitError, match="cycles of reduced forms"):
        real_class_group(4 * (10**6 + 3))  # h⁺ = 6, R ≈ 577: cycles of hundreds of forms


def test_class_group_dispatch_and_units():
    G = class_group(10**10 + 1)  # above REAL_ENUMERATION_LIMIT: infrastructure
    assert G.provenance.method == "bsgs"
    assert G.invariants == (2, 3336)  # formkit enumeration (10 s) gives C2 × C3336 as well
    d = G.to_dict()
    assert d["fundamental_unit"] == [2 * 10**5, 2] and d["fundamental_unit_norm"] == -1
    big = class_group(10**20 + 1)
    assert big.to_dict()["regulator"] == pytest.approx(math.log(10**10 + math.sqrt(10**20 + 1)))


def test_class_number_summary_function():
    a = class_number_summary(10**12 + 1)
    assert a["class_number_narrow"] == 50280  # enumeration (3 min, see the slow test) gives 50280
    assert a["assumption"] == "GRH" and a["method"] == "infrastructure"
    b = class_number_summary(316, method="enumeration")
    assert (b["class_number_narrow"], b["class_number"], b["certified"]) == (6, 3, True)
    with pytest.raises(FormkitError, match="method"):
        class_number_summary(316, method="fast")


def test_summary_methods_round_trip():
    # the method asked for is the method run and named (shared decision: method names round-trip)
    for m in ("enumeration", "bsgs", "infrastructure"):
        r = class_number_summary(316, method=m)
        assert r["method"] == m
        assert (r["class_number_narrow"], r["class_number"]) == (6, 3)  # enumeration of Cl⁺(316)
    assert class_number_summary(-23, method="bsgs")["method"] == "bsgs"
    with pytest.raises(FormkitError, match="needs D > 0, not D = -23"):
        class_number_summary(-23, method="infrastructure")
    with pytest.raises(FormkitError, match="not the structure"):
        class_group(316, method="infrastructure")


@pytest.mark.slow
def test_large_against_enumeration():
    # 10^10+1 by enumeration takes about 10 s, 10^12+1 about 3 min
    for D in (10**10 + 1, 10**12 + 1):
        E = class_group(D, method="enumeration")
        G = real_class_group(D)
        assert G.invariants == E.invariants and G.class_number_wide == E.class_number_wide


@pytest.mark.slow
def test_many_against_enumeration():
    rng = random.Random(8)
    for D in random_discriminants(rng, 150, 10**8, negative=False):
        G = real_class_group(D)
        E = class_group(D, method="enumeration")
        assert G.invariants == E.invariants, D


def test_statistics_counted():
    st_ = BSGSStatistics()
    R, norm = infra._regulator_infrastructure(10**12 + 41, st_, 10**7)
    assert st_.baby_steps > 0 and R > 0 and norm in (1, -1)


# ---------------------------------------------------------------------------
# genus theory and Rédei's 4-rank (tests/_redei.py, from memory, checked against
# enumeration in test_large_discriminants.py) beyond enumeration


@pytest.mark.parametrize("seed", [1, 3])  # Rédei 4-ranks 0 and 1
def test_narrow_two_and_four_ranks_at_12_digits(seed):
    from _redei import prime_discriminants, redei_four_rank

    D, fac = built_discriminant(random.Random(seed), 3, 4, 1)
    G = real_class_group(D)
    assert G.two_rank == len(prime_discriminants(D, fac)) - 1
    assert sum(1 for n in G.invariants if n % 4 == 0) == redei_four_rank(D, fac)


@pytest.mark.parametrize("seed", [1, 2, 4])  # Rédei 4-ranks 0, 1 and 2
def test_two_power_divides_narrow_class_number_at_20_digits(seed):
    # 2-rank t − 1 and 4-rank r₄ force 2^(t−1+r₄) | h⁺
    from _redei import prime_discriminants, redei_four_rank

    D, fac = built_discriminant(random.Random(seed), 4, 5, 1)
    r = real_class_number(D)
    t = len(prime_discriminants(D, fac))
    assert r.class_number_narrow % 2 ** (t - 1 + redei_four_rank(D, fac)) == 0


def test_regulator_search_has_a_memory_budget(monkeypatch):
    monkeypatch.setattr(infra, "REGULATOR_STEP_LIMIT", 10)
    with pytest.raises(FormkitError, match="memory budget"):
        real_class_number(10**12 + 29)  # R ≈ 2.7·10^5: thousands of baby steps
    assert real_class_number(10**20 + 1).class_number_narrow == 352006328  # R tiny: the cycle closes at once


@pytest.mark.parametrize(
    "D", [10**10 + 1, 10**11 + 12, 4 * (10**11 + 7), 10**12 + 1, 10**12 + 5, 10**11 + 21]
)
def test_structure_cost_counts_the_cycle_walks(D, monkeypatch):
    # counted: the canonical forms computed (each one walk of a cycle of about R/1.19 forms)
    # against the walks the estimate assumes; an upper estimate within a factor 12
    from formkit.core.factorisation import prime_factorisation

    walks = [0]
    original = infra._NarrowOps.canonical

    def counting(self, x):
        walks[0] += 1
        return original(self, x)

    monkeypatch.setattr(infra._NarrowOps, "canonical", counting)
    infra.real_class_group(D)
    r = infra.real_class_number(D)
    h = r.class_number_narrow
    assumed = 1.0 if h == 1 else 5 * (math.log2(h) + 1) * (len(prime_factorisation(h)) + 1)
    seconds, _ = infra.structure_cost(h, genus_count(D), r.regulator)
    assert walks[0] <= assumed <= 12 * max(walks[0], 2), (D, walks[0], assumed)
    assert seconds >= walks[0] * (r.regulator / 1.19) * 1e-6


def test_structure_of_a_long_cycle_is_refused_before_the_walks():
    # D = 10^14 + 33: h⁺ = 24 and R ≈ 1.14·10^6, so dozens of walks of ~10^6 forms
    from formkit.core.budget import budget
    from formkit.errors import BudgetError

    with budget("20s"), pytest.raises(BudgetError, match=r"h⁺ = 24; each comparison of classes walks"):
        real_class_group(10**14 + 33)
