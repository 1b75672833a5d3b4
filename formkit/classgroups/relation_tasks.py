"""Sieve parameters by size and the parallel sieve tasks of the subexponential method.

Shared by the two signs: :mod:`formkit.classgroups.subexponential` (``D < 0``) and
:mod:`formkit.classgroups.subexponential_real` (``D > 0``, with the regulator).  It holds

* :data:`SIEVE_TABLE`, :func:`factor_base_bound` (Bach's bound [1]) and
  :func:`sieve_parameters`, the parameters chosen by the size of ``D``;
* :func:`subexponential_cost`, the estimate that decides whether a run may start;
* the sieve tasks (a task is the unit of work of a worker process, of a Dask future
  and of the relation store), run on local processes or a cluster;
* the smoothness test over the factor base (Bernstein's product test [2], then trial
  division by the primes that divide).

References
----------
.. [1] E. Bach, "Explicit bounds for primality testing and related problems",
       Math. Comp. 55 (1990), 355–380.
.. [2] D. J. Bernstein, "How to find smooth parts of integers", 2004 (from memory).
.. [3] M. J. Jacobson, Jr., "Applying sieving to the computation of quadratic class
       groups", Math. Comp. 68 (1999), 859–867 (the sieve of each task).
"""

from __future__ import annotations

import math
import multiprocessing
from collections import deque
from collections.abc import Callable, Generator, Iterator

import numpy as np

from ..core.arith import mpz
from ..errors import FormkitError
from .baby_step_giant_step import bach_bound
from .relation_sieve import FactorBase, Relation, SieveParameters, sieve_relations
from .relation_store import RelationStore

__all__ = [
    "SIEVE_TABLE",
    "A_PER_TASK",
    "STALE_TASKS",
    "factor_base_bound",
    "sieve_parameters",
    "subexponential_cost",
]

#: Sieve parameters by size: ``(largest number of digits of |D|, M, polynomials per a,
#: large-prime factor)``; the factor-base bound is Bach's bound (see
#: :func:`factor_base_bound`).  Chosen with benchmarks/bench_subexponential.py and
#: sieve runs of six values of a per setting (docs/performance.md, "Subexponential class
#: groups", 2026-12-03): full relations per CPU second grow with M up to 640000 at 40
#: and 50 digits (the per-prime loop of the sieve is paid once per polynomial), but a
#: task then brings far more relations than needed and the linear algebra grows with
#: them (30 digits 4.1 -> 5.3 s, 40 digits 14.9 -> 16.7 s with M = 60000 / 160000), so
#: up to 50 digits the earlier rows stay; from 51 digits M = 640000 (measured at 60
#: digits).  A factor-base bound 1.5 or 2 times Bach's bound gave fewer full relations
#: per second per column, so it stays at Bach's.
SIEVE_TABLE: tuple[tuple[int, int, int, int], ...] = (
    (15, 1000, 2, 30),
    (20, 3000, 2, 40),
    (25, 6000, 4, 50),
    (30, 15000, 4, 60),
    (35, 25000, 4, 60),
    (40, 40000, 8, 80),
    (50, 80000, 8, 100),
    (10**9, 640000, 4, 100),
)

#: Cover primes (values of ``a``) per sieve task: one task is the unit of work of a
#: worker process and of the relation store (common practice, no source).
A_PER_TASK = 4

#: Sieve tasks in a row that add no new relation before the search gives up (tiny groups,
#: D = −20 say, have only a handful of distinct relations to find).
STALE_TASKS = 32


