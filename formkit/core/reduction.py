"""Reduction of binary quadratic forms, definite and indefinite, with matrices and traces.

*Definite forms.*  A positive definite form ``(a, b, c)`` is reduced when
``|b| ≤ a ≤ c`` and ``b ≥ 0`` whenever ``|b| = a`` or ``a = c``; every positive
definite form is properly equivalent to exactly one reduced form (Gauss; Lagrange's
algorithm, Cohen GTM 138 Algorithm 5.4.2).  A negative definite form ``Q`` is reduced
when ``−Q`` is, and is reduced through ``−Q``.

*Indefinite forms* (non-square ``D > 0``).  ``(a, b, c)`` is reduced when
``0 < b < √D`` and ``√D − b < 2|a| < √D + b`` (Gauss).  The reduction operator ρ maps
``(a, b, c)`` to ``(c, b', (b'² − D)/4c)`` with ``b' ≡ −b (mod 2c)`` normalised into
``(−|c|, |c|]`` when ``|c| > √D`` and into ``(√D − 2|c|, √D)`` otherwise; its matrix
is ``[[0, −1], [1, t]]`` with ``b' = −b + 2ct``.  Iterating ρ reduces any form in a
number of steps logarithmic in its coefficients, and permutes the reduced forms of a
proper class in one cycle (Buchmann–Vollmer, *Binary Quadratic Forms*, §6.2–6.3,
Algorithm 6.1; Cohen GTM 138 §5.6.1).

All comparisons with √D are done exactly with ``s = ⌊√D⌋`` (√D is irrational).

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, Algorithm 5.4.2 and §5.6.
.. [2] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, Ch. 5–6.
.. [3] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Theorem 2.8.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from ..errors import FormError
from .arith import isqrt
from .displays import SentenceDisplay
from .forms import IDENTITY, Form, FormLike, Matrix, _require_nonsquare, as_form, mat_mul
from .raw_reduction import (
    REPRESENTATIVE_CYCLE_LIMIT,
    _cycle_representative_raw,
    _is_reduced_definite_raw,
    _is_reduced_indefinite_raw,
    _reduce_definite_raw,
    _reduce_indefinite_raw,
    _rho_indefinite_raw,
    _to_work,
)

__all__ = [
    "ReductionStep",
    "ReductionResult",
    "FormCycle",
    "is_reduced",
    "reduce_form",
    "reduced",
    "rho",
    "reduced_cycle",
    "class_representative",
]


@dataclass(frozen=True)
class ReductionStep:
    """One step of a reduction: ``after = before · matrix``.

    ``kind`` is ``'translate'`` (``[[1, k], [0, 1]]``, b changed modulo 2a),
    ``'swap'`` (``[[0, −1], [1, 0]]``, a and c exchanged), or ``'rho'`` (the
    indefinite reduction operator ``[[0, −1], [1, t]]``).
    """

    kind: str
    before: Form
    matrix: Matrix
    after: Form


@dataclass(frozen=True)
class ReductionResult(SentenceDisplay):
    """The outcome of :func:`reduce_form`: ``reduced == form · matrix``, ``matrix ∈ SL2(Z)``."""

    form: Form
    reduced: Form
    matrix: Matrix
    steps: tuple[ReductionStep, ...] = field(default=(), repr=False)

    def _display_sentence(self) -> str:
        return f"({self.form.a}, {self.form.b}, {self.form.c}) reduces to ({self.reduced.a}, {self.reduced.b}, {self.reduced.c}) by the matrix {self.matrix}"

    def _display_provenance(self) -> str:
        return "exact (Gauss reduction), checked by substitution"

    def to_dict(self) -> dict:
        """JSON-ready dictionary."""
        return {
            "form": self.form.to_list(),
            "discriminant": self.form.discriminant,
            "reduced": self.reduced.to_list(),
            "matrix": [list(r) for r in self.matrix],
        }


@dataclass(frozen=True)
class FormCycle(SentenceDisplay):
    """The cycle of reduced indefinite forms ``forms[0] → forms[1] → …`` under ρ.

    ``matrices[i]`` takes ``forms[i]`` to ``forms[i+1]`` (indices modulo the length);
    the product of all of them is an automorph of ``forms[0]``.
    """

    forms: tuple[Form, ...]
    matrices: tuple[Matrix, ...] = field(repr=False)

    def _display_sentence(self) -> str:
        return (
            f"a cycle of {len(self.forms)} reduced forms: "
            + ", ".join(f"({f.a}, {f.b}, {f.c})" for f in self.forms[:12])
            + (" …" if len(self.forms) > 12 else "")
        )

    def _display_provenance(self) -> str:
        return "exact (Gauss reduction of indefinite forms)"

    def __len__(self) -> int:
        return len(self.forms)

    def __iter__(self):
        return iter(self.forms)

    def __contains__(self, f: object) -> bool:
        return f in self.forms

    @property
    def length(self) -> int:
        """Number of reduced forms in the cycle."""
        return len(self.forms)


# ---------------------------------------------------------------------------
# public API


def is_reduced(form: FormLike) -> bool:
    """True if ``form`` is reduced (definite or indefinite, as defined above).

    Raises
    ------
    DiscriminantError
        If the discriminant is a square (including 0).

    Examples
    --------
    >>> is_reduced((2, 1, 3)), is_reduced((3, 1, 2)), is_reduced((1, 3, -1))
    (True, False, True)
    """
    f = as_form(form)
    D = _require_nonsquare(f, "reduction")
    if D < 0:
        return _is_reduced_definite_raw(f.a, f.b, f.c)
    return _is_reduced_indefinite_raw(f.a, f.b, int(isqrt(D)))


def reduce_form(form: FormLike, *, steps: bool = False) -> ReductionResult:
    """Reduce ``form`` and return the reduced form and the SL2(Z) matrix to it.

    Parameters
    ----------
    form : FormLike
        Any form of non-square discriminant (definite forms need not be primitive).
    steps : bool
        Record every step (kind, matrix, form after it) in ``result.steps``.

    Returns
    -------
    ReductionResult
        ``result.reduced == result.form.transform(result.matrix)``.  For definite forms
        the reduced form is the unique reduced form of the class; for indefinite ones
        it is the first reduced form reached (use :func:`reduced_cycle` for all).

    Raises
    ------
    DiscriminantError
        If the discriminant is a perfect square (the form factors over Q).

    Examples
    --------
    >>> r = reduce_form((10, 37, 35))
    >>> r.reduced, r.matrix
    (Form(1, 1, 8), ((-2, 1), (1, -1)))
    >>> Form(10, 37, 35).transform(r.matrix) == r.reduced
    True
    >>> reduce_form((1, 0, -7)).reduced
    Form(1, 4, -3)
    """
    f = as_form(form)
    D = _require_nonsquare(f, "reduction")
    if D < 0:
        return _reduce_definite(f, steps)
    return _reduce_indefinite(f, D, steps)


def reduced(form: FormLike) -> Form:
    """The reduced form of :func:`reduce_form`, without the matrix.

    Examples
    --------
    >>> reduced("5x^2 + 8xy + 4y^2")
    Form(1, 0, 4)
    """
    f = as_form(form)
    D = _require_nonsquare(f, "reduction")
    if D < 0:
        sign = 1 if f.a > 0 else -1
        a, b, c = _reduce_definite_raw(*_to_work(sign * f.a, sign * f.b, sign * f.c))
        return Form(sign * a, sign * b, sign * c)
    sq = isqrt(D)
    return Form(*(int(v) for v in _reduce_indefinite_raw(*_to_work(f.a, f.b, f.c, D, sq))))


def _reduce_definite(f: Form, record: bool) -> ReductionResult:
    sign = 1 if f.a > 0 else -1
    a, b, c = _to_work(sign * f.a, sign * f.b, sign * f.c)
    p, q, r, s = 1, 0, 0, 1
    trace: list[ReductionStep] = []

    def push(kind: str, m: Matrix, before: tuple, after: tuple) -> None:
        trace.append(
            ReductionStep(
                kind,
                Form(*(sign * int(v) for v in before)),
                m,
                Form(*(sign * int(v) for v in after)),
            )
        )

    while True:
        if not (-a < b <= a):
            a2 = 2 * a
            rr = b % a2
            if rr > a:
                rr -= a2
            k = (rr - b) // a2
            before = (a, b, c)
            c = a * k * k + b * k + c
            b = rr
            # M <- M · [[1, k], [0, 1]]
            q, s = p * k + q, r * k + s
            if record:
                push("translate", ((1, int(k)), (0, 1)), before, (a, b, c))
        if a > c or (a == c and b < 0):
            before = (a, b, c)
            a, b, c = c, -b, a
            # M <- M · [[0, -1], [1, 0]]
            p, q, r, s = q, -p, s, -r
            if record:
                push("swap", ((0, -1), (1, 0)), before, (a, b, c))
            continue
        break
    matrix = ((int(p), int(q)), (int(r), int(s)))
    red = Form(sign * int(a), sign * int(b), sign * int(c))
    return ReductionResult(f, red, matrix, tuple(trace))


def _reduce_indefinite(f: Form, D: int, record: bool) -> ReductionResult:
    a, b, c, Dz, sq = _to_work(f.a, f.b, f.c, D, isqrt(D))
    p, q, r, s = 1, 0, 0, 1
    trace: list[ReductionStep] = []
    while not _is_reduced_indefinite_raw(a, b, sq):
        before = (a, b, c)
        a, b, c, t = _rho_indefinite_raw(a, b, c, Dz, sq)
        # M <- M · [[0, -1], [1, t]]
        p, q, r, s = q, -p + t * q, s, -r + t * s
        if record:
            trace.append(
                ReductionStep("rho", Form(*before), ((0, -1), (1, int(t))), Form(int(a), int(b), int(c)))
            )
    matrix = ((int(p), int(q)), (int(r), int(s)))
    return ReductionResult(f, Form(int(a), int(b), int(c)), matrix, tuple(trace))


def rho(form: FormLike) -> tuple[Form, Matrix]:
    """One application of the reduction operator ρ to an indefinite form.

    Returns ``(ρ(form), M)`` with ``ρ(form) == form · M``.

    Raises
    ------
    FormError
        If the form is not indefinite.

    Examples
    --------
    >>> rho((1, 4, -1))
    (Form(-1, 4, 1), ((0, -1), (1, -4)))
    """
    f = as_form(form)
    D = _require_nonsquare(f, "the reduction operator")
    if D < 0:
        raise FormError(f"the reduction operator ρ is for indefinite forms; {f!r} has D = {D} < 0")
    a, b, c, t = _rho_indefinite_raw(*_to_work(f.a, f.b, f.c, D, isqrt(D)))
    return Form(int(a), int(b), int(c)), ((0, -1), (1, int(t)))


def reduced_cycle(form: FormLike, *, max_length: int | None = None) -> FormCycle:
    """The cycle of reduced forms properly equivalent to the indefinite ``form``.

    The form is reduced first; the cycle starts at that reduced form.  Every reduced
    form of the proper class occurs exactly once.

    Parameters
    ----------
    max_length : int, optional
        Stop with :class:`FormError` if the cycle is longer (cycles of |D| ≈ 10^k can
        have about 10^(k/2) forms).

    Examples
    --------
    >>> cyc = reduced_cycle((1, 0, -7))
    >>> cyc.forms
    (Form(1, 4, -3), Form(-3, 2, 2), Form(2, 2, -3), Form(-3, 4, 1))
    >>> len(cyc)
    4
    """
    f = as_form(form)
    D = _require_nonsquare(f, "a cycle of reduced forms")
    if D < 0:
        raise FormError(f"cycles of reduced forms are for indefinite forms; {f!r} has D = {D} < 0")
    start = _reduce_indefinite(f, D, False).reduced
    forms = [start]
    matrices: list[Matrix] = []
    a, b, c, Dz, sq = _to_work(start.a, start.b, start.c, D, isqrt(D))
    while True:
        a, b, c, t = _rho_indefinite_raw(a, b, c, Dz, sq)
        matrices.append(((0, -1), (1, int(t))))
        g = Form(int(a), int(b), int(c))
        if g == start:
            break
        forms.append(g)
        if max_length is not None and len(forms) > max_length:
            raise FormError(f"cycle of {start!r} is longer than max_length = {max_length}")
    return FormCycle(tuple(forms), tuple(matrices))


def class_representative(form: FormLike, *, max_length: int = REPRESENTATIVE_CYCLE_LIMIT) -> Form:
    """The canonical representative of the proper class of ``form``: one form per class.

    * ``D < 0``: the reduced form (Gauss: the unique reduced form of the class);
    * ``D > 0``: among the reduced forms of the class's ρ-cycle, the one with the least
      ``|a|``, positive ``a`` preferred, then the least ``b`` (unique: a cycle holds each
      reduced form once).  The principal class is represented by its form with ``a = 1``.

    This is the form listed by ``formkit group`` and
    :func:`formkit.core.enumeration.class_representatives`, the form returned by
    :func:`formkit.core.composition.compose` and :func:`~formkit.core.composition.power`,
    and the class element's form in :class:`formkit.classgroups.group.ClassGroup`.

    Parameters
    ----------
    form : FormLike
        A form of non-square discriminant.
    max_length : int
        D > 0: the longest cycle walked (default 2,000,000 forms, a few seconds).

    Returns
    -------
    Form

    Raises
    ------
    DiscriminantError
        If the discriminant is a perfect square.
    FormError
        If the cycle is longer than ``max_length``.

    Examples
    --------
    >>> class_representative((2, 3, 5)), class_representative((5, 4, 2))
    (Form(2, -1, 4), Form(2, 0, 3))
    >>> reduced((1, 0, -79)), class_representative((1, 0, -79))   # D = 316 = 4·79
    (Form(1, 16, -15), Form(1, 16, -15))
    >>> class_representative((-6, 14, 5))                         # the form group 316 lists
    Form(-3, 14, 10)

    References
    ----------
    Buchmann–Vollmer, *Binary Quadratic Forms*, §6.3 (cycles of reduced forms);
    Cohen GTM 138, Algorithm 5.4.2 (Gauss reduction).
    """
    f = as_form(form)
    D = _require_nonsquare(f, "a class representative")
    if D < 0:
        return reduced(f)
    r = reduced(f)
    sq = isqrt(D)
    a, b, c, Dz, sqz = _to_work(r.a, r.b, r.c, D, sq)
    rep = _cycle_representative_raw(a, b, c, Dz, sqz, max_length)
    if rep is None:
        raise FormError(
            f"the cycle of {r!r} has more than max_length = {max_length} reduced forms; "
            "no class representative chosen"
        )
    return Form(*rep)


def _cycle_product(cyc: FormCycle, upto: int | None = None) -> Matrix:
    m = IDENTITY
    for step in cyc.matrices[: upto if upto is not None else len(cyc.matrices)]:
        m = mat_mul(m, step)
    return m


def _cycle_prefix(start: Form, limit: int) -> tuple[list[Form], bool]:
    """The ρ-cycle of the reduced indefinite ``start``: (forms, complete?), at most ``limit``
    forms (``limit = 0``: no bound)."""
    D = start.discriminant
    forms = [start]
    a, b, c, Dz, sq = _to_work(start.a, start.b, start.c, D, isqrt(D))
    while True:
        a, b, c, _ = _rho_indefinite_raw(a, b, c, Dz, sq)
        g = Form(int(a), int(b), int(c))
        if g == start:
            return forms, True
        if limit and len(forms) >= limit:
            return forms, False
        forms.append(g)
