"""Partial zeta functions ζ(s, C) of the narrow ideal classes of a real quadratic order (D > 0).

For ``D < 0`` the ideals of a class are counted by the Epstein zeta function of a form
(:mod:`formkit.classgroups.class_series`); for ``D > 0`` the form is indefinite, every
number it represents is represented infinitely often (the automorphs), and
``Σ' Q(x, y)^(−s)`` is no sum at all.  The analogue (Dedekind, Hecke) is the partial zeta
function of a narrow class ``C`` of invertible ideals of the order ``O_D``,

    ζ(s, C) = Σ_{𝔞 ∈ C} N(𝔞)^(−s)        (Re s > 1),

equivalently the sum over the representations ``Q(x, y) > 0`` modulo the proper
automorphs.  Here it is summed directly:

* every ideal is ``m·𝔟`` with ``m ≥ 1`` and ``𝔟`` primitive, in the same narrow class
  (``m`` is totally positive) and invertible together, so ``ζ(s, C) = ζ(2s)·Σ_{𝔟 ∈ C
  primitive} N(𝔟)^(−s)``;
* the primitive ideals of norm ``a`` are the lattices ``[a, (−b + √D)/2]`` with
  ``b mod 2a``, ``b² ≡ D (mod 4a)`` (Cohen, GTM 138, §5.2, from memory); it is
  invertible iff the form ``(a, b, c)``, ``c = (b² − D)/4a``, is primitive, and its
  narrow class corresponds to the proper class of that form (up to inversion, which
  does not change ``ζ(s, C)``: the conjugate ideal has the same norm and the inverse
  class);
* all ``a ≤ X`` are listed (square roots modulo ``4a``), the class of each form found
  in the enumerated class group, and ``Σ a^(−s)`` summed in ball arithmetic.

**Tail bound.**  The number ``ρ(a)`` of ``b mod 2a`` is half the number of square roots
of ``D`` modulo ``4a``; modulo ``p^j`` with ``p^v ∥ D`` there are at most ``2p^⌊v/2⌋``
(odd ``p``) and ``4·2^⌊v/2⌋`` (``p = 2``) roots, so ``ρ(a) ≤ 2M·2^ω(a) ≤ 2M·τ(a)`` with
``M`` the largest integer whose square divides ``D``.  With ``Σ_{n ≤ t} τ(n) ≤ t(1 + log t)``
and partial summation the primitive ideals of norm ``> X`` of *all* classes add at most

    T(X, s) = 2M·s·X^(1−s)/(s − 1)·(log X + 1 + 1/(s − 1))      (real s > 1),

so ``ζ(s, C) ∈ ζ(2s)·(S_C(X) + [0, T])``.  The tail decays only like ``X^(1−s)·log X``:
this is a direct summation, good for a few digits at ``s = 2`` and more for larger
``s``; the digits that the bound certifies are the ones reported.  This route is taken
when a ``bound`` is given.

**Analytic continuation** (the default, no ``bound``): every ``ζ(s, C)`` and ``L(s, ψ)`` at
any complex ``s ≠ 1``, from the functional equation ``Λ(s, ψ) = Λ(1 − s, ψ̄)`` of the class
character L-series and a rapidly convergent smoothed sum
(:mod:`formkit.classgroups.partial_zeta_continuation`, where ``W(ψ) = 1`` is proved for
every order and the cuts are bounded explicitly).

**Checks and characters.**  For fundamental ``D > 0``, ``Σ_C ζ(s, C) = ζ_K(s) =
ζ(s)·L(s, χ_D)`` (:func:`real_class_zeta_sum`, the right side from
:func:`formkit.analytic.l_series.quadratic_field_zeta`).  A character ``ψ`` of the narrow
class group (a ring class character; ``ψ`` and ``ψ̄`` give the same series at real
``s``) has ``L(s, ψ) = Σ_C ψ(C)·ζ(s, C)`` (:func:`real_class_character_l_series`); for a
genus character ``ψ_{d₁,d₂}`` Kronecker's factorisation ``L(s, ψ) = L(s, χ_{d₁})·L(s, χ_{d₂})``
holds as for ``D < 0`` (:func:`real_genus_character_l_series`).  The Chowla–Selberg
formula has no analogue here: it is a statement about η at CM points (``D < 0``).

References
----------
.. [1] E. Hecke, "Über die Kroneckersche Grenzformel für reelle quadratische Körper und
       die Klassenzahl relativ-Abelscher Körper", Verh. Naturf. Ges. Basel 28 (1917)
       (partial zeta functions of real quadratic classes; from memory).
.. [2] D. Zagier, *Zetafunktionen und quadratische Körper*, Springer 1981, §10–13.
.. [3] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.2 (ideals of quadratic orders and forms).
.. [4] T. M. Apostol, *Introduction to Analytic Number Theory*, Springer 1976, Thm 3.3
       (``Σ_{n ≤ x} τ(n) = x log x + O(x)``; the bound ``t(1 + log t)`` from
       ``Σ_{d ≤ t} ⌊t/d⌋``).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, replace
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
from ..core.factorisation import prime_factorisation
from ..core.forms import Form, FormLike, as_form
from ..core.modular_roots import sqrt_mod
from ..errors import DiscriminantError, FormkitError
from .class_series import SeriesIdentity, genus_character_discriminants
from .partial_zeta_continuation import _digits_of
from .partial_zeta_continuation import _positive as _positive_discriminant

__all__ = [
    "DEFAULT_IDEAL_NORM_BOUND",
    "MAX_IDEAL_NORM_BOUND",
    "PartialZetaValues",
    "partial_zeta_values",
    "partial_zeta",
    "real_class_zeta_sum",
    "real_class_character_l_series",
    "real_genus_character_l_series",
]

#: Ideals of norm up to this bound are listed by default (about 1 s here for D ≈ 10^3).
DEFAULT_IDEAL_NORM_BOUND = 20_000

#: The largest bound accepted (about a minute of square roots and class look-ups).
MAX_IDEAL_NORM_BOUND = 10**6


def _positive(D: object, what: str, fundamental: bool = False) -> int:
    D = _positive_discriminant(D, what)
    if fundamental and not is_fundamental_discriminant(D):
        raise DiscriminantError(
            f"{what} is stated for fundamental discriminants; {D} is not fundamental (for an order use "
            "order_zeta_sum or order_genus_character_l_series, which add the factors at p | f)"
        )
    return D


def _route(s: object, bound: object) -> tuple[ComplexArgument, bool]:
    """``(s, direct)``: direct summation when a ``bound`` is given, else the analytic continuation."""
    s = as_complex_argument(s)
    if bound is None:
        return s, False
    if not (s.is_real and s.real > 1):
        raise FormkitError(
            f"a bound on the ideal norms selects direct summation, which converges for real s > 1 only; "
            f"s = {s} is not (leave the bound out: the analytic continuation takes any s ≠ 1)"
        )
    return s, True


def _square_part(D: int) -> int:
    m = 1
    for p, e in prime_factorisation(abs(D)).items():
        m *= p ** (e // 2)
    return m


@dataclass(frozen=True)
class PartialZetaValues:
    """``ζ(s, C)`` for every narrow class ``C`` of discriminant ``D > 0``, by direct summation.

    ``classes[i]`` is the reduced form of the class (as in ``class_group(D)``),
    ``values[i]`` the certified ``ζ(s, C)``, ``ideal_counts[i]`` the number of primitive
    invertible ideals of norm ``≤ bound`` found in it; ``tail_bound`` is ``ζ(2s)·T(X, s)``
    (module docstring), the width of every interval.
    """

    discriminant: int
    s: ComplexArgument
    bound: int
    classes: tuple[Form, ...]
    values: tuple[CertifiedValue, ...]
    ideal_counts: tuple[int, ...]
    tail_bound: float
    provenance: str

    def value(self, form: FormLike) -> CertifiedValue:
        """``ζ(s, C)`` for the class of ``form``."""
        from .dispatch import class_group

        G = class_group(self.discriminant, method="enumeration")
        x = G(form)
        for f, v in zip(self.classes, self.values):
            if G(f) == x:
                return v
        raise FormkitError(f"{form!r} is in no class of {self.discriminant}")  # pragma: no cover

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return {
            "discriminant": self.discriminant,
            "s": str(self.s),
            "bound": self.bound,
            "tail_bound": f"{self.tail_bound:.3e}",
            "classes": [
                {"form": f.to_list(), "ideals": n, "zeta": v.to_dict()}
                for f, v, n in zip(self.classes, self.values, self.ideal_counts)
            ],
            "provenance": self.provenance,
        }

    def __repr__(self) -> str:
        return (
            f"PartialZetaValues(D={self.discriminant}, s={self.s}, ideals of norm ≤ {self.bound}: "
            + ", ".join(f"({f.a}, {f.b}, {f.c}): {v.text()}" for f, v in zip(self.classes, self.values))
            + f"; tail ≤ {self.tail_bound:.1e})"
        )

    def _repr_html_(self) -> str:
        rows = "".join(
            f"<tr><td>({f.a}, {f.b}, {f.c})</td><td><code>{v.text()}</code></td><td>{n}</td></tr>"
            for f, v, n in zip(self.classes, self.values, self.ideal_counts)
        )
        return (
            f"<p>ζ(s, C) for D = {self.discriminant}, s = {self.s} (ideals of norm ≤ {self.bound}, "
            f"tail ≤ {self.tail_bound:.1e}):</p><table><tr><th>class</th><th>ζ(s, C)</th><th>ideals</th></tr>"
            f"{rows}</table><p><small>{self.provenance}</small></p>"
        )

    def _repr_latex_(self) -> str:
        body = r",\ ".join(f"{v.text()}" for v in self.values)
        return rf"$\zeta(s, C) = {body}$ \quad(\text{{{self.provenance}}})"


def _ideal_sums(D: int, s: ComplexArgument, X: int, prec: int):
    """Per class: ``(Σ_{𝔟 ∈ C primitive, N𝔟 ≤ X} N𝔟^(−s) as an arb, count)``; the group."""
    from flint import arb, ctx

    from ..core.enumeration import _factor_with, _spf_sieve
    from .dispatch import class_group

    G = class_group(D, method="enumeration")
    index = {x: i for i, x in enumerate(G.elements())}
    h = len(index)
    counts = [0] * h
    spf = _spf_sieve(4 * X)
    with ctx.workprec(prec):
        sums = [arb(0) for _ in range(h)]
        minus_s = -s.ball()
        for a in range(1, X + 1):
            factors = _factor_with(spf, 4 * a)
            roots = {r % (2 * a) for r in sqrt_mod(D, 4 * a, factors)}
            if not roots:
                continue
            power = (minus_s * arb(a).log()).exp()
            for b in roots:
                c = (b * b - D) // (4 * a)
                if math.gcd(a, b, c) != 1:
                    continue  # not invertible
                i = index[G((a, b, c))]
                sums[i] += power
                counts[i] += 1
    return G, sums, counts


def partial_zeta_values(D: object, s: object, *, bound: object = None, digits: int = 30) -> PartialZetaValues:
    """``ζ(s, C) = Σ_{𝔞 ∈ C} N(𝔞)^(−s)`` (continued analytically) for every narrow class of ``D > 0``.

    Without ``bound``: the analytic continuation by the functional equation of the class
    character L-series (:mod:`formkit.classgroups.partial_zeta_continuation`), any complex
    ``s ≠ 1`` with ``|Im s| ≤ 100``; ``bound`` is then the largest norm summed and
    ``tail_bound`` 0 (the cuts are inside each ball).  With ``bound``: direct summation over
    the ideals of norm ``≤ bound`` (real ``s > 1``; module docstring).

    Parameters
    ----------
    D : int
        A positive non-square discriminant (fundamental or not: the invertible ideals of
        the order of discriminant ``D``).
    s : number or text
        Any complex ``s ≠ 1`` (``"1/2+14i"``, ``-3``); with ``bound``, a real ``s > 1``.
    bound : int, optional
        ``X``: direct summation over the primitive ideals of norm ``≤ X`` (at most 10^6;
        the CLI's default is 20000).
    digits : int
        The most digits reported; fewer when the tail bound does not allow them.

    Returns
    -------
    PartialZetaValues

    Raises
    ------
    DiscriminantError
        If ``D`` is not a positive discriminant.
    FormkitError
        At ``s = 1``; with ``bound``, if ``s`` is not real ``> 1``, ``bound`` is out of
        range, or the tail bound leaves no certified digit.

    Examples
    --------
    >>> z = partial_zeta_values(12, 4, bound=2000, digits=8)
    >>> [f.to_list() for f in z.classes], [v.text() for v in z.values]     # h⁺(12) = 2
    ([[1, 2, -2], [-1, 2, 2]], ['1.0049347', '0.07530141'])
    >>> [v.text() for v in partial_zeta_values(12, 4, digits=12).values]    # continuation
    ['1.00493467851', '0.0753014029058']
    >>> partial_zeta_values(5, -1).values[0].text()                      # ζ_K(−1) = 1/30 for Q(√5)
    '0.0333333333333333333333333333333'
    """
    from flint import arb, ctx

    from .partial_zeta_continuation import continued_partial_zeta

    D = _positive(D, "the partial zeta function ζ(s, C)")
    s, direct = _route(s, bound)
    digits = check_digits(digits)
    if not direct:
        forms, vals, N, counts, prov = continued_partial_zeta(D, s, digits=digits)
        return PartialZetaValues(
            D,
            s,
            N,
            forms,
            vals,
            counts,
            0.0,
            f"{prov}; analytic continuation (functional equation), norms ≤ {N}",
        )
    X = as_int(bound, "bound")
    if not 1 <= X <= MAX_IDEAL_NORM_BOUND:
        raise FormkitError(f"bound must lie in [1, {MAX_IDEAL_NORM_BOUND}], not {X}")
    prec = bits_for(digits) + 40
    G, sums, counts = _ideal_sums(D, s, X, prec)
    M = _square_part(D)
    z2 = riemann_zeta(s * 2, digits=digits + 5)
    values = []
    with ctx.workprec(prec):
        sb = s.ball()
        lx = arb(X).log()
        T = 2 * M * sb / (sb - 1) * ((1 - sb) * lx).exp() * (lx + 1 + 1 / (sb - 1))
        zeta2 = as_ball(z2).real
        tail = float(T.upper()) * float(zeta2.upper())
        quantity_forms = [x.form for x in G.elements()]
        for f, part in zip(quantity_forms, sums):
            ball = zeta2 * (part + T / 2 + arb(0, 1) * (T / 2))
            ball = arb(ball.mid(), ball.rad()) if ball.is_finite() else ball
            got = _digits_of(ball, digits)
            if got < 1:
                raise FormkitError(
                    f"ζ({s}, C) for D = {D}: the tail bound {tail:.1e} beyond norm {X} leaves no certified "
                    "digit; raise --bound or take a larger s"
                )
            values.append(
                certified(
                    ball,
                    got,
                    quantity=f"ζ(s, C), C = class of ({f.a}, {f.b}, {f.c}) (D = {D})",
                    s=s,
                    method=(
                        f"direct sum over the invertible ideals of norm ≤ {X} times ζ(2s), tail ≤ {tail:.1e} "
                        "(explicit bound), ball arithmetic (unconditional)"
                    ),
                    terms=X,
                )
            )
    return PartialZetaValues(
        D,
        s,
        X,
        tuple(quantity_forms),
        tuple(values),
        tuple(counts),
        tail,
        f"{G.provenance}; ideals listed by square roots of D modulo 4a, a ≤ {X}",
    )


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

    with ctx.workprec(bits_for(30) + 40):
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
    """``Σ_C ζ(s, C)`` over the narrow classes of a fundamental ``D > 0``, beside ``ζ(s)·L(s, χ_D)``.

    ``values`` may pass the :class:`PartialZetaValues` of ``D`` at ``s`` already computed;
    ``bound`` selects direct summation (real ``s > 1``), as in :func:`partial_zeta_values`.

    Examples
    --------
    >>> r = real_class_zeta_sum(229, 3, bound=3000, digits=10)     # Cl⁺(229) ≅ C3
    >>> r.agrees, r.class_number
    (True, 3)
    >>> real_class_zeta_sum(229, "-1/2+3i", digits=10).agrees
    True
    """
    from flint import acb, ctx

    D = _positive(D, "Σ_C ζ(s, C) = ζ(s)·L(s, χ_D)", fundamental=True)
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


def _character_values(D: int, character: Sequence[int]):
    """``ψ(C)`` (complex balls) for the classes of ``class_group(D)`` in its element order."""
    from flint import acb, fmpq

    from .dispatch import class_group

    G = class_group(D, method="enumeration")
    inv = G.invariants
    k = [as_int(x, "character exponent") for x in character]
    if len(k) != len(inv):
        raise FormkitError(
            f"a character of Cl⁺({D}) ≅ {G.structure} is given by {len(inv)} exponents (one per "
            f"invariant {list(inv)}), not {len(k)}"
        )
    out = []
    for x in G.elements():
        e = G.discrete_log(x)
        phase = sum((Fraction(ki * ei, ni) for ki, ei, ni in zip(k, e, inv)), Fraction(0))
        out.append(acb.exp_pi_i(acb(2 * fmpq(phase.numerator, phase.denominator))))
    return G, k, out


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
    with ``bound``: direct summation (real ``s > 1``).

    Examples
    --------
    >>> real_class_character_l_series(229, [1], 3, bound=3000, digits=8).text()
    '0.96944'
    >>> real_class_character_l_series(229, [1], 3, digits=12).text()
    '0.969440675897'
    """
    from flint import acb, ctx

    from .partial_zeta_continuation import continued_class_character_l_series

    D = _positive(D, "the L-series of a narrow class group character")
    s, direct = _route(s, bound)
    digits = check_digits(digits)
    if not direct:
        return continued_class_character_l_series(D, character, s, digits=digits)
    G, k, psis = _character_values(D, character)
    z = partial_zeta_values(D, s, bound=bound, digits=digits)
    with ctx.workprec(bits_for(digits) + 40):
        total = acb(0)
        for psi, v in zip(psis, z.values):
            total += psi * as_ball(v)
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
            method=f"Σ_C ψ(C)·ζ(s, C) over {len(psis)} narrow classes; {z.values[0].method}",
            terms=z.bound,
        )


