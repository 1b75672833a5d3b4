"""Building a class-number table store on all cores or a Dask cluster, resumably.

:func:`build_table` splits a range of discriminants into chunks (see
:mod:`formkit.tables.rows`), computes them in worker processes (``workers``, default all
cores) or on an existing Dask distributed cluster (``cluster``), and writes each chunk
to the SQLite file of :mod:`formkit.tables.store` in one transaction, so a stopped run
resumes where it stopped.  Progress goes to stderr (tqdm) only when stderr is a
terminal.

References
----------
.. [1] Dask Development Team, *Dask: Library for dynamic task scheduling*, 2016
       (``distributed.Client``, ``as_completed``).
"""

from __future__ import annotations

import math
import os
import threading
import time
from collections.abc import Callable, Iterable
from dataclasses import dataclass

from ..core.arith import as_int, isqrt
from ..errors import FormkitError
from .rows import (
    CHUNK_THETA,
    THETA_CROSSOVER,
    ChunkSpec,
    RawRow,
    TableRow,
    _check_engine,
    _check_range,
    chunk_method,
    compute_chunk,
    split_range,
)
from .small_forms import WORD_BOUND
from .store import _check_or_record_meta, _connect, _done_intervals, _drop_damaged, _missing, _write_chunk

__all__ = [
    "BuildSummary",
    "build_table",
    "table_cost",
]

#: Default chunk widths (numbers of consecutive integers D per chunk).
CHUNK_NEGATIVE_FAST = 100_000
CHUNK_NEGATIVE_PYTHON = 250_000
CHUNK_WITH_INVARIANTS = 20_000  # structures from h are cheap; the sweep per chunk is not
CHUNK_POSITIVE = 1_000


@dataclass(frozen=True)
class BuildSummary:
    """What a :func:`build_table` run did."""

    path: str | None
    start: int
    stop: int
    chunks_total: int
    chunks_already_done: int
    chunks_computed: int
    rows_written: int
    seconds: float
    workers: int
    cluster: str | None

    def to_dict(self) -> dict:
        return dict(self.__dict__)

    def _text(self) -> str:
        where = f"into {self.path!r}" if self.path else "in memory"
        how = f"on the Dask cluster {self.cluster}" if self.cluster else f"with {self.workers} worker(s)"
        return (
            f"table of D from {self.start} to {self.stop} {where}: {self.chunks_computed} of "
            f"{self.chunks_total} chunks computed ({self.chunks_already_done} already stored), "
            f"{self.rows_written} rows written in {self.seconds:.1f} s {how}; every row unconditional"
        )

    def __repr__(self) -> str:
        return f"<{self._text()}>"

    def _repr_html_(self) -> str:
        import html

        return html.escape(self._text())

    def _repr_latex_(self) -> str:
        return r"$\text{" + self._text().replace("_", r"\_").replace("%", r"\%") + "}$"


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


def _run_chunks(specs: list[ChunkSpec], workers: int, cluster, sink: Callable, bar) -> None:
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


def _run_on_cluster(specs: list[ChunkSpec], cluster, sink: Callable, bar) -> None:
    from ..core.cluster import connect_cluster

    client, own = connect_cluster(cluster)
    from distributed import as_completed

    try:
        futures = client.map(compute_chunk, specs, pure=False)
        for fut in as_completed(futures):
            sink(*fut.result())
            bar.update(1)
    finally:
        if own:
            client.close()


class _NoBar:
    def update(self, n: int) -> None:
        pass

    def close(self) -> None:
        pass


def _progress_bar(total: int, show: bool | None, desc: str):
    """The chunk bar: formkit.core.progress's (stderr only, off with --quiet); ``show=False``
    turns it off for this call, ``show=True`` shows it at once instead of after two seconds."""
    if show is False:
        return _NoBar()
    from ..core.progress import ProgressBar

    return ProgressBar(total, desc, "chunk", 0.0 if show else 2.0)


