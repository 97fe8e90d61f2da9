"""Decisions written to the store: who decided, the ledger note that records it, flags closed.

Every human decision (a settled reading, a merge, a note) goes through these three, inside the
caller's write transaction, so the ledger and the flags table always tell the same story.
"""

from __future__ import annotations

import json
import os
from collections.abc import Iterable
from typing import Any

from stock.store.database import Store, now


def who(by: str | None = None) -> str:
    """The person deciding: ``--by``, else the login name, else "unknown"."""
    return by or os.environ.get("USER") or os.environ.get("USERNAME") or "unknown"


def ledger_note(store: Store, bin_id: int, kind: str, ref: str, note: dict[str, Any],
                actor: str) -> int:
    """A movement of zero parts that records a decision; returns its ledger id.

    Written directly rather than through :meth:`Store.move`, which would turn an unknown
    quantity (NULL) into 0: a decision about a marking says nothing about how many there are.
    """
    cur = store.db.conn.execute(
        "INSERT INTO ledger (bin_id, delta, kind, ref, note, actor, at) VALUES (?, 0, ?, ?, ?, ?, ?)",
        (bin_id, kind, ref, json.dumps(note, default=str, ensure_ascii=False), actor, now()))
    return int(cur.lastrowid)


def close_flags(store: Store, flag_ids: Iterable[int], decision: dict[str, Any]) -> None:
    """Mark flags settled with the decision that settled them (inside a write transaction)."""
    stamp = now()
    text = json.dumps(decision, default=str, ensure_ascii=False)
    for fid in flag_ids:
        store.db.conn.execute(
            "UPDATE flags SET status = 'settled', closed_at = ?, decision_json = ? WHERE id = ?",
            (stamp, text, fid))


__all__ = ["close_flags", "ledger_note", "who"]
