"""The pick list as a workbook: a "Pick list" sheet to tick off at the shelves, then "Cautions"."""

from __future__ import annotations

from pathlib import Path

from stock.kitting.pick_list import PickList
from stock.sheets_out.workbook import Column, add_table_sheet, new_workbook, save_workbook


def write_pick_list_xlsx(pl: PickList, path: Path) -> int:
    """Write the pick list as an XLSX workbook (a "Pick list" sheet, then "Cautions"); returns rows.

    Raises:
        StoreProblem: the file cannot be written.
    """
    columns = (Column("Location", 12, "@"), Column("Bin", 16, "@"), Column("Marking", 18, "@"),
               Column("Value", 10), Column("Count", 8, "0"), Column("Refs", 30),
               Column("Package", 18), Column("Picked", 8))
    wb = new_workbook()
    rows = [(r.location or "", r.bin_key, r.marking, r.value, r.count, " ".join(r.refs), r.package,
             "") for r in pl.rows]
    add_table_sheet(wb, "Pick list", columns, rows, totals={0: "Total", 4: "sum"})
    notes = [(f"Plan {pl.plan}, {pl.boards} board(s), status {pl.status}",)]
    notes.extend((c,) for c in pl.cautions)
    add_table_sheet(wb, "Cautions", (Column("Read before handling", 120),), notes)
    save_workbook(wb, Path(path))
    return len(rows)


__all__ = ["write_pick_list_xlsx"]
