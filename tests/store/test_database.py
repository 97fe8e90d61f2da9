"""The store keeps the ledger and on-hand quantities in step.

Sources: SQLite documentation for WAL, STRICT tables and BEGIN IMMEDIATE (sqlite.org); the
ledger rules (append-only, never negative) are this project's own promises, common practice in
stock-keeping, no published source.
"""

from __future__ import annotations

import sqlite3

import pytest

from stock.errors import NotFound, Refused, StoreProblem
from stock.store.database import open_store


def _bin(store, key="cab/A1", on_hand=None):
    with store.writing() as db:
        cur = db.conn.execute(
            "INSERT INTO bins (bin_key, location, label, created_at, updated_at)"
            " VALUES (?, ?, ?, 'now', 'now')", (key, key.split("/")[-1], "10nF"))
    return cur.lastrowid


def test_opening_a_new_database_applies_every_migration_and_turns_on_wal(tmp_path):
    s = open_store(tmp_path / "s.db")
    assert s.one("PRAGMA journal_mode")["journal_mode"] == "wal"
    assert s.one("PRAGMA foreign_keys")["foreign_keys"] == 1
    assert {"bins", "parts", "ledger", "flags", "plans", "reservations"} <= set(s.db.table_names())


def test_reopening_applies_nothing_twice(tmp_path):
    open_store(tmp_path / "s.db").close()
    s = open_store(tmp_path / "s.db")
    names = [r["name"] for r in s.rows("SELECT name FROM _sqlite_migrations")]
    assert len(names) == len(set(names))


def test_movements_keep_on_hand_equal_to_the_ledger_sum(store):
    b = _bin(store)
    with store.writing():
        store.move(b, 10, "import")
        store.move(b, -3, "pull", ref="plan:1")
        assert store.set_count(b, 12) == 5
    total = store.one("SELECT SUM(delta) AS s FROM ledger WHERE bin_id = ?", (b,))["s"]
    assert total == store.one("SELECT on_hand FROM bins WHERE id = ?", (b,))["on_hand"] == 12


def test_a_movement_below_zero_is_refused_and_writes_nothing(store):
    b = _bin(store)
    with store.writing():
        store.move(b, 2, "import")
    with pytest.raises(Refused, match="cannot take 5 from bin cab/A1: it holds only 2"):
        with store.writing():
            store.move(b, -5, "pull")
    assert store.one("SELECT COUNT(*) AS n FROM ledger")["n"] == 1


def test_the_ledger_refuses_updates_and_deletes(store):
    b = _bin(store)
    with store.writing():
        store.move(b, 1, "import")
    with pytest.raises(sqlite3.IntegrityError, match="append-only"):
        store.db.conn.execute("UPDATE ledger SET delta = 99")
    with pytest.raises(sqlite3.IntegrityError, match="append-only"):
        store.db.conn.execute("DELETE FROM ledger")


def test_an_exception_inside_writing_rolls_everything_back(store):
    b = _bin(store)
    with pytest.raises(ZeroDivisionError):
        with store.writing():
            store.move(b, 7, "import")
            1 / 0
    assert store.one("SELECT on_hand FROM bins WHERE id = ?", (b,))["on_hand"] is None
    assert store.one("SELECT COUNT(*) AS n FROM ledger")["n"] == 0


def test_strict_tables_keep_bin_codes_as_text(store):
    b = _bin(store, key="cab/007")
    assert store.one("SELECT location FROM bins WHERE id = ?", (b,))["location"] == "007"


def test_a_settled_flag_is_not_reopened_by_raising_it_again(store):
    first = store.raise_flag(kind="ambiguous-code", message="100: 10 pF or 100 pF?", fingerprint="fp1")
    store.db.conn.execute("UPDATE flags SET status = 'settled' WHERE id = ?", (first,))
    assert store.raise_flag(kind="ambiguous-code", message="again", fingerprint="fp1") is None
    assert store.one("SELECT status FROM flags WHERE id = ?", (first,))["status"] == "settled"


def test_find_bin_accepts_id_key_location_or_label(store):
    b = _bin(store, key="cab/A1")
    assert store.find_bin(str(b))["id"] == b
    assert store.find_bin("CAB/a1")["id"] == b
    assert store.find_bin("A1")["id"] == b
    with pytest.raises(NotFound, match="no bin 'Z9'"):
        store.find_bin("Z9")


def test_a_missing_database_is_a_clear_problem_when_creation_is_off(tmp_path):
    with pytest.raises(StoreProblem, match="no stock database here"):
        open_store(tmp_path / "none.db", create=False)


def test_a_file_that_is_not_a_database_is_named_as_such(tmp_path):
    junk = tmp_path / "junk.db"
    junk.write_bytes(b"this is not sqlite" * 100)
    with pytest.raises(StoreProblem, match="not a stock database"):
        open_store(junk)


def test_a_second_writer_gets_a_clear_message_after_a_bounded_wait(tmp_path, monkeypatch):
    import stock.store.database as store_module

    monkeypatch.setattr(store_module, "BUSY_TIMEOUT_S", 0.2)
    a = open_store(tmp_path / "s.db")
    b = open_store(tmp_path / "s.db")
    a.db.conn.execute("BEGIN IMMEDIATE")
    try:
        with pytest.raises(StoreProblem, match="locked by another program"):
            with b.writing():
                pass
    finally:
        a.db.conn.execute("ROLLBACK")


def test_a_failing_first_migration_leaves_no_half_made_schema(tmp_path, monkeypatch):
    # SQLite transactions (sqlite.org): DDL is transactional; the migration must not commit midway
    import stock.store.database as store_module

    def broken(db, script):
        db.conn.execute("CREATE TABLE bins_half (x)")
        raise RuntimeError("power cut")

    monkeypatch.setattr(store_module, "_run_script", broken)
    path = tmp_path / "new.db"
    with pytest.raises(RuntimeError, match="power cut"):
        open_store(path)
    monkeypatch.undo()
    s = open_store(path)          # opens as a new stock database, not as a foreign file
    assert "bins" in s.db.table_names() and "bins_half" not in s.db.table_names()
