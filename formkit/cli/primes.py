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


def _cmd_hilbert(args: argparse.Namespace) -> int:
    from ..representation.class_polynomials import class_polynomial
    from .conventions import emit

    D = discriminant_of(args)
    H = class_polynomial(D, verify=not args.no_verify)
    payload = H.to_dict()
    disc = None
    if args.discriminant_factors:
        from ..representation.class_polynomials import class_polynomial_discriminant

        disc = class_polynomial_discriminant(D)
        payload["polynomial_discriminant"] = disc.to_dict()

    def human() -> str:
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
            "reduced forms, rounded to integers and verified (second computation at higher precision, "
            "rounding residuals, coefficient bound, roots modulo small primes). For fundamental D this "
            "is the Hilbert class polynomial, otherwise the ring class polynomial of the order. "
            "Python: formkit.class_polynomial(D) (and formkit.class_polynomial_discriminant(D))."
        ),
        epilog="examples:\n  formkit hilbert -23\n  formkit hilbert -108 --json\n  formkit hilbert -56 --discriminant-factors",
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
    q.set_defaults(handler=_cmd_hilbert)


__all__ = ["register"]
