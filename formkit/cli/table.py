"""Command ``table``: class-number tables over ranges, resumable SQLite stores, queries."""

from __future__ import annotations

import argparse
import csv
import io
import sys
import textwrap
from collections.abc import Sequence

from ..core.parse import parse_integer
from ..tables.rows import TableRow
from .conventions import integer_type, plural

_FILTERS = ("class_number", "invariants", "conductor", "genera", "fundamental_part")


def _cmd_table(args: argparse.Namespace) -> int:
    from ..tables.parallel import build_table
    from ..tables.store import query_table, table_info
    from .conventions import CommandError

    fmt = "json" if args.json else args.format
    start = None if args.start is None else parse_integer(args.start, "--from")
    stop = None if args.stop is None else parse_integer(args.stop, "--to")
    filters_given = any(getattr(args, k) is not None for k in _FILTERS)

    if args.statistics or args.p_rank or args.p_rank_at_least or args.first or args.plot:
        return _cmd_group_counts(args, start, stop, fmt)

    if args.info:
        if args.db is None:
            raise CommandError("--info needs --db FILE")
        info = table_info(args.db)
        _emit_info(args, info)
        return 0

    query = args.query or filters_given or (args.db is not None and start is None and stop is None)
    if query:
        if args.db is None:
            raise CommandError(
                "querying needs --db FILE (filters such as --class-number read a stored table)"
            )
        rows = query_table(
            args.db,
            start=start,
            stop=stop,
            class_number=None
            if args.class_number is None
            else parse_integer(args.class_number, "--class-number"),
            invariants=args.invariants,
            conductor=None if args.conductor is None else parse_integer(args.conductor, "--conductor"),
            fundamental=args.fundamental,
            fundamental_discriminant=None
            if args.fundamental_part is None
            else parse_integer(args.fundamental_part, "--fundamental-part"),
            genus_count=None if args.genera is None else parse_integer(args.genera, "--genera"),
            limit=args.limit,
        )
        meta = table_info(args.db)["meta"]
        _print_rows(rows, fmt, meta.get("invariants") == "1", meta.get("method", "enumeration"))
        return 0

    if start is None or stop is None:
        raise CommandError(
            "a table needs both --from A and --to B (or --db FILE with filters to query a stored one)"
        )
    if args.limit is not None:
        raise CommandError("--limit applies to queries of a stored table (with --db and filters)")
    invariants = not args.no_invariants
    rows_out: list[TableRow] | None = None if args.db else []
    try:
        summary = build_table(
            args.db,
            start,
            stop,
            fundamental=args.fundamental,
            invariants=invariants,
            workers=args.workers,
            cluster=args.cluster,
            chunk_size=args.chunk_size,
            engine=args.engine,
            rows_out=rows_out,
        )
    except KeyboardInterrupt:
        if args.db:
            info = table_info(args.db)
            sys.stderr.write(
                f"formkit: {plural(info['chunks'], 'finished chunk')} ({plural(info['rows'], 'row')}) are safe in {args.db}; "
                "run the same command again to resume\n"
            )
        raise
    if rows_out is not None:
        rows_out.sort(key=lambda r: (abs(r.discriminant), r.discriminant))
        _print_rows(rows_out, fmt, invariants, _method_name(args.engine))
        return 0
    payload = summary.to_dict()
    method = table_info(args.db)["meta"].get("method", "enumeration")
    payload.update(method=method, certified=True)
    if fmt == "json":
        from .conventions import emit

        emit(args, payload, "")
    else:
        sys.stdout.write(
            f"{summary.path}: D in [{summary.start}, {summary.stop}]: {plural(summary.chunks_computed, 'chunk')} "
            f"computed ({plural(summary.rows_written, 'row')}), {summary.chunks_already_done} already done; "
            f"{summary.seconds:.2f} s on "
            + (f"cluster {summary.cluster}" if summary.cluster else f"{summary.workers} worker(s)")
            + f"; class numbers in the file by {_method_words(method)}, unconditional\n"
        )
    return 0


# ---------------------------------------------------------------------------
# statistics, p-rank queries, first occurrences
# ---------------------------------------------------------------------------