def _plan(
    start: int,
    stop: int,
    missing: Iterable[tuple[int, int]],
    fundamental: bool,
    invariants: bool,
    engine: str,
    chunk_size: int | None,
) -> list[ChunkSpec]:
    specs = []
    for lo, hi in missing:
        if chunk_size is not None:
            size = chunk_size
        elif (
            lo < 0 and not invariants and (engine == "theta" or (engine == "auto" and -lo >= THETA_CROSSOVER))
        ):
            size = CHUNK_THETA  # each chunk needs the FFT series to its end: computed once per worker
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


def table_cost(
    intervals: Iterable[tuple[int, int]], invariants: bool, engine: str = "auto"
) -> tuple[float, float]:
    """Estimated (CPU seconds, bytes) of computing the table rows of the given ranges of D.

    Negative ranges without invariants are swept at once (:mod:`formkit.tables.sweep`):
    loops to ``√|D|`` plus about a microsecond per ``D`` (measured here, rounded up).
    Where the theta series is used (``engine="theta"``, or ``"auto"`` beyond
    :data:`~formkit.tables.rows.THETA_CROSSOVER`): the FFT series to ``|D|`` once per
    worker (``1.5·10⁻⁷·|D|`` s, about 16 bytes per integer up to ``|D|``), the quotient of
    the Kronecker–Hurwitz relation to ``|D|/8`` once per worker (``2·10⁻⁷·|D|`` s) and the
    windows (``4·10⁻⁷`` s per ``D``); fitted to ``benchmarks/bench_theta.py`` at ``10⁷`` and
    ``10⁸`` (docs/performance.md, "Tables at scale") and rounded up.
    Invariants of negative ranges: the sweep per chunk and the structure from ``h``
    (:mod:`formkit.tables.structure`, ``10⁻⁵·log₂ √|D|`` s per discriminant, about twice
    the measured figure).  Positive ranges, and invariants beyond ``|D| = 2^60``, cost
    one class-group computation per discriminant, priced at the largest ``|D|`` by
    :func:`formkit.core.enumeration.enumeration_cost` (about half the integers are
    discriminants).  Memory: the sweep tables, one chunk of rows, and about 200 bytes
    per row kept for the caller.

    Examples
    --------
    >>> t, m = table_cost([(-10**6, -3)], invariants=False)
    >>> t < 60 and m < 2**30
    True
    >>> table_cost([(-30, 10**10)], invariants=True)[0] > 10**6
    True
    >>> 300 < table_cost([(-10**7, -3)], invariants=True)[0] < 1800   # about 300 CPU-s measured
    True
    >>> t, m = table_cost([(-10**8, -3)], invariants=False)  # theta + relation: 50 CPU-s measured
    >>> 50 < t < 150 and 1.5 * 2**30 < m < 2 * 2**30  # theta_memory (0.97 GiB) + 200 B per row of a chunk
    True
    """
    from ..classgroups.baby_step_giant_step import bsgs_cost
    from ..classgroups.dispatch import ENUMERATION_LIMIT
    from ..core.budget import to_float
    from ..core.enumeration import enumeration_cost
    from .theta import theta_memory

    seconds = memory = 0.0
    for lo, hi in intervals:
        for a, b in ((lo, min(hi, -1)), (max(lo, 1), hi)):
            if a > b:
                continue
            count = to_float(b - a + 1)
            M = max(abs(a), abs(b))
            root = to_float(isqrt(M))
            if (
                b < 0
                and not invariants
                and (engine == "theta" or (engine == "auto" and M >= THETA_CROSSOVER))
            ):
                seconds += 3.5e-7 * M + count * 4e-7
                memory = max(memory, theta_memory(int(M)) + 200 * min(count, CHUNK_THETA))
            elif b < 0 and not invariants:
                seconds += 3e-6 * root + 1e-6 * count * (1 + math.log(root + 2))
                memory = max(memory, 40 * root + 200 * min(count, CHUNK_NEGATIVE_PYTHON))
            elif b < 0 and M < WORD_BOUND:
                # h swept chunk by chunk, then the structure from h (formkit.tables.structure):
                # measured about 6·10⁻⁵ CPU-s per discriminant near |D| = 10⁷, priced at
                # 10⁻⁵·log₂ √M per discriminant (twice that there)
                chunks = count / CHUNK_WITH_INVARIANTS + 1
                seconds += 3e-6 * root * chunks + 1e-6 * count * (1 + math.log(root + 2))
                seconds += (count / 2) * 1e-5 * math.log2(root + 2)
                memory = max(memory, 40 * root + 200 * min(count, CHUNK_NEGATIVE_PYTHON))
            else:
                if b < 0 and M > ENUMERATION_LIMIT:  # class_group uses baby-step giant-step there
                    t, m = bsgs_cost(-M)
                else:
                    t, m = enumeration_cost(-M if b < 0 else M)
                seconds += (count / 2) * max(t, 2e-5)
                memory = max(memory, m + 200 * min(count, CHUNK_POSITIVE))
    return seconds, memory


