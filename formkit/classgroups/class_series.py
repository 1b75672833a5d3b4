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
from ..analytic.epstein import epstein_zeta
from ..analytic.l_series import l_series, quadratic_field_zeta, riemann_zeta
from ..core.arith import as_int, kronecker
from ..core.discriminants import (
    is_fundamental_discriminant,
    unit_count,
    validate_discriminant,
)
from ..core.factorisation import prime_factorisation
from ..errors import DiscriminantError, FormkitError
from .genus import value_prime_to

__all__ = [
    "SeriesIdentity",
    "prime_discriminants",
    "genus_character_discriminants",
    "class_zeta_sum",
    "class_character_l_series",
    "genus_character_l_series",
    "chowla_selberg",
]

#: ``chowla_selberg`` sums ``|D|`` values of log Γ.
MAX_CHOWLA_SELBERG_DISCRIMINANT = 10**5


@dataclass(frozen=True)
class SeriesIdentity:
    """Two independent certified computations of one number, and whether they agree.

    ``left`` is the side computed from the classes (Epstein zeta functions or η-values),
    ``right`` the side from the factorisation or closed formula; ``agrees`` is True when
    their error intervals overlap.  ``provenance`` says how the classes were obtained.
    """

    statement: str
    discriminant: int
    s: ComplexArgument
    left: CertifiedValue
    right: CertifiedValue
    agrees: bool
    class_number: int
    provenance: str

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return {
            "statement": self.statement,
            "discriminant": self.discriminant,
            "s": str(self.s),
            "by_classes": self.left.to_dict(),
            "by_formula": self.right.to_dict(),
            "agrees": self.agrees,
            "class_number": self.class_number,
            "provenance": self.provenance,
        }

    def __repr__(self) -> str:
        return (
            f"SeriesIdentity({self.statement} at s = {self.s}, D = {self.discriminant}: "
            f"{self.left.text()} (classes) vs {self.right.text()} (formula): "
            f"{'agree' if self.agrees else 'DISAGREE'}; {self.provenance})"
        )

    def _repr_html_(self) -> str:
        return (
            f"<p><b>{self.statement}</b>, D = {self.discriminant}, s = {self.s}:<br>"
            f"by classes <code>{self.left.text()}</code><br>by formula <code>{self.right.text()}</code><br>"
            f"{'agree' if self.agrees else 'DISAGREE'}; <small>{self.provenance}</small></p>"
        )

    def _repr_latex_(self) -> str:
        return (
            rf"$\text{{{self.statement}}}:\ {self.left.text()} \approx {self.right.text()}$"
            rf"\quad\text{{({'agree' if self.agrees else 'disagree'}; {self.provenance})}}"
        )


def _negative(D: object, what: str, fundamental: bool = False) -> int:
    D = validate_discriminant(D)
    if D > 0:
        raise DiscriminantError(f"{what} is built from positive definite forms: D must be negative, not {D}")
    if fundamental and not is_fundamental_discriminant(D):
        raise DiscriminantError(
            f"{what} is stated for fundamental discriminants; {D} is not fundamental (for an order use "
            "order_zeta_sum or order_genus_character_l_series, which add the factors at p | f)"
        )
    return D


def _classes(D: int):
    from .dispatch import class_group

    G = class_group(D, method="enumeration")
    return G, str(G.provenance)


def prime_discriminants(D: object) -> tuple[int, ...]:
    """The prime discriminants whose product is the fundamental discriminant ``D``.

    ``p* = (−1)^((p−1)/2)·p`` for each odd prime ``p | D`` and one of ``−4, 8, −8`` for 2
    (Zagier, *Zetafunktionen und quadratische Körper*, §12; from memory).

    Examples
    --------
    >>> prime_discriminants(-84), prime_discriminants(-20), prime_discriminants(5)
    ((-3, -7, -4), (5, -4), (5,))
    """
    D = validate_discriminant(D)
    if not is_fundamental_discriminant(D):
        raise DiscriminantError(f"prime discriminants factor fundamental discriminants; {D} is not one")
    out = []
    rest = D
    for p in sorted(prime_factorisation(abs(D))):
        if p == 2:
            continue
        ps = p if p % 4 == 1 else -p
        out.append(ps)
        rest //= ps
    if rest != 1:
        out.append(rest)  # −4, 8 or −8
    return tuple(out)


