"""Readable reprs and notebook displays of the result types (issue 15, "notebooks").

Every public result type of the tables, graphs, orders and ideals has a ``repr`` that is
not a bare dataclass dump, an ``_repr_html_`` and an ``_repr_latex_`` with its provenance
visible (a GRH mark on a conditional result).  Values shown are checked against the
classical tables (class numbers from memory: h(−23) = 3, h(−20) = 2, Cl(−4620) ≅
C2 × C2 × C6 in Buell's table, h⁺(12) = 2) and brute force where they are counts.
"""

from __future__ import annotations

import re

import pytest

import formkit
from formkit.classgroups.orders import ideal_class_group, projection_kernel_structure
from formkit.core.ideals import factor_ideal, prime_ideals_above, principal_ideal
from formkit.core.quadratic_numbers import QuadraticNumber
from formkit.graphs import cayley_graph, cycle_graph, fibre_graph, graph_from_json, graph_to_json
from formkit.tables import (
    ClassNumberTable,
    hurwitz_class_numbers,
    structure_from_class_number,
    table_rows,
)


def _balanced(latex: str) -> bool:
    depth = 0
    for i, ch in enumerate(latex):
        if ch == "{" and (i == 0 or latex[i - 1] != "\\"):
            depth += 1
        elif ch == "}" and (i == 0 or latex[i - 1] != "\\"):
            depth -= 1
            if depth < 0:
                return False
    return depth == 0


def _check_displays(obj, *needles, conditional=False):
    text = repr(obj)
    assert not re.match(r"^\w+\((\w+=[^,]*, )+\w+=", text), f"bare dataclass repr: {text}"
    h, latex = obj._repr_html_(), obj._repr_latex_()
    assert latex.startswith("$") and latex.count("$") % 2 == 0 and _balanced(latex), latex
    for needle in needles:
        assert needle in h, (needle, h[:300])
    if conditional:
        assert "GRH" in h and "GRH" in latex and "GRH" in text
    else:
        assert "unconditional" in h or "verified" in h, h[:300]


def test_table_rows_display_a_table():
    t = table_rows(-24, -20)
    assert isinstance(t, ClassNumberTable) and isinstance(t, list)
    # h(−20) = 2, h(−23) = 3, h(−24) = 2 (from memory, Buell's table)
    assert [r.class_number for r in t] == [2, 3, 2]
    _check_displays(t, "<table>", "<td>-23</td><td>-23</td><td>1</td><td>3</td><td>C3</td>")
    assert "3 rows" in t._repr_html_()
    _check_displays(t[1], "<td>-23</td>")
    assert repr(t[1]) == "<table row: D = -23, h = 3, Cl = C3, 1 genus; unconditional>"


def test_long_tables_say_how_many_rows_are_left_out():
    t = table_rows(-500, -3, invariants=False)
    # the number of discriminants −500 ≤ D ≤ −3 (D ≡ 0, 1 mod 4), counted by brute force
    n = sum(1 for D in range(-500, -2) if D % 4 in (0, 1))
    assert len(t) == n
    assert f"… {n - 40} more rows" in t._repr_html_()
    assert f"{n - 40} more rows" in t._repr_latex_()


def test_real_rows_show_the_narrow_group_and_regulator():
    r = table_rows(12, 12)[0]
    assert "h⁺ = 2" in repr(r) and "Cl⁺ = C2" in repr(r)  # h⁺(12) = 2: Q(√3) has N(ε) = +1
    assert "h^{+}" in r._repr_latex_() and "<th>R</th>" in r._repr_html_()


def test_structure_and_hurwitz_displays():
    S = structure_from_class_number(-4620, 24)
    _check_displays(S, "C2 × C2 × C6")
    H = hurwitz_class_numbers(12)
    # H(3) = 1/3, H(4) = 1/2, H(12) = 4/3 (Hurwitz class numbers, from memory)
    _check_displays(H, "H(3) = 1/3", "H(4) = 1/2", "H(12) = 4/3")
    assert r"\tfrac{4}{3}" in H._repr_latex_()


