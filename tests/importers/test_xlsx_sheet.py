"""Reading XLSX workbooks: every sheet, the header found, merges, types, hostile workbooks.

Sources: the workbook parts (``[Content_Types].xml``, ``xl/workbook.xml``, ``<dimension>``,
``<mergeCell ref=...>``) per ECMA-376 Office Open XML, Part 1; openpyxl read-only behaviour per
shared/reference/libraries.md §A3 (no merged cells, ragged rows in unsized sheets, integral
numbers as int); the OLE2 compound-file signature D0 CF 11 E0 A1 B1 1A E1 per Microsoft's
[MS-CFB] specification (encrypted OOXML and old .xls live in such files). Header aliases: common
practice in shop sheets, no published source. The workbooks are our invented workshop's.
"""

from __future__ import annotations

import datetime as dt
import io
import re
import zipfile

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from openpyxl import Workbook

from importers import xlsx_sheet
from importers.raw_sheet import RawRow
from importers.sheet import read_sheets
from stock.errors import BadSheet


def save(wb: Workbook, tmp_path, name: str = "bins.xlsx"):
    path = tmp_path / name
    wb.save(path)
    return path


def rewrite_part(path, part: str, change) -> None:
    """Edit one XML part of a saved workbook (to fake what other writers produce)."""
    with zipfile.ZipFile(path) as src:
        items = [(info, src.read(info.filename)) for info in src.infolist()]
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as dst:
        for info, data in items:
            dst.writestr(info.filename, change(data) if info.filename == part else data)


def simple_book(*sheets: tuple[str, list[list]]) -> Workbook:
    wb = Workbook()
    wb.remove(wb.active)
    for title, rows in sheets:
        ws = wb.create_sheet(title)
        for row in rows:
            ws.append(row)
    return wb


DRAWERS = ("Drawers", [["Bin", "Marking", "Qty"], ["A1", "104", 20], ["A2", "4n7", 5]])
SPARES = ("Spares", [["Drawer", "Cap.", "Qty on hand"], ["S1", "220p", 3]])


def test_every_sheet_is_read_in_workbook_order(tmp_path):
    path = save(simple_book(DRAWERS, SPARES), tmp_path)
    sheets = read_sheets(path)
    assert [(s.sheet, s.headers) for s in sheets] == [("Drawers", ("Bin", "Marking", "Qty")),
                                                      ("Spares", ("Drawer", "Cap.", "Qty on hand"))]
    assert [list(s.rows) for s in sheets] == [
        [RawRow(2, ("A1", "104", 20)), RawRow(3, ("A2", "4n7", 5))],
        [RawRow(2, ("S1", "220p", 3))],
    ]


def test_sheets_can_be_read_in_any_order_after_opening(tmp_path):
    path = save(simple_book(DRAWERS, SPARES), tmp_path)
    first, second = read_sheets(path)
    assert [r.number for r in second.rows] == [2]
    assert [r.number for r in first.rows] == [2, 3]


def test_one_sheet_is_read_when_named(tmp_path):
    path = save(simple_book(DRAWERS, SPARES), tmp_path)
    (sheet,) = read_sheets(path, sheet="Spares")
    assert sheet.sheet == "Spares"


@pytest.mark.parametrize(("wanted", "hint"), [
    pytest.param("Bins", "one of 'Drawers', 'Spares'", id="unknown-lists-sheets"),
    pytest.param("drawers", "sheet 'Drawers'", id="wrong-case-suggests-the-sheet"),
])
def test_an_unknown_sheet_is_refused_with_the_sheet_names(tmp_path, wanted, hint):
    path = save(simple_book(DRAWERS, SPARES), tmp_path)
    with pytest.raises(BadSheet) as caught:
        read_sheets(path, sheet=wanted)
    assert str(caught.value) == f"{path}: has no sheet {wanted!r} (expected {hint})"


def test_empty_sheets_are_passed_over_but_an_empty_named_sheet_is_refused(tmp_path):
    path = save(simple_book(DRAWERS, ("Blank", [])), tmp_path)
    assert [s.sheet for s in read_sheets(path)] == ["Drawers"]
    with pytest.raises(BadSheet) as caught:
        read_sheets(path, sheet="Blank")
    assert str(caught.value) == (f"{path}, sheet 'Blank': is empty "
                                 "(expected a header row naming the columns, then one row per bin)")


