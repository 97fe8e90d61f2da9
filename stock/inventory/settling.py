"""Bins that need a human: each open flag with its readings, and the decision that settles it.

The tool cannot measure a part; the person at the bench can. Every flag names its bin, the
readings the decoder considered and the one look or measurement that would settle it.
:func:`settle` records the answer without losing anything: ``parts.marking`` and
``parts.decoded_json`` keep what the sheet said, ``parts.settled_json`` holds the reading the
human chose (the flat part columns follow it), the ledger keeps who decided what and when (a
``settle`` movement of zero parts with a JSON note), and the flag closes for good. A closed flag
never returns on re-import, because :meth:`~stock.store.Store.raise_flag` ignores a fingerprint
it has seen. :func:`reopen` undoes a decision, again with a ledger note.

Readings are numbered: 0 is the decoder's own choice, 1…n its alternatives in order.

Flags raised by looking at the stock live in :mod:`stock.stock_checks` (unknown quantity, below
minimum, shelf life) and :mod:`stock.duplicates` (the same part in several bins, and merging).

What each flag kind means and what settles it is the table in :mod:`stock.flag_kinds`.
"""

from __future__ import annotations

import json
import os
from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field, replace
from datetime import date
from decimal import Decimal
from typing import Any

from stock.decoded import Marking, Tolerance
from stock.errors import BadValue, NotFound, Refused
from stock.store.flag_kinds import FlagKind, SettledBy, flag_kind
from stock.store.database import Store, now


@dataclass(frozen=True)
class Reading:
    """One reading of a marking: number 0 is the decoder's choice, 1…n its alternatives."""

    number: int
    capacitance_pf: Decimal | None
    tolerance: Tolerance | None
    voltage_v: Decimal | None
    dielectric_code: str | None
    reason: str

    def describe(self) -> str:
        """The reading in engineering units, e.g. ``"47 pF ±10 %"``; "no value" when none."""
        from stock.units import format_capacitance, format_tolerance, format_voltage

        words = [format_capacitance(self.capacitance_pf) if self.capacitance_pf is not None
                 else "no value"]
        if self.tolerance is not None:
            words.append(format_tolerance(self.tolerance))
        if self.voltage_v is not None:
            words.append(format_voltage(self.voltage_v, "DC"))
        if self.dielectric_code:
            words.append(self.dielectric_code)
        return " ".join(words)

    def to_json(self) -> dict[str, Any]:
        return {
            "number": self.number,
            "capacitance_pf": None if self.capacitance_pf is None else float(self.capacitance_pf),
            "tolerance": self.tolerance.to_json() if self.tolerance else None,
            "voltage_v": None if self.voltage_v is None else float(self.voltage_v),
            "dielectric": self.dielectric_code,
            "reason": self.reason,
            "text": self.describe(),
        }


def readings(marking: Marking) -> tuple[Reading, ...]:
    """The decoder's reading (number 0) and each alternative, filled in from the chosen reading
    where the alternative leaves a fact out."""
    found = [Reading(0, marking.capacitance_pf, marking.tolerance, marking.voltage_v,
                     marking.dielectric.code if marking.dielectric else None,
                     "the decoder's reading")]
    for n, alt in enumerate(marking.alternatives, start=1):
        picked = pick_reading(marking, n)
        found.append(Reading(n, picked.capacitance_pf, picked.tolerance, picked.voltage_v,
                             picked.dielectric.code if picked.dielectric else None, alt.reason))
    return tuple(found)


def pick_reading(marking: Marking, number: int) -> Marking:
    """The marking as it reads with alternative ``number`` chosen (0 keeps the decoder's choice).

    The alternative's facts replace the chosen ones; facts it leaves out stay as decoded. The
    result has no alternatives left and loses the flags a reading decision settles.

    Raises:
        BadValue: no such reading.
    """
    if not 0 <= number <= len(marking.alternatives):
        choices = "0" if not marking.alternatives else f"0 to {len(marking.alternatives)}"
        raise BadValue("--reading", str(number), f"a reading number {choices} as listed by `stock flags`")
    chosen = marking
    if number:
        alt = marking.alternatives[number - 1]
        chosen = replace(
            marking,
            capacitance_pf=alt.capacitance_pf if alt.capacitance_pf is not None else marking.capacitance_pf,
            tolerance=alt.tolerance or marking.tolerance,
            voltage_v=alt.voltage_v if alt.voltage_v is not None else marking.voltage_v,
            dielectric=alt.dielectric or marking.dielectric)
    return _decided(chosen)


