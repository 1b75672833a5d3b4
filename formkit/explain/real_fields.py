"""Worked example for D > 0: the continued fraction behind the fundamental unit, narrow
against wide class numbers.

With ``ω₀ = (P₀ + √D)/2`` (``P₀ = 0`` for ``D ≡ 0``, ``1`` for ``D ≡ 1 (mod 4)``) the
continued fraction algorithm ``a_k = ⌊x_k⌋``, ``P_{k+1} = a_k Q_k − P_k``,
``Q_{k+1} = (D − P_{k+1}²)/Q_k`` keeps ``x_k = (P_k + √D)/Q_k`` with ``Q_k | D − P_k²``;
from ``x₁`` on it is purely periodic, and the product of the complete quotients over one
period, ``x₁ ⋯ x_ℓ``, is the fundamental unit of the order of discriminant ``D``, of norm
``(−1)^ℓ`` (Cohen GTM 138, §5.7 (Algorithm 5.7.2); Buchmann–Vollmer, *Binary Quadratic
Forms*, §6.4; from memory).  The product is computed exactly here and compared with
:func:`formkit.core.discriminants.fundamental_unit` (the cycle of reduced forms); the
sentence is printed only when they agree.  The narrow class number is ``h⁺ = h`` when
``N(ε) = −1`` and ``2h`` otherwise.
"""

from __future__ import annotations

from math import gcd

from ..classgroups.dispatch import class_group
from ..core.arith import isqrt
from ..core.discriminants import fundamental_unit
from .document import Block, Heading, Math, Paragraph, para, text

__all__ = ["continued_fraction_period", "real_field_blocks"]

#: Partial quotients printed (the rest are counted).
QUOTIENTS_SHOWN = 40


def continued_fraction_period(D: int) -> tuple[int, list[int], tuple[int, int]]:
    """``(a0, period, (t, u))``: the continued fraction of ``(P₀ + √D)/2`` and the product
    ``(t + u√D)/2`` of the complete quotients over one period.

    Examples
    --------
    >>> continued_fraction_period(4 * 7)       # √7 = [2; 1, 1, 1, 4], 8 + 3√7
    (2, [1, 1, 1, 4], (16, 3))
    >>> continued_fraction_period(5)           # (1 + √5)/2 = [1; 1], unit (1 + √5)/2
    (1, [1], (1, 1))
    """
    s = isqrt(D)
    P, Q = D % 2, 2
    a0 = int((P + s) // Q)
    quotients: list[int] = []
    P, Q = a0 * Q - P, (D - (a0 * Q - P) ** 2) // Q
    start = (P, Q)
    A, B, den = 1, 0, 1  # running product (A + B√D)/den
    while True:
        a = (P + s) // Q if Q > 0 else (P + s + 1) // Q - 1
        quotients.append(int(a))
        A, B, den = A * P + B * D, A + B * P, den * Q
        g = gcd(gcd(A, B), den)
        A, B, den = A // g, B // g, den // g
        P = a * Q - P
        Q = (D - P * P) // Q
        if start == (P, Q):
            break
    # (A + B√D)/den = (t + u√D)/2
    if 2 % den == 0:
        return a0, quotients, (int(A * (2 // den)), int(B * (2 // den)))
    return a0, quotients, (0, 0)  # pragma: no cover - not of the form (t + u√D)/2


def real_field_blocks(D: int) -> tuple[list[Block], dict]:
    """The continued fraction, the fundamental unit and narrow against wide for ``D > 0``."""
    a0, period, (t, u) = continued_fraction_period(D)
    eps = fundamental_unit(D)
    G = class_group(D)
    ell = len(period)
    blocks: list[Block] = [Heading(2, "The fundamental unit and its continued fraction")]
    w = "sqrt(D)/2" if D % 4 == 0 else "(1 + sqrt(D))/2"
    shown = ", ".join(map(str, period[:QUOTIENTS_SHOWN])) + (", ..." if ell > QUOTIENTS_SHOWN else "")
    cf = Math(rf"[{a0};\ \overline{{{shown}}}]", f"[{a0}; ({shown}) repeated]")
    blocks.append(
        Paragraph(
            text(f"The continued fraction of @omega = {w}@ is ")
            + (cf,)
            + text(
                f", with period length @l = {ell}@ (the complete quotients @x_k = (P_k + sqrt(D))/q_k@ are purely "
                "periodic from @x_1@)."
            )
        )
    )
    agree = (t, u) == (eps.t, eps.u)
    digits = len(str(eps.t))
    unit = (
        f"@epsilon = ({eps.t} + {eps.u} sqrt({D}))/2@"
        if digits <= 60
        else f"@epsilon = (t + u sqrt({D}))/2@ with @t@ of {digits} digits"
    )
    if agree:
        blocks.append(
            para(
                f"The product @x_1 · x_2 ··· x_l@ of the complete quotients over one period is the fundamental unit {unit} "
                f"of the order of discriminant @{D}@ (equal to the unit found from the cycle of the principal "
                f"form), of norm @(-1)^l = {eps.norm:+d}@."
            )
        )
    else:  # pragma: no cover - would contradict the theorem; say only what is known
        blocks.append(
            para(f"The fundamental unit of the order of discriminant @{D}@ is {unit}, of norm {eps.norm:+d}.")
        )
    h, hn = G.class_number_wide, G.class_number_narrow
    if eps.norm == -1:
        nw = (
            "Since @N(epsilon) = -1@, each wide class (ideals up to principal ideals) is a single narrow class "
            f"(ideals up to principal ideals with a totally positive generator): @h^+ = h = {h}@."
        )
    else:
        nw = (
            "Since @N(epsilon) = +1@, no unit has norm @-1@, so each wide class (ideals up to principal ideals) "
            "is two narrow classes (ideals up to principal ideals with a totally positive generator): "
            f"@h^+ = 2h = {hn}@ with @h = {h}@."
        )
    if (eps.norm == -1 and hn == h) or (eps.norm == 1 and hn == 2 * h):
        blocks.append(para(nw))
    data = {
        "a0": a0,
        "period": period,
        "period_length": ell,
        "unit": [eps.t, eps.u],
        "unit_norm": eps.norm,
        "product_is_unit": agree,
        "class_number": h,
        "class_number_narrow": hn,
    }
    return blocks, data
