"""Header mappings kept in the store, per header signature, so a sheet's mapping is given once.

A mapping given with ``--map`` (or found by content and kept with ``--keep-mapping``) is saved
for the sheet's *header signature*: its headers, cleaned as the header mapper cleans them, in
column order. The next import of a sheet with the same headers uses it as if it had been given
again, and the printed mapping says ``remembered``. ``--forget-mapping`` drops it first.

>>> header_signature(["Bin #", " Qty_on-hand "]) == header_signature(["bin #", "QTY ON HAND"])
True
"""

from __future__ import annotations

import hashlib
import json
from typing import Any, Sequence

from importers.headers import normalise
from stock.store.database import Store, now


def header_signature(headers: Sequence[str]) -> str:
    """A short digest of the cleaned headers, in order (two sheets with the same headers share it)."""
    joined = "\x1f".join(normalise(h) for h in headers)
    return hashlib.sha256(joined.encode("utf-8")).hexdigest()[:32]


def remembered_mapping(store: Store, headers: Sequence[str], vocabulary: str = "bins") -> dict[str, str]:
    """The mapping {field: header} kept for these headers, or {} when none is."""
    row = store.one("SELECT mapping_json FROM remembered_mappings WHERE signature = ? AND vocabulary = ?",
                    (header_signature(headers), vocabulary))
    return dict(json.loads(row["mapping_json"])) if row else {}


def remember_mapping(store: Store, headers: Sequence[str], header_map: Any,
                     vocabulary: str = "bins") -> dict[str, str]:
    """Keep a sheet's mapping (every field given a column) for its headers; returns what was kept.

    Runs inside the caller's transaction (the import's), so a rolled-back import keeps nothing.
    """
    mapping = {name: header_map.headers[i] for name, i in header_map.field_to_index.items()}
    store.db.conn.execute(
        "INSERT INTO remembered_mappings (signature, vocabulary, headers_json, mapping_json, saved_at)"
        " VALUES (?, ?, ?, ?, ?) ON CONFLICT(signature) DO UPDATE SET vocabulary = excluded.vocabulary,"
        " headers_json = excluded.headers_json, mapping_json = excluded.mapping_json,"
        " saved_at = excluded.saved_at",
        (header_signature(headers), vocabulary, json.dumps(list(headers), ensure_ascii=False),
         json.dumps(mapping, ensure_ascii=False), now()))
    return mapping


def forget_mapping(store: Store, headers: Sequence[str]) -> bool:
    """Drop the mapping kept for these headers; True when there was one."""
    cur = store.db.conn.execute("DELETE FROM remembered_mappings WHERE signature = ?",
                                (header_signature(headers),))
    return cur.rowcount > 0


__all__ = ["forget_mapping", "header_signature", "remember_mapping", "remembered_mapping"]
