"""Units from relations among prime ideals of a real quadratic field, and the regulator.

A relation of the subexponential method for ``D > 0`` is an equation of ideals
``∏ 𝔭_i^{e_i} = (γ)`` up to rational factors, ``γ`` a known element of ``K = Q(√D)``
(:mod:`formkit.classgroups.subexponential_real`).  It is kept here as a sparse integer
row ``e``, the real number ``λ(γ) = ½·log|γ/γ'|`` (which rational factors do not change)
and the parity ``s`` of the number of generators of negative norm.  Every integer vector
``k`` with ``Σ k_j·e_j = 0`` gives a unit ``u = ∏ γ_j^{k_j}`` (up to a rational factor,
which is then ±1), with ``log|u| = Σ k_j·λ_j`` a multiple of the regulator ``R`` and
``N(u) = (−1)^{Σ k_j s_j}``.  This module finds such kernel vectors and the real greatest
common divisor of their logarithms (Buchmann [1]; Cohen [2], §5.9):

1. structured elimination on pivots ±1, the same row operations applied to ``λ`` and
   ``s`` (rows that become zero are units at once);
2. for the dense rest, a set ``S`` of independent rows (rank modulo a prime) and, for
   some other rows ``r``, the rational solution ``x_r`` of ``x·M_S = r`` (FLINT).  With
   ``t = |det M_S| / h*`` (``h*`` the index of the relation lattice) the vectors ``t·x_r``
   are integral, and the integer kernel vectors supported on ``S`` and these rows are the
   ``c`` with ``Σ c_r·t·x_r ≡ 0 (mod t)`` — a lattice built one column at a time by small
   Hermite normal forms (:func:`_kernel_combinations`);
3. the logarithms ``Σ c_r·λ_r − (Σ c_r x_r)·λ_S`` in multiple precision (gmpy2's MPFR,
   with the precision raised by the caller until it covers the size of the ``x_r`` and the
   error growth of the gcd), then their real
   Euclidean gcd, checked: every logarithm is an integer multiple of it to within
   ``2^-40``.

The gcd ``R*`` is a multiple of ``R`` (its logarithms are logs of true units); that it
equals ``R`` is proved by the caller, from ``h*·R*`` against the analytic interval.

References
----------
.. [1] J. Buchmann, "A subexponential algorithm for the determination of class groups
       and regulators of algebraic number fields", Séminaire de Théorie des Nombres,
       Paris 1988–89, Progr. Math. 91, Birkhäuser 1990, 27–41.
.. [2] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.9 (Buchmann's sub-exponential algorithm; the regulator as the
       gcd of the real parts of kernel vectors of the relation matrix with a real column).
.. [3] M. J. Jacobson, Jr., *Subexponential class group computation in quadratic
       orders*, PhD thesis, TU Darmstadt 1999 (from memory).
"""

from __future__ import annotations

import heapq
import random
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import flint

from ..core.arith import mpfr, real_log2, real_precision, real_rint
from ..errors import FormkitError

__all__ = ["UnitRow", "UnitLogs", "unit_logarithms", "real_gcd"]

#: Prime for the rank test that picks independent rows (any large prime works).
RANK_PRIME = (1 << 61) - 1
#: Tolerance of the real gcd: a remainder below it counts as 0.  Every non-zero multiple of
#: a regulator exceeds log((1 + √5)/2) > 0.48, and the logarithms are far more precise.
GCD_TOLERANCE = 0.25


@dataclass
class UnitRow:
    """One relation: sparse row ``e``, ``λ = ½·log|γ/γ'|`` (an MPFR number) and the parity ``s``."""

    row: dict[int, int]
    log: Any
    sign: int


@dataclass
class UnitLogs:
    """Logarithms ``log|u|`` (MPFR) and norm parities of the units found."""

    logs: list
    signs: list[int]
    precision: int
    dense_shape: tuple[int, int]
    #: bits lost to cancellation in the largest sum (the caller raises the precision
    #: above this and recomputes when it is close)
    needed: int = 0


