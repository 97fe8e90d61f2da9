"""Intake: turn the rows of a read sheet into stored bins, parts, ledger movements and flags.

The readers in :mod:`importers` give raw rows; :mod:`stock.row_reading` says what each row means
(its fields' text, its count, its decoded marking checked against any explicit value or label);
:mod:`stock.inventory.sheet_intake` stores the result batch by batch, in one transaction per
file; each distinct reading is stored once (:mod:`stock.inventory.stored_markings`). Every
row read is accounted for exactly once: stored (perhaps with flags), unchanged (already stored
that way), or quarantined with its reason. Nothing is dropped and nothing is silently changed.

Bin identity: ``bin_key`` is ``"<cabinet>/<location>"``, lower-cased with runs of white space
made single, where *cabinet* is the cabinet column if the sheet has one, else the sheet name
(xlsx) or the file name without its extension (csv); and *location* is the location column,
else the label, else the marking text. Re-importing an edited sheet finds its bins by that key.

Quantity rules (common practice in stock-keeping, no published source): whole numbers only; a
blank cell means "not counted" (``on_hand`` NULL, an ``unknown-quantity`` flag), never zero;
a negative or non-numeric count quarantines the row.

>>> bin_key("Cabinet  1", " A2 ")
'cabinet 1/a2'
"""

from __future__ import annotations

import hashlib
import json
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from stock.store.flag_kinds import QUARANTINE_FIXES
from stock.inventory.row_reading import (MARKING_FIELDS, MAX_COUNT, READING_FIELDS, bin_key,
                                         cell_text, decode_cached, normalise, read_quantity)
from stock.inventory.sheet_intake import BATCH, SheetIntake
from stock.store.database import Store, now

# Page cache for the import's transaction (KiB): the parts and grades indexes of a big sheet
# outgrow SQLite's default 2 MiB and then every insert rereads pages from the OS.
IMPORT_CACHE_KIB = 65536

# Why a row was quarantined, and what the user can do about it (shown by `stock quarantine`).
@dataclass(frozen=True)
class SheetReport:
    """What one sheet of one file did (or would do, in a dry run) to the store."""

    path: str
    sheet: str | None
    rows: int = 0
    stored: int = 0
    quarantined: int = 0
    flagged: int = 0
    unchanged: int = 0
    new_bins: int = 0
    updated_bins: int = 0
    count_movements: int = 0
    flags_raised: int = 0
    same_file: bool = False
    mapping: tuple[str, ...] = ()
    notes: tuple[str, ...] = ()
    import_id: int | None = None
    skipped: str | None = None


    def to_json(self) -> dict[str, Any]:
        return {
            "path": self.path, "sheet": self.sheet, "rows": self.rows, "stored": self.stored,
            "quarantined": self.quarantined, "flagged": self.flagged, "unchanged": self.unchanged,
            "new_bins": self.new_bins, "updated_bins": self.updated_bins,
            "count_movements": self.count_movements, "flags_raised": self.flags_raised,
            "same_file": self.same_file, "mapping": list(self.mapping), "notes": list(self.notes),
            "skipped": self.skipped,
        }


@dataclass(frozen=True)
class ImportReport:
    """The sheets of one imported file; ``dry_run`` says nothing was kept."""

    path: str
    sheets: tuple[SheetReport, ...]
    dry_run: bool = False

    def to_json(self) -> dict[str, Any]:
        return {"files": [s.to_json() | {"dry_run": self.dry_run} for s in self.sheets]}


class _DryRun(Exception):
    """Raised inside the transaction of a dry run so that nothing is kept."""


