"""Hermite normal forms of tall integer matrices of full column rank, by a sublattice of known index.

A relation matrix after structured elimination (:mod:`formkit.core.lattice`) is tall: a
few hundred columns, thousands of rows.  A Hermite normal form that takes every row
into the elimination (FLINT's ``fmpz_mat.hnf`` on the whole matrix) spends most of
its time on the rows that add nothing.  Here the lattice ``L`` spanned by the rows of
``M`` (m × k, rank k) is found instead as follows.

1. **A sublattice.**  ``L'`` is spanned by k rows of ``M`` and a few random
   combinations ``Σ ε_i·row_i`` (``ε_i ∈ {−1, 0, 1}``) of all rows; ``L' ⊆ L``.  Its
   Hermite normal form ``H`` (k × k, FLINT) is cheap: the matrix is almost square and
   its entries are small.
2. **A multiple of the index.**  ``h* = det H = ∏ H_ii = [Zᵏ : L']`` is a multiple of
   ``[Zᵏ : L]``, and ``h*·Zᵏ ⊆ L' ⊆ L``: from here on everything can be read modulo
   ``h*``, as in the Hermite normal form modulo a multiple of the determinant
   (Domich–Kannan–Trotter [1]; Cohen [2], Algorithm 2.4.8).
3. **Membership modulo h*.**  ``L' = L`` exactly when every row ``v`` of ``M`` lies in
   ``L'``, i.e. ``v·H⁻¹`` is integral.  With ``H⁻¹ = N/δ`` (``δ`` divides ``h*``) this is
   ``M·N ≡ 0 (mod δ)``: one integer matrix product (FLINT) and a test that δ divides
   its entries.  If some row fails, ``L'`` grows by new random combinations
   (the rows of ``H`` are kept) and steps 1–3 repeat; a combination with coefficients
   ``{−1, 0, 1}`` misses a given index-``p`` overlattice with probability about
   ``1/p``, so a few rounds suffice.

The result is exact whatever the random choices: the Hermite normal form of a lattice
is unique, and the membership test proves ``L' = L``.  When ``M`` has rank below k, or
the rounds run out, :func:`tall_hermite_rows` returns ``None`` and the caller uses the
Hermite form of the whole matrix.  (The random combinations are the usual way to shrink
a relation matrix before a determinant: Cohen [2], §5.5 and §2.4, and the class group
literature (Buchmann, Jacobson; from memory).)

References
----------
.. [1] P. D. Domich, R. Kannan, L. E. Trotter, "Hermite normal form computation using
       modulo determinant arithmetic", Math. Oper. Res. 12 (1987), 50–59.
.. [2] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993, §2.4.2 (Algorithm 2.4.8, HNF modulo D) and §5.5.
"""

from __future__ import annotations

import random
from collections.abc import Sequence
from typing import Any

import flint

__all__ = ["tall_hermite_rows", "lies_in_row_lattice", "EXTRA_COMBINATIONS", "ROUNDS"]

#: Random combinations of all rows added to k rows of the matrix (per round).  A handful
#: is enough in practice: each one removes a given overlattice of prime index p with
#: probability about 1 − 1/p (no source for the value).
EXTRA_COMBINATIONS = 6

#: Rounds of new random combinations before giving up (the caller then takes the
#: Hermite form of the whole matrix).
ROUNDS = 6

#: The prime used to check the rank of ``M`` when the sublattice has rank < k (a rank
#: modulo p never exceeds the rank over Q).
_RANK_PRIME = (1 << 61) - 1


