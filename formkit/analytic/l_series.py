"""L(s, χ_D) and ζ(s) at any complex s, certified, and their exact values at s = 0, −1, −2, ….

**The method** (Riemann's for ζ, Lavrik's for Dirichlet L-series; Cohen, *Advanced
Topics in Computational Number Theory*, §10.3, from memory).  Let ``χ = χ_d`` be the
Kronecker character of a fundamental discriminant ``d ≠ 1``: a real primitive
character of conductor ``q = |d|`` and parity ``a = 0`` (``d > 0``) or ``1`` (``d < 0``),
whose root number is 1.  With ``Λ(s) = (q/π)^((s+a)/2)·Γ((s+a)/2)·L(s, χ)`` the theta
function ``Σ χ(n)·n^a·e^(−πn²t/q)`` and its transformation under ``t ↦ 1/t`` give, for
*every* ``s``,

    Λ(s) = Σ_{n ≥ 1} χ(n)·n^a·[E_{1−σ₁}(x_n) + E_{1−σ₂}(x_n)],
    x_n = πn²/q,  σ₁ = (s + a)/2,  σ₂ = (1 − s + a)/2,

where ``E_p(x) = x^(p−1)·Γ(1−p, x) = ∫_1^∞ e^(−xt)·t^(−p) dt`` is the generalised
exponential integral.  For ζ (``q = 1``, ``a = 0``) the same identity holds with the two
polar terms ``−1/s − 1/(1 − s)`` added.  The functional equation is built in, the
series converges like ``e^(−πn²/q)``, so about ``√(q·digits)`` terms are needed.

**Error bound.**  For ``x > c = max(0, Re σ − 1)``, ``|E_{1−σ}(x)| ≤ e^(−x)/(x − c)``
(bound ``t^(Re σ − 1) ≤ e^(c(t−1))`` under the integral), so the terms ``n > N`` add at
most ``(N+1)^a·e^(−x)·(1/(x − c₁) + 1/(x − c₂))/(1 − r)^(a+1)`` with ``x = x_{N+1}``
and ``r = e^(−2π(N+1)/q)``; ``N`` is chosen (in floating point) to make this small
enough, and the bound itself is then evaluated in ball arithmetic and added to the radius
of the ball, so no rounding error of its own is left out.

**Blocks.**  For large ``q`` the terms are grouped into blocks ``n ∈ [n₀ − B, n₀ + B]``
with ``B ≈ n₀/32``, ``n₀/64`` or ``n₀/128`` (longer series, narrower blocks) and each
``E`` expanded in a Taylor series around ``x₀ = x_{n₀}``:
``d/dx E_{1−σ}(x) = −E_{−σ}(x)`` and ``E_{−σ}(x) = (e^(−x) + σ·E_{1−σ}(x))/x``, so all
the coefficients come from one value of ``E``; the block sum needs only the exact
integer moments ``Σ χ(n)·n^a·(n² − n₀²)^k``.  The remainder after ``K`` terms is at most
``h^(K+1)/(K+1)!·Γ(Re σ+K+1)/(x₀−h)^(Re σ+K+1)`` per term (``h`` the largest
``|x_n − x₀|``), also evaluated in ball arithmetic and added to the radius.  This turns
the ``√q`` special-function values into ``O(log q)`` of them plus integer arithmetic; the
high moments, whose Taylor coefficients are small, are summed in doubles with a proved
rounding bound added to the radius (:func:`_block_sum`).

All arithmetic is ball arithmetic (python-flint's ``arb``), so rounding errors are
bounded as well; the result is returned only when its radius meets the requested
digits (:mod:`formkit.analytic.balls`), after at most three attempts at rising
working precision.  For imprimitive ``χ_D`` (``D = f²·d_K``) the finite Euler factor
``∏_{p|f}(1 − χ_{d_K}(p)·p^(−s))`` is multiplied in.

**Exact values.**  ``L(1 − k, χ) = −B_{k,χ}/k`` with the generalised Bernoulli number
``B_{k,χ} = F^(k−1)·Σ_{a=1}^{F} χ(a)·B_k(a/F)`` for any period ``F`` of ``χ``, and
``ζ(1 − k) = −B_k/k`` (``B_1 = +1/2`` there, so ``ζ(0) = −1/2``) (Washington,
*Introduction to Cyclotomic Fields*, §4.1, Theorem 4.2; from memory) — in
:mod:`formkit.analytic.special_values`.

References
----------
.. [1] B. Riemann, "Über die Anzahl der Primzahlen unter einer gegebenen Grösse", 1859
       (the theta-function proof of the functional equation).
.. [2] H. Davenport, *Multiplicative Number Theory*, 3rd ed., GTM 74, Ch. 9 (the
       functional equation of L(s, χ); the Gauss sum of a real character).
.. [3] H. Cohen, *Advanced Topics in Computational Number Theory*, GTM 193,
       Springer 2000, §10.3 (computing L-series with incomplete gamma functions).
.. [4] L. C. Washington, *Introduction to Cyclotomic Fields*, 2nd ed., GTM 83, §4.1.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction
from typing import Any

from ..core.arith import kronecker
from ..core.discriminants import discriminant_parts, validate_discriminant
from ..core.factorisation import prime_factorisation
from ..errors import FormkitError
from .balls import (
    CertifiedValue,
    ComplexArgument,
    as_complex_argument,
    ball_lower,
    bits_for,
    certified,
    check_digits,
    meets,
)
from .lseries import _characters_numpy, _primes_upto
from .special_values import _zeta_nonpositive, l_series_at_nonpositive_integer

__all__ = [
    "MAX_SERIES_TERMS",
    "series_cost",
    "series_terms",
    "l_series",
    "riemann_zeta",
    "quadratic_field_zeta",
    "CriticalLineSamples",
    "critical_line_samples",
]

#: The largest number of series terms ``N`` accepted (about ``|d_K|·digits/40``).
MAX_SERIES_TERMS = 4 * 10**7

#: Below this index the terms are summed one by one; above it in Taylor blocks.
_DIRECT_TERMS = 400

#: A block starting at ``n`` has ``n // divisor`` terms (at least 8): the Taylor series then
#: gains about ``log2(divisor)`` bits per term, at the price of more blocks.  The divisor is
#: 16 for series of fewer than 3·10^4 terms, 32 below 3·10^5 and 64 beyond (measured with
#: ``benchmarks/bench_analytic.py`` at |D| = 10^6 … 10^12, see docs/performance.md);
#: ``_BLOCK_DIVISOR`` set to an integer overrides it (16 everywhere was the previous path).
_BLOCK_DIVISOR: int | None = None
_DIVISOR_STEPS = ((3 * 10**4, 16), (3 * 10**5, 32))

#: Moments of high order in doubles with a proved error bound (``_block_sum``); ``False``
#: gives the previous all-integer path (kept for the benchmark's side-by-side run).
_FLOAT_MOMENTS = True


# ---------------------------------------------------------------------------------------
# the character table and the theta-split series
# ---------------------------------------------------------------------------------------


def _character_table(d: int, N: int):
    """``χ_d(n)`` for ``0 ≤ n ≤ N`` as a numpy int8 array (χ_d is completely multiplicative)."""
    import numpy as np

    chi = np.zeros(N + 1, dtype=np.int8)
    if N >= 1:
        chi[1] = 1
    if N < 2:
        return chi
    _kind, primes = _primes_upto(max(N, 2))
    primes = np.asarray(primes, dtype=np.int64)
    at_prime = np.zeros(N + 1, dtype=np.int8)
    at_prime[primes] = _characters_numpy(d, primes).astype(np.int8)
    spf = np.zeros(N + 1, dtype=np.int64)
    for p in primes[primes * primes <= N]:
        block = spf[p * p :: p]
        block[block == 0] = p
    spf[primes] = primes
    lo = 2
    while lo <= N:
        hi = min(N, 2 * lo - 1)
        idx = np.arange(lo, hi + 1)
        p = spf[idx]
        chi[idx] = at_prime[p] * chi[idx // p]
        lo = hi + 1
    return chi


def _error_ball(bound, complex_: bool):
    """A ball ``[−B, B]`` (or ``[−B, B] + [−B, B]i``) containing every number of modulus ``≤ bound``.

    ``bound`` is an arb whose upper end is the bound: the product with the exact ball
    ``[−1, 1]`` contains ``[−B, B]`` rigorously (no floating-point rounding of ``B``).
    """
    from flint import acb, arb

    unit = arb(0, 1)
    b = unit * bound.upper()
    return acb(b, b) if complex_ else b


def _tail_bound_ball(N: int, q: int, a: int, c1: Fraction, c2: Fraction):
    """The bound of the module docstring for the terms ``n > N``, in ball arithmetic (``None`` if it does not apply)."""
    from flint import arb, fmpq

    n1 = N + 1
    x = arb.pi() * (n1 * n1) / q
    inverse_gaps = arb(0)
    for c in (c1, c2):
        gap = x - arb(fmpq(c.numerator, c.denominator))
        if not gap > 0:
            return None
        inverse_gaps += 1 / gap
    r = (-2 * arb.pi() * n1 / q).exp()
    return arb(n1) ** a * (-x).exp() * inverse_gaps / (1 - r) ** (a + 1)


def _tail_log_bound(N: int, q: int, a: int, c1: float, c2: float) -> float:
    """log of the bound for the terms n > N (module docstring); +inf when it does not apply.

    In floating point: it only chooses ``N``; the bound added to the result is
    :func:`_tail_bound_ball`, in ball arithmetic.
    """
    x = math.pi * (N + 1) ** 2 / q
    if x <= max(c1, c2) + 1e-9:
        return math.inf
    r = -2 * math.pi * (N + 1) / q  # log r
    one_minus_r = -math.expm1(r)
    return (
        a * math.log(N + 1)
        - x
        + math.log(1 / (x - c1) + 1 / (x - c2))
        - (a + 1) * math.log(one_minus_r)
        + 1e-9
    )


def _terms_needed(q: int, a: int, c1: float, c2: float, log_tol: float) -> int:
    lo, hi = 0, max(4, math.isqrt(q) + 1)
    while _tail_log_bound(hi, q, a, c1, c2) > log_tol:
        lo, hi = hi, 2 * hi
        if hi > 8 * MAX_SERIES_TERMS:
            break
    while hi - lo > 1:
        mid = (lo + hi) // 2
        if _tail_log_bound(mid, q, a, c1, c2) > log_tol:
            lo = mid
        else:
            hi = mid
    return hi


def _expint(x, sigma):
    """``E_{1−σ}(x) = ∫_1^∞ e^(−xt) t^(σ−1) dt`` for an arb ``x > 0`` and arb/acb ``σ``."""
    from flint import acb, ctx

    p = 1 - sigma
    value = acb(x).expint(p) if isinstance(sigma, acb) else x.expint(p)
    if value.rel_accuracy_bits() >= min(ctx.prec, x.rel_accuracy_bits()) - 16:
        return value
    # flint's E_p uses its asymptotic series for large x even when that series cannot
    # reach the precision (about x/log 2 bits: at 1100 bits, x = 225π gives 1017); then
    # E_p(x) = x^(p−1)·e^(−x)·U(p, p, x) (DLMF 8.19.1 with 8.5.3), whose U flint computes
    xc = acb(x)
    u = (p - 1) * xc.log()
    alt = (u - xc).exp() * xc.hypgeom_u(p, p)
    if not isinstance(sigma, acb):
        alt = alt.real
    return alt if alt.rel_accuracy_bits() > value.rel_accuracy_bits() else value


def _remainder_log(h: float, x0: float, sr: float, K: int) -> float:
    """log of ``h^(K+1)/(K+1)!·Γ(σr+K+1)/(x0−h)^(σr+K+1)`` (the Taylor remainder bound), in floats:
    it only chooses ``K``; :func:`_remainder_ball` is the bound used."""
    c = sr + K + 1
    if c <= 0:
        return math.inf
    return (K + 1) * math.log(h) - math.lgamma(K + 2) + math.lgamma(c) - c * math.log(x0 - h)


def _remainder_ball(lo: int, hi: int, n0: int, q: int, sr: Fraction, K: int):
    """``h^(K+1)/(K+1)!·Γ(σr+K+1)/(x0−h)^(σr+K+1)`` in ball arithmetic, ``x0 = πn0²/q``, ``h = max|x_n − x0|``."""
    from flint import arb, fmpq

    h = arb.pi() * max(abs(lo * lo - n0 * n0), abs(hi * hi - n0 * n0)) / q
    x0 = arb.pi() * (n0 * n0) / q
    c = sr + K + 1
    gap = x0 - h
    if not (c > 0 and gap > 0):  # pragma: no cover - blocks are at most 1/16 of their start
        raise ArithmeticError(f"Taylor remainder bound does not apply to the block [{lo}, {hi}]")
    cb = arb(fmpq(c.numerator, c.denominator))
    return h ** (K + 1) / arb(K + 2).gamma() * cb.gamma() / (cb * gap.log()).exp()


def _block_sum(
    chi,
    q: int,
    a: int,
    lo: int,
    hi: int,
    sigmas,
    sr: tuple[float, float],
    log_tol: float,
    sr_exact: tuple[Fraction, Fraction],
):
    """``Σ_{lo ≤ n ≤ hi} χ(n)·n^a·Σ_σ E_{1−σ}(x_n)`` by Taylor expansion at the block centre.

    The moments ``P_k = Σ w·v^k`` (``w = χ(n)·n^a``, ``v = n² − n₀²``) are exact integers for
    the first ``k``; once the Taylor coefficient ``c_k`` times ``V^k`` (``V = 2^e ≥ max|v|``) is
    small enough, ``P_k = V^k·Q_k`` with ``Q_k = Σ w·(v/V)^k`` in IEEE doubles: ``v/V`` is
    exact (``V`` a power of 2, ``|v| < 2^53``), each of the ``k`` products rounds once
    (relative error ``≤ (1 + 2^-53)^k − 1``; Higham, *Accuracy and Stability of Numerical
    Algorithms*, 2nd ed., Lemma 3.1) and the pairwise sum (:func:`_pairwise_sum`: each term
    passes through ``d = ⌈log2 m⌉`` additions) adds at most ``γ_d·Σ|terms|`` (ibid. §4.2),
    so ``|Q̃_k − Q_k| ≤ 1.02·(d + k + 1)·2^-53·Σ|w|``
    (plus ``2^-1000·(k + 1)·Σ|w|`` for underflow); that bound times ``|c_k|·V^k`` is added
    to the radius in ball arithmetic.  :data:`_FLOAT_MOMENTS` switches this off (the previous path).
    """
    import numpy as np
    from flint import acb, arb

    n0 = (lo + hi) // 2
    idx = np.flatnonzero(chi[lo : hi + 1]) + lo
    if len(idx) == 0:
        return 0, 0
    h = math.pi * max(abs(lo * lo - n0 * n0), abs(hi * hi - n0 * n0)) / q
    x0f = math.pi * n0 * n0 / q
    w64 = chi[idx].astype(np.int64) * (idx if a else 1)
    mass = int(np.abs(w64).sum())
    K = 0
    while max(_remainder_log(h, x0f, s, K) for s in sr) + math.log(mass) > log_tol:
        K += 1
        # each order gains about log2(15) ≈ 3.9 bits (h/(x0 − h) ≤ 1/15 for blocks of 1/16 of
        # their start), so about bits/3.9 orders: 1000 digits need some 850 (was a cap of 400)
        cap = 400 + int(-log_tol)
        if cap < K:  # pragma: no cover - the blocks are small enough
            raise ArithmeticError(f"Taylor block [{lo}, {hi}] does not converge")
    remainder = 2 * mass * sum((_remainder_ball(lo, hi, n0, q, s, K) for s in sr_exact), arb(0))
    x0 = arb.pi() * n0 * n0 / q
    e = (-x0).exp()
    step = -arb.pi() / q
    # Taylor coefficients T[σ][k] = E_{1−σ−k}(x0)·(−π/q)^k/k!  (the k-th derivative of E_{1−σ}(πm/q) at m = n0²/k!)
    table = []
    for sigma in sigmas:
        g = _expint(x0, sigma)  # g_k = E_{1−σ−k}(x0)
        coeff = arb(1)  # (−π/q)^k / k!
        row = [g]
        for k in range(1, K + 1):
            g = (e + (sigma + (k - 1)) * g) / x0
            coeff = coeff * step / k
            row.append(g * coeff)
        table.append(row)
    vmax = max(abs(lo * lo - n0 * n0), abs(hi * hi - n0 * n0))
    V_exp = max(1, vmax.bit_length())
    float_ok = _FLOAT_MOMENTS and vmax < 2**53 and mass < 2**53 and int(np.abs(w64).max()) < 2**53
    m = len(idx)
    depth = max(1, (m - 1).bit_length())  # additions each term goes through in _pairwise_sum
    # the k from which a double moment is accurate enough: |c_k|·V^k·(float error) ≤ tol/(2(K+1))
    float_from = K + 1
    if float_ok:
        budget = log_tol - math.log(4 * (K + 1))
        log_err = math.log(1.02 * 2.0**-53 * mass)
        for k in range(K + 1):
            size = max(_log_upper(row[k]) for row in table) + k * V_exp * math.log(2)
            if size + log_err + math.log(depth + k + 1) <= budget:
                float_from = k
                break
    # exact moments P_k, k < float_from (numpy object arrays of Python integers)
    moments: list[Any] = []
    if float_from > 0:
        w = np.array([int(x) for x in w64.tolist()], dtype=object)
        va = np.array([n * n - n0 * n0 for n in idx.tolist()], dtype=object)
        for k in range(float_from):
            moments.append(int(w64.sum()) if k == 0 else int(w.sum()))
            if k + 1 < float_from:
                w = w * va
    error = arb(0)
    if float_from <= K:
        from flint import fmpq

        u = (idx * idx - n0 * n0).astype(np.float64) / 2.0**V_exp  # exact: |v| < 2^53, V a power of 2
        power = w64.astype(np.float64)
        for _j in range(float_from):
            power = power * u
        scale = arb(2) ** V_exp
        for k in range(float_from, K + 1):
            if k > float_from:
                power = power * u
            Qk = _pairwise_sum(power)
            moments.append(arb(fmpq(*Qk.as_integer_ratio())) * scale**k)
            bound = 1.02 * 2.0**-53 * mass * (depth + k + 1) + 2.0**-1000 * mass * (k + 1)
            magnitude = sum((abs(row[k]) for row in table), arb(0)) * scale**k
            error += magnitude * arb(fmpq(*bound.as_integer_ratio()))
    total: Any = None
    for row in table:
        part = row[0] * moments[0]
        for k in range(1, K + 1):
            part += row[k] * moments[k]
        total = part if total is None else total + part
    total += _error_ball(remainder + error, isinstance(total, acb))
    return total, m


def _pairwise_sum(x) -> float:
    """The sum of a float64 array by halving (zero-padded to a power of 2): every term passes
    through exactly ``⌈log2 len(x)⌉`` additions, whatever numpy's own summation does."""
    import numpy as np

    n = len(x)
    size = 1 << max(0, (n - 1).bit_length())
    a = np.zeros(size)
    a[:n] = x
    while size > 1:
        size //= 2
        a = a[:size] + a[size:]
    return float(a[0])


