"""Benchmark: class-number tables of whole ranges of negative discriminants.

Measures, side by side in one run:

* class numbers (with fundamental part, conductor and number of genera) of all
  D in [-10^6, -3] on 1 and 2 worker processes (issue goal: <= 30 s on 2 cores),
  with the numpy sweep and the pure-Python sweep;
* the same range written into an SQLite store (one transaction per chunk);
* throughput per worker (discriminants per second per worker, 1 vs 2 workers);
* with ``--big``: [-10^7, -3] once on 2 workers;
* with ``--invariants``: a table with class-group invariants (one class_group per D).

Wall-clock medians and CPU seconds (this process plus its workers) are printed with
the load average, since a busy machine stretches wall-clock times.

Run:  python benchmarks/bench_tables.py [--repeat 3] [--big] [--invariants] [--skip-python]
"""

from __future__ import annotations

import argparse
import os
import resource
import statistics
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from formkit import build_table


def cpu_seconds() -> float:
    s = resource.getrusage(resource.RUSAGE_SELF)
    c = resource.getrusage(resource.RUSAGE_CHILDREN)
    return s.ru_utime + s.ru_stime + c.ru_utime + c.ru_stime


def measure(label: str, fn, repeat: int) -> dict:
    walls, cpus = [], []
    load0 = os.getloadavg()[0]
    result = None
    for _ in range(repeat):
        c0, t0 = cpu_seconds(), time.perf_counter()
        result = fn()
        walls.append(time.perf_counter() - t0)
        cpus.append(cpu_seconds() - c0)
    load1 = os.getloadavg()[0]
    out = {
        "label": label,
        "wall": statistics.median(walls),
        "cpu": statistics.median(cpus),
        "load": (load0 + load1) / 2,
        "rows": getattr(result, "rows_written", None),
    }
    print(
        f"{label:58s} wall {out['wall']:8.2f} s   cpu {out['cpu']:8.2f} s   "
        f"rows {out['rows']}   load {out['load']:.1f}   (median of {repeat})",
        flush=True,
    )
    return out


def _spin(n: int) -> float:
    t = time.process_time()
    s = 0
    for i in range(n):
        s += i
    return time.process_time() - t


def calibrate() -> float:
    """Wall time of 2 processes spinning in parallel over 1 process doing the same.

    About 1.0 on an idle 2-core machine; about 2.0 when the machine is so busy that a
    second process of this session gains no CPU (then no 2-worker speed-up can show).
    """
    import multiprocessing as mp

    n = 10**7
    t0 = time.perf_counter()
    _spin(n)
    one = time.perf_counter() - t0
    with mp.Pool(2) as pool:
        t0 = time.perf_counter()
        pool.map(_spin, [n, n])
        two = time.perf_counter() - t0
    return two / one


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--big", action="store_true", help="also [-10^7, -3] on 2 workers (once)")
    ap.add_argument("--invariants", action="store_true", help="also a table with group invariants")
    ap.add_argument("--skip-python", action="store_true", help="skip the pure-Python engine")
    args = ap.parse_args()
    N = 10**6
    print(f"formkit table benchmark; cores: {os.cpu_count()}; python {sys.version.split()[0]}")
    print(f"load average at start: {os.getloadavg()}")
    cal = calibrate()
    print(
        f"calibration: 2 parallel spinning processes take {cal:.2f}x the wall time of one "
        "(1.0 = two free cores, 2.0 = no parallelism available)"
    )
    res = {}
    common = {"invariants": False, "progress": False}
    res["np1"] = measure(
        "numpy,  [-10^6, -3], 1 worker", lambda: build_table(None, -N, -3, workers=1, **common), args.repeat
    )
    res["np2"] = measure(
        "numpy,  [-10^6, -3], 2 workers", lambda: build_table(None, -N, -3, workers=2, **common), args.repeat
    )

    def to_db():
        with tempfile.TemporaryDirectory() as d:
            return build_table(os.path.join(d, "t.db"), -N, -3, workers=2, **common)

    res["db2"] = measure("numpy,  [-10^6, -3], 2 workers, into SQLite", to_db, args.repeat)
    if not args.skip_python:
        res["py1"] = measure(
            "python, [-10^6, -3], 1 worker",
            lambda: build_table(None, -N, -3, workers=1, engine="python", **common),
            1,
        )
        res["py2"] = measure(
            "python, [-10^6, -3], 2 workers",
            lambda: build_table(None, -N, -3, workers=2, engine="python", **common),
            1,
        )
    if args.invariants:
        res["inv2"] = measure(
            "with invariants, [-20000, -3], 2 workers",
            lambda: build_table(None, -20000, -3, workers=2, progress=False),
            1,
        )
    if args.big:
        res["big2"] = measure(
            "numpy,  [-10^7, -3], 2 workers", lambda: build_table(None, -10 * N, -3, workers=2, **common), 1
        )

    print()
    print("summary")
    nD = res["np1"]["rows"]
    for key in ("np", "py"):
        if f"{key}1" not in res:
            continue
        w1, w2 = res[f"{key}1"]["wall"], res[f"{key}2"]["wall"]
        print(
            f"  {key:6s} throughput per worker: 1 worker {nD / w1:12.0f} D/s, "
            f"2 workers {nD / w2 / 2:12.0f} D/s per worker; speed-up 2 vs 1: {w1 / w2:.2f}x"
        )
    print(f"  calibration at start: {cal:.2f}x; at end: {calibrate():.2f}x (see above)")
    print(
        f"  goal [-10^6, -3] <= 30 s on 2 cores: {res['np2']['wall']:.2f} s "
        f"({'met' if res['np2']['wall'] <= 30 else 'NOT met'})"
    )
    print(
        f"  SQLite store overhead (2 workers): {res['db2']['wall'] / res['np2']['wall']:.2f}x the in-memory run"
    )
    if "py2" in res:
        print(
            f"  numpy vs pure Python, 2 workers: {res['py2']['wall'] / res['np2']['wall']:.1f}x faster "
            f"(cpu {res['py2']['cpu'] / res['np2']['cpu']:.1f}x)"
        )
    if "inv2" in res:
        r = res["inv2"]
        print(f"  with invariants: {r['rows'] / r['wall']:.0f} D/s on 2 workers")
    if "big2" in res:
        r = res["big2"]
        print(f"  [-10^7, -3]: {r['wall']:.1f} s wall, {r['cpu']:.1f} s cpu, {r['rows'] / r['wall']:.0f} D/s")


if __name__ == "__main__":
    main()
