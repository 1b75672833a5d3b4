"""Run the command line: ``python -m formkit``."""

from .cli import main

raise SystemExit(main())
