"""Helpers shared by the CLI tests: run ``formkit.cli.main`` in-process and read its output."""

import json

from formkit.cli import main


def run(capsys, *argv):
    """Run ``formkit *argv``; return ``(exit status, stdout, stderr)``."""
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def run_json(capsys, *argv):
    """Run ``formkit *argv --json``; check success, a quiet stderr and one JSON line; parse it."""
    code, out, err = run(capsys, *argv, "--json")
    assert code == 0, err
    assert err == ""
    assert out.count("\n") == 1  # one JSON object on one line
    return json.loads(out)
