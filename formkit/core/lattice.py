"""Integer lattices: Hermite and Smith normal forms with transformations, quotients Zⁿ/L.

A matrix ``A`` (m rows, n columns, integer entries) stands for the lattice ``L`` spanned
by its rows in Zⁿ.  This module gives

* :func:`hermite_normal_form` — the row Hermite normal form ``H = T·A`` (upper echelon,
  positive pivots, entries above a pivot reduced into ``[0, pivot)``, zero rows last),
  optionally with the unimodular ``T``;
* :func:`smith_normal_form` — the diagonal ``d₁ | d₂ | … `` of ``U·A·V`` with ``U``, ``V``
  unimodular, optionally with the column transformation ``V`` and its inverse (the two
  matrices that generators and discrete logarithms need; the row transformation ``U``,
  which only recombines relations, is not computed);
* :func:`lattice_quotient` and :func:`finite_lattice_quotient` (from
  :mod:`formkit.core.abelian_quotient`, importable from here) — the finitely generated
  abelian group ``Zⁿ/L`` itself: its invariants, generators as integer vectors, and the
  coordinates (discrete logarithm) of any vector.

The work is spread over modules by topic: reading matrices
(:mod:`formkit.core.matrix_input`), structured elimination
(:mod:`formkit.core.sparse_elimination`), Hermite forms of tall matrices through a
sublattice (:mod:`formkit.core.modular_hermite`), the Smith form with its column
transformation from a Hermite form (:mod:`formkit.core.smith_diagonal`) and the quotient
(:mod:`formkit.core.abelian_quotient`, whose docstring describes the method).  Every
result is checked before it is returned: ``V·V⁻¹ = I`` and every relation vanishes in
the quotient.  FLINT is used for its exact integer matrix arithmetic (Hermite forms,
products, inverses); the normal forms and quotients are assembled here.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993: §2.4.2 (Hermite normal form, Algorithm 2.4.5), §2.4.3 (Smith normal form,
       Algorithm 2.4.14), Algorithm 2.4.8 (HNF modulo D).
.. [2] R. Kannan, A. Bachem, "Polynomial algorithms for computing the Smith and Hermite
       normal forms of an integer matrix", SIAM J. Comput. 8 (1979) 499–507.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property

import flint

from ..errors import FormkitError
from .abelian_quotient import LatticeQuotient, finite_lattice_quotient, lattice_quotient
from .displays import SentenceDisplay
from .matrix_input import MatrixLike, Rows, dense_matrix, identity_lists, matrix_tuples, read_matrix

__all__ = [
    "HermiteForm",
    "SmithForm",
    "LatticeQuotient",
    "hermite_normal_form",
    "smith_normal_form",
    "lattice_quotient",
    "finite_lattice_quotient",
]


# ---------------------------------------------------------------------------
# Hermite normal form


@dataclass(frozen=True)
class HermiteForm(SentenceDisplay):
    """The row Hermite normal form ``H = T·A`` of an integer matrix ``A``.

    ``H`` is upper echelon: the first ``rank`` rows are non-zero, the pivot (first
    non-zero entry) of each is positive and lies right of the one above, every entry
    above a pivot lies in ``[0, pivot)``; the other rows are zero.  ``transform`` is
    ``T`` (unimodular, m × m) when it was asked for, else ``None``.
    """

    matrix: Rows
    rank: int
    pivots: tuple[int, ...]
    transform: Rows | None = field(default=None, repr=False)

    def _display_sentence(self) -> str:
        return f"Hermite normal form of rank {self.rank}, pivots in columns {list(self.pivots)}"

    def _display_provenance(self) -> str:
        return "exact integer linear algebra (FLINT)"

    def __repr__(self) -> str:
        m = len(self.matrix)
        n = len(self.matrix[0]) if m else 0
        t = ", with transform" if self.transform is not None else ""
        return f"HermiteForm({m}×{n}, rank {self.rank}, pivots {list(self.pivots)}{t})"


def hermite_normal_form(A: MatrixLike, *, ncols: int | None = None, transform: bool = False) -> HermiteForm:
    """The row Hermite normal form of ``A``: the canonical basis of its row lattice.

    Parameters
    ----------
    A : sequence of rows, or ``flint.fmpz_mat``
        Integer matrix (rows as sequences of integers, or as mappings ``{column: entry}``
        with ``ncols`` given).
    ncols : int, optional
        Number of columns (needed for sparse rows or a matrix without rows).
    transform : bool
        Also return the unimodular ``T`` with ``T·A = H``.  When the rows of ``A`` are
        linearly dependent, the rows of ``T`` that give the zero rows of ``H`` form the
        Hermite basis of the left kernel, whose entries can be very large; the
        transformation is then slow to compute beyond some hundred rows.

    Returns
    -------
    HermiteForm
        ``matrix`` (m × n tuples), ``rank``, ``pivots`` (column of each non-zero row) and
        ``transform``.

    Raises
    ------
    FormkitError
        If ``A`` is not a matrix of integers.

    Examples
    --------
    >>> H = hermite_normal_form([[2, 4, 4], [-6, 6, 12], [10, -4, -16]])
    >>> H.matrix
    ((2, 4, 4), (0, 6, 0), (0, 0, 12))
    >>> H = hermite_normal_form([[3, 6], [2, 4]], transform=True)
    >>> H.matrix, H.rank
    (((1, 2), (0, 0)), 1)
    >>> T = H.transform
    >>> [[T[i][0] * 3 + T[i][1] * 2, T[i][0] * 6 + T[i][1] * 4] for i in range(2)]
    [[1, 2], [0, 0]]

    References
    ----------
    Cohen, GTM 138, Definition 2.4.2 and Algorithm 2.4.5; the computation is FLINT's
    ``fmpz_mat_hnf`` (with ``fmpz_mat_hnf_transform``), checked here by ``T·A = H``.
    """
    n, rows = read_matrix(A, ncols)
    m = len(rows)
    M = dense_matrix(rows, range(n))
    if transform:
        H, T = M.hnf(True)
        if m and n and T * M != H:  # pragma: no cover - would be a FLINT bug
            raise ArithmeticError("Hermite normal form: T·A ≠ H")
        Tt: Rows | None = matrix_tuples(T)
    else:
        H = M.hnf()
        Tt = None
    Ht = matrix_tuples(H) if m else ()
    pivots = []
    for r in Ht:
        j = next((j for j, x in enumerate(r) if x), None)
        if j is None:
            break
        pivots.append(j)
    return HermiteForm(matrix=Ht, rank=len(pivots), pivots=tuple(pivots), transform=Tt)


# ---------------------------------------------------------------------------
# Smith normal form


class SmithForm:
    """The Smith normal form of an m × n integer matrix ``A``: ``U·A·V = diag(d)``.

    ``diagonal`` has min(m, n) entries ``d₁ | d₂ | … | d_r``, r the rank, then zeros.
    With ``transforms=True`` in :func:`smith_normal_form`, ``right`` is ``V`` (n × n,
    unimodular) and ``right_inverse`` its inverse: the class of ``x ∈ Zⁿ`` in
    ``Zⁿ/L`` has coordinates ``(x·V)_i mod d_i`` (``d_i`` extended by zeros to n
    entries), and row i of ``V⁻¹`` is a generator of the i-th cyclic factor.  The row
    transformation ``U`` is not computed.
    """

    def __init__(self, m: int, n: int, quotient: LatticeQuotient, with_transforms: bool) -> None:
        self.shape = (m, n)
        self._q = quotient
        full = [1] * (n - len(quotient.invariants)) + list(quotient.invariants)
        self._full = full
        self.diagonal: tuple[int, ...] = tuple(full[: min(m, n)])
        self._with = with_transforms

    @property
    def rank(self) -> int:
        return sum(1 for x in self.diagonal if x)

    @property
    def invariants(self) -> tuple[int, ...]:
        """The entries other than 1 of the diagonal, with one 0 per free generator of
        ``Zⁿ/L`` (so ``n − rank`` zeros): the invariants of the quotient group."""
        return self._q.invariants

    def _need(self) -> None:
        if not self._with:
            raise FormkitError(
                "the transformations were not computed: call smith_normal_form(A, transforms=True)"
            )

    @cached_property
    def _transforms(self) -> tuple[Rows, Rows]:
        q = self._q
        n = q.ncols
        alive = q._alive
        pos = {c: i for i, c in enumerate(alive)}
        # M0 = identity on eliminated columns ⊕ V_d on the alive ones
        V = identity_lists(n)
        Vinv = identity_lists(n)
        Vd, Vdi = q._Vd, q._Vd_inverse
        for c in alive:
            V[c][c] = 0
            Vinv[c][c] = 0
        for ii, ci in enumerate(alive):
            for jj, cj in enumerate(alive):
                V[ci][cj] = Vd[ii][jj]
                Vinv[ci][cj] = Vdi[ii][jj]
        # V = C_1 ⋯ C_T · M0 and V⁻¹ = M0⁻¹ · C_T⁻¹ ⋯ C_1⁻¹ (C_t the elimination steps)
        q._elim.lift_rows(V)
        q._elim.lift_columns(Vinv)
        order = sorted(set(range(n)) - set(pos)) + list(alive)
        Vt = tuple(tuple(r[c] for c in order) for r in V)
        Vit = tuple(tuple(Vinv[c]) for c in order)
        if n and flint.fmpz_mat([list(r) for r in Vt]) * flint.fmpz_mat(
            [list(r) for r in Vit]
        ) != flint.fmpz_mat(identity_lists(n)):  # pragma: no cover - internal check
            raise ArithmeticError("Smith normal form: V·V⁻¹ ≠ I")
        return Vt, Vit

    @property
    def right(self) -> Rows:
        """``V`` (n × n, unimodular) with ``U·A·V`` diagonal."""
        self._need()
        return self._transforms[0]

    @property
    def right_inverse(self) -> Rows:
        """``V⁻¹``: its rows are generators of the cyclic factors of ``Zⁿ/L``."""
        self._need()
        return self._transforms[1]

    @property
    def quotient(self) -> LatticeQuotient:
        """``Zⁿ/L`` with generators and coordinates (see :class:`LatticeQuotient`)."""
        return self._q

    def __repr__(self) -> str:
        m, n = self.shape
        shown = (
            list(self.diagonal)
            if len(self.diagonal) <= 12
            else [*self.diagonal[:4], "…", *self.diagonal[-6:]]
        )
        return f"SmithForm({m}×{n}, diagonal {shown})"


def smith_normal_form(A: MatrixLike, *, ncols: int | None = None, transforms: bool = False) -> SmithForm:
    """The Smith normal form ``U·A·V = diag(d₁, …, d_k)`` of an integer matrix.

    Parameters
    ----------
    A : sequence of rows, or ``flint.fmpz_mat``
        Integer matrix: rows of integers, or sparse rows ``{column: entry}`` with
        ``ncols`` given.
    ncols : int, optional
        Number of columns (needed for sparse rows or a matrix without rows).
    transforms : bool
        Also compute the column transformation ``V`` and ``V⁻¹`` (as tuples of rows);
        they are built when first read.

    Returns
    -------
    SmithForm
        ``diagonal`` (min(m, n) entries, each dividing the next, zeros last),
        ``invariants``, ``quotient`` and, if asked for, ``right`` and ``right_inverse``.

    Raises
    ------
    FormkitError
        If ``A`` is not an integer matrix.

    Examples
    --------
    >>> S = smith_normal_form([[2, 4, 4], [-6, 6, 12], [10, -4, -16]], transforms=True)
    >>> S.diagonal
    (2, 6, 12)
    >>> V = S.right
    >>> A = [[2, 4, 4], [-6, 6, 12], [10, -4, -16]]
    >>> AV = [[sum(A[i][k] * V[k][j] for k in range(3)) for j in range(3)] for i in range(3)]
    >>> smith_normal_form(AV).diagonal   # V is unimodular: same Smith form
    (2, 6, 12)

    References
    ----------
    Cohen, GTM 138, Algorithm 2.4.14; Kannan–Bachem (1979) for the alternation of row
    and column Hermite forms.
    """
    n, rows = read_matrix(A, ncols)
    q = lattice_quotient(rows, ncols=n)
    return SmithForm(len(rows), n, q, transforms)
