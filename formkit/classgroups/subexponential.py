"""Class groups of negative discriminants by relations among prime forms (index calculus).

The method of Hafner and McCurley [1] and Buchmann, as described in Cohen [2], §5.5
(Algorithm 5.5.2, "sub-exponential class group"), with Jacobson's sieve [4] for the
relations, restricted here to fundamental ``D < 0``:

1. **Factor base.**  The reduced prime forms ``P_p = (p, b_p, c)`` of the primes
   ``p ≤ B`` with ``χ_D(p) ≠ −1``, where ``B`` is at least Bach's bound ``6·log²|D|``
   (Bach [3]): under GRH these forms generate ``Cl(D)``.
2. **Relations by sieving.**  The values of ``a x² + b x + c`` for forms ``(a, b, c)``
   with ``a`` a product of factor-base primes are sieved over an interval
   (:mod:`formkit.classgroups.relation_sieve`, self-initialising, one large prime);
   each smooth value is a relation.  Every ``a`` contains a *cover prime*, taken in
   turn from the largest down.  Before each linear algebra call the prime forms that
   the relations cannot pin down (:func:`~formkit.classgroups.relation_combination.weak_columns`,
   singleton peeling) get a sieve polynomial whose ``a`` contains their prime, and
   those still left (small or ramified primes) a random walk ``P_p·∏P_s^{±1}`` over
   small prime forms until the reduced form has a smooth first coefficient (Cohen [2],
   Algorithm 5.5.2, step 3, the relation search of Hafner–McCurley).
3. **Linear algebra.**  The quotient ``Zⁿ/L`` of the relation lattice is computed by
   :func:`formkit.core.lattice.lattice_quotient`: structured elimination of unit pivots
   (:mod:`formkit.core.sparse_elimination`), the Hermite form of the tall dense rest
   from a sublattice, its determinant and a membership test modulo it
   (:mod:`formkit.core.modular_hermite`), then the Smith normal form of the few columns
   whose pivot exceeds 1, with the column transformations for generators and discrete
   logarithms.  Its order ``h*`` is a multiple of ``h``
   (the relations are true relations and the factor base generates); relations are
   added until ``h*`` lies in the GRH interval ``[h⁻, h⁺]`` of
   :func:`formkit.analytic.lseries.class_number_estimate` with ``h* < 2·h⁻``, which
   forces ``h* = h``.

Relations can be kept in an SQLite file (:class:`formkit.classgroups.relation_store.RelationStore`)
as they are found, so that a killed run resumes; the sieve runs on several local
processes (``workers``) or as futures on a Dask cluster (``cluster``, the plumbing of
:mod:`formkit.core.cluster` shared with the tables).  The sieve parameters come from
:data:`SIEVE_TABLE`.

The result is conditional on GRH (Bach's bound and the interval of the Euler
product).  On the command line: ``formkit group D --method subexponential --workers N
--db FILE`` (or ``--cluster ADDRESS``).  Non-fundamental ``D`` go through the maximal
order (:mod:`formkit.classgroups.subexponential_orders`); ``D > 0`` (with the regulator) is
:mod:`formkit.classgroups.subexponential_real`, reached from
:func:`class_group_subexponential`; :func:`formkit.class_group` chooses this method by size
for ``D < 0`` (:data:`formkit.classgroups.dispatch.SUBEXPONENTIAL_FROM`).  Not yet here:
two large primes (issue 18).

References
----------
.. [1] J. L. Hafner, K. S. McCurley, "A rigorous subexponential algorithm for
       computation of class groups", J. Amer. Math. Soc. 2 (1989), 837–850.
.. [2] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.5 (Algorithm 5.5.2).
.. [3] E. Bach, "Explicit bounds for primality testing and related problems",
       Math. Comp. 55 (1990), 355–380.
.. [4] M. J. Jacobson, Jr., "Applying sieving to the computation of quadratic class
       groups", Math. Comp. 68 (1999), 859–867.
"""

from __future__ import annotations

import random
from dataclasses import dataclass, field
from itertools import count
from pathlib import Path

