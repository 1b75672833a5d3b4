"""Worked example: Dirichlet composition of two forms, with every intermediate value.

:func:`worked_composition` — Dirichlet composition as in Cohen GTM 138 Algorithm
5.4.7: ``s``, ``n``, the two extended-Euclid steps with their Bézout coefficients,
``d1 = gcd(a1, a2, s)``, ``v1``, ``v2``, ``r``, the unreduced composite, then its
reduction; the result is checked against :func:`formkit.compose`.
:func:`composition_trace` records the numbers; :func:`explain_composition` returns the
rendered text (``formkit explain compose``).

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993, Algorithm 5.4.7.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from ..core.arith import xgcd
from ..core.forms import Form, FormLike, as_form
from ..core.reduction import ReductionResult, reduce_form
from .document import (
    Block,
    Heading,
    Items,
    Paragraph,
    WorkedExample,
    m_form,
    m_poly,
    matrix_list,
    para,
    reduction_blocks,
    text,
)

__all__ = [
    "CompositionTrace",
    "composition_trace",
    "worked_composition",
    "explain_composition",
]


def _p(x: int) -> str:
    """An integer for substitution into a formula: negative ones in parentheses."""
    return f"({x})" if x < 0 else str(x)


# ---------------------------------------------------------------------------
# composition


@dataclass(frozen=True)
class CompositionTrace:
    """Every intermediate value of Dirichlet composition (Cohen GTM 138, Algorithm 5.4.7).

    ``first``/``second`` are the forms after ordering (smaller ``|a|`` first);
    ``euclid1 = (d, u, v)`` with ``u·a2 + v·a1 = d`` (``None`` when ``a1 | a2``);
    ``euclid2 = (d1, u, v)`` with ``u·s + v·d = d1`` (``None`` when ``d | s``);
    ``composite`` the unreduced ``(v1·v2, b2 + 2·v2·r, ·)`` and ``reduction`` its
    reduction.
    """

    F: Form
    G: Form
    discriminant: int
    swapped: bool
    first: Form
    second: Form
    s: int
    n: int
    euclid1: tuple[int, int, int] | None
    y1: int
    d: int
    euclid2: tuple[int, int, int] | None
    x2: int
    y2: int
    d1: int
    v1: int
    v2: int
    r: int
    composite: Form
    reduction: ReductionResult = field(repr=False)

    @property
    def result(self) -> Form:
        """The reduced composite."""
        return self.reduction.reduced

    def to_dict(self) -> dict:
        """JSON-ready dictionary of every value."""
        return {
            "F": self.F.to_list(),
            "G": self.G.to_list(),
            "discriminant": self.discriminant,
            "swapped": self.swapped,
            "first": self.first.to_list(),
            "second": self.second.to_list(),
            "s": self.s,
            "n": self.n,
            "euclid1": None if self.euclid1 is None else dict(zip(("d", "u", "v"), self.euclid1)),
            "y1": self.y1,
            "d": self.d,
            "euclid2": None if self.euclid2 is None else dict(zip(("d1", "u", "v"), self.euclid2)),
            "x2": self.x2,
            "y2": self.y2,
            "d1": self.d1,
            "v1": self.v1,
            "v2": self.v2,
            "r": self.r,
            "composite": self.composite.to_list(),
            "result": self.result.to_list(),
        }


def composition_trace(F: FormLike, G: FormLike) -> CompositionTrace:
    """Dirichlet composition of two primitive forms with every intermediate value.

    Follows Cohen GTM 138, Algorithm 5.4.7, as :func:`formkit.compose` does, and
    checks that both give the same reduced form.

    Raises
    ------
    DiscriminantMismatchError, NotPrimitiveError, FormError
        As :func:`formkit.compose`.

    Examples
    --------
    >>> t = composition_trace((2, 1, 3), (3, 1, 2))   # (3, 1, 2) is in the inverse class
    >>> t.d1, t.v1, t.v2, t.r, t.composite, t.result
    (1, 2, 3, 0, Form(6, 1, 1), Form(1, 1, 6))
    """
    from ..core.composition import _check, compose

    F, G = as_form(F, name="F"), as_form(G, name="G")
    D = _check(F, G)
    swapped = F.a > G.a
    P1, P2 = (G, F) if swapped else (F, G)
    a1, b1 = P1.a, P1.b
    a2, b2, c2 = P2.a, P2.b, P2.c
    s = (b1 + b2) // 2
    n = b2 - s
    if a2 % a1 == 0:
        e1 = None
        y1, d = 0, a1
    else:
        d, u, v = (int(t) for t in xgcd(a2, a1))
        e1 = (d, u, v)
        y1 = u
    if s % d == 0:
        e2 = None
        y2, x2, d1 = -1, 0, d
    else:
        d1, u, v = (int(t) for t in xgcd(s, d))
        e2 = (d1, u, v)
        x2, y2 = u, -v
    v1, v2 = a1 // d1, a2 // d1
    r = (y1 * y2 * n - x2 * c2) % v1
    a3, b3 = v1 * v2, b2 + 2 * v2 * r
    c3 = (b3 * b3 - D) // (4 * a3)
    if (c2 * d1 + r * (b2 + v2 * r)) != c3 * v1 or (b3 * b3 - D) % (4 * a3):  # pragma: no cover
        raise ArithmeticError(f"composition of {F!r} and {G!r}: inconsistent third coefficient")
    composite = Form(a3, b3, c3)
    red = reduce_form(composite, steps=True)
    check = compose(F, G)
    if D < 0 and check != red.reduced:  # pragma: no cover - would be a bug
        raise ArithmeticError(f"traced composition {red.reduced!r} differs from compose() = {check!r}")
    if D > 0:
        from ..core.equivalence import proper_equivalence

        if proper_equivalence(check, red.reduced) is None:  # pragma: no cover - would be a bug
            raise ArithmeticError(
                f"traced composition {red.reduced!r} not equivalent to compose() = {check!r}"
            )
    return CompositionTrace(
        F, G, D, swapped, P1, P2, s, n, e1, y1, d, e2, x2, y2, d1, v1, v2, r, composite, red
    )


def worked_composition(F: FormLike, G: FormLike) -> WorkedExample:
    """Dirichlet composition of two forms, every intermediate value shown.

    Raises
    ------
    DiscriminantMismatchError, NotPrimitiveError, FormError
        As :func:`formkit.compose`.

    Examples
    --------
    >>> ex = worked_composition((2, 1, 3), (2, 1, 3))
    >>> ex.data["d1"], ex.data["composite"], ex.data["result"]
    (1, [4, 5, 3], [2, -1, 3])
    """
    t = composition_trace(F, G)
    D = t.discriminant
    a1, b1, _c1 = t.first.coefficients
    a2, b2, c2 = t.second.coefficients
    title = f"Composition of ({t.F.a}, {t.F.b}, {t.F.c}) and ({t.G.a}, {t.G.b}, {t.G.c})"
    blocks: list[Block] = [
        Heading(1, title),
        Paragraph(
            text(f"Both forms have discriminant @D = {D}@: @F = @")
            + (m_poly(t.F),)
            + text(" and @G = @")
            + (m_poly(t.G), ".")
        ),
        para(
            "We follow Dirichlet composition as in Cohen, A Course in Computational Algebraic Number Theory, "
            "Algorithm 5.4.7. With @(a1, b1, c1)@ the form of smaller leading coefficient and @(a2, b2, c2)@ the "
            "other, two extended-Euclid steps give @d1 = gcd(a1, a2, (b1 + b2)/2)@ and r; the composite is "
            "@(v1 v2, b2 + 2 v2 r, c3)@ with @v1 = a1/d1@ and @v2 = a2/d1@, which is then reduced."
        ),
        Heading(2, "Intermediate values"),
    ]
    steps = [
        text("Order: @(a1, b1, c1) = @")
        + (m_form(t.first),)
        + text(", @(a2, b2, c2) = @")
        + (m_form(t.second),)
        + (" (the two forms were exchanged)." if t.swapped else " (already in this order).",),
        text(f"@s = (b1 + b2)/2 = ({b1} + {_p(b2)})/2 = {t.s}@ and @n = b2 - s = {t.n}@."),
    ]
    if t.euclid1 is None:
        steps.append(
            text(f"First Euclid step: @a1 = {a1}@ divides @a2 = {a2}@, so @y1 = 0@ and @d = a1 = {t.d}@.")
        )
    else:
        d, u, v = t.euclid1
        steps.append(
            text(
                f"First Euclid step: @d = gcd(a2, a1) = gcd({a2}, {a1}) = {d} = {_p(u)}·{_p(a2)} + {_p(v)}·{_p(a1)}@, "
                f"so @y1 = u = {t.y1}@."
            )
        )
    if t.euclid2 is None:
        steps.append(
            text(
                f"Second Euclid step: @d = {t.d}@ divides @s = {t.s}@, so @x2 = 0@, @y2 = -1@ and @d1 = d = {t.d1}@."
            )
        )
    else:
        d1, u, v = t.euclid2
        steps.append(
            text(
                f"Second Euclid step: @d1 = gcd(s, d) = gcd({t.s}, {t.d}) = {d1} = {_p(u)}·{_p(t.s)} + {_p(v)}·{_p(t.d)}@, "
                f"so @x2 = u = {t.x2}@ and @y2 = -v = {t.y2}@."
            )
        )
    steps.append(text(f"@v1 = a1/d1 = {t.v1}@ and @v2 = a2/d1 = {t.v2}@."))
    steps.append(
        text(
            f"@r = (y1 y2 n - x2 c2) mod v1 = ({_p(t.y1)}·{_p(t.y2)}·{_p(t.n)} - {_p(t.x2)}·{_p(c2)}) mod {t.v1} = {t.r}@."
        )
    )
    a3, b3, c3 = t.composite.coefficients
    steps.append(
        text(
            f"Composite: @a3 = v1 v2 = {a3}@, @b3 = b2 + 2 v2 r = {b3}@ and "
            f"@c3 = (c2 d1 + r(b2 + v2 r))/v1 = (b3^2 - D)/(4 a3) = {c3}@, that is @({a3}, {b3}, {c3})@."
        )
    )
    blocks.append(Items(tuple(steps)))
    blocks.append(
        para(
            f"Check: @b3 = {b3}@ is congruent to @b1 = {b1}@ modulo @2 v1 = {2 * t.v1}@ and to @b2 = {b2}@ modulo "
            f"@2 v2 = {2 * t.v2}@; @a3 = a1 a2/d1^2 = {a1 * a2 // (t.d1 * t.d1)}@; the composite has discriminant "
            f"@{t.composite.discriminant}@."
        )
    )
    blocks.append(Heading(2, "Reduction of the composite"))
    red_blocks, recs = reduction_blocks(t.reduction)
    blocks.extend(red_blocks)
    blocks.append(
        Paragraph(
            text("So @F * G@ is the class of ")
            + (m_poly(t.result), ", the reduced form ", m_form(t.result), ".")
        )
    )
    if D > 0:
        blocks.append(
            para(
                "(For @D > 0@ the class has a cycle of reduced forms; this is the first one reached, and "
                "formkit.compose may name another form of the same cycle.)"
            )
        )
    data = t.to_dict()
    data["reduction_steps"] = recs
    data["reduction_matrix"] = matrix_list(t.reduction.matrix)
    return WorkedExample("compose", title, data, tuple(blocks))


def explain_composition(F: FormLike, G: FormLike, *, format: str = "md", fragment: bool = False) -> str:
    """:func:`worked_composition` rendered as ``"md"`` or ``"tex"`` text.

    Examples
    --------
    >>> "Second Euclid step" in explain_composition((2, 1, 3), (3, -1, 2), format="tex")
    True
    """
    return worked_composition(F, G).render(format, fragment=fragment)
