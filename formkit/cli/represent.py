"""Commands ``represent`` and ``genera``: solutions of Q(x, y) = N, and genus theory."""

from __future__ import annotations

import argparse

from ..core.forms import as_form
from ..core.parse import parse_integer
from .conventions import add_discriminant_argument, add_limit_options, form_text, limit_of, plural


def _parse_factors(text: str) -> dict:
    """``'3^2*5*7^3'`` (or separated by spaces or commas) -> ``{3: 2, 5: 1, 7: 3}``; no evaluation."""
    from .conventions import CommandError

    tokens = [t for t in text.replace("*", " ").replace(",", " ").split() if t]
    if not tokens:
        raise CommandError(f"--factors must look like 3^2*5*7, not {text!r}")
    out: dict = {}
    for tok in tokens:
        base, _, exp = tok.partition("^")
        if not (base.isascii() and base.isdigit()) or (exp and not (exp.isascii() and exp.isdigit())):
            raise CommandError(
                f"--factors must look like 3^2*5*7 (primes and exponents in digits), not {tok!r}"
            )
        p, e = int(base), int(exp) if exp else 1
        out[p] = out.get(p, 0) + e
    return out


def _cmd_represent(args: argparse.Namespace) -> int:
    from ..core.equivalence import fundamental_automorph
    from ..representation.representations import represent
    from .conventions import emit

    Q = as_form(args.form)
    n = parse_integer(args.n, "N")
    limit = limit_of(args)
    factors = _parse_factors(args.factors) if args.factors is not None else None
    res = represent(Q, n, primitive=args.primitive, limit=limit, factors=factors)
    payload = res.to_dict()

    def human() -> str:
        D = Q.discriminant
        lines = [f"form: {Q}   {form_text(Q)}   (D = {D}, {Q.kind})", f"N = {n}"]
        which = "primitive solutions" if args.primitive else "solutions"
        if res.definite:
            assert res.count is not None  # definite forms always have a finite count
            lines.append(
                f"{plural(res.count, 'solution')} in all, {res.primitive_count} primitive (gcd(x, y) = 1)"
            )
            if res.solutions:
                lines.append(f"{which}{' (first ' + str(len(res.solutions)) + ')' if res.truncated else ''}:")
                lines.extend(f"  ({x}, {y})" for x, y in res.solutions)
            return "\n".join(lines)
        if n == 0:
            lines.append("only the solution (0, 0) (the discriminant is not a square)")
            return "\n".join(lines)
        if not res.orbit_count:
            lines.append("no solutions")
            return "\n".join(lines)
        A = fundamental_automorph(Q)
        lines.append(
            f"infinitely many solutions in {plural(res.orbit_count, 'orbit')} "
            f"({res.primitive_orbit_count} of them of primitive solutions) under ±A^k, "
            f"A = [[{A[0][0]}, {A[0][1]}], [{A[1][0]}, {A[1][1]}]]"
        )
        lines.append(
            f"one {which[:-1]} per orbit (least x^2 + y^2){' (first ' + str(len(res.orbits)) + ')' if res.truncated else ''}:"
        )
        lines.extend(f"  ({x}, {y})" for x, y in res.orbits)
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def _cmd_genera(args: argparse.Namespace) -> int:
    from ..classgroups.genus import genera
    from .conventions import discriminant_of, emit

    D = discriminant_of(args)
    P = genera(D)
    payload = P.to_dict()

    def human() -> str:
        lines = [
            f"discriminant {D}: {P.class_number} {'narrow ' if D > 0 else ''}classes in {P.count} genera "
            f"(2^(mu-1) with mu = {len(P.characters)} assigned characters)",
            "characters: " + (", ".join(f"{c.name} = {c.formula}" for c in P.characters) or "none"),
        ]
        for g in P:
            sym = " ".join("+" if s > 0 else "-" for s in g.symbol) or "(empty)"
            label = "principal genus" if g.is_principal else "genus"
            lines.append(f"{label} [{sym}]: " + ", ".join(form_text(f) for f in g.forms))
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def register(sub: argparse._SubParsersAction, parent: argparse.ArgumentParser) -> None:
    """Add the ``represent`` and ``genera`` commands."""
    raw = argparse.RawDescriptionHelpFormatter
    p = sub.add_parser(
        "represent",
        parents=[parent],
        help="all solutions of Q(x, y) = N (definite Q) or one per orbit (indefinite Q)",
        description=(
            "Solve Q(x, y) = N by the square-root method (roots of b^2 = D mod 4N, reduction of "
            "(N, b, (b^2 - D)/4N), the equivalence matrix giving (x, y)). For definite forms: the number "
            "of all and of primitive solutions and the list; for indefinite forms the solutions form "
            "infinitely many orbits under the automorphs: one solution per orbit is listed, the one "
            "with the least x^2 + y^2 (the same as in formkit explain represent), and count is null. N may be a large integer; it must be factorable. "
            "Python: formkit.represent(form, N, primitive=..., limit=..., factors=...)."
        ),
        epilog=(
            "examples:\n  formkit represent 'x^2+y^2' 325\n  formkit represent 2,1,3 18 --json\n"
            "  formkit represent 'x^2-2y^2' 119 --primitive\n"
            "  formkit represent 1,0,1 10^40 --limit 5\n"
            "  formkit represent 1,0,1 1625 --factors 5^3*13"
        ),
        formatter_class=raw,
    )
    p.add_argument("form", help="the form: a,b,c or [a,b,c] or a polynomial such as '2x^2+xy+3y^2'")
    p.add_argument(
        "n",
        metavar="N",
        help="the integer to represent: digits of any length, or a power of ten such as 3*10^20",
    )
    p.add_argument("--primitive", action="store_true", help="list only primitive solutions (gcd(x, y) = 1)")
    add_limit_options(p, "solutions or orbit representatives (the counts stay exact)", None)
    p.add_argument(
        "--factors",
        metavar="FACTORS",
        default=None,
        help="the factorisation of |N| if known, e.g. 3^2*5*7 (checked: primes whose product is |N|); "
        "saves factoring a large N",
    )
    p.set_defaults(handler=_cmd_represent)

    g = sub.add_parser(
        "genera",
        parents=[parent],
        help="the assigned characters of D and its classes sorted into genera",
        description=(
            "Genus theory of discriminant D: the assigned characters (odd primes dividing D, and delta, "
            "epsilon or delta*epsilon at 2 as D mod 32 calls for), the genus symbol of every class and the "
            "partition into 2^(mu-1) genera, principal genus first. For D > 0 the classes are narrow "
            "classes. Python: formkit.genera(D)."
        ),
        epilog="examples:\n  formkit genera -84\n  formkit genera -4620 --json\n  formkit genera 316",
        formatter_class=raw,
    )
    add_discriminant_argument(g, "the discriminant (e.g. -84, 316)")
    g.set_defaults(handler=_cmd_genera)


__all__ = ["register"]
