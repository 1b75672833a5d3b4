"""Tests of formkit.core.ideals and formkit.core.principal_ideals against outside sources.

* prime ideals and their splitting against sympy's number-field prime decomposition
  (``sympy.polys.numberfields.primes.prime_decomp``, a general-purpose reference used
  here as an outside check only);
* ideal products (lattices) against Dirichlet composition of the forms (Cohen GTM 138,
  Algorithm 5.4.7, as implemented in formkit.core.composition — a different algorithm)
  for random D with |D| ≤ 10^12, both signs;
* hypothesis properties: N(IJ) = N(I)N(J), I·Ī = (N(I)), the dictionary forms ↔ ideals,
  factorisations multiply back, principality agrees with the class of the form;
* Cox, *Primes of the Form x² + ny²*, Lemma 7.5 / Prop. 7.4 (invertible ⇔ gcd(a, b, c) = 1)
  and Theorem 7.7 (the dictionary), from memory.
"""

from __future__ import annotations

import random

import pytest
import sympy
from hypothesis import given, settings
from hypothesis import strategies as st
from sympy.polys.numberfields.primes import prime_decomp

from formkit import FormkitError, NotInOrderError, NotInvertibleIdealError
from formkit.core.arith import factorint, is_probable_prime, kronecker
from formkit.core.composition import _compose_raw, compose
from formkit.core.discriminants import discriminant_parts
from formkit.core.equivalence import are_properly_equivalent
from formkit.core.forms import Form
from formkit.core.ideals import (
    QuadraticIdeal,
    factor_element,
    factor_ideal,
    ideal_from_form,
    ideal_from_generators,
    parse_ideal,
    prime_ideals_above,
    principal_ideal,
)
from formkit.core.principal_ideals import principal_generator
from formkit.core.quadratic_numbers import QuadraticNumber
from formkit.core.reduction import reduced

x = sympy.symbols("x")
SQUAREFREE = [m for m in range(-60, 61) if m not in (0, 1) and all(m % (p * p) for p in (2, 3, 5, 7))]


