"""The cost models of the representation layer against the work counted in real runs.

The estimates (:func:`formkit.representation.orbits.cycle_walk_cost`,
:func:`formkit.representation.class_polynomials.class_polynomial_cost` through the working
precision) only decide whether to start.  These tests count what the models are built on —
reduction steps and entry sizes of the cycle walks, the precision of a class polynomial
against the size of its coefficients — in instrumented runs and compare within a stated factor (common
practice, no source), beside outside facts: Lévy's constant π²/(12·log 2) for the average
step of the continued fraction (from memory) and the size of the constant term of H_D.
"""

from __future__ import annotations

import math

import pytest

from formkit.core.discriminants import fundamental_unit, regulator


def _principal_cycle_length(D: int) -> int:
    # brute force: walk ρ on the principal reduced form until it returns
    from formkit.core.raw_reduction import _principal_reduced_indefinite, _rho_indefinite_raw

    sq = math.isqrt(D)
    start = _principal_reduced_indefinite(D)
    a, b, c = start
    steps = 0
    while True:
        a, b, c, _ = _rho_indefinite_raw(a, b, c, D, sq)
        steps += 1
        if (abs(a), b) == (start[0], start[1]):
            return steps


@pytest.mark.parametrize("D", [4 * (10**6 + 3), 10**7 + 1001, 4 * 1299709, 8 * 1000003, 5 * 10**7 + 53])
def test_cycle_walk_steps_and_entry_bits_against_a_counted_walk(D):
    # the model: R/1.19 ρ-steps for the unit walk and entries of about R/log 2 bits
    R = float(regulator(D, digits=15))
    steps = _principal_cycle_length(D)
    model_steps = R / 1.19
    assert model_steps / 2 <= steps <= 2 * model_steps, (D, steps, model_steps)
    e = fundamental_unit(D)  # ε = (t + u√D)/2 ≈ t: t has about R/log 2 bits
    assert abs(e.t.bit_length() - R / math.log(2)) <= 2, (D, e.t.bit_length(), R / math.log(2))


def test_cycle_walk_cost_grows_like_the_square_of_the_regulator():
    from formkit.representation.orbits import cycle_walk_cost

    small, big = cycle_walk_cost(10**4, norm=1)[0], cycle_walk_cost(10**6, norm=1)[0]
    assert 100 * small < big < 10**4 * small  # steps × bits: between R and R² growth
    assert cycle_walk_cost(10**4, norm=-1)[0] > cycle_walk_cost(10**4, norm=1)[0]  # the form's cycle is 2R


@pytest.mark.parametrize("D", [-23, -1151, -4004, -10007, -40004])
def test_class_polynomial_precision_covers_the_counted_coefficients(D, monkeypatch):
    # counted: the bits of the largest coefficient of H_D and the attempts made; the working
    # precision of the model
    # covers the coefficients with room, no retry is needed, and the largest coefficient is
    # about the constant term, of π√|D|·Σ1/a/log 2 bits (|j(τ_Q)| ≈ e^{π√|D|/a}; Cox §13, from memory)
    import formkit.representation.class_polynomials as CP

    calls: list[int] = []
    original = CP._ball_product

    def counting(D_, forms, prec):
        calls.append(prec)
        return original(D_, forms, prec)

    monkeypatch.setattr(CP, "_ball_product", counting)
    CP._class_polynomial.cache_clear()
    H = CP._class_polynomial(D, True)
    forms = CP._reduced_forms(D)
    h = len(forms)
    model_bits = CP._leading_term_bits(D, forms)
    largest = max(abs(c) for c in H.coefficients).bit_length()
    assert len(calls) == 1 and calls[0] == CP._working_bits(model_bits, h)  # one attempt, the model's bits
    assert largest <= calls[0] <= 2 * largest + 200, (D, largest, calls[0])
    assert abs(largest - model_bits) <= 3 * h + 12, (D, largest, model_bits)
    assert H.verification is not None and H.verification.precision_bits == calls[0]


def test_square_divisors_are_counted_and_priced_before_they_are_listed():
    # counted: the list has ∏(⌊e/2⌋ + 1) entries (brute force over g with g² | n); for
    # n = 10^100000 (50001² of them) the listing is refused before it starts
    from formkit.core.budget import budget
    from formkit.errors import BudgetError
    from formkit.representation.representations import represent
    from formkit.representation.square_root_method import _square_divisors, square_divisor_cost

    n, fac = 2**5 * 3**4 * 7**2, {2: 5, 3: 4, 7: 2}
    listed = _square_divisors(fac)
    assert sorted(g for g, _ in listed) == [g for g in range(1, math.isqrt(n) + 1) if n % (g * g) == 0]
    assert len(listed) == 3 * 3 * 2
    assert square_divisor_cost({2: 100000, 5: 100000})[1] > 10**11
    for form in ((1, 1, 6), (1, 1, -1)):
        with budget("20s"), pytest.raises(BudgetError, match="2500100001 square divisors"):
            represent(form, 10**100000)
