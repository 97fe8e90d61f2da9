"""IEC 60062 value codes: three-digit code, letter-and-digit code, values with units, unit-less values.

Sources: IEC 60062 as reproduced in (docs/sources.md: [IEC 60062] letter-and-digit code, [IEC 60062]
three-digit code) and its worked
examples; the eseries library (IEC 60063) as an outside oracle for the round trip.
"""

from __future__ import annotations

from decimal import Decimal

import eseries
import pytest
from hypothesis import given
from hypothesis import strategies as st

from stock.markings.decoder import decode
from stock.markings.value_codes import encode_three_digit, read_value, three_digit_value

# IEC 60062 three-digit code, worked examples of the reference tables ([IEC 60062] three-digit code,
# [code-table-blog], [decoder-guide], [german-table-page]).
THREE_DIGIT_CASES = [
    pytest.param("104", Decimal(100000), id="104-is-100nF"),
    pytest.param("479", Decimal("4.7"), id="479-is-4.7pF"),
    pytest.param("478", Decimal("0.47"), id="478-is-0.47pF"),
    pytest.param("108", Decimal("0.1"), id="108-is-0.1pF"),
    pytest.param("223", Decimal(22000), id="223-is-22nF"),
    pytest.param("471", Decimal(470), id="471-is-470pF"),
    pytest.param("105", Decimal(1000000), id="105-is-1uF"),
    pytest.param("226", Decimal(22000000), id="226-is-22uF"),
    pytest.param("109", Decimal(1), id="109-is-1pF"),
]


@pytest.mark.parametrize(("code", "pf"), THREE_DIGIT_CASES)
def test_three_digit_code_gives_two_figures_times_the_multiplier(code, pf):
    assert three_digit_value(code) == pf
    assert read_value(code).chosen.capacitance_pf == pf


# IEC 60062 letter-and-digit code ([IEC 60062] letter-and-digit code, [encyclopaedia-rkm],
# [colour-tutorial-a]) and R as the decimal point ([code-table-blog], [decoder-guide]).
LETTER_CASES = [
    pytest.param("p47", Decimal("0.47"), id="p47-is-0.47pF"),
    pytest.param("4p7", Decimal("4.7"), id="4p7-is-4.7pF"),
    pytest.param("47p", Decimal(47), id="47p-is-47pF"),
    pytest.param("n47", Decimal(470), id="n47-is-470pF"),
    pytest.param("4n7", Decimal(4700), id="4n7-is-4.7nF"),
    pytest.param("47n", Decimal(47000), id="47n-is-47nF"),
    pytest.param("2u2", Decimal(2200000), id="2u2-is-2.2uF"),
    pytest.param("µ1", None, id="micro-sign-needs-cleaning-first"),
    pytest.param("u1", Decimal(100000), id="u1-is-100nF"),
    pytest.param("4m7", Decimal(4700000000), id="4m7-is-4.7mF"),
    pytest.param("4F7", Decimal("4.7E12"), id="4F7-is-4.7F"),
    pytest.param("4R7", Decimal("4.7"), id="4R7-is-4.7pF"),
    pytest.param("0R5", Decimal("0.5"), id="0R5-is-0.5pF"),
    pytest.param("4N7", Decimal(4700), id="upper-case-N-is-nano"),
    pytest.param("3K3", Decimal(3300), id="older-US-3K3-is-3.3nF"),   # from memory of older US makers' practice ([old-us-letter-codes])
]


@pytest.mark.parametrize(("token", "pf"), LETTER_CASES)
def test_letter_and_digit_code_puts_the_prefix_where_the_point_is(token, pf):
    reading = read_value(token)
    if pf is None:
        assert reading is None
    else:
        assert reading.chosen.capacitance_pf == pf


# Values with units, including the old MFD / mmfd spellings ([IEC 60062] letter-and-digit code; from memory of
# US practice).
UNIT_CASES = [
    pytest.param("47pF", Decimal(47), id="47pF"),
    pytest.param("100nF", Decimal(100000), id="100nF"),
    pytest.param("0.1uF", Decimal(100000), id="0.1uF"),
    pytest.param("2200uF", Decimal(2200000000), id="2200uF"),
    pytest.param(".047MFD", Decimal(47000), id="047MFD-is-47nF"),
    pytest.param("10mmfd", Decimal(10), id="mmfd-is-pF"),
    pytest.param("100uuF", Decimal(100), id="micromicrofarad-is-pF"),
    pytest.param("4.7mF", Decimal(4700000000), id="SI-mF-is-millifarad"),
    pytest.param("1F", Decimal("1E12"), id="1F-double-layer"),
]


@pytest.mark.parametrize(("token", "pf"), UNIT_CASES)
def test_values_with_units_decode_exactly(token, pf):
    assert read_value(token).chosen.capacitance_pf == pf


