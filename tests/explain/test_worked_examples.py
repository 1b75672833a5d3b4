"""Tests of formkit.explain: the traced computations against independent
computations (brute force, classical theorems, the library's own fast paths), and the
Markdown / LaTeX output (compiled when a TeX engine is installed, else checked for
structure)."""

from __future__ import annotations

import math
import re
import shutil
import subprocess

import pytest
from hypothesis import given
from hypothesis import strategies as st

from formkit import (
    DiscriminantError,
    DiscriminantMismatchError,
    FormkitError,
    NotAnIntegerError,
    NotPrimitiveError,
    ParseError,
    class_group,
    compose,
    is_reduced,
    reduced,
)
from formkit.classgroups.genus import genus_count
from formkit.core.forms import Form, mat_mul
from formkit.explain.class_group import explain_class_group, worked_class_group
from formkit.explain.composition import composition_trace, explain_composition, worked_composition
from formkit.explain.document import escape_tex, formula, text
from formkit.explain.reduction import explain_reduction, worked_reduction
from formkit.explain.representation import explain_representation, worked_representation
from formkit.representation.representations import represent

# ---------------------------------------------------------------------------
# helpers


def _random_sl2(draw_ints):
    """A product of generators of SL2(Z) from a list of integers (translations and S)."""
    M = ((1, 0), (0, 1))
    for k in draw_ints:
        M = mat_mul(M, ((1, k), (0, 1)))
        M = mat_mul(M, ((0, -1), (1, 0)))
    return M


