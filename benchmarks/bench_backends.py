"""Benchmark: the exact backends on python-flint against sympy — factorisation and Smith forms.

Run:  python3 benchmarks/bench_backends.py [--repeat N] [--timeout T] [--quick] [--reach]

Prints medians over N runs (default 3) of **CPU time**, measured side by side in one run:

* *Factorisation* of semiprimes p·q with balanced random primes (30, 45 and 60 digits;
  a new N for every run, so no cache helps): formkit's path
  (:func:`formkit.core.factorisation.prime_factorisation`, FLINT's ``fmpz_factor``; above
  2^128 in a child process, whose CPU time is counted) against sympy's ``factorint`` and
  sympy's ``ecm`` (default bounds).  The sympy calls run in a child process limited to
  T seconds of CPU time (default 60; ``RLIMIT_CPU``); a call that does not finish is reported as
  ``> T s`` and the median is ``> T s`` once half the runs have timed out (the remaining
  runs of that row are then skipped).  ``ecm`` with its default bounds may also give up
  (no factor found); that is reported as ``gave up``, and counts as no answer.
* *Smith normal form of class group relation matrices*: relations among the first n prime
  forms of a negative discriminant (n = 50, 200, 1000 columns, 1.1·n + 10 rows, about
  ten non-zero entries per row), collected by formkit's own relation search (the one of
  :mod:`formkit.classgroups.subexponential`; collecting them is not timed).  Timed:
  :func:`formkit.core.lattice.lattice_quotient` with the generators (the column
  transformation and its inverse, which generators and discrete logs need), against
  sympy's ``smith_normal_form`` (diagonal only) and FLINT's ``fmpz_mat.snf`` (diagonal
  only, dense), both in a child process with the same CPU limit.  The diagonals are compared.
* ``--reach`` adds the end-to-end command ``formkit represent 1,0,1 N --json --quiet``
  on N = p·q, p, q ≡ 1 (mod 4) balanced random primes of 60, 65, 70, 75 and 80 digits
  (one run each, CPU time of the command and its children, each process limited to 600
  CPU seconds by ``--reach-limit``; it stops at the first size over the limit).

CPU time is ``time.process_time`` of the process plus, for child processes, their user
and system time (``resource.getrusage(RUSAGE_CHILDREN)``); wall-clock time depends on the
load of the (shared) machine; it is printed for the --reach runs only.  ``--quick``: one run, a
20 s limit, 30/45-digit semiprimes and 50/200 columns.
"""

from __future__ import annotations

import argparse
import json
import os
import platform
import random
import resource
import signal
import statistics
import subprocess
import sys
import time
from collections.abc import Callable
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

import flint
import sympy

from formkit.core import factorisation as fz
from formkit.core.lattice import lattice_quotient

ROOT = Path(__file__).resolve().parents[1]

# ---------------------------------------------------------------------------
# CPU time of this process and its children


def _cpu() -> float:
    ch = resource.getrusage(resource.RUSAGE_CHILDREN)
    return time.process_time() + ch.ru_utime + ch.ru_stime


def cpu_of(fn: Callable[[], object]) -> tuple[float, object]:
    """``(CPU seconds, result)`` of ``fn()``, children included."""
    t = _cpu()
    out = fn()
    return _cpu() - t, out


# The child that runs one outside computation and reports its own CPU time.
_CHILD = r"""
import json, sys, time
task = json.loads(sys.stdin.read())
kind = task["kind"]
if kind in ("factorint", "ecm", "snf"):
    import sympy
    from sympy.ntheory import ecm
    from sympy.matrices.normalforms import smith_normal_form
    from sympy import Matrix, ZZ
else:
    import flint
out = {}
t = time.process_time()
if kind == "factorint":
    out["result"] = sorted(int(p) for p in sympy.factorint(task["n"]))
elif kind == "ecm":
    try:
        out["result"] = sorted(int(p) for p in ecm(task["n"]))
    except ValueError as e:
        out["failed"] = str(e)
elif kind == "snf":
    S = smith_normal_form(Matrix(task["rows"]), domain=ZZ)
    out["result"] = [abs(int(S[i, i])) for i in range(min(S.shape))]
elif kind == "flint_snf":
    S = flint.fmpz_mat(task["rows"]).snf()
    out["result"] = [abs(int(S[i, i])) for i in range(min(S.nrows(), S.ncols()))]
out["cpu"] = time.process_time() - t
sys.stdout.write(json.dumps(out))
"""


