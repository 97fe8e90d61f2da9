"""`stock bins`, `stock show` and `stock quarantine` print what the store holds.

Sources: "104" = 100 nF per IEC 60062 (three-digit code); units written per IEC 60027-1
("100 nF"); quantity rules are common practice in stock-keeping, no published source.
"""

from __future__ import annotations

import csv
import json

import pytest
from typer.testing import CliRunner

from stock.cli import app

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1"}


@pytest.fixture
def db(tmp_path):
    path = tmp_path / "shelf.csv"
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(["Location", "Label", "Marking", "Qty"])
        w.writerows([["A1", "100nF", "104", "25"], ["A2", "", "472", ""], ["A3", "", "??", "2"]])
    db = tmp_path / "s.db"
    result = CliRunner().invoke(app, ["--db", str(db), "import", str(path)], env=ENV)
    assert result.exit_code == 0, result.output
    return db


def run(db, *args):
    return CliRunner().invoke(app, ["--db", str(db), *args], env=ENV)


def test_bins_json_lists_each_bin_with_its_value(db):
    data = json.loads(run(db, "bins", "--json").stdout)
    assert [(b["bin_key"], b["value"], b["on_hand"]) for b in data["bins"]] == [
        ("shelf/a1", "100 nF", 25), ("shelf/a2", "4.7 nF", None)]


def test_bins_text_is_a_table_in_engineering_units(db):
    out = run(db, "bins").stdout
    assert out.splitlines()[0].split()[:3] == ["bin", "marking", "value"]
    assert "100 nF" in out and "4.7 nF" in out


def test_show_prints_the_facts_and_the_quantity_history(db):
    result = run(db, "show", "shelf/a1")
    assert result.exit_code == 0, result.output
    assert "100 nF" in result.stdout and "import" in result.stdout and "+25 -> 25" in result.stdout


def test_show_json_carries_the_decoded_marking(db):
    data = json.loads(run(db, "show", "A1", "--json").stdout)
    assert data["decoded"]["text"] == "104" and data["history"][0]["delta"] == 25


def test_show_of_an_unknown_bin_is_one_line_and_exit_1(db):
    result = run(db, "show", "Z9")
    assert result.exit_code == 1
    assert result.stderr.startswith("stock: no bin 'Z9'")


def test_quarantine_lists_rows_with_raw_values_reason_and_fix(db):
    data = json.loads(run(db, "quarantine", "--json").stdout)
    (row,) = data["rows"]
    assert (row["file"], row["row"], row["reason"]) == ("shelf.csv", 4,
                                                        "no capacitance could be read from '??'")
    assert row["raw"]["Marking"] == "??" and row["fix"]
    text = run(db, "quarantine").stdout
    assert "shelf.csv row 4" in text and "fix:" in text


def test_reading_commands_refuse_a_missing_database(tmp_path):
    result = run(tmp_path / "none.db", "bins")
    assert result.exit_code == 1 and "no stock database here" in result.stderr


@pytest.mark.parametrize("command", ["bins", "show", "quarantine"])
def test_each_command_has_help_with_an_example(command):
    result = CliRunner().invoke(app, [command, "--help"], env=ENV)
    assert result.exit_code == 0 and f"stock {command}" in result.stdout
