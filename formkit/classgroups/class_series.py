"""Dirichlet series over the classes of a negative discriminant: ζ_K, ring class and genus characters.

For ``D < 0`` and one positive definite form ``C`` per class, ``r_C(n)/w`` counts the
ideals of norm ``n`` in the class ``C`` (for ``n`` prime to the conductor), so the
Epstein zeta functions (:func:`formkit.analytic.epstein.epstein_zeta`) give:

* ``Σ_C Z_C(s) = w·ζ_K(s) = w·ζ(s)·L(s, χ_D)`` for fundamental ``D`` (Dirichlet;
  Zagier, *Zetafunktionen und quadratische Körper*, §10–11) — :func:`class_zeta_sum`
  computes both sides independently and says whether they agree;
* the L-series of a character ``ψ`` of the class group (a ring class character of the
  order of discriminant ``D``): ``L(s, ψ) = (1/w)·Σ_C ψ(C)·Z_C(s)`` —
  :func:`class_character_l_series`;
* for a *genus character* ``ψ = ψ_{d₁,d₂}`` (``D = d₁·d₂`` with ``d₁, d₂`` fundamental
  discriminants or 1; ``ψ(C) = χ_{d₁}(m) = χ_{d₂}(m)`` for any ``m`` represented by ``C``
  and prime to ``D``) Kronecker's factorisation ``L(s, ψ) = L(s, χ_{d₁})·L(s, χ_{d₂})``
  (Zagier §12, Satz 2, from memory) — :func:`genus_character_l_series` computes both sides;
* the Chowla–Selberg formula ``Σ_C log(√(Im τ_C)·|η(τ_C)|²) = −(h/2)·log(4π√|D|) +
  (w/4)·Σ_{a=1}^{|D|} χ_D(a)·log Γ(a/|D|)`` (Chowla–Selberg 1967; derived from Kronecker's
  limit formula, the identity above at ``s = 1`` and Lerch's formula for ``L'(0, χ)``) —
  :func:`chowla_selberg`; at class number one it gives ``|η(τ)|`` at the single root
  as a product of Γ-values (``|η(i)| = Γ(1/4)/(2π^(3/4))``).

For a non-fundamental ``D = f²·d_K`` (an order of conductor ``f > 1``) the sums over the
classes carry extra factors at the primes ``p | f``: :func:`class_zeta_sum` and
:func:`genus_character_l_series` hand such ``D`` to
:func:`~formkit.classgroups.order_series.order_zeta_sum` and
:func:`~formkit.classgroups.order_series.order_genus_character_l_series`, which state and
check the identity with those factors (same result type).  The L-series of class group
characters are in :mod:`formkit.classgroups.class_character_series` (re-exported here), the
splittings ``D = d₁·d₂`` in :mod:`formkit.classgroups.genus_characters`, the result type in
:mod:`formkit.classgroups.series_identity`.

The classes come from complete enumeration (:func:`formkit.classgroups.dispatch.class_group`
with ``method="enumeration"``), so every statement here is unconditional; all numbers are
certified balls (:mod:`formkit.analytic.balls`).

References
----------
.. [1] D. Zagier, *Zetafunktionen und quadratische Körper*, Springer 1981, §10–12.
.. [2] S. Chowla, A. Selberg, "On Epstein's zeta-function", J. reine angew. Math. 227
       (1967), 86–110.
.. [3] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §9 (ring class fields).
"""

from __future__ import annotations

from fractions import Fraction

from ..analytic.balls import (
    CertifiedValue,
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
    is_fundamental_discriminant,
    unit_count,
    validate_discriminant,
)
from ..errors import DiscriminantError, FormkitError
from .class_character_series import class_character_l_series as class_character_l_series
from .class_character_series import enumerated_classes
from .genus import value_prime_to
from .genus_characters import genus_character_discriminants as genus_character_discriminants
from .genus_characters import prime_discriminants as prime_discriminants
from .order_series import order_genus_character_l_series, order_zeta_sum
from .series_identity import SeriesIdentity as SeriesIdentity
from .series_identity import overlap, sum_balls

