"""The migration that stores each distinct reading once (``markings``, ``bin_parts``,
``marking_grades``) and keeps ``parts`` and ``grades`` as views of the old shape.

Registered in :mod:`stock.store.database` after the migrations before it; like every released
migration it never changes.
"""

from __future__ import annotations

from typing import Any

from sqlite_utils import Database

from stock.store.sql_script import run_script as _run_script

# The flat facts of a reading, as search and the exports read them (stock.inventory.row_reading's
# PART_COLUMNS when this migration was written; a migration never changes once released).
_MARKING_COLUMNS = ("capacitance_pf", "tol_minus", "tol_plus", "tol_unit", "tol_code", "voltage_v",
                    "voltage_kind", "dielectric_code", "family", "class", "tempco_ppm_per_k",
                    "tempco_tol_ppm_per_k", "temp_min_c", "temp_max_c", "change_minus_pct",
                    "change_plus_pct", "safety_class", "polarity", "rated_temp_c")
_MARKING_TYPES = ("REAL", "REAL", "REAL", "TEXT", "TEXT", "REAL", "TEXT", "TEXT", "TEXT", "INTEGER",
                  "REAL", "REAL", "REAL", "REAL", "REAL", "REAL", "TEXT", "TEXT", "REAL")


def marking_digest(marking_json: str) -> bytes:
    """The identity of one stored reading: 16 bytes of BLAKE2b over its JSON text."""
    from hashlib import blake2b
    return blake2b(marking_json.encode(), digest_size=16).digest()


def _markings_schema() -> str:
    cols = ", ".join(f"{c} {t}" for c, t in zip(_MARKING_COLUMNS, _MARKING_TYPES))
    new_cols = ", ".join(f"NEW.{c}" for c in _MARKING_COLUMNS)
    names = ", ".join(_MARKING_COLUMNS)
    decoded_cols = ", ".join(f"CASE WHEN NEW.settled_json IS NULL THEN NEW.{c} END"
                             for c in _MARKING_COLUMNS)
    shown = ", ".join(f"s.{c}" for c in _MARKING_COLUMNS)
    return f"""
    CREATE TABLE markings (
        id INTEGER PRIMARY KEY,
        digest BLOB UNIQUE,
        text TEXT NOT NULL,
        marking_json TEXT NOT NULL,
        {cols}
    ) STRICT;
    CREATE INDEX markings_family_cap ON markings(family, capacitance_pf);
    CREATE INDEX markings_class_cap ON markings(class, capacitance_pf);
    CREATE INDEX markings_cap ON markings(capacitance_pf);
    CREATE TABLE bin_parts (
        bin_id INTEGER PRIMARY KEY REFERENCES bins(id),
        marking_id INTEGER NOT NULL REFERENCES markings(id),
        settled_id INTEGER REFERENCES markings(id),
        shown_id INTEGER NOT NULL REFERENCES markings(id),
        package TEXT, mounting TEXT,
        CHECK (shown_id = COALESCE(settled_id, marking_id))
    ) STRICT;
    CREATE INDEX bin_parts_shown ON bin_parts(shown_id);
    CREATE TABLE marking_grades (
        marking_id INTEGER NOT NULL REFERENCES markings(id),
        measured INTEGER NOT NULL DEFAULT 0 CHECK (measured IN (0, 1)),
        case_size TEXT NOT NULL DEFAULT '',
        application TEXT NOT NULL,
        grade TEXT NOT NULL CHECK (grade IN ('fit', 'marginal', 'unfit', 'unknown')),
        reasons_json TEXT NOT NULL DEFAULT '[]',
        table_version TEXT NOT NULL,
        PRIMARY KEY (marking_id, measured, case_size, application)
    ) STRICT, WITHOUT ROWID;
    CREATE VIEW parts AS
        SELECT p.bin_id, d.text AS marking, {shown}, p.package, p.mounting,
               d.marking_json AS decoded_json,
               CASE WHEN p.settled_id IS NOT NULL THEN s.marking_json END AS settled_json
        FROM bin_parts p JOIN markings d ON d.id = p.marking_id JOIN markings s ON s.id = p.shown_id;
    CREATE VIEW grades AS
        SELECT p.bin_id, g.application, g.grade, g.reasons_json, g.table_version
        FROM bin_parts p JOIN marking_grades g ON g.marking_id = p.shown_id
            AND g.measured = (p.settled_id IS NOT NULL) AND g.case_size = COALESCE(p.package, '');
    CREATE TRIGGER parts_insert INSTEAD OF INSERT ON parts BEGIN
        INSERT INTO markings (text, marking_json, {names})
            VALUES (NEW.marking, NEW.decoded_json, {decoded_cols});
        INSERT INTO bin_parts (bin_id, marking_id, shown_id, package, mounting)
            VALUES (NEW.bin_id, last_insert_rowid(), last_insert_rowid(), NEW.package, NEW.mounting);
        INSERT INTO markings (text, marking_json, {names})
            SELECT NEW.marking, NEW.settled_json, {new_cols} WHERE NEW.settled_json IS NOT NULL;
        UPDATE bin_parts SET settled_id = last_insert_rowid(), shown_id = last_insert_rowid()
            WHERE bin_id = NEW.bin_id AND NEW.settled_json IS NOT NULL;
    END;
    CREATE TRIGGER parts_update INSTEAD OF UPDATE ON parts BEGIN
        INSERT INTO markings (text, marking_json, {names})
            VALUES (NEW.marking, NEW.decoded_json, {decoded_cols});
        UPDATE bin_parts SET marking_id = last_insert_rowid(), settled_id = NULL,
            shown_id = last_insert_rowid(), package = NEW.package, mounting = NEW.mounting
            WHERE bin_id = OLD.bin_id;
        INSERT INTO markings (text, marking_json, {names})
            SELECT NEW.marking, NEW.settled_json, {new_cols} WHERE NEW.settled_json IS NOT NULL;
        UPDATE bin_parts SET settled_id = last_insert_rowid(), shown_id = last_insert_rowid()
            WHERE bin_id = OLD.bin_id AND NEW.settled_json IS NOT NULL;
    END;
    CREATE TRIGGER parts_delete INSTEAD OF DELETE ON parts BEGIN
        DELETE FROM bin_parts WHERE bin_id = OLD.bin_id;
    END;
    """


