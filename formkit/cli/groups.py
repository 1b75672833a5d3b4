"""Commands ``group``, ``class-number``, ``compose`` and ``power``: class groups and composition."""

from __future__ import annotations

import argparse

from ..classgroups.dispatch import chosen_method, class_group, class_number_summary
from ..core.composition import compose, power
from ..core.forms import as_form
from ..core.parse import parse_integer
from .conventions import (
    CommandError,
    add_discriminant_argument,
    add_limit_options,
    discriminant_of,
    form_text,
    integer_type,
    limit_of,
    plural,
)

#: Beyond this |D| the ``class-number`` command does not compute the kernel of Cl(O) → Cl(O_K)
#: (it needs the group structure; ``formkit group`` computes it).
_KERNEL_LIMIT = 10**10


def _order_lines(D: int) -> list[str]:
    from ..core.quadratic_orders import Order

    order = Order(D)
    if order.is_maximal:
        return [
            f"order: {order.ring_text}, the maximal order of {order.field_text}; discriminant {D} (fundamental)"
        ]
    return [
        f"order: {order.ring_text}, of conductor f = {order.conductor} in {order.field_text}; discriminant "
        f"{D} = {order.conductor}^2 * ({order.fundamental_discriminant})"
    ]


def _order_payload(
    D: int, method: str, digits: int | None, kernel: bool, known: dict, group=None
) -> tuple[dict, object]:
    """The keys shared by ``group`` and ``class-number``: the order, units, formula, kernel."""
    from ..classgroups.orders import order_class_number, projection_kernel_structure
    from ..core.quadratic_orders import Order

    order = Order(D)
    out: dict = {"order": order.to_dict()}
    keys = ("class_number", "class_number_narrow", "method", "certified", "assumption", "bound")
    summary = {k: known[k] for k in keys}
    summary["detail"] = known.get("detail") or ""
    if D > 0:
        summary.update(regulator=known["regulator"], fundamental_unit_norm=known["fundamental_unit_norm"])
    formula = order_class_number(D, method, summaries={D: summary})
    out["class_number_formula"] = {
        k: v
        for k, v in formula.to_dict().items()
        if k
        in (
            "field_class_number",
            "field_class_number_narrow",
            "unit_index",
            "euler_factors",
            "formula",
            "class_number",
        )
    }
    out["unit_count"] = order.unit_count if D < 0 else None
    out["fundamental_unit_text"] = None
    out["fundamental_unit_basis"] = None
    out["regulator_text"] = None
    # the unit is written out when the group's own output does so, or (class-number) when R < 2000
    unit_known = known.get("fundamental_unit") is not None if "fundamental_unit" in known else True
    if D > 0 and unit_known and known["regulator"] < 2000:
        out["fundamental_unit_text"] = order.fundamental_unit_text()
        out["fundamental_unit_basis"] = list(order.fundamental_unit_basis())
        import mpmath

        out["regulator_text"] = mpmath.nstr(order.regulator(digits or 15), digits or 15)
    out["kernel"] = None
    if kernel and order.conductor > 1:
        out["kernel"] = projection_kernel_structure(D, method, group=group).to_dict()
    return out, formula


def _unit_lines(D: int, payload: dict, digits: int | None) -> list[str]:
    lines = []
    if D < 0:
        lines.append(f"units: the {payload['unit_count']} roots of unity")
        return lines
    norm = payload["fundamental_unit_norm"]
    if payload["fundamental_unit_text"] is not None:
        lines.append(f"fundamental unit: ε = {payload['fundamental_unit_text']}, norm N(ε) = {norm:+d}")
        lines.append(f"regulator: R = log ε = {payload['regulator_text']}")
    else:
        lines.append(
            f"fundamental unit: norm {norm:+d}, not written out (about {payload['regulator'] / 2.302585092994046:.3g} digits)"
        )
        lines.append(f"regulator: R = {payload['regulator']:.15g} (double precision)")
    return lines


