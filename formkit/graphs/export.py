"""Export of the graphs of :mod:`formkit.graphs`: node-link JSON, GraphML and DOT text.

* :func:`graph_to_json` / :func:`graph_from_json` — networkx node-link data, nodes keyed
  by the text ``"a,b,c"`` (JSON has no tuples); :func:`graph_from_json` restores the
  tuple keys and attributes, so a round trip gives an equal graph.
* :func:`graph_to_graphml` — GraphML (list-valued attributes as JSON text), readable by
  ``networkx.read_graphml`` and by graph editors such as yEd or Gephi.
* :func:`graph_to_dot` — Graphviz DOT text written here (Graphviz is not needed), every
  id and value double-quoted with ``\\`` and ``"`` escaped, nodes filled by genus and
  edges coloured by prime with the colours of :mod:`formkit.graphs.colours`.

References
----------
.. [1] A. Hagberg, D. Schult, P. Swart, "Exploring network structure, dynamics, and
       function using NetworkX", SciPy 2008 (node-link data, GraphML I/O).
.. [2] U. Brandes et al., "GraphML Progress Report", Graph Drawing 2001, LNCS 2265.
.. [3] E. R. Gansner, S. C. North, "An open graph visualization system and its
       applications to software engineering", Software—Practice and Experience 30
       (2000) (the DOT language).
"""

from __future__ import annotations

import json

import networkx as nx

from ..errors import FormkitError
from .labels import form_label, genus_label, graph_title, node_label

__all__ = [
    "graph_to_json",
    "graph_from_json",
    "graph_to_graphml",
    "graph_to_dot",
]

Triple = tuple[int, int, int]


def _jsonable(v: object) -> object:
    if isinstance(v, tuple):
        return [_jsonable(t) for t in v]
    if isinstance(v, list):
        return [_jsonable(t) for t in v]
    return v


def _relabelled(C: nx.Graph) -> nx.Graph:
    """A copy with text node keys ``"a,b,c"`` and JSON-ready attributes."""
    H = (nx.MultiDiGraph if C.is_multigraph() else nx.DiGraph)() if C.is_directed() else nx.Graph()
    H.graph.update({k: _jsonable(v) for k, v in C.graph.items()})
    for n, d in C.nodes(data=True):
        H.add_node(node_label(n), **{k: _jsonable(v) for k, v in d.items()})
    if C.is_multigraph():
        for u, v, k, d in C.edges(keys=True, data=True):
            H.add_edge(node_label(u), node_label(v), key=k, **{a: _jsonable(b) for a, b in d.items()})
    else:
        for u, v, d in C.edges(data=True):
            H.add_edge(node_label(u), node_label(v), **{a: _jsonable(b) for a, b in d.items()})
    return H


def graph_to_json(C: nx.Graph, indent: int | None = None) -> str:
    """The graph as networkx node-link JSON, nodes keyed ``"a,b,c"`` (edges under ``"edges"``).

    ``networkx.node_link_graph(json.loads(text))`` reads it back (with text keys);
    :func:`graph_from_json` restores the tuple keys.

    Examples
    --------
    >>> from formkit.graphs import cayley_graph
    >>> data = json.loads(graph_to_json(cayley_graph(-23, [2])))
    >>> data["directed"], data["multigraph"], len(data["nodes"]), data["nodes"][0]["id"]
    (True, True, 3, '1,1,6')
    """
    return json.dumps(nx.node_link_data(_relabelled(C), edges="edges"), indent=indent)


def _key(text: str) -> Triple:
    try:
        a, b, c = (int(t) for t in text.split(","))
    except ValueError as exc:
        raise FormkitError(f"node key must be 'a,b,c', not {text!r}") from exc
    return (a, b, c)


def graph_from_json(text: str) -> nx.Graph:
    """Read a graph written by :func:`graph_to_json`, with tuple node keys again.

    Raises
    ------
    FormkitError
        If the text is not node-link JSON with ``"a,b,c"`` node keys.

    Examples
    --------
    >>> from formkit.graphs import cayley_graph
    >>> C = cayley_graph(-47, [2])
    >>> B = graph_from_json(graph_to_json(C))
    >>> sorted(B.nodes) == sorted(C.nodes), B.graph["identity"]
    (True, (1, 1, 12))
    """
    try:
        data = json.loads(text)
        H = nx.node_link_graph(data, edges="edges")
    except (ValueError, KeyError, TypeError) as exc:
        raise FormkitError(f"not a node-link JSON graph: {exc}") from exc
    mapping = {n: _key(n) for n in H.nodes}
    H = nx.relabel_nodes(H, mapping)
    from .results import GRAPH_CLASSES

    kind = GRAPH_CLASSES.get(str(H.graph.get("kind")))
    if kind is not None and kind().is_multigraph() == H.is_multigraph():
        H = kind(H)  # the class the builders return, with its displays
    for k in ("identity", "identity_maximal"):
        if k in H.graph:
            H.graph[k] = tuple(H.graph[k])
    for _, d in H.nodes(data=True):
        if isinstance(d.get("genus"), list):
            d["genus"] = tuple(d["genus"])
    return H


