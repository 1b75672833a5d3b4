"""Class groups of large discriminants: baby-step giant-step, structure, discrete logs.

For ``|D|`` far beyond enumeration (20 to 40 digits) the class group ``Cl(D)``, ``D < 0``,
is computed from the prime forms of small norm:

1. *Generators.*  Under GRH the classes of the prime forms of norm
   ``≤ 6·log²|D|`` generate ``Cl(D)`` (Bach, "Explicit bounds for primality testing
   and related problems", Math. Comp. 55 (1990), 355–380, stated for maximal orders;
   Cohen GTM 138, §5.5.1).  This is the only unproved step for fundamental ``D``.
2. *Orders.*  The order of the first generator is found by Shanks' baby-step
   giant-step (Cohen GTM 138, Algorithm 5.4.10; Buchmann–Vollmer, *Binary Quadratic
   Forms*, Ch. 9), with the giant steps walking outwards from the analytic estimate of
   :func:`formkit.analytic.lseries.class_number_estimate` (the estimate only decides where to
   look first; the search is exhaustive, so a poor estimate costs time, not
   correctness).  The class number found is then checked against the interval that
   holds under GRH (:func:`formkit.analytic.lseries.l_value_estimate`).  Baby steps are stored
   by ``(a, |b|)``, which ``x^j`` and ``x^{-j}`` share, so each giant step covers
   ``2s + 1`` exponents.  The number of genera ``2^t``
   divides ``h`` (genus theory), so the search runs on ``x^(2^t)`` over a range ``2^t``
   times shorter.  A multiple ``k`` with ``x^k = 1`` is turned into the exact order by
   factoring ``k``.
3. *Structure.*  The subgroup ``H`` generated so far is kept as its Sylow subgroups,
   each with a basis ``b_1, …, b_r`` of orders ``ℓ^{c_1} ≤ … ≤ ℓ^{c_r}``.  A new
   generator's ℓ-part ``z`` contributes the relation ``z^{ℓ^j} = ∏ b_i^{d_i}`` with
   ``j`` minimal, found with an ℓ-adic discrete logarithm (Pohlig–Hellman digit by
   digit, the digits read off in the ℓ-torsion by a table or baby-step giant-step),
   and a Smith normal form of the relation matrix (:mod:`formkit.core.lattice`) gives the new basis
   (Cohen GTM 138, §2.4.3 and §5.5; Teske, "A space efficient algorithm for group
   structure computation", Math. Comp. 67 (1998)).  This part lives in
   :mod:`formkit.classgroups.abelian_groups`, shared with :mod:`formkit.classgroups.infrastructure`.
4. *Index bound.*  ``h(D) ≤ U`` with the proven bound ``U`` of
   :func:`formkit.analytic.lseries.class_number_upper_bound`, so ``[Cl(D) : H] ≤ U/|H|``; a
   prime ``ℓ > U/|H|`` cannot divide the index, so the ℓ-parts of later generators
   need no membership test.  For the other primes a generator costs one exponentiation
   by the ``(U/|H|)``-rough part of ``|H|`` plus small ones.
5. *Non-fundamental D = f²·d_K.*  ``h(D) = h(d_K)·f·∏_{p|f}(1 − χ_{d_K}(p)/p)/[O_K^*:O^*]``
   (Cox, *Primes of the form x² + ny²*, Theorem 7.24).  ``h(d_K)`` is computed first
   (by enumeration when ``|d_K|`` is within :data:`formkit.classgroups.dispatch.ENUMERATION_LIMIT`,
   which makes the whole result unconditional; otherwise by this module under GRH), and
   prime forms of ``D`` are added until ``|H| = h(D)``, which proves ``H = Cl(D)``.

Group operations are Shanks' NUCOMP/NUDUPL (Cohen Algorithms 5.4.8, 5.4.9; the same
formulas as :mod:`formkit.core.composition`, inlined here on plain Python integers, with
modular inverses from ``pow(x, -1, m)``) for ``|D| ≥ 10^18`` and Dirichlet composition
followed by reduction below; powers use a width-3 sliding window.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993, §2.4.3, Algorithms 5.4.8–5.4.10, §5.5.
.. [2] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, Ch. 9.
.. [3] E. Bach, "Explicit bounds for primality testing and related problems",
       Math. Comp. 55 (1990), 355–380.
.. [4] E. Teske, "A space efficient algorithm for group structure computation",
       Math. Comp. 67 (1998), 1637–1663.
.. [5] D. Shanks, "Class number, a theory of factorization, and genera", Proc. Symp.
       Pure Math. 20, AMS 1971, 415–440.
"""

