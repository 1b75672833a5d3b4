"""Deciding whether a form represents a prime, fast: reduction of (p, b, ·) and Cornacchia.

*The reduction test.*  A primitive form ``Q`` of discriminant ``D`` represents the
prime ``p`` exactly when ``χ_D(p) ≠ −1`` and one of the forms ``(p, ±b, (b² − D)/4p)``
with ``b² ≡ D (mod 4p)`` is properly equivalent to ``Q`` — the second one belongs to the
inverse class ``Q⁻¹`` (Cox, *Primes of the Form x² + ny²*, Lemma 2.5 and Theorem 2.8
for ``D < 0``; the same square-root correspondence as in :mod:`formkit.representation.representations`).
One square root modulo ``p`` (Tonelli–Shanks) and one reduction (a logarithmic number of
steps) decide it, with the equivalence matrix giving ``(x, y)``; for ``D > 0`` the reduced
form is looked up in the cycle of ``Q``.  Primes of hundreds of digits take milliseconds.

*Cornacchia's algorithm* solves ``x² + n y² = p`` (Cohen, GTM 138, Algorithm 1.5.2)
and ``x² + |D| y² = 4p`` (Algorithm 1.5.3, the modified version) by one square root and
a Euclidean algorithm stopped at ``√p``; it is the fast path for the forms
``x² + ny²`` and ``x² + xy + ((1 − D)/4) y²`` and an independent cross-check of the
reduction test.

Numbers that are not (probable) primes are never rejected: they are passed to the
general square-root method of :mod:`formkit.representation.representations`.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, Algorithms 1.5.1–1.5.3.
.. [2] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §2.
.. [3] G. Cornacchia, *Su di un metodo per la risoluzione in numeri interi
       dell'equazione Σ C_h x^{n−h} y^h = P*, Giornale di Matematiche 46 (1908).
"""

from __future__ import annotations

from dataclasses import dataclass

from ..core.arith import as_int, is_probable_prime, is_square, isqrt, kronecker, mpz
from ..core.displays import SentenceDisplay
from ..core.equivalence import proper_equivalence
from ..core.forms import Form, FormLike, _require_nonsquare, as_form, mat_inverse, mat_mul
from ..core.modular_roots import _sqrt_mod_prime
from ..core.reduction import _reduce_definite
from ..errors import FormkitError, NotPrimeError

__all__ = [
    "RepresentationDecision",
    "cornacchia",
    "cornacchia_4p",
    "prime_representation",
]

Vector = tuple[int, int]


def cornacchia(n: object, p: object) -> Vector | None:
    """Solve ``x² + n y² = p`` for a prime ``p`` and ``n ≥ 1`` by Cornacchia's algorithm.

    Cohen, GTM 138, Algorithm 1.5.2: take ``x₀² ≡ −n (mod p)``, run the Euclidean
    algorithm on ``(p, x₀)`` until the remainder drops below ``√p``; that remainder is
    ``x`` if ``(p − x²)/n`` is a square ``y²``.  Returns ``(x, y)`` with ``x, y ≥ 0`` or
    ``None`` when there is no solution.

    Raises
    ------
    NotPrimeError
        If ``p`` is not a (probable) prime.
    FormkitError
        If ``n < 1``.

    Examples
    --------
    >>> cornacchia(1, 13), cornacchia(2, 11), cornacchia(5, 29), cornacchia(5, 7)
    ((3, 2), (3, 1), (3, 2), None)
    >>> p = 10**100 + 949                     # a prime ≡ 1 (mod 4)
    >>> x, y = cornacchia(1, p)
    >>> x * x + y * y == p
    True
    """
    n = as_int(n, "n")
    p = as_int(p, "p")
    if n < 1:
        raise FormkitError(f"Cornacchia's algorithm solves x² + n·y² = p for n ≥ 1, not n = {n}")
    if not is_probable_prime(p):
        raise NotPrimeError(f"Cornacchia's algorithm needs a prime p, not {p}")
    return _cornacchia(n, p)


def _cornacchia(n: int, p: int) -> Vector | None:
    if n >= p:
        return (0, 1) if n == p else None
    if p == 2:
        return (1, 1) if n == 1 else None
    if kronecker(-n, p) == -1:
        return None
    x0 = int(_sqrt_mod_prime(mpz(-n) % p, mpz(p)))
    if 2 * x0 < p:
        x0 = p - x0
    a, b = mpz(p), mpz(x0)
    bound = isqrt(p)
    while b > bound:
        a, b = b, a % b
    rest = p - b * b
    if rest % n:
        return None
    c = rest // n
    if not is_square(c):
        return None
    return int(b), int(isqrt(c))


