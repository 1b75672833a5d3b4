"""Worked example: the class group of a discriminant with its class table and genera.

:func:`worked_class_group` lists the reduced forms, the structure of ``Cl(D)``, and the
class table with orders, discrete logarithms and the assigned genus characters (Cox,
§3, the table before Theorem 3.15), then checks genus theory on it: ``2^(μ−1)``
genera of equal size, the principal genus equal to the squares (Gauss).
:func:`explain_class_group` returns the rendered text (``formkit explain group``).

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §3.
.. [2] C. F. Gauss, *Disquisitiones Arithmeticae*, 1801, art. 229–287.
"""

from __future__ import annotations

from ..core.arith import isqrt
from ..core.forms import Form
from .document import (
    Block,
    Heading,
    Items,
    Math,
    Paragraph,
    Table,
    WorkedExample,
    _check_count,
    m_form,
    m_int,
    para,
    text,
)

__all__ = ["worked_class_group", "explain_class_group"]

#: The sources, printed once at the end of the example.
REFERENCES_LINE = (
    "References: D. A. Cox, Primes of the Form @x^2 + ny^2@, 2nd ed., Wiley 2013, Section 3 (genus theory) and "
    "Section 7 (orders), Sections 11 and 13 (ring class fields and class polynomials); H. Cohen, A Course in "
    "Computational Algebraic Number Theory, Springer 1993, Section 5.7 (continued fractions and the fundamental "
    "unit); C. F. Gauss, Disquisitiones Arithmeticae, 1801, art. 229-287."
)

#: Work out the ring class polynomial in the example up to this degree (its coefficients grow
#: like ``exp(π·Σ 1/a)·…``; at degree 100 they have thousands of digits and are only summarised).
POLYNOMIAL_DEGREE_LIMIT = 100


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
        q = ch.prime
        return Math(
            rf"+1 \text{{ if }} m \text{{ is a square modulo }} {q}\text{{, }} -1 \text{{ if not}}",
            f"+1 if m is a square modulo {q}, -1 if not",
        )
    return {
        "delta": Math(r"(-1)^{(m-1)/2}", "(-1)^((m-1)/2)"),
        "epsilon": Math(r"(-1)^{(m^2-1)/8}", "(-1)^((m²-1)/8)"),
        "delta*epsilon": Math(r"(-1)^{(m-1)/2 + (m^2-1)/8}", "(-1)^((m-1)/2 + (m²-1)/8)"),
    }[ch.kind]


def _kronecker_relation(D: int, chars, limit: int = 2 * 10**5) -> tuple[int, ...] | None:
    """The indices ``S`` with ``(D/m) = ∏_{i ∈ S} χ_i(m)`` for every ``m`` prime to ``D``.

    ``(D/m)`` is the Kronecker symbol, a character modulo ``|D|`` (even when ``D > 0``);
    the assigned characters are characters modulo ``|D|`` as well, so the relation is
    checked on every unit modulo ``|D|``.  ``None`` when ``|D| > limit`` (not checked)
    or when no product matches (not expected).
    """
    from itertools import combinations

    from ..core.arith import gcd, kronecker

    m_ = abs(D)
    if m_ > limit:
        return None
    units = [r for r in range(1, m_ + 1) if gcd(r, m_) == 1]
    table = [(kronecker(D, r), [ch(r) for ch in chars]) for r in units]
    idx = range(len(chars))
    for k in range(len(chars) + 1):
        for S in combinations(idx, k):
            if all(kd == _prod(v[i] for i in S) for kd, v in table):
                return S
    return None


def _prod(values) -> int:
    out = 1
    for v in values:
        out *= v
    return out


def _sign(s: int) -> Math:
    return Math("+1" if s > 0 else "-1", "+1" if s > 0 else "-1")


