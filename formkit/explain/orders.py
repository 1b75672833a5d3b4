"""Worked examples for orders: the class number formula with its factors, the kernel of
``Cl(O) → Cl(O_K)`` as forms and as ideals, and the ring class polynomial.

For ``D = f²·d_K`` with ``f > 1`` the order ``O`` of discriminant ``D`` has

    h(O) = h(O_K) · f / [O_K^× : O^×] · ∏_{p | f} (1 − (d_K/p)/p)

(Cox Theorem 7.24 for ``D < 0``; the same with wide class numbers for ``D > 0``), and
extension of ideals ``a ↦ a·O_K`` is a surjection ``Cl(O) → Cl(O_K)`` whose kernel has
``h(O)/h(O_K)`` classes (Cox Prop. 7.20 / Thm 7.24; numbers from memory).  All numbers are
computed by :mod:`formkit.classgroups.orders` and :mod:`formkit.core.ideals`; the blocks
here only state them, each sentence guarded by the condition it states.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §7 (orders), §9
       (ring class polynomials); theorem numbers from memory.
"""

from __future__ import annotations

from .document import Block, Display, Heading, Math, Table, m_form, para

__all__ = ["order_blocks", "ring_class_polynomial_blocks"]

#: Kernel classes listed in full (the rest are counted).
KERNEL_SHOWN = 24


def _ideal_math(ideal) -> Math:
    tex = ideal._repr_latex_().strip("$")
    return Math(tex, str(ideal).split(", ", 1)[1].rstrip(")") if "D=" in repr(ideal) else str(ideal))


def order_blocks(D: int) -> tuple[list[Block], dict]:
    """The order section for ``D = f²·d_K`` with ``f > 1`` (empty for ``f = 1``).

    Returns
    -------
    (list of blocks, dict)
        The blocks and their numbers (JSON-ready).

    Examples
    --------
    >>> blocks, data = order_blocks(-108)
    >>> data["class_number"], data["field_class_number"], data["unit_index"], data["kernel_size"]
    (3, 1, 3, 3)
    """
    from ..classgroups.orders import order_class_number, projection_kernel
    from ..core.ideals import ideal_from_form

    oc = order_class_number(D)
    f = oc.order.conductor
    if f == 1:
        return [], {}
    dK = D // (f * f)
    h, hK, u = oc.class_number, oc.field_class_number, oc.unit_index
    blocks: list[Block] = [Heading(2, "The order and its class number")]
    blocks.append(
        para(
            f"@D = {D} = {f}^2 · ({dK})@: the order @O@ of conductor @f = {f}@ in the quadratic field @K@ of "
            f"discriminant @{dK}@, whose maximal order @O_K@ has class number @h(O_K) = {hK}@. The class number "
            "formula for orders reads"
        )
    )
    prod_tex = "".join(
        rf"\left(1 - \frac{{{chi}}}{{{p}}}\right)" for p, chi, _v in oc.euler_factors
    )  # chi = (d_K/p)
    prod_plain = "".join(f"(1 - ({chi})/{p})" for p, chi, _v in oc.euler_factors)
    blocks.append(
        Display(
            Math(
                rf"h(\mathcal{{O}}) = \frac{{h(\mathcal{{O}}_K)\, f}}{{[\mathcal{{O}}_K^\times : "
                rf"\mathcal{{O}}^\times]}} \prod_{{p \mid f}} \left(1 - \frac{{(d_K/p)}}{{p}}\right) = "
                rf"\frac{{{hK} \cdot {f}}}{{{u}}} {prod_tex} = {h}",
                f"h(O) = h(O_K)·f/[O_K^× : O^×] · ∏_(p|f) (1 − (d_K/p)/p) = {hK}·{f}/{u} · {prod_plain} = {h}",
            )
        )
    )
    factors = ", ".join(f"@({dK}/{p}) = {chi}@" for p, chi, _v in oc.euler_factors)
    if D < 0:
        unit_why = (
            f"the unit index @[O_K^× : O^×] = {u}@ is the number of roots of unity of @O_K@ over that of @O@"
        )
    else:
        unit_why = (
            f"the unit index @[O_K^× : O^×] = {u}@ is the least @k@ with @epsilon_K^k@ in @O@, "
            "for the fundamental unit @epsilon_K@ of @O_K@"
        )
    blocks.append(para(f"Here {factors} for the primes dividing @f@, and {unit_why}."))
    kernel = projection_kernel(D)
    # the map on forms is on proper (narrow, for D > 0) classes
    hn, hKn = (h, hK) if D < 0 else (oc.class_number_narrow, oc.field_class_number_narrow)
    plus = "" if D < 0 else "^+"
    word = "" if D < 0 else "narrow "
    blocks.append(Heading(2, "The kernel of the map to the maximal order"))
    count = (
        f"has @h{plus}(O)/h{plus}(O_K) = {hn}/{hKn} = {len(kernel)}@ elements"
        if len(kernel) * hKn == hn
        else f"has {len(kernel)} elements"
    )
    blocks.append(
        para(
            f"Extending ideals from @O@ to @O_K@ maps the {word}class group @Cl{plus}(O)@ onto @Cl{plus}(O_K)@; "
            f"the kernel, the classes that become principal{' in the narrow sense' if D > 0 else ''} in @O_K@, "
            f"{count}. They are, as forms of discriminant @{D}@ and as ideals @[a, (-b + sqrt(D))/2]@ of @O@ "
            "(a basis over @Z@):"
        )
    )
    rows = []
    recs = []
    for x in kernel[:KERNEL_SHOWN]:
        ideal = ideal_from_form(x.form)
        rows.append(((m_form(x.form),), (_ideal_math(ideal),), (Math(str(x.order), str(x.order)),)))
        recs.append({"form": x.form.to_list(), "ideal": str(ideal), "order": x.order})
    blocks.append(Table((("form",), ("ideal of O",), ("order in Cl(O)",)), tuple(rows)))
    if len(kernel) > KERNEL_SHOWN:
        blocks.append(para(f"({len(kernel) - KERNEL_SHOWN} further kernel classes are not listed.)"))
    data = {
        "conductor": f,
        "fundamental_discriminant": dK,
        "class_number": h,
        "field_class_number": hK,
        "unit_index": u,
        "euler_factors": [[p, chi] for p, chi, _v in oc.euler_factors],
        "kernel_size": len(kernel),
        "kernel": recs,
    }
    return blocks, data


