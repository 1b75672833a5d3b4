"""The Python examples of the documentation site run and their assertions hold.

Every ```python block of the tutorial and the how-to pages is executed in order, page by page,
in one namespace per page (common practice for documentation examples, no outside source; the
values asserted there are checked by the tests of each module against their sources).
"""

from __future__ import annotations

import pathlib
import re

import pytest

DOCS = pathlib.Path(__file__).resolve().parent.parent / "docs"
PAGES = [DOCS / "tutorial.md", *sorted((DOCS / "howto").glob("*.md"))]
BLOCK = re.compile(r"^```python\n(.*?)^```", re.S | re.M)


@pytest.mark.parametrize("page", PAGES, ids=lambda p: p.stem)
def test_python_blocks_run(page, tmp_path, monkeypatch):
    blocks = BLOCK.findall(page.read_text())
    if page.stem == "notebooks":
        pytest.importorskip("matplotlib")
        blocks = [b for b in blocks if "IPython" not in b]  # IPython is not a dependency
    assert blocks or page.stem == "tables_on_a_cluster", page
    monkeypatch.chdir(tmp_path)
    namespace: dict[str, object] = {}
    for block in blocks:
        exec(compile(block, str(page), "exec"), namespace)  # our own documentation, not user text


def test_every_page_is_in_a_toctree():
    index = (DOCS / "index.md").read_text()
    for page in [*PAGES, DOCS / "methods.md", DOCS / "gallery.md", DOCS / "l_value_interval.md"]:
        name = page.relative_to(DOCS).with_suffix("").as_posix()
        assert f"\n{name}\n" in index, name
