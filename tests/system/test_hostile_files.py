"""Hostile files through the real import path: a clear one-line error or every row accounted for.

Each file goes through ``stock.intake.import_file`` and through ``stock import`` (typer's
CliRunner on ``stock.cli.app``), into a store that already holds stock. A refused file leaves
the store exactly as it was (``stock check`` passes, every table keeps its row count).

Sources: hostile inputs (binary junk, a zip that is not a workbook, huge cells, NUL bytes, mixed
line endings, huge header rows) are common practice in fuzzing, no published source. The
workbook layout (``<dimension ref=...>``, ``<row r=...>``, inline strings) is ECMA-376 / ISO/IEC
29500 SpreadsheetML; 1 048 576 rows × 16 384 columns is the sheet size Excel documents. CSV
quoting and line breaks per RFC 4180. "104" = 100 nF per IEC 60062 is only sheet content.
"""

from __future__ import annotations

import io
import json
import re
import zipfile
from pathlib import Path

import pytest
from typer.testing import CliRunner

from stock.store.integrity import check_store
from stock.cli import app
from stock.errors import BadSheet
from stock.inventory.intake import import_file
from stock.store.database import open_store
from tests.helpers_procs import table_counts, write_bin_sheet
from tests.regression_inputs import BOM_SHEETS, CLI_ARGS, COUNT_CELLS, LOCATIONS

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1"}


@pytest.fixture
def db(tmp_path) -> Path:
    """A store holding three bins from an earlier import, to be kept through every refusal."""
    path = tmp_path / "stock.db"
    earlier = write_bin_sheet(tmp_path / "earlier.csv",
                              [("E1", "104K", 10), ("E2", "472J", 5), ("E3", "1n5 C0G", 3)])
    with open_store(path) as store:
        import_file(store, earlier)
    return path


def _counts(db: Path) -> dict[str, int]:
    with open_store(db) as store:
        assert check_store(store).ok
        return table_counts(store)


def _cli(db: Path, *args: str):
    return CliRunner().invoke(app, ["--db", str(db), *args], env=ENV)


def _workbook(path: Path, rows: list[list], *, dimension: str | None = None,
              far_rows: list[tuple[int, list]] = ()) -> Path:
    """An XLSX written by openpyxl, then its sheet XML edited: a claimed dimension, far rows."""
    from openpyxl import Workbook

    wb = Workbook()
    ws = wb.active
    ws.title = "Cabinet 1"
    for r in rows:
        ws.append(r)
    buf = io.BytesIO()
    wb.save(buf)
    with zipfile.ZipFile(io.BytesIO(buf.getvalue())) as zin, \
            zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as zout:
        for name in zin.namelist():
            body = zin.read(name)
            if name == "xl/worksheets/sheet1.xml":
                if dimension:
                    body, n = re.subn(rb'<dimension ref="[^"]*"\s*/>',
                                      f'<dimension ref="{dimension}"/>'.encode(), body)
                    assert n == 1
                extra = "".join(
                    f'<row r="{r}">' + "".join(
                        f'<c r="{chr(65 + i)}{r}" t="inlineStr"><is><t>{v}</t></is></c>'
                        for i, v in enumerate(cells)) + "</row>"
                    for r, cells in far_rows)
                body = body.replace(b"</sheetData>", extra.encode() + b"</sheetData>")
            zout.writestr(name, body)
    return path


def _junk_csv(tmp: Path) -> Path:
    p = tmp / "bins.csv"
    p.write_bytes(bytes(range(256)) * 64)
    return p


def _junk_xlsx(tmp: Path) -> Path:
    p = tmp / "bins.xlsx"
    p.write_bytes(b"\x00\x01garbage\xff" * 500)
    return p


def _plain_zip(tmp: Path) -> Path:
    p = tmp / "bins.xlsx"
    with zipfile.ZipFile(p, "w") as z:
        z.writestr("readme.txt", "not a workbook")
        z.writestr("data/bins.csv", "Location,Marking,Qty\nA1,104,5\n")
    return p


