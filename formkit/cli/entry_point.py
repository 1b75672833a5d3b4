"""The ``formkit`` command line: a thin layer over the library (the entry point).

Every command has a ``--json`` form printing one JSON object; the same result is one
function call away in Python (each command's help names the function).  Commands live
in the modules of :mod:`formkit.cli`, one per topic; each defines
``register(subparsers, parent)`` where ``parent`` carries the shared options, and uses
the conventions of :mod:`formkit.cli.conventions`.

Exit status: 0 on success, 2 for bad input (one line ``formkit: error: …`` on stderr),
1 for an internal error (a short message; the traceback only with ``--debug``).
"""

from __future__ import annotations

import argparse
import re
import sys
from collections.abc import Sequence

from .._version import __version__
from ..core.budget import BUDGET_SYNTAX, set_budget
from ..core.progress import set_progress
from ..errors import FormkitError
from .conventions import NUMBER_SYNTAX, _Parser, add_number_syntax_epilog

__all__ = ["main", "build_parser"]

_FORMLIKE_DASH = re.compile(r"-[\d\sxy(\[]")


def build_parser() -> argparse.ArgumentParser:
    """The full argument parser (all commands registered)."""
    parent = _Parser(add_help=False)
    parent.add_argument("--json", action="store_true", help="print one JSON object instead of text")
    parent.add_argument("--debug", action="store_true", help="show tracebacks of internal errors")
    parent.add_argument(
        "--quiet", action="store_true", help="no progress bars or phase lines on stderr (errors still shown)"
    )
    parent.add_argument(
        "--budget",
        metavar="LIMITS",
        default=None,
        help=BUDGET_SYNTAX + " (one budget for every command; see formkit.core.budget)",
    )
    parser = _Parser(
        prog="formkit",
        description=(
            "Binary quadratic forms ax^2+bxy+cy^2: reduction, equivalence, class groups, genera, "
            "representations and prime criteria. Forms are written a,b,c or [a,b,c] or as "
            "polynomials such as '3x^2 + 7xy - 5y^2'; negative numbers and forms may be given "
            "directly (formkit group -23). " + NUMBER_SYNTAX
        ),
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    # the version is defined once, in formkit/_version.py (pyproject reads it from there)
    parser.add_argument("--version", action="version", version=f"formkit {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    # the modules providing commands, in the order they appear in ``formkit --help``
    from . import analytic, explain, forms, graph, groups, ideals, primes, represent, table

    for module in (forms, groups, ideals, explain, primes, table, graph, represent, analytic):
        module.register(sub, parent)
    add_number_syntax_epilog(parser)
    return parser


def _protect_negative_arguments(argv: Sequence[str]) -> list[str]:
    # argparse takes "-x^2+5y^2" or "-1,0,5" for options; a leading space stops that
    # and the parsers here strip white space.
    out = []
    for tok in argv:
        if _FORMLIKE_DASH.match(tok) and not re.fullmatch(r"-\d+", tok):
            out.append(" " + tok)
        else:
            out.append(tok)
    return out


def main(argv: Sequence[str] | None = None) -> int:
    """Entry point of the ``formkit`` command; returns the exit status."""
    if hasattr(sys, "set_int_max_str_digits"):
        sys.set_int_max_str_digits(0)
    argv = list(sys.argv[1:] if argv is None else argv)
    debug = "--debug" in argv
    try:
        parser = build_parser()
        args = parser.parse_args(_protect_negative_arguments(argv))
        if not getattr(args, "command", None):
            sys.stderr.write("formkit: error: a command is required (formkit --help lists them)\n")
            return 2
        if getattr(args, "quiet", False):
            set_progress(False)
        if getattr(args, "budget", None) is not None:
            set_budget(args.budget)
        try:
            return int(args.handler(args) or 0)
        finally:
            set_progress(None)
            set_budget(None)
    except SystemExit as exc:  # argparse exits (help, errors)
        return int(exc.code) if isinstance(exc.code, int) else 2
    except FormkitError as exc:
        sys.stderr.write(f"formkit: error: {_one_line(exc)}\n")
        return 2
    except KeyboardInterrupt:
        sys.stderr.write("formkit: interrupted\n")
        return 130
    except BrokenPipeError:
        return 0
    except (MemoryError, OverflowError, RecursionError) as exc:
        # last resort: the methods price their work first (formkit.core.budget), so these
        # mean an estimate was too low; still a one-line refusal, never an internal error
        if debug:
            raise
        sys.stderr.write(f"formkit: error: {_resource_message(exc, argv)}\n")
        return 2
    except Exception as exc:  # internal error
        if debug:
            raise
        sys.stderr.write(
            f"formkit: internal error: {type(exc).__name__}: {_one_line(exc)} (run with --debug for details)\n"
        )
        return 1


def _resource_message(exc: BaseException, argv: Sequence[str]) -> str:
    shown = " ".join(argv)
    if len(shown) > 80:
        shown = shown[:77] + "..."
    if isinstance(exc, MemoryError):
        why = "ran out of memory"
    elif isinstance(exc, RecursionError):
        why = "nested too deeply"
    else:
        why = f"met a number too large for this method ({_one_line(exc)})"
    return (
        f"'formkit {shown}' {why}; the input is beyond what this command can do here "
        "(try --method bsgs or a smaller input, or a lower --budget to be refused earlier)"
    )


def _one_line(exc: BaseException) -> str:
    return " ".join(str(exc).split())
