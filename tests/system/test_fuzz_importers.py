"""The sheet readers and the whole import take any bytes: rows, or one clear error; never a traceback.

Sources: hostile inputs (random bytes, damaged zip archives, broken quoting, mixed encodings) are
common practice in fuzzing, no published source. The XLSX layout the damaged workbooks start
from is ECMA-376 / ISO/IEC 29500 (Office Open XML) as written by openpyxl. SQLite's
``PRAGMA integrity_check`` (sqlite.org) and this project's ``stock check`` judge the store after
each import: every row accounted for, on-hand equal to the ledger.
"""

from __future__ import annotations

import datetime as dt
import io
import itertools
import shutil
import zipfile

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from importers.raw_sheet import RawSheet
from importers.sheet import read_sheets
from stock.store.integrity import check_store
from stock.errors import BadSheet, StockError
from stock.inventory.intake import import_file
from stock.kitting.planner import KitOptions, plan_kit
from stock.store.database import open_store
from tests.helpers_procs import scaled, table_counts
from tests.regression_inputs import BOM_SHEETS, CSV_SHEETS

SUITABLE = [HealthCheck.too_slow, HealthCheck.function_scoped_fixture, HealthCheck.data_too_large]
_counter = itertools.count()


def _consume(path) -> list[RawSheet] | BadSheet:
    """Read every sheet and every row; return the sheets, or the BadSheet raised."""
    try:
        sheets = read_sheets(path)
        for s in sheets:
            assert isinstance(s, RawSheet)
            assert all(isinstance(h, str) and h for h in s.headers)
            for row in s.rows:
                assert len(row.cells) == len(s.headers)
                assert row.number > s.header_row
        return sheets
    except BadSheet as exc:
        text = str(exc)
        assert "\n" not in text and text.startswith(str(path)), text
        return exc


@pytest.mark.parametrize("ext", [".csv", ".xlsx", ".tsv", ".txt"])
@settings(max_examples=100, deadline=None, suppress_health_check=SUITABLE)
@given(data=st.binary(max_size=4096))
def test_any_bytes_read_as_sheets_or_one_bad_sheet_error(tmp_path, ext, data):
    path = tmp_path / f"junk{next(_counter)}{ext}"
    path.write_bytes(data)
    _consume(path)


def _workbook_bytes() -> bytes:
    from openpyxl import Workbook

    wb = Workbook()
    ws = wb.active
    ws.title = "Cabinet 1"
    ws.append(["Location", "Marking", "Qty"])
    for i in range(12):
        ws.append([f"A{i}", "104K", i])
    buf = io.BytesIO()
    wb.save(buf)
    return buf.getvalue()


WORKBOOK = _workbook_bytes()
with zipfile.ZipFile(io.BytesIO(WORKBOOK)) as _z:
    MEMBERS = {n: _z.read(n) for n in _z.namelist()}


@settings(max_examples=100, deadline=None, suppress_health_check=SUITABLE)
@given(flips=st.lists(st.tuples(st.integers(0, len(WORKBOOK) - 1), st.integers(0, 255)),
                      min_size=1, max_size=30))
def test_a_workbook_with_damaged_bytes_reads_or_says_it_is_damaged(tmp_path, flips):
    data = bytearray(WORKBOOK)
    for pos, value in flips:
        data[pos] = value
    path = tmp_path / f"flipped{next(_counter)}.xlsx"
    path.write_bytes(bytes(data))
    _consume(path)


XML_NOISE = [b"<", b">", b"&", b'"', b"\x00", b"<c r=\"XFD1048576\"><v>1</v></c>",
             b"<dimension ref=\"A1:ZZ1000000\"/>", b"<row r=\"99999999\">", b"</row>",
             b"<c r=\"A1\" t=\"s\"><v>99999</v></c>", b"<c t=\"e\"><v>#REF!</v></c>",
             b"<c t=\"d\"><v>not-a-date</v></c>", b"<c t=\"n\"><v>1e400</v></c>", b"]]>",
             b"<!DOCTYPE x [<!ENTITY a \"aaaaaaaaaa\">]>", b"&a;"]


