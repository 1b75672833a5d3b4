"""Tests for the commands ``formkit group``, ``formkit compose`` and ``formkit power``.

JSON keys as in issue 3 (item 8); values are compared with brute force
(tests/_classgroup_reference.py) and classical values (from memory, named inline).
"""

from __future__ import annotations

import json
import math
import os
import re
import subprocess
import sys

import pytest
from _classgroup_reference import (
    BruteGroup,
    brute_reduced_definite,
    class_key,
    class_product,
    indefinite_cycles,
    is_reduced_indefinite,
    wide_class_number,
)

from formkit.cli import main

ISSUE_KEYS = {
    "discriminant",
    "fundamental_discriminant",
    "conductor",
    "class_number",
    "invariants",
    "generators",
    "forms",
    "method",
    "certified",
}
REAL_KEYS = {"regulator", "fundamental_unit"}
# Extra keys present in the output beyond those the issue names (honesty fields for
# conditional results, and the norm of the unit; the order, its units, the class number
# formula, the kernel of Cl(O) → Cl(O_K) and the group of ideal classes, issue 13);
# allowed, nothing else.
EXTRA_KEYS = {
    "assumption",
    "bound",
    "fundamental_unit_norm",
    "detail",
    "class_number_narrow",
    "order",
    "class_number_formula",
    "unit_count",
    "fundamental_unit_text",
    "fundamental_unit_basis",
    "regulator_text",
    "kernel",
    "ideal_class_group",
    # issue 15: the structure in the shared notation, every class with order and discrete log
    "structure",
    "classes",
}


def run(argv, capsys):
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def run_json(argv, capsys):
    code, out, err = run([*argv, "--json"], capsys)
    assert code == 0, err
    assert err == ""
    assert out.count("\n") == 1
    return json.loads(out)


# ---------------------------------------------------------------------------
# group


@pytest.mark.parametrize("D", [-3, -4, -23, -56, -4004, -3299, -108, -4 * 1155])
def test_group_json_negative(D, capsys):
    # source: brute force (scanned reduced forms, ideal multiplication)
    d = run_json(["group", str(D)], capsys)
    assert ISSUE_KEYS <= set(d) <= ISSUE_KEYS | EXTRA_KEYS
    B = BruteGroup(D)
    assert d["discriminant"] == D
    assert d["class_number"] == B.h == len(d["forms"])
    assert sorted(map(tuple, d["forms"])) == brute_reduced_definite(D)
    assert tuple(d["invariants"]) == B.invariants()
    assert len(d["generators"]) == len(d["invariants"])
    for g, n in zip(d["generators"], d["invariants"]):
        assert tuple(g) in B.key and B.order(class_key(tuple(g), D)) == n
    assert d["fundamental_discriminant"] * d["conductor"] ** 2 == D
    assert d["method"] == "enumeration" and d["certified"] is True


def test_group_json_values_by_hand(capsys):
    # Cl(−4004) ≅ C2 × C2 × C10 (brute force; 4004 = 4·7·11·13 gives 2-rank 3 by genus theory)
    d = run_json(["group", "-4004"], capsys)
    assert d["invariants"] == [2, 2, 10] and d["class_number"] == 40
    # −108 = 6²·(−3)
    d = run_json(["group", "-108"], capsys)
    assert (d["fundamental_discriminant"], d["conductor"], d["class_number"]) == (-3, 6, 3)


@pytest.mark.parametrize("D", [5, 40, 136, 316, 229, 12 * 25])
def test_group_json_positive(D, capsys):
    d = run_json(["group", str(D)], capsys)
    assert ISSUE_KEYS | REAL_KEYS <= set(d) <= ISSUE_KEYS | REAL_KEYS | EXTRA_KEYS
    # class_number_narrow = h⁺ = proper classes of forms (brute force); class_number = h
    assert d["class_number_narrow"] == BruteGroup(D).h == len(d["forms"])
    assert d["class_number"] == wide_class_number(D)
    t, u = d["fundamental_unit"]
    assert t * t - D * u * u in (4, -4) and u > 0
    assert abs(d["regulator"] - math.log((t + u * math.sqrt(D)) / 2)) < 1e-9
    cycles = indefinite_cycles(D)
    assert sorted(cycles[tuple(f)] for f in d["forms"]) == list(range(d["class_number_narrow"]))


