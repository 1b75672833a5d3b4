"""Tests of ``formkit explain`` (reduce, compose, represent, group): formats, JSON,
output files, notations and bad input.  The mathematics is tested in
tests/test_worked_examples.py; here the command line is checked against the Python
functions it stands for."""

from __future__ import annotations

import json

import pytest

from formkit import explain_class_group, explain_composition, explain_reduction, explain_representation
from formkit.cli import main


def run(argv, capsys):
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def test_reduce_markdown_is_the_python_text(capsys):
    code, out, err = run(["explain", "reduce", "10,37,35"], capsys)
    assert code == 0 and err == ""
    assert out == explain_reduction((10, 37, 35))
    assert out.startswith("# Reduction of (10, 37, 35)")


def test_compose_tex_document_and_fragment(capsys):
    code, out, _ = run(["explain", "compose", "2,1,3", "3,-1,2", "--format", "tex"], capsys)
    assert code == 0 and out == explain_composition((2, 1, 3), (3, -1, 2), format="tex")
    assert out.startswith("\\documentclass") and "\\end{document}" in out
    code, frag, _ = run(["explain", "compose", "2,1,3", "3,-1,2", "--format", "tex", "--fragment"], capsys)
    assert code == 0 and "\\documentclass" not in frag and "\\begin{enumerate}" in frag


def test_represent_and_group(capsys):
    code, out, _ = run(["explain", "represent", "2x^2+xy+3y^2", "18"], capsys)
    assert code == 0 and out == explain_representation((2, 1, 3), 18)
    code, out, _ = run(["explain", "group", "-84"], capsys)
    assert code == 0 and out == explain_class_group(-84)
    code, out, _ = run(["explain", "group", "-84", "--limit", "2"], capsys)
    assert code == 0 and "further classes not listed" in out


def test_json_record(capsys):
    code, out, _ = run(["explain", "represent", "1,0,5", "21", "--json"], capsys)
    assert code == 0
    d = json.loads(out)
    assert set(d) == {"kind", "format", "text", "data"}
    assert d["kind"] == "represent" and d["format"] == "md"
    assert d["text"] == explain_representation((1, 0, 5), 21)
    # x² + 5y² = 21: (±1, ±2), (±4, ±1) — 8 solutions (brute force in test_worked_examples)
    assert d["data"]["count"] == 8
    code, out, _ = run(["explain", "group", "-84", "--json", "--format", "tex"], capsys)
    d = json.loads(out)
    assert d["format"] == "tex" and d["text"].startswith("\\documentclass")
    assert d["data"]["genus_count"] == 4


def test_output_file(tmp_path, capsys):
    target = tmp_path / "ex.tex"
    code, out, _ = run(["explain", "reduce", "x^2-13y^2", "--format", "tex", "-o", str(target)], capsys)
    assert code == 0 and "wrote reduce example" in out
    assert target.read_text() == explain_reduction((1, 0, -13), format="tex")


def test_negative_forms_and_notations(capsys):
    outs = []
    for text in ("-3,1,-2", "[-3,1,-2]", "(-3, 1, -2)", "-3x^2 + xy - 2y^2"):
        code, out, err = run(["explain", "reduce", text, "--json"], capsys)
        assert code == 0, err
        outs.append(json.loads(out)["data"])
    assert all(o == outs[0] for o in outs) and outs[0]["reduced"] == [-2, -1, -3]


@pytest.mark.parametrize(
    "argv,needle",
    [
        (["explain", "reduce", "1,2,1"], "square"),  # D = 0
        (["explain", "reduce", "x^3"], "x^3"),
        (["explain", "compose", "1,0,1", "1,1,1"], "discriminant"),
        (["explain", "represent", "1,0,1", "2.5"], "2.5"),
        (["explain", "represent", "1,0,1", "5", "--limit", "-1"], "--limit must be at least 0"),
        (["explain", "group", "-5"], "-5"),
        (["explain", "group", "-84", "--format", "pdf"], "pdf"),
        (["explain", "reduce", "1,0,1", "--fragment"], "--fragment"),
        (["explain"], "TOPIC"),
        (["explain", "frobnicate"], "frobnicate"),
    ],
)
def test_bad_input(argv, needle, capsys):
    code, out, err = run(argv, capsys)
    assert code == 2 and out == ""
    assert len(err.splitlines()) == 1 and err.startswith("formkit: error: ")
    assert needle in err


def test_unwritable_output(tmp_path, capsys):
    code, _, err = run(["explain", "reduce", "1,0,1", "-o", str(tmp_path / "no" / "such" / "dir.md")], capsys)
    assert code == 2 and err.startswith("formkit: error: cannot write")
