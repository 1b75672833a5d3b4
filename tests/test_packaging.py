"""Release checks: one version, ``formkit --version``, and the built wheel works outside the tree.

The wheel test builds sdist and wheel with ``python -m build``, checks them with ``twine check``,
installs the wheel into a fresh virtual environment and runs the CLI from there, from a directory
outside the source tree (common practice for Python packages, no outside source). It takes a minute
or two (it installs the dependencies), so it is marked slow; ``.ci/run`` runs it explicitly.
"""

from __future__ import annotations

import importlib.util
import os
import pathlib
import shutil
import subprocess
import sys

import pytest

import formkit
from formkit.cli import main

ROOT = pathlib.Path(__file__).resolve().parent.parent


def test_version_defined_once():
    # pyproject reads the version from formkit/_version.py instead of repeating it
    tomllib = pytest.importorskip("tomllib")  # Python ≥ 3.11
    meta = tomllib.loads((ROOT / "pyproject.toml").read_text())
    assert "version" not in meta["project"]
    assert "version" in meta["project"]["dynamic"]
    assert meta["tool"]["setuptools"]["dynamic"]["version"] == {"attr": "formkit._version.__version__"}


def test_version_option(capsys):
    assert main(["--version"]) == 0
    assert capsys.readouterr().out.strip() == f"formkit {formkit.__version__}"


def test_license_and_changelog_present():
    assert "MIT License" in (ROOT / "LICENSE").read_text()
    assert f"## {formkit.__version__}" in (ROOT / "CHANGELOG.md").read_text()


@pytest.mark.slow
@pytest.mark.skipif(
    importlib.util.find_spec("build") is None or shutil.which("twine") is None,
    reason="needs the dev extra (build, twine)",
)
def test_built_wheel_installs_and_runs(tmp_path):
    dist = tmp_path / "dist"
    subprocess.run([sys.executable, "-m", "build", "--outdir", str(dist), str(ROOT)], check=True)
    wheels = sorted(dist.glob("formkit-*.whl"))
    sdists = sorted(dist.glob("formkit-*.tar.gz"))
    assert len(wheels) == 1 and len(sdists) == 1
    subprocess.run(["twine", "check", "--strict", str(wheels[0]), str(sdists[0])], check=True)
    venv = tmp_path / "venv"
    subprocess.run([sys.executable, "-m", "venv", str(venv)], check=True)
    py = venv / "bin" / "python"
    subprocess.run([str(py), "-m", "pip", "install", "--quiet", str(wheels[0])], check=True)
    elsewhere = tmp_path / "elsewhere"
    elsewhere.mkdir()
    env = {k: v for k, v in os.environ.items() if k not in ("PYTHONPATH", "VIRTUAL_ENV")}
    where = subprocess.run(
        [str(py), "-c", "import formkit; print(formkit.__file__)"],
        cwd=elsewhere,
        env=env,
        capture_output=True,
        text=True,
        check=True,
    ).stdout.strip()
    # the package comes from the fresh environment, not from the source tree
    assert pathlib.Path(where).is_relative_to(venv), where
    cli = venv / "bin" / "formkit"
    out = subprocess.run(
        [str(cli), "--version"], cwd=elsewhere, env=env, capture_output=True, text=True, check=True
    )
    assert out.stdout.strip() == f"formkit {formkit.__version__}"
    # h(-23) = 3 (Cohen, A Course in Computational Algebraic Number Theory, table B.1)
    out = subprocess.run(
        [str(cli), "class-number", "-23", "--json"],
        cwd=elsewhere,
        env=env,
        capture_output=True,
        text=True,
        check=True,
    )
    assert '"class_number": 3' in out.stdout
    # bad input: one line on stderr, exit 2
    bad = subprocess.run([str(cli), "group", "5,5"], cwd=elsewhere, env=env, capture_output=True, text=True)
    assert bad.returncode == 2 and bad.stderr.startswith("formkit: error: ")
