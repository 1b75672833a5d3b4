"""Prime factorisation of integers: the one path every formkit computation factors through.

Representations (the square-root method needs the primes of ``N``), genus theory of a
discriminant, conductors and orders, class numbers of orders, discriminants of class
polynomials: all of them ask this module, and this module asks FLINT's integer
factorisation (``fmpz_factor`` through python-flint: trial division, Pollard rho,
ECM and the self-initialising quadratic sieve, chosen by size).  FLINT is used here for
arithmetic only: it factors integers; everything formkit derives from the factors is
formkit's own.

* :func:`prime_factorisation` — ``{p: e}`` for ``|n|``, computed or checked;
* :func:`checked_factorisation` — the check of a factorisation the caller supplies
  (the command line's ``--factors``): every factor a prime ``p ≥ 2`` (BPSW test),
  every exponent ≥ 0, the product equal to ``|n|``.

Every computed factorisation is checked the same way before it is returned (product
equal to ``|n|``, every factor passing BPSW), so an error in any backend cannot reach a
result silently.

*Long jobs.*  Numbers above ``2^128`` are factored in a child Python process, so that
Ctrl-C ends the job at once (FLINT's C loop does not look at Python's signals); after a
few seconds a line on stderr (:func:`formkit.core.progress.slow_notice`) says that the
factorisation is still running and that ``--factors`` (``factors=`` in Python) skips it.
Measured reach on this machine: ``docs/performance.md`` (section *Factorisation*).

*Cost and budget.*  The prime factors below ``2^32`` are removed first (FLINT's
``factor_smooth``, well under a second at any size allowed by the number syntax).  What
is left, if composite, is priced at its worst case, two primes of equal size, by
:func:`factorisation_cost`; the child process is stopped when the time budget
(:mod:`formkit.core.budget`) runs out, and the refusal names the estimate, the budget and
``--factors``.

References
----------
.. [1] R. Crandall, C. Pomerance, *Prime Numbers: A Computational Perspective*, 2nd ed.,
       Springer 2005: §5.2 (Pollard rho), §7.4 (Lenstra's elliptic curve method), §6.1
       (the quadratic sieve); §3.6.3 (the Baillie–PSW test).
.. [2] The FLINT team, *FLINT: Fast Library for Number Theory*, documentation of
       ``fmpz_factor`` (https://flintlib.org).
"""

from __future__ import annotations

import subprocess
import sys
from collections.abc import Mapping
from functools import lru_cache

from ..errors import FormkitError, NotAnIntegerError
from .progress import slow_notice

__all__ = ["prime_factorisation", "checked_factorisation", "factorisation_cost", "FACTORS_HINT"]

#: What the slow-job notice suggests (names the command line's option and the keyword).
FACTORS_HINT = "if you know the prime factors, pass them with --factors (factors= in Python)"

# Above this size the factorisation runs in a child process (interruptible); below it
# FLINT answers in well under a second and is called in this process.
_IN_PROCESS_BITS = 128

_CHILD_SCRIPT = (
    "import sys, flint\n"
    "n = flint.fmpz(int(sys.stdin.read()))\n"
    "sys.stdout.write(' '.join(f'{int(p)}^{int(e)}' for p, e in n.factor()))\n"
)


#: Bits of the prime factors removed by FLINT's ``factor_smooth`` before the worst case
#: of the cofactor is priced (about 0.05 s for a 100-digit number on this machine).
_SMOOTH_BITS = 32


def factorisation_cost(digits: int) -> tuple[float, float]:
    """Worst-case ``(seconds, bytes)`` to factor a composite of ``digits`` decimal digits.

    The worst case is a product of two primes of equal size, where FLINT's quadratic
    sieve does the work.  Measured on the development machine (CPU seconds, medians of
    products of two primes near ``10^(d/2)``): 0.02 s at 30 digits, 0.1 s at 40, 0.8 s
    at 50, 8.4 s at 60 -- a factor of about 10 per 10 digits in this range, which the
    quadratic sieve's ``L(n)^(1 + o(1))``, ``L(n) = exp(√(log n · log log n))``, flattens
    only slowly.  The estimate is ``0.8 s · L(10^d)/L(10^50)`` times 3 (rounded up),
    at least 0.1 s, plus 0.2 s to start the child process that does it (Python and
    python-flint; about 0.1 s measured, counted by the test against measured runs); memory ``20 MB + 3 MB`` per digit above 40 (the sieve's relations
    and matrix, rounded up).  Larger numbers are usually factored far sooner (a small
    factor is found by ECM), so this decides only whether to *start* without a time limit.

    Examples
    --------
    >>> t, m = factorisation_cost(60)
    >>> 10 < t < 60 and m < 2**30
    True
    >>> factorisation_cost(200)[0] > 86400 * 365
    True
    """
    import math

    def L(d: float) -> float:
        ln = d * math.log(10)
        return math.sqrt(ln * math.log(ln))

    d = max(int(digits), 1)
    seconds = 3 * 0.8 * math.exp(min(700.0, L(d) - L(50)))
    return max(0.1, seconds) + 0.2, 20e6 + 3e6 * max(0, d - 40)


