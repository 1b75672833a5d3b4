"""Hermite normal forms of tall integer matrices, by a sublattice and a membership test.

A relation matrix after structured elimination (:mod:`formkit.core.sparse_elimination`)
is tall: a few hundred columns, thousands of rows.  A Hermite normal form that takes
every row into the elimination (FLINT's ``fmpz_mat.hnf`` on the whole matrix) spends
most of its time on the rows that add nothing, and is slower still when the rank is
below the number of columns.  Here the lattice ``L`` spanned by the rows of ``M``
(m × k) is found instead as follows.

1. **A sublattice.**  ``L'`` is spanned by k rows of ``M`` and a few random
   combinations ``Σ ε_i·row_i`` (``ε_i ∈ {−1, 0, 1}``) of all rows; ``L' ⊆ L``.  Its
   Hermite normal form ``H`` (FLINT) is cheap: the matrix is almost square and its
   entries are small.
2. **A multiple of the index.**  When ``L'`` has rank k, ``h* = det H = ∏ H_ii =
   [Zᵏ : L']`` is a multiple of ``[Zᵏ : L]``, and ``h*·Zᵏ ⊆ L' ⊆ L``: from here on
   everything can be read modulo ``h*``, as in the Hermite normal form modulo a
   multiple of the determinant (Domich–Kannan–Trotter [1]; Cohen [2], Algorithm 2.4.8).
   (For rank r < k the same holds on the r pivot columns.)
3. **Membership modulo h*.**  ``L' = L`` exactly when every row ``v`` of ``M`` lies in
   ``L'``: its coordinates ``v_P·H_P⁻¹`` on the pivot columns ``P`` are integers
   (with ``H_P⁻¹ = N/δ``, δ dividing ``h*``: ``M_P·N ≡ 0 (mod δ)``, one integer
   product) and, for rank r < k, they give back ``v``.  If some row fails, ``L'``
   grows by new random combinations (the rows of ``H`` are kept, and when its rank is
   short, as many more as the rank of ``M`` modulo a prime says are missing) and steps
   1–3 repeat; a combination with coefficients ``{−1, 0, 1}`` misses a given
   overlattice of prime index p with probability about ``1/p``, so a few rounds
   suffice.

:func:`tall_hermite_rows` does steps 1–3; :func:`sublattice_hermite_forms` yields the
candidates of step 1 and leaves the test to the caller, which may have a cheaper one
(:func:`formkit.core.lattice.lattice_quotient` tests the relations against the Smith
form of the candidate on its few columns with an invariant ≠ 1).

The result is exact whatever the random choices: the Hermite normal form of a lattice
is unique, and the membership test proves ``L' = L``.  When ``M`` is not tall or the
rounds run out, :func:`tall_hermite_rows` returns ``None`` and the caller uses the
Hermite form of the whole matrix.  (The random combinations are a common way to shrink
a relation matrix before a determinant, e.g. in the class group literature (Buchmann,
Jacobson; from memory).)

References
----------
.. [1] P. D. Domich, R. Kannan, L. E. Trotter, "Hermite normal form computation using
       modulo determinant arithmetic", Math. Oper. Res. 12 (1987), 50–59.
.. [2] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993, §2.4.2 (Algorithm 2.4.8, HNF modulo D) and §5.5.
"""

from __future__ import annotations

import random
from collections.abc import Iterator, Sequence
from typing import Any

import flint

from .sparse_elimination import RANK_PRIME

__all__ = [
    "tall_hermite_rows",
    "sublattice_hermite_forms",
    "lies_in_row_lattice",
    "EXTRA_COMBINATIONS",
    "ROUNDS",
]

#: Random combinations of all rows added to k rows of the matrix (per round).  A handful
#: is enough in practice: each one removes a given overlattice of prime index p with
#: probability about 1 − 1/p (no source for the value).
EXTRA_COMBINATIONS = 6

#: Rounds of new random combinations before giving up (the caller then takes the
#: Hermite form of the whole matrix).
ROUNDS = 6

#: The prime modulo which the rank of ``M`` is taken when the sublattice has rank < k
#: (only to choose how many combinations to add: a rank modulo p never exceeds the rank
#: over Q, and the membership test decides).
_RANK_PRIME = RANK_PRIME


