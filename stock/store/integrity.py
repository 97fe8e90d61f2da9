"""Verify a stock database and say what is wrong in words.

Checks, each a plain sentence when it fails:

- SQLite's own ``PRAGMA integrity_check`` and ``PRAGMA foreign_key_check``;
- every bin's ``on_hand`` equals the sum of its ledger movements (a bin whose quantity is unknown
  has only movements that change nothing, such as a recorded decision);
- no part, ledger row, flag, source row or reservation points at a bin, import or plan that is gone;
- every pulled plan has pull movements for what it reserved, and no held reservation exceeds what
  its bin holds.

>>> from stock.store.database import open_store
>>> check_store(open_store(":memory:")).ok
True
"""

from __future__ import annotations

from dataclasses import dataclass, field

from stock.store.database import Store


@dataclass(frozen=True)
class CheckReport:
    """What :func:`check_store` found: ``problems`` is empty when all is well."""

    problems: tuple[str, ...]
    checked: dict[str, int] = field(default_factory=dict)

    @property
    def ok(self) -> bool:
        return not self.problems

    def to_json(self) -> dict:
        return {"ok": self.ok, "problems": list(self.problems), "checked": self.checked}


_ORPHANS = (
    ("parts", "bin_id", "bins", "part(s) belong to no bin"),
    ("ledger", "bin_id", "bins", "ledger movement(s) name a bin that does not exist"),
    ("flags", "bin_id", "bins", "flag(s) name a bin that does not exist"),
    ("source_rows", "import_id", "imports", "source row(s) belong to no import"),
    ("source_rows", "bin_id", "bins", "source row(s) name a bin that does not exist"),
    ("reservations", "plan_id", "plans", "reservation(s) belong to no plan"),
    ("reservations", "bin_id", "bins", "reservation(s) name a bin that does not exist"),
    ("plan_lines", "plan_id", "plans", "plan line(s) belong to no plan"),
)


def check_store(store: Store) -> CheckReport:
    """Run every check; never raises for a damaged database, reports it instead."""
    problems: list[str] = []
    checked: dict[str, int] = {}

    integrity = [r[0] for r in store.db.conn.execute("PRAGMA integrity_check").fetchall()]
    if integrity != ["ok"]:
        problems.append("SQLite integrity check failed: " + "; ".join(integrity[:5]))
    for row in store.db.conn.execute("PRAGMA foreign_key_check").fetchall()[:20]:
        problems.append(f"table {row[0]} row {row[1]} points at a missing row in {row[2]}")

    mismatches = store.rows(
        "SELECT b.id, b.bin_key, b.on_hand, COALESCE(SUM(l.delta), 0) AS total, COUNT(l.id) AS moves"
        " FROM bins b LEFT JOIN ledger l ON l.bin_id = b.id GROUP BY b.id"
        " HAVING (b.on_hand IS NULL AND total != 0) OR (b.on_hand IS NOT NULL AND b.on_hand != total)")
    for m in mismatches:
        held = "unknown" if m["on_hand"] is None else str(m["on_hand"])
        problems.append(f"bin {m['bin_key']} says {held} on hand but its ledger sums to {m['total']}")
    checked["bins"] = store.one("SELECT COUNT(*) AS n FROM bins")["n"]
    checked["ledger"] = store.one("SELECT COUNT(*) AS n FROM ledger")["n"]

    for table, column, target, words in _ORPHANS:
        n = store.one(
            f"SELECT COUNT(*) AS n FROM {table} t WHERE t.{column} IS NOT NULL"
            f" AND NOT EXISTS (SELECT 1 FROM {target} x WHERE x.id = t.{column})")["n"]
        if n:
            problems.append(f"{n} {words} ({table}.{column})")

    for plan in store.rows(
            "SELECT p.id, COALESCE(SUM(r.qty), 0) AS reserved FROM plans p"
            " LEFT JOIN reservations r ON r.plan_id = p.id WHERE p.status = 'pulled' GROUP BY p.id"):
        pulled = store.one("SELECT COALESCE(-SUM(delta), 0) AS n FROM ledger"
                           " WHERE kind = 'pull' AND ref = ?", (f"plan:{plan['id']}",))["n"]
        if pulled != plan["reserved"]:
            problems.append(f"plan {plan['id']} is marked pulled but its pull movements take"
                            f" {pulled} parts, not the {plan['reserved']} it reserved")
    for over in store.rows(
            "SELECT b.bin_key, b.on_hand, s.held FROM bin_stock s JOIN bins b ON b.id = s.bin_id"
            " WHERE s.held > COALESCE(b.on_hand, 0)"):
        problems.append(f"bin {over['bin_key']} holds {over['on_hand'] or 0} but plans reserve"
                        f" {over['held']} of it (a count went down after planning)")
    return CheckReport(tuple(problems), checked)


__all__ = ["CheckReport", "check_store"]
