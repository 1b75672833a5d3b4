"""Benchmark: class polynomials at h = 200, 400, 1000 — H_D, the Weber polynomial, roots mod a 256-bit prime.

Run:  python3 benchmarks/bench_class_polynomials_at_scale.py [--repeat N] [--previous-large] [--invariants-only]

Prints medians of N runs (default 3) of CPU time (``time.process_time``), measured side by
side in one run, for D = −100015 (h = 200), −400095 (h = 400), −2000311 (h = 1000), all
≡ 1 (mod 8) so that the Weber invariant applies:

Columns: "prec" is the working precision in decimal digits, "digits" the length of the
largest coefficient.

* H_D (``verify=False`` and verified) by FLINT's modular j in balls at the precision of
  Σ π√|D|/a plus room;
* the previous path (our own η series in balls at the precision of the proved bound B(D),
  the code on main before this change, rebuilt here from the same modules) for h = 200 and
  400, and for h = 1000 with ``--previous-large`` (about 160 s a run);
* the Weber polynomial (``verify=False`` and verified) and the ratio H_D / Weber;
* the CM step at a 256-bit prime p with 4p = t² − D v²: all roots of the Weber polynomial
  modulo p, their images j, and a curve with p + 1 − t points;
* the Weber polynomials of D = −4m (``formkit.representation.weber_even``; one D per kind
  of invariant at h ≈ 200, and h ≈ 1000): CPU time, the length of the largest coefficient,
  and for h ≈ 200 H_D beside it (for h ≈ 1000 the length of H_D's constant term,
  Σ π√|D|/(a ln 10), stands in for it);
* the double η-quotient polynomials (``formkit.representation.double_eta``, the default pair)
  at h = 200, 204, 400, 1000: CPU time and coefficient lengths beside H_D's (the same
  stand-in at h = 1000).
"""

from __future__ import annotations

import argparse
import math
import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from formkit.analytic.ball_polynomials import certified_integer_coefficients, product_tree
from formkit.analytic.j_function import _j_ball_of_form
from formkit.representation import class_invariants as ci
from formkit.representation import class_polynomials as cp
from formkit.representation import double_eta as de
from formkit.representation.cm_method import cm_curve, cm_prime, polynomial_roots_mod_prime

CASES = [(-100015, 200), (-400095, 400), (-2000311, 1000)]
# D = −4m: m ≡ 6 (mod 8) f1², m ≡ 5 f⁴, m ≡ 3 f (3 ∤ m); then h ≈ 1000 for m ≡ 3 and m ≡ 6
ETA_CASES = [(-100015, 200), (-100556, 204), (-400095, 400), (-2000311, 1000)]
EVEN_CASES = [(-105464, 200), (-100724, 196), (-100556, 204), (-2403884, 990), (-2400056, 980)]


def median_time(fn, repeat: int) -> float:
    """Median CPU seconds of this process over ``repeat`` runs."""
    times = []
    for _ in range(repeat):
        t = time.process_time()
        fn()
        times.append(time.process_time() - t)
    return statistics.median(times)


