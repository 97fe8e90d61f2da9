"""The stock database: one SQLite file, its schema as registered migrations, and the ledger.

Tables (all STRICT, so a bin code "007" stays text and "lots" never lands in a number column):

- ``bins``: the physical place (identity ``bin_key``, label, location, cabinet, notes, minimum)
  and ``on_hand``, the quantity, NULL while unknown. ``on_hand`` is only ever changed by
  :meth:`Store.move`, in the same transaction as the ledger row that explains it.
- ``parts``: the decoded part in each bin (one per bin), flat columns for queries plus the whole
  decoded marking as JSON.
- ``ledger``: append-only quantity movements (triggers refuse UPDATE and DELETE).
- ``imports`` and ``source_rows``: every file read and every row in it, raw, with its status.
- ``flags``: what needs a human, with a fingerprint so a settled flag never returns.
- ``plans``, ``plan_lines``, ``reservations``: kits planned from a BOM and the parts they hold.
- ``grades``: each part's grade per application at the default conditions.

Writers use :meth:`Store.writing` (``BEGIN IMMEDIATE``): two processes never interleave a
read-check-write, and a second writer waits up to ``busy_timeout`` before a clear error.
"""

from __future__ import annotations

import json
import sqlite3
from collections.abc import Iterator
from contextlib import contextmanager
from datetime import datetime, timezone
from pathlib import Path
from typing import Any

from sqlite_utils import Database, Migrations

from stock.errors import NotFound, Refused, StoreProblem
from stock.scan_codes import bin_key_from_scan, is_scan

BUSY_TIMEOUT_S = 10.0
MAX_ON_HAND = 2**53          # the largest count kept exactly in SQLite, JSON and floats alike
LEDGER_KINDS = ("import", "count", "pull", "undo", "adjust", "merge", "settle")

migrations = Migrations("stock")


def _run_script(db: Database, script: str) -> None:
    """Run SQL statements one by one inside the caller's transaction.

    ``sqlite3``'s ``executescript`` commits any open transaction first, which would make a
    migration half-applied if the process died midway; statement by statement it stays atomic.
    """
    statement = ""
    for line in script.splitlines(keepends=True):
        statement += line
        if sqlite3.complete_statement(statement):
            db.conn.execute(statement)
            statement = ""
    if statement.strip():
        raise ValueError(f"incomplete SQL statement in a migration: {statement.strip()[:60]!r}")