# SeriesIdentity, prime_discriminants, genus_character_discriminants and
# class_character_l_series are defined in the modules imported above and stay importable
# from here; the names this module defines are:
__all__ = [
    "class_zeta_sum",
    "genus_character_l_series",
    "chowla_selberg",
]

#: ``chowla_selberg`` sums ``|D|`` values of log Γ.
MAX_CHOWLA_SELBERG_DISCRIMINANT = 10**5


def _negative(D: object, what: str, positive_counterpart: str) -> int:
    D = validate_discriminant(D)
    if D > 0:
        raise DiscriminantError(
            f"{what} is built from positive definite forms: D must be negative, not {D} (for D > 0 use "
            f"{positive_counterpart}, by the partial zeta functions of the narrow classes)"
        )
    return D


def _classes(D: int):
    G = enumerated_classes(D)
    return G, str(G.provenance)


def class_zeta_sum(D: object, s: object, *, digits: int = 30) -> SeriesIdentity:
    """``Σ_C Z_C(s)`` over the classes of ``D < 0``, beside ``w·ζ(s)·L(s, χ_D)`` (times ``∏_{p|f} e_p(s)`` for an order).

    For fundamental ``D`` the right side is ``w·ζ_K(s)``; for ``D = f²·d_K`` with ``f > 1``
    the call is handed to :func:`~formkit.classgroups.order_series.order_zeta_sum`, whose
    right side is ``w·ζ(s)·L(s, χ_{d_K})·∏_{p|f} e_p(s)``.  Either way the two sides are
    computed independently and compared.

    Parameters
    ----------
    D : int
        A negative discriminant.
    s : number or text
        Any complex ``s ≠ 1``.
    digits : int
        Significant digits of both sides.

    Returns
    -------
    SeriesIdentity

    Raises
    ------
    DiscriminantError
        If ``D`` is not a negative discriminant (for ``D > 0`` see
        :func:`formkit.classgroups.partial_zeta.real_class_zeta_sum`).
    FormkitError
        At the pole ``s = 1``.

    Examples
    --------
    >>> r = class_zeta_sum(-23, 2, digits=20)
    >>> r.agrees, r.class_number
    (True, 3)
    >>> r = class_zeta_sum(-12, 2, digits=20)      # the order Z[√−3]: 2(1 + 2^(1−2s))ζ(s)L(s, χ₋₃)
    >>> r.statement, r.agrees
    ('Σ_C Z_C(s) = w·ζ(s)·L(s, χ_-3)·e_2(s)', True)

    References
    ----------
    Zagier, *Zetafunktionen und quadratische Körper*, §10–11.
    """
    D = _negative(D, "Σ_C Z_C(s) = w·ζ_K(s)", "real_class_zeta_sum")
    if not is_fundamental_discriminant(D):
        return order_zeta_sum(D, s, digits=digits)
    s = as_complex_argument(s)
    digits = check_digits(digits)
    G, prov = _classes(D)
    forms = G.forms()
    w = unit_count(D)
    values = [epstein_zeta(f, s, digits=digits + 5) for f in forms]
    left = sum_balls(
        [(1, v) for v in values],
        digits,
        "Σ_C Z_C(s)",
        s,
        "sum of Epstein zeta values",
        sum(v.terms for v in values),
    )
    zk = quadratic_field_zeta(D, s, digits=digits + 5)
    right = sum_balls([(w, zk)], digits, f"w·ζ(s)·L(s, χ_{D})", s, zk.method, zk.terms)
    return SeriesIdentity(
        "Σ_C Z_C(s) = w·ζ(s)·L(s, χ_D)", D, s, left, right, overlap(left, right), len(forms), prov
    )


