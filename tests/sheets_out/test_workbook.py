"""Tables written safely: formula-looking text stays text, bad characters replaced, nothing fails a write.

Source: the OWASP "CSV Injection" note (cells starting with = + - @ tab or CR are run as formulas by
spreadsheet programs); Excel's documented cell limit of 32 767 characters; XML 1.0 (control
characters other than tab, LF, CR are not allowed).
"""

from __future__ import annotations

import csv
import gc

import openpyxl
import pytest

from stock.errors import BadValue, StoreProblem
from stock.sheets_out.workbook import (CELL_LIMIT, Column, add_table_sheet, guard_csv, new_workbook,
                                       output_kind, save_workbook, write_csv)


# OWASP CSV Injection: the six dangerous first characters
@pytest.mark.parametrize("value, expected", [
    pytest.param("=1+1", "'=1+1", id="equals"),
    pytest.param("+41 22", "'+41 22", id="plus"),
    pytest.param("-5V", "'-5V", id="minus"),
    pytest.param("@SUM(A1)", "'@SUM(A1)", id="at"),
    pytest.param("\tx", "'\tx", id="tab"),
    pytest.param("\rx", "'\rx", id="carriage-return"),
    pytest.param("104K", "104K", id="a-marking-untouched"),
    pytest.param("a=b", "a=b", id="an-equals-inside-untouched"),
    pytest.param(-5, -5, id="a-negative-number-is-a-number"),
    pytest.param(None, None, id="none"),
    pytest.param("a\x00b", "a\ufffdb", id="nul-replaced"),
])
def test_a_csv_cell_that_could_run_as_a_formula_gets_an_apostrophe(value, expected):
    assert guard_csv(value) == expected


@pytest.mark.parametrize("name, kind", [
    pytest.param("out.xlsx", "xlsx", id="xlsx"),
    pytest.param("OUT.CSV", "csv", id="upper-case-csv"),
])
def test_the_output_kind_comes_from_the_file_name(tmp_path, name, kind):
    assert output_kind(tmp_path / name) == kind


@pytest.mark.parametrize("name", ["out.ods", "out", "out.xls"])
def test_another_output_name_is_refused_naming_it_and_the_accepted_endings(tmp_path, name):
    with pytest.raises(BadValue) as info:
        output_kind(tmp_path / name)
    assert name in str(info.value)
    assert ".xlsx or .csv" in str(info.value)


def test_write_csv_writes_a_header_and_guarded_rows_with_a_bom(tmp_path):
    path = tmp_path / "t.csv"
    n = write_csv(path, (Column("Marking"), Column("Qty")), [("=cmd()", 3), ("4µ7", 0)])
    assert n == 2
    raw = path.read_bytes()
    assert raw.startswith(b"\xef\xbb\xbf")          # UTF-8 BOM
    with open(path, encoding="utf-8-sig", newline="") as fh:
        assert list(csv.reader(fh)) == [["Marking", "Qty"], ["'=cmd()", "3"], ["4µ7", "0"]]


def test_write_csv_to_a_missing_folder_is_a_store_problem_naming_the_file(tmp_path):
    path = tmp_path / "no-such-folder" / "t.csv"
    with pytest.raises(StoreProblem) as info:
        write_csv(path, (Column("A"),), [])
    assert str(path) in str(info.value)
    assert "cannot write the file" in str(info.value)


def test_a_table_sheet_keeps_formula_text_as_text_and_adds_a_sum_row(tmp_path):
    wb = new_workbook()
    rows = [("=HYPERLINK(\"x\")", 2), ("bad\x01char", 3), ("x" * (CELL_LIMIT + 10), 5)]
    add_table_sheet(wb, "T", (Column("Text", 20), Column("Qty", 8, "0")), rows, totals={0: "Total", 1: "sum"})
    path = tmp_path / "t.xlsx"
    save_workbook(wb, path)
    ws = openpyxl.load_workbook(path)["T"]
    assert ws.freeze_panes == "A2"
    assert ws.auto_filter.ref == "A1:B4"
    assert [c.value for c in ws[1]] == ["Text", "Qty"]
    assert ws["A2"].value == '=HYPERLINK("x")' and ws["A2"].data_type == "s"
    assert ws["A3"].value == "bad\ufffdchar"
    assert len(ws["A4"].value) <= CELL_LIMIT and ws["A4"].value.endswith("[cut at 32767]")
    assert ws["A5"].value == "Total"
    assert ws["B5"].value == "=SUM(B2:B4)"      # 2 + 3 + 5 rows two to four


# openpyxl leaves its half-written sheet generator behind after a failed save; collect it here
@pytest.mark.filterwarnings("ignore::pytest.PytestUnraisableExceptionWarning")
def test_saving_a_workbook_where_it_cannot_be_written_is_a_store_problem(tmp_path):
    wb = new_workbook()
    add_table_sheet(wb, "T", (Column("A"),), [])
    path = tmp_path / "missing" / "t.xlsx"
    with pytest.raises(StoreProblem, match="cannot write the file") as info:
        save_workbook(wb, path)
    assert str(path) in str(info.value)
    del wb, info
    gc.collect()
