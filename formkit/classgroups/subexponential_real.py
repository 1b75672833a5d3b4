"""Class groups and regulators of real quadratic fields by relations among prime ideals.

Buchmann's subexponential method [1] for a fundamental ``D > 0`` (Cohen [2], §5.9),
with the relations from Jacobson's sieve [3] (:mod:`formkit.classgroups.relation_sieve`,
which accepts ``D > 0``: the polynomial values change sign and the sign is kept):

1. **Factor base.**  The prime forms of the primes ``p ≤ B`` with ``χ_D(p) ≠ −1``,
   ``B`` at least Bach's bound ``6·log² D`` [4]: under GRH their classes generate
   ``Cl(D)``, and with the class ``δ`` of principal ideals whose generators have negative
   norm (the form ``(−1, b, −c)``) they generate ``Cl⁺(D)``.
2. **Relations with generators.**  A sieved value ``v = f(x)`` of ``f = (a, b, c)`` gives
   the equation of ideals ``(γ) = 𝔞·𝔟`` with ``γ = (β + √D)/2``, ``β = −(2ax + b)``,
   ``N(γ) = a·v``, ``N(𝔞) = a``, ``N(𝔟) = |v|``: its exponent row is that of the
   negative case, and beside it this module keeps ``λ = ½·log|γ/γ'|`` and whether
   ``N(γ) < 0`` (a pair of partial relations with the same large prime ``ℓ`` gives
   ``γ₁·γ₂^{∓1}``).  Prime forms that no sieved relation reaches are expressed by a
   random walk of reduced forms that keeps the generator of the principal ideal it
   leaves (the ``b`` of every reduction step, as in the infrastructure's distances).
3. **Linear algebra.**  The index ``h*`` of the relation lattice comes from
   :func:`formkit.core.lattice.finite_lattice_quotient` (a multiple of ``h``); integer
   kernel vectors give units, whose logarithms are multiples of the regulator ``R``
   (:mod:`formkit.classgroups.unit_relations`); their real gcd ``R*`` is a multiple of
   ``R``.  Relations are added until ``h*·R*`` lies in the GRH interval for
   ``h·R = √D·L(1, χ_D)/2`` (:func:`formkit.analytic.lseries.class_number_estimate`,
   Cox Theorem 7.24) with ``h*·R* < 2·lower``: since ``h*/h`` and ``R*/R`` are positive
   integers, both are 1.
4. **Narrow group.**  The units found generate the unit group modulo ±1 (``R* = R``), so
   ``N(ε) = −1`` exactly when one of them has norm −1.  Then ``Cl⁺ = Cl``; otherwise the
   relations with a sign column (``δ``, ``2δ = 0``, the parity of negative norms) present
   ``Cl⁺(D)``, whose order is checked to be ``2h``.

Everything is conditional on GRH (Bach's bound and the analytic interval); the
regulator is computed in multiple precision and reported as a double.  Classes are
compared through their discrete logarithms (a smooth reduced representative, as for
``D < 0``), so the canonical form of a class is the power product of the generators at
its coordinates (short cycles: the cycle representative of the infrastructure path).

References
----------
.. [1] J. Buchmann, "A subexponential algorithm for the determination of class groups
       and regulators of algebraic number fields", Séminaire de Théorie des Nombres,
       Paris 1988–89, Progr. Math. 91, Birkhäuser 1990, 27–41.
.. [2] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.9 (the algorithm number not checked here).
.. [3] M. J. Jacobson, Jr., "Applying sieving to the computation of quadratic class
       groups", Math. Comp. 68 (1999), 859–867; and his thesis (TU Darmstadt 1999) for
       real quadratic fields (from memory).
.. [4] E. Bach, "Explicit bounds for primality testing and related problems",
       Math. Comp. 55 (1990), 355–380.
.. [5] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, Theorem 7.24.
"""

from __future__ import annotations

import math
import random
from dataclasses import dataclass, field
from itertools import count
from pathlib import Path
from typing import Any

from ..analytic.lseries import class_number_estimate, default_prime_bound
from ..core.arith import mpfr, real_log, real_log2, real_sqrt, set_real_precision
from ..core.discriminants import discriminant_parts, validate_discriminant
from ..core.lattice import finite_lattice_quotient
from ..core.progress import progress_bar
from ..errors import DiscriminantError, FormkitError
from .abelian_groups import BSGSStatistics
from .baby_step_giant_step import bach_bound
from .group import ClassGroup, Provenance
from .infrastructure import _NarrowOps
from .relation_sieve import FactorBase, Relation, SieveParameters
from .relation_tasks import (
    STALE_TASKS,
    _check_subexponential_cost,
    _next_task,
    _prepared_factor_base,
    _resume,
    _show,
    _Smoothness,
    _tasks,
)
from .unit_relations import UnitRow, real_gcd, unit_logarithms

