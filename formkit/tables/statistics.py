"""Statistics of class groups over a table: p-ranks, divisibility, cyclicity, first occurrences.

For the rows of a table with invariants (:func:`formkit.table_rows`, or a store read by
:func:`formkit.query_table`) this module counts

* the ``p``-rank (the number of invariants divisible by ``p``) for ``p = 3, 5, 7, …``
  beside the Cohen–Lenstra prediction for imaginary quadratic fields,
  ``Prob(r_p = r) = p^(−r²)·η_∞(p) / η_r(p)²`` with ``η_r(p) = ∏_{k=1}^{r} (1 − p^(−k))``
  (Cohen and Lenstra 1984, §9; formula from memory);
* ``p | h``, predicted ``1 − η_∞(p)`` (for ``p = 3`` about 0.4399; from memory);
* the 2-rank (fixed by genus theory, no random-group prediction) and the 4-rank, beside
  Gerth's prediction ``Prob(r_4 = r) = 2^(−r²)·η_∞(2) / η_r(2)²`` (Gerth 1984, proved
  by Fouvry and Klüners 2007; from memory);
* cyclic groups, and non-cyclic odd parts beside the Cohen–Lenstra value
  ``1 − ∏_{p odd} η_∞(p)·(1 + 1/(p·(1 − 1/p)²))`` (about 0.0224; from memory).

The predictions are limits over imaginary quadratic *fields* ordered by ``|d_K|``;
:func:`class_group_statistics` therefore keeps fundamental discriminants by default.
Convergence is slow (the secondary terms decay like a power of ``log |D|``), so the
observed frequencies at ``|D| ≤ 10^7`` sit visibly below the predictions for ``p | h``.

References
----------
.. [1] H. Cohen and H. W. Lenstra Jr., "Heuristics on class groups of number fields",
       Number Theory Noordwijkerhout 1983, LNM 1068, Springer 1984, 33–62.
.. [2] F. Gerth III, "The 4-class ranks of quadratic fields", Invent. Math. 77 (1984),
       489–515.
.. [3] É. Fouvry and J. Klüners, "On the 4-rank of class groups of quadratic number
       fields", Invent. Math. 167 (2007), 455–513.
"""

from __future__ import annotations

import html
import json
from collections.abc import Iterable, Sequence
from dataclasses import dataclass

from ..errors import FormkitError

__all__ = [
    "GroupStatistic",
    "GroupStatistics",
    "class_group_statistics",
    "cohen_lenstra_rank_probability",
    "first_occurrences",
    "rows_with_rank",
]


def _eta(p: int, r: int | None) -> float:
    """``η_r(p) = ∏_{k=1}^{r} (1 − p^(−k))``; ``r = None`` is ``η_∞`` (to double precision)."""
    out, k = 1.0, 1
    while (r is None and p ** (-k) > 1e-18) or (r is not None and k <= r):
        out *= 1.0 - p ** (-float(k))
        k += 1
    return out


def cohen_lenstra_rank_probability(p: int, r: int) -> float:
    """Cohen–Lenstra probability that an imaginary quadratic field has ``p``-rank ``r``
    (``p`` odd); for ``p = 2`` the same formula is Gerth's for the 4-rank.

    Examples
    --------
    >>> round(1 - cohen_lenstra_rank_probability(3, 0), 4)   # Prob(3 | h), from memory 0.4399
    0.4399
    >>> round(sum(cohen_lenstra_rank_probability(5, r) for r in range(8)), 12)
    1.0
    """
    if p < 2 or r < 0:
        raise FormkitError(f"need a prime p ≥ 2 and a rank r ≥ 0, not p={p}, r={r}")
    return p ** (-float(r * r)) * _eta(p, None) / _eta(p, r) ** 2


