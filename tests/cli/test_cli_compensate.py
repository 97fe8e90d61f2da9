"""Tests for `stock compensate`: the bench answer, the JSON contract, and one clear line for bad input.

Outside source: the LC resonance formula (Δf/f = −½·ΔC/C; TC_eff = −2·(Δf/f)/ΔT), worked by
hand in each comment; old tempco names take the tolerance of their EIA-198 code per
the old names' EIA-198 codes in docs/sources.md ([EIA-198], [parameters-page]: N150 = P2G ±30,
N750 = U2J ±120 ppm/K). The shelf is our own (Heron Lane
Workshop, fictional), imported through `stock import`.
"""

from __future__ import annotations

import json

import pytest
from typer.testing import CliRunner

from stock.cli import app

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1", "NO_COLOR": "1"}
runner = CliRunner()

HERON_SHELF = """Drawer;Value;Dielectric;Qty
H1;8.2pF;N150;6
H2;12pF;N150;9
H3;2.7pF;N750;15
H4;33pF;N750;4
H5;18pF;P100;5
H6;47pF;C0G;30
"""


@pytest.fixture
def db(tmp_path):
    sheet = tmp_path / "heron_lane.csv"
    sheet.write_text(HERON_SHELF, encoding="utf-8")
    path = str(tmp_path / "heron.db")
    result = runner.invoke(app, ["--db", path, "import", str(sheet)], env=ENV)
    assert result.exit_code == 0, result.output
    return path


def run(db, *args):
    return runner.invoke(app, ["--db", db, "compensate", *args], env=ENV)


def test_compensate_has_help_with_an_example():
    result = runner.invoke(app, ["compensate", "--help"], env=ENV)
    assert result.exit_code == 0
    assert "Example: stock compensate --f0 7MHz --tank 300p --drift -20Hz/K" in result.stdout


def test_the_answer_reads_as_a_bench_instruction(db):
    result = run(db, "--f0", "7MHz", "--tank", "300p", "--drift", "-20Hz/K")
    assert result.exit_code == 0, result.output
    out = result.stdout
    # TC_eff = −2·(−20/7) = +5.714 ppm/K; −TC_eff·C = −1714.3 pF·ppm/K
    assert "TC_eff = −2·(Δf/f)/ΔT = +5.714 ppm/K" in out
    assert "−1714.3 pF·ppm/K" in out
    # N150 slice 11.43 pF: 12 pF leaves −½·(5.714 − 6) = +0.143 ppm/K = +1.0 Hz/K,
    # band ±½·12·30/300 = ±0.6 ppm/K → −3.2 … +5.2 Hz/K
    assert ("take out 12 pF of C0G, fit 12 pF N150 from bin heron_lane/h2: drift −20 → +1.0 Hz/K "
            "(band −3.2 … +5.2)") in out
    # N750 slice 2.286 pF: 2.7 pF leaves −½·(5.714 − 6.75) = +0.518 ppm/K = +3.6 Hz/K
    assert "fit 2.7 pF N750 from bin heron_lane/h3: drift −20 → +3.6 Hz/K" in out
    assert "adds to this drift: cancelling it needs a negative tempco" in out   # the P100 drawer
    assert "N150 marks no tolerance: ±30 ppm/K, that of P2G" in out
    assert "caution: warm the box again" in out and "re-trimming" in out


def test_a_whole_shift_over_a_warming_is_the_same_drift(db):
    per_k = run(db, "--f0", "7MHz", "--tank", "300p", "--drift", "-20Hz/K", "--json")
    whole = run(db, "--f0", "7MHz", "--tank", "300p", "--drift", "-60Hz", "--delta-t", "3", "--json")
    a, b = json.loads(per_k.stdout), json.loads(whole.stdout)
    assert a["tank"]["drift_hz_per_k"] == pytest.approx(-20) == b["tank"]["drift_hz_per_k"]   # −60 / 3
    assert a["options"][0]["parts"] == b["options"][0]["parts"]
    assert b["inputs"]["delta_t"] == "3"


