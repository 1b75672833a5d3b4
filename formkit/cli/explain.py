"""Command ``explain``: worked examples in Markdown or LaTeX (subcommands reduce, compose,
represent, group)."""

from __future__ import annotations

import argparse

from ..core.forms import as_form
from ..core.parse import parse_integer
from .conventions import add_discriminant_argument, add_limit_options, limit_of

_FORM_HELP = "a form: a,b,c or [a,b,c] or (a,b,c) or a polynomial such as '3x^2+7xy-5y^2'"

_JSON_NOTE = (
    'With --json one object is printed: {"kind", "format", "text", "data"} where text is the '
    "rendered document and data holds every recorded number (the same as "
    'formkit.worked_<topic>(...).to_dict()["data"] in Python).'
)


def _unlimited(limit: int | None) -> int:
    # --all: no limit (the library takes a count; larger than anything listed)
    return 10**18 if limit is None else limit


def _emit_example(args: argparse.Namespace, example) -> int:
    from .conventions import CommandError, emit

    if args.fragment and args.format != "tex":
        raise CommandError("--fragment applies to --format tex only")
    text = example.render(
        args.format, fragment=args.fragment, sectioning=args.heading_level, numbered=args.numbered_headings
    )
    if args.output:
        try:
            with open(args.output, "w", encoding="utf-8") as fh:
                fh.write(text)
        except OSError as exc:
            raise CommandError(f"cannot write {args.output!r}: {exc.strerror}") from None
    payload = {"kind": example.kind, "format": args.format, "text": text, "data": example.data}
    if args.output:
        payload["output"] = args.output
        human = f"wrote {example.kind} example ({args.format}, {text.count(chr(10))} lines) to {args.output}"
    else:
        human = text
    emit(args, payload, human)
    return 0


def _cmd_reduce(args: argparse.Namespace) -> int:
    from ..explain.reduction import worked_reduction

    return _emit_example(args, worked_reduction(as_form(args.form)))


def _cmd_compose(args: argparse.Namespace) -> int:
    from ..explain.composition import worked_composition

    return _emit_example(
        args, worked_composition(as_form(args.first, name="F"), as_form(args.second, name="G"))
    )


def _cmd_represent(args: argparse.Namespace) -> int:
    from ..explain.representation import worked_representation

    n = parse_integer(args.n, "n")
    return _emit_example(
        args, worked_representation(as_form(args.form), n, max_detail=_unlimited(limit_of(args)))
    )


def _cmd_group(args: argparse.Namespace) -> int:
    from ..explain.class_group import worked_class_group
    from .conventions import discriminant_of

    D = discriminant_of(args)
    return _emit_example(args, worked_class_group(D, max_classes=max(1, _unlimited(limit_of(args)))))


def _format_parent() -> argparse.ArgumentParser:
    from .conventions import _Parser

    p = _Parser(add_help=False)
    p.add_argument("--format", choices=("md", "tex"), default="md", help="Markdown (default) or LaTeX")
    p.add_argument(
        "--fragment",
        action="store_true",
        help="with --format tex: only the body, to \\input into a document that loads amsmath, array and "
        "longtable (default: a complete, compilable article)",
    )
    p.add_argument(
        "--heading-level",
        choices=("part", "chapter", "section", "subsection", "subsubsection"),
        default="section",
        help="with --format tex: the sectioning command of the title (default section; lower headings "
        "go one level down each)",
    )
    p.add_argument(
        "--numbered-headings", action="store_true", help="with --format tex: numbered headings (\\section)"
    )
    p.add_argument("-o", "--output", metavar="FILE", help="write the document to FILE instead of printing it")
    return p


