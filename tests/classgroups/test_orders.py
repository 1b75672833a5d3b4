"""Tests for formkit.classgroups.orders: projection Cl(D) → Cl(d_K), its kernel, unit index, class number formula.

References:
* the class number formula for orders, h(D) = h(d_K)·f/[O_K*:O*]·∏_{p|f}(1 − χ_{d_K}(p)/p)
  (Cox, *Primes of the Form x² + ny²*, Theorem 7.24 / Corollary 7.28, from memory) is
  compared with **enumeration** and with the **brute-force** class number;
* the projection is compared with the extension of ideals I ↦ I·O_K computed by a
  Hermite normal form in tests/_classgroup_reference.py (Cox §7.A, from memory);
* the unit index is checked against the exact identity ε_D = ε_K^k.
"""

from __future__ import annotations

import math
import random

import pytest
from _classgroup_reference import (
    brute_class_number,
    brute_reduced_definite,
    class_key,
    class_product,
    extend_to_maximal,
    fundamental_part,
    indefinite_cycles,
    wide_class_number,
)
from _foundation_strategies import act
from hypothesis import given
from hypothesis import strategies as st

from formkit import (
    DiscriminantError,
    Form,
    FormkitError,
    NotAnIntegerError,
    NotPrimitiveError,
    class_group,
    class_number,
    class_number_order_formula,
    coprime_representative,
    fundamental_unit,
    order_projection,
    project_to_maximal_order,
    projection_kernel,
    unit_index,
)


def discriminants(lo: int, hi: int) -> list[int]:
    return [D for D in range(lo, hi + 1) if D % 4 in (0, 1) and not (D >= 0 and math.isqrt(D) ** 2 == D)]


def non_fundamental(lo: int, hi: int) -> list[int]:
    return [D for D in discriminants(lo, hi) if fundamental_part(D)[1] > 1]


# ---------------------------------------------------------------------------
# class number formula


def test_formula_against_enumeration_negative():
    # source: Cox Thm 7.24 (formula) vs complete enumeration, every D in [−4000, −3]
    for D in discriminants(-4000, -3):
        assert class_number_order_formula(D) == class_number(D), D


def test_formula_against_brute_force_positive():
    # source: the formula for the wide class number of a real order vs the brute-force
    # wide class number (orbits of ρ-cycles), every non-square D in [5, 700]
    for D in discriminants(5, 700):
        assert class_number_order_formula(D) == wide_class_number(D), D


@pytest.mark.slow
def test_formula_wide_range():
    for D in discriminants(-60000, -3):
        assert class_number_order_formula(D) == class_number(D), D
    for D in discriminants(5, 5000):
        assert class_number_order_formula(D) == class_group(D).class_number_wide, D


def test_formula_classical_values():
    # source: Cox §2, §7 (from memory): h(−4·27) = 3 (x² + 27y², 4x² ± 2xy + 7y²),
    # h(−3·49) = 2 (conductor 7 over Q(√−3)) and the non-maximal orders of class number
    # one (−12, −16, −27, −28); each value also by brute force
    for D, h in {-108: 3, -147: 2, -12: 1, -16: 1, -27: 1, -28: 1}.items():
        assert class_number_order_formula(D) == h == brute_class_number(D), D


# ---------------------------------------------------------------------------
# unit index


def test_unit_index_negative():
    # source: O_K* = {±1} except for d_K = −3 (6 units) and −4 (4 units); the orders of
    # conductor f > 1 have only ±1
    for D in discriminants(-3000, -3):
        d, f = fundamental_part(D)
        expected = 1 if f == 1 else {-3: 3, -4: 2}.get(d, 1)
        assert unit_index(D) == expected, D


def _unit_power(t, u, d, k):
    """(t + u√d)/2 raised to the k-th power, as (T, U) with the same normalisation."""
    T, U = 2, 0
    for _ in range(k):
        T, U = (T * t + U * u * d) // 2, (T * u + U * t) // 2
    return T, U


