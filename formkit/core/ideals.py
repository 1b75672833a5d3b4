"""Invertible ideals of a quadratic order: the value type, the dictionary with forms, prime ideals, factorisation.

Every non-zero ideal ``I`` of the order ``O`` of discriminant ``D`` has a unique Z-basis

    I = [k·a, k·(−b + √D)/2],   k ≥ 1,  a ≥ 1,  −a < b ≤ a,  b² ≡ D (mod 4a)

(the Hermite normal form of the lattice on the basis ``1, ω = (D + √D)/2`` of ``O``;
Cohen GTM 138, §5.2, Proposition 5.2.? — number not recalled — and Buchmann–Vollmer,
*Binary Quadratic Forms*, §6.1).  ``k`` is the content, ``N(I) = k²·a``, and with
``c = (b² − D)/(4a)`` the ideal is invertible (proper: its ring of multipliers is ``O``)
exactly when ``gcd(a, b, c) = 1`` (Cox, *Primes of the Form x² + ny²*, Lemma 7.5 and
Proposition 7.4).  :class:`QuadraticIdeal` holds only invertible ideals.

The dictionary (Cox, Theorem 7.7 for ``D < 0``; the oriented version for ``D > 0`` as in
Buchmann–Vollmer §6.4):

* ideal → form: ``I ↦ N(xα − yβ)/N(I)`` for the positively oriented basis
  ``α = k·a, β = k·(−b + √D)/2``, which is the primitive form ``(a, b, c)``;
* form → ideal: ``(a, b, c) ↦ [a, (−b + √D)/2]`` when ``a > 0``; for ``D > 0`` and
  ``a < 0`` the ideal ``√D·[|a|, (−b + √D)/2]``, whose oriented basis gives a form properly
  equivalent to ``(a, b, c)``.  So proper classes of forms correspond to *narrow* ideal
  classes (``I ~ J`` iff ``I = λJ`` with ``N(λ) > 0``), and the map is a bijection
  ``Cl⁺(D) ≅`` {forms of discriminant D} / SL2(Z) (positive definite ones when ``D < 0``).

Products are computed on lattices (Hermite normal form of the four products of basis
elements), independently of form composition.  Prime ideals above ``p ∤ f`` come from
the splitting of ``p`` (``χ_D(p) = 1, 0, −1``); above ``p | f`` there is no invertible
prime ideal, and factorisation into prime ideals is offered for ideals prime to the
conductor (where it is unique; Cox, Proposition 7.20).  Integers are factored with
:func:`formkit.core.factorisation.prime_factorisation`.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §7.A–7.C.
.. [2] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, Ch. 6.
.. [3] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, §5.2.
"""

from __future__ import annotations

import html
from collections.abc import Iterable

from ..errors import FormError, FormkitError, NotInvertibleIdealError, NotPrimeError
from .arith import as_int, gcd, is_probable_prime, kronecker, xgcd
from .discriminants import discriminant_parts, validate_discriminant
from .displays import latex_text as _latex_text
from .factorisation import prime_factorisation
from .forms import Form, FormLike, as_form
from .quadratic_numbers import QuadraticNumber
from .quadratic_orders import Order

__all__ = [
    "QuadraticIdeal",
    "ideal_from_generators",
    "parse_ideal",
    "principal_ideal",
    "ideal_from_form",
    "form_from_ideal",
    "PrimeIdeals",
    "prime_ideals_above",
    "IdealFactorization",
    "factor_ideal",
    "factor_element",
]


def _number(D: int, value: object, name: str = "element") -> QuadraticNumber:
    if isinstance(value, QuadraticNumber) and value.discriminant == D:
        a = value
    else:
        a = Order(D).number(value, name)
    return a


def _uv(a: QuadraticNumber) -> tuple[int, int]:
    """Coordinates on ``1, ω = (D + √D)/2`` of an element ``(x + y√D)/2`` of the order."""
    x, y, _z = a.coordinates
    return (x - y * a.discriminant) // 2, y


