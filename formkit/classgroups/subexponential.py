"""Class groups of negative discriminants by relations among prime forms (index calculus).

The method of Hafner and McCurley [1] and Buchmann, as described in Cohen [2], §5.5
(Algorithm 5.5.2, "sub-exponential class group"), restricted here to fundamental
``D < 0``:

1. **Factor base.**  The reduced prime forms ``P_p = (p, b_p, c)`` of the primes
   ``p ≤ B`` with ``χ_D(p) ≠ −1``, where ``B`` is at least Bach's bound ``6·log²|D|``
   (Bach [3]): under GRH these forms generate ``Cl(D)``.
2. **Relations.**  For a random exponent vector ``e`` on a few factor-base forms, the
   product ``∏ P_p^{e_p}`` is reduced to ``(a, b, c)``; when ``a`` factors over the
   factor base, ``a = ∏ p^{k_p}``, the form ``(a, b, c)`` is ``∏ P_p^{±k_p}`` (the sign
   is read off ``b`` modulo ``2p``, modulo 4 for ``p = 2``), which gives the relation
   ``e − (±k) = 0``.  Smoothness is tested with one modular power of the product of the
   factor base; values with one large prime cofactor ``q ≤ B²`` are kept and two
   values with the same ``q`` are combined (large-prime variation).
3. **Linear algebra.**  The quotient ``Zⁿ/L`` of the relation lattice is computed by
   :func:`formkit.core.lattice.lattice_quotient` (sparse elimination of unit pivots, then
   the Smith normal form of the dense rest on python-flint).  Its order ``h*`` is a
   multiple of ``h`` (the relations found are true relations and the factor base
   generates); relations are added until ``h*`` lies in the GRH interval
   ``[h⁻, h⁺]`` of :func:`formkit.analytic.lseries.class_number_estimate` with
   ``h* < 2·h⁻``, which forces ``h* = h``.

The result is conditional on GRH (Bach's bound and the interval of the Euler
product).  Not yet here: Jacobson's sieve over a self-initialising family of
polynomials, parallel relation collection, a relation store, ``D > 0`` and
non-fundamental ``D`` (see issue 18).

References
----------
.. [1] J. L. Hafner, K. S. McCurley, "A rigorous subexponential algorithm for
       computation of class groups", J. Amer. Math. Soc. 2 (1989), 837–850.
.. [2] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.5 (Algorithm 5.5.2).
.. [3] E. Bach, "Explicit bounds for primality testing and related problems",
       Math. Comp. 55 (1990), 355–380.
"""

from __future__ import annotations

import math
import random
from dataclasses import dataclass, field

from ..analytic.lseries import class_number_estimate
from ..core.arith import mpz
from ..core.discriminants import discriminant_parts, validate_discriminant
from ..core.enumeration import _prime_forms
from ..core.lattice import lattice_quotient
from ..core.progress import progress_bar
from ..errors import DiscriminantError, FormkitError
from .baby_step_giant_step import BSGSStatistics, _Ops, bach_bound
from .group import ClassGroup, Provenance

__all__ = ["class_group_subexponential", "RelationStatistics", "factor_base_bound"]

Triple = tuple[int, int, int]


@dataclass
class RelationStatistics:
    """Counters of the last relation search (for benchmarks and the provenance)."""

    factor_base: int = 0
    bound: int = 0
    trials: int = 0
    full: int = 0
    combined: int = 0
    checks: list[str] = field(default_factory=list)


_LAST: dict[str, RelationStatistics] = {}


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