def lies_in_row_lattice(M: flint.fmpz_mat, H: Sequence[Sequence[int]]) -> bool:
    """Whether every row of ``M`` lies in the row lattice of ``H``, a matrix in Hermite normal form.

    With ``P`` the pivot columns of the r non-zero rows of ``H`` (``H_P`` upper
    triangular, non-singular) and ``H_P⁻¹ = N/δ``: a row ``v`` lies in the lattice iff its
    only possible coordinates ``x = v_P·H_P⁻¹`` are integers and ``x·H = v``; for all
    rows at once, ``M_P·N ≡ 0 (mod δ)`` and ``(M_P·N)·H = δ·M`` (integer products).

    Parameters
    ----------
    M : flint.fmpz_mat
        m × k integer matrix.
    H : sequence of rows
        An integer matrix in row echelon form with non-zero pivots (a Hermite normal
        form, e.g. FLINT's), k columns; zero rows are ignored.

    Returns
    -------
    bool

    Examples
    --------
    >>> H = [[2, 1], [0, 3]]
    >>> lies_in_row_lattice(flint.fmpz_mat([[2, 4], [0, 6], [4, 2]]), H)
    True
    >>> lies_in_row_lattice(flint.fmpz_mat([[1, 0]]), H)
    False
    >>> lies_in_row_lattice(flint.fmpz_mat([[2, 4, 6], [1, 2, 4]]), [[1, 2, 3]])  # rank 1
    False

    References
    ----------
    Cohen, GTM 138, §2.4.2 (a vector lies in the lattice of a basis iff its coordinates
    in that basis are integers).
    """
    m, k = M.nrows(), M.ncols()
    Hr = [[int(x) for x in r] for r in H if any(r)]
    if m == 0:
        return True
    if not Hr:
        return bool(M.is_zero())
    piv = [next(j for j, x in enumerate(r) if x) for r in Hr]
    r = len(Hr)
    HP = flint.fmpz_mat([[row[j] for j in piv] for row in Hr])
    sel = flint.fmpz_mat([[1 if j == piv[c] else 0 for c in range(r)] for j in range(k)])
    inv: Any = HP.inv()
    num, den = inv.numer_denom()
    delta = int(den)
    X = (M * sel) * num
    if delta != 1:
        # X/δ over Q: its common denominator is 1 iff δ divides every entry of X
        Q: Any = flint.fmpq_mat(X) * flint.fmpq(1, delta)
        _n, d = Q.numer_denom()
        if int(d) != 1:
            return False
    if r == k:
        return True  # x·H = v holds on the pivot columns, which are all the columns
    return bool(X * flint.fmpz_mat(Hr) == M * delta)


def _combinations(M: flint.fmpz_mat, count: int, rng: random.Random) -> flint.fmpz_mat:
    """``count`` random combinations of the rows of ``M`` with coefficients in {−1, 0, 1}."""
    m = M.nrows()
    R = flint.fmpz_mat([[rng.choice((-1, 0, 1)) for _ in range(m)] for _ in range(count)])
    return R * M


def _stack(rows: list[list[int]], extra: flint.fmpz_mat) -> flint.fmpz_mat:
    return flint.fmpz_mat(rows + [[int(x) for x in r] for r in extra.tolist()])


