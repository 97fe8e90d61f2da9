"""Two-character voltage codes and explicit voltages.

Source: the published voltage-code tables reproduced in docs/sources.md: voltage-code tables
([code-table-blog], [decoder-guide], [coding-blog-voltage])
([code-table-blog], [decoder-guide], [coding-blog-voltage]); the rows marked "memory" there are marked so
here.
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.markings.voltage_codes import VOLTAGE_MANTISSA, encode_voltage, read_voltage, voltage_code_value

D = Decimal

# Every row of the docs/sources.md: voltage-code tables ([code-table-blog], [decoder-guide],
# [coding-blog-voltage]), with the source that confirms it.
VOLTAGE_CODE_TABLE = [
    pytest.param("0E", D("2.5"), id="0E-2.5V"),    # [decoder-guide]
    pytest.param("0G", D(4), id="0G-4V"),          # [code-table-blog], [decoder-guide]
    pytest.param("0L", D("5.5"), id="0L-5.5V"),    # [code-table-blog], [decoder-guide]
    pytest.param("0J", D("6.3"), id="0J-6.3V"),    # [code-table-blog], [decoder-guide]
    pytest.param("1A", D(10), id="1A-10V"),        # [code-table-blog], [decoder-guide]
    pytest.param("1C", D(16), id="1C-16V"),        # [code-table-blog], [decoder-guide]
    pytest.param("1D", D(20), id="1D-20V"),        # [decoder-guide]
    pytest.param("1E", D(25), id="1E-25V"),        # [code-table-blog], [decoder-guide]
    pytest.param("1V", D(35), id="1V-35V"),        # [decoder-guide]
    pytest.param("1G", D(40), id="1G-40V"),        # [decoder-guide]
    pytest.param("1H", D(50), id="1H-50V"),        # [code-table-blog], [decoder-guide], [coding-blog-voltage]
    pytest.param("1J", D(63), id="1J-63V"),        # [code-table-blog], [decoder-guide]
    pytest.param("1K", D(80), id="1K-80V"),        # [code-table-blog]
    pytest.param("1N", D(75), id="1N-75V"),        # from memory (one maker's table)
    pytest.param("2A", D(100), id="2A-100V"),      # [code-table-blog], [coding-blog-voltage]
    pytest.param("2Q", D(110), id="2Q-110V"),      # [code-table-blog]
    pytest.param("2B", D(125), id="2B-125V"),      # [code-table-blog]
    pytest.param("2T", D(150), id="2T-150V"),      # [coding-blog-voltage] (reader comment)
    pytest.param("2C", D(160), id="2C-160V"),      # [code-table-blog]
    pytest.param("2Z", D(180), id="2Z-180V"),      # [code-table-blog]
    pytest.param("2D", D(200), id="2D-200V"),      # [code-table-blog], [coding-blog-voltage]
    pytest.param("2P", D(220), id="2P-220V"),      # [code-table-blog]
    pytest.param("2E", D(250), id="2E-250V"),      # [code-table-blog], [decoder-guide], [coding-blog-voltage]
    pytest.param("2F", D(315), id="2F-315V"),      # [code-table-blog], [decoder-guide]
    pytest.param("2V", D(350), id="2V-350V"),      # [code-table-blog], [decoder-guide]
    pytest.param("2G", D(400), id="2G-400V"),      # [code-table-blog], [decoder-guide], [coding-blog-voltage]
    pytest.param("2W", D(450), id="2W-450V"),      # [code-table-blog], [decoder-guide]
    pytest.param("2H", D(500), id="2H-500V"),      # [code-table-blog]
    pytest.param("2J", D(630), id="2J-630V"),      # [code-table-blog], [decoder-guide], [coding-blog-voltage]
    pytest.param("2K", D(800), id="2K-800V"),      # [decoder-guide]
    pytest.param("3A", D(1000), id="3A-1kV"),      # [code-table-blog], [decoder-guide]
    pytest.param("3L", D(1200), id="3L-1.2kV"),    # [decoder-guide]
    pytest.param("3B", D(1250), id="3B-1.25kV"),   # [decoder-guide]
    pytest.param("3C", D(1600), id="3C-1.6kV"),    # from memory (rule)
    pytest.param("3D", D(2000), id="3D-2kV"),      # from memory (rule)
    pytest.param("3E", D(2500), id="3E-2.5kV"),    # from memory (rule)
    pytest.param("3F", D(3150), id="3F-3.15kV"),   # from memory (rule)
    pytest.param("3G", D(4000), id="3G-4kV"),      # from memory (rule)
    pytest.param("3H", D(5000), id="3H-5kV"),      # from memory (rule)
]


@pytest.mark.parametrize(("code", "volts"), VOLTAGE_CODE_TABLE)
def test_every_published_voltage_code_decodes(code, volts):
    assert voltage_code_value(code) == volts
    assert voltage_code_value(code.lower()) == volts


@pytest.mark.parametrize(("code", "volts"), VOLTAGE_CODE_TABLE)
def test_every_published_voltage_encodes_back_to_its_code(code, volts):
    assert encode_voltage(volts) == code


def test_every_mantissa_letter_appears_in_the_published_table():
    published = {p.values[0][1] for p in VOLTAGE_CODE_TABLE}
    assert set(VOLTAGE_MANTISSA) == published


@pytest.mark.parametrize("code", ["2X", "4A", "1I", "A1", "22", "1", ""])
def test_codes_outside_the_table_give_none(code):
    assert voltage_code_value(code) is None


# Explicit voltages as printed on parts ( common practice for WV and ~).
EXPLICIT_CASES = [
    pytest.param("50V", D(50), None, id="50V"),
    pytest.param("1kV", D(1000), None, id="1kV"),
    pytest.param("1KV", D(1000), None, id="1KV"),
    pytest.param("250VDC", D(250), "DC", id="250VDC"),
    pytest.param("275VAC", D(275), "AC", id="275VAC"),
    pytest.param("250V~", D(250), "AC", id="250V-tilde"),
    pytest.param("63WV", D(63), "DC", id="working-volts"),
    pytest.param("6V3", D("6.3"), None, id="6V3"),
    pytest.param("6.3V", D("6.3"), None, id="6.3V"),
    pytest.param("1.5kV", D(1500), None, id="1.5kV"),
]


@pytest.mark.parametrize(("text", "volts", "kind"), EXPLICIT_CASES)
def test_explicit_voltages_keep_their_kind(text, volts, kind):
    assert read_voltage(text) == (volts, kind)


@pytest.mark.parametrize("text", ["V", "0V", "50", "X7R", "6.3V3", "1kV3"])
def test_text_that_is_no_voltage_gives_none(text):
    assert read_voltage(text) is None
