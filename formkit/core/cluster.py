"""Connecting to a Dask distributed cluster: the plumbing shared by tables and class groups.

:func:`connect_cluster` turns what the user gave (a scheduler address such as
``"tcp://10.0.0.5:8786"``, or a ``distributed.Client``) into a client, checks that the
workers can import formkit, and says whether the caller owns (and so must close) the
client; :func:`stream_tasks` runs a stream of calls as futures and yields their results
as they finish.  Used by :func:`formkit.tables.parallel.build_table` (chunks of a table) and
:func:`formkit.classgroups.subexponential.class_group_subexponential` (sieve tasks).

References
----------
.. [1] Dask Development Team, *Dask: Library for dynamic task scheduling*, 2016
       (``distributed.Client``, ``as_completed``).
"""

from __future__ import annotations

from collections.abc import Callable, Generator, Iterator

from ..errors import FormkitError

__all__ = ["connect_cluster", "stream_tasks"]


def _cluster_probe() -> str:  # runs on a Dask worker
    from .._version import __version__

    return __version__


def connect_cluster(cluster, option: str = "--cluster"):
    """``(client, own)`` for a scheduler address or a client; ``own`` is true when the
    client was made here (the caller closes it).

    Parameters
    ----------
    cluster : str or distributed.Client
        The scheduler address, or a client already connected.
    option : str
        The option name used in error messages.

    Returns
    -------
    tuple
        ``(client, own)``.

    Raises
    ------
    FormkitError
        If Dask distributed is not installed, the scheduler cannot be reached, or the
        workers cannot run formkit.

    Examples
    --------
    A running scheduler is needed (tests/tables/test_tables.py and
    tests/classgroups/test_subexponential.py start a local one)::

        client, own = connect_cluster("tcp://10.0.0.5:8786")
    """
    try:
        from distributed import Client
    except ImportError:
        raise FormkitError(f"{option} needs Dask distributed: pip install 'formkit[cluster]'") from None
    own = isinstance(cluster, str)
    try:
        client = Client(cluster) if own else cluster
    except (OSError, TimeoutError, ValueError) as exc:
        raise FormkitError(f"could not connect to the Dask scheduler at {cluster!r}: {exc}") from None
    try:  # the scheduler and every worker must be able to import formkit
        client.submit(_cluster_probe, pure=False).result()
    except Exception as exc:
        if own:
            client.close()
        raise FormkitError(
            f"the Dask cluster at {cluster!r} cannot run formkit tasks ({type(exc).__name__}: "
            f"{' '.join(str(exc).split())[:200]}); install formkit on the scheduler and every worker"
        ) from None
    return client, own


def stream_tasks(
    cluster, fn: Callable, calls: Iterator[tuple], option: str = "--cluster", per_thread: int = 2
) -> Generator:
    """Yield ``fn(*args)`` for the argument tuples of ``calls``, run as futures on a Dask
    cluster, in the order they finish (``distributed.as_completed``).

    At most ``per_thread`` futures per worker thread are in flight; a new one is submitted
    for each result that comes back, so an endless ``calls`` is fine.  Closing the
    generator cancels the futures still running (and closes a client made here).

    Parameters
    ----------
    cluster : str or distributed.Client
        As for :func:`connect_cluster`.
    fn : callable
        A module-level function (the workers import it by name).
    calls : iterator of tuple
        The arguments of each call.
    option, per_thread
        The option name for error messages; futures in flight per worker thread.

    Raises
    ------
    FormkitError
        As :func:`connect_cluster`.
    """
    client, own = connect_cluster(cluster, option)
    from distributed import as_completed

    pending: set = set()
    try:
        threads = max(1, sum(client.nthreads().values()))

        def submit(args: tuple):
            fut = client.submit(fn, *args, pure=False)
            pending.add(fut)
            return fut

        flight = as_completed([submit(a) for _, a in zip(range(per_thread * threads), calls)])
        for fut in flight:
            pending.discard(fut)
            result = fut.result()
            nxt = next(calls, None)
            if nxt is not None:
                flight.add(submit(nxt))
            yield result
    finally:
        if pending:
            client.cancel(list(pending))
        if own:
            client.close()
