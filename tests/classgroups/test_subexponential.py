"""Tests of the subexponential (relation / index-calculus) class group, D < 0."""

import random

import pytest

from formkit.classgroups.baby_step_giant_step import class_group_bsgs
from formkit.classgroups.enumerated import class_group_enumerated
from formkit.classgroups.subexponential import class_group_subexponential
from formkit.core.discriminants import discriminant_parts
from formkit.errors import FormkitError


def _fundamental_below(D):
    while not (D % 4 in (0, 1) and discriminant_parts(D)[1] == 1):
        D -= 1
    return D


def test_agrees_with_enumeration_small():
    # reference: formkit's complete enumeration (unconditional); no table is
    # needed here: fundamental D near 10^6.
    for D in (-1_000_003, -1_000_004 + 0, -999_991 * 4):
        D = _fundamental_below(D)
        G = class_group_subexponential(D)
        E = class_group_enumerated(D)
        assert G.invariants == E.invariants, D


@pytest.mark.parametrize("digits", [11, 13])
def test_agrees_with_bsgs_invariants_and_dlog(digits):
    # reference: formkit's baby-step giant-step (independent method, GRH)
    rng = random.Random(digits)
    D = _fundamental_below(-rng.randrange(10 ** (digits - 1), 10**digits))
    G = class_group_subexponential(D)
    H = class_group_bsgs(D)
    assert G.invariants == H.invariants
    # discrete logs: the coordinates reconstruct the class, orders agree with bsgs
    for x in list(H.generators)[:2]:
        y = G(x.form)
        coords = G.discrete_log(y)
        z = G.identity
        for g, k in zip(G.generators, coords):
            z = z * g**k
        assert z == y
        assert y.order == x.order


def test_provenance_is_conditional():
    G = class_group_subexponential(-(10**12) - 3)  # h = 124568 by enumeration (formkit)
    assert G.order == 124568
    p = G.provenance
    assert p.method == "subexponential" and not p.certified and p.assumption == "GRH"
    assert "Bach" in p.detail and "lies in" in p.detail


def test_bad_input():
    with pytest.raises(FormkitError, match="starts at"):  # D > 0 goes to subexponential_real (D ≥ 10^5)
        class_group_subexponential(5 * 8 + 1)
    with pytest.raises(FormkitError, match="conductor"):
        class_group_subexponential(-23 * 9)  # conductor 3
    with pytest.raises(FormkitError):
        class_group_subexponential(-16)


def test_dispatch_and_cli_method_round_trip(capsys):
    # the --method value round-trips to the JSON "method" (shared decision on naming)
    import json

    from formkit import class_group
    from formkit.cli.entry_point import main

    assert class_group(-1_000_003, method="subexponential").provenance.method == "subexponential"
    rc = main(["group", "-1000003", "--method", "subexponential", "--json", "--quiet"])
    out = json.loads(capsys.readouterr().out)
    assert rc in (0, None) and out["method"] == "subexponential"
    # h(-1000003) by formkit's enumeration (unconditional)
    assert out["class_number"] == class_group_enumerated(-1_000_003).order


def _check_against_bsgs(D):
    G = class_group_subexponential(D)
    H = class_group_bsgs(D)
    assert G.invariants == H.invariants, D
    for x in list(H.generators)[:2]:
        y = G(x.form)
        z = G.identity
        for g, k in zip(G.generators, G.discrete_log(y)):
            z = z * g**k
        assert z == y and y.order == x.order, (D, x)


@pytest.mark.parametrize("digits", [20, 22])
def test_sieve_agrees_with_bsgs(digits):
    # reference: formkit's baby-step giant-step (independent method, GRH); random
    # fundamental D, so the sieve path (relation_sieve) and the random walks both run
    rng = random.Random(1000 + digits)
    _check_against_bsgs(_fundamental_below(-rng.randrange(10 ** (digits - 1), 10**digits)))


@pytest.mark.slow
@pytest.mark.parametrize("k", range(30))
def test_sieve_agrees_with_bsgs_many(k):
    # issue 18: 30 random D of 20–32 digits against baby-step giant-step
    rng = random.Random(k)
    digits = 20 + k * 13 // 30
    _check_against_bsgs(_fundamental_below(-rng.randrange(10 ** (digits - 1), 10**digits)))