def test_a_workbook_with_nothing_in_it_is_refused(tmp_path):
    path = save(Workbook(), tmp_path)
    with pytest.raises(BadSheet) as caught:
        read_sheets(path)
    assert str(caught.value) == f"{path}: has no sheet with anything in it (expected a header row, then one row per bin)"


def test_the_header_is_found_below_title_and_blank_rows(tmp_path):
    rows = [["Kingsbridge Radio — capacitor drawers"], ["counted 2026-11-28"], [], [],
            ["Bin #", "Marking/Code", "WV", "Tol", "Qty on hand"], ["A1", "104", 50, "K", 20]]
    sheet = read_sheets(save(simple_book(("Bins", rows)), tmp_path))[0]
    assert sheet.header_row == 5
    assert sheet.headers == ("Bin #", "Marking/Code", "WV", "Tol", "Qty on hand")
    assert [r.number for r in sheet.skipped_above] == [1, 2]
    assert list(sheet.rows) == [RawRow(6, ("A1", "104", 50, "K", 20))]


def test_a_header_merged_over_two_rows_is_named_from_the_merge(tmp_path):
    # ECMA-376: a merge's value lives in its top-left cell; openpyxl read-only cannot see merges.
    wb = Workbook()
    ws = wb.active
    ws.title = "Bins"
    ws["A1"] = "Kingsbridge Radio"
    ws.merge_cells("A1:E1")
    ws["A3"] = "Bin #"
    ws.merge_cells("A3:A4")
    ws["B3"] = "Capacitor"
    ws.merge_cells("B3:D3")
    ws["E3"] = "Qty on hand"
    ws.merge_cells("E3:E4")
    for col, text in zip("BCD", ("Cap.", "WV", "Tol")):
        ws[f"{col}4"] = text
    ws.append(["A1", 104, 50, "K", 20])
    ws["A6"] = "A2 and A3"
    ws.merge_cells("A6:A7")
    ws["B6"], ws["B7"] = "4n7", "10n"
    sheet = read_sheets(save(wb, tmp_path))[0]
    assert sheet.header_row == 4
    assert sheet.headers == ("Bin #", "Cap.", "WV", "Tol", "Qty on hand")
    assert set(sheet.merged) == {"A1:E1", "A3:A4", "B3:D3", "E3:E4", "A6:A7"}
    # data cells under a merge are left as read; the merge is listed for the importer
    assert list(sheet.rows) == [RawRow(5, ("A1", 104, 50, "K", 20)),
                                RawRow(6, ("A2 and A3", "4n7", None, None, None)),
                                RawRow(7, (None, "10n", None, None, None))]


def test_a_header_merged_across_columns_names_each_column(tmp_path):
    wb = Workbook()
    ws = wb.active
    ws.append(["Bin", "Value", None, "Qty"])
    ws.merge_cells("B1:C1")
    ws.append(["A1", 4.7, "nF", 10])
    sheet = read_sheets(save(wb, tmp_path))[0]
    assert sheet.headers == ("Bin", "Value", "Value (2)", "Qty")
    assert list(sheet.rows) == [RawRow(2, ("A1", 4.7, "nF", 10))]


def test_blank_rows_are_skipped_and_row_numbers_are_the_sheets(tmp_path):
    wb = simple_book(("Bins", [["Bin", "Marking"], ["A1", "104"], [], [None, "  "], ["A2", "4n7"]]))
    sheet = read_sheets(save(wb, tmp_path))[0]
    assert [(r.number, r.cells) for r in sheet.rows] == [(2, ("A1", "104")), (5, ("A2", "4n7"))]


def test_trailing_empty_columns_are_dropped_and_extra_cells_kept(tmp_path):
    wb = Workbook()
    ws = wb.active
    ws.append(["Bin", "Marking", None, None])
    ws.cell(row=1, column=9).number_format = "0.00"   # a formatted, empty cell far to the right
    ws.append(["A1", "104", None, None, None, "spare box"])
    sheet = read_sheets(save(wb, tmp_path))[0]
    assert sheet.headers == ("Bin", "Marking")
    assert list(sheet.rows) == [RawRow(2, ("A1", "104"), (("column 6", "spare box"),))]


