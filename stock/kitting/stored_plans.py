"""Kit plans as stored: read back, listed, pulled, undone, dropped.

:func:`stock.kit.plan_kit` writes a numbered plan and its reservations; this module reads a plan
back (:func:`load_plan`, :func:`list_plans`) and carries it through the rest of its life. Pull,
undo and drop each run in one transaction; the plan's status (reserved → pulled → returned, or
reserved → dropped) is read inside it, so a second pull of the same plan, even from another
process at the same moment, is refused with :class:`~stock.errors.Refused`.

A pull takes each bin's reserved parts with one ledger movement (kind ``pull``, ref
``plan:N``); an undo writes the exact reverse of those movements; a drop frees the
reservations without moving any part.
"""

from __future__ import annotations

import json
from collections import defaultdict
from dataclasses import dataclass, field
from typing import Any

from stock.errors import NotFound, Refused
from stock.kitting.line_rules import cautions_for
from stock.store.database import Store, now


@dataclass(frozen=True)
class Allocation:
    """Parts of one bin held for one line."""

    bin_id: int
    bin_key: str
    location: str | None
    marking: str
    qty: int

    def to_json(self) -> dict[str, Any]:
        return {"bin": self.bin_key, "qty": self.qty}


@dataclass(frozen=True)
class PlanLine:
    """One BOM line in a plan: what it needs, the bins chosen, what is short and why."""

    line_no: int
    row: int | None
    refs: tuple[str, ...]
    value: str
    kind: str
    tracked: bool
    need: int
    allocations: tuple[Allocation, ...]
    short: int
    notes: tuple[str, ...]
    requirement: str                  # in words, for ordering
    details: dict[str, Any] = field(default_factory=dict)

    @property
    def fitted(self) -> bool:
        return self.details.get("fitted", True) is not False

    def to_json(self) -> dict[str, Any]:
        return {"refs": list(self.refs), "need": self.need,
                "allocations": [a.to_json() for a in self.allocations], "short": self.short,
                "notes": list(self.notes), "line": self.line_no, "row": self.row,
                "value": self.value, "requirement": self.requirement,
                "footprint": (self.details.get("package") or {}).get("raw")}


@dataclass(frozen=True)
class KitPlan:
    """A numbered plan as stored: its lines, what is not tracked, what could not be read, cautions."""

    id: int
    boards: int
    status: str
    created_at: str
    changed_at: str | None
    bom_path: str | None
    options: dict[str, Any]
    lines: tuple[PlanLine, ...]
    cautions: tuple[str, ...]

    @property
    def tracked_lines(self) -> tuple[PlanLine, ...]:
        return tuple(line for line in self.lines if line.tracked)

    @property
    def not_tracked(self) -> tuple[PlanLine, ...]:
        return tuple(line for line in self.lines if not line.tracked and line.fitted)

    @property
    def not_fitted(self) -> tuple[PlanLine, ...]:
        """Lines marked do-not-fit in the BOM: they take nothing."""
        return tuple(line for line in self.lines if not line.fitted)

    @property
    def errors(self) -> tuple[dict[str, Any], ...]:
        return tuple(line.details["error"] for line in self.lines if line.details.get("error"))

    @property
    def short_lines(self) -> int:
        return sum(1 for line in self.tracked_lines if line.short > 0)

    def to_json(self) -> dict[str, Any]:
        """The ``stock kit plan --json`` shape (stable contract)."""
        return {
            "plan": self.id, "boards": self.boards,
            "lines": [line.to_json() for line in self.tracked_lines],
            "short_lines": self.short_lines,
            "status": self.status, "created_at": self.created_at, "bom": self.bom_path,
            "options": self.options, "cautions": list(self.cautions),
            "not_tracked": [{"refs": list(line.refs), "value": line.value, "kind": line.kind,
                             "need": line.need, "row": line.row} for line in self.not_tracked],
            "not_fitted": [{"refs": list(line.refs), "value": line.value, "kind": line.kind,
                            "row": line.row, "reason": line.details.get("not_fitted")}
                           for line in self.not_fitted],
            "errors": list(self.errors),
        }


