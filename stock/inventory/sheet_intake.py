"""Storing the rows of one sheet, batch by batch, inside the file's one transaction.

Rows are read, decoded and written ``BATCH`` at a time: a batch is read and understood first (its
quantity, its marking, its bin key), then the bins its keys name are looked up in one query (the
stored bin, and whether an earlier row of this file already gave that bin), then each row is
stored or quarantined and the batch is written with ``executemany``. Nothing grows with the
number of rows but the database: no list of the file, of its keys or of the bins touched is held.

What a row means comes from :mod:`stock.inventory.row_reading`; what is written for it is kept
in :mod:`stock.inventory.intake_writes`; readings are stored once each
(:mod:`stock.inventory.stored_markings`).
"""

from __future__ import annotations

import json
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from itertools import islice
from json.encoder import encode_basestring_ascii
from pathlib import Path
from typing import Any

from stock.decoded import Marking
from stock.inventory.intake_writes import (BinState, Counts, FlagForms, Writer, reasons_json,
                                           stored_bins)
from stock.inventory.row_reading import (RowReader, cell_text, normalise, package_facts,
                                         read_quantity)
from stock.inventory.source_records import encode_cells
from stock.inventory.stored_markings import Readings, set_reading
from stock.store.database import Store, now

BATCH = 5000
PROGRESS_EVERY = 1000


@dataclass
class _Row:
    """One data row once understood, before the store is asked about its bin."""

    number: int
    cells: tuple[Any, ...]
    extra: tuple[tuple[str, Any], ...]
    problems: list[tuple[str, str]]
    fields: dict[str, str] | None = None
    quantity: int | None = None
    key: str | None = None
    cabinet: str = ""
    text: str = ""
    marking: Marking | None = None
    claims: Any = None
    settled: bool = False       # the reading is our own export's, to be stored as settled


