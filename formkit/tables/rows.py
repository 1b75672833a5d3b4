"""Tables of class numbers over ranges of discriminants.

A table row describes one discriminant ``D``: its fundamental part ``d_K`` and
conductor ``f`` (``D = f²·d_K``), the class number ``h(D)`` (the narrow one when
``D > 0``), optionally the invariants ``n1 | n2 | … | nk`` of the class group, the
number of genera ``2^(μ−1)``, and for ``D > 0`` the wide class number and the
regulator.  Rows are computed in *chunks* (contiguous ranges of ``D``); the chunk
is the unit of parallel work (:mod:`formkit.tables.parallel` runs chunks on all cores
or on a Dask cluster and commits them to the SQLite file of :mod:`formkit.tables.store`).

*Negative discriminants, all at once.*  The class numbers of a whole chunk are found
by counting reduced forms for all ``D`` at once — for a fixed first coefficient ``a``
the count is periodic in ``−D`` — followed by a Möbius inversion that keeps the
primitive forms (Gauss; Cohen GTM 138, Algorithm 5.3.5, swept over a range; details
in :mod:`formkit.tables.sweep`).  Sieves give the fundamental part, the conductor
and the number of genera ``2^(μ−1)`` (Cox, Proposition 3.11 and Theorem 3.15).  Two
engines: ``"numpy"`` (vectorised) and ``"python"`` (an independent pure-Python sweep).

A third engine, ``"theta"`` (:mod:`formkit.tables.theta`), gets the class numbers of
wide negative ranges from the three-squares theta series, and the ``d_K ≡ 1 (mod 8)``
part by counting reduced forms; ``"auto"`` takes it beyond :data:`THETA_CROSSOVER`.

Positive discriminants are done one ``D`` at a time (:func:`formkit.class_group`,
:func:`formkit.fundamental_unit`).  Every result is unconditional: counts of reduced
forms, the theta series with a checked rounding error, and invariants forced by ``h``
or built from explicit relations (:data:`METHOD_DESCRIPTIONS`).

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
from collections.abc import Iterator, Sequence
from dataclasses import dataclass

from ..core.arith import as_int
from ..errors import FormkitError
from .display import ClassNumberTable
from .sweep import (
    _chunk_arith_np,
    _chunk_arith_py,
    _class_numbers_np,
    _class_numbers_py,
    _need_numpy,
    _numpy,
)

__all__ = [
    "TableRow",
    "chunk_method",
    "class_numbers",
    "table_rows",
]

#: Engines for negative discriminants: ``"numpy"`` (vectorised periodic counting),
#: ``"python"`` (one arithmetic progression per ``(a, b)``) and ``"theta"`` (Hurwitz class
#: numbers from θ³, :mod:`formkit.tables.theta`; computes ``H`` from 0 to the chunk's end).
ENGINES = ("numpy", "python", "theta")

#: ``"auto"`` takes the theta series for a range ``[−H, −L]`` when ``H`` is at least this
#: and the range is wide (:func:`_auto_engine`; measured crossover on this 2-core machine,
#: benchmarks/bench_theta.py, docs/performance.md).
THETA_CROSSOVER = 4_000_000

#: Width of the theta engine's chunks in a store (and the width from which ``"auto"`` takes
#: it for any ``H`` beyond the crossover: the FFT series, kept per process, is then shared
#: by many chunks).
CHUNK_THETA = 1 << 22


def _auto_engine(L: int, H: int) -> str:
    """``"theta"`` or ``"numpy"`` for ``h(−n)``, ``L ≤ n ≤ H``, under ``engine="auto"``
    (numpy present): theta from :data:`THETA_CROSSOVER` on for ranges at least
    ``min(H/64, CHUNK_THETA/2)`` wide, where the FFT series (``O(H log H)``) is small next
    to the sweep it replaces.

    Examples
    --------
    >>> _auto_engine(3, 10**6), _auto_engine(3, 10**7), _auto_engine(10**7 - 1000, 10**7)
    ('numpy', 'theta', 'numpy')
    """
    if H >= THETA_CROSSOVER and min(H // 64, CHUNK_THETA // 2) <= H - L + 1:
        return "theta"
    return "numpy"


#: A row in transit between workers and the store (plain tuple, cheap to pickle):
#: (D, d_K, f, h, h_wide, invariants-or-None, genera, regulator-or-None).
RawRow = tuple[int, int, int, int, int | None, tuple[int, ...] | None, int, float | None]


@dataclass(frozen=True)
class TableRow:
    """One row of a class-number table.

    ``class_number_narrow`` is the narrow class number ``h⁺`` (forms up to proper
    equivalence; ``h`` when ``D < 0``), ``class_number_wide`` the class number ``h`` of
    ideal classes when ``D > 0`` (``None`` when ``D < 0``), and the property
    ``class_number`` is ``h`` for either sign; ``regulator`` is ``None`` when ``D < 0``.  ``invariants`` is ``None`` when the
    table was built without group structure and ``()`` for the trivial group.  The
    regulator is a double (about 15 significant digits) rounded from a value computed
    by :func:`formkit.regulator` at 20 digits and verified at higher precision.
    """

    discriminant: int
    fundamental_discriminant: int
    conductor: int
    class_number_narrow: int
    invariants: tuple[int, ...] | None
    genus_count: int
    class_number_wide: int | None = None
    regulator: float | None = None

    @classmethod
    def _from_raw(cls, raw: Sequence) -> TableRow:
        D, dk, f, h, hw, inv, g, reg = raw
        return cls(D, dk, f, h, None if inv is None else tuple(inv), g, hw, reg)

    @property
    def class_number(self) -> int:
        """The class number ``h`` (ideal classes of the order), for either sign of ``D``."""
        return self.class_number_narrow if self.class_number_wide is None else self.class_number_wide

    def to_dict(self) -> dict:
        """JSON-ready dictionary (the keys are the column names; ``class_number`` is ``h``,
        ``class_number_narrow`` is ``h⁺``)."""
        return {
            "discriminant": self.discriminant,
            "fundamental_discriminant": self.fundamental_discriminant,
            "conductor": self.conductor,
            "class_number": self.class_number,
            "class_number_narrow": self.class_number_narrow,
            "invariants": None if self.invariants is None else list(self.invariants),
            "genus_count": self.genus_count,
            "regulator": self.regulator,
        }

    def __repr__(self) -> str:
        from .display import _structure

        parts = [f"D = {self.discriminant}"]
        if self.conductor > 1:
            parts.append(f"d_K = {self.fundamental_discriminant}, f = {self.conductor}")
        parts.append(f"h = {self.class_number}")
        if self.discriminant > 0:
            parts.append(f"h⁺ = {self.class_number_narrow}")
        if self.invariants is not None:
            parts.append(f"{'Cl⁺' if self.discriminant > 0 else 'Cl'} = {_structure(self.invariants)}")
        parts.append(f"{self.genus_count} genera" if self.genus_count != 1 else "1 genus")
        if self.regulator is not None:
            parts.append(f"R = {self.regulator:.10g}")
        return f"<table row: {', '.join(parts)}; unconditional>"

    def _repr_html_(self) -> str:
        from .display import TABLE_PROVENANCE, rows_html

        return rows_html([self], TABLE_PROVENANCE)

    def _repr_latex_(self) -> str:
        from .display import TABLE_PROVENANCE, rows_latex

        return rows_latex([self], TABLE_PROVENANCE)


# ---------------------------------------------------------------------------
# public: class numbers of a range of negative discriminants
# ---------------------------------------------------------------------------


def _check_engine(engine: str) -> str:
    if engine == "auto":
        return "numpy" if _numpy() is not None else "python"
    if engine not in ENGINES:
        raise FormkitError(f"engine must be 'auto', 'numpy', 'python' or 'theta', not {engine!r}")
    if engine in ("numpy", "theta"):
        _need_numpy()
    return engine


#: The methods a chunk of a table can be computed by, as recorded with each chunk in the
#: store (:mod:`formkit.tables.store`) and printed as "method:" with the rows.
METHOD_DESCRIPTIONS = {
    "enumeration": "class numbers by counting reduced forms (D < 0: the sweep of a whole range, Gauss; "
    "Cohen GTM 138 Alg. 5.3.5; D > 0: complete enumeration of the cycles of reduced forms), unconditional",
    "theta": "class numbers by the three-squares theta series r3(n) = 12(H(4n) - 2H(n)) (Gauss, Disq. "
    "art. 291-292) with theta^3 by FFT and a checked rounding error, non-maximal orders removed by "
    "Moebius inversion, unconditional; the D whose fundamental part is 1 (mod 8) by counting reduced forms",
    "theta-relation": "class numbers by the three-squares theta series r3(n) = 12(H(4n) - 2H(n)) (Gauss, "
    "Disq. art. 291-292) with theta^3 by FFT and a checked rounding error, non-maximal orders removed by "
    "Moebius inversion, unconditional; the D whose fundamental part is 1 (mod 8) by the Kronecker-Hurwitz "
    "class number relation sum_t H(4n - t^2) = 2 sigma(n) - lambda(n) (Hurwitz 1885), solved exactly "
    "for H(8k - 1) by division by the triangular series (formkit.tables.hurwitz_relation)",
}

#: How the invariants of a chunk's rows were obtained (stores built with invariants).
INVARIANT_DESCRIPTIONS = {
    "negative": "invariants forced by h and the number of genera, else Sylow subgroups generated by prime "
    "forms up to their known order (explicit relations), unconditional",
    "positive": "invariants by formkit.class_group (complete enumeration), unconditional",
}


def chunk_method(spec: ChunkSpec) -> str:
    """The method (a key of :data:`METHOD_DESCRIPTIONS`) by which :func:`compute_chunk` gets
    the class numbers of the chunk ``spec``.

    Examples
    --------
    >>> chunk_method(ChunkSpec(-100, -3, engine="theta")), chunk_method(ChunkSpec(-100, -3))
    ('theta-relation', 'enumeration')
    >>> chunk_method(ChunkSpec(5, 100, engine="theta"))
    'enumeration'
    """
    if spec.hi < 0 and _negative_engine(spec) == "theta":
        return "theta-relation"  # ("theta": stores written when the d_K ≡ 1 (mod 8) third was swept)
    return "enumeration"


def _negative_engine(spec: ChunkSpec) -> str:
    """The engine a negative chunk runs with (``"auto"`` resolved by the chunk's range)."""
    engine = _check_engine(spec.engine)
    if spec.engine == "auto" and engine == "numpy":
        return _auto_engine(max(3, -spec.hi), -spec.lo)
    return engine


def describe_methods(methods: Sequence[str], invariants: bool) -> str:
    """One text naming every method of a table (for the store and the printed rows).

    Examples
    --------
    >>> describe_methods(["theta"], False)[:60]
    'class numbers by the three-squares theta series r3(n) = 12(H'
    """
    parts = [METHOD_DESCRIPTIONS.get(m, m) for m in methods]
    if invariants:
        parts.append(INVARIANT_DESCRIPTIONS["negative"] + "; D > 0: " + INVARIANT_DESCRIPTIONS["positive"])
    parts.append("genera 2^(mu-1) (Cox Prop 3.11, Thm 3.15)")
    return "; ".join(parts)


def _class_numbers_any(L: int, H: int, engine: str):
    """h(−n), n in [L, H], as a numpy array by the sweep or the theta series."""
    if engine == "theta":
        from .theta import class_number_array

        return class_number_array(L, H)
    return _class_numbers_np(L, H)


def _check_range(start: object, stop: object) -> tuple[int, int]:
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
    engine : {"auto", "numpy", "python", "theta"}
        ``"numpy"`` (vectorised, the default when numpy is installed), ``"python"`` or
        ``"theta"`` (three-squares theta series; ``"auto"`` picks it for ranges from near
        wide ranges beyond :data:`THETA_CROSSOVER`).

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
    >>> class_numbers(-24, -20, engine="theta")
    {-20: 2, -23: 3, -24: 2}

    References
    ----------
    Cohen GTM 138, Algorithm 5.3.5 (counting reduced forms), swept over a range.
    """
    start, stop = _check_range(start, stop)
    auto = engine == "auto"
    engine = _check_engine(engine)
    L, H = max(3, -stop), -start
    if L > H:
        return {}
    if auto and engine == "numpy":
        engine = _auto_engine(L, H)
    h = _class_numbers_any(L, H, engine).tolist() if engine != "python" else _class_numbers_py(L, H)
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


def _invariants_from_order(h: int, genera: int) -> tuple[int, ...] | None:
    """The invariants when ``h`` and the 2-rank alone decide them, else ``None``.

    A Sylow subgroup of prime order is cyclic, so a square-free odd part of ``h`` gives
    a cyclic odd part.  The 2-rank of the (narrow) class group is ``μ − 1`` where
    ``2^(μ−1)`` is the number of genera (Gauss: the genera are the cosets of the
    squares, Cox Theorem 3.15 and Proposition 3.11), so the 2-Sylow subgroup has
    ``r = log2(genera)`` cyclic factors whose exponents sum to ``v = v_2(h)``; the
    exponents are forced when ``r ≤ 1`` or ``v ≤ r + 1``.

    Examples
    --------
    >>> _invariants_from_order(8, 4), _invariants_from_order(12, 4), _invariants_from_order(12, 2)
    ((2, 4), (2, 6), (12,))
    >>> _invariants_from_order(9, 1), _invariants_from_order(16, 4)   # 3² | h; 2-part C2×C8 or C4×C4
    (None, None)
    """
    r = genera.bit_length() - 1
    v, odd = 0, h
    while odd % 2 == 0:
        odd //= 2
        v += 1
    if r > v or (r == 0 and v > 0) or (r > 1 and v > r + 1):
        return None
    m, p = odd, 3
    while p * p <= m:  # the odd part must be square-free
        if m % p == 0:
            m //= p
            if m % p == 0:
                return None
        p += 2
    twos = [2] * r
    if v > r:
        twos[-1] = 2 ** (v - r + 1)
    if not twos:
        return (odd,) if odd > 1 else ()
    twos[-1] *= odd
    return tuple(twos)


def _invariants_of(D: int, h: int, genera: int, f: int | None = None) -> tuple[int, ...]:
    quick = _invariants_from_order(h, genera)
    if quick is not None:
        return quick
    if D < 0:  # h is known unconditionally: build only the Sylow subgroups not forced by it
        from .structure import structure_from_class_number

        return structure_from_class_number(D, h, genera, conductor=f).invariants
    from ..classgroups.dispatch import class_group

    G = class_group(D, method="enumeration")  # tables hold unconditional rows only
    if not G.provenance.certified:  # pragma: no cover - tables stay in the enumeration range
        raise FormkitError(
            f"class group of {D} is not certified ({G.provenance}); tables store only certified rows"
        )
    inv = tuple(int(x) for x in G.invariants)
    if math.prod(inv) != h:  # two independent computations must agree
        raise ArithmeticError(f"class number {h} of {D} from counting disagrees with the group {inv}")
    return inv


class RowColumns:
    """The rows of a negative chunk as columns (numpy arrays pickle as plain memory, so
    workers hand results to the parent cheaply); iterating yields row tuples."""

    __slots__ = ("D", "dK", "f", "genera", "h", "inv")

    def __init__(self, D, dK, f, h, genera, inv) -> None:
        self.D, self.dK, self.f, self.h, self.genera, self.inv = D, dK, f, h, genera, inv

    def __getstate__(self):
        return (self.D, self.dK, self.f, self.h, self.genera, self.inv)

    def __setstate__(self, state) -> None:
        self.D, self.dK, self.f, self.h, self.genera, self.inv = state

    def __len__(self) -> int:
        return len(self.D)

    def __iter__(self) -> Iterator[RawRow]:
        from itertools import repeat

        return zip(
            self.D.tolist(),
            self.dK.tolist(),
            self.f.tolist(),
            self.h.tolist(),
            repeat(None),
            repeat(None) if self.inv is None else iter(self.inv),
            self.genera.tolist(),
            repeat(None),
        )


def _negative_rows(spec: ChunkSpec):
    L, H = -spec.hi, -spec.lo
    L = max(L, 3)
    if L > H:
        return []
    engine = _negative_engine(spec)
    if engine in ("numpy", "theta"):
        np = _numpy()
        h = _class_numbers_any(L, H, engine)
        dK, f, gen = _chunk_arith_np(L, H)
        n = np.arange(L, H + 1, dtype=np.int64)
        keep = (n % 4 == 0) | (n % 4 == 3)
        if spec.fundamental:
            keep &= f == 1
        cols = RowColumns(-n[keep], dK[keep], f[keep], h[keep], gen[keep], None)
        if spec.invariants:
            cols.inv = [
                _invariants_of(D, hD, g, fD)
                for D, hD, g, fD in zip(
                    cols.D.tolist(), cols.h.tolist(), cols.genera.tolist(), cols.f.tolist()
                )
            ]
        return cols
    h_list = _class_numbers_py(L, H)
    dK_list, f_list, gen_list = _chunk_arith_py(L, H)
    rows: list[RawRow] = []
    for i in range(H - L + 1):
        n_i = L + i
        if n_i % 4 not in (0, 3):
            continue
        if spec.fundamental and f_list[i] != 1:
            continue
        D = -n_i
        inv = _invariants_of(D, h_list[i], gen_list[i], f_list[i]) if spec.invariants else None
        rows.append((D, dK_list[i], f_list[i], h_list[i], None, inv, gen_list[i], None))
    return rows


def _positive_rows(spec: ChunkSpec) -> list[RawRow]:
    from ..classgroups.genus import genus_count
    from ..core.arith import is_square
    from ..core.discriminants import discriminant_parts, fundamental_unit
    from ..core.enumeration import class_number

    rows: list[RawRow] = []
    for D in range(max(spec.lo, 5), spec.hi + 1):
        if D % 4 not in (0, 1) or is_square(D):
            continue
        dK, f = discriminant_parts(D)
        if spec.fundamental and f != 1:
            continue
        h = class_number(D)
        genera = genus_count(D)
        inv = _invariants_of(D, h, genera) if spec.invariants else None
        unit = fundamental_unit(D)
        hw = h if unit.norm == -1 else h // 2
        reg = float(unit.regulator(20))
        rows.append((D, dK, f, h, hw, inv, genera, reg))
    return rows


def compute_chunk(spec: ChunkSpec) -> tuple[ChunkSpec, Sequence[RawRow], float]:
    """Compute the rows of one chunk; returns ``(spec, rows, seconds)``.

    ``rows`` is a list of row tuples or a :class:`RowColumns` (iterating gives tuples).

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


def split_range(start: int, stop: int, size: int) -> Iterator[tuple[int, int]]:
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
) -> ClassNumberTable:
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
    ClassNumberTable
        A list of :class:`TableRow` in order of increasing ``|D|`` (negative before
        positive for equal ``|D|``), with notebook displays.

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
    >>> r.class_number_narrow, r.class_number, round(r.regulator, 6)
    (2, 1, 1.316958)
    """
    start, stop = _check_range(start, stop)
    engine = _check_engine(engine)
    raw: list[RawRow] = []
    for lo, hi in split_range(start, stop, 1 << 20):
        raw.extend(compute_chunk(ChunkSpec(lo, hi, bool(fundamental), bool(invariants), engine))[1])
    raw.sort(key=lambda t: (abs(t[0]), t[0]))
    return ClassNumberTable(TableRow._from_raw(t) for t in raw)