def _cpu_limit(seconds: float) -> Callable[[], None]:
    """A ``preexec_fn`` giving the child (and its children, each) ``seconds`` of CPU time."""

    def limit() -> None:
        soft = max(1, int(seconds + 0.999))
        resource.setrlimit(resource.RLIMIT_CPU, (soft, soft + 5))

    return limit


def _killed_by_cpu_limit(code: int) -> bool:
    return code in (-signal.SIGXCPU, -signal.SIGKILL)


def outside(kind: str, limit: float, **task: object) -> dict:
    """Run one outside computation in a child process limited to ``limit`` CPU seconds:
    ``{"cpu", "result"}``, ``{"timeout"}`` or ``{"failed"}``."""
    proc = subprocess.Popen(
        [sys.executable, "-c", _CHILD],
        stdin=subprocess.PIPE,
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
        preexec_fn=_cpu_limit(limit),
    )
    try:
        # the CPU limit ends the child; the wall-clock limit is a safety net on a loaded machine
        out, err = proc.communicate(json.dumps({"kind": kind, **task}), timeout=20 * limit + 60)
    except subprocess.TimeoutExpired:
        proc.kill()
        proc.communicate()
        return {"timeout": limit}
    if _killed_by_cpu_limit(proc.returncode):
        return {"timeout": limit}
    if proc.returncode != 0:
        return {"failed": err.strip().splitlines()[-1] if err.strip() else f"exit {proc.returncode}"}
    return json.loads(out)


def outside_series(
    kind: str, tasks: list[dict], limit: float, check: Callable[[int, list[int]], None]
) -> tuple[str, float | None]:
    """Run ``kind`` on each task (one child each) and summarise: ``(text, median or None)``.

    The text is the median CPU time, a run without an answer counting as +∞; ``> T s``
    once at least half of the runs timed out (the other runs are then skipped, the
    median being known to exceed T); ``gave up k of n`` when at least half of the runs
    ended without an answer and some of them gave up (sympy's ``ecm`` with its default
    bounds raises ValueError).
    ``check(i, result)`` compares a result with the known answer of task ``i``.
    """
    vals: list[float] = []
    tout = failed = 0
    for i, task in enumerate(tasks):
        if tout and 2 * tout >= len(tasks):
            break
        r = outside(kind, limit, **task)
        if "timeout" in r:
            tout += 1
        elif "failed" in r:
            failed += 1
        else:
            check(i, r["result"])
            vals.append(r["cpu"])
    if failed + tout and 2 * (failed + tout) >= len(tasks):
        # no answer in at least half of the runs: there is no median to quote
        if not failed:
            return f"> {limit:g} s", None
        got = f"; answered in {', '.join(f'{v:.3f}' for v in vals)} s" if vals else ""
        over = f", {tout} over {limit:g} s" if tout else ""
        return f"gave up {failed} of {len(tasks)}{over}{got}", None
    # a run without an answer (timed out or gave up) counts as +∞ in the median
    m = statistics.median(sorted(vals) + [float("inf")] * (tout + failed))
    note = f" ({failed} of {len(tasks)} gave up)" if failed else ""
    return f"{m:.3f}{note}", m


def ratio(other: float | None, ours: float, limit: float, text: str) -> str:
    if other is not None:
        return f"{other / ours:.0f}×"
    return f"> {limit / ours:.0f}×" if text.startswith(">") else "–"


# ---------------------------------------------------------------------------
# factorisation


def balanced_semiprime(digits: int, rng: random.Random, mod4: int | None = None) -> tuple[int, int, int]:
    """``(N, p, q)``: N of exactly ``digits`` digits, p < q primes of about digits/2 digits
    (sympy.nextprime from random starts); ``mod4 = 1`` asks for p, q ≡ 1 (mod 4)."""
    while True:
        lo = 10 ** ((digits - 1) / 2)
        hi = 10 ** (digits / 2)
        ps = []
        for _ in range(2):
            p = int(sympy.nextprime(rng.randrange(int(lo), int(hi))))
            while mod4 is not None and p % 4 != mod4:
                p = int(sympy.nextprime(p))
            ps.append(p)
        p, q = sorted(ps)
        if p != q and len(str(p * q)) == digits:
            return p * q, p, q


