"""Benchmark: class groups of D < 0 by the subexponential method (relations among prime forms).

Prints, for random fundamental D < 0 of each size, the median CPU time (this process and
its worker processes) and wall-clock time of ``class_group_subexponential(D)``, the
factor-base size, the relations used and the sieved relations per CPU second; at the
sizes given by ``--compare`` baby-step giant-step runs on the same D in the same run and
the ratio of the medians is printed.  Every result of both methods is checked to agree.

Usage:  python3 benchmarks/bench_subexponential.py [--sizes 30,40,50] [--count 3]
        [--compare 30] [--workers 1]
"""

from __future__ import annotations

import argparse
import random
import resource
import statistics
import time

from formkit.classgroups import subexponential as sub
from formkit.classgroups.baby_step_giant_step import class_group_bsgs
from formkit.core.discriminants import is_fundamental_discriminant


def random_fundamental(rng: random.Random, digits: int) -> int:
    while True:
        D = -rng.randrange(10 ** (digits - 1), 10**digits)
        if is_fundamental_discriminant(D):
            return D


def cpu() -> float:
    me = resource.getrusage(resource.RUSAGE_SELF)
    kids = resource.getrusage(resource.RUSAGE_CHILDREN)
    return me.ru_utime + me.ru_stime + kids.ru_utime + kids.ru_stime


def timed(f, *args, **kw):
    c, w = cpu(), time.perf_counter()
    out = f(*args, **kw)
    return out, cpu() - c, time.perf_counter() - w


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sizes", default="30,40,50")
    ap.add_argument("--count", type=int, default=3)
    ap.add_argument("--compare", default="30", help="sizes at which baby-step giant-step runs too")
    ap.add_argument("--workers", type=int, default=1)
    ap.add_argument("--seed", type=int, default=2026)
    args = ap.parse_args()
    compare = {int(s) for s in args.compare.split(",") if s}
    rng = random.Random(args.seed)
    print(f"subexponential, D < 0, {args.count} random fundamental D per size, workers={args.workers}")
    for digits in (int(s) for s in args.sizes.split(",")):
        cpus, walls, rates, bs = [], [], [], []
        for _ in range(args.count):
            D = random_fundamental(rng, digits)
            G, c, w = timed(sub.class_group_subexponential, D, workers=args.workers)
            st = sub._LAST["stats"]
            cpus.append(c)
            walls.append(w)
            rates.append(st.sieved / c)
            line = f"  {digits} digits  D={D}  {G.invariants}  cpu {c:.1f}s wall {w:.1f}s  n={st.factor_base}"
            if digits in compare:
                H, cb, _wb = timed(class_group_bsgs, D)
                assert H.invariants == G.invariants, (D, H.invariants, G.invariants)
                bs.append(cb)
                line += f"  bsgs cpu {cb:.1f}s"
            print(line, flush=True)
        med = statistics.median(cpus)
        out = (
            f"{digits} digits: median cpu {med:.1f}s, wall {statistics.median(walls):.1f}s, "
            f"{statistics.median(rates):.0f} sieved relations per cpu second"
        )
        if bs:
            out += f"; bsgs median cpu {statistics.median(bs):.1f}s, ratio subexp/bsgs {med / statistics.median(bs):.2f}"
        print(out, flush=True)


if __name__ == "__main__":
    main()
