"""Tests of formkit.classgroups.relation_combination and the smoothness test of the subexponential method.

Outside checks: FLINT's rank of an integer matrix (a general-purpose library) for the
bound on the rank that the peeling of :func:`weak_columns` proves; sympy's ``factorint``
for the factorisations over the factor base; hand-made relation sets.
"""

from __future__ import annotations

import flint
from hypothesis import given, settings
from hypothesis import strategies as st
from sympy import factorint, primerange

from formkit.classgroups.relation_combination import RelationCollector, weak_columns
from formkit.classgroups.relation_sieve import Relation
from formkit.classgroups.relation_tasks import _Smoothness

sparse_rows = st.integers(1, 9).flatmap(
    lambda n: st.tuples(
        st.just(n),
        st.lists(
            st.dictionaries(st.integers(0, n - 1), st.integers(-3, 3).filter(bool), min_size=1, max_size=3),
            max_size=12,
        ),
    )
)


@settings(max_examples=300, deadline=None)
@given(case=sparse_rows)
def test_weak_columns_bound_the_rank(case):
    # the weak and pinned columns live on the pinned rows only, so rank ≤ n − #weak
    # (the argument in the docstring); FLINT's rank is the outside check
    n, rows = case
    weak = weak_columns(rows, n)
    dense = [[r.get(j, 0) for j in range(n)] for r in rows]
    rank = flint.fmpz_mat(dense).rank() if dense else 0
    assert rank <= n - len(weak)
    # a column in no relation is weak
    assert {j for j in range(n) if not any(j in r for r in rows)} <= set(weak)


def test_weak_columns_by_hand():
    # columns 0 and 1 only in the first relation: one of them cannot be pinned
    assert weak_columns([{0: 1, 1: -1, 2: 1}, {2: 2, 3: 1}, {3: 1}], 4) == [1]
    # a chain that closes: every column pinned
    assert weak_columns([{0: 1, 1: 1}, {1: 1, 2: 1}, {2: 1}], 3) == []
    assert weak_columns([], 2) == [0, 1]


def test_collector_pairs_partials_and_drops_duplicates():
    C = RelationCollector()
    C.add(Relation(((0, 1),)))
    C.add(Relation(((0, 1),)))  # the same relation again
    C.add(Relation(((1, 1),), large=97, large_sign=1))
    C.add(Relation(((2, 1),), large=97, large_sign=1))  # s·s' = 1: r − r' (r the later one)
    C.add(Relation(((3, 2),), large=89, large_sign=-1))
    C.add(Relation(((3, 2),), large=89, large_sign=-1))  # r − r' = 0: nothing
    assert C.rows == [{0: 1}, {1: -1, 2: 1}]
    assert C.full == 2 and C.combined == 1


@settings(max_examples=200, deadline=None)
@given(st.integers(1, 10**30))
def test_smoothness_against_sympy(a):
    primes = list(primerange(2, 2000))
    got = _Smoothness(primes)(a)
    f = factorint(a)  # sympy, the outside factorisation
    if all(p < 2000 for p in f):
        assert got == dict(f)
    else:
        assert got is None


def test_smoothness_of_high_powers():
    # exponents up to log₂ a: 2^100 and 3^60·5 are smooth, 2^100·2003 is not
    S = _Smoothness([2, 3, 5, 7])
    assert S(2**100) == {2: 100}
    assert S(3**60 * 5) == {3: 60, 5: 1}
    assert S(2**100 * 2003) is None
    assert S(1) == {}
