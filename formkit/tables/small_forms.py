"""Composition and prime forms of negative discriminants of word size, on plain integers.

The structure of a table row (:mod:`formkit.tables.structure`) needs a few dozen
compositions of reduced forms of one discriminant ``D`` with ``|D| < 2^60``.  At that
size Python's own integers beat every library type, and the time goes into interpreter
overhead: this module keeps the inner loops flat — Dirichlet composition (Cohen
Algorithm 5.4.7) and duplication with the Gauss reduction written into the same
function (Cohen Algorithm 5.4.2), no counters, no type conversions — and builds prime
forms from tables of square roots modulo the small primes that are shared by all ``D``
of a process (a table row rarely needs a prime above a few dozen).

:class:`SmallFormGroup` has the interface of the operations object the Sylow-subgroup
machinery of :mod:`formkit.classgroups.abelian_groups` expects (``one``, ``mul``,
``sqr``, ``inv``, ``pow``), so the rare rows that need a Smith normal form use it too.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, Algorithms 5.4.2 (reduction), 5.4.7 (composition), 5.4.8
       (duplication).
"""

from __future__ import annotations

from math import gcd

from ..core.arith import next_prime
from ..core.forms import Form
from ..core.raw_reduction import _reduce_definite_raw
from ..errors import FormkitError

__all__ = ["SmallFormGroup", "WORD_BOUND"]

#: Largest ``|D|`` served (products of coefficients stay below 2^126, no NUCOMP needed).
WORD_BOUND = 1 << 60

#: Primes with a table of square roots (``ROOTS[p][r]`` = a root of ``r`` mod ``p`` or −1).
_TABLE_PRIMES = 1000
_ROOTS: dict[int, list[int]] = {}
_PRIMES: list[int] = []


