"""Theta series of one form.

Outside references: Jacobi's two-square theorem r₂(n) = 4(d₁(n) − d₃(n)) (Jacobi 1829,
from memory); brute-force counting of lattice points.
"""

from __future__ import annotations

import pytest

from formkit import Form
from formkit.analytic.theta_series import theta_series
from formkit.errors import FormError, FormkitError


def test_jacobi_two_squares():
    th = theta_series((1, 0, 1), 3000)
    assert th[0] == 1
    for n in range(1, 3001):
        d1 = sum(1 for d in range(1, n + 1, 4) if n % d == 0)
        d3 = sum(1 for d in range(3, n + 1, 4) if n % d == 0)
        assert th[n] == 4 * (d1 - d3), n


@pytest.mark.parametrize("form", [(1, 1, 1), (2, 1, 3), (3, -2, 5), (4, 4, 9), (6, 5, 7), (2, 0, 2)])
def test_brute_force(form):
    Q = Form(*form)
    N = 150
    th = theta_series(Q, N)
    counts = [0] * (N + 1)
    R = 40
    for x in range(-R, R + 1):
        for y in range(-R, R + 1):
            v = Q(x, y)
            if v <= N:
                counts[v] += 1
    assert [th[n] for n in range(N + 1)] == counts


def test_unreduced_form_and_output():
    a = theta_series(Form(2, 1, 3).transform(((2, 1), (1, 1))), 60)
    b = theta_series((2, 1, 3), 60)
    assert a.to_dict()["coefficients"] == b.to_dict()["coefficients"]
    assert "ThetaSeries" in repr(b) and "q^60" in repr(b)
    assert b.coefficients.flags.writeable is False


def test_bad_input():
    with pytest.raises(FormError, match="positive definite"):
        theta_series((1, 0, -3), 10)
    with pytest.raises(FormkitError, match="N must"):
        theta_series((1, 0, 1), -1)
