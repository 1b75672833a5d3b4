"""Command group ``ideal``: invertible ideals of quadratic orders (dictionary with forms, primes, factorisation).

Subcommands: ``primes`` (prime ideals above p), ``of-form`` (form → ideal), ``form``
(ideal → form), ``multiply`` (product, compared with form composition), ``factor``
(an ideal or the principal ideal of an element into prime ideals), ``principal``
(principality with a generator; compact form for huge generators when D > 0).
Ideals are written by generators, ``'(2, 1 + √-5)'``; elements as ``'3 + 2√-5'`` or
``'(1+sqrt(5))/2'`` (parsed by hand).
"""

from __future__ import annotations

import argparse

from ..core.forms import as_form
from .conventions import add_discriminant_argument, discriminant_of, emit, form_text, integer_type

_IDEAL_HELP = "an ideal by generators, e.g. '(2, 1 + √-5)' or '(3, 1+sqrt(-5))'"


def _ideal(args: argparse.Namespace, D: int, text: str, name: str = "ideal"):
    from ..core.ideals import parse_ideal

    return parse_ideal(D, text, name)


def _cmd_primes(args: argparse.Namespace) -> int:
    from ..core.ideals import prime_ideals_above

    D = discriminant_of(args)
    dec = prime_ideals_above(D, args.p)
    payload = dec.to_dict()

    def human() -> str:
        lines = [dec.statement()]
        for P, e, g in zip(dec.ideals, dec.exponents, dec.residue_degrees):
            lines.append(
                f"  {P.text()}: norm {P.norm}, residue degree {g}, exponent {e}, form {form_text(P.form)}"
            )
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def _cmd_of_form(args: argparse.Namespace) -> int:
    from ..core.ideals import ideal_from_form

    Q = as_form(args.form)
    I = ideal_from_form(Q)  # noqa: E741
    payload = {"form": Q.to_list(), "ideal": I.to_dict(), "form_of_ideal": I.form.to_list()}

    def human() -> str:
        lines = [
            f"form {form_text(Q)} (D = {Q.discriminant}) ↦ ideal {I.text()} of {I.order.ring_text}, norm {I.norm}"
        ]
        if Q.a < 0:
            lines.append("  (a < 0: the ideal is √D·[|a|, (−b + √D)/2], in the narrow class of the form)")
        lines.append(f"  and back: the ideal's form is {form_text(I.form)} (properly equivalent to the form)")
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def _cmd_form(args: argparse.Namespace) -> int:
    D = discriminant_of(args)
    I = _ideal(args, D, args.ideal)  # noqa: E741
    payload = {"ideal": I.to_dict(), "form": I.form.to_list()}
    emit(
        args,
        payload,
        lambda: (
            f"ideal {I.text()} (norm {I.norm}, content {I.content}) ↦ form {form_text(I.form)} = N(xα − yβ)/N(I)"
        ),
    )
    return 0


def _cmd_multiply(args: argparse.Namespace) -> int:
    from ..core.composition import compose
    from ..core.reduction import reduced

    D = discriminant_of(args)
    I, J = _ideal(args, D, args.ideal_i, "I"), _ideal(args, D, args.ideal_j, "J")  # noqa: E741
    K = I * J
    composite = reduced(compose(I.form, J.form))
    agrees = reduced(K.form) == composite
    payload = {
        "first": I.to_dict(),
        "second": J.to_dict(),
        "product": K.to_dict(),
        "composition": composite.to_list(),
        "agrees_with_composition": agrees,
    }

    def human() -> str:
        return "\n".join(
            [
                f"I·J = {I.text()} · {J.text()} = {K.text()}, norm {K.norm} = {I.norm}·{J.norm}",
                f"form of I·J, reduced: {form_text(reduced(K.form))}; composition of the forms, reduced: "
                f"{form_text(composite)} ({'the same class' if agrees else 'DIFFERENT'})",
            ]
        )

    emit(args, payload, human)
    return 0


