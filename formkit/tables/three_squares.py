"""Sums of three squares by FFT: ``r₃(n)`` through three short theta products.

``r₃(n) = #{(x, y, z) ∈ ℤ³ : x² + y² + z² = n}`` is the coefficient of ``θ(q)³``,
``θ = Σ_{k ∈ ℤ} q^{k²}``.  Squares are ``≡ 0`` or ``1 (mod 4)``, so ``n mod 4`` is the
number of odd coordinates mod 4, and ``r₃(4n) = r₃(n)`` (all three even).  With
``θ_odd(q) = Σ_{k odd} q^{k²} = 2q·ψ(q⁸)``, ``ψ(q) = Σ_{j ≥ 0} q^{j(j+1)/2}`` (Gauss's
triangular series; ``(2j+1)² = 8·j(j+1)/2 + 1``) and ``Σ_{k even} q^{k²} = θ(q⁴)``:

* ``n = 8j + 3`` (three odd): ``r₃(n) = 8·[q^j] ψ(q)³`` (and ``r₃ = 0`` for
  ``n ≡ 7 mod 8``: Legendre's theorem falls out);
* ``n = 4j + 1`` (one odd, three places): ``r₃(n) = 6·[q^j] ψ(q²)·θ(q)²``;
* ``n = 4j + 2`` (two odd): ``r₃(n) = 12·[q^j] ψ(q²)²·θ(q)``.

(Derived here from the parity argument; checked against brute force in the tests.)  For
the class numbers up to ``N`` only ``r₃`` at ``n ≡ 3 (mod 8)`` up to ``N`` and at
``n ≡ 1, 2 (mod 4)`` up to ``N/4`` are needed, so the transforms have about ``N/8`` and
``N/16`` coefficients instead of the ``N`` of ``θ³`` — and ``ψ`` has only ``√(2m)``
nonzero terms among ``m``.

*Exactness.*  Each product is one real FFT (numpy, float64) of a power-of-two length
``L`` larger than the degree of the full product, so there is no wrap-around; every
coefficient is an integer, is rounded, and the largest distance to the nearest integer
is checked to be below ``1/4`` (about ``10⁻¹⁰`` in practice), else :class:`ArithmeticError`.
The largest distance seen is returned with the series.

References
----------
.. [1] C. F. Gauss, *Disquisitiones Arithmeticae*, 1801, art. 291–292 (three squares).
.. [2] A.-M. Legendre, *Essai sur la théorie des nombres*, 1798 (n = 4^a(8b + 7)).
.. [3] J. W. Cooley and J. W. Tukey, "An algorithm for the machine calculation of
       complex Fourier series", Math. Comp. 19 (1965), 297–301.
"""

from __future__ import annotations

import math
import threading
from dataclasses import dataclass
from typing import Any

from .sweep import _numpy

__all__: list = []  # private helpers of formkit.tables.theta

#: Largest allowed distance of an FFT coefficient to the nearest integer.
ROUNDING_TOLERANCE = 0.25


def _theta_coefficients(m: int):
    """θ = Σ_{k ∈ ℤ} q^{k²} at indices ``0 … m`` (float64)."""
    np = _numpy()
    out = np.zeros(m + 1, dtype=np.float64)
    k = np.arange(0, math.isqrt(m) + 1, dtype=np.int64)
    out[k * k] = 2.0
    out[0] = 1.0
    return out