__all__ = ["class_group_subexponential_real", "RealRelationStatistics"]

Triple = tuple[int, int, int]

#: Working precision (bits) of the unit logarithms to start with; raised when the kernel
#: vectors are larger (see :class:`formkit.classgroups.unit_relations.UnitLogs`).
START_PRECISION = 256
#: Smallest D taken: below it the sieve (whose polynomials then have first coefficients
#: above √D) found no full relation lattice with units for 5 of 16 random D in [10^3, 10^5),
#: and all 16 in [10^5, 10^9) succeeded (measured during development); enumeration is instant there.
MIN_DISCRIMINANT = 10**5
#: Largest D taken (for now): the largest size measured (benchmarks/bench_subexponential_real.py
#: and docs/performance.md, "D > 0 (2026-12-04)": medians of three, 30 digits 6.7 CPU-s, 40
#: digits 24 CPU-s, 50 digits 276 CPU-s; single D: 45 digits 42 s); beyond it the sieve
#: parameters and the cost estimate are untried for D > 0.
MAX_DIGITS = 50
MAX_DISCRIMINANT = 10**MAX_DIGITS
#: Below this regulator classes get the canonical forms of the infrastructure path (cycle walks).
CYCLE_CANONICAL_REGULATOR = 50_000.0


@dataclass
class RealRelationStatistics:
    """Counters of the last run (for benchmarks and the provenance)."""

    factor_base: int = 0
    bound: int = 0
    relations: int = 0
    sieved: int = 0
    combined: int = 0
    tasks: int = 0
    walks: int = 0
    units: int = 0
    resumed: int = 0
    tasks_resumed: int = 0
    lattice_calls: int = 0
    precision: int = 0
    checks: list[str] = field(default_factory=list)


_LAST: dict[str, RealRelationStatistics] = {}

#: One relation: sparse row over the factor base and the generators ``((β, exponent), …)``.
Record = tuple[dict[int, int], tuple[tuple[int, int], ...]]


class _RealCollector:
    """Relations with their generators; partial relations paired by the large prime."""

    def __init__(self) -> None:
        self.records: list[Record] = []
        self.seen: set[tuple] = set()
        self.partials: dict[int, Relation] = {}
        self.covered: set[int] = set()
        self.combined = 0

    def _keep(self, items: tuple[tuple[int, int], ...], gens: tuple[tuple[int, int], ...]) -> None:
        key = (items, gens)
        if key in self.seen or (not items and not gens):
            return
        self.seen.add(key)
        self.records.append((dict(items), gens))
        self.covered.update(i for i, _k in items)

    def add(self, r: Relation) -> None:
        if r.large == 1:
            self._keep(r.exponents, ((r.beta, 1),))
            return
        first = self.partials.get(r.large)
        if first is None:
            self.partials[r.large] = r
            return
        if first.beta == r.beta:
            return
        f = r.large_sign * first.large_sign  # r − f·first: the large prime cancels
        comb = dict(r.exponents)
        for i, k in first.exponents:
            comb[i] = comb.get(i, 0) - f * k
        items = tuple(sorted((i, k) for i, k in comb.items() if k))
        self.combined += 1
        self._keep(items, ((r.beta, 1), (first.beta, -f)))


def _walk(base: FactorBase, col: int, rng: random.Random, trials: int, smooth: _Smoothness) -> tuple | None:
    """A relation containing ``𝔭_col``: a random walk ``𝔭_col·∏𝔭_s^{±1}`` of reduced forms
    until the first coefficient is smooth, with the generator of the principal ideal
    it leaves (Cohen, Algorithm 5.5.2 step 3, with the infrastructure's bookkeeping).

    Composition multiplies the ideals ``I(a, b) = [|a|, (−b + √D)/2]`` up to a rational
    factor; a reduction step ``ρ`` maps ``I(a, b)`` to ``((b + √D)/2)·I(a, b)/a``
    (Buchmann–Vollmer, Ch. 6; the distances of :mod:`formkit.classgroups.infrastructure`),
    so the walk ends at ``I(final) = Θ·∏𝔭`` with ``Θ = ∏ (b + √D)/2`` over the steps,
    and the relation ``∏𝔭 − I(final) = (Θ^{-1})`` is kept with the ``b`` of every step."""
    from ..core.composition import _compose_raw
    from ..core.raw_reduction import _is_reduced_indefinite_raw, _rho_indefinite_raw

    D = base.D
    sq = math.isqrt(D)
    small = min(len(base), 24)
    x = base.forms[col]
    walk = {col: 1}
    gens: dict[int, int] = {}
    for _ in range(trials):
        s = rng.randrange(small)
        e = rng.choice((1, -1))
        g = base.forms[s]
        if e < 0:
            g = (g[0], -g[1], g[2])
        a, b, c = (int(v) for v in _compose_raw(*x, *g, D))
        while not _is_reduced_indefinite_raw(a, b, sq):
            gens[b] = gens.get(b, 0) - 1
            a, b, c, _t = (int(v) for v in _rho_indefinite_raw(a, b, c, D, sq))
        x = (a, b, c)
        walk[s] = walk.get(s, 0) + e
        exps = smooth(abs(a))
        if exps is None:
            continue
        row = dict(walk)
        for i, k in base.signed(b, exps).items():
            row[i] = row.get(i, 0) - k
        if row.get(col):
            items = tuple(sorted((i, k) for i, k in row.items() if k))
            return items, tuple(sorted((beta, k) for beta, k in gens.items() if k))
    return None