def _formula_lines(D: int, payload: dict) -> list[str]:
    cf = payload["class_number_formula"]
    lines = []
    if payload["order"]["conductor"] > 1:
        lines.append(f"class number formula: {cf['formula']}")
        ups = ", ".join(
            f"p = {e['p']}: χ(p) = {e['kronecker_symbol']}, factor {e['factor']}" for e in cf["euler_factors"]
        )
        lines.append(
            f"  factors: h(O_K) = {cf['field_class_number']}, f = {payload['order']['conductor']}, "
            f"[O_K* : O*] = {cf['unit_index']}; {ups}"
        )
    k = payload.get("kernel")
    if k is not None:
        inv = " × ".join(f"C{n}" for n in k["invariants"]) or "C1"
        lines.append(
            f"kernel of Cl(O) → Cl(O_K) (forms up to proper equivalence): {inv}, {k['order']} "
            f"class{'es' if k['order'] != 1 else ''}"
            + (f": {', '.join(str(x) for x in k['elements'])}" if k["elements"] is not None else "")
        )
        if D > 0 and k["wide_order"] != k["order"]:
            winv = " × ".join(f"C{n}" for n in k["wide_invariants"]) or "C1"
            lines.append(f"kernel on ideal classes: {winv}, {k['wide_order']} classes")
    return lines


def _digits(args: argparse.Namespace) -> int | None:
    d = getattr(args, "digits", None)
    return d


def _group_of(D: int, args: argparse.Namespace):
    """``class_group(D, method)``, or when the subexponential method runs (asked for, or
    chosen by ``auto``) with its workers, store and cluster
    ``class_group_subexponential_order(D, workers=…, store=…, cluster=…)``."""
    sieve_options = [
        name
        for name, value in (("--workers", args.workers), ("--db", args.db), ("--cluster", args.cluster))
        if value is not None
    ]
    method = chosen_method(D, args.method)
    if method != "subexponential":
        if sieve_options:
            raise CommandError(
                f"{' and '.join(sieve_options)} {'is' if len(sieve_options) == 1 else 'are'} for the "
                f"subexponential method (its relation sieve and store), and --method {args.method} runs "
                f"{method} for D = {D}; use --method subexponential"
            )
        return class_group(D, method=args.method)
    if not sieve_options:
        return class_group(D, method=args.method)
    from ..classgroups.subexponential_orders import class_group_subexponential_order

    # a fresh run with these options (the store is read back), remembered for the kernel and
    # the class number formula that follow
    return class_group_subexponential_order(
        D, reuse=False, workers=args.workers or 1, store=args.db, cluster=args.cluster
    )


