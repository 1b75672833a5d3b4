"""Structured Gaussian elimination of sparse integer relation matrices on unit pivots.

A relation matrix of a class group (rows: relations, columns: prime forms) is sparse:
some ten entries per row, most of them ±1.  Before any dense normal form, the columns
are removed one at a time where a row has an entry ±1 there: with that row ``r`` as
pivot (``r[j] = s = ±1``), the unimodular column operation ``e_j ← e_j − s·Σ_{k≠j}
r[k]·e_k`` makes ``r`` the unit vector ``s·e_j``, and that row and column are dropped.
The quotient ``Zⁿ/L`` of the row lattice does not change (up to the trivial factor),
and the class of ``e_j`` is recorded as ``−s·Σ r[k]·e_k`` for generators and discrete
logarithms.

The column of least weight is taken first, and in it the shortest row with a unit
entry (the Markowitz cost ``(|r| − 1)·(w_j − 1)`` bounds the fill-in); elimination stops
when that cost exceeds a limit (:func:`markowitz_limit`, growing with the number of
columns), and the rest goes to the dense methods of
:mod:`formkit.core.lattice`.  Pivots of other sizes are not used: over Z they do not
remove a column without changing the lattice, and on class group relation matrices the
stopping cause is fill-in, not a lack of units (every remaining column of the 30- and
36-digit matrices of docs/performance.md still had an entry ±1).  Entries stay small
(at most a few hundred there), since a pivot of ±1 never divides.

References
----------
.. [1] B. A. LaMacchia, A. M. Odlyzko, "Solving large sparse linear systems over finite
       fields", CRYPTO '90, LNCS 537 (1991), 109–133 (structured Gaussian elimination).
.. [2] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993, §5.5 (the relation matrix of the sub-exponential class group method).
.. [3] J. Buchmann, S. Düllmann, "Distributed class group computation" (1991), for its
       use on class group relation matrices (from memory).
"""

from __future__ import annotations

import heapq
from dataclasses import dataclass

__all__ = ["Elimination", "eliminate_unit_pivots", "markowitz_limit", "MARKOWITZ_LIMIT", "RANK_PRIME"]

#: Structured elimination stops when the cheapest remaining pivot would fill in more
#: than this many new entries, or when no entry ±1 is left; the rest goes dense.
#: (20000 was the fastest total of elimination and dense Hermite form among
#: 3000–150000 on a 36-digit relation matrix, docs/performance.md.)
MARKOWITZ_LIMIT = 20000


def markowitz_limit(n: int) -> int:
    """The Markowitz limit used for a matrix of ``n`` columns: :data:`MARKOWITZ_LIMIT` up to
    2100 columns, then growing like ``(n/2100)⁴``.

    With more columns the dense rest costs more (its Hermite form grows like a power
    3–4 of its size) and continuing the elimination pays; the rule fits three relation
    matrices of the subexponential method, total CPU of elimination and first Hermite
    form (docs/performance.md; under load): 2103 columns (36 digits) 2.0 s at 20000
    against 2.5 s at 60000; 2612 (40 digits) 4.2 / 3.2 / 3.8 s at 20000 / 60000 /
    200000; 3758 (50 digits) 61.4 / 29.3 / 38.1 s at 20000 / 200000 / 600000.  No
    source; beyond 3758 columns it is an extrapolation.

    Examples
    --------
    >>> markowitz_limit(1500), markowitz_limit(2612), markowitz_limit(3758)
    (20000, 47868, 205107)
    """
    return max(MARKOWITZ_LIMIT, round(MARKOWITZ_LIMIT * (n / 2100) ** 4))


