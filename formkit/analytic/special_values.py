"""Exact values of ζ(s) and L(s, χ_D) at s = 0, −1, −2, …: Bernoulli and generalised Bernoulli numbers.

``L(1 − k, χ) = −B_{k,χ}/k`` with the generalised Bernoulli number
``B_{k,χ} = F^(k−1)·Σ_{a=1}^{F} χ(a)·B_k(a/F)`` for any period ``F`` of ``χ``, and
``ζ(1 − k) = −B_k/k`` (``B_1 = +1/2`` there, so ``ζ(0) = −1/2``) (Washington,
*Introduction to Cyclotomic Fields*, §4.1, Theorem 4.2; from memory).  For
``D = f²·d_K`` the primitive character's value is multiplied by the Euler factors
``∏_{p | f}(1 − χ_{d_K}(p)·p^(k−1))``.  Exact rational arithmetic throughout; these are
the values :func:`formkit.analytic.l_series.l_series` returns at non-positive integers.

References
----------
.. [1] L. C. Washington, *Introduction to Cyclotomic Fields*, 2nd ed., GTM 83, §4.1.
.. [2] H. Cohen, *Number Theory, Volume II*, GTM 240, §9.4 and §10.3 (from memory).
.. [3] R. P. Brent, D. Harvey, "Fast computation of Bernoulli, tangent and secant
       numbers", in *Computational and Analytical Mathematics*, Springer 2013, 127–142
       (the tangent-number algorithm; from memory).
"""

from __future__ import annotations

import math
from fractions import Fraction
from functools import lru_cache

from ..core.arith import kronecker
from ..core.discriminants import discriminant_parts, validate_discriminant
from ..core.factorisation import prime_factorisation
from ..errors import FormkitError

__all__ = [
    "bernoulli_number",
    "generalised_bernoulli",
    "generalised_bernoulli_cost",
    "l_series_at_nonpositive_integer",
]


# ---------------------------------------------------------------------------------------


