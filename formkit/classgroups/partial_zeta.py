"""Identities of the partial zeta functions of real quadratic classes (D > 0): ζ_K and genus characters.

The partial zeta function ``ζ(s, C) = Σ_{𝔞 ∈ C} N(𝔞)^(−s)`` of a narrow class ``C`` of
invertible ideals of the order of discriminant ``D > 0`` — by direct summation with an
explicit tail bound, or continued analytically to every complex ``s ≠ 1`` — is computed in
:mod:`formkit.classgroups.narrow_class_zeta`, the L-series ``L(s, ψ) = Σ_C ψ(C)·ζ(s, C)`` of
a narrow class character in :mod:`formkit.classgroups.class_character_series` (both
re-exported here).  This module gives ``ζ(s, C)`` for the class of one form
(:func:`partial_zeta`) and checks the values against the closed formulas:

* for fundamental ``D > 0``, ``Σ_C ζ(s, C) = ζ_K(s) = ζ(s)·L(s, χ_D)``
  (:func:`real_class_zeta_sum`, the right side from
  :func:`formkit.analytic.l_series.quadratic_field_zeta`);
* for a genus character ``ψ_{d₁,d₂}`` Kronecker's factorisation ``L(s, ψ) =
  L(s, χ_{d₁})·L(s, χ_{d₂})`` holds as for ``D < 0`` (:func:`real_genus_character_l_series`;
  ``ψ(C) = χ_{d₁}(m)`` for a norm ``m > 0`` of an ideal of ``C`` prime to ``D``);
* for an order (``D = f²·d_K``, ``f > 1``) both functions hand ``D`` to
  :func:`~formkit.classgroups.order_series.order_zeta_sum` and
  :func:`~formkit.classgroups.order_series.order_genus_character_l_series`, whose right sides
  carry the factors ``e_p(s, ψ)`` at ``p | f``.

The Chowla–Selberg formula has no analogue here: it is a statement about η at CM points
(``D < 0``).

References
----------
.. [1] E. Hecke, "Über die Kroneckersche Grenzformel für reelle quadratische Körper und
       die Klassenzahl relativ-Abelscher Körper", Verh. Naturf. Ges. Basel 28 (1917)
       (partial zeta functions of real quadratic classes; from memory).
.. [2] D. Zagier, *Zetafunktionen und quadratische Körper*, Springer 1981, §10–13.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import replace
from fractions import Fraction

from ..analytic.balls import (
    CertifiedValue,
    ComplexArgument,
    as_ball,
    as_complex_argument,
    bits_for,
    certified,
    check_digits,
)
from ..analytic.l_series import l_series, quadratic_field_zeta, riemann_zeta
from ..core.arith import as_int, kronecker
from ..core.discriminants import is_fundamental_discriminant
from ..core.forms import Form, FormLike, as_form
from ..errors import FormkitError
from .class_character_series import enumerated_classes
from .class_character_series import real_class_character_l_series as real_class_character_l_series
from .genus_characters import genus_character_discriminants
from .narrow_class_zeta import DEFAULT_IDEAL_NORM_BOUND as DEFAULT_IDEAL_NORM_BOUND
from .narrow_class_zeta import MAX_IDEAL_NORM_BOUND as MAX_IDEAL_NORM_BOUND
from .narrow_class_zeta import PartialZetaValues as PartialZetaValues
from .narrow_class_zeta import _route
from .narrow_class_zeta import partial_zeta_values as partial_zeta_values
from .order_series import order_genus_character_l_series, order_zeta_sum
from .partial_zeta_continuation import _digits_of, _positive, continued_class_character_l_series
from .series_identity import SeriesIdentity

# partial_zeta_values, PartialZetaValues, the two bounds and real_class_character_l_series
# are defined in the modules imported above and stay importable from here; the names this
# module defines are:
__all__ = [
    "partial_zeta",
    "real_class_zeta_sum",
    "real_genus_character_l_series",
]


def _positive_value_prime_to(form: Form, D: int) -> int:
    """A value ``Q(x, y) > 0`` prime to ``D`` (the genus characters read positive norms)."""
    for size in range(1, 200):
        for x in range(-size, size + 1):
            for y in (-size, size) if abs(x) != size else range(-size, size + 1):
                m = form.a * x * x + form.b * x * y + form.c * y * y
                if m > 0 and math.gcd(m, D) == 1:
                    return m
    raise ArithmeticError(f"no positive value of {form!r} prime to {D} found")  # pragma: no cover


def partial_zeta(form: FormLike, s: object, *, bound: object = None, digits: int = 30) -> CertifiedValue:
    """``ζ(s, C)`` for the narrow class ``C`` of one indefinite form (see :func:`partial_zeta_values`).

    Examples
    --------
    >>> partial_zeta((1, 1, -1), 3, bound=3000, digits=6).text()     # h⁺(5) = 1: ζ_K(3) for Q(√5)
    '1.0275'
    >>> partial_zeta((1, 1, -1), "1/2", digits=15).text()           # ζ_K(1/2), continued
    '-0.338438541108383'
    """
    Q = as_form(form)
    return partial_zeta_values(Q.discriminant, s, bound=bound, digits=digits).value(Q)


def _at(ball, s: ComplexArgument):
    """The real part of an acb ball at real ``s`` (the series are real there), else the ball."""
    return ball.real if s.is_real else ball


def _sum_identity(
    left_ball, right: CertifiedValue, statement: str, D: int, s: ComplexArgument, values, prov: str
):
    from flint import ctx

    with ctx.workprec(bits_for(right.digits) + 40):
        got = _digits_of(left_ball, right.digits)
        left = certified(
            left_ball,
            max(1, got),
            quantity=statement.split(" = ")[0],
            s=s,
            method=values[0].method if values else "",
            terms=values[0].terms if values else 0,
        )
        agrees = bool(left_ball.overlaps(_at(as_ball(right), s)))
    return SeriesIdentity(statement, D, s, left, right, agrees, len(values), prov)


def real_class_zeta_sum(
    D: object,
    s: object,
    *,
    bound: object = None,
    digits: int = 30,
    values: PartialZetaValues | None = None,
) -> SeriesIdentity:
    """``Σ_C ζ(s, C)`` over the narrow classes of ``D > 0``, beside ``ζ(s)·L(s, χ_D)`` (times ``∏_{p|f} e_p(s)`` for an order).

    For fundamental ``D`` the right side is ``ζ_K(s)``; for ``D = f²·d_K`` with ``f > 1``
    the call is handed to :func:`~formkit.classgroups.order_series.order_zeta_sum`, whose
    right side is ``ζ(s)·L(s, χ_{d_K})·∏_{p|f} e_p(s)``.

    Parameters
    ----------
    D : int
        A positive non-square discriminant.
    s : number or text
        Any complex ``s ≠ 1``; with ``bound``, a real ``s > 1``.
    bound : int, optional
        Direct summation over the ideals of norm ``≤ bound``, as in
        :func:`~formkit.classgroups.narrow_class_zeta.partial_zeta_values`; without it the
        analytic continuation.
    digits : int
        The most digits reported (fewer on the side by the classes when a tail bound allows
        fewer).
    values : PartialZetaValues, optional
        The values of ``D`` at ``s`` already computed (used when they match ``D`` and ``s``).

    Returns
    -------
    SeriesIdentity

    Raises
    ------
    DiscriminantError
        If ``D`` is not a positive discriminant.
    FormkitError
        At ``s = 1``, or as :func:`~formkit.classgroups.narrow_class_zeta.partial_zeta_values`.

    Examples
    --------
    >>> r = real_class_zeta_sum(229, 3, bound=3000, digits=10)     # Cl⁺(229) ≅ C3
    >>> r.agrees, r.class_number
    (True, 3)
    >>> real_class_zeta_sum(229, "-1/2+3i", digits=10).agrees
    True
    >>> r = real_class_zeta_sum(45, 2, digits=15)                  # the order of conductor 3 in Q(√5)
    >>> r.statement, r.agrees
    ('Σ_C ζ(s, C) = ζ(s)·L(s, χ_5)·e_3(s)', True)

    References
    ----------
    Zagier, *Zetafunktionen und quadratische Körper*, §13 (``ζ_K`` as the sum of the
    partial zeta functions).
    """
    from flint import acb, ctx

    D = _positive(D, "Σ_C ζ(s, C) = ζ(s)·L(s, χ_D)")
    if not is_fundamental_discriminant(D):
        return order_zeta_sum(D, s, digits=digits, bound=bound, values=values)
    if values is not None and values.discriminant == D and values.s == as_complex_argument(s):
        z = values
    else:
        z = partial_zeta_values(D, s, bound=bound, digits=digits)
    right = quadratic_field_zeta(D, z.s, digits=check_digits(digits))
    with ctx.workprec(bits_for(digits) + 40):
        total = _at(acb(0), z.s)
        for v in z.values:
            total += _at(as_ball(v), z.s)
    return _sum_identity(total, right, "Σ_C ζ(s, C) = ζ(s)·L(s, χ_D)", D, z.s, z.values, z.provenance)


def real_genus_character_l_series(
    D: object, d1: object, s: object, *, bound: object = None, digits: int = 30
) -> SeriesIdentity:
    """``L(s, ψ_{d₁,d₂})`` by the classes and as ``L(s, χ_{d₁})·L(s, χ_{d₂})`` (``D = d₁·d₂ > 0``).

    Without ``bound`` the left side is the continued ``L(s, ψ)`` of the genus character
    (any complex ``s``; ``s ≠ 1`` when ``d₁ = 1``); with ``bound`` it is
    ``Σ_C ψ(C)·ζ(s, C)`` summed directly (real ``s > 1``).  For ``D = f²·d_K`` with
    ``f > 1`` the call is handed to
    :func:`~formkit.classgroups.order_series.order_genus_character_l_series` (``d₁``
    fundamental or 1, ``d₂ = D/d₁ ≡ 0, 1 (mod 4)``; right side
    ``L(s, χ_{d₁*})·L(s, χ_{d₂*})·∏_{p|f} e_p(s, ψ)``).

    Parameters
    ----------
    D : int
        A positive non-square discriminant.
    d1 : int
        For fundamental ``D`` one of
        :func:`~formkit.classgroups.genus_characters.genus_character_discriminants`, for an
        order one of :func:`~formkit.classgroups.genus_characters.order_genus_character_discriminants`.
    s : number or text
        Any complex ``s`` (``s ≠ 1`` for the trivial character); with ``bound`` a real ``s > 1``.
    bound : int, optional
        Direct summation over the ideals of norm ``≤ bound``.
    digits : int
        The most digits reported.

    Returns
    -------
    SeriesIdentity

    Raises
    ------
    DiscriminantError, FormkitError
        If ``D`` is not positive, ``d₁`` does not split it, or at the pole.

    Examples
    --------
    >>> r = real_genus_character_l_series(12, -3, 4, bound=2000, digits=8)   # L(4, χ₋₃)·L(4, χ₋₄)
    >>> r.agrees, r.right.text()
    (True, '0.92963328')
    >>> r = real_genus_character_l_series(12, -3, "1/2+2i", digits=15)
    >>> r.agrees, r.left.digits
    (True, 15)
    >>> r = real_genus_character_l_series(45, -3, 2, digits=15)   # an order: L(2, χ₋₃)·L(2, χ₋₁₅)·e_3
    >>> r.statement.split(" = ")[1], r.agrees
    ('L(s, χ_-3)·L(s, χ_-15)·e_3(s, ψ)', True)

    References
    ----------
    Zagier, *Zetafunktionen und quadratische Körper*, §12–13.
    """
    from flint import acb, ctx

    D = _positive(D, "a genus character L-series")
    if not is_fundamental_discriminant(D):
        return order_genus_character_l_series(D, d1, s, digits=digits, bound=bound)
    s, direct = _route(s, bound)
    digits = check_digits(digits)
    d1 = as_int(d1, "d1")
    pairs = genus_character_discriminants(D)
    if not any(d1 in p for p in pairs):
        raise FormkitError(
            f"{d1} does not split {D} into two fundamental discriminants; choose d1 among "
            f"{sorted({p[0] for p in pairs} | {p[1] for p in pairs})}"
        )
    d2 = D // d1
    signs = []
    for x in enumerated_classes(D).elements():
        # ψ(C) = χ_{d₁}(m) = χ_{d₂}(m) for a norm m > 0 of an ideal of C (or C⁻¹) prime to D
        m = _positive_value_prime_to(x.form, D)
        signs.append(kronecker(d1, m))
        if signs[-1] != kronecker(d2, m):  # pragma: no cover - genus theory
            raise ArithmeticError(f"χ_{d1}({m}) ≠ χ_{d2}({m}) for a value of {x.form!r}")
    if direct:
        z = partial_zeta_values(D, s, bound=bound, digits=digits)
        vals, prov = z.values, z.provenance
        with ctx.workprec(bits_for(digits) + 40):
            total = _at(acb(0), s)
            for psi, v in zip(signs, z.values):
                total += psi * _at(as_ball(v), s)
    else:
        one = continued_class_character_l_series(D, _genus_exponents(D, signs), s, digits=digits)
        vals, prov = (one,), str(enumerated_classes(D).provenance)
        with ctx.workprec(bits_for(digits) + 40):
            total = _at(as_ball(one), s)

    def factor(d: int) -> CertifiedValue:
        return riemann_zeta(s, digits=digits + 5) if d == 1 else l_series(d, s, digits=digits + 5)

    f1, f2 = factor(d1), factor(d2)
    with ctx.workprec(bits_for(digits) + 40):
        prod = _at(as_ball(f1) * as_ball(f2), s)
        right = certified(
            prod,
            digits,
            quantity=f"L(s, χ_{d1})·L(s, χ_{d2})",
            s=s,
            method=f1.method,
            terms=f1.terms + f2.terms,
        )
    identity = _sum_identity(total, right, f"L(s, ψ) = L(s, χ_{d1})·L(s, χ_{d2})", D, s, vals, prov)
    return replace(identity, class_number=enumerated_classes(D).order)


def _genus_exponents(D: int, signs: Sequence[int]) -> tuple[int, ...]:
    """The exponents ``k`` of the character of ``class_group(D)`` with the values ``signs`` (±1)."""
    from itertools import product

    G = enumerated_classes(D)
    logs = [G.discrete_log(x) for x in G.elements()]
    inv = G.invariants
    for k in product(*[(0, n // 2) if n % 2 == 0 else (0,) for n in inv]):
        if all(
            (-1) ** int(2 * sum((Fraction(ki * ei, ni) for ki, ei, ni in zip(k, e, inv)), Fraction(0))) == sg
            for e, sg in zip(logs, signs)
        ):
            return tuple(k)
    raise ArithmeticError(
        f"the genus character {list(signs)} is no character of {G.structure}"
    )  # pragma: no cover
