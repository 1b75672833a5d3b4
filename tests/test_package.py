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


def _library_modules():
    """Every module of the library (the subpackages walked), without private ones and the CLI."""
    root = pathlib.Path(formkit.__file__).parent
    for path in sorted(root.rglob("*.py")):
        parts = path.relative_to(root).with_suffix("").parts
        if parts[-1] == "__init__":
            parts = parts[:-1]
        if not parts or parts[0] == "cli" or any(p.startswith("_") for p in parts):
            continue
        yield "formkit." + ".".join(parts)


def test_no_two_modules_export_one_name_for_different_objects():
    # a star import would silently let the later module win (this caught a clash once)
    owners = {}
    names = list(_library_modules())
    assert (
        "formkit.core.forms" in names and "formkit.classgroups" in names
    )  # the walk reaches the subpackages
    for name_of_module in names:
        module = importlib.import_module(name_of_module)
        for name in getattr(module, "__all__", ()):
            obj = getattr(module, name)
            if name in owners:
                other_module, other_obj = owners[name]
                assert other_obj is obj, f"{name} exported by {other_module} and {name_of_module}"
            else:
                owners[name] = (name_of_module, obj)