def _check_worked_cost(D: int, h: int) -> None:
    """Refuse a worked example whose checks need every one of ``h`` classes beyond the budget.

    The genus check squares every class and the table gives each a value prime to ``D``
    and a discrete logarithm: about ``2·10⁻³`` s and 4 KB a class (rounded up from
    ``h = 10^4``, under 10 s on the development machine).
    """
    from ..core.budget import check_cost, describe_integer

    check_cost(
        f"the worked class group of D = {describe_integer(D)} "
        f"(its checks visit all {describe_integer(h)} classes)",
        seconds=2e-3 * h,
        memory=4096.0 * h,
        further="formkit group D gives the structure without visiting every class",
    )


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
    from ..classgroups.dispatch import class_group
    from ..classgroups.genus import assigned_characters, value_prime_to
    from ..core.discriminants import validate_discriminant

    D = validate_discriminant(D)
    max_classes = _check_count(max_classes, "max_classes", 1)
    if D > 0:  # the class table lists the classes (by enumeration): priced before the group itself
        from ..core.enumeration import _check_enumeration_cost

        _check_enumeration_cost(D)
    G = class_group(D)
    prov = G.provenance
    title = f"The class group of discriminant {D}"
    d_K, f = G.fundamental_discriminant, G.conductor
    h = G.order
    _check_worked_cost(G.discriminant, h)
    blocks: list[Block] = [Heading(1, title)]
    what = "narrow class group" if D > 0 else "class group"
    plus = "^+" if D > 0 else ""
    blocks.append(
        para(
            (
                f"@D = {D} = {f}^2 · ({d_K})@, the order of conductor {f} in the field of discriminant {d_K}. "
                if f > 1
                else f"@D = {D}@ is a fundamental discriminant. "
            )
            + f"Its {what} @Cl{plus}({D})@ has order @h{plus} = {h}@; "
            + (
                "computed by complete enumeration of the reduced forms (unconditional)."
                if prov.certified
                else f"computed by {prov.method}, conditional on {prov.assumption}"
                + (f" (bound {prov.bound})." if prov.bound is not None else ".")
            )
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
                    f"A reduced form @(a, b, c)@ has @3a^2 <= |D|@, so @a <= {A}@; for each @a@ the values of @b@ with "
                    f"@|b| <= a@, @b ≡ D (mod 2)@ and @4a | b^2 - D@ give @c = (b^2 - D)/4a@, kept when "
                    f"@a <= c@ (and @b >= 0@ if @|b| = a@ or @a = c@) and @gcd(a, b, c) = 1@. The {h} primitive "
                    "reduced forms, one per class:"
                )
            )
            by_a: dict[int, list[Form]] = {}
            for x in G.elements():
                by_a.setdefault(x.form.a, []).append(x.form)
            blocks.append(
                Table(
                    ((Math("a", "a"),), ("reduced forms",)),
                    tuple(
                        ((m_int(a),), tuple(p for g in fs for p in (m_form(g), " "))[:-1])
                        for a, fs in sorted(by_a.items())
                    ),
                )
            )
        else:
            from ..core.reduction import _cycle_prefix

            blocks.append(
                para(
                    "For @D > 0@ each proper class holds a cycle of reduced forms under rho; one form per cycle "
                    "names the class:"
                )
            )
            cycle_rows = []
            for x in G.elements():
                cyc, complete = _cycle_prefix(x.form, 8)
                cycle_text = tuple(p for g in cyc for p in (m_form(g), " "))[:-1]
                cycle_rows.append(((m_form(x.form),), cycle_text + (() if complete else (" ...",))))
            blocks.append(Table((("class",), ("its cycle",)), tuple(cycle_rows)))
    if f > 1:
        from .orders import order_blocks

        ob, odata = order_blocks(D)
        blocks.extend(ob)
        data["order"] = odata
    blocks.append(Heading(2, "Structure"))
    gens = G.generators
    if gens:
        blocks.append(
            Paragraph(
                text(f"@Cl{plus}({D}) ≅ {G.structure.replace(' x ', ' × ')}@")
                + (", generated by ",)
                + tuple(
                    p for g, n in zip(gens, G.invariants) for p in (m_form(g.form), f" (order {n})", ", ")
                )[:-1]
                + text(f"; exponent {G.exponent}, 2-rank {G.two_rank}.")
            )
        )
    else:
        blocks.append(
            para(
                f"The group is trivial: every primitive form of discriminant {D} is equivalent to the principal form."
            )
        )

    chars = assigned_characters(D)
    mu = len(chars)
    expected = 1 << (mu - 1) if mu else 1
    blocks.append(Heading(2, "Genus characters"))
    if chars:
        blocks.append(
            para(
                f"The genus of a form is read off from any value @m@ of the form prime to @D@: the forms of one genus "
                f"take the same values in @(Z/{abs(D)}Z)^×@. The assigned characters of @D = {D}@ are the "
                f"following characters modulo @|D|@, evaluated at @m@ (at @2@, for odd @m@); "
                f"with @mu = {mu}@ characters there are @2^{{mu - 1}} = {expected}@ genera."
            )
        )
        blocks.append(
            Table(
                (("character",), ("definition",)),
                tuple(((_char_math(c),), (_char_formula(c),)) for c in chars),
            )
        )
        S = _kronecker_relation(D, chars)
        if S is not None:
            prod_tex = r" \cdot ".join(_char_math(chars[i]).tex for i in S) or "1"
            prod_plain = " · ".join(_char_math(chars[i]).plain for i in S) or "1"
            blocks.append(
                Paragraph(
                    text("For every @m@ prime to @D@ the Kronecker symbol satisfies ")
                    + (Math(rf"\left(\frac{{{D}}}{{m}}\right) = {prod_tex}", f"({D}/m) = {prod_plain}"),)
                    + text(
                        f" (checked for all residues @m@ modulo {abs(D)}). A value @m@ prime to @D@ of a form "
                        f"of discriminant @D@ has @(D/m) = 1@, because @D ≡ b^2@ modulo @4m@ for a proper "
                        "representation; so this product is @+1@ on every genus symbol, and only half of the "
                        f"@2^{{mu}}@ sign patterns occur."
                    )
                )
            )
    else:
        blocks.append(para("@D@ has no assigned characters: there is one genus."))

    blocks.append(Heading(2, "Class table"))
    elements = list(G.elements())
    shown = elements[:max_classes]
    sym_index: dict[tuple, int] = {}
    rows: list[tuple[tuple[Math | str, ...], ...]] = []
    recs: list[dict] = []
    for i, x in enumerate(shown, 1):
        fx = x.form
        mval, vx, vy = value_prime_to(fx, D)
        symbol = tuple(ch(mval) for ch in chars)
        dl = G.discrete_log(x)
        row: list[tuple[Math | str, ...]] = [
            (m_int(i),),
            (m_form(fx),),
            (m_int(x.order),),
            (m_int("(" + ", ".join(map(str, dl)) + ")"),),
            (Math(f"{mval} = Q({vx}, {vy})", f"{mval} = Q({vx}, {vy})"),),
        ]
        row.extend((_sign(s),) for s in symbol)
        rows.append(tuple(row))
        recs.append(
            {
                "form": fx.to_list(),
                "order": x.order,
                "discrete_log": list(dl),
                "value": [mval, vx, vy],
                "genus_symbol": list(symbol),
            }
        )
        sym_index.setdefault(symbol, len(sym_index))
    header: list[tuple[Math | str, ...]] = [
        ("#",),
        ("reduced form",),
        ("order",),
        ("discrete log",),
        ("value m",),
    ]
    header.extend((_char_math(c),) for c in chars)
    blocks.append(
        para(
            "Discrete logarithms are the exponents on the generators listed above; @m = Q(x, y)@ is a value of the "
            "form @Q@ prime to @D@, at the @(x, y)@ shown."
        )
    )
    blocks.append(Table(tuple(header), tuple(rows)))
    data["characters"] = [c.name for c in chars]
    data["classes"] = recs
    data["classes_complete"] = len(shown) == len(elements)
    if len(shown) < len(elements):
        blocks.append(
            para(
                f"({len(elements) - len(shown)} further classes not listed; raise max_classes, on the command line --limit N or --all.)"
            )
        )
        blocks.extend(_field_blocks(D, h, data))
        blocks.append(para(REFERENCES_LINE))
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
        sym_m = Math(
            "(" + ", ".join("+1" if s > 0 else "-1" for s in sym) + ")",
            "(" + ", ".join("+1" if s > 0 else "-1" for s in sym) + ")",
        )
        items.append(
            (f"{label}, symbol ", sym_m, ": ") + tuple(p for g in genera[sym] for p in (m_form(g), ", "))[:-1]
        )
    blocks.append(Items(tuple(items), numbered=False))
    squares = {(x * x).form for x in elements}
    principal = set(genera.get(one, []))
    sizes = {len(v) for v in genera.values()}
    ok_count = len(genera) == expected
    ok_sizes = len(sizes) == 1
    ok_squares = squares == principal
    ok_rank = expected == (1 << G.two_rank)
    checks = [
        text(
            f"Number of genera: {len(genera)}, as genus theory predicts (@2^{{mu - 1}} = {expected}@)"
            + ("." if ok_count else " -- MISMATCH.")
        ),
        text(
            f"Each genus has @h{plus}/{expected} = {h // expected if expected else h}@ classes"
            + ("." if ok_sizes else " -- MISMATCH: sizes " + str(sorted(sizes)) + ".")
        ),
        text(
            f"The principal genus is the set of squares @Cl{plus}(D)^2@ (Gauss)"
            + ("." if ok_squares else " -- MISMATCH.")
        ),
        text(
            f"The number of genera equals @2^r@ with @r = {G.two_rank}@ the 2-rank of the class group"
            + ("." if ok_rank else " -- MISMATCH.")
        ),
    ]
    blocks.append(Heading(3, "Checks of genus theory"))
    blocks.append(Items(tuple(checks)))
    data["genera"] = [{"symbol": list(s), "forms": [g.to_list() for g in genera[s]]} for s in order_keys]
    data["genus_count"] = len(genera)
    data["expected_genus_count"] = expected
    data["principal_genus_is_squares"] = ok_squares
    blocks.extend(_field_blocks(D, h, data))
    blocks.append(para(REFERENCES_LINE))
    return WorkedExample("group", title, data, tuple(blocks))


