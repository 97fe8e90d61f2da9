"""The stock-take sheet read back: each filled-in count recorded as a count movement.

The sheet is written by :mod:`stock.sheets_out.count_sheet`.

The sheet carries each bin's key (which identifies it on the way back), what to look for, the
quantity the store expects, and an empty "Counted" column that accepts only whole numbers ≥ 0.
Reading it back records each difference as a ``count`` movement in one transaction; a blank
"Counted" cell means "not counted" and changes nothing. A bad cell (text, a fraction, a negative
number, a bin the store does not know) refuses the whole sheet with its row and column named.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import Any

from importers.xlsx_sheet import open_workbook
from stock.counts import read_quantity
from stock.errors import BadSheet
from stock.store.database import Store

SHEET_TITLE = "Stock take"
MARKER = "stock count sheet v1"      # in A1 of the hidden "About" sheet: how we know our own sheet
COUNT_HEADERS = ("Bin", "Location", "Label", "Marking", "Value", "Expected", "Counted", "Note")
_COUNTED = COUNT_HEADERS.index("Counted")


def is_count_sheet(path: Path) -> bool:
    """Whether a file is a stock-take sheet this tool wrote (its hidden marker)."""
    if path.suffix.lower() not in (".xlsx", ".xlsm"):
        return False

    try:
        wb = open_workbook(path)
    except BadSheet:  # not a workbook we can open: the normal importer will say why
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


def _whole(value: Any, file: str, row: int) -> int | None:
    try:
        return read_quantity(value)
    except ValueError:
        raise BadSheet(file, f"cannot read {value!r} as a count", sheet=SHEET_TITLE, row=row,
                       column="Counted", hint="a whole number, 0 or more, or a blank cell") from None


def apply_count_sheet(store: Store, path: Path, *, dry_run: bool = False) -> CountReport:
    """Read a filled-in stock-take sheet and record every difference as a count movement.

    Raises:
        BadSheet: a counted cell is not a whole number ≥ 0, or a bin is unknown (nothing is recorded).
    """

    file = str(path)
    try:
        wb = open_workbook(path)
    except BadSheet as exc:
        raise BadSheet(file, f"is not a readable stock-take workbook ({exc.reason})",
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
        cells = tuple(cells) + (None,) * (len(COUNT_HEADERS) - len(cells))
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


__all__ = ["COUNT_HEADERS", "MARKER", "SHEET_TITLE", "CountChange", "CountReport", "apply_count_sheet",
           "is_count_sheet", "preview_count_sheet"]
