"""L-series of the characters of a class group, summed over the classes (every order, D < 0 and D > 0).

A character ``ψ`` of ``Cl(D)`` (the narrow class group ``Cl⁺(D)`` for ``D > 0``) is given by
its exponents ``(k₁, …, k_r)``: ``ψ(g_i) = e^(2πi·k_i/n_i)`` on the generators ``g_i`` of
orders ``n_i`` of ``class_group(D)``.  Its series over the invertible ideals of the order of
discriminant ``D`` (a ring class character; for fundamental ``D`` a class group character of
``K``) is read off the classes:

* ``D < 0``: ``L(s, ψ) = (1/w)·Σ_C ψ(C)·Z_C(s)`` with the Epstein zeta functions
  (:func:`formkit.analytic.epstein.epstein_zeta`; ``r_C(n)/w`` counts the ideals of norm
  ``n`` in ``C``), at ``s = 1`` for ``ψ ≠ 1`` through the constant terms of Kronecker's
  limit formula (``Σ_C ψ(C) = 0`` kills the poles) — :func:`class_character_l_series`;
* ``D > 0``: ``L(s, ψ) = Σ_C ψ(C)·ζ(s, C)`` with the partial zeta functions
  (:mod:`formkit.classgroups.narrow_class_zeta`), or continued to every complex ``s`` by its
  functional equation (:mod:`formkit.classgroups.partial_zeta_continuation`) —
  :func:`real_class_character_l_series`.

For an order of conductor ``f > 1`` the series differs from the primitive L-series of
``ψ`` by the factors at ``p | f`` (:mod:`formkit.classgroups.order_series`).  The classes
come from complete enumeration (unconditional); every number is a certified ball.

References
----------
.. [1] D. Zagier, *Zetafunktionen und quadratische Körper*, Springer 1981, §10–12.
.. [2] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §9 (ring class
       fields and their characters).
"""

from __future__ import annotations

from collections.abc import Sequence
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
from ..core.arith import as_int
from ..core.discriminants import unit_count, validate_discriminant
from ..errors import DiscriminantError, FormkitError
from .narrow_class_zeta import _route, partial_zeta_values
from .partial_zeta_continuation import _digits_of, _positive, continued_class_character_l_series
from .series_identity import sum_balls

__all__ = ["class_character_l_series", "real_class_character_l_series"]


def enumerated_classes(D: int):
    """``class_group(D)`` by complete enumeration (unconditional)."""
    from .dispatch import class_group

    return class_group(D, method="enumeration")


def character_phase(D: int, character: Sequence[int] | None):
    """``(G, exponents, phase)`` for the character of ``Cl(D)`` (``Cl⁺(D)`` for ``D > 0``) with these exponents.

    ``phase(x)`` is ``t ∈ [0, 1)`` with ``ψ(x) = e^(2πit)``; ``character=None`` is the
    trivial character.

    Raises
    ------
    FormkitError
        If the number of exponents is not the number of invariants of the group.
    """
    G = enumerated_classes(D)
    inv = G.invariants
    k = [0] * len(inv) if character is None else [as_int(x, "character exponent") for x in character]
    if len(k) != len(inv):
        name = "Cl⁺" if D > 0 else "Cl"
        raise FormkitError(
            f"a character of {name}({D}) ≅ {G.structure} is given by {len(inv)} exponents (one per "
            f"invariant {list(inv)}), not {len(k)}"
        )

    def phase(x) -> Fraction:
        e = G.discrete_log(x)
        return sum((Fraction(ki * ei, ni) for ki, ei, ni in zip(k, e, inv)), Fraction(0)) % 1

    return G, k, phase


def _root_of_unity(t: Fraction):
    from flint import acb, fmpq

    return acb.exp_pi_i(acb(2 * fmpq(t.numerator, t.denominator)))


