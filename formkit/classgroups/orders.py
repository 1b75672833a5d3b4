"""Quadratic orders of conductor f: the projection Cl(D) → Cl(d_K) and the class number formula.

For ``D = f²·d_K`` the order ``O`` of discriminant ``D`` sits inside the maximal order
``O_K``.  Extending ideals from ``O`` to ``O_K`` gives a surjective homomorphism
``Cl(D) → Cl(d_K)``; on forms it sends a primitive form ``(a, b, c)`` with
``gcd(a, f) = 1`` to ``(a, b', ·)`` with ``f·b' ≡ b (mod 2a)`` and ``b' ≡ d_K (mod 2)``
(the ideal ``[a, (−b + f√d_K)/2]`` becomes ``[a, (−b' + √d_K)/2]``).  Its kernel has
order ``h(D)/h(d_K)``, and

    h(D) = h(d_K) · f / [O_K* : O*] · ∏_{p | f} (1 − χ_{d_K}(p)/p)

(Cox, *Primes of the Form x² + ny²*, Theorem 7.24 and Corollary 7.28 for D < 0;
the same formula with ordinary (wide) class numbers holds for D > 0, Cohen GTM 138
§5.? / Buell 1989 — number not recalled).  For ``D < 0`` the unit index is
``w(d_K)/w(D)``; for ``D > 0`` it is the least ``k`` with ``ε_K^k ∈ O``.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §7.
.. [2] D. A. Buell, *Binary Quadratic Forms*, Springer 1989, Ch. 7.
"""

from __future__ import annotations

from fractions import Fraction

from ..core.arith import kronecker
from ..core.discriminants import discriminant_parts, fundamental_unit, unit_index, validate_discriminant
from ..core.enumeration import class_number
from ..core.factorisation import prime_factorisation
from ..core.forms import Form
from ..core.order_projection import coprime_representative, project_to_maximal_order
from ..core.quadratic_orders import Order
from .dispatch import class_group
from .group import ClassGroup, ClassGroupElement, Provenance

__all__ = [
    "OrderClassNumber",
    "order_class_number",
    "IdealClassGroup",
    "ideal_class_group",
    "OrderKernel",
    "projection_kernel_structure",
    "coprime_representative",
    "project_to_maximal_order",
    "order_projection",
    "projection_kernel",
    "class_number_order_formula",
]


def order_projection(D: object) -> dict:
    """The homomorphism ``Cl(D) → Cl(d_K)`` as a dictionary of class group elements.

    Examples
    --------
    >>> proj = order_projection(-72)
    >>> sorted({y.form.to_list()[0] for y in proj.values()}), len(proj)
    ([1], 2)
    """
    D = validate_discriminant(D)
    d_K, _ = discriminant_parts(D)
    G, H = class_group(D), class_group(d_K)
    return {x: H(project_to_maximal_order(x.form)) for x in G}


def projection_kernel(D: object) -> list[ClassGroupElement]:
    """The kernel of ``Cl(D) → Cl(d_K)``: classes of ``D`` that become principal.

    Examples
    --------
    >>> len(projection_kernel(-4 * 27)), len(projection_kernel(-3 * 49))
    (3, 2)
    """
    return [x for x, y in order_projection(D).items() if y.is_identity()]


def class_number_order_formula(D: object) -> int:
    """``h(D)`` from ``h(d_K)`` by the class number formula for orders.

    For ``D > 0`` this is the wide class number (classes of invertible ideals).

    Examples
    --------
    >>> class_number_order_formula(-4 * 27), class_number_order_formula(-3 * 49)
    (3, 2)
    """
    D = validate_discriminant(D)
    d_K, f = discriminant_parts(D)
    # h(d_K) by enumeration (no group structure needed); wide sense for d_K > 0
    hK = class_number(d_K)
    if d_K > 0 and fundamental_unit(d_K).norm == 1:
        hK //= 2
    value = Fraction(hK * f, unit_index(D))
    for p in prime_factorisation(f):
        value *= 1 - Fraction(kronecker(d_K, p), p)
    if value.denominator != 1:  # pragma: no cover - would contradict the theorem
        raise ArithmeticError(f"class number formula gave a non-integer {value} for D = {D}")
    return int(value)


# -- the class number formula with every factor, the kernel with its structure -----------------
def _sigma(D: int) -> Form:
    """A form of the narrow class of the principal ideals with a generator of negative norm."""
    P = Form.principal(D)
    return Form(-1, P.b, -P.c)


