"""Tests of formkit.core.forms: the Form value type, matrices, principal and prime forms, sympy.

Outside references: the definitions (evaluation, the matrix action written out in
tests/_foundation_strategies.py), sympy (Matrix products and inverses, Poly), brute
force over small coefficients, and values from Cox, *Primes of the Form x² + ny²*
(from memory) named beside each check.
"""

from __future__ import annotations

import copy
import math
import pickle

import pytest
import sympy
from _foundation_strategies import act, det, gl2_matrices
from hypothesis import given
from hypothesis import strategies as st

from formkit import (
    IDENTITY,
    DiscriminantError,
    Form,
    FormError,
    MatrixError,
    NotAnIntegerError,
    NotPrimeError,
    NotPrimitiveError,
    ParseError,
    as_form,
    as_matrix,
    kronecker_character,
    mat_det,
    mat_inverse,
    mat_mul,
)

coef = st.integers(-(10**30), 10**30)
forms = st.builds(Form, coef, coef, coef)
small_matrices = st.tuples(
    st.tuples(st.integers(-50, 50), st.integers(-50, 50)),
    st.tuples(st.integers(-50, 50), st.integers(-50, 50)),
)


# --- the value type ---------------------------------------------------------------------


def test_basic_properties():
    f = Form(2, 1, 3)
    assert (f.a, f.b, f.c) == (2, 1, 3) == f.coefficients == tuple(f)
    assert f.discriminant == -23 and f.content == 1 and f.is_primitive
    assert f.is_positive_definite and f.is_definite and not f.is_indefinite
    assert f.kind == "positive definite"
    assert Form(-2, 1, -3).kind == "negative definite" and Form(-2, 1, -3).is_negative_definite
    assert Form(1, 1, -1).kind == "indefinite" and Form(1, 1, -1).is_indefinite
    for g in (Form(1, 2, 1), Form(0, 0, 0), Form(1, 0, -4), Form(0, 3, 0)):
        assert g.kind == "degenerate" and not g.is_indefinite  # square discriminants incl. 0
    assert Form(4, 6, 10).content == 2 and not Form(4, 6, 10).is_primitive
    assert Form(4, 6, 10).primitive_part() == Form(2, 3, 5)
    assert Form(0, 0, 0).primitive_part() == Form(0, 0, 0)
    assert Form(1, 2, 3).scaled(-3) == Form(-3, -6, -9)
    assert -Form(1, 2, 3) == Form(-1, -2, -3)
    assert Form(1, 2, 3).opposite() == Form(1, -2, 3)
    assert Form(1, 2, 3).to_list() == [1, 2, 3]


def test_immutable_hashable_picklable():
    f = Form(2, 1, 3)
    with pytest.raises(AttributeError):
        f.a = 5
    with pytest.raises(AttributeError):
        f._a = 5
    with pytest.raises(AttributeError):
        del f.a
    assert {f: 1}[Form(2, 1, 3)] == 1 and hash(f) == hash(Form(2, 1, 3))
    assert f != Form(2, -1, 3) and f != (2, 1, 3)
    assert pickle.loads(pickle.dumps(f)) == f and copy.deepcopy(f) == f
    assert sorted([Form(2, 1, 3), Form(1, 1, 6), Form(2, -1, 3)]) == [
        Form(1, 1, 6),
        Form(2, -1, 3),
        Form(2, 1, 3),
    ]


def test_display():
    assert repr(Form(3, 7, -5)) == "Form(3, 7, -5)"
    assert str(Form(3, 7, -5)) == "3x^2 + 7xy - 5y^2"
    assert str(Form(-1, 0, 13)) == "-x^2 + 13y^2"
    assert str(Form(1, -1, 1)) == "x^2 - xy + y^2"
    assert str(Form(0, 0, 0)) == "0"
    assert Form(3, 7, -5)._repr_latex_() == "$3x^{2} + 7xy - 5y^{2}$"
    assert Form(-1, 1, 0)._repr_latex_() == "$-x^{2} + xy$"


@given(forms, st.integers(-(10**6), 10**6), st.integers(-(10**6), 10**6))
def test_evaluation(f, x, y):
    assert f(x, y) == f.a * x * x + f.b * x * y + f.c * y * y


@given(forms, small_matrices)
def test_transform_matches_definition(f, m):
    g = f.transform(m)
    assert g.coefficients == act(f.coefficients, m)
    assert g == f * m
    # (Q·M)(x, y) = Q(px + qy, rx + sy) at a few points
    (p, q), (r, s) = m
    for x, y in ((1, 0), (0, 1), (2, -3), (-5, 7)):
        assert g(x, y) == f(p * x + q * y, r * x + s * y)
    # disc(Q·M) = det(M)²·disc(Q)
    assert g.discriminant == det(m) ** 2 * f.discriminant


@given(forms, gl2_matrices(), gl2_matrices())
def test_action_is_a_right_action(f, m, n):
    assert f.transform(m).transform(n) == f.transform(mat_mul(m, n))
    assert f.transform(IDENTITY) == f


