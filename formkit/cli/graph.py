"""Command ``graph``: class-group structure as a graph (JSON, GraphML, DOT, PNG, SVG)."""

from __future__ import annotations

import argparse
import json
import os
import sys

FORMATS = ("json", "graphml", "dot", "png", "svg")
TEXT_FORMATS = ("json", "graphml", "dot")
# the picture options of formkit.graphs.plotting (LAYOUTS, LABELS, EDGE_STYLES), written out
# here so that building the parser does not import networkx; a test checks they agree
LAYOUTS = ("rings", "coordinates", "circle")
LABELS = ("auto", "forms", "orders", "logs", "none")
EDGE_STYLES = ("auto", "curved", "straight")


def _parse_primes(text: str) -> list[int]:
    from ..core.parse import parse_integer
    from .conventions import CommandError

    parts = [t.strip() for t in text.split(",")]
    if not text.strip() or any(not t for t in parts):
        raise CommandError(f"--primes must be a comma-separated list of primes such as 2,3,5, not {text!r}")
    return [parse_integer(t, f"--primes entry {t!r}") for t in parts]


def _format_of(args: argparse.Namespace) -> str:
    from .conventions import CommandError

    if args.format:
        return args.format
    if args.output:
        ext = os.path.splitext(args.output)[1].lstrip(".").lower()
        if ext in FORMATS:
            return ext
        if ext in ("gv",):
            return "dot"
        if ext:
            raise CommandError(
                f"cannot tell the format from the file name {args.output!r}; give --format "
                f"({', '.join(FORMATS)})"
            )
    return "json"


#: What the nodes and the edges of each kind of graph are, for the summary line.
_COUNTED = {
    "cayley": ("class", "classes", "{x, x·[p]}", "x → x·[p]"),
    "cycles": ("reduced form", "reduced forms", "{f, ρ(f)}", "f → ρ(f)"),
    "fibres": ("class", "classes", "", "x → image of x"),
}


def _counts_text(payload: dict) -> str:
    """``24 classes; 48 undirected edges {x, x·[p]}; 72 directed edges x → x·[p]``."""
    from .conventions import plural

    one, many, edge, arrow = _COUNTED[payload["kind"]]
    n, e, d = payload["node_count"], payload["edge_count"], payload["directed_edge_count"]
    if not edge:  # fibres: nothing is joined both ways
        return f"{plural(n, one, many)}; {plural(e, 'edge')} {arrow}"
    return (
        f"{plural(n, one, many)}; {plural(e, 'undirected edge')} {edge}; {plural(d, 'directed edge')} {arrow}"
    )


def _cmd_graph(args: argparse.Namespace) -> int:
    from ..core.discriminants import validate_discriminant
    from ..core.parse import parse_integer
    from ..graphs import (
        cayley_graph,
        cycle_graph,
        edge_count,
        fibre_graph,
        graph_title,
        graph_to_dot,
        graph_to_graphml,
        graph_to_json,
    )
    from .conventions import CommandError, discriminant_of, emit

    D = validate_discriminant(discriminant_of(args))
    fmt = _format_of(args)
    if fmt not in TEXT_FORMATS and not args.output:
        raise CommandError(f"--format {fmt} writes a picture: give a file with --output FILE.{fmt}")
    if args.kind != "cayley" and (args.primes is not None or args.bound is not None):
        raise CommandError(f"--primes and --bound choose the edges of --kind cayley, not --kind {args.kind}")
    picture = {"layout": args.layout, "labels": args.labels, "edge_style": args.edge_style}
    given = [f"--{k.replace('_', '-')}" for k, v in picture.items() if v is not None]
    if given and fmt in TEXT_FORMATS:
        verb = "shapes" if len(given) == 1 else "shape"
        raise CommandError(f"{' and '.join(given)} {verb} a picture (png, svg), not --format {fmt}")
    if args.layout == "coordinates" and args.kind != "cayley":
        raise CommandError(
            "--layout coordinates places classes by their discrete logarithms: it needs --kind cayley, "
            f"not --kind {args.kind}"
        )
    if args.labels == "logs" and args.kind != "cayley":
        raise CommandError(f"--labels logs (discrete logarithms) needs --kind cayley, not --kind {args.kind}")
    if args.kind == "cayley":
        primes = _parse_primes(args.primes) if args.primes is not None else None
        bound = parse_integer(args.bound, "--bound") if args.bound is not None else None
        if bound is not None and bound < 2:
            raise CommandError(f"--bound must be at least 2, not {bound}")
        C = cayley_graph(D, primes, bound=bound)
    elif args.kind == "cycles":
        C = cycle_graph(D)
    else:
        C = fibre_graph(D)

    payload = {
        "output": args.output,
        "format": fmt,
        "kind": args.kind,
        "discriminant": D,
        "node_count": C.number_of_nodes(),
        "edge_count": edge_count(C),
        "directed_edge_count": edge_count(C, directed=True),
        "title": graph_title(C),
    }
    if args.kind == "cayley":
        payload["primes"] = list(C.graph["primes"])
    if fmt in TEXT_FORMATS:
        text = {
            "json": lambda: graph_to_json(C, indent=1 if args.output else None),
            "graphml": lambda: graph_to_graphml(C),
            "dot": lambda: graph_to_dot(C),
        }[fmt]()
        if not text.endswith("\n"):
            text += "\n"
        if not args.output:
            if args.json:  # one JSON object: the summary with the graph inside
                if fmt == "json":
                    payload["graph"] = json.loads(text)
                else:
                    payload["text"] = text
                sys.stdout.write(json.dumps(payload) + "\n")
            else:
                sys.stdout.write(text)
            return 0
        try:
            with open(args.output, "w", encoding="utf-8") as fh:
                fh.write(text)
        except OSError as exc:
            raise CommandError(f"cannot write {args.output!r}: {exc.strerror}") from exc
    else:
        from ..graphs.plotting import save_picture

        try:
            save_picture(
                C,
                args.output,
                fmt,
                labels=args.labels or "auto",
                edges=args.edge_style or "auto",
                layout=args.layout or "rings",
            )
        except OSError as exc:
            raise CommandError(f"cannot write {args.output!r}: {exc.strerror}") from exc

    emit(args, payload, f"wrote {fmt}: {graph_title(C)} ({_counts_text(payload)}) to {args.output}")
    return 0


