"""Relation matrices of class groups, for the tests of the lattice code.

For D < 0 and the first n prime forms p_1, …, p_n of D (χ_D(p) = 1, p ∤ D), a random
product ∏ p_i^{e_i} (NUCOMP) is reduced to (a, b, c); when a factors over the primes of
the base, a = ∏ p_i^{v_i} and the form is the product of p_i^{±v_i} (the sign read from
b mod 2p), which gives the relation e − v.  Relations are collected until every column
occurs at least twice.  This is the relation search of the subexponential class group
methods (Hafner–McCurley; Buchmann) in its simplest form: common practice, written
from memory.
"""

from __future__ import annotations

import random

from formkit.core.composition import _nucomp_bound, _nucomp_raw
from formkit.core.enumeration import _prime_forms


def factor_base(D: int, n: int) -> list[tuple[int, tuple[int, int, int]]]:
    """The first n pairs (p, reduced prime form of norm p) with χ_D(p) = 1."""
    out = []
    for p, f in _prime_forms(D, 1):
        if D % p:
            out.append((p, f))
            if len(out) == n:
                break
    return out


def relation_matrix(D: int, n: int, extra: int, seed: int = 1) -> list[list[int]]:
    """At least n + extra relations among the first n prime forms of D < 0 (dense rows)."""
    rnd = random.Random(seed)
    base = factor_base(D, n)
    L = _nucomp_bound(D)
    small = min(n, 12)
    rows: list[list[int]] = []
    targets: list[int] = []
    nxt = 0
    want = n + extra
    while len(rows) < want or targets:
        e = [0] * n
        x = (1, 1, (1 - D) // 4) if D % 4 == 1 else (1, 0, -D // 4)
        terms = [(rnd.randrange(small), rnd.randint(1, 3)) for _ in range(6)]
        if targets:
            terms.append((targets.pop(), 1))
        else:
            terms.append((nxt % n, 1))
            nxt += 1
        terms.append((rnd.randrange(n), 1))
        for i, k in terms:
            a, b, c = base[i][1]
            sign = 1
            if rnd.random() < 0.5 and b:
                b, sign = -b, -1
            for _ in range(k):
                x = _nucomp_raw(*x, a, b, c, D, L)
            e[i] += sign * k
        a, b, _c = x
        m, v = a, [0] * n
        for i, (p, (_pa, pb, _pc)) in enumerate(base):
            if m == 1:
                break
            while m % p == 0:
                m //= p
                v[i] += 1 if (b - pb) % (2 * p) == 0 else -1
        if m != 1:
            continue
        r = [e[i] - v[i] for i in range(n)]
        if any(r):
            rows.append(r)
        if len(rows) >= want and not targets:
            counts = [sum(1 for q in rows if q[j]) for j in range(n)]
            targets = [j for j in range(n) if counts[j] < 2]
            want = len(rows) + len(targets)
    return rows
