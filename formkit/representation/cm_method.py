"""The CM step: roots of class polynomials modulo a prime, and the curves they give.

For a negative discriminant ``D < −4`` and a prime ``p`` with ``4p = t² − D·v²`` (so that
``p`` splits completely in the ring class field of the order of discriminant ``D``; Cox,
*Primes of the Form x² + ny²*, Theorems 9.4 and 14.16, numbers as recalled), ``H_D``
splits into ``h(D)`` distinct linear factors modulo ``p`` (for ``p ∤ disc H_D``), and each
root ``j`` is the j-invariant of an elliptic curve over ``F_p`` whose Frobenius is a
generator ``(±t ± v√D)/2`` of a prime above ``p`` — so the curve or its quadratic twist
has exactly ``p + 1 − t`` points.  This is the complex multiplication (CM) method of
Atkin and Morain [2].

* :func:`polynomial_roots_mod_prime` — the roots in ``F_p`` of an integer polynomial
  (FLINT's ``fmpz_mod_poly`` root finding: arithmetic of polynomials over ``F_p``);
* :func:`cm_prime` — a prime of a given size with ``4p = t² − D·v²``;
* :func:`cm_j_invariants` — the roots of ``H_D`` modulo ``p``, either directly, or from
  the roots of the Weber polynomial through ``j = (1 − 16u)³/u²``
  (:mod:`formkit.representation.class_invariants`), or from the roots ``x`` of a double
  η-quotient class polynomial through the roots of ``Ψ(x, J)``
  (:func:`double_eta_roots_to_j`, :mod:`formkit.representation.double_eta_modular`; the
  pairs of :func:`double_eta_cm_pair`, for which both roots are proved roots of ``H_D``);
* :func:`cm_curve` — a curve ``y² = x³ + a₄x + a₆`` over ``F_p`` with ``p + 1 − t``
  points, checked by ``[p + 1 − t]P = O`` for random points ``P`` (our own arithmetic in
  Jacobian coordinates).

*What is not.*  The double η-quotients whose modular polynomial has degree ``> 2`` in ``J``
(``(5, 13)``, ``(7, 13)``, …): the extra roots of ``Ψ(x, J)`` need not be CM values of
discriminant ``D`` and formkit does not choose among them, so these pairs are refused here.
The point checks of :func:`cm_curve` are random (``[p + 1 − t]P = O`` at ``tries`` points),
not a proof of the group order.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §14 (complex
       multiplication and elliptic curves over finite fields; as recalled).
.. [2] A. O. L. Atkin, F. Morain, "Elliptic curves and primality proving",
       Math. Comp. 61 (1993), 29–68 (the CM method, §3 and §5).
.. [3] L. C. Washington, *Elliptic Curves: Number Theory and Cryptography*, 2nd ed.,
       CRC 2008, §2.2 (the group law), §2.7 (the j-invariant of y² = x³ + ax + b).
.. [4] A. Enge, R. Schertz, "Constructing elliptic curves over finite fields using double
       eta-quotients", J. Théor. Nombres Bordeaux 16 (2004), 555–568.
"""

from __future__ import annotations

import math
import random
from collections.abc import Sequence
from dataclasses import dataclass

from ..core.arith import as_int, is_probable_prime
from ..core.displays import SentenceDisplay
from ..errors import DiscriminantError, FormkitError
from .class_polynomials import _check_negative

__all__ = [
    "CMCurve",
    "cm_curve",
    "cm_j_invariants",
    "cm_prime",
    "double_eta_cm_pair",
    "double_eta_roots_to_j",
    "polynomial_roots_mod_prime",
]


def _check_prime(p: object) -> int:
    p = as_int(p, "p")
    if p < 3 or not is_probable_prime(p):
        raise FormkitError(f"p must be an odd prime, not {p}")
    return p


