"""Genus theory: assigned characters, genus symbols, and the partition into genera.

Two primitive forms of discriminant ``D`` lie in the same *genus* when they represent
the same values in ``(Z/DZ)^×`` (Gauss).  The genus is read off from any one value
``m`` of the form that is prime to ``D``, through the *assigned characters* of ``D``:

* ``(m/p)`` (Legendre symbol) for every odd prime ``p`` dividing ``D``;
* at 2, depending on ``D`` modulo 32, with ``δ(m) = (−1)^((m−1)/2)`` and
  ``ε(m) = (−1)^((m²−1)/8)`` for odd ``m``:

  ============================  ======================  ===================
  ``D`` (mod 32 / 16)           ``D/4`` modulo 8         characters at 2
  ============================  ======================  ===================
  ``D ≡ 1 (mod 4)``              —                       none
  ``D ≡ 4 (mod 16)``             1, 5                    none
  ``D ≡ 12 (mod 16)``            3, 7                    δ
  ``D ≡ 8 (mod 32)``             2                       ε
  ``D ≡ 24 (mod 32)``            6                       δε
  ``D ≡ 16 (mod 32)``            4                       δ
  ``D ≡ 0 (mod 32)``             0                       δ and ε
  ============================  ======================  ===================

This is the table of Cox, *Primes of the Form x² + ny²*, before Theorem 3.15, written for
``D = −4n`` (``n ≡ 3 mod 4``: none; ``n ≡ 1, 5 mod 8``: δ; ``n ≡ 2 mod 8``: δε;
``n ≡ 6 mod 8``: ε; ``n ≡ 4 mod 8``: δ; ``n ≡ 0 mod 8``: δ, ε) and restated through
``D/4 = −n`` so that it applies to every discriminant, positive or negative, fundamental
or not (Buell, *Binary Quadratic Forms*, Springer 1989, Ch. 4, gives the same
characters for all discriminants).  With ``μ`` assigned characters the genus symbol map
is a homomorphism from the (narrow, for ``D > 0``) class group onto a subgroup of index
2 of ``{±1}^μ``; there are ``2^(μ−1)`` genera, each a coset of the *principal genus*
(the genus of the principal form, all symbols +1), and the principal genus is the
subgroup of squares (Gauss; Cox Theorem 3.15 and Theorem 6.1 — numbers as recalled).
The tests check all three statements against the class group.

For ``D > 0`` the classes are the narrow (proper) classes, one per cycle of reduced
forms; the values used may be negative, where the characters above still make sense.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §3 (genus theory
       for ``D = −4n``, Theorem 3.15 and the table before it).
.. [2] D. A. Buell, *Binary Quadratic Forms: Classical Theory and Modern Computations*,
       Springer 1989, Ch. 4 (genera for all discriminants).
.. [3] C. F. Gauss, *Disquisitiones Arithmeticae*, 1801, art. 229–287.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass

from ..core.arith import gcd, kronecker
from ..core.discriminants import validate_discriminant
from ..core.displays import SentenceDisplay
from ..core.factorisation import prime_factorisation
from ..core.forms import Form, FormLike, _require_nonsquare, as_form
from ..core.modular_roots import crt
from ..errors import DiscriminantMismatchError, FormError, FormkitError, NotPrimitiveError

__all__ = [
    "GenusCharacter",
    "Genus",
    "GenusPartition",
    "assigned_characters",
    "genus_count",
    "value_prime_to",
    "genus_symbol",
    "same_genus",
    "genera",
    "principal_genus",
]

_TWO_ADIC_FORMULAS = {
    "delta": "(-1)^((n-1)/2)",
    "epsilon": "(-1)^((n^2-1)/8)",
    "delta*epsilon": "(-1)^((n-1)/2 + (n^2-1)/8)",
}


@dataclass(frozen=True)
class GenusCharacter(SentenceDisplay):
    """One assigned character of a discriminant.

    ``kind`` is ``"odd prime"`` (the Legendre symbol ``(n/p)``, ``prime = p``) or one
    of the characters at 2: ``"delta"`` (``(−1)^((n−1)/2)``), ``"epsilon"``
    (``(−1)^((n²−1)/8)``) and ``"delta*epsilon"`` (their product); then ``prime = 2``.
    Calling the character on an integer prime to its prime gives ``±1``.

    Examples
    --------
    >>> chars = assigned_characters(-20)
    >>> [c.name for c in chars], [c(3) for c in chars]
    (['(n/5)', 'delta'], [-1, -1])
    """

    kind: str
    prime: int

    def _display_sentence(self) -> str:
        return (
            f"the genus character {self.name} = {self.formula}"
            if self.name != self.formula
            else f"the genus character {self.name}"
        )

    def _display_provenance(self) -> str:
        return "genus theory (Gauss; Cox §3), exact"

    @property
    def name(self) -> str:
        """Short name: ``(n/p)``, ``delta``, ``epsilon`` or ``delta*epsilon``."""
        if self.kind == "odd prime":
            return f"(n/{self.prime})"
        return self.kind

    @property
    def formula(self) -> str:
        """The character as a formula in ``n``."""
        if self.kind == "odd prime":
            return f"Legendre symbol (n/{self.prime})"
        return _TWO_ADIC_FORMULAS[self.kind]

    def __call__(self, n: int) -> int:
        n = int(n)
        if n % self.prime == 0:
            raise FormkitError(
                f"the genus character {self.name} is evaluated at integers prime to {self.prime}; {n} is not"
            )
        if self.kind == "odd prime":
            return kronecker(n, self.prime)
        delta = 1 if n % 4 == 1 else -1
        eps = 1 if n % 8 in (1, 7) else -1
        if self.kind == "delta":
            return delta
        if self.kind == "epsilon":
            return eps
        return delta * eps

    def __repr__(self) -> str:
        return f"GenusCharacter({self.name})"


def _two_adic_kinds(D: int) -> tuple[str, ...]:
    if D % 4 == 1:
        return ()
    m = (D // 4) % 8
    return {
        1: (),
        5: (),
        3: ("delta",),
        7: ("delta",),
        2: ("epsilon",),
        6: ("delta*epsilon",),
        4: ("delta",),
        0: ("delta", "epsilon"),
    }[m]


def assigned_characters(D: object) -> tuple[GenusCharacter, ...]:
    """The assigned characters of the discriminant ``D`` (odd primes first, then 2).

    See the module docstring for the table at 2 (Cox, *Primes of the Form x² + ny²*,
    the table before Theorem 3.15, restated for all ``D`` via ``D/4 mod 8``).

    Raises
    ------
    DiscriminantError
        If ``D`` is not a discriminant.

    Examples
    --------
    >>> [c.name for c in assigned_characters(-84)]
    ['(n/3)', '(n/7)', 'delta']
    >>> [c.name for c in assigned_characters(-32)], [c.name for c in assigned_characters(-8)]
    (['delta', 'epsilon'], ['delta*epsilon'])
    >>> [c.name for c in assigned_characters(-23)]
    ['(n/23)']
    """
    D = validate_discriminant(D)
    odd = [p for p in prime_factorisation(D) if p != 2]
    chars = [GenusCharacter("odd prime", p) for p in odd]
    chars.extend(GenusCharacter(k, 2) for k in _two_adic_kinds(D))
    return tuple(chars)


def genus_count(D: object) -> int:
    """The number of genera ``2^(μ−1)``, ``μ`` the number of assigned characters.

    Examples
    --------
    >>> genus_count(-84), genus_count(-23), genus_count(-420)
    (4, 1, 8)
    """
    mu = len(assigned_characters(D))
    return 1 << (mu - 1) if mu >= 1 else 1


def _primitive_form(form: FormLike, what: str) -> Form:
    f = as_form(form)
    D = _require_nonsquare(f, what)
    if not f.is_primitive:
        raise NotPrimitiveError(
            f"{what} needs a primitive form; {f!r} has content {f.content} "
            f"(divide it out: {f.primitive_part()!r})"
        )
    if D < 0 and f.a < 0:
        raise FormError(
            f"{what} is defined here for positive definite forms; {f!r} is negative definite "
            f"(use its negative {(-f)!r})"
        )
    return f


def value_prime_to(form: FormLike, M: object) -> tuple[int, int, int]:
    """A value ``m = Q(x, y)`` of a primitive form with ``gcd(m, M) = 1``: ``(m, x, y)``.

    Small pairs ``(x, y)`` are tried first; otherwise ``(x, y)`` is built by the Chinese
    remainder theorem, one prime ``p | M`` at a time: ``(1, 0)`` if ``p ∤ a``, else
    ``(0, 1)`` if ``p ∤ c``, else ``(1, 1)`` (then ``p ∤ b`` by primitivity) — the
    argument of Cox, *Primes of the Form x² + ny²*, Lemma 2.25.

    Raises
    ------
    NotPrimitiveError
        If the form is not primitive (then no such value need exist).

    Examples
    --------
    >>> value_prime_to((2, 2, 3), 20)
    (3, 0, 1)
    >>> value_prime_to((6, 5, 6), 6 * 35)
    (17, 1, 1)
    """
    f = as_form(form)
    modulus = abs(int(M))  # type: ignore[call-overload]  # M may be any integer-like value
    if not f.is_primitive:
        raise NotPrimitiveError(f"{f!r} is not primitive (content {f.content}); its values share a factor")
    for x, y in ((1, 0), (0, 1), (1, 1), (1, -1), (2, 1), (1, 2), (2, -1), (1, -2), (3, 1), (1, 3)):
        m = f(x, y)
        if m != 0 and gcd(m, modulus) == 1:
            return m, x, y
    primes = list(prime_factorisation(modulus)) if modulus > 1 else []
    xs, ys = [], []
    for p in primes:
        if f.a % p:
            xs.append(1)
            ys.append(0)
        elif f.c % p:
            xs.append(0)
            ys.append(1)
        else:
            xs.append(1)
            ys.append(1)
    x, P = crt(xs, primes)
    y, _ = crt(ys, primes)
    if x == 0 and y == 0:  # pragma: no cover - only when M = 1, handled above
        x = 1
    m = f(x, y)
    if m == 0 or gcd(m, modulus) != 1:
        # x, y can be shifted by multiples of P without changing m mod P
        for k in range(1, 64):
            m = f(x + k * P, y)
            if m != 0 and gcd(m, modulus) == 1:
                return m, x + k * P, y
        raise FormkitError(f"no value of {f!r} prime to {modulus} found")  # pragma: no cover
    return m, x, y


def genus_symbol(form: FormLike) -> tuple[int, ...]:
    """The genus symbol ``(χ_1(m), …, χ_μ(m))`` of a primitive form.

    ``m`` is a value of the form prime to ``D`` (:func:`value_prime_to`) and the
    ``χ_i`` are :func:`assigned_characters` of ``D``.  The principal genus has symbol
    all ``+1``.

    Raises
    ------
    NotPrimitiveError
        If the form is not primitive.
    FormError
        If the form is negative definite (use its negative).
    DiscriminantError
        If the discriminant is a square.

    Examples
    --------
    >>> genus_symbol((1, 0, 5)), genus_symbol((2, 2, 3))
    ((1, 1), (-1, -1))
    >>> genus_symbol((3, 2, 7))     # D = −80: characters (n/5), delta
    (-1, -1)
    """
    f = _primitive_form(form, "a genus symbol")
    D = f.discriminant
    m, _, _ = value_prime_to(f, D)
    return tuple(ch(m) for ch in assigned_characters(D))


def same_genus(F: FormLike, G: FormLike) -> bool:
    """True when two primitive forms of the same discriminant lie in the same genus.

    Examples
    --------
    >>> same_genus((1, 0, 21), (3, 0, 7)), same_genus((1, 0, 21), (2, 2, 11))
    (False, False)
    >>> same_genus((2, 2, 11), (3, 0, 7))   # D = −84 has 4 genera of one class each
    False
    """
    F = as_form(F, name="F")
    G = as_form(G, name="G")
    if F.discriminant != G.discriminant:
        raise DiscriminantMismatchError(
            f"genera compare forms of one discriminant: {F!r} has D = {F.discriminant}, "
            f"{G!r} has D = {G.discriminant}"
        )
    return genus_symbol(F) == genus_symbol(G)


@dataclass(frozen=True)
class Genus(SentenceDisplay):
    """One genus: its symbol and the reduced forms of its classes."""

    symbol: tuple[int, ...]
    forms: tuple[Form, ...]

    def _display_sentence(self) -> str:
        return (
            "genus with symbol ("
            + ", ".join(f"{e:+d}" for e in self.symbol)
            + "): "
            + ", ".join(f"({f.a}, {f.b}, {f.c})" for f in self.forms)
        )

    def _display_provenance(self) -> str:
        return "genus theory (Gauss; Cox §3), exact"

    @property
    def is_principal(self) -> bool:
        """True for the genus of the principal form (symbol all +1)."""
        return all(s == 1 for s in self.symbol)

    def __len__(self) -> int:
        return len(self.forms)

    def to_dict(self) -> dict:
        """``{"symbol": [...], "forms": [[a, b, c], ...]}``."""
        return {"symbol": list(self.symbol), "forms": [f.to_list() for f in self.forms]}


@dataclass(frozen=True)
class GenusPartition(SentenceDisplay):
    """The classes of discriminant ``D`` sorted into genera.

    ``genera`` lists the genera that occur (principal genus first, then by symbol);
    ``expected_count`` is ``2^(μ−1)`` from the theory, which :attr:`count` must equal.
    """

    discriminant: int
    characters: tuple[GenusCharacter, ...]
    genera: tuple[Genus, ...]

    def _display_sentence(self) -> str:
        return (
            f"D = {self.discriminant}: {len(self.genera)} genera of {sum(len(g.forms) for g in self.genera)} classes; assigned characters "
            + ", ".join(c.name for c in self.characters)
        )

    def _display_provenance(self) -> str:
        return "genus theory (Gauss; Cox §3), complete: every class placed by its characters"

    @property
    def count(self) -> int:
        """Number of genera found among the classes."""
        return len(self.genera)

    @property
    def expected_count(self) -> int:
        """``2^(μ−1)``."""
        mu = len(self.characters)
        return 1 << (mu - 1) if mu else 1

    @property
    def class_number(self) -> int:
        """Total number of classes (narrow classes for ``D > 0``)."""
        return sum(len(g) for g in self.genera)

    @property
    def principal(self) -> Genus:
        """The principal genus."""
        return self.genera[0]

    def genus_of(self, form: FormLike) -> Genus:
        """The genus (of this partition) containing ``form``."""
        f = as_form(form)
        if f.discriminant != self.discriminant:
            raise DiscriminantMismatchError(
                f"{f!r} has discriminant {f.discriminant}, not {self.discriminant}"
            )
        s = genus_symbol(f)
        for g in self.genera:
            if g.symbol == s:
                return g
        raise FormkitError(f"no class of {f!r} in this partition")  # pragma: no cover

    def __iter__(self):
        return iter(self.genera)

    def __len__(self) -> int:
        return len(self.genera)

    def to_dict(self) -> dict:
        """The JSON shape of ``formkit genera D --json``."""
        return {
            "discriminant": self.discriminant,
            "characters": [c.name for c in self.characters],
            "genera": [g.to_dict() for g in self.genera],
        }

    def __repr__(self) -> str:
        return (
            f"GenusPartition(D={self.discriminant}, characters={[c.name for c in self.characters]}, "
            f"genera={self.count}, classes={self.class_number})"
        )


def _class_forms(D: int) -> tuple[Form, ...]:
    from ..core.enumeration import class_representatives

    return tuple(class_representatives(D))


def genera(D: object, forms: Iterable[FormLike] | None = None) -> GenusPartition:
    """Sort the classes of discriminant ``D`` into genera by their genus symbols.

    Parameters
    ----------
    D : int
        The discriminant (any, positive or negative, fundamental or not).
    forms : iterable of forms, optional
        One primitive form per class; by default
        :func:`formkit.core.enumeration.class_representatives` (so ``D`` must be small
        enough to list all classes).

    Returns
    -------
    GenusPartition
        Principal genus first; forms within a genus in the order given.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a discriminant.
    DiscriminantMismatchError
        If a given form has another discriminant.

    Examples
    --------
    >>> P = genera(-84)
    >>> [c.name for c in P.characters], P.count, P.expected_count
    (['(n/3)', '(n/7)', 'delta'], 4, 4)
    >>> P.principal.forms
    (Form(1, 0, 21),)
    """
    D = validate_discriminant(D)
    chars = assigned_characters(D)
    if forms is None:
        forms = _class_forms(D)
    groups: dict[tuple[int, ...], list[Form]] = {}
    for item in forms:
        f = as_form(item)
        if f.discriminant != D:
            raise DiscriminantMismatchError(f"{f!r} has discriminant {f.discriminant}, not {D}")
        f = _primitive_form(f, "sorting into genera")
        m, _, _ = value_prime_to(f, D)
        groups.setdefault(tuple(ch(m) for ch in chars), []).append(f)
    one = tuple(1 for _ in chars)
    keys = sorted(groups, key=lambda s: (s != one, tuple(-v for v in s)))
    return GenusPartition(D, chars, tuple(Genus(k, tuple(groups[k])) for k in keys))


def principal_genus(D: object) -> Genus:
    """The principal genus of discriminant ``D`` (the genus of the principal form).

    Examples
    --------
    >>> principal_genus(-56).forms
    (Form(1, 0, 14), Form(2, 0, 7))
    """
    return genera(D).principal