def test_upper_case_mf_is_read_as_microfarad_with_a_doubt():
    # from memory of older US parts: "MF" = microfarad; SI "mF" = millifarad
    reading = read_value("10MF")
    assert reading.chosen.capacitance_pf == Decimal(10000000)
    assert reading.others[0].capacitance_pf == Decimal(10000000000)
    assert [f.kind for f in reading.flags] == ["ambiguous-code"]


# Unit-less convention ([IEC 60062] letter-and-digit code, [german-training-page], [code-table-blog],
# [german-table-page]): whole numbers are pF, decimals are µF.
UNITLESS_CASES = [
    pytest.param("47", Decimal(47), id="47-is-47pF"),
    pytest.param("1000", Decimal(1000), id="1000-is-1000pF"),
    pytest.param(".1", Decimal(100000), id="point-1-is-100nF"),
    pytest.param("0.047", Decimal(47000), id="0.047-is-47nF"),
]


@pytest.mark.parametrize(("token", "pf"), UNITLESS_CASES)
def test_unitless_values_follow_the_old_convention_and_are_flagged(token, pf):
    reading = read_value(token)
    assert reading.chosen.capacitance_pf == pf
    assert "unit-assumed" in {f.kind for f in reading.flags}


def test_unitless_whole_number_on_an_electrolytic_is_microfarad():
    # common practice, no published source: "2200" on a can is never 2200 pF
    reading = read_value("2200", family="aluminium-electrolytic")
    assert reading.chosen.capacitance_pf == Decimal(2200000000)
    assert reading.others[0].capacitance_pf == Decimal(2200)


# A three-digit code ending in 0 is also a literal number of pF (docs/sources.md: [IEC 60062] three-digit
# code).
@pytest.mark.parametrize(("code", "as_code", "literal"), [
    pytest.param("100", Decimal(10), Decimal(100), id="100"),
    pytest.param("470", Decimal(47), Decimal(470), id="470"),
    pytest.param("220", Decimal(22), Decimal(220), id="220"),
])
def test_three_digits_ending_in_zero_offer_both_readings(code, as_code, literal):
    reading = read_value(code)
    assert [c.capacitance_pf for c in reading.candidates] == [as_code, literal]
    assert "ambiguous-code" in {f.kind for f in reading.flags}


def test_two_digits_and_k_are_ambiguous_between_iec_and_older_us_practice():
    # IEC 60062 via [german-training-page]: 47 pF ±10 %; older US makers' practice
    # ([old-us-letter-codes]): 47 nF
    reading = read_value("47K")
    assert reading.chosen.capacitance_pf == Decimal(47)
    assert reading.chosen.tolerance_letter == "K"
    assert reading.others[0].capacitance_pf == Decimal(47000)


def test_multiplier_digit_seven_is_disputed_except_on_tantalum():
    # docs/sources.md: [IEC 60062] three-digit code: 7 "not used" ([code-table-blog], [decoder-guide]);
    # tantalum chips print 107 = 100 µF (common practice)
    assert "disputed-code" in {f.kind for f in read_value("107").flags}
    tantalum = read_value("107", family="tantalum")
    assert tantalum.chosen.capacitance_pf == Decimal(100000000)
    assert not tantalum.flags


@pytest.mark.parametrize("token", ["X7R", "abc", "", "000", "0", "0.0", "p", "12345678"])
def test_tokens_that_are_no_value_give_none(token):
    assert read_value(token) is None


def _e24_values_1pf_to_10uf() -> list[Decimal]:
    """Every E24 value from 1 pF to 10 µF, the figures taken from the eseries library (IEC 60063)."""
    figures = eseries.series(eseries.E24)
    return [Decimal(f).scaleb(exp) for exp in range(-1, 6) for f in figures] + [Decimal(10000000)]


E24_PF = _e24_values_1pf_to_10uf()


def test_e24_list_from_eseries_spans_1pf_to_10uf():
    assert E24_PF[0] == 1 and E24_PF[-1] == Decimal(10000000) and len(E24_PF) == 24 * 7 + 1


@given(st.sampled_from(E24_PF))
def test_every_e24_value_survives_the_three_digit_code(pf):
    code = encode_three_digit(pf)
    assert len(code) == 3
    assert decode(code).capacitance_pf == pf


def test_all_e24_values_from_1pf_to_10uf_survive_the_three_digit_code():
    codes = {pf: encode_three_digit(pf) for pf in E24_PF}
    assert [pf for pf, code in codes.items() if decode(code).capacitance_pf != pf] == []
    assert len(set(codes.values())) == len(E24_PF)


def test_encoding_refuses_a_value_with_three_figures():
    with pytest.raises(ValueError, match="no three-digit code"):
        encode_three_digit(Decimal(1234))