def bench_factorisation(digit_list: tuple[int, ...], repeat: int, limit: float) -> None:
    rng = random.Random(2026)
    print(f"\n## Factorisation of balanced semiprimes (median CPU s of {repeat} runs, limit {limit:g} s)")
    print(
        "| N digits | formkit (FLINT) | sympy factorint | sympy ecm | factorint / formkit | ecm / formkit |"
    )
    print("|---:|---:|---:|---:|---:|---:|")
    for digits in digit_list:
        cases = [balanced_semiprime(digits, rng) for _ in range(repeat)]
        ours = []
        for n, p, q in cases:
            fz._factor_cached.cache_clear()
            t, fac = cpu_of(lambda n=n: fz.prime_factorisation(n))
            assert fac == {p: 1, q: 1}, (n, fac)
            ours.append(t)
        mo = statistics.median(ours)

        def check(i: int, result: list[int], cases=cases) -> None:
            assert result == [cases[i][1], cases[i][2]], (cases[i], result)

        tasks = [{"n": n} for n, _p, _q in cases]
        ft, fm = outside_series("factorint", tasks, limit, check)
        et, em = outside_series("ecm", tasks, limit, check)
        print(
            f"| {digits} | {mo:.3f} | {ft} | {et} | {ratio(fm, mo, limit, ft)} | {ratio(em, mo, limit, et)} |",
            flush=True,
        )


# ---------------------------------------------------------------------------
# Smith normal form of relation matrices

#: (columns, discriminant): the first n prime forms of D; |D| grows with n so that
#: relations stay easy to find (Bach's bound 6·log²|D| is about the largest prime).
RELATION_CASES = ((50, -(10**12 + 11)), (200, -(10**16 + 3)), (1000, -(10**22 + 3)))


def relation_matrix(D: int, ncols: int, extra: int | None = None, seed: int = 1) -> list[dict[int, int]]:
    """``ncols + extra`` relations among the first ``ncols`` prime forms of ``D`` (sparse rows),
    from formkit's relation search (subexponential method, without the large-prime
    bookkeeping being reported)."""
    from formkit.classgroups.abelian_groups import BSGSStatistics
    from formkit.classgroups.baby_step_giant_step import _Ops
    from formkit.classgroups.relation_sieve import FactorBase
    from formkit.classgroups.relation_tasks import _Smoothness
    from formkit.classgroups.subexponential import _express
    from formkit.core.enumeration import _prime_forms

    if extra is None:
        extra = ncols // 10 + 10
    last = 2
    for k, (p, _g) in enumerate(_prime_forms(D, 1), 1):
        last = p
        if k == ncols:
            break
    base = FactorBase(D, last)
    assert len(base) == ncols
    ops = _Ops(D, BSGSStatistics())
    smooth = _Smoothness(list(base.primes))
    rng = random.Random(seed)
    rows: list[dict[int, int]] = []
    while len(rows) < ncols + extra:  # random walks from each prime form in turn
        r = _express(base, ops, len(rows) % ncols, rng, 10_000, smooth)
        if r is not None and r.large == 1:
            rows.append(dict(r.exponents))
    return rows