from ..analytic.lseries import class_number_estimate
from ..core.discriminants import discriminant_parts, validate_discriminant
from ..core.lattice import finite_lattice_quotient
from ..core.progress import progress_bar
from ..errors import DiscriminantError, FormkitError
from .baby_step_giant_step import BSGSStatistics, _Ops, bach_bound
from .group import ClassGroup, Provenance
from .relation_combination import RelationCollector, weak_columns
from .relation_sieve import FactorBase, Relation, SieveParameters, sieve_relations
from .relation_tasks import (
    SIEVE_TABLE,
    STALE_TASKS,
    _check_subexponential_cost,
    _next_task,
    _prepared_factor_base,
    _resume,
    _show,
    _Smoothness,
    _tasks,
    factor_base_bound,
    sieve_parameters,
    subexponential_cost,
)

__all__ = [
    "class_group_subexponential",
    "RelationStatistics",
    "factor_base_bound",
    "sieve_parameters",
    "SIEVE_TABLE",
    "subexponential_cost",
]

Triple = tuple[int, int, int]

#: Rounds of sieving with the weak columns (:func:`~formkit.classgroups.relation_combination.weak_columns`)
#: as cover primes before the random walks take the rest (one round nearly always pins
#: them all; no source).
WEAK_ROUNDS = 2


@dataclass
class RelationStatistics:
    """Counters of the last relation search (for benchmarks and the provenance)."""

    factor_base: int = 0
    bound: int = 0
    trials: int = 0
    full: int = 0
    combined: int = 0
    sieved: int = 0
    expressed: int = 0
    weak_sieved: int = 0
    tasks: int = 0
    resumed: int = 0
    tasks_resumed: int = 0
    checks: list[str] = field(default_factory=list)


_LAST: dict[str, RelationStatistics] = {}


def _express(
    base: FactorBase, ops: _Ops, col: int, rng: random.Random, trials: int, smooth: _Smoothness
) -> Relation | None:
    """A relation containing ``P_col`` once: a random walk ``P_col·∏P_s^{±1}`` until the
    reduced form ``(a, b, c)`` has ``a`` smooth (Cohen, Algorithm 5.5.2)."""
    small = min(len(base), 24)
    x = base.forms[col]
    walk = {col: 1}
    for _ in range(trials):
        s = rng.randrange(small)
        e = rng.choice((1, -1))
        g = base.forms[s] if e > 0 else ops.inv(base.forms[s])
        x = ops.mul(x, g)
        walk[s] = walk.get(s, 0) + e
        b = int(x[1])
        exps = smooth(int(x[0]))
        if exps is None:
            continue
        row = dict(walk)
        for i, k in base.signed(b, exps).items():
            row[i] = row.get(i, 0) - k
        if row.get(col):  # not trivial (the walk not yet reduced) and P_col still in it
            return Relation(tuple(sorted((i, k) for i, k in row.items() if k)))
    return None


# --- the class group -----------------------------------------------------------------