@dataclass(frozen=True)
class KitAction:
    """What a pull, undo or drop did: the plan's new status and each bin's movement."""

    plan: int
    action: str
    status: str
    moves: tuple[tuple[str, int], ...]

    def to_json(self) -> dict[str, Any]:
        return {"plan": self.plan, "action": self.action, "status": self.status,
                "moves": [{"bin": b, "delta": d} for b, d in self.moves]}



def _plan_row(store: Store, plan: int | str) -> dict[str, Any]:
    text = str(plan).strip().removeprefix("plan:").removeprefix("#")
    plain = text.isascii() and text.isdigit() and len(text) < 19   # "²" passes isdigit(); int64 ids
    row = store.one("SELECT * FROM plans WHERE id = ?", (int(text),)) if plain else None
    if row is None:
        raise NotFound("plan", str(plan), "a plan number shown by `stock kit plan`")
    return row


def load_plan(store: Store, plan: int | str) -> KitPlan:
    """A stored plan with its lines, allocations and cautions.

    Raises:
        NotFound: no such plan.
    """
    row = _plan_row(store, plan)
    held: dict[int, list[Allocation]] = defaultdict(list)
    for r in store.rows(
            "SELECT r.line_id, r.bin_id, b.bin_key, b.location, p.marking, SUM(r.qty) AS qty"
            " FROM reservations r JOIN bins b ON b.id = r.bin_id"
            " LEFT JOIN parts p ON p.bin_id = r.bin_id WHERE r.plan_id = ?"
            " GROUP BY r.line_id, r.bin_id ORDER BY r.line_id, MIN(r.id)", (row["id"],)):
        held[r["line_id"]].append(Allocation(r["bin_id"], r["bin_key"], r["location"],
                                             r["marking"] or "", int(r["qty"])))
    lines = []
    for r in store.rows("SELECT * FROM plan_lines WHERE plan_id = ? ORDER BY line_no", (row["id"],)):
        details = json.loads(r["requirement_json"])
        lines.append(PlanLine(r["line_no"], details.get("row"), tuple(json.loads(r["refs_json"])),
                              details.get("value", ""), details.get("kind", ""), bool(r["tracked"]),
                              r["need"], tuple(held.get(r["id"], ())), r["short"],
                              tuple(json.loads(r["notes_json"])), details.get("describe", ""),
                              details))
    return KitPlan(row["id"], row["boards"], row["status"], row["created_at"], row["changed_at"],
                   row["bom_path"], json.loads(row["options_json"]), tuple(lines),
                   cautions_for(store, lines))


def _state_error(action: str, row: dict[str, Any]) -> Refused:
    when = f" at {row['changed_at']}" if row.get("changed_at") else ""
    reasons = {
        "pulled": f"it was already pulled{when}",
        "dropped": f"it was dropped{when}; make a new plan",
        "returned": f"it was pulled and its parts returned{when}; make a new plan",
        "reserved": "it has not been pulled",
    }
    return Refused(f"{action} plan {row['id']}", reasons.get(row["status"], row["status"]))


