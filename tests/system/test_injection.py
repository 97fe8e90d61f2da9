"""SQL fragments and formula prefixes in markings and labels stay plain text, everywhere.

A sheet's cells go into the store through bound parameters only, so "'); DROP TABLE bins;--"
is a label like any other; and every export writes user text so that no spreadsheet program runs
it: XLSX string cells (``data_type`` "s", quote prefix on formula-like text, no ``<f>`` element
from user text) and CSV cells with a leading apostrophe before ``= + - @ tab CR``.

Sources: OWASP "CSV Injection" (formula prefixes = + - @ tab CR and the apostrophe guard);
OWASP "SQL Injection" (the classic fragments used here); ECMA-376 SpreadsheetML (a cell's
``t="s"``/``t="inlineStr"`` string types, ``<f>`` formulas, the ``quotePrefix`` style flag);
W3C XML 1.0 section 2.11 (a CR in element text is read as LF).
"104" = 100 nF per IEC 60062 is only sheet content.
"""

from __future__ import annotations

import csv
import json
import zipfile
from pathlib import Path

import pytest
from typer.testing import CliRunner

from stock.store.integrity import check_store
from stock.cli import app
from stock.sheets_out.exports import export_inventory, export_purchasing
from stock.inventory.intake import import_file
from stock.sheets_out.workbook import FORMULA_PREFIXES
from stock.sheets_out.count_sheet import export_count_sheet
from stock.store.database import open_store
from tests.helpers_procs import write_bin_sheet

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1"}

# (location, marking, label): each marking decodes to a capacitance so the row is stored.
HOSTILE_ROWS = [
    ("A1", "104K '); DROP TABLE bins;--", "'); DROP TABLE bins;--"),
    ("A2", "104 OR 1=1", "1 OR 1=1"),
    ("A3", "=104K", "=HYPERLINK(\"http://example.invalid\",\"click\")"),
    ("A4", "4n7 @SUM(1+1)*cmd", "+1+1"),
    ("A5", "104K =cmd|' /C calc'!A0", "-2+3"),
    ("A6", "472J", "@SUM(A1:A9)"),
    ("A7", "1n5 C0G", "\"; DELETE FROM ledger; --"),
    ("=A8", "222K", "Robert'); DROP TABLE parts;--"),
]
# Markings that do not decode: quarantined, and their raw text kept as it was.
QUARANTINED_ROWS = [("Q1", "+104K", "plus"), ("Q2", "-104K", "minus"), ("Q3", "@104K", "at")]
# Set in the store directly: the importer folds white space, so tab and CR prefixes arrive only
# through a later edit; the exports must still guard them.
WHITESPACE_LABELS = {"A1": "\t=1+1", "A2": "\r@SUM(1)"}


@pytest.fixture
def loaded(tmp_path) -> Path:
    db = tmp_path / "stock.db"
    sheet = write_bin_sheet(tmp_path / "hostile.csv",
                            [(loc, mark, 5, label, 10) for loc, mark, label in HOSTILE_ROWS + QUARANTINED_ROWS],
                            headers=("Location", "Marking", "Qty", "Label", "Minimum"))
    with open_store(db) as store:
        (report,) = import_file(store, sheet).sheets
        assert (report.stored, report.quarantined) == (len(HOSTILE_ROWS), len(QUARANTINED_ROWS))
    return db


def _with_whitespace_labels(db: Path) -> dict[str, str]:
    """Give two bins tab/CR-prefixed labels; returns location -> label for every stored bin."""
    with open_store(db) as store, store.writing() as d:
        for loc, label in WHITESPACE_LABELS.items():
            d.conn.execute("UPDATE bins SET label = ? WHERE location = ?", (label, loc))
    labels = {loc: label for loc, _, label in HOSTILE_ROWS}
    labels.update(WHITESPACE_LABELS)
    return labels


