"""Tests of the ``represent`` and ``genera`` commands (issue 4, item 6).

Reference values: Jacobi's two-square theorem (r(325) = 4·(d₁ − d₃) = 24), brute force,
the genera of D = −84 (Cox §3: x² + 21y² has one class per genus, 21 idoneal) — all as
in the library tests; here the JSON shape and the error conventions are checked.
"""

from __future__ import annotations

import json
from math import gcd

import pytest
import sympy
from _cli import run, run_json


def test_represent_definite_json(capsys):
    d = run_json(capsys, "represent", "x^2+y^2", "325")
    assert set(d) >= {"form", "n", "count", "primitive_count", "solutions"}
    assert d["form"] == [1, 0, 1] and d["n"] == 325
    assert d["count"] == 24 == len(d["solutions"])  # Jacobi: 4·(6 − 0)
    assert d["primitive_count"] == sum(1 for x, y in d["solutions"] if gcd(x, y) == 1) == 16
    assert all(x * x + y * y == 325 for x, y in d["solutions"])


def test_represent_primitive_and_limit(capsys):
    d = run_json(capsys, "represent", "1,0,1", "325", "--primitive")
    assert len(d["solutions"]) == d["primitive_count"] == 16 and d["count"] == 24
    assert all(gcd(x, y) == 1 for x, y in d["solutions"])
    d = run_json(capsys, "represent", "[1,0,1]", "325", "--limit", "5")
    assert len(d["solutions"]) == 5 and d["count"] == 24 and d["truncated"] is True


def test_represent_brute_force(capsys):
    for n in range(40):
        d = run_json(capsys, "represent", "2x^2+xy+3y^2", str(n))
        brute = sorted(
            [x, y] for x in range(-10, 11) for y in range(-10, 11) if 2 * x * x + x * y + 3 * y * y == n
        )
        assert d["solutions"] == brute and d["count"] == len(brute)


def test_represent_large_integer(capsys):
    # N of 57 digits, written out, with eight 8-digit prime factors ≡ 1 (mod 4) (sympy
    # factors it quickly); Jacobi's formula gives 4·2^8 = 1024 solutions.
    primes = [10000121, 11000149, 12000253, 13000261, 14000281, 15000317, 16000321, 17000377]
    n = 1
    for p in primes:
        assert p % 4 == 1 and sympy.isprime(p)
        n *= p
    assert len(str(n)) == 57
    d = run_json(capsys, "represent", "1,0,1", str(n))
    assert d["count"] == 1024 == len(d["solutions"]) and d["n"] == n
    assert all(x * x + y * y == n for x, y in d["solutions"])


def test_represent_indefinite_json(capsys):
    d = run_json(capsys, "represent", "x^2-2y^2", "119")
    assert d["count"] is None
    assert d["orbits"] == [[11, 1], [11, -1], [13, 5], [13, -5]]
    assert all(x * x - 2 * y * y == 119 for x, y in d["orbits"])
    d = run_json(capsys, "represent", "1,0,-3", "2")
    assert d["count"] is None and d["orbits"] == []


def test_represent_human_text(capsys):
    code, out, _err = run(capsys, "represent", "x^2+y^2", "25")
    assert code == 0 and "12 solutions in all, 8 primitive" in out and "(3, 4)" in out
    code, out, _err = run(capsys, "represent", "-x^2+3y^2", "11")
    assert code == 0 and "orbit" in out and "A = [[" in out
    code, out, _err = run(capsys, "represent", "1,0,-2", "0")
    assert code == 0 and "(0, 0)" in out
    code, out, _err = run(capsys, "represent", "1,0,-2", "3")
    assert code == 0 and "no solutions" in out


def test_represent_negative_n_and_negative_forms(capsys):
    d = run_json(capsys, "represent", "1,0,1", "-5")
    assert d["count"] == 0 and d["solutions"] == []
    d = run_json(capsys, "represent", "-1,0,-1", "-5")
    assert d["count"] == 8


def test_genera_json(capsys):
    d = run_json(capsys, "genera", "-84")
    assert d["discriminant"] == -84
    assert d["characters"] == ["(n/3)", "(n/7)", "delta"]
    assert len(d["genera"]) == 4
    assert d["genera"][0] == {"symbol": [1, 1, 1], "forms": [[1, 0, 21]]}
    assert sorted(g["forms"][0] for g in d["genera"]) == [[1, 0, 21], [2, 2, 11], [3, 0, 7], [5, 4, 5]]
    d = run_json(capsys, "genera", "316")
    assert sum(len(g["forms"]) for g in d["genera"]) == 6 and len(d["genera"]) == 2


def test_genera_human(capsys):
    code, out, _err = run(capsys, "genera", "-56")
    assert code == 0 and "principal genus [+ +]" in out and "epsilon" in out


@pytest.mark.parametrize(
    "argv",
    [
        ("represent", "1,2,1", "5"),  # square discriminant
        ("represent", "x^2 + ", "5"),  # unreadable form
        ("represent", "1,0,1", "five"),  # N not an integer
        ("represent", "1,0,1", "5", "--limit", "-2"),
        ("represent", "1,0,1", "5", "--limit", "x"),
        ("genera", "-22"),  # not a discriminant
        ("genera", "16"),
        ("genera", "abc"),
    ],
)
def test_bad_input(capsys, argv):
    code, out, err = run(capsys, *argv)
    assert code == 2 and out == ""
    assert err.startswith("formkit: error: ") and err.count("\n") == 1


