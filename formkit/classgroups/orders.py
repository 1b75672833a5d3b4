"""Quadratic orders of conductor f: the projection Cl(D) → Cl(d_K) and the class number formula.

For ``D = f²·d_K`` the order ``O`` of discriminant ``D`` sits inside the maximal order
``O_K``.  Extending ideals from ``O`` to ``O_K`` gives a surjective homomorphism
``Cl(D) → Cl(d_K)``; on forms it sends a primitive form ``(a, b, c)`` with
``gcd(a, f) = 1`` to ``(a, b', ·)`` with ``f·b' ≡ b (mod 2a)`` and ``b' ≡ d_K (mod 2)``
(the ideal ``[a, (−b + f√d_K)/2]`` becomes ``[a, (−b' + √d_K)/2]``).  Its kernel has
order ``h(D)/h(d_K)``, and

    h(D) = h(d_K) · f / [O_K* : O*] · ∏_{p | f} (1 − χ_{d_K}(p)/p)

(Cox, *Primes of the Form x² + ny²*, Theorem 7.24 and Corollary 7.28 for D < 0;
the same formula with ordinary (wide) class numbers holds for D > 0, Cohen GTM 138
§5.? / Buell 1989 — number not recalled).  For ``D < 0`` the unit index is
``w(d_K)/w(D)``; for ``D > 0`` it is the least ``k`` with ``ε_K^k ∈ O``.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §7.
.. [2] D. A. Buell, *Binary Quadratic Forms*, Springer 1989, Ch. 7.
"""

from __future__ import annotations

from fractions import Fraction

from ..core.arith import as_int, factorint, invert, kronecker, xgcd
from ..core.discriminants import discriminant_parts, fundamental_unit, unit_index, validate_discriminant
from ..core.enumeration import class_number
from ..core.forms import Form, FormLike, _require_nonsquare, as_form
from ..core.reduction import reduced
from ..errors import FormkitError, NotPrimitiveError
from .dispatch import class_group
from .group import ClassGroupElement

__all__ = [
    "coprime_representative",
    "project_to_maximal_order",
    "order_projection",
    "projection_kernel",
    "class_number_order_formula",
]


def coprime_representative(form: FormLike, m: int) -> tuple[Form, tuple]:
    """A form properly equivalent to ``form`` whose first coefficient is prime to ``m``.

    Returns ``(g, M)`` with ``g = form·M``, ``M ∈ SL2(Z)``.  A primitive form
    represents integers prime to any given ``m`` (Cox, Lemma 2.25), found here by a
    search over small coprime ``(x, y)``.

    Raises
    ------
    NotPrimitiveError
        If ``form`` is not primitive.
    NotAnIntegerError, FormkitError
        If ``m`` is not a non-zero integer.

    Examples
    --------
    >>> coprime_representative((2, 0, 9), 2)[0]
    Form(9, 0, 2)
    """
    f = as_form(form)
    if not f.is_primitive:
        raise NotPrimitiveError(f"{f!r} is not primitive (content {f.content})")
    m = abs(as_int(m, "m"))
    if m == 0:
        raise FormkitError(f"coprime_representative needs a non-zero modulus m, not {m}")
    from math import gcd

    bound = 1
    while True:
        for x in range(bound + 1):
            for y in (bound, -bound) if x < bound else range(-bound, bound + 1):
                if gcd(x, y) != 1:
                    continue
                v = f(x, y)
                if v != 0 and gcd(v, m) == 1:
                    _g, s0, t0 = xgcd(x, y)
                    M = ((x, -int(t0)), (y, int(s0)))
                    return f.transform(M), M
        bound += 1


def project_to_maximal_order(form: FormLike) -> Form:
    """The image in ``Cl(d_K)`` of the class of a primitive form of discriminant ``D = f²d_K``.

    Returns a reduced form of discriminant ``d_K`` (for ``D > 0`` a reduced form of
    the image class).

    Examples
    --------
    >>> project_to_maximal_order((2, 0, 9))     # D = -72 = 3²·(-8)
    Form(1, 0, 2)
    >>> project_to_maximal_order((3, 2, 7))     # D = -80 = 2²·(-20)
    Form(2, 2, 3)
    """
    f = as_form(form)
    D = _require_nonsquare(f, "projection to the maximal order")
    if not f.is_primitive:
        raise NotPrimitiveError(f"{f!r} is not primitive (content {f.content})")
    d_K, cond = discriminant_parts(D)
    if cond == 1:
        return reduced(f)
    g, _M = coprime_representative(f, cond)
    a, b = g.a, g.b
    A = abs(a)
    if A % 2 == 1:
        r = b * int(invert(cond, A)) % A if A > 1 else 0
        # b' ≡ r (mod A), b' ≡ d_K (mod 2)
        bp = r if (r - d_K) % 2 == 0 else r + A
    else:
        bp = b * int(invert(cond, 2 * A)) % (2 * A)
    if (bp * bp - d_K) % (4 * A):  # pragma: no cover - impossible by the argument above
        raise ArithmeticError(f"projection of {f!r}: {bp}² is not ≡ {d_K} (mod {4 * A})")
    c = (bp * bp - d_K) // (4 * a)
    return reduced(Form(a, bp, c))


def order_projection(D: object) -> dict:
    """The homomorphism ``Cl(D) → Cl(d_K)`` as a dictionary of class group elements.

    Examples
    --------
    >>> proj = order_projection(-72)
    >>> sorted({y.form.to_list()[0] for y in proj.values()}), len(proj)
    ([1], 2)
    """
    D = validate_discriminant(D)
    d_K, _ = discriminant_parts(D)
    G, H = class_group(D), class_group(d_K)
    return {x: H(project_to_maximal_order(x.form)) for x in G}


def projection_kernel(D: object) -> list[ClassGroupElement]:
    """The kernel of ``Cl(D) → Cl(d_K)``: classes of ``D`` that become principal.

    Examples
    --------
    >>> len(projection_kernel(-4 * 27)), len(projection_kernel(-3 * 49))
    (3, 2)
    """
    return [x for x, y in order_projection(D).items() if y.is_identity()]


def class_number_order_formula(D: object) -> int:
    """``h(D)`` from ``h(d_K)`` by the class number formula for orders.

    For ``D > 0`` this is the wide class number (classes of invertible ideals).

    Examples
    --------
    >>> class_number_order_formula(-4 * 27), class_number_order_formula(-3 * 49)
    (3, 2)
    """
    D = validate_discriminant(D)
    d_K, f = discriminant_parts(D)
    # h(d_K) by enumeration (no group structure needed); wide sense for d_K > 0
    hK = class_number(d_K)
    if d_K > 0 and fundamental_unit(d_K).norm == 1:
        hK //= 2
    value = Fraction(hK * f, unit_index(D))
    for p in factorint(f):
        value *= 1 - Fraction(kronecker(d_K, p), p)
    if value.denominator != 1:  # pragma: no cover - would contradict the theorem
        raise ArithmeticError(f"class number formula gave a non-integer {value} for D = {D}")
    return int(value)