from __future__ import annotations

import math
from math import gcd, isqrt

from ..analytic.lseries import class_number_estimate, class_number_upper_bound
from ..core.arith import kronecker
from ..core.budget import check_cost
from ..core.discriminants import discriminant_parts, validate_discriminant
from ..core.enumeration import _prime_forms
from ..core.factorisation import prime_factorisation
from ..core.progress import ProgressBar, announces_slowness, progress_bar
from ..core.raw_reduction import _reduce_definite_raw
from ..errors import DiscriminantError
from .abelian_groups import BABY_STEP_LIMIT, BSGSStatistics, _order_from_multiple, _Structure, _Sylow
from .group import ClassGroup, Provenance

__all__ = [
    "bach_bound",
    "bsgs_cost",
    "class_group_bsgs",
    "order_of_class",
    "BSGSStatistics",
    "last_statistics",
]

Triple = tuple[int, int, int]


_LAST: dict[str, BSGSStatistics] = {}


def last_statistics() -> BSGSStatistics | None:
    """Counters of the most recent :func:`class_group_bsgs` computation (for benchmarks)."""
    return _LAST.get("stats")


# ---------------------------------------------------------------------------
# group arithmetic on reduced positive definite forms (plain int triples)


class _Ops:
    """Composition, squaring, inverse and powers in Cl(D), D < 0, counting operations."""

    def __init__(self, D: int, stats: BSGSStatistics) -> None:
        self.D = D
        self.stats = stats
        L = max(1, isqrt(isqrt(-D // 4)))
        self.L = L
        self.L2 = L * L
        k = D % 2
        self.one: Triple = (1, k, (k - D) // 4)
        self.nucomp = -D >= 10**18

    #: Gauss reduction of a positive definite form (Cohen Algorithm 5.4.2), shared
    #: with formkit.core.raw_reduction.
    reduce = staticmethod(_reduce_definite_raw)

    def _partial(self, d1: int, v1: int, v2: int, r: int, b2: int, c2: int) -> Triple:
        # NUCOMP partial reduction (the formulas of formkit.core.composition._partial_reduce)
        bound = self.L if v1 == v2 else isqrt(v1 * self.L2 // v2)
        Rp, Rc = v1, r
        Cp, Cc = 0, -1
        odd = True
        while Rc > bound:
            q, rem = divmod(Rp, Rc)
            Rp, Rc = Rc, rem
            Cp, Cc = Cc, Cp - q * Cc
            odd = not odd
        dc = d1 * c2
        a3 = (v2 * Rc * Rc - b2 * Rc * Cc + dc * Cc * Cc) // v1
        b3 = (2 * v2 * Rc * Rp - b2 * (Rc * Cp + Rp * Cc) + 2 * dc * Cc * Cp) // v1
        if odd:
            b3 = -b3
        return self.reduce(a3, b3, (b3 * b3 - self.D) // (4 * a3))

    def _finish(self, d1: int, v1: int, v2: int, r: int, b2: int, c2: int) -> Triple:
        if self.nucomp:
            return self._partial(d1, v1, v2, r, b2, c2)
        a3 = v1 * v2
        b3 = b2 + 2 * v2 * r
        return self.reduce(a3, b3, (b3 * b3 - self.D) // (4 * a3))

    def mul(self, x: Triple, y: Triple) -> Triple:
        """Product of reduced forms (Cohen Algorithm 5.4.7 for d1, v1, v2, r; then NUCOMP)."""
        self.stats.operations += 1
        a1, b1, c1 = x
        a2, b2, c2 = y
        if a1 < a2:
            a1, b1, c1, a2, b2, c2 = a2, b2, c2, a1, b1, c1
        if a2 == 1:
            return (a1, b1, c1)
        d = gcd(a1, a2)
        if d == 1:
            return self._finish(1, a1, a2, ((b1 - b2) // 2 * pow(a2, -1, a1)) % a1, b2, c2)
        s = (b1 + b2) // 2
        A1 = a1 // d
        y1 = pow(a2 // d, -1, A1) if A1 > 1 else 0  # y1·a2 ≡ d (mod a1)
        if s % d == 0:
            d1, x2, y2 = d, 0, -1
        else:
            d1 = gcd(s, d)
            dd = d // d1
            x2 = pow(s // d1, -1, dd) if dd > 1 else 0  # x2·s ≡ d1 (mod d)
            y2 = -((d1 - x2 * s) // d)
        v1 = a1 // d1
        r = (y1 * y2 * (b2 - s) - x2 * c2) % v1
        return self._finish(d1, v1, a2 // d1, r, b2, c2)

    def sqr(self, x: Triple) -> Triple:
        """Square of a reduced form (NUDUPL, Cohen Algorithm 5.4.8)."""
        self.stats.operations += 1
        a, b, c = x
        if a == 1:
            return x
        d1 = gcd(a, b)
        v1 = a // d1
        u = pow(b // d1, -1, v1) if v1 > 1 else 0  # u·b ≡ d1 (mod a)
        return self._finish(d1, v1, v1, (-u * c) % v1, b, c)

    @staticmethod
    def inv(x: Triple) -> Triple:
        a, b, c = x
        if b == 0 or b == a or a == c:
            return x
        return (a, -b, c)

    def pow(self, x: Triple, e: int) -> Triple:
        if e < 0:
            x, e = self.inv(x), -e
        if e == 0:
            return self.one
        bits = bin(e)[2:]
        result: Triple | None
        if len(bits) <= 16:
            result = x
            for bit in bits[1:]:
                result = self.sqr(result)
                if bit == "1":
                    result = self.mul(result, x)
            return result
        # left-to-right sliding window of width 3 (odd powers x, x^3, x^5, x^7)
        x2 = self.sqr(x)
        odd = [x]
        for _ in range(3):
            odd.append(self.mul(odd[-1], x2))
        result = None
        i, n = 0, len(bits)
        while i < n:
            if bits[i] == "0":
                result = self.sqr(result)  # type: ignore[arg-type]
                i += 1
                continue
            j = min(i + 3, n)
            while bits[j - 1] == "0":
                j -= 1
            w = odd[int(bits[i:j], 2) >> 1]
            if result is None:
                result = w
            else:
                for _ in range(j - i):
                    result = self.sqr(result)
                result = self.mul(result, w)
            i = j
        return result  # type: ignore[return-value]


# ---------------------------------------------------------------------------
# orders


#: Steps between two updates of the progress bar of an order search.
_PROGRESS_EVERY = 1024


def _order_multiple(ops: _Ops, x: Triple, center: int, spread: float, limit: int) -> int:
    """A positive ``k`` with ``x^k = 1``: baby steps ``x^j`` (0 ≤ j ≤ s) keyed by ``(a, |b|)``,
    giant steps outwards from ``center`` in strides of ``2s+1``.  Exhaustive up to ``limit``.

    A progress bar on stderr (:mod:`formkit.core.progress`) counts the steps; its total is
    the ``s`` baby steps and the giant steps that cover the window ``spread`` around the
    estimate, where the order lies unless the estimate of ``h`` is far off."""
    s = int(min(BABY_STEP_LIMIT, max(4, math.isqrt(max(1, int(spread))))))
    expected = s + int(spread / (2 * s + 1)) + 1
    with progress_bar(total=expected, desc="baby-step giant-step (order of a class)", unit="step") as bar:
        return _order_search(ops, x, center, s, limit, bar)


def _order_search(ops: _Ops, x: Triple, center: int, s: int, limit: int, bar: ProgressBar) -> int:
    st = ops.stats
    st.searches += 1
    one = ops.one
    if x == one:
        return 1
    table: dict[tuple[int, int], tuple[int, int]] = {(one[0], abs(one[1])): (0, one[1])}
    y = x
    for j in range(1, s + 1):
        a, b, c = y
        if b == 0 or b == a or a == c:  # ambiguous: y = y^{-1}, so x^{2j} = 1
            return 2 * j
        key = (a, abs(b))
        hit = table.get(key)
        if hit is not None:
            i, bi = hit
            return j - i if bi == b else j + i
        table[key] = (j, b)
        if j % _PROGRESS_EVERY == 0:
            bar.update(_PROGRESS_EVERY)
        if j < s:
            y = ops.mul(y, x)
    st.baby_steps += s
    stride = 2 * s + 1
    X = ops.mul(y, ops.mul(y, x))  # x^(2s+1)
    Xinv = ops.inv(X)
    K = max(center, s + 1)
    up = ops.pow(x, K)
    Ku, Kd = K, K
    down = up
    down_alive = True
    while True:
        st.giant_steps += 1
        if st.giant_steps % _PROGRESS_EVERY == 0:
            bar.update(_PROGRESS_EVERY)
        a, b, _ = up
        hit = table.get((a, abs(b)))
        if hit is not None:
            i, bi = hit
            return Ku - i if bi == b else Ku + i
        up = ops.mul(up, X)
        Ku += stride
        if down_alive:
            Kd -= stride
            if Kd - s < 1:
                down_alive = False
            else:
                down = ops.mul(down, Xinv)
                a, b, _ = down
                hit = table.get((a, abs(b)))
                if hit is not None:
                    i, bi = hit
                    return Kd - i if bi == b else Kd + i
        if Ku - s > limit and not down_alive:
            raise ArithmeticError(
                f"baby-step giant-step found no order of {x} up to the proven bound {limit}"
            )


# ---------------------------------------------------------------------------
# the class group


#: Bytes per stored baby step (a dict entry keyed by a pair of ints, measured with
#: tracemalloc at 30–40 digit D, rounded up) and seconds per group operation at 40 digits.
_BYTES_PER_BABY_STEP = 300
_SECONDS_PER_STEP = 6e-6
#: Past this many bits of |D| even the estimate of h is not attempted: |D|^(1/4) steps alone
#: are beyond any budget.
_HOPELESS_BITS = 2000


def bsgs_cost(D: int, spread: float | None = None) -> tuple[float, float]:
    """Estimated (seconds, bytes) of one baby-step giant-step order search for ``D < 0``.

    ``spread`` is the width of the search window around the estimate of ``h`` (by default
    ``√|D|/(π·1000)``, a typical width).  Baby steps ``s = min(2^24, √spread)`` are
    stored; giant steps ``spread/(2s+1)``; a few searches are counted (``×4``).

    Examples
    --------
    >>> t, m = bsgs_cost(-10**40 - 3)
    >>> m > 4 * 2**30
    True
    >>> t, m = bsgs_cost(-10**20 - 3)
    >>> t < 60 and m < 2**30
    True
    """
    bits = abs(D).bit_length()
    if spread is None:
        log_spread = 0.5 * bits * math.log(2) - math.log(math.pi * 1000)
        spread = math.exp(min(log_spread, 700.0))
    s = min(float(BABY_STEP_LIMIT), max(4.0, math.sqrt(max(1.0, spread))))
    per_step = _SECONDS_PER_STEP * (1 + bits / 130)
    seconds = 4 * (s + spread / (2 * s + 1)) * per_step
    return seconds, _BYTES_PER_BABY_STEP * s


def _check_bsgs_cost(D: int, spread: float | None = None) -> None:
    from ..core.budget import describe_integer

    seconds, memory = bsgs_cost(D, spread)
    check_cost(
        f"baby-step giant-step for D = {describe_integer(D)}",
        seconds=seconds,
        memory=memory,
        further="no method here reaches that far (its cost grows like |D|^(1/4))",
    )


def _precheck_bsgs_cost(D: int) -> None:
    """Before factoring ``D`` or estimating ``h``: refuse at once when the typical cost
    (:func:`bsgs_cost` without a spread) is ten times over the budget."""
    from ..core.budget import current_budget

    if abs(D).bit_length() > _HOPELESS_BITS or bsgs_cost(D)[0] > 10 * current_budget().seconds:
        _check_bsgs_cost(D)


def bach_bound(D: object) -> int:
    """Bach's bound ``⌊6·log²|D|⌋``: under GRH the prime forms of norm at most this
    generate ``Cl(D)`` (Bach 1990, theorem number not recalled; Cohen GTM 138, §5.5.1).

    Examples
    --------
    >>> bach_bound(-10**20), bach_bound(-10**30)
    (12724, 28630)
    """
    D = validate_discriminant(D)
    return int(6 * math.log(abs(D)) ** 2)


def _unit_index(d_K: int, f: int) -> int:
    if f == 1:
        return 1
    return {-3: 3, -4: 2}.get(d_K, 1)


def _class_number_from_field(d_K: int, f: int, h_K: int) -> int:
    """``h(f²d_K) = h(d_K)·f·∏_{p|f}(1 − χ(p)/p)/[O_K^*:O^*]`` (Cox Theorem 7.24), exactly."""
    num, den = h_K * f, _unit_index(d_K, f)
    for p in prime_factorisation(f) if f > 1 else ():
        num *= p - kronecker(d_K, p)
        den *= p
    if num % den:  # pragma: no cover - the formula gives an integer
        raise ArithmeticError(f"class number formula for orders gave {num}/{den}")
    return num // den


#: Fundamental discriminants up to this size are enumerated (unconditionally) when
#: they are needed for a non-fundamental D.
FIELD_ENUMERATION_LIMIT = 10**9


def _build(
    D: int, ops: _Ops, forms, center: int, spread: float, U: int, target: int | None, divisor: int = 1
) -> _Structure:
    # ``divisor`` is a known divisor of h (the number of genera): the first search runs on
    # g^divisor, whose order divides h/divisor, over a range ``divisor`` times shorter.
    stats = ops.stats
    syl: dict[int, _Sylow] = {}
    n = 1
    nfac: dict[int, int] = {}
    for _p, g in forms:
        stats.generators_used += 1
        if n == 1:
            k = divisor * _order_multiple(
                ops, ops.pow(g, divisor), max(1, round(center / divisor)), spread / divisor, U // divisor + 1
            )
            o, fac = _order_from_multiple(ops, g, k)
            for ell, v in fac.items():
                syl.setdefault(ell, _Sylow(ops, ell)).add(ops.pow(g, o // ell**v))
        else:
            M = U // n
            n_s = 1
            for ell, e in nfac.items():
                if ell <= M:
                    n_s *= ell**e
            y = ops.pow(g, n // n_s)
            gn = ops.pow(y, n_s)
            if gn == ops.one:  # ord(g) | n: only the small primes can enlarge H
                for ell, e in nfac.items():
                    if ell <= M:
                        syl[ell].add(ops.pow(y, n_s // ell**e))
            else:
                c2 = max(1, round(center / n))
                k = _order_multiple(ops, gn, c2, spread / n, U // n + 1)
                fac = dict(nfac)
                for ell, e in prime_factorisation(k).items():
                    fac[ell] = fac.get(ell, 0) + e
                o, ofac = _order_from_multiple(ops, g, n * k, fac)
                for ell, v in ofac.items():
                    if ell in nfac and ell > M:
                        continue  # ℓ cannot divide the index: G_ℓ ⊂ H already
                    syl.setdefault(ell, _Sylow(ops, ell)).add(ops.pow(g, o // ell**v))
        n, nfac = 1, {}
        for ell, S in syl.items():
            if S.exps:
                nfac[ell] = sum(S.exps)
                n *= S.order
        if target is not None and n == target:
            break
    if n > U:  # pragma: no cover - would contradict the proven bound
        raise ArithmeticError(f"computed class number {n} exceeds the proven bound {U}")
    return _Structure(ops, syl)


@announces_slowness(lambda D, **k: f"baby-step giant-step for Cl({D}) (conditional on GRH)")
def class_group_bsgs(D: object, *, prime_bound: int | None = None) -> ClassGroup:
    """The class group ``Cl(D)``, ``D < 0``, by baby-step giant-step (GRH, Bach's bound).

    Parameters
    ----------
    D : int
        A negative discriminant (fundamental or not) of any size.
    prime_bound : int, optional
        Truncation point of the Euler product that steers the search
        (default :func:`formkit.analytic.lseries.default_prime_bound`).

    Returns
    -------
    ClassGroup
        With ``provenance.method == "bsgs"``.  For fundamental ``D`` the result is
        conditional on GRH (``provenance.bound`` is Bach's bound: the prime forms up to
        it are all used as generators).  For ``D = f²·d_K`` with ``f > 1`` the class
        number is fixed by ``h(d_K)``: unconditional when ``|d_K|`` ≤
        :data:`FIELD_ENUMERATION_LIMIT` (``d_K`` enumerated), else conditional on GRH.

    Notes
    -----
    ``G.discrete_log(x)`` (and so ``x.order``) projects ``x`` to each Sylow subgroup
    and solves there (Pohlig–Hellman); for a prime ``ℓ`` dividing ``h`` once, that is a
    baby-step giant-step of about ``√ℓ`` operations, so when ``h`` has a prime factor
    near ``h`` itself a discrete logarithm costs about ``|D|^(1/4)`` operations and
    memory (refused beyond ``2^24`` stored steps).  Building the group does not need it.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a negative discriminant.

    Examples
    --------
    >>> G = class_group_bsgs(-10**12 - 3)   # enumeration also gives h = 124568
    >>> G.invariants, G.order, G.provenance.assumption
    ((2, 62284), 124568, 'GRH')
    >>> H = class_group_bsgs(-4004)     # Cl(−4004) ≅ C2 × C2 × C10 (enumeration, formkit)
    >>> H.invariants, H.provenance.method
    ((2, 2, 10), 'bsgs')
    """
    D = validate_discriminant(D)
    if D > 0:
        raise DiscriminantError(
            f"baby-step giant-step class groups are implemented for D < 0, not {D}; "
            "for D > 0 use formkit.real_class_number (class numbers and regulator)"
        )
    _precheck_bsgs_cost(D)
    d_K, f = discriminant_parts(D)
    stats = BSGSStatistics()
    _LAST["stats"] = stats
    ops = _Ops(D, stats)
    est = class_number_estimate(D, prime_bound)
    U = class_number_upper_bound(D)
    B = bach_bound(D)
    spread = max(1.0, est.estimate * est.l_value.typical_radius)
    _check_bsgs_cost(D, spread)
    center = max(1, round(est.estimate))
    target: int | None = None
    assumption: str | None
    bound: int | None
    certified, assumption, bound = False, "GRH", B
    if f > 1:
        if -d_K <= FIELD_ENUMERATION_LIMIT:
            from ..core.enumeration import class_number

            h_K = class_number(d_K)
            certified, assumption, bound = True, None, None
            how = f"h(d_K) = {h_K} by enumeration (unconditional)"
        else:
            G_K = class_group_bsgs(d_K, prime_bound=prime_bound)
            h_K = G_K.order
            bound = G_K.provenance.bound
            how = f"h(d_K) = {h_K} by baby-step giant-step under GRH (Bach bound {bound} for d_K)"
        _LAST["stats"] = stats
        target = _class_number_from_field(d_K, f, h_K)
        forms = _prime_forms(D, f, max(B, 10**7))
    else:
        forms = _prime_forms(D, f, B)
    from .genus import genus_count

    S = _build(D, ops, forms, center, spread, U, target, genus_count(D))
    if target is not None and S.order != target:
        raise ArithmeticError(f"prime forms reached {S.order} classes, expected h(D) = {target}")
    if target is not None:
        detail = f"h(D) = h(d_K)·f·∏(1−χ(p)/p)/[O_K*:O*] with {how}; prime forms reach all {target} classes"
    else:
        detail = (
            f"structure of the subgroup generated by all prime forms of norm ≤ {B} (Bach: Cl(D) under GRH)"
        )
    if not est.lower <= S.order <= est.upper:  # pragma: no cover - would contradict GRH or reveal a bug
        raise ArithmeticError(
            f"h = {S.order} found for D = {D} lies outside the interval [{est.lower}, {est.upper}] "
            "that the Euler product gives under GRH"
        )
    detail += (
        f"; h lies in the interval [{est.lower}, {est.upper}] given under GRH by the Euler product "
        f"to {est.l_value.prime_bound}"
    )

    def canonical(x: Triple) -> Triple:
        a, b, c = _Ops.reduce(int(x[0]), int(x[1]), int(x[2]))
        return (a, b, c)

    return ClassGroup(
        D,
        invariants=S.invariants,
        generators=S.generators,
        dlog=S.dlog,
        canonical=canonical,
        provenance=Provenance("bsgs", certified, assumption, bound, detail),
        forms=None,
    )


def order_of_class(form: object) -> int:
    """The order of the class of a primitive positive definite form, by baby-step giant-step.

    The search is steered by the analytic class-number estimate but is exhaustive, so
    the result is unconditional.

    Examples
    --------
    >>> order_of_class((2, 1, 3))      # Cl(−23) ≅ C3
    3
    >>> order_of_class((1, 1, 6))
    1
    """
    from ..core.forms import as_form
    from ..errors import FormError, NotPrimitiveError

    F = as_form(form)
    D = F.discriminant
    if D >= 0 or F.a < 0:
        raise FormError(f"order_of_class needs a positive definite form, not {F!r}")
    if not F.is_primitive:
        raise NotPrimitiveError(f"order_of_class needs a primitive form; {F!r} has content {F.content}")
    _precheck_bsgs_cost(D)
    ops = _Ops(D, BSGSStatistics())
    est = class_number_estimate(D)
    _check_bsgs_cost(D, max(1.0, est.estimate * est.l_value.typical_radius))
    x = _Ops.reduce(F.a, F.b, F.c)
    k = _order_multiple(
        ops,
        x,
        max(1, round(est.estimate)),
        max(1.0, est.estimate * est.l_value.typical_radius),
        class_number_upper_bound(D),
    )
    return _order_from_multiple(ops, x, k)[0]