@settings(max_examples=100, deadline=None, suppress_health_check=SUITABLE)
@given(data=st.data())
def test_a_workbook_with_damaged_xml_parts_reads_or_says_it_is_damaged(tmp_path, data):
    names = sorted(MEMBERS)
    victims = data.draw(st.sets(st.sampled_from(names), min_size=1, max_size=3))
    dropped = data.draw(st.sets(st.sampled_from(names), max_size=1))
    buf = io.BytesIO()
    with zipfile.ZipFile(buf, "w") as z:
        for name in names:
            if name in dropped:
                continue
            body = bytearray(MEMBERS[name])
            if name in victims:
                for _ in range(data.draw(st.integers(1, 6))):
                    pos = data.draw(st.integers(0, len(body)))
                    cut = data.draw(st.integers(0, 20))
                    body[pos:pos + cut] = data.draw(st.sampled_from(XML_NOISE))
            z.writestr(name, bytes(body))
    path = tmp_path / f"damaged{next(_counter)}.xlsx"
    path.write_bytes(buf.getvalue())
    _consume(path)


# A vocabulary of headers (real aliases, near misses, junk) and cells (codes, numbers at the
# edges of SQLite's INTEGER, formula prefixes, SQL fragments, control characters).
HEADERS = ["Location", "Bin", "Marking", "Value", "Qty", "Quantity", "Label", "Cabinet", "Notes",
           "Tolerance", "Voltage", "Minimum", "Colours", "Dielectric", "Package", "Date code",
           "qty", "Qty", "", "x", "Mark\x00ing", "=Qty", "Wert", "Value (pF)"]
CELLS = ["104", "4n7", "472J", "100pF", "2u2 50V", "brown black red", "X7R", "10%", "63V",
         "", " ", "0", "-3", "2.5", "1e9", "lots", "NaN", "inf", "-0", "+5", "1,000", "A1", "a1 ",
         "9223372036854775807", "9223372036854775808", "99999999999999999999", "١٢", "²",
         "=1+1", "@SUM(A1)", "'); DROP TABLE bins;--", "1 OR 1=1", "\x00", "\x1a", "\t",
         "µF", "\u202e", "x" * 300]
cell = st.sampled_from(CELLS) | st.text(max_size=12)


@st.composite
def csv_files(draw) -> bytes:
    delimiter = draw(st.sampled_from([",", ";", "\t", "|"]))
    newline = draw(st.sampled_from(["\n", "\r\n", "\r"]))
    headers = draw(st.lists(st.sampled_from(HEADERS), min_size=1, max_size=7))
    lines = [delimiter.join(headers)]
    for _ in range(draw(st.integers(0, 25))):
        cells = draw(st.lists(cell, max_size=len(headers) + 2))
        quoted = [f'"{c}"' if draw(st.booleans()) and '"' not in c else c for c in cells]
        lines.append(delimiter.join(quoted))
    if draw(st.booleans()):
        lines.insert(draw(st.integers(0, len(lines))), draw(st.sampled_from(['"open quote', '""', "\x00\x00"])))
    text = newline.join(lines) + draw(st.sampled_from(["", newline]))
    encoding = draw(st.sampled_from(["utf-8", "utf-8-sig", "utf-16", "cp1252"]))
    return text.encode(encoding, errors="replace")


def _import_and_judge(store, path) -> None:
    before = table_counts(store)
    try:
        report = import_file(store, path)
    except StockError as exc:
        assert "\n" not in str(exc)
        assert table_counts(store) == before, "a refused import changed the store"
    else:
        added = table_counts(store)["source_rows"] - before["source_rows"]
        fresh = [s for s in report.sheets if not s.same_file]
        for s in fresh:
            assert s.stored + s.unchanged + s.quarantined == s.rows, s
        assert added == sum(s.rows for s in fresh), "a row read was not accounted for"
    report = check_store(store)
    assert report.ok, report.problems


@pytest.fixture(scope="module")
def empty_db(tmp_path_factory):
    """A migrated, empty database file to copy: opening a new one per example costs too much."""
    path = tmp_path_factory.mktemp("template") / "empty.db"
    open_store(path).close()
    return path


def _fresh_store(empty_db, folder):
    shutil.copyfile(empty_db, folder / "stock.db")
    return open_store(folder / "stock.db")


