"""Tests of formkit.core.reduction: definite and indefinite reduction, ρ, cycles, step traces.

Outside references: brute-force lists of reduced forms from the defining inequalities
(tests/_foundation_strategies.py), class numbers h(D) and narrow class numbers h⁺(D)
from published tables (Buell, *Binary Quadratic Forms*, 1989, and Cohen GTM 138,
appendix tables — values from memory), explicit reduced-form lists from Cox, *Primes of
the Form x² + ny²* §2 (from memory), and hypothesis properties under random SL2(Z)
matrices.
"""

from __future__ import annotations

import math
import random

import pytest
from _foundation_strategies import (
    act,
    brute_reduced_definite,
    brute_reduced_indefinite,
    definite_forms,
    det,
    indefinite_forms,
    mul,
    random_sl2,
    reduced_definite_forms,
    sl2_matrices,
)
from hypothesis import given

from formkit import (
    DiscriminantError,
    Form,
    FormCycle,
    FormError,
    NotAnIntegerError,
    ParseError,
    is_reduced,
    reduce_form,
    reduced,
    reduced_cycle,
    rho,
)

IDENT = ((1, 0), (0, 1))

# Class numbers h(D) of primitive positive definite forms (Buell 1989 table / Cohen GTM 138
# Appendix B; from memory).  Includes non-fundamental D (−12, −16, −27, −28, −36, ...).
CLASS_NUMBERS = {
    -3: 1,
    -4: 1,
    -7: 1,
    -8: 1,
    -11: 1,
    -12: 1,
    -15: 2,
    -16: 1,
    -19: 1,
    -20: 2,
    -23: 3,
    -24: 2,
    -27: 1,
    -28: 1,
    -31: 3,
    -35: 2,
    -36: 2,
    -39: 4,
    -40: 2,
    -43: 1,
    -47: 5,
    -48: 2,
    -51: 2,
    -52: 2,
    -55: 4,
    -56: 4,
    -59: 3,
    -60: 2,
    -63: 4,
    -64: 2,
    -67: 1,
    -71: 7,
    -72: 2,
    -75: 2,
    -79: 5,
    -84: 4,
    -87: 6,
    -88: 2,
    -95: 8,
    -99: 2,
    -100: 2,
    -103: 5,
    -104: 6,
    -163: 1,
}

# Narrow class numbers h⁺(D) of real quadratic orders (= number of cycles of primitive
# reduced forms).  h⁺ = h when the fundamental unit has norm −1, else 2h (Cohen GTM 138
# §5.2 and Appendix B, from memory): 5, 8, 13, 17, 29, 37 (h = 1, N(ε) = −1);
# 12, 21, 24, 28 (h = 1, N(ε) = +1); 40, 65 (h = 2, N(ε) = −1); 60, 136 (h = 2,
# N(ε) = +1; 34 has no solution of x² − 34y² = −1); 229 (h = 3, N(ε) = −1).
NARROW_CLASS_NUMBERS = {
    5: 1,
    8: 1,
    13: 1,
    17: 1,
    29: 1,
    37: 1,
    12: 2,
    21: 2,
    24: 2,
    28: 2,
    40: 2,
    65: 2,
    60: 4,
    136: 4,
    229: 3,
}


def fm(t):
    return Form(*t)


# --- definite reduction --------------------------------------------------------------------------


def check_definite_result(f, res):
    assert res.form == f
    assert f.transform(res.matrix) == res.reduced
    assert act(f.coefficients, res.matrix) == res.reduced.coefficients  # independent action
    assert det(res.matrix) == 1
    assert is_reduced(res.reduced)
    assert reduced(f) == res.reduced


@given(reduced_definite_forms(), sl2_matrices())
def test_definite_reduction_is_invariant(f, m):
    """The reduced form of a class is unique: reducing F·M gives back F (Gauss)."""
    g = fm(act(f.coefficients, m))
    res = reduce_form(g)
    check_definite_result(g, res)
    assert res.reduced == f
    assert is_reduced(f)


