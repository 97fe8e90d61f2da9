"""Grades over the store: each bin's grades at given conditions, and the stored default grades.

:func:`refresh_stored_grades` keeps the ``grades`` table current at the default conditions: it
grades each distinct grading input once (the reading shown, whether it was settled, the bin's
package) and writes those rows in bulk, and does nothing when the
application table and model version are unchanged. :func:`grade_bins` grades bins at any
conditions on the fly. The physics is :mod:`stock.grading`; this module only reads and writes.
"""

from __future__ import annotations

import json
from collections.abc import Iterable
from dataclasses import dataclass, field
from typing import Any

from stock.physics.applications import Rules, load_rules
from stock.decoded import Marking
from stock.errors import NotFound
from stock.physics.grading import Conditions, Grade, grade_all

def _row_marking(row: dict[str, Any]) -> Marking:
    from stock.inventory.bins import part_marking

    return part_marking(row)


def stored_marking(decoded_json: str, settled_json: str | None) -> Marking:
    from stock.inventory.bins import stored_marking as from_json

    return from_json(decoded_json, settled_json)


_PART_SQL = ("SELECT b.id AS bin_id, b.bin_key, b.location, b.label, p.decoded_json, p.settled_json,"
             " p.package FROM parts p JOIN bins b ON b.id = p.bin_id")


@dataclass(frozen=True)
class BinGrades:
    """One stored part and its grades."""

    bin_id: int
    bin_key: str
    location: str | None
    marking: Marking
    grades: dict[str, Grade] = field(default_factory=dict)
    package: str | None = None

    def to_json(self) -> dict[str, Any]:
        return {"bin_id": self.bin_id, "bin_key": self.bin_key, "location": self.location,
                "marking": self.marking.text,
                "grades": {n: g.word for n, g in self.grades.items()},
                "reasons": {n: list(g.reasons) for n, g in self.grades.items()},
                "doubts": {n: list(g.doubts) for n, g in self.grades.items() if g.doubts},
                "package": self.package}


def _parts(store, bin_refs: Iterable[str] | None) -> list[dict[str, Any]]:
    if not bin_refs:
        return store.rows(_PART_SQL + " ORDER BY b.bin_key")
    rows = []
    for ref in bin_refs:
        found = store.find_bin(ref)
        row = store.one(_PART_SQL + " WHERE b.id = ?", (found["id"],))
        if row is None:
            raise NotFound("part in bin", str(ref), "a bin that holds a decoded part")
        rows.append(row)
    return rows


def grade_bins(store, bin_refs: Iterable[str] | None = None, conditions: Conditions = Conditions(), *,
               rules: Rules | None = None) -> list[BinGrades]:
    """Grade the parts in some bins (all when none are named) at some conditions.

    Raises:
        NotFound: a bin reference matches nothing, or its bin holds no part.
    """
    rules = rules or load_rules(db_path=store.path)
    # a settled reading (or a measured --value) removes the unmarked-tolerance doubt; the package
    # column gives the case size the DC-bias model needs
    return [BinGrades(r["bin_id"], r["bin_key"], r["location"], m,
                      grade_all(m, conditions, rules=rules, measured=bool(r.get("settled_json")),
                                case_size=r.get("package")), r.get("package"))
            for r in _parts(store, bin_refs) for m in (_row_marking(r),)]


def bin_marking(store, ref: str) -> tuple[dict[str, Any], Marking]:
    """A stored part's row and marking, by bin reference (see :meth:`Store.find_bin`)."""
    row = _parts(store, [ref])[0]
    return row, _row_marking(row)


def current_version(store) -> str:
    """The table version stored grades must carry: the table in force for this database."""
    return load_rules(db_path=store.path).version


