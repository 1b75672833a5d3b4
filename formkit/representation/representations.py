"""Representations of integers by binary quadratic forms: counts, all solutions, class sums.

*The square-root method.*  Let ``Q`` be a primitive form of discriminant ``D`` and
``m ≠ 0``.  A proper (primitive, ``gcd(x, y) = 1``) representation ``Q(x, y) = m``
extends to a matrix ``M ∈ SL2(Z)`` with first column ``(x, y)``; then
``Q·M = (m, b, c)`` and ``b`` is determined modulo ``2m``, with ``b² ≡ D (mod 4m)``.
Conversely every such ``b`` whose form ``(m, b, (b² − D)/4m)`` is primitive and
properly equivalent to ``Q`` gives representations: if ``Q·M = (m, b, c)`` the first
column of ``M`` represents ``m``, and the matrices doing this are ``N·M`` for ``N`` in
the proper automorphism group of ``Q``, so each such ``b`` accounts for exactly ``w``
proper representations when ``D < 0`` (``w`` = 2, 4 or 6) and for one orbit under the
(infinite) automorphism group when ``D > 0``.  All representations are the proper
representations of ``n/g²`` scaled by ``g``, over ``g² | n``.  (Gauss, *Disquisitiones*
art. 154–170; Cox, *Primes of the Form x² + ny²*, Lemma 2.5 and §2.A; Buchmann–Vollmer,
*Binary Quadratic Forms*, §3.2 and §6.8 — numbers as recalled.)

The roots ``b`` come from :func:`formkit.core.modular_roots.sqrt_mod` with the factorisation of ``n``
(:func:`formkit.core.factorisation.prime_factorisation`, or given by the caller and checked), so ``n`` of 60 digits and more is
fine whenever it can be factored.

*Sums over classes* (``D < 0``).  Summing over one primitive form per class,
``Σ_Q r_Q(n) = w·Σ_{g²|n} N*(n/g²)`` for every ``n ≥ 1``, where ``N*(m)`` is the number
of ``b mod 2m`` with ``b² ≡ D (mod 4m)`` and ``gcd(m, b, (b² − D)/4m) = 1``
(:func:`total_representation_count`, no class group needed).  When ``n`` is prime to
the conductor ``f`` of ``D`` (always, for fundamental ``D``) this equals Dirichlet's
``w·Σ_{d|n} χ_D(d)`` (:func:`dirichlet_count`; Dirichlet, *Vorlesungen über
Zahlentheorie* §§ 88–90; Cox Exercise 7.x / Zagier, *Zetafunktionen und quadratische
Körper* §8 — numbers not recalled).  For ``D > 0`` the same sums count orbits.

*Conventions.*  Negative definite forms are handled through ``−Q`` (``Q(x, y) = n`` iff
``(−Q)(x, y) = −n``).  A form with content ``k > 1`` represents ``n`` only when
``k | n``, and then exactly as ``Q/k`` represents ``n/k``: such forms are accepted and
handled by their content.  ``n = 0`` has only the solution ``(0, 0)`` (non-square
discriminant); it is counted once and is not primitive.

Indefinite forms (infinitely many solutions, in orbits) are treated in
:mod:`formkit.representation.orbits`; :func:`represent` covers both kinds.  The steps
both share are in :mod:`formkit.representation.square_root_method`.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §2.
.. [2] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, Ch. 3, 6.
.. [3] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, §5.2–5.6.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..core.arith import as_int, gcd, kronecker, mpz
from ..core.discriminants import discriminant_parts, unit_count, validate_discriminant
from ..core.equivalence import automorphism_group
from ..core.factorisation import prime_factorisation
from ..core.forms import Form, FormLike, mat_inverse, mat_mul
from ..core.progress import progress_bar
from ..core.reduction import _reduce_definite
from ..errors import DiscriminantError, FormError, FormkitError
from .square_root_method import (
    _content_and_sign,
    _factor_abs,
    _primitive_target,
    _proper_roots,
    _scaled_factors,
    _square_divisors,
)

__all__ = [
    "RepresentationResult",
    "represent",
    "representations",
    "representation_count",
    "primitive_representation_count",
    "total_representation_count",
    "dirichlet_count",
]

Vector = tuple[int, int]


# ---------------------------------------------------------------------------
# definite forms


def _definite_primitive_solutions(P: Form, m: int, fac: dict[int, int], automorphs) -> list[Vector]:
    """All proper representations of m > 0 by the primitive positive definite P."""
    D = P.discriminant
    red_P = _reduce_definite(P, False)
    target = red_P.reduced
    out: list[Vector] = []
    roots = _proper_roots(D, m, fac)
    with progress_bar(total=len(roots), desc=f"solutions of Q(x, y) = {_short(m)}", unit="root") as bar:
        for b in roots:
            bar.update(1)
            _solutions_from_root(D, m, b, target, red_P, automorphs, out)
    return out


def _short(n: int) -> str:
    """``n`` for a progress line: in full up to 20 digits, else its number of digits."""
    s = str(n)
    return s if len(s) <= 20 else f"a {len(s)}-digit number"


def _solutions_from_root(D: int, m: int, b: int, target, red_P, automorphs, out: list[Vector]) -> None:
    """The solutions of ``P(x, y) = m`` belonging to the root ``b`` (none unless ``(m, b, ·) ~ P``)."""
    F = Form(m, b, (b * b - D) // (4 * m))
    rf = _reduce_definite(F, False)
    if rf.reduced != target:
        return
    M = mat_mul(red_P.matrix, mat_inverse(rf.matrix))  # P·M = F
    x, y = M[0][0], M[1][0]
    for N in automorphs:
        out.append((N[0][0] * x + N[0][1] * y, N[1][0] * x + N[1][1] * y))


def _definite_primitive_count(P: Form, m: int, fac: dict[int, int], w: int) -> int:
    from ..core.raw_reduction import _reduce_definite_raw

    D = P.discriminant
    target = _reduce_definite(P, False).reduced.coefficients
    count = 0
    for b in _proper_roots(D, m, fac):
        a2, b2, c2 = _reduce_definite_raw(mpz(m), mpz(b), mpz((b * b - D) // (4 * m)))
        if (a2, b2, c2) == target:
            count += w
    return count


def _definite_solutions(P: Form, m: int, fac: dict[int, int], primitive: bool) -> list[Vector]:
    automorphs = list(automorphism_group(P).elements())
    if primitive:
        return _definite_primitive_solutions(P, m, fac, automorphs)
    out: list[Vector] = []
    for g, rest in _square_divisors(fac):
        for x, y in _definite_primitive_solutions(P, m // (g * g), rest, automorphs):
            out.append((g * x, g * y))
    return out


@dataclass(frozen=True)
class RepresentationResult:
    """How a form represents ``n``.

    For definite forms ``count`` and ``primitive_count`` are the numbers of all and of
    primitive solutions and ``solutions`` lists them (all, or only the primitive ones
    when asked; at most ``limit`` of them when a limit was given — ``truncated`` says
    so).  For indefinite forms ``count`` is ``None`` (infinitely many solutions unless
    ``n = 0``), ``orbits`` holds one representative per orbit under the proper
    automorphs (the smallest, see :func:`formkit.representation.orbits.orbit_representative`) and ``orbit_count``
    their number; ``primitive_orbit_count`` counts the orbits of primitive solutions.
    """

    form: Form
    n: int
    definite: bool
    count: int | None
    primitive_count: int | None
    solutions: tuple[Vector, ...]
    orbits: tuple[Vector, ...] = ()
    orbit_count: int | None = None
    primitive_orbit_count: int | None = None
    primitive_only: bool = False
    truncated: bool = False

    @property
    def represented(self) -> bool:
        """True when ``Q(x, y) = n`` has a solution."""
        return bool(self.solutions) or bool(self.orbits) or bool(self.count)

    def _summary(self) -> str:
        f = self.form
        head = f"({f.a}, {f.b}, {f.c}) = {self.n}: "
        if self.definite:
            return (
                head
                + f"{self.count} solutions, {self.primitive_count} primitive (complete, square-root method)"
            )
        return head + (
            f"{self.orbit_count} orbits under the automorphs, one solution each (least x² + y²)"
            if self.orbit_count
            else "no solutions"
        )

    def _repr_html_(self) -> str:
        """Notebook display: the counts and the listed solutions or orbit representatives."""
        listed = self.solutions if self.definite else self.orbits
        shown = ", ".join(f"({x}, {y})" for x, y in listed[:50]) + (" …" if len(listed) > 50 else "")
        return f"{self._summary()}<br>{shown}"

    def _repr_latex_(self) -> str:
        listed = self.solutions if self.definite else self.orbits
        vecs = r",\ ".join(f"({x}, {y})" for x, y in listed[:50])
        return rf"$\text{{{self._summary()}}}$" + (f": ${vecs}$" if vecs else "")

    def to_dict(self) -> dict:
        """The JSON shape of ``formkit represent``."""
        d: dict = {
            "form": self.form.to_list(),
            "n": self.n,
            "count": self.count,
            "primitive_count": self.primitive_count,
        }
        if self.definite:
            d["solutions"] = [list(v) for v in self.solutions]
        else:
            d["orbits"] = [list(v) for v in self.orbits]
            d["orbit_count"] = self.orbit_count
            d["primitive_orbit_count"] = self.primitive_orbit_count
        d["primitive_only"] = self.primitive_only
        d["truncated"] = self.truncated
        return d


def represent(
    form: FormLike,
    n: object,
    *,
    primitive: bool = False,
    limit: int | None = None,
    factors: dict[int, int] | None = None,
) -> RepresentationResult:
    """All solutions of ``Q(x, y) = n`` (definite ``Q``) or their orbits (indefinite ``Q``).

    Parameters
    ----------
    form : FormLike
        Any form of non-square discriminant (non-primitive and negative definite forms
        are handled, see the module docstring).
    n : int
        The number to represent (any sign, any size that can be factored).
    primitive : bool
        List only primitive solutions (``gcd(x, y) = 1``); the counts are always both given.
    limit : int, optional
        List at most this many solutions / orbit representatives (counts stay exact).
    factors : dict, optional
        The factorisation ``{p: e}`` of ``|n|`` if known (checked), to skip factoring.

    Returns
    -------
    RepresentationResult

    Raises
    ------
    DiscriminantError
        If the discriminant of the form is a perfect square.
    NotAnIntegerError
        If ``n`` is not an integer.

    Examples
    --------
    >>> r = represent((1, 0, 1), 25)
    >>> r.count, r.primitive_count, r.solutions[:4]
    (12, 8, ((-5, 0), (-4, -3), (-4, 3), (-3, -4)))
    >>> r = represent((1, 0, -2), 7)
    >>> r.count, r.orbits, r.orbit_count
    (None, ((3, 1), (3, -1)), 2)
    """
    Q, D, k, sign, n = _content_and_sign(form, n)
    if limit is not None:
        limit = as_int(limit, "limit")
        if limit < 0:
            raise FormkitError(f"limit must be ≥ 0, not {limit}")
    if D < 0:
        sols = _all_definite(Q, D, k, sign, n, factors, primitive=False)
        prim = [v for v in sols if gcd(v[0], v[1]) == 1]
        listed = prim if primitive else sols
        truncated = limit is not None and len(listed) > limit
        if truncated:
            listed = listed[:limit]
        return RepresentationResult(
            Q, n, True, len(sols), len(prim), tuple(listed), primitive_only=primitive, truncated=truncated
        )
    from .orbits import _all_orbits

    orbs, prim_count = _all_orbits(Q, D, k, n, factors)
    listed = [v for v in orbs if gcd(v[0], v[1]) == 1] if primitive else orbs
    truncated = limit is not None and len(listed) > limit
    if truncated:
        listed = listed[:limit]
    return RepresentationResult(
        Q,
        n,
        False,
        None,
        None,
        (),
        tuple(listed),
        len(orbs),
        prim_count,
        primitive_only=primitive,
        truncated=truncated,
    )


def _all_definite(Q, D, k, sign, n, factors, primitive: bool) -> list[Vector]:
    if n == 0:
        return [] if primitive else [(0, 0)]
    P, m = _primitive_target(Q, k, sign, n)
    if P is None or m < 0:
        return []
    fac = _factor_abs(m, _scaled_factors(factors, n, m))
    return sorted(_definite_solutions(P, m, fac, primitive))


def representations(
    form: FormLike, n: object, *, primitive: bool = False, factors: dict[int, int] | None = None
) -> tuple[Vector, ...]:
    """All ``(x, y)`` with ``Q(x, y) = n`` for a definite form ``Q``, sorted.

    Parameters
    ----------
    primitive : bool
        Only the solutions with ``gcd(x, y) = 1``.
    factors : dict, optional
        Known factorisation of ``|n|`` (checked).

    Raises
    ------
    FormError
        If ``Q`` is indefinite (infinitely many solutions: use
        :func:`formkit.representation.orbits.representation_orbits`).

    Examples
    --------
    >>> representations((1, 1, 1), 7)
    ((-3, 1), (-3, 2), (-2, -1), (-2, 3), (-1, -2), (-1, 3), (1, -3), (1, 2), (2, -3), (2, 1), (3, -2), (3, -1))
    >>> representations((2, 1, 3), 5)
    ()
    >>> representations((1, 0, 1), 0), representations((1, 0, 1), -5)
    (((0, 0),), ())
    """
    Q, D, k, sign, n = _content_and_sign(form, n)
    if D > 0:
        raise FormError(
            f"{Q!r} is indefinite: Q(x, y) = {n} has infinitely many solutions or none; "
            "use representation_orbits for one solution per orbit"
        )
    return tuple(_all_definite(Q, D, k, sign, n, factors, primitive))


def representation_count(form: FormLike, n: object, *, factors: dict[int, int] | None = None) -> int:
    """``r_Q(n)``: the number of all ``(x, y) ∈ Z²`` with ``Q(x, y) = n`` (definite ``Q``).

    Counted without listing the solutions: ``w`` times the number of roots ``b`` whose
    form is equivalent to ``Q``, summed over ``g² | n``.

    Examples
    --------
    >>> [representation_count((1, 0, 1), n) for n in range(11)]
    [1, 4, 4, 0, 4, 8, 0, 0, 4, 4, 8]
    >>> representation_count((1, 0, 1), 5**40 * 13**10)   # Jacobi: 4·41·11
    1804
    """
    return _count(form, n, factors, primitive=False)


def primitive_representation_count(
    form: FormLike, n: object, *, factors: dict[int, int] | None = None
) -> int:
    """The number of ``(x, y)`` with ``gcd(x, y) = 1`` and ``Q(x, y) = n`` (definite ``Q``).

    Examples
    --------
    >>> primitive_representation_count((1, 0, 1), 25), primitive_representation_count((1, 0, 1), 9)
    (8, 0)
    """
    return _count(form, n, factors, primitive=True)


def _count(form, n, factors, primitive: bool) -> int:
    Q, D, k, sign, n = _content_and_sign(form, n)
    if D > 0:
        raise FormError(f"{Q!r} is indefinite: solutions are infinite in number; count orbits instead")
    if n == 0:
        return 0 if primitive else 1
    P, m = _primitive_target(Q, k, sign, n)
    if P is None or m < 0:
        return 0
    fac = _factor_abs(m, _scaled_factors(factors, n, m))
    w = unit_count(P.discriminant)
    if primitive:
        return _definite_primitive_count(P, m, fac, w)
    return sum(_definite_primitive_count(P, m // (g * g), rest, w) for g, rest in _square_divisors(fac))


# ---------------------------------------------------------------------------
# sums over classes


def total_representation_count(D: object, n: object, *, factors: dict[int, int] | None = None) -> int:
    """``Σ_Q r_Q(n)`` over one primitive form per class (``D < 0``), or ``Σ_Q`` of the number
    of solution orbits (``D > 0``, narrow classes), for ``n ≥ 1``.

    Computed without the class group as ``w·Σ_{g²|n} N*(n/g²)`` where ``N*(m)`` counts the
    ``b mod 2m`` with ``b² ≡ D (mod 4m)`` and ``(m, b, (b² − D)/4m)`` primitive
    (``w`` = 2, 4, 6 for ``D < 0`` and 1 for ``D > 0``).  This holds for every ``n ≥ 1``.

    Examples
    --------
    >>> total_representation_count(-23, 6), total_representation_count(-20, 5)
    (8, 2)
    """
    D = validate_discriminant(D)
    n = as_int(n, "n")
    if n < 1:
        raise FormkitError(f"total_representation_count needs n ≥ 1, not {n}")
    fac = _factor_abs(n, factors)
    w = unit_count(D) if D < 0 else 1
    return w * sum(len(_proper_roots(D, n // (g * g), rest)) for g, rest in _square_divisors(fac))


def dirichlet_count(D: object, n: object) -> int:
    """Dirichlet's formula ``w·Σ_{d|n} χ_D(d)`` for ``n ≥ 1`` prime to the conductor of ``D``.

    Under that condition (automatic for fundamental ``D``) it equals
    :func:`total_representation_count`: the sum over classes of ``r_Q(n)`` for ``D < 0``,
    of the orbit counts for ``D > 0`` (then ``w = 1``).

    Raises
    ------
    DiscriminantError
        If ``n`` shares a prime with the conductor ``f`` (the formula then fails, e.g.
        ``D = −36``, ``n = 9``); use :func:`total_representation_count`.

    Examples
    --------
    >>> dirichlet_count(-4, 25), dirichlet_count(-23, 6), dirichlet_count(-3, 7)
    (12, 8, 12)
    """
    D = validate_discriminant(D)
    n = as_int(n, "n")
    if n < 1:
        raise FormkitError(f"dirichlet_count needs n ≥ 1, not {n}")
    f = discriminant_parts(D)[1]
    if gcd(n, f) != 1:
        raise DiscriminantError(
            f"Dirichlet's formula needs n prime to the conductor {f} of D = {D}; "
            f"gcd({n}, {f}) = {gcd(n, f)} (use total_representation_count)"
        )
    w = unit_count(D) if D < 0 else 1
    fac = prime_factorisation(n) if n > 1 else {}
    # Σ_{d|n} χ(d) is multiplicative: Π_p (1 + χ(p) + … + χ(p)^e)
    total = 1
    for p, e in fac.items():
        chi = kronecker(D, p)
        total *= sum(chi**i for i in range(e + 1))
    return w * total