def _primes_with_roots() -> list[int]:
    if not _PRIMES:
        p = 3
        while p < _TABLE_PRIMES:
            roots = [-1] * p
            for x in range((p + 1) // 2):
                roots[x * x % p] = x
            _ROOTS[p] = roots
            _PRIMES.append(p)
            p = int(next_prime(p))
    return _PRIMES


Triple = tuple[int, int, int]


class SmallFormGroup:
    """The class group of a negative discriminant ``D``, ``|D| < 2^60``, on reduced triples.

    Parameters
    ----------
    D : int
        A negative discriminant with ``|D| < 2^60``.

    Raises
    ------
    FormkitError
        If ``D`` is not a negative discriminant below that size.

    Examples
    --------
    >>> G = SmallFormGroup(-23)
    >>> g = next(G.prime_forms(1))[1]; g
    (2, 1, 3)
    >>> G.sqr(g), G.mul(g, G.sqr(g)), G.pow(g, 3) == G.one, G.pow(g, -1)
    ((2, -1, 3), (1, 1, 6), True, (2, -1, 3))

    References
    ----------
    Cohen GTM 138, Algorithms 5.4.2, 5.4.7, 5.4.8.
    """

    __slots__ = ("D", "one")

    def __init__(self, D: int) -> None:
        if not (-WORD_BOUND < D < 0) or D % 4 not in (0, 1):
            raise FormkitError(f"D must be a negative discriminant above −2^60, not {D}")
        self.D = D
        k = D & 1
        self.one: Triple = (1, k, (k - D) // 4)

    @staticmethod
    def inv(x: Triple) -> Triple:
        """The inverse class (reduced)."""
        a, b, c = x
        if b == 0 or b == a or a == c:
            return x
        return (a, -b, c)

    def mul(self, x: Triple, y: Triple) -> Triple:
        """Product of two reduced forms, reduced (Cohen Algorithms 5.4.7 and 5.4.2)."""
        a1, b1, c1 = x
        a2, b2, c2 = y
        if a1 < a2:
            a1, b1, a2, b2, c2 = a2, b2, a1, b1, c1
        if a2 == 1:
            return y if x[0] == 1 else x
        d = gcd(a1, a2)
        if d == 1:
            v1 = a1
            a = a1 * a2
            b = b2 + 2 * a2 * (((b1 - b2) // 2 * pow(a2, -1, a1)) % a1)
        else:
            s = (b1 + b2) // 2
            A1 = a1 // d
            y1 = pow(a2 // d, -1, A1) if A1 > 1 else 0
            if s % d == 0:
                d1, x2, y2 = d, 0, -1
            else:
                d1 = gcd(s, d)
                dd = d // d1
                x2 = pow(s // d1, -1, dd) if dd > 1 else 0
                y2 = -((d1 - x2 * s) // d)
            v1 = a1 // d1
            v2 = a2 // d1
            a = v1 * v2
            b = b2 + 2 * v2 * ((y1 * y2 * (b2 - s) - x2 * c2) % v1)
        c = (b * b - self.D) // (4 * a)
        while True:  # Gauss reduction (Cohen Algorithm 5.4.2)
            if not (-a < b <= a):
                a2 = a + a
                r = b % a2
                if r > a:
                    r -= a2
                k = (r - b) // a2
                c += (a * k + b) * k
                b = r
            if a > c:
                a, b, c = c, -b, a
                continue
            if a == c and b < 0:
                b = -b
            return (a, b, c)

    def sqr(self, x: Triple) -> Triple:
        """Square of a reduced form, reduced (Cohen Algorithms 5.4.8 and 5.4.2)."""
        a, b, c = x
        if a == 1:
            return x
        d1 = gcd(a, b)
        v1 = a // d1
        if v1 > 1:
            b = b + 2 * v1 * ((-pow(b // d1, -1, v1) * c) % v1)
        a = v1 * v1
        c = (b * b - self.D) // (4 * a)
        while True:
            if not (-a < b <= a):
                a2 = a + a
                r = b % a2
                if r > a:
                    r -= a2
                k = (r - b) // a2
                c += (a * k + b) * k
                b = r
            if a > c:
                a, b, c = c, -b, a
                continue
            if a == c and b < 0:
                b = -b
            return (a, b, c)

    def pow(self, x: Triple, e: int) -> Triple:
        """``x^e`` for any integer ``e`` (left-to-right binary powering)."""
        if e < 0:
            x, e = self.inv(x), -e
        if e == 0:
            return self.one
        sqr, mul = self.sqr, self.mul
        r = x
        for i in range(e.bit_length() - 2, -1, -1):
            r = sqr(r)
            if (e >> i) & 1:
                r = mul(r, x)
        return r

    def prime_forms(self, f: int, start: int = 2):
        """Reduced prime forms ``(p, (a, b, c))`` for the primes ``p ≥ start`` with
        ``p ∤ f`` and ``(D/p) ≠ −1``, in increasing order (``f`` the conductor of ``D``).

        A prime form of ``p`` is ``(p, b, (b² − D)/4p)`` with ``b² ≡ D (mod 4p)``; for the
        primes below 1000 ``b`` comes from a table of square roots modulo ``p`` kept for
        the process, beyond from :meth:`formkit.core.forms.Form.prime_form`.
        """
        D = self.D
        red = _reduce_definite_raw
        if start <= 2 and f % 2:
            m = D % 8
            if m == 1:
                yield 2, red(2, 1, (1 - D) // 8)
            elif m == 0:
                yield 2, red(2, 0, -D // 8)
            elif m == 4:
                yield 2, red(2, 2, (4 - D) // 8)
        odd = D & 1
        for p in _primes_with_roots():
            if p < start or not f % p:
                continue
            b = _ROOTS[p][D % p]
            if b < 0:
                continue
            if (b & 1) != odd:
                b = p - b
            yield p, red(p, b, (b * b - D) // (4 * p))
        p = _TABLE_PRIMES
        while True:
            p = int(next_prime(p))
            if p >= start and f % p:
                try:
                    g = Form.prime_form(D, p)
                except FormkitError:  # (D/p) = −1: no form of p
                    continue
                yield p, red(g.a, g.b, g.c)
