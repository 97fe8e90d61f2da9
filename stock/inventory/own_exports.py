"""The store's own inventory export, read back: bins by their key, facts from their own columns.

An inventory sheet written by ``stock export inventory`` (CSV, or the ``Bins`` sheet of the
workbook) is known by its headers (:data:`EXPORT_HEADERS`). Imported again — into another store,
or after editing it in a spreadsheet — each row's bin is the one its ``Bin`` column names, and
the part's facts are those its columns state (capacitance in pF, tolerance, voltage and AC/DC,
dielectric, family, safety class, polarity), not a fresh decoding of the marking: a reading a
person settled in the old store was written into those columns, and stays settled here.

The marking is still decoded, so the part keeps the decoder's alternatives and doubts beside the
facts; where the columns say something the decoding does not, the columns' reading is stored as
the settled one, its doubts closed, and the ledger says it came from the exported sheet.
"""

from __future__ import annotations

import json
import re
from dataclasses import replace
from decimal import Decimal, InvalidOperation
from typing import Any, Sequence

from stock.decoded import FAMILIES, Marking, Tolerance
from stock.inventory.row_reading import (
    PART_COLUMNS,
    agreed_by_claim,
    cell_text,
    decode_cached,
    part_columns,
    same_value,
)
from stock.markings.families import family_dielectric
from stock.store.flag_records import close_flags, ledger_note

# The headers that mark an inventory export (a subset of what the exporter writes; a test keeps
# them in step with stock.sheets_out.exports.INVENTORY_COLUMNS).
EXPORT_HEADERS = ("Bin", "Marking", "Capacitance (pF)", "Tolerance", "Voltage (V)", "AC/DC",
                  "Dielectric", "Family", "Safety class", "Polarity", "On hand")
# Field → export header, for the fields read as such; the other reading fields get no column.
_READ_AS = {"bin_key": "Bin", "location": "Location", "cabinet": "Cabinet", "label": "Label",
            "marking": "Marking", "quantity": "On hand", "package": "Package", "mounting": "Mounting",
            "minimum": "Minimum", "date_code": "Date code", "notes": "Notes"}
_NOT_READ = ("value", "colours", "tolerance", "voltage", "dielectric", "safety_class", "polarity",
             "rated_temp", "notes", "minimum", "date_code")


def is_own_export(headers: Sequence[str]) -> bool:
    """Whether a sheet's headers are those of the store's inventory export.

    >>> is_own_export(["Bin", "Location", "Marking", "Capacitance (pF)", "Tolerance", "Voltage (V)",
    ...                "AC/DC", "Dielectric", "Family", "Safety class", "Polarity", "On hand"])
    True
    >>> is_own_export(["Bin", "Marking", "Qty"])
    False
    """
    present = set(headers)
    return all(h in present for h in EXPORT_HEADERS)


def export_overrides(headers: Sequence[str]) -> dict[str, str]:
    """The ``{field: header}`` mapping an export is read by (fields it states as facts: no column)."""
    present = set(headers)
    out = {name: header for name, header in _READ_AS.items() if header in present}
    out.update({name: "" for name in _NOT_READ if name not in out})
    return out


def _decimal(cell: Any) -> Decimal | None:
    text = cell_text(cell)
    if not text:
        return None
    try:
        return Decimal(text)
    except InvalidOperation:
        return None


