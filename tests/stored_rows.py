"""Bins written into a test store the way the importer writes them.

Tests that need a part with exactly stated facts (a hand-built :class:`~stock.decoded.Marking`)
store it through the importer's one column mapping, :func:`stock.inventory.row_reading.part_columns`, so a
change to that mapping reaches these tests too; the count arrives as one ``import`` movement in
the ledger, as a new bin's count does at import.
"""

from __future__ import annotations

import json

from stock.decoded import Marking
from stock.inventory.row_reading import PART_COLUMNS, part_columns
from stock.store.database import Store, now

_INSERT_PART = (f"INSERT INTO parts (bin_id, marking, {', '.join(PART_COLUMNS)}, decoded_json)"
                f" VALUES ({', '.join('?' * (len(PART_COLUMNS) + 3))})")


def store_bin(store: Store, key: str, marking: Marking, on_hand: int | None = None, *,
              location: str | None = None, label: str | None = None, cabinet: str | None = None,
              minimum: int | None = None) -> int:
    """One bin holding one part; returns the bin id. ``on_hand=None`` leaves the count unknown."""
    stamp = now()
    with store.writing() as db:
        bin_id = db.conn.execute(
            "INSERT INTO bins (bin_key, label, location, cabinet, minimum, created_at, updated_at)"
            " VALUES (?,?,?,?,?,?,?)", (key, label, location, cabinet, minimum, stamp, stamp)).lastrowid
        db.conn.execute(_INSERT_PART, (bin_id, marking.text, *part_columns(marking),
                                       json.dumps(marking.to_json(), ensure_ascii=False)))
        if on_hand is not None:
            store.move(bin_id, on_hand, "import")
    return bin_id