def pull_plan(store: Store, plan: int | str, *, actor: str | None = None) -> KitAction:
    """Take a plan's reserved parts out of their bins: one ledger movement per bin, one transaction.

    The status is read inside the transaction, so two pulls of one plan (two processes at once
    included) take the parts once; the second is refused.

    Raises:
        NotFound: no such plan.
        Refused: the plan is not reserved (already pulled, dropped, returned), or a bin now holds
            fewer parts than the plan reserved (nothing is taken then).
    """
    with store.writing():
        row = _plan_row(store, plan)
        if row["status"] != "reserved":
            raise _state_error("pull", row)
        ref = f"plan:{row['id']}"
        moves = []
        for r in store.rows("SELECT r.bin_id, b.bin_key, b.on_hand, SUM(r.qty) AS qty"
                            " FROM reservations r JOIN bins b ON b.id = r.bin_id"
                            " WHERE r.plan_id = ? GROUP BY r.bin_id ORDER BY MIN(r.id)", (row["id"],)):
            qty = int(r["qty"])
            try:
                store.move(r["bin_id"], -qty, "pull", ref=ref, note=f"kit plan {row['id']}",
                           actor=actor)
            except Refused:
                raise Refused(f"pull plan {row['id']}",
                              f"bin {r['bin_key']} holds {r['on_hand'] or 0}, fewer than the {qty}"
                              " reserved (it was counted down since the plan was made); nothing"
                              " was taken: recount, or drop the plan and plan again") from None
            moves.append((r["bin_key"], -qty))
        store.db.conn.execute("UPDATE plans SET status = 'pulled', changed_at = ? WHERE id = ?",
                              (now(), row["id"]))
    return KitAction(row["id"], "pull", "pulled", tuple(moves))


def undo_pull(store: Store, plan: int | str, *, actor: str | None = None) -> KitAction:
    """Put a pulled plan's parts back: the exact reverse of each pull movement, one transaction.

    Raises:
        NotFound: no such plan.
        Refused: the plan was not pulled (or was already returned).
    """
    with store.writing():
        row = _plan_row(store, plan)
        if row["status"] != "pulled":
            raise _state_error("undo", row)
        ref = f"plan:{row['id']}"
        moves = []
        for r in store.rows("SELECT l.bin_id, b.bin_key, SUM(l.delta) AS delta FROM ledger l"
                            " JOIN bins b ON b.id = l.bin_id WHERE l.kind = 'pull' AND l.ref = ?"
                            " GROUP BY l.bin_id ORDER BY MIN(l.id)", (ref,)):
            back = -int(r["delta"])
            if back:
                store.move(r["bin_id"], back, "undo", ref=ref,
                           note=f"kit plan {row['id']} returned", actor=actor)
                moves.append((r["bin_key"], back))
        store.db.conn.execute("UPDATE plans SET status = 'returned', changed_at = ? WHERE id = ?",
                              (now(), row["id"]))
    return KitAction(row["id"], "undo", "returned", tuple(moves))


def drop_plan(store: Store, plan: int | str) -> KitAction:
    """Free a reserved plan's parts without taking them.

    Raises:
        NotFound: no such plan.
        Refused: the plan is not reserved (a pulled plan is undone, not dropped).
    """
    with store.writing():
        row = _plan_row(store, plan)
        if row["status"] != "reserved":
            if row["status"] == "pulled":
                return_first = Refused(f"drop plan {row['id']}", "its parts were pulled; run"
                                       f" `stock kit undo {row['id']}` to put them back")
                raise return_first
            raise _state_error("drop", row)
        store.db.conn.execute("UPDATE plans SET status = 'dropped', changed_at = ? WHERE id = ?",
                              (now(), row["id"]))
    return KitAction(row["id"], "drop", "dropped", ())


def list_plans(store: Store) -> list[dict[str, Any]]:
    """Every plan, newest first, with its line and shortfall counts."""
    return store.rows(
        "SELECT p.id AS plan, p.created_at, p.boards, p.status, p.bom_path AS bom,"
        " SUM(CASE WHEN l.tracked = 1 THEN 1 ELSE 0 END) AS lines,"
        " SUM(CASE WHEN l.tracked = 1 AND l.short > 0 THEN 1 ELSE 0 END) AS short_lines"
        " FROM plans p LEFT JOIN plan_lines l ON l.plan_id = p.id GROUP BY p.id ORDER BY p.id DESC")


__all__ = ["Allocation", "KitAction", "KitPlan", "PlanLine", "drop_plan", "list_plans", "load_plan",
           "pull_plan", "undo_pull"]
