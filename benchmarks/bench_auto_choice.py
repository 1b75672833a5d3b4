"""Benchmark: where ``class_group(D)`` should switch from baby-step giant-step to the subexponential method.

For random fundamental D < 0 of each size, runs both
:func:`formkit.classgroups.baby_step_giant_step.class_group_bsgs` and
:func:`formkit.classgroups.subexponential.class_group_subexponential` (one worker) on the
same D in the same run, checks that the invariants agree, and prints the CPU time of each
(this process and its children, ``resource.getrusage``), the medians and their ratio.
The crossover sets :data:`formkit.classgroups.dispatch.SUBEXPONENTIAL_FROM`
(docs/performance.md, "Automatic choice of the method").

Usage:  PYTHONPATH=. python3 benchmarks/bench_auto_choice.py [--sizes 26,28,30,32,34] [--count 3]
"""

from __future__ import annotations

import argparse
import random
import statistics

from bench_subexponential import random_fundamental, timed

from formkit.classgroups.baby_step_giant_step import class_group_bsgs
from formkit.classgroups.subexponential import class_group_subexponential


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sizes", default="26,28,30,32,34")
    ap.add_argument("--count", type=int, default=3)
    ap.add_argument("--seed", type=int, default=2027)
    args = ap.parse_args()
    rng = random.Random(args.seed)
    print(f"bsgs vs subexponential, D < 0, {args.count} random fundamental D per size, CPU seconds")
    for digits in (int(s) for s in args.sizes.split(",")):
        bs, ss = [], []
        for _ in range(args.count):
            D = random_fundamental(rng, digits)
            H, cb, _wb = timed(class_group_bsgs, D)
            G, cs, _ws = timed(class_group_subexponential, D)
            assert G.invariants == H.invariants, (D, G.invariants, H.invariants)
            bs.append(cb)
            ss.append(cs)
            print(f"  {digits} digits  D={D}  h={G.order}  bsgs {cb:.1f}s  subexp {cs:.1f}s", flush=True)
        mb, ms = statistics.median(bs), statistics.median(ss)
        print(
            f"{digits} digits: bsgs median {mb:.1f}s, subexp median {ms:.1f}s, ratio subexp/bsgs {ms / mb:.2f}",
            flush=True,
        )


if __name__ == "__main__":
    main()
