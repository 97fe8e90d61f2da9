"""What an import writes, gathered per batch and written with ``executemany``; the bins a batch names.

:class:`Writer` holds one batch of new bins, their parts, ledger movements, source rows and flags,
and writes them in foreign-key order. :func:`stored_bins` answers, for one batch's bin keys in one
query, each stored bin's state and whether a row of the same file already gave it.
"""

from __future__ import annotations

import json
import sqlite3
from dataclasses import asdict, dataclass

from stock.decoded import Marking

_INSERT_BIN = ("INSERT INTO bins (id, bin_key, label, location, cabinet, notes, minimum, date_code,"
               " on_hand, created_at, updated_at) VALUES (?,?,?,?,?,?,?,?,?,?,?)")
_INSERT_PART = ("INSERT INTO bin_parts (bin_id, marking_id, settled_id, shown_id, package, mounting)"
                " VALUES (?,?,?,?,?,?)")
_INSERT_SOURCE = ("INSERT INTO source_rows (id, import_id, sheet, row_number, raw_json, status,"
                  " reasons_json, bin_id) VALUES (?,?,?,?,?,?,?,?)")
_INSERT_LEDGER = ("INSERT INTO ledger (bin_id, delta, kind, ref, note, actor, at)"
                  " VALUES (?, ?, 'import', ?, NULL, NULL, ?)")
_INSERT_FLAG = ("INSERT OR IGNORE INTO flags (bin_id, source_row_id, kind, message, details_json,"
                " fingerprint, status, opened_at) VALUES (?, ?, ?, ?, ?, ?, 'open', ?)")
_STORED_BINS = (
    "SELECT b.id, b.bin_key, b.on_hand, b.label, b.location, b.notes, b.minimum, b.date_code, d.text,"
    " (SELECT json_array(s.sheet, s.row_number) FROM source_rows s WHERE s.bin_id = b.id"
    "  AND s.import_id IN (SELECT value FROM json_each(?2)) ORDER BY s.id LIMIT 1)"
    " FROM bins b LEFT JOIN bin_parts p ON p.bin_id = b.id LEFT JOIN markings d ON d.id = p.marking_id"
    " WHERE b.bin_key IN (SELECT value FROM json_each(?1))")


@dataclass
class Counts:
    """What one sheet did to the store (the numbers of its report)."""

    rows: int = 0
    stored: int = 0
    quarantined: int = 0
    flagged: int = 0
    unchanged: int = 0
    new_bins: int = 0
    updated_bins: int = 0
    count_movements: int = 0
    flags_raised: int = 0

    def as_dict(self) -> dict[str, int]:
        return asdict(self)


@dataclass
class BinState:
    """A stored bin as a row of this import sees it (kept in step as the row changes it)."""

    id: int
    on_hand: int | None
    label: str | None
    location: str | None
    notes: str | None
    minimum: int | None
    date_code: str | None
    marking: str | None
    first_row: tuple[str | None, int] | None   # (sheet, row) of this file that gave it, if any


def stored_bins(conn: sqlite3.Connection, keys: set[str], file_imports: list[int]) -> dict[str, BinState]:
    """The stored bins among ``keys``, each with the first row of this file that gave it."""
    if not keys:
        return {}
    out = {}
    for (bin_id, key, on_hand, label, location, notes, minimum, date_code, text,
         first) in conn.execute(_STORED_BINS, (json.dumps(sorted(keys)), json.dumps(file_imports))):
        out[key] = BinState(bin_id, on_hand, label, location, notes, minimum, date_code, text,
                            tuple(json.loads(first)) if first else None)
    return out


class Writer:
    """One batch of rows to write; ``ids`` (next ids of bins and source rows) lasts the file."""

    def __init__(self, conn: sqlite3.Connection, ids: dict[str, int], counts: Counts):
        self.conn = conn
        self.ids = ids
        self.counts = counts
        self._bins: list[tuple] = []
        self._parts: list[tuple] = []
        self._ledger: list[tuple] = []
        self._sources: list[tuple] = []
        self._flags: list[tuple] = []

    def next_bin_id(self) -> int:
        self.ids["bins"] += 1
        return self.ids["bins"]

    def next_source_id(self) -> int:
        self.ids["source_rows"] += 1
        return self.ids["source_rows"]

    def bin(self, row: tuple) -> None:
        self._bins.append(row)

    def part(self, row: tuple) -> None:
        self._parts.append(row)

    def movement(self, row: tuple) -> None:
        self._ledger.append(row)

    def flag(self, row: tuple) -> None:
        self._flags.append(row)

    def source(self, import_id: int, sheet: str | None, number: int, cells_json: str, status: str,
               reasons: str, bin_id: int | None, *, source_id: int | None = None) -> None:
        self._sources.append((source_id or self.next_source_id(), import_id, sheet, number,
                              cells_json, status, reasons, bin_id))

    def flush(self) -> None:
        conn = self.conn
        for sql, rows in ((_INSERT_BIN, self._bins), (_INSERT_PART, self._parts),
                          (_INSERT_LEDGER, self._ledger), (_INSERT_SOURCE, self._sources)):
            if rows:
                conn.executemany(sql, rows)
                rows.clear()
        if self._flags:
            # Store.raise_flag's insert-or-ignore by fingerprint, many at once: a flag already
            # raised (open or settled) is neither duplicated nor reopened.
            before = conn.total_changes
            conn.executemany(_INSERT_FLAG, self._flags)
            self.counts.flags_raised += conn.total_changes - before
            self._flags.clear()


def reasons_json(reasons: list[tuple[str, str]]) -> str:
    """The ``reasons_json`` of a source row: a list of {kind, message}."""
    if not reasons:
        return "[]"
    return json.dumps([{"kind": k, "message": m} for k, m in reasons], ensure_ascii=False)


class FlagForms:
    """A row's flags as (kind, message, fingerprint) and their reasons JSON; a marking's own flags
    are worked out once per marking text."""

    REMEMBERED = 65536

    def __init__(self) -> None:
        self._own: dict[str, tuple[Marking, tuple[tuple[str, str, str], ...], str]] = {}

    def _marking_flags(self, text: str, m: Marking) -> tuple[tuple[tuple[str, str, str], ...], str]:
        """(kind, message, fingerprint suffix after the bin key) of each flag, and reasons JSON."""
        found = self._own.get(text)
        if found is None or found[0] is not m:
            seen: dict[str, int] = {}
            out = []
            for f in m.flags:
                n = seen.get(f.kind, 0)
                seen[f.kind] = n + 1
                out.append((f.kind, f.message, f"|{f.kind}|{text}" + (f"|{n}" if n else "")))
            found = (m, tuple(out), reasons_json([(k, msg) for k, msg, _ in out]))
            if len(self._own) >= self.REMEMBERED:
                self._own.clear()
            self._own[text] = found
        return found[1], found[2]

    def rows(self, key: str, text: str, marking: Marking, extra: list[tuple[str, str, str]],
             quantity: int | None) -> tuple[list[tuple[str, str, str]], str]:
        """The flags of a row whose bin is ``key`` and whose known count is ``quantity``."""
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
        return out, reasons or reasons_json([(k, m) for k, m, _ in out])


__all__ = ["BinState", "Counts", "FlagForms", "Writer", "reasons_json", "stored_bins"]
