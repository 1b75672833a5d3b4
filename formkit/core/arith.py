"""Integer arithmetic backend: the one place that talks to gmpy2.

Every hot path in formkit does its big-integer arithmetic through the names exported
here (integer square roots, extended gcd, Kronecker symbols, probable-prime tests,
square roots modulo primes and prime powers, the Chinese remainder theorem).
Factorisation comes from sympy's ``factorint``.

The backend is chosen once, at import time, from the environment variable
``FORMKIT_INTEGER_BACKEND``: ``gmpy2`` (the default) or ``python`` (plain Python
integers; used by ``benchmarks/`` to measure what gmpy2 buys).  Both backends return
the same values; with gmpy2, :func:`mpz` makes the gmpy2 integer type that the other
functions are fastest on.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993: Algorithm 1.5.1 (Tonelli–Shanks square root modulo p),
       Section 1.3.3 (Chinese remainder theorem), Algorithm 1.4.10 (Kronecker symbol).
"""

from __future__ import annotations

import math
import operator
import os
from functools import lru_cache
from typing import Iterable, Sequence

from ..errors import FormkitError, NotAnIntegerError, NotPrimeError

__all__ = [
    "BACKEND",
    "mpz",
    "as_int",
    "isqrt",
    "isqrt_rem",
    "is_square",
    "gcd",
    "xgcd",
    "lcm",
    "invert",
    "powmod",
    "kronecker",
    "is_probable_prime",
    "next_prime",
    "factorint",
    "divisors",
    "sqrt_mod_prime",
    "sqrt_mod_prime_power",
    "sqrt_mod",
    "crt",
]

BACKEND: str = os.environ.get("FORMKIT_INTEGER_BACKEND", "gmpy2").strip().lower() or "gmpy2"

if BACKEND == "gmpy2":
    import gmpy2 as _g

    mpz = _g.mpz
    _isqrt = _g.isqrt
    _isqrt_rem = _g.isqrt_rem
    _is_square = _g.is_square
    _gcd = _g.gcd
    _gcdext = _g.gcdext
    _invert = _g.invert
    _powmod = _g.powmod
    _kronecker = _g.kronecker
    _is_prime = _g.is_prime
    _next_prime = _g.next_prime
elif BACKEND == "python":
    _g = None
    mpz = int  # type: ignore[assignment]
    _isqrt = math.isqrt

    def _isqrt_rem(n: int) -> tuple[int, int]:
        r = math.isqrt(n)
        return r, n - r * r

    def _is_square(n: int) -> bool:
        return n >= 0 and math.isqrt(n) ** 2 == n

    _gcd = math.gcd

    def _gcdext(a: int, b: int) -> tuple[int, int, int]:
        # iterative extended Euclid; the returned gcd is non-negative
        x0, x1, y0, y1 = 1, 0, 0, 1
        while b:
            q, r = divmod(a, b)
            a, b = b, r
            x0, x1 = x1, x0 - q * x1
            y0, y1 = y1, y0 - q * y1
        if a < 0:
            return -a, -x0, -y0
        return a, x0, y0

    def _invert(a: int, m: int) -> int:
        return pow(a, -1, m)

    def _powmod(a: int, e: int, m: int) -> int:
        return pow(a, e, m)

    def _kronecker(a: int, n: int) -> int:
        return _kronecker_python(a, n)

    def _is_prime(n: int, reps: int = 25) -> bool:
        from sympy import isprime

        return bool(isprime(n))

    def _next_prime(n: int) -> int:
        from sympy import nextprime

        return int(nextprime(n))
else:  # pragma: no cover - configuration error
    raise ImportError(
        f"FORMKIT_INTEGER_BACKEND must be 'gmpy2' or 'python', not {BACKEND!r}"
    )


def _kronecker_python(a: int, n: int) -> int:
    """Kronecker symbol (a/n) in pure Python (Cohen GTM 138, Algorithm 1.4.10)."""
    if n == 0:
        return 1 if a in (1, -1) else 0
    if a % 2 == 0 and n % 2 == 0:
        return 0
    v = 0
    while n % 2 == 0:
        n //= 2
        v += 1
    k = 1
    if v % 2 == 1 and a % 8 in (3, 5):
        k = -1
    if n < 0:
        n = -n
        if a < 0:
            k = -k
    a %= n
    while a:
        while a % 2 == 0:
            a //= 2
            if n % 8 in (3, 5):
                k = -k
        a, n = n, a
        if a % 4 == 3 and n % 4 == 3:
            k = -k
        a %= n
    return k if n == 1 else 0


