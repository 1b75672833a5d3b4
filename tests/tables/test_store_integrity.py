"""Table stores that cannot lie: damage, repair and two writers, with real processes.

Sources: the identities checked are theorems (every discriminant is f²·d_K, Cox §7.A;
the invariant factors multiply to h; genus theory: the number of genera is the order of
Cl/Cl², Cox Thm 3.15); the file format is formkit's own.
"""

from __future__ import annotations

import sqlite3
import subprocess
import sys

import pytest

from formkit.errors import StoreDamagedError
from formkit.tables.parallel import build_table
from formkit.tables.store import query_table, table_info

CMD = [sys.executable, "-m", "formkit"]


def _run(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run([*CMD, *args], capture_output=True, text=True, timeout=120)


def _one_line_exit_2(p: subprocess.CompletedProcess) -> None:
    assert p.returncode == 2, (p.returncode, p.stderr)
    lines = p.stderr.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("formkit: error: "), p.stderr


@pytest.fixture
def store(tmp_path):
    db = str(tmp_path / "t.db")
    build_table(db, -400, -3, workers=1, chunk_size=100)
    return db


def test_edited_invariants_are_refused_and_repaired(store):
    # -84: Cl ≅ C2 × C2 (class number 4; Cox's table of h(-4n), n = 21)
    conn = sqlite3.connect(store)
    conn.execute("UPDATE rows SET invariants = '2,4' WHERE discriminant = -84")
    conn.commit()
    conn.close()
    with pytest.raises(StoreDamagedError, match=r"damaged chunk.*\[-100, -3\].*--from -100 --to -3"):
        query_table(store, class_number=4)
    p = _run("table", "--db", store, "--class-number", "4")
    _one_line_exit_2(p)
    assert p.stdout == ""
    p = _run("table", "--db", store, "--info")
    _one_line_exit_2(p)
    assert "DAMAGED" in p.stdout
    assert not table_info(store)["verified"]
    # a rebuild recomputes exactly the damaged chunk
    s = build_table(store, -400, -3, workers=1, chunk_size=100)
    assert s.chunks_computed == 1
    assert table_info(store)["verified"]
    assert [r.invariants for r in query_table(store, start=-84, stop=-84)] == [(2, 2)]


def test_checksum_catches_a_consistent_edit(store):
    # h and invariants changed together keep ∏ invariants = h; only the checksum sees it
    conn = sqlite3.connect(store)
    conn.execute("UPDATE rows SET class_number = 8, invariants = '2,4' WHERE discriminant = -84")
    conn.commit()
    conn.close()
    with pytest.raises(StoreDamagedError, match="checksum"):
        query_table(store)


def test_overwritten_bytes_end_in_one_line(store):
    with open(store, "r+b") as fh:
        fh.seek(4096 + 100)
        fh.write(b"\xff" * 16)
    p = _run("table", "--db", store, "--class-number", "3")
    assert p.returncode in (0, 2), p.stderr
    if p.returncode == 2:
        _one_line_exit_2(p)
    p = _run("table", "--db", store, "--info")
    assert p.returncode in (0, 2) and "Traceback" not in p.stderr


def test_two_writers_at_once(tmp_path):
    db = str(tmp_path / "m.db")
    args = ("table", "--from", "-6000", "--to", "-3", "--db", db, "--workers", "1", "--json")
    procs = [
        subprocess.Popen([*CMD, *args], stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
        for _ in range(2)
    ]
    outs = [p.communicate(timeout=300) for p in procs]
    for p, (_out, err) in zip(procs, outs):
        assert p.returncode == 0, err
        assert "internal error" not in err
    assert table_info(db)["verified"]
    reference = str(tmp_path / "r.db")
    build_table(reference, -6000, -3, workers=1)
    assert query_table(db) == query_table(reference)
