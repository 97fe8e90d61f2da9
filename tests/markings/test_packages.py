"""Package facts from package, footprint and description text.

Sources: the EIA chip size names (imperial hundredths of an inch, metric tenths of a millimetre)
from memory of the EIA / IEC 60115-8 designations, checked against the definition inch = 25.4 mm;
moulded tantalum case letters from memory of EIA-535; CAD footprint naming (``C_0805_2012Metric``,
``CP_Radial_D5.0mm_P2.00mm``) is common practice in CAD libraries, no published source.
"""

from __future__ import annotations

from decimal import Decimal

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from stock.markings.packages import CHIP_SIZES, TANTALUM_CASES, fits, read_package

D = Decimal

# Imperial code -> metric name, from memory of the EIA / IEC 60115-8 chip size tables.
SIZE_PAIRS = [
    pytest.param("0201", "0603", id="0201-is-0603M"),
    pytest.param("0402", "1005", id="0402-is-1005M"),
    pytest.param("0603", "1608", id="0603-is-1608M"),
    pytest.param("0805", "2012", id="0805-is-2012M"),
    pytest.param("1206", "3216", id="1206-is-3216M"),
    pytest.param("1210", "3225", id="1210-is-3225M"),
    pytest.param("1812", "4532", id="1812-is-4532M"),
    pytest.param("2220", "5750", id="2220-is-5750M"),
]


@pytest.mark.parametrize(("imperial", "metric"), SIZE_PAIRS)
def test_a_metric_name_reads_as_its_imperial_code(imperial: str, metric: str) -> None:
    # from memory of the EIA / IEC 60115-8 chip size designations
    assert read_package(f"{metric}M").chip_size == imperial
    assert read_package(f"{metric} metric").chip_size == imperial
    assert read_package(f"C_{imperial}_{metric}Metric").chip_size == imperial


def test_every_size_pair_agrees_with_the_inch_in_millimetres() -> None:
    # inch = 25.4 mm exactly (by definition); the names round the sides to 0.01 in and 0.1 mm,
    # and makers' nominal sides differ from the converted inch figure by up to about 0.16 mm.
    for imperial, metric in CHIP_SIZES.items():
        digits = 3 if len(imperial) == 5 else 2
        inch_l, inch_w = D(imperial[:digits]) / 100, D(imperial[digits:]) / 100
        if len(imperial) == 5:     # 01005: 0.010 × 0.005 in
            inch_l, inch_w = D(imperial[:3]) / 1000, D(imperial[3:]) / 1000
        mm_l, mm_w = D(metric[:2]) / 10, D(metric[2:]) / 10
        assert abs(inch_l * D("25.4") - mm_l) <= D("0.2"), imperial
        assert abs(inch_w * D("25.4") - mm_w) <= D("0.2"), imperial


def test_a_cad_footprint_naming_both_sizes_is_one_size() -> None:
    # common practice: CAD chip footprints carry the imperial code and the metric name
    p = read_package("C_0805_2012Metric")
    assert (p.chip_size, p.mounting, p.notes, p.conflicts, p.unparsed) == ("0805", "SMD", (), (), ())


def test_a_footprint_naming_two_different_sizes_uses_neither() -> None:
    p = read_package("C_0805_1608Metric")
    assert p.chip_size is None
    assert "different sizes" in p.conflicts[0]


def test_a_bare_size_that_is_also_a_metric_name_is_read_as_imperial_and_says_so() -> None:
    # common practice, no published source: a bare 0603 is the imperial size
    p = read_package("0603")
    assert p.chip_size == "0603"
    assert "metric 0603 would be 0201" in p.notes[0]
    assert read_package("0603M").chip_size == "0201"


def test_a_bare_metric_only_name_needs_no_suffix() -> None:
    # 1608 and 2012 are not imperial codes, so they can only be metric names
    assert read_package("1608").chip_size == "0603"
    assert read_package("2012").chip_size == "0805"


def test_a_four_digit_number_that_is_no_size_is_left_unparsed() -> None:
    assert read_package("2024").chip_size is None
    assert read_package("2024").unparsed == ("2024",)


