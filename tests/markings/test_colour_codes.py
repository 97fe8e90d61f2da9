"""Colour bands and top dots: IEC 60062 colour figures, tubular tempco bands, reading direction.

Outside sources: the IEC 60062 capacitor colour code as tabulated by the tutorial pages keyed
[colour-tutorial-a],
[colour-tables-b], [colour-identification-c] (and the encyclopedia table [encyclopaedia-colour-code]) in
docs/sources.md; the Class 1 tempco colour
tables of the same pages plus [gdr-ceramics] (GDR TGL 7838) and [tc-letter-colour-table]; IEC 60063 E12 values
from the `eseries`
reference library. Where a case rests on memory it says so.
"""

from __future__ import annotations

from decimal import Decimal

import eseries
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from stock.markings.colour_codes import looks_like_colours
from stock.markings.colours import decode_colours
from stock.markings.colour_words import parse_colour_text
from stock.decoded import Marking

# IEC 60062 colour order for the figures 0-9 (from memory of IEC 60062, the resistor/capacitor
# colour code), kept apart from the module's table so the round trip checks it.
IEC_60062_FIGURE_COLOURS = ("black", "brown", "red", "orange", "yellow", "green", "blue", "violet",
                            "grey", "white")


def tol(marking: Marking) -> tuple[Decimal, Decimal, str] | None:
    t = marking.tolerance
    return None if t is None else (t.minus, t.plus, t.unit)


def alternative_values(marking: Marking) -> set[Decimal]:
    return {a.capacitance_pf for a in marking.alternatives}


# Spellings people type: full names, British/American, 3-letter abbreviations (common practice, no
# published source), IEC 60757 two-letter codes (from memory of IEC 60757), separators and prefixes.
@pytest.mark.parametrize("text, colours", [
    pytest.param("yellow violet brown", ("yellow", "violet", "brown"), id="full-names"),
    pytest.param("yel-vio-brn", ("yellow", "violet", "brown"), id="abbreviations-with-hyphens"),
    pytest.param("YEL/VIO/BRN", ("yellow", "violet", "brown"), id="upper-case-with-slashes"),
    pytest.param("yellow, purple; brown", ("yellow", "violet", "brown"), id="purple-is-violet"),
    pytest.param("gray grey gry gra", ("grey", "grey", "grey", "grey"), id="grey-and-gray"),
    pytest.param("orn org blk wht gld slv", ("orange", "orange", "black", "white", "gold", "silver"),
                 id="more-abbreviations"),
    pytest.param("YE VT BN", ("yellow", "violet", "brown"), id="iec-60757-two-letter-codes"),
    pytest.param("bands: red red orange", ("red", "red", "orange"), id="bands-prefix"),
])
def test_every_common_spelling_reads_as_the_same_colours(text, colours):
    assert parse_colour_text(text).sequence == colours


# Three and four bands: 2 figures, multiplier in pF, tolerance (IEC 60062 colour code per [colour-tutorial-a],
# [colour-tables-b],
# [colour-identification-c]; the pF column applies at 10 pF and below, the % column above).
@pytest.mark.parametrize("text, pf, tolerance", [
    pytest.param("yellow violet brown", "470", ("20", "20", "%"), id="470pF-no-band-is-20pc"),
    pytest.param("brown black orange silver", "10000", ("10", "10", "%"), id="10nF-silver-10pc"),
    pytest.param("orange white red", "3900", ("20", "20", "%"), id="3n9"),
    pytest.param("grey red black gold", "82", ("5", "5", "%"), id="82pF-gold-5pc"),
    pytest.param("green blue white", "5.6", ("20", "20", "%"), id="white-multiplies-by-0.1"),
    pytest.param("brown black grey", "0.10", ("20", "20", "%"), id="grey-multiplies-by-0.01"),
    pytest.param("brown green black white", "15", ("10", "10", "%"), id="15pF-white-is-10pc-above-10pF"),
    pytest.param("brown black black white", "10", ("1", "1", "pF"), id="10pF-white-is-1pF-at-threshold"),
    pytest.param("red red gold green", "2.2", ("0.5", "0.5", "pF"), id="2p2-green-is-half-pF"),
    pytest.param("blue grey white black", "6.8", ("2", "2", "pF"), id="6p8-black-is-2pF"),
    pytest.param("yellow violet black grey", "47", ("20", "80", "%"), id="47pF-grey-is-plus80-minus20"),
])
def test_three_and_four_bands_read_as_figures_multiplier_tolerance(text, pf, tolerance):
    m = decode_colours(text)
    assert m.capacitance_pf == Decimal(pf)
    assert tol(m) == tuple(Decimal(v) if i < 2 else v for i, v in enumerate(tolerance))