@migrations()
def m001_core(db: Database) -> None:
    _run_script(db, f"""
    CREATE TABLE bins (
        id INTEGER PRIMARY KEY,
        bin_key TEXT NOT NULL UNIQUE,
        label TEXT, location TEXT, cabinet TEXT, notes TEXT,
        minimum INTEGER, date_code TEXT,
        on_hand INTEGER CHECK (on_hand IS NULL OR on_hand >= 0),
        created_at TEXT NOT NULL, updated_at TEXT NOT NULL
    ) STRICT;
    CREATE TABLE parts (
        bin_id INTEGER PRIMARY KEY REFERENCES bins(id),
        marking TEXT NOT NULL,
        capacitance_pf REAL,
        tol_minus REAL, tol_plus REAL, tol_unit TEXT, tol_code TEXT,
        voltage_v REAL, voltage_kind TEXT,
        dielectric_code TEXT, family TEXT, class INTEGER,
        tempco_ppm_per_k REAL, tempco_tol_ppm_per_k REAL,
        temp_min_c REAL, temp_max_c REAL, change_minus_pct REAL, change_plus_pct REAL,
        safety_class TEXT, polarity TEXT, rated_temp_c REAL,
        package TEXT, mounting TEXT,
        decoded_json TEXT NOT NULL,
        settled_json TEXT
    ) STRICT;
    CREATE INDEX parts_family_cap ON parts(family, capacitance_pf);
    CREATE INDEX parts_class_cap ON parts(class, capacitance_pf);
    CREATE INDEX parts_cap ON parts(capacitance_pf);
    CREATE INDEX parts_voltage ON parts(voltage_v);
    CREATE INDEX parts_dielectric ON parts(dielectric_code);
    CREATE TABLE imports (
        id INTEGER PRIMARY KEY,
        path TEXT NOT NULL, file_name TEXT NOT NULL, sha256 TEXT NOT NULL, sheet TEXT,
        at TEXT NOT NULL,
        rows INTEGER NOT NULL DEFAULT 0, stored INTEGER NOT NULL DEFAULT 0,
        quarantined INTEGER NOT NULL DEFAULT 0, flagged INTEGER NOT NULL DEFAULT 0,
        unchanged INTEGER NOT NULL DEFAULT 0,
        mapping_json TEXT
    ) STRICT;
    CREATE INDEX imports_sha ON imports(sha256, sheet);
    CREATE TABLE source_rows (
        id INTEGER PRIMARY KEY,
        import_id INTEGER NOT NULL REFERENCES imports(id),
        sheet TEXT, row_number INTEGER NOT NULL,
        raw_json TEXT NOT NULL,
        status TEXT NOT NULL CHECK (status IN ('stored', 'quarantined', 'flagged')),
        reasons_json TEXT NOT NULL DEFAULT '[]',
        bin_id INTEGER REFERENCES bins(id)
    ) STRICT;
    CREATE INDEX source_rows_import ON source_rows(import_id);
    CREATE INDEX source_rows_status ON source_rows(status);
    CREATE TABLE ledger (
        id INTEGER PRIMARY KEY,
        bin_id INTEGER NOT NULL REFERENCES bins(id),
        delta INTEGER NOT NULL,
        kind TEXT NOT NULL CHECK (kind IN ({", ".join(repr(k) for k in LEDGER_KINDS)})),
        ref TEXT, note TEXT, actor TEXT,
        at TEXT NOT NULL
    ) STRICT;
    CREATE INDEX ledger_bin ON ledger(bin_id);
    CREATE TRIGGER ledger_append_only_update BEFORE UPDATE ON ledger
        BEGIN SELECT RAISE(ABORT, 'the ledger is append-only'); END;
    CREATE TRIGGER ledger_append_only_delete BEFORE DELETE ON ledger
        BEGIN SELECT RAISE(ABORT, 'the ledger is append-only'); END;
    CREATE TABLE flags (
        id INTEGER PRIMARY KEY,
        bin_id INTEGER REFERENCES bins(id),
        source_row_id INTEGER REFERENCES source_rows(id),
        kind TEXT NOT NULL, message TEXT NOT NULL,
        details_json TEXT NOT NULL DEFAULT '{{}}',
        fingerprint TEXT NOT NULL UNIQUE,
        status TEXT NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'settled')),
        opened_at TEXT NOT NULL, closed_at TEXT,
        decision_json TEXT
    ) STRICT;
    CREATE INDEX flags_bin ON flags(bin_id, status);
    CREATE TABLE plans (
        id INTEGER PRIMARY KEY,
        created_at TEXT NOT NULL,
        boards INTEGER NOT NULL,
        bom_path TEXT,
        status TEXT NOT NULL DEFAULT 'reserved'
            CHECK (status IN ('reserved', 'pulled', 'dropped', 'returned')),
        options_json TEXT NOT NULL DEFAULT '{{}}',
        changed_at TEXT
    ) STRICT;
    CREATE TABLE plan_lines (
        id INTEGER PRIMARY KEY,
        plan_id INTEGER NOT NULL REFERENCES plans(id),
        line_no INTEGER NOT NULL,
        refs_json TEXT NOT NULL DEFAULT '[]',
        need INTEGER NOT NULL,
        short INTEGER NOT NULL DEFAULT 0,
        tracked INTEGER NOT NULL DEFAULT 1,
        requirement_json TEXT NOT NULL DEFAULT '{{}}',
        notes_json TEXT NOT NULL DEFAULT '[]'
    ) STRICT;
    CREATE INDEX plan_lines_plan ON plan_lines(plan_id);
    CREATE TABLE reservations (
        id INTEGER PRIMARY KEY,
        plan_id INTEGER NOT NULL REFERENCES plans(id),
        line_id INTEGER NOT NULL REFERENCES plan_lines(id),
        bin_id INTEGER NOT NULL REFERENCES bins(id),
        qty INTEGER NOT NULL CHECK (qty > 0)
    ) STRICT;
    CREATE INDEX reservations_bin ON reservations(bin_id);
    CREATE INDEX reservations_plan ON reservations(plan_id);
    CREATE TABLE grades (
        bin_id INTEGER NOT NULL REFERENCES bins(id),
        application TEXT NOT NULL,
        grade TEXT NOT NULL CHECK (grade IN ('fit', 'marginal', 'unfit', 'unknown')),
        reasons_json TEXT NOT NULL DEFAULT '[]',
        table_version TEXT NOT NULL,
        PRIMARY KEY (bin_id, application)
    ) STRICT;
    """)


