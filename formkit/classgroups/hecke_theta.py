"""Hecke operators on the theta series of a negative discriminant; the cusp part in eigenforms.

For ``D < 0`` the theta series ``θ_C = Σ r_C(n)qⁿ`` of the classes ``C`` of primitive
positive definite forms of discriminant ``D`` are modular forms of weight 1 on
``Γ₀(|D|)`` with character ``χ_D`` (Hecke; :mod:`formkit.analytic.theta_series`).  For a
prime ``p ∤ D`` the Hecke operator of weight 1 is

    (T_p f)(n) = a(pn) + χ_D(p)·a(n/p)        (a(n/p) = 0 unless p | n)

(Diamond–Shurman, *A First Course in Modular Forms*, Prop. 5.3.1, from memory), and for
``p | D`` the operator ``U_p: a(n) ↦ a(pn)`` (same formula with ``χ_D(p) = 0``), used for
the primes ``p | D`` up to 60 where it preserves the span — it separates eigenforms that
are twists of each other by a genus character and so share every ``T_p``, ``p ∤ D``.  This
module computes everything from the q-expansions, exactly:

* the span ``V`` of the ``θ_C`` and its subspace ``S`` spanned by the cusp parts
  ``θ_C − θ_{G(C)}`` (``θ_G`` Siegel's genus average, :mod:`formkit.classgroups.genus_theta`;
  ``θ_G`` is an Eisenstein series and ``θ_C − θ_G`` a cusp form by Siegel's theorem, so
  ``V = span{θ_G} ⊕ S``);
* the matrices of ``T_p`` on bases of ``V`` and ``S`` (rational), found from the first
  coefficients and *proved* by **Sturm's bound**: a form in ``M_1(Γ₀(N), χ)`` whose
  coefficients ``a(0), …, a(B)`` vanish, ``B = ⌊m/12⌋``, ``m = N·∏_{p|N}(1 + 1/p)`` the
  index of ``Γ₀(N)``, is zero (Sturm 1987; from memory).  So ``T_p b_i = Σ_j c_ij b_j``
  checked on ``a(0..B)`` holds as an identity of modular forms; if it fails the span is
  reported not Hecke-stable (an error: it would contradict the theory);
* their characteristic polynomials (exact, factored over ``Q`` with python-flint);
* the simultaneous eigenvectors in ``S``: a combination ``T = Σ k_p T_p`` with a
  squarefree characteristic polynomial ``χ_T`` is diagonalised over the number fields
  ``K = Q[x]/(g)`` of its irreducible factors ``g`` — a left eigenvector for the root
  ``α`` is ``e_j·q(T)`` with ``q(x) = χ_T(x)/(x − α) ∈ K[x]``, and each ``T_p`` preserves
  the line (it commutes with ``T``).  The eigenvalue of every ``T_p`` is read off and
  *checked* exactly in ``K``.  Eigenspaces that no such ``T`` splits (old forms, for
  non-fundamental ``D``) are reported with their polynomials, unsplit;
* the cusp part ``θ_Q − θ_G`` as ``Σ_f Tr_{K_f/Q}(c_f·f)`` over the eigenforms ``f``
  (normalised to ``a(n₀) = 1`` at their first non-zero coefficient, usually ``n₀ = 1``),
  with ``c_f`` from the right eigenvectors; the sum is checked coefficient by
  coefficient up to ``q^N``.

For fundamental ``D`` the eigenforms are ``Σ_{𝔞} ψ(𝔞)q^{N𝔞}`` for the class group
characters ``ψ ≠ ψ̄`` up to conjugation, the genus characters giving the Eisenstein part
(Hecke; Zagier, *Zetafunktionen und quadratische Körper*, §12, from memory); that is a
test here, not an input.  The classes come from complete enumeration (unconditional).

References
----------
.. [1] E. Hecke, "Zur Theorie der elliptischen Modulfunktionen", Math. Ann. 97 (1927)
       (theta series of binary forms and Hecke operators; from memory).
.. [2] J. Sturm, "On the congruence of modular forms", in *Number Theory (New York
       1984–85)*, LNM 1240, Springer 1987, 275–280.
.. [3] F. Diamond, J. Shurman, *A First Course in Modular Forms*, GTM 228, Springer
       2005, §5.2–5.3 (Hecke operators with character).
.. [4] H. Cohen, F. Strömberg, *Modular Forms: A Classical Approach*, GSM 179, AMS
       2017, Cor. 5.6.14 (Sturm's bound with character; from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from fractions import Fraction
from typing import Any

from ..analytic.theta_series import theta_series
from ..core.arith import as_int, kronecker
from ..core.displays import SentenceDisplay
from ..core.factorisation import prime_factorisation
from ..core.forms import Form, FormLike, as_form
from ..core.reduction import reduced
from ..errors import DiscriminantError, FormError, FormkitError
from .genus import genera
from .hecke_operators import _factor_list, _hecke_matrix, _independent, _NotStable
from .hecke_operators import sturm_bound as sturm_bound
from .number_fields import _Field, _poly_list, _poly_text

# sturm_bound is defined in hecke_operators and stays importable from here
__all__ = [
    "MAX_HECKE_DISCRIMINANT",
    "HeckeEigenform",
    "HeckeDecomposition",
    "hecke_decomposition",
]

#: The largest ``|D|`` accepted (the q-expansions go to ``p·B ≈ p·|D|/8``).
MAX_HECKE_DISCRIMINANT = 20_000

#: Primes ``p ∤ D`` tried for the Hecke operators, at most this many.
_PRIME_COUNT = 8

#: The operators ``U_p`` (``p | D``) are tried for the primes up to this bound.
_RAMIFIED_LIMIT = 60


# ---------------------------------------------------------------------------------------
# results
# ---------------------------------------------------------------------------------------


def _elt_text(elt: tuple[Fraction, ...], var: str = "a") -> str:
    return _poly_text(elt, var)


@dataclass(frozen=True, eq=False)
class HeckeEigenform(SentenceDisplay):
    """A simultaneous eigenform of the ``T_p`` (``p ∤ D``) in the cusp span, over ``K = Q(a)``.

    ``field_polynomial`` is the minimal polynomial ``g`` of ``a`` (constant coefficient
    first; degree 1 means the coefficients are rational); every number below is an
    element of ``K`` written as its coefficients on ``1, a, a², …``.
    ``coefficients[n]`` is the coefficient of ``qⁿ`` (normalised to 1 at ``n = normalised_at``),
    ``eigenvalues[p]`` the eigenvalue of ``T_p`` (exact, checked), and ``component`` the
    ``c`` with ``θ_Q − θ_G = Σ_f Tr_{K_f/Q}(c_f·f)``.
    """

    field_polynomial: tuple[Fraction, ...]
    coefficients: tuple[tuple[Fraction, ...], ...]
    eigenvalues: dict[int, tuple[Fraction, ...]]
    normalised_at: int
    component: tuple[Fraction, ...]

    def _display_sentence(self) -> str:
        return repr(self)

    def _display_provenance(self) -> str:
        return "Hecke eigenvalues exact and checked; Sturm's bound proves the operators"

    @property
    def degree(self) -> int:
        """``[K : Q]``."""
        return len(self.field_polynomial) - 1

    @property
    def component_text(self) -> str:
        """``c_f`` as text in ``a``."""
        return _elt_text(self.component)

    def coefficient_text(self, n: int) -> str:
        """The coefficient of ``qⁿ`` as text in ``a``."""
        return _elt_text(self.coefficients[n])

    def to_dict(self) -> dict:
        """JSON-ready dictionary (rationals as ``"p/q"`` strings)."""

        def js(e: tuple[Fraction, ...]) -> list[str]:
            return [str(v) for v in e]

        return {
            "field_polynomial": js(self.field_polynomial),
            "field_polynomial_text": _poly_text(self.field_polynomial),
            "normalised_at": self.normalised_at,
            "coefficients": [js(c) for c in self.coefficients],
            "eigenvalues": {str(p): js(v) for p, v in self.eigenvalues.items()},
            "component": js(self.component),
            "component_text": _elt_text(self.component),
        }

    def __repr__(self) -> str:
        field_ = "Q" if self.degree == 1 else f"Q(a), {_poly_text(self.field_polynomial, 'a')} = 0"
        head = ", ".join(self.coefficient_text(n) for n in range(min(8, len(self.coefficients))))
        return f"HeckeEigenform(over {field_}: [{head}, …])"


@dataclass(frozen=True, eq=False)
class HeckeDecomposition:
    """The Hecke operators on the theta series of ``D`` and the cusp part of ``θ_Q`` in eigenforms.

    ``hecke_polynomials[p]`` is the factored characteristic polynomial of ``T_p`` (``U_p``
    for ``p | D``) on the
    cusp span ``S`` (pairs ``(coefficients, multiplicity)``), ``span_polynomials[p]`` on the
    span ``V`` of all ``θ_C``; ``unsplit`` lists the factors of the combined operator whose
    eigenspaces the primes used do not separate (their eigenforms are not given);
    ``reconstructs`` says whether ``Σ_f Tr(c_f·f)`` equals the cusp part up to ``q^bound``
    (``None`` when some part is unsplit).
    """

    form: Form
    discriminant: int
    bound: int
    sturm_bound: int
    primes: tuple[int, ...]
    span_dimension: int
    cusp_dimension: int
    span_polynomials: dict[int, tuple]
    hecke_polynomials: dict[int, tuple]
    eigenforms: tuple[HeckeEigenform, ...]
    unsplit: tuple
    cusp_part: tuple[Fraction, ...]
    reconstructs: bool | None
    provenance: str = field(default="")

    def to_dict(self, limit: int = 30) -> dict:
        """JSON-ready dictionary; the first ``limit + 1`` coefficients of each series."""
        m = min(self.bound, limit)

        def polys(d: dict) -> dict:
            return {
                str(p): [
                    {"factor": [str(c) for c in g], "text": _poly_text(g), "multiplicity": e} for g, e in f
                ]
                for p, f in d.items()
            }

        forms = []
        for f in self.eigenforms:
            d = f.to_dict()
            d["coefficients"] = d["coefficients"][: m + 1]
            forms.append(d)
        return {
            "form": self.form.to_list(),
            "discriminant": self.discriminant,
            "bound": self.bound,
            "sturm_bound": self.sturm_bound,
            "primes": list(self.primes),
            "span_dimension": self.span_dimension,
            "cusp_dimension": self.cusp_dimension,
            "span_polynomials": polys(self.span_polynomials),
            "hecke_polynomials": polys(self.hecke_polynomials),
            "eigenforms": forms,
            "unsplit": [
                {"factor": [str(c) for c in g], "text": _poly_text(g), "multiplicity": e}
                for g, e in self.unsplit
            ],
            "cusp_part": [str(c) for c in self.cusp_part[: m + 1]],
            "reconstructs": self.reconstructs,
            "provenance": self.provenance,
        }

    def __repr__(self) -> str:
        return (
            f"HeckeDecomposition(Q=({self.form.a}, {self.form.b}, {self.form.c}), D={self.discriminant}: cusp span of dimension "
            f"{self.cusp_dimension}, {len(self.eigenforms)} eigenform(s) over fields of degrees "
            f"{[f.degree for f in self.eigenforms]}, reconstructs: {self.reconstructs}; {self.provenance})"
        )

    def _repr_html_(self) -> str:
        rows = "".join(
            f"<li>over Q(a), {_poly_text(f.field_polynomial, 'a')} = 0: "
            f"<code>{', '.join(f.coefficient_text(n) for n in range(min(10, len(f.coefficients))))}, …</code>; "
            f"component {_elt_text(f.component)}</li>"
            for f in self.eigenforms
        )
        return (
            f"<p>θ<sub>Q</sub> − θ<sub>genus</sub> for Q = ({self.form.a}, {self.form.b}, {self.form.c}) in Hecke eigenforms "
            f"(T_p, p ∈ {list(self.primes)}; proved by Sturm's bound B = {self.sturm_bound}):</p><ul>{rows}</ul>"
            f"<p><small>{self.provenance}</small></p>"
        )

    def _repr_latex_(self) -> str:
        return (
            rf"$\theta_Q - \theta_{{\mathrm{{gen}}}} = \sum_f \operatorname{{Tr}}(c_f f)$ over "
            rf"{len(self.eigenforms)} eigenforms \quad(\text{{{self.provenance}}})"
        )


# ---------------------------------------------------------------------------------------
# the computation
# ---------------------------------------------------------------------------------------


def _check(form: FormLike, bound: object) -> tuple[Form, int]:
    Q = as_form(form)
    if not (Q.is_positive_definite and Q.is_primitive):
        raise FormError(
            f"the theta series of a class are taken among primitive positive definite forms; {Q!r} is not one"
        )
    D = Q.discriminant
    if -D > MAX_HECKE_DISCRIMINANT:
        raise DiscriminantError(
            f"the Hecke operators are computed on q-expansions to about 20·|D|/12 terms; "
            f"|D| ≤ {MAX_HECKE_DISCRIMINANT}, not {-D}"
        )
    N = as_int(bound, "bound")
    if not 0 <= N <= 10**5:
        raise FormkitError(f"bound must lie in [0, 100000], not {N}")
    return Q, N


def _class_key(f: Form) -> tuple[int, int, int]:
    """θ of (a, b, c) and of its inverse (a, −b, c) agree: one key for both."""
    g = reduced(as_form((f.a, abs(f.b), f.c)))
    h = reduced(as_form((f.a, -abs(f.b), f.c)))
    return min(g.coefficients, h.coefficients)


def _eigenvector(K: _Field, q: list, powers: list, j: int, right: bool) -> list:
    """Row ``j`` (left eigenvector) or column ``j`` (right) of ``q(C) = Σ_k q_k·C^k`` over ``K``."""
    from flint import fmpq_poly

    r = powers[0].nrows()
    return [
        K.reduce(
            sum((q[k] * (powers[k][i, j] if right else powers[k][j, i]) for k in range(len(q))), fmpq_poly(0))
        )
        for i in range(r)
    ]


def _eigen_split(C_total, matrices: dict[int, Any], r: int):
    """Split by a squarefree factor of the characteristic polynomial of ``C_total``."""
    from flint import fmpq_mat, fmpq_poly

    chi = C_total.charpoly()
    found = []
    unsplit = []
    for g, e in chi.factor()[1]:
        g = g / g.leading_coefficient()  # monic
        if e > 1:
            unsplit.append((_poly_list(g), int(e)))
            continue
        K = _Field(g)
        # q(x) = χ(x)/(x − α) over K, by synthetic division
        c = list(chi.coeffs())
        n = len(c) - 1
        alpha = fmpq_poly([0, 1]) % g
        q = [fmpq_poly(0)] * n
        q[n - 1] = fmpq_poly([c[n]])
        for k in range(n - 1, 0, -1):
            q[k - 1] = K.reduce(fmpq_poly([c[k]]) + alpha * q[k])
        powers = [fmpq_mat(r, r, [1 if i == j else 0 for i in range(r) for j in range(r)])]
        for _k in range(1, n):
            powers.append(powers[-1] * C_total)

        v = next(
            vv
            for vv in (_eigenvector(K, q, powers, j, False) for j in range(r))
            if any(not x.is_zero() for x in vv)
        )
        u = next(
            uu
            for uu in (_eigenvector(K, q, powers, j, True) for j in range(r))
            if any(not x.is_zero() for x in uu)
        )
        # eigenvalues of each T_p, checked on every coordinate
        i0 = next(i for i in range(r) if not v[i].is_zero())
        eig = {}
        for p, Cp in matrices.items():
            vp = [K.reduce(sum((v[i] * Cp[i, j] for i in range(r)), fmpq_poly(0))) for j in range(r)]
            lam = K.reduce(vp[i0] * K.inverse(v[i0]))
            if any(not K.reduce(vp[j] - lam * v[j]).is_zero() for j in range(r)):
                raise ArithmeticError(
                    f"eigenvector of the combined operator is not one of T_{p}"
                )  # pragma: no cover
            eig[p] = lam
        found.append((K, v, u, eig))
    return found, unsplit


def hecke_decomposition(
    form: FormLike, bound: object = 30, *, primes: int = _PRIME_COUNT
) -> HeckeDecomposition:
    """The Hecke operators on the theta series of ``D = disc(Q) < 0`` and ``θ_Q − θ_G`` in eigenforms.

    Parameters
    ----------
    form : FormLike
        A primitive positive definite form ``Q`` (``|D| ≤ 20000``).
    bound : int
        The eigenforms and the cusp part are given up to ``q^bound`` (at most 10^5).
    primes : int
        How many primes ``p ∤ D`` (the smallest) define the Hecke operators (default 8).

    Returns
    -------
    HeckeDecomposition

    Raises
    ------
    FormError
        If ``Q`` is not primitive positive definite.
    DiscriminantError
        If ``|D| > 20000``.

    Examples
    --------
    >>> h = hecke_decomposition((1, 1, 6), 10)      # D = −23: one cusp form, η(z)η(23z)
    >>> f, = h.eigenforms
    >>> [f.coefficient_text(n) for n in range(1, 9)], f.component_text
    ... # doctest: +NORMALIZE_WHITESPACE
    (['1', '-1', '-1', '0', '0', '1', '0', '1'], '4/3')
    >>> h.hecke_polynomials[2][0][0], h.reconstructs        # T_2 has eigenvalue −1: x + 1
    ((Fraction(1, 1), Fraction(1, 1)), True)
    """
    from flint import fmpq, fmpq_mat

    Q, N = _check(form, bound)
    D = Q.discriminant
    count = as_int(primes, "primes")
    if not 1 <= count <= 30:
        raise FormkitError(f"primes must lie in [1, 30], not {count}")
    B = sturm_bound(D)
    ps: list[int] = []
    p = 2
    while len(ps) < count:
        if D % p and all(p % q for q in range(2, math.isqrt(p) + 1)):
            ps.append(p)
        p += 1
    # U_p = T_p for the primes p | D up to _RAMIFIED_LIMIT: they separate twins (forms whose T_p, p ∤ D,
    # agree: twists of each other by a genus character); kept only where they preserve the span
    ramified = [q for q in sorted(prime_factorisation(-D)) if q <= _RAMIFIED_LIMIT]
    M = max(N, max(ps + ramified) * B + B, B)
    P = genera(D)
    # one θ per class up to inversion; its genus average
    keyed: dict[tuple[int, int, int], tuple[list[int], Any]] = {}
    genus_of: dict[tuple[int, int, int], int] = {}
    averages = []
    for gi, G in enumerate(P):
        thetas = []
        for f in G.forms:
            k = _class_key(f)
            th = [int(v) for v in theta_series(f, M).coefficients]
            thetas.append(th)
            keyed.setdefault(k, (th, gi))
            genus_of[k] = gi
        # Siegel's average: all |Aut| equal for primitive forms of one D (module genus_theta)
        averages.append([fmpq(sum(t[n] for t in thetas), len(thetas)) for n in range(M + 1)])
    keys = sorted(keyed)
    span_rows = [[fmpq(v) for v in keyed[k][0]] for k in keys]
    cusp_rows = [[keyed[k][0][n] - averages[keyed[k][1]][n] for n in range(M + 1)] for k in keys]

    def operators(rows: list[list[Any]]):
        idx, piv = _independent(rows, B)
        basis = [rows[i] for i in idx]
        mats = {p: _hecke_matrix(basis, piv, p, kronecker(D, p), B) for p in ps}
        for q in ramified:
            try:
                mats[q] = _hecke_matrix(basis, piv, q, 0, B)
            except _NotStable:
                continue
        return basis, piv, mats

    span_basis, _span_piv, span_mats = operators(span_rows)
    basis, piv, mats = operators(cusp_rows)
    r = len(basis)
    hecke_polys = {p: _factor_list(C.charpoly()) for p, C in mats.items()} if r else {}
    span_polys = {p: _factor_list(C.charpoly()) for p, C in span_mats.items()}
    kQ = _class_key(reduced(Q))
    target = cusp_rows[keys.index(kQ)]
    show = N
    eigenforms: list[HeckeEigenform] = []
    unsplit: tuple = ()
    reconstructs: bool | None = True
    if r:
        # coordinates of the cusp part of Q in the basis
        A = fmpq_mat(r, r, [basis[j][pv] for j in range(r) for pv in piv])
        x = fmpq_mat(1, r, [target[pv] for pv in piv]) * A.inv()
        best: tuple = ()
        used = sorted(mats)
        for weights in ([1] * len(used), list(range(1, len(used) + 1)), [3**i for i in range(len(used))]):
            C_total = fmpq_mat(r, r)
            for w, p in zip(weights, used):
                C_total += mats[p] * w
            found, rest = _eigen_split(C_total, mats, r)
            if not best or len(rest) < len(best[1]):
                best = (found, rest)
            if not rest:
                break
        found, rest = best
        unsplit = tuple(rest)
        approx = [Fraction(0)] * (show + 1)
        exact = [Fraction(int(v.p), int(v.q)) for v in target[: show + 1]]
        for K, v, u, eig in found:
            from flint import fmpq_poly

            series = [
                K.reduce(sum((v[i] * basis[i][n] for i in range(r)), fmpq_poly(0))) for n in range(show + 1)
            ]
            full = [K.reduce(sum((v[i] * basis[i][n] for i in range(r)), fmpq_poly(0))) for n in range(M + 1)]
            n0 = next(n for n in range(M + 1) if not full[n].is_zero())
            scale = full[n0]
            inv = K.inverse(scale)
            # component along v: (x·u)/(v·u), then times a(n0) for the normalised form
            xu = K.reduce(sum((u[i] * x[0, i] for i in range(r)), fmpq_poly(0)))
            vu = K.reduce(sum((u[i] * v[i] for i in range(r)), fmpq_poly(0)))
            comp = K.reduce(xu * K.inverse(vu) * scale)
            normal = [K.reduce(s * inv) for s in series]
            for n in range(show + 1):
                approx[n] += K.trace(K.reduce(comp * normal[n]))
            # write the field as Q(λ_p) for the first Hecke eigenvalue that generates it
            K2, convert = K, (lambda beta: beta)
            if K.degree > 1:
                for p in [q for q in ps if q in eig] + [q for q in sorted(eig) if q not in ps]:
                    got = K.rebased(eig[p])
                    if got is not None:
                        K2, convert = got
                        break
            eigenforms.append(
                HeckeEigenform(
                    K2.polynomial(),
                    tuple(K2.element(convert(c)) for c in normal),
                    {p: K2.element(convert(lam)) for p, lam in eig.items()},
                    n0,
                    K2.element(convert(comp)),
                )
            )
        reconstructs = None if unsplit else approx == exact
    return HeckeDecomposition(
        Q,
        D,
        N,
        B,
        tuple(sorted(mats)) if r else tuple(ps),
        len(span_basis),
        r,
        span_polys,
        hecke_polys,
        tuple(eigenforms),
        unsplit,
        tuple(Fraction(int(v.p), int(v.q)) for v in target[: show + 1]),
        reconstructs,
        (
            f"classes by complete enumeration (unconditional); T_p on q-expansions, the matrices proved by "
            f"Sturm's bound B = {B}"
        ),
    )
