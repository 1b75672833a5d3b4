"""Tests for formkit.core.factorisation (the one factorisation path).

Outside references: sympy's ``factorint`` (an independent factoriser) on random
integers; sympy's ``nextprime``/``isprime`` to build semiprimes with known factors;
classical factorisations of Fermat numbers (from memory: Euler for 2^32 + 1, Landry for
2^64 + 1).
"""

from __future__ import annotations

import random

import pytest
import sympy
from hypothesis import given, settings
from hypothesis import strategies as st

from formkit.core import factorisation as fz
from formkit.core.factorisation import checked_factorisation, prime_factorisation
from formkit.core.progress import set_progress
from formkit.errors import FormkitError


@settings(max_examples=200, deadline=None)
@given(st.integers(min_value=-(10**30), max_value=10**30).filter(lambda n: n != 0))
def test_agrees_with_sympy_factorint(n):
    # outside reference: sympy.factorint
    assert prime_factorisation(n) == dict(sorted(sympy.factorint(abs(n)).items()))


def test_fermat_numbers():
    # 2^32 + 1 = 641 · 6700417 (Euler) and 2^64 + 1 = 274177 · 67280421310721 (Landry); from memory
    assert prime_factorisation(2**32 + 1) == {641: 1, 6700417: 1}
    assert prime_factorisation(2**64 + 1) == {274177: 1, 67280421310721: 1}


def test_units_zero_and_fresh_copies():
    assert prime_factorisation(1) == {} and prime_factorisation(-1) == {}
    with pytest.raises(FormkitError, match="cannot factor 0"):
        prime_factorisation(0)
    d = prime_factorisation(360)
    d[2] = 99  # the cache must not be changed through a returned dictionary
    assert prime_factorisation(360) == {2: 3, 3: 2, 5: 1}


def _semiprime(digits: int, seed: int) -> tuple[int, int]:
    rng = random.Random(seed)
    p = sympy.nextprime(rng.randrange(10 ** (digits - 1), 10**digits))
    q = sympy.nextprime(rng.randrange(10 ** (digits - 1), 10**digits))
    return int(p), int(q)


def test_large_semiprime_through_child_process():
    # 2 × 20-digit primes: above 2^128, so factored in the child process; factors from sympy.nextprime
    p, q = _semiprime(20, 1)
    n = p * q
    assert n.bit_length() > fz._IN_PROCESS_BITS
    assert prime_factorisation(n) == dict(sorted({p: 1, q: 1}.items()))
    assert prime_factorisation(-p * q * 12) == dict(sorted({2: 2, 3: 1, p: 1, q: 1}.items()))


def test_large_prime_is_not_sent_anywhere():
    p = int(sympy.nextprime(10**80))  # prime by sympy.nextprime
    assert prime_factorisation(p) == {p: 1}


def test_slow_notice_names_the_option(monkeypatch, capsys):
    # the notice fires after `after` seconds; make that 0 to see it on a quick job
    real = fz.slow_notice
    monkeypatch.setattr(fz, "slow_notice", lambda what, hint="": real(what, hint=hint, after=0.0))
    p, q = _semiprime(21, 2)
    set_progress(True)
    try:
        assert prime_factorisation(p * q, what="N") == dict(sorted({p: 1, q: 1}.items()))
    finally:
        set_progress(None)
    err = capsys.readouterr().err
    assert "factoring N (" in err and "--factors" in err


def test_checked_factorisation_accepts_and_rejects():
    assert checked_factorisation(-1625, {13: 1, 5: 3}) == {5: 3, 13: 1}
    assert checked_factorisation(12, {2: 2, 3: 1, 7: 0}) == {2: 2, 3: 1}
    with pytest.raises(FormkitError, match="12, which is not prime"):
        checked_factorisation(1625, {5: 3, 12: 1})
    with pytest.raises(FormkitError, match="multiply to 125, not to"):
        checked_factorisation(1625, {5: 3})
    with pytest.raises(FormkitError, match="exceeds"):
        checked_factorisation(10, {2: 10**6})
    with pytest.raises(FormkitError, match="primes p ≥ 2"):
        checked_factorisation(10, {-2: 1, 5: 1})
    with pytest.raises(FormkitError, match="cannot factor 0"):
        checked_factorisation(0, {})
    # a given factorisation takes precedence over computing one, and is checked
    assert prime_factorisation(1625, factors={5: 3, 13: 1}) == {5: 3, 13: 1}
    with pytest.raises(FormkitError):
        prime_factorisation(1625, factors={5: 2, 65: 1})


def test_child_failure_is_reported(monkeypatch):
    monkeypatch.setattr(fz, "_CHILD_SCRIPT", "import sys; sys.exit('boom')")
    fz._factor_cached.cache_clear()
    p, q = _semiprime(22, 3)
    with pytest.raises(FormkitError, match="child process"):
        prime_factorisation(p * q)


def test_old_name_is_the_same_path():
    from formkit.core.arith import factorint

    assert factorint(-360) == prime_factorisation(360)


def test_the_cost_is_priced_on_the_cofactor_that_is_left(monkeypatch):
    # counted: the digits of the composite cofactor after the primes below 2^32 are removed
    # (2^20·3^7·1000003 here) are the digits that factorisation_cost is asked about
    import sympy

    import formkit.core.factorisation as F

    p, q = sympy.nextprime(10**23 + 12345), sympy.nextprime(10**24 + 54321)
    n = 2**20 * 3**7 * 1000003 * p * q
    priced: list[int] = []
    original = F.factorisation_cost
    monkeypatch.setattr(F, "factorisation_cost", lambda d: priced.append(d) or original(d))
    assert prime_factorisation(n) == {2: 20, 3: 7, 1000003: 1, p: 1, q: 1}
    assert priced == [len(str(p * q))]


@pytest.mark.slow
def test_factorisation_cost_bounds_measured_semiprimes():
    # the estimate is a worst case for two primes of equal size: measured CPU time of the child
    # (resource.getrusage of children) stays below it and above a thirtieth of it (common
    # practice; slow because it factors 40- and 50-digit semiprimes)
    import resource

    import sympy

    from formkit.core.factorisation import _factor_in_child, factorisation_cost

    for digits in (40, 50):
        p = sympy.nextprime(10 ** (digits // 2 - 1) * 3)
        q = sympy.nextprime(p * 3)
        before = resource.getrusage(resource.RUSAGE_CHILDREN)
        pairs = _factor_in_child(p * q)
        after = resource.getrusage(resource.RUSAGE_CHILDREN)
        used = after.ru_utime + after.ru_stime - before.ru_utime - before.ru_stime
        estimate = factorisation_cost(len(str(p * q)))[0]
        assert sorted(pairs) == [(p, 1), (q, 1)]
        assert used <= estimate and estimate <= 30 * max(used, 0.1), (digits, used, estimate)