@settings(max_examples=80, deadline=None, suppress_health_check=SUITABLE)
@given(content=csv_files())
def test_importing_random_csv_gives_a_report_or_a_clear_error_and_a_sound_store(
        tmp_path_factory, empty_db, content):
    folder = tmp_path_factory.mktemp("imports", numbered=True)
    with _fresh_store(empty_db, folder) as store:
        path = folder / "bins.csv"
        path.write_bytes(content)
        _import_and_judge(store, path)


# Typed workbook cells: what a spreadsheet program stores (numbers past 2**63, dates in a count
# column, booleans, text longer than a cell should be) rather than text.
XLSX_CELLS = st.one_of(
    st.none(), st.booleans(), st.integers(-2**70, 2**70),
    st.floats(allow_nan=False, allow_infinity=False),
    st.datetimes(min_value=dt.datetime(1900, 3, 1), max_value=dt.datetime(2100, 1, 1)),
    st.dates(min_value=dt.date(1900, 3, 1)), st.sampled_from(CELLS), st.text(max_size=20))
XLSX_HEADERS = st.lists(st.sampled_from(HEADERS[:17]) | st.integers(0, 999) | st.none(), min_size=1, max_size=6)


@settings(max_examples=40, deadline=None, suppress_health_check=SUITABLE)
@given(headers=XLSX_HEADERS, rows=st.lists(st.lists(XLSX_CELLS, max_size=8), max_size=12),
       title=st.sampled_from(["Sheet", "Cabinet 1", "'quoted'", "x" * 31, "=A1"]))
def test_importing_a_random_workbook_gives_a_report_or_a_clear_error_and_a_sound_store(
        tmp_path_factory, empty_db, headers, rows, title):
    from openpyxl import Workbook

    folder = tmp_path_factory.mktemp("books", numbered=True)
    wb = Workbook()
    ws = wb.active
    ws.title = title
    ws.append(headers)
    for r in rows:
        ws.append([_cell_for_openpyxl(c) for c in r])
    path = folder / "bins.xlsx"
    wb.save(path)
    with _fresh_store(empty_db, folder) as store:
        _import_and_judge(store, path)


def _cell_for_openpyxl(value):
    # openpyxl refuses control characters in text; a sheet program would never have stored them
    if isinstance(value, str):
        from openpyxl.cell.cell import ILLEGAL_CHARACTERS_RE
        return ILLEGAL_CHARACTERS_RE.sub("", value)
    return value


@pytest.mark.parametrize("name", list(CSV_SHEETS))
def test_every_kept_regression_sheet_imports_cleanly(tmp_path, name):
    path = tmp_path / f"{name}.csv"
    path.write_bytes(CSV_SHEETS[name])
    with open_store(tmp_path / "stock.db") as store:
        _import_and_judge(store, path)


# Quantity past SQLite's 64-bit INTEGER (found by the fuzzer above): the row is quarantined as a
# bad quantity, the rest stored. 2**63 - 1 is SQLite's largest INTEGER (sqlite.org, "Datatypes").
def test_a_count_too_large_for_the_database_quarantines_only_that_row(tmp_path):
    path = tmp_path / "bins.csv"
    path.write_bytes(CSV_SHEETS["quantity-past-64-bits"])
    with open_store(tmp_path / "stock.db") as store:
        (sheet,) = import_file(store, path).sheets
        assert (sheet.rows, sheet.stored, sheet.quarantined) == (2, 1, 1)
        row = store.one("SELECT reasons_json FROM source_rows WHERE status = 'quarantined'")
        assert "bad-quantity" in row["reasons_json"]
        assert "99999999999999999999" in row["reasons_json"]
        assert check_store(store).ok


def test_a_minimum_too_large_for_the_database_keeps_the_row_with_no_minimum(tmp_path):
    path = tmp_path / "bins.csv"
    path.write_bytes(CSV_SHEETS["minimum-past-64-bits"])
    with open_store(tmp_path / "stock.db") as store:
        (sheet,) = import_file(store, path).sheets
        assert (sheet.rows, sheet.stored) == (1, 1)
        assert store.one("SELECT minimum, on_hand FROM bins") == {"minimum": None, "on_hand": 5}
        raw = store.one("SELECT raw_json FROM source_rows")["raw_json"]
        assert "99999999999999999999" in raw


