"""Root conftest: make the doctests in formkit/ see the public names (like networkx)."""

import pytest

import formkit


@pytest.fixture(autouse=True)
def _formkit_doctest_namespace(doctest_namespace):
    doctest_namespace["formkit"] = formkit
    for name in formkit.__all__:
        doctest_namespace[name] = getattr(formkit, name)
