"""Colour words as typed: full names, abbreviations, two-letter codes, misspellings and layout words.

Sources: the colour names of IEC 60062 (black 0 ... white 9, gold, silver); IEC 60757 two-letter colour
codes (from memory of IEC 60757: BK, BN, RD, OG, YE, GN, BU, VT, GY, WH); 3-letter abbreviations of
parts lists (common practice, no published source).
"""

from __future__ import annotations

import pytest

from stock.markings.colour_words import COLOURS, base_colour, parse_colour_text


def test_the_colour_list_holds_the_twelve_iec_60062_colours_and_none():
    # IEC 60062 colour code: ten figure colours plus gold and silver
    assert set(COLOURS) == {"black", "brown", "red", "orange", "yellow", "green", "blue", "violet",
                            "grey", "white", "gold", "silver", "none"}


# spellings: IEC 60757 codes (from memory), parts-list abbreviations (common practice)
@pytest.mark.parametrize("text, sequence", [
    pytest.param("yel-vio-brn", ("yellow", "violet", "brown"), id="dashed-abbreviations"),
    pytest.param("YEL/VIO/BRN", ("yellow", "violet", "brown"), id="upper-case-slashes"),
    pytest.param("BN BK OG", ("brown", "black", "orange"), id="iec-60757-two-letter-codes"),
    pytest.param("brown gray red", ("brown", "grey", "red"), id="american-gray"),
    pytest.param("purple green black", ("violet", "green", "black"), id="purple-is-violet"),
    pytest.param("brown and black then orange", ("brown", "black", "orange"), id="filler-words-skipped"),
])
def test_colour_words_are_read_in_written_order(text, sequence):
    parsed = parse_colour_text(text)
    assert parsed.sequence == sequence
    assert parsed.unknown == ()
    assert parsed.corrections == ()


def test_a_misspelt_colour_is_corrected_and_the_correction_reported():
    parsed = parse_colour_text("orng wht red")
    assert parsed.sequence == ("orange", "white", "red")
    assert parsed.corrections == ("'orng' read as orange",)


def test_a_word_that_is_no_colour_is_kept_as_unknown_not_dropped():
    parsed = parse_colour_text("brown black xyzzy orange")
    assert parsed.sequence == ("brown", "black", "orange")
    assert parsed.unknown == ("xyzzy",)


def test_a_top_dot_colour_is_the_tempco_not_a_value_band():
    parsed = parse_colour_text("brown black orange, top dot black")
    assert parsed.sequence == ("brown", "black", "orange")
    assert parsed.tempco == ("black",)
    assert "dots" not in parsed.hints     # the noun names the tempco dot, not the layout


def test_a_two_colour_tempco_is_kept_whole_only_when_it_is_a_known_pair():
    pairs = {("red", "violet")}
    assert parse_colour_text("top band red violet, brown black red", pairs).tempco == ("red", "violet")
    unknown_pair = parse_colour_text("top band red violet, brown black red", set())
    assert unknown_pair.tempco == ("red",)
    assert unknown_pair.sequence == ("violet", "brown", "black", "red")


@pytest.mark.parametrize("text, hint", [
    pytest.param("mica dots red red brown", "mica", id="mica"),
    pytest.param("EIA red red brown", "EIA", id="eia"),
    pytest.param("JAN red red brown", "JAN", id="jan"),
    pytest.param("bands red red brown", "bands", id="bands"),
    pytest.param("stripes red red brown", "bands", id="stripes-are-bands"),
    pytest.param("axial red red brown", "tubular", id="axial-is-tubular"),
    pytest.param("disk red red brown", "disc", id="disk-is-disc"),
])
def test_layout_words_become_hints(text, hint):
    parsed = parse_colour_text(text)
    assert hint in parsed.hints
    assert parsed.sequence == ("red", "red", "brown")


def test_silver_mica_names_the_family_not_a_silver_dot():
    parsed = parse_colour_text("silver mica red red brown")
    assert parsed.sequence == ("red", "red", "brown")
    assert "mica" in parsed.hints


def test_a_shade_stays_with_its_colour_and_base_colour_drops_it():
    parsed = parse_colour_text("light red brown")
    assert parsed.sequence == ("light red", "brown")
    assert base_colour("light red") == "red"
    assert base_colour("red") == "red"


def test_empty_text_reads_as_nothing_without_raising():
    parsed = parse_colour_text("")
    assert (parsed.sequence, parsed.tempco, parsed.unknown) == ((), (), ())
