"""Number fields ``Q[x]/(g)`` for Hecke eigenvalues: arithmetic, traces, change of generator.

The eigenvalues of the Hecke operators on theta series
(:mod:`formkit.classgroups.hecke_theta`) lie in number fields ``K = Q[x]/(g)``, ``g`` a
monic irreducible factor of a characteristic polynomial.  This module holds the little
arithmetic needed there, exactly, on python-flint's rational polynomials (``fmpq_poly``):
reduction modulo ``g``, inverses by the extended Euclidean algorithm, the trace
``Tr_{K/Q}`` as the trace of the multiplication matrix (the companion matrix of ``g``),
coordinates on the power basis, a change of primitive element (the minimal polynomial of
``λ ∈ K`` from the powers ``1, λ, …, λ^d`` when they span ``K``), and the text of a
polynomial.  (Standard linear algebra over ``Q``; Cohen, GTM 138, §4.1–4.3, from memory.)

The names are private (the public results are those of :mod:`~formkit.classgroups.hecke_theta`).

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §4.1–4.3 (number fields given by a polynomial, traces, the minimal
       polynomial of an element).
"""

from __future__ import annotations

from fractions import Fraction
from typing import Any

__all__: list[str] = []


def _poly_list(p) -> tuple[Fraction, ...]:
    """Coefficients (constant first) of an fmpq_poly as Fractions."""
    return tuple(Fraction(int(c.p), int(c.q)) for c in p.coeffs())


def _poly_text(coeffs: tuple[Fraction, ...], var: str = "x") -> str:
    """``x^2 - x - 1`` from constant-first coefficients."""
    terms = []
    for k in range(len(coeffs) - 1, -1, -1):
        c = coeffs[k]
        if c == 0:
            continue
        sign = "-" if c < 0 else "+"
        a = abs(c)
        mono = "" if k == 0 else (var if k == 1 else f"{var}^{k}")
        body = str(a) if (a != 1 or k == 0) else ""
        if body and mono:
            body = f"{body}*{mono}" if "/" not in body else f"({body})*{mono}"
        elif mono:
            body = mono
        terms.append((sign, body))
    if not terms:
        return "0"
    out = ("-" if terms[0][0] == "-" else "") + terms[0][1]
    for sign, body in terms[1:]:
        out += f" {sign} {body}"
    return out


class _Field:
    """``Q[x]/(g)`` for a monic irreducible ``g`` (``deg g = 1``: the rationals)."""

    def __init__(self, g) -> None:
        from flint import fmpq_mat

        self.g = g
        self.degree = g.degree()
        d = self.degree
        # the companion matrix: multiplication by x on 1, x, …, x^(d−1)
        c = list(g.coeffs())
        rows: list[list[Any]] = [[0] * d for _ in range(d)]
        for i in range(d - 1):
            rows[i + 1][i] = 1
        for i in range(d):
            rows[i][d - 1] = -c[i]
        # row vector convention: (coordinates of p)·C = coordinates of x·p
        self._companion = fmpq_mat(d, d, [v for row in rows for v in row]).transpose()

    def reduce(self, p):
        return p % self.g

    def inverse(self, p):
        d, u, _v = p.xgcd(self.g)
        if d.degree() != 0:  # pragma: no cover - g irreducible and p ≢ 0
            raise ArithmeticError("not invertible in the number field")
        return self.reduce(u / d[0])

    def trace(self, p) -> Fraction:
        """``Tr_{K/Q}(p(α))``: the trace of ``p`` at the companion matrix."""
        from flint import fmpq_mat

        d = self.degree
        M = fmpq_mat(d, d)
        P = fmpq_mat(d, d, [1 if i == j else 0 for i in range(d) for j in range(d)])
        for c in p.coeffs():
            M += P * c
            P = P * self._companion
        return sum((Fraction(int(M[i, i].p), int(M[i, i].q)) for i in range(d)), Fraction(0))

    def coordinates(self, p) -> list:
        """The coordinates of ``p(α)`` on ``1, α, …, α^(d−1)`` (fmpq)."""
        from flint import fmpq

        c = list(self.reduce(p).coeffs())
        return c + [fmpq(0)] * (self.degree - len(c))

    def rebased(self, lam):
        """``(Q[y]/(m), convert)`` with ``y ↦ lam`` when ``lam`` generates ``K``, else ``None``.

        ``m`` is the minimal polynomial of ``lam``; ``convert`` maps an element of this
        field to the fmpq_poly in ``y`` with the same value.
        """
        from flint import fmpq_mat, fmpq_poly

        d = self.degree
        rows = []
        power = fmpq_poly(1)
        for _k in range(d):
            rows.append(self.coordinates(power))
            power = self.reduce(power * lam)
        L = fmpq_mat(d, d, [v for row in rows for v in row])
        if L.rank() < d:
            return None
        Linv = L.inv()
        last = fmpq_mat(1, d, self.coordinates(power)) * Linv  # lam^d on 1, lam, …, lam^(d−1)
        m = fmpq_poly([-last[0, k] for k in range(d)] + [1])

        def convert(beta):
            c = fmpq_mat(1, d, self.coordinates(beta)) * Linv
            return fmpq_poly([c[0, k] for k in range(d)])

        return _Field(m), convert

    def polynomial(self) -> tuple[Fraction, ...]:
        return _poly_list(self.g)

    def element(self, p) -> tuple[Fraction, ...]:
        out = _poly_list(self.reduce(p))
        return out + (Fraction(0),) * (self.degree - len(out)) if self.degree > 1 else (out or (Fraction(0),))
