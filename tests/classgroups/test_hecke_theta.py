"""Hecke operators on the theta series of a discriminant, and the cusp part in eigenforms.

Outside references: η(z)η(23z) by its own product expansion (the classical identity
θ_(1,1,6) − θ_(2,1,3) = 2η(z)η(23z), from memory); Hecke's description of the eigenforms
by class group characters (theorem, from memory: for fundamental D and p split, T_p has
the eigenvalues ψ(𝔭) + ψ(𝔭)⁻¹ for the non-genus characters ψ up to conjugation, for p
inert the eigenvalue 0), evaluated with formkit's enumerated class group in floating point;
brute-force representation counts of formkit.representation for the cusp part.
"""

from __future__ import annotations

import math
from fractions import Fraction

import pytest

from formkit import class_group, is_fundamental_discriminant
from formkit.classgroups.hecke_theta import hecke_decomposition, sturm_bound
from formkit.core.arith import kronecker
from formkit.errors import DiscriminantError, FormError, FormkitError
from formkit.representation.representations import representation_count


def _eta_product(levels: tuple[int, ...], N: int) -> list[int]:
    """Coefficients of q^(Σ levels/24)·∏_k ∏_{n≥1}(1 − q^(k·n)) up to q^N (shifted: index 0 ↔ q^shift)."""
    c = [0] * (N + 1)
    c[0] = 1
    for k in levels:
        n = 1
        while k * n <= N:
            step = k * n
            for i in range(N, step - 1, -1):  # multiply by (1 − q^step)
                c[i] -= c[i - step]
            n += 1
    return c


def test_eta_23():
    # θ_(1,1,6) − θ_(2,1,3) = 2·η(z)η(23z) = 2q·∏(1 − qⁿ)(1 − q^(23n))  (classical, from memory)
    N = 400
    h = hecke_decomposition((1, 1, 6), N)
    (f,) = h.eigenforms
    eta = _eta_product((1, 23), N - 1)  # η(z)η(23z) = q·(this)
    assert f.degree == 1 and f.normalised_at == 1
    assert [f.coefficients[n][0] for n in range(1, N + 1)] == [Fraction(v) for v in eta]
    # the cusp part of (1,1,6) is θ − (θ_(1,1,6) + 2θ_(2,1,3))/3 = (2/3)(θ_(1,1,6) − θ_(2,1,3)) = (4/3)·η η
    assert f.component == (Fraction(4, 3),)
    assert h.reconstructs is True
    for n in range(1, 60):  # against brute-force representation counts
        diff = representation_count((1, 1, 6), n) - representation_count((2, 1, 3), n)
        assert diff == 2 * eta[n - 1], n
    # T_p eigenvalue = a(p) for p ∤ 23
    for p, lam in f.eigenvalues.items():
        assert lam == f.coefficients[p], p


def _expected_eigenvalues(D: int, p: int) -> list[float]:
    """ψ(𝔭) + ψ̄(𝔭) (p split), 0 (p inert), ψ(𝔭) (p | D) over the non-genus characters ψ of Cl(D),
    one per pair {ψ, ψ̄} (Hecke)."""
    G = class_group(D, method="enumeration")
    inv = G.invariants
    if kronecker(D, p) == -1:
        e_p = None
    else:
        e_p = G.discrete_log(G.prime_form(p))
    seen = set()
    out = []

    def chars(i, acc):
        if i == len(inv):
            yield tuple(acc)
            return
        for k in range(inv[i]):
            yield from chars(i + 1, acc + [k])

    for k in chars(0, []):
        if all((2 * ki) % ni == 0 for ki, ni in zip(k, inv)):
            continue  # genus characters: the Eisenstein part
        conj = tuple((-ki) % ni for ki, ni in zip(k, inv))
        if conj in seen:
            continue
        seen.add(k)
        if e_p is None:
            out.append(0.0)
        elif D % p == 0:  # U_p: ψ(𝔭) for the ramified prime 𝔭 (of order ≤ 2, so ψ(𝔭) = ±1)
            phase = sum(ki * ei / ni for ki, ei, ni in zip(k, e_p, inv))
            out.append(math.cos(2 * math.pi * phase))
        else:
            phase = sum(ki * ei / ni for ki, ei, ni in zip(k, e_p, inv))
            out.append(2 * math.cos(2 * math.pi * phase))
    return sorted(out)


