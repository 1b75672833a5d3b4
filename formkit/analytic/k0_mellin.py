"""The incomplete Mellin transform G(w, y) = ∫_y^∞ 4·K_0(2πx)·x^(w−1) dx, certified, for complex w.

``4K_0(2πx)`` is the inverse Mellin transform of ``π^(−w)Γ(w/2)²`` (from
``∫_0^∞ K_0(x)x^(w−1)dx = 2^(w−2)Γ(w/2)²``, Gradshteyn–Ryzhik 6.561.16, from memory; checked in
the tests against ``mpmath.quad``), the gamma factor of the L-series of a real quadratic
field; ``G`` is the smoothing function of their approximate functional equation
(:mod:`formkit.classgroups.partial_zeta_continuation`).  ``G(w, y)`` is entire in ``w``.

**Method.**  Termwise integration of ``K_0(2z) = Σ_k z^(2k)/(k!)²·(H_k − γ − log z)``
(Abramowitz–Stegun 9.6.13, ``H_k`` the harmonic numbers) over ``(0, Y]``, ``Y = πy``:

    G(w, y) = π^(−w)·[Γ(w/2)² − 4·Σ_k Y^(2k+w)/(k!)²·((H_k − γ − log Y)/(2k + w) + 1/(2k + w)²)].

At ``w = −2m`` the pole of ``Γ(w/2)²`` cancels the ``k = m`` term; the pair is replaced by
its limit ``(2(A − log Y)² + B)/(m!)²`` with ``A = H_m − γ``, ``B = ζ(2) + Σ_{j≤m} 1/j²``
(from ``Γ(−m + η) = (−1)^m/(m!·η)·Γ(1 + η)/∏_{j≤m}(1 − η/j)``).  **Cut:** the series stops
at ``k = K`` with ``K + 1 ≥ 2Y`` and ``2K ≥ |w| + 1``; then ``|2k + w| ≥ 1``, each omitted
term is at most ``t_k = Y^(2k)/(k!)²·(k + 2 + |log Y|)`` in size, ``t_(k+1) ≤ t_k/3``, and
``4|π^(−w)Y^w|·(3/2)·t_(K+1)`` is added to the radius.  The terms reach ``e^(2Y)`` and
cancel down to ``G ≈ e^(−2Y)``, so ``2.9·Y`` extra bits are carried (ball arithmetic keeps
the account in any case).

References
----------
.. [1] M. Abramowitz, I. A. Stegun, *Handbook of Mathematical Functions*, 9.6.13.
.. [2] I. S. Gradshteyn, I. M. Ryzhik, *Table of Integrals, Series, and Products*, 6.561.16.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence

from ..errors import FormkitError
from .balls import CertifiedValue, ComplexArgument, as_complex_argument, bits_for, certified, check_digits

__all__ = ["incomplete_k0_mellin"]


def is_pole_of_gamma_half(w: ComplexArgument) -> bool:
    """True when ``w ∈ {0, −2, −4, …}`` (a pole of ``Γ(w/2)``)."""
    return w.is_integer and w.real <= 0 and w.real.numerator % 2 == 0


def _series_length(Ymax: float, wabs: float, prec: int) -> int:
    """``K`` with ``K + 1 ≥ 2Y``, ``2K ≥ |w| + 1`` and the first omitted term below ``2^(−prec)``."""
    K = max(1, math.ceil(2 * Ymax), math.ceil((wabs + 1) / 2))
    L = abs(math.log(Ymax)) if Ymax > 0 else 0.0
    while True:
        k = K + 1
        log_t = 2 * k * math.log(max(Ymax, 1e-300)) - 2 * math.lgamma(k + 1) + math.log(k + 2 + L)
        if log_t < -prec * math.log(2) - 10:
            return K
        K += 8


def incomplete_mellin_balls(
    w: ComplexArgument, ymax: float, make_ys: Callable[[], Sequence], prec: int
) -> list:
    """``G(w, y) = ∫_y^∞ 4K_0(2πx)x^(w−1)dx`` (acb balls) for the values ``y`` in ``(0, ymax]``.

    ``make_ys()`` builds the ``arb`` values ``y`` inside the raised working precision (the
    series cancels: an error in ``y`` grows by ``e^(2πy)``).
    """
    from flint import acb, acb_poly, arb, ctx

    Ymax = ymax * math.pi
    # the terms of the series reach e^(2Y) and cancel down to G ≈ e^(−2Y): 2Y/log 2 more bits
    with ctx.workprec(prec + int(2.9 * Ymax) + 20):
        ys = make_ys()
        wb = acb(w.ball())
        pi = arb.pi()
        K = _series_length(Ymax, abs(complex(float(w.real), float(w.imag))), prec)
        pole = is_pole_of_gamma_half(w)
        m = -int(w.real) // 2 if pole else -1
        euler = arb.const_euler()
        H = arb(0)
        H2 = arb(0)
        fact2 = arb(1)
        c1, c2 = [], []
        A = B = fm2 = arb(0)
        for k in range(K + 1):
            if k > 0:
                H += arb(1) / k
                H2 += arb(1) / (k * k)
                fact2 *= k * k
            if k == m:
                A, B, fm2 = H - euler, arb.pi() ** 2 / 6 + H2, fact2
                c1.append(acb(0))
                c2.append(acb(0))
                continue
            u = 1 / (wb + 2 * k)
            c1.append(((H - euler) * u + u * u) / fact2)
            c2.append(u / fact2)
        P1, P2 = acb_poly(c1), acb_poly(c2)
        head = None if pole else (wb / 2).gamma() ** 2
        scale = (-wb * pi.log()).exp()
        k1 = K + 1
        fk1 = arb(k1 + 1).rgamma() ** 2  # 1/((K+1)!)²
        out = []
        for y in ys:
            Y = pi * y
            L = Y.log()
            z = Y * Y
            Yw = (wb * L).exp()
            series = P1(acb(z)) - L * P2(acb(z))
            first = (2 * (A - L) ** 2 + B) / fm2 if pole else head
            val = scale * (first - 4 * Yw * series)
            t_next = z**k1 * fk1 * (k1 + 2 + abs(L))
            rad = (4 * scale.abs_upper() * Yw.abs_upper() * arb(3) / 2 * t_next).upper()
            out.append(val + acb(arb(0, rad), arb(0, rad)))
        return out


def incomplete_k0_mellin(w: object, y: object, *, digits: int = 30) -> CertifiedValue:
    """``G(w, y) = ∫_y^∞ 4·K_0(2πx)·x^(w−1) dx`` for complex ``w`` and rational ``y > 0``.

    The smoothing function of the approximate functional equation (module docstring):
    ``G(w, 0⁺) = π^(−w)Γ(w/2)²`` for ``Re w > 0``, and ``G`` is entire in ``w``.

    Parameters
    ----------
    w : number or text
        Any complex number (exact rational parts, as ``s`` elsewhere).
    y : number or text
        A positive rational.
    digits : int
        Significant digits certified.

    Returns
    -------
    CertifiedValue

    Raises
    ------
    FormkitError
        If ``y`` is not positive.

    Examples
    --------
    >>> incomplete_k0_mellin(2, "1/10", digits=15).text()
    '0.0778647984660819'

    References
    ----------
    Abramowitz–Stegun 9.6.13 (the series of ``K_0``).
    """
    from flint import arb, ctx, fmpq

    w = as_complex_argument(w, "w")
    yq = as_complex_argument(y, "y")
    digits = check_digits(digits)
    if not (yq.is_real and yq.real > 0):
        raise FormkitError(f"G(w, y) is defined for real y > 0, not y = {yq}")
    prec = bits_for(digits) + 20
    with ctx.workprec(prec):
        (val,) = incomplete_mellin_balls(
            w, float(yq.real), lambda: [arb(fmpq(yq.real.numerator, yq.real.denominator))], prec
        )
        ball = val.real if w.is_real else val
        return certified(
            ball,
            digits,
            quantity="G(w, y) = ∫_y^∞ 4K_0(2πx)x^(w−1)dx",
            s=w,
            method="series of K_0 integrated termwise, explicit tail bound, ball arithmetic",
            terms=0,
        )
