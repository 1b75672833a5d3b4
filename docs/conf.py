"""Sphinx configuration of the formkit documentation site.

Build: ``python -m sphinx -W --keep-going -b html docs docs/_build/html`` (needs the ``docs``
extra: ``pip install -e '.[docs]'``).  The API pages (``docs/api/``) and the gallery pictures
(``docs/_generated/``) are written by this file at the start of every build, from the package
itself, so that they cannot drift from the code.
"""

from __future__ import annotations

import importlib
import pathlib
import pkgutil
import re
import sys

HERE = pathlib.Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))
sys.path.insert(0, str(HERE))

import formkit  # noqa: E402

project = "formkit"
author = "the formkit developers"
copyright = "2026, the formkit developers"
release = formkit.__version__
version = release

extensions = [
    "myst_parser",
    "numpydoc",
    "sphinx.ext.autodoc",
    "sphinx.ext.mathjax",
    "sphinx.ext.viewcode",
]
source_suffix = {".rst": "restructuredtext", ".md": "markdown"}
exclude_patterns = ["_build", "Thumbs.db", ".DS_Store"]
myst_enable_extensions = ["dollarmath", "deflist"]
myst_heading_anchors = 3

# numpydoc renders the Parameters/Returns/Raises/Examples sections of the docstrings
numpydoc_show_class_members = False
numpydoc_class_members_toctree = False
numpydoc_xref_param_type = False
numpydoc_validation_checks: set[str] = set()
# The docstrings list their references as a bibliography (".. [1] Cohen, …") without citing
# each one inline, which is the house style; Sphinx would warn for every uncited entry.
suppress_warnings = ["ref.citation"]
autodoc_member_order = "bysource"
autodoc_typehints = "none"  # the docstrings describe the types in words
autodoc_default_options = {"members": True, "show-inheritance": True}

html_theme = "alabaster"
html_static_path: list[str] = []
html_title = f"formkit {release}"

#: The layers, bottom first (CONTRIBUTING.md and tests/test_layers.py state the import rule).
LAYERS = [
    ("formkit.errors", "errors"),
    ("formkit.core", "core"),
    ("formkit.analytic", "analytic"),
    ("formkit.classgroups", "class groups"),
    ("formkit.representation", "representation"),
    ("formkit.graphs", "graphs"),
    ("formkit.tables", "tables"),
    ("formkit.explain", "worked examples"),
    ("formkit.cli", "command line"),
]


def _modules(package: str) -> list[str]:
    mod = importlib.import_module(package)
    if not hasattr(mod, "__path__"):
        return []
    return sorted(
        f"{package}.{info.name}"
        for info in pkgutil.iter_modules(mod.__path__)
        if not info.name.startswith("_")
    )


def write_api_pages(out: pathlib.Path) -> None:
    """One page per layer; each lists its modules, documented from their docstrings."""
    out.mkdir(parents=True, exist_ok=True)
    index = [
        "API reference",
        "=============",
        "",
        "Generated from the docstrings.  Every public name is also importable from the top-level",
        "package (``formkit.class_group``, ``formkit.Form``, …); the pages below follow the layers,",
        "bottom first.",
        "",
        ".. toctree::",
        "   :maxdepth: 2",
        "",
    ]
    for package, title in LAYERS:
        slug = package.replace(".", "_")
        index.append(f"   {slug}")
        heading = f"{title} (``{package}``)"
        lines = [heading, "=" * len(heading), "", f".. automodule:: {package}", "   :no-members:", ""]
        for name in _modules(package):
            lines += [name, "-" * len(name), "", f".. automodule:: {name}", ""]
        text = "\n".join(lines) + "\n"
        page = out / f"{slug}.rst"
        if not page.exists() or page.read_text() != text:
            page.write_text(text)
    text = "\n".join(index) + "\n"
    page = out / "index.rst"
    if not page.exists() or page.read_text() != text:
        page.write_text(text)


_LITERAL = re.compile(r"(``.+?``|:\w+:`[^`]+`|`[^`]+`_?)")


def _escape_bars(line: str) -> str:
    # |D|, |γ| … in running text are absolute values, not reStructuredText substitutions
    parts = _LITERAL.split(line)
    for i in range(0, len(parts), 2):
        parts[i] = re.sub(r"(?<!\\)\|", r"\\|", parts[i])
    return "".join(parts)


def _absolute_values(app, what, name, obj, options, lines: list[str]) -> None:
    """Escape the bars of absolute values outside literals and doctests (no grid tables are used)."""
    literal_indent: int | None = None
    doctest = False
    previous = ""
    for i, line in enumerate(lines):
        stripped = line.strip()
        indent = len(line) - len(line.lstrip())
        if literal_indent is not None and stripped and indent <= literal_indent:
            literal_indent = None
        if doctest and not stripped:
            doctest = False
        if stripped.startswith(">>>"):
            doctest = True
        if literal_indent is None and previous.rstrip().endswith("::") and stripped:
            literal_indent = len(previous) - len(previous.lstrip())
        if stripped:
            previous = line
        if literal_indent is not None or doctest or "|" not in line:
            continue
        lines[i] = _escape_bars(line)


def _builder_inited(app) -> None:
    write_api_pages(HERE / "api")
    import make_gallery

    make_gallery.make_pictures(HERE / "_generated")


def setup(app):
    app.connect("builder-inited", _builder_inited)
    app.connect("autodoc-process-docstring", _absolute_values, priority=900)
    return {"parallel_read_safe": True}
