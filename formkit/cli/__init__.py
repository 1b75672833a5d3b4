"""The command line ``formkit``: one module per command group, and the entry point.

* :mod:`~formkit.cli.entry_point` — the parser with every command, :func:`main` (the
  console script ``formkit`` and ``python -m formkit``), exit statuses;
* :mod:`~formkit.cli.conventions` — one-line errors with exit status 2, one JSON object
  with ``--json`` (:func:`emit`);
* the commands: :mod:`~formkit.cli.forms` (reduce, equivalent), :mod:`~formkit.cli.groups`
  (group, class-number, compose, power), :mod:`~formkit.cli.explain` (explain …),
  :mod:`~formkit.cli.primes` (primes, hilbert), :mod:`~formkit.cli.table` (table),
  :mod:`~formkit.cli.graph` (graph), :mod:`~formkit.cli.represent` (represent, genera).

The top layer: it may import every layer of the library, and nothing imports it.
"""

from .conventions import emit
from .entry_point import build_parser, main

__all__ = ["main", "build_parser", "emit"]
