"""Enumeration of reduced forms and class numbers by complete listing.

The classes of primitive forms of discriminant ``D`` under proper (SL2(Z))
equivalence are listed here by their reduced forms (positive definite ones when
``D < 0``); for ``D > 0`` these are the *narrow* classes of the order of discriminant
``D``.  The group structure lives in :mod:`formkit.classgroups`.

*Enumeration* (``D < 0``).  Every class has exactly one reduced form; for each
``a ≤ √(|D|/3)`` the admissible ``b`` are the square roots of ``D`` modulo ``4a``,
computed from the factorisation of ``a`` (a smallest-prime-factor sieve) and the CRT,
rather than by scanning all ``b`` (Cohen GTM 138, Algorithm 5.3.5 refined this way;
Buchmann–Vollmer Ch. 5).  *Enumeration* (``D > 0``): all reduced forms are listed from
the factorisations of ``(D − b²)/4`` for ``0 < b < √D`` and grouped into cycles of the
reduction operator; one cycle per class (Gauss; Buchmann–Vollmer Theorem 6.10.3).

Results from enumeration are unconditional.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.3–5.5, §2.4.3 (Smith normal form).
.. [2] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, Ch. 5, 6, 9.
.. [3] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §3.
"""

from __future__ import annotations

import math
from functools import lru_cache
from math import gcd as _gcd

from .arith import divisors, isqrt, kronecker, next_prime
from .discriminants import validate_discriminant
from .forms import Form
from .modular_roots import _sqrt_mod_prime_power
from .raw_reduction import (
    _reduce_definite_raw,
    _reduce_indefinite_raw,
    _representative_key,
    _rho_indefinite_raw,
)

__all__ = [
    "reduced_forms",
    "class_representatives",
    "class_number",
    "enumeration_cost",
]

# ---------------------------------------------------------------------------
# enumeration


def _spf_sieve(n: int) -> list[int]:
    spf = list(range(n + 1))
    i = 2
    while i * i <= n:
        if spf[i] == i:
            for j in range(i * i, n + 1, i):
                if spf[j] == j:
                    spf[j] = i
        i += 1
    return spf


def _factor_with(spf: list[int], n: int) -> dict[int, int]:
    out: dict[int, int] = {}
    while n > 1:
        p = spf[n]
        e = 0
        while n % p == 0:
            n //= p
            e += 1
        out[p] = e
    return out