def _log_upper(x) -> float:
    """log of an upper bound for |x| (a float; -inf for 0) — it only chooses where doubles suffice."""
    b = float(abs(x).upper())
    return math.log(b) if b > 0 else -math.inf


def _lambda(d: int, s: ComplexArgument, prec: int, log_tol: float):
    """``(Λ(s), N)`` for ``χ_d`` (``d`` fundamental, or ``d = 1`` for ζ) at ``prec`` bits."""
    from flint import acb, arb, ctx

    q = abs(d)
    a = 1 if d < 0 else 0
    s1 = (s + a) * Fraction(1, 2)
    s2 = (1 - s + a) * Fraction(1, 2)
    c1_exact, c2_exact = max(Fraction(0), s1.real - 1), max(Fraction(0), s2.real - 1)
    c1, c2 = float(c1_exact), float(c2_exact)
    N = _terms_needed(q, a, c1, c2, log_tol - math.log(2))
    if N > MAX_SERIES_TERMS:
        raise FormkitError(
            f"L(s, χ_{d}) to this precision needs {N} terms of the series, more than the "
            f"{MAX_SERIES_TERMS} this method is allowed; ask for fewer digits"
        )
    with ctx.workprec(prec):
        sig = (s1.ball(), s2.ball())
        srs = (float(s1.real), float(s2.real))
        pi_q = arb.pi() / q
        total = acb(0) if not s.is_real else arb(0)
        if d == 1:
            sb = s.ball()
            total = -1 / sb - 1 / (1 - sb)
        chi = _character_table(d, N) if d != 1 else None
        direct = min(N, _DIRECT_TERMS)
        count = 0
        for n in range(1, direct + 1):
            c = 1 if chi is None else int(chi[n])
            if c:
                x = pi_q * (n * n)
                term = _expint(x, sig[0]) + _expint(x, sig[1])
                total += term * (c * (n if a else 1))
                count += 1
        lo = direct + 1
        if lo <= N:
            # split the tolerance evenly over the blocks (each at most 1/16 of its start)
            blocks = []
            divisor = _BLOCK_DIVISOR or next((d for bound, d in _DIVISOR_STEPS if bound > N), 64)
            while lo <= N:
                hi = min(N, lo + max(8, lo // divisor))
                blocks.append((lo, hi))
                lo = hi + 1
            block_tol = log_tol - math.log(2 * len(blocks))
            for lo_, hi_ in blocks:
                part, k = _block_sum(chi, q, a, lo_, hi_, sig, srs, block_tol, (s1.real, s2.real))
                total += part
                count += k
        tail = _tail_bound_ball(N, q, a, c1_exact, c2_exact)
        if tail is None:  # pragma: no cover - _terms_needed chose N with x_{N+1} > c₁, c₂
            raise ArithmeticError(f"the tail bound does not apply at N = {N}")
        total += _error_ball(tail, isinstance(total, acb))
    return total, N


def _gamma_factor(d: int, s: ComplexArgument, prec: int):
    """``(π/q)^σ₁ / Γ(σ₁)`` (so that ``L = Λ·factor``); ``σ₁ = (s + a)/2``."""
    from flint import arb, ctx

    q = abs(d)
    a = 1 if d < 0 else 0
    with ctx.workprec(prec):
        s1 = ((s + a) * Fraction(1, 2)).ball()
        return (s1 * (arb.pi() / q).log()).exp() * s1.rgamma()


def _log_scale(d: int, s: ComplexArgument) -> float:
    """``log |(q/π)^σ₁·Γ(σ₁)|`` in floats (the size of Λ when ``|L| ≈ 1``)."""
    import mpmath

    q = abs(d)
    a = 1 if d < 0 else 0
    h = (s + a) * Fraction(1, 2)
    s1 = complex(float(h.real), float(h.imag))
    if s1.imag == 0 and s1.real <= 0 and s1.real == int(s1.real):
        return 0.0
    lg = complex(mpmath.loggamma(s1))
    return lg.real + s1.real * math.log(q / math.pi)


def series_terms(d: int, s: object, digits: int) -> int:
    """The number ``N`` of terms the theta-split series sums for ``L(s, χ_d)`` to ``digits``.

    The same choice as the evaluation makes on its first attempt (``d`` fundamental, or
    ``1`` for ζ); ``N`` grows like ``√(|d|·digits)``.

    Examples
    --------
    >>> series_terms(1, 2, 30), series_terms(-10**6 - 3, 2, 30) > 1000
    (5, True)
    """
    s = as_complex_argument(s)
    extra = int(math.pi * abs(float(s.imag)) / (4 * math.log(2))) + 10
    bits = bits_for(digits) + extra
    a = 1 if d < 0 else 0
    c1 = max(0.0, float((s + a).real) / 2 - 1)
    c2 = max(0.0, float((1 - s + a).real) / 2 - 1)
    return _terms_needed(abs(d), a, c1, c2, -bits * math.log(2) + _log_scale(d, s) - math.log(2))


def series_cost(d: int, s: object, digits: int) -> tuple[float, float]:
    """``(seconds, bytes)`` estimated for the series of ``L(s, χ_d)`` (or ``ζ``, ``d = 1``) to ``digits``.

    With ``N`` = :func:`series_terms`, ``b`` the working bits and ``K = b/3.9`` the
    Taylor orders of a block: ``N·K·(2·10⁻⁷ + 3·10⁻⁹·K)`` s for the blocks (exact
    moments ``Σ w·v^k``, whose size grows with ``k``), ``min(N, 400)·(10⁻⁴ + 0.06·(b/1000)^2.3)``
    s for the terms summed one by one (two incomplete gammas at ``b`` bits: 1 s a term at
    3400 bits), plus ``1.5·10⁻³·(e/1000)^1.9`` s a term for the ``e = π|Im s|/(4 log 2)``
    bits that cancel in ``Γ`` at large ``|Im s|`` (measured: 0.11 s a term at ``Im s = 10⁴``,
    ``e ≈ 11 300``; 0.028 s at ``5000``), and ``24·N``
    bytes (character and smallest-prime-factor tables).  Measured on the development
    machine (2 cores): N = 5138 … 513733 at 30 digits, 27124 at 1000 digits, within a
    factor 2 (the test ``tests/analytic/test_analytic_cost.py`` checks the count of
    terms and the time).

    Examples
    --------
    >>> t, m = series_cost(-10**12 - 3, 2, 1000)
    >>> t > 36000                       # about 18 h: refused at the default budget
    True
    """
    N = series_terms(d, s, digits)
    bits = bits_for(digits) + 10
    extra = math.pi * abs(float(as_complex_argument(s).imag)) / (4 * math.log(2))
    K = bits / 3.9 + 4
    blocks = max(0, N - _DIRECT_TERMS) * K * (2e-7 + 3e-9 * K)
    direct = min(N, _DIRECT_TERMS) * (1e-4 + 0.06 * (bits / 1000) ** 2.3 + 1.5e-3 * (extra / 1000) ** 1.9)
    return blocks + direct, 24.0 * N + 2 * 10**6


def _check_series_cost(d: int, s: ComplexArgument, digits: int) -> None:
    from ..core.budget import check_cost, describe_integer

    seconds, memory = series_cost(d, s, digits)
    name = "ζ(s)" if d == 1 else f"L(s, χ_{describe_integer(d)})"
    check_cost(
        f"{name} at s = {s} to {digits} digits ({describe_integer(series_terms(d, s, digits))} series terms)",
        seconds=seconds,
        memory=memory,
        further="fewer --digits reach further (the terms grow like √(|d_K|·digits))",
    )


def _series_value(d: int, s: ComplexArgument, digits: int):
    """A ball for ``L(s, χ_d)`` (``d`` fundamental ≠ 1) or ``ζ(s)`` (``d = 1``) and ``N``."""
    _check_series_cost(d, s, digits)
    extra = int(math.pi * abs(float(s.imag)) / (4 * math.log(2))) + 10
    target_bits = bits_for(digits)
    shortfall = 0
    for _attempt in range(3):
        bits = target_bits + extra + shortfall
        log_tol = -bits * math.log(2) + _log_scale(d, s)
        prec = bits + 2 * max(10, int(math.log2(abs(d) + 1))) + 10
        lam, N = _lambda(d, s, prec, log_tol)
        from flint import ctx

        with ctx.workprec(prec):
            value = lam * _gamma_factor(d, s, prec)
        if meets(value, digits):
            return value, N
        # the value is smaller than the scale assumed: add the missing bits and retry
        lower = ball_lower(value)
        if lower > 0:
            shortfall += int(max(8.0, -math.log2(lower) + 8))
        else:
            shortfall += max(64, target_bits)
    return value, N


def _euler_factor(d_K: int, f: int, s: ComplexArgument, prec: int):
    from flint import arb, ctx

    with ctx.workprec(prec):
        out = arb(1)
        sb = s.ball()
        for p in prime_factorisation(f) if f > 1 else ():
            c = kronecker(d_K, p)
            if c:
                out = out * (1 - c * (-sb * arb(p).log()).exp())
        return out


def _method(N: int) -> str:
    return (
        f"functional equation and incomplete-gamma series (exponential integrals E_p), {N} terms, "
        "Taylor blocks beyond n = 400, ball arithmetic; tail bounded explicitly (unconditional)"
    )


def l_series(D: object, s: object, *, digits: int = 30) -> CertifiedValue:
    """``L(s, χ_D) = Σ_{n ≥ 1} (D/n)·n^(−s)``, continued to all of C, certified to ``digits``.

    Parameters
    ----------
    D : int
        A discriminant (``χ_D`` is the Kronecker character ``n ↦ (D/n)``; for
        ``D = f²·d_K`` it differs from the primitive ``χ_{d_K}`` by the Euler factors at
        the primes dividing ``f``).
    s : number or text
        Any complex number (``"1/2+14.1347i"``, ``2``, ``0.5``, ``complex``).  At
        ``s = 0, −1, −2, …`` the exact rational value is returned (``exact``).
    digits : int
        Significant digits certified (relative error ``≤ 10^−digits``).

    Returns
    -------
    CertifiedValue
        ``value`` (mpmath), ``error_bound``, ``terms`` and ``method``.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a non-square discriminant.
    FormkitError
        If ``digits`` is outside ``[1, 1000]``, the series would need more than
        :data:`MAX_SERIES_TERMS` terms, or the value cannot be certified (too close to 0).

    Examples
    --------
    >>> L = l_series(-4, 1, digits=25)             # π/4
    >>> L.text()
    '0.7853981633974483096156608'
    >>> l_series(-23, 0).exact                     # 2h/w
    Fraction(3, 1)
    >>> l_series(5, 2, digits=20).text()           # 4π²/(25√5)
    '0.70621140325974096993'

    References
    ----------
    Cohen, *Advanced Topics in Computational Number Theory*, §10.3; Davenport Ch. 9.
    """
    D = validate_discriminant(D)
    s = as_complex_argument(s)
    digits = check_digits(digits)
    d_K, f = discriminant_parts(D)
    quantity = f"L(s, χ_{D})"
    if s.is_integer and s.real <= 0:
        exact = l_series_at_nonpositive_integer(D, -int(s.real))
        return _exact_value(
            exact, quantity, s, digits, "generalised Bernoulli number B_{k,χ}: L(1 − k, χ) = −B_{k,χ}/k"
        )
    value, N = _series_value(d_K, s, digits)
    if f > 1:
        from flint import ctx

        prec = bits_for(digits) + 40
        with ctx.workprec(prec):
            value = value * _euler_factor(d_K, f, s, prec)
    return certified(value, digits, quantity=quantity, s=s, method=_method(N), terms=N, discriminant=D)


def _exact_value(exact: Fraction, quantity: str, s: ComplexArgument, digits: int, method: str):
    import mpmath

    with mpmath.workdps(digits):
        value = mpmath.mpf(exact.numerator) / exact.denominator
    return CertifiedValue(quantity, s, value, 0.0, digits, method, 0, exact)


def riemann_zeta(s: object, *, digits: int = 30) -> CertifiedValue:
    """Riemann's ``ζ(s)`` for complex ``s ≠ 1``, certified, by Riemann's own theta-split formula.

    ``π^(−s/2)·Γ(s/2)·ζ(s) = −1/s − 1/(1−s) + Σ_{n≥1} [E_{1−s/2}(πn²) + E_{(1+s)/2}(πn²)]``
    (module docstring with ``q = 1``); exact at ``s = 0, −1, −2, …``.

    Raises
    ------
    FormkitError
        At the pole ``s = 1``, or as :func:`l_series`.

    Examples
    --------
    >>> riemann_zeta(2, digits=20).text()          # π²/6
    '1.6449340668482264365'
    >>> riemann_zeta(-1).exact
    Fraction(-1, 12)
    """
    s = as_complex_argument(s)
    digits = check_digits(digits)
    if s.is_integer and s.real == 1:
        raise FormkitError("s = 1 is the pole of ζ(s) (residue 1); ζ is defined at every other s")
    if s.is_integer and s.real <= 0:
        return _exact_value(
            _zeta_nonpositive(-int(s.real)), "ζ(s)", s, digits, "Bernoulli number: ζ(1 − k) = −B_k/k"
        )
    value, N = _series_value(1, s, digits)
    return certified(value, digits, quantity="ζ(s)", s=s, method=_method(N), terms=N)


def quadratic_field_zeta(D: object, s: object, *, digits: int = 30) -> CertifiedValue:
    """The Dedekind zeta function ``ζ_K(s) = ζ(s)·L(s, χ_{d_K})`` of ``K = Q(√D)``.

    The factorisation (Dirichlet; Zagier, *Zetafunktionen und quadratische Körper*, §11)
    is the method: both factors are certified by :func:`riemann_zeta` and
    :func:`l_series` and multiplied in ball arithmetic.  Only the field matters, so
    ``D`` may be the discriminant of any order of ``K``.

    Raises
    ------
    FormkitError
        At the pole ``s = 1`` (residue ``L(1, χ_{d_K})``), or as :func:`l_series`.

    Examples
    --------
    >>> quadratic_field_zeta(-4, -1).exact       # ζ(−1)·L(−1, χ_−4) = 0 (χ_−4 is odd)
    Fraction(0, 1)
    >>> quadratic_field_zeta(5, -1).exact        # ζ_K(−1) = 1/30 for Q(√5)
    Fraction(1, 30)
    """
    D = validate_discriminant(D)
    s = as_complex_argument(s)
    digits = check_digits(digits)
    d_K, _f = discriminant_parts(D)
    quantity = f"ζ_K(s) for K = Q(√{d_K})"
    if s.is_integer and s.real == 1:
        raise FormkitError(
            f"s = 1 is the pole of ζ_K(s) for K = Q(√{d_K}) (residue L(1, χ_{d_K})); any other s is fine"
        )
    if s.is_integer and s.real <= 0:
        n = -int(s.real)
        exact = _zeta_nonpositive(n) * l_series_at_nonpositive_integer(d_K, n)
        return _exact_value(
            exact,
            quantity,
            s,
            digits,
            "Bernoulli and generalised Bernoulli numbers: ζ_K(1 − k) = ζ(1 − k)·L(1 − k, χ)",
        )
    from flint import ctx

    z, N1 = _series_value(1, s, digits + 2)
    L, N2 = _series_value(d_K, s, digits + 2)
    with ctx.workprec(bits_for(digits) + 40):
        value = z * L
    return certified(
        value,
        digits,
        quantity=quantity,
        s=s,
        method=f"ζ(s)·L(s, χ_{d_K}), each by " + _method(max(N1, N2)),
        terms=N1 + N2,
        discriminant=d_K,
    )


@dataclass(frozen=True)
class CriticalLineSamples:
    """``|L(½ + it, χ_D)|`` (or ``|ζ(½ + it)|`` for ``D = 1``) at equally spaced ``t`` in ``[0, height]``.

    ``heights[i]`` are the exact rationals ``t_i`` (as floats here) and ``values[i]`` the
    certified absolute values rounded to floats; ``error_bound`` is the largest
    certified error of the complex values (before rounding to floats).
    """

    discriminant: int
    heights: tuple[float, ...]
    values: tuple[float, ...]
    digits: int
    error_bound: float
    method: str

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return {
            "discriminant": self.discriminant,
            "t": list(self.heights),
            "abs_value": list(self.values),
            "digits": self.digits,
            "error_bound": f"{self.error_bound:.3e}",
            "method": self.method,
        }

    def __repr__(self) -> str:
        return (
            f"CriticalLineSamples(D={self.discriminant}, {len(self.values)} points on 0 ≤ t ≤ "
            f"{self.heights[-1] if self.heights else 0}, max |L| = {max(self.values, default=0):.6g})"
        )

    def _repr_html_(self) -> str:
        return (
            f"<p>|L(½ + it, χ<sub>{self.discriminant}</sub>)| at {len(self.values)} points, "
            f"0 ≤ t ≤ {self.heights[-1]:g}: max {max(self.values, default=0):.6g}<br>"
            f"<small>each value certified to {self.digits} digits; {self.method}</small></p>"
        )

    def _repr_latex_(self) -> str:
        return (
            rf"$\max_{{0 \le t \le {self.heights[-1]:g}}} |L(\tfrac12 + it, \chi_{{{self.discriminant}}})| "
            rf"\approx {max(self.values, default=0):.6g}$ \quad(\text{{{len(self.values)} certified samples}})"
        )


def critical_line_samples(
    D: object, height: object, *, points: int = 200, digits: int = 10
) -> CriticalLineSamples:
    """``|L(½ + it, χ_D)|`` for ``t = k·height/(points − 1)``, ``k = 0 … points − 1``.

    ``D = 1`` gives ``|ζ(½ + it)|``.  Each value is certified by :func:`l_series`
    (or :func:`riemann_zeta`) to ``digits`` digits.

    Raises
    ------
    FormkitError
        If ``height`` is not a positive number ≤ 10^4 or ``points`` is not in ``[2, 10^5]``.

    Examples
    --------
    >>> c = critical_line_samples(-4, 20, points=5, digits=8)
    >>> [round(v, 5) for v in c.values]
    [0.66769, 1.09321, 0.44393, 2.45837, 2.87431]
    """
    from ..core.arith import as_int

    h = as_complex_argument(height, "height")
    if not h.is_real or not 0 < h.real <= 10**4:
        raise FormkitError(f"height must be a real number in (0, 10^4], not {height!r}")
    points = as_int(points, "points")
    if not 2 <= points <= 10**5:
        raise FormkitError(f"points must lie in [2, 10^5], not {points}")
    digits = check_digits(digits)
    D_int = 1 if D == 1 else validate_discriminant(D)
    from ..core.budget import check_cost, describe_integer
    from ..core.progress import progress_bar

    def point(k: int) -> ComplexArgument:
        return ComplexArgument(Fraction(1, 2), Fraction(h.real * k / (points - 1)))

    # the whole walk priced first: the cost of every 1 in `step` points (it grows with t), scaled
    d_K = 1 if D_int == 1 else discriminant_parts(D_int)[0]
    step = max(1, points // 64)
    sampled = [series_cost(d_K, point(k), digits) for k in range(0, points, step)]
    check_cost(
        f"|L(1/2 + it, χ_{describe_integer(D_int)})| at {points} points up to t = {float(h.real):g} to {digits} digits",
        seconds=step * sum(c[0] for c in sampled),
        memory=max(c[1] for c in sampled),
        further="fewer --points or a smaller --height reach further (the work per point grows like t^1.9)",
    )
    ts, vals, err, method = [], [], 0.0, ""
    with progress_bar(total=points, desc="critical line: points", unit="point") as bar:
        for k in range(points):
            s = point(k)
            v = riemann_zeta(s, digits=digits) if D_int == 1 else l_series(D_int, s, digits=digits)
            ts.append(float(s.imag))
            vals.append(float(abs(complex(v.value))))
            err = max(err, v.error_bound)
            method = v.method
            bar.update(1)
    return CriticalLineSamples(D_int, tuple(ts), tuple(vals), digits, err, method)
