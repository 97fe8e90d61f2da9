"""The one shape every reader produces: a header and lazily streamed rows with the user's row numbers.

Both readers (``csv_sheet``, ``xlsx_sheet``) hand :func:`shape_sheet` numbered rows of raw cells;
it finds the header row, names the columns and aligns the data rows, so CSV and XLSX come out the
same.

How a sheet is shaped (the same for every format):

* The header row is the row among the first ``HEADER_SCAN_ROWS`` non-blank rows whose cells map
  to the most distinct known fields (bins or BOM vocabulary); earlier rows win ties. Title rows
  above it are kept in ``RawSheet.skipped_above``. If no row names a known field, the row with
  the most filled cells is the header, the earliest on a tie (the importer then refuses the sheet
  for want of a value column).
* Trailing blank header cells are dropped; a blank header inside the row becomes ``"column N"``
  (N counted from 1 as in the file), and repeated headers become ``"Notes (2)"``, ``"Notes (3)"``.
* Data rows that are wholly blank are skipped (their numbers are simply not seen). Every other row
  comes as a RawRow whose cells are padded or cut to the header width; non-blank cells beyond the
  header are kept in ``RawRow.extra`` under names such as ``"column 12"``, never dropped.
* Text cells that are empty or only whitespace read as None; other values pass through as read.
"""

from __future__ import annotations

import datetime as _dt
import math
from dataclasses import dataclass, field
from itertools import chain
from typing import Any, Callable, Iterable, Iterator

HEADER_SCAN_ROWS = 30        # non-blank rows looked at when searching for the header row

@dataclass(frozen=True)
class RawRow:
    """One data row as read.

    Attributes:
        number: the row number a user sees in the file (1-based, header and title rows counted).
        cells: the values, one per header (None for blank).
        extra: (synthetic header, value) for non-blank cells to the right of the header.
    """

    number: int
    cells: tuple[Any, ...]
    extra: tuple[tuple[str, Any], ...] = ()


@dataclass(frozen=True)
class RawSheet:
    """A sheet with its header found and its data rows streaming.

    ``rows`` is a one-shot iterator: it reads the file as it is consumed, so a 100 000-row file
    never sits in memory. Reading problems found midway raise BadSheet from the iterator.

    Attributes:
        file: the path as given.
        sheet: the worksheet name (None for a text sheet).
        header_row: the row number of the header.
        headers: unique, non-empty column names.
        rows: the data rows below the header.
        skipped_above: non-blank rows above the header (titles, dates, notes).
        merged: merged cell ranges of the worksheet ("A1:C1"); header cells under a merge carry the
            merge's value, data cells are left as read (only the top-left holds it).
        hidden: the worksheet is hidden in the workbook.
        encoding: the text encoding used (text sheets).
        delimiter: the field separator used (text sheets).
        notes: things worth telling the user, added while reading (e.g. reading stopped early).
    """

    file: str
    sheet: str | None
    header_row: int
    headers: tuple[str, ...]
    rows: Iterator[RawRow] = field(compare=False, repr=False)
    skipped_above: tuple[RawRow, ...] = ()
    merged: tuple[str, ...] = ()
    hidden: bool = False
    encoding: str | None = None
    delimiter: str | None = None
    notes: list[str] = field(default_factory=list, compare=False)

    def raw_record(self, row: RawRow, jsonable: bool = False) -> dict[str, Any]:
        """The row as header → value, extra cells included; blanks left out.

        With ``jsonable`` dates become ISO text and anything else JSON cannot hold becomes text,
        ready to be stored as the row's raw JSON.

        >>> s = RawSheet("f.csv", None, 1, ("Marking", "Qty"), iter(()))
        >>> s.raw_record(RawRow(2, ("104", None), (("column 3", "spare"),)))
        {'Marking': '104', 'column 3': 'spare'}
        """
        pairs = chain(zip(self.headers, row.cells), row.extra)
        return {h: (_jsonable(v) if jsonable else v) for h, v in pairs if v is not None}


def _jsonable(value: Any) -> Any:
    if isinstance(value, (bool, int, str)):
        return value
    if isinstance(value, float):
        return value if math.isfinite(value) else str(value)
    if isinstance(value, (_dt.datetime, _dt.date, _dt.time)):
        return value.isoformat()
    return str(value)


def is_blank(value: Any) -> bool:
    """True for None and for text that is empty or only whitespace."""
    return value is None or (isinstance(value, str) and not value.strip())


