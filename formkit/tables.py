"""Tables of class numbers over ranges of discriminants.

A table row describes one discriminant ``D``: its fundamental part ``d_K`` and
conductor ``f`` (``D = f²·d_K``), the class number ``h(D)`` (the narrow one when
``D > 0``), optionally the invariants ``n1 | n2 | … | nk`` of the class group, the
number of genera ``2^(μ−1)``, and for ``D > 0`` the wide class number and the
regulator.  Rows are computed in *chunks* (contiguous ranges of ``D``); the chunk
is the unit of parallel work (:mod:`formkit.table_store` runs chunks on all cores or
on a Dask cluster and commits them to an SQLite file).

*Negative discriminants, all at once.*  Every class of primitive positive definite
forms of discriminant ``D < 0`` contains exactly one reduced form ``(a, b, c)``:
``|b| ≤ a ≤ c`` with ``b ≥ 0`` when ``|b| = a`` or ``a = c`` (Cox, Theorem 2.8;
Cohen GTM 138, Definition 5.3.2).  Instead of enumerating the reduced forms of one
``D`` at a time, a chunk ``n = −D ∈ [L, H]`` is swept once over all ``a``:

* ``r(n)`` — the number of *all* reduced forms (primitive or not) of discriminant
  ``−n`` — is a sum over ``a`` of ``#{b ∈ (−a, a] : b² ≡ −n (mod 4a), c ≥ a, …}``.
  For ``n ≥ 4a² + 4a`` the conditions on ``c`` hold automatically, so the term is a
  periodic function of ``n`` with period ``4a`` (the number of square roots of
  ``−n`` modulo ``4a`` in ``(−a, a]``) and is added to the whole chunk in one
  vectorised step; in the band ``3a² ≤ n < 4a² + 4a`` each ``b`` switches on at the
  first ``n`` with ``c ≥ a``, handled by a cumulative sum over a ``(rows × 4a)`` grid.
* A form of content ``g`` is ``g`` times a primitive form of discriminant ``D/g²``,
  so ``r(n) = Σ_{g² | n} h(−n/g²)`` and, by Möbius inversion,
  ``h(−n) = Σ_{g² | n} μ(g)·r(n/g²)``.

This is the classical method of counting reduced forms (Gauss; Cohen GTM 138,
Algorithm 5.3.5, done here for all ``D`` of a range at once).  A pure-Python sweep
(``engine="python"``, one arithmetic progression per pair ``(a, b)``, primitivity by
inclusion–exclusion over the divisors of ``gcd(a, b)``) is an independent second
implementation used for cross-checks and when numpy is missing.

*Genera.*  With ``r`` the number of odd primes dividing ``D`` and ``m = D/4`` when
``4 | D``, the number ``μ`` of assigned characters is ``r`` for ``D ≡ 1 (mod 4)``
and ``r``, ``r + 1``, ``r + 1``, ``r + 2`` for ``m ≡ 1 (mod 4)``, ``m ≡ 2, 3
(mod 4)``, ``m ≡ 4 (mod 8)``, ``m ≡ 0 (mod 8)``; there are ``2^(μ−1)`` genera (Cox,
Proposition 3.11 and Theorem 3.15, stated there for ``D = −4n`` and written here in
terms of ``m = −n``; the same count holds for the narrow classes when ``D > 0``,
Buell, *Binary Quadratic Forms*, Ch. 4, theorem number not recalled).  The fast path
finds the odd primes dividing every ``D`` of a chunk with a sieve.

Positive discriminants are done one ``D`` at a time (:func:`formkit.class_group`,
:func:`formkit.fundamental_unit`).  All results come from complete enumeration and are
unconditional.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.3 (Algorithm 5.3.5, counting reduced forms), table of class
       numbers in Appendix B.
.. [2] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, Theorem 2.8,
       Proposition 3.11, Theorem 3.15.
.. [3] D. A. Buell, *Binary Quadratic Forms: Classical Theory and Modern
       Computations*, Springer 1989, Ch. 4 and the tables of class groups.
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass
from functools import lru_cache
from typing import Iterator, List, Optional, Sequence, Tuple

from .arith import as_int
from .errors import FormkitError

try:  # numpy is a dependency; the pure-Python engine keeps working without it
    import numpy as _np
except ImportError:  # pragma: no cover - exercised only where numpy is absent
    _np = None

__all__ = [
    "TableRow",
    "class_numbers",
    "table_rows",
]

#: Engines for the negative-discriminant sweep: ``"numpy"`` (vectorised periodic
#: counting) and ``"python"`` (one arithmetic progression per ``(a, b)``).
ENGINES = ("numpy", "python")

#: A row in transit between workers and the store (plain tuple, cheap to pickle):
#: (D, d_K, f, h, h_wide, invariants-or-None, genera, regulator-or-None).
RawRow = Tuple[int, int, int, int, Optional[int], Optional[Tuple[int, ...]], int, Optional[float]]


@dataclass(frozen=True)
class TableRow:
    """One row of a class-number table.

    ``class_number`` is the narrow class number when ``D > 0``; ``class_number_wide``
    and ``regulator`` are ``None`` when ``D < 0``.  ``invariants`` is ``None`` when the
    table was built without group structure and ``()`` for the trivial group.  The
    regulator is a double (about 15 significant digits) rounded from a value computed
    by :func:`formkit.regulator` at 20 digits and verified at higher precision.
    """

    discriminant: int
    fundamental_discriminant: int
    conductor: int
    class_number: int
    invariants: Optional[Tuple[int, ...]]
    genus_count: int
    class_number_wide: Optional[int] = None
    regulator: Optional[float] = None

    @classmethod
    def _from_raw(cls, raw: Sequence) -> "TableRow":
        D, dk, f, h, hw, inv, g, reg = raw
        return cls(D, dk, f, h, None if inv is None else tuple(inv), g, hw, reg)

    def _raw(self) -> RawRow:
        return (self.discriminant, self.fundamental_discriminant, self.conductor,
                self.class_number, self.class_number_wide, self.invariants,
                self.genus_count, self.regulator)

    def to_dict(self) -> dict:
        """JSON-ready dictionary (the keys are the column names)."""
        return {
            "discriminant": self.discriminant,
            "fundamental_discriminant": self.fundamental_discriminant,
            "conductor": self.conductor,
            "class_number": self.class_number,
            "invariants": None if self.invariants is None else list(self.invariants),
            "genus_count": self.genus_count,
            "class_number_wide": self.class_number_wide,
            "regulator": self.regulator,
        }


# ---------------------------------------------------------------------------
# small sieves shared by both engines
# ---------------------------------------------------------------------------

@lru_cache(maxsize=8)
def _mobius_table(n: int) -> Tuple[int, ...]:
    """μ(0..n) by a linear sieve."""
    mu = [1] * (n + 1)
    is_comp = [False] * (n + 1)
    primes: List[int] = []
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
def _primes_upto(n: int) -> Tuple[int, ...]:
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
    if _np is None:  # pragma: no cover
        raise FormkitError("engine 'numpy' needs numpy (pip install numpy), or use engine='python'")


def _count_all_reduced_np(L: int, H: int):
    """r(n) for n in [L, H]: the number of reduced forms (any content) of disc −n."""
    np = _np
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
    np = _np
    lo_b = -a + 1 if (-a + 1 - t) % 2 == 0 else -a + 2  # b ≡ t (mod 2), b in (−a, a]
    bs = np.arange(lo_b, a + 1, 2, dtype=np.int64)
    q = (bs * bs + t) // 4  # n = 4ac − b² = 4k + t  <=>  k = a·c − q
    return (-q) % a, a * (a + (bs < 0)) - q


@lru_cache(maxsize=4096)
def _periodic_plan(a: int, t: int):
    """(first k of the band, first k of the periodic part, widened pattern, its period)."""
    np = _np
    res, start = _form_starts(a, t)
    pat = np.bincount(res, minlength=a).astype(np.int32)
    reps = max(1, -(-256 // a))
    ext = np.tile(pat, reps + 1)  # any rotation of the widened pattern is a slice
    return int(start.min()), int(start.max()), ext, a * reps


def _count_class_np(kL: int, kH: int, t: int):
    """r(4k + t) for k in [kL, kH]: for fixed a the count is periodic in k with period a."""
    np = _np
    W = kH - kL + 1
    r = np.zeros(W, dtype=np.int32)
    H = 4 * kH + t
    a = 1
    while 3 * a * a <= H:
        smin, full, ext, Pm = _periodic_plan(a, t)
        S = max(kL, full)  # from S on every b counts
        B = max(kL, smin)
        if B < S and B <= kH:  # the band where forms switch on one b at a time
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
        if S <= kH:
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


_SMALL_R: dict = {"cap": 0, "r": None}


def _small_r(upto: int):
    """r(0..cap) with cap ≥ upto, cached per process (grows by doubling)."""
    if _SMALL_R["cap"] < upto:
        cap = max(1 << 12, 2 * _SMALL_R["cap"], upto)
        r = _np.zeros(cap + 1, dtype=_np.int32)
        r[3:] = _count_all_reduced_np(3, cap)
        _SMALL_R["cap"], _SMALL_R["r"] = cap, r
    return _SMALL_R["r"]


def _class_numbers_np(L: int, H: int):
    """h(−n) for n in [L, H] (0 where −n is not a discriminant), via Möbius inversion."""
    np = _np
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
    np = _np
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
    mu_r = np.where(m % 4 == 1, omega,
                    np.where((m % 4 == 2) | (m % 4 == 3), omega + 1,
                             np.where(m % 8 == 4, omega + 1, omega + 2)))
    mu_all = np.where(D % 4 == 1, omega, mu_r)
    genera = np.left_shift(1, np.maximum(mu_all - 1, 0))
    return dK, f, genera


# ---------------------------------------------------------------------------
# pure-Python engine
# ---------------------------------------------------------------------------

def _squarefree_divisors_mu(g: int) -> List[Tuple[int, int]]:
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


def _class_numbers_py(L: int, H: int) -> List[int]:
    """h(−n) for n in [L, H] by sweeping primitive reduced forms directly."""
    W = H - L + 1
    cnt = [0] * W
    gcd = math.gcd
    a = 1
    while 3 * a * a <= H:
        fa = 4 * a
        for b in range(0, a + 1):
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


# ---------------------------------------------------------------------------
# public: class numbers of a range of negative discriminants
# ---------------------------------------------------------------------------

def _check_engine(engine: str) -> str:
    if engine == "auto":
        return "numpy" if _np is not None else "python"
    if engine not in ENGINES:
        raise FormkitError(f"engine must be 'auto', 'numpy' or 'python', not {engine!r}")
    if engine == "numpy":
        _need_numpy()
    return engine


def _check_range(start: object, stop: object) -> Tuple[int, int]:
    start = as_int(start, "start")
    stop = as_int(stop, "stop")
    if start > stop:
        raise FormkitError(f"the range start must not exceed its end, not start={start} > stop={stop}")
    return start, stop


def class_numbers(start: int, stop: int, *, engine: str = "auto") -> dict:
    """Class numbers ``h(D)`` of all negative discriminants ``start ≤ D ≤ stop``.

    All ``D`` of the range are done at once by counting reduced forms (see the module
    docstring); non-discriminants (``D ≡ 2, 3 mod 4``) and ``D ≥ 0`` are skipped.

    Parameters
    ----------
    start, stop : int
        The range, inclusive (``stop`` may be positive; only ``D ≤ −3`` are counted).
    engine : {"auto", "numpy", "python"}
        ``"numpy"`` (vectorised, the default when numpy is installed) or ``"python"``.

    Returns
    -------
    dict
        ``{D: h(D)}`` in order of increasing ``|D|``.

    Raises
    ------
    NotAnIntegerError
        If a bound is not an integer.
    FormkitError
        If ``start > stop`` or the engine is unknown.

    Examples
    --------
    >>> class_numbers(-24, -3)
    {-3: 1, -4: 1, -7: 1, -8: 1, -11: 1, -12: 1, -15: 2, -16: 1, -19: 1, -20: 2, -23: 3, -24: 2}
    >>> class_numbers(-23, -23, engine="python")
    {-23: 3}

    References
    ----------
    Cohen GTM 138, Algorithm 5.3.5 (counting reduced forms), swept over a range.
    """
    start, stop = _check_range(start, stop)
    engine = _check_engine(engine)
    L, H = max(3, -stop), -start
    if L > H:
        return {}
    h = _class_numbers_np(L, H).tolist() if engine == "numpy" else _class_numbers_py(L, H)
    return {-n: h[n - L] for n in range(L, H + 1) if n % 4 in (0, 3)}


# ---------------------------------------------------------------------------
# chunks: the unit of work for the store and the parallel runners
# ---------------------------------------------------------------------------

@dataclass(frozen=True)
class ChunkSpec:
    """A contiguous range ``lo ≤ D ≤ hi`` (same sign throughout) and how to fill it."""

    lo: int
    hi: int
    fundamental: bool = False
    invariants: bool = True
    engine: str = "auto"


def _invariants_of(D: int, h: int) -> Tuple[int, ...]:
    from .classgroup import class_group

    G = class_group(D)
    if not G.provenance.certified:  # pragma: no cover - tables stay in the enumeration range
        raise FormkitError(f"class group of {D} is not certified ({G.provenance}); tables store only certified rows")
    inv = tuple(int(x) for x in G.invariants)
    if math.prod(inv) != h:  # two independent computations must agree
        raise ArithmeticError(f"class number {h} of {D} from counting disagrees with the group {inv}")
    return inv


def _negative_rows(spec: ChunkSpec) -> List[RawRow]:
    L, H = -spec.hi, -spec.lo
    L = max(L, 3)
    if L > H:
        return []
    engine = _check_engine(spec.engine)
    if engine == "numpy":
        h = _class_numbers_np(L, H).tolist()
        dK, f, gen = (x.tolist() for x in _chunk_arith_np(L, H))
    else:
        h = _class_numbers_py(L, H)
        dK, f, gen = _chunk_arith_py(L, H)
    rows: List[RawRow] = []
    for i in range(H - L + 1):
        n = L + i
        if n % 4 not in (0, 3):
            continue
        if spec.fundamental and f[i] != 1:
            continue
        D = -n
        inv = _invariants_of(D, h[i]) if spec.invariants else None
        rows.append((D, dK[i], f[i], h[i], None, inv, gen[i], None))
    return rows


def _positive_rows(spec: ChunkSpec) -> List[RawRow]:
    from .arith import is_square
    from .classgroup import class_group
    from .discriminants import discriminant_parts, fundamental_unit
    from .enumeration import class_number
    from .genus import genus_count

    rows: List[RawRow] = []
    for D in range(max(spec.lo, 5), spec.hi + 1):
        if D % 4 not in (0, 1) or is_square(D):
            continue
        dK, f = discriminant_parts(D)
        if spec.fundamental and f != 1:
            continue
        if spec.invariants:
            G = class_group(D)
            h = G.order
            inv: Optional[Tuple[int, ...]] = _invariants_of(D, h)
        else:
            h, inv = class_number(D), None
        unit = fundamental_unit(D)
        hw = h if unit.norm == -1 else h // 2
        reg = float(unit.regulator(20))
        rows.append((D, dK, f, h, hw, inv, genus_count(D), reg))
    return rows


def compute_chunk(spec: ChunkSpec) -> Tuple[ChunkSpec, List[RawRow], float]:
    """Compute the rows of one chunk; returns ``(spec, rows, seconds)``.

    Top-level so that process pools and Dask workers can import it.
    """
    t0 = time.perf_counter()
    if spec.hi < 0:
        rows = _negative_rows(spec)
    elif spec.lo > 0:
        rows = _positive_rows(spec)
    else:
        raise FormkitError(f"a chunk must not contain 0, not [{spec.lo}, {spec.hi}]")
    return spec, rows, time.perf_counter() - t0


def split_range(start: int, stop: int, size: int) -> Iterator[Tuple[int, int]]:
    """Split ``[start, stop]`` (minus 0) into pieces aligned to multiples of ``size``.

    Examples
    --------
    >>> list(split_range(-25, 12, 10))
    [(-25, -21), (-20, -11), (-10, -1), (1, 9), (10, 12)]
    """
    if size < 1:
        raise FormkitError(f"chunk size must be a positive integer, not {size}")
    for lo, hi in ((start, min(stop, -1)), (max(start, 1), stop)):
        x = lo
        while x <= hi:
            end = min(hi, (x // size + 1) * size - 1)
            yield (x, end)
            x = end + 1


def table_rows(
    start: int,
    stop: int,
    *,
    fundamental: bool = False,
    invariants: bool = True,
    engine: str = "auto",
) -> List[TableRow]:
    """The table rows of all discriminants ``start ≤ D ≤ stop``, in this process.

    For large ranges, parallel runs and a resumable file use
    :func:`formkit.build_table`; this function is the same computation in memory.

    Parameters
    ----------
    start, stop : int
        The range of ``D``, inclusive; may be negative, positive or both.
        Non-discriminants and squares are skipped.
    fundamental : bool
        Keep only fundamental discriminants.
    invariants : bool
        Also compute the class-group invariants (:func:`formkit.class_group`; about
        a millisecond or more per ``D``).  Without them negative ranges are swept
        all at once.
    engine : {"auto", "numpy", "python"}
        The sweep for negative discriminants.

    Returns
    -------
    list of TableRow
        In order of increasing ``|D|`` (negative before positive for equal ``|D|``).

    Raises
    ------
    FormkitError
        If ``start > stop`` or the engine is unknown.

    Examples
    --------
    >>> for row in table_rows(-24, -20):
    ...     print(row.discriminant, row.fundamental_discriminant, row.conductor,
    ...           row.class_number, row.invariants, row.genus_count)
    -20 -20 1 2 (2,) 2
    -23 -23 1 3 (3,) 1
    -24 -24 1 2 (2,) 2
    >>> r = table_rows(12, 12)[0]
    >>> r.class_number, r.class_number_wide, round(r.regulator, 6)
    (2, 1, 1.316958)
    """
    start, stop = _check_range(start, stop)
    engine = _check_engine(engine)
    raw: List[RawRow] = []
    for lo, hi in split_range(start, stop, 1 << 20):
        raw.extend(compute_chunk(ChunkSpec(lo, hi, bool(fundamental), bool(invariants), engine))[1])
    raw.sort(key=lambda t: (abs(t[0]), t[0]))
    return [TableRow._from_raw(t) for t in raw]