def _brute_solutions(Q: Form, n: int):
    """All (x, y) with Q(x, y) = n, Q positive definite, by a box search.

    4a·Q = (2ax + by)² + |D|y², so |y| ≤ √(4an/|D|), and symmetrically for x."""
    D = -Q.discriminant
    ybound = math.isqrt(4 * Q.a * n // D) + 1
    xbound = math.isqrt(4 * Q.c * n // D) + 1
    return sorted(
        (x, y) for x in range(-xbound, xbound + 1) for y in range(-ybound, ybound + 1) if Q(x, y) == n
    )


def _tex_structure_problems(tex: str, complete: bool = True) -> list[str]:
    """Check a LaTeX text for the mistakes that stop compilation; returns the problems."""
    problems = []
    if any(ord(ch) > 127 for ch in tex):
        problems.append("non-ASCII character")
    if complete:
        if not tex.startswith("\\documentclass"):
            problems.append("no \\documentclass first")
        if tex.count("\\begin{document}") != 1 or not tex.rstrip().endswith("\\end{document}"):
            problems.append("document environment")
        for pkg in re.findall(r"\\usepackage(?:\[[^]]*\])?\{([^}]*)\}", tex):
            if pkg not in ("amsmath", "longtable", "array", "geometry"):  # latex-base + -recommended
                problems.append(f"non-standard package {pkg}")
    else:
        if "\\documentclass" in tex or "\\begin{document}" in tex:
            problems.append("fragment contains a preamble")
    body = re.sub(r"(?m)^%.*$", "", tex)  # comment lines
    # braces: escaped \{ \} do not count
    depth = 0
    for m in re.finditer(r"\\[{}]|[{}]", body):
        tok = m.group()
        if tok == "{":
            depth += 1
        elif tok == "}":
            depth -= 1
            if depth < 0:
                problems.append("unbalanced }")
                break
    if depth > 0:
        problems.append("unbalanced {")
    stack = []
    for m in re.finditer(r"\\(begin|end)\{([^}]*)\}", body):
        if m.group(1) == "begin":
            stack.append(m.group(2))
        elif not stack or stack.pop() != m.group(2):
            problems.append(f"environment {m.group(2)} closed out of order")
            break
    if stack:
        problems.append(f"unclosed environments {stack}")
    # text outside math: no unescaped special characters
    outside = re.sub(r"\\\[.*?\\\]", " ", body, flags=re.S)
    pieces = re.split(r"(?<!\\)\$", outside)
    if len(pieces) % 2 == 0:
        problems.append("unbalanced $")
    text_only = " ".join(pieces[0::2])
    text_only = re.sub(r"\\[A-Za-z]+\*?", " ", text_only)  # commands
    text_only = re.sub(r"\\[{}_#%&$^~ ]", " ", text_only)  # escapes
    text_only = text_only.replace("\\\\", " ")
    for ch in "_#%^~":
        if ch in text_only:
            problems.append(f"unescaped {ch!r} in text")
    if "&" in text_only and "longtable" not in body:
        problems.append("unescaped & in text")
    return problems


EXAMPLES = [
    ("reduce", lambda fmt, frag: explain_reduction((10, 37, 35), format=fmt, fragment=frag)),
    ("reduce-indefinite", lambda fmt, frag: explain_reduction("-x^2 + 13y^2", format=fmt, fragment=frag)),
    ("compose", lambda fmt, frag: explain_composition((3, 2, 5), (5, 2, 3), format=fmt, fragment=frag)),
    ("represent", lambda fmt, frag: explain_representation((2, 1, 3), 18, format=fmt, fragment=frag)),
    (
        "represent-indefinite",
        lambda fmt, frag: explain_representation((1, 0, -2), 49, format=fmt, fragment=frag),
    ),
    ("group", lambda fmt, frag: explain_class_group(-4 * 65, format=fmt, fragment=frag)),
    ("group-real", lambda fmt, frag: explain_class_group(316, format=fmt, fragment=frag)),
]


# ---------------------------------------------------------------------------
# reduction


@given(
    st.sampled_from([-3, -4, -23, -31, -56, -84, -4004, 5, 13, 316, 1001 * 4]),
    st.lists(st.integers(-6, 6), min_size=0, max_size=5),
    st.integers(0, 50),
)
def test_reduction_steps_replay(D, moves, pick):
    """Replaying every recorded matrix reproduces every recorded form, the running
    products multiply to the final matrix, and the end is reduced (is_reduced)."""
    forms = class_group(D).forms()
    f = forms[pick % len(forms)].transform(_random_sl2(moves))
    ex = worked_reduction(f)
    g = f
    running = ((1, 0), (0, 1))
    for s in ex.data["steps"]:
        assert s["before"] == g.to_list()
        M = tuple(tuple(r) for r in s["matrix"])
        g = g.transform(M)
        running = mat_mul(running, M)
        assert s["after"] == g.to_list()
        assert [list(r) for r in running] == s["running_matrix"]
    assert g.to_list() == ex.data["reduced"]
    assert f.transform(tuple(tuple(r) for r in ex.data["matrix"])) == g
    assert is_reduced(g)
    if D < 0:
        assert g == reduced(f)


def test_reduction_classical_example():
    # 10x² + 37xy + 35y² (D = −31) reduces to x² + xy + 8y², the principal form of
    # discriminant −31 (h(−31) = 3: the classes are x² + xy + 8y², 2x² ± xy + 4y²; from memory).
    ex = worked_reduction((10, 37, 35))
    assert ex.data["reduced"] == [1, 1, 8]
    md = ex.render("md")
    assert "translate by `k = -2`" in md and "swap" in md


def test_indefinite_reduction_lists_the_cycle():
    # x² − 13y² (D = 52): the cycle of the principal class; its length is even and every
    # form on it is reduced (checked with is_reduced) and distinct.
    ex = worked_reduction((1, 0, -13))
    cyc = [Form(*c) for c in ex.data["cycle"]]
    assert ex.data["cycle_complete"] and len(cyc) == len(set(cyc)) and len(cyc) % 2 == 0
    assert all(is_reduced(c) for c in cyc)
    assert "The cycle of reduced forms" in ex.render("md")


def test_negative_definite_reduction():
    ex = worked_reduction("-3x^2 + xy - 2y^2")
    assert ex.data["reduced"] == [-2, -1, -3]  # the negative of reduced(3, -1, 2) = (2, 1, 3)
    assert "negative definite" in ex.render("md")


# ---------------------------------------------------------------------------
# composition


def _united_composite(F: Form, G: Form) -> Form:
    """Composition of forms with gcd(a1, a2, (b1 + b2)/2) = 1 by the classical recipe:
    (a1·a2, B, ·) with B ≡ b1 (mod 2a1), B ≡ b2 (mod 2a2), B² ≡ D (mod 4a1a2)
    (Cox, Primes of the Form x² + ny², Lemma 3.2 and (3.7); found by brute force)."""
    D = F.discriminant
    A = F.a * G.a
    for B in range(-A, A + 1):
        if (B - F.b) % (2 * F.a) == 0 and (B - G.b) % (2 * G.a) == 0 and (B * B - D) % (4 * A) == 0:
            return reduced(Form(A, B, (B * B - D) // (4 * A)))
    raise AssertionError("no B found")


@given(
    st.sampled_from([-23, -47, -56, -84, -260, -671, -4 * 27, -3 * 49, -1155]),
    st.integers(0, 10**6),
    st.integers(0, 10**6),
    st.lists(st.integers(-3, 3), max_size=3),
)
def test_composition_trace_values(D, i, j, moves):
    forms = class_group(D).forms()
    F = forms[i % len(forms)].transform(_random_sl2(moves))
    G = forms[j % len(forms)]
    t = composition_trace(F, G)
    a1, b1, _ = t.first.coefficients
    a2, b2, _c2 = t.second.coefficients
    assert a1 <= a2 and {t.first, t.second} == {F, G}
    # Bézout identities of the two Euclid steps
    if t.euclid1 is not None:
        d, u, v = t.euclid1
        assert d == math.gcd(a1, a2) == u * a2 + v * a1
    else:
        assert a2 % a1 == 0 and t.d == a1
    if t.euclid2 is not None:
        d1, u, v = t.euclid2
        assert d1 == u * t.s + v * t.d
    assert t.d1 == math.gcd(a1, a2, (b1 + b2) // 2)
    A, B, _C = t.composite.coefficients
    assert a1 * a2 // t.d1**2 == A and t.composite.discriminant == D
    assert (B - b1) % (2 * t.v1) == 0 and (B - b2) % (2 * t.v2) == 0
    assert t.result == compose(F, G)
    if t.d1 == 1:
        assert t.result == _united_composite(F, G)


def test_composition_group_law_examples():
    # Cl(−23) ≅ C3 generated by (2, 1, 3) (Cox §2, from memory): square = inverse class.
    ex = worked_composition((2, 1, 3), (2, 1, 3))
    assert ex.data["result"] == [2, -1, 3]
    ex = worked_composition((2, 1, 3), (2, -1, 3))
    assert ex.data["result"] == [1, 1, 6]
    # a case with d1 > 1 (both leading coefficients even, D = −4·65): squaring (2, 2, 33)
    t = composition_trace((2, 2, 33), (2, 2, 33))
    assert t.d1 == 2 and t.result == Form(1, 0, 65)


def test_composition_indefinite():
    # D = 316 = 4·79: Cl⁺ ≅ C6 (class_group); the traced result is in the class of compose().
    from formkit import proper_equivalence

    t = composition_trace((3, 14, -10), (3, 14, -10))
    assert proper_equivalence(t.result, compose((3, 14, -10), (3, 14, -10))) is not None


def test_composition_bad_input():
    with pytest.raises(DiscriminantMismatchError):
        composition_trace((1, 0, 1), (1, 1, 1))
    with pytest.raises(NotPrimitiveError):
        composition_trace((2, 0, 2), (1, 0, 4))
    with pytest.raises(ParseError):
        explain_composition("2,1", (2, 1, 3))
    with pytest.raises(FormkitError):
        explain_composition((-2, 1, -3), (-2, 1, -3))  # negative definite


# ---------------------------------------------------------------------------
# representations


@pytest.mark.parametrize(
    "form,n",
    [
        ((1, 0, 1), 25),
        ((1, 0, 1), 65),
        ((1, 1, 1), 49),
        ((2, 1, 3), 18),
        ((1, 0, 5), 21),
        ((2, 2, 3), 63),
        ((1, 0, 14), 15 * 9),
        ((3, 2, 5), 56),
        ((2, 0, 2), 20),
        ((-1, 0, -5), -21),
        ((1, 0, 1), 7),
        ((1, 0, 1), -5),
    ],
)
def test_representation_solutions_match_brute_force(form, n):
    ex = worked_representation(form, n)
    Q = Form(*form)
    P, m = (-Q, -n) if Q.a < 0 else (Q, n)
    brute = _brute_solutions(P, m) if m > 0 else []
    assert [tuple(v) for v in ex.data["solutions"]] == brute
    assert ex.data["count"] == len(brute)
    # the representations module (another engineer's implementation) agrees
    assert sorted(map(tuple, ex.data["solutions"])) == sorted(represent(form, n).solutions)


@given(st.sampled_from([-3, -4, -15, -20, -23, -56, -84]), st.integers(1, 300), st.integers(0, 100))
def test_representation_roots_and_counts(D, n, pick):
    forms = class_group(D).forms()
    Q = forms[pick % len(forms)]
    ex = worked_representation(Q, n)
    # every listed b is a root of b² ≡ D (mod 4m) in [0, 2m), and all roots are listed
    by_g: dict = {}
    for r in ex.data["roots"]:
        m, b = r["m"], r["b"]
        assert 0 <= b < 2 * m and (b * b - D) % (4 * m) == 0
        by_g.setdefault(m, []).append(b)
    for m, bs in by_g.items():
        assert bs == [b for b in range(2 * m) if (b * b - D) % (4 * m) == 0]
    assert ex.data["count"] == len(_brute_solutions(Q, n))


def test_representation_indefinite_orbits():
    # x² − 2y² = 7: the two orbits (3, ±1) (represent() agrees), and 49 = 7²: one more
    # orbit from 7·(1, 0).
    for n in (7, 49, -1, 14):
        ex = worked_representation((1, 0, -2), n)
        r = represent((1, 0, -2), n)
        assert ex.data["orbit_count"] == r.orbit_count
        assert all(x * x - 2 * y * y == n for x, y in ex.data["solutions"])
    assert worked_representation((1, 0, -2), 3).data["orbit_count"] == 0  # (2/3) = −1


def test_representation_zero_and_content():
    assert worked_representation((1, 1, 1), 0).data["solutions"] == [[0, 0]]
    assert worked_representation((2, 0, 2), 3).data["count"] == 0  # content 2 does not divide 3
    md = explain_representation((1, 0, 1), 5, max_detail=0)
    assert "further roots are not shown" in md


def test_representation_bad_input():
    with pytest.raises(NotAnIntegerError):
        worked_representation((1, 0, 1), 2.5)
    with pytest.raises(DiscriminantError):
        worked_representation((1, 2, 1), 4)
    with pytest.raises(FormkitError):
        worked_representation((1, 0, 1), 5, max_detail=-1)
    with pytest.raises(ParseError):
        explain_representation("x^3", 5)


# ---------------------------------------------------------------------------
# class groups


@pytest.mark.parametrize("D", [-3, -4, -23, -84, -260, -420, -4004, -4 * 27, 316, 5, 4 * 85, 1155 * 4])
def test_class_group_table(D):
    ex = worked_class_group(D)
    G = class_group(D)
    d = ex.data
    assert d["class_number"] == G.order == len(d["classes"])
    assert d["invariants"] == list(G.invariants)
    # genus theory (Gauss; Cox §3): 2^(μ−1) genera, equal sizes, principal genus = squares
    assert d["genus_count"] == d["expected_genus_count"] == genus_count(D)
    assert d["principal_genus_is_squares"] is True
    sizes = {len(g["forms"]) for g in d["genera"]}
    assert sizes == {G.order // genus_count(D)}
    for row in d["classes"]:
        m, x, y = row["value"]
        assert Form(*row["form"])(x, y) == m and math.gcd(m, D) == 1
        assert G.element(row["discrete_log"]) == G(row["form"])
        assert G(row["form"]) ** row["order"] == G.identity
    assert "MISMATCH" not in ex.render("md")


def test_class_group_classical_values():
    # −420 = −4·105: 105 is idoneal, so one class per genus: h = 8, 8 genera (Euler's list
    # of idoneal numbers; Cox §3, from memory).
    d = worked_class_group(-420).data
    assert d["class_number"] == 8 and d["genus_count"] == 8
    # −4·14 = −56: h = 4, cyclic, two genera (Cox §2, x² + 14y², from memory).
    d = worked_class_group(-56).data
    assert d["invariants"] == [4] and d["genus_count"] == 2


def test_class_group_truncated_and_errors():
    ex = worked_class_group(-4004, max_classes=5)
    assert len(ex.data["classes"]) == 5 and ex.data["classes_complete"] is False
    assert "further classes not listed" in ex.render("md")
    with pytest.raises(DiscriminantError):
        worked_class_group(-5)
    with pytest.raises(DiscriminantError):
        worked_class_group(49)
    with pytest.raises(FormkitError):
        worked_class_group(-23, max_classes=0)
    with pytest.raises(NotAnIntegerError):
        explain_class_group("minus 23")


# ---------------------------------------------------------------------------
# output


def test_markup_and_escaping():
    f = formula("b^2 - 4ac <= sqrt(D)")
    assert f.plain == "b² - 4ac ≤ √D" and f.tex == r"b^2 - 4ac \le  \sqrt{D}"
    assert escape_tex("a_1 & 50% #2 {x} ~ ^") == r"a\_1 \& 50\% \#2 \{x\} \textasciitilde{} \^{}"
    assert [type(p).__name__ for p in text("a @x@ b @y@")] == ["str", "Math", "str", "Math"]
    with pytest.raises(ValueError):
        escape_tex("\u2603")


@pytest.mark.parametrize("name,make", EXAMPLES, ids=[e[0] for e in EXAMPLES])
def test_markdown_output(name, make):
    md = make("md", False)
    assert md.startswith("# ") and md.endswith("\n")
    assert "@" not in md  # no markup left over
    assert "``" not in md  # no touching code spans


@pytest.mark.parametrize("name,make", EXAMPLES, ids=[e[0] for e in EXAMPLES])
def test_latex_structure(name, make):
    assert _tex_structure_problems(make("tex", False), complete=True) == []
    assert _tex_structure_problems(make("tex", True), complete=False) == []


def test_latex_structure_checker_finds_mistakes():
    good = explain_reduction((3, 1, 2), format="tex")
    assert _tex_structure_problems(good) == []
    assert _tex_structure_problems(good.replace("\\end{enumerate}", "")) != []
    assert _tex_structure_problems(good.replace("Gauss", "Gauss_x")) != []
    assert _tex_structure_problems(good.replace("{article}", "{article")) != []


def test_unknown_format():
    with pytest.raises(FormkitError):
        explain_reduction((1, 0, 1), format="pdf")


_ENGINE = shutil.which("pdflatex") or shutil.which("lualatex")


@pytest.mark.skipif(_ENGINE is None, reason="no TeX engine (pdflatex/lualatex) installed")
@pytest.mark.parametrize("name,make", EXAMPLES, ids=[e[0] for e in EXAMPLES])
def test_latex_compiles(name, make, tmp_path):
    src = tmp_path / f"{name}.tex"
    src.write_text(make("tex", False), encoding="ascii")
    proc = subprocess.run(
        [_ENGINE, "-interaction=nonstopmode", "-halt-on-error", src.name],
        cwd=tmp_path,
        capture_output=True,
        text=True,
        timeout=300,
    )
    assert proc.returncode == 0, proc.stdout[-3000:]
    assert (tmp_path / f"{name}.pdf").stat().st_size > 1000


# Issue 15: one choice of orbit representatives for indefinite forms, shared by
# `represent` and `explain represent` (least x² + y², orbits.orbit_representative).
# Reference: brute force over a box — every listed vector solves Q(x, y) = n.
@pytest.mark.parametrize("form,n", [((1, 0, -94), 3), ((1, 0, -2), 119), ((2, 1, -4), 18), ((1, 1, -1), 11)])
def test_explain_represent_lists_the_orbit_representatives_of_represent(form, n):
    from formkit.explain.representation import worked_representation
    from formkit.representation.representations import represent

    ex = worked_representation(form, n)
    res = represent(form, n)
    a, b, c = form
    assert sorted(map(tuple, ex.data["solutions"])) == sorted(res.orbits)
    assert all(a * x * x + b * x * y + c * y * y == n for x, y in res.orbits)


def test_worked_group_refuses_a_huge_class_number_in_one_line():
    # h(-4·10^20 - 3)-sized groups cannot be listed class by class; the refusal names the count
    # (common practice, no source)
    import pytest

    from formkit.core.budget import budget
    from formkit.errors import BudgetError
    from formkit.explain.class_group import worked_class_group

    with budget("1s"), pytest.raises(BudgetError, match="visit all"):
        worked_class_group(-(10**12) - 3)


def test_worked_real_group_is_priced_before_the_group_is_computed(monkeypatch):
    # the class table of D > 0 lists every class by enumeration; for D = 2^42 + 44 that is
    # refused before the group is computed (it used to run the infrastructure first, 45 CPU-s)
    import formkit.classgroups.dispatch as dispatch
    from formkit.core.budget import budget
    from formkit.errors import BudgetError

    def not_called(*args, **kwargs):
        raise AssertionError("class_group computed before the enumeration was priced")

    monkeypatch.setattr(dispatch, "class_group", not_called)
    with budget("20s,1G"), pytest.raises(BudgetError, match="enumerating the classes of D = 4398046511148"):
        worked_class_group(2**42 + 44)
