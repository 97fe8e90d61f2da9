"""Settling a bin: the decision a person makes about a flagged bin, recorded without losing anything.

The tool cannot measure a part; the person at the bench can. Every flag names its bin, the
readings the decoder considered and the one look or measurement that would settle it.
:func:`settle` records the answer without losing anything: ``parts.marking`` and
``parts.decoded_json`` keep what the sheet said, ``parts.settled_json`` holds the reading the
human chose (the flat part columns follow it), the ledger keeps who decided what and when (a
``settle`` movement of zero parts with a JSON note), and the flag closes for good. A closed flag
never returns on re-import, because :meth:`~stock.store.database.Store.raise_flag` ignores a fingerprint
it has seen. :func:`reopen` undoes a decision, again with a ledger note.

Readings (numbered 0 for the decoder's choice, 1…n for its alternatives) are
:mod:`stock.inventory.readings`; the flags listed with them, :mod:`stock.inventory.flag_list`.

Flags raised by looking at the stock live in :mod:`stock.inventory.stock_checks` (unknown quantity, below
minimum, shelf life) and :mod:`stock.inventory.duplicates` (the same part in several bins, and merging).

What each flag kind means and what settles it is the table in :mod:`stock.store.flag_kinds`.
"""

from __future__ import annotations

import json
from dataclasses import dataclass, field, replace
from decimal import Decimal
from typing import Any

from stock.decoded import Marking
from stock.errors import BadValue, NotFound, Refused
from stock.inventory.readings import current_marking, decided, part_columns, pick_reading, reading_summary
from stock.inventory.stored_grades import refresh_stored_grades
from stock.markings.decoder import decode
from stock.markings.typed_values import parse_capacitance
from stock.store.database import Store
from stock.store.flag_kinds import flag_kind
from stock.store.flag_records import ledger_note, close_flags, who


def _refresh_grades(store: Store, bin_ids: list[int]) -> None:
    refresh_stored_grades(store, bin_ids)


@dataclass(frozen=True)
class Settlement:
    """What :func:`settle` or :func:`reopen` did."""

    bin_key: str
    decision: str
    closed: tuple[int, ...]
    reopened: tuple[int, ...] = ()
    old: dict[str, Any] | None = None
    new: dict[str, Any] | None = None
    ledger_id: int | None = None
    warnings: tuple[str, ...] = field(default_factory=tuple)

    def to_json(self) -> dict[str, Any]:
        return {"bin": self.bin_key, "decision": self.decision, "closed": list(self.closed),
                "reopened": list(self.reopened), "old": self.old, "new": self.new,
                "ledger_id": self.ledger_id, "warnings": list(self.warnings)}


def _open_flags_for(store: Store, bin_id: int) -> list[dict[str, Any]]:
    return store.rows(
        "SELECT id, kind, details_json FROM flags WHERE status = 'open' AND (bin_id = ?"
        " OR (kind = 'duplicate' AND EXISTS (SELECT 1 FROM json_each(details_json, '$.bin_ids')"
        " WHERE value = ?))) ORDER BY id", (bin_id, bin_id))