class SheetIntake:
    """Stores the rows of one sheet inside the file's transaction.

    Args:
        store: the open store (a write transaction is open).
        path: the file, for messages and the default cabinet.
        raw_sheet: the sheet as read (:class:`importers.raw_sheet.RawSheet`).
        header_map: its header mapping.
        import_id: the ``imports`` row of this sheet.
        file_imports: the ``imports`` ids of every sheet of this file so far (this one included):
            a bin given by an earlier row of any of them is a duplicate row.
        ids: the last ids of ``bins`` and ``source_rows``, carried from sheet to sheet.
        progress: called with the number of rows done, every ``PROGRESS_EVERY`` rows.
    """

    def __init__(self, store: Store, path: Path, raw_sheet: Any, header_map: Any, import_id: int,
                 file_imports: list[int], ids: dict[str, int],
                 progress: Callable[[int], None] | None):
        self.store = store
        self.conn = store.db.conn
        self.path = path
        self.sheet = raw_sheet
        self.import_id = import_id
        self.file_imports = file_imports
        self.progress = progress
        self.stamp = now()
        self.counts = Counts()
        self.changed_any = False
        self.reader = RowReader(header_map, [cell_text(h) for h in raw_sheet.headers])
        self.readings = Readings(self.conn)
        self.writer = Writer(self.conn, ids, self.counts)
        self.flag_forms = FlagForms()
        self.default_cabinet = raw_sheet.sheet if raw_sheet.sheet else path.stem
        self._cabinet_keys: dict[str, str] = {}
        self._ref = f"import:{import_id}"
        self.exported = None              # ExportedFacts when the sheet is our own export
        self.settled: list[tuple[int, Marking]] = []   # new bins whose reading the export settles
        self._where = json.dumps({"sheet": raw_sheet.sheet, "file": path.name})[1:-1]

    def run(self) -> None:
        rows = self._data_rows()
        done = 0
        while chunk := list(islice(rows, BATCH)):
            understood = [self._understand(number, cells, extra) for number, cells, extra in chunk]
            batch = self.writer
            known = stored_bins(self.conn, {r.key for r in understood if r.key}, self.file_imports)
            given: dict[str, int] = {}     # bin key -> row number, for this batch's own rows
            for row in understood:
                self._settle_row(row, known, given, batch)
            batch.flush()
            done += len(chunk)
            if self.progress and done // PROGRESS_EVERY != (done - len(chunk)) // PROGRESS_EVERY:
                self.progress(done)
        if self.progress:
            self.progress(self.counts.rows)

    def _data_rows(self) -> Iterator[tuple[int, tuple[Any, ...], tuple[tuple[str, Any], ...]]]:
        for raw_row in self.sheet.rows:
            cells = tuple(raw_row.cells)
            if all(c is None or (isinstance(c, str) and not c.strip()) for c in cells):
                continue  # a blank line is not a row
            self.counts.rows += 1
            yield raw_row.number, cells, getattr(raw_row, "extra", ())

    def _understand(self, number: int, cells: tuple[Any, ...],
                    extra: tuple[tuple[str, Any], ...]) -> _Row:
        """Everything a row says without asking the store: count, reading, bin key."""
        reader = self.reader
        row = _Row(number, cells, extra, [])  # every reason a row is refused, not just the first
        try:
            row.quantity = read_quantity(reader.raw_cell(cells, "quantity"))
        except ValueError as exc:
            row.problems.append(("bad-quantity", str(exc)))
        f = row.fields = reader.texts(cells)
        row.text, row.marking, row.claims = reader.reading(f)
        if self.exported is not None:
            row.marking, row.settled = self.exported.marking(cells, row.marking, row.text)
        m = row.marking
        if m is None or m.capacitance_pf is None:
            row.problems.append(("no-capacitance", _no_capacitance(row.text, m)))
        if row.problems:
            return row
        row.cabinet = f.get("cabinet") or self.default_cabinet
        cabinet_key = self._cabinet_keys.get(row.cabinet)
        if cabinet_key is None:
            if len(self._cabinet_keys) > 4096:
                self._cabinet_keys.clear()
            cabinet_key = self._cabinet_keys[row.cabinet] = normalise(row.cabinet)
        row.key = f"{cabinet_key}/{normalise(f.get('location') or f.get('label') or row.text)}"
        if f.get("bin_key"):
            row.key, self._cabinet_keys[row.cabinet] = _stated_key(f["bin_key"], cabinet_key)
        return row

    def _quarantine(self, row: _Row, batch: Writer, problems: list[tuple[str, str]]) -> None:
        self.counts.quarantined += 1
        batch.source(self.import_id, self.sheet.sheet, row.number,
                     encode_cells(row.cells, row.extra), "quarantined", reasons_json(problems), None)

    def _settle_row(self, row: _Row, known: dict[str, BinState], given: dict[str, int],
                    batch: Writer) -> None:
        if row.problems:
            self._quarantine(row, batch, row.problems)
            return
        key = row.key
        assert key is not None and row.marking is not None
        state = known.get(key)
        first = given.get(key)
        if first is None and state is not None and state.first_row is not None:
            first = state.first_row
        if first is not None:
            sheet, number = first if isinstance(first, tuple) else (self.sheet.sheet, first)
            where = f"row {number}" + (f" of sheet {sheet!r}" if sheet != self.sheet.sheet else "")
            self._quarantine(row, batch, [("duplicate-row",
                                           f"bin {key!r} already came from {where} of this file")])
            return
        given[key] = row.number
        label = row.fields.get("label", "")
        marking, extra_flags = self.reader.cross_check(key, row.text, row.marking, row.claims, label)
        package, mounting, conflict = package_facts(row.fields.get("package"), row.fields.get("mounting"),
                                                    marking.package, marking.mounting)
        if conflict:
            extra_flags = [*extra_flags, ("conflicting-readings", f"bin {key!r}: {conflict}",
                                          f"{key}|package-conflict|{package}|{mounting}")]
        if state is None:
            state = known[key] = self._new_bin(row, label, marking, package, mounting, batch)
            if row.settled:
                self.settled.append((state.id, marking))
        else:
            self._edited_bin(row, state, label, marking, package, mounting, batch)
        self._flags_and_source(row, state, marking, extra_flags, batch)

    def _new_bin(self, row: _Row, label: str, marking: Marking, package: str | None,
                 mounting: str | None, batch: Writer) -> BinState:
        f = row.fields
        bin_id = batch.next_bin_id()
        location = f.get("location") or None
        minimum = _minimum(self.reader, row.cells)
        reading_id = self.readings.id_for(marking, row.text)
        batch.bin((bin_id, row.key, label or None, location, row.cabinet, f.get("notes"), minimum,
                   f.get("date_code"), row.quantity, self.stamp, self.stamp))
        batch.part((bin_id, reading_id, None, reading_id, package, mounting))
        if row.quantity is not None:
            # A new bin's count arrives as one 'import' movement in the same transaction as the
            # bin row, so on_hand equals the ledger sum from the start.
            batch.movement((bin_id, row.quantity, self._ref, self.stamp))
        self.counts.new_bins += 1
        self.counts.stored += 1
        self.changed_any = True
        return BinState(bin_id, row.quantity, label or None, location, f.get("notes"), minimum,
                        f.get("date_code"), row.text, None)

    def _edited_bin(self, row: _Row, old: BinState, label: str, marking: Marking,
                    package: str | None, mounting: str | None, batch: Writer) -> None:
        """Bring a stored bin in line with its edited row."""
        f = row.fields
        changed = False
        new = (label or None, f.get("location") or None, f.get("notes"),
               _minimum(self.reader, row.cells), f.get("date_code"))
        if new != (old.label, old.location, old.notes, old.minimum, old.date_code):
            self.conn.execute(
                "UPDATE bins SET label = ?, location = ?, notes = ?, minimum = ?, date_code = ?,"
                " updated_at = ? WHERE id = ?", (*new, self.stamp, old.id))
            old.label, old.location, old.notes, old.minimum, old.date_code = new
            changed = True
        if row.text != old.marking:
            # A settled decision outlives re-imports: the bin keeps showing it, the new decoding
            # is kept beside it.
            set_reading(self.conn, old.id, marking, text=row.text, package=package,
                        mounting=mounting, readings=self.readings)
            old.marking = row.text
            changed = True
        if row.quantity is not None and row.quantity != old.on_hand:
            self.store.set_count(old.id, row.quantity, "count", ref=self._ref,
                                 note=f"count in {self.path.name}")
            old.on_hand = row.quantity
            self.counts.count_movements += 1
            changed = True
        if changed:
            self.counts.stored += 1
            self.counts.updated_bins += 1
            self.changed_any = True
        else:
            self.counts.unchanged += 1

    def _flags_and_source(self, row: _Row, state: BinState, marking: Marking,
                          extra_flags: list[tuple[str, str, str]], batch: Writer) -> None:
        flags, reasons = self.flag_forms.rows(row.key, row.text, marking, extra_flags, state.on_hand)
        source_id = batch.next_source_id()
        if flags:
            self.counts.flagged += 1
            # what Store.raise_flag writes: json.dumps(details) of marking, row, sheet and file
            details = (f'{{"marking": {encode_basestring_ascii(row.text)}, "row": {row.number},'
                       f' {self._where}}}')
            for kind, message, fingerprint in flags:
                batch.flag((state.id, source_id, kind, message, details, fingerprint, self.stamp))
        batch.source(self.import_id, self.sheet.sheet, row.number, encode_cells(row.cells, row.extra),
                     "flagged" if flags else "stored", reasons, state.id, source_id=source_id)