def _prime_rank(text: str, option: str) -> tuple[int, int]:
    """``"P:R"`` → (p, r) with p prime and r ≥ 0."""
    from ..core.arith import is_probable_prime
    from .conventions import CommandError

    parts = text.split(":")
    if len(parts) != 2:
        raise CommandError(f"{option} takes P:R (a prime and a rank, e.g. 3:2), not {text!r}")
    p, r = parse_integer(parts[0], option), parse_integer(parts[1], option)
    if p < 2 or p > 10**6 or not is_probable_prime(p) or r < 0:
        raise CommandError(f"{option} needs a prime P (at most 10^6) and a rank R >= 0, not {text!r}")
    return p, r


def _cmd_group_counts(args: argparse.Namespace, start, stop, fmt: str) -> int:
    from ..tables.rows import table_rows
    from ..tables.statistics import class_group_statistics, first_occurrences, rows_with_rank
    from ..tables.store import query_table, table_info
    from .conventions import CommandError, emit

    if args.db is not None and (start is None) == (stop is None):
        rows: list = query_table(args.db, start=start, stop=stop)
        if table_info(args.db)["meta"].get("invariants") != "1":
            raise CommandError(f"{args.db} was built without invariants; p-ranks need them")
        source = f"rows of {args.db}"
    elif start is None or stop is None:
        raise CommandError("--statistics, --p-rank and --first need --from A --to B, or --db FILE")
    elif args.db is not None:
        rows = query_table(args.db, start=start, stop=stop)
        source = f"rows of {args.db}"
    else:
        rows = table_rows(start, stop, fundamental=args.fundamental, invariants=True, engine=args.engine)
        source = "computed now"
    rows = [r for r in rows if r.discriminant < 0 and (not args.fundamental or r.conductor == 1)]
    provenance = (
        f"{source}; unconditional: h by {'theta series and the Kronecker–Hurwitz relation' if args.engine == 'theta' else 'counting'}, "
        "structure forced by h or from explicit relations"
    )
    if args.statistics:
        stats = class_group_statistics(rows, fundamental=True, provenance=provenance)
        if args.plot:
            stats.plot(args.plot)
        if fmt == "json":
            emit(args, stats.to_dict(), "")
        else:
            sys.stdout.write(stats.text() + "\n")
            if args.plot:
                sys.stdout.write(f"plot written to {args.plot}\n")
        return 0
    if args.plot:
        raise CommandError("--plot goes with --statistics")
    if args.first:
        wanted = [_prime_rank(x, "--first") for x in args.first.split(",")]
        occ = first_occurrences(rows, wanted)
        payload = {
            "first_occurrences": [
                {
                    "prime": p,
                    "rank_at_least": r,
                    "row": None if occ[(p, r)] is None else occ[(p, r)].to_dict(),
                }
                for p, r in wanted
            ],
            "provenance": provenance,
        }

        def human() -> str:
            lines = []
            for p, r in wanted:
                row = occ[(p, r)]
                if row is None:
                    lines.append(f"{p}-rank >= {r}: none in the range")
                else:
                    inv = " × ".join(f"C{n}" for n in row.invariants) or "C1"
                    lines.append(f"{p}-rank >= {r}: first at D = {row.discriminant}, {inv}")
            return "\n".join(lines) + f"\n({provenance})"

        emit(args, payload, human)
        return 0
    for text, at_least in ((args.p_rank, False), (args.p_rank_at_least, True)):
        if text:
            p, r = _prime_rank(text, "--p-rank-at-least" if at_least else "--p-rank")
            rows = rows_with_rank(rows, p, r, at_least=at_least)
    if args.limit is not None:
        rows = rows[: args.limit]
    method = (
        _method_name(args.engine)
        if args.db is None
        else table_info(args.db)["meta"].get("method", "enumeration")
    )
    _print_rows(rows, fmt, True, method)
    return 0


def _method_name(engine: str) -> str:
    """The method key (``enumeration`` or ``theta-relation``) of a run with this ``--engine``."""
    return "theta-relation" if engine == "theta" else "enumeration"