def test_cell_types_pass_through_as_stored(tmp_path):
    # libraries.md §A3: openpyxl returns int for integral numbers, float otherwise, datetime for dates.
    wb = simple_book(("Bins", [["Bin", "Marking", "Value", "Qty", "Date code"],
                               ["A1", 104, "0.1", 20.0, dt.datetime(1987, 3, 1)],
                               ["A2", "104", 0.1, "20", "8703"],
                               ["A3", True, "=1+1", None, None]]))
    sheet = read_sheets(save(wb, tmp_path))[0]
    rows = list(sheet.rows)
    assert rows[0].cells == ("A1", 104, "0.1", 20, dt.datetime(1987, 3, 1))
    assert type(rows[0].cells[3]) is int
    assert rows[1].cells == ("A2", "104", 0.1, "20", "8703")
    # a formula with no cached value (written by a script) reads as blank (data_only)
    assert rows[2].cells == ("A3", True, None, None, None)


def test_an_integral_float_in_the_xml_becomes_an_int(tmp_path):
    path = save(simple_book(("Bins", [["Bin", "Qty"], ["A1", 7]])), tmp_path)
    rewrite_part(path, "xl/worksheets/sheet1.xml", lambda xml: xml.replace(b"<v>7</v>", b"<v>7.0</v>"))
    rows = list(read_sheets(path)[0].rows)
    assert rows == [RawRow(2, ("A1", 7))]
    assert type(rows[0].cells[1]) is int


def test_a_sheet_claiming_a_million_rows_reads_only_its_rows(tmp_path):
    # ECMA-376 <dimension ref="A1:H1000000"/>: a claim, not a promise; we ignore it.
    path = save(simple_book(("Bins", [["Bin", "Marking"], ["A1", "104"], ["A2", "4n7"]])), tmp_path)
    rewrite_part(path, "xl/worksheets/sheet1.xml",
                 lambda xml: re.sub(rb'<dimension ref="[^"]*"\s*/>', b'<dimension ref="A1:H1000000"/>', xml))
    sheet = read_sheets(path)[0]
    assert sheet.headers == ("Bin", "Marking")
    assert [r.number for r in sheet.rows] == [2, 3]
    assert sheet.notes == []


def test_reading_stops_after_a_long_run_of_blank_rows_and_says_so(tmp_path, monkeypatch):
    monkeypatch.setattr(xlsx_sheet, "EMPTY_RUN_LIMIT", 50)
    wb = simple_book(("Bins", [["Bin", "Marking"], ["A1", "104"]]))
    ws = wb["Bins"]
    ws["A40"] = "A40"           # 37 blank rows before it: still read
    for row in range(41, 200):
        ws.cell(row=row, column=1).number_format = "0.0"   # formatted but blank, as sheets often are
    ws["A300"] = "far below"
    sheet = read_sheets(save(wb, tmp_path))[0]
    assert [r.number for r in sheet.rows] == [2, 40]
    assert sheet.notes == ["stopped reading sheet 'Bins' at row 90: 50 blank rows in a row; rows below are not read"]


def test_hidden_sheets_are_read_and_marked(tmp_path):
    wb = simple_book(DRAWERS, SPARES)
    wb["Spares"].sheet_state = "hidden"
    sheets = read_sheets(save(wb, tmp_path))
    assert [(s.sheet, s.hidden) for s in sheets] == [("Drawers", False), ("Spares", True)]


def test_an_xlsm_workbook_is_read(tmp_path):
    path = save(simple_book(DRAWERS), tmp_path, name="bins.xlsm")
    assert read_sheets(path)[0].headers == ("Bin", "Marking", "Qty")


def zip_bytes(members: dict[str, bytes]) -> bytes:
    buffer = io.BytesIO()
    with zipfile.ZipFile(buffer, "w") as archive:
        for name, data in members.items():
            archive.writestr(name, data)
    return buffer.getvalue()


