"""What the store holds, bin by bin: the listing, one bin in full, and the rows not stored.

These are read-only queries over the tables :mod:`stock.intake` fills. :func:`part_marking` is
the one way to get a stored part's decoded marking: a settled decision (``parts.settled_json``)
wins over the import's decoding (``parts.decoded_json``), so grading, search and flags all see
the reading a person confirmed.
"""

from __future__ import annotations

import json
import re
from collections.abc import Iterable
from decimal import Decimal
from functools import lru_cache
from typing import Any

from stock.decoded import Marking, Tolerance
from stock.store.flag_kinds import QUARANTINE_FIXES
from stock.store.database import Store


def part_marking(row: dict[str, Any]) -> Marking:
    """The marking of a stored part: the settled reading if there is one, else the decoded one.

    ``row`` is a ``parts`` row (at least ``decoded_json`` and ``settled_json``). A settled JSON
    may be a marking's JSON itself or an object holding it under ``"marking"``.

    >>> m = part_marking({"decoded_json": '{"text": "104", "capacitance_pf": 100000.0}',
    ...                   "settled_json": None})
    >>> m.text, m.capacitance_pf
    ('104', Decimal('100000.0'))
    """
    return stored_marking(row["decoded_json"], row.get("settled_json"))


def stored_marking(decoded_json: str, settled_json: str | None) -> Marking:
    """:func:`part_marking` from the two JSON columns themselves (for callers reading plain tuples).

    >>> stored_marking('{"text": "104"}', '{"marking": {"text": "474"}}').text
    '474'
    """
    if settled_json:
        found = _settled_marking(settled_json)
        if found is not None:
            return found
    return _marking_from_text(decoded_json)


@lru_cache(maxsize=16384)
def _marking_from_text(text: str) -> Marking:
    """Markings repeat across bins: parse each stored JSON text once (Markings are frozen)."""
    return Marking.from_json(json.loads(text))


@lru_cache(maxsize=4096)
def _settled_marking(text: str) -> Marking | None:
    data = json.loads(text)
    if isinstance(data, dict) and isinstance(data.get("marking"), dict):
        data = data["marking"]
    if isinstance(data, dict) and "text" in data:
        return Marking.from_json(data)
    return None


def natural_key(text: str | None) -> tuple[Any, ...]:
    """A sort key that orders the digits inside a name as numbers; missing names sort last.

    >>> sorted(["A10", "B1", "A2", "a3", None], key=natural_key)
    ['A2', 'a3', 'A10', 'B1', None]
    """
    if text is None or not str(text).strip():
        return (1,)
    parts: list[tuple[int, Any]] = []
    for chunk in re.split(r"(\d+)", str(text).strip().lower()):
        if chunk.isdecimal():            # isdigit() would pass "²", which int() refuses
            parts.append((0, int(chunk)))
        elif chunk:
            parts.append((1, chunk))
    return (0, tuple(parts))


def _fmt_cap(pf: float | None) -> str | None:
    from stock.units import format_capacitance
    return None if pf is None else format_capacitance(Decimal(str(pf)))


def _fmt_volt(v: float | None, kind: str | None) -> str | None:
    from stock.units import format_voltage
    return None if v is None else format_voltage(Decimal(str(v)), kind or "DC")


def _fmt_tol(minus: float | None, plus: float | None, unit: str | None) -> str | None:
    from stock.units import format_tolerance
    if minus is None or plus is None or unit is None:
        return None
    return format_tolerance(Tolerance(Decimal(str(minus)), Decimal(str(plus)), unit))


_LIST_SQL = """
SELECT b.id, b.bin_key, b.cabinet, b.location, b.label, b.on_hand, b.minimum,
       p.marking, p.capacitance_pf, p.tol_minus, p.tol_plus, p.tol_unit, p.dielectric_code,
       p.family, p.voltage_v, p.voltage_kind, p.safety_class, p.package, p.mounting,
       s.held AS reserved, s.available, COALESCE(f.open_flags, 0) AS open_flags
FROM bins b
JOIN bin_stock s ON s.bin_id = b.id
LEFT JOIN parts p ON p.bin_id = b.id
LEFT JOIN (SELECT bin_id, COUNT(*) AS open_flags FROM flags WHERE status = 'open'
           GROUP BY bin_id) f ON f.bin_id = b.id
{where}
ORDER BY b.bin_key
"""


