"""The commands l-value, epstein, theta and critical-line.

Outside references: mpmath (general-purpose library), Jacobi's r₂(n) (from memory), the
class number formula L(0, χ_D) = 2h/w (theorem), and the house CLI conventions (common
practice).
"""

from __future__ import annotations

import mpmath
import pytest

from tests._cli import run, run_json


def test_l_value_json(capsys):
    out = run_json(capsys, "l-value", "-4", "2", "--digits", "25")
    assert out["kind"] == "kronecker_character" and out["discriminant"] == -4
    with mpmath.workdps(30):
        catalan = mpmath.catalan  # L(2, χ_−4) = Catalan's constant (classical)
        assert abs(mpmath.mpf(out["value"]["real"]) - catalan) < 10**-24
    assert out["value"]["imag"] == "0.0" and out["exact"] is None


def test_l_value_exact_and_text(capsys):
    out = run_json(capsys, "l-value", "-23", "0")
    assert out["exact"] == "3"  # 2h/w for D = −23
    code, text, _err = run(capsys, "l-value", "-23", "0")
    assert code == 0 and "= 3" in text and "exact rational" in text


def test_other_series(capsys):
    assert run_json(capsys, "l-value", "5", "-1", "--field-zeta")["exact"] == "1/30"
    g = run_json(capsys, "l-value", "-84", "2", "--genus", "-3", "--digits", "15")
    assert g["kind"] == "genus_character" and g["agrees"] is True
    c = run_json(capsys, "l-value", "-23", "2", "--class-character", "1", "--digits", "15")
    assert c["kind"] == "class_character" and c["character"] == [1]


def test_epstein(capsys):
    z = run_json(capsys, "epstein", "1,0,1", "3", "--digits", "20")
    with mpmath.workdps(30):
        ref = 4 * mpmath.zeta(3) * mpmath.dirichlet(3, [0, 1, 0, -1])  # 4ζ(3)β(3)
        assert abs(mpmath.mpf(z["value"]["real"]) - ref) < 10**-18
    k = run_json(capsys, "epstein", "x^2+xy+y^2", "--limit-formula", "--digits", "15")
    assert k["agrees"] is True and k["form"] == [1, 1, 1]
    c = run_json(capsys, "epstein", "-23", "2", "--classes", "--digits", "15")
    assert c["agrees"] is True and c["class_number"] == 3
    cs = run_json(capsys, "epstein", "-4", "--chowla-selberg", "--digits", "15")
    assert cs["agrees"] is True


def test_theta(capsys):
    t = run_json(capsys, "theta", "1,0,1", "--bound", "12", "--limit", "12")
    assert t["coefficients"] == [1, 4, 4, 0, 4, 8, 0, 0, 4, 4, 8, 0, 0]  # Jacobi's r₂(n)
    g = run_json(capsys, "theta", "2,1,3", "--bound", "10", "--genus")
    assert g["siegel_agrees"] is True and g["cusp_part"][:3] == ["0", "-2/3", "2/3"]
    # D = −36 = 3²·(−4), an order: Siegel's formula with local densities against the lattice-point average
    o = run_json(capsys, "theta", "2,2,5", "--bound", "40", "--genus")
    assert (
        o["siegel_agrees"] is True
        and o["eisenstein_bound"] == 40
        and "local densities" in o["eisenstein_method"]
    )


def test_theta_eigenforms(capsys):
    # D = −47, Cl ≅ C5: one cusp eigenform over Q(√5); a(2) is a root of x² + x − 1 (Hecke: 2cos(4π/5)
    # for the class of the prime form at 2, of order 5 — theorem, from memory)
    e = run_json(capsys, "theta", "1,1,12", "--bound", "12", "--eigenforms")
    assert e["kind"] == "hecke_eigenforms" and e["reconstructs"] is True and e["cusp_dimension"] == 2
    (f,) = e["eigenforms"]
    assert f["field_polynomial_text"] == "x^2 + x - 1" and f["coefficients"][2] == ["0", "1"]
    assert e["hecke_polynomials"]["2"][0]["text"] == "x^2 + x - 1"
    code, text, _err = run(capsys, "theta", "1,1,6", "--bound", "10", "--eigenforms")
    assert code == 0 and "theta_Q - theta_G = (4/3)*f1" in text and "checked exactly" in text
    code, _out, err = run(capsys, "theta", "1,1,6", "--bound", "10", "--eigenforms", "--genus")
    assert code == 2 and "give one of them" in err


