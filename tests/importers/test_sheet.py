"""The shared sheet shape and the dispatcher: extensions, magic bytes, header search, alignment.

Sources: file signatures per their specifications — zip local-file header "PK\\x03\\x04" (PKWARE
APPNOTE.TXT §4.3.7), OLE2 compound file D0 CF 11 E0 A1 B1 1A E1 ([MS-CFB] §2.2); header aliases:
common practice in shop sheets, no published source. Sheets are our invented workshop's.
"""

from __future__ import annotations

import dataclasses
import datetime as dt
import io
import zipfile

import pytest
from openpyxl import Workbook

from importers.raw_sheet import RawRow, RawSheet, clean_cell, make_headers, shape_sheet
from importers.sheet import read_sheets, sniff_kind
from stock.errors import BadSheet


def zip_bytes() -> bytes:
    buffer = io.BytesIO()
    with zipfile.ZipFile(buffer, "w") as archive:
        archive.writestr("a.txt", "x")
    return buffer.getvalue()


OLE2 = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + bytes(504)

# What each name and content is taken for; signatures per APPNOTE and [MS-CFB].
KINDS = [
    pytest.param("bins.csv", b"Bin,Qty\n", "text", id="csv"),
    pytest.param("bins.TSV", b"Bin\tQty\n", "text", id="tsv-upper-case-extension"),
    pytest.param("bins.txt", b"Bin\tQty\n", "text", id="txt"),
    pytest.param("bins.xlsx", zip_bytes(), "workbook", id="xlsx"),
    pytest.param("bins.xlsm", zip_bytes(), "workbook", id="xlsm"),
]


@pytest.mark.parametrize(("name", "data", "kind"), KINDS)
def test_the_reader_is_chosen_by_extension_and_first_bytes(tmp_path, name, data, kind):
    path = tmp_path / name
    path.write_bytes(data)
    assert sniff_kind(path) == kind


REFUSED = [
    pytest.param("bins.csv", zip_bytes(), "is a zip archive (perhaps a workbook), not a text sheet, despite its "
                 ".csv name (expected rename it to .xlsx if it is a workbook)", id="zip-named-csv"),
    pytest.param("bins.xlsx", b"Bin,Qty\n", "is not an XLSX workbook (a .xlsx file is a zip archive; this one is "
                 "not) (expected a workbook saved as .xlsx, or rename a text sheet to .csv)", id="text-named-xlsx"),
    pytest.param("bins.xlsx", OLE2, "is a password-protected (encrypted) workbook or an old .xls file (expected "
                 "an unencrypted .xlsx, or the sheet saved as .csv)", id="encrypted-xlsx"),
    pytest.param("bins.csv", OLE2, "is a password-protected (encrypted) workbook or an old .xls file (expected "
                 "an unencrypted .xlsx, or the sheet saved as .csv)", id="ole2-named-csv"),
    pytest.param("bins.xls", OLE2, "is an old binary .xls workbook, which is not read (expected the workbook "
                 "saved as .xlsx or .csv)", id="old-xls"),
    pytest.param("bins.ods", zip_bytes(), "has an extension this tool does not read (.ods) (expected .csv, .tsv, "
                 ".txt, .xlsx or .xlsm)", id="ods"),
    pytest.param("bins", b"Bin,Qty\n", "has an extension this tool does not read (none) (expected .csv, .tsv, "
                 ".txt, .xlsx or .xlsm)", id="no-extension"),
]


@pytest.mark.parametrize(("name", "data", "message"), REFUSED)
def test_a_file_of_the_wrong_kind_is_refused_in_one_line(tmp_path, name, data, message):
    path = tmp_path / name
    path.write_bytes(data)
    with pytest.raises(BadSheet) as caught:
        read_sheets(path)
    assert str(caught.value) == f"{path}: {message}"


def test_a_missing_file_and_a_folder_are_refused(tmp_path):
    with pytest.raises(BadSheet, match="nothing.csv: no such file$"):
        read_sheets(tmp_path / "nothing.csv")
    (tmp_path / "dir.csv").mkdir()
    with pytest.raises(BadSheet, match="dir.csv: is a folder, not a file$"):
        read_sheets(tmp_path / "dir.csv")


def test_csv_and_xlsx_of_the_same_sheet_come_out_the_same(tmp_path):
    rows = [["Kingsbridge Radio"], [], ["Bin", "Marking", "Notes", "Notes"], ["A1", "104", "box", None, "x"]]
    csv_path = tmp_path / "same.csv"
    csv_path.write_text("\n".join(",".join("" if c is None else c for c in r) for r in rows) + "\n")
    wb = Workbook()
    for r in rows:
        wb.active.append(r)
    xlsx_path = tmp_path / "same.xlsx"
    wb.save(xlsx_path)
    (from_csv,), (from_xlsx,) = read_sheets(csv_path), read_sheets(xlsx_path)
    for sheet in (from_csv, from_xlsx):
        assert (sheet.header_row, sheet.headers) == (3, ("Bin", "Marking", "Notes", "Notes (2)"))
        assert list(sheet.rows) == [RawRow(4, ("A1", "104", "box", None), (("column 5", "x"),))]