def test_sieve_relations_are_true():
    # every full relation from the sieve multiplies out to the identity (checked by
    # composition of forms, independent of the sieve's sign bookkeeping)
    from formkit.classgroups.baby_step_giant_step import BSGSStatistics, _Ops
    from formkit.classgroups.relation_sieve import FactorBase, sieve_relations
    from formkit.classgroups.relation_tasks import _task_covers, sieve_parameters

    D = _fundamental_below(-(10**18) - 11)
    params = sieve_parameters(D)
    base = FactorBase(D, params.bound)
    ops = _Ops(D, BSGSStatistics())
    one = ops.reduce(*((1, 1, (1 - D) // 4) if D % 4 == 1 else (1, 0, -D // 4)))
    n = 0
    for r in sieve_relations(base, params, _task_covers(base, 0), 7):
        if r.large != 1:
            continue
        x = one
        for i, k in r.exponents:
            g = base.forms[i] if k > 0 else ops.inv(base.forms[i])
            x = ops.mul(x, ops.pow(g, abs(k)))
        assert x == one, r
        n += 1
    assert n > 20


def test_kill_and_resume(tmp_path):
    # a real process is killed (SIGKILL) after it has stored some sieve tasks; the same
    # call with the same store continues from them and gives baby-step giant-step's group
    import sqlite3
    import subprocess
    import sys
    import time
    from pathlib import Path

    from formkit.classgroups import subexponential as sub

    D = _fundamental_below(-(10**25) - 7)
    path = tmp_path / "rel.sqlite"
    root = str(Path(sub.__file__).resolve().parents[2])
    code = (
        "import sys; sys.path.insert(0, sys.argv[1]);"
        "from formkit.classgroups.subexponential import class_group_subexponential as f;"
        "f(int(sys.argv[2]), store=sys.argv[3], max_relations=10**9)"
    )
    proc = subprocess.Popen([sys.executable, "-c", code, root, str(D), str(path)], stderr=subprocess.DEVNULL)
    done = 0
    try:
        deadline = time.monotonic() + 120
        while time.monotonic() < deadline and proc.poll() is None:
            time.sleep(0.2)
            if path.exists():
                try:
                    with sqlite3.connect(path) as db:
                        done = db.execute("SELECT count(*) FROM tasks").fetchone()[0]
                except sqlite3.OperationalError:  # tables not yet created
                    continue
                if done >= 1:
                    break
    finally:
        proc.kill()
        proc.wait()
    assert done >= 1, "the killed run stored no finished task"
    with sqlite3.connect(path) as db:
        stored = db.execute("SELECT count(*) FROM relations").fetchone()[0]
    assert stored > 0
    G = class_group_subexponential(D, store=path)
    assert G.invariants == class_group_bsgs(D).invariants
    # the resumed run read the stored relations and did not redo the stored tasks
    stats = sub._LAST["stats"]
    assert stats.resumed == stored and stats.tasks_resumed == done


@pytest.mark.slow
def test_two_workers_agree():
    # two local worker processes give the same group as baby-step giant-step
    D = _fundamental_below(-(10**19) - 1)
    G = class_group_subexponential(D, workers=2)
    assert G.invariants == class_group_bsgs(D).invariants


def test_both_hermite_paths_give_the_same_group(monkeypatch):
    # issue 18: the Hermite form of the dense rest through a sublattice (forced here from
    # one column on) against FLINT's on the whole rest (the earlier path): the same
    # invariants, generators and discrete logs, and baby-step giant-step's group
    # (formkit's, an independent method, GRH)
    import functools

    from formkit.classgroups import subexponential as sub
    from formkit.core import abelian_quotient, lattice

    D = _fundamental_below(-(10**20) - 39)
    H = class_group_bsgs(D)
    results = []
    for mode in ("sublattice", "whole"):
        monkeypatch.setattr(abelian_quotient, "SUBLATTICE_FROM_COLUMNS", 1)
        monkeypatch.setattr(
            sub, "finite_lattice_quotient", functools.partial(lattice.finite_lattice_quotient, hermite=mode)
        )
        G = class_group_subexponential(D)
        logs = [G.discrete_log(G(x.form)) for x in H.generators]
        results.append((G.invariants, [g.form for g in G.generators], logs))
    assert results[0] == results[1]
    assert results[0][0] == H.invariants


@pytest.mark.parametrize("D", [-15, -20, -24, -40])
def test_class_number_two_is_pinned_by_the_genera(D):
    # h = 2 (Watkins' table / enumeration): the GRH interval [1, 3] alone leaves h*/2 = 1 open,
    # the two genera (Gauss: 2^(t−1) divides h) close it; before, the search never stopped
    G = class_group_subexponential(D)
    assert G.invariants == class_group_enumerated(D).invariants == (2,)
    assert "2 genera divide h" in G.provenance.detail


def test_a_hundred_digit_discriminant_is_refused_before_any_work():
    # priced before D is factored (3^226 + 30 has 108 digits): days of work, refused at 20 s
    from formkit.core.budget import budget
    from formkit.errors import BudgetError

    with budget("20s"), pytest.raises(BudgetError, match=r"subexponential method \(108 digits\)"):
        class_group_subexponential(-(3**226) - 30)