_UPSERT_GRADE = ("INSERT INTO marking_grades (marking_id, measured, case_size, application, grade,"
                 " reasons_json, table_version) VALUES (?, ?, ?, ?, ?, ?, ?)"
                 " ON CONFLICT(marking_id, measured, case_size, application) DO UPDATE SET"
                 " grade = excluded.grade, reasons_json = excluded.reasons_json,"
                 " table_version = excluded.table_version")
# The grading inputs in force, each with how many bins share it: the reading shown, whether it was
# settled (measured), and the bin's package (the case size).
_GROUPS = ("SELECT shown_id, measured, case_size, n FROM (SELECT shown_id, settled_id IS NOT NULL AS"
           " measured, COALESCE(package, '') AS case_size, COUNT(*) AS n FROM bin_parts {where}"
           " GROUP BY 1, 2, 3) q")
# ... of those, the ones whose stored grades are missing or from another table version.
_STALE = _GROUPS.format(where="") + (
    " WHERE (SELECT COUNT(*) FROM marking_grades g WHERE g.marking_id = q.shown_id AND g.measured ="
    " q.measured AND g.case_size = q.case_size AND g.table_version = ?) < ?")


def refresh_stored_grades(store, bin_ids: Iterable[int] | None = None) -> int:
    """Store the grades at the default conditions of the readings in force; returns how many
    parts (bins) that graded.

    Grades belong to what decides them, not to the bin: the reading (a ``markings`` row), whether
    it was settled (a measured reading drops the unmarked-tolerance doubt) and the bin's package
    (the case size of the DC-bias model). A reading held by a thousand bins of one package is
    graded once, and each row keeps the grade word, the reasons that decided it and its doubts.
    With ``bin_ids`` those parts' grades are computed again. Without, only inputs whose stored
    grades are missing or carry another table version (the application table, a shop override
    beside the database, or the model changed) are graded: a cheap no-op when nothing changed.
    """
    rules = load_rules(db_path=store.path)
    conn = store.db.conn
    if bin_ids is None:
        groups = conn.execute(_STALE, (rules.version, len(rules.rows))).fetchall()
    else:
        ids = sorted(set(int(i) for i in bin_ids))
        groups = conn.execute(_GROUPS.format(
            where="WHERE bin_id IN (SELECT value FROM json_each(?))"), (json.dumps(ids),)).fetchall()
    if not groups:
        return 0
    with store.writing():
        for start in range(0, len(groups), 5000):
            chunk = groups[start:start + 5000]
            encoded = dict(conn.execute(
                "SELECT id, marking_json FROM markings WHERE id IN (SELECT value FROM json_each(?))",
                (json.dumps(sorted({g[0] for g in chunk})),)))
            rows = []
            for reading_id, measured, case_size, _ in chunk:
                text = encoded[reading_id]
                marking = stored_marking(text, text if measured else None)
                graded = grade_all(marking, Conditions(), rules=rules, measured=bool(measured),
                                   case_size=case_size or None)
                # only the deciding reasons (and the doubts) are stored; `stock grade --explain`
                # recomputes the rest
                rows += [(reading_id, measured, case_size, name, g.word, json.dumps(
                            list(g.reasons[:g.deciding]) + [f"doubt: {d}" for d in g.doubts],
                            ensure_ascii=False), rules.version)
                         for name, g in graded.items()]
            conn.executemany(_UPSERT_GRADE, rows)
    return len(ids) if bin_ids is not None else sum(g[3] for g in groups)


def stored_grade_words(store) -> dict[int, dict[str, str]]:
    """Each bin's stored grade word per application at the default conditions.

    Call :func:`refresh_stored_grades` first where the grading table may have changed.
    """
    words: dict[int, dict[str, str]] = {}
    for row in store.rows("SELECT bin_id, application, grade FROM grades"):
        words.setdefault(row["bin_id"], {})[row["application"]] = row["grade"]
    return words


__all__ = ["BinGrades", "bin_marking", "current_version", "grade_bins", "refresh_stored_grades",
           "stored_grade_words"]