def test_group_json_q_sqrt_79(capsys):
    # Q(√79): class number 3, narrow 6, ε = 80 + 9√79 of norm +1 (from memory)
    d = run_json(["group", "316"], capsys)
    assert (d["class_number_narrow"], d["class_number"], d["fundamental_unit"]) == (6, 3, [160, 9])
    assert d["fundamental_unit_text"] == "80 + 9√79" and d["ideal_class_group"]["invariants"] == [3]


def test_group_human_output(capsys):
    code, out, err = run(["group", "-4004"], capsys)
    assert code == 0 and err == ""
    assert "C2 × C2 × C10" in out
    assert "class number h = 40" in out
    assert "unconditional" in out
    # a table of all 40 classes with their orders: one line per class, orders divide 10
    row = re.compile(r"^\s*\((-?\d+), (-?\d+), (-?\d+)\)\s+(\d+)\s")
    rows = [m.groups() for m in map(row.match, out.splitlines()) if m]
    assert len(rows) == 40
    orders = {tuple(map(int, r[:3])): int(r[3]) for r in rows}
    assert sorted(orders) == brute_reduced_definite(-4004)
    B = BruteGroup(-4004)
    for form, n in orders.items():
        assert B.order(class_key(form, -4004)) == n


def test_group_human_output_positive_and_rows(capsys):
    code, out, _ = run(["group", "316"], capsys)
    assert code == 0
    assert "C6" in out and "fundamental unit" in out
    # narrow and wide named in words (issue 13, item 4): h⁺ = 6 proper form classes, h = 3 ideal classes
    assert "narrow class number h+ = 6" in out and "(forms up to proper equivalence)" in out
    assert "class number h = 3" in out and "(ideal classes of the order)" in out
    code, out, _ = run(["group", "-4004", "--limit", "5"], capsys)
    assert code == 0 and "35 more classes" in out


# ---------------------------------------------------------------------------
# compose and power


def test_compose_json(capsys):
    # source: ideal multiplication, all pairs for two D; both methods
    for D in (-84, -3 * 49):
        reps = brute_reduced_definite(D)
        for F in reps:
            for G in reps:
                for method in ("dirichlet", "nucomp"):
                    d = run_json(
                        ["compose", ",".join(map(str, F)), ",".join(map(str, G)), "--method", method], capsys
                    )
                    assert set(d) == {"result"}
                    assert tuple(d["result"]) == class_product(F, G, D)


def test_compose_json_indefinite(capsys):
    D = 316
    forms = sorted(indefinite_cycles(D))[:6]
    for F in forms:
        for G in forms:
            d = run_json(["compose", ",".join(map(str, F)), ",".join(map(str, G))], capsys)
            r = tuple(d["result"])
            assert is_reduced_indefinite(r[0], r[1], D)
            assert class_key(r, D) == class_product(F, G, D)


def test_power_json_negative_exponent(capsys):
    # (2, 1, 3) has order 3 in Cl(−23) (h(−23) = 3, from memory)
    assert run_json(["power", "2,1,3", "-1"], capsys) == {"result": [2, -1, 3]}
    assert run_json(["power", "2,1,3", "3"], capsys) == {"result": [1, 1, 6]}
    assert run_json(["power", "2,1,3", "-3*10^40"], capsys) == {"result": [1, 1, 6]}
    # polynomial notation and a non-reduced input
    assert run_json(["power", "2x^2+5xy+6y^2", "2"], capsys) == {"result": [2, -1, 3]}


def test_power_json_against_brute_force(capsys):
    D = -4004
    B = BruteGroup(D)
    for F in brute_reduced_definite(D)[::8]:
        key = class_key(F, D)
        x = B.one
        for k in range(6):
            d = run_json(["power", ",".join(map(str, F)), str(k)], capsys)
            assert tuple(d["result"]) == x
            x = B.mul(x, key)
        n = B.order(key)
        d = run_json(["power", ",".join(map(str, F)), str(-1)], capsys)
        assert tuple(d["result"]) == class_key((F[0], -F[1], F[2]), D)
        assert run_json(["power", ",".join(map(str, F)), str(-n)], capsys)["result"] == list(B.one)


