"""Finite abelian groups given by an arithmetic object: orders, Sylow bases, structure.

Shared by :mod:`formkit.classgroups.baby_step_giant_step` (``Cl(D)``, ``D < 0``) and
:mod:`formkit.classgroups.infrastructure` (``Cl⁺(D)``, ``D > 0``).  The group is an ``ops`` object
with ``one``, ``mul(x, y)``, ``pow(x, e)`` (any integer ``e``), ``inv(x)`` and a
``stats`` counter, whose elements are hashable and *canonical* (equal classes are equal
values).

* :func:`_order_from_multiple`: the exact order from a multiple, by removing prime
  factors (Cohen GTM 138, Algorithm 1.4.3 in spirit; common practice).
* :class:`_Sylow`: a subgroup of an ℓ-Sylow subgroup with a basis ``b_1, …, b_r`` of
  orders ``ℓ^{c_1} ≤ … ≤ ℓ^{c_r}``, enlarged one element at a time: the element's
  relation ``z^{ℓ^j} = ∏ b_i^{d_i}`` (``j`` minimal) comes from an ℓ-adic discrete
  logarithm (Pohlig–Hellman digit by digit, the digits read off in the ℓ-torsion by a
  table or baby-step giant-step) and a Smith normal form
  (:func:`formkit.core.lattice.lattice_quotient`) of the relation matrix
  gives the new basis (Cohen GTM 138, §2.4.3 and §5.5; Teske, "A space efficient
  algorithm for group structure computation", Math. Comp. 67 (1998)).
* :class:`_Structure`: the Sylow bases put together: invariant factors, generators of
  exactly those orders, and discrete logarithms by projection and CRT.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993, §2.4.3, §5.5.
.. [2] E. Teske, "A space efficient algorithm for group structure computation",
       Math. Comp. 67 (1998), 1637–1663.
"""

from __future__ import annotations

import math

from ..core.arith import invert, isqrt
from ..core.factorisation import prime_factorisation
from ..core.lattice import lattice_quotient
from ..core.modular_roots import crt
from ..errors import FormkitError

__all__: list[str] = []

Triple = tuple[int, int, int]

#: Largest ℓ-torsion table (number of entries) built for ℓ-adic discrete logarithms.
TORSION_TABLE_LIMIT = 1 << 16
#: Largest number of baby steps stored for any single search.
BABY_STEP_LIMIT = 1 << 24


class BSGSStatistics:
    """Counters of one computation: group operations, baby and giant steps."""

    __slots__ = ("baby_steps", "generators_used", "giant_steps", "operations", "searches")

    def __init__(self) -> None:
        self.operations = 0
        self.baby_steps = 0
        self.giant_steps = 0
        self.searches = 0
        self.generators_used = 0

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return {k: getattr(self, k) for k in self.__slots__}

    def __repr__(self) -> str:
        return "BSGSStatistics(" + ", ".join(f"{k}={getattr(self, k)}" for k in self.__slots__) + ")"