def lies_in_row_lattice(M: flint.fmpz_mat, H: flint.fmpz_mat) -> bool:
    """Whether every row of ``M`` lies in the row lattice of the non-singular square ``H``.

    Tested as ``M·N ≡ 0 (mod δ)`` for ``H⁻¹ = N/δ`` (one integer product).

    Parameters
    ----------
    M : flint.fmpz_mat
        m × k integer matrix.
    H : flint.fmpz_mat
        k × k non-singular integer matrix.

    Returns
    -------
    bool

    Raises
    ------
    ZeroDivisionError
        If ``H`` is singular (from FLINT).

    Examples
    --------
    >>> H = flint.fmpz_mat([[2, 1], [0, 3]])
    >>> lies_in_row_lattice(flint.fmpz_mat([[2, 4], [0, 6], [4, 2]]), H)
    True
    >>> lies_in_row_lattice(flint.fmpz_mat([[1, 0]]), H)
    False

    References
    ----------
    Cohen, GTM 138, §2.4.2 (a vector lies in the lattice of a basis iff its coordinates
    in that basis are integers).
    """
    if M.nrows() == 0:
        return True
    inv: Any = H.inv()
    num, den = inv.numer_denom()
    delta = int(den)
    if delta == 1:
        return True
    # M·N/δ over Q: its common denominator is 1 iff δ divides every entry of M·N
    Q: Any = flint.fmpq_mat(M * num) * flint.fmpq(1, delta)
    _n, d = Q.numer_denom()
    return int(d) == 1


def _combinations(M: flint.fmpz_mat, count: int, rng: random.Random) -> flint.fmpz_mat:
    """``count`` random combinations of the rows of ``M`` with coefficients in {−1, 0, 1}."""
    m = M.nrows()
    R = flint.fmpz_mat([[rng.choice((-1, 0, 1)) for _ in range(m)] for _ in range(count)])
    return R * M


def _stack(rows: list[list[int]], extra: flint.fmpz_mat) -> flint.fmpz_mat:
    return flint.fmpz_mat(rows + [[int(x) for x in r] for r in extra.tolist()])


def tall_hermite_rows(
    M: flint.fmpz_mat,
    rows: Sequence[Sequence[int]] | None = None,
    *,
    extra: int = EXTRA_COMBINATIONS,
    rounds: int = ROUNDS,
    seed: int = 0,
) -> flint.fmpz_mat | None:
    """The Hermite normal form (its k non-zero rows) of the row lattice of a tall ``M`` of rank k.

    See the module docstring for the method.  The result is exact and does not depend
    on ``seed``, which only changes the random combinations (and so the time).

    Parameters
    ----------
    M : flint.fmpz_mat
        m × k integer matrix, expected to have rank k and m well above k.
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
        The k × k upper triangular Hermite normal form (FLINT's convention, the same as
        the non-zero rows of ``M.hnf()``), or ``None`` when ``M`` has fewer than
        ``k + extra`` rows, rank below k (as far as a rank modulo a prime shows), or the
        rounds ran out; the caller then computes ``M.hnf()``.

    Examples
    --------
    >>> M = flint.fmpz_mat([[2, 0], [0, 4], [6, 2], [4, 4], [2, 2], [8, 6], [0, 2], [2, 6], [4, 0], [6, 6]])
    >>> tall_hermite_rows(M, extra=2)
    [2, 0]
    [0, 2]
    >>> tall_hermite_rows(flint.fmpz_mat([[1, 2], [2, 4], [3, 6], [4, 8]]), extra=2) is None  # rank 1
    True

    References
    ----------
    Domich–Kannan–Trotter (1987); Cohen, GTM 138, Algorithm 2.4.8 (HNF modulo a multiple
    of the determinant) and §2.4.2.
    """
    m, k = M.nrows(), M.ncols()
    if k == 0 or m < k + extra:
        return None
    rng = random.Random(seed)
    # k rows spread over M (the first rows alone are often the relations of one sieve task)
    stride = m / k
    lists: Sequence[Sequence[Any]] = rows if rows is not None else M.tolist()
    base = [[int(x) for x in lists[int(i * stride)]] for i in range(k)]
    S = _stack(base, _combinations(M, extra, rng))
    rank_checked = False
    for _ in range(rounds):
        H = S.hnf()
        Hrows = [[int(x) for x in r] for r in H.tolist()[:k]]
        if not any(Hrows[k - 1]):  # rank of the sublattice below k
            if not rank_checked:
                rank_checked = True
                if flint.nmod_mat([[int(x) for x in r] for r in lists], _RANK_PRIME).rank() < k:
                    return None  # M itself has (most likely) rank < k: the caller's general path
            Hrows = [r for r in Hrows if any(r)]
            S = _stack(Hrows, _combinations(M, extra + k - len(Hrows), rng))
            continue
        Hk = flint.fmpz_mat(Hrows)
        if lies_in_row_lattice(M, Hk):
            return Hk
        S = _stack(Hrows, _combinations(M, extra, rng))
    return None
