"""The projection ``Cl(D) → Cl(d_K)`` on forms: from the order of conductor f to the maximal order.

For ``D = f²·d_K``, extending ideals from the order ``O`` to ``O_K`` sends a primitive form
``(a, b, c)`` with ``gcd(a, f) = 1`` to ``(a, b', ·)`` with ``f·b' ≡ b (mod 2a)`` and
``b' ≡ d_K (mod 2)`` (the ideal ``[a, (−b + f√d_K)/2]`` becomes ``[a, (−b' + √d_K)/2]``).
Kept in core so that both :mod:`formkit.classgroups.orders` (the kernel of the projection)
and :mod:`formkit.classgroups.subexponential_orders` (discrete logarithms through the
maximal order) use it without an import circle; :mod:`formkit.classgroups.orders`
re-exports both functions.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §7 (Lemma 2.25,
       Proposition 7.20).
"""

from __future__ import annotations

from ..errors import FormkitError, NotPrimitiveError
from .arith import as_int, invert, xgcd
from .discriminants import discriminant_parts
from .forms import Form, FormLike, _require_nonsquare, as_form
from .reduction import reduced

__all__ = ["coprime_representative", "project_to_maximal_order"]


def coprime_representative(form: FormLike, m: int) -> tuple[Form, tuple]:
    """A form properly equivalent to ``form`` whose first coefficient is prime to ``m``.

    Returns ``(g, M)`` with ``g = form·M``, ``M ∈ SL2(Z)``.  A primitive form
    represents integers prime to any given ``m`` (Cox, Lemma 2.25), found here by a
    search over small coprime ``(x, y)``.

    Raises
    ------
    NotPrimitiveError
        If ``form`` is not primitive.
    NotAnIntegerError, FormkitError
        If ``m`` is not a non-zero integer.

    Examples
    --------
    >>> coprime_representative((2, 0, 9), 2)[0]
    Form(9, 0, 2)
    """
    f = as_form(form)
    if not f.is_primitive:
        raise NotPrimitiveError(f"{f!r} is not primitive (content {f.content})")
    m = abs(as_int(m, "m"))
    if m == 0:
        raise FormkitError(f"coprime_representative needs a non-zero modulus m, not {m}")
    from math import gcd

    bound = 1
    while True:
        for x in range(bound + 1):
            for y in (bound, -bound) if x < bound else range(-bound, bound + 1):
                if gcd(x, y) != 1:
                    continue
                v = f(x, y)
                if v != 0 and gcd(v, m) == 1:
                    _g, s0, t0 = xgcd(x, y)
                    M = ((x, -int(t0)), (y, int(s0)))
                    return f.transform(M), M
        bound += 1


def project_to_maximal_order(form: FormLike) -> Form:
    """The image in ``Cl(d_K)`` of the class of a primitive form of discriminant ``D = f²d_K``.

    Returns a reduced form of discriminant ``d_K`` (for ``D > 0`` a reduced form of
    the image class).

    Examples
    --------
    >>> project_to_maximal_order((2, 0, 9))     # D = -72 = 3²·(-8)
    Form(1, 0, 2)
    >>> project_to_maximal_order((3, 2, 7))     # D = -80 = 2²·(-20)
    Form(2, 2, 3)
    """
    f = as_form(form)
    D = _require_nonsquare(f, "projection to the maximal order")
    if not f.is_primitive:
        raise NotPrimitiveError(f"{f!r} is not primitive (content {f.content})")
    d_K, cond = discriminant_parts(D)
    if cond == 1:
        return reduced(f)
    g, _M = coprime_representative(f, cond)
    a, b = g.a, g.b
    A = abs(a)
    if A % 2 == 1:
        r = b * int(invert(cond, A)) % A if A > 1 else 0
        # b' ≡ r (mod A), b' ≡ d_K (mod 2)
        bp = r if (r - d_K) % 2 == 0 else r + A
    else:
        bp = b * int(invert(cond, 2 * A)) % (2 * A)
    if (bp * bp - d_K) % (4 * A):  # pragma: no cover - impossible by the argument above
        raise ArithmeticError(f"projection of {f!r}: {bp}² is not ≡ {d_K} (mod {4 * A})")
    c = (bp * bp - d_K) // (4 * a)
    return reduced(Form(a, bp, c))