def test_hostile_text_is_stored_byte_for_byte_and_no_statement_ran(loaded):
    with open_store(loaded) as store:
        tables = set(store.db.table_names())
        assert {"bins", "parts", "ledger"} <= tables
        got = {r["location"]: (r["marking"], r["label"]) for r in store.rows(
            "SELECT b.location, b.label, p.marking FROM bins b JOIN parts p ON p.bin_id = b.id")}
        assert got == {loc: (mark, label) for loc, mark, label in HOSTILE_ROWS}
        assert store.one("SELECT COUNT(*) AS n FROM ledger")["n"] == len(HOSTILE_ROWS)
        assert check_store(store).ok


def test_quarantined_hostile_rows_keep_their_raw_text(loaded):
    result = CliRunner().invoke(app, ["--db", str(loaded), "quarantine", "--json"], env=ENV)
    assert result.exit_code == 0, result.output
    raw = {r["raw"]["Location"]: r["raw"] for r in json.loads(result.stdout)["rows"]}
    for loc, mark, label in QUARANTINED_ROWS:
        assert raw[loc]["Marking"] == mark and raw[loc]["Label"] == label


def test_bins_json_shows_the_hostile_text_exactly(loaded):
    labels = _with_whitespace_labels(loaded)
    result = CliRunner().invoke(app, ["--db", str(loaded), "bins", "--json"], env=ENV)
    assert result.exit_code == 0, result.output
    bins = {b["location"]: b for b in json.loads(result.stdout)["bins"]}
    for loc, mark, _ in HOSTILE_ROWS:
        assert bins[loc]["marking"] == mark
        assert bins[loc]["label"] == labels[loc]


def _guarded(text: str) -> str:
    """What OWASP's guard makes of a CSV cell: an apostrophe before a formula prefix."""
    return "'" + text if text.startswith(FORMULA_PREFIXES) else text


def _read_csv(path: Path) -> list[dict[str, str]]:
    with open(path, newline="", encoding="utf-8-sig") as fh:
        return list(csv.DictReader(fh))


def _xlsx_cells(path: Path, sheet: str) -> list[list]:
    from openpyxl import load_workbook

    wb = load_workbook(path)          # normal mode: cell styles (quote prefix) are visible
    try:
        return [list(row) for row in wb[sheet].iter_rows()]
    finally:
        wb.close()


def _assert_text_cell(cell, text: str) -> None:
    assert cell.data_type == "s", (cell.coordinate, cell.data_type, text)
    # A bare CR in XML text reads back as LF (XML 1.0, 2.11 end-of-line handling): the one
    # change a workbook makes; the text is still a string, never a formula.
    assert cell.value == text.replace("\r\n", "\n").replace("\r", "\n")
    if text.startswith(FORMULA_PREFIXES):
        assert cell.quotePrefix, (cell.coordinate, text)


def _no_formula_in(path: Path, part: str) -> None:
    with zipfile.ZipFile(path) as z:
        xml = z.read(part)
    assert b"<f>" not in xml and b"<f " not in xml


def test_the_inventory_workbook_holds_hostile_text_as_string_cells(loaded, tmp_path):
    labels = _with_whitespace_labels(loaded)
    out = tmp_path / "inventory.xlsx"
    with open_store(loaded) as store:
        assert export_inventory(store, out) == len(HOSTILE_ROWS)
    rows = _xlsx_cells(out, "Bins")
    header = [c.value for c in rows[0]]
    loc_i, label_i, mark_i = header.index("Location"), header.index("Label"), header.index("Marking")
    marks = {loc: mark for loc, mark, _ in HOSTILE_ROWS}
    seen = set()
    for row in rows[1:]:
        loc = row[loc_i].value
        _assert_text_cell(row[loc_i], loc)
        _assert_text_cell(row[label_i], labels[loc])
        _assert_text_cell(row[mark_i], marks[loc])
        seen.add(loc)
    assert seen == set(marks)
    _no_formula_in(out, "xl/worksheets/sheet1.xml")