def _roots(factors) -> list[float]:
    import numpy as np

    out: list[float] = []
    for coeffs, e in factors:
        r = np.roots([float(c) for c in reversed(coeffs)])
        out.extend([complex(z).real for z in r] * e)
    return sorted(out)


@pytest.mark.parametrize("D", [-47, -71, -79, -84, -104, -199, -239, -260, -431])
def test_hecke_polynomials_against_class_group_characters(D):
    G = class_group(D, method="enumeration")
    h = hecke_decomposition(G.forms()[0], 20)
    assert is_fundamental_discriminant(D)
    assert not h.unsplit and h.reconstructs is True
    for p, factors in h.hecke_polynomials.items():
        got, want = _roots(factors), _expected_eigenvalues(D, p)
        assert len(got) == len(want) == h.cusp_dimension, (D, p)
        assert all(abs(a - b) < 1e-8 for a, b in zip(got, want)), (D, p, got, want)
    # the span of all θ_C: one dimension per class up to inversion (fundamental D)
    inverse_pairs = {frozenset((x, x.inverse())) for x in G.elements()}
    assert h.span_dimension == len(inverse_pairs)


def test_cusp_part_every_form_small_discriminants():
    # the cusp part of each class against brute force, and its reconstruction from eigenforms
    for D in (-23, -39, -56, -63, -87, -108, -135):  # fundamental and not
        G = class_group(D, method="enumeration")
        for Q in G.forms():
            h = hecke_decomposition(Q, 25)
            if h.reconstructs is None:
                continue  # an unsplit old space: no eigenform claim to test
            assert h.reconstructs is True, (D, Q)
            same_genus = [f for f in G.forms() if _genus(f) == _genus(Q)]
            for n in range(1, 26):
                avg = Fraction(sum(representation_count(f, n) for f in same_genus), len(same_genus))
                assert h.cusp_part[n] == representation_count(Q, n) - avg, (D, Q, n)


def _genus(Q):
    from formkit.classgroups.genus import genus_symbol

    return genus_symbol(Q)


def test_sturm_bound():
    # m = index of Γ₀(N): 24 for N = 23, 12·(3/2)·(4/3)·… (direct formula)
    assert sturm_bound(-23) == 2
    assert sturm_bound(-84) == 84 * (3 * 4 * 8) // (2 * 3 * 7) // 12
    assert sturm_bound(-3) == 0


def test_non_fundamental_unsplit_is_reported():
    # D = −23·9 = −207: old forms η(z)η(23z) at z and 3z share their T_p eigenvalues (p ∤ 207)
    h = hecke_decomposition((1, 1, 52), 20)
    assert h.unsplit or h.reconstructs is True
    if h.unsplit:
        assert h.reconstructs is None


def test_bad_input():
    with pytest.raises(FormError, match="positive definite"):
        hecke_decomposition((1, 0, -2), 10)
    with pytest.raises(FormError, match="primitive"):
        hecke_decomposition((2, 0, 2), 10)
    with pytest.raises(DiscriminantError, match="20000"):
        hecke_decomposition((1, 1, 10**5), 10)
    with pytest.raises(FormkitError, match="bound"):
        hecke_decomposition((1, 1, 6), -1)
    with pytest.raises(FormkitError, match="primes"):
        hecke_decomposition((1, 1, 6), 5, primes=0)


def test_eigenvalue_is_coefficient_and_multiplicative():
    # a normalised eigenform has a(p) = eigenvalue of T_p and a(mn) = a(m)a(n) for coprime m, n
    # (Hecke theory, from memory); the products computed in Q[x]/(g) with flint polynomials
    from flint import fmpq, fmpq_poly

    h = hecke_decomposition((2, 1, 12), 60)  # D = −95, Cl ≅ C8
    assert h.eigenforms
    for f in h.eigenforms:
        assert f.normalised_at == 1
        assert all(f.eigenvalues[p] == f.coefficients[p] for p in f.eigenvalues)
        g = fmpq_poly([fmpq(c.numerator, c.denominator) for c in f.field_polynomial])

        def elt(n):
            return fmpq_poly([fmpq(c.numerator, c.denominator) for c in f.coefficients[n]])

        for m in range(2, 8):
            for n in range(2, 60 // m + 1):
                if math.gcd(m, n) == 1:
                    assert (elt(m) * elt(n)) % g == elt(m * n) % g, (m, n)
