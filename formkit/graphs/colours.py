"""Colours of the graphs of :mod:`formkit.graphs`: one fill per genus, one stroke per prime.

Used by the DOT export (:mod:`formkit.graphs.export`) and the pictures
(:mod:`formkit.graphs.plotting`), so both show the same colours; no matplotlib needed.

References
----------
.. [1] C. Brewer, colorbrewer2.org (the Set3 and Dark2 palettes used here).
"""

from __future__ import annotations

import colorsys
from collections.abc import Hashable

import networkx as nx

from .labels import genus_label

__all__ = [
    "genus_key",
    "genus_colours",
    "edge_colours",
]

# ColorBrewer Set3 (pastel fills for genera) and Dark2 (strong strokes for primes).
_FILLS = [
    "#8dd3c7",
    "#ffffb3",
    "#bebada",
    "#fb8072",
    "#80b1d3",
    "#fdb462",
    "#b3de69",
    "#fccde5",
    "#d9d9d9",
    "#bc80bd",
    "#ccebc5",
    "#ffed6f",
]
_STROKES = ["#1b9e77", "#d95f02", "#7570b3", "#e7298a", "#66a61e", "#e6ab02", "#a6761d", "#666666"]


def _extra_colours(n: int, light: bool) -> list[str]:
    out = []
    for i in range(n):
        h = (i * 0.618033988749895) % 1.0
        r, g, b = colorsys.hls_to_rgb(h, 0.78 if light else 0.38, 0.65)
        out.append(f"#{round(r * 255):02x}{round(g * 255):02x}{round(b * 255):02x}")
    return out


def _palette(base: list[str], n: int, light: bool) -> list[str]:
    return base[:n] + (_extra_colours(n - len(base), light) if n > len(base) else [])


def genus_key(C: nx.Graph, node: Hashable) -> str:
    """The genus label of a node as used for colours: signs such as ``'+-'``; in a fibre
    graph prefixed by the node's discriminant (``'-455 +--'``), the two groups having
    different characters.

    Examples
    --------
    >>> from formkit.graphs import fibre_graph
    >>> F = fibre_graph(-23 * 9)
    >>> genus_key(F, (1, 1, 6)), genus_key(F, (1, 1, 52))
    ('-23 +', '-207 ++')
    """
    d = C.nodes[node]
    label = genus_label(d.get("genus"))
    if C.graph.get("kind") == "fibres":
        return f"{d.get('discriminant')} {label}"
    return label


def genus_colours(C: nx.Graph) -> dict[str, str]:
    """Fill colour (hex) per genus key (:func:`genus_key`), the principal genus first.

    In a fibre graph each group has its own list, both starting at the first colour.

    Examples
    --------
    >>> from formkit.graphs import cayley_graph
    >>> genus_colours(cayley_graph(-84, [2, 3]))     # characters (n/3), (n/7), delta
    {'+++': '#8dd3c7', '+--': '#ffffb3', '-+-': '#bebada', '--+': '#fb8072'}
    """
    groups: dict[str, set] = {}
    for v in C.nodes:
        key = genus_key(C, v)
        prefix, _, label = key.rpartition(" ")
        groups.setdefault(prefix, set()).add(label)
    out: dict[str, str] = {}
    for prefix in sorted(groups, key=lambda t: (len(t), t)):
        ordered = sorted(groups[prefix], key=lambda s: (s.count("-"), s.count("?"), s))
        for label, colour in zip(ordered, _palette(_FILLS, len(ordered), True)):
            out[f"{prefix} {label}" if prefix else label] = colour
    return out


def edge_colours(C: nx.Graph) -> dict[int, str]:
    """Stroke colour (hex) per prime of a Cayley graph (empty for other graphs).

    Examples
    --------
    >>> from formkit.graphs import cayley_graph
    >>> edge_colours(cayley_graph(-71, [2, 3]))
    {2: '#1b9e77', 3: '#d95f02'}
    """
    primes = list(C.graph.get("primes", []))
    return dict(zip(primes, _palette(_STROKES, len(primes), False)))