def cornacchia_4p(D: object, p: object) -> Vector | None:
    """Solve ``x² + |D| y² = 4p`` for a prime ``p`` and a discriminant ``D < 0``.

    The modified Cornacchia algorithm (Cohen, GTM 138, Algorithm 1.5.3): ``x₀² ≡ D
    (mod p)`` with ``x₀ ≡ D (mod 2)``, Euclid on ``(2p, x₀)`` until the remainder is below
    ``2√p``.  Then ``x² + xy + ((1 − D)/4)y² = p`` (odd ``D``) corresponds to
    ``((2x + y)² + |D|y²) = 4p``.  Returns ``(x, y)`` with ``x, y ≥ 0`` or ``None``.

    Raises
    ------
    NotPrimeError
        If ``p`` is not a (probable) prime.
    DiscriminantError
        If ``D`` is not a negative discriminant.

    Examples
    --------
    >>> cornacchia_4p(-3, 7), cornacchia_4p(-23, 59), cornacchia_4p(-23, 13)
    ((5, 1), (12, 2), None)
    """
    from ..core.discriminants import validate_discriminant
    from ..errors import DiscriminantError

    D = validate_discriminant(D)
    if D > 0:
        raise DiscriminantError(f"cornacchia_4p needs a negative discriminant, not {D}")
    p = as_int(p, "p")
    if not is_probable_prime(p):
        raise NotPrimeError(f"Cornacchia's algorithm needs a prime p, not {p}")
    return _cornacchia_4p(D, p)


def _cornacchia_4p(D: int, p: int) -> Vector | None:
    N = -D
    if p == 2:
        r = 8 + D
        if r >= 0 and is_square(r):
            return int(isqrt(r)), 1
        return None
    if 4 * p < N:
        return None
    if kronecker(D, p) == -1:
        return None
    x0 = int(_sqrt_mod_prime(mpz(D) % p, mpz(p)))
    if (x0 - D) % 2:
        x0 = p - x0
    a, b = mpz(2 * p), mpz(x0)
    bound = isqrt(4 * p)
    while b > bound:
        a, b = b, a % b
    rest = 4 * p - b * b
    if rest < 0 or rest % N:
        return None
    c = rest // N
    if not is_square(c):
        return None
    return int(b), int(isqrt(c))


@dataclass(frozen=True)
class RepresentationDecision(SentenceDisplay):
    """Whether ``form`` represents ``n``, with one solution and how it was found.

    ``method`` is ``"cornacchia"``, ``"reduction"`` (the prime test by reduction of
    ``(p, b, ·)``), ``"character"`` (``χ_D(p) = −1`` settles it) or ``"square-root method"``
    (``n`` not a probable prime, or a non-primitive form: the general method).
    ``prime`` records whether ``n`` was treated as a prime.
    """

    form: Form
    n: int
    represented: bool
    solution: Vector | None
    method: str
    prime: bool

    def _display_sentence(self) -> str:
        return repr(self)

    def _display_provenance(self) -> str:
        return "exact"

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return {
            "form": self.form.to_list(),
            "n": self.n,
            "represented": self.represented,
            "solution": list(self.solution) if self.solution else None,
            "method": self.method,
            "prime": self.prime,
        }


def _roots_mod_4p(D: int, p: int) -> list[int]:
    """The ``b`` in ``[0, 2p)`` with ``b² ≡ D (mod 4p)`` (p prime, χ_D(p) ≠ −1)."""
    if p == 2:
        return [b for b in range(4) if (b * b - D) % 8 == 0]
    if D % p == 0:
        return [0 if D % 2 == 0 else p]
    r = int(_sqrt_mod_prime(mpz(D) % p, mpz(p)))
    b = r if (r - D) % 2 == 0 else p - r
    return [b, 2 * p - b]


def _general(Q: Form, n: int, prime: bool) -> RepresentationDecision:
    from .representations import represent

    res = represent(Q, n, limit=1)
    sol = res.solutions[0] if res.solutions else (res.orbits[0] if res.orbits else None)
    return RepresentationDecision(Q, n, sol is not None, sol, "square-root method", prime)


