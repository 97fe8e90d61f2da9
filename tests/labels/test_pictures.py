"""The README's label picture is regenerated from the PDF and stays small and scannable.

Sources: zxing-cpp decodes the picture's code (a reference decoder); "tens of kB" is this
project's own limit for pictures committed with the README.
"""

from __future__ import annotations

import runpy
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]


def test_the_label_picture_is_made_from_the_pdf_small_and_its_code_scans(tmp_path):
    zxingcpp = pytest.importorskip("zxingcpp")
    from PIL import Image

    script = runpy.run_path(str(ROOT / "docs" / "make_pictures.py"))
    out = script["label_picture"](tmp_path / "label.png")
    assert out.stat().st_size < 60_000
    image = Image.open(out)
    assert image.size == pytest.approx((70 / 25.4 * 200 + 2, 37 / 25.4 * 200 + 2), abs=2)
    assert [code.text for code in zxingcpp.read_barcodes(image)] == ["BIN:CABINET A/A28"]


def test_the_committed_picture_is_small():
    assert (ROOT / "docs" / "label.png").stat().st_size < 60_000
    assert "docs/label.png" in (ROOT / "README.md").read_text(encoding="utf-8")