@migrations()
def m002_bin_stock(db: Database) -> None:
    # The one definition of "available": on hand less what plans not yet pulled hold. A view, so
    # search, kitting, exports and the integrity check read the same numbers.
    _run_script(db, """
    CREATE VIEW bin_stock AS
    SELECT b.id AS bin_id, b.on_hand AS on_hand, COALESCE(h.held, 0) AS held,
           MAX(0, COALESCE(b.on_hand, 0) - COALESCE(h.held, 0)) AS available
    FROM bins b LEFT JOIN (
        SELECT r.bin_id, SUM(r.qty) AS held FROM reservations r
        JOIN plans p ON p.id = r.plan_id WHERE p.status = 'reserved' GROUP BY r.bin_id
    ) h ON h.bin_id = b.id;
    """)


@migrations()
def m003_remembered_mappings(db: Database) -> None:
    """Header mappings a user gave once, kept per header signature and used on the next import."""
    _run_script(db, """
    CREATE TABLE remembered_mappings (
        signature TEXT PRIMARY KEY,
        vocabulary TEXT NOT NULL,
        headers_json TEXT NOT NULL,
        mapping_json TEXT NOT NULL,
        saved_at TEXT NOT NULL
    ) STRICT;
    """)


def now() -> str:
    """The current time as ISO 8601 UTC, the form every table stores."""
    return datetime.now(timezone.utc).isoformat(timespec="seconds")


def _friendly(path: str, exc: sqlite3.Error) -> StoreProblem:
    text = str(exc).lower()
    if "locked" in text or "busy" in text:
        return StoreProblem(path, "the database is locked by another program",
                            f"waited {BUSY_TIMEOUT_S:g} s; try again when it has finished")
    if "readonly" in text or "read-only" in text:
        return StoreProblem(path, "the database file is read-only",
                            "use a copy you may write to, or fix the file's permissions")
    if "full" in text:
        return StoreProblem(path, "the disk (or the database's size limit) is full",
                            "nothing of this change was written; free space and run it again")
    if "not a database" in text or "malformed" in text:
        return StoreProblem(path, "this file is not a stock database (or it is damaged)",
                            "give the path of a stock database with --db, or a new file name to start one")
    return StoreProblem(path, f"database error: {exc}")


