"""The splittings ``D = d₁·d₂`` that give the genus characters of a discriminant.

For a fundamental ``D`` the genus characters are ``ψ_{d₁,d₂}`` with ``D = d₁·d₂`` and
``d₁, d₂`` fundamental discriminants or 1: each ``d₁`` is a product of a subset of the
*prime discriminants* of ``D`` (``p* = (−1)^((p−1)/2)·p`` for odd ``p | D``, one of
``−4, 8, −8`` for ``p = 2``), and ``ψ(C) = χ_{d₁}(m) = χ_{d₂}(m)`` for any ``m``
represented by ``C`` and prime to ``D`` (Zagier, *Zetafunktionen und quadratische Körper*,
§12, from memory).  For an order (``D = f²·d_K``, ``f > 1``) the same recipe with ``d₁``
fundamental or 1 and ``d₂ = D/d₁ ≡ 0, 1 (mod 4)`` any discriminant or square gives the genus
characters of ``Cl(D)``; different pairs can then give one character.  The L-series of these
characters factor as products of two Dirichlet L-series
(:func:`formkit.classgroups.class_series.genus_character_l_series`,
:func:`formkit.classgroups.order_series.order_genus_character_l_series`).

References
----------
.. [1] D. Zagier, *Zetafunktionen und quadratische Körper*, Springer 1981, §12.
.. [2] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §3 (genus theory),
       §7 (orders).
"""

from __future__ import annotations

from ..core.arith import divisors, isqrt
from ..core.discriminants import discriminant_parts, is_fundamental_discriminant, validate_discriminant
from ..core.factorisation import prime_factorisation
from ..errors import DiscriminantError

__all__ = [
    "prime_discriminants",
    "genus_character_discriminants",
    "order_genus_character_discriminants",
]


def prime_discriminants(D: object) -> tuple[int, ...]:
    """The prime discriminants whose product is the fundamental discriminant ``D``.

    ``p* = (−1)^((p−1)/2)·p`` for each odd prime ``p | D`` and one of ``−4, 8, −8`` for 2
    (Zagier, *Zetafunktionen und quadratische Körper*, §12; from memory).

    Parameters
    ----------
    D : int
        A fundamental discriminant.

    Returns
    -------
    tuple of int
        The odd prime discriminants by increasing ``p``, then the one at 2 (if ``D`` is even).

    Raises
    ------
    DiscriminantError
        If ``D`` is not a fundamental discriminant.

    Examples
    --------
    >>> prime_discriminants(-84), prime_discriminants(-20), prime_discriminants(5)
    ((-3, -7, -4), (5, -4), (5,))
    """
    D = validate_discriminant(D)
    if not is_fundamental_discriminant(D):
        raise DiscriminantError(f"prime discriminants factor fundamental discriminants; {D} is not one")
    out = []
    rest = D
    for p in sorted(prime_factorisation(abs(D))):
        if p == 2:
            continue
        ps = p if p % 4 == 1 else -p
        out.append(ps)
        rest //= ps
    if rest != 1:
        out.append(rest)  # −4, 8 or −8
    return tuple(out)


def genus_character_discriminants(D: object) -> tuple[tuple[int, int], ...]:
    """The pairs ``(d₁, d₂)``, ``d₁·d₂ = D``, one per genus character of a fundamental ``D``.

    ``d₁`` runs over the products of the prime discriminants not involving the last one
    (so each unordered pair appears once); the trivial character ``(1, D)`` comes first.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a fundamental discriminant (for an order see
        :func:`order_genus_character_discriminants`).

    Examples
    --------
    >>> genus_character_discriminants(-20)
    ((1, -20), (5, -4))
    >>> len(genus_character_discriminants(-420))   # 2^(μ−1) with μ = 4
    8
    """
    primes = prime_discriminants(D)
    D = validate_discriminant(D)
    head = primes[:-1]
    pairs = []
    for mask in range(1 << len(head)):
        d1 = 1
        for i, p in enumerate(head):
            if mask >> i & 1:
                d1 *= p
        pairs.append((d1, D // d1))
    return tuple(sorted(pairs, key=lambda t: (abs(t[0]), t[0])))


def field_discriminant(d: int) -> int:
    """The fundamental discriminant of ``Q(√d)`` (``1`` for a square ``d``)."""
    if d > 0 and isqrt(d) ** 2 == d:
        return 1
    return discriminant_parts(d)[0]


def splittings(D: int) -> list[tuple[int, int]]:
    """Every ``(d₁, D/d₁)`` with ``d₁`` fundamental or 1 and ``D/d₁ ≡ 0, 1 (mod 4)``, ``|d₁|`` increasing."""
    out = []
    for n in sorted(divisors(abs(D))):
        for d1 in (n, -n):
            if d1 != 1 and not is_fundamental_discriminant(d1):
                continue
            if D % d1 or (D // d1) % 4 not in (0, 1):
                continue
            out.append((d1, D // d1))
    return out


def order_genus_character_discriminants(D: object) -> tuple[tuple[int, int], ...]:
    """The pairs ``(d₁, d₂)``, ``d₁·d₂ = D``, ``d₁`` fundamental or 1 and ``d₂ ≡ 0, 1 (mod 4)``.

    Each gives a genus character ``ψ(C) = χ_{d₁}(m)`` of ``Cl(D)``; different pairs can give
    the same character (for ``D = −36``, ``(−4, 9)`` gives the trivial one).  Each unordered
    pair appears once.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a discriminant.

    Examples
    --------
    >>> order_genus_character_discriminants(-36)
    ((1, -36), (-3, 12), (-4, 9))
    """
    D = validate_discriminant(D)
    out: list[tuple[int, int]] = []
    seen: set[frozenset[int]] = set()
    for d1, d2 in splittings(D):
        if frozenset((d1, d2)) not in seen:
            seen.add(frozenset((d1, d2)))
            out.append((d1, d2))
    return tuple(out)
