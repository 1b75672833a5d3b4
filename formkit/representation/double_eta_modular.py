"""The modular polynomial ``Ψ(X, J)`` relating a double η-quotient ``w_{p₁,p₂}^s`` and ``j``, exact.

For distinct primes ``p₁ < p₂`` (``p₁ = 2`` allowed), ``N = p₁p₂`` and ``s = 24/gcd(24,
(p₁ − 1)(p₂ − 1))``, let ``w = w_{p₁,p₂}`` be the double η-quotient of
:mod:`formkit.representation.double_eta`, ``w(z) = η(z/p₁)η(z/p₂)/(η(z)η(z/N))``.  Put
``g(z) = w(Nz) = η(p₁z)η(p₂z)/(η(z)η(Nz))``.  Then ``f = g^s`` is a modular function for
``Γ₀(N)``: the η-quotient ``∏η(δz)^{r_δ}`` with ``r = s·(−1, 1, 1, −1)`` at ``δ = 1, p₁,
p₂, N`` has weight 0, ``Σδr_δ = Σ(N/δ)r_δ = −s(p₁ − 1)(p₂ − 1) ≡ 0 (mod 24)`` and
``∏δ^{r_δ} = 1`` (the criterion of Gordon–Hughes and Newman, Ono [3], Theorem 1.64, as
recalled); and it is invariant under the Fricke
involution ``z ↦ −1/(Nz)`` (each η transforms by ``√(z/i)``, the four square roots cancel).
This module computes the primitive integer polynomial ``Ψ(X, J)`` with ``Ψ(f, j) = 0``;
since ``w^s(z) = f(z/N)`` and ``j(z) = j(N·z/N)``, the Fricke invariance gives also
``Ψ(w^s(z), j(z)) = 0``, the relation the CM step needs.

*Degrees, from the cusps.*  The orders of an η-quotient at the cusps of ``X₀(N)`` (Ligozat's
formula, e.g. Ono [3], Theorem 1.65, as recalled): with ``e = s(p₁ − 1)(p₂ − 1)/24`` (an
integer), ``f`` has poles of order ``e`` at ``∞`` and at ``0`` and zeros of order ``e`` at
``1/p₁`` and ``1/p₂``, so ``f`` has degree ``2e`` on ``X₀(N)``; ``j`` has poles at the
four cusps of orders their widths ``1, N, p₂, p₁``.  Hence

* ``deg_J Ψ = 2e`` (over a value ``x`` of ``f`` lie ``2e`` points of ``X₀(N)``, and ``Ψ``
  is ``x^{p₁+p₂}·∏(J − j(z))`` over them).  That ``f`` and ``j`` generate the function
  field of ``X₀(N)`` is not assumed; the tests show ``Ψ`` irreducible (two specialisations
  factored by FLINT), so ``j`` has degree exactly ``2e`` over ``C(f)``;
* the coefficients ``σ_k`` of ``Ψ/lc`` (the elementary symmetric functions of the ``2e``
  values of ``j`` over ``x``) are Laurent polynomials in ``x`` (poles only at cusps, i.e. at
  ``x = ∞`` and ``x = 0``), and the growth of the ``j``-values near the cusps bounds their
  exponents: ``−⌊kp₂/e⌋ ≤ · ≤ ⌊kN/e⌋`` for ``k ≤ e`` and ``−(p₂ + ⌊(k − e)p₁/e⌋) ≤ · ≤
  N + ⌊(k − e)/e⌋`` for ``k > e``;
* so ``Ψ = X^{p₁+p₂}·(J^{2e} − σ₁J^{2e−1} + …)`` has ``deg_X Ψ = p₁ + p₂ + N + 1 =
  (p₁ + 1)(p₂ + 1) = ψ(N)``, the index of ``Γ₀(N)``, and leading coefficient ``X^{p₁+p₂}``
  in ``J``.  For ``e = 1`` (the pairs ``(3, 5)``, ``(3, 7)``, ``(3, 13)``, ``(5, 7)`` and
  those with ``p₁ = 2``) ``Ψ`` has degree 2 in ``J`` and the two values of ``j`` over
  ``f(z)`` are ``j(z)`` and ``j(Nz)``.

*Method.*  Exact power series in ``q``: ``∏(1 − qⁿ)`` by Euler's pentagonal theorem, its
inverse by the partition recurrence, ``E₄ = 1 + 240Σσ₃(n)qⁿ`` and ``j = E₄³/Δ``, all with
integer coefficients.  The unknown coefficients of the ``σ_k`` solve a linear system (the
``q``-expansion of ``Σσ_k(f)j^{2e−k}`` vanishes); it is solved modulo 62-bit primes
(FLINT's ``nmod_mat`` row reduction as arithmetic), the solutions joined by the Chinese
remainder theorem and rational reconstruction until they stabilise (Wang's rational
reconstruction, e.g. von zur Gathen–Gerhard [4], §5.10).  Full rank modulo one prime
proves the solution unique over ``Q`` among Laurent polynomials within these bounds, so it
is the elementary symmetric functions themselves.

*Verification (exact, always).*  The integer polynomial found is accepted only when the
``q``-expansion of ``Ψ(f, j)``, computed exactly, vanishes up to ``q^B`` with ``B = eψ(N) +
2e(N + p₁ + p₂)``.  This proves ``Ψ(f, j) = 0``: otherwise ``Ψ(f, j)`` would be a non-zero
function on ``X₀(N)`` with a zero of order ``> B`` at ``∞``, more zeros than its poles at
the other cusps allow (at most ``eψ(N) + 2eN`` at ``0``, ``2ep₂`` at ``1/p₁``, ``2ep₁`` at
``1/p₂``).  A test checks ``Ψ(w^s(τ), j(τ)) ∋ 0`` in ball arithmetic at random ``τ``.

*Supported pairs.*  Those of :data:`DOUBLE_ETA_MODULAR_PAIRS` — the ten pairs
:func:`~formkit.representation.double_eta.double_eta_pair` chooses from and the four
``(2, 3)``, ``(2, 5)``, ``(2, 7)``, ``(2, 13)`` (all with ``e = 1``) — each computed once
and cached (measured: under 0.1 s for ``e = 1``, 1.2 s for ``(5, 13)``, 5 to 18 s for the
pairs with ``e ≥ 3``, ``(7, 11)`` the longest; the cost is priced against the budget of
:mod:`formkit.core.budget` first).  Other pairs are refused.

References
----------
.. [1] A. Enge, R. Schertz, "Constructing elliptic curves over finite fields using double
       eta-quotients", J. Théor. Nombres Bordeaux 16 (2004), 555–568.
.. [2] A. Enge, A. V. Sutherland, "Class invariants by the CRT method", ANTS-IX (2010),
       LNCS 6197, 142–156 (modular polynomials of double η-quotients, as recalled).
.. [3] K. Ono, *The Web of Modularity*, CBMS 102, AMS 2004, Theorem 1.64 and 1.65 (η-quotients
       on ``Γ₀(N)`` and their orders at the cusps; as recalled).
.. [4] J. von zur Gathen, J. Gerhard, *Modern Computer Algebra*, 3rd ed., CUP 2013, §5.4
       (Chinese remaindering), §5.10 (rational reconstruction).
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass
from fractions import Fraction
from functools import cache
from typing import Any

from ..core.arith import as_int
from ..core.displays import SentenceDisplay
from ..errors import FormkitError
from .double_eta import _PAIRS, _PAIRS_WITH_2, _exponent

__all__ = [
    "DOUBLE_ETA_MODULAR_PAIRS",
    "DoubleEtaModularPolynomial",
    "double_eta_modular_polynomial",
    "double_eta_pole_order",
]

#: The pairs whose modular polynomial is computed (``double_eta_pair``'s list and four with 2), sorted.
DOUBLE_ETA_MODULAR_PAIRS: tuple[tuple[int, int], ...] = tuple(sorted(_PAIRS + _PAIRS_WITH_2))

#: The 62-bit primes the linear systems are solved modulo, from the largest below ``2^62``.
_PRIME_START = 1 << 62


def double_eta_pole_order(p1: int, p2: int) -> int:
    """``e = s(p₁ − 1)(p₂ − 1)/24``: the order of the pole of ``w^s`` at ``∞``; ``deg_J Ψ = 2e``.

    Examples
    --------
    >>> [double_eta_pole_order(*pair) for pair in [(3, 5), (3, 13), (5, 13), (7, 13), (3, 11)]]
    [1, 1, 2, 3, 5]
    """
    return _exponent(p1, p2) * (p1 - 1) * (p2 - 1) // 24


# ---------------------------------------------------------------------------
# exact q-series (lists of integers, the coefficient of q^n at index n)


def _euler_product(n: int) -> list[int]:
    """``∏_{k≥1}(1 − q^k) mod q^n`` by Euler's pentagonal number theorem."""
    c = [0] * n
    c[0] = 1
    k = 1
    while k * (3 * k - 1) // 2 < n:
        sign = -1 if k % 2 else 1
        for m in (k * (3 * k - 1) // 2, k * (3 * k + 1) // 2):
            if m < n:
                c[m] += sign
        k += 1
    return c


def _partition_numbers(n: int) -> list[int]:
    """``p(0), …, p(n − 1)``, the coefficients of ``1/∏(1 − q^k)``, by Euler's recurrence."""
    p = [0] * n
    p[0] = 1
    for m in range(1, n):
        total, k = 0, 1
        while k * (3 * k - 1) // 2 <= m:
            sign = 1 if k % 2 else -1
            total += sign * p[m - k * (3 * k - 1) // 2]
            if k * (3 * k + 1) // 2 <= m:
                total += sign * p[m - k * (3 * k + 1) // 2]
            k += 1
        p[m] = total
    return p


def _eisenstein_e4(n: int) -> list[int]:
    """``E₄ = 1 + 240Σσ₃(m)q^m mod q^n`` (σ₃ by a divisor sieve)."""
    sigma3 = [0] * n
    for d in range(1, n):
        for m in range(d, n, d):
            sigma3[m] += d**3
    return [1] + [240 * sigma3[m] for m in range(1, n)]


def _inflate(c: list[int], d: int, n: int) -> list[int]:
    """``c(q^d) mod q^n``."""
    out = [0] * n
    for i in range(min(len(c), (n + d - 1) // d)):
        out[i * d] = c[i]
    return out


def _base_series(p1: int, p2: int, n: int) -> tuple[list[list[int]], list[list[int]], list[int], list[int]]:
    """Factors of ``G = g·q^{(p₁−1)(p₂−1)/24}`` and of ``1/G``, ``E₄`` and ``1/∏(1 − q^k)``."""
    N = p1 * p2
    E, P = _euler_product(n), _partition_numbers(n)
    G = [_inflate(E, p1, n), _inflate(E, p2, n), P, _inflate(P, N, n)]
    G_inverse = [_inflate(P, p1, n), _inflate(P, p2, n), E, _inflate(E, N, n)]
    return G, G_inverse, _eisenstein_e4(n), P


def _laurent_bounds(p1: int, p2: int, e: int) -> tuple[list[int], list[int]]:
    """``lo[k], hi[k]``: ``σ_k`` has exponents of ``X`` in ``[−lo[k], hi[k]]`` (module docstring)."""
    N, big, small = p1 * p2, max(p1, p2), min(p1, p2)
    hi = [0] + [k * N // e if k <= e else N + (k - e) // e for k in range(1, 2 * e + 1)]
    lo = [0] + [k * big // e if k <= e else big + (k - e) * small // e for k in range(1, 2 * e + 1)]
    return lo, hi


def _solve_modulo(p1: int, p2: int, ell: int) -> list[int] | None:
    """The unknowns ``c_{k,i}`` (coefficient of ``X^i J^{2e−k}``, ``k ≥ 1``) modulo ``ell``, in
    the order of :func:`_unknowns`; ``None`` if the system has not full rank modulo ``ell``."""
    from flint import nmod_mat, nmod_poly

    s, e = _exponent(p1, p2), double_eta_pole_order(p1, p2)
    lo, hi = _laurent_bounds(p1, p2, e)
    cols = _unknowns(p1, p2)
    top = max(e * hi[k] + 2 * e - k for k in range(2 * e + 1))  # the largest pole order at ∞
    R = len(cols) + 24  # equations: the coefficients of q^−top, …, q^(R−1−top)
    G, G_inverse, E4, P = _base_series(p1, p2, R)

    def mul(a: Any, b: Any) -> Any:
        return a.mul_low(b, R)

    def product(factors: list[list[int]]) -> Any:
        out = nmod_poly([1], ell)
        for x in factors:
            out = mul(out, nmod_poly(x, ell))
        return out

    Gs, Gis = product(G).pow_trunc(s, R), product(G_inverse).pow_trunc(s, R)
    Jt = mul(nmod_poly(E4, ell).pow_trunc(3, R), nmod_poly(P, ell).pow_trunc(24, R))  # q·j
    Gpow = {0: nmod_poly([1], ell)}
    for i in range(1, max(hi) + 1):
        Gpow[i] = mul(Gpow[i - 1], Gs)
    for i in range(1, max(lo) + 1):
        Gpow[-i] = mul(Gpow[1 - i], Gis)
    Jpow = [nmod_poly([1], ell)]
    for _k in range(2 * e):
        Jpow.append(mul(Jpow[-1], Jt))

    def column(k: int, i: int) -> list[int]:
        # q^top · X^i J^(2e−k) = q^(top − ei − (2e−k)) · G^(si) · (qj)^(2e−k)
        shift = top - e * i - (2 * e - k)
        c = [0] * shift + [int(x) for x in mul(Gpow[i], Jpow[2 * e - k]).coeffs()]
        return (c + [0] * R)[:R]

    columns = [column(k, i) for k, i in cols]
    rhs = column(0, 0)
    n = len(cols)
    rows = [[columns[c][r] for c in range(n)] + [(-rhs[r]) % ell] for r in range(R)]
    reduced, rank = nmod_mat(rows, ell).rref()
    if rank != n:
        return None  # rank n + 1 (inconsistent) or a deficient rank modulo this prime
    return [int(reduced[i, n]) for i in range(n)]


def _unknowns(p1: int, p2: int) -> list[tuple[int, int]]:
    e = double_eta_pole_order(p1, p2)
    lo, hi = _laurent_bounds(p1, p2, e)
    return [(k, i) for k in range(1, 2 * e + 1) for i in range(-lo[k], hi[k] + 1)]


def _rational_reconstruction(a: int, m: int) -> Fraction | None:
    """``r/t ≡ a (mod m)`` with ``|r|, |t| ≤ √(m/2)``, if any (Wang; von zur Gathen–Gerhard §5.10)."""
    bound = math.isqrt(m // 2)
    r0, r1, t0, t1 = m, a % m, 0, 1
    while r1 > bound:
        q = r0 // r1
        r0, r1, t0, t1 = r1, r0 - q * r1, t1, t0 - q * t1
    if abs(t1) > bound or math.gcd(r1, abs(t1)) != 1 or t1 == 0:
        return None
    return Fraction(r1, t1)


def _next_prime_below(n: int) -> int:
    from ..core.arith import is_probable_prime

    n -= 1
    while not is_probable_prime(n):
        n -= 1
    return n


def _series_check(p1: int, p2: int, rows: tuple[tuple[int, ...], ...]) -> int:
    """Exact ``q``-expansion of ``Ψ(f, j)`` to ``q^B`` (module docstring); returns ``B``, or
    raises ``RuntimeError`` if a coefficient does not vanish."""
    from flint import fmpz_poly

    s, e = _exponent(p1, p2), double_eta_pole_order(p1, p2)
    N, psi = p1 * p2, (p1 + 1) * (p2 + 1)
    B = e * psi + 2 * e * (N + p1 + p2)
    top = e * psi + 2 * e
    L = top + B + 1  # q^top·Ψ(f, j) mod q^L
    G, _G_inverse, E4, P = _base_series(p1, p2, L)
    Gs = fmpz_poly([1])
    for x in G:
        Gs = Gs.mul_low(fmpz_poly(x), L)
    Gs = Gs.pow_trunc(s, L)
    Jt = fmpz_poly(E4).pow_trunc(3, L).mul_low(fmpz_poly(P).pow_trunc(24, L), L)
    # q^(eψ + 2e)·Ψ(f, j) = Σ_k [q^(eψ)·c_k(f)]·(qj)^k·q^(2e − k), c_k(X) = Σ_i rows[k][i]·X^i;
    # q^(eψ)·c_k(f) = Σ_i c_i q^(e(ψ − i)) G^(si), by Horner: H ← H·G^s + c_i q^(e(ψ − i))
    total = fmpz_poly(0)
    Jpow = fmpz_poly([1])
    for k, row in enumerate(rows):
        inner = fmpz_poly(0)
        for i in range(psi, -1, -1):
            inner = inner.mul_low(Gs, L)
            if i < len(row) and row[i]:
                inner += fmpz_poly([0] * (e * (psi - i)) + [row[i]])
        total += fmpz_poly([0] * (2 * e - k) + [1]).mul_low(inner.mul_low(Jpow, L), L)
        Jpow = Jpow.mul_low(Jt, L)
    bad = [n for n, c in enumerate(total.coeffs()[:L]) if c != 0]
    if bad:
        raise RuntimeError(f"Ψ for ({p1}, {p2}): q-expansion of Ψ(f, j) has a non-zero term q^{bad[0] - top}")
    return B


def _check_pair(p1: object, p2: object) -> tuple[int, int]:
    a, b = sorted((as_int(p1, "p1"), as_int(p2, "p2")))
    if (a, b) not in DOUBLE_ETA_MODULAR_PAIRS:
        raise FormkitError(
            f"the modular polynomial of w_{{{a},{b}}} is not computed here; the supported pairs are "
            f"{', '.join(f'({x}, {y})' for x, y in DOUBLE_ETA_MODULAR_PAIRS)}"
        )
    return a, b


@dataclass(frozen=True)
class DoubleEtaModularPolynomial(SentenceDisplay):
    """``Ψ(X, J) ∈ Z[X, J]`` with ``Ψ(w_{p₁,p₂}^s, j) = 0``, primitive, exact (module docstring).

    Attributes
    ----------
    p1, p2, exponent (``s``), pole_order (``e``; ``deg_J Ψ = 2e``)
    rows
        ``rows[k]`` lists the coefficients of ``J^k`` as a polynomial in ``X``, constant term
        first (so ``Ψ = Σ_k Σ_i rows[k][i]·X^i·J^k``).
    primes_used
        How many 62-bit primes the linear system was solved modulo.
    series_check_terms
        ``B``: the exact ``q``-expansion of ``Ψ(f, j)`` vanished up to ``q^B`` (a proof of
        ``Ψ(f, j) = 0``, module docstring).
    seconds
        Time the computation took (wall clock, this machine).
    """

    p1: int
    p2: int
    exponent: int
    pole_order: int
    rows: tuple[tuple[int, ...], ...]
    primes_used: int
    series_check_terms: int
    seconds: float

    @property
    def degree_j(self) -> int:
        """``deg_J Ψ = 2e``."""
        return len(self.rows) - 1

    @property
    def degree_x(self) -> int:
        """``deg_X Ψ = (p₁ + 1)(p₂ + 1)``."""
        return max(len(r) for r in self.rows) - 1

    @property
    def coefficient_bits(self) -> int:
        """The bit length of the largest coefficient."""
        return max(abs(c).bit_length() for r in self.rows for c in r)

    def specialise(self, x: object, p: object) -> list[int]:
        """The coefficients of ``Ψ(x, J) mod p`` as a polynomial in ``J``, leading first.

        Examples
        --------
        >>> Psi = double_eta_modular_polynomial(3, 13)
        >>> len(Psi.specialise(5, 101))   # degree 2 in J
        3
        """
        x, p = as_int(x, "x"), as_int(p, "p")
        if p < 2:
            raise FormkitError(f"p must be a prime, not {p}")
        out = []
        for row in reversed(self.rows):
            acc = 0
            for c in reversed(row):
                acc = (acc * x + c) % p
            out.append(acc)
        return out

    def _display_sentence(self) -> str:
        return (
            f"Ψ(X, J) for w_{{{self.p1},{self.p2}}}^{self.exponent}: degree {self.degree_x} in X, "
            f"{self.degree_j} in J, coefficients of up to {self.coefficient_bits} bits"
        )

    def _display_provenance(self) -> str:
        return (
            f"exact: linear algebra on q-expansions modulo {self.primes_used} primes, Chinese remainders; "
            f"Ψ(w^s, j) = 0 proved by its exact q-expansion vanishing to q^{self.series_check_terms}"
        )

    def __repr__(self) -> str:
        return f"DoubleEtaModularPolynomial({self._display_sentence()})"

    def to_dict(self) -> dict:
        return {
            "primes": [self.p1, self.p2],
            "power": self.exponent,
            "degree_x": self.degree_x,
            "degree_j": self.degree_j,
            "coefficient_bits": self.coefficient_bits,
            "method": self._display_provenance(),
        }


@cache
def _modular_polynomial(p1: int, p2: int) -> DoubleEtaModularPolynomial:
    from ..core.budget import check_cost

    s, e = _exponent(p1, p2), double_eta_pole_order(p1, p2)
    # measured 0.1 s (e = 1), 1.2 s (e = 2), at most 18 s (e = 5, (7, 11)); rounded up
    check_cost(
        f"the modular polynomial of w_{{{p1},{p2}}}",
        seconds=(0.0, 0.2, 3.0, 15.0, 15.0, 40.0)[e],
        memory=2**28,
    )
    start = time.perf_counter()
    cols = _unknowns(p1, p2)
    lo, _hi = _laurent_bounds(p1, p2, e)
    shift = max(lo)
    residues: list[int] = [0] * len(cols)
    modulus, ell, used, previous = 1, _PRIME_START, 0, None
    deficient = 0
    while True:
        ell = _next_prime_below(ell)
        sol = _solve_modulo(p1, p2, ell)
        if sol is None:  # pragma: no cover - a prime dividing a minor; never seen
            deficient += 1
            if deficient > 3:
                raise RuntimeError(f"Ψ for ({p1}, {p2}): the linear system is not of full rank")
            continue
        # Chinese remainders: x ≡ residues (mod modulus), x ≡ sol (mod ell)
        inverse = pow(modulus, -1, ell)
        residues = [r + modulus * ((v - r) * inverse % ell) for r, v in zip(residues, sol)]
        modulus *= ell
        used += 1
        found = [_rational_reconstruction(r, modulus) for r in residues]
        if any(f is None for f in found):
            continue
        if found != previous:
            previous = found
            continue
        den = math.lcm(*(f.denominator for f in found if f is not None))
        table: dict[tuple[int, int], int] = {(0, 0): den}
        for (k, i), f in zip(cols, found):
            assert f is not None
            table[(k, i)] = int(f * den)
        degree_j = 2 * e
        rows = [[0] * ((p1 + 1) * (p2 + 1) + 1) for _ in range(degree_j + 1)]
        for (k, i), c in table.items():
            rows[degree_j - k][i + shift] = c
        content = math.gcd(*(c for r in rows for c in r))
        frozen = tuple(tuple(c // content for c in r) for r in rows)
        try:
            B = _series_check(p1, p2, frozen)
        except RuntimeError:  # pragma: no cover - the reconstruction was premature
            previous = None
            continue
        return DoubleEtaModularPolynomial(
            p1, p2, s, e, frozen, used, B, round(time.perf_counter() - start, 3)
        )


def double_eta_modular_polynomial(p1: object, p2: object) -> DoubleEtaModularPolynomial:
    """The modular polynomial ``Ψ(X, J)`` of ``w_{p₁,p₂}^s``: ``Ψ(w^s, j) = 0`` (module docstring).

    Parameters
    ----------
    p1, p2 : int
        A pair of :data:`DOUBLE_ETA_MODULAR_PAIRS` (in either order).

    Returns
    -------
    DoubleEtaModularPolynomial
        Computed once per pair (cached).

    Raises
    ------
    FormkitError
        If the pair is not one of :data:`DOUBLE_ETA_MODULAR_PAIRS`.

    Examples
    --------
    >>> Psi = double_eta_modular_polynomial(3, 13)
    >>> Psi.degree_x, Psi.degree_j, Psi.rows[2][:3]    # leading coefficient X^16 in J
    (56, 2, (0, 0, 0))
    >>> Psi.rows[2].index(1)
    16

    References
    ----------
    Enge–Schertz, JTNB 16 (2004); Enge–Sutherland, ANTS-IX (2010).
    """
    a, b = _check_pair(p1, p2)
    return _modular_polynomial(a, b)