def test_transform_bad_matrices():
    f = Form(1, 0, 1)
    for bad in ([[1, 2, 3], [4, 5, 6]], 5, [[1, 0]], "[[1,0],[0,1]]"):
        with pytest.raises(MatrixError):
            f.transform(bad)
    with pytest.raises(NotAnIntegerError):
        f.transform([[1.0, 0], [0, 1]])


@pytest.mark.parametrize("bad", [(1.0, 2, 3), ("1", 2, 3), (1, None, 3), (1, 2, 2.5), (True, 0, 1)])
def test_constructor_refuses_non_integers(bad):
    with pytest.raises(NotAnIntegerError) as info:
        Form(*bad)
    assert isinstance(info.value, TypeError)


def test_evaluation_bad_input():
    with pytest.raises(NotAnIntegerError):
        Form(1, 0, 1)(0.5, 1)


# --- matrices ------------------------------------------------------------------------------


@given(small_matrices, small_matrices)
def test_matrix_helpers_against_sympy(m, n):
    assert mat_mul(m, n) == tuple(map(tuple, (sympy.Matrix(m) * sympy.Matrix(n)).tolist()))
    assert mat_det(m) == sympy.Matrix(m).det()
    if mat_det(m) in (1, -1):
        inv = mat_inverse(m)
        assert sympy.Matrix(inv) == sympy.Matrix(m).inv()
        assert mat_mul(m, inv) == IDENTITY
        assert as_matrix([list(r) for r in m]) == m
    else:
        with pytest.raises(MatrixError, match="determinant"):
            mat_inverse(m)
        with pytest.raises(MatrixError, match="determinant"):
            as_matrix(m)


@pytest.mark.parametrize(
    "bad, err",
    [
        ([[1, 0], [0, 0]], MatrixError),  # singular
        ([[2, 0], [0, 1]], MatrixError),  # det 2
        ([[1, 0, 0], [0, 1, 0]], MatrixError),
        ([1, 0, 0, 1], MatrixError),
        (None, MatrixError),
        ([[1.0, 0], [0, 1]], NotAnIntegerError),
        ([["1", 0], [0, 1]], NotAnIntegerError),
    ],
)
def test_as_matrix_bad_input(bad, err):
    with pytest.raises(err):
        as_matrix(bad)


# --- coercion -----------------------------------------------------------------------------


def test_as_form():
    f = Form(1, 1, 6)
    assert as_form(f) is f
    assert as_form((1, 1, 6)) == as_form([1, 1, 6]) == as_form("x^2 + xy + 6y^2") == f
    assert as_form(sympy.Matrix([1, 1, 6])) == f


@pytest.mark.parametrize(
    "bad, err",
    [
        ((1, 2), FormError),
        ((1, 2, 3, 4), FormError),
        (5, FormError),
        (None, FormError),
        ((1.5, 2, 3), NotAnIntegerError),
        ("1,2", ParseError),
        ("x^3", ParseError),
    ],
)
def test_as_form_bad_input(bad, err):
    with pytest.raises(err):
        as_form(bad)


# --- principal and prime forms ----------------------------------------------------------------


def test_principal_forms():
    # Cox §2: the principal form x² + ny² of D = −4n, and x² + xy + ((1−D)/4)y² for D ≡ 1 mod 4
    assert Form.principal(-20) == Form(1, 0, 5)
    assert Form.principal(-23) == Form(1, 1, 6)
    assert Form.principal(13) == Form(1, 1, -3)
    for D in [d for d in range(-300, 300) if d % 4 in (0, 1) and not (d >= 0 and math.isqrt(d) ** 2 == d)]:
        f = Form.principal(D)
        assert f.a == 1 and f.b in (0, 1) and f.discriminant == D


@pytest.mark.parametrize(
    "bad, err",
    [(-22, DiscriminantError), (0, DiscriminantError), (9, DiscriminantError), (-23.0, NotAnIntegerError)],
)
def test_principal_bad_input(bad, err):
    with pytest.raises(err):
        Form.principal(bad)