def _cmd_factor(args: argparse.Namespace) -> int:
    from ..core.ideals import factor_ideal, principal_ideal
    from ..core.quadratic_orders import Order
    from .conventions import CommandError

    D = discriminant_of(args)
    if (args.ideal is None) == (args.element is None):
        raise CommandError("give exactly one of IDEAL or --element ALPHA")
    if args.element is not None:
        alpha = Order(D).element(args.element, "--element")
        I = principal_ideal(D, alpha)  # noqa: E741
        what = f"({alpha.text()})"
    else:
        I = _ideal(args, D, args.ideal)  # noqa: E741
        what = I.text()
    fac = factor_ideal(I)
    payload = fac.to_dict()

    def human() -> str:
        lines = [f"{what} = {I.text()}, norm {I.norm}", f"  = {fac.text()}"]
        for p, P, e in fac.factors:
            lines.append(f"  {P.text()}^{e}: above p = {p}, norm {P.norm}, form {form_text(P.form)}")
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def _cmd_principal(args: argparse.Namespace) -> int:
    from ..core.principal_ideals import principal_generator

    D = discriminant_of(args)
    I = _ideal(args, D, args.ideal)  # noqa: E741
    compact = True if args.compact else None
    r = principal_generator(I, compact=compact, max_steps=args.max_steps)
    payload = r.to_dict()

    def human() -> str:
        lines = [r.statement()]
        if r.compact is not None:
            lines.append(
                f"  compact form: ∏ α_j^e_j with {len(r.compact.terms)} factors (log|γ| ≈ "
                f"{float(r.compact.log_abs(15)):.10g}, about {payload['compact_generator']['digits']} digits)"
            )
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def register(sub: argparse._SubParsersAction, parent: argparse.ArgumentParser) -> None:
    """Add the ``ideal`` command group."""
    from .conventions import _Parser

    raw = argparse.RawDescriptionHelpFormatter
    p = sub.add_parser(
        "ideal",
        help="ideals of quadratic orders: prime ideals, forms <-> ideals, products, factorisation, principality",
        description=(
            "Invertible ideals of the order O of discriminant D, written by generators such as "
            "'(2, 1 + √-5)'. Every ideal is shown by its Z-basis [k·a, k·(−b + √D)/2]. "
            "Python: formkit.parse_ideal, formkit.prime_ideals_above, formkit.ideal_from_form, "
            "formkit.factor_ideal, formkit.principal_generator."
        ),
        epilog=(
            "examples:\n  formkit ideal primes -20 3\n  formkit ideal factor -20 --element '1 + √-5'\n\n"
            "run 'formkit ideal ACTION --help' for each action"
        ),
        formatter_class=raw,
    )
    sp = p.add_subparsers(dest="action", metavar="ACTION", parser_class=_Parser)
    sp.required = True

    q = sp.add_parser(
        "primes",
        parents=[parent],
        help="the prime ideals above p, with the splitting type and their forms",
        description="The prime ideals of O above the prime p. Python: formkit.prime_ideals_above(D, p).",
        epilog=(
            "examples:\n  formkit ideal primes -20 3\n  formkit ideal primes 'Q(sqrt(94))' 2 --json\n"
            "  formkit ideal primes -3 --conductor 2 2"
        ),
        formatter_class=raw,
    )
    add_discriminant_argument(q, "the discriminant of the order")
    q.add_argument("p", type=integer_type("p", 2), help="a prime")
    q.set_defaults(handler=_cmd_primes)

    q = sp.add_parser(
        "of-form",
        parents=[parent],
        help="the ideal of a primitive form (for D > 0 and a < 0 the oriented ideal √D·[|a|, ...])",
        description=(
            "The ideal [a, (−b + √D)/2] of the form (a, b, c); for D > 0 and a < 0 the ideal "
            "√D·[|a|, (−b + √D)/2], so that proper classes of forms match narrow ideal classes. "
            "Python: formkit.ideal_from_form(form)."
        ),
        epilog="examples:\n  formkit ideal of-form 2,1,3\n  formkit ideal of-form -1,18,13 --json",
        formatter_class=raw,
    )
    q.add_argument("form", help="a primitive form")
    q.set_defaults(handler=_cmd_of_form)

    q = sp.add_parser(
        "form",
        parents=[parent],
        help="the form N(xα − yβ)/N(I) of an ideal",
        description="The primitive form of an ideal (its oriented Z-basis). Python: formkit.parse_ideal(D, text).form.",
        epilog="examples:\n  formkit ideal form -20 '(3, 1 + √-5)'\n  formkit ideal form 'Q(sqrt(94))' '(3, 1+√94)' --json",
        formatter_class=raw,
    )
    add_discriminant_argument(q, "the discriminant of the order")
    q.add_argument("ideal", help=_IDEAL_HELP)
    q.set_defaults(handler=_cmd_form)

    q = sp.add_parser(
        "multiply",
        parents=[parent],
        help="the product of two ideals, checked against the composition of their forms",
        description="I·J by lattices, and the composition of the forms of I and J. Python: I * J.",
        epilog="examples:\n  formkit ideal multiply -20 '(2, 1 + √-5)' '(3, 1 + √-5)'",
        formatter_class=raw,
    )
    add_discriminant_argument(q, "the discriminant of the order")
    q.add_argument("ideal_i", metavar="I", help=_IDEAL_HELP)
    q.add_argument("ideal_j", metavar="J", help=_IDEAL_HELP)
    q.set_defaults(handler=_cmd_multiply)

    q = sp.add_parser(
        "factor",
        parents=[parent],
        help="factor an ideal, or the principal ideal of an element, into prime ideals",
        description=(
            "The factorisation into invertible prime ideals of an ideal prime to the conductor, or "
            "of the principal ideal (α) of an element α of the order (--element). "
            "Python: formkit.factor_ideal(I), formkit.factor_element(D, alpha)."
        ),
        epilog=(
            "examples:\n  formkit ideal factor -20 '(6, 2 + 2√-5)'\n  formkit ideal factor -20 --element '1 + √-5'\n"
            "  formkit ideal factor 'Q(sqrt(94))' --element '2143295 + 221064√94' --json"
        ),
        formatter_class=raw,
    )
    add_discriminant_argument(q, "the discriminant of the order")
    q.add_argument("ideal", nargs="?", default=None, help=_IDEAL_HELP)
    q.add_argument("--element", metavar="ALPHA", help="factor the principal ideal (ALPHA), e.g. '1 + √-5'")
    q.set_defaults(handler=_cmd_factor)

    q = sp.add_parser(
        "principal",
        parents=[parent],
        help="is the ideal principal? a generator (compact form when huge, D > 0)",
        description=(
            "Decide whether the ideal is principal (exactly: reduction, and for D > 0 a complete walk "
            "of the principal cycle) and give a generator; for D > 0 also whether it is narrowly "
            "principal (a generator of positive norm). A generator with more than about 430 digits is "
            "given as a compact product ∏ α_j^e_j of small numbers with exponents 2^k (JSON key "
            "compact_generator: terms [{number: [x, y, z], text, exponent}], meaning "
            "∏ ((x + y√D)/(2z))^exponent). Python: formkit.principal_generator(I)."
        ),
        epilog=(
            "examples:\n  formkit ideal principal -20 '(3, 1 + √-5)'\n  formkit ideal principal 'Q(sqrt(94))' '(2, √94)'\n"
            "  formkit ideal principal 4*1000000007 '(19, -5+sqrt(1000000007))' --json"
        ),
        formatter_class=raw,
    )
    add_discriminant_argument(q, "the discriminant of the order")
    q.add_argument("ideal", help=_IDEAL_HELP)
    q.add_argument(
        "--compact", action="store_true", help="D > 0: give the generator in compact form even when small"
    )
    q.add_argument(
        "--max-steps",
        type=integer_type("--max-steps", 1),
        default=2_000_000,
        metavar="N",
        help="D > 0: give up after N reduced ideals of the principal cycle (default 2,000,000)",
    )
    q.set_defaults(handler=_cmd_principal)


__all__ = ["register"]