def _scalar(v: object) -> object:
    if v is None:
        return ""
    if isinstance(v, (list, tuple)):
        return json.dumps(_jsonable(v), separators=(",", ":"))
    if isinstance(v, bool):
        return v
    if isinstance(v, int):
        return int(v)
    return v


def graph_to_graphml(C: nx.Graph) -> str:
    """The graph as GraphML text.

    Node ids are ``"a,b,c"``; list-valued attributes (``form``, ``matrix``,
    ``genus`` …) become JSON text such as ``"[2,1,3]"``; ``genus_label`` adds the
    symbol as signs.  ``networkx.read_graphml`` reads it back.

    Examples
    --------
    >>> from formkit.graphs import cayley_graph
    >>> text = graph_to_graphml(cayley_graph(-23, [2]))
    >>> text.count("<node "), text.count("<edge ")
    (3, 3)
    """
    H = _relabelled(C)
    for _, d in H.nodes(data=True):
        if "genus" in d:
            d["genus_label"] = genus_label(d["genus"])
        for k in list(d):
            d[k] = _scalar(d[k])
    for *_, d in H.edges(data=True):
        for k in list(d):
            d[k] = _scalar(d[k])
    for k in list(H.graph):
        H.graph[k] = _scalar(H.graph[k])
    return "\n".join(nx.generate_graphml(H)) + "\n"


def _dot_quote(v: object) -> str:
    s = str(v)
    s = s.replace("\\", "\\\\").replace('"', '\\"').replace("\n", "\\n")
    return f'"{s}"'


def _dot_attrs(d: dict) -> str:
    return "[" + ", ".join(f"{k}={_dot_quote(v)}" for k, v in d.items()) + "]"


def graph_to_dot(C: nx.Graph) -> str:
    """The graph as Graphviz DOT text (written here; Graphviz is not needed).

    Every id and value is double-quoted with ``\\`` and ``"`` escaped.  Nodes are
    labelled ``(a, b, c)`` and filled by genus; edges are labelled and coloured by prime
    (Cayley graphs) or by ``t`` of the matrix (cycle graphs).

    Examples
    --------
    >>> from formkit.graphs import cayley_graph
    >>> print(graph_to_dot(cayley_graph(-23, [2])))  # doctest: +ELLIPSIS
    digraph "Cl(-23)" {
      graph [label="Cayley graph of Cl(-23) = C3, h = 3, primes 2", ...];
      node [style="filled", fontsize="10"];
      "1,1,6" [label="(1, 1, 6)", order="1", genus="+", fillcolor="#8dd3c7"];
    ...
      "1,1,6" -> "2,1,3" [label="2", prime="2", color="#1b9e77"];
    ...
    }
    """
    from .colours import edge_colours, genus_colours, genus_key

    D = C.graph.get("discriminant")
    gcol = genus_colours(C)
    ecol = edge_colours(C)
    arrow = "->" if C.is_directed() else "--"
    lines = [
        f"{'digraph' if C.is_directed() else 'graph'} {_dot_quote(f'Cl({D})')} {{",
        f"  graph {_dot_attrs({'label': graph_title(C), 'labelloc': 't'})};",
        f"  node {_dot_attrs({'style': 'filled', 'fontsize': 10})};",
    ]
    for n, d in C.nodes(data=True):
        attrs = {"label": form_label(n), "order": d.get("order")}
        attrs["genus"] = genus_label(d.get("genus"))
        if "bipartite" in d:
            attrs["discriminant"] = d["discriminant"]
            attrs["shape"] = "box" if d["bipartite"] == 1 else "ellipse"
        attrs["fillcolor"] = gcol.get(genus_key(C, n), "#dddddd")
        lines.append(f"  {_dot_quote(node_label(n))} {_dot_attrs(attrs)};")
    for u, v, d in C.edges(data=True):
        attrs = {}
        if "prime" in d:
            attrs = {"label": d["prime"], "prime": d["prime"], "color": ecol.get(d["prime"], "#333333")}
        elif "matrix" in d:
            m = d["matrix"]
            attrs = {"label": f"t={m[1][1]}", "matrix": json.dumps(m, separators=(",", ":"))}
        lines.append(
            f"  {_dot_quote(node_label(u))} {arrow} {_dot_quote(node_label(v))} {_dot_attrs(attrs)};"
        )
    lines.append("}")
    return "\n".join(lines) + "\n"
