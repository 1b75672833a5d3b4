"""Benchmark: class groups of D < 0 by the subexponential method (relations among prime forms).

Prints, for random fundamental D < 0 of each size, the median CPU time (this process and
its worker processes) and wall-clock time of ``class_group_subexponential(D)``, the
factor-base size, the relations used and the sieved relations per CPU second; at the
sizes given by ``--compare`` baby-step giant-step runs on the same D in the same run and
the ratio of the medians is printed.  Every result of both methods is checked to agree.

``--hermite sublattice,whole`` runs the subexponential method once per choice of
:func:`formkit.core.lattice.finite_lattice_quotient`'s ``hermite`` (the dense Hermite form
from a full-rank sublattice, or FLINT on the whole dense rest: the earlier path) on the
same D, side by side, and checks that they agree; "la" is the CPU time spent in
``finite_lattice_quotient`` (elimination, rank test, Hermite and Smith forms; this
process), the rest being the relation search and the Euler-product interval.

``--workers 1,2`` runs each D once per number of worker processes (CPU then includes the
workers; wall time shows what the second core buys).  ``--budget`` raises formkit's cost
refusal (60 digits is estimated above the default 30 minutes).

Usage:  python3 benchmarks/bench_subexponential.py [--sizes 30,40,50] [--count 3]
        [--compare 30] [--workers 1] [--hermite sublattice] [--budget 3h]
"""

from __future__ import annotations

import argparse
import random
import resource
import statistics
import time

from formkit.classgroups import subexponential as sub
from formkit.classgroups.baby_step_giant_step import class_group_bsgs
from formkit.core import lattice
from formkit.core.budget import set_budget
from formkit.core.discriminants import is_fundamental_discriminant


def random_fundamental(rng: random.Random, digits: int, sign: int = -1) -> int:
    """A random fundamental discriminant of sign ``sign`` with ``digits`` digits (uniform in
    ``[10^(digits−1), 10^digits)`` before the test; also used by the other subexponential
    benchmarks)."""
    while True:
        D = sign * rng.randrange(10 ** (digits - 1), 10**digits)
        if is_fundamental_discriminant(D) and D != 1:
            return D


def cpu() -> float:
    me = resource.getrusage(resource.RUSAGE_SELF)
    kids = resource.getrusage(resource.RUSAGE_CHILDREN)
    return me.ru_utime + me.ru_stime + kids.ru_utime + kids.ru_stime


def timed(f, *args, **kw):
    c, w = cpu(), time.perf_counter()
    out = f(*args, **kw)
    return out, cpu() - c, time.perf_counter() - w


LA = {"cpu": 0.0, "calls": 0}


def use_hermite(mode: str) -> None:
    """Make the subexponential method call finite_lattice_quotient with ``hermite=mode`` and time it."""

    def timed_quotient(rows, ncols):
        t = time.process_time()
        try:
            return lattice.finite_lattice_quotient(rows, ncols=ncols, hermite=mode)
        finally:
            LA["cpu"] += time.process_time() - t
            LA["calls"] += 1

    sub.finite_lattice_quotient = timed_quotient


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sizes", default="30,40,50")
    ap.add_argument("--count", type=int, default=3)
    ap.add_argument("--compare", default="30", help="sizes at which baby-step giant-step runs too")
    ap.add_argument("--workers", default="1", help="comma-separated numbers of worker processes")
    ap.add_argument("--budget", default="3h")
    ap.add_argument("--seed", type=int, default=2026)
    ap.add_argument("--hermite", default="sublattice", help="comma-separated: sublattice, whole")
    args = ap.parse_args()
    set_budget(args.budget)
    modes = [(m, int(w)) for m in args.hermite.split(",") if m for w in args.workers.split(",") if w]
    compare = {int(s) for s in args.compare.split(",") if s}
    rng = random.Random(args.seed)
    print(f"subexponential, D < 0, {args.count} random fundamental D per size, workers {args.workers}")
    for digits in (int(s) for s in args.sizes.split(",")):
        cpus: dict[tuple[str, int], list[float]] = {m: [] for m in modes}
        las: dict[tuple[str, int], list[float]] = {m: [] for m in modes}
        walls_by: dict[tuple[str, int], list[float]] = {m: [] for m in modes}
        walls, rates, bs = [], [], []
        for _ in range(args.count):
            D = random_fundamental(rng, digits)
            line = f"  {digits} digits  D={D}"
            first = None
            for mode, workers in modes:
                use_hermite(mode)
                LA["cpu"], LA["calls"] = 0.0, 0
                G, c, w = timed(sub.class_group_subexponential, D, workers=workers)
                st = sub._LAST["stats"]
                if first is None:
                    first = G
                    walls.append(w)
                    rates.append(st.sieved / c)
                    line += f"  {G.invariants}  n={st.factor_base}"
                else:
                    assert G.invariants == first.invariants and G.generators == first.generators, (D, mode)
                cpus[(mode, workers)].append(c)
                las[(mode, workers)].append(LA["cpu"])
                walls_by[(mode, workers)].append(w)
                line += (
                    f"  [{mode}, {workers} worker(s)] cpu {c:.1f}s (la {LA['cpu']:.1f}s in {LA['calls']} calls)"
                    f" wall {w:.1f}s"
                )
            if digits in compare:
                H, cb, _wb = timed(class_group_bsgs, D)
                assert H.invariants == first.invariants, (D, H.invariants, first.invariants)
                bs.append(cb)
                line += f"  bsgs cpu {cb:.1f}s"
            print(line, flush=True)
        med = statistics.median(cpus[modes[0]])
        out = f"{digits} digits:"
        for mode in modes:
            out += (
                f" [{mode[0]}, {mode[1]} worker(s)] median cpu {statistics.median(cpus[mode]):.1f}s"
                f" (la {statistics.median(las[mode]):.1f}s, wall {statistics.median(walls_by[mode]):.1f}s),"
            )
        out += (
            f" wall {statistics.median(walls):.1f}s, "
            f"{statistics.median(rates):.0f} sieved relations per cpu second"
        )
        if bs:
            out += f"; bsgs median cpu {statistics.median(bs):.1f}s, ratio subexp/bsgs {med / statistics.median(bs):.2f}"
        print(out, flush=True)


if __name__ == "__main__":
    main()
