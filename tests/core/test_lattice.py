"""Tests of formkit.core.lattice: Hermite and Smith normal forms, quotients Zⁿ/L.

Outside references: sympy's ``smith_normal_form`` and ``hermite_normal_form`` (a
general-purpose library) and FLINT's ``fmpz_mat.snf`` (diagonal only) on random
matrices; the defining properties checked directly (unimodular transformations, the
same lattice, the divisibility chain); class groups computed by complete enumeration
(formkit's own, tested elsewhere against published tables) for relation matrices of
class groups; the worked example of the Smith normal form on Wikipedia ("Smith normal
form", example section; from memory).
"""

from __future__ import annotations

import itertools
import random

import flint
import pytest
from _relation_matrices import factor_base, relation_matrix
from hypothesis import given
from hypothesis import strategies as st
from sympy import Matrix
from sympy.matrices.normalforms import hermite_normal_form as sympy_hnf
from sympy.matrices.normalforms import smith_normal_form as sympy_snf

import formkit
from formkit.core.composition import _nucomp_bound, _nucomp_raw
from formkit.core.lattice import hermite_normal_form, lattice_quotient, smith_normal_form
from formkit.core.raw_reduction import _reduce_definite_raw
from formkit.errors import FormkitError

small_matrices = st.integers(0, 5).flatmap(
    lambda n: st.lists(st.lists(st.integers(-12, 12), min_size=n, max_size=n), min_size=0, max_size=6).map(
        lambda rows: (rows, n)
    )
)


def _mul(A, B):
    return [[sum(A[i][k] * B[k][j] for k in range(len(B))) for j in range(len(B[0]))] for i in range(len(A))]


def _det(M) -> int:
    return int(flint.fmpz_mat([list(r) for r in M]).det()) if M else 1


def _same_lattice(A, B, n) -> bool:
    """Row lattices equal: equal Hermite forms (FLINT's, on the non-zero rows)."""

    def h(X):
        X = [list(r) for r in X if any(r)]
        if not X:
            return []
        return [r for r in flint.fmpz_mat(X).hnf().tolist() if any(r)]

    return h(A) == h(B)


# --- Smith normal form ----------------------------------------------------------


def test_smith_worked_example():
    # Wikipedia, "Smith normal form", example (from memory): diag(2, 6, 12)
    A = [[2, 4, 4], [-6, 6, 12], [10, -4, -16]]
    S = smith_normal_form(A, transforms=True)
    assert S.diagonal == (2, 6, 12) and S.invariants == (2, 6, 12) and S.rank == 3
    assert abs(_det(S.right)) == 1


@given(small_matrices)
def test_smith_diagonal_agrees_with_sympy(case):
    # sympy's smith_normal_form (outside reference); signs normalised to ≥ 0
    rows, n = case
    S = smith_normal_form(rows, ncols=n)
    m = len(rows)
    if m == 0 or n == 0:
        assert S.diagonal == ()
        return
    ref = sympy_snf(Matrix(rows))
    assert S.diagonal == tuple(abs(int(ref[i, i])) for i in range(min(m, n)))


@given(small_matrices)
def test_smith_transformations(case):
    # defining properties: V unimodular, V·V⁻¹ = I, and A·V spans the lattice of
    # diag(d) (so U exists with U·A·V = diag(d)); d_i | d_{i+1}, zeros last
    rows, n = case
    S = smith_normal_form(rows, ncols=n, transforms=True)
    V, Vi = S.right, S.right_inverse
    if n:
        assert _mul(V, Vi) == [[int(i == j) for j in range(n)] for i in range(n)]
        assert abs(_det(V)) == 1
    d = list(S.diagonal)
    nz = [x for x in d if x]
    assert d == nz + [0] * (len(d) - len(nz))
    assert all(b % a == 0 for a, b in itertools.pairwise(nz))
    if rows and n:
        full = [1] * (n - len(S.invariants)) + list(S.invariants)
        diag_rows = [[full[i] if i == j else 0 for j in range(n)] for i in range(min(len(rows), n))]
        assert _same_lattice(_mul(rows, V), diag_rows, n)


def test_smith_against_flint_on_larger_random_matrices():
    # FLINT's own fmpz_mat.snf (diagonal only) as the outside reference, including
    # matrices with more columns than 24, which go through the sparse elimination
    rnd = random.Random(17)
    for _ in range(25):
        n = rnd.randint(1, 45)
        m = max(0, n + rnd.randint(-8, 8))
        A = [[rnd.choice([0, 0, 0, 0, 1, -1, 2, -3, 4, 6]) for _ in range(n)] for _ in range(m)]
        S = smith_normal_form(A, ncols=n)
        if m:
            ref = flint.fmpz_mat(A).snf()
            assert S.diagonal == tuple(int(ref[i, i]) for i in range(min(m, n)))


def test_smith_degenerate_shapes():
    assert smith_normal_form([], ncols=3).invariants == (0, 0, 0)
    assert smith_normal_form([[0, 0], [0, 0]]).diagonal == (0, 0)
    assert smith_normal_form([[5]]).diagonal == (5,)
    assert smith_normal_form(flint.fmpz_mat([[2, 4, 4], [-6, 6, 12], [10, -4, -16]])).diagonal == (2, 6, 12)
    assert smith_normal_form([[-5]]).diagonal == (5,)
    assert smith_normal_form([[1, 2, 3]]).diagonal == (1,)
    S = smith_normal_form([[0, 4, 0]], transforms=True)
    assert S.invariants == (4, 0, 0) and abs(_det(S.right)) == 1
    with pytest.raises(FormkitError, match="transformations were not computed"):
        _ = smith_normal_form([[2]]).right


