"""Congruence criteria: the values of a genus modulo |D|, one class per genus, idoneal numbers.

Let ``Q`` be a primitive form of non-square discriminant ``D`` (positive definite when
``D < 0``) and ``C`` its class in ``Cl(D)`` (the narrow class group when ``D > 0``).

*Congruence criteria* (Cox §2–§3, Theorem 2.26 and Corollary 2.27 as recalled).  The
values of ``Q`` prime to ``D``, taken modulo ``|D|``, form a coset of the subgroup of
values of the principal form; this coset is the same for all forms of one genus and
determines the genus.  Hence when the genus of ``Q`` consists of the class of ``Q``
alone — which happens for every ``Q`` exactly when ``Cl(D)`` has exponent ≤ 2, i.e.
one class per genus, since the principal genus is ``Cl(D)²`` — a prime ``p ∤ D`` is
represented by ``Q`` iff ``p mod |D|`` lies in that coset.  The same holds when the
genus is ``{C, C⁻¹}`` (``C`` of order 4 in a genus of two classes), since ``Q`` and
``Q⁻¹`` represent the same numbers; in every other case the congruence class of ``p``
only tells the genus, and no congruence criterion exists
(:func:`formkit.representation.prime_criteria.has_congruence_criterion`).  The modulus ``|D|`` always suffices: for ``x² + ny²`` it is
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

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §2 (Theorem 2.26,
       Corollary 2.27), §3 (genus theory); numbers as recalled.
.. [2] C. F. Gauss, *Disquisitiones Arithmeticae*, 1801, art. 229–287 (genera).
.. [3] L. Euler, on numeri idonei (1778); the list of 65 idoneal numbers (from memory).
"""

from __future__ import annotations

from ..classgroups.dispatch import class_group
from ..core.arith import as_int, kronecker
from ..core.factorisation import prime_factorisation
from ..core.forms import Form, FormLike
from ..core.modular_roots import crt
from ..errors import FormkitError
from .prime_decision import _check_form

__all__ = [
    "genus_residues",
    "one_class_per_genus",
    "is_idoneal",
]

#: Largest number of residues :func:`genus_residues` lists.
RESIDUE_LIMIT = 10**6


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
    fac = prime_factorisation(abs(D))
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
