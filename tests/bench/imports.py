"""Import benchmarks: CSV and XLSX end to end through :func:`stock.intake.import_file`, a very wide
sheet, and the peak memory of a big import, each against a bare baseline.

Baselines (as measured in the shared library notes, table B1/B2): ``csv.reader`` plus one sqlite3
``executemany`` of the same rows into a table of the same width, in one transaction, WAL with
``synchronous=NORMAL``; for XLSX, openpyxl read-only iteration of the same file alone; for the
wide sheet, ``csv.reader`` plus ``json.dumps`` of each row's cells by header (what the import keeps
of every row). The wide sheet's time was once a wall-clock assert in the hostile-file tests; it is
measured here instead.
"""

from __future__ import annotations

import csv
import os
import sqlite3
import subprocess
import sys
import time
from pathlib import Path
from typing import Any

from tests.bench.data import HEADERS, write_csv, write_xlsx
from tests.bench.timing import interleaved, line

REPO = Path(__file__).resolve().parents[2]
TABLES = ("imports", "bins", "parts", "ledger", "source_rows", "flags", "grades")  # foreign-key order


def _fresh(path: Path) -> Path:
    for suffix in ("", "-wal", "-shm"):
        Path(f"{path}{suffix}").unlink(missing_ok=True)
    return path


def import_once(sheet: Path, db: Path) -> Any:
    """Open a fresh store, import the sheet, close (the close includes the WAL checkpoint)."""
    from stock.inventory.intake import import_file
    from stock.store.database import open_store

    store = open_store(_fresh(db))
    try:
        return import_file(store, sheet)
    finally:
        store.close()


def csv_baseline_once(sheet: Path, db: Path) -> None:
    """csv.reader → one executemany into a table as wide as the sheet, one transaction."""
    conn = sqlite3.connect(_fresh(db), isolation_level=None)
    conn.execute("PRAGMA journal_mode = WAL")
    conn.execute("PRAGMA synchronous = NORMAL")
    conn.execute(f"CREATE TABLE sheet ({', '.join(f'c{i} TEXT' for i in range(len(HEADERS)))})")
    with open(sheet, newline="", encoding="utf-8") as fh:
        rows = csv.reader(fh)
        next(rows)
        conn.execute("BEGIN")
        conn.executemany(f"INSERT INTO sheet VALUES ({', '.join('?' * len(HEADERS))})", rows)
        conn.execute("COMMIT")
    conn.close()


def read_only_once(sheet: Path) -> int:
    """The project's own sheet reader alone (no decoding, no store): the floor of reading."""
    from importers.sheet import read_sheets

    return sum(1 for s in read_sheets(sheet) for _ in s.rows)