def genus_character_l_series(D: object, d1: object, s: object, *, digits: int = 30) -> SeriesIdentity:
    """``L(s, ψ_{d₁,d₂})`` by the classes and as ``L(s, χ_{d₁})·L(s, χ_{d₂})`` (``D = d₁·d₂ < 0``).

    For fundamental ``D``, ``d₁`` and ``d₂`` are fundamental (or 1).  For ``D = f²·d_K``
    with ``f > 1`` the call is handed to
    :func:`~formkit.classgroups.order_series.order_genus_character_l_series`: ``d₁``
    fundamental or 1, ``d₂ = D/d₁ ≡ 0, 1 (mod 4)``, and the right side is
    ``L(s, χ_{d₁*})·L(s, χ_{d₂*})·∏_{p|f} e_p(s, ψ)``.

    Parameters
    ----------
    D : int
        A negative discriminant.
    d1 : int
        For fundamental ``D`` one of :func:`~formkit.classgroups.genus_characters.genus_character_discriminants`,
        for an order one of
        :func:`~formkit.classgroups.genus_characters.order_genus_character_discriminants`.
    s : number or text
        Any complex ``s`` (``s ≠ 1`` for the trivial character).
    digits : int
        Significant digits of both sides.

    Returns
    -------
    SeriesIdentity

    Raises
    ------
    DiscriminantError, FormkitError
        If ``D`` is not negative or ``d₁`` does not split it.

    Examples
    --------
    >>> r = genus_character_l_series(-20, 5, 2, digits=20)    # L(2, χ_5)·L(2, χ_−4)
    >>> r.agrees
    True
    >>> r = genus_character_l_series(-36, -3, 2, digits=20)   # an order: L(2, χ₋₃)·L(2, χ₁₂)·e_3
    >>> r.statement.split(" = ")[1], r.agrees
    ('L(s, χ_-3)·L(s, χ_12)·e_3(s, ψ)', True)

    References
    ----------
    Zagier, *Zetafunktionen und quadratische Körper*, §12.
    """
    from flint import ctx

    D = _negative(D, "a genus character L-series", "real_genus_character_l_series")
    if not is_fundamental_discriminant(D):
        return order_genus_character_l_series(D, d1, s, digits=digits)
    s = as_complex_argument(s)
    digits = check_digits(digits)
    d1 = as_int(d1, "d1")
    pairs = {frozenset(p) for p in genus_character_discriminants(D)}
    pair = next((p for p in pairs if d1 in p), None)
    if pair is None:
        raise FormkitError(
            f"{d1} does not split {D} into two fundamental discriminants; choose d1 among "
            f"{sorted({p[0] for p in genus_character_discriminants(D)} | {p[1] for p in genus_character_discriminants(D)})}"
        )
    d2 = D // d1
    G, prov = _classes(D)
    w = unit_count(D)
    at_pole = s.is_integer and s.real == 1
    if at_pole and 1 in (d1, d2):
        raise FormkitError(f"s = 1 is the pole of L(s, ψ) = ζ(s)·L(s, χ_{D}) for the trivial genus character")
    terms = []
    for x in G.elements():
        m, _, _ = value_prime_to(x.form, D)
        psi = kronecker(d1, m)
        if at_pole:
            terms.append((Fraction(psi, w), kronecker_limit(x.form, digits=digits + 5).constant_term))
        else:
            terms.append((Fraction(psi, w), epstein_zeta(x.form, s, digits=digits + 5)))
    from flint import fmpq

    left = sum_balls(
        [(fmpq(c.numerator, c.denominator), v) for c, v in terms],
        digits,
        "(1/w)·Σ_C ψ(C)·Z_C(s)",
        s,
        f"Epstein zeta values of {len(terms)} classes",
        sum(v.terms for _c, v in terms),
    )

    def factor(d: int) -> CertifiedValue:
        return riemann_zeta(s, digits=digits + 5) if d == 1 else l_series(d, s, digits=digits + 5)

    f1, f2 = factor(d1), factor(d2)
    with ctx.workprec(bits_for(digits) + 30):
        prod = as_ball(f1) * as_ball(f2)
        ball = prod.real if s.is_real else prod
        right = certified(
            ball,
            digits,
            quantity=f"L(s, χ_{d1})·L(s, χ_{d2})",
            s=s,
            method=f1.method,
            terms=f1.terms + f2.terms,
        )
    return SeriesIdentity(
        f"L(s, ψ) = L(s, χ_{d1})·L(s, χ_{d2})", D, s, left, right, overlap(left, right), len(terms), prov
    )


