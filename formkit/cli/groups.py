"""Commands ``group``, ``class-number``, ``compose`` and ``power``: class groups and composition."""

from __future__ import annotations

import argparse

from ..classgroups.dispatch import class_group, class_number_summary
from ..core.composition import compose, power
from ..core.forms import as_form
from ..core.parse import parse_integer
from .conventions import add_discriminant_argument, discriminant_of, integer_type


def _cmd_group(args: argparse.Namespace) -> int:
    from .conventions import emit

    D = discriminant_of(args)
    G = class_group(D, method=args.method)
    payload = G.to_dict()

    def human() -> str:
        prov = G.provenance
        lines = [
            f"discriminant {G.discriminant} = {G.conductor}^2 * {G.fundamental_discriminant}"
            if G.conductor > 1
            else f"discriminant {G.discriminant} (fundamental)",
            f"{'narrow class group' if G.is_narrow else 'class group'}: {G.structure}   (order {G.order})",
        ]
        if G.discriminant > 0:
            lines.append(f"class number, wide sense: {payload['class_number_wide']}")
            if payload["fundamental_unit"] is None:
                lines.append(
                    f"fundamental unit: norm {payload['fundamental_unit_norm']:+d}, not written out "
                    f"(about {payload['regulator'] / 2.302585092994046:.3g} digits)"
                )
            else:
                t, u = payload["fundamental_unit"]
                lines.append(
                    f"fundamental unit: ({t} + {u}*sqrt({G.discriminant}))/2, "
                    f"norm {payload['fundamental_unit_norm']:+d}"
                )
            lines.append(f"regulator: {payload['regulator']:.15g}")
        lines.append(
            "generators: "
            + ", ".join(f"{g.form.to_list()} (order {n})" for g, n in zip(G.generators, G.invariants))
            if G.invariants
            else "generators: none (trivial group)"
        )
        lines.append(f"method: {prov}")
        if payload["forms"] is not None:
            rows = payload["forms"]
            shown = rows[: args.max_rows]
            lines.append("")
            lines.append(f"{'class':>24}  {'order':>6}  discrete log")
            for f in shown:
                x = G(f)
                lines.append(f"{f!s:>24}  {x.order:>6}  {list(G.discrete_log(x))}")
            if len(rows) > len(shown):
                lines.append(f"... {len(rows) - len(shown)} more classes (use --max-rows or --json)")
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def _cmd_class_number(args: argparse.Namespace) -> int:
    from .conventions import emit

    D = discriminant_of(args)
    payload = class_number_summary(D, method=args.method, interval=args.interval)

    def human() -> str:
        lines = [f"discriminant {payload['discriminant']}"]
        if payload["discriminant"] > 0:
            lines += [
                f"narrow class number h+: {payload['class_number']}",
                f"class number h (wide sense): {payload['class_number_wide']}",
                f"regulator: {payload['regulator']:.15g}",
                f"norm of the fundamental unit: {payload['fundamental_unit_norm']:+d}",
            ]
        else:
            lines.append(f"class number: {payload['class_number']}")
        how = "unconditional" if payload["certified"] else f"conditional on {payload['assumption']}"
        if payload["bound"] is not None and not payload["certified"]:
            how += f" (bound {payload['bound']})"
        lines.append(f"method: {payload['method']}, {how}")
        if payload["detail"]:
            lines.append(f"how: {payload['detail']}")
        iv = payload.get("analytic_interval")
        if iv:
            lines.append(
                f"analytic interval for {iv['of']} (holds under {iv['assumption']}; Euler product to "
                f"{iv['prime_bound']}): [{iv['lower']:.10g}, {iv['upper']:.10g}]"
            )
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def _cmd_compose(args: argparse.Namespace) -> int:
    from .conventions import emit

    F, G = as_form(args.first, name="F"), as_form(args.second, name="G")
    result = compose(F, G, method=args.method)
    emit(args, {"result": result.to_list()}, lambda: f"{F}  *  {G}  =  {result}   {result.to_list()}")
    return 0


