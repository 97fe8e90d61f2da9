"""The colour decoder end to end: values from IEC 60062 colours, the E12 preference, both ends, doubts.

Sources: IEC 60062 colour code (figures black 0 ... white 9; multiplier = 10^figure, in pF for
capacitors); IEC 60063 E12 series (10 12 15 18 22 27 33 39 47 56 68 82) and E24 (adds 11 13 16 20 24
30 36 43 51 62 75 91). Values below by hand arithmetic.
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.markings.colours import decode_colours, series_rank


# IEC 60063: E12 and E24 membership, by reading the published series
@pytest.mark.parametrize("value, rank", [
    pytest.param(Decimal(4700), 0, id="4700-is-E12"),
    pytest.param(Decimal("8.2"), 0, id="8.2-is-E12"),
    pytest.param(Decimal(300), 1, id="300-is-E24-only"),
    pytest.param(Decimal(9100), 1, id="9100-is-E24-only"),
    pytest.param(Decimal(170_000), 2, id="17-is-in-no-series"),
    pytest.param(Decimal(0), 3, id="zero-is-no-value"),
    pytest.param(None, 3, id="none-is-no-value"),
])
def test_series_rank_prefers_e12_then_e24(value, rank):
    assert series_rank(value) == rank


# IEC 60062 three-band code: two figures and a multiplier, in pF (hand arithmetic)
@pytest.mark.parametrize("text, pf", [
    pytest.param("yel-vio-brn", Decimal(470), id="47x10-is-470pF"),
    pytest.param("brown black orange", Decimal(10_000), id="10x1000-is-10nF"),
    pytest.param("orange white red", Decimal(3900), id="39x100-is-3.9nF"),
    pytest.param("red red brown", Decimal(220), id="22x10-is-220pF"),
])
def test_three_value_bands_give_the_capacitance_in_picofarads(text, pf):
    assert decode_colours(text).capacitance_pf == pf


def test_a_three_band_marking_has_its_tolerance_assumed_and_says_so():
    # IEC 60062: a capacitor marking without a tolerance band is read as ±20 %
    m = decode_colours("yel-vio-brn")
    assert m.tolerance.plus == Decimal(20)
    assert "tolerance-assumed" in m.flag_kinds()


def test_a_black_top_dot_is_np0():
    # EIA/IEC tempco colours: black = NP0 (0 ppm/K), from memory of EIA-198
    assert decode_colours("brown black orange, top dot black").dielectric.code == "NP0"


def test_a_misspelling_is_flagged_and_the_value_still_read():
    m = decode_colours("orng wht red")
    assert m.capacitance_pf == Decimal(3900)      # 39 x 100 pF, IEC 60062
    assert "spelling-corrected" in m.flag_kinds()


def test_a_marking_that_only_reads_from_the_other_end_is_reversed_and_flagged():
    # brown green violet: violet (10^7) is no capacitor multiplier in IEC 60062, so only the
    # reversed reading violet green brown = 75 x 10 = 750 pF (an E24 value) fits
    m = decode_colours("brown green violet")
    assert m.capacitance_pf == Decimal(750)
    assert "both-ends" in m.flag_kinds()


@pytest.mark.parametrize("text", [
    pytest.param("", id="empty"),
    pytest.param("hello world", id="no-colours"),
    pytest.param("red", id="one-colour-fits-no-layout"),
    pytest.param(None, id="none"),
])
def test_text_that_fits_no_layout_gives_an_unreadable_marking_not_an_exception(text):
    m = decode_colours(text)
    assert m.capacitance_pf is None
    assert "unreadable" in m.flag_kinds()


def test_an_unreadable_marking_says_how_many_colours_and_which_layouts_would_fit():
    m = decode_colours("red")
    reason = next(f.message for f in m.flags if f.kind == "unreadable")
    assert "1 colour (red)" in reason
    assert "3 or 4 value bands" in reason
