"""A handout on one discriminant: one complete document, in LaTeX or Markdown.

:func:`worked_handout` puts together, for a discriminant ``D`` (and optionally a form
``Q``, a number ``n`` to represent and a prime bound): the order and its class number
formula (conductor ``f > 1``), the reduced forms, the structure with generators, genera
and characters (:func:`~formkit.explain.class_group.worked_class_group`), the ring class
polynomial (``D < 0``) or the continued fraction behind the fundamental unit and narrow
against wide class numbers (``D > 0``), a representation worked out
(:func:`~formkit.explain.representation.worked_representation`), and the primes ``Q``
represents with the criterion of :func:`formkit.representation.prime_criteria.prime_criterion`
(a congruence criterion exactly when the genus of ``Q`` is ``{Q, Q⁻¹}``).  Every sentence
comes from the builders it reuses, each guarded by the condition it states.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §2–§3, §7, §9.
"""

from __future__ import annotations

from ..classgroups.dispatch import class_group
from ..core.arith import as_int
from ..core.forms import FormLike, as_form
from ..errors import FormkitError
from .class_group import worked_class_group
from .document import Block, Heading, Math, Paragraph, WorkedExample, m_form, para, text
from .representation import worked_representation

__all__ = ["worked_handout"]

#: Represented primes listed in the handout.
PRIMES_SHOWN = 40


def _shift(blocks, by: int = 1) -> list:
    return [Heading(b.level + by, b.text) if isinstance(b, Heading) else b for b in blocks]


def worked_handout(
    D: object, form: FormLike | None = None, n: object | None = None, *, bound: object = 1000
) -> WorkedExample:
    """A complete handout on the discriminant ``D``.

    Parameters
    ----------
    D : int
        A non-square discriminant.
    form : FormLike, optional
        The form whose representations and primes are worked out (discriminant ``D``,
        primitive, positive definite when ``D < 0``); default the first generator of
        the class group, or the principal form when the group is trivial.
    n : int, optional
        The number represented in the worked representation; default the least prime
        ``≤ bound`` that the form represents.
    bound : int
        The primes up to ``bound`` that the form represents are listed (default 1000).

    Returns
    -------
    WorkedExample
        ``kind == "handout"``; ``.render("tex")`` is a complete LaTeX document.

    Raises
    ------
    FormkitError
        For a form of another discriminant, or when no represented prime is ``≤ bound``
        and no ``n`` is given.

    Examples
    --------
    >>> h = worked_handout(-56, (3, 2, 5), bound=200)
    >>> h.data["criterion"]["kind"], h.data["criterion"]["residues"]
    ('congruence', [3, 5, 13, 19, 27, 45])
    """
    from ..representation.prime_criteria import prime_criterion, represented_primes

    D = as_int(D, "D")
    G = class_group(D)
    if form is None:
        Q = G.generators[0].form if G.generators else G.identity.form
    else:
        Q = as_form(form)
        if Q.discriminant != D:
            raise FormkitError(f"the form {Q!r} has discriminant {Q.discriminant}, not {D}")
    X = as_int(bound, "bound")
    group = worked_class_group(D)
    title = f"A handout on the discriminant {D}"
    blocks: list[Block] = [Heading(1, title)]
    blocks.extend(_shift(group.blocks[:-1]))  # all but its references line
    data: dict = {"discriminant": D, "form": Q.to_list(), "group": group.data}
    # the group's example already carries the ring class polynomial (D < 0) or the unit (D > 0)
    for key in ("class_polynomial", "unit"):
        if key in group.data:
            data[key] = group.data[key]
    crit = prime_criterion(Q, polynomial=False)
    primes = represented_primes(Q, X)
    if n is None:
        if not primes:
            raise FormkitError(
                f"{Q} represents no prime up to {X}; give a number to represent or a larger bound"
            )
        n = primes[0]
    rep = worked_representation(Q, n)
    triple = f"({Q.a}, {Q.b}, {Q.c})"
    blocks.append(Heading(2, f"A representation by {triple}"))
    blocks.extend(_shift(rep.blocks[1:-1]))  # without its title and references line
    data["representation"] = rep.data
    data["ideal_reading"] = rep.data.get("ideal_reading", [])
    blocks.append(Heading(2, f"The primes represented by {triple}"))
    blocks.extend(_criterion_blocks(Q, crit))
    dens = crit.density
    blocks.append(
        Paragraph(
            text(
                f"Among all primes they have density @{dens.numerator}/{dens.denominator}@ "
                + (
                    "(@1/(2h)@, the class has order at most 2)"
                    if crit.class_order <= 2
                    else "(@1/h@, the class has order greater than 2)"
                )
                + "; the primes dividing @D@ that it represents: "
                + (", ".join(map(str, crit.exceptions)) or "none")
                + "."
            )
        )
    )
    shown = primes[:PRIMES_SHOWN]
    blocks.append(
        Paragraph(
            text(f"The {len(primes)} primes @p <= {X}@ represented by ")
            + (m_form(Q),)
            + (
                (
                    ": "
                    + ", ".join(map(str, shown))
                    + (f", ... (the first {len(shown)} listed)" if len(primes) > len(shown) else "")
                    + "."
                )
                if shown
                else ".",
            )
        )
    )
    data["criterion"] = crit.criterion_dict()
    data["primes"] = primes
    blocks.append(para("References: " + crit.references.replace("x^2 + ny^2", "@x^2 + ny^2@")))
    return WorkedExample("handout", title, data, tuple(blocks))


def _q_is(Q) -> Math:
    s = f"Q = ({Q.a}, {Q.b}, {Q.c})"
    return Math(s, s)


def _criterion_blocks(Q, crit) -> list[Block]:
    """The criterion in math mode, from the fields of a :class:`PrimeCriterion`."""
    D = Q.discriminant
    inv = as_form((Q.a, -Q.b, Q.c))
    if crit.kind == "congruence":
        genus: tuple
        if crit.genus_size == 1:
            genus = ("The genus of ", _q_is(Q), " consists of its class alone")
        else:
            genus = (
                "The genus of ",
                _q_is(Q),
                " consists of its class and the inverse class, that of ",
                m_form(inv),
                ", which represents the same numbers",
            )
        res = crit.residues
        shown = ", ".join(map(str, res[:60])) + (", ..." if len(res) > 60 else "")
        return [
            Paragraph(
                genus
                + text(
                    f"; so a congruence criterion exists. For primes @p@ not dividing {abs(D)}, @p@ is represented "
                    f"if and only if @p mod {crit.modulus}@ is one of the {len(res)} residues {shown}."
                )
            )
        ]
    pair = 1 if crit.class_order <= 2 else 2
    return [
        Paragraph(
            ("The genus of ", _q_is(Q))
            + text(
                f" has {crit.genus_size} classes, more than the {pair} of @{{Q, Q^{{-1}}}}@, so no congruence "
                "criterion exists: one exists exactly when the genus is @{Q, Q^{-1}}@. For primes @p@ not dividing "
                f"{abs(D)}, @p@ is represented if and only if @({D}/p) = 1@ and the class of the prime form "
                "@(p, b, (b^2 - D)/4p)@, @b^2 ≡ D (mod 4p)@, is that of @Q@ or of @Q^{-1}@ "
                f"(the class of @Q@ has order {crit.class_order})."
            )
        )
    ]