def real_genus_character_l_series(
    D: object, d1: object, s: object, *, bound: object = None, digits: int = 30
) -> SeriesIdentity:
    """``L(s, ψ_{d₁,d₂})`` by the classes and as ``L(s, χ_{d₁})·L(s, χ_{d₂})`` (fundamental ``D > 0``).

    Without ``bound`` the left side is the continued ``L(s, ψ)`` of the genus character
    (any complex ``s``; ``s ≠ 1`` when ``d₁ = 1``); with ``bound`` it is
    ``Σ_C ψ(C)·ζ(s, C)`` summed directly (real ``s > 1``).

    Examples
    --------
    >>> r = real_genus_character_l_series(12, -3, 4, bound=2000, digits=8)   # L(4, χ₋₃)·L(4, χ₋₄)
    >>> r.agrees, r.right.text()
    (True, '0.92963328')
    >>> r = real_genus_character_l_series(12, -3, "1/2+2i", digits=15)
    >>> r.agrees, r.left.digits
    (True, 15)
    """
    from flint import acb, ctx

    D = _positive(D, "a genus character L-series", fundamental=True)
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
    for x in _classes(D).elements():
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
        from .partial_zeta_continuation import continued_class_character_l_series

        one = continued_class_character_l_series(D, _genus_exponents(D, signs), s, digits=digits)
        vals, prov = (one,), str(_classes(D).provenance)
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
    return replace(identity, class_number=_classes(D).order)


def _classes(D: int):
    from .dispatch import class_group

    return class_group(D, method="enumeration")


def _genus_exponents(D: int, signs: Sequence[int]) -> tuple[int, ...]:
    """The exponents ``k`` of the character of ``class_group(D)`` with the values ``signs`` (±1)."""
    from itertools import product

    G = _classes(D)
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