def _field_blocks(D: int, h: int, data: dict) -> list[Block]:
    """The ring class polynomial (``D < 0``, up to degree :data:`POLYNOMIAL_DEGREE_LIMIT`) or the
    continued fraction, fundamental unit and narrow against wide (``D > 0``); fills ``data``."""
    if D > 0:
        from .real_fields import real_field_blocks

        rb, data["unit"] = real_field_blocks(D)
        return rb
    from .orders import ring_class_polynomial_blocks

    if h <= POLYNOMIAL_DEGREE_LIMIT:
        pb, data["class_polynomial"] = ring_class_polynomial_blocks(D)
        return pb
    name = "Hilbert" if data.get("conductor", 1) == 1 else "ring"
    return [
        Heading(2, f"The {name} class polynomial"),
        para(
            f"Its degree is @h = {h}@, more than the {POLYNOMIAL_DEGREE_LIMIT} worked out here; the command "
            f"formkit hilbert {D} computes it."
        ),
    ]


def explain_class_group(
    D: object, *, format: str = "md", fragment: bool = False, max_classes: int = 500
) -> str:
    """:func:`worked_class_group` rendered as ``"md"`` or ``"tex"`` text.

    Examples
    --------
    >>> print(explain_class_group(-84).splitlines()[0])
    # The class group of discriminant -84
    """
    return worked_class_group(D, max_classes=max_classes).render(format, fragment=fragment)
