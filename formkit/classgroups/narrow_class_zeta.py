"""Partial zeta functions ζ(s, C) of the narrow ideal classes of a real quadratic order (D > 0).

For ``D < 0`` the ideals of a class are counted by the Epstein zeta function of a form
(:mod:`formkit.classgroups.class_series`); for ``D > 0`` the form is indefinite, every
number it represents is represented infinitely often (the automorphs), and
``Σ' Q(x, y)^(−s)`` is no sum at all.  The analogue (Dedekind, Hecke) is the partial zeta
function of a narrow class ``C`` of invertible ideals of the order ``O_D``,

    ζ(s, C) = Σ_{𝔞 ∈ C} N(𝔞)^(−s)        (Re s > 1),

equivalently the sum over the representations ``Q(x, y) > 0`` modulo the proper
automorphs.  This module gives its values, for fundamental ``D`` and for orders alike; the
identities they satisfy (``Σ_C ζ(s, C) = ζ_K(s)``, genus characters) are in
:mod:`formkit.classgroups.partial_zeta`, the L-series of the class characters in
:mod:`formkit.classgroups.class_character_series`.

**Direct summation** (when a ``bound`` is given):

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
``s``; the digits that the bound certifies are the ones reported.

**Analytic continuation** (the default, no ``bound``): every ``ζ(s, C)`` at any complex
``s ≠ 1``, from the functional equation ``Λ(s, ψ) = Λ(1 − s, ψ̄)`` of the class character
L-series and a rapidly convergent smoothed sum
(:mod:`formkit.classgroups.partial_zeta_continuation`, where ``W(ψ) = 1`` is proved for
every order and the cuts are bounded explicitly).

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
from dataclasses import dataclass

from ..analytic.balls import (
    CertifiedValue,
    ComplexArgument,
    as_ball,
    as_complex_argument,
    bits_for,
    certified,
    check_digits,
)
from ..analytic.l_series import riemann_zeta
from ..core.arith import as_int
from ..core.factorisation import prime_factorisation
from ..core.forms import Form, FormLike
from ..core.modular_roots import sqrt_mod
from ..errors import FormkitError
from .partial_zeta_continuation import _digits_of, _positive

__all__ = [
    "DEFAULT_IDEAL_NORM_BOUND",
    "MAX_IDEAL_NORM_BOUND",
    "PartialZetaValues",
    "partial_zeta_values",
]

#: Ideals of norm up to this bound are listed by default (about 1 s here for D ≈ 10^3).
DEFAULT_IDEAL_NORM_BOUND = 20_000

#: The largest bound accepted (about a minute of square roots and class look-ups).
MAX_IDEAL_NORM_BOUND = 10**6


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
    """``ζ(s, C)`` for every narrow class ``C`` of discriminant ``D > 0`` (direct summation or continuation).

    ``classes[i]`` is the reduced form of the class (as in ``class_group(D)``),
    ``values[i]`` the certified ``ζ(s, C)``, ``ideal_counts[i]`` the number of primitive
    invertible ideals of norm ``≤ bound`` found in it; ``tail_bound`` is ``ζ(2s)·T(X, s)``
    (module docstring), the width of every interval, for direct summation, and 0 for the
    continuation (whose cuts are inside each ball).
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
