"""Averages of representation numbers: lattice points in ellipses and the class number.

For a positive definite form ``Q`` of discriminant ``D`` the number of lattice points
``N_Q(X) = #{(x, y) ∈ Z² : Q(x, y) ≤ X} = Σ_{0 ≤ n ≤ X} r_Q(n)`` (``r_Q(0) = 1``, the
origin) is counted exactly here, and compared with the area ``2πX/√|D|`` of the
ellipse ``Q ≤ X`` (Gauss's lattice-point argument; the error is ``O(√X)``).  Summed
over one form per class, ``Σ_Q N_Q(X) ≈ h·2πX/√|D| = w·L(1, χ_D)·X``, which is
Dirichlet's class number formula ``h = w√|D|·L(1, χ_D)/(2π)`` (valid for every
negative discriminant with the Kronecker character ``χ_D``): counting points is an
independent sanity check of a class number.

Counting is exact integer arithmetic (``O(√(X/√|D|))`` rows of the reduced form).  The
main terms and ``L(1, χ_D)`` are floating-point (mpmath) values at a stated precision,
each computed twice at different precisions and checked to agree.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138, §5.3
       (class number formula).
.. [2] D. Zagier, *Zetafunktionen und quadratische Körper*, Springer 1981, §8–9.
.. [3] P. G. L. Dirichlet, *Vorlesungen über Zahlentheorie*, §§ 95–100 (numbers not
       recalled).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from ..core.arith import as_int, isqrt, kronecker
from ..core.discriminants import unit_count, validate_discriminant
from ..core.displays import SentenceDisplay
from ..core.forms import Form, FormLike, _require_nonsquare, as_form
from ..core.reduction import reduced
from ..errors import FormError, FormkitError

__all__ = [
    "LatticeCount",
    "ClassLatticeTotal",
    "lattice_point_count",
    "class_lattice_total",
    "l_value_at_one",
]


def _mp_checked(fn, digits: int):
    """Evaluate ``fn()`` (an mpmath computation) at two working precisions and compare."""
    import mpmath

    values = []
    for extra in (10, 30):
        with mpmath.workdps(digits + extra):
            values.append(fn())
    with mpmath.workdps(digits + 10):
        diff = abs(values[0] - values[1])
        if diff > mpmath.mpf(10) ** (-digits) * max(1, abs(values[1])):
            raise ArithmeticError("floating-point value did not stabilise under higher precision")
    with mpmath.workdps(digits):
        return +values[1]


@dataclass(frozen=True)
class LatticeCount(SentenceDisplay):
    """``N_Q(X)`` beside the area ``2πX/√|D|`` of the ellipse ``Q ≤ X``.

    ``count`` is exact; ``main_term`` and ``error = count − main_term`` are mpmath
    numbers with ``digits`` significant digits.
    """

    form: Form
    bound: int
    count: int
    main_term: Any
    error: Any
    digits: int

    def _display_sentence(self) -> str:
        return f"#{{(x, y) : {self.form} ≤ {self.bound}}} = {self.count} (origin included); area term {float(self.main_term):.10g}, difference {float(self.error):.4g}"

    def _display_provenance(self) -> str:
        return "lattice points counted exactly; the area term to " + str(self.digits) + " digits"

    def to_dict(self) -> dict:
        """JSON-ready dictionary (floats as decimal strings)."""
        return {
            "form": self.form.to_list(),
            "bound": self.bound,
            "count": self.count,
            "main_term": str(self.main_term),
            "error": str(self.error),
        }


def _count_reduced(a: int, b: int, c: int, X: int) -> int:
    """#{(x, y): ax² + bxy + cy² ≤ X} for positive definite (a, b, c), a ≤ c."""
    D = b * b - 4 * a * c
    absD = -D
    # (2ax + by)² + |D| y² ≤ 4aX
    four_aX = 4 * a * X
    ymax = isqrt(four_aX // absD)
    two_a = 2 * a
    total = 0
    for y in range(-ymax, ymax + 1):
        T = four_aX - absD * y * y
        if T < 0:
            continue
        r = isqrt(T)
        k = (b * y) % two_a
        # u ≡ k (mod 2a), -r ≤ u ≤ r
        total += (r - k) // two_a - (-r - k + two_a - 1) // two_a + 1
    return int(total)


def lattice_point_count(form: FormLike, X: object, *, digits: int = 30) -> LatticeCount:
    """``N_Q(X) = #{(x, y) : Q(x, y) ≤ X}`` exactly, with the main term ``2πX/√|D|``.

    The count is invariant under SL2(Z), so the reduced form is used and each row
    ``y`` contributes the ``u = 2ax + by`` with ``u² ≤ 4aX − |D|y²`` and
    ``u ≡ by (mod 2a)``.  Non-primitive forms are fine (it is a point count).

    Parameters
    ----------
    form : FormLike
        A positive definite form.
    X : int
        The bound, ``X ≥ 0``.
    digits : int
        Precision of the main term and the error.

    Raises
    ------
    FormError
        If the form is not positive definite.

    Examples
    --------
    >>> r = lattice_point_count((1, 0, 1), 100)     # points in the disc of radius 10
    >>> r.count, round(float(r.main_term), 3)
    (317, 314.159)
    """
    Q = as_form(form)
    D = _require_nonsquare(Q, "counting lattice points")
    X = as_int(X, "X")
    if not Q.is_positive_definite:
        raise FormError(
            f"lattice points are counted in the ellipse of a positive definite form; {Q!r} is {Q.kind}"
        )
    if X < 0:
        raise FormkitError(f"the bound X must be ≥ 0, not {X}")
    R = reduced(Q)
    count = _count_reduced(R.a, R.b, R.c, X)

    import mpmath

    def main():
        return 2 * mpmath.pi * X / mpmath.sqrt(-D)

    m = _mp_checked(main, digits)
    with mpmath.workdps(digits):
        err = count - m
    return LatticeCount(Q, X, count, m, err, digits)


@dataclass(frozen=True)
class ClassLatticeTotal(SentenceDisplay):
    """``Σ_Q N_Q(X)`` over one form per class, beside ``h·2πX/√|D| = w·L(1, χ_D)·X``.

    ``class_number_estimate = count·√|D|/(2πX)`` is what counting alone says about ``h``.
    """

    discriminant: int
    bound: int
    class_number: int
    unit_count: int
    count: int
    main_term: Any
    error: Any
    class_number_estimate: Any
    digits: int

    def _display_sentence(self) -> str:
        return f"D = {self.discriminant}: {self.count} lattice points with Q(x, y) ≤ {self.bound} (the origin included) summed over one form Q of each of the {self.class_number} classes; area term {float(self.main_term):.10g}, so h ≈ {float(self.class_number_estimate):.6g}"

    def _display_provenance(self) -> str:
        return "lattice points counted exactly; the area term to " + str(self.digits) + " digits"

    def to_dict(self) -> dict:
        """JSON-ready dictionary (floats as decimal strings)."""
        return {
            "discriminant": self.discriminant,
            "bound": self.bound,
            "class_number": self.class_number,
            "count": self.count,
            "main_term": str(self.main_term),
            "error": str(self.error),
            "class_number_estimate": str(self.class_number_estimate),
        }


def class_lattice_total(D: object, X: object, *, digits: int = 30) -> ClassLatticeTotal:
    """Lattice points of all classes of discriminant ``D < 0`` in their ellipses ``Q ≤ X``.

    Uses :func:`formkit.core.enumeration.class_representatives` for the classes.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a negative discriminant.

    Examples
    --------
    >>> t = class_lattice_total(-23, 10**4)
    >>> t.class_number, t.count, round(float(t.class_number_estimate), 2)
    (3, 39295, 3.0)
    """
    from ..core.enumeration import class_representatives
    from ..errors import DiscriminantError

    D = validate_discriminant(D)
    if D > 0:
        raise DiscriminantError(f"class_lattice_total is for negative discriminants, not {D}")
    X = as_int(X, "X")
    if X < 0:
        raise FormkitError(f"the bound X must be ≥ 0, not {X}")
    forms = list(class_representatives(D))
    h = len(forms)
    count = sum(_count_reduced(*reduced(f).coefficients, X) for f in forms)

    import mpmath

    def main():
        return h * 2 * mpmath.pi * X / mpmath.sqrt(-D)

    m = _mp_checked(main, digits)
    with mpmath.workdps(digits):
        err = count - m
        est = count * mpmath.sqrt(-D) / (2 * mpmath.pi * X) if X else mpmath.mpf(0)
    return ClassLatticeTotal(D, X, h, unit_count(D), count, m, err, est, digits)


def l_value_at_one(D: object, *, digits: int = 20):
    """``L(1, χ_D)`` for the Kronecker character of a discriminant, from its period.

    ``χ_D(n) = (D/n)`` has period ``q = |D|`` and sums to 0 over a period, so
    ``L(1, χ_D) = −(1/q)·Σ_{a=1}^{q} χ_D(a)·ψ(a/q)`` with ``ψ`` the digamma function
    (from ``L(s, χ) = q^{−s} Σ χ(a) ζ(s, a/q)`` at ``s = 1``).  Costs ``O(|D|)`` digamma
    values, so meant for ``|D|`` up to about 10^5.  Computed at two precisions and
    checked.  Independent of the class group: with Dirichlet's formula it gives
    ``h = w√|D|·L(1, χ_D)/(2π)`` for ``D < 0``.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a discriminant.
    FormkitError
        If ``|D| > 10^6`` (too slow this way).

    Examples
    --------
    >>> import mpmath
    >>> L = l_value_at_one(-4)                 # Leibniz: 1 − 1/3 + 1/5 − … = π/4
    >>> abs(L - mpmath.pi / 4) < 1e-14
    True
    >>> round(float(2 * mpmath.sqrt(23) * l_value_at_one(-23) / (2 * mpmath.pi)), 12)
    3.0
    """
    D = validate_discriminant(D)
    q = abs(D)
    if q > 10**6:
        raise FormkitError(f"l_value_at_one sums over a period of length |D|; {D} is too large (|D| ≤ 10^6)")
    chi = [kronecker(D, a) for a in range(q + 1)]

    import mpmath

    def value():
        s = mpmath.mpf(0)
        for a in range(1, q):
            if chi[a]:
                s += chi[a] * mpmath.digamma(mpmath.mpf(a) / q)
        return -s / q

    return _mp_checked(value, digits)
