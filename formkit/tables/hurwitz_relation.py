"""Hurwitz class numbers ``H(n)``, ``n ≡ 7 (mod 8)``, from the Kronecker–Hurwitz relation.

These are the ``n`` the three-squares relation of :mod:`formkit.tables.theta` says nothing
about (``r₃(n) = 0``, ``H(4n) = 2H(n)``).  Three classical identities determine them.

* The Kronecker–Hurwitz class number relation (Hurwitz 1885; Zagier 1975; Cohen GTM 138
  §5.3 — exact statement from memory, checked by hand at ``n = 1, 2`` and against
  enumeration in the tests): for ``n ≥ 1``, with ``H(0) = −1/12``,
  ``Σ_{t ∈ ℤ, t² ≤ 4n} H(4n − t²) = 2σ(n) − λ(n)``,  ``λ(n) = Σ_{d | n} min(d, n/d)``.
* Gauss's three squares in Hurwitz's form, ``r₃(m) = 12(H(4m) − 2H(m))`` for ``m ≥ 1``,
  which also holds at ``m = 0`` (``r₃(0) = 1``: ``1/12 − 2/12 = H(0)``).
* Jacobi's four squares, ``r₄(n) = 8σ(n) − 32σ(n/4)`` (``σ(n/4) = 0`` when ``4 ∤ n``;
  from memory, checked by brute force in the tests).

*Derivation* (done here).  Split the relation for ``4n`` by the parity of ``t`` and put
``S(n) = Σ_u H(4(n − u²))`` (the even ``t = 2u``), ``O(n) = Σ_{t odd} H(4n − t²)``,
``P(n) = Σ_u H(n − u²)``.  The three-squares identity summed over ``u`` gives
``S(n) = r₄(n)/12 + 2P(n)``.  ``P(n) = 0`` for ``n ≡ 2 (mod 4)`` (every ``n − u²`` is
``≡ 1, 2 mod 4``), and for ``n = 4m`` the even and odd ``u`` give ``P(4m) = S(m) + O(m)``,
the whole relation at ``m``.  For ``n = 2k`` every odd ``t = 2j + 1`` lands on
``8k − t² = 8(k − T_j) − 1``, ``T_j = j(j+1)/2``; so with ``G(k) = H(8k − 1)`` (``G(0) = 0``)
``O(2k) = 2·Σ_{j ≥ 0} G(k − T_j)`` and, after ``r₄``,

    ``Σ_{j ≥ 0} G(k − T_j) = c(k)``,
    ``6c(k) = 4σ(2k) − 3λ(2k) − [2 | k]·(4σ(k/2) − 6λ(k/2))``.

The right side is elementary; no class number appears on it.  (``k = 1, 2, 3, 4``:
``c = 1, 3, 5, 7 = H(7), H(15) + H(7), H(23) + H(15), H(31) + H(23) + H(7)``.)  In series,
``G(q)·ψ(q) = C(q)`` with Gauss's triangular series ``ψ = Σ_j q^{T_j}``, ``ψ(0) = 1``: ``G`` is
``C`` divided by ``ψ``.  ``4σ(n) − 3λ(n)`` and ``4σ(m) − 6λ(m)`` come from one sieve over
the divisor pairs ``d < e``, ``de = n`` (``d ≤ √n``), segment by segment.

*The division, exactly.*  ``1/ψ`` has integer coefficients that grow like ``exp(c√k)``
(``ψ = (q²; q²)²_∞/(q; q)_∞`` by Gauss's product, so ``1/ψ`` grows like a partition
function), so it is never formed over ℤ.  The quotient is built from left to right by divide and conquer
(the "relaxed"/online order): for a block ``[lo, hi)`` the left half is solved, its
contribution ``Σ G(i)·ψ(k − i)`` to the right half is added by one real FFT of length
``hi − lo`` (a middle product: the wrap-around only hits the left half), then the right
half is solved.  Here ``0 ≤ G < 2^30`` and ``ψ ∈ {0, 1}``, every coefficient is an integer
below ``2^45``, and each rounded coefficient's distance to its integer is checked to be
below ``1/4``.  A leaf of ``W`` coefficients, whose contributions from the left are then
all in, is solved modulo the prime ``p = 2^30 − 35``: ``G ≡ (1/ψ mod p, q^W)·(C − acc)``,
the inverse computed once by Newton's iteration modulo ``p``, the products by FFT on two
balanced 15-bit limbs (rounding checked the same way).  Since only ``C − acc`` modulo
``p`` enters a leaf, the running sums ``acc`` are kept modulo ``p`` (int32); the middle
products longer than ``2^23`` are cut into blocks of ``2^22``
(:mod:`formkit.tables.blocked_convolution`: the same integers, each block rounded and
checked), so the memory stays near 3.6 GB at ``N = 10^9`` (one transform of ``2^27``
points held about 7 GB).  The residue determines ``G``
because ``0 ≤ H(n) < p`` for ``n < 6·10^9``: ``H(n)`` is at most the number of reduced
forms ``(a, b, c)``, ``|b| ≤ a ≤ c``, of discriminant ``−n``; then ``3a² ≤ n`` and ``b``, of
the parity of ``n``, takes at most ``a + 1`` values, so
``H(n) ≤ Σ_{a ≤ A} (a + 1) = A(A + 3)/2``, ``A = ⌊√(n/3)⌋`` (proved here).  Every value is
checked against ``1 ≤ G(k) ≤ A(A + 3)/2`` (the form ``x² + xy + 2k·y²`` gives ``G(k) ≥ 1``)
and every ``6c(k)`` against divisibility by 6.

References
----------
.. [1] A. Hurwitz, "Über Relationen zwischen Classenanzahlen binärer quadratischer
       Formen von negativer Determinante", Math. Ann. 25 (1885), 157–196 (pages from memory).
.. [2] D. Zagier, "Nombres de classes et formes modulaires de poids 3/2", C. R. Acad.
       Sci. Paris 281 (1975), 883–886 (pages from memory).
.. [3] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.3 (Hurwitz class numbers).
.. [4] C. G. J. Jacobi, *Fundamenta nova theoriae functionum ellipticarum*, 1829 (four
       squares).
.. [5] J. van der Hoeven, "Relax, but don't be too lazy", J. Symbolic Comput. 34 (2002),
       479–542 (online multiplication and division; pages from memory).
"""

