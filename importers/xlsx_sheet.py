"""Read the worksheets of an XLSX/XLSM workbook: python-calamine for the cells, openpyxl where it cannot.

* Cells are read with python-calamine (a compiled reader, several times faster than openpyxl):
  its rows are turned into what openpyxl read-only mode gives (blank ``''`` → None, a date cell
  → ``datetime``, leading empty rows and columns put back so row numbers are the user's), so
  both readers feed the same rows to the importer. Where calamine cannot serve (not installed, a
  file it refuses, a sheet it does not know), openpyxl reads the workbook as below.
* openpyxl: ``read_only=True, data_only=True``: rows stream from the zip, and formula cells give the value
  the spreadsheet program last saved (a workbook written by a script has none: such cells read
  as blank).
* Sheet dimensions are ignored (``reset_dimensions``): many writers record none or a wrong one, and a
  sheet claiming A1:H1000000 must not be padded out to a million rows. Rows come back as long as
  their last filled cell and are padded to the header width.
* Reading stops after ``EMPTY_RUN_LIMIT`` blank rows in a row (rows formatted down to the bottom of the
  sheet are the usual cause); the stop is reported in ``RawSheet.notes``.
* Merged cells: openpyxl's read-only mode does not report them, so this module reads the
  ``<mergeCell ref="A1:C1"/>`` entries from the worksheet's XML itself (one streamed pass over the
  compressed part, without parsing it). In the rows searched for the header every cell of a merge
  takes the merge's value, so a header merged over two rows or columns is found and named; data
  rows are left as read and the ranges are listed in ``RawSheet.merged``.
* Numbers stored as text stay text and text-like codes stored as numbers stay numbers (the decoder
  handles both); integral floats become ints; dates stay ``datetime``.
"""

from __future__ import annotations

import datetime as _dt
import lzma
import re
import warnings
import zipfile
import zlib
from pathlib import Path
from typing import Any, Callable, Iterator

from importers.raw_sheet import RawSheet, clean_cell, shape_sheet
from stock.errors import BadSheet

EMPTY_RUN_LIMIT = 10_000      # blank rows in a row after which the rest of a sheet is not read
_MERGE_RE = re.compile(rb"<(?:\w+:)?mergeCell\b[^>]*?\bref=\"([A-Z]{1,3}[0-9]+(?::[A-Z]{1,3}[0-9]+)?)\"")
_REF_RE = re.compile(r"([A-Z]{1,3})([0-9]+)")
_WORKBOOK_PARTS = ("xl/workbook.xml", "xl/workbook.bin")

# Failures openpyxl and zipfile raise on corrupt or foreign files.
# NotImplementedError: an unknown zip version or compression method; RuntimeError: an encrypted
# zip member; SyntaxError covers xml.etree's ParseError.
_READ_ERRORS = (zipfile.BadZipFile, zlib.error, lzma.LZMAError, KeyError, ValueError, TypeError,
                IndexError, AttributeError, EOFError, OSError, SyntaxError, NotImplementedError,
                RuntimeError)


def read_workbook(path: Path, sheet: str | None = None) -> list[RawSheet]:
    """Read every worksheet that holds data, or only ``sheet``.

    Raises:
        BadSheet: not a workbook, corrupt, no such sheet (the message lists the sheets), or no
            worksheet holds anything.
    """
    file = str(path)
    _check_archive(path)
    fast = _read_with_calamine(path, sheet)
    if fast:
        return fast
    book = open_workbook(path)
    names = list(book.sheetnames)
    if sheet is not None and sheet not in names:
        book.close()
        near = [n for n in names if n.casefold() == sheet.casefold()]
        hint = f"sheet {near[0]!r}" if near else "one of " + ", ".join(repr(n) for n in names)
        raise BadSheet(file, f"has no sheet {sheet!r}", hint=hint)
    wanted = [sheet] if sheet is not None else names
    handle = _BookHandle(book)
    sheets: list[RawSheet] = []
    try:
        for name in wanted:
            worksheet = book[name]
            if not hasattr(worksheet, "iter_rows"):      # a chart sheet holds no cells
                if sheet is not None:
                    raise BadSheet(file, "is a chart sheet, not a sheet of cells", sheet=name)
                continue
            shaped = _read_worksheet(path, book, worksheet, handle)
            if shaped is not None:
                sheets.append(shaped)
            elif sheet is not None:
                raise BadSheet(file, "is empty", sheet=name,
                               hint="a header row naming the columns, then one row per bin")
    except BadSheet:
        book.close()
        raise
    except _READ_ERRORS as exc:
        book.close()
        raise BadSheet(file, f"is a damaged workbook ({_short(exc)})", sheet=name) from None
    if not sheets:
        book.close()
        raise BadSheet(file, "has no sheet with anything in it", hint="a header row, then one row per bin")
    handle.finished()
    return sheets