def _odd_part_cyclic_probability(prime_bound: int = 100000) -> float:
    from ..core.arith import next_prime

    out, p = 1.0, 3
    while p < prime_bound:
        out *= cohen_lenstra_rank_probability(p, 0) + cohen_lenstra_rank_probability(p, 1)
        p = int(next_prime(p))
    return out


def _rank(inv: Sequence[int], m: int) -> int:
    return sum(1 for n in inv if n % m == 0)


@dataclass(frozen=True)
class GroupStatistic:
    """One line: what is counted, how often, and the prediction (``None`` if none applies)."""

    quantity: str
    count: int
    frequency: float
    predicted: float | None
    prediction: str

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return {
            "quantity": self.quantity,
            "count": self.count,
            "frequency": self.frequency,
            "predicted": self.predicted,
            "prediction": self.prediction,
        }

    def _text(self) -> str:
        pred = (
            "no prediction"
            if self.predicted is None
            else f"predicted {self.predicted:.4f} ({self.prediction})"
        )
        return f"{self.quantity}: {self.count} times, frequency {self.frequency:.4f}; {pred}"

    def __repr__(self) -> str:
        return f"<{self._text()}>"

    def _repr_html_(self) -> str:
        return html.escape(self._text())

    def _repr_latex_(self) -> str:
        return r"$\text{" + self._text().replace("_", r"\_").replace("%", r"\%").replace("&", r"\&") + "}$"


@dataclass(frozen=True)
class GroupStatistics:
    """Counts over ``total`` class groups with ``|D|`` in ``[low, high]``.

    ``provenance`` says where the groups came from; every line names its prediction.
    """

    low: int
    high: int
    total: int
    fundamental_only: bool
    lines: tuple[GroupStatistic, ...]
    provenance: str

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return {
            "low": self.low,
            "high": self.high,
            "total": self.total,
            "fundamental_only": self.fundamental_only,
            "provenance": self.provenance,
            "lines": [x.to_dict() for x in self.lines],
        }

    def text(self) -> str:
        """A plain-text table."""
        what = "fundamental discriminants" if self.fundamental_only else "discriminants"
        head = [
            f"{self.total} {what} D < 0 with {self.low} ≤ |D| ≤ {self.high} ({self.provenance})",
            f"{'quantity':<24} {'count':>10} {'frequency':>10} {'predicted':>10}  prediction",
        ]
        for x in self.lines:
            pred = "—" if x.predicted is None else f"{x.predicted:.4f}"
            head.append(f"{x.quantity:<24} {x.count:>10} {x.frequency:>10.4f} {pred:>10}  {x.prediction}")
        return "\n".join(head)

    def __repr__(self) -> str:
        return f"GroupStatistics(total={self.total}, |D| in [{self.low}, {self.high}]; {self.provenance})"

    def _repr_html_(self) -> str:
        rows = "".join(
            f"<tr><td>{html.escape(x.quantity)}</td><td>{x.count}</td><td>{x.frequency:.4f}</td>"
            f"<td>{'—' if x.predicted is None else f'{x.predicted:.4f}'}</td>"
            f"<td>{html.escape(x.prediction)}</td></tr>"
            for x in self.lines
        )
        return (
            f"<p>{self.total} class groups, {self.low} ≤ |D| ≤ {self.high} "
            f"({html.escape(self.provenance)})</p><table><tr><th>quantity</th><th>count</th>"
            f"<th>frequency</th><th>predicted</th><th>prediction</th></tr>{rows}</table>"
        )

    def _repr_latex_(self) -> str:
        body = " \\\\\n".join(
            f"\\text{{{x.quantity}}} & {x.count} & {x.frequency:.4f} & "
            + ("\\text{--}" if x.predicted is None else f"{x.predicted:.4f}")
            for x in self.lines
        )
        return (
            "$\\begin{array}{lrrr}\\text{quantity} & \\text{count} & \\text{frequency} & "
            f"\\text{{predicted}} \\\\\n{body}\n\\end{{array}}$"
        )

    def to_json(self) -> str:
        """One JSON object."""
        return json.dumps(self.to_dict(), ensure_ascii=False)

    def plot(self, path: str) -> None:
        """Bar chart of observed frequencies beside the predictions, written to ``path``
        (``.png`` or ``.svg``; needs matplotlib)."""
        try:
            from matplotlib.figure import Figure
        except ImportError as exc:  # pragma: no cover - matplotlib is an optional extra
            raise FormkitError("plots need matplotlib: pip install 'formkit[plot]'") from exc
        if not str(path).endswith((".png", ".svg")):
            raise FormkitError(f"the plot file must end in .png or .svg, not {path!r}")
        lines = [x for x in self.lines if x.predicted is not None]
        fig = Figure(figsize=(max(6.0, 0.55 * len(lines)), 4.2))
        ax = fig.add_subplot(1, 1, 1)
        xs = range(len(lines))
        ax.bar([x - 0.2 for x in xs], [x.frequency for x in lines], 0.4, label="observed")
        ax.bar([x + 0.2 for x in xs], [float(x.predicted or 0.0) for x in lines], 0.4, label="predicted")
        ax.set_xticks(list(xs))
        ax.set_xticklabels([x.quantity for x in lines], rotation=60, ha="right", fontsize=8)
        ax.set_yscale("log")
        ax.set_ylabel("frequency")
        what = "fundamental discriminants" if self.fundamental_only else "discriminants"
        ax.set_title(f"{self.total} {what}, {self.low} ≤ |D| ≤ {self.high}", fontsize=9)
        ax.legend(fontsize=8)
        fig.tight_layout()
        fig.savefig(str(path))


