"""Label sheets read back from the PDF: every fact on its own label, inside its box, and scannable.

Sources: the PDF is read back with pdfplumber (text and character boxes) and rendered with PDFium
(pypdfium2); the QR codes are decoded with zxing-cpp, a reference decoder independent of the
encoder (segno). Sheet geometries are from memory of common label sheets (common practice, no
published source); the 5 pt floor is this project's legibility rule (common practice).
"""

from __future__ import annotations

import pdfplumber
import pytest

from stock.labels.content import select_labels
from stock.labels.fitting import MIN_PT
from stock.labels.layouts import choose_layout, named_layout
from stock.labels.render import write_labels
from stock.scan_codes import bin_key_from_scan
from tests.labels.conftest import LONG_KEY, PT_PER_MM, box_pt, chars_in, render_page, text_of

# The smallest and the default sheets, two letter sheets, and a custom portrait label of our own.
LAYOUTS = ["a4-5x13-38x21", "a4-3x8-70x37", "letter-3x10-67x25", "letter-2x5-102x51", "size=30x50 grid=6x5"]


def label_text(pdf, layout, position, inner=False):
    """The text on one label position (pages follow each other), read back from the PDF."""
    box = layout.label_box(position)
    box = box.inset(layout.padding) if inner else box
    return text_of(chars_in(pdf.pages[position // layout.per_page].chars, box_pt(box, layout.page_size[1])))


def _sheet(store, tmp_path, name, **options):
    if name and "=" in name:
        options = dict(part.split("=") for part in name.split())
        name = None
    layout = choose_layout(name=name) if name else choose_layout(**options)
    labels = select_labels(store)
    sheet = write_labels(labels, layout, tmp_path / "labels.pdf", frames=False)
    return sheet, layout, labels


@pytest.mark.parametrize("name", LAYOUTS)
def test_every_bins_value_and_key_are_on_its_own_label_in_grid_order(shelf, tmp_path, name):
    sheet, layout, labels = _sheet(shelf, tmp_path, name)
    with pdfplumber.open(sheet.path) as pdf:
        texts = [label_text(pdf, layout, position) for position in range(len(labels))]
    for position, (facts, text) in enumerate(zip(labels, texts)):
        assert facts.value in text, (position, facts.bin_key, text)
        if facts.bin_key != LONG_KEY or layout.label_w > 40:     # see the next test for narrow labels
            assert "bin " + facts.bin_key in text, (position, facts.bin_key, text)


def test_a_key_too_long_for_the_smallest_label_keeps_its_location_end(shelf, tmp_path):
    sheet, layout, labels = _sheet(shelf, tmp_path, "a4-5x13-38x21")
    position = next(p for p, f in enumerate(labels) if f.bin_key == LONG_KEY)
    with pdfplumber.open(sheet.path) as pdf:
        text = text_of(chars_in(pdf.pages[0].chars, box_pt(layout.label_box(position), layout.page_size[1])))
    assert "bin …/drawer 12 left side" in text


@pytest.mark.parametrize("name", LAYOUTS)
def test_no_character_leaves_its_label_padding(shelf, tmp_path, name):
    sheet, layout, labels = _sheet(shelf, tmp_path, name)
    with pdfplumber.open(sheet.path) as pdf:
        for number, page in enumerate(pdf.pages):
            positions = range(number * layout.per_page, min(len(labels), (number + 1) * layout.per_page))
            inner = [box_pt(layout.label_box(p).inset(layout.padding), layout.page_size[1]) for p in positions]
            for c in page.chars:
                assert any(chars_in([c], area) for area in inner), \
                    f"{c['text']!r} at {c['x0']:.1f},{c['top']:.1f} on page {number + 1} overflows"


def test_the_smallest_layout_sets_no_type_below_five_points(shelf, tmp_path):
    sheet, _, _ = _sheet(shelf, tmp_path, "a4-5x13-38x21")
    with pdfplumber.open(sheet.path) as pdf:
        sizes = [c["size"] for c in pdf.pages[0].chars]
    assert sizes and min(sizes) >= MIN_PT - 0.01


def test_the_value_is_the_largest_type_on_each_label(shelf, tmp_path):
    sheet, layout, labels = _sheet(shelf, tmp_path, "a4-3x8-70x37")
    with pdfplumber.open(sheet.path) as pdf:
        chars = pdf.pages[0].chars
    for position, facts in enumerate(labels):
        inside = chars_in(chars, box_pt(layout.label_box(position), layout.page_size[1]))
        biggest = max(c["size"] for c in inside)
        value_sizes = {round(c["size"], 2) for c in inside if c["size"] == biggest}
        assert text_of([c for c in inside if c["size"] == biggest]).startswith(facts.value[:2]), facts.bin_key
        assert len(value_sizes) == 1


@pytest.mark.parametrize("name", ["a4-5x13-38x21", "a4-3x8-70x37", "letter-3x10-67x25", "size=30x50 grid=6x5"])
def test_each_qr_code_decodes_to_the_bin_key_of_the_label_it_sits_on(shelf, tmp_path, name):
    zxingcpp = pytest.importorskip("zxingcpp")
    sheet, layout, labels = _sheet(shelf, tmp_path, name)
    dpi = 300
    image = render_page(sheet.path, dpi=dpi)
    found = {}
    for code in zxingcpp.read_barcodes(image):
        centre_x = sum(p.x for p in (code.position.top_left, code.position.bottom_right)) / 2
        centre_y = sum(p.y for p in (code.position.top_left, code.position.bottom_right)) / 2
        mm_x, mm_y = centre_x / dpi * 25.4, centre_y / dpi * 25.4
        for position in range(len(labels)):
            box = layout.label_box(position)
            if box.x <= mm_x <= box.x + box.w and box.y <= mm_y <= box.y + box.h:
                found[position] = bin_key_from_scan(code.text)
    assert found == {p: facts.bin_key for p, facts in enumerate(labels)}
    with pdfplumber.open(sheet.path) as pdf:
        chars = pdf.pages[0].chars
    pt_per_px = 72 / dpi
    for code in zxingcpp.read_barcodes(image):
        corners = (code.position.top_left, code.position.top_right, code.position.bottom_left,
                   code.position.bottom_right)
        x0, x1 = min(p.x for p in corners) * pt_per_px, max(p.x for p in corners) * pt_per_px
        top, bottom = min(p.y for p in corners) * pt_per_px, max(p.y for p in corners) * pt_per_px
        for c in chars:
            apart = c["x1"] <= x0 or c["x0"] >= x1 or c["bottom"] <= top or c["top"] >= bottom
            assert apart, f"{c['text']!r} overlaps the code {code.text}"


def test_labels_past_one_sheet_go_on_the_next_page_and_skip_passes_over_used_positions(shelf, tmp_path):
    layout = named_layout("letter-2x5-102x51")      # 10 a sheet
    labels = select_labels(shelf)                     # 12 bins
    sheet = write_labels(labels, layout, tmp_path / "two.pdf", skip=7)
    assert sheet.pages == 2 and sheet.skipped == 7
    with pdfplumber.open(sheet.path) as pdf:
        first, second = pdf.pages[0].chars, pdf.pages[1].chars
        assert len(pdf.pages) == 2
    page_h = layout.page_size[1]
    for position in range(7):
        assert not chars_in(first, box_pt(layout.label_box(position), page_h))
    assert labels[0].value in text_of(chars_in(first, box_pt(layout.label_box(7), page_h)))
    assert labels[3].bin_key in text_of(chars_in(second, box_pt(layout.label_box(0), page_h)))


def test_flagged_bins_say_they_need_a_look_and_others_do_not(shelf, tmp_path):
    sheet, layout, labels = _sheet(shelf, tmp_path, "a4-3x8-70x37")
    with pdfplumber.open(sheet.path) as pdf:
        chars = pdf.pages[0].chars
    for position, facts in enumerate(labels):
        text = text_of(chars_in(chars, box_pt(layout.label_box(position), layout.page_size[1])))
        assert ("needs a look" in text) == bool(facts.look), facts.bin_key


def test_a_safety_part_shows_its_class_and_an_electrolytic_its_marked_lead(shelf, tmp_path):
    # IEC 60384-14 class X2 printed on the part; aluminium electrolytics mark the negative lead
    # (common practice, no published source).
    sheet, layout, labels = _sheet(shelf, tmp_path, "a4-5x13-38x21")
    with pdfplumber.open(sheet.path) as pdf:
        chars = pdf.pages[0].chars
    by_key = {f.bin_key: p for p, f in enumerate(labels)}

    def text(key):
        return text_of(chars_in(chars, box_pt(layout.label_box(by_key[key]), layout.page_size[1])))

    assert "310 V AC" in text("tidewater bench/t3") and "X2" in text("tidewater bench/t3")
    assert "− lead marked" in text("tidewater bench/t4")
    assert "+ lead marked" in text("tidewater bench/t5")


def test_the_fit_for_tags_are_printed_in_the_table_order(shelf, tmp_path):
    sheet, layout, labels = _sheet(shelf, tmp_path, "a4-3x8-70x37")
    with pdfplumber.open(sheet.path) as pdf:
        chars = pdf.pages[0].chars
    text = text_of(chars_in(chars, box_pt(layout.label_box(1), layout.page_size[1])))
    assert "TU TI SI BY BU MA" in text


def test_a_long_marking_wraps_or_is_shortened_inside_the_label(shelf, tmp_path):
    sheet, layout, labels = _sheet(shelf, tmp_path, "a4-3x8-70x37")
    position = next(p for p, f in enumerate(labels) if f.bin_key == "tidewater bench/t8")
    with pdfplumber.open(sheet.path) as pdf:
        page = pdf.pages[0]
        inner = box_pt(layout.label_box(position).inset(layout.padding), layout.page_size[1])
        text = text_of(chars_in(page.chars, inner))
    assert "marked 222J 630V polypropylene" in text and "…" in text
    assert dict(sheet.trims)["tidewater bench/t8"] == ("marking",)


def test_a_half_written_sheet_never_replaces_the_previous_file(shelf, tmp_path, monkeypatch):
    from reportlab.pdfgen.canvas import Canvas

    out = tmp_path / "labels.pdf"
    out.write_bytes(b"the sheet printed last week")

    def full_disk(self):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(Canvas, "save", full_disk)
    from stock.errors import StoreProblem
    with pytest.raises(StoreProblem, match="No space left on device"):
        write_labels(select_labels(shelf), named_layout("a4-3x8-70x37"), out)
    assert out.read_bytes() == b"the sheet printed last week"
    assert [p.name for p in tmp_path.iterdir() if p.name.startswith(".")] == []


def test_the_page_is_the_paper_size_in_points(shelf, tmp_path):
    # ISO 216 A4 is 210 × 297 mm; ANSI letter 8.5 × 11 in = 612 × 792 pt.
    for name, size in (("a4-3x8-70x37", (210 * PT_PER_MM, 297 * PT_PER_MM)), ("letter-3x10-67x25", (612, 792))):
        sheet, _, _ = _sheet(shelf, tmp_path, name)
        with pdfplumber.open(sheet.path) as pdf:
            assert pdf.pages[0].width == pytest.approx(size[0], abs=0.01)
            assert pdf.pages[0].height == pytest.approx(size[1], abs=0.01)
