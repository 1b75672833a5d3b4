"""Connecting to a Dask distributed cluster: the plumbing shared by tables and class groups.

:func:`connect_cluster` turns what the user gave (a scheduler address such as
``"tcp://10.0.0.5:8786"``, or a ``distributed.Client``) into a client, checks that the
workers can import formkit, and says whether the caller owns (and so must close) the
client.  Used by :func:`formkit.tables.parallel.build_table` (chunks of a table) and
:func:`formkit.classgroups.subexponential.class_group_subexponential` (sieve tasks).

References
----------
.. [1] Dask Development Team, *Dask: Library for dynamic task scheduling*, 2016
       (``distributed.Client``, ``as_completed``).
"""

from __future__ import annotations

from ..errors import FormkitError

__all__ = ["connect_cluster"]


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
