"""Relations among prime forms combined and examined before the linear algebra.

* :class:`RelationCollector` keeps the full relations of the sieve as sparse rows
  (dropping duplicates) and combines partial relations with the same large prime ``ℓ``
  (the large-prime variation, Jacobson [1], §4).
* :func:`weak_columns` finds the prime forms that the relations cannot pin down, by
  peeling singletons: a column met by one relation only uses that relation up, and the
  other columns of that relation lose it.  A column left with no relation makes the
  rank of the relation matrix short whatever the other relations are, so the class
  group search adds a relation for it (a random walk) before any linear algebra.  The
  same peeling is the first step of structured Gaussian elimination (LaMacchia–Odlyzko
  [2], "singleton removal").

References
----------
.. [1] M. J. Jacobson, Jr., "Applying sieving to the computation of quadratic class
       groups", Math. Comp. 68 (1999), 859–867.
.. [2] B. A. LaMacchia, A. M. Odlyzko, "Solving large sparse linear systems over finite
       fields", CRYPTO '90, LNCS 537 (1991), 109–133.
"""

from __future__ import annotations

from collections import deque
from collections.abc import Mapping, Sequence

from .relation_sieve import Relation

__all__ = ["RelationCollector", "weak_columns"]


class RelationCollector:
    """Full relations as sparse rows (duplicates dropped); partial relations paired by their large prime.

    Two partial relations ``r = s·[P_ℓ]`` and ``r' = s'·[P_ℓ]`` with the same large prime
    ``ℓ`` give the full relation ``r − s·s'·r'`` (Jacobson [1], §4).

    Examples
    --------
    >>> C = RelationCollector()
    >>> C.add(Relation(((0, 1), (1, 2)), large=101, large_sign=1))
    >>> C.add(Relation(((0, 1), (2, -1)), large=101, large_sign=-1))
    >>> C.rows, C.combined
    ([{0: 2, 1: 2, 2: -1}], 1)
    """

    def __init__(self) -> None:
        self.rows: list[dict[int, int]] = []
        self.seen: set[tuple[tuple[int, int], ...]] = set()
        self.partials: dict[int, Relation] = {}
        self.covered: set[int] = set()
        self.full = 0
        self.combined = 0

    def _row(self, items: tuple[tuple[int, int], ...]) -> None:
        if not items or items in self.seen:
            return
        self.seen.add(items)
        self.rows.append(dict(items))
        self.covered.update(i for i, _k in items)

    def add(self, r: Relation) -> None:
        if r.large == 1:
            self.full += 1
            self._row(r.exponents)
            return
        first = self.partials.get(r.large)
        if first is None:
            self.partials[r.large] = r
            return
        # r = s·[ℓ], first = s'·[ℓ]  ⇒  r − s·s'·first = 0
        comb = dict(r.exponents)
        f = r.large_sign * first.large_sign
        for i, k in first.exponents:
            comb[i] = comb.get(i, 0) - f * k
        items = tuple(sorted((i, k) for i, k in comb.items() if k))
        if items:
            self.combined += 1
            self._row(items)


def weak_columns(rows: Sequence[Mapping[int, int]], n: int) -> list[int]:
    """The columns ``0..n−1`` left without a relation when singletons are peeled off.

    Repeatedly, a column met by exactly one remaining relation takes that relation (the
    relation is removed, and the other columns lose one relation each).  A column that
    loses its last relation to another column, or never had one, is *weak*: the
    relations cannot have rank n unless more relations contain it.  (A necessary
    condition only: the exact rank is the linear algebra's.)

    Parameters
    ----------
    rows : sequence of mappings ``{column: entry}``
        The relations (entries non-zero).
    n : int
        The number of columns.

    Returns
    -------
    list of int
        The weak columns, increasing.

    Examples
    --------
    Two columns met only by the same relation: one of them is weak; column 3 is met by none.

    >>> weak_columns([{0: 1, 1: 1, 2: 1}, {2: 3}], 4)
    [1, 3]
    >>> weak_columns([{0: 1, 1: 1}, {1: 1}], 2)
    []

    References
    ----------
    LaMacchia–Odlyzko (1991), singleton removal.
    """
    where: list[list[int]] = [[] for _ in range(n)]
    for i, r in enumerate(rows):
        for j in r:
            where[j].append(i)
    weight = [len(w) for w in where]
    used = [False] * len(rows)
    weak = {j for j in range(n) if weight[j] == 0}
    todo = deque(j for j in range(n) if weight[j] == 1)
    while todo:
        j = todo.popleft()
        if weight[j] != 1:
            continue
        i = next(i for i in where[j] if not used[i])
        used[i] = True
        weight[j] = -1  # pinned by relation i
        for k in rows[i]:
            if k == j or weight[k] <= 0:
                continue
            weight[k] -= 1
            if weight[k] == 0:
                weak.add(k)
            elif weight[k] == 1:
                todo.append(k)
    return sorted(weak)
