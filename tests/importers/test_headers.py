"""Header mapping for bin sheets and BOMs.

Sources: the header aliases are common practice in shop sheets and BOM exports, no published
source; "MFD"/"MMFD" for µF/pF are from memory of mid-century US parts catalogues; the fuzzy
matching rules (alias table first, WRatio with a cutoff, refuse near ties) follow
shared/reference/libraries.md §A5, which measured them.
"""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from importers.headers import (BIN_FIELDS, BOM_FIELDS, guess_field, header_row_score, map_headers,
                               normalise, split_unit)
from stock.errors import BadValue

# Messy headers seen in shop sheets, and their kin; common practice in shop sheets, no published source.
BIN_CASES = [
    pytest.param("Cap.", "value", id="cap-dot-is-value"),
    pytest.param("Value (pF)", "value", id="value-pf-is-value"),
    pytest.param("Qty on hand", "quantity", id="qty-on-hand-is-quantity"),
    pytest.param("Drawer", "location", id="drawer-is-location"),
    pytest.param("Bin #", "location", id="bin-hash-is-location"),
    pytest.param("Marking/Code", "marking", id="marking-slash-code-is-marking"),
    pytest.param("Marking / code", "marking", id="spaced-slash-is-marking"),
    pytest.param("WV", "voltage", id="wv-is-voltage"),
    pytest.param("Dielectric/Type", "dielectric", id="dielectric-slash-type-is-dielectric"),
    pytest.param("Tol", "tolerance", id="tol-is-tolerance"),
    pytest.param("Tol %", "tolerance", id="tol-percent-is-tolerance"),
    pytest.param("Colours", "colours", id="colours"),
    pytest.param("Colors", "colours", id="us-colors"),
    pytest.param("  QTY ", "quantity", id="upper-case-padded-qty"),
    pytest.param("Qty (pcs)", "quantity", id="bracketed-suffix-ignored"),
    pytest.param("Voltage rating (V)", "voltage", id="voltage-rating-v"),
    pytest.param("WVDC", "voltage", id="wvdc"),
    pytest.param("Slot", "location", id="slot-is-location"),
    pytest.param("Bin label", "label", id="bin-label"),
    pytest.param("Cabinet", "cabinet", id="cabinet"),
    pytest.param("Comments", "notes", id="comments-are-notes"),
    pytest.param("Reorder level", "minimum", id="reorder-level-is-minimum"),
    pytest.param("Min", "minimum", id="min"),
    pytest.param("Case size", "package", id="case-size-is-package"),
    pytest.param("SMD/THT", "mounting", id="smd-tht-is-mounting"),
    pytest.param("Date code", "date_code", id="date-code"),
    pytest.param("Datecode", "date_code", id="datecode-run-together"),
    pytest.param("Safety class", "safety_class", id="safety-class"),
    pytest.param("Polarity", "polarity", id="polarity"),
    pytest.param("Temp (°C)", "rated_temp", id="temp-celsius-is-rated-temp"),
    pytest.param("cap/code", "marking", id="cap-code-is-the-marking"),
]


@pytest.mark.parametrize(("header", "field"), BIN_CASES)
def test_messy_bin_headers_map_by_alias(header, field):
    guess = guess_field(header, "bins")
    assert (guess.field, guess.how, guess.score) == (field, "alias", 100.0)


# Typing slips; the scores are rapidfuzz WRatio as measured, cutoff 85 per libraries.md §A5.
TYPO_CASES = [
    pytest.param("Quantitiy", "quantity", id="quantitiy"),
    pytest.param("Dielectic", "dielectric", id="dielectic"),
    pytest.param("Toleranse", "tolerance", id="toleranse"),
    pytest.param("Voltge", "voltage", id="voltge"),
    pytest.param("Locaton", "location", id="locaton"),
    pytest.param("Qty on hnd", "quantity", id="qty-on-hnd"),
    pytest.param("Reordr level", "minimum", id="reordr-level"),
]


