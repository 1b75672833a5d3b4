"""``L(1, χ_D)`` from a truncated Euler product, and the class-number estimates it gives.

For a discriminant ``D = f²·d_K`` let ``χ_D(n) = (D/n)`` (Kronecker symbol).  The
analytic class number formula, valid for orders as well as for maximal orders
(Cox, *Primes of the form x² + ny²*, Theorem 7.24 and Exercise 7.30; Buchmann–Vollmer
§9.5), reads

* ``D < 0``:  ``h(D) = w(D)·√|D|·L(1, χ_D) / (2π)``,
* ``D > 0``:  ``h(D)·R(D) = √D·L(1, χ_D) / 2`` (``h`` the *wide* class number and
  ``R`` the regulator of the order),

where ``L(1, χ_D) = L(1, χ_{d_K})·∏_{p | f}(1 − χ_{d_K}(p)/p)`` — exactly what the
Euler product of ``χ_D`` gives, since ``χ_D(p) = 0`` for ``p | f``.  We evaluate
``L(1, χ_{d_K})`` by the product ``∏_{p ≤ P}(1 − χ(p)/p)^{-1}`` over the primes up to
``P`` and multiply by the correction factors of the primes ``p | f`` exactly.

**What the interval means (read this).**  Two different intervals are produced:

1. A *heuristic* interval.  The omitted tail ``log L − log ∏_{p≤P}`` is, under GRH,
   ``O(log(qP)/(√P log P))`` (Bach, "Improved approximations for Euler products",
   CMS Conf. Proc. 15 (1995), 13–28).  We do **not** use a proven explicit constant:
   the width here is ``HEURISTIC_WIDTH / √(P·log P) + 1/P``, a random-walk model of the
   tail ``Σ_{p>P} χ(p)/p`` (variance ``≈ 1/(P log P)``) with a safety factor
   :data:`HEURISTIC_WIDTH` calibrated against exact class numbers (enumeration of random
   fundamental ``D < 0`` up to ``10^9``; the tail behaves alike for ``D > 0``).  It is
   **not certified**, neither unconditionally nor under GRH.  For ``D < 0`` formkit uses
   it only to *steer* baby-step giant-step (where to look first): no class group depends
   on it being right.  For ``D > 0``,
   :func:`formkit.large_discriminants.real_class_number` reads the class number off it
   and reports that result as not certified.
2. An *unconditional* (proven) upper bound ``L(1, χ_{d_K}) < 2 + log|d_K|``: split
   ``Σ χ(n)/n`` at ``n = q = |d_K|``; the head is at most ``1 + log q`` and, because
   ``χ`` sums to 0 over any ``q`` consecutive integers, partial sums are bounded by
   ``q`` and Abel summation bounds the tail by ``q/(q+1) < 1``.  Hence
   ``h(D) ≤ w·√|D|·(2 + log|d_K|)·∏_{p|f}(1 + 1/p)/(2π)`` for ``D < 0``.  This weak
   but true bound limits the index of a subgroup in :mod:`formkit.large_discriminants`.

Floating point: the logarithms are summed in IEEE double precision (53-bit); the
rounding error of at most ``π(P)`` terms is below ``π(P)·2^-50·Σ|log(1 ± 1/p)|`` and is
added to the radius (it is far below the heuristic width).

References
----------
.. [1] E. Bach, "Improved approximations for Euler products", in *Number Theory*
       (Halifax 1994), CMS Conf. Proc. 15, AMS 1995, 13–28.
.. [2] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.3.2 (class number formula), §5.4 (use of the estimate in
       Shanks' baby-step giant-step).
.. [3] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, Thm 7.24.
.. [4] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, §9.5.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Optional

from .arith import as_int, factorint, isqrt, kronecker
from .discriminants import discriminant_parts, validate_discriminant
from .errors import FormkitError

__all__ = [
    "HEURISTIC_WIDTH",
    "LValueEstimate",
    "ClassNumberEstimate",
    "default_prime_bound",
    "l_value_estimate",
    "class_number_estimate",
    "class_number_upper_bound",
]

#: Safety factor of the heuristic width ``HEURISTIC_WIDTH/√(P log P)`` on ``log L``.
#: The largest observed ``|log L − log ∏_{p≤P}|·√(P log P)`` over a calibration sample
#: of 1004 random fundamental D < 0 with 10^5 ≤ |D| < 10^9 and P = 10^3, 10^4, 10^5
#: (exact h by enumeration) was 3.4; 6 leaves a margin.  The slow test in
#: tests/test_lseries.py repeats this on 600 D.  Heuristic, not a theorem.
HEURISTIC_WIDTH = 6.0

#: Largest prime bound accepted (the vectorised Legendre symbols need p < 2^31).
MAX_PRIME_BOUND = 2 * 10**8


@dataclass(frozen=True)
class LValueEstimate:
    """``L(1, χ_D)`` with a heuristic interval and a proven upper bound.

    ``value`` is the truncated Euler product (times the exact conductor correction);
    ``lower``/``upper`` bound it with the *heuristic* relative width ``log_radius``
    (see the module docstring: not certified).  ``proven_upper`` is an unconditional
    upper bound.
    """

    discriminant: int
    prime_bound: int
    value: float
    log_radius: float
    lower: float
    upper: float
    proven_upper: float
    assumption: str = "heuristic"

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return dict(self.__dict__)


@dataclass(frozen=True)
class ClassNumberEstimate:
    """The analytic estimate of the class number (``D < 0``) or of ``h·R`` (``D > 0``).

    ``estimate`` is the analytic value; ``[lower, upper]`` is the *heuristic* interval
    (integers for ``D < 0``; for ``D > 0`` an interval for ``h·R``);
    ``proven_upper`` an unconditional upper bound.
    """

    discriminant: int
    estimate: float
    lower: float
    upper: float
    proven_upper: float
    l_value: LValueEstimate

    @property
    def assumption(self) -> str:
        """``"heuristic"``: the interval is not certified (see :mod:`formkit.lseries`)."""
        return self.l_value.assumption

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        out = {k: v for k, v in self.__dict__.items() if k != "l_value"}
        out["l_value"] = self.l_value.to_dict()
        out["assumption"] = self.assumption
        return out


def default_prime_bound(D: int) -> int:
    """The truncation point ``P`` used by default: ``|D|^(1/4)`` clamped to ``[10^4, 3·10^7]``.

    Chosen from ``benchmarks/bench_large_discriminants.py`` so that the Euler product
    costs about as much as the baby-step giant-step it steers.

    Examples
    --------
    >>> default_prime_bound(-10**12), default_prime_bound(-10**20), default_prime_bound(-10**40)
    (10000, 100000, 30000000)
    """
    D = validate_discriminant(D)
    return int(min(3 * 10**7, max(10**4, isqrt(isqrt(abs(D))))))


@lru_cache(maxsize=4)
def _primes_upto(P: int) -> tuple:
    """The primes ≤ P (sieve of Eratosthenes): a numpy array when numpy exists, else a list."""
    try:
        import numpy as np
    except ImportError:  # pragma: no cover - numpy is optional
        sieve = bytearray([1]) * (P + 1)
        sieve[0:2] = b"\x00\x00"
        for i in range(2, isqrt(P) + 1):
            if sieve[i]:
                sieve[i * i :: i] = bytes(len(range(i * i, P + 1, i)))
        return ("list", [i for i in range(P + 1) if sieve[i]])
    s = np.ones(P + 1, dtype=bool)
    s[:2] = False
    s[4::2] = False
    for i in range(3, isqrt(P) + 1, 2):
        if s[i]:
            s[i * i :: 2 * i] = False
    return ("numpy", np.flatnonzero(s))


def _log_euler_product_python(d: int, primes) -> tuple[float, float]:
    # returns (Σ log(1 − χ(p)/p), Σ |terms|·(number of terms)) — the second for the rounding bound
    total = 0.0
    magnitude = 0.0
    for p in primes:
        c = kronecker(d, p)
        if c:
            t = math.log1p(-c / p)
            total += t
            magnitude += abs(t)
    return total, magnitude * len(primes)


def _log_euler_product_numpy(d: int, primes) -> tuple[float, float]:
    import numpy as np

    p = primes[1:].astype(np.int64)  # odd primes
    n = abs(d)
    r = np.zeros_like(p)
    digits = []
    while n:
        digits.append(n & 0xFFFFF)
        n >>= 20
    for dig in reversed(digits):  # Horner: r = (r·2^20 + digit) mod p, r·2^20 < 2^51
        r = (r * (1 << 20) + dig) % p
    if d < 0:
        r = (p - r) % p
    # Legendre symbol a^((p-1)/2) mod p by square-and-multiply on the whole array
    e = (p - 1) // 2
    result = np.ones_like(p)
    base = r.copy()
    while np.any(e):
        odd = (e & 1).astype(bool)
        result = np.where(odd, (result * base) % p, result)
        base = (base * base) % p
        e >>= 1
    chi = np.where(result == 1, 1.0, np.where(result == 0, 0.0, -1.0))
    terms = np.log1p(-chi / p)
    total = float(np.sum(terms))
    mag = float(np.sum(np.abs(terms)))
    c2 = kronecker(d, 2)
    if c2:
        t = math.log1p(-c2 / 2)
        total += t
        mag += abs(t)
    return total, mag * (len(p) + 1)


def _log_euler_product(d: int, P: int, backend: Optional[str] = None) -> tuple[float, float]:
    kind, primes = _primes_upto(P)
    if backend == "python" or kind == "list":
        return _log_euler_product_python(d, [int(q) for q in primes])
    return _log_euler_product_numpy(d, primes)


def _conductor_factor(d_K: int, f: int) -> float:
    out = 1.0
    for p in factorint(f) if f > 1 else ():
        out *= 1.0 - kronecker(d_K, p) / p
    return out


def _conductor_factor_upper(f: int) -> float:
    out = 1.0
    for p in factorint(f) if f > 1 else ():
        out *= 1.0 + 1.0 / p
    return out


def l_value_estimate(D: object, prime_bound: Optional[int] = None, *, backend: Optional[str] = None) -> LValueEstimate:
    """``L(1, χ_D)`` from the Euler product over the primes ``≤ prime_bound``.

    Parameters
    ----------
    D : int
        A non-square discriminant.
    prime_bound : int, optional
        The truncation point ``P`` (default :func:`default_prime_bound`), at least 2.
    backend : {None, "python"}
        ``"python"`` forces the plain-Python loop (used to cross-check the vectorised one).

    Returns
    -------
    LValueEstimate
        ``value`` and a **heuristic** interval ``[lower, upper]`` (not certified: see
        the module docstring), and the proven bound ``proven_upper``.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a non-square discriminant.
    FormkitError
        If ``prime_bound`` is not an integer in ``[2, 2·10^8]``.

    Examples
    --------
    >>> est = l_value_estimate(-4, 10**5)            # L(1, χ_{-4}) = π/4
    >>> est.lower < math.pi / 4 < est.upper, round(est.value, 2)
    (True, 0.79)
    >>> est = l_value_estimate(5, 10**5)             # L(1, χ_5) = 2 log((1+√5)/2)/√5
    >>> abs(est.value - 2 * math.log((1 + 5 ** 0.5) / 2) / 5 ** 0.5) < 1e-3
    True
    """
    D = validate_discriminant(D)
    P = default_prime_bound(D) if prime_bound is None else as_int(prime_bound, "prime_bound")
    if not 2 <= P <= MAX_PRIME_BOUND:
        raise FormkitError(f"prime_bound must lie in [2, {MAX_PRIME_BOUND}], not {P}")
    d_K, f = discriminant_parts(D)
    log_prod, mag = _log_euler_product(d_K, P, backend)
    value = math.exp(-log_prod) * _conductor_factor(d_K, f)  # L = ∏ (1 − χ(p)/p)^(−1)
    radius = HEURISTIC_WIDTH / math.sqrt(P * math.log(P)) + 1.0 / P + mag * 2.0**-50
    proven = (2.0 + math.log(abs(d_K))) * _conductor_factor_upper(f)
    return LValueEstimate(
        D, P, value, radius, value * math.exp(-radius), value * math.exp(radius), proven
    )


def _unit_count(D: int) -> int:
    return {-3: 6, -4: 4}.get(D, 2) if D < 0 else 2


def class_number_estimate(D: object, prime_bound: Optional[int] = None) -> ClassNumberEstimate:
    """Analytic estimate of ``h(D)`` (``D < 0``) or of ``h(D)·R(D)`` (``D > 0``).

    For ``D < 0`` the interval ``[lower, upper]`` holds integers (the heuristic bounds
    rounded outwards; clipped below at 1); ``proven_upper`` is an unconditional upper
    bound for ``h(D)``.  For ``D > 0`` the same fields bound ``h·R`` (wide ``h``).

    Examples
    --------
    >>> e = class_number_estimate(-10**8 - 7)
    >>> e.lower <= 7253 <= e.upper      # h(−100000007) = 7253 (formkit enumeration and a brute-force count)
    True
    >>> e.assumption
    'heuristic'
    """
    D = validate_discriminant(D)
    L = l_value_estimate(D, prime_bound)
    if D < 0:
        scale = _unit_count(D) * math.sqrt(-D) / (2 * math.pi)
        lo = max(1, math.floor(scale * L.lower))
        hi = max(lo, math.ceil(scale * L.upper))
        return ClassNumberEstimate(D, scale * L.value, lo, hi, math.floor(scale * L.proven_upper) + 1, L)
    scale = math.sqrt(D) / 2
    return ClassNumberEstimate(D, scale * L.value, scale * L.lower, scale * L.upper, scale * L.proven_upper, L)


def class_number_upper_bound(D: object) -> int:
    """An unconditional (proven) upper bound for ``h(D)``, ``D < 0``.

    ``h(D) ≤ w·√|D|·(2 + log|d_K|)·∏_{p | f}(1 + 1/p)/(2π)`` (module docstring), with
    the floating-point value enlarged by one part in 10^9 and rounded up.

    Examples
    --------
    >>> class_number_upper_bound(-23) >= 3
    True
    """
    D = validate_discriminant(D)
    if D > 0:
        raise FormkitError(f"class_number_upper_bound is for negative discriminants, not {D}")
    d_K, f = discriminant_parts(D)
    value = (
        _unit_count(D) * math.sqrt(-D) * (2.0 + math.log(-d_K)) * _conductor_factor_upper(f) / (2 * math.pi)
    )
    return int(math.ceil(value * (1 + 1e-9))) + 1
