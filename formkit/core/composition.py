"""Composition of primitive forms: Dirichlet–Arndt composition, Shanks' NUCOMP and NUDUPL.

*Dirichlet (Arndt) composition* of two primitive forms ``(a1, b1, c1)``,
``(a2, b2, c2)`` of the same discriminant, with leading coefficients not necessarily
coprime, follows Cohen GTM 138, Algorithm 5.4.7: two extended-Euclid steps give
``d1 = gcd(a1, a2, (b1 + b2)/2)`` and ``r mod v1`` with ``v1 = a1/d1``, ``v2 = a2/d1``;
the composite is ``(v1·v2, b2 + 2·v2·r, ·)``, then reduced.

*NUCOMP* (Shanks 1989; Jacobson–van der Poorten, "Computational aspects of NUCOMP",
ANTS V, 2002; Cohen GTM 138 Algorithm 5.4.9) avoids the full-size intermediate form:
the reduction of ``(v1·v2, b2 + 2·v2·r, ·)`` is, up to its last few steps, the
continued-fraction expansion of ``r/v1``.  We run that expansion (a partial extended
Euclid on numbers of size about √|D|) until the remainder drops below
``(v1/v2)^(1/2)·|D/4|^(1/4)``, and build the transformed form directly from the
remainders ``R_i`` and cofactors ``C_i``:

    a3 = (v2·R_i² − b2·R_i·C_i + d1·c2·C_i²) / v1
    b3 = (2·v2·R_i·R_{i−1} − b2·(R_i·C_{i−1} + R_{i−1}·C_i) + 2·d1·c2·C_i·C_{i−1}) / v1

(these are the values of the composite and its polar form at the vectors
``(k_i, −C_i)``, ``(k_{i−1}, −C_{i−1})`` where ``v1·k_j − r·C_j = R_j``), followed by a
final reduction of a form that is already almost reduced.  *NUDUPL* is the same for
squaring, where one Euclid step suffices.  All results are exact: the partial
reduction is an explicit unimodular change of variables, so correctness does not rest
on the stopping bound, which only governs speed.

Composition here is of classes: results are reduced.  Indefinite forms are composed by
the Dirichlet method and reduced with Gauss reduction (NUCOMP is for definite forms).

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, Algorithms 5.4.7 (composition), 5.4.8 (NUDUPL), 5.4.9 (NUCOMP).
.. [2] M. J. Jacobson, Jr., A. J. van der Poorten, "Computational aspects of NUCOMP",
       ANTS V, LNCS 2369 (2002), 120–133.
.. [3] D. Shanks, "On Gauss and composition I, II", in *Number Theory and
       Applications*, Kluwer 1989.
"""

from __future__ import annotations

from functools import lru_cache

from ..errors import DiscriminantMismatchError, FormError, NotPrimitiveError
from .arith import as_int, isqrt, mpz, xgcd
from .forms import Form, FormLike, _require_nonsquare, as_form
from .raw_reduction import (
    REPRESENTATIVE_CYCLE_LIMIT,
    _cycle_representative_raw,
    _reduce_definite_raw,
    _reduce_indefinite_raw,
)

__all__ = ["compose", "square", "power", "inverse", "COMPOSITION_METHODS"]

COMPOSITION_METHODS = ("dirichlet", "nucomp")


# ---------------------------------------------------------------------------
# raw cores on integers (a, b, c); inputs primitive, same discriminant


def _compose_parts(a1, b1, c1, a2, b2, c2, swap=True):
    """Cohen Algorithm 5.4.7 steps 1–4 up to the choice of r.

    Returns ``(d1, v1, v2, r, b2, c2)`` where the composite is ``(v1·v2, b2 + 2·v2·r, ·)``
    and ``v1 = a1/d1`` belongs to the first form after the optional swap (Cohen puts
    the smaller leading coefficient first; NUCOMP wants the larger one there).
    """
    if swap and a1 > a2:
        a1, b1, c1, a2, b2, c2 = a2, b2, c2, a1, b1, c1
    s = (b1 + b2) // 2
    n = b2 - s
    if a2 % a1 == 0:
        y1 = 0
        d = a1
    else:
        d, u, _v = xgcd(a2, a1)
        y1 = u
    if s % d == 0:
        y2 = -1
        x2 = 0
        d1 = d
    else:
        d1, u, v = xgcd(s, d)
        x2 = u
        y2 = -v
    v1 = a1 // d1
    v2 = a2 // d1
    r = (y1 * y2 * n - x2 * c2) % v1
    return d1, v1, v2, r, b2, c2


def _compose_raw(a1, b1, c1, a2, b2, c2, D):
    """Unreduced Dirichlet composite of two primitive forms of discriminant ``D``."""
    _d1, v1, v2, r, b2, c2 = _compose_parts(a1, b1, c1, a2, b2, c2)
    a3 = v1 * v2
    b3 = b2 + 2 * v2 * r
    c3 = (b3 * b3 - D) // (4 * a3)
    return a3, b3, c3


