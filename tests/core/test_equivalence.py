"""Tests of formkit.core.equivalence: proper/improper equivalence and automorphism groups.

Outside references: brute-force searches over small matrices, the matrix action written
out in tests/_foundation_strategies.py, narrow class numbers from published tables
(Cohen GTM 138 Appendix B, from memory), Pell solutions (classical values, from
memory; sympy's diop_DN), and the unit groups of Z[i] and Z[ω] (orders 4 and 6).
"""

from __future__ import annotations

import itertools

import pytest
from _foundation_strategies import (
    act,
    brute_reduced_definite,
    brute_reduced_indefinite,
    definite_forms,
    det,
    improper_matrices,
    indefinite_forms,
    mul,
    reduced_definite_forms,
    sl2_matrices,
)
from hypothesis import given
from hypothesis import strategies as st
from sympy.solvers.diophantine.diophantine import diop_DN

from formkit import (
    AutomorphismGroup,
    DiscriminantError,
    DiscriminantMismatchError,
    EquivalenceResult,
    Form,
    FormError,
    NotAnIntegerError,
    ParseError,
    are_equivalent,
    are_properly_equivalent,
    automorphism_group,
    fundamental_automorph,
    improper_equivalence,
    proper_equivalence,
    reduced_cycle,
)
from formkit.core import equivalence

IDENT = ((1, 0), (0, 1))
MINUS = ((-1, 0), (0, -1))


def small_matrices(bound: int, determinant: int):
    r = range(-bound, bound + 1)
    for p, q, s_, t in itertools.product(r, r, r, r):
        if p * t - q * s_ == determinant:
            yield ((p, q), (s_, t))


SMALL_SL2 = list(small_matrices(3, 1))
SMALL_DET_MINUS = list(small_matrices(3, -1))


# --- random equivalent pairs --------------------------------------------------------------------


@given(st.one_of(definite_forms(), indefinite_forms()), sl2_matrices())
def test_proper_equivalence_found_and_verified(f, m):
    g = Form(*act(f.coefficients, m))
    M = proper_equivalence(f, g)
    assert M is not None and det(M) == 1
    assert act(f.coefficients, M) == g.coefficients
    res = equivalence(f, g)
    assert res.equivalent and res.properly and act(f.coefficients, res.matrix) == g.coefficients
    assert are_properly_equivalent(f, g) and are_equivalent(f, g)


@given(st.one_of(definite_forms(), indefinite_forms()), improper_matrices())
def test_improper_equivalence_found_and_verified(f, m):
    g = Form(*act(f.coefficients, m))
    M = improper_equivalence(f, g)
    assert M is not None and det(M) == -1
    assert act(f.coefficients, M) == g.coefficients
    res = equivalence(f, g)
    assert res.equivalent and are_equivalent(f, g)
    assert act(f.coefficients, res.matrix) == g.coefficients
    assert det(res.matrix) == (1 if res.properly else -1)
    # properly equivalent as well exactly when a proper matrix exists
    assert res.properly == (proper_equivalence(f, g) is not None)


# --- definite: against brute force over small matrices ------------------------------------------


def test_definite_equivalence_brute_force():
    """For reduced forms, any equivalence between them has entries of absolute value ≤ 2
    or so; searching all matrices with entries in [−3, 3] decides equivalence exactly."""
    for D in range(-80, 0):
        if D % 4 not in (0, 1):
            continue
        forms = [Form(*t) for t in brute_reduced_definite(D)]
        for f, g in itertools.product(forms, forms):
            proper_brute = any(act(f.coefficients, m) == g.coefficients for m in SMALL_SL2)
            improper_brute = any(act(f.coefficients, m) == g.coefficients for m in SMALL_DET_MINUS)
            M = proper_equivalence(f, g)
            assert (M is not None) == proper_brute == (f == g), (f, g)
            N = improper_equivalence(f, g)
            assert (N is not None) == improper_brute, (f, g)
            if N is not None:
                assert det(N) == -1 and act(f.coefficients, N) == g.coefficients


def test_classical_pairs():
    # 2x² ± xy + 3y² (D = −23) are improperly but not properly equivalent; together with
    # x² + xy + 6y² they give h(−23) = 3 (Cox §2, from memory)
    r = equivalence((2, 1, 3), (2, -1, 3))
    assert r.equivalent and not r.properly and det(r.matrix) == -1
    assert Form(2, 1, 3).transform(r.matrix) == Form(2, -1, 3)
    assert not equivalence((1, 1, 6), (2, 1, 3)).equivalent
    assert equivalence((1, 1, 6), (2, 1, 3)).matrix is None
    # x² + 5y² and 2x² + 2xy + 3y² (D = −20) are inequivalent (Cox §2)
    assert not are_equivalent((1, 0, 5), (2, 2, 3))
    # positive and negative definite forms are never equivalent
    assert not are_equivalent((1, 0, 1), (-1, 0, -1))