def _hnf(vectors: Iterable[tuple[int, int]]) -> tuple[int, int, int]:
    """``(A, B, C)``: the lattice spanned by the vectors is ``Z·(A, 0) + Z·(B, C)``, ``0 ≤ B < A``."""
    A, B, C = 0, 0, 0
    for u, v in vectors:
        if v == 0:
            A = gcd(A, u)
        elif C == 0:
            B, C = u, v
            if C < 0:
                B, C = -B, -C
        else:
            g, s, t = xgcd(C, v)
            g, s, t = int(g), int(s), int(t)
            A = gcd(A, (v // g) * B - (C // g) * u)
            B, C = s * B + t * u, g
        if A:
            B %= A
    return int(abs(A)), int(B), int(C)


class QuadraticIdeal:
    """An invertible ideal ``k·[a, (−b + √D)/2]`` of the order of discriminant ``D``.

    Immutable and hashable; equal ideals have equal ``(D, k, a, b)``.  Build one with
    :func:`ideal_from_generators`, :func:`principal_ideal`, :func:`ideal_from_form`,
    :func:`prime_ideals_above` or ``QuadraticIdeal(D, a, b, k)``.

    Raises
    ------
    NotInvertibleIdealError
        If ``gcd(a, b, c) > 1`` (the lattice is an ideal of a larger order only).
    FormkitError
        If ``a < 1``, ``k < 1`` or ``b² ≢ D (mod 4a)``.

    Examples
    --------
    >>> P = QuadraticIdeal(-20, 2, 2)        # [2, (−2 + √−20)/2] = [2, −1 + √−5]
    >>> P, P.norm, P.form
    (QuadraticIdeal(D=-20, [2, -1 + √-5]), 2, Form(2, 2, 3))
    >>> P * P == principal_ideal(-20, 2)     # P² = (2): the prime above 2 is ramified
    True
    """

    __slots__ = ("_D", "_a", "_b", "_k")
    _D: int
    _a: int
    _b: int
    _k: int

    def __init__(self, D: object, a: object, b: object, k: object = 1) -> None:
        D = validate_discriminant(D)
        a, b, k = as_int(a, "a"), as_int(b, "b"), as_int(k, "k")
        if a < 1 or k < 1:
            raise FormkitError(f"an ideal k·[a, (−b + √D)/2] needs a ≥ 1 and k ≥ 1, not a = {a}, k = {k}")
        if (b * b - D) % (4 * a):
            raise FormkitError(
                f"[{a}, (−{b} + √{D})/2] is not an ideal of the order of discriminant {D}: "
                f"b² − D = {b * b - D} is not divisible by 4a = {4 * a}"
            )
        b = (b + a - 1) % (2 * a) - a + 1  # −a < b ≤ a
        c = (b * b - D) // (4 * a)
        g = gcd(gcd(a, b), c)
        if g != 1:
            order = Order(D)
            basis = f"[{a}, {QuadraticNumber(D, -b, 1).text()}]"
            raise NotInvertibleIdealError(
                f"the ideal {basis if k == 1 else f'{k}·{basis}'} of {order.ring_text} (discriminant {D}) is not "
                f"invertible: gcd(a, b, c) = gcd({a}, {b}, {c}) = {g} > 1, so its ring of multipliers is the "
                f"larger order of discriminant {D // (g * g)}, not {order.ring_text}"
            )
        object.__setattr__(self, "_D", D)
        object.__setattr__(self, "_a", int(a))
        object.__setattr__(self, "_b", int(b))
        object.__setattr__(self, "_k", int(k))

    def __setattr__(self, name: str, value: object) -> None:
        raise AttributeError("QuadraticIdeal is immutable")

    def __reduce__(self):
        return (QuadraticIdeal, (self._D, self._a, self._b, self._k))

    @classmethod
    def _from_hnf(cls, D: int, A: int, B: int, C: int) -> QuadraticIdeal:
        if A == 0 or C == 0:
            raise NotInvertibleIdealError(
                "the zero ideal (or a lattice of rank < 2) is not an invertible ideal"
            )
        if A % C or B % C:  # pragma: no cover - an O-module always has C | A, C | B
            raise ArithmeticError(f"HNF ({A}, {B}, {C}) is not the lattice of an ideal of discriminant {D}")
        k, a = C, A // C
        b = -(2 * (B // C) + D)
        return cls(D, a, b, k)

    # -- data --------------------------------------------------------------------------------------
    @property
    def discriminant(self) -> int:
        """The discriminant ``D`` of the order."""
        return self._D

    @property
    def order(self) -> Order:
        """The order ``O`` of which this is an ideal."""
        return Order(self._D)

    @property
    def content(self) -> int:
        """The largest rational integer ``k`` with ``I ⊆ kO``."""
        return self._k

    @property
    def coefficients(self) -> tuple[int, int, int]:
        """``(k, a, b)`` of ``k·[a, (−b + √D)/2]``."""
        return (self._k, self._a, self._b)

    @property
    def norm(self) -> int:
        """``N(I) = [O : I] = k²·a``."""
        return self._k * self._k * self._a

    @property
    def form(self) -> Form:
        """The primitive form ``(a, b, c)`` of this ideal (see the module docstring)."""
        return Form(self._a, self._b, (self._b * self._b - self._D) // (4 * self._a))

    @property
    def basis(self) -> tuple[QuadraticNumber, QuadraticNumber]:
        """The Z-basis ``(k·a, k·(−b + √D)/2)`` (positively oriented)."""
        k = self._k
        return (QuadraticNumber(self._D, 2 * k * self._a, 0), QuadraticNumber(self._D, -k * self._b, k))

    def is_primitive(self) -> bool:
        """True when the content is 1."""
        return self._k == 1

    def is_unit_ideal(self) -> bool:
        """True for ``O`` itself."""
        return self._k == 1 and self._a == 1

    def _vectors(self) -> list[tuple[int, int]]:
        return [_uv(x) for x in self.basis]

    # -- arithmetic --------------------------------------------------------------------------------
    def conjugate(self) -> QuadraticIdeal:
        """``Ī = k·[a, (b + √D)/2]``; ``I·Ī = (N(I))``."""
        return QuadraticIdeal(self._D, self._a, -self._b, self._k)

    def scaled(self, n: object) -> QuadraticIdeal:
        """``n·I`` for a non-zero integer ``n``."""
        n = abs(as_int(n, "n"))
        if n == 0:
            raise NotInvertibleIdealError("0·I is the zero ideal, which is not invertible")
        return QuadraticIdeal(self._D, self._a, self._b, self._k * n)

    def __mul__(self, other: object) -> QuadraticIdeal:
        if isinstance(other, QuadraticIdeal):
            if other._D != self._D:
                raise FormkitError(
                    f"ideals of different orders (discriminants {self._D} and {other._D}) cannot be multiplied"
                )
            prods = [_uv(x * y) for x in self.basis for y in other.basis]
            return QuadraticIdeal._from_hnf(self._D, *_hnf(prods))
        if isinstance(other, int) and not isinstance(other, bool):
            return self.scaled(other)
        return NotImplemented

    __rmul__ = __mul__

    def __pow__(self, n: int) -> QuadraticIdeal:
        n = as_int(n, "exponent")
        if n < 0:
            raise FormkitError(f"only integral ideals are represented: the exponent must be ≥ 0, not {n}")
        result, base = principal_ideal(self._D, 1), self
        while n:
            if n & 1:
                result = result * base
            base = base * base
            n >>= 1
        return result

    def __contains__(self, value: object) -> bool:
        x = _number(self._D, value)
        if not x.in_order():
            return False
        u, v = _uv(x)
        k, A = self._k, self._k * self._a
        B = k * (-self._b - self._D) // 2
        if v % k:
            return False
        return (u - (v // k) * B) % A == 0

    def divides(self, other: QuadraticIdeal) -> bool:
        """True when ``other ⊆ self`` (for invertible ideals: ``self | other``)."""
        return all(x in self for x in other.basis)

    def __eq__(self, other: object) -> bool:
        if isinstance(other, QuadraticIdeal):
            return (self._D, self._k, self._a, self._b) == (other._D, other._k, other._a, other._b)
        return NotImplemented

    def __hash__(self) -> int:
        return hash(("QuadraticIdeal", self._D, self._k, self._a, self._b))

    # -- output -------------------------------------------------------------------------------------
    def text(self) -> str:
        """The Z-basis written with ``√m``: ``'[2, 1 + √-5]'``."""
        x, y = self.basis
        return f"[{x.text()}, {y.text()}]"

    def to_dict(self) -> dict:
        """JSON-ready: ``discriminant``, ``content``, ``a``, ``b``, ``norm``, ``basis`` (text), ``form``."""
        return {
            "discriminant": self._D,
            "content": self._k,
            "a": self._a,
            "b": self._b,
            "norm": self.norm,
            "basis": self.text(),
            "form": self.form.to_list(),
        }

    def __repr__(self) -> str:
        return f"QuadraticIdeal(D={self._D}, {self.text()})"

    def _repr_latex_(self) -> str:
        x, y = self.basis
        return rf"$\left[{x._repr_latex_()[1:-1]},\ {y._repr_latex_()[1:-1]}\right]$"

    def _repr_html_(self) -> str:
        return (
            f"ideal {html.escape(self.text())} of {html.escape(self.order.ring_text)}: norm {self.norm}, "
            f"form ({self.form.a}, {self.form.b}, {self.form.c})"
        )


# -- constructors ------------------------------------------------------------------------------------
def ideal_from_generators(D: object, generators: Iterable[object]) -> QuadraticIdeal:
    """The ideal of the order of discriminant ``D`` generated by the given elements.

    Elements may be :class:`QuadraticNumber` values, integers or text (``'1 + √-5'``).

    Raises
    ------
    NotInOrderError
        If a generator is not in the order.
    NotInvertibleIdealError
        If the ideal is zero or not invertible.

    Examples
    --------
    >>> ideal_from_generators(-20, ["2", "1 + √-5"])       # [2, 1 + √−5] = [2, −1 + √−5]
    QuadraticIdeal(D=-20, [2, -1 + √-5])
    >>> ideal_from_generators(-12, ["2", "1 + √-3"])
    Traceback (most recent call last):
    ...
    formkit.errors.NotInvertibleIdealError: the ideal [2, -1 + √-3] of Z[√-3] (discriminant -12) is not invertible: gcd(a, b, c) = gcd(2, 2, 2) = 2 > 1, so its ring of multipliers is the larger order of discriminant -3, not Z[√-3]
    """
    D = validate_discriminant(D)
    order = Order(D)
    omega = QuadraticNumber(D, D, 1)
    vectors = []
    for i, g in enumerate(generators):
        x = order.element(g, f"generator {i + 1}") if not isinstance(g, QuadraticNumber) else g
        if x.discriminant != D or not x.in_order():
            x = order.element(x, f"generator {i + 1}")
        vectors += [_uv(x), _uv(x * omega)]
    if not vectors:
        raise NotInvertibleIdealError("an ideal needs at least one generator (the empty set generates 0)")
    A, B, C = _hnf(vectors)
    if A == 0 or C == 0:
        raise NotInvertibleIdealError("the generators generate the zero ideal, which is not invertible")
    return QuadraticIdeal._from_hnf(D, A, B, C)


def parse_ideal(D: object, text: object, name: str = "ideal") -> QuadraticIdeal:
    """The ideal written as generators, ``'(2, 1 + √-5)'`` or ``'[2, 1+sqrt(-5)]'`` (or one element).

    Each generator is read by :meth:`formkit.core.quadratic_orders.Order.element` (by
    hand, never evaluated) and must lie in the order.

    Examples
    --------
    >>> parse_ideal(-20, "(3, 1 + sqrt(-5))").norm, parse_ideal(-20, "1+√-5").norm
    (3, 6)
    """
    from .parse import MAX_TEXT

    D = validate_discriminant(D)
    if isinstance(text, QuadraticIdeal):
        return text
    if not isinstance(text, str):
        return principal_ideal(D, text)
    if len(text) > MAX_TEXT:
        raise FormkitError(f"{name} is too long ({len(text)} characters, at most {MAX_TEXT})")
    t = text.strip()
    if len(t) >= 2 and (t[0], t[-1]) in (("(", ")"), ("[", "]")):
        inner = t[1:-1]
        depth, ok = 0, True
        for ch in inner:  # '(1+√5)/(2)' is one element, not a list in parentheses
            depth += {"(": 1, ")": -1}.get(ch, 0)
            if depth < 0:
                ok = False
                break
        if ok and depth == 0:
            t = inner
    parts, depth, start = [], 0, 0
    for i, ch in enumerate(t):
        depth += {"(": 1, ")": -1}.get(ch, 0)
        if ch == "," and depth == 0:
            parts.append(t[start:i])
            start = i + 1
    parts.append(t[start:])
    if any(not p.strip() for p in parts):
        raise FormkitError(
            f"{name}: cannot read {text!r}: write generators separated by commas, as in (2, 1 + √-5)"
        )
    order = Order(D)
    return ideal_from_generators(D, [order.element(p, f"{name} generator {p.strip()!r}") for p in parts])


def principal_ideal(D: object, element: object) -> QuadraticIdeal:
    """The principal ideal ``(α)`` of an element ``α ≠ 0`` of the order of discriminant ``D``.

    Examples
    --------
    >>> principal_ideal(-20, "1 + √-5").norm, principal_ideal(5, "(1+√5)/2").is_unit_ideal()
    (6, True)
    """
    D = validate_discriminant(D)
    x = Order(D).element(element) if not isinstance(element, QuadraticNumber) else element
    if x.discriminant != D or not x.in_order():
        x = Order(D).element(x)
    if x == 0:
        raise NotInvertibleIdealError("(0) is the zero ideal, which is not invertible")
    return ideal_from_generators(D, [x])


def ideal_from_form(form: FormLike) -> QuadraticIdeal:
    """The ideal of a primitive form (the dictionary of the module docstring).

    ``(a, b, c) ↦ [a, (−b + √D)/2]`` for ``a > 0``; for ``D > 0`` and ``a < 0`` the ideal
    ``√D·[|a|, (−b + √D)/2]``, in the narrow class that corresponds to the proper class
    of the form.  Negative definite forms are refused.

    Examples
    --------
    >>> ideal_from_form((2, 1, 3))
    QuadraticIdeal(D=-23, [2, (-1 + √-23)/2])
    >>> I = ideal_from_form((-1, 18, 13)); I.norm, ideal_from_form((-1, 18, 13)).form
    (376, Form(94, 0, -1))
    """
    Q = as_form(form)
    D = validate_discriminant(Q.discriminant, "discriminant of the form")
    if not Q.is_primitive:
        raise FormError(f"{Q!r} is not primitive (content {Q.content}); ideals correspond to primitive forms")
    if Q.a > 0:
        return QuadraticIdeal(D, Q.a, Q.b)
    if D < 0:
        raise FormError(
            f"{Q!r} is negative definite; ideals of imaginary orders correspond to positive definite forms"
        )
    if Q.a == 0:  # pragma: no cover - a = 0 only for square D, refused above
        raise FormError(f"{Q!r} has a = 0")
    return principal_ideal(D, QuadraticNumber(D, 0, 2)) * QuadraticIdeal(D, -Q.a, Q.b)


def form_from_ideal(ideal: QuadraticIdeal) -> Form:
    """The primitive form ``N(xα − yβ)/N(I)`` of an ideal (its oriented HNF basis ``α, β``)."""
    if not isinstance(ideal, QuadraticIdeal):
        raise FormkitError(f"form_from_ideal needs a QuadraticIdeal, not {ideal!r}")
    return ideal.form


# -- prime ideals ---------------------------------------------------------------------------------------
class PrimeIdeals:
    """The prime ideals of an order above a rational prime ``p``, with the splitting type.

    ``splitting`` is ``'split'`` (``pO = P·P̄``, ``P ≠ P̄``), ``'ramified'`` (``pO = P²``),
    ``'inert'`` (``pO`` prime, of norm ``p²``) or ``'conductor'`` (``p | f``: the prime of
    ``O`` above ``p`` is not invertible, and ``ideals`` is empty).
    """

    __slots__ = ("discriminant", "exponents", "ideals", "p", "residue_degrees", "splitting")

    def __init__(self, D, p, splitting, ideals, exponents, degrees) -> None:
        self.discriminant, self.p, self.splitting = D, p, splitting
        self.ideals: tuple[QuadraticIdeal, ...] = tuple(ideals)
        self.exponents: tuple[int, ...] = tuple(exponents)
        self.residue_degrees: tuple[int, ...] = tuple(degrees)

    @property
    def prime_forms(self) -> list[Form]:
        """The forms of the prime ideals (the prime forms ``(p, ±b, c)``; ``(1, ·, ·)``·p for inert p)."""
        return [P.form for P in self.ideals]

    def statement(self) -> str:
        """One sentence on how ``p`` decomposes."""
        p, ring = self.p, Order(self.discriminant).ring_text
        if self.splitting == "conductor":
            return (
                f"{p} divides the conductor {discriminant_parts(self.discriminant)[1]} of {ring}: the prime ideal "
                f"of {ring} above {p} is not invertible (no prime form is primitive), and ideals of norm "
                f"divisible by {p} have no factorisation into invertible prime ideals"
            )
        names = " · ".join(P.text() + (f"^{e}" if e > 1 else "") for P, e in zip(self.ideals, self.exponents))
        what = {"split": "splits", "ramified": "ramifies", "inert": "is inert"}[self.splitting]
        return f"{p} {what} in {ring}: {p}·O = {names}"

    def to_dict(self) -> dict:
        """JSON-ready."""
        return {
            "discriminant": self.discriminant,
            "p": self.p,
            "splitting": self.splitting,
            "kronecker_symbol": kronecker(self.discriminant, self.p),
            "ideals": [P.to_dict() for P in self.ideals],
            "exponents": list(self.exponents),
            "residue_degrees": list(self.residue_degrees),
            "prime_forms": [f.to_list() for f in self.prime_forms],
            "statement": self.statement(),
        }

    def __repr__(self) -> str:
        return f"PrimeIdeals(D={self.discriminant}, p={self.p}: {self.statement()})"

    def _repr_html_(self) -> str:
        return html.escape(self.statement())

    def _repr_latex_(self) -> str:
        return _latex_text(self.statement())


def prime_ideals_above(D: object, p: object) -> PrimeIdeals:
    """The prime ideals of the order of discriminant ``D`` above the prime ``p``.

    ``χ_D(p) = 1``: split, ``P = [p, (−b + √D)/2]`` with ``b² ≡ D (mod 4p)`` and ``P̄``;
    ``χ_D(p) = 0`` and ``p ∤ f``: ramified, ``P² = (p)``; ``χ_D(p) = −1``: inert (Cox,
    Proposition 5.16 for the maximal order, and Proposition 7.20 for ``p ∤ f``).

    Examples
    --------
    >>> prime_ideals_above(-20, 3).statement()
    '3 splits in Z[√-5]: 3·O = [3, -1 + √-5] · [3, 1 + √-5]'
    >>> prime_ideals_above(-12, 2).splitting, prime_ideals_above(-20, 11).splitting
    ('conductor', 'inert')
    """
    D = validate_discriminant(D)
    p = as_int(p, "p")
    if p < 2 or not is_probable_prime(p):
        raise NotPrimeError(f"prime ideals lie above a prime p, not {p}")
    _d_K, f = discriminant_parts(D)
    if f % p == 0:
        return PrimeIdeals(D, p, "conductor", (), (), ())
    chi = kronecker(D, p)
    if chi == -1:
        return PrimeIdeals(D, p, "inert", (QuadraticIdeal(D, 1, D % 2, p),), (1,), (2,))
    P = QuadraticIdeal(D, p, Form.prime_form(D, p).b)
    if chi == 0:
        return PrimeIdeals(D, p, "ramified", (P,), (2,), (1,))
    return PrimeIdeals(D, p, "split", (P, P.conjugate()), (1, 1), (1, 1))


# -- factorisation --------------------------------------------------------------------------------------
class IdealFactorization:
    """``I = ∏ P_i^{e_i}`` into invertible prime ideals (ideals prime to the conductor)."""

    __slots__ = ("factors", "ideal")

    def __init__(self, ideal: QuadraticIdeal, factors) -> None:
        self.ideal = ideal
        self.factors: tuple[tuple[int, QuadraticIdeal, int], ...] = tuple(factors)  # (p, P, e)

    def product(self) -> QuadraticIdeal:
        """``∏ P_i^{e_i}`` recomputed (equals :attr:`ideal`)."""
        out = principal_ideal(self.ideal.discriminant, 1)
        for _p, P, e in self.factors:
            out = out * P**e
        return out

    def text(self) -> str:
        """``'[2, -1 + √-5]^2 · [3, 1 + √-5]'`` (``'(1)'`` for the unit ideal)."""
        return " · ".join(P.text() + (f"^{e}" if e > 1 else "") for _p, P, e in self.factors) or "(1)"

    def to_dict(self) -> dict:
        """JSON-ready: the ideal and its factors ``{p, ideal, exponent, splitting}``."""
        D = self.ideal.discriminant
        return {
            "ideal": self.ideal.to_dict(),
            "factors": [
                {"p": p, "ideal": P.to_dict(), "exponent": e, "splitting": prime_ideals_above(D, p).splitting}
                for p, P, e in self.factors
            ],
            "text": self.text(),
        }

    def __repr__(self) -> str:
        return f"IdealFactorization({self.ideal.text()} = {self.text()})"

    def _repr_html_(self) -> str:
        return (
            html.escape(f"{self.ideal.text()} = {self.text()}")
            + "<br><small>verified by multiplying back</small>"
        )

    def _repr_latex_(self) -> str:
        if not self.factors:
            return "$" + self.ideal._repr_latex_().strip("$") + r" = (1)$"
        parts = [P._repr_latex_().strip("$") + (f"^{{{e}}}" if e > 1 else "") for _p, P, e in self.factors]
        return "$" + self.ideal._repr_latex_().strip("$") + " = " + r" \cdot ".join(parts) + "$"


def factor_ideal(ideal: QuadraticIdeal) -> IdealFactorization:
    """Factor an invertible ideal prime to the conductor into prime ideals (verified by multiplying back).

    Raises
    ------
    FormkitError
        If the norm shares a prime with the conductor (no factorisation into invertible
        prime ideals exists there).

    Examples
    --------
    >>> factor_ideal(principal_ideal(-20, 6)).text()
    '[2, -1 + √-5]^2 · [3, 1 + √-5] · [3, -1 + √-5]'
    """
    if not isinstance(ideal, QuadraticIdeal):
        raise FormkitError(f"factor_ideal needs a QuadraticIdeal, not {ideal!r}")
    D = ideal.discriminant
    _d_K, f = discriminant_parts(D)
    k, a, b = ideal.coefficients
    bad = gcd(ideal.norm, f)
    if bad != 1:
        p = min(prime_factorisation(bad))
        raise FormkitError(
            f"{ideal.text()} has norm {ideal.norm}, divisible by {p}, which divides the conductor {f} of "
            f"{Order(D).ring_text}: there ideals have no factorisation into invertible prime ideals; "
            "factorisation is offered for ideals prime to the conductor"
        )
    exps: dict[tuple[int, QuadraticIdeal], int] = {}
    for p, e in prime_factorisation(k).items():
        dec = prime_ideals_above(D, p)
        for P, ep in zip(dec.ideals, dec.exponents):
            exps[(p, P)] = exps.get((p, P), 0) + e * ep
    for p, e in prime_factorisation(a).items():
        P = QuadraticIdeal(D, p, b)  # the prime above p containing (−b + √D)/2
        exps[(p, P)] = exps.get((p, P), 0) + e
    factors = sorted(((p, P, e) for (p, P), e in exps.items()), key=lambda t: (t[0], t[1].coefficients))
    result = IdealFactorization(ideal, factors)
    if result.product() != ideal:  # pragma: no cover - the verification step
        raise ArithmeticError(f"factorisation of {ideal!r} does not multiply back: {result.text()}")
    return result


def factor_element(D: object, element: object) -> IdealFactorization:
    """Factor the principal ideal ``(α)`` of an element of the order into prime ideals.

    Examples
    --------
    >>> factor_element(-20, "1 + √-5").text()
    '[2, -1 + √-5] · [3, 1 + √-5]'
    """
    return factor_ideal(principal_ideal(D, element))
