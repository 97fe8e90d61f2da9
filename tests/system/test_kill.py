"""Faults in the middle of a write: kill -9 during a kit pull or undo, a read-only file, a full disk.

A kit pull is one transaction: killed at any moment, the next open finds either the whole pull
(every bin taken, plan "pulled") or none of it (every bin as it was, plan still "reserved"), and
SQLite's integrity check passes. Through ``stock import``, a read-only database and a full disk
give one clear line and exit 1, and the database is as it was. (The library-level read-only and
full-disk cases are in tests/system/test_faults.py; the killed import is in tests/system/test_import_crash.py.)

Source: SQLite documentation (sqlite.org): "Atomic Commit In SQLite" and "Write-Ahead Logging"
(an uncommitted transaction is rolled back when the next connection opens the database),
``PRAGMA integrity_check``, ``PRAGMA max_page_count`` (simulates a full disk), the SQLITE_READONLY
result and URI ``mode=ro``. SIGKILL cannot be caught (POSIX signal(7)), so no cleanup code runs.
"""

from __future__ import annotations

import os
import random
import shutil
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import pytest
from typer.testing import CliRunner

import stock.store.database
from stock.store.integrity import check_store
from stock.cli import app
from stock.inventory.intake import import_file
from stock.kitting.planner import KitOptions, plan_kit
from stock.kitting.stored_plans import pull_plan, undo_pull
from stock.store.database import open_store
from tests.helpers_procs import ledger_mismatches, scaled, table_counts, write_bin_sheet, write_bom

ROOT = Path(__file__).resolve().parents[2]
ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1"}
BINS, EACH = 300, 5

# The child pulls the plan. With a pause after each bin's movement (sleep_s > 0) the pull lasts
# long enough to be killed mid-transaction for sure: the marker is written after the first
# movement, before the commit. With no pause, the kill lands wherever the timer says.
CHILD = r"""
import sys, time
from pathlib import Path
import stock.store.database
from stock.kitting.stored_plans import pull_plan, undo_pull
from stock.store.database import open_store

db, plan, marker, sleep_s = sys.argv[1], sys.argv[2], Path(sys.argv[3]), float(sys.argv[4])
action = {"pull": pull_plan, "undo": undo_pull}[sys.argv[5]]
store = open_store(db)
if sleep_s:
    original = stock.store.database.Store.move
    def slow_move(self, *args, **kwargs):
        new = original(self, *args, **kwargs)
        if not marker.exists():
            marker.write_text("moving")
        time.sleep(sleep_s)
        return new
    stock.store.database.Store.move = slow_move
else:
    marker.write_text("opened")
action(store, plan)
Path(str(marker) + ".done").write_text("done")
"""


@pytest.fixture
def planned(tmp_path) -> tuple[Path, int]:
    """A store with BINS bins of EACH parts and one plan reserving every one of them."""
    db = tmp_path / "stock.db"
    with open_store(db) as store:
        import_file(store, write_bin_sheet(tmp_path / "shelf.csv",
                                           [(f"S{i}", "104K", EACH) for i in range(BINS)]))
        plan = plan_kit(store, write_bom(tmp_path / "bom.csv"), KitOptions(boards=BINS * EACH))
        assert sum(a.qty for line in plan.lines for a in line.allocations) == BINS * EACH
    return db, plan.id


def _start(db: Path, plan: int, marker: Path, sleep_s: float, action: str = "pull") -> subprocess.Popen:
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    return subprocess.Popen([sys.executable, "-c", CHILD, str(db), str(plan), str(marker),
                             str(sleep_s), action], env=env)


def _wait_for(marker: Path, child: subprocess.Popen, seconds: float = 60) -> None:
    deadline = time.monotonic() + seconds
    while not marker.exists() and child.poll() is None and time.monotonic() < deadline:
        time.sleep(0.005)
    assert marker.exists(), "the child never started pulling"


def _kill(child: subprocess.Popen, *, may_have_finished: bool = False) -> None:
    child.send_signal(signal.SIGKILL)
    child.wait(timeout=30)
    # a child that ended between the caller's poll() and the signal exits 0
    assert child.returncode == -signal.SIGKILL or (may_have_finished and child.returncode == 0), \
        child.returncode


def _state(db: Path, plan: int) -> dict:
    with open_store(db) as store:
        assert store.one("PRAGMA integrity_check")["integrity_check"] == "ok"
        report = check_store(store)
        assert report.ok, report.problems
        assert ledger_mismatches(store) == []
        state = {
            "status": store.one("SELECT status FROM plans WHERE id = ?", (plan,))["status"],
            "pull_rows": store.one("SELECT COUNT(*) AS n FROM ledger WHERE kind = 'pull'")["n"],
            "on_hand": store.one("SELECT SUM(on_hand) AS n FROM bins")["n"],
        }
        undo_rows = store.one("SELECT COUNT(*) AS n FROM ledger WHERE kind = 'undo'")["n"]
        if undo_rows:
            state["undo_rows"] = undo_rows
        return state


NOTHING_PULLED = {"status": "reserved", "pull_rows": 0, "on_hand": BINS * EACH}
ALL_PULLED = {"status": "pulled", "pull_rows": BINS, "on_hand": 0}