def storage_floor(imported: Path, db: Path, repeats: int) -> float:
    """Median seconds to write, bare, exactly the rows an import stored (every table, one
    transaction, plain executemany into the real schema): what SQLite itself needs for them."""
    from stock.store.database import open_store

    source = sqlite3.connect(imported)
    tables = {t: source.execute(f"SELECT * FROM {t}").fetchall() for t in TABLES}
    source.close()
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        store = open_store(_fresh(db))
        conn = store.db.conn
        conn.execute("BEGIN IMMEDIATE")
        for t, rows in tables.items():
            if rows:
                conn.executemany(f"INSERT INTO {t} VALUES ({', '.join('?' * len(rows[0]))})", rows)
        conn.execute("COMMIT")
        store.close()
        times.append(time.perf_counter() - start)
    del tables
    return sorted(times)[len(times) // 2]


def csv_import(n: int, work: Path, repeats: int = 3, *, floor: bool = True) -> dict[str, Any]:
    """CSV of ``n`` generated rows: import vs csv + executemany (target ratio ≥ 0.5)."""
    sheet = write_csv(work / f"sheet-{n}.csv", n)
    db, base_db = work / "import.db", work / "baseline.db"
    medians = interleaved({"import": lambda: import_once(sheet, db),
                           "baseline": lambda: csv_baseline_once(sheet, base_db),
                           "read": lambda: read_only_once(sheet)}, repeats)
    report = import_once(sheet, db).sheets[0]
    extra: dict[str, Any] = {"read_seconds": round(medians["read"], 4),
                             "stored": report.stored, "quarantined": report.quarantined,
                             "flagged": report.flagged, "target_ratio": 0.5}
    if floor:
        extra["storage_floor_seconds"] = round(storage_floor(db, work / "floor.db", repeats), 4)
    extra["db_mb"] = round(db.stat().st_size / 1e6, 1)
    return line("csv_import", n, medians["import"], medians["baseline"], **extra)


def openpyxl_once(sheet: Path) -> int:
    """openpyxl read-only iteration of the whole sheet, values only."""
    from openpyxl import load_workbook

    wb = load_workbook(sheet, read_only=True, data_only=True, keep_links=False)
    try:
        return sum(1 for ws in wb.worksheets for _ in ws.iter_rows(values_only=True))
    finally:
        wb.close()


def xlsx_import(n: int, work: Path, repeats: int = 3) -> dict[str, Any]:
    """XLSX of ``n`` generated rows: import vs openpyxl read-only iteration alone."""
    sheet = write_xlsx(work / f"sheet-{n}.xlsx", n)
    db = work / "import-xlsx.db"
    medians = interleaved({"import": lambda: import_once(sheet, db),
                           "baseline": lambda: openpyxl_once(sheet)}, repeats)
    return line("xlsx_import", n, medians["import"], medians["baseline"])


_CHILD = """
import sys, time
from tests.bench.imports import csv_baseline_once, import_once
start = time.perf_counter()
(import_once if sys.argv[1] == "import" else csv_baseline_once)(sys.argv[2], sys.argv[3])
print(time.perf_counter() - start)
"""


def _child(kind: str, sheet: Path, db: Path) -> tuple[float, float]:
    """Run one import (or baseline) in a fresh interpreter; (seconds, peak RSS of children in MB)."""
    import resource

    out = subprocess.run([sys.executable, "-c", _CHILD, kind, str(sheet), str(db)], cwd=REPO,
                         check=True, capture_output=True, text=True,
                         env={**os.environ, "PYTHONPATH": str(REPO)})
    peak_kib = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss  # KiB on Linux
    return float(out.stdout.strip().splitlines()[-1]), peak_kib / 1024


def memory(n: int, work: Path) -> dict[str, Any]:
    """Peak RSS of an ``n``-row CSV import in a subprocess (target < 300 MB).

    ``RUSAGE_CHILDREN`` reports the largest child so far, so the (smaller) baseline runs first and
    no other child runs before it.
    """
    sheet = work / f"sheet-{n}.csv"
    if not sheet.exists():
        write_csv(sheet, n)
    base_seconds, base_mb = _child("baseline", sheet, work / "mem-baseline.db")
    seconds, peak_mb = _child("import", sheet, work / "mem-import.db")
    return line("memory", n, seconds, base_seconds, peak_rss_mb=round(peak_mb, 1),
                baseline_peak_rss_mb=round(base_mb, 1), target_mb=300)


def write_wide_csv(path: Path, rows: int, width: int) -> Path:
    """A bin sheet of ``rows`` rows and ``width`` columns: Location, Marking, Qty, then extras."""
    headers = ["Location", "Marking", "Qty", *[f"Extra {i}" for i in range(4, width + 1)]]
    with open(path, "w", newline="", encoding="utf-8") as fh:
        out = csv.writer(fh)
        out.writerow(headers)
        for r in range(1, rows + 1):
            out.writerow([f"A{r}", "104K", r, *[f"{r}.{c}" for c in range(4, width + 1)]])
    return path


def wide_baseline_once(sheet: Path) -> int:
    """csv.reader and json.dumps of every row as a header → cell mapping: the floor of keeping it."""
    import json

    with open(sheet, newline="", encoding="utf-8") as fh:
        rows = csv.reader(fh)
        headers = next(rows)
        return sum(len(json.dumps(dict(zip(headers, row)))) for row in rows)


def wide_import(width: int, work: Path, repeats: int = 3, rows: int = 3) -> dict[str, Any]:
    """A sheet ``width`` columns wide (a few rows): import vs reading and serialising it bare."""
    sheet = write_wide_csv(work / f"wide-{width}.csv", rows, width)
    db = work / "wide.db"
    import_once(sheet, db)              # warm up: the first import pays for loading the modules
    medians = interleaved({"import": lambda: import_once(sheet, db),
                           "baseline": lambda: wide_baseline_once(sheet)}, repeats)
    report = import_once(sheet, db).sheets[0]
    return line("wide_import", width, medians["import"], medians["baseline"], per=rows * width,
                rows=rows, stored=report.stored)
