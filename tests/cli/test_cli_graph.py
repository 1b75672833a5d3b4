"""Tests of ``formkit graph`` (issue 7): formats, output files, options, bad input.

References: networkx's readers (``node_link_graph``, ``read_graphml``) parse what the
command writes; sympy's Kronecker symbol gives the primes of ``--bound``; the PNG
signature is from the PNG specification (RFC 2083, §3.1); class numbers from memory
(h(−23) = 3, h(−47) = 5, h⁺(316) = 6 for Q(√79)).
"""

from __future__ import annotations

import io
import json

import networkx as nx
import pytest
from sympy import kronecker_symbol, primerange

import formkit.cli as cli


def run(argv, capsys):
    code = cli.main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def test_default_is_node_link_json_on_stdout(capsys):
    code, out, err = run(["graph", "-47"], capsys)
    assert code == 0 and err == ""
    G = nx.node_link_graph(json.loads(out), edges="edges")
    assert G.number_of_nodes() == 5  # h(-47) = 5
    # one generator of order 5: the directed 5-cycle (networkx.cycle_graph as reference)
    assert nx.is_isomorphic(G, nx.cycle_graph(5, create_using=nx.DiGraph))


def test_primes_option_out_degree(capsys):
    code, out, _ = run(["graph", "-23", "--primes", "2,3"], capsys)
    assert code == 0
    G = nx.node_link_graph(json.loads(out), edges="edges")
    assert G.graph["primes"] == [2, 3]
    assert all(d == 2 for _, d in G.out_degree())


def test_bound_option_uses_every_non_inert_prime(capsys):
    code, out, _ = run(["graph", "-23", "--bound", "30"], capsys)
    assert code == 0
    G = nx.node_link_graph(json.loads(out), edges="edges")
    # D = -23 is fundamental: every p with (D/p) != -1 (sympy.kronecker_symbol)
    assert G.graph["primes"] == [p for p in primerange(2, 31) if kronecker_symbol(-23, p) != -1]


def test_dot_to_stdout(capsys):
    code, out, _ = run(["graph", "-23", "--primes", "2", "--format", "dot"], capsys)
    assert code == 0
    assert out.startswith('digraph "Cl(-23)" {') and out.rstrip().endswith("}")
    assert out.count(" -> ") == 3


def test_graphml_to_stdout(capsys):
    code, out, _ = run(["graph", "316", "--kind", "cycles", "--format", "graphml"], capsys)
    assert code == 0
    G = nx.read_graphml(io.BytesIO(out.encode()))
    assert nx.number_weakly_connected_components(G) == 6  # h⁺(316) = 6


def test_fibres_kind(capsys):
    code, out, _ = run(["graph", "-207", "--kind", "fibres"], capsys)
    assert code == 0
    G = nx.node_link_graph(json.loads(out), edges="edges")
    bottom = [n for n, s in G.nodes(data="bipartite") if s == 0]
    top = [n for n, s in G.nodes(data="bipartite") if s == 1]
    assert len(top) == 3 and len(bottom) == 6
    assert sorted(G.in_degree(n) for n in top) == [2, 2, 2]


@pytest.mark.parametrize("fmt,ext", [("json", "json"), ("graphml", "graphml"), ("dot", "dot"), ("dot", "gv")])
def test_output_file_and_format_from_suffix(fmt, ext, tmp_path, capsys):
    path = tmp_path / f"g.{ext}"
    code, out, err = run(["graph", "-455", "--output", str(path)], capsys)
    assert code == 0 and err == ""
    assert out.startswith(f"wrote {fmt}:") and str(path) in out
    text = path.read_text()
    if fmt == "json":
        assert nx.node_link_graph(json.loads(text), edges="edges").number_of_nodes() == 20
    elif fmt == "graphml":
        assert nx.read_graphml(str(path)).number_of_nodes() == 20
    else:
        assert text.startswith("digraph")