def _check_table_cost(
    intervals: list[tuple[int, int]], invariants: bool, workers: int, engine: str = "auto"
) -> None:
    from ..core.budget import check_cost, describe_integer

    if not intervals:
        return
    seconds, memory = table_cost(intervals, invariants, engine)
    lo, hi = intervals[0][0], intervals[-1][1]
    check_cost(
        f"the table of {describe_integer(lo)} ≤ D ≤ {describe_integer(hi)}"
        + (" with invariants" if invariants else "")
        + f" on {workers} worker{'s' if workers > 1 else ''}",
        seconds=seconds / max(1, workers),
        memory=memory * max(1, workers),
        further="a narrower range (several runs into one --db file add up)"
        + ("" if not invariants else ", or --no-invariants for negative ranges"),
    )


def _check_workers(workers: int | None) -> int:
    if workers is None:
        return os.cpu_count() or 1
    workers = as_int(workers, "workers")
    if workers < 1:
        raise FormkitError(f"workers must be at least 1, not {workers}")
    return workers


def build_table(
    path: str | None,
    start: int,
    stop: int,
    *,
    fundamental: bool = False,
    invariants: bool = True,
    workers: int | None = None,
    cluster=None,
    chunk_size: int | None = None,
    engine: str = "auto",
    progress: bool | None = None,
    rows_out: list | None = None,
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
        20 000 with invariants, 1 000 for ``D > 0``).
    engine : {"auto", "numpy", "python", "theta"}
        The sweep for negative discriminants, or the three-squares theta series
        (:mod:`formkit.tables.theta`; chunks of :data:`CHUNK_THETA` integers, each worker
        computing the FFT series once, up to the end of its first and largest chunk).
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
    _check_engine(engine)  # "auto" stays in the chunks: each resolves it by its own range
    if chunk_size is not None:
        chunk_size = as_int(chunk_size, "chunk size")
        if chunk_size < 1:
            raise FormkitError(f"chunk size must be a positive integer, not {chunk_size}")
    t0 = time.perf_counter()
    conn = None
    if path is not None:
        conn = _connect(path, create=True)
        _check_or_record_meta(conn, path, bool(fundamental), bool(invariants), [])  # options must match
        _drop_damaged(conn)  # damaged chunks are recomputed, never trusted
        done = _done_intervals(conn)
    else:
        done = []
    missing = _missing(start, stop, done)
    if cluster is None:
        _check_table_cost(missing, bool(invariants), min(workers, os.cpu_count() or 1), engine)
    already = sum(1 for lo, hi in done if hi >= start and lo <= stop)
    specs = _plan(start, stop, missing, bool(fundamental), bool(invariants), engine, chunk_size)
    if conn is not None and path is not None and specs:  # the store names every method used
        _check_or_record_meta(
            conn, path, bool(fundamental), bool(invariants), [chunk_method(s) for s in specs]
        )
    written = [0]

    def sink(spec: ChunkSpec, rows: list[RawRow], seconds: float) -> None:
        if conn is not None and not _write_chunk(conn, spec, rows, seconds):
            return  # another writer stored this part of the range first
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
