"""Tests of formkit.tables.theta: r₃ against brute force and Legendre's theorem, H(n) against
published values, class numbers against the reduced-form sweep."""

from __future__ import annotations

import math
from fractions import Fraction

import pytest
from hypothesis import given
from hypothesis import strategies as st

from formkit import FormkitError, class_numbers, discriminant_parts
from formkit.tables.theta import (
    _r3_upto,
    class_numbers_by_theta,
    determined_by_theta,
    hurwitz_class_numbers,
    three_square_counts,
)

# H(n) for 1 ≤ n ≤ 50 (n ≡ 0, 3 mod 4; 0 otherwise): the classical table of Hurwitz class
# numbers (Zagier; Cohen GTM 138 §5.3), values from memory, each re-derived by hand from the
# reduced forms (a, b, c) with weights 1/2 and 1/3.
H_PUBLISHED = {
    3: Fraction(1, 3), 4: Fraction(1, 2), 7: 1, 8: 1, 11: 1, 12: Fraction(4, 3), 15: 2,
    16: Fraction(3, 2), 19: 1, 20: 2, 23: 3, 24: 2, 27: Fraction(4, 3), 28: 2, 31: 3, 32: 3,
    35: 2, 36: Fraction(5, 2), 39: 4, 40: 2, 43: 1, 44: 4, 47: 5, 48: Fraction(10, 3),
}  # fmt: skip


def test_hurwitz_against_published_values():
    H = hurwitz_class_numbers(50)
    assert H.values[0] == Fraction(-1, 12)  # convention H(0) = −1/12 (from memory)
    for n in range(1, 51):
        assert H.values[n] == H_PUBLISHED.get(n, 0), n
    assert "unconditional" in H.provenance and H.rounding_error < 0.25


def test_r3_against_brute_force():
    N = 400  # direct count of (x, y, z) with x² + y² + z² = n
    brute = [0] * (N + 1)
    r = math.isqrt(N)
    for x in range(-r, r + 1):
        for y in range(-r, r + 1):
            for z in range(-r, r + 1):
                s = x * x + y * y + z * z
                if s <= N:
                    brute[s] += 1
    assert three_square_counts(N) == brute


def test_legendre_and_the_two_transforms():
    # Legendre/Gauss: n is a sum of three squares unless n = 4^a(8b + 7); and r₃(4n) = r₃(n)
    # (from memory); the three short products (ψ³, ψ(q²)θ², ψ(q²)²θ) must agree with cubing
    # the spectrum of θ, an independent transform.
    N = 20000
    one, err1 = _r3_upto(N, 0)
    series, err2 = _r3_upto(N)
    assert (one == series).all() and max(err1, err2) < 0.25
    for n in range(1, N + 1):
        m = n
        while m % 4 == 0:
            m //= 4
        assert (one[n] == 0) == (m % 8 == 7), n
        if 4 * n <= N:
            assert one[4 * n] == one[n]


def test_against_sweep_sample():
    # every D in [−2·10^5, −3]: the theta series against counting reduced forms
    N = 200_000
    assert class_numbers_by_theta(-N, -3) == class_numbers(-N, -3, engine="numpy")
    low = class_numbers_by_theta(-N, -150_000)  # a window far from 0
    assert low == class_numbers(-N, -150_000, engine="numpy")
    assert class_numbers_by_theta(-N, -150_000, complete=False).items() <= low.items()


@pytest.mark.slow
def test_against_sweep_to_a_million():
    N = 1_000_000
    sweep = class_numbers(-N, -3, engine="numpy")
    assert class_numbers_by_theta(-N, -3) == sweep
    alone = class_numbers_by_theta(-N, -3, complete=False)
    assert all(sweep[D] == h for D, h in alone.items())


def test_theta_alone_gives_exactly_the_determined_discriminants():
    got = class_numbers_by_theta(-3000, -3, complete=False)
    sweep = class_numbers(-3000, -3)
    assert set(got) == {D for D in sweep if determined_by_theta(D)}
    assert all(sweep[D] == h for D, h in got.items())


