"""Commands ``reduce`` and ``equivalent``: reduction and equivalence of single forms."""

from __future__ import annotations

import argparse

from ..core.equivalence import equivalence
from ..core.forms import as_form
from ..core.reduction import _cycle_prefix, class_representative, reduce_form
from .conventions import add_limit_options, form_text, integer_type, limit_of, plural

#: Default bound on the number of cycle forms printed by ``formkit reduce``: cycles of
#: discriminants near 10^k can hold about 10^(k/2) forms, far too many to list.
CYCLE_LIMIT = 10_000
#: Default bound on the cycle walk of ``formkit equivalent`` (about a second of work).
MAX_CYCLE_STEPS = 1_000_000


def _listing_cap(start) -> int:
    """The most forms of a cycle that ``reduce --all`` lists within the budget: about 6 µs and
    ``200 + 3·(digits of D)/2`` bytes a form (a ρ-step and the kept form; measured about
    2–6.5 µs a step for D ≈ 10^40 … 10^200 on the development machine under load, rounded up)."""
    from ..core.budget import current_budget

    b = current_budget()
    per_form = 200 + 1.5 * len(str(start.discriminant))
    by_memory = b.memory / per_form
    by_time = b.seconds / 6e-6
    return max(1, int(min(by_memory, by_time, 10**9)))


def _matrix_text(m) -> str:
    return f"[[{m[0][0]}, {m[0][1]}], [{m[1][0]}, {m[1][1]}]]"


def _cmd_reduce(args: argparse.Namespace) -> int:
    from .conventions import emit

    f = as_form(args.form)
    res = reduce_form(f, steps=args.steps)
    payload = res.to_dict()
    rep = class_representative(res.reduced)
    payload["class_representative"] = rep.to_list()
    cyc = None
    complete = True
    if f.is_indefinite:
        limit = limit_of(args, zero_means_all=True)
        cap = _listing_cap(res.reduced) if not limit else 0
        cyc, complete = _cycle_prefix(res.reduced, limit or cap)
        if not limit and not complete:
            from ..core.budget import current_budget
            from ..errors import BudgetError

            raise BudgetError(
                f"the cycle of reduced forms of {form_text(res.reduced)} has more than {cap} forms: listing "
                f"all of them is over the budget of {current_budget()}; --limit N lists the first N "
                "(its length is about R/1.19, R the regulator: formkit class-number D)"
            )
        payload["cycle"] = [g.to_list() for g in cyc]
        payload["cycle_complete"] = complete
    if args.steps:
        payload["steps"] = [
            {"kind": s.kind, "matrix": [list(r) for r in s.matrix], "form": s.after.to_list()}
            for s in res.steps
        ]

    def human() -> str:
        lines = [f"form:          {f}   {form_text(f)}", f"discriminant:  {f.discriminant}  ({f.kind})"]
        if args.steps:
            lines.append("steps:")
            for i, s in enumerate(res.steps, 1):
                lines.append(f"  {i:3d}. {s.kind:9s} by {_matrix_text(s.matrix):24s} -> {form_text(s.after)}")
            if not res.steps:
                lines.append("  (already reduced)")
        lines.append(f"reduced:       {res.reduced}   {form_text(res.reduced)}")
        lines.append(f"matrix:        {_matrix_text(res.matrix)}   (form · matrix = reduced)")
        if f.is_indefinite:
            lines.append(
                f"class:         represented by {rep}   {form_text(rep)}   (least |a| on the cycle, as formkit group lists it)"
            )
        if cyc is not None:
            if complete:
                lines.append(f"cycle ({plural(len(cyc), 'reduced form')}):")
            else:
                lines.append(
                    f"cycle (more than {len(cyc)} reduced forms; the first {len(cyc)} shown, see --limit N and --all):"
                )
            lines.extend(f"  {form_text(g)}" for g in cyc)
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def _cmd_equivalent(args: argparse.Namespace) -> int:
    from .conventions import CommandError, emit

    F, G = as_form(args.first, name="F"), as_form(args.second, name="G")
    if args.max_steps < 1:
        raise CommandError(f"--max-steps must be >= 1, not {args.max_steps}")
    res = equivalence(F, G, max_steps=args.max_steps)

    def human() -> str:
        if not res.equivalent:
            return f"{F} and {G} are not equivalent"
        how = "properly (det +1)" if res.properly else "only improperly (det -1)"
        return f"{F} and {G} are equivalent, {how}\nmatrix: {_matrix_text(res.matrix)}   (F · matrix = G)"

    emit(args, res.to_dict(), human)
    return 0


def register(sub: argparse._SubParsersAction, parent: argparse.ArgumentParser) -> None:
    """Add the ``reduce`` and ``equivalent`` commands."""
    p = sub.add_parser(
        "reduce",
        parents=[parent],
        help="reduce a form (definite or indefinite), with the matrix and optional steps",
        description=(
            "Reduce a binary quadratic form and print the SL2(Z) matrix taking it to the reduced "
            "form; for indefinite forms also the whole cycle of reduced forms and the class "
            "representative (the form of the cycle that formkit group, compose and power give). "
            "Python: formkit.reduce_form(form, steps=True), formkit.reduced_cycle(form), formkit.class_representative(form)."
        ),
        epilog="examples:\n  formkit reduce 10,37,35 --steps\n  formkit reduce '-x^2 + 13y^2' --json",
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("form", help="the form: a,b,c or [a,b,c] or a polynomial such as '3x^2+7xy-5y^2'")
    p.add_argument("--steps", action="store_true", help="show every reduction step with its matrix")
    add_limit_options(
        p,
        "forms of the cycle of an indefinite form (the JSON key cycle_complete tells)",
        CYCLE_LIMIT,
        zero_means_all=True,
    )
    p.set_defaults(handler=_cmd_reduce)

    q = sub.add_parser(
        "equivalent",
        parents=[parent],
        help="decide proper/improper equivalence of two forms and give the matrix",
        description=(
            "Decide whether F and G are equivalent (properly under SL2(Z), or improperly under a "
            "matrix of determinant -1) and print a matrix M with F·M = G. "
            "Python: formkit.equivalence(F, G)."
        ),
        epilog="examples:\n  formkit equivalent 1,0,-7 -3,2,2\n  formkit equivalent 3,2,5 3,-2,5 --json",
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    q.add_argument("first", metavar="F", help="first form")
    q.add_argument("second", metavar="G", help="second form")
    q.add_argument(
        "--max-steps",
        type=integer_type("--max-steps", 1),
        default=MAX_CYCLE_STEPS,
        metavar="N",
        help=f"indefinite forms: give up after N steps along a cycle (default {MAX_CYCLE_STEPS:,})",
    )
    q.set_defaults(handler=_cmd_equivalent)


__all__ = ["register"]