def _triangular_coefficients(m: int, stretch: int = 1):
    """ψ(q^stretch) = Σ_{j ≥ 0} q^{stretch·j(j+1)/2} at indices ``0 … m`` (float64)."""
    np = _numpy()
    out = np.zeros(m + 1, dtype=np.float64)
    j = np.arange(0, math.isqrt(2 * (m // stretch)) + 2, dtype=np.int64)
    t = stretch * (j * (j + 1) // 2)
    out[t[t <= m]] = 1.0
    return out


def _fft_length(m: int) -> int:
    return 1 << max(m - 1, 1).bit_length()


def _rounded(x, what: str) -> tuple[Any, float]:
    """``(x rounded to int32, largest rounding distance)``; refuses a distance ≥ 1/4."""
    np = _numpy()
    r = np.rint(x)
    err = float(np.max(np.abs(x - r))) if len(x) else 0.0
    if err >= ROUNDING_TOLERANCE:  # pragma: no cover - far from happening at these sizes
        raise ArithmeticError(f"FFT rounding error {err:.3g} in {what} exceeds {ROUNDING_TOLERANCE}")
    return r.astype(np.int32), err


@dataclass(frozen=True, eq=False)
class ThreeSquareSeries:
    """``P3[j] = [q^j] ψ³`` (``j ≤ (top3 − 3)/8``), ``A1[j] = [q^j] ψ(q²)θ²`` and
    ``A2[j] = [q^j] ψ(q²)²θ`` (``j ≤ (top12 − 1)/4``) as int32 arrays, and the largest
    rounding distance seen."""

    top3: int
    top12: int
    P3: Any
    A1: Any
    A2: Any
    rounding_error: float

    def covers(self, top3: int, top12: int) -> bool:
        return self.top3 >= top3 and self.top12 >= top12

    def r3(self, n):
        """``r₃(n)`` for an int64 array of ``n ≢ 0 (mod 4)`` within the computed tops."""
        np = _numpy()
        out = np.zeros(n.shape, dtype=np.int64)
        c = n % 8
        s = c == 3
        out[s] = 8 * self.P3[(n[s] - 3) >> 3].astype(np.int64)
        s = (c == 1) | (c == 5)
        out[s] = 6 * self.A1[(n[s] - 1) >> 2].astype(np.int64)
        s = (c == 2) | (c == 6)
        out[s] = 12 * self.A2[(n[s] - 2) >> 2].astype(np.int64)
        return out


def three_square_series(top3: int, top12: int) -> ThreeSquareSeries:
    """The three products of the module docstring, enough for ``r₃(n)`` at ``n ≡ 3 (mod 8)``,
    ``n ≤ top3``, and at ``n ≡ 1, 2 (mod 4)``, ``n ≤ top12``."""
    np = _numpy()
    M3 = max((top3 - 3) // 8, 0)
    Ma = max((top12 - 1) // 4, 0)
    Mp = max(M3, Ma // 2)  # ψ² is needed up to M3 (for ψ³) and up to Ma/2 (for ψ(q²)²)
    L = _fft_length(2 * Mp + 1)
    spsi = np.fft.rfft(_triangular_coefficients(Mp), L)
    psi2, e1 = _rounded(np.fft.irfft(spsi * spsi, L)[: Mp + 1], "ψ²")
    t = np.fft.rfft(psi2[: M3 + 1].astype(np.float64), L)
    t *= spsi
    del spsi
    P3, e2 = _rounded(np.fft.irfft(t, L)[: M3 + 1], "ψ³")
    del t
    La = _fft_length(2 * Ma + 1)
    stheta = np.fft.rfft(_theta_coefficients(Ma), La)
    r2, e3 = _rounded(np.fft.irfft(stheta * stheta, La)[: Ma + 1], "θ²")
    t = np.fft.rfft(r2.astype(np.float64), La)
    del r2
    t *= np.fft.rfft(_triangular_coefficients(Ma, 2), La)
    A1, e4 = _rounded(np.fft.irfft(t, La)[: Ma + 1], "ψ(q²)θ²")
    sq = np.zeros(Ma + 1, dtype=np.float64)
    sq[::2] = psi2[: Ma // 2 + 1]
    del psi2
    t = np.fft.rfft(sq, La)
    t *= stheta
    del stheta, sq
    A2, e5 = _rounded(np.fft.irfft(t, La)[: Ma + 1], "ψ(q²)²θ")
    return ThreeSquareSeries(top3, top12, P3, A1, A2, max(e1, e2, e3, e4, e5))


_CACHE: list = []
_LOCK = threading.Lock()


def cached_series(top3: int, top12: int) -> ThreeSquareSeries:
    """:func:`three_square_series` covering the tops, kept per process (the chunks of one
    build, largest first, then reuse the first chunk's series; threads of one Dask worker
    share it)."""
    with _LOCK:
        if _CACHE and _CACHE[0].covers(top3, top12):
            return _CACHE[0]
        if _CACHE:  # grow by at least a quarter: a rising sequence of chunks recomputes rarely
            top3 = max(top3, _CACHE[0].top3 + _CACHE[0].top3 // 4)
            top12 = max(top12, _CACHE[0].top12 + _CACHE[0].top12 // 4)
            _CACHE.clear()
        s = three_square_series(top3, top12)
        _CACHE.append(s)
        return s


def r3_upto(N: int) -> tuple[Any, float]:
    """``(r₃(0..N) as int32, largest rounding distance)`` from the three series."""
    np = _numpy()
    s = three_square_series(N, N)
    out = np.zeros(N + 1, dtype=np.int32)
    out[0] = 1
    n = np.arange(N + 1, dtype=np.int64)
    odd4 = n % 4 != 0
    out[odd4] = s.r3(n[odd4])
    k = np.zeros(N + 1, dtype=np.int64)
    q = 4
    while q <= N:
        k[q::q] += 1
        q *= 4
    m = n >> (2 * k)
    four = (n % 4 == 0) & (n > 0)
    out[four] = out[m[four]]  # r₃(4^k·m) = r₃(m)
    return out, s.rounding_error