@given(st.integers(3, 10**7))
def test_determined_iff_fundamental_part_not_1_mod_8(n):
    D = -n
    if D % 4 not in (0, 1):
        with pytest.raises(FormkitError):
            determined_by_theta(D)
        return
    dK, _ = discriminant_parts(D)
    assert determined_by_theta(D) == (dK % 8 != 1)


def test_bad_input():
    with pytest.raises(FormkitError, match="bound"):
        hurwitz_class_numbers(-1)
    with pytest.raises(FormkitError, match="start"):
        class_numbers_by_theta(-3, -10)
    assert class_numbers_by_theta(-2, 5) == {}


def test_store_names_the_method_of_each_chunk(tmp_path):
    # a theta build must not be recorded as enumeration; a store built by both names both,
    # and each chunk keeps its own method (common practice, no source: provenance rule)
    from formkit import build_table, query_table, table_info

    db = str(tmp_path / "t.db")
    build_table(db, -2000, -1001, invariants=False, workers=1, engine="theta")
    info = table_info(db)
    assert info["meta"]["method"] == "theta-relation" and "theta series" in info["meta"]["description"]
    assert "Kronecker-Hurwitz" in info["meta"]["description"]
    assert "enumeration" not in info["meta"]["method"]
    assert info["methods"] == {"theta-relation": [[-2000, -1001]]}
    build_table(db, -1000, -3, invariants=False, workers=1, engine="numpy")
    info = table_info(db)
    assert info["meta"]["method"] == "enumeration + theta-relation"
    assert info["methods"] == {"theta-relation": [[-2000, -1001]], "enumeration": [[-1000, -3]]}
    rows = {r.discriminant: r.class_number for r in query_table(db)}
    assert rows == class_numbers(-2000, -3)  # both methods agree with the sweep


def test_sweep_of_the_class_7_mod_8_against_brute_force():
    # r(m) = all reduced forms (a, b, c) of discriminant −m (|b| ≤ a ≤ c, b ≥ 0 if |b| = a
    # or a = c; Cox Thm 2.8), counted directly, for m ≡ 7 (mod 8) in a window and from 7
    from formkit.tables.sweep import _count_class_seven

    def brute(m):
        count, a = 0, 1
        while 3 * a * a <= m:
            for b in range(-a + 1, a + 1):
                if (b * b + m) % (4 * a) == 0:
                    c = (b * b + m) // (4 * a)
                    if c > a or (c == a and b >= 0):
                        count += 1
            a += 1
        return count

    for first, hi in ((7, 3000), (8 * 2500 + 7, 8 * 2900)):
        assert _count_class_seven(first, hi).tolist() == [brute(m) for m in range(first, hi + 1, 8)]


def test_theta_chunks_on_a_dask_cluster(tmp_path):
    # the theta engine runs chunk by chunk on a (local) Dask cluster into the resumable
    # store, and agrees row for row with a sweep-built store (common practice, no source)
    distributed = pytest.importorskip("distributed")
    from formkit import build_table, query_table, table_info

    db, ref = str(tmp_path / "theta.db"), str(tmp_path / "sweep.db")
    build_table(ref, -60_000, -3, invariants=False, workers=1, chunk_size=10_000)
    with distributed.LocalCluster(
        n_workers=2, threads_per_worker=1, processes=False, dashboard_address="127.0.0.1:0"
    ) as cluster:
        address = cluster.scheduler_address
        build_table(db, -30_000, -3, invariants=False, chunk_size=10_000, engine="theta", cluster=address)
        s = build_table(db, -60_000, -3, invariants=False, chunk_size=10_000, engine="theta", cluster=address)
    assert (s.chunks_already_done, s.chunks_computed) == (3, 3)
    assert table_info(db)["methods"] == {"theta-relation": [[-60_000, -3]]}
    assert [r.to_dict() for r in query_table(db)] == [r.to_dict() for r in query_table(ref)]