def brute_prime_forms(D: int, p: int) -> list[Form]:
    """Primitive forms (p, b, c) of discriminant D with 0 ≤ b ≤ p, by brute force."""
    out = []
    for b in range(p + 1):
        if (b * b - D) % (4 * p) == 0:
            f = Form(p, b, (b * b - D) // (4 * p))
            if f.is_primitive:
                out.append(f)
    return out


def test_prime_forms_brute_force():
    # Cox §2 / Cohen §5.2: a primitive form with leading coefficient p exists iff χ_D(p) ≠ −1
    # and p does not divide the conductor; the prime form is the one with least b ≥ 0
    for D in [d for d in range(-200, 200) if d % 4 in (0, 1) and not (d >= 0 and math.isqrt(d) ** 2 == d)]:
        chi = kronecker_character(D)
        for p in sympy.primerange(2, 40):
            brute = brute_prime_forms(D, p)
            if chi(p) == -1:
                assert brute == []
                with pytest.raises(FormError, match="inert"):
                    Form.prime_form(D, p)
            elif not brute:
                with pytest.raises(NotPrimitiveError, match="conductor"):
                    Form.prime_form(D, p)
            else:
                f = Form.prime_form(D, p)
                assert f == brute[0], (D, p)
                assert f.discriminant == D and f.a == p and f.is_primitive


def test_prime_form_examples():
    # D = −23: the forms 2x² ± xy + 3y² represent 2 (Cox §2, h(−23) = 3, from memory)
    assert Form.prime_form(-23, 2) == Form(2, 1, 3)
    assert Form.prime_form(-20, 5) == Form(5, 0, 1)
    assert Form.prime_form(5, 5) == Form(5, 5, 1)


@pytest.mark.parametrize(
    "D, p, err",
    [
        (-23, 4, NotPrimeError),
        (-23, 1, NotPrimeError),
        (-23, -2, NotPrimeError),
        (-23, 5, FormError),  # (−23/5) = −1
        (-12, 2, NotPrimitiveError),  # 2 divides the conductor of −12 = 2²·(−3)
        (-63, 3, NotPrimitiveError),  # −63 = 3²·(−7)
        (-22, 2, DiscriminantError),
        (-23, 2.0, NotAnIntegerError),
    ],
)
def test_prime_form_bad_input(D, p, err):
    with pytest.raises(err):
        Form.prime_form(D, p)


# --- sympy conversion ---------------------------------------------------------------------------

X, Y = sympy.symbols("x y")


@given(forms)
def test_sympy_round_trip(f):
    P = f.to_sympy()
    assert isinstance(P, sympy.Poly)
    assert P.as_expr() == f.a * X**2 + f.b * X * Y + f.c * Y**2
    assert Form.from_sympy(P) == f
    assert Form.from_sympy(P.as_expr(), X, Y) == f


def test_from_sympy_variants():
    u, v = sympy.symbols("u v")
    assert Form.from_sympy(3 * u**2 - v**2) == Form(3, 0, -1)
    assert Form.from_sympy(5 * Y**2, X, Y) == Form(0, 0, 5)
    assert Form.from_sympy(7 * X * Y) == Form(0, 7, 0)
    assert Form.from_sympy(sympy.Integer(0) * X) == Form(0, 0, 0)
    assert Form.from_sympy(Form(1, 2, 3).to_sympy(u, v)) == Form(1, 2, 3)
    assert Form.from_sympy(sympy.expand((X + 2 * Y) * (3 * X - Y))) == Form(3, 5, -2)


@pytest.mark.parametrize(
    "bad",
    [
        "x**2 + y**2",  # text: never handed to sympy
        "__import__('os').system('echo unsafe')",
        X**3,
        X**2 + X,
        X**2 + 1,
        X**2 + Y**2 + sympy.Symbol("z") ** 2,
        X**2 / 2 + Y**2,
        sympy.Float(1.5) * X**2,
        sympy.sqrt(2) * X**2,
        sympy.sin(X),
        (1, 2, 3),
        None,
    ],
)
def test_from_sympy_bad_input(bad):
    with pytest.raises(FormError):
        Form.from_sympy(bad)


def test_from_sympy_never_sympifies_text(monkeypatch):
    def forbidden(*args, **kwargs):
        raise AssertionError("sympify was called on user input")

    import sys

    import sympy.parsing.sympy_parser as sympy_parser

    monkeypatch.setattr(sympy, "sympify", forbidden)
    monkeypatch.setattr(sys.modules["sympy.core.sympify"], "sympify", forbidden)
    monkeypatch.setattr(sympy_parser, "parse_expr", forbidden)
    for text in ("x**2 + y**2", "__import__('os').system('echo unsafe')"):
        with pytest.raises(FormError, match=r"Form\.parse"):
            Form.from_sympy(text)


def test_from_sympy_bad_variables():
    with pytest.raises(FormError, match="both"):
        Form.from_sympy(X**2, X)
    with pytest.raises(FormError, match="Symbols"):
        Form.from_sympy(X**2, "x", "y")


@pytest.mark.parametrize(
    "fn", [mat_det, mat_inverse, lambda m: mat_mul(m, IDENTITY), lambda m: mat_mul(IDENTITY, m)]
)
@pytest.mark.parametrize(
    "bad, err",
    [
        (None, MatrixError),
        ([1, 2, 3, 4], MatrixError),
        ([[1, 2], [3]], MatrixError),
        ([[1.0, 0], [0, 1]], NotAnIntegerError),
    ],
)
def test_matrix_helpers_bad_input(fn, bad, err):
    with pytest.raises(err):
        fn(bad)


def test_scaled_bad_input():
    with pytest.raises(NotAnIntegerError):
        Form(1, 2, 3).scaled(1.5)
