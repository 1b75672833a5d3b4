"""Does a form represent the prime p?  The class of the prime form decides.

Let ``Q`` be a primitive form of non-square discriminant ``D`` (positive definite when
``D < 0``) and ``C`` its class in ``Cl(D)`` (the narrow class group when ``D > 0``).

*The class of the prime ideal decides.*  A prime ``p ∤ D`` is represented by some
primitive form of discriminant ``D`` iff ``χ_D(p) = (D/p) = 1`` (Cox Lemma 2.5 for odd
``p``; the same argument with ``b² ≡ D (mod 8)`` for ``p = 2``), and then exactly by the
forms in the class of the prime form ``(p, b, ·)`` at ``p`` and its inverse ``(p, −b, ·)``
— the classes of the two prime ideals above ``p``.  So ``Q`` represents ``p`` iff
``χ_D(p) = 1`` and the prime form at ``p`` lies in ``C`` or ``C⁻¹``.  This is the
per-prime decision used here (one reduction per prime); :func:`formkit.represent`
decides single numbers, listing the solutions.

Also here: :func:`primes_up_to` (a sieve) and the checks of the forms and bounds that
:mod:`formkit.representation.genus_congruences` and
:mod:`formkit.representation.prime_criteria` accept.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §2 (Lemma 2.5);
       numbers as recalled.
"""

from __future__ import annotations

import math

from ..classgroups.dispatch import class_group
from ..core.arith import as_int, isqrt, kronecker
from ..core.budget import prime_count_upper
from ..core.enumeration import _cycles_cached
from ..core.factorisation import prime_factorisation
from ..core.forms import Form, FormLike, _require_nonsquare, as_form
from ..core.modular_roots import sqrt_mod, sqrt_mod_prime
from ..core.raw_reduction import _reduce_definite_raw, _reduce_indefinite_raw
from ..errors import FormError, FormkitError, NotPrimitiveError

__all__ = [
    "represents_prime",
    "primes_up_to",
    "prime_listing_cost",
]

#: Largest bound accepted by :func:`formkit.represented_primes` and :func:`primes_up_to`.
PRIME_BOUND_LIMIT = 10**8


# ---------------------------------------------------------------------------
# input checks


def _check_form(form: FormLike) -> Form:
    Q = as_form(form)
    _require_nonsquare(Q, "a prime criterion")
    if not Q.is_primitive:
        raise NotPrimitiveError(
            f"prime criteria are for primitive forms; {Q!r} has content {Q.content} "
            f"(its values are multiples of {Q.content}, so it represents no prime unless {Q.content} is "
            f"prime and {Q.primitive_part()!r} represents 1)"
        )
    if Q.discriminant < 0 and Q.a < 0:
        raise FormError(
            f"{Q!r} is negative definite and represents no positive prime; use {(-Q)!r}, "
            "which represents p exactly when the given form represents -p"
        )
    return Q


def _check_bound(upto: object) -> int:
    X = as_int(upto, "upto")
    if X < 0:
        raise FormkitError(f"upto must be ≥ 0, not {X}")
    if X > PRIME_BOUND_LIMIT:
        raise FormkitError(f"upto must be at most {PRIME_BOUND_LIMIT} (a sieve is kept in memory), not {X}")
    return X


# ---------------------------------------------------------------------------
# cost


def prime_listing_cost(upto: object, *, per_prime: bool = True) -> tuple[float, float]:
    """Estimated ``(seconds, bytes)`` of listing the primes ``p ≤ upto`` a form represents.

    The work is a sieve over ``upto + 1`` bytes, the list of the primes (``π(X)`` Python
    integers, about 40 bytes each with their list slot), and one decision per prime:
    ``per_prime=True`` (the class of the prime form, :class:`_Decider`) or a residue
    look-up (``per_prime=False``, the congruence criterion).  Constants measured on the
    development machine (CPU time, ``X = 10^7``): 0.084 µs per sieve position, 9–12 µs
    per class decision (definite / indefinite), under 0.2 µs per look-up; taken here as
    0.3 µs, 36 µs and 0.6 µs (about 3 times over), with :func:`formkit.core.budget.prime_count_upper` for
    ``π(X)``.  Memory: the sieve and two lists of at most ``π(X)`` integers.

    Examples
    --------
    >>> t, m = prime_listing_cost(10**8)
    >>> 60 < t < 1800 and m < 2**30
    True
    """
    X = max(as_int(upto, "upto"), 0)
    n = prime_count_upper(X)
    seconds = 3e-7 * X + (3.6e-5 if per_prime else 6e-7) * n
    return seconds, float(X + 1 + 80 * n)


