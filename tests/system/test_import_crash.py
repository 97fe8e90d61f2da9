"""An import killed midway leaves the database as it was: intact, and the file all in or all out.

Sources: SQLite's atomic commit with a write-ahead log (sqlite.org, "Atomic Commit In SQLite"
and "Write-Ahead Logging"): a transaction not committed when the process dies is rolled back on
the next open. "104" = 100 nF per IEC 60062 is only the content of the generated sheet.
"""

from __future__ import annotations

import csv
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

from stock.store.database import open_store

ROWS = 20_000
CHILD = """
import sys
from pathlib import Path
from stock.inventory.intake import import_file
from stock.store.database import open_store

marker = Path(sys.argv[3])

def progress(done):
    if done and not marker.exists():
        marker.write_text(str(done))

with open_store(sys.argv[1]) as store:
    import_file(store, sys.argv[2], progress=progress)
Path(sys.argv[3] + ".done").write_text("finished")
"""


def _big_sheet(path: Path, rows: int, prefix: str = "R") -> Path:
    codes = ["104", "472", "4n7", "100pF", "223K", "1n5 C0G", "2.2uF 50V", "331"]
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(["Location", "Marking", "Qty"])
        for i in range(rows):
            w.writerow([f"{prefix}{i}", codes[i % len(codes)], i % 97])
    return path


def _run_and_kill(db: Path, sheet: Path, marker: Path) -> bool:
    """Start an import, kill -9 it once rows are flowing; True if it was killed before finishing."""
    env = dict(os.environ, PYTHONPATH=str(Path(__file__).resolve().parents[2]))
    child = subprocess.Popen([sys.executable, "-c", CHILD, str(db), str(sheet), str(marker)], env=env)
    try:
        deadline = time.monotonic() + 120
        while not marker.exists() and child.poll() is None and time.monotonic() < deadline:
            time.sleep(0.01)
        killed_midway = child.poll() is None
        child.send_signal(signal.SIGKILL)
    finally:
        child.wait()
    return killed_midway and not Path(str(marker) + ".done").exists()


def test_killing_an_import_midway_leaves_the_database_intact_and_the_file_all_out(tmp_path):
    db = tmp_path / "stock.db"
    with open_store(db) as store:  # a store with earlier stock in it, to be kept
        from stock.inventory.intake import import_file
        import_file(store, _big_sheet(tmp_path / "earlier.csv", 50, prefix="E"))
    sheet = _big_sheet(tmp_path / "big.csv", ROWS)
    assert _run_and_kill(db, sheet, tmp_path / "started"), "the import finished before it was killed"
    with open_store(db) as store:
        assert store.one("PRAGMA integrity_check")["integrity_check"] == "ok"
        assert store.one("PRAGMA foreign_key_check") is None
        assert store.one("SELECT COUNT(*) AS n FROM imports WHERE file_name = 'big.csv'")["n"] == 0
        assert store.one("SELECT COUNT(*) AS n FROM source_rows")["n"] == 50
        assert store.one("SELECT COUNT(*) AS n FROM bins")["n"] == 50
        ledger = store.one("SELECT COALESCE(SUM(delta), 0) AS n FROM ledger")["n"]
        on_hand = store.one("SELECT COALESCE(SUM(on_hand), 0) AS n FROM bins")["n"]
        assert ledger == on_hand
        # and the same file imports whole afterwards
        from stock.inventory.intake import import_file
        (report,) = import_file(store, sheet).sheets
        assert report.rows == ROWS and report.stored + report.quarantined == ROWS
