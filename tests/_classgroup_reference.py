"""Brute-force references for the class-group tests (independent of formkit's algorithms).

Everything here is written from the definitions, in plain Python integers, and uses
no formkit function except the ``Form`` value type for convenience at the call sites:

* reduced forms by scanning every ``b`` (definite: ``|b| ≤ a ≤ c``; indefinite:
  ``0 < b < √D``, ``√D − b < 2|a| < √D + b``), instead of square roots modulo ``4a``;
* the reduction operator ρ and the cycles of reduced indefinite forms (Gauss;
  Buchmann–Vollmer, *Binary Quadratic Forms*, §6.1–6.10, from memory);
* composition through **ideal multiplication** in the order ``O_D``: the class of a
  primitive form ``(a, b, c)`` with ``a > 0`` is that of the invertible ideal
  ``[a, (−b + √D)/2]`` (Cox, *Primes of the Form x² + ny²*, Theorem 7.7 for D < 0; the
  same map on narrow classes for D > 0, Buchmann–Vollmer Ch. 6–7, from memory).  The
  product ideal is put in Hermite normal form and its content divided out.  This is a
  different algorithm from Dirichlet/Arndt composition and from NUCOMP;
* the structure of a finite abelian group from the number of elements whose order
  divides ``p^k`` (for each prime ``p``): ``log_p(N(p^k)/N(p^(k−1)))`` is the number of
  invariant factors divisible by ``p^k``.
"""

from __future__ import annotations

import math
from functools import cache

import _foundation_strategies as _fs

# ---------------------------------------------------------------------------
# number theory helpers (plain Python)


def prime_factors(n: int) -> list[int]:
    n = abs(n)
    out = []
    p = 2
    while p * p <= n:
        if n % p == 0:
            out.append(p)
            while n % p == 0:
                n //= p
        p += 1
    if n > 1:
        out.append(n)
    return out


def is_squarefree(n: int) -> bool:
    n = abs(n)
    p = 2
    while p * p <= n:
        if n % (p * p) == 0:
            return False
        p += 1
    return True


def is_fundamental(d: int) -> bool:
    """Fundamental discriminant by the definition (d ≡ 1 mod 4 squarefree, or 4m with m ≡ 2, 3 mod 4 squarefree)."""
    if d in (0, 1):
        return False
    if d % 4 == 1:
        return is_squarefree(d)
    if d % 4 == 0:
        m = d // 4
        return m % 4 in (2, 3) and is_squarefree(m)
    return False