from __future__ import annotations

import math
import threading
from typing import Any

from ..core.arith import as_int
from ..errors import FormkitError
from . import blocked_convolution as _blocked
from .blocked_convolution import blocked_convolution, dense_block, sparse_block
from .sweep import _need_numpy, _numpy

__all__ = ["hurwitz_seven"]

#: The prime of the leaf solves (``2^30 − 35``; primality checked in the tests).
PRIME = (1 << 30) - 35

#: Largest ``n`` for which ``A(A + 3)/2 < PRIME`` (the exactness bound of the module docstring).
MAX_N = 6 * 10**9

#: Largest allowed distance of a rounded FFT coefficient to its integer.
ROUNDING_TOLERANCE = 0.25

_LIMB = 15  # bits of the balanced limbs of the leaf product


def _round_checked(x, what: str) -> tuple[Any, float]:
    np = _numpy()
    r = np.rint(x)
    err = float(np.max(np.abs(x - r))) if len(x) else 0.0
    if err >= ROUNDING_TOLERANCE:  # pragma: no cover - far from happening at these sizes
        raise ArithmeticError(f"FFT rounding error {err:.3g} in {what} exceeds {ROUNDING_TOLERANCE}")
    return r.astype(np.int64), err


# ---------------------------------------------------------------------------
# the right side: 6c(k) from a divisor-pair sieve
# ---------------------------------------------------------------------------


