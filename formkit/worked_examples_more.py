"""Worked examples of representations of integers and of class groups with genera.

The second half of :mod:`formkit.worked_examples` (which re-exports both functions).

* :func:`worked_representation` follows the square-root method: a proper
  representation ``Q(x, y) = m`` is the first column of a matrix ``M ∈ SL2(Z)`` with
  ``Q·M = (m, b, c)``, ``b`` determined modulo ``2m`` with ``b² ≡ D (mod 4m)``; so one
  lists those ``b``, reduces each ``(m, b, (b² − D)/4m)`` and keeps the ones properly
  equivalent to ``Q``; the matrix of the equivalence gives ``(x, y)``, and the proper
  automorphs of ``Q`` give the others (``w`` of them when ``D < 0``; one orbit under the
  infinite automorphism group when ``D > 0``).  All solutions are ``g`` times the proper
  ones of ``n/g²``, ``g² | n``.  (Gauss, *Disquisitiones* art. 154–170; Cox, *Primes of
  the Form x² + ny²*, Lemma 2.5 and §2.A; Buchmann–Vollmer, *Binary Quadratic Forms*,
  §3.2 — numbers as recalled.)  Written from the mathematics; the tests compare its
  solutions with :func:`formkit.representation.representations.represent`.
* :func:`worked_class_group` lists the reduced forms, the structure of ``Cl(D)``, and the
  class table with orders, discrete logarithms and the assigned genus characters (Cox,
  §3, the table before Theorem 3.15), then checks genus theory on it: ``2^(μ−1)``
  genera of equal size, the principal genus equal to the squares (Gauss).

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §2–§3.
.. [2] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, §3.2.
.. [3] C. F. Gauss, *Disquisitiones Arithmeticae*, 1801, art. 154–170, 229–287.
"""

from __future__ import annotations