@pytest.mark.parametrize(("header", "field"), TYPO_CASES)
def test_misspelt_headers_map_fuzzily_above_the_cutoff(header, field):
    guess = guess_field(header, "bins")
    assert guess.field == field
    assert guess.how == "fuzzy"
    assert 85 <= guess.score < 100


# Columns a shop sheet or BOM carries that are not ours; they must stay unmapped rather than be
# caught by containment ("part" inside "supplier part number"). Common practice, no published source.
UNRELATED = [
    pytest.param("Supplier part number", "bom", id="supplier-part-number"),
    pytest.param("Manufacturer", "bins", id="manufacturer"),
    pytest.param("MPN", "bins", id="mpn"),
    pytest.param("Price", "bins", id="price"),
    pytest.param("URL", "bom", id="url"),
    pytest.param("Supplier", "bom", id="supplier-in-a-bom"),
    pytest.param("Cat", "bins", id="short-word-not-caught-by-single-letter-alias"),
    pytest.param("column 7", "bins", id="synthetic-reader-header"),
]


@pytest.mark.parametrize(("header", "vocabulary"), UNRELATED)
def test_unrelated_headers_stay_unmapped(header, vocabulary):
    assert guess_field(header, vocabulary).field is None


# Capacitance units in headers; "MFD"/"MMFD" from memory of old US catalogues (µF, µµF = pF);
# U+00B5 MICRO SIGN and U+03BC GREEK SMALL LETTER MU per the Unicode Standard both occur.
UNIT_CASES = [
    pytest.param("Value (pF)", "value", "pF", id="value-pf"),
    pytest.param("uF", "value", "µF", id="bare-uf"),
    pytest.param("Cap nF", "value", "nF", id="cap-nf"),
    pytest.param("Capacitance µF", "value", "µF", id="micro-sign"),
    pytest.param("C (\u03bcF)", "value", "µF", id="greek-mu"),
    pytest.param("MFD", "value", "µF", id="mfd-is-microfarad"),
    pytest.param("MMFD", "value", "pF", id="mmfd-is-picofarad"),
    pytest.param("Value [pF]", "value", "pF", id="square-brackets"),
    pytest.param("Qty (pcs)", "quantity", None, id="pieces-is-no-unit"),
    pytest.param("Info", "notes", None, id="nf-inside-a-word-is-no-unit"),
]


@pytest.mark.parametrize(("header", "field", "unit"), UNIT_CASES)
def test_a_unit_named_in_a_header_is_reported(header, field, unit):
    guess = guess_field(header, "bins")
    assert (guess.field, guess.unit) == (field, unit)
    hm = map_headers([header])
    assert hm.units == ({field: unit} if unit else {})


# BOM columns as KiCad/Altium-style exports and hand-made BOMs name them; common practice, no published source.
BOM_CASES = [
    pytest.param("Reference", "refs", id="reference"),
    pytest.param("Designator", "refs", id="designator"),
    pytest.param("Ref Des", "refs", id="ref-des"),
    pytest.param("Qty per board", "qty", id="qty-per-board"),
    pytest.param("Quantity", "qty", id="quantity"),
    pytest.param("Use", "application", id="use"),
    pytest.param("Purpose", "application", id="purpose"),
    pytest.param("Type", "part_type", id="type-is-part-type-in-a-bom"),
    pytest.param("Category", "part_type", id="category"),
    pytest.param("Tempco", "tempco", id="tempco"),
    pytest.param("TC", "tempco", id="tc"),
    pytest.param("Dielectric/Type", "dielectric", id="dielectric-type-is-still-dielectric"),
    pytest.param("Value", "value", id="value"),
    pytest.param("Description", "notes", id="description-is-notes"),
]


@pytest.mark.parametrize(("header", "field"), BOM_CASES)
def test_bom_headers_map_to_the_bom_vocabulary(header, field):
    assert guess_field(header, "bom").field == field