#: Polynomials printed in full up to this many characters.
POLYNOMIAL_SHOWN = 600


def ring_class_polynomial_blocks(D: int) -> tuple[list[Block], dict]:
    """The ring (or Hilbert) class polynomial of ``D < 0``, in full when it is short.

    Examples
    --------
    >>> blocks, data = ring_class_polynomial_blocks(-23)
    >>> data["coefficients"]
    [1, 3491750, -5151296875, 12771880859375]
    """
    from ..representation.class_polynomials import class_polynomial

    H = class_polynomial(D)
    name = "Hilbert class polynomial" if H.kind == "Hilbert" else "ring class polynomial"
    blocks: list[Block] = [Heading(2, f"The {name}")]
    blocks.append(
        para(
            f"@H(x) = ∏ (x - j(tau_Q))@ over the {H.degree} reduced forms @Q = (a, b, c)@, with "
            "@tau_Q = (-b + sqrt(D))/2a@ and @j@ the modular invariant; its coefficients are integers, and a "
            f"root generates the {'Hilbert' if H.kind == 'Hilbert' else 'ring'} class field over @K@. Each "
            "@j(tau_Q)@ is enclosed in a ball of complex numbers and the balls are multiplied out: "
            + H._how()  # the polynomial's own account of its certificate
            + "."
        )
    )
    terms = _poly_terms(H.coefficients)
    digits = max(len(str(abs(c))) for c in H.coefficients)
    if sum(map(len, terms)) <= POLYNOMIAL_SHOWN and digits <= 60:
        lines: list[list[str]] = [[]]
        for t in terms:  # about 60 characters per line of the display
            if lines[-1] and sum(map(len, lines[-1])) + len(t) > 60:
                lines.append([])
            lines[-1].append(t)
        tex = (
            r"\begin{aligned} H(x) = {} & " + r" \\ & ".join(" ".join(ln) for ln in lines) + r" \end{aligned}"
        )
        plain = "H(x) = " + " ".join(terms).replace("{", "").replace("}", "")
        blocks.append(Display(Math(tex, plain)))
    else:
        blocks.append(
            para(
                f"@H@ has degree {H.degree} and coefficients of up to {digits} digits, too long to print here "
                f"(the command formkit hilbert {D} prints it)."
            )
        )
    return blocks, {"degree": H.degree, "kind": H.kind, "coefficients": list(H.coefficients)}


def _poly_terms(coeffs: tuple[int, ...]) -> list[str]:
    """The nonzero terms of a polynomial (leading coefficient first), signed, one per row."""
    n = len(coeffs) - 1
    out: list[str] = []
    for i, c in enumerate(coeffs):
        if c == 0:
            continue
        k = n - i
        mono = "" if k == 0 else ("x" if k == 1 else f"x^{{{k}}}")
        num = "" if abs(c) == 1 and k else str(abs(c))
        sign = "-" if c < 0 else ("+" if out else "")
        out.append(f"{sign}{num}{mono}")
    return out