def _as_int(x: object, name: str) -> int:
    """``x`` as a Python int (integers only; bool refused), else NotAnIntegerError."""
    if isinstance(x, bool) or not hasattr(x, "__index__"):
        raise NotAnIntegerError(f"{name} must be an integer, not {x!r}")
    return int(x.__index__())


def _is_probable_prime(n: int) -> bool:
    """BPSW probable-prime test (FLINT's ``fmpz_is_probabprime``); False below 2."""
    import flint

    return n >= 2 and bool(flint.fmpz(n).is_probable_prime())


def checked_factorisation(n: int, factors: Mapping[int, int]) -> dict[int, int]:
    """Check a factorisation ``{p: e}`` of ``|n|`` given by the caller and return it sorted.

    Parameters
    ----------
    n : int
        A non-zero integer.
    factors : mapping
        Primes to exponents; entries with exponent 0 are dropped, repeated primes
        (when the mapping allows them) add up.

    Returns
    -------
    dict
        ``{p: e}`` sorted by ``p``.

    Raises
    ------
    FormkitError
        If an entry is not a prime ``p ≥ 2`` with an exponent ``≥ 0``, if ``p^e``
        exceeds ``|n|``, or if the product is not ``|n|``.

    Examples
    --------
    >>> checked_factorisation(-1625, {13: 1, 5: 3})
    {5: 3, 13: 1}
    >>> checked_factorisation(1625, {5: 3, 12: 1})
    Traceback (most recent call last):
    ...
    formkit.errors.FormkitError: the given factorisation of 1625 contains 12, which is not prime
    """
    n = abs(_as_int(n, "n"))
    if n == 0:
        raise FormkitError("cannot factor 0")
    fac: dict[int, int] = {}
    prod = 1
    for p, e in dict(factors).items():
        p = _as_int(p, "prime factor")
        e = _as_int(e, "exponent")
        if e < 0 or p < 2:
            raise FormkitError(f"factorisation entries must be primes p ≥ 2 with exponents ≥ 0, not {p}^{e}")
        if e == 0:
            continue
        if e > max(1, n.bit_length()):  # p^e would exceed |n|: refuse before computing it
            raise FormkitError(f"the given factor {p}^{e} exceeds |n| = {n}")
        if not _is_probable_prime(p):
            raise FormkitError(f"the given factorisation of {n} contains {p}, which is not prime")
        fac[p] = fac.get(p, 0) + e
        prod *= p**e
        if prod > n:
            break
    if prod != n:
        raise FormkitError(f"the given factors multiply to {prod}, not to |n| = {n}")
    return dict(sorted(fac.items()))


def prime_factorisation(
    n: int, *, factors: Mapping[int, int] | None = None, what: str = "n"
) -> dict[int, int]:
    """Prime factorisation ``{p: e}`` of ``|n|``, sorted by ``p``.

    Parameters
    ----------
    n : int
        A non-zero integer (``±1`` gives ``{}``).
    factors : mapping, optional
        A factorisation the caller already knows; it is checked
        (:func:`checked_factorisation`) instead of recomputed.
    what : str
        How the slow-job notice names ``n`` (``"N"``, ``"the discriminant"``, …).

    Returns
    -------
    dict
        ``{p: e}``; a fresh dictionary the caller may change.

    Raises
    ------
    FormkitError
        If ``n = 0`` or a given factorisation is wrong.
    KeyboardInterrupt
        On Ctrl-C, also while a large factorisation runs in its child process.

    Examples
    --------
    >>> prime_factorisation(-360)
    {2: 3, 3: 2, 5: 1}
    >>> prime_factorisation(2**64 + 1)  # Landry (1880), from memory
    {274177: 1, 67280421310721: 1}
    >>> prime_factorisation(1)
    {}

    References
    ----------
    See the module docstring.
    """
    n = abs(_as_int(n, "n"))
    if factors is not None:
        return checked_factorisation(n, factors)
    if n == 0:
        raise FormkitError("cannot factor 0")
    return dict(_factor_cached(int(n), what))