def test_equivalence_result_to_dict():
    r = equivalence((3, 2, 5), (3, -2, 5))
    d = r.to_dict()
    assert d["equivalent"] is True and d["properly"] is False
    assert Form(3, 2, 5).transform(d["matrix"]) == Form(3, -2, 5)
    assert EquivalenceResult(False, False, None).to_dict() == {
        "equivalent": False,
        "properly": False,
        "matrix": None,
    }


# --- indefinite: classes against published narrow class numbers -------------------------------


@pytest.mark.parametrize(
    "D, h_plus", [(5, 1), (12, 2), (13, 1), (21, 2), (40, 2), (60, 4), (65, 2), (136, 4)]
)
def test_indefinite_classes_count_narrow_class_number(D, h_plus):
    # narrow class numbers from Cohen GTM 138 Appendix B and the unit norms (from memory)
    forms = [Form(*t) for t in brute_reduced_indefinite(D, primitive=True)]
    reps: list[Form] = []
    for f in forms:
        if not any(are_properly_equivalent(f, r) for r in reps):
            reps.append(f)
    assert len(reps) == h_plus
    # proper equivalence among reduced forms is exactly "same cycle"
    for f, g in itertools.product(forms[:12], forms[:12]):
        assert are_properly_equivalent(f, g) == (g in reduced_cycle(f))


def test_norm_minus_one_makes_forms_properly_equivalent_to_negatives():
    # x² − 2y² represents −1 (1 − 2·1² = −1; the unit 1 + √2 has norm −1), so
    # (1, 0, −2) and (−1, 0, 2) are properly equivalent
    M = proper_equivalence((1, 0, -2), (-1, 0, 2))
    assert M is not None and Form(1, 0, -2).transform(M) == Form(-1, 0, 2)
    # x² − 3y² never represents −1 (x² ≡ −1 mod 3 has no solution), so (1, 0, −3) and
    # (−1, 0, 3) are not properly equivalent (the unit 2 + √3 has norm +1)
    assert proper_equivalence((1, 0, -3), (-1, 0, 3)) is None


# --- automorphisms -----------------------------------------------------------------------------


def brute_automorphs(f: Form, matrices) -> set:
    return {m for m in matrices if act(f.coefficients, m) == f.coefficients}


def test_units_of_gaussian_and_eisenstein_integers_as_automorphs():
    # Z[i]: 4 units ⇒ x² + y² has 4 proper automorphs; Z[ω]: 6 units ⇒ x² + xy + y² has 6
    for f, order in ((Form(1, 0, 1), 4), (Form(1, 1, 1), 6), (Form(2, 2, 2), 6), (Form(3, 0, 3), 4)):
        G = automorphism_group(f)
        assert G.order == order and G.is_finite
        elems = list(G.elements())
        assert len(set(elems)) == order
        assert set(elems) == brute_automorphs(f, SMALL_SL2)


@given(reduced_definite_forms(max_a=20, max_c=60))
def test_definite_automorphism_groups_brute_force(f):
    G = automorphism_group(f)
    elems = set(G.elements())
    assert len(elems) == G.order and G.order in (2, 4, 6)
    assert elems == brute_automorphs(f, SMALL_SL2)
    for m in elems:
        assert m in G and det(m) == 1 and f.transform(m) == f
    # closed under multiplication
    assert all(mul(m, n) in elems for m in elems for n in elems)
    assert automorphism_group(-f).order == G.order


@given(definite_forms())
def test_definite_automorphs_fix_any_form(f):
    G = automorphism_group(f)
    for m in G.elements():
        assert det(m) == 1 and act(f.coefficients, m) == f.coefficients


@given(indefinite_forms(bound=200))
def test_indefinite_automorphs(f):
    G = automorphism_group(f)
    assert G.order is None and not G.is_finite
    A = fundamental_automorph(f)
    assert G.generator == A
    assert det(A) == 1 and act(f.coefficients, A) == f.coefficients
    assert abs(A[0][0] + A[1][1]) > 2  # hyperbolic: infinite order
    elems = list(itertools.islice(G.elements(), 10))
    assert elems[0] == IDENT and elems[1] == MINUS and len(set(elems)) == 10
    assert mul(elems[2], elems[4]) == IDENT  # A and A⁻¹ both listed
    for m in elems:
        assert det(m) == 1 and act(f.coefficients, m) == f.coefficients and m in G


