"""Exceptions raised by formkit.

Every error a user can provoke with bad input is a :class:`FormkitError`, which is a
:class:`ValueError`; its message names the offending value and the rule it broke.
Values that are not integers at all raise :class:`NotAnIntegerError`, which is both a
:class:`FormkitError` and a :class:`TypeError`.
"""

from __future__ import annotations

__all__ = [
    "FormkitError",
    "NotAnIntegerError",
    "DiscriminantError",
    "FormError",
    "NotPrimitiveError",
    "ParseError",
    "DiscriminantMismatchError",
    "NotPrimeError",
    "MatrixError",
    "NotInOrderError",
    "NotInvertibleIdealError",
    "BudgetError",
    "StoreDamagedError",
]


class FormkitError(ValueError):
    """Base class of every error formkit raises for bad input."""


class NotAnIntegerError(FormkitError, TypeError):
    """A value that must be an integer is not one."""


class DiscriminantError(FormkitError):
    """A number is not a valid discriminant for the operation asked for."""


class FormError(FormkitError):
    """A form does not meet a requirement (definite, non-degenerate, ...)."""


class NotPrimitiveError(FormError):
    """A form must be primitive (gcd(a, b, c) = 1) and is not."""


class ParseError(FormkitError):
    """Text could not be read as a form, matrix or number."""


class DiscriminantMismatchError(FormkitError):
    """Two objects that must share a discriminant do not."""


class NotPrimeError(FormkitError):
    """A number that must be prime is not."""


class MatrixError(FormkitError):
    """A matrix is not in the group required (SL2(Z) or GL2(Z))."""


class NotInOrderError(FormkitError):
    """A number of the field is not an element of the order asked for."""


class NotInvertibleIdealError(FormkitError):
    """An ideal of a non-maximal order is not invertible (not proper), or is the zero ideal."""


class BudgetError(FormkitError):
    """Work estimated (before it starts) to need more time or memory than the budget allows.

    The message says what the work would need and which method or option reaches
    further (see :mod:`formkit.core.budget`).
    """


class StoreDamagedError(FormkitError):
    """A table store failed its checks (checksums or row identities); the message names the
    damaged chunks and how to repair them."""
