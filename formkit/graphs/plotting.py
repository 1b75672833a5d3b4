"""Pictures of the graphs of :mod:`formkit.graphs` (PNG, SVG) through matplotlib.

matplotlib is an optional dependency (``pip install 'formkit[plot]'``); it is imported
only when a picture is drawn.  The colour tables (:mod:`formkit.graphs.colours`) and
the layout (:func:`graph_layout`) need no matplotlib; the DOT export uses the same colours.

Layout (chosen to stay legible up to a few hundred classes):

* Cayley graphs: the class group is cut into the cosets of ``⟨[p₁]⟩`` for the prime
  ``p₁`` of largest class order; each coset is a ring on which ``[p₁]`` steps one
  place clockwise.  Rings are ordered breadth-first from the principal class along the
  other primes, and each ring starts at ``(start of its parent ring)·[q]``, so the
  other primes appear as parallel chords.  One ring: a circle; at most six large rings
  (or at most three rings of three or more classes):
  concentric shells; otherwise a grid of small rings.
* Cycle graphs: one ring per ρ-cycle (= narrow class), in a grid, radius growing with
  the cycle length.
* Fibre graphs: the classes of ``Cl(d_K)`` as squares in a grid, each in the middle of
  a ring of circles, its fibre (so the edges are spokes and never cross).

Nodes are filled by genus (legend), edges coloured by prime (legend); node labels
``(a, b, c)`` are drawn only for at most 40 nodes, and the principal class has a black
rim.

References
----------
.. [1] J. D. Hunter, "Matplotlib: A 2D graphics environment", Computing in Science &
       Engineering 9 (2007) 90–95.
"""

from __future__ import annotations

import math
import os
from collections.abc import Hashable
from typing import cast

import networkx as nx

from ..errors import FormkitError
from .colours import edge_colours, genus_colours, genus_key

__all__ = [
    "picture_edges",
    "graph_layout",
    "LAYOUTS",
    "LABELS",
    "EDGE_STYLES",
    "draw_graph",
    "save_picture",
    "PICTURE_FORMATS",
]

#: Picture formats written by :func:`save_picture`.
PICTURE_FORMATS = ("png", "svg")
#: Layouts of :func:`graph_layout`: ``"rings"`` (default: cosets of the largest cyclic
#: subgroup as rings), ``"coordinates"`` (Cayley graphs: the classes at their discrete
#: logarithms, :mod:`formkit.graphs.layouts`), ``"circle"`` (every node on one circle).
LAYOUTS = ("rings", "coordinates", "circle")
#: Node labels of :func:`draw_graph`: ``"auto"`` (forms for at most 40 nodes), ``"forms"``
#: (the reduced form ``(a, b, c)``), ``"orders"`` (the order of the class), ``"logs"``
#: (Cayley graphs: the discrete logarithm), ``"none"``.
LABELS = ("auto", "forms", "orders", "logs", "none")
#: Edge styles of :func:`draw_graph`.
EDGE_STYLES = ("auto", "curved", "straight")

Point = tuple[float, float]


# ---------------------------------------------------------------------------
# layout


def _ring(m: int, centre: Point, r: float, phase: float = 0.0) -> list[Point]:
    if m == 1:
        return [centre]
    return [
        (
            centre[0] + r * math.sin(2 * math.pi * j / m + phase),
            centre[1] + r * math.cos(2 * math.pi * j / m + phase),
        )
        for j in range(m)
    ]