def _check_splitting_against_sympy(m, bound):
    d_K = m if m % 4 == 1 else 4 * m
    for p in sympy.primerange(2, bound):
        ours = prime_ideals_above(d_K, p)
        # the minimal polynomial of ω_K (x² − m hangs in sympy 1.14 at p = 2 when m ≡ 1 mod 4)
        T = sympy.Poly(x**2 - x - (m - 1) // 4 if m % 4 == 1 else x**2 - m)
        theirs = sorted((P.e, P.f) for P in prime_decomp(p, T=T))
        assert sorted(zip(ours.exponents, ours.residue_degrees)) == theirs, (m, p)
        for P, f in zip(ours.ideals, ours.residue_degrees):
            assert P.norm == p**f
        # the product of the primes with their exponents is (p)
        prod = principal_ideal(d_K, 1)
        for P, e in zip(ours.ideals, ours.exponents):
            prod = prod * P**e
        assert prod == principal_ideal(d_K, p)


@pytest.mark.parametrize("m", [-5, -1, -3, 2, 5, 94, -23, 79, -58, 33])
def test_prime_splitting_against_sympy(m):
    # source: sympy's prime_decomp in the maximal order of Q(√m) (outside check)
    _check_splitting_against_sympy(m, 20)


@pytest.mark.slow
@pytest.mark.parametrize("m", SQUAREFREE)
def test_prime_splitting_against_sympy_all(m):
    _check_splitting_against_sympy(m, 60)


def test_primes_above_conductor_and_inert_primes():
    # source: Cox Prop. 7.20 (from memory): p | f has no invertible prime ideal above it
    dec = prime_ideals_above(-12, 2)
    assert dec.splitting == "conductor" and dec.ideals == ()
    assert "not invertible" in dec.statement()
    dec = prime_ideals_above(-20, 11)  # (−20/11) = −1
    assert dec.splitting == "inert" and dec.ideals[0] == principal_ideal(-20, 11)
    with pytest.raises(FormkitError, match="prime"):
        prime_ideals_above(-20, 9)


def test_non_invertible_and_bad_ideals_are_refused():
    # source: Cox Lemma 7.5 (from memory): [2, 1 + √-3] has gcd(a, b, c) = 2 in Z[√-3]
    with pytest.raises(NotInvertibleIdealError, match=r"gcd\(a, b, c\) = gcd\(2, 2, 2\) = 2"):
        ideal_from_generators(-12, ["2", "1 + √-3"])
    with pytest.raises(NotInvertibleIdealError, match="zero ideal"):
        principal_ideal(-20, 0)
    with pytest.raises(NotInvertibleIdealError):
        ideal_from_generators(-20, ["0", "0"])
    with pytest.raises(NotInOrderError, match="not in the order"):
        parse_ideal(-12, "(2, (1 + √-3)/2)")
    with pytest.raises(FormkitError, match="not divisible by 4a"):
        QuadraticIdeal(-20, 3, 1)


def _prime_forms(D: int, count: int, rng: random.Random) -> list[int]:
    out = []
    p = 2
    while len(out) < count and p < 10**5:
        if is_probable_prime(p) and kronecker(D, p) == 1 and D % p:
            out.append(p)
        p += rng.randint(1, 40)
    return out


def test_ideal_products_against_form_composition_random_large_d():
    # source: Dirichlet composition (Cohen Alg. 5.4.7, formkit.core.composition) —
    # the lattice product of [a1, (−b1+√D)/2][a2, (−b2+√D)/2] is d·[a3, (−b3+√D)/2]
    # with (a3, b3) the composite and b3 determined mod 2a3
    rng = random.Random(13)
    done = 0
    while done < 40:
        D = rng.choice([-1, 1]) * rng.randint(10**6, 10**12)
        if D % 4 not in (0, 1) or sympy.sqrt(D).is_integer:
            continue
        ps = _prime_forms(D, 3, rng)
        if len(ps) < 2:
            continue
        A = prime_ideals_above(D, ps[0]).ideals[rng.randint(0, 1)] ** rng.randint(1, 3)
        J = prime_ideals_above(D, ps[1]).ideals[rng.randint(0, 1)]
        if rng.random() < 0.5:
            J = J * prime_ideals_above(D, ps[-1]).ideals[0]
        K = A * J
        a3, b3, _c3 = _compose_raw(*A.form, *J.form, D)
        k, a, b = K.coefficients
        assert k == 1 and a == a3 and (b - b3) % (2 * a) == 0, D
        assert K.norm == A.norm * J.norm
        done += 1


def test_product_with_common_factors_has_content():
    # (P)(P̄) = (p): the content is p (Cox Lemma 7.14, from memory)
    P = prime_ideals_above(-23, 3).ideals[0]
    K = P * P.conjugate()
    assert K.coefficients == (3, 1, 1) and principal_ideal(-23, 3) == K


DISCS = [-3, -4, -20, -23, -56, -84, -108, -4004, 5, 12, 40, 316, 376, 1580, 3384, 229]


@st.composite
def ideals(draw, D=None):
    D = draw(st.sampled_from(DISCS)) if D is None else D
    _d_K, f = discriminant_parts(D)
    ps = [p for p in sympy.primerange(2, 60) if f % p and kronecker(D, p) != -1]
    A = principal_ideal(D, draw(st.integers(1, 30)))
    if f > 1:  # keep the content prime to the conductor
        A = principal_ideal(D, 1)
    for _ in range(draw(st.integers(0, 3))):
        p = draw(st.sampled_from(ps))
        A = A * draw(st.sampled_from(prime_ideals_above(D, p).ideals))
    return A


@settings(max_examples=60, deadline=None)
@given(st.data())
def test_norm_is_multiplicative_and_i_times_conjugate_is_principal(data):
    # source: N(IJ) = N(I)N(J) and I·Ī = (N(I)) for invertible ideals (Cox Lemma 7.14, from memory)
    A = data.draw(ideals())
    J = data.draw(ideals(A.discriminant))
    assert (A * J).norm == A.norm * J.norm
    assert A * A.conjugate() == principal_ideal(A.discriminant, A.norm)
    assert (A * J).conjugate() == A.conjugate() * J.conjugate()
    assert A * J == J * A
    r = principal_generator(A * A.conjugate())
    assert r.principal and abs(r.generator_norm) == A.norm**2


@settings(max_examples=60, deadline=None)
@given(st.data())
def test_the_dictionary_forms_and_ideals(data):
    # source: Cox Theorem 7.7 (from memory): form → ideal → form is the identity on primitive
    # forms with a > 0, and ideal → form → ideal recovers the primitive part
    A = data.draw(ideals())
    Q = A.form
    assert Q.discriminant == A.discriminant and Q.is_primitive
    assert ideal_from_form(Q) == QuadraticIdeal(A.discriminant, Q.a, Q.b)
    assert ideal_from_form(Q).form == Q
    D = A.discriminant
    if D > 0:
        # oriented version: a form with a < 0 gives an ideal in its narrow class
        neg = Form(-Q.a, Q.b, -Q.c)
        assert are_properly_equivalent(ideal_from_form(neg).form, neg)


@settings(max_examples=60, deadline=None)
@given(st.data())
def test_factorisations_multiply_back(data):
    # source: unique factorisation of ideals prime to the conductor (Cox Prop. 7.20, from memory)
    A = data.draw(ideals())
    fac = factor_ideal(A)
    assert fac.product() == A
    for p, P, _e in fac.factors:
        assert P in prime_ideals_above(A.discriminant, p).ideals


@settings(max_examples=40, deadline=None)
@given(st.data())
def test_principality_agrees_with_the_class_of_the_form(data):
    # source: I is principal iff its form is in the principal class, narrowly iff properly
    # equivalent to the principal form (the dictionary, Cox Thm 7.7 / Buchmann–Vollmer §6.4)
    A = data.draw(ideals())
    D = A.discriminant
    r = principal_generator(A)
    P = Form.principal(D)
    narrow = are_properly_equivalent(A.form, P)
    wide = narrow or are_properly_equivalent(A.form, Form(-1, P.b, -P.c))
    assert r.principal == wide and r.narrowly_principal == narrow
    if r.principal:
        g = r.generator if r.generator is not None else r.compact.expand()
        assert principal_ideal(D, g) == A and abs(int(g.norm)) == A.norm


def test_factor_elements():
    # source: hand computation: N(1 + √-5) = 6 = 2·3 (Cox §5, from memory)
    fac = factor_element(-20, "1 + √-5")
    assert [(p, e) for p, _P, e in fac.factors] == [(2, 1), (3, 1)]
    assert factor_element(5, "(1+√5)/2").factors == ()  # a unit
    fac = factor_element(-23, "5*(1+√-23)/2")  # (5) is inert in Q(√-23)
    assert [(p, e, P.norm) for p, P, e in fac.factors] == [(2, 1, 2), (3, 1, 3), (5, 1, 25)]
    with pytest.raises(FormkitError, match="divides the conductor"):
        factor_element(-12, "2")


def test_principal_generators_small_cases():
    # source: hand computation. In Z[√-5], (3, 1 + √-5) is not principal (no x² + 5y² = 3);
    # in Q(√94) (h = 1, h⁺ = 2) the prime above 2 is principal, (3, 1+√94) too
    assert not principal_generator(parse_ideal(-20, "(3, 1 + √-5)")).principal
    r = principal_generator(parse_ideal(-20, "(9, 3 + 3√-5, 6)"))  # = (3)
    assert r.principal and r.generator == QuadraticNumber(-20, 6, 0)
    for text in ("(2, √94)", "(3, 1 + √94)", "(5, 2 + √94)"):
        r = principal_generator(parse_ideal(376, text))
        assert r.principal
        g = r.generator
        assert principal_ideal(376, g) == parse_ideal(376, text)


def test_compact_representation_of_a_huge_generator():
    # D = 4·1000000007: a prime ideal above 19 is principal with a generator of about 2900
    # digits; the compact form has O(log log γ) factors and expands to a generator
    D = 4 * 1000000007
    P = prime_ideals_above(D, 19).ideals[0]
    r = principal_generator(P)
    assert r.principal and r.generator is None and r.compact is not None
    assert len(r.compact.terms) <= 20 and float(r.compact.log_abs()) > 1000
    g = r.compact.expand()
    assert principal_ideal(D, g) == P and abs(int(g.norm)) == 19
    d = r.to_dict()["compact_generator"]
    assert d["digits"] > 2000 and all(t["exponent"] & (t["exponent"] - 1) == 0 for t in d["terms"])
    # the explicit walk gives the same (positive) generator
    assert principal_generator(P, compact=False).generator == g


def test_compact_and_explicit_generators_agree_random():
    rng = random.Random(7)
    for _ in range(8):
        q = sympy.nextprime(rng.randint(10**3, 10**6))
        D = 4 * q if q % 4 == 3 else q
        for p in sympy.primerange(2, 50):
            dec = prime_ideals_above(D, p)
            if dec.splitting != "split":
                continue
            r1 = principal_generator(dec.ideals[0], compact=True)
            r2 = principal_generator(dec.ideals[0], compact=False)
            assert r1.principal == r2.principal
            if r1.principal:
                assert r1.compact.expand() == r2.generator
            break


def test_ideal_value_type():
    A = parse_ideal(-20, "(3, 1 + sqrt(-5))")
    assert QuadraticIdeal(-20, 3, -2) == A and hash(A) == hash(QuadraticIdeal(-20, 3, 4))
    assert repr(A) == "QuadraticIdeal(D=-20, [3, 1 + √-5])"
    assert "norm 3" in A._repr_html_() and r"\sqrt{-5}" in A._repr_latex_()
    assert A.to_dict()["form"] == [3, -2, 2]
    assert "1 + √-5" in A and "1 - √-5" not in A
    with pytest.raises(AttributeError):
        A._a = 1  # type: ignore[misc]


def test_reduced_forms_of_products_match_composition_small():
    # source: Dirichlet composition up to reduction, D < 0 (classes have one reduced form)
    for D in (-23, -56, -4004, -108):
        primes = [p for p in sympy.primerange(2, 40) if kronecker(D, p) == 1 and discriminant_parts(D)[1] % p]
        forms = [Form.prime_form(D, p) for p in primes[:4]]
        for F in forms:
            for G in forms:
                assert reduced((ideal_from_form(F) * ideal_from_form(G)).form) == compose(F, G)


def test_factorint_is_the_factoriser():
    # factor_ideal goes through formkit.core.arith.factorint (house rule); sanity on a norm
    A = principal_ideal(-4, 2 * 3 * 5)
    assert {p for p, _P, _e in factor_ideal(A).factors} == set(factorint(30))
