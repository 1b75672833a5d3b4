"""Worked example: the representations of an integer by a form, by the square-root method.

:func:`worked_representation` follows the square-root method: a proper
representation ``Q(x, y) = m`` is the first column of a matrix ``M ∈ SL2(Z)`` with
``Q·M = (m, b, c)``, ``b`` determined modulo ``2m`` with ``b² ≡ D (mod 4m)``; so one
lists those ``b``, reduces each ``(m, b, (b² − D)/4m)`` and keeps the ones properly
equivalent to ``Q``; the matrix of the equivalence gives ``(x, y)``, and the proper
automorphs of ``Q`` give the others (``w`` of them when ``D < 0``; one orbit under the
infinite automorphism group when ``D > 0``).  All solutions are ``g`` times the proper
ones of ``n/g²``, ``g² | n``.  (Gauss, *Disquisitiones* art. 154–170; Cox, *Primes of
the Form x² + ny²*, Lemma 2.5 and §2.A; Buchmann–Vollmer, *Binary Quadratic Forms*,
§3.2 — section numbers from memory.)  Written from the mathematics; the tests compare its
solutions with :func:`formkit.representation.representations.represent`.
:func:`explain_representation` returns the rendered text (``formkit explain represent``).

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §2.
.. [2] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, §3.2.
.. [3] C. F. Gauss, *Disquisitiones Arithmeticae*, 1801, art. 154–170.
"""

from __future__ import annotations

from typing import Any

from ..core.arith import as_int, gcd
from ..core.factorisation import prime_factorisation
from ..core.forms import Form, FormLike, Matrix, _require_nonsquare, as_form, mat_inverse, mat_mul
from ..core.modular_roots import sqrt_mod
from ..core.reduction import reduce_form
from .document import (
    Block,
    Heading,
    Math,
    Paragraph,
    Table,
    WorkedExample,
    _check_count,
    m_form,
    m_int,
    m_matrix,
    m_poly,
    m_vector,
    matrix_list,
    para,
    reduction_blocks,
    text,
)

__all__ = ["worked_representation", "explain_representation"]

#: The sources, printed once at the end of the example.
REFERENCES_LINE = (
    "References: D. A. Cox, Primes of the Form @x^2 + ny^2@, 2nd ed., Wiley 2013, Section 2.A, Lemmas 2.3 "
    "and 2.5 (proper representations and the forms (m, b, c)); C. F. Gauss, Disquisitiones Arithmeticae, "
    "1801, Section V (numbers from memory); for the reading as ideals, Cox Section 7.B (forms and ideals of "
    "orders)."
)

#: Longest cycle of reduced forms a worked representation walks (indefinite forms).
MAX_CYCLE = 100_000