def m004_markings_once(db: Database) -> None:
    """Each distinct reading stored once (``markings``), bins pointing at it (``bin_parts``), its
    grades kept once per reading, settled or not, and package (``marking_grades``: a settled
    reading drops the unmarked-tolerance doubt, the case size feeds the DC-bias model); ``parts`` and ``grades`` become views of the
    same shape as the old tables, so every reader keeps its SQL. Source rows may now hold a compact
    array of cells under the import's header (``imports.headers_json``); old rows keep their
    objects. Source rows get an index by bin, and their status index shrinks to the quarantined.

    Rows written through the ``parts`` view (tests, older tools) get readings of their own with
    no digest; the importer shares readings by digest.
    """
    conn = db.conn
    conn.execute("ALTER TABLE parts RENAME TO old_parts")
    conn.execute("ALTER TABLE grades RENAME TO old_grades")
    _run_script(db, _markings_schema())
    names = ", ".join(_MARKING_COLUMNS)
    insert = (f"INSERT INTO markings (digest, text, marking_json, {names})"
              f" VALUES ({', '.join('?' * (len(_MARKING_COLUMNS) + 3))})")
    ids: dict[tuple[Any, ...], int] = {}
    digests: set[bytes] = set()

    def reading(text: str, marking_json: str, columns: tuple[Any, ...], shareable: bool) -> int:
        key = (marking_json, columns) if shareable else None
        if key is not None and key in ids:
            return ids[key]
        digest = marking_digest(marking_json) if shareable else None
        if digest in digests:
            digest = None      # the same JSON with other columns (written by hand): kept apart
        cur = conn.execute(insert, (digest, text, marking_json, *columns))
        if digest is not None:
            digests.add(digest)
            ids[key] = cur.lastrowid
        return cur.lastrowid

    cursor = conn.execute(f"SELECT bin_id, marking, decoded_json, settled_json, package, mounting,"
                          f" {names} FROM old_parts ORDER BY bin_id")
    while chunk := cursor.fetchmany(5000):
        links = []
        for bin_id, text, decoded, settled, package, mounting, *columns in chunk:
            columns = tuple(columns)
            if settled is None:
                marking_id = settled_id = reading(text, decoded, columns, True)
                settled_id = None
            else:   # the old columns are the settled reading's; the decoded one's are not kept
                marking_id = reading(text, decoded, (None,) * len(columns), False)
                settled_id = reading(text, settled, columns, False)
            links.append((bin_id, marking_id, settled_id, settled_id or marking_id, package, mounting))
        conn.executemany("INSERT INTO bin_parts (bin_id, marking_id, settled_id, shown_id, package,"
                         " mounting) VALUES (?, ?, ?, ?, ?, ?)", links)
    conn.execute("INSERT OR IGNORE INTO marking_grades (marking_id, measured, case_size, application,"
                 " grade, reasons_json, table_version) SELECT p.shown_id, p.settled_id IS NOT NULL,"
                 " COALESCE(p.package, ''), g.application, g.grade, g.reasons_json,"
                 " g.table_version FROM old_grades g JOIN bin_parts p ON p.bin_id = g.bin_id")
    conn.execute("DROP TABLE old_grades")
    conn.execute("DROP TABLE old_parts")
    conn.execute("ALTER TABLE imports ADD COLUMN headers_json TEXT")
    conn.execute("CREATE INDEX source_rows_bin ON source_rows(bin_id)")
    # only quarantined rows are ever looked up by status: index those alone
    conn.execute("DROP INDEX source_rows_status")
    conn.execute("CREATE INDEX source_rows_quarantined ON source_rows(import_id)"
                 " WHERE status = 'quarantined'")


__all__ = ["m004_markings_once", "marking_digest"]
