"""Signs of life on long jobs: progress bars and phase lines on stderr.

Every long computation in formkit (tables, factorisation, baby-step giant-step, the
infrastructure, class polynomials, long solution lists) reports through this module, so
that one switch decides whether anything is shown:

* progress is shown only when stderr is a terminal, unless :func:`set_progress` says
  otherwise (the command line's ``--quiet`` turns it off; tests may turn it on);
* nothing is ever written to stdout (``--json`` output stays one JSON object);
* a bar or a phase line appears only once the job has run for ``delay`` seconds, so
  quick calls stay silent.

The bars are tqdm's; this module is the only one that imports tqdm for formkit's jobs.

Examples
--------
>>> set_progress(False)
>>> with progress_bar(total=3, desc="chunks") as bar:
...     for _ in range(3):
...         bar.update(1)
>>> with slow_notice("factoring n (45 digits)", hint="pass --factors"):
...     pass
>>> set_progress(None)
"""

from __future__ import annotations

import functools
import sys
import threading
import time
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from typing import Any, TextIO

__all__ = [
    "ProgressBar",
    "phase",
    "progress_bar",
    "progress_enabled",
    "set_progress",
    "slow_notice",
    "announces_slowness",
]

_forced: bool | None = None
_delay: float | None = None


def set_progress(enabled: bool | None, *, delay: float | None = None) -> None:
    """Turn progress output on (``True``), off (``False``) or back to automatic (``None``).

    Automatic means: shown when stderr is a terminal.  The command line calls
    ``set_progress(False)`` for ``--quiet``.  ``delay`` (seconds) replaces the delay of
    every bar and notice until the next call (tests show bars at once with ``delay=0``).
    """
    global _forced, _delay
    _forced = enabled
    _delay = delay


def progress_enabled(stream: TextIO | None = None) -> bool:
    """Whether progress output is shown now (see :func:`set_progress`)."""
    if _forced is not None:
        return _forced
    stream = sys.stderr if stream is None else stream
    try:
        return bool(stream.isatty())
    except (AttributeError, ValueError):
        return False


class ProgressBar:
    """A progress bar that is a no-op when progress is off.

    Use through :func:`progress_bar`.  ``update(n)`` advances it; ``set_postfix_str(s)``
    shows a short status (relations found, current bound, …).
    """

    def __init__(self, total: float | None, desc: str, unit: str, delay: float) -> None:
        self._bar: Any = None
        delay = delay if _delay is None else _delay
        if progress_enabled():
            from tqdm import tqdm

            self._bar = tqdm(
                total=total,
                desc=desc,
                unit=unit,
                file=sys.stderr,
                dynamic_ncols=True,
                delay=delay,
                leave=False,
            )

    def update(self, n: float = 1) -> None:
        if self._bar is not None:
            self._bar.update(n)

    def set_postfix_str(self, text: str) -> None:
        if self._bar is not None:
            self._bar.set_postfix_str(text, refresh=False)

    def close(self) -> None:
        if self._bar is not None:
            self._bar.close()
            self._bar = None


@contextmanager
def progress_bar(
    total: float | None = None, desc: str = "", unit: str = "it", delay: float = 2.0
) -> Iterator[ProgressBar]:
    """A progress bar on stderr, closed on exit (also on Ctrl-C).

    Parameters
    ----------
    total : number or None
        The amount of work, if known (then tqdm shows an estimate of the time left).
    desc, unit : str
        What is being counted.
    delay : float
        Seconds before the bar first appears.
    """
    bar = ProgressBar(total, desc, unit, delay)
    try:
        yield bar
    finally:
        bar.close()


def phase(message: str) -> None:
    """Write one phase line (``formkit: <message>``) to stderr when progress is on."""
    if progress_enabled():
        sys.stderr.write(f"formkit: {message}\n")
        sys.stderr.flush()


@contextmanager
def slow_notice(what: str, hint: str = "", after: float = 3.0) -> Iterator[None]:
    """Say once on stderr that ``what`` is still running after ``after`` seconds.

    For jobs whose length cannot be estimated (factorisation): the line reads
    ``formkit: <what> is taking more than N s; <hint>``.  Nothing is written if the job
    ends sooner or progress is off.
    """
    if not progress_enabled():
        yield
        return
    after = after if _delay is None else _delay
    done = threading.Event()
    start = time.monotonic()

    def _watch() -> None:
        if not done.wait(after):
            extra = f"; {hint}" if hint else ""
            sys.stderr.write(f"formkit: {what} is taking more than {after:g} s{extra}\n")
            sys.stderr.flush()

    watcher = threading.Thread(target=_watch, daemon=True)
    watcher.start()
    try:
        yield
    finally:
        done.set()
        watcher.join(timeout=max(0.0, 0.1 - (time.monotonic() - start)))


def announces_slowness(
    describe: Callable[..., str], hint: str = "", after: float = 3.0
) -> Callable[[Callable[..., Any]], Callable[..., Any]]:
    """Decorator: run the function inside :func:`slow_notice`, the job named by
    ``describe(*args, **kwargs)`` (for long searches: baby-step giant-step, the
    infrastructure, class polynomials).

    >>> @announces_slowness(lambda n: f"counting to {n}")
    ... def count(n):
    ...     return sum(range(n))
    >>> count(10)
    45
    """

    def decorate(fn: Callable[..., Any]) -> Callable[..., Any]:
        @functools.wraps(fn)
        def wrapper(*args: Any, **kwargs: Any) -> Any:
            if not progress_enabled():
                return fn(*args, **kwargs)
            with slow_notice(describe(*args, **kwargs), hint, after):
                return fn(*args, **kwargs)

        return wrapper

    return decorate