def class_group_subexponential(
    D: object,
    *,
    seed: int = 0,
    max_relations: int | None = None,
    store: str | Path | None = None,
    workers: int = 1,
    params: SieveParameters | None = None,
    cluster=None,
) -> ClassGroup:
    """The class group ``Cl(D)`` of a fundamental ``D < 0`` from relations among prime forms.

    A fundamental ``D > 0`` is passed to
    :func:`formkit.classgroups.subexponential_real.class_group_subexponential_real` (the narrow
    group, ``h`` and the regulator, with the same store and cluster).

    Parameters
    ----------
    D : int
        A fundamental negative discriminant.
    seed : int
        Seed of the sieve and of the random walks (the result does not depend on it).
    max_relations : int, optional
        Stop with an error after this many relations (default ``20·n + 500`` for a factor
        base of n forms).
    store : str or Path, optional
        An SQLite file for the relations (:class:`~formkit.classgroups.relation_store.RelationStore`):
        relations are written as found, and the same call with the same file continues a
        killed run without losing the finished sieve tasks.
    workers : int
        Local processes for the sieve (1: in this process).
    params : SieveParameters, optional
        Instead of :func:`sieve_parameters` (its ``bound`` must be at least Bach's bound).
    cluster : str or distributed.Client, optional
        Run the sieve tasks on this Dask distributed cluster (a scheduler address such as
        ``"tcp://10.0.0.5:8786"``, or a client) instead of local processes; the results
        are stored as they come back (``workers`` is then ignored; no local cost check,
        as for tables).

    Returns
    -------
    ClassGroup
        With ``provenance.method == "subexponential"``, conditional on GRH,
        ``provenance.bound`` the factor-base bound (≥ Bach's bound).

    Raises
    ------
    DiscriminantError
        If ``D`` is not a fundamental negative discriminant.
    FormkitError
        If the relations do not pin ``h`` down within ``max_relations``, or the store
        belongs to another ``D`` or bound.

    Examples
    --------
    >>> G = class_group_subexponential(-10**12 - 3)   # enumeration also gives h = 124568
    >>> G.invariants, G.provenance.method, G.provenance.assumption
    ((2, 62284), 'subexponential', 'GRH')

    References
    ----------
    Cohen, GTM 138, Algorithm 5.5.2; Hafner–McCurley (1989); Jacobson (1999).
    """
    D = validate_discriminant(D)
    if D > 0:  # Buchmann's method with the regulator: its own module
        from .subexponential_real import class_group_subexponential_real

        return class_group_subexponential_real(
            D,
            seed=seed,
            max_relations=max_relations,
            workers=workers,
            params=params,
            store=store,
            cluster=cluster,
        )
    if cluster is None:
        _check_subexponential_cost(D)  # before D is factored
    _d_K, f = discriminant_parts(D)
    if f != 1:
        raise DiscriminantError(
            f"the subexponential method is implemented for fundamental D only; {D} has conductor {f} "
            "(formkit.classgroups.subexponential_orders.class_group_subexponential_order and method "
            "'subexponential' of class_group go through the maximal order)"
        )
    params, base = _prepared_factor_base(D, params)
    stats = RelationStatistics()
    _LAST["stats"] = stats
    B = params.bound
    n = len(base)
    stats.factor_base, stats.bound = n, B
    est = class_number_estimate(D)
    lower, upper = int(est.lower), int(est.upper)
    # h is a multiple of the number of genera 2^(t−1) (Gauss): h* < 2·max(lower, genera) with
    # h | h* leaves h = h* (for tiny D the analytic interval alone does not exclude h*/2)
    from .genus import genus_count

    floor = max(1, lower, genus_count(D))
    ops = _Ops(D, BSGSStatistics())
    rng = random.Random(seed)
    limit = max_relations if max_relations is not None else 20 * n + 500
    smooth = _Smoothness(base.primes)
    cover_set = set(base.a_candidates)
    # one polynomial over a quarter of the interval per weak column: a few full relations
    # each (at 50 digits the full family gave 3.6·n relations and a 49-s linear algebra)
    weak_params = SieveParameters(
        params.bound, max(1000, params.half_width // 4), params.large_prime_factor, 1, params.slack
    )
    col = RelationCollector()
    # a ramified P_p is its own inverse: 2·[P_p] = 0 (the sieve sees only the parity of its exponent)
    for p in sorted(base.ramified):
        col.add(Relation(((base.index[p], 2),)))
    db, done = _resume(store, D, B, col.add, stats)
    stream = _tasks(D, params, (t for t in count() if t not in done), seed, workers, cluster)
    Q = None
    want = n + 10
    shown = 0
    try:
        with progress_bar(total=want, desc="relations", unit="rel") as bar:
            while True:
                fetched, stale = False, 0
                while (len(col.rows) < want or not fetched) and stale < STALE_TASKS:
                    fetched = True
                    before = len(col.rows)
                    _next_task(stream, db, col.add, stats)
                    stale = stale + 1 if len(col.rows) == before else 0
                    shown = _show(bar, shown, len(col.rows), want)
                fresh = []
                # columns that no relation pins down (cheap peeling, no linear algebra), so
                # that the rank test below does not fail for them (at 50 digits the earlier
                # loop sieved 1.5·n relations first): a sieve over polynomials whose a
                # contains that prime (every relation from them contains its form), a few
                # rounds, then a random walk for what is left (small or ramified primes)
                for round_ in range(WEAK_ROUNDS + 1):
                    weak = weak_columns(col.rows, n)
                    if not weak:
                        break
                    covers = [base.primes[i] for i in weak if base.primes[i] in cover_set]
                    if round_ < WEAK_ROUNDS and covers:
                        got = list(sieve_relations(base, weak_params, covers, rng.randrange(1 << 62)))
                        stats.sieved += len(got)
                        stats.weak_sieved += len(covers)
                    else:
                        got = []
                        for i in weak:
                            w = _express(base, ops, i, rng, 400_000, smooth)
                            if w is None:
                                raise FormkitError(
                                    f"no relation found for the prime form of norm {base.primes[i]}"
                                )
                            stats.expressed += 1
                            got.append(w)
                    fresh.extend(got)
                    for w in got:
                        col.add(w)
                if db is not None and fresh:
                    db.add(fresh)
                shown = _show(bar, shown, len(col.rows), want)
                # the Hermite and Smith forms only once the relations have full rank (modulo
                # a prime, after the elimination: cheap); before, the quotient is infinite,
                # and at 50 digits such an early call cost as much as the final one
                Q = finite_lattice_quotient(col.rows, ncols=n)
                h = Q.order if Q is not None and Q.is_finite else 0
                if h and floor <= h <= upper and h < 2 * floor:
                    break
                if len(col.rows) >= limit or stale >= STALE_TASKS:
                    raise FormkitError(
                        f"the subexponential method did not pin down h(D) for D = {D} within {limit} "
                        f"relations (factor base of {n} prime forms up to {B}, {len(col.rows)} distinct relations "
                        "found); use method 'bsgs' or 'enumeration'"
                    )
                want = len(col.rows) + max(10, n // 10)
    finally:
        stream.close()
        if db is not None:
            db.close()
    stats.full, stats.combined = col.full, col.combined
    assert Q is not None  # the loop ends only with a finite quotient
    h = Q.order
    stats.checks = [
        f"factor base: all {n} prime forms of norm ≤ {B} (Bach's bound {bach_bound(D)}: generators under GRH)",
        f"{len(col.rows)} relations ({stats.sieved} sieved in {stats.tasks} tasks, {col.combined} from "
        f"large-prime pairs, {stats.expressed} by random walks, {stats.weak_sieved} polynomial families "
        "aimed at prime forms no relation pinned down"
        + (f"; {stats.resumed} read back from the store)" if db is not None else ")"),
        f"h = {h} lies in [{lower}, {upper}] (Euler product to {est.l_value.prime_bound}, GRH) and h < 2·{floor}"
        + ("" if floor == lower else f" ({floor} genera divide h)")
        + ", so the relation lattice is the full lattice",
    ]
    invariants = tuple(d for d in Q.invariants if d != 1)

    def power_product(vec) -> Triple:
        x = ops.reduce(*_identity(D))
        for j, k in enumerate(vec):
            if k:
                x = ops.mul(x, ops.pow(base.forms[j], int(k)))
        return (int(x[0]), int(x[1]), int(x[2]))

    generators = [power_product(v) for v in Q.generators]

    def canonical(x: Triple) -> Triple:
        a, b, c = ops.reduce(int(x[0]), int(x[1]), int(x[2]))
        return (int(a), int(b), int(c))

    drng = random.Random(seed + 1)
    small = min(n, 20)

    def dlog(x: Triple) -> tuple[int, ...]:
        """Coordinates of ``x``: randomise ``x·∏P^r`` until its reduced form is smooth."""
        for _ in range(100000):
            r = {drng.randrange(small): drng.randrange(1, max(2, h)) for _ in range(3)}
            y = canonical(x)
            for j, k in r.items():
                y = ops.mul(y, ops.pow(base.forms[j], k))
            exps = smooth(int(y[0]))
            if exps is None:
                continue
            vec = [0] * n
            for i, k in base.signed(int(y[1]), exps).items():
                vec[i] += k
            for j, k in r.items():
                vec[j] -= k
            return tuple(int(c) for c in Q.coordinates(vec))
        raise FormkitError(f"no smooth representative found for the class of {x}")  # pragma: no cover

    detail = "; ".join(stats.checks)
    return ClassGroup(
        D,
        invariants=invariants,
        generators=generators,
        dlog=dlog,
        canonical=canonical,
        provenance=Provenance("subexponential", False, "GRH", B, detail),
        forms=None,
    )


def _identity(D: int) -> Triple:
    return (1, 1, (1 - D) // 4) if D % 4 == 1 else (1, 0, -D // 4)
