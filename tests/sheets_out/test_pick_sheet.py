"""The pick list as a workbook: a sheet to tick off with a total, then the cautions to read.

Sources: 104 = 100 nF (IEC 60062); the count is hand arithmetic (2 positions × 3 boards = 6).
"""

from __future__ import annotations

import csv
import gc

import openpyxl
import pytest

from stock.errors import StoreProblem
from stock.inventory.intake import import_file
from stock.kitting.pick_list import pick_list
from stock.kitting.planner import kit_options, plan_kit
from stock.sheets_out.pick_sheet import write_pick_list_xlsx


def write(path, header, rows):
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(header)
        w.writerows(rows)
    return path


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