def test_build_summary_and_statistic_displays(tmp_path):
    summary = formkit.build_table(str(tmp_path / "t.db"), -200, -3, workers=1)
    text = repr(summary)
    assert text.startswith("<table of D from -200 to -3") and "unconditional" in text
    assert summary._repr_latex_().startswith("$\\text{")
    stats = formkit.class_group_statistics(table_rows(-400, -3))
    line = stats.lines[0]
    assert repr(line).startswith("<") and line.quantity in line._repr_html_()
    assert _balanced(line._repr_latex_())


@pytest.mark.parametrize(
    "C, needles",
    [
        (cayley_graph(-4620), ["C2 × C2 × C6", "<svg", "24 nodes, 48 edges undirected, 72 directed"]),
        (cycle_graph(316), ["6 narrow classes", "<svg"]),
        (fibre_graph(-207), ["Cl(-207) -&gt; Cl(-23)", "<svg"]),
    ],
    ids=["cayley", "cycles", "fibres"],
)
def test_graph_displays_draw_the_picture(C, needles):
    pytest.importorskip("matplotlib")
    _check_displays(C, *needles)


def test_graph_displays_without_matplotlib(monkeypatch):
    import formkit.graphs.plotting as plotting

    def refuse(*a, **k):
        raise formkit.FormkitError("pictures need matplotlib")

    monkeypatch.setattr(plotting, "draw_graph", refuse)
    h = cayley_graph(-23)._repr_html_()
    assert "<svg" not in h and "C3" in h


def test_graph_classes_survive_json_and_copies():
    C = cayley_graph(-23)
    B = graph_from_json(graph_to_json(C))
    assert type(B) is type(C) and repr(B) == repr(C)
    assert type(C.copy()) is type(C)


def test_conditional_graph_is_marked():
    # a graph drawn from a group obtained under GRH carries the mark (baby-step giant-step
    # for Cl(−23) is conditional by construction; the structure C3 is classical)
    C = cayley_graph(-23)
    C.graph["provenance"] = str(formkit.class_group(-23, method="bsgs").provenance)
    _check_displays(C, "C3", conditional=True)


def test_ideal_class_group_and_kernel_displays():
    # Q(√94): Cl⁺ ≅ C2 but Cl ≅ C1 (N(ε) = +1); from memory, Cohen's table
    _check_displays(ideal_class_group(376), "Cl(376) ≅ C1", "Cl<sup>+</sup>(376) ≅ C2")
    _check_displays(ideal_class_group(10**10 + 1), "C2 × C3336", conditional=True)
    # Z[(1+7√-3)/2]: h = 1·7/3·(1 + 1/7) = 2 onto Cl(−3) = 1, so the kernel has 2 classes
    # (Cox, Theorem 7.24: h(O) = h(O_K)·f/[O_K*:O*]·∏(1 − χ(p)/p), χ_{-3}(7) = 1 … = 1·7/3·6/7)
    _check_displays(projection_kernel_structure(-147), "Cl(-147) → Cl(-3) ≅ C2", "2 classes")


def test_ideal_displays():
    F = factor_ideal(principal_ideal(-20, 6))
    # (6) = P2² · P3 · P3' in Z[√-5] (classical: 6 = 2·3 = (1+√-5)(1−√-5))
    _check_displays(F, "[2, -1 + √-5]^2")
    assert F._repr_latex_().count(r"\left[") == 4
    P = prime_ideals_above(-20, 3)
    assert P._repr_latex_().startswith(r"$\text{3 splits")
    ideal = principal_ideal(-20, 3)
    assert "form (" in ideal._repr_html_() and "[" not in ideal._repr_html_().split("form")[1]


def test_principality_and_numbers_display():
    from formkit.core.principal_ideals import principal_generator

    R = principal_generator(principal_ideal(-20, 3))
    assert "principal" in R._repr_html_() and R._repr_latex_().startswith("$\\text{")
    x = QuadraticNumber(-20, 0, 1, 1)  # √-20/2 = √-5
    assert "√-5" in x._repr_html_() and "Q(√-5)" in x._repr_html_()