def _grid_centres(R: int) -> list[Point]:
    cols = math.ceil(math.sqrt(R))
    return [(float(k % cols), -float(k // cols)) for k in range(R)]


def picture_edges(C: nx.Graph) -> list[tuple[Hashable, Hashable, int | None, bool]]:
    """The edges a picture draws: ``(u, v, prime, directed)``.

    A Cayley graph's generator of order 2 joins each pair of classes both ways; it is
    drawn as one undirected edge (``directed = False``), so the picture of ``Cl(D)`` with
    ``r`` generators has at most ``r·h`` edges.  Other graphs: every edge, directed.

    >>> from formkit.graphs.construction import cayley_graph
    >>> C = cayley_graph(-84)                      # C2 × C2: two generators of order 2
    >>> len(picture_edges(C)), C.number_of_edges()
    (4, 8)
    """
    if C.graph.get("kind") != "cayley":
        return [(u, v, None, True) for u, v in C.edges()]
    from .reading import prime_orders

    orders = prime_orders(C)
    out: list[tuple[Hashable, Hashable, int | None, bool]] = []
    seen: set = set()
    for u, v, q in C.edges(data="prime"):
        if orders.get(q) == 2:
            key = (q, frozenset((u, v)))
            if key in seen:
                continue
            seen.add(key)
            out.append((u, v, q, False))
        else:
            out.append((u, v, q, True))
    return out


def _ring_prime(C: nx.Graph) -> int | None:
    """The prime of largest class order (smallest such prime), None without primes."""
    from .reading import prime_orders

    primes = list(C.graph.get("primes", []))
    if not primes:
        return None
    orders = prime_orders(C)
    return max(primes, key=lambda p: (orders[p], -p))


def _cayley_rings(C: nx.Graph) -> list[list[Hashable]]:
    primes = list(C.graph.get("primes", []))
    nodes = list(C.nodes)
    p1 = _ring_prime(C)
    if p1 is None:
        return [[n] for n in nodes]
    step: dict[int, dict[Hashable, Hashable]] = {p: {} for p in primes}
    for u, v, q in C.edges(data="prime"):
        step[q][u] = v
    ring_of: dict[Hashable, int] = {}
    rings: list[list[Hashable]] = []

    def make_ring(base: Hashable) -> None:
        ring, x = [base], step[p1][base]
        while x != base:
            ring.append(x)
            x = step[p1][x]
        for y in ring:
            ring_of[y] = len(rings)
        rings.append(ring)

    starts = [tuple(C.graph["identity"])] + nodes
    for s in starts:
        if s in ring_of:
            continue
        make_ring(s)
        queue = [len(rings) - 1]
        while queue:
            k = queue.pop(0)
            base = rings[k][0]
            for q in primes:
                v = step[q][base]
                if v not in ring_of:
                    make_ring(v)
                    queue.append(len(rings) - 1)
    return rings


def _place_rings(rings: list[list[Hashable]], scale_by_size: bool) -> dict[Hashable, Point]:
    pos: dict[Hashable, Point] = {}
    R = len(rings)
    m = max(len(r) for r in rings)
    if R == 1:
        for n, p in zip(rings[0], _ring(len(rings[0]), (0.0, 0.0), 1.0)):
            pos[n] = p
    elif not scale_by_size and R <= 6 and m >= 3 and (m >= 8 or R <= 3):
        for k, ring in enumerate(rings):
            r = 0.5 + 0.5 * k / (R - 1)
            for n, p in zip(ring, _ring(len(ring), (0.0, 0.0), r)):
                pos[n] = p
    else:
        for ring, c in zip(rings, _grid_centres(R)):
            r = (0.38 if scale_by_size else 0.3) * (math.sqrt(len(ring) / m) if scale_by_size else 1.0)
            for n, p in zip(ring, _ring(len(ring), c, max(r, 0.16), 0.0 if len(ring) > 2 else math.pi / 2)):
                pos[n] = p
    return pos


def _cycle_rings(C: nx.Graph) -> list[list[Hashable]]:
    rings = []
    seen = set()
    starts = sorted(C.nodes, key=lambda n: (tuple(C.nodes[n].get("class_form", n)) != tuple(n), n))
    for s in starts:
        if s in seen:
            continue
        ring, x = [s], next(iter(C.successors(s)))
        seen.add(s)
        while x != s:
            ring.append(x)
            seen.add(x)
            x = next(iter(C.successors(x)))
        rings.append(ring)
    rings.sort(key=lambda r: -len(r))
    return rings


def _fibre_layout(C: nx.Graph) -> dict[Hashable, Point]:
    top = [n for n, s in C.nodes(data="bipartite") if s == 1]
    pos: dict[Hashable, Point] = {}
    for y, c in zip(top, _grid_centres(len(top))):
        pos[y] = c
        fibre = sorted(C.predecessors(y))
        if len(fibre) == 1:
            pos[fibre[0]] = (c[0], c[1] - 0.3)
            continue
        for x, p in zip(fibre, _ring(len(fibre), c, 0.34, math.pi / 2 if len(fibre) == 2 else 0.0)):
            pos[x] = p
    return pos


def graph_layout(C: nx.Graph, layout: str = "rings") -> dict[Hashable, Point]:
    """Node positions for a graph of :mod:`formkit.graphs` (see the module docstring).

    ``layout`` is one of :data:`LAYOUTS`; ``"coordinates"`` needs a Cayley graph.

    Examples
    --------
    >>> from formkit.graphs import cayley_graph
    >>> pos = graph_layout(cayley_graph(-23, [2]))
    >>> [tuple(round(c, 3) for c in pos[n]) for n in [(1, 1, 6), (2, 1, 3), (2, -1, 3)]]
    [(0.0, 1.0), (0.866, -0.5), (-0.866, -0.5)]
    """
    if layout not in LAYOUTS:
        raise FormkitError(f"layout must be one of {', '.join(LAYOUTS)}, not {layout!r}")
    kind = C.graph.get("kind")
    if C.number_of_nodes() == 0:
        return {}
    if layout == "coordinates":
        from .layouts import coordinate_layout

        return coordinate_layout(C)
    if layout == "circle":
        nodes = sorted(C.nodes, key=lambda v: (v != tuple(C.graph.get("identity", ())), v))
        return dict(zip(nodes, _ring(len(nodes), (0.0, 0.0), 1.0)))
    if kind == "cayley":
        return _place_rings(_cayley_rings(C), False)
    if kind == "cycles":
        return _place_rings(_cycle_rings(C), True)
    if kind == "fibres":
        return _fibre_layout(C)
    return {n: (float(x), float(y)) for n, (x, y) in nx.circular_layout(C).items()}


# ---------------------------------------------------------------------------
# drawing


def _matplotlib():
    try:
        import matplotlib
        from matplotlib.figure import Figure
        from matplotlib.lines import Line2D
    except ImportError as exc:
        raise FormkitError(
            "pictures need matplotlib, which is not installed: pip install 'formkit[plot]'"
        ) from exc
    return matplotlib, Figure, Line2D


def _fast_arrows(ax, pos, el, colour, width, alpha, node_size, scale) -> None:
    """Straight arrows as one matplotlib ``quiver`` (one artist instead of one patch per
    edge), shortened to stop at the node rims; used for large graphs."""
    if not el:
        return
    rim = math.sqrt(node_size) / 2 + 1.5  # points
    X, Y, U, V = [], [], [], []
    for u, v in el:
        (x0, y0), (x1, y1) = pos[u], pos[v]
        dx, dy = x1 - x0, y1 - y0
        length_pts = math.hypot(dx * scale[0], dy * scale[1])
        if length_pts <= 2 * rim:
            continue  # self-loop or touching nodes: nothing visible to draw
        t = rim / length_pts
        X.append(x0 + t * dx)
        Y.append(y0 + t * dy)
        U.append(dx * (1 - 2 * t))
        V.append(dy * (1 - 2 * t))
    if X:
        ax.quiver(
            X,
            Y,
            U,
            V,
            angles="xy",
            scale_units="xy",
            scale=1,
            color=colour,
            alpha=alpha,
            units="inches",
            width=max(0.6, width) / 72,
            headwidth=4.5,
            headlength=5.5,
            headaxislength=5,
            zorder=1,
        )


def _label_kind(labels: bool | str | None, n: int) -> str:
    if labels is None or labels == "auto":
        return "forms" if n <= 40 else "none"
    if labels is True or labels is False:
        return "forms" if labels else "none"
    if labels not in LABELS:
        raise FormkitError(f"labels must be one of {', '.join(LABELS)}, not {labels!r}")
    return str(labels)


def _label_texts(C: nx.Graph, kind: str) -> dict[Hashable, str]:
    from .labels import form_label

    if kind == "forms":
        return {v: form_label(v) for v in C.nodes}
    if kind == "orders":
        return {v: str(d.get("order", "?")) for v, d in C.nodes(data=True)}
    if C.graph.get("kind") != "cayley":
        raise FormkitError("discrete-logarithm labels need a Cayley graph")
    from .layouts import _discrete_logs

    _inv, logs, _basis = _discrete_logs(C)
    return {v: "(" + ", ".join(str(x) for x in e) + ")" for v, e in logs.items()}


def draw_graph(
    C: nx.Graph,
    *,
    labels: bool | str | None = None,
    title: str | None = None,
    edges: str = "auto",
    layout: str = "rings",
):
    """Draw a graph of :mod:`formkit.graphs` on a new matplotlib ``Figure`` (no pyplot state).

    Parameters
    ----------
    labels : str or bool, optional
        One of :data:`LABELS`: ``"forms"`` writes ``(a, b, c)`` beside each node,
        ``"orders"`` the order of the class, ``"logs"`` its discrete logarithm, ``"none"``
        nothing; default ``"auto"``: forms when there are at most 40 nodes (``True`` and
        ``False`` mean ``"forms"`` and ``"none"``).
    title : str, optional
        Default :func:`formkit.graphs.graph_title`.
    edges : {"auto", "curved", "straight"}
        ``"curved"``: one curved arrow patch per edge (parallel and opposite edges stay
        apart); ``"straight"``: straight arrows drawn as one matplotlib ``quiver`` per
        colour, several times faster for hundreds of edges (see
        ``benchmarks/bench_graphs.py``); ``"auto"``: straight above 60 nodes.
    layout : str
        One of :data:`LAYOUTS` (:func:`graph_layout`).

    Returns
    -------
    matplotlib.figure.Figure

    Raises
    ------
    FormkitError
        If matplotlib is not installed, or ``edges`` is not one of the three styles.
    """
    from .labels import form_label, graph_title

    if edges not in EDGE_STYLES:
        raise FormkitError(f"edges must be 'auto', 'curved' or 'straight', not {edges!r}")

    n = C.number_of_nodes()
    kind = C.graph.get("kind")
    pos = graph_layout(C, layout)
    label_kind = _label_kind(labels, n)
    text = _label_texts(C, label_kind) if label_kind != "none" else {}
    labels = bool(text)
    _mpl, Figure, Line2D = _matplotlib()
    side = 6.0 if n <= 12 else (8.0 if n <= 60 else 10.0)
    fig = Figure(figsize=(side + 2.5, side))
    box = (0.02, 0.02, side / (side + 2.5) - 0.02, 0.9)
    ax = fig.add_axes(box)
    ax.set_axis_off()
    ax.set_aspect("equal")
    xs = [p[0] for p in pos.values()] or [0.0]
    ys = [p[1] for p in pos.values()] or [0.0]
    spacing = 1.0  # the rings are laid out for labels 0.09 below a node
    if layout == "coordinates" and n > 1:  # a grid: labels scaled to its mesh
        pts = list(pos.values())
        mesh = min(math.dist(p, q) for i, p in enumerate(pts) for q in pts[i + 1 :]) if n <= 400 else 0.1
        spacing = min(1.0, 3.0 * mesh)
    pad = 0.6 if (layout == "coordinates" and spacing >= 1.0) or (layout == "circle" and labels) else 0.25
    if layout == "coordinates" and len(C.graph.get("invariants", ())) == 1 and labels:
        pad = 0.6  # a circle with its labels outside
    xlim = (min(xs) - pad, max(xs) + pad)
    # a grid: room above the top row for the bowed edges that wrap around
    top = 0.5 if layout == "coordinates" and spacing >= 1.0 else 0.0
    ylim = (min(ys) - pad - (0.1 if labels else 0), max(ys) + pad + top)
    ax.set_xlim(*xlim)
    ax.set_ylim(*ylim)

    gcol = genus_colours(C)
    ecol = edge_colours(C)
    node_size = 700 if n <= 8 else (420 if n <= 20 else (220 if n <= 40 else max(18, int(9000 / n))))
    arrow = 14 if n <= 20 else (10 if n <= 60 else 6)
    width = 1.6 if n <= 40 else (1.0 if n <= 120 else 0.6)
    # points per data unit (for the fast arrows, which must stop at the node rims)
    fw, fh = fig.get_size_inches()
    sx = box[2] * fw * 72 / (xlim[1] - xlim[0])
    sy = box[3] * fh * 72 / (ylim[1] - ylim[0])
    scale = (min(sx, sy), min(sx, sy))
    fast = n > 60 if edges == "auto" else edges == "straight"

    def draw_edges(el, colour, rad, alpha=1.0, directed=True):
        common = {
            "edgelist": el,
            "ax": ax,
            "edge_color": colour,
            "width": width,
            "node_size": node_size,
            "alpha": alpha,
        }
        if not directed:  # a generator of order 2: one straight undirected edge per pair
            nx.draw_networkx_edges(C, pos, arrows=False, **common)
        elif fast:
            _fast_arrows(ax, pos, el, colour, width, alpha, node_size, scale)
        else:
            nx.draw_networkx_edges(
                C, pos, arrows=True, arrowsize=arrow, connectionstyle=f"arc3,rad={rad:.2f}", **common
            )

    if kind == "cayley":
        p1 = _ring_prime(C)
        others = [p for p in C.graph["primes"] if p != p1]
        for i, p in enumerate(([p1] if p1 is not None else []) + others):
            drawn = [(u, v, d) for u, v, q, d in picture_edges(C) if q == p]
            el = [(u, v) for u, v, _d in drawn]
            directed = all(d for _u, _v, d in drawn)
            alpha = 0.75 if fast and p != p1 else 1.0
            if layout == "coordinates":  # unit steps straight, the steps that wrap around bowed
                short = [(u, v) for u, v in el if math.dist(pos[u], pos[v]) <= 1.01]
                draw_edges(short, ecol[p], 0.0, alpha, directed)
                draw_edges([e for e in el if e not in short], ecol[p], 0.25, alpha, directed)
                continue
            draw_edges(el, ecol[p], 0.06 if p == p1 else 0.1 + 0.1 * i, alpha, directed)
    else:
        draw_edges(list(C.edges()), "#555555", 0.08 if kind == "cycles" else 0.0)

    # nodes, by genus and (fibres) by side
    identity = tuple(C.graph.get("identity", ())) or None
    groups: dict[tuple[str, str], list] = {}
    for v, d in C.nodes(data=True):
        shape = "s" if d.get("bipartite") == 1 else "o"
        groups.setdefault((genus_key(C, v), shape), []).append(v)
    for (g, shape), nodes in groups.items():
        nx.draw_networkx_nodes(
            C,
            pos,
            nodelist=nodes,
            ax=ax,
            node_color=gcol[g],
            node_shape=shape,
            node_size=node_size * (1.6 if shape == "s" else 1.0),
            edgecolors="#444444",
            linewidths=0.6 if n > 40 else 0.9,
        )
    for e in (identity, tuple(C.graph.get("identity_maximal", ())) or None):
        if e in pos:
            big_e = C.nodes[e].get("bipartite") == 1
            nx.draw_networkx_nodes(
                C,
                pos,
                nodelist=[e],
                ax=ax,
                node_color=gcol[genus_key(C, e)],
                node_shape="s" if big_e else "o",
                node_size=node_size * (1.6 if big_e else 1.0),
                edgecolors="black",
                linewidths=2.0 if n <= 40 else 1.2,
            )
    if labels:
        fs = 9 if n <= 12 else (7 if n <= 24 else 6)
        on_circle = layout != "rings" and all(abs(math.hypot(*p) - 1) < 1e-9 for p in pos.values())
        if on_circle and n > 1:  # a circle: each label outside its node, pointing away
            for v, (x, y) in pos.items():
                ax.text(
                    1.09 * x,
                    1.09 * y,
                    text[v],
                    fontsize=fs,
                    ha="left" if x > 0.15 else ("right" if x < -0.15 else "center"),
                    va="bottom" if y > 0.15 else ("top" if y < -0.15 else "center"),
                )
        elif layout == "coordinates" and spacing >= 1.0:  # a grid: below and above in turn
            for parity, va, dy in ((0, "top", -0.16), (1, "bottom", 0.16)):
                chosen = {v: t for v, t in text.items() if round(pos[v][0]) % 2 == parity}
                nx.draw_networkx_labels(
                    C,
                    {v: (pos[v][0], pos[v][1] + dy) for v in chosen},
                    labels=chosen,
                    ax=ax,
                    font_size=fs,
                    verticalalignment=va,
                )
        else:
            offset = {v: (x, y - 0.09 * spacing) for v, (x, y) in pos.items()}
            nx.draw_networkx_labels(C, offset, labels=text, ax=ax, font_size=fs, verticalalignment="top")
    elif kind == "cycles" and C.graph.get("class_number", 0) <= 60:
        for ring in _cycle_rings(C):
            cx = sum(pos[v][0] for v in ring) / len(ring)
            cy = sum(pos[v][1] for v in ring) / len(ring)
            if len(ring) <= 2:  # no room inside: write the class below the pair
                cy = min(pos[v][1] for v in ring) - 0.08
            ax.text(
                cx,
                cy,
                form_label(cast("tuple[int, int, int]", ring[0])),
                ha="center",
                va="center",
                fontsize=7,
                color="#333333",
            )

    # legends
    handles = []
    genera = list(gcol.items())
    shown = genera if len(genera) <= 16 else genera[:15]
    for g, colour in shown:
        prefix, _, label = g.rpartition(" ")
        legend_text = f"genus {label}" + (f" in Cl({prefix})" if prefix else "")
        handles.append(
            Line2D(
                [],
                [],
                marker="o",
                linestyle="",
                markerfacecolor=colour,
                markeredgecolor="#444444",
                markersize=8,
                label=legend_text,
            )
        )
    if len(genera) > len(shown):
        handles.append(Line2D([], [], linestyle="", label=f"… {len(genera)} genera in all"))
    if kind == "cayley":
        from .reading import prime_orders

        orders = prime_orders(C) if C.graph["primes"] else {}
        for p, colour in ecol.items():
            handles.append(Line2D([], [], color=colour, linewidth=2, label=f"·[{p}]  (order {orders[p]})"))
    if kind == "fibres":
        handles.append(
            Line2D(
                [],
                [],
                marker="s",
                linestyle="",
                markerfacecolor="white",
                markeredgecolor="#444444",
                markersize=9,
                label=f"class of Cl({C.graph['fundamental_discriminant']})",
            )
        )
        handles.append(
            Line2D(
                [],
                [],
                marker="o",
                linestyle="",
                markerfacecolor="white",
                markeredgecolor="#444444",
                markersize=8,
                label=f"class of Cl({C.graph['discriminant']})",
            )
        )
    if label_kind == "logs":
        from .layouts import _discrete_logs

        basis = _discrete_logs(C)[2].split(", [")
        handles.append(Line2D([], [], linestyle="", label="labels: exponents of\n  " + ",\n  [".join(basis)))
    if identity in pos:
        handles.append(
            Line2D(
                [],
                [],
                marker="o",
                linestyle="",
                markerfacecolor="white",
                markeredgecolor="black",
                markeredgewidth=2,
                markersize=8,
                label="principal class",
            )
        )
    fig.legend(handles=handles, loc="upper right", fontsize=8, frameon=False, borderaxespad=0.8)
    fig.suptitle(title if title is not None else graph_title(C), fontsize=10, x=0.02, ha="left")
    return fig


def save_picture(
    C: nx.Graph,
    path: str | os.PathLike[str],
    format: str | None = None,
    *,
    labels: bool | str | None = None,
    edges: str = "auto",
    layout: str = "rings",
    dpi: int = 150,
) -> str:
    """Draw a graph and write it as PNG or SVG; returns the format written.

    Parameters
    ----------
    path : str or path-like
        The output file.
    format : {"png", "svg"}, optional
        Default: from the file suffix.
    labels, edges, layout
        As for :func:`draw_graph`.
    dpi : int
        Resolution of PNG output.

    Raises
    ------
    FormkitError
        If the format is neither png nor svg, or matplotlib is not installed.
    """
    fmt = format
    if fmt is None:
        fmt = os.path.splitext(os.fspath(path))[1].lstrip(".").lower()
    if fmt not in PICTURE_FORMATS:
        raise FormkitError(
            f"picture format must be one of {', '.join(PICTURE_FORMATS)}, not {fmt!r} (from {os.fspath(path)!r})"
        )
    fig = draw_graph(C, labels=labels, edges=edges, layout=layout)
    fig.savefig(path, format=fmt, dpi=dpi)
    return fmt
