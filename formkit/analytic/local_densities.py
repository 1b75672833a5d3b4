"""Local densities of binary forms and Siegel's formula for the genus average, for every D < 0.

For a positive definite primitive form ``Q`` of discriminant ``D`` and a prime ``p`` the
*local density* is

    α_p(n) = lim_{k→∞} p^(−k)·#{(x, y) mod p^k : Q(x, y) ≡ n (mod p^k)}

(Siegel's normalisation for two variables and one represented number).  It depends only
on ``Q`` over ``Z_p``, hence only on the genus of ``Q``.  Siegel's theorem for binary
forms (Siegel 1935, with ``ε = 1/2`` for two variables representing numbers, the Euler
product taken in the order of the primes) gives the weighted average over the genus
``G`` of ``Q``:

    r_G(n) = ½·(2π/√|D|)·∏_p α_p(n),

and for ``p ∤ 2nD`` one has ``α_p(n) = 1 − χ_D(p)/p``.  The tail of the product is
``1/L(1, χ_D)`` up to the factors at ``p | 2n``, and Dirichlet's class number formula
``L(1, χ_D) = 2π·h(D)/(w(D)·√|D|)`` (valid for orders with the Kronecker character
``χ_D``) turns the formula into a finite one, for fundamental and non-fundamental ``D``
alike:

    r_G(n) = (w/(2h))·∏_{p | 2nD} α_p(n)/(1 − χ_D(p)/p).

The local factors at the primes dividing the conductor are just the ``α_p`` there.  The
densities are computed exactly:

* ``p ∤ D`` (``p = 2`` included when ``D`` is odd): every primitive solution mod ``p``
  lifts (the gradient of ``Q`` is a unit there; Hensel), and the imprimitive ones are
  ``p·(solution for n/p²)``, so ``α_p(n) = Σ_{j: p^(2j) | n} β_p(n/p^(2j))`` with
  ``β_p(m) = #{primitive (x, y) mod p : Q ≡ m}/p``; for odd ``p`` that count is
  ``p − χ_D(p)`` (``p ∤ m``) or ``(p − 1)(1 + χ_D(p))`` (``p | m``) (counting points on
  a conic over ``F_p``; from memory, checked against brute force in the tests);
* ``p | D``: ``Q ≅ uX² + vY²`` over ``Z_p`` with ``u = a`` (or ``c``) a unit and
  ``v = −D/(4u)`` (complete the square; ``b`` is even when ``p = 2 | D``).  For odd ``p ∤ n``,
  ``α_p(n) = 1 + (nu/p)`` (Hensel in ``X``); otherwise the solutions are counted modulo
  ``p^k`` by a convolution of the square counts of ``uX²`` and ``vY²`` (numpy), with
  ``k = v_p(n) + v_p(D) + 1`` (``+ 3`` for ``p = 2``), where the count has become stable
  (Hensel's lemma with the valuation of the gradient; the tests compare two
  consecutive ``k`` as a check).

References
----------
.. [1] C. L. Siegel, "Über die analytische Theorie der quadratischen Formen", Ann. of
       Math. 36 (1935), 527–606 (the main theorem; ε = 1/2 for m = n + 1).
.. [2] J. W. S. Cassels, *Rational Quadratic Forms*, Academic Press 1978, Ch. 8–9
       (p-adic forms, genera; from memory).
.. [3] D. Zagier, *Zetafunktionen und quadratische Körper*, Springer 1981, §8 and §12.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

from ..core.arith import kronecker
from ..core.factorisation import prime_factorisation
from ..core.forms import Form, FormLike, as_form
from ..errors import FormError, FormkitError

__all__ = ["MAX_DENSITY_MODULUS", "local_density", "siegel_genus_average"]

#: The largest ``p^k`` up to which solutions are counted for a density at ``p | D``.
MAX_DENSITY_MODULUS = 4 * 10**7


def _valuation(n: int, p: int) -> int:
    v = 0
    while n % p == 0:
        n //= p
        v += 1
    return v


def _check(form: FormLike) -> Form:
    Q = as_form(form)
    if not (Q.is_positive_definite and Q.is_primitive):
        raise FormError(
            f"local densities are computed here for primitive positive definite forms; {Q!r} is not one"
        )
    return Q


@lru_cache(maxsize=64)
def _square_counts(u: int, pk: int):
    """``S[t] = #{X mod p^k : uX² ≡ t}`` as a numpy int64 array."""
    import numpy as np

    x = np.arange(pk, dtype=np.int64)
    return np.bincount((u % pk) * (x * x % pk) % pk, minlength=pk).astype(np.int64)


