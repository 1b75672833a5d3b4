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

*How, and exactly.*  ``ψ²`` and ``θ²`` are counted, not transformed: their coefficients
are the numbers of pairs of triangular numbers (of squares) with a given sum, a histogram
per block (:func:`formkit.tables.blocked_convolution.pair_counts`; exact integers).  The
three products with a sparse factor (``ψ²·ψ``, ``θ²·ψ(q²)``, ``ψ(q²)²·θ``) are real FFT
products (numpy, float64) cut into blocks of at most ``2^22`` coefficients, so that the
memory is a bounded number of spectra of ``2^22 + 1`` values beside the results (about
4.5 GB at ``N = 10^9`` where one transform of the whole length needed 10.5 GB;
:mod:`formkit.tables.blocked_convolution`).  Every coefficient is an integer, is rounded,
and the largest distance to the nearest integer is checked to be below ``1/4`` (about
``10⁻¹¹`` in practice), else :class:`ArithmeticError`.  The largest distance seen is
returned with the series.

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

from . import blocked_convolution as _blocked
from .blocked_convolution import block_size, blocked_convolution, dense_block, pair_counts, sparse_block
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


def _triangular_numbers(m: int):
    """The triangular numbers ``j(j+1)/2 ≤ m`` (int64, increasing)."""
    np = _numpy()
    j = np.arange(0, math.isqrt(2 * max(m, 0)) + 2, dtype=np.int64)
    t = j * (j + 1) // 2
    return t[t <= m]


def _squares(m: int, start: int = 0):
    """The squares ``k² ≤ m``, ``k ≥ start`` (int64, increasing)."""
    np = _numpy()
    k = np.arange(start, math.isqrt(max(m, 0)) + 1, dtype=np.int64)
    return k * k


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


def three_square_series(
    top3: int, top12: int, *, max_block: int | None = None, threads: int | None = None
) -> ThreeSquareSeries:
    """The three products of the module docstring, enough for ``r₃(n)`` at ``n ≡ 3 (mod 8)``,
    ``n ≤ top3``, and at ``n ≡ 1, 2 (mod 4)``, ``n ≤ top12``: ``ψ²`` and ``θ²`` by exact
    pair counts, the three products with a sparse factor by blocked transforms of at most
    ``2·max_block`` points (:mod:`formkit.tables.blocked_convolution`; default its
    ``MAX_BLOCK`` and ``THREADS``)."""
    np = _numpy()
    max_block = max_block or _blocked.MAX_BLOCK
    threads = threads or _blocked.THREADS
    M3 = max((top3 - 3) // 8, 0)
    Ma = max((top12 - 1) // 4, 0)
    Mp = max(M3, Ma // 2)  # ψ² is needed up to M3 (for ψ³) and up to Ma/2 (for ψ(q²)²)
    tri = _triangular_numbers(Mp)
    ones = np.ones(1, dtype=np.float64)

    def product(a, length, b, what):
        out = np.empty(length, dtype=np.int32)

        def put(start: int, vals) -> None:
            out[start : start + len(vals)] = vals

        _, err = blocked_convolution(
            a,
            0,
            length,
            b,
            0,
            length,
            block=block_size(length, max_block),
            sink=put,
            what=what,
            threads=threads,
        )
        return out, err

    # θ² = r₂: 4·#{x ≥ 1, y ≥ 0} (the four rotations of that quadrant cover ℤ² ∖ {0})
    r2 = pair_counts(_squares(Ma, 1), _squares(Ma), Ma)
    r2 *= 4
    r2[0] = 1
    A1, e1 = product(dense_block(r2), Ma + 1, sparse_block(2 * tri), "ψ(q²)θ²")
    del r2
    psi2 = pair_counts(tri, tri, Mp)
    if len(psi2) and int(psi2.max()) < 1 << 15:  # (≤ the divisor count of 4n + 1: small) half the memory
        psi2 = psi2.astype(np.int16)
    sq = _squares(Ma)
    theta_weights = np.full(len(sq), 2.0)
    theta_weights[:1] = ones
    A2, e2 = product(dense_block(psi2, 2), Ma + 1, sparse_block(sq, theta_weights), "ψ(q²)²θ")
    P3, e3 = product(dense_block(psi2), M3 + 1, sparse_block(tri), "ψ³")
    del psi2
    return ThreeSquareSeries(top3, top12, P3, A1, A2, max(e1, e2, e3))


def series_memory(top3: int, top12: int, *, max_block: int | None = None, threads: int | None = None) -> int:
    """Peak bytes of :func:`three_square_series` (its arrays, the kept spectra and the working
    buffers of the largest product; the inputs of the interpreter not counted).

    Examples
    --------
    >>> round(series_memory(10**9, 10**9 // 4) / 2**30, 1)   # GiB, at N = 10^9
    4.6
    """
    max_block = max_block or _blocked.MAX_BLOCK
    threads = threads or _blocked.THREADS
    M3 = max((top3 - 3) // 8, 0) + 1
    Ma = max((top12 - 1) // 4, 0) + 1
    Mp = max(M3, Ma // 2 + 1)

    def product(length: int) -> int:
        B = block_size(length, max_block)
        return _blocked.kept_bytes(length, length, B, False) + _blocked.working_bytes(B, threads)

    first = 8 * Ma + product(Ma)  # r₂ and ψ(q²)θ²
    second = 6 * Mp + 8 * Ma + product(Ma)  # ψ² (int32, then int16), the two products to N/16
    third = 2 * Mp + 8 * Ma + 4 * M3 + product(M3)  # and ψ³
    return max(first, second, third)


def series_bytes(top3: int, top12: int) -> int:
    """Bytes of the arrays a :class:`ThreeSquareSeries` keeps."""
    return 4 * (max((top3 - 3) // 8, 0) + 1) + 8 * (max((top12 - 1) // 4, 0) + 1)


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
