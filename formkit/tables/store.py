"""Resumable class-number tables in an SQLite file: the file format, and reading it back.

:func:`formkit.build_table` (:mod:`formkit.tables.parallel`) writes each chunk of a
range of discriminants to the file in **one transaction** that also records the chunk
in the ``chunks`` table.  A run stopped at any moment — Ctrl-C, ``kill -9``, a lost
machine — leaves only whole chunks in the file; running the same command again
computes just the parts of the range no finished chunk covers.  :func:`query_table`
reads rows back with filters (class number, invariants, conductor, …); no SQL is taken
from users.

The file holds three tables: ``meta`` (options and provenance: every method used,
``enumeration`` — counting reduced forms — and/or ``theta`` — the three-squares theta
series —, all unconditional), ``chunks`` (finished ranges, each with the method of its
rows) and ``rows`` (one per discriminant, primary key ``discriminant``, so a row can never
appear twice).  The journal is SQLite's write-ahead log, so the file can be queried
while a build is running.

References
----------
.. [1] SQLite documentation, "Atomic Commit In SQLite" and "Write-Ahead Logging"
       (transactions are atomic across process crashes).
"""

from __future__ import annotations

import hashlib
import itertools
import math
import os
import re
import sqlite3
import time
from collections.abc import Sequence
from typing import Any

from ..core.arith import as_int
from ..errors import FormkitError, StoreDamagedError
from .display import ClassNumberTable
from .rows import ChunkSpec, RawRow, TableRow, _check_range, chunk_method, describe_methods

__all__ = [
    "query_table",
    "table_info",
    "parse_invariants",
    "verify_store",
    "row_problem",
]

_FORMAT = "formkit-table-1"
_COLUMNS = (
    "discriminant",
    "fundamental_discriminant",
    "conductor",
    "class_number",
    "class_number_wide",
    "invariants",
    "genus_count",
    "regulator",
)
_SCHEMA = """
CREATE TABLE IF NOT EXISTS meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS chunks (
    lo INTEGER NOT NULL, hi INTEGER NOT NULL, row_count INTEGER NOT NULL,
    seconds REAL NOT NULL, finished TEXT NOT NULL, checksum TEXT, method TEXT, PRIMARY KEY (lo, hi));
CREATE TABLE IF NOT EXISTS rows (
    discriminant INTEGER PRIMARY KEY,
    fundamental_discriminant INTEGER NOT NULL,
    conductor INTEGER NOT NULL,
    class_number INTEGER NOT NULL,
    class_number_wide INTEGER,
    invariants TEXT,
    genus_count INTEGER NOT NULL,
    regulator REAL);
"""

# ---------------------------------------------------------------------------
# invariants text
# ---------------------------------------------------------------------------


def parse_invariants(value: object) -> tuple[int, ...]:
    """Canonical invariants ``n1 | n2 | … | nk`` (factors 1 dropped) from text or a sequence.

    Parameters
    ----------
    value : str or sequence of int
        ``"2,2,4"``, ``"2 4"``, ``"[2, 4]"``, ``(2, 4)``, ``"C2 × C4"``; ``"1"``, ``"C1"``
        or ``""`` is the trivial group.

    Raises
    ------
    FormkitError
        If an entry is not a positive integer or the chain ``n1 | n2 | …`` fails.

    Examples
    --------
    >>> parse_invariants("2,2,4"), parse_invariants("1"), parse_invariants([1, 3])
    ((2, 2, 4), (), (3,))
    >>> parse_invariants("C2 × C4"), parse_invariants("C1")
    ((2, 4), ())
    >>> parse_invariants("2,3")
    Traceback (most recent call last):
    ...
    formkit.errors.FormkitError: invariants must form a chain n1 | n2 | …, not 2,3 (2 does not divide 3)
    """
    if isinstance(value, str):
        text = value.strip().strip("[]()").replace(",", " ")
        # the text notation "C2 × C4" (or "C2 x C4"; "C1" is the trivial group)
        if re.fullmatch(r"C\d+(\s*[×x]\s*C\d+)*", value.strip()):
            text = " ".join(re.findall(r"C(\d+)", value))
        parts = text.split()
        nums = []
        for p in parts:
            if not p.isdigit():
                raise FormkitError(f"invariants must be positive integers such as 2,2,4, not {value!r}")
            nums.append(int(p))
    else:
        try:
            items: Any = value  # any iterable; a non-iterable raises TypeError below
            nums = [as_int(x, "invariant") for x in items]
        except TypeError:
            raise FormkitError(f"invariants must be a list of positive integers, not {value!r}") from None
    if any(n < 1 for n in nums):
        raise FormkitError(f"invariants must be positive integers, not {nums}")
    nums = [n for n in nums if n != 1]
    for x, y in itertools.pairwise(nums):
        if y % x:
            shown = ",".join(map(str, nums))
            raise FormkitError(
                f"invariants must form a chain n1 | n2 | …, not {shown} ({x} does not divide {y})"
            )
    return tuple(nums)


