"""Running a migration's SQL statement by statement inside the caller's transaction."""

from __future__ import annotations

import sqlite3

from sqlite_utils import Database


def run_script(db: Database, script: str) -> None:
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


__all__ = ["run_script"]
