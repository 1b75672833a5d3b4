"""The class group ``Cl(D)`` as an object: elements, composition, structure, provenance.

``Cl(D)`` is the group of proper equivalence classes of primitive forms of discriminant
``D`` (positive definite when ``D < 0``) under composition; for ``D > 0`` it is the
*narrow* class group of the order of discriminant ``D``.  A :class:`ClassGroup` holds
its structure: the invariant factors ``n1 | n2 | … | nk`` (so ``Cl(D) ≅ ⊕ Z/n_i``),
generators of exactly those orders, and a discrete logarithm of every class on them.
A :class:`ClassGroupElement` is a class, represented by its canonical reduced form; it
knows its group and supports ``*``, ``**`` (any integer), :meth:`~ClassGroupElement.inverse`
and :attr:`~ClassGroupElement.order`.

Every result records how it was obtained in :attr:`ClassGroup.provenance`.  The
groups are built by the methods :mod:`formkit.classgroups.enumerated`,
:mod:`formkit.classgroups.baby_step_giant_step` and
:mod:`formkit.classgroups.infrastructure`; :func:`formkit.class_group`
(:mod:`formkit.classgroups.dispatch`) chooses among them.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §2.4.3, §5.4, §5.5.
.. [2] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, Ch. 9.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator, Sequence
from dataclasses import dataclass

from ..core.arith import as_int, lcm, mpz
from ..core.composition import _compose_raw, _nucomp_bound, _nucomp_raw, _nudupl_raw
from ..core.discriminants import discriminant_parts, fundamental_unit
from ..core.displays import SentenceDisplay
from ..core.forms import Form, FormLike, as_form
from ..errors import DiscriminantMismatchError, FormError, FormkitError, NotPrimitiveError

__all__ = [
    "Provenance",
    "ClassGroup",
    "ClassGroupElement",
]

Triple = tuple[int, int, int]


@dataclass(frozen=True)
class Provenance(SentenceDisplay):
    """How a class-group result was obtained.

    ``method`` is ``"enumeration"`` or ``"bsgs"``; ``certified`` is true when the result
    is unconditional; ``assumption`` names a hypothesis it rests on (``"GRH"``) and
    ``bound`` the bound used with it (e.g. Bach's bound on the norms of the prime forms
    taken as generators).
    """

    method: str
    certified: bool
    assumption: str | None = None
    bound: int | None = None
    detail: str = ""

    def _display_sentence(self) -> str:
        return str(self)

    def _display_provenance(self) -> str:
        return (
            "conditional on GRH"
            if self.assumption == "GRH"
            else ("unconditional" if self.certified else "not certified")
        ) + ("" if self.bound is None else f", bound {self.bound}")

    def __str__(self) -> str:
        if self.certified:
            text = f"{self.method}, unconditional"
        else:
            text = f"{self.method}, conditional on {self.assumption}"
            if self.bound is not None:
                text += f" (bound {self.bound})"
        return text + (f"; {self.detail}" if self.detail else "")

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return {
            "method": self.method,
            "certified": self.certified,
            "assumption": self.assumption,
            "bound": self.bound,
            "detail": self.detail,
        }


ENUMERATED = Provenance("enumeration", True, None, None, "complete enumeration of reduced forms")


class ClassGroupElement:
    """A class of ``Cl(D)``, represented by its canonical reduced form.

    Create elements through the group: ``G(form)``, ``G.identity``, ``G.prime_form(p)``,
    iteration over ``G``.

    Examples
    --------
    >>> G = class_group(-23)
    >>> x = G((2, 1, 3))
    >>> x * x, x ** 3 == G.identity, x.order
    (ClassGroupElement(Form(2, -1, 3), D=-23), True, 3)
    """

    __slots__ = ("_form", "_group")
    _form: Triple
    _group: ClassGroup

    def __init__(self, group: ClassGroup, form: Triple) -> None:
        object.__setattr__(self, "_group", group)
        object.__setattr__(self, "_form", form)

    def __setattr__(self, name: str, value: object) -> None:
        raise AttributeError("ClassGroupElement is immutable")

    @property
    def group(self) -> ClassGroup:
        """The class group this element belongs to."""
        return self._group

    @property
    def form(self) -> Form:
        """The canonical reduced form of the class."""
        return Form(*self._form)

    def _check(self, other: object) -> ClassGroupElement:
        if not isinstance(other, ClassGroupElement):
            raise FormkitError(f"cannot compose a class with {other!r} (not a class group element)")
        if other._group.discriminant != self._group.discriminant:
            raise DiscriminantMismatchError(
                f"classes of different discriminants cannot be composed: "
                f"{self._group.discriminant} and {other._group.discriminant}"
            )
        return other

    def __mul__(self, other: ClassGroupElement) -> ClassGroupElement:
        other = self._check(other)
        return ClassGroupElement(self._group, self._group._mul(self._form, other._form))

    def __truediv__(self, other: ClassGroupElement) -> ClassGroupElement:
        return self * self._check(other).inverse()

    def inverse(self) -> ClassGroupElement:
        """The inverse class (that of ``(a, −b, c)``)."""
        a, b, c = self._form
        return ClassGroupElement(self._group, self._group._canon((a, -b, c)))

    __invert__ = inverse

    def __pow__(self, k: int) -> ClassGroupElement:
        k = as_int(k, "exponent")
        if k < 0:
            return self.inverse() ** (-k)
        G = self._group
        result = G._identity
        base = self._form
        while k:
            if k & 1:
                result = G._mul(result, base)
            k >>= 1
            if k:
                base = G._sqr(base)
        return ClassGroupElement(G, result)

    @property
    def order(self) -> int:
        """The order of the class in the group (from its discrete logarithm)."""
        e = self._group.discrete_log(self)
        n = 1
        for ei, ni in zip(e, self._group.invariants):
            n = lcm(n, ni // _gcd(ei, ni))
        return n

    def is_identity(self) -> bool:
        """True for the principal class."""
        return self._form == self._group._identity

    def __eq__(self, other: object) -> bool:
        if isinstance(other, ClassGroupElement):
            return self._group.discriminant == other._group.discriminant and self._form == other._form
        return NotImplemented

    def __hash__(self) -> int:
        return hash((self._group.discriminant, self._form))

    def __repr__(self) -> str:
        return f"ClassGroupElement({self.form!r}, D={self._group.discriminant})"

    def __str__(self) -> str:
        return f"[{self.form}]"

    def _repr_latex_(self) -> str:
        return r"$\left[" + self.form._repr_latex_().strip("$") + r"\right]$"

    def _repr_html_(self) -> str:
        """Notebook display: the class of its representative, with order and discrete log."""
        f = self.form
        return (
            f"class of ({f.a}, {f.b}, {f.c}) in Cl({self._group.discriminant}): order {self.order}, "
            f"discrete log {list(self._group.discrete_log(self))}"
        )


def _require_prime(p: object) -> int:
    from ..core.arith import is_probable_prime
    from ..errors import NotPrimeError

    p = as_int(p, "p")
    if not is_probable_prime(p):
        raise NotPrimeError(f"a Sylow subgroup needs a prime p, not {p}")
    return p


def _gcd(a: int, b: int) -> int:
    from math import gcd

    return gcd(a, b)


class ClassGroup:
    """The class group ``Cl(D)`` with its structure and how it was obtained.

    Obtain one with :func:`class_group`.  ``len(G)`` and ``G.order`` are the order of
    the group: for ``D > 0`` this is the *narrow* class group (forms up to proper
    equivalence, ``G.class_number_narrow = h⁺``), and ``G.class_number`` is the class
    number ``h`` of ideal classes of the order; ``G.invariants`` are ``n1 | n2 | …``;
    ``G.generators`` have exactly those orders; ``G.discrete_log(x)`` gives the
    exponents of ``x`` on them; ``G.provenance`` says how the result was obtained.

    Examples
    --------
    >>> G = class_group(-4004)
    >>> G.order, G.invariants, G.two_rank
    (40, (2, 2, 10), 3)
    >>> G.provenance.method, G.provenance.certified
    ('enumeration', True)
    >>> [g.order for g in G.generators]
    [2, 2, 10]
    """

    def __init__(
        self,
        discriminant: int,
        *,
        invariants: Sequence[int],
        generators: Sequence[Triple],
        dlog: Callable[[Triple], tuple[int, ...]],
        canonical: Callable[[Triple], Triple],
        provenance: Provenance,
        forms: Sequence[Triple] | None = None,
        units: tuple[float, int] | None = None,
    ) -> None:
        self._D = discriminant
        self._units = units  # (regulator, N(ε)) when D > 0 and the unit itself is not computed
        self._invariants = tuple(int(n) for n in invariants)
        self._generators = tuple(generators)
        self._dlog = dlog
        self._canon = canonical
        self._provenance = provenance
        self._forms = tuple(forms) if forms is not None else None
        self._identity = canonical(tuple(Form.principal(discriminant)))  # type: ignore[arg-type]
        Dz = mpz(discriminant)
        if discriminant < 0 and abs(discriminant) > 10**30:
            L = _nucomp_bound(discriminant)

            def mul(x: Triple, y: Triple) -> Triple:
                return canonical(_nucomp_raw(x[0], x[1], x[2], y[0], y[1], y[2], Dz, L))

            def sqr(x: Triple) -> Triple:
                return canonical(_nudupl_raw(x[0], x[1], x[2], Dz, L))

        else:
            D = discriminant

            def mul(x: Triple, y: Triple) -> Triple:
                return canonical(_compose_raw(x[0], x[1], x[2], y[0], y[1], y[2], D))

            def sqr(x: Triple) -> Triple:
                return canonical(_compose_raw(x[0], x[1], x[2], x[0], x[1], x[2], D))

        self._mul: Callable[[Triple, Triple], Triple] = mul
        self._sqr: Callable[[Triple], Triple] = sqr

    # -- basic data ------------------------------------------------------------
    @property
    def discriminant(self) -> int:
        """The discriminant D."""
        return self._D

    @property
    def fundamental_discriminant(self) -> int:
        """``d_K`` with ``D = f²·d_K``."""
        return discriminant_parts(self._D)[0]

    @property
    def conductor(self) -> int:
        """The conductor ``f`` of the order."""
        return discriminant_parts(self._D)[1]

    @property
    def order(self) -> int:
        """The order of this group: the narrow class number ``h⁺`` for D > 0 (``h`` for D < 0)."""
        n = 1
        for k in self._invariants:
            n *= k
        return n

    class_number_narrow = order

    def __len__(self) -> int:
        return self.order

    @property
    def invariants(self) -> tuple[int, ...]:
        """Invariant factors ``(n1, n2, …)`` with ``n1 | n2 | …`` and every ``n_i > 1``."""
        return self._invariants

    @property
    def generators(self) -> tuple[ClassGroupElement, ...]:
        """Generators of orders ``n1, n2, …`` (one per invariant factor)."""
        return tuple(ClassGroupElement(self, g) for g in self._generators)

    @property
    def provenance(self) -> Provenance:
        """How this group was computed (method, certified, assumption, bound)."""
        return self._provenance

    @property
    def identity(self) -> ClassGroupElement:
        """The principal class."""
        return ClassGroupElement(self, self._identity)

    @property
    def exponent(self) -> int:
        """The exponent of the group (the largest invariant factor, or 1)."""
        return self._invariants[-1] if self._invariants else 1

    @property
    def two_rank(self) -> int:
        """The 2-rank: the number of even invariant factors."""
        return sum(1 for n in self._invariants if n % 2 == 0)

    @property
    def is_narrow(self) -> bool:
        """True for D > 0, where this is the narrow (proper) class group."""
        return self._D > 0

    @property
    def structure(self) -> str:
        """The group as a product of cyclic groups, e.g. ``'C2 × C2 × C10'`` (``'C1'`` if trivial)."""
        return " × ".join(f"C{n}" for n in self._invariants) or "C1"

    # -- elements --------------------------------------------------------------
    def __call__(self, form: FormLike) -> ClassGroupElement:
        """The class of a primitive form of discriminant D (positive definite if D < 0)."""
        f = as_form(form)
        if f.discriminant != self._D:
            raise DiscriminantMismatchError(
                f"{f!r} has discriminant {f.discriminant}, not {self._D} as this class group"
            )
        if not f.is_primitive:
            raise NotPrimitiveError(f"class groups consist of primitive forms; {f!r} has content {f.content}")
        if self._D < 0 and f.a < 0:
            raise FormError(f"Cl({self._D}) consists of positive definite forms; {f!r} is negative definite")
        return ClassGroupElement(self, self._canon(f.coefficients))

    def element(self, value: Sequence[int] | FormLike | ClassGroupElement) -> ClassGroupElement:
        """A class: from what :meth:`__call__` takes (a form of discriminant D, in any
        notation) or from exponents ``(e_1, …)`` giving ``∏ g_i^{e_i}`` on the generators
        (inverse of :meth:`discrete_log`).

        A triple of integers is read as a form when it has discriminant D, else as
        exponents; when both readings are possible (three generators) it is refused, and
        ``Form(a, b, c)`` or a list of exponents of another length says which is meant.

        Examples
        --------
        >>> from formkit.classgroups.dispatch import class_group
        >>> G = class_group(-16428)
        >>> G.element(Form(13, 2, 316)) == G((13, 2, 316)) == G.element("13x^2 + 2xy + 316y^2")
        True
        >>> G.element((13, 2, 316)) == G((13, 2, 316)), G.element([1] * len(G.invariants)) in G
        (True, True)
        """
        if isinstance(value, ClassGroupElement):
            return self(value.form)
        if isinstance(value, (Form, str)):
            return self(value)
        items = list(value)
        if len(items) == 3 and all(isinstance(v, int) for v in items):
            a, b, c = items
            if b * b - 4 * a * c == self._D:
                if len(self._invariants) == 3:
                    raise FormkitError(
                        f"{tuple(items)} is both a form of discriminant {self._D} and exponents on the "
                        "three generators: pass Form(a, b, c) or G(...) for the class of the form"
                    )
                return self(tuple(items))
        exps = [as_int(e, "exponent") for e in items]
        if len(exps) != len(self._invariants):
            raise FormkitError(
                f"need {len(self._invariants)} exponents (one per invariant factor), not {len(exps)}"
            )
        x = self.identity
        for g, e in zip(self.generators, exps):
            x = x * g**e
        return x

    def discrete_log(self, x: ClassGroupElement | FormLike) -> tuple[int, ...]:
        """Exponents ``(e_1, …)`` with ``x = ∏ g_i^{e_i}``, ``0 ≤ e_i < n_i``.

        Examples
        --------
        >>> G = class_group(-4004)
        >>> x = G.prime_form(3)
        >>> G.element(G.discrete_log(x)) == x
        True
        """
        if not isinstance(x, ClassGroupElement):
            x = self(x)
        elif x.group.discriminant != self._D:
            raise DiscriminantMismatchError(f"{x!r} is not in Cl({self._D})")
        e = self._dlog(x._form)
        return tuple(int(ei) % ni for ei, ni in zip(e, self._invariants))

    def prime_form(self, p: int) -> ClassGroupElement:
        """The class of the prime form at ``p`` (needs ``χ_D(p) ≠ −1`` and a primitive form)."""
        return self(Form.prime_form(self._D, p))

    def elements(self) -> Iterator[ClassGroupElement]:
        """All classes (in the order of the enumeration when there was one)."""
        if self._forms is not None:
            for f in self._forms:
                yield ClassGroupElement(self, f)
            return
        yield from self._elements_from_structure()

    def _elements_from_structure(self) -> Iterator[ClassGroupElement]:
        def rec(i: int, x: ClassGroupElement) -> Iterator[ClassGroupElement]:
            if i == len(self._invariants):
                yield x
                return
            g = ClassGroupElement(self, self._generators[i])
            y = x
            for _ in range(self._invariants[i]):
                yield from rec(i + 1, y)
                y = y * g

        yield from rec(0, self.identity)

    def __iter__(self) -> Iterator[ClassGroupElement]:
        return self.elements()

    def __contains__(self, x: object) -> bool:
        return isinstance(x, ClassGroupElement) and x.group.discriminant == self._D

    def forms(self) -> list[Form]:
        """The canonical reduced form of every class."""
        return [x.form for x in self.elements()]

    def ambiguous_classes(self) -> list[ClassGroupElement]:
        """The classes of order ≤ 2 (there are ``2^two_rank`` of them)."""
        halves = [
            (ClassGroupElement(self, g) ** (n // 2))
            for g, n in zip(self._generators, self._invariants)
            if n % 2 == 0
        ]
        out = [self.identity]
        for h in halves:
            out = out + [x * h for x in out]
        return out

    def sylow_subgroup(self, p: int) -> list[ClassGroupElement]:
        """The elements of the p-Sylow subgroup (order a power of the prime ``p``)."""
        p = _require_prime(p)
        gens: list[ClassGroupElement] = []
        orders: list[int] = []
        for g, n in zip(self._generators, self._invariants):
            pk = 1
            while n % (pk * p) == 0:
                pk *= p
            if pk > 1:
                gens.append(ClassGroupElement(self, g) ** (n // pk))
                orders.append(pk)
        out = [self.identity]
        for element, n in zip(gens, orders):
            powers = [element**j for j in range(n)]
            out = [x * y for x in out for y in powers]
        return out

    def sylow_invariants(self, p: int) -> tuple[int, ...]:
        """Invariant factors of the p-Sylow subgroup."""
        p = _require_prime(p)
        out = []
        for n in self._invariants:
            pk = 1
            while n % (pk * p) == 0:
                pk *= p
            if pk > 1:
                out.append(pk)
        return tuple(out)

    # -- real quadratic extras ---------------------------------------------------
    @property
    def class_number(self) -> int:
        """The class number ``h``: ideal classes of the order (invertible ideals modulo principal ideals).

        For D < 0 this is the order of the group.  For D > 0 the group is the narrow one
        (forms up to proper equivalence, ``h⁺ = order``) and ``h = h⁺`` if the fundamental
        unit has norm −1, else ``h⁺/2``.
        """
        if self._D < 0:
            return self.order
        norm = self._units[1] if self._units is not None else fundamental_unit(self._D).norm
        return self.order if norm == -1 else self.order // 2

    #: The older name of :attr:`class_number` (``h``), kept for existing code.
    class_number_wide = class_number

    # -- output --------------------------------------------------------------------
    def to_dict(self) -> dict:
        """JSON-ready summary (keys as in ``formkit group D --json``)."""
        d_K, f = discriminant_parts(self._D)
        out: dict = {
            "discriminant": self._D,
            "fundamental_discriminant": d_K,
            "conductor": f,
            "class_number": self.class_number,
            "class_number_narrow": self.order,
            "invariants": list(self._invariants),
            "structure": self.structure,
            "generators": [list(g) for g in self._generators],
            "forms": [list(g) for g in self._forms] if self._forms is not None else None,
            "method": self._provenance.method,
            "certified": self._provenance.certified,
            "assumption": self._provenance.assumption,
            "bound": self._provenance.bound,
            "detail": self._provenance.detail,
        }
        if self._D > 0 and self._units is not None and self._units[0] > 2000:  # the unit has > 860 digits
            out["regulator"] = self._units[0]
            out["fundamental_unit"] = None
            out["fundamental_unit_norm"] = self._units[1]
        elif self._D > 0:
            unit = fundamental_unit(self._D)
            out["regulator"] = float(unit.regulator(20))
            out["fundamental_unit"] = [unit.t, unit.u]
            out["fundamental_unit_norm"] = unit.norm
        return out

    def __repr__(self) -> str:
        if self._D > 0:
            return (
                f"<narrow class group Cl⁺({self._D}) ≅ {self.structure} (forms up to proper equivalence), "
                f"h⁺ = {self.order}, h = {self.class_number}; {self._provenance}>"
            )
        return f"<class group Cl({self._D}) ≅ {self.structure}, h = {self.order}; {self._provenance}>"

    def _provenance_mark(self) -> str:
        # the condition a result rests on, visible beside it (empty when unconditional)
        p = self._provenance
        if p.certified:
            return "unconditional"
        return f"conditional on {p.assumption}" + (f", bound {p.bound}" if p.bound is not None else "")

    def _repr_html_(self) -> str:
        """Notebook display: structure, class numbers, generators and how it was obtained."""
        import html

        name = "Cl<sup>+</sup>" if self._D > 0 else "Cl"
        gens = ", ".join(f"({g.form.a}, {g.form.b}, {g.form.c})" for g in self.generators) or "none"
        mark = "" if self._provenance.certified else " <b>[GRH]</b>"
        return (
            f"{name}({self._D}) ≅ {html.escape(self.structure)}, "
            + (
                f"h<sup>+</sup> = {self.order}, h = {self.class_number}"
                if self._D > 0
                else f"h = {self.order}"
            )
            + f"; generators {gens}{mark}<br><small>{html.escape(str(self._provenance))}</small>"
        )

    def _repr_latex_(self) -> str:
        parts = r" \times ".join(f"C_{{{n}}}" for n in self._invariants) or "C_1"
        if not self._provenance.certified:
            parts += rf"\ [\text{{{self._provenance_mark()}}}]"
        if self._D > 0:
            return (
                rf"$\mathrm{{Cl}}^{{+}}({self._D}) \cong {parts},\ h^{{+}} = {self.order},\ h = {self.class_number}$"
                rf" (narrow: forms up to proper equivalence; {self._provenance})"
            )
        return rf"$\mathrm{{Cl}}({self._D}) \cong {parts},\ h = {self.order}$ ({self._provenance})"

    def __eq__(self, other: object) -> bool:
        if isinstance(other, ClassGroup):
            return self._D == other._D
        return NotImplemented

    def __hash__(self) -> int:
        return hash(("ClassGroup", self._D))
