"""Discriminants of binary quadratic forms and of quadratic orders.

A discriminant is a non-square integer ``D ≡ 0, 1 (mod 4)``; it is the discriminant
``b² − 4ac`` of the form ``(a, b, c)`` and of the quadratic order ``Z[(D + √D)/2]``.
This module validates discriminants, splits ``D = f²·d_K`` into the fundamental
discriminant and the conductor, evaluates the Kronecker character ``χ_D``, counts the
units ``w(D)`` of imaginary orders, computes the fundamental unit
``ε = (t + u√D)/2`` of a real order, its norm and the regulator ``log ε``, and the
unit index ``[O_K* : O*]`` of an order in the maximal order.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, Sections 5.1–5.2 (discriminants, conductor), Section 5.7
       (fundamental units and regulators), Algorithm 5.7.2.
.. [2] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §7.
.. [3] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, Ch. 6.
"""

from __future__ import annotations

import time
from collections.abc import Callable
from dataclasses import dataclass
from functools import lru_cache

from ..errors import BudgetError, DiscriminantError, FormkitError
from . import budget as _budget
from .arith import as_int, is_square, isqrt, kronecker
from .factorisation import prime_factorisation

__all__ = [
    "validate_discriminant",
    "squarefree_decomposition",
    "is_discriminant",
    "is_fundamental_discriminant",
    "fundamental_discriminant",
    "conductor",
    "discriminant_parts",
    "kronecker_character",
    "unit_count",
    "QuadraticUnit",
    "fundamental_unit",
    "regulator",
    "unit_index",
]


def validate_discriminant(D: object, name: str = "discriminant") -> int:
    """Return ``D`` as an ``int`` if it is a discriminant, else raise.

    A discriminant here is an integer ``≡ 0, 1 (mod 4)`` that is not a perfect square
    (so 0, 1, 4, 9, ... are refused: their forms factor over Q).

    Raises
    ------
    NotAnIntegerError
        If ``D`` is not an integer.
    DiscriminantError
        If ``D ≡ 2, 3 (mod 4)`` or ``D`` is a perfect square.

    Examples
    --------
    >>> validate_discriminant(-23)
    -23
    >>> validate_discriminant(-22)
    Traceback (most recent call last):
    ...
    formkit.errors.DiscriminantError: discriminant must be ≡ 0 or 1 (mod 4), not -22 (≡ 2); the field Q(√-22) has discriminant -88 (write Q(sqrt(-22)) or -88)
    >>> validate_discriminant(16)
    Traceback (most recent call last):
    ...
    formkit.errors.DiscriminantError: discriminant must not be 0 or a perfect square: 16 = 4² is a perfect square: forms of square discriminant factor over Q and there is no quadratic field
    """
    D = as_int(D, name)
    if D % 4 not in (0, 1):
        raise DiscriminantError(
            f"{name} must be ≡ 0 or 1 (mod 4), not {D} (≡ {D % 4}); {_nearest_meaning(D)}"
        )
    if is_square(D):
        raise DiscriminantError(f"{name} must not be 0 or a perfect square: {_nearest_meaning(D)}")
    return D