def _cmd_group(args: argparse.Namespace) -> int:
    from ..classgroups.orders import ideal_class_group
    from .conventions import emit

    D = discriminant_of(args)
    G = _group_of(D, args)
    payload = G.to_dict()
    # every listed class with its order and discrete logarithm (as in the text table)
    payload["classes"] = (
        [
            {"form": f, "order": G(f).order, "discrete_log": list(G.discrete_log(G(f)))}
            for f in payload["forms"]
        ]
        if payload["forms"] is not None
        else None
    )
    known = dict(payload, detail=G.provenance.detail)
    extra, _formula = _order_payload(D, args.method, _digits(args), kernel=True, known=known, group=G)
    payload.update(extra)
    wide = ideal_class_group(D, args.method, group=G) if D > 0 else None
    payload["ideal_class_group"] = (
        wide.to_dict()
        if wide is not None
        else {
            "class_number": G.order,
            "invariants": list(G.invariants),
            "structure": G.structure,
            "generators": [g.form.to_list() for g in G.generators],
        }
    )

    def human() -> str:
        prov = G.provenance
        lines = _order_lines(D)
        if D > 0:
            lines.append(
                f"narrow class group Cl+(O) (forms up to proper equivalence): {G.structure}; "
                f"narrow class number h+ = {G.order}"
            )
            lines.append(
                f"class group Cl(O) (ideal classes of the order): {wide.structure}; class number h = {wide.class_number}"  # type: ignore[union-attr]
            )
        else:
            lines.append(
                f"class group Cl(O) (ideal classes of the order = proper classes of positive definite forms): "
                f"{G.structure}; class number h = {G.order}"
            )
        lines += _unit_lines(D, payload, _digits(args))
        lines += _formula_lines(D, payload)
        lines.append(
            ("generators of Cl+(O): " if D > 0 else "generators: ")
            + ", ".join(f"{form_text(g.form)} (order {n})" for g, n in zip(G.generators, G.invariants))
            if G.invariants
            else "generators: none (trivial group)"
        )
        lines.append(f"method: {prov}")
        if payload["forms"] is not None:
            rows = payload["forms"]
            limit = limit_of(args)
            shown = rows if limit is None else rows[:limit]
            lines.append("")
            lines.append(f"{'class':>24}  {'order':>6}  discrete log")
            for f in shown:
                x = G(f)
                lines.append(f"{form_text(f):>24}  {x.order:>6}  {list(G.discrete_log(x))}")
            if len(rows) > len(shown):
                lines.append(
                    f"... {plural(len(rows) - len(shown), 'more class', 'more classes')} (use --limit N, --all or --json)"
                )
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def _cmd_class_number(args: argparse.Namespace) -> int:
    from .conventions import emit

    D = discriminant_of(args)
    payload = class_number_summary(D, method=args.method, interval=args.interval)
    # the kernel needs the structure of both groups, which the infrastructure does not give
    with_kernel = abs(D) <= _KERNEL_LIMIT and args.method != "infrastructure"
    extra, _formula = _order_payload(D, args.method, _digits(args), kernel=with_kernel, known=payload)
    payload.update(extra)

    def human() -> str:
        lines = _order_lines(D)
        if D > 0:
            lines += [
                f"narrow class number h+ (forms up to proper equivalence): {payload['class_number_narrow']}",
                f"class number h (ideal classes of the order): {payload['class_number']}",
            ]
        else:
            lines.append(
                f"class number h (ideal classes of the order = proper classes of positive definite forms): "
                f"{payload['class_number']}"
            )
        lines += _unit_lines(D, payload, _digits(args))
        lines += _formula_lines(D, payload)
        if payload["order"]["conductor"] > 1 and payload["kernel"] is None:
            why = (
                "not computed by --method infrastructure, which gives no structure"
                if args.method == "infrastructure"
                else "not computed beyond |D| = 10^10 here"
            )
            lines.append(f"kernel of Cl(O) → Cl(O_K): {why} (formkit group computes it)")
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
    emit(args, {"result": result.to_list()}, lambda: f"{F}  *  {G}  =  {result}   {form_text(result)}")
    return 0


def _cmd_power(args: argparse.Namespace) -> int:
    from .conventions import emit

    F = as_form(args.form)
    k = parse_integer(args.exponent, "exponent")
    result = power(F, k)
    emit(args, {"result": result.to_list()}, lambda: f"({F})^{k}  =  {result}   {form_text(result)}")
    return 0


