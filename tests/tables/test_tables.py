"""Tests of formkit.tables (rows, sweep, store, parallel) against published values, theorems,
brute force and independent implementations; the resumable store is killed for real."""

from __future__ import annotations

import contextlib
import math
import os
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import pytest
from _foundation_strategies import brute_reduced_definite
from hypothesis import given
from hypothesis import strategies as st

from formkit import (
    DiscriminantError,
    FormkitError,
    NotAnIntegerError,
    build_table,
    class_number,
    class_numbers,
    discriminant_parts,
    is_fundamental_discriminant,
    query_table,
    table_info,
    table_rows,
)
from formkit.classgroups.genus import genus_count
from formkit.core.arith import kronecker
from formkit.tables.rows import ChunkSpec, compute_chunk, split_range
from formkit.tables.store import parse_invariants
from formkit.tables.sweep import _chunk_arith_np, _chunk_arith_py, _class_numbers_np, _class_numbers_py

ROOT = Path(__file__).resolve().parents[2]


# ---------------------------------------------------------------------------
# independent brute force: primitive reduced forms of one D, by the definition
# ---------------------------------------------------------------------------


def brute_reduced(D: int) -> list[tuple[int, int, int]]:
    """All primitive reduced forms of D < 0: |b| <= a <= c, b >= 0 if |b| = a or a = c."""
    return brute_reduced_definite(D, primitive=True)


# ---------------------------------------------------------------------------
# published values
# ---------------------------------------------------------------------------

# h(D) of fundamental D < 0; Cohen GTM 138, Appendix B table / Buell 1989 tables (from memory).
PUBLISHED_H = {
    -3: 1,
    -4: 1,
    -7: 1,
    -8: 1,
    -15: 2,
    -20: 2,
    -23: 3,
    -24: 2,
    -31: 3,
    -35: 2,
    -39: 4,
    -47: 5,
    -55: 4,
    -56: 4,
    -71: 7,
    -79: 5,
    -84: 4,
    -95: 8,
    -104: 6,
    -199: 9,
    -167: 11,
    -191: 13,
    -239: 15,
    -311: 19,
    -383: 17,
    -479: 25,
    -1555: 4,
    -2683: 5,
    -907: 3,
    -427: 2,
}


@pytest.mark.parametrize("engine", ["numpy", "python"])
def test_published_class_numbers(engine):
    got = class_numbers(-2683, -3, engine=engine)
    for D, h in PUBLISHED_H.items():
        assert got[D] == h, D


@pytest.mark.parametrize(
    "h, count, largest",
    # Number of imaginary quadratic fields with class number h and the largest |d_K|:
    # h=1: 9 (Baker–Heegner–Stark), largest 163; h=2: 18, largest 427; h=3: 16, largest 907;
    # h=4: 54, largest 1555; h=5: 25, largest 2683 — Watkins, Math. Comp. 73 (2004),
    # table of class numbers up to 100 (from memory).
    # h=6: 51, largest 3763; h=7: 31, largest 5923 (same table, from memory).
    [(1, 9, 163), (2, 18, 427), (3, 16, 907), (4, 54, 1555), (5, 25, 2683), (6, 51, 3763), (7, 31, 5923)],
)
def test_fundamental_discriminants_with_small_class_number(h, count, largest):
    hs = class_numbers(-largest, -3)
    found = [D for D, hD in hs.items() if hD == h and is_fundamental_discriminant(D)]
    assert len(found) == count
    assert min(found) == -largest


def test_class_number_one_list():
    # Baker–Heegner–Stark: the nine fundamental D < 0 with h = 1 (Cox Thm 7.30, from memory)
    hs = class_numbers(-5000, -3)
    ones = sorted((D for D, h in hs.items() if h == 1 and is_fundamental_discriminant(D)), reverse=True)
    assert ones == [-3, -4, -7, -8, -11, -19, -43, -67, -163]
    # and all D < 0 (orders too) with h = 1: the 13 of Cox Thm 7.30 (from memory)
    all_ones = sorted((D for D, h in hs.items() if h == 1), reverse=True)
    assert all_ones == [-3, -4, -7, -8, -11, -12, -16, -19, -27, -28, -43, -67, -163]