def test_a_small_value_says_its_tolerance_colour_was_read_in_pf():
    # [colour-tutorial-a], [colour-tables-b], [colour-identification-c]: the pF column holds at 10 pF and
    # below
    m = decode_colours("red red gold white")
    assert tol(m) == (Decimal(1), Decimal(1), "pF")
    flag = next(f for f in m.flags if f.kind == "tolerance-by-value")
    # the message names its sources by their old numbers (docs/sources.md, column "was")
    assert "threshold 10 pF" in flag.message and "S19, S20, S21" in flag.message


# Disagreements between the tables ([colour-tutorial-a] vs [colour-tables-b]/[colour-identification-c] vs
# [encyclopaedia-colour-code]): both readings kept, flagged.
@pytest.mark.parametrize("text, chosen, other", [
    pytest.param("red red gold red", ("0.25", "pF"), ("2", "%"), id="red-quarter-pF-per-colour-tutorial-a"),
    pytest.param("red red gold grey", ("0.25", "pF"), ("80", "%"), id="grey-quarter-pF-per-colour-tables-b-colour-identification-c"),
    pytest.param("red red gold brown", ("0.1", "pF"), ("1", "%"), id="brown-tenth-pF-only-colour-tutorial-a"),
    pytest.param("red red brown green", ("5", "%"), ("0.5", "%"), id="green-5pc-or-half-pc-encyclopaedia-colour-code"),
    pytest.param("red red brown gold", ("5", "%"), ("0.5", "pF"), id="gold-5pc-or-half-pF-encyclopaedia-colour-code"),
])
def test_disputed_tolerance_colours_keep_both_readings(text, chosen, other):
    m = decode_colours(text)
    assert (m.tolerance.plus, m.tolerance.unit) == (Decimal(chosen[0]), chosen[1])
    assert any(a.tolerance and (a.tolerance.plus, a.tolerance.unit) == (Decimal(other[0]), other[1])
               and a.capacitance_pf == m.capacitance_pf for a in m.alternatives)
    assert "disputed-code" in m.flag_kinds()


def test_grey_multiplier_also_offers_the_resistor_style_reading():
    # [colour-tables-b] prints grey = ×10^8 in its resistor-style table, ×0.01 for ceramics
    m = decode_colours("brown black grey white")
    assert m.capacitance_pf == Decimal("0.1")
    assert Decimal(10) * Decimal(100_000_000) in alternative_values(m)
    assert "disputed-code" in m.flag_kinds()


# Tubular ceramic read from the wide tempco band ([colour-tutorial-a] column order; tempco colours
# [colour-tutorial-a], [colour-tables-b], [colour-identification-c]).
@pytest.mark.parametrize("text, pf, tolerance, code, ppm", [
    pytest.param("bands: violet yellow violet black green", "47", ("5", "%"), "N750", -750,
                 id="n750-47pF-5pc"),
    pytest.param("black brown black black white", "10", ("1", "pF"), "NP0", 0, id="np0-10pF-1pF"),
    pytest.param("orange red red brown silver", "220", ("10", "%"), "N150", -150, id="n150-220pF"),
    pytest.param("red violet brown black brown silver", "100", ("10", "%"), "P100", 100,
                 id="two-colour-p100-six-bands"),  # red + violet = P100: [gdr-ceramics], [capinfo-1993]
    pytest.param("tubular yellow orange green blue black silver", "56", ("10", "%"), "N2200", -2200,
                 id="two-colour-n2200-from-memory"),  # yellow + orange = N2200: from memory
])
def test_tubular_bands_start_with_the_tempco(text, pf, tolerance, code, ppm):
    m = decode_colours(text)
    assert m.capacitance_pf == Decimal(pf)
    assert (m.tolerance.plus, m.tolerance.unit) == (Decimal(tolerance[0]), tolerance[1])
    assert m.dielectric.code == code
    assert m.dielectric.tempco_ppm_per_k == Decimal(ppm)
    assert (m.dielectric.family, m.dielectric.klass) == ("ceramic", 1)
    assert "tempco colour code" in m.dielectric.source


