"""Class numbers of the real quadratic fields Q(sqrt(4m^2 + 1)), far beyond enumeration.

Scenario
--------
A researcher studies the fields K = Q(sqrt(D)), D = 4m^2 + 1 (squarefree, so D is a
fundamental discriminant).  Their fundamental unit is eps = 2m + sqrt(D), of norm -1, so
the regulator R = log(2m + sqrt(D)) is tiny and, by the class number formula
h * R = sqrt(D) * L(1, chi_D) / 2, the class number h is huge: about sqrt(D)/log(D).
Listing the classes is hopeless beyond D ~ 10^12, and walking a cycle does not help
either.  The researcher

1. checks the classical small cases: for squarefree 4m^2 + 1 with m < 60, h = 1 exactly
   for m = 1, 2, 3, 5, 7, 13 (Chowla's conjecture, proved by Biro in 2003; from memory),
   both by enumeration (unconditional) and by the infrastructure method of
   formkit.classgroups.infrastructure (conditional on GRH), which must agree;
2. computes h and R for m = 10^3, ..., 10^10 (D up to 4*10^20 + 1) with
   formkit.real_class_number, and checks R against the exact log(2m + sqrt(D)) and the
   norm of the unit against -1;
3. computes the narrow class group for m = 10^4, where enumeration still works, by both
   methods, and for m = 10^9 by the infrastructure only;
4. prints, for each large result, how it was obtained (conditional on GRH, with the
   prime bound of the Euler product whose interval fixed h).

Run:  python examples/real_fields_beyond_enumeration.py
"""

from __future__ import annotations

import math
import time

from formkit.classgroups.dispatch import class_group
from formkit.classgroups.infrastructure import real_class_group, real_class_number
from formkit.core.arith import factorint


def squarefree(n: int) -> bool:
    return all(e == 1 for e in factorint(n).values())


def verdict(ok: bool) -> str:
    return "agrees" if ok else "DISAGREE"


def main() -> None:
    print("1. class number one among squarefree 4m^2+1, m < 60")
    ones_enum, ones_infra = [], []
    for m in range(1, 60):
        D = 4 * m * m + 1
        if not squarefree(D):
            continue
        if class_group(D, method="enumerate").class_number_wide == 1:
            ones_enum.append(m)
        if real_class_number(D).class_number_wide == 1:
            ones_infra.append(m)
    print(f"   enumeration:    h = 1 for m in {ones_enum}")
    print(f"   infrastructure: h = 1 for m in {ones_infra}")
    print(
        f"   Biro's theorem: h = 1 for m in [1, 2, 3, 5, 7, 13]: {verdict(ones_enum == ones_infra == [1, 2, 3, 5, 7, 13])}"
    )

    print("\n2. m = 10^k: class number and regulator")
    print(f"   {'k':>2} {'D':>24} {'h':>14} {'R':>12}  {'sqrt(D)/log(D)':>15}  time    check")
    last = None
    for k in range(3, 11):
        m = 10**k
        D = 4 * m * m + 1
        if not squarefree(D):
            print(f"   {k:>2} {D:>24}  (not squarefree: skipped)")
            continue
        t = time.perf_counter()
        r = real_class_number(D)
        dt = time.perf_counter() - t
        exact_R = math.log(2 * m + math.sqrt(D))
        ok = (
            abs(r.regulator - exact_R) < 1e-9 * exact_R
            and r.unit_norm == -1
            and r.class_number == r.class_number_wide
        )
        print(
            f"   {k:>2} {D:>24} {r.class_number:>14} {r.regulator:>12.6f}  {math.sqrt(D) / math.log(D):>15.0f}"
            f"  {dt:5.2f}s  {verdict(ok)}"
        )
        last = r
    if last is not None:
        print(f"   how: {last.provenance}")

    print("\n3. the narrow class group")
    D = 4 * 10**8 + 1
    E = class_group(D, method="enumerate")
    G = real_class_group(D)
    print(
        f"   D = {D}: enumeration {E.structure}, infrastructure {G.structure}: {verdict(E.invariants == G.invariants)}"
    )
    D = 4 * 10**18 + 1
    G = real_class_group(D)
    gens_ok = [g.order for g in G.generators] == list(G.invariants)
    print(
        f"   D = {D}: {G.structure} (order {G.order}); generators have the stated orders: {verdict(gens_ok)}"
    )
    print(
        f"   how: {G.provenance.method}, conditional on {G.provenance.assumption} (bound {G.provenance.bound})"
    )


if __name__ == "__main__":
    main()
