"""Displays of table results: one row, a list of rows, in text, HTML and LaTeX.

:class:`ClassNumberTable` is the list of :class:`formkit.tables.rows.TableRow` that
:func:`formkit.table_rows` and :func:`formkit.query_table` return: a plain ``list`` with a
``provenance`` (how every row was obtained) and notebook displays — an HTML table and a
LaTeX ``array`` of the first :data:`SHOWN_ROWS` rows, the number of rows left out said
below them.  Columns: ``D``, ``d_K``, ``f``, the class numbers (``h``, and ``h⁺`` when a
row has ``D > 0``), the group structure (``C2 × C6``, trivial ``C1``; the narrow group
``Cl⁺(D)`` when ``D > 0``), the number of
genera and, when a row has ``D > 0``, the regulator.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, Appendix B (the layout of tables of class groups: D, h, structure).
"""

from __future__ import annotations

import html
from collections.abc import Iterable
from typing import Any

__all__ = ["ClassNumberTable", "SHOWN_ROWS", "TABLE_PROVENANCE"]

#: Rows shown by the notebook displays (the rest are counted, never silently dropped).
SHOWN_ROWS = 40

#: How every row of a table is obtained (the module docstring of :mod:`formkit.tables.rows`).
TABLE_PROVENANCE = (
    "unconditional: class numbers by complete enumeration of reduced forms (or the theta series "
    "of three squares), structures forced by h or built from explicit relations"
)


def _structure(inv: tuple[int, ...] | None) -> str:
    if inv is None:
        return "—"
    return " × ".join(f"C{n}" for n in inv) or "C1"


def _structure_latex(inv: tuple[int, ...] | None) -> str:
    if inv is None:
        return r"\text{--}"
    return r" \times ".join(f"C_{{{n}}}" for n in inv) or "C_1"


def _real(rows: Iterable[Any]) -> bool:
    return any(r.discriminant > 0 for r in rows)


def _cells(r: Any, real: bool) -> list[str]:
    out = [str(r.discriminant), str(r.fundamental_discriminant), str(r.conductor), str(r.class_number)]
    if real:
        out.append(str(r.class_number_narrow))
    out += [_structure(r.invariants), str(r.genus_count)]
    if real:
        out.append("—" if r.regulator is None else f"{r.regulator:.10g}")
    return out


def _head(real: bool) -> list[str]:
    cl = "Cl(D), Cl⁺(D) for D > 0" if real else "Cl(D)"
    return ["D", "d_K", "f", "h", *(["h⁺"] if real else []), cl, "genera", *(["R"] if real else [])]


def _latex_head(real: bool) -> list[str]:
    return [
        "D",
        "d_K",
        "f",
        "h",
        *(["h^{+}"] if real else []),
        r"\operatorname{Cl}(D)" + (r"\ (\operatorname{Cl}^{+}(D),\ D > 0)" if real else ""),
        r"\text{genera}",
        *(["R"] if real else []),
    ]


def _latex_cells(r: Any, real: bool) -> list[str]:
    out = [str(r.discriminant), str(r.fundamental_discriminant), str(r.conductor), str(r.class_number)]
    if real:
        out.append(str(r.class_number_narrow))
    out += [_structure_latex(r.invariants), str(r.genus_count)]
    if real:
        out.append(r"\text{--}" if r.regulator is None else f"{r.regulator:.10g}")
    return out


def rows_html(rows: list[Any], provenance: str, shown: int = SHOWN_ROWS) -> str:
    """An HTML table of the first ``shown`` rows, the rest counted, the provenance below."""
    real = _real(rows)
    head = "".join(f"<th>{html.escape(h)}</th>" for h in _head(real))
    body = "".join(
        "<tr>" + "".join(f"<td>{html.escape(c)}</td>" for c in _cells(r, real)) + "</tr>"
        for r in rows[:shown]
    )
    more = len(rows) - min(len(rows), shown)
    tail = f"<p>… {more} more row{'s' if more != 1 else ''}</p>" if more > 0 else ""
    n = len(rows)
    return (
        f"<table><tr>{head}</tr>{body}</table>{tail}"
        f"<p><small>{n} row{'s' if n != 1 else ''}; {html.escape(provenance)}</small></p>"
    )


def rows_latex(rows: list[Any], provenance: str, shown: int = SHOWN_ROWS) -> str:
    """A LaTeX ``array`` of the first ``shown`` rows, the rest counted, the provenance beside."""
    real = _real(rows)
    cols = "r" * len(_latex_head(real))
    lines = [" & ".join(_latex_head(real))] + [" & ".join(_latex_cells(r, real)) for r in rows[:shown]]
    more = len(rows) - min(len(rows), shown)
    tail = rf" \text{{(… {more} more rows)}}" if more > 0 else ""
    body = " \\\\\n".join(lines)
    return f"$\\begin{{array}}{{{cols}}}\n{body}\n\\end{{array}}{tail}$ ({provenance})"


class ClassNumberTable(list):
    """The rows of a class-number table (a ``list`` of :class:`~formkit.tables.rows.TableRow`).

    ``provenance`` says how the rows were obtained (every row of formkit's tables is
    unconditional).  Displays: ``repr`` (the number of rows, the range and the first
    rows), ``_repr_html_`` (an HTML table) and ``_repr_latex_`` (an ``array``).

    Examples
    --------
    >>> from formkit.tables import table_rows
    >>> t = table_rows(-24, -20)
    >>> t
    <table of 3 rows, D from -20 to -24 (unconditional): -20: h = 2, C2; -23: h = 3, C3; -24: h = 2, C2>
    >>> [r.discriminant for r in t] == [-20, -23, -24], isinstance(t, list)
    (True, True)
    """

    provenance: str

    def __init__(self, rows: Iterable[Any] = (), provenance: str = TABLE_PROVENANCE) -> None:
        super().__init__(rows)
        self.provenance = provenance

    def __repr__(self) -> str:
        n = len(self)
        if not n:
            return f"<table of 0 rows ({self.provenance.split(':')[0]})>"
        first = "; ".join(
            f"{r.discriminant}: h = {r.class_number}"
            + (f", h⁺ = {r.class_number_narrow}" if r.discriminant > 0 else "")
            + (
                f", {'Cl⁺ ' if r.discriminant > 0 else ''}{_structure(r.invariants)}"
                if r.invariants is not None
                else ""
            )
            for r in self[:5]
        )
        more = f"; … {n - 5} more" if n > 5 else ""
        return (
            f"<table of {n} row{'s' if n != 1 else ''}, D from {self[0].discriminant} to {self[-1].discriminant} "
            f"({self.provenance.split(':')[0]}): {first}{more}>"
        )

    def _repr_html_(self) -> str:
        return rows_html(list(self), self.provenance)

    def _repr_latex_(self) -> str:
        return rows_latex(list(self), self.provenance)