def fundamental_part(D: int) -> tuple[int, int]:
    """``(d_K, f)`` with ``D = f²·d_K`` by trial division (definition)."""
    f, d = 1, D
    for p in range(2, math.isqrt(abs(D)) + 1):
        while d % (p * p) == 0 and (d // (p * p)) % 4 in (0, 1):
            d //= p * p
            f *= p
    assert is_fundamental(d), (D, d, f)
    return d, f


def legendre_kronecker(d: int, n: int) -> int:
    """Kronecker symbol (d/n) for a prime n, from Euler's criterion (n odd) or the rule at 2."""
    if n == 2:
        if d % 2 == 0:
            return 0
        return 1 if d % 8 in (1, 7) else -1
    r = pow(d % n, (n - 1) // 2, n)
    return 0 if r == 0 else (1 if r == 1 else -1)


# ---------------------------------------------------------------------------
# reduced forms by scanning


def brute_reduced_definite(D: int) -> list[tuple[int, int, int]]:
    """All primitive reduced positive definite forms of D < 0 by scanning every b."""
    return _fs.brute_reduced_definite(D, primitive=True)


def is_reduced_indefinite(a: int, b: int, D: int) -> bool:
    s = math.isqrt(D)
    A = abs(a)
    return 0 < b <= s and 2 * A + b > s and 2 * A - b <= s


def brute_reduced_indefinite(D: int) -> list[tuple[int, int, int]]:
    """All primitive reduced indefinite forms of D > 0 by scanning b and a."""
    return _fs.brute_reduced_indefinite(D, primitive=True)


def rho(f: tuple[int, int, int], D: int) -> tuple[int, int, int]:
    """The reduction operator: ``(a, b, c) -> (c, b', ·)``, ``b' ≡ −b (mod 2|c|)`` normalised."""
    _a, b, c = f
    s = math.isqrt(D)
    C = abs(c)
    if s < C:
        # -|c| < b' <= |c|
        bp = (-b) % (2 * C)
        if bp > C:
            bp -= 2 * C
    else:
        # √D − 2|c| < b' < √D, i.e. s − 2|c| < b' <= s
        bp = s - ((s + b) % (2 * C))
    assert (bp + b) % (2 * C) == 0
    return (c, bp, (bp * bp - D) // (4 * c))


def reduce_indefinite(f: tuple[int, int, int], D: int) -> tuple[int, int, int]:
    for _ in range(100000):
        if is_reduced_indefinite(f[0], f[1], D):
            return f
        f = rho(f, D)
    raise AssertionError(f"reduction of {f} did not terminate")


def reduce_definite(f: tuple[int, int, int]) -> tuple[int, int, int]:
    """Gauss–Lagrange reduction of a positive definite form, written out from the definition."""
    a, b, c = f
    assert a > 0
    while True:
        # translate: b -> b + 2ak into (-a, a]
        k = (a - b) // (2 * a)
        b, c = b + 2 * a * k, a * k * k + b * k + c
        if c < a:
            a, b, c = c, -b, a
            continue
        if a == c and b < 0:
            b = -b
        return (a, b, c)


@cache
def indefinite_cycles(D: int) -> dict[tuple[int, int, int], int]:
    """Map every reduced form of D > 0 to the index of its ρ-cycle (cycles numbered from 0)."""
    index: dict[tuple[int, int, int], int] = {}
    n = 0
    for f in brute_reduced_indefinite(D):
        if f in index:
            continue
        g = f
        while True:
            index[g] = n
            g = rho(g, D)
            if g == f:
                break
        n += 1
    return index


def class_key(f: tuple[int, int, int], D: int):
    """A canonical label of the proper class of ``f`` (reduced form, or cycle number)."""
    if D < 0:
        return reduce_definite(f)
    return indefinite_cycles(D)[reduce_indefinite(f, D)]


def brute_class_number(D: int) -> int:
    if D < 0:
        return len(brute_reduced_definite(D))
    return max(indefinite_cycles(D).values()) + 1


# ---------------------------------------------------------------------------
# composition through ideals


def _with_positive_a(f: tuple[int, int, int]) -> tuple[int, int, int]:
    """A properly equivalent form with a > 0 (indefinite forms represent positive numbers)."""
    a, b, c = f
    if a > 0:
        return f
    for y in range(1, 1000):
        for x in range(-1000, 1001):
            if math.gcd(x, y) != 1:
                continue
            v = a * x * x + b * x * y + c * y * y
            if v > 0:
                # M = [[x, r], [y, s]] with xs − ry = 1
                _g, s0, r0 = _egcd(x, y)  # x*s0 + y*r0 = 1
                p, q, r, s = x, -r0, y, s0
                return (
                    a * p * p + b * p * r + c * r * r,
                    2 * a * p * q + b * (p * s + q * r) + 2 * c * r * s,
                    a * q * q + b * q * s + c * s * s,
                )
    raise AssertionError(f"no positive value of {f} found")


def _egcd(a: int, b: int) -> tuple[int, int, int]:
    x0, y0, x1, y1 = 1, 0, 0, 1
    while b:
        q = a // b
        a, b = b, a - q * b
        x0, x1 = x1, x0 - q * x1
        y0, y1 = y1, y0 - q * y1
    if a < 0:
        a, x0, y0 = -a, -x0, -y0
    return a, x0, y0


def _hnf2(vectors: list[tuple[int, int]]) -> tuple[int, int, int]:
    """HNF of a full-rank lattice in Z²: basis (X, 0), (Y, Z) with X, Z > 0, 0 ≤ Y < X."""
    vecs = [v for v in vectors if v != (0, 0)]
    # Euclid on the second coordinates
    top = None
    rest = []
    for v in vecs:
        if top is None:
            if v[1] != 0:
                top = v
            else:
                rest.append(v)
            continue
        if v[1] == 0:
            rest.append(v)
            continue
        u, w = top, v
        while w[1] != 0:
            q = u[1] // w[1]
            u, w = w, (u[0] - q * w[0], u[1] - q * w[1])
        top = u
        rest.append(w)
    assert top is not None
    if top[1] < 0:
        top = (-top[0], -top[1])
    X = 0
    for v in rest:
        assert v[1] == 0
        X = math.gcd(X, v[0])
    assert X > 0
    Y, Z = top[0] % X, top[1]
    return X, Y, Z


def ideal_compose(F: tuple[int, int, int], G: tuple[int, int, int], D: int) -> tuple[int, int, int]:
    """A form in the product class of F and G, through the product of their ideals."""
    a1, b1, _ = _with_positive_a(F)
    a2, b2, _ = _with_positive_a(G)
    # elements (u + v√D)/2 as pairs (u, v)
    alpha1, beta1 = (2 * a1, 0), (-b1, 1)
    alpha2, beta2 = (2 * a2, 0), (-b2, 1)

    def mul(x, y):
        (u1, v1), (u2, v2) = x, y
        # (u1 + v1√D)(u2 + v2√D)/4 = ((u1u2 + D v1v2)/2 + (u1v2 + u2v1)/2 √D)/2
        U, V = u1 * u2 + D * v1 * v2, u1 * v2 + u2 * v1
        assert U % 2 == 0 and V % 2 == 0
        return (U // 2, V // 2)

    gens = [mul(alpha1, alpha2), mul(alpha1, beta2), mul(beta1, alpha2), mul(beta1, beta2)]
    X, Y, Z = _hnf2(gens)
    assert X % (2 * Z) == 0 and Y % Z == 0, (X, Y, Z)
    a = X // (2 * Z)
    b = (-Y // Z) % (2 * a)
    assert (b * b - D) % (4 * a) == 0, (F, G, a, b)
    return (a, b, (b * b - D) // (4 * a))


def class_product(F, G, D):
    return class_key(ideal_compose(tuple(F), tuple(G), D), D)


# ---------------------------------------------------------------------------
# a brute-force class group: reps, multiplication table, structure from order counts


class BruteGroup:
    """Cl(D) from brute-force representatives and ideal multiplication (small |D| only)."""

    def __init__(self, D: int) -> None:
        self.D = D
        if D < 0:
            self.reps = brute_reduced_definite(D)
        else:
            cycles = indefinite_cycles(D)
            first: dict[int, tuple[int, int, int]] = {}
            for f, i in sorted(cycles.items()):
                first.setdefault(i, f)
            self.reps = [first[i] for i in sorted(first)]
        self.key = {f: class_key(f, D) for f in self.reps}
        self.by_key = {k: f for f, k in self.key.items()}
        self.h = len(self.reps)
        one = (1, D % 2, (D % 2 - D) // 4)
        self.one = class_key(one, D)

    def mul(self, x, y):
        """Product of two class keys."""
        return class_product(self.by_key[x], self.by_key[y], self.D)

    def order(self, x) -> int:
        n, y = 1, x
        while y != self.one:
            y = self.mul(y, x)
            n += 1
        return n

    def invariants(self) -> tuple[int, ...]:
        orders = [self.order(k) for k in self.by_key]
        h = self.h
        assert all(h % o == 0 for o in orders)
        pparts: dict[int, list[int]] = {}
        for p in prime_factors(h):
            counts = []
            k = 0
            while True:
                n = sum(1 for o in orders if (p**k) % o == 0)
                counts.append(n)
                if n == h or (k > 0 and counts[-1] == counts[-2]):
                    break
                k += 1
            # r_k = #{invariants with p^k | n_i} = log_p(N(p^k)/N(p^(k-1)))
            exps = []
            for k in range(1, len(counts)):
                ratio = counts[k] // counts[k - 1]
                r = round(math.log(ratio, p))
                assert p**r == ratio
                exps.append(r)
            # exponents of p in the invariants: number of i with v_p(n_i) >= k is exps[k-1]
            rank = exps[0] if exps else 0
            vals = [sum(1 for r in exps if r > i) for i in range(rank)]
            pparts[p] = sorted(p**v for v in vals)
        rank = max((len(v) for v in pparts.values()), default=0)
        inv = [1] * rank
        for powers in pparts.values():
            powers = [1] * (rank - len(powers)) + powers
            inv = [x * y for x, y in zip(inv, powers)]
        return tuple(inv)


def extend_to_maximal(F: tuple[int, int, int], D: int) -> tuple[int, int, int]:
    """A form of discriminant d_K in the class of the ideal I·O_K, I the ideal of F in O_D.

    With ``D = f²·d_K`` and ``a > 0``, ``I = [a, (−b + f√d_K)/2]``; the products of its
    basis with the basis ``1, (d_K + √d_K)/2`` of ``O_K`` span ``I·O_K`` (Cox §7.A, from memory).
    """
    d, f = fundamental_part(D)
    a, b, _ = _with_positive_a(F)
    # elements (u + v√d)/2 as pairs (u, v)
    alpha, beta = (2 * a, 0), (-b, f)
    one, omega = (2, 0), (d, 1)

    def mul(x, y):
        (u1, v1), (u2, v2) = x, y
        U, V = u1 * u2 + d * v1 * v2, u1 * v2 + u2 * v1
        assert U % 2 == 0 and V % 2 == 0
        return (U // 2, V // 2)

    X, Y, Z = _hnf2([mul(alpha, one), mul(alpha, omega), mul(beta, one), mul(beta, omega)])
    assert X % (2 * Z) == 0 and Y % Z == 0, (X, Y, Z)
    A = X // (2 * Z)
    B = (-Y // Z) % (2 * A)
    assert (B * B - d) % (4 * A) == 0
    return (A, B, (B * B - d) // (4 * A))


def wide_class_number(D: int) -> int:
    """For D > 0: narrow classes up to (a, b, c) ~ (−a, b, −c) (multiplication by an
    element of negative norm; Buchmann–Vollmer Ch. 6, from memory), counted on cycles."""
    cycles = indefinite_cycles(D)
    orbits = set()
    for (a, b, c), i in cycles.items():
        j = cycles[(-a, b, -c)]
        orbits.add((min(i, j), max(i, j)))
    return len(orbits)


def has_unit_of_norm_minus_one(D: int) -> bool:
    """True iff (1, b, c) and (−1, b, −c) lie on one ρ-cycle (the principal form
    properly represents −1), i.e. t² − D·u² = −4 is solvable."""
    s = math.isqrt(D)
    b = s if (s - D) % 2 == 0 else s - 1
    cycles = indefinite_cycles(D)
    one = reduce_indefinite((1, b, (b * b - D) // 4), D)
    minus = reduce_indefinite((-1, b, -(b * b - D) // 4), D)
    return cycles[one] == cycles[minus]