def test_factors_option_for_a_large_n(capsys):
    # N = p·q with 31-digit primes p, q ≡ 1 (mod 4) (sympy.nextprime, an outside reference):
    # Jacobi's two-square theorem gives r₂(N) = 4·(d₁(N) − d₃(N)) = 4·4 = 16, all primitive
    # since N is squarefree.  Without --factors this N would have to be factored first.
    from sympy import isprime, nextprime

    p = nextprime(10**30)
    while p % 4 != 1:
        p = nextprime(p)
    q = nextprime(p)
    while q % 4 != 1:
        q = nextprime(q)
    assert isprime(p) and isprime(q)
    d = run_json(capsys, "represent", "1,0,1", str(p * q), "--factors", f"{p}*{q}")
    assert d["count"] == 16 and d["primitive_count"] == 16
    for x, y in d["solutions"]:
        assert x * x + y * y == p * q


def test_large_n_is_factored_without_help(capsys):
    # N = p·q with random 22-digit primes p, q ≡ 1 (mod 4) (sympy.nextprime, outside
    # reference), far apart so no shortcut applies; formkit factors N itself (python-flint)
    # and Jacobi's two-square theorem gives r₂(N) = 4·(d₁ − d₃) = 16, as with --factors.
    import random

    from sympy import nextprime

    rng = random.Random(17)

    def prime_1_mod_4():
        p = nextprime(rng.randrange(10**21, 10**22))
        while p % 4 != 1:
            p = nextprime(p)
        return int(p)

    p, q = prime_1_mod_4(), prime_1_mod_4()
    d = run_json(capsys, "represent", "1,0,1", str(p * q))
    assert d["count"] == 16 and d["primitive_count"] == 16
    assert all(x * x + y * y == p * q for x, y in d["solutions"])
    assert run_json(capsys, "represent", "1,0,1", str(p * q), "--factors", f"{q}*{p}") == d


@pytest.mark.parametrize(
    "factors, needle",
    [
        ("5^3*11", "multiply to 1375"),
        ("5^x", "5^x"),
        ("25^2*13", "25"),
        ("", "--factors"),
        ("5^3*13*-1", "-1"),
        ("5²*13", "5²"),
        ("5^99999999999", "exceeds"),
    ],
)
def test_factors_option_bad_input(factors, needle, capsys):
    code, out, err = run(capsys, "represent", "1,0,1", "1625", "--factors", factors)
    assert code == 2 and out == ""
    assert err.startswith("formkit: error: ") and err.count("\n") == 1 and needle in err


def _semiprime_1_mod_4(digits: int, seed: int) -> tuple[int, int]:
    """Two random primes ≡ 1 (mod 4) of ``digits`` digits (sympy.nextprime, outside reference)."""
    import random

    from sympy import nextprime

    rng = random.Random(seed)
    out = []
    for _ in range(2):
        p = nextprime(rng.randrange(10 ** (digits - 1), 10**digits))
        while p % 4 != 1:
            p = nextprime(p)
        out.append(int(p))
    return out[0], out[1]


def test_progress_line_while_factoring(monkeypatch, capsys):
    # The notice waits 3 s; make it 0 so a quick 40-digit factorisation shows it, and
    # pretend stderr is a terminal.  It names N and --factors, goes to stderr only, and
    # --quiet silences it.
    import formkit.core.factorisation as fz
    import formkit.core.progress as pg

    real = fz.slow_notice
    monkeypatch.setattr(fz, "slow_notice", lambda what, hint="": real(what, hint=hint, after=0.0))
    monkeypatch.setattr(pg, "progress_enabled", lambda stream=None: pg._forced is not False)
    p, q = _semiprime_1_mod_4(20, 5)
    fz._factor_cached.cache_clear()
    code, out, err = run(capsys, "represent", "1,0,1", str(p * q), "--json")
    assert code == 0
    assert "formkit: factoring N (40 digits)" in err and "--factors" in err
    assert out.count("\n") == 1 and json.loads(out)["count"] == 16  # stdout: the JSON object only
    fz._factor_cached.cache_clear()
    code, out, err = run(capsys, "represent", "1,0,1", str(p * q), "--json", "--quiet")
    assert code == 0 and err == ""


def test_wrong_factors_of_a_large_n_are_refused(capsys):
    # the check refuses a composite "prime" and a wrong product before any factoring
    p, q = _semiprime_1_mod_4(30, 6)
    for given, needle in (
        (f"{p * q}", "not prime"),
        (f"{p}*{q + 1}", "not prime"),
        (f"{p}*{p}", "multiply to"),
    ):
        code, out, err = run(capsys, "represent", "1,0,1", str(p * q), "--factors", given)
        assert code == 2 and out == ""
        assert err.startswith("formkit: error: ") and err.count("\n") == 1 and needle in err