def test_vocabularies_name_exactly_the_agreed_fields():
    # The field names are a contract with intake and kit (CONTRACTS.md).
    assert BIN_FIELDS == ("marking", "value", "tolerance", "voltage", "dielectric", "colours", "quantity",
                          "location", "label", "cabinet", "notes", "minimum", "package", "mounting",
                          "date_code", "safety_class", "polarity", "rated_temp", "bin_key")
    assert BOM_FIELDS == ("refs", "qty", "value", "marking", "tolerance", "voltage", "dielectric",
                          "tempco", "application", "part_type", "notes", "package", "mounting", "dnp",
                          "fitted")


def test_a_whole_messy_sheet_maps_and_describes_itself():
    headers = ("Bin #", "Cap.", "WV", "Tol", "Dielectric/Type", "Qty on hand", "Quantitiy", "Supplier")
    hm = map_headers(headers)
    assert hm.field_to_index == {"location": 0, "value": 1, "voltage": 2, "tolerance": 3,
                                 "dielectric": 4, "quantity": 5}
    assert hm.unmapped == ("Quantitiy", "Supplier")
    assert hm.describe() == [
        "'Bin #' → location (alias)",
        "'Cap.' → value (alias)",
        "'WV' → voltage (alias)",
        "'Tol' → tolerance (alias)",
        "'Dielectric/Type' → dielectric (alias)",
        "'Qty on hand' → quantity (alias)",
        "'Quantitiy' → not used (also looks like quantity; 'Qty on hand' was used)",
        "'Supplier' → not used",
    ]
    assert hm.header_of("quantity") == "Qty on hand"
    assert hm.value(("A1", "104", "50", "K", "X7R", "20"), "voltage") == "50"
    assert hm.value(("A1",), "notes") is None


def test_a_fuzzy_match_is_described_with_its_score():
    hm = map_headers(["Quantitiy"])
    assert hm.describe() == ["'Quantitiy' → quantity (fuzzy 94)"]
    assert hm.how == {"quantity": "fuzzy"}


def test_an_exact_alias_beats_an_earlier_fuzzy_match_for_the_same_field():
    hm = map_headers(["Quantitiy", "Qty"])
    assert hm.field_to_index == {"quantity": 1}


def test_two_fields_scoring_alike_leave_the_header_unmapped_and_say_why():
    # rapidfuzz WRatio scores "tht/smd size" 90 for both package and mounting (measured).
    hm = map_headers(["Marking", "THT/SMD size"])
    assert hm.field_to_index == {"marking": 0}
    assert hm.describe()[1] == ("'THT/SMD size' → not used (could be package or mounting; "
                                "use --map FIELD=HEADER)")


def test_an_override_wins_over_the_guess_and_frees_the_guessed_field():
    hm = map_headers(["Bin", "Marking", "Stuff", "Notes"], overrides={"notes": "Stuff", "label": "Bin"})
    assert hm.field_to_index == {"label": 0, "marking": 1, "notes": 2}
    assert hm.describe()[0] == "'Bin' → label (--map)"
    assert hm.describe()[3] == "'Notes' → not used (also looks like notes; 'Stuff' was used)"


def test_an_override_matches_a_header_ignoring_case_and_punctuation():
    hm = map_headers(["Bin", "Cap value (nF)"], overrides={"value": "cap value nf"})
    assert hm.field_to_index == {"location": 0, "value": 1}
    assert hm.units == {"value": "nF"}


def test_an_empty_override_leaves_a_field_unmapped():
    hm = map_headers(["Marking", "Notes"], overrides={"notes": ""})
    assert hm.field_to_index == {"marking": 0}
    assert hm.describe()[1] == "'Notes' → not used (looks like notes, but --map notes= left it unmapped)"