def test_compose_and_power_human(capsys):
    code, out, _ = run(["compose", "2,1,3", "2,1,3"], capsys)
    assert code == 0 and "(2, -1, 3)" in out
    code, out, _ = run(["power", "2,1,3", "-1"], capsys)
    assert code == 0 and "(2, -1, 3)" in out


# ---------------------------------------------------------------------------
# bad input


@pytest.mark.parametrize(
    "argv, needle",
    [
        (["group", "-5"], "-5"),
        (["group", "16"], "16"),
        (["group", "abc"], "abc"),
        (["group", "-23", "--limit", "-1"], "--limit"),
        (["group", "-23", "--method", "magic"], "magic"),
        (["compose", "2,1,3", "1,1,1"], "discriminant"),
        (["compose", "2,2,6", "2,2,6"], "primitive"),
        (["compose", "1,1,-3", "1,1,-3", "--method", "nucomp"], "definite"),
        (["compose", "-2,1,-3", "-2,1,-3"], "negative definite"),
        (["compose", "2,1"], "G"),
        (["power", "2,1,3", "x"], "x"),
        (["power", "2,1,3", "1.5"], "1.5"),
        (["power", "2,2,6", "3"], "primitive"),
        (["power", "nonsense", "3"], "nonsense"),
    ],
)
def test_bad_input_one_line_exit_2(argv, needle, capsys):
    code, out, err = run(argv, capsys)
    assert code == 2
    assert out == ""
    assert err.startswith("formkit: error: ") and err.count("\n") == 1
    assert needle in err
    assert "Traceback" not in err


def test_real_subprocess():
    # one real process: exit status 2, a single stderr line, nothing on stdout
    env = dict(os.environ)
    root = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
    env["PYTHONPATH"] = root + os.pathsep + env.get("PYTHONPATH", "")
    bad = subprocess.run(
        [sys.executable, "-m", "formkit", "group", "-5", "--json"],
        capture_output=True,
        text=True,
        env=env,
        timeout=120,
    )
    assert bad.returncode == 2 and bad.stdout == ""
    assert bad.stderr.startswith("formkit: error: ") and bad.stderr.count("\n") == 1
    assert "-5" in bad.stderr and "Traceback" not in bad.stderr


# ---------------------------------------------------------------------------
# D > 0 beyond enumeration, and class-number


def test_group_positive_bsgs_json(capsys):
    # C2 × C3336: formkit's enumeration of 10^10+1 (10 s) gives the same invariants
    d = run_json(["group", "10^10+1", "--method", "bsgs"], capsys)
    assert set(d) <= ISSUE_KEYS | REAL_KEYS | EXTRA_KEYS
    assert d["invariants"] == [2, 3336] and d["class_number"] == 6672
    assert d["method"] == "bsgs" and d["certified"] is False and d["assumption"] == "GRH"
    assert d["forms"] is None and d["fundamental_unit"] == [200000, 2]


def test_group_positive_huge_unit_not_written(capsys):
    code, out, err = run(["group", "10^12+29"], capsys)  # auto: above the enumeration limit
    assert code == 0 and err == ""
    assert "C2 × C2; narrow class number h+ = 4" in out  # h⁺ = 4 = number of genera, so C2 × C2 (Gauss)
    assert "not written out" in out and "conditional on GRH" in out


def test_class_number_json_and_text(capsys):
    d = run_json(["class-number", "10^12+1"], capsys)
    # 50280: formkit's enumeration of all reduced forms of 10^12+1 (3 minutes) agrees
    assert (d["class_number"], d["class_number_narrow"], d["fundamental_unit_norm"]) == (50280, 50280, -1)
    assert d["assumption"] == "GRH" and not d["certified"]
    assert abs(d["regulator"] - math.log(10**6 + math.sqrt(10**12 + 1))) < 1e-9  # unit 10^6 + √D
    code, out, _err = run(["class-number", "-23"], capsys)
    assert code == 0 and "positive definite forms): 3" in out and "unconditional" in out
    code, out, _err = run(["class-number", "316", "--method", "bsgs"], capsys)
    assert "narrow class number h+ (forms up to proper equivalence): 6" in out and "GRH" in out
    assert "class number h (ideal classes of the order): 3" in out


