"""Dirichlet series of non-maximal orders: ζ_O(s), ring class and genus characters, factors at p | f.

For ``D = f²·d_K`` let ``O`` be the order of discriminant ``D`` and ``ψ`` a character of
``Cl(O)`` (the narrow class group for ``D > 0``), ``ψ = 1`` included.  The classes give the
series over the *invertible* ideals of ``O``,

    L_O(s, ψ) = Σ_{𝔟 ⊆ O invertible} ψ(𝔟)·N(𝔟)^(−s)
              = (1/w)·Σ_C ψ(C)·Z_C(s)          (D < 0, Epstein zeta functions)
              = Σ_C ψ(C)·ζ(s, C)               (D > 0, partial zeta functions),

(``r_C(n)/w`` counts the invertible ideals of norm ``n`` in ``C⁻¹``: ``α ↦ α𝔞⁻¹`` for the
ideal ``𝔞`` of the form, ``α ∈ 𝔞`` up to the ``w`` units; ``Z_C = Z_{C⁻¹}``).  Invertible
ideals are locally principal, so ``L_O`` is an Euler product over ``p``; at ``p ∤ f`` the
factor is that of the Hecke L-series of ``ψ``, at ``p | f`` it is new.

The factors ``e_p(s, ψ)`` at ``p | f`` — polynomials in ``X = p^(−s)``, derived from the
local structure of the order and read off the class groups — are given by
:mod:`formkit.classgroups.conductor_factors`; with them

    L_O(s, ψ) = L(s, ψ)·∏_{p | f} e_p(s, ψ),

``L(s, ψ)`` the primitive L-series of ``ψ`` (the Hecke L-series of its conductor).  Special
cases:

* ``ψ = 1``: ``Σ_C Z_C(s) = w·ζ(s)·L(s, χ_{d_K})·∏_{p^k ∥ f} e_p(s)`` with
  ``e_p = (1 − X)(1 − χ(p)X)·Σ_{i<k} p^i X^(2i) + p^k X^(2k)(1 − χ(p)/p)``; for ``D = −12``
  this is the classical ``Σ'(x² + 3y²)^(−s) = 2(1 + 2^(1−2s))·ζ(s)·L(s, χ_{−3})``, and the
  residue at ``s = 1`` gives back the class number formula of the order
  (``e_p(1) = 1 − χ(p)/p``);
* a genus character ``ψ = ψ_{d₁,d₂}`` (``D = d₁·d₂``, ``d₁`` fundamental or 1, ``d₂`` a
  discriminant or a square; ``ψ(C) = χ_{d₁}(m) = χ_{d₂}(m)`` for ``m`` represented by ``C``
  and prime to ``D``): ``L(s, ψ) = L(s, χ_{d₁*})·L(s, χ_{d₂*})`` with ``d*`` the fundamental
  discriminant of ``Q(√d)`` (``χ_1 = 1``: ``ζ``), by Kronecker's factorisation for the
  biquadratic field ``K(√d₁)``; so
  ``L_O(s, ψ) = L(s, χ_{d₁*})·L(s, χ_{d₂*})·∏_{p|f} e_p(s, ψ)``.  Equivalently, over the
  ideals prime to ``f`` only, ``L(s, χ_{f²d₁})·L(s, χ_{f²d₂})``.


The functions of the maximal order (:func:`formkit.classgroups.class_series.class_zeta_sum`,
:func:`~formkit.classgroups.class_series.genus_character_l_series`,
:func:`formkit.classgroups.partial_zeta.real_class_zeta_sum`,
:func:`~formkit.classgroups.partial_zeta.real_genus_character_l_series`) hand a
non-fundamental ``D`` to the ones here, so one call serves every discriminant.  The classes
come from complete enumeration (unconditional); every number is a certified ball.

References
----------
.. [1] D. Zagier, *Zetafunktionen und quadratische Körper*, Springer 1981, §10–12.
.. [2] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §7 (orders, ring class
       groups, the class number formula for orders, Thm 7.24).
.. [3] J. Neukirch, *Algebraic Number Theory*, Springer 1999, Ch. I §12 (orders, locally
       principal ideals) and Ch. VII (Hecke characters and their local components); section
       numbers from memory.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
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
from ..analytic.epstein import epstein_zeta, kronecker_limit
from ..analytic.l_series import l_series, quadratic_field_zeta, riemann_zeta
from ..core.arith import as_int, kronecker
from ..core.discriminants import (
    discriminant_parts,
    is_fundamental_discriminant,
    unit_count,
    validate_discriminant,
)
from ..errors import DiscriminantError, FormkitError
from .class_character_series import (
    character_phase,
    class_character_l_series,
    enumerated_classes,
    real_class_character_l_series,
)
from .conductor_factors import (
    OrderLocalFactor,
    _local_factors,
    _product_ball,
    _real_if,
    order_local_factors,
)
from .genus import value_prime_to
from .genus_characters import (  # noqa: F401 - order_genus_character_discriminants: the older import path
    field_discriminant,
    order_genus_character_discriminants,
    splittings,
)
from .narrow_class_zeta import PartialZetaValues, partial_zeta_values
from .partial_zeta_continuation import _digits_of
from .series_identity import SeriesIdentity

__all__ = [
    "RingClassLSeries",
    "order_zeta_sum",
    "order_genus_character_l_series",
    "ring_class_l_series",
]

# ---------------------------------------------------------------------------------------
# Σ over the classes = w·ζ_K(s)·∏ e_p(s)
# ---------------------------------------------------------------------------------------


def _check_order(D: object, what: str) -> int:
    D = validate_discriminant(D)
    if is_fundamental_discriminant(D):
        raise DiscriminantError(
            f"{what} is the order (conductor f > 1) form of the identity; {D} is fundamental "
            "(use the maximal-order function, e.g. class_zeta_sum)"
        )
    return D


def _class_values(D: int, s: ComplexArgument, digits: int, bound: object, values: object = None):
    """The per-class values: Epstein zeta values (``D < 0``) or partial zeta values (``D > 0``)."""
    G = enumerated_classes(D)
    if D < 0:
        return G, {x: epstein_zeta(x.form, s, digits=digits + 5) for x in G.elements()}, str(G.provenance)
    if isinstance(values, PartialZetaValues) and values.discriminant == D and values.s == s:
        z = values
    else:  # no bound: the analytic continuation (any s ≠ 1); a bound: direct summation
        z = partial_zeta_values(D, s, bound=bound, digits=digits)
    return G, {G(f): v for f, v in zip(z.classes, z.values)}, z.provenance


def _identity(statement, D, s, left_ball, right_ball, digits, left_method, right_method, h, prov, terms):
    got = min(digits, _digits_of(left_ball.real if s.is_real else left_ball, digits)) if D > 0 else digits
    left = certified(
        left_ball, max(1, got), quantity=statement.split(" = ")[0], s=s, method=left_method, terms=terms
    )
    right = certified(
        right_ball, digits, quantity=statement.split(" = ")[1], s=s, method=right_method, terms=0
    )
    agrees = bool(as_ball(left).overlaps(as_ball(right)))
    return SeriesIdentity(statement, D, s, left, right, agrees, h, prov)


def order_zeta_sum(
    D: object, s: object, *, digits: int = 30, bound: object = None, values: object = None
) -> SeriesIdentity:
    """The sum over the classes of an order beside ``w·ζ(s)·L(s, χ_{d_K})·∏_{p|f} e_p(s)``.

    For ``D < 0`` the left side is ``Σ_C Z_C(s)`` (Epstein zeta functions, any ``s ≠ 1``);
    for ``D > 0`` it is ``Σ_C ζ(s, C)`` over the narrow classes (partial zeta functions:
    continued analytically to any ``s ≠ 1``, or with ``bound`` the ideals of norm ``≤ bound``
    summed directly for real ``s > 1``; ``values`` may pass the
    :class:`~formkit.classgroups.narrow_class_zeta.PartialZetaValues` already computed) and
    ``w`` is absent.
    The factors ``e_p`` are those of :func:`order_local_factors` for ``ψ = 1``.

    Raises
    ------
    DiscriminantError
        If ``D`` is fundamental (see :func:`formkit.class_zeta_sum`).
    FormkitError
        At the pole ``s = 1``, or as the functions summed.

    Examples
    --------
    >>> r = order_zeta_sum(-12, 2, digits=20)       # 2(1 + 2^(1−2s))ζ(s)L(s, χ₋₃)
    >>> r.agrees, r.right.text()
    (True, '2.8916796498393361566')
    """
    from flint import ctx

    D = _check_order(D, "Σ_C Z_C(s) = w·ζ(s)·L(s, χ_{d_K})·∏ e_p(s)")
    s = as_complex_argument(s)
    digits = check_digits(digits)
    if s.is_integer and s.real == 1:
        raise FormkitError(f"s = 1 is the pole of the sum over the classes of {D}; any other s is fine")
    d_K, _f = discriminant_parts(D)
    factors = order_local_factors(D)
    _G, per_class, prov = _class_values(D, s, digits, bound, values)
    zk = quadratic_field_zeta(d_K, s, digits=digits + 5)
    w = unit_count(D) if D < 0 else 1
    with ctx.workprec(bits_for(digits) + 40):
        left = sum((as_ball(v) for v in per_class.values()), 0 * as_ball(zk))
        right = w * as_ball(zk) * _product_ball(factors, s)
        left, right = _real_if(left, s), _real_if(right, s)
        ps = "·".join(f"e_{e.prime}(s)" for e in factors)
        lhs = "Σ_C Z_C(s)" if D < 0 else "Σ_C ζ(s, C)"
        wtxt = "w·" if D < 0 else ""
        statement = f"{lhs} = {wtxt}ζ(s)·L(s, χ_{d_K})·{ps}"
        return _identity(
            statement,
            D,
            s,
            left,
            right,
            digits,
            "sum over the classes" + (" of Epstein zeta values" if D < 0 else " of partial zeta values"),
            "ζ_K(s) times the factors at p | f: " + "; ".join(f"e_{e.prime} = {e.text()}" for e in factors),
            len(per_class),
            prov,
            sum(v.terms for v in per_class.values()),
        )


def order_genus_character_l_series(
    D: object, d1: object, s: object, *, digits: int = 30, bound: object = None
) -> SeriesIdentity:
    """``L_O(s, ψ_{d₁,d₂})`` by the classes and as ``L(s, χ_{d₁*})·L(s, χ_{d₂*})·∏_{p|f} e_p(s, ψ)``.

    ``D`` is any discriminant (non-fundamental here; fundamental ``D`` is handled by
    :func:`formkit.genus_character_l_series`); ``d₁`` one of
    :func:`order_genus_character_discriminants`.  For ``D > 0`` the classes are narrow and
    ``s`` must be real ``> 1``.

    Raises
    ------
    DiscriminantError, FormkitError
        If ``D`` is fundamental, ``d₁`` does not split ``D``, or at the pole of the trivial
        character.

    Examples
    --------
    >>> r = order_genus_character_l_series(-36, -3, 2, digits=20)    # L(2, χ₋₃)·L(2, χ₁₂)·e_3
    >>> r.agrees
    True
    """
    from flint import ctx

    D = _check_order(D, "the genus character L-series of an order")
    s = as_complex_argument(s)
    digits = check_digits(digits)
    d1 = as_int(d1, "d1")
    if not any(d1 == p[0] for p in splittings(D)):
        raise FormkitError(
            f"d1 = {d1} does not split {D} as d1·d2 with d1 a fundamental discriminant (or 1) and d2 ≡ 0, 1 "
            f"(mod 4); choose d1 among {sorted({p[0] for p in splittings(D)})}"
        )
    d2 = D // d1
    e1, e2 = field_discriminant(d1), field_discriminant(d2)
    G = enumerated_classes(D)

    def phase(x) -> Fraction:
        m, _, _ = value_prime_to(x.form, D)
        return Fraction(0) if kronecker(d1, m) == 1 else Fraction(1, 2)

    trivial = all(phase(x) == 0 for x in G.elements())
    if trivial and s.is_integer and s.real == 1:
        raise FormkitError(
            f"s = 1 is the pole of L_O(s, ψ) for the trivial character (ψ_{d1} is trivial on Cl({D}))"
        )
    factors = _local_factors(D, phase)
    G, values, prov = _left_values(D, s, digits, bound, trivial)
    w = unit_count(D) if D < 0 else 1

    def factor(d: int) -> CertifiedValue:
        return riemann_zeta(s, digits=digits + 5) if d == 1 else l_series(d, s, digits=digits + 5)

    f1, f2 = factor(e1), factor(e2)
    with ctx.workprec(bits_for(digits) + 40):
        left = sum((int(1 - 4 * phase(x)) * as_ball(v) for x, v in values.items()), 0 * as_ball(f1)) / w
        right = as_ball(f1) * as_ball(f2) * _product_ball(factors, s)
        left, right = _real_if(left, s), _real_if(right, s)
        ps = "·".join(f"e_{e.prime}(s, ψ)" for e in factors)
        lhs = "(1/w)·Σ_C ψ(C)·Z_C(s)" if D < 0 else "Σ_C ψ(C)·ζ(s, C)"
        n1 = "ζ(s)" if e1 == 1 else f"L(s, χ_{e1})"
        n2 = "ζ(s)" if e2 == 1 else f"L(s, χ_{e2})"
        return _identity(
            f"{lhs} = {n1}·{n2}·{ps}",
            D,
            s,
            left,
            right,
            digits,
            f"genus character χ_{d1}(m) on the classes",
            f"{f1.method}; factors at p | f: " + "; ".join(f"e_{e.prime} = {e.text()}" for e in factors),
            len(values),
            prov,
            sum(v.terms for v in values.values()),
        )


def _left_values(D: int, s: ComplexArgument, digits: int, bound: object, trivial: bool):
    """Per class: ``Z_C(s)`` (or, at ``s = 1`` for ``D < 0``, the constant term of Kronecker's limit formula)."""
    if D < 0 and s.is_integer and s.real == 1 and not trivial:
        G = enumerated_classes(D)
        return (
            G,
            {x: kronecker_limit(x.form, digits=digits + 5).constant_term for x in G.elements()},
            str(G.provenance),
        )
    return _class_values(D, s, digits, bound)


# ---------------------------------------------------------------------------------------
# ring class characters of orders
# ---------------------------------------------------------------------------------------


@dataclass(frozen=True)
class RingClassLSeries:
    """A ring class character ``ψ`` of ``Cl(D)``: its series over the invertible ideals and its L-series.

    ``invertible`` is ``L_O(s, ψ)`` from the classes; ``primitive`` is ``L(s, ψ) =
    L_O(s, ψ)/∏ e_p(s, ψ)``; ``conductor`` is the conductor of ``ψ`` as a ring class
    character (``ψ`` comes from the order of conductor ``conductor``); ``factors`` the
    ``e_p`` at ``p | f``.
    """

    discriminant: int
    character: tuple[int, ...]
    s: ComplexArgument
    conductor: int
    invertible: CertifiedValue
    primitive: CertifiedValue
    factors: tuple[OrderLocalFactor, ...]
    provenance: str

    @property
    def character_discriminant(self) -> int:
        """``d_K·conductor²``: ``ψ`` factors through the class group of this discriminant."""
        d_K, _f = discriminant_parts(self.discriminant)
        return d_K * self.conductor**2

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return {
            "discriminant": self.discriminant,
            "character": list(self.character),
            "s": str(self.s),
            "character_conductor": self.conductor,
            "invertible_ideals": self.invertible.to_dict(),
            "primitive": self.primitive.to_dict(),
            "local_factors": [e.to_dict() for e in self.factors],
            "provenance": self.provenance,
        }

    def __repr__(self) -> str:
        return (
            f"RingClassLSeries(D={self.discriminant}, ψ={list(self.character)}, s={self.s}: conductor "
            f"{self.conductor}, L_O = {self.invertible.text()}, L(s, ψ) = {self.primitive.text()})"
        )

    def _repr_html_(self) -> str:
        rows = "".join(f"<li>e<sub>{e.prime}</sub> = {e.text()}</li>" for e in self.factors)
        return (
            f"<p>ψ = {list(self.character)} on Cl({self.discriminant}), s = {self.s}, conductor of ψ "
            f"{self.conductor}:<br>over the invertible ideals <code>{self.invertible.text()}</code><br>"
            f"primitive L(s, ψ) <code>{self.primitive.text()}</code></p><ul>{rows}</ul>"
            f"<p><small>{self.provenance}</small></p>"
        )

    def _repr_latex_(self) -> str:
        return (
            rf"$L_{{\mathcal O}}(s, \psi) = {self.invertible.text()},\ L(s, \psi) = {self.primitive.text()}$"
            rf"\quad(\text{{conductor {self.conductor}; {self.provenance}}})"
        )


def ring_class_l_series(
    D: object, character: Sequence[int], s: object, *, digits: int = 30, bound: object = None
) -> RingClassLSeries:
    """``L_O(s, ψ)`` over the invertible ideals of the order of ``D`` and the primitive ``L(s, ψ)``.

    ``character`` as in :func:`formkit.class_character_l_series`.  For ``D < 0`` any
    ``s`` (``s = 1`` for non-trivial ``ψ``); for ``D > 0`` real ``s > 1``.

    Raises
    ------
    FormkitError
        If the character has the wrong length, at the pole ``s = 1`` of the trivial
        character, or where ``∏ e_p(s, ψ)`` is not certified non-zero.

    Examples
    --------
    >>> r = ring_class_l_series(-44, [1], 2, digits=15)       # Cl(−44) ≅ C3, ψ of conductor 2
    >>> r.conductor, r.primitive.text() == r.invertible.text()
    (2, True)
    """
    from flint import ctx

    D = validate_discriminant(D)
    s = as_complex_argument(s)
    digits = check_digits(digits)
    G, k, phase = character_phase(D, character)
    if D < 0:
        v = class_character_l_series(D, k, s, digits=digits + 5)
    else:
        v = real_class_character_l_series(D, k, s, bound=bound, digits=digits)
    factors = _local_factors(D, phase)
    conductor = math.prod(e.prime**e.conductor_exponent for e in factors)
    with ctx.workprec(bits_for(digits) + 40):
        ep = _product_ball(factors, s)
        if ep.contains(0):
            raise FormkitError(
                f"∏ e_p(s, ψ) at s = {s} is not certified non-zero: the primitive L(s, ψ) is not given"
            )
        prim = _real_if(as_ball(v) / ep, s)
        got = min(v.digits, digits)
        label = "(" + ", ".join(str(x) for x in k) + ")"
        primitive = certified(
            prim,
            got,
            quantity=f"L(s, ψ) (primitive), ψ = {label} on Cl({D}) ≅ {G.structure}",
            s=s,
            method=f"L_O(s, ψ)/∏ e_p(s, ψ); {v.method}",
            terms=v.terms,
        )
        invertible = certified(
            _real_if(as_ball(v), s),
            got,
            quantity=f"L_O(s, ψ) over the invertible ideals, ψ = {label} on Cl({D}) ≅ {G.structure}",
            s=s,
            method=v.method,
            terms=v.terms,
        )
    return RingClassLSeries(D, tuple(k), s, conductor, invertible, primitive, factors, str(G.provenance))