def _truncated_workbook(tmp: Path) -> Path:
    full = _workbook(tmp / "whole.xlsx", [["Location", "Marking", "Qty"], ["A1", "104", 5]])
    p = tmp / "bins.xlsx"
    p.write_bytes(full.read_bytes()[: len(full.read_bytes()) // 2])
    return p


def _workbook_as_csv(tmp: Path) -> Path:
    full = _workbook(tmp / "whole.xlsx", [["Location", "Marking", "Qty"], ["A1", "104", 5]])
    p = tmp / "bins.csv"
    p.write_bytes(full.read_bytes())
    return p


def _no_value_column(tmp: Path) -> Path:
    return write_bin_sheet(tmp / "bins.csv", [("A1", "x", 1)], headers=("Location", "Colour of box", "Qty"))


def _empty(tmp: Path) -> Path:
    p = tmp / "bins.csv"
    p.write_bytes(b"")
    return p


# What each refused file must say (the reader's own words, one line, naming the file).
REFUSED = [
    pytest.param(_junk_csv, "is not a text sheet (it holds binary data)", id="binary-junk-named-csv"),
    pytest.param(_junk_xlsx, "is not an XLSX workbook", id="binary-junk-named-xlsx"),
    pytest.param(_plain_zip, "is a zip archive but not an XLSX workbook", id="zip-that-is-not-a-workbook"),
    pytest.param(_truncated_workbook, "damaged workbook", id="workbook-cut-in-half"),
    pytest.param(_workbook_as_csv, "is a zip archive (perhaps a workbook), not a text sheet",
                 id="workbook-named-csv"),
    pytest.param(_no_value_column, "no column carries a value or marking", id="no-value-column"),
    pytest.param(_empty, "is empty", id="empty-file"),
]


@pytest.mark.parametrize("make, words", REFUSED)
def test_a_refused_file_leaves_the_store_unchanged_through_the_library(tmp_path, db, make, words):
    before = _counts(db)
    path = make(tmp_path)
    with open_store(db) as store, pytest.raises(BadSheet) as err:
        import_file(store, path)
    assert words in str(err.value) and str(err.value).startswith(str(path))
    assert _counts(db) == before


@pytest.mark.parametrize("make, words", REFUSED)
def test_a_refused_file_gives_one_line_and_exit_1_through_the_cli(tmp_path, db, make, words):
    before = _counts(db)
    path = make(tmp_path)
    result = _cli(db, "import", str(path))
    assert result.exit_code == 1, result.output
    assert result.exception is None or isinstance(result.exception, SystemExit)
    (line,) = result.stderr.strip().splitlines()
    assert line.startswith(f"stock: {path}") and words in line
    assert "Traceback" not in result.output
    assert _counts(db) == before


def _import_json(db: Path, path: Path) -> dict:
    result = _cli(db, "import", str(path), "--json")
    assert result.exit_code == 0, result.output
    (sheet,) = json.loads(result.stdout)["files"]
    return sheet


@pytest.fixture
def rows_read(monkeypatch) -> list[int]:
    """Counts the rows openpyxl's read-only sheet hands the importer (padding rows included)."""
    from openpyxl.worksheet._read_only import ReadOnlyWorksheet

    counted = [0]
    original = ReadOnlyWorksheet._cells_by_row

    def counting(self, *args, **kwargs):
        for row in original(self, *args, **kwargs):
            counted[0] += 1
            yield row

    monkeypatch.setattr(ReadOnlyWorksheet, "_cells_by_row", counting)
    return counted


def test_a_workbook_claiming_a_million_rows_reads_only_the_filled_ones(tmp_path, db, rows_read):
    rows = [["Location", "Marking", "Qty"], *[[f"A{i}", "104K", i + 1] for i in range(5)]]
    path = _workbook(tmp_path / "claims.xlsx", rows, dimension="A1:C1000000")
    sheet = _import_json(db, path)
    assert rows_read[0] == 6, "a claimed dimension must not be padded out"
    assert (sheet["rows"], sheet["stored"]) == (5, 5)
    assert _counts(db)["bins"] == 3 + 5


def test_a_workbook_with_one_cell_far_below_the_rest_stops_at_the_blank_run_and_says_so(tmp_path, db,
                                                                                        rows_read):
    # Rows formatted down to row 1 048 576 (Excel's last row): reading stops after the documented
    # run of blank rows (importers.xlsx_sheet.EMPTY_RUN_LIMIT); the user must be told rows were not read.
    from importers.xlsx_sheet import EMPTY_RUN_LIMIT

    rows = [["Location", "Marking", "Qty"], *[[f"A{i}", "104K", i + 1] for i in range(5)]]
    path = _workbook(tmp_path / "far.xlsx", rows, dimension="A1:C1048576",
                     far_rows=[(1_048_576, ["Z9", "472", "7"])])
    result = _cli(db, "import", str(path), "--json")
    assert result.exit_code == 0, result.output
    # the header, five rows, then blank rows up to the limit: never the million below
    assert rows_read[0] <= 6 + EMPTY_RUN_LIMIT + 1
    (sheet,) = json.loads(result.stdout)["files"]
    assert (sheet["rows"], sheet["stored"]) == (5, 5)
    stop = f"{EMPTY_RUN_LIMIT} blank rows in a row; rows below are not read"
    assert stop in result.stderr                                  # told on the terminal
    assert any(stop in note for note in sheet["notes"])           # and in the JSON report


def test_a_far_cell_within_the_blank_run_is_read_with_its_own_row_number(tmp_path, db):
    rows = [["Location", "Marking", "Qty"], ["A1", "104K", 1]]
    path = _workbook(tmp_path / "near.xlsx", rows, far_rows=[(5000, ["Z9", "472", "7"])])
    sheet = _import_json(db, path)
    assert (sheet["rows"], sheet["stored"]) == (2, 2)
    with open_store(db) as store:
        assert store.one("SELECT MAX(row_number) AS n FROM source_rows")["n"] == 5000


def test_a_one_megabyte_cell_is_kept_whole(tmp_path, db):
    note = "spare parts from the old amplifier " * 30_000       # just over 1 MB
    path = write_bin_sheet(tmp_path / "big.csv", [("A1", "104K", 4, note.strip()), ("A2", "472J", 2, "")],
                           headers=("Location", "Marking", "Qty", "Notes"))
    sheet = _import_json(db, path)
    assert (sheet["rows"], sheet["stored"]) == (2, 2)
    with open_store(db) as store:
        stored = store.one("SELECT notes FROM bins WHERE location = 'A1'")["notes"]
        assert stored == note.strip() and len(stored) > 1_000_000
        assert check_store(store).ok


def test_a_one_megabyte_marking_is_quarantined_or_stored_never_a_crash(tmp_path, db):
    path = write_bin_sheet(tmp_path / "big.csv", [("A1", "x" * 1_100_000, 4), ("A2", "472J", 2)])
    sheet = _import_json(db, path)
    assert sheet["rows"] == 2 and sheet["stored"] + sheet["quarantined"] == 2
    with open_store(db) as store:
        raw = store.one("SELECT raw_json FROM source_rows WHERE row_number = 2"
                        " AND import_id = (SELECT MAX(id) FROM imports)")["raw_json"]
        assert len(json.loads(raw)["Marking"]) == 1_100_000     # nothing read is lost


def test_nul_bytes_in_a_csv_are_dropped_and_the_rows_kept(tmp_path, db):
    path = tmp_path / "nul.csv"
    path.write_bytes(b"Loca\x00tion,Marking,Qty\r\nA1,10\x004K,5\r\n\x00A2,472J,\x003\r\n")
    sheet = _import_json(db, path)
    assert (sheet["rows"], sheet["stored"]) == (2, 2)
    with open_store(db) as store:
        got = store.rows("SELECT b.location, p.marking, b.on_hand FROM bins b JOIN parts p"
                         " ON p.bin_id = b.id WHERE b.location IN ('A1', 'A2') ORDER BY b.location")
    assert got == [{"location": "A1", "marking": "104K", "on_hand": 5},
                   {"location": "A2", "marking": "472J", "on_hand": 3}]


def test_mixed_line_endings_give_every_row_its_spreadsheet_row_number(tmp_path, db):
    path = tmp_path / "mixed.csv"
    path.write_bytes(b'Location,Marking,Qty\r\nA1,104K,1\nA2,472J,2\rA3,"1n5\r\nC0G",3\r\nA4,222K,4')
    sheet = _import_json(db, path)
    assert (sheet["rows"], sheet["stored"]) == (4, 4)
    with open_store(db) as store:
        numbers = [r["row_number"] for r in store.rows(
            "SELECT row_number FROM source_rows WHERE import_id = (SELECT MAX(id) FROM imports)"
            " ORDER BY row_number")]
        assert numbers == [2, 3, 4, 5]
        assert store.one("SELECT on_hand FROM bins WHERE location = 'A4'")["on_hand"] == 4


@pytest.mark.parametrize("kind", ["csv", "xlsx"])
def test_a_header_only_file_imports_no_rows_and_changes_no_stock(tmp_path, db, kind):
    if kind == "csv":
        path = write_bin_sheet(tmp_path / "head.csv", [])
    else:
        path = _workbook(tmp_path / "head.xlsx", [["Location", "Marking", "Qty"]])
    before = _counts(db)
    sheet = _import_json(db, path)
    assert (sheet["rows"], sheet["stored"], sheet["quarantined"]) == (0, 0, 0)
    after = _counts(db)
    assert {k: after[k] for k in ("bins", "parts", "ledger")} == \
        {k: before[k] for k in ("bins", "parts", "ledger")}


def test_duplicated_headers_keep_every_cell_of_the_row(tmp_path, db):
    path = write_bin_sheet(tmp_path / "dup.csv", [("A1", "104K", "5", "1n0", "7")],
                           headers=("Location", "Marking", "Qty", "Marking", "Qty"))
    sheet = _import_json(db, path)
    assert sheet["rows"] == 1 and sheet["stored"] + sheet["quarantined"] == 1
    with open_store(db) as store:
        raw = json.loads(store.one("SELECT raw_json FROM source_rows ORDER BY id DESC LIMIT 1")["raw_json"])
        assert sorted(map(str, raw.values())) == sorted(["A1", "104K", "5", "1n0", "7"])
        assert check_store(store).ok


def test_ten_thousand_columns_import_with_every_cell_kept(tmp_path, db):
    width = 10_000
    headers = ("Location", "Marking", "Qty", *[f"Extra {i}" for i in range(4, width + 1)])
    rows = [(f"A{r}", "104K", r, *[f"{r}.{c}" for c in range(4, width + 1)]) for r in range(1, 4)]
    path = write_bin_sheet(tmp_path / "wide.csv", rows, headers=headers)
    sheet = _import_json(db, path)    # how fast: tests/bench (wide sheets), not a timed test
    assert (sheet["rows"], sheet["stored"]) == (3, 3)
    with open_store(db) as store:
        raw = json.loads(store.one("SELECT raw_json FROM source_rows ORDER BY id DESC LIMIT 1")["raw_json"])
        assert len(raw) == width and raw[f"Extra {width}"] == f"3.{width}"


@pytest.mark.parametrize("name", list(BOM_SHEETS))
def test_a_hostile_bom_through_kit_plan_gives_a_plan_or_one_line_never_a_traceback(tmp_path, db, name):
    content, boards = BOM_SHEETS[name]
    path = tmp_path / f"{name}.csv"
    path.write_bytes(content)
    before = _counts(db)
    result = _cli(db, "kit", "plan", str(path), "--boards", str(boards), "--json")
    assert result.exception is None or isinstance(result.exception, SystemExit), repr(result.exception)
    assert "Traceback" not in result.output
    if result.exit_code == 0:
        plan = json.loads(result.stdout)
        assert plan["lines"], "the BOM line must be kept in the plan, readable or not"
    else:
        assert result.exit_code in (1, 2)
        assert result.stderr.strip().splitlines()[-1].startswith("stock: ")
        assert _counts(db) == before
    _counts(db)        # check_store passes either way


def _foreign_db(tmp: Path) -> Path:
    import sqlite3

    p = tmp / "browser-history.sqlite"
    conn = sqlite3.connect(p)
    conn.execute("CREATE TABLE visits (id INTEGER PRIMARY KEY, url TEXT)")
    conn.execute("INSERT INTO visits (url) VALUES ('http://example.invalid')")
    conn.commit()
    conn.close()
    return p


def _csv_as_db(tmp: Path) -> Path:
    return write_bin_sheet(tmp / "bins.csv", [("A1", "104K", 5)])


def _cut_db(tmp: Path) -> Path:
    whole = tmp / "whole.db"
    with open_store(whole) as store:
        import_file(store, write_bin_sheet(tmp / "w.csv", [(f"A{i}", "104K", i) for i in range(300)]))
    p = tmp / "cut.db"
    p.write_bytes(whole.read_bytes()[:8192])
    return p


# --db given a file that is not a stock database: one line, exit 1, and the file untouched
# (SQLite file format, sqlite.org "Database File Format": the 16-byte header and page layout).
@pytest.mark.parametrize("make, words", [
    pytest.param(_foreign_db, "this is another program's SQLite database (tables visits)", id="other-programs-database"),
    pytest.param(_csv_as_db, "this file is not a stock database (or it is damaged)", id="a-csv-given-as-db"),
    pytest.param(_cut_db, "this file is not a stock database (or it is damaged)", id="a-database-cut-short"),
])
@pytest.mark.parametrize("command", ["bins", "import", "check"])
def test_a_file_that_is_not_a_stock_database_is_refused_and_left_untouched(tmp_path, make, words, command):
    target = make(tmp_path)
    before = target.read_bytes()
    args = {"bins": ["bins"], "check": ["check"],
            "import": ["import", str(write_bin_sheet(tmp_path / "new.csv", [("N1", "472J", 2)]))]}[command]
    result = _cli(target, *args)
    assert result.exit_code == 1, result.output
    (line,) = result.stderr.strip().splitlines()
    assert line.startswith(f"stock: {target}: {words}")
    assert target.read_bytes() == before


@pytest.fixture
def count_sheet(tmp_path, db) -> Path:
    from stock.sheets_out.count_sheet import export_count_sheet

    out = tmp_path / "count.xlsx"
    with open_store(db) as store:
        export_count_sheet(store, out)
    return out


def _fill_counted(sheet: Path, value, out: Path) -> Path:
    from openpyxl import load_workbook

    wb = load_workbook(sheet)
    wb["Stock take"]["G2"] = value
    wb.save(out)
    return out


# A filled-in stock-take sheet is a file the user edited: a bad "Counted" cell refuses the whole
# sheet naming row 2 and column 'Counted', and nothing is recorded.
@pytest.mark.parametrize("name", list(COUNT_CELLS))
def test_a_hostile_counted_cell_refuses_the_count_sheet_and_records_nothing(tmp_path, db, count_sheet, name):
    from stock.inventory.stocktake import apply_count_sheet

    filled = _fill_counted(count_sheet, COUNT_CELLS[name], tmp_path / "filled.xlsx")
    before = _counts(db)
    with open_store(db) as store, pytest.raises(BadSheet) as err:
        apply_count_sheet(store, filled)
    text = str(err.value)
    assert "sheet 'Stock take', row 2, column 'Counted': cannot read" in text
    assert _counts(db) == before


@pytest.mark.parametrize("make, words", [
    pytest.param(_junk_xlsx, "is not a readable stock-take workbook", id="junk"),
    pytest.param(_junk_csv, "is not a readable stock-take workbook", id="csv"),
    pytest.param(lambda t: _workbook(t / "other.xlsx", [["Location", "Marking", "Qty"]]),
                 "has no sheet 'Stock take'", id="another-workbook"),
])
def test_a_file_that_is_not_a_count_sheet_is_refused_in_one_line(tmp_path, db, make, words):
    from stock.inventory.stocktake import apply_count_sheet

    path = make(tmp_path)
    before = _counts(db)
    with open_store(db) as store, pytest.raises(BadSheet) as err:
        apply_count_sheet(store, path)
    assert words in str(err.value) and "\n" not in str(err.value)
    assert _counts(db) == before


@pytest.mark.parametrize("args", CLI_ARGS, ids=["-".join(a)[:40] for a in CLI_ARGS])
def test_a_hostile_command_line_value_gives_one_line_never_a_traceback(db, args):
    before = _counts(db)
    result = _cli(db, *args)
    assert result.exception is None or isinstance(result.exception, SystemExit), repr(result.exception)
    assert result.exit_code in (1, 2), result.output
    assert "Traceback" not in result.output
    if result.exit_code == 1:
        (line,) = result.stderr.strip().splitlines()
        assert line.startswith("stock: ")
    assert _counts(db) == before


def test_odd_locations_sort_in_the_count_sheet_and_the_pick_list(tmp_path, db):
    from stock.kitting.planner import KitOptions, plan_kit
    from stock.kitting.pick_list import pick_list
    from stock.sheets_out.pick_sheet import write_pick_list_xlsx
    from stock.sheets_out.count_sheet import export_count_sheet
    from tests.helpers_procs import write_bom

    rows = [(loc, "104K", 3) for loc in LOCATIONS if loc.strip()]
    path = write_bin_sheet(tmp_path / "odd.csv", rows, headers=("Location", "Marking", "Qty"))
    with open_store(db) as store:
        (sheet,) = import_file(store, path).sheets
        assert sheet.stored == len(rows)
        assert export_count_sheet(store, tmp_path / "count.xlsx") == 3 + len(rows)
        plan = plan_kit(store, write_bom(tmp_path / "bom.csv"), KitOptions(boards=3 * len(rows) + 10))
        assert write_pick_list_xlsx(pick_list(store, plan.id), tmp_path / "pick.xlsx") >= len(rows)
