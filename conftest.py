"""Root conftest: make the doctests in formkit/ see the public names (like networkx); keep mpmath's precision per test."""

import pytest

import formkit


@pytest.fixture(autouse=True)
def _formkit_doctest_namespace(doctest_namespace):
    doctest_namespace["formkit"] = formkit
    for name in formkit.__all__:
        doctest_namespace[name] = getattr(formkit, name)


@pytest.fixture(autouse=True)
def _restore_mpmath_precision():
    """Every test and doctest starts at mpmath's default precision and leaves it as it found it
    (a test that sets ``mpmath.mp.dps`` would otherwise change how later doctests print)."""
    import mpmath

    dps = mpmath.mp.dps
    yield
    mpmath.mp.dps = dps