def _reduced_forms_negative(D: int) -> list[tuple[int, int, int]]:
    amax = int(isqrt(-D // 3))
    spf = _spf_sieve(max(amax, 2))
    out: list[tuple[int, int, int]] = []
    # square roots of D modulo each prime power met (modulo 2^(e+2) for p = 2, since
    # the modulus is 4a), computed once per prime power and combined by the CRT below
    root_cache: dict[tuple[int, int], tuple[int, tuple[int, ...]]] = {}
    for a in range(1, amax + 1):
        fac = _factor_with(spf, a)
        fac[2] = fac.get(2, 0) + 2
        roots = [0]
        m = 1
        for p, e in fac.items():
            entry = root_cache.get((p, e))
            if entry is None:
                entry = (p**e, tuple(int(r) for r in _sqrt_mod_prime_power(D, p, e)))
                root_cache[(p, e)] = entry
            mod, rs = entry
            if not rs:
                roots = []
                break
            if m == 1:
                roots = list(rs)
            else:
                inv = pow(m, -1, mod)
                roots = [x + m * (((r - x) * inv) % mod) for x in roots for r in rs]
            m *= mod
        if not roots:
            continue
        two_a = 2 * a
        bs = sorted({(r % two_a) if (r % two_a) <= a else (r % two_a) - two_a for r in roots})
        four_a = 4 * a
        for b in bs:
            c = (b * b - D) // four_a
            if c < a:
                continue
            if b < 0 and (b == -a or a == c):
                continue
            if _gcd(_gcd(a, b), c) != 1:
                continue
            out.append((a, b, c))
    return out


def _reduced_forms_positive(D: int) -> list[tuple[int, int, int]]:
    s = int(isqrt(D))
    out = []
    for b in range(s, 0, -1):
        if (b - D) % 2:
            continue
        N = (D - b * b) // 4  # = -ac > 0
        for a_abs in divisors(N):
            # reduced: s - b < 2|a| <= s + b  (exact form of √D − b < 2|a| < √D + b)
            if not (2 * a_abs > s - b and 2 * a_abs - b <= s):
                continue
            c_abs = N // a_abs
            if _gcd(_gcd(a_abs, b), c_abs) != 1:
                continue
            out.append((a_abs, b, -c_abs))
            out.append((-a_abs, b, c_abs))
    return sorted(out)


def enumeration_cost(D: int) -> tuple[float, float]:
    """Estimated (seconds, bytes) of enumerating the reduced forms of ``D``.

    ``D < 0``: a sieve and a loop over ``a ≤ √(|D|/3)`` (about 10 µs and 100 bytes per
    ``a``, measured here at ``|D| = 10^11``, rounded up); ``D > 0``: a loop over
    ``b ≤ √D`` with a factorisation each, and the forms kept for the cycles (about
    100 µs and 300 bytes per ``b``).

    Examples
    --------
    >>> t, m = enumeration_cost(-10**11)
    >>> 0.5 < t < 10 and m < 2**30
    True
    """
    from .budget import to_float

    r = to_float(isqrt(abs(D)))
    if D < 0:
        r /= 1.7
        return 1.2e-5 * r, 100.0 * r
    return 1e-4 * r, 300.0 * r


def _check_enumeration_cost(D: int) -> None:
    from .budget import check_cost, describe_integer

    seconds, memory = enumeration_cost(D)
    check_cost(
        f"enumerating the classes of D = {describe_integer(D)}",
        seconds=seconds,
        memory=memory,
        further=(
            "baby-step giant-step (group/class-number --method bsgs, conditional on GRH) reaches further"
            if D < 0
            else "the infrastructure (class-number --method bsgs, conditional on GRH) reaches further"
        ),
    )


@lru_cache(maxsize=64)
def _reduced_forms_cached(D: int) -> tuple[tuple[int, int, int], ...]:
    _check_enumeration_cost(D)
    if D < 0:
        return tuple(_reduced_forms_negative(D))
    return tuple(_reduced_forms_positive(D))


def reduced_forms(D: object) -> list[Form]:
    """All primitive reduced forms of discriminant ``D``.

    For ``D < 0`` these are the positive definite reduced forms, one per class.  For
    ``D > 0`` every reduced indefinite form is listed (each class has a whole cycle).

    Raises
    ------
    DiscriminantError
        If ``D`` is not a discriminant.

    Examples
    --------
    >>> reduced_forms(-23)
    [Form(1, 1, 6), Form(2, -1, 3), Form(2, 1, 3)]
    >>> len(reduced_forms(-4004))
    40
    >>> reduced_forms(13)
    [Form(-1, 3, 1), Form(1, 3, -1)]
    """
    D = validate_discriminant(D)
    return [Form(*f) for f in _reduced_forms_cached(D)]


def _cycles_positive(D: int) -> tuple[list[tuple[int, int, int]], dict[tuple, tuple]]:
    """Canonical representative per cycle, and a map reduced form -> representative."""
    _check_enumeration_cost(D)
    sq = int(isqrt(D))
    index: dict[tuple, tuple] = {}
    reps: list[tuple[int, int, int]] = []
    for f in _reduced_forms_cached(D):
        if f in index:
            continue
        cyc = [f]
        a, b, c = f
        while True:
            a, b, c, _t = _rho_indefinite_raw(a, b, c, D, sq)
            if (a, b, c) == f:
                break
            cyc.append((a, b, c))
        rep = min(cyc, key=_representative_key)  # class_representative's choice
        for g in cyc:
            index[g] = rep
        reps.append(rep)
    reps.sort(key=_representative_key)
    return reps, index


@lru_cache(maxsize=64)
def _cycles_cached(D: int):
    return _cycles_positive(D)


def class_representatives(D: object) -> list[Form]:
    """One reduced form for each proper class of primitive forms of discriminant ``D``.

    For ``D > 0`` the representative of a cycle is its form with the least ``|a|``
    (positive ``a`` preferred, then least ``b``); the principal class comes first.

    Examples
    --------
    >>> class_representatives(-56)
    [Form(1, 0, 14), Form(2, 0, 7), Form(3, -2, 5), Form(3, 2, 5)]
    >>> class_representatives(4 * 79)   # Q(√79): narrow class number 6
    [Form(1, 16, -15), Form(-1, 16, 15), Form(3, 14, -10), Form(3, 16, -5), Form(-3, 14, 10), Form(-3, 16, 5)]
    """
    D = validate_discriminant(D)
    if D < 0:
        return reduced_forms(D)
    return [Form(*f) for f in _cycles_cached(D)[0]]


def class_number(D: object) -> int:
    """The class number ``h(D)`` by complete enumeration (narrow class number for ``D > 0``).

    Examples
    --------
    >>> [class_number(d) for d in (-3, -4, -23, -47, -71)]
    [1, 1, 3, 5, 7]
    >>> class_number(4 * 79), class_number(5)
    (6, 1)
    """
    D = validate_discriminant(D)
    if D < 0:
        return len(_reduced_forms_cached(D))
    return len(_cycles_cached(D)[0])


# ---------------------------------------------------------------------------
# reduced prime forms of the small primes


def _prime_forms(D: int, f: int, stop: int | None = None):
    """Reduced prime forms ``(p, b, c)`` of D for the primes p ≤ stop (all primes if None)
    with p ∤ f and χ_D(p) ≠ −1, in increasing order: the generators from which both
    large-discriminant class-group methods start (baby-step giant-step for D < 0,
    :mod:`formkit.classgroups.infrastructure` for D > 0)."""
    sq = math.isqrt(D) if D > 0 else 0
    p = 2
    while stop is None or p <= stop:
        if kronecker(D, p) != -1 and f % p:
            g = Form.prime_form(D, p)
            if D < 0:
                yield p, _reduce_definite_raw(g.a, g.b, g.c)
            else:
                a, b, c = _reduce_indefinite_raw(g.a, g.b, g.c, D, sq)
                yield p, (int(a), int(b), int(c))
        p = int(next_prime(p))