def _method_words(method: str) -> str:
    """The words printed for a method key, or for several joined by `` + `` (a store)."""
    words = {
        "enumeration": "enumeration (counting reduced forms)",
        "theta": "the three-squares theta series (D with d_K ≡ 1 mod 8: counting reduced forms)",
        "theta-relation": "the three-squares theta series (D with d_K ≡ 1 mod 8: the Kronecker–Hurwitz "
        "class number relation)",
    }
    return " and ".join(words.get(m.strip(), m.strip()) for m in method.split("+"))


# ---------------------------------------------------------------------------
# output
# ---------------------------------------------------------------------------


def _inv_plain(inv) -> str:
    """The group in the text notation shared by every command: ``C2 × C4``, the trivial group ``C1``."""
    if inv is None:
        return ""
    return " × ".join(f"C{n}" for n in inv) or "C1"


def _print_rows(
    rows: Sequence[TableRow], fmt: str, with_invariants: bool, method: str = "enumeration"
) -> None:
    out = sys.stdout
    if fmt == "json":
        import json

        payload = {
            "rows": [r.to_dict() for r in rows],
            "count": len(rows),
            "method": method,
            "certified": True,
            "invariants_computed": with_invariants,
        }
        out.write(json.dumps(payload) + "\n")
        return
    positive = any(r.discriminant > 0 for r in rows)
    if fmt == "csv":
        buf = io.StringIO()
        w = csv.writer(buf, lineterminator="\n")
        w.writerow(
            [
                "discriminant",
                "fundamental_discriminant",
                "conductor",
                "class_number",
                "class_number_narrow",
                "structure",
                "genus_count",
                "regulator",
            ]
        )
        for r in rows:
            w.writerow(
                [
                    r.discriminant,
                    r.fundamental_discriminant,
                    r.conductor,
                    r.class_number,
                    r.class_number_narrow,
                    _inv_plain(r.invariants),
                    r.genus_count,
                    "" if r.regulator is None else repr(r.regulator),
                ]
            )
        out.write(buf.getvalue())
        return
    if fmt == "tex":
        out.write(_tex(rows, with_invariants, positive))
        return
    # text: aligned columns
    head = ["D", "d_K", "f", "h"]
    if positive:
        head.append("h+")
    if with_invariants:
        head.append("structure")
    head.append("genera")
    if positive:
        head.append("regulator")
    table = [head]
    for r in rows:
        line = [str(r.discriminant), str(r.fundamental_discriminant), str(r.conductor), str(r.class_number)]
        if positive:
            line.append(str(r.class_number_narrow))
        if with_invariants:
            line.append(_inv_plain(r.invariants))
        line.append(str(r.genus_count))
        if positive:
            line.append("" if r.regulator is None else f"{r.regulator:.12g}")
        table.append(line)
    widths = [max(len(row[i]) for row in table) for i in range(len(head))]
    for row in table:
        out.write("  ".join(cell.rjust(w) for cell, w in zip(row, widths)).rstrip() + "\n")
    out.write(
        f"({plural(len(rows), 'row')}; class numbers by {_method_words(method)}, unconditional"
        + (
            "; h = class number (ideal classes of the order), h+ = narrow class number (forms up to "
            "proper equivalence); the invariants are those of the narrow group Cl+(D) when D > 0"
            if positive
            else ""
        )
        + ")\n"
    )


