"""Random discriminants for the tests: log-uniform samples, and ones built from known primes."""

from __future__ import annotations

import math

from sympy import nextprime

from formkit.core.discriminants import is_discriminant


def random_discriminants(rng, count, top, negative=True, nonfundamental_share=0.3):
    """``count`` non-square discriminants of log-uniform size below ``top``, some times f²."""
    out = []
    while len(out) < count:
        D = rng.randrange(3, int(10 ** rng.uniform(1, math.log10(top))))  # log-uniform sizes
        D = -D if negative else D
        if not is_discriminant(D) or (not negative and math.isqrt(D) ** 2 == D):
            continue
        if rng.random() < nonfundamental_share:
            f = rng.choice([2, 3, 5, 6, 7])
            if abs(D) * f * f < top:
                D *= f * f
        out.append(D)
    return out


def built_discriminant(rng, primes_wanted, digits, sign):
    """A fundamental ``D = sign·∏ p_i`` (times 4 when that is ≡ 3 mod 4) and its factorisation;
    the primes are seeded by ``rng`` (sympy.nextprime of random integers)."""
    while True:
        ps = [
            int(nextprime(rng.randrange(10 ** (digits - 1), 9 * 10 ** (digits - 1))))
            for _ in range(primes_wanted)
        ]
        if len(set(ps)) < primes_wanted:
            continue
        n = sign * math.prod(ps)
        fac = dict.fromkeys(ps, 1)
        if n % 4 == 1:
            return n, fac
        fac[2] = 2
        return 4 * n, fac  # n ≡ 3 mod 4: 4n is fundamental