def _inv_text(inv: Sequence[int] | None) -> str | None:
    return None if inv is None else ",".join(str(int(x)) for x in inv)


def _inv_from_text(text: str | None) -> tuple[int, ...] | None:
    if text is None:
        return None
    return tuple(int(x) for x in text.split(",")) if text else ()


# ---------------------------------------------------------------------------
# the SQLite file
# ---------------------------------------------------------------------------


def _connect(path: str, *, create: bool) -> sqlite3.Connection:
    path = os.fspath(path)
    if not create and not os.path.exists(path):
        raise FormkitError(f"no table store at {path!r} (build one with --from/--to and --db)")
    try:
        conn = sqlite3.connect(path, isolation_level=None, timeout=60)
        conn.execute("PRAGMA journal_mode=WAL")
        conn.execute("PRAGMA synchronous=NORMAL")
        if create:
            conn.executescript(_SCHEMA)
            cols = {r[1] for r in conn.execute("PRAGMA table_info(chunks)")}
            if "checksum" not in cols:  # a store written before chunks carried checksums
                conn.execute("ALTER TABLE chunks ADD COLUMN checksum TEXT")
            if "method" not in cols:  # a store written before chunks carried their method
                conn.execute("ALTER TABLE chunks ADD COLUMN method TEXT")
        else:
            names = {r[0] for r in conn.execute("SELECT name FROM sqlite_master WHERE type='table'")}
            if not {"meta", "chunks", "rows"} <= names:
                raise FormkitError(
                    f"{path!r} is not a formkit table store (tables meta, chunks, rows missing)"
                )
    except sqlite3.DatabaseError as exc:
        raise FormkitError(f"{path!r} is not a usable SQLite table store: {exc}") from None
    return conn


def _meta(conn: sqlite3.Connection) -> dict:
    return dict(conn.execute("SELECT key, value FROM meta"))


