"""Relations among prime forms of ``D < 0`` (and ``D > 0``, the sign kept) by sieving quadratic polynomials (Jacobson's method).

For a form ``A = (a, b, c)`` of discriminant ``D`` with ``a = q₁·q₂·…·q_k`` a product of
distinct split primes of the factor base, the polynomial ``f(x) = a x² + b x + c`` takes
the values ``A(x, 1)``.  Since ``A`` maps ``(X, Y) ↦ (xX − Y, X)`` (determinant 1) to
``(f(x), −(2ax + b), ·)``, every value ``v = f(x)`` that factors over the factor base,
``v = ∏ p^{k_p}``, gives a relation

    ``∏ P_{q_i}^{±1} = ∏ P_p^{±k_p}``

in ``Cl(D)``, the signs read off ``b`` modulo ``2q_i`` and ``−(2ax + b)`` modulo ``2p``
(Jacobson [1], §3; the same polynomials as in the multiple-polynomial quadratic sieve,
Silverman [2]).  The values over an interval ``−M ≤ x < M`` are sieved with numpy:
``log₂ p`` is added at the two roots of ``f`` modulo each factor-base prime ``p``
(computed from a square root of ``D`` modulo ``p``, once per prime), and the positions
whose sum comes close to ``log₂ f(x)`` are trial-divided exactly.  A value whose
cofactor is a single prime ``ℓ`` below the large-prime bound is kept as a *partial*
relation; two partials with the same ``ℓ`` combine into a full one (the large-prime
variation, [1] §4).

Self-initialisation ([2]; Contini's thesis): for one ``a`` the ``2^{k−1}`` values of
``b = Σ ±B_i`` (``B_i ≡ √D mod q_i``, ``B_i ≡ 0`` modulo the other ``q_j``) give distinct
polynomials at the cost of one set of inverses ``(2a)^{-1} mod p``.

Each ``a`` contains one *cover prime* chosen by the caller, so that every relation from
its polynomials involves that prime form: this is how the large primes of the factor base,
which rarely divide a sieved value, get into the relation lattice.

References
----------
.. [1] M. J. Jacobson, Jr., "Applying sieving to the computation of quadratic class
       groups", Math. Comp. 68 (1999), 859–867.
.. [2] R. D. Silverman, "The multiple polynomial quadratic sieve", Math. Comp. 48
       (1987), 329–339.
.. [3] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.5 (relations of prime forms) and §10.4 (the quadratic sieve).
"""

from __future__ import annotations

import math
import random
from collections.abc import Iterator
from dataclasses import dataclass

import numpy as np

from ..core.enumeration import _prime_forms
from ..core.forms import Form
from ..core.modular_roots import sqrt_mod_prime

__all__ = ["FactorBase", "SieveParameters", "Relation", "sieve_relations"]

Triple = tuple[int, int, int]

#: Primes below this are not sieved (their logs are a fixed allowance in the threshold);
#: common practice in the quadratic sieve (Silverman [2], §4), no source for the value.
SMALL_PRIME_CUT = 30


@dataclass(frozen=True)
class SieveParameters:
    """The tunable parameters of the sieve.

    Attributes
    ----------
    bound : int
        Factor-base bound ``B`` (prime forms of norm ≤ B).
    half_width : int
        ``M``: each polynomial is sieved over ``−M ≤ x < M``.
    large_prime_factor : int
        Partial relations keep one prime cofactor ``ℓ ≤ large_prime_factor · B`` (and ``ℓ ≤ B²``).
    polynomials_per_a : int
        How many ``b`` of the self-initialising family are used for one ``a`` (at most ``2^{k−1}``).
    slack : float
        Bits below ``log₂ f(x) − log₂ ℓ_max`` still trial-divided (covers the unsieved small primes).
    """

    bound: int
    half_width: int
    large_prime_factor: int = 60
    polynomials_per_a: int = 4
    slack: float = 6.0


@dataclass(frozen=True)
class Relation:
    """A relation ``Σ exponents[i]·[P_i] = large_sign·[P_ℓ]`` (``large = 1``: a full relation).

    ``exponents`` is a sorted tuple of ``(column, exponent)`` pairs with non-zero exponents.
    """

    exponents: tuple[tuple[int, int], ...]
    large: int = 1
    large_sign: int = 1
    #: ``D > 0`` only (0 otherwise): the relation is the principal ideal ``((β + √D)/2)``
    #: (times the ideal of the large prime), ``β = −(2ax + b)``; its norm ``a·f(x)`` has the
    #: sign of ``β² − D`` (:mod:`formkit.classgroups.subexponential_real` reads both).
    beta: int = 0


