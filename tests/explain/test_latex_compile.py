"""Every ``explain`` output and the handout compile with pdflatex: no error, no undefined
reference, no overfull box wider than 1 pt.

Needs ``pdflatex`` (texlive-latex-base + texlive-latex-recommended).  ``.ci/run`` installs
them when missing and sets ``FORMKIT_REQUIRE_LATEX=1``, so there a missing pdflatex is a
failure, not a skip; elsewhere the test is skipped without pdflatex.
"""

import os
import re
import shutil
import subprocess

import pytest

from formkit.explain.class_group import worked_class_group
from formkit.explain.composition import worked_composition
from formkit.explain.reduction import worked_reduction
from formkit.explain.representation import worked_representation

PDFLATEX = shutil.which("pdflatex")
if PDFLATEX is None:
    if os.environ.get("FORMKIT_REQUIRE_LATEX") == "1":
        raise RuntimeError("FORMKIT_REQUIRE_LATEX=1 but pdflatex is not installed")
    pytestmark = pytest.mark.skip(reason="pdflatex not installed")

# both signs, orders with f > 1 (-108: f = 3; -16428: f = 74; -4000: f = 10; -14700: f = 70;
# 180: f = 6; 4036: f = 2), class numbers up to 76 (-20004) and 199 (-19991, class table only)
GROUP_DISCRIMINANTS = [
    -3,
    -4,
    -23,
    -56,
    -108,
    -4004,
    -16428,
    -4000,
    -14700,
    -20004,
    5,
    12,
    136,
    180,
    316,
    4036,
]


def _compile(tmp_path, name: str, tex: str) -> str:
    src = tmp_path / f"{name}.tex"
    src.write_text(tex, encoding="ascii")  # the writer promises pure ASCII
    for _ in range(2):  # twice, so that references would resolve
        proc = subprocess.run(
            [PDFLATEX, "-interaction=nonstopmode", "-halt-on-error", src.name],
            cwd=tmp_path,
            capture_output=True,
            text=True,
            timeout=120,
        )
    log = (tmp_path / f"{name}.log").read_text(encoding="latin-1")
    assert proc.returncode == 0, log[-3000:]
    return log


def _check_log(log: str) -> None:
    errors = [ln for ln in log.splitlines() if ln.startswith("!")]
    assert not errors, errors
    assert "undefined" not in log.lower() or not re.search(r"(Reference|Citation) .* undefined", log), log
    wide = [float(w) for w in re.findall(r"Overfull \\[hv]box \(([0-9.]+)pt too", log)]
    assert all(w <= 1.0 for w in wide), [ln for ln in log.splitlines() if "Overfull" in ln]


@pytest.mark.parametrize("D", GROUP_DISCRIMINANTS)
def test_group_example_compiles(tmp_path, D):
    _check_log(_compile(tmp_path, "group", worked_class_group(D).render("tex")))


@pytest.mark.parametrize(
    "example",
    [
        lambda: worked_reduction((10, 37, 35)),
        lambda: worked_reduction((3, 7, -5)),
        lambda: worked_composition((2, 1, 3), (3, -1, 2)),
        lambda: worked_composition((3, 4, -5), (-5, 4, 3)),
        lambda: worked_representation((2, 1, 3), 18),
        lambda: worked_representation((1, 0, -79), 45),
    ],
)
def test_other_examples_compile(tmp_path, example):
    _check_log(_compile(tmp_path, "example", example().render("tex")))


def test_fragment_in_a_report(tmp_path):
    # a fragment set at chapter level inside a document of the user's
    body = worked_class_group(-56).render("tex", fragment=True, sectioning="chapter", numbered=True)
    assert r"\chapter{" in body and r"\section*" not in body
    doc = (
        "\\documentclass{report}\n\\usepackage{amsmath}\n\\usepackage{array}\n\\usepackage{longtable}\n"
        "\\begin{document}\n" + body + "\\end{document}\n"
    )
    _check_log(_compile(tmp_path, "report", doc))


@pytest.mark.parametrize(
    "D,form",
    [(-56, (3, 2, 5)), (-4, None), (-108, None), (-16428, None), (5, None), (180, None), (316, None)],
)
def test_handout_compiles(tmp_path, D, form):
    from formkit.explain.handout import worked_handout

    _check_log(_compile(tmp_path, "handout", worked_handout(D, form, bound=1000).render("tex")))