def polynomial_roots_mod_prime(coefficients: Sequence[int], p: object) -> list[int]:
    """The distinct roots in ``[0, p)`` of an integer polynomial modulo a prime, sorted.

    Parameters
    ----------
    coefficients : sequence of int
        Leading coefficient first.
    p : int
        An odd prime (any size: FLINT's ``fmpz_mod_poly`` does the arithmetic).

    Returns
    -------
    list of int

    Raises
    ------
    FormkitError
        If ``p`` is not an odd prime, or the polynomial vanishes modulo ``p``.

    Examples
    --------
    >>> polynomial_roots_mod_prime([1, 0, -1, -1], 23)    # x³ − x − 1 has a double root mod 23
    [3, 10]
    >>> polynomial_roots_mod_prime([1, 0, 1], 7)
    []
    """
    from flint import fmpz_mod_ctx, fmpz_mod_poly_ctx

    p = _check_prime(p)
    ring = fmpz_mod_poly_ctx(fmpz_mod_ctx(p))
    f = ring([int(c) % p for c in reversed(list(coefficients))])
    if f.is_zero():
        raise FormkitError(f"the polynomial vanishes identically modulo {p}")
    if f.degree() == 0:
        return []
    return sorted(int(r) for r, _m in f.roots())


def cm_prime(D: object, bits: object, *, seed: int = 0) -> tuple[int, int, int]:
    """A prime ``p`` of ``bits`` bits with ``4p = t² − D·v²`` and ``v ∈ {1, 2}``.

    ``t`` runs over random integers (``random.Random(seed)``) of about ``bits/2 + 1`` bits;
    the first ``(t² − D·v²)/4`` that is an integer of the right size and a (probable)
    prime (Baillie–PSW) is returned.

    Returns
    -------
    (p, t, v)

    Raises
    ------
    DiscriminantError, FormkitError
        If ``D`` is not a negative discriminant below −4, or ``bits`` is not in ``[8, 4096]``.

    Examples
    --------
    >>> p, t, v = cm_prime(-23, 64)
    >>> 4 * p == t * t + 23 * v * v, p.bit_length()
    (True, 64)
    """
    D = _check_negative(D)
    if D >= -4:
        raise DiscriminantError(f"the CM method here needs D < −4 (j ≠ 0, 1728), not {D}")
    bits = as_int(bits, "bits")
    if not 8 <= bits <= 4096:
        raise FormkitError(f"bits must be an integer in [8, 4096], not {bits}")
    rng = random.Random(seed)
    for _ in range(200_000):
        v = rng.choice((1, 2))
        lo = math.isqrt(max(0, (1 << (bits + 1)) + D * v * v)) + 1  # 4p ≥ 2^(bits+1)
        hi = math.isqrt((1 << (bits + 2)) + D * v * v)  # 4p < 2^(bits+2)
        if hi <= lo:
            continue
        t = rng.randrange(lo, hi)
        n = t * t - D * v * v
        if n % 4 == 0 and (n // 4).bit_length() == bits and is_probable_prime(n // 4):
            return n // 4, t, v
    raise FormkitError(f"no prime 4p = t² − ({D})v² of {bits} bits found")  # pragma: no cover


def double_eta_cm_pair(D: object) -> tuple[int, int]:
    """The pair for the CM step with a double η-quotient: the first of ``double_eta_pair``'s list
    with ``deg_J Ψ = 2`` (``(3, 13)``, ``(5, 7)``, ``(3, 7)``, ``(3, 5)``) that suits ``D`` and
    gives a generator (a squarefree polynomial).

    Raises
    ------
    DiscriminantError
        If none of these four pairs suits ``D``.

    Examples
    --------
    >>> double_eta_cm_pair(-23), double_eta_cm_pair(-71)
    ((3, 13), (3, 5))
    """
    from .double_eta import _PAIRS, _double_eta_polynomial, _NotAGenerator, _pair_applies
    from .double_eta_modular import double_eta_pole_order

    D = _check_negative(D)
    pairs = [pair for pair in _PAIRS if double_eta_pole_order(*pair) == 1]
    for pair in pairs:
        if _pair_applies(D, *pair):
            try:
                _double_eta_polynomial(D, pair[0], pair[1], True)
            except _NotAGenerator:
                continue
            return pair
    raise DiscriminantError(
        f"no double eta-quotient with a modular polynomial of degree 2 in j ({pairs}) suits D = {D} "
        "(both primes split or ramified, not both ramified, prime to the conductor, values distinct); "
        "use --invariant weber or j"
    )


def double_eta_roots_to_j(x: object, p: object, primes: tuple[int, int]) -> list[int]:
    """The roots of ``Ψ(x, J)`` modulo ``p``: for a root ``x`` of the double η-quotient class
    polynomial of ``D``, roots of ``H_D`` modulo ``p`` (``deg_J Ψ = 2`` pairs only).

    *Why every root is a root of* ``H_D``.  Let ``x_Q = w^s(τ_Q)``, reduced to ``x̄_Q`` modulo
    a prime ``𝔓`` above ``p`` of the field generated by all the ``x_Q`` and ``j``-values, ``τ_Q = (−B + √D)/(2A)`` at a form
    ``[A, B, C]`` of the N-system (``gcd(A, N) = 1``, ``N | C``).  For ``deg_J Ψ = 2`` the
    fibre of ``f = g^s`` (:mod:`~formkit.representation.double_eta_modular`) over ``w^s(τ) =
    f(τ/N)`` is ``{τ/N, −1/τ}`` (``f`` has degree 2 and is invariant under ``z ↦ −1/(Nz)``),
    so ``Ψ(w^s(τ), J) = w^s(τ)^{p₁+p₂}·(J − j(τ))(J − j(τ/N))`` (the leading coefficient of
    ``Ψ`` in ``J`` is ``X^{p₁+p₂}``, tested).  Both are CM values of discriminant ``D``:
    ``τ/N`` is the root of ``[AN, B, C/N]``, of discriminant ``B² − 4AC = D`` and primitive
    (a prime ``r`` dividing ``AN``, ``B`` and ``C/N``: if ``r ∤ N`` it divides ``[A, B, C]``;
    an odd ``r | N`` would have ``r² | D`` though it is at most ramified and prime to the
    conductor; for ``r = 2 | N``, ``D/4 ≡ (B/2)² (mod 4)`` would be a square modulo 4, while
    ``D/4 ≡ 2, 3 (mod 4)`` when 2 ramifies and the conductor is odd).  All are algebraic
    integers (``W`` is monic); ``W ≡ ∏(X − x̄_Q)`` modulo ``𝔓``, so every root of ``W`` in
    ``F_p`` is some ``x̄_Q``, and for ``x ≢ 0`` the roots of ``Ψ(x, J) mod p`` are the
    reductions of ``j(τ)`` and ``j(τ/N)``, roots of ``H_D`` — for any odd ``p``, split or not;
    only *all* roots of ``H_D`` need ``p`` to split completely.  (Enge–Schertz [4] make the same
    observation, as recalled.)  Tests compare with formkit's ``H_D`` for many ``D``.

    Raises
    ------
    FormkitError
        If ``x ≡ 0 (mod p)`` (the leading coefficient vanishes: take another root), or the
        pair has ``deg_J Ψ ≠ 2``, or is not supported.

    Examples
    --------
    >>> from formkit.representation.double_eta import double_eta_polynomial
    >>> W = double_eta_polynomial(-23)          # x³ − x² + 1 for w_{3,13}; 4·59 = 12² + 23·2²
    >>> xs = polynomial_roots_mod_prime(W.coefficients, 59)
    >>> sorted({j for x in xs for j in double_eta_roots_to_j(x, 59, (3, 13))}) == cm_j_invariants(-23, 59, invariant="j")
    True
    """
    from .double_eta_modular import double_eta_modular_polynomial

    p = _check_prime(p)
    x = as_int(x, "x") % p
    Psi = double_eta_modular_polynomial(*primes)
    if Psi.degree_j != 2:
        raise FormkitError(
            f"the CM step with w_{{{Psi.p1},{Psi.p2}}} (degree {Psi.degree_j} in j) is not done here: "
            "only for the pairs (2, 3), (2, 5), (2, 7), (2, 13), (3, 5), (3, 7), (3, 13), (5, 7), whose modular "
            "polynomial has degree 2 in j"
        )
    if x == 0:
        raise FormkitError(f"x = 0 (mod {p}) annuls the leading coefficient X^{Psi.p1 + Psi.p2} of Ψ(X, J)")
    return polynomial_roots_mod_prime(Psi.specialise(x, p), p)


def cm_j_invariants(
    D: object, p: object, *, invariant: str = "weber", primes: tuple[int, int] | None = None
) -> list[int]:
    """The roots of ``H_D`` modulo ``p``, sorted.

    With ``invariant="weber"`` (``D ≡ 1 mod 8`` or ``D = −4m``, see
    :func:`~formkit.representation.class_invariants.weber_invariant_applies`) the Weber
    polynomial is computed, its roots modulo ``p`` are found and sent to roots of ``H_D``
    (``j = (1 − 16u)³/u²`` for odd ``D``, ``j = (F ∓ 16)³/F`` for ``D = −4m``;
    :func:`formkit.representation.class_invariants.weber_root_to_j`); with
    ``invariant="double-eta"`` the class polynomial of ``w_{p₁,p₂}^s`` (``primes``, default
    :func:`double_eta_cm_pair`), its roots ``x`` modulo ``p`` and the roots of ``Ψ(x, J)``
    (:func:`double_eta_roots_to_j`; roots ``x ≡ 0`` are skipped); with ``invariant="j"``
    the roots of ``H_D`` itself are found.

    Raises
    ------
    FormkitError
        If ``p`` is not an odd prime or ``invariant`` is not ``"weber"``, ``"double-eta"`` or
        ``"j"``, or ``primes`` is given for another invariant; DiscriminantError if the
        invariant does not apply to ``D``.

    Examples
    --------
    >>> cm_j_invariants(-23, 59) == cm_j_invariants(-23, 59, invariant="j")   # 4·59 = 12² + 23·2²
    True
    >>> cm_j_invariants(-71, 1367, invariant="double-eta") == cm_j_invariants(-71, 1367, invariant="j")  # 4·1367 = 72² + 71·2²
    True
    """
    from .class_invariants import weber_polynomial, weber_root_to_j
    from .class_polynomials import class_polynomial

    D = _check_negative(D)
    p = _check_prime(p)
    if primes is not None and invariant != "double-eta":
        raise FormkitError(f"primes are for invariant='double-eta', not {invariant!r}")
    if invariant == "weber":
        W = weber_polynomial(D)
        return sorted({weber_root_to_j(x, p, D) for x in polynomial_roots_mod_prime(W.coefficients, p) if x})
    if invariant == "double-eta":
        from .double_eta import double_eta_polynomial

        pair = double_eta_cm_pair(D) if primes is None else primes
        P = double_eta_polynomial(D, pair)
        pair = (P.p1, P.p2)
        xs = polynomial_roots_mod_prime(P.coefficients, p)
        return sorted({j for x in xs if x for j in double_eta_roots_to_j(x, p, pair)})
    if invariant == "j":
        return polynomial_roots_mod_prime(class_polynomial(D).coefficients, p)
    raise FormkitError(f"invariant must be 'weber', 'double-eta' or 'j', not {invariant!r}")


# ---------------------------------------------------------------------------
# elliptic curves y² = x³ + a4·x + a6 over F_p, Jacobian coordinates (X : Y : Z) ↦ (X/Z², Y/Z³)


def _double(P: tuple[int, int, int], a4: int, p: int) -> tuple[int, int, int]:
    X, Y, Z = P
    if Y == 0 or Z == 0:
        return (1, 1, 0)
    YY = Y * Y % p
    S = 4 * X * YY % p
    M = (3 * X * X + a4 * pow(Z, 4, p)) % p
    X3 = (M * M - 2 * S) % p
    return X3, (M * (S - X3) - 8 * YY * YY) % p, 2 * Y * Z % p


def _add(P: tuple[int, int, int], Q: tuple[int, int, int], a4: int, p: int) -> tuple[int, int, int]:
    if P[2] == 0:
        return Q
    if Q[2] == 0:
        return P
    X1, Y1, Z1 = P
    X2, Y2, Z2 = Q
    Z1Z1, Z2Z2 = Z1 * Z1 % p, Z2 * Z2 % p
    U1, U2 = X1 * Z2Z2 % p, X2 * Z1Z1 % p
    S1, S2 = Y1 * Z2 * Z2Z2 % p, Y2 * Z1 * Z1Z1 % p
    if U1 == U2:
        return _double(P, a4, p) if S1 == S2 else (1, 1, 0)
    H, R = (U2 - U1) % p, (S2 - S1) % p
    HH = H * H % p
    HHH = H * HH % p
    V = U1 * HH % p
    X3 = (R * R - HHH - 2 * V) % p
    return X3, (R * (V - X3) - S1 * HHH) % p, H * Z1 * Z2 % p


def _multiply(k: int, P: tuple[int, int, int], a4: int, p: int) -> tuple[int, int, int]:
    """``[k]P`` by double-and-add (Washington §2.2 formulas in Jacobian coordinates)."""
    R = (1, 1, 0)
    for bit in bin(k)[2:]:
        R = _double(R, a4, p)
        if bit == "1":
            R = _add(R, P, a4, p)
    return R


def _random_point(a4: int, a6: int, p: int, rng: random.Random) -> tuple[int, int, int]:
    from sympy.ntheory import sqrt_mod

    while True:
        x = rng.randrange(p)
        r = (x * x * x + a4 * x + a6) % p
        if r == 0:
            return (x, 0, 1)
        if pow(r, (p - 1) // 2, p) == 1:
            y = sqrt_mod(r, p)
            return (x, int(y), 1)


def _kills(N: int, a4: int, a6: int, p: int, rng: random.Random, tries: int) -> bool:
    return all(_multiply(N, _random_point(a4, a6, p, rng), a4, p)[2] == 0 for _ in range(tries))


@dataclass(frozen=True)
class CMCurve(SentenceDisplay):
    """An elliptic curve ``y² = x³ + a4·x + a6`` over ``F_p`` with ``order`` points, from a
    root ``j`` of ``H_D`` modulo ``p`` (``4p = t² − D·v²``); ``points_checked`` random
    points ``P`` had ``[order]P = O``."""

    discriminant: int
    p: int
    t: int
    j: int
    a4: int
    a6: int
    order: int
    points_checked: int

    def _display_sentence(self) -> str:
        return f"y² = x³ + {self.a4}x + {self.a6} over F_p, p = {self.p}: j = {self.j}, {self.order} = p + 1 − {self.t} points"

    def _display_provenance(self) -> str:
        return f"[order]P = O checked at {self.points_checked} random points"

    def to_dict(self) -> dict:
        return {
            "discriminant": self.discriminant,
            "p": self.p,
            "trace": self.t,
            "j": self.j,
            "a4": self.a4,
            "a6": self.a6,
            "order": self.order,
            "points_checked": self.points_checked,
        }


def cm_curve(D: object, p: object, t: object, j: object, *, tries: int = 8, seed: int = 0) -> CMCurve:
    """A curve over ``F_p`` with j-invariant ``j`` (a root of ``H_D`` mod ``p``) and
    ``p + 1 − t`` points: ``y² = x³ + 3kx + 2k`` with ``k = j/(1728 − j)`` (whose
    j-invariant is ``1728·4a₄³/(4a₄³ + 27a₆²) = j``; Washington §2.7) or its quadratic twist
    by a non-residue ``c`` (``a₄c², a₆c³``), whichever has ``[p + 1 − t]P = O`` for
    ``tries`` random points.

    Raises
    ------
    FormkitError
        If ``j ∈ {0, 1728}`` (mod p), or neither curve passes (``j`` is then not a root of
        ``H_D`` modulo ``p`` for this ``t``).

    Examples
    --------
    >>> from formkit.representation.class_polynomials import class_polynomial
    >>> j = polynomial_roots_mod_prime(class_polynomial(-23).coefficients, 59)[0]
    >>> E = cm_curve(-23, 59, 12, j)      # 4·59 = 12² + 23·2²
    >>> E.order
    48
    """
    D = _check_negative(D)
    p = _check_prime(p)
    t = as_int(t, "t")
    j = as_int(j, "j") % p
    if j in (0, 1728 % p):
        raise FormkitError(f"j = {j} (0 or 1728 mod {p}) has extra automorphisms; not handled here")
    if (t * t - 4 * p) % D != 0 or (t * t - 4 * p) // D < 0:
        raise FormkitError(f"t = {t} does not satisfy 4p = t² − D·v² for p = {p}, D = {D}")
    rng = random.Random(seed)
    k = j * pow(1728 - j, -1, p) % p
    a4, a6 = 3 * k % p, 2 * k % p
    N = p + 1 - t
    if not _kills(N, a4, a6, p, rng, tries):
        c = 2
        while pow(c, (p - 1) // 2, p) == 1:
            c += 1
        a4, a6 = a4 * c * c % p, a6 * c * c * c % p
        if not _kills(N, a4, a6, p, rng, tries):
            raise FormkitError(f"no twist of the curve with j = {j} has p + 1 − t = {N} points")
    return CMCurve(D, p, t, j, a4, a6, N, tries)
