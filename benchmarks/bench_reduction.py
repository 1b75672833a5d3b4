"""Benchmark: reductions per second, and what the gmpy2 integer backend buys.

For discriminants with |D| about 10^6, 10^40, 10^200 (and 10^1000), definite and indefinite, the
script makes non-reduced forms by applying random SL2(Z) matrices (entries of about 30
digits) to reduced forms of D, then times ``formkit.reduce_form`` (reduced form *and*
the transforming matrix) and ``formkit.reduced`` (reduced form only).  It also times
the exact fundamental unit of D = 4·10000141, which has 2456 digits.

The integer backend is fixed when formkit is imported (``FORMKIT_INTEGER_BACKEND``),
so each measurement runs in a child process of this script; the two backends are
measured side by side, alternating gmpy2 / python children in every repeat, and the
medians over the repeats are printed with their ratio.  Times are CPU times of the
child process (``time.process_time``), so other load on the machine inflates them less.

Usage::

    python benchmarks/bench_reduction.py [--repeats 5] [--json]
"""

from __future__ import annotations

import argparse
import json
import os
import platform
import statistics
import subprocess
import sys
import time
from datetime import date

# CPU time of this process: the figures stay meaningful when other jobs share the machine
_clock = time.process_time

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)

# (label, D, number of forms); D ≡ 1 (mod 4) and not a square
CASES = [
    ("definite   |D|~1e6", -(10**6) - 3, 400),
    ("indefinite  D~1e6", 10**6 + 5, 400),
    ("definite   |D|~1e40", -(10**40) - 3, 300),
    ("indefinite  D~1e40", 10**40 + 1, 300),
    ("definite   |D|~1e200", -(10**200) - 3, 150),
    ("indefinite  D~1e200", 10**200 + 1, 150),
    ("definite   |D|~1e1000", -(10**1000) - 3, 40),
    ("indefinite  D~1e1000", 10**1000 + 1, 40),
]
# an exact fundamental unit with 2456 digits (Z[√10000141], norm −1): long products
UNIT_D = 4 * 10000141
UNIT_LABEL = "fundamental unit D=4*10000141 (2456 digits)"
MATRIX_DIGITS = 30
SEED = 20240601


