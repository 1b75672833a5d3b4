"""Shared pytest configuration: hypothesis profiles.

The tests mirror the package (tests/core/, tests/classgroups/, …) without __init__.py
files: pytest puts the directory of this conftest on sys.path, so the shared helpers
here (_cli, _discriminants, _foundation_strategies, _redei, _classgroup_reference) are
imported by their plain names from every subdirectory, and test file names must be
unique across the tree.
"""

import os

from hypothesis import HealthCheck, settings

settings.register_profile(
    "default", max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow]
)
settings.register_profile("thorough", max_examples=1000, deadline=None)
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "default"))
