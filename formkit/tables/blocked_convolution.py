"""Exact integer convolutions in bounded memory: blocked FFT products and pair counts.

The theta series of :mod:`formkit.tables.three_squares` and the quotient of
:mod:`formkit.tables.hurwitz_relation` multiply series of length up to ``N/8``; one real
FFT of the whole length holds several float64/complex128 arrays of twice that length at
once (about 10 GB at ``N = 10^9``).  Here the same products are cut into blocks whose
transforms have a fixed length, so the memory is that of a few blocks plus the output.

*Blocked products* (:func:`blocked_convolution`).  For ``out[n] = Σ_i a[i]·b[n − i]`` on a
range of ``n``, ``a`` given on a range of ``i``, cut ``a`` and the output into blocks of
``B``: ``a_t = a[a₀ + tB + u]`` and ``n = o₀ + sB + v`` (``0 ≤ u, v < B``).  Then
``n − i = (o₀ − a₀) + (s − t)B + v − u`` with ``|v − u| < B``, so the pair ``(s, t)`` needs
``b`` only on the segment ``β_d[x] = b[(o₀ − a₀) + (d − 1)B + x]``, ``0 ≤ x < 2B``, of
``d = s − t`` (a Toeplitz structure: one segment per difference).  In the cyclic
convolution of length ``2B`` of ``a_t`` (zero-padded) and ``β_d``, position ``B + v`` is
``Σ_u a_t[u]·β_d[B + v − u]`` and ``0 < B + v − u < 2B``: no wrap-around reaches the
positions ``B … 2B − 1``.  So the output block ``s`` is positions ``B … 2B − 1`` of
``irfft(Σ_t rfft(a_t)·rfft(β_{s−t}))`` — one inverse transform per output block, the sum
over ``t`` taken on the spectra.  Spectra are kept (the first few by order of use) up to
a fixed count and recomputed otherwise.  This is the middle product (and the truncated
product as its special case ``a₀ = o₀ = 0``: ``β_d`` for ``d < 0`` is zero) with the
classical overlap-add/overlap-save cutting (Cooley–Tukey transforms; Stockham's
sectioning, from memory).

*Exactness.*  Every output is an integer; every rounded value's distance to the nearest
integer is checked below ``1/4`` (else :class:`ArithmeticError`) and the largest distance
is returned — the check the whole-length products made, now per block.

*Pair counts* (:func:`pair_counts`).  ``#{(p, q) ∈ S₁ × S₂ : p + q = n}`` for sorted sets
of nonnegative integers (the squares, the triangular numbers), counted exactly by a
histogram per output block: the coefficients of ``θ²`` and ``ψ²`` without any
transform (about ``π·m/4`` and ``π·m/2`` pairs up to ``m``).

References
----------
.. [1] J. W. Cooley and J. W. Tukey, "An algorithm for the machine calculation of
       complex Fourier series", Math. Comp. 19 (1965), 297–301.
.. [2] T. G. Stockham, "High-speed convolution and correlation", AFIPS Spring Joint
       Computer Conference 28 (1966), 229–233 (sectioned convolution; details from memory).
.. [3] G. Hanrot, M. Quercia and P. Zimmermann, "The middle product algorithm I",
       Appl. Algebra Engrg. Comm. Comput. 14 (2004), 415–438 (from memory).
"""

from __future__ import annotations

import threading
from collections.abc import Callable
from typing import Any

from .sweep import _numpy

__all__: list = []  # private helpers of formkit.tables.three_squares and .hurwitz_relation

#: Largest allowed distance of a rounded FFT coefficient to its integer.
ROUNDING_TOLERANCE = 0.25

#: Largest block ``B`` (transforms of length ``2B``, 64 MB per spectrum; smaller transforms
#: are also faster per point: measured 4.1 s against 12.0 s for ψ³ at ``N = 10^8`` with
#: blocks of ``2^21`` against one block of ``2^24``).
MAX_BLOCK = 1 << 22

#: Bytes of spectra one product keeps (the rest are recomputed when needed again): all of
#: them up to ``N = 10^9`` (``ψ³`` there: 30 blocks, 60 spectra of 64 MB; :func:`kept_bytes`).
MAX_KEPT_BYTES = 3 << 30


#: Threads of the blocked products (numpy's FFT releases the interpreter lock, so two
#: threads use two cores; 1 by default on a shared machine).
THREADS = 1