def _log_of(beta: int, D: int, sD):
    """``½·log|γ/γ'|`` for ``γ = (β + √D)/2``, without cancellation: ``|γ'| = |N(γ)|/|γ|``."""
    if beta == 0:
        return mpfr(0)
    big = abs(beta) + sD  # 2·max(|γ|, |γ'|)
    val = real_log(big * big / abs(beta * beta - D)) / 2
    return val if beta > 0 else -val


def _unit_rows(D: int, records: list[Record], precision: int) -> list[UnitRow]:
    set_real_precision(precision)
    sD = real_sqrt(mpfr(D))
    cache: dict[int, Any] = {}
    out = []
    for row, gens in records:
        lg = mpfr(0)
        sign = 0
        for beta, k in gens:
            if beta not in cache:
                cache[beta] = _log_of(beta, D, sD)
            lg += k * cache[beta]
            sign += k * (beta * beta < D)
        out.append(UnitRow(dict(row), lg, sign % 2))
    return out


def class_group_subexponential_real(
    D: object,
    *,
    seed: int = 0,
    max_relations: int | None = None,
    workers: int = 1,
    params: SieveParameters | None = None,
    store: str | Path | None = None,
    cluster: Any = None,
) -> ClassGroup:
    """The narrow class group ``Cl⁺(D)``, ``h``, ``h⁺`` and the regulator of a fundamental ``D > 0``.

    Parameters
    ----------
    D : int
        A fundamental positive discriminant.
    seed : int
        Seed of the sieve and of the searches for smooth representatives (the result does
        not depend on it).
    max_relations : int, optional
        Stop with an error after this many relations (default ``20·n + 500`` for a factor
        base of n prime forms).
    workers : int
        Local processes for the sieve (1: in this process).
    params : SieveParameters, optional
        Instead of :func:`formkit.classgroups.subexponential.sieve_parameters` (its
        ``bound`` must be at least Bach's bound).
    store : str or Path, optional
        An SQLite file for the sieved relations with their generators
        (:class:`~formkit.classgroups.relation_store.RelationStore`): relations are
        written as each sieve task finishes, and a later call with the same file reads
        them back and skips the finished tasks (the random-walk relations are found again).
    cluster : str or distributed.Client, optional
        A Dask scheduler address or client: the sieve tasks run there as futures
        (:mod:`formkit.core.cluster`; ``workers`` is then ignored and the local cost check
        skipped).

    Returns
    -------
    ClassGroup
        The narrow group, with ``provenance.method == "subexponential"`` (conditional on
        GRH, ``provenance.bound`` the factor-base bound) and the regulator and ``N(ε)``
        as in :func:`formkit.classgroups.infrastructure.real_class_group`.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a fundamental positive discriminant.
    FormkitError
        If the relations do not pin ``h`` and ``R`` down within ``max_relations``.

    Examples
    --------
    >>> G = class_group_subexponential_real(10**12 + 1)   # the infrastructure path: h⁺ = 50280
    >>> G.invariants, G.class_number, round(G.to_dict()["regulator"], 9)
    ((2, 25140), 50280, 14.508657739)

    References
    ----------
    Buchmann (1990); Cohen, GTM 138, §5.9; Jacobson (1999).
    """
    D = validate_discriminant(D)
    if D < 0:
        raise DiscriminantError(f"class_group_subexponential_real needs D > 0, not {D}")
    if D < MIN_DISCRIMINANT:
        raise DiscriminantError(
            f"the subexponential method for D > 0 starts at D = {MIN_DISCRIMINANT}, not {D} "
            "(its sieve needs larger D; use method 'enumeration' or 'bsgs')"
        )
    if D > MAX_DISCRIMINANT:
        raise DiscriminantError(
            f"the subexponential method for D > 0 is implemented up to D = 10^{MAX_DIGITS}, not D = {D} "
            f"({len(str(D))} digits: larger D are untried here)"
        )
    if cluster is None:
        _check_subexponential_cost(D)
    if discriminant_parts(D)[1] != 1:
        raise DiscriminantError(
            f"the subexponential method is implemented for fundamental D only; {D} has conductor "
            f"{discriminant_parts(D)[1]} (use method 'bsgs', which handles orders)"
        )
    params, base = _prepared_factor_base(D, params)
    stats = RealRelationStatistics()
    _LAST["stats"] = stats
    B = params.bound
    n = len(base)
    stats.factor_base, stats.bound = n, B
    P = max(default_prime_bound(D), min(2 * 10**6, D))
    est = class_number_estimate(D, P)
    lower, upper = est.lower, est.upper
    limit = max_relations if max_relations is not None else 20 * n + 500
    col = _RealCollector()
    for p in sorted(base.ramified):  # 𝔭² = (p): a relation with a rational generator
        col._keep(((base.index[p], 2),), ())
    rng = random.Random(seed)
    db, done = _resume(store, D, B, col.add, stats)
    stream = _tasks(D, params, (t for t in count() if t not in done), seed, workers, cluster)
    want = n + max(20, n // 10)
    precision = START_PRECISION
    smooth = _Smoothness(list(base.primes))
    pinned = None
    shown = 0
    try:
        with progress_bar(total=want, desc="relations", unit="rel") as bar:
            while pinned is None:
                stale = 0
                while len(col.records) < want and stale < STALE_TASKS:
                    before = len(col.records)
                    _next_task(stream, db, col.add, stats)
                    stale = stale + 1 if len(col.records) == before else 0
                    shown = _show(bar, shown, len(col.records), want)
                for i in range(n):
                    if i in col.covered:
                        continue
                    w = _walk(base, i, rng, 100_000, smooth)
                    if w is None:  # pragma: no cover - the walk meets smooth forms quickly
                        raise FormkitError(f"no relation found for the prime form of norm {base.primes[i]}")
                    stats.walks += 1
                    col._keep(*w)
                shown = _show(bar, shown, len(col.records), want)
                pinned = _try_pin(D, n, col.records, lower, upper, rng, stats, precision)
                if pinned is not None and pinned[0] == "precision":
                    precision = pinned[1]
                    pinned = _try_pin(D, n, col.records, lower, upper, rng, stats, precision)
                if pinned is not None and pinned[0] == "precision":  # pragma: no cover
                    raise ArithmeticError("unit logarithms need ever more precision")
                if pinned is None:
                    if len(col.records) >= limit or stale >= STALE_TASKS:
                        raise FormkitError(
                            f"the subexponential method did not pin down h(D) and R(D) for D = {D} within "
                            f"{limit} relations (factor base of {n} prime forms up to {B}, "
                            f"{len(col.records)} relations found); use method 'bsgs'"
                        )
                    want = len(col.records) + max(10, n // 10)
    finally:
        stream.close()
        if db is not None:
            db.close()
    _kind, Q, R, norm, unit_count = pinned
    h = Q.order
    stats.relations, stats.combined, stats.units = len(col.records), col.combined, unit_count
    narrow = h if norm == -1 else 2 * h
    if norm == -1:
        QN, ncols = Q, n
    else:
        rows = []
        for row, gens in col.records:
            s = sum(k * (beta * beta < D) for beta, k in gens) % 2
            rows.append({**row, n: 1} if s else dict(row))
        rows.append({n: 2})
        QN, ncols = finite_lattice_quotient(rows, ncols=n + 1), n + 1
        if QN is None or not QN.is_finite or QN.order != narrow:  # pragma: no cover - contradicts the theory
            raise ArithmeticError(
                f"the narrow relation lattice of D = {D} has index {QN and QN.order}, not {narrow}"
            )
    stats.checks = [
        f"factor base: all {n} prime forms of norm ≤ {B} (Bach's bound {bach_bound(D)}: generators under GRH)",
        f"{len(col.records)} relations ({stats.sieved} sieved in {stats.tasks} tasks, {col.combined} from "
        f"large-prime pairs, {stats.walks} by random walks"
        + (f", {stats.resumed} read back from the store" if db is not None else "")
        + f"), {unit_count} units from kernel vectors "
        f"(logarithms to {stats.precision} bits)",
        f"h·R = {h}·{float(R):.12g} lies in [{lower:.9g}, {upper:.9g}] (Euler product to {P}, GRH) and is "
        f"below twice its lower end, so h and R are exact",
        f"N(ε) = {norm:+d} ("
        + ("a unit of norm −1 found" if norm == -1 else "every unit found has norm +1")
        + f"), h⁺ = {narrow}"
        + ("" if norm == -1 else " (index of the relations with a sign column)"),
    ]
    return _build_group(D, base, QN, ncols, narrow, float(R), norm, B, seed, "; ".join(stats.checks))


def _try_pin(D, n, records, lower, upper, rng, stats, precision):
    """``("pinned", Q, R, N(ε), units)`` once ``h*·R*`` is pinned, ``("precision", bits)`` when
    the logarithms need more bits, else None."""
    stats.lattice_calls += 1
    Q = finite_lattice_quotient([dict(r) for r, _g in records], ncols=n)
    if Q is None or not Q.is_finite:
        return None
    rows = _unit_rows(D, records, precision)
    units = unit_logarithms(n, rows, Q.order, extra=40 + 8 * stats.lattice_calls, rng=rng)
    # The real gcd multiplies the errors of the logarithms by up to (max|log|/R)²: Euclid's
    # algorithm on two of them by max|log|/g, and each later value is reduced modulo the
    # gcd g so far, whose error is multiplied by max|log|/g again (measured at 26 digits:
    # inputs right to 1e-113, g wrong by 1e-17).  R > 0.48 for every real quadratic field,
    # so the gcd costs twice the bits the largest logarithm has above the binary point.
    top = max((abs(v) for v in units.logs), default=0)
    needed = units.needed + (2 * (int(real_log2(top + 2)) + 2) if top else 0)
    if needed > precision - 96:
        return ("precision", needed + 192)
    stats.precision = precision
    R = real_gcd(units.logs)
    if R is None:
        return None
    hR = Q.order * R
    if not (lower <= hR <= upper and hR < 2 * lower):
        return None
    norm = -1 if any(s % 2 for s, v in zip(units.signs, units.logs) if abs(v) > 0.25) else 1
    return ("pinned", Q, R, norm, sum(1 for v in units.logs if abs(v) > 0.25))


def _build_group(D, base, QN, ncols, narrow, R, norm, B, seed, detail) -> ClassGroup:
    stats = BSGSStatistics()
    ops = _NarrowOps(D, stats)
    one = ops.one
    delta = ops.reduce(-one[0], one[1], -one[2])
    forms = list(base.forms) + [delta]
    smooth = _Smoothness(list(base.primes))
    n = len(base)
    invariants = tuple(QN.invariants)
    gen_vecs = list(QN.generators)

    def power(vec) -> Triple:
        x = one
        for j, k in enumerate(vec):
            if k:
                x = ops.mul(x, ops.pow(forms[j], int(k)))
        return x

    raw_gens = [power(v) for v in gen_vecs]
    drng = random.Random(seed + 1)
    small = min(n, 24)

    def coordinates(x: Triple) -> tuple[int, ...]:
        y = ops.reduce(int(x[0]), int(x[1]), int(x[2]))
        walk = [0] * ncols
        for _ in range(1_000_000):
            exps = smooth(abs(int(y[0])))
            if exps is not None:
                vec = [-w for w in walk]
                for i, k in base.signed(int(y[1]), exps).items():
                    vec[i] += k
                if y[0] < 0 and ncols > n:
                    vec[n] += 1
                c = QN.coordinates(vec)
                return tuple(int(e) for e in c)
            s = drng.randrange(small)
            e = drng.choice((1, -1))
            y = ops.mul(y, forms[s] if e > 0 else ops.inverse(forms[s]))
            walk[s] += e
        raise FormkitError(f"no smooth representative found for the class of {x}")  # pragma: no cover

    if R < CYCLE_CANONICAL_REGULATOR:

        def canonical(x: Triple) -> Triple:
            return ops.canonical(ops.reduce(int(x[0]), int(x[1]), int(x[2])))

        generators = [canonical(g) for g in raw_gens]
    else:

        def canonical(x: Triple) -> Triple:
            y = one
            for g, k in zip(raw_gens, coordinates(x)):
                if k:
                    y = ops.mul(y, ops.pow(g, k))
            return y

        generators = [canonical(g) for g in raw_gens]

    return ClassGroup(
        D,
        invariants=invariants,
        generators=generators,
        dlog=coordinates,
        canonical=canonical,
        provenance=Provenance("subexponential", False, "GRH", B, detail),
        forms=None,
        units=(R, norm),
    )
