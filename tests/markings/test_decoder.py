"""Whole markings: the project's example markings, the ambiguities that must be flagged, hostile text.

Sources: IEC 60062 (value and tolerance codes), EIA-198 (dielectric codes), IEC 60384-14 (safety
classes) as reproduced in docs/sources.md; the voltage-code table voltage-code tables ([code-table-blog],
[decoder-guide], [coding-blog-voltage]); polarity
conventions are common practice, no published source.
"""

from __future__ import annotations

from decimal import Decimal

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from stock.decoded import Marking
from stock.markings.decoder import MAX_MARKING_CHARS, decode
from stock.markings.description import summary
from stock.markings.cautions import cautions

D = Decimal

# Every example marking of the project's brief, with the reading the tables give (sources per field above).
EXAMPLE_MARKINGS = [
    pytest.param("104K 2A X7R", "100 nF ±10 %  100 V DC  X7R (−55…+125 °C, ±15 %)", id="104K-2A-X7R"),
    pytest.param("4n7 J 100V", "4.7 nF ±5 %  100 V DC", id="4n7-J-100V"),
    pytest.param("47pF NP0", "47 pF  NP0 (0 ±30 ppm/K)", id="47pF-NP0"),
    pytest.param("223Z", "22 nF +80/−20 %", id="223Z"),
    pytest.param("1R5C", "1.5 pF ±0.25 pF", id="1R5C"),
    pytest.param("0.01 1KV Z5U", "10 nF  1 kV DC  Z5U (+10…+85 °C, +22/−56 %)", id="0.01-1KV-Z5U"),
    pytest.param("u1 63V polyester", "100 nF  63 V DC  polyester (+400 ±200 ppm/K, −55…+125 °C, ±5 %)",
                 id="u1-63V-polyester"),
    pytest.param("C0G 100 50V", "10 pF  50 V DC  C0G (0 ±30 ppm/K)", id="C0G-100-50V"),
    pytest.param("N750 33p", "33 pF  N750 (−750 ppm/K)", id="N750-33p"),
    pytest.param("2200uF 25V 105C", "2200 µF  25 V DC  105 °C rated", id="2200uF-25V-105C"),
    pytest.param("X2 0.1uF 275VAC", "100 nF  275 V AC  safety class X2", id="X2-0.1uF-275VAC"),
    pytest.param("10uF 16V tantalum +",
                 "10 µF  16 V DC  tantalum (−55…+125 °C, ±10 %)  positive-marked", id="tantalum-plus"),
    pytest.param(".047 MFD 600V", "47 nF  600 V DC", id="047-MFD-600V"),
    # IEC 60062: a three-digit code followed by M is the code with the ±20 % letter, not millifarads
    pytest.param("473M 1H Y5V", "47 nF ±20 %  50 V DC  Y5V (−30…+85 °C, +22/−82 %)", id="473M-is-47nF-20pct"),
    pytest.param("106M 0J X5R", "10 µF ±20 %  6.3 V DC  X5R (−55…+85 °C, ±15 %)", id="106M-is-10uF-20pct"),
    # IEC 60062: likewise a trailing F is the ±1 % letter (above 10 pF), not farads
    pytest.param("101F", "100 pF ±1 %", id="101F-is-100pF-1pct"),
    pytest.param("473F 50V C0G", "47 nF ±1 %  50 V DC  C0G (0 ±30 ppm/K)", id="473F-is-47nF-1pct"),
    # a value in farads carries its unit on a double-layer part (IEC 60062 letter F = 10⁰)
    pytest.param("0.47F 5.5V supercap", "470000 µF  5.5 V DC  double-layer (−25…+70 °C, +20/−30 %)",
                 id="0.47F-supercap-is-farads"),
]


@pytest.mark.parametrize(("text", "line"), EXAMPLE_MARKINGS)
def test_example_markings_decode_to_the_expected_line(text, line):
    assert summary(decode(text)) == line


# The field values behind the lines, for the cases above ([IEC 60062], [EIA-198]).
def test_field_values_of_the_named_cases():
    assert decode("104").capacitance_pf == 100000
    assert decode("479").capacitance_pf == D("4.7")
    assert decode("4n7").capacitance_pf == 4700
    m = decode("1R5C")
    assert (m.capacitance_pf, m.tolerance.minus, m.tolerance.unit, m.tolerance.code) == (D("1.5"), D("0.25"), "pF", "C")
    m = decode("103Z")
    assert (m.capacitance_pf, m.tolerance.minus, m.tolerance.plus) == (10000, 20, 80)
    m = decode("Y5V")
    assert (m.dielectric.temp_min_c, m.dielectric.temp_max_c, m.dielectric.change_minus_pct) == (-30, 85, 82)
    assert decode("U2J").dielectric.tempco_ppm_per_k == -750
    m = decode("2200uF 25V 105C")
    assert (m.capacitance_pf, m.voltage_v, m.rated_temp_c) == (2200000000, 25, 105)


