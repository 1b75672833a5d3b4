"""Gauss's principal genus theorem, checked on the class group: the principal genus is Cl(D)².

The genera come from :mod:`formkit.classgroups.genus` (genus symbols, no group needed),
the squares from composition in :func:`formkit.class_group`; the theorem says the two
sets of classes coincide (Gauss, *Disquisitiones* art. 229–287; Cox, *Primes of the
Form x² + ny²*, Theorem 3.15 — numbers as recalled).

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §3.
.. [2] C. F. Gauss, *Disquisitiones Arithmeticae*, 1801, art. 229–287.
"""

from __future__ import annotations

from ..core.discriminants import validate_discriminant
from .dispatch import class_group
from .genus import assigned_characters, genus_symbol

__all__ = ["principal_genus_is_squares"]


def principal_genus_is_squares(D: object) -> bool:
    """Check Gauss's theorem for ``D``: the principal genus is the group of squares.

    Squares are computed with the class group's composition
    (:func:`formkit.class_group`); the principal genus from genus symbols.
    Returns ``True`` when the two sets of classes coincide (the theorem says always).

    Examples
    --------
    >>> principal_genus_is_squares(-56), principal_genus_is_squares(-260)
    (True, True)
    """
    D = validate_discriminant(D)
    G = class_group(D)
    elements = list(G.elements())
    one = tuple(1 for _ in assigned_characters(D))
    squares = {x * x for x in elements}
    principal = {x for x in elements if genus_symbol(x.form) == one}
    return squares == principal