@pytest.mark.parametrize(
    "D, method", [("316", "enumeration"), ("316", "bsgs"), ("316", "infrastructure"), ("-23", "bsgs")]
)
def test_class_number_method_round_trips(D, method, capsys):
    # shared decision: the value given to --method is the method run and the one printed
    d = run_json(["class-number", D, "--method", method], capsys)
    assert d["method"] == method
    # h⁺(316) = 6, h(316) = 3, h(−23) = 3: brute force of the reduced forms (tests/_classgroup_reference.py)
    narrow = (
        len(set(indefinite_cycles(int(D)).values())) if int(D) > 0 else len(brute_reduced_definite(int(D)))
    )
    assert d["class_number_narrow"] == narrow
    code, out, _err = run(["class-number", D, "--method", method], capsys)
    assert code == 0 and f"method: {method}," in out


def test_class_number_auto_names_the_method_chosen(capsys):
    assert run_json(["class-number", "316"], capsys)["method"] == "enumeration"
    assert run_json(["class-number", "10^12+1"], capsys)["method"] == "infrastructure"


@pytest.mark.parametrize(
    "argv, needle",
    [
        (["class-number", "-23", "--method", "infrastructure"], "needs D > 0, not D = -23"),
        (["class-number", "17^2"], "289"),
        (["class-number", "-5"], "-5"),
        (["class-number", "x1"], "x1"),
        (["class-number", "13", "--method", "magic"], "magic"),
    ],
)
def test_class_number_bad_input(argv, needle, capsys):
    code, out, err = run(argv, capsys)
    assert code == 2 and out == ""
    assert err.startswith("formkit: error: ") and err.count("\n") == 1 and needle in err


def test_class_number_interval(capsys):
    # h(−10^9−7) = 26629 by enumeration (unconditional) must lie in the GRH interval
    d = run_json(["class-number", "-10^9-7", "--interval"], capsys)
    iv = d["analytic_interval"]
    assert d["certified"] and iv["of"] == "h" and iv["assumption"] == "GRH"
    assert iv["lower"] <= d["class_number"] <= iv["upper"]
    # D > 0: the interval is for h·R (wide h)
    d = run_json(["class-number", "316", "--interval"], capsys)
    iv = d["analytic_interval"]
    assert iv["of"] == "h*R" and iv["lower"] <= d["class_number"] * d["regulator"] <= iv["upper"]


def test_group_json_holds_orders_and_discrete_logs(capsys):
    # issue 15: the JSON carries what the text table shows; checked against the group law
    # itself (brute force: x^order = 1 and the discrete log rebuilds the class)
    from formkit import class_group

    d = run_json(["group", "-4620"], capsys)
    G = class_group(-4620)
    assert d["structure"] == G.structure and len(d["classes"]) == d["class_number"] == G.order
    for c in d["classes"]:
        x = G(c["form"])
        assert (x ** c["order"]).is_identity and G.element(c["discrete_log"]) == x
    assert run_json(["group", "-3"], capsys)["structure"] == "C1"
    assert run_json(["group", "-3", "--method", "enumeration"], capsys)["method"] == "enumeration"


def test_group_subexponential_with_workers_and_a_store(tmp_path, capsys):
    # the relation store: a second run with the same file reads the relations back, and both
    # runs give the group of baby-step giant-step (an independent method)
    D = "-(10^10+3)"  # fundamental: 10^10 + 3 = 7·1428571429 ≡ 3 (mod 4), squarefree (sympy)
    store = tmp_path / "relations.db"
    first = main(
        ["group", D, "--method", "subexponential", "--workers", "2", "--db", str(store), "--json", "--quiet"]
    )
    one = json.loads(capsys.readouterr().out)
    second = main(["group", D, "--method", "subexponential", "--db", str(store), "--json", "--quiet"])
    two = json.loads(capsys.readouterr().out)
    main(["group", D, "--method", "bsgs", "--json", "--quiet"])
    reference = json.loads(capsys.readouterr().out)
    assert first == second == 0 and one["invariants"] == two["invariants"] == reference["invariants"]
    assert one["method"] == two["method"] == "subexponential"
    assert re.search(r"[1-9]\d* read back from the store", two["detail"])
    code = main(["group", "-23", "--workers", "2"])
    assert code == 2 and "--method subexponential" in capsys.readouterr().err