# Ambiguities that must be flagged, with the other reading kept.
FLAG_CASES = [
    pytest.param("100", "ambiguous-code", D(100), id="code-ending-in-zero"),
    pytest.param("470", "ambiguous-code", D(470), id="470-literal-kept"),
    pytest.param("47K", "ambiguous-code", D(47000), id="nnK-older-US"),
    pytest.param("0.047", "unit-assumed", None, id="decimal-without-unit"),
    pytest.param("33", "unit-assumed", None, id="whole-number-without-unit"),
    pytest.param("1R5C", "tolerance-by-value", None, id="tolerance-by-value"),
    pytest.param("1C", "ambiguous-code", D(1), id="voltage-code-or-value"),
    pytest.param("NPO 10p", "spelling-corrected", None, id="letter-O-NPO"),
    pytest.param("104P", "disputed-code", None, id="disputed-tolerance-letter"),
    pytest.param("M4G", "disputed-code", None, id="disputed-class1-digit"),
    pytest.param("X7S", "disputed-code", None, id="disputed-S-change"),
    pytest.param("104K blorp", "unparsed", None, id="unknown-token"),
]


@pytest.mark.parametrize(("text", "kind", "alternative_pf"), FLAG_CASES)
def test_doubtful_readings_are_flagged_and_keep_their_alternatives(text, kind, alternative_pf):
    m = decode(text)
    assert kind in m.flag_kinds()
    assert all(f.message for f in m.flags)
    if alternative_pf is not None:
        assert alternative_pf in {a.capacitance_pf for a in m.alternatives}
    assert all(a.reason for a in m.alternatives)


def test_a_written_tolerance_wins_over_a_letter_that_disagrees():
    assert "conflicting-readings" not in decode("104K ±10%").flag_kinds()
    m = decode("104K ±5%")
    assert m.tolerance.plus == 5 and "conflicting-readings" in m.flag_kinds()


def test_unknown_tokens_are_kept_verbatim():
    m = decode("104K Blorp 50V qq9")
    assert m.unparsed == ("Blorp", "qq9")
    assert m.capacitance_pf == 100000 and m.voltage_v == 50


def test_voltage_code_is_read_as_a_value_when_the_voltage_is_printed_in_full():
    m = decode("2A 100V")   # 2A cannot be the voltage twice: 2 pF ±0.05 pF (IEC 60062 A, from memory)
    assert m.capacitance_pf == 2 and m.voltage_v == 100
    assert D(100) in {a.voltage_v for a in m.alternatives}


def test_tempco_printed_in_ppm_is_a_class1_reading():
    # common practice: film/ceramic parts and sheets write the tempco as "-750 ppm/K"
    m = decode("0±30 ppm/K 100p")
    assert (m.dielectric.tempco_ppm_per_k, m.dielectric.tempco_tol_ppm_per_k, m.tolerance) == (0, 30, None)
    assert decode("-150 ppm/°C 22p").dielectric.tempco_ppm_per_k == -150


def test_two_dielectrics_that_disagree_are_flagged():
    m = decode("X7R polyester 100n")
    assert m.dielectric.code == "X7R" and "conflicting-readings" in m.flag_kinds()
    assert "conflicting-readings" not in decode("C0G NP0 ceramic 10p").flag_kinds()
    assert "conflicting-readings" in decode("N150 -750ppm").flag_kinds()


def test_chip_size_is_read_as_a_package_not_a_value():
    # EIA chip sizes (common practice): "1206" is a case, not 1.206 nF
    m = decode("X7R 1206 10% 50V")
    assert m.capacitance_pf is None and m.unparsed == () and m.package == "1206"


def test_rated_temperature_forms():
    assert decode("47uF 63V 85°C").rated_temp_c == 85
    assert decode("47uF 63V 85 °C").rated_temp_c == 85
    assert decode("47uF 63V 105C").rated_temp_c == 105
    m = decode("47uF 63V -40/+85°C")   # category range: the upper end is the rated temperature
    assert m.rated_temp_c == 85 and not m.unparsed


# Polarity (common practice, no published source): a printed + or − is what it says; without one
# the family's usual band is assumed and flagged.
@pytest.mark.parametrize(("text", "polarity", "assumed"), [
    pytest.param("10uF 16V tantalum +", "positive-marked", False, id="tantalum-plus"),
    pytest.param("10uF 16V tantalum", "positive-marked", True, id="tantalum-usual"),
    pytest.param("470uF 25V electrolytic", "negative-marked", True, id="aluminium-usual"),
    pytest.param("470uF 25V electrolytic -", "negative-marked", False, id="aluminium-minus"),
    pytest.param("100n 63V MKT", None, False, id="film-none"),
])
def test_polarity_follows_the_mark_or_the_family_convention(text, polarity, assumed):
    m = decode(text)
    assert m.polarity == polarity
    assert ("polarity-assumed" in m.flag_kinds()) is assumed


