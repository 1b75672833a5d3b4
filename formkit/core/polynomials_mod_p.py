"""Polynomials over the integers reduced modulo a prime: root counts and squarefreeness.

Used to check class polynomials (:mod:`formkit.representation.class_polynomials`) and to apply the
class-polynomial criterion.  Polynomials are lists of residues, lowest degree first.
Products use Kronecker substitution (pack the coefficients into one big integer,
multiply once, unpack), remainders the reversed-polynomial trick with a Newton
inverse, so ``x^p mod f`` costs ``O(log p)`` big-integer multiplications; the number of
distinct roots of ``f`` in ``F_p`` is ``deg gcd(f, x^p − x)``.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §1.6 (polynomials over finite fields, roots via gcd with x^p − x;
       number not recalled) and §3.1 (Kronecker substitution / fast multiplication).
"""

from __future__ import annotations

from collections.abc import Sequence

from ..errors import FormError, NotPrimeError
from .arith import as_int, is_probable_prime

__all__ = ["root_count_mod_prime", "is_squarefree_mod_prime"]


def _trim(f: list[int]) -> list[int]:
    while f and f[-1] == 0:
        f.pop()
    return f


def _to_mod(coefficients: Sequence[int], p: int) -> list[int]:
    return _trim([int(c) % p for c in reversed(coefficients)])


def _pack(f: list[int], width: int) -> int:
    return int.from_bytes(b"".join(c.to_bytes(width, "little") for c in f), "little")


def _unpack(n: int, width: int, count: int, p: int) -> list[int]:
    raw = n.to_bytes(width * count, "little")
    return [int.from_bytes(raw[i * width : (i + 1) * width], "little") % p for i in range(count)]


def _mul(f: list[int], g: list[int], p: int) -> list[int]:
    """Product modulo p by Kronecker substitution (one big-integer multiplication)."""
    if not f or not g:
        return []
    n = min(len(f), len(g))
    width = ((2 * (p - 1).bit_length() + n.bit_length()) + 8) // 8
    count = len(f) + len(g) - 1
    return _trim(_unpack(_pack(f, width) * _pack(g, width), width, count, p))


def _divmod_naive(g: list[int], f: list[int], p: int) -> list[int]:
    """Remainder of g by f (f non-zero) modulo p, schoolbook."""
    g = list(g)
    df = len(f) - 1
    inv = pow(f[-1], -1, p)
    for i in range(len(g) - 1, df - 1, -1):
        c = g[i] * inv % p
        if c:
            for k in range(df + 1):
                g[i - df + k] = (g[i - df + k] - c * f[k]) % p
    return _trim(g[:df])


def _xpow_minus_x_mod(f: list[int], p: int) -> list[int]:
    """x^p − x modulo the monic f and p (square-and-multiply with fast multiplication)."""
    n = len(f) - 1
    # Precompute the inverse of rev(f) modulo x^n for Barrett-style remainders.
    rev = f[::-1]
    inv = [1]
    prec = 1
    while prec < n:  # Newton iteration: inv ← inv·(2 − rev·inv) mod x^{2·prec}
        prec = min(2 * prec, n)
        e = _mul(rev[:prec], inv, p)[:prec]
        e = [(-c) % p for c in e] + [0] * (prec - len(e))
        e[0] = (e[0] + 2) % p
        inv = _mul(inv, _trim(e), p)[:prec]

    def rem(g: list[int]) -> list[int]:
        if len(g) <= n:
            return g
        d = len(g) - 1
        m = d - n + 1  # number of quotient coefficients
        qrev = _mul(g[::-1][:m], inv[:m], p)[:m]
        q = (qrev + [0] * (m - len(qrev)))[::-1]
        r = _mul(q, f, p)
        out = [(g[i] - (r[i] if i < len(r) else 0)) % p for i in range(n)]
        return _trim(out)

    result = [1]
    base = [0, 1] if n > 1 else rem([0, 1])
    exponent = p
    while exponent:
        if exponent & 1:
            result = rem(_mul(result, base, p))
        exponent >>= 1
        if exponent:
            base = rem(_mul(base, base, p))
    result = result + [0] * max(0, 2 - len(result))
    result[1] = (result[1] - 1) % p
    return _trim(result)


def _gcd_degree(f: list[int], g: list[int], p: int) -> int:
    while g:
        f, g = g, _divmod_naive(f, g, p)
    return len(f) - 1


def _check_prime(p: object) -> int:
    p = as_int(p, "p")
    if p < 2 or not is_probable_prime(p):
        raise NotPrimeError(f"p must be a prime, not {p}")
    return p


def _check_monic(coefficients: Sequence[int]) -> list[int]:
    coeffs = [as_int(c, "coefficient") for c in coefficients]
    if not coeffs or coeffs[0] != 1:
        raise FormError(
            f"the polynomial must be monic (leading coefficient 1 first), not {list(coefficients)[:3]}…"
        )
    return coeffs


def root_count_mod_prime(polynomial: Sequence[int], p: object) -> int:
    """Number of distinct roots modulo ``p`` of a monic integer polynomial.

    Computed as ``deg gcd(f, x^p − x)`` over ``F_p`` (with a direct search for small
    ``p``).

    Parameters
    ----------
    polynomial : sequence of int
        Coefficients, leading (= 1) first.
    p : int
        A prime.

    Returns
    -------
    int

    Raises
    ------
    NotPrimeError
        If ``p`` is not prime.
    FormError
        If the polynomial is not monic.

    Examples
    --------
    >>> from formkit.representation.class_polynomials import class_polynomial
    >>> H = class_polynomial(-23).coefficients
    >>> root_count_mod_prime(H, 59), root_count_mod_prime(H, 13)  # 59 = 5² + 5·2 + 6·2², 13 = 2·2² + 2 + 3
    (3, 0)
    """
    p = _check_prime(p)
    coeffs = _check_monic(polynomial)
    f = _to_mod(coeffs, p)
    if len(f) <= 1:
        return 0
    if p <= 4 * len(f) + 50:
        count = 0
        for x in range(p):
            v = 0
            for c in coeffs:
                v = (v * x + c) % p
            count += v == 0
        return count
    return _gcd_degree(f, _xpow_minus_x_mod(f, p), p)


def is_squarefree_mod_prime(polynomial: Sequence[int], p: object) -> bool:
    """True if the monic polynomial has no repeated factor modulo ``p``, i.e. ``p ∤ disc``.

    Examples
    --------
    >>> is_squarefree_mod_prime([1, 0, 1], 2), is_squarefree_mod_prime([1, 0, 1], 3)
    (False, True)
    """
    p = _check_prime(p)
    coeffs = _check_monic(polynomial)
    f = _to_mod(coeffs, p)
    n = len(f) - 1
    df = _trim([(i * f[i]) % p for i in range(1, n + 1)])
    if not df:
        return n <= 0
    return _gcd_degree(f, df, p) == 0
