"""Solutions of Q(x, y) = n for indefinite forms: orbits under the proper automorphs.

For an indefinite form ``Q`` of non-square discriminant ``D > 0`` the proper
automorphism group is ``{±A^k : k ∈ Z}`` with ``A`` the fundamental automorph
(:func:`formkit.core.equivalence.fundamental_automorph`), and the solutions of
``Q(x, y) = n ≠ 0`` fall into finitely many orbits ``{±A^k v}``.  By the square-root
correspondence of :mod:`formkit.representation.representations`, the orbits of proper solutions of
``Q = m`` correspond one-to-one to the roots ``b mod 2|m|`` of ``b² ≡ D (mod 4|m|)``
whose form ``(m, b, (b² − D)/4m)`` is primitive and properly equivalent to ``Q``:
``b`` is an invariant of the orbit, and the solutions attached to one ``b`` are the
first columns of ``N·M`` for ``N`` in the automorphism group (none of which fixes a
non-zero vector, since ``t = 2`` forces ``u = 0`` in ``t² − Du² = 4``).  Equivalence is
decided by looking the reduced form of ``(m, b, ·)`` up in the cycle of reduced forms
of ``Q`` (Gauss; Buchmann–Vollmer, *Binary Quadratic Forms*, §6.8–6.10 — numbers as
recalled).  All solutions are ``g·v`` with ``v`` a proper solution of ``Q = n/g²``.

Each orbit is represented by its element of least ``x² + y²``: along an orbit
``k ↦ |A^k v|²`` is a sum of two exponentials in ``k`` plus a constant (``A`` has
positive eigenvalues ``ε², ε⁻²``), hence convex, so descending from any element reaches
the minimum; ties (at most two ``k`` and two signs) are broken by preferring ``x > 0``,
then ``y ≥ 0``, then smaller ``|y|``.

References
----------
.. [1] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, Ch. 6.
.. [2] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §2.
.. [3] C. F. Gauss, *Disquisitiones Arithmeticae*, art. 168–170 (numbers as recalled).
"""

from __future__ import annotations

import math
import time
from collections.abc import Iterator
from typing import cast

from ..core.arith import as_int, gcd, isqrt, mpz
from ..core.budget import check_cost, current_budget, describe_integer, format_seconds
from ..core.equivalence import fundamental_automorph
from ..core.forms import Form, FormLike, Matrix, _require_nonsquare, as_form, mat_inverse, mat_mul
from ..core.progress import progress_bar
from ..core.raw_reduction import _rho_indefinite_raw
from ..core.reduction import _reduce_indefinite
from ..errors import BudgetError, FormError
from .square_root_method import (
    _content_and_sign,
    _factor_abs,
    _primitive_target,
    _proper_roots,
    _scaled_factors,
    _square_divisors,
)

__all__ = [
    "representation_orbits",
    "orbit_representative",
    "walk_orbit",
]

Vector = tuple[int, int]


#: Below this discriminant the cycle walks are cheap at any regulator (R < √D·log D, at
#: most about 0.5 s here) and are not priced first.
_UNPRICED_BELOW = 10**7


def cycle_walk_cost(R: float, norm: int = -1, targets: int = 1) -> tuple[float, float]:
    """Estimated ``(seconds, bytes)`` of the indefinite representation walks for regulator ``R``.

    Two walks are made: the principal cycle for the fundamental unit (``R/1.19`` reduction
    steps: on average a step of the reduction operator ρ advances the distance ``log|θ|``
    by ``π²/(12·log 2) ≈ 1.19``, Lévy's constant of continued fractions) and the cycle of
    the form, of distance ``R⁺`` (``R``, or ``2R`` when ``N(ε) = −1``), carrying its
    transformation matrix, whose entries grow to about ``R⁺/log 2`` bits.  Measured on the
    development machine (CPU time): the unit walk of ``D = 4·(10^10 + 19)`` (``R ≈ 147160``,
    124 000 steps) took 3.9 s, about ``0.3 ns`` per bit of the current entries per step,
    plus ``1.5 µs`` per step; taken here as ``1 ns`` per bit (``2 ns`` for the form's cycle,
    whose matrix product is the general one) and ``2 µs`` per step.  Memory: the matrices
    kept (four entries each, one per target form and a few working ones), 4 entries of
    ``R⁺/log 2`` bits.

    Examples
    --------
    >>> t, m = cycle_walk_cost(147160.0, norm=1)
    >>> 5 < t < 60 and m < 2**30
    True
    >>> cycle_walk_cost(10.0**12)[0] > 10**9
    True
    """
    Rp = 2 * R if norm == -1 else R
    unit_steps, form_steps = R / 1.19 + 2, Rp / 1.19 + 2
    unit_bits, form_bits = R / math.log(2), Rp / math.log(2)
    seconds = unit_steps * (2e-6 + 1e-9 * unit_bits / 2) + form_steps * (2e-6 + 2e-9 * form_bits / 2)
    memory = (targets + 8) * 4 * form_bits / 8 + 1e6
    return seconds, memory


