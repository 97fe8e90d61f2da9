"""Drawing label sheets as PDF: each label's facts set to fit, a QR code of its bin, page after page.

A landscape label keeps the text on the left and the QR code on the right, top-aligned; a label
taller than it is wide puts the code under the text. The code is drawn as vector squares with a
two-module border inside its square, and the text keeps two more modules away, so the quiet zone
is at least four modules on the text side (ISO/IEC 18004) and the label's own padding adds to it
on the others. Text is set in the Bitstream Vera faces that ship with the PDF library, so ``±``,
``µ``, ``−``, ``…`` and ``°`` print the same on every machine; nothing is taken from the system.

The sheet is written to a temporary file beside the target and renamed over it when complete:
an error midway leaves any earlier file untouched.
"""

from __future__ import annotations

import os
from collections.abc import Sequence
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from stock.errors import BadLayout, StoreProblem
from stock.labels.content import LabelFacts
from stock.labels.fitting import Block, Line, Run, fit_block, pad, run_width
from stock.labels.layouts import Box, Layout

PT_PER_MM = 72 / 25.4
FONT, FONT_BOLD = "StockLabelSans", "StockLabelSansBold"
QR_MAX_MM = 24.0          # larger modules add nothing a handheld scanner needs
QR_SHARE = 0.38           # of a landscape label's inner width
QR_BORDER = 2             # modules of white drawn inside the code's square
GREY = 0.55               # the faint tags of the fit-for mark (unfit), and frames
VALUE_SCALE = 2.1         # the value, as a multiple of the small type
RATING_SCALE = 1.2        # tolerance, voltage and safety class

BOX_BELOW, BOX_ABOVE = 0.24, 0.9     # a boxed run's box, below and above the baseline (em)

GRADE_STYLE = {"fit": "inverted", "marginal": "boxed", "unknown": "dashed", "unfit": "faint"}


@lru_cache(maxsize=1)
def _fonts() -> None:
    # reportlab is heavy: imported only when a sheet is drawn, and its fonts registered once.
    import reportlab
    from reportlab.pdfbase import pdfmetrics
    from reportlab.pdfbase.ttfonts import TTFont

    faces = Path(reportlab.__file__).resolve().parent / "fonts"   # the library's own copy, never a system one
    pdfmetrics.registerFont(TTFont(FONT, str(faces / "Vera.ttf")))
    pdfmetrics.registerFont(TTFont(FONT_BOLD, str(faces / "VeraBd.ttf")))


def measure(text: str, bold: bool, size: float) -> float:
    """The width of ``text`` in pt, in the label face (widths grow in proportion to the size)."""
    return _unit_width(text, bold) * size


@lru_cache(maxsize=65536)
def _unit_width(text: str, bold: bool) -> float:
    # The fitter measures the same words at many sizes: measure each once, at 1 pt.
    from reportlab.pdfbase.pdfmetrics import stringWidth

    _fonts()
    return stringWidth(text, FONT_BOLD if bold else FONT, 1.0)


def _location_note(facts: LabelFacts) -> str:
    tail = facts.bin_key.rsplit("/", 1)[-1]
    if facts.location and facts.location.strip().casefold() != tail:
        return f" · at {facts.location.strip()}"
    return ""


def label_lines(facts: LabelFacts) -> list[Line]:
    """The lines of one label, top to bottom, with how each may wrap and when it may be left out."""
    lines = [Line((Run(facts.value, bold=True, scale=VALUE_SCALE),)
                  + ((Run(facts.tolerance, scale=RATING_SCALE),) if facts.tolerance else ()), name="value")]
    rating = ((Run(facts.voltage, scale=RATING_SCALE),) if facts.voltage else ()) + (
        (Run(facts.safety_class, bold=True, scale=RATING_SCALE, style="inverted"),) if facts.safety_class else ())
    if rating:
        lines.append(Line(rating, name="rating"))
    if facts.dielectric:
        lines.append(Line((Run(facts.dielectric),), wrap=2, drop=2, name="dielectric"))
    if facts.polarity:
        lines.append(Line((Run(facts.polarity, bold=True),), wrap=2, name="polarity"))
    lines.append(Line(tuple(Run(tag, bold=True, scale=0.95, style=GRADE_STYLE.get(word, "dashed"))
                            for _, tag, word in facts.fitness), wrap=2, drop=3, cells=True, name="fit-for"))
    lines.append(Line((Run("marked " + " ".join(facts.marking.split())),), wrap=2, drop=1, name="marking"))
    tail = facts.bin_key.rsplit("/", 1)[-1]
    lines.append(Line((Run("bin " + facts.bin_key + _location_note(facts)),), wrap=3, name="bin",
                      fallback=f"bin …/{tail}{_location_note(facts)}"))
    if facts.look:
        lines.append(Line((Run("needs a look: " + ", ".join(facts.look), bold=True, style="inverted"),),
                          wrap=3, name="needs a look"))
    return lines


