"""The ``formkit table`` command: build, print, store, query, formats, errors."""

from __future__ import annotations

import csv
import io
import json
import os
import re
import subprocess
import sys
from pathlib import Path

import pytest

from formkit import class_group, is_fundamental_discriminant
from formkit.cli import main

ROOT = Path(__file__).resolve().parents[2]


def run(argv, capsys):
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def test_text_table(capsys):
    code, out, err = run(["table", "--from", "-30", "--to", "-3"], capsys)
    assert code == 0 and err == ""
    lines = out.splitlines()
    assert lines[0].split() == ["D", "d_K", "f", "h", "structure", "genera"]
    cells = [re.split(r"\s{2,}", line.strip()) for line in lines[1:-1]]
    body = {int(c[0]): c for c in cells}
    # h(−23) = 3, cyclic, one genus; h(−12) = 1 with conductor 2 over −3 (Cox §7, from memory)
    assert body[-23] == ["-23", "-23", "1", "3", "C3", "1"]
    assert body[-12] == ["-12", "-3", "2", "1", "C1", "1"]
    assert len(body) == 14 and "unconditional" in lines[-1]


def test_csv_and_positive_columns(capsys):
    code, out, _ = run(["table", "--from", "5", "--to", "100", "--fundamental", "--format", "csv"], capsys)
    assert code == 0
    rows = list(csv.DictReader(io.StringIO(out)))
    assert [int(r["discriminant"]) for r in rows] == [
        d for d in range(5, 101) if is_fundamental_discriminant(d)
    ]
    by = {int(r["discriminant"]): r for r in rows}
    # Q(√3): narrow class number 2, wide 1, regulator log(2+√3) = 1.3169578969… (from memory)
    # h⁺(12) = 2 proper form classes, h(12) = 1 ideal class (enumeration; N(2 + √3) = +1)
    assert (by[12]["class_number_narrow"], by[12]["class_number"]) == ("2", "1")
    assert float(by[12]["regulator"]) == pytest.approx(1.3169578969248166, rel=1e-14)
    for D, r in by.items():
        G = class_group(D)
        assert int(r["class_number_narrow"]) == G.order and int(r["class_number"]) == G.class_number
        assert r["structure"] == G.structure  # one notation: C2 × C4, the trivial group C1


def test_json_object(capsys):
    code, out, _ = run(["table", "--from", "-100", "--to", "-3", "--no-invariants", "--json"], capsys)
    assert code == 0 and out.count("\n") == 1
    payload = json.loads(out)
    assert payload["count"] == len(payload["rows"]) == 50
    assert payload["method"] == "enumeration" and payload["certified"] is True
    assert payload["invariants_computed"] is False
    assert all(r["invariants"] is None for r in payload["rows"])
    by = {r["discriminant"]: r for r in payload["rows"]}
    assert by[-47]["class_number"] == 5 and by[-71]["class_number"] == 7  # Cohen GTM 138 App. B (from memory)
    _code2, out2, _ = run(
        ["table", "--from", "-100", "--to", "-3", "--no-invariants", "--format", "json"], capsys
    )
    assert json.loads(out2) == payload


def test_tex_fragment(capsys):
    code, out, _ = run(["table", "--from", "-84", "--to", "-84", "--format", "tex"], capsys)
    assert code == 0
    assert out.count(r"\begin{tabular}") == 1 and out.rstrip().endswith(r"\end{tabular}")
    assert r"$-84$ & $-84$ & $1$ & $4$ & $C_{2} \times C_{2}$ & $4$ \\" in out  # Cl(−84) = (Z/2)² (Cox §3)
    code, out, _ = run(["table", "--from", "12", "--to", "13", "--format", "tex"], capsys)
    assert "$1.316958$" in out and r"$h^{+}$" in out


