"""Shared by the schema test and the script that drafts the schema files.

Every command path (``group``, ``ideal split``, ``explain represent``, …) has one JSON
Schema file ``formkit/cli/schemas/<path joined by '.'>.json`` describing its ``--json``
output.  :func:`examples` lists the help examples of every command (the lines of the
``examples:`` section of its ``--help``), run from a scratch directory so that ``-o FILE``
examples write there.
"""

from __future__ import annotations

import argparse
import shlex
from pathlib import Path

import formkit.cli.entry_point as cli

SCHEMA_DIR = Path(cli.__file__).parent / "schemas"


def _subparsers(parser: argparse.ArgumentParser):
    for action in parser._actions:
        if isinstance(action, argparse._SubParsersAction):
            return action
    return None


def leaves(parser=None, prefix=()):
    """(path, parser) of every command that runs a handler."""
    parser = parser or cli.build_parser()
    action = _subparsers(parser)
    for name, sp in action.choices.items():
        path = prefix + (name,)
        if _subparsers(sp) is None:
            yield path, sp
        else:
            yield from leaves(sp, path)


def schema_path(path) -> Path:
    return SCHEMA_DIR / (".".join(path) + ".json")


def examples():
    """(path, argv) for every help example, with --json added."""
    out = []
    for path, sp in leaves():
        for ln in (sp.epilog or "").splitlines():
            ln = ln.strip()
            if ln.startswith("formkit "):
                argv = shlex.split(ln)[1:]
                if tuple(argv[: len(path)]) == path:
                    out.append((path, [*argv, "--json"] if "--json" not in argv else argv))
    return out


#: Help examples too slow (or needing a cluster) for the default test run; checked with -m slow.
SLOW_EXAMPLES = {
    "table --from -1000000 --to -3 --no-invariants --db neg.db",
    "table --from -20000 --to -3 --db groups.db --workers 8",
    "table --from -10000000 --to -3 --no-invariants --db big.db --cluster tcp://host:8786",
    "table --db big.db --info",
    "table --db neg.db --class-number 7 --fundamental",
    "table --db groups.db --invariants 2,2,4 --format tex",
}


def is_slow(argv) -> bool:
    return " ".join(a for a in argv if a != "--json") in SLOW_EXAMPLES


def random_argvs(seed: int = 15, n: int = 6):
    """Random inputs for the commands whose output shape depends on the input (signs of D,
    definite or indefinite forms, solvable or not): a fixed seed, so failures reproduce."""
    import random

    from formkit.core.enumeration import class_representatives

    rng = random.Random(seed)
    out = []
    for _ in range(n):
        D = rng.choice([-1, 1]) * rng.randrange(3, 3000)
        while D % 4 not in (0, 1) or (D > 0 and int(D**0.5) ** 2 == D):
            D += 1
        reps = class_representatives(D)
        F, G = rng.choice(reps), rng.choice(reps)
        fs = ",".join(map(str, F))
        gs = ",".join(map(str, G))
        N = str(rng.randrange(1, 400))
        out += [
            (("group",), ["group", str(D), "--json"]),
            (("class-number",), ["class-number", str(D), "--json"]),
            (("genera",), ["genera", str(D), "--json"]),
            (("reduce",), ["reduce", fs, "--json"]),
            (("compose",), ["compose", fs, gs, "--json"]),
            (("power",), ["power", fs, str(rng.randrange(-9, 10)), "--json"]),
            (("represent",), ["represent", fs, N, "--json"]),
            (("primes",), ["primes", fs, "--bound", "300", "--json"]),
            (("equivalent",), ["equivalent", fs, gs, "--json"]),
            (("explain", "represent"), ["explain", "represent", fs, N, "--json"]),
            (("graph",), ["graph", str(D), "--json"]),
        ]
        if D < 0:
            out.append((("hilbert",), ["hilbert", str(D), "--json"]))
    return out