def _decided(marking: Marking) -> Marking:
    keep = tuple(f for f in marking.flags if flag_kind(f.kind).settled_by != "reading")
    return replace(marking, alternatives=(), flags=keep)


def current_marking(part: Mapping[str, Any]) -> Marking:
    """The reading in force for a ``parts`` row: the settled one if a human chose, else the decoder's."""
    from stock.inventory.bins import part_marking

    return part_marking(dict(part))


def part_columns(marking: Marking) -> dict[str, Any]:
    """The flat ``parts`` columns that follow a marking, by name: the same values import writes
    (:func:`stock.row_reading.part_columns`), so search sees a settled reading as it sees an
    imported one."""
    from stock.inventory.row_reading import PART_COLUMNS, part_columns as columns_in_order

    return dict(zip(PART_COLUMNS, columns_in_order(marking)))


def reading_summary(marking: Marking) -> dict[str, Any]:
    """A short JSON record of a reading, as the ledger keeps it."""
    data = marking.to_json()
    return {"text": data["text"], "capacitance_pf": data["capacitance_pf"],
            "tolerance": data["tolerance"], "voltage_v": data["voltage_v"],
            "dielectric": marking.dielectric.code if marking.dielectric else None,
            "safety_class": data["safety_class"]}


def describe_summary(summary: Mapping[str, Any]) -> str:
    """A :func:`reading_summary` in engineering units, e.g. ``"47 nF ±10 % 50 V DC X7R"``."""
    def dec(v: Any) -> Decimal | None:
        return None if v is None else Decimal(str(v))

    return Reading(0, dec(summary.get("capacitance_pf")), Tolerance.from_json(summary.get("tolerance")),
                   dec(summary.get("voltage_v")), summary.get("dielectric"), "").describe()


@dataclass(frozen=True)
class FlagView:
    """One flag as a person reads it: where, what, the readings and what would settle it."""

    id: int
    kind: str
    status: str
    message: str
    meaning: str
    hint: str
    bin_id: int | None
    bin_key: str | None
    location: str | None
    label: str | None
    marking: str | None
    readings: tuple[Reading, ...]
    details: dict[str, Any]
    opened_at: str
    settled_by: SettledBy
    decision: dict[str, Any] | None = None

    def to_json(self) -> dict[str, Any]:
        return {
            "id": self.id, "kind": self.kind, "status": self.status, "message": self.message,
            "meaning": self.meaning, "settle": self.hint, "settled_by": self.settled_by,
            "bin": self.bin_key, "bin_id": self.bin_id, "location": self.location,
            "label": self.label, "marking": self.marking,
            "readings": [r.to_json() for r in self.readings],
            "details": self.details, "opened_at": self.opened_at, "decision": self.decision,
        }


class _Blank(dict):
    def __missing__(self, key: str) -> str:
        return "?"


def _or_list(items: list[str]) -> str:
    unique = list(dict.fromkeys(items))
    return unique[0] if len(unique) == 1 else ", ".join(unique[:-1]) + " or " + unique[-1]


def _hint(kind: FlagKind, row: Mapping[str, Any], found: tuple[Reading, ...],
          marking: Marking | None, details: Mapping[str, Any]) -> str:
    label = details.get("label") or row.get("label")
    if details.get("label_pf") is not None:
        from stock.units import format_capacitance
        label = format_capacitance(Decimal(str(details["label_pf"])))
    claims = [r.reason + (f" ({r.describe()})" if r.capacitance_pf is not None else "")
              for r in found[1:] if " says " in r.reason]
    fields = _Blank(
        claims="; ".join(claims) or f"the label says {label or '?'}",
        choices=_or_list([r.describe() for r in found]) if found else "what value is it",
        marking=(marking.text if marking else row.get("marking")) or "?",
        label=label or "?",
        value=found[0].describe() if found else "?",
        unparsed=", ".join(repr(u) for u in marking.unparsed) if marking and marking.unparsed else "the rest",
        bins=", ".join(details.get("bins", [])) or (row.get("bin_key") or "?"),
        bin=row.get("bin_key") or "BIN",
        id=row.get("id", "ID"),
        on_hand=row.get("on_hand") if row.get("on_hand") is not None else "?",
        minimum=row.get("minimum") if row.get("minimum") is not None else "?",
        date_code=details.get("date_code") or row.get("date_code") or "?",
        age=details.get("age") or "age unknown",
    )
    return kind.settle.format_map(fields)


