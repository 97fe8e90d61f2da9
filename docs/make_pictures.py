"""The README's picture of a bin label, rendered from the PDF that `stock labels` writes.

Run from the top of the source tree after a change to how labels look:

    python3 docs/make_pictures.py

It imports the demo shop into a temporary database, writes a one-label sheet for one of its bins
(the same code path as the command), renders the page with PDFium at print resolution and keeps
the label's box as a small grey-scale PNG, ``docs/label.png``.
"""

from __future__ import annotations

import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
PICTURE = ROOT / "docs" / "label.png"
BIN = "cabinet a/a28"             # an X7R part: filled, outlined and grey tags all show
LAYOUT = "a4-3x8-70x37"
DPI = 200                         # enough to read the 5 pt type; keeps the file in tens of kB


def label_picture(out: Path = PICTURE, bin_ref: str = BIN, layout: str = LAYOUT, dpi: int = DPI) -> Path:
    """Write the picture of one label of the demo shop to ``out``; returns ``out``."""
    sys.path.insert(0, str(ROOT))
    import pypdfium2

    from stock.demo import DEMO_FILES, demo_source
    from stock.inventory.intake import import_file
    from stock.labels import make_labels
    from stock.store.database import open_store

    with tempfile.TemporaryDirectory() as folder:
        work = Path(folder)
        with open_store(work / "shop.db") as store:
            for name in DEMO_FILES:
                import_file(store, demo_source() / name)
            sheet = make_labels(store, work / "label.pdf", [bin_ref], layout=layout, frames=True)
        box = sheet.layout.label_box(0)
        pdf = pypdfium2.PdfDocument(str(sheet.path))
        try:
            image = pdf[0].render(scale=dpi / 72).to_pil().convert("L")
        finally:
            pdf.close()
    px = dpi / 25.4
    edge = 1                       # keep the frame line inside the picture
    crop = (round(float(box.x) * px) - edge, round(float(box.y) * px) - edge,
            round(float(box.x + box.w) * px) + edge, round(float(box.y + box.h) * px) + edge)
    image.crop(tuple(max(0, v) for v in crop)).save(out, optimize=True)
    return out


if __name__ == "__main__":
    written = label_picture()
    print(f"wrote {written.relative_to(ROOT)} ({written.stat().st_size // 1024} kB)")