def _stated_key(stated: str, cabinet_key: str) -> tuple[str, str]:
    """A bin key given in its own column (our export's ``Bin``): the key and its cabinet part."""
    key = normalise(stated)
    if key.startswith(cabinet_key + "/"):
        return key, cabinet_key
    return key, key.partition("/")[0]


def _no_capacitance(text: str, marking: Marking | None) -> str:
    """Why a row holds no capacitance, naming what its text was read as instead."""
    if not text:
        return "no capacitance could be read: the row has no marking or value"
    if marking is not None:
        other = [a.reason for a in marking.alternatives if a.capacitance_pf is not None]
        if marking.voltage_v is not None and other:
            from stock.units import format_voltage
            return (f"no capacitance could be read from {text!r}: it reads as a voltage code"
                    f" ({format_voltage(marking.voltage_v, marking.voltage_kind)}), not a value"
                    f" (at a stretch {other[0].split(': ', 1)[-1]}); give the capacitance with its"
                    " unit, e.g. 1nF")
    return f"no capacitance could be read from {text!r}"


def _minimum(reader: RowReader, cells: tuple[Any, ...]) -> int | None:
    try:
        return read_quantity(reader.raw_cell(cells, "minimum"))
    except ValueError:
        return None  # a bad minimum is no reason to lose the row; the raw cell is kept


__all__ = ["BATCH", "SheetIntake"]
