"""`stock grade` and `stock drift` through the command line.

Outside sources: EIA-198 codes (C0G 0 ± 30 ppm/K, X7R ±15 %: docs/sources.md: [EIA-198] Class 1, [EIA-198]
Class 2); IEC 60384-14
safety classes ([IEC 60384-14]); the 10 MHz tank worked example of [lc-resonance] (C0G ∓150 Hz/K, derived).
"""

from __future__ import annotations

import json
from decimal import Decimal as D

import pytest
from typer.testing import CliRunner

from stock.cli import app
from stock.decoded import Dielectric, Marking, Tolerance
from stock.store.database import now, open_store

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1"}
C0G = Dielectric("C0G", "ceramic", 1, D(0), D(30), D(-55), D(125), source="EIA-198")
X7R = Dielectric("X7R", "ceramic", 2, temp_min_c=D(-55), temp_max_c=D(125),
                 change_minus_pct=D(15), change_plus_pct=D(15), source="EIA-198")
ALU = Dielectric("aluminium-electrolytic", "aluminium-electrolytic")
PARTS = {
    "A1": Marking("101J C0G", D(100), Tolerance(D(5), D(5), "%"), D(50), "DC", C0G),
    "A2": Marking("104K X7R", D(100000), Tolerance(D(10), D(10), "%"), D(50), "DC", X7R),
    "A3": Marking("470µF 25V", D(470_000_000), Tolerance(D(20), D(20), "%"), D(25), "DC", ALU,
                  polarity="negative-marked"),
}


@pytest.fixture
def db(tmp_path):
    path = tmp_path / "stock.db"
    with open_store(path) as store, store.writing():
        for key, marking in PARTS.items():
            stamp = now()
            cur = store.db.conn.execute(
                "INSERT INTO bins (bin_key, location, created_at, updated_at) VALUES (?, ?, ?, ?)",
                (key, key, stamp, stamp))
            store.db.conn.execute("INSERT INTO parts (bin_id, marking, decoded_json) VALUES (?, ?, ?)",
                                  (cur.lastrowid, marking.text, json.dumps(marking.to_json())))
    return path


def run(*args: str):
    return CliRunner().invoke(app, list(args), env=ENV)


def test_grade_prints_parts_by_applications_with_the_classic_words(db):
    result = run("--db", str(db), "grade")
    assert result.exit_code == 0, result.output
    lines = result.stdout.splitlines()
    assert lines[0].split() == ["bin", "marking", "tuned", "timing", "signal", "bypass", "bulk", "mains"]
    rows = {line.split()[0]: line for line in lines[1:4]}
    assert rows["A1"].split()[-6:] == ["fit", "fit", "fit", "fit", "unfit", "unfit"]
    assert rows["A2"].split()[-6:] == ["unfit", "unfit", "marginal", "fit", "unfit", "unfit"]
    assert rows["A3"].split()[-6:] == ["unfit", "unfit", "marginal", "marginal", "fit", "unfit"]
    assert "local electrical codes and licensed practice" in result.stdout


def test_grade_json_is_one_object_with_words_and_reasons(db):
    result = run("--db", str(db), "grade", "A2", "--json")
    data = json.loads(result.stdout)
    assert data["conditions"]["temp_min_c"] == 0 and data["conditions"]["reference_c"] == 25
    [item] = data["parts"]
    assert item["bin_key"] == "A2"
    assert item["grades"]["tuned"] == "unfit"
    assert item["reasons"]["tuned"][0].startswith("unfit for tuned: X7R may move ±15 % over −55…+125 °C")


def test_grade_at_other_conditions_counts_the_working_voltage(db):
    result = run("--db", str(db), "grade", "A2", "--volts", "25", "--temp", "-10..60", "--json")
    data = json.loads(result.stdout)
    assert data["conditions"]["working_v"] == 25
    assert "DC bias −20 %" in data["parts"][0]["reasons"]["bypass"][0]


def test_explain_prints_the_budget_term_by_term(db):
    result = run("--db", str(db), "grade", "--explain", "A2")
    assert result.exit_code == 0, result.output
    out = result.stdout
    for label in ("tolerance", "temperature", "ageing", "DC bias", "drift", "total", "missing"):
        assert f"\n  {label}" in out
    assert "ageing       −3.89 %" in out
    assert "total        +25/−28.9 %" in out


