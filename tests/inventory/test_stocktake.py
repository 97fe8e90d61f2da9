"""The stock-take sheet round trip: written, filled in, read back as count movements.

Sources: the ledger rule (a count records the difference) is common practice in stock-keeping,
no published source; the data-validation form is the OOXML whole-number validation
(ECMA-376 part 1, dataValidation type "whole").
"""

from __future__ import annotations

from decimal import Decimal

import pytest
from openpyxl import load_workbook

from stock.decoded import Marking
from stock.errors import BadSheet
from stock.inventory.bins import natural_key
from stock.inventory.stocktake import apply_count_sheet, is_count_sheet, preview_count_sheet
from stock.sheets_out.count_sheet import export_count_sheet
from tests.sheets_out.test_exports import put_part


def _fill(path, counts: dict[str, object]):
    wb = load_workbook(path)
    ws = wb["Stock take"]
    for row in ws.iter_rows(min_row=2):
        if row[0].value in counts:
            row[6].value = counts[row[0].value]
    wb.save(path)


@pytest.fixture
def shelf(store):
    for key, qty in (("cab/A10", 5), ("cab/A2", 7), ("cab/B1", None)):
        put_part(store, key, Marking("104", Decimal(100000)), on_hand=qty)
    return store


def test_the_sheet_is_in_natural_location_order_with_a_validated_counted_column(shelf, tmp_path):
    out = tmp_path / "take.xlsx"
    assert export_count_sheet(shelf, out) == 3
    wb = load_workbook(out)
    ws = wb["Stock take"]
    assert [r[0] for r in ws.iter_rows(min_row=2, values_only=True)] == ["cab/A2", "cab/A10", "cab/B1"]
    (dv,) = ws.data_validations.dataValidation
    assert dv.type == "whole" and dv.operator == "greaterThanOrEqual" and dv.formula1 == "0"
    assert str(dv.sqref) == "G2:G4"
    assert wb["About"].sheet_state == "hidden" and is_count_sheet(out)


def test_reading_the_filled_sheet_back_records_the_differences_as_counts(shelf, tmp_path):
    out = tmp_path / "take.xlsx"
    export_count_sheet(shelf, out)
    _fill(out, {"cab/A2": 4, "cab/A10": 5, "cab/B1": 12})
    assert preview_count_sheet(shelf, out).changes[0].delta == -3
    assert shelf.one("SELECT COUNT(*) AS n FROM ledger WHERE kind = 'count'")["n"] == 0  # preview wrote nothing
    report = apply_count_sheet(shelf, out)
    assert [(c.bin_key, c.delta) for c in report.changes] == [("cab/A2", -3), ("cab/B1", 12)]
    assert report.counted == 3 and report.not_counted == 0
    held = {r["bin_key"]: r["on_hand"] for r in shelf.rows("SELECT bin_key, on_hand FROM bins")}
    assert held == {"cab/A10": 5, "cab/A2": 4, "cab/B1": 12}
    moves = shelf.rows("SELECT delta, ref FROM ledger WHERE kind = 'count' ORDER BY id")
    assert [m["delta"] for m in moves] == [-3, 12] and moves[0]["ref"] == "count:take.xlsx"


def test_a_bad_count_refuses_the_whole_sheet_naming_row_and_column(shelf, tmp_path):
    out = tmp_path / "take.xlsx"
    export_count_sheet(shelf, out)
    _fill(out, {"cab/A2": 4, "cab/A10": "lots"})
    with pytest.raises(BadSheet) as err:
        apply_count_sheet(shelf, out)
    assert str(err.value) == (f"{out}, sheet 'Stock take', row 3, column 'Counted': cannot read 'lots'"
                              " as a count (expected a whole number, 0 or more, or a blank cell)")
    assert shelf.one("SELECT on_hand FROM bins WHERE bin_key = 'cab/A2'")["on_hand"] == 7


def test_natural_order_puts_a2_before_a10():
    # common practice for drawer labels, no published source
    assert sorted(["A10", "A2", "A1"], key=natural_key) == ["A1", "A2", "A10"]


def test_importing_the_filled_sheet_through_the_cli_records_counts(shelf, tmp_path):
    from typer.testing import CliRunner

    from stock.cli import app

    out = tmp_path / "take.xlsx"
    export_count_sheet(shelf, out)
    _fill(out, {"cab/A2": 9})
    db = shelf.path
    result = CliRunner().invoke(app, ["--db", db, "import", str(out), "--json"])
    assert result.exit_code == 0, result.output
    import json

    report = json.loads(result.stdout)
    assert report["files"] == [] and report["counts"][0]["changes"] == [
        {"bin": "cab/A2", "row": 2, "expected": 7, "counted": 9, "delta": 2}]
    assert shelf.one("SELECT on_hand FROM bins WHERE bin_key = 'cab/A2'")["on_hand"] == 9
