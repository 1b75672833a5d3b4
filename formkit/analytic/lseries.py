"""``L(1, χ_D)`` with an explicit error interval under GRH, and the class-number bounds it gives.

For a discriminant ``D = f²·d_K`` let ``χ_D(n) = (D/n)`` (Kronecker symbol) and
``q = |d_K|`` the conductor.  The analytic class number formula, valid for orders as
well as for maximal orders (Cox, *Primes of the form x² + ny²*, Theorem 7.24 and
Exercise 7.30; Buchmann–Vollmer §9.5), reads

* ``D < 0``:  ``h(D) = w(D)·√|D|·L(1, χ_D) / (2π)``,
* ``D > 0``:  ``h(D)·R(D) = √D·L(1, χ_D) / 2`` (``h`` the *wide* class number and
  ``R`` the regulator of the order),

where ``L(1, χ_D) = L(1, χ_{d_K})·∏_{p | f}(1 − χ_{d_K}(p)/p)`` exactly.

**The interval (conditional on GRH, proved in ``docs/l_value_interval.md``).**  With
``x = P/2`` and the weight ``W(y) = 1`` on ``[0, 1]``, ``2 − y`` on ``[1, 2]``, ``0``
beyond (its Mellin transform ``K(z) = (2^(z+1) − 1)/(z(z+1))`` has a single pole, at
``z = 0``), let

    S(x) = Σ_{p^k < 2x} χ(p)^k·W(p^k/x)/(k·p^k)        (a smoothed log of the Euler product).

If every zero of ``L(s, χ_{d_K})`` in the critical strip has real part ½, then

    |log L(1, χ_{d_K}) − S(x)|  ≤  C₀·Z/(√x·log x) + (log 2/x + 1/x²)/log x,

with ``C₀ = (1 + √2)·√5/2`` and ``Z`` any upper bound for ``Σ_ρ 1/(¼ + γ²)`` over the
zeros ``ρ = ½ + iγ``.  For every ``σ ≥ 1`` the Hadamard product gives, under GRH,

    Σ_ρ 1/(¼ + γ²) ≤ 4(σ − ½)·[½·log(q/π) + ½·ψ((σ + a)/2) + L'/L(σ, χ)],

(``a = 0`` for ``D > 0``, ``1`` for ``D < 0``; ``ψ`` the digamma function), and
``L'/L(σ, χ) = −Σ χ(n)Λ(n)n^(−σ)`` is bounded above by its partial sum over
``n ≤ P`` plus ``∫_P^∞ log t·t^(−σ) dt``.  We take the smallest ``Z`` over
``σ ∈ {1.25, 1.5, 1.75, 2, 2.5, 3}``.  For large ``q`` the radius is about
``4·log q/(√x log x)``: 0.4 % of ``L`` at ``q = 4·10^20`` and ``P = 2·10^7``.  The argument is the classical
contour shift of the explicit formula (Davenport, *Multiplicative Number Theory*,
Ch. 12 and 19) with the weight above, the weight used by Bach ("Improved approximations
for Euler products", 1995) for the same purpose; the constants are our own and are
derived in full in the document named above.  **Nothing here is unconditional** except
the upper bound in the next paragraph: without GRH no effective lower bound of
useful size is known (Siegel's theorem is ineffective).

**Unconditional upper bound.**  ``L(1, χ_{d_K}) < 2 + log q``: split ``Σ χ(n)/n`` at
``n = q``; the head is at most ``1 + log q`` and, because ``χ`` sums to 0 over any
``q`` consecutive integers, Abel summation bounds the tail by ``q/(q+1) < 1``.  Hence
``h(D) ≤ w·√|D|·(2 + log q)·∏_{p|f}(1 + 1/p)/(2π)`` for ``D < 0`` (proved, used by
:mod:`formkit.classgroups.baby_step_giant_step` to bound the index of a subgroup).

**Steering width (not a bound).**  ``typical_radius = 1/√(P·log P)`` is the standard
deviation of the tail ``Σ_{p>P} χ(p)/p`` in a random-sign model.  It only sizes the
baby steps of the baby-step giant-step searches; no result depends on it.

Floating point: ``S``, the ``L'/L`` partial sums and the logarithms are IEEE doubles;
the rounding error of a sum of ``M`` terms is below ``(M + 10)·2^-52·Σ|terms|``, which
is added to the radius, and the interval ends are widened by ``10^-12`` relative for
``exp``.  The digamma value comes from mpmath at 53 bits (error below ``10^-15``); to cover it
and the rounding of the bracket, the bound ``Z`` is inflated to ``Z·(1 + 10^-12) + 10^-12``.

References
----------
.. [1] H. Davenport, *Multiplicative Number Theory*, 3rd ed., GTM 74, Springer 2000,
       Ch. 12 (Hadamard product of ``ξ(s, χ)``, ``Re B(χ) = −Σ Re 1/ρ``), Ch. 17 and 19
       (explicit formula and the contour shift).
.. [2] E. Bach, "Improved approximations for Euler products", in *Number Theory*
       (Halifax 1994), CMS Conf. Proc. 15, AMS 1995, 13–28 (the idea of weighting the
       partial products; its constants are not used here).
.. [3] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.3.2 (class number formula), §5.4 (use of the estimate in
       Shanks' baby-step giant-step).
.. [4] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, Thm 7.24.
.. [5] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, §9.5.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

from ..core.arith import as_int, isqrt, kronecker
from ..core.discriminants import discriminant_parts, validate_discriminant
from ..core.displays import SentenceDisplay
from ..core.factorisation import prime_factorisation
from ..errors import FormkitError

__all__ = [
    "GRH_CONSTANT",
    "LValueEstimate",
    "ClassNumberEstimate",
    "default_prime_bound",
    "l_value_estimate",
    "class_number_estimate",
    "class_number_upper_bound",
]

#: ``C₀ = (1 + √2)·√5/2 ≈ 2.70``: under GRH ``|K(ρ − 1 − u)| ≤ C₀/(¼ + γ²)`` for all
#: ``u ≥ 0`` (``docs/l_value_interval.md``, Lemma 3).
GRH_CONSTANT = (1 + math.sqrt(2)) * math.sqrt(5) / 2

#: The values of ``σ`` tried in the bound for ``Σ_ρ 1/(¼ + γ²)``.
SIGMAS = (1.25, 1.5, 1.75, 2.0, 2.5, 3.0)

#: ``L'/L(σ, χ)`` is summed over the prime powers up to this bound (or ``P`` if smaller).
LOG_DERIVATIVE_TERMS = 10**6

#: Smallest and largest prime bound accepted (the vectorised Legendre symbols need p < 2^31).
MIN_PRIME_BOUND = 16
MAX_PRIME_BOUND = 2 * 10**8

_ULP = 2.0**-52


@dataclass(frozen=True)
class LValueEstimate(SentenceDisplay):
    """``L(1, χ_D)`` with an interval that holds under GRH, and a proven upper bound.

    ``value`` is ``exp(S(x))`` times the exact conductor correction (module docstring);
    ``[lower, upper] = value·exp(∓log_radius)`` contains ``L(1, χ_D)`` if GRH holds for
    ``L(s, χ_{d_K})``; ``zero_sum_bound`` is the bound ``Z`` used for
    ``Σ_ρ 1/(¼ + γ²)`` and ``sigma`` the ``σ`` that gave it.  ``proven_upper`` is an
    unconditional upper bound.  ``typical_radius`` only steers searches (not a bound).
    """

    discriminant: int
    prime_bound: int
    value: float
    log_radius: float
    lower: float
    upper: float
    proven_upper: float
    zero_sum_bound: float
    sigma: float
    typical_radius: float
    assumption: str = "GRH"

    def _display_sentence(self) -> str:
        return f"L(1, χ_{self.discriminant}) ≈ {self.value:.10g}, in [{self.lower:.10g}, {self.upper:.10g}] (Euler product over p ≤ {self.prime_bound}); unconditionally ≤ {self.proven_upper:.6g}"

    def _display_provenance(self) -> str:
        return f"the interval conditional on {self.assumption}; the upper bound {self.proven_upper:.6g} unconditional"

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return dict(self.__dict__)


@dataclass(frozen=True)
class ClassNumberEstimate(SentenceDisplay):
    """The analytic estimate of the class number (``D < 0``) or of ``h·R`` (``D > 0``).

    ``estimate`` is the analytic value; ``[lower, upper]`` holds the true value under
    GRH (integers for ``D < 0``; for ``D > 0`` an interval for ``h·R``, wide ``h``);
    ``proven_upper`` is an unconditional upper bound.
    """

    discriminant: int
    estimate: float
    lower: float
    upper: float
    proven_upper: float
    l_value: LValueEstimate

    def _display_sentence(self) -> str:
        return (
            f"h({self.discriminant}) ≈ {self.estimate:.10g}, in [{self.lower}, {self.upper}]"
            if self.discriminant < 0
            else f"h·R for D = {self.discriminant} ≈ {self.estimate:.10g}, in [{self.lower:.10g}, {self.upper:.10g}]"
        ) + f"; unconditionally ≤ {self.proven_upper:.6g}"

    def _display_provenance(self) -> str:
        return f"the interval conditional on {self.assumption} (Euler product over p ≤ {self.l_value.prime_bound}); the upper bound unconditional"

    @property
    def assumption(self) -> str:
        """``"GRH"``: the interval is proved under the generalised Riemann hypothesis."""
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
    except ImportError:  # pragma: no cover - numpy is a dependency; kept for robustness
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


def _characters_numpy(d: int, primes):
    """``χ_d(p) = (d/p)`` for the numpy array of primes (Euler's criterion, vectorised)."""
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
    # Legendre symbol a^((p-1)/2) mod p by square-and-multiply on the whole array (p < 2^31)
    e = (p - 1) // 2
    result = np.ones_like(p)
    base = r.copy()
    while np.any(e):
        odd = (e & 1).astype(bool)
        result = np.where(odd, (result * base) % p, result)
        base = (base * base) % p
        e >>= 1
    chi = np.where(result == 1, 1.0, np.where(result == 0, 0.0, -1.0))
    return np.concatenate(([float(kronecker(d, 2))], chi))


class _Sum:
    """A float sum with the data for its rounding bound ``(M + 10)·2^-52·Σ|t|``."""

    __slots__ = ("count", "magnitude", "value")

    def __init__(self) -> None:
        self.value, self.magnitude, self.count = 0.0, 0.0, 0

    def add(self, value: float, magnitude: float, count: int) -> None:
        self.value += value
        self.magnitude += magnitude
        self.count += count

    @property
    def rounding(self) -> float:
        return (self.count + 10) * _ULP * self.magnitude


def _sums(d: int, P: int, backend: str | None = None) -> tuple[_Sum, dict[float, _Sum], int]:
    """``S(x)`` with ``x = P/2`` and ``Σ_{p^k ≤ N} χ(p)^k·log p·p^(−kσ)`` for σ in SIGMAS."""
    kind, primes = _primes_upto(P)
    x = P / 2
    N = min(P, LOG_DERIVATIVE_TERMS)
    S = _Sum()
    T = {s: _Sum() for s in SIGMAS}
    if backend == "python" or kind == "list":
        plist = [int(p) for p in primes]
        chis = [kronecker(d, p) for p in plist]
        for p, c in zip(plist, chis):
            if c:
                t = c * (1.0 if p <= x else 2.0 - p / x) / p
                S.add(t, abs(t), 1)
                if p <= N:
                    for s in SIGMAS:
                        u = c * math.log(p) * p**-s
                        T[s].add(u, abs(u), 1)
    else:
        import numpy as np

        chi = _characters_numpy(d, primes)
        pf = primes.astype(np.float64)
        t = chi * np.where(pf <= x, 1.0, 2.0 - pf / x) / pf
        S.add(float(np.sum(t)), float(np.sum(np.abs(t))), len(t))
        m = int(np.searchsorted(primes, N, side="right"))
        lp = np.log(pf[:m])
        for s in SIGMAS:
            u = chi[:m] * lp * pf[:m] ** -s
            T[s].add(float(np.sum(u)), float(np.sum(np.abs(u))), m)
        plist = [int(p) for p in primes[: int(np.searchsorted(primes, isqrt(P), side="right"))]]
        chis = [int(c) for c in chi[: len(plist)]]
    # prime powers p^k, k ≥ 2
    for p, c in zip(plist, chis):
        if not c or p * p > P:
            if p * p > P:
                break
            continue
        k, pk = 2, p * p
        while pk <= P:
            ck = c**k
            t = ck * (1.0 if pk <= x else 2.0 - pk / x) / (k * pk)
            S.add(t, abs(t), 1)
            if pk <= N:
                for s in SIGMAS:
                    u = ck * math.log(p) * float(pk) ** -s
                    T[s].add(u, abs(u), 1)
            k, pk = k + 1, pk * p
    return S, T, N


def _digamma(v: float) -> float:
    import mpmath

    return float(mpmath.digamma(v))


def _zero_sum_bound(q: int, odd: bool, T: dict[float, _Sum], N: int) -> tuple[float, float]:
    """``(Z, σ)`` with ``Σ_ρ 1/(¼ + γ²) ≤ Z`` under GRH (docs/l_value_interval.md, Lemma 5)."""
    a = 1 if odd else 0
    best = (math.inf, 0.0)
    for s, part in T.items():
        tail = N ** (1 - s) * (math.log(N) / (s - 1) + 1 / (s - 1) ** 2)  # ∫_N^∞ log t·t^(−σ) dt
        log_derivative_upper = -part.value + part.rounding + tail
        xi = 0.5 * math.log(q / math.pi) + 0.5 * _digamma((s + a) / 2) + log_derivative_upper
        Z = 4 * (s - 0.5) * xi * (1 + 1e-12) + 1e-12
        if best[0] > Z:
            best = (Z, s)
    if not best[0] > 0:  # pragma: no cover - Σ_ρ is positive, so a bound ≤ 0 is an error
        raise ArithmeticError(f"bound {best[0]} for a sum of positive terms (q = {q})")
    return best


def _conductor_factor(d_K: int, f: int) -> float:
    out = 1.0
    for p in prime_factorisation(f) if f > 1 else ():
        out *= 1.0 - kronecker(d_K, p) / p
    return out


def _conductor_factor_upper(f: int) -> float:
    out = 1.0
    for p in prime_factorisation(f) if f > 1 else ():
        out *= 1.0 + 1.0 / p
    return out


def l_value_estimate(
    D: object, prime_bound: int | None = None, *, backend: str | None = None
) -> LValueEstimate:
    """``L(1, χ_D)`` with an explicit error interval, valid under GRH.

    Parameters
    ----------
    D : int
        A non-square discriminant.
    prime_bound : int, optional
        ``P``: the primes up to ``P`` are used (``x = P/2`` in the module docstring);
        default :func:`default_prime_bound`.
    backend : {None, "python"}
        ``"python"`` forces the plain-Python loop (used to cross-check the vectorised one).

    Returns
    -------
    LValueEstimate
        ``value`` and the interval ``[lower, upper]``, which contains ``L(1, χ_D)`` if
        GRH holds for ``L(s, χ_{d_K})`` (``assumption == "GRH"``), and the proven
        bound ``proven_upper``.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a non-square discriminant.
    FormkitError
        If ``prime_bound`` is not an integer in ``[16, 2·10^8]``.

    Examples
    --------
    >>> est = l_value_estimate(-4, 10**5)            # L(1, χ_{-4}) = π/4
    >>> est.lower < math.pi / 4 < est.upper, round(est.value, 3), est.assumption
    (True, 0.785, 'GRH')
    >>> est = l_value_estimate(5, 10**6)             # L(1, χ_5) = 2 log((1+√5)/2)/√5
    >>> est.lower < 2 * math.log((1 + 5 ** 0.5) / 2) / 5 ** 0.5 < est.upper
    True

    References
    ----------
    Davenport, *Multiplicative Number Theory*, Ch. 12 and 19; the proof of the interval
    is in ``docs/l_value_interval.md``.
    """
    D = validate_discriminant(D)
    P = default_prime_bound(D) if prime_bound is None else as_int(prime_bound, "prime_bound")
    if not MIN_PRIME_BOUND <= P <= MAX_PRIME_BOUND:
        raise FormkitError(f"prime_bound must lie in [{MIN_PRIME_BOUND}, {MAX_PRIME_BOUND}], not {P}")
    d_K, f = discriminant_parts(D)
    S, T, N = _sums(d_K, P, backend)
    Z, sigma = _zero_sum_bound(abs(d_K), d_K < 0, T, N)
    x = P / 2
    lx = math.log(x)
    radius = GRH_CONSTANT * Z / (math.sqrt(x) * lx) + (math.log(2) / x + 1 / x**2) / lx
    radius = radius * (1 + 1e-12) + S.rounding
    corr = _conductor_factor(d_K, f)
    value = math.exp(S.value) * corr
    lower = math.exp(S.value - radius) * corr * (1 - 1e-12)
    upper = math.exp(S.value + radius) * corr * (1 + 1e-12)
    proven = (2.0 + math.log(abs(d_K))) * _conductor_factor_upper(f)
    typical = 1.0 / math.sqrt(P * math.log(P))
    return LValueEstimate(D, P, value, radius, lower, upper, proven, Z, sigma, typical)


def _unit_count(D: int) -> int:
    return {-3: 6, -4: 4}.get(D, 2) if D < 0 else 2


def class_number_estimate(D: object, prime_bound: int | None = None) -> ClassNumberEstimate:
    """Analytic estimate of ``h(D)`` (``D < 0``) or of ``h(D)·R(D)`` (``D > 0``), with an
    interval valid under GRH.

    For ``D < 0`` the interval ``[lower, upper]`` holds integers (the bounds of
    :func:`l_value_estimate` scaled and rounded outwards; clipped below at 1);
    ``proven_upper`` is an unconditional upper bound for ``h(D)``.  For ``D > 0`` the
    same fields bound ``h·R`` (wide ``h``).

    Parameters
    ----------
    D : int
        A non-square discriminant.
    prime_bound : int, optional
        Passed to :func:`l_value_estimate`.

    Returns
    -------
    ClassNumberEstimate

    Raises
    ------
    DiscriminantError, FormkitError
        As :func:`l_value_estimate`.

    Examples
    --------
    >>> e = class_number_estimate(-10**8 - 7)
    >>> e.lower <= 7253 <= e.upper      # h(−100000007) = 7253 (formkit enumeration and a brute-force count)
    True
    >>> e.assumption
    'GRH'
    """
    D = validate_discriminant(D)
    L = l_value_estimate(D, prime_bound)
    if D < 0:
        scale = _unit_count(D) * math.sqrt(-D) / (2 * math.pi)
        lo = max(1, math.floor(scale * L.lower * (1 - 1e-12)))
        hi = max(lo, math.ceil(scale * L.upper * (1 + 1e-12)))
        return ClassNumberEstimate(D, scale * L.value, lo, hi, math.floor(scale * L.proven_upper) + 1, L)
    scale = math.sqrt(D) / 2
    return ClassNumberEstimate(
        D,
        scale * L.value,
        scale * L.lower * (1 - 1e-12),
        scale * L.upper * (1 + 1e-12),
        scale * L.proven_upper,
        L,
    )


def class_number_upper_bound(D: object) -> int:
    """An unconditional (proven) upper bound for ``h(D)``, ``D < 0``.

    ``h(D) ≤ w·√|D|·(2 + log|d_K|)·∏_{p | f}(1 + 1/p)/(2π)`` (module docstring), with
    the floating-point value enlarged by one part in 10^9 and rounded up.

    Parameters
    ----------
    D : int
        A negative discriminant.

    Returns
    -------
    int

    Raises
    ------
    DiscriminantError, FormkitError
        If ``D`` is not a negative discriminant.

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
    return math.ceil(value * (1 + 1e-9)) + 1