def test_a_pull_killed_midway_leaves_every_bin_as_it_was_and_pulls_whole_afterwards(tmp_path, planned):
    db, plan = planned
    marker = tmp_path / "started"
    child = _start(db, plan, marker, sleep_s=0.003)
    _wait_for(marker, child)
    time.sleep(0.2)                    # well inside the pull: BINS × 3 ms of movements remain
    assert child.poll() is None, "the pull finished before it was killed"
    _kill(child)
    assert not Path(str(marker) + ".done").exists()
    assert _state(db, plan) == NOTHING_PULLED

    with open_store(db) as store:      # and the same plan pulls whole, once, afterwards
        done = pull_plan(store, plan)
        assert len(done.moves) == BINS
    assert _state(db, plan) == ALL_PULLED


def test_an_undo_killed_midway_leaves_the_plan_pulled_and_undoes_whole_afterwards(tmp_path, planned):
    db, plan = planned
    with open_store(db) as store:
        pull_plan(store, plan)
    marker = tmp_path / "started"
    child = _start(db, plan, marker, sleep_s=0.003, action="undo")
    _wait_for(marker, child)
    time.sleep(0.2)
    assert child.poll() is None, "the undo finished before it was killed"
    _kill(child)
    assert _state(db, plan) == ALL_PULLED

    with open_store(db) as store:
        undo_pull(store, plan)
    assert _state(db, plan) == {"status": "returned", "pull_rows": BINS, "on_hand": BINS * EACH,
                                "undo_rows": BINS}


@pytest.mark.slow
def test_a_pull_killed_at_random_moments_is_always_all_or_nothing(tmp_path, planned):
    db, plan = planned        # closed: the WAL is checkpointed into the file, so a copy is whole
    rng = random.Random(12)
    for attempt in range(scaled(4)):
        trial = tmp_path / f"trial{attempt}.db"
        shutil.copyfile(db, trial)
        marker = tmp_path / f"moving{attempt}"
        child = _start(trial, plan, marker, sleep_s=0.0002)   # ~0.1 s of movements, then commit
        _wait_for(marker, child)
        time.sleep(rng.uniform(0, 0.2))
        _kill(child, may_have_finished=True)
        state = _state(trial, plan)
        assert state in (NOTHING_PULLED, ALL_PULLED), state
        if state == NOTHING_PULLED:
            # nothing half-done is left behind: the same plan pulls in full afterwards
            with open_store(trial) as store:
                pull_plan(store, plan)
            assert _state(trial, plan) == ALL_PULLED


def _sheet(tmp_path: Path, rows: int = 2000) -> Path:
    return write_bin_sheet(tmp_path / "new.csv", [(f"N{i}", "472J", i % 50) for i in range(rows)])


@pytest.fixture
def stocked(tmp_path) -> Path:
    db = tmp_path / "stock.db"
    with open_store(db) as store:
        import_file(store, write_bin_sheet(tmp_path / "old.csv", [("E1", "104K", 10), ("E2", "472J", 4)]))
    return db


def _fingerprint(db: Path) -> dict[str, int]:
    with open_store(db) as store:
        assert check_store(store).ok
        return table_counts(store)


def test_a_full_disk_during_a_cli_import_says_so_and_keeps_the_database(tmp_path, stocked, monkeypatch):
    before = _fingerprint(stocked)
    real_open = stock.store.database.open_store

    def open_with_little_room(path, **kwargs):
        store = real_open(path, **kwargs)
        pages = store.one("PRAGMA page_count")["page_count"]
        store.db.conn.execute(f"PRAGMA max_page_count = {pages + 2}")
        return store

    monkeypatch.setattr(stock.store.database, "open_store", open_with_little_room)
    result = CliRunner().invoke(app, ["--db", str(stocked), "import", str(_sheet(tmp_path))], env=ENV)
    monkeypatch.undo()
    assert result.exit_code == 1, result.output
    (line,) = result.stderr.strip().splitlines()
    assert line == (f"stock: {stocked}: the disk (or the database's size limit) is full;"
                    " nothing of this change was written; free space and run it again")
    assert "Traceback" not in result.output
    assert _fingerprint(stocked) == before


def test_a_read_only_database_refuses_a_cli_import_with_one_line(tmp_path, stocked, monkeypatch):
    before = _fingerprint(stocked)
    real_connect = sqlite3.connect

    def connect_read_only(name, *args, **kwargs):
        # what SQLite does with a file it may not write (even as root, who ignores permissions)
        return real_connect(f"file:{name}?mode=ro", *args, uri=True, **kwargs)

    monkeypatch.setattr(sqlite3, "connect", connect_read_only)
    result = CliRunner().invoke(app, ["--db", str(stocked), "import", str(_sheet(tmp_path, 20))], env=ENV)
    monkeypatch.undo()
    assert result.exit_code == 1, result.output
    assert result.stderr.strip().splitlines() == [
        f"stock: {stocked}: the database file is read-only; use a copy you may write to,"
        " or fix the file's permissions"]
    assert _fingerprint(stocked) == before


@pytest.mark.skipif(os.geteuid() == 0, reason="root writes through file permissions")
def test_a_database_file_without_write_permission_refuses_a_cli_import(tmp_path, stocked):
    before = _fingerprint(stocked)
    stocked.chmod(0o444)
    try:
        result = CliRunner().invoke(app, ["--db", str(stocked), "import", str(_sheet(tmp_path, 20))], env=ENV)
    finally:
        stocked.chmod(0o644)
    assert result.exit_code == 1, result.output
    assert "the database file is read-only" in result.stderr
    assert _fingerprint(stocked) == before