def open_workbook(path: Path) -> Any:
    """Open a workbook read-only after the archive checks; the one way every reader opens XLSX.

    Raises:
        BadSheet: an OpenDocument, encrypted, binary or damaged file, or not a workbook at all.
    """
    file = str(path)
    _check_archive(path)
    from openpyxl import load_workbook   # imported late: it costs start-up time (libraries.md A2)

    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")   # "no default style", unsupported extensions ...
            return load_workbook(path, read_only=True, data_only=True, keep_links=False)
    except _READ_ERRORS as exc:
        raise BadSheet(file, f"is not a readable XLSX workbook ({_short(exc)})") from None
    except Exception as exc:     # openpyxl's own InvalidFileException and the like
        raise BadSheet(file, f"is not a readable XLSX workbook ({_short(exc)})") from None


def _check_archive(path: Path) -> None:
    file = str(path)
    try:
        with zipfile.ZipFile(path) as archive:
            members = set(archive.namelist())
            if "mimetype" in members and "content.xml" in members:
                raise BadSheet(file, "is an OpenDocument spreadsheet, not an XLSX workbook",
                               hint="the sheet saved as .xlsx or .csv")
            if "EncryptedPackage" in members or "EncryptionInfo" in members:
                raise BadSheet(file, "is a password-protected (encrypted) workbook",
                               hint="an unencrypted .xlsx")
            if "[Content_Types].xml" not in members or not any(p in members for p in _WORKBOOK_PARTS):
                raise BadSheet(file, "is a zip archive but not an XLSX workbook (it has no xl/workbook.xml)",
                               hint="a workbook saved as .xlsx")
            if "xl/workbook.bin" in members and "xl/workbook.xml" not in members:
                raise BadSheet(file, "is a binary .xlsb workbook, which is not read",
                               hint="the workbook saved as .xlsx")
    except BadSheet:
        raise
    except (zipfile.BadZipFile, NotImplementedError, RuntimeError, ValueError, EOFError) as exc:
        raise BadSheet(file, f"is a damaged workbook (the zip archive is corrupt: {_short(exc)})") from None
    except OSError as exc:
        raise BadSheet(file, f"cannot be opened ({exc.strerror or exc})") from None


def _short(exc: BaseException) -> str:
    text = " ".join(str(exc).split()) or type(exc).__name__
    return text if len(text) <= 120 else text[:117] + "..."


class _BookHandle:
    """Closes the workbook when the last sheet's rows have been read (or abandoned)."""

    def __init__(self, book: Any) -> None:
        self.book = book
        self.open_sheets = 1     # held by read_workbook itself until every sheet is set up

    def opened(self) -> None:
        self.open_sheets += 1

    def finished(self) -> None:
        self.open_sheets -= 1
        if self.open_sheets <= 0:
            self.book.close()


def _read_worksheet(path: Path, book: Any, worksheet: Any, handle: _BookHandle) -> RawSheet | None:
    file = str(path)
    name = worksheet.title
    merged = _merged_ranges(path, getattr(worksheet, "_worksheet_path", None))
    notes: list[str] = []
    worksheet.reset_dimensions()
    handle.opened()
    rows = _numbered_rows(file, name, worksheet, notes, handle)
    fill = _merge_filler(merged) if merged else None
    shaped = shape_sheet(file, name, rows, fill_header=fill, merged=tuple(merged),
                         hidden=getattr(worksheet, "sheet_state", "visible") != "visible", notes=notes)
    if shaped is None:
        rows.close()
    return shaped


def _numbered_rows(file: str, sheet: str, worksheet: Any, notes: list[str],
                   handle: _BookHandle) -> Iterator[tuple[int, tuple[Any, ...]]]:
    read = [0]           # rows taken from the file so far, for the damaged-workbook message
    try:
        cells = (tuple(clean_cell(v) for v in values) for values in worksheet.iter_rows(values_only=True))
        yield from _filled_rows(sheet, cells, 1, notes, read)
    except _READ_ERRORS as exc:
        raise BadSheet(file, f"is a damaged workbook ({_short(exc)})", sheet=sheet, row=read[0] + 1) from None
    finally:
        handle.finished()


def _filled_rows(sheet: str, rows: Iterator[tuple[Any, ...]], first: int, notes: list[str],
                 read: list[int]) -> Iterator[tuple[int, tuple[Any, ...]]]:
    """(row number, cells) of the rows holding something, numbered from ``first``; a run of
    ``EMPTY_RUN_LIMIT`` blank rows ends the sheet (formatting dragged to the last row) and says so.
    ``read[0]`` counts the rows taken, blank ones too. Both workbook readers go through here."""
    blank_run = 0
    number = first - 1
    for cells in rows:
        number += 1
        read[0] += 1
        if all(c is None for c in cells):
            blank_run += 1
            if blank_run >= EMPTY_RUN_LIMIT:
                notes.append(f"stopped reading sheet {sheet!r} at row {number}: "
                             f"{EMPTY_RUN_LIMIT} blank rows in a row; rows below are not read")
                return
            continue
        blank_run = 0
        yield number, cells


