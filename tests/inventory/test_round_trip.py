"""What the store exports, the store imports back: every bin with equal facts, counts and decisions.

No outside source is needed: the check is that export and import are inverse on the store's own
facts (a round-trip invariant); the expected values are those of the first store, never computed
by the import under test.
"""

from __future__ import annotations

import csv
import sqlite3

import pytest

from stock.demo import demo_source
from stock.inventory.intake import import_file
from stock.inventory.own_exports import EXPORT_HEADERS
from stock.inventory.settling import settle
from stock.sheets_out.exports import INVENTORY_COLUMNS, export_inventory
from stock.store.database import open_store

FACTS_SQL = """
SELECT b.bin_key, b.location, b.cabinet, b.label, b.on_hand, b.minimum, b.date_code,
       p.capacitance_pf, p.tol_minus, p.tol_plus, p.tol_unit, p.voltage_v, p.voltage_kind,
       p.dielectric_code, p.family, p.tempco_ppm_per_k, p.safety_class, p.polarity, p.package,
       p.mounting, p.settled_json IS NOT NULL AS settled
FROM bins b JOIN parts p ON p.bin_id = b.id ORDER BY b.bin_key
"""


def bin_facts(path):
    conn = sqlite3.connect(path)
    conn.row_factory = sqlite3.Row
    try:
        return {r["bin_key"]: dict(r) for r in conn.execute(FACTS_SQL)}
    finally:
        conn.close()


def own_shop(tmp_path):
    """A shop of our own: settled doubts, two bins of one value, safety parts, packages, colours."""
    sheet = tmp_path / "back_room.csv"
    rows = [
        ["Where", "Printed on it", "Label", "Tolerance", "Colours", "Pieces", "Package"],
        ["R1", "47K", "470p", "", "", "12", "radial"],                       # settled below
        ["R2", "101J 100V C0G", "", "", "", "30", "0805"],                   # a pair of bins ...
        ["R3", "101J 100V C0G", "", "", "", "25", "0805"],                   # ... of one value
        ["R4", "X2 0.1uF 275VAC", "", "", "", "8", "RADIAL 15mm pitch"],
        ["R5", "Y2 2n2 250VAC", "", "", "", "6", "radial"],
        ["R6", "", "", "5%", "yellow violet brown", "40", ""],
        ["R7", "CAP ALUM 100UF 20% 25V RADIAL 6.3x11", "", "", "", "", ""],
        ["R8", "100", "", "", "", "9", "1206"],                              # 10 pF or 100 pF: settled
    ]
    with open(sheet, "w", newline="", encoding="utf-8") as fh:
        csv.writer(fh).writerows(rows)
    path = tmp_path / "own.db"
    store = open_store(path)
    try:
        import_file(store, sheet)
        settle(store, "R1", reading=2, note="measured 468 pF")
        settle(store, "R8", value="100p", note="measured 101 pF")
    finally:
        store.close()
    return path


def demo_shop(tmp_path):
    src = demo_source()
    path = tmp_path / "demo.db"
    store = open_store(path)
    try:
        import_file(store, src / "lantern_register.xlsx")
        import_file(store, src / "drawer_cabinet_c.csv")
        settle(store, "A18", reading=2, note="measured 468 pF")
    finally:
        store.close()
    return path


@pytest.mark.parametrize("make", [demo_shop, own_shop], ids=["demo-shop", "own-shop"])
@pytest.mark.parametrize("suffix", [".csv", ".xlsx"])
def test_an_exported_store_imports_back_bin_for_bin(tmp_path, make, suffix):
    first = make(tmp_path)
    store = open_store(first)
    try:
        out = tmp_path / f"inventory{suffix}"
        written = export_inventory(store, out)
    finally:
        store.close()
    second = tmp_path / "second.db"
    copy = open_store(second)
    try:
        report = import_file(copy, out)
    finally:
        copy.close()
    before, after = bin_facts(first), bin_facts(second)
    assert written == len(before) and sum(s.stored for s in report.sheets) == len(before)
    assert set(after) == set(before)
    for key in before:
        assert after[key] == before[key], key
    assert any(f["settled"] for f in before.values())


def test_a_settled_reading_stays_settled_and_the_ledger_says_where_it_came_from(tmp_path):
    first = own_shop(tmp_path)
    store = open_store(first)
    try:
        export_inventory(store, tmp_path / "inv.csv")
    finally:
        store.close()
    copy = open_store(tmp_path / "second.db")
    try:
        import_file(copy, tmp_path / "inv.csv")
        part = copy.one("SELECT p.capacitance_pf FROM parts p JOIN bins b ON b.id = p.bin_id"
                        " WHERE b.location = 'R1'")
        notes = [r["note"] for r in copy.rows("SELECT note FROM ledger WHERE kind = 'settle'")]
        open_on_r1 = copy.one("SELECT COUNT(*) AS n FROM flags f JOIN bins b ON b.id = f.bin_id"
                              " WHERE b.location = 'R1' AND f.status = 'open'")["n"]
    finally:
        copy.close()
    assert part["capacitance_pf"] == 470.0
    assert any("inv.csv" in n for n in notes)
    assert open_on_r1 == 0


def test_the_workbook_skips_its_chart_sheet_and_says_why(tmp_path):
    first = own_shop(tmp_path)
    store = open_store(first)
    try:
        export_inventory(store, tmp_path / "inv.xlsx")
    finally:
        store.close()
    copy = open_store(tmp_path / "second.db")
    try:
        report = import_file(copy, tmp_path / "inv.xlsx")
    finally:
        copy.close()
    skipped = {s.sheet: s.skipped for s in report.sheets if s.skipped}
    assert list(skipped) == ["Drift with temperature"]
    assert "no column carries a value or marking" in skipped["Drift with temperature"]


def test_importing_the_export_into_the_same_store_changes_no_bin(tmp_path):
    first = own_shop(tmp_path)
    store = open_store(first)
    try:
        before = bin_facts(first)
        export_inventory(store, tmp_path / "inv.csv")
        report = import_file(store, tmp_path / "inv.csv")
    finally:
        store.close()
    assert bin_facts(first) == before
    assert report.sheets[0].new_bins == 0


def test_the_export_headers_still_mark_an_export():
    written = {c.header for c in INVENTORY_COLUMNS} if hasattr(INVENTORY_COLUMNS[0], "header") else \
        {c[0] for c in INVENTORY_COLUMNS}
    assert set(EXPORT_HEADERS) <= written