@dataclass
class Elimination:
    """The result of eliminating unit pivots from the relations ``rows`` (in place).

    ``steps`` lists ``(j, s, w)``: column j was eliminated with pivot sign s = ±1 and
    pivot row ``w`` (a dict without column j); generator j equals
    ``−s·Σ_k w[k]·e_k`` in the quotient.  ``rows`` are the remaining relations on the
    columns ``alive``.
    """

    steps: list[tuple[int, int, dict[int, int]]]
    rows: list[dict[int, int]]
    alive: list[int]

    def reduce(self, vec: dict[int, int]) -> dict[int, int]:
        """The sparse vector ``vec`` with the eliminated columns replaced by their classes (in place).

        Column j of a step ``(j, s, w)`` equals ``−s·Σ_k w[k]·e_k`` in the quotient, so
        the result has entries on the columns :attr:`alive` only and the same class.

        Examples
        --------
        >>> E = eliminate_unit_pivots(3, [{0: 1, 1: 2}, {1: 3, 2: 1}, {2: 4}])
        >>> E.reduce({0: 1})   # e_0 = −2·e_1 in the quotient
        {1: -2}
        """
        for j, s, w in self.steps:
            v = vec.pop(j, 0)
            if v:
                f = s * v
                for k, c in w.items():
                    vec[k] = vec.get(k, 0) - f * c
        return vec

    def lift_rows(self, V: list[list[int]]) -> None:
        """``V ← C_1 ⋯ C_T · V`` (in place) for the column operations ``C_t = I − s·e_j·wᵀ``
        of the steps: the transformation of the whole matrix from the one of the rest."""
        for j, s, w in reversed(self.steps):
            row = V[j]
            for k, c in w.items():
                f = s * c
                rk = V[k]
                for col, x in enumerate(rk):
                    if x:
                        row[col] -= f * x

    def lift_columns(self, W: list[list[int]]) -> None:
        """``W ← W · C_T⁻¹ ⋯ C_1⁻¹`` (in place), ``C_t⁻¹ = I + s·e_j·wᵀ``: the inverse of
        :meth:`lift_rows`."""
        for j, s, w in reversed(self.steps):
            for r in W:
                x = r[j]
                if x:
                    f = s * x
                    for k, c in w.items():
                        r[k] += f * c


def eliminate_unit_pivots(n: int, rows: list[dict[int, int]], limit: int = MARKOWITZ_LIMIT) -> Elimination:
    """Structured Gaussian elimination of the sparse rows on pivots ±1 (see the module docstring).

    Parameters
    ----------
    n : int
        The number of columns.
    rows : list of dict
        Sparse rows ``{column: entry}`` without zeros; they are changed in place.
    limit : int
        Stop when the cheapest pivot has a Markowitz cost above this.

    Returns
    -------
    Elimination
        The steps (for generators and coordinates), the remaining rows and their columns.

    Examples
    --------
    Z³ modulo (1, 2, 0), (0, 3, 1), (0, 0, 4) is cyclic of order 12:

    >>> E = eliminate_unit_pivots(3, [{0: 1, 1: 2}, {1: 3, 2: 1}, {2: 4}])
    >>> E.alive, E.rows
    ([1], [{1: -12}])

    References
    ----------
    LaMacchia–Odlyzko (1991); Cohen, GTM 138, §5.5.
    """
    live = {i: r for i, r in enumerate(rows) if r}
    cols: dict[int, set[int]] = {j: set() for j in range(n)}
    for i, r in live.items():
        for j in r:
            cols[j].add(i)
    steps: list[tuple[int, int, dict[int, int]]] = []
    # heap of (column weight, column); stale entries are skipped
    heap = [(len(s), j) for j, s in cols.items() if s]
    heapq.heapify(heap)
    while heap:
        wgt, j = heapq.heappop(heap)
        s = cols.get(j)
        if s is None or len(s) != wgt:
            if s:
                heapq.heappush(heap, (len(s), j))
            continue
        best = None
        for i in s:
            r = live[i]
            if abs(r[j]) == 1 and (best is None or len(r) < len(live[best])):
                best = i
        if best is None:
            continue  # no unit entry in this column now; it may get one later
        cost = (len(live[best]) - 1) * (wgt - 1)
        if cost > limit:
            heapq.heappush(heap, (wgt, j))
            # the cheapest column by weight is too expensive: every other is too
            break
        piv = live.pop(best)
        sgn = piv.pop(j)
        for k in piv:
            cols[k].discard(best)
        for i in list(s):
            if i == best:
                continue
            r = live[i]
            f = r.pop(j) * sgn  # r ← r − f·(sgn·e_j + piv) clears column j
            for k, x in piv.items():
                y = r.get(k, 0) - f * x
                if y:
                    if k not in r:
                        cols[k].add(i)
                    r[k] = y
                elif k in r:
                    del r[k]
                    cols[k].discard(i)
            if not r:
                del live[i]
        del cols[j]
        steps.append((j, sgn, piv))
        for k in piv:
            if cols[k]:
                heapq.heappush(heap, (len(cols[k]), k))
    alive = sorted(cols)
    return Elimination(steps=steps, rows=list(live.values()), alive=alive)


#: A prime below 2^63 for ranks modulo a prime (the Mersenne prime 2^61 − 1), e.g. in
#: :func:`formkit.core.lattice.finite_lattice_quotient`.
RANK_PRIME = (1 << 61) - 1
