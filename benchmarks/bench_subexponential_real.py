"""Benchmark: class groups and regulators of D > 0 by the subexponential method (Buchmann).

For random fundamental D > 0 of each size (uniform in [10^(k−1), 10^k), seed fixed), the
median CPU time (this process and its workers, ``resource.getrusage``) and wall time of
``class_group_subexponential(D)``, the factor-base size, the relations and units used; at
the sizes in ``--compare`` the infrastructure path (``real_class_group``, or
``real_class_number`` where its structure is out of reach: cycles longer than
``CYCLE_LIMIT``; ``--compare-numbers``: ``real_class_number`` only)
runs on the same D in the same run, the results are checked to agree (regulator to 1e-9
relative, h, h⁺ and, for the group, the invariants of Cl⁺) and the ratio of the medians
is printed.

Usage:  python3 benchmarks/bench_subexponential_real.py [--sizes 20,24,30,40] [--count 3]
        [--compare 20] [--compare-numbers 24]
"""

from __future__ import annotations

import argparse
import random
import statistics

from bench_subexponential import random_fundamental as _random_fundamental
from bench_subexponential import timed

from formkit.classgroups import subexponential_real as subr
from formkit.classgroups.infrastructure import real_class_group, real_class_number
from formkit.errors import FormkitError


def random_fundamental(rng: random.Random, digits: int) -> int:
    return _random_fundamental(rng, digits, sign=1)


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sizes", default="20,24,30,40")  # the method takes D ≤ 10^50
    ap.add_argument("--count", type=int, default=3)
    ap.add_argument("--compare", default="20", help="sizes at which real_class_group runs too")
    ap.add_argument("--compare-numbers", default="", help="sizes at which real_class_number runs too")
    ap.add_argument("--workers", type=int, default=1)
    ap.add_argument("--seed", type=int, default=2026)
    args = ap.parse_args()
    compare = {int(s) for s in args.compare.split(",") if s}
    numbers = {int(s) for s in args.compare_numbers.split(",") if s}
    print(
        "| digits | D | median CPU (s) | median wall (s) | factor base | relations | units | "
        "N(ε) = −1 | infrastructure median CPU (s) | ratio subexp / infrastructure |"
    )
    print("|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|")
    for k in [int(s) for s in args.sizes.split(",") if s]:
        rng = random.Random(args.seed + k)
        cpus, walls, other, fb, rels, units, minus = [], [], [], [], [], [], 0
        for _ in range(args.count):
            D = random_fundamental(rng, k)
            G, c, w = timed(subr.class_group_subexponential_real, D, workers=args.workers)
            st = subr._LAST["stats"]
            cpus.append(c)
            walls.append(w)
            fb.append(st.factor_base)
            rels.append(st.relations)
            units.append(st.units)
            R, norm = G._units
            minus += norm == -1
            line = (
                f"D = {D}: {G.structure}, h = {G.class_number}, R = {R:.12g}, N(ε) = {norm:+d}, {c:.2f} CPU-s"
            )
            if k in compare or k in numbers:
                H = None
                if k in compare:
                    try:
                        H, c2, _w2 = timed(real_class_group, D)
                    except FormkitError:  # cycles too long for its structure: the numbers only
                        numbers.add(k)
                if H is not None:
                    R2, norm2 = H._units
                    assert H.invariants == G.invariants, (D, H.invariants, G.invariants)
                    assert H.class_number == G.class_number
                else:
                    H, c2, _w2 = timed(real_class_number, D)
                    R2, norm2 = H.regulator, H.unit_norm
                    assert (H.class_number, H.class_number_narrow) == (G.class_number, G.order)
                assert abs(R2 - R) <= 1e-9 * R and norm2 == norm, (D, R, R2, norm, norm2)
                other.append(c2)
                line += f"; infrastructure {c2:.2f} CPU-s, agrees"
            print("  " + line, flush=True)
        med = statistics.median(cpus)
        om = statistics.median(other) if other else None
        print(
            f"| {k} | {args.count} | {med:.2f} | {statistics.median(walls):.2f} | ~{round(statistics.median(fb))} | "
            f"~{round(statistics.median(rels))} | ~{round(statistics.median(units))} | {minus} of {args.count} | "
            + (f"{om:.2f} | {med / om:.2f} |" if om else "— | — |"),
            flush=True,
        )


if __name__ == "__main__":
    main()