def prime_representation(
    form: FormLike, p: object, *, method: str = "auto", assume_prime: bool = False
) -> RepresentationDecision:
    """Decide whether ``Q`` represents the prime ``p`` and give ``(x, y)`` with ``Q(x, y) = p``.

    The path: ``χ_D(p)``; one root ``b`` of ``b² ≡ D (mod 4p)``; reduce ``(p, b, ·)`` and
    ``(p, −b, ·)`` and compare with ``Q`` (that is, with ``Q`` and ``Q⁻¹``); the reduction
    matrix gives ``(x, y)``.  For ``x² + ny²`` and the principal form of odd ``D < 0``,
    ``method="auto"`` uses Cornacchia's algorithm instead.

    Parameters
    ----------
    form : FormLike
        A form of non-square discriminant, definite or indefinite.
    p : int
        The number to test; if it is not a probable prime (or the form is not primitive
        and positive-or-indefinite) the general method of
        :func:`formkit.representation.representations.represent` answers instead — never a silent "no".
    method : {"auto", "reduction", "cornacchia"}
        ``"cornacchia"`` needs ``Q = x² + ny²`` or ``x² + xy + ky²`` (definite).
    assume_prime : bool
        Skip the probable-prime test (about 70 ms for a 1000-digit number) when the
        caller knows ``p`` is prime.

    Returns
    -------
    RepresentationDecision

    Raises
    ------
    FormkitError
        For an unknown ``method`` or ``"cornacchia"`` on a form it does not cover.
    DiscriminantError
        If the discriminant is a square.

    Examples
    --------
    >>> prime_representation((1, 0, 5), 29)
    RepresentationDecision(form=Form(1, 0, 5), n=29, represented=True, solution=(3, 2), method='cornacchia', prime=True)
    >>> d = prime_representation((2, 2, 3), 23)
    >>> d.represented, Form(2, 2, 3)(*d.solution), d.method
    (True, 23, 'reduction')
    >>> prime_representation((1, 0, 5), 7).represented
    False
    >>> prime_representation((1, 0, 5), 49).method       # 49 is not prime: general method
    'square-root method'
    """
    Q = as_form(form)
    D = _require_nonsquare(Q, "representing a prime")
    n = as_int(p, "p")
    if method not in ("auto", "reduction", "cornacchia"):
        raise FormkitError(f"method must be 'auto', 'reduction' or 'cornacchia', not {method!r}")
    is_prime = n >= 2 and (assume_prime or is_probable_prime(n))
    principal_kind = D < 0 and Q.a == 1 and Q.b in (0, 1) and Q.c >= 1
    if method == "cornacchia" and not principal_kind:
        raise FormkitError(f"Cornacchia's algorithm covers x² + ny² and x² + xy + ky² (n, k ≥ 1), not {Q!r}")
    if not is_prime or not Q.is_primitive or (D < 0 and Q.a < 0):
        if method == "cornacchia" and not is_prime:
            raise NotPrimeError(f"Cornacchia's algorithm needs a prime, and {n} is not one")
        return _general(Q, n, is_prime)
    if kronecker(D, n) == -1:
        return RepresentationDecision(Q, n, False, None, "character", True)
    if principal_kind and method in ("auto", "cornacchia"):
        if Q.b == 0:
            sol = _cornacchia(Q.c, n)
        else:
            sol4 = _cornacchia_4p(D, n)
            sol = None if sol4 is None else ((sol4[0] - sol4[1]) // 2, sol4[1])
        if sol is not None and Q(*sol) != n:  # pragma: no cover - internal consistency
            raise ArithmeticError(f"Cornacchia produced {sol} with Q(x, y) = {Q(*sol)} ≠ {n}")
        return RepresentationDecision(Q, n, sol is not None, sol, "cornacchia", True)
    sol = _reduction_test(Q, D, n)
    return RepresentationDecision(Q, n, sol is not None, sol, "reduction", True)


def _reduction_test(Q: Form, D: int, p: int) -> Vector | None:
    if D < 0:
        rq = _reduce_definite(Q, False)
        for b in _roots_mod_4p(D, p):
            F = Form(p, b, (b * b - D) // (4 * p))
            rf = _reduce_definite(F, False)
            if rf.reduced == rq.reduced:
                T = mat_mul(rq.matrix, mat_inverse(rf.matrix))
                return _checked(Q, (T[0][0], T[1][0]), p)
        return None
    for b in _roots_mod_4p(D, p):
        F = Form(p, b, (b * b - D) // (4 * p))
        M = proper_equivalence(Q, F)
        if M is not None:
            return _checked(Q, (M[0][0], M[1][0]), p)
    return None


def _checked(Q: Form, v: Vector, p: int) -> Vector:
    if Q(*v) != p:  # pragma: no cover - internal consistency
        raise ArithmeticError(f"internal error: {Q!r} at {v} is {Q(*v)}, not {p}")
    return v