def chowla_selberg(D: object, *, digits: int = 30) -> SeriesIdentity:
    """Both sides of the Chowla–Selberg formula for a fundamental ``D < 0`` (as products).

    Left: ``∏_C √(Im τ_C)·|η(τ_C)|²`` over the reduced forms of the classes; right:
    ``(4π√|D|)^(−h/2)·∏_{a=1}^{|D|} Γ(a/|D|)^(w·χ_D(a)/4)``.  At class number one the
    left side is the single value ``√(Im τ)·|η(τ)|²`` of the principal form.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a negative fundamental discriminant or ``|D| > 10^5``.

    Examples
    --------
    >>> r = chowla_selberg(-4, digits=15)     # |η(i)|² = Γ(1/4)²/(4π^(3/2))
    >>> r.agrees, r.right.text()
    (True, '0.590170299508048')
    """
    from flint import arb, ctx, fmpq

    from ..analytic.eta import _eta_ball, form_root

    D = validate_discriminant(D)
    if D > 0:
        raise DiscriminantError(
            f"the Chowla–Selberg formula expresses η at the CM points of a discriminant D < 0 by Γ-values "
            f"(Lerch's formula for L'(0, χ_D), χ_D odd); it has no counterpart for D = {D} > 0, whose forms "
            "are indefinite (for real quadratic classes see the partial zeta functions, formkit epstein D S --classes)"
        )
    if not is_fundamental_discriminant(D):
        raise DiscriminantError(
            f"the Chowla–Selberg formula is stated here for fundamental discriminants (Lerch's formula for "
            f"L'(0, χ_D) with χ_D primitive); {D} is not fundamental"
        )
    digits = check_digits(digits)
    q = -D
    if q > MAX_CHOWLA_SELBERG_DISCRIMINANT:
        raise DiscriminantError(
            f"the Chowla–Selberg product runs over |D| Γ-values; |D| ≤ {MAX_CHOWLA_SELBERG_DISCRIMINANT}, not {q}"
        )
    G, prov = _classes(D)
    h, w = G.order, unit_count(D)
    s0 = as_complex_argument(0)
    prec = bits_for(digits) + 40 + 2 * q.bit_length()
    with ctx.workprec(prec):
        left = arb(0)
        for f in G.forms():
            tau = form_root(f)
            left += (tau.imag.sqrt() * abs(_eta_ball(tau, prec)) ** 2).log()
        right = -arb(h) / 2 * (4 * arb.pi() * arb(q).sqrt()).log()
        acc = arb(0)
        for a in range(1, q):
            c = kronecker(D, a)
            if c:
                acc += c * arb.gamma_fmpq(fmpq(a, q)).log()
        right += arb(w) / 4 * acc
        lv = certified(
            left.exp(),
            digits,
            quantity="∏_C √(Im τ_C)·|η(τ_C)|²",
            s=s0,
            method=f"η by the pentagonal series at {h} roots ({prov})",
            terms=h,
        )
        rv = certified(
            right.exp(),
            digits,
            quantity="(4π√|D|)^(−h/2)·∏ Γ(a/|D|)^(w·χ(a)/4)",
            s=s0,
            method=f"{q - 1} Γ-values at rationals, ball arithmetic",
            terms=q - 1,
        )
        agrees = bool(left.overlaps(right))
    return SeriesIdentity("Chowla–Selberg formula", D, s0, lv, rv, agrees, h, prov)
