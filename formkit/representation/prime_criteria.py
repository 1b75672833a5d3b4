"""Which primes a form represents: congruence criteria, class polynomials, densities.

Let ``Q`` be a primitive form of non-square discriminant ``D`` (positive definite when
``D < 0``) and ``C`` its class in ``Cl(D)`` (the narrow class group when ``D > 0``).

*The class of the prime ideal decides.*  A prime ``p ∤ D`` is represented by some
primitive form of discriminant ``D`` iff ``χ_D(p) = (D/p) = 1`` (Cox Lemma 2.5 for odd
``p``; the same argument with ``b² ≡ D (mod 8)`` for ``p = 2``), and then exactly by the
forms in the class of the prime form ``(p, b, ·)`` at ``p`` and its inverse ``(p, −b, ·)``
— the classes of the two prime ideals above ``p``.  So ``Q`` represents ``p`` iff
``χ_D(p) = 1`` and the prime form at ``p`` lies in ``C`` or ``C⁻¹``.  This is the
per-prime decision used here (one reduction per prime); :func:`formkit.represent`
decides single numbers, listing the solutions.

*Congruence criteria* (Cox §2–§3, Theorem 2.26 and Corollary 2.27 as recalled).  The
values of ``Q`` prime to ``D``, taken modulo ``|D|``, form a coset of the subgroup of
values of the principal form; this coset is the same for all forms of one genus and
determines the genus.  Hence when the genus of ``Q`` consists of the class of ``Q``
alone — which happens for every ``Q`` exactly when ``Cl(D)`` has exponent ≤ 2, i.e.
one class per genus, since the principal genus is ``Cl(D)²`` — a prime ``p ∤ D`` is
represented by ``Q`` iff ``p mod |D|`` lies in that coset.  When the genus has several
classes the congruence class of ``p`` only tells the genus, and no congruence
criterion is offered.  The modulus ``|D|`` always suffices: for ``x² + ny²`` it is
already ``4n``, and the characters at 2 have period dividing ``|D|`` (below).

The coset is computed locally, without trusting a table of characters: by the Chinese
remainder theorem the unit values of ``Q`` modulo ``|D| = ∏ q^e`` are the products of
the unit values modulo each ``q^e``.  For odd ``q``, ``4aQ = (2ax + by)² − Dy²`` with
``q ∤ a`` (after a unimodular change making a value ``v`` prime to ``q`` the first
coefficient) shows that the unit values modulo ``q^e`` are ``v·(squares)``, i.e. the
``r`` with ``(r/q) = (v/q)``.  For ``q = 2`` with ``2^e ∥ D``: ``aQ = X² − (D/4)Y²``
with ``a`` odd; when ``e ≥ 3`` an odd value needs ``X`` odd, and ``X²`` runs over all of
``1 + 8Z`` modulo ``2^e``, so the unit values are a union of classes modulo 8 — found
by trying ``x, y`` modulo 8 (modulo 4 when ``e = 2``).

*Class polynomials* (Cox Theorem 9.2 for ``x² + ny²`` and Theorem 9.4 for orders;
Theorem 11.1: ``K(j(O))`` is the ring class field; numbers as recalled).  For ``D < 0``
and an odd prime ``p ∤ D·disc(H_D)``, the principal form represents ``p`` iff
``χ_D(p) = 1`` and ``H_D(x) ≡ 0 (mod p)`` has a solution.  More generally, for such
``p`` with ``χ_D(p) = 1``, ``H_D`` factors modulo ``p`` into irreducible factors all
of degree equal to the order of the class of the prime form at ``p``.

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

import math
from dataclasses import dataclass, field
from fractions import Fraction
from typing import Optional

from ..core.arith import as_int, factorint, isqrt, kronecker
from ..core.modular_roots import crt, sqrt_mod, sqrt_mod_prime
from ..classgroups.dispatch import class_group
from ..errors import FormError, FormkitError, NotPrimitiveError
from ..core.forms import Form, FormLike, _require_nonsquare, as_form
from ..core.enumeration import _cycles_cached
from ..core.raw_reduction import _reduce_definite_raw, _reduce_indefinite_raw

__all__ = [
    "PrimeCriterion",
    "DensityCount",
    "prime_criterion",
    "genus_residues",
    "one_class_per_genus",
    "is_idoneal",
    "prime_density",
    "density_count",
    "represented_primes",
    "represents_prime",
    "primes_up_to",
]

#: Largest number of residues :func:`genus_residues` lists.
RESIDUE_LIMIT = 10**6
#: Largest bound accepted by :func:`represented_primes` and :func:`primes_up_to`.
PRIME_BOUND_LIMIT = 10**8


# ---------------------------------------------------------------------------
# input checks


def _check_form(form: FormLike) -> Form:
    Q = as_form(form)
    _require_nonsquare(Q, "a prime criterion")
    if not Q.is_primitive:
        raise NotPrimitiveError(
            f"prime criteria are for primitive forms; {Q!r} has content {Q.content} "
            f"(its values are multiples of {Q.content}, so it represents no prime unless {Q.content} is "
            f"prime and {Q.primitive_part()!r} represents 1)"
        )
    if Q.discriminant < 0 and Q.a < 0:
        raise FormError(
            f"{Q!r} is negative definite and represents no positive prime; use {(-Q)!r}, "
            "which represents p exactly when the given form represents -p"
        )
    return Q


def _check_bound(upto: object) -> int:
    X = as_int(upto, "upto")
    if X < 0:
        raise FormkitError(f"upto must be ≥ 0, not {X}")
    if X > PRIME_BOUND_LIMIT:
        raise FormkitError(f"upto must be at most {PRIME_BOUND_LIMIT} (a sieve is kept in memory), not {X}")
    return X


# ---------------------------------------------------------------------------
# primes


def primes_up_to(upto: object) -> list[int]:
    """All primes ``p ≤ upto`` (sieve of Eratosthenes).

    Raises
    ------
    FormkitError
        If ``upto`` is negative or larger than ``PRIME_BOUND_LIMIT`` (10^8).

    Examples
    --------
    >>> primes_up_to(30)
    [2, 3, 5, 7, 11, 13, 17, 19, 23, 29]
    """
    X = _check_bound(upto)
    if X < 2:
        return []
    sieve = bytearray([1]) * (X + 1)
    sieve[0] = sieve[1] = 0
    for i in range(2, math.isqrt(X) + 1):
        if sieve[i]:
            sieve[i * i :: i] = bytes(len(range(i * i, X + 1, i)))
    return [i for i, v in enumerate(sieve) if v]


class _Decider:
    """Per-prime decision: the class of the prime form at p is C or C⁻¹."""

    def __init__(self, Q: Form) -> None:
        self.Q = Q
        self.D = D = Q.discriminant
        self.G = G = class_group(D)
        self.C = G(Q)
        self.targets = {self.C, self.C.inverse()}
        self.raw_targets = {t.form.coefficients for t in self.targets}
        if D > 0:  # reduced form -> representative of its cycle (the canonical class form)
            self.sqrt_D = isqrt(D)
            self.cycle_of = _cycles_cached(D)[1]
        self.exceptions = tuple(p for p in sorted(factorint(abs(D))) if self._divisor_represented(p))

    def _divisor_represented(self, p: int) -> bool:
        D = self.D
        for b in sorted({int(r) % (2 * p) for r in sqrt_mod(D, 4 * p)}):
            f = Form(p, b, (b * b - D) // (4 * p))
            if f.is_primitive and self.G(f) in self.targets:
                return True
        return False

    def __call__(self, p: int) -> bool:
        D = self.D
        if D % p == 0:
            return p in self.exceptions
        if p == 2:
            if kronecker(D, p) != 1:
                return False
            return self.G(Form.prime_form(D, p)) in self.targets
        # fast path for odd p: Euler's criterion, then the prime form (p, b, (b² − D)/4p)
        # with b² ≡ D (mod p), b ≡ D (mod 2), reduced (Gauss) and compared with C, C⁻¹
        d = D % p
        if pow(d, (p - 1) >> 1, p) != 1:
            return False
        if p & 3 == 3:
            r = pow(d, (p + 1) >> 2, p)
        elif p & 7 == 5:  # Atkin's square root for p ≡ 5 (mod 8)
            v = pow(2 * d, (p - 5) >> 3, p)
            r = d * v * (2 * d * v * v - 1) % p
        else:
            r = int(sqrt_mod_prime(d, p))
        b = r if (r - D) % 2 == 0 else p - r
        c = (b * b - D) // (4 * p)
        if D < 0:
            return _reduce_definite_raw(p, b, c) in self.raw_targets
        red = _reduce_indefinite_raw(p, b, c, D, self.sqrt_D)
        return self.cycle_of[(int(red[0]), int(red[1]), int(red[2]))] in self.raw_targets


def represents_prime(form: FormLike, p: object) -> bool:
    """True if the form represents the prime ``p``: ``Q(x, y) = p`` has a solution.

    Decided by the class of the prime form at ``p`` (module docstring); for the
    solutions themselves use :func:`formkit.represent`.

    Raises
    ------
    NotPrimeError
        If ``p`` is not a prime.
    NotPrimitiveError, FormError, DiscriminantError
        If the form is not primitive, is negative definite or has square discriminant.

    Examples
    --------
    >>> represents_prime((1, 0, 5), 29), represents_prime((1, 0, 5), 7), represents_prime((2, 2, 3), 7)
    (True, False, True)
    """
    from ..core.arith import is_probable_prime
    from ..errors import NotPrimeError

    Q = _check_form(form)
    p = as_int(p, "p")
    if p < 2 or not is_probable_prime(p):
        raise NotPrimeError(f"p must be a prime, not {p}")
    return _Decider(Q)(p)


# ---------------------------------------------------------------------------
# genera and congruences


def one_class_per_genus(D: object) -> bool:
    """True if every genus of discriminant ``D`` consists of a single class.

    Equivalent to ``Cl(D)`` (narrow for ``D > 0``) having exponent ≤ 2, because the
    principal genus is the subgroup of squares (Gauss; Cox Theorem 3.15, as recalled).

    Examples
    --------
    >>> one_class_per_genus(-4 * 5), one_class_per_genus(-4 * 14), one_class_per_genus(-4 * 1848)
    (True, False, True)
    """
    return class_group(D).exponent <= 2


def is_idoneal(n: object) -> bool:
    """True if ``n ≥ 1`` is idoneal in Euler's sense: ``x² + ny²`` has one class per genus.

    Raises
    ------
    FormkitError
        If ``n < 1``.

    Examples
    --------
    >>> [n for n in range(1, 30) if is_idoneal(n)]
    [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 12, 13, 15, 16, 18, 21, 22, 24, 25, 28]
    """
    n = as_int(n, "n")
    if n < 1:
        raise FormkitError(f"idoneal numbers are positive integers, not {n}")
    return one_class_per_genus(-4 * n)


def _local_units(Q: Form, q: int, e: int) -> list[int]:
    """Residues modulo q^e of the values of Q prime to q (see module docstring)."""
    a, b, c = Q.coefficients
    qe = q**e
    if q == 2:
        m = 2 ** min(e, 3)
        T = {(a * x * x + b * x * y + c * y * y) % m for x in range(m) for y in range(m)}
        return [r for r in range(1, qe, 2) if r % m in T]
    v = next(v for v in (a, c, a + b + c) if v % q)
    s = kronecker(v, q)
    return [r for r in range(1, qe) if r % q and kronecker(r, q) == s]


def genus_residues(form: FormLike) -> tuple[int, tuple[int, ...]]:
    """The residues modulo ``|D|`` of the values of ``Q`` (and of its genus) prime to ``D``.

    A prime ``p ∤ D`` represented by any form in the genus of ``Q`` satisfies
    ``p mod |D| ∈ residues``; conversely a prime with ``p mod |D| ∈ residues`` is
    represented by some form of the genus.  Computed prime by prime as described in
    the module docstring.

    Parameters
    ----------
    form : FormLike
        A primitive form of non-square discriminant, not negative definite.

    Returns
    -------
    (int, tuple of int)
        The modulus ``|D|`` and the sorted residues.

    Raises
    ------
    FormkitError
        If there would be more than ``RESIDUE_LIMIT`` (10^6) residues.

    Examples
    --------
    >>> genus_residues((1, 0, 5))      # p = x² + 5y²  iff  p ≡ 1, 9 (mod 20)
    (20, (1, 9))
    >>> genus_residues((1, 1, 1))
    (3, (1,))
    """
    Q = _check_form(form)
    D = Q.discriminant
    fac = factorint(abs(D))
    count = 1
    for q, e in fac.items():
        count *= q ** (e - 1) * (q - 1) // (2 if q > 2 else 1)
    if count > RESIDUE_LIMIT:
        raise FormkitError(
            f"the genus of {Q!r} has about {count} residues modulo {abs(D)}, more than {RESIDUE_LIMIT}"
        )
    residues = [0]
    modulus = 1
    for q, e in sorted(fac.items()):
        qe = q**e
        local = _local_units(Q, q, e)
        residues = [crt((r, s), (modulus, qe))[0] for r in residues for s in local]
        modulus *= qe
    return modulus, tuple(sorted(int(r) for r in residues))


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
class DensityCount:
    """Primes up to ``upto`` represented by a form, beside the Chebotarev prediction.

    ``represented`` of the ``prime_count`` primes ``p ≤ upto`` are represented;
    ``expected = density · prime_count``.
    """

    form: Form
    upto: int
    represented: int
    prime_count: int
    density: Fraction

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
        ``h(D)``, narrow for ``D > 0``.
    class_order : int
        The order of the class of ``Q`` in ``Cl(D)``.
    density : Fraction
        Among all primes.
    kind : str
        ``"congruence"`` (one class in the genus), ``"class_polynomial"`` (``D < 0``,
        several classes in the genus) or ``"ideal_class"`` (``D > 0``, several classes).
    modulus, residues
        For ``"congruence"``: ``p ∤ D`` is represented iff ``p mod modulus ∈ residues``.
    polynomial : tuple of int
        For ``"class_polynomial"``: ``H_D``, leading coefficient first.
    exceptions : tuple of int
        The primes dividing ``D`` that ``Q`` represents.
    statement : str
        The criterion in words, with its hypotheses.
    """

    form: Form
    discriminant: int
    class_number: int
    class_order: int
    density: Fraction
    kind: str
    modulus: Optional[int] = None
    residues: tuple[int, ...] = ()
    polynomial: tuple[int, ...] = ()
    exceptions: tuple[int, ...] = ()
    statement: str = field(default="", compare=False)

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
        return d

    def to_dict(self) -> dict:
        return {
            "form": self.form.to_list(),
            "discriminant": self.discriminant,
            "class_number": self.class_number,
            "class_order": self.class_order,
            "density": f"{self.density.numerator}/{self.density.denominator}",
            "criterion": self.criterion_dict(),
            "exceptions": list(self.exceptions),
        }

    def __str__(self) -> str:
        return self.statement


