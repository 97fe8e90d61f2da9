"""Tests for `stock find`: options, human output in engineering units, the JSON contract, errors.

Outside sources: textbook parallel/series formulas (100 pF ∥ 47 pF = 147 pF), EIA-198 codes
(C0G, N750, X7R), IEC 60384-14 for the mains caution, IEC 60063 for the value to buy.
"""

from __future__ import annotations

import json

import pytest
from typer.testing import CliRunner

from stock.cli import app
from stock.store.database import open_store
from tests.matching.test_search import add_bin, part

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1"}
runner = CliRunner()


@pytest.fixture
def db(tmp_path):
    """A small bench stock of Gull Street Wireless (fictional) with tuned-circuit parts."""
    path = tmp_path / "gull-street.db"
    with open_store(path) as s:
        add_bin(s, "A1", part("101J", "100", tol="1", volts="100", code="C0G"), 4, "drawer 1")
        add_bin(s, "A2", part("470J", "47", tol="1", volts="100", code="C0G"), 4, "drawer 2")
        add_bin(s, "A3", part("151K", "150", tol="10", volts="50", code="X7R"), 9, "drawer 3")
        add_bin(s, "B1", part("40 N750", "40", tol="2", volts="100", code="N750"), 5, "tray 1")
        add_bin(s, "B2", part("60 NP0", "60", tol="2", volts="100", code="NP0"), 5, "tray 2")
    return str(path)


def run(db, *args):
    return runner.invoke(app, ["--db", db, "find", *args], env=ENV)


def test_find_has_help_with_an_example():
    result = runner.invoke(app, ["find", "--help"], env=ENV)
    assert result.exit_code == 0
    assert "stock find --value 150p" in result.stdout


def test_a_single_part_prints_in_engineering_units(db):
    result = run(db, "--value", "100p", "--tol", "2%", "--use", "tuned")
    assert result.exit_code == 0, result.stderr
    assert "bin A1 at drawer 1: 101J = 100 pF, 4 available, fit" in result.stdout
    assert "for 100 pF ±2 %, fit for tuned:" in result.stdout


def test_combine_prints_the_pair_and_its_formula(db):
    result = run(db, "--value", "147pF", "--tol", "2%", "--combine")
    assert result.exit_code == 0, result.stderr
    assert "parallel: 1 × 47 pF from bin A2 ∥ 1 × 100 pF from bin A1 → 147 pF" in result.stdout
    assert "47 pF ∥ 100 pF = 147 pF (C₁ + C₂)" in result.stdout


def test_json_has_the_contract_keys_and_nothing_else_on_stdout(db):
    # N750's tolerance on α is not marked: ±120 ppm/K assumed (as U2J, EIA-198), NP0 ±30: the pair's
    # spread is (40·120 + 60·30)/100 = ±66 ppm/K, so the window must be wider than −300±30
    result = run(db, "--value", "100p", "--tempco", "-300±70", "--combine", "--json")
    assert result.exit_code == 0, result.stderr
    data = json.loads(result.stdout)
    assert data["requirement"]["tempco_min"] == -370.0
    assert data["matches"] == []
    combo = data["combinations"][0]
    assert combo["kind"] == "parallel" and combo["capacitance_pf"] == 100.0
    assert combo["tempco_ppm_per_k"] == -300.0            # (40·(−750) + 60·0) / 100
    assert [p["bin"] for p in combo["parts"]] == ["B1", "B2"]
    assert {"worst_case_pct", "voltage_v"} <= set(combo)


def test_an_empty_answer_says_why_and_what_to_buy(db):
    result = run(db, "--value", "150p", "--tol", "10%", "--use", "tuned")
    assert result.exit_code == 0
    assert "nothing on hand will do:" in result.stdout
    assert "1 part at 150 pF, X7R (bin A3): unfit for tuned" in result.stdout
    assert "buy 150 pF ±10 %, fit for tuned" in result.stdout


def test_a_mains_requirement_prints_the_safety_caution(db):
    result = run(db, "--value", "100n", "--use", "mains", "--safety", "X2")
    assert result.exit_code == 0
    assert "caution: mains work can kill" in result.stdout
    assert "defer to local electrical codes and licensed practice" in result.stdout


@pytest.mark.parametrize(("args", "message"), [
    pytest.param(["--value", "15x"], "stock: --value: cannot read '15x'", id="bad-value"),
    pytest.param(["--value", "150p", "--tempco", "warm"], "stock: --tempco: cannot read 'warm'", id="bad-tempco"),
    pytest.param(["--value", "150p", "--use", "radio"], "stock: --use: cannot read 'radio'", id="bad-use"),
    pytest.param(["--value", "150p", "--limit", "0"], "stock: --limit: cannot read '0'", id="bad-limit"),
])
def test_bad_options_give_one_clear_line_and_exit_2(db, args, message):
    result = run(db, *args)
    assert result.exit_code == 2
    assert result.stderr.startswith(message)


def test_a_missing_database_is_reported_not_created(tmp_path):
    missing = str(tmp_path / "none.db")
    result = runner.invoke(app, ["--db", missing, "find", "--value", "150p"], env=ENV)
    assert result.exit_code == 1
    assert "no stock database here" in result.stderr
