"""The migration to readings stored once, run on a store written by the schema before it.

``fixtures/store-before-markings.db`` was written by the code before the migration existed: the
sheet ``store-before-markings.csv`` imported, then bin A5's label conflict settled with reading 1
(the label's 1 nF). The migration must keep every part's columns, JSON, settled reading, grades
and source rows, and the store must then take imports as before.
"""

from __future__ import annotations

import shutil
import sqlite3
from pathlib import Path

from stock.inventory.bins import bin_detail, part_marking
from stock.inventory.intake import import_file
from stock.store.database import open_store
from stock.store.integrity import check_store

FIXTURES = Path(__file__).parent / "fixtures"


def _old_rows(path: Path, sql: str) -> list[dict]:
    conn = sqlite3.connect(path)
    conn.row_factory = sqlite3.Row
    try:
        return [dict(r) for r in conn.execute(sql)]
    finally:
        conn.close()


def _copy(tmp_path: Path) -> Path:
    db = tmp_path / "old.db"
    shutil.copy(FIXTURES / "store-before-markings.db", db)
    return db


def test_the_old_store_really_has_the_old_tables(tmp_path):
    db = _copy(tmp_path)
    kinds = {r["name"]: r["type"] for r in _old_rows(db, "SELECT name, type FROM sqlite_master")}
    assert kinds["parts"] == "table" and kinds["grades"] == "table" and "markings" not in kinds


def test_every_part_keeps_its_columns_json_and_settled_reading(tmp_path):
    db = _copy(tmp_path)
    before = _old_rows(db, "SELECT * FROM parts ORDER BY bin_id")
    with open_store(db) as store:
        after = store.rows("SELECT * FROM parts ORDER BY bin_id")
        assert after == before
        settled = [r for r in after if r["settled_json"]]
        assert len(settled) == 1
        # the settled reading is the label's: 1 nF (IEC 60062 letter code "1n0")
        assert part_marking(settled[0]).capacitance_pf == 1000
        assert store.one("SELECT capacitance_pf FROM parts WHERE bin_id = ?",
                         (settled[0]["bin_id"],))["capacitance_pf"] == 1000.0
        assert check_store(store).ok


def test_bins_sharing_a_marking_share_one_reading_and_its_grades(tmp_path):
    db = _copy(tmp_path)
    old_grades = _old_rows(db, "SELECT bin_id, application, grade, reasons_json, table_version"
                               " FROM grades ORDER BY bin_id, application")
    with open_store(db) as store:
        assert store.rows("SELECT bin_id, application, grade, reasons_json, table_version"
                          " FROM grades ORDER BY bin_id, application") == old_grades
        a1, a2 = (store.one("SELECT shown_id FROM bin_parts p JOIN bins b ON b.id = p.bin_id"
                            " WHERE b.location = ?", (loc,))["shown_id"] for loc in ("A1", "A2"))
        assert a1 == a2     # both bins hold "104K 2A X7R"
        n_readings = store.one("SELECT COUNT(*) AS n FROM markings")["n"]
        n_parts = store.one("SELECT COUNT(*) AS n FROM bin_parts")["n"]
        # one shared reading, and the settled bin's two (decoded and settled)
        assert n_readings == n_parts - 1 + 1
        assert store.one("SELECT COUNT(*) AS n FROM marking_grades")["n"] == \
            store.one("SELECT COUNT(DISTINCT application) AS n FROM marking_grades")["n"] * (n_readings - 1)


def test_old_source_rows_still_read_as_records(tmp_path):
    db = _copy(tmp_path)
    with open_store(db) as store:
        detail = bin_detail(store, "front rack/a2")
        assert detail["source_rows"][0]["raw"] == {"Cabinet": "Front rack", "Location": "A2",
                                                   "Marking": "104K 2A X7R", "Qty": "10",
                                                   "Notes": "spare"}


def test_the_migrated_store_takes_the_same_file_and_an_edited_one(tmp_path):
    db = _copy(tmp_path)
    sheet = tmp_path / "store-before-markings.csv"
    shutil.copy(FIXTURES / "store-before-markings.csv", sheet)
    with open_store(db) as store:
        (again,) = import_file(store, sheet).sheets
        assert again.same_file
        sheet.write_text(sheet.read_text().replace("A7,2200uF 25V 105C,,2", "A7,2200uF 35V 105C,,3"))
        (edited,) = import_file(store, sheet).sheets
        assert (edited.updated_bins, edited.count_movements) == (1, 1)
        a7 = store.one("SELECT p.voltage_v, b.on_hand FROM parts p JOIN bins b ON b.id = p.bin_id"
                       " WHERE b.location = 'A7'")
        assert a7 == {"voltage_v": 35.0, "on_hand": 3}
        # the settled bin still shows the reading a person chose
        assert store.one("SELECT capacitance_pf FROM parts p JOIN bins b ON b.id = p.bin_id"
                         " WHERE b.location = 'A5'")["capacitance_pf"] == 1000.0
        assert store.one("SELECT COUNT(*) AS n FROM grades g JOIN bins b ON b.id = g.bin_id"
                         " WHERE b.location = 'A7'")["n"] > 0
        assert check_store(store).ok


def test_both_third_migrations_apply_in_order_on_an_old_store(tmp_path):
    db = _copy(tmp_path)
    with open_store(db) as store:
        names = [r["name"] for r in store.rows("SELECT name FROM _sqlite_migrations ORDER BY id")]
        assert names.index("m003_remembered_mappings") < names.index("m004_markings_once")
        assert store.one("SELECT COUNT(*) AS n FROM remembered_mappings")["n"] == 0


def test_a_store_that_already_remembers_mappings_gets_the_readings_tables(tmp_path):
    # a store the schema before readings-once wrote once it remembered mappings (its m003 applied)
    db = _copy(tmp_path)
    conn = sqlite3.connect(db)
    conn.executescript("""
        CREATE TABLE remembered_mappings (signature TEXT PRIMARY KEY, vocabulary TEXT NOT NULL,
            headers_json TEXT NOT NULL, mapping_json TEXT NOT NULL, saved_at TEXT NOT NULL) STRICT;
        INSERT INTO remembered_mappings VALUES ('sig', 'bins', '["Where","Print"]',
            '{"location":"Where","marking":"Print"}', '2026-01-01T00:00:00+00:00');
        INSERT INTO _sqlite_migrations (migration_set, name, applied_at)
            VALUES ('stock', 'm003_remembered_mappings', '2026-01-01');
    """)
    conn.commit()
    conn.close()
    with open_store(db) as store:
        assert store.one("SELECT COUNT(*) AS n FROM remembered_mappings")["n"] == 1
        kinds = {r["name"]: r["type"] for r in store.rows("SELECT name, type FROM sqlite_master")}
        assert kinds["parts"] == "view" and kinds["markings"] == "table"
        assert store.one("SELECT COUNT(*) AS n FROM bin_parts")["n"] == len(
            _old_rows(FIXTURES / "store-before-markings.db", "SELECT bin_id FROM parts"))
        assert check_store(store).ok
