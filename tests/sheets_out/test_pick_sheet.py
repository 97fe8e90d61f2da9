"""The pick list as a workbook: a sheet to tick off with a total, then the cautions to read.

Sources (docs/sources.md): 104 = 100 nF, 473 = 47 nF ([IEC 60062]); the counts are hand
arithmetic (2 positions × 3 boards = 6); text that begins with "=" is kept from running as a
formula ([OWASP CSV injection]); the 50 V stored-charge caution is common practice, no published
source.
"""

from __future__ import annotations

import gc

import openpyxl
import pytest

from stock.errors import StoreProblem
from stock.inventory.intake import import_file
from stock.kitting.pick_list import pick_list
from stock.kitting.planner import kit_options, plan_kit
from stock.sheets_out.pick_sheet import write_pick_list_xlsx
from tests.helpers_procs import write_sheet as write


@pytest.fixture
def picks(store, tmp_path):
    import_file(store, write(tmp_path / "rack.csv", ["Location", "Label", "Marking", "Qty"],
                             [["Q1", "decoupling", "104K 50V X7R", "12"]]))
    bom = write(tmp_path / "b.csv", ["Designator", "Qty", "Value"], [["C1,C2", "2", "100n"]])
    return pick_list(store, plan_kit(store, bom, kit_options(3)).id)


def test_the_workbook_has_a_pick_sheet_with_a_total_and_a_cautions_sheet(picks, tmp_path):
    out = tmp_path / "picks.xlsx"
    assert write_pick_list_xlsx(picks, out) == 1
    wb = openpyxl.load_workbook(out)
    assert wb.sheetnames == ["Pick list", "Cautions"]
    ws = wb["Pick list"]
    header = [c.value for c in ws[1]]
    assert header[:6] == ["Location", "Bin", "Marking", "Value", "Count", "Refs"]
    assert header[-1] == "Picked"                   # the column ticked at the shelf comes last
    row = dict(zip(header, (c.value for c in ws[2])))
    assert {k: row[k] for k in header[:6]} == {"Location": "Q1", "Bin": "rack/q1", "Marking": "104K 50V X7R",
                                               "Value": "100 nF", "Count": 6, "Refs": "C1 C2"}
    assert row["Picked"] is None
    assert ws["A3"].value == "Total" and ws["E3"].value == "=SUM(E2:E2)"
    notes = [r[0].value for r in wb["Cautions"].iter_rows(min_row=2)]
    assert notes[0] == f"Plan {picks.plan}, 3 board(s), status reserved"


# openpyxl leaves its half-written sheet generators behind after a failed save; collect them here
@pytest.mark.filterwarnings("ignore::pytest.PytestUnraisableExceptionWarning")
def test_writing_where_the_file_cannot_go_is_a_store_problem_naming_it(picks, tmp_path):
    out = tmp_path / "no-such-folder" / "picks.xlsx"
    with pytest.raises(StoreProblem) as info:
        write_pick_list_xlsx(picks, out)
    assert str(out) in str(info.value)
    del info
    gc.collect()


# C1, C2 × 3 boards = 6 of 100 nF: A9's 5 and the unlocated bin's 1; C4 × 3 = 3 of 47 nF
@pytest.fixture
def three_stops(store, tmp_path):
    import_file(store, write(tmp_path / "rack.csv", ["Location", "Marking", "Qty", "Package"],
                             [["=1+1", "473K 100V X7R", "20", "0805"], ["A9", "104K 50V X7R", "5", "0805"],
                              ["", "104K 50V X7R", "1", ""]]))
    bom = write(tmp_path / "b.csv", ["Designator", "Qty", "Value"], [["C1,C2", "2", "100n"], ["C4", "1", "47n"]])
    return pick_list(store, plan_kit(store, bom, kit_options(3)).id)


def test_every_stop_is_a_row_and_the_total_sums_them_all(three_stops, tmp_path):
    out = tmp_path / "picks.xlsx"
    assert write_pick_list_xlsx(three_stops, out) == 3
    ws = openpyxl.load_workbook(out)["Pick list"]
    assert [(ws[f"D{i}"].value, ws[f"E{i}"].value, ws[f"G{i}"].value) for i in (2, 3, 4)] == [
        ("47 nF", 3, "0805"), ("100 nF", 5, "0805"), ("100 nF", 1, None)]
    assert ws["A4"].value is None                           # the bin with no location
    assert ws["A5"].value == "Total" and ws["E5"].value == "=SUM(E2:E4)"


def test_a_location_that_looks_like_a_formula_stays_text(three_stops, tmp_path):
    out = tmp_path / "picks.xlsx"
    write_pick_list_xlsx(three_stops, out)
    cell = openpyxl.load_workbook(out)["Pick list"]["A2"]
    assert (cell.value, cell.data_type, cell.quotePrefix) == ("=1+1", "s", True)


def test_the_cautions_sheet_carries_the_plans_cautions_after_its_heading_line(three_stops, tmp_path):
    out = tmp_path / "picks.xlsx"
    write_pick_list_xlsx(three_stops, out)
    notes = [r[0].value for r in openpyxl.load_workbook(out)["Cautions"].iter_rows(min_row=2)]
    assert len(notes) == 2
    assert notes[0] == f"Plan {three_stops.plan}, 3 board(s), status reserved"
    assert notes[1].startswith("Parts rated above 50 V (rack/=1+1 (473K 100V X7R))")
