"""One call for every discriminant: the maximal-order series functions on orders (conductor f > 1).

``class_zeta_sum``, ``genus_character_l_series`` (D < 0) and ``real_class_zeta_sum``,
``real_genus_character_l_series`` (D > 0) hand a non-fundamental D to the functions of
:mod:`formkit.classgroups.order_series`.  Outside references, all computed here without
formkit's series code:

* D < 0: the Epstein zeta functions summed by brute force over the lattice points
  (numpy), over the reduced forms listed by brute force (|b| ≤ a ≤ c; Cox, *Primes of the
  Form x² + ny²*, Thm 2.8, from memory);
* D > 0: the invertible ideals of the order listed by brute force — every ideal is m·𝔟
  with 𝔟 = [a, (−b + √D)/2] primitive, b mod 2a, b² ≡ D (mod 4a), invertible iff
  gcd(a, b, c) = 1 (Cohen, GTM 138, §5.2, from memory), so Σ N(𝔞)^(−s) = ζ(2s)·Σ a^(−s);
* the genus character as ψ(C) = χ_{d₁}(m) for a value m of the form prime to D (genus
  theory; Cox §3, Zagier, *Zetafunktionen und quadratische Körper* §12, from memory);
* mpmath's ζ and Dirichlet L-series, times the factors at p | f of the order written out
  from the closed formula e_p = (1 − X)(1 − χ(p)X)·Σ_{i<k} p^i X^(2i) + p^k X^(2k)(1 − χ(p)/p),
  X = p^(−s) (ψ = 1; for D = −12 it is the classical 1 + 2^(1−2s), from memory).
"""

from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest

from formkit.classgroups.class_series import class_zeta_sum, genus_character_l_series
from formkit.classgroups.order_series import order_genus_character_l_series, order_zeta_sum
from formkit.classgroups.partial_zeta import real_class_zeta_sum, real_genus_character_l_series
from formkit.core.arith import kronecker
from formkit.core.discriminants import discriminant_parts
from formkit.core.factorisation import prime_factorisation
from formkit.errors import FormkitError