def _order_from_multiple(ops, x: Triple, k: int, factors: dict | None = None) -> tuple[int, dict]:
    """The exact order of ``x`` given ``x^k = 1``; returns ``(order, factorisation)``."""
    fac = dict(prime_factorisation(k) if factors is None else factors)
    n = k
    for p in sorted(fac):
        while fac[p] and ops.pow(x, n // p) == ops.one:
            n //= p
            fac[p] -= 1
    return n, {p: e for p, e in fac.items() if e}


# ---------------------------------------------------------------------------
# Sylow subgroups with a basis


class _Sylow:
    """A subgroup of the ℓ-Sylow subgroup with basis ``b_i`` of orders ``ℓ^{c_i}`` (ascending)."""

    def __init__(self, ops, ell: int) -> None:
        self.ops = ops
        self.ell = ell
        self.basis: list[Triple] = []
        self.exps: list[int] = []
        self._tables: dict[int, object] = {}

    @property
    def order(self) -> int:
        return self.ell ** sum(self.exps)

    def log_order(self, z: Triple) -> int:
        """``a`` with ``ord(z) = ℓ^a`` (z must lie in the ℓ-Sylow subgroup)."""
        ops, a = self.ops, 0
        while z != ops.one:
            z = ops.pow(z, self.ell)
            a += 1
            if a > 200:
                raise ArithmeticError("element is not of ℓ-power order")
        return a

    # -- discrete logarithm in the ℓ-torsion Ω_t = <h_i : i ≥ t>, h_i = b_i^{ℓ^{c_i−1}}
    def _torsion_solver(self, t: int):
        solver = self._tables.get(t)
        if solver is not None:
            return solver
        ops, ell = self.ops, self.ell
        hs = [ops.pow(b, ell ** (c - 1)) for b, c in zip(self.basis[t:], self.exps[t:])]
        r = len(hs)
        if ell**r <= TORSION_TABLE_LIMIT:
            table = {ops.one: (0,) * r}
            for i, h in enumerate(hs):
                new = {}
                for elt, vec in table.items():
                    y = elt
                    for d in range(ell):
                        new[y] = vec[:i] + (d,) + vec[i + 1 :]
                        y = ops.mul(y, h)
                table = new
            solver = ("table", table)
        else:
            # table over h_t..h_{r−2} (all digits) times baby steps of the last one
            head = {ops.one: (0,) * (r - 1)}
            for i, h in enumerate(hs[:-1]):
                new = {}
                for elt, vec in head.items():
                    y = elt
                    for d in range(ell):
                        new[y] = vec[:i] + (d,) + vec[i + 1 :]
                        y = ops.mul(y, h)
                head = new
            m = isqrt(ell) + 1
            if len(head) * m > BABY_STEP_LIMIT:
                raise FormkitError(f"ℓ-torsion of rank {r} at ℓ = {ell} is too large for this implementation")
            last = hs[-1]
            baby = {}
            for elt, vec in head.items():
                y = elt
                for j in range(m):
                    baby[y] = vec + (j,)
                    y = ops.mul(y, last)
            solver = ("bsgs", (baby, ops.inv(ops.pow(last, m)), m))
        self._tables[t] = solver
        return solver

    def _torsion_log(self, t: int, w: Triple) -> tuple[int, ...] | None:
        kind, data = self._torsion_solver(t)
        if kind == "table":
            return data.get(w)
        baby, giant, m = data
        y = w
        for i in range(m + 1):
            v = baby.get(y)
            if v is not None:
                d = (v[-1] + i * m) % self.ell
                return v[:-1] + (d,)
            y = self.ops.mul(y, giant)
        return None

    def dlog(self, x: Triple) -> list[int] | None:
        """Exponents ``e`` with ``x = ∏ b_i^{e_i}``, or None if ``x`` is not in the subgroup."""
        ops, ell = self.ops, self.ell
        r = len(self.basis)
        if r == 0:
            return [] if x == ops.one else None
        C = self.exps[-1]
        zs = [x]  # zs[m] = x^(ℓ^m)
        for _ in range(C):
            zs.append(ops.pow(zs[-1], ell))
        if zs[C] != ops.one:
            return None
        e = [0] * r
        for s in range(1, C + 1):
            t = next(i for i in range(r) if self.exps[i] >= C - s + 1)
            w = zs[C - s]
            scale = ell ** (C - s)
            for i in range(t, r):
                if e[i]:
                    w = ops.mul(w, ops.pow(self.basis[i], -scale * e[i]))
            digits = self._torsion_log(t, w)
            if digits is None:
                return None
            for i, d in zip(range(t, r), digits):
                e[i] += d * ell ** (self.exps[i] - C + s - 1)
        return e

    def add(self, z: Triple) -> bool:
        """Enlarge the subgroup by ``z`` (of ℓ-power order); True if it grew."""
        ops, ell = self.ops, self.ell
        a = self.log_order(z)
        if a == 0:
            return False
        powers = [z]
        for _ in range(a):
            powers.append(ops.pow(powers[-1], ell))
        if self.basis and self.dlog(z) is not None:  # the common case: z already in H
            return False
        # smallest j with z^(ℓ^j) in the subgroup (membership is monotone in j)
        lo, hi = 1, a
        while lo < hi:
            mid = (lo + hi) // 2
            if self.dlog(powers[mid]) is None:
                lo = mid + 1
            else:
                hi = mid
        j = lo
        if j == 0:
            return False
        d_hi = self.dlog(powers[j]) if j < a else [0] * len(self.basis)
        if d_hi is None:  # pragma: no cover - membership is monotone
            raise ArithmeticError("inconsistent membership test")
        k = len(self.basis)
        gens = self.basis + [z]
        orders = [ell**c for c in self.exps] + [ell**a]
        rows = [[orders[i] if col == i else 0 for col in range(k + 1)] for i in range(k)]
        rows.append([-v for v in d_hi] + [ell**j])
        quotient = lattice_quotient(rows, ncols=k + 1)
        new_basis, new_exps = [], []
        for n, vec in zip(quotient.invariants, quotient.generators):
            y = ops.one
            for i in range(k + 1):
                ex = vec[i] % orders[i]
                if ex:
                    y = ops.mul(y, ops.pow(gens[i], ex))
            c = round(math.log(n, ell))
            while ell**c < n:
                c += 1
            if ell**c != n or self.log_order(y) != c:  # pragma: no cover - internal check
                raise ArithmeticError(f"Smith normal form step gave an element of wrong order at ℓ = {ell}")
            new_basis.append(y)
            new_exps.append(c)
        order = sorted(range(len(new_exps)), key=lambda i: new_exps[i])
        self.basis = [new_basis[i] for i in order]
        self.exps = [new_exps[i] for i in order]
        self._tables.clear()
        return True


class _Structure:
    """Result of the Sylow-basis computation: invariants, generators, dlog."""

    def __init__(self, ops, syl: dict[int, _Sylow]) -> None:
        self.ops = ops
        self.syl = {ell: S for ell, S in sorted(syl.items()) if S.basis}
        self.order = 1
        for S in self.syl.values():
            self.order *= S.order
        k = max((len(S.basis) for S in self.syl.values()), default=0)
        self.rank = k
        invariants = [1] * k
        gens = [ops.one] * k
        for S in self.syl.values():
            off = k - len(S.basis)
            for i, (b, c) in enumerate(zip(S.basis, S.exps)):
                invariants[off + i] *= S.ell**c
                gens[off + i] = ops.mul(gens[off + i], b)
        self.invariants = tuple(invariants)
        self.generators = tuple(gens)
        n = self.order
        self.projectors = {}
        for ell, S in self.syl.items():
            q = S.order
            m = n // q
            self.projectors[ell] = (m * int(invert(m % q, q))) % n if q > 1 else 0

    def dlog(self, x: Triple) -> tuple[int, ...]:
        ops, k = self.ops, self.rank
        residues: list[list[int]] = [[] for _ in range(k)]
        moduli: list[list[int]] = [[] for _ in range(k)]
        for ell, S in self.syl.items():
            v = S.dlog(ops.pow(x, self.projectors[ell]))
            if v is None:
                raise ArithmeticError(
                    f"class {x} is not in the subgroup generated by the prime forms used "
                    "(this would contradict GRH through Bach's bound)"
                )
            off = k - len(S.basis)
            for i, (e, c) in enumerate(zip(v, S.exps)):
                residues[off + i].append(e)
                moduli[off + i].append(S.ell**c)
        out = []
        for r, m in zip(residues, moduli):
            out.append(int(crt(r, m)[0]) if len(r) > 1 else int(r[0]) % m[0])
        return tuple(out)
