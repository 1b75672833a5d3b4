"""The conventions every ``formkit`` command keeps, shared by the command modules.

* bad command-line input raises :class:`CommandError` (a :class:`~formkit.FormkitError`),
  and argparse errors go through :class:`_Parser`: one line ``formkit: error: …`` on
  stderr, exit status 2;
* :func:`emit` prints one JSON object with ``--json`` (integers, forms and result types
  made JSON-ready), the human text otherwise.
"""

from __future__ import annotations

import argparse
import json
import re
import sys
from collections.abc import Callable
from typing import Any

from ..core.parse import MAX_INTEGER_BITS
from ..errors import FormkitError

__all__ = [
    "CommandError",
    "emit",
    "integer_type",
    "add_discriminant_argument",
    "discriminant_of",
    "add_limit_options",
    "limit_of",
    "plural",
    "form_text",
    "NUMBER_SYNTAX",
    "NUMBER_SYNTAX_SHORT",
    "add_number_syntax_epilog",
]

#: One paragraph on how numbers and discriminants are written, shown by ``formkit --help``.
NUMBER_SYNTAX = (
    "Numbers: every integer argument is an expression of decimal integers with + - * ^ and "
    "parentheses (** is the same as ^; ^ binds tightest and to the right, so -3^2 = -9 and "
    "2^3^2 = 2^9; no decimal points, no e-notation), such as -4*3*10^2, 10^12+1 or -(10^40+27); "
    f"results over {MAX_INTEGER_BITS} bits (about {MAX_INTEGER_BITS * 3 // 10} digits) are refused "
    "before they are computed. Discriminants may also be "
    "written as a field, Q(sqrt(m)) or Q(√m) with m square-free (its maximal order), and "
    "'Q(sqrt(m)), f=F' or the option --conductor F gives the order of conductor F in that field "
    "(beside a fundamental discriminant too: -3 --conductor 6 is D = -108)."
)


#: The line that ends every command's ``--help``: where the number syntax applies and its bound.
NUMBER_SYNTAX_SHORT = (
    "numbers: every integer argument (D, N, the a,b,c of a form, --bound, --digits, ...) is "
    "written with + - * ^ (or **) and parentheses, e.g. -4*3*10^2, 2^64+1, -(10^40+27); "
    f"at most {MAX_INTEGER_BITS} bits, checked before anything is computed (formkit --help "
    "gives the rules)"
)


def add_number_syntax_epilog(parser: argparse.ArgumentParser) -> None:
    """Append :data:`NUMBER_SYNTAX_SHORT` to the epilog of ``parser`` and of its sub-commands."""
    import textwrap

    line = textwrap.fill(NUMBER_SYNTAX_SHORT, width=78)
    for action in parser._actions:
        if isinstance(action, argparse._SubParsersAction):
            for child in action.choices.values():
                add_number_syntax_epilog(child)
    if parser.prog.split()[-1] != "formkit":
        parser.epilog = f"{parser.epilog}\n\n{line}" if parser.epilog else line


class CommandError(FormkitError):
    """Bad command-line input that the library itself does not see."""


class _Parser(argparse.ArgumentParser):
    """argparse with the house error format: one line, exit status 2."""

    def error(self, message: str) -> None:  # type: ignore[override]
        # "argument --bound: --bound must be …": the option is named once
        m = re.match(r"argument (\S+): (\1\b.*)", message, re.S)
        if m:
            message = m.group(2)
        message = " ".join(message.split())  # one line, even when the text given holds line breaks
        sys.stderr.write(f"formkit: error: {message}\n")
        raise SystemExit(2)


def integer_type(name: str, minimum: int | None = None) -> Callable[[str], int]:
    """An argparse ``type=`` reading the number syntax of :func:`formkit.core.parse.parse_integer`."""

    def convert(text: str) -> int:
        from ..core.parse import parse_integer

        try:
            value = parse_integer(text, name)
        except FormkitError as exc:  # reported by argparse as one line, exit 2
            raise argparse.ArgumentTypeError(str(exc)) from None
        if minimum is not None and value < minimum:
            raise argparse.ArgumentTypeError(f"{name} must be at least {minimum}, not {value}")
        return value

    convert.__name__ = name
    return convert


def form_text(form: Any) -> str:
    """A form in the text notation shared by every command: ``(a, b, c)`` (JSON uses ``[a, b, c]``).

    >>> form_text([1, 16, -15])
    '(1, 16, -15)'
    """
    a, b, c = (form.a, form.b, form.c) if hasattr(form, "a") else form
    return f"({a}, {b}, {c})"


def plural(n: int, word: str, plural_form: str | None = None) -> str:
    """``"1 row"``, ``"2 rows"``, ``"0 classes"``: the count with the word in the right number.

    >>> plural(1, "row"), plural(3, "row"), plural(0, "class", "classes")
    ('1 row', '3 rows', '0 classes')
    """
    return f"{n} {word if n == 1 else (plural_form or word + 's')}"


def add_limit_options(
    parser: argparse.ArgumentParser, what: str, default: int | None, *, zero_means_all: bool = False
) -> None:
    """The limit family shared by every command: ``--limit N`` (the most items printed) and
    ``--all`` (print every item).  Numeric upper bounds of a search are ``--bound X``."""
    shown = "all" if default is None else str(default)
    parser.add_argument(
        "--limit",
        type=integer_type("--limit", 0),
        default=default,
        metavar="N",
        help=f"list at most N {what} (default {shown}" + ("; 0 = all" if zero_means_all else "") + ")",
    )
    parser.add_argument(
        "--all", action="store_true", help=f"list every one of the {what} (overrides --limit)"
    )


def limit_of(args: argparse.Namespace, *, zero_means_all: bool = False) -> int | None:
    """The ``--limit``/``--all`` pair as one number, ``None`` meaning no limit."""
    if getattr(args, "all", False):
        return None
    limit = getattr(args, "limit", None)
    if zero_means_all and limit == 0:
        return None
    return limit


def add_discriminant_argument(
    parser: argparse.ArgumentParser, help: str, *, metavar: str | None = "D"
) -> None:
    """The positional ``discriminant`` (numbers, fields ``Q(sqrt(m))``, ``, f=F``) and ``--conductor F``."""
    parser.add_argument(
        "discriminant",
        metavar=metavar,
        help=help + "; or a field Q(sqrt(m)) / Q(√m), optionally with ', f=F' (see formkit --help)",
    )
    parser.add_argument(
        "--conductor",
        metavar="F",
        default=None,
        help="the order of conductor F in the field (or beside the fundamental discriminant) given",
    )


def discriminant_of(args: argparse.Namespace, name: str = "discriminant") -> int:
    """The discriminant of ``args.discriminant`` and ``args.conductor`` (one parser for every command)."""
    from ..core.quadratic_orders import parse_discriminant

    return parse_discriminant(args.discriminant, name, conductor=getattr(args, "conductor", None))


def emit(args: argparse.Namespace, payload: dict, human: Callable[[], str] | str) -> None:
    """Print ``payload`` as one JSON object when ``--json`` was given, else ``human``."""
    if getattr(args, "json", False):
        sys.stdout.write(json.dumps(payload, default=_json_default) + "\n")
    else:
        text = human() if callable(human) else human
        sys.stdout.write(text.rstrip("\n") + "\n")


def _json_default(obj: Any) -> Any:
    try:
        import operator

        return operator.index(obj)
    except TypeError:
        pass
    if hasattr(obj, "to_list"):
        return obj.to_list()
    if hasattr(obj, "to_dict"):
        return obj.to_dict()
    return str(obj)
