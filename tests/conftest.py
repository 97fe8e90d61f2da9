"""Shared fixtures: tiny stores in tmp_path; the Hypothesis profiles.

Hypothesis profiles: ``ci`` (the default) is derandomised, so every run draws the same examples
and a failure in CI is a failure on every machine; ``long`` draws ten times as many fresh random
examples for a local soak: ``HYPOTHESIS_PROFILE=long python3 -m pytest``. A test's own
``@settings(max_examples=…)`` still sets its count in both.
"""

from __future__ import annotations

import os

import pytest
from hypothesis import HealthCheck, settings

from stock.store.database import Store, open_store

settings.register_profile("ci", derandomize=True, database=None, deadline=None, print_blob=True,
                          suppress_health_check=[HealthCheck.too_slow])
settings.register_profile("long", max_examples=1000, deadline=None,
                          suppress_health_check=[HealthCheck.too_slow])
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "ci"))


@pytest.fixture
def store(tmp_path) -> Store:
    """An empty stock database in a temporary folder."""
    s = open_store(tmp_path / "stock.db")
    yield s
    s.close()