from .core.arith import as_int, factorint, gcd, isqrt
from .core.modular_roots import sqrt_mod
from .errors import FormkitError
from .core.forms import Form, FormLike, Matrix, _require_nonsquare, as_form, mat_inverse, mat_mul
from .core.reduction import reduce_form
from .worked_examples_text import (
    Block,
    Heading,
    Items,
    Math,
    Paragraph,
    Table,
    WorkedExample,
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

__all__ = ["worked_representation", "worked_class_group"]

#: Longest cycle of reduced forms a worked representation walks (indefinite forms).
MAX_CYCLE = 100_000


def _check_count(value: object, name: str, least: int) -> int:
    v = as_int(value, name)
    if v < least:
        raise FormkitError(f"{name} must be at least {least}, not {v}")
    return v


def _square_divisors(m: int) -> list[int]:
    """All ``g ≥ 1`` with ``g² | m`` (``m ≠ 0``), increasing."""
    gs = [1]
    for p, e in (factorint(abs(m)) if abs(m) > 1 else {}).items():
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
    title = f"Representations of {n} by {Q.to_list()}"
    blocks: list[Block] = [
        Heading(1, title),
        Paragraph(
            ("We solve ", Math(m_poly(Q).tex + f" = {n}", f"{Q} = {n}"))
            + text(f" for integers x, y; the form has discriminant @D = {D}@.")
        ),
        para(
            "Method (Gauss; Cox, Primes of the Form @x^2 + ny^2@, Lemma 2.5): a proper solution (@gcd(x, y) = 1@) "
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
        return WorkedExample("represent", title, data, tuple(blocks))
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
        note.append(f"The coefficients have common divisor @{k}@: we solve @{P.a}x^2 + ({P.b})xy + ({P.c})y^2 = {m}@.")
    if none is None and D < 0 and m < 0:
        none = f"A positive definite form takes no negative value such as {m}: no solutions."
    for t in note:
        blocks.append(para(t))
    if none is not None:
        blocks.append(Paragraph((none,)))
        data.update(count=0, primitive_count=0, solutions=[], roots=[])
        return WorkedExample("represent", title, data, tuple(blocks))

    DP = P.discriminant
    blocks.append(Heading(2, "The reduced form of Q"))
    red_P = reduce_form(P, steps=True)
    rb, _ = reduction_blocks(red_P)
    blocks.extend(rb)
    # index: reduced form R properly equivalent to P  ->  N with P·N = R
    index: dict[Form, Matrix] = {red_P.reduced: red_P.matrix}
    if DP > 0:
        from .core.reduction import reduced_cycle

        cyc = reduced_cycle(P, max_length=MAX_CYCLE)
        N = red_P.matrix
        for f_i, step in zip(cyc.forms[1:], cyc.matrices):
            N = mat_mul(N, step)
            index[f_i] = N
        blocks.append(
            para(
                f"Q is indefinite: a form is properly equivalent to Q exactly when its reduction lands on the cycle "
                f"of the reduced form of Q, which has {len(cyc)} forms: "
                + ", ".join(f"@{g.to_list()}@" for g in cyc.forms[:40])
                + (" and more." if len(cyc) > 40 else ".")
            )
        )
        automorphs: list[Matrix] = []
    else:
        from .core.equivalence import automorphism_group

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
        blocks.append(Heading(2, f"g = {g}: proper solutions of Q(x, y) = {mm}" + (f", times {g}" if g > 1 else "")))
        roots = [int(b) for b in sqrt_mod(DP, 4 * am) if b < 2 * am]
        if not roots:
            blocks.append(para(f"No b in @[0, {2 * am})@ has @b^2 ≡ {DP} (mod {4 * am})@: {DP} is not a square modulo {4 * am}."))
            continue
        blocks.append(
            para(
                f"The b in @[0, {2 * am})@ with @b^2 ≡ {DP} (mod {4 * am})@: "
                + ", ".join(f"@{b}@" for b in roots) + "."
            )
        )
        rows = []
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
            N = index.get(rf.reduced)
            rec["reduced"] = rf.reduced.to_list()
            if N is None:
                rows.append((m_int(b), m_form(F), ("yes",), (m_form(rf.reduced),), ("no",), ("-",)))
                rec.update(equivalent=False, matrix=None, solution=None)
            else:
                M = mat_mul(N, mat_inverse(rf.matrix))  # P·M = F
                x, y = M[0][0], M[1][0]
                if P.transform(M) != F or P(x, y) != mm:  # pragma: no cover - would be a bug
                    raise ArithmeticError(f"representation of {mm} by {P!r}: matrix check failed")
                sol = (g * x, g * y)
                rows.append((m_int(b), m_form(F), ("yes",), (m_form(rf.reduced),), ("yes",), (m_vector(sol),)))
                rec.update(equivalent=True, matrix=matrix_list(M), solution=list(sol))
                if automorphs:
                    solutions.extend((g * (A[0][0] * x + A[0][1] * y), g * (A[1][0] * x + A[1][1] * y)) for A in automorphs)
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
            if N is None:
                details.append(Paragraph(("The reduced form ", m_form(rf.reduced), " is not that of Q: no solution from this b.")))
            else:
                details.append(
                    Paragraph(
                        ("It is " + ("on the cycle of Q" if DP > 0 else "the reduced form of Q") + ", so ",
                         m_form(F), " = Q·M with ", m_matrix(M))
                        + text(" (the matrix taking Q to that reduced form times the inverse of this reduction "
                               f"matrix); its first column "
                               f"@({x}, {y})@ gives @Q({x}, {y}) = {mm}@")
                        + (text(f"; scaled by g: @{sol}@.") if g > 1 else (".",))
                    )
                )
        blocks.append(
            Table(
                (("b",), ("form (m, b, c)",), ("primitive",), ("reduced",), ("equivalent to Q",), ("solution (x, y)",)),
                tuple(rows),
            )
        )
        blocks.extend(details)
    if omitted:
        blocks.append(para(f"(Reduction steps of {omitted} further roots are not shown; see max_detail.)"))

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
                    + ", ".join(f"@{v}@" for v in solutions) + "."
                )
            )
        else:
            blocks.append(para(f"No solutions: Q does not represent {n}."))
    else:
        data.update(count=None, orbit_count=len(solutions), solutions=[list(v) for v in solutions])
        if solutions:
            blocks.append(
                para(
                    f"Infinitely many solutions, in {len(solutions)} orbits under the automorphs of Q; one solution "
                    "per orbit: " + ", ".join(f"@{v}@" for v in solutions) + "."
                )
            )
        else:
            blocks.append(para(f"No solutions: Q does not represent {n}."))
    return WorkedExample("represent", title, data, tuple(blocks))


# ---------------------------------------------------------------------------
# class groups


def _char_math(ch) -> Math:
    if ch.kind == "odd prime":
        return Math(rf"\left(\frac{{m}}{{{ch.prime}}}\right)", f"(m/{ch.prime})")
    return {
        "delta": Math(r"\delta(m)", "δ(m)"),
        "epsilon": Math(r"\varepsilon(m)", "ε(m)"),
        "delta*epsilon": Math(r"\delta\varepsilon(m)", "δε(m)"),
    }[ch.kind]


def _char_formula(ch) -> Math:
    if ch.kind == "odd prime":
        return Math(rf"\text{{Legendre symbol modulo }} {ch.prime}", f"Legendre symbol modulo {ch.prime}")
    return {
        "delta": Math(r"(-1)^{(m-1)/2}", "(-1)^((m-1)/2)"),
        "epsilon": Math(r"(-1)^{(m^2-1)/8}", "(-1)^((m²-1)/8)"),
        "delta*epsilon": Math(r"(-1)^{(m-1)/2 + (m^2-1)/8}", "(-1)^((m-1)/2 + (m²-1)/8)"),
    }[ch.kind]


def _sign(s: int) -> Math:
    return Math("+1" if s > 0 else "-1", "+1" if s > 0 else "-1")


def worked_class_group(D: object, *, max_classes: int = 500) -> WorkedExample:
    """The class group of ``D`` with its class table and genus characters.

    Parameters
    ----------
    D : int
        A non-square discriminant.
    max_classes : int
        List at most this many classes (the genus checks need all of them and are
        left out beyond).

    Returns
    -------
    WorkedExample

    Raises
    ------
    DiscriminantError
        If ``D`` is not a non-square discriminant.

    Examples
    --------
    >>> ex = worked_class_group(-84)
    >>> ex.data["invariants"], ex.data["genus_count"], ex.data["principal_genus_is_squares"]
    ([2, 2], 4, True)
    >>> [row["form"] for row in ex.data["classes"]]
    [[1, 0, 21], [2, 2, 11], [3, 0, 7], [5, 4, 5]]
    """
    from .classgroups.dispatch import class_group
    from .core.discriminants import validate_discriminant
    from .classgroups.genus import assigned_characters, value_prime_to

    D = validate_discriminant(D)
    max_classes = _check_count(max_classes, "max_classes", 1)
    G = class_group(D)
    prov = G.provenance
    title = f"The class group of discriminant {D}"
    d_K, f = G.fundamental_discriminant, G.conductor
    h = G.order
    blocks: list[Block] = [Heading(1, title)]
    what = "narrow class group" if D > 0 else "class group"
    blocks.append(
        para(
            (f"@D = {D} = {f}^2 · ({d_K})@, the order of conductor {f} in the field of discriminant {d_K}. "
             if f > 1 else f"@D = {D}@ is a fundamental discriminant. ")
            + f"Its {what} @Cl({D})@ has order @h = {h}@; "
            + ("computed by complete enumeration of the reduced forms (unconditional)." if prov.certified
               else f"computed by {prov.method}, conditional on {prov.assumption}"
               + (f" (bound {prov.bound})." if prov.bound is not None else "."))
        )
    )
    data: dict = {
        "discriminant": D,
        "fundamental_discriminant": d_K,
        "conductor": f,
        "class_number": h,
        "invariants": list(G.invariants),
        "generators": [g.form.to_list() for g in G.generators],
        "provenance": prov.to_dict(),
    }
    if prov.method == "enumeration" and h <= max_classes:
        blocks.append(Heading(2, "Reduced forms"))
        if D < 0:
            A = int(isqrt(-D // 3))
            blocks.append(
                para(
                    f"A reduced form @(a, b, c)@ has @3a^2 <= |D|@, so @a <= {A}@; for each a the b with "
                    f"@|b| <= a@, @b ≡ D (mod 2)@ and @4a | b^2 - D@ give @c = (b^2 - D)/4a@, kept when "
                    f"@a <= c@ (and @b >= 0@ if @|b| = a@ or @a = c@) and @gcd(a, b, c) = 1@. The {h} primitive "
                    "reduced forms, one per class:"
                )
            )
            by_a: dict[int, list[Form]] = {}
            for x in G.elements():
                by_a.setdefault(x.form.a, []).append(x.form)
            blocks.append(
                Table((("a",), ("reduced forms",)),
                      tuple(((m_int(a),), tuple(p for g in fs for p in (m_form(g), " "))[:-1]) for a, fs in sorted(by_a.items())))
            )
        else:
            from .core.reduction import _cycle_prefix

            blocks.append(
                para(
                    "For @D > 0@ each proper class holds a cycle of reduced forms under rho; one form per cycle "
                    "names the class:"
                )
            )
            rows = []
            for x in G.elements():
                cyc, complete = _cycle_prefix(x.form, 8)
                shown = tuple(p for g in cyc for p in (m_form(g), " "))[:-1]
                rows.append(((m_form(x.form),), shown + (() if complete else (" ...",))))
            blocks.append(Table((("class",), ("its cycle",)), tuple(rows)))
    blocks.append(Heading(2, "Structure"))
    gens = G.generators
    if gens:
        blocks.append(
            Paragraph(
                text(f"@Cl({D}) ≅ {G.structure.replace(' x ', ' × ')}@")
                + (", generated by ",)
                + tuple(p for g, n in zip(gens, G.invariants) for p in (m_form(g.form), f" (order {n})", ", "))[:-1]
                + text(f"; exponent {G.exponent}, 2-rank {G.two_rank}.")
            )
        )
    else:
        blocks.append(para(f"The group is trivial: every primitive form of discriminant {D} is equivalent to the principal form."))

    chars = assigned_characters(D)
    mu = len(chars)
    expected = 1 << (mu - 1) if mu else 1
    blocks.append(Heading(2, "Genus characters"))
    if chars:
        blocks.append(
            para(
                f"The assigned characters of D (Cox, Primes of the Form @x^2 + ny^2@, Section 3) are evaluated at a "
                f"value m of the form prime to D; with @mu = {mu}@ characters there are "
                f"@2^{{mu - 1}} = {expected}@ genera."
            )
        )
        blocks.append(Table((("character",), ("value at m",)), tuple(((_char_math(c),), (_char_formula(c),)) for c in chars)))
    else:
        blocks.append(para("D has no assigned characters: there is one genus."))

    blocks.append(Heading(2, "Class table"))
    elements = list(G.elements())
    shown = elements[:max_classes]
    sym_index: dict[tuple, int] = {}
    rows = []
    recs = []
    for i, x in enumerate(shown, 1):
        fx = x.form
        mval, vx, vy = value_prime_to(fx, D)
        symbol = tuple(ch(mval) for ch in chars)
        dl = G.discrete_log(x)
        row = [(m_int(i),), (m_form(fx),), (m_int(x.order),), (m_int("(" + ", ".join(map(str, dl)) + ")"),),
               (Math(f"{mval} = Q({vx}, {vy})", f"{mval} = Q({vx}, {vy})"),)]
        row.extend((_sign(s),) for s in symbol)
        rows.append(tuple(row))
        recs.append({"form": fx.to_list(), "order": x.order, "discrete_log": list(dl), "value": [mval, vx, vy],
                     "genus_symbol": list(symbol)})
        sym_index.setdefault(symbol, len(sym_index))
    header = [("#",), ("reduced form",), ("order",), ("discrete log",), ("value m",)]
    header.extend((_char_math(c),) for c in chars)
    blocks.append(
        para(
            "Discrete logarithms are the exponents on the generators listed above; m is a value of the form prime "
            "to D, at the (x, y) shown."
        )
    )
    blocks.append(Table(tuple(header), tuple(rows)))
    data["characters"] = [c.name for c in chars]
    data["classes"] = recs
    data["classes_complete"] = len(shown) == len(elements)
    if len(shown) < len(elements):
        blocks.append(para(f"({len(elements) - len(shown)} further classes not listed; see max_classes.)"))
        return WorkedExample("group", title, data, tuple(blocks))

    blocks.append(Heading(2, "Genera"))
    genera: dict[tuple, list[Form]] = {}
    for rec in recs:
        genera.setdefault(tuple(rec["genus_symbol"]), []).append(Form(*rec["form"]))
    one = tuple(1 for _ in chars)
    order_keys = sorted(genera, key=lambda s: (s != one, tuple(-v for v in s)))
    items = []
    for j, sym in enumerate(order_keys, 1):
        label = "principal genus" if sym == one else f"genus {j}"
        sym_m = Math("(" + ", ".join("+1" if s > 0 else "-1" for s in sym) + ")",
                     "(" + ", ".join("+1" if s > 0 else "-1" for s in sym) + ")")
        items.append((f"{label}, symbol ", sym_m, ": ") + tuple(p for g in genera[sym] for p in (m_form(g), ", "))[:-1])
    blocks.append(Items(tuple(items), numbered=False))
    squares = {(x * x).form for x in elements}
    principal = set(genera.get(one, []))
    sizes = {len(v) for v in genera.values()}
    ok_count = len(genera) == expected
    ok_sizes = len(sizes) == 1
    ok_squares = squares == principal
    ok_rank = expected == (1 << G.two_rank)
    checks = [
        text(f"Number of genera: {len(genera)}, as genus theory predicts (@2^{{mu - 1}} = {expected}@)"
             + ("." if ok_count else " -- MISMATCH.")),
        text(f"Each genus has @h/{expected} = {h // expected if expected else h}@ classes"
             + ("." if ok_sizes else " -- MISMATCH: sizes " + str(sorted(sizes)) + ".")),
        text("The principal genus is the set of squares @Cl(D)^2@ (Gauss)" + ("." if ok_squares else " -- MISMATCH.")),
        text(f"The number of genera equals @2^r@ with r the 2-rank {G.two_rank} of the class group"
             + ("." if ok_rank else " -- MISMATCH.")),
    ]
    blocks.append(Heading(3, "Checks of genus theory"))
    blocks.append(Items(tuple(checks)))
    data["genera"] = [{"symbol": list(s), "forms": [g.to_list() for g in genera[s]]} for s in order_keys]
    data["genus_count"] = len(genera)
    data["expected_genus_count"] = expected
    data["principal_genus_is_squares"] = ok_squares
    return WorkedExample("group", title, data, tuple(blocks))