def test_build_store_then_query(tmp_path, capsys):
    db = str(tmp_path / "t.db")
    code, out, err = run(
        [
            "table",
            "--from",
            "-3000",
            "--to",
            "-3",
            "--no-invariants",
            "--db",
            db,
            "--workers",
            "1",
            "--chunk-size",
            "1000",
        ],
        capsys,
    )
    assert code == 0 and err == ""  # not a terminal: no progress bar
    assert "3 chunks computed (1500 rows), 0 already done" in out
    code, out, _ = run(
        ["table", "--from", "-3000", "--to", "-3", "--no-invariants", "--db", db, "--json"], capsys
    )
    s = json.loads(out)
    assert (s["chunks_computed"], s["chunks_already_done"], s["rows_written"]) == (0, 3, 0)
    # h = 1 among fundamental discriminants (Baker–Heegner–Stark; Cox Thm 7.30)
    code, out, _ = run(["table", "--db", db, "--class-number", "1", "--fundamental", "--json"], capsys)
    assert [r["discriminant"] for r in json.loads(out)["rows"]] == [-3, -4, -7, -8, -11, -19, -43, -67, -163]
    # h = 3: 16 fields, the largest |d_K| is 907 (Watkins 2004, from memory)
    code, out, _ = run(
        ["table", "--db", db, "--class-number", "3", "--fundamental", "--format", "csv"], capsys
    )
    found = [int(r["discriminant"]) for r in csv.DictReader(io.StringIO(out))]
    assert len(found) == 16 and found[-1] == -907
    code, out, _ = run(["table", "--db", db, "--query", "--from", "-20", "--to", "-15", "--json"], capsys)
    assert [r["discriminant"] for r in json.loads(out)["rows"]] == [-15, -16, -19, -20]
    code, out, _ = run(["table", "--db", db, "--conductor", "5", "--limit", "2", "--json"], capsys)
    assert [r["discriminant"] for r in json.loads(out)["rows"]] == [-75, -100]
    code, out, _ = run(["table", "--db", db, "--genera", "8", "--fundamental-part", "-420", "--json"], capsys)
    # −1680 = 2²·(−420): D/4 = −420 ≡ 4 (mod 8) adds one character, μ = 3 + 1 (Cox Prop. 3.11)
    assert [r["discriminant"] for r in json.loads(out)["rows"]] == [-420, -1680]
    code, out, _ = run(["table", "--db", db, "--info"], capsys)
    assert code == 0 and "covered: [-3000, -3]" in out and "1500 rows" in out
    code, out, _ = run(["table", "--db", db, "--info", "--json"], capsys)
    assert json.loads(out)["meta"]["certified"] == "1"


def test_structure_query(tmp_path, capsys):
    db = str(tmp_path / "g.db")
    assert run(["table", "--from", "-500", "--to", "-3", "--db", db, "--workers", "1"], capsys)[0] == 0
    _code, out, _ = run(["table", "--db", db, "--invariants", "2,2,2", "--json"], capsys)
    got = [r["discriminant"] for r in json.loads(out)["rows"]]
    assert -420 in got  # 105 is idoneal: Cl(−420) = (Z/2)³ (Euler's idoneal numbers, from memory)
    assert got == [
        D for D in range(-3, -501, -1) if D % 4 in (0, 1) and class_group(D).invariants == (2, 2, 2)
    ]


@pytest.mark.parametrize(
    "argv, words",
    [
        (["table", "--from", "-3"], "--to"),
        (["table", "--from", "-3", "--to", "-30"], "start must not exceed"),
        (["table", "--from", "x", "--to", "-3"], "--from"),
        (["table", "--class-number", "7"], "--db"),
        (["table", "--info"], "--db"),
        (["table", "--from", "-30", "--to", "-3", "--workers", "0"], "must be at least 1"),
        (["table", "--from", "-30", "--to", "-3", "--chunk-size", "-5"], "must be at least 1"),
        (["table", "--from", "-30", "--to", "-3", "--format", "xml"], "invalid choice"),
        (["table", "--from", "-30", "--to", "-3", "--limit", "3"], "--limit"),
        (["table", "--db", "/nonexistent/dir/none.db", "--class-number", "7"], "no table store"),
    ],
)
def test_bad_input_one_line(argv, words, capsys):
    code, out, err = run(argv, capsys)
    assert code == 2 and out == ""
    lines = err.splitlines()
    assert len(lines) == 1 and lines[0].startswith("formkit: error: ") and words in lines[0], err


def test_bad_query_values(tmp_path, capsys):
    db = str(tmp_path / "h.db")
    run(["table", "--from", "-100", "--to", "-3", "--no-invariants", "--db", db], capsys)
    for argv, words in [
        (["--invariants", "2,2"], "without invariants"),
        (["--class-number", "0"], "at least 1"),
        (["--class-number", "seven"], "class-number"),
    ]:
        code, _out, err = run(["table", "--db", db, *argv], capsys)
        assert code == 2 and len(err.splitlines()) == 1 and words in err, err
    code, _, err = run(["table", "--from", "-200", "--to", "-3", "--db", db], capsys)  # with invariants
    assert code == 2 and "built without invariants" in err


