"""Commands ``primes`` and ``hilbert``: which primes a form represents; class polynomials."""

from __future__ import annotations

import argparse

from ..core.forms import as_form
from .conventions import (
    add_discriminant_argument,
    add_limit_options,
    discriminant_of,
    form_text,
    integer_type,
    limit_of,
    plural,
)

_SHOWN = 60  # primes listed in the text output by default (all of them with --json or --all)


def _cmd_primes(args: argparse.Namespace) -> int:
    from ..representation.prime_criteria import PrimeCriterion, prime_criterion, represented_primes
    from ..representation.prime_decision import PRIME_BOUND_LIMIT, primes_up_to
    from .conventions import CommandError, emit

    Q = as_form(args.form)
    X = args.bound
    if X > PRIME_BOUND_LIMIT:
        raise CommandError(
            f"--bound must be at most {PRIME_BOUND_LIMIT} (a sieve is kept in memory), not {X}"
        )
    crit: PrimeCriterion = prime_criterion(Q, polynomial=not args.no_polynomial)
    primes = represented_primes(Q, X)
    count_all = len(primes_up_to(X))
    expected = float(crit.density) * count_all
    payload = {
        "form": crit.form.to_list(),
        "discriminant": crit.discriminant,
        "density": f"{crit.density.numerator}/{crit.density.denominator}",
        "criterion": crit.criterion_dict(),
        "exceptions": list(crit.exceptions),
        "primes": primes,
        "class_number": crit.class_number,
        "class_number_narrow": crit.class_number_narrow,
        "class_order": crit.class_order,
        "prime_count": {
            "bound": X,
            "represented": len(primes),
            "primes": count_all,
            "expected": round(expected, 2),
        },
    }

    def human() -> str:
        c = crit
        hs = "h⁺" if c.discriminant > 0 else "h"
        lines = [
            f"form:          {c.form}   {form_text(c.form)}",
            f"discriminant:  {c.discriminant}   class number h = {c.class_number}"
            + (
                f", narrow class number h⁺ = {c.class_number_narrow}; the class of the form has order "
                f"{c.class_order} in Cl⁺({c.discriminant})"
                if c.discriminant > 0
                else f", class of the form has order {c.class_order}"
            ),
            f"density:       {c.density} of all primes "
            + (f"(1/(2{hs}): class of order ≤ 2)" if c.class_order <= 2 else f"(1/{hs}: class of order > 2)"),
        ]
        if c.kind == "congruence":
            lines.append(f"criterion:     congruence modulo {c.modulus}: residues {list(c.residues)}")
        elif c.kind == "class_polynomial":
            if c.polynomial:
                deg = len(c.polynomial) - 1
                head = ", ".join(map(str, c.polynomial[:4])) + (", …" if deg > 3 else "")
                lines.append(
                    f"criterion:     class polynomial of degree {deg}: [{head}]  (formkit hilbert {c.discriminant})"
                )
            else:
                lines.append("criterion:     class of the prime ideal (class polynomial not computed)")
        else:
            lines.append("criterion:     narrow class of the prime ideal above p")
        lines.append(
            f"exceptions:    {list(c.exceptions) or 'none'}  (primes dividing D that the form represents)"
        )
        lines.append("statement:     " + c.statement)
        lines.append("references:    " + c.references)
        limit = limit_of(args)
        listed = primes if limit is None else primes[:limit]
        lines.append(
            f"primes ≤ {X}:  {len(primes)} represented of {plural(count_all, 'prime')} (predicted {expected:.1f})"
        )
        if listed:
            more = len(primes) - len(listed)
            lines.append(
                "  "
                + ", ".join(map(str, listed))
                + (f", … ({more} more: --limit N or --all lists them)" if more else "")
            )
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def _short_list(values: list[int], shown: int = 6) -> str:
    """``[a, b, c, …]`` with at most ``shown`` entries and the count of the rest."""
    if len(values) <= shown:
        return "[" + ", ".join(map(str, values)) + "]"
    return "[" + ", ".join(map(str, values[:shown])) + f", … ({len(values) - shown} more)]"


