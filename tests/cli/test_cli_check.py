"""`stock check`: a sound store says ok with its counts; a damaged one names each problem and exits 1.

Exit codes 1 (bad data) / 2 (bad usage) are common practice for command-line tools; the ledger rule
(on-hand equals the sum of the bin's movements) is this project's own (DEVELOPERS.md).
"""

from __future__ import annotations

import json
import sqlite3

import pytest
from typer.testing import CliRunner

from stock.cli import app

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1"}

SHEET = "Location,Marking,Qty\nC1,104,25\nC2,472,10\nC3,4n7,\n"


@pytest.fixture
def shop(tmp_path):
    sheet = tmp_path / "drawer.csv"
    sheet.write_text(SHEET, encoding="utf-8")
    db = tmp_path / "stock.db"
    result = CliRunner().invoke(app, ["--db", str(db), "import", str(sheet)], env=ENV)
    assert result.exit_code == 0, result.output
    return db


def run(*args):
    return CliRunner().invoke(app, list(args), env=ENV)


def test_a_sound_store_checks_ok_naming_how_many_bins_and_movements_agree(shop):
    result = run("--db", str(shop), "check")
    assert result.exit_code == 0, result.output
    # three bins imported; two counted rows make two import movements, the blank one none or one
    assert result.output.startswith("ok: 3 bins, ")
    assert "ledger movements agree" in result.output


def test_check_json_is_one_object_with_ok_problems_and_checked(shop):
    result = run("--db", str(shop), "check", "--json")
    assert result.exit_code == 0
    data = json.loads(result.output)
    assert data["ok"] is True and data["problems"] == []
    assert data["checked"]["bins"] == 3


def test_a_store_whose_on_hand_disagrees_with_its_ledger_is_reported_and_exits_1(shop):
    # damage the store behind the tool's back, as a crash or a hand edit would
    conn = sqlite3.connect(shop)
    conn.execute("UPDATE bins SET on_hand = on_hand + 7 WHERE location = 'C1'")
    conn.commit()
    conn.close()
    result = run("--db", str(shop), "check")
    assert result.exit_code == 1
    assert result.output.startswith("problem: ")
    data = json.loads(run("--db", str(shop), "check", "--json").output)
    assert data["ok"] is False and data["problems"]


def test_checking_a_database_that_does_not_exist_is_one_line_naming_it(tmp_path):
    missing = tmp_path / "nowhere.db"
    result = run("--db", str(missing), "check")
    assert result.exit_code != 0
    assert str(missing) in result.output
    assert "Traceback" not in result.output
    assert not missing.exists()          # checking never creates a store


def test_check_has_help_with_an_example():
    result = run("check", "--help")
    assert result.exit_code == 0
    assert "Example: stock --db shop.db check" in result.output