@dataclass(frozen=True)
class Placed:
    """Where one label's parts went, in pt from the page's bottom-left corner (PDF coordinates)."""

    text: tuple[float, float, float, float]     # x, y (bottom), width, height of the text region
    code: tuple[float, float, float]            # x, y (bottom), side of the code's square
    modules: int                                # modules across the code, its border left out
    wide: tuple[float, float] | None = None     # (depth, width): text under the code may run wider


def _qr(payload: str):  # noqa: ANN202  (a segno.QRCode)
    import segno   # pure Python, imported when a code is drawn

    return segno.make(payload, error="m", micro=False)


def place(box: Box, padding: float, page_h_pt: float, modules: int) -> Placed:
    """Split a label's inner box between text and code (see the module docstring)."""
    inner = box.inset(padding)
    x, top = float(inner.x) * PT_PER_MM, page_h_pt - float(inner.y) * PT_PER_MM
    w, h = float(inner.w) * PT_PER_MM, float(inner.h) * PT_PER_MM
    limit = QR_MAX_MM * PT_PER_MM
    if w >= 1.15 * h:
        side = min(h, QR_SHARE * w, limit)
        module = side / (modules + 2 * QR_BORDER)
        text_w = w - side - 2 * module
        # Under the code (past its white border and one more module) the text may use the full width.
        return Placed((x, top - h, text_w, h), (x + w - side, top - side, side), modules,
                      (side - module, w))
    side = min(0.62 * w, 0.45 * h, limit)
    module = side / (modules + 2 * QR_BORDER)
    text_h = h - side - 2 * module
    return Placed((x, top - text_h, w, text_h), (x + (w - side) / 2, top - h, side), modules)


def _draw_code(canvas, code, x: float, y: float, side: float) -> None:
    matrix = code.matrix
    n = len(matrix)
    module = side / (n + 2 * QR_BORDER)
    path = canvas.beginPath()
    for r, row in enumerate(matrix):
        c = 0
        while c < n:
            if row[c]:
                start = c
                while c < n and row[c]:
                    c += 1
                path.rect(x + (QR_BORDER + start) * module, y + side - (QR_BORDER + r + 1) * module,
                          (c - start) * module, module)
            else:
                c += 1
    canvas.setFillGray(0)
    canvas.drawPath(path, stroke=0, fill=1)


def _draw_run(canvas, run: Run, x: float, baseline: float) -> float:
    """Draw one run with its baseline at ``baseline``; returns its width."""
    width = run_width(run, measure)
    inner = pad(run.size) if run.padded else 0.0
    # Vera's capitals reach 0.73 em and its descenders 0.24 em: the box frames both with a margin.
    bottom, height = baseline - BOX_BELOW * run.size, (BOX_BELOW + BOX_ABOVE) * run.size
    if run.style == "inverted":
        canvas.setFillGray(0)
        canvas.rect(x, bottom, width, height, stroke=0, fill=1)
        canvas.setFillGray(1)
    elif run.style in ("boxed", "dashed"):
        stroke = max(0.35, run.size * 0.07)
        canvas.setLineWidth(stroke)
        if run.style == "dashed":
            canvas.setDash(run.size * 0.25, run.size * 0.2)
        inset = stroke / 2      # keep the stroke inside the run's box
        canvas.rect(x + inset, bottom + inset, width - 2 * inset, height - 2 * inset, stroke=1, fill=0)
        canvas.setDash()
    canvas.setFillGray(GREY if run.style == "faint" else (1 if run.style == "inverted" else 0))
    canvas.setFont(FONT_BOLD if run.bold else FONT, run.size)
    canvas.drawString(x + inner, baseline, run.text)
    canvas.setFillGray(0)
    return width