def test_pipe_is_quiet_subprocess(tmp_path):
    db = str(tmp_path / "p.db")
    env = dict(os.environ, PYTHONPATH=str(ROOT) + os.pathsep + os.environ.get("PYTHONPATH", ""))
    proc = subprocess.run(
        [
            sys.executable,
            "-m",
            "formkit",
            "table",
            "--from",
            "-20000",
            "--to",
            "-3",
            "--no-invariants",
            "--db",
            db,
            "--workers",
            "2",
            "--chunk-size",
            "5000",
        ],
        capture_output=True,
        text=True,
        env=env,
        timeout=300,
    )
    assert proc.returncode == 0 and proc.stderr == "", proc.stderr  # no progress bar into a pipe
    assert "4 chunks computed (10000 rows)" in proc.stdout, proc.stdout


def test_cluster_option_and_probe(tmp_path, capsys, monkeypatch):
    distributed = pytest.importorskip("distributed")
    import formkit.core.cluster as store  # the probe lives with the shared cluster plumbing

    db = str(tmp_path / "c.db")
    with distributed.LocalCluster(
        n_workers=1, threads_per_worker=2, processes=False, dashboard_address="127.0.0.1:0"
    ) as cluster:
        addr = cluster.scheduler_address
        code, out, err = run(
            [
                "table",
                "--from",
                "-5000",
                "--to",
                "-3",
                "--no-invariants",
                "--db",
                db,
                "--cluster",
                addr,
                "--chunk-size",
                "1000",
                "--json",
            ],
            capsys,
        )
        assert code == 0, err
        s = json.loads(out)
        assert s["cluster"] == addr and s["chunks_computed"] == 5 and s["rows_written"] == 2500
        # h = 2: 18 fundamental discriminants, the largest |d_K| is 427 (Watkins 2004, from memory)
        code, out, _ = run(["table", "--db", db, "--class-number", "2", "--fundamental", "--json"], capsys)
        assert json.loads(out)["count"] == 18

        def broken():
            raise ImportError("No module named 'formkit'")

        monkeypatch.setattr(store, "_cluster_probe", broken)
        code, out, err = run(["table", "--from", "-100", "--to", "-3", "--cluster", addr], capsys)
        assert code == 2 and len(err.splitlines()) == 1 and "install formkit on the scheduler" in err


# ---------------------------------------------------------------------------
# statistics, p-rank queries, first occurrences, the theta engine (issue 20)
# ---------------------------------------------------------------------------


def test_table_statistics_json_and_plot(capsys, tmp_path):
    from _cli import run, run_json

    data = run_json(capsys, "table", "--from", "-3000", "--to", "-3", "--statistics")
    by = {x["quantity"]: x for x in data["lines"]}
    # the counts must match the groups listed by the same command (independent path: enumeration)
    groups = [
        tuple(int(n) for n in class_group(D, method="enumerate").invariants)
        for D in range(-3000, -2)
        if D % 4 in (0, 1) and is_fundamental_discriminant(D)
    ]
    assert data["total"] == len(groups)
    assert by["3 | h"]["count"] == sum(1 for g in groups if any(n % 3 == 0 for n in g))
    assert "unconditional" in data["provenance"]
    code, out, err = run(
        capsys, "table", "--from", "-2000", "--to", "-3", "--statistics", "--plot", str(tmp_path / "s.png")
    )
    assert code == 0 and err == "" and "Cohen–Lenstra" in out and (tmp_path / "s.png").exists()


def test_table_first_and_rank_queries(capsys):
    from _cli import run, run_json

    # −3299: C3 × C9, the first 3-rank 2 (from memory; Buell 1989 tables)
    code, out, _ = run(capsys, "table", "--from", "-5000", "--to", "-3", "--fundamental", "--first", "3:2")
    assert code == 0 and "first at D = -3299, C3 × C9" in out
    data = run_json(
        capsys, "table", "--from", "-13000", "--to", "-3", "--fundamental", "--p-rank-at-least", "5:2"
    )
    assert [r["discriminant"] for r in data["rows"]] == [-11199, -12451]  # from memory
    data = run_json(capsys, "table", "--from", "-500", "--to", "-3", "--p-rank", "3:0", "--engine", "theta")
    assert all(all(n % 3 for n in r["invariants"]) for r in data["rows"]) and data["count"] > 100


@pytest.mark.parametrize(
    "argv, needle",
    [
        (["--from", "-30", "--to", "-3", "--first", "4:1"], "prime P"),
        (["--from", "-30", "--to", "-3", "--p-rank", "3"], "P:R"),
        (["--from", "-30", "--to", "-3", "--plot", "x.png"], "--plot goes with --statistics"),
        (["--statistics"], "--from A --to B"),
    ],
)
def test_table_statistics_errors(capsys, argv, needle):
    from _cli import run

    code, out, err = run(capsys, "table", *argv)
    assert code == 2 and out == "" and err.count("\n") == 1 and needle in err
    assert err.startswith("formkit: error: ")
