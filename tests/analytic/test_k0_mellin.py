"""The incomplete Mellin transform G(w, y) = ∫_y^∞ 4K_0(2πx)x^(w−1)dx of formkit.analytic.k0_mellin.

Outside references: mpmath's quad and besselk (general-purpose numerical integration and
Bessel functions) and the Mellin transform ∫_0^∞ K_0(x)x^(s−1)dx = 2^(s−2)Γ(s/2)²
(Gradshteyn–Ryzhik 6.561.16, from memory; checked here first with mpmath.quad).
"""

from __future__ import annotations

import mpmath
import pytest

from formkit.analytic.k0_mellin import incomplete_k0_mellin
from formkit.errors import FormkitError


@pytest.mark.parametrize("s", [mpmath.mpf("1.5"), mpmath.mpf(2), mpmath.mpc(3, 1)])
def test_mellin_transform_of_k0(s):
    # ∫_0^∞ K_0(x)x^(s−1)dx = 2^(s−2)Γ(s/2)²  (from memory; mpmath.quad as the outside check)
    with mpmath.workdps(15):
        nodes = [0, 1, 5, mpmath.inf]
        lhs = mpmath.quad(lambda x: mpmath.besselk(0, x) * x ** (s - 1), nodes)
        rhs = 2 ** (s - 2) * mpmath.gamma(s / 2) ** 2
        assert abs(lhs - rhs) < mpmath.mpf(10) ** -10 * abs(rhs)


def _quad(w, y):
    f = lambda x: 4 * mpmath.besselk(0, 2 * mpmath.pi * x) * x ** (w - 1)  # noqa: E731
    return mpmath.quad(f, [y, y + 1, y + 4, mpmath.inf])


@pytest.mark.slow  # mpmath.quad of a Bessel function at 32 digits: 5–9 s a case
@pytest.mark.parametrize(
    ("w", "wm", "y"),
    [
        (2, 2, "1/10"),
        ("1/2+3i", mpmath.mpc(0.5, 3), "3/7"),
        (0, 0, "1/3"),  # w = 0: the pole of Γ(w/2)² cancels the first term of the series
        (-2, -2, "1/2"),  # w = −2m, m = 1
        (-4, -4, "1/5"),
        (-3, -3, 2),
        ("-1/2+i", mpmath.mpc(-0.5, 1), 5),
        (7, 7, "1/100"),
    ],
)
def test_against_quadrature(w, wm, y):
    v = incomplete_k0_mellin(w, y, digits=25)
    with mpmath.workdps(32):
        num, _, den = str(y).partition("/")
        ref = _quad(wm, mpmath.mpf(int(num)) / int(den or 1))
        assert abs(mpmath.mpc(v.value) - ref) <= v.error_bound + mpmath.mpf(10) ** -20 * abs(ref), (
            w,
            y,
        )  # quad's own accuracy
    assert v.digits == 25


def test_small_y_tends_to_the_gamma_factor():
    # G(w, 0⁺) = π^(−w)Γ(w/2)² for Re w > 0, and G(w, y) = that − O(y^Re w log y)
    v = incomplete_k0_mellin(3, "1/1000000", digits=20)
    with mpmath.workdps(30):
        full = mpmath.pi**-3 * mpmath.gamma(mpmath.mpf(3) / 2) ** 2
        assert 0 < full - mpmath.mpf(v.value) < 1e-16


def test_bad_y():
    with pytest.raises(FormkitError, match="y > 0"):
        incomplete_k0_mellin(2, 0)
    with pytest.raises(FormkitError, match="y > 0"):
        incomplete_k0_mellin(2, "1+i")
