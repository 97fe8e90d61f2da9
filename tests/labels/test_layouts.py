"""Sheet layouts: the paper sizes, the named sheet geometries, custom sizes and the refusals.

Sources: ISO 216 (A4 = 210 × 297 mm); ANSI/ASME Y14.1 (letter = 8.5 × 11 in, 1 in = 25.4 mm
exactly, NIST); the named sheets' label sizes, pitches and margins are from memory of common
label sheets (common practice, no published source); the 5 mm unprintable band is common practice.
"""

from __future__ import annotations

from decimal import Decimal as D

import pytest

from stock.errors import BadLayout
from stock.labels.layouts import (LAYOUTS, PAPERS, check_layout, choose_layout, custom_layout,
                                  named_layout, parse_grid, parse_margins)


def test_a4_and_letter_have_their_standard_sizes():
    assert PAPERS["a4"] == (D(210), D(297))                             # ISO 216
    assert PAPERS["letter"] == (D("8.5") * D("25.4"), D(11) * D("25.4"))   # ANSI letter in mm


@pytest.mark.parametrize("name", sorted(LAYOUTS))
def test_every_named_layout_fits_on_its_paper(name):
    layout = LAYOUTS[name]
    check_layout(layout)
    last = layout.label_box(layout.per_page - 1)
    page_w, page_h = layout.page_size
    assert last.x + last.w <= page_w and last.y + last.h <= page_h


@pytest.mark.parametrize("name, per_page, size", [
    pytest.param("a4-3x8-70x37", 24, (D(70), D(37)), id="a4-24-up"),
    pytest.param("a4-5x13-38x21", 65, (D("38.1"), D("21.2")), id="a4-65-up"),
    pytest.param("letter-3x10-67x25", 30, (D("2.625") * D("25.4"), D(1) * D("25.4")), id="letter-2.625x1in"),
    pytest.param("letter-2x10-102x25", 20, (D(4) * D("25.4"), D("25.4")), id="letter-4x1in"),
    pytest.param("letter-2x5-102x51", 10, (D(4) * D("25.4"), D(2) * D("25.4")), id="letter-4x2in"),
])
def test_named_layouts_carry_the_sheet_geometry_their_name_says(name, per_page, size):
    layout = named_layout(name)
    assert layout.per_page == per_page and (layout.label_w, layout.label_h) == size


def test_positions_run_left_to_right_then_down_one_pitch_apart():
    layout = named_layout("letter-3x10-67x25")           # pitch 2.75 in across, 1 in down
    first, second, fourth = layout.label_box(0), layout.label_box(1), layout.label_box(3)
    assert (first.x, first.y) == (D("4.7625"), D("12.7"))           # 3/16 in, 1/2 in
    assert second.x - first.x == D("2.75") * D("25.4") and second.y == first.y
    assert fourth.x == first.x and fourth.y - first.y == D("25.4")
    assert layout.label_box(30) == first                            # the next sheet starts over


def test_a_layout_name_is_its_paper_grid_and_rounded_size():
    for name, layout in LAYOUTS.items():
        paper, grid, size = name.split("-")
        assert paper == layout.paper and grid == f"{layout.columns}x{layout.rows}"
        width, height = (int(v) for v in size.split("x"))
        assert abs(layout.label_w - width) <= D("0.5") and abs(layout.label_h - height) <= D("0.5")


def test_a_custom_size_without_a_grid_fills_the_page_inside_the_unprintable_band():
    layout = custom_layout("a4", (D(60), D(30)))
    assert (layout.columns, layout.rows) == (3, 9)       # 3 × 60 ≤ 200, 9 × 30 ≤ 287
    assert layout.left == D(15) and layout.top == D("13.5")   # centred: (210 − 180) / 2, (297 − 270) / 2


@pytest.mark.parametrize("options, what, words", [
    pytest.param({"size": "70x37", "grid": "4x8"}, "--grid 4x8", "at most 3 columns", id="too-many-columns"),
    pytest.param({"size": "70x37", "grid": "3x9"}, "--grid 3x9", "at most 8 rows", id="too-many-rows"),
    pytest.param({"size": "300x40"}, "--size 300x40", "larger than an A4 page", id="label-wider-than-page"),
    pytest.param({"size": "50x290", "paper": "letter"}, "--size 50x290", "larger than a US Letter page", id="label-taller-than-letter"),
    pytest.param({"size": "20x10"}, "--size 20x10", "too small", id="too-small"),
    pytest.param({"size": "0x30"}, "--size 0x30", "above 0 mm", id="zero-width"),
    pytest.param({"margins": "-2,5"}, "--margins -2,5", "cannot be negative", id="negative-margin"),
    pytest.param({"size": "50x30", "gap": "-1x0"}, "--gap -1x0", "cannot be negative", id="negative-gap"),
    pytest.param({"name": "a4-3x8-70x37", "margins": "0,1"}, "--grid 3x8", "left margin of 1 mm", id="margin-pushes-off"),
    pytest.param({"name": "a4-5x13-38x21", "paper": "letter"}, "--layout a4-5x13-38x21", "not letter", id="wrong-paper"),
    pytest.param({"name": "a4-3x8-70x37", "size": "70x37"}, "--layout with --size", "either", id="both"),
    pytest.param({"grid": "3x8"}, "--grid", "--size", id="grid-alone"),
    pytest.param({"name": "sheet-of-labels"}, "--layout", "one of a4-3x8-70x37", id="unknown-name"),
    pytest.param({"paper": "a5"}, "--paper a5", "one of a4, letter", id="unknown-paper"),
    pytest.param({"size": "seventy"}, "--size seventy", "WxH in mm", id="unreadable-size"),
])
def test_an_impossible_layout_is_refused_naming_the_option_and_what_would_do(options, what, words):
    with pytest.raises(BadLayout) as caught:
        choose_layout(**options)
    assert caught.value.what == what and caught.value.exit_code == 2
    assert words in str(caught.value) and "\n" not in str(caught.value)


def test_the_paper_picks_its_default_layout():
    assert choose_layout().name == "a4-3x8-70x37"
    assert choose_layout(paper="letter").name == "letter-3x10-67x25"


def test_margins_move_a_named_layout_to_correct_a_printer_offset():
    moved = choose_layout(name="a4-4x10-48x25", margins="20,9")
    assert (moved.top, moved.left) == (D(20), D(9)) and moved.per_page == 40


@pytest.mark.parametrize("text, expected", [("10,4.5", (D(10), D("4.5"))), ("8", (D(8), D(8))),
                                            ("12 mm, 3mm", (D(12), D(3)))])
def test_margins_read_top_then_left(text, expected):
    assert parse_margins(text) == expected


@pytest.mark.parametrize("text", ["3x2.5", "0x8", "x8", "3 by 8"])
def test_a_grid_is_two_whole_numbers_of_at_least_one(text):
    with pytest.raises(BadLayout):
        parse_grid(text)
