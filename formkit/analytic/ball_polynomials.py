"""Polynomials with real ball coefficients: products of many factors, and certified rounding.

Used to build class polynomials from their roots (:mod:`formkit.representation.class_polynomials`):

* :func:`product_tree` — the product of many polynomials by a balanced binary tree of
  multiplications (each level multiplies polynomials of about equal degree, so FLINT's
  fast multiplication of ball polynomials is used where it pays; the cost is that of
  ``O(log n)`` full-size multiplications instead of ``n`` multiplications by a linear
  factor);
* :func:`certified_integer_coefficients` — the integer polynomial a ball polynomial
  encloses, returned only when every coefficient ball contains exactly one integer
  (its radius is below 1/2 and it meets an integer).  Since ball arithmetic encloses the
  exact result, the rounding is then proved right: if the exact coefficients are
  integers, they are these.

All arithmetic is python-flint's ``arb_poly`` (balls with rigorous error bounds);
formkit supplies the factors and decides what the product means.

References
----------
.. [1] J. von zur Gathen, J. Gerhard, *Modern Computer Algebra*, 3rd ed., Cambridge
       2013, §10.1 (subproduct trees; Algorithm 10.3).
.. [2] F. Johansson, "Arb: efficient arbitrary-precision midpoint-radius interval
       arithmetic", IEEE Trans. Computers 66 (2017), 1281–1292.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

__all__ = ["product_tree", "certified_integer_coefficients", "largest_radius_log2"]


def product_tree(factors: Sequence[Any]) -> Any:
    """The product of ``arb_poly`` factors, multiplied pairwise level by level.

    Parameters
    ----------
    factors : sequence of flint.arb_poly
        At least one factor; multiplied at the current flint precision.

    Returns
    -------
    flint.arb_poly

    Raises
    ------
    ValueError
        If ``factors`` is empty.

    Examples
    --------
    >>> from flint import arb_poly
    >>> P = product_tree([arb_poly([-1, 1]), arb_poly([-2, 1]), arb_poly([-3, 1])])
    >>> certified_integer_coefficients(P)  # (x − 1)(x − 2)(x − 3)
    [1, -6, 11, -6]

    References
    ----------
    von zur Gathen–Gerhard, Algorithm 10.3 (subproduct tree).
    """
    level = list(factors)
    if not level:
        raise ValueError("product_tree needs at least one factor")
    while len(level) > 1:
        nxt = [level[i] * level[i + 1] for i in range(0, len(level) - 1, 2)]
        if len(level) % 2:
            nxt.append(level[-1])
        level = nxt
    return level[0]


def certified_integer_coefficients(poly: Any) -> list[int] | None:
    """The integer coefficients (leading first) enclosed by ``poly``, or ``None``.

    ``None`` unless every coefficient ball has radius ``< 1/2`` and contains an integer
    (then it contains exactly one).

    Examples
    --------
    >>> from flint import arb, arb_poly
    >>> certified_integer_coefficients(arb_poly([arb(-6, 0.1), arb(11, 0.2), 1]))
    [1, 11, -6]
    >>> certified_integer_coefficients(arb_poly([arb(-6, 0.6), 1])) is None
    True
    """
    out = []
    for c in poly.coeffs():
        z = _unique_integer(c)
        if z is None:
            return None
        out.append(z)
    out.reverse()
    return out


def _unique_integer(x: Any) -> int | None:
    """The integer in the arb ball ``x`` if there is exactly one and the radius is < 1/2.

    Decided in exact integer arithmetic from the binary forms ``mid = m·2^e``,
    ``rad = r·2^f`` (FLINT's own ``unique_fmpz`` gives up on very large midpoints).
    """
    if not x.is_finite():
        return None
    m, e = (int(v) for v in x.mid().man_exp())
    r, f = (int(v) for v in x.rad().man_exp())
    g = min(e, f, -1)  # common exponent: everything is an integer multiple of 2^g
    M = m << (e - g)  # mid·2^-g
    R = r << (f - g)  # rad·2^-g
    unit = 1 << -g  # 1·2^-g
    if not unit > 2 * R:  # radius < 1/2
        return None
    n = (M + unit // 2) >> -g  # nearest integer to mid (ties up)
    if abs(M - (n << -g)) > R:
        return None
    return n


def largest_radius_log2(poly: Any) -> int:
    """The least ``k`` with every coefficient radius ``< 2^k`` found from the radii's binary
    form (so within one of optimal); ``−10⁹`` if every coefficient is exact.

    Examples
    --------
    >>> from flint import arb, arb_poly
    >>> largest_radius_log2(arb_poly([arb(1, 2**-40), arb(3, 2**-50)]))  # radii rounded up
    -39
    """
    worst = -(10**9)
    for c in poly.coeffs():
        m, e = c.rad().man_exp()
        m = int(m)
        if m > 0:
            worst = max(worst, int(e) + m.bit_length())
    return worst
