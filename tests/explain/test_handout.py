"""The handout: one document on a discriminant, its claims taken from checked results."""

import json
import re
import subprocess
import sys

import pytest

from formkit import errors
from formkit.explain.handout import worked_handout


def test_handout_issue_form():
    # the issue's example: genus {(3,2,5), (3,-2,5)}; residues 3, 5, 13, 19, 27, 45 mod 56 (the issue's list)
    h = worked_handout(-56, (3, 2, 5), bound=200)
    md = h.render("md")
    assert "so a congruence criterion exists" in md and "no congruence criterion" not in md
    assert "3, 5, 13, 19, 27, 45" in md
    assert h.data["primes"][:4] == [3, 5, 13, 19]  # 3 = Q(1, 0), 5 = Q(0, 1), 13 = Q(-1, 2)... checked below
    assert all(
        any(3 * x * x + 2 * x * y + 5 * y * y == p for x in range(-9, 10) for y in range(-9, 10))
        for p in h.data["primes"]
    )  # brute force


def test_handout_no_criterion_and_order():
    h = worked_handout(
        -16428, bound=500
    )  # f = 74 in Q(sqrt(-3)): h(O) = 1*74/3*(3/2)(36/37) = 36 (Cox Thm 7.24)
    md = h.render("md")
    assert h.data["group"]["order"]["class_number"] == 36 and h.data["group"]["order"]["unit_index"] == 3
    assert "no congruence criterion exists" in md
    assert "as recalled" not in md


def test_handout_tex_is_ascii_and_math():
    tex = worked_handout(-4004, bound=100).render("tex")
    assert tex.isascii()
    body = "\n".join(ln for ln in tex.splitlines() if not ln.startswith("%"))
    outside = re.sub(r"\$[^$]*\$", "", re.sub(r"\\\[.*?\\\]", "", body, flags=re.S))
    assert not re.search(r"(?<![\w\\])-\d", outside)  # every minus sign of a number is in math mode
    assert "[[" not in tex
    # Greek letters are typeset, never spelled out in the text or in math mode (common practice)
    for handout in (tex, worked_handout(-16428, (13, 2, 316), 13, bound=100).render("tex")):
        words = re.sub(r"\\[A-Za-z]+", "", handout)  # drop the TeX commands (\beta, \alpha, ...)
        found = re.findall(r"\b(alpha|beta|gamma|delta|epsilon|rho|tau|omega|chi|mu)\b", words)
        assert not found, found


def test_handout_errors():
    with pytest.raises(errors.FormkitError, match="discriminant -3, not -56"):
        worked_handout(-56, (1, 1, 1))


def test_handout_cli_json():
    out = subprocess.run(
        [sys.executable, "-m", "formkit", "handout", "-56", "--form", "3,2,5", "--bound", "100", "--json"],
        capture_output=True,
        text=True,
        check=True,
    ).stdout
    d = json.loads(out)
    assert d["kind"] == "handout" and d["data"]["criterion"]["kind"] == "congruence"
    err = subprocess.run(
        [sys.executable, "-m", "formkit", "handout", "-56", "--form", "1,1,1"], capture_output=True, text=True
    )
    assert err.returncode == 2 and err.stderr.count("\n") == 1 and err.stderr.startswith("formkit: error:")
