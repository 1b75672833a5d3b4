"""Smith normal forms with the column transformation, from a Hermite normal form.

The last step of :func:`formkit.core.abelian_quotient.lattice_quotient`: a lattice given
by its row Hermite normal form ``H`` (k columns) is brought to the diagonal
``d₁ | d₂ | …`` of its Smith normal form, and the unimodular column transformation ``V``
is kept, since generators (rows of ``V⁻¹``) and discrete logarithms (``x·V``) need it;
the row transformation, which only recombines relations, is not computed.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993, §2.4.3 (Algorithm 2.4.14).
.. [2] R. Kannan, A. Bachem, "Polynomial algorithms for computing the Smith and Hermite
       normal forms of an integer matrix", SIAM J. Comput. 8 (1979) 499–507.
"""

from __future__ import annotations

from typing import Any

import flint

from .arith import xgcd
from .matrix_input import identity_lists

__all__ = ["smith_of_hermite", "dense_smith", "unimodular_inverse"]


def _is_diagonal(B: list[list[int]]) -> bool:
    return all(not x or i == j for i, r in enumerate(B) for j, x in enumerate(r))


def dense_smith(M: flint.fmpz_mat) -> tuple[list[int], list[list[int]]]:
    """``(d, V)`` for a dense k-column matrix: ``d`` the k diagonal entries of a Smith form
    of ``M·V`` (ones first, then entries > 1 each dividing the next, then zeros) and
    ``V`` unimodular (k × k, as lists), from FLINT's Hermite form of the whole ``M``.

    Examples
    --------
    >>> dense_smith(flint.fmpz_mat([[2, 4], [6, 6]]))[0]
    [2, 6]
    """
    k = M.ncols()
    if k == 0:
        return [], []
    H = M.hnf() if M.nrows() else M
    return smith_of_hermite([[int(x) for x in r] for r in H.tolist()], k)


def smith_of_hermite(Hl: list[list[int]], k: int) -> tuple[list[int], list[list[int]]]:
    """``(d, V)`` as in :func:`dense_smith` for the lattice of ``Hl``, a matrix in Hermite
    normal form with k columns (zero rows allowed).

    Rows of ``Hl`` whose pivot is 1 are cleared by column operations; the rest (the
    columns whose pivot exceeds 1, usually a handful) is diagonalised by alternating
    column and row Hermite forms (Kannan–Bachem [2]) with the column transformations
    tracked, and the diagonal is made a divisibility chain by gcd/lcm steps (Cohen [1],
    Algorithm 2.4.14, step 10).

    Parameters
    ----------
    Hl : list of list of int
        A matrix in row Hermite normal form (FLINT's convention), k columns.
    k : int
        The number of columns.

    Returns
    -------
    tuple
        ``(d, V)``: k diagonal entries and the k × k unimodular ``V``; the lattice of
        ``Hl`` is ``{x : (x·V)_i ∈ d_i·Z}``.

    Examples
    --------
    Z² modulo the rows (2, 1), (0, 3) is cyclic of order 6:

    >>> d, V = smith_of_hermite([[2, 1], [0, 3]], 2)
    >>> d
    [1, 6]
    """
    if k == 0:
        return [], []
    Hl = [r for r in Hl if any(r)]
    # rows whose pivot is 1: their column is a unit vector; clear the rest of the row
    # by column operations (they change that row only): V = I − E on those rows
    unit_rows = []
    unit_cols = set()
    for r in Hl:
        j = next(j for j, x in enumerate(r) if x)
        if r[j] == 1:
            unit_rows.append((j, r))
            unit_cols.add(j)
    rest_rows = [r for r in Hl if r[next(j for j, x in enumerate(r) if x)] != 1]
    Q = [j for j in range(k) if j not in unit_cols]
    B = [[r[j] for j in Q] for r in rest_rows]
    q = len(Q)
    Vb = identity_lists(q)
    if q and B:
        Bm = flint.fmpz_mat(B)
        while True:
            T_H, T = Bm.transpose().hnf(True)  # column step: B·Tᵀ = T_Hᵀ
            Vb_m = flint.fmpz_mat(Vb) * T.transpose()
            Vb = [[int(x) for x in r] for r in Vb_m.tolist()]
            Bm = T_H.transpose()
            Bl = [[int(x) for x in r] for r in Bm.tolist()]
            Bl = [r for r in Bl if any(r)]
            if _is_diagonal(Bl):
                break
            Bm = flint.fmpz_mat(Bl).hnf()  # row step (untracked)
            Bl = [r for r in ([int(x) for x in r] for r in Bm.tolist()) if any(r)]
            if _is_diagonal(Bl):
                break
            Bm = flint.fmpz_mat(Bl)
        diag = [abs(Bl[i][i]) if i < len(Bl) else 0 for i in range(q)]
        for i, r in enumerate(Bl):  # make the diagonal non-negative
            if r[i] < 0:
                for row in Vb:
                    row[i] = -row[i]
    else:
        diag = [0] * q
    # gcd/lcm of pairs until each non-zero entry divides the next (Cohen 2.4.14, step 10)
    nz = [i for i in range(q) if diag[i]]
    for a_pos in range(len(nz)):
        for b_pos in range(a_pos + 1, len(nz)):
            i, j = nz[a_pos], nz[b_pos]
            a, b = diag[i], diag[j]
            if b % a == 0:
                continue
            g, s, t = (int(x) for x in xgcd(a, b))
            # U·diag(a, b)·W = diag(g, ab/g) with W = [[1, −t·b/g], [1, s·a/g]]
            bg, ag = b // g, a // g
            for row in Vb:
                ci, cj = row[i], row[j]
                row[i] = ci + cj
                row[j] = -t * bg * ci + s * ag * cj
            diag[i], diag[j] = g, a * bg
    # order: ones, then the rest by size (the divisibility chain), then zeros
    order_b = sorted(range(q), key=lambda i: (diag[i] == 0, diag[i]))
    # assemble V on all k columns: V = (I − E) · (I on unit columns ⊕ Vb on Q)
    V = identity_lists(k)
    for ii, qi in enumerate(Q):
        for jj, qj in enumerate(Q):
            V[qi][qj] = Vb[ii][jj]
    for j, r in unit_rows:
        # row j of (I − E)·(I ⊕ Vb) = e_j − Σ_{c∈Q} r[c]·(row c of I ⊕ Vb)
        for ii, qi in enumerate(Q):
            c = r[qi]
            if c:
                for jj, qj in enumerate(Q):
                    V[j][qj] -= c * Vb[ii][jj]
    cols_order = sorted(unit_cols) + [Q[i] for i in order_b]
    d = [1] * len(unit_cols) + [diag[i] for i in order_b]
    V = [[row[c] for c in cols_order] for row in V]
    return d, V


def unimodular_inverse(V: list[list[int]]) -> list[list[int]]:
    """The inverse of a unimodular integer matrix (as lists), through FLINT's rational inverse.

    Examples
    --------
    >>> unimodular_inverse([[2, 1], [1, 1]])
    [[1, -1], [-1, 2]]
    """
    k = len(V)
    if k == 0:
        return []
    inv: Any = flint.fmpz_mat(V).inv()
    num, den = inv.numer_denom()
    if abs(int(den)) != 1:  # pragma: no cover - V is unimodular by construction
        raise ArithmeticError("transformation matrix is not unimodular")
    return [[int(x) * int(den) for x in r] for r in num.tolist()]
