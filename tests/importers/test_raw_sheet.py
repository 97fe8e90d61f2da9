"""Shaping a stream of rows into a sheet: the header found, columns named, rows aligned, nothing dropped.

The rules are this project's own (written in importers/raw_sheet.py's docstring); the expected names
and row numbers below are worked by hand from those rules.
"""

from __future__ import annotations

import datetime as dt

import pytest

from importers.raw_sheet import RawRow, RawSheet, clean_cell, is_blank, make_headers, shape_sheet


@pytest.mark.parametrize("value, blank", [
    pytest.param(None, True, id="none"),
    pytest.param("", True, id="empty"),
    pytest.param(" \t ", True, id="whitespace"),
    pytest.param("0", False, id="zero-text"),
    pytest.param(0, False, id="zero-number"),
])
def test_is_blank_means_none_or_only_whitespace(value, blank):
    assert is_blank(value) is blank


@pytest.mark.parametrize("value, cleaned", [
    pytest.param("  ", None, id="blank-text-is-none"),
    pytest.param(104.0, 104, id="an-integral-float-is-an-int-so-104-stays-a-code"),
    pytest.param(0.1, 0.1, id="a-fraction-stays"),
    pytest.param(float("inf"), float("inf"), id="infinity-stays"),
    pytest.param(" 104 ", " 104 ", id="text-kept-as-read"),
])
def test_clean_cell(value, cleaned):
    assert clean_cell(value) == cleaned


@pytest.mark.parametrize("cells, headers", [
    pytest.param(["Notes", None, "notes", "Qty", None, None], ("Notes", "column 2", "notes (2)", "Qty"),
                 id="blank-named-repeat-numbered-trailing-dropped"),
    pytest.param(["Qty", "Qty", "Qty"], ("Qty", "Qty (2)", "Qty (3)"), id="three-repeats"),
    pytest.param(["Qty", "Qty (2)", "Qty"], ("Qty", "Qty (2)", "Qty (3)"), id="a-repeat-skips-a-taken-name"),
    pytest.param(["Marking\nCode", "  Qty  "], ("Marking Code", "Qty"), id="wrapped-text-on-one-line"),
    pytest.param([dt.date(2026, 12, 1)], ("2026-12-01",), id="a-date-header-as-iso-text"),
    pytest.param([None, None], (), id="all-blank"),
])
def test_make_headers_names_every_column_uniquely(cells, headers):
    assert make_headers(cells) == headers


def _numbered(rows, start=1):
    return iter([(n, tuple(clean_cell(c) for c in r)) for n, r in enumerate(rows, start=start)])


def test_the_header_is_found_below_a_title_and_the_title_is_kept():
    rows = [["Drawer list, workshop B"], [None, None, None], ["Location", "Marking", "Qty"],
            ["A1", "104", 5], [None, None, None], ["A2", "472", None]]
    sheet = shape_sheet("f.csv", None, _numbered(rows))
    assert sheet.header_row == 3
    assert sheet.headers == ("Location", "Marking", "Qty")
    assert [r.number for r in sheet.skipped_above] == [1]
    body = list(sheet.rows)
    assert [r.number for r in body] == [4, 6]          # the blank row 5 is skipped, numbers kept
    assert body[1].cells == ("A2", "472", None)


def test_short_rows_are_padded_and_cells_beyond_the_header_kept_as_extra():
    rows = [["Location", "Marking"], ["A1"], ["A2", "104", None, "spare"]]
    body = list(shape_sheet("f.csv", None, _numbered(rows)).rows)
    assert body[0] == RawRow(2, ("A1", None))
    assert body[1] == RawRow(3, ("A2", "104"), (("column 4", "spare"),))


def test_with_no_known_header_the_fullest_row_is_the_header():
    rows = [["Workshop B"], ["foo", "bar", "baz"], ["1", "2", "3"]]
    sheet = shape_sheet("f.csv", None, _numbered(rows))
    assert sheet.headers == ("foo", "bar", "baz")
    assert sheet.header_row == 2


def test_a_stream_with_no_filled_row_gives_none():
    assert shape_sheet("f.csv", None, _numbered([[None], [None, None]])) is None
    assert shape_sheet("f.csv", None, iter(())) is None


def test_a_raw_record_leaves_blanks_out_and_makes_dates_json_text():
    s = RawSheet("f.csv", None, 1, ("Marking", "Qty", "Date"), iter(()))
    row = RawRow(2, ("104", None, dt.date(2026, 1, 31)), (("column 4", float("nan")),))
    assert s.raw_record(row) == {"Marking": "104", "Date": dt.date(2026, 1, 31), "column 4": row.extra[0][1]}
    assert s.raw_record(row, jsonable=True) == {"Marking": "104", "Date": "2026-01-31", "column 4": "nan"}
