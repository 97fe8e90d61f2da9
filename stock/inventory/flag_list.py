"""Bins that need a human: each flag as a person reads it, with its readings and what settles it.

What each flag kind means and what settles it is the table in :mod:`stock.store.flag_kinds`;
:mod:`stock.inventory.settling` records the decision.
"""

from __future__ import annotations

import json
from collections.abc import Mapping
from dataclasses import dataclass
from datetime import date
from decimal import Decimal
from typing import Any

from stock.decoded import Marking
from stock.errors import BadValue
from stock.inventory.duplicates import raise_duplicate_flags
from stock.inventory.readings import Reading, readings
from stock.inventory.stock_checks import raise_stock_flags
from stock.store.database import Store
from stock.store.flag_kinds import FlagKind, SettledBy, flag_kind
from stock.units import format_capacitance


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
        raise_stock_flags(store, today=today)
        raise_duplicate_flags(store)
    sql = _FLAG_QUERY + " WHERE f.status = ?"
    params: list[Any] = [status]
    if kind:
        sql += " AND f.kind = ?"
        params.append(kind)
    sql += " ORDER BY b.bin_key IS NULL, b.bin_key, f.id"
    return [_view(r) for r in store.rows(sql, params)]


__all__ = ["FlagView", "list_flags"]