def clean_cell(value: Any) -> Any:
    """Blank text → None, integral floats → int (a code ``104`` typed as a number), rest as read.

    >>> clean_cell("  "), clean_cell(104.0), clean_cell(0.1), clean_cell(" 104 ")
    (None, 104, 0.1, ' 104 ')
    """
    if isinstance(value, str):
        return value if value.strip() else None
    if isinstance(value, float) and math.isfinite(value) and value.is_integer():
        return int(value)
    return value


def _header_text(value: Any) -> str:
    if isinstance(value, (_dt.datetime, _dt.date)):
        return value.isoformat()
    return " ".join(str(clean_cell(value)).split())     # wrapped header text on one line


def make_headers(cells: Iterable[Any]) -> tuple[str, ...]:
    """Name the columns of a header row: trailing blanks dropped, blanks named, repeats numbered.

    >>> make_headers(["Notes", None, "notes", "Qty", None, None])
    ('Notes', 'column 2', 'notes (2)', 'Qty')
    """
    cells = list(cells)
    while cells and is_blank(cells[-1]):
        cells.pop()
    names: list[str] = []
    seen: set[str] = set()
    last_number: dict[str, int] = {}     # so a title merged over 16 000 columns stays linear
    for i, cell in enumerate(cells, start=1):
        base = f"column {i}" if is_blank(cell) else _header_text(cell)
        name, n = base, last_number.get(base.casefold(), 1)
        while name.casefold() in seen:
            n += 1
            name = f"{base} ({n})"
        last_number[base.casefold()] = n
        seen.add(name.casefold())
        names.append(name)
    return tuple(names)


def _align(number: int, cells: tuple[Any, ...], width: int) -> RawRow:
    if len(cells) == width:
        return RawRow(number, cells)
    if len(cells) < width:
        return RawRow(number, cells + (None,) * (width - len(cells)))
    extra = tuple((f"column {i}", v) for i, v in enumerate(cells[width:], start=width + 1) if v is not None)
    return RawRow(number, cells[:width], extra)


def shape_sheet(file: str, sheet: str | None, numbered_rows: Iterator[tuple[int, tuple[Any, ...]]],
                *, fill_header: Callable[[int, tuple[Any, ...]], tuple[Any, ...]] | None = None,
                **details: Any) -> RawSheet | None:
    """Find the header in a stream of (row number, cleaned cells) and wrap the rest as RawRows.

    Args:
        file: the path as given, for messages.
        sheet: worksheet name or None.
        numbered_rows: rows in file order, cells already cleaned (blank → None); blank rows may
            be left out or included.
        fill_header: optional function (row number, cells) → cells that fills in merged cells
            of the rows looked at for the header.
        **details: further RawSheet fields (merged, hidden, encoding, delimiter, notes).

    Returns:
        The RawSheet, or None when the stream holds no non-blank row at all.
    """
    from importers.headers import header_row_score    # rapidfuzz is imported only when needed

    # (number, cells as read, cells with merges filled): merges count for the header search
    # and the header itself, while data rows keep their cells as read.
    scanned: list[tuple[int, tuple[Any, ...], tuple[Any, ...]]] = []
    for number, cells in numbered_rows:
        if all(c is None for c in cells):
            continue
        filled = fill_header(number, cells) if fill_header is not None else cells
        scanned.append((number, cells, filled))
        if len(scanned) >= HEADER_SCAN_ROWS:
            break
    if not scanned:
        return None
    scores = [header_row_score(filled) for _, _, filled in scanned]
    if max(scores) == 0:      # no row names a known field: take the fullest row (a title has one cell)
        scores = [sum(c is not None for c in cells) for _, cells, _ in scanned]
    best = max(range(len(scanned)), key=lambda i: (scores[i], -i))
    header_number, _, header_cells = scanned[best]
    headers = make_headers(header_cells)
    width = len(headers)
    above = tuple(_align(n, cells, width) for n, cells, _ in scanned[:best])
    rest = [(n, cells) for n, cells, _ in scanned[best + 1:]]

    def data_rows() -> Iterator[RawRow]:
        for number, cells in chain(rest, numbered_rows):
            if all(c is None for c in cells):
                continue
            yield _align(number, cells, width)

    return RawSheet(file, sheet, header_number, headers, data_rows(), skipped_above=above, **details)