class FactorBase:
    """The prime forms ``P_p = (p, b_p, c)`` of ``D < 0`` for ``p ≤ B``, ``χ_D(p) ≠ −1``, and sieve data.

    Parameters
    ----------
    D : int
        A fundamental negative discriminant (not checked here).
    B : int
        The bound.
    """

    def __init__(self, D: int, B: int) -> None:
        self.D = D
        self.B = B
        self.primes: list[int] = []
        self.forms: list[Triple] = []
        for p, g in _prime_forms(D, 1, B):
            self.primes.append(p)
            self.forms.append((int(g[0]), int(g[1]), int(g[2])))
        # b_p of the unreduced prime form (p, b_p, ·): the sign rule of :meth:`signed` reads it
        # (the reduced form of a prime p > √(|D|/4) need not have first coefficient p)
        self.roots = [int(Form.prime_form(D, p).b) for p in self.primes]
        self.index = {p: i for i, p in enumerate(self.primes)}
        self.ramified = frozenset(p for p in self.primes if D % p == 0)
        # odd primes sieved: split or ramified, above the small-prime cut
        sieved = [p for p in self.primes if p >= SMALL_PRIME_CUT]
        self.sieved = np.array(sieved, dtype=np.int64)
        self.sqrt_d = np.array([sqrt_mod_prime(D % p, p) for p in sieved], dtype=np.int64)
        self.logs = np.array([round(math.log2(p)) for p in sieved], dtype=np.uint8)
        self.small = [p for p in self.primes if p < SMALL_PRIME_CUT]
        # primes that may go into a: split, odd, not tiny
        self.a_candidates = [p for p in self.primes if p >= SMALL_PRIME_CUT and p not in self.ramified]

    def __len__(self) -> int:
        return len(self.primes)

    def signed(self, b: int, exps: dict[int, int]) -> dict[int, int]:
        """Columns → exponents of the class of ``(∏ p^{exps[p]}, b, ·)`` in the factor base.

        The ``p``-part of a primitive form ``(n, b, ·)`` is ``P_p^{k}`` or ``P_p^{−k}`` as ``b ≡ b_p``
        or ``b ≡ −b_p`` modulo ``2p`` (modulo 4 for ``p = 2``; Cohen [3], Lemma 5.2.4 ff.);
        ramified ``P_p`` has order ≤ 2, so only the parity of ``k`` counts.
        """
        out: dict[int, int] = {}
        for p, e in exps.items():
            i = self.index[p]
            if p in self.ramified:
                if e % 2:
                    out[i] = 1
                continue
            m = 4 if p == 2 else 2 * p
            out[i] = e if (b - self.roots[i]) % m == 0 else -e
        return out


def _choose_a(base: FactorBase, cover: int, target: float, rng: random.Random) -> list[int]:
    """Distinct primes ``[cover, q₂, …]`` of the factor base with product near ``target``."""
    chosen = [cover]
    rest = target / cover
    cands = [p for p in base.a_candidates if p != cover]
    if rest < 1.5 * SMALL_PRIME_CUT or not cands:
        return chosen
    # aim for primes of about 2000 (or as large as the base allows), at least one factor
    size = min(2000.0, float(cands[-1]) / 2)
    k = max(1, round(math.log(rest) / math.log(max(size, SMALL_PRIME_CUT + 1))))
    import bisect

    for j in range(k):
        left = k - j
        want = rest ** (1.0 / left)
        pos = bisect.bisect_left(cands, want)
        if left > 1:
            pos += rng.randrange(-min(pos, 20), 21)
        pos = max(0, min(len(cands) - 1, pos))
        tries = 0
        while cands[pos] in chosen and tries < 50:
            pos = max(0, min(len(cands) - 1, pos + rng.choice((-1, 1))))
            tries += 1
        if cands[pos] in chosen:
            break
        chosen.append(cands[pos])
        rest /= cands[pos]
    return chosen


def _modinv_vector(x: np.ndarray, p: np.ndarray) -> np.ndarray:
    """``x^{-1} mod p`` elementwise (p prime, p ∤ x) by Fermat's little theorem, in int64."""
    result = np.ones_like(x)
    base = x % p
    e = p - 2
    while np.any(e):
        odd = (e & 1).astype(bool)
        result = np.where(odd, (result * base) % p, result)
        base = (base * base) % p
        e = e >> 1
    return result


