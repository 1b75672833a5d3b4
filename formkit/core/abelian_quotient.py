"""The finitely generated abelian group ``Zⁿ/L`` of an integer lattice: invariants, generators, coordinates.

A group presented by n generators (the columns) and relations (the rows of an integer
matrix spanning the lattice ``L``), for instance a class group given by relations among
prime forms, is ``Zⁿ/L``.  :func:`lattice_quotient` computes it: its invariants (the
Smith invariants other than 1), a generator of each cyclic factor as an integer vector
and the coordinates (discrete logarithm) of any vector; :func:`finite_lattice_quotient`
does the same only when ``L`` has full rank, which a search for relations tests after
every batch.

Method.  Rows are read sparsely.  First a structured Gaussian elimination
(:mod:`formkit.core.sparse_elimination`) removes, one at a time, a column that has an
entry ±1 in some row, choosing the pair of least Markowitz cost (fill-in); each step is
a unimodular column operation followed by the removal of a row and a column that have
become a unit vector, so it changes neither the quotient nor the Smith form apart from
a 1 on the diagonal.  The dense rest (a few hundred columns, but as many rows as
relations are left) is put into Hermite normal form through sublattices
(:mod:`formkit.core.modular_hermite`): k of its rows and a few random combinations of
all rows, whose determinant is a multiple of the index [3]; a candidate is accepted
when every relation vanishes in its quotient, tested through its Smith form on the few
columns with an invariant ≠ 1.  Below :data:`SUBLATTICE_FROM_COLUMNS` columns, or with
``hermite="whole"``, FLINT takes all rows at once.  The Smith form with its column
transformation comes from the Hermite form (:mod:`formkit.core.smith_diagonal`).

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993: §2.4.3 (Theorem 2.4.12, Algorithm 2.4.14), Algorithm 2.4.8 (HNF modulo D),
       §5.5 (relation matrices of class groups).
.. [2] B. A. LaMacchia, A. M. Odlyzko, "Solving large sparse linear systems over finite
       fields", CRYPTO '90, LNCS 537 (structured Gaussian elimination).
.. [3] P. D. Domich, R. Kannan, L. E. Trotter, "Hermite normal form computation using
       modulo determinant arithmetic", Math. Oper. Res. 12 (1987), 50–59.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping, Sequence
from functools import cached_property

import flint

from ..errors import FormkitError
from .arith import as_int
from .matrix_input import MatrixLike, dense_lists, read_matrix
from .modular_hermite import sublattice_hermite_forms
from .smith_diagonal import smith_of_hermite, unimodular_inverse
from .sparse_elimination import (
    MARKOWITZ_LIMIT,
    RANK_PRIME,
    Elimination,
    eliminate_unit_pivots,
    markowitz_limit,
)

__all__ = ["LatticeQuotient", "lattice_quotient", "finite_lattice_quotient"]

#: Below this many columns the sparse elimination is skipped (FLINT on the whole matrix
#: is faster than the bookkeeping).
SPARSE_FROM_COLUMNS = 24

#: Below this many columns of the dense rest, its Hermite form is FLINT's on the whole
#: matrix even with ``hermite="sublattice"`` (measured: 0.33 against 0.14 ms for 14 × 4,
#: 2.4 against 1.9 ms for 60 × 20 random matrices; the sublattice wins from some dozens
#: of columns and thousands of rows on).
SUBLATTICE_FROM_COLUMNS = 32


class LatticeQuotient:
    """The abelian group ``Zⁿ/L`` for the row lattice ``L`` of an integer matrix.

    Built by :func:`lattice_quotient`.  ``invariants`` are the Smith invariants other
    than 1: finite ones ``d₁ | d₂ | …`` (each > 1) followed by one ``0`` per free
    generator (``Z``).  ``generators[i]`` is an integer vector of Zⁿ whose class has
    order ``invariants[i]`` (infinite for 0), and :meth:`coordinates` writes the class
    of any vector in these generators: ``x ≡ Σ c_i·generators[i] (mod L)`` with
    ``0 ≤ c_i < d_i`` (``c_i`` any integer where ``d_i = 0``).
    """

    def __init__(self, n: int, nrows: int, elim: Elimination, d: list[int], Vd: list[list[int]]) -> None:
        self.ncols = n
        self.nrows = nrows
        self._elim = elim
        self._steps = elim.steps
        self._alive = elim.alive
        self._d = d
        self._Vd = Vd
        nontrivial = [i for i, x in enumerate(d) if x != 1]
        self._nontrivial = nontrivial
        self.invariants: tuple[int, ...] = tuple(d[i] for i in nontrivial)

    @property
    def free_rank(self) -> int:
        """The number of factors Z (invariants equal to 0)."""
        return sum(1 for x in self.invariants if x == 0)

    @property
    def order(self) -> int:
        """The order of the torsion subgroup (of the whole group when it is finite)."""
        out = 1
        for x in self.invariants:
            if x:
                out *= x
        return out

    @property
    def is_finite(self) -> bool:
        return self.free_rank == 0

    @cached_property
    def _Vd_inverse(self) -> list[list[int]]:
        return unimodular_inverse(self._Vd)

    @cached_property
    def generators(self) -> tuple[tuple[int, ...], ...]:
        """One vector of Zⁿ per invariant, whose class has that order (see the class)."""
        inv = self._Vd_inverse
        out = []
        for i in self._nontrivial:
            v = [0] * self.ncols
            for jj, c in enumerate(self._alive):
                v[c] = inv[i][jj]
            out.append(tuple(v))
        return tuple(out)

    def _reduce_to_alive(self, x: Sequence[int] | Mapping[int, int]) -> list[int]:
        if isinstance(x, Mapping):
            vec = {}
            for j, v in x.items():
                j = as_int(j, "column index")
                if not 0 <= j < self.ncols:
                    raise FormkitError(f"column index {j} is outside 0..{self.ncols - 1}")
                vec[j] = as_int(v, f"x[{j}]")
        else:
            vals = [as_int(v, "entry of x") for v in x]
            if len(vals) != self.ncols:
                raise FormkitError(f"x has {len(vals)} entries, not {self.ncols}")
            vec = {j: v for j, v in enumerate(vals) if v}
        vec = self._elim.reduce(vec)
        return [vec.get(c, 0) for c in self._alive]

    def coordinates(self, x: Sequence[int] | Mapping[int, int]) -> tuple[int, ...]:
        """The coordinates of the class of ``x`` in :attr:`generators` (a discrete log).

        ``x`` is a vector of length n or a mapping ``{column: entry}``.  Entry i lies in
        ``[0, d_i)`` for a finite invariant ``d_i`` and is an arbitrary integer where
        ``d_i = 0``.
        """
        y = self._reduce_to_alive(x)
        out = []
        for i in self._nontrivial:
            z = sum(y[jj] * self._Vd[jj][i] for jj in range(len(y)) if y[jj])
            d = self._d[i]
            out.append(z % d if d else z)
        return tuple(out)

    def __repr__(self) -> str:
        inv = " × ".join("Z" if d == 0 else f"Z/{d}" for d in self.invariants) or "0"
        return f"LatticeQuotient(Z^{self.ncols} / L ≅ {inv})"


def lattice_quotient(
    A: MatrixLike, *, ncols: int | None = None, hermite: str = "sublattice"
) -> LatticeQuotient:
    """The abelian group ``Zⁿ/L``, L the lattice spanned by the rows of ``A``.

    This is the linear algebra of a group presented by generators (the n columns) and
    relations (the rows), for instance a class group given by relations among prime
    forms: the invariants, a generator of each cyclic factor (as an integer vector of
    exponents) and the coordinates of any vector.

    Parameters
    ----------
    A : sequence of rows, or ``flint.fmpz_mat``
        The relations: rows of n integers, or sparse rows ``{column: entry}`` (then
        ``ncols`` is required).  Sparse relation matrices with thousands of columns
        are fine: unit pivots are eliminated first (see the module docstring).
    ncols : int, optional
        The number of generators n.
    hermite : {"sublattice", "whole"}
        How the Hermite form of the dense rest (after the elimination) is computed:
        ``"sublattice"`` (default) from a sublattice, its determinant and a membership
        test modulo it (:func:`formkit.core.modular_hermite.tall_hermite_rows`; when the
        rest has at least :data:`SUBLATTICE_FROM_COLUMNS` columns and is tall),
        ``"whole"`` by FLINT on all rows at once (the earlier path, kept as a
        reference).  Both give the same result.

    Returns
    -------
    LatticeQuotient

    Raises
    ------
    FormkitError
        If ``A`` is not an integer matrix.

    Examples
    --------
    Z² modulo the rows (2, 4) and (6, 6) is Z/2 × Z/6:

    >>> G = lattice_quotient([[2, 4], [6, 6]])
    >>> G.invariants, G.order
    ((2, 6), 12)
    >>> G.coordinates([2, 4]), G.coordinates([0, 0])
    ((0, 0), (0, 0))

    A free factor appears as 0:

    >>> lattice_quotient([[0, 3, 0]]).invariants
    (3, 0, 0)

    References
    ----------
    Cohen, GTM 138, §2.4.3 (the Smith normal form and the structure of finitely
    generated abelian groups, Theorem 2.4.12 and Algorithm 2.4.14).
    """
    Q = _quotient(A, ncols, hermite, finite_only=False)
    assert Q is not None
    return Q


def finite_lattice_quotient(
    A: MatrixLike, *, ncols: int | None = None, hermite: str = "sublattice"
) -> LatticeQuotient | None:
    """:func:`lattice_quotient` when ``L`` has rank n (checked modulo a prime), else ``None``.

    After the structured elimination, the rank of the dense rest modulo the prime
    :data:`formkit.core.sparse_elimination.RANK_PRIME` is taken first (cheap); when it
    is below the number of its columns the quotient is infinite (unless the prime
    divides every maximal minor, a remote case) and ``None`` is returned without the
    Hermite and Smith forms.  A search that adds relations until the quotient is finite
    calls this.

    Parameters
    ----------
    A, ncols, hermite
        As in :func:`lattice_quotient`.

    Returns
    -------
    LatticeQuotient or None
        A finite quotient, or ``None``.

    Raises
    ------
    FormkitError
        If ``A`` is not an integer matrix.

    Examples
    --------
    >>> finite_lattice_quotient([[2, 4], [6, 6]]).invariants
    (2, 6)
    >>> finite_lattice_quotient([[0, 3, 0]]) is None
    True

    References
    ----------
    Cohen, GTM 138, §2.4.3; a rank modulo p is at most the rank over Q.
    """
    return _quotient(A, ncols, hermite, finite_only=True)


def _quotient(A: MatrixLike, ncols: int | None, hermite: str, finite_only: bool) -> LatticeQuotient | None:
    if hermite not in ("sublattice", "whole"):
        raise FormkitError(f"hermite must be 'sublattice' or 'whole', not {hermite!r}")
    n, rows = read_matrix(A, ncols)
    m = len(rows)
    limit = markowitz_limit(n)
    if finite_only and n >= SPARSE_FROM_COLUMNS and limit > MARKOWITZ_LIMIT:
        # the rank test after a shorter elimination (a larger dense rest costs little
        # modulo a prime; the long elimination pays only for the Hermite form): at 50
        # digits 1.9 s instead of 4.9 s per test (docs/performance.md)
        test = eliminate_unit_pivots(n, [dict(r) for r in rows], MARKOWITZ_LIMIT)
        if _short_rank(dense_lists(test.rows, test.alive), len(test.alive)):
            return None
        finite_only = False  # proven: rank n
    if n >= SPARSE_FROM_COLUMNS:
        elim = eliminate_unit_pivots(n, rows, limit)
    else:
        elim = Elimination(steps=[], rows=[r for r in rows if r], alive=list(range(n)))
    dense_rows = dense_lists(elim.rows, elim.alive)
    k = len(elim.alive)
    if finite_only and _short_rank(dense_rows, k):
        return None
    M = flint.fmpz_mat(dense_rows) if dense_rows else flint.fmpz_mat(0, k, [])
    # Hermite forms of growing sublattices L' ⊆ L (or of L at once); the test that every
    # relation vanishes in Zᵏ/L' (through the Smith form of L') proves L' = L, and the
    # last candidate is the whole matrix's form
    if hermite == "sublattice" and k >= SUBLATTICE_FROM_COLUMNS:
        candidates: Iterable[list[list[int]]] = sublattice_hermite_forms(M, dense_rows)
    else:
        candidates = [[[int(x) for x in r] for r in (M.hnf() if M.nrows() else M).tolist()]]
    for H in candidates:
        d, Vd = smith_of_hermite(H, k)
        if _relations_vanish(M, d, Vd):
            return LatticeQuotient(n, m, elim, d, Vd)
    raise ArithmeticError("Smith normal form: a relation does not vanish")  # pragma: no cover


def _short_rank(dense_rows: list[list[int]], k: int) -> bool:
    """Whether the rank of the k-column ``dense_rows`` modulo :data:`RANK_PRIME` is below k
    (then the rank over Q is below k too)."""
    if not k:
        return False
    if len(dense_rows) < k:
        return True
    return bool(flint.nmod_mat([[x % RANK_PRIME for x in r] for r in dense_rows], RANK_PRIME).rank() < k)


def _relations_vanish(M: flint.fmpz_mat, d: list[int], Vd: list[list[int]]) -> bool:
    """Whether every row of ``M`` lies in the lattice ``{x : (x·V)_i ∈ d_i·Z}`` (the lattice
    of the Smith form ``(d, V)``); only the columns with ``d_i ≠ 1`` need a test."""
    if not M.nrows() or not Vd:
        return True
    check = [i for i, di in enumerate(d) if di != 1]
    if not check:
        return True
    W = M * flint.fmpz_mat([[row[i] for i in check] for row in Vd])
    for c, i in enumerate(check):
        di = d[i]
        for r in range(W.nrows()):
            x = int(W[r, c])
            if (di == 0 and x) or (di and x % di):
                return False
    return True