class OrderClassNumber:
    """The class number formula for the order of discriminant ``D = f²·d_K``, with every factor.

    ``h(O) = h(O_K) · f / [O_K* : O*] · ∏_{p | f} (1 − χ_{d_K}(p)/p)`` (Cox, Theorem 7.24,
    for ``D < 0``; the same with the class numbers of ideal classes for ``D > 0``), and
    for ``D > 0`` the narrow class number ``h⁺(O) = h(O)·2`` if the fundamental unit of
    ``O`` has norm ``+1``, else ``h(O)``.

    Attributes: ``order`` (:class:`formkit.core.quadratic_orders.Order`),
    ``class_number`` (``h(O)``, ideal classes), ``class_number_narrow`` (``h⁺(O)``, forms up
    to proper equivalence), ``field_class_number`` and ``field_class_number_narrow`` (the
    same for ``O_K``), ``unit_index``, ``euler_factors`` (``(p, χ(p), 1 − χ(p)/p)`` for
    each ``p | f``), ``unit_norm`` (``N(ε_O)``, ``D > 0``), ``provenance`` (how ``h(O_K)``
    was obtained, from :func:`formkit.classgroups.dispatch.class_number_summary`).
    """

    __slots__ = (
        "class_number",
        "class_number_narrow",
        "euler_factors",
        "field_class_number",
        "field_class_number_narrow",
        "order",
        "provenance",
        "unit_index",
        "unit_norm",
    )
    order: Order
    class_number: int
    class_number_narrow: int
    field_class_number: int
    field_class_number_narrow: int
    unit_index: int
    euler_factors: tuple[tuple[int, int, Fraction], ...]
    unit_norm: int | None
    provenance: Provenance

    def __init__(self, **kw) -> None:
        for k in self.__slots__:
            setattr(self, k, kw[k])

    def formula_text(self) -> str:
        """``'h(O) = h(O_K) · f / [O_K* : O*] · ∏ (1 − χ(p)/p) = 1 · 6 / 3 · (1 + 1/2)(1 − 0/3) = 3'``."""
        f = self.order.conductor
        if f == 1:
            return f"h(O) = h(O_K) = {self.class_number} (O is the maximal order)"
        factors = "".join(
            f"(1 {'−' if chi >= 0 else '+'} {abs(chi)}/{p})" for p, chi, _v in self.euler_factors
        )
        return (
            f"h(O) = h(O_K) · f / [O_K* : O*] · ∏_(p|f) (1 − χ(p)/p) = {self.field_class_number} · {f} / "
            f"{self.unit_index} · {factors} = {self.class_number}"
        )

    def to_dict(self) -> dict:
        """JSON-ready; the keys are documented in the README (``class_number`` is ``h``, ``class_number_narrow`` is ``h⁺``)."""
        return {
            **self.order.to_dict(),
            "class_number": self.class_number,
            "class_number_narrow": self.class_number_narrow,
            "field_class_number": self.field_class_number,
            "field_class_number_narrow": self.field_class_number_narrow,
            "unit_index": self.unit_index,
            "euler_factors": [
                {"p": p, "kronecker_symbol": chi, "factor": f"{v.numerator}/{v.denominator}"}
                for p, chi, v in self.euler_factors
            ],
            "unit_norm": self.unit_norm,
            "formula": self.formula_text(),
            **self.provenance.to_dict(),
        }

    def __repr__(self) -> str:
        return f"<{self.order.describe()}: {self.formula_text()}; {self.provenance}>"

    def _repr_latex_(self) -> str:
        f = self.order.conductor
        prod = "".join(rf"\left(1 - \frac{{{chi}}}{{{p}}}\right)" for p, chi, _v in self.euler_factors)
        return (
            rf"$h(\mathcal{{O}}) = \frac{{h(\mathcal{{O}}_K)\, f}}{{[\mathcal{{O}}_K^\times : \mathcal{{O}}^\times]}}"
            rf"\prod_{{p \mid f}}\left(1 - \frac{{\chi(p)}}{{p}}\right) = \frac{{{self.field_class_number} \cdot {f}}}"
            rf"{{{self.unit_index}}}{prod} = {self.class_number}$ ({self.provenance})"
        )

    def _repr_html_(self) -> str:
        import html

        return html.escape(f"{self.order.describe()}: {self.formula_text()}; {self.provenance}")


