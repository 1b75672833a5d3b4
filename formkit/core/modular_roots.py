"""Square roots modulo primes, prime powers and composite moduli; the Chinese remainder theorem.

Built on the integer backend :mod:`formkit.core.arith` (gmpy2 when available): square
roots modulo a prime by Tonelli–Shanks with the shortcuts for p ≡ 3 (mod 4) and
p ≡ 5 (mod 8), lifted to prime powers by Hensel's lemma, combined over the prime
powers of a modulus by the Chinese remainder theorem.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993: Algorithm 1.5.1 (Tonelli–Shanks square root modulo p),
       Section 1.3.3 (Chinese remainder theorem).
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence
from functools import lru_cache

from ..errors import FormkitError, NotPrimeError
from .arith import _int, _powmod, as_int, gcd, invert, is_probable_prime, kronecker, mpz
from .factorisation import prime_factorisation

__all__ = [
    "sqrt_mod_prime",
    "sqrt_mod_prime_power",
    "sqrt_mod",
    "crt",
]


def sqrt_mod_prime(a: int, p: int) -> int:
    """A square root of ``a`` modulo the prime ``p`` (the smaller of the two).

    Uses Tonelli–Shanks (Cohen GTM 138, Algorithm 1.5.1) with a shortcut for
    p ≡ 3 (mod 4).  ``p`` is assumed prime (checked only as a probable prime).

    Raises
    ------
    NotPrimeError
        If ``p`` is not a (probable) prime.
    FormkitError
        If ``a`` is not a square modulo ``p``.

    Examples
    --------
    >>> int(sqrt_mod_prime(-1, 13))
    5
    >>> int(sqrt_mod_prime(0, 7))
    0
    """
    a, p = _int(a, "a"), _int(p, "p")
    if not is_probable_prime(p):
        raise NotPrimeError(f"sqrt_mod_prime needs a prime modulus, not {p}")
    return _sqrt_mod_prime(mpz(a) % p, mpz(p))


def _sqrt_mod_prime(a: int, p: int) -> int:
    a %= p
    if a == 0 or p == 2:
        return a
    if kronecker(a, p) != 1:
        raise FormkitError(f"{a} is not a square modulo {p}")
    if p % 4 == 3:
        r = _powmod(a, (p + 1) // 4, p)
    elif p % 8 == 5:
        v = _powmod(2 * a, (p - 5) // 8, p)
        i = 2 * a * v * v % p
        r = a * v * (i - 1) % p
    else:
        # Tonelli–Shanks
        q, e = p - 1, 0
        while q % 2 == 0:
            q //= 2
            e += 1
        z = mpz(2)
        while kronecker(z, p) != -1:
            z += 1
        y = _powmod(z, q, p)
        r = _powmod(a, (q - 1) // 2, p)
        b = a * r * r % p
        r = a * r % p
        while b != 1:
            m, t = 0, b
            while t != 1:
                t = t * t % p
                m += 1
            t = _powmod(y, 1 << (e - m - 1), p)
            y = t * t % p
            r = r * t % p
            b = b * y % p
            e = m
    return min(r, p - r)


def sqrt_mod_prime_power(a: int, p: int, k: int) -> list[int]:
    """All square roots of ``a`` modulo ``p**k`` (sorted; empty when there are none).

    Handles every case, including ``p = 2`` and ``p`` dividing ``a``; roots are lifted
    from ``p`` by Hensel's lemma (Cohen GTM 138, §1.5; number not recalled).

    Raises
    ------
    NotPrimeError
        If ``p`` is not a (probable) prime.
    FormkitError
        If ``k < 1``.

    Examples
    --------
    >>> sqrt_mod_prime_power(-7, 2, 5)
    [5, 11, 21, 27]
    >>> sqrt_mod_prime_power(0, 3, 3)
    [0, 9, 18]
    >>> sqrt_mod_prime_power(2, 3, 2)
    []
    """
    a, p, k = as_int(a, "a"), as_int(p, "p"), as_int(k, "k")
    if k < 1:
        raise FormkitError(f"prime power exponent must be >= 1, not {k}")
    if not is_probable_prime(p):
        raise NotPrimeError(f"sqrt_mod_prime_power needs a prime p, not {p}")
    return [int(r) for r in _sqrt_mod_prime_power(a, p, k)]


@lru_cache(maxsize=65536)
def _sqrt_mod_prime_power(a: int, p: int, k: int) -> tuple[int, ...]:
    pk = p**k
    a %= pk
    if a == 0:
        # x^2 ≡ 0 mod p^k  <=>  p^ceil(k/2) | x
        step = p ** ((k + 1) // 2)
        return tuple(range(0, pk, step))
    # write a = p^v * a', v < k
    v = 0
    while a % p == 0:
        a //= p
        v += 1
    if v % 2 == 1:
        return ()
    h = v // 2
    # x = p^h * y with y^2 ≡ a' mod p^(k - v); y is then free modulo p^(k - h)
    roots_unit = _sqrt_unit_mod_prime_power(a, p, k - v)
    if not roots_unit:
        return ()
    ph = p**h
    mod_small = p ** (k - v)
    mod_y = p ** (k - h)
    out = set()
    for y0 in roots_unit:
        for t in range(0, mod_y, mod_small):
            out.add((ph * (y0 + t)) % pk)
    return tuple(sorted(out))


def _sqrt_unit_mod_prime_power(a: int, p: int, k: int) -> list[int]:
    """All roots of y^2 ≡ a (mod p^k) for a prime to p."""
    pk = p**k
    a %= pk
    if p == 2:
        if k == 1:
            return [1]
        if k == 2:
            return [1, 3] if a % 4 == 1 else []
        if a % 8 != 1:
            return []
        # lift a root mod 2^j to mod 2^(j+1) keeping the root defined mod 2^(j-1)
        r = 1
        for j in range(3, k):
            # r is a root modulo 2^j; make it a root modulo 2^(j+1)
            if (r * r - a) % (1 << (j + 1)) != 0:
                r += 1 << (j - 1)
        return sorted({r % pk, (-r) % pk, (r + pk // 2) % pk, (-r + pk // 2) % pk})
    if kronecker(a, p) != 1:
        return []
    r = int(_sqrt_mod_prime(mpz(a), mpz(p)))
    pj = p
    for _ in range(1, k):
        # Hensel: r <- r - (r^2 - a) / (2r)  mod p^(j+1)
        pj *= p
        r = (r - (r * r - a) * int(invert(2 * r, pj))) % pj
    return sorted({r % pk, (-r) % pk})


def sqrt_mod(a: int, n: int, factors: dict[int, int] | None = None) -> list[int]:
    """All square roots of ``a`` modulo ``n >= 1``, sorted.

    ``factors`` may give the factorisation of ``n`` to avoid refactoring.  The roots
    modulo each prime power (:func:`sqrt_mod_prime_power`) are combined by the
    Chinese remainder theorem.

    Raises
    ------
    NotAnIntegerError
        If ``a`` or ``n`` is not an integer.
    FormkitError
        If ``n < 1``.

    Examples
    --------
    >>> sqrt_mod(-3, 28)
    [5, 9, 19, 23]
    >>> sqrt_mod(5, 1)
    [0]
    """
    a, n = as_int(a, "a"), as_int(n, "n")
    if n < 1:
        raise FormkitError(f"modulus must be >= 1, not {n}")
    if n == 1:
        return [0]
    if factors is None:
        factors = prime_factorisation(n)
    moduli: list[int] = []
    root_lists: list[Sequence[int]] = []
    for p, e in factors.items():
        roots = _sqrt_mod_prime_power(int(a), int(p), int(e))
        if not roots:
            return []
        moduli.append(p**e)
        root_lists.append(roots)
    # combine with CRT
    results = [0]
    m = 1
    for mod, residues in zip(moduli, root_lists):
        inv = int(invert(m, mod)) if m > 1 else 0
        new = []
        for x in results:
            for r in residues:
                # y ≡ x mod m, y ≡ r mod mod
                t = ((r - x) * inv) % mod if m > 1 else r
                new.append(x + m * t)
        results = new
        m *= mod
    return sorted(results)


def crt(residues: Iterable[int], moduli: Iterable[int]) -> tuple[int, int]:
    """Chinese remainder theorem for pairwise coprime moduli: ``(x, M)``.

    Returns the unique ``0 <= x < M = ∏ moduli`` with ``x ≡ r_i (mod m_i)``.

    Raises
    ------
    FormkitError
        If the moduli are not pairwise coprime or lengths differ.

    Examples
    --------
    >>> crt([2, 3, 2], [3, 5, 7])
    (23, 105)
    """
    residues = [as_int(r, "residue") for r in residues]
    moduli = list(moduli)
    if len(residues) != len(moduli):
        raise FormkitError("crt needs as many residues as moduli")
    x, m = 0, 1
    for r, mod in zip(residues, moduli):
        mod = as_int(mod, "modulus")
        if mod < 1:
            raise FormkitError(f"crt moduli must be positive, not {mod}")
        if gcd(m, mod) != 1:
            raise FormkitError(f"crt moduli must be pairwise coprime; {mod} is not")
        t = ((r - x) * int(invert(m, mod))) % mod if mod > 1 else 0
        x += m * t
        m *= mod
    return int(x % m), int(m)
