"""The time and memory budget: every costly method prices its work before it starts.

A method whose cost grows with its input (enumerating classes, baby-step tables,
walking the cycle of an indefinite form, a table range, a graph bound, a class
polynomial …) first estimates its time and memory from the size of the input and
calls :func:`check_cost`.  When the estimate is over the current :class:`Budget`
the call raises :class:`~formkit.errors.BudgetError` at once, in one line saying what
the work would need and which method or option reaches further, instead of running
for hours or until the machine runs out of memory.

The default budget, :data:`DEFAULT_BUDGET`, is **30 minutes and 4 GB**: it fits a
2-core machine with 24 GB shared by a few jobs.  On the command line the global
option ``--budget`` changes it (``--budget 2h``, ``--budget 16G``, ``--budget
10m,1G``, ``--budget unlimited``); in Python :func:`set_budget` or the context
manager :func:`budget` do.

The estimates are deliberately rough (constants measured on the development machine,
stated in the docstring of each cost function, rounded up); they only decide whether
to start.  A
method that is long but within budget shows progress through
:mod:`formkit.core.progress`.

Examples
--------
>>> b = parse_budget("10m,1G")
>>> b.seconds, b.memory
(600.0, 1073741824)
>>> with budget(b):
...     check_cost("a small job", seconds=1.0, memory=10**6)
>>> with budget(b):
...     check_cost("a big job", seconds=1e6, memory=2**20, further="use a faster method")
Traceback (most recent call last):
...
formkit.errors.BudgetError: a big job would need about 11.6 days and 1.0 MB, over the budget of 10 min and 1.0 GB; use a faster method, or raise the budget with --budget (e.g. --budget 12d)
"""

from __future__ import annotations

import math
import re
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass

from ..errors import BudgetError, ParseError

__all__ = [
    "Budget",
    "DEFAULT_BUDGET",
    "budget",
    "check_cost",
    "current_budget",
    "format_bytes",
    "format_seconds",
    "parse_budget",
    "set_budget",
    "BUDGET_SYNTAX",
    "describe_integer",
    "to_float",
    "prime_count_upper",
]


@dataclass(frozen=True)
class Budget:
    """The most time (seconds) and memory (bytes) one computation may be expected to take.

    ``math.inf`` means no limit.
    """

    seconds: float
    memory: float

    def __str__(self) -> str:
        return f"{format_seconds(self.seconds)} and {format_bytes(self.memory)}"


#: 30 minutes and 4 GB (see the module docstring).
DEFAULT_BUDGET = Budget(1800.0, 4 * 2**30)

#: How ``--budget`` is written (shown in the help).
BUDGET_SYNTAX = (
    "time and/or memory a single computation may be expected to need before it is refused "
    "(estimated before it starts): a time such as 90s, 10m, 2h, 3d and/or a size such as 500M, "
    "8G, separated by a comma, or 'unlimited'; default 30m,4G"
)

_current: Budget = DEFAULT_BUDGET


def current_budget() -> Budget:
    """The budget in force."""
    return _current


def set_budget(value: Budget | str | None) -> None:
    """Set the budget (a :class:`Budget`, text for :func:`parse_budget`, or ``None`` for the default)."""
    global _current
    if value is None:
        _current = DEFAULT_BUDGET
    elif isinstance(value, str):
        _current = parse_budget(value)
    else:
        _current = value


@contextmanager
def budget(value: Budget | str | None) -> Iterator[Budget]:
    """Run a block under another budget, then restore the previous one."""
    global _current
    old = _current
    set_budget(value)
    try:
        yield _current
    finally:
        _current = old


_TIME_UNITS = {"s": 1.0, "m": 60.0, "min": 60.0, "h": 3600.0, "d": 86400.0}
_SIZE_UNITS = {"k": 2**10, "m": 2**20, "g": 2**30, "t": 2**40}
_PART = re.compile(r"\s*([0-9]+(?:\.[0-9]+)?)\s*([a-zA-Z]+)\s*\Z", re.ASCII)


def parse_budget(text: str) -> Budget:
    """Read ``--budget`` text: ``"2h"``, ``"16G"``, ``"10m,1G"``, ``"unlimited"``.

    A time unit is one of ``s``, ``m``/``min``, ``h``, ``d``; a size unit is ``K``, ``M``,
    ``G``, ``T`` optionally followed by ``B`` (binary: 1G = 2^30 bytes).  The part not
    given keeps its default.  ``m`` alone means minutes; ``MB`` means megabytes.

    Raises
    ------
    ParseError
        For any other text.

    Examples
    --------
    >>> parse_budget("2h") == Budget(7200.0, DEFAULT_BUDGET.memory)
    True
    >>> parse_budget("512MB").memory
    536870912
    >>> parse_budget("unlimited").seconds
    inf
    """
    s = str(text).strip()
    if s.lower() in ("unlimited", "none", "inf"):
        return Budget(math.inf, math.inf)
    seconds, memory = DEFAULT_BUDGET.seconds, DEFAULT_BUDGET.memory
    parts = s.split(",")
    if not s or len(parts) > 2:
        raise ParseError(f"budget: cannot read {text!r}: {BUDGET_SYNTAX}")
    seen = set()
    for part in parts:
        m = _PART.match(part)
        if not m:
            raise ParseError(f"budget: cannot read {part.strip()!r} in {text!r}: {BUDGET_SYNTAX}")
        value, unit = float(m.group(1)), m.group(2)
        low = unit.lower()
        if low in _TIME_UNITS and unit not in ("M",):
            kind, seconds = "time", value * _TIME_UNITS[low]
        elif low.rstrip("b") in _SIZE_UNITS:
            kind, memory = "memory", value * _SIZE_UNITS[low.rstrip("b")]
        else:
            raise ParseError(f"budget: unknown unit {unit!r} in {text!r}: {BUDGET_SYNTAX}")
        if kind in seen:
            raise ParseError(f"budget: {kind} given twice in {text!r}")
        seen.add(kind)
        if value <= 0:
            raise ParseError(f"budget: the {kind} must be positive, not {part.strip()!r}")
    if memory != math.inf:
        memory = int(memory)
    return Budget(seconds, memory)


