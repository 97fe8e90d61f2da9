"""A small repair bench of our own (not the demo shop) and helpers to read label PDFs back."""

from __future__ import annotations

from pathlib import Path

import pytest

from stock.inventory.intake import import_file
from stock.store.database import open_store

# An invented bench: a radio repairer's parts shelf, with the awkward things labels must survive
# (a mains part, both polarities, a long marking, a long shelf name, a location that is not the key).
SHELF_CSV = """Shelf,Slot,Marking,Qty,Notes
Tidewater Bench,T1,101J 2A C0G,40,
Tidewater Bench,T2,104K 2A X7R,300,
Tidewater Bench,T3,X2 0.47uF 310VAC,12,mains filter spares
Tidewater Bench,T4,470uF 35V 105C electrolytic,25,
Tidewater Bench,T5,10uF 16V tantalum +,30,
Tidewater Bench,T6,473M 1H Y5V,60,
Tidewater Bench,T7,47K,15,
Tidewater Bench,T8,222J 630V polypropylene snubber grade long lead radial box type made for the old tube amplifier rebuilds,8,
Tidewater Bench,T9,4.7uF 50V bipolar electrolytic,10,
Tidewater Bench,T10,221J U2J,20,
Long Cabinet Of Leftover Parts From The Estate Sale Behind The Door,drawer 12 left side,331J 1H C0G,5,
Tidewater Bench,T12,1n0 C0G 50V,55,
"""
LONG_KEY = "long cabinet of leftover parts from the estate sale behind the door/drawer 12 left side"


@pytest.fixture
def shelf(tmp_path):
    """A store holding the invented shelf, imported the way a user would."""
    sheet = tmp_path / "tidewater_shelf.csv"
    sheet.write_text(SHELF_CSV, encoding="utf-8")
    store = open_store(tmp_path / "stock.db")
    import_file(store, sheet)
    yield store
    store.close()


PT_PER_MM = 72 / 25.4


def box_pt(box, page_h_mm) -> tuple[float, float, float, float]:
    """A layout box (mm from the top-left) as pdfplumber coordinates: x0, top, x1, bottom in pt."""
    return (float(box.x) * PT_PER_MM, float(box.y) * PT_PER_MM,
            float(box.x + box.w) * PT_PER_MM, float(box.y + box.h) * PT_PER_MM)


def chars_in(chars, area, slack: float = 0.01):
    """The characters whose whole box lies inside ``area`` (pdfplumber coordinates)."""
    x0, top, x1, bottom = area
    return [c for c in chars if c["x0"] >= x0 - slack and c["x1"] <= x1 + slack
            and c["top"] >= top - slack and c["bottom"] <= bottom + slack]


def text_of(chars) -> str:
    """Characters in reading order (line by line, left to right), a space wherever a line ends
    or a gap opens between two characters; spaces collapsed."""
    def baseline(c):
        return round(-c["matrix"][5], 0)

    ordered = sorted(chars, key=lambda c: (baseline(c), c["x0"]))
    text, last = "", None
    for c in ordered:
        if last is not None and (baseline(c) != baseline(last)
                                 or c["x0"] - last["x1"] > 0.15 * c["size"]):
            text += " "
        text += c["text"]
        last = c
    return " ".join(text.split())


def render_page(path: Path, page: int = 0, dpi: int = 300):
    """A page of the PDF as a PIL image (pypdfium2, the PDFium renderer)."""
    import pypdfium2

    pdf = pypdfium2.PdfDocument(str(path))
    try:
        return pdf[page].render(scale=dpi / 72).to_pil().convert("L")
    finally:
        pdf.close()
