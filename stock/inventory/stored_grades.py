"""Grades over the store: each bin's grades at given conditions, and the stored default grades.

:func:`refresh_stored_grades` keeps the ``grades`` table current at the default conditions: it
grades each distinct marking once and writes every bin's rows in bulk, and does nothing when the
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


# Grades go in by one INSERT … SELECT joining each bin to its marking's set of grades: SQLite then
# writes the (bins × applications) rows itself, at half the cost of binding each from Python.
_STORE_GRADES = ("INSERT INTO grades (bin_id, application, grade, reasons_json, table_version)"
                 " SELECT b.bin_id, s.application, s.grade, s.reasons_json, ? FROM temp.graded_bins b"
                 " JOIN temp.grade_sets s ON s.set_id = b.set_id WHERE true"
                 " ON CONFLICT(bin_id, application) DO UPDATE SET grade = excluded.grade,"
                 " reasons_json = excluded.reasons_json, table_version = excluded.table_version")


def refresh_stored_grades(store, bin_ids: Iterable[int] | None = None) -> int:
    """Store each part's grades at the default conditions; returns how many parts were graded.

    Each row keeps the grade word and the reasons that decided it. With ``bin_ids`` those parts are
    graded again (their marking may have changed). Without, only parts whose stored grades are
    missing or carry another table version (the application table, a shop override beside the
    database, or the model changed) are graded: a cheap no-op when nothing changed. The parts are
    read in one query and graded once per distinct stored marking.
    """
    rules = load_rules(db_path=store.path)
    conn = store.db.conn
    if bin_ids is None:
        current = store.one("SELECT (SELECT COUNT(*) FROM grades g JOIN parts p ON p.bin_id = g.bin_id"
                            " WHERE g.table_version = ?) AS graded,"
                            " (SELECT COUNT(*) FROM parts) AS parts", (rules.version,))
        if current and current["graded"] == current["parts"] * len(rules.rows):
            return 0   # the usual case: every part carries this table's grades
        bin_ids = [r[0] for r in conn.execute(   # read before writing: the writes change this count
            "SELECT p.bin_id FROM parts p WHERE (SELECT COUNT(*) FROM grades g WHERE g.bin_id = p.bin_id"
            " AND g.table_version = ?) < ?", (rules.version, len(rules.rows)))]
    ids = sorted(set(int(i) for i in bin_ids))
    if not ids:
        return 0
    set_ids: dict[tuple[str, bool, str | None], int] = {}   # many bins hold the same marking: grade it once
    sets: list[tuple[int, str, str, str]] = []
    graded = 0
    with store.writing():
        conn.execute("DROP TABLE IF EXISTS temp.grade_sets")
        conn.execute("DROP TABLE IF EXISTS temp.graded_bins")
        conn.execute("CREATE TEMP TABLE grade_sets (set_id INTEGER, application TEXT, grade TEXT,"
                     " reasons_json TEXT)")
        conn.execute("CREATE TEMP TABLE graded_bins (bin_id INTEGER PRIMARY KEY, set_id INTEGER)")
        cursor = conn.execute("SELECT bin_id, decoded_json, settled_json, package FROM parts WHERE bin_id IN"
                              " (SELECT value FROM json_each(?)) ORDER BY bin_id", (json.dumps(ids),))
        while chunk := cursor.fetchmany(5000):
            members = []
            for bin_id, decoded, settled, package in chunk:
                key = (settled or decoded, bool(settled), package)
                set_id = set_ids.get(key)
                if set_id is None:
                    set_id = set_ids[key] = len(set_ids)
                    marking = _row_marking({"decoded_json": decoded, "settled_json": settled})
                    graded_set = grade_all(marking, Conditions(), rules=rules, measured=bool(settled),
                                           case_size=package)
                    # only the deciding reasons (and the doubts) are stored; `stock grade --explain`
                    # recomputes the rest
                    sets += [(set_id, name, g.word, json.dumps(
                                list(g.reasons[:g.deciding]) + [f"doubt: {d}" for d in g.doubts],
                                ensure_ascii=False))
                             for name, g in graded_set.items()]
                members.append((bin_id, set_id))
            conn.executemany("INSERT INTO temp.graded_bins VALUES (?, ?)", members)
            graded += len(chunk)
        conn.executemany("INSERT INTO temp.grade_sets VALUES (?, ?, ?, ?)", sets)
        conn.execute("CREATE INDEX temp.grade_sets_by_id ON grade_sets(set_id)")
        conn.execute(_STORE_GRADES, (rules.version,))
        conn.execute("DROP TABLE temp.grade_sets")
        conn.execute("DROP TABLE temp.graded_bins")
    return graded


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