class Store:
    """An open stock database. Use :func:`open_store` to get one."""

    def __init__(self, db: Database, path: str):
        self.db = db
        self.path = path

    def close(self) -> None:
        self.db.close()

    def __enter__(self) -> Store:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    @contextmanager
    def writing(self) -> Iterator[Database]:
        """One write transaction, taken at once (``BEGIN IMMEDIATE``) and all-or-nothing.

        Nested calls become savepoints, so library functions may call each other.
        """
        conn = self.db.conn
        if conn.in_transaction:
            with self.db.atomic():
                yield self.db
            return
        try:
            conn.execute("BEGIN IMMEDIATE")
        except sqlite3.OperationalError as exc:
            raise _friendly(self.path, exc) from exc
        try:
            yield self.db
        except sqlite3.OperationalError as exc:
            if conn.in_transaction:
                conn.execute("ROLLBACK")
            raise _friendly(self.path, exc) from exc
        except BaseException:
            if conn.in_transaction:
                conn.execute("ROLLBACK")
            raise
        else:
            try:
                conn.execute("COMMIT")
            except sqlite3.OperationalError as exc:
                if conn.in_transaction:
                    conn.execute("ROLLBACK")
                raise _friendly(self.path, exc) from exc

    def rows(self, sql: str, params: Any = ()) -> list[dict[str, Any]]:
        """Run a query and return its rows as dicts."""
        cur = self.db.conn.execute(sql, params)
        names = [d[0] for d in cur.description or ()]
        return [dict(zip(names, r)) for r in cur.fetchall()]

    def one(self, sql: str, params: Any = ()) -> dict[str, Any] | None:
        found = self.rows(sql, params)
        return found[0] if found else None

    def move(self, bin_id: int, delta: int, kind: str, *, ref: str | None = None,
             note: str | None = None, actor: str | None = None) -> int:
        """Record one ledger movement and apply it to the bin's quantity; returns the new on-hand.

        Must run inside :meth:`writing`. An unknown quantity (NULL) counts as zero. A movement that
        would leave fewer than zero parts is refused and nothing is written.

        Raises:
            Refused: the bin would go negative, or hold more than ``MAX_ON_HAND``.
            NotFound: no such bin.
        """
        if kind not in LEDGER_KINDS:
            raise ValueError(f"ledger kind {kind!r} is not one of {', '.join(LEDGER_KINDS)}")
        if not self.db.conn.in_transaction:
            raise RuntimeError("Store.move must run inside Store.writing()")
        row = self.one("SELECT on_hand, bin_key FROM bins WHERE id = ?", (bin_id,))
        if row is None:
            raise NotFound("bin", str(bin_id))
        new = (row["on_hand"] or 0) + delta
        if new < 0:
            raise Refused(f"take {-delta} from bin {row['bin_key']}",
                          f"it holds only {row['on_hand'] or 0}")
        if new > MAX_ON_HAND:   # a typing slip; SQLite's INTEGER would overflow a little further on
            raise Refused(f"put {delta} parts in bin {row['bin_key']}",
                          f"a bin holding more than {MAX_ON_HAND:,} parts is not a count")
        stamp = now()
        self.db.conn.execute(
            "INSERT INTO ledger (bin_id, delta, kind, ref, note, actor, at) VALUES (?,?,?,?,?,?,?)",
            (bin_id, delta, kind, ref, note, actor, stamp))
        self.db.conn.execute("UPDATE bins SET on_hand = ?, updated_at = ? WHERE id = ?",
                             (new, stamp, bin_id))
        return new

    def set_count(self, bin_id: int, counted: int, kind: str = "count", *,
                  ref: str | None = None, note: str | None = None) -> int:
        """Bring a bin to a counted quantity with one movement of the difference; returns the delta.

        A bin whose quantity was unknown gets a movement of the whole count, so the ledger always
        sums to ``on_hand``. A zero difference on a known quantity writes nothing.
        """
        row = self.one("SELECT on_hand FROM bins WHERE id = ?", (bin_id,))
        if row is None:
            raise NotFound("bin", str(bin_id))
        delta = counted - (row["on_hand"] or 0)
        if delta or row["on_hand"] is None:
            self.move(bin_id, delta, kind, ref=ref, note=note)
        return delta

    def reserved(self, bin_id: int) -> int:
        """Parts held for plans not yet pulled or dropped."""
        row = self.one("SELECT held FROM bin_stock WHERE bin_id = ?", (bin_id,))
        return int(row["held"]) if row else 0

    def available(self, bin_id: int) -> int:
        """On hand less reservations (an unknown quantity counts as none available)."""
        row = self.one("SELECT available FROM bin_stock WHERE bin_id = ?", (bin_id,))
        if row is None:
            raise NotFound("bin", str(bin_id))
        return int(row["available"])

    def raise_flag(self, *, kind: str, message: str, fingerprint: str, bin_id: int | None = None,
                   source_row_id: int | None = None, details: dict[str, Any] | None = None) -> int | None:
        """Open a flag unless one with the same fingerprint exists (open or settled).

        The fingerprint names what the flag is about (for example ``"label-conflict|cab1/A2|104|10nF"``),
        so importing the same row again neither duplicates an open flag nor reopens a settled one.
        Returns the new flag's id, or None when it already existed.
        """
        cur = self.db.conn.execute(
            "INSERT OR IGNORE INTO flags (bin_id, source_row_id, kind, message, details_json, fingerprint,"
            " status, opened_at) VALUES (?, ?, ?, ?, ?, ?, 'open', ?)",
            (bin_id, source_row_id, kind, message, json.dumps(details or {}, default=str),
             fingerprint, now()))
        return cur.lastrowid if cur.rowcount else None

    def find_bin(self, ref: str) -> dict[str, Any]:
        """A bin by id, bin key, location or label (case-insensitive); the first exact match wins.

        A scanned label code (``BIN:…``, see :mod:`stock.scan_codes`) names its bin key exactly.

        Raises:
            NotFound: nothing matches, or a location/label matches several bins.
            BadValue: a scanned code that cannot be read.
        """
        text = ref.strip()
        if is_scan(text):
            key = bin_key_from_scan(text)
            row = self.one("SELECT * FROM bins WHERE bin_key = ?", (key,))
            if row is None:
                raise NotFound("bin", key, f"a bin of this database; the code scanned ({text!r}) may"
                               " come from another database's label, or from a bin since merged")
            return row
        if text.isascii() and text.isdigit() and len(text) < 19:   # "²" is a digit to isdigit(); 19 digits pass int64
            row = self.one("SELECT * FROM bins WHERE id = ?", (int(text),))
            if row:
                return row
        for column in ("bin_key", "location", "label"):
            found = self.rows(f"SELECT * FROM bins WHERE {column} = ? COLLATE NOCASE", (text,))
            if len(found) == 1:
                return found[0]
            if len(found) > 1:
                keys = ", ".join(r["bin_key"] for r in found[:6])
                raise NotFound("single bin", text, f"one of {keys}")
        raise NotFound("bin", text, "a bin id, key, location or label listed by `stock bins`")


