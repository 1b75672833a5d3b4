"""The graph classes returned by :mod:`formkit.graphs.construction`, with their displays.

:class:`CayleyGraph` (a :class:`networkx.MultiDiGraph`), :class:`CycleGraph` and
:class:`FibreGraph` (:class:`networkx.DiGraph`) are the networkx classes themselves with
three additions, so that a graph reads well in a terminal and in a notebook:

* ``repr(C)``: the title (:func:`formkit.graphs.labels.graph_title`), the numbers of nodes
  and edges (undirected edges as :func:`formkit.graphs.construction.edge_count` counts
  them) and how the class group was obtained;
* ``_repr_html_``: the picture of :func:`formkit.graphs.plotting.draw_graph` as inline SVG
  (when matplotlib is installed and the graph has at most :data:`INLINE_PICTURE_LIMIT`
  nodes) under the same caption, with a GRH mark on a conditional group;
* ``_repr_latex_``: the caption in LaTeX (``\\operatorname{Cl}(D) \\cong C_2 \\times C_6``).

Everything else is networkx's: the subclasses add no state, and copies, subgraphs and
``networkx`` algorithms behave as for the base classes.

References
----------
.. [1] A. Hagberg, D. Schult, P. Swart, "Exploring network structure, dynamics, and
       function using NetworkX", SciPy 2008 (graph classes made to be subclassed).
"""

from __future__ import annotations

import html
import io

import networkx as nx

__all__ = ["CayleyGraph", "CycleGraph", "FibreGraph"]

#: Largest graph drawn inline by ``_repr_html_`` (larger ones show the caption only).
INLINE_PICTURE_LIMIT = 400


def _conditional(C: nx.Graph) -> bool:
    prov = str(C.graph.get("provenance", ""))
    return "conditional on" in prov


def _counts(C: nx.Graph) -> str:
    from .reading import edge_count

    n = C.number_of_nodes()
    e = edge_count(C)
    d = edge_count(C, directed=True)
    text = f"{n} node{'s' if n != 1 else ''}, {e} edge{'s' if e != 1 else ''}"
    if d != e:
        text += f" undirected, {d} directed"
    return text


def _how(C: nx.Graph) -> str:
    prov = str(C.graph.get("provenance", ""))
    return prov.split(";")[0] if prov else "provenance unknown"


class _ClassGraphDisplay:
    """``repr``, ``_repr_html_`` and ``_repr_latex_`` for the graphs of :mod:`formkit.graphs`."""

    graph: dict

    def __repr__(self) -> str:
        from .labels import graph_title

        C: nx.Graph = self
        return f"<{graph_title(C)}: {_counts(C)}; {_how(C)}>"

    def __str__(self) -> str:
        return repr(self)[1:-1]

    def _repr_html_(self) -> str:
        from .labels import graph_title

        C: nx.Graph = self
        mark = " <b>[GRH]</b>" if _conditional(C) else ""
        caption = (
            f"<p>{html.escape(graph_title(C))}: {html.escape(_counts(C))}{mark}<br>"
            f"<small>{html.escape(str(C.graph.get('provenance', '')))}</small></p>"
        )
        if C.number_of_nodes() > INLINE_PICTURE_LIMIT:
            return caption
        try:
            from .plotting import draw_graph

            fig = draw_graph(C)
        except Exception:  # no matplotlib (FormkitError) or a drawing problem: the caption alone
            return caption
        buf = io.StringIO()
        fig.savefig(buf, format="svg")
        svg = buf.getvalue()
        svg = svg[svg.find("<svg") :]  # drop the XML prologue: inline SVG in HTML
        return caption + svg

    def _repr_latex_(self) -> str:
        C: nx.Graph = self
        g = C.graph
        D = g.get("discriminant")
        kind = g.get("kind")
        cond = r"\ [\text{conditional on GRH}]" if _conditional(C) else ""
        if kind == "cayley":
            inv = r" \times ".join(f"C_{{{n}}}" for n in g.get("invariants", ())) or "C_1"
            cl = r"\operatorname{Cl}^{+}" if D > 0 else r"\operatorname{Cl}"
            ps = ", ".join(str(p) for p in g["primes"]) or "none"
            head = rf"\text{{Cayley graph of }} {cl}({D}) \cong {inv},\ h = {g['class_number']}"
            return rf"${head},\ \text{{primes }} {ps}{cond}$ ({_counts(C)}; {_how(C)})"
        if kind == "cycles":
            return (
                rf"$\text{{cycles of reduced forms of }} D = {D} \text{{ under }} \rho,\ "
                rf"h^{{+}} = {g['class_number']}{cond}$ ({_counts(C)}; {_how(C)})"
            )
        return (
            rf"$\operatorname{{Cl}}({D}) \to \operatorname{{Cl}}({g.get('fundamental_discriminant')}),\ "
            rf"f = {g.get('conductor')},\ \text{{fibres of }} {g.get('fibre_size')}{cond}$ ({_counts(C)}; {_how(C)})"
        )


class CayleyGraph(_ClassGraphDisplay, nx.MultiDiGraph):
    """The Cayley graph of :func:`formkit.graphs.cayley_graph`: a :class:`networkx.MultiDiGraph`."""


class CycleGraph(_ClassGraphDisplay, nx.DiGraph):
    """The graph of ρ-cycles of :func:`formkit.graphs.cycle_graph`: a :class:`networkx.DiGraph`."""


class FibreGraph(_ClassGraphDisplay, nx.DiGraph):
    """The fibres of ``Cl(D) → Cl(d_K)`` of :func:`formkit.graphs.fibre_graph`: a :class:`networkx.DiGraph`."""


#: The class of each kind of graph (``graph.graph["kind"]``).
GRAPH_CLASSES: dict[str, type[nx.Graph]] = {
    "cayley": CayleyGraph,
    "cycles": CycleGraph,
    "fibres": FibreGraph,
}
