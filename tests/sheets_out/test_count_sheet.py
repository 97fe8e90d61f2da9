"""The stock-take sheet: every bin in natural location order, an empty Counted column that takes whole numbers.

Sources: natural order (A2 before A10) is common practice, no published source; 104 = 100 nF and
472 = 4.7 nF by IEC 60062 three-digit codes.
"""

from __future__ import annotations

import csv

import openpyxl

from stock.inventory.intake import import_file
from stock.sheets_out.count_sheet import COUNT_COLUMNS, export_count_sheet


def _shelf(store, tmp_path):
    path = tmp_path / "shelf.csv"
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(["Location", "Label", "Marking", "Qty"])
        w.writerows([["A10", "", "472", "4"], ["A2", "", "104", ""], ["A1", "=cmd()", "104", "3"]])
    import_file(store, path)


def test_the_count_sheet_lists_bins_in_natural_order_with_expected_and_an_empty_counted(store, tmp_path):
    _shelf(store, tmp_path)
    out = tmp_path / "take.xlsx"
    assert export_count_sheet(store, out) == 3
    wb = openpyxl.load_workbook(out)
    ws = wb["Stock take"]
    assert [c.value for c in ws[1]] == [c.header for c in COUNT_COLUMNS]
    header = [c.value for c in ws[1]]
    loc, label, value, expected, counted = (header.index(h) for h in
                                             ("Location", "Label", "Value", "Expected", "Counted"))
    body = [[c.value for c in row] for row in ws.iter_rows(min_row=2)]
    assert [r[loc] for r in body] == ["A1", "A2", "A10"]
    assert [r[value] for r in body] == ["100 nF", "100 nF", "4.7 nF"]
    assert [r[expected] for r in body] == [3, None, 4]      # blank quantity stays blank, not 0
    assert all(r[counted] is None for r in body)
    assert body[0][label] == "=cmd()" and ws.cell(2, label + 1).data_type == "s"   # OWASP CSV Injection


def test_the_counted_column_accepts_only_whole_numbers_of_zero_or_more(store, tmp_path):
    _shelf(store, tmp_path)
    out = tmp_path / "take.xlsx"
    export_count_sheet(store, out)
    wb = openpyxl.load_workbook(out)
    rules = wb["Stock take"].data_validations.dataValidation
    assert len(rules) == 1
    rule = rules[0]
    assert (rule.type, rule.operator, rule.formula1) == ("whole", "greaterThanOrEqual", "0")
    assert str(rule.sqref) == "G2:G4"
    assert wb["About"].sheet_state == "hidden"
    assert wb["About"]["A1"].value == "stock count sheet v1"


def test_an_empty_store_still_writes_a_sheet_with_its_header(store, tmp_path):
    out = tmp_path / "take.xlsx"
    assert export_count_sheet(store, out) == 0
    ws = openpyxl.load_workbook(out)["Stock take"]
    assert ws.max_row == 1