def test_json_summary_with_output(tmp_path, capsys):
    path = tmp_path / "g.dot"
    code, out, _ = run(["graph", "-455", "-o", str(path), "--json"], capsys)
    assert code == 0
    payload = json.loads(out)
    assert payload["format"] == "dot" and payload["output"] == str(path)
    # Cl(-455) = C2 × C10: directed arrows one per class and prime; undirected edges
    # {x, x·[p]}: h/2 for a prime of order 2, h otherwise (brute force in the group itself)
    from formkit import class_group

    G = class_group(-455)
    h, ps = G.order, payload["primes"]
    assert payload["node_count"] == h == 20 and payload["directed_edge_count"] == h * len(ps)
    orders = {p: G.prime_form(p).order for p in ps}
    assert payload["edge_count"] == sum(h // 2 if orders[p] == 2 else h for p in ps)


def test_summary_line_says_what_is_counted(tmp_path, capsys):
    # Cl(-84) = C2 × C2 with the primes 2, 3 (both of order 2): 4 classes, the 4 undirected
    # edges of a square (networkx: the 2-cube has 4 edges), 8 arrows
    code, out, _ = run(["graph", "-84", "-o", str(tmp_path / "g.dot")], capsys)
    assert code == 0
    assert "4 classes; 4 undirected edges {x, x·[p]}; 8 directed edges x → x·[p]" in out
    assert nx.hypercube_graph(2).number_of_edges() == 4


def test_json_flag_to_stdout_is_one_object(capsys):
    code, out, _ = run(["graph", "-23", "--format", "dot", "--json"], capsys)
    assert code == 0 and out.count("\n") == 1
    payload = json.loads(out)
    assert payload["text"].startswith("digraph")
    code, out, _ = run(["graph", "-23", "--json"], capsys)
    assert json.loads(out)["graph"]["directed"] is True


@pytest.mark.parametrize("ext", ["png", "svg"])
def test_picture_output(ext, tmp_path, capsys):
    pytest.importorskip("matplotlib")
    path = tmp_path / f"g.{ext}"
    code, _out, err = run(["graph", "-455", "--output", str(path)], capsys)
    assert code == 0, err
    data = path.read_bytes()
    if ext == "png":
        assert data[:8] == b"\x89PNG\r\n\x1a\n" and len(data) > 20_000
    else:
        assert b"<svg" in data[:2000]


@pytest.mark.parametrize(
    "argv,needle",
    [
        (["graph", "-23", "--format", "png"], "--output"),
        (["graph", "-23", "--format", "svg"], "--output"),
        (["graph", "-23", "--format", "xml"], "invalid choice"),
        (["graph", "-23", "--primes", "4"], "4 is not prime"),
        (["graph", "-23", "--primes", "5"], "inert"),
        (["graph", "-36", "--primes", "3"], "conductor"),
        (["graph", "-23", "--primes", "2,x"], "'x'"),
        (["graph", "-23", "--primes", "2,,3"], "comma-separated"),
        (["graph", "-23", "--primes", ""], "comma-separated"),
        (["graph", "-23", "--bound", "1"], "at least 2"),
        (["graph", "-23", "--bound", "ten"], "'ten'"),
        (["graph", "-23", "--primes", "2", "--bound", "5"], "not allowed"),
        (["graph", "-22"], "mod 4"),
        (["graph", "16"], "square"),
        (["graph", "abc"], "'abc'"),
        (["graph", "-23", "--kind", "cycles"], "positive discriminant"),
        (["graph", "-23", "--kind", "fibres"], "fundamental"),
        (["graph", "-207", "--kind", "fibres", "--primes", "2"], "--kind cayley"),
        (["graph", "-23", "--kind", "tree"], "invalid choice"),
        (["graph", "-23", "--output", "x.txt"], "cannot tell the format"),
        (["graph", "-23", "--output", "/nonexistent-dir/x.json"], "cannot write"),
    ],
)
def test_bad_input_one_line_exit_2(argv, needle, capsys):
    code, out, err = run(argv, capsys)
    assert code == 2 and out == ""
    lines = err.splitlines()
    assert len(lines) == 1 and lines[0].startswith("formkit: error: ") and "Traceback" not in err
    assert needle in lines[0]


def test_picture_without_matplotlib_is_a_clean_error(monkeypatch, tmp_path, capsys):
    import sys

    monkeypatch.setitem(sys.modules, "matplotlib", None)
    code, _out, err = run(["graph", "-23", "--output", str(tmp_path / "x.png")], capsys)
    assert code == 2 and "formkit[plot]" in err and len(err.splitlines()) == 1


def test_picture_options_on_the_command_line(tmp_path, capsys):
    base = ["graph", "-4620", "-o", str(tmp_path / "a.png"), "--json"]
    code, out, _ = run(base, capsys)
    plain = json.loads(out)
    code, out, _ = run(
        [*base, "--layout", "coordinates", "--labels", "logs", "--edge-style", "curved"], capsys
    )
    assert code == 0 and json.loads(out) == plain  # --json unaffected by the picture options
    assert (tmp_path / "a.png").read_bytes()[:4] == b"\x89PNG"


@pytest.mark.parametrize(
    "argv, needle",
    [
        (["graph", "-23", "--layout", "circle"], "--layout shapes a picture (png, svg), not --format json"),
        (
            ["graph", "316", "--kind", "cycles", "--layout", "coordinates", "-o", "x.png"],
            "needs --kind cayley",
        ),
        (["graph", "316", "--kind", "cycles", "--labels", "logs", "-o", "x.png"], "needs --kind cayley"),
        (["graph", "-23", "--layout", "spiral", "-o", "x.png"], "invalid choice"),
    ],
)
def test_picture_options_bad_use(argv, needle, tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    code, out, err = run(argv, capsys)
    assert code == 2 and out == "" and needle in err and err.count("\n") == 1


def test_cli_picture_choices_match_the_library():
    from formkit.cli import graph as cli_graph
    from formkit.graphs import plotting

    assert cli_graph.LAYOUTS == plotting.LAYOUTS
    assert cli_graph.LABELS == plotting.LABELS
    assert cli_graph.EDGE_STYLES == plotting.EDGE_STYLES
