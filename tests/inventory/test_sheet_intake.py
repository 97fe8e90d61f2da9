"""Importing batch by batch: what one batch learns must hold for the next (duplicates, bins
stored or edited by an earlier batch, readings shared), so results never depend on where a
batch boundary falls. Quantity rules: common practice, no published source; the values are
IEC 60062 three-digit codes ("104" is 10 × 10⁴ pF = 100 nF)."""

from __future__ import annotations

import csv

import pytest
from openpyxl import Workbook

from stock.inventory import sheet_intake
from stock.inventory.intake import import_file
from stock.store.integrity import check_store


def write_csv(path, rows, headers=("Location", "Marking", "Qty")):
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(headers)
        w.writerows(rows)
    return path


ROWS = [["A1", "104", "5"], ["A2", "472", "3"], ["A3", "104", "7"], ["A4", "4n7", ""],
        ["A1", "103", "1"],      # a second row for bin A1, two batches after the first
        ["A5", "104", "2"], ["A2", "472", "3"]]


@pytest.fixture(params=[2, 3, 5000], ids=["batch-2", "batch-3", "one-batch"])
def batch(request, monkeypatch):
    monkeypatch.setattr(sheet_intake, "BATCH", request.param)
    return request.param


def test_a_bin_given_twice_is_a_duplicate_wherever_the_batches_split(store, tmp_path, batch):
    (sheet,) = import_file(store, write_csv(tmp_path / "rack.csv", ROWS)).sheets
    assert (sheet.rows, sheet.stored, sheet.quarantined, sheet.new_bins) == (7, 5, 2, 5)
    reasons = [r["reasons_json"] for r in store.rows(
        "SELECT reasons_json FROM source_rows WHERE status = 'quarantined' ORDER BY row_number")]
    assert "already came from row 2 of this file" in reasons[0]
    assert "already came from row 3 of this file" in reasons[1]
    assert check_store(store).ok


def test_bins_sharing_a_marking_share_one_reading_across_batches(store, tmp_path, batch):
    import_file(store, write_csv(tmp_path / "rack.csv", ROWS))
    shown = {r["location"]: r["shown_id"] for r in store.rows(
        "SELECT b.location, p.shown_id FROM bins b JOIN bin_parts p ON p.bin_id = b.id")}
    assert shown["A1"] == shown["A3"] == shown["A5"]
    assert len(set(shown.values())) == 3      # 104, 472, 4n7
    # grades once per reading, each bin sees them
    assert store.one("SELECT COUNT(DISTINCT marking_id) AS n FROM marking_grades")["n"] == 3
    assert store.one("SELECT COUNT(DISTINCT bin_id) AS n FROM grades")["n"] == 5


def test_an_edited_sheet_updates_bins_stored_by_earlier_batches(store, tmp_path, batch):
    path = write_csv(tmp_path / "rack.csv", [["A1", "104", "5"], ["A2", "472", "3"], ["A3", "103", "1"]])
    import_file(store, path)
    write_csv(path, [["A1", "104", "5"], ["A2", "473", "3"], ["A3", "103", "9"], ["A4", "222", "2"]])
    (sheet,) = import_file(store, path).sheets
    assert (sheet.unchanged, sheet.updated_bins, sheet.new_bins, sheet.count_movements) == (1, 2, 1, 1)
    caps = {r["location"]: r["capacitance_pf"] for r in store.rows(
        "SELECT b.location, p.capacitance_pf FROM bins b JOIN parts p ON p.bin_id = b.id")}
    assert caps == {"A1": 100_000.0, "A2": 47_000.0, "A3": 10_000.0, "A4": 2_200.0}
    assert check_store(store).ok


def test_a_bin_on_two_sheets_of_one_workbook_is_a_duplicate(store, tmp_path, batch):
    wb = Workbook()
    first = wb.active
    first.title = "Rack"
    for row in [["Cabinet", "Location", "Marking", "Qty"], ["Main", "A1", "104", 5], ["Main", "A2", "472", 1]]:
        first.append(row)
    second = wb.create_sheet("Overflow")
    for row in [["Cabinet", "Location", "Marking", "Qty"], ["Main", "A9", "103", 2], ["Main", "A1", "104", 5]]:
        second.append(row)
    wb.save(tmp_path / "two.xlsx")
    rack, overflow = import_file(store, tmp_path / "two.xlsx").sheets
    assert (rack.stored, overflow.stored, overflow.quarantined) == (2, 1, 1)
    reason = store.one("SELECT reasons_json FROM source_rows WHERE status = 'quarantined'")["reasons_json"]
    assert "already came from row 2 of sheet 'Rack' of this file" in reason