def _cmd_power(args: argparse.Namespace) -> int:
    from .conventions import emit

    F = as_form(args.form)
    k = parse_integer(args.exponent, "exponent")
    result = power(F, k)
    emit(args, {"result": result.to_list()}, lambda: f"({F})^{k}  =  {result}   {result.to_list()}")
    return 0


def register(sub: argparse._SubParsersAction, parent: argparse.ArgumentParser) -> None:
    """Add the ``group``, ``class-number``, ``compose`` and ``power`` commands."""
    p = sub.add_parser(
        "group",
        parents=[parent],
        help="the class group of a discriminant: structure, generators, all classes",
        description=(
            "Compute the class group Cl(D) of primitive forms of discriminant D (the narrow class "
            "group when D > 0): invariant factors, generators, every reduced class with its order "
            "and discrete logarithm, and how the result was obtained. "
            "Python: formkit.class_group(D)."
        ),
        epilog=(
            "examples:\n  formkit group -4004\n  formkit group 316 --json\n"
            "  formkit group -3*10^30 --method bsgs"
        ),
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    add_discriminant_argument(p, "the discriminant D (negative or positive, e.g. -4004, 316, -4*3*10^2)")
    p.add_argument(
        "--method",
        choices=("auto", "enumerate", "bsgs"),
        default="auto",
        help="enumerate (unconditional), bsgs (baby-step giant-step, conditional on GRH), "
        "or auto (enumeration for small |D|)",
    )
    p.add_argument(
        "--max-rows",
        type=integer_type("--max-rows", 0),
        default=200,
        help="classes listed in the text table (default 200)",
    )
    p.set_defaults(handler=_cmd_group)

    c = sub.add_parser(
        "class-number",
        parents=[parent],
        help="class number(s) of a discriminant, and the regulator when D > 0, without the structure",
        description=(
            "The class number h(D); for D > 0 also the wide class number, the regulator and the "
            "norm of the fundamental unit. Reaches further than 'group' for D > 0, where the "
            "structure needs short cycles of reduced forms. Says how the result was obtained. "
            "Python: formkit.class_number_summary(D)."
        ),
        epilog=(
            "examples:\n  formkit class-number 10^12+1\n  formkit class-number 10^20+1 --json\n"
            "  formkit class-number -10^9-7 --interval\n"
            "  formkit class-number -4*10^25-4 --method bsgs"
        ),
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    add_discriminant_argument(c, "the discriminant D (negative or positive)")
    c.add_argument(
        "--method",
        choices=("auto", "enumerate", "bsgs"),
        default="auto",
        help="enumerate (unconditional), bsgs (conditional on GRH: baby-step giant-step for D < 0, "
        "infrastructure and the analytic interval for D > 0), or auto",
    )
    c.add_argument(
        "--interval",
        action="store_true",
        help="also print the interval for h (D < 0) or h*R (D > 0) that L(1, chi_D) gives under GRH",
    )
    c.set_defaults(handler=_cmd_class_number)

    q = sub.add_parser(
        "compose",
        parents=[parent],
        help="compose two primitive forms of one discriminant (reduced result)",
        description="Compose two primitive forms of the same discriminant and reduce. Python: formkit.compose(F, G).",
        epilog="examples:\n  formkit compose 2,1,3 2,1,3\n  formkit compose 3,2,5 2,0,7 --method nucomp --json",
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    q.add_argument("first", metavar="F", help="first form")
    q.add_argument("second", metavar="G", help="second form")
    q.add_argument(
        "--method", choices=("dirichlet", "nucomp"), default="dirichlet", help="composition algorithm"
    )
    q.set_defaults(handler=_cmd_compose)

    r = sub.add_parser(
        "power",
        parents=[parent],
        help="the K-th power of a form's class (K may be negative)",
        description="Raise the class of a primitive form to the power K (reduced result). Python: formkit.power(F, K).",
        epilog="examples:\n  formkit power 2,1,3 3\n  formkit power 5,4,201 -7 --json",
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    r.add_argument("form", help="the form")
    r.add_argument("exponent", metavar="K", help="the exponent (any integer)")
    r.set_defaults(handler=_cmd_power)


__all__ = ["register"]