def test_a_tempco_band_typed_at_the_far_end_is_read_from_the_other_end():
    # the [colour-tutorial-a] layout written backwards: green black violet yellow violet = violet yellow
    # violet black green
    m = decode_colours("green black violet yellow violet")
    assert (m.capacitance_pf, m.dielectric.code) == (Decimal(47), "N750")
    assert "both-ends" in m.flag_kinds()


# Disc and plate ceramics: value bands plus a top dot or band (tempco colours [colour-tutorial-a],
# [colour-tables-b], [colour-identification-c], [gdr-ceramics], [tc-letter-colour-table]).
@pytest.mark.parametrize("text, pf, code", [
    pytest.param("brown black orange, top dot black", "10000", "NP0", id="top-dot-black-is-np0"),
    pytest.param("top dot violet; red red brown", "220", "N750", id="top-dot-first"),
    pytest.param("top band red violet, brown black red", "1000", "P100", id="two-colour-top-band"),
    pytest.param("disc orange white brown, top dot orange orange", "390", "N1500",
                 id="orange-orange-n1500-from-memory"),
    pytest.param("yellow violet brown, top gold", "470", "P100", id="gold-is-p100-per-tc-letter-colour-table"),
    pytest.param("red red brown, top dot grey", "220", "P030", id="grey-is-p030"),
    pytest.param("red red brown, top dot light blue", "220", "N470", id="light-blue-tgl-7838"),
    pytest.param("red red brown, top dot dark blue", "220", "N1500", id="dark-blue-tgl-7838"),
    pytest.param("wide band violet, yellow violet black green", "47", "N750", id="wide-band-named"),
])
def test_a_top_dot_gives_the_tempco_of_a_disc(text, pf, code):
    m = decode_colours(text)
    assert m.capacitance_pf == Decimal(pf)
    assert m.dielectric.code == code


@pytest.mark.parametrize("colour, chosen, others", [
    pytest.param("brown", "N030", {"N033", "N150"}, id="brown-n030-colour-tables-b-or-n033-colour-tutorial-a"),
    pytest.param("red", "N080", {"N075"}, id="red-n080-colour-tables-b-or-n075-colour-tutorial-a"),
])
def test_disputed_tempco_colours_keep_every_reading(colour, chosen, others):
    m = decode_colours(f"yellow violet brown, top dot {colour}")
    assert m.dielectric.code == chosen
    assert {a.dielectric.code for a in m.alternatives if a.dielectric} >= others
    assert "disputed-code" in m.flag_kinds()


def test_a_lone_top_dot_still_reports_its_tempco_but_no_value():
    m = decode_colours("top dot black")
    assert m.capacitance_pf is None and m.dielectric.code == "NP0"
    assert "unreadable" in m.flag_kinds()


# Reading direction: both ends decoded, E12 membership (IEC 60063) ranks, the written order breaks ties.
def test_a_sequence_valid_from_both_ends_returns_both_readings():
    m = decode_colours("red violet yellow")       # 270 nF as written, 4.7 nF backwards; both E12
    assert m.capacitance_pf == Decimal(270_000)
    assert Decimal(4700) in alternative_values(m)
    assert "both-ends" in m.flag_kinds()


def test_the_e12_reading_wins_over_an_e24_reading_from_the_other_end():
    m = decode_colours("orange black brown")       # 300 pF (E24) as written, 10 nF (E12) backwards
    assert m.capacitance_pf == Decimal(10_000)
    assert Decimal(300) in alternative_values(m)
    assert "both-ends" in m.flag_kinds()