def register(sub: argparse._SubParsersAction, parent: argparse.ArgumentParser) -> None:
    """Add the ``explain`` command and its subcommands."""
    from .conventions import _Parser

    fmt = _format_parent()
    raw = argparse.RawDescriptionHelpFormatter
    # --json and --debug sit on each topic (a second copy here would be overwritten by
    # the topic's defaults when argparse merges the namespaces)
    p = sub.add_parser(
        "explain",
        help="worked examples, every step with its numbers, in Markdown or LaTeX",
        description=(
            "Write a worked example for a paper, thesis or lecture: every step of a reduction, a "
            "composition, a representation or a class group computation, with its numbers, as "
            "Markdown or as a LaTeX document (or fragment). " + _JSON_NOTE
        ),
        epilog=(
            "examples:\n"
            "  formkit explain reduce 10,37,35\n"
            "  formkit explain compose 2,1,3 3,-1,2 --format tex -o composition.tex\n"
            "  formkit explain represent '2x^2+xy+3y^2' 18\n"
            "  formkit explain group -84 --format tex --fragment\n\n"
            "run 'formkit explain TOPIC --help' for each topic"
        ),
        formatter_class=raw,
    )
    topics = p.add_subparsers(dest="topic", metavar="TOPIC", parser_class=_Parser)
    topics.required = True

    r = topics.add_parser(
        "reduce",
        parents=[parent, fmt],
        help="the reduction of a form, step by step",
        description=(
            "Every reduction step (translation, swap, or the operator rho for indefinite forms) with its "
            "matrix and the running product; for indefinite forms also the cycle of reduced forms. "
            "Python: formkit.explain_reduction(form, format='md'). " + _JSON_NOTE
        ),
        epilog="examples:\n  formkit explain reduce 10,37,35\n  formkit explain reduce '-x^2 + 13y^2' --format tex",
        formatter_class=raw,
    )
    r.add_argument("form", help=_FORM_HELP)
    r.set_defaults(handler=_cmd_reduce)

    c = topics.add_parser(
        "compose",
        parents=[parent, fmt],
        help="Dirichlet composition of two forms, every intermediate value",
        description=(
            "Dirichlet composition (Cohen, GTM 138, Algorithm 5.4.7) with s, n, both extended-Euclid steps "
            "and their Bezout coefficients, d1, v1, v2, r, the unreduced composite and its reduction. "
            "Python: formkit.explain_composition(F, G, format='md'). " + _JSON_NOTE
        ),
        epilog="examples:\n  formkit explain compose 2,1,3 3,-1,2\n  formkit explain compose [3,2,5] [3,2,5] --format tex",
        formatter_class=raw,
    )
    c.add_argument("first", metavar="F", help="first form; " + _FORM_HELP)
    c.add_argument("second", metavar="G", help="second form (same discriminant)")
    c.set_defaults(handler=_cmd_compose)

    q = topics.add_parser(
        "represent",
        parents=[parent, fmt],
        help="how Q(x, y) = N is solved: square roots modulo 4m and reductions",
        description=(
            "Solve Q(x, y) = N by the square-root method: for every g with g^2 | N, the roots b of "
            "b^2 = D (mod 4m), m = N/g^2, the reduction of each (m, b, (b^2 - D)/4m), the comparison with "
            "Q and the solution read off the matrix. "
            "Python: formkit.explain_representation(form, n, format='md'). " + _JSON_NOTE
        ),
        epilog="examples:\n  formkit explain represent 2,1,3 18\n  formkit explain represent 'x^2-2y^2' 7 --format tex",
        formatter_class=raw,
    )
    q.add_argument("form", help=_FORM_HELP)
    q.add_argument("n", metavar="N", help="the integer to represent")
    add_limit_options(q, "roots whose reduction steps are shown (the tables are always complete)", 32)
    q.set_defaults(handler=_cmd_represent)

    g = topics.add_parser(
        "group",
        parents=[parent, fmt],
        help="the class group with its class table, orders and genus characters",
        description=(
            "The reduced forms, the structure and generators of Cl(D), and the class table with orders, "
            "discrete logarithms and genus characters, followed by the checks of genus theory. "
            "Python: formkit.explain_class_group(D, format='md'). " + _JSON_NOTE
        ),
        epilog="examples:\n  formkit explain group -84\n  formkit explain group -4004 --format tex -o cl4004.tex",
        formatter_class=raw,
    )
    add_discriminant_argument(g, "the discriminant (e.g. -84, 316)")
    add_limit_options(g, "classes (at least 1)", 500)
    g.set_defaults(handler=_cmd_group)

    hp = sub.add_parser(
        "handout",
        parents=[parent, fmt],
        help="one complete handout on a discriminant (LaTeX or Markdown)",
        description=(
            "Write one complete document on a discriminant D: the order and its class number formula, the "
            "reduced forms, the structure with generators, genera and characters, the ring class polynomial "
            "(D < 0), a representation worked out, and the primes a form represents with the criterion (a "
            "congruence criterion exactly when the genus of the form is {Q, Q^-1}). "
            "Python: formkit.worked_handout(D, form, n, bound=X).render('tex'). " + _JSON_NOTE
        ),
        epilog=(
            "examples:\n  formkit handout -56 --form 3,2,5 --bound 10^4\n"
            "  formkit handout -16428 --represent 13 --format tex -o handout.tex\n  formkit handout 316 --format md"
        ),
        formatter_class=raw,
    )
    add_discriminant_argument(hp, "the discriminant (e.g. -56, -16428, 316)", metavar="D")
    hp.add_argument(
        "--form", default=None, help="the form worked out (default: the first generator); " + _FORM_HELP
    )
    hp.add_argument(
        "--represent",
        default=None,
        metavar="N",
        help="the number represented (default: the least prime it represents)",
    )
    hp.add_argument(
        "--bound", default="1000", metavar="X", help="list the represented primes up to X (default 1000)"
    )
    hp.set_defaults(handler=_cmd_handout)


def _cmd_handout(args: argparse.Namespace) -> int:
    from ..explain.handout import worked_handout
    from .conventions import discriminant_of

    D = discriminant_of(args)
    form = as_form(args.form) if args.form is not None else None
    n = parse_integer(args.represent, "--represent") if args.represent is not None else None
    X = parse_integer(args.bound, "--bound")
    return _emit_example(args, worked_handout(D, form, n, bound=X))


__all__ = ["register"]