def test_explain_json_carries_the_budget(db):
    data = json.loads(run("--db", str(db), "grade", "--explain", "A1", "--json").stdout)
    assert data["budget"]["terms"]["temperature"]["plus_pct"] == pytest.approx(0.075)


def test_a_bad_temperature_range_is_a_usage_error_naming_the_option(db):
    result = run("--db", str(db), "grade", "--temp", "hot")
    assert result.exit_code == 2
    assert "stock: --temp: cannot read 'hot'" in result.stderr


def test_an_unknown_bin_is_named(db):
    result = run("--db", str(db), "grade", "Z9")
    assert result.exit_code == 1
    assert "no bin 'Z9'" in result.stderr


def test_a_bad_shop_override_stops_the_command_with_its_file_and_key(db):
    (db.parent / "stock-grading.toml").write_text("[tuned]\nspeed = 3\n")
    result = run("--db", str(db), "grade")
    assert result.exit_code == 2
    assert "stock-grading.toml: [tuned] key: cannot read 'speed'" in result.stderr


def test_drift_of_a_bin_in_a_10mhz_tank(db):
    # docs/sources.md: [lc-resonance]: C0G ±30 ppm/K in a 10 MHz tank → ∓150 Hz/K; 10 K → ∓1500 Hz
    result = run("--db", str(db), "drift", "--part", "A1", "--f0", "10MHz", "--tank", "100p",
                 "--delta-t", "10", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert (data["shift_low_hz"], data["shift_high_hz"]) == (-1500, 1500)


def test_drift_of_a_timer_in_words(db):
    result = run("--db", str(db), "drift", "--part", "A2", "--timer", "--period", "1s")
    assert result.exit_code == 0, result.output
    assert "−15 … 15 %" in result.stdout
    assert "whole window applies" in result.stdout


def test_drift_with_a_coil_works_out_the_tank(db):
    result = run("--db", str(db), "drift", "--part", "A1", "--f0", "3.5MHz", "--coil", "10uH", "--json")
    assert json.loads(result.stdout)["tank_pf"] == pytest.approx(206.7779)


def test_drift_without_a_tank_is_refused(db):
    result = run("--db", str(db), "drift", "--part", "A1")
    assert result.exit_code == 2
    assert "--f0" in result.stderr


@pytest.mark.parametrize("command", ["grade", "drift"])
def test_each_command_has_help_with_an_example(command):
    result = run(command, "--help")
    assert result.exit_code == 0
    assert "Example: stock" in result.stdout


def test_grade_on_an_imported_sheet_gives_the_classic_outcomes(tmp_path):
    # the project's importer and decoder end to end; EIA-198 codes and an IEC 60384-14 Y1 part
    sheet = tmp_path / "bins.csv"
    sheet.write_text("bin,marking,qty\nC1,101J C0G 50V,40\nC2,104K X7R 50V,100\n"
                     "C3,470uF 25V electrolytic,12\nC4,Y1 2.2nF 250VAC ceramic,4\n", encoding="utf-8")
    db = tmp_path / "shop.db"
    assert run("--db", str(db), "import", str(sheet)).exit_code == 0
    data = json.loads(run("--db", str(db), "grade", "--json").stdout)
    words = {p["marking"]: p["grades"] for p in data["parts"]}
    assert words["101J C0G 50V"]["tuned"] == "fit"
    assert words["104K X7R 50V"]["tuned"] == "unfit" and words["104K X7R 50V"]["bypass"] == "fit"
    assert words["470uF 25V electrolytic"]["timing"] == "unfit"
    assert words["470uF 25V electrolytic"]["bulk"] == "fit"
    assert words["Y1 2.2nF 250VAC ceramic"]["mains"] == "fit"
    assert all(w["mains"] != "fit" for m, w in words.items() if not m.startswith("Y1"))
    with open_store(db) as store:
        stored = store.rows("SELECT grade FROM grades g JOIN bins b ON b.id = g.bin_id"
                            " WHERE g.application = 'tuned' ORDER BY b.bin_key")
    assert stored[0]["grade"] == "fit"