@lru_cache(maxsize=4096)
def _factor_cached(n: int, what: str) -> tuple[tuple[int, int], ...]:
    if n == 1:
        return ()
    if _is_probable_prime(n):
        return ((n, 1),)
    import flint

    if n.bit_length() <= _IN_PROCESS_BITS:
        pairs = [(int(p), int(e)) for p, e in flint.fmpz(n).factor()]
    else:
        # small primes first (cheap at any size); the rest, if composite, in a child process
        pairs = []
        rest = 1
        for fp, fe in flint.fmpz(n).factor_smooth(_SMOOTH_BITS):
            q, k = int(fp), int(fe)
            if _is_probable_prime(q):
                pairs.append((q, k))
            else:
                rest *= q**k
        if rest > 1:
            pairs += _factor_cofactor(n, rest, what)
    merged: dict[int, int] = {}
    for q, k in pairs:
        merged[q] = merged.get(q, 0) + k
    pairs = list(merged.items())
    pairs.sort()
    _verify(n, pairs)
    return tuple(pairs)


def _factor_cofactor(n: int, rest: int, what: str) -> list[tuple[int, int]]:
    """Factor the composite cofactor ``rest`` of ``n`` (no prime factor below 2^32) within the budget."""
    from .budget import check_cost, current_budget, describe_integer, format_seconds

    if rest.bit_length() <= _IN_PROCESS_BITS:
        import flint

        return [(int(p), int(e)) for p, e in flint.fmpz(rest).factor()]
    digits = len(str(rest))
    seconds, memory = factorisation_cost(digits)
    what_text = f"factoring {what} = {describe_integer(n)}"
    if rest != n:
        what_text += f" (a {digits}-digit cofactor without prime factors below 2^{_SMOOTH_BITS})"
    else:
        what_text += f" ({digits} digits, no prime factor below 2^{_SMOOTH_BITS})"
    check_cost(what_text, memory=memory)  # memory first: the time limit below stops a long run
    limit = current_budget().seconds
    hint = FACTORS_HINT
    if seconds > limit:
        hint += f"; stopped after the time budget of {format_seconds(limit)} (--budget) if not done"
    with slow_notice(f"factoring {what} ({len(str(n))} digits)", hint=hint):
        pairs = _factor_in_child(rest, None if limit == float("inf") else limit)
    if pairs is None:
        from ..errors import BudgetError

        raise BudgetError(
            f"{what_text} did not finish within the budget of {format_seconds(limit)} (the worst case, two "
            f"primes of {digits // 2} digits, needs about {format_seconds(seconds)}); {FACTORS_HINT}, or raise "
            "the budget with --budget"
        )
    return pairs


def _factor_in_child(n: int, timeout: float | None = None) -> list[tuple[int, int]] | None:
    """FLINT's factorisation of ``n`` in a child Python process (killed on Ctrl-C).

    ``None`` if it did not finish within ``timeout`` seconds (the child is killed)."""
    proc = subprocess.Popen(
        [sys.executable, "-c", _CHILD_SCRIPT],
        stdin=subprocess.PIPE,
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
    )
    try:
        out, err = proc.communicate(str(n), timeout=timeout)
    except subprocess.TimeoutExpired:
        return None
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.wait()
    if proc.returncode != 0:
        raise FormkitError(f"the factorisation of {n} failed in its child process: {err.strip()[-200:]}")
    pairs = []
    for tok in out.split():
        p, _, e = tok.partition("^")
        pairs.append((int(p), int(e)))
    return pairs


def _verify(n: int, pairs: list[tuple[int, int]]) -> None:
    prod = 1
    for p, e in pairs:
        if e < 1 or not _is_probable_prime(p):
            raise FormkitError(
                f"internal error: the factorisation of {n} contains {p}^{e}, which is not a prime power"
            )
        prod *= p**e
    if prod != n:
        raise FormkitError(f"internal error: the factors of {n} multiply to {prod}")
