"""Fuzzing every command in-process: each input ends in exit 0 or one line ``formkit: error: …``.

Hypothesis builds command lines from the parser itself (every command, its positional
arguments and options), with forms, numbers in the documented syntax (small, huge,
nested powers), fields and junk text, under a tight ``--budget`` so that large inputs
are refused by the cost estimates.  A time guard (an interval timer on CPU time) and a memory
guard (``RLIMIT_AS`` raised by 2 GB over the current size) make a runaway a test failure
instead of a stuck machine.  A sample runs by default; ten thousand inputs under the
``slow`` marker.  The acceptance rule is the house rule for bad input (no test source
beyond it: common practice for fuzzing).
"""

from __future__ import annotations

import argparse
import contextlib
import resource
import signal

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from formkit.cli.entry_point import build_parser, main

#: Options that start processes, write files or reach the network: not fuzzed.
_SKIP = {
    "-o",
    "--output",
    "--db",
    "--cluster",
    "--workers",
    "--help",
    "--json",
    "--debug",
    "--quiet",
    "--budget",
}
_GUARD_SECONDS = 60
_MEMORY_MARGIN = 2 * 2**30


def _commands() -> dict[str, argparse.ArgumentParser]:
    parser = build_parser()
    sub = next(a for a in parser._actions if isinstance(a, argparse._SubParsersAction))
    return dict(sub.choices)


COMMANDS = _commands()

small = st.integers(-(10**4), 10**4).map(str)
power = st.builds(
    lambda s, b, e, c: f"{s}{b}^{e}{c:+d}",
    st.sampled_from(["", "-"]),
    st.sampled_from([2, 3, 10]),
    st.integers(0, 400),
    st.integers(-50, 50),
)
nested = st.sampled_from(
    ["10^10^10", "2^(3^40)", "((((1))))", "-(10^40+27)", "2**10", "10^100000", "-4*10^35-7"]
)
form = st.builds(lambda a, b, c: f"{a},{b},{c}", small, small, small)
big_form = st.builds(lambda a, b, c: f"{a},{b},{c}", power, power, power)
poly = st.sampled_from(["x^2+y^2", "3x^2 + 7xy - 5y^2", "-x^2+xy+y^2", "x^2", "2xy"])
field = st.sampled_from(["Q(sqrt(-5))", "Q(√13)", "Q(sqrt(-3)), f=6", "Q(sqrt(4))"])
junk = st.text(max_size=25)
VALUE = st.one_of(small, small, form, power, nested, big_form, poly, field, junk)


@st.composite
def command_lines(draw) -> list[str]:
    name = draw(st.sampled_from(sorted(COMMANDS)))
    sp = COMMANDS[name]
    argv = [name]
    for action in sp._actions:
        if action.option_strings:
            continue
        if action.choices:
            argv.append(draw(st.sampled_from(sorted(action.choices))))
        else:
            argv.append(draw(VALUE))
    options = [a for a in sp._actions if a.option_strings and not set(a.option_strings) & _SKIP]
    for action in draw(st.lists(st.sampled_from(options), max_size=3, unique_by=id)) if options else []:
        argv.append(action.option_strings[-1])
        if action.nargs == 0:
            continue
        if action.choices:
            argv.append(draw(st.sampled_from(sorted(action.choices))))
        else:
            argv.append(draw(VALUE))
    if draw(st.booleans()):
        argv.append("--json")
    if draw(st.integers(0, 20)) == 0:
        argv.append(draw(junk))  # a stray argument
    return argv


class _Runaway(BaseException):
    """Raised by the time guard (a BaseException, so formkit's handlers do not catch it)."""


@contextlib.contextmanager
def _guards():
    def alarm(signum, frame):
        raise _Runaway(f"still running after {_GUARD_SECONDS} CPU seconds")

    # CPU time (ITIMER_PROF), not wall time: the budget prices CPU work, and a loaded shared
    # machine must not turn a priced run into a failure
    old_handler = signal.signal(signal.SIGPROF, alarm)
    soft, hard = resource.getrlimit(resource.RLIMIT_AS)
    with open("/proc/self/statm") as fh:
        size = int(fh.read().split()[0]) * resource.getpagesize()
    limit = size + _MEMORY_MARGIN
    if hard != resource.RLIM_INFINITY:
        limit = min(limit, hard)
    resource.setrlimit(resource.RLIMIT_AS, (limit, hard))
    signal.setitimer(signal.ITIMER_PROF, _GUARD_SECONDS)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_PROF, 0)
        resource.setrlimit(resource.RLIMIT_AS, (soft, hard))
        signal.signal(signal.SIGPROF, old_handler)


def _check(argv: list[str], capsys, tmp_path, monkeypatch) -> None:
    monkeypatch.chdir(tmp_path)
    full = [*argv, "--quiet", "--budget", "20s,1G"]
    try:
        with _guards():
            code = main(full)
    except _Runaway as exc:  # name the command line (hypothesis does not report BaseExceptions)
        raise _Runaway(f"{exc}: formkit {' '.join(full)}") from None
    _out, err = capsys.readouterr()
    assert "Traceback" not in err and "internal error" not in err, (full, err)
    if code == 0:
        return
    assert code == 2, (full, code, err)
    lines = err.strip("\n").split("\n")
    assert len(lines) == 1 and lines[0].startswith("formkit: error: "), (full, err)


_COMMON = {"deadline": None, "suppress_health_check": list(HealthCheck), "derandomize": True}


@settings(max_examples=150, **_COMMON)
@given(argv=command_lines())
def test_fuzz_sample(argv, capsys, tmp_path_factory, monkeypatch):
    _check(argv, capsys, tmp_path_factory.mktemp("fuzz"), monkeypatch)


@pytest.mark.slow
@settings(max_examples=10_000, **{**_COMMON, "derandomize": False})
@given(argv=command_lines())
def test_fuzz_ten_thousand(argv, capsys, tmp_path_factory, monkeypatch):
    _check(argv, capsys, tmp_path_factory.mktemp("fuzz"), monkeypatch)
