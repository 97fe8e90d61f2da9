"""`stock replace`: help with an example, the answer in words, the JSON contract, one-line errors.

The shelf is Marsh Lane Radio Repairs' (invented), imported from a CSV. Outside sources: the EIA
6-dot mica code ([navy-colour-code]/[mica-mailing-list]), EIA-198 (C0G 0 ± 30 ppm/K), IEC 60384-14 for
the mains caution, IEC 60063 (E12) for the value to buy; substitution rules are common practice.
"""

from __future__ import annotations

import json

import pytest
from typer.testing import CliRunner

from stock.markings.safety_classes import MAINS_CAUTION

from stock.cli import app
from tests.matching.test_replacement import SHELF

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1"}
runner = CliRunner()


@pytest.fixture
def db(tmp_path):
    sheet = tmp_path / "marsh_lane_shelf.csv"
    sheet.write_text(SHELF, encoding="utf-8")
    path = tmp_path / "marsh-lane.db"
    result = runner.invoke(app, ["--db", str(path), "import", str(sheet)], env=ENV)
    assert result.exit_code == 0, result.stderr
    return str(path)


def run(db, *args):
    return runner.invoke(app, ["--db", db, "replace", *args], env=ENV)


def test_replace_has_help_with_a_real_example():
    result = runner.invoke(app, ["replace", "--help"], env=ENV)
    assert result.exit_code == 0
    assert 'stock replace "white yellow violet red gold brown" --use tuned' in result.stdout


def test_a_mica_colour_code_prints_the_original_the_need_and_ranked_stand_ins(db):
    result = run(db, "white yellow violet red gold brown", "--use", "tuned", "--volts", "250")
    assert result.exit_code == 0, result.stderr
    out = result.stdout
    assert "original: white yellow violet red gold brown → 470 pF ±5 %" in out
    assert "a stand-in needs: 470 pF ±5 %, fit for tuned, working 250 V (derated)" in out
    assert "  1. bin marsh_lane_shelf/m1 at M1: 470pF 5% silver mica 500V = 470 pF, 12 available, fit" in out
    assert "rule: mica-to-c0g — mica and C0G/NP0 ceramics are the trade's equals in tuned work" in out
    assert "differs: tempco 0±30 ppm/K against the original's 0±200 ppm/K" in out
    assert "caution: A new part in a tuned circuit may shift its frequency" in out


def test_an_empty_answer_says_why_and_what_to_buy(db):
    result = run(db, ".05 MFD 600V paper")
    assert result.exit_code == 0, result.stderr
    assert "nothing on the shelf will do:" in result.stdout
    assert "buy 47 nF ±10 %, film (polypropylene or polyester), rated ≥ 600 V DC" in result.stdout


def test_json_follows_the_contract_and_nothing_else_is_printed(db):
    result = run(db, ".047 MFD 400V paper", "--position", "line-line", "--volts", "230", "--json")
    assert result.exit_code == 0, result.stderr
    data = json.loads(result.stdout)
    assert set(data) == {"original", "requirement", "stand_ins", "pairs", "cautions", "explanation",
                         "suggestion", "buy"}
    assert data["original"]["decoded"]["dielectric"]["family"] == "paper"
    assert data["requirement"]["safety_needed"] == "X2" and data["requirement"]["voltage_kind"] == "AC"
    assert [s["bin"] for s in data["stand_ins"]] == ["marsh_lane_shelf/x1", "marsh_lane_shelf/x3"]
    for s in data["stand_ins"]:
        assert set(s) >= {"bin", "marking", "facts", "rule", "differences"}
        assert s["rule"]["name"] == "mains-paper-by-class"
        assert s["facts"]["safety_class"]
    assert any(MAINS_CAUTION in c for c in data["cautions"])   # the one mains caution text
    assert data["pairs"] == [] and data["buy"] is None


@pytest.mark.parametrize("args, code, words", [
    pytest.param(("104", "--position", "across"), 2, "--position: cannot read 'across'", id="bad-position"),
    pytest.param(("no such thing",), 2, "MARKING|BIN: cannot read 'no such thing'", id="unreadable"),
    pytest.param((".047 MFD 400V paper", "--use", "mains"), 2, "--position", id="mains-without-position"),
    pytest.param(("104", "--use", "radio"), 2, "--use: cannot read 'radio'", id="bad-use"),
])
def test_bad_usage_is_one_line_on_stderr_with_exit_2(db, args, code, words):
    result = run(db, *args)
    assert result.exit_code == code
    assert result.stdout == ""
    assert words in result.stderr and len(result.stderr.strip().splitlines()) == 1
