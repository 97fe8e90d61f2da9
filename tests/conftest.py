"""Shared fixtures: tiny stores in tmp_path."""

from __future__ import annotations

import pytest

from stock.store.database import Store, open_store


@pytest.fixture
def store(tmp_path) -> Store:
    """An empty stock database in a temporary folder."""
    s = open_store(tmp_path / "stock.db")
    yield s
    s.close()