def bench_smith(cases: tuple[tuple[int, int], ...], repeat: int, limit: float) -> None:
    print(
        f"\n## Smith normal form of class group relation matrices (median CPU s of {repeat} runs, limit {limit:g} s)"
    )
    print(
        "| columns | rows | non-zeros / row | invariants ≠ 1 | formkit core.lattice (with generators) "
        "| sympy smith_normal_form | FLINT snf (dense, diagonal only) | sympy / formkit |"
    )
    print("|---:|---:|---:|---|---:|---:|---:|---:|")
    for n, D in cases:
        rows = relation_matrix(D, n)
        dense = [[r.get(j, 0) for j in range(n)] for r in rows]
        nnz = sum(len(r) for r in rows) / len(rows)

        def ours(rows=rows, n=n):
            q = lattice_quotient(rows, ncols=n)
            q.generators  # noqa: B018 - the transformation inverse, as class groups read it
            return q

        times = []
        q = None
        for _ in range(repeat):
            t, q = cpu_of(ours)
            times.append(t)
        assert q is not None
        mo = statistics.median(times)
        # the full diagonal of min(m, n) entries: ones, the invariants (zeros last)
        full = [1] * (min(len(rows), n) - len(q.invariants)) + list(q.invariants)

        def check(_i: int, result: list[int], full=full) -> None:
            assert sorted(result, key=lambda x: (x == 0, x)) == full, "the diagonals differ"

        tasks = [{"rows": dense}] * repeat
        st, sm = outside_series("snf", tasks, limit, check)
        ft, _fm = outside_series("flint_snf", tasks, limit, check)
        inv = " × ".join(f"C{d}" if d else "Z" for d in q.invariants) or "C1"
        if len(inv) > 40:
            inv = inv[:37] + "…"
        print(
            f"| {n} | {len(rows)} | {nnz:.1f} | {inv} | {mo:.3f} | {st} | {ft} | {ratio(sm, mo, limit, st)} |",
            flush=True,
        )


# ---------------------------------------------------------------------------
# reach of `formkit represent`


def bench_reach(digit_list: tuple[int, ...], limit: float = 600.0) -> None:
    rng = random.Random(1717)
    print(f"\n## `formkit represent 1,0,1 N` end to end (one run each, limit {limit:g} CPU s)")
    print("| N digits | CPU (s) | wall (s) | solutions |")
    print("|---:|---:|---:|---:|")
    for digits in digit_list:
        n, _p, _q = balanced_semiprime(digits, rng, mod4=1)
        cmd = [sys.executable, "-m", "formkit", "represent", "1,0,1", str(n), "--json", "--quiet"]
        c0, w0 = _cpu(), time.monotonic()
        proc = subprocess.Popen(
            cmd,
            cwd=ROOT,
            stdout=subprocess.PIPE,
            stderr=subprocess.PIPE,
            text=True,
            start_new_session=True,
            preexec_fn=_cpu_limit(limit),  # inherited by the factorising child
        )
        try:
            out, err = proc.communicate(timeout=20 * limit)
        except subprocess.TimeoutExpired:
            os.killpg(proc.pid, signal.SIGKILL)  # the command and its factorising child
            proc.communicate()
            print(f"| {digits} | > {limit:g} (wall-clock safety limit) | – | – |", flush=True)
            break
        c1, w1 = _cpu(), time.monotonic()
        if proc.returncode != 0:
            print(f"| {digits} | > {limit:g} | {w1 - w0:.0f} | – ({err.strip()[-80:]}) |", flush=True)
            break
        d = json.loads(out)
        assert d["count"] == 16 and all(x * x + y * y == n for x, y in d["solutions"]), err
        print(f"| {digits} | {c1 - c0:.1f} | {w1 - w0:.1f} | {d['count']} |", flush=True)


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument(
        "--timeout", type=float, default=60.0, help="CPU-time limit of each sympy/FLINT child (s)"
    )
    ap.add_argument("--quick", action="store_true", help="one run, 20 s limit, smaller cases")
    ap.add_argument("--reach", action="store_true", help="also time `formkit represent` on 60–80 digits")
    ap.add_argument("--reach-limit", type=float, default=600.0, help="CPU-time limit of each --reach run (s)")
    ap.add_argument("--only", choices=["factor", "smith", "reach"], help="run one part only")
    args = ap.parse_args()
    repeat, limit = args.repeat, args.timeout
    digits: tuple[int, ...] = (30, 45, 60)
    cases = RELATION_CASES
    if args.quick:
        repeat, limit = 1, 20.0
        digits, cases = (30, 45), RELATION_CASES[:2]
    print(
        f"# bench_backends ({time.strftime('%Y-%m-%d')}; Python {platform.python_version()}, "
        f"python-flint {flint.__version__}, sympy {sympy.__version__})"
    )
    if args.only in (None, "factor"):
        bench_factorisation(digits, repeat, limit)
    if args.only in (None, "smith"):
        bench_smith(cases, repeat, limit)
    if args.reach or args.only == "reach":
        bench_reach((60, 65, 70, 75, 80), args.reach_limit)


if __name__ == "__main__":
    main()