def format_seconds(t: float) -> str:
    """A duration in the largest fitting unit (``"12 s"``, ``"3.5 h"``, ``"2.1e+08 years"``)."""
    if t == math.inf:
        return "unlimited time"
    if t < 60:
        return f"{t:.0f} s" if t >= 1 else "under a second"
    for unit, size in (("years", 365.25 * 86400), ("days", 86400), ("h", 3600), ("min", 60)):
        if t >= size:
            v = t / size
            if unit == "years" and v >= 1e4:
                return f"{v:.1e} years"
            return f"{v:.1f} {unit}" if v < 10 or unit in ("days", "years") else f"{v:.0f} {unit}"
    return f"{t:.0f} s"  # pragma: no cover


def format_bytes(n: float) -> str:
    """A size in bytes in the largest fitting binary unit (``"1.0 GB"``)."""
    if n == math.inf:
        return "unlimited memory"
    for unit, size in (
        ("EB", 2**60),
        ("PB", 2**50),
        ("TB", 2**40),
        ("GB", 2**30),
        ("MB", 2**20),
        ("KB", 2**10),
    ):
        if n >= size:
            v = n / size
            return f"{v:.1e} {unit}" if v >= 1e4 else f"{v:.1f} {unit}"
    return f"{int(n)} bytes"


def describe_integer(n: int) -> str:
    """``n`` in full up to 24 digits, else its leading digits and its length.

    Examples
    --------
    >>> describe_integer(-10**40 - 3)
    '-10000000…(41 digits)'
    """
    n = int(n)
    if n.bit_length() <= 80:
        return str(n)
    digits = int(n.bit_length() * 0.30103)  # within one of the true count
    if n.bit_length() > 20_000:
        return f"{'-' if n < 0 else ''}(about {digits} digits)"
    s = str(n)
    return f"{s[: 9 if n < 0 else 8]}…({len(s.lstrip('-'))} digits)"


def to_float(n: int) -> float:
    """``float(n)``, or ``±inf`` when ``n`` is too large for a float (no OverflowError)."""
    n = int(n)
    if n.bit_length() > 1000:
        return math.inf if n > 0 else -math.inf
    return float(n)


def prime_count_upper(x: int) -> int:
    """An upper bound for ``π(x)``, the number of primes ``p ≤ x``.

    ``π(x) < 1.25506·x/log x`` for ``x > 1`` (Rosser–Schoenfeld 1962, Theorem 1,
    corollary (3.6); from memory), and ``π(x) ≤ x/2 + 1`` for small ``x``; ``x`` itself
    beyond the float range.  Cost estimates count primes with it.

    Examples
    --------
    >>> prime_count_upper(100) >= 25, prime_count_upper(10**6) >= 78498
    (True, True)
    """
    X = int(x)
    if X < 2:
        return 0
    if X < 17:
        return X // 2 + 1
    if X.bit_length() > 1000:
        return X
    return int(1.25506 * X / math.log(X)) + 1


def _suggest(seconds: float, memory: float, b: Budget) -> str:
    parts = []
    if seconds > b.seconds:
        for unit, size, most in (("m", 60, 99), ("h", 3600, 48), ("d", 86400, math.inf)):
            if seconds / size <= most:
                parts.append(f"{math.ceil(seconds / size)}{unit}")
                break
    if memory > b.memory:
        parts.append(f"{math.ceil(memory / 2**30)}G")
    return ",".join(parts)


def check_cost(what: str, *, seconds: float = 0.0, memory: float = 0.0, further: str | None = None) -> None:
    """Refuse work estimated to need more than the current budget.

    Parameters
    ----------
    what : str
        The work, naming its input (``"enumerating the classes of D = -4·10^35 - 7"``).
    seconds, memory : float
        The estimates (seconds of one core, bytes).
    further : str, optional
        Which method or option reaches further (part of the message).

    Raises
    ------
    BudgetError
        If ``seconds`` or ``memory`` is over :func:`current_budget`.
    """
    b = _current
    if seconds <= b.seconds and memory <= b.memory:
        return
    msg = f"{what} would need about {format_seconds(seconds)} and {format_bytes(memory)}, over the budget of {b}"
    hint = _suggest(seconds, memory, b)
    if further:
        msg += f"; {further}"
        if hint and seconds < 1e9 and memory < 2**50:
            msg += f", or raise the budget with --budget (e.g. --budget {hint})"
    elif hint and seconds < 1e9 and memory < 2**50:
        msg += f"; raise the budget with --budget (e.g. --budget {hint})"
    raise BudgetError(msg)
