"""Benchmark: class numbers by the three-squares theta series against the reduced-form sweep,
and class-group invariants from the known h against the enumeration path, in one run.

* ``class numbers``: all D in [−N, −3], chunk by chunk as ``build_table`` runs the theta
  engine (chunks of 2^22, largest first, the FFT series computed once), by the theta series
  (complete: the d_K ≡ 1 (mod 8) part from the sweep on n ≡ 7 (mod 8)), by the theta series
  alone (``complete=False``, the d_K ≢ 1 (mod 8) two thirds) and by the numpy sweep on the
  same chunks; the results are compared; CPU seconds of this process (single-threaded
  numpy FFT) and the peak resident memory are printed with the ratios.
* ``invariants``: windows of D near −10^6 and −10^7: per-row CPU of ``table_rows``
  (structure from h, sweep included) against what table rows did before (the structure
  when h and the genus count force it, else ``class_group(D, method="enumerate")``).

Run:  nice -n 10 python benchmarks/bench_theta.py [--bounds 1e6,1e7,1e8] [--window 4000]
      (``--bounds ""`` runs only the invariants part, ``--no-invariants`` only the first)
"""

from __future__ import annotations

import argparse
import os
import resource
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from formkit import class_group, table_rows
from formkit.tables.rows import _invariants_from_order


def cpu() -> float:
    r = resource.getrusage(resource.RUSAGE_SELF)
    return r.ru_utime + r.ru_stime


def peak_mb() -> float:
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024


def timed(fn):
    c, t = cpu(), time.perf_counter()
    out = fn()
    return out, cpu() - c, time.perf_counter() - t


def class_number_run(N: int, skip_sweep_above: float) -> None:
    """All D in [−N, −3] chunk by chunk (the chunks of build_table's theta engine, largest
    first), theta complete, theta alone and the numpy sweep on the same chunks, compared."""
    from formkit.tables.rows import CHUNK_THETA, split_range
    from formkit.tables.sweep import _class_numbers_np
    from formkit.tables.theta import class_number_array
    from formkit.tables.three_squares import cached_series

    chunks = sorted(split_range(-N, -3, CHUNK_THETA), key=lambda c: c[0])
    _, cs, _ = timed(lambda: cached_series(N, N // 4))
    ct = ca = csw = 0.0
    agree = True
    for lo, hi in chunks:
        L, H = max(3, -hi), -lo
        h, c, _ = timed(lambda L=L, H=H: class_number_array(L, H))
        ct += c
        _, c, _ = timed(lambda L=L, H=H: class_number_array(L, H, complete=False))
        ca += c
        if skip_sweep_above >= N:
            s, c, _ = timed(lambda L=L, H=H: _class_numbers_np(L, H))
            csw += c
            agree &= bool((s == h).all())
    print(
        f"N = {N:.0e} ({len(chunks)} chunks): FFT series {cs:.1f} s; theta complete {cs + ct:.1f} s; "
        f"theta alone {cs + ca:.1f} s; sweep {csw:.1f} s; agree: {agree}; "
        f"sweep/theta {csw / (cs + ct):.2f}, sweep/theta-alone {csw / (cs + ca):.2f}; "
        f"peak RSS {peak_mb():.0f} MB",
        flush=True,
    )


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--bounds", default="1e6,1e7")
    ap.add_argument("--window", type=int, default=4000)
    ap.add_argument("--skip-sweep-above", type=float, default=2e8)
    ap.add_argument("--no-invariants", action="store_true")
    a = ap.parse_args()
    print(f"load average {os.getloadavg()[0]:.1f}; CPU seconds of this process")
    for N in (int(float(x)) for x in a.bounds.split(",") if x):
        class_number_run(N, a.skip_sweep_above)
    if a.no_invariants:
        return
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
