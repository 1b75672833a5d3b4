"""The theta-split series of Λ(s, χ_d): its terms, its explicit tail bound and its Taylor blocks.

This is the engine of :mod:`formkit.analytic.l_series` (which states the method: the
functional equation built into ``Λ(s) = Σ_{n ≥ 1} χ(n)·n^a·[E_{1−σ₁}(x_n) + E_{1−σ₂}(x_n)]``,
``x_n = πn²/q``, ``E_p`` the generalised exponential integral).  Here the series is summed,
in ball arithmetic, with every error bounded:

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

The module's names are private (the public functions are those of
:mod:`formkit.analytic.l_series`); its tunables ``_DIRECT_TERMS``, ``_BLOCK_DIVISOR`` and
``_FLOAT_MOMENTS`` are what the tests and ``benchmarks/bench_analytic.py`` switch to compare
the paths.

References
----------
.. [1] H. Cohen, *Advanced Topics in Computational Number Theory*, GTM 193,
       Springer 2000, §10.3 (computing L-series with incomplete gamma functions).
.. [2] N. J. Higham, *Accuracy and Stability of Numerical Algorithms*, 2nd ed., SIAM 2002,
       Lemma 3.1 and §4.2 (rounding of products and of pairwise sums).
"""

from __future__ import annotations

import math
from fractions import Fraction
from typing import Any

from ..errors import FormkitError
from .balls import ComplexArgument
from .lseries import _characters_numpy, _primes_upto

__all__: list[str] = []

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
