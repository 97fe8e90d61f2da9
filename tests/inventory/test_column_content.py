"""Columns judged by what their cells hold: values, bin locations, counts, reference designators.

Sources: the codes are IEC 60062 (``104`` = 100 nF, ``4n7`` = 4.7 nF); the thresholds and the
shapes of locations and designators are common practice in shop sheets and BOMs, no published
source. The sheets are invented, headed with phrases people type.
"""

from __future__ import annotations

import pytest

from importers.headers import map_headers
from stock.inventory.column_content import (bin_sheet_evidence, bom_evidence, describe_columns,
                                            map_by_content, profile_column, profile_sheet)


def test_a_column_of_codes_and_values_holds_values():
    p = profile_column(["104K 2A", "4n7", "10uF 25V", "", "22p", "CAP CER 0.1UF 50V X7R 0603"])
    assert p.cells == 5 and p.holds_values()


def test_a_column_of_bare_counts_is_not_a_value_column():
    p = profile_column(["25", "100", "3", "47", "220"])
    assert p.holds_counts() and not p.holds_values()


def test_drawer_names_are_locations_even_where_a_code_could_read_them():
    p = profile_column(["K1", "K2", "K3", "K10", "K11"])
    assert p.holds_locations() and not p.holds_values()


def test_lists_of_designators_mark_a_bom():
    p = profile_column(["C1, C2", "C3-C5", "C7", "C8 C9"])
    assert p.holds_references()
    assert bom_evidence(["Parts on the board"], [p]) is not None


def test_single_codes_like_a1_are_not_taken_for_designators():
    p = profile_column(["A1", "A2", "B7", "C12"])
    assert bom_evidence(["Where"], [p]) is None and p.holds_locations()


HEADERS = ["What is printed on it", "Where it lives", "How many we have", "Who bought it"]
ROWS = [["104K 2A", "A1", 25, "Sam"], ["4n7 C0G", "A2", 10, "Sam"], ["47uF 25V", "B1", 4, "Jo"],
        ["2n2 J", "B2", 7, None], ["1k", "B3", 3, "Jo"]]


def test_plain_words_headers_are_mapped_by_content_and_say_so():
    hm = map_by_content(map_headers(HEADERS), profile_sheet(HEADERS, ROWS))
    assert hm.field_to_index == {"marking": 0, "location": 1, "quantity": 2}
    described = hm.describe()
    assert described[0] == "'What is printed on it' → marking (content 80 %)"
    assert described[1] == "'Where it lives' → location (content 100 %)"
    assert described[2] == "'How many we have' → quantity (content 100 %)"


def test_content_never_overrides_an_alias_or_a_map():
    headers = ["Qty", "Marking", "Shelf spot"]
    rows = [[3, "104", "A1"], [4, "4n7", "A2"], [5, "10uF", "A3"]]
    hm = map_headers(headers, overrides={"location": ""})
    hm = map_by_content(hm, profile_sheet(headers, rows))
    assert hm.field_to_index == {"quantity": 0, "marking": 1}
    assert hm.how["quantity"] == "alias" and hm.how["marking"] == "alias"


def test_a_second_value_column_found_by_content_is_read_after_the_first():
    headers = ["Marking", "Printed on the reel"]
    rows = [["104", "100nF 50V"], [None, "4n7 100V"], ["222", None]]
    hm = map_by_content(map_headers(headers), profile_sheet(headers, rows))
    assert hm.reading_order() == (("marking", 0), ("marking", 1))


def test_a_refusal_says_what_each_column_holds():
    headers = ["Shelf", "Pieces", "Remarks"]
    text = describe_columns(headers, profile_sheet(headers, [["A1", 3, "old stock"], ["A2", 4, "new"]]))
    assert text == "'Shelf' (bin locations), 'Pieces' (whole numbers), 'Remarks' (text such as 'old stock')"


@pytest.mark.parametrize("headers, rows, looks_like_bins", [
    pytest.param(["Drawer", "Code", "Qty"], [["A1", "104", 3]], True, id="bin-sheet"),
    pytest.param(["Ref", "Qty", "Value"], [["C1, C2", 2, "100n"]], False, id="bom"),
])
def test_a_bin_sheet_is_told_from_a_bom(headers, rows, looks_like_bins):
    found = bin_sheet_evidence(headers, profile_sheet(headers, rows))
    assert (found is not None) == looks_like_bins