OVERRIDE_ERRORS = [
    pytest.param({"colour": "Bands"}, "bins",
                 "--map: cannot read 'colour=Bands' (expected FIELD=HEADER with FIELD one of marking, value, "
                 "tolerance, voltage, dielectric, colours, quantity, location, label, cabinet, notes, minimum, "
                 "package, mounting, date_code, safety_class, polarity, rated_temp, bin_key)",
                 id="unknown-field"),
    pytest.param({"refs": "Refs"}, "bins", None, id="bom-field-in-a-bin-sheet"),
    pytest.param({"value": "Capp"}, "bins",
                 "--map: cannot read 'value=Capp' (expected a header of this sheet: 'Bin', 'Cap', 'Qty')",
                 id="unknown-header"),
    pytest.param({"value": "Cap", "marking": "Cap"}, "bins",
                 "--map: cannot read 'marking=Cap' (expected a header not already given to another field by --map)",
                 id="same-header-twice"),
]


@pytest.mark.parametrize(("overrides", "vocabulary", "message"), OVERRIDE_ERRORS)
def test_a_bad_override_is_refused_with_what_would_be_accepted(overrides, vocabulary, message):
    with pytest.raises(BadValue) as caught:
        map_headers(["Bin", "Cap", "Qty"], vocabulary, overrides)
    if message:
        assert str(caught.value) == message
    assert caught.value.exit_code == 2


def test_an_unknown_vocabulary_is_refused():
    with pytest.raises(BadValue, match="vocabulary: cannot read 'parts' \\(expected one of 'bins', 'bom'\\)"):
        map_headers(["Cap"], "parts")


# Header-row search scores; common practice, no published source.
ROW_SCORES = [
    pytest.param(("Bin #", "Cap.", "Qty", None, 104), 3, id="three-fields"),
    pytest.param(("Kingsbridge Radio: capacitor drawers, 2026",), 0, id="title-row"),
    pytest.param(("A1", "104", "20", "X7R"), 0, id="data-row"),
    pytest.param(("Notes", "Notes (2)", "Comments"), 1, id="one-field-thrice-counts-once"),
    pytest.param(("Refs", "Qty", "Value", "Use"), 4, id="bom-header"),
]


@pytest.mark.parametrize(("cells", "score"), ROW_SCORES)
def test_header_rows_score_by_distinct_fields(cells, score):
    assert header_row_score(cells) == score


@pytest.mark.parametrize(("raw", "clean"), [
    pytest.param("  Qty_on-hand ", "qty on hand", id="separators"),
    pytest.param("Marking / Code", "marking/code", id="slash-kept"),
    pytest.param("Bin\u00a0#", "bin #", id="no-break-space"),
])
def test_normalise_cleans_case_and_punctuation(raw, clean):
    # common practice, no published source
    assert normalise(raw) == clean


def test_split_unit_leaves_other_words_alone():
    # common practice, no published source
    assert split_unit("Tol %") == ("tol", None)
    assert split_unit("Value (pF)") == ("value", "pF")


@settings(max_examples=200, deadline=None)
@given(st.lists(st.text(max_size=30), max_size=12), st.sampled_from(["bins", "bom"]))
def test_mapping_any_headers_gives_each_field_at_most_one_real_column(headers, vocabulary):
    # invariant (no outside source needed): a total function over text, columns used once
    hm = map_headers(headers, vocabulary)
    indexes = list(hm.field_to_index.values())
    assert len(indexes) == len(set(indexes))
    assert all(0 <= i < len(headers) for i in indexes)
    extra = [i for cols in hm.also.values() for i in cols]
    assert not set(extra) & set(indexes)
    assert len(hm.unmapped) + len(indexes) + len(extra) == len(headers)
    assert len(hm.describe()) == len(headers) + (len(hm.reading_order()) > 1)


# CAD BOM exports name the footprint and a do-not-fit column (common practice, no published source).
@pytest.mark.parametrize(("header", "field"), [
    pytest.param("Footprint", "package", id="footprint"),
    pytest.param("DNP", "dnp", id="dnp"),
    pytest.param("Do not fit", "dnp", id="do-not-fit"),
    pytest.param("Populate", "fitted", id="populate"),
])
def test_cad_bom_headers_map_to_footprint_and_fitting_fields(header, field):
    assert guess_field(header, "bom").field == field
