"""Distributor-style descriptions, typing slips and lone unit letters, as the decoder reads them.

Sources: the family words and abbreviations are common practice in distributor descriptions
(no published source); the EIA voltage codes (``1H`` 50 V, ``2A`` 100 V) from memory of EIA-198;
chip sizes from memory of the EIA chip size names; IEC 60062 for ``4n7`` and ``104``.
"""

from decimal import Decimal as D

import pytest

from stock.markings.decoder import decode
from stock.markings.cautions import cautions


# common practice in distributor descriptions, no published source
@pytest.mark.parametrize("text, family", [
    pytest.param("CAP CER 0.1UF 50V X7R 0603", "ceramic", id="CER-with-X7R-is-ceramic"),
    pytest.param("CER 10nF", "ceramic", id="CER-alone-is-ceramic"),
    pytest.param("CAP ALUM 100UF 20% 25V RADIAL", "aluminium-electrolytic", id="ALUM"),
    pytest.param("aluminium 47uF", "aluminium-electrolytic", id="aluminium"),
    pytest.param("aluminum 47uF", "aluminium-electrolytic", id="aluminum"),
    pytest.param("47uF electrolytic", "aluminium-electrolytic", id="electrolytic"),
    pytest.param("ELEC 47uF 16V", "aluminium-electrolytic", id="ELEC"),
    pytest.param("CAP TANT 10UF 16V", "tantalum", id="TANT"),
    pytest.param("CAP FILM 0.1UF 63V POLYESTER", "polyester", id="FILM-with-kind"),
    pytest.param("CAP FILM 1nF MKP", "polypropylene", id="FILM-MKP"),
    pytest.param("CAP MICA 100PF 500V", "mica", id="mica"),
    pytest.param("polystyrene 1n 63V", "polystyrene", id="polystyrene"),
    pytest.param("paper 47nF 400V", "paper", id="paper"),
    pytest.param("double layer 1F 5.5V", "double-layer", id="double-layer"),
])
def test_description_family_words_name_the_family(text, family):
    m = decode(text)
    assert m.dielectric is not None and m.dielectric.family == family
    assert m.unparsed == ()


@pytest.mark.parametrize("text", [
    "CAP CER 0.1UF 50V X7R 0603",
    "CAP ALUM 100UF 20% 25V RADIAL",
    "CAP FILM 0.1UF 275VAC X2 RADIAL",
    "Capacitor 10nF 50V",
    "CAP ALUM 2200UF 35V SNAP-IN",
    "CAP ALUM 47UF 16V RADIAL 5x11",
    "100nF 50V SMD 1206",
    "10uF 25V through hole axial",
])
def test_the_words_of_a_description_are_all_understood(text):
    m = decode(text)
    assert m.unparsed == () and "unparsed" not in m.flag_kinds()
    assert m.capacitance_pf is not None


# EIA chip sizes (from memory of the EIA chip size names); mounting words common practice
@pytest.mark.parametrize("text, package, mounting", [
    pytest.param("CAP CER 0.1UF 50V X7R 0603", "0603", "SMD", id="chip-size-is-SMD"),
    pytest.param("CAP ALUM 100UF 25V RADIAL", "RADIAL", "THT", id="radial-is-through-hole"),
    pytest.param("CAP ALUM 47UF 16V RADIAL 5x11", "RADIAL 5x11", "THT", id="can-size-kept"),
    pytest.param("10uF 25V axial", "axial", "THT", id="axial"),
    pytest.param("2200uF 35V snap-in", "snap-in", "THT", id="snap-in"),
    pytest.param("100nF SMD", "SMD", "SMD", id="SMD-word"),
    pytest.param("47uF through hole", "through hole", "THT", id="through-hole-in-two-words"),
])
def test_package_and_mounting_words_become_facts(text, package, mounting):
    m = decode(text)
    assert (m.package, m.mounting) == (package, mounting)
    assert m.to_json()["package"] == package and m.to_json()["mounting"] == mounting


def test_aluminium_parts_are_polarised_and_cautioned():
    # common practice: aluminium electrolytics mark the negative lead
    m = decode("CAP ALUM 100UF 20% 25V RADIAL")
    assert m.polarity == "negative-marked"
    assert any(c.startswith("Polarised part") for c in cautions(m))


@pytest.mark.parametrize("text, family", [
    pytest.param("47uF 25V elctrolytic", "aluminium-electrolytic", id="elctrolytic"),
    pytest.param("47uF 25V electrolitic", "aluminium-electrolytic", id="electrolitic"),
    pytest.param("10uF tantallum", "tantalum", id="tantallum"),
    pytest.param("1n polystyren", "polystyrene", id="polystyren"),
    pytest.param("100n polyestr", "polyester", id="polyestr"),
])
def test_a_misspelt_family_word_is_read_and_flagged(text, family):
    m = decode(text)
    assert m.dielectric.family == family
    assert "spelling-corrected" in m.flag_kinds()


def test_a_misspelt_electrolytic_is_still_polarised():
    m = decode("47uF 25V elctrolytic")
    assert m.polarity == "negative-marked" and cautions(m)


def test_words_that_name_no_family_are_not_forced_into_one():
    m = decode("47uF plastic")
    assert m.dielectric is None and m.unparsed == ("plastic",)


# IEC 60062 letter-and-digit values; EIA voltage codes are capitals (from memory of EIA-198)
@pytest.mark.parametrize("text, pf, volts", [
    pytest.param("1n", D(1000), None, id="lone-1n-is-1nF"),
    pytest.param("1p", D(1), None, id="lone-1p-is-1pF"),
    pytest.param("4n7", D(4700), None, id="lone-4n7"),
    pytest.param("1n 50V", D(1000), D(50), id="1n-beside-a-voltage"),
    pytest.param("1n 1H", D(1000), D(50), id="1n-beside-a-voltage-code"),
    pytest.param("104K 1H", D(100000), D(50), id="1H-beside-a-value-is-50V"),
])
def test_lower_case_unit_letters_are_values(text, pf, volts):
    m = decode(text)
    assert m.capacitance_pf == pf and m.voltage_v == volts
    assert "ambiguous-code" not in m.flag_kinds()


def test_a_lone_capital_1N_is_a_value_with_the_voltage_code_kept_as_a_doubt():
    # EIA voltage code 1N = 75 V (from memory of EIA-198); IEC 60062: 1N = 1 nF
    m = decode("1N")
    assert m.capacitance_pf == D(1000)
    assert "ambiguous-code" in m.flag_kinds()
    assert any(a.voltage_v == D(75) for a in m.alternatives)


@pytest.mark.parametrize("text, pf", [
    pytest.param("1OOn", D(100000), id="1OOn"),
    pytest.param("1O4", D(100000), id="1O4"),
    pytest.param("1OOpF", D(100), id="1OOpF"),
    pytest.param("1O3", D(10000), id="1O3-is-10nF"),   # IEC 60062: 103 = 10 × 10³ pF
])
def test_letter_o_typed_for_zero_is_corrected_and_flagged(text, pf):
    m = decode(text)
    assert m.capacitance_pf == pf
    assert "spelling-corrected" in m.flag_kinds() and m.unparsed == ()


def test_47O_reads_as_470_with_its_usual_doubt():
    # IEC 60062: 470 is 47 pF as a code, or 470 pF written out; both are E12 values
    m = decode("47O")
    assert "spelling-corrected" in m.flag_kinds() and m.unparsed == ()
    assert {m.capacitance_pf, *(a.capacitance_pf for a in m.alternatives)} >= {D(47), D(470)}


def test_a_resistor_value_gives_no_capacitance():
    assert decode("1k").capacitance_pf is None
