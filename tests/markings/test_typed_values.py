"""Capacitances and voltages typed by a user: every accepted syntax, and errors naming what was typed.

Sources: "104" = 100 nF and "4n7" = 4.7 nF per IEC 60062 (three-digit and letter-and-digit codes);
"6V3" = 6.3 V per IEC 60062 (the unit letter as decimal point); "2A" = 100 V per the EIA voltage code
table (from memory of EIA-198 voltage codes); SI prefixes p, n, u/µ per ISO 80000-1.
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.errors import BadValue
from stock.markings.typed_values import parse_capacitance, parse_voltage


# IEC 60062 codes and SI prefixes; expected values by hand arithmetic in pF
@pytest.mark.parametrize("text, pf", [
    pytest.param("150p", Decimal(150), id="150p-is-150pF"),
    pytest.param("4n7", Decimal(4700), id="4n7-is-4700pF"),
    pytest.param("0.1u", Decimal(100_000), id="0.1u-is-100nF"),
    pytest.param("104", Decimal(100_000), id="104-is-10-times-10e4-pF"),
    pytest.param("100nF", Decimal(100_000), id="100nF"),
    pytest.param("2.2p", Decimal("2.2"), id="a-decimal-picofarad"),
    pytest.param("147p", Decimal(147), id="lower-case-p-is-the-unit"),
])
def test_a_typed_capacitance_is_read_in_picofarads(text, pf):
    assert parse_capacitance(text) == pf


@pytest.mark.parametrize("text", [
    pytest.param("15x", id="letters-that-are-no-unit"),
    pytest.param("", id="empty"),
    pytest.param("   ", id="blank"),
    pytest.param("hello", id="a-word"),
])
def test_a_typed_capacitance_that_is_no_value_is_refused_naming_it_and_the_accepted_forms(text):
    with pytest.raises(BadValue) as info:
        parse_capacitance(text, what="--value")
    message = str(info.value)
    assert message.startswith("--value: cannot read ")
    assert repr(text) in message
    assert "4n7" in message and "104" in message   # examples of what is accepted
    assert info.value.exit_code == 2


def test_the_error_names_the_column_or_option_it_was_given():
    with pytest.raises(BadValue, match=r"^Value column: cannot read 'abc'"):
        parse_capacitance("abc", what="Value column")


# IEC 60062 (R/V as decimal point), SI prefix k = 10^3, EIA voltage code 2A = 100 V (from memory)
@pytest.mark.parametrize("text, volts", [
    pytest.param("50", Decimal(50), id="a-bare-number"),
    pytest.param("50V", Decimal(50), id="with-its-unit"),
    pytest.param("1kV", Decimal(1000), id="kilovolts"),
    pytest.param("6V3", Decimal("6.3"), id="6V3-is-6.3V"),
    pytest.param("2A", Decimal(100), id="eia-code-2A-is-100V"),
    pytest.param("63", Decimal(63), id="63"),
])
def test_a_typed_voltage_is_read_in_volts(text, volts):
    assert parse_voltage(text) == volts


@pytest.mark.parametrize("text", [
    pytest.param("fifty", id="a-word"),
    pytest.param("0", id="zero"),
    pytest.param("-5", id="negative"),
    pytest.param("", id="empty"),
])
def test_a_typed_voltage_that_is_no_voltage_is_refused_naming_it_and_the_accepted_forms(text):
    with pytest.raises(BadValue) as info:
        parse_voltage(text)
    message = str(info.value)
    assert message.startswith("--voltage: cannot read ")
    assert repr(text) in message
    assert "50V" in message and "6V3" in message


def test_a_typed_value_that_reads_two_ways_is_refused_naming_both_readings():
    # "100": the IEC 60062 three-digit code gives 10 x 10^0 = 10 pF; written literally it is 100 pF
    with pytest.raises(BadValue) as info:
        parse_capacitance("100")
    assert str(info.value) == ("--value: cannot read '100' "
                               "(expected one value with its unit; this reads as 10pF or 100pF)")


def test_a_typed_value_with_a_tolerance_letter_is_refused():
    # a marking's tolerance letter (K = ±10 %, IEC 60062) is no part of a typed value
    with pytest.raises(BadValue, match=r"cannot read '104K'"):
        parse_capacitance("104K")