def _inputs(D: int, count: int, seed: int):
    """Deterministic non-reduced forms of discriminant D (the same in every process)."""
    import random

    from formkit import Form, reduced

    rng = random.Random(seed)
    base = reduced(Form(1, 1, (1 - D) // 4))  # the principal form of D, reduced
    out = []
    for _ in range(count):
        # a random SL2(Z) matrix: product of [[k, -1], [1, 0]] = T^k·S until large enough
        p, q, r, s = 1, 0, 0, 1
        while max(abs(p), abs(q), abs(r), abs(s)) < 10**MATRIX_DIGITS:
            k = rng.randint(1, 10**4) * rng.choice((1, -1))
            p, q, r, s = p * k + q, -p, r * k + s, -r
        out.append(base.transform(((p, q), (r, s))))
    return out


def _child() -> dict:
    """Time every case once in this process; seconds per reduction."""
    from formkit import reduce_form, reduced
    from formkit.core import arith

    results = {"backend": arith.BACKEND}
    for i, (label, D, count) in enumerate(CASES):
        forms = _inputs(D, count, SEED + i)
        best = {"with_matrix": float("inf"), "form_only": float("inf")}
        for _ in range(2):  # the first pass warms up caches; keep the better of two
            t0 = _clock()
            for f in forms:
                reduce_form(f)
            t1 = _clock()
            for f in forms:
                reduced(f)
            t2 = _clock()
            best["with_matrix"] = min(best["with_matrix"], (t1 - t0) / count)
            best["form_only"] = min(best["form_only"], (t2 - t1) / count)
        results[label] = best
        if arith.BACKEND == "gmpy2":
            results["raw " + label] = _raw_core(D, forms)
    from formkit.core.discriminants import _fundamental_unit

    compute = _fundamental_unit.__wrapped__  # bypass the cache
    compute(UNIT_D)
    t0 = _clock()
    for _ in range(5):
        compute(UNIT_D)
    t1 = _clock()
    results[UNIT_LABEL] = {"with_matrix": (t1 - t0) / 5, "form_only": (t1 - t0) / 5}
    return results


def _raw_core(D: int, forms) -> dict:
    """Seconds per reduction of the bare reduction loop (no matrix, no validation) on
    Python ints and on gmpy2 mpz: what the integer type alone costs."""
    from formkit.core.arith import isqrt, mpz
    from formkit.core.raw_reduction import _reduce_definite_raw, _reduce_indefinite_raw

    out = {}
    for kind, conv in (("int", int), ("mpz", mpz)):
        data = [(conv(f.a), conv(f.b), conv(f.c)) for f in forms]
        Dc, sq = conv(D), conv(int(isqrt(abs(D))))
        best = float("inf")
        for _ in range(2):
            t0 = _clock()
            if D < 0:
                for a, b, c in data:
                    _reduce_definite_raw(a, b, c)
            else:
                for a, b, c in data:
                    _reduce_indefinite_raw(a, b, c, Dc, sq)
            best = min(best, (_clock() - t0) / len(data))
        out[kind] = best
    return out


def _run_child(backend: str) -> dict:
    env = dict(os.environ, FORMKIT_INTEGER_BACKEND=backend, PYTHONPATH=ROOT)
    proc = subprocess.run(
        [sys.executable, os.path.abspath(__file__), "--child"],
        env=env,
        capture_output=True,
        text=True,
        check=True,
    )
    return json.loads(proc.stdout)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeats", type=int, default=5)
    parser.add_argument("--json", action="store_true")
    parser.add_argument("--child", action="store_true", help=argparse.SUPPRESS)
    args = parser.parse_args()
    if args.child:
        sys.stdout.write(json.dumps(_child()))
        return

    load_before = os.getloadavg()[0] if hasattr(os, "getloadavg") else float("nan")
    runs: dict[str, list[dict]] = {"gmpy2": [], "python": []}
    for _ in range(args.repeats):
        for backend in ("gmpy2", "python"):  # side by side, alternating
            runs[backend].append(_run_child(backend))
    summary = {}
    for label in [c[0] for c in CASES] + [UNIT_LABEL]:
        row = {}
        for backend in ("gmpy2", "python"):
            for kind in ("with_matrix", "form_only"):
                row[f"{backend}_{kind}"] = statistics.median(r[label][kind] for r in runs[backend])
        summary[label] = row
    if args.json:
        print(json.dumps(summary, indent=2))
        return
    print(
        f"formkit reduction benchmark — {date.today()}, {platform.python_implementation()} "
        f"{platform.python_version()}, {os.cpu_count()} cores, median of {args.repeats} repeats (CPU time)"
    )
    load_after = os.getloadavg()[0] if hasattr(os, "getloadavg") else float("nan")
    print(f"inputs: reduced forms moved by random SL2(Z) matrices with ~{MATRIX_DIGITS}-digit entries")
    print(f"machine load average (1 min) before/after: {load_before:.1f} / {load_after:.1f}\n")
    head = f"{'case':22s} {'gmpy2 red/s':>12s} {'python red/s':>13s} {'gmpy2/python':>13s}   {'gmpy2 form-only red/s':>22s} {'ratio':>6s}"
    print(head)
    print("-" * len(head))
    for label, row in summary.items():
        g, p = row["gmpy2_with_matrix"], row["python_with_matrix"]
        go, po = row["gmpy2_form_only"], row["python_form_only"]
        if label == UNIT_LABEL:
            print(
                f"\n{label}: {1 / g:,.1f}/s with gmpy2, {1 / p:,.1f}/s with Python ints, ratio {p / g:.2f}x"
            )
            continue
        print(f"{label:22s} {1 / g:12,.0f} {1 / p:13,.0f} {p / g:12.2f}x   {1 / go:22,.0f} {po / go:5.2f}x")
    print("\nbare reduction loop (no matrix, no validation), gmpy2 run: Python ints vs mpz")
    print(f"{'case':22s} {'int red/s':>12s} {'mpz red/s':>12s} {'mpz/int':>8s}")
    for label, _, _ in CASES:
        i = statistics.median(r["raw " + label]["int"] for r in runs["gmpy2"])
        m = statistics.median(r["raw " + label]["mpz"] for r in runs["gmpy2"])
        print(f"{label:22s} {1 / i:12,.0f} {1 / m:12,.0f} {i / m:7.2f}x")
    print("\nred/s = reductions per second (reduce_form: form and matrix; form-only: reduced());")
    print("gmpy2/python = speed with gmpy2 divided by speed with plain Python ints (>1: gmpy2 faster);")
    print("with gmpy2, coefficients below MPZ_THRESHOLD_BITS bits are still reduced with Python ints")


if __name__ == "__main__":
    main()
