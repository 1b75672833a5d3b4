"""Worked example: the reduction of a form, step by step.

:func:`worked_reduction` — every reduction step with its matrix and the running
product (Gauss/Lagrange reduction for definite forms, Cohen GTM 138 Algorithm 5.4.2;
the operator ρ for indefinite forms, Buchmann–Vollmer §6.2, with the cycle).
:func:`explain_reduction` returns the rendered text (``formkit explain reduce``).

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, Springer
       1993, Algorithm 5.4.2, §5.6.
.. [2] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, §6.2.
"""

from __future__ import annotations

from ..core.forms import FormLike, as_form
from ..core.reduction import reduce_form
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
    "worked_reduction",
    "explain_reduction",
]

#: Forms of an indefinite cycle listed in a worked reduction.
CYCLE_SHOWN = 40


def worked_reduction(form: FormLike) -> WorkedExample:
    """The reduction of a form, step by step (definite or indefinite).

    Each step gives its kind (translation, swap, or ρ), its matrix, the form after it
    and the running product of the matrices; for an indefinite form the cycle of
    reduced forms follows (the first :data:`CYCLE_SHOWN`).

    Raises
    ------
    DiscriminantError
        If the discriminant is a square.
    ParseError, FormError
        For input that is not a form.

    Examples
    --------
    >>> ex = worked_reduction((10, 37, 35))
    >>> [s["kind"] for s in ex.data["steps"]], ex.data["reduced"]
    (['translate', 'swap', 'translate'], [1, 1, 8])
    >>> "running product" in ex.render("md")
    True
    """
    from ..core.reduction import _cycle_prefix

    f = as_form(form)
    res = reduce_form(f, steps=True)
    D = f.discriminant
    title = f"Reduction of ({f.a}, {f.b}, {f.c})"
    blocks: list[Block] = [
        Heading(1, title),
        Paragraph(
            ("The form ", m_poly(f)) + text(f" has discriminant @D = b^2 - 4ac = {D}@; it is {f.kind}.")
        ),
    ]
    if D < 0:
        blocks.append(
            para(
                "A positive definite form @(a, b, c)@ is reduced when @|b| <= a <= c@, with @b >= 0@ if "
                "@|b| = a@ or @a = c@ (Gauss; Cohen, GTM 138, Algorithm 5.4.2). Each step either translates "
                "b into @(-a, a]@ by the matrix @[[1, k], [0, 1]]@ or exchanges a and c by @[[0, -1], [1, 0]]@."
                + ("" if f.a > 0 else " A negative definite form is reduced through its negative.")
            )
        )
    else:
        blocks.append(
            para(
                "An indefinite form @(a, b, c)@ is reduced when @0 < b < sqrt(D)@ and "
                "@sqrt(D) - b < 2|a| < sqrt(D) + b@. Each step applies rho, which takes @(a, b, c)@ to "
                "@(c, b', (b'^2 - D)/4c)@ with @b' = -b + 2ct@, where b' lies in @(-|c|, |c|]@ when "
                "@|c| > sqrt(D)@ and in @(sqrt(D) - 2|c|, sqrt(D))@ otherwise; its matrix is @[[0, -1], [1, t]]@ "
                "(Buchmann and Vollmer, Binary Quadratic Forms, Section 6.2)."
            )
        )
    blocks.append(Heading(2, "Steps"))
    red_blocks, recs = reduction_blocks(res)
    blocks.extend(red_blocks)
    data = {
        "form": f.to_list(),
        "discriminant": D,
        "steps": recs,
        "reduced": res.reduced.to_list(),
        "matrix": matrix_list(res.matrix),
    }
    if D > 0:
        forms, complete = _cycle_prefix(res.reduced, CYCLE_SHOWN)
        blocks.append(Heading(2, "The cycle of reduced forms"))
        blocks.append(
            para(
                "Applying rho to a reduced form gives a reduced form; the reduced forms of the class form one cycle"
                + (
                    f" of length {len(forms)}:"
                    if complete
                    else f", longer than {CYCLE_SHOWN}; its first {len(forms)} forms:"
                )
            )
        )
        blocks.append(Items(tuple((m_form(g),) for g in forms)))
        data["cycle"] = [g.to_list() for g in forms]
        data["cycle_complete"] = complete
    return WorkedExample("reduce", title, data, tuple(blocks))


def explain_reduction(form: FormLike, *, format: str = "md", fragment: bool = False) -> str:
    """:func:`worked_reduction` rendered as ``"md"`` or ``"tex"`` text.

    Examples
    --------
    >>> print(explain_reduction((3, 1, 2)).splitlines()[0])
    # Reduction of (3, 1, 2)
    """
    return worked_reduction(form).render(format, fragment=fragment)
