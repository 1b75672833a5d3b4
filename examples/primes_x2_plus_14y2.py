"""A researcher describes the primes of the form x^2 + 14y^2.

Scenario
--------
14 is not one of Euler's idoneal numbers: the genus of x^2 + 14y^2 (discriminant
D = -56, class group C4) contains a second class, 2x^2 + 7y^2, so no congruence
condition modulo 56 singles out the primes p = x^2 + 14y^2 (Cox, Primes of the Form
x^2 + ny^2, Section 2 and Theorem 9.2 as recalled).  Instead, for odd primes p not
dividing 56 * disc(H):

    p = x^2 + 14y^2  <=>  (-56/p) = 1 and H(x) = 0 has a root modulo p,

with H the Hilbert class polynomial of D = -56 (degree h(-56) = 4).  The researcher

1. states the criterion (formkit.prime_criterion) and prints H with its verification;
2. lists the primes p < 1000 of the form x^2 + 14y^2 with a solution for each
   (formkit.represented_primes, formkit.represent);
3. checks the list three independent ways: a brute-force search over x, y; the
   class-polynomial criterion (root counts of H modulo p); and the genus (the
   congruence classes modulo 56, which x^2 + 14y^2 shares with 2x^2 + 7y^2);
4. compares the proportion among all primes with the density 1/(2h) = 1/8
   (Chebotarev; the class of x^2 + 14y^2 has order 1).

Run:  python examples/primes_x2_plus_14y2.py [BOUND]
"""

from __future__ import annotations

import math
import sys

import sympy

from formkit.core.arith import kronecker
from formkit.representation.class_polynomials import class_polynomial
from formkit.representation.prime_criteria import prime_criterion, represented_primes
from formkit.representation.prime_decision import primes_up_to
from formkit.representation.representations import represent

Q = (1, 0, 14)
D = -56


def brute_force(bound: int) -> list[int]:
    """Primes p <= bound with p = x^2 + 14y^2, by trying every y and testing x."""
    found = set()
    for y in range(math.isqrt(bound // 14) + 1):
        for x in range(math.isqrt(bound) + 1):
            v = x * x + 14 * y * y
            if v <= bound and sympy.isprime(v):
                found.add(v)
    return sorted(found)


def main(argv: list[str]) -> int:
    bound = int(argv[0]) if argv else 1000
    crit = prime_criterion(Q)
    H = class_polynomial(D)
    x = sympy.Symbol("x")
    disc = int(sympy.discriminant(sympy.Poly(list(H.coefficients), x)))
    bad_primes = sorted(sympy.factorint(abs(disc)))
    print(
        f"Primes of the form x^2 + 14y^2 (D = {D}, h = {crit.class_number}, class order {crit.class_order})"
    )
    print(f"criterion kind: {crit.kind}")
    print(f"H(x) = {H}")
    ver = H.verification
    if ver is not None:
        print(
            f"H certified: ball arithmetic at {ver.precision_bits} bits, coefficients bounded by 10^{ver.bound_digits}, "
            f"root counts checked at {len(ver.primes_checked)} primes"
        )
    print(f"primes dividing disc(H): {bad_primes}")
    print(f"statement: {crit.statement}")

    listed = represented_primes(Q, bound)
    print(f"\nprimes p <= {bound} with p = x^2 + 14y^2: {len(listed)}")
    for p in listed[:12]:
        sol = next((s for s in represent(Q, p).solutions if s[0] >= 0 and s[1] >= 0), None)
        print(f"  {p:5d} = {sol[0]}^2 + 14*{sol[1]}^2")
    if len(listed) > 12:
        print(f"  ... and {len(listed) - 12} more up to {bound}")

    brute = brute_force(bound)
    print(f"\ncheck 1, brute force over x, y: {'agrees' if brute == listed else 'DISAGREES'}")

    by_poly = [
        p
        for p in primes_up_to(bound)
        if p % 2 and 56 % p and p not in bad_primes and kronecker(D, p) == 1 and H.root_count_mod(p) > 0
    ]
    listed_generic = [p for p in listed if p % 2 and 56 % p and p not in bad_primes]
    print(
        f"check 2, class polynomial criterion (odd p not dividing 56*disc(H)): "
        f"{'agrees' if by_poly == listed_generic else 'DISAGREES'} ({len(by_poly)} primes)"
    )

    residues = sorted({p % 56 for p in listed if 56 % p})
    other = list(brute_force_form((2, 0, 7), bound))
    shared = sorted({p % 56 for p in other if 56 % p})
    print(
        f"check 3, genus: p mod 56 lies in {residues}; 2x^2 + 7y^2 gives the same classes: "
        f"{'yes' if residues == shared else 'no'} -- so no congruence criterion exists"
    )

    # Cox's own form of the criterion for n = 14 (Primes of the Form x^2 + ny^2, the
    # introduction; quoted from memory): for odd p != 7, p = x^2 + 14y^2 iff (-14/p) = 1
    # and (x^2 + 1)^2 = 8 (mod p) is solvable.  Checked by trying every x modulo p.
    by_cox = [
        p
        for p in primes_up_to(bound)
        if p % 2
        and p != 7
        and kronecker(-14, p) == 1
        and any((t * t + 1) ** 2 % p == 8 % p for t in range(p))
    ]
    print(
        f"check 4, (x^2 + 1)^2 = 8 (mod p) as in Cox: {'agrees' if by_cox == [p for p in listed if p % 2 and p != 7] else 'DISAGREES'}"
    )

    total = len(primes_up_to(bound))
    print(
        f"\ndensity: {len(listed)}/{total} = {len(listed) / total:.4f} of the primes up to {bound}; "
        f"Chebotarev density {crit.density} = {float(crit.density):.4f}"
    )
    return 0


def brute_force_form(form: tuple[int, int, int], bound: int) -> list[int]:
    """Primes p <= bound represented by a positive definite diagonal form a x^2 + c y^2."""
    a, _, c = form
    found = set()
    for y in range(math.isqrt(bound // c) + 1):
        for x in range(math.isqrt(bound // a) + 1):
            v = a * x * x + c * y * y
            if v <= bound and sympy.isprime(v):
                found.add(v)
    return sorted(found)


if __name__ == "__main__":
    raise SystemExit(main(sys.argv[1:]))