def _tangent_numbers(n: int) -> list[int]:
    """The tangent numbers ``T_1, …, T_n`` (``tan x = Σ T_k x^(2k−1)/(2k−1)!``: 1, 2, 16, 272, …).

    Brent and Harvey's in-place algorithm [3] (Algorithm TangentNumbers): ``O(n²)``
    additions and multiplications of integers by small integers, no division.
    """
    from ..core.progress import progress_bar

    T = [0] * (n + 1)
    if n >= 1:
        T[1] = 1
    for k in range(2, n + 1):
        T[k] = (k - 1) * T[k - 1]
    with progress_bar(total=n * (n - 1) // 2, desc=f"tangent numbers T_1..T_{n}", unit="step") as bar:
        for k in range(2, n + 1):
            for j in range(k, n + 1):
                T[j] = (j - k) * T[j - 1] + (j - k + 2) * T[j]
            bar.update(n - k + 1)
    return T


@lru_cache(maxsize=8)
def _bernoulli_list(n: int) -> tuple[Fraction, ...]:
    """``B_0, …, B_n`` (``B_1 = −1/2``): ``B_{2k} = (−1)^(k−1)·2k·T_k/(4^k(4^k − 1))`` from the
    tangent numbers (Brent–Harvey [3], §2), ``B_j = 0`` for odd ``j ≥ 3``."""
    T = _tangent_numbers(n // 2)
    B = [Fraction(0)] * (n + 1)
    B[0] = Fraction(1)
    if n >= 1:
        B[1] = Fraction(-1, 2)
    for k in range(1, n // 2 + 1):
        four = 4**k
        B[2 * k] = Fraction((-1) ** (k - 1) * 2 * k * T[k], four * (four - 1))
    return tuple(B)


def bernoulli_number(k: object) -> Fraction:
    """The Bernoulli number ``B_k`` (with ``B_1 = −1/2``), exactly.

    Examples
    --------
    >>> [str(bernoulli_number(k)) for k in (0, 1, 2, 4, 12)]
    ['1', '-1/2', '1/6', '-1/30', '-691/2730']
    """
    from ..core.arith import as_int

    k = as_int(k, "k")
    if k < 0 or k > 5000:
        raise FormkitError(f"Bernoulli numbers are computed for 0 ≤ k ≤ 5000, not {k}")
    return _bernoulli_list(k)[k]


def generalised_bernoulli_cost(D: int, k: int) -> tuple[float, float]:
    """``(seconds, bytes)`` estimated for :func:`generalised_bernoulli` ``(D, k)``.

    With ``F = |D|``: ``1.5·10⁻⁶·F`` s for the character values, ``F·(k+1)·(2·10⁻⁷ +
    5·10⁻¹¹·k·log₂F)`` s for the power sums ``Σ χ(a)·a^m`` (integers of ``k·log₂F``
    bits), ``1.2·10⁻¹⁰·k³`` s for ``B_0 … B_k`` from the tangent numbers (unless cached), and
    the ``k+1`` power sums and Bernoulli numbers in memory.  Measured on the development
    machine at (F, k) = (10⁵, 1), (10⁵, 10), (10⁴, 100), (10³, 1000): within a factor 2
    (checked by ``tests/analytic/test_analytic_cost.py``).

    Examples
    --------
    >>> generalised_bernoulli_cost(-23, 11)[0] < 1
    True
    >>> generalised_bernoulli_cost(-10**12 - 3, 11)[0] > 86400
    True
    """
    F = abs(int(D))
    k = int(k)
    log_f = max(1.0, F.bit_length())
    seconds = 1.5e-6 * F + F * (k + 1) * (2e-7 + 5e-11 * k * log_f) + 1.2e-10 * k**3
    memory = 2 * (k + 1) * (k * log_f / 8 + 64) + 10**6
    return seconds, memory


def _check_bernoulli_cost(D: int, k: int) -> None:
    from ..core.budget import check_cost, describe_integer

    seconds, memory = generalised_bernoulli_cost(D, k)
    check_cost(
        (
            f"the exact value from B_{{{k},χ}} for D = {describe_integer(D)} (a sum over the |D| "
            f"residues with powers up to {k})"
            if abs(D) > 1
            else f"the exact value from the Bernoulli number B_{k}"
        ),
        seconds=seconds,
        memory=memory,
        further="the cost grows like |D|·k; a numerical value at a nearby non-integer s is cheaper",
    )


def generalised_bernoulli(D: object, k: object) -> Fraction:
    """The generalised Bernoulli number ``B_{k, χ_D}``, from the definition over a period.

    ``B_{k,χ} = F^(k−1)·Σ_{a=1}^{F} χ(a)·B_k(a/F)`` with ``F = |D|`` (a period of
    ``χ_D``) and the Bernoulli polynomial ``B_k(x) = Σ_j C(k, j)·B_j·x^(k−j)``; it costs
    ``O(|D|·k)`` integer operations.

    Raises
    ------
    FormkitError
        If ``k < 1``.
    BudgetError
        If the estimate (:func:`generalised_bernoulli_cost`) is over the budget.

    Examples
    --------
    >>> generalised_bernoulli(-4, 1), generalised_bernoulli(-23, 1)   # −2h/w
    (Fraction(-1, 2), Fraction(-3, 1))
    """
    from ..core.arith import as_int

    D = validate_discriminant(D)
    k = as_int(k, "k")
    F = abs(D)
    if k < 1:
        raise FormkitError(f"generalised_bernoulli needs k ≥ 1, not k = {k} (D = {D})")
    _check_bernoulli_cost(D, k)
    B = _bernoulli_list(k)
    power_sums = [0] * (k + 1)  # Σ χ(a)·a^m
    for a in range(1, F + 1):
        c = kronecker(D, a)
        if c:
            p = c
            for m in range(k + 1):
                power_sums[m] += p
                p *= a
    total = Fraction(0)
    for j in range(k + 1):
        total += math.comb(k, j) * B[j] * Fraction(F) ** (j - 1) * power_sums[k - j]
    return total


def l_series_at_nonpositive_integer(D: object, n: object) -> Fraction:
    """``L(−n, χ_D)`` for ``n ≥ 0``, exactly: ``−B_{n+1,χ}/(n+1)`` with Euler factors.

    The generalised Bernoulli number of the primitive character ``χ_{d_K}`` is used and
    ``∏_{p | f}(1 − χ_{d_K}(p)·p^n)`` multiplied in (``D = f²·d_K``).

    Raises
    ------
    FormkitError
        If ``n < 0``.
    BudgetError
        If the work is over the budget (:func:`generalised_bernoulli_cost`).

    Examples
    --------
    >>> l_series_at_nonpositive_integer(-23, 0)     # 2h/w = 3
    Fraction(3, 1)
    >>> l_series_at_nonpositive_integer(5, 1)       # ζ_K(−1) = ζ(−1)·L(−1, χ_5) = 1/30
    Fraction(-2, 5)
    >>> l_series_at_nonpositive_integer(-4, 2)      # Euler number E_2/2 = −1/2
    Fraction(-1, 2)
    """
    from ..core.arith import as_int

    D = validate_discriminant(D)
    n = as_int(n, "n")
    if n < 0:
        raise FormkitError(f"n must be ≥ 0 for L(−n, χ_D), not {n}")
    d_K, f = discriminant_parts(D)
    value = -generalised_bernoulli(d_K, n + 1) / (n + 1)
    for p in prime_factorisation(f) if f > 1 else ():
        value *= 1 - kronecker(d_K, p) * Fraction(p) ** n
    return value


def _zeta_nonpositive(n: int) -> Fraction:
    if n == 0:
        return Fraction(-1, 2)
    _check_bernoulli_cost(1, n + 1)
    return -_bernoulli_list(n + 1)[n + 1] / (n + 1)
