"""`stock check` finds what a damaged or tampered database hides.

Sources: SQLite documentation for PRAGMA integrity_check and foreign_key_check (sqlite.org); the
ledger-equals-on-hand rule is this project's own promise (common practice in stock-keeping, no
published source).
"""

from __future__ import annotations

from stock.store.integrity import check_store


def _bin(store, key="cab/A1"):
    with store.writing() as db:
        return db.conn.execute(
            "INSERT INTO bins (bin_key, created_at, updated_at) VALUES (?, 'now', 'now')", (key,)
        ).lastrowid


def test_a_consistent_database_checks_ok(store):
    b = _bin(store)
    with store.writing():
        store.move(b, 5, "import")
    report = check_store(store)
    assert report.ok and report.problems == ()
    assert report.checked == {"bins": 1, "ledger": 1}


def test_an_on_hand_changed_behind_the_ledger_is_reported_in_words(store):
    b = _bin(store)
    with store.writing():
        store.move(b, 5, "import")
    store.db.conn.execute("UPDATE bins SET on_hand = 9 WHERE id = ?", (b,))
    report = check_store(store)
    assert report.problems == ("bin cab/A1 says 9 on hand but its ledger sums to 5",)


def test_orphan_rows_are_reported_when_foreign_keys_were_off(store):
    store.db.conn.execute("PRAGMA foreign_keys = OFF")
    store.db.conn.execute("INSERT INTO reservations (plan_id, line_id, bin_id, qty) VALUES (99, 1, 98, 2)")
    problems = " | ".join(check_store(store).problems)
    assert "1 reservation(s) belong to no plan (reservations.plan_id)" in problems
    assert "1 reservation(s) name a bin that does not exist (reservations.bin_id)" in problems


def test_a_pulled_plan_without_its_pull_movements_is_reported(store):
    b = _bin(store)
    with store.writing() as db:
        store.move(b, 5, "import")
        db.conn.execute("INSERT INTO plans (id, created_at, boards, status) VALUES (1, 'now', 1, 'pulled')")
        db.conn.execute("INSERT INTO plan_lines (id, plan_id, line_no, need) VALUES (1, 1, 1, 2)")
        db.conn.execute("INSERT INTO reservations (plan_id, line_id, bin_id, qty) VALUES (1, 1, ?, 2)", (b,))
    assert check_store(store).problems == (
        "plan 1 is marked pulled but its pull movements take 0 parts, not the 2 it reserved",)