def test_order_class_number_formula():
    # h(f²d) = h(d)·f / [O_K^*: O^*] · Π_{p|f} (1 − χ_d(p)/p)  (Cox Thm 7.24)
    hs = class_numbers(-40000, -3)
    checked = 0
    for D, h in hs.items():
        dK, f = discriminant_parts(D)
        if f == 1 or -D > 40000:
            continue
        units = {-3: 3, -4: 2}.get(dK, 1)
        num, den = hs[dK] * f, units
        for p in {
            p for p in range(2, f + 1) if f % p == 0 and all(p % q for q in range(2, math.isqrt(p) + 1))
        }:
            num *= p - kronecker(dK, p)
            den *= p
        assert num % den == 0 and h == num // den, D
        checked += 1
    assert checked > 3000


# ---------------------------------------------------------------------------
# brute force and independent implementations
# ---------------------------------------------------------------------------


def test_sweep_equals_brute_force_per_D():
    L, H = 3, 2500
    np_h = _class_numbers_np(L, H)
    py_h = _class_numbers_py(L, H)
    for n in range(L, H + 1):
        expected = len(brute_reduced(-n)) if n % 4 in (0, 3) else 0
        assert np_h[n - L] == py_h[n - L] == expected, n


@given(st.integers(3, 10**5), st.integers(0, 400))
def test_sweep_any_window_matches_enumeration(L, width):
    # a window of the sweep must agree with per-D enumeration (formkit.class_number)
    H = L + width
    np_h = _class_numbers_np(L, H).tolist()
    assert np_h == _class_numbers_py(L, H)
    for n in range(L, H + 1, 37):
        if n % 4 in (0, 3):
            assert np_h[n - L] == class_number(-n), n


def test_windows_of_a_larger_sweep_agree():
    whole = _class_numbers_np(10**6 - 3000, 10**6)
    part = _class_numbers_np(10**6 - 1000, 10**6 - 500)
    assert (whole[2000:2501] == part).all()
    for n in (10**6 - 2999, 10**6 - 1234, 10**6):
        if n % 4 in (0, 3):
            assert whole[n - (10**6 - 3000)] == class_number(-n)


def test_chunk_arithmetic_against_factorisation():
    # fundamental part, conductor (sympy factorisation via discriminant_parts) and number of
    # genera (formkit.classgroups.genus: assigned characters, Cox Prop. 3.11 / Thm 3.15) for both sieves
    for L, H in ((3, 3000), (999_000, 1_000_000)):
        a = [x.tolist() for x in _chunk_arith_np(L, H)]
        b = _chunk_arith_py(L, H)
        for n in range(L, H + 1):
            if n % 4 not in (0, 3):
                continue
            i = n - L
            expected = (*discriminant_parts(-n), genus_count(-n))
            assert (a[0][i], a[1][i], a[2][i]) == expected == (b[0][i], b[1][i], b[2][i]), n


def test_genera_equal_ambiguous_classes():
    # Gauss: the number of genera equals the number of ambiguous classes; for D < 0 each
    # contains exactly one reduced form with b = 0, b = a or a = c (Cox Prop. 3.11, Lemma 3.10)
    for row in table_rows(-1500, -3, invariants=False):
        amb = [f for f in brute_reduced(row.discriminant) if f[1] == 0 or f[1] == f[0] or f[0] == f[2]]
        assert row.genus_count == len(amb), row.discriminant


def test_rows_with_invariants_match_class_group():
    from formkit import class_group

    rows = table_rows(-400, -3)
    assert len(rows) == 200  # n = -D ≡ 0, 3 (mod 4), 3 ≤ n ≤ 400
    for r in rows:
        G = class_group(r.discriminant)
        assert r.invariants == tuple(G.invariants)
        assert r.class_number == G.order == math.prod(r.invariants)
        assert r.genus_count == 2**G.two_rank  # genera = Cl/Cl² (Gauss; Cox Thm 3.15)


