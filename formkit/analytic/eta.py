"""Dedekind's η(τ) = e^(πiτ/12)·∏(1 − qⁿ), q = e^(2πiτ), certified, at any τ in the upper half plane.

The point is first moved into the standard fundamental domain by ``τ ↦ τ + n`` and
``τ ↦ −1/τ``, with the transformation laws ``η(τ + 1) = e^(πi/12)·η(τ)`` and
``η(−1/τ) = √(−iτ)·η(τ)`` (principal square root; Apostol, *Modular Functions and
Dirichlet Series*, Theorem 3.1; from memory).  There ``|q| ≤ e^(−π√3) < 0.0044`` and
Euler's pentagonal series ``∏(1 − qⁿ) = 1 + Σ_{k≥1} (−1)^k·(q^(k(3k−1)/2) + q^(k(3k+1)/2))``
converges fast; after ``K`` terms the rest is at most ``2|q|^((K+1)(3K+2)/2)/(1 − |q|)``,
which is added to the radius of the ball.  All arithmetic is ball arithmetic
(python-flint); τ is given exactly — by a positive definite form, whose root
``(−b + i√|D|)/(2a)`` is used, or as a complex number with rational parts (text
``"1/2+3/2i"``, or a float at its exact binary value) — and the moves to the
fundamental domain are carried out on the ball.

References
----------
.. [1] T. M. Apostol, *Modular Functions and Dirichlet Series in Number Theory*,
       2nd ed., GTM 41, Springer 1990, Ch. 3 (η and its transformation law).
.. [2] L. Euler, the pentagonal number theorem (Apostol, Theorem 14.3 of
       *Introduction to Analytic Number Theory*; from memory).
"""

from __future__ import annotations

import math

from ..core.forms import Form, as_form
from ..errors import FormError, FormkitError
from .balls import CertifiedValue, as_complex_argument, bits_for, certified, check_digits

__all__ = ["dedekind_eta", "form_root"]


def form_root(form: object):
    """The root ``τ_Q = (−b + i√|D|)/(2a)`` of a positive definite form, as an acb ball.

    (``Q(x, 1) = a(x − τ)(x − τ̄)``; evaluated at the current flint precision.)

    Raises
    ------
    FormError
        If the form is not positive definite.
    """
    from flint import acb, arb

    Q = as_form(form)
    if not Q.is_positive_definite:
        raise FormError(
            f"the root τ_Q in the upper half plane needs a positive definite form; {Q!r} is {Q.kind}"
        )
    D = Q.discriminant
    return acb(arb(-Q.b) / (2 * Q.a), arb(-D).sqrt() / (2 * Q.a))


def _log2_upper(x) -> float:
    """An upper bound for ``log₂ x`` of a positive arb upper bound ``x`` (no float underflow)."""
    m, e = (int(v) for v in x.man_exp())
    if m <= 0:
        return -math.inf
    shift = max(0, m.bit_length() - 53)
    return e + shift + math.log2(m >> shift) + 1e-9


def _pentagonal(q, prec_bits: int):
    """``∏(1 − qⁿ)`` for an acb ``q`` with ``|q| < 0.01`` (a ball, with the tail bound).

    The size of ``|q|`` is handled through ``log₂|q|`` (``|q|`` itself may be far below
    the smallest float, as for the roots of forms of large discriminant), and the tail
    ``2|q|^((K+1)(3K+2)/2)/(1 − |q|) ≤ 4|q|^(k(3k−1)/2)`` is added to the radius as an
    exact power of two.
    """
    from flint import acb, arb

    upper = q.abs_upper()
    lr = _log2_upper(upper)  # log₂ of an upper bound for |q|
    if not lr < -1:  # pragma: no cover - callers reduce τ first
        raise ArithmeticError(f"|q| ≤ 2^{lr} too large for the pentagonal series")
    total = acb(1)
    k = 1
    qk = q  # q^k
    a = q  # q^{k(3k−1)/2}
    while True:
        b = a * qk  # q^{k(3k+1)/2}
        total = total - (a + b) if k % 2 else total + (a + b)
        # next exponents: (k+1)(3k+2)/2 = k(3k+1)/2 + 2k + 1
        qk1 = qk * q
        a = b * qk * qk1
        qk = qk1
        k += 1
        expo = k * (3 * k - 1) / 2
        if lr == -math.inf or expo * lr < -prec_bits - 4:
            break
    if lr == -math.inf:
        return total
    # the omitted terms: Σ_{n ≥ expo} |q|^n ≤ |q|^expo/(1 − |q|) ≤ 2|q|^expo, counted twice
    # (both pentagonal exponents) — at most 4·|q|^expo ≤ 2^(expo·lr + 2)
    tail = arb(2) ** math.ceil(expo * lr + 2)
    return total + acb(arb(0, tail), arb(0, tail))