def _cmd_hilbert(args: argparse.Namespace) -> int:
    from ..representation.class_polynomials import class_polynomial
    from .conventions import CommandError, emit

    D = discriminant_of(args)
    if args.eta_primes is not None and args.invariant != "double-eta":
        raise CommandError("--eta-primes is for --invariant double-eta")
    if args.invariant == "double-eta":
        return _hilbert_double_eta(args, D)
    weber = args.invariant == "weber"
    if weber:
        from ..representation.class_invariants import weber_polynomial

        if args.discriminant_factors:
            raise CommandError("--discriminant-factors is for H_D; leave out --invariant weber")
        from ..representation.class_invariants import weber_invariant_applies

        if not weber_invariant_applies(D):  # D ≡ 5 (mod 8)
            raise CommandError(
                f"--invariant weber: no Weber invariant for D = {D} ≡ 5 (mod 8); there Weber's functions "
                f"generate the ring class field of 4D = {4 * D} (formkit hilbert {4 * D} --invariant weber); "
                "use the default j"
            )
        P = weber_polynomial(D, verify=not args.no_verify)
        payload = P.to_dict()
    else:
        H = class_polynomial(D, verify=not args.no_verify)
        payload = {**H.to_dict(), "invariant": "j"}
    disc = None
    if args.discriminant_factors:
        from ..representation.class_polynomials import class_polynomial_discriminant

        disc = class_polynomial_discriminant(D)
        payload["polynomial_discriminant"] = disc.to_dict()
    roots = None
    if args.roots_mod is not None:
        from ..errors import FormkitError
        from ..representation.class_invariants import weber_root_to_j
        from ..representation.cm_method import polynomial_roots_mod_prime

        p = args.roots_mod
        try:
            xs = polynomial_roots_mod_prime(payload["coefficients"], p)
        except FormkitError as exc:
            raise CommandError(f"--roots-mod: {exc}") from None
        js = sorted({weber_root_to_j(x, p, D) for x in xs if x}) if weber else xs
        roots = {"p": p, "roots": xs, "j_invariants": js}
        payload["roots_mod_p"] = roots
    curve = None if args.cm_curve is None else _cm_curve_payload(D, args.cm_curve, "weber" if weber else "j")
    if curve is not None:
        payload["cm_curve"] = curve

    def human() -> str:
        if weber:
            lines = [
                f"discriminant:  {P.discriminant}   (Weber class polynomial, degree h = {P.degree}; roots: "
                f"{P.invariant} and its conjugates, m = {payload['m']})",
                f"W(x) = {P}",
                f"j-invariants: for every root x, {P.j_relation.replace(', ', ' with ', 1)} is a root of H_D",
            ]
            v = P.verification
            lines.append(
                f"certified: ball arithmetic at {P.working_bits} bits, every coefficient ball holds exactly one integer"
                + (
                    ""
                    if v is None
                    else f"; root counts mod {list(v.primes_checked)} match the prime-form classes"
                )
            )
        else:
            lines = [
                f"discriminant:  {H.discriminant}   ({'Hilbert' if H.kind == 'Hilbert' else 'ring'} class polynomial, "
                f"degree h = {H.degree})",
                f"H(x) = {H}",
            ]
            v = H.verification
            if v is None:
                lines.append(
                    f"certified by ball arithmetic ({H.working_digits} digits: every coefficient ball holds exactly one "
                    "integer); bound and root-count checks skipped (--no-verify)"
                )
            else:
                lines.append(
                    f"certified: ball arithmetic at {v.precision_bits} bits, every coefficient ball (radius "
                    f"< 2^{v.radius_log2}) holds exactly one integer; coefficients < 10^{v.bound_digits} (stated bound); root counts "
                    f"mod {list(v.primes_checked)} match the prime-form classes"
                )
        if disc is not None:
            sign = "-" if disc.value < 0 else ""
            fac = " * ".join(f"{p}^{e}" if e > 1 else str(p) for p, e in disc.factors) or "1"
            rest = (
                ""
                if disc.complete
                else f" * {disc.cofactor} (not factored by trial division to {disc.trial_bound})"
            )
            n = len(str(abs(disc.value)))
            lines.append(f"disc(H) = {sign}{fac}{rest}   ({n} digit{'s' if n != 1 else ''})")
        if roots is not None:
            name = "W" if weber else "H"
            lines.append(
                f"roots of {name} mod {roots['p']}: {plural(len(roots['roots']), 'root')} {_short_list(roots['roots'])}"
            )
            if weber:
                lines.append(
                    f"  their images j, roots of H_D mod {roots['p']}: {_short_list(roots['j_invariants'])}"
                )
        if curve is not None:
            lines.append(
                f"CM curve: p = {curve['p']} ({args.cm_curve} bits), 4p = t^2 + {-D}*v^2 with t = {curve['trace']}, "
                f"v = {curve['v']}; j = {curve['j']} (one of {curve['roots_found']} roots of H_D mod p)"
            )
            lines.append(
                f"  y^2 = x^3 + {curve['a4']}x + {curve['a6']} has p + 1 - t = {curve['order']} points "
                f"([p + 1 - t]P = O checked for {curve['points_checked']} random points P)"
            )
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def _cm_curve_payload(D: int, bits: int, invariant: str, primes=None) -> dict:
    """``--cm-curve BITS``: a CM prime of that size, the roots of H_D through ``invariant`` and a curve."""
    from ..representation.cm_method import cm_curve, cm_j_invariants, cm_prime
    from .conventions import CommandError

    if D >= -4:
        raise CommandError(f"--cm-curve needs D < -4 (j ≠ 0, 1728), not {D}")
    if not 16 <= bits <= 1024:
        raise CommandError(f"--cm-curve BITS must be in [16, 1024], not {bits}")
    p, t, v = cm_prime(D, bits)
    js = cm_j_invariants(D, p, invariant=invariant, **({"primes": primes} if primes is not None else {}))
    return {**cm_curve(D, p, t, js[0]).to_dict(), "v": v, "roots_found": len(js)}


