"""Intake: turn the rows of a read sheet into stored bins, parts, ledger movements and flags.

The readers in :mod:`importers` give raw rows; :mod:`stock.row_reading` says what each row means
(its fields' text, its count, its decoded marking checked against any explicit value or label);
this module stores the result in one transaction per file, batched (``executemany``). Every
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
from json.encoder import encode_basestring_ascii
from pathlib import Path
from typing import Any

from stock.decoded import Marking
from stock.store.flag_kinds import QUARANTINE_FIXES
from stock.inventory.row_reading import (MARKING_FIELDS, MAX_COUNT, PART_COLUMNS, READING_FIELDS, RowReader,
                               bin_key, cell_text, decode_cached, normalise, package_facts,
                               part_columns, read_quantity)
from stock.store.database import Store, now

BATCH = 2000
PROGRESS_EVERY = 1000
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


_INSERT_PART = (
    f"INSERT INTO parts (bin_id, marking, {', '.join(PART_COLUMNS)}, package, mounting,"
    f" decoded_json) VALUES ({', '.join('?' * (len(PART_COLUMNS) + 5))})")
_UPDATE_PART = (
    f"UPDATE parts SET marking = ?, {', '.join(c + ' = ?' for c in PART_COLUMNS)},"
    " package = COALESCE(?, package), mounting = COALESCE(?, mounting), decoded_json = ?"
    " WHERE bin_id = ?")
_INSERT_BIN = ("INSERT INTO bins (id, bin_key, label, location, cabinet, notes, minimum, date_code,"
               " on_hand, created_at, updated_at) VALUES (?,?,?,?,?,?,?,?,?,?,?)")
_INSERT_SOURCE = ("INSERT INTO source_rows (id, import_id, sheet, row_number, raw_json, status,"
                  " reasons_json, bin_id) VALUES (?,?,?,?,?,?,?,?)")
_INSERT_LEDGER = ("INSERT INTO ledger (bin_id, delta, kind, ref, note, actor, at)"
                  " VALUES (?, ?, 'import', ?, NULL, NULL, ?)")
_INSERT_FLAG = ("INSERT OR IGNORE INTO flags (bin_id, source_row_id, kind, message, details_json,"
                " fingerprint, status, opened_at) VALUES (?, ?, ?, ?, ?, ?, 'open', ?)")


@dataclass
class _Existing:
    id: int
    on_hand: int | None
    label: str | None
    location: str | None
    notes: str | None
    minimum: int | None
    date_code: str | None
    marking: str | None
    settled_json: str | None


class _SheetIntake:
    """Stores the rows of one sheet inside the file's transaction."""

    def __init__(self, store: Store, path: Path, raw_sheet: Any, header_map: Any,
                 import_id: int, seen_keys: dict[str, tuple[str | None, int]],
                 ids: dict[str, int], progress: Callable[[int], None] | None):
        self.store = store
        self.conn = store.db.conn
        self.path = path
        self.sheet = raw_sheet
        self.import_id = import_id
        self.seen = seen_keys
        self.ids = ids
        self.progress = progress
        self.stamp = now()
        self.existing: dict[str, dict[str, _Existing]] = {}
        self.counts = dict(rows=0, stored=0, quarantined=0, flagged=0, unchanged=0, new_bins=0,
                           updated_bins=0, count_movements=0, flags_raised=0)
        self.touched: list[int] = []
        self._extra: tuple[tuple[str, Any], ...] = ()
        self._bins: list[tuple] = []
        self._parts: list[tuple] = []
        self._ledger: list[tuple] = []
        self._sources: list[tuple] = []
        self._flags: list[tuple] = []
        # the readers see to it that headers are unique
        self.reader = RowReader(header_map, [cell_text(h) for h in raw_sheet.headers])
        self.default_cabinet = raw_sheet.sheet if raw_sheet.sheet else path.stem
        self._cabinet_keys: dict[str, str] = {}
        self._forms: dict[int, tuple[Marking, tuple[Any, ...], str]] = {}
        self._flag_forms: dict[str, tuple[Marking, tuple[tuple[str, str, str], ...], str]] = {}
        self._ref = f"import:{import_id}"
        self.exported = None              # ExportedFacts when the sheet is our own export
        self.settled: list[tuple[int, Marking]] = []
        self._where = json.dumps({"sheet": raw_sheet.sheet, "file": path.name})[1:-1]

    def _existing_for(self, cabinet_key: str) -> dict[str, _Existing]:
        """Every stored bin of one cabinet, read once (no per-row SELECT)."""
        found = self.existing.get(cabinet_key)
        if found is None:
            lo = cabinet_key + "/"
            hi = cabinet_key + "0"  # "0" follows "/" in code-point order: the key range of this cabinet
            found = {}
            for r in self.conn.execute(
                    "SELECT b.id, b.bin_key, b.on_hand, b.label, b.location, b.notes, b.minimum,"
                    " b.date_code, p.marking, p.settled_json FROM bins b"
                    " LEFT JOIN parts p ON p.bin_id = b.id WHERE b.bin_key >= ? AND b.bin_key < ?",
                    (lo, hi)):
                found[r[1]] = _Existing(r[0], r[2], r[3], r[4], r[5], r[6], r[7], r[8], r[9])
            self.existing[cabinet_key] = found
        return found

    def run(self) -> None:
        for raw_row in self.sheet.rows:
            cells = tuple(raw_row.cells)
            if all(c is None or (isinstance(c, str) and not c.strip()) for c in cells):
                continue  # a blank line is not a row
            self.counts["rows"] += 1
            self._extra = getattr(raw_row, "extra", ())
            self._row(raw_row.number, cells)
            if len(self._sources) >= BATCH:
                self._flush()
            if self.progress and self.counts["rows"] % PROGRESS_EVERY == 0:
                self.progress(self.counts["rows"])
        self._flush()
        if self.progress:
            self.progress(self.counts["rows"])

    def _stored_form(self, m: Marking) -> tuple[tuple[Any, ...], str]:
        """Flat columns and JSON of a marking, remembered by identity: the reader hands out one
        object per distinct reading, so a sheet's repeated markings are turned into rows once."""
        found = self._forms.get(id(m))
        if found is None or found[0] is not m:
            found = (m, part_columns(m), json.dumps(m.to_json(), ensure_ascii=False))
            if len(self._forms) < 65536:
                self._forms[id(m)] = found
        return found[1], found[2]

    def _marking_flags(self, text: str, m: Marking) -> tuple[tuple[tuple[str, str, str], ...], str]:
        """A marking's own flags as (kind, message, fingerprint suffix after the bin key), and
        their reasons JSON, remembered per marking text."""
        found = self._flag_forms.get(text)
        if found is None or found[0] is not m:
            seen: dict[str, int] = {}
            out = []
            for f in m.flags:
                n = seen.get(f.kind, 0)
                seen[f.kind] = n + 1
                out.append((f.kind, f.message, f"|{f.kind}|{text}" + (f"|{n}" if n else "")))
            found = (m, tuple(out), _reasons_json([(k, msg) for k, msg, _ in out]))
            if len(self._flag_forms) < 65536:
                self._flag_forms[text] = found
        return found[1], found[2]

    def _next_id(self, table: str) -> int:
        self.ids[table] += 1
        return self.ids[table]

    def _quarantine(self, number: int, cells: tuple[Any, ...],
                    problems: list[tuple[str, str]]) -> None:
        self.counts["quarantined"] += 1
        self._sources.append((self._next_id("source_rows"), self.import_id, self.sheet.sheet, number,
                              self.reader.raw_json(cells, self._extra), "quarantined",
                              _reasons_json(problems), None))

    def _row(self, number: int, cells: tuple[Any, ...]) -> None:
        reader = self.reader
        problems: list[tuple[str, str]] = []  # every reason a row is refused, not just the first
        try:
            quantity = read_quantity(reader.raw_cell(cells, "quantity"))
        except ValueError as exc:
            quantity = None
            problems.append(("bad-quantity", str(exc)))
        f = reader.texts(cells)
        text, marking, claims = reader.reading(f)
        settled = False
        if self.exported is not None:
            marking, settled = self.exported.marking(cells, marking, text)
        if marking is None or marking.capacitance_pf is None:
            problems.append(("no-capacitance", _no_capacitance(text, marking)))
        if problems:
            self._quarantine(number, cells, problems)
            return
        assert marking is not None
        label = f.get("label", "")
        location = f.get("location", "")
        cabinet = f.get("cabinet") or self.default_cabinet
        cabinet_key = self._cabinet_keys.get(cabinet)
        if cabinet_key is None:
            cabinet_key = self._cabinet_keys[cabinet] = normalise(cabinet)
        key = f"{cabinet_key}/{normalise(location or label or text)}"
        if f.get("bin_key"):
            key, cabinet_key = _stated_key(f["bin_key"], cabinet_key)
            self._cabinet_keys[cabinet] = cabinet_key
        first = self.seen.get(key)
        if first is not None:
            where = f"row {first[1]}" + (f" of sheet {first[0]!r}" if first[0] != self.sheet.sheet else "")
            self._quarantine(number, cells, [("duplicate-row",
                                              f"bin {key!r} already came from {where} of this file")])
            return
        self.seen[key] = (self.sheet.sheet, number)

        marking, extra_flags = reader.cross_check(key, text, marking, claims, label)
        bin_id = self._store(number, cells, f, key, cabinet, label, location or None, text,
                             marking, extra_flags, quantity)
        if settled and bin_id is not None:
            self.settled.append((bin_id, marking))

    def _flags_for(self, key: str, text: str, marking: Marking,
                   extra: list[tuple[str, str, str]], quantity: int | None,
                   ) -> tuple[list[tuple[str, str, str]], str]:
        """The row's flags as (kind, message, fingerprint), and their reasons JSON."""
        if not extra:
            own, reasons = self._marking_flags(text, marking)
            out = [(kind, message, key + suffix) for kind, message, suffix in own]
        else:  # a label conflict is among the marking's flags too: list it once, as found
            out = []
            seen: dict[str, int] = {}
            extra_messages = {m for _, m, _ in extra}
            for f in marking.flags:
                if f.message in extra_messages:
                    continue
                n = seen.get(f.kind, 0)
                seen[f.kind] = n + 1
                out.append((f.kind, f.message, f"{key}|{f.kind}|{text}" + (f"|{n}" if n else "")))
            out.extend(extra)
            reasons = ""
        if quantity is None:
            out.append(("unknown-quantity", f"bin {key!r} has no count in the sheet (blank is"
                        " not zero); count it", f"{key}|unknown-quantity"))
            reasons = ""
        return out, reasons or _reasons_json([(k, m) for k, m, _ in out])

    def _store(self, number: int, cells: tuple[Any, ...], f: dict[str, str], key: str,
               cabinet: str, label: str, location: str | None, text: str,
               marking: Marking, extra: list[tuple[str, str, str]], quantity: int | None) -> int | None:
        in_cabinet = self._existing_for(self._cabinet_keys[cabinet])
        existing = in_cabinet.get(key)
        notes = f.get("notes")
        date_code = f.get("date_code")
        try:
            minimum = read_quantity(self.reader.raw_cell(cells, "minimum"))
        except ValueError:
            minimum = None  # a bad minimum is no reason to lose the row; the raw cell is kept
        package, mounting, conflict = package_facts(f.get("package"), f.get("mounting"),
                                                    marking.package, marking.mounting)
        if conflict:
            extra = [*extra, ("conflicting-readings", f"bin {key!r}: {conflict}",
                              f"{key}|package-conflict|{package}|{mounting}")]
        known = quantity if existing is None or quantity is not None else existing.on_hand
        flags, reasons = self._flags_for(key, text, marking, extra, known)
        source_id = self._next_id("source_rows")
        status = "flagged" if flags else "stored"

        if existing is None:
            bin_id = self._next_id("bins")
            columns, decoded = self._stored_form(marking)
            self._bins.append((bin_id, key, label or None, location, cabinet, notes, minimum,
                               date_code, quantity, self.stamp, self.stamp))
            self._parts.append((bin_id, text, *columns, package, mounting, decoded))
            if quantity is not None:
                # A new bin's count arrives as one 'import' movement in the same transaction as
                # the bin row, so on_hand equals the ledger sum from the start.
                self._ledger.append((bin_id, quantity, self._ref, self.stamp))
            self.counts["new_bins"] += 1
            self.counts["stored"] += 1
            self.touched.append(bin_id)
            in_cabinet[key] = _Existing(
                bin_id, quantity, label or None, location, notes, minimum, date_code, text, None)
        else:
            bin_id = existing.id
            changed = self._update(existing, label, location, notes, minimum, date_code, text,
                                   marking, extra, quantity, package, mounting)
            self.counts["stored" if changed else "unchanged"] += 1
            if changed:
                self.counts["updated_bins"] += 1
                self.touched.append(bin_id)
        if flags:
            self.counts["flagged"] += 1
            # what Store.raise_flag writes: json.dumps(details) of marking, row, sheet and file
            details = f'{{"marking": {encode_basestring_ascii(text)}, "row": {number}, {self._where}}}'
            for kind, message, fp in flags:
                self._flags.append((bin_id, source_id, kind, message, details, fp, self.stamp))
        self._sources.append((source_id, self.import_id, self.sheet.sheet, number,
                              self.reader.raw_json(cells, self._extra), status, reasons, bin_id))
        return bin_id if existing is None else None

    def _update(self, old: _Existing, label: str, location: str | None, notes: str | None,
                minimum: int | None, date_code: str | None, text: str, marking: Marking,
                extra: list, quantity: int | None, package: str | None,
                mounting: str | None) -> bool:
        """Bring a stored bin in line with its edited row; True when anything changed."""
        changed = False
        new_label = label or None
        if (new_label, location, notes, minimum, date_code) != (
                old.label, old.location, old.notes, old.minimum, old.date_code):
            self.conn.execute(
                "UPDATE bins SET label = ?, location = ?, notes = ?, minimum = ?, date_code = ?,"
                " updated_at = ? WHERE id = ?",
                (new_label, location, notes, minimum, date_code, self.stamp, old.id))
            old.label, old.location, old.notes, old.minimum, old.date_code = (
                new_label, location, notes, minimum, date_code)
            changed = True
        if text != old.marking:
            shown = marking
            if old.settled_json:
                # A settled decision outlives re-imports: the flat columns follow it, the new
                # decoding is kept beside it in decoded_json.
                from stock.inventory.bins import part_marking
                shown = part_marking({"decoded_json": json.dumps(marking.to_json()),
                                      "settled_json": old.settled_json})
            columns = part_columns(shown)
            decoded = json.dumps(marking.to_json())
            if old.marking is None:
                self.conn.execute(_INSERT_PART, (old.id, text, *columns, package, mounting, decoded))
            else:
                self.conn.execute(_UPDATE_PART, (text, *columns, package, mounting, decoded, old.id))
            old.marking = text
            changed = True
        if quantity is not None and quantity != old.on_hand:
            self.store.set_count(old.id, quantity, "count", ref=f"import:{self.import_id}",
                                 note=f"count in {self.path.name}")
            old.on_hand = quantity
            self.counts["count_movements"] += 1
            changed = True
        return changed

    def _flush(self) -> None:
        conn = self.conn
        if self._bins:
            conn.executemany(_INSERT_BIN, self._bins)
            conn.executemany(_INSERT_PART, self._parts)
            self._bins.clear()
            self._parts.clear()
        if self._ledger:
            conn.executemany(_INSERT_LEDGER, self._ledger)
            self._ledger.clear()
        if self._sources:
            conn.executemany(_INSERT_SOURCE, self._sources)
            self._sources.clear()
        if self._flags:
            # Store.raise_flag's insert-or-ignore by fingerprint, many at once: a flag already
            # raised (open or settled) is neither duplicated nor reopened.
            before = conn.total_changes
            conn.executemany(_INSERT_FLAG, self._flags)
            self.counts["flags_raised"] += conn.total_changes - before
            self._flags.clear()


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


