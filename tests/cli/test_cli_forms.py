"""Tests of the ``formkit reduce`` and ``formkit equivalent`` commands.

The JSON shapes are those of the issue; every matrix printed is checked by applying it
with the matrix action written out in tests/_foundation_strategies.py.  One test runs a
real ``python -m formkit`` subprocess.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys

import pytest
from _cli import run, run_json
from _foundation_strategies import act, brute_reduced_indefinite, det

REDUCE_KEYS = {"form", "discriminant", "reduced", "matrix", "class_representative"}
EQUIVALENT_KEYS = {"equivalent", "properly", "matrix"}


def assert_usage_error(code, out, err):
    assert code == 2
    assert out == ""
    lines = err.splitlines()
    assert len(lines) == 1, err
    assert lines[0].startswith("formkit: error: ")
    assert "Traceback" not in err


# --- reduce ---------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "arg, form",
    [
        ("10,37,35", [10, 37, 35]),
        ("[2, -1, 3]", [2, -1, 3]),
        ("-3,-2,-5", [-3, -2, -5]),  # negative definite, negative first coefficient
        ("5x^2 + 8xy + 4y^2", [5, 8, 4]),
        ("-2x^2 + 2xy - 3y^2", [-2, 2, -3]),
    ],
)
def test_reduce_json_definite(capsys, arg, form):
    d = run_json(capsys, "reduce", arg)
    assert set(d) == REDUCE_KEYS
    assert d["form"] == form
    a, b, c = form
    assert d["discriminant"] == b * b - 4 * a * c < 0
    assert act(tuple(d["form"]), d["matrix"]) == tuple(d["reduced"])  # reduced == form·matrix
    assert det(d["matrix"]) == 1


@pytest.mark.parametrize(
    "argv",
    [
        ["reduce", "-3,2,2"],
        ["reduce", "-x^2 + 13y^2"],
        ["reduce", "-x^2+13y^2"],
        ["reduce", "1,0,-7"],
        ["reduce", "(-1, 5, 7)"],
        ["reduce", "--json", "-3,2,2"],  # option before the negative argument
    ],
)
def test_reduce_json_indefinite_with_negative_arguments(capsys, argv):
    d = run_json(capsys, *argv)
    assert set(d) == REDUCE_KEYS | {"cycle", "cycle_complete"}
    assert d["discriminant"] > 0
    assert act(tuple(d["form"]), d["matrix"]) == tuple(d["reduced"]) and det(d["matrix"]) == 1
    assert d["cycle_complete"] is True
    cycle = [tuple(f) for f in d["cycle"]]
    assert cycle[0] == tuple(d["reduced"])
    # the cycle consists of reduced forms of D (brute-force inequalities), without repeats
    reduced_forms = set(brute_reduced_indefinite(d["discriminant"]))
    assert set(cycle) <= reduced_forms and len(set(cycle)) == len(cycle)


def test_reduce_examples_from_the_issue(capsys):
    d = run_json(capsys, "reduce", "-x^2 + 13y^2")
    assert d["form"] == [-1, 0, 13] and d["discriminant"] == 52
    d = run_json(capsys, "reduce", "-3,2,2")
    assert d["form"] == [-3, 2, 2] and d["discriminant"] == 28
    # (−3, 2, 2) is reduced: √28 − 2 < 6 < √28 + 2; its cycle has the 4 forms of the class
    assert d["reduced"] == [-3, 2, 2] and d["matrix"] == [[1, 0], [0, 1]]
    assert len(d["cycle"]) == 4


def test_reduce_steps(capsys):
    d = run_json(capsys, "reduce", "10,37,35", "--steps")
    assert set(d) == REDUCE_KEYS | {"steps"}
    current = tuple(d["form"])
    for s in d["steps"]:
        current = act(current, s["matrix"])
        assert list(current) == s["form"]
    assert list(current) == d["reduced"]
    code, out, _err = run(capsys, "reduce", "10,37,35", "--steps")
    assert code == 0 and "translate" in out and "swap" in out and "(1, 1, 8)" in out


def test_reduce_human_output(capsys):
    code, out, err = run(capsys, "reduce", "-x^2 + 13y^2")
    assert code == 0 and err == ""
    assert "discriminant:  52" in out and "cycle (10 reduced forms)" in out
    code, out, err = run(capsys, "reduce", "3,0,3")
    assert code == 0 and "reduced:" in out and "(3, 0, 3)" in out


def test_reduce_huge_form_exact(capsys):
    a = 10**300 + 7
    d = run_json(capsys, "reduce", f"{a},{2 * a - 1},{a + 1}")  # D = 1 − 8a < 0
    assert d["form"] == [a, 2 * a - 1, a + 1] and d["discriminant"] == 1 - 8 * a
    assert act(tuple(d["form"]), d["matrix"]) == tuple(d["reduced"])


def test_reduce_cycle_limit(capsys):
    d = run_json(capsys, "reduce", "1,1,-10000000000000000000001", "--limit", "3")
    assert len(d["cycle"]) == 3 and d["cycle_complete"] is False
    code, out, _err = run(capsys, "reduce", "1,1,-10000000000000000000001", "--limit", "3")
    assert code == 0 and "more than 3" in out
    d = run_json(capsys, "reduce", "1,0,-7", "--limit", "0")
    assert len(d["cycle"]) == 4 and d["cycle_complete"] is True
    assert_usage_error(*run(capsys, "reduce", "1,0,-7", "--limit", "-1"))


# --- equivalent -------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "F, G, equivalent, properly",
    [
        ("1,0,-7", "-3,2,2", True, True),
        ("-3,2,2", "1,0,-7", True, True),
        ("2,1,3", "2,-1,3", True, False),  # D = −23: improperly only (Cox §2, from memory)
        ("3,2,5", "3,-2,5", True, False),
        ("2,1,3", "1,1,6", False, False),
        ("1,0,5", "2,2,3", False, False),  # D = −20, h = 2
        ("2,1,3", "2,5,6", True, True),
        ("-x^2 + 13y^2", "x^2 - 13y^2", True, True),  # unit (18 + 5√13) has norm −1
        ("x^2 - 3y^2", "-x^2 + 3y^2", False, False),
    ],
)
def test_equivalent_json(capsys, F, G, equivalent, properly):
    d = run_json(capsys, "equivalent", F, G)
    assert set(d) == EQUIVALENT_KEYS
    assert d["equivalent"] is equivalent and d["properly"] is properly
    if equivalent:
        from formkit import Form

        f, g = Form.parse(F), Form.parse(G)
        assert act(f.coefficients, d["matrix"]) == g.coefficients  # F·matrix = G
        assert det(d["matrix"]) == (1 if properly else -1)
    else:
        assert d["matrix"] is None


def test_equivalent_human_output(capsys):
    code, out, _err = run(capsys, "equivalent", "2,1,3", "2,-1,3")
    assert code == 0 and "only improperly" in out
    code, out, _err = run(capsys, "equivalent", "2,1,3", "1,1,6")
    assert code == 0 and "not equivalent" in out


# --- bad input ----------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "argv",
    [
        [],
        ["reduce"],
        ["reduce", "1,2"],
        ["reduce", "1,2,3,4"],
        ["reduce", "[1,2,3)"],
        ["reduce", "x^3"],
        ["reduce", "__import__('os').system('echo unsafe')"],
        ["reduce", "1,2,1"],  # D = 0
        ["reduce", "1,0,-4"],  # D = 16, a square
        ["reduce", "1.5,2,3"],
        ["reduce", "1,2,3", "--bogus"],
        ["reduce", "1,2,3", "--limit", "x"],
        ["equivalent", "1,0,1"],
        ["equivalent", "1,0,1", "1,1,1"],  # different discriminants
        ["equivalent", "1,0,1", "x^2 + y^2 + z^2"],
        ["nosuchcommand"],
        ["reduce", ""],
        ["reduce", "-"],
    ],
)
def test_bad_input_one_line_exit_2(capsys, argv):
    assert_usage_error(*run(capsys, *argv))


def test_real_subprocess():
    env = dict(os.environ)
    env.pop("FORMKIT_INTEGER_BACKEND", None)
    proc = subprocess.run(
        [sys.executable, "-m", "formkit", "reduce", "-x^2 + 13y^2", "--json"],
        capture_output=True,
        text=True,
        timeout=120,
        env=env,
    )
    assert proc.returncode == 0, proc.stderr
    d = json.loads(proc.stdout)
    assert d["form"] == [-1, 0, 13] and act((-1, 0, 13), d["matrix"]) == tuple(d["reduced"])
    assert "cycle" in d
    proc = subprocess.run(
        [sys.executable, "-m", "formkit", "reduce", "1,2"],
        capture_output=True,
        text=True,
        timeout=120,
        env=env,
    )
    assert proc.returncode == 2 and proc.stdout == ""
    assert len(proc.stderr.splitlines()) == 1 and proc.stderr.startswith("formkit: error: ")
    assert "Traceback" not in proc.stderr


def test_equivalent_max_steps(capsys):
    code, out, err = run(
        capsys,
        "equivalent",
        "1,1,-250000000000000000000003",
        "-1,1,250000000000000000000003",
        "--max-steps",
        "1000",
    )
    assert_usage_error(code, out, err)
    assert "not decided" in err
    assert_usage_error(*run(capsys, "equivalent", "1,0,-7", "-3,2,2", "--max-steps", "0"))
    d = run_json(capsys, "equivalent", "1,0,-7", "-3,2,2", "--max-steps", "10")
    assert d["equivalent"] is True


def test_reduce_all_lists_a_whole_cycle_or_stops_at_the_budget(capsys):
    # the cycle of (1, 18, -13), D = 376, is listed completely (it closes on its first form); a cycle of about 10^55 forms (D ≈ 4·10^110) stops at the forms the budget
    # holds, in one line naming --limit
    data = run_json(capsys, "reduce", "1,0,-94", "--all")
    assert data["cycle_complete"] and data["cycle"][0] == data["reduced"]
    code, out, err = run(capsys, "reduce", "1,-10^55+22,2^118-21", "--all", "--budget", "1s,100M")
    assert code == 2 and out == "" and err.count("\n") == 1
    assert "listing all of them is over the budget" in err and "--limit N" in err
