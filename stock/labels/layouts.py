"""Label sheet geometry: the paper, the label size, the grid, the margins, and whether it all fits.

A layout places ``columns × rows`` labels of ``label_w × label_h`` mm on a page, the first one
``top`` mm from the top edge and ``left`` mm from the left edge, the next ones one pitch (label
plus gap) further on. Positions count left to right, then top to bottom (position 0 is the top
left label). Every length is exact (``Decimal`` mm); :func:`check_layout` refuses a layout that
cannot be printed, naming the option at fault.

The named layouts are common sheet geometries, named by their paper, grid and label size in mm
(``a4-3x8-70x37`` is A4, 3 columns by 8 rows of 70 × 37 mm labels).

>>> layout = named_layout("a4-3x8-70x37")
>>> layout.per_page, layout.label_box(4)
(24, Box(x=Decimal('70'), y=Decimal('37.5'), w=Decimal('70'), h=Decimal('37')))
"""

from __future__ import annotations

import re
from dataclasses import dataclass, replace
from decimal import Decimal, InvalidOperation

from stock.errors import BadLayout

# ISO 216 (A4, 210 × 297 mm) and ANSI/ASME Y14.1 (letter, 8.5 × 11 in = 215.9 × 279.4 mm).
PAPERS: dict[str, tuple[Decimal, Decimal]] = {
    "a4": (Decimal("210"), Decimal("297")),
    "letter": (Decimal("215.9"), Decimal("279.4")),
}

# Below this a label cannot carry the value in large type, the facts in 5 pt and a code of
# modules a handheld scanner reads (common practice, no published source).
MIN_LABEL_MM = (Decimal(30), Decimal(15))     # longer side, shorter side

INCH = Decimal("25.4")


@dataclass(frozen=True)
class Box:
    """A rectangle on the page in mm, measured from the page's top-left corner."""

    x: Decimal
    y: Decimal
    w: Decimal
    h: Decimal

    def inset(self, by: Decimal) -> Box:
        """The box shrunk by ``by`` on every side."""
        return Box(self.x + by, self.y + by, self.w - 2 * by, self.h - 2 * by)


@dataclass(frozen=True)
class Layout:
    """Where the labels of one sheet go."""

    name: str
    paper: str
    label_w: Decimal
    label_h: Decimal
    columns: int
    rows: int
    top: Decimal
    left: Decimal
    gap_x: Decimal = Decimal(0)
    gap_y: Decimal = Decimal(0)

    @property
    def page_size(self) -> tuple[Decimal, Decimal]:
        return PAPERS[self.paper]

    @property
    def per_page(self) -> int:
        return self.columns * self.rows

    @property
    def padding(self) -> Decimal:
        """The blank border kept inside each label: 7 % of its shorter side, within 1.2…3 mm.

        It keeps text clear of a slightly shifted print and gives the code its quiet zone.
        """
        return min(Decimal(3), max(Decimal("1.2"), min(self.label_w, self.label_h) * Decimal("0.07")))

    def label_box(self, position: int) -> Box:
        """The box of a position on its page (positions past one page wrap to the next)."""
        slot = position % self.per_page
        column, row = slot % self.columns, slot // self.columns
        return Box(self.left + column * (self.label_w + self.gap_x),
                   self.top + row * (self.label_h + self.gap_y), self.label_w, self.label_h)

    def describe(self) -> str:
        """One line for people: ``A4, 3 × 8 labels of 70 × 37 mm``."""
        paper = "A4" if self.paper == "a4" else "US Letter"
        return (f"{paper}, {self.columns} × {self.rows} labels of {_mm(self.label_w)} × "
                f"{_mm(self.label_h)} mm")


def _mm(value: Decimal) -> str:
    text = format(value.normalize(), "f")
    return text.rstrip("0").rstrip(".") if "." in text else text