def draw_label(canvas, facts: LabelFacts, box: Box, layout: Layout, *, frame: bool = False) -> Block:
    """Draw one label in its box; returns the text as set (what was shortened or left out)."""
    page_h = float(layout.page_size[1]) * PT_PER_MM
    code = _qr(facts.payload)
    placed = place(box, layout.padding, page_h, code.symbol_size(border=0)[0])
    tx, ty, tw, th = placed.text
    block = fit_block(label_lines(facts), tw, th, measure, wide=placed.wide)
    top = ty + th
    gap = 0.5
    for line in block.lines:
        size = max(r.size for r in line.runs)
        boxed = any(r.padded for r in line.runs)
        baseline = top - (BOX_ABOVE + 0.06 if boxed else 0.76) * size
        x = tx
        for i, run in enumerate(line.runs):
            if i:
                x += gap * run.size
            x += _draw_run(canvas, run, x, baseline)
        top -= line.height
    _draw_code(canvas, code, *placed.code)
    if frame:
        canvas.setStrokeGray(GREY)
        canvas.setLineWidth(0.25)
        canvas.rect(float(box.x) * PT_PER_MM, page_h - float(box.y + box.h) * PT_PER_MM,
                    float(box.w) * PT_PER_MM, float(box.h) * PT_PER_MM, stroke=1, fill=0)
        canvas.setStrokeGray(0)
    return block


@dataclass(frozen=True)
class LabelSheet:
    """What was written: the file, the labels (in order), the pages, and any label set short."""

    path: Path
    layout: Layout
    labels: tuple[LabelFacts, ...]
    pages: int
    skipped: int
    trims: tuple[tuple[str, tuple[str, ...]], ...] = ()   # (bin key, lines left out or shortened)

    @property
    def notes(self) -> tuple[str, ...]:
        return tuple(f"bin {key}: {', '.join(names)} left out or shortened to fit" for key, names in self.trims)

    def trim_counts(self) -> dict[str, int]:
        """How many labels left out or shortened each kind of line, most first."""
        counts: dict[str, int] = {}
        for _, names in self.trims:
            for name in names:
                counts[name] = counts.get(name, 0) + 1
        return dict(sorted(counts.items(), key=lambda item: -item[1]))

    def to_json(self) -> dict:
        return {"path": str(self.path), "layout": self.layout.name, "paper": self.layout.paper,
                "pages": self.pages, "skipped": self.skipped,
                "labels": [f.to_json() for f in self.labels], "notes": list(self.notes)}


def _check_target(out: Path) -> None:
    if out.is_dir():
        raise StoreProblem(str(out), "is a folder", "give a file name such as labels.pdf")
    parent = out.parent if str(out.parent) else Path(".")
    if not parent.is_dir():
        raise StoreProblem(str(out), f"the folder {str(parent)!r} does not exist", "create it first")
    if not os.access(parent, os.W_OK):
        raise StoreProblem(str(out), f"the folder {str(parent)!r} cannot be written to",
                           "choose a folder you may write to")


def write_labels(labels: Sequence[LabelFacts], layout: Layout, out: Path, *, skip: int = 0,
                 frames: bool = False) -> LabelSheet:
    """Write a PDF of ``labels`` in ``layout``, starting ``skip`` positions into the first sheet.

    Raises:
        BadLayout: ``skip`` is not a position of the first sheet.
        StoreProblem: the file cannot be written (nothing is left half written).
    """
    if not 0 <= skip < layout.per_page:
        raise BadLayout(f"--skip {skip}", f"a sheet of this layout has {layout.per_page} positions",
                        f"0 to {layout.per_page - 1} used positions to pass over")
    out = Path(out)
    _check_target(out)
    _fonts()
    from reportlab.pdfgen.canvas import Canvas

    page_w, page_h = (float(v) * PT_PER_MM for v in layout.page_size)
    temp = out.with_name(f".{out.name}.{os.getpid()}.part")
    trims: list[tuple[str, tuple[str, ...]]] = []
    try:
        canvas = Canvas(str(temp), pagesize=(page_w, page_h), invariant=1, pageCompression=1)
        canvas.setTitle(f"bin labels, {layout.name}")
        canvas.setCreator("stock")
        for n, facts in enumerate(labels):
            position = n + skip
            if position and position % layout.per_page == 0:
                canvas.showPage()
            block = draw_label(canvas, facts, layout.label_box(position), layout, frame=frames)
            if block.left_out or block.shortened:
                trims.append((facts.bin_key, tuple(dict.fromkeys(block.left_out + block.shortened))))
        canvas.showPage()
        canvas.save()
        os.replace(temp, out)
    except OSError as exc:
        raise StoreProblem(str(out), f"cannot write the labels: {exc.strerror or exc}",
                           "nothing was written") from exc
    finally:
        if temp.exists():
            temp.unlink()
    pages = (len(labels) + skip + layout.per_page - 1) // layout.per_page
    return LabelSheet(out, layout, tuple(labels), pages, skip, tuple(trims))


__all__ = ["FONT", "FONT_BOLD", "GRADE_STYLE", "PT_PER_MM", "LabelSheet", "Placed", "draw_label",
           "label_lines", "measure", "place", "write_labels"]