def test_positive_rows():
    import mpmath

    rows = {r.discriminant: r for r in table_rows(5, 240)}
    assert 9 not in rows and 16 not in rows and 6 not in rows  # squares, non-discriminants
    # narrow/wide class numbers: Q(√3): ε = 2+√3 has norm +1, h = 1, h+ = 2; Q(√10): h = 2,
    # ε = 3+√10 has norm −1; Q(√15): h = 2, ε = 4+√15 norm +1 so h+ = 4; Q(√229): h = 3, the
    # first real quadratic field with class number 3 (Cohen GTM 138 App. B, from memory)
    assert (rows[12].class_number_narrow, rows[12].class_number) == (2, 1)
    assert (rows[40].class_number_narrow, rows[40].class_number) == (2, 2)
    assert (rows[60].class_number_narrow, rows[60].class_number) == (4, 2)
    assert (rows[229].class_number_narrow, rows[229].class_number) == (3, 3)
    # regulators: log of the fundamental unit, written out by hand
    assert rows[5].regulator == pytest.approx(float(mpmath.log((1 + mpmath.sqrt(5)) / 2)), rel=1e-15)
    assert rows[8].regulator == pytest.approx(float(mpmath.log(1 + mpmath.sqrt(2))), rel=1e-15)
    assert rows[12].regulator == pytest.approx(float(mpmath.log(2 + mpmath.sqrt(3))), rel=1e-15)
    for D, r in rows.items():
        assert r.genus_count == genus_count(D)
        assert (r.fundamental_discriminant, r.conductor) == discriminant_parts(D)


def test_mixed_range_and_fundamental_filter():
    rows = table_rows(-40, 40, fundamental=True, invariants=False)
    Ds = [r.discriminant for r in rows]
    assert Ds == sorted(Ds, key=lambda d: (abs(d), d))
    assert set(Ds) == {d for d in range(-40, 41) if is_fundamental_discriminant(d)}


# ---------------------------------------------------------------------------
# bad input
# ---------------------------------------------------------------------------


def test_bad_input(tmp_path):
    with pytest.raises(FormkitError, match="start must not exceed"):
        class_numbers(-3, -10)
    with pytest.raises(NotAnIntegerError):
        class_numbers("a", -3)
    with pytest.raises(FormkitError, match="engine"):
        class_numbers(-10, -3, engine="fortran")
    with pytest.raises(FormkitError, match="start must not exceed"):
        table_rows(5, 1)
    db = str(tmp_path / "t.db")
    with pytest.raises(FormkitError, match="workers must be at least 1"):
        build_table(db, -10, -3, workers=0)
    with pytest.raises(FormkitError, match="chunk size"):
        build_table(db, -10, -3, chunk_size=0)
    with pytest.raises(FormkitError, match="no table store"):
        query_table(str(tmp_path / "missing.db"))
    bad = tmp_path / "notadb.db"
    bad.write_text("hello, this is not SQLite\n" * 100)
    with pytest.raises(FormkitError, match="not"):
        query_table(str(bad))
    with pytest.raises(FormkitError, match="chain"):
        parse_invariants("2,3")
    with pytest.raises(FormkitError, match="positive integers"):
        parse_invariants("2,x")
    with pytest.raises(FormkitError, match="positive integers"):
        parse_invariants([0, 2])
    with pytest.raises(FormkitError, match="no table store"):
        table_info(str(tmp_path / "missing.db"))
    with pytest.raises(FormkitError, match="chunk size"):
        list(split_range(-10, -3, 0))
    with pytest.raises(FormkitError, match="must not contain 0"):
        compute_chunk(ChunkSpec(-5, 5))
    assert class_numbers(5, 10) == {} and class_numbers(-2, -1) == {}
    assert table_rows(-2, 4) == []  # no discriminant in range (0, 1, 4 are squares)
    assert issubclass(DiscriminantError, FormkitError)


# ---------------------------------------------------------------------------
# the store
# ---------------------------------------------------------------------------


def _rows_of(db):
    return [r.to_dict() for r in query_table(db)]