# --- quotients -------------------------------------------------------------------


@given(small_matrices, st.lists(st.integers(-30, 30), min_size=5, max_size=5), st.data())
def test_quotient_coordinates_are_a_homomorphism_with_kernel_L(case, v, data):
    rows, n = case
    G = lattice_quotient(rows, ncols=n)
    x = v[:n]
    y = data.draw(st.lists(st.integers(-30, 30), min_size=n, max_size=n))
    cx, cy, cxy = G.coordinates(x), G.coordinates(y), G.coordinates([a + b for a, b in zip(x, y)])
    for a, b, c, d in zip(cx, cy, cxy, G.invariants):
        assert (a + b - c) % d == 0 if d else a + b == c
    for r in rows:  # relations vanish
        assert all(c == 0 for c in G.coordinates(r))
    for i, g in enumerate(G.generators):  # generator i has coordinates e_i
        assert G.coordinates(g) == tuple(int(i == j) for j in range(len(G.invariants)))
    # the order of the torsion is the product of the invariants; the free rank is
    # n − rank (sympy's rank as the reference)
    rank = Matrix(rows).rank() if rows and n else 0
    assert G.free_rank == n - rank


def test_quotient_sparse_rows_and_repr():
    # Z³/⟨4e₀, 6e₁ + 3e₂⟩ ≅ Z/4 × Z/3 × Z ≅ Z/12 × Z (by hand)
    G = lattice_quotient([{0: 4}, {1: 6, 2: 3}], ncols=3)
    assert G.invariants == (12, 0) and G.order == 12 and not G.is_finite
    assert G.coordinates({1: 6, 2: 3}) == (0,) * len(G.invariants)
    assert "Z^3 / L" in repr(G)


def _form_of(D, base, x):
    """The reduced form ∏ p_i^{x_i} (NUCOMP; inverse = (a, −b, c))."""
    L = _nucomp_bound(D)
    f = (1, 1, (1 - D) // 4) if D % 4 == 1 else (1, 0, -D // 4)
    for (_p, (a, b, c)), e in zip(base, x):
        if e < 0:
            b, e = -b, -e
        for _ in range(e):
            f = _nucomp_raw(*f, a, b, c, D, L)
    return _reduce_definite_raw(*f)


@pytest.mark.parametrize("D, n", [(-1000003, 40), (-493828, 60), (-10000019, 80)])
def test_quotient_of_class_group_relations_is_the_class_group(D, n):
    # relation matrices among 40–80 prime forms (the sparse elimination path) give
    # the structure that complete enumeration gives (formkit.class_group, unconditional)
    G = formkit.class_group(D, method="enumeration")
    R = relation_matrix(D, n, extra=n // 2)
    Q = lattice_quotient(R)
    assert Q.invariants == G.invariants
    base = factor_base(D, n)
    # the coordinates detect the identity: ∏ p_i^{x_i} is principal iff x ↦ 0
    rnd = random.Random(D)
    for _ in range(20):
        x = [rnd.randint(-3, 3) if rnd.random() < 0.2 else 0 for _ in range(n)]
        principal = _form_of(D, base, x)[0] == 1
        assert principal == all(c == 0 for c in Q.coordinates(x))
    # the generators are classes of exactly the orders of the invariants
    for g, d in zip(Q.generators, Q.invariants):
        assert G(_form_of(D, base, g)).order == d


# --- Hermite normal form ----------------------------------------------------------


def _is_hnf(H) -> bool:
    last = -1
    zero_seen = False
    for i, r in enumerate(H):
        j = next((j for j, x in enumerate(r) if x), None)
        if j is None:
            zero_seen = True
            continue
        if zero_seen or j <= last or r[j] <= 0:
            return False
        if any(not 0 <= H[k][j] < r[j] for k in range(i)):
            return False
        last = j
    return True


@given(small_matrices)
def test_hermite_properties_and_sympy(case):
    rows, n = case
    Hf = hermite_normal_form(rows, ncols=n, transform=True)
    H, T = Hf.matrix, Hf.transform
    assert _is_hnf(H)
    if rows and n:
        assert _mul(T, rows) == [list(r) for r in H]
        assert abs(_det(T)) == 1
        # sympy's hermite_normal_form works on columns: HNF(Aᵀ)ᵀ spans the same lattice
        nz = [r for r in H if any(r)]
        if nz:
            ref = sympy_hnf(Matrix(rows).T).T
            assert _same_lattice(nz, [[int(x) for x in r] for r in ref.tolist()], n)
    assert Hf.rank == len(Hf.pivots) == (Matrix(rows).rank() if rows and n else 0)


# --- bad input ---------------------------------------------------------------------


@pytest.mark.parametrize(
    "bad, kwargs, match",
    [
        ([[1, 2], [3]], {}, "row 1 of A has 1 entries, not 2"),
        ([[1, 2.0]], {}, "must be an integer"),
        ([{0: 1}], {}, "give ncols"),
        ([{5: 1}], {"ncols": 3}, "column index 5, outside 0..2"),
        ("12", {}, "sequence of rows"),
        ([], {}, "give ncols"),
        ([[1, 2]], {"ncols": 3}, "row 0 of A has 2 entries, not 3"),
    ],
)
def test_bad_input(bad, kwargs, match):
    for fn in (smith_normal_form, hermite_normal_form, lattice_quotient):
        with pytest.raises(FormkitError, match=match):
            fn(bad, **kwargs)


def test_coordinates_bad_vector():
    G = lattice_quotient([[2, 0], [0, 3]])
    with pytest.raises(FormkitError, match="x has 3 entries, not 2"):
        G.coordinates([1, 2, 3])