def _partial_reduce(d1, v1, v2, r, b2, c2, D, L):
    """The NUCOMP partial reduction of the composite ``(v1·v2, b2 + 2·v2·r, ·)``."""
    bound = isqrt(v1 * L * L // v2) if v2 else 0
    R_prev, R_cur = v1, r
    C_prev, C_cur = 0, -1
    steps = 0
    while R_cur > bound and R_cur != 0:
        q, rem = divmod(R_prev, R_cur)
        R_prev, R_cur = R_cur, rem
        C_prev, C_cur = C_cur, C_prev - q * C_cur
        steps += 1
    dc = d1 * c2
    a3 = (v2 * R_cur * R_cur - b2 * R_cur * C_cur + dc * C_cur * C_cur) // v1
    b3 = (2 * v2 * R_cur * R_prev - b2 * (R_cur * C_prev + R_prev * C_cur) + 2 * dc * C_cur * C_prev) // v1
    # the change of variables [[k_i, k_{i-1}], [-C_i, -C_{i-1}]] has det (−1)^(steps+1);
    # make it proper by negating the second column (which negates b3)
    if steps % 2 == 0:
        b3 = -b3
    c3 = (b3 * b3 - D) // (4 * a3)
    return a3, b3, c3


def _nucomp_raw(a1, b1, c1, a2, b2, c2, D, L):
    """NUCOMP of two primitive positive definite forms; returns a reduced form."""
    # larger leading coefficient first, so that the Euclid runs on the larger v1
    if a1 < a2:
        a1, b1, c1, a2, b2, c2 = a2, b2, c2, a1, b1, c1
    d1, v1, v2, r, bb, cc = _compose_parts(a1, b1, c1, a2, b2, c2, swap=False)
    a3, b3, c3 = _partial_reduce(d1, v1, v2, r, bb, cc, D, L)
    return _reduce_definite_raw(a3, b3, c3)


def _nudupl_raw(a, b, c, D, L):
    """NUDUPL: the square of a primitive positive definite form, reduced."""
    # composition of f with itself: y1 = 0, d1 = gcd(a, b) = u·b + v·a, r = −u·c mod a/d1
    d1, u, _v = xgcd(b, a)
    v1 = a // d1
    r = (-u * c) % v1
    a3, b3, c3 = _partial_reduce(d1, v1, v1, r, b, c, D, L)
    return _reduce_definite_raw(a3, b3, c3)


@lru_cache(maxsize=256)
def _nucomp_bound(D) -> int:
    """``L = ⌊|D/4|^(1/4)⌋`` (memoised: the public calls ask for it on every composition)."""
    return int(isqrt(isqrt(abs(int(D)) // 4)))


# ---------------------------------------------------------------------------
# public API


def _check(F: Form, G: Form) -> int:
    D = _require_nonsquare(F, "composition")
    if G.discriminant != D:
        raise DiscriminantMismatchError(
            f"composition needs forms of one discriminant: {F!r} has D = {D}, {G!r} has D = {G.discriminant}"
        )
    for f in (F, G):
        if not f.is_primitive:
            raise NotPrimitiveError(f"composition needs primitive forms; {f!r} has content {f.content}")
        if D < 0 and f.a < 0:
            raise FormError(
                f"composition of definite forms is defined on positive definite forms; {f!r} is negative definite"
            )
    return D


def _reduce_any(a, b, c, D) -> Form:
    """The class representative of (a, b, c): reduced (D < 0), least on its cycle (D > 0)."""
    if D < 0:
        return Form(*(int(v) for v in _reduce_definite_raw(a, b, c)))
    return _representative_indefinite(_reduce_indefinite_raw(a, b, c, D, isqrt(D)), D)


def _representative_indefinite(r, D) -> Form:
    # the form that formkit.core.reduction.class_representative chooses (one per class)
    rep = _cycle_representative_raw(r[0], r[1], r[2], D, isqrt(D))
    if rep is None:
        raise FormError(
            f"the cycle of the composite ({int(r[0])}, {int(r[1])}, {int(r[2])}) has more than "
            f"{REPRESENTATIVE_CYCLE_LIMIT} reduced forms: no class representative chosen"
        )
    return Form(*rep)


def compose(F: FormLike, G: FormLike, *, method: str = "dirichlet") -> Form:
    """The reduced composite of two primitive forms of the same discriminant.

    Parameters
    ----------
    F, G : FormLike
        Primitive forms of one non-square discriminant (positive definite when D < 0).
    method : {"dirichlet", "nucomp"}
        ``"nucomp"`` (Shanks' NUCOMP, or NUDUPL when F = G) is for definite forms.

    Returns
    -------
    Form
        The class representative of the product class
        (:func:`formkit.core.reduction.class_representative`): the reduced form for
        D < 0; for D > 0 the least reduced form of its cycle (least ``|a|``, positive
        ``a`` first, then least ``b``), the form ``formkit group`` lists.

    Raises
    ------
    DiscriminantMismatchError, NotPrimitiveError, FormError

    Examples
    --------
    >>> compose((2, 1, 3), (2, 1, 3))
    Form(2, -1, 3)
    >>> compose((2, 1, 3), (2, -1, 3))
    Form(1, 1, 6)
    >>> compose((3, 2, 5), (3, 2, 5), method="nucomp")
    Form(2, 0, 7)

    References
    ----------
    Cohen GTM 138, Algorithms 5.4.7 and 5.4.9.
    """
    F, G = as_form(F, name="F"), as_form(G, name="G")
    D = _check(F, G)
    if method not in COMPOSITION_METHODS:
        raise FormError(f"method must be one of {COMPOSITION_METHODS}, not {method!r}")
    a1, b1, c1 = mpz(F.a), mpz(F.b), mpz(F.c)
    a2, b2, c2 = mpz(G.a), mpz(G.b), mpz(G.c)
    if method == "nucomp":
        if D > 0:
            raise FormError("NUCOMP is implemented for definite forms; use method='dirichlet' for D > 0")
        L = _nucomp_bound(D)
        if F == G:
            out = _nudupl_raw(a1, b1, c1, mpz(D), L)
        else:
            out = _nucomp_raw(a1, b1, c1, a2, b2, c2, mpz(D), L)
        return Form(*(int(v) for v in out))
    a3, b3, c3 = _compose_raw(a1, b1, c1, a2, b2, c2, mpz(D))
    return _reduce_any(a3, b3, c3, mpz(D))


def square(F: FormLike, *, method: str = "nucomp") -> Form:
    """The reduced square of ``F`` (NUDUPL for definite forms by default).

    Examples
    --------
    >>> square((2, 1, 3))
    Form(2, -1, 3)
    """
    F = as_form(F)
    if F.discriminant > 0 and method == "nucomp":
        method = "dirichlet"
    return compose(F, F, method=method)


def inverse(F: FormLike) -> Form:
    """The class representative of the inverse class, that of ``(a, −b, c)``.

    Examples
    --------
    >>> inverse((2, 1, 3))
    Form(2, -1, 3)
    """
    F = as_form(F)
    D = _check(F, F)
    return _reduce_any(mpz(F.a), mpz(-F.b), mpz(F.c), mpz(D))


def power(F: FormLike, k: int, *, method: str = "nucomp") -> Form:
    """``F^k`` in the class group: its class representative (``k`` may be negative or zero).

    The result is :func:`formkit.core.reduction.class_representative` of the power class
    (for D > 0 the form ``formkit group`` lists).

    Uses binary powering with NUDUPL/NUCOMP for definite forms (Dirichlet composition
    and Gauss reduction for indefinite ones), so ``k`` may have hundreds of digits.

    Examples
    --------
    >>> power((2, 1, 3), 3)
    Form(1, 1, 6)
    >>> power((2, 1, 3), -1), power((2, 1, 3), 0)
    (Form(2, -1, 3), Form(1, 1, 6))
    """
    F = as_form(F)
    k = as_int(k, "k")
    D = _check(F, F)
    if method not in COMPOSITION_METHODS:
        raise FormError(f"method must be one of {COMPOSITION_METHODS}, not {method!r}")
    if k < 0:
        F = inverse(F)
        k = -k
    Dz = mpz(D)
    if D < 0:
        start = _reduce_definite_raw(mpz(F.a), mpz(F.b), mpz(F.c))
        one = Form.principal(D)
        if k == 0:
            return one
        L = _nucomp_bound(D)
        base = start
        # left-to-right binary powering
        result = base
        for bit in bin(k)[3:]:
            if method == "nucomp":
                result = _nudupl_raw(*result, Dz, L)
                if bit == "1":
                    result = _nucomp_raw(result[0], result[1], result[2], base[0], base[1], base[2], Dz, L)
            else:
                result = _reduce_definite_raw(*_compose_raw(*result, *result, Dz))
                if bit == "1":
                    result = _reduce_definite_raw(*_compose_raw(*result, *base, Dz))
        return Form(*(int(v) for v in result))
    sq = isqrt(Dz)
    if k == 0:
        P = Form.principal(D)
        return _reduce_any(mpz(P.a), mpz(P.b), mpz(P.c), Dz)
    base = _reduce_indefinite_raw(mpz(F.a), mpz(F.b), mpz(F.c), Dz, sq)
    result = base
    for bit in bin(k)[3:]:
        a, b, c = _compose_raw(result[0], result[1], result[2], result[0], result[1], result[2], Dz)
        result = _reduce_indefinite_raw(a, b, c, Dz, sq)
        if bit == "1":
            a, b, c = _compose_raw(result[0], result[1], result[2], base[0], base[1], base[2], Dz)
            result = _reduce_indefinite_raw(a, b, c, Dz, sq)
    return _representative_indefinite(result, Dz)
