"""The 4-rank of a negative discriminant from its ambiguous forms and the genus characters.

For a finite abelian 2-group ``A`` the number of cyclic factors of order at least 4 is
the rank of ``A[2] ∩ A²``.  In the class group ``Cl(D)`` both sides are explicit:

* ``Cl[2]`` is the set of classes of the *ambiguous* reduced forms — ``(a, 0, c)``,
  ``(a, a, c)`` and ``(a, b, a)`` — of which there are ``2^(μ−1)`` (Cox,
  Proposition 3.11; the count is checked here), read off from the divisors of ``D``;
* ``Cl²`` is the principal genus (Gauss's principal genus theorem; Cox Theorem 3.15),
  the kernel of the genus characters of :mod:`formkit.classgroups.genus`.

So the 4-rank is ``μ − 1 − rank``, ``rank`` the F₂-rank of the genus symbols of the
ambiguous forms.  This is Rédei's matrix in the language of forms (Rédei 1934: the
Legendre symbols of the prime discriminants dividing ``D`` at the primes of ``D``); the
symbols of the ambiguous forms are those Legendre symbols, but the forms also serve
discriminants that are not fundamental, where Rédei's statement is not the one needed.

The 2-Sylow subgroup of order ``2^e`` with ``r`` cyclic factors of which ``r₄`` have
order ``≥ 4`` is then forced when ``r₄ ≤ 1`` or ``e ≤ r + r₄ + 1``
(:func:`forced_two_part`).

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §3 (Proposition
       3.11, Theorem 3.15; numbers as recalled).
.. [2] L. Rédei, "Arithmetischer Beweis des Satzes über die Anzahl der durch vier
       teilbaren Invarianten der absoluten Klassengruppe im quadratischen Zahlkörper",
       J. reine angew. Math. 171 (1934), 55–60.
.. [3] C. F. Gauss, *Disquisitiones Arithmeticae*, 1801, art. 286–287 (duplication).
"""

from __future__ import annotations

from math import gcd

from ..classgroups.genus import _two_adic_kinds
from ..core.factorisation import prime_factorisation

__all__ = ["ambiguous_forms", "four_rank", "forced_two_part"]


def ambiguous_forms(D: int, factors: dict[int, int] | None = None) -> list[tuple[int, int, int]]:
    """The primitive reduced ambiguous forms of ``D < 0`` (one per class of order ≤ 2).

    Parameters
    ----------
    D : int
        A negative discriminant.
    factors : dict, optional
        The factorisation ``{p: e}`` of ``|D|`` (computed if omitted).

    Returns
    -------
    list of (a, b, c)
        The reduced forms with ``b = 0``, ``b = a`` or ``a = c``.

    Examples
    --------
    >>> ambiguous_forms(-84)
    [(1, 0, 21), (2, 2, 11), (3, 0, 7), (5, 4, 5)]
    >>> ambiguous_forms(-23)
    [(1, 1, 6)]

    References
    ----------
    Cox, *Primes of the Form x² + ny²*, Proposition 3.11 (the count ``2^(μ−1)``).
    """
    n = -D
    if factors is None:
        factors = prime_factorisation(n)
    return sorted(_ambiguous_iter(n, factors))


