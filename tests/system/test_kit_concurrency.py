"""Two processes at once: a plan is pulled once, and two planners never promise the same parts.

Sources: SQLite documentation on BEGIN IMMEDIATE and WAL (sqlite.org, "Transaction" and
"Write-Ahead Logging"): one writer at a time, a second waits on the busy timeout. The ledger
rules (one pull per plan, never negative stock) are common practice in stock-keeping, no
published source.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

from stock.kitting.planner import KitOptions, plan_kit
from stock.store.database import open_store
from tests.helpers_procs import ready_file, start_when_ready
from tests.kitting.test_planner import add_bin, bom, ledger_sum, line, on_hand, part

# Each child waits for the go file, then acts; the parent starts both before releasing them,
# so both are inside the same moment when they reach the database.
CHILD = r"""
import json, sys, time
from pathlib import Path
from stock.errors import StockError
from stock.store.database import open_store
from stock.kitting import planner as kit
from stock.kitting import stored_plans as kit_plans

db, action, arg, go = sys.argv[1:5]
store = open_store(db)
Path(sys.argv[5]).write_text("ready")
while not Path(go).exists():
    time.sleep(0.002)
try:
    if action == "pull":
        done = kit_plans.pull_plan(store, arg)
        print(json.dumps({"ok": True, "moves": done.moves}))
    else:
        plan = kit.plan_kit(store, arg, kit.KitOptions(boards=10))
        print(json.dumps({"ok": True, "plan": plan.id,
                          "taken": sum(a.qty for l in plan.lines for a in l.allocations)}))
except StockError as exc:
    print(json.dumps({"ok": False, "error": str(exc)}))
"""


def _race(db: Path, action: str, args: list[str], go: Path) -> list[dict]:
    names = [f"child{i}" for i in range(len(args))]
    children = [subprocess.Popen([sys.executable, "-c", CHILD, str(db), action, arg, str(go),
                                  str(ready_file(go, name))],
                                 stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
                for arg, name in zip(args, names)]
    start_when_ready(go, names, children)   # both have imported and opened the store
    results = []
    for child in children:
        out, err = child.communicate(timeout=60)
        assert child.returncode == 0, err
        results.append(json.loads(out.strip().splitlines()[-1]))
    return results


@pytest.mark.parametrize("attempt", range(3))
def test_two_processes_pulling_one_plan_pull_it_exactly_once(tmp_path, attempt):
    db = tmp_path / "stock.db"
    store = open_store(db)
    a1 = add_bin(store, "cab/A1", "A1", part("104K", 100000, tol="10"), 25)
    a2 = add_bin(store, "cab/A2", "A2", part("104K", 100000, tol="10"), 30)
    kit = plan_kit(store, bom(line("C1 C2", 2, tol_pct=10)), KitOptions(boards=20))
    store.close()

    results = _race(db, "pull", [str(kit.id), str(kit.id)], tmp_path / "go")

    assert sorted(r["ok"] for r in results) == [False, True]
    refused = next(r for r in results if not r["ok"])
    assert refused["error"].startswith(f"cannot pull plan {kit.id}: it was already pulled at ")
    store = open_store(db)
    assert on_hand(store, a1) + on_hand(store, a2) == 55 - 40
    for bin_id in (a1, a2):
        assert ledger_sum(store, bin_id) == on_hand(store, bin_id)
    assert store.one("SELECT COUNT(*) AS n FROM ledger WHERE kind = 'pull'")["n"] == 2
    assert store.one("SELECT status FROM plans WHERE id = ?", (kit.id,))["status"] == "pulled"
    store.close()


def test_two_processes_planning_at_once_never_promise_the_same_parts(tmp_path):
    db = tmp_path / "stock.db"
    store = open_store(db)
    a1 = add_bin(store, "cab/A1", "A1", part("104K", 100000, tol="10"), 15)
    store.close()
    bom_file = tmp_path / "bom.csv"
    bom_file.write_text("Refs,Qty,Value,Tolerance\nC1,1,100n,10%\n", encoding="utf-8")

    results = _race(db, "plan", [str(bom_file), str(bom_file)], tmp_path / "go")

    assert all(r["ok"] for r in results)
    assert sorted(r["taken"] for r in results) == [5, 10]
    store = open_store(db)
    assert store.reserved(a1) == 15 and store.available(a1) == 0
    store.close()