def _eta_ball(z, prec: int):
    """``η(z)`` for an acb ``z`` in the upper half plane, at ``prec`` bits (a ball)."""
    from flint import acb, arb, ctx

    with ctx.workprec(prec):
        factor = acb(1)
        steps = 0
        while True:
            steps += 1
            if steps > 10_000:  # pragma: no cover - each inversion raises Im τ
                raise FormkitError(f"could not move τ = {z} into the fundamental domain")
            # τ ↦ τ − n with n the nearest integer to Re τ: η(τ) = e^{πin/12}·η(τ − n)
            n = round(float(z.real.mid()))
            if n:
                z = z - n
                factor = factor * acb.exp_pi_i(acb(arb(n) / 12))
            if float(abs(z).upper()) < 1 - 1e-9:
                # η(τ) = (−iτ)^(−1/2)·η(−1/τ)
                factor = factor / (-acb(0, 1) * z).sqrt()
                z = -1 / z
                continue
            break
        q = acb.exp_pi_i(2 * z)
        return factor * acb.exp_pi_i(z / 12) * _pentagonal(q, prec)


def dedekind_eta(tau: object, *, digits: int = 30) -> CertifiedValue:
    """Dedekind's ``η(τ)``, certified to ``digits`` significant digits.

    Parameters
    ----------
    tau : Form, complex or text
        A positive definite form (its root ``τ_Q = (−b + i√|D|)/(2a)``), or a point of
        the upper half plane (text such as ``"1/2+3/2i"`` is exact).
    digits : int
        Significant digits certified.

    Returns
    -------
    CertifiedValue

    Raises
    ------
    FormError, FormkitError
        If ``τ`` is not in the upper half plane or the form is not positive definite.

    Examples
    --------
    >>> e = dedekind_eta(Form(1, 0, 1), digits=20)      # η(i) = Γ(1/4)/(2π^(3/4))
    >>> e.text()
    '0.768225422326056659'
    >>> dedekind_eta("1/2+3i", digits=12).text()
    '0.452037516822 + 0.0595118680928i'
    """
    from flint import acb, ctx

    digits = check_digits(digits)
    prec = bits_for(digits) + 30
    with ctx.workprec(prec):
        if isinstance(tau, (Form, tuple, list)):
            Q = as_form(tau)
            z = form_root(Q)
            label = f"η(τ_Q), Q = ({Q.a}, {Q.b}, {Q.c})"
            s_arg = as_complex_argument(0)
        else:
            s_arg = as_complex_argument(tau, "tau")
            if not s_arg.imag > 0:
                raise FormkitError(f"tau must lie in the upper half plane (Im τ > 0), not {tau!r}")
            z = s_arg.ball()
            z = acb(z) if not isinstance(z, acb) else z
            label = "η(τ)"
        value = _eta_ball(z, prec)
    return certified(
        value,
        digits,
        quantity=label,
        s=s_arg,
        method="Euler's pentagonal series after moving τ to the fundamental domain, ball arithmetic",
        terms=0,
    )