def spectrum_bytes(block: int) -> int:
    """Bytes of one spectrum of the blocks ``B`` (``B + 1`` complex128 values)."""
    return 16 * (block + 1)


def working_bytes(block: int, threads: int = 1) -> int:
    """Bytes :func:`blocked_convolution` allocates besides the kept spectra and its output: per
    thread an input block of ``2B`` floats and three spectra (a spectrum not kept, a
    product, a sum), the inverse transform and its rounding, and the FFT's own scratch of
    about one transform."""
    return threads * (16 * block + 3 * spectrum_bytes(block)) + 16 * block + 8 * block + 16 * block


def kept_bytes(a_len: int, o_len: int, block: int, toeplitz: bool) -> int:
    """Bytes of the spectra :func:`blocked_convolution` keeps at most: those of the blocks of
    ``a`` and of the segments of ``b`` alive at once (all ``d ≤ s`` for a truncated product,
    a window of ``na`` differences for a middle product), capped at :data:`MAX_KEPT_BYTES`."""
    na, no = -(-a_len // block), -(-o_len // block)
    nb = min(na, no) if toeplitz else no
    return min((na + nb) * spectrum_bytes(block), MAX_KEPT_BYTES)


Block = Callable[[Any, int], None]  # fill(buffer, lo): buffer[:] = the values at lo … lo + len − 1


def block_size(length: int, max_block: int = MAX_BLOCK) -> int:
    """The block ``B`` for products of ``length`` coefficients: a power of two, the whole
    length below ``max_block`` (one block, as one transform), else ``max_block``."""
    b = 1 << max(length - 1, 1).bit_length()
    return min(b, max_block)


def dense_block(values, stretch: int = 1) -> Block:
    """Blocks of the series ``Σ_k values[k]·q^{stretch·k}`` (zero outside ``0 … stretch·(len − 1)``)."""

    def fill(out, lo: int) -> None:
        out[:] = 0.0
        hi = lo + len(out)
        a, b = max(lo, 0), min(hi, stretch * (len(values) - 1) + 1)
        if a < b:
            first = a + (-a) % stretch
            if first < b:
                out[first - lo : b - lo : stretch] = values[first // stretch : (b - 1) // stretch + 1]

    return fill


def sparse_block(positions, weights=None, end: int | None = None) -> Block:
    """Blocks of ``Σ_j weights[j]·q^{positions[j]}`` (positions sorted, distinct; weight 1 by
    default; nothing at or beyond ``end``)."""
    np = _numpy()

    def fill(out, lo: int) -> None:
        out[:] = 0.0
        hi = lo + len(out)
        top = hi if end is None else min(hi, end)
        i, j = np.searchsorted(positions, [max(lo, 0), max(top, 0)])
        if i < j:
            out[positions[i:j] - lo] = 1.0 if weights is None else weights[i:j]

    return fill


def _rounding_distance(y, r) -> float:
    """Largest ``|y − r|`` (``y`` is overwritten)."""
    np = _numpy()
    y -= r
    np.abs(y, out=y)
    return float(y.max()) if len(y) else 0.0


def blocked_convolution(
    a: Block,
    a_lo: int,
    a_hi: int,
    b: Block,
    o_lo: int,
    o_hi: int,
    *,
    block: int | None = None,
    kept: int = MAX_KEPT_BYTES,
    sink: Callable[[int, Any], None] | None = None,
    what: str = "a product",
    threads: int = 1,
) -> tuple[Any, float]:
    """``out[n] = Σ_{a_lo ≤ i < a_hi} a[i]·b[n − i]`` for ``o_lo ≤ n < o_hi`` (``b`` zero at
    negative indices), by the blocked transforms of the module docstring.

    Returns ``(out as int64, largest rounding distance)``; with ``sink`` each output block
    is handed to ``sink(start, values)`` (rounded float64 values, a buffer reused for the
    next block) instead and ``out`` is None (memory).  ``block`` is the block ``B``
    (default :func:`block_size`), ``kept`` the bytes of spectra kept, ``threads`` the
    threads working on one output block (numpy's FFT releases the interpreter lock).
    """
    np = _numpy()
    B = block or block_size(max(a_hi - a_lo, o_hi - o_lo))
    T = 2 * B
    na = -(-(a_hi - a_lo) // B)
    no = -(-(o_hi - o_lo) // B)
    shift = o_lo - a_lo
    threads = max(1, min(threads, na))
    out = None if sink is not None else np.zeros(max(o_hi - o_lo, 0), dtype=np.int64)
    spectra: dict = {}
    room = [kept // spectrum_bytes(B)]
    lock = threading.Lock()
    # per thread: the input block, a spectrum not kept, the product and the sum of products
    bufs = [
        (np.empty(T), np.empty(B + 1, complex), np.empty(B + 1, complex), np.empty(B + 1, complex))
        for _ in range(threads)
    ]
    y = np.empty(T)
    r = np.empty(B)
    worst = 0.0

    def spectrum(key, buf):
        with lock:
            s = spectra.get(key)
            keep = s is None and room[0] > 0
            if keep:
                room[0] -= 1
        if s is not None:
            return s
        x, free = buf[0], buf[1]
        side, k = key
        if side == "a":
            lo = a_lo + k * B
            x[B:] = 0.0
            a(x[: min(B, a_hi - lo)], lo)
            x[min(B, a_hi - lo) : B] = 0.0
        else:
            b(x, shift + (k - 1) * B)
        s = np.fft.rfft(x, T) if keep else np.fft.rfft(x, T, out=free)
        if keep:
            with lock:
                spectra[key] = s
        return s

    def partial(job):
        i, chunk = job
        buf = bufs[i]
        prod, acc = buf[2], buf[3]
        acc[:] = 0.0
        for t, d in chunk:
            sa = spectrum(("a", t), buf)
            if sa is buf[1]:  # not kept: the second spectrum needs the buffer, so copy it out
                np.copyto(prod, sa)
                sa = prod
            sb = spectrum(("b", d), buf)
            np.multiply(sa, sb, out=prod)
            acc += prod
        return acc

    pool = None
    if threads > 1:
        from concurrent.futures import ThreadPoolExecutor

        pool = ThreadPoolExecutor(max_workers=threads)
    try:
        for s in range(no):
            width = min(B, o_hi - o_lo - s * B)
            pairs = [
                (t, s - t) for t in range(na) if shift + (s - t + 1) * B > 0
            ]  # else β at negative indices
            if not pairs:
                r[:width] = 0.0
            else:
                jobs = [(i, pairs[i::threads]) for i in range(threads) if pairs[i::threads]]
                parts = (
                    list(pool.map(partial, jobs))
                    if pool is not None and len(jobs) > 1
                    else [partial(jobs[0])]
                )
                S = parts[0]
                for p in parts[1:]:
                    S += p
                np.fft.irfft(S, T, out=y)
                np.rint(y[B : B + width], out=r[:width])
                err = _rounding_distance(y[B : B + width], r[:width])
                if err >= ROUNDING_TOLERANCE:  # pragma: no cover - far from happening at these sizes
                    raise ArithmeticError(
                        f"FFT rounding error {err:.3g} in {what} exceeds {ROUNDING_TOLERANCE}"
                    )
                worst = max(worst, err)
            with lock:  # segments of differences below the next output's are not needed again
                for key in [k for k in spectra if k[0] == "b" and k[1] < s + 2 - na]:
                    del spectra[key]
                    room[0] += 1
            if sink is not None:
                sink(o_lo + s * B, r[:width])
            else:
                out[s * B : s * B + width] = r[:width]  # type: ignore[index]
    finally:
        if pool is not None:
            pool.shutdown()
    return out, worst


def pair_counts(first, second, m: int, block: int = 1 << 20):
    """``c[n] = #{(p, q) : p ∈ first, q ∈ second, p + q = n}`` for ``0 ≤ n ≤ m`` (int32), for
    sorted int64 arrays of distinct nonnegative integers; exact (a histogram per block of
    ``block`` outputs)."""
    np = _numpy()
    out = np.zeros(m + 1, dtype=np.int32)
    first = first[first <= m]
    second = second[second <= m]
    for lo in range(0, m + 1, block):
        hi = min(lo + block, m + 1)
        ps = first[first < hi]
        j0 = np.searchsorted(second, lo - ps)
        j1 = np.searchsorted(second, hi - ps)
        lengths = j1 - j0
        total = int(lengths.sum())
        if total == 0:
            continue
        # all q = second[j] with j0[i] ≤ j < j1[i], beside their p: one flat index array
        starts = np.repeat(j0 - np.concatenate([[0], np.cumsum(lengths)[:-1]]), lengths)
        idx = second[np.arange(total, dtype=np.int64) + starts]
        idx += np.repeat(ps - lo, lengths)
        out[lo:hi] = np.bincount(idx, minlength=hi - lo)
    return out