def as_int(value: object, name: str = "value") -> int:
    """Return ``value`` as a Python ``int`` or raise :class:`NotAnIntegerError`.

    Accepts ``int``, gmpy2 ``mpz``, sympy ``Integer`` and any object with
    ``__index__``; ``bool`` and floats are refused (even integral floats), because a
    float that looks integral has usually lost digits already.

    Parameters
    ----------
    value : object
        The value to convert.
    name : str
        The argument's name, used in the error message.

    Returns
    -------
    int

    Raises
    ------
    NotAnIntegerError
        If ``value`` is not an integer.

    Examples
    --------
    >>> as_int(7)
    7
    >>> as_int(2.0, "D")
    Traceback (most recent call last):
    ...
    formkit.errors.NotAnIntegerError: D must be an integer, not 2.0 (float)
    """
    if isinstance(value, bool) or isinstance(value, float):
        raise NotAnIntegerError(
            f"{name} must be an integer, not {value!r} ({type(value).__name__})"
        )
    try:
        return operator.index(value)  # type: ignore[arg-type]
    except TypeError:
        pass
    # sympy Integer has __index__, but sympy Rational etc. do not: refuse them.
    raise NotAnIntegerError(
        f"{name} must be an integer, not {value!r} ({type(value).__name__})"
    )


_INT_TYPES = (int,) if mpz is int else (int, type(mpz(0)))


def _int(value: object, name: str) -> int:
    """``value`` unchanged when it is an int or mpz (hot path), else :func:`as_int`."""
    if type(value) in _INT_TYPES:
        return value  # type: ignore[return-value]
    return as_int(value, name)


def _int_from_digits(text: str) -> int:
    """A Python int from a string of ASCII decimal digits (optionally signed), of any length.

    Python refuses ``int(text)`` above 4300 digits unless the limit is lifted; gmpy2
    has no such limit and converts in subquadratic time.
    """
    if len(text) <= 4000 or _g is None:
        return int(text)
    return int(_g.mpz(text))


def isqrt(n: int) -> int:
    """Floor of the square root of ``n >= 0``.

    Examples
    --------
    >>> isqrt(10**40 + 1) == 10**20
    True
    """
    n = _int(n, "n")
    if n < 0:
        raise FormkitError(f"isqrt needs a non-negative integer, not {n}")
    return _isqrt(n)


def isqrt_rem(n: int) -> tuple[int, int]:
    """Return ``(s, n - s*s)`` with ``s = isqrt(n)``.

    Examples
    --------
    >>> tuple(int(v) for v in isqrt_rem(17))
    (4, 1)
    """
    n = _int(n, "n")
    if n < 0:
        raise FormkitError(f"isqrt_rem needs a non-negative integer, not {n}")
    return _isqrt_rem(n)


def is_square(n: int) -> bool:
    """True when ``n`` is the square of an integer (0 counts; negatives do not).

    Examples
    --------
    >>> is_square(0), is_square(49), is_square(-4), is_square(50)
    (True, True, False, False)
    """
    n = _int(n, "n")
    return n >= 0 and bool(_is_square(n))


def gcd(*values: int) -> int:
    """Greatest common divisor (non-negative) of any number of integers.

    Examples
    --------
    >>> gcd(12, -18, 27)
    3
    >>> gcd()
    0
    """
    g = 0
    for v in values:
        g = _gcd(g, _int(v, "gcd argument"))
    return int(g)


def xgcd(a: int, b: int) -> tuple[int, int, int]:
    """Extended Euclid: ``(g, s, t)`` with ``g = gcd(a, b) >= 0`` and ``s*a + t*b = g``.

    Examples
    --------
    >>> g, s, t = xgcd(240, 46)
    >>> int(g), int(s * 240 + t * 46)
    (2, 2)
    """
    return _gcdext(_int(a, "a"), _int(b, "b"))


