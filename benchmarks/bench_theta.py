"""Benchmark: class numbers by the three-squares theta series against the reduced-form sweep,
and class-group invariants from the known h against the enumeration path, in one run.

* ``class numbers``: all D in [−N, −3], chunk by chunk as ``build_table`` runs the theta
  engine (chunks of 2^22, largest first, the FFT series and the quotient of the
  Kronecker–Hurwitz relation computed once), by the theta series with the d_K ≡ 1 (mod 8)
  part from the relation (the engine's default), with that part from the sweep on
  n ≡ 7 (mod 8) (the previous path), by the theta series alone (``complete=False``, the
  d_K ≢ 1 (mod 8) two thirds) and by the numpy sweep on the same chunks; the results are
  compared; CPU seconds of this process (single-threaded numpy FFT) and the peak resident
  memory are printed with the ratios.
* ``invariants``: windows of D near −10^6 and −10^7: per-row CPU of ``table_rows``
  (structure from h, sweep included) against what table rows did before (the structure
  when h and the genus count force it, else ``class_group(D, method="enumerate")``).

Run:  nice -n 10 python benchmarks/bench_theta.py [--bounds 1e6,1e7,1e8] [--window 4000] [--threads 1]
      [--skip-sweep-above 2e8] [--skip-old-above 2e8] [--skip-alone-above 2e8]
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


def class_number_run(N: int, skip_sweep_above: float, skip_old_above: float, skip_alone_above: float) -> None:
    """All D in [−N, −3] chunk by chunk (the chunks of build_table's theta engine, largest
    first): theta with the d_K ≡ 1 (mod 8) third from the Kronecker–Hurwitz relation (the
    engine's default), theta with that third swept (the previous path), theta alone and the
    numpy sweep on the same chunks, compared."""
    from formkit.tables.hurwitz_relation import cached_seven
    from formkit.tables.rows import CHUNK_THETA, split_range
    from formkit.tables.sweep import _class_numbers_np
    from formkit.tables.theta import class_number_array
    from formkit.tables.three_squares import cached_series

    chunks = sorted(split_range(-N, -3, CHUNK_THETA), key=lambda c: c[0])
    from formkit.tables.theta import theta_memory

    w0 = time.perf_counter()
    _, cs, ws = timed(lambda: cached_series(N, N // 4))
    rss_series = peak_mb()
    (_, rel_err), cr, wr = timed(lambda: cached_seven((N + 1) // 8))
    rss_relation = peak_mb()
    ct = cold = ca = csw = wt = 0.0
    agree = True
    for lo, hi in chunks:
        L, H = max(3, -hi), -lo
        h, c, w = timed(lambda L=L, H=H: class_number_array(L, H))
        ct += c
        wt += w
        if skip_alone_above >= N:
            _, c, _ = timed(lambda L=L, H=H: class_number_array(L, H, complete=False))
            ca += c
        if skip_old_above >= N:
            o, c, _ = timed(lambda L=L, H=H: class_number_array(L, H, seven="sweep"))
            cold += c
            agree &= bool((o == h).all())
        if skip_sweep_above >= N:
            s, c, _ = timed(lambda L=L, H=H: _class_numbers_np(L, H))
            csw += c
            agree &= bool((s == h).all())
    new, old, alone = cs + cr + ct, cs + cold, cs + ca

    def ratio(x: float) -> str:
        return f"{x / new:.2f}" if x else "not run"

    def secs(x: float) -> str:
        return f"{x:.1f} s" if x else "not run"

    print(
        f"N = {N:.0e}: wall s: FFT series {ws:.1f}, relation {wr:.1f}, chunks {wt:.1f} (theta + relation "
        f"{ws + wr + wt:.1f}; whole run so far {time.perf_counter() - w0:.1f}); peak RSS after the series "
        f"{rss_series:.0f} MB; estimate theta_memory {theta_memory(N) / 2**20:.0f} MB (+ interpreter); "
        f"load average now {os.getloadavg()[0]:.1f}",
        flush=True,
    )
    print(
        f"N = {N:.0e} ({len(chunks)} chunks): FFT series {cs:.1f} s; relation series {cr:.1f} s "
        f"(rounding {rel_err:.1e}, peak RSS so far {rss_relation:.0f} MB); theta + relation {new:.1f} s; "
        f"theta + swept seventh {secs(old if cold else 0)}; theta alone {secs(alone if ca else 0)}; "
        f"sweep {secs(csw)}; compared and agree: {agree}; "
        f"(theta + swept seventh)/(theta + relation) {ratio(old if cold else 0)}, "
        f"sweep/(theta + relation) {ratio(csw)}; peak RSS {peak_mb():.0f} MB",
        flush=True,
    )


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--bounds", default="1e6,1e7")
    ap.add_argument("--window", type=int, default=4000)
    ap.add_argument("--skip-sweep-above", type=float, default=2e8)
    ap.add_argument("--skip-old-above", type=float, default=2e8, help="theta with the seventh swept")
    ap.add_argument("--skip-alone-above", type=float, default=2e8, help="theta alone (complete=False)")
    ap.add_argument("--no-invariants", action="store_true")
    ap.add_argument("--threads", type=int, default=1, help="threads of the blocked FFT products")
    a = ap.parse_args()
    from formkit.tables import blocked_convolution

    blocked_convolution.THREADS = a.threads
    print(f"load average {os.getloadavg()[0]:.1f}; CPU seconds of this process")
    for N in (int(float(x)) for x in a.bounds.split(",") if x):
        class_number_run(N, a.skip_sweep_above, a.skip_old_above, a.skip_alone_above)
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
