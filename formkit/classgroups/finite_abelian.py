"""Subgroups and quotients of finite abelian groups given by generators and relations.

A finite abelian group here is ``Z^r / R`` (``R`` a full-rank lattice given by relation
vectors); a subgroup is ``L / R`` for a lattice ``R ⊆ L ⊆ Z^r``.  The structure of
``L / R`` comes from the Smith normal form of the matrix of ``R`` on a basis of ``L``,
with the unimodular column transform giving generators of the invariant factors (Cohen,
GTM 138, Algorithm 2.4.14 for the Smith normal form and §2.4.3 on finite abelian
groups; Hermite normal form, Algorithm 2.4.5).  Kernels of homomorphisms
``Z^r/R_G → Z^s/R_H`` are lattices ``{e : A·e ∈ R_H}``, found from the integer kernel
of ``[A | −R_H]``.  Used for the kernel of ``Cl(O) → Cl(O_K)`` and for the class group
``Cl(O) = Cl⁺(O)/⟨σ⟩`` of a real order.

The normal forms are those of :mod:`formkit.core.lattice` (Hermite forms with their
transformation, Smith forms with the column transformation, on python-flint's exact
integer matrices); this module only sets up the lattices and reads the answers back.
The matrices are small (one row per invariant factor of a class group).

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993, §2.4.2–2.4.3 (Algorithms 2.4.5 and 2.4.14, Theorem 2.4.12).
"""

from __future__ import annotations

from collections.abc import Sequence

from ..core.lattice import hermite_normal_form, lattice_quotient

__all__: list[str] = []

Matrix = list[list[int]]


def _identity(n: int) -> Matrix:
    return [[int(i == j) for j in range(n)] for i in range(n)]


def integer_kernel(M: Matrix) -> list[list[int]]:
    """A basis of ``{x ∈ Z^n : M·x = 0}`` (as a list of vectors).

    The rows of the transformation ``T`` of the Hermite form ``T·Mᵀ = H`` that give the
    zero rows of ``H`` (``T`` is unimodular, so they are a basis of the kernel lattice,
    not only of the rational kernel; Cohen, GTM 138, Proposition 2.4.9, from memory).
    """
    if not M:
        return []
    n = len(M[0])
    Mt = [[M[i][j] for i in range(len(M))] for j in range(n)]
    H = hermite_normal_form(Mt, ncols=len(M), transform=True)
    assert H.transform is not None
    return [list(row) for row in H.transform[H.rank :]]


def lattice_basis(vectors: Sequence[Sequence[int]], dim: int) -> Matrix:
    """The Hermite basis (rows of an upper-triangular ``dim × dim`` matrix) of the full-rank lattice spanned by ``vectors``."""
    H = hermite_normal_form([list(v) for v in vectors], ncols=dim)
    if H.rank != dim:
        raise ArithmeticError(f"the lattice has rank {H.rank}, not {dim}")
    return [list(row) for row in H.matrix[:dim]]


def _solve_upper(B: Matrix, v: Sequence[int]) -> list[int]:
    """``c`` with ``c·B = v`` for the upper-triangular basis rows ``B`` (exact; ``v`` in the lattice)."""
    n = len(B)
    c = [0] * n
    for j in range(n):
        s = v[j] - sum(c[i] * B[i][j] for i in range(j))
        if s % B[j][j]:
            raise ArithmeticError("vector is not in the lattice")
        c[j] = s // B[j][j]
    return c


def subquotient(
    subgroup: Sequence[Sequence[int]], relations: Sequence[Sequence[int]], dim: int
) -> tuple[tuple[int, ...], list[list[int]]]:
    """Structure of ``L/R``: invariant factors ``n_1 | n_2 | …`` (all > 1) and generators (vectors of ``Z^dim``).

    ``subgroup`` spans ``L`` and ``relations`` spans ``R ⊆ L``, both of rank ``dim``.
    On the basis ``B`` of ``L`` the relations have coordinates ``C`` (``R = C·B``), so
    ``L/R ≅ Z^dim / (row lattice of C)``; a generator with coordinates ``g`` is the
    vector ``g·B``.
    """
    B = lattice_basis(list(subgroup) + list(relations), dim)
    C = [_solve_upper(B, r) for r in relations]
    q = lattice_quotient(C, ncols=dim)
    if not q.is_finite:
        raise ArithmeticError(f"the relations have rank below {dim}: L/R is infinite")
    gens = [[sum(g[k] * B[k][j] for k in range(dim)) for j in range(dim)] for g in q.generators]
    return q.invariants, gens


def homomorphism_kernel(
    images: Sequence[Sequence[int]],
    source_relations: Sequence[Sequence[int]],
    target_relations: Sequence[Sequence[int]],
    dim: int,
) -> tuple[tuple[int, ...], list[list[int]]]:
    """Kernel of ``Z^dim/R_G → Z^s/R_H``, ``e_i ↦ images[i]``: invariants and generators (as for :func:`subquotient`)."""
    s = len(images[0]) if images else 0
    if s == 0:
        return subquotient(_identity(dim), source_relations, dim)
    # [A | −R_H] (x; y) = 0
    M = [[images[j][i] for j in range(dim)] + [-r[i] for r in target_relations] for i in range(s)]
    kernel = [v[:dim] for v in integer_kernel(M)]
    return subquotient(kernel, source_relations, dim)