def _summary(r: dict[str, Any]) -> dict[str, Any]:
    on_hand = r["on_hand"]
    return {
        "id": r["id"],
        "bin_key": r["bin_key"],
        "cabinet": r["cabinet"],
        "location": r["location"],
        "label": r["label"],
        "marking": r["marking"],
        "capacitance_pf": r["capacitance_pf"],
        "value": _fmt_cap(r["capacitance_pf"]),
        "tolerance": _fmt_tol(r["tol_minus"], r["tol_plus"], r["tol_unit"]),
        "dielectric": r["dielectric_code"],
        "family": r["family"],
        "voltage": _fmt_volt(r["voltage_v"], r["voltage_kind"]),
        "safety_class": r["safety_class"],
        "package": r["package"],
        "mounting": r["mounting"],
        "package_text": package_text(r["package"], r["mounting"]),
        "on_hand": on_hand,
        "reserved": r["reserved"],
        "available": r["available"],
        "minimum": r["minimum"],
        "open_flags": r["open_flags"],
    }


def package_text(package: str | None, mounting: str | None) -> str:
    """A part's package in a few words (``0805``, ``through-hole radial, D5 × L11 mm``), or "".

    >>> package_text("RADIAL 5x11", "THT"), package_text(None, "SMD"), package_text(None, None)
    ('through-hole radial, D5 × L11 mm', 'SMD', '')
    """
    if not package:
        return {"THT": "through-hole"}.get(mounting or "", mounting or "")
    from stock.markings.packages import read_package

    facts = read_package(package)
    return facts.describe() if facts.known else package


def list_bins(store: Store) -> list[dict[str, Any]]:
    """Every bin, by key: what it holds (formatted), its quantity, what is free, open flags.

    ``on_hand`` is None while the bin has never been counted; ``available`` then counts as 0.
    """
    return [_summary(r) for r in store.rows(_LIST_SQL.format(where=""))]


def bin_detail(store: Store, ref: str) -> dict[str, Any]:
    """One bin in full: decoded facts, readings not chosen, flags, quantity history, source rows.

    Args:
        store: the open store.
        ref: a bin id, key, location or label (see :meth:`Store.find_bin`).

    Raises:
        NotFound: no bin matches ``ref``, or several do.
    """
    found = store.find_bin(ref)
    rows = store.rows(_LIST_SQL.format(where="WHERE b.id = ?"), (found["id"],))
    detail = _summary(rows[0])
    detail["notes"] = found["notes"]
    detail["date_code"] = found["date_code"]
    part = store.one("SELECT * FROM parts WHERE bin_id = ?", (found["id"],))
    if part is not None:
        marking = part_marking(part)
        detail["decoded"] = marking.to_json()
        detail["alternatives"] = [a.to_json() for a in marking.alternatives]
        detail["settled"] = bool(part["settled_json"])
        detail["package"] = part["package"]
        detail["mounting"] = part["mounting"]
    else:
        detail["decoded"], detail["alternatives"], detail["settled"] = None, [], False
    detail["flags"] = [
        {"id": f["id"], "kind": f["kind"], "status": f["status"], "message": f["message"],
         "opened_at": f["opened_at"], "closed_at": f["closed_at"]}
        for f in store.rows("SELECT * FROM flags WHERE bin_id = ? ORDER BY id", (found["id"],))]
    total = 0
    history = []
    for m in store.rows("SELECT * FROM ledger WHERE bin_id = ? ORDER BY id", (found["id"],)):
        total += m["delta"]
        history.append({"at": m["at"], "kind": m["kind"], "delta": m["delta"], "after": total,
                        "ref": m["ref"], "note": m["note"], "actor": m["actor"]})
    detail["history"] = history
    detail["source_rows"] = [
        {"file": s["file_name"], "sheet": s["sheet"], "row": s["row_number"],
         "status": s["status"], "imported_at": s["at"], "raw": json.loads(s["raw_json"]),
         "reasons": json.loads(s["reasons_json"])}
        for s in store.rows(
            "SELECT s.*, i.file_name, i.at FROM source_rows s JOIN imports i ON i.id = s.import_id"
            " WHERE s.bin_id = ? ORDER BY s.id", (found["id"],))]
    return detail