def _read_with_calamine(path: Path, sheet: str | None) -> list[RawSheet] | None:
    """Every worksheet holding data (or only ``sheet``) read by python-calamine; None when
    calamine cannot serve this file and openpyxl should read it (which also words any error)."""
    try:
        from python_calamine import CalamineWorkbook, SheetTypeEnum, SheetVisibleEnum  # late: compiled
    except ImportError:
        return None
    file = str(path)
    try:
        book = CalamineWorkbook.from_path(str(path))
    except Exception:      # calamine's own errors, or a panic in the compiled reader
        return None
    try:
        kinds = {m.name: m for m in book.sheets_metadata}
        wanted = [sheet] if sheet is not None else list(book.sheet_names)
        sheets = []
        for name in wanted:
            meta = kinds.get(name)
            if meta is None or meta.typ != SheetTypeEnum.WorkSheet:
                return None           # no such sheet, or a chart sheet: openpyxl says so in words
            cells = book.get_sheet_by_name(name)
            merged = cells.merged_cell_ranges
            if merged is None:
                return None
            refs = [f"{_column_letters(c0 + 1)}{r0 + 1}:{_column_letters(c1 + 1)}{r1 + 1}"
                    for (r0, c0), (r1, c1) in merged if (r0, c0) != (r1, c1)]
            notes: list[str] = []
            rows = _calamine_rows(file, name, cells, notes)
            shaped = shape_sheet(file, name, rows, fill_header=_merge_filler(refs) if refs else None,
                                 merged=tuple(refs), hidden=meta.visible != SheetVisibleEnum.Visible,
                                 notes=notes)
            if shaped is not None:
                sheets.append(shaped)
            elif sheet is not None:
                return None           # an empty sheet: openpyxl's path words it
        return sheets or None
    except Exception:
        return None
    finally:
        book.close()


def _column_letters(column: int) -> str:
    letters = ""
    while column:
        column, rest = divmod(column - 1, 26)
        letters = chr(65 + rest) + letters
    return letters


def _calamine_cell(value: Any) -> Any:
    """A calamine cell as openpyxl read-only gives it: dates as datetimes, then cleaned."""
    if type(value) is _dt.date:
        return _dt.datetime(value.year, value.month, value.day)
    return clean_cell(value)


def _calamine_rows(file: str, sheet: str, cells: Any, notes: list[str]) -> Iterator[tuple[int, tuple[Any, ...]]]:
    """(row number, cells) as :func:`_numbered_rows` gives them, from a sheet calamine loaded."""
    first_row, left = cells.start or (0, 0)
    pad = (None,) * left
    rows = (pad + tuple(_calamine_cell(v) for v in values) for values in cells.iter_rows())
    for number, row in _filled_rows(sheet, rows, first_row + 1, notes, [0]):
        while row and row[-1] is None:
            row = row[:-1]
        yield number, row


def _merged_ranges(path: Path, part: str | None) -> list[str]:
    """The ``ref`` of every ``<mergeCell>`` in one worksheet part, read as raw bytes."""
    if not part:
        return []
    part = part.lstrip("/")
    found: list[str] = []
    try:
        with zipfile.ZipFile(path) as archive, archive.open(part) as stream:
            tail = b""
            while chunk := stream.read(1 << 20):
                data = tail + chunk
                last_end = 0
                for match in _MERGE_RE.finditer(data):
                    found.append(match.group(1).decode("ascii"))
                    last_end = match.end()
                tail = data[max(last_end, len(data) - 256):]
    except _READ_ERRORS:
        return []     # no merge information is not fatal; openpyxl reports real damage when reading
    return [r for r in dict.fromkeys(found) if ":" in r]


def _cell_index(ref: str) -> tuple[int, int]:
    letters, digits = _REF_RE.fullmatch(ref).groups()
    column = 0
    for ch in letters:
        column = column * 26 + (ord(ch) - 64)
    return int(digits), column


def _merge_filler(ranges: list[str]) -> Callable[[int, tuple[Any, ...]], tuple[Any, ...]]:
    """A function filling the cells of a header-scan row from the merges that cover it.

    A merge's value sits in its top-left cell, which may be in an earlier row, so values are
    remembered as rows pass (the header scan sees rows in order).
    """
    spans = []
    for ref in ranges:
        first, last = ref.split(":")
        (r0, c0), (r1, c1) = _cell_index(first), _cell_index(last)
        spans.append((min(r0, r1), max(r0, r1), min(c0, c1), max(c0, c1)))
    top_values: dict[int, Any] = {}

    def fill(number: int, cells: tuple[Any, ...]) -> tuple[Any, ...]:
        out = list(cells)
        for i, (r0, r1, c0, c1) in enumerate(spans):
            if number == r0 and c0 - 1 < len(cells):
                top_values[i] = cells[c0 - 1]
            if not (r0 <= number <= r1) or top_values.get(i) is None:
                continue
            if len(out) < c1:
                out.extend([None] * (c1 - len(out)))
            for c in range(c0 - 1, c1):
                if out[c] is None:
                    out[c] = top_values[i]
        return tuple(out)

    return fill
