"""Writing tables to XLSX and CSV safely: frozen header, filter, widths, formats, no formulas let in.

Any text that begins with ``=``, ``+``, ``-``, ``@``, a tab or a carriage return could be taken as
a formula by a spreadsheet program (formula injection, see the OWASP "CSV Injection" note). In
XLSX such text is written as a string cell with a quote prefix; in CSV it gets a leading
apostrophe. Characters XML cannot carry (NUL and other control characters) become U+FFFD, and a
cell longer than a spreadsheet accepts is cut with a visible mark, so nothing makes a write fail.

>>> guard_csv("=HYPERLINK(1)"), guard_csv("104K"), guard_csv(-5)
("'=HYPERLINK(1)", '104K', -5)
"""

from __future__ import annotations

import csv
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from stock.errors import BadValue, StoreProblem

FORMULA_PREFIXES = ("=", "+", "-", "@", "\t", "\r")
CELL_LIMIT = 32_767          # characters in one cell (Excel's documented limit)


@dataclass(frozen=True)
class Column:
    """One output column: header, width in characters, and an Excel number format."""

    header: str
    width: int = 12
    number_format: str | None = None     # e.g. "0", "#,##0", "0.00", "@"


def _clean(text: str) -> str:
    from openpyxl.cell.cell import ILLEGAL_CHARACTERS_RE

    text = ILLEGAL_CHARACTERS_RE.sub("\ufffd", text)
    if len(text) > CELL_LIMIT:
        text = text[: CELL_LIMIT - 20] + " …[cut at 32767]"
    return text


def guard_csv(value: Any) -> Any:
    """A CSV cell value that no spreadsheet will run as a formula."""
    if isinstance(value, str):
        value = value.replace("\x00", "\ufffd")
        if value.startswith(FORMULA_PREFIXES):
            return "'" + value
    return value


def output_kind(path: Path) -> str:
    """'xlsx' or 'csv' from the file name; anything else is a usage error."""
    suffix = path.suffix.lower()
    if suffix in (".xlsx", ".csv"):
        return suffix[1:]
    raise BadValue("output file", str(path), "a name ending in .xlsx or .csv")


def write_csv(path: Path, columns: Sequence[Column], rows: Iterable[Sequence[Any]]) -> int:
    """Write a header and rows as UTF-8 CSV (with BOM, so spreadsheet programs read µ right)."""
    n = 0
    try:
        with open(path, "w", newline="", encoding="utf-8-sig") as fh:
            out = csv.writer(fh)
            out.writerow([c.header for c in columns])
            for row in rows:
                out.writerow([guard_csv(v) for v in row])
                n += 1
    except OSError as exc:
        raise StoreProblem(str(path), f"cannot write the file: {exc.strerror or exc}") from exc
    return n


def sheet_cell(ws: Any, value: Any, number_format: str | None = None, bold: bool = False) -> Any:
    """A write-only cell holding ``value``; text that looks like a formula stays text."""
    from openpyxl.cell import WriteOnlyCell
    from openpyxl.styles import Font

    if isinstance(value, str):
        value = _clean(value)
    cell = WriteOnlyCell(ws, value=value)
    if isinstance(value, str) and (cell.data_type != "s" or value.startswith(FORMULA_PREFIXES)):
        cell.data_type = "s"
        cell.quotePrefix = True
    if number_format:
        cell.number_format = number_format
    if bold:
        cell.font = Font(bold=True)
    return cell


def formula_cell(ws: Any, formula: str, number_format: str | None = None, bold: bool = False) -> Any:
    """A cell holding a formula the tool itself wrote (totals); never user text."""
    from openpyxl.cell import WriteOnlyCell
    from openpyxl.styles import Font

    cell = WriteOnlyCell(ws, value=formula)
    cell.data_type = "f"
    if number_format:
        cell.number_format = number_format
    if bold:
        cell.font = Font(bold=True)
    return cell


def add_table_sheet(wb: Any, title: str, columns: Sequence[Column],
                    rows: Sequence[Sequence[Any]], totals: dict[int, str] | None = None) -> Any:
    """A sheet with a bold frozen header, an autofilter, widths and number formats.

    ``totals`` maps a column index to "sum" (a SUM formula under the rows) or a label.
    """
    from openpyxl.utils import get_column_letter

    ws = wb.create_sheet(title)
    ws.freeze_panes = "A2"
    for i, col in enumerate(columns, start=1):
        ws.column_dimensions[get_column_letter(i)].width = col.width
    last_col = get_column_letter(len(columns))
    ws.auto_filter.ref = f"A1:{last_col}{len(rows) + 1}"
    ws.append([sheet_cell(ws, c.header, bold=True) for c in columns])
    for row in rows:
        ws.append([sheet_cell(ws, v, col.number_format) for v, col in zip(row, columns)])
    if totals:
        line: list[Any] = []
        for i, col in enumerate(columns):
            what = totals.get(i)
            if what == "sum":
                letter = get_column_letter(i + 1)
                line.append(formula_cell(ws, f"=SUM({letter}2:{letter}{len(rows) + 1})",
                                         col.number_format, bold=True))
            else:
                line.append(sheet_cell(ws, what, bold=True) if what else None)
        ws.append(line)
    return ws


def new_workbook() -> Any:
    from openpyxl import Workbook

    return Workbook(write_only=True)


def save_workbook(wb: Any, path: Path) -> None:
    try:
        wb.save(path)
    except OSError as exc:
        raise StoreProblem(str(path), f"cannot write the file: {exc.strerror or exc}") from exc


__all__ = ["CELL_LIMIT", "FORMULA_PREFIXES", "Column", "add_table_sheet", "formula_cell",
           "guard_csv", "new_workbook", "output_kind", "save_workbook", "sheet_cell", "write_csv"]