def _named(paper: str, w: str, h: str, columns: int, rows: int, top: str, left: str,
           gap_x: str = "0", gap_y: str = "0") -> Layout:
    lw, lh = Decimal(w), Decimal(h)
    name = f"{paper}-{columns}x{rows}-{round(lw)}x{round(lh)}"
    return Layout(name, paper, lw, lh, columns, rows, Decimal(top), Decimal(left),
                  Decimal(gap_x), Decimal(gap_y))


# Sheet geometries sold by many makers (from memory of common sheets; common practice, no
# published source). Letter sizes are whole fractions of an inch, written in mm.
LAYOUTS: dict[str, Layout] = {layout.name: layout for layout in (
    _named("a4", "70", "37", 3, 8, "0.5", "0"),                        # 24 a sheet, edge to edge
    _named("a4", "70", "42.3", 3, 7, "0.45", "0"),                     # 21 a sheet, edge to edge
    _named("a4", "63.5", "38.1", 3, 7, "15.15", "7.25", "2.5"),        # 21 a sheet, rounded corners
    _named("a4", "99.1", "38.1", 2, 7, "15.15", "4.65", "2.5"),        # 14 a sheet
    _named("a4", "48.5", "25.4", 4, 10, "21.5", "8"),                  # 40 a sheet
    _named("a4", "38.1", "21.2", 5, 13, "10.7", "4.75", "2.5"),        # 65 a sheet, the smallest
    _named("letter", "66.675", "25.4", 3, 10, "12.7", "4.7625", "3.175"),    # 2 5/8 × 1 in, 30 a sheet
    _named("letter", "101.6", "25.4", 2, 10, "12.7", "3.96875", "4.7625"),   # 4 × 1 in, 20 a sheet
    _named("letter", "101.6", "50.8", 2, 5, "12.7", "3.96875", "4.7625"),    # 4 × 2 in, 10 a sheet
)}

DEFAULT_LAYOUT = {"a4": "a4-3x8-70x37", "letter": "letter-3x10-67x25"}


def named_layout(name: str) -> Layout:
    """A named layout.

    Raises:
        BadLayout: no layout has that name.

    >>> named_layout("letter-3x10-67x25").describe()
    'US Letter, 3 × 10 labels of 66.675 × 25.4 mm'
    """
    found = LAYOUTS.get(name.strip().lower())
    if found is None:
        raise BadLayout("--layout", f"no layout named {name!r}", "one of " + ", ".join(LAYOUTS))
    return found


_PAIR = re.compile(r"\s*([+-]?\d+(?:[.,]\d+)?)\s*[x×*]\s*([+-]?\d+(?:[.,]\d+)?)\s*(?:mm)?\s*", re.IGNORECASE)


def parse_pair(text: str, what: str, expected: str) -> tuple[Decimal, Decimal]:
    """Two numbers written ``WxH`` (``70x37``, ``38.1 × 21.2 mm``).

    Raises:
        BadLayout: the text is not two numbers joined by an x.
    """
    match = _PAIR.fullmatch(text)
    if not match:
        raise BadLayout(f"{what} {text}", "cannot read it", expected)
    return Decimal(match[1].replace(",", ".")), Decimal(match[2].replace(",", "."))


def parse_margins(text: str) -> tuple[Decimal, Decimal]:
    """Page margins in mm: ``TOP,LEFT`` or one number for both.

    Raises:
        BadLayout: not one or two numbers.

    >>> parse_margins("10,4.5"), parse_margins("8")
    ((Decimal('10'), Decimal('4.5')), (Decimal('8'), Decimal('8')))
    """
    parts = [p.strip().removesuffix("mm").strip() for p in text.split(",")]
    try:
        numbers = [Decimal(p) for p in parts]
    except InvalidOperation:
        numbers = []
    if len(numbers) not in (1, 2) or not all(n.is_finite() for n in numbers):
        raise BadLayout(f"--margins {text}", "cannot read it", "TOP,LEFT in mm, e.g. 10,4.5, or one number for both")
    return (numbers[0], numbers[-1])