def _polynomials(base: FactorBase, qs: list[int], count: int) -> Iterator[tuple[int, int, int]]:
    """Up to ``count`` polynomials ``(a, b, c)``, ``a = ∏ qs``, of the self-initialising family."""
    D = base.D
    a = math.prod(qs)
    parts = []
    for q in qs:
        t = sqrt_mod_prime(D % q, q)
        cof = a // q
        parts.append(t * cof * pow(cof, -1, q) % a)
    k = len(qs)
    for mask in range(min(count, 1 << (k - 1))):
        b = parts[0]
        for i in range(1, k):
            b += -parts[i] if (mask >> (i - 1)) & 1 else parts[i]
        b %= a
        if (b - D) % 2:
            b += a  # a is odd; b ≡ D (mod 2) makes b² ≡ D (mod 4a)
        if b > a:
            b -= 2 * a
        yield a, b, (b * b - D) // (4 * a)


def sieve_relations(
    base: FactorBase, params: SieveParameters, covers: list[int], seed: int
) -> Iterator[Relation]:
    """Relations from the polynomials with ``a`` containing each prime of ``covers`` in turn.

    Parameters
    ----------
    base : FactorBase
    params : SieveParameters
    covers : list of int
        Factor-base primes (odd, unramified); the ``i``-th ``a`` contains ``covers[i]``.
    seed : int
        Seed for the choice of the other primes of ``a`` (the relations are true whatever it is).

    Yields
    ------
    Relation
        Full relations (``large == 1``) and partial ones (one large prime ``ℓ``).
    """
    D = base.D
    M = params.half_width
    width = 2 * M
    rng = random.Random(seed)
    target = math.sqrt(abs(D) / 2) / M
    large_max = min(params.large_prime_factor * base.B, base.B * base.B)
    P = base.sieved
    T = base.sqrt_d
    L = base.logs
    xs = np.arange(-M, M, dtype=np.float64)
    for cover in covers:
        qs = _choose_a(base, cover, target, rng)
        a0 = math.prod(qs)
        keep = np.ones(len(P), dtype=bool)
        for q in qs:
            keep &= q != P
        Pk, Tk, Lk = P[keep], T[keep], L[keep]
        inv2a = _modinv_vector(np.array([(2 * a0) % int(p) for p in Pk], dtype=np.int64), Pk)
        plist = Pk.tolist()
        llist = Lk.tolist()
        direct = base.small + qs  # trial-divided without the sieve
        for a, b, c in _polynomials(base, qs, params.polynomials_per_a):
            bm = np.array([b % p for p in plist], dtype=np.int64)
            r1 = ((Tk - bm) * inv2a) % Pk
            r2 = ((Pk - Tk - bm) % Pk * inv2a) % Pk
            s1 = ((r1 + M) % Pk).tolist()
            s2 = ((r2 + M) % Pk).tolist()
            sieve = np.zeros(width, dtype=np.uint8)
            for p, lp, i1, i2 in zip(plist, llist, s1, s2):
                sieve[i1::p] += lp
                if i2 != i1:
                    sieve[i2::p] += lp
            fx = (float(a) * xs + float(b)) * xs + float(c)
            # D > 0: f changes sign; the sieve sees |f(x)| (the sign is kept with the relation)
            thresh = np.log2(np.abs(fx)) - math.log2(large_max) - params.slack
            cand = np.nonzero(sieve >= thresh)[0]
            for pos in cand.tolist():
                x = pos - M
                rel = _trial_divide(base, a, b, c, x, qs, direct, Pk, r1, r2, large_max)
                if rel is not None:
                    yield rel


def _trial_divide(
    base: FactorBase,
    a: int,
    b: int,
    c: int,
    x: int,
    qs: list[int],
    direct: list[int],
    Pk: np.ndarray,
    r1: np.ndarray,
    r2: np.ndarray,
    large_max: int,
) -> Relation | None:
    v = (a * x + b) * x + c
    xm = x % Pk
    hits = Pk[(xm == r1) | (xm == r2)].tolist()
    exps: dict[int, int] = {}
    for p in direct + hits:
        if v % p == 0:
            e = 0
            while v % p == 0:
                v //= p
                e += 1
            exps[p] = exps.get(p, 0) + e
    v = abs(v)  # D > 0: a negative value is a relation whose generator has negative norm
    if v != 1 and v > large_max:
        return None
    beta = -(2 * a * x + b)
    row: dict[int, int] = base.signed(b, dict.fromkeys(qs, 1))
    for i, k in base.signed(beta, exps).items():
        row[i] = row.get(i, 0) - k
    items = tuple(sorted((i, k) for i, k in row.items() if k))
    gen = beta if base.D > 0 else 0
    if v == 1:
        return Relation(items, beta=gen)
    # all prime factors of v exceed B (primes with χ = −1 never divide a primitive value),
    # and v ≤ B², so v is prime; its form is (v, β mod 2v): record which of the two
    sign = 1 if beta % (2 * v) <= v else -1
    return Relation(items, v, sign, gen)
