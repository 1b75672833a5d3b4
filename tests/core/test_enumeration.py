"""Tests for formkit.core.enumeration: reduced forms, class representatives, class numbers.

References checked against (each test names its source):
* brute force: every reduced form found by scanning all b (tests/_classgroup_reference.py),
  independent of the square-root-modulo-4a method of the library;
* Baker–Heegner–Stark: the nine imaginary quadratic fields of class number one;
* the thirteen negative discriminants (orders included) of class number one
  (Cox, *Primes of the Form x² + ny²*, Theorem 7.30; from memory);
* Watkins, "Class numbers of imaginary quadratic fields", Math. Comp. 73 (2004),
  907–938, Table 4: the number of fundamental d < 0 with h(d) = h and the largest |d|
  (from memory, h = 1…10);
* Euler's 65 idoneal numbers (classical; from memory): Cl(−4n) has one class per genus
  (exponent ≤ 2) exactly for these n.
"""

from __future__ import annotations

import math
from collections import Counter

import pytest
from _classgroup_reference import (
    brute_class_number,
    brute_reduced_definite,
    brute_reduced_indefinite,
    indefinite_cycles,
    is_fundamental,
    reduce_definite,
)
from hypothesis import given
from hypothesis import strategies as st

from formkit import (
    DiscriminantError,
    Form,
    FormkitError,
    NotAnIntegerError,
    class_number,
    class_representatives,
    reduced_forms,
)


def discriminants(lo: int, hi: int) -> list[int]:
    return [D for D in range(lo, hi + 1) if D % 4 in (0, 1) and not (D >= 0 and math.isqrt(D) ** 2 == D)]


# ---------------------------------------------------------------------------
# brute force: every reduced form by scanning all b


def test_reduced_forms_negative_match_scan_of_all_b():
    # source: brute force (definition of a reduced definite form, every b scanned)
    for D in discriminants(-2500, -3):
        got = [f.coefficients for f in reduced_forms(D)]
        assert sorted(got) == brute_reduced_definite(D), D
        assert len(set(got)) == len(got)


def test_reduced_forms_positive_match_scan_of_all_b():
    # source: brute force (definition of a reduced indefinite form, every b and a scanned)
    for D in discriminants(5, 700):
        got = [f.coefficients for f in reduced_forms(D)]
        assert sorted(got) == brute_reduced_indefinite(D), D


@pytest.mark.slow
def test_reduced_forms_match_scan_wide_range():
    # source: brute force, larger range
    for D in discriminants(-15000, -3):
        assert sorted(f.coefficients for f in reduced_forms(D)) == brute_reduced_definite(D), D
    for D in discriminants(5, 4000):
        assert sorted(f.coefficients for f in reduced_forms(D)) == brute_reduced_indefinite(D), D


def _negative_discriminant(n: int) -> int:
    D = -n
    while D % 4 not in (0, 1):
        D -= 1
    return D


@given(st.integers(10**5, 10**7))
def test_reduced_forms_random_large_negative(n):
    # source: brute force, on a sample of leading coefficients for random |D| up to 10^7:
    # every listed form is reduced, primitive, of discriminant D, and for a ≤ 40 the
    # list equals the scan of all b.
    D = _negative_discriminant(n)
    forms = reduced_forms(D)
    for f in forms:
        a, b, c = f.coefficients
        assert b * b - 4 * a * c == D
        assert -a < b <= a <= c and not (a == c and b < 0)
        assert math.gcd(math.gcd(a, b), c) == 1
    few = [f.coefficients for f in forms if f.a <= 40]
    scan = []
    for a in range(1, 41):
        for b in range(-a + 1, a + 1):
            if (b * b - D) % (4 * a) == 0:
                c = (b * b - D) // (4 * a)
                if c >= a and not (b < 0 and a == c) and math.gcd(math.gcd(a, b), c) == 1:
                    scan.append((a, b, c))
    assert sorted(few) == sorted(scan)


def test_class_representatives_negative_are_reduced_forms():
    for D in (-3, -4, -23, -56, -4004, -3299):
        assert class_representatives(D) == reduced_forms(D)


def test_class_representatives_positive_one_per_cycle():
    # source: brute force — the ρ-cycles of the reduced forms computed from the definition
    for D in discriminants(5, 500):
        reps = class_representatives(D)
        cycles = indefinite_cycles(D)
        labels = [cycles[f.coefficients] for f in reps]
        assert sorted(labels) == list(range(len(set(cycles.values())))), D
        # the principal class comes first
        assert labels[0] == cycles[_reduce_principal(D)]


