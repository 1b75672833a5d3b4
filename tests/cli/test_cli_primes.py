"""Tests for the ``primes`` and ``hilbert`` commands (in-process through formkit.cli.main)."""

import pytest
import sympy
from _cli import run, run_json


def test_primes_congruence_json(capsys):
    # Fermat/Euler (classical): p = x² + 5y² iff p = 5 or p ≡ 1, 9 (mod 20)
    d = run_json(capsys, "primes", "x^2 + 5y^2", "--bound", "1000")
    assert d["form"] == [1, 0, 5] and d["discriminant"] == -20 and d["density"] == "1/4"
    assert d["criterion"]["kind"] == "congruence"
    assert d["criterion"]["modulus"] == 20 and d["criterion"]["residues"] == [1, 9]
    assert d["exceptions"] == [5]
    expected = [5] + [p for p in sympy.primerange(2, 1001) if p % 20 in (1, 9)]
    assert d["primes"] == expected


def test_primes_class_polynomial_json(capsys):
    # Gauss: p = x² + 27y² iff p ≡ 1 (mod 3) and 2 is a cubic residue mod p (Cox Thm 4.15, as recalled)
    d = run_json(capsys, "primes", "1,0,27", "--bound", "3000")
    assert d["criterion"]["kind"] == "class_polynomial"
    assert len(d["criterion"]["polynomial"]) == 4 and d["criterion"]["polynomial"][0] == 1
    assert d["density"] == "1/6"  # h(−108) = 3, principal class: 1/(2h)
    assert d["exceptions"] == []
    expected = [p for p in sympy.primerange(5, 3001) if p % 3 == 1 and pow(2, (p - 1) // 3, p) == 1]
    assert d["primes"] == expected
    assert (
        d["prime_count"]["represented"] == len(expected) and d["prime_count"]["primes"] == 430
    )  # π(3000) = 430


def test_primes_nonprincipal_class(capsys):
    d = run_json(capsys, "primes", "[2, 1, 3]", "--bound", "100")
    assert d["density"] == "1/3"  # class of order 3 in Cl(−23) ≅ Z/3
    assert d["criterion"]["kind"] == "class_polynomial" and d["criterion"]["principal"] is False
    assert d["criterion"]["polynomial"] == [1, 3491750, -5151296875, 12771880859375]  # Cox §13 (from memory)
    # brute force: values of 2x² + xy + 3y² below 100
    vals = {2 * x * x + x * y + 3 * y * y for x in range(-10, 11) for y in range(-10, 11)}
    assert d["primes"] == [p for p in sympy.primerange(2, 101) if p in vals]


def test_primes_indefinite(capsys):
    # x² − 2y²: p = 2 or p ≡ ±1 (mod 8) (classical)
    d = run_json(capsys, "primes", "x^2 - 2y^2", "--bound", "500")
    assert d["criterion"] == {**d["criterion"], "kind": "congruence", "modulus": 8, "residues": [1, 7]}
    assert d["primes"] == [2] + [p for p in sympy.primerange(3, 501) if p % 8 in (1, 7)]


def test_primes_text(capsys):
    code, out, err = run(capsys, "primes", "1,0,14", "--bound", "200")
    assert code == 0 and err == ""
    assert "no congruence criterion" in out and "class polynomial of degree 4" in out
    assert "density:       1/8" in out


def test_primes_without_polynomial(capsys):
    d = run_json(capsys, "primes", "1,0,14", "--bound", "50", "--no-polynomial")
    assert d["criterion"]["polynomial"] == []
    assert d["primes"] == [23]  # 23 = 3² + 14·1²; 15 = 1 + 14 is not prime


def test_primes_default_bound_and_power_notation(capsys):
    d = run_json(capsys, "primes", "1,1,1")
    assert d["prime_count"]["bound"] == 1000
    d = run_json(capsys, "primes", "1,1,1", "--bound", "10^4")
    assert d["prime_count"]["bound"] == 10**4
    # x² + xy + y²: p = 3 or p ≡ 1 (mod 3) (classical)
    assert d["primes"] == [3] + [p for p in sympy.primerange(2, 10**4) if p % 3 == 1]


def test_hilbert_json(capsys):
    d = run_json(capsys, "hilbert", "-23")
    assert d == {
        **d,
        "discriminant": -23,
        "degree": 3,
        "coefficients": [1, 3491750, -5151296875, 12771880859375],
    }
    d = run_json(capsys, "hilbert", "-163")
    assert d["coefficients"] == [1, 640320**3]  # j = −640320³ (classical)
    d = run_json(capsys, "hilbert", "-16", "--no-verify")
    assert d["coefficients"] == [1, -287496] and d["kind"] == "ring" and d["verification"] is None


def test_hilbert_text(capsys):
    code, out, err = run(capsys, "hilbert", "-15")
    assert code == 0 and err == ""
    assert "H(x) = x^2 + 191025x - 121287375" in out  # Cox §13 (from memory)
    assert "certified: ball arithmetic" in out


@pytest.mark.parametrize(
    "argv,words",
    [
        (["primes", "2,2,2"], "content 2"),
        (["primes", "-1,0,-5"], "negative definite"),
        (["primes", "1,0,-1"], "square"),
        (["primes", "1,0,5", "--bound", "-3"], "--bound must be at least 0, not -3"),
        (["primes", "1,0,5", "--bound", "ten"], "--bound: cannot read 'ten' as an integer"),
        (["primes", "1,0,5", "--bound", "10^9"], "at most"),
        (["primes", "1,2"], "three"),
        (["hilbert", "5"], "negative discriminants"),
        (["hilbert", "-22"], "-22"),
        (["hilbert", "x"], "discriminant: cannot read 'x' as an integer"),
        (["hilbert"], "required"),
        (["hilbert", "-11", "--invariant", "weber"], "-11 ≡ 5 (mod 8)"),
        (
            ["hilbert", "-120", "--invariant", "double-eta", "--eta-primes", "5,13", "--roots-mod", "59"],
            "has degree 4",
        ),
        (["hilbert", "-88", "--invariant", "double-eta", "--cm-curve", "64"], "degree 2 in j"),
        (
            ["hilbert", "-23", "--invariant", "double-eta", "--roots-mod", "91"],
            "p must be an odd prime, not 91",
        ),
        (["hilbert", "-23", "--invariant", "double-eta", "--discriminant-factors"], "it is for H_D"),
        (["hilbert", "-23", "--eta-primes", "3,13"], "--invariant double-eta"),
        (["hilbert", "-23", "--invariant", "double-eta", "--eta-primes", "3"], "two primes"),
        (["hilbert", "-71", "--invariant", "double-eta", "--eta-primes", "5,7"], "not qualify"),
        (["hilbert", "-88", "--invariant", "double-eta"], "suits D = -88"),
        (["hilbert", "-23", "--invariant", "gamma"], "invalid choice"),
        (["hilbert", "-23", "--roots-mod", "91"], "p must be an odd prime, not 91"),
        (["hilbert", "-23", "--cm-curve", "8"], "--cm-curve must be at least 16"),
        (["hilbert", "-4", "--cm-curve", "32"], "D < -4"),
        (["hilbert", "-23", "--invariant", "weber", "--discriminant-factors"], "--discriminant-factors"),
    ],
)
def test_bad_input_one_line_exit_2(capsys, argv, words):
    code, out, err = run(capsys, *argv)
    assert code == 2
    assert out == ""
    assert err.startswith("formkit: error: ") and err.count("\n") == 1
    assert words in err
    assert "Traceback" not in err


def test_hilbert_discriminant_factors(capsys):
    import json

    from formkit.cli import main

    code = main(["hilbert", "-15", "--discriminant-factors", "--json"])
    out, err = capsys.readouterr()
    assert code == 0 and err == ""
    d = json.loads(out)["polynomial_discriminant"]
    # H₋₁₅ = x² + 191025x − 121287375 (Cox §13, as recalled): disc = 191025² + 4·121287375
    assert d["value"] == 191025**2 + 4 * 121287375 and d["complete"]
    assert d["factors"] == [[3, 6], [5, 3], [7, 4], [13, 2]]  # sympy.factorint agrees below
    import sympy

    assert sympy.factorint(d["value"]) == {3: 6, 5: 3, 7: 4, 13: 2}
    code = main(["hilbert", "-15", "--discriminant-factors"])
    out, _ = capsys.readouterr()
    assert "disc(H) = 3^6 * 5^3 * 7^4 * 13^2" in out


def test_hilbert_weber_json_and_roots(capsys):
    # Weber's x³ − x − 1 for D = −23 (Yui–Zagier's table; from memory)
    d = run_json(capsys, "hilbert", "-23", "--invariant", "weber", "--roots-mod", "59")
    assert d["invariant"] == "weber" and d["coefficients"] == [1, 0, -1, -1] and d["power"] == 1
    # 4·59 = 12² + 23·2²: 59 splits completely, so three roots; brute force over F_59
    assert d["roots_mod_p"]["roots"] == [x for x in range(59) if (x**3 - x - 1) % 59 == 0]
    H = run_json(capsys, "hilbert", "-23", "--roots-mod", "59")
    assert H["invariant"] == "j"
    brute = [x for x in range(59) if sum(c * x ** (3 - i) for i, c in enumerate(H["coefficients"])) % 59 == 0]
    assert d["roots_mod_p"]["j_invariants"] == H["roots_mod_p"]["roots"] == brute


def test_hilbert_weber_even_discriminant(capsys):
    # D = −44: Weber's f(√−11), a root of x³ − 2x² + 2x − 2 (Weber's table; from memory)
    d = run_json(capsys, "hilbert", "-44", "--invariant", "weber", "--roots-mod", "47")
    assert d["coefficients"] == [1, -2, 2, -2] and d["weber_function"] == "f" and d["m"] == 11
    assert (d["power"], d["sqrt2_exponent"]) == (1, 0)
    # 47 = 6² + 11·1²: splits completely; the roots by brute force over F_47
    assert d["roots_mod_p"]["roots"] == [x for x in range(47) if (x**3 - 2 * x * x + 2 * x - 2) % 47 == 0]
    H = run_json(capsys, "hilbert", "-44", "--roots-mod", "47")
    assert (
        d["roots_mod_p"]["j_invariants"] == H["roots_mod_p"]["roots"] and len(H["roots_mod_p"]["roots"]) == 3
    )
    code, out, _err = run(capsys, "hilbert", "-56", "--invariant", "weber")
    assert code == 0 and "f1(sqrt(-m))^2 and its conjugates, m = 14" in out and "(F + 16)^3/F" in out


def test_hilbert_double_eta(capsys):
    import sympy

    from formkit.core.enumeration import class_number

    d = run_json(capsys, "hilbert", "-191", "--invariant", "double-eta")
    assert d["invariant"] == "double-eta" and d["primes"] == [3, 13] and d["power"] == 1
    # degree h(−191) = 13 (enumeration) and irreducible (sympy's factorisation)
    assert d["degree"] == class_number(-191) == 13
    assert sympy.Poly(d["coefficients"], sympy.Symbol("x")).is_irreducible
    code, out, _err = run(capsys, "hilbert", "-191", "--invariant", "double-eta")
    assert code == 0 and "the two roots J of Psi(x, J)" in out and "are roots of H_D" in out


def test_hilbert_double_eta_roots_mod(capsys):
    # the roots j through Ψ equal the roots of formkit's H_D mod p (computed by the j route)
    for D, p in [(-23, 59), (-191, 10007), (-71, 1367), (-455, 10007)]:
        d = run_json(capsys, "hilbert", str(D), "--invariant", "double-eta", "--roots-mod", str(p))
        H = run_json(capsys, "hilbert", str(D), "--roots-mod", str(p))
        assert d["roots_mod_p"]["j_invariants"] == H["roots_mod_p"]["roots"]
        m = d["modular_polynomial"]
        p1, p2 = m["primes"]
        assert m["degree_j"] == 2 and m["degree_x"] == (p1 + 1) * (p2 + 1) and "q^" in m["method"]
    # a pair with the prime 2 (given explicitly): the same j's; 4·57791 = 480² + 191·2² splits completely
    assert 4 * 57791 == 480**2 + 191 * 2**2
    d = run_json(
        capsys, "hilbert", "-191", "--invariant", "double-eta", "--eta-primes", "2,13", "--roots-mod", "57791"
    )
    H = run_json(capsys, "hilbert", "-191", "--roots-mod", "57791")
    assert d["primes"] == [2, 13] and d["power"] == 2
    assert (
        d["roots_mod_p"]["j_invariants"] == H["roots_mod_p"]["roots"] and len(H["roots_mod_p"]["roots"]) == 13
    )
    # W = x³ − x² + 1 for D = −23: its roots mod 59 by brute force
    d = run_json(capsys, "hilbert", "-23", "--invariant", "double-eta", "--roots-mod", "59")
    assert d["roots_mod_p"]["roots"] == [x for x in range(59) if (x**3 - x * x + 1) % 59 == 0]
    code, out, _err = run(capsys, "hilbert", "-23", "--invariant", "double-eta", "--roots-mod", "59")
    assert code == 0 and "the roots j of Psi(x, J), roots of H_D mod 59: [20, 42, 44]" in out


def test_hilbert_double_eta_cm_curve(capsys):
    d = run_json(capsys, "hilbert", "-191", "--invariant", "double-eta", "--cm-curve", "16")
    c = d["cm_curve"]
    p, t = c["p"], c["trace"]
    assert p.bit_length() == 16 and sympy.isprime(p) and 4 * p == t * t + 191 * c["v"] ** 2
    # brute-force point count of y² = x³ + a4 x + a6 over F_p (Euler's criterion)
    n = 1 + sum(
        1 if r == 0 else 2 if pow(r, (p - 1) // 2, p) == 1 else 0
        for r in ((x**3 + c["a4"] * x + c["a6"]) % p for x in range(p))
    )
    assert n == c["order"] == p + 1 - t and c["roots_found"] == 13
    d = run_json(capsys, "hilbert", "-191", "--invariant", "double-eta", "--cm-curve", "256")
    c = d["cm_curve"]
    assert c["p"].bit_length() == 256 and c["order"] == c["p"] + 1 - c["trace"]
    H = run_json(capsys, "hilbert", "-191", "--roots-mod", str(c["p"]))
    assert c["j"] in H["roots_mod_p"]["roots"]  # a root of formkit's H_D mod p
    code, out, _err = run(capsys, "hilbert", "-191", "--invariant", "double-eta", "--cm-curve", "64")
    assert code == 0 and "from the roots of W and Psi" in out and "has p + 1 - t =" in out


def test_hilbert_cm_curve(capsys):
    d = run_json(capsys, "hilbert", "-71", "--invariant", "weber", "--cm-curve", "16")
    c = d["cm_curve"]
    p, t = c["p"], c["trace"]
    assert p.bit_length() == 16 and sympy.isprime(p) and 4 * p == t * t + 71 * c["v"] ** 2
    # brute-force point count of y² = x³ + a4 x + a6 over F_p (Euler's criterion)
    n = 1 + sum(
        1 if r == 0 else 1 + pow(r, (p - 1) // 2, p) if pow(r, (p - 1) // 2, p) == 1 else 0
        for r in ((x**3 + c["a4"] * x + c["a6"]) % p for x in range(p))
    )
    assert n == c["order"] == p + 1 - t
    code, out, _err = run(capsys, "hilbert", "-71", "--invariant", "weber", "--cm-curve", "64")
    assert code == 0 and "has p + 1 - t =" in out and "random points P" in out