def _tex(rows: Sequence[TableRow], with_invariants: bool, positive: bool) -> str:
    cols = (
        "rrrr"
        + ("r" if positive else "")
        + ("l" if with_invariants else "")
        + "r"
        + ("r" if positive else "")
    )
    head = [r"$D$", r"$d_K$", r"$f$", r"$h$"]
    if positive:
        head.append(r"$h^{+}$")
    if with_invariants:
        head.append(r"$\mathrm{Cl}^{+}(D)$" if positive else r"$\mathrm{Cl}(D)$")
    head.append("genera")
    if positive:
        head.append(r"$R$")
    lines = [
        "% class-number table written by formkit (enumeration, unconditional)"
        + (
            "; h: ideal classes of the order, h^+: narrow class number (forms up to proper equivalence)"
            if positive
            else ""
        ),
        rf"\begin{{tabular}}{{{cols}}}",
        r"\hline",
        " & ".join(head) + r" \\",
        r"\hline",
    ]
    for r in rows:
        cells = [
            f"${r.discriminant}$",
            f"${r.fundamental_discriminant}$",
            f"${r.conductor}$",
            f"${r.class_number}$",
        ]
        if positive:
            cells.append(f"${r.class_number_narrow}$")
        if with_invariants:
            inv = r.invariants or ()
            cells.append("$" + (r" \times ".join(f"C_{{{n}}}" for n in inv) if inv else "C_1") + "$")
        cells.append(f"${r.genus_count}$")
        if positive:
            cells.append("" if r.regulator is None else f"${r.regulator:.6f}$")
        lines.append(" & ".join(cells) + r" \\")
    lines += [r"\hline", r"\end{tabular}", ""]
    return "\n".join(lines)


def _emit_info(args: argparse.Namespace, info: dict) -> None:
    from .conventions import emit

    def human() -> str:
        m = info["meta"]
        lines = [
            f"table store {info['path']}: {plural(info['rows'], 'row')} in {plural(info['chunks'], 'finished chunk')}",
            "covered: " + (", ".join(f"[{lo}, {hi}]" for lo, hi in info["covered"]) or "nothing yet"),
            f"options: invariants={'yes' if m.get('invariants') == '1' else 'no'}, "
            f"fundamental only={'yes' if m.get('fundamental') == '1' else 'no'}",
            f"method: {m.get('method')} (certified: {'yes' if m.get('certified') == '1' else 'no'}); "
            f"formkit {m.get('formkit_version')}, created {m.get('created')}",
            *(
                f"  {key}: " + ", ".join(f"[{lo}, {hi}]" for lo, hi in spans)
                for key, spans in info.get("methods", {}).items()
            ),
            "  " + m.get("description", ""),
            "verified: every chunk's checksum and every row's identities checked"
            if info.get("verified", True)
            else f"verified: {len(info['damaged'])} DAMAGED chunks (see the error below)",
        ]
        return "\n".join(lines)

    emit(args, info, human)
    if info.get("damaged"):
        from ..errors import StoreDamagedError
        from ..tables.store import _damage_message

        raise StoreDamagedError(_damage_message(info["path"], [tuple(d) for d in info["damaged"]]))


# ---------------------------------------------------------------------------
# registration
# ---------------------------------------------------------------------------