def _check_cycle_cost(P: Form, D: int, n: int, targets: int) -> None:
    """Refuse the walks of :func:`_all_orbits` when their estimate is over the budget.

    The regulator is found first by the infrastructure (Shanks' baby-step giant-step, about
    ``D^(1/4)`` steps, itself priced), so the length of the cycles is known before they are
    walked."""
    if D < _UNPRICED_BELOW:
        return
    from ..analytic.lseries import class_number_estimate, default_prime_bound
    from ..classgroups.abelian_groups import BSGSStatistics
    from ..classgroups.infrastructure import _regulator_infrastructure

    est = class_number_estimate(D, default_prime_bound(D))
    R, norm = _regulator_infrastructure(D, BSGSStatistics(), est.upper)
    seconds, memory = cycle_walk_cost(R, norm, targets)
    check_cost(
        f"the solutions of {P} = {describe_integer(n)} by the cycles of reduced forms (D = {describe_integer(D)}, regulator "
        f"R ≈ {R:.4g}: about {R / 1.19:.3g} reduction steps, and automorphs with about {R / math.log(10):.3g} digits)",
        seconds=seconds,
        memory=memory,
        further="the cost grows like R², and no other method here lists the orbits",
    )


def _cycle_matrices(P: Form, targets: set[tuple[int, int, int]]) -> dict[tuple[int, int, int], Matrix]:
    """``{t: M}`` with ``P·M = t`` (``M ∈ SL2(Z)``) for the reduced forms ``t`` of ``targets``
    on the cycle of reduced forms of ``P``.

    The cycle is walked once with its running matrix; only the matrices of the targets are
    kept (memory: one matrix per target found, not one per form of the cycle).  A walk
    longer than the time budget stops with :class:`~formkit.errors.BudgetError`."""
    D = P.discriminant
    sq = isqrt(D)
    start = _reduce_indefinite(P, D, False)
    to_start = start.matrix  # P · to_start = start
    a, b, c = mpz(start.reduced.a), mpz(start.reduced.b), mpz(start.reduced.c)
    first = (int(a), int(b), int(c))
    found: dict[tuple[int, int, int], Matrix] = {}
    if first in targets:
        found[first] = to_start
    p, q, r, s = 1, 0, 0, 1  # the running matrix [[p, q], [r, s]]
    limit = current_budget().seconds
    t0 = time.monotonic()
    steps = 0
    with progress_bar(desc=f"the cycle of reduced forms of {P}", unit="form", delay=3.0) as bar:
        while len(found) < len(targets):
            a, b, c, t = _rho_indefinite_raw(a, b, c, mpz(D), sq)
            p, q, r, s = q, -p + t * q, s, -r + t * s  # times [[0, -1], [1, t]]
            key = (int(a), int(b), int(c))
            if key == first:
                break
            if key in targets:
                found[key] = mat_mul(to_start, ((int(p), int(q)), (int(r), int(s))))
            steps += 1
            if steps & 0xFFF == 0:
                bar.update(0x1000)
                elapsed = time.monotonic() - t0
                if elapsed > limit:
                    raise BudgetError(
                        f"the cycle of reduced forms of {P} (D = {describe_integer(D)}) has more than {steps} forms "
                        f"and walking it has already taken {format_seconds(elapsed)}, over the budget of "
                        f"{format_seconds(limit)} (the cycle length is about R/1.19 for the regulator R); raise "
                        "--budget, or use a form of smaller discriminant"
                    )
    return found


def _size(v: Vector) -> int:
    return v[0] * v[0] + v[1] * v[1]


def _apply(A: Matrix, v: Vector) -> Vector:
    return (A[0][0] * v[0] + A[0][1] * v[1], A[1][0] * v[0] + A[1][1] * v[1])


def _canonical(A: Matrix, Ainv: Matrix, v: Vector) -> Vector:
    """The smallest element of the orbit ``{±A^k v}`` (ties broken as documented)."""
    if v == (0, 0):
        return v
    while _size(_apply(A, v)) < _size(v):
        v = _apply(A, v)
    while _size(_apply(Ainv, v)) < _size(v):
        v = _apply(Ainv, v)
    cands = [v]
    for w in (_apply(A, v), _apply(Ainv, v)):
        if _size(w) == _size(v):
            cands.append(w)
    cands += [(-x, -y) for x, y in cands]
    return min(cands, key=_orbit_key)


def _orbit_key(v: Vector):
    x, y = v
    return (x * x + y * y, x < 0 or (x == 0 and y < 0), y < 0, abs(y), x)