def lcm(a: int, b: int) -> int:
    """Least common multiple (non-negative).

    Examples
    --------
    >>> lcm(4, 6)
    12
    """
    a, b = _int(a, "a"), _int(b, "b")
    if a == 0 or b == 0:
        return 0
    return int(abs(a // gcd(a, b) * b))


def invert(a: int, m: int) -> int:
    """Inverse of ``a`` modulo ``m``; raises :class:`FormkitError` if there is none.

    Examples
    --------
    >>> int(invert(3, 7))
    5
    """
    a, m = _int(a, "a"), _int(m, "modulus")
    if m == 0:
        raise FormkitError("invert: modulus must be non-zero")
    m = abs(m)
    if m == 1:
        return mpz(0)
    try:
        return _invert(a % m, m)
    except (ZeroDivisionError, ValueError) as exc:
        raise FormkitError(f"{a} has no inverse modulo {m}") from exc


def powmod(a: int, e: int, m: int) -> int:
    """``a**e mod m`` for ``m >= 1`` (``e`` may be negative when ``a`` is invertible mod m).

    Raises
    ------
    FormkitError
        If ``m < 1``, or ``e < 0`` and ``a`` is not invertible modulo ``m``.

    Examples
    --------
    >>> int(powmod(3, 200, 7)), int(powmod(3, -1, 7))
    (2, 5)
    """
    a, e, m = _int(a, "a"), _int(e, "exponent"), _int(m, "modulus")
    if m < 1:
        raise FormkitError(f"powmod needs a modulus >= 1, not {m}")
    if e < 0:
        return _powmod(invert(a, m), -e, m)
    return _powmod(a, e, m)


def kronecker(a: int, n: int) -> int:
    """The Kronecker symbol (a/n), defined for all integers a and n.

    Examples
    --------
    >>> [kronecker(-4, p) for p in (2, 3, 5, 7, 13)]
    [0, -1, 1, -1, 1]
    >>> kronecker(5, -1), kronecker(-5, -1)
    (1, -1)
    """
    return int(_kronecker(_int(a, "a"), _int(n, "n")))


def is_probable_prime(n: int) -> bool:
    """Probable-prime test (BPSW-strength through gmpy2; exact for n < 2**64).

    Examples
    --------
    >>> is_probable_prime(2**127 - 1), is_probable_prime(561), is_probable_prime(1)
    (True, False, False)
    """
    n = _int(n, "n")
    if n < 2:
        return False
    return bool(_is_prime(n, 25))


def next_prime(n: int) -> int:
    """The least probable prime greater than ``n``.

    Examples
    --------
    >>> int(next_prime(100))
    101
    """
    n = _int(n, "n")
    if n < 2:
        return 2
    return _next_prime(n)


def factorint(n: int) -> dict[int, int]:
    """Prime factorisation ``{p: e}`` of ``|n|`` (sympy's ``factorint``).

    ``n = 0`` raises; ``±1`` gives ``{}``.

    Examples
    --------
    >>> factorint(-360)
    {2: 3, 3: 2, 5: 1}
    """
    n = abs(as_int(n, "n"))
    if n == 0:
        raise FormkitError("cannot factor 0")
    return _factorint_cached(n)


@lru_cache(maxsize=4096)
def _factorint_cached(n: int) -> dict[int, int]:
    from sympy import factorint as _sympy_factorint

    return {int(p): int(e) for p, e in sorted(_sympy_factorint(n).items())}


def divisors(n: int, factors: dict[int, int] | None = None) -> list[int]:
    """Sorted positive divisors of ``|n|`` (n non-zero).

    Examples
    --------
    >>> divisors(12)
    [1, 2, 3, 4, 6, 12]
    """
    if factors is None:
        factors = factorint(n)
    divs = [1]
    for p, e in factors.items():
        divs = [d * p**k for d in divs for k in range(e + 1)]
    return sorted(divs)


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
        factors = factorint(n)
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
    for mod, roots in zip(moduli, root_lists):
        inv = int(invert(m, mod)) if m > 1 else 0
        new = []
        for x in results:
            for r in roots:
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
