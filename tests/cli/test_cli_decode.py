"""`stock decode`: the JSON contract and the human line in engineering units.

Expected values come from IEC 60062 (value and tolerance codes), EIA-198 (X7R) and the voltage-code
table (2A = 100 V) as reproduced in docs/sources.md.
"""

from __future__ import annotations

import json

import pytest
from typer.testing import CliRunner

from stock.cli import app

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1"}
EXAMPLE_MARKINGS = ["104K 2A X7R", "4n7 J 100V", "47pF NP0", "223Z", "1R5C", "0.01 1KV Z5U", "u1 63V polyester",
                  "C0G 100 50V", "N750 33p", "2200uF 25V 105C", "X2 0.1uF 275VAC", "10uF 16V tantalum +",
                  ".047 MFD 600V"]
TOP_KEYS = {"text", "capacitance_pf", "tolerance", "voltage_v", "voltage_kind", "dielectric", "safety_class",
            "polarity", "rated_temp_c", "alternatives", "flags", "unparsed"}
DIELECTRIC_KEYS = {"code", "family", "class", "tempco_ppm_per_k", "tempco_tol_ppm_per_k", "temp_min_c",
                   "temp_max_c", "change_minus_pct", "change_plus_pct"}
NUMBER = (int, float)


def run(*args: str):
    return CliRunner().invoke(app, ["decode", *args], env=ENV, catch_exceptions=False)


def check_shape(obj: dict) -> None:
    """The JSON contract, key by key and type by type."""
    assert TOP_KEYS <= set(obj)
    assert isinstance(obj["text"], str)
    for key in ("capacitance_pf", "voltage_v", "rated_temp_c"):
        assert obj[key] is None or isinstance(obj[key], NUMBER)
    tol = obj["tolerance"]
    assert tol is None or (isinstance(tol["minus"], NUMBER) and isinstance(tol["plus"], NUMBER)
                           and tol["unit"] in ("%", "pF") and tol["minus"] >= 0 and tol["plus"] >= 0)
    assert obj["voltage_kind"] in (None, "DC", "AC")
    diel = obj["dielectric"]
    if diel is not None:
        assert DIELECTRIC_KEYS <= set(diel)
        assert isinstance(diel["code"], str) and isinstance(diel["family"], str)
        assert diel["class"] in (1, 2, None)
        for key in DIELECTRIC_KEYS - {"code", "family", "class"}:
            assert diel[key] is None or isinstance(diel[key], NUMBER)
    assert obj["safety_class"] is None or isinstance(obj["safety_class"], str)
    assert obj["polarity"] in (None, "positive-marked", "negative-marked")
    for alt in obj["alternatives"]:
        assert {"capacitance_pf", "tolerance", "reason"} <= set(alt) and isinstance(alt["reason"], str)
    for flag in obj["flags"]:
        assert set(flag) == {"kind", "message"}
    assert all(isinstance(u, str) for u in obj["unparsed"])


def test_json_gives_one_object_per_text_in_the_contract_shape():
    result = run(*EXAMPLE_MARKINGS, "", "\x07", "47K", "--json")
    assert result.exit_code == 0
    lines = result.stdout.splitlines()
    assert len(lines) == len(EXAMPLE_MARKINGS) + 3
    objects = [json.loads(line) for line in lines]
    for text, obj in zip([*EXAMPLE_MARKINGS, "", "\x07", "47K"], objects):
        check_shape(obj)
        assert obj["text"] == text


def test_json_values_of_the_first_example():
    obj = json.loads(run("104K 2A X7R", "--json").stdout)
    assert obj["capacitance_pf"] == 100000.0
    assert obj["tolerance"] == {"minus": 10.0, "plus": 10.0, "unit": "%"}
    assert (obj["voltage_v"], obj["voltage_kind"]) == (100.0, "DC")
    assert obj["dielectric"]["code"] == "X7R" and obj["dielectric"]["class"] == 2
    assert (obj["dielectric"]["temp_min_c"], obj["dielectric"]["temp_max_c"]) == (-55.0, 125.0)


def test_json_of_asymmetric_tolerance_has_magnitudes():
    obj = json.loads(run("223Z", "--json").stdout)
    assert obj["tolerance"] == {"minus": 20.0, "plus": 80.0, "unit": "%"}


def test_human_output_is_one_line_per_marking_then_indented_flags():
    result = run("104K 2A X7R", "C0G 100 50V")
    assert result.exit_code == 0
    lines = result.stdout.splitlines()
    assert lines[0] == "104K 2A X7R\t100 nF ±10 %  100 V DC  X7R (−55…+125 °C, ±15 %)"
    assert lines[1] == "C0G 100 50V\t10 pF  50 V DC  C0G (0 ±30 ppm/K)"
    assert lines[2].startswith("    ambiguous-code: 100: three-digit code 10 pF or 100 pF")


def test_mains_part_prints_the_safety_caution():
    result = run("X2 0.1uF 275VAC")
    assert "caution: mains work can kill" in result.stdout
    assert "local electrical codes" in result.stdout


@pytest.mark.parametrize("args", [["--help"]])
def test_decode_has_help_with_an_example(args):
    result = run(*args)
    assert result.exit_code == 0
    assert 'stock decode "104K 2A X7R"' in result.stdout


def test_colours_option_uses_the_colour_decoder():
    result = run("--colours", "brown black yellow", "--json")
    assert result.exit_code == 0
    obj = json.loads(result.stdout)
    check_shape(obj)
    assert obj["capacitance_pf"] == 100000.0   # brown 1, black 0, yellow ×10⁴ pF (IEC 60062 colour code)


def test_no_text_is_a_usage_error():
    assert run().exit_code == 2