def test_store_resume_and_queries(tmp_path):
    from formkit import class_group

    db = str(tmp_path / "t.db")
    s1 = build_table(db, -400, -3, invariants=True, workers=1, chunk_size=100)
    assert (s1.chunks_computed, s1.chunks_already_done) == (4, 0)
    s2 = build_table(db, -700, -201, workers=1, chunk_size=100)  # overlaps: only the new part
    assert s2.chunks_already_done == 2 and s2.chunks_computed == 3  # [-400, -201] was done
    assert s2.rows_written == 150
    rows = query_table(db)
    Ds = [r.discriminant for r in rows]
    assert len(Ds) == len(set(Ds)) == 350
    plain = table_rows(-700, -3, invariants=False)
    assert [r.to_dict() | {"invariants": None} for r in rows] == [r.to_dict() for r in plain]
    for r in rows:
        assert r.invariants == class_group(r.discriminant).invariants
    # queries
    sevens = [r.discriminant for r in query_table(db, class_number=7, fundamental=True)]
    assert sevens[:4] == [-71, -151, -223, -251]  # smallest |d_K| with h = 7 (Watkins 2004, from memory)
    assert sevens == [
        r.discriminant for r in rows if r.class_number == 7 and is_fundamental_discriminant(r.discriminant)
    ]
    c222 = [r.discriminant for r in query_table(db, invariants="2,2,2")]
    assert -420 in c222  # x² + 105y²: 105 is idoneal, Cl(−420) = (Z/2)³ (Cox §3, from memory)
    assert c222 == [r.discriminant for r in rows if r.invariants == (2, 2, 2)]
    assert [r.discriminant for r in query_table(db, invariants="1", conductor=2)] == [-12, -16, -28]
    assert [r.discriminant for r in query_table(db, genus_count=8, stop=-400, start=-500)] == [
        r.discriminant for r in rows if r.genus_count == 8 and -500 <= r.discriminant <= -400
    ]
    assert len(query_table(db, limit=3)) == 3
    assert all(r.fundamental_discriminant == -3 for r in query_table(db, fundamental_discriminant=-3))
    info = table_info(db)
    assert info["covered"] == [[-700, -3]] and info["rows"] == 350
    assert info["meta"]["method"] == "enumeration" and info["meta"]["certified"] == "1"
    # options must match the file
    with pytest.raises(FormkitError, match="built with invariants"):
        build_table(db, -1200, -3, invariants=False, workers=1)
    with pytest.raises(FormkitError, match="fundamental"):
        build_table(db, -1200, -3, fundamental=True, workers=1)
    with pytest.raises(FormkitError, match="at least 1"):
        query_table(db, class_number=0)
    with pytest.raises(FormkitError, match="start must not exceed"):
        query_table(db, start=-3, stop=-30)
    with pytest.raises(FormkitError, match="chain"):
        query_table(db, invariants="4,2")


def test_store_without_invariants_refuses_structure_queries(tmp_path):
    db = str(tmp_path / "h.db")
    build_table(db, -5000, -3, invariants=False, workers=1)
    with pytest.raises(FormkitError, match="without invariants"):
        query_table(db, invariants="2,2")
    rows = query_table(db, class_number=2, fundamental=True)
    assert len(rows) == 18 and rows[-1].discriminant == -427  # Watkins (from memory)


def test_pool_equals_serial(tmp_path):
    a, b = str(tmp_path / "a.db"), str(tmp_path / "b.db")
    build_table(a, -30_000, -3, invariants=False, workers=1, chunk_size=4_000)
    s = build_table(b, -30_000, -3, invariants=False, workers=2, chunk_size=4_000)
    assert s.workers == 2 and s.chunks_computed == 8
    assert _rows_of(a) == _rows_of(b)


def test_python_engine_store_equals_numpy(tmp_path):
    a, b = str(tmp_path / "a.db"), str(tmp_path / "b.db")
    build_table(a, -30_000, -20_001, invariants=False, workers=1, engine="python")
    build_table(b, -30_000, -20_001, invariants=False, workers=1, engine="numpy")
    assert _rows_of(a) == _rows_of(b)


def _table_cmd(db, *extra):
    return [
        sys.executable,
        "-m",
        "formkit",
        "table",
        "--from",
        "-230000",
        "--to",
        "-200001",
        "--no-invariants",
        "--db",
        db,
        "--chunk-size",
        "500",
        *extra,
    ]


def _chunk_count(db):
    if not os.path.exists(db):  # do not create the file before the build does
        return 0
    try:
        with sqlite3.connect(db, timeout=5) as c:
            return c.execute("SELECT count(*) FROM chunks").fetchone()[0]
    except sqlite3.OperationalError:
        return 0