def _congruence_text(Q: Form, m: int, residues: tuple[int, ...]) -> str:
    shown = ", ".join(map(str, residues[:40])) + (", …" if len(residues) > 40 else "")
    return (
        f"The genus of {Q} consists of its class alone (one class per genus for D = {Q.discriminant}). "
        f"For primes p ∤ {abs(Q.discriminant)}: p is represented by {Q} iff p ≡ {shown} (mod {m}) "
        f"[{len(residues)} residues]. (Cox Thm 2.26 / Cor. 2.27, as recalled.)"
    )


def _class_text(Q: Form, D: int, order: int, polynomial: bool) -> str:
    what = "the class of the prime ideal above p" if D < 0 else "the narrow class of the prime ideal above p"
    text = (
        f"The genus of {Q} contains other classes, so no congruence criterion exists. "
        f"For primes p ∤ {abs(D)}: p is represented by {Q} iff ({D}/p) = 1 and {what} — the class of "
        f"the prime form (p, b, (b²−({D}))/4p) with b² ≡ {D} (mod 4p) — is that of {Q} or its inverse "
        f"(order {order} in Cl({D})). formkit.represent(Q, p) decides a single p with its solutions."
    )
    if polynomial and order == 1:
        text += (
            f" Equivalently, for odd p ∤ {abs(D)}·disc(H): p is represented iff ({D}/p) = 1 and H(x) ≡ 0 (mod p) "
            f"is solvable, H the class polynomial of D = {D} (Cox Thm 9.2 / Thm 9.4, as recalled); "
            f"formkit.class_polynomial_discriminant({D}) gives the primes dividing disc(H)."
        )
    elif polynomial:
        text += (
            f" In terms of the class polynomial H of D = {D}: for odd p ∤ {abs(D)}·disc(H) with ({D}/p) = 1, "
            f"H splits modulo p into irreducible factors all of degree equal to the order of the prime ideal "
            f"class; p represented by {Q} forces that degree to be {order}."
        )
    return text


