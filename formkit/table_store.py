"""Resumable class-number tables in an SQLite file, computed on all cores or a cluster.

:func:`build_table` splits a range of discriminants into chunks (see
:mod:`formkit.tables`), computes them in worker processes (``workers``, default all
cores) or on an existing Dask distributed cluster (``cluster``), and writes each chunk
to the file in **one transaction** that also records the chunk in the ``chunks``
table.  A run stopped at any moment — Ctrl-C, ``kill -9``, a lost machine — leaves
only whole chunks in the file; running the same command again computes just the
parts of the range no finished chunk covers.  :func:`query_table` reads rows back
with filters (class number, invariants, conductor, …); no SQL is taken from users.

The file holds three tables: ``meta`` (options and provenance: the method is
complete enumeration, so every row is unconditional), ``chunks`` (finished ranges)
and ``rows`` (one per discriminant, primary key ``discriminant``, so a row can never
appear twice).  The journal is SQLite's write-ahead log, so the file can be queried
while a build is running.

References
----------
.. [1] SQLite documentation, "Atomic Commit In SQLite" and "Write-Ahead Logging"
       (transactions are atomic across process crashes).
"""

from __future__ import annotations

import os
import sqlite3
import sys
import threading
import time
from dataclasses import dataclass
from typing import Callable, Iterable, List, Optional, Sequence, Tuple

from .core.arith import as_int
from .errors import FormkitError
from .tables import ChunkSpec, RawRow, TableRow, _check_engine, _check_range, compute_chunk, split_range

__all__ = [
    "BuildSummary",
    "build_table",
    "query_table",
    "table_info",
    "parse_invariants",
]

_FORMAT = "formkit-table-1"
_COLUMNS = ("discriminant", "fundamental_discriminant", "conductor", "class_number",
            "class_number_wide", "invariants", "genus_count", "regulator")