def _check_or_record_meta(
    conn: sqlite3.Connection, path: str, fundamental: bool, invariants: bool, methods: Sequence[str] = ()
) -> None:
    """Check the options of an existing store (or record them in a new one), and record the
    methods of this build: ``meta.method`` lists every method used, joined by `` + ``."""
    want = {"fundamental": str(int(fundamental)), "invariants": str(int(invariants))}
    meta = _meta(conn)
    if not meta and not methods:
        return  # a new store: recorded once the build knows its methods
    if meta:
        if meta.get("format") != _FORMAT:
            raise FormkitError(f"{path!r} has table format {meta.get('format')!r}, expected {_FORMAT!r}")
        for key, val in want.items():
            if meta.get(key) != val:
                was = "with" if meta.get(key) == "1" else "without"
                raise FormkitError(
                    f"{path!r} was built {was} {key}; rerun with the same options or use a new file "
                    f"(--{'no-invariants' if key == 'invariants' else 'fundamental'} must match)"
                )
        old = _split_methods(meta.get("method"))
        if not set(methods) <= set(old):
            new = sorted({*old, *methods})
            conn.execute("BEGIN IMMEDIATE")
            conn.executemany(
                "INSERT OR REPLACE INTO meta (key, value) VALUES (?, ?)",
                [("method", " + ".join(new)), ("description", describe_methods(new, invariants))],
            )
            conn.execute("COMMIT")
        return
    methods = sorted(set(methods))
    from .._version import __version__

    rows = {
        "format": _FORMAT,
        **want,
        "method": " + ".join(methods),
        "certified": "1",
        "assumption": "none",
        "description": describe_methods(methods, invariants),
        "formkit_version": __version__,
        "created": time.strftime("%Y-%m-%dT%H:%M:%S"),
    }
    conn.execute("BEGIN IMMEDIATE")
    conn.executemany("INSERT INTO meta (key, value) VALUES (?, ?)", rows.items())
    conn.execute("COMMIT")


def _split_methods(text: str | None) -> list[str]:
    return [m.strip() for m in (text or "").split("+") if m.strip()]


def _done_intervals(conn: sqlite3.Connection) -> list[tuple[int, int]]:
    return sorted(conn.execute("SELECT lo, hi FROM chunks"))


def _missing(start: int, stop: int, done: Sequence[tuple[int, int]]) -> list[tuple[int, int]]:
    """[start, stop] minus the union of the done intervals."""
    out, x = [], start
    for lo, hi in done:
        if hi < x:
            continue
        if lo > stop:
            break
        if lo > x:
            out.append((x, lo - 1))
        x = max(x, hi + 1)
        if x > stop:
            break
    if x <= stop:
        out.append((x, stop))
    return out


def _chunk_checksum(rows: Sequence[Sequence]) -> str:
    """SHA-256 of the rows of a chunk (in increasing D, each column as stored)."""
    h = hashlib.sha256()
    for r in sorted(rows, key=lambda r: r[0]):
        D, dk, f, hn, hw, inv, g, reg = r
        inv_t = inv if inv is None or isinstance(inv, str) else _inv_text(inv)
        reg_t = None if reg is None else repr(round(float(reg), 9))
        h.update(repr((int(D), int(dk), int(f), int(hn), hw, inv_t, int(g), reg_t)).encode())
    return h.hexdigest()


def row_problem(D: int, dk: int, f: int, h: int, inv: str | None, g: int) -> str | None:
    """Why a stored row fails the identities every true row satisfies, or ``None``.

    The checks: ``D = f²·d_K`` with ``d_K`` fundamental (every discriminant is ``f²``
    times a fundamental one; Cox, *Primes of the form x²+ny²*, §7.A); the invariants ``n1 | n2 | …`` have
    product ``h``; the number of genera is a power of two dividing ``h`` (Gauss:
    ``2^(μ−1)`` genera of equal size, Cox Thm 3.15) with the 2-rank of the invariants
    equal to ``log₂`` of it (genus theory: Cl/Cl² has order the number of genera).

    Examples
    --------
    >>> row_problem(-84, -84, 1, 4, "2,2", 4) is None
    True
    >>> row_problem(-84, -84, 1, 4, "2,4", 4)
    'invariants 2,4 have product 8, not h = 4'
    """
    from ..core.discriminants import is_fundamental_discriminant

    if f * f * dk != D or f < 1 or not is_fundamental_discriminant(dk):
        return f"D = {D} is not f²·d_K for f = {f}, d_K = {dk} (fundamental)"
    if h < 1 or g < 1 or g & (g - 1) or h % g:
        return f"{g} genera is not a power of two dividing h = {h}"
    if inv is not None:
        try:
            nums = tuple(int(x) for x in inv.split(",")) if inv else ()
        except ValueError:
            return f"invariants {inv!r} are not integers"
        if math.prod(nums) != h:
            return f"invariants {inv} have product {math.prod(nums)}, not h = {h}"
        if any(y % x for x, y in itertools.pairwise(nums)) or any(x < 2 for x in nums):
            return f"invariants {inv} do not form a chain n1 | n2 | …"
        if 2 ** sum(1 for x in nums if x % 2 == 0) != g:
            return f"invariants {inv} have 2-rank {sum(1 for x in nums if x % 2 == 0)}, but {g} genera"
    return None


