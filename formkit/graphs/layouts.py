"""Layouts of Cayley graphs by the group's own coordinates: discrete logarithms.

``Cl(D) ≅ C_{n_1} × … × C_{n_r}`` (``n_1 | … | n_r``) with generators ``g_1, …, g_r``
(:attr:`formkit.classgroups.group.ClassGroup.generators`): every class is
``g_1^{e_1} ⋯ g_r^{e_r}`` for one vector ``(e_1, …, e_r)``, ``0 ≤ e_i < n_i``
(:meth:`~formkit.classgroups.group.ClassGroup.discrete_log`).  :func:`coordinate_layout`
places the class at its vector:

* ``r = 1`` (cyclic): on a circle, ``e_1`` steps of ``2π/n_1`` clockwise from the top, so
  multiplication by ``g_1`` is a rotation;
* ``r = 2``: on the grid ``(e_2, −e_1)`` — the torus ``Z/n_2 × Z/n_1`` cut open, so
  multiplication by a generator is a shift (and wraps around at the edges);
* ``r ≥ 3``: the grid of the two largest factors inside a block, the blocks placed on a
  grid by the remaining coordinates (``e_1, …, e_{r−2}``, small factors such as the
  2-rank of the genus characters).

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §2.4.3 and §5.4 (structure of finite abelian groups, discrete
       logarithms in class groups).
"""

from __future__ import annotations

import math
from collections.abc import Hashable

import networkx as nx

from ..errors import FormkitError

__all__ = ["coordinate_layout"]

Point = tuple[float, float]


Logs = tuple[tuple[int, ...], dict[Hashable, tuple[int, ...]], str]


def _prime_basis_logs(C: nx.Graph) -> Logs | None:
    """Exponents in the graph's own primes when their classes are a basis (the product of
    their orders is ``h`` and they generate), read off the edges; else None."""
    from .reading import prime_orders

    primes = list(C.graph.get("primes", []))
    if not primes:
        return None
    orders = prime_orders(C)
    if math.prod(orders[p] for p in primes) != C.number_of_nodes():
        return None
    step: dict[int, dict[Hashable, Hashable]] = {p: {} for p in primes}
    for u, v, q in C.edges(data="prime"):
        step[q][u] = v
    logs: dict[Hashable, tuple[int, ...]] = {tuple(C.graph["identity"]): ()}
    for p in primes:  # extend by one coordinate: x·[p]^e for 0 ≤ e < ord([p])
        new: dict[Hashable, tuple[int, ...]] = {}
        for x, e in logs.items():
            y = x
            for k in range(orders[p]):
                new[y] = (*e, k)
                y = step[p][y]
        logs = new
    if len(logs) != C.number_of_nodes():  # the primes do not generate: not a basis
        return None
    # order the coordinates by increasing order of the prime (as n_1 | … | n_r)
    idx = sorted(range(len(primes)), key=lambda i: (orders[primes[i]], i))
    radices = tuple(orders[primes[i]] for i in idx)
    basis = ", ".join(f"[{primes[i]}]" for i in idx)
    return radices, {v: tuple(e[i] for i in idx) for v, e in logs.items()}, basis


def _discrete_logs(C: nx.Graph) -> Logs:
    """The coordinates of every class: in the graph's primes when they form a basis (then
    every edge is a unit step of one coordinate), else in the group's generators; and the
    basis in words (``"[3], [5], [17]"``)."""
    found = _prime_basis_logs(C)
    if found is not None:
        return found
    from ..classgroups.dispatch import class_group

    G = class_group(C.graph["discriminant"])
    inv = tuple(int(n) for n in G.invariants)
    names = ", ".join(f"[({g.form.a}, {g.form.b}, {g.form.c})]" for g in G.generators)
    return inv, {v: tuple(int(e) for e in G.discrete_log(G(v))) for v in C.nodes}, names


def _mixed_radix(digits: tuple[int, ...], radices: tuple[int, ...]) -> int:
    k = 0
    for e, n in zip(digits, radices):
        k = k * n + e
    return k


def coordinate_layout(C: nx.Graph) -> dict[Hashable, Point]:
    """Positions of the classes of a Cayley graph by their discrete logarithms.

    The coordinates are the exponents in the graph's primes when their classes form a basis
    of the group (``∏ ord[p] = h`` and they generate, as the default primes of a group whose
    invariants they match do): then each edge is one step along one axis.  Otherwise they
    are the discrete logarithms in the group's generators.  Grid points are one unit apart;
    blocks are placed so that the picture is about as wide as it is high.

    Raises
    ------
    FormkitError
        If ``C`` is not a Cayley graph of :func:`formkit.graphs.cayley_graph`.

    Examples
    --------
    >>> from formkit.graphs import cayley_graph
    >>> pos = coordinate_layout(cayley_graph(-23))     # C3: a circle
    >>> sorted((round(x, 3), round(y, 3)) for x, y in pos.values())
    [(-0.866, -0.5), (0.0, 1.0), (0.866, -0.5)]
    >>> pos = coordinate_layout(cayley_graph(-420))    # C2 × C2 × C2: two 2 × 2 squares
    >>> len(set(pos.values()))
    8
    """
    if C.graph.get("kind") != "cayley":
        raise FormkitError(
            f"the coordinate layout places classes by their discrete logarithms: it needs a Cayley "
            f"graph, not a graph of kind {C.graph.get('kind')!r}"
        )
    inv, logs, _basis = _discrete_logs(C)
    r = len(inv)
    if r == 0:
        return dict.fromkeys(C.nodes, (0.0, 0.0))
    if r == 1:
        n = inv[0]
        return {
            v: (math.sin(2 * math.pi * e[0] / n), math.cos(2 * math.pi * e[0] / n)) for v, e in logs.items()
        }
    wx, wy = inv[-1], inv[-2]  # the two largest factors: x and y inside a block
    outer = inv[:-2]
    blocks = math.prod(outer)
    cols = min(
        range(1, blocks + 1),
        key=lambda c: (max(c * (wx + 1), math.ceil(blocks / c) * (wy + 1)), c),
    )
    pos: dict[Hashable, Point] = {}
    for v, e in logs.items():
        k = _mixed_radix(e[:-2], outer)
        bx, by = k % cols, k // cols
        pos[v] = (float(bx * (wx + 1) + e[-1]), -float(by * (wy + 1) + e[-2]))
    return pos