def custom_layout(paper: str, size: tuple[Decimal, Decimal], grid: tuple[int, int] | None = None,
                  margins: tuple[Decimal, Decimal] | None = None,
                  gap: tuple[Decimal, Decimal] = (Decimal(0), Decimal(0))) -> Layout:
    """A layout of labels of ``size`` mm; without a grid, as many as fit within 5 mm margins.

    Without margins the grid is centred on the page. The result is checked (:func:`check_layout`).

    Raises:
        BadLayout: the layout cannot be printed.

    >>> custom_layout("a4", (Decimal(50), Decimal(30))).describe()
    'A4, 4 × 9 labels of 50 × 30 mm'
    """
    if paper not in PAPERS:
        raise BadLayout("--paper", f"no paper {paper!r}", "one of " + ", ".join(PAPERS))
    width, height = size
    _check_size(width, height, f"{_mm(width)}x{_mm(height)}")
    page_w, page_h = PAPERS[paper]
    if grid is None:
        edge = Decimal(5)    # the band most printers cannot reach (common practice)
        grid = (max(1, int((page_w - 2 * edge + gap[0]) // (width + gap[0]))),
                max(1, int((page_h - 2 * edge + gap[1]) // (height + gap[1]))))
    columns, rows = grid
    if margins is None:
        margins = ((page_h - rows * height - (rows - 1) * gap[1]) / 2,
                   (page_w - columns * width - (columns - 1) * gap[0]) / 2)
        margins = (max(Decimal(0), margins[0]), max(Decimal(0), margins[1]))
    name = f"{paper}-{columns}x{rows}-{_mm(width)}x{_mm(height)}"
    layout = Layout(name, paper, width, height, columns, rows, margins[0], margins[1], gap[0], gap[1])
    check_layout(layout)
    return layout


def with_margins(layout: Layout, margins: tuple[Decimal, Decimal]) -> Layout:
    """The layout moved to other page margins (to correct a printer's offset), checked."""
    moved = replace(layout, top=margins[0], left=margins[1])
    check_layout(moved)
    return moved


def _check_size(width: Decimal, height: Decimal, shown: str) -> None:
    if width <= 0 or height <= 0:
        raise BadLayout(f"--size {shown}", "a label needs a width and a height above 0 mm", "e.g. 70x37")
    longer, shorter = max(width, height), min(width, height)
    if longer < MIN_LABEL_MM[0] or shorter < MIN_LABEL_MM[1]:
        raise BadLayout(f"--size {shown}", "too small to carry the value, the facts in legible type"
                        " and a code a scanner can read",
                        f"at least {MIN_LABEL_MM[0]} × {MIN_LABEL_MM[1]} mm")


def check_layout(layout: Layout) -> None:
    """Refuse a layout that cannot be printed: negative margins or gaps, labels off the page.

    Raises:
        BadLayout: naming the option at fault and what would fit.
    """
    page_w, page_h = layout.page_size
    paper = "an A4" if layout.paper == "a4" else "a US Letter"
    shown = f"{_mm(layout.label_w)}x{_mm(layout.label_h)}"
    if layout.label_w > page_w or layout.label_h > page_h:
        raise BadLayout(f"--size {shown}", f"a {shown} mm label is larger than {paper} page"
                        f" ({_mm(page_w)} × {_mm(page_h)} mm)", "a label that fits on the page")
    _check_size(layout.label_w, layout.label_h, shown)
    if layout.columns < 1 or layout.rows < 1:
        raise BadLayout(f"--grid {layout.columns}x{layout.rows}", "a sheet needs at least one column"
                        " and one row", "e.g. 3x8")
    if layout.top < 0 or layout.left < 0:
        raise BadLayout(f"--margins {_mm(layout.top)},{_mm(layout.left)}", "margins cannot be negative",
                        "TOP,LEFT of 0 mm or more")
    if layout.gap_x < 0 or layout.gap_y < 0:
        raise BadLayout(f"--gap {_mm(layout.gap_x)}x{_mm(layout.gap_y)}", "gaps cannot be negative",
                        "0 mm or more")
    for across, count, size, gap, start, page, side in (
            (True, layout.columns, layout.label_w, layout.gap_x, layout.left, page_w, "wide"),
            (False, layout.rows, layout.label_h, layout.gap_y, layout.top, page_h, "high")):
        need = start + count * size + (count - 1) * gap
        if need > page:
            fits = int((page - start + gap) // (size + gap)) if page - start >= size else 0
            word = "columns" if across else "rows"
            margin = "left" if across else "top"
            raise BadLayout(
                f"--grid {layout.columns}x{layout.rows}",
                f"{count} {word} of {_mm(size)} mm labels with gaps of {_mm(gap)} mm and a {margin}"
                f" margin of {_mm(start)} mm need {_mm(need)} mm; {paper} page is {_mm(page)} mm {side}",
                f"at most {fits} {word}, or smaller labels or margins")


def choose_layout(*, paper: str | None = None, name: str | None = None, size: str | None = None,
                  grid: str | None = None, margins: str | None = None, gap: str | None = None) -> Layout:
    """The layout the options ask for: a named one, a custom size, or the paper's default.

    Args:
        paper: ``a4`` or ``letter`` (default: the named layout's paper, else ``a4``).
        name: a layout of :data:`LAYOUTS`; not together with ``size``.
        size: ``WxH`` in mm for custom labels; ``grid`` (``CxR``) and ``gap`` (``XxY`` mm) go with it.
        margins: ``TOP,LEFT`` in mm, replacing the layout's own (a named layout keeps its grid).

    Raises:
        BadLayout: options that conflict, or a layout that cannot be printed.

    >>> choose_layout(paper="letter").name, choose_layout(size="50x30", grid="3x5", margins="10").left
    ('letter-3x10-67x25', Decimal('10'))
    """
    if paper is not None and paper.strip().lower() not in PAPERS:
        raise BadLayout(f"--paper {paper}", "no such paper", "one of " + ", ".join(PAPERS))
    paper = paper.strip().lower() if paper else None
    if name and size:
        raise BadLayout("--layout with --size", "a named layout fixes its label size",
                        "either --layout NAME or --size WxH [--grid CxR]")
    if (grid or gap) and not size:
        raise BadLayout("--grid" if grid else "--gap", "goes with a custom label size",
                        "--size WxH as well, or a named --layout")
    parsed_margins = parse_margins(margins) if margins else None
    if size:
        gaps = parse_pair(gap, "--gap", "XxY in mm, e.g. 2.5x0") if gap else (Decimal(0), Decimal(0))
        return custom_layout(paper or "a4", parse_pair(size, "--size", "WxH in mm, e.g. 70x37"),
                             parse_grid(grid) if grid else None, parsed_margins, gaps)
    layout = named_layout(name or DEFAULT_LAYOUT[paper or "a4"])
    if paper and layout.paper != paper:
        raise BadLayout(f"--layout {layout.name}", f"is a layout for {layout.paper} sheets, not {paper}",
                        "a layout named for the paper: " + ", ".join(n for n in LAYOUTS if n.startswith(paper)))
    return with_margins(layout, parsed_margins) if parsed_margins else layout


def parse_grid(text: str) -> tuple[int, int]:
    """A grid written ``CxR`` (columns by rows).

    Raises:
        BadLayout: not two whole numbers of at least 1.

    >>> parse_grid("3x8")
    (3, 8)
    """
    columns, rows = parse_pair(text, "--grid", "COLUMNSxROWS, e.g. 3x8")
    if columns != columns.to_integral_value() or rows != rows.to_integral_value() or columns < 1 or rows < 1:
        raise BadLayout(f"--grid {text}", "columns and rows are whole numbers of at least 1", "e.g. 3x8")
    return int(columns), int(rows)


__all__ = ["DEFAULT_LAYOUT", "LAYOUTS", "MIN_LABEL_MM", "PAPERS", "Box", "Layout", "check_layout", "choose_layout",
           "custom_layout", "named_layout", "parse_grid", "parse_margins", "parse_pair", "with_margins"]