def order_class_number(D: object, method: str = "auto", *, summaries: dict | None = None) -> OrderClassNumber:
    """The class number formula for the order of discriminant ``D``, with every factor.

    ``h(O_K)`` comes from :func:`formkit.classgroups.dispatch.class_number_summary` (its
    provenance is kept); the unit index is exact (:func:`formkit.core.discriminants.unit_index`)
    when the fundamental units can be written out, else the ratio of the regulators
    ``R(O)/R(O_K)`` rounded (checked to be within 10⁻⁶ of an integer).  ``summaries`` may
    hold results of ``class_number_summary`` already computed, keyed by discriminant.

    Examples
    --------
    >>> r = order_class_number(-108)
    >>> r.class_number, r.unit_index, r.euler_factors
    (3, 3, ((2, -1, Fraction(3, 2)), (3, 0, Fraction(1, 1))))
    >>> r.formula_text()
    'h(O) = h(O_K) · f / [O_K* : O*] · ∏_(p|f) (1 − χ(p)/p) = 1 · 6 / 3 · (1 + 1/2)(1 − 0/3) = 3'
    >>> r = order_class_number(4 * 94 * 9)   # Z[3√94]
    >>> r.class_number, r.class_number_narrow, r.field_class_number_narrow
    (2, 4, 2)
    """
    from .dispatch import class_number_summary

    D = validate_discriminant(D)
    order = Order(D)
    d_K, f = discriminant_parts(D)
    known = dict(summaries or {})

    def summary(d: int) -> dict:
        if d not in known:
            known[d] = class_number_summary(d, method)
        return known[d]

    sK = summary(d_K)

    prov = Provenance(sK["method"], sK["certified"], sK["assumption"], sK["bound"], sK.get("detail") or "")
    hK = sK["class_number"]
    if D < 0 or f == 1:
        index = unit_index(D) if D < 0 else 1
        norm = sK.get("fundamental_unit_norm")
    elif sK["regulator"] < 2000 and D < 10**40:  # ε_K can be written out: the exact index
        index = unit_index(D)  # the order of ε_K modulo f, without writing ε_K^index out
        norm = fundamental_unit(d_K).norm ** index  # ε_O = ε_K^index
    else:
        sD = summary(D)
        ratio = sD["regulator"] / sK["regulator"]
        index = round(ratio)
        if abs(ratio - index) > 1e-6 * ratio:  # pragma: no cover - would be a bug upstream
            raise ArithmeticError(f"R(O)/R(O_K) = {ratio} is not an integer for D = {D}")
        norm = sD["fundamental_unit_norm"]
    value = Fraction(hK * f, index)
    factors = []
    for p in sorted(prime_factorisation(f)):
        chi = kronecker(d_K, p)
        v = 1 - Fraction(chi, p)
        factors.append((p, chi, v))
        value *= v
    if value.denominator != 1:  # pragma: no cover - would contradict the theorem
        raise ArithmeticError(f"class number formula gave a non-integer {value} for D = {D}")
    h = int(value)
    narrow = h if D < 0 or norm == -1 else 2 * h
    return OrderClassNumber(
        order=order,
        class_number=h,
        class_number_narrow=narrow,
        field_class_number=hK,
        field_class_number_narrow=sK.get("class_number_narrow", hK),
        unit_index=index,
        euler_factors=tuple(factors),
        unit_norm=norm if D > 0 else None,
        provenance=prov,
    )