@pytest.mark.parametrize("sig", [signal.SIGKILL, signal.SIGINT])
def test_interrupted_build_resumes(tmp_path, sig):
    """Start a real build, stop it with kill -9 (or Ctrl-C) mid-run, rerun, compare."""
    db = str(tmp_path / "k.db")
    env = dict(os.environ, PYTHONPATH=str(ROOT) + os.pathsep + os.environ.get("PYTHONPATH", ""))
    proc = subprocess.Popen(
        _table_cmd(db, "--workers", "2"),
        cwd=tmp_path,
        env=env,
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        start_new_session=True,
    )
    try:
        deadline = time.monotonic() + 120
        while _chunk_count(db) < 3:
            assert proc.poll() is None, proc.communicate()
            assert time.monotonic() < deadline
            time.sleep(0.01)
        if sig == signal.SIGKILL:
            os.kill(proc.pid, signal.SIGKILL)  # only the parent: workers must notice and stop
        else:
            os.killpg(proc.pid, signal.SIGINT)  # Ctrl-C reaches the whole foreground group
        proc.wait(timeout=60)
        done_at_kill = _chunk_count(db)
        assert 3 <= done_at_kill < 60, "the run was not interrupted mid-way"
        if sig == signal.SIGINT:
            err = proc.stderr.read().decode()
            assert proc.returncode == 130 and "resume" in err and "Traceback" not in err
        # the workers of a killed parent go away by themselves
        deadline = time.monotonic() + 15
        while True:
            try:
                os.killpg(proc.pid, 0)
            except ProcessLookupError:
                break
            assert time.monotonic() < deadline, "orphaned workers still running"
            time.sleep(0.1)
    finally:
        with contextlib.suppress(ProcessLookupError):
            os.killpg(proc.pid, signal.SIGKILL)
        proc.stdout.close()
        proc.stderr.close()
    rerun = subprocess.run(
        _table_cmd(db, "--workers", "2", "--json"),
        cwd=tmp_path,
        env=env,
        capture_output=True,
        text=True,
        timeout=300,
    )
    assert rerun.returncode == 0, rerun.stderr
    import json

    summary = json.loads(rerun.stdout)
    assert summary["chunks_already_done"] == done_at_kill
    assert summary["chunks_computed"] == 60 - done_at_kill
    with sqlite3.connect(db) as c:
        (n, distinct) = c.execute("SELECT count(*), count(DISTINCT discriminant) FROM rows").fetchone()
        (chunk_rows,) = c.execute("SELECT sum(row_count) FROM chunks").fetchone()
        stored = dict(c.execute("SELECT discriminant, class_number FROM rows"))
    assert n == distinct == chunk_rows == 15_000
    assert stored == class_numbers(-230_000, -200_001)  # a clean run, in this process


# ---------------------------------------------------------------------------
# Dask cluster
# ---------------------------------------------------------------------------


def test_dask_cluster_same_results_same_store(tmp_path):
    distributed = pytest.importorskip("distributed")
    db, ref = str(tmp_path / "c.db"), str(tmp_path / "ref.db")
    build_table(ref, -40_000, -3, invariants=False, workers=1, chunk_size=5_000)
    with distributed.LocalCluster(
        n_workers=2, threads_per_worker=1, processes=False, dashboard_address="127.0.0.1:0"
    ) as cluster:
        address = cluster.scheduler_address
        build_table(db, -20_000, -3, invariants=False, chunk_size=5_000, cluster=address)
        s = build_table(db, -40_000, -3, invariants=False, chunk_size=5_000, cluster=address)
        assert (s.chunks_already_done, s.chunks_computed, s.cluster) == (4, 4, address)
        mixed = table_rows(-30, 30)
        got = []
        build_table(None, -30, 30, cluster=address, rows_out=got)
        assert sorted(r.to_dict()["discriminant"] for r in got) == sorted(r.discriminant for r in mixed)
        assert {r.discriminant: r for r in got} == {r.discriminant: r for r in mixed}
    assert _rows_of(db) == _rows_of(ref)


def test_cluster_unreachable_is_a_clean_error(tmp_path):
    pytest.importorskip("distributed")
    import dask

    with (
        dask.config.set({"distributed.comm.timeouts.connect": "1s"}),
        pytest.raises(FormkitError, match="could not connect"),
    ):
        build_table(None, -100, -3, cluster="tcp://127.0.0.1:1", invariants=False)


def test_invariants_shortcut_agrees_with_class_group():
    # invariants decided by h and the 2-rank (number of genera) alone must be the group's
    from formkit import class_group
    from formkit.tables.rows import _invariants_from_order

    decided = 0
    for D in [d for d in range(-3, -3001, -1) if d % 4 in (0, 1)] + [
        d for d in range(5, 1500) if d % 4 in (0, 1)
    ]:
        try:
            G = class_group(D)
        except DiscriminantError:  # squares
            continue
        quick = _invariants_from_order(G.order, genus_count(D))
        if quick is not None:
            assert quick == G.invariants, D
            decided += 1
    assert decided > 1800  # about 90% of these D need no group computation