# CAD footprint names (common practice in CAD libraries, no published source):
# text, chip size, mounting, lead form, diameter, pitch, polarised
FOOTPRINTS = [
    pytest.param("C_0603_1608Metric", "0603", "SMD", "chip", None, None, False, id="chip-0603"),
    pytest.param("C_0603_1608Metric_Pad1.08x0.95mm_HandSolder", "0603", "SMD", "chip", None, None,
                 False, id="chip-with-pad-sizes"),
    pytest.param("Capacitor_SMD:C_1206_3216Metric", "1206", "SMD", "chip", None, None, False,
                 id="library-prefix"),
    pytest.param("CP_Radial_D5.0mm_P2.00mm", None, "THT", "radial", "5.0", "2.00", True,
                 id="radial-electrolytic"),
    pytest.param("C_Disc_D5.0mm_W2.5mm_P5.00mm", None, "THT", "radial", "5.0", "5.00", False,
                 id="disc"),
    pytest.param("C_Rect_L7.2mm_W2.5mm_P5.00mm", None, "THT", "radial", None, "5.00", False,
                 id="film-box"),
    pytest.param("CP_Axial_L10.0mm_D4.5mm_P15.00mm_Horizontal", None, "THT", "axial", "4.5",
                 "15.00", True, id="axial-electrolytic"),
    pytest.param("CP_Elec_6.3x5.4", None, "SMD", "can", "6.3", None, True, id="smd-can"),
    pytest.param("CP_Tantalum_Case-A_EIA-3216-18_Reflow", "1206", "SMD", "chip", None, None, True,
                 id="tantalum-case-A"),
    pytest.param("C_Radial_D6.3mm_H11.0mm_P2.50mm", None, "THT", "radial", "6.3", "2.50", False,
                 id="radial-unpolarised"),
]


@pytest.mark.parametrize(("text", "chip", "mounting", "form", "diameter", "pitch", "polarised"),
                         FOOTPRINTS)
def test_cad_footprints_read_into_facts(text: str, chip: str | None, mounting: str, form: str,
                                        diameter: str | None, pitch: str | None,
                                        polarised: bool) -> None:
    p = read_package(text)
    assert (p.chip_size, p.mounting, p.lead_form, p.polarised_hint) == (chip, mounting, form, polarised)
    assert (p.body.diameter_mm if p.body else None) == (D(diameter) if diameter else None)
    assert p.pitch_mm == (D(pitch) if pitch else None)
    assert p.unparsed == ()


# Shop and distributor wording (common practice, no published source): text, mounting, lead form
WORDS = [
    pytest.param("SMD", "SMD", None, id="SMD"),
    pytest.param("SMT 0805", "SMD", "chip", id="SMT"),
    pytest.param("chip", "SMD", None, id="chip"),
    pytest.param("through hole", "THT", None, id="through-hole"),
    pytest.param("THT", "THT", None, id="THT"),
    pytest.param("Radial", "THT", "radial", id="radial"),
    pytest.param("AXIAL", "THT", "axial", id="axial"),
    pytest.param("snap in", "THT", "snap-in", id="snap-in"),
    pytest.param("screw terminal", "THT", "screw-terminal", id="screw-terminal"),
    pytest.param("disc", "THT", "radial", id="disc"),
]


@pytest.mark.parametrize(("text", "mounting", "form"), WORDS)
def test_mounting_words_read_into_facts(text: str, mounting: str, form: str | None) -> None:
    p = read_package(text)
    assert (p.mounting, p.lead_form, p.unparsed) == (mounting, form, ())


def test_a_can_size_and_pitch_are_read_from_shop_words() -> None:
    p = read_package("radial 6.3x11 pitch 2.5mm")
    assert (p.body.diameter_mm, p.body.length_mm, p.pitch_mm) == (D("6.3"), D(11), D("2.5"))
    assert read_package("box RM5").pitch_mm == D(5)


def test_a_description_keeps_the_words_that_are_no_package_fact() -> None:
    p = read_package("CAP CER 0.1UF 50V X7R 0603")
    assert p.chip_size == "0603"
    assert p.unparsed == ("CER", "0.1UF", "50V", "X7R")