def register(sub: argparse._SubParsersAction, parent: argparse.ArgumentParser) -> None:
    """Add the ``graph`` command."""
    p = sub.add_parser(
        "graph",
        parents=[parent],
        help="the class group as a graph: Cayley graph, cycles of reduced forms, fibres of an order",
        description=(
            "Build a graph of the class group of D and write it as node-link JSON, GraphML, DOT "
            "or a picture (PNG/SVG, needs matplotlib: pip install 'formkit[plot]'). "
            "--kind cayley (default): one node per class, edges x -> x*[p] for prime forms [p]; "
            "without --primes/--bound the smallest primes that generate the group are used. "
            "--kind cycles (D > 0): the reduced forms with the reduction operator rho as edges, "
            "one cycle per narrow class. --kind fibres (D = f^2 d_K, f > 1): the map "
            "Cl(D) -> Cl(d_K). Text formats go to stdout unless --output is given; the format "
            "is taken from the --output suffix when --format is not given. With --json one JSON "
            "object is printed: a summary (node_count; edge_count, the undirected edges {x, x·[p]}, a "
            "generator of order 2 joining each pair once; directed_edge_count, the arrows x -> x·[p] "
            "of the node-link graph; primes; output file) holding the graph "
            "under 'graph' (node-link) or the GraphML/DOT text under 'text' when written to stdout. "
            "Python: formkit.cayley_graph(D, primes), formkit.cycle_graph(D), formkit.fibre_graph(D), "
            "formkit.graph_to_json / graph_to_graphml / graph_to_dot, "
            "formkit.graphs.plotting.save_picture(C, file, layout=..., labels=..., edges=...)."
        ),
        epilog=(
            "examples:\n"
            "  formkit graph -23 --primes 2\n"
            "  formkit graph -23 --primes 2 --format dot\n"
            "  formkit graph -4620 --bound 20 --output cl4620.png\n"
            "  formkit graph -4620 --layout coordinates --labels logs --output cl4620-grid.png\n"
            "  formkit graph 316 --kind cycles --format graphml --output cycles.graphml\n"
            "  formkit graph -207 --kind fibres"
        ),
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    from .conventions import add_discriminant_argument

    add_discriminant_argument(p, "a discriminant (non-square, 0 or 1 mod 4), e.g. -23, 316, -4*10^4")
    which = p.add_mutually_exclusive_group()
    which.add_argument(
        "--primes", metavar="P,Q,...", help="label the edges by these primes (comma-separated)"
    )
    which.add_argument(
        "--bound",
        metavar="B",
        help="use every prime p <= B with a primitive prime form (chi_D(p) != -1, p not dividing the conductor)",
    )
    p.add_argument(
        "--kind",
        choices=("cayley", "cycles", "fibres"),
        default="cayley",
        help="which graph (default cayley)",
    )
    p.add_argument("--format", choices=FORMATS, help="output format (default: from --output, else json)")
    p.add_argument(
        "--layout",
        choices=LAYOUTS,
        help="pictures: rings (default; the cosets of the largest cyclic subgroup as rings), "
        "coordinates (--kind cayley: each class at its discrete logarithm, a circle for a cyclic "
        "group, a grid of the two largest factors, blocks for the others), circle (one circle)",
    )
    p.add_argument(
        "--labels",
        choices=LABELS,
        help="pictures: write beside each node its form (a, b, c), its order, its discrete "
        "logarithm (logs, --kind cayley) or nothing (none); default auto: forms up to 40 nodes",
    )
    p.add_argument(
        "--edge-style",
        choices=EDGE_STYLES,
        help="pictures: curved arrows, straight arrows (faster for hundreds of edges), or auto "
        "(default: straight above 60 nodes)",
    )
    p.add_argument("--output", "-o", metavar="FILE", help="write to FILE (needed for png and svg)")
    p.set_defaults(handler=_cmd_graph)


__all__ = ["register"]
