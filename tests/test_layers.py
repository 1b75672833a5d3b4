"""The layers of formkit: imports run only downwards, and no module imports itself in a circle.

The import graph is read from the source with ``ast`` — every ``import`` and ``from …
import`` statement, including those inside functions (a lazy import is still a
dependency) — so it sees what running the code might not.  The order of the layers is
defined once, in ``LAYERS`` below; a new subpackage or top-level module must be placed
there.  (Layering and acyclic dependencies: common practice, no outside source.)
"""

from __future__ import annotations

import ast
import pathlib

import networkx as nx

import formkit

#: Bottom to top.  A module may import modules of its own subpackage (without circles)
#: and of lower layers; subpackages that share a layer do not import each other.
LAYERS = (
    {"formkit.errors", "formkit._version"},
    {"formkit.core"},
    {"formkit.analytic"},
    {"formkit.classgroups"},
    {"formkit.representation"},
    {"formkit.graphs", "formkit.tables", "formkit.explain"},
    {"formkit.cli"},
    {"formkit", "formkit.__main__"},
)

ROOT = pathlib.Path(formkit.__file__).parent


def source_modules(root: pathlib.Path) -> dict:
    """``{module name: path}`` for every ``.py`` file of the package at ``root``."""
    out = {}
    for path in sorted(root.rglob("*.py")):
        parts = (root.name,) + path.relative_to(root).with_suffix("").parts
        if parts[-1] == "__init__":
            parts = parts[:-1]
        out[".".join(parts)] = path
    return out


def _is_package(name: str, modules: dict) -> bool:
    return modules[name].name == "__init__.py"


def import_graph(root: pathlib.Path) -> nx.DiGraph:
    """Module → module edges of every import between modules of the package at ``root``."""
    modules = source_modules(root)
    top = root.name
    graph = nx.DiGraph()
    graph.add_nodes_from(modules)
    for name, path in modules.items():
        package = name if _is_package(name, modules) else name.rpartition(".")[0]
        tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
        for node in ast.walk(tree):
            targets = []
            if isinstance(node, ast.Import):
                targets = [alias.name for alias in node.names]
            elif isinstance(node, ast.ImportFrom):
                if node.level:
                    base = package.split(".")
                    base = base[: len(base) - (node.level - 1)]
                    source = ".".join(base + ([node.module] if node.module else []))
                else:
                    source = node.module or ""
                for alias in node.names:
                    # `from package import submodule` depends on the submodule itself
                    sub = f"{source}.{alias.name}"
                    targets.append(sub if sub in modules else source)
            for target in targets:
                if target != top and not target.startswith(top + "."):
                    continue
                while target not in modules and "." in target:  # `import a.b.c` of a non-module
                    target = target.rpartition(".")[0]
                graph.add_edge(name, target, line=node.lineno)
    return graph


def layer_of(name: str, layers=LAYERS):
    """``(rank, layer unit)`` of a module: the entry of ``layers`` it belongs to."""
    for rank, units in enumerate(layers):
        for unit in units:
            if name == unit or (name.startswith(unit + ".") and unit.count(".") >= 1):
                return rank, unit
    return None


def layer_problems(graph: nx.DiGraph, layers=LAYERS) -> list:
    """Every import that runs up or sideways, every unplaced module, every circle."""
    problems = []
    for name in sorted(graph):
        if layer_of(name, layers) is None:
            problems.append(f"{name} belongs to no layer (add it to LAYERS in tests/test_layers.py)")
    for a, b, data in sorted(graph.edges(data=True)):
        la, lb = layer_of(a, layers), layer_of(b, layers)
        if la is None or lb is None or a == b:
            continue
        where = f"{a} imports {b} (line {data['line']})"
        if lb[0] > la[0]:
            problems.append(f"upward import: {where}")
        elif lb[0] == la[0] and lb[1] != la[1]:
            problems.append(f"sideways import between layers of one rank: {where}")
        elif la[1] == lb[1] and b == la[1] and a != b:
            problems.append(f"a module imports its own subpackage's __init__: {where}")
    for component in nx.strongly_connected_components(graph):
        if len(component) > 1:
            problems.append("import circle: " + " <-> ".join(sorted(component)))
    for a, _b in nx.selfloop_edges(graph):
        problems.append(f"{a} imports itself")
    return problems


def test_every_import_runs_down_the_layers_without_circles():
    graph = import_graph(ROOT)
    assert graph.number_of_edges() > 100  # the walk really sees the imports
    assert graph.has_edge("formkit.classgroups.dispatch", "formkit.classgroups.enumerated")  # a lazy one
    assert layer_problems(graph) == []


def test_no_dynamic_imports():
    # importlib.import_module or __import__ would hide an edge from the graph above
    for name, path in source_modules(ROOT).items():
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            if isinstance(node, ast.Call):
                f = node.func
                called = f.attr if isinstance(f, ast.Attribute) else getattr(f, "id", None)
                assert called not in ("import_module", "__import__"), (
                    f"dynamic import in {name}, line {node.lineno}"
                )


def test_the_check_finds_upward_imports_and_circles(tmp_path):
    # a small package with one import of every forbidden kind: the check must name each
    pkg = tmp_path / "pkg"
    (pkg / "low").mkdir(parents=True)
    (pkg / "high").mkdir()
    (pkg / "side").mkdir()
    (pkg / "__init__.py").write_text("from . import high\n")
    (pkg / "low" / "__init__.py").write_text("")
    (pkg / "low" / "a.py").write_text("def f():\n    from ..high.b import g  # lazy, but upward\n")
    (pkg / "low" / "c.py").write_text("from .d import x\n")
    (pkg / "low" / "d.py").write_text("from .c import y\n")
    (pkg / "low" / "e.py").write_text("from . import helper\n")
    (pkg / "high" / "__init__.py").write_text("")
    (pkg / "high" / "b.py").write_text("from ..low.a import f\nfrom ..side.s import z\n")
    (pkg / "side" / "__init__.py").write_text("")
    (pkg / "side" / "s.py").write_text("")
    (pkg / "stray.py").write_text("")
    layers = ({"pkg.low"}, {"pkg.high", "pkg.side"}, {"pkg"})
    problems = layer_problems(import_graph(pkg), layers)
    assert "upward import: pkg.low.a imports pkg.high.b (line 2)" in problems
    assert "sideways import between layers of one rank: pkg.high.b imports pkg.side.s (line 2)" in problems
    assert "import circle: pkg.low.c <-> pkg.low.d" in problems
    assert "import circle: pkg.high.b <-> pkg.low.a" in problems
    assert "a module imports its own subpackage's __init__: pkg.low.e imports pkg.low (line 1)" in problems
    assert "pkg.stray belongs to no layer (add it to LAYERS in tests/test_layers.py)" in problems
    assert len(problems) == 6