def _count_diagonal(u: int, v: int, n: int, pk: int) -> int:
    """``#{(X, Y) mod p^k : uX² + vY² ≡ n}`` by the convolution of the square counts."""
    import numpy as np

    su = _square_counts(u % pk, pk)
    sv = _square_counts(v % pk, pk)
    t = np.arange(pk, dtype=np.int64)
    return int(np.dot(su, sv[(n - t) % pk]))


def _diagonal(Q: Form, p: int) -> tuple[int, int]:
    """``(u, v)`` with ``Q ≅ uX² + vY²`` over ``Z_p`` (``p | D``), as integers modulo a high power of ``p``."""
    a, b, c = Q.coefficients
    D = Q.discriminant
    u = a if a % p else c
    big = p ** (2 * _valuation(D, p) + 40)
    if p == 2:
        if b % 2:  # pragma: no cover - p = 2 | D makes b even
            raise ArithmeticError("b is odd although 2 | D")
        v = (-(D // 4) * pow(u, -1, big)) % big
    else:
        v = (-D * pow(4 * u, -1, big)) % big
    return u, v


def _density_hensel(Q: Form, p: int, n: int) -> Fraction:
    """``α_p(n)`` for ``p ∤ D`` (Hensel at every primitive solution; module docstring)."""
    chi = kronecker(Q.discriminant, p)
    total = Fraction(0)
    m = n
    while True:
        if p == 2:
            a, b, c = Q.coefficients
            cnt = sum(
                1
                for x in range(2)
                for y in range(2)
                if (x, y) != (0, 0) and (a * x * x + b * x * y + c * y * y - m) % 2 == 0
            )
        elif m % p:
            cnt = p - chi
        else:
            cnt = (p - 1) * (1 + chi)
        total += Fraction(cnt, p)
        if m % (p * p):
            return total
        m //= p * p


def local_density(form: FormLike, p: int, n: int) -> Fraction:
    """``α_p(n) = lim p^(−k)·#{(x, y) mod p^k : Q(x, y) ≡ n}`` exactly, for ``n ≥ 1``.

    Parameters
    ----------
    form : FormLike
        A primitive positive definite form.
    p : int
        A prime.
    n : int
        A positive integer.

    Raises
    ------
    FormError
        If the form is not primitive positive definite.
    FormkitError
        If ``n < 1`` or the count would need a modulus ``p^k`` above 4·10^7.

    Examples
    --------
    >>> local_density((1, 0, 1), 2, 1), local_density((1, 0, 1), 5, 1)   # x² + y²: 2 and 1 − χ₋₄(5)/5
    (Fraction(2, 1), Fraction(4, 5))
    """
    Q = _check(form)
    if n < 1:
        raise FormkitError(f"n must be a positive integer, not {n}")
    D = Q.discriminant
    if D % p:
        return _density_hensel(Q, p, n)
    u, v = _diagonal(Q, p)
    if p != 2 and n % p:
        return Fraction(1 + kronecker(n * u, p))
    k = _valuation(n, p) + _valuation(D, p) + (3 if p == 2 else 1)
    pk = p**k
    if pk > MAX_DENSITY_MODULUS:
        raise FormkitError(
            f"the density at p = {p} of n = {n} for D = {D} needs a count modulo {p}^{k} > {MAX_DENSITY_MODULUS}"
        )
    return Fraction(_count_diagonal(u, v, n, pk), pk)


def siegel_genus_average(form: FormLike, n: int, class_number: int, unit_count: int) -> Fraction:
    """Siegel's genus average ``r_G(n) = (w/(2h))·∏_{p | 2nD} α_p(n)/(1 − χ_D(p)/p)`` (``n ≥ 1``).

    ``class_number`` is ``h(D)`` (primitive classes) and ``unit_count`` is ``w(D)``.

    Examples
    --------
    >>> siegel_genus_average((1, 0, 5), 9, 2, 2)           # x² + 5y², alone in its genus: r(9) = 6
    Fraction(6, 1)
    >>> siegel_genus_average((1, 0, 4), 4, 1, 2)           # D = −16 (conductor 2): r(4) = 4
    Fraction(4, 1)
    """
    Q = _check(form)
    D = Q.discriminant
    out = Fraction(unit_count, 2 * class_number)
    primes = set(prime_factorisation(2 * n)) | set(prime_factorisation(-D))
    for p in sorted(primes):
        out *= local_density(Q, p, n) / (1 - Fraction(kronecker(D, p), p))
    return out
