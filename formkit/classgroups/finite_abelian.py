"""Subgroups and quotients of finite abelian groups given by generators and relations.

A finite abelian group here is ``Z^r / R`` (``R`` a full-rank lattice given by relation
vectors); a subgroup is ``L / R`` for a lattice ``R ⊆ L ⊆ Z^r``.  The structure of
``L / R`` comes from the Smith normal form of the matrix of ``R`` on a basis of ``L``,
with the unimodular transforms giving generators of the invariant factors (Cohen,
GTM 138, Algorithm 2.4.14 for the Smith normal form and §2.4.3 on finite abelian
groups; Hermite normal form, Algorithm 2.4.5 — from memory).  Kernels of
homomorphisms ``Z^r/R_G → Z^s/R_H`` are lattices ``{e : A·e ∈ R_H}``, found from the
integer kernel of ``[A | −R_H]``.  Used for the kernel of ``Cl(O) → Cl(O_K)`` and for the
class group ``Cl(O) = Cl⁺(O)/⟨σ⟩`` of a real order.

All arithmetic is exact on Python integers; the matrices are small (one row per
invariant factor of a class group).

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, §2.4.
"""

from __future__ import annotations

from collections.abc import Sequence

__all__: list[str] = []

Matrix = list[list[int]]


def _identity(n: int) -> Matrix:
    return [[int(i == j) for j in range(n)] for i in range(n)]


def _column_echelon(M: Matrix) -> tuple[Matrix, Matrix, int]:
    """Column operations: ``M·U = [E | 0]`` with ``E`` of full column rank; returns ``(M·U, U, rank)``."""
    rows, cols = len(M), len(M[0]) if M else 0
    A = [row[:] for row in M]
    U = _identity(cols)
    rank = 0
    for i in range(rows):
        if rank == cols:
            break
        # bring gcd of A[i][rank:] into column `rank` by Euclid on columns
        while True:
            nz = [j for j in range(rank, cols) if A[i][j] != 0]
            if not nz:
                break
            j0 = min(nz, key=lambda j: abs(A[i][j]))
            _swap_cols(A, U, rank, j0)
            done = True
            for j in range(rank + 1, cols):
                if A[i][j]:
                    q = A[i][j] // A[i][rank]
                    _add_col(A, U, j, rank, -q)
                    if A[i][j]:
                        done = False
            if done:
                break
        if A[i][rank] != 0:
            rank += 1
    return A, U, rank


def _swap_cols(A: Matrix, U: Matrix, i: int, j: int) -> None:
    if i != j:
        for row in A:
            row[i], row[j] = row[j], row[i]
        for row in U:
            row[i], row[j] = row[j], row[i]


def _add_col(A: Matrix, U: Matrix, target: int, source: int, q: int) -> None:
    for row in A:
        row[target] += q * row[source]
    for row in U:
        row[target] += q * row[source]


def integer_kernel(M: Matrix) -> list[list[int]]:
    """A basis of ``{x ∈ Z^n : M·x = 0}`` (as a list of vectors)."""
    if not M:
        return []
    _E, U, rank = _column_echelon(M)
    n = len(M[0])
    return [[U[i][j] for i in range(n)] for j in range(rank, n)]


def lattice_basis(vectors: Sequence[Sequence[int]], dim: int) -> Matrix:
    """A basis (as columns of a ``dim × dim`` matrix) of the full-rank lattice spanned by ``vectors``."""
    M = [[v[i] for v in vectors] for i in range(dim)]
    E, _U, rank = _column_echelon(M)
    if rank != dim:
        raise ArithmeticError(f"the lattice has rank {rank}, not {dim}")
    return [row[:dim] for row in E]


def _solve_lower(B: Matrix, v: Sequence[int]) -> list[int]:
    """``c`` with ``B·c = v`` for a lower-triangular (column echelon) ``B`` (exact; ``v`` in the lattice)."""
    n = len(B)
    c = [0] * n
    for i in range(n):
        s = v[i] - sum(B[i][j] * c[j] for j in range(i))
        if s % B[i][i]:
            raise ArithmeticError("vector is not in the lattice")
        c[i] = s // B[i][i]
    return c


def smith_form(M: Matrix) -> tuple[list[int], Matrix]:
    """Diagonal ``d`` of the Smith normal form of the square or wide matrix ``M``, and ``W = U⁻¹``.

    ``U·M·V = diag(d)`` with unimodular ``U, V``; only ``U⁻¹`` is returned (its columns
    are the new basis vectors of the ambient lattice; column ``i`` generates ``Z/d_i``).
    """
    n, m = len(M), len(M[0]) if M else 0
    A = [row[:] for row in M]
    W = _identity(n)  # W = U^{-1}: row op (r_i += q r_j) on A is column op (c_j −= q c_i) on W
    t = 0
    while t < min(n, m):
        nz = [(abs(A[i][j]), i, j) for i in range(t, n) for j in range(t, m) if A[i][j]]
        if not nz:
            break
        _v, i0, j0 = min(nz)
        A[t], A[i0] = A[i0], A[t]
        for row in W:
            row[t], row[i0] = row[i0], row[t]
        for row in A:
            row[t], row[j0] = row[j0], row[t]
        again = False
        for i in range(t + 1, n):
            q = A[i][t] // A[t][t]
            if q:
                A[i] = [x - q * y for x, y in zip(A[i], A[t])]
                for row in W:
                    row[t] += q * row[i]
            if A[i][t]:
                again = True
        for j in range(t + 1, m):
            q = A[t][j] // A[t][t]
            if q:
                for row in A:
                    row[j] -= q * row[t]
            if A[t][j]:
                again = True
        if again:
            continue
        # divisibility: d_t must divide every later entry
        bad = next(((i, j) for i in range(t + 1, n) for j in range(t + 1, m) if A[i][j] % A[t][t]), None)
        if bad is not None:
            i = bad[0]
            A[t] = [x + y for x, y in zip(A[t], A[i])]
            for row in W:
                row[i] -= row[t]
            continue
        t += 1
    d = [abs(A[i][i]) if i < m else 0 for i in range(n)]
    return d, W


def subquotient(
    subgroup: Sequence[Sequence[int]], relations: Sequence[Sequence[int]], dim: int
) -> tuple[tuple[int, ...], list[list[int]]]:
    """Structure of ``L/R``: invariant factors ``n_1 | n_2 | …`` (all > 1) and generators (vectors of ``Z^dim``).

    ``subgroup`` spans ``L`` and ``relations`` spans ``R ⊆ L``, both of rank ``dim``.
    """
    B = lattice_basis(list(subgroup) + list(relations), dim)
    C = [[0] * len(relations) for _ in range(dim)]
    for j, r in enumerate(relations):
        c = _solve_lower(B, r)
        for i in range(dim):
            C[i][j] = c[i]
    d, W = smith_form(C)
    pairs = []
    for i in range(dim):
        if d[i] != 1:
            gen = [sum(B[r][k] * W[k][i] for k in range(dim)) for r in range(dim)]
            pairs.append((d[i], gen))
    pairs.sort(key=lambda t: t[0])
    return tuple(n for n, _ in pairs), [g for _, g in pairs]


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