def verify_store(conn: sqlite3.Connection) -> list[tuple[int, int, str]]:
    """Every damaged chunk ``(lo, hi, why)``: checksum, row count or a row identity fails.

    Raises
    ------
    StoreDamagedError
        If SQLite itself cannot read the file (damaged pages).
    """
    damaged = []
    try:
        chunks = list(conn.execute("SELECT lo, hi, row_count, checksum FROM chunks ORDER BY lo"))
        for lo, hi, count, checksum in chunks:
            rows = list(
                conn.execute(
                    "SELECT " + ", ".join(_COLUMNS) + " FROM rows WHERE discriminant BETWEEN ? AND ?",
                    (lo, hi),
                )
            )
            why = None
            if len(rows) != count:
                why = f"{len(rows)} rows instead of {count}"
            elif checksum is not None and _chunk_checksum(rows) != checksum:
                why = "checksum of its rows does not match"
            else:
                for D, dk, f, h, _hw, inv, g, _reg in rows:
                    why = row_problem(D, dk, f, h, inv, g)
                    if why:
                        why = f"row D = {D}: {why}"
                        break
            if why:
                damaged.append((lo, hi, why))
        conn.execute("PRAGMA quick_check").fetchall()
    except sqlite3.DatabaseError as exc:
        raise StoreDamagedError(
            f"the table store file is damaged beyond its chunks (SQLite: {exc}); delete it and rebuild "
            "with the same formkit table --from/--to --db command"
        ) from None
    return damaged


def _damage_message(path: str, damaged: Sequence[tuple[int, int, str]]) -> str:
    shown = "; ".join(f"[{lo}, {hi}] ({why})" for lo, hi, why in damaged[:3])
    more = f" and {len(damaged) - 3} more" if len(damaged) > 3 else ""
    lo, hi = damaged[0][0], damaged[-1][1]
    return (
        f"{os.fspath(path)!r} has {len(damaged)} damaged chunk{'s' if len(damaged) > 1 else ''}: "
        f"{shown}{more}; repair with formkit table --from {lo} --to {hi} --db {os.fspath(path)} "
        "(same options as the build: damaged chunks are recomputed)"
    )


def _drop_damaged(conn: sqlite3.Connection) -> int:
    """Delete damaged chunks and their rows so that a build recomputes them; their number."""
    damaged = verify_store(conn)
    if damaged:
        conn.execute("BEGIN IMMEDIATE")
        for lo, hi, _why in damaged:
            conn.execute("DELETE FROM rows WHERE discriminant BETWEEN ? AND ?", (lo, hi))
            conn.execute("DELETE FROM chunks WHERE lo = ? AND hi = ?", (lo, hi))
        conn.execute("COMMIT")
    return len(damaged)


