"""Integer arithmetic backend: the one place that talks to gmpy2.

Every hot path in formkit does its big-integer arithmetic through the names exported
here (integer square roots, extended gcd, Kronecker symbols, probable-prime tests) and
through :mod:`formkit.core.modular_roots` (square roots modulo primes and prime powers,
the Chinese remainder theorem), which is built on them.  Factorisation lives in
:mod:`formkit.core.factorisation` (python-flint).

The backend is chosen once, at import time, from the environment variable
``FORMKIT_INTEGER_BACKEND``: ``gmpy2`` (the default) or ``python`` (plain Python
integers; used by ``benchmarks/`` to measure what gmpy2 buys).  Both backends return
the same values; with gmpy2, :func:`mpz` makes the gmpy2 integer type that the other
functions are fastest on.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993: Algorithm 1.4.10 (Kronecker symbol).
"""

from __future__ import annotations

import math
import operator
import os

from ..errors import FormkitError, NotAnIntegerError

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
    "mpfr",
    "real_log",
    "real_log2",
    "real_sqrt",
    "real_rint",
    "real_precision",
    "set_real_precision",
]

# Multiple-precision reals (MPFR through gmpy2, whatever the integer backend): only for
# the analytic steps that need them, such as the logarithms of units in the real
# subexponential method.  This module is the one place gmpy2 is imported.
import gmpy2 as _mpfr_lib

mpfr = _mpfr_lib.mpfr
real_log = _mpfr_lib.log
real_log2 = _mpfr_lib.log2
real_sqrt = _mpfr_lib.sqrt
real_rint = _mpfr_lib.rint


def real_precision() -> int:
    """The working precision of :func:`mpfr` arithmetic, in bits."""
    return int(_mpfr_lib.get_context().precision)


def set_real_precision(bits: int) -> None:
    """Set the working precision of :func:`mpfr` arithmetic to ``bits`` bits."""
    _mpfr_lib.get_context().precision = int(bits)


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
    mpz = int
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
    raise ImportError(f"FORMKIT_INTEGER_BACKEND must be 'gmpy2' or 'python', not {BACKEND!r}")


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
    if isinstance(value, (bool, float)):
        raise NotAnIntegerError(f"{name} must be an integer, not {value!r} ({type(value).__name__})")
    try:
        return operator.index(value)  # type: ignore[arg-type]
    except TypeError:
        pass
    # sympy Integer has __index__, but sympy Rational etc. do not: refuse them.
    raise NotAnIntegerError(f"{name} must be an integer, not {value!r} ({type(value).__name__})")


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
    """Prime factorisation ``{p: e}`` of ``|n|``; kept for old callers.

    The same as :func:`formkit.core.factorisation.prime_factorisation` (FLINT's
    factorisation, checked), which is the one path formkit factors through.
    ``n = 0`` raises; ``±1`` gives ``{}``.

    Examples
    --------
    >>> factorint(-360)
    {2: 3, 3: 2, 5: 1}
    """
    from .factorisation import prime_factorisation

    return prime_factorisation(n)


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