def test_unitless_whole_number_on_an_electrolytic_is_read_as_microfarad():
    m = decode("2200 25V electrolytic")
    assert m.capacitance_pf == 2200000000
    assert "unit-assumed" in m.flag_kinds()


# IEC 60384-14 classes, dual ratings, AC kept; cautions printed for mains parts.
def test_safety_class_dual_rating_and_ac_voltage():
    m = decode("X1/Y2 4.7nF 400VAC")
    assert (m.safety_class, m.voltage_v, m.voltage_kind) == ("X1Y2", 400, "AC")
    assert any("local electrical codes" in c for c in cautions(m))


def test_plain_volts_on_a_safety_capacitor_are_read_as_ac_with_a_flag():
    m = decode("Y2 2n2 250V")
    assert m.voltage_kind == "AC" and "voltage-kind-assumed" in m.flag_kinds()


# Input forms seen in typed sheets: case, spaces, dots, slashes, decimal commas, µ/u/U, ±, °.
@pytest.mark.parametrize(("text", "pf", "tol_plus"), [
    pytest.param("4,7nF ± 5 %", D(4700), D(5), id="comma-and-spaced-plus-minus"),
    pytest.param("4.7µF", D(4700000), None, id="micro-sign"),
    pytest.param("4.7μF", D(4700000), None, id="greek-mu"),
    pytest.param("4.7UF", D(4700000), None, id="upper-U"),
    pytest.param("  104k  ", D(100000), D(10), id="spaces-lower-case"),
    pytest.param("100n/63V", D(100000), None, id="slash-separator"),
    pytest.param("104K.", D(100000), D(10), id="trailing-dot"),
    pytest.param("4n7 +80/-20%", D(4700), D(80), id="asymmetric-written"),
    pytest.param("0.1 mfd", D(100000), None, id="lower-mfd"),
    pytest.param("10 mmfd", D(10), None, id="mmfd"),
    pytest.param("４７pF", D(47), None, id="fullwidth-digits"),
])
def test_tolerant_input_forms(text, pf, tol_plus):
    m = decode(text)
    assert m.capacitance_pf == pf
    assert (m.tolerance.plus if m.tolerance else None) == tol_plus


# Hostile text: never raises, always says why (the project's promise).
@pytest.mark.parametrize("text", ["", "   ", "\x00\x07\x1b", "日本語テキスト", "🙂🙂", "\u202e104K",
                                  "x" * (MAX_MARKING_CHARS + 1)])
def test_hostile_text_gives_an_unreadable_flag(text):
    m = decode(text)
    assert isinstance(m, Marking)
    assert "unreadable" in m.flag_kinds()


def test_overlong_text_is_cut_to_the_documented_length():
    m = decode("104K " * 1000)
    assert len(m.text) == MAX_MARKING_CHARS and m.capacitance_pf is None


def test_control_characters_are_removed_and_the_rest_still_decodes():
    m = decode("104K\x00 2A")
    assert m.capacitance_pf == 100000 and "unreadable" in m.flag_kinds()


@settings(max_examples=400)
@given(st.text(max_size=250))
def test_decode_never_raises_on_any_text(text):
    m = decode(text)
    assert isinstance(m, Marking)
    assert not any("decoder failed" in f.message for f in m.flags)
    Marking.from_json(m.to_json())


@settings(max_examples=300)
@given(st.lists(st.sampled_from(["104K", "2A", "X7R", "4n7", "J", "100V", "NPO", "+", "-", "105C", "X1/Y2",
                                 "0.01", "470", "47K", "tantalum", "silver", "mica", "±5%", "275VAC", "MFD",
                                 ".047", "1R5C", "Z", "u1", "°C", "85", "%", "/"]), max_size=8))
def test_decode_never_raises_on_any_mix_of_real_tokens(tokens):
    m = decode(" ".join(tokens))
    assert not any("decoder failed" in f.message for f in m.flags)
    if m.tolerance is not None:
        assert m.tolerance.minus >= 0 and m.tolerance.plus >= 0


def test_json_round_trip_keeps_every_field():
    m = decode("104K 2A X7R")
    assert Marking.from_json(m.to_json()) == m


def test_a_value_with_its_unit_beside_a_printed_voltage_is_not_doubted_as_a_voltage_code():
    # EIA voltage code: 1F would be 31.5 V; with 5.5 V printed and F the farad unit, it is 1 F
    m = decode("1F 5.5V double layer")
    assert m.capacitance_pf == Decimal(10) ** 12 and m.voltage_v == Decimal("5.5")
    assert "ambiguous-code" not in m.flag_kinds()
    assert any(a.voltage_v == Decimal("31.5") for a in m.alternatives)