def file_sha256(path: Path) -> str:
    digest = hashlib.sha256()
    with path.open("rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 20), b""):
            digest.update(chunk)
    return digest.hexdigest()


def _sheet_notes(raw_sheet: Any) -> tuple[str, ...]:
    """What the reader found worth telling while reading (rows below a long blank run not read ...)."""
    return tuple(getattr(raw_sheet, "notes", None) or ())


def _start_import(store: Store, path: Path, sha: str, raw_sheet: Any, mapping: tuple[str, ...]) -> int:
    """The ``imports`` row of one sheet, with its header kept once for its compact source rows."""
    headers = [cell_text(h) for h in raw_sheet.headers]
    return store.db.conn.execute(
        "INSERT INTO imports (path, file_name, sha256, sheet, at, mapping_json, headers_json)"
        " VALUES (?, ?, ?, ?, ?, ?, ?)",
        (str(path.resolve()), path.name, sha, raw_sheet.sheet, now(),
         json.dumps(list(mapping), ensure_ascii=False),
         json.dumps(headers, ensure_ascii=False))).lastrowid


def import_file(store: Store, path: str | Path, *, sheet: str | None = None,
                overrides: dict[str, str] | Sequence[Any] | None = None, dry_run: bool = False,
                progress: Callable[[int], None] | None = None, force: bool = False,
                keep_mapping: bool = False, forget_mapping: bool = False,
                check_map: bool = True) -> ImportReport:
    """Import one CSV or XLSX file (every sheet, or ``sheet``) in one transaction.

    Args:
        store: the open store.
        path: the file.
        sheet: import only this sheet of a workbook.
        overrides: ``--map`` rules (:class:`~stock.inventory.sheet_plan.MapRule`), or a plain
            ``{field: header}`` that applies to every sheet having the header.
        dry_run: do everything, then roll back; the report says what would have changed.
        progress: called with the number of rows done so far, every thousand rows or so.
        force: import a sheet that looks like a BOM all the same.
        keep_mapping: keep each sheet's mapping for its headers (a ``--map`` is kept anyway).
        forget_mapping: drop the mapping kept for each sheet's headers before reading it.
        check_map: refuse a ``--map`` rule that no sheet of this file has (the CLI checks
            across all the files of one command instead).

    Returns:
        An :class:`ImportReport` with one :class:`SheetReport` per sheet (skipped sheets too).

    Raises:
        BadSheet: the file cannot be read, no sheet has a column that holds values, or a sheet
            looks like a BOM. The store is unchanged.
    """
    from importers.sheet import read_sheets
    from stock.inventory.sheet_plan import unmatched_error, unmatched_rules

    path = Path(path)
    rules = _as_rules(overrides)
    sheets = read_sheets(path, sheet)
    sha = file_sha256(path)
    reports: list[SheetReport] = []
    conn = store.db.conn
    cache = conn.execute("PRAGMA cache_size").fetchone()[0]
    if 0 <= cache or -cache < IMPORT_CACHE_KIB:
        conn.execute(f"PRAGMA cache_size = -{IMPORT_CACHE_KIB}")  # this connection only
    try:
        with store.writing():
            if check_map:
                left = unmatched_rules(rules, [(path, s.sheet, s.headers) for s in sheets])
                if left:
                    raise unmatched_error(left[0], [(path, s.sheet, s.headers) for s in sheets])
            ids = {t: store.one(f"SELECT COALESCE(MAX(id), 0) AS n FROM {t}")["n"]
                   for t in ("bins", "source_rows")}
            file_imports: list[int] = []
            changed = False
            skipped: list[Any] = []
            for raw_sheet in sheets:
                plan = _plan(store, path, raw_sheet, rules, force, keep_mapping, forget_mapping)
                if plan.skip is not None:
                    skipped.append(plan)
                    reports.append(SheetReport(str(path), raw_sheet.sheet, skipped=plan.skip))
                    continue
                changed = _import_sheet(store, path, sha, plan, file_imports, ids, progress,
                                        dry_run, reports) or changed
            if len(skipped) == len(sheets):
                from stock.inventory.sheet_plan import refuse_unreadable
                refuse_unreadable(path, skipped)
            if changed and not dry_run:
                from stock.inventory.stored_grades import refresh_stored_grades
                from stock.inventory.stock_checks import raise_stock_flags
                refresh_stored_grades(store)   # the readings this file brought that have none yet
                raise_stock_flags(store)   # below minimum, shelf life: known as soon as imported
            if dry_run:
                raise _DryRun
    except _DryRun:
        pass
    finally:
        conn.execute(f"PRAGMA cache_size = {cache}")
    return ImportReport(str(path), tuple(reports), dry_run=dry_run)


def _as_rules(overrides: dict[str, str] | Sequence[Any] | None) -> tuple[Any, ...]:
    from stock.inventory.sheet_plan import MapRule

    if not overrides:
        return ()
    if isinstance(overrides, dict):
        return tuple(MapRule(None, k, v) for k, v in overrides.items())
    return tuple(overrides)


def _plan(store: Store, path: Path, raw_sheet: Any, rules: Sequence[Any], force: bool,
          keep_mapping: bool, forget_mapping: bool) -> Any:
    """The sheet's plan (mapping by header, memory and content; or why it is skipped)."""
    from stock.inventory.sheet_plan import plan_sheet

    if forget_mapping:
        from stock.inventory.remembered_mappings import forget_mapping as forget
        forget(store, [cell_text(h) for h in raw_sheet.headers])
    return plan_sheet(store, path, raw_sheet, rules, force=force, keep_mapping=keep_mapping)


def _import_sheet(store: Store, path: Path, sha: str, plan: Any, file_imports: list[int],
                  ids: dict[str, int], progress: Callable[[int], None] | None,
                  dry_run: bool, reports: list[SheetReport]) -> bool:
    """Store the rows of one planned sheet and add its report; True when it changed any bin."""
    raw_sheet, header_map = plan.sheet, plan.header_map
    mapping = tuple(header_map.describe())
    notes = _sheet_notes(raw_sheet) + (("read as this store's own inventory export",)
                                       if plan.exported else ())
    before = store.one(
        "SELECT rows FROM imports WHERE sha256 = ? AND sheet IS ? ORDER BY id DESC LIMIT 1",
        (sha, raw_sheet.sheet))
    if before is not None:
        reports.append(SheetReport(str(path), raw_sheet.sheet, rows=before["rows"],
                                   unchanged=before["rows"], same_file=True, mapping=mapping))
        return False
    import_id = _start_import(store, path, sha, raw_sheet, mapping)
    file_imports.append(import_id)
    intake = SheetIntake(store, path, raw_sheet, header_map, import_id, file_imports, ids, progress)
    if plan.exported:
        from stock.inventory.own_exports import ExportedFacts
        intake.exported = ExportedFacts([cell_text(h) for h in raw_sheet.headers])
    intake.run()
    if intake.settled:
        from stock.inventory.own_exports import settle_from_export
        settle_from_export(store, intake.settled, path.name, import_id)
    if plan.keep:
        from stock.inventory.remembered_mappings import remember_mapping
        remember_mapping(store, [cell_text(h) for h in raw_sheet.headers], header_map)
        notes += ("mapping kept for these headers; the next import uses it (--forget-mapping drops it)",)
    c = intake.counts
    store.db.conn.execute(
        "UPDATE imports SET rows = ?, stored = ?, quarantined = ?, flagged = ?,"
        " unchanged = ? WHERE id = ?",
        (c.rows, c.stored, c.quarantined, c.flagged, c.unchanged, import_id))
    reports.append(SheetReport(str(path), raw_sheet.sheet, mapping=mapping, notes=notes,
                               import_id=None if dry_run else import_id, **c.as_dict()))
    return intake.changed_any


__all__ = ["BATCH", "MARKING_FIELDS", "MAX_COUNT", "QUARANTINE_FIXES", "READING_FIELDS",
           "ImportReport", "SheetReport", "bin_key", "cell_text", "decode_cached", "import_file",
           "normalise", "read_quantity"]
