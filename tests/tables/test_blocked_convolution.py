"""Tests of formkit.tables.blocked_convolution and of the blocked theta path: blocked products
against numpy's direct convolution (a general-purpose library, outside check) and brute
force; the blocked series and quotient against the whole-length ones and the sweep; the
memory estimate the budget uses against the measured peak."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from formkit import class_numbers
from formkit.tables import blocked_convolution as bc
from formkit.tables.blocked_convolution import (
    blocked_convolution,
    dense_block,
    pair_counts,
    sparse_block,
)
from formkit.tables.hurwitz_relation import _seven_series, seven_memory
from formkit.tables.sweep import _count_class_seven
from formkit.tables.theta import _r3_upto, class_numbers_by_theta, theta_memory
from formkit.tables.three_squares import series_memory, three_square_series

ROOT = Path(__file__).resolve().parents[2]


def triangular(m: int) -> np.ndarray:
    t = np.array([j * (j + 1) // 2 for j in range(m)], dtype=np.int64)
    return t[t < m]


@settings(max_examples=60, deadline=None)
@given(
    st.integers(1, 600),
    st.integers(0, 300),
    st.integers(0, 900),
    st.integers(1, 400),
    st.sampled_from([1, 2, 4, 16, 64, 1024]),
    st.sampled_from([0, 1 << 10, 1 << 40]),
    st.sampled_from([1, 2]),
    st.integers(0, 2**32 - 1),
)
def test_blocked_against_numpy_convolve(na, a_lo, o_lo, no, block, kept, threads, seed):
    # out[n] = Σ_{a_lo ≤ i < a_lo + na} a[i]·b[n − i] on [o_lo, o_lo + no): numpy.convolve of the
    # same integer sequences (exact in int64), any block size, kept spectra or none, threads
    rng = np.random.default_rng(seed)
    a = rng.integers(-1000, 1000, size=a_lo + na)
    a[:a_lo] = 0
    pos = np.flatnonzero(rng.random(o_lo + no + 1) < 0.2).astype(np.int64)
    b = np.zeros(o_lo + no + 1, dtype=np.int64)
    b[pos] = 1
    full = np.convolve(a, b)
    want = np.zeros(no, dtype=np.int64)
    part = full[o_lo : o_lo + no]
    want[: len(part)] = part
    got, err = blocked_convolution(
        dense_block(a),
        a_lo,
        a_lo + na,
        sparse_block(pos),
        o_lo,
        o_lo + no,
        block=block,
        kept=kept,
        threads=threads,
    )
    assert got.tolist() == want.tolist() and err < 0.25


def test_sink_and_stretch_and_weights():
    # ψ(q²)·θ by blocks handed to a sink, against numpy.convolve
    m = 5000
    tri = triangular(m)
    psi2 = np.zeros(m, dtype=np.int64)
    psi2[tri[2 * tri < m] * 2] = 1
    sq = np.arange(0, 71, dtype=np.int64) ** 2
    sq = sq[sq < m]
    w = np.where(sq == 0, 1.0, 2.0)
    theta = np.zeros(m, dtype=np.int64)
    theta[sq] = w
    want = np.convolve(psi2, theta)[:m]
    got = np.zeros(m, dtype=np.int64)

    def put(start, vals):
        got[start : start + len(vals)] = vals

    out, err = blocked_convolution(
        dense_block(psi2[::2], 2),
        0, m, sparse_block(sq, w), 0, m, block=128, sink=put,
    )  # fmt: skip
    assert out is None and got.tolist() == want.tolist() and err < 0.25


def test_pair_counts_against_brute_force():
    m = 3000
    tri = triangular(m + 1)
    brute = np.zeros(m + 1, dtype=np.int64)
    for x in tri:
        for y in tri:
            if x + y <= m:
                brute[x + y] += 1
    for block in (1, 7, 256, 1 << 20):
        assert pair_counts(tri, tri, m, block).tolist() == brute.tolist()


def test_blocked_series_equals_whole_and_cubing_theta():
    # the three products in blocks of 2^8, 2^10 and in one block (whole length) agree, and
    # with cubing θ's spectrum (an independent transform)
    N = 120_000
    whole = three_square_series(N, N // 4, max_block=1 << 30)
    for mb, th in ((1 << 8, 1), (1 << 10, 2)):
        s = three_square_series(N, N // 4, max_block=mb, threads=th)
        for k in ("P3", "A1", "A2"):
            assert (getattr(s, k) == getattr(whole, k)).all(), (mb, k)
        assert s.rounding_error < 0.25
    one, _ = _r3_upto(N, 0)
    series, _ = _r3_upto(N)
    assert (one == series).all()


def test_blocked_quotient_equals_whole_and_the_sweep():
    # the middle products in blocks (down to 2^9) against the whole-length ones and against
    # counting reduced forms for every n ≡ 7 (mod 8) to 4·10^5
    K = 50_000
    whole, _ = _seven_series(K, leaf=1 << 10, max_block=1 << 30)
    for mb, th in ((1 << 9, 1), (1 << 11, 2)):
        G, err = _seven_series(K, leaf=1 << 10, max_block=mb, threads=th)
        assert (whole == G).all() and err < 0.25
    assert whole[1:].tolist() == _count_class_seven(7, 8 * K - 1).tolist()


def test_blocked_class_numbers_against_the_sweep(monkeypatch):
    # the whole theta engine with tiny blocks, against the reduced-form sweep
    from formkit.tables import hurwitz_relation, three_squares

    monkeypatch.setattr(bc, "MAX_BLOCK", 1 << 9)
    monkeypatch.setattr(three_squares, "_CACHE", [])
    monkeypatch.setattr(hurwitz_relation, "_CACHE", [])
    N = 60_000
    assert class_numbers_by_theta(-N, -3) == class_numbers(-N, -3, engine="numpy")


def test_memory_estimates_grow_with_the_arrays_only():
    # beyond the largest blocks the working set is fixed: the estimates grow by the arrays
    # (about 4·N/8 + 8·N/16 bytes of series, 8·2^⌈log₂ N/8⌉ for the quotient)
    a, b = series_memory(4 * 10**8, 10**8), series_memory(8 * 10**8, 2 * 10**8)
    assert b > a and b - a < 2.1 * a
    assert seven_memory(2**27) - seven_memory(2**26) < 2 * 2**30
    assert theta_memory(10**9) < 6 * 2**30  # the goal (8 GB) with a margin


@pytest.mark.slow
def test_memory_estimate_against_the_measured_peak():
    # a fresh process computes the series and the quotient for N = 10^8 and reports its
    # peak resident memory (getrusage); the estimate the table budget uses must be within
    # 25 % of the measured growth over the interpreter with numpy loaded
    N = 10**8
    code = (
        "import json, resource, numpy\n"
        "from formkit.tables.three_squares import cached_series\n"
        "from formkit.tables.hurwitz_relation import cached_seven\n"
        "base = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss\n"
        f"cached_series({N}, {N} // 4); cached_seven(({N} + 1) // 8)\n"
        "peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss\n"
        "print(json.dumps([base * 1024, peak * 1024]))\n"
    )
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, env=env, check=True)
    base, peak = json.loads(out.stdout)
    est = theta_memory(N, windows=False)
    assert 0.75 < (peak - base) / est < 1.25, (peak - base, est)
