"""Conventions every ``formkit`` command keeps (issue 8, item 4), checked for every
command registered in :func:`formkit.cli.build_parser` — including those added later:

* ``--help`` works and shows an ``examples:`` section whose lines parse;
* ``--json`` and ``--debug`` exist, and the first example prints one JSON object;
* forms are accepted in every notation of the parser (``a,b,c``, ``[a,b,c]``,
  ``(a,b,c)``, polynomials), with the same result, and negative forms are not taken
  for options;
* bad input: exactly one stderr line ``formkit: error: …`` and exit status 2;
* an internal error: exit status 1, a short message and no traceback, unless
  ``--debug`` is given.
"""

from __future__ import annotations

import argparse
import json
import shlex

import pytest

import formkit.cli.entry_point as cli
from formkit.core.forms import Form

FORM_DESTS = {"form", "first", "second"}


def _subparsers(parser: argparse.ArgumentParser):
    for action in parser._actions:
        if isinstance(action, argparse._SubParsersAction):
            return action
    return None


def _walk(parser, prefix=()):
    """Every command path with its parser; ``leaf`` tells whether it runs a handler."""
    action = _subparsers(parser)
    if action is None:
        return
    for name, sp in action.choices.items():
        path = prefix + (name,)
        leaf = _subparsers(sp) is None
        yield path, sp, leaf
        if not leaf:
            yield from _walk(sp, path)


ALL = list(_walk(cli.build_parser()))
LEAVES = [(path, sp) for path, sp, leaf in ALL if leaf]
IDS = [" ".join(path) for path, _ in LEAVES]


def _examples(sp: argparse.ArgumentParser, path) -> list[list[str]]:
    """The example command lines of a parser's epilog, as argument lists (without 'formkit')."""
    out = []
    for ln in (sp.epilog or "").splitlines():
        ln = ln.strip()
        if ln.startswith("formkit "):
            argv = shlex.split(ln)[1:]
            if tuple(argv[: len(path)]) == path:
                out.append(argv)
    return out


def _positionals(sp):
    return [a for a in sp._actions if not a.option_strings and not isinstance(a, argparse._SubParsersAction)]


def _run(argv, capsys):
    code = cli.main(argv)
    out, err = capsys.readouterr()
    return code, out, err


# ---------------------------------------------------------------------------


@pytest.mark.parametrize("path,sp,leaf", ALL, ids=[" ".join(p) for p, _, _ in ALL])
def test_help_has_examples(path, sp, leaf, capsys):
    code, out, err = _run([*path, "--help"], capsys)
    assert code == 0 and err == ""
    assert "examples:" in out, f"'formkit {' '.join(path)} --help' has no examples section (epilog)"
    if leaf:
        assert _examples(sp, path), f"no example line 'formkit {' '.join(path)} …' in the epilog"


def test_top_level_help(capsys):
    code, out, _ = _run(["--help"], capsys)
    assert code == 0
    for path, _sp, _leaf in ALL:
        if len(path) == 1:
            assert path[0] in out


@pytest.mark.parametrize("path,sp", LEAVES, ids=IDS)
def test_json_and_debug_options(path, sp):
    assert "--json" in sp._option_string_actions, f"formkit {' '.join(path)} has no --json"
    assert "--debug" in sp._option_string_actions, f"formkit {' '.join(path)} has no --debug"


@pytest.mark.parametrize("path,sp", LEAVES, ids=IDS)
def test_examples_parse(path, sp):
    parser = cli.build_parser()
    for argv in _examples(sp, path):
        ns = parser.parse_args(cli._protect_negative_arguments(argv))
        assert callable(getattr(ns, "handler", None)), argv


@pytest.mark.parametrize("path,sp", LEAVES, ids=IDS)
def test_first_example_runs_with_json(path, sp, capsys):
    argv = _examples(sp, path)[0]
    if "--json" not in argv:
        argv = argv + ["--json"]
    code, out, err = _run(argv, capsys)
    assert code == 0, err
    payload = json.loads(out)
    assert isinstance(payload, dict)
    assert out.count("\n") == 1  # one object on one line


@pytest.mark.parametrize("path,sp", LEAVES, ids=IDS)
def test_bad_input_is_one_line_exit_2(path, sp, capsys):
    pos = [a for a in _positionals(sp) if a.nargs not in ("?", "*")]
    if pos:
        argv = [*path, *(["@@"] * len(pos))]
    else:  # options only: an unknown option is bad input too
        argv = [*path, "--no-such-option"]
    code, out, err = _run(argv, capsys)
    assert code == 2
    lines = err.splitlines()
    assert len(lines) == 1 and lines[0].startswith("formkit: error: "), err
    assert "Traceback" not in err and out == ""


