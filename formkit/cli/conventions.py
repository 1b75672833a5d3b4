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
import sys
from collections.abc import Callable
from typing import Any

from ..errors import FormkitError

__all__ = ["CommandError", "emit"]


class CommandError(FormkitError):
    """Bad command-line input that the library itself does not see."""


class _Parser(argparse.ArgumentParser):
    """argparse with the house error format: one line, exit status 2."""

    def error(self, message: str) -> None:  # type: ignore[override]
        sys.stderr.write(f"formkit: error: {message}\n")
        raise SystemExit(2)


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