def _ambiguous_iter(n: int, factors: dict[int, int]):
    """The ambiguous reduced forms of ``−n`` from the divisors ``d < √n`` of ``n``."""
    divs = [1]
    for p, e in factors.items():
        divs = [d * p**k for d in divs for k in range(e + 1)]
    m = n // 4 if n % 4 == 0 else 0
    for d in divs:
        if d * d >= n:
            continue
        q = n // d
        if m and d * d <= m and m % d == 0 and gcd(d, m // d) == 1:
            yield (d, 0, m // d)
        t = q + d
        if t % 4 == 0 and t >= 4 * d and gcd(d, t // 4) == 1:
            yield (d, d, t // 4)
        if q < 3 * d and (d + q) % 4 == 0:  # (2a − b)(2a + b) = n with 0 < b < a
            a, b = (d + q) // 4, (q - d) // 2
            if gcd(a, b) == 1:
                yield (a, b, a)


def _symbol_bits(D: int, odd: list[int], kinds: tuple[str, ...], form: tuple[int, int, int]) -> int:
    """The genus symbol of a form as a bit mask (bit set: character −1)."""
    a, b, c = form
    m = 0
    for x, y in ((1, 0), (0, 1), (1, 1), (1, -1), (2, 1), (1, 2), (2, -1), (1, -2), (3, 1), (1, 3)):
        v = a * x * x + b * x * y + c * y * y
        if gcd(v, D) == 1:
            m = v
            break
    if not m:
        from ..classgroups.genus import value_prime_to

        m = value_prime_to(form, D)[0]
    bits = 0
    for i, p in enumerate(odd):
        if pow(m % p, (p - 1) // 2, p) != 1:
            bits |= 1 << i
    k = len(odd)
    for kind in kinds:
        delta = m % 4 == 3
        eps = m % 8 in (3, 5)
        if delta if kind == "delta" else eps if kind == "epsilon" else delta != eps:
            bits |= 1 << k
        k += 1
    return bits


def four_rank(D: int, genus_count: int | None = None, at_least: int = 0) -> int:
    """The 4-rank of ``Cl(D)``, ``D < 0``: the number of invariants divisible by 4.

    Parameters
    ----------
    D : int
        A negative discriminant.
    genus_count : int, optional
        The number of genera ``2^(μ−1)``; when given it is checked against the number
        of ambiguous forms found.
    at_least : int, optional
        A lower bound known beforehand (1 when ``2^(μ−1)`` is a proper divisor of the
        2-part of ``h``): the symbols are read only until the rank they span reaches
        ``μ − 1 − at_least``.

    Returns
    -------
    int
        ``μ − 1 −`` the F₂-rank of the genus symbols of the ambiguous forms.

    Raises
    ------
    ArithmeticError
        If the number of ambiguous forms is not ``2^(μ−1)`` (an internal check, made
        whenever the rank of the symbols is not already at its bound), or
        ``genus_count`` disagrees with the assigned characters.

    Examples
    --------
    >>> four_rank(-84), four_rank(-260), four_rank(-4620)   # Cl: C2×C2, C2×C4, C2×C2×C6
    (0, 1, 0)
    >>> four_rank(-260, at_least=1)
    1

    References
    ----------
    Gauss (principal genus = squares); Cox Proposition 3.11, Theorem 3.15; Rédei (1934).
    """
    n = -D
    factors = prime_factorisation(n)
    odd = [p for p in factors if p != 2]
    kinds = _two_adic_kinds(D)
    mu = len(odd) + len(kinds)
    if genus_count is not None and genus_count != 1 << (mu - 1):
        raise ArithmeticError(f"{genus_count} genera given for {D}, but it has {mu} assigned characters")
    basis: list[int] = []  # F₂ elimination on the symbols
    top = mu - 1 - at_least
    count = 0
    for form in _ambiguous_iter(n, factors):
        if len(basis) >= top:
            # the bound: no further form can raise the rank, and the 4-rank is at_least
            # whether or not the forms were complete
            break
        count += 1
        if form[0] == 1:  # the principal form: symbol all +1
            continue
        v = _symbol_bits(D, odd, kinds, form)
        for w in basis:
            v = min(v, v ^ w)
        if v:
            basis.append(v)
    else:
        if count != 1 << (mu - 1):  # the rank rests on all of Cl[2]: the forms must be complete
            raise ArithmeticError(
                f"{count} ambiguous forms of {D}, but genus theory counts {1 << (mu - 1)} classes of order ≤ 2"
            )
    return mu - 1 - len(basis)


def forced_two_part(e: int, r: int, r4: int) -> list[int] | None:
    """Exponents (ascending) of a 2-group of order ``2^e``, rank ``r``, 4-rank ``r₄`` if forced.

    Returns ``None`` when several groups fit (``r₄ ≥ 2`` and ``e ≥ r + r₄ + 2``).

    Raises
    ------
    ArithmeticError
        If no 2-group has these invariants.

    Examples
    --------
    >>> forced_two_part(5, 3, 1), forced_two_part(6, 3, 2), forced_two_part(7, 3, 2)
    ([1, 1, 3], [1, 2, 3], None)
    """
    if r4 > r or r > e or (r == 0) != (e == 0) or e < r + r4 or (r4 == 0 and e != r):
        raise ArithmeticError(f"no 2-group of order 2^{e} has rank {r} and 4-rank {r4}")
    if r4 <= 1:
        return [1] * (r - 1) + [e - r + 1] if r else []
    extra = e - r - r4  # beyond 2 per factor of order ≥ 4
    if extra <= 1:
        return [1] * (r - r4) + [2] * (r4 - extra) + [3] * extra
    return None