def _hilbert_double_eta(args: argparse.Namespace, D: int) -> int:
    """``hilbert --invariant double-eta``: the polynomial, and with ``--roots-mod`` / ``--cm-curve``
    the step to ``j`` through the modular polynomial ``Ψ(w^s, j)`` (pairs of degree 2 in ``j``)."""
    from ..errors import FormkitError
    from ..representation.double_eta import double_eta_polynomial
    from .conventions import CommandError, emit

    if args.discriminant_factors:
        raise CommandError(
            "--discriminant-factors is not available with --invariant double-eta: it is for H_D; "
            "leave out --invariant double-eta"
        )
    wants_j = args.roots_mod is not None or args.cm_curve is not None
    primes = None
    if args.eta_primes is not None:
        parts = args.eta_primes.replace(" ", "").split(",")
        if len(parts) != 2 or not all(x.isdigit() for x in parts):
            raise CommandError(f"--eta-primes must be two primes P1,P2 such as 3,13, not {args.eta_primes!r}")
        primes = (int(parts[0]), int(parts[1]))
    try:
        if wants_j and primes is None:
            from ..representation.cm_method import double_eta_cm_pair

            primes = double_eta_cm_pair(D)
        P = double_eta_polynomial(D, primes, verify=not args.no_verify)
        Psi = None
        if wants_j:
            from ..representation.double_eta_modular import double_eta_modular_polynomial

            Psi = double_eta_modular_polynomial(P.p1, P.p2)
            if Psi.degree_j != 2:
                raise CommandError(
                    f"--roots-mod and --cm-curve with --invariant double-eta need a pair whose modular "
                    f"polynomial has degree 2 in j (3,5 3,7 3,13 5,7 2,3 2,5 2,7 2,13); that of {P.p1},{P.p2} has degree "
                    f"{Psi.degree_j}, and formkit does not choose among its roots"
                )
    except FormkitError as exc:
        raise CommandError(f"--invariant double-eta: {exc}") from None
    pair = (P.p1, P.p2)
    payload = P.to_dict()
    if Psi is not None:
        payload["modular_polynomial"] = Psi.to_dict()
    roots = None
    if args.roots_mod is not None:
        from ..representation.cm_method import double_eta_roots_to_j, polynomial_roots_mod_prime

        p = args.roots_mod
        try:
            xs = polynomial_roots_mod_prime(P.coefficients, p)
        except FormkitError as exc:
            raise CommandError(f"--roots-mod: {exc}") from None
        js = sorted({j for x in xs if x for j in double_eta_roots_to_j(x, p, pair)})
        roots = {"p": p, "roots": xs, "j_invariants": js}
        payload["roots_mod_p"] = roots
    curve = None if args.cm_curve is None else _cm_curve_payload(D, args.cm_curve, "double-eta", pair)
    if curve is not None:
        payload["cm_curve"] = curve

    def human() -> str:
        lines = [
            f"discriminant:  {D}   (double eta-quotient class polynomial, degree h = {P.degree}; roots: "
            f"{P.invariant} at an N-system of forms and its conjugates)",
            f"W(x) = {P}",
            f"j-invariants: {P.j_relation}",
            f"certified: ball arithmetic at {P.working_bits} bits, imaginary parts contain 0 and every real part "
            "holds exactly one integer; squarefree (exact gcd with W')"
            + (
                ""
                if not P.primes_checked
                else f"; root counts mod {list(P.primes_checked)} match the prime-form classes"
            ),
        ]
        if Psi is not None:
            lines.append(
                f"modular polynomial: Psi(X, J) of degree {Psi.degree_x} in X, {Psi.degree_j} in J "
                f"({Psi.coefficient_bits}-bit coefficients; {Psi._display_provenance()})"
            )
        if roots is not None:
            lines.append(
                f"roots of W mod {roots['p']}: {plural(len(roots['roots']), 'root')} {_short_list(roots['roots'])}"
            )
            lines.append(
                f"  the roots j of Psi(x, J), roots of H_D mod {roots['p']}: {_short_list(roots['j_invariants'])}"
            )
        if curve is not None:
            lines.append(
                f"CM curve: p = {curve['p']} ({args.cm_curve} bits), 4p = t^2 + {-D}*v^2 with t = {curve['trace']}, "
                f"v = {curve['v']}; j = {curve['j']} (one of {curve['roots_found']} roots of H_D mod p, "
                f"from the roots of W and Psi)"
            )
            lines.append(
                f"  y^2 = x^3 + {curve['a4']}x + {curve['a6']} has p + 1 - t = {curve['order']} points "
                f"([p + 1 - t]P = O checked for {curve['points_checked']} random points P)"
            )
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def register(sub: argparse._SubParsersAction, parent: argparse.ArgumentParser) -> None:
    """Add the ``primes`` and ``hilbert`` commands."""
    p = sub.add_parser(
        "primes",
        parents=[parent],
        help="which primes a form represents: criterion, density, and the list up to a bound",
        description=(
            "Describe the primes represented by a primitive form: a congruence criterion modulo |D| "
            "when the genus of the form is {Q, Q^-1} (exactly then one exists), else the class-polynomial criterion (D < 0) or "
            "the ideal-class criterion (D > 0); the Chebotarev density (among all primes); the "
            "primes dividing D that it represents; and every prime up to the bound that it represents. "
            "Python: formkit.prime_criterion(form), formkit.represented_primes(form, upto)."
        ),
        epilog=(
            "examples:\n  formkit primes 1,0,27 --bound 1000\n  formkit primes 'x^2 + 5y^2' --bound 10^6 --json\n"
            "  formkit primes 1,0,-79 --bound 500"
        ),
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("form", help="the form: a,b,c or [a,b,c] or a polynomial such as 'x^2+27y^2'")
    p.add_argument(
        "--bound",
        type=integer_type("--bound", 0),
        default=1000,
        metavar="X",
        help="the represented primes p ≤ X (default 1000; at most 10^8)",
    )
    add_limit_options(p, "represented primes in the text output", _SHOWN)
    p.add_argument(
        "--no-polynomial",
        action="store_true",
        help="do not compute the class polynomial (for discriminants of large class number)",
    )
    p.set_defaults(handler=_cmd_primes)

    q = sub.add_parser(
        "hilbert",
        parents=[parent],
        help="the Hilbert (or ring) class polynomial H_D(x) of a negative discriminant",
        description=(
            "Compute the class polynomial of a negative discriminant D from the j-invariants of the "
            "reduced forms in ball arithmetic, the rounding to integers certified (every coefficient ball "
            "holds exactly one integer) and checked (coefficient bound, roots modulo small primes). For "
            "fundamental D this is the Hilbert class polynomial, otherwise the ring class polynomial of "
            "the order. With --invariant weber the Weber class polynomial instead: the same class field, "
            "coefficients 3 to 72 times shorter (D ≡ 1 mod 8: f(sqrt(-m))/sqrt(2), m = -D, 72 times, its cube "
            "when 3 | D; D = -4m: F(sqrt(-m))^k/sqrt(2)^e with F = f or f1 and k, e by m mod 8, 72/k times; "
            "not for D ≡ 5 mod 8); with --invariant double-eta that of a double eta-quotient w_{p1,p2}^s. --roots-mod P gives "
            "the roots modulo a prime (for Weber and double-eta also the roots j of H_D; double-eta through "
            "the modular polynomial Psi(w^s, j), for the pairs 3,5 3,7 3,13 5,7 2,3 2,5 2,7 2,13 of degree 2 in j), --cm-curve BITS an elliptic curve over a prime field of "
            "that size with complex multiplication by the order of discriminant D. "
            "Python: formkit.class_polynomial(D), formkit.weber_polynomial(D), formkit.double_eta_polynomial(D), "
            "formkit.cm_prime, "
            "formkit.cm_curve (and formkit.class_polynomial_discriminant(D))."
        ),
        epilog=(
            "examples:\n  formkit hilbert -23\n  formkit hilbert -108 --json\n  formkit hilbert -56 --discriminant-factors\n"
            "  formkit hilbert -71 --invariant weber --roots-mod 10007\n"
            "  formkit hilbert -191 --invariant weber --cm-curve 256\n"
            "  formkit hilbert -56 --invariant weber --roots-mod 10007\n"
            "  formkit hilbert -191 --invariant double-eta\n"
            "  formkit hilbert -191 --invariant double-eta --cm-curve 256"
        ),
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    add_discriminant_argument(q, "a negative discriminant, D ≡ 0 or 1 (mod 4)")
    q.add_argument("--no-verify", action="store_true", help="skip the verification (faster)")
    q.add_argument(
        "--discriminant-factors",
        action="store_true",
        help="also compute disc(H) exactly and its prime factors (the primes the class-polynomial "
        "criterion for p = x^2 + ny^2 must exclude)",
    )
    q.add_argument(
        "--invariant",
        choices=("j", "weber", "double-eta"),
        default="j",
        help="j: the class polynomial H_D (default); weber: the Weber class polynomial of "
        "f(sqrt(-m))/sqrt(2) (D ≡ 1 mod 8, m = -D; cubed when 3 | D) or of F(sqrt(-m))^k/sqrt(2)^e "
        "with F = f or f1 and k, e by m mod 8 (D = -4m); double-eta: the class polynomial of the "
        "double eta-quotient w_{p1,p2}^s (Enge-Schertz; the step to j with --roots-mod and --cm-curve "
        "for the pairs 3,5 3,7 3,13 5,7 2,3 2,5 2,7 2,13)",
    )
    q.add_argument(
        "--eta-primes",
        default=None,
        metavar="P1,P2",
        help="with --invariant double-eta: the two primes, odd or 2,3 2,5 2,7 2,13 (neither inert, not both ramified; "
        "default the pair of largest gain among 3,13 5,7 5,13 7,13 3,7 3,5 ... that suits D; with "
        "--roots-mod or --cm-curve the first of 3,13 5,7 3,7 3,5 that suits D)",
    )
    q.add_argument(
        "--roots-mod",
        type=integer_type("--roots-mod", 3),
        default=None,
        metavar="P",
        help="also the roots of the polynomial modulo the odd prime P (any size, e.g. 2^255-19)",
    )
    q.add_argument(
        "--cm-curve",
        type=integer_type("--cm-curve", 16),
        default=None,
        metavar="BITS",
        help="also a prime p of BITS bits with 4p = t^2 - D v^2 and a curve over F_p with p + 1 - t "
        "points whose j is a root of H_D mod p (the CM method)",
    )
    q.set_defaults(handler=_cmd_hilbert)


__all__ = ["register"]