class IdealClassGroup:
    """``Cl(O)``, the ideal classes of the order, beside the narrow group ``Cl⁺(O)`` of proper form classes.

    For ``D < 0`` the two are the same.  For ``D > 0``, ``Cl(O) = Cl⁺(O)/⟨σ⟩`` with ``σ``
    the narrow class of the principal ideals whose generators have negative norm (the
    form ``(−1, b, −c)`` beside the principal form ``(1, b, c)``; ``σ = 1`` iff the
    fundamental unit has norm −1).  ``invariants`` and ``generators`` (forms representing
    ideal classes) describe ``Cl(O)``; ``narrow`` is the :class:`ClassGroup`.
    """

    __slots__ = ("generators", "invariants", "narrow")

    def __init__(self, narrow, invariants, generators) -> None:
        self.narrow = narrow
        self.invariants: tuple[int, ...] = tuple(invariants)
        self.generators: tuple[Form, ...] = tuple(generators)

    @property
    def class_number(self) -> int:
        """``h(O)``."""
        n = 1
        for k in self.invariants:
            n *= k
        return n

    @property
    def structure(self) -> str:
        """``'C2 × C4'`` (``'C1'`` if trivial)."""
        return " × ".join(f"C{n}" for n in self.invariants) or "C1"

    def to_dict(self) -> dict:
        """JSON-ready: ``invariants``, ``generators`` (forms), ``class_number``."""
        return {
            "class_number": self.class_number,
            "invariants": list(self.invariants),
            "structure": self.structure,
            "generators": [g.to_list() for g in self.generators],
        }

    def __repr__(self) -> str:
        return f"<class group Cl({self.narrow.discriminant}) of ideal classes ≅ {self.structure}; {self.narrow.provenance}>"

    def _repr_html_(self) -> str:
        import html

        prov = self.narrow.provenance
        mark = "" if prov.certified else " <b>[GRH]</b>"
        gens = ", ".join(f"({g.a}, {g.b}, {g.c})" for g in self.generators) or "none"
        D = self.narrow.discriminant
        beside = (
            f"; the narrow group Cl<sup>+</sup>({D}) ≅ {html.escape(self.narrow.structure)}" if D > 0 else ""
        )
        return (
            f"Cl({D}) ≅ {html.escape(self.structure)} (ideal classes), h = {self.class_number}; "
            f"generators {gens}{beside}{mark}<br><small>{html.escape(str(prov))}</small>"
        )

    def _repr_latex_(self) -> str:
        prov = self.narrow.provenance
        inv = r" \times ".join(f"C_{{{n}}}" for n in self.invariants) or "C_1"
        cond = "" if prov.certified else rf"\ [\text{{conditional on {prov.assumption}}}]"
        return rf"$\operatorname{{Cl}}({self.narrow.discriminant}) \cong {inv},\ h = {self.class_number}{cond}$ ({prov})"


def _relations(G) -> list[list[int]]:
    r = len(G.invariants)
    return [[n if i == j else 0 for j in range(r)] for i, n in enumerate(G.invariants)]


def ideal_class_group(D: object, method: str = "auto", *, group: ClassGroup | None = None) -> IdealClassGroup:
    """The class group of ideal classes ``Cl(O)`` of the order of discriminant ``D``.

    Examples
    --------
    >>> ideal_class_group(376).structure, ideal_class_group(376).narrow.structure   # Q(√94)
    ('C1', 'C2')
    >>> ideal_class_group(-4004).invariants
    (2, 2, 10)
    """
    from .finite_abelian import subquotient

    G = group if group is not None and group.discriminant == D else class_group(D, method)
    if G.discriminant < 0 or not G.invariants:
        return IdealClassGroup(G, G.invariants, [g.form for g in G.generators])
    r = len(G.invariants)
    s = list(G.discrete_log(_sigma(G.discriminant)))
    ident = [[int(i == j) for j in range(r)] for i in range(r)]
    inv, gens = subquotient(ident, _relations(G) + [s], r)
    return IdealClassGroup(G, inv, [G.element(v).form for v in gens])


