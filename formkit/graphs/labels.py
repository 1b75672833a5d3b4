"""Labels of the graphs of :mod:`formkit.graphs`: node keys, genus signs, titles.

Shared by the export (:mod:`formkit.graphs.export`), the colour tables
(:mod:`formkit.graphs.colours`) and the pictures (:mod:`formkit.graphs.plotting`).
"""

from __future__ import annotations

from collections.abc import Sequence

import networkx as nx

__all__ = [
    "node_label",
    "form_label",
    "genus_label",
    "graph_title",
]

Triple = tuple[int, int, int]


def node_label(node: Sequence[int]) -> str:
    """The text key of a node ``(a, b, c)`` in exported graphs: ``"a,b,c"``.

    Examples
    --------
    >>> node_label((2, -1, 3))
    '2,-1,3'
    """
    return ",".join(str(int(v)) for v in node)


def form_label(node: Sequence[int]) -> str:
    """A node ``(a, b, c)`` as a form is written in text: ``"(a, b, c)"`` (pictures, DOT labels).

    Examples
    --------
    >>> form_label((2, -1, 3))
    '(2, -1, 3)'
    """
    return "(" + ", ".join(str(int(v)) for v in node) + ")"


def genus_label(symbol: Sequence[int] | None) -> str:
    """A genus symbol ``(±1, …)`` as a short string of signs, ``'?'`` if unknown.

    Examples
    --------
    >>> genus_label((1, -1, -1)), genus_label(None)
    ('+--', '?')
    """
    if symbol is None:
        return "?"
    return "".join("+" if s > 0 else "-" for s in symbol)


def graph_title(C: nx.Graph) -> str:
    """A one-line description of a graph built here."""
    g = C.graph
    kind = g.get("kind")
    D = g.get("discriminant")
    if kind == "cayley":
        ps = ", ".join(str(p) for p in g["primes"]) or "none"
        cl = "Cl+" if D > 0 else "Cl"
        return f"Cayley graph of {cl}({D}) = {g['structure']}, h = {g['class_number']}, primes {ps}"
    if kind == "cycles":
        return f"cycles of reduced forms of D = {D} under rho, {g['class_number']} narrow classes"
    if kind == "fibres":
        return (
            f"Cl({D}) -> Cl({g['fundamental_discriminant']}), conductor {g['conductor']}, "
            f"h = {g['class_number']} -> {g['class_number_maximal']}, fibres of {g['fibre_size']}"
        )
    return f"graph of {C.number_of_nodes()} nodes"
