"""Sweeps behind :mod:`formkit.tables.rows`: class numbers, conductors and genera of all
negative discriminants of a range at once.

*Class numbers.*  Every class of primitive positive definite forms of discriminant
``D = −n < 0`` contains exactly one reduced form ``(a, b, c)``: ``|b| ≤ a ≤ c`` with
``b ≥ 0`` when ``|b| = a`` or ``a = c`` (Cox, Theorem 2.8; Cohen GTM 138,
Definition 5.3.2).  Let ``r(n)`` count *all* reduced forms (any content) of
discriminant ``−n``.  For a fixed ``a`` and ``n = 4k + t`` (``t ∈ {0, 3}``, ``b ≡ t``
mod 2) the form ``(a, b, c)`` has ``k = a·c − (b² + t)/4``, so once ``c ≥ a`` holds
automatically (``n ≥ 4a² + 4a``) the number of forms with first coefficient ``a`` is
a periodic function of ``k`` with period ``a``; numpy adds that pattern to a whole
chunk in one vectorised step.  In the band ``3a² ≤ n < 4a² + 4a`` each ``b`` switches
on at the first ``k`` with ``c ≥ a`` (``c > a`` when ``b < 0``), handled by a running
sum over a ``(rows × a)`` grid.  A form of content ``g`` is ``g`` times a primitive
form of discriminant ``D/g²``, so ``r(n) = Σ_{g² | n} h(−n/g²)`` and, by Möbius
inversion, ``h(−n) = Σ_{g² | n} μ(g)·r(n/g²)``.  This is the classical count of
reduced forms (Gauss; Cohen GTM 138, Algorithm 5.3.5) done for a range at once.

The pure-Python sweep (:func:`_class_numbers_py`) is an independent second
implementation: one arithmetic progression in ``n`` per pair ``(a, b)``, primitivity by
inclusion–exclusion over the square-free divisors of ``gcd(a, b)``.

*Fundamental part, conductor, genera.*  A sieve finds the largest square ``g²``
dividing each ``n`` (then ``D = g²·(−n/g²)`` gives ``d_K`` and ``f``) and the number
``r`` of odd primes dividing ``n``; the number of genera is ``2^(μ−1)`` with ``μ = r``
for ``D ≡ 1 (mod 4)`` and, for ``m = D/4``, ``μ = r, r + 1, r + 1, r + 2`` when
``m ≡ 1 (mod 4)``, ``m ≡ 2, 3 (mod 4)``, ``m ≡ 4 (mod 8)``, ``m ≡ 0 (mod 8)`` (Cox,
Proposition 3.11 and Theorem 3.15, there for ``D = −4n``, i.e. ``m = −n``; for the
narrow classes of ``D > 0`` the same count holds, Buell 1989 Ch. 4, theorem number
not recalled).

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.3, Algorithm 5.3.5.
.. [2] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, Theorem 2.8,
       Proposition 3.11, Theorem 3.15.
.. [3] D. A. Buell, *Binary Quadratic Forms: Classical Theory and Modern
       Computations*, Springer 1989, Ch. 4.
"""

from __future__ import annotations

import math
from functools import lru_cache

from ..errors import FormkitError

_NUMPY: list = []


def _numpy():
    """numpy, imported on first use (keeps ``import formkit`` fast), or None if absent."""
    if not _NUMPY:
        try:  # numpy is a dependency; the pure-Python engine keeps working without it
            import numpy
        except ImportError:  # pragma: no cover - exercised only where numpy is absent
            numpy = None  # type: ignore[assignment]
        _NUMPY.append(numpy)
    return _NUMPY[0]


__all__: list = []  # private helpers of formkit.tables.rows


# ---------------------------------------------------------------------------
# small sieves shared by both engines
# ---------------------------------------------------------------------------


@lru_cache(maxsize=8)
def _mobius_table(n: int) -> tuple[int, ...]:
    """μ(0..n) by a linear sieve."""
    mu = [1] * (n + 1)
    is_comp = [False] * (n + 1)
    primes: list[int] = []
    if n >= 0:
        mu[0] = 0
    for i in range(2, n + 1):
        if not is_comp[i]:
            primes.append(i)
            mu[i] = -1
        for p in primes:
            if i * p > n:
                break
            is_comp[i * p] = True
            if i % p == 0:
                mu[i * p] = 0
                break
            mu[i * p] = -mu[i]
    return tuple(mu)


@lru_cache(maxsize=8)
def _primes_upto(n: int) -> tuple[int, ...]:
    if n < 2:
        return ()
    sieve = bytearray([1]) * (n + 1)
    sieve[0] = sieve[1] = 0
    for p in range(2, math.isqrt(n) + 1):
        if sieve[p]:
            sieve[p * p :: p] = bytearray(len(range(p * p, n + 1, p)))
    return tuple(i for i in range(n + 1) if sieve[i])