def _checked_rows(rows: Iterable, fundamental: bool) -> list:
    out = []
    for r in rows:
        if r.discriminant >= 0:
            continue
        if r.invariants is None:
            raise FormkitError(
                f"row D = {r.discriminant} has no invariants; statistics need a table built with invariants"
            )
        if fundamental and r.conductor != 1:
            continue
        out.append(r)
    return out


def class_group_statistics(
    rows: Iterable,
    *,
    primes: Sequence[int] = (2, 3, 5, 7),
    max_rank: int = 3,
    fundamental: bool = True,
    provenance: str = "unconditional rows of a class-number table",
) -> GroupStatistics:
    """Frequencies of p-ranks, of ``p | h``, of cyclic groups and of non-cyclic odd parts.

    Parameters
    ----------
    rows : iterable of TableRow
        Rows with invariants (negative discriminants; positive ones are skipped).
    primes : sequence of int
        The primes ``p`` (``2`` gives the 2-rank and Gerth's 4-rank lines).
    max_rank : int
        Ranks ``0 … max_rank − 1`` get a line each, the last line is ``≥ max_rank``.
    fundamental : bool
        Keep only fundamental discriminants (the predictions are about fields).
    provenance : str
        Where the rows came from (shown with the result).

    Returns
    -------
    GroupStatistics

    Raises
    ------
    FormkitError
        If a row has no invariants or no row is left.

    Examples
    --------
    >>> from formkit.tables.rows import table_rows
    >>> s = class_group_statistics(table_rows(-5000, -3), primes=(3,))
    >>> [(x.quantity, x.count) for x in s.lines][:3]
    [('3-rank = 0', 1025), ('3-rank = 1', 496), ('3-rank = 2', 3)]

    References
    ----------
    Cohen–Lenstra, LNM 1068 (1984); Gerth, Invent. Math. 77 (1984).
    """
    sel = _checked_rows(rows, fundamental)
    if not sel:
        raise FormkitError("no rows with negative discriminants to count")
    N = len(sel)
    lines: list[GroupStatistic] = []

    def add(q: str, c: int, pred: float | None, src: str) -> None:
        lines.append(GroupStatistic(q, c, c / N, pred, src))

    for p in primes:
        if p == 2:
            for label, m, src in (("2-rank", 2, "genus theory fixes it"), ("4-rank", 4, "Gerth")):
                ranks = [_rank(r.invariants, m) for r in sel]
                for k in range(max_rank + 1):
                    c = sum(1 for x in ranks if (x == k if k < max_rank else x >= k))
                    pred = None
                    if m == 4:
                        pred = (
                            cohen_lenstra_rank_probability(2, k)
                            if k < max_rank
                            else 1 - sum(cohen_lenstra_rank_probability(2, j) for j in range(max_rank))
                        )
                    add(f"{label} {'=' if k < max_rank else '≥'} {k}", c, pred, src)
            continue
        ranks = [_rank(r.invariants, p) for r in sel]
        for k in range(max_rank + 1):
            c = sum(1 for x in ranks if (x == k if k < max_rank else x >= k))
            pred = (
                cohen_lenstra_rank_probability(p, k)
                if k < max_rank
                else 1 - sum(cohen_lenstra_rank_probability(p, j) for j in range(max_rank))
            )
            add(f"{p}-rank {'=' if k < max_rank else '≥'} {k}", c, pred, "Cohen–Lenstra")
        add(f"{p} | h", sum(1 for x in ranks if x), 1 - cohen_lenstra_rank_probability(p, 0), "Cohen–Lenstra")
    add("cyclic", sum(1 for r in sel if len(r.invariants) <= 1), None, "none (2-part by genus theory)")
    noncyc = sum(1 for r in sel if sum(1 for n in r.invariants if _odd(n) > 1) >= 2)
    add("non-cyclic odd part", noncyc, 1 - _odd_part_cyclic_probability(), "Cohen–Lenstra")
    low = min(-r.discriminant for r in sel)
    high = max(-r.discriminant for r in sel)
    return GroupStatistics(low, high, N, bool(fundamental), tuple(lines), provenance)


