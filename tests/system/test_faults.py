"""Faults a shop meets: a read-only database, a full disk. A clear message, an intact database.

Source: SQLite result codes SQLITE_READONLY and SQLITE_FULL, and PRAGMA query_only and
max_page_count as documented on sqlite.org (used to simulate the faults without root tricks).
"""

from __future__ import annotations

import os

import pytest

from stock.store.integrity import check_store
from stock.errors import StoreProblem
from stock.store.database import open_store


def _bin(store, key):
    with store.writing() as db:
        return db.conn.execute(
            "INSERT INTO bins (bin_key, notes, created_at, updated_at) VALUES (?, ?, 'now', 'now')",
            (key, "x" * 2000)).lastrowid


def test_writing_to_a_read_only_database_says_so(tmp_path):
    store = open_store(tmp_path / "s.db")
    b = _bin(store, "cab/A1")
    store.db.conn.execute("PRAGMA query_only = ON")   # what SQLite does with a read-only file
    with pytest.raises(StoreProblem, match="the database file is read-only"):
        with store.writing():
            store.move(b, 5, "import")
    store.db.conn.execute("PRAGMA query_only = OFF")
    assert check_store(store).ok and store.one("SELECT on_hand FROM bins")["on_hand"] is None


@pytest.mark.skipif(os.geteuid() == 0, reason="root writes through file permissions")
def test_a_file_without_write_permission_is_reported_as_read_only(tmp_path):
    path = tmp_path / "s.db"
    open_store(path).close()
    path.chmod(0o444)
    store = open_store(path)
    with pytest.raises(StoreProblem, match="read-only"):
        _bin(store, "cab/A1")


def test_a_full_disk_leaves_the_database_intact_and_says_what_happened(tmp_path):
    store = open_store(tmp_path / "s.db")
    first = _bin(store, "cab/A1")
    with store.writing():
        store.move(first, 3, "import")
    pages = store.one("PRAGMA page_count")["page_count"]
    store.db.conn.execute(f"PRAGMA max_page_count = {pages + 1}")
    with pytest.raises(StoreProblem) as err:
        with store.writing():
            for i in range(200):
                _bin(store, f"cab/B{i}")
    assert "is full" in str(err.value) and "nothing of this change was written" in str(err.value)
    store.db.conn.execute("PRAGMA max_page_count = 1073741823")
    assert check_store(store).ok
    assert store.one("SELECT COUNT(*) AS n FROM bins")["n"] == 1
