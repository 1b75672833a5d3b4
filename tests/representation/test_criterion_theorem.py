"""Every printed claim of ``prime_criterion`` checked against brute force, for |D| ≤ 3000.

The theorem under test (Chebotarev; Cox, *Primes of the Form x² + ny²*, §9, from memory):
the primes represented by a primitive form ``Q`` are described by congruences exactly when
the genus of ``Q`` is ``{Q, Q⁻¹}``.  For each class of each discriminant we check

* the genus, computed independently from the assigned characters (``genus_symbol``), is
  ``{Q, Q⁻¹}`` iff a congruence criterion is offered, and the stated genus size is right;
* when offered, the criterion holds for every prime ``p ≤ 10^5``: the residues are exactly
  the unit values of ``Q`` modulo ``|D|`` (all ``x, y`` modulo ``|D|`` tried, so a prime
  outside them is provably not represented), and every prime inside them gets an explicit
  solution ``Q(x, y) = p`` (box search; for D > 0 the leftovers through ``represent``, the
  solution checked by evaluating ``Q``);
* when not offered, the claim "no congruence criterion exists" has a witness modulo |D|:
  two primes ``p ≡ q (mod |D|)``, one represented and one not (D < 0: complete box search).

By default a sample of discriminants is walked with primes ≤ 3·10^4; the full walk (every D, both signs) is
``@pytest.mark.slow``, as is the density check at 10^6.
"""

import functools
import math

import numpy as np
import pytest

from formkit.classgroups.dispatch import class_group
from formkit.classgroups.genus import genus_symbol
from formkit.core.forms import Form
from formkit.representation.prime_criteria import (
    density_count,
    has_congruence_criterion,
    prime_criterion,
)
from formkit.representation.prime_decision import primes_up_to
from formkit.representation.representations import represent

N = 10**5


def _discriminants(bound: int) -> list[int]:
    out = []
    for D in range(-bound, bound + 1):
        if D % 4 in (0, 1) and D != 0 and not (D > 0 and math.isqrt(D) ** 2 == D):
            out.append(D)
    return out


ALL_D = _discriminants(3000)
# default sample: every 150th discriminant, plus the cases of the issue and classical ones (−56: genus
# {Q, Q⁻¹} with h = 4; −4·14, −4·21, 316 = 4·79 narrow h⁺ = 6; 136 = 8·17; −420 one class per genus)
SAMPLE_D = sorted(set(ALL_D[::150]) | {-56, -84, -420, -23, -47, -104, 316, 136, 12, 60, 229, -2379, 2920})


@functools.cache
def _primes(n: int) -> np.ndarray:
    return np.array(primes_up_to(n), dtype=np.int64)