@pytest.mark.slow
@settings(max_examples=scaled(10), deadline=None, suppress_health_check=SUITABLE)
@given(contents=st.lists(csv_files(), min_size=2, max_size=6))
def test_many_random_imports_into_one_store_keep_it_sound(tmp_path_factory, empty_db, contents):
    folder = tmp_path_factory.mktemp("many", numbered=True)
    with _fresh_store(empty_db, folder) as store:
        for i, content in enumerate(contents):
            path = folder / f"sheet{i % 3}.csv"       # same names again: re-imports of edits
            path.write_bytes(content)
            _import_and_judge(store, path)


# BOMs are the other sheet a user imports (`stock kit plan BOM`): any BOM gives a plan (with its
# unreadable lines kept as problems) or a StockError, and the store stays sound.
BOM_HEADERS = ["Refs", "Designator", "Qty", "Quantity", "Value", "Tolerance", "Voltage",
               "Dielectric", "Application", "Notes", "Kind", "Footprint", "", "Refs"]
BOM_CELLS = ["C1", "C1-C4", "C1-C99999", "R1", "CX1", "C1,C2, C3", "-1", "0", "1e9", "inf", "NaN",
             "99999999999999999999", "2.5", "lots", "", "100n", "104", "4n7", "1e-28p", "X2",
             "mains", "tuned", "10%", "±5 %", "50V", "C0G", "N750", "X7R", "=1+1", "0±30",
             "'); DROP TABLE plans;--", "\x00", "2u2", "tantalum", "polarised", "1000000"]
SHELF = b"Location,Marking,Qty\n" + b"".join(
    f"S{i},{m},{20 + i}\n".encode() for i, m in enumerate(
        ["104K", "4n7 C0G", "2u2 50V", "X2 275VAC 104K", "100uF 25V", "10pF", "1n0 J", "47n"]))


@pytest.fixture(scope="module")
def shelf_db(tmp_path_factory):
    """A database holding a few bins of common parts, to copy for each plan."""
    folder = tmp_path_factory.mktemp("shelf")
    (folder / "shelf.csv").write_bytes(SHELF)
    with open_store(folder / "shelf.db") as store:
        import_file(store, folder / "shelf.csv")
    return folder / "shelf.db"


def _plan_and_judge(store, path, boards: int) -> None:
    before = table_counts(store)
    try:
        plan_kit(store, path, KitOptions(boards=boards))
    except StockError as exc:
        assert "\n" not in str(exc)
        assert table_counts(store) == before, "a refused plan changed the store"
    report = check_store(store)
    assert report.ok, report.problems


@st.composite
def bom_files(draw) -> bytes:
    headers = draw(st.lists(st.sampled_from(BOM_HEADERS), min_size=1, max_size=6))
    out = io.StringIO()
    import csv
    w = csv.writer(out)
    w.writerow(headers)
    for _ in range(draw(st.integers(0, 10))):
        w.writerow(draw(st.lists(st.sampled_from(BOM_CELLS) | st.text(max_size=8),
                                 max_size=len(headers) + 1)))
    return out.getvalue().encode("utf-8", errors="replace")


@settings(max_examples=60, deadline=None, suppress_health_check=SUITABLE)
@given(content=bom_files(), boards=st.sampled_from([1, 3, 100]))
def test_planning_a_random_bom_gives_a_plan_or_a_clear_error_and_a_sound_store(
        tmp_path_factory, shelf_db, content, boards):
    folder = tmp_path_factory.mktemp("boms", numbered=True)
    shutil.copyfile(shelf_db, folder / "stock.db")
    path = folder / "bom.csv"
    path.write_bytes(content)
    with open_store(folder / "stock.db") as store:
        _plan_and_judge(store, path, boards)


@pytest.mark.parametrize("name", list(BOM_SHEETS))
def test_every_kept_regression_bom_plans_cleanly(tmp_path, shelf_db, name):
    content, boards = BOM_SHEETS[name]
    shutil.copyfile(shelf_db, tmp_path / "stock.db")
    path = tmp_path / f"{name}.csv"
    path.write_bytes(content)
    with open_store(tmp_path / "stock.db") as store:
        try:
            KitOptions(boards=boards)
        except StockError as exc:           # a refused board count is a clear error too
            assert "--boards" in str(exc)
            return
        _plan_and_judge(store, path, boards)
