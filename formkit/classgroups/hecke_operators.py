"""Hecke operators on q-expansions of weight 1: their matrices on a span, proved by Sturm's bound.

For theta series of a discriminant ``D < 0`` (modular forms of weight 1 on ``Γ₀(|D|)``
with character ``χ_D``) the Hecke operator at a prime ``p ∤ D`` acts on coefficients by

    (T_p f)(n) = a(pn) + χ_D(p)·a(n/p)        (a(n/p) = 0 unless p | n),

and ``U_p: a(n) ↦ a(pn)`` at ``p | D`` (Diamond–Shurman, *A First Course in Modular Forms*,
Prop. 5.3.1, from memory).  Given a basis of a span of q-expansions, the matrix of ``T_p``
is found from the coefficients at the pivot columns and checked on ``a(0), …, a(B)``,
``B`` **Sturm's bound** (:func:`sturm_bound`): a form in ``M_1(Γ₀(N), χ)`` whose first
``B + 1`` coefficients vanish is zero (Sturm 1987; Cohen–Strömberg Cor. 5.6.14, from
memory), so the checked relation is an identity of modular forms.  Used by
:mod:`formkit.classgroups.hecke_theta`.

References
----------
.. [1] J. Sturm, "On the congruence of modular forms", in *Number Theory (New York
       1984–85)*, LNM 1240, Springer 1987, 275–280.
.. [2] F. Diamond, J. Shurman, *A First Course in Modular Forms*, GTM 228, Springer
       2005, §5.2–5.3 (Hecke operators with character).
.. [3] H. Cohen, F. Strömberg, *Modular Forms: A Classical Approach*, GSM 179, AMS
       2017, Cor. 5.6.14 (Sturm's bound with character; from memory).
"""

from __future__ import annotations

from fractions import Fraction
from typing import Any

from ..core.discriminants import validate_discriminant
from ..core.factorisation import prime_factorisation
from .number_fields import _poly_list

__all__ = ["sturm_bound"]


class _NotStable(Exception):
    """``U_p`` (``p | D``) does not preserve the span: it is then left out."""


def sturm_bound(D: object) -> int:
    """``B = ⌊m/12⌋``, ``m = |D|·∏_{p | D}(1 + 1/p)``: weight-1 forms on ``Γ₀(|D|)`` are fixed by ``a(0..B)``.

    Examples
    --------
    >>> sturm_bound(-23), sturm_bound(-4)          # m = 24 and 6
    (2, 0)
    """
    D = validate_discriminant(D)
    N = abs(D)
    m = N
    for p in prime_factorisation(N) if N > 1 else ():
        m = m // p * (p + 1)
    return m // 12


def _independent(rows: list[list[int]], upto: int) -> tuple[list[int], list[int]]:
    """Indices of a maximal independent subset of ``rows`` (first ``upto + 1`` entries) and pivots."""
    from flint import fmpq_mat

    chosen: list[int] = []
    rank = 0
    for i, _r in enumerate(rows):
        trial = chosen + [i]
        M = fmpq_mat(len(trial), upto + 1, [rows[k][n] for k in trial for n in range(upto + 1)])
        if M.rank() > rank:
            chosen, rank = trial, rank + 1
    if not chosen:
        return [], []
    M = fmpq_mat(len(chosen), upto + 1, [rows[k][n] for k in chosen for n in range(upto + 1)])
    R, _rk = M.rref()
    pivots = []
    for i in range(len(chosen)):
        j = next(j for j in range(upto + 1) if R[i, j] != 0)
        pivots.append(j)
    return chosen, pivots


def _hecke_matrix(basis: list[list[Any]], pivots: list[int], p: int, chi_p: int, B: int):
    """The rational matrix ``C`` with ``T_p b_i = Σ_j C_ij b_j``, checked on ``a(0..B)``."""
    from flint import fmpq, fmpq_mat

    r = len(basis)
    A = fmpq_mat(r, r, [basis[j][pv] for j in range(r) for pv in pivots])  # A[j, k] = b_j(pivot_k)
    Ainv = A.inv()
    out = []
    for b in basis:
        t = [b[p * n] + (chi_p * b[n // p] if n % p == 0 else 0) for n in range(B + 1)]
        rhs = fmpq_mat(1, r, [t[pv] for pv in pivots])
        c = rhs * Ainv
        for n in range(B + 1):
            if sum((c[0, j] * basis[j][n] for j in range(r)), fmpq(0)) != t[n]:
                if chi_p == 0:
                    raise _NotStable(p)
                raise ArithmeticError(
                    f"T_{p} does not preserve the span of the theta series (checked to q^{B}): "
                    "this contradicts Hecke's theory; please report it"
                )
        out.append([c[0, j] for j in range(r)])
    return fmpq_mat(r, r, [v for row in out for v in row])


def _factor_list(poly) -> tuple[tuple[tuple[Fraction, ...], int], ...]:
    _content, fac = poly.factor()
    return tuple((_poly_list(g), int(e)) for g, e in fac)
