"""The stock-take sheet: written in location order, filled in by hand, read back as count movements.

The sheet carries each bin's key (which identifies it on the way back), what to look for, the
quantity the store expects, and an empty "Counted" column that accepts only whole numbers ≥ 0.
Reading it back records each difference as a ``count`` movement in one transaction; a blank
"Counted" cell means "not counted" and changes nothing. A bad cell (text, a fraction, a negative
number, a bin the store does not know) refuses the whole sheet with its row and column named.
"""

from __future__ import annotations

from decimal import Decimal
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from stock.inventory.bins import natural_key
from stock.errors import BadSheet
from stock.sheets_out.workbook import Column, new_workbook, save_workbook, sheet_cell
from stock.store.database import Store

SHEET_TITLE = "Stock take"
MARKER = "stock count sheet v1"      # in A1 of the hidden "About" sheet: how we know our own sheet
COUNT_COLUMNS = (
    Column("Bin", 18), Column("Location", 10), Column("Label", 12), Column("Marking", 24),
    Column("Value", 10), Column("Expected", 10, "#,##0"), Column("Counted", 10, "0"), Column("Note", 30),
)
_COUNTED = 6


def export_count_sheet(store: Store, out: Path) -> int:
    """Write the stock-take sheet for every bin, in natural location order; returns its rows."""
    from openpyxl.worksheet.datavalidation import DataValidation

    from stock.units import format_capacitance

    bins = store.rows("SELECT b.bin_key, b.location, b.label, b.on_hand, p.marking, p.capacitance_pf"
                      " FROM bins b LEFT JOIN parts p ON p.bin_id = b.id")
    bins.sort(key=lambda r: (natural_key(r["location"]), natural_key(r["bin_key"])))
    wb = new_workbook()
    ws = wb.create_sheet(SHEET_TITLE)
    ws.freeze_panes = "A2"
    from openpyxl.utils import get_column_letter

    for i, col in enumerate(COUNT_COLUMNS, start=1):
        ws.column_dimensions[get_column_letter(i)].width = col.width
    last = len(bins) + 1
    check = DataValidation(type="whole", operator="greaterThanOrEqual", formula1="0", allow_blank=True,
                           showErrorMessage=True, errorTitle="Counted",
                           error="Enter the number of parts counted: a whole number, 0 or more.")
    check.add(f"G2:G{max(last, 2)}")
    ws.data_validations.append(check)
    ws.auto_filter.ref = f"A1:H{last}"
    ws.append([sheet_cell(ws, c.header, bold=True) for c in COUNT_COLUMNS])
    for r in bins:
        ws.append([sheet_cell(ws, r["bin_key"]), sheet_cell(ws, r["location"]), sheet_cell(ws, r["label"]),
                   sheet_cell(ws, r["marking"]), sheet_cell(ws, format_capacitance(Decimal(str(r["capacitance_pf"])))
                              if r["capacitance_pf"] is not None else ""),
                   r["on_hand"], None, None])
    about = wb.create_sheet("About")
    about.sheet_state = "hidden"
    about.append([MARKER])
    about.append(["Fill in the Counted column; leave it blank for bins not counted. "
                  "Then: stock import THIS_FILE"])
    save_workbook(wb, out)
    return len(bins)


def is_count_sheet(path: Path) -> bool:
    """Whether a file is a stock-take sheet this tool wrote (its hidden marker)."""
    if path.suffix.lower() not in (".xlsx", ".xlsm"):
        return False
    try:
        from openpyxl import load_workbook

        wb = load_workbook(path, read_only=True, data_only=True)
    except Exception:  # not a workbook we can open: the normal importer will say why
        return False
    try:
        if "About" not in wb.sheetnames or SHEET_TITLE not in wb.sheetnames:
            return False
        first = next(wb["About"].iter_rows(min_row=1, max_row=1, values_only=True), (None,))
        return bool(first) and first[0] == MARKER
    finally:
        wb.close()


@dataclass(frozen=True)
class CountChange:
    bin_key: str
    row: int
    expected: int | None
    counted: int

    @property
    def delta(self) -> int:
        return self.counted - (self.expected or 0)

    def to_json(self) -> dict[str, Any]:
        return {"bin": self.bin_key, "row": self.row, "expected": self.expected,
                "counted": self.counted, "delta": self.delta}


