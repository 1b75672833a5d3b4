"""The subexponential method for D > 0 (Buchmann): regulator, h, h⁺ and Cl⁺ against outside facts."""

from __future__ import annotations

import math
import random

import gmpy2
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from formkit.classgroups.enumerated import class_group_enumerated
from formkit.classgroups.infrastructure import real_class_group, real_class_number
from formkit.classgroups.subexponential import class_group_subexponential
from formkit.classgroups.subexponential_real import class_group_subexponential_real
from formkit.classgroups.unit_relations import real_gcd
from formkit.core.discriminants import is_fundamental_discriminant
from formkit.errors import DiscriminantError, FormkitError


def _fundamental(rng: random.Random, lo: int, hi: int) -> int:
    while True:
        D = rng.randrange(lo, hi)
        if is_fundamental_discriminant(D):
            return D


def _pell_regulator(D: int) -> float:
    """log ε from sympy's solver of t² − D·u² = ±4 (outside check: the least positive solution)."""
    from sympy.solvers.diophantine.diophantine import diop_DN

    sols = [(t, u) for N in (-4, 4) for t, u in diop_DN(D, N) if t > 0 and u > 0]
    t, u = min(sols)  # t² = D·u² ± 4: the least t is the least unit above 1
    return float(gmpy2.log((t + u * gmpy2.sqrt(gmpy2.mpfr(D, 200))) / 2))


@pytest.mark.parametrize("seed", range(2))
def test_regulator_against_pell_equation(seed):
    # outside check: sympy's Pell-type solver gives the fundamental unit (t + u√D)/2
    D = _fundamental(random.Random(seed), 10**5, 10**7)
    G = class_group_subexponential_real(D)
    R, _norm = G._units
    assert abs(R - _pell_regulator(D)) < 1e-9 * R


@pytest.mark.parametrize("seed", range(2))
def test_against_enumeration(seed):
    # outside check: brute force enumeration of the reduced forms (unconditional)
    D = _fundamental(random.Random(100 + seed), 10**5, 10**6)
    G = class_group_subexponential_real(D)
    E = class_group_enumerated(D)
    assert (G.invariants, G.class_number) == (E.invariants, E.class_number)


@pytest.mark.parametrize("seed", range(2))
def test_against_infrastructure_11_to_12_digits(seed):
    # the infrastructure path (baby-step giant-step in the principal cycle) on the same D
    D = _fundamental(random.Random(200 + seed), 10**10, 10**12)
    G = class_group_subexponential_real(D)
    H = real_class_group(D)
    assert G.invariants == H.invariants and G.class_number == H.class_number
    assert G._units[1] == H._units[1]
    assert abs(G._units[0] - H._units[0]) < 1e-9 * H._units[0]


def test_both_unit_norms_and_known_fields():
    # from memory: 10^12 + 1 = (10^6)² + 1 has ε = 10^6 + √D of norm −1; the infrastructure
    # path gives h⁺ = 50280 (docs/performance.md); 4·(10^13 + 3) has N(ε) = +1, h⁺ = 32
    G = class_group_subexponential_real(10**12 + 1)
    assert G._units[1] == -1 and G.order == G.class_number == 50280
    assert abs(G._units[0] - math.log(10**6 + math.sqrt(10**12 + 1))) < 1e-9
    G = class_group_subexponential_real(4 * (10**13 + 3))
    assert G._units[1] == 1 and G.order == 2 * G.class_number == 32