def test_a_coil_gives_the_total(db):
    result = run(db, "--f0", "7MHz", "--coil", "4.7uH", "--drift", "-3ppm/K", "--json")
    data = json.loads(result.stdout)
    # C = 1/((2π·7 MHz)²·4.7 µH) = 109.988 pF; −3 ppm/K = −21 Hz/K at 7 MHz
    assert data["tank"]["c_total_pf"] == pytest.approx(109.988, abs=0.001)
    assert data["tank"]["c_total_from"] == "coil"
    assert data["tank"]["drift_hz_per_k"] == pytest.approx(-21)


def test_the_json_carries_parts_slice_residual_and_band(db):
    result = run(db, "--f0", "7MHz", "--tank", "300p", "--drift", "-20Hz/K", "--json")
    data = json.loads(result.stdout)
    assert set(data) >= {"inputs", "tank", "tempcos", "options", "buy", "explanation", "assumptions", "cautions"}
    best = data["options"][0]
    assert best["parts"][0]["bin"] == "heron_lane/h2" and best["parts"][0]["capacitance_pf"] == 12
    assert best["parts"][0]["tempco"] == "N150" and best["parts"][0]["tempco_ppm_per_k"] == -150
    assert best["cx_pf"] == pytest.approx(11.428571, abs=1e-6)            # 1714.2857 / 150
    assert best["residual_hz_per_k"] == pytest.approx(1.0)                # see the bench-line test
    assert best["residual_band_hz_per_k"] == pytest.approx([-3.2, 5.2])
    assert best["residual_ppm_per_k"] == pytest.approx(0.142857, abs=1e-6)


def test_a_positive_drift_is_answered_with_the_P_part(db):
    result = run(db, "--f0", "7MHz", "--tank", "300p", "--drift", "+20Hz/K")
    # P100 slice 17.14 pF; 18 pF leaves −½·(−5.714 + 6) = −0.143 ppm/K = −1.0 Hz/K
    assert "fit 18 pF P100 from bin heron_lane/h5: drift +20 → −1.0 Hz/K" in result.stdout
    assert "positive-tempco (P) parts cancel it" in result.stdout


@pytest.mark.parametrize("args, words", [
    pytest.param(["--f0", "7MHz", "--drift", "-20Hz/K"], "--tank/--coil: neither was given", id="no-tank"),
    pytest.param(["--f0", "7MHz", "--tank", "300p", "--coil", "4.7uH", "--drift", "-20Hz/K"],
                 "--tank/--coil: both were given", id="tank-and-coil"),
    pytest.param(["--f0", "0", "--tank", "300p", "--drift", "-20Hz/K"], "--f0: cannot read '0'", id="zero-f0"),
    pytest.param(["--f0", "-7MHz", "--tank", "300p", "--drift", "-20Hz/K"], "--f0: cannot read '-7MHz'",
                 id="negative-f0"),
    pytest.param(["--f0", "7MHz", "--tank", "300p", "--drift", "-20"],
                 "--drift: cannot read '-20' (expected a drift with its unit", id="drift-without-unit"),
    pytest.param(["--f0", "7MHz", "--tank", "300p", "--drift", "-60Hz"],
                 "--drift/--delta-t: a whole shift (Hz) needs the warming it took", id="shift-without-delta-t"),
    pytest.param(["--f0", "7MHz", "--tank", "0p", "--drift", "-20Hz/K"], "--tank", id="zero-tank"),
    pytest.param(["--f0", "7MHz", "--tank", "300p", "--drift", "-20Hz/K", "--tank-tempco", "X7R"],
                 "--tank-tempco: cannot read 'X7R'", id="class-2-slice"),
])
def test_bad_input_is_one_line_with_exit_code_2(db, args, words):
    result = run(db, *args)
    assert result.exit_code == 2, result.output
    assert result.stderr.strip().count("\n") == 0
    assert words in result.stderr
