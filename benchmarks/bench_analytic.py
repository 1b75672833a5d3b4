"""Benchmark: L-series, Epstein zeta values and theta series (the analytic side).

Measures, in one run (CPU seconds by ``time.process_time``, medians of ``--repeat`` runs):

* ``L(s, χ_D)`` at 30 digits for fundamental ``D`` near ``−10^6`` and ``−10^12`` (and
  ``10^6``, ``10^9``), at ``s = 1`` and ``s = ½ + 10i``; the number of series terms;
* the same for ``|D| ≈ 10^8`` with the Taylor blocks switched off (term-by-term), for the
  same-run ratio that shows what the blocks buy;
* ``Z_Q(s)`` at 30 digits for reduced forms of small and large discriminant, real and
  complex ``s``, and Kronecker's limit formula;
* ``θ_Q`` up to ``q^(10^6)`` and ``q^(10^7)`` for ``x² + y²`` and a form of larger discriminant;
* the previous path of ``L(s, χ_D)`` (Taylor blocks of ``n/16`` terms, every moment an exact
  integer) against the present one (blocks of ``n/16``, ``n/32`` or ``n/64`` by size, the high moments in doubles with a
  proved error bound) for ``|D| ≈ 10^6, 10^8, 10^9`` and ``10^12``, side by side, with the ratio
  (``--compare-only`` runs just this part).

The machine is shared: quote CPU times and ratios measured in the same run.

Run:  python benchmarks/bench_analytic.py [--repeat 3] [--skip-large] [--compare-only]
"""

from __future__ import annotations

import argparse
import importlib
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from formkit import epstein_zeta, is_fundamental_discriminant, kronecker_limit, l_series, theta_series


def fundamental_near(D: int) -> int:
    step = -1 if D < 0 else 1
    while not is_fundamental_discriminant(D):
        D += step
    return D


def measure(label: str, fn, repeat: int):
    cpus, result = [], None
    for _ in range(repeat):
        c0 = time.process_time()
        result = fn()
        cpus.append(time.process_time() - c0)
    med = statistics.median(cpus)
    print(f"{label:62s} cpu {med:9.3f} s  (median of {repeat})", flush=True)
    return med, result


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--skip-large", action="store_true", help="leave out |D| = 10^12 and θ to 10^7")
    ap.add_argument(
        "--compare-only", action="store_true", help="only the previous path against the present one"
    )
    args = ap.parse_args()
    r = args.repeat
    if args.compare_only:
        compare_paths(r, args.skip_large)
        return

    print("## L(s, χ_D), 30 digits")
    sizes = [-(10**6), 10**6, -(10**9)] + ([] if args.skip_large else [-(10**12)])
    for size in sizes:
        D = fundamental_near(size)
        reps = 1 if abs(D) >= 10**12 else r
        for s in ("1", "1/2+10i"):
            _, L = measure(f"L({s}, χ_D), D = {D}", lambda: l_series(D, s, digits=30), reps)
            print(f"    = {L.text()[:40]}…  ({L.terms} terms, error ≤ {L.error_bound:.1e})")

    print("## what the Taylor blocks buy (same run)")
    mod = importlib.import_module("formkit.analytic.theta_split_series")  # the series' tunables
    D = fundamental_near(-(10**8))
    blocked, _ = measure(f"L(1, χ_D), D = {D}, Taylor blocks", lambda: l_series(D, 1, digits=30), r)
    saved = mod._DIRECT_TERMS
    mod._DIRECT_TERMS = 10**12
    try:
        plain, _ = measure(f"L(1, χ_D), D = {D}, term by term", lambda: l_series(D, 1, digits=30), 1)
    finally:
        mod._DIRECT_TERMS = saved
    print(f"    term by term / blocks = {plain / blocked:.1f}")

    print("## Z_Q(s), 30 digits")
    for Q in ((1, 0, 1), (2, 1, 3), (1, 0, 10**6 + 3), (997, 2 * 131, 10**6 + 7)):
        for s in ("2", "1/2+10i"):
            _, z = measure(f"Z_Q({s}), Q = {list(Q)}", lambda: epstein_zeta(Q, s, digits=30), r)
            print(f"    = {z.text()[:40]}…  ({z.terms} K-Bessel terms)")
        measure(f"Kronecker limit formula, Q = {list(Q)}", lambda: kronecker_limit(Q, digits=30), r)

    print("## θ_Q")
    bounds = [10**6] + ([] if args.skip_large else [10**7])
    for Q in ((1, 0, 1), (3, 2, 35)):
        for N in bounds:
            _, th = measure(f"θ_Q to q^{N}, Q = {list(Q)}", lambda: theta_series(Q, N), r)
            print(f"    r_Q({N}) = {th[N]}, lattice points counted = {int(th.coefficients.sum())}")


def compare_paths(r: int, skip_large: bool) -> None:
    """The previous L-series path against the present one, in the same run."""
    mod = importlib.import_module("formkit.analytic.theta_split_series")  # the series' tunables
    print(
        "## L(s, χ_D), 30 digits: previous path (blocks n/16, integer moments) vs present (n/32 or n/64, doubles)"
    )
    sizes = [-(10**6), -(10**8), -(10**9)] + ([] if skip_large else [-(10**12)])
    for size in sizes:
        D = fundamental_near(size)
        reps = 1 if abs(D) >= 10**12 else r
        for s in ("1", "1/2+10i"):
            saved = (mod._BLOCK_DIVISOR, mod._FLOAT_MOMENTS)
            mod._BLOCK_DIVISOR, mod._FLOAT_MOMENTS = 16, False
            try:
                old, L0 = measure(f"previous: L({s}, χ_D), D = {D}", lambda: l_series(D, s, digits=30), reps)
            finally:
                mod._BLOCK_DIVISOR, mod._FLOAT_MOMENTS = saved
            new, L1 = measure(f"present:  L({s}, χ_D), D = {D}", lambda: l_series(D, s, digits=30), reps)
            same = abs(L0.value - L1.value) <= L0.error_bound + L1.error_bound
            print(
                f"    previous / present = {old / new:.2f}; values agree within their bounds: {same}; "
                f"error bounds {L0.error_bound:.1e} and {L1.error_bound:.1e}; {L1.terms} terms"
            )


if __name__ == "__main__":
    main()
