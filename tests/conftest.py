"""Shared pytest configuration: doctest namespace and hypothesis profiles."""

import os

from hypothesis import HealthCheck, settings


settings.register_profile(
    "default", max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow]
)
settings.register_profile("thorough", max_examples=1000, deadline=None)
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "default"))


