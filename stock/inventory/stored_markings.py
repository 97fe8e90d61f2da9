"""Each distinct reading stored once: the ``markings`` rows bins point at, found by digest.

A shop's sheet repeats its markings (the same ``104`` in hundreds of bins), so the decoded facts,
the flat columns search filters on and the stored grades belong to the reading, not to each bin.
A reading's identity is the digest of its JSON (:func:`stock.store.database.marking_digest`): the
same decoding, label agreements and doubts give the same row, whichever import or settle wrote it.
A bin's ``bin_parts`` row names the decoded reading (``marking_id``), the settled one if a person
chose one (``settled_id``), and the reading in force (``shown_id``), which search and grades read.
"""

from __future__ import annotations

import json
import sqlite3
from typing import Any

from stock.decoded import Marking
from stock.inventory.row_reading import PART_COLUMNS, part_columns
from stock.store.database import marking_digest

REMEMBERED = 65536   # readings whose ids one writer keeps at hand (memory stays bounded)

_INSERT = (f"INSERT INTO markings (digest, text, marking_json, {', '.join(PART_COLUMNS)})"
           f" VALUES ({', '.join('?' * (len(PART_COLUMNS) + 3))})")


def marking_json(m: Marking) -> str:
    """The stored JSON of a reading (the text its digest is taken over)."""
    return json.dumps(m.to_json(), ensure_ascii=False)


class Readings:
    """Finds or adds the ``markings`` row of a reading; remembers recent ones by object and JSON.

    Readers hand out one object per distinct reading, so a sheet's repeated markings cost one
    dictionary lookup each after the first.
    """

    def __init__(self, conn: sqlite3.Connection):
        self.conn = conn
        self._by_object: dict[int, tuple[Marking, int]] = {}
        self._by_json: dict[str, int] = {}
        self.added = 0

    def id_for(self, m: Marking, text: str | None = None) -> int:
        """The id of the row holding ``m`` (added if new); ``text`` is the marking as written."""
        found = self._by_object.get(id(m))
        if found is not None and found[0] is m:
            return found[1]
        encoded = marking_json(m)
        row_id = self._by_json.get(encoded)
        if row_id is None:
            row_id = self._find_or_add(encoded, m, m.text if text is None else text)
            if len(self._by_json) >= REMEMBERED:
                self._by_json.clear()
            self._by_json[encoded] = row_id
        if len(self._by_object) >= REMEMBERED:
            self._by_object.clear()
        self._by_object[id(m)] = (m, row_id)
        return row_id

    def _find_or_add(self, encoded: str, m: Marking, text: str) -> int:
        digest = marking_digest(encoded)
        row = self.conn.execute("SELECT id FROM markings WHERE digest = ?", (digest,)).fetchone()
        if row is not None:
            return row[0]
        self.added += 1
        return self.conn.execute(_INSERT, (digest, text, encoded, *part_columns(m))).lastrowid


def set_reading(conn: sqlite3.Connection, bin_id: int, decoded: Marking | None = None, *,
                settled: Marking | None | bool = False, text: str | None = None,
                package: str | None = None, mounting: str | None = None,
                readings: Readings | None = None) -> None:
    """Point a bin at its readings: a new decoded one (``decoded``), a settled one (``settled``; None
    drops it, False leaves it as it is). A bin with no part yet gets one. Runs in the caller's
    transaction; ``readings`` lends a writer's remembered readings."""
    readings = readings or Readings(conn)
    row = conn.execute("SELECT marking_id, settled_id FROM bin_parts WHERE bin_id = ?",
                       (bin_id,)).fetchone()
    marking_id = readings.id_for(decoded, text) if decoded is not None else (row[0] if row else None)
    if marking_id is None:
        raise ValueError(f"bin {bin_id} holds no part and no decoded reading was given")
    if settled is False:
        settled_id = row[1] if row else None
    else:
        settled_id = readings.id_for(settled) if settled is not None else None
    shown = settled_id or marking_id
    if row is None:
        conn.execute("INSERT INTO bin_parts (bin_id, marking_id, settled_id, shown_id, package, mounting)"
                     " VALUES (?, ?, ?, ?, ?, ?)", (bin_id, marking_id, settled_id, shown, package, mounting))
    else:
        conn.execute("UPDATE bin_parts SET marking_id = ?, settled_id = ?, shown_id = ?,"
                     " package = COALESCE(?, package), mounting = COALESCE(?, mounting) WHERE bin_id = ?",
                     (marking_id, settled_id, shown, package, mounting, bin_id))


def stored_json(conn: sqlite3.Connection, bin_id: int) -> tuple[Any, ...] | None:
    """(decoded JSON, settled JSON or None) of a bin's part, or None when it holds none."""
    return conn.execute("SELECT d.marking_json, CASE WHEN p.settled_id IS NOT NULL THEN s.marking_json END"
                        " FROM bin_parts p JOIN markings d ON d.id = p.marking_id"
                        " JOIN markings s ON s.id = p.shown_id WHERE p.bin_id = ?", (bin_id,)).fetchone()


__all__ = ["REMEMBERED", "Readings", "marking_json", "set_reading", "stored_json"]