def _write_chunk(conn: sqlite3.Connection, spec: ChunkSpec, rows: Sequence[RawRow], seconds: float) -> bool:
    """Write one chunk in one transaction; ``False`` if another writer has already stored a
    chunk overlapping it (its rows are then left as that writer wrote them)."""
    try:
        conn.execute("BEGIN IMMEDIATE")
    except sqlite3.OperationalError as exc:
        raise FormkitError(
            f"the table store is locked by another writer for over a minute ({exc}); "
            "wait for it to finish, then run this command again to fill in what is left"
        ) from None
    taken = conn.execute(
        "SELECT 1 FROM chunks WHERE lo <= ? AND hi >= ? LIMIT 1", (spec.hi, spec.lo)
    ).fetchone()
    if taken:
        conn.execute("ROLLBACK")
        return False
    try:
        conn.executemany(
            "INSERT INTO rows (discriminant, fundamental_discriminant, conductor, class_number, "
            "class_number_wide, invariants, genus_count, regulator) VALUES (?, ?, ?, ?, ?, ?, ?, ?)",
            # ascending keys append to the B-tree: the cheapest insertion order
            ((D, dk, f, h, hw, _inv_text(inv), g, reg) for (D, dk, f, h, hw, inv, g, reg) in sorted(rows)),
        )
        conn.execute(
            "INSERT INTO chunks (lo, hi, row_count, seconds, finished, checksum, method) "
            "VALUES (?, ?, ?, ?, ?, ?, ?)",
            (
                spec.lo,
                spec.hi,
                len(rows),
                round(seconds, 6),
                time.strftime("%Y-%m-%dT%H:%M:%S"),
                _chunk_checksum(rows),
                chunk_method(spec),
            ),
        )
    except sqlite3.IntegrityError:  # rows of another writer's overlapping chunk
        conn.execute("ROLLBACK")
        return False
    except BaseException:
        conn.execute("ROLLBACK")
        raise
    conn.execute("COMMIT")
    return True


# ---------------------------------------------------------------------------
# reading back
# ---------------------------------------------------------------------------


def _int_filter(name: str, value: object, minimum: int | None = None) -> int:
    v = as_int(value, name)
    if minimum is not None and v < minimum:
        raise FormkitError(f"{name} must be at least {minimum}, not {v}")
    return v