def squarefree_decomposition(n: object) -> tuple[int, int]:
    """``(r, m)`` with ``n = r²·m``, ``r > 0`` and ``m`` square-free (sign kept in ``m``).

    Factorisation through :func:`formkit.core.factorisation.prime_factorisation`.

    Examples
    --------
    >>> squarefree_decomposition(-12), squarefree_decomposition(94), squarefree_decomposition(-1)
    ((2, -3), (1, 94), (1, -1))
    """
    n = as_int(n, "n")
    if n == 0:
        raise FormkitError("0 has no square-free part")
    r, m = 1, (-1 if n < 0 else 1)
    for p, e in prime_factorisation(abs(n)).items():
        r *= p ** (e // 2)
        if e % 2:
            m *= p
    return r, m


def _nearest_meaning(D: int) -> str:
    """What a user who typed the non-discriminant ``D`` probably meant (one clause)."""
    if D == 0:
        return "0 is the discriminant of degenerate forms only, and of no quadratic field"
    if D > 0 and is_square(D):
        return (
            f"{D} = {int(isqrt(D))}² is a perfect square: forms of square discriminant factor over Q "
            "and there is no quadratic field"
        )
    if abs(D) > 10**24:  # factoring could take long: say what holds if D is square-free
        return (
            f"if {D} is square-free, the field Q(√{D}) has discriminant {4 * D} and Z[√{D}] is its "
            "ring of integers"
        )
    r, m = squarefree_decomposition(D)
    d_K = m if m % 4 == 1 else 4 * m
    if r == 1:
        return f"the field Q(√{D}) has discriminant {d_K} (write Q(sqrt({D})) or {d_K})"
    return (
        f"Q(√{D}) is the field Q(√{m}), of discriminant {d_K}, and the order Z[√{D}] has discriminant "
        f"{4 * D} (write Q(sqrt({m})) or {4 * D})"
    )


def is_discriminant(D: object) -> bool:
    """True if ``D`` is a non-square integer ≡ 0, 1 (mod 4).

    Examples
    --------
    >>> [d for d in range(-12, 13) if is_discriminant(d)]
    [-12, -11, -8, -7, -4, -3, 5, 8, 12]
    """
    try:
        validate_discriminant(D)
    except (DiscriminantError, TypeError):
        return False
    return True


@lru_cache(maxsize=4096)
def _parts(D: int) -> tuple[int, int]:
    # D = f^2 d_K with d_K fundamental
    fac = prime_factorisation(D)
    sign = -1 if D < 0 else 1
    core = sign  # squarefree kernel with sign
    f = 1
    for p, e in fac.items():
        f *= p ** (e // 2)
        if e % 2:
            core *= p
    if core % 4 == 1:
        return core, f
    # core ≡ 2, 3 mod 4: d_K = 4·core and f must lose a factor 2
    return 4 * core, f // 2


def discriminant_parts(D: object) -> tuple[int, int]:
    """Return ``(d_K, f)`` with ``D = f²·d_K`` and ``d_K`` fundamental.

    Examples
    --------
    >>> discriminant_parts(-108)
    (-3, 6)
    >>> discriminant_parts(-56)
    (-56, 1)
    >>> discriminant_parts(8 * 25)
    (8, 5)
    """
    D = validate_discriminant(D)
    return _parts(D)


def fundamental_discriminant(D: object) -> int:
    """The fundamental discriminant ``d_K`` of the field containing the order of ``D``.

    Examples
    --------
    >>> fundamental_discriminant(-12), fundamental_discriminant(-16), fundamental_discriminant(45)
    (-3, -4, 5)
    """
    return discriminant_parts(D)[0]


def conductor(D: object) -> int:
    """The conductor ``f`` of the order of discriminant ``D``, ``D = f²·d_K``.

    Examples
    --------
    >>> conductor(-12), conductor(-63), conductor(-23)
    (2, 3, 1)
    """
    return discriminant_parts(D)[1]


def is_fundamental_discriminant(D: object) -> bool:
    """True if ``D`` is a fundamental discriminant (conductor 1).

    Examples
    --------
    >>> [d for d in range(-30, 0) if is_fundamental_discriminant(d)]
    [-24, -23, -20, -19, -15, -11, -8, -7, -4, -3]
    """
    if not is_discriminant(D):
        return False
    return conductor(D) == 1


def kronecker_character(D: object) -> Callable[[int], int]:
    """The Kronecker character ``χ_D(n) = (D/n)`` as a function of ``n``.

    Examples
    --------
    >>> chi = kronecker_character(-4)
    >>> [chi(n) for n in range(1, 9)]
    [1, 0, -1, 0, 1, 0, -1, 0]
    """
    D = validate_discriminant(D)

    def chi(n: int) -> int:
        return kronecker(D, as_int(n, "n"))

    chi.__doc__ = f"Kronecker character of discriminant {D}: n ↦ ({D}/n)."
    return chi


def unit_count(D: object) -> int:
    """Number ``w(D)`` of units of the imaginary quadratic order of discriminant ``D < 0``.

    ``w = 6`` for ``D = -3``, ``4`` for ``D = -4`` and ``2`` otherwise.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a negative discriminant.

    Examples
    --------
    >>> unit_count(-3), unit_count(-4), unit_count(-12), unit_count(-23)
    (6, 4, 2, 2)
    """
    D = validate_discriminant(D)
    if D > 0:
        raise DiscriminantError(
            f"unit_count needs a negative discriminant, not {D} "
            "(a real order has infinitely many units; see fundamental_unit)"
        )
    return {-3: 6, -4: 4}.get(D, 2)


@dataclass(frozen=True)
class QuadraticUnit:
    """The unit ``ε = (t + u√D)/2`` of the order of discriminant ``D > 0``.

    ``t, u > 0`` are exact integers with ``t² − D·u² = 4·norm``.
    """

    discriminant: int
    t: int
    u: int

    def __post_init__(self) -> None:
        D = validate_discriminant(self.discriminant)
        t, u = as_int(self.t, "t"), as_int(self.u, "u")
        if D < 0:
            raise DiscriminantError(f"QuadraticUnit needs a positive discriminant, not {D}")
        if t * t - D * u * u not in (4, -4):
            raise FormkitError(f"(t + u√D)/2 with t = {t}, u = {u}, D = {D} is not a unit: t² − D·u² ≠ ±4")
        object.__setattr__(self, "discriminant", D)
        object.__setattr__(self, "t", t)
        object.__setattr__(self, "u", u)

    @property
    def norm(self) -> int:
        """The norm ``(t² − D u²)/4``, which is ``+1`` or ``−1``."""
        return (self.t * self.t - self.discriminant * self.u * self.u) // 4

    def regulator(self, digits: int = 30):
        """``log ε`` as an mpmath number with ``digits`` significant decimal digits.

        The value is computed twice, at ``digits`` and ``digits + 20``, and the two
        are checked to agree (a verification of the floating-point step).
        """
        return _log_unit(self.discriminant, self.t, self.u, digits)

    def __repr__(self) -> str:
        return f"QuadraticUnit(D={self.discriminant}, t={self.t}, u={self.u}, norm={self.norm:+d})"

    def _repr_latex_(self) -> str:
        return rf"$\varepsilon = \frac{{{self.t} + {self.u}\sqrt{{{self.discriminant}}}}}{{2}}$"

    def _repr_html_(self) -> str:
        return (
            f"<p>ε = ({self.t} + {self.u}√{self.discriminant})/2, norm {self.norm:+d}<br>"
            "<small>the fundamental unit: first solution of the Pell equation t² − Du² = ±4, exact</small></p>"
        )


def _log_unit(D: int, t: int, u: int, digits: int):
    import mpmath

    digits = as_int(digits, "digits")
    if digits < 1:
        raise FormkitError(f"digits must be >= 1, not {digits}")
    values = []
    for extra in (0, 20):
        with mpmath.workdps(digits + 10 + extra):
            values.append(mpmath.log((t + u * mpmath.sqrt(D)) / 2))
    with mpmath.workdps(digits + 10):
        if abs(values[0] - values[1]) > mpmath.mpf(10) ** (-digits) * abs(values[1]):
            raise ArithmeticError("regulator did not stabilise under higher precision")
    with mpmath.workdps(digits):
        return +values[1]


def fundamental_unit(D: object) -> QuadraticUnit:
    """The fundamental unit ``ε = (t + u√D)/2 > 1`` of the real order of discriminant ``D``.

    Found by walking the cycle of reduced forms that contains the principal form,
    multiplying the matrices of the reduction operator, until the principal form
    (norm +1) or its negative-norm partner ``(−1, b, −c)`` (norm −1) returns; the
    product matrix is the automorph ``[[(t − bu)/2, −cu], [au, (t + bu)/2]]``.  All
    arithmetic is exact, so ``t`` may have thousands of digits.  This is the
    continued-fraction method (Cohen GTM 138, Algorithm 5.7.2; Buchmann–Vollmer,
    Binary Quadratic Forms, §6.4) phrased in terms of forms.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a positive discriminant.

    Examples
    --------
    >>> fundamental_unit(5)
    QuadraticUnit(D=5, t=1, u=1, norm=-1)
    >>> fundamental_unit(12)
    QuadraticUnit(D=12, t=4, u=1, norm=+1)
    >>> e = fundamental_unit(4 * 61)   # x² − 61y² = −1 has x = 29718, y = 3805
    >>> (e.t // 2, e.u, e.norm)
    (29718, 3805, -1)
    """
    D = validate_discriminant(D)
    if D < 0:
        raise DiscriminantError(f"fundamental_unit needs a positive discriminant, not {D} (use unit_count)")
    t, u = _fundamental_unit(D)
    return QuadraticUnit(D, t, u)


@lru_cache(maxsize=256)
def _fundamental_unit(D: int) -> tuple[int, int]:
    from .raw_reduction import _principal_reduced_indefinite, _rho_indefinite_raw, _to_work

    a0, b0, c0 = _principal_reduced_indefinite(D)
    # the forms stay small (|a|, |c| < √D): plain ints unless D itself is large
    a0, b0, c0, D, sq = _to_work(a0, b0, c0, D, isqrt(D))
    a, b, c = a0, b0, c0
    # accumulated matrix P (det 1): form0 · P = current form
    p, q, r, s = 1, 0, 0, 1
    # the walk has R/1.19 steps for the regulator R, unknown in advance: stopped when it
    # outruns the time budget (callers that can price it first do so)
    limit = _budget.current_budget().seconds
    t0 = time.monotonic()
    steps = 0
    while True:
        steps += 1
        if steps & 0xFFF == 0 and time.monotonic() - t0 > limit:
            raise BudgetError(
                f"the fundamental unit of D = {_budget.describe_integer(int(D))}: the cycle of the principal form "
                f"has more than {steps} reduced forms, and walking it has taken "
                f"longer than the budget of {_budget.format_seconds(limit)}; the unit's coefficients have about "
                "R/log 10 digits; raise --budget, or use a smaller discriminant"
            )
        a, b, c, tt = _rho_indefinite_raw(a, b, c, D, sq)
        # step matrix [[0, -1], [1, tt]]
        p, q, r, s = q, -p + tt * q, s, -r + tt * s
        if (a, b, c) == (a0, b0, c0):
            M = (p, q, r, s)
            break
        if (a, b, c) == (-a0, b0, -c0):
            # form0 · P = -(form0 · diag(1, -1))  =>  M = P · diag(1, -1)
            M = (p, -q, r, -s)
            break
    mp, _mq, mr, ms = M
    t = abs(mp + ms)
    # M[1][0] = a0 * u with a0 = 1
    u = abs(mr // a0)
    return int(t), int(u)


def regulator(D: object, digits: int = 30):
    """The regulator ``R = log ε`` of the real order of discriminant ``D``.

    Returned as an mpmath number with ``digits`` significant digits; computed from the
    exact fundamental unit and verified at higher precision (the value is computed at
    ``digits + 10`` and ``digits + 30`` working digits and the two must agree to
    ``digits`` digits, else ``ArithmeticError``).  ``print`` shows an mpmath number
    at mpmath's global precision; use ``mpmath.nstr(R, digits)`` to see all digits.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a positive discriminant.
    FormkitError
        If ``digits < 1``.

    Examples
    --------
    >>> print(regulator(5, digits=15))
    0.481211825059603
    >>> import mpmath
    >>> mpmath.nstr(regulator(5, digits=40), 40)
    '0.4812118250596034474977589134243684231352'
    """
    return fundamental_unit(D).regulator(digits)


def unit_index(D: object) -> int:
    """The index ``[O_K* : O*]`` of the unit group of the order of discriminant ``D``.

    Examples
    --------
    >>> unit_index(-12), unit_index(-16), unit_index(-20), unit_index(5 * 4)
    (3, 2, 1, 3)
    """
    D = validate_discriminant(D)
    d_K, f = discriminant_parts(D)
    if D < 0:
        return unit_count(d_K) // unit_count(D)
    if f == 1:
        return 1
    eK = fundamental_unit(d_K)
    # ε_K = x + y·ω with ω = (d_K + √d_K)/2 (ω² = d_K·ω − n, n = (d_K² − d_K)/4), and
    # O = Z + f·O_K = Z + fZ·ω: ε_K^k ∈ O iff f divides the ω-coordinate of ε_K^k.  So the
    # index is the order of ε_K in (O_K/f)^*/(Z/f)^*, a group of order
    # N = f·∏_{p|f}(1 − χ(p)/p) (Cox, Primes of the Form x² + ny², Lemma 7.27 — number from
    # memory), found from N by removing prime factors while the power stays in O; the
    # powers are taken modulo f (square and multiply), never written out.
    n = (d_K * d_K - d_K) // 4

    def mul(P: tuple[int, int], Q: tuple[int, int]) -> tuple[int, int]:
        (x1, y1), (x2, y2) = P, Q
        yy = y1 * y2
        return (x1 * x2 - yy * n) % f, (x1 * y2 + x2 * y1 + yy * d_K) % f

    def power_in_order(k: int) -> bool:
        result, base = (1 % f, 0), ((eK.t - eK.u * d_K) // 2 % f, eK.u % f)
        while k:
            if k & 1:
                result = mul(result, base)
            base = mul(base, base)
            k >>= 1
        return result[1] == 0

    N = 1
    primes_of_N: set[int] = set()
    for p, e in prime_factorisation(f).items():
        N *= p ** (e - 1) * (p - kronecker(d_K, p))
        if e > 1:
            primes_of_N.add(p)
        primes_of_N.update(prime_factorisation(p - kronecker(d_K, p)))
    if not power_in_order(N):  # pragma: no cover - Lagrange's theorem in (O_K/f)^*/(Z/f)^*
        raise ArithmeticError(f"ε_K^{N} is not in the order of discriminant {D}")
    k = N
    for q in sorted(primes_of_N):
        while k % q == 0 and power_in_order(k // q):
            k //= q
    return k