def bin_parts(store: Store, bin_ids: Iterable[int] | None = None) -> list[tuple[dict[str, Any], Marking]]:
    """Bins that hold a part, by key, each with its row (id, key, location, label, cabinet) and marking.

    With ``bin_ids``, only those bins (in key order still).
    """
    sql = ("SELECT b.id, b.bin_key, b.location, b.label, b.cabinet, p.marking, p.decoded_json,"
           " p.settled_json FROM bins b JOIN parts p ON p.bin_id = b.id")
    params: tuple[Any, ...] = ()
    if bin_ids is not None:
        sql += " WHERE b.id IN (SELECT value FROM json_each(?))"
        params = (json.dumps(sorted(set(int(i) for i in bin_ids))),)
    return [(row, part_marking(row)) for row in store.rows(sql + " ORDER BY b.bin_key", params)]


def bins_changed_since(store: Store, since: str) -> set[int]:
    """Bins with a ledger movement (count, pull, settle …) or a changed record at or after ``since``.

    ``since`` is an ISO 8601 time or date in UTC, the form the tables store (a bare date means
    its midnight, which sorts first among that day's times).
    """
    return {r["bin_id"] for r in store.rows(
        "SELECT bin_id FROM ledger WHERE at >= ? UNION SELECT id FROM bins WHERE updated_at >= ?",
        (since, since))}


def open_flag_kinds(store: Store) -> dict[int, tuple[str, ...]]:
    """The kinds of each bin's open flags, oldest first, each kind once (bins without any left out)."""
    kinds: dict[int, dict[str, None]] = {}
    for f in store.rows("SELECT bin_id, kind FROM flags WHERE status = 'open' AND bin_id IS NOT NULL"
                        " ORDER BY id"):
        kinds.setdefault(f["bin_id"], {})[f["kind"]] = None
    return {bin_id: tuple(found) for bin_id, found in kinds.items()}


def quarantined_rows(store: Store) -> list[dict[str, Any]]:
    """Rows not stored, from the latest import of each file and sheet, with how to fix each.

    Older imports of the same file are left out: once an edited file is imported again, its
    earlier quarantined rows are history, not work to do.
    """
    out = []
    for r in store.rows(
            "SELECT s.row_number, s.sheet, s.raw_json, s.reasons_json, i.file_name, i.path, i.at"
            " FROM source_rows s JOIN imports i ON i.id = s.import_id"
            " WHERE s.status = 'quarantined' AND i.id = (SELECT MAX(j.id) FROM imports j"
            "   WHERE j.file_name = i.file_name AND j.sheet IS i.sheet)"
            " ORDER BY i.file_name, s.sheet, s.row_number"):
        reasons = json.loads(r["reasons_json"])
        kinds = [x.get("kind") if isinstance(x, dict) else None for x in reasons]
        messages = [x.get("message") if isinstance(x, dict) else str(x) for x in reasons]
        fixes = [QUARANTINE_FIXES.get(k or "", "correct the row, then import the file again")
                 for k in kinds]
        out.append({"file": r["file_name"], "path": r["path"], "sheet": r["sheet"],
                    "row": r["row_number"], "raw": json.loads(r["raw_json"]),
                    "reason": "; ".join(messages), "kind": kinds[0] if kinds else None,
                    "fix": "; ".join(dict.fromkeys(fixes)), "imported_at": r["at"]})
    return out


__all__ = ["bin_detail", "bin_parts", "bins_changed_since", "list_bins", "open_flag_kinds", "natural_key", "part_marking", "quarantined_rows", "stored_marking"]
