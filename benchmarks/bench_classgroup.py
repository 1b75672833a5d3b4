"""Benchmark: class group enumeration and structure; NUCOMP against plain composition.

Run:  python3 benchmarks/bench_classgroup.py [--repeat N] [--quick] [--seed S]

Prints, measured side by side in one run:

* **Enumeration** of all reduced forms (``class_number``) and the **full structure**
  (``class_group``: enumeration, the relation lattice, its Smith normal form, generators
  and the discrete-log table) for random negative discriminants with |D| ≈ 10^6, 10^8,
  10^10 (and, for information, random positive D ≈ 10^6, 10^8).  Caches are cleared
  before every timing, so each figure is a cold computation (CPU time).  Medians over
  several random D of each size.
* **Composition** of random reduced forms at |D| ≈ 10^20, 10^100, 10^400: Shanks'
  NUCOMP (and NUDUPL for squares) against Dirichlet composition followed by Gauss
  reduction, on the *same* pairs of forms, timings interleaved (A, B, A, B, …) so that
  machine load affects both alike; the ratio is plain / NUCOMP (> 1 means NUCOMP is
  faster).  Both the raw integer cores and the public ``compose`` are timed, and the
  results are checked to be equal.
* **Powering** ``power(F, k)`` with a k of about |D|^(1/2), NUCOMP/NUDUPL vs Dirichlet.
"""

from __future__ import annotations

import argparse
import random
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from formkit.classgroups import dispatch as cg_module
from formkit.classgroups.dispatch import class_group
from formkit.core import arith as arith_module
from formkit.core import discriminants as disc_module
from formkit.core import enumeration as enum_module
from formkit.core import modular_roots as roots_module
from formkit.core.arith import isqrt, kronecker, mpz, next_prime
from formkit.core.composition import (
    _compose_raw,
    _nucomp_bound,
    _nucomp_raw,
    _nudupl_raw,
    compose,
    power,
)
from formkit.core.enumeration import class_number
from formkit.core.modular_roots import sqrt_mod_prime
from formkit.core.raw_reduction import _reduce_definite_raw


def clear_caches() -> None:
    """Empty every memo the computation could reuse (lists of forms, groups, and the
    factorisations / square roots memoised in formkit.core.arith and formkit.core.modular_roots),
    so each timing is cold."""
    for module in (arith_module, roots_module, enum_module, cg_module, disc_module):
        for name in dir(module):
            clear = getattr(getattr(module, name), "cache_clear", None)
            if callable(clear):
                clear()
    cg_module._GROUP_CACHE.clear()


def timed(fn) -> float:
    """CPU time of one call (process time, so other processes on the machine do not count)."""
    t = time.process_time()
    fn()
    return time.process_time() - t


def random_discriminant(rng: random.Random, exponent: int, sign: int) -> int:
    while True:
        n = rng.randrange(10**exponent, 2 * 10**exponent)
        D = sign * n
        if D % 4 in (0, 1) and not (D > 0 and isqrt(D) ** 2 == D):
            return D