def test_fundamental_automorph_is_minimal_brute_force():
    # every proper automorph with small entries is ±Aⁿ, n ∈ Z (no smaller automorph is missed)
    for t in ((1, 0, -2), (1, 1, -1), (1, 0, -3), (2, 2, -3), (1, 4, -3), (3, 4, -3)):
        f = Form(*t)
        G = automorphism_group(f)
        powers = list(itertools.islice(G.elements(), 40))
        for m in small_matrices(9, 1):
            if act(t, m) == t:
                assert m in powers, (t, m)


@pytest.mark.parametrize("d", [2, 3, 7, 13, 61, 109, 991])
def test_automorph_of_pell_form(d):
    # for x² − d y² the automorphs are [[x, d·y], [y, x]] with x² − d y² = 1; the fundamental
    # one comes from the fundamental solution (sympy's diop_DN; e.g. 1766319049, 226153980
    # for d = 61, from memory)
    x, y = diop_DN(d, 1)[0]
    A = fundamental_automorph((1, 0, -d))
    assert A in (((x, d * y), (y, x)), ((x, -d * y), (-y, x)))
    if d == 61:
        assert (x, y) == (1766319049, 226153980)


def test_automorphism_group_membership():
    G = automorphism_group((2, 1, 3))
    assert MINUS in G and IDENT in G and ((1, 1), (0, 1)) not in G
    assert "not a matrix" not in G and [[1, 0], [0, 2]] not in G
    assert isinstance(G, AutomorphismGroup) and hash(G) == hash(automorphism_group((2, 1, 3)))


# --- bad input ------------------------------------------------------------------------------------

PAIR_FUNCTIONS = [
    proper_equivalence,
    improper_equivalence,
    equivalence,
    are_properly_equivalent,
    are_equivalent,
]


@pytest.mark.parametrize("fn", PAIR_FUNCTIONS)
def test_mismatched_discriminants(fn):
    with pytest.raises(DiscriminantMismatchError, match=r"-23.*-20|different discriminants"):
        fn((2, 1, 3), (1, 0, 5))


@pytest.mark.parametrize("fn", PAIR_FUNCTIONS)
@pytest.mark.parametrize(
    "F, G, err",
    [
        ((1, 2, 1), (1, 2, 1), DiscriminantError),  # D = 0
        ((1, 0, -4), (1, 0, -4), DiscriminantError),  # D = 16, a square
        ((1.0, 0, 1), (1, 0, 1), NotAnIntegerError),
        ((1, 0, 1), ("1", 0, 1), NotAnIntegerError),
        ((1, 0), (1, 0, 1), FormError),
        ("x^3", (1, 0, 1), ParseError),
        ((1, 0, 1), None, FormError),
    ],
)
def test_bad_pairs(fn, F, G, err):
    with pytest.raises(err):
        fn(F, G)


@pytest.mark.parametrize("fn", [automorphism_group, fundamental_automorph])
@pytest.mark.parametrize(
    "bad, err",
    [
        ((1, 2, 1), DiscriminantError),
        ((0, 1, 0), DiscriminantError),
        ((1.5, 0, 1), NotAnIntegerError),
        ("1,2", ParseError),
    ],
)
def test_automorphism_bad_input(fn, bad, err):
    with pytest.raises(err):
        fn(bad)


def test_fundamental_automorph_needs_indefinite():
    with pytest.raises(FormError, match="definite"):
        fundamental_automorph((1, 0, 1))


def test_max_steps_bounds_the_cycle_walk():
    # D = 10^24 + 13 has long cycles: the walk gives up with an honest error
    F, G = (1, 1, -250000000000000000000003), (-1, 1, 250000000000000000000003)
    with pytest.raises(FormError, match="max_steps = 1000"):
        proper_equivalence(F, G, max_steps=1000)
    with pytest.raises(FormError, match="not decided"):
        equivalence(F, G, max_steps=1000)
    # a bound that is large enough changes nothing
    cyc = reduced_cycle((1, 0, -61))
    g = cyc.forms[-1]
    M = proper_equivalence((1, 0, -61), g, max_steps=len(cyc) + 1)
    assert M is not None and act((1, 0, -61), M) == g.coefficients
