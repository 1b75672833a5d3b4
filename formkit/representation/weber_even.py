"""Weber class invariants for the discriminants ``D = −4m``: ``f``, ``f₁`` at ``√−m``.

For ``D ≡ 1 (mod 8)`` the Weber value at ``(−1 + √D)/2`` is treated in
:mod:`formkit.representation.class_invariants`.  For ``D = −4m`` the order
``O = Z[θ]``, ``θ = √−m``, has the ring class field ``H_O`` generated over ``K = Q(√D)`` by
``j(θ)``, and a power of one of Weber's functions ([3]; ``f, f₁, f₂`` with
``f·f₁·f₂ = √2``) at ``θ``, times a power of ``√2``, already lies in ``H_O``:

    x = F(√−m)^k / √2^e,

with ``(F, k, e)`` depending on ``m`` modulo 8 (``k`` three times larger when ``3 | m``):

    =========  ================  ================  ==============
    m mod 8    invariant x       j from F = F²⁴    height vs. H_D
    =========  ================  ================  ==============
    1          f(√−m)² / √2      (F − 16)³/F       1/36
    5          f(√−m)⁴           (F − 16)³/F       1/18
    3          f(√−m)            (F − 16)³/F       1/72
    7          f(√−m) / √2       (F − 16)³/F       1/72
    2          f₁(√−m)² / √2     (F + 16)³/F       1/36
    6          f₁(√−m)²          (F + 16)³/F       1/36
    4          f₁(√−m)⁴ / √2     (F + 16)³/F       1/18
    0          f₁(√−m)⁸          (F + 16)³/F       1/9
    =========  ================  ================  ==============

(``F²⁴ = x^{24/k}·2^{12e/k}``, an integer power of 2 in every row, so ``j`` is a rational
function of degree ``72/k`` in ``x`` and the coefficients are about ``72/k`` times shorter
than those of ``H_D`` — three times longer when ``3 | m``; measured in
``benchmarks/bench_class_polynomials_at_scale.py``: 61–65× for ``f``, 33–34× for ``f₁²``,
17× for ``f⁴`` at ``h ≈ 200`` and 1000.  The relations are
``γ₂ = (f²⁴ − 16)/f⁸ = (f₁²⁴ + 16)/f₁⁸`` and ``j = γ₂³``, Weber [3] §§34, 54 as recalled
in [1] and [4] §12.)  These are the classical cases of Weber and of Yui–Zagier [1]
(whose table of conditions Enge–Morain [2] reproduce), recalled from memory; the rows
were *derived again here* by Shimura's reciprocity law in the explicit form of Gee and
Stevenhagen [5]: ``x`` lies in ``H_O`` exactly when ``x^M(θ) = x(θ)`` for every matrix
``M = [[t, −ms], [s, t]]`` (the image of ``(O/48O)^*`` in ``GL₂(Z/48Z)``), which we checked
numerically (at random such ``M``) for 36 values ``m ≤ 54`` covering every row, with and
without ``3 | m``; the smallest ``k`` (with ``e ∈ {0, 1}``) passing is the one in the table
(``tests/representation/test_weber_even.py`` repeats this for 17 of them).  Every
polynomial for ``m < 200`` was then certified, and the images of its roots modulo two
split primes were exactly the roots of ``H_D``.  For ``m ≡ 0 (mod 8)`` with ``3 | m`` the invariant is ``f₁(√−m)²⁴``,
only three times shorter than ``j``.  ``D ≡ 5 (mod 8)`` is refused: there Weber's
functions give the ring class field of ``4D``, of degree ``3h(D)``.

*The conjugates* ([5], Theorem; as recalled).  For the reduced form ``Q = (a, b, c)`` of
``D`` with ``τ_Q = (−b + √D)/(2a)`` the conjugate of ``x(θ)`` under the class of ``Q`` is
``x^{M_Q}(τ_Q)``, where ``M_Q ∈ GL₂(Z/48Z)`` is, modulo ``16`` and modulo ``3``
(``p = 2, 3``):

* ``[[a, b/2], [0, 1]]`` if ``p ∤ a``;
* ``[[−b/2, −c], [1, 0]]`` if ``p | a``, ``p ∤ c``;
* ``[[−b/2 − a, −b/2 − c], [1, −1]]`` if ``p | a`` and ``p | c``.

Writing ``M = diag(1, d)·M'`` with ``d = det M`` and ``M' ∈ SL₂(Z/48Z)`` lifted to
``SL₂(Z)``, ``x^M(τ) = x^{σ_d}(M'τ)``, where ``σ_d`` acts on the ``q``-expansion
coefficients by ``ζ₄₈ ↦ ζ₄₈^d``: it fixes ``f`` and ``f₁`` (rational coefficients) and sends
``√2`` to ``(2/d)·√2``.  The values are computed in ball arithmetic (python-flint's
``acb.modular_eta``, which moves ``M'τ`` into the fundamental domain itself), the forms
``(a, ±b, c)`` give complex conjugate values (``x(θ)`` is real and complex conjugation
inverts the Artin symbols), and the product is certified as in
:mod:`formkit.representation.class_invariants`: every coefficient ball must hold exactly
one integer, else the precision is raised — so a wrong root of unity, a wrong matrix or
a value outside ``H_O`` shows up as a failure, never as a wrong polynomial.

References
----------
.. [1] N. Yui, D. Zagier, "On the singular values of Weber modular functions",
       Math. Comp. 66 (1997), 1645–1662.
.. [2] A. Enge, F. Morain, "Comparing invariants for class fields of imaginary
       quadratic fields", ANTS-V (2002), LNCS 2369, 252–266.
.. [3] H. Weber, *Lehrbuch der Algebra*, vol. III, 1908.
.. [4] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §12 (Weber
       functions; Theorem 12.17 as recalled).
.. [5] A. Gee, "Class invariants by Shimura's reciprocity law", J. Théor. Nombres
       Bordeaux 11 (1999), 45–72; P. Stevenhagen, "Hilbert's 12th problem, complex
       multiplication and Shimura reciprocity", Class Field Theory — its Centenary and
       Prospect, 2001, 161–176.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Any

from ..core.progress import progress_bar
from ..errors import DiscriminantError, FormkitError

__all__ = ["EVEN_WEBER_TABLE", "even_weber_shape", "even_weber_root_to_j"]

#: ``m mod 8 ↦ (function, exponent k, power e of √2 divided by)`` for ``x = F(√−m)^k/√2^e``
#: (``k`` three times larger when ``3 | m``); see the module docstring.
EVEN_WEBER_TABLE: dict[int, tuple[str, int, int]] = {
    1: ("f", 2, 1),
    5: ("f", 4, 0),
    3: ("f", 1, 0),
    7: ("f", 1, 1),
    2: ("f1", 2, 1),
    6: ("f1", 2, 0),
    4: ("f1", 4, 1),
    0: ("f1", 8, 0),
}

_LEVEL = 48


def even_weber_shape(D: int) -> tuple[str, int, int]:
    """``(F, k, e)`` with ``x = F(√−m)^k/√2^e`` the Weber invariant of ``D = −4m``.

    Parameters
    ----------
    D : int
        A negative discriminant ``≡ 0 (mod 4)``.

    Returns
    -------
    tuple
        ``("f" or "f1", k, e)``.

    Raises
    ------
    DiscriminantError
        If ``D`` is not negative with ``D ≡ 0 (mod 4)``.

    Examples
    --------
    >>> even_weber_shape(-44), even_weber_shape(-20), even_weber_shape(-84)
    (('f', 1, 0), ('f', 4, 0), ('f', 12, 0))
    """
    if D >= 0 or D % 4 != 0:
        raise DiscriminantError(f"this Weber invariant needs a negative D ≡ 0 (mod 4), not {D}")
    m = -D // 4
    F, k, e = EVEN_WEBER_TABLE[m % 8]
    if m % 3 == 0:
        k *= 3
    return F, k, e


def even_weber_description(shape: tuple[str, int, int]) -> str:
    """The invariant in words, e.g. ``f(sqrt(-m))^2/sqrt(2)``."""
    F, k, e = shape
    s = f"{F}(sqrt(-m))" + (f"^{k}" if k != 1 else "")
    return s + ("" if e == 0 else "/sqrt(2)" if e == 1 else f"/sqrt(2)^{e}")


def even_weber_relation(shape: tuple[str, int, int]) -> str:
    """How a root ``x`` gives a root ``j`` of ``H_D``, in words."""
    F, k, e = shape
    sign = "-" if F == "f" else "+"
    scale = 12 * e // k
    F24 = ("x" if k == 24 else f"x^{24 // k}") + (f"*2^{scale}" if scale else "")
    return f"j = (F {sign} 16)^3/F, F = {F}(sqrt(-m))^24 = {F24}"


def even_weber_root_to_j(x: int, p: int, shape: tuple[str, int, int]) -> int:
    """The root ``j = (F ∓ 16)³/F`` of ``H_D`` modulo ``p`` from a root ``x`` of the Weber
    polynomial of ``D = −4m`` (``F = x^{24/k}·2^{12e/k}``, the sign ``−`` for ``f``, ``+``
    for ``f₁``).

    Raises
    ------
    FormkitError
        If ``x ≡ 0 (mod p)``.

    Examples
    --------
    >>> p = 10**9 + 7
    >>> even_weber_root_to_j(1, p, ("f", 4, 0)) == (1 - 16) ** 3 % p   # j = (F − 16)³/F at F = 1
    True
    """
    F, k, e = shape
    x %= p
    if x == 0:
        raise FormkitError(f"a root of the Weber polynomial modulo {p} must be nonzero, not {x}")
    F24 = pow(x, 24 // k, p) * pow(2, 12 * e // k, p) % p
    t = (F24 - 16) if F == "f" else (F24 + 16)
    return t**3 * pow(F24, -1, p) % p


def _egcd(x: int, y: int) -> tuple[int, int, int]:
    """``(g, s, t)`` with ``s·x + t·y = g = gcd(x, y) ≥ 0``."""
    s0, s1, t0, t1 = 1, 0, 0, 1
    while y:
        q, r = divmod(x, y)
        x, y = y, r
        s0, s1 = s1, s0 - q * s1
        t0, t1 = t1, t0 - q * t1
    return (x, s0, t0) if x >= 0 else (-x, -s0, -t0)


def _lift_sl2(M: tuple[int, int, int, int], N: int) -> tuple[int, int, int, int]:
    """A matrix of ``SL₂(Z)`` congruent to ``M ∈ SL₂(Z/NZ)`` (entries row by row).

    Make ``gcd(c, d) = 1`` by adding multiples of ``N`` to ``d``; with ``a₀d − b₀c = 1`` and
    ``uc + vd = 1`` the lift is ``(a₀ + κc, b₀ + κd)``, ``κ = u(a − a₀) + v(b − b₀)``.
    """
    a, b, c, d = (v % N for v in M)
    if c == 0:
        c = N
    while math.gcd(c, d) != 1:
        d += N
    _g, s, t = _egcd(d, c)  # s·d + t·c = 1
    a0, b0 = s, -t
    _g, u, v = _egcd(c, d)
    kappa = u * (a - a0) + v * (b - b0)
    return a0 + kappa * c, b0 + kappa * d, c, d


def _crt(r16: int, r3: int) -> int:
    """The residue modulo 48 that is ``r16`` mod 16 and ``r3`` mod 3."""
    return (r16 * 33 + r3 * 16) % 48  # 33 ≡ 1 (16), ≡ 0 (3); 16 ≡ 0 (16), ≡ 1 (3)


def _shimura_matrix(a: int, b: int, c: int) -> tuple[int, int, int, int]:
    """Gee–Stevenhagen's ``M_Q ∈ GL₂(Z/48Z)`` for ``Q = (a, b, c)``, ``θ = √−m`` (``B = 0``)."""
    parts = []
    for p, q in ((2, 16), (3, 3)):
        if a % p:
            M = (a, b // 2, 0, 1)
        elif c % p:
            M = (-b // 2, -c, 1, 0)
        else:
            M = (-b // 2 - a, -b // 2 - c, 1, -1)
        parts.append(tuple(v % q for v in M))
    return tuple(_crt(x, y) for x, y in zip(parts[0], parts[1]))  # type: ignore[return-value]


def _kronecker_2(d: int) -> int:
    """``(2/d)`` for odd ``d``."""
    return 1 if d % 8 in (1, 7) else -1


def _even_weber_value(a: int, b: int, c: int, D: int, shape: tuple[str, int, int]) -> Any:
    """``x^{M_Q}(τ_Q)`` for the form ``(a, b, c)``, an acb ball at the current precision."""
    from flint import acb, arb

    F, k, e = shape
    M = _shimura_matrix(a, b, c)
    det = (M[0] * M[3] - M[1] * M[2]) % _LEVEL
    inv = pow(det, -1, _LEVEL)
    A, B, C, Dd = _lift_sl2((M[0], M[1], M[2] * inv, M[3] * inv), _LEVEL)
    tau = acb(arb(-b) / (2 * a), arb(-D).sqrt() / (2 * a))
    z = (A * tau + B) / (C * tau + Dd)
    if F == "f":
        w = acb(arb(-1) / 24).exp_pi_i() * ((z + 1) / 2).modular_eta() / z.modular_eta()
    else:
        w = (z / 2).modular_eta() / z.modular_eta()
    x = w**k
    if e:
        x = x / arb(2).sqrt() ** e
        if e % 2 and _kronecker_2(det) == -1:  # σ_d(√2) = (2/d)·√2
            x = -x
    return x


def _even_ball_product(D: int, forms: Sequence[tuple[int, int, int]], prec: int, shape: tuple[str, int, int]):
    """∏(x − x_Q) as a real ball polynomial (conjugate pairs ``(a, ±b, c)`` as quadratics)."""
    from flint import arb_poly, ctx

    from ..analytic.ball_polynomials import product_tree

    factors = []
    with (
        ctx.workprec(prec),
        progress_bar(total=len(forms), desc=f"Weber values (D = {D})", unit="form") as bar,
    ):
        for a, b, c in forms:
            bar.update(1)
            if b < 0:
                continue  # its value is the conjugate of that of (a, −b, c)
            x = _even_weber_value(a, b, c, D, shape)
            if b == 0 or b == a or a == c:  # an ambiguous class: the value is real
                factors.append(arb_poly([-x.real, 1]))
            else:
                re, im = x.real, x.imag
                factors.append(arb_poly([re * re + im * im, -2 * re, 1]))
        return product_tree(factors)
