"""Reduction on bare integer triples: the hot loops every layer shares.

These are the cores of :mod:`formkit.core.reduction` without ``Form`` objects, matrices
or checks: Gauss reduction of a positive definite ``(a, b, c)`` (Cohen GTM 138,
Algorithm 5.4.2), the reduction operator ρ on indefinite forms and reduction by
iterating it (Buchmann–Vollmer, *Binary Quadratic Forms*, §6.2–6.3, Algorithm 6.1),
with ``sq = ⌊√D⌋`` for the exact comparisons with √D.  Callers pass ``int`` or gmpy2
``mpz`` (:func:`_to_work` picks the faster type for the size).  The definitions of
reduced forms are in :mod:`formkit.core.reduction`.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, Algorithm 5.4.2 and §5.6.
.. [2] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, Ch. 6.
"""

from __future__ import annotations

from .arith import isqrt, mpz

__all__: list = []

#: Coefficients of at least this many bits are reduced with gmpy2 ``mpz``; smaller ones
#: with plain Python ints, which are faster there (no conversions, no object overhead).
#: Chosen from ``benchmarks/bench_reduction.py`` (docs/performance.md, section
#: "Reduction and the integer backend"): Python ints win at |D| ≈ 10^40, mpz from
#: coefficients of a few hundred digits on.
MPZ_THRESHOLD_BITS = 512


def _to_work(*values):
    """``values`` as the integer type that is fastest for their size (see above)."""
    if mpz is not int and max(abs(v) for v in values).bit_length() >= MPZ_THRESHOLD_BITS:
        return tuple(mpz(v) for v in values)
    return tuple(int(v) for v in values)


def _is_reduced_definite_raw(a: int, b: int, c: int) -> bool:
    if a < 0:
        a, b, c = -a, -b, -c
    return -a < b <= a <= c and not (a == c and b < 0)


def _reduce_definite_raw(a: int, b: int, c: int) -> tuple[int, int, int]:
    """Reduce a positive definite form (no matrix).  Cohen Algorithm 5.4.2."""
    while True:
        if not (-a < b <= a):
            a2 = a + a
            r = b % a2
            if r > a:
                r -= a2
            # b -> r = b + 2ak with k = (r - b) / 2a
            k = (r - b) // a2
            c += (a * k + b) * k
            b = r
        if a > c:
            a, b, c = c, -b, a
            continue
        if a == c and b < 0:
            b = -b
        return a, b, c


def _is_reduced_indefinite_raw(a: int, b: int, sq: int) -> bool:
    if b <= 0 or b > sq:
        return False
    a2 = 2 * abs(a)
    return a2 + b > sq and a2 - b <= sq


def _rho_indefinite_raw(a: int, b: int, c: int, D: int, sq: int):
    """One step of ρ: returns ``(c, b', (b'² − D)/4c, t)`` with matrix ``[[0, −1], [1, t]]``."""
    cc = abs(c)
    c2 = 2 * cc
    if cc > sq:
        r = (-b) % c2
        if r > cc:
            r -= c2
    else:
        r = sq - ((sq + b) % c2)
    t = (b + r) // (2 * c)
    return c, r, (r * r - D) // (4 * c), t


def _reduce_indefinite_raw(a: int, b: int, c: int, D: int, sq: int):
    """Apply ρ until reduced; returns the reduced form (no matrix)."""
    while not _is_reduced_indefinite_raw(a, b, sq):
        a, b, c, _ = _rho_indefinite_raw(a, b, c, D, sq)
    return a, b, c


def _principal_reduced_indefinite(D: int) -> tuple[int, int, int]:
    """A reduced form ``(1, b, (b² − D)/4)`` of discriminant ``D > 0`` (b the largest
    integer < √D with b ≡ D mod 2)."""
    sq = int(isqrt(D))
    b = sq if (sq - D) % 2 == 0 else sq - 1
    return 1, b, (b * b - D) // 4


#: Longest cycle of reduced forms walked to find the representative of an indefinite class
#: (about 2.5 s at 0.8 million ρ-steps per second; cycles have about R/1.19 forms).
REPRESENTATIVE_CYCLE_LIMIT = 2_000_000


def _representative_key(f: tuple) -> tuple:
    """Order on the reduced forms of a cycle: least ``|a|``, then positive ``a``, then least ``b``.

    The least form of a cycle in this order is the class representative for D > 0
    (:func:`formkit.core.reduction.class_representative`); every layer uses this key."""
    return (abs(f[0]), f[0] < 0, f[1])


def _cycle_representative_raw(a, b, c, D, sq, limit: int = REPRESENTATIVE_CYCLE_LIMIT):
    """The least form (by :func:`_representative_key`) on the ρ-cycle of the *reduced*
    indefinite ``(a, b, c)``; ``None`` if the cycle has more than ``limit`` forms."""
    start = (int(a), int(b), int(c))
    if start[0] == 1:  # the only reduced form with a = 1 is on the principal cycle, and least there
        return start
    best_key, best = _representative_key(start), start
    for _ in range(limit):
        a, b, c, _t = _rho_indefinite_raw(a, b, c, D, sq)
        g = (int(a), int(b), int(c))
        if g == start:
            return best
        if g[0] == 1:
            return g
        k = _representative_key(g)
        if k < best_key:
            best_key, best = k, g
    return None
