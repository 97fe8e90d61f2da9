"""What a position asks: tempco windows, the requirement's own refusals, options typed by a user.

Sources (docs/sources.md): C0G = 0 ±30 ppm/K, U2J = −750 ±120 ppm/K, X7R a Class 2 dielectric with
no linear tempco ([EIA-198]); an old name such as N750 that states no tolerance takes that of the
EIA-198 code it is sold as (U2J, derived). Windows below are hand arithmetic: −750 ± 120 is −870…−630.
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.errors import BadValue
from stock.markings.ceramic_codes import decode_dielectric
from stock.matching.requirement import Requirement, build_requirement, parse_tempco_window, tempco_tolerance

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
    # [EIA-198]: C0G ±30, U2J ±120 ppm/K
    assert tempco_tolerance(decode_dielectric("C0G")) == D(30)
    assert tempco_tolerance(decode_dielectric("U2J")) == D(120)
    assert tempco_tolerance(None) == D(0)


def test_an_old_name_with_no_tolerance_takes_that_of_the_eia_code_it_is_sold_as():
    # derived: N750 is sold as U2J, −750 ±120 ppm/K ([EIA-198], [parameters-page])
    assert tempco_tolerance(decode_dielectric("N750")) == D(120)
    assert parse_tempco_window("N750") == (D(-870), D(-630))


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
