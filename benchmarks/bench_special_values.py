"""Benchmark: three exact computations behind the analytic commands, each beside a direct path.

Measured in one run (CPU seconds by ``time.process_time``, medians of ``--repeat`` runs),
each result checked against the direct path before it is timed:

* the Bernoulli numbers ``B_0 … B_k`` (all of them: the generalised Bernoulli numbers
  ``B_{k,χ}`` need the whole list) from the tangent numbers
  (``formkit.analytic.special_values._bernoulli_list``, its cache cleared between runs)
  against sympy's ``bernoulli(j)`` for every ``j ≤ k`` (a general-purpose reference, its cache
  cleared too) for ``k = 1000, 2000, 3000``.  A single ``B_k`` is far cheaper in sympy
  (milliseconds at ``k = 3000``, by ``ζ(k)``); formkit always builds the list;
* the Dirichlet convolution ``Σ_{d|n} χ₁(d)·χ₂(n/d)`` for ``n ≤ N`` behind the Eisenstein part
  of a genus theta series, by the hyperbola method
  (``formkit.classgroups.genus_theta._dirichlet_convolution``) against the direct loop over
  every ``d ≤ N`` (numpy slices), for ``N = 2·10^5`` and ``2·10^6``;
* the unit index ``[O_K^* : O^*]`` of a real order of conductor ``f``
  (:func:`formkit.core.discriminants.unit_index`: the order of ``ε_K`` modulo ``f``) against
  multiplying out the powers of ``ε_K`` exactly until the ω-coordinate is divisible by ``f``.

Run:  python benchmarks/bench_special_values.py [--repeat 3]
"""

from __future__ import annotations

import argparse
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

import numpy as np
import sympy

from formkit.analytic import special_values
from formkit.classgroups.genus_theta import _character_table, _dirichlet_convolution
from formkit.core.discriminants import fundamental_unit, unit_index


def cpu(fn, repeat: int, before=None) -> tuple[float, object]:
    times, result = [], None
    for _ in range(repeat):
        if before is not None:
            before()
        t = time.process_time()
        result = fn()
        times.append(time.process_time() - t)
    return statistics.median(times), result


def direct_convolution(d1: int, d2: int, N: int) -> np.ndarray:
    c1 = _character_table(d1, N).astype(np.int64)
    c2 = _character_table(d2, N).astype(np.int64)
    out = np.zeros(N + 1, dtype=np.int64)
    for d in range(1, N + 1):
        if c1[d]:
            out[d::d] += c1[d] * c2[1 : N // d + 1]
    out[0] = 0
    return out


def direct_unit_index(d_K: int, f: int) -> int:
    e = fundamental_unit(d_K)
    t, u = e.t, e.u  # ε_K = (t + u√d_K)/2 = x + u·ω with ω = (d_K + √d_K)/2
    tk, uk, k = t, u, 1
    while uk % f:
        tk, uk = (tk * t + d_K * uk * u) // 2, (tk * u + uk * t) // 2
        k += 1
    return k


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=3)
    r = ap.parse_args().repeat

    print("| computation | size | formkit CPU (s) | direct path CPU (s) | ratio |")
    print("|---|---:|---:|---:|---:|")

    def clear() -> None:
        special_values._bernoulli_list.cache_clear()

    for k in (1000, 2000, 3000):
        ours, b = cpu(lambda k=k: special_values._bernoulli_list(k), r, clear)
        ref, s = cpu(lambda k=k: [sympy.bernoulli(j) for j in range(k + 1)], 1, sympy.core.cache.clear_cache)
        # sympy takes B_1 = +1/2 (recent versions), formkit B_1 = −1/2: compared from B_2 on
        assert all(sympy.Rational(x.numerator, x.denominator) == y for x, y in zip(b[2:], s[2:])), k
        print(
            f"| B_0 … B_k: tangent numbers vs sympy.bernoulli(j), j ≤ k | k = {k} | {ours:.3f} | {ref:.3f} | {ref / ours:.1f} |"
        )

    for N in (2 * 10**5, 2 * 10**6):
        ours, a = cpu(lambda N=N: _dirichlet_convolution(-4, 5, N), r)
        ref, b = cpu(lambda N=N: direct_convolution(-4, 5, N), r)
        assert np.array_equal(a, b), N
        print(
            f"| Σ_(d|n) χ_-4(d)χ_5(n/d): hyperbola vs all d | N = {N} | {ours:.3f} | {ref:.3f} | {ref / ours:.1f} |"
        )

    for d_K, f in ((5, 10007), (13, 100003), (5, 100003)):
        ours, i = cpu(lambda d_K=d_K, f=f: unit_index(f * f * d_K), r)
        ref, j = cpu(lambda d_K=d_K, f=f: direct_unit_index(d_K, f), 1)
        assert i == j, (d_K, f, i, j)
        print(
            f"| unit index: ε_K mod f vs powers written out | D = {f}²·{d_K} (index {i}) | {ours:.4f} | {ref:.3f} | {ref / ours:.0f} |"
        )


if __name__ == "__main__":
    main()
