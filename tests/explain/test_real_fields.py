"""The continued fraction behind the fundamental unit (D > 0), against classical values and the
reduction-cycle unit."""

import math

from formkit.core.discriminants import fundamental_unit
from formkit.explain.real_fields import continued_fraction_period, real_field_blocks


def test_classical_expansions():
    # √7 = [2; 1, 1, 1, 4], unit 8 + 3√7; √61 = [7; 1, 4, 3, 1, 2, 2, 1, 3, 4, 1, 14], x² − 61y² = −1 at
    # x = 29718, y = 3805 (classical, from memory); (1 + √5)/2 = [1; 1]
    assert continued_fraction_period(28) == (2, [1, 1, 1, 4], (16, 3))
    a0, period, (t, u) = continued_fraction_period(4 * 61)
    assert (a0, period) == (7, [1, 4, 3, 1, 2, 2, 1, 3, 4, 1, 14]) and (t // 2, u) == (29718, 3805)
    assert continued_fraction_period(5) == (1, [1], (1, 1))


def test_product_of_quotients_is_the_unit():
    # every non-square D < 3000: the product over one period equals the unit found from the cycle of
    # the principal form (a different algorithm), and its norm is (−1)^period length
    for D in range(5, 3000):
        if D % 4 in (0, 1) and math.isqrt(D) ** 2 != D:
            _a0, period, tu = continued_fraction_period(D)
            e = fundamental_unit(D)
            assert tu == (e.t, e.u) and e.norm == (-1) ** len(period), D
            assert e.t * e.t - D * e.u * e.u == 4 * e.norm


def test_narrow_against_wide_sentence():
    _b, d = real_field_blocks(316)  # h(316) = 3, h⁺ = 6, ε = 80 + 9√79 of norm +1 (values from memory)
    assert (d["class_number"], d["class_number_narrow"], d["unit_norm"]) == (3, 6, 1)
    _b, d = real_field_blocks(5)
    assert (d["class_number"], d["class_number_narrow"], d["unit_norm"]) == (1, 1, -1)
