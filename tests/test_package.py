"""Package-level checks: exports, lazy imports, py.typed (common practice, no outside source)."""

import importlib
import pathlib
import subprocess
import sys

import formkit


def test_lazy_graph_names_match_module():
    graphs = importlib.import_module("formkit.graphs")
    assert sorted(formkit._graphs_all) == sorted(graphs.__all__)
    for name in graphs.__all__:
        assert getattr(formkit, name) is getattr(graphs, name)


def test_every_exported_name_resolves():
    for name in formkit.__all__:
        assert hasattr(formkit, name), name


def test_import_does_not_load_networkx():
    code = "import sys, formkit; print('networkx' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "False"


def test_py_typed_shipped():
    assert (pathlib.Path(formkit.__file__).parent / "py.typed").exists()


def test_unknown_attribute_is_an_attribute_error():
    try:
        formkit.no_such_name  # noqa: B018
    except AttributeError as exc:
        assert "no_such_name" in str(exc)
    else:  # pragma: no cover
        raise AssertionError("expected AttributeError")
