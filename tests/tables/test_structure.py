"""Tests of formkit.tables.structure: structures from the known h against enumeration."""

from __future__ import annotations

import random

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from formkit import FormkitError, class_group, class_numbers
from formkit.classgroups.abelian_groups import BSGSStatistics
from formkit.classgroups.baby_step_giant_step import _Ops
from formkit.classgroups.genus import genus_count
from formkit.core.discriminants import discriminant_parts
from formkit.core.enumeration import _prime_forms
from formkit.tables.four_rank import ambiguous_forms, forced_two_part, four_rank
from formkit.tables.small_forms import SmallFormGroup
from formkit.tables.structure import structure_from_class_number


def _enumerated(D: int) -> tuple[int, ...]:
    return tuple(int(x) for x in class_group(D, method="enumerate").invariants)


def test_every_small_discriminant_against_enumeration():
    for D, h in class_numbers(-3000, -3).items():
        assert structure_from_class_number(D, h).invariants == _enumerated(D), D


def test_random_discriminants_near_a_million():
    rng = random.Random(20)
    hs = class_numbers(-1_010_000, -1_000_000)
    for D in rng.sample(sorted(hs), 60):
        assert structure_from_class_number(D, hs[D]).invariants == _enumerated(D), D


@pytest.mark.parametrize("count", [4, pytest.param(40, marks=pytest.mark.slow)])
def test_random_discriminants_up_to_1e8(count):
    rng = random.Random(8 + count)
    done = 0
    while done < count:
        D = -rng.randrange(10**7, 10**8)
        if D % 4 not in (0, 1):
            continue
        h = class_numbers(D, D)[D]
        assert structure_from_class_number(D, h).invariants == _enumerated(D), D
        done += 1


def _discriminant(n: int) -> int:
    return -(4 * (n // 4) + (3 if n % 2 else 4))  # n ↦ a D ≡ 0 or 1 (mod 4) near −n


@settings(max_examples=12, deadline=None)
@given(st.integers(3, 10**8))
def test_structures_against_enumeration_hypothesis(n):
    # enumeration of all reduced forms (formkit's enumerated class group) as the outside check
    D = _discriminant(n)
    h = class_numbers(D, D)[D]
    r = structure_from_class_number(D, h)
    assert r.invariants == _enumerated(D), D
    assert r.provenance.startswith("unconditional")


@pytest.mark.slow
@settings(max_examples=80, deadline=None)
@given(st.integers(10**6, 10**8))
def test_structures_against_bsgs_hypothesis(n):
    # formkit's baby-step giant-step class group, an independent computation of the group
    D = _discriminant(n)
    h = class_numbers(D, D)[D]
    bsgs = tuple(int(x) for x in class_group(D, method="bsgs").invariants)
    assert structure_from_class_number(D, h).invariants == bsgs, D


def test_structures_where_the_two_part_is_built():
    # D near −2·10^6 whose 2-part the order, the 2-rank and the 4-rank leave open
    # (4-rank ≥ 2), and some of those the 4-rank settles, against enumeration
    hs = class_numbers(-2_004_000, -2_000_000)
    open_, settled = [], []
    for D, h in hs.items():
        r = structure_from_class_number(D, h)
        if 2 in r.computed_primes:
            open_.append(D)
        elif r.four_rank is not None:
            settled.append(D)
    assert open_ and settled
    for D in open_[:15] + settled[:15]:
        assert structure_from_class_number(D, hs[D]).invariants == _enumerated(D), D


def test_four_rank_against_enumeration():
    # the number of invariants divisible by 4 in the enumerated group, every D to 2000 and
    # random D near 10^6 (fundamental or not)
    rng = random.Random(4)
    Ds = [D for D in range(-2000, -2) if D % 4 in (0, 1)]
    Ds += [D for D in rng.sample(range(-1_100_000, -1_000_000), 120) if D % 4 in (0, 1)]
    for D in Ds:
        inv = _enumerated(D)
        assert four_rank(D, genus_count(D)) == sum(1 for n in inv if n % 4 == 0), D
        amb = ambiguous_forms(D)
        assert len(amb) == 2 ** sum(1 for n in inv if n % 2 == 0), D  # |Cl[2]|


def test_forced_two_part_by_brute_force():
    # all ascending exponent lists of 2-groups of order ≤ 2^9: forced exactly when unique
    def partitions(e, smallest=1):
        if e == 0:
            yield []
        for c in range(smallest, e + 1):
            for rest in partitions(e - c, c):
                yield [c] + rest

    for e in range(10):
        groups: dict[tuple[int, int], list[list[int]]] = {}
        for p in partitions(e):
            groups.setdefault((len(p), sum(1 for c in p if c >= 2)), []).append(p)
        for (r, r4), fits in groups.items():
            got = forced_two_part(e, r, r4)
            assert got == (fits[0] if len(fits) == 1 else None), (e, r, r4)
        with pytest.raises(ArithmeticError):
            forced_two_part(e, e + 1, 0)


def test_small_form_group_against_bsgs_operations():
    # composition, squaring, powers and prime forms against formkit's BSGS arithmetic
    rng = random.Random(60)
    for _ in range(150):
        D = -rng.randrange(3, 10**12)
        if D % 4 not in (0, 1):
            continue
        f = discriminant_parts(D)[1]
        G, old = SmallFormGroup(D), _Ops(D, BSGSStatistics())
        mine = [g for _, (_, g) in zip(range(8), G.prime_forms(f))]
        assert mine == [g for _, (_, g) in zip(range(8), _prime_forms(D, f))], D
        for g in mine:
            assert G.sqr(g) == old.sqr(g)
            for k in mine:
                assert G.mul(g, k) == old.mul(g, k)
            e = rng.randrange(-(10**6), 10**6)
            assert G.pow(g, e) == old.pow(g, e)
    with pytest.raises(FormkitError, match="negative discriminant"):
        SmallFormGroup(-7 - 2**60)


def test_known_structures():
    # classic non-cyclic 3- and 5-parts (from memory; Buell 1989 tables)
    assert structure_from_class_number(-3299, 27).invariants == (3, 9)
    assert structure_from_class_number(-4027, 9).invariants == (3, 3)
    assert structure_from_class_number(-11199, 100).invariants == (5, 20)
    assert structure_from_class_number(-12451, 25).invariants == (5, 5)
    # smallest |d| with 3-rank 3, Diaz y Diaz (1974), from memory; h(−3321607) = 63 from memory
    r = structure_from_class_number(-3321607, class_numbers(-3321607, -3321607)[-3321607])
    assert sum(1 for n in r.invariants if n % 3 == 0) == 3
    assert r.computed_primes == (3,) and "explicit relations" in r.provenance


def test_wrong_class_numbers_are_refused():
    with pytest.raises(ArithmeticError):
        structure_from_class_number(-4027, 27)  # true h = 9: the 3-Sylow never reaches 27
    with pytest.raises(ArithmeticError):
        structure_from_class_number(-3299, 54)  # one genus but h even
    # a cyclic group of order 27 (found by enumeration) given h = 9: elements of order 27
    D27 = next(D for D, h in class_numbers(-5000, -3).items() if h == 27 and _enumerated(D) == (27,))
    with pytest.raises(ArithmeticError, match="not dividing"):
        structure_from_class_number(D27, 9)
    with pytest.raises(FormkitError, match="negative discriminant"):
        structure_from_class_number(-5, 1)
    with pytest.raises(FormkitError, match="class number"):
        structure_from_class_number(-23, 0)