@pytest.mark.parametrize("path,sp", LEAVES, ids=IDS)
def test_internal_error_exit_1_without_traceback(path, sp, capsys, monkeypatch):
    argv = _examples(sp, path)[0]
    real = cli.build_parser

    def boom(args):
        raise RuntimeError("simulated failure")

    def patched():
        parser = real()
        node = parser
        for name in path:
            node = _subparsers(node).choices[name]
        node.set_defaults(handler=boom)
        return parser

    monkeypatch.setattr(cli, "build_parser", patched)
    code, _out, err = _run(argv, capsys)
    assert code == 1
    assert "Traceback" not in err and len(err.splitlines()) == 1
    assert "internal error" in err and "simulated failure" in err and "--debug" in err
    with pytest.raises(RuntimeError):
        cli.main(argv + ["--debug"])


def _form_slots(sp, argv, path):
    """Indices in argv of the form arguments (by parsing the example)."""
    ns = cli.build_parser().parse_args(cli._protect_negative_arguments(argv))
    slots = []
    for a in _positionals(sp):
        if a.dest in FORM_DESTS:
            value = getattr(ns, a.dest)
            used = {i for i, _ in slots}
            idx = [
                i
                for i, t in enumerate(argv)
                if t.strip() == str(value).strip() and i >= len(path) and i not in used
            ]
            if idx:
                slots.append((idx[0], Form.parse(str(value))))
    return slots


FORM_LEAVES = [(p, sp) for p, sp in LEAVES if any(a.dest in FORM_DESTS for a in _positionals(sp))]


@pytest.mark.parametrize("path,sp", FORM_LEAVES, ids=[" ".join(p) for p, _ in FORM_LEAVES])
def test_every_form_notation_gives_the_same_result(path, sp, capsys):
    argv = _examples(sp, path)[0]
    argv = [t for t in argv if t != "--json"]
    slots = _form_slots(sp, argv, path)
    assert slots, f"could not find the form argument in {argv}"
    outputs = []
    for style in range(4):
        trial = list(argv)
        for i, f in slots:
            a, b, c = f.coefficients
            trial[i] = [f"{a},{b},{c}", f"[{a},{b},{c}]", f"({a}, {b}, {c})", str(f)][style]
        code, out, err = _run(trial + ["--json"], capsys)
        assert code == 0, (trial, err)
        outputs.append(json.loads(out))
    assert all(o == outputs[0] for o in outputs)


@pytest.mark.parametrize("path,sp", FORM_LEAVES, ids=[" ".join(p) for p, _ in FORM_LEAVES])
def test_negative_forms_are_not_options(path, sp):
    argv = _examples(sp, path)[0]
    slots = _form_slots(sp, argv, path)
    parser = cli.build_parser()
    for text in ("-1,0,13", "-x^2 + 13y^2", "-3x^2+xy-2y^2", "-2,1,-3"):
        trial = list(argv)
        for i, _f in slots:
            trial[i] = text
        ns = parser.parse_args(cli._protect_negative_arguments(trial))
        for a in _positionals(sp):
            if a.dest in FORM_DESTS:
                assert Form.parse(getattr(ns, a.dest)) == Form.parse(text)


@pytest.mark.slow
@pytest.mark.parametrize("path,sp", LEAVES, ids=IDS)
def test_every_help_example_runs(path, sp, capsys, monkeypatch, tmp_path):
    """Every example printed by --help runs and exits 0, in order in one directory
    (later examples may query a file an earlier one wrote).  Slow: some build large
    tables.  Examples needing a cluster address are left out (no network here), and so
    are the queries of the stores they would have built."""
    monkeypatch.chdir(tmp_path)  # examples may write files (-o, --db, --output)
    unbuilt = set()  # stores an example would have built on a cluster
    for argv in _examples(sp, path):
        db = argv[argv.index("--db") + 1] if "--db" in argv[:-1] else None
        if "--cluster" in argv:
            unbuilt.add(db)
            continue
        if db is not None and db in unbuilt:
            continue  # queries the store of a skipped cluster example
        code, _out, err = _run(argv, capsys)
        assert code == 0, (argv, err)


def test_a_stray_argument_with_line_breaks_is_reported_on_one_line(capsys):
    # found by the fuzz run: argparse echoed the junk argument, line break and all
    from formkit.cli import main

    code = main(["group", "-23", "junk\nmore\r\njunk"])
    err = capsys.readouterr().err
    assert code == 2 and err.count("\n") == 1 and err.startswith("formkit: error: unrecognized arguments")