def settle(store: Store, bin_ref: str, *, reading: int | None = None, value: str | Decimal | None = None,
           marking: str | None = None, count: int | None = None, note: str | None = None,
           flag_id: int | None = None, by: str | None = None) -> Settlement:
    """Record a person's decision about a bin, re-decode with it, and close the flags it settles.

    Give at most one of ``reading`` (a number from :func:`~stock.inventory.readings.readings`),
    ``value`` (a capacitance, any syntax the decoder reads) or ``marking`` (the marking as it
    really reads). ``count`` settles an unknown quantity with a count movement. With none of
    these, a ``note`` settles the flags a note settles (duplicate, below-minimum, shelf-life,
    unknown kinds). ``flag_id`` narrows the decision to one flag.

    Raises:
        NotFound: no such bin, or no such open flag on it.
        BadValue: an unreadable value or reading number, or two decisions at once.
        Refused: nothing to settle, or a flag that needs a decision the call did not give.
    """
    given = [name for name, v in (("--reading", reading), ("--value", value), ("--marking", marking))
             if v is not None]
    if len(given) > 1:
        raise BadValue(" and ".join(given), "both", "one of --reading, --value or --marking")
    if count is not None and count < 0:
        raise BadValue("--count", str(count), "a whole number of parts, 0 or more")
    actor = who(by)
    bin_row = store.find_bin(bin_ref)
    bin_id, key = bin_row["id"], bin_row["bin_key"]
    part = store.one("SELECT * FROM parts WHERE bin_id = ?", (bin_id,))
    if given and part is None:
        raise Refused(f"settle the reading of bin {key}", "it holds no decoded part")
    targets = _flags_to_settle(store, bin_id, key, flag_id, bool(given), count)

    decision: dict[str, Any] = {"via": "settle", "bin_id": bin_id, "by": actor, "note": note}
    old = new = None
    warnings: list[str] = []
    chosen: Marking | None = None
    if given:
        before = current_marking(part)
        chosen, decision["decision"] = _chosen_reading(part, key, before, reading, value, marking, warnings)
        old, new = reading_summary(before), reading_summary(chosen)
        decision["old"], decision["new"] = old, new
    else:
        decision["decision"] = f"count {count}" if count is not None else "note"
    ids = [f["id"] for f in targets]
    decision["flags"] = ids
    with store.writing():
        ledger_id = _record(store, bin_row, chosen, count, ids, decision, actor)
    return Settlement(key, decision["decision"], tuple(ids), old=old, new=new,
                      ledger_id=ledger_id, warnings=tuple(warnings))


def _flags_to_settle(store: Store, bin_id: int, key: str, flag_id: int | None, reading_given: bool,
                     count: int | None) -> list[dict[str, Any]]:
    """The open flags a decision of this kind settles; refuses a decision that settles nothing."""
    open_flags = _open_flags_for(store, bin_id)
    if flag_id is not None:
        open_flags = [f for f in open_flags if f["id"] == flag_id]
        if not open_flags:
            raise NotFound(f"open flag on bin {key} numbered", str(flag_id),
                           f"a flag id listed by `stock flags` for bin {key}")
    wanted: set[str] = set()
    if reading_given:
        wanted.add("reading")
    if count is not None:
        wanted.add("count")
    if not reading_given and count is None:
        wanted.add("note")
    targets = [f for f in open_flags if flag_kind(f["kind"]).settled_by in wanted]
    if flag_id is not None and not targets:
        need = flag_kind(open_flags[0]["kind"]).settled_by
        words = {"reading": "a reading: --reading N (0 keeps the decoder's), --value or --marking",
                 "count": "a count: --count N", "note": "a --note (or a merge)"}
        raise Refused(f"settle flag {flag_id} ({open_flags[0]['kind']})", f"it is settled by {words[need]}")
    if not targets and not reading_given and count is None:
        pending = ", ".join(f"{f['id']} {f['kind']}" for f in open_flags) or "none"
        raise Refused(f"settle bin {key}", "nothing to settle with a note alone"
                      f" (open flags: {pending}); give --reading, --value, --marking or --count")
    if "note" in wanted and flag_id is None and len({f["kind"] for f in targets}) > 1:
        # One note rarely answers two different questions (a reorder says nothing of polarity).
        pending = ", ".join(f"{f['id']} {f['kind']}" for f in targets)
        raise Refused(f"settle bin {key} with one note", f"it has several open flags ({pending});"
                      " give --flag ID for each")
    return targets


def _chosen_reading(part: dict[str, Any], key: str, before: Marking, reading: int | None,
                    value: str | Decimal | None, marking: str | None,
                    warnings: list[str]) -> tuple[Marking, str]:
    """The reading a person chose (by number, by value or by the marking as it really reads)."""
    if reading is not None:
        decoded = Marking.from_json(json.loads(part["decoded_json"]))
        if reading == 0 and decoded.capacitance_pf is None:
            raise Refused(f"keep the decoder's reading of bin {key}",
                          "it found no value; give --value or --marking")
        return pick_reading(decoded, reading), f"reading {reading}"
    if value is not None:
        pf = value if isinstance(value, Decimal) else _parse_value(str(value))
        return decided(replace(before, capacitance_pf=pf)), f"value {value}"
    chosen = decode(str(marking))
    if chosen.alternatives or any(flag_kind(f.kind).settled_by == "reading" for f in chosen.flags):
        warnings.append(f"the marking {marking!r} still has doubts"
                        f" ({', '.join(sorted(chosen.flag_kinds())) or 'alternatives'});"
                        " recorded as given")
    if chosen.capacitance_pf is None:
        raise Refused(f"settle bin {key} with the marking {marking!r}",
                      "no value can be read from it; give --value")
    return chosen, f"marking {marking}"