_FLAG_QUERY = """
SELECT f.id, f.kind, f.status, f.message, f.details_json, f.opened_at, f.decision_json, f.bin_id,
       b.bin_key, b.location, b.label, b.on_hand, b.minimum, b.date_code,
       p.marking, p.decoded_json, p.settled_json
FROM flags f LEFT JOIN bins b ON b.id = f.bin_id LEFT JOIN parts p ON p.bin_id = f.bin_id
"""


def _view(row: Mapping[str, Any]) -> FlagView:
    kind = flag_kind(row["kind"])
    details = json.loads(row["details_json"] or "{}")
    marking = Marking.from_json(json.loads(row["decoded_json"])) if row.get("decoded_json") else None
    found = readings(marking) if marking is not None and kind.settled_by == "reading" else ()
    return FlagView(
        id=row["id"], kind=row["kind"], status=row["status"], message=row["message"],
        meaning=kind.meaning, hint=_hint(kind, row, found, marking, details),
        bin_id=row["bin_id"], bin_key=row["bin_key"], location=row["location"],
        label=row["label"], marking=row["marking"], readings=found, details=details,
        opened_at=row["opened_at"], settled_by=kind.settled_by,
        decision=json.loads(row["decision_json"]) if row.get("decision_json") else None)


def list_flags(store: Store, *, kind: str | None = None, status: str = "open",
               check: bool = False, today: date | None = None) -> list[FlagView]:
    """Every flag with the given status (open by default), by bin, then by age.

    Args:
        kind: only flags of this kind.
        status: ``"open"`` or ``"settled"``.
        check: run the stock and duplicate checks first, so their flags are current.
        today: the date the shelf-life rule counts from (tests pin it).
    """
    if status not in ("open", "settled"):
        raise BadValue("--status", status, "open or settled")
    if check:
        from stock.inventory.duplicates import raise_duplicate_flags
        from stock.inventory.stock_checks import raise_stock_flags

        raise_stock_flags(store, today=today)
        raise_duplicate_flags(store)
    sql = _FLAG_QUERY + " WHERE f.status = ?"
    params: list[Any] = [status]
    if kind:
        sql += " AND f.kind = ?"
        params.append(kind)
    sql += " ORDER BY b.bin_key IS NULL, b.bin_key, f.id"
    return [_view(r) for r in store.rows(sql, params)]


def who(by: str | None = None) -> str:
    """The person deciding: ``--by``, else the login name, else "unknown"."""
    return by or os.environ.get("USER") or os.environ.get("USERNAME") or "unknown"


def ledger_note(store: Store, bin_id: int, kind: str, ref: str, note: dict[str, Any],
                actor: str) -> int:
    """A movement of zero parts that records a decision; returns its ledger id.

    Written directly rather than through :meth:`Store.move`, which would turn an unknown
    quantity (NULL) into 0: a decision about a marking says nothing about how many there are.
    """
    cur = store.db.conn.execute(
        "INSERT INTO ledger (bin_id, delta, kind, ref, note, actor, at) VALUES (?, 0, ?, ?, ?, ?, ?)",
        (bin_id, kind, ref, json.dumps(note, default=str, ensure_ascii=False), actor, now()))
    return int(cur.lastrowid)


def close_flags(store: Store, flag_ids: Iterable[int], decision: dict[str, Any]) -> None:
    """Mark flags settled with the decision that settled them (inside a write transaction)."""
    stamp = now()
    text = json.dumps(decision, default=str, ensure_ascii=False)
    for fid in flag_ids:
        store.db.conn.execute(
            "UPDATE flags SET status = 'settled', closed_at = ?, decision_json = ? WHERE id = ?",
            (stamp, text, fid))