def test_an_implausible_other_end_is_kept_but_not_flagged():
    m = decode_colours("yellow violet brown")      # backwards 170 nF is in no E series
    assert Decimal(170_000) in alternative_values(m)
    assert "both-ends" not in m.flag_kinds()


def test_a_palindrome_is_read_once():
    assert decode_colours("red red red").alternatives == ()


# Misspellings corrected with rapidfuzz and flagged (common practice, no published source).
@pytest.mark.parametrize("text, pf, corrected", [
    pytest.param("orng wht red", "3900", ["'orng' read as orange"], id="orng"),
    pytest.param("yelow vilot brwn", "470",
                 ["'yelow' read as yellow", "'vilot' read as violet", "'brwn' read as brown"], id="three"),
    pytest.param("brown blak red gren", "1000", ["'blak' read as black", "'gren' read as green"],
                 id="blak-is-black-not-blank"),
])
def test_misspelt_colours_are_corrected_and_flagged(text, pf, corrected):
    m = decode_colours(text)
    assert m.capacitance_pf == Decimal(pf)
    assert [f.message for f in m.flags if f.kind == "spelling-corrected"] == corrected


# Text that is no colour code: a result with an unreadable flag, never an exception.
@pytest.mark.parametrize("text, kinds", [
    pytest.param("", {"unreadable"}, id="empty"),
    pytest.param("hello world", {"unreadable", "unparsed"}, id="words"),
    pytest.param("red", {"unreadable"}, id="one-colour"),
    pytest.param("black black black", {"unreadable"}, id="leading-zero-both-ends"),
    pytest.param("gold silver gold", {"unreadable"}, id="no-figures"),
])
def test_text_that_is_no_colour_code_is_flagged_unreadable(text, kinds):
    m = decode_colours(text)
    assert m.capacitance_pf is None
    assert kinds <= m.flag_kinds()


def test_the_unreadable_flag_names_the_colours_and_the_layouts_tried():
    flag = next(f for f in decode_colours("red green").flags if f.kind == "unreadable")
    assert flag.message.startswith("2 colours (red green) fit no layout: 3 or 4 value bands")


def test_unknown_words_are_kept_as_unparsed():
    m = decode_colours("yellow violet brown 63V")
    assert m.capacitance_pf == Decimal(470) and m.unparsed == ("63V",)


# Auto-detection: every word a colour or a colour-code word (common practice, no published source).
@pytest.mark.parametrize("text, expected", [
    pytest.param("yellow violet brown", True, id="three-colours"),
    pytest.param("YEL/VIO/BRN", True, id="abbreviations"),
    pytest.param("brown black orange, top dot black", True, id="with-top-dot"),
    pytest.param("top dot black", True, id="top-dot-alone"),
    pytest.param("dots: white red red brown black black", True, id="mica-dots"),
    pytest.param("orng vilot brn", True, id="misspelt"),
    pytest.param("red", False, id="one-colour-is-not-a-marking"),
    pytest.param("104K", False, id="three-digit-code"),
    pytest.param("100n 63V red", False, id="value-and-a-colour"),
    pytest.param("X7R", False, id="dielectric-code"),
    pytest.param("", False, id="empty"),
])
def test_looks_like_colours_detects_colour_markings(text, expected):
    assert looks_like_colours(text) is expected


def to_three_bands(pf: Decimal) -> str:
    """Encode a value ≥ 10 pF with two significant figures as IEC 60062 colour bands."""
    digits, exponent = pf.normalize().as_tuple().digits, pf.normalize().as_tuple().exponent
    figures = (list(digits) + [0])[:2]
    zeros = len(digits) - 2 + exponent
    return " ".join(IEC_60062_FIGURE_COLOURS[d] for d in (*figures, zeros))


# IEC 60063 E12, 10 pF to 1 µF, from the eseries reference library.
E12_PF = [Decimal(str(v)).quantize(Decimal(1)) for v in eseries.erange(eseries.E12, 10, 1e6)]