def test_group_operations_and_discrete_logs():
    G = class_group_subexponential_real(4 * (10**13 + 3))
    for g, n in zip(G.generators, G.invariants):
        assert (g**n).is_identity() and not (g ** (n // 2)).is_identity()
    x = G.generators[-1] * G.generators[0]
    assert G.element(G.discrete_log(x)) == x


def test_dispatch_and_bad_input():
    assert class_group_subexponential(10**12 + 1).class_number == 50280
    with pytest.raises(FormkitError, match="cannot be opened as a relation store"):
        class_group_subexponential(10**12 + 1, store="/nonexistent/x.db")  # D > 0 uses the store too
    with pytest.raises(DiscriminantError, match="conductor"):
        class_group_subexponential_real(9 * (10**10 + 1))
    with pytest.raises(DiscriminantError, match="starts at"):
        class_group_subexponential_real(229)
    with pytest.raises(DiscriminantError, match="D > 0"):
        class_group_subexponential_real(-(10**12) - 3)


@settings(max_examples=40, deadline=None)
@given(st.lists(st.integers(-(10**6), 10**6), min_size=1, max_size=6), st.integers(1, 50))
def test_real_gcd_of_multiples(ks, r):
    # the gcd of k_i·x is gcd(k_i)·x (elementary number theory)
    gmpy2.get_context().precision = 200
    x = gmpy2.log(gmpy2.mpfr(r + 1)) + 1
    g = real_gcd([k * x for k in ks])
    e = math.gcd(*ks)
    if e == 0:
        assert g is None
    else:
        assert abs(g / x - e) < 1e-20 * e


@pytest.mark.slow
@pytest.mark.parametrize("seed", range(5))
def test_against_infrastructure_16_to_20_digits(seed):
    # regulator, h, h⁺ against real_class_number (the structure is out of its reach here)
    rng = random.Random(300 + seed)
    D = _fundamental(rng, 10 ** (15 + seed), 10 ** (16 + seed))
    G = class_group_subexponential_real(D)
    r = real_class_number(D)
    assert (G.class_number, G.order, G._units[1]) == (r.class_number, r.class_number_narrow, r.unit_norm)
    assert abs(G._units[0] - r.regulator) < 1e-9 * r.regulator


def test_26_digit_field_of_richaud_degert_type():
    # D = n² + 4 with n odd: ε = (n + √D)/2 is the fundamental unit, of norm −1 (fields of
    # Richaud–Degert type; from memory), so R = log ε exactly; h against formkit's
    # infrastructure path.  Here h ≈ 5.5·10^10 and the unit logarithms reach 10^50: before
    # the precision covered the error growth of the real gcd, no run pinned h·R.
    n = 10**13 + 1
    D = n * n + 4
    G = class_group_subexponential_real(D)
    assert G._units[1] == -1
    assert abs(G._units[0] - math.log((n + math.sqrt(D)) / 2)) < 1e-9
    assert G.class_number == G.order == real_class_number(D).class_number


# --- the relation store and a Dask cluster (as for D < 0) ---------------------------------


def test_store_resumes_a_stopped_run(tmp_path, monkeypatch):
    # a run stopped (here by its relation limit, the linear algebra made to fail) has
    # stored its finished sieve tasks with their generators; the same call with the same
    # store reads them back, skips those tasks and gives the infrastructure's numbers
    import sqlite3

    from formkit.classgroups import subexponential_real as subr

    D = 4 * (10**13 + 3)
    path = tmp_path / "real.sqlite"
    with monkeypatch.context() as m:
        m.setattr(subr, "_try_pin", lambda *a, **k: None)
        with pytest.raises(FormkitError, match="did not pin down"):
            class_group_subexponential_real(D, store=path, max_relations=1)
    with sqlite3.connect(path) as db:
        stored = db.execute("SELECT count(*) FROM relations").fetchone()[0]
        done = db.execute("SELECT count(*) FROM tasks").fetchone()[0]
        betas = db.execute("SELECT count(*) FROM relations WHERE beta != '0'").fetchone()[0]
    assert stored > 0 and done > 0 and betas == stored  # every relation keeps its generator
    G = class_group_subexponential_real(D, store=path)
    st = subr._LAST["stats"]
    assert st.resumed == stored and st.tasks_resumed == done
    assert "read back from the store" in G.provenance.detail
    r = real_class_number(D)
    assert (G.class_number, G.order, G._units[1]) == (r.class_number, r.class_number_narrow, r.unit_norm)
    assert abs(G._units[0] - r.regulator) < 1e-9 * r.regulator


def test_store_of_the_first_layout_gains_the_generator_column(tmp_path):
    # a store written before the beta column existed (D < 0) opens and reads as before
    import sqlite3

    from formkit.classgroups.relation_sieve import Relation
    from formkit.classgroups.relation_store import RelationStore

    path = tmp_path / "old.sqlite"
    with sqlite3.connect(path) as db:
        db.execute("CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT)")
        db.execute("CREATE TABLE relations (exponents TEXT, large INTEGER, sign INTEGER)")
        db.execute("CREATE TABLE tasks (task INTEGER PRIMARY KEY)")
        meta = {"discriminant": "-1000003", "bound": "1000", "format": "formkit-relations-1"}
        db.executemany("INSERT INTO meta VALUES (?, ?)", list(meta.items()))
        db.execute("INSERT INTO relations VALUES ('[[0, 1], [2, -1]]', 1, 1)")
    with RelationStore(path, -1000003, 1000) as s:
        assert s.relations() == [Relation(((0, 1), (2, -1)))]
        s.add([Relation(((1, 2),), beta=-7)], task=3)
    with RelationStore(path, -1000003, 1000) as s:
        assert s.relations()[-1].beta == -7 and s.done_tasks() == {3}


def test_sieve_on_a_local_dask_cluster(tmp_path):
    distributed = pytest.importorskip("distributed")
    from formkit.classgroups import subexponential_real as subr

    D = 4 * (10**13 + 3)
    path = tmp_path / "real.sqlite"
    with distributed.LocalCluster(
        n_workers=2, threads_per_worker=1, processes=False, dashboard_address="127.0.0.1:0"
    ) as cluster:
        G = class_group_subexponential(D, cluster=cluster.scheduler_address, store=path)
        assert subr._LAST["stats"].tasks >= 1
    H = class_group_subexponential_real(D)  # in this process, no store
    assert (G.invariants, G.class_number, G._units) == (H.invariants, H.class_number, H._units)