# ---------------------------------------------------------------------------
# primes


def primes_up_to(upto: object) -> list[int]:
    """All primes ``p ≤ upto`` (sieve of Eratosthenes).

    Raises
    ------
    FormkitError
        If ``upto`` is negative or larger than ``PRIME_BOUND_LIMIT`` (10^8).

    Examples
    --------
    >>> primes_up_to(30)
    [2, 3, 5, 7, 11, 13, 17, 19, 23, 29]
    """
    X = _check_bound(upto)
    if X < 2:
        return []
    sieve = bytearray([1]) * (X + 1)
    sieve[0] = sieve[1] = 0
    for i in range(2, math.isqrt(X) + 1):
        if sieve[i]:
            sieve[i * i :: i] = bytes(len(range(i * i, X + 1, i)))
    return [i for i, v in enumerate(sieve) if v]


class _Decider:
    """Per-prime decision: the class of the prime form at p is C or C⁻¹."""

    def __init__(self, Q: Form) -> None:
        self.Q = Q
        self.D = D = Q.discriminant
        self.G = G = class_group(D)
        self.C = G(Q)
        self.targets = {self.C, self.C.inverse()}
        self.raw_targets = {t.form.coefficients for t in self.targets}
        if D > 0:  # reduced form -> representative of its cycle (the canonical class form)
            self.sqrt_D = isqrt(D)
            self.cycle_of = _cycles_cached(D)[1]
        self.exceptions = tuple(
            p for p in sorted(prime_factorisation(abs(D))) if self._divisor_represented(p)
        )

    def _divisor_represented(self, p: int) -> bool:
        D = self.D
        for b in sorted({int(r) % (2 * p) for r in sqrt_mod(D, 4 * p)}):
            f = Form(p, b, (b * b - D) // (4 * p))
            if f.is_primitive and self.G(f) in self.targets:
                return True
        return False

    def __call__(self, p: int) -> bool:
        D = self.D
        if D % p == 0:
            return p in self.exceptions
        if p == 2:
            if kronecker(D, p) != 1:
                return False
            return self.G(Form.prime_form(D, p)) in self.targets
        # fast path for odd p: Euler's criterion, then the prime form (p, b, (b² − D)/4p)
        # with b² ≡ D (mod p), b ≡ D (mod 2), reduced (Gauss) and compared with C, C⁻¹
        d = D % p
        if pow(d, (p - 1) >> 1, p) != 1:
            return False
        if p & 3 == 3:
            r = pow(d, (p + 1) >> 2, p)
        elif p & 7 == 5:  # Atkin's square root for p ≡ 5 (mod 8)
            v = pow(2 * d, (p - 5) >> 3, p)
            r = d * v * (2 * d * v * v - 1) % p
        else:
            r = int(sqrt_mod_prime(d, p))
        b = r if (r - D) % 2 == 0 else p - r
        c = (b * b - D) // (4 * p)
        if D < 0:
            return _reduce_definite_raw(p, b, c) in self.raw_targets
        red = _reduce_indefinite_raw(p, b, c, D, self.sqrt_D)
        return self.cycle_of[(int(red[0]), int(red[1]), int(red[2]))] in self.raw_targets


def represents_prime(form: FormLike, p: object) -> bool:
    """True if the form represents the prime ``p``: ``Q(x, y) = p`` has a solution.

    Decided by the class of the prime form at ``p`` (module docstring); for the
    solutions themselves use :func:`formkit.represent`.

    Raises
    ------
    NotPrimeError
        If ``p`` is not a prime.
    NotPrimitiveError, FormError, DiscriminantError
        If the form is not primitive, is negative definite or has square discriminant.

    Examples
    --------
    >>> represents_prime((1, 0, 5), 29), represents_prime((1, 0, 5), 7), represents_prime((2, 2, 3), 7)
    (True, False, True)
    """
    from ..core.arith import is_probable_prime
    from ..errors import NotPrimeError

    Q = _check_form(form)
    p = as_int(p, "p")
    if p < 2 or not is_probable_prime(p):
        raise NotPrimeError(f"p must be a prime, not {p}")
    return _Decider(Q)(p)