def _reduced_forms(D: int) -> list[tuple[int, int, int]]:
    """The reduced primitive positive definite forms of D < 0, by brute force."""
    out = []
    for a in range(1, math.isqrt(-D // 3) + 1):
        for b in range(-a + 1, a + 1):
            if (b * b - D) % (4 * a):
                continue
            c = (b * b - D) // (4 * a)
            if c < a or (b < 0 and c == a) or math.gcd(math.gcd(a, b), c) != 1:
                continue
            out.append((a, b, c))
    return out


def _lattice_sum(form, s: float, R: int = 400) -> float:
    """Σ' Q(x, y)^(−s) over |x|, |y| ≤ R (numpy; the rest is below 1e-9 for the forms used at s = 3)."""
    a, b, c = form
    x = np.arange(-R, R + 1, dtype=np.float64)
    X, Y = np.meshgrid(x, x)
    Q = a * X * X + b * X * Y + c * Y * Y
    Q[R, R] = np.inf  # the origin is left out
    return float(np.sum(Q ** (-s)))


def _value_prime_to(form, D: int) -> int:
    """A positive value of the form prime to D, by search over small x, y."""
    a, b, c = form
    for size in range(1, 50):
        for x in range(-size, size + 1):
            for y in range(-size, size + 1):
                m = a * x * x + b * x * y + c * y * y
                if m > 0 and math.gcd(m, D) == 1:
                    return m
    raise AssertionError(f"no value of {form} prime to {D}")


def _primitive_ideals(D: int, N: int):
    """(a, (a, b, c)) for the primitive invertible ideals [a, (−b + √D)/2] of norm a ≤ N (D > 0)."""
    for a in range(1, N + 1):
        bs = np.arange(2 * a, dtype=np.int64)
        for b in bs[(bs * bs - D) % (4 * a) == 0]:
            b = int(b)
            c = (b * b - D) // (4 * a)
            if math.gcd(math.gcd(a, b), c) == 1:
                yield a, (a, b, c)


def _dirichlet(d: int, s):
    """mpmath's L(s, χ_d) (ζ for d = 1)."""
    if d == 1:
        return mpmath.zeta(s)
    return mpmath.dirichlet(s, [kronecker(d, n) for n in range(abs(d))])


def _closed_form_factors(D: int, s):
    """∏_{p^k ∥ f} e_p(s) for ψ = 1 from the closed formula (module docstring), in mpmath."""
    d_K, f = discriminant_parts(D)
    out = mpmath.mpf(1)
    for p, k in prime_factorisation(f).items():
        X = mpmath.power(p, -s)
        chi = kronecker(d_K, p)
        head = sum(p**i * X ** (2 * i) for i in range(k))
        out *= (1 - X) * (1 - chi * X) * head + p**k * X ** (2 * k) * (1 - mpmath.mpf(chi) / p)
    return out


def _num(v) -> complex:
    return complex(v.value)


@pytest.mark.parametrize("D", [-12, -75, -108, -300])
def test_class_zeta_sum_of_an_order_against_lattice_sums(D):
    r = class_zeta_sum(D, 3, digits=20)
    assert "e_" in r.statement and r.agrees
    assert r.class_number == len(_reduced_forms(D))  # every class summed
    brute = sum(_lattice_sum(f, 3.0) for f in _reduced_forms(D))
    assert abs(_num(r.left) - brute) < 1e-9 * brute
    assert abs(_num(r.right) - brute) < 1e-9 * brute
    same = order_zeta_sum(D, 3, digits=20)  # the dispatch gives the order function's identity
    assert (same.statement, same.right.text(), same.provenance) == (r.statement, r.right.text(), r.provenance)


@pytest.mark.parametrize(
    "D, s, z", [(-300, "1/2+3i", (0.5, 3)), (-108, "-3/2", (-1.5, 0)), (-12, "2", (2, 0))]
)
def test_class_zeta_sum_of_an_order_against_mpmath(D, s, z):
    # w·ζ(s)·L(s, χ_dK)·∏ e_p(s), mpmath and the closed formula for e_p, at complex and negative s
    r = class_zeta_sum(D, s, digits=25)
    assert r.agrees
    d_K, _f = discriminant_parts(D)
    with mpmath.workdps(30):
        z = mpmath.mpc(*z)
        ref = complex(2 * mpmath.zeta(z) * _dirichlet(d_K, z) * _closed_form_factors(D, z))
    assert abs(_num(r.right) - ref) < 1e-18 * abs(ref)
    assert abs(_num(r.left) - ref) < 1e-18 * abs(ref)
    if D == -12:  # Σ'(x² + 3y²)^(−s) = 2(1 + 2^(1−2s))ζ(s)L(s, χ₋₃) (classical, from memory)
        ref2 = float(2 * (1 + mpmath.power(2, 1 - 2 * 2)) * mpmath.zeta(2) * _dirichlet(-3, 2))
        assert abs(_num(r.left) - ref2) < 1e-18


@pytest.mark.parametrize("D, d1", [(-108, -3), (-75, 5), (-300, 5), (-300, -15)])
def test_genus_character_l_series_of_an_order_against_lattice_sums(D, d1):
    r = genus_character_l_series(D, d1, 3, digits=20)
    assert r.agrees and "e_" in r.statement
    forms = _reduced_forms(D)
    w = 2  # D < −4
    brute = sum(kronecker(d1, _value_prime_to(f, D)) * _lattice_sum(f, 3.0) for f in forms) / w
    assert abs(_num(r.left) - brute) < 1e-9
    assert abs(_num(r.right) - brute) < 1e-9
    same = order_genus_character_l_series(D, d1, 3, digits=20)
    assert same.statement == r.statement and same.right.text() == r.right.text()


def _brute_invertible_sum(D: int, s: int, N: int, d1: int = 1):
    """Σ over the invertible ideals of ψ(𝔞)·N(𝔞)^(−s), ψ = χ_{d₁}(value prime to D); primitive norms ≤ N."""
    total = mpmath.mpf(0)
    for a, form in _primitive_ideals(D, N):
        psi = 1 if d1 == 1 else kronecker(d1, _value_prime_to(form, D))
        total += psi * mpmath.power(a, -s)
    return total * mpmath.zeta(2 * s)


@pytest.mark.parametrize("D", [45, 500])
def test_real_class_zeta_sum_of_an_order_against_counted_ideals(D):
    # the rest beyond norm 2500 is at most about 2M·N^(−3)·log N < 1e-8 (partial_zeta's tail bound)
    s = 4
    brute = _brute_invertible_sum(D, s, 2500)
    r = real_class_zeta_sum(D, s, digits=20)  # the analytic continuation (no bound)
    assert r.agrees and "e_" in r.statement
    assert abs(_num(r.left) - float(brute)) < 1e-8
    assert abs(_num(r.right) - float(brute)) < 1e-8
    d_K, _f = discriminant_parts(D)
    with mpmath.workdps(30):
        ref = mpmath.zeta(s) * _dirichlet(d_K, s) * _closed_form_factors(D, s)
    assert abs(_num(r.right) - float(ref)) < 1e-18
    direct = real_class_zeta_sum(D, s, bound=3000, digits=20)  # direct summation takes the same road
    assert direct.agrees and abs(_num(direct.left) - float(brute)) <= direct.left.error_bound + 1e-8


def test_real_class_zeta_sum_of_an_order_at_complex_s():
    # the continuation at s = −1/2 + 2i against mpmath's ζ(s)·L(s, χ_5) and the closed-form factors
    r = real_class_zeta_sum(500, "-1/2+2i", digits=20)
    assert r.agrees
    with mpmath.workdps(30):
        z = mpmath.mpc(-0.5, 2)
        ref = complex(mpmath.zeta(z) * _dirichlet(5, z) * _closed_form_factors(500, z))
    assert abs(_num(r.right) - ref) < 1e-15 * abs(ref)


@pytest.mark.parametrize("D, d1", [(45, -3), (45, 5)])
def test_real_genus_character_l_series_of_an_order_against_counted_ideals(D, d1):
    s = 4
    brute = _brute_invertible_sum(D, s, 2500, d1)
    r = real_genus_character_l_series(D, d1, s, digits=20)
    assert r.agrees and "e_" in r.statement
    assert abs(_num(r.left) - float(brute)) < 1e-8
    assert abs(_num(r.right) - float(brute)) < 1e-8
    same = order_genus_character_l_series(D, d1, s, digits=20)
    assert same.statement == r.statement and same.right.text() == r.right.text()


def test_bad_input_on_orders_names_the_rule():
    with pytest.raises(FormkitError, match="d1 = 7 does not split -108"):
        genus_character_l_series(-108, 7, 2)
    with pytest.raises(FormkitError, match="pole"):
        class_zeta_sum(-108, 1)
    with pytest.raises(FormkitError, match="real s > 1"):
        real_class_zeta_sum(45, "1/2", bound=100)
    with pytest.raises(FormkitError, match="d1 = 7 does not split 45"):
        real_genus_character_l_series(45, 7, 3)
