"""`stock export purchasing | inventory | count`: files written, rows counted, bad names refused.

Sources: 104 = 100 nF and 472 = 4.7 nF by IEC 60062 three-digit codes; the order quantity for a bin
below its minimum is minimum − on hand (hand arithmetic: 20 − 5 = 15 with no spare); exit codes
1 (bad data) / 2 (bad usage) are common practice for command-line tools.
"""

from __future__ import annotations

import csv
import json

import openpyxl
import pytest
from typer.testing import CliRunner

from stock.cli import app

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1"}

SHEET = "Location,Marking,Qty,Minimum\nD1,104,5,20\nD2,472,10,\nD3,4n7,30,10\n"


@pytest.fixture
def shop(tmp_path):
    sheet = tmp_path / "drawer.csv"
    sheet.write_text(SHEET, encoding="utf-8")
    db = tmp_path / "stock.db"
    result = CliRunner().invoke(app, ["--db", str(db), "import", str(sheet)], env=ENV)
    assert result.exit_code == 0, result.output
    return db


def run(db, *args):
    return CliRunner().invoke(app, ["--db", str(db), "export", *args], env=ENV)


def _csv(path):
    with open(path, encoding="utf-8-sig", newline="") as fh:
        return list(csv.DictReader(fh))


def test_inventory_csv_has_a_row_per_bin_and_says_so(shop, tmp_path):
    out = tmp_path / "shelves.csv"
    result = run(shop, "inventory", str(out))
    assert result.exit_code == 0, result.output
    assert result.output.strip() == f"wrote {out} (3 rows)"
    rows = _csv(out)
    assert sorted(r["Location"] for r in rows) == ["D1", "D2", "D3"]
    assert {r["Location"]: r["Value"] for r in rows}["D1"] == "100 nF"


def test_inventory_xlsx_json_report_names_the_export_path_and_rows(shop, tmp_path):
    out = tmp_path / "shelves.xlsx"
    result = run(shop, "inventory", str(out), "--json")
    assert result.exit_code == 0, result.output
    assert json.loads(result.output) == {"export": "inventory", "path": str(out), "rows": 3}
    assert "Bins" in openpyxl.load_workbook(out).sheetnames


def test_purchasing_below_minimum_orders_the_shortfall(shop, tmp_path):
    out = tmp_path / "order.csv"
    result = run(shop, "purchasing", str(out), "--below-minimum", "--spare", "0", "--json")
    assert result.exit_code == 0, result.output
    assert json.loads(result.output)["rows"] == 1     # only D1 (5 on hand, minimum 20) is short
    (row,) = _csv(out)
    assert row["Value"] == "100 nF"
    assert int(row["Quantity"].replace(",", "")) == 15     # 20 − 5


def test_purchasing_with_nothing_to_order_writes_an_empty_list(shop, tmp_path):
    out = tmp_path / "order.csv"
    result = run(shop, "purchasing", str(out))
    assert result.exit_code == 0, result.output
    assert result.output.strip() == f"wrote {out} (0 rows)"


def test_a_bad_spare_margin_is_refused_naming_it_and_the_accepted_forms(shop, tmp_path):
    result = run(shop, "purchasing", str(tmp_path / "o.csv"), "--spare", "lots")
    assert result.exit_code == 2
    assert "--spare: cannot read 'lots'" in result.output
    assert "a percentage such as 5" in result.output


@pytest.mark.parametrize("command, name, accepted", [
    pytest.param("inventory", "shelves.ods", "a name ending in .xlsx or .csv", id="inventory-ods"),
    pytest.param("purchasing", "order.txt", "a name ending in .xlsx or .csv", id="purchasing-txt"),
    pytest.param("count", "take.csv", "a name ending in .xlsx", id="count-needs-xlsx"),
])
def test_an_output_name_of_the_wrong_kind_is_refused_with_exit_2(shop, tmp_path, command, name, accepted):
    out = tmp_path / name
    result = run(shop, command, str(out))
    assert result.exit_code == 2
    assert f"output file: cannot read '{out}'" in result.output
    assert accepted in result.output
    assert not out.exists()


def test_count_writes_the_stock_take_sheet(shop, tmp_path):
    out = tmp_path / "take.xlsx"
    result = run(shop, "count", str(out))
    assert result.exit_code == 0, result.output
    assert result.output.strip() == f"wrote {out} (3 rows)"
    ws = openpyxl.load_workbook(out)["Stock take"]
    assert ws.max_row == 4        # header and three bins


def test_exporting_from_a_missing_database_fails_without_creating_it(tmp_path):
    missing = tmp_path / "none.db"
    result = run(missing, "inventory", str(tmp_path / "x.csv"))
    assert result.exit_code != 0
    assert str(missing) in result.output
    assert not missing.exists()


@pytest.mark.parametrize("command", ["purchasing", "inventory", "count"])
def test_each_export_command_has_help_with_an_example(command):
    result = CliRunner().invoke(app, ["export", command, "--help"], env=ENV)
    assert result.exit_code == 0
    assert f"Example: stock export {command}" in result.output