def _values_in_box(Q: Form, n: int, box: int | None = None) -> set[int]:
    """Values 1 ≤ Q(x, y) ≤ n: complete for definite Q; a box search |x|, |y| ≤ box otherwise."""
    a, b, c = Q.coefficients
    D = Q.discriminant
    if D < 0:  # a(x + by/2a)² + |D|y²/4a ≤ n bounds y, then x
        ymax = math.isqrt(4 * a * n // -D) + 1
        ys = np.arange(-ymax, ymax + 1, dtype=np.int64)
        xmax = math.isqrt(n // a) + abs(b) * ymax // (2 * a) + 2
        xs = np.arange(-xmax, xmax + 1, dtype=np.int64)
    else:
        xs = ys = np.arange(-box, box + 1, dtype=np.int64)
    X, Y = np.meshgrid(xs, ys, sparse=True)
    V = a * X * X + b * X * Y + c * Y * Y
    V = V[(V >= 1) & (n >= V)]
    return set(np.unique(V).tolist())


def _unit_values(Q: Form, m: int) -> set[int]:
    """Residues modulo m of the values of Q prime to m (all x, y modulo m)."""
    a, b, c = Q.coefficients
    r = np.arange(m, dtype=np.int64)
    X, Y = np.meshgrid(r, r, sparse=True)
    V = (a * X * X + b * X * Y + c * Y * Y) % m
    return {int(v) for v in np.unique(V) if math.gcd(int(v), m) == 1}


def _genus_by_characters(G, C) -> set:
    sym = genus_symbol(C.form)
    return {G(f) for f in G.forms() if genus_symbol(f) == sym}


def _check_discriminant(D: int, n: int = N) -> None:
    G = class_group(D)
    primes = _primes(n)
    m = abs(D)
    for f in G.forms():
        Q = Form(*f.coefficients) if not isinstance(f, Form) else f
        if D < 0 and Q.a < 0:
            continue
        C = G(Q)
        genus = _genus_by_characters(G, C)
        pair = {C, C.inverse()}
        assert pair <= genus, (D, Q)
        crit = prime_criterion(Q, polynomial=False)
        assert crit.genus_size == len(genus), (D, Q)
        offered = crit.kind == "congruence"
        assert offered == (genus == pair) == has_congruence_criterion(Q), (D, Q)
        prime_to_D = [int(p) for p in primes if m % p]
        if offered:
            assert crit.modulus == m
            assert set(crit.residues) == _unit_values(Q, m), (D, Q)
            assert "so a congruence criterion exists" in crit.statement
            claimed = [p for p in prime_to_D if p % m in set(crit.residues)]
            found = _values_in_box(Q, n, box=400)
            for p in claimed:
                if p in found:
                    continue
                assert D > 0, (D, Q, p)  # the definite box search is complete
                sols = represent(Q, p, limit=1)
                assert sols.represented, (D, Q, p)
                x, y = sols.orbits[0] if sols.orbits else sols.solutions[0]
                assert Q(x, y) == p
        else:
            assert "no congruence criterion exists" in crit.statement
            found = _values_in_box(Q, n, box=400)
            rep = {p % m for p in prime_to_D if p in found}
            witness = any(
                p % m in rep and p not in found and (D < 0 or not represent(Q, p, limit=1).represented)
                for p in prime_to_D
            )
            assert witness, (D, Q)


@pytest.mark.parametrize("D", SAMPLE_D)
def test_criterion_claims_sample(D):
    _check_discriminant(D, 3 * 10**4)  # primes ≤ 3·10^4 by default; ≤ 10^5 in the slow walk


@pytest.mark.slow
@pytest.mark.parametrize("D", ALL_D)
def test_criterion_claims_every_discriminant(D):
    _check_discriminant(D)


def test_issue_example_3_2_5():
    # the issue's form: genus {(3,2,5), (3,−2,5)}, represented primes ≡ 3, 5, 13, 19, 27, 45 (mod 56)
    c = prime_criterion((3, 2, 5))
    assert c.kind == "congruence" and c.residues == (3, 5, 13, 19, 27, 45) and c.genus_size == 2
    assert "no congruence criterion" not in c.statement and "as recalled" not in c.statement


# Densities at 10^6.  Tolerance: |count − expected| ≤ 6·sqrt(expected) + 1% of expected —
# six binomial standard deviations plus room for Chebyshev-type bias (common practice, no source).
# The printed density (1/h, or 1/(2h) for a class of order ≤ 2; h⁺ for D > 0) is a theorem of
# Chebotarev type (Cox §9.B, from memory); the counts are brute force for D < 0 (every value
# ≤ 10^6 of the form, a complete search) and, for D > 0, the class of the prime form at every
# split prime (``method="classes"``, a different path from the congruence the criterion uses).
DENSITY_FORMS = [
    (1, 0, 1),
    (1, 0, 5),
    (3, 2, 5),
    (1, 0, 14),
    (1, 0, 27),
    (2, 1, 3),
    (1, 1, 6),
    (1, 0, -2),
    (1, 0, -79),
    (2, 1, -5),
    (1, 1, -7),
    (5, 4, 11),
    (1, 0, 41),
]


def _density_forms_of_sample() -> list[tuple[int, int, int]]:
    """Every class (one form each, positive definite for D < 0) of every discriminant of the sample."""
    out = []
    for D in SAMPLE_D:
        for f in class_group(D).forms():
            a, b, c = f.coefficients
            if D > 0 or a > 0:
                out.append((a, b, c))
    return out


def _brute_prime_count(form: tuple[int, int, int], n: int) -> int:
    Q = Form(*form)
    if Q.discriminant < 0:
        vals = np.fromiter(_values_in_box(Q, n), dtype=np.int64)
        primes = _primes(n)
        return int(np.isin(primes, vals).sum())
    from formkit.representation.prime_criteria import represented_primes

    return len(represented_primes(Q, n, method="classes"))


def _check_density(form: tuple[int, int, int], n: int) -> None:
    d = density_count(form, n)
    count = _brute_prime_count(form, n)
    assert count == d.represented, (form, count, d)
    assert d.prime_count == len(_primes(n))
    assert abs(count - d.expected) <= 6 * math.sqrt(d.expected) + 0.01 * d.expected, (form, count, d)


@pytest.mark.parametrize("form", DENSITY_FORMS[:6])
def test_density_at_one_hundred_thousand(form):
    _check_density(form, 10**5)


@pytest.mark.slow
@pytest.mark.parametrize("form", sorted(set(DENSITY_FORMS) | set(_density_forms_of_sample())))
def test_density_at_one_million(form):
    _check_density(form, 10**6)