def test_the_inventory_csv_guards_every_formula_prefix_with_an_apostrophe(loaded, tmp_path):
    labels = _with_whitespace_labels(loaded)
    out = tmp_path / "inventory.csv"
    with open_store(loaded) as store:
        export_inventory(store, out)
    marks = {loc: mark for loc, mark, _ in HOSTILE_ROWS}
    by_loc = {}
    for row in _read_csv(out):
        loc = row["Location"][1:] if row["Location"].startswith("'=") else row["Location"]
        by_loc[loc] = row
    assert set(by_loc) == set(marks)
    for loc, row in by_loc.items():
        assert row["Location"] == _guarded(loc)
        assert row["Label"] == _guarded(labels[loc])
        assert row["Marking"] == _guarded(marks[loc])
        assert not any(v.startswith(FORMULA_PREFIXES) for v in row.values())


def test_the_count_sheet_holds_hostile_text_as_string_cells(loaded, tmp_path):
    labels = _with_whitespace_labels(loaded)
    out = tmp_path / "count.xlsx"
    with open_store(loaded) as store:
        assert export_count_sheet(store, out) == len(HOSTILE_ROWS)
    rows = _xlsx_cells(out, "Stock take")
    header = [c.value for c in rows[0]]
    marks = {loc: mark for loc, mark, _ in HOSTILE_ROWS}
    for row in rows[1:]:
        loc = row[header.index("Location")].value
        _assert_text_cell(row[header.index("Location")], loc)
        _assert_text_cell(row[header.index("Label")], labels[loc])
        _assert_text_cell(row[header.index("Marking")], marks[loc])
    _no_formula_in(out, "xl/worksheets/sheet1.xml")


@pytest.mark.parametrize("suffix", [".xlsx", ".csv"])
def test_the_purchasing_list_carries_hostile_markings_as_text(loaded, tmp_path, suffix):
    out = tmp_path / f"order{suffix}"
    with open_store(loaded) as store:
        n = export_purchasing(store, out, below_minimum=True)   # every bin holds 5 of a minimum 10
    assert n >= 1
    if suffix == ".csv":
        text_cells = [v for row in _read_csv(out) for v in row.values()]
        assert not any(v.startswith(FORMULA_PREFIXES) for v in text_cells)
        joined = "\n".join(text_cells)
    else:
        rows = _xlsx_cells(out, "To order")
        header = [c.value for c in rows[0]]
        cells = [row[header.index("Requirement")] for row in rows[1:-1]]   # last row: totals
        assert all(c.data_type == "s" for c in cells if c.value)
        joined = "\n".join(str(c.value) for c in cells)
    for _, mark, _ in HOSTILE_ROWS:
        assert mark in joined


def test_the_pick_list_workbook_holds_hostile_markings_as_string_cells(loaded, tmp_path):
    from stock.kitting.planner import KitOptions, plan_kit
    from stock.kitting.pick_list import pick_list
    from stock.sheets_out.pick_sheet import write_pick_list_xlsx
    from tests.helpers_procs import write_bom

    out = tmp_path / "pick.xlsx"
    with open_store(loaded) as store:
        plan = plan_kit(store, write_bom(tmp_path / "bom.csv", qty_per_board=4, tolerance=""),
                        KitOptions(boards=5))
        assert write_pick_list_xlsx(pick_list(store, plan.id), out) >= 2
    rows = _xlsx_cells(out, "Pick list")
    header = [c.value for c in rows[0]]
    marks = {mark for _, mark, _ in HOSTILE_ROWS}
    picked = [row[header.index("Marking")] for row in rows[1:-1]]       # last row: totals
    assert {c.value for c in picked} <= marks
    assert any(c.value.startswith(FORMULA_PREFIXES) for c in picked)    # "=104K" was picked
    for cell in picked:
        _assert_text_cell(cell, cell.value)
