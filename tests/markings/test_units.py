"""Engineering formatting and parsing of user-typed values.

Sources: SI prefixes and the IEC 80000 habit of a space before the unit (reference); IEC 60062
codes for the parsing cases (docs/sources.md: [IEC 60062] letter-and-digit code, [IEC 60062] three-digit
code); voltage codes per voltage-code tables ([code-table-blog], [decoder-guide], [coding-blog-voltage]).
"""

from __future__ import annotations

from decimal import Decimal

import pytest
from hypothesis import given
from hypothesis import strategies as st

from stock.decoded import Tolerance
from stock.errors import BadValue
from stock.markings.typed_values import parse_capacitance, parse_voltage
from stock.units import (format_capacitance, format_temperature_range, format_tolerance, format_voltage,
                         parse_drift, parse_percent, parse_temperature_range)

D = Decimal

# SI prefixes (reference): pF below 1 nF, nF below 1 µF, µF below 1 F.
FORMAT_CASES = [
    pytest.param(D("0.47"), "0.47 pF", id="sub-pF"),
    pytest.param(D("4.7"), "4.7 pF", id="4.7pF"),
    pytest.param(D(100), "100 pF", id="100pF"),
    pytest.param(D(1000), "1 nF", id="1nF"),
    pytest.param(D(4700), "4.7 nF", id="4.7nF"),
    pytest.param(D(100000), "100 nF", id="100nF"),
    pytest.param(D(2200000), "2.2 µF", id="2.2uF"),
    pytest.param(D(2200000000), "2200 µF", id="2200uF"),
    pytest.param(D("1E12"), "1 F", id="1F"),
]


@pytest.mark.parametrize(("pf", "text"), FORMAT_CASES)
def test_capacitance_is_printed_in_engineering_units(pf, text):
    assert format_capacitance(pf) == text


def test_tolerances_and_voltages_are_printed_with_real_signs():
    assert format_tolerance(Tolerance(D(10), D(10), "%")) == "±10 %"
    assert format_tolerance(Tolerance(D(20), D(80), "%")) == "+80/−20 %"
    assert format_tolerance(Tolerance(D(0), D(100), "%")) == "+100/−0 %"
    assert format_tolerance(Tolerance(D("0.25"), D("0.25"), "pF")) == "±0.25 pF"
    assert format_voltage(D(100), "DC") == "100 V DC"
    assert format_voltage(D(275), "AC") == "275 V AC"
    assert format_voltage(D(1500), "DC") == "1.5 kV DC"
    assert format_temperature_range(D(10), D(85)) == "+10…+85 °C"


# Every syntax of the decoder (IEC 60062 [IEC 60062] letter-and-digit code/[IEC 60062] three-digit code;
# unit-less convention [IEC 60062] letter-and-digit code).
PARSE_CASES = [
    pytest.param("150p", D(150), id="150p"),
    pytest.param("4n7", D(4700), id="4n7"),
    pytest.param("0.1u", D(100000), id="0.1u"),
    pytest.param("0,1µF", D(100000), id="decimal-comma-micro-sign"),
    pytest.param("104", D(100000), id="104-code"),
    pytest.param("100 nF", D(100000), id="spaced-unit"),
    pytest.param(".047 MFD", D(47000), id="MFD"),
    pytest.param("4R7", D("4.7"), id="R-decimal"),
    pytest.param("2.2uF", D(2200000), id="2.2uF"),
]


@pytest.mark.parametrize(("text", "pf"), PARSE_CASES)
def test_user_values_parse_in_every_decoder_syntax(text, pf):
    assert parse_capacitance(text) == pf


@pytest.mark.parametrize("text", ["15x", "", "X7R", "104K", "abc"])
def test_unreadable_capacitance_names_the_option_and_the_text(text):
    with pytest.raises(BadValue) as caught:
        parse_capacitance(text, what="--value")
    assert str(caught.value) == (f"--value: cannot read {text!r} (expected a capacitance such as "
                                 "150p, 4n7, 0.1u, 100nF or 104)")