def prime_criterion(form: FormLike, *, polynomial: bool = True) -> PrimeCriterion:
    """Describe the primes represented by a primitive form.

    Offers a congruence criterion modulo ``|D|`` exactly when the genus of ``Q``
    consists of one class; otherwise (``D < 0``) the class-polynomial criterion with
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
    Cox, *Primes of the Form x² + ny²*, Cor. 2.27, Thm 9.2, Thm 9.4 (as recalled).
    """
    Q = _check_form(form)
    D = Q.discriminant
    dec = _Decider(Q)
    h = dec.G.order
    order = dec.C.order
    density = Fraction(1, 2 * h) if order <= 2 else Fraction(1, h)
    common = dict(form=Q, discriminant=D, class_number=h, class_order=order, density=density,
                  exceptions=dec.exceptions)
    if dec.G.exponent <= 2:
        try:
            m, residues = genus_residues(Q)
        except FormkitError:
            pass  # too many residues to list: fall through to the class description
        else:
            return PrimeCriterion(kind="congruence", modulus=m, residues=residues,
                                  statement=_congruence_text(Q, m, residues), **common)
    if D < 0:
        poly: tuple[int, ...] = ()
        if polynomial:
            from .class_polynomials import class_polynomial

            poly = class_polynomial(D).coefficients
        return PrimeCriterion(kind="class_polynomial", polynomial=poly,
                              statement=_class_text(Q, D, order, bool(poly)), **common)
    return PrimeCriterion(kind="ideal_class", statement=_class_text(Q, D, order, False), **common)


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
        has one class); ``"classes"`` reduces the prime form at every split prime;
        ``"auto"`` takes the congruence when it applies.  Both give the same list.

    Returns
    -------
    list of int

    Raises
    ------
    FormkitError
        For a bad bound or method, or ``"congruence"`` when the genus has several classes.

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
    primes = primes_up_to(X)
    use_congruence = method == "congruence" or (method == "auto" and dec.G.exponent <= 2)
    if use_congruence:
        if dec.G.exponent > 2:
            raise FormkitError(
                f"no congruence criterion for {Q!r}: its genus has more than one class (Cl({D}) has exponent "
                f"{dec.G.exponent})"
            )
        m, residues = genus_residues(Q)
        ok = bytearray(m)
        for r in residues:
            ok[r] = 1
        return [p for p in primes if (ok[p % m] if D % p else p in dec.exceptions)]
    return [p for p in primes if dec(p)]
