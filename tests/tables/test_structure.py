"""Tests of formkit.tables.structure: structures from the known h against enumeration."""

from __future__ import annotations

import random

import pytest

from formkit import FormkitError, class_group, class_numbers
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
