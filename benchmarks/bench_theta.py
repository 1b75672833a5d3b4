"""Benchmark: class numbers by the three-squares theta series against the reduced-form sweep,
and class-group invariants from the known h against the enumeration path, in one run.

* ``class numbers``: all D in [−N, −3] by ``class_numbers_by_theta`` (complete: the
  d_K ≡ 1 (mod 8) part from the sweep on n ≡ 7 (mod 8)), by the theta series alone
  (``complete=False``, the d_K ≢ 1 (mod 8) two thirds) and by the numpy sweep; the results
  are compared; CPU seconds of this process (single-threaded numpy FFT) and the peak
  resident memory are printed with the ratios.
* ``invariants``: windows of D near −10^6 and −10^7: per-row CPU of ``table_rows``
  (structure from h, sweep included) against what table rows did before (the structure
  when h and the genus count force it, else ``class_group(D, method="enumerate")``).

Run:  nice -n 10 python benchmarks/bench_theta.py [--bounds 1e6,1e7,1e8] [--window 4000]
      (``--bounds ""`` runs only the invariants part)
"""

from __future__ import annotations

import argparse
import os
import resource
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from formkit import class_group, class_numbers, table_rows
from formkit.tables.rows import _invariants_from_order
from formkit.tables.theta import class_numbers_by_theta


def cpu() -> float:
    r = resource.getrusage(resource.RUSAGE_SELF)
    return r.ru_utime + r.ru_stime


def peak_mb() -> float:
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024


def timed(fn):
    c, t = cpu(), time.perf_counter()
    out = fn()
    return out, cpu() - c, time.perf_counter() - t


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--bounds", default="1e6,1e7")
    ap.add_argument("--window", type=int, default=4000)
    ap.add_argument("--skip-sweep-above", type=float, default=2e8)
    a = ap.parse_args()
    print(f"load average {os.getloadavg()[0]:.1f}; CPU seconds, wall seconds in brackets")
    for N in (int(float(x)) for x in a.bounds.split(",") if x):
        th, c1, w1 = timed(lambda: class_numbers_by_theta(-N, -3))
        print(f"N = {N:.0e}: theta (complete) {c1:.1f} s [{w1:.1f}], peak RSS {peak_mb():.0f} MB", flush=True)
        only, c2, w2 = timed(lambda: class_numbers_by_theta(-N, -3, complete=False))
        print(f"N = {N:.0e}: theta alone ({len(only)} of {len(th)} D) {c2:.1f} s [{w2:.1f}]", flush=True)
        del only
        if a.skip_sweep_above >= N:
            sw, c3, w3 = timed(lambda: class_numbers(-N, -3, engine="numpy"))
            same = sw == th
            print(
                f"N = {N:.0e}: sweep {c3:.1f} s [{w3:.1f}]; agree: {same}; "
                f"sweep/theta {c3 / c1:.2f}, sweep/theta-alone {c3 / c2:.2f}",
                flush=True,
            )
            del sw
        del th
    for centre in (10**6, 10**7):
        lo = -centre - a.window
        rows, cn, _ = timed(lambda lo=lo, centre=centre: table_rows(lo, -centre))
        sample = rows[:: max(1, len(rows) // 300)]

        def before(sample=sample):  # what table rows did before: forced by h, else enumeration
            for r in sample:
                if _invariants_from_order(r.class_number, r.genus_count) is None:
                    class_group(r.discriminant, method="enumerate")

        _, co, _ = timed(before)
        per_new, per_old = cn / len(rows), co / len(sample)
        print(
            f"invariants near -{centre:.0e}: structure from h {per_new * 1e3:.3f} ms/row ({len(rows)} rows, "
            f"sweep included); before (forced by h, else enumeration) {per_old * 1e3:.3f} ms/row "
            f"({len(sample)} rows, sweep not included); ratio {per_old / per_new:.1f}",
            flush=True,
        )


if __name__ == "__main__":
    main()