# Workbooks that are not what they claim; ECMA-376 part names, [MS-CFB] signature, ODF "mimetype".
HOSTILE = [
    pytest.param(zip_bytes({"readme.txt": b"hello"}),
                 "is a zip archive but not an XLSX workbook (it has no xl/workbook.xml) "
                 "(expected a workbook saved as .xlsx)", id="zip-that-is-not-a-workbook"),
    pytest.param(zip_bytes({"mimetype": b"application/vnd.oasis.opendocument.spreadsheet", "content.xml": b"<x/>"}),
                 "is an OpenDocument spreadsheet, not an XLSX workbook (expected the sheet saved as .xlsx or .csv)",
                 id="opendocument-renamed"),
    pytest.param(b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + bytes(504),
                 "is a password-protected (encrypted) workbook or an old .xls file "
                 "(expected an unencrypted .xlsx, or the sheet saved as .csv)", id="encrypted-ole2"),
    pytest.param(b"Bin,Marking\nA1,104\n",
                 "is not an XLSX workbook (a .xlsx file is a zip archive; this one is not) "
                 "(expected a workbook saved as .xlsx, or rename a text sheet to .csv)", id="csv-named-xlsx"),
    pytest.param(bytes(range(256)) * 8,
                 "is not an XLSX workbook (a .xlsx file is a zip archive; this one is not) "
                 "(expected a workbook saved as .xlsx, or rename a text sheet to .csv)", id="binary-junk"),
    pytest.param(b"",
                 "is not an XLSX workbook (a .xlsx file is a zip archive; this one is not) "
                 "(expected a workbook saved as .xlsx, or rename a text sheet to .csv)", id="empty-file"),
]


@pytest.mark.parametrize(("data", "message"), HOSTILE)
def test_files_that_are_not_workbooks_are_refused_in_one_line(tmp_path, data, message):
    path = tmp_path / "bins.xlsx"
    path.write_bytes(data)
    with pytest.raises(BadSheet) as caught:
        read_sheets(path)
    assert str(caught.value) == f"{path}: {message}"


def test_a_truncated_workbook_is_refused_as_damaged(tmp_path):
    path = save(simple_book(DRAWERS), tmp_path)
    path.write_bytes(path.read_bytes()[:300])
    with pytest.raises(BadSheet) as caught:
        read_sheets(path)
    assert str(caught.value).startswith(f"{path}: is a damaged workbook (the zip archive is corrupt: ")
    assert "\n" not in str(caught.value)


def test_broken_sheet_xml_is_refused_as_damaged_naming_the_sheet(tmp_path):
    path = save(simple_book(DRAWERS), tmp_path)
    rewrite_part(path, "xl/worksheets/sheet1.xml",
                 lambda xml: xml.replace(b"</sheetData>", b"<row r='9'><c r='A9'><v>1</v></row></sheetData>"))
    with pytest.raises(BadSheet) as caught:
        for sheet in read_sheets(path):
            list(sheet.rows)
    message = str(caught.value)
    assert message.startswith(f"{path}, sheet 'Drawers'")
    assert "is a damaged workbook" in message


def test_an_encrypted_package_inside_a_zip_is_named(tmp_path):
    path = tmp_path / "locked.xlsx"
    path.write_bytes(zip_bytes({"EncryptionInfo": b"\x04\x00", "EncryptedPackage": b"\x00" * 16}))
    with pytest.raises(BadSheet, match="is a password-protected \\(encrypted\\) workbook"):
        read_sheets(path)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(st.data())
def test_a_damaged_workbook_gives_rows_or_a_bad_sheet_never_a_crash(tmp_path, data):
    # fuzzing (common practice): flip bytes of a real workbook; a result or a clear error, never a traceback
    original = tmp_path / "good.xlsx"
    if not original.exists():
        simple_book(DRAWERS, SPARES).save(original)
    raw = bytearray(original.read_bytes())
    for _ in range(data.draw(st.integers(1, 8))):
        raw[data.draw(st.integers(0, len(raw) - 1))] = data.draw(st.integers(0, 255))
    path = tmp_path / "damaged.xlsx"
    path.write_bytes(bytes(raw))
    try:
        for sheet in read_sheets(path):
            for row in sheet.rows:
                assert len(row.cells) == len(sheet.headers)
    except BadSheet as exc:
        assert str(exc).startswith(str(path))