def test_real_quadratic_classes(capsys):
    # D = 229 > 0: the partial zeta functions sum to ζ(3)·L(3, χ_229) (mpmath's Dirichlet L-series)
    c = run_json(capsys, "epstein", "229", "3", "--classes", "--bound", "2000", "--digits", "15")
    assert c["kind"] == "partial_zeta" and c["agrees"] is True and len(c["partial_zeta"]) == 3
    with mpmath.workdps(20):
        ref = mpmath.zeta(3) * mpmath.dirichlet(3, [0] + _chi(229))
    total = sum(mpmath.mpf(x["zeta"]["value"]["real"]) for x in c["partial_zeta"])
    # each text value is correct to its "digits" significant digits (error bound plus the rounding)
    tolerance = sum(
        float(x["zeta"]["error_bound"])
        + abs(float(x["zeta"]["value"]["real"])) * 10.0 ** (1 - x["zeta"]["digits"])
        for x in c["partial_zeta"]
    )
    assert abs(total - ref) <= tolerance
    g = run_json(capsys, "l-value", "12", "4", "--genus", "-3", "--bound", "2000", "--digits", "15")
    assert g["kind"] == "genus_character" and g["agrees"] is True
    k = run_json(capsys, "l-value", "229", "3", "--class-character", "1", "--bound", "2000")
    assert k["kind"] == "class_character" and k["discriminant"] == 229
    code, _out, err = run(capsys, "epstein", "5", "--chowla-selberg")
    assert code == 2 and "CM points" in err
    code, _out, err = run(capsys, "l-value", "-23", "2", "--bound", "100")
    assert code == 2 and "--bound" in err


def _chi(D):
    from formkit.core.arith import kronecker

    return [kronecker(D, n) for n in range(1, D)]


def test_pictures(capsys, tmp_path):
    pytest.importorskip("matplotlib")
    png = tmp_path / "r.png"
    code, _out, _err = run(capsys, "theta", "1,1,6", "--bound", "30", "--genus", "-o", str(png))
    assert code == 0 and png.read_bytes()[:4] == b"\x89PNG"
    svg = tmp_path / "c.svg"
    code, _out, _err = run(capsys, "critical-line", "-4", "--height", "10", "--points", "12", "-o", str(svg))
    assert code == 0 and "<svg" in svg.read_text()


@pytest.mark.parametrize(
    "argv, words",
    [
        (("epstein", "1,0,1", "1"), "pole"),
        (("epstein", "1,0,-2", "2"), "positive definite"),
        (("l-value", "-4", "2", "--digits", "5000"), "digits"),
        (("l-value", "-4", "2+"), "s must be"),
        (("l-value", "-23", "2", "--class-character", "x"), "--class-character"),
        (("l-value", "-23", "2", "--genus", "5", "--field-zeta"), "at most one"),
        (("theta", "1,0,1", "--bound", "-3"), "N must"),
        (("theta", "1,0,1", "--bound", "5", "-o", "x.png"), "--genus"),
        (("theta", "1,0,1", "--bound", "5", "--genus", "-o", "x.pdf"), ".png or .svg"),
        (("critical-line", "-4", "--height", "0"), "height"),
        (("epstein", "-23", "--classes"), "needs S"),
    ],
)
def test_bad_input(capsys, argv, words, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    code, out, err = run(capsys, *argv)
    assert code == 2 and out == ""
    assert err.startswith("formkit: error: ") and err.count("\n") == 1 and words in err


def test_orders(capsys):
    # non-fundamental D: the identities with the factors e_p at p | f (formkit.classgroups.order_series);
    # D = −12: Σ'(x² + 3y²)^(−s) = 2(1 + 2^(1−2s))ζ(s)L(s, χ₋₃) (classical, from memory; mpmath's ζ and L)
    c = run_json(capsys, "epstein", "-12", "2", "--classes", "--digits", "20")
    assert c["agrees"] is True and [e["factor"] for e in c["local_factors"]] == ["1 + 2X^2"]
    with mpmath.workdps(25):
        ref = 2 * (1 + mpmath.mpf(2) ** -3) * mpmath.zeta(2) * mpmath.dirichlet(2, [0, 1, -1])
        assert abs(mpmath.mpf(c["by_classes"]["value"]["real"]) - ref) < 1e-18
    g = run_json(capsys, "l-value", "-36", "2", "--genus", "-3", "--digits", "15")
    assert g["kind"] == "genus_character" and g["agrees"] is True and g["local_factors"][0]["prime"] == 3
    # the character of order 3 of Cl(−176) comes from Cl(−44): the same primitive L(s, ψ)
    k = run_json(capsys, "l-value", "-176", "3", "--class-character", "2", "--digits", "15")
    k0 = run_json(capsys, "l-value", "-44", "3", "--class-character", "1", "--digits", "15")
    assert k["character_conductor"] == k0["character_conductor"] == 2
    assert k["primitive"]["value"]["real"][:14] == k0["primitive"]["value"]["real"][:14]
    r = run_json(capsys, "epstein", "48", "3", "--classes", "--bound", "2000", "--digits", "10")
    assert r["agrees"] is True and r["local_factors"][0]["factor"] == "1 - X + 2X^2"
    code, text, _err = run(capsys, "l-value", "-176", "3", "--class-character", "2", "--digits", "10")
    assert code == 0 and "factors through Cl(-44)" in text and "e_2 = 1 + 2X^2" in text
    code, _out, err = run(capsys, "l-value", "-63", "2", "--genus", "5")
    assert code == 2 and "does not split" in err
