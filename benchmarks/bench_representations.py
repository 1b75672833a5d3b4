"""Benchmark: representations of 40- and 60-digit n, prime decision for 100-, 300- and
1000-digit primes, and the ratio against sympy's Diophantine solver.

Run:  python3 benchmarks/bench_representations.py [--repeat N] [--quick]

Prints medians of N runs (default 5) of CPU time (``time.process_time``), measured side
by side in one run:

* all solutions of Q(x, y) = n for n of 40 and 60 digits built as products of known
  primes (the factorisation is passed in, so the time is that of the square-root
  method alone; sympy's ``factorint`` of the same n is timed beside it), for forms of
  discriminant D = −100003 (|D| ≈ 10^5, h = 39, cyclic);
* deciding whether a form represents a prime of 100, 300 and 1000 digits: Cornacchia
  (modified, Cohen 1.5.3) for the principal form and the reduction test for it and for
  a non-principal form, with and without the probable-prime test;
* formkit's ``represent`` against ``sympy.diophantine`` on equations both solve (the
  solution sets are compared), with caches of both cleared before every timed call.
"""

from __future__ import annotations

import argparse
import random
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

import sympy

from formkit.core import arith, modular_roots
from formkit.core.arith import is_probable_prime, kronecker
from formkit.core.enumeration import class_number
from formkit.core.forms import Form
from formkit.representation.cornacchia import prime_representation
from formkit.representation.orbits import representation_orbits
from formkit.representation.representations import represent

D0 = -100003


def median_time(fn, repeat: int, setup=None) -> float:
    """Median CPU seconds (``time.process_time``) of ``fn()`` over ``repeat`` runs."""
    times = []
    for _ in range(repeat):
        if setup:
            setup()
        t = time.process_time()
        fn()
        times.append(time.process_time() - t)
    return statistics.median(times)


def clear_caches() -> None:
    arith._factorint_cached.cache_clear()
    modular_roots._sqrt_mod_prime_power.cache_clear()
    sympy.core.cache.clear_cache()


