"""Benchmark: building, exporting and drawing class-group graphs (formkit.graphs).

For Cayley graphs of class groups with h ≈ 20 … 200 (default primes, so about log₂ h
primes and h·#primes edges) the script times, in one process and side by side:

* ``cayley_graph`` (the class group itself is cached first and not timed);
* the three text exports ``graph_to_json``, ``graph_to_graphml``, ``graph_to_dot``;
* a PNG picture (``save_picture``, 150 dpi) with ``edges="curved"`` (one
  FancyArrowPatch per edge) and ``edges="straight"`` (one ``quiver`` per prime),
  alternating the two in every repeat; the median of each and their ratio are printed.

Usage::

    python benchmarks/bench_graphs.py [--repeats 3]
"""

from __future__ import annotations

import argparse
import os
import platform
import statistics
import sys
import tempfile
import time

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.dirname(HERE))

CASES = [-455, -1799, -7991, -60896]  # h = 20, 50, 100, 200


def _time(fn, repeats):
    out = []
    for _ in range(repeats):
        t = time.perf_counter()
        fn()
        out.append(time.perf_counter() - t)
    return statistics.median(out)


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeats", type=int, default=3)
    args = ap.parse_args()

    import matplotlib

    from formkit.classgroups.dispatch import class_group
    from formkit.graphs import cayley_graph, graph_to_dot, graph_to_graphml, graph_to_json
    from formkit.graphs.plotting import save_picture

    print(f"python {platform.python_version()}, matplotlib {matplotlib.__version__}, {platform.machine()}")
    print(f"medians of {args.repeats} runs, seconds")
    head = f"{'D':>8} {'h':>4} {'edges':>6} {'build':>7} {'json':>7} {'graphml':>8} {'dot':>7} {'png curved':>11} {'png straight':>13} {'ratio':>6}"
    print(head)
    tmp = tempfile.mkdtemp()
    save_picture(cayley_graph(-23), os.path.join(tmp, "warm.png"))  # imports, font cache
    for D in CASES:
        G = class_group(D)
        C = cayley_graph(D)
        build = _time(lambda: cayley_graph(D), args.repeats)
        tj = _time(lambda: graph_to_json(C), args.repeats)
        tg = _time(lambda: graph_to_graphml(C), args.repeats)
        td = _time(lambda: graph_to_dot(C), args.repeats)
        curved, straight = [], []
        for _ in range(args.repeats):
            for style, acc in (("curved", curved), ("straight", straight)):
                t = time.perf_counter()
                save_picture(C, os.path.join(tmp, f"{-D}-{style}.png"), edges=style)
                acc.append(time.perf_counter() - t)
        c, s = statistics.median(curved), statistics.median(straight)
        print(
            f"{D:>8} {G.order:>4} {C.number_of_edges():>6} {build:>7.3f} {tj:>7.3f} {tg:>8.3f} {td:>7.3f} "
            f"{c:>11.2f} {s:>13.2f} {c / s:>6.1f}"
        )


if __name__ == "__main__":
    main()