def _odd(n: int) -> int:
    while n % 2 == 0:
        n //= 2
    return n


def rows_with_rank(rows: Iterable, p: int, rank: int, *, at_least: bool = False) -> list:
    """The rows whose class group has ``p``-rank ``rank`` (``≥ rank`` with ``at_least``).

    ``rows_with_rank(rows, p, 2, at_least=True)`` are the groups containing
    ``C(p) × C(p)``.

    Examples
    --------
    >>> from formkit.tables.rows import table_rows
    >>> [r.discriminant for r in rows_with_rank(table_rows(-4100, -3000, fundamental=True), 3, 2)]
    [-3299, -3896, -4027]
    """
    if p < 2 or rank < 0:
        raise FormkitError(f"need a prime p ≥ 2 and a rank ≥ 0, not p={p}, rank={rank}")
    out = []
    for r in rows:
        if r.invariants is None:
            raise FormkitError(f"row D = {r.discriminant} has no invariants")
        k = _rank(r.invariants, p)
        if k == rank or (at_least and k > rank):
            out.append(r)
    return out


def first_occurrences(rows: Iterable, wanted: Sequence[tuple[int, int]]) -> dict:
    """For each ``(p, r)`` in ``wanted``: the row of smallest ``|D|`` with ``p``-rank ``≥ r``
    (``None`` if none in the rows).

    Examples
    --------
    >>> from formkit.tables.rows import table_rows
    >>> occ = first_occurrences(table_rows(-5000, -3, fundamental=True), [(3, 2), (5, 2)])
    >>> occ[(3, 2)].discriminant, occ[(3, 2)].invariants, occ[(5, 2)]
    (-3299, (3, 9), None)
    """
    best: dict = {tuple(w): None for w in wanted}
    for r in rows:
        if r.invariants is None:
            raise FormkitError(f"row D = {r.discriminant} has no invariants")
        for p, k in best:
            if _rank(r.invariants, p) >= k:
                cur = best[(p, k)]
                if cur is None or abs(r.discriminant) < abs(cur.discriminant):
                    best[(p, k)] = r
    return best
