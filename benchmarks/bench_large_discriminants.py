"""Benchmark: class groups of large discriminants by baby-step giant-step.

Prints, for random fundamental D < 0 of each size, the median wall-clock and CPU time
of ``class_group_bsgs(D)``, the median number of group operations (compositions and
squarings), and that number against the |D|^(1/4) and |D|^(1/5) rules of thumb; then
enumeration against baby-step giant-step side by side around the
``ENUMERATION_LIMIT`` threshold; then for D > 0 the class numbers and regulator
(``real_class_number``), the narrow class group (``real_class_group``) and enumeration
side by side.

Usage:  python3 benchmarks/bench_large_discriminants.py [--sizes 15,20,25,30] [--count 5]
        [--real-sizes 8,10,12,14,16,18,20,22] [--skip-threshold]
"""

from __future__ import annotations

import argparse
import random
import statistics
import time

from formkit.classgroups.baby_step_giant_step import class_group_bsgs, last_statistics
from formkit.classgroups.dispatch import class_group
from formkit.classgroups.infrastructure import real_class_group, real_class_number
from formkit.core.discriminants import is_fundamental_discriminant
from formkit.errors import FormkitError


def random_fundamental(rng: random.Random, digits: int, sign: int = -1) -> int:
    while True:
        D = sign * rng.randrange(10**digits, 2 * 10**digits)
        if is_fundamental_discriminant(D):
            return D


def timed(fn, *args):
    w, c = time.perf_counter(), time.process_time()
    out = fn(*args)
    return out, time.perf_counter() - w, time.process_time() - c


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--sizes", default="15,20,25,30")
    ap.add_argument("--count", type=int, default=5)
    ap.add_argument("--seed", type=int, default=2026)
    ap.add_argument("--skip-threshold", action="store_true")
    ap.add_argument("--real-sizes", default="8,10,12,14,16,18,20,22")
    args = ap.parse_args()
    rng = random.Random(args.seed)
    class_group_bsgs(-(10**6) - 3)  # warm up imports (numpy, sympy) outside the timings

    print("D < 0, baby-step giant-step (GRH, Bach bound), random fundamental D in [10^k, 2·10^k)")
    print(
        f"{'k':>3} {'n':>2} {'wall s':>8} {'cpu s':>8} {'ops':>9} {'ops/|D|^.25':>12} {'ops/|D|^.2':>11}"
        f" {'bsgs steps':>10} {'gens':>5}"
    )
    for k in [int(s) for s in args.sizes.split(",")]:
        walls, cpus, ops, steps, gens = [], [], [], [], []
        for _ in range(args.count):
            D = random_fundamental(rng, k)
            G, w, c = timed(class_group_bsgs, D)
            st = last_statistics()
            walls.append(w)
            cpus.append(c)
            ops.append(st.operations)
            steps.append(st.baby_steps + st.giant_steps)
            gens.append(st.generators_used)
            print(
                f"    D = {D}: {G.structure}, {w:.2f} s wall, {c:.2f} s cpu, {st.operations} ops", flush=True
            )
        Dabs = 1.5 * 10**k
        mo = statistics.median(ops)
        print(
            f"{k:>3} {args.count:>2} {statistics.median(walls):>8.2f} {statistics.median(cpus):>8.2f} {mo:>9.0f}"
            f" {mo / Dabs**0.25:>12.3f} {mo / Dabs**0.2:>11.3f} {statistics.median(steps):>10.0f}"
            f" {statistics.median(gens):>5.0f}",
            flush=True,
        )

    if not args.skip_threshold:
        print("\nenumeration (unconditional) against baby-step giant-step (GRH), same D, cpu seconds")
        print(f"{'k':>3} {'enumerate':>10} {'bsgs':>8} {'ratio':>7}")
        for k in (8, 9, 10, 11, 12):
            D = random_fundamental(rng, k)
            _, _, ce = timed(class_group, D, "enumerate")
            _, _, cb = timed(class_group_bsgs, D)
            print(f"{k:>3} {ce:>10.3f} {cb:>8.3f} {ce / cb:>7.1f}", flush=True)

    print("\nD > 0: real_class_number (infrastructure regulator, class number from the GRH interval")
    print("and the orders of classes), random fundamental D in [10^k, 2·10^k)")
    print(
        f"{'k':>3} {'wall s':>8} {'cpu s':>8} {'max wall':>9} {'reduction steps':>16} {'Euler P':>10} {'failed':>7}"
    )
    for k in [int(s) for s in args.real_sizes.split(",")]:
        ws, cs, ss, ps, failed = [], [], [], [], 0
        for _ in range(args.count):
            D = random_fundamental(rng, k, sign=1)
            try:
                r, w, c = timed(real_class_number, D)
            except FormkitError:
                failed += 1
                continue
            ws.append(w)
            cs.append(c)
            ss.append(r.statistics.baby_steps + r.statistics.giant_steps)
            ps.append(r.provenance.bound)
        print(
            f"{k:>3} {statistics.median(ws):>8.3f} {statistics.median(cs):>8.3f} {max(ws):>9.3f}"
            f" {statistics.median(ss):>16.0f} {max(ps):>10} {failed:>7}",
            flush=True,
        )

    print("\nD > 0: narrow class group, enumeration (unconditional) against real_class_group (GRH), cpu s")
    print(f"{'k':>3} {'enumerate':>10} {'infrastructure':>15} {'ratio':>7}")
    for k in (8, 9, 10, 11, 12):
        ce_all, cb_all = [], []
        for _ in range(max(1, args.count // 2)):
            D = random_fundamental(rng, k, sign=1)
            _, _, cb = timed(real_class_group, D)
            ce = float("nan")
            if k <= 10:
                _, _, ce = timed(class_group, D, "enumerate")
            ce_all.append(ce)
            cb_all.append(cb)
        ce, cb = statistics.median(ce_all), statistics.median(cb_all)
        print(f"{k:>3} {ce:>10.3f} {cb:>15.3f} {ce / cb:>7.1f}", flush=True)


if __name__ == "__main__":
    main()