def test_a_typed_value_that_reads_two_ways_is_refused_with_both_readings():
    # IEC 60062 three-digit code 100 = 10 pF; printed literally 100 = 100 pF
    with pytest.raises(BadValue) as caught:
        parse_capacitance("100", what="--value")
    assert str(caught.value) == "--value: cannot read '100' (expected one value with its unit; this reads as 10pF or 100pF)"


def test_percent_parses_plain_and_signed_forms():
    assert parse_percent("5", "--tol") == 5
    assert parse_percent("±5 %", "--tol") == 5
    assert parse_percent(".5%", "--tol") == D("0.5")
    with pytest.raises(BadValue, match=r"--tol: cannot read 'five' \(expected a percentage"):
        parse_percent("five", "--tol")


@pytest.mark.parametrize(("text", "low", "high"), [
    pytest.param("0..50", D(0), D(50), id="dots"),
    pytest.param("-40..85", D(-40), D(85), id="negative"),
    pytest.param("−55…+125 °C", D(-55), D(125), id="typographic"),
    pytest.param("-25 to 70", D(-25), D(70), id="words"),
])
def test_temperature_ranges_parse(text, low, high):
    assert parse_temperature_range(text) == (low, high)


def test_temperature_range_with_ends_swapped_is_refused():
    with pytest.raises(BadValue, match=r"--temp: cannot read '50..0' \(expected a range .* \(low end first\)\)"):
        parse_temperature_range("50..0")


@pytest.mark.parametrize(("text", "volts"), [
    pytest.param("50", D(50), id="bare"),
    pytest.param("50V", D(50), id="50V"),
    pytest.param("1kV", D(1000), id="1kV"),
    pytest.param("6V3", D("6.3"), id="6V3"),
    pytest.param("2A", D(100), id="code-2A"),   # EIA code, docs/sources.md: voltage-code tables ([code-table-blog], [decoder-guide], [coding-blog-voltage]) ([code-table-blog], [coding-blog-voltage])
    pytest.param("250 VDC", D(250), id="spaced"),
])
def test_voltages_parse(text, volts):
    assert parse_voltage(text) == volts


@pytest.mark.parametrize("text", ["", "-5", "lots", "nan", "inf"])
def test_unreadable_voltage_is_refused(text):
    with pytest.raises(BadValue, match="expected a voltage such as 50, 50V, 1kV"):
        parse_voltage(text, "--volts")


@given(st.decimals(min_value=D("0.01"), max_value=D("1E13"), allow_nan=False, places=2))
def test_formatted_capacitance_parses_back_to_the_same_value(pf):
    text = format_capacitance(pf).replace(" ", "").replace("µ", "u").replace("−", "-")
    assert parse_capacitance(text) == pf


# A measured drift (SI prefixes as above; ppm = parts per million of the frequency).
@pytest.mark.parametrize(("text", "value", "unit"), [
    pytest.param("-20Hz/K", "-20", "Hz/K", id="hz-per-kelvin"),
    pytest.param("−20 Hz/K", "-20", "Hz/K", id="real-minus-and-space"),
    pytest.param("-20Hz/°C", "-20", "Hz/K", id="per-degree-is-per-kelvin"),
    pytest.param("+1.5kHz/K", "1500", "Hz/K", id="kilohertz"),            # 1.5 × 10³
    pytest.param("-3ppm/K", "-3", "ppm/K", id="ppm-per-kelvin"),
    pytest.param("-60Hz", "-60", "Hz", id="whole-shift"),
    pytest.param("-9ppm", "-9", "ppm", id="whole-shift-ppm"),
    pytest.param("250mHz/K", "0.25", "Hz/K", id="millihertz"),             # 250 × 10⁻³
])
def test_a_measured_drift_parses_with_its_unit(text, value, unit):
    assert parse_drift(text) == (D(value), unit)


@pytest.mark.parametrize("text", ["-20", "fast", "-20V/K", "-20 Hz per K", ""])
def test_a_drift_without_a_drift_unit_is_refused(text):
    with pytest.raises(BadValue, match=r"--drift: cannot read .* \(expected a drift with its unit"):
        parse_drift(text)