def _reasons_json(reasons: list[tuple[str, str]]) -> str:
    """The ``reasons_json`` of a source row: a list of {kind, message}."""
    if not reasons:
        return "[]"
    return json.dumps([{"kind": k, "message": m} for k, m in reasons], ensure_ascii=False)


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
        progress: called with the number of rows done so far, every few hundred rows.
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
    seen: dict[str, tuple[str | None, int]] = {}
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
            touched: list[int] = []
            skipped: list[Any] = []
            for raw_sheet in sheets:
                plan = _plan(store, path, raw_sheet, rules, force, keep_mapping, forget_mapping)
                if plan.skip is not None:
                    skipped.append(plan)
                    reports.append(SheetReport(str(path), raw_sheet.sheet, skipped=plan.skip))
                    continue
                report, bins = _import_sheet(store, path, sha, plan, seen, ids, progress, dry_run)
                reports.append(report)
                touched.extend(bins)
            if len(skipped) == len(sheets):
                from stock.inventory.sheet_plan import refuse_unreadable
                refuse_unreadable(path, skipped)
            if touched and not dry_run:
                from stock.inventory.stored_grades import refresh_stored_grades
                from stock.inventory.stock_checks import raise_stock_flags
                refresh_stored_grades(store, touched)
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


def _import_sheet(store: Store, path: Path, sha: str, plan: Any, seen: dict[str, tuple[str | None, int]],
                  ids: dict[str, int], progress: Callable[[int], None] | None,
                  dry_run: bool) -> tuple[SheetReport, list[int]]:
    """Store the rows of one planned sheet; its report and the bins it touched."""
    raw_sheet, header_map = plan.sheet, plan.header_map
    mapping = tuple(header_map.describe())
    notes = _sheet_notes(raw_sheet) + (("read as this store's own inventory export",)
                                       if plan.exported else ())
    before = store.one(
        "SELECT rows FROM imports WHERE sha256 = ? AND sheet IS ? ORDER BY id DESC LIMIT 1",
        (sha, raw_sheet.sheet))
    if before is not None:
        return SheetReport(str(path), raw_sheet.sheet, rows=before["rows"], unchanged=before["rows"],
                           same_file=True, mapping=mapping), []
    cur = store.db.conn.execute(
        "INSERT INTO imports (path, file_name, sha256, sheet, at, mapping_json)"
        " VALUES (?, ?, ?, ?, ?, ?)",
        (str(path.resolve()), path.name, sha, raw_sheet.sheet, now(),
         json.dumps(list(mapping), ensure_ascii=False)))
    intake = _SheetIntake(store, path, raw_sheet, header_map, cur.lastrowid, seen, ids, progress)
    if plan.exported:
        from stock.inventory.own_exports import ExportedFacts
        intake.exported = ExportedFacts([cell_text(h) for h in raw_sheet.headers])
    intake.run()
    if intake.settled:
        from stock.inventory.own_exports import settle_from_export
        settle_from_export(store, intake.settled, path.name, cur.lastrowid)
    if plan.keep:
        from stock.inventory.remembered_mappings import remember_mapping
        remember_mapping(store, [cell_text(h) for h in raw_sheet.headers], header_map)
        notes += ("mapping kept for these headers; the next import uses it (--forget-mapping drops it)",)
    c = intake.counts
    store.db.conn.execute(
        "UPDATE imports SET rows = ?, stored = ?, quarantined = ?, flagged = ?,"
        " unchanged = ? WHERE id = ?",
        (c["rows"], c["stored"], c["quarantined"], c["flagged"], c["unchanged"], cur.lastrowid))
    return SheetReport(str(path), raw_sheet.sheet, mapping=mapping, notes=notes,
                       import_id=None if dry_run else cur.lastrowid, **c), intake.touched


__all__ = ["BATCH", "MARKING_FIELDS", "MAX_COUNT", "QUARANTINE_FIXES", "READING_FIELDS",
           "ImportReport", "SheetReport", "bin_key", "cell_text", "decode_cached", "import_file",
           "normalise", "read_quantity"]
