"""The README's pictures: a bin label, and the two drift charts of the inventory workbook.

Run from the top of the source tree after a change to how labels or the charts look:

    python3 docs/make_pictures.py

The label: the demo shop is imported into a temporary database, a one-label sheet is written for
one of its bins (the same code path as the command), the page is rendered with PDFium at print
resolution and the label's box is kept as a small grey-scale PNG, ``docs/label.png``.

The charts: the demo shop's inventory workbook is written by `stock export inventory`, a
spreadsheet program (LibreOffice, ``soffice``) prints it to PDF, ``pdftoppm`` renders the last
page (the "Drift charts" sheet) and each chart is cut out as ``docs/drift_class1.png`` and
``docs/drift_class2.png``. Without LibreOffice and pdftoppm the charts are skipped with a note.
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


CHARTS = (ROOT / "docs" / "drift_class1.png", ROOT / "docs" / "drift_class2.png")
CHART_DPI = 96


def _chart_boxes(image) -> list[tuple[int, int, int, int]]:
    """The boxes of the charts on the rendered page: runs of rows with ink, split by white bands."""
    width, height = image.size
    data = image.load()
    inked = [any(data[x, y] < 235 for x in range(0, width, 2)) for y in range(height)]
    runs, start = [], None
    for y, ink in enumerate(inked + [False]):
        if ink and start is None:
            start = y
        elif not ink and start is not None:
            if y - start > height // 10:           # a chart, not a stray line of text
                runs.append((start, y))
            start = None
    boxes = []
    for top, bottom in runs:
        cols = [x for x in range(width) if any(data[x, y] < 235 for y in range(top, bottom, 2))]
        boxes.append((max(0, cols[0] - 2), max(0, top - 2), min(width, cols[-1] + 3), min(height, bottom + 2)))
    return boxes


def chart_pictures(outs: tuple[Path, Path] = CHARTS, dpi: int = CHART_DPI) -> list[Path]:
    """Write the two drift charts of the demo shop's inventory workbook; returns the files written."""
    import shutil
    import subprocess

    if shutil.which("soffice") is None or shutil.which("pdftoppm") is None:
        print("skipped the drift charts: LibreOffice (soffice) and pdftoppm are needed to render them")
        return []
    sys.path.insert(0, str(ROOT))
    from PIL import Image

    from stock.demo import DEMO_FILES, demo_source
    from stock.inventory.intake import import_file
    from stock.sheets_out.exports import export_inventory
    from stock.store.database import open_store

    with tempfile.TemporaryDirectory() as folder:
        work = Path(folder)
        with open_store(work / "shop.db") as store:
            for name in DEMO_FILES:
                import_file(store, demo_source() / name)
            export_inventory(store, work / "inventory.xlsx")
        subprocess.run(["soffice", "--headless", "--convert-to", "pdf", "--outdir", str(work),
                        str(work / "inventory.xlsx")], check=True, capture_output=True, timeout=300)
        info = subprocess.run(["pdfinfo", str(work / "inventory.pdf")], capture_output=True, text=True,
                              check=True).stdout
        last = next(line.split()[-1] for line in info.splitlines() if line.startswith("Pages:"))
        subprocess.run(["pdftoppm", "-r", str(dpi), "-png", "-f", last, "-l", last,
                        str(work / "inventory.pdf"), str(work / "charts")], check=True, timeout=120)
        [page] = work.glob("charts*.png")
        image = Image.open(page).convert("RGB")
        boxes = _chart_boxes(image.convert("L"))
        written = []
        for out, box in zip(outs, boxes):
            image.crop(box).quantize(colors=64).save(out, optimize=True)
            written.append(out)
    return written


if __name__ == "__main__":
    for written in [label_picture(), *chart_pictures()]:
        print(f"wrote {written.relative_to(ROOT)} ({written.stat().st_size // 1024} kB)")