def register(sub: argparse._SubParsersAction, parent: argparse.ArgumentParser) -> None:
    """Add the ``table`` command."""
    p = sub.add_parser(
        "table",
        parents=[parent],
        help="class-number tables over ranges of D (all cores, resumable SQLite file, Dask cluster)",
        description=textwrap.fill(
            "Tabulate every discriminant D with A <= D <= B (non-discriminants and squares are "
            "skipped): D, fundamental part d_K, conductor f, class number h (narrow when D > 0), "
            "invariants of the class group, number of genera, and for D > 0 the wide class number "
            "and the regulator. Negative ranges are swept all at once by counting reduced forms. "
            "With --db FILE the rows go into an SQLite file one chunk per transaction: an "
            "interrupted run (Ctrl-C, kill -9) keeps every finished chunk and the same command "
            "resumes it; the run prints a summary, and the file is read back with filters "
            "(--class-number, --invariants, ...). Without --db the rows are printed. "
            "Python: formkit.table_rows, formkit.build_table, formkit.query_table.",
            width=88,
        ),
        epilog=(
            "examples:\n"
            "  formkit table --from -200 --to -3\n"
            "  formkit table --from 5 --to 200 --fundamental --format csv\n"
            "  formkit table --from -1000000 --to -3 --no-invariants --db neg.db\n"
            "  formkit table --db neg.db --class-number 7 --fundamental\n"
            "  formkit table --from -20000 --to -3 --db groups.db --workers 8\n"
            "  formkit table --db groups.db --invariants 2,2,4 --format tex\n"
            "  formkit table --from -10000000 --to -3 --no-invariants --db big.db --cluster tcp://host:8786\n"
            "  formkit table --db big.db --info\n"
            "  formkit table --from -100000 --to -3 --statistics --plot ranks.png\n"
            "  formkit table --from -20000 --to -3 --fundamental --p-rank-at-least 5:2\n"
            "  formkit table --from -200000 --to -3 --fundamental --first 3:2,5:2,7:2"
        ),
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument(
        "--from", dest="start", metavar="A", help="first discriminant of the range (may be negative)"
    )
    p.add_argument("--to", dest="stop", metavar="B", help="last discriminant of the range (inclusive)")
    p.add_argument(
        "--fundamental",
        action="store_true",
        help="only fundamental discriminants (when building, or as a query filter)",
    )
    p.add_argument(
        "--no-invariants",
        action="store_true",
        help="skip the group structure: class numbers only, far faster (the negative sweep)",
    )
    p.add_argument(
        "--format",
        choices=("text", "csv", "json", "tex"),
        default="text",
        help="output: aligned text (default), CSV, one JSON object, or a LaTeX tabular",
    )
    p.add_argument("--db", metavar="FILE", help="SQLite file to build into (resumable) or to query")
    p.add_argument(
        "--workers",
        type=integer_type("--workers", 1),
        metavar="N",
        help="worker processes (default: all cores)",
    )
    p.add_argument(
        "--cluster",
        metavar="ADDRESS",
        help="run the chunks on this Dask distributed scheduler instead of local processes "
        "(needs formkit[cluster]; formkit must be importable on the workers)",
    )
    p.add_argument(
        "--chunk-size",
        type=integer_type("--chunk-size", 1),
        metavar="N",
        help="consecutive D per chunk and transaction (default 100000, 20000 with invariants, 1000 for D > 0)",
    )
    p.add_argument(
        "--engine",
        choices=("auto", "numpy", "python", "theta"),
        default="auto",
        help="class numbers of negative D: reduced-form sweep (numpy or python) or the "
        "three-squares theta series (theta); auto picks by range",
    )
    s = p.add_argument_group("class-group statistics (rows with invariants, D < 0)")
    s.add_argument(
        "--statistics",
        action="store_true",
        help="counts and frequencies of p-ranks (p = 2, 3, 5, 7; 4-rank), p | h, cyclic groups and "
        "non-cyclic odd parts beside Cohen-Lenstra and Gerth (fundamental D)",
    )
    s.add_argument("--plot", metavar="FILE", help="with --statistics: bar chart (.png or .svg)")
    s.add_argument("--p-rank", metavar="P:R", help="rows whose class group has p-rank exactly R")
    s.add_argument(
        "--p-rank-at-least",
        metavar="P:R",
        help="rows with p-rank at least R (P:2 = the groups containing C(P) × C(P))",
    )
    s.add_argument(
        "--first",
        metavar="P:R,...",
        help="first occurrence (smallest |D|) of p-rank at least R, e.g. 3:3,5:2",
    )
    g = p.add_argument_group("querying a stored table (with --db)")
    g.add_argument(
        "--query", action="store_true", help="print stored rows (of --from/--to) instead of building"
    )
    g.add_argument(
        "--class-number",
        metavar="H",
        help="rows with narrow class number H (forms up to proper equivalence; the class number when D < 0)",
    )
    g.add_argument(
        "--invariants",
        metavar="N1,N2,...",
        help="rows with this group structure: 2,2,4 or 'C2 × C2 × C4' (1 or C1 = trivial)",
    )
    g.add_argument("--conductor", metavar="F", help="rows of conductor F")
    g.add_argument("--fundamental-part", metavar="D_K", help="rows with fundamental discriminant D_K")
    g.add_argument("--genera", metavar="G", help="rows with G genera")
    g.add_argument(
        "--limit", type=integer_type("--limit", 0), metavar="N", help="at most N rows (default all)"
    )
    g.add_argument(
        "--info", action="store_true", help="describe the stored table: options, coverage, provenance"
    )
    p.set_defaults(handler=_cmd_table)


__all__ = ["register"]