class _Base:
    """The factor base: primes, their prime forms, and the smoothness test."""

    def __init__(self, D: int, B: int) -> None:
        self.D = D
        self.primes: list[int] = []
        self.forms: list[Triple] = []
        for p, g in _prime_forms(D, 1, B):
            self.primes.append(p)
            self.forms.append((int(g[0]), int(g[1]), int(g[2])))
        self.index = {p: i for i, p in enumerate(self.primes)}
        self.B = B
        prod = mpz(1)
        for p in self.primes:
            prod *= p
        self.product = prod
        self.ramified = {p for p in self.primes if D % p == 0}

    def split(self, a: int) -> tuple[dict[int, int], int] | None:
        """``a = s·q`` with ``s`` smooth; ``(exponents of s, q)`` when ``q`` is 1 or a prime ≤ B², else None."""
        a = mpz(a)
        k = max(1, int(a).bit_length().bit_length())
        g = math.gcd(int(pow(self.product, 1 << k, a)), int(a))
        q = int(a) // g
        if q != 1 and (q > self.B * self.B or not _is_probable_prime(q)):
            return None
        out: dict[int, int] = {}
        s = g
        for p in self.primes:
            if p > s:
                break
            if s % p == 0:
                e = 0
                while s % p == 0:
                    s //= p
                    e += 1
                out[p] = e
        return out, q

    def signed(self, b: int, exps: dict[int, int]) -> dict[int, int]:
        """Column → exponent of the form ``(a, b, ·)`` with ``a = ∏ p^{exps[p]}`` in the base."""
        out: dict[int, int] = {}
        for p, e in exps.items():
            i = self.index[p]
            if p in self.ramified:
                e %= 2
                if e:
                    out[i] = e
                continue
            m = 4 if p == 2 else 2 * p
            out[i] = e if (b - self.forms[i][1]) % m == 0 else -e
        return out


def _is_probable_prime(n: int) -> bool:
    import gmpy2

    return bool(gmpy2.is_prime(n))


