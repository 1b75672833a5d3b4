"""Reading a graph of :mod:`formkit.graphs` back: subgroups, cycles, orders, edge counts.

These work on the graphs alone (networkx), so the pictures (:mod:`formkit.graphs.plotting`)
and displays (:mod:`formkit.graphs.results`) use them without building anything; they are
re-exported by :mod:`formkit.graphs.construction` and :mod:`formkit.graphs`.

* :func:`generated_subgroup` — the classes reachable from the identity;
* :func:`cycle_lengths`, :func:`prime_orders` — the cycles of one prime's edges;
* :func:`edge_count` — edges counted as unordered pairs ``{x, x·[p]}`` (or as arrows).

References
----------
.. [1] N. Biggs, *Algebraic Graph Theory*, 2nd ed., Cambridge 1993, Ch. 16 (Cayley graphs).
"""

from __future__ import annotations

from collections.abc import Iterable

import networkx as nx

from ..core.arith import as_int
from ..errors import FormkitError

__all__ = ["generated_subgroup", "cycle_lengths", "prime_orders", "edge_count"]

Triple = tuple[int, int, int]


def _check_cayley(C: nx.Graph) -> None:
    if C.graph.get("kind") != "cayley":
        raise FormkitError(
            f"this needs a Cayley graph from cayley_graph(), not a graph of kind {C.graph.get('kind')!r}"
        )


def _prime_edges(C: nx.Graph, p: int) -> dict[Triple, Triple]:
    if p not in C.graph["primes"]:
        raise FormkitError(f"the prime {p} labels no edge of this graph (its primes: {C.graph['primes']})")
    return {u: v for u, v, q in C.edges(data="prime") if q == p}


def generated_subgroup(C: nx.MultiDiGraph, primes: Iterable[int] | None = None) -> set[Triple]:
    """The classes reachable from the identity along edges of ``primes`` (default: all).

    In a Cayley graph this is the subgroup the classes of those primes generate
    (the group is finite, so forward paths already give inverses).

    Examples
    --------
    >>> from formkit.graphs import cayley_graph
    >>> C = cayley_graph(-420, [2, 3, 5])
    >>> len(generated_subgroup(C)), len(generated_subgroup(C, [2, 3]))
    (8, 4)
    """
    _check_cayley(C)
    chosen = list(C.graph["primes"]) if primes is None else [as_int(p, "prime") for p in primes]
    for p in chosen:
        _prime_edges(C, p)  # checks p labels edges
    H = nx.DiGraph()
    H.add_nodes_from(C.nodes)
    H.add_edges_from((u, v) for u, v, q in C.edges(data="prime") if q in chosen)
    start = tuple(C.graph["identity"])
    return {start} | nx.descendants(H, start)


def cycle_lengths(C: nx.MultiDiGraph, p: int) -> list[int]:
    """Lengths of the cycles formed by the edges of the prime ``p`` (sorted).

    Each has length the order of ``[p]``; there are ``h / order`` of them.

    Examples
    --------
    >>> from formkit.graphs import cayley_graph
    >>> cycle_lengths(cayley_graph(-420, [2]), 2)
    [2, 2, 2, 2]
    """
    _check_cayley(C)
    step = _prime_edges(C, as_int(p, "prime"))
    seen: set[Triple] = set()
    out = []
    for start in step:
        if start in seen:
            continue
        n, x = 0, start
        while True:
            seen.add(x)
            x, n = step[x], n + 1
            if x == start:
                break
        out.append(n)
    return sorted(out)


def prime_orders(C: nx.MultiDiGraph) -> dict[int, int]:
    """The order of each prime's class: the length of its cycle through the identity.

    Examples
    --------
    >>> from formkit.graphs import cayley_graph
    >>> prime_orders(cayley_graph(-71, [2, 3]))
    {2: 7, 3: 7}
    """
    _check_cayley(C)
    out = {}
    start = tuple(C.graph["identity"])
    for p in C.graph["primes"]:
        step = _prime_edges(C, p)
        n, x = 1, step[start]
        while x != start:
            x, n = step[x], n + 1
        out[p] = n
    return out


def edge_count(C: nx.Graph, *, directed: bool = False) -> int:
    """The number of edges of a graph built here, counted as undirected edges (default).

    An undirected edge is an unordered pair ``{x, y}`` joined by one generator: for a
    Cayley graph ``{x, x·[p]}`` for each class ``x`` and prime ``p`` — ``h`` edges for a
    prime of order ``≥ 3``, ``h/2`` for one of order 2 (its arrows ``x → x·[p]`` and
    ``x·[p] → x`` are one edge), ``h`` loops for a principal one; parallel edges of
    different primes count separately.  For a cycle graph the generator is ρ (a cycle of
    two forms is one edge), for a fibre graph each class of ``Cl(D)`` gives one edge to its
    image.  ``directed=True`` counts the arrows stored in the graph instead
    (``C.number_of_edges()``, the ``edges`` of its node-link JSON).

    Examples
    --------
    >>> from formkit.graphs import cayley_graph
    >>> C = cayley_graph(-84)              # C2 × C2, primes 2 and 3 of order 2
    >>> edge_count(C), edge_count(C, directed=True)
    (4, 8)
    >>> edge_count(cayley_graph(-23, [2]))  # C3: a triangle
    3
    """
    if directed:
        return int(C.number_of_edges())
    if not C.is_directed():
        return int(C.number_of_edges())
    arrows = set(C.edges(keys=True)) if C.is_multigraph() else {(u, v, None) for u, v in C.edges()}
    both_ways = sum(1 for u, v, k in arrows if u != v and (v, u, k) in arrows)
    return len(arrows) - both_ways // 2