def bench_enumeration(rng: random.Random, repeat: int, quick: bool) -> None:
    print(f"## enumeration and structure (cold caches; median over {repeat} random D per size)")
    print(
        f"{'|D| ~':>8} {'sign':>4} {'median h':>9} {'enumerate s':>12} {'structure s':>12} {'example invariants'}"
    )
    sizes = [(6, -1), (8, -1), (10, -1), (6, 1), (8, 1)]
    if quick:
        sizes = [(6, -1), (8, -1), (6, 1)]
    class_group(-23)  # import sympy's Smith normal form once, outside the timings
    for exponent, sign in sizes:
        reps = max(3, repeat if exponent < 10 else repeat // 2 + 1)
        t_enum, t_struct, hs = [], [], []
        example = None
        # warm-up on another D of this size (sympy extends its prime sieve lazily, once)
        clear_caches()
        class_number(random_discriminant(rng, exponent, sign))
        for _ in range(reps):
            D = random_discriminant(rng, exponent, sign)
            clear_caches()
            t_enum.append(timed(lambda: class_number(D)))
            clear_caches()
            box = {}
            t_struct.append(timed(lambda: box.setdefault("G", class_group(D))))
            G = box["G"]
            hs.append(G.order)
            example = (D, G.invariants)
        inv = " x ".join(f"C{n}" for n in example[1]) or "C1"
        print(
            f"{'10^' + str(exponent):>8} {'+' if sign > 0 else '-':>4} {statistics.median(hs):>9.0f} "
            f"{statistics.median(t_enum):>12.3f} {statistics.median(t_struct):>12.3f} D={example[0]}: {inv}"
        )
    print()


def random_reduced_form(rng: random.Random, D: int):
    """A random primitive reduced form of D < 0: a prime form (p, b, ·) with p ≈ √|D|, reduced."""
    root = int(isqrt(-D))
    while True:
        p = int(next_prime(rng.randrange(max(3, root // 8), max(5, root))))
        if kronecker(D, p) != 1:
            continue
        r = int(sqrt_mod_prime(D % p, p))
        b = r if (r - D) % 2 == 0 else p - r
        return _reduce_definite_raw(mpz(p), mpz(b), mpz((b * b - D) // (4 * p)))


def interleaved(fa, fb, items, rounds: int) -> tuple[float, float]:
    """Per-call CPU-time medians (seconds) of fa and fb over ``items``.

    Each item is run as A then B back to back, so both see the same machine state;
    per-round totals are divided by the number of items and the median over rounds
    is returned.
    """
    ta, tb = [], []
    clock = time.process_time
    for _ in range(rounds):
        sa = sb = 0.0
        for it in items:
            t0 = clock()
            fa(*it)
            t1 = clock()
            fb(*it)
            t2 = clock()
            sa += t1 - t0
            sb += t2 - t1
        ta.append(sa / len(items))
        tb.append(sb / len(items))
    return statistics.median(ta), statistics.median(tb)


def bench_composition(rng: random.Random, repeat: int, quick: bool) -> None:
    print(
        f"## NUCOMP vs Dirichlet composition + reduction (same inputs, interleaved; median of {repeat} rounds)"
    )
    print(f"{'|D| ~':>8} {'operation':<28} {'Dirichlet us':>13} {'NUCOMP us':>10} {'ratio':>6}")
    exponents = [20, 100, 400] if not quick else [20, 100]
    npairs = 40
    for e in exponents:
        D = random_discriminant(rng, e, -1)
        Dz = mpz(D)
        L = _nucomp_bound(D)
        pairs = [(random_reduced_form(rng, D), random_reduced_form(rng, D)) for _ in range(npairs)]

        # correctness on these very inputs
        for f, g in pairs:
            plain = _reduce_definite_raw(*_compose_raw(*f, *g, Dz))
            assert _nucomp_raw(*f, *g, Dz, L) == plain
            assert _nudupl_raw(*f, Dz, L) == _reduce_definite_raw(*_compose_raw(*f, *f, Dz))

        def dir_mul(f, g):
            return _reduce_definite_raw(*_compose_raw(*f, *g, Dz))

        def nuc_mul(f, g):
            return _nucomp_raw(*f, *g, Dz, L)

        def dir_sqr(f, g):
            return _reduce_definite_raw(*_compose_raw(*f, *f, Dz))

        def nuc_sqr(f, g):
            return _nudupl_raw(*f, Dz, L)

        forms = [(tuple(int(v) for v in f), tuple(int(v) for v in g)) for f, g in pairs]

        def pub_dir(f, g):
            return compose(f, g, method="dirichlet")

        def pub_nuc(f, g):
            return compose(f, g, method="nucomp")

        rows = [
            ("product (raw cores)", dir_mul, nuc_mul, pairs),
            ("square (raw; NUDUPL)", dir_sqr, nuc_sqr, pairs),
            ("product (public compose)", pub_dir, pub_nuc, forms),
        ]
        for label, fa, fb, items in rows:
            ta, tb = interleaved(fa, fb, items, repeat)
            print(f"{'10^' + str(e):>8} {label:<28} {ta * 1e6:>13.1f} {tb * 1e6:>10.1f} {ta / tb:>6.2f}")

        # powering with an exponent of about √|D|
        k = rng.randrange(int(isqrt(-D)), 2 * int(isqrt(-D)))
        F = forms[0][0]
        assert power(F, k, method="nucomp") == power(F, k, method="dirichlet")
        ta, tb = interleaved(
            lambda: power(F, k, method="dirichlet"),
            lambda: power(F, k, method="nucomp"),
            [()],
            max(5, repeat),
        )
        label = f"power, k ~ 10^{len(str(k)) - 1}"
        print(f"{'10^' + str(e):>8} {label:<28} {ta * 1e6:>13.0f} {tb * 1e6:>10.0f} {ta / tb:>6.2f}")
    print()


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=7, help="random D per size / timing rounds (default 7)")
    ap.add_argument("--quick", action="store_true", help="smaller sizes only")
    ap.add_argument("--seed", type=int, default=2024, help="random seed (default 2024)")
    args = ap.parse_args()
    rng = random.Random(args.seed)
    bench_enumeration(rng, args.repeat, args.quick)
    bench_composition(rng, args.repeat, args.quick)


if __name__ == "__main__":
    main()