def subexponential_cost(D: int) -> tuple[float, float]:
    """Estimated ``(seconds, bytes)`` of :func:`class_group_subexponential` for ``D``.

    Fitted to the measured times (docs/performance.md, "Subexponential class groups",
    2026-12-03, one worker: medians 5.5 CPU-s at 30 digits, 19.8 s at 40; 82 s at 50 and
    525 s at 60 digits for one D each): ``3 · 82 s · exp(0.6·(ℓ(D) − ℓ(10^50)))`` with
    ``ℓ(D) = √(log|D|·log log|D|)``, the exponent of ``L_|D|[1/2, ·]`` (Hafner–McCurley,
    Buchmann), which gives 34–41 s at 40 digits and 18–21 min at 60; memory
    ``0.5 GB·(log|D|/log 10^50)^4`` (the relation matrix, whose two sides grow like the
    factor base, about ``log²|D|``).  An upper estimate (3 times the measured time at 50
    digits, 2.4 times at 60, about equal at 30 digits where it does not matter); it only
    decides whether to start.  (Until 2026-12-04 it was fitted to 167 s at 50 digits, and
    refused 60 digits under the default budget of 30 min.)  For ``D > 0`` four times the
    time: it took 0.6–1.2 times the ``D < 0`` fit at 40 digits and 1.1–2.0 times it at 50
    (docs/performance.md, "D > 0 (2026-12-04)": 22–49 s and 274–470 s).

    Examples
    --------
    >>> subexponential_cost(-10**30 - 3)[0] < 60
    True
    >>> 15 * 60 < subexponential_cost(-(10**59) - 3)[0] < 30 * 60   # 60 digits: under the default budget
    True
    >>> subexponential_cost(-(3**226) - 30)[0] > 86400
    True
    """
    ln = math.log(abs(D))
    ell = math.sqrt(ln * math.log(ln))
    ln50 = 50 * math.log(10)
    ell50 = math.sqrt(ln50 * math.log(ln50))
    seconds = 3 * 82.0 * math.exp(min(700.0, 0.6 * (ell - ell50)))
    return (4 * seconds if D > 0 else seconds), 5e8 * (ln / ln50) ** 4


def _check_subexponential_cost(D: int) -> None:
    from ..core.budget import check_cost, describe_integer

    seconds, memory = subexponential_cost(D)
    what = "class group and regulator" if D > 0 else "class group"
    further = "--workers N shares the sieve among N processes"
    check_cost(
        f"the {what} of D = {describe_integer(D)} by the subexponential method ({len(str(abs(D)))} digits)",
        seconds=seconds,
        memory=memory,
        further=further if D > 0 else further + "; no method here reaches further for D < 0",
    )


def _resume(
    store, D: int, bound: int, add: Callable[[Relation], object], stats
) -> tuple[RelationStore | None, set[int]]:
    """Open the relation store ``store`` (if any) of ``D`` and ``bound``, hand its relations to
    ``add`` and count them in ``stats``: ``(store or None, the finished tasks)``."""
    if store is None:
        return None, set()
    db = RelationStore(store, D, bound)
    stored = db.relations()
    for r in stored:
        add(r)
    done = db.done_tasks()
    stats.resumed, stats.tasks_resumed = len(stored), len(done)
    return db, done


def _next_task(stream: Iterator[tuple[int, list[Relation]]], db: RelationStore | None, add, stats) -> None:
    """Take the next finished sieve task of ``stream``: count it in ``stats``, write it to the
    store ``db`` (if any) and hand its relations to ``add``."""
    task, rels = next(stream)
    stats.tasks += 1
    stats.sieved += len(rels)
    if db is not None:
        db.add(rels, task)
    for r in rels:
        add(r)


def factor_base_bound(D: int) -> int:
    """The factor-base bound used for ``D``: Bach's bound ``⌊6·log²|D|⌋`` (at least 50).

    Taking every prime form up to Bach's bound into the factor base makes the GRH
    condition of [3] hold by construction (no separate check of larger primes).

    Examples
    --------
    >>> factor_base_bound(-10**20 - 3)
    12724
    """
    return max(50, bach_bound(D))


def _prepared_factor_base(D: int, params: SieveParameters | None) -> tuple[SieveParameters, FactorBase]:
    """The sieve parameters (by default :func:`sieve_parameters`) and the factor base of ``D``,
    checked: the bound at least Bach's bound, and a split prime to cover the sieve polynomials."""
    params = params if params is not None else sieve_parameters(D)
    if params.bound < bach_bound(D):
        raise FormkitError(
            f"factor-base bound {params.bound} is below Bach's bound {bach_bound(D)} for D = {D}"
        )
    base = FactorBase(D, params.bound)
    if not base.a_candidates:
        raise FormkitError(
            f"D = {D} is too small for the sieve (no split prime in [30, {params.bound}]); use 'enumeration'"
        )
    return params, base


def sieve_parameters(D: int) -> SieveParameters:
    """The sieve parameters for ``D`` from :data:`SIEVE_TABLE`.

    Examples
    --------
    >>> p = sieve_parameters(-10**30 - 3)
    >>> p.bound, p.half_width
    (28630, 25000)
    """
    digits = len(str(abs(D)))
    for top, M, per_a, lp in SIEVE_TABLE:
        if digits <= top:
            return SieveParameters(factor_base_bound(D), M, lp, per_a)
    raise AssertionError("unreachable: the last row of SIEVE_TABLE has no limit")  # pragma: no cover


