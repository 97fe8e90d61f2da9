"""Decisions written to the store: the deciding person, the zero-quantity ledger note, closed flags.

Rules are the project's own (DEVELOPERS.md: the ledger is append-only; a decision says nothing about
how many parts there are, so its movement is zero and the count stays as it was).
"""

from __future__ import annotations

import csv
import json

import pytest

from stock.inventory.intake import import_file
from stock.store.flag_records import close_flags, ledger_note, who


def _import(store, tmp_path, rows):
    path = tmp_path / "shelf.csv"
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(["Location", "Marking", "Qty"])
        w.writerows(rows)
    import_file(store, path)


@pytest.mark.parametrize("by, env, expected", [
    pytest.param("kim", {"USER": "lee"}, "kim", id="by-wins"),
    pytest.param(None, {"USER": "lee"}, "lee", id="the-login-name"),
    pytest.param(None, {"USERNAME": "sam"}, "sam", id="the-windows-login-name"),
    pytest.param(None, {}, "unknown", id="nobody-known"),
    pytest.param("", {}, "unknown", id="empty-by-is-not-a-name"),
])
def test_who_is_the_given_name_else_the_login_else_unknown(monkeypatch, by, env, expected):
    monkeypatch.delenv("USER", raising=False)
    monkeypatch.delenv("USERNAME", raising=False)
    for k, v in env.items():
        monkeypatch.setenv(k, v)
    assert who(by) == expected


def test_a_ledger_note_moves_no_parts_and_keeps_the_unknown_count_unknown(store, tmp_path):
    _import(store, tmp_path, [["B1", "104", ""]])          # blank quantity = not counted
    bin_id = store.one("SELECT id FROM bins")["id"]
    with store.writing():
        lid = ledger_note(store, bin_id, "settle", "flag 1", {"reading": 0, "ä": "ü"}, "kim")
    row = store.one("SELECT * FROM ledger WHERE id = ?", (lid,))
    assert (row["delta"], row["kind"], row["ref"], row["actor"]) == (0, "settle", "flag 1", "kim")
    assert json.loads(row["note"]) == {"reading": 0, "ä": "ü"}
    assert store.one("SELECT on_hand FROM bins WHERE id = ?", (bin_id,))["on_hand"] is None


def test_closing_flags_settles_only_those_named_and_records_the_decision(store, tmp_path):
    _import(store, tmp_path, [["B1", "104", ""], ["B2", "472", ""]])   # two unknown-quantity flags
    flags = store.rows("SELECT id FROM flags WHERE kind = 'unknown-quantity' ORDER BY id")
    assert len(flags) == 2
    with store.writing():
        close_flags(store, [flags[0]["id"]], {"count": 12, "by": "kim"})
    first, second = store.rows("SELECT * FROM flags WHERE kind = 'unknown-quantity' ORDER BY id")
    assert first["status"] == "settled" and first["closed_at"]
    assert json.loads(first["decision_json"]) == {"count": 12, "by": "kim"}
    assert second["status"] == "open" and second["decision_json"] is None
