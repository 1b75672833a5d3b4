"""Class polynomials of double η-quotients ``w_{p₁,p₂}`` (Enge–Schertz), certified.

For distinct primes ``p₁, p₂`` (odd, or ``p₁ = 2``, see *The prime 2* below) and ``N = p₁p₂``
the double η-quotient

    w_{p₁,p₂}(z) = η(z/p₁)·η(z/p₂) / (η(z)·η(z/N))

gives class invariants for the discriminants ``D`` in which neither ``p₁`` nor ``p₂`` is
inert (and neither divides the conductor; we also ask that not both ramify — for
``D = −455`` and ``w_{5,7}`` the polynomial we got is reducible, the Atkin–Lehner
involution at ``N`` then acting on the values; Enge–Schertz treat that case apart): with ``s = 24/gcd(24, (p₁ − 1)(p₂ − 1))``, a
square root ``B₀`` of ``D`` modulo ``4N`` and an *N-system* — one form ``[A, B, C]`` per
class with ``gcd(A, N) = 1`` and ``B ≡ B₀ (mod 2N)`` (hence ``N | C``) — the numbers
``w_{p₁,p₂}(τ)^s``, ``τ = (−B + √D)/(2A)``, are the conjugates over ``Q(√D)`` of a
generator of the ring class field of the order of discriminant ``D``, and their
polynomial has integer coefficients (Enge–Schertz [1], Theorem; Schertz [2] for
N-systems; as recalled).  The conditions as we recall them are not quite sufficient: for
``D = −160`` with ``(7, 13)`` and ``D = −595`` with ``(5, 13)`` the values coincide in
pairs and the polynomial is a square (among the 1014 pairs ``(D, (p₁, p₂))`` with
``−1200 < D < 0`` and the first six pairs of the list, these three; the other 1011 gave
polynomials irreducible of degree ``h(D)``, by sympy's factorisation).  So every
polynomial is tested for squarefreeness over ``Z`` (exact), and a pair that fails it is
refused (the default choice moves on to the next pair).  Asymptotically its coefficients are
``12(p₁ + 1)(p₂ + 1)/(s(p₁ − 1)(p₂ − 1))`` times shorter than those of ``H_D`` (Enge–Morain
[3]; 28 for ``w_{3,13}``, 24 for ``w_{5,7}``): :func:`double_eta_pair` picks the pair of
largest gain among a short list.

*What is computed.*  The values in ball arithmetic (python-flint's ``acb.modular_eta``),
the product ``∏(x − x_Q)`` of complex linear factors by a product tree, and the integer
polynomial, accepted only when every coefficient ball has imaginary part containing 0
and real part containing exactly one integer (so, given the theorem that the
coefficients are rational integers, the rounding is proved right; otherwise the
precision is raised).  *Checks* (on by default): the root counts modulo split primes
against the prime-form classes, as for ``H_D`` — they test that the roots generate the
ring class field.

*The prime 2.*  With ``p₁ = 2`` and ``p₂ ∈ {3, 5, 7, 13}`` (``s = 12, 6, 4, 2``; gains 6, 9,
12, 21) the same construction is offered when the pair is asked for (not in the default
list): the conditions are the same — 2 not inert (``D ≡ 1 mod 8``, or ``D`` even) and prime
to the conductor, ``p₂`` not inert and prime to the conductor, not both ramified.  We
recall Enge–Schertz's theorem as stated for all primes, 2 included, but have not re-read
that case, so it rests on our recollection and on experiment: for every discriminant
``−1500 < D < 0`` that suits one of the four pairs (167 to 185 per pair) the coefficient
balls held integers at ``300 + 3h`` bits and the polynomial was squarefree and irreducible
of degree ``h(D)`` (sympy), and for ``−800 < D < 0`` the step to ``j`` below gave exactly the
roots of ``H_D`` modulo two split primes each (a one-off run; the test suite repeats a dozen
of these cases).

*The step to* ``j``.  The modular polynomial ``Ψ(X, J)`` with ``Ψ(w^s, j) = 0``, of degree
``(p₁ + 1)(p₂ + 1)`` in ``X`` and ``2e = s(p₁ − 1)(p₂ − 1)/12`` in ``J``, is computed exactly
by :mod:`~formkit.representation.double_eta_modular` for the ten pairs of the list and the
four with ``p₁ = 2``.  For the eight pairs with ``2e = 2`` (``(2, 3)``, ``(2, 5)``, ``(2, 7)``,
``(2, 13)``, ``(3, 5)``, ``(3, 7)``, ``(3, 13)``, ``(5, 7)``) both roots of
``Ψ(x, J)`` modulo ``p`` are roots of ``H_D`` for every root ``x ≢ 0`` of this polynomial,
and :func:`formkit.representation.cm_method.cm_j_invariants` (``invariant="double-eta"``)
and the command line (``--roots-mod``, ``--cm-curve``) take that step.

*What is not.*  For the pairs with ``2e > 2`` the other ``2e − 2`` roots of ``Ψ(x, J)`` need
not be CM values of discriminant ``D``, and formkit does not choose among them: the CM step
refuses those pairs.  Nor ``p₁ = 2`` with other ``p₂``, nor ``p₁ = p₂``.

References
----------
.. [1] A. Enge, R. Schertz, "Constructing elliptic curves over finite fields using double
       eta-quotients", J. Théor. Nombres Bordeaux 16 (2004), 555–568.
.. [2] R. Schertz, "Weber's class invariants revisited", J. Théor. Nombres Bordeaux 14
       (2002), 325–343.
.. [3] A. Enge, F. Morain, "Comparing invariants for class fields of imaginary quadratic
       fields", ANTS-V (2002), LNCS 2369, 252–266.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

from ..analytic.ball_polynomials import product_tree
from ..core.arith import is_probable_prime, kronecker
from ..core.discriminants import discriminant_parts
from ..core.forms import Form
from ..core.progress import announces_slowness, progress_bar
from ..errors import DiscriminantError, FormkitError
from .class_polynomials import (
    _check_negative,
    _leading_term_bits,
    _polynomial_text,
    _reduced_forms,
    _split_check,
)

__all__ = ["DoubleEtaPolynomial", "double_eta_pair", "double_eta_polynomial", "double_eta_gain"]

#: Pairs tried by :func:`double_eta_pair`, by decreasing gain (see :func:`double_eta_gain`).
_PAIRS = ((3, 13), (5, 7), (5, 13), (7, 13), (3, 7), (3, 5), (7, 11), (3, 17), (5, 11), (3, 11))

#: The pairs with ``p₁ = 2`` offered when asked for (module docstring, *The prime 2*).
_PAIRS_WITH_2 = ((2, 3), (2, 5), (2, 7), (2, 13))


def _exponent(p1: int, p2: int) -> int:
    return 24 // math.gcd(24, (p1 - 1) * (p2 - 1))


def double_eta_gain(p1: int, p2: int) -> float:
    """``12(p₁ + 1)(p₂ + 1)/(s(p₁ − 1)(p₂ − 1))``: how many times shorter than ``H_D`` (asymptotically).

    Examples
    --------
    >>> double_eta_gain(3, 13), double_eta_gain(5, 7), double_eta_gain(3, 5)
    (28.0, 24.0, 12.0)
    """
    return 12 * (p1 + 1) * (p2 + 1) / (_exponent(p1, p2) * (p1 - 1) * (p2 - 1))


def _pair_applies(D: int, p1: int, p2: int) -> bool:
    f = discriminant_parts(D)[1]
    if D % p1 == 0 and D % p2 == 0:
        return False  # both ramified: w is then fixed up to a constant by an Atkin–Lehner involution
    return all(kronecker(D, p) != -1 and f % p != 0 for p in (p1, p2))


def double_eta_pair(D: object) -> tuple[int, int]:
    """The pair ``(p₁, p₂)`` of largest gain among a short list that suits ``D``.

    Raises
    ------
    DiscriminantError
        If no pair of the list has both primes split or ramified (not both ramified) and prime
        to the conductor.

    Examples
    --------
    >>> double_eta_pair(-23), double_eta_pair(-71), double_eta_pair(-1151)   # 13 inert in Q(√−71)
    ((3, 13), (3, 5), (5, 7))
    """
    D = _check_negative(D)
    for p1, p2 in _PAIRS:
        if _pair_applies(D, p1, p2):
            return p1, p2
    raise DiscriminantError(
        f"no double eta-quotient of the list {list(_PAIRS)} suits D = {D} (both primes must be split or "
        "ramified, not both ramified, and prime to the conductor); use H_D or a Weber polynomial"
    )


def _n_system_form(a: int, b: int, c: int, D: int, N: int, B0: int) -> tuple[int, int]:
    """``(A, B)`` of a form ``[A, B, C]`` equivalent to ``(a, b, c)`` with ``gcd(A, N) = 1``,
    ``B ≡ B₀ (mod 2N)``, ``A`` small (a search over small coprime ``(x, y)``, then a translation)."""
    best: tuple[int, int] | None = None
    for r in range(1, 40):
        for y in range(r + 1):
            for x in range(-r, r + 1):
                if (max(abs(x), y) != r and r > 1) or math.gcd(x, y) != 1 or (y == 0 and x != 1):
                    continue
                A = a * x * x + b * x * y + c * y * y
                if A <= 0 or math.gcd(A, N) != 1 or (best is not None and best[0] <= A):
                    continue
                _g, s, t = _egcd(x, y)
                u, v = -t, s  # [[x, u], [y, v]] has determinant x·s + y·t = 1
                B = 2 * a * x * u + b * (x * v + y * u) + 2 * c * y * v
                k = ((B0 - B) // 2 * pow(A, -1, N)) % N  # B + 2Ak ≡ B₀ (mod 2N); B ≡ B₀ (mod 2)
                best = (A, B + 2 * A * k)
        if best is not None and r >= 3:
            return best
    if best is None:  # pragma: no cover - a primitive form represents integers prime to N
        raise RuntimeError(f"no representative with A prime to {N} found for {(a, b, c)}")
    return best


def _egcd(x: int, y: int) -> tuple[int, int, int]:
    s0, s1, t0, t1 = 1, 0, 0, 1
    while y:
        q, r = divmod(x, y)
        x, y = y, r
        s0, s1 = s1, s0 - q * s1
        t0, t1 = t1, t0 - q * t1
    return (x, s0, t0) if x >= 0 else (-x, -s0, -t0)


def _square_root_mod(D: int, N: int) -> int:
    """``B₀ ≡ D (mod 2)`` with ``B₀² ≡ D (mod 4N)``, the least such in ``[0, 2N)``."""
    for B0 in range(D % 2, 2 * N, 2):
        if (B0 * B0 - D) % (4 * N) == 0:
            return B0
    raise DiscriminantError(f"D = {D} is not a square modulo 4·{N}")  # pragma: no cover


def _double_eta_value(A: int, B: int, D: int, p1: int, p2: int, s: int) -> Any:
    from flint import acb, arb

    z = acb(arb(-B) / (2 * A), arb(-D).sqrt() / (2 * A))
    N = p1 * p2
    w = (z / p1).modular_eta() * (z / p2).modular_eta() / (z.modular_eta() * (z / N).modular_eta())
    return w**s


class _NotAGenerator(DiscriminantError):
    """The values coincide in pairs: this pair gives no generator for this ``D``."""


def _is_squarefree(coeffs: Sequence[int]) -> bool:
    """``gcd(W, W') = 1`` over ``Q`` (exact, FLINT's integer polynomial arithmetic)."""
    from flint import fmpz_poly

    W = fmpz_poly(list(reversed(coeffs)))
    return W.gcd(W.derivative()).degree() == 0


def _certified_from_complex(poly: Any) -> tuple[list[int], int] | None:
    """Integer coefficients (leading first) and log₂ of the largest real radius, when every
    ball has imaginary part ∋ 0 (radius < 1/2) and real part holding exactly one integer;
    else ``None``."""
    from flint import arb_poly

    from ..analytic.ball_polynomials import certified_integer_coefficients, largest_radius_log2

    coeffs = [poly[i] for i in range(poly.degree() + 1)]
    if not all(c.imag.contains(0) and c.imag.rad() < 0.5 for c in coeffs):
        return None
    real = arb_poly([c.real for c in coeffs])
    ints = certified_integer_coefficients(real)
    return None if ints is None else (ints, largest_radius_log2(real))


@dataclass(frozen=True)
class DoubleEtaPolynomial:
    """The class polynomial of ``w_{p₁,p₂}^s`` for ``D``, with provenance.

    Attributes
    ----------
    discriminant, p1, p2, exponent (``s``), coefficients (leading first), forms (the reduced
    forms, one per class), working_bits, radius_log2 (every real coefficient ball had radius
    below ``2^radius_log2``), primes_checked and principal_primes (root counts matched the
    prime-form classes; empty with ``verify=False``).
    """

    discriminant: int
    p1: int
    p2: int
    exponent: int
    coefficients: tuple[int, ...]
    forms: tuple[Form, ...]
    working_bits: int
    radius_log2: int
    primes_checked: tuple[int, ...]
    principal_primes: tuple[int, ...]

    @property
    def degree(self) -> int:
        return len(self.coefficients) - 1

    @property
    def invariant(self) -> str:
        """The class invariant in words."""
        s = f"^{self.exponent}" if self.exponent != 1 else ""
        return f"w_{{{self.p1},{self.p2}}}{s} = (eta(z/{self.p1}) eta(z/{self.p2}) / (eta(z) eta(z/{self.p1 * self.p2}))){s}"

    @property
    def j_relation(self) -> str:
        """How a root ``x`` gives roots of ``H_D`` (the modular polynomial ``Ψ``), in words."""
        s = f"^{self.exponent}" if self.exponent != 1 else ""
        if self.exponent * (self.p1 - 1) * (self.p2 - 1) == 24:  # deg_J Ψ = 2
            return (
                f"for every root x (x ≠ 0) the two roots J of Psi(x, J), the modular polynomial of "
                f"w_{{{self.p1},{self.p2}}}{s} and j (degree 2 in J), are roots of H_D"
            )
        return (
            f"the roots of H_D are among the roots J of Psi(x, J), the modular polynomial of "
            f"w_{{{self.p1},{self.p2}}}{s} and j, of degree > 2 in J; formkit does not "
            "choose among them (use a pair 3,5 3,7 3,13 5,7 or 2,3 2,5 2,7 2,13 for the step to j)"
        )

    def to_dict(self) -> dict:
        return {
            "discriminant": self.discriminant,
            "invariant": "double-eta",
            "invariant_value": self.invariant,
            "primes": [self.p1, self.p2],
            "power": self.exponent,
            "j_relation": self.j_relation,
            "degree": self.degree,
            "coefficient_order": "descending",
            "coefficients": list(self.coefficients),
            "kind": "Hilbert" if discriminant_parts(self.discriminant)[1] == 1 else "ring",
            "working_digits": math.floor(self.working_bits * math.log10(2)),
            "verification": None
            if not self.primes_checked
            else {
                "method": "ball arithmetic (imaginary parts contain 0, every real part holds exactly one integer)",
                "precision_bits": self.working_bits,
                "radius_log2": self.radius_log2,
                "primes_checked": list(self.primes_checked),
                "principal_primes": list(self.principal_primes),
            },
        }

    def _text(self) -> str:
        return _polynomial_text(self.coefficients)

    def __str__(self) -> str:
        return self._text()

    def __repr__(self) -> str:
        text = self._text()
        if len(text) > 80:
            text = text[:60] + " …"
        return f"DoubleEtaPolynomial(D={self.discriminant}, w_{{{self.p1},{self.p2}}}^{self.exponent}, degree={self.degree}: {text})"

    def _how(self) -> str:
        return (
            f"roots {self.invariant} at an N-system and conjugates; certified by ball arithmetic at "
            f"{self.working_bits} bits"
        )

    def _repr_html_(self) -> str:
        import html

        text = self._text()
        if len(text) > 400:
            text = text[:380] + " …"
        return f"W<sub>{self.discriminant}</sub>(x) = {html.escape(text)}<br><small>{html.escape(self._how())}</small>"

    def _repr_latex_(self) -> str:
        return f"$W_{{{self.discriminant}}}(x) = {self._text()}$ ({self._how()})"


def _ball_product(D: int, forms: Sequence[tuple[int, int, int]], prec: int, p1: int, p2: int, s: int) -> Any:
    from flint import acb_poly, ctx

    N = p1 * p2
    B0 = _square_root_mod(D, N)
    factors = []
    with (
        ctx.workprec(prec),
        progress_bar(total=len(forms), desc=f"eta quotients (D = {D})", unit="form") as bar,
    ):
        for a, b, c in forms:
            bar.update(1)
            A, B = _n_system_form(a, b, c, D, N, B0)
            factors.append(acb_poly([-_double_eta_value(A, B, D, p1, p2, s), 1]))
        return product_tree(factors)


@lru_cache(maxsize=16)
def _double_eta_polynomial(D: int, p1: int, p2: int, verify: bool) -> DoubleEtaPolynomial:
    forms = _reduced_forms(D)
    h = len(forms)
    s = _exponent(p1, p2)
    # Σ π√|D|/(a ln 2) / gain bits, the asymptotic size, with room (measured: at h = 1000 the
    # largest coefficient ball had radius 2^−659 at this precision); raised if the certificate fails
    prec = math.ceil(1.05 * _leading_term_bits(D, forms) / double_eta_gain(p1, p2)) + h // 4 + 64
    for _attempt in range(8):
        found = _certified_from_complex(_ball_product(D, forms, prec, p1, p2, s))
        if found is not None:
            coeffs, radius = found
            break
        prec += prec // 2 + 64
    else:  # pragma: no cover - would mean the invariant does not apply
        raise RuntimeError(f"double eta-quotient polynomial of D = {D}: no integer polynomial at {prec} bits")
    if h > 1 and not _is_squarefree(coeffs):
        raise _NotAGenerator(
            f"for D = {D} the values of w_{{{p1},{p2}}}{'' if s == 1 else f'^{s}'} at an N-system repeat "
            "(their polynomial has repeated roots, so they do not generate the ring class field); "
            "choose another pair"
        )
    primes: list[int] = []
    principal: list[int] = []
    if verify:
        primes, principal = _split_check(D, coeffs, forms)
        if len(primes) < 6:  # pragma: no cover - the polynomial is squarefree mod almost every p
            raise RuntimeError(
                f"double eta-quotient polynomial of D = {D}: only {len(primes)} primes to check"
            )
    return DoubleEtaPolynomial(
        D,
        p1,
        p2,
        s,
        tuple(coeffs),
        tuple(Form(*f) for f in forms),
        prec,
        radius,
        tuple(primes),
        tuple(principal),
    )


@announces_slowness(lambda D, **k: f"the double eta-quotient class polynomial of discriminant {D}")
def double_eta_polynomial(
    D: object, primes: tuple[int, int] | None = None, *, verify: bool = True
) -> DoubleEtaPolynomial:
    """The class polynomial of the double η-quotient ``w_{p₁,p₂}^s`` for ``D`` (module docstring).

    Parameters
    ----------
    D : int
        A negative discriminant.
    primes : (int, int), optional
        Distinct primes ``p₁ < p₂`` (odd, or ``(2, p₂)`` with ``p₂ ∈ {3, 5, 7, 13}``), neither
        inert in ``Q(√D)`` nor dividing the conductor,
        not both ramified; default: the first pair of :func:`double_eta_pair`'s list that suits
        ``D`` and gives a squarefree polynomial.
    verify : bool
        Check root counts modulo split primes (default ``True``).

    Returns
    -------
    DoubleEtaPolynomial

    Raises
    ------
    DiscriminantError
        If the pair does not suit ``D``, or its values repeat (the polynomial, exact, has a
        repeated root: it happens, e.g. ``D = −160`` with ``(7, 13)``); FormkitError if it is
        not two distinct primes, or 2 with another ``p₂``.

    Examples
    --------
    >>> P = double_eta_polynomial(-71)      # w_{3,5}³: h(−71) = 7
    >>> P.p1, P.p2, P.exponent, P.degree
    (3, 5, 3, 7)
    >>> double_eta_polynomial(-23).coefficients    # w_{3,13}
    (1, -1, 0, 1)

    References
    ----------
    Enge–Schertz, JTNB 16 (2004); Enge–Morain, ANTS-V (2002).
    """
    D = _check_negative(D)
    if primes is None:
        for p1, p2 in _PAIRS:
            if _pair_applies(D, p1, p2):
                try:
                    return _double_eta_polynomial(D, p1, p2, bool(verify))
                except _NotAGenerator:
                    continue
        double_eta_pair(D)  # raises: no pair suits D
        raise DiscriminantError(f"no pair of the list {list(_PAIRS)} gives a generator for D = {D}")
    else:
        p1, p2 = sorted(int(p) for p in primes)
        if p1 == p2 or not (is_probable_prime(p1) and is_probable_prime(p2)):
            raise FormkitError(f"primes must be two distinct primes, not {primes}")
        if p1 == 2 and (p1, p2) not in _PAIRS_WITH_2:
            raise FormkitError(
                f"with the prime 2 only the pairs {', '.join(f'({a}, {b})' for a, b in _PAIRS_WITH_2)} "
                f"are offered (tested), not {(p1, p2)}"
            )
        if not _pair_applies(D, p1, p2):
            raise DiscriminantError(
                f"w_{{{p1},{p2}}} needs both primes split or ramified (not both ramified) in Q(sqrt({D})) "
                f"and prime to the conductor; {p1}, {p2} do not qualify"
            )
    return _double_eta_polynomial(D, p1, p2, bool(verify))
