"""Tests of formkit.classgroups.finite_abelian: subquotients L/R and kernels of homomorphisms.

Outside references: sympy's ``smith_normal_form`` (a general-purpose library) for the
invariant factors; FLINT's ``fmpz_mat.hnf`` and ``fmpz_mat.rank`` for lattice equality
and ranks; brute force (listing the elements of small groups) for kernels.  The
structure theorem used to check generators — if g_1, …, g_k generate a finite abelian
group of order ∏ n_i and n_i·g_i = 0, then it is ⊕ ⟨g_i⟩ ≅ ⊕ Z/n_i — is Cohen, GTM 138,
Theorem 2.4.12 (from memory).
"""

from __future__ import annotations

import itertools

import flint
from hypothesis import given, settings
from hypothesis import strategies as st
from sympy import Matrix
from sympy.matrices.normalforms import smith_normal_form as sympy_snf

from formkit.classgroups.finite_abelian import homomorphism_kernel, integer_kernel, subquotient


def _det(rows: list[list[int]]) -> int:
    return int(flint.fmpz_mat(rows).det())


def _hnf_rows(rows: list[list[int]]) -> list[list[int]]:
    return [[int(x) for x in r] for r in flint.fmpz_mat(rows).hnf().tolist() if any(r)]


def _in_lattice(v: list[int], rows: list[list[int]]) -> bool:
    return _hnf_rows(rows + [v]) == _hnf_rows(rows)


def _full_rank(dim: int, lo: int = -6, hi: int = 6) -> st.SearchStrategy[list[list[int]]]:
    row = st.lists(st.integers(lo, hi), min_size=dim, max_size=dim)
    return st.lists(row, min_size=dim, max_size=dim).filter(lambda M: _det(M) != 0)


def _check_structure(inv, gens, L, R):
    """``gens`` realise ``L/R ≅ ⊕ Z/inv_i`` (see the module docstring)."""
    index = abs(_det(_hnf_rows(R))) // abs(_det(_hnf_rows(L)))
    prod = 1
    for n in inv:
        prod *= n
    assert prod == index
    assert all(n > 1 for n in inv) and all(b % a == 0 for a, b in itertools.pairwise(inv))
    for n, g in zip(inv, gens):
        assert _in_lattice(g, L)
        assert _in_lattice([n * x for x in g], R)
    assert _hnf_rows([list(g) for g in gens] + R) == _hnf_rows(L)


@settings(max_examples=60, deadline=None)
@given(st.integers(1, 4).flatmap(_full_rank))
def test_quotient_of_whole_lattice_agrees_with_sympy(R):
    dim = len(R)
    inv, gens = subquotient([[int(i == j) for j in range(dim)] for i in range(dim)], R, dim)
    # sympy: the diagonal of the Smith form, without the ones (invariant factors)
    S = sympy_snf(Matrix(R))
    expected = sorted(abs(int(S[i, i])) for i in range(dim) if abs(int(S[i, i])) != 1)
    assert list(inv) == expected
    _check_structure(inv, gens, [[int(i == j) for j in range(dim)] for i in range(dim)], R)


@settings(max_examples=40, deadline=None)
@given(st.integers(1, 3).flatmap(lambda d: st.tuples(_full_rank(d, -4, 4), _full_rank(d, -3, 3))))
def test_subquotient_of_a_sublattice(LM):
    L, M = LM
    dim = len(L)
    R = [[sum(M[i][k] * L[k][j] for k in range(dim)) for j in range(dim)] for i in range(dim)]  # R = M·L ⊆ L
    inv, gens = subquotient(L, R, dim)
    S = sympy_snf(Matrix(M))  # L/R ≅ Z^dim / (rows of M)
    assert list(inv) == sorted(abs(int(S[i, i])) for i in range(dim) if abs(int(S[i, i])) != 1)
    _check_structure(inv, gens, L, R)


@settings(max_examples=60, deadline=None)
@given(
    st.integers(1, 4).flatmap(
        lambda n: st.lists(st.lists(st.integers(-5, 5), min_size=n, max_size=n), min_size=1, max_size=4)
    )
)
def test_integer_kernel_is_a_saturated_basis(M):
    n = len(M[0])
    K = integer_kernel(M)
    rank = flint.fmpz_mat(M).rank()
    assert len(K) == n - rank
    for x in K:
        assert all(sum(r[j] * x[j] for j in range(n)) == 0 for r in M)
    if K:
        # a basis of the kernel lattice (not a sublattice of finite index): its Smith
        # diagonal is all ones (sympy)
        S = sympy_snf(Matrix(K))
        assert all(abs(int(S[i, i])) == 1 for i in range(len(K)))


def test_homomorphism_kernel_by_brute_force():
    # Z/4 × Z/6 → Z/6 × Z/2, e_0 ↦ (3, 1), e_1 ↦ (2, 0): brute force over the 24 elements
    src = [[4, 0], [0, 6]]
    tgt = [[6, 0], [0, 2]]
    images = [[3, 1], [2, 0]]
    inv, gens = homomorphism_kernel(images, src, tgt, 2)
    kernel = [
        (x, y) for x, y in itertools.product(range(4), range(6)) if (3 * x + 2 * y) % 6 == 0 and x % 2 == 0
    ]
    prod = 1
    for n in inv:
        prod *= n
    assert prod == len(kernel)
    # the generators lie in the kernel and generate it
    reached = {(0, 0)}
    for g in gens:
        assert ((3 * g[0] + 2 * g[1]) % 6, g[0] % 2) == (0, 0)
        reached = {((a + k * g[0]) % 4, (b + k * g[1]) % 6) for a, b in reached for k in range(12)}
    assert reached == set(kernel)