def _square_divisors(m: int) -> list[int]:
    """All ``g ≥ 1`` with ``g² | m`` (``m ≠ 0``), increasing."""
    gs = [1]
    for p, e in (prime_factorisation(abs(m)) if abs(m) > 1 else {}).items():
        gs = [g * p**k for g in gs for k in range(e // 2 + 1)]
    return sorted(gs)


# ---------------------------------------------------------------------------
# representations


def worked_representation(form: FormLike, n: object, *, max_detail: int = 32) -> WorkedExample:
    """How ``Q(x, y) = n`` is solved by square roots modulo ``4m`` and reduction.

    Parameters
    ----------
    form : FormLike
        Any form of non-square discriminant (content and negative definite forms are
        handled as in :mod:`formkit.representation.representations`).
    n : int
        The number to represent.
    max_detail : int
        Show the reduction steps for at most this many roots ``b`` (the table of all
        roots and all solutions is always complete).

    Returns
    -------
    WorkedExample
        ``data["solutions"]`` lists every solution (definite forms) or one solution
        per orbit of the automorphs (indefinite forms).

    Raises
    ------
    DiscriminantError, NotAnIntegerError, ParseError
        For a square discriminant or input that is not a form / an integer.

    Examples
    --------
    >>> ex = worked_representation((1, 0, 5), 21)
    >>> ex.data["count"], ex.data["solutions"][:4]
    (8, [[-4, -1], [-4, 1], [-1, -2], [-1, 2]])
    >>> [r["b"] for r in ex.data["roots"]]
    [8, 20, 22, 34]
    """
    Q = as_form(form)
    D = _require_nonsquare(Q, "representations")
    n = as_int(n, "n")
    max_detail = _check_count(max_detail, "max_detail", 0)
    title = f"Representations of {n} by ({Q.a}, {Q.b}, {Q.c})"
    blocks: list[Block] = [
        Heading(1, title),
        Paragraph(
            ("We solve ", Math(m_poly(Q).tex + f" = {n}", f"{Q} = {n}"))
            + text(f" for integers x, y; the form has discriminant @D = {D}@.")
        ),
        para(
            "Method (Gauss): a proper solution (@gcd(x, y) = 1@) "
            "of @Q(x, y) = m@ is the first column of a matrix M of determinant 1 with @Q·M = (m, b, c)@, where "
            "b is determined modulo 2m and @b^2 ≡ D (mod 4m)@. So we list those b, reduce each form "
            "@(m, b, (b^2 - D)/4m)@ and keep the ones properly equivalent to Q; the matrix of the equivalence "
            "gives (x, y), and the automorphs of Q give the other solutions. Every solution is g times a proper "
            "solution of @n/g^2@ for some g with @g^2 | n@."
        ),
    ]
    data: dict = {"form": Q.to_list(), "n": n, "discriminant": D, "definite": D < 0}
    if n == 0:
        blocks.append(para("Since D is not a square, the form vanishes only at @(x, y) = (0, 0)@."))
        data.update(count=1, primitive_count=0, solutions=[[0, 0]], roots=[])
        return WorkedExample("represent", title, data, (*blocks, para(REFERENCES_LINE)))
    P, m, note = Q, n, []
    if D < 0 and Q.a < 0:
        P, m = -Q, -n
        note.append(f"Q is negative definite: we solve @-Q(x, y) = {m}@ instead.")
    k = P.content
    none = None
    if m % k:
        none = f"The coefficients of Q have common divisor {k}, which does not divide {m}: no solutions."
    elif k > 1:
        P, m = Form(P.a // k, P.b // k, P.c // k), m // k
        note.append(
            f"The coefficients have common divisor @{k}@: we solve @{P.a}x^2 + ({P.b})xy + ({P.c})y^2 = {m}@."
        )
    if none is None and D < 0 and m < 0:
        none = f"A positive definite form takes no negative value such as {m}: no solutions."
    for t in note:
        blocks.append(para(t))
    if none is not None:
        blocks.append(Paragraph((none,)))
        data.update(count=0, primitive_count=0, solutions=[], roots=[])
        return WorkedExample("represent", title, data, (*blocks, para(REFERENCES_LINE)))

    DP = P.discriminant
    blocks.append(Heading(2, "The reduced form of Q"))
    red_P = reduce_form(P, steps=True)
    rb, _ = reduction_blocks(red_P)
    blocks.extend(rb)
    # index: reduced form R properly equivalent to P  ->  N with P·N = R
    index: dict[Form, Matrix] = {red_P.reduced: red_P.matrix}
    if DP > 0:
        from ..core.reduction import reduced_cycle

        cyc = reduced_cycle(P, max_length=MAX_CYCLE)
        N = red_P.matrix
        for f_i, step in zip(cyc.forms[1:], cyc.matrices):
            N = mat_mul(N, step)
            index[f_i] = N
        blocks.append(
            para(
                f"Q is indefinite: a form is properly equivalent to Q exactly when its reduction lands on the cycle "
                f"of the reduced form of Q, which has {len(cyc)} forms: "
                + ", ".join(f"@({g.a}, {g.b}, {g.c})@" for g in cyc.forms[:40])
                + (" and more." if len(cyc) > 40 else ".")
            )
        )
        automorphs: list[Matrix] = []
    else:
        from ..core.equivalence import automorphism_group

        automorphs = list(automorphism_group(P).elements())
        blocks.append(
            Paragraph(
                text(f"The proper automorphs of the form (@w = {len(automorphs)}@ of them) are ")
                + tuple(x for A in automorphs for x in (m_matrix(A), ", "))[:-1]
                + (".",)
            )
        )

    roots_rec: list[dict] = []
    solutions: list[tuple[int, int]] = []
    detailed = 0
    omitted = 0
    for g in _square_divisors(m):
        mm = m // (g * g)
        am = abs(mm)
        blocks.append(
            Heading(2, f"g = {g}: proper solutions of Q(x, y) = {mm}" + (f", times {g}" if g > 1 else ""))
        )
        roots = [int(b) for b in sqrt_mod(DP, 4 * am) if b < 2 * am]
        if not roots:
            blocks.append(
                para(
                    f"No b in @[0, {2 * am})@ has @b^2 ≡ {DP} (mod {4 * am})@: {DP} is not a square modulo {4 * am}."
                )
            )
            continue
        blocks.append(
            para(
                f"The b in @[0, {2 * am})@ with @b^2 ≡ {DP} (mod {4 * am})@: "
                + ", ".join(f"@{b}@" for b in roots)
                + "."
            )
        )
        rows: list[tuple[Any, ...]] = []  # cells: Math values and tuples of parts, as Table renders both
        details: list[Block] = []
        for b in roots:
            c = (b * b - DP) // (4 * mm)
            F = Form(mm, b, c)
            rec: dict = {"g": g, "m": mm, "b": b, "form": F.to_list(), "primitive": F.is_primitive}
            if not F.is_primitive:
                rows.append((m_int(b), m_form(F), ("no",), ("-",), ("-",), ("-",)))
                rec.update(reduced=None, equivalent=False, matrix=None, solution=None)
                roots_rec.append(rec)
                continue
            rf = reduce_form(F, steps=True)
            to_reduced = index.get(rf.reduced)
            rec["reduced"] = rf.reduced.to_list()
            if to_reduced is None:
                rows.append((m_int(b), m_form(F), ("yes",), (m_form(rf.reduced),), ("no",), ("-",)))
                rec.update(equivalent=False, matrix=None, solution=None)
            else:
                M = mat_mul(to_reduced, mat_inverse(rf.matrix))  # P·M = F
                x, y = M[0][0], M[1][0]
                if P.transform(M) != F or P(x, y) != mm:  # pragma: no cover - would be a bug
                    raise ArithmeticError(f"representation of {mm} by {P!r}: matrix check failed")
                sol = (g * x, g * y)
                rows.append(
                    (m_int(b), m_form(F), ("yes",), (m_form(rf.reduced),), ("yes",), (m_vector(sol),))
                )
                rec.update(equivalent=True, matrix=matrix_list(M), solution=list(sol))
                if automorphs:
                    solutions.extend(
                        (g * (A[0][0] * x + A[0][1] * y), g * (A[1][0] * x + A[1][1] * y)) for A in automorphs
                    )
                else:
                    solutions.append(sol)
            roots_rec.append(rec)
            if detailed >= max_detail:
                omitted += 1
                continue
            detailed += 1
            details.append(Heading(3, f"b = {b}: reduction of ({mm}, {b}, {c})"))
            steps_blocks, steps_rec = reduction_blocks(rf)
            rec["steps"] = steps_rec
            details.extend(steps_blocks)
            if to_reduced is None:
                details.append(
                    Paragraph(
                        (
                            "The reduced form ",
                            m_form(rf.reduced),
                            " is not that of Q: no solution from this b.",
                        )
                    )
                )
            else:
                details.append(
                    Paragraph(
                        (
                            "It is " + ("on the cycle of Q" if DP > 0 else "the reduced form of Q") + ", so ",
                            m_form(F),
                            " = Q·M with ",
                            m_matrix(M),
                        )
                        + text(
                            " (the matrix taking Q to that reduced form times the inverse of this reduction "
                            f"matrix); its first column "
                            f"@({x}, {y})@ gives @Q({x}, {y}) = {mm}@"
                        )
                        + (text(f"; scaled by g: @{sol}@.") if g > 1 else (".",))
                    )
                )
        blocks.append(
            Table(
                (
                    ("b",),
                    ("form (m, b, c)",),
                    ("primitive",),
                    ("reduced",),
                    ("equivalent to Q",),
                    ("solution (x, y)",),
                ),
                tuple(rows),
            )
        )
        blocks.extend(details)
    if omitted:
        blocks.append(
            para(
                f"(Reduction steps of {omitted} further roots are not shown; raise max_detail, on the command line --limit N or --all.)"
            )
        )

    blocks.append(Heading(2, "Result"))
    solutions = sorted(set(solutions))
    data["roots"] = roots_rec
    if D < 0:
        prim = [v for v in solutions if gcd(v[0], v[1]) == 1]
        data.update(count=len(solutions), primitive_count=len(prim), solutions=[list(v) for v in solutions])
        if solutions:
            blocks.append(
                para(
                    f"{len(solutions)} solutions ({len(prim)} of them proper): "
                    + ", ".join(f"@{v}@" for v in solutions)
                    + "."
                )
            )
        else:
            blocks.append(para(f"No solutions: Q does not represent {n}."))
    else:
        # one solution per orbit, the same choice as formkit.represent: least x² + y²
        # (formkit.representation.orbits.orbit_representative)
        from ..representation.orbits import orbit_representative

        solutions = sorted({orbit_representative(Q, v) for v in solutions})
        data.update(count=None, orbit_count=len(solutions), solutions=[list(v) for v in solutions])
        if solutions:
            blocks.append(
                para(
                    f"Infinitely many solutions, in {len(solutions)} orbits under the automorphs of Q; one solution "
                    "per orbit (the one with the least x² + y²): "
                    + ", ".join(f"@{v}@" for v in solutions)
                    + "."
                )
            )
        else:
            blocks.append(para(f"No solutions: Q does not represent {n}."))
    ib, data["ideal_reading"] = _ideal_reading(Q, n, solutions)
    blocks.extend(ib)
    return WorkedExample("represent", title, data, (*blocks, para(REFERENCES_LINE)))


#: Solutions read as ideals in the worked example.
IDEAL_READINGS_SHOWN = 8


def _ideal_reading(Q: Form, n: int, solutions: list) -> tuple[list[Block], list]:
    """Each solution ``Q(x, y) = n`` as an element ``α = (2ax + by − y√D)/2`` of the ideal
    ``A = [a, (−b + √D)/2]`` of norm ``|a|`` with ``N(α) = a·n``; so ``(α) = A·B`` with
    ``B`` integral of norm ``n`` in the class of ``A⁻¹`` (wide class for ``D > 0``).
    Every norm is checked before it is printed."""
    from ..core.ideals import ideal_from_form

    a, b, _c = Q.coefficients
    D = Q.discriminant
    n = int(n)
    if not solutions or n <= 0:
        return [], []
    if Q.content != 1:
        return [
            para(
                f"(The form has content {Q.content}, so it is not attached to an invertible ideal of an order; "
                "the solutions have no reading as ideals.)"
            )
        ], []
    ideal = ideal_from_form(Q)
    blocks: list[Block] = [Heading(3, "The solutions read as ideals")]
    cls = "class" if D < 0 else "wide class"
    blocks.append(
        Paragraph(
            text("Let ")
            + (
                Math(
                    "A = " + ideal._repr_latex_().strip("$"),
                    "A = " + str(ideal).split(", ", 1)[1][:-1],
                ),
            )
            + text(
                f", the ideal @[a, (-b + sqrt(D))/2]@ of the order of discriminant @{D}@ attached to @Q@, of norm "
                f"@{abs(a)}@. A solution @Q(x, y) = {n}@ gives @alpha = (2ax + by - y sqrt(D))/2@ in it with "
                f"@N(alpha) = a · Q(x, y) = {a * n}@, so the principal ideal @(alpha)@ is the product of "
                f"@A@ and an integral ideal of norm @{n}@ in the {cls} inverse to it:"
            )
        )
    )
    rows = []
    recs = []
    for x, y in solutions[:IDEAL_READINGS_SHOWN]:
        A, B = 2 * a * x + b * y, -y  # alpha = (A + B sqrt(D))/2
        if 4 * a * n != A * A - D * B * B:  # pragma: no cover - would be a wrong solution
            raise ArithmeticError(f"N(alpha) != a*n for the solution ({x}, {y}) of {Q!r} = {n}")
        al = _alpha_text(A, B, D)
        g, beta = _cofactor_ideal(Q, n, x, y)
        m = n // (g * g)
        ideal_b = f"[{m}, (" + (f"{beta} + " if beta else "") + "sqrt(D))/2]"
        if g > 1:
            ideal_b = f"{g} · " + ideal_b
        rows.append(
            (
                (_m_pair(x, y),),
                text(f"@alpha = {al}@"),
                text(f"@N(alpha) = {a * n}@"),
                text(f"@B = {ideal_b}@"),
            )
        )
        recs.append({"solution": [x, y], "alpha": [A, B], "norm": a * n, "cofactor": [g, m, beta]})
    blocks.append(Table((("(x, y)",), ("element of A",), ("norm",), ("the ideal B of norm n",)), tuple(rows)))
    blocks.append(
        para(
            "Here @B = (alpha) A^{-1}@, written @g · [m, (beta + sqrt(D))/2]@ with @g = gcd(x, y)@, "
            "@m = n/g^2@ and @beta^2 ≡ D (mod 4m)@ (checked); proper solutions (@g = 1@) give ideals not "
            "divisible by any rational integer, and distinct proper solutions up to the units give distinct "
            "@B@."
        )
    )
    if len(solutions) > IDEAL_READINGS_SHOWN:
        blocks.append(para(f"({len(solutions) - IDEAL_READINGS_SHOWN} further solutions read the same way.)"))
    return blocks, recs


def _cofactor_ideal(Q: Form, n: int, x: int, y: int) -> tuple[int, int]:
    """``(g, β)`` with ``B = (α)·A⁻¹ = g·[n/g², (β + √D)/2]``, ``g = gcd(x, y)``.

    ``B = α·Ā/a`` has the Z-basis ``α = (2ax + by − y√D)/2`` and ``α·(−b − √D)/(2a) =
    (−bx − 2cy − x√D)/2``; the combination ``x·α − y·(…)`` is the integer ``n``, and a
    combination with ``√D``-coefficient ``g`` gives ``β``, reduced modulo ``2m``.  The
    congruence ``β² ≡ D (mod 4m)`` is checked.
    """
    a, b, c = Q.coefficients
    D = Q.discriminant
    g, s, t = _xgcd(-y, -x)  # s·(−y) + t·(−x) = g
    u = s * (2 * a * x + b * y) + t * (-b * x - 2 * c * y)
    m = n // (g * g)
    beta = (u // g) % (2 * m)
    if beta > m:
        beta -= 2 * m
    if (beta * beta - D) % (4 * m):  # pragma: no cover - would contradict the algebra above
        raise ArithmeticError(f"cofactor ideal of ({x}, {y}) for {Q!r} = {n}: beta = {beta} is no root")
    return g, beta


def _xgcd(p: int, q: int) -> tuple[int, int, int]:
    """``(g, s, t)`` with ``s·p + t·q = g = gcd(p, q) ≥ 0``."""
    s0, s1, t0, t1 = 1, 0, 0, 1
    while q:
        k = p // q
        p, q = q, p - k * q
        s0, s1 = s1, s0 - k * s1
        t0, t1 = t1, t0 - k * t1
    return (p, s0, t0) if p >= 0 else (-p, -s0, -t0)


def _alpha_text(A: int, B: int, D: int) -> str:
    """``(A + B√D)/2`` in lowest terms: ``A/2 + (B/2)·√D`` written as ``A/2 ± |B| √(D/4)`` when ``4 | D``
    (then ``A`` is even), coefficient 1 left out."""
    if B == 0:
        return str(A // 2)
    sign = "-" if B < 0 else "+"
    if D % 4 == 0:
        root = f"sqrt({D // 4})" if abs(B) == 1 else f"{abs(B)} sqrt({D // 4})"
        return f"{A // 2} {sign} {root}"
    root = f"sqrt({D})" if abs(B) == 1 else f"{abs(B)} sqrt({D})"
    return f"({A} {sign} {root})/2"


def _m_pair(x: int, y: int) -> Math:
    s = f"({x}, {y})"
    return Math(s, s)


def explain_representation(
    form: FormLike, n: object, *, format: str = "md", fragment: bool = False, max_detail: int = 32
) -> str:
    """:func:`worked_representation` rendered as ``"md"`` or ``"tex"`` text.

    Examples
    --------
    >>> print(explain_representation((1, 0, 5), 21).splitlines()[0])
    # Representations of 21 by (1, 0, 5)
    """
    return worked_representation(form, n, max_detail=max_detail).render(format, fragment=fragment)