# --- sieve tasks (run in worker processes) ----------------------------------------------

_WORKER: dict[int, tuple[FactorBase, SieveParameters]] = {}


def _task_covers(base: FactorBase, task: int) -> list[int]:
    """The cover primes of sieve task ``task``: the candidates for ``a`` from the largest down, in turn."""
    cands = base.a_candidates
    return [cands[-1 - (task * A_PER_TASK + j) % len(cands)] for j in range(A_PER_TASK)]


def _run_task(D: int, params: SieveParameters, task: int, seed: int) -> tuple[int, list[Relation]]:
    """One sieve task (a module-level function, so that worker processes can run it)."""
    got = _WORKER.get(D)
    if got is None or got[1] != params:
        _WORKER.clear()
        got = (FactorBase(D, params.bound), params)
        _WORKER[D] = got
    base = got[0]
    rels = list(sieve_relations(base, params, _task_covers(base, task), seed * 1_000_003 + task))
    return task, rels


def _tasks(
    D: int, params: SieveParameters, todo: Iterator[int], seed: int, workers: int, cluster=None
) -> Generator[tuple[int, list[Relation]], None, None]:
    """Yield ``(task, relations)`` as tasks finish, on ``workers`` local processes or on
    the Dask cluster ``cluster`` (a scheduler address or a client).

    At most ``2·workers`` tasks (on a cluster: two per worker thread) are in flight;
    closing the generator stops the workers (their unfinished tasks are lost, never
    half-stored)."""
    if cluster is not None:
        from ..core.cluster import stream_tasks

        yield from stream_tasks(cluster, _run_task, ((D, params, t, seed) for t in todo))
        return
    if workers <= 1:
        for t in todo:
            yield _run_task(D, params, t, seed)
        return
    ctx = multiprocessing.get_context("spawn")
    pool = ctx.Pool(workers)
    try:
        flight: deque = deque()
        for t in todo:
            flight.append(pool.apply_async(_run_task, (D, params, t, seed)))
            if len(flight) >= 2 * workers:
                yield flight.popleft().get()
        while flight:
            yield flight.popleft().get()
    finally:
        pool.terminate()
        pool.join()


# --- collecting relations ------------------------------------------------------------


def _residues(n: int, primes: np.ndarray) -> np.ndarray:
    """``n mod p`` for every p of ``primes`` (all < 2^31), by 31-bit limbs in int64."""
    limbs = []
    while n:
        limbs.append(n & 0x7FFFFFFF)
        n >>= 31
    r = np.zeros(len(primes), dtype=np.int64)
    for limb in reversed(limbs):
        r = ((r << 31) + limb) % primes
    return r


class _Smoothness:
    """Factorisations over the primes of the factor base, with a fast test first.

    ``a`` factors over the primes ``p₁, …, p_n`` iff ``a`` divides ``P^{2^e}`` for
    ``P = ∏ p_i`` and ``2^e`` at least the largest exponent (``2^e > log₂ a``), i.e. iff
    ``(P mod a)^{2^e} ≡ 0 (mod a)``: one reduction of ``P`` and ``e`` squarings modulo
    ``a`` (the product test of Bernstein's batch smoothness detection, D. J. Bernstein,
    "How to find smooth parts of integers", 2004; from memory).  Only the values that
    pass are divided out (about ten times faster on the random walks at 50 digits,
    where nearly every value fails).
    """

    def __init__(self, primes: list[int]) -> None:
        self.primes = np.array(primes, dtype=np.int64)
        self.product = mpz(math.prod(primes))

    def __call__(self, a: int) -> dict[int, int] | None:
        """The exponents of ``a ≥ 1`` over the primes when ``a`` factors over them, else None."""
        if a > 1 and pow(self.product % a, 1 << a.bit_length().bit_length(), a) != 0:
            return None
        exps: dict[int, int] = {}
        for p in self.primes[_residues(a, self.primes) == 0].tolist():
            k = 0
            while a % p == 0:
                a //= p
                k += 1
            exps[p] = k
        return exps if a == 1 else None


def _show(bar, shown: int, found: int, needed: int) -> int:
    """Advance the progress bar to ``found`` relations and show ``found/needed``."""
    if found > shown:
        bar.update(found - shown)
    bar.set_postfix_str(f"{found}/{needed} relations")
    return max(shown, found)