def _eliminate(n: int, rows: list[UnitRow], limit: int) -> tuple[list[UnitRow], list[UnitRow]]:
    """Structured elimination on pivots ±1, tracking ``λ`` and ``s``: (units, rest)."""
    live = {i: r for i, r in enumerate(rows) if r.row}
    units = [r for r in rows if not r.row]
    cols: dict[int, set[int]] = {j: set() for j in range(n)}
    for i, r in live.items():
        for j in r.row:
            cols[j].add(i)
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
            e = live[i].row
            if abs(e[j]) == 1 and (best is None or len(e) < len(live[best].row)):
                best = i
        if best is None:
            continue
        if (len(live[best].row) - 1) * (wgt - 1) > limit:
            break
        piv = live.pop(best)
        sgn = piv.row[j]
        for k in piv.row:
            cols[k].discard(best)
        for i in list(s):
            r = live[i]
            c = r.row[j] * sgn  # r − c·piv has no column j
            for k, v in piv.row.items():
                w = r.row.get(k, 0) - c * v
                if w:
                    if k not in r.row:
                        cols[k].add(i)
                    r.row[k] = w
                else:
                    del r.row[k]
                    cols[k].discard(i)
            r.log = r.log - c * piv.log
            r.sign = (r.sign + c * piv.sign) % 2
            if not r.row:
                units.append(live.pop(i))
        del cols[j]
        for k in piv.row:
            if cols.get(k):
                heapq.heappush(heap, (len(cols[k]), k))
    return units, list(live.values())


def _independent_rows(M: list[list[int]]) -> list[int]:
    """Indices of a maximal set of rows of ``M`` independent modulo :data:`RANK_PRIME`."""
    T = flint.nmod_mat([list(c) for c in zip(*M)], RANK_PRIME)  # columns of M as rows
    R, rank = T.rref()
    piv = []
    for i in range(rank):
        for j in range(R.ncols()):
            if int(R[i, j]) != 0:
                piv.append(j)
                break
    return piv