def test_the_encoder_of_this_test_matches_a_worked_example():
    assert to_three_bands(Decimal(4700)) == "yellow violet red"   # 4.7 nF, [colour-tutorial-a]/[colour-tables-b] worked form
    assert len(E12_PF) == 61 and E12_PF[0] == 10 and E12_PF[-1] == 1_000_000


@given(st.sampled_from(E12_PF))
def test_every_e12_value_encoded_to_three_bands_decodes_back_exactly(pf):
    assert decode_colours(to_three_bands(pf)).capacitance_pf == pf


_WORDS = st.sampled_from(["red", "brn", "gry", "gold", "silver", "orng", "top", "dot", "dots", "bands",
                          "mica", "EIA", "jan", "rma", "wide", "light", "none", "black", "white",
                          "violet", "blue", "green", "yellow", "xyz", "104", ""])
_SEPS = st.sampled_from([" ", "-", "/", ",", ";", ": ", ", top dot "])


@settings(max_examples=300)
@given(st.lists(st.tuples(_WORDS, _SEPS), max_size=9))
def test_decode_never_raises_on_colour_like_text_and_round_trips_as_json(parts):
    text = "".join(w + s for w, s in parts)
    m = decode_colours(text)
    assert m.text == text
    assert m.capacitance_pf is not None or "unreadable" in m.flag_kinds()
    assert Marking.from_json(m.to_json()) == m


@settings(max_examples=300)
@given(st.text())
def test_decode_never_raises_on_any_text(text):
    m = decode_colours(text)
    assert isinstance(m, Marking) and m.text == text
    # a value is read, or the marking says why not
    assert m.capacitance_pf is not None or m.flag_kinds() & {"unreadable", "unparsed"} or m.unparsed
    # text with a digit is never taken for colours: the printed codes are read instead
    detected = looks_like_colours(text)
    assert isinstance(detected, bool)
    if any(ch.isdigit() for ch in text):
        assert not detected


def test_five_bands_ending_in_a_voltage_colour_read_as_a_polyester_film_part():
    # from memory of the C280-style polyester code: brown black yellow = 100 nF, white ±10 %, red 250 V
    m = decode_colours("bands: brown black yellow white red")
    assert (m.capacitance_pf, m.tolerance.plus, m.voltage_v) == (Decimal(100_000), Decimal(10), Decimal(250))
    assert m.dielectric.family == "polyester"
    assert "unverified-code" in m.flag_kinds()


def test_five_colours_that_fit_a_band_and_a_mica_code_equally_say_so():
    # polyester (from memory) and RMA five dots ([rma-mica-page]) both give 100 nF
    m = decode_colours("brown black yellow white red")
    assert m.dielectric.family == "polyester"
    assert "layout-ambiguous" in m.flag_kinds()
    assert any(a.dielectric and a.dielectric.family == "mica" for a in m.alternatives)


def test_a_top_dot_split_from_bands_in_one_clause_takes_one_colour():
    m = decode_colours("top dot black brown black orange")
    assert (m.capacitance_pf, m.dielectric.code) == (Decimal(10_000), "NP0")


_FIGURE = st.sampled_from(IEC_60062_FIGURE_COLOURS[1:])            # a first figure is never black
_MULTIPLIER = st.sampled_from(IEC_60062_FIGURE_COLOURS[1:7])       # brown ×10 … blue ×10^6 ([colour-tutorial-a])


@given(_MULTIPLIER, _FIGURE, _MULTIPLIER)
def test_three_bands_valid_from_both_ends_return_both_readings(first, second, last):
    # first and last are each a valid first figure and a valid multiplier (IEC 60062 via [colour-tutorial-a])
    colours = (first, second, last)
    m = decode_colours(" ".join(colours))
    values = {m.capacitance_pf} | alternative_values(m)

    def value(c):
        return Decimal(IEC_60062_FIGURE_COLOURS.index(c[0]) * 10 + IEC_60062_FIGURE_COLOURS.index(c[1])) \
            * Decimal(10) ** IEC_60062_FIGURE_COLOURS.index(c[2])

    assert {value(colours), value(colours[::-1])} <= values