def _pair_sieve(lo: int, hi: int, step: int, big: int, small: int, square: int):
    """``Σ_{d·e = step·i, d < e} (big·e + small·d) + [step·i = d²]·square·d`` for
    ``lo ≤ i < hi`` (int64), over the divisor pairs with ``d ≤ √(step·i)``."""
    np = _numpy()
    out = np.zeros(hi - lo, dtype=np.int64)
    nlo, nhi = step * lo, step * (hi - 1)  # the n = step·i of the segment
    for d in range(1, math.isqrt(max(nhi, 0)) + 1):
        # multiples n = d·e of step in [nlo, nhi] with e ≥ d
        g = math.gcd(d, step)
        es = step // g  # e must be a multiple of es
        e0 = max(d, -(-nlo // d))
        e0 += (-e0) % es
        e1 = nhi // d
        if e0 > e1:
            continue
        e = np.arange(e0, e1 + 1, es, dtype=np.int64)
        i0 = d * e0 // step - lo
        sl = slice(i0, i0 + (len(e) - 1) * (d * es // step) + 1, d * es // step)
        out[sl] += big * e + small * d
        if e0 == d:  # n = d²: the pair (d, d) once, with weight square·d
            out[i0] += (square - big - small) * d
    return out


def _six_c(lo: int, hi: int):
    """``6c(k)`` for ``lo ≤ k < hi`` (``lo ≥ 0``; ``c(0) = 0``), checked divisible by 6."""
    np = _numpy()
    x = _pair_sieve(lo, hi, 2, 4, -2, 1)  # 4σ(2k) − 3λ(2k)
    mlo, mhi = (lo + 1) // 2, (hi + 1) // 2  # k = 2m, lo ≤ 2m < hi
    if mlo < mhi:
        y = _pair_sieve(mlo, mhi, 1, 4, -8, -2)  # 4σ(m) − 6λ(m)
        first = 2 * mlo - lo
        x[first : first + 2 * len(y) - 1 : 2] -= y
    if lo == 0:
        x[0] = 0
    if np.any(x % 6):  # pragma: no cover - a failure of the sieve, not of the input
        raise ArithmeticError("6c(k) not divisible by 6: the divisor sieve is wrong")
    return x


# ---------------------------------------------------------------------------
# the division G = C / ψ
# ---------------------------------------------------------------------------


def _triangular_indices(m: int):
    """The triangular numbers ``T_j = j(j+1)/2 < m`` (int64)."""
    np = _numpy()
    j = np.arange(0, math.isqrt(2 * max(m, 1)) + 2, dtype=np.int64)
    t = j * (j + 1) // 2
    return t[t < m]


def _psi_spectrum(w: int):
    """``rfft`` of ψ's coefficients ``0 … w − 1`` at length ``w``."""
    np = _numpy()
    a = np.zeros(w, dtype=np.float64)
    a[_triangular_indices(w)] = 1.0
    return np.fft.rfft(a)


def _balanced(x):
    """``x mod p`` in ``(−p/2, p/2]`` and its two limbs ``x = x1·2^15 + x0``, ``|x0|, |x1| ≤ 2^14``."""
    np = _numpy()
    x = x % PRIME
    x = np.where(x > PRIME // 2, x - PRIME, x)
    x0 = ((x + (1 << (_LIMB - 1))) & ((1 << _LIMB) - 1)) - (1 << (_LIMB - 1))
    x1 = (x - x0) >> _LIMB
    return x0.astype(np.float64), x1.astype(np.float64)


_LEAF: dict = {}


def _mul_low(a, b, n: int) -> tuple[Any, float]:
    """``a·b mod (p, q^n)`` in ``[0, p)`` (int64) for int64 arrays of length ``≥ n``, by FFT
    on the balanced limbs (rounding checked)."""
    np = _numpy()
    a0, a1 = (np.fft.rfft(x, 2 * n) for x in _balanced(a[:n]))
    b0, b1 = (np.fft.rfft(x, 2 * n) for x in _balanced(b[:n]))
    return _combine(a0, a1, b0, b1, n)


def _combine(a0, a1, b0, b1, n: int) -> tuple[Any, float]:
    """The limb products of two spectra (of length ``2n``) put together modulo ``p``."""
    np = _numpy()
    p00, e1 = _round_checked(np.fft.irfft(a0 * b0, 2 * n)[:n], "a product modulo p")
    p01, e2 = _round_checked(np.fft.irfft(a0 * b1 + a1 * b0, 2 * n)[:n], "a product modulo p")
    p11, e3 = _round_checked(np.fft.irfft(a1 * b1, 2 * n)[:n], "a product modulo p")
    shift2 = pow(2, 2 * _LIMB, PRIME)
    g = (p00 % PRIME + ((p01 % PRIME) << _LIMB) % PRIME + (p11 % PRIME) * shift2 % PRIME) % PRIME
    return g, max(e1, e2, e3)


def _leaf_inverse(W: int):
    """Spectra (length ``2W``) of the limbs of ``u = 1/ψ mod (p, q^W)``, by Newton's iteration
    ``u ← u·(2 − ψu)`` modulo ``q^{2m}`` from ``u = 1`` (each step doubles the correct terms)."""
    np = _numpy()
    if W not in _LEAF:
        psi = np.zeros(W, dtype=np.int64)
        psi[_triangular_indices(W)] = 1
        u = np.ones(1, dtype=np.int64)
        m = 1
        while m < W:
            m *= 2
            uu = np.zeros(m, dtype=np.int64)
            uu[: len(u)] = u
            e, _ = _mul_low(psi, uu, m)
            e = (-e) % PRIME
            e[0] = (e[0] + 2) % PRIME
            u, _ = _mul_low(uu, e, m)
        u0, u1 = _balanced(u[:W])
        _LEAF[W] = (np.fft.rfft(u0, 2 * W), np.fft.rfft(u1, 2 * W))
    return _LEAF[W]


def _leaf_solve(rhs, W: int) -> tuple[Any, float]:
    """``(1/ψ)·rhs mod (p, q^W)`` in ``[0, p)`` (int64)."""
    np = _numpy()
    I0, I1 = _leaf_inverse(W)
    r0, r1 = (np.fft.rfft(x, 2 * W) for x in _balanced(rhs))
    return _combine(r0, r1, I0, I1, W)


def _seven_series(
    K: int,
    leaf: int = 1 << 16,
    segment: int = 1 << 22,
    max_block: int | None = None,
    threads: int | None = None,
) -> tuple[Any, float]:
    """``(G(0..K) as int32, largest rounding distance)``, ``G(k) = H(8k − 1)``, by the division
    ``G = C/ψ`` of the module docstring (leaves of ``leaf`` coefficients, ``6c`` sieved in
    segments of ``segment``, the middle products beyond ``2·max_block`` in blocks of
    ``max_block``, :mod:`formkit.tables.blocked_convolution`; default its ``MAX_BLOCK``
    and ``THREADS``)."""
    np = _numpy()
    max_block = max_block or _blocked.MAX_BLOCK
    threads = threads or _blocked.THREADS
    W = 1 << max(min(leaf, K + 1) - 1, 1).bit_length()
    top = W
    while top < K + 1:
        top *= 2
    seg = max(segment // W, 1) * W
    G = np.zeros(top, dtype=np.int32)
    # Σ_{i < leaf start} G(i)ψ(k − i) modulo p (all the leaves use), filled by the middle products
    acc = np.zeros(top, dtype=np.int32)
    psi_block = sparse_block(_triangular_indices(top))
    spectra: dict = {}
    cseg: dict = {}
    worst = [0.0]

    def c_at(lo: int, hi: int):
        s = lo // seg * seg
        if cseg.get("lo") != s:
            cseg.clear()
            cseg["lo"], cseg["c"] = s, _six_c(s, min(s + seg, K + 1)) // 6
        c = cseg["c"][lo - s : hi - s]
        return np.concatenate([c, np.zeros(hi - lo - len(c), dtype=np.int64)])

    def leaf_at(lo: int) -> None:
        g, err = _leaf_solve(c_at(lo, lo + W) - acc[lo : lo + W].astype(np.int64), W)
        worst[0] = max(worst[0], err)
        n = 8 * np.arange(lo, lo + W, dtype=np.int64) - 1
        A = np.sqrt(np.maximum(n, 0) / 3.0).astype(np.int64)
        A = np.where(n >= 3 * (A + 1) ** 2, A + 1, np.where(n < 3 * A * A, A - 1, A))  # ⌊√(n/3)⌋
        valid = (n >= 7) & (n <= 8 * K - 1)
        bad = valid & ((g < 1) | (g > A * (A + 3) // 2))
        if bad.any():  # pragma: no cover - an arithmetic failure, never seen
            k = lo + int(np.argmax(bad))
            raise ArithmeticError(f"H({8 * k - 1}) came out as {int(g[k - lo])}, outside [1, A(A+3)/2]")
        g[~valid] = 0
        G[lo : lo + W] = g

    def solve(lo: int, hi: int) -> None:
        if hi - lo == W:
            leaf_at(lo)
            return
        mid = (lo + hi) // 2
        solve(lo, mid)
        if mid > K:
            return
        w = hi - lo
        if w // 2 > max_block:  # the large middle products in blocks (bounded memory)

            def add(start: int, vals) -> None:
                acc[start : start + len(vals)] = (
                    acc[start : start + len(vals)] + vals.astype(np.int64) % PRIME
                ) % PRIME

            _, err = blocked_convolution(
                dense_block(G[lo:mid]), 0, mid - lo, psi_block, mid - lo, w,
                block=max_block, sink=lambda start, vals: add(lo + start, vals),
                what="a middle product", threads=threads,
            )  # fmt: skip
            worst[0] = max(worst[0], err)
            solve(mid, hi)
            return
        spec = spectra.get(w)
        if spec is None:
            spec = _psi_spectrum(w)
            if w <= top // 4:  # used by several blocks: keep it
                spectra[w] = spec
        f = np.fft.rfft(G[lo:mid].astype(np.float64), w)
        f *= spec
        spec = None  # (memory: the large spectra are not kept)
        out = np.fft.irfft(f, w)[w // 2 :]
        del f
        r = np.rint(out)
        out -= r
        np.abs(out, out=out)
        err = float(out.max())
        del out
        if err >= ROUNDING_TOLERANCE:  # pragma: no cover - far from happening at these sizes
            raise ArithmeticError(
                f"FFT rounding error {err:.3g} in a middle product exceeds {ROUNDING_TOLERANCE}"
            )
        worst[0] = max(worst[0], err)
        acc[mid:hi] = (acc[mid:hi] + r.astype(np.int64) % PRIME) % PRIME
        del r
        solve(mid, hi)

    solve(0, top)
    return G[: K + 1], worst[0]


def seven_memory(
    K: int, *, max_block: int | None = None, threads: int | None = None, segment: int = 1 << 22
) -> int:
    """Peak bytes of :func:`_seven_series` up to ``K``: the quotient and the residues of its
    running sums (int32 each, to a power of two), a segment of the sieve, and the largest
    middle product — in blocks (kept spectra and working buffers) beyond ``2·max_block``,
    else one transform (about five arrays of its length).

    Examples
    --------
    >>> round(seven_memory((10**9 + 1) // 8) / 2**30, 1)   # GiB, at N = 10^9
    3.5
    """
    max_block = max_block or _blocked.MAX_BLOCK
    threads = threads or _blocked.THREADS
    top = 1 << max(K, 1).bit_length()
    whole = 40 * min(top, 2 * max_block)  # the largest middle product done in one transform
    if top // 2 > max_block:
        blocked = _blocked.kept_bytes(top // 2, top // 2, max_block, True) + _blocked.working_bytes(
            max_block, threads
        )
    else:
        blocked = 0
    return 8 * top + 24 * segment + max(whole, blocked)


def seven_bytes(K: int) -> int:
    """Bytes of the quotient kept per process (int32 to a power of two above ``K``)."""
    return 4 * (1 << max(K, 1).bit_length())


# ---------------------------------------------------------------------------
# per-process cache and the public function
# ---------------------------------------------------------------------------

_CACHE: list = []
_LOCK = threading.Lock()


def cached_seven(K: int) -> tuple[Any, float]:
    """``(G(0..K'), rounding distance)`` for some ``K' ≥ K``, kept per process (grows by at
    least a quarter, like the three-squares series)."""
    with _LOCK:
        if _CACHE and len(_CACHE[0][0]) > K:
            return _CACHE[0]
        if _CACHE:
            K = max(K, (len(_CACHE[0][0]) - 1) * 5 // 4)
            _CACHE.clear()
        s = _seven_series(K)
        _CACHE.append(s)
        return s


def seven_values(m):
    """``H(m)`` for an int64 array of ``m ≡ 7 (mod 8)`` (int64), from the cached series."""
    np = _numpy()
    k = (m + 1) >> 3
    G, _ = cached_seven(int(k.max()) if len(k) else 0)
    return G[k].astype(np.int64)


def hurwitz_seven(bound: int) -> dict[int, int]:
    """``H(n)`` for every ``n ≡ 7 (mod 8)``, ``7 ≤ n ≤ bound``, by the Kronecker–Hurwitz relation.

    ``H(n)`` counts all classes of positive definite forms of discriminant ``−n`` (for these
    ``n`` no class is weighted, so ``H(n)`` is an integer).  Computed as in the module
    docstring: ``Σ_j H(8(k − T_j) − 1) = c(k)`` with ``c`` from ``σ`` and ``λ``, solved for
    ``H`` by an exact online division by the triangular series; unconditional.

    Parameters
    ----------
    bound : int
        The largest ``n`` (``0 ≤ bound ≤ 6·10^9``).

    Returns
    -------
    dict
        ``{n: H(n)}`` in increasing ``n``.

    Raises
    ------
    FormkitError
        If ``bound`` is negative or beyond ``6·10^9`` (where the residues modulo
        ``2^30 − 35`` would no longer determine ``H``).

    Examples
    --------
    >>> hurwitz_seven(100)
    {7: 1, 15: 2, 23: 3, 31: 3, 39: 4, 47: 5, 55: 4, 63: 5, 71: 7, 79: 5, 87: 6, 95: 8}

    References
    ----------
    Hurwitz, Math. Ann. 25 (1885); Zagier, C. R. Acad. Sci. Paris 281 (1975); Cohen
    GTM 138 §5.3.
    """
    bound = as_int(bound, "bound")
    if bound < 0 or bound > MAX_N:
        raise FormkitError(f"bound must be in [0, 6·10^9] (exactness modulo 2^30 − 35), not {bound}")
    _need_numpy()
    K = (bound + 1) // 8
    G, _ = _seven_series(K)
    return {8 * k - 1: int(v) for k, v in enumerate(G.tolist()) if k >= 1}
