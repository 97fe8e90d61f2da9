"""What a position asks and whether one part meets it: value bands, tempco windows, safety, quantity.

Sources: three-digit codes and tolerance letters J = ±5 %, K = ±10 %, M = ±20 % (IEC 60062);
C0G = 0 ±30 ppm/K, U2J = −750 ±120 ppm/K, X7R a Class 2 dielectric with no linear tempco (EIA-198);
X classes go line to line and Y classes line to earth, and a part with no class goes in neither
(IEC 60384-14). Bands below are hand arithmetic: 150 pF ±5 % is 142.5…157.5 pF.
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.errors import BadValue
from stock.markings.decoder import decode
from stock.matching.requirement import (Requirement, Stocked, build_requirement, check_part, check_single,
                                        check_tempco, check_value, parse_tempco_window, tempco_tolerance,
                                        window_text)
from stock.markings.ceramic_codes import decode_dielectric

D = Decimal


# windows by hand; codes from EIA-198
@pytest.mark.parametrize("text, window", [
    pytest.param("0±30", (D(-30), D(30)), id="plus-minus"),
    pytest.param("-750±120", (D(-870), D(-630)), id="negative-middle"),
    pytest.param("−150 +/- 60 ppm/K", (D(-210), D(-90)), id="true-minus-and-ascii-plus-minus"),
    pytest.param("-100..50", (D(-100), D(50)), id="a-range"),
    pytest.param("C0G", (D(-30), D(30)), id="c0g-is-0-pm-30"),
    pytest.param("U2J", (D(-870), D(-630)), id="u2j-is-minus-750-pm-120"),
])
def test_a_tempco_window_reads_as_low_and_high_ppm_per_kelvin(text, window):
    assert parse_tempco_window(text) == window


@pytest.mark.parametrize("text, accepted", [
    pytest.param("100..-100", "a window whose low end is below its high end", id="reversed-range"),
    pytest.param("X7R", "a Class 1 code such as C0G", id="class-2-has-no-linear-tempco"),
    pytest.param("warm", "a window such as 0±30", id="a-word"),
])
def test_a_tempco_that_is_no_window_is_refused_naming_it_and_what_is_accepted(text, accepted):
    with pytest.raises(BadValue) as info:
        parse_tempco_window(text)
    assert f"--tempco: cannot read {text!r}" in str(info.value)
    assert accepted in str(info.value)


def test_the_tempco_tolerance_is_the_marked_one():
    # EIA-198: C0G ±30, U2J ±120 ppm/K
    assert tempco_tolerance(decode_dielectric("C0G")) == D(30)
    assert tempco_tolerance(decode_dielectric("U2J")) == D(120)
    assert tempco_tolerance(None) == D(0)


@pytest.mark.parametrize("window, text", [
    pytest.param((D(-330), D(-270)), "−330…−270 ppm/K", id="both-ends"),
    pytest.param((D("-Infinity"), D(100)), "≤ 100 ppm/K", id="only-a-ceiling"),
    pytest.param((D(0), D("Infinity")), "≥ 0 ppm/K", id="only-a-floor"),
])
def test_a_window_in_words(window, text):
    assert window_text(window) == text


@pytest.mark.parametrize("fields, option, accepted", [
    pytest.param({"capacitance_pf": D(0)}, "--value", "a capacitance above zero", id="zero-value"),
    pytest.param({"tol_pct": D(0)}, "--tol", "between 0 and 100 %", id="zero-tolerance"),
    pytest.param({"tol_pct": D(100)}, "--tol", "between 0 and 100 %", id="hundred-percent"),
    pytest.param({"qty": 0}, "--qty", "a quantity of 1 or more", id="zero-quantity"),
    pytest.param({"working_v": D(2_000_000)}, "--volts", "up to 1,000,000 V", id="two-megavolts"),
    pytest.param({"application": "rocket"}, "--use", "tuned", id="unknown-application"),
    pytest.param({"safety_class": "Z9"}, "--safety", "X1Y2", id="unknown-safety-class"),
    pytest.param({"position": "roof"}, "--position", "line-earth", id="unknown-position"),
    pytest.param({"tempco_min": D(10), "tempco_max": D(-10)}, "--tempco", "low end is below",
                 id="reversed-window"),
    pytest.param({"max_abs_tempco": D(-1)}, "--max-tempco", "0 ppm/K or more", id="negative-magnitude"),
])
def test_a_requirement_that_cannot_be_met_by_anything_is_refused_naming_the_option(fields, option, accepted):
    args = {"capacitance_pf": D(150)} | fields
    with pytest.raises(BadValue) as info:
        Requirement(**args)
    assert str(info.value).startswith(f"{option}: cannot read ")
    assert accepted in str(info.value)


# 150 pF ±5 % is 142.5…157.5 pF (hand arithmetic); part bands by IEC 60062 letters
@pytest.mark.parametrize("marking, ok, failed", [
    pytest.param("151J", True, None, id="150pF-J-band-equals-the-window"),
    pytest.param("151K", False, "tolerance", id="150pF-K-may-deliver-135-to-165"),
    pytest.param("151", False, "tolerance", id="no-marked-tolerance-cannot-promise"),
    pytest.param("161J", False, "tolerance", id="160pF-J-reaches-168"),
])
def test_a_single_parts_whole_band_must_lie_inside_the_required_band(marking, ok, failed):
    verdict = check_value(decode(marking), Requirement(D(150), tol_pct=D(5)))
    assert (verdict.ok, verdict.failed) == (ok, failed)


def test_the_failed_band_is_explained_in_picofarads():
    verdict = check_value(decode("151K"), Requirement(D(150), tol_pct=D(5)))
    assert verdict.reasons == ("150 pF ±10 % may deliver 135 pF…165 pF, outside 142.5 pF…157.5 pF",)


def test_without_a_tolerance_the_nominal_must_be_within_one_percent():
    # common practice, no published source: "the same value" within 1 %
    assert check_value(decode("151"), Requirement(D(150))).ok
    verdict = check_value(decode("161J"), Requirement(D(150)))
    assert (verdict.ok, verdict.reasons) == (False, ("160 pF is not 150 pF",))


@pytest.mark.parametrize("marking, ok", [
    pytest.param("101J C0G", True, id="c0g-in-a-c0g-window"),
    pytest.param("101J U2J", False, id="u2j-outside-a-c0g-window"),
    pytest.param("104K 50V X7R", False, id="class-2-has-no-linear-tempco"),
])
def test_a_parts_tempco_band_must_lie_in_the_window(marking, ok):
    req = Requirement(D(100), tempco_min=D(-30), tempco_max=D(30))
    assert check_tempco(decode(marking), req).ok is ok


def test_a_part_without_a_safety_class_is_never_offered_for_mains():
    # IEC 60384-14: only X/Y rated parts go across the mains or to earth
    verdict = check_part(decode("104K 50V X7R"), Requirement(D(100_000), application="mains"), working_v=None)
    assert (verdict.ok, verdict.failed) == (False, "safety")
    assert "no X/Y safety class" in verdict.reasons[0]


def test_an_x_class_part_may_not_take_a_line_to_earth_position():
    req = Requirement(D(100_000), application="mains", position="line-earth")
    verdict = check_part(decode("X2 104K 275VAC"), req, working_v=None)
    assert verdict.failed == "safety"
    assert "line–earth position needs a Y class" in verdict.reasons[0]


def test_a_part_for_the_wrong_family_is_refused_naming_both():
    req = Requirement(D(100), family="ceramic", dielectric_code=None)
    verdict = check_part(decode("X2 104K 275VAC"), req, working_v=None)
    assert verdict.failed == "family"
    assert verdict.reasons[0].endswith("not ceramic")


def _stocked(marking, on_hand, reserved=0):
    return Stocked(bin_id=1, bin_key="/j1", location="J1", on_hand=on_hand, reserved=reserved,
                   marking=decode(marking))


@pytest.mark.parametrize("on_hand, reserved, qty, ok, reason", [
    pytest.param(5, 0, 4, True, "5 available", id="enough"),
    pytest.param(5, 3, 4, False, "2 available, 4 needed", id="reserved-parts-are-not-available"),
    pytest.param(None, 0, 1, False, "0 available, 1 needed", id="an-uncounted-bin-promises-nothing"),
    pytest.param(5, 1, 4, True, "4 available (1 reserved)", id="exactly-enough-after-reservations"),
])
def test_a_single_part_must_also_be_there_in_the_quantity_asked(on_hand, reserved, qty, ok, reason):
    verdict = check_single(_stocked("151J", on_hand, reserved), Requirement(D(150), tol_pct=D(5), qty=qty))
    assert verdict.ok is ok
    assert verdict.reasons[-1] == reason


def test_a_requirement_built_from_typed_options_says_itself_in_words():
    req = build_requirement(value="4n7", tol="10%", volts="100", qty=3, temp="-20..70")
    assert req.capacitance_pf == D(4700)
    assert req.describe() == "3 × 4.7 nF ±10 %, ≥ 100 V, −20…+70 °C"
    assert req.to_json()["description"] == req.describe()


@pytest.mark.parametrize("options, option", [
    pytest.param({"value": "lots"}, "--value", id="bad-value"),
    pytest.param({"value": "4n7", "tol": "tight"}, "--tol", id="bad-tolerance"),
    pytest.param({"value": "4n7", "volts": "high"}, "--volts", id="bad-voltage"),
    pytest.param({"value": "4n7", "max_tempco": "small"}, "--max-tempco", id="bad-magnitude"),
    pytest.param({"value": "4n7", "use": "rocket"}, "--use", id="bad-application"),
])
def test_typed_options_that_do_not_read_are_refused_naming_the_option(options, option):
    with pytest.raises(BadValue) as info:
        build_requirement(**options)
    assert str(info.value).startswith(f"{option}: cannot read ")