def query_table(
    path: str,
    *,
    start: int | None = None,
    stop: int | None = None,
    class_number: int | None = None,
    invariants: object = None,
    conductor: int | None = None,
    fundamental: bool = False,
    fundamental_discriminant: int | None = None,
    genus_count: int | None = None,
    limit: int | None = None,
) -> ClassNumberTable:
    """Rows of the table store ``path`` that pass every given filter.

    Parameters
    ----------
    path : str
        A file written by :func:`build_table`.
    start, stop : int, optional
        Keep ``start ≤ D ≤ stop``.
    class_number : int, optional
        The narrow class number ``h⁺(D)`` (forms up to proper equivalence; ``h(D)`` for ``D < 0``).
    invariants : str or sequence of int, optional
        The group structure, e.g. ``"2,2,4"`` (``"1"`` for the trivial group); needs
        a store built with invariants.
    conductor, fundamental_discriminant, genus_count : int, optional
        Exact matches.
    fundamental : bool
        Only fundamental discriminants (conductor 1).
    limit : int, optional
        At most this many rows.

    Returns
    -------
    ClassNumberTable
        A list of :class:`TableRow` in order of increasing ``|D|``, with notebook displays.

    Raises
    ------
    FormkitError
        If the file is missing or not a table store, a filter value is invalid, or
        invariants are asked of a store built without them.

    Examples
    --------
    >>> import tempfile, os
    >>> db = os.path.join(tempfile.mkdtemp(), "t.db")
    >>> _ = build_table(db, -200, -3, workers=1)
    >>> [r.discriminant for r in query_table(db, invariants="2,2", fundamental=True)]
    [-84, -120, -132, -168, -195]
    >>> [r.discriminant for r in query_table(db, class_number=1, fundamental=True)]
    [-3, -4, -7, -8, -11, -19, -43, -67, -163]
    """
    if start is not None and stop is not None:
        _check_range(start, stop)
    conn = _connect(path, create=False)
    try:
        damaged = verify_store(conn)
        if damaged:
            raise StoreDamagedError(_damage_message(path, damaged))
        meta = _meta(conn)
        where: list[str] = []
        params: list[int | str | None] = []
        if start is not None:
            where.append("discriminant >= ?")
            params.append(as_int(start, "start"))
        if stop is not None:
            where.append("discriminant <= ?")
            params.append(as_int(stop, "stop"))
        if class_number is not None:
            where.append("class_number = ?")
            params.append(_int_filter("class number", class_number, 1))
        if conductor is not None:
            where.append("conductor = ?")
            params.append(_int_filter("conductor", conductor, 1))
        if fundamental:
            where.append("conductor = 1")
        if fundamental_discriminant is not None:
            where.append("fundamental_discriminant = ?")
            params.append(as_int(fundamental_discriminant, "fundamental discriminant"))
        if genus_count is not None:
            where.append("genus_count = ?")
            params.append(_int_filter("number of genera", genus_count, 1))
        if invariants is not None:
            if meta.get("invariants") != "1":
                raise FormkitError(
                    f"{os.fspath(path)!r} was built without invariants (--no-invariants); "
                    "rebuild into a new file to filter by group structure"
                )
            where.append("invariants = ?")
            params.append(_inv_text(parse_invariants(invariants)))
        sql = "SELECT " + ", ".join(_COLUMNS) + " FROM rows"
        if where:
            sql += " WHERE " + " AND ".join(where)
        sql += " ORDER BY abs(discriminant), discriminant"
        if limit is not None:
            sql += " LIMIT ?"
            params.append(_int_filter("limit", limit, 0))
        out = []
        try:
            for D, dk, f, h, hw, inv, g, reg in conn.execute(sql, params):
                why = row_problem(D, dk, f, h, inv, g)
                if why:  # a row outside every chunk, or damage the chunk check missed
                    raise StoreDamagedError(
                        f"{os.fspath(path)!r}: row D = {D} fails a check ({why}); repair with formkit table "
                        f"--from {D} --to {D} --db {os.fspath(path)} after deleting the file's damaged part"
                    )
                out.append(TableRow(D, dk, f, h, _inv_from_text(inv), g, hw, reg))
        except sqlite3.DatabaseError as exc:
            raise StoreDamagedError(
                f"{os.fspath(path)!r} is damaged (SQLite: {exc}); delete it and rebuild with the same "
                "formkit table --from/--to --db command"
            ) from None
        return ClassNumberTable(out)
    finally:
        conn.close()


def table_info(path: str) -> dict:
    """Options, provenance and coverage of a table store.

    Returns
    -------
    dict
        ``meta`` (options, method, certified …), ``rows``, ``chunks``, ``covered``
        (the finished ranges merged into maximal intervals) and ``methods`` (for each
        method, the ranges its chunks cover; ``"not recorded"`` for chunks of stores
        written before chunks carried their method).
    """
    conn = _connect(path, create=False)
    try:
        damaged = verify_store(conn)
        meta = _meta(conn)
        nrows = conn.execute("SELECT count(*) FROM rows").fetchone()[0]
        done = _done_intervals(conn)
        methods: dict[str, list[list[int]]] = {}
        for lo, hi, m in conn.execute("SELECT lo, hi, method FROM chunks ORDER BY lo"):
            spans = methods.setdefault(m or "not recorded", [])
            if spans and lo <= spans[-1][1] + 1 + (1 if spans[-1][1] == -1 else 0):
                spans[-1][1] = max(spans[-1][1], hi)
            else:
                spans.append([lo, hi])
        covered: list[list[int]] = []
        for lo, hi in done:
            if covered and lo <= covered[-1][1] + 1 + (1 if covered[-1][1] == -1 else 0):
                covered[-1][1] = max(covered[-1][1], hi)
            else:
                covered.append([lo, hi])
        return {
            "path": os.fspath(path),
            "meta": meta,
            "rows": nrows,
            "chunks": len(done),
            "covered": covered,
            "methods": methods,
            "verified": not damaged,
            "damaged": [[lo, hi, why] for lo, hi, why in damaged],
        }
    finally:
        conn.close()
