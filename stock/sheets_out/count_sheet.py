"""The stock-take sheet written: every bin in location order, with an empty "Counted" column.

The sheet carries each bin's key (which identifies it on the way back), what to look for, the
quantity the store expects, and an empty "Counted" column that accepts only whole numbers ≥ 0.
:mod:`stock.inventory.stocktake` reads it back.
"""

from __future__ import annotations

from decimal import Decimal
from pathlib import Path

from stock.inventory.bins import natural_key
from stock.inventory.stocktake import COUNT_HEADERS, MARKER, SHEET_TITLE
from stock.sheets_out.workbook import Column, new_workbook, save_workbook, sheet_cell
from stock.store.database import Store
from stock.units import format_capacitance

_WIDTHS = {"Bin": 18, "Location": 10, "Label": 12, "Marking": 24, "Value": 10, "Expected": 10,
           "Counted": 10, "Note": 30}
_FORMATS = {"Expected": "#,##0", "Counted": "0"}
COUNT_COLUMNS = tuple(Column(h, _WIDTHS[h], *((_FORMATS[h],) if h in _FORMATS else ())) for h in COUNT_HEADERS)


def export_count_sheet(store: Store, out: Path) -> int:
    """Write the stock-take sheet for every bin, in natural location order; returns its rows."""
    from openpyxl.worksheet.datavalidation import DataValidation

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


__all__ = ["COUNT_COLUMNS", "export_count_sheet"]