def sublattice_hermite_forms(
    M: flint.fmpz_mat,
    rows: Sequence[Sequence[int]] | None = None,
    *,
    extra: int = EXTRA_COMBINATIONS,
    rounds: int = ROUNDS,
    seed: int = 0,
) -> Iterator[list[list[int]]]:
    """Hermite normal forms (non-zero rows) of growing sublattices ``L' ⊆ L`` of the row lattice of ``M``.

    Steps 1 and 3 of the module docstring without the test: each form yielded spans a
    sublattice of ``L`` containing the previous one, built from k rows of ``M`` and
    ``extra`` more random combinations per round (more when its rank is short).  The
    caller tests whether the rows of ``M`` lie in it (:func:`lies_in_row_lattice`, or a
    cheaper test of its own, e.g. through a Smith form of the candidate) and stops;
    after ``rounds`` candidates the Hermite form of the whole ``M`` (exactly ``L``) is
    yielded last.

    Parameters
    ----------
    M : flint.fmpz_mat
        m × k integer matrix (any shape and rank).
    rows : sequence of rows, optional
        The rows of ``M`` as Python integers, when the caller has them.
    extra, rounds, seed
        As in :func:`tall_hermite_rows`.

    Yields
    ------
    list of list of int
        Hermite normal forms (FLINT's convention) of sublattices of ``L``, the last one
        that of ``L``.

    Examples
    --------
    >>> M = flint.fmpz_mat([[2, 0], [0, 4], [6, 2], [4, 4], [2, 2], [8, 6], [0, 2], [2, 6], [4, 0], [6, 6]])
    >>> forms = list(sublattice_hermite_forms(M, extra=2, rounds=2))
    >>> forms[-1], all(lies_in_row_lattice(flint.fmpz_mat(H), forms[-1]) for H in forms if H)
    ([[2, 0], [0, 2]], True)

    References
    ----------
    Domich–Kannan–Trotter (1987); Cohen, GTM 138, Algorithm 2.4.8 and §2.4.2.
    """
    m, k = M.nrows(), M.ncols()
    lists: Sequence[Sequence[Any]] = rows if rows is not None else M.tolist()
    if k and m >= k + extra:
        rng = random.Random(seed)
        # k rows spread over M (the first rows alone are often the relations of one sieve task)
        stride = m / k
        base = [[int(x) for x in lists[int(i * stride)]] for i in range(k)]
        S = _stack(base, _combinations(M, extra, rng))
        target = None
        for _ in range(rounds):
            Hrows = [r for r in ([int(x) for x in row] for row in S.hnf().tolist()) if any(r)]
            yield Hrows
            more = extra
            if len(Hrows) < k:
                # the sublattice may lack rank: as many more combinations as the rank of
                # M modulo a prime (≤ its rank over Q) says are missing
                if target is None:
                    target = flint.nmod_mat([[int(x) for x in r] for r in lists], _RANK_PRIME).rank()
                more += max(0, target - len(Hrows))
            S = _stack(Hrows, _combinations(M, more, rng))
    whole = M.hnf() if m else M
    yield [r for r in ([int(x) for x in row] for row in whole.tolist()) if any(r)]


def tall_hermite_rows(
    M: flint.fmpz_mat,
    rows: Sequence[Sequence[int]] | None = None,
    *,
    extra: int = EXTRA_COMBINATIONS,
    rounds: int = ROUNDS,
    seed: int = 0,
) -> flint.fmpz_mat | None:
    """The Hermite normal form (its non-zero rows) of the row lattice of a tall ``M``.

    See the module docstring for the method.  The result is exact and does not depend
    on ``seed``, which only changes the random combinations (and so the time).

    Parameters
    ----------
    M : flint.fmpz_mat
        m × k integer matrix with m well above k (any rank).
    rows : sequence of rows, optional
        The rows of ``M`` as Python integers, when the caller has them (saves a
        conversion of the whole matrix).
    extra : int
        Random combinations of all rows added per round.
    rounds : int
        Rounds before giving up.
    seed : int
        Seed of the random combinations.

    Returns
    -------
    flint.fmpz_mat or None
        The r × k Hermite normal form, r the rank of ``M`` (FLINT's convention: the
        same as the non-zero rows of ``M.hnf()``), or ``None`` when ``M`` has fewer
        than ``k + extra`` rows or the rounds ran out; the caller then computes
        ``M.hnf()``.

    Examples
    --------
    >>> M = flint.fmpz_mat([[2, 0], [0, 4], [6, 2], [4, 4], [2, 2], [8, 6], [0, 2], [2, 6], [4, 0], [6, 6]])
    >>> tall_hermite_rows(M, extra=2)
    [2, 0]
    [0, 2]
    >>> tall_hermite_rows(flint.fmpz_mat([[1, 2], [2, 4], [3, 6], [4, 8]]), extra=2)  # rank 1
    [1, 2]
    >>> tall_hermite_rows(flint.fmpz_mat([[1, 2], [3, 4]])) is None  # not tall
    True

    References
    ----------
    Domich–Kannan–Trotter (1987); Cohen, GTM 138, Algorithm 2.4.8 (HNF modulo a multiple
    of the determinant) and §2.4.2.
    """
    m, k = M.nrows(), M.ncols()
    if k == 0 or m < k + extra:
        return None
    for i, Hrows in enumerate(sublattice_hermite_forms(M, rows, extra=extra, rounds=rounds, seed=seed)):
        if i == rounds:
            return None  # the rounds ran out (the next form would be the whole matrix's)
        if lies_in_row_lattice(M, Hrows):
            return flint.fmpz_mat(Hrows) if Hrows else flint.fmpz_mat(0, k, [])
    return None  # pragma: no cover - the generator yields rounds + 1 forms