def previous_path(D: int) -> list[int]:
    """The code on main before this change: own η-series j in balls at B(D)-based precision."""
    from flint import arb_poly, ctx

    forms = cp._reduced_forms(D)
    h = len(forms)
    bound = cp.class_polynomial_bound(D)
    prec = math.ceil(bound * math.log2(10)) + 4 * math.ceil(math.log2(h + 2)) + 64
    factors = []
    with ctx.workprec(prec):
        for a, b, c in forms:
            if b < 0:
                continue
            j = _j_ball_of_form(a, b, D, prec)
            if b == 0 or b == a or a == c:
                factors.append(arb_poly([-j.real, 1]))
            else:
                factors.append(arb_poly([j.real * j.real + j.imag * j.imag, -2 * j.real, 1]))
        coeffs = certified_integer_coefficients(product_tree(factors))
    assert coeffs is not None
    return coeffs


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--quick", action="store_true", help="h = 200 only")
    ap.add_argument("--previous-large", action="store_true", help="also time the previous path at h = 1000")
    ap.add_argument(
        "--invariants-only",
        action="store_true",
        help="only the Weber polynomials of D = -4m and the double eta-quotients",
    )
    args = ap.parse_args()
    r = args.repeat
    print(f"## class polynomials at scale (median CPU seconds of {r} runs)")
    print(
        f"{'D':>9} {'h':>5} {'H prec':>7} {'H s':>7} {'H ver s':>8} {'prev s':>8} {'prev/H':>7}"
        f" {'W prec':>7} {'W s':>6} {'W ver s':>8} {'H/W':>6} {'W digits':>9} {'H digits':>9}"
    )
    rows = []
    for D, h in [] if args.invariants_only else CASES[:1] if args.quick else CASES:

        def hd(verify: bool, D: int = D):
            cp._class_polynomial.cache_clear()
            return cp.class_polynomial(D, verify=verify)

        def wd(verify: bool, D: int = D):
            ci._weber_polynomial.cache_clear()
            return ci.weber_polynomial(D, verify=verify)

        t_h = median_time(lambda: hd(False), r)
        t_hv = median_time(lambda: hd(True), r)
        H = hd(False)
        assert H.degree == h
        t_prev = None
        if h < 1000 or args.previous_large:
            t_prev = median_time(lambda D=D: previous_path(D), r)
            assert tuple(previous_path(D)) == H.coefficients  # same polynomial
        t_w = median_time(lambda: wd(False), r)
        t_wv = median_time(lambda: wd(True), r)
        W = wd(False)
        prev = "-" if t_prev is None else f"{t_prev:.2f}"
        ratio = "-" if t_prev is None else f"{t_prev / t_h:.2f}"
        print(
            f"{D:>9} {h:>5} {H.working_digits:>7} {t_h:>7.2f} {t_hv:>8.2f} {prev:>8} {ratio:>7}"
            f" {math.floor(W.working_bits * math.log10(2)):>7} {t_w:>6.2f} {t_wv:>8.2f} {t_h / t_w:>6.0f}"
            f" {len(str(max(abs(c) for c in W.coefficients))):>9} {len(str(max(abs(c) for c in H.coefficients))):>9}"
        )
        rows.append((D, W))
    print("\n## CM step at a 256-bit prime (median CPU seconds; Weber polynomial already computed)")
    print(f"{'D':>9} {'h':>5} {'roots s':>8} {'curve s':>8} {'roots':>6}")
    for D, W in rows:
        p, t, _v = cm_prime(D, 256)
        t_r = median_time(lambda p=p, W=W: polynomial_roots_mod_prime(W.coefficients, p), r)
        xs = polynomial_roots_mod_prime(W.coefficients, p)
        js = sorted({ci.weber_root_to_j(x, p, D) for x in xs})
        t_c = median_time(lambda D=D, p=p, t=t, js=js: cm_curve(D, p, t, js[0]), r)
        print(f"{D:>9} {W.degree:>5} {t_r:>8.2f} {t_c:>8.2f} {len(js):>6}")
    print("\n## Weber polynomials of D = -4m (median CPU seconds)")
    print(
        f"{'D':>9} {'h':>5} {'invariant':>24} {'W s':>6} {'W ver s':>8} {'W digits':>9} {'H digits':>9}"
        f" {'H s':>6} {'H/W digits':>10} {'roots 256 s':>11}"
    )
    for D, h in EVEN_CASES[:1] if args.quick else EVEN_CASES:

        def we(verify: bool, D: int = D):
            ci._weber_polynomial.cache_clear()
            return ci.weber_polynomial(D, verify=verify)

        t_w = median_time(lambda: we(False), r)
        t_wv = median_time(lambda: we(True), r)
        W = we(False)
        assert W.degree == h
        w_digits = len(str(max(abs(c) for c in W.coefficients)))
        if h <= 400:
            cp._class_polynomial.cache_clear()
            t_h = median_time(
                lambda D=D: (cp._class_polynomial.cache_clear(), cp.class_polynomial(D, verify=False)), r
            )
            H = cp.class_polynomial(D, verify=False)
            h_digits, t_hs = len(str(max(abs(c) for c in H.coefficients))), f"{t_h:.2f}"
        else:  # the constant term's length stands in for H_D's largest coefficient
            h_digits = round(cp._leading_term_bits(D, cp._reduced_forms(D)) * math.log10(2))
            t_hs = "-"
        p, _t, _v = cm_prime(D, 256)
        t_r = median_time(lambda p=p, W=W: polynomial_roots_mod_prime(W.coefficients, p), 1)
        xs = polynomial_roots_mod_prime(W.coefficients, p)
        assert len({ci.weber_root_to_j(x, p, D) for x in xs}) == h
        print(
            f"{D:>9} {h:>5} {W.invariant:>24} {t_w:>6.2f} {t_wv:>8.2f} {w_digits:>9} {h_digits:>9}"
            f" {t_hs:>6} {h_digits / w_digits:>10.1f} {t_r:>11.2f}"
        )

    print("\n## double eta-quotient polynomials (median CPU seconds; polynomial only, no step to j)")
    print(
        f"{'D':>9} {'h':>5} {'pair':>8} {'s':>3} {'W s':>6} {'W ver s':>8} {'W digits':>9} {'H digits':>9} {'H/W':>6}"
    )
    for D, h in ETA_CASES[:1] if args.quick else ETA_CASES:

        def eta(verify: bool, D: int = D):
            de._double_eta_polynomial.cache_clear()
            return de.double_eta_polynomial(D, verify=verify)

        t_w = median_time(lambda: eta(False), r)
        t_wv = median_time(lambda: eta(True), r)
        W = eta(False)
        assert W.degree == h
        w_digits = len(str(max(abs(c) for c in W.coefficients)))
        if h <= 400:
            h_digits = len(str(max(abs(c) for c in cp.class_polynomial(D, verify=False).coefficients)))
        else:
            h_digits = round(cp._leading_term_bits(D, cp._reduced_forms(D)) * math.log10(2))
        print(
            f"{D:>9} {h:>5} {f'{W.p1},{W.p2}':>8} {W.exponent:>3} {t_w:>6.2f} {t_wv:>8.2f} {w_digits:>9}"
            f" {h_digits:>9} {h_digits / w_digits:>6.1f}"
        )


if __name__ == "__main__":
    main()