_SCHEMA = """
CREATE TABLE IF NOT EXISTS meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS chunks (
    lo INTEGER NOT NULL, hi INTEGER NOT NULL, row_count INTEGER NOT NULL,
    seconds REAL NOT NULL, finished TEXT NOT NULL, PRIMARY KEY (lo, hi));
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

#: Default chunk widths (numbers of consecutive integers D per chunk).
CHUNK_NEGATIVE_FAST = 100_000
CHUNK_NEGATIVE_PYTHON = 250_000
CHUNK_WITH_INVARIANTS = 2_000
CHUNK_POSITIVE = 1_000


@dataclass(frozen=True)
class BuildSummary:
    """What a :func:`build_table` run did."""

    path: Optional[str]
    start: int
    stop: int
    chunks_total: int
    chunks_already_done: int
    chunks_computed: int
    rows_written: int
    seconds: float
    workers: int
    cluster: Optional[str]

    def to_dict(self) -> dict:
        return dict(self.__dict__)


# ---------------------------------------------------------------------------
# invariants text
# ---------------------------------------------------------------------------

def parse_invariants(value: object) -> Tuple[int, ...]:
    """Canonical invariants ``n1 | n2 | … | nk`` (factors 1 dropped) from text or a sequence.

    Parameters
    ----------
    value : str or sequence of int
        ``"2,2,4"``, ``"2 4"``, ``"[2, 4]"``, ``(2, 4)``; ``"1"`` or ``""`` is the
        trivial group.

    Raises
    ------
    FormkitError
        If an entry is not a positive integer or the chain ``n1 | n2 | …`` fails.

    Examples
    --------
    >>> parse_invariants("2,2,4"), parse_invariants("1"), parse_invariants([1, 3])
    ((2, 2, 4), (), (3,))
    >>> parse_invariants("2,3")
    Traceback (most recent call last):
    ...
    formkit.errors.FormkitError: invariants must form a chain n1 | n2 | …, not 2,3 (2 does not divide 3)
    """
    if isinstance(value, str):
        text = value.strip().strip("[]()").replace(",", " ")
        parts = text.split()
        nums = []
        for p in parts:
            if not p.isdigit():
                raise FormkitError(f"invariants must be positive integers such as 2,2,4, not {value!r}")
            nums.append(int(p))
    else:
        try:
            nums = [as_int(x, "invariant") for x in value]  # type: ignore[union-attr]
        except TypeError:
            raise FormkitError(f"invariants must be a list of positive integers, not {value!r}") from None
    if any(n < 1 for n in nums):
        raise FormkitError(f"invariants must be positive integers, not {nums}")
    nums = [n for n in nums if n != 1]
    for x, y in zip(nums, nums[1:]):
        if y % x:
            shown = ",".join(map(str, nums))
            raise FormkitError(f"invariants must form a chain n1 | n2 | …, not {shown} ({x} does not divide {y})")
    return tuple(nums)


def _inv_text(inv: Optional[Sequence[int]]) -> Optional[str]:
    return None if inv is None else ",".join(str(int(x)) for x in inv)


def _inv_from_text(text: Optional[str]) -> Optional[Tuple[int, ...]]:
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
        else:
            names = {r[0] for r in conn.execute("SELECT name FROM sqlite_master WHERE type='table'")}
            if not {"meta", "chunks", "rows"} <= names:
                raise FormkitError(f"{path!r} is not a formkit table store (tables meta, chunks, rows missing)")
    except sqlite3.DatabaseError as exc:
        raise FormkitError(f"{path!r} is not a usable SQLite table store: {exc}") from None
    return conn


def _meta(conn: sqlite3.Connection) -> dict:
    return dict(conn.execute("SELECT key, value FROM meta"))


def _check_or_record_meta(conn: sqlite3.Connection, path: str, fundamental: bool, invariants: bool) -> None:
    want = {"fundamental": str(int(fundamental)), "invariants": str(int(invariants))}
    meta = _meta(conn)
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
        return
    from . import __version__

    rows = {
        "format": _FORMAT,
        **want,
        "method": "enumeration",
        "certified": "1",
        "assumption": "none",
        "description": "class numbers by counting reduced forms (Gauss; Cohen GTM 138 Alg. 5.3.5); "
        "invariants from h and the 2-rank where these decide them, else by formkit.class_group "
        "(complete enumeration); genera 2^(mu-1) (Cox Prop 3.11, Thm 3.15)",
        "formkit_version": __version__,
        "created": time.strftime("%Y-%m-%dT%H:%M:%S"),
    }
    conn.execute("BEGIN IMMEDIATE")
    conn.executemany("INSERT INTO meta (key, value) VALUES (?, ?)", rows.items())
    conn.execute("COMMIT")


def _done_intervals(conn: sqlite3.Connection) -> List[Tuple[int, int]]:
    return sorted(conn.execute("SELECT lo, hi FROM chunks"))


def _missing(start: int, stop: int, done: Sequence[Tuple[int, int]]) -> List[Tuple[int, int]]:
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


def _write_chunk(conn: sqlite3.Connection, spec: ChunkSpec, rows: Sequence[RawRow], seconds: float) -> None:
    conn.execute("BEGIN IMMEDIATE")
    try:
        conn.executemany(
            "INSERT INTO rows (discriminant, fundamental_discriminant, conductor, class_number, "
            "class_number_wide, invariants, genus_count, regulator) VALUES (?, ?, ?, ?, ?, ?, ?, ?)",
            # ascending keys append to the B-tree: the cheapest insertion order
            ((D, dk, f, h, hw, _inv_text(inv), g, reg) for (D, dk, f, h, hw, inv, g, reg) in sorted(rows)),
        )
        conn.execute(
            "INSERT INTO chunks (lo, hi, row_count, seconds, finished) VALUES (?, ?, ?, ?, ?)",
            (spec.lo, spec.hi, len(rows), round(seconds, 6), time.strftime("%Y-%m-%dT%H:%M:%S")),
        )
    except BaseException:
        conn.execute("ROLLBACK")
        raise
    conn.execute("COMMIT")


# ---------------------------------------------------------------------------
# running chunks: in process, on a process pool, on a Dask cluster
# ---------------------------------------------------------------------------

def _watch_parent(parent: int) -> None:  # pragma: no cover - runs in pool workers
    while True:
        time.sleep(0.5)
        if os.getppid() != parent:
            os._exit(1)


def _worker_init(parent: int) -> None:  # pragma: no cover - runs in pool workers
    # Ctrl-C is the parent's business (it stops the pool); a worker whose parent was
    # killed (kill -9) stops instead of lingering
    import signal

    signal.signal(signal.SIGINT, signal.SIG_IGN)
    threading.Thread(target=_watch_parent, args=(parent,), daemon=True).start()


def _run_chunks(specs: List[ChunkSpec], workers: int, cluster, sink: Callable, bar) -> None:
    if not specs:
        return
    if cluster is not None:
        _run_on_cluster(specs, cluster, sink, bar)
    elif workers <= 1 or len(specs) == 1:
        for spec in specs:
            sink(*compute_chunk(spec))
            bar.update(1)
    else:
        import multiprocessing as mp

        ctx = mp.get_context()
        with ctx.Pool(min(workers, len(specs)), initializer=_worker_init, initargs=(os.getpid(),)) as pool:
            for result in pool.imap_unordered(compute_chunk, specs, chunksize=1):
                sink(*result)
                bar.update(1)


def _run_on_cluster(specs: List[ChunkSpec], cluster, sink: Callable, bar) -> None:
    try:
        from distributed import Client, as_completed
    except ImportError:
        raise FormkitError(
            "--cluster needs Dask distributed: pip install 'formkit[cluster]'"
        ) from None
    own = isinstance(cluster, str)
    try:
        client = Client(cluster) if own else cluster
    except (OSError, TimeoutError, ValueError) as exc:
        raise FormkitError(f"could not connect to the Dask scheduler at {cluster!r}: {exc}") from None
    try:
        try:  # the scheduler and every worker must be able to import formkit
            client.submit(_cluster_probe, pure=False).result()
        except Exception as exc:
            raise FormkitError(
                f"the Dask cluster at {cluster!r} cannot run formkit tasks ({type(exc).__name__}: "
                f"{' '.join(str(exc).split())[:200]}); install formkit on the scheduler and every worker"
            ) from None
        futures = client.map(compute_chunk, specs, pure=False)
        for fut in as_completed(futures):
            sink(*fut.result())
            bar.update(1)
    finally:
        if own:
            client.close()


def _cluster_probe() -> str:  # runs on a Dask worker
    from . import __version__

    return __version__


class _NoBar:
    def update(self, n: int) -> None:
        pass

    def close(self) -> None:
        pass


def _progress_bar(total: int, show: Optional[bool], desc: str):
    if show is None:
        show = sys.stderr.isatty()
    if not show:
        return _NoBar()
    from tqdm import tqdm

    return tqdm(total=total, desc=desc, unit="chunk", file=sys.stderr, dynamic_ncols=True)


def _plan(start: int, stop: int, missing: Iterable[Tuple[int, int]], fundamental: bool,
          invariants: bool, engine: str, chunk_size: Optional[int]) -> List[ChunkSpec]:
    specs = []
    for lo, hi in missing:
        if chunk_size is not None:
            size = chunk_size
        elif lo > 0:
            size = CHUNK_POSITIVE
        elif invariants:
            size = CHUNK_WITH_INVARIANTS
        else:
            size = CHUNK_NEGATIVE_PYTHON if engine == "python" else CHUNK_NEGATIVE_FAST
        for a, b in split_range(lo, hi, size):
            specs.append(ChunkSpec(a, b, fundamental, invariants, engine))
    # costliest (largest |D|) first: the workers then finish close together
    specs.sort(key=lambda s: -max(abs(s.lo), abs(s.hi)))
    return specs


def _check_workers(workers: Optional[int]) -> int:
    if workers is None:
        return os.cpu_count() or 1
    workers = as_int(workers, "workers")
    if workers < 1:
        raise FormkitError(f"workers must be at least 1, not {workers}")
    return workers


def build_table(
    path: Optional[str],
    start: int,
    stop: int,
    *,
    fundamental: bool = False,
    invariants: bool = True,
    workers: Optional[int] = None,
    cluster=None,
    chunk_size: Optional[int] = None,
    engine: str = "auto",
    progress: Optional[bool] = None,
    rows_out: Optional[list] = None,
) -> BuildSummary:
    """Compute the table of ``start ≤ D ≤ stop`` into the SQLite file ``path``, resumably.

    Parameters
    ----------
    path : str or None
        The SQLite file (created if missing).  Chunks already recorded there are
        skipped.  ``None`` computes without a file; pass a list as ``rows_out`` to
        receive the rows.
    start, stop : int
        The range of ``D``, inclusive (negative, positive or both; non-discriminants
        and squares are skipped).
    fundamental : bool
        Only fundamental discriminants.
    invariants : bool
        Also the class-group invariants (one :func:`formkit.class_group` per ``D``;
        without them negative ranges are swept all at once and run far faster).
    workers : int, optional
        Worker processes (default ``os.cpu_count()``).
    cluster : str or distributed.Client, optional
        Run the chunks on this Dask distributed cluster (scheduler address such as
        ``"tcp://10.0.0.5:8786"``, or a client) instead of local processes.
    chunk_size : int, optional
        Consecutive integers ``D`` per chunk (default: 100 000 for the negative sweep,
        2 000 with invariants, 1 000 for ``D > 0``).
    engine : {"auto", "numpy", "python"}
        The sweep for negative discriminants.
    progress : bool, optional
        Show a tqdm progress bar on stderr (default: when stderr is a terminal).
    rows_out : list, optional
        Rows computed by this run are appended here as :class:`TableRow`.

    Returns
    -------
    BuildSummary

    Raises
    ------
    FormkitError
        For a bad range, worker count, chunk size or engine, a file built with other
        options, or an unreachable cluster.

    Examples
    --------
    >>> import tempfile, os
    >>> db = os.path.join(tempfile.mkdtemp(), "t.db")
    >>> s = build_table(db, -100, -3, invariants=False, workers=1, chunk_size=40)
    >>> s.chunks_computed, s.rows_written
    (3, 50)
    >>> build_table(db, -200, -3, invariants=False, workers=1, chunk_size=40).chunks_already_done
    3
    >>> [r.discriminant for r in query_table(db, class_number=5)]
    [-47, -79, -103, -127, -131, -179, -188]
    """
    start, stop = _check_range(start, stop)
    workers = _check_workers(workers)
    engine = _check_engine(engine)
    if chunk_size is not None:
        chunk_size = as_int(chunk_size, "chunk size")
        if chunk_size < 1:
            raise FormkitError(f"chunk size must be a positive integer, not {chunk_size}")
    t0 = time.perf_counter()
    conn = None
    if path is not None:
        conn = _connect(path, create=True)
        _check_or_record_meta(conn, path, bool(fundamental), bool(invariants))
        done = _done_intervals(conn)
    else:
        done = []
    missing = _missing(start, stop, done)
    already = sum(1 for lo, hi in done if hi >= start and lo <= stop)
    specs = _plan(start, stop, missing, bool(fundamental), bool(invariants), engine, chunk_size)
    written = [0]

    def sink(spec: ChunkSpec, rows: List[RawRow], seconds: float) -> None:
        if conn is not None:
            _write_chunk(conn, spec, rows, seconds)
        if rows_out is not None:
            rows_out.extend(TableRow._from_raw(r) for r in rows)
        written[0] += len(rows)

    bar = _progress_bar(len(specs), progress, "formkit table")
    try:
        _run_chunks(specs, workers, cluster, sink, bar)
    finally:
        bar.close()
        if conn is not None:
            conn.close()
    return BuildSummary(
        path=None if path is None else os.fspath(path),
        start=start,
        stop=stop,
        chunks_total=already + len(specs),
        chunks_already_done=already,
        chunks_computed=len(specs),
        rows_written=written[0],
        seconds=round(time.perf_counter() - t0, 3),
        workers=workers,
        cluster=cluster if isinstance(cluster, str) or cluster is None else repr(cluster),
    )


# ---------------------------------------------------------------------------
# reading back
# ---------------------------------------------------------------------------

def _int_filter(name: str, value: object, minimum: Optional[int] = None) -> int:
    v = as_int(value, name)
    if minimum is not None and v < minimum:
        raise FormkitError(f"{name} must be at least {minimum}, not {v}")
    return v


def query_table(
    path: str,
    *,
    start: Optional[int] = None,
    stop: Optional[int] = None,
    class_number: Optional[int] = None,
    invariants: object = None,
    conductor: Optional[int] = None,
    fundamental: bool = False,
    fundamental_discriminant: Optional[int] = None,
    genus_count: Optional[int] = None,
    limit: Optional[int] = None,
) -> List[TableRow]:
    """Rows of the table store ``path`` that pass every given filter.

    Parameters
    ----------
    path : str
        A file written by :func:`build_table`.
    start, stop : int, optional
        Keep ``start ≤ D ≤ stop``.
    class_number : int, optional
        ``h(D)`` (narrow for ``D > 0``).
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
    list of TableRow
        In order of increasing ``|D|``.

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
        meta = _meta(conn)
        where, params = [], []
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
        for D, dk, f, h, hw, inv, g, reg in conn.execute(sql, params):
            out.append(TableRow(D, dk, f, h, _inv_from_text(inv), g, hw, reg))
        return out
    finally:
        conn.close()


def table_info(path: str) -> dict:
    """Options, provenance and coverage of a table store.

    Returns
    -------
    dict
        ``meta`` (options, method, certified …), ``rows``, ``chunks`` and ``covered``
        (the finished ranges merged into maximal intervals).
    """
    conn = _connect(path, create=False)
    try:
        meta = _meta(conn)
        nrows = conn.execute("SELECT count(*) FROM rows").fetchone()[0]
        done = _done_intervals(conn)
        covered: List[List[int]] = []
        for lo, hi in done:
            if covered and lo <= covered[-1][1] + 1 + (1 if covered[-1][1] == -1 else 0):
                covered[-1][1] = max(covered[-1][1], hi)
            else:
                covered.append([lo, hi])
        return {"path": os.fspath(path), "meta": meta, "rows": nrows, "chunks": len(done), "covered": covered}
    finally:
        conn.close()
