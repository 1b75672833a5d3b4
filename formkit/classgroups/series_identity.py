"""Two independent certified computations of one Dirichlet series value, and whether they agree.

Every identity of the series over the classes — ``Σ_C Z_C(s) = w·ζ_K(s)``, the factorisation
of a genus character L-series, the Chowla–Selberg formula, their versions for orders and for
``D > 0`` (:mod:`~formkit.classgroups.class_series`, :mod:`~formkit.classgroups.partial_zeta`,
:mod:`~formkit.classgroups.order_series`) — is returned as a :class:`SeriesIdentity`: the side
computed from the classes, the side from the closed formula, both as certified balls
(:mod:`formkit.analytic.balls`), and whether their error intervals overlap.  Two intervals
that overlap are consistent, not a proof of the identity; two that do not overlap would
disprove it (or the code).

References
----------
.. [1] D. Zagier, *Zetafunktionen und quadratische Körper*, Springer 1981, §10–12 (the
       identities checked).
"""

from __future__ import annotations

from dataclasses import dataclass

from ..analytic.balls import CertifiedValue, ComplexArgument, as_ball, bits_for, certified

__all__ = ["SeriesIdentity"]


@dataclass(frozen=True)
class SeriesIdentity:
    """Two independent certified computations of one number, and whether they agree.

    ``left`` is the side computed from the classes (Epstein zeta functions, partial zeta
    functions or η-values), ``right`` the side from the factorisation or closed formula;
    ``agrees`` is True when their error intervals overlap.  ``provenance`` says how the
    classes were obtained.

    Examples
    --------
    >>> from formkit.classgroups.class_series import class_zeta_sum
    >>> r = class_zeta_sum(-23, 2, digits=12)
    >>> r.statement, r.agrees, r.to_dict()["by_formula"]["value"] == r.right.to_dict()["value"]
    ('Σ_C Z_C(s) = w·ζ(s)·L(s, χ_D)', True, True)
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


def overlap(a: CertifiedValue, b: CertifiedValue) -> bool:
    """Whether the error intervals of two certified values meet."""
    from flint import ctx

    with ctx.workprec(bits_for(max(a.digits, b.digits)) + 30):
        return bool(as_ball(a).overlaps(as_ball(b)))


def sum_balls(terms, digits: int, quantity: str, s: ComplexArgument, method: str, terms_count: int):
    """``Σ coefficient·value`` over ``terms`` as a certified value (real when ``s`` is real and it is)."""
    from flint import acb, ctx

    with ctx.workprec(bits_for(digits) + 30):
        total = acb(0)
        for coefficient, value in terms:
            total += coefficient * as_ball(value)
        real = total.imag.contains(0) and s.is_real
        ball = total.real if real else total
        return certified(ball, digits, quantity=quantity, s=s, method=method, terms=terms_count)