def _refuse_foreign(name: str, db: Database) -> None:
    """Never add our tables to another program's SQLite file (``--db`` pointed at the wrong file)."""
    tables = [t for t in db.table_names() if not t.startswith("sqlite_")]
    if tables and "_sqlite_migrations" not in tables:
        shown = ", ".join(tables[:4]) + (" ..." if len(tables) > 4 else "")
        db.close()
        raise StoreProblem(name, f"this is another program's SQLite database (tables {shown}),"
                           " not a stock database", "nothing was changed; give --db a stock"
                           " database or a new file name")


def open_store(path: str | Path, *, create: bool = True) -> Store:
    """Open (or create) a stock database, with WAL, foreign keys and every migration applied.

    Raises:
        StoreProblem: the file is missing (with ``create=False``), locked, read-only or not a database.
    """
    name = str(path)
    if name != ":memory:" and not create and not Path(name).exists():
        raise StoreProblem(name, "no stock database here", "import a sheet first, or give --db")
    try:
        conn = sqlite3.connect(name, timeout=BUSY_TIMEOUT_S, isolation_level=None)
        conn.execute(f"PRAGMA busy_timeout = {int(BUSY_TIMEOUT_S * 1000)}")
        db = Database(conn)
        if migrations.pending(db):
            _refuse_foreign(name, db)   # before WAL is turned on: that too would change the file
        if name != ":memory:":
            mode = conn.execute("PRAGMA journal_mode").fetchone()[0]
            if mode != "wal":
                db.enable_wal()
        conn.execute("PRAGMA synchronous = NORMAL")
        conn.execute("PRAGMA foreign_keys = ON")
        if migrations.pending(db):
            # Applied under one write lock: a second process creating the same new file waits
            # here, then finds nothing pending (each migration nests as a savepoint).
            conn.execute("BEGIN IMMEDIATE")
            try:
                migrations.apply(db)
                conn.execute("COMMIT")
            except BaseException:
                if conn.in_transaction:
                    conn.execute("ROLLBACK")
                raise
    except sqlite3.Error as exc:
        raise _friendly(name, exc) from exc
    return Store(db, name)


__all__ = ["LEDGER_KINDS", "MAX_ON_HAND", "Store", "migrations", "now", "open_store"]
