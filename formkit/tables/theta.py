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
the other third of the discriminants ``H(n)`` (``n ≡ 7 mod 8``) comes, by default
(``seven="relation"``), from the Kronecker–Hurwitz class number relation
(:mod:`formkit.tables.hurwitz_relation`: ``Σ_j H(8(k − T_j) − 1)`` is elementary in ``σ``
and ``λ``, solved by an exact division by the triangular series), or (``seven="sweep"``)
is the number of all reduced forms of discriminant ``−n``, counted by the sweep of
:mod:`formkit.tables.sweep` on the class ``n ≡ 7 (mod 8)`` only; and ``H(4^k n) = 2^k H(n)``.

*Removing non-maximal orders.*  Every form of content ``g`` is ``g`` times a primitive
form of discriminant ``−n/g²``, so ``H(n) = Σ_{g² | n} h_w(−n/g²)`` with
``h_w(D) = h(D)/(w(D)/2)`` (``h_w(−3) = ⅓``, ``h_w(−4) = ½``, else ``h``) and ``h_w = 0``
off the discriminants; Möbius inversion gives ``h_w(−n) = Σ_{g² | n} μ(g)·H(n/g²)``.  All
of this is done on the integers ``6·H(n)``.

*The convolution.*  ``r₃`` comes from three short FFT products of the triangular series
``ψ`` and ``θ`` (:mod:`formkit.tables.three_squares`: ``ψ³`` up to ``N/8`` and
``ψ(q²)θ²``, ``ψ(q²)²θ`` up to ``N/16``), each rounded with the largest distance to an
integer checked below ``1/4``.  The Hurwitz numbers are then assembled window by window,
``T(4^k·n') = 2^k·T(n') + (2^k − 1)·r₃(n')/2`` with ``T = 6H``, so a chunk ``[L, H]`` of a
table needs the series up to ``H`` (kept per process, as is the quotient of the relation
up to ``H/8``), or the sweep only for the ``n' ≡ 7 (mod 8)`` of its own windows
``[L/(g²4^k), H/(g²4^k)]``.

References
----------
.. [1] C. F. Gauss, *Disquisitiones Arithmeticae*, 1801, art. 291–292.
.. [2] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.3 (Hurwitz class numbers), Algorithm 5.3.5.
.. [3] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, Theorem 7.24.
.. [4] A. S. Mosunov and M. J. Jacobson Jr., "Unconditional class group tabulation of
       imaginary quadratic fields to |Δ| < 2⁴⁰", Math. Comp. 85 (2016), 1983–2009.
.. [5] A. Hurwitz, "Über Relationen zwischen Classenanzahlen binärer quadratischer
       Formen von negativer Determinante", Math. Ann. 25 (1885), 157–196.
"""

from __future__ import annotations

import math
import threading
from dataclasses import dataclass
from fractions import Fraction

from ..core.arith import as_int
from ..errors import FormkitError
from .hurwitz_relation import cached_seven, seven_values
from .sweep import _count_class_seven, _mobius_table, _need_numpy, _numpy
from .three_squares import ROUNDING_TOLERANCE, _theta_coefficients, cached_series, r3_upto

__all__ = [
    "HurwitzNumbers",
    "hurwitz_class_numbers",
    "class_numbers_by_theta",
    "determined_by_theta",
    "three_square_counts",
    "theta_memory",
]


def _r3_single(N: int) -> tuple:
    """θ³ up to ``N`` by one real FFT of length ``M > 3N`` (cubing the spectrum; no
    wrap-around reaches ``0…N``): the direct method, kept as an independent check."""
    np = _numpy()
    M = 1 << (3 * N + 1).bit_length()
    s = np.fft.rfft(_theta_coefficients(N), M)
    s = s * s * s
    out = np.fft.irfft(s, M)[: N + 1]
    rounded = np.rint(out)
    err = float(np.max(np.abs(out - rounded)))
    if err >= ROUNDING_TOLERANCE:  # pragma: no cover - far from happening at these sizes
        raise ArithmeticError(f"FFT rounding error {err:.3g} exceeds {ROUNDING_TOLERANCE}")
    return rounded.astype(np.int32), err


def _r3_upto(N: int, block: int | None = None) -> tuple:
    """``(r₃(0..N) as int32, largest rounding distance)``: by the three short products of
    :mod:`formkit.tables.three_squares`, or (``block=0``) by cubing θ's spectrum."""
    if block == 0:
        return _r3_single(N)
    return r3_upto(N)


def three_square_counts(bound: int, *, block: int | None = None) -> list[int]:
    """``r₃(n)``, the number of ``(x, y, z) ∈ ℤ³`` with ``x² + y² + z² = n``, for ``0 ≤ n ≤ bound``.

    Computed by FFT with a checked rounding error (:mod:`formkit.tables.three_squares`;
    ``block=0`` cubes the spectrum of θ instead).

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


#: How the ``n ≡ 7 (mod 8)`` are obtained: the Kronecker–Hurwitz relation or the sweep.
SEVEN_METHODS = ("relation", "sweep")


def _check_seven(seven: str) -> str:
    if seven not in SEVEN_METHODS:
        raise FormkitError(f"seven must be 'relation' or 'sweep', not {seven!r}")
    return seven


def _count_seven(lo: int, hi: int, seven: str = "relation"):
    """``H(m)`` — the number of all reduced forms of discriminant ``−m`` — for the
    ``m ≡ 7 (mod 8)`` in ``[lo, hi]`` (int64, increasing ``m``), by the Kronecker–Hurwitz
    relation (``seven="relation"``) or the sweep (``"sweep"``)."""
    np = _numpy()
    first = lo + (7 - lo) % 8
    if first > hi:
        return np.zeros(0, dtype=np.int64)
    if seven == "relation":
        return seven_values(np.arange(first, hi + 1, 8, dtype=np.int64))
    return _count_class_seven(first, hi).astype(np.int64)


def _six_hurwitz_window(lo: int, hi: int, series, complete: bool = True, seven: str = "relation"):
    """``T(n) = 6·H(n)`` for ``lo ≤ n ≤ hi`` (``lo ≥ 1``) as int64; ``−1`` where the theta
    series says nothing and ``complete`` is False.

    With ``n = 4^k·n'``, ``4 ∤ n'``: ``T(n) = 2^k·T(n') + (2^k − 1)·r₃(n')/2`` (the
    recursion ``H(4m) = r₃(m)/12 + 2H(m)`` unrolled; ``r₃(4m) = r₃(m)``), with
    ``T(n') = 0`` for ``n' ≡ 1, 2 (mod 4)``, ``T(n') = r₃(n')/4`` for ``n' ≡ 3 (mod 8)``
    and ``T(n') = 6·H(n')`` (the relation or the sweep) for ``n' ≡ 7 (mod 8)``.
    """
    np = _numpy()
    W = hi - lo + 1
    k = np.zeros(W, dtype=np.int64)
    q = 4
    while q <= hi:
        k[(-lo) % q :: q] += 1
        q *= 4
    n = np.arange(lo, hi + 1, dtype=np.int64)
    m = n >> (2 * k)
    del n
    c = m % 8
    need = (c == 3) | ((k > 0) & (c != 7) & (m % 4 != 0))
    r3 = np.zeros(W, dtype=np.int64)
    r3[need] = series.r3(m[need])
    del need, m
    T0 = np.where(c == 3, r3 >> 2, 0)
    q, kk = 1, 0
    while 7 * q <= hi:  # n = 4^kk·n', n' ≡ 7 (mod 8): positions 7q, 15q, … (mod 8q)
        a, b = -(-lo // q), hi // q
        first = a + (7 - a) % 8
        if first <= b:
            pos = slice(first * q - lo, b * q - lo + 1, 8 * q)
            T0[pos] = 6 * _count_seven(first, b, seven) if complete else -1
        q *= 4
        kk += 1
    T = (T0 << k) + ((1 << k) - 1) * (r3 >> 1)
    if not complete:
        T[T0 < 0] = -1
    return T


def _six_hurwitz(N: int, *, complete: bool = True, seven: str = "relation"):
    """``(6·H(0..N) as int64, known mask, rounding error)``; ``6·H(0) = −½`` is stored as 0.

    With ``complete`` the values the theta series leaves open (``n = 4^k·m``,
    ``m ≡ 7 mod 8``) are filled in (relation or sweep); otherwise they are ``−1`` and
    ``known`` is False there.
    """
    np = _numpy()
    series = cached_series(N, N // 4)
    T = np.zeros(N + 1, dtype=np.int64)
    if N >= 1:
        T[1:] = _six_hurwitz_window(1, N, series, complete, seven)
    known = T >= 0
    return T, known, series.rounding_error


@dataclass(frozen=True)
class HurwitzNumbers:
    """Hurwitz class numbers ``H(n)`` for ``1 ≤ n ≤ bound`` and how they were obtained.

    ``values[n]`` is ``H(n)`` as a :class:`fractions.Fraction` (``values[0]`` is
    ``−1/12`` by convention); ``seven_count`` counts the ``n = 4^k·m``, ``m ≡ 7 (mod 8)``,
    and ``seven`` says how they were obtained (``"relation"``: the Kronecker–Hurwitz
    relation, :mod:`formkit.tables.hurwitz_relation`; ``"sweep"``: counting reduced forms);
    ``rounding_error`` is the largest distance of an FFT coefficient to its integer (the
    result is exact when it is below ``1/4``).
    """

    bound: int
    values: tuple[Fraction, ...]
    seven_count: int
    rounding_error: float
    seven: str = "relation"

    @property
    def provenance(self) -> str:
        """How the values were obtained (one sentence)."""
        how = (
            "the Kronecker–Hurwitz class number relation (exact division by ψ)"
            if self.seven == "relation"
            else "counting reduced forms"
        )
        return (
            f"unconditional: r₃(n) = 12(H(4n) − 2H(n)) with θ³ by FFT (largest rounding "
            f"distance {self.rounding_error:.1e} < 1/4), and {self.seven_count} values with "
            f"n = 4^k·m, m ≡ 7 (mod 8), by {how}"
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


def hurwitz_class_numbers(bound: int, *, seven: str = "relation") -> HurwitzNumbers:
    """Hurwitz class numbers ``H(0), …, H(bound)`` from the theta series of three squares.

    Parameters
    ----------
    bound : int
        The largest ``n`` (``≥ 0``).
    seven : {"relation", "sweep"}
        How the ``n = 4^k·m``, ``m ≡ 7 (mod 8)``, are obtained: the Kronecker–Hurwitz
        relation (default) or counting reduced forms.

    Returns
    -------
    HurwitzNumbers

    Raises
    ------
    FormkitError
        If ``bound`` is negative or ``seven`` is not one of the two.

    Examples
    --------
    >>> H = hurwitz_class_numbers(23)
    >>> [str(H.values[n]) for n in (3, 4, 7, 8, 11, 12, 15, 16, 20, 23)]
    ['1/3', '1/2', '1', '1', '1', '4/3', '2', '3/2', '2', '3']

    References
    ----------
    Gauss, *Disquisitiones* art. 291–292 (three squares); Cohen GTM 138 §5.3; Hurwitz,
    Math. Ann. 25 (1885) (the class number relation).
    """
    bound = as_int(bound, "bound")
    if bound < 0:
        raise FormkitError(f"bound must be ≥ 0, not {bound}")
    seven = _check_seven(seven)
    _need_numpy()
    T, _, err = _six_hurwitz(bound, complete=True, seven=seven)
    if seven == "relation":
        err = max(err, cached_seven((bound + 1) // 8)[1])
    vals = [Fraction(int(t), 6) for t in T.tolist()]
    vals[0] = Fraction(-1, 12)
    nseven = sum(1 for n in range(1, bound + 1) if _odd_part_4(n) % 8 == 7)
    return HurwitzNumbers(bound, tuple(vals), nseven, err, seven)


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


_SMALL_T: dict = {}


_SMALL_LOCK = threading.Lock()


def _small_six_hurwitz(upto: int, seven: str = "relation"):
    """``6·H(0..cap)``, ``cap ≥ upto``, kept per process and method (grows by doubling)."""
    with _SMALL_LOCK:
        cap, T = _SMALL_T.get(seven, (0, None))
        if cap < upto:
            cap = max(1 << 16, 2 * cap, upto)
            T = _six_hurwitz(cap, seven=seven)[0]
            _SMALL_T[seven] = (cap, T)
        return T


def _class_numbers_from_hurwitz(L: int, H: int, complete: bool = True, seven: str = "relation"):
    """``h(−n)`` for ``n ∈ [L, H]`` by Möbius inversion of ``H(n) = Σ_{g² | n} h_w(−n/g²)``
    (int64; 0 off discriminants, −1 where an input is unknown).

    Only ``6·H`` on the windows ``[L/g², H/g²]`` is computed: the window ``g = 1`` and the
    few large ones directly, the small ones from a per-process table.
    """
    np = _numpy()
    W = H - L + 1
    acc = np.zeros(W, dtype=np.int64)
    bad = np.zeros(W, dtype=bool)
    gmax = math.isqrt(H)
    mu = _mobius_table(max(gmax, 1))
    series = cached_series(H, H // 4)
    if complete and seven == "relation":
        cached_seven((H + 1) // 8)  # the quotient up to H/8 once, before the windows
    small_cap = max(1 << 16, H >> 6)
    small = None
    for g in range(1, gmax + 1):
        if mu[g] == 0:
            continue
        g2 = g * g
        mlo, mhi = max(-(-L // g2), 1), H // g2
        if mlo > mhi:
            continue
        if g > 1 and mhi <= small_cap and complete:
            if small is None:
                small = _small_six_hurwitz(small_cap, seven)
            vals = small[mlo : mhi + 1]
        else:
            vals = _six_hurwitz_window(mlo, mhi, series, complete, seven)
        first = g2 * mlo - L
        sl = slice(first, first + g2 * (mhi - mlo) + 1, g2)
        if mu[g] == 1:
            acc[sl] += vals
        else:
            acc[sl] -= vals
        if not complete:
            bad[sl] |= vals < 0
    # 6·h_w(−n); h_w(−3) = 1/3, h_w(−4) = 1/2
    h = acc // 6
    for n0, hv in ((3, 1), (4, 1)):
        if L <= n0 <= H:
            h[n0 - L] = hv
    h[bad] = -1
    return h


def class_numbers_by_theta(start: int, stop: int, *, complete: bool = True, seven: str = "relation") -> dict:
    """Class numbers ``h(D)`` of the negative discriminants ``start ≤ D ≤ stop`` by theta series.

    ``H(n)`` for all ``n ≤ −start`` from ``r₃`` (module docstring), then the non-maximal
    orders removed by Möbius inversion.  The theta series alone gives every ``D`` whose
    fundamental discriminant is ``≢ 1 (mod 8)``; with ``complete`` (default) the others
    come from the Kronecker–Hurwitz relation (``seven="relation"``, default) or the
    reduced-form sweep (``seven="sweep"``), otherwise they are left out.

    Parameters
    ----------
    start, stop : int
        The range, inclusive (only ``D ≤ −3`` are counted).
    complete : bool
        Also give the discriminants with fundamental part ``≡ 1 (mod 8)``.
    seven : {"relation", "sweep"}
        How ``H(n)`` for ``n ≡ 7 (mod 8)`` is obtained when ``complete``.

    Returns
    -------
    dict
        ``{D: h(D)}`` in order of increasing ``|D|``.

    Raises
    ------
    FormkitError
        If ``start > stop`` or ``seven`` is not one of the two.

    Examples
    --------
    >>> class_numbers_by_theta(-24, -3)
    {-3: 1, -4: 1, -7: 1, -8: 1, -11: 1, -12: 1, -15: 2, -16: 1, -19: 1, -20: 2, -23: 3, -24: 2}
    >>> class_numbers_by_theta(-32, -20, complete=False)   # −23, −28, −31: d_K ≡ 1 (mod 8)
    {-20: 2, -24: 2, -27: 1, -32: 2}

    References
    ----------
    Mosunov and Jacobson, Math. Comp. 85 (2016) (the method at scale); Gauss,
    *Disquisitiones* art. 291–292; Hurwitz, Math. Ann. 25 (1885).
    """
    start, stop = as_int(start, "start"), as_int(stop, "stop")
    if start > stop:
        raise FormkitError(f"the range start must not exceed its end, not start={start} > stop={stop}")
    seven = _check_seven(seven)
    _need_numpy()
    L, H = max(3, -stop), -start
    if L > H:
        return {}
    h = class_number_array(L, H, complete=complete, seven=seven)
    out = {}
    for n, v in zip(range(L, H + 1), h.tolist()):
        if n % 4 in (0, 3) and v >= 0:
            out[-n] = v
    return out


def theta_memory(N: int, *, windows: bool = True, chunk: int = 1 << 22) -> int:
    """Peak bytes of the theta engine for the class numbers of ``[−N, −3]`` in one process
    (the interpreter itself not counted): the largest of the three-squares series
    (:func:`formkit.tables.three_squares.series_memory`), the quotient of the
    Kronecker–Hurwitz relation beside the series
    (:func:`formkit.tables.hurwitz_relation.seven_memory`) and, with ``windows``, the
    assembly of a chunk of ``chunk`` discriminants beside both (about ten int64 arrays of
    the window, and of the per-process table of small windows, ``N/64`` long).

    Examples
    --------
    >>> round(theta_memory(10**9) / 2**30, 1)   # GiB
    4.6
    """
    from .hurwitz_relation import seven_bytes, seven_memory
    from .three_squares import series_bytes, series_memory

    K = (N + 1) // 8
    kept = series_bytes(N, N // 4)
    peaks = [series_memory(N, N // 4), kept + seven_memory(K)]
    if windows:
        small = max(1 << 16, N >> 6)
        peaks.append(kept + seven_bytes(K) + 88 * max(min(chunk, N), small))
    return max(peaks)


def class_number_array(L: int, H: int, *, complete: bool = True, seven: str = "relation"):
    """``h(−n)`` for ``n ∈ [L, H]`` as an int64 array (0 off discriminants, −1 if unknown);
    ``seven`` as in :func:`class_numbers_by_theta`."""
    return _class_numbers_from_hurwitz(max(L, 1), H, complete, _check_seven(seven))