def prime_values(Q: Form, lo: int, hi: int, count: int, rng: random.Random) -> list[int]:
    """``count`` distinct primes in ``[lo, hi)`` represented by the positive definite ``Q``:
    values Q(x, y) at random points of the box around the ellipse Q ≤ hi, kept when
    they fall in the range and are probably prime (``hi/lo`` should be about 10)."""
    absD = -Q.discriminant
    xs = arith.isqrt(4 * Q.c * hi // absD)
    ys = arith.isqrt(4 * Q.a * hi // absD)
    out: list[int] = []
    while len(out) < count:
        x = rng.randrange(-xs, xs + 1)
        y = rng.randrange(1, ys + 1)
        v = Q(x, y)
        if lo <= v < hi and is_probable_prime(v) and v not in out:
            out.append(v)
    return out


def bench_large_n(repeat: int, factor_too: bool = True) -> None:
    rng = random.Random(20240)
    P = Form.principal(D0)  # x² + xy + 25001y²
    Q = Form(11, 3, 2273)  # a non-principal class of D0 (order 39)
    print(f"\n## All solutions of Q(x, y) = n, D = {D0}, h = {class_number(D0)}")
    print("| n digits | prime factors | form | solutions | primitive | solve (s) | sympy factorint (s) |")
    print("|---:|---|---|---:|---:|---:|---:|")
    for target, k, dg in ((40, 4, 10), (60, 6, 10), (60, 12, 5)):
        shape = f"{k} × {dg} digits"
        for form in (P, Q):
            # k − 1 primes represented by the principal form and a last one represented by
            # `form`, sized so that n has exactly `target` digits: n lies in the class of form
            primes = prime_values(P, 10 ** (dg - 1), 10**dg, k - 1, rng)
            M = 1
            for p in primes:
                M *= p
            primes += prime_values(form, -(-(10 ** (target - 1)) // M), 10**target // M, 1, rng)
            n = M * primes[-1]
            assert len(str(n)) == target
            fac = dict.fromkeys(primes, 1)
            res = represent(form, n, factors=fac)
            assert all(form(x, y) == n for x, y in res.solutions)
            t = median_time(lambda: represent(form, n, factors=fac), repeat, clear_caches)
            if factor_too and (k, dg) != (6, 10):
                tf = f"{median_time(lambda: sympy.factorint(n), 1, clear_caches):.3f}"
            else:
                tf = "not timed"  # Pollard rho on 10-digit factors: 40 s to many minutes
            print(
                f"| {len(str(n))} | {shape} | {form.to_list()} | {res.count} | {res.primitive_count} "
                f"| {t:.4f} | {tf} |",
                flush=True,
            )


def bench_primes(repeat: int, digit_list=(100, 300, 1000)) -> None:
    rng = random.Random(7)
    P = Form.principal(D0)
    Q = Form(11, 3, 2273)
    print(f"\n## Prime decision, D = {D0} (median ms)")
    print("| digits | form | represented | method | with prime test (ms) | assume_prime (ms) |")
    print("|---:|---|---|---|---:|---:|")
    for digits in digit_list:
        pP = prime_values(P, 10 ** (digits - 1), 10**digits, 1, rng)[0]
        pQ = prime_values(Q, 10 ** (digits - 1), 10**digits, 1, rng)[0]
        # a prime with χ_D(p) = 1 not in these classes, and one with χ_D(p) = −1
        q = int(arith.next_prime(10 ** (digits - 1)))
        while kronecker(D0, q) != -1:
            q = int(arith.next_prime(q))
        cases = [(P, pP, "auto"), (P, pP, "reduction"), (Q, pQ, "auto"), (Q, pP, "auto"), (P, q, "auto")]
        for form, p, method in cases:
            d = prime_representation(form, p, method=method)
            if d.represented:
                assert form(*d.solution) == p
            t1 = median_time(lambda: prime_representation(form, p, method=method), repeat)
            t2 = median_time(lambda: prime_representation(form, p, method=method, assume_prime=True), repeat)
            print(
                f"| {digits} | {form.to_list()} | {d.represented} | {d.method} | {1000 * t1:.2f} | {1000 * t2:.2f} |",
                flush=True,
            )


def bench_sympy(repeat: int) -> None:
    x, y = sympy.symbols("x y", integer=True)
    samples = [
        ((1, 0, 1), 5**6 * 13**3 * 17),
        ((1, 0, 1), 10000121 * 11000149 * 12000253),
        ((2, 1, 3), (10**6 + 3) * 47),
        ((3, 2, 7), 20 * 1000003),
        ((1, 0, 5), 1000000000061),  # prime ≡ 1 (mod 20)
        ((1, 1, 25001), 82821343 * 2506799),  # Q(1234, 57)·Q(77, 10), |D| ≈ 10^5
        ((1, 0, 1), int(sympy.nextprime(10**20 + 10**10)) * 5),
    ]
    print("\n## formkit `represent` against `sympy.diophantine` (definite forms, same solution sets)")
    print("| equation | solutions | formkit (s) | sympy (s) | sympy / formkit |")
    print("|---|---:|---:|---:|---:|")
    ratios = []
    for (a, b, c), n in samples:
        eq = a * x**2 + b * x * y + c * y**2 - n
        ours = sorted(represent((a, b, c), n).solutions)
        ref = sorted((int(u), int(v)) for u, v in sympy.diophantine(eq, syms=(x, y)))
        assert ours == ref, (a, b, c, n)
        t1 = median_time(lambda: represent((a, b, c), n), repeat, clear_caches)
        t2 = median_time(lambda: sympy.diophantine(eq, syms=(x, y)), repeat, clear_caches)
        ratios.append(t2 / t1)
        print(f"| {Form(a, b, c)} = {n} | {len(ours)} | {t1:.4f} | {t2:.4f} | {t2 / t1:.0f} |", flush=True)
    print(f"\nmedian ratio sympy / formkit: {statistics.median(ratios):.0f}")
    # one indefinite equation: sympy returns parametric families, formkit orbit representatives
    eq = x**2 - 2 * y**2 - 7 * 17 * 23 * 31
    t1 = median_time(lambda: representation_orbits((1, 0, -2), 7 * 17 * 23 * 31), repeat, clear_caches)
    t2 = median_time(lambda: sympy.diophantine(eq, syms=(x, y)), repeat, clear_caches)
    print(
        f"indefinite x^2 - 2y^2 = {7 * 17 * 23 * 31}: {len(representation_orbits((1, 0, -2), 7 * 17 * 23 * 31))} "
        f"orbits; formkit {t1:.4f} s, sympy (parametric families) {t2:.4f} s, ratio {t2 / t1:.0f}"
    )


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--repeat", type=int, default=5)
    ap.add_argument(
        "--quick",
        action="store_true",
        help="one run each, skip the 1000-digit primes and the sympy factoring",
    )
    args = ap.parse_args()
    repeat = 1 if args.quick else args.repeat
    print(f"integer backend: {arith.BACKEND}; CPU time medians of {repeat} run(s)", flush=True)
    bench_large_n(repeat, factor_too=not args.quick)
    bench_primes(repeat, (100, 300) if args.quick else (100, 300, 1000))
    bench_sympy(repeat)


if __name__ == "__main__":
    main()