def genus_character_discriminants(D: object) -> tuple[tuple[int, int], ...]:
    """The pairs ``(d₁, d₂)``, ``d₁·d₂ = D``, one per genus character of a fundamental ``D``.

    ``d₁`` runs over the products of the prime discriminants not involving the last one
    (so each unordered pair appears once); the trivial character ``(1, D)`` comes first.

    Examples
    --------
    >>> genus_character_discriminants(-20)
    ((1, -20), (5, -4))
    >>> len(genus_character_discriminants(-420))   # 2^(μ−1) with μ = 4
    8
    """
    primes = prime_discriminants(D)
    D = validate_discriminant(D)
    head = primes[:-1]
    pairs = []
    for mask in range(1 << len(head)):
        d1 = 1
        for i, p in enumerate(head):
            if mask >> i & 1:
                d1 *= p
        pairs.append((d1, D // d1))
    return tuple(sorted(pairs, key=lambda t: (abs(t[0]), t[0])))


def _sum_balls(terms, digits: int, quantity: str, s: ComplexArgument, method: str, terms_count: int):
    from flint import acb, ctx

    with ctx.workprec(bits_for(digits) + 30):
        total = acb(0)
        for coefficient, value in terms:
            total += coefficient * as_ball(value)
        real = total.imag.contains(0) and s.is_real
        ball = total.real if real else total
        return certified(ball, digits, quantity=quantity, s=s, method=method, terms=terms_count)


def class_zeta_sum(D: object, s: object, *, digits: int = 30) -> SeriesIdentity:
    """``Σ_C Z_C(s)`` over the classes of a fundamental ``D < 0``, beside ``w·ζ(s)·L(s, χ_D)``.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a negative fundamental discriminant.
    FormkitError
        At the pole ``s = 1``.

    Examples
    --------
    >>> r = class_zeta_sum(-23, 2, digits=20)
    >>> r.agrees, r.class_number
    (True, 3)
    """
    D = _negative(D, "Σ_C Z_C(s) = w·ζ_K(s)", fundamental=True)
    s = as_complex_argument(s)
    digits = check_digits(digits)
    G, prov = _classes(D)
    forms = G.forms()
    w = unit_count(D)
    values = [epstein_zeta(f, s, digits=digits + 5) for f in forms]
    left = _sum_balls(
        [(1, v) for v in values],
        digits,
        "Σ_C Z_C(s)",
        s,
        "sum of Epstein zeta values",
        sum(v.terms for v in values),
    )
    zk = quadratic_field_zeta(D, s, digits=digits + 5)
    right = _sum_balls([(w, zk)], digits, f"w·ζ(s)·L(s, χ_{D})", s, zk.method, zk.terms)
    return SeriesIdentity(
        "Σ_C Z_C(s) = w·ζ(s)·L(s, χ_D)", D, s, left, right, _overlap(left, right), len(forms), prov
    )


def _overlap(a: CertifiedValue, b: CertifiedValue) -> bool:
    from flint import ctx

    with ctx.workprec(bits_for(max(a.digits, b.digits)) + 30):
        return bool(as_ball(a).overlaps(as_ball(b)))


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
    """
    from flint import acb, ctx, fmpq

    D = _negative(D, "the L-series of a class group character")
    s = as_complex_argument(s)
    digits = check_digits(digits)
    G, prov = _classes(D)
    inv = G.invariants
    k = [int(x) for x in character]
    if len(k) != len(inv):
        raise FormkitError(
            f"a character of Cl({D}) ≅ {G.structure} is given by {len(inv)} exponents (one per "
            f"invariant {list(inv)}), not {len(k)}"
        )
    trivial = all(ki % ni == 0 for ki, ni in zip(k, inv))
    if s.is_integer and s.real == 1 and trivial:
        raise FormkitError("s = 1 is the pole of L(s, ψ) for the trivial character ψ (it is ζ_K(s)/… there)")
    w = unit_count(D)
    terms = []
    with ctx.workprec(bits_for(digits) + 30):
        for x in G.elements():
            e = G.discrete_log(x)
            phase = sum((Fraction(ki * ei, ni) for ki, ei, ni in zip(k, e, inv)), Fraction(0))
            psi = acb.exp_pi_i(acb(2 * fmpq(phase.numerator, phase.denominator)))
            if s.is_integer and s.real == 1:
                # Σψ(C) = 0 kills the poles; use Kronecker's limit formula: ψ-weighted constant terms
                from ..analytic.epstein import kronecker_limit

                terms.append((psi / w, kronecker_limit(x.form, digits=digits + 5).constant_term))
            else:
                terms.append((psi / w, epstein_zeta(x.form, s, digits=digits + 5)))
    label = "(" + ", ".join(str(v) for v in k) + ")"
    value = _sum_balls(
        terms,
        digits,
        f"L(s, ψ), ψ = {label} on Cl({D}) ≅ {G.structure}",
        s,
        f"(1/w)·Σ_C ψ(C)·Z_C(s) over {len(terms)} classes ({prov})",
        sum(v.terms for _c, v in terms),
    )
    return value


def genus_character_l_series(D: object, d1: object, s: object, *, digits: int = 30) -> SeriesIdentity:
    """``L(s, ψ_{d₁,d₂})`` by the classes and as ``L(s, χ_{d₁})·L(s, χ_{d₂})`` (``D = d₁·d₂`` fundamental).

    Parameters
    ----------
    D : int
        A negative fundamental discriminant.
    d1 : int
        A fundamental discriminant (or 1) dividing ``D`` with ``D/d₁`` fundamental
        (or 1): one of :func:`genus_character_discriminants`.

    Raises
    ------
    DiscriminantError, FormkitError
        If ``D`` is not negative fundamental or ``d₁`` does not split it.

    Examples
    --------
    >>> r = genus_character_l_series(-20, 5, 2, digits=20)    # L(2, χ_5)·L(2, χ_−4)
    >>> r.agrees
    True
    """
    from flint import ctx

    D = _negative(D, "a genus character L-series", fundamental=True)
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
            from ..analytic.epstein import kronecker_limit

            terms.append((Fraction(psi, w), kronecker_limit(x.form, digits=digits + 5).constant_term))
        else:
            terms.append((Fraction(psi, w), epstein_zeta(x.form, s, digits=digits + 5)))
    from flint import fmpq

    left = _sum_balls(
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
        f"L(s, ψ) = L(s, χ_{d1})·L(s, χ_{d2})", D, s, left, right, _overlap(left, right), len(terms), prov
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
    D = _negative(D, "the Chowla–Selberg formula", fundamental=True)
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
