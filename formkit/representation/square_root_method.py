"""The square-root method shared by definite and indefinite representations.

A proper representation ``Q(x, y) = m`` (``gcd(x, y) = 1``) of a primitive form ``Q`` of
discriminant ``D`` corresponds to a root ``b`` of ``b² ≡ D (mod 4m)``, ``0 ≤ b < 2|m|``,
with ``(m, b, (b² − D)/4m)`` primitive and properly equivalent to ``Q``; all
representations are the proper ones of ``n/g²`` scaled by ``g``, over ``g² | n``
(Gauss, *Disquisitiones* art. 154–170; Cox, *Primes of the Form x² + ny²*, Lemma 2.5
and §2.A — numbers as recalled).  Here are the steps both kinds of form share: the
factorisation of ``|n|`` (checked when the caller gives it), the divisors ``g²``, the
roots ``b`` (:func:`formkit.core.modular_roots.sqrt_mod`), and the reduction of a
form with content or of a negative definite form to a primitive target.  Used by
:mod:`formkit.representation.representations` (definite forms) and
:mod:`formkit.representation.orbits` (indefinite forms).

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §2.
.. [2] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, §3.2.
"""

from __future__ import annotations

from ..core.arith import as_int, gcd
from ..core.factorisation import checked_factorisation, prime_factorisation
from ..core.forms import Form, FormLike, _require_nonsquare, as_form
from ..core.modular_roots import sqrt_mod

__all__: list = []


def _factor_abs(n: int, factors: dict[int, int] | None) -> dict[int, int]:
    """Factorisation of ``|n|`` (n ≠ 0), checked if given by the caller."""
    n = abs(n)
    if factors is None:
        return prime_factorisation(n, what="N") if n > 1 else {}
    return checked_factorisation(n, factors)


def square_divisor_cost(fac: dict[int, int]) -> tuple[float, float]:
    """Estimated ``(seconds, bytes)`` of the work over the ``g`` with ``g² | n`` (``n`` factored as ``fac``).

    There are ``S = ∏_p (⌊e_p/2⌋ + 1)`` of them; each is kept with the factorisation of
    ``n/g²`` (about ``200 + 60·ω(n)`` bytes) and costs at least one square root of ``D``
    modulo ``4n/g²`` (about ``2·10⁻⁵`` s, more for long numbers: measured 15 µs a divisor
    for ``n = 10^1000``, 251 001 divisors in 3.8 s, on the development machine).

    Examples
    --------
    >>> square_divisor_cost({2: 100000, 5: 100000})[1] > 10**11       # 50001² divisors
    True
    >>> square_divisor_cost({2: 3, 5: 2})[0] < 0.01
    True
    """
    S = 1
    for e in fac.values():
        S *= e // 2 + 1
    bits = sum(e * p.bit_length() for p, e in fac.items())
    return float(S) * 2e-5 * (1 + bits / 1e4), float(S) * (200 + 60 * len(fac))


def _square_divisors(fac: dict[int, int]) -> list[tuple[int, dict[int, int]]]:
    """All ``g`` with ``g² | n`` together with the factorisation of ``n/g²`` (priced first)."""
    from ..core.budget import check_cost, describe_integer

    seconds, memory = square_divisor_cost(fac)
    if seconds > 1 or memory > 10**8:
        S = 1
        for e in fac.values():
            S *= e // 2 + 1
        check_cost(
            f"the {describe_integer(S)} square divisors g² of N (each a set of square roots of D modulo 4N/g²)",
            seconds=seconds,
            memory=memory,
            further="their number is ∏(⌊e/2⌋ + 1) over the prime powers p^e ∥ N, so only an N with fewer "
            "repeated prime factors is cheaper",
        )
    out: list[tuple[int, dict[int, int]]] = [(1, dict(fac))]
    for p, e in fac.items():
        new = []
        for g, rest in out:
            for k in range(1, e // 2 + 1):
                r = dict(rest)
                r[p] = e - 2 * k
                if r[p] == 0:
                    del r[p]
                new.append((g * p**k, r))
        out.extend(new)
    return out


def _proper_roots(D: int, m: int, fac: dict[int, int]) -> list[int]:
    """The ``b`` in ``[0, 2|m|)`` with ``b² ≡ D (mod 4|m|)`` and ``(m, b, ·)`` primitive."""
    am = abs(m)
    fac4 = dict(fac)
    fac4[2] = fac4.get(2, 0) + 2
    roots = sqrt_mod(D, 4 * am, factors=fac4)
    two_m = 2 * am
    out = []
    for b in roots:
        if b >= two_m:
            break
        c = (b * b - D) // (4 * m)
        if gcd(am, b, c) == 1:
            out.append(int(b))
    return out


def _content_and_sign(form: FormLike, n: object) -> tuple[Form, int, int, int, int]:
    """Return ``(Q, D, k, sign, n)``; ``Q`` the original form, ``k`` its content and
    ``sign = −1`` for negative definite forms."""
    Q = as_form(form)
    D = _require_nonsquare(Q, "representations")
    n = as_int(n, "n")
    sign = -1 if (D < 0 and Q.a < 0) else 1
    return Q, D, Q.content, sign, n


def _primitive_target(Q: Form, k: int, sign: int, n: int) -> tuple[Form | None, int]:
    """The primitive positive-or-indefinite form and the value it must take, or ``None``
    when no representation is possible (content does not divide n)."""
    if n % k:
        return None, 0
    P = Form(sign * Q.a // k, sign * Q.b // k, sign * Q.c // k)
    return P, sign * n // k


def _scaled_factors(factors, n: int, m: int):
    """Factorisation of |m| from one of |n| (m = n/k), or None."""
    if factors is None:
        return None
    fac = _factor_abs(n, factors)
    q = abs(n) // abs(m)
    for p in prime_factorisation(q) if q > 1 else {}:
        while q % p == 0:
            fac[p] -= 1
            q //= p
    return {p: e for p, e in fac.items() if e}
