"""Which primes a form represents: the criterion in words, class polynomials, densities.

Let ``Q`` be a primitive form of non-square discriminant ``D`` (positive definite when
``D < 0``) and ``C`` its class in ``Cl(D)`` (the narrow class group when ``D > 0``).

:func:`prime_criterion` and :func:`represented_primes` put together the per-prime
decision (:mod:`formkit.representation.prime_decision`), the congruence criteria
(:mod:`formkit.representation.genus_congruences`) and the following.

*Class polynomials* (Cox Theorem 9.2 for ``x² + ny²`` and Theorem 9.4 for orders;
Theorem 11.1: ``K(j(O))`` is the ring class field; numbers as recalled).  For ``D < 0``
and an odd prime ``p ∤ D·disc(H_D)``, the principal form represents ``p`` iff
``χ_D(p) = 1`` and ``H_D(x) ≡ 0 (mod p)`` has a solution.  More generally, for such
``p`` with ``χ_D(p) = 1``, ``H_D`` factors modulo ``p`` into irreducible factors all
of degree equal to the order of the class of the prime form at ``p``.

*When congruences suffice* (Chebotarev; Cox §9).  The primes represented by ``Q``
are described by congruence conditions exactly when the genus ``C·Cl²`` of ``Q`` is
``{C, C⁻¹}`` (:func:`has_congruence_criterion`): the genus always contains ``C`` and
``C⁻¹``, these two classes represent the same numbers, and a congruence condition only
sees the Frobenius modulo the commutator subgroup ``Cl²`` of ``Cl ⋊ Z/2``.  So a class
and its inverse alone in a genus (``h/2^r = 2``, ``C`` of order 4) have a criterion too,
although that discriminant has more than one class per genus.

*Densities* (Chebotarev; Cox Theorem 9.12 / §9.B, number as recalled).  The ring class
field ``L`` (narrow ring class field when ``D > 0``) is Galois over ``Q`` with group
``Cl(D) ⋊ Z/2``, the generator of ``Z/2`` acting by inversion; the primes represented
by ``Q`` are, up to finitely many, those whose Frobenius lies in the conjugacy class
``{σ_C, σ_C⁻¹}``, of size 1 when ``C`` has order ≤ 2 and 2 otherwise.  So among *all*
primes they have Dirichlet (and natural) density ``1/(2h)`` when ``C`` has order ≤ 2
and ``1/h`` otherwise.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §2 (Lemma 2.5,
       Theorem 2.26, Corollary 2.27), §3 (genus theory), §9 (Theorems 9.2, 9.4, 9.12),
       §11 (Theorem 11.1); numbers as recalled.
.. [2] C. F. Gauss, *Disquisitiones Arithmeticae*, 1801, art. 229–287 (genera).
.. [3] L. Euler, on numeri idonei (1778); the list of 65 idoneal numbers (from memory).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction
from typing import Any

from ..classgroups.dispatch import class_group
from ..core.budget import check_cost
from ..core.displays import SentenceDisplay
from ..core.forms import Form, FormLike
from ..core.progress import progress_bar
from ..errors import FormkitError
from .genus_congruences import RESIDUE_LIMIT, genus_residues
from .prime_decision import _check_bound, _check_form, _Decider, prime_listing_cost, primes_up_to

__all__ = [
    "PrimeCriterion",
    "DensityCount",
    "prime_criterion",
    "prime_density",
    "density_count",
    "represented_primes",
    "has_congruence_criterion",
    "REFERENCES",
]


#: The sources of the statements, printed as one references line beside a criterion.
REFERENCES = (
    "Cox, Primes of the Form x^2 + ny^2 (2nd ed., 2013): Lemma 2.5 (primes represented by some form), "
    "Thm 2.26 and Cor. 2.27 (genus cosets mod |D|), Thm 3.15 (principal genus = squares), "
    "Thm 9.2/9.4 (class polynomials), Thm 9.12 and Sect. 9.B (Chebotarev densities); theorem numbers "
    "from memory."
)


# ---------------------------------------------------------------------------
# densities


def prime_density(form: FormLike) -> Fraction:
    """The Chebotarev density, among all primes, of the primes represented by ``Q``.

    ``1/(2h)`` when the class of ``Q`` has order ≤ 2 in ``Cl(D)``, ``1/h`` otherwise
    (``h`` the class number, narrow for ``D > 0``; module docstring).

    Examples
    --------
    >>> prime_density((1, 0, 5)), prime_density((2, 1, 3)), prime_density((1, 1, 6))
    (Fraction(1, 4), Fraction(1, 3), Fraction(1, 6))
    """
    Q = _check_form(form)
    G = class_group(Q.discriminant)
    h = G.order
    return Fraction(1, 2 * h) if G(Q).order <= 2 else Fraction(1, h)


@dataclass(frozen=True)
class DensityCount(SentenceDisplay):
    """Primes up to ``upto`` represented by a form, beside the Chebotarev prediction.

    ``represented`` of the ``prime_count`` primes ``p ≤ upto`` are represented;
    ``expected = density · prime_count``.
    """

    form: Form
    upto: int
    represented: int
    prime_count: int
    density: Fraction

    def _display_sentence(self) -> str:
        return f"{self.represented} of the {self.prime_count} primes ≤ {self.upto} are represented by ({self.form.a}, {self.form.b}, {self.form.c}); predicted density {self.density}"

    def _display_provenance(self) -> str:
        return "counted exactly; the density is Chebotarev's theorem (unconditional)"

    @property
    def expected(self) -> float:
        return float(self.density) * self.prime_count

    @property
    def ratio(self) -> float:
        """``represented / expected`` (tends to 1 as ``upto`` grows); nan if nothing is expected."""
        return self.represented / self.expected if self.expected else float("nan")

    def to_dict(self) -> dict:
        return {
            "upto": self.upto,
            "represented": self.represented,
            "prime_count": self.prime_count,
            "density": f"{self.density.numerator}/{self.density.denominator}",
            "expected": round(self.expected, 2),
        }


def density_count(form: FormLike, upto: object) -> DensityCount:
    """Count the primes ``p ≤ upto`` represented by ``Q`` and compare with the density.

    Examples
    --------
    >>> d = density_count((2, 1, 3), 10**4)
    >>> d.represented, d.prime_count, d.density, round(d.expected, 1)
    (408, 1229, Fraction(1, 3), 409.7)
    """
    Q = _check_form(form)
    X = _check_bound(upto)
    return DensityCount(Q, X, len(represented_primes(Q, X)), len(primes_up_to(X)), prime_density(Q))


# ---------------------------------------------------------------------------
# the criterion


@dataclass(frozen=True)
class PrimeCriterion:
    """A description of the primes represented by a form, fit to quote.

    Attributes
    ----------
    form : Form
    discriminant : int
    class_number : int
        ``h(D)``, the class number (for ``D > 0`` the wide one: forms up to equivalence
        by ``GL₂(Z)`` acting with the sign of the determinant, i.e. ideal classes).
    class_number_narrow : int
        ``h⁺(D)``, the number of classes of forms up to proper equivalence (``= h`` for
        ``D < 0``); the criterion and the density are stated in this group.
    class_order : int
        The order of the class of ``Q`` in ``Cl(D)`` (the narrow group for ``D > 0``).
    density : Fraction
        Among all primes.
    kind : str
        ``"congruence"`` (the genus of ``Q`` is ``{Q, Q⁻¹}``), ``"class_polynomial"``
        (``D < 0``, otherwise) or ``"ideal_class"`` (``D > 0``, otherwise).
    modulus, residues
        For ``"congruence"``: ``p ∤ D`` is represented iff ``p mod modulus ∈ residues``.
    polynomial : tuple of int
        For ``"class_polynomial"``: ``H_D``, leading coefficient first.
    exceptions : tuple of int
        The primes dividing ``D`` that ``Q`` represents.
    genus_size : int
        The number of classes in the genus of ``Q`` (``h / 2^r``, ``r`` the 2-rank).
    statement : str
        The criterion in words, with its hypotheses; every factual sentence in it is
        chosen by a condition checked here (genus size, class order, discriminant sign).
    references : str
        The sources, one line (:data:`REFERENCES`).
    """

    form: Form
    discriminant: int
    class_number: int
    class_number_narrow: int
    class_order: int
    density: Fraction
    kind: str
    modulus: int | None = None
    residues: tuple[int, ...] = ()
    polynomial: tuple[int, ...] = ()
    exceptions: tuple[int, ...] = ()
    genus_size: int = 1
    statement: str = field(default="", compare=False)
    references: str = field(default=REFERENCES, compare=False)

    def criterion_dict(self) -> dict:
        """The ``criterion`` object of ``formkit primes --json``."""
        if self.kind == "congruence":
            d: dict = {"kind": "congruence", "modulus": self.modulus, "residues": list(self.residues)}
        elif self.kind == "class_polynomial":
            d = {"kind": "class_polynomial", "polynomial": list(self.polynomial)}
        else:
            d = {"kind": "ideal_class"}
        d["principal"] = self.class_order == 1
        d["statement"] = self.statement
        d["genus_size"] = self.genus_size
        d["references"] = self.references
        return d

    def to_dict(self) -> dict:
        return {
            "form": self.form.to_list(),
            "discriminant": self.discriminant,
            "class_number": self.class_number,
            "class_number_narrow": self.class_number_narrow,
            "class_order": self.class_order,
            "density": f"{self.density.numerator}/{self.density.denominator}",
            "criterion": self.criterion_dict(),
            "exceptions": list(self.exceptions),
        }

    def __str__(self) -> str:
        return self.statement

    def _repr_html_(self) -> str:
        """Notebook display: the statement and the density (a theorem: unconditional)."""
        import html

        return (
            f"{html.escape(self.statement)}<br><small>density {self.density} of all primes "
            f"(Chebotarev); criterion of kind {self.kind}, unconditional</small>"
        )

    def _repr_latex_(self) -> str:
        return rf"\text{{{self.statement}}}\ (\text{{density }} {self.density.numerator}/{self.density.denominator})"


def _genus_classes(dec: _Decider) -> tuple[int, int]:
    """``(|genus of C|, |{C, C⁻¹}|)``; the genus is the coset ``C·Cl²`` of size ``h / 2^r``."""
    G = dec.G
    return G.order // 2**G.two_rank, 1 if dec.C.order <= 2 else 2


def has_congruence_criterion(form: FormLike) -> bool:
    """True if the primes represented by ``Q`` are described by congruences.

    Theorem: this happens exactly when the genus of ``Q`` is ``{Q, Q⁻¹}``.  The genus
    ``C·Cl²`` always contains ``C`` and ``C⁻¹ = C·C⁻²``, and ``Q``, ``Q⁻¹`` represent the
    same numbers, so when the genus is ``{C, C⁻¹}`` the genus coset modulo ``|D|``
    (:func:`~formkit.representation.genus_congruences.genus_residues`) is a criterion.
    Conversely the represented primes are (up to finitely many) those whose Frobenius
    in ``Gal(L/Q) ≅ Cl ⋊ Z/2`` (``L`` the ring class field) lies in ``{σ_C, σ_C⁻¹}``; a
    congruence condition is a condition on the Frobenius in an abelian subextension,
    i.e. on the image modulo the commutator subgroup ``Cl²``, so the set must be a union
    of cosets of ``Cl²``, which forces ``C·Cl² = {C, C⁻¹}`` (Chebotarev; Cox §9).

    Examples
    --------
    >>> has_congruence_criterion((3, 2, 5)), has_congruence_criterion((1, 0, 14))
    (True, False)
    """
    size, pair = _genus_classes(_Decider(_check_form(form)))
    return size == pair


def _congruence_text(Q: Form, m: int, residues: tuple[int, ...], size: int, inverse: Form) -> str:
    D = Q.discriminant
    shown = ", ".join(map(str, residues[:40])) + (", …" if len(residues) > 40 else "")
    if size == 1:
        genus = f"The genus of {Q} consists of its class alone"
    else:
        genus = (
            f"The genus of {Q} consists of its class and the inverse class, that of {inverse}, "
            "and the two represent the same numbers"
        )
    return (
        f"{genus}; so a congruence criterion exists. For primes p not dividing {abs(D)}: p is represented "
        f"by {Q} if and only if p ≡ {shown} (mod {m}) [{len(residues)} residue"
        f"{'s' if len(residues) != 1 else ''}]."
    )


def _class_text(Q: Form, D: int, order: int, polynomial: bool, size: int, pair: int) -> str:
    what = "the class of the prime ideal above p" if D < 0 else "the narrow class of the prime ideal above p"
    if size == pair:  # the criterion exists but has too many residues to list
        head = (
            f"The genus of {Q} is {{Q, Q⁻¹}}, so a congruence criterion modulo {abs(D)} exists, but it has more "
            f"than {RESIDUE_LIMIT} residues and is not listed. "
        )
    else:
        head = (
            f"The genus of {Q} has {size} classes, more than the {pair} class{'es' if pair > 1 else ''} of "
            f"{{Q, Q⁻¹}}, so no congruence criterion exists (one exists exactly when the genus is {{Q, Q⁻¹}}). "
        )
    text = (
        head
        + f"For primes p not dividing {abs(D)}: p is represented by {Q} if and only if ({D}/p) = 1 and {what} "
        f"(the class of the prime form (p, b, (b² − ({D}))/(4p)) with b² ≡ {D} (mod 4p)) is that of {Q} or "
        f"its inverse (order {order} in Cl({D}))."
    )
    if polynomial and order == 1:
        text += (
            f" Equivalently, for odd p not dividing {abs(D)}·disc(H): p is represented if and only if "
            f"({D}/p) = 1 and H(x) ≡ 0 (mod p) has a solution, H the class polynomial of discriminant {D}."
        )
    elif polynomial:
        text += (
            f" For odd p not dividing {abs(D)}·disc(H) with ({D}/p) = 1, the class polynomial H of "
            f"discriminant {D} splits modulo p into irreducible factors all of degree equal to the order of "
            f"the prime ideal class; if {Q} represents p, that degree is {order}."
        )
    return text


def prime_criterion(form: FormLike, *, polynomial: bool = True) -> PrimeCriterion:
    """Describe the primes represented by a primitive form.

    Offers a congruence criterion modulo ``|D|`` exactly when the genus of ``Q`` is
    ``{Q, Q⁻¹}`` (:func:`has_congruence_criterion`); otherwise (``D < 0``) the class-polynomial criterion with
    ``H_D`` and the prime-ideal-class description, or (``D > 0``) the ideal-class
    description.  Always gives the density and the exceptional primes dividing ``D``.

    Parameters
    ----------
    form : FormLike
        A primitive form of non-square discriminant (not negative definite).
    polynomial : bool
        Compute ``H_D`` for the class-polynomial criterion (``D < 0``).  Default ``True``.

    Returns
    -------
    PrimeCriterion

    Raises
    ------
    NotPrimitiveError, FormError, DiscriminantError
        For forms that are not primitive, negative definite or of square discriminant.

    Examples
    --------
    >>> c = prime_criterion("x^2 + 5y^2")
    >>> c.kind, c.modulus, c.residues, c.exceptions, c.density
    ('congruence', 20, (1, 9), (5,), Fraction(1, 4))
    >>> c = prime_criterion((1, 0, 14))
    >>> c.kind, c.polynomial[:2], c.density
    ('class_polynomial', (1, -16220384512), Fraction(1, 8))

    References
    ----------
    :data:`REFERENCES`.
    """
    Q = _check_form(form)
    D = Q.discriminant
    dec = _Decider(Q)
    h = dec.G.order
    order = dec.C.order
    size, pair = _genus_classes(dec)
    density = Fraction(1, 2 * h) if order <= 2 else Fraction(1, h)
    common: dict[str, Any] = {
        "form": Q,
        "discriminant": D,
        "class_number": dec.G.class_number,
        "class_number_narrow": h,
        "class_order": order,
        "density": density,
        "exceptions": dec.exceptions,
        "genus_size": size,
    }
    if size == pair:
        try:
            m, residues = genus_residues(Q)
        except FormkitError:
            pass  # too many residues to list: fall through to the class description
        else:
            return PrimeCriterion(
                kind="congruence",
                modulus=m,
                residues=residues,
                statement=_congruence_text(Q, m, residues, size, dec.C.inverse().form),
                **common,
            )
    if D < 0:
        poly: tuple[int, ...] = ()
        if polynomial:
            from .class_polynomials import class_polynomial

            poly = class_polynomial(
                D,
                further="without the polynomial (formkit primes --no-polynomial, polynomial=False in Python) "
                "the criterion costs only the class group",
            ).coefficients
        return PrimeCriterion(
            kind="class_polynomial",
            polynomial=poly,
            statement=_class_text(Q, D, order, bool(poly), size, pair),
            **common,
        )
    return PrimeCriterion(kind="ideal_class", statement=_class_text(Q, D, order, False, size, pair), **common)


def represented_primes(form: FormLike, upto: object, *, method: str = "auto") -> list[int]:
    """All primes ``p ≤ upto`` represented by ``Q``.

    Parameters
    ----------
    form : FormLike
        A primitive form of non-square discriminant (not negative definite).
    upto : int
        The bound (at most 10^8).
    method : {"auto", "congruence", "classes"}
        ``"congruence"`` uses the residues modulo ``|D|`` (only when the genus of ``Q``
        is ``{Q, Q⁻¹}``); ``"classes"`` reduces the prime form at every split prime;
        ``"auto"`` takes the congruence when it applies.  Both give the same list.

    Returns
    -------
    list of int

    Raises
    ------
    FormkitError
        For a bad bound or method, or ``"congruence"`` when the genus is not ``{Q, Q⁻¹}``.

    Examples
    --------
    >>> represented_primes((1, 0, 27), 200)
    [31, 43, 109, 127, 157]
    >>> represented_primes((2, 1, 3), 60)
    [2, 3, 13, 29, 31, 41, 47]
    """
    Q = _check_form(form)
    X = _check_bound(upto)
    if method not in ("auto", "congruence", "classes"):
        raise FormkitError(f"method must be 'auto', 'congruence' or 'classes', not {method!r}")
    D = Q.discriminant
    dec = _Decider(Q)
    size, pair = _genus_classes(dec)
    use_congruence = method == "congruence" or (method == "auto" and size == pair)
    seconds, memory = prime_listing_cost(X, per_prime=not use_congruence)
    check_cost(
        f"listing the primes p ≤ {X} represented by {Q}",
        seconds=seconds,
        memory=memory,
        further="a smaller bound reaches the answer sooner (the criterion and density do not depend on it)",
    )
    primes = primes_up_to(X)
    if use_congruence:
        if size != pair:
            raise FormkitError(
                f"no congruence criterion for {Q!r}: its genus has {size} classes, more than the class of "
                f"the form and its inverse"
            )
        m, residues = genus_residues(Q)
        ok = bytearray(m)
        for r in residues:
            ok[r] = 1
        return [p for p in primes if (ok[p % m] if D % p else p in dec.exceptions)]
    out: list[int] = []
    step = 1 << 14
    with progress_bar(total=len(primes), desc=f"primes ≤ {X} represented by {Q}", unit="prime") as bar:
        for i in range(0, len(primes), step):
            out += [p for p in primes[i : i + step] if dec(p)]
            bar.update(len(primes[i : i + step]))
    return out