def _record(store: Store, bin_row: dict[str, Any], chosen: Marking | None, count: int | None,
            ids: list[int], decision: dict[str, Any], actor: str) -> int | None:
    """Write the decision inside the caller's transaction: part columns, count, ledger, flags."""
    bin_id = bin_row["id"]
    ledger_id = None
    if chosen is not None:
        cols = part_columns(chosen)
        sets = ", ".join(f'"{c}" = ?' for c in cols)
        store.db.conn.execute(f"UPDATE parts SET {sets}, settled_json = ? WHERE bin_id = ?",
                              (*cols.values(), json.dumps(chosen.to_json(), ensure_ascii=False), bin_id))
    counted = False
    if count is not None:
        was_unknown = bin_row["on_hand"] is None
        delta = store.set_count(bin_id, count, "count", ref="settle",
                                note=json.dumps(decision, default=str, ensure_ascii=False))
        counted = bool(delta) or was_unknown
        if counted:
            ledger_id = store.one("SELECT MAX(id) AS id FROM ledger WHERE bin_id = ?",
                                  (bin_id,))["id"]
    if chosen is not None or not counted:
        ledger_id = ledger_note(store, bin_id, "settle", ref="flags:" + ",".join(map(str, ids)),
                                note=decision, actor=actor)
    decision["ledger_id"] = ledger_id
    close_flags(store, ids, decision)
    if chosen is not None:
        _refresh_grades(store, [bin_id])
    return ledger_id


def _parse_value(text: str) -> Decimal:
    return parse_capacitance(text, what="--value")


def reopen(store: Store, bin_ref: str, *, note: str | None = None, by: str | None = None) -> Settlement:
    """Undo the decisions on a bin: drop the settled reading and reopen the flags settled on it.

    Flags closed by a merge or by a stock check (no longer true) stay closed.

    Raises:
        NotFound: no such bin.
        Refused: nothing on the bin was settled.
    """
    actor = who(by)
    bin_row = store.find_bin(bin_ref)
    bin_id, key = bin_row["id"], bin_row["bin_key"]
    part = store.one("SELECT * FROM parts WHERE bin_id = ?", (bin_id,))
    settled = store.rows(
        "SELECT id FROM flags WHERE status = 'settled' AND json_extract(decision_json, '$.via') = 'settle'"
        " AND json_extract(decision_json, '$.bin_id') = ? ORDER BY id", (bin_id,))
    if (part is None or part["settled_json"] is None) and not settled:
        raise Refused(f"reopen bin {key}", "nothing on it was settled")
    ids = [f["id"] for f in settled]
    record: dict[str, Any] = {"via": "reopen", "by": actor, "note": note, "flags": ids}
    old = new = None
    if part is not None and part["settled_json"] is not None:
        original = Marking.from_json(json.loads(part["decoded_json"]))
        old, new = reading_summary(current_marking(part)), reading_summary(original)
        record["old"], record["new"] = old, new
    with store.writing():
        if old is not None:
            cols = part_columns(Marking.from_json(json.loads(part["decoded_json"])))
            sets = ", ".join(f'"{c}" = ?' for c in cols)
            store.db.conn.execute(f"UPDATE parts SET {sets}, settled_json = NULL WHERE bin_id = ?",
                                  (*cols.values(), bin_id))
        for fid in ids:
            store.db.conn.execute(
                "UPDATE flags SET status = 'open', closed_at = NULL, decision_json = NULL WHERE id = ?",
                (fid,))
        ledger_id = ledger_note(store, bin_id, "settle", ref="reopen", note=record, actor=actor)
        if old is not None:
            _refresh_grades(store, [bin_id])
    return Settlement(key, "reopen", (), reopened=tuple(ids), old=old, new=new, ledger_id=ledger_id)


__all__ = ["Settlement", "reopen", "settle"]
