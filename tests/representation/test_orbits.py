"""Tests of formkit.representation.orbits: solutions of Q(x, y) = n for indefinite forms, by orbits.

Sources: brute force in a box (every solution in the box lies in exactly one returned
orbit, and the orbits met equal the returned ones); Dirichlet's count for fundamental
D > 0 (Σ over narrow classes of the number of orbits = Σ_{d|n} χ_D(d), from memory);
sympy's ``diophantine`` parametric families as reference; classical facts on
x² − 2y² (h⁺(8) = 1; each split prime doubles the orbits).
"""

from __future__ import annotations

from itertools import islice
from math import gcd, isqrt

import pytest
import sympy

from formkit.core.arith import kronecker
from formkit.core.discriminants import is_fundamental_discriminant
from formkit.core.enumeration import class_representatives
from formkit.core.equivalence import fundamental_automorph
from formkit.core.forms import Form
from formkit.errors import FormError, NotAnIntegerError
from formkit.representation.orbits import orbit_representative, representation_orbits, walk_orbit
from formkit.representation.representations import dirichlet_count, represent, total_representation_count


def in_orbit(f, rep, v, box):
    """Is v = ±A^k rep for some k?  Walk the orbit until the entries leave the box."""
    A = fundamental_automorph(f)
    for w0 in (rep, (-rep[0], -rep[1])):
        for M in (A, ((A[1][1], -A[0][1]), (-A[1][0], A[0][0]))):
            w = w0
            for _ in range(200):
                if w == v:
                    return True
                w = (M[0][0] * w[0] + M[0][1] * w[1], M[1][0] * w[0] + M[1][1] * w[1])
                if abs(w[0]) > 10 * box and abs(w[1]) > 10 * box:
                    break
    return False


def box_solutions(f, n, B):
    """All (x, y) with |x|, |y| ≤ B and f(x, y) = n: for each y solve the quadratic in x
    exactly (a x² + b y x + c y² − n = 0)."""
    a, b, c = f.a, f.b, f.c
    out = []
    for y in range(-B, B + 1):
        if a == 0:
            xs = [x for x in range(-B, B + 1) if f(x, y) == n]
        else:
            disc = (b * y) ** 2 - 4 * a * (c * y * y - n)
            if disc < 0 or isqrt(disc) ** 2 != disc:
                continue
            s = isqrt(disc)
            xs = {(-b * y + e) // (2 * a) for e in (s, -s) if (-b * y + e) % (2 * a) == 0}
        out.extend((x, y) for x in xs if abs(x) <= B and f(x, y) == n)
    return out


INDEF = [
    Form(1, 0, -2),
    Form(1, 1, -1),
    Form(1, 0, -3),
    Form(-1, 0, 3),
    Form(2, 1, -4),
    Form(3, 4, -2),
    Form(1, 0, -7),
    Form(5, 7, -3),
    Form(4, 2, -1),
    Form(2, 0, -6),
    Form(1, 5, -3),
    Form(7, 11, -5),
]


@pytest.mark.parametrize("f", INDEF)
def test_indefinite_orbits_against_box(f):
    # every solution in the box lies in exactly one returned orbit; the number of orbits
    # met in a box containing all representatives equals the returned count.
    for n in list(range(-30, 31)):
        reps = representation_orbits(f, n)
        assert all(f(x, y) == n for x, y in reps)
        B = max([12] + [max(abs(x), abs(y)) for x, y in reps])
        hit = set()
        for x, y in box_solutions(f, n, B):
            owners = [r for r in reps if in_orbit(f, r, (x, y), B)]
            assert len(owners) == 1, (f, n, (x, y), owners)
            hit.add(owners[0])
            assert orbit_representative(f, (x, y)) == owners[0]
        assert hit == set(reps), (f, n)
        res = represent(f, n)
        assert res.count is None and res.orbit_count == len(reps)
        assert res.primitive_orbit_count == sum(1 for x, y in reps if gcd(x, y) == 1)


def test_indefinite_dirichlet_orbit_count():
    # For fundamental D > 0 and n ≥ 1: Σ over narrow classes of the number of orbits of
    # solutions of Q = n is Σ_{d|n} χ_D(d) (Dirichlet; same correspondence with ideals).
    for D in [5, 8, 12, 13, 17, 21, 24, 28, 29, 33, 40, 60, 65, 85, 136]:
        if not is_fundamental_discriminant(D):
            continue
        forms = class_representatives(D)
        for n in range(1, 60):
            total = sum(len(representation_orbits(g, n)) for g in forms)
            assert (
                total == sum(kronecker(D, d) for d in range(1, n + 1) if n % d == 0) == dirichlet_count(D, n)
            )
            assert total == total_representation_count(D, n)


def test_walk_orbit():
    f = Form(1, 1, -1)
    rep = representation_orbits(f, 11)[0]
    walked = list(islice(walk_orbit(f, rep), 40))
    assert len(set(walked)) == 40 and all(f(x, y) == 11 for x, y in walked)
    assert all(orbit_representative(f, v) == rep for v in walked)
    assert list(walk_orbit(f, (0, 0))) == [(0, 0)]


def test_indefinite_large_n():
    # x² − 2y² = n: with n = product of primes ≡ ±1 (mod 8) there are 2^k orbits of
    # primitive solutions (h⁺(8) = 1; each split prime doubles them).
    primes = [7, 17, 23, 31, 41, 47, 71, 73, 79, 89]
    n = 1
    for p in primes:
        n *= p
    reps = representation_orbits((1, 0, -2), n)
    assert len(reps) == 2 ** len(primes)
    assert all(x * x - 2 * y * y == n for x, y in reps)


def test_indefinite_against_sympy():
    # sympy's diophantine gives parametric families for x² − Dy² = n; their members must
    # fall in our orbits and meet every orbit.
    x, y, t = sympy.symbols("x y t", integer=True)
    for (a, b, c), n in [((1, 0, -2), 7), ((1, 0, -3), 13), ((1, 0, -7), 9), ((1, 0, -2), 119)]:
        fam = sympy.diophantine(a * x**2 + b * x * y + c * y**2 - n, syms=(x, y))
        f = Form(a, b, c)
        reps = set(representation_orbits(f, n))
        seen = set()
        for sol in fam:
            for k in range(3):
                u, v = (int(sympy.nsimplify(sympy.expand(e.subs(t, k)))) for e in sol)
                assert f(u, v) == n
                seen.add(orbit_representative(f, (u, v)))
        assert seen == reps, ((a, b, c), n)


def test_indefinite_zero_and_non_primitive():
    assert representation_orbits((1, 0, -2), 0) == ((0, 0),)
    assert representation_orbits((2, 0, -4), 7) == ()
    assert set(representation_orbits((2, 0, -4), 14)) == set(representation_orbits((1, 0, -2), 7))


def test_bad_input():
    with pytest.raises(FormError, match="definite"):
        representation_orbits((1, 0, 1), 5)
    with pytest.raises(FormError, match="definite"):
        orbit_representative((1, 0, 1), (1, 2))
    with pytest.raises(FormError, match="definite"):
        next(walk_orbit((1, 0, 1), (1, 2)))
    with pytest.raises(NotAnIntegerError):
        orbit_representative((1, 0, -2), (1.5, 2))
    with pytest.raises(NotAnIntegerError):
        representation_orbits((1, 0, -2), "7")