class ExportedFacts:
    """Reads the facts columns of an exported sheet and sets them on the decoded marking."""
    def __init__(self, headers: Sequence[str]):
        self.at = {h: i for i, h in enumerate(headers)}

    def _cell(self, cells: Sequence[Any], header: str) -> Any:
        i = self.at.get(header)
        return None if i is None or i >= len(cells) else cells[i]

    def _text(self, cells: Sequence[Any], header: str) -> str:
        return cell_text(self._cell(cells, header))

    def marking(self, cells: Sequence[Any], decoded: Marking | None, text: str) -> tuple[Marking | None, bool]:
        """(the part's marking with the columns' facts, whether they differ from the decoding)."""
        base = decoded or Marking(text=text)
        pf = _decimal(self._cell(cells, "Capacitance (pF)"))
        if pf is None:
            return decoded, False          # nothing stated: the decoding stands (or the row is refused)
        if base.capacitance_pf is not None and same_value(base.capacitance_pf, pf):
            # the sheet states the value the decoder chose: its doubts about the value are answered
            base = agreed_by_claim(base, "the exported sheet", self._text(cells, "Value") or text)
        tolerance_text = self._text(cells, "Tolerance")
        tolerance = _tolerance(tolerance_text)
        volts = _decimal(self._cell(cells, "Voltage (V)"))
        kind = self._text(cells, "AC/DC") or None
        dielectric = _dielectric(self._text(cells, "Dielectric"), self._text(cells, "Family"), base)
        facts = replace(
            base,
            capacitance_pf=base.capacitance_pf if base.capacitance_pf is not None
            and same_value(base.capacitance_pf, pf) else pf,
            tolerance=base.tolerance if _same_tolerance(base.tolerance, tolerance) else tolerance,
            voltage_v=base.voltage_v if volts is not None and base.voltage_v is not None
            and same_value(base.voltage_v, volts) else volts,
            voltage_kind=kind if volts is not None else None,
            dielectric=dielectric,
            safety_class=self._text(cells, "Safety class") or None,
            polarity=self._text(cells, "Polarity") or None)
        differs = _facts(facts) != _facts(base)
        return facts, differs


_PF_TOLERANCE = re.compile(r"^±\s*(\d+(?:\.\d+)?)\s*pF$")


def _tolerance(text: str) -> Any:
    """A tolerance as the export writes it: ``±10 %``, ``+80/−20 %``, ``±0.25 pF``."""
    if not text:
        return None
    pf = _PF_TOLERANCE.match(text)
    if pf:
        return Tolerance(Decimal(pf[1]), Decimal(pf[1]), "pF")
    return decode_cached(text).tolerance


def _same_tolerance(a: Any, b: Any) -> bool:
    if a is None or b is None:
        return a is b
    return (a.minus, a.plus, a.unit) == (b.minus, b.plus, b.unit)


def _dielectric(code: str, family: str, base: Marking) -> Any:
    if not code and not family:
        return None
    if base.dielectric is not None and base.dielectric.code == code and base.dielectric.family == family:
        return base.dielectric
    read = decode_cached(code).dielectric if code else None
    if read is not None and (not family or read.family == family):
        return read
    return family_dielectric(family) if family in FAMILIES else base.dielectric


def _facts(m: Marking) -> tuple:
    cols = part_columns(m)
    return cols[:1] + cols[1:4] + cols[5:]    # the tolerance letter is not written in the export


def settle_from_export(store: Any, settled: Sequence[tuple[int, Marking]], file_name: str,
                       import_id: int) -> None:
    """Store the exported reading of each bin as its settled one, close its doubts, note it.

    Runs inside the import's transaction, after the sheet's rows are stored.
    """

    sets = ", ".join(f'"{c}" = ?' for c in PART_COLUMNS)
    for bin_id, marking in settled:
        decision = {"via": "import", "decision": "reading from the exported sheet",
                    "file": file_name, "import_id": import_id}
        store.db.conn.execute(f"UPDATE parts SET {sets}, settled_json = ? WHERE bin_id = ?",
                              (*part_columns(marking), json.dumps(marking.to_json(), ensure_ascii=False),
                               bin_id))
        ids = [r["id"] for r in store.rows("SELECT id FROM flags WHERE bin_id = ? AND status = 'open'"
                                           " AND kind NOT IN ('unknown-quantity')", (bin_id,))]
        decision["flags"] = ids
        ledger_note(store, bin_id, "settle", ref=f"import:{import_id}",
                    note={**decision, "note": f"settled reading taken from {file_name}"}, actor=None)
        if ids:
            close_flags(store, ids, decision)


__all__ = ["EXPORT_HEADERS", "ExportedFacts", "export_overrides", "is_own_export", "settle_from_export"]