def _relation_rows(D: int, base: _Base, ops: _Ops, need: int, rng: random.Random, stats: RelationStatistics):
    """Yield relation rows (dicts column → exponent) until the caller stops."""
    n = len(base.primes)
    partials: dict[int, tuple[dict[int, int], int]] = {}
    small = max(1, min(n, 20))
    col = 0
    while True:
        stats.trials += 1
        # every column gets its turn as the forced member (so every prime form is related)
        e: dict[int, int] = {col: 1}
        col = (col + 1) % n
        for _ in range(min(small, 6)):
            j = rng.randrange(small)
            e[j] = e.get(j, 0) + rng.randrange(1, max(2, need))
        x = ops.reduce(1, 1, (1 - D) // 4) if D % 4 == 1 else ops.reduce(1, 0, -D // 4)
        for j, k in e.items():
            x = ops.mul(x, ops.pow(base.forms[j], k))
        a, b = int(x[0]), int(x[1])
        got = base.split(a)
        if got is None:
            continue
        exps, q = got
        row = dict(e)
        for i, k in base.signed(b, exps).items():
            row[i] = row.get(i, 0) - k
        if q == 1:
            stats.full += 1
            yield {i: v for i, v in row.items() if v}
            continue
        # large prime q: the q-part of (a, b, c) is (q, ±b mod 2q): record that sign
        sign = 1 if (b % (2 * q)) <= q else -1
        if q in partials:
            other, osign = partials.pop(q)
            comb = dict(row)
            for i, v in other.items():
                comb[i] = comb.get(i, 0) - sign * osign * v
            stats.combined += 1
            comb = {i: v for i, v in comb.items() if v}
            if comb:
                yield comb
        else:
            partials[q] = (row, sign)


def class_group_subexponential(D: object, *, seed: int = 0, max_relations: int | None = None) -> ClassGroup:
    """The class group ``Cl(D)`` of a fundamental ``D < 0`` from relations among prime forms.

    Parameters
    ----------
    D : int
        A fundamental negative discriminant.
    seed : int
        Seed of the random exponent vectors (the result does not depend on it).
    max_relations : int, optional
        Stop with an error after this many relations (default ``10·n + 200`` for a factor
        base of n forms).

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
        If the relations do not pin ``h`` down within ``max_relations``.

    Examples
    --------
    >>> G = class_group_subexponential(-10**12 - 3)   # enumeration also gives h = 124568
    >>> G.invariants, G.provenance.method, G.provenance.assumption
    ((2, 62284), 'subexponential', 'GRH')

    References
    ----------
    Cohen, GTM 138, Algorithm 5.5.2; Hafner–McCurley (1989).
    """
    D = validate_discriminant(D)
    if D > 0:
        raise DiscriminantError(f"the subexponential method is implemented for D < 0 only, not {D}")
    _d_K, f = discriminant_parts(D)
    if f != 1:
        raise DiscriminantError(
            f"the subexponential method is implemented for fundamental D only; {D} has conductor {f} "
            "(use method 'bsgs', which handles orders)"
        )
    stats = RelationStatistics()
    _LAST["stats"] = stats
    B = factor_base_bound(D)
    base = _Base(D, B)
    n = len(base.primes)
    stats.factor_base, stats.bound = n, B
    est = class_number_estimate(D)
    lower, upper = int(est.lower), int(est.upper)
    ops = _Ops(D, BSGSStatistics())
    rng = random.Random(seed)
    limit = max_relations if max_relations is not None else 10 * n + 200
    rows: list[dict[int, int]] = []
    gen = _relation_rows(D, base, ops, max(2, n), rng, stats)
    target = n + 10
    Q = None
    with progress_bar(total=limit, desc="relations", unit="rel") as bar:
        while len(rows) < limit:
            rows.append(next(gen))
            bar.update(1)
            if len(rows) < target:
                continue
            Q = lattice_quotient(rows, ncols=n)
            h = Q.order if Q.is_finite else 0
            if h and lower <= h <= upper and h < 2 * max(1, lower):
                break
            target = len(rows) + max(5, n // 10)
        else:
            raise FormkitError(
                f"the subexponential method did not pin down h(D) for D = {D} within {limit} relations "
                f"(factor base of {n} prime forms up to {B}); use method 'bsgs'"
            )
    assert Q is not None
    h = Q.order
    stats.checks = [
        f"factor base: all {n} prime forms of norm ≤ {B} (Bach's bound {bach_bound(D)}: generators under GRH)",
        f"{len(rows)} relations ({stats.full} full, {stats.combined} from large-prime pairs, {stats.trials} trials)",
        f"h = {h} lies in [{lower}, {upper}] (Euler product to {est.l_value.prime_bound}, GRH) and h < 2·{lower},"
        " so the relation lattice is the full lattice",
    ]
    gens_vec = Q.generators
    invariants = tuple(d for d in Q.invariants if d != 1)

    def power_product(vec) -> Triple:
        x = ops.reduce(*_identity(D))
        for j, k in enumerate(vec):
            if k:
                x = ops.mul(x, ops.pow(base.forms[j], int(k)))
        return (int(x[0]), int(x[1]), int(x[2]))

    generators = [power_product(v) for v in gens_vec]

    def canonical(x: Triple) -> Triple:
        a, b, c = ops.reduce(int(x[0]), int(x[1]), int(x[2]))
        return (int(a), int(b), int(c))

    drng = random.Random(seed + 1)

    def dlog(x: Triple) -> tuple[int, ...]:
        """Coordinates of ``x``: randomise ``x·∏P^r`` until its reduced form is smooth."""
        small = min(n, 20)
        for _ in range(100000):
            r = {drng.randrange(small): drng.randrange(1, max(2, h)) for _ in range(3)}
            y = canonical(x)
            for j, k in r.items():
                y = ops.mul(y, ops.pow(base.forms[j], k))
            a, b, _c = int(y[0]), int(y[1]), int(y[2])
            got = base.split(a)
            if got is None or got[1] != 1:
                continue
            vec = [0] * n
            for i, k in base.signed(b, got[0]).items():
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