def test_compact_product_display():
    import math

    from formkit.core.principal_ideals import CompactProduct

    # γ = (1 + √2)^3 · (3 + √8)^-1 in Z[√2]; log|γ| = 3·log(1 + √2) − log(3 + 2√2) = log(1 + √2)
    eps = QuadraticNumber(8, 2, 1, 1)  # (2 + √8)/2 = 1 + √2
    c = CompactProduct(8, [(eps, 3), (QuadraticNumber(8, 6, 2, 1), -1)])
    h = c._repr_html_()
    assert "2 terms" in h and f"{math.log(1 + math.sqrt(2)):.8f}"[:8] in h
    assert c._repr_latex_().startswith("$\\text{compact product of 2 terms")


def test_graph_str_counts_undirected_edges():
    # Cl(-84) = C2 × C2 on the primes 2, 3 (order 2 each): the square, 4 edges (networkx's
    # 2-cube), stored as 8 arrows
    import networkx as nx

    C = cayley_graph(-84)
    assert nx.hypercube_graph(2).number_of_edges() == 4
    assert str(C).endswith("4 nodes, 4 edges undirected, 8 directed; enumeration, unconditional")


# --- the small result types (formkit.core.displays): one sentence and its provenance -------------


def _small_results():
    F = formkit.Form
    from formkit.core.lattice import hermite_normal_form
    from formkit.representation.cm_method import cm_curve

    return {
        "lattice count": formkit.lattice_point_count(F(1, 0, 1), 100),
        "class lattice total": formkit.class_lattice_total(-84, 100),
        "L estimate": formkit.class_number_estimate(-(10**20) - 3).l_value,
        "h estimate": formkit.class_number_estimate(-(10**20) - 3),
        "genus character": formkit.genera(-84).characters[0],
        "genus": formkit.genera(-84).genera[1],
        "genera": formkit.genera(-84),
        "provenance": formkit.class_group(-84).provenance,
        "equivalence": formkit.equivalence(F(3, 2, 5), F(3, -2, 5)),
        "automorphisms": formkit.automorphism_group(F(1, 0, 1)),
        "hermite": hermite_normal_form([[2, 4], [0, 6]]),
        "reduction": formkit.reduce_form(F(10, 37, 35)),
        "cycle": formkit.reduced_cycle(F(3, 14, -10)),
        "cm curve": cm_curve(-7, 11, 4, -3375 % 11),  # j(-7) = -3375 (from memory); 4*11 = 4^2 + 7*2^2
        "density": formkit.density_count(F(3, 2, 5), 1000),
        "unit": formkit.fundamental_unit(316),
    }


def test_small_result_types_display_a_sentence_and_provenance():
    results = _small_results()
    for name, r in results.items():
        h, t = r._repr_html_(), r._repr_latex_()
        assert h.startswith("<p>") and "<small>" in h, name
        assert t.startswith("$") and t.endswith("$") and _balanced(t), name
    # the GRH mark on the conditional estimates only (the interval of L(1, chi) is proved under GRH)
    assert "conditional on GRH" in results["h estimate"]._repr_html_()
    assert "conditional on GRH" in results["L estimate"]._repr_html_()
    assert "GRH" not in results["genera"]._repr_html_()
    # the numbers shown are the true ones: 45 of the 168 primes <= 1000 for (3, 2, 5) (brute force in
    # tests/representation); the lattice points of x^2 + y^2 <= 100, origin included, counted here (317, Gauss's
    # circle problem at r = 10, from memory)
    assert "45 of the 168 primes" in results["density"]._repr_html_()
    assert (
        results["lattice count"].count
        == 317
        == sum(1 for x in range(-10, 11) for y in range(-10, 11) if x * x + y * y <= 100)
    )
    assert "= 317 (origin included)" in results["lattice count"]._repr_html_()
    assert (
        "properly equivalent" not in results["equivalence"]._repr_html_()
    )  # (3, 2, 5) ~ (3, -2, 5) improperly
    assert "(1, 1, 8)" in results["reduction"]._repr_html_()  # (10, 37, 35) has D = -31, h = 3 (from memory)
