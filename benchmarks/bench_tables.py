"""Benchmark: class-number tables of whole ranges of negative discriminants.

Measures, side by side in one run:

* class numbers (with fundamental part, conductor and number of genera) of all
  D in [-10^6, -3] on 1 and 2 worker processes (issue goal: <= 30 s on 2 cores),
  with the numpy sweep and the pure-Python sweep;
* the same range written into an SQLite store (one transaction per chunk);
* throughput per worker (discriminants per second per worker, 1 vs 2 workers);
* with ``--big``: [-10^7, -3] once on 2 workers;
* with ``--invariants``: a table with class-group invariants (one class_group per D);
* with ``--structure-vs REV``: the invariants of the rows of a sub-range
  (``--structure-range``, default [-10^7, -10^7 + 2·10^5]) from the same class numbers,
  this tree in this process against the tree at git revision REV (exported with
  ``git archive``) in a child process, CPU seconds of each and their ratio; the two lists
  of invariants are compared;
* with ``--invariants-full``: the invariant table of all D in [-10^7, -3] once on 2
  workers (wall, CPU incl. workers, CPU per row, load average).

Wall-clock medians and CPU seconds (this process plus its workers) are printed with
the load average, since a busy machine stretches wall-clock times.

Run:  python benchmarks/bench_tables.py [--repeat 3] [--big] [--invariants] [--skip-python]
      [--structure-vs c67a575 [--structure-range LO:HI]] [--invariants-full] [--only-structure]
"""

from __future__ import annotations

import argparse
import json
import os
import resource
import statistics
import subprocess
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


_STRUCTURE_CHILD = r"""
import hashlib, json, sys, time
from formkit.tables.rows import ChunkSpec, _invariants_of, _negative_rows
lo, hi = int(sys.argv[1]), int(sys.argv[2])
cols = _negative_rows(ChunkSpec(lo, hi, invariants=False))
args = list(zip(cols.D.tolist(), cols.h.tolist(), cols.genera.tolist(), cols.f.tolist()))
t = time.process_time()
inv = [list(_invariants_of(*a)) for a in args]
cpu = time.process_time() - t
digest = hashlib.sha256(json.dumps(inv).encode()).hexdigest()
print(json.dumps({"cpu": cpu, "rows": len(args), "digest": digest}))
"""


def structure_child(src: str, lo: int, hi: int) -> dict:
    """The invariants of the rows in [lo, hi] with the formkit at ``src``, in a child process."""
    env = dict(os.environ, PYTHONPATH=src)
    out = subprocess.run(
        [sys.executable, "-c", _STRUCTURE_CHILD, str(lo), str(hi)],
        env=env,
        cwd=src,
        capture_output=True,
        text=True,
        check=True,
    )
    return json.loads(out.stdout.strip().splitlines()[-1])


def structure_side_by_side(rev: str, lo: int, hi: int) -> None:
    """Old tree (git revision ``rev``) against this tree, same rows, one after the other."""
    here = str(Path(__file__).resolve().parents[1])
    with tempfile.TemporaryDirectory() as old:
        archive = subprocess.run(
            ["git", "-C", here, "archive", rev, "formkit"], capture_output=True, check=True
        )
        subprocess.run(["tar", "-x", "-C", old], input=archive.stdout, check=True)
        load0 = os.getloadavg()[0]
        new = structure_child(here, lo, hi)
        before = structure_child(old, lo, hi)
        load1 = os.getloadavg()[0]
    same = new["digest"] == before["digest"]
    print(
        f"structure from h, D in [{lo}, {hi}], {new['rows']} rows: revision {rev} "
        f"{before['cpu']:.2f} CPU-s ({1000 * before['cpu'] / before['rows']:.3f} ms/row), this tree "
        f"{new['cpu']:.2f} CPU-s ({1000 * new['cpu'] / new['rows']:.3f} ms/row), ratio "
        f"{before['cpu'] / new['cpu']:.2f}; same invariants: {same}; load {load0:.1f} -> {load1:.1f}",
        flush=True,
    )
    if not same:
        raise SystemExit("the two trees disagree")


def invariants_full() -> None:
    """All D in [-10^7, -3] with invariants, once, 2 workers."""
    load0 = os.getloadavg()
    c0, t0 = cpu_seconds(), time.perf_counter()
    s = build_table(None, -(10**7), -3, workers=2, progress=False)
    wall = time.perf_counter() - t0
    cpu = cpu_seconds() - c0
    load1 = os.getloadavg()
    rows = s.rows_written
    print(
        f"invariants of all D in [-10^7, -3], 2 workers: wall {wall:.1f} s, cpu {cpu:.1f} s "
        f"(this process and its workers), rows {rows}, {1000 * cpu / rows:.4f} CPU-ms per row; "
        f"projected on two free cores {cpu / 2:.0f} s; load average at start {load0}, at end {load1}",
        flush=True,
    )


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--big", action="store_true", help="also [-10^7, -3] on 2 workers (once)")
    ap.add_argument("--invariants", action="store_true", help="also a table with group invariants")
    ap.add_argument("--skip-python", action="store_true", help="skip the pure-Python engine")
    ap.add_argument("--structure-vs", metavar="REV", help="structure from h against git revision REV")
    ap.add_argument("--structure-range", default="-10000000:-9800000", help="LO:HI for --structure-vs")
    ap.add_argument(
        "--invariants-full", action="store_true", help="invariants of [-10^7, -3] once, 2 workers"
    )
    ap.add_argument(
        "--only-structure", action="store_true", help="run only --structure-vs / --invariants-full"
    )
    args = ap.parse_args()
    if args.structure_vs or args.invariants_full:
        print(f"load average at start: {os.getloadavg()}; cores: {os.cpu_count()}")
        if args.structure_vs:
            lo, hi = (int(x) for x in args.structure_range.split(":"))
            structure_side_by_side(args.structure_vs, lo, hi)
        if args.invariants_full:
            invariants_full()
        if args.only_structure:
            return
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
