"""The modular invariant j(τ), evaluated exactly enough to build class polynomials.

``j(τ)`` is computed from the eta quotient ``t = Δ(2τ)/Δ(τ) = q·(P(q²)/P(q))²⁴`` with
``P(q) = ∏(1 − qⁿ) = Σ_k (−1)^k q^{k(3k−1)/2}`` (Euler's pentagonal number theorem)
and ``j = (1 + 256 t)³ / t``; the pentagonal series is summed in fixed-point integer
arithmetic (all its terms have modulus < 1).  For ``τ`` in the closure of the standard
fundamental domain ``|j(τ) − 1/q| ≤ 2079`` (A. Enge, Math. Comp. 78 (2009), Lemma 1;
from memory), the bound on which the precision of :mod:`formkit.representation.class_polynomials`
rests.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §11 (the j-function).
.. [2] A. Enge, "The complexity of class polynomial computation via floating point
       approximations", Math. Comp. 78 (2009), 1089–1107.
.. [3] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §7.6 (q-expansions).
"""

from __future__ import annotations

import mpmath

from ..core.arith import as_int, mpz
from ..core.forms import Form
from ..core.raw_reduction import _reduce_definite_raw
from ..errors import FormError

__all__ = ["j_invariant"]

# |j(τ) − 1/q| ≤ 2079 on the fundamental domain (Enge 2009, Lemma 1; from memory).
_J_TAIL = 2079


def _fixed(x, bits: int) -> int:
    """``round(x·2^bits)`` for an mpf ``x``, as an integer."""
    return int(mpmath.nint(mpmath.ldexp(x, bits)))


def _euler_product(q):
    """``∏(1 − qⁿ)`` for ``|q| < 1`` by Euler's pentagonal series ``Σ (−1)^k q^{k(3k∓1)/2}``.

    The series is summed in fixed point (integers scaled by ``2^P`` with ``P`` twenty
    bits beyond the current mpmath precision; every term has modulus < 1, so absolute
    accuracy is what matters) and returned as an mpc.  Summation stops when the next
    term is below ``2^{−P+2}``.
    """
    P = mpmath.mp.prec + 20
    qr, qi = _fixed(q.real, P), _fixed(q.imag, P)
    qr, qi = mpz(qr), mpz(qi)

    def mul(ar, ai, br, bi):
        return (ar * br - ai * bi) >> P, (ar * bi + ai * br) >> P

    sr, si = mpz(1) << P, mpz(0)
    kr, ki = qr, qi  # q^k
    cr, ci = qr, qi  # q^{k(3k−1)/2}
    k = 1
    while abs(cr) + abs(ci) > 4:
        tr, ti = mul(cr, ci, kr, ki)  # q^{k(3k+1)/2}
        if k & 1:
            sr -= cr + tr
            si -= ci + ti
        else:
            sr += cr + tr
            si += ci + ti
        k1r, k1i = mul(kr, ki, qr, qi)
        t2r, t2i = mul(tr, ti, kr, ki)
        cr, ci = mul(t2r, t2i, k1r, k1i)  # exponent grows by 2k + 1
        kr, ki = k1r, k1i
        k += 1
    return mpmath.mpc(mpmath.ldexp(mpmath.mpf(int(sr)), -P), mpmath.ldexp(mpmath.mpf(int(si)), -P))


def _j_from_q(q):
    u = _euler_product(q * q) / _euler_product(q)
    u2 = u * u
    u8 = (u2 * u2) ** 2
    t = q * u8 * u8 * u8  # q·u²⁴
    v = 1 + 256 * t
    return v * v * v / t


def _j_of_form(a: int, b: int, D: int):
    """j((−b + √D)/2a) at the current precision (q = e^{−π√|D|/a}·e^{−πib/a})."""
    r = mpmath.exp(-mpmath.pi * mpmath.sqrt(-D) / a)
    q = r * mpmath.expjpi(mpmath.mpf(-b) / a)
    return _j_from_q(q)


def _j_ball_of_form(a: int, b: int, D: int, prec: int):
    """``j(τ_Q)``, ``τ_Q = (−b + i√|D|)/(2a)``, as an acb ball at ``prec`` bits (rigorous).

    From Dedekind's η in ball arithmetic (:func:`formkit.analytic.eta._eta_ball`):
    ``t = (η(2τ)/η(τ))²⁴ = Δ(2τ)/Δ(τ)`` and ``j = (1 + 256t)³/t`` (the formula of the
    module docstring), so the ball encloses the exact value.
    """
    from flint import acb, arb, ctx

    from .eta import _eta_ball

    with ctx.workprec(prec):
        tau = acb(arb(-b) / (2 * a), arb(-D).sqrt() / (2 * a))
        t = (_eta_ball(2 * tau, prec) / _eta_ball(tau, prec)) ** 24
        return (1 + 256 * t) ** 3 / t


def j_invariant(tau: object, *, digits: int = 30):
    """The modular invariant ``j(τ)`` (normalised so that ``j(i) = 1728``).

    Parameters
    ----------
    tau : complex, mpmath.mpc or Form
        A point of the upper half plane, or a positive definite form ``(a, b, c)``,
        standing for its root ``τ = (−b + √D)/(2a)`` in the upper half plane.
    digits : int
        Decimal digits of working precision (the result is accurate to about that
        many significant digits, relative to ``max(1, |j|)``).

    Returns
    -------
    mpmath.mpc

    Raises
    ------
    FormError
        If ``tau`` is not in the upper half plane or the form is not positive definite.

    Examples
    --------
    >>> j_invariant(1j).real
    mpf('1728.0')
    >>> round(float(j_invariant(Form(1, 1, 2)).real))
    -3375

    References
    ----------
    Cox, *Primes of the Form x² + ny²*, §11 (the j-function); Euler's pentagonal theorem.
    """
    digits = as_int(digits, "digits")
    if digits < 5:
        raise FormError(f"digits must be at least 5, not {digits}")
    with mpmath.workdps(digits + 10):
        if isinstance(tau, Form):
            if not tau.is_positive_definite:
                raise FormError(f"j_invariant needs a positive definite form, not {tau!r}")
            a, b, _c = _reduce_definite_raw(tau.a, tau.b, tau.c)
            value = _j_of_form(a, b, tau.discriminant)
        else:
            try:
                z = mpmath.mpc(tau)
            except (TypeError, ValueError) as exc:
                raise FormError(f"tau must be a complex number or a Form, not {tau!r}") from exc
            if not z.imag > 0:
                raise FormError(f"tau must lie in the upper half plane (Im τ > 0), not {tau!r}")
            # move τ to the fundamental domain (τ ↦ τ + n, τ ↦ −1/τ)
            for _ in range(10_000):
                z -= mpmath.nint(z.real)
                if abs(z) < 1:
                    z = -1 / z
                else:
                    break
            value = _j_from_q(mpmath.exp(2j * mpmath.pi * z))
    with mpmath.workdps(digits):
        return +value
