"""Rédei's 4-rank of class groups, from the factorisation of D (a reference for the tests).

Rédei (1934), as recalled (from memory): for a fundamental discriminant
D = d_1⋯d_t (prime discriminants d_i: −4, ±8 or ±p ≡ 1 mod 4, p_i the prime of d_i), let
A over F_2 have a_ij = 1 iff the Kronecker symbol (d_j/p_i) = −1 (i ≠ j) and a_ii chosen
so that every row sums to 0.  Then the 4-rank of the narrow class group is
t − 1 − rank(A).  tests/test_large_discriminants.py confirms this recollection against
enumeration for every fundamental |D| < 3000 before using it at 20 to 30 digits.
"""

from __future__ import annotations

from formkit.core.arith import factorint, kronecker


def prime_discriminants(D: int, factors=None) -> list[tuple[int, int]]:
    """``[(p_i, d_i)]`` with ``D = ∏ d_i`` (D fundamental; ``factors`` of |D| if known)."""
    fac = factorint(abs(D)) if factors is None else factors
    out = [(p, p if p % 4 == 1 else -p) for p in sorted(fac) if p != 2]
    odd = 1
    for _p, d in out:
        odd *= d
    if D // odd != 1:
        assert D // odd in (-4, 8, -8), (D, D // odd)
        out.append((2, D // odd))
    return out


def _rank_f2(rows: list[int]) -> int:
    rank = 0
    rows = list(rows)
    while rows:
        pivot = rows.pop()
        if not pivot:
            continue
        rank += 1
        low = pivot & -pivot
        rows = [r ^ pivot if r & low else r for r in rows]
    return rank


def redei_four_rank(D: int, factors=None) -> int:
    pd = prime_discriminants(D, factors)
    t = len(pd)
    rows = []
    for i, (p_i, _d) in enumerate(pd):
        bits = [1 if i != j and kronecker(d_j, p_i) == -1 else 0 for j, (_p, d_j) in enumerate(pd)]
        bits[i] = sum(bits) % 2
        rows.append(sum(b << j for j, b in enumerate(bits)))
    return t - 1 - _rank_f2(rows)