@dataclass(frozen=True)
class CountReport:
    file: str
    counted: int
    not_counted: int
    changes: tuple[CountChange, ...]

    def to_json(self) -> dict[str, Any]:
        return {"file": self.file, "counted": self.counted, "not_counted": self.not_counted,
                "changes": [c.to_json() for c in self.changes]}


MAX_COUNT = 2**53   # a larger count is a typing slip (and past what SQLite and JSON hold exactly)


def _whole(value: Any, file: str, row: int) -> int | None:
    if value is None or (isinstance(value, str) and not value.strip()):
        return None
    raw, number = value, None
    if isinstance(value, bool):
        number = None
    elif isinstance(value, int):
        number = value
    elif isinstance(value, float) and value.is_integer():
        number = int(value)
    elif isinstance(value, str) and value.strip().isdecimal():   # isdigit() would pass "²"
        number = int(value.strip())
    if number is None or not 0 <= number <= MAX_COUNT:
        raise BadSheet(file, f"cannot read {raw!r} as a count", sheet=SHEET_TITLE, row=row,
                       column="Counted", hint="a whole number, 0 or more, or a blank cell")
    return number


def apply_count_sheet(store: Store, path: Path, *, dry_run: bool = False) -> CountReport:
    """Read a filled-in stock-take sheet and record every difference as a count movement.

    Raises:
        BadSheet: a counted cell is not a whole number ≥ 0, or a bin is unknown (nothing is recorded).
    """
    from openpyxl import load_workbook

    file = str(path)
    try:
        wb = load_workbook(path, read_only=True, data_only=True)
    except Exception as exc:     # not a workbook at all: zip, XML and openpyxl's own errors
        raise BadSheet(file, f"is not a readable stock-take workbook ({type(exc).__name__})",
                       hint="the .xlsx written by `stock export count`") from None
    try:
        if SHEET_TITLE not in wb.sheetnames:
            raise BadSheet(file, f"has no sheet {SHEET_TITLE!r}",
                           hint="the .xlsx written by `stock export count`")
        rows = list(wb[SHEET_TITLE].iter_rows(min_row=2, values_only=True))
    finally:
        wb.close()
    known = {r["bin_key"]: r for r in store.rows("SELECT id, bin_key, on_hand FROM bins")}
    readings: list[tuple[int, dict[str, Any], int]] = []
    not_counted = 0
    for number, cells in enumerate(rows, start=2):
        cells = tuple(cells) + (None,) * (len(COUNT_COLUMNS) - len(cells))
        if all(c is None for c in cells):
            continue
        counted = _whole(cells[_COUNTED], file, number)
        if counted is None:
            not_counted += 1
            continue
        key = str(cells[0] or "")
        if key not in known:
            raise BadSheet(file, f"no bin {key!r} in this database", sheet=SHEET_TITLE, row=number,
                           column="Bin", hint="the bin keys this sheet was written with")
        readings.append((number, known[key], counted))
    changes = []
    with store.writing():
        for number, bin_row, counted in readings:
            expected = bin_row["on_hand"]
            if expected != counted:
                changes.append(CountChange(bin_row["bin_key"], number, expected, counted))
                store.set_count(bin_row["id"], counted, "count", ref=f"count:{path.name}",
                                note=f"stock-take sheet row {number}")
        if dry_run:  # leaving by an exception rolls the transaction back
            raise _DryRun(CountReport(file, len(readings), not_counted, tuple(changes)))
    return CountReport(file, len(readings), not_counted, tuple(changes))


class _DryRun(Exception):
    def __init__(self, report: CountReport):
        self.report = report


def preview_count_sheet(store: Store, path: Path) -> CountReport:
    """What :func:`apply_count_sheet` would record, without recording it."""
    try:
        apply_count_sheet(store, path, dry_run=True)
    except _DryRun as done:
        return done.report
    raise AssertionError("dry run did not stop")  # pragma: no cover


__all__ = ["CountChange", "CountReport", "apply_count_sheet", "export_count_sheet",
           "is_count_sheet", "natural_key", "preview_count_sheet"]