def test_unit_index_positive():
    # source: exact identity — the fundamental unit of the order is ε_K^k for k = unit index
    for D in non_fundamental(5, 1500):
        d, f = fundamental_part(D)
        k = unit_index(D)
        eK, eD = fundamental_unit(d), fundamental_unit(D)
        T, U = _unit_power(eK.t, eK.u, d, k)
        # (t_D + u_D·√D)/2 with √D = f·√d
        assert (eD.t, eD.u * f) == (T, U), D
        for j in range(1, k):  # no smaller power lies in the order
            T, U = _unit_power(eK.t, eK.u, d, j)
            assert not (U % f == 0 and (T - (U // f) * D) % 2 == 0), (D, j)


# ---------------------------------------------------------------------------
# projection and kernel


def test_projection_against_ideal_extension():
    # source: extension of ideals I ↦ I·O_K by Hermite normal form (brute force)
    for D in non_fundamental(-1500, -3) + non_fundamental(5, 500):
        d, _ = fundamental_part(D)
        reps = brute_reduced_definite(D) if D < 0 else sorted(indefinite_cycles(D))
        for F in reps:
            img = project_to_maximal_order(F)
            assert img.discriminant == d
            assert class_key(img.coefficients, d) == class_key(extend_to_maximal(F, D), d), (D, F)


def test_projection_is_surjective_homomorphism_with_kernel_of_size_h_ratio():
    # source: Cox Prop. 7.20 / Thm 7.24 (from memory): Cl(D) → Cl(d_K) is onto with
    # kernel of order h(D)/h(d_K); homomorphism checked with the ideal product as the law
    for D in non_fundamental(-500, -3) + non_fundamental(5, 250):
        d, _ = fundamental_part(D)
        G, H = class_group(D), class_group(d)
        proj = order_projection(D)
        assert set(proj) == set(G)
        assert set(proj.values()) == set(H), D
        elems = list(G)
        for x in elems[:12]:
            for y in elems[:12]:
                xy = class_product(x.form.coefficients, y.form.coefficients, D)
                z = G(Form(*_rep_of_key(G, xy, D)))
                assert proj[z] == proj[x] * proj[y], (D, x, y)
        ker = projection_kernel(D)
        assert len(ker) * H.order == G.order, D
        assert G.identity in ker and all(proj[k].is_identity() for k in ker)
        # the kernel is a subgroup
        assert all(a * b in ker for a in ker for b in ker)


def _rep_of_key(G, key, D):
    for x in G:
        if class_key(x.form.coefficients, D) == key:
            return x.form.coefficients
    raise AssertionError(key)


def test_projection_on_fundamental_discriminant_is_identity():
    for D in (-23, -4004, 316, 229):
        proj = order_projection(D)
        assert all(x == y for x, y in proj.items())
        assert projection_kernel(D) == [class_group(D).identity]


def test_projection_examples():
    # D = −72 = 3²·(−8): h(−72) = 2, h(−8) = 1 (from memory; brute force)
    assert brute_class_number(-72) == 2 and brute_class_number(-8) == 1
    assert project_to_maximal_order((2, 0, 9)) == Form(1, 0, 2)
    assert len(projection_kernel(-72)) == 2


# ---------------------------------------------------------------------------
# coprime representatives


@given(st.integers(3, 10**5), st.integers(1, 10**4), st.integers(0, 10**6))
def test_coprime_representative(n, m, seed):
    D = -n
    while D % 4 not in (0, 1):
        D -= 1
    rng = random.Random(seed)
    F = rng.choice(brute_reduced_definite(D) if n < 3000 else [Form.principal(D).coefficients])
    g, M = coprime_representative(F, m)
    (p, q), (r, s) = M
    assert p * s - q * r == 1
    assert g.coefficients == act(F, M)  # written-out action, not formkit's transform
    assert math.gcd(g.a, m) == 1


def test_coprime_representative_indefinite():
    for D in (40, 316, 5 * 49, 12 * 25):
        for F in sorted(indefinite_cycles(D)):
            for m in (2, 3, 5, 6, 30, D):
                g, M = coprime_representative(F, m)
                assert g.coefficients == act(F, M) and math.gcd(g.a, m) == 1


# ---------------------------------------------------------------------------
# bad input


@pytest.mark.parametrize("fn", [order_projection, projection_kernel, unit_index, class_number_order_formula])
def test_bad_discriminants(fn):
    for bad, exc in [(-5, DiscriminantError), (16, DiscriminantError), ("x", NotAnIntegerError)]:
        with pytest.raises(exc) as info:
            fn(bad)
        assert isinstance(info.value, FormkitError)


def test_projection_bad_input():
    with pytest.raises(NotPrimitiveError, match="content 2"):
        project_to_maximal_order((2, 2, 6))
    with pytest.raises(DiscriminantError, match="square"):
        project_to_maximal_order((1, 2, 1))
    with pytest.raises(NotPrimitiveError):
        coprime_representative((2, 2, 6), 3)
    with pytest.raises(FormkitError, match="non-zero"):
        coprime_representative((2, 1, 3), 0)
    with pytest.raises(NotAnIntegerError):
        coprime_representative((2, 1, 3), "x")