def numbered(*rows):
    return iter(enumerate(rows, start=1))


def test_the_header_is_the_row_naming_the_most_fields():
    sheet = shape_sheet("f.csv", None, numbered(("Value", None), ("Bin", "Value", "Qty"), ("A1", "104", "3")))
    assert (sheet.header_row, sheet.headers) == (2, ("Bin", "Value", "Qty"))
    assert sheet.skipped_above == (RawRow(1, ("Value", None, None)),)


def test_the_first_row_is_the_header_when_no_row_names_a_field():
    sheet = shape_sheet("f.csv", None, numbered((None, None), ("Spalte A", "Spalte B"), ("A1", "104")))
    assert (sheet.header_row, sheet.headers) == (2, ("Spalte A", "Spalte B"))
    assert list(sheet.rows) == [RawRow(3, ("A1", "104"))]


def test_with_no_known_field_the_fullest_row_is_the_header_not_a_title():
    sheet = shape_sheet("f.csv", None, numbered(("Inventar 2026",), ("Fach", "Aufdruck", "Anzahl"), ("A1", "104", "3")))
    assert (sheet.header_row, sheet.headers) == (2, ("Fach", "Aufdruck", "Anzahl"))


def test_a_title_repeated_over_sixteen_thousand_columns_is_named_quickly():
    # XLSX allows 16 384 columns (ECMA-376); a merged title filled across them must not go quadratic
    headers = make_headers(["Title"] * 16_384)
    assert headers[-1] == "Title (16384)"
    assert len(set(headers)) == 16_384


def test_only_blank_rows_give_no_sheet():
    assert shape_sheet("f.csv", None, numbered((None,), (None, None))) is None


def test_the_header_search_looks_only_at_the_first_thirty_rows():
    rows = [(f"title {i}",) for i in range(30)] + [("Bin", "Marking")]
    sheet = shape_sheet("f.csv", None, numbered(*rows))
    assert sheet.header_row == 1
    assert [r.number for r in sheet.rows][-1] == 31      # the late "header" is kept as data, not lost


# Header naming rules (module docstring of importers.sheet); common practice, no published source.
HEADER_NAMES = [
    pytest.param(["Notes", None, "notes", "Qty", None, None], ("Notes", "column 2", "notes (2)", "Qty"),
                 id="blank-named-repeat-numbered-trailing-dropped"),
    pytest.param(["Value\n(pF)", "  Qty  "], ("Value (pF)", "Qty"), id="wrapped-header-on-one-line"),
    pytest.param([104, 2.0, dt.date(2026, 1, 5)], ("104", "2", "2026-01-05"), id="numbers-and-dates-as-text"),
    pytest.param(["column 2", None], ("column 2",), id="trailing-blank-dropped"),
    pytest.param([None, "column 1"], ("column 1", "column 1 (2)"), id="synthetic-name-clash"),
]


@pytest.mark.parametrize(("cells", "headers"), HEADER_NAMES)
def test_header_cells_become_unique_names(cells, headers):
    assert make_headers(cells) == headers


# Cell cleaning; integral floats to int per the brief (a code 104 typed as a number).
CLEAN = [
    pytest.param("", None, id="empty-text"),
    pytest.param(" \t", None, id="whitespace"),
    pytest.param(104.0, 104, id="integral-float"),
    pytest.param(0.1, 0.1, id="fraction-kept"),
    pytest.param(float("inf"), float("inf"), id="infinity-kept"),
    pytest.param(True, True, id="bool-kept"),
    pytest.param("007", "007", id="leading-zeros-kept"),
]


@pytest.mark.parametrize(("raw", "clean"), CLEAN)
def test_cells_are_cleaned_only_of_blanks_and_float_noise(raw, clean):
    result = clean_cell(raw)
    assert result == clean
    assert type(result) is type(clean)


def test_raw_record_keeps_extra_cells_and_can_be_made_json_safe():
    sheet = RawSheet("f.xlsx", "Bins", 1, ("Bin", "Counted", "Qty"), iter(()))
    row = RawRow(2, ("A1", dt.datetime(2026, 11, 28, 9, 30), float("nan")), (("column 4", "spare"),))
    assert sheet.raw_record(row, jsonable=True) == {"Bin": "A1", "Counted": "2026-11-28T09:30:00",
                                                     "Qty": "nan", "column 4": "spare"}


def test_rows_and_sheets_are_frozen():
    row = RawRow(2, ("A1",))
    with pytest.raises(dataclasses.FrozenInstanceError):
        row.number = 3
    sheet = RawSheet("f.csv", None, 1, ("Bin",), iter(()))
    with pytest.raises(dataclasses.FrozenInstanceError):
        sheet.headers = ()


@pytest.mark.parametrize("module", ["importers.raw_sheet", "importers.csv_sheet", "importers.headers"])
def test_the_docstring_examples_of_the_readers_hold(module):
    # pytest's --doctest-modules covers stock/ only; the importers' examples are run here.
    import doctest
    import importlib

    result = doctest.testmod(importlib.import_module(module), optionflags=doctest.ELLIPSIS)
    assert result.attempted > 0
    assert result.failed == 0
