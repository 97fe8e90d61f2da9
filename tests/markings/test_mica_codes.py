"""Mica colour dots: EIA (white type dot), JAN/AWS (black), paper (silver), older RMA codes.

Outside sources (keys of docs/sources.md): [navy-colour-code] = US Navy manual OD 1647 (white type
dot, worked example 1200 pF ±2 %), [mica-mailing-list] = ARC5 mailing-list post quoting AWS charts AN
16-40BC224-2
(worked example 51 pF ±4 % characteristic C, 500 V DC), [rma-mica-page] = moulded-mica RMA chart (3-dot
example
red green black = 25 pF), [encyclopaedia-colour-code] = encyclopedia colour table (characteristic brown B …
green F),
[mica-colour-page] = code-chart page (three figures after the white dot, characteristic last).
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.markings.colours import decode_colours
from stock.markings.mica_codes import characteristic_dielectric, mica_readings


# Worked examples printed by the sources.
@pytest.mark.parametrize("text, pf, tol_pct, volts, code", [
    pytest.param("mica EIA white brown red black blue red", "1200", "2", None, "mica",
                 id="navy-colour-code-white-dot-1200pF-blue-2pc"),
    pytest.param("black green brown red yellow black", "51", "4", "500", "mica char. C",
                 id="mica-mailing-list-aws-51pF-4pc-char-C-500V"),
    pytest.param("mica red green black", "25", "20", "500", "mica", id="rma-mica-page-rma-three-dots-25pF"),
    pytest.param("dots red green black brown gold", "25", "5", "100", "mica",
                 id="rma-mica-page-rma-five-dots-voltage-tolerance"),
    pytest.param("mica RMA brown red orange brown gold black", "123", "5", "100", "mica",
                 id="rma-six-dots-three-figures-from-memory"),
])
def test_mica_worked_examples_decode(text, pf, tol_pct, volts, code):
    m = decode_colours(text)
    assert m.capacitance_pf == Decimal(pf)
    assert m.tolerance.plus == Decimal(tol_pct) and m.tolerance.unit == "%"
    assert m.voltage_v == (Decimal(volts) if volts else None)
    assert (m.dielectric.code if m.dielectric else None) == code


def test_an_unnamed_six_dot_code_returns_every_consistent_reading_and_says_so():
    m = decode_colours("dots: white red red brown black black")
    assert m.capacitance_pf == Decimal(22)                     # [navy-colour-code]/[mica-mailing-list] order, E12
    assert Decimal(221) in {a.capacitance_pf for a in m.alternatives}   # [mica-colour-page] order: three figures
    flag = next(f for f in m.flags if f.kind == "layout-ambiguous")
    assert "S23 order" in flag.message and "say mica EIA, JAN or RMA" in flag.message


def test_naming_the_code_removes_the_layout_doubt():
    m = decode_colours("mica JAN black green brown red yellow black")
    assert "layout-ambiguous" not in m.flag_kinds()
    assert m.capacitance_pf == Decimal(51)


def test_naming_a_code_the_dots_do_not_fit_is_a_label_conflict():
    m = decode_colours("JAN white brown red black blue red")
    assert "label-conflict" in m.flag_kinds()
    assert m.capacitance_pf == Decimal(1200)


# Characteristic letters disagree: [encyclopaedia-colour-code] brown B … green F; [mica-colour-page] classes A
# to E (shift inferred).
@pytest.mark.parametrize("colour, chosen, other", [
    pytest.param("red", "C", "B", id="red-C-per-encyclopaedia-colour-code-mica-mailing-list"),
    pytest.param("green", "F", "E", id="green-F-per-encyclopaedia-colour-code"),
])
def test_disputed_characteristic_letters_keep_both_readings(colour, chosen, other):
    m = decode_colours(f"mica JAN black green brown {colour} green black")
    assert m.dielectric.code == f"mica char. {chosen}"
    assert f"mica char. {other}" in {a.dielectric.code for a in m.alternatives if a.dielectric}
    assert any("mica characteristic" in f.message for f in m.flags if f.kind == "disputed-code")


def test_characteristic_c_is_plus_minus_200_ppm():
    # [mica-mailing-list]: characteristic C = ±200 ppm/°C
    d = characteristic_dielectric("C", "[mica-mailing-list]")
    assert (d.family, d.tempco_ppm_per_k, d.tempco_tol_ppm_per_k) == ("mica", 0, 200)


def test_yellow_tolerance_on_mica_is_flagged_as_disputed():
    # [mica-mailing-list]: yellow = ±4 % in one AWS chart, blank in another
    m = decode_colours("black green brown red yellow black")
    assert any("yellow is ±4 %" in f.message for f in m.flags if f.kind == "disputed-code")


def test_a_silver_type_dot_is_a_paper_capacitor():
    # [navy-colour-code]: paper is a silver dot
    m = decode_colours("dots silver brown black black black brown")
    assert m.dielectric.family == "paper" and m.capacitance_pf == Decimal(100)


def test_a_reading_outside_the_mica_range_is_not_offered():
    # white type dot, [mica-colour-page] order would give 120 × 10^6 pF: no moulded mica is that large
    readings, _ = mica_readings(("white", "brown", "red", "black", "blue", "red"), frozenset())
    assert [r.capacitance_pf for r in readings] == [Decimal(1200)]


def test_three_dots_are_a_mica_code_only_when_the_text_says_mica():
    assert mica_readings(("red", "green", "black"), frozenset())[0] == []
    assert mica_readings(("red", "green", "black"), frozenset({"mica"}))[0][0].voltage_v == 500