def unit_logarithms(
    n: int,
    rows: Sequence[UnitRow],
    index: int,
    *,
    extra: int,
    rng: random.Random,
    limit: int = 20000,
) -> UnitLogs:
    """Logarithms and norm parities of units from integer kernel vectors of the relations.

    Parameters
    ----------
    n : int
        Number of columns (prime ideals).
    rows : sequence of UnitRow
        The relations (copied; not changed).
    index : int
        ``h*``, the index of the row lattice in Zⁿ (finite).
    extra : int
        How many rows outside the independent set are solved for (more: more units).
    rng : random.Random
        Chooses those rows.
    limit : int
        Markowitz limit of the elimination.

    Returns
    -------
    UnitLogs

    Raises
    ------
    FormkitError
        If the rows do not have rank ``n`` (the index is not finite).

    Examples
    --------
    Two relations with the same row: their quotient is a unit of logarithm ``λ₁ − λ₂``.

    >>> from formkit.core.arith import mpfr, real_log, set_real_precision
    >>> set_real_precision(100)
    >>> r = [UnitRow({0: 2}, mpfr(3.5), 0), UnitRow({0: 2}, mpfr(1.0), 1)]
    >>> u = unit_logarithms(1, r, 2, extra=4, rng=random.Random(1))
    >>> [round(float(abs(x)), 6) for x in u.logs], u.signs
    ([2.5], [1])
    """
    work = [UnitRow(dict(r.row), r.log, r.sign) for r in rows]
    units, rest = _eliminate(n, work, limit)
    logs = [u.log for u in units]
    signs = [u.sign for u in units]
    shape = (0, 0)
    needed = 0
    if rest:
        cols = sorted({j for r in rest for j in r.row})
        pos = {j: i for i, j in enumerate(cols)}
        M = [[0] * len(cols) for _ in rest]
        for i, r in enumerate(rest):
            for j, v in r.row.items():
                M[i][pos[j]] = v
        shape = (len(rest), len(cols))
        S = _independent_rows(M)
        if len(S) < len(cols):
            raise FormkitError(
                f"the relations have rank {len(S)} on {len(cols)} columns after elimination: no finite index"
            )
        others = [i for i in range(len(rest)) if i not in set(S)]
        rng.shuffle(others)
        others = others[:extra]
        if others:
            MS = flint.fmpz_mat([M[i] for i in S])
            det = abs(int(MS.det()))
            if det % index:
                raise ArithmeticError(f"det {det} of independent relations is not a multiple of h* = {index}")
            t = det // index
            Xq = MS.transpose().solve(flint.fmpz_mat([list(c) for c in zip(*(M[i] for i in others))]))
            # Y[r][i] = t·x_r[i] (integral: t kills the quotient of the two lattices)
            Y = [[0] * len(S) for _ in others]
            for i in range(len(S)):
                for jr in range(len(others)):
                    q = Xq[i, jr] * t
                    if q.q != 1:
                        raise ArithmeticError("t·x is not integral")  # pragma: no cover
                    Y[jr][i] = int(q.p)
            basis = _kernel_combinations(Y, t)
            for c in basis:
                ys = [sum(c[r] * Y[r][i] for r in range(len(others))) // t for i in range(len(S))]
                big = max(abs(v) for v in list(c) + ys)
                top = max(abs(rest[i].log) for i in S + others)
                needed = max(needed, big.bit_length() + len(S).bit_length() + int(real_log2(top + 2)) + 1)
                lg = sum(c[r] * rest[others[r]].log for r in range(len(others)))
                lg = lg - sum(ys[i] * rest[S[i]].log for i in range(len(S)) if ys[i])
                sg = sum(c[r] * rest[others[r]].sign for r in range(len(others)))
                sg += sum(ys[i] * rest[S[i]].sign for i in range(len(S)))
                logs.append(lg)
                signs.append(sg % 2)
    return UnitLogs(logs, signs, real_precision(), shape, needed)


def _kernel_combinations(Y: list[list[int]], t: int) -> list[list[int]]:
    """A basis of ``{c ∈ Z^e : c·Y ≡ 0 (mod t)}`` (``e`` rows of ``Y``).

    One column at a time: with ``B`` a basis of the lattice for the columns so far and
    ``v = B·y mod t`` for the next column ``y``, the Hermite normal form of the
    ``(e+1) × (e+1)`` matrix ``[[v, B], [t, 0]]`` has ``gcd(v, t)`` above and the basis
    of the next lattice below.  Every matrix stays ``(e+1)``-square with entries below
    ``t`` (the lattice contains ``t·Z^e``), so the cost is linear in the number of
    columns -- one Hermite form of the whole ``(k+e)``-square matrix was far slower at
    24 digits and more (Cohen, GTM 138, §2.4.3 for the Hermite form modulo a multiple
    of the determinant, which is the same idea).
    """
    e = len(Y)
    B = [[int(i == r) for i in range(e)] for r in range(e)]
    if t == 1 or not e:
        return B
    for i in range(len(Y[0])):
        col = [Y[r][i] % t for r in range(e)]
        if not any(col):
            continue
        v = [sum(B[q][r] * col[r] for r in range(e)) % t for q in range(e)]
        if not any(v):
            continue
        H = flint.fmpz_mat([[v[q]] + B[q] for q in range(e)] + [[t] + [0] * e]).hnf()
        B = [[int(H[q, j]) for j in range(1, e + 1)] for q in range(1, e + 1)]
    return B


def real_gcd(values: Sequence, tolerance: float = GCD_TOLERANCE):
    """The positive real gcd of real numbers that are integer multiples of one number.

    Euclid's algorithm with the symmetric remainder; a remainder below ``tolerance``
    counts as zero.  Returns ``None`` when every value is below the tolerance.

    Raises
    ------
    FormkitError
        If a value is not within ``2^-40·max(1, |v|)`` of a multiple of the result (the
        values were not multiples of one number, or the precision was too low).

    Examples
    --------
    >>> from formkit.core.arith import mpfr, real_log, set_real_precision
    >>> set_real_precision(100)
    >>> g = real_gcd([mpfr(6) * real_log(3), -mpfr(10) * real_log(3)])
    >>> round(float(g / real_log(3)), 12)
    2.0
    """
    g = None
    for v in values:
        a = abs(v)
        if a < tolerance:
            continue
        if g is None:
            g = a
            continue
        x, y = (g, a) if g >= a else (a, g)
        while y >= tolerance:
            q = real_rint(x / y)
            x, y = y, abs(x - q * y)
        g = x
    if g is None:
        return None
    for v in values:
        q = real_rint(v / g)
        if abs(v - q * g) > mpfr(2) ** -40 * max(1, abs(v)):
            raise FormkitError(f"the unit logarithm {float(v):.6g} is not a multiple of {float(g):.6g}")
    return g