def register(sub: argparse._SubParsersAction, parent: argparse.ArgumentParser) -> None:
    """Add the ``group``, ``class-number``, ``compose`` and ``power`` commands."""
    p = sub.add_parser(
        "group",
        parents=[parent],
        help="the class group of a discriminant: structure, generators, all classes",
        description=(
            "Compute the class group of the order O of discriminant D: for D > 0 both the narrow "
            "class group Cl+(O) (forms up to proper equivalence, narrow class number h+) and the "
            "class group Cl(O) of ideal classes (class number h); the order (conductor f in Q(√m)), "
            "its units, the class number formula with its factors and, for f > 1, the kernel of "
            "Cl(O) → Cl(O_K); invariant factors, generators, every reduced class with its order "
            "and discrete logarithm, and how the result was obtained. "
            "Python: formkit.class_group(D), formkit.ideal_class_group(D), formkit.order_class_number(D), "
            "formkit.projection_kernel_structure(D)."
        ),
        epilog=(
            "examples:\n  formkit group -4004\n  formkit group 316 --json\n"
            "  formkit group 'Q(sqrt(94))' --digits 40\n  formkit group 'Q(sqrt(-3))' --conductor 6\n"
            "  formkit group -4*3*10^2\n  formkit group -3*10^30 --method bsgs\n"
            "  formkit group '-(10^30+7)' --method subexponential --workers 2 --db relations.db"
        ),
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    add_discriminant_argument(p, "the discriminant D (negative or positive, e.g. -4004, 316, -4*3*10^2)")
    p.add_argument(
        "--method",
        choices=("auto", "enumeration", "bsgs", "subexponential"),
        default="auto",
        help="enumeration (unconditional), bsgs (baby-step giant-step, conditional on GRH), "
        "subexponential (relations among prime forms, GRH; D < 0, orders through the maximal order, "
        "and fundamental 10^5 ≤ D ≤ 10^50 with the regulator from the units of the relations), "
        "or auto (enumeration for small |D|, then bsgs, and subexponential for D < 0 from |D| = 10^27 "
        "and for fundamental D > 0 from 10^23 on: the crossovers measured here)",
    )
    p.add_argument(
        "--digits",
        type=integer_type("--digits", 1),
        default=None,
        metavar="N",
        help="D > 0: the regulator to N significant digits (mpmath, verified at higher precision)",
    )
    p.add_argument(
        "--workers",
        type=integer_type("--workers", 1),
        default=None,
        metavar="N",
        help="--method subexponential: sieve for relations on N local processes (default 1)",
    )
    p.add_argument(
        "--db",
        default=None,
        metavar="FILE",
        help="--method subexponential: keep the relations in this SQLite file as they are found; "
        "the same command with the same file continues a stopped run",
    )
    p.add_argument(
        "--cluster",
        metavar="ADDRESS",
        default=None,
        help="--method subexponential: run the sieve tasks on this Dask distributed scheduler "
        "instead of local processes, as formkit table --cluster does (needs formkit[cluster]; "
        "formkit must be importable on the workers); with --db the relations are stored as they come",
    )
    add_limit_options(p, "classes in the text table", 200)
    p.set_defaults(handler=_cmd_group)

    c = sub.add_parser(
        "class-number",
        parents=[parent],
        help="class number(s) of a discriminant, and the regulator when D > 0, without the structure",
        description=(
            "The class number h of the order of discriminant D (ideal classes); for D > 0 also the "
            "narrow class number h+ (forms up to proper equivalence), the fundamental unit, its norm "
            "and the regulator; the order (conductor f in Q(√m)), the class number formula with its "
            "factors and, for f > 1, the kernel of Cl(O) → Cl(O_K). Reaches further than 'group' "
            "for D > 0, where the structure needs short cycles of reduced forms. Says how the result "
            "was obtained. JSON keys: class_number = h, class_number_narrow = h+. "
            "Python: formkit.class_number_summary(D), formkit.order_class_number(D)."
        ),
        epilog=(
            "examples:\n  formkit class-number 10^12+1\n  formkit class-number 10^20+1 --json\n"
            "  formkit class-number 'Q(sqrt(94))' --digits 50\n  formkit class-number 'Q(√-1), f=15'\n"
            "  formkit class-number -10^9-7 --interval\n"
            "  formkit class-number -4*10^25-4 --method bsgs\n"
            "  formkit class-number 10^15+1 --method infrastructure"
        ),
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    add_discriminant_argument(c, "the discriminant D (negative or positive)")
    c.add_argument(
        "--method",
        choices=("auto", "enumeration", "bsgs", "subexponential", "infrastructure"),
        default="auto",
        help="enumeration (unconditional); bsgs (conditional on GRH: baby-step giant-step among the "
        "classes; for D > 0 it needs short cycles of reduced forms); subexponential (conditional on "
        "GRH: relations among prime forms; D < 0, and fundamental 10^5 ≤ D ≤ 10^50 with the regulator); "
        "infrastructure (D > 0, conditional on GRH: the regulator by the infrastructure of the "
        "principal cycle, h from the analytic interval; about 10^26 at most); or auto (enumeration "
        "for small |D|, then bsgs and from |D| = 10^27 on subexponential for D < 0; infrastructure for "
        "D > 0, and subexponential for fundamental D from 10^23 on). The output's method line "
        "names the method run",
    )
    c.add_argument(
        "--digits",
        type=integer_type("--digits", 1),
        default=None,
        metavar="N",
        help="D > 0: the regulator to N significant digits (mpmath, verified at higher precision)",
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