def _mu_from_r(m: int, r: int) -> int:
    """μ (number of assigned characters) from D/4 = m (or None-like) and r odd primes."""
    if m % 4 == 1:
        return r
    if m % 4 in (2, 3):
        return r + 1
    if m % 8 == 4:
        return r + 1
    return r + 2


def _genus_count_from_parts(D: int, r: int) -> int:
    """2^(μ−1) from D and the number r of odd primes dividing D (Cox Prop. 3.11)."""
    mu = r if D % 4 == 1 else _mu_from_r(D // 4, r)
    return 1 << (mu - 1)


# ---------------------------------------------------------------------------
# numpy engine
# ---------------------------------------------------------------------------


def _need_numpy() -> None:
    if _numpy() is None:  # pragma: no cover
        raise FormkitError("engine 'numpy' needs numpy (pip install numpy), or use engine='python'")


def _count_all_reduced_np(L: int, H: int):
    """r(n) for n in [L, H]: the number of reduced forms (any content) of disc −n."""
    np = _numpy()
    r = np.zeros(H - L + 1, dtype=np.int32)
    for t in (0, 3):  # n ≡ 0 or 3 (mod 4); r vanishes on the other classes
        kL, kH = -(-(L - t) // 4), (H - t) // 4
        if kL <= kH:
            first = 4 * kL + t - L
            r[first : first + 4 * (kH - kL) + 1 : 4] = _count_class_np(kL, kH, t)
    return r


def _form_starts(a: int, t: int):
    """For first coefficient a and n ≡ t (mod 4): b's residue class of k mod a and the
    first k = (n − t)/4 at which (a, b, c) is reduced (c = a, or c = a + 1 when b < 0)."""
    np = _numpy()
    lo_b = -a + 1 if (-a + 1 - t) % 2 == 0 else -a + 2  # b ≡ t (mod 2), b in (−a, a]
    bs = np.arange(lo_b, a + 1, 2, dtype=np.int64)
    q = (bs * bs + t) // 4  # n = 4ac − b² = 4k + t  <=>  k = a·c − q
    return (-q) % a, a * (a + (bs < 0)) - q


@lru_cache(maxsize=4096)
def _periodic_plan(a: int, t: int):
    """(first k of the band, first k of the periodic part, widened pattern, its period)."""
    np = _numpy()
    res, start = _form_starts(a, t)
    pat = np.bincount(res, minlength=a).astype(np.int32)
    reps = max(1, -(-256 // a))
    ext = np.tile(pat, reps + 1)  # any rotation of the widened pattern is a slice
    return int(start.min()), int(start.max()), ext, a * reps


def _count_class_np(kL: int, kH: int, t: int):
    """r(4k + t) for k in [kL, kH]: for fixed a the count is periodic in k with period a."""
    np = _numpy()
    W = kH - kL + 1
    r = np.zeros(W, dtype=np.int32)
    H = 4 * kH + t
    a = 1
    while 3 * a * a <= H:
        smin, full, ext, Pm = _periodic_plan(a, t)
        S = max(kL, full)  # from S on every b counts
        B = max(kL, smin)
        if B < S and kH >= B:  # the band where forms switch on one b at a time
            P = a
            res, start = _form_starts(a, t)
            top = min(kH, S - 1)
            G0 = B - B % P
            rows = (top - G0) // P + 1
            grid = np.zeros((rows, P), dtype=np.int32)
            before = start < G0
            if before.any():
                grid[0] += np.bincount(res[before], minlength=P).astype(np.int32)
            inside = (start >= G0) & (start <= top)
            if inside.any():
                np.add.at(grid, ((start[inside] - G0) // P, res[inside]), 1)
            for i in range(1, rows):  # running sum down each column
                grid[i] += grid[i - 1]
            r[B - kL : top - kL + 1] += grid.ravel()[B - G0 : top - G0 + 1]
        if kH >= S:
            o = S % a
            pat = ext[o : o + Pm]
            seg = r[S - kL :]
            q, rem = divmod(seg.shape[0], Pm)
            if q:
                seg[: q * Pm].reshape(q, Pm)[...] += pat
            if rem:
                seg[q * Pm :] += pat[:rem]
        a += 1
    return r


@lru_cache(maxsize=4096)
def _seven_plan(a: int):
    """For m = 8j + 7 and first coefficient a: period P in j, each b's residue of j mod P and
    first j at which (a, b, c) is reduced; (k = 2j + 1 in the notation of _form_starts)."""
    np = _numpy()
    res, start = _form_starts(a, 3)  # k ≡ res (mod a), k ≥ start
    if a % 2:
        P = a
        rj = ((res - 1) * ((a + 1) // 2)) % a  # 2j + 1 ≡ res (mod a)
        sj = -(-(start - 1) // 2)
    else:  # 2j + 1 ≡ res (mod a) needs res odd, then j ≡ (res − 1)/2 (mod a/2)
        P = a // 2
        keep = res % 2 == 1
        rj = ((res[keep] - 1) // 2) % P
        sj = -(-(start[keep] - 1) // 2)
    sj = sj + (rj - sj) % P  # the first such j in the residue class
    pat = np.bincount(rj, minlength=P).astype(np.int32)
    reps = max(1, -(-256 // P))
    ext = np.tile(pat, reps + 1)
    return P, rj, sj, ext, P * reps


def _count_class_seven(first: int, hi: int):
    """r(m) for m = first, first + 8, … ≤ hi (first ≡ 7 mod 8): the reduced forms of the
    discriminants −m whose fundamental part is ≡ 1 (mod 8), for the theta engine.

    The sweep of :func:`_count_class_np` on ``n = 4k + 3`` restricted to odd ``k``
    (``k = 2j + 1``): for fixed ``a`` the count is periodic in ``j`` with period ``a``
    (``a`` odd) or ``a/2`` (``a`` even; only the ``b`` with an odd residue of ``k`` occur),
    so half the work of sweeping all ``n ≡ 3 (mod 4)``.
    """
    np = _numpy()
    jL, jH = (first - 7) // 8, (hi - 7) // 8
    W = jH - jL + 1
    r = np.zeros(W, dtype=np.int32)
    a = 1
    while 3 * a * a <= hi:
        P, res, start, ext, Pm = _seven_plan(a)
        a += 1
        if len(res) == 0:
            continue
        smin, full = int(start.min()), int(start.max())
        S = max(jL, full)
        B = max(jL, smin)
        if B < S and jH >= B:
            top = min(jH, S - 1)
            G0 = B - B % P
            rows = (top - G0) // P + 1
            grid = np.zeros((rows, P), dtype=np.int32)
            before = start < G0
            if before.any():
                grid[0] += np.bincount(res[before], minlength=P).astype(np.int32)
            inside = (start >= G0) & (start <= top)
            if inside.any():  # bincount: far faster than np.add.at
                flat = ((start[inside] - G0) // P) * P + res[inside]
                grid.ravel()[:] += np.bincount(flat, minlength=rows * P).astype(np.int32)
            for i in range(1, rows):  # running sum down each column (faster than cumsum on axis 0)
                grid[i] += grid[i - 1]
            r[B - jL : top - jL + 1] += grid.ravel()[B - G0 : top - G0 + 1]
        if jH >= S:
            o = S % P
            pat = ext[o : o + Pm]
            seg = r[S - jL :]
            q, rem = divmod(seg.shape[0], Pm)
            if q:
                seg[: q * Pm].reshape(q, Pm)[...] += pat
            if rem:
                seg[q * Pm :] += pat[:rem]
    return r


_SMALL_R: dict = {"cap": 0, "r": None}


def _small_r(upto: int):
    """r(0..cap) with cap ≥ upto, cached per process (grows by doubling)."""
    if _SMALL_R["cap"] < upto:
        cap = max(1 << 12, 2 * _SMALL_R["cap"], upto)
        r = _numpy().zeros(cap + 1, dtype=_numpy().int32)
        r[3:] = _count_all_reduced_np(3, cap)
        _SMALL_R["cap"], _SMALL_R["r"] = cap, r
    return _SMALL_R["r"]


def _class_numbers_np(L: int, H: int):
    """h(−n) for n in [L, H] (0 where −n is not a discriminant), via Möbius inversion."""
    np = _numpy()
    W = H - L + 1
    h = np.zeros(W, dtype=np.int64)
    gmax = math.isqrt(H // 3)
    mu = _mobius_table(max(gmax, 1))
    small_cap = max(1 << 16, H >> 6)
    for g in range(1, gmax + 1):
        if mu[g] == 0:
            continue
        g2 = g * g
        mlo, mhi = max(-(-L // g2), 3), H // g2
        if mlo > mhi:
            continue
        if g > 1 and mhi <= small_cap:
            rs = _small_r(mhi)[mlo : mhi + 1]
        else:
            rs = _count_all_reduced_np(mlo, mhi)
        first = g2 * mlo - L
        view = h[first : first + g2 * (mhi - mlo) + 1 : g2]
        if mu[g] == 1:
            view += rs
        else:
            view -= rs
    return h


def _chunk_arith_np(L: int, H: int):
    """Fundamental part, conductor and genus count of D = −n for n in [L, H] (sieves)."""
    np = _numpy()
    W = H - L + 1
    n = np.arange(L, H + 1, dtype=np.int64)
    # largest g with g² | n
    sq = np.ones(W, dtype=np.int64)
    for g in range(2, math.isqrt(H) + 1):
        g2 = g * g
        sq[(-L) % g2 :: g2] = g
    core = n // (sq * sq)
    dcore = -core
    is1 = dcore % 4 == 1
    dK = np.where(is1, dcore, 4 * dcore)
    f = np.where(is1, sq, sq // 2)
    # number of distinct odd primes dividing n
    omega = np.zeros(W, dtype=np.int64)
    cof = n.copy()
    pk = 2
    while pk <= H:
        cof[(-L) % pk :: pk] //= 2
        pk *= 2
    for p in _primes_upto(math.isqrt(H)):
        if p == 2:
            continue
        omega[(-L) % p :: p] += 1
        pk = p
        while pk <= H:
            cof[(-L) % pk :: pk] //= p
            pk *= p
    omega += cof > 1
    D = -n
    m = D // 4  # floor division: exact where 4 | D
    mu_r = np.where(
        m % 4 == 1,
        omega,
        np.where((m % 4 == 2) | (m % 4 == 3), omega + 1, np.where(m % 8 == 4, omega + 1, omega + 2)),
    )
    mu_all = np.where(D % 4 == 1, omega, mu_r)
    genera = np.left_shift(1, np.maximum(mu_all - 1, 0))
    return dK, f, genera


# ---------------------------------------------------------------------------
# pure-Python engine
# ---------------------------------------------------------------------------


def _squarefree_divisors_mu(g: int) -> list[tuple[int, int]]:
    ps = []
    x, p = g, 2
    while p * p <= x:
        if x % p == 0:
            ps.append(p)
            while x % p == 0:
                x //= p
        p += 1
    if x > 1:
        ps.append(x)
    out = [(1, 1)]
    for p in ps:
        out += [(d * p, -m) for d, m in out]
    return out


def _class_numbers_py(L: int, H: int) -> list[int]:
    """h(−n) for n in [L, H] by sweeping primitive reduced forms directly."""
    W = H - L + 1
    cnt = [0] * W
    gcd = math.gcd
    a = 1
    while 3 * a * a <= H:
        fa = 4 * a
        for b in range(a + 1):
            bb = b * b
            # b and −b give the same D; both reduced iff 0 < b < a and c > a
            w = 1 if (b == 0 or b == a) else 2
            clo = max(a, -(-(L + bb) // fa))
            chi = (H + bb) // fa
            if clo > chi:
                continue
            g = gcd(a, b)
            if g == 1:
                s, e = fa * clo - bb - L, fa * chi - bb - L + 1
                if w == 1:
                    for i in range(s, e, fa):
                        cnt[i] += 1
                else:
                    for i in range(s, e, fa):
                        cnt[i] += 2
                    if clo == a:  # (a, −b, a) is not reduced
                        cnt[s] -= 1
            else:  # keep gcd(a, b, c) = 1: inclusion–exclusion over d | g
                for d, m in _squarefree_divisors_mu(g):
                    c0 = -(-clo // d) * d
                    if c0 > chi:
                        continue
                    st = fa * d
                    v = m * w
                    for i in range(fa * c0 - bb - L, fa * chi - bb - L + 1, st):
                        cnt[i] += v
        a += 1
    return cnt


def _chunk_arith_py(L: int, H: int):
    W = H - L + 1
    sq = [1] * W
    for g in range(2, math.isqrt(H) + 1):
        g2 = g * g
        for i in range((-L) % g2, W, g2):
            sq[i] = g
    omega = [0] * W
    cof = list(range(L, H + 1))
    for p in _primes_upto(math.isqrt(H)):
        for i in range((-L) % p, W, p):
            x = cof[i]
            while x % p == 0:
                x //= p
            cof[i] = x
            if p != 2:
                omega[i] += 1
    dK, f, gen = [0] * W, [0] * W, [0] * W
    for i in range(W):
        n = L + i
        s = sq[i]
        dcore = -(n // (s * s))
        if dcore % 4 == 1:
            dK[i], f[i] = dcore, s
        else:
            dK[i], f[i] = 4 * dcore, s // 2
        r = omega[i] + (1 if cof[i] > 1 else 0)
        gen[i] = _genus_count_from_parts(-n, r) if (-n) % 4 in (0, 1) else 0
    return dK, f, gen
