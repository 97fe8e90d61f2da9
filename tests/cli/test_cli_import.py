"""`stock import`: the report, the JSON contract, dry runs and one-line errors.

Sources: "104" = 100 nF and "472" = 4.7 nF per IEC 60062 (three-digit code); quantity rules
are common practice in stock-keeping, no published source; exit codes follow the project's
rule (1 bad data, 2 bad usage), common practice for command-line tools.
"""

from __future__ import annotations

import csv
import json

import pytest
from typer.testing import CliRunner

from stock.cli import app
from stock.store.database import open_store

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1"}


def write_csv(path, rows, headers=("Bin #", "Marking", "Qty on hand")):
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(headers)
        w.writerows(rows)
    return path


@pytest.fixture
def runner():
    return CliRunner()


@pytest.fixture
def sheet(tmp_path):
    return write_csv(tmp_path / "drawer.csv", [["A1", "104", "25"], ["A2", "472", ""],
                                               ["A3", "junk!", "1"]])


def run(runner, db, *args):
    return runner.invoke(app, ["--db", str(db), *args], env=ENV)


def test_json_report_has_the_contracted_keys(runner, tmp_path, sheet):
    result = run(runner, tmp_path / "s.db", "import", str(sheet), "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    (f,) = data["files"]
    assert {"path", "sheet", "rows", "stored", "quarantined", "flagged", "unchanged"} <= set(f)
    assert (f["rows"], f["stored"], f["quarantined"], f["flagged"], f["unchanged"]) == (3, 2, 1, 1, 0)
    assert f["path"] == str(sheet) and f["sheet"] is None
    assert "→ location" in result.stderr  # the mapping goes to stderr in --json mode


def test_the_human_report_prints_the_mapping_and_a_summary_table(runner, tmp_path, sheet):
    result = run(runner, tmp_path / "s.db", "import", str(sheet))
    assert result.exit_code == 0, result.output
    assert "'Qty on hand' → quantity" in result.stdout
    lines = result.stdout.splitlines()
    header = next(line for line in lines if line.startswith("file"))
    assert header.split()[:7] == ["file", "sheet", "rows", "stored", "quarantined", "flagged", "unchanged"]
    assert "stock quarantine" in result.stderr


def test_a_second_import_of_the_same_file_reports_every_row_unchanged(runner, tmp_path, sheet):
    run(runner, tmp_path / "s.db", "import", str(sheet))
    data = json.loads(run(runner, tmp_path / "s.db", "import", str(sheet), "--json").stdout)
    assert (data["files"][0]["unchanged"], data["files"][0]["stored"]) == (3, 0)


def test_a_dry_run_keeps_nothing(runner, tmp_path, sheet):
    result = run(runner, tmp_path / "s.db", "import", str(sheet), "--dry-run", "--json")
    assert result.exit_code == 0
    assert json.loads(result.stdout)["files"][0]["stored"] == 2
    with open_store(tmp_path / "s.db") as store:
        assert store.one("SELECT COUNT(*) AS n FROM bins")["n"] == 0


def test_map_overrides_the_header_guess(runner, tmp_path):
    path = write_csv(tmp_path / "odd.csv", [["A1", "104", "3"]], headers=("Where", "Printed", "Held"))
    result = run(runner, tmp_path / "s.db", "import", str(path), "--json",
                 "--map", "location=Where", "--map", "marking=Printed", "--map", "quantity=Held")
    assert result.exit_code == 0, result.output
    assert json.loads(result.stdout)["files"][0]["stored"] == 1


def test_a_malformed_map_is_a_usage_error(runner, tmp_path, sheet):
    result = run(runner, tmp_path / "s.db", "import", str(sheet), "--map", "quantity")
    assert result.exit_code == 2


def test_a_bad_file_is_one_line_naming_it_and_exit_1(runner, tmp_path):
    path = tmp_path / "broken.xlsx"
    path.write_bytes(b"this is not a workbook")
    result = run(runner, tmp_path / "s.db", "import", str(path))
    assert result.exit_code == 1
    lines = result.stderr.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("stock: ") and "broken.xlsx" in lines[0]
    with open_store(tmp_path / "s.db") as store:
        assert store.one("SELECT COUNT(*) AS n FROM imports")["n"] == 0


def test_a_sheet_without_a_value_or_marking_column_is_refused(runner, tmp_path):
    path = write_csv(tmp_path / "q.csv", [["A1", "3"]], headers=("Bin #", "Qty"))
    result = run(runner, tmp_path / "s.db", "import", str(path))
    assert result.exit_code == 1
    assert ("no column carries a value or marking (headers found: 'Bin #' (bin locations),"
            " 'Qty' (whole numbers))") in result.stderr


def test_import_help_has_a_real_example(runner):
    result = runner.invoke(app, ["import", "--help"], env=ENV)
    assert result.exit_code == 0
    assert "stock import shop-bins.xlsx" in result.stdout


def test_a_sheet_in_plain_words_imports_with_no_map_and_prints_how_columns_were_found(runner, tmp_path):
    path = write_csv(tmp_path / "bench.csv", [["104K 2A", "A1", "25"], ["4n7 C0G", "A2", "10"],
                                              ["47uF 25V elctrolytic", "B1", "4"]],
                     headers=("What is printed on it", "Where it lives", "How many we have"))
    result = run(runner, tmp_path / "s.db", "import", str(path))
    assert result.exit_code == 0, result.stderr
    assert "'What is printed on it' → marking (content 100 %)" in result.stdout
    assert "'Where it lives' → location (content 100 %)" in result.stdout


def test_import_help_lists_every_field_with_one_line_and_the_per_sheet_map(runner):
    from importers.headers import BIN_FIELDS

    result = runner.invoke(app, ["import", "--help"], env=ENV)
    assert result.exit_code == 0
    for name in BIN_FIELDS:
        assert f"  {name} " in result.stdout
    assert "SHEET:FIELD=HEADER" in result.stdout


def test_a_bom_given_to_import_is_refused_and_forced_in_with_force(runner, tmp_path):
    path = write_csv(tmp_path / "board.csv", [["C1, C2", "2", "100n"], ["C3-C5", "3", "4u7"]],
                     headers=("Refs", "Qty", "Value"))
    refused = run(runner, tmp_path / "s.db", "import", str(path))
    assert refused.exit_code == 1 and "kit plan" in refused.stderr
    forced = run(runner, tmp_path / "s.db", "import", str(path), "--force")
    assert forced.exit_code == 0, forced.stderr


def test_two_files_take_one_map_that_only_one_of_them_has(runner, tmp_path):
    a = write_csv(tmp_path / "a.csv", [["A1", "104", "3"]], headers=("Bin", "Stamp", "Qty"))
    b = write_csv(tmp_path / "b.csv", [["B1", "4n7", "2"]], headers=("Bin", "Marking", "Qty"))
    result = run(runner, tmp_path / "s.db", "import", str(a), str(b), "--map", "marking=Stamp")
    assert result.exit_code == 0, result.stderr
    wrong = run(runner, tmp_path / "t.db", "import", str(a), str(b), "--map", "marking=Nowhere")
    assert wrong.exit_code == 2 and "Nowhere" in wrong.stderr      # a --map is usage


def test_a_bin_sheet_given_to_kit_plan_is_refused_with_a_hint(runner, tmp_path):
    path = write_csv(tmp_path / "bins.csv", [["A1", "104", "3"]], headers=("Drawer", "Code", "Qty"))
    run(runner, tmp_path / "s.db", "import", str(path))
    result = run(runner, tmp_path / "s.db", "kit", "plan", str(path), "--boards", "1")
    assert result.exit_code == 1 and "looks like a bin sheet" in result.stderr
    assert "stock import" in result.stderr