@given(definite_forms(), sl2_matrices())
def test_definite_reduction_of_any_form(f, m):
    res = reduce_form(f)
    check_definite_result(f, res)
    assert res.reduced.discriminant == f.discriminant
    assert reduce_form(f.transform(m)).reduced == res.reduced
    # negative definite forms reduce through −Q
    assert reduce_form(-f).reduced == -res.reduced


def test_reduced_lists_against_brute_force_and_tables():
    for D in range(-400, 0):
        if D % 4 not in (0, 1):
            continue
        all_reduced = brute_reduced_definite(D)
        primitive = brute_reduced_definite(D, primitive=True)
        for t in all_reduced:
            f = fm(t)
            assert is_reduced(f) and reduce_form(f).matrix == IDENT and reduced(f) == f
        # the library's notion of "reduced" matches the inequalities exactly
        a_max = math.isqrt(-D // 3) + 1
        by_library = sorted(
            (a, b, (b * b - D) // (4 * a))
            for a in range(1, a_max + 1)
            for b in range(-a, a + 1)
            if (b * b - D) % (4 * a) == 0 and is_reduced((a, b, (b * b - D) // (4 * a)))
        )
        assert by_library == all_reduced, D
        if D in CLASS_NUMBERS:
            assert len(primitive) == CLASS_NUMBERS[D], D


def test_published_reduced_form_lists():
    # Cox §2 (from memory): h(−20) = 2, h(−23) = 3, h(−56) = 4, h(−84) = 4 with these forms
    assert brute_reduced_definite(-20, True) == [(1, 0, 5), (2, 2, 3)]
    assert brute_reduced_definite(-23, True) == [(1, 1, 6), (2, -1, 3), (2, 1, 3)]
    assert brute_reduced_definite(-56, True) == [(1, 0, 14), (2, 0, 7), (3, -2, 5), (3, 2, 5)]
    assert brute_reduced_definite(-84, True) == [(1, 0, 21), (2, 2, 11), (3, 0, 7), (5, 4, 5)]
    for D in (-20, -23, -56, -84):
        assert all(is_reduced(t) for t in brute_reduced_definite(D))


def test_definite_examples():
    r = reduce_form((10, 37, 35))
    assert r.reduced == Form(1, 1, 8) and r.matrix == ((-2, 1), (1, -1))
    assert reduced("5x^2 + 8xy + 4y^2") == Form(1, 0, 4)
    # boundary cases of the normalisation: |b| = a and a = c take b ≥ 0
    assert reduced((2, -2, 3)) == Form(2, 2, 3)
    assert reduced((3, -1, 3)) == Form(3, 1, 3)
    assert reduced((-3, 1, -3)) == Form(-3, -1, -3)
    # non-primitive forms reduce too
    assert reduced((20, 74, 70)) == Form(2, 2, 16)


# --- step traces --------------------------------------------------------------------------------


def check_trace(f, res):
    prod = IDENT
    current = f
    for step in res.steps:
        assert step.before == current
        assert step.before.transform(step.matrix) == step.after
        assert det(step.matrix) == 1
        prod = mul(prod, step.matrix)
        current = step.after
    assert current == res.reduced
    assert prod == res.matrix


@given(definite_forms())
def test_definite_trace(f):
    res = reduce_form(f, steps=True)
    check_trace(f, res)
    assert {s.kind for s in res.steps} <= {"translate", "swap"}
    assert reduce_form(f).steps == ()


@given(indefinite_forms())
def test_indefinite_trace(f):
    res = reduce_form(f, steps=True)
    check_trace(f, res)
    assert {s.kind for s in res.steps} <= {"rho"}


# --- indefinite reduction and cycles ------------------------------------------------------------


def brute_is_reduced_indefinite(f):
    a, b, c = f
    D = b * b - 4 * a * c
    r = math.sqrt(D)
    return 0 < b < r and r - b < 2 * abs(a) < r + b


@given(indefinite_forms())
def test_indefinite_reduction(f):
    res = reduce_form(f)
    g = res.reduced
    assert f.transform(res.matrix) == g and act(f.coefficients, res.matrix) == g.coefficients
    assert det(res.matrix) == 1
    assert is_reduced(g) and brute_is_reduced_indefinite(g.coefficients)
    assert reduced(f) == g


@given(indefinite_forms(bound=60), sl2_matrices())
def test_equivalent_indefinite_forms_have_the_same_cycle(f, m):
    g = f.transform(m)
    cf, cg = reduced_cycle(f), reduced_cycle(g)
    assert set(cf.forms) == set(cg.forms)
    assert len(cf) == len(cg)
    assert reduce_form(g).reduced in cf


@given(indefinite_forms(bound=60))
def test_cycle_structure(f):
    cyc = reduced_cycle(f)
    n = len(cyc)
    assert n == cyc.length == len(cyc.matrices) and len(set(cyc.forms)) == n
    # the signs of a alternate along a cycle, so its length is even (Buchmann–Vollmer §6)
    assert n % 2 == 0
    prod = IDENT
    for i, (g, m) in enumerate(zip(cyc.forms, cyc.matrices)):
        assert is_reduced(g) and brute_is_reduced_indefinite(g.coefficients)
        assert det(m) == 1
        assert g.transform(m) == cyc.forms[(i + 1) % n]
        assert rho(g) == (cyc.forms[(i + 1) % n], m)
        prod = mul(prod, m)
    # going once round the cycle gives a proper automorph of forms[0] (not ±I)
    assert cyc.forms[0].transform(prod) == cyc.forms[0] and det(prod) == 1
    assert prod not in (IDENT, ((-1, 0), (0, -1)))


def test_cycles_partition_reduced_forms_and_count_narrow_classes():
    for D, h_plus in NARROW_CLASS_NUMBERS.items():
        forms = brute_reduced_indefinite(D, primitive=True)
        seen: set = set()
        cycles = 0
        for t in forms:
            if t in seen:
                continue
            cyc = reduced_cycle(t)
            assert all(g.coefficients in forms for g in cyc)  # cycles stay among reduced forms
            assert not seen & {g.coefficients for g in cyc}
            seen |= {g.coefficients for g in cyc}
            cycles += 1
        assert seen == set(forms)
        assert cycles == h_plus, D


def test_indefinite_examples():
    assert reduce_form((1, 0, -7)).reduced == Form(1, 4, -3)
    cyc = reduced_cycle((1, 0, -7))
    assert cyc.forms == (Form(1, 4, -3), Form(-3, 2, 2), Form(2, 2, -3), Form(-3, 4, 1))
    assert isinstance(cyc, FormCycle) and Form(2, 2, -3) in cyc and list(cyc) == list(cyc.forms)
    assert rho((1, 4, -1)) == (Form(-1, 4, 1), ((0, -1), (1, -4)))
    assert is_reduced((1, 3, -1)) and not is_reduced((1, 0, -7))


def test_library_reduced_matches_inequalities_indefinite():
    for D in (5, 8, 12, 13, 21, 28, 40, 60, 61, 136):
        s = math.isqrt(D)
        brute = set(brute_reduced_indefinite(D))
        by_library = {
            (a, b, (b * b - D) // (4 * a))
            for a in range(-2 * s, 2 * s + 1)
            if a
            for b in range(-2 * s, 2 * s + 1)
            if (b * b - D) % (4 * a) == 0 and is_reduced((a, b, (b * b - D) // (4 * a)))
        }
        assert by_library == brute, D


# --- huge coefficients: steps logarithmic in the size ---------------------------------------------


@pytest.mark.parametrize(
    "start",
    [
        Form(2, 1, 3),  # D = −23
        Form(1, 1, 10**40),  # |D| ≈ 4·10^40
        Form(1, 3, -1),  # D = 13
        Form(1, 2 * 10**20 - 1, -(10**20)),  # D ≈ 4·10^40
    ],
)
def test_huge_coefficients_reduce_in_logarithmically_many_steps(start):
    rng = random.Random(20240601)
    target = reduce_form(start).reduced
    for _ in range(5):
        m = random_sl2(rng, 150)  # entries of ~150 digits: the form gets ~300-digit entries
        g = start.transform(m)
        H = max(abs(v) for v in g)
        assert len(str(H)) >= 290
        res = reduce_form(g, steps=True)
        assert g.transform(res.matrix) == res.reduced and det(res.matrix) == 1
        # Lagrange/Gauss reduction: O(log H) steps; observed ≤ 0.75·log2 H for worst-case
        # (Fibonacci-like) matrices, so 2·log2 H + 10 is a safe ceiling far below H itself
        assert len(res.steps) <= 2 * math.log2(H) + 10
        assert is_reduced(res.reduced)
        if g.is_definite:
            assert res.reduced == target
        elif g.discriminant < 10**6:
            # small D: the reduced form lies on the cycle of the starting class
            assert res.reduced in reduced_cycle(target)


def test_fibonacci_matrices_worst_case_steps():
    # alternating upper/lower unipotent matrices [[1,1],[0,1]], [[1,0],[1,1]] give Euclid's
    # worst case (Fibonacci growth, Lamé's theorem)
    m = IDENT
    for i in range(1400):
        m = mul(m, ((1, 1), (0, 1)) if i % 2 else ((1, 0), (1, 1)))
    for start in (Form(2, 1, 3), Form(1, 0, 1), Form(3, 1, -5)):
        g = start.transform(m)
        H = max(abs(v) for v in g)
        assert len(str(H)) > 280
        res = reduce_form(g, steps=True)
        assert len(res.steps) <= 2 * math.log2(H) + 10
        assert g.transform(res.matrix) == res.reduced


def test_discriminant_of_200_digits():
    rng = random.Random(7)
    D = -(10**200) - 3  # ≡ 1 mod 4
    f = Form(1, 1, (1 - D) // 4)
    m = random_sl2(rng, 120)
    g = f.transform(m)
    res = reduce_form(g, steps=True)
    assert res.reduced == f and len(res.steps) <= 2 * math.log2(max(abs(v) for v in g)) + 10
    Dp = 10**200 + 1
    fp = reduce_form(Form(1, 1, (1 - Dp) // 4)).reduced
    res = reduce_form(fp.transform(m))
    assert is_reduced(res.reduced) and fp.transform(m).transform(res.matrix) == res.reduced


# --- bad input ------------------------------------------------------------------------------------

SQUARE_DISCRIMINANT = [(1, 2, 1), (0, 0, 0), (1, 0, -4), (0, 5, 0), (2, 5, 2), (0, 1, 7)]


@pytest.mark.parametrize("fn", [reduce_form, reduced, is_reduced, reduced_cycle, rho])
@pytest.mark.parametrize("f", SQUARE_DISCRIMINANT)
def test_square_discriminants_refused(fn, f):
    with pytest.raises(DiscriminantError, match="square"):
        fn(f)


@pytest.mark.parametrize("fn", [reduced_cycle, rho])
def test_definite_forms_refused_where_indefinite_needed(fn):
    with pytest.raises(FormError, match="indefinite"):
        fn((2, 1, 3))


@pytest.mark.parametrize("fn", [reduce_form, reduced, is_reduced, reduced_cycle, rho])
@pytest.mark.parametrize(
    "bad, err",
    [
        ((1.0, 2, 3), NotAnIntegerError),
        ((1, 2), FormError),
        ("x^3", ParseError),
        (None, FormError),
        ("1,2", ParseError),
    ],
)
def test_bad_forms_refused(fn, bad, err):
    with pytest.raises(err):
        fn(bad)


def test_cycle_max_length():
    with pytest.raises(FormError, match="max_length"):
        reduced_cycle((1, 0, -1000003), max_length=3)
    assert len(reduced_cycle((1, 0, -7), max_length=4)) == 4