def class_character_l_series(
    D: object, character: Sequence[int], s: object, *, digits: int = 30
) -> CertifiedValue:
    """``L(s, ψ) = (1/w)·Σ_C ψ(C)·Z_C(s)`` for a character ``ψ`` of the class group of ``D < 0``.

    Parameters
    ----------
    D : int
        A negative discriminant (fundamental or not: for an order, ``ψ`` is a ring
        class character and the series counts its invertible ideals).
    character : sequence of int
        ``(k₁, …, k_r)``: ``ψ(g_i) = e^(2πi·k_i/n_i)`` on the generators ``g_i`` of
        orders ``n_i`` of ``class_group(D)`` (see its ``invariants`` and ``generators``).
    s : number or text
        Any complex ``s ≠ 1`` (``s = 1`` is allowed for non-trivial ``ψ``).
    digits : int
        Significant digits of the result.

    Returns
    -------
    CertifiedValue

    Raises
    ------
    DiscriminantError
        If ``D`` is not negative.
    FormkitError
        If the character has the wrong length, or at ``s = 1`` for the trivial character.

    Examples
    --------
    >>> L = class_character_l_series(-23, [1], 1, digits=15)   # ψ of order 3 on Cl(−23) ≅ C3
    >>> L.text()
    '0.368409320715827'

    References
    ----------
    Zagier, *Zetafunktionen und quadratische Körper*, §10–11.
    """
    from flint import ctx

    D = validate_discriminant(D)
    if D > 0:
        raise DiscriminantError(
            f"the L-series of a class group character is built here from positive definite forms: D must be "
            f"negative, not {D} (for D > 0 use real_class_character_l_series)"
        )
    s = as_complex_argument(s)
    digits = check_digits(digits)
    G, k, phase = character_phase(D, character)
    prov = str(G.provenance)
    trivial = all(phase(x) == 0 for x in G.elements())
    at_one = s.is_integer and s.real == 1
    if at_one and trivial:
        raise FormkitError("s = 1 is the pole of L(s, ψ) for the trivial character ψ (it is ζ_K(s)/… there)")
    w = unit_count(D)
    terms = []
    with ctx.workprec(bits_for(digits) + 30):
        for x in G.elements():
            psi = _root_of_unity(phase(x))
            if at_one:
                # Σψ(C) = 0 kills the poles; use Kronecker's limit formula: ψ-weighted constant terms
                terms.append((psi / w, kronecker_limit(x.form, digits=digits + 5).constant_term))
            else:
                terms.append((psi / w, epstein_zeta(x.form, s, digits=digits + 5)))
    label = "(" + ", ".join(str(v) for v in k) + ")"
    return sum_balls(
        terms,
        digits,
        f"L(s, ψ), ψ = {label} on Cl({D}) ≅ {G.structure}",
        s,
        f"(1/w)·Σ_C ψ(C)·Z_C(s) over {len(terms)} classes ({prov})",
        sum(v.terms for _c, v in terms),
    )


def real_class_character_l_series(
    D: object,
    character: Sequence[int],
    s: object,
    *,
    bound: object = None,
    digits: int = 30,
) -> CertifiedValue:
    """``L(s, ψ) = Σ_C ψ(C)·ζ(s, C)`` for a character ``ψ`` of the narrow class group of ``D > 0``.

    ``character`` gives ``ψ(g_i) = e^(2πi·k_i/n_i)`` on the generators of ``class_group(D)``.
    Without ``bound``: any complex ``s`` (``s ≠ 1`` for ``ψ = 1``), by
    :func:`~formkit.classgroups.partial_zeta_continuation.continued_class_character_l_series`;
    with ``bound``: direct summation (real ``s > 1``).  ``D`` may be the discriminant of an
    order (the series then runs over its invertible ideals).

    Raises
    ------
    DiscriminantError
        If ``D`` is not positive.
    FormkitError
        If the character has the wrong length, at the pole, or (with ``bound``) when the tail
        leaves no certified digit.

    Examples
    --------
    >>> real_class_character_l_series(229, [1], 3, bound=3000, digits=8).text()
    '0.96944'
    >>> real_class_character_l_series(229, [1], 3, digits=12).text()
    '0.969440675897'

    References
    ----------
    Hecke (1917); Zagier, *Zetafunktionen und quadratische Körper*, §13 (see
    :mod:`formkit.classgroups.narrow_class_zeta`).
    """
    from flint import acb, ctx

    D = _positive(D, "the L-series of a narrow class group character")
    s, direct = _route(s, bound)
    digits = check_digits(digits)
    if not direct:
        return continued_class_character_l_series(D, character, s, digits=digits)
    G, k, phase = character_phase(D, character)
    z = partial_zeta_values(D, s, bound=bound, digits=digits)
    with ctx.workprec(bits_for(digits) + 40):
        total = acb(0)
        for x, v in zip(G.elements(), z.values):
            total += _root_of_unity(phase(x)) * as_ball(v)
        ball = total.real if total.imag.contains(0) else total
        got = _digits_of(ball, digits)
        if got < 1:
            raise FormkitError(f"L({s}, ψ) for D = {D}: no certified digit at bound {z.bound}; raise --bound")
        label = "(" + ", ".join(str(v) for v in k) + ")"
        return certified(
            ball,
            got,
            quantity=f"L(s, ψ), ψ = {label} on Cl⁺({D}) ≅ {G.structure}",
            s=s,
            method=f"Σ_C ψ(C)·ζ(s, C) over {len(z.values)} narrow classes; {z.values[0].method}",
            terms=z.bound,
        )
