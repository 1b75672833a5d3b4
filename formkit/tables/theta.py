"""Class numbers from the theta series of the sum of three squares.

*The relation.*  Let ``r₃(n)`` be the number of ``(x, y, z) ∈ ℤ³`` with
``x² + y² + z² = n`` (the coefficients of ``θ(q)³``, ``θ = Σ_k q^{k²}``) and ``H(n)`` the
Hurwitz class number: the number of classes of positive definite forms (not necessarily
primitive) of discriminant ``−n``, the classes of ``a·(x² + y²)`` counted ½ and of
``a·(x² + xy + y²)`` counted ⅓ (``H(n) = 0`` unless ``n ≡ 0, 3 mod 4``).  Gauss's
three-squares theorem in Hurwitz's form (Gauss, *Disquisitiones* art. 291–292; Cohen
GTM 138 §5.3 and Zagier's note on Eisenstein series of weight 3/2 — theorem numbers not
recalled, from memory) reads, for ``n ≥ 1``,

    ``r₃(n) = 12·(H(4n) − 2·H(n))``.

Checked at ``n = 1, 2, 3, 4`` by hand: ``H(4) = ½, H(8) = 1, H(3) = ⅓, H(12) = 4/3,
H(16) = 3/2`` give ``6, 12, 8, 6``.  What the relation determines:

* ``n ≡ 1, 2 (mod 4)``: ``H(n) = 0``, so ``H(4n) = r₃(n)/12``;
* ``n ≡ 0 (mod 4)``: ``H(4n) = r₃(n)/12 + 2·H(n)``, a recursion in powers of 4;
* ``n ≡ 3 (mod 8)``: the order of conductor 2 gives ``H(4n) = (3 − χ(2))·H(n) = 4·H(n)``
  (``χ(2) = −1``; the class number formula for orders, Cox Theorem 7.24 — number from
  memory), hence
  ``H(n) = r₃(n)/24``;
* ``n ≡ 7 (mod 8)``: ``χ(2) = 1`` gives ``H(4n) = 2·H(n)`` and ``r₃(n) = 0`` (Legendre):
  the relation says nothing.  These ``n`` and ``4^k·n`` are exactly the discriminants
  ``−n`` whose fundamental discriminant is ``≡ 1 (mod 8)``.

So the theta series gives ``H`` — hence, by removing non-maximal orders, ``h`` — of every
discriminant whose fundamental discriminant is ``≢ 1 (mod 8)``, unconditionally.  For
the other third of the discriminants ``H(n)`` (``n ≡ 7 mod 8``) is the number of all
reduced forms of discriminant ``−n``, counted by the sweep of
:mod:`formkit.tables.sweep` on the class ``n ≡ 3 (mod 4)`` only, and ``H(4^k n) = 2^k H(n)``.

*Removing non-maximal orders.*  Every form of content ``g`` is ``g`` times a primitive
form of discriminant ``−n/g²``, so ``H(n) = Σ_{g² | n} h_w(−n/g²)`` with
``h_w(D) = h(D)/(w(D)/2)`` (``h_w(−3) = ⅓``, ``h_w(−4) = ½``, else ``h``) and ``h_w = 0``
off the discriminants; Möbius inversion gives ``h_w(−n) = Σ_{g² | n} μ(g)·H(n/g²)``.  All
of this is done on the integers ``6·H(n)``.

*The convolution.*  ``r₂ = θ·θ`` and ``r₃ = θ·r₂`` are computed by a blocked real FFT
(numpy, float64): the coefficients ``0 … N`` are cut into blocks of ``B`` and the product
of block ``i`` of one factor with block ``j`` of the other, an FFT of length ``2B``, lands
in output blocks ``i + j`` and ``i + j + 1``; only ``O(B)`` floats are in memory at once.
Every coefficient is an integer; each block is rounded and the largest distance to the
nearest integer is checked to be below ``1/4`` (it is about ``10⁻⁹`` in practice), else
:class:`ArithmeticError`.  The worst distance seen is reported with the result.

References
----------
.. [1] C. F. Gauss, *Disquisitiones Arithmeticae*, 1801, art. 291–292.
.. [2] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.3 (Hurwitz class numbers), Algorithm 5.3.5.
.. [3] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, Theorem 7.24.
.. [4] A. S. Mosunov and M. J. Jacobson Jr., "Unconditional class group tabulation of
       imaginary quadratic fields to |Δ| < 2⁴⁰", Math. Comp. 85 (2016), 1983–2009.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction

from ..core.arith import as_int
from ..core.progress import phase
from ..errors import FormkitError
from .sweep import _count_class_np, _mobius_table, _need_numpy, _numpy

__all__ = [
    "HurwitzNumbers",
    "hurwitz_class_numbers",
    "class_numbers_by_theta",
    "determined_by_theta",
    "three_square_counts",
]

#: Default FFT block (coefficients per block); 2^24 coefficients, transforms of length 2^25.
THETA_BLOCK = 1 << 24

#: Memory allowed for cached block spectra.
SPECTRUM_CACHE_BYTES = 2 << 30

#: Largest allowed distance of an FFT coefficient to the nearest integer.
ROUNDING_TOLERANCE = 0.25


def _theta_block(i0: int, i1: int):
    """Coefficients of θ = Σ_{k ∈ ℤ} q^{k²} at indices ``i0 ≤ i < i1``."""
    np = _numpy()
    out = np.zeros(i1 - i0, dtype=np.float64)
    k0 = math.isqrt(max(i0 - 1, 0)) if i0 > 0 else 0
    ks = np.arange(k0, math.isqrt(max(i1 - 1, 0)) + 1, dtype=np.int64)
    sq = ks * ks
    sel = (sq >= i0) & (sq < i1)
    out[sq[sel] - i0] = np.where(ks[sel] == 0, 1.0, 2.0)
    return out


class _BlockedProduct:
    """Coefficients ``0 … N`` of ``a·b`` for two series given block by block."""

    def __init__(self, a_block, b_block, N: int, B: int) -> None:
        self.a_block, self.b_block, self.N, self.B = a_block, b_block, N, B
        self.max_error = 0.0
        self._spectra: dict = {}

    def _spectrum(self, which: str, j: int):
        key = (which, j)
        s = self._spectra.get(key)
        if s is None:
            np = _numpy()
            lo = j * self.B
            hi = min(lo + self.B, self.N + 1)
            blk = (self.a_block if which == "a" else self.b_block)(lo, hi)
            s = np.fft.rfft(blk, 2 * self.B)
            if (len(self._spectra) + 1) * 16 * self.B > SPECTRUM_CACHE_BYTES:
                self._spectra.clear()  # keep memory bounded (recomputed on demand)
            self._spectra[key] = s
        return s

    def block(self, m: int):
        """Integer coefficients at indices ``mB … min((m+1)B, N+1) − 1`` (int64)."""
        np = _numpy()
        B = self.B
        acc = np.zeros(B + 1, dtype=np.complex128)  # rfft length of 2B
        out = np.zeros(B, dtype=np.float64)
        for s in (m, m - 1):  # pairs with i + j = s land in blocks s and s+1
            if s < 0:
                continue
            acc[:] = 0
            for i in range(s + 1):
                acc += self._spectrum("a", i) * self._spectrum("b", s - i)
            full = np.fft.irfft(acc, 2 * B)
            out += full[:B] if s == m else full[B:]
        hi = min(B, self.N + 1 - m * B)
        out = out[:hi]
        rounded = np.rint(out)
        err = float(np.max(np.abs(out - rounded))) if hi else 0.0
        self.max_error = max(self.max_error, err)
        if err >= ROUNDING_TOLERANCE:
            raise ArithmeticError(
                f"FFT rounding error {err:.3g} at block {m} exceeds {ROUNDING_TOLERANCE}; use a smaller block"
            )
        return rounded.astype(np.int64)


#: Up to this N, θ³ is one FFT of length ≥ 3N + 1 (cubing the spectrum); beyond, blocks.
SINGLE_FFT_LIMIT = 1 << 24


def _r3_single(N: int) -> tuple:
    """θ³ up to ``N`` by one real FFT of length ``M > 3N`` (no wrap-around reaches ``0…N``)."""
    np = _numpy()
    M = 1 << (3 * N + 1).bit_length()
    s = np.fft.rfft(_theta_block(0, N + 1), M)
    s = s * s * s
    out = np.fft.irfft(s, M)[: N + 1]
    rounded = np.rint(out)
    err = float(np.max(np.abs(out - rounded)))
    if err >= ROUNDING_TOLERANCE:  # pragma: no cover - far from happening at these sizes
        raise ArithmeticError(f"FFT rounding error {err:.3g} exceeds {ROUNDING_TOLERANCE}")
    return rounded.astype(np.int32), err


def _r3_upto(N: int, block: int | None = None) -> tuple:
    """``(r₃(0..N) as int32, largest rounding distance)``: one FFT for small ``N`` (or
    ``block=0``), else two blocked FFT products ``θ·θ`` and ``θ·r₂``."""
    np = _numpy()
    if (block is None and N <= SINGLE_FFT_LIMIT) or block == 0:
        r3, err = _r3_single(N)
        if N >= 7 and r3[7::8].any():  # pragma: no cover - Legendre, see below
            raise ArithmeticError("θ³ has a nonzero coefficient at n ≡ 7 (mod 8); FFT result rejected")
        return r3, err
    B = max(16, min(block or THETA_BLOCK, N + 1))
    B = 1 << (B - 1).bit_length()  # a power of two (fast FFT lengths)
    r2 = np.zeros(N + 1, dtype=np.int32)
    p2 = _BlockedProduct(_theta_block, _theta_block, N, B)
    nblocks = N // B + 1
    for m in range(nblocks):
        r2[m * B : m * B + B] = p2.block(m)
    p2._spectra.clear()

    def r2_block(lo: int, hi: int):
        return r2[lo:hi].astype(np.float64)

    r3 = np.zeros(N + 1, dtype=np.int32)
    p3 = _BlockedProduct(_theta_block, r2_block, N, B)
    for m in range(nblocks):
        r3[m * B : m * B + B] = p3.block(m)
    if N >= 7 and r3[7::8].any():  # Legendre: no n ≡ 7 (mod 8) is a sum of three squares
        raise ArithmeticError("θ³ has a nonzero coefficient at n ≡ 7 (mod 8); FFT result rejected")
    return r3, max(p2.max_error, p3.max_error)


def three_square_counts(bound: int, *, block: int | None = None) -> list[int]:
    """``r₃(n)``, the number of ``(x, y, z) ∈ ℤ³`` with ``x² + y² + z² = n``, for ``0 ≤ n ≤ bound``.

    Computed as the coefficients of ``θ(q)³`` by blocked FFT with a checked rounding
    error (module docstring).

    Examples
    --------
    >>> three_square_counts(12)
    [1, 6, 12, 8, 6, 24, 24, 0, 12, 30, 24, 24, 8]
    """
    bound = as_int(bound, "bound")
    if bound < 0:
        raise FormkitError(f"bound must be ≥ 0, not {bound}")
    _need_numpy()
    return _r3_upto(bound, block)[0].tolist()


def _six_hurwitz(N: int, *, complete: bool = True, block: int | None = None):
    """``(6·H(0..N) as int64, known mask, rounding error)``; ``6·H(0) = −½`` is stored as 0.

    With ``complete`` the values the theta series leaves open (``n = 4^k·m``,
    ``m ≡ 7 mod 8``) are filled in from the sweep; otherwise they are ``−1`` and
    ``known`` is False there.
    """
    np = _numpy()
    big = N >= 5_000_000
    if big:
        phase(f"theta series: r3(n) for n <= {N} by FFT")
    r3, err = _r3_upto(N, block)
    if big and complete:
        phase("theta series: H(n) for n = 7 (mod 8) by counting reduced forms")
    T = np.zeros(N + 1, dtype=np.int64)  # T(n) = 6·H(n)
    # n ≡ 3 (mod 8): H(n) = r₃(n)/24, so 6H = r₃/4
    T[3::8] = r3[3::8] // 4
    if complete and N >= 7:
        # H(m) for m ≡ 7 (mod 8): number of all reduced forms of discriminant −m
        kL, kH = 1, (N - 3) // 4  # m = 4k + 3, k odd
        rr = _count_class_np(kL, kH, 3).astype(np.int64)
        T[7::8] = 6 * rr[::2]
    else:
        T[7::8] = -1
    # H(4n) = r₃(n)/12 + 2H(n) ⇒ T(4n) = r₃(n)/2 + 2T(n), in increasing n
    lim = N // 4
    if lim >= 1:
        m = np.arange(1, lim + 1, dtype=np.int64)
        # process level by level: T(4n) needs T(n), and n < 4n
        pos = 1
        while pos <= lim:
            top = min(lim, 4 * pos - 1)  # n in [pos, top] only need T(n) with n < 4·pos
            idx = m[pos - 1 : top]
            T[4 * idx] = r3[idx] // 2 + 2 * T[idx]
            pos = top + 1
    known = np.ones(N + 1, dtype=bool)
    if not complete:  # n = 4^k·m, m ≡ 7 (mod 8)  ⇔  n ≡ 7·4^k (mod 8·4^k)
        q = 1
        while 7 * q <= N:
            known[7 * q :: 8 * q] = False
            q *= 4
        T[~known] = -1
    T[0] = 0
    T[1::4] = 0
    T[2::4] = 0
    return T, known, err


@dataclass(frozen=True)
class HurwitzNumbers:
    """Hurwitz class numbers ``H(n)`` for ``1 ≤ n ≤ bound`` and how they were obtained.

    ``values[n]`` is ``H(n)`` as a :class:`fractions.Fraction` (``values[0]`` is
    ``−1/12`` by convention); ``from_sweep`` counts the ``n = 4^k·m``, ``m ≡ 7 (mod 8)``,
    taken from the reduced-form sweep; ``rounding_error`` is the largest distance of an
    FFT coefficient to its integer (the result is exact when it is below ``1/4``).
    """

    bound: int
    values: tuple[Fraction, ...]
    from_sweep: int
    rounding_error: float

    @property
    def provenance(self) -> str:
        """How the values were obtained (one sentence)."""
        return (
            f"unconditional: r₃(n) = 12(H(4n) − 2H(n)) with θ³ by FFT (largest rounding "
            f"distance {self.rounding_error:.1e} < 1/4), and {self.from_sweep} values with "
            "n = 4^k·m, m ≡ 7 (mod 8), by counting reduced forms"
        )

    def __repr__(self) -> str:
        return f"HurwitzNumbers(bound={self.bound}; {self.provenance})"

    def _first(self) -> list[tuple[int, Fraction]]:
        return [(n, self.values[n]) for n in range(1, min(self.bound, 12) + 1)]

    def _repr_html_(self) -> str:
        import html

        vals = ", ".join(f"H({n}) = {v}" for n, v in self._first())
        more = " …" if self.bound > 12 else ""
        return (
            f"Hurwitz class numbers H(n), 1 ≤ n ≤ {self.bound}: {html.escape(vals)}{more}"
            f"<br><small>{html.escape(self.provenance)}</small>"
        )

    def _repr_latex_(self) -> str:
        def frac(v: Fraction) -> str:
            return str(v.numerator) if v.denominator == 1 else rf"\tfrac{{{v.numerator}}}{{{v.denominator}}}"

        vals = r",\ ".join(f"H({n}) = {frac(v)}" for n, v in self._first())
        more = r",\ \ldots" if self.bound > 12 else ""
        return f"${vals}{more}$ ({self.provenance})"


def hurwitz_class_numbers(bound: int, *, block: int | None = None) -> HurwitzNumbers:
    """Hurwitz class numbers ``H(0), …, H(bound)`` from the theta series of three squares.

    Parameters
    ----------
    bound : int
        The largest ``n`` (``≥ 0``).
    block : int, optional
        FFT block length (default :data:`THETA_BLOCK`).

    Returns
    -------
    HurwitzNumbers

    Raises
    ------
    FormkitError
        If ``bound`` is negative.

    Examples
    --------
    >>> H = hurwitz_class_numbers(23)
    >>> [str(H.values[n]) for n in (3, 4, 7, 8, 11, 12, 15, 16, 20, 23)]
    ['1/3', '1/2', '1', '1', '1', '4/3', '2', '3/2', '2', '3']

    References
    ----------
    Gauss, *Disquisitiones* art. 291–292 (three squares); Cohen GTM 138 §5.3.
    """
    bound = as_int(bound, "bound")
    if bound < 0:
        raise FormkitError(f"bound must be ≥ 0, not {bound}")
    _need_numpy()
    T, _, err = _six_hurwitz(bound, complete=True, block=block)
    vals = [Fraction(int(t), 6) for t in T.tolist()]
    vals[0] = Fraction(-1, 12)
    nseven = sum(1 for n in range(1, bound + 1) if _odd_part_4(n) % 8 == 7)
    return HurwitzNumbers(bound, tuple(vals), nseven, err)


def _odd_part_4(n: int) -> int:
    while n and n % 4 == 0:
        n //= 4
    return n


def determined_by_theta(D: int) -> bool:
    """True if the relation ``r₃(n) = 12(H(4n) − 2H(n))`` alone gives ``h(D)``, ``D < 0``:
    exactly when the fundamental discriminant of ``D`` is ``≢ 1 (mod 8)``.

    Examples
    --------
    >>> [determined_by_theta(D) for D in (-3, -4, -7, -15, -28, -31, -112, -8, -23)]
    [True, True, False, False, False, False, False, True, False]
    """
    D = as_int(D, "D")
    if D >= 0 or D % 4 not in (0, 1):
        raise FormkitError(f"D must be a negative discriminant (≡ 0, 1 mod 4), not {D}")
    return _odd_part_4(-D) % 8 != 7


def _class_numbers_from_hurwitz(T, L: int, H: int):
    """``h(−n)`` for ``n ∈ [L, H]`` from ``T = 6·H(0..H)`` by Möbius inversion (int64; 0 off
    discriminants, −1 where an input is unknown)."""
    np = _numpy()
    W = H - L + 1
    acc = np.zeros(W, dtype=np.int64)
    bad = np.zeros(W, dtype=bool)
    gmax = math.isqrt(H)
    mu = _mobius_table(max(gmax, 1))
    for g in range(1, gmax + 1):
        if mu[g] == 0:
            continue
        g2 = g * g
        mlo, mhi = max(-(-L // g2), 1), H // g2
        if mlo > mhi:
            continue
        vals = T[mlo : mhi + 1]
        first = g2 * mlo - L
        sl = slice(first, first + g2 * (mhi - mlo) + 1, g2)
        acc[sl] += mu[g] * vals
        bad[sl] |= vals < 0
    # 6·h_w(−n); h_w(−3) = 1/3, h_w(−4) = 1/2
    h = acc // 6
    for n0, hv in ((3, 1), (4, 1)):
        if L <= n0 <= H:
            h[n0 - L] = hv
    h[bad] = -1
    return h


def class_numbers_by_theta(start: int, stop: int, *, complete: bool = True, block: int | None = None) -> dict:
    """Class numbers ``h(D)`` of the negative discriminants ``start ≤ D ≤ stop`` by theta series.

    ``H(n)`` for all ``n ≤ −start`` from ``r₃`` (module docstring), then the non-maximal
    orders removed by Möbius inversion.  The theta series alone gives every ``D`` whose
    fundamental discriminant is ``≢ 1 (mod 8)``; with ``complete`` (default) the others
    come from the reduced-form sweep, otherwise they are left out.

    Parameters
    ----------
    start, stop : int
        The range, inclusive (only ``D ≤ −3`` are counted).
    complete : bool
        Also give the discriminants with fundamental part ``≡ 1 (mod 8)``.
    block : int, optional
        FFT block length.

    Returns
    -------
    dict
        ``{D: h(D)}`` in order of increasing ``|D|``.

    Raises
    ------
    FormkitError
        If ``start > stop``.

    Examples
    --------
    >>> class_numbers_by_theta(-24, -3)
    {-3: 1, -4: 1, -7: 1, -8: 1, -11: 1, -12: 1, -15: 2, -16: 1, -19: 1, -20: 2, -23: 3, -24: 2}
    >>> class_numbers_by_theta(-32, -20, complete=False)   # −23, −28, −31: d_K ≡ 1 (mod 8)
    {-20: 2, -24: 2, -27: 1, -32: 2}

    References
    ----------
    Mosunov and Jacobson, Math. Comp. 85 (2016) (the method at scale); Gauss,
    *Disquisitiones* art. 291–292.
    """
    start, stop = as_int(start, "start"), as_int(stop, "stop")
    if start > stop:
        raise FormkitError(f"the range start must not exceed its end, not start={start} > stop={stop}")
    _need_numpy()
    L, H = max(3, -stop), -start
    if L > H:
        return {}
    h = class_number_array(L, H, complete=complete, block=block)
    out = {}
    for n, v in zip(range(L, H + 1), h.tolist()):
        if n % 4 in (0, 3) and v >= 0:
            out[-n] = v
    return out


def class_number_array(L: int, H: int, *, complete: bool = True, block: int | None = None):
    """``h(−n)`` for ``n ∈ [L, H]`` as an int64 array (0 off discriminants, −1 if unknown)."""
    T, _, _ = _six_hurwitz(H, complete=complete, block=block)
    return _class_numbers_from_hurwitz(T, L, H)