class OrderKernel:
    """The kernel of ``Cl(O) → Cl(O_K)`` (extension of ideals), with structure and elements.

    ``invariants``/``generators``/``elements`` describe the kernel on proper form classes
    (``Cl⁺``; for ``D < 0`` this is ``Cl``).  For ``D > 0`` also ``wide_invariants``,
    ``wide_generators``: the kernel of ``Cl(O) → Cl(O_K)`` on ideal classes.  ``elements``
    is ``None`` when the kernel has more than ``element_limit`` classes.
    """

    __slots__ = (
        "discriminant",
        "elements",
        "generators",
        "invariants",
        "provenance",
        "wide_generators",
        "wide_invariants",
    )
    discriminant: int
    invariants: tuple[int, ...]
    generators: list[Form]
    elements: list[Form] | None
    wide_invariants: tuple[int, ...]
    wide_generators: list[Form]
    provenance: Provenance

    def __init__(self, **kw) -> None:
        for k in self.__slots__:
            setattr(self, k, kw[k])

    @property
    def order(self) -> int:
        """The number of classes in the kernel (``h⁺(O)/h⁺(O_K)``)."""
        n = 1
        for k in self.invariants:
            n *= k
        return n

    @property
    def wide_order(self) -> int:
        """``h(O)/h(O_K)``."""
        n = 1
        for k in self.wide_invariants:
            n *= k
        return n

    def to_dict(self) -> dict:
        """JSON-ready: ``order``, ``invariants``, ``generators``, ``elements`` (forms or null), and the ``wide_`` keys."""
        return {
            "order": self.order,
            "invariants": list(self.invariants),
            "structure": " × ".join(f"C{n}" for n in self.invariants) or "C1",
            "generators": [g.to_list() for g in self.generators],
            "elements": None if self.elements is None else [g.to_list() for g in self.elements],
            "wide_order": self.wide_order,
            "wide_invariants": list(self.wide_invariants),
            "wide_generators": [g.to_list() for g in self.wide_generators],
        }

    def __repr__(self) -> str:
        inv = " × ".join(f"C{n}" for n in self.invariants) or "C1"
        return (
            f"<kernel of Cl({self.discriminant}) → Cl(d_K): {inv}, {self.order} classes; {self.provenance}>"
        )

    def _repr_html_(self) -> str:
        import html

        inv = " × ".join(f"C{n}" for n in self.invariants) or "C1"
        gens = ", ".join(f"({g.a}, {g.b}, {g.c})" for g in self.generators) or "none"
        mark = "" if self.provenance.certified else " <b>[GRH]</b>"
        return (
            f"kernel of Cl({self.discriminant}) → Cl({discriminant_parts(self.discriminant)[0]}) ≅ {html.escape(inv)}, "
            f"{self.order} classes; generators {gens}{mark}<br><small>{html.escape(str(self.provenance))}</small>"
        )

    def _repr_latex_(self) -> str:
        inv = r" \times ".join(f"C_{{{n}}}" for n in self.invariants) or "C_1"
        p = self.provenance
        cond = "" if p.certified else rf"\ [\text{{conditional on {p.assumption}}}]"
        return (
            rf"$\ker\left(\operatorname{{Cl}}({self.discriminant}) \to "
            rf"\operatorname{{Cl}}({discriminant_parts(self.discriminant)[0]})\right) "
            rf"\cong {inv},\ {self.order}\text{{ classes}}{cond}$ ({p})"
        )


def projection_kernel_structure(
    D: object, method: str = "auto", element_limit: int = 1000, *, group: ClassGroup | None = None
) -> OrderKernel:
    """The kernel of ``Cl(O) → Cl(O_K)`` with its structure, generators and (when small) its elements.

    Computed as the kernel of the homomorphism on exponent vectors (Smith normal form,
    :mod:`formkit.classgroups.finite_abelian`), from the class groups of ``D`` and ``d_K``
    and the images of the generators (:func:`project_to_maximal_order`).

    Examples
    --------
    >>> k = projection_kernel_structure(-3 * 49)     # Z[(1+7√-3)/2]: kernel of order h = 2
    >>> k.order, k.invariants, [g.to_list() for g in k.elements]
    (2, (2,), [[1, 1, 37], [3, 3, 13]])
    """
    from .finite_abelian import homomorphism_kernel, subquotient

    D = validate_discriminant(D)
    d_K, _f = discriminant_parts(D)
    G = group if group is not None and group.discriminant == D else class_group(D, method)
    H = class_group(d_K, method)
    r = len(G.invariants)

    def solve(src_rel, tgt_rel, images):
        if r == 0:
            return (), []
        if not H.invariants and len(tgt_rel) == 0:
            return subquotient([[int(i == j) for j in range(r)] for i in range(r)], src_rel, r)
        return homomorphism_kernel(images, src_rel, tgt_rel, r)

    images = [list(H.discrete_log(project_to_maximal_order(g.form))) for g in G.generators]
    if not H.invariants:
        images = [[0] for _ in range(r)]
        tgt: list[list[int]] = [[1]]
    else:
        tgt = _relations(H)
    inv, gens = solve(_relations(G), tgt, images)
    gen_forms = [G.element(v).form for v in gens]
    elements = None
    count = 1
    for n in inv:
        count *= n
    if count <= element_limit:
        xs = [G.identity]
        for v, n in zip(gens, inv):
            g = G.element(v)
            xs = [x * g**j for x in xs for j in range(n)]
        elements = sorted((x.form for x in xs), key=lambda F: (abs(F.a), F.b))
    wide_inv, wide_gens = inv, gen_forms
    if D > 0 and r:
        src_w = _relations(G) + [list(G.discrete_log(_sigma(D)))]
        tgt_w = tgt + ([list(H.discrete_log(_sigma(d_K)))] if H.invariants else [])
        wi, wg = solve(src_w, tgt_w, images)
        wide_inv, wide_gens = wi, [G.element(v).form for v in wg]
    return OrderKernel(
        discriminant=D,
        invariants=inv,
        generators=gen_forms,
        elements=elements,
        wide_invariants=wide_inv,
        wide_generators=wide_gens,
        provenance=G.provenance,
    )
