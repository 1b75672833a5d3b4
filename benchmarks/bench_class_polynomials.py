"""Benchmark: class polynomials H_D for class numbers about 20, 50, 100, 200, and the
``primes`` command up to 10^6.

Run:  python3 benchmarks/bench_class_polynomials.py [--repeat N] [--quick]

Prints medians of N runs (default 3) of CPU time, measured side by side in one run:

* H_D: the computation alone (``verify=False``) beside the verified one (a second
  computation at higher precision, residuals, the coefficient bound and root counts
  modulo primes), with the digits used, the stated bound B(D) and the actual size of
  the largest coefficient;
* represented primes up to 10^6: the congruence method beside the per-prime class
  method on the same form, and the whole ``formkit primes … --bound 10^6 --json``
  command for forms of every kind.
"""

from __future__ import annotations

import argparse
import io
import math
import statistics
import sys
import time
from contextlib import redirect_stdout
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from formkit.cli import main
from formkit.core.enumeration import class_number
from formkit.representation import class_polynomials as cp
from formkit.representation.class_polynomials import class_polynomial, class_polynomial_bound
from formkit.representation.prime_criteria import represented_primes


def median_time(fn, repeat: int) -> float:
    """Median CPU seconds of this process (``time.process_time``): single-threaded work,
    so this is what the code costs even when other jobs share the machine."""
    times = []
    for _ in range(repeat):
        t = time.process_time()
        fn()
        times.append(time.process_time() - t)
    return statistics.median(times)


def first_discriminant_with_class_number(h: int) -> int:
    D = -3
    while True:
        D -= 1
        if D % 4 in (0, 1) and class_number(D) == h:
            return D


def bench_class_polynomials(targets, repeat: int) -> None:
    print("## class polynomials (median of", repeat, "runs)")
    print(
        f"{'D':>8} {'h':>4} {'bound B':>8} {'actual':>7} {'digits':>7} {'compute s':>10} {'verified s':>11} {'ratio':>6}"
    )
    for h in targets:
        D = first_discriminant_with_class_number(h)

        def plain():
            cp._class_polynomial.cache_clear()
            return class_polynomial(D, verify=False)

        def verified():
            cp._class_polynomial.cache_clear()
            return class_polynomial(D)

        t1 = median_time(plain, repeat)
        t2 = median_time(verified, repeat)
        H = class_polynomial(D)
        actual = math.log10(max(abs(c) for c in H.coefficients))
        print(
            f"{D:>8} {H.degree:>4} {class_polynomial_bound(D):>8.0f} {actual:>7.0f} {H.working_digits:>7} "
            f"{t1:>10.3f} {t2:>11.3f} {t2 / t1:>6.2f}"
        )


def bench_primes(repeat: int, X: int) -> None:
    print(f"\n## represented primes up to {X} (median of {repeat} runs)")
    form = (1, 0, 5)
    represented_primes(form, 1000)  # warm the class group cache
    tc = median_time(lambda: represented_primes(form, X, method="congruence"), repeat)
    tk = median_time(lambda: represented_primes(form, X, method="classes"), repeat)
    print(f"x^2+5y^2: congruence {tc:.3f} s, per-prime classes {tk:.3f} s, ratio {tk / tc:.1f}")
    print(f"\n{'command (class polynomial recomputed each run)':<50} {'seconds':>8}")
    for args in (["x^2+5y^2"], ["1,0,27"], ["2,1,3"], ["1,0,14"], ["1,0,-79"], ["x^2-2y^2"], ["1,1,1319"]):
        argv = ["primes", *args, "--bound", str(X), "--json"]

        def run():
            cp._class_polynomial.cache_clear()  # count the class polynomial every time
            with redirect_stdout(io.StringIO()):
                assert main(argv) == 0

        t = median_time(run, repeat)
        print(f"formkit {' '.join(argv):<42} {t:>8.3f}")


def main_bench() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--quick", action="store_true", help="class numbers 20, 50 and primes to 10^5 only")
    args = ap.parse_args()
    targets = (20, 50) if args.quick else (20, 50, 100, 200)
    bench_class_polynomials(targets, args.repeat)
    bench_primes(args.repeat, 10**5 if args.quick else 10**6)


if __name__ == "__main__":
    main_bench()
