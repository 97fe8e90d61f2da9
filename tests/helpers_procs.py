"""Helpers for the fault and concurrency suites: run length, child processes, store facts.

The workers below run in child processes (multiprocessing "spawn" context, so each starts a
fresh interpreter and opens its own store, as a second user at the shop would). They live in
an importable module because "spawn" pickles a worker by its module and name.

Run length: ``scaled(n)`` gives ``n`` normally and ``n * STOCK_SLOW`` when the environment sets
``STOCK_SLOW`` (e.g. ``STOCK_SLOW=10 pytest -m slow``), so CI runs the short form and a
long soak needs no code change. Source: common practice in fuzzing, no published source.
"""

from __future__ import annotations

import csv
import json
import os
import random
import time
from pathlib import Path
from collections.abc import Iterable, Sequence
from typing import Any


def slow_factor() -> int:
    """The multiplier for long runs (env STOCK_SLOW, default 1)."""
    try:
        return max(1, int(os.environ.get("STOCK_SLOW", "1")))
    except ValueError:
        return 1


def scaled(n: int) -> int:
    """``n`` for the short form, ``n × STOCK_SLOW`` for a long run."""
    return n * slow_factor()


def write_sheet(path: Path, headers: Sequence[str], rows: Iterable[Sequence[Any]]) -> Path:
    """A CSV sheet (a bin sheet or a BOM): the header row, then the rows."""
    with open(path, "w", newline="", encoding="utf-8") as fh:
        out = csv.writer(fh)
        out.writerow(headers)
        out.writerows(rows)
    return path


def write_bin_sheet(path: Path, rows: list[tuple[str, str, Any]], *,
                    headers: tuple[str, ...] = ("Location", "Marking", "Qty")) -> Path:
    """A CSV bin sheet of (location, marking, quantity) rows."""
    return write_sheet(path, headers, rows)


def write_bom(path: Path, qty_per_board: int = 1, value: str = "100n", tolerance: str = "10%") -> Path:
    """A one-line capacitor BOM."""
    path.write_text(f"Refs,Qty,Value,Tolerance\nC1,{qty_per_board},{value},{tolerance}\n",
                    encoding="utf-8")
    return path


def ledger_mismatches(store: Any) -> list[dict[str, Any]]:
    """Bins whose on-hand differs from the sum of their ledger movements (should be none)."""
    return store.rows(
        "SELECT b.bin_key, b.on_hand, COALESCE(SUM(l.delta), 0) AS total FROM bins b"
        " LEFT JOIN ledger l ON l.bin_id = b.id GROUP BY b.id"
        " HAVING COALESCE(b.on_hand, 0) != total")


def table_counts(store: Any) -> dict[str, int]:
    """Rows per table: a fingerprint that an unchanged store keeps."""
    names = ("bins", "parts", "ledger", "imports", "source_rows", "flags", "plans", "plan_lines",
             "reservations", "grades")
    return {n: store.one(f"SELECT COUNT(*) AS n FROM {n}")["n"] for n in names}


def ready_file(go: str | Path, name: str) -> Path:
    """The file a child writes once it is ready for the start signal ``go``."""
    return Path(f"{go}.{name}.ready")


def start_when_ready(go: str | Path, names: list[str], children: list[Any] = (),
                     seconds: float = 120) -> None:
    """Wait until every named child has written its ready file, then write ``go``.

    Polls every 5 ms instead of sleeping a fixed time, and fails at once if a child has died
    (``children``: Popen objects or multiprocessing Processes) or after ``seconds``.
    """
    deadline = time.monotonic() + seconds
    waiting = [ready_file(go, n) for n in names]
    while not all(p.exists() for p in waiting):
        ended = [c for c in children if (c.poll() if hasattr(c, "poll") else c.exitcode) is not None]
        assert not ended, f"a child ended before it was ready: {ended}"
        assert time.monotonic() < deadline, f"children never ready: {[p.name for p in waiting if not p.exists()]}"
        time.sleep(0.005)
    Path(go).write_text("go")


def _log(path: Path, record: dict[str, Any]) -> None:
    with open(path, "a", encoding="utf-8") as fh:
        fh.write(json.dumps(record) + "\n")


def import_worker(db: str, folder: str, name: str, seconds: float, go: str, log: str) -> None:
    """Import edited versions of one cabinet's sheet again and again until time is up.

    Each version changes every count, so each import writes count movements to the ledger.
    The cabinet is the worker's own (the file name), and its values (4.7 nF) are not the ones the
    kit workers plan for, so kits never reserve what an import recounts.
    """
    from stock.errors import StockError
    from stock.inventory.intake import import_file
    from stock.store.database import open_store

    rng = random.Random(name)
    store = open_store(db)

    def one_import(version: int) -> None:
        sheet = Path(folder) / f"{name}-v{version}" / f"{name}.csv"
        sheet.parent.mkdir()
        write_bin_sheet(sheet, [(f"B{i}", "4n7 J 100V", rng.randrange(0, 50)) for i in range(40)])
        try:
            report = import_file(store, sheet)
            _log(Path(log), {"who": name, "import": version, "stored": report.sheets[0].stored})
        except StockError as exc:
            _log(Path(log), {"who": name, "import": version, "error": str(exc)})

    one_import(0)      # before the start: the cabinet exists, so every later import recounts
    ready_file(go, name).write_text("ready")
    while not Path(go).exists():
        time.sleep(0.005)
    end = time.monotonic() + seconds
    version = 0
    while time.monotonic() < end:
        version += 1
        one_import(version)
    store.close()


def kit_worker(db: str, bom: str, name: str, seconds: float, go: str, log: str) -> None:
    """Plan small kits from the shared bins and pull them, racing the other kit worker.

    Each round plans a kit, then tries to pull its own plan and one recent plan of anyone's
    (so two workers often pull the same plan at once), sometimes undoes or drops one. Every
    successful pull is logged with its plan id.
    """
    from stock.errors import StockError
    from stock.kitting.planner import KitOptions, plan_kit
    from stock.kitting.stored_plans import drop_plan, pull_plan, undo_pull
    from stock.store.database import open_store

    rng = random.Random(name)
    store = open_store(db)
    ready_file(go, name).write_text("ready")
    while not Path(go).exists():
        time.sleep(0.005)
    end = time.monotonic() + seconds
    while time.monotonic() < end:
        try:
            plan = plan_kit(store, bom, KitOptions(boards=rng.randrange(1, 4)))
            _log(Path(log), {"who": name, "planned": plan.id})
        except StockError as exc:
            _log(Path(log), {"who": name, "error": str(exc)})
            continue
        latest = store.one("SELECT MAX(id) AS n FROM plans")["n"]
        targets = [plan.id, rng.randrange(max(1, latest - 3), latest + 1)]
        for target in targets:
            try:
                done = pull_plan(store, target, actor=name)
                _log(Path(log), {"who": name, "pulled": done.plan,
                                 "moves": [list(m) for m in done.moves]})
            except StockError as exc:
                _log(Path(log), {"who": name, "refused": target, "error": str(exc)})
        try:
            if rng.random() < 0.3:
                undo_pull(store, plan.id, actor=name)
                _log(Path(log), {"who": name, "undone": plan.id})
            elif rng.random() < 0.3:
                drop_plan(store, latest)
                _log(Path(log), {"who": name, "dropped": latest})
        except StockError as exc:
            _log(Path(log), {"who": name, "error": str(exc)})
    store.close()


__all__ = ["import_worker", "kit_worker", "ledger_mismatches", "ready_file", "scaled", "slow_factor",
           "start_when_ready", "table_counts", "write_bin_sheet", "write_bom"]