def _refresh_grades(store: Store, bin_ids: list[int]) -> None:
    from stock.inventory.stored_grades import refresh_stored_grades

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

    Give at most one of ``reading`` (a number from :func:`readings`), ``value`` (a capacitance,
    any syntax the decoder reads) or ``marking`` (the marking as it really reads). ``count``
    settles an unknown quantity with a count movement. With none of these, a ``note`` settles
    the flags a note settles (duplicate, below-minimum, shelf-life, unknown kinds). ``flag_id``
    narrows the decision to one flag.

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

    open_flags = _open_flags_for(store, bin_id)
    if flag_id is not None:
        open_flags = [f for f in open_flags if f["id"] == flag_id]
        if not open_flags:
            raise NotFound(f"open flag on bin {key} numbered", str(flag_id),
                           f"a flag id listed by `stock flags` for bin {key}")
    wanted: set[str] = set()
    if given:
        wanted.add("reading")
    if count is not None:
        wanted.add("count")
    if not given and count is None:
        wanted.add("note")
    targets = [f for f in open_flags if flag_kind(f["kind"]).settled_by in wanted]
    if flag_id is not None and not targets:
        need = flag_kind(open_flags[0]["kind"]).settled_by
        words = {"reading": "a reading: --reading N (0 keeps the decoder's), --value or --marking",
                 "count": "a count: --count N", "note": "a --note (or a merge)"}
        raise Refused(f"settle flag {flag_id} ({open_flags[0]['kind']})", f"it is settled by {words[need]}")
    if not targets and not given and count is None:
        pending = ", ".join(f"{f['id']} {f['kind']}" for f in open_flags) or "none"
        raise Refused(f"settle bin {key}", "nothing to settle with a note alone"
                      f" (open flags: {pending}); give --reading, --value, --marking or --count")
    if "note" in wanted and flag_id is None and len({f["kind"] for f in targets}) > 1:
        # One note rarely answers two different questions (a reorder says nothing of polarity).
        pending = ", ".join(f"{f['id']} {f['kind']}" for f in targets)
        raise Refused(f"settle bin {key} with one note", f"it has several open flags ({pending});"
                      " give --flag ID for each")

    decision: dict[str, Any] = {"via": "settle", "bin_id": bin_id, "by": actor, "note": note}
    old = new = None
    warnings: list[str] = []
    chosen: Marking | None = None
    if given:
        decoded = Marking.from_json(json.loads(part["decoded_json"]))
        before = current_marking(part)
        if reading is not None:
            if reading == 0 and decoded.capacitance_pf is None:
                raise Refused(f"keep the decoder's reading of bin {key}",
                              "it found no value; give --value or --marking")
            chosen = pick_reading(decoded, reading)
            decision["decision"] = f"reading {reading}"
        elif value is not None:
            pf = value if isinstance(value, Decimal) else _parse_value(str(value))
            chosen = _decided(replace(before, capacitance_pf=pf))
            decision["decision"] = f"value {value}"
        else:
            from stock.markings.decoder import decode

            chosen = decode(str(marking))
            if chosen.alternatives or any(flag_kind(f.kind).settled_by == "reading" for f in chosen.flags):
                warnings.append(f"the marking {marking!r} still has doubts"
                                f" ({', '.join(sorted(chosen.flag_kinds())) or 'alternatives'});"
                                " recorded as given")
            if chosen.capacitance_pf is None:
                raise Refused(f"settle bin {key} with the marking {marking!r}",
                              "no value can be read from it; give --value")
            decision["decision"] = f"marking {marking}"
        old, new = reading_summary(before), reading_summary(chosen)
        decision["old"], decision["new"] = old, new
    elif count is not None:
        decision["decision"] = f"count {count}"
    else:
        decision["decision"] = "note"

    ids = [f["id"] for f in targets]
    decision["flags"] = ids
    with store.writing():
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
    return Settlement(key, decision["decision"], tuple(ids), old=old, new=new,
                      ledger_id=ledger_id, warnings=tuple(warnings))


def _parse_value(text: str) -> Decimal:
    from stock.units import parse_capacitance

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


__all__ = [
    "FlagView", "Reading", "Settlement", "close_flags",
    "current_marking", "describe_summary", "ledger_note", "list_flags", "part_columns", "pick_reading",
    "readings", "reading_summary", "reopen", "settle", "who",
]