@pytest.mark.parametrize(("text", "polarised"), [
    pytest.param("CAP ALUM 4.7UF RADIAL", False, id="no-polarity-word"),
    pytest.param("electrolytic radial", True, id="electrolytic"),
    pytest.param("bipolar electrolytic radial", False, id="bipolar-electrolytic"),
    pytest.param("non polar electrolytic", False, id="non-polar"),
    pytest.param("C_Radial_D5.0mm_P2.00mm", False, id="cad-unpolarised"),
    pytest.param("CP_Radial_D5.0mm_P2.00mm", True, id="cad-polarised"),
])
def test_a_polarity_hint_is_read_and_a_bipolar_part_is_not_polarised(text, polarised):
    # common practice: CAD libraries prefix polarised footprints CP_; bipolar electrolytics
    # have no polarity (from memory of maker datasheets)
    assert read_package(text).polarised_hint is polarised


def test_tantalum_case_letters_name_a_metric_body() -> None:
    # from memory of EIA-535: case A is 3216, B is 3528
    assert TANTALUM_CASES["a"] == "3216"
    assert read_package("tantalum case B").describe() == "3528 metric"


def test_a_chip_size_beside_through_hole_words_uses_no_mounting() -> None:
    p = read_package("1206 radial")
    assert p.mounting is None and p.chip_size is None
    assert p.conflicts


@settings(max_examples=300, deadline=None)
@given(st.text())
def test_any_text_reads_without_raising_and_keeps_its_raw_text(text: str) -> None:
    p = read_package(text)
    assert p.raw == text


# fits(part, pads): common practice, no published source
FITS = [
    pytest.param("0805", "C_0603_1608Metric", False, "0805 part for 0603 pads", id="bigger-chip"),
    pytest.param("0603", "C_0603_1608Metric", True, "", id="same-chip"),
    pytest.param("radial 5x11", "C_0805_2012Metric", False, "through-hole radial part for 0805 pads",
                 id="radial-on-chip-pads"),
    pytest.param("SMD 0805", "C_Disc_D5.0mm_W2.5mm_P5.00mm", False,
                 "SMD 0805 part for a through-hole radial footprint (D5 × W2.5 mm, 5 mm pitch)",
                 id="chip-in-holes"),
    pytest.param("", "C_0603_1608Metric", None, "package not recorded; check it fits 0603 pads",
                 id="unknown-part"),
    pytest.param("SMD", "C_0603_1608Metric", None, "SMD, size not recorded; check it fits 0603 pads",
                 id="smd-without-size"),
    pytest.param("0805", "", True, "", id="line-without-footprint"),
    pytest.param("axial", "CP_Radial_D5.0mm_P2.00mm", False,
                 "through-hole axial part for a through-hole radial footprint (D5 mm, 2 mm pitch)",
                 id="axial-for-radial"),
    pytest.param("radial D6.3mm P2.5mm", "CP_Radial_D5.0mm_P2.00mm", False,
                 "D6.3 mm body for a D5 mm outline", id="can-too-wide"),
    pytest.param("radial D5mm P2mm", "CP_Radial_D5.0mm_P2.00mm", True, "", id="can-fits"),
    pytest.param("radial D4mm P5mm", "CP_Radial_D5.0mm_P2.00mm", False,
                 "5 mm pitch part for a through-hole radial footprint (D5 mm, 2 mm pitch)",
                 id="wrong-pitch"),
    pytest.param("disc P2.54mm", "C_Disc_D5.0mm_W2.5mm_P2.50mm", True, "", id="tenth-inch-is-2.5mm"),
    pytest.param("radial", "CP_Radial_D5.0mm_P2.00mm", None,
                 "lead pitch not recorded; check it fits a through-hole radial footprint (D5 mm,"
                 " 2 mm pitch)", id="pitch-unknown"),
    pytest.param("axial L12mm", "C_Axial_D4.5mm_P10.00mm", False,
                 "L12 mm axial body for holes 10 mm apart", id="axial-too-long"),
    pytest.param("axial L6mm", "C_Axial_L5.0mm_D2.5mm_P10.00mm", False,
                 "L6 mm body for a L5 mm outline", id="axial-longer-than-outline"),
]


@pytest.mark.parametrize(("part", "pads", "ok", "reason"), FITS)
def test_a_part_fits_a_footprint_or_says_why_not(part: str, pads: str, ok: bool | None,
                                                 reason: str) -> None:
    assert fits(read_package(part), read_package(pads)) == (ok, reason)