def _all_orbits(Q: Form, D: int, k: int, n: int, factors) -> tuple[list[Vector], int]:
    if n == 0:
        return [(0, 0)], 0
    P, m = _primitive_target(Q, k, 1, n)
    if P is None:
        return [], 0
    fac = _factor_abs(m, _scaled_factors(factors, n, m))
    D = P.discriminant
    # the candidate forms (m/g², b, ·), one per root b, and their reduced forms
    candidates = []
    for g, rest in _square_divisors(fac):
        mm = m // (g * g)
        for b in _proper_roots(D, mm, rest):
            rf = _reduce_indefinite(Form(mm, b, (b * b - D) // (4 * mm)), D, False)
            candidates.append((g, rf))
    if not candidates:
        return [], 0
    _check_cycle_cost(P, D, m, len(candidates))
    found = _cycle_matrices(P, {rf.reduced.coefficients for _g, rf in candidates})
    if not found:
        return [], 0
    A = fundamental_automorph(P)
    Ainv = mat_inverse(A)
    reps: list[Vector] = []
    prim = 0
    for g, rf in candidates:
        N = found.get(rf.reduced.coefficients)
        if N is not None:
            M = mat_mul(N, mat_inverse(rf.matrix))
            v = _canonical(A, Ainv, (g * M[0][0], g * M[1][0]))
            reps.append(v)
            if g == 1:
                prim += 1
    reps.sort(key=_orbit_key)
    return reps, prim


def representation_orbits(
    form: FormLike, n: object, *, primitive: bool = False, factors: dict[int, int] | None = None
) -> tuple[Vector, ...]:
    """One solution of ``Q(x, y) = n`` per orbit of the proper automorphs (indefinite ``Q``).

    The solutions of ``Q(x, y) = n ≠ 0`` fall into finitely many orbits
    ``{±A^k v : k ∈ Z}`` under the proper automorphism group (``A`` the fundamental
    automorph); each orbit is represented by its element of least ``x² + y²`` (ties:
    ``x > 0`` first, then ``y ≥ 0``, then smaller ``|y|``).  Every solution of the
    equation is ``±A^k`` times exactly one returned vector.

    Parameters
    ----------
    primitive : bool
        Only the orbits of primitive solutions.

    Raises
    ------
    FormError
        If ``Q`` is definite (use :func:`representations`).

    Examples
    --------
    >>> representation_orbits((1, 1, -1), 11)      # x² + xy − y² = 11
    ((3, 1), (3, 2))
    >>> representation_orbits((1, 0, -3), 2)       # x² − 3y² = 2 has no solution
    ()
    """
    Q, D, k, _sign, n = _content_and_sign(form, n)
    if D < 0:
        raise FormError(f"{Q!r} is definite: use representations() for the full list of solutions")
    reps, _ = _all_orbits(Q, D, k, n, factors)
    if primitive:
        reps = [v for v in reps if gcd(v[0], v[1]) == 1]
    return tuple(reps)


def _orbit_matrices(form: FormLike) -> tuple[Form, Matrix, Matrix]:
    Q = as_form(form)
    D = _require_nonsquare(Q, "orbits of solutions")
    if D < 0:
        raise FormError(f"{Q!r} is definite: its solution sets are finite (use representations())")
    A = fundamental_automorph(Q)
    return Q, A, mat_inverse(A)


def orbit_representative(form: FormLike, solution: tuple[int, int]) -> Vector:
    """The representative (least ``x² + y²``) of the orbit of ``solution`` under the proper
    automorphs of the indefinite form ``Q`` — the vector :func:`representation_orbits` returns.

    Examples
    --------
    >>> orbit_representative((1, 0, -2), (17, 12))   # 17² − 2·12² = 1
    (1, 0)
    """
    _Q, A, Ainv = _orbit_matrices(form)
    x, y = (as_int(v, "solution entry") for v in solution)
    return _canonical(A, Ainv, (x, y))


def walk_orbit(form: FormLike, solution: tuple[int, int]) -> Iterator[Vector]:
    """Walk the orbit of ``solution`` under the proper automorphs of an indefinite form.

    Yields ``v, −v, Av, −Av, A⁻¹v, −A⁻¹v, A²v, …`` without end (``A`` the fundamental
    automorph): every solution in the orbit appears exactly once.  Take what you need
    with :func:`itertools.islice`.

    Examples
    --------
    >>> from itertools import islice
    >>> list(islice(walk_orbit((1, 0, -2), (1, 0)), 6))
    [(1, 0), (-1, 0), (3, 2), (-3, -2), (3, -2), (-3, 2)]
    """
    _Q, A, Ainv = _orbit_matrices(form)
    v0 = cast("tuple[int, int]", tuple(as_int(v, "solution entry") for v in solution))
    if v0 == (0, 0):
        yield (0, 0)
        return
    yield v0
    yield (-v0[0], -v0[1])
    fwd = back = v0
    while True:
        fwd = _apply(A, fwd)
        back = _apply(Ainv, back)
        for v in (fwd, back):
            yield v
            yield (-v[0], -v[1])