def _reduce_principal(D):
    from _classgroup_reference import reduce_indefinite

    return reduce_indefinite((1, D % 2, (D % 2 - D) // 4), D)


def test_class_number_matches_brute_force():
    # source: brute force
    for D in discriminants(-1500, -3) + discriminants(5, 500):
        assert class_number(D) == brute_class_number(D), D


def test_class_number_small_published_values():
    # source: Cox, Primes of the Form x² + ny², §2 tables / classical (from memory):
    # h(−4n) for n = 1…10 and a few odd discriminants
    expected = {
        -4: 1,
        -8: 1,
        -12: 1,
        -16: 1,
        -20: 2,
        -24: 2,
        -28: 1,
        -32: 2,
        -36: 2,
        -40: 2,
        -23: 3,
        -47: 5,
        -71: 7,
        -56: 4,
        -84: 4,
        -4 * 14: 4,
        -4 * 17: 4,
        -4 * 21: 4,
    }
    for D, h in expected.items():
        assert class_number(D) == h, D
    # Q(√79): narrow class number 6 (wide 3; see test_classgroup) — from memory
    assert class_number(4 * 79) == 6


# ---------------------------------------------------------------------------
# class number one and Watkins' table (one pass over the fundamental d ≥ −20000)

_RANGE = 20000


@pytest.fixture(scope="module")
def fundamental_class_numbers():
    return {d: class_number(d) for d in range(-3, -_RANGE - 1, -1) if is_fundamental(d)}


def test_baker_heegner_stark(fundamental_class_numbers):
    # source: Baker (1966), Heegner (1952), Stark (1967): the fundamental d < 0 with
    # h(d) = 1 are exactly −3, −4, −7, −8, −11, −19, −43, −67, −163 (checked for |d| ≤ 20000)
    ones = sorted(d for d, h in fundamental_class_numbers.items() if h == 1)
    assert ones == [-163, -67, -43, -19, -11, -8, -7, -4, -3]


def test_thirteen_discriminants_of_class_number_one():
    # source: Cox, Theorem 7.30 (from memory): the 13 negative discriminants (orders
    # included) with h(D) = 1; checked over all D ≥ −5000 (non-fundamental ones D = f²d_K
    # with h = 1 all have |D| ≤ 28, so the range is ample)
    ones = [D for D in discriminants(-5000, -3) if class_number(D) == 1]
    assert sorted(ones) == sorted([-3, -4, -7, -8, -11, -12, -16, -19, -27, -28, -43, -67, -163])


# Watkins 2004, Table 4 (from memory): h -> (number of fundamental d < 0, largest |d|)
WATKINS = {
    1: (9, 163),
    2: (18, 427),
    3: (16, 907),
    4: (54, 1555),
    5: (25, 2683),
    6: (51, 3763),
    7: (31, 5923),
    8: (131, 6307),
    9: (34, 10627),
    10: (87, 13843),
}


def test_watkins_counts(fundamental_class_numbers):
    # source: Watkins, Math. Comp. 73 (2004), Table 4 (from memory).  Range 20000 exceeds
    # the largest |d| for h ≤ 10 (13843) by a margin, so the counts must agree exactly.
    assert max(m for _, m in WATKINS.values()) < _RANGE
    counts = Counter(h for h in fundamental_class_numbers.values() if h <= 10)
    largest = {}
    for d, h in fundamental_class_numbers.items():
        if h <= 10:
            largest[h] = max(largest.get(h, 0), -d)
    for h, (n, m) in WATKINS.items():
        assert counts[h] == n, h
        assert largest[h] == m, h


@pytest.mark.slow
def test_baker_heegner_stark_wider():
    # source: Baker–Heegner–Stark; Watkins (no fundamental d with h ≤ 10 beyond 13843)
    for d in range(-_RANGE - 1, -200001, -1):
        if is_fundamental(d):
            assert class_number(d) > 10, d


# ---------------------------------------------------------------------------
# Euler's idoneal numbers

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


def _all_ambiguous(forms) -> bool:
    # a reduced form is its own inverse's reduced form iff b = 0, b = a or a = c
    return all(f.b == 0 or f.b == f.a or f.a == f.c for f in forms)


def test_idoneal_numbers():
    # source: Euler / Gauss (classical, from memory): the 65 known idoneal numbers; n is
    # idoneal iff every class of Cl(−4n) has order ≤ 2 (one class per genus).  Every
    # n ≤ 1848 is checked, so both membership and non-membership are tested.
    assert len(IDONEAL) == 65
    found = [n for n in range(1, 1849) if _all_ambiguous(reduced_forms(-4 * n))]
    assert found == IDONEAL


def test_idoneal_criterion_is_independent_of_enumeration():
    # the same criterion on the brute-force list (sample, to keep the default run fast)
    for n in list(range(1, 200)) + [760, 840, 1320, 1365, 1848, 1847, 1300]:
        assert _all_ambiguous(Form(*f) for f in brute_reduced_definite(-4 * n)) == (n in IDONEAL), n


# ---------------------------------------------------------------------------
# properties and bad input


@given(st.integers(3, 10**6))
def test_reduced_forms_are_distinct_classes(n):
    D = _negative_discriminant(n)
    forms = reduced_forms(D)
    assert len(forms) == class_number(D)
    assert forms[0] == Form.principal(D)  # the principal form (1, D mod 2, ·) is reduced
    assert all(Form(*reduce_definite(f.coefficients)) == f for f in forms)
    # inverse classes are present: (a, −b, c) reduces to a listed form
    listed = set(forms)
    for f in forms[:50]:
        assert Form(*reduce_definite((f.a, -f.b, f.c))) in listed


@pytest.mark.parametrize("fn", [reduced_forms, class_representatives, class_number])
@pytest.mark.parametrize(
    "bad, exc",
    [
        (-5, DiscriminantError),
        (7, DiscriminantError),
        (16, DiscriminantError),
        (0, DiscriminantError),
        (1, DiscriminantError),
        ("abc", NotAnIntegerError),
        (-23.0, NotAnIntegerError),
        (None, NotAnIntegerError),
    ],
)
def test_bad_discriminants(fn, bad, exc):
    with pytest.raises(exc) as info:
        fn(bad)
    assert isinstance(info.value, FormkitError)
    assert str(bad) in str(info.value) or repr(bad) in str(info.value)
