"""Progress bars on long jobs and a clean stop on Ctrl-C (issue 15, "signs of life").

Progress is forced on with ``set_progress(True, delay=0)`` (in a terminal it is on by
itself after two seconds): then the bars of baby-step giant-step, the infrastructure, the
class polynomials and long representation lists appear on stderr, stdout stays one JSON
object, and ``--quiet`` silences them.  Common practice, no source: the values printed are
checked elsewhere; here only where the text goes.
"""

from __future__ import annotations

import json
import re

import pytest

import formkit.cli.entry_point as entry
from formkit.cli import main
from formkit.core.progress import set_progress

#: (argv, a phrase of the bar or phase line the job shows)
JOBS = [
    (["group", "-10^12-3", "--method", "bsgs"], "baby-step giant-step (order of a class)"),
    (["class-number", "10^12+1"], "regulator: baby steps"),
    (["hilbert", "-23*97"], "j-values (D = -2231)"),
    # 5·13·17·29·37·41·53·61: 2^8 roots b of b² ≡ −4 (mod 4n), one bar step each
    (["represent", "1,0,1", str(5 * 13 * 17 * 29 * 37 * 41 * 53 * 61)], "solutions of Q(x, y) ="),
]


def _run(argv, capsys, forced):
    set_progress(forced, delay=0.0)
    try:
        code = main(argv)
    finally:
        set_progress(None)
    out, err = capsys.readouterr()
    assert code == 0, err
    return out, err


@pytest.mark.parametrize("argv, phrase", JOBS, ids=[a[0] for a, _ in JOBS])
def test_progress_goes_to_stderr_never_stdout(argv, phrase, capsys):
    out, err = _run([*argv, "--json"], capsys, True)
    assert phrase in err
    assert out.count("\n") == 1 and phrase not in out
    json.loads(out)  # stdout is exactly one JSON object


@pytest.mark.parametrize("argv, phrase", JOBS, ids=[a[0] for a, _ in JOBS])
def test_quiet_silences_progress(argv, phrase, capsys):
    out, err = _run([*argv, "--quiet"], capsys, None)
    assert err == "" and phrase not in out


def test_no_progress_when_not_forced_and_not_a_terminal(capsys):
    _out, err = _run(["group", "-10^12-3", "--method", "bsgs"], capsys, None)  # capsys: not a TTY
    assert err == ""


def test_ctrl_c_ends_with_one_line_and_status_130(monkeypatch, capsys):
    from formkit.classgroups import baby_step_giant_step as bsgs

    def interrupted(*a, **k):
        raise KeyboardInterrupt

    monkeypatch.setattr(bsgs, "_order_search", interrupted)
    set_progress(True, delay=0.0)
    try:
        code = main(["group", "-10^12-3", "--method", "bsgs"])
    finally:
        set_progress(None)
    out, err = capsys.readouterr()
    assert code == 130 and out == ""
    # the bar erases itself (carriage return, blanks, carriage return), then the one line
    assert re.split(r"[\r\n]", err.rstrip("\n"))[-1] == "formkit: interrupted"
    assert err.count("interrupted") == 1 and "error" not in err
    assert "Traceback" not in err
    assert entry.main is main
