"""`stock kit`: plan, show, picklist, pull, undo, drop through the command line.

Sources: the JSON shape is this project's own contract (README); allocation rules are common
practice, no published source; tolerance letter K = ±10 % from IEC 60062; X2 class from
IEC 60384-14; exit codes follow the project's rule (1 bad data, 2 bad usage).
"""

from __future__ import annotations

import json

import pytest
from typer.testing import CliRunner

from stock.cli import app
from stock.store.database import open_store
from tests.kitting.test_planner import add_bin, on_hand, part

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1"}
runner = CliRunner()


@pytest.fixture
def shop(tmp_path):
    """A small shop database and a BOM for five boards of an invented amplifier."""
    db = tmp_path / "stock.db"
    store = open_store(db)
    ids = {
        "A2": add_bin(store, "cab/A2", "A2", part("104K 50V", 100000, tol="10", volts=50), 6),
        "A10": add_bin(store, "cab/A10", "A10", part("104K 50V", 100000, tol="10", volts=50), 20),
        "B1": add_bin(store, "cab/B1", "B1", part("473K 630V", 47000, tol="10", volts=630), 50),
    }
    store.close()
    bom = tmp_path / "amp.csv"
    bom.write_text("Designator,Qty,Value,Tolerance,Voltage\n"
                   '"C1,C2",2,100n,10%,50V\n'
                   "CX1,1,100n,,275VAC X2\n"
                   "R1,1,10k,,\n", encoding="utf-8")
    return db, bom, ids


def run(db, *args):
    return runner.invoke(app, ["--db", str(db), "kit", *args], env=ENV)


def test_every_kit_command_has_help_with_an_example():
    for command in ("plan", "show", "picklist", "pull", "undo", "drop"):
        result = runner.invoke(app, ["kit", command, "--help"], env=ENV)
        assert result.exit_code == 0, command
        assert "Example" in result.stdout and f"stock kit {command}" in result.stdout, command


def test_plan_json_follows_the_contract(shop):
    db, bom, _ = shop
    result = run(db, "plan", str(bom), "--boards", "5", "--json")
    assert result.exit_code == 0, result.stderr
    data = json.loads(result.stdout)
    assert data["plan"] == 1 and data["boards"] == 5
    first, mains = data["lines"]
    assert first["refs"] == ["C1", "C2"] and first["need"] == 10
    assert first["allocations"] == [{"bin": "cab/A10", "qty": 10}]
    assert first["short"] == 0
    assert mains["refs"] == ["CX1"] and mains["allocations"] == [] and mains["short"] == 5
    assert data["short_lines"] == 1
    assert data["not_tracked"][0]["refs"] == ["R1"]
    assert any("licensed practice" in c for c in data["cautions"])


def test_plan_text_names_bins_shortfalls_and_cautions(shop):
    db, bom, _ = shop
    result = run(db, "plan", str(bom), "--boards", "5", "--spare", "10%")
    assert result.exit_code == 0, result.stderr
    out = result.stdout
    assert out.startswith("plan 1: 5 boards, reserved, 2 capacitor lines, 1 short")
    assert "need 11\tcab/A10 ×11\tok" in out
    assert "short 6: order 6 × 100 nF, safety class X2" in out
    assert "CAUTION: Mains positions (CX1 (X2))" in out


def test_show_repeats_the_plan_as_stored(shop):
    db, bom, _ = shop
    planned = json.loads(run(db, "plan", str(bom), "--boards", "2", "--json").stdout)
    shown = json.loads(run(db, "show", "1", "--json").stdout)
    assert shown == planned


def test_show_without_a_number_lists_the_plans(shop):
    db, bom, _ = shop
    run(db, "plan", str(bom), "--boards", "2")
    run(db, "plan", str(bom), "--boards", "3")
    run(db, "drop", "1")
    listed = json.loads(run(db, "show", "--json").stdout)
    assert [(p["plan"], p["status"], p["boards"], p["lines"], p["short_lines"]) for p in listed] == [
        (2, "reserved", 3, 2, 1), (1, "dropped", 2, 2, 1)]
    text = run(db, "show").stdout.splitlines()
    assert text[0] == "plan\tstatus\tboards\tlines\tshort\tcreated\tbom"
    assert text[1].startswith("2\treserved\t3\t2\t1\t")


def test_picklist_prints_natural_order_and_writes_xlsx(shop, tmp_path):
    db, bom, _ = shop
    run(db, "plan", str(bom), "--boards", "12")
    out = tmp_path / "pick.xlsx"
    result = run(db, "picklist", "1", "--xlsx", str(out))
    assert result.exit_code == 0, result.stderr
    rows = [line.split("\t") for line in result.stdout.splitlines()[2:] if "\t" in line]
    assert [r[0] for r in rows] == ["A2", "A10"]
    assert f"wrote 2 pick rows to {out}" in result.stderr
    assert out.exists()


def test_pull_then_a_second_pull_is_refused_then_undo_restores(shop):
    db, bom, ids = shop
    run(db, "plan", str(bom), "--boards", "5")
    first = run(db, "pull", "1", "--json")
    assert first.exit_code == 0, first.stderr
    assert json.loads(first.stdout) == {"plan": 1, "action": "pull", "status": "pulled",
                                        "moves": [{"bin": "cab/A10", "delta": -10}]}
    second = run(db, "pull", "1")
    assert second.exit_code == 1
    assert second.stderr.startswith("stock: cannot pull plan 1: it was already pulled at ")
    undo = run(db, "undo", "1")
    assert undo.exit_code == 0 and undo.stdout.splitlines() == ["plan 1: returned", "cab/A10\t+10"]
    store = open_store(db)
    assert on_hand(store, ids["A10"]) == 20
    store.close()


def test_drop_frees_the_parts_for_the_next_plan(shop):
    db, bom, _ = shop
    run(db, "plan", str(bom), "--boards", "13")
    held = json.loads(run(db, "show", "1", "--json").stdout)
    assert sum(a["qty"] for a in held["lines"][0]["allocations"]) == 26
    assert run(db, "drop", "1").stdout.strip() == "plan 1: dropped"
    again = json.loads(run(db, "plan", str(bom), "--boards", "13", "--json").stdout)
    assert sum(a["qty"] for a in again["lines"][0]["allocations"]) == 26


@pytest.mark.parametrize("args, code, message", [
    pytest.param(["pull", "7"], 1, "stock: no plan '7'", id="unknown-plan"),
    pytest.param(["plan", "BOM", "--boards", "2", "--allow", "cheaper"], 2,
                 "stock: --allow: cannot read 'cheaper'", id="unknown-allowance"),
    pytest.param(["plan", "BOM", "--boards", "2", "--temp", "warm"], 2,
                 "stock: --temp: cannot read 'warm'", id="bad-temperature"),
    pytest.param(["plan", "missing.csv", "--boards", "2"], 1, "missing.csv", id="missing-bom"),
])
def test_bad_input_gives_one_clear_line_and_its_exit_code(shop, args, code, message):
    db, bom, _ = shop
    args = [str(bom) if a == "BOM" else a for a in args]
    result = run(db, *args)
    assert result.exit_code == code
    assert message in result.stderr
    assert "Traceback" not in result.stderr


def test_tank_lines_are_filled_from_unmarked_c0g_bins_and_say_the_parts_are_to_measure(tmp_path):
    # A fictional oscillator board: EIA-198 C0G bins that print no tolerance letter (common on the
    # shelf). Proven parts (a marked ±2 %) go first; the rest are parts to measure, and the notes say so.
    db = tmp_path / "stock.db"
    store = open_store(db)
    add_bin(store, "osc/T1", "T1", part("100p C0G 50V", 100, volts=50, dielectric="C0G"), 30)
    add_bin(store, "osc/T2", "T2", part("101G C0G 50V", 100, tol="2", volts=50, dielectric="C0G"), 2)
    store.close()
    bom = tmp_path / "osc.csv"
    bom.write_text("Designator,Qty,Value,Tolerance,Voltage,Dielectric\n"
                   '"C11,C12",2,100p,,50V,C0G\n'
                   "C21,1,100p,2%,50V,C0G\n", encoding="utf-8")
    data = json.loads(run(db, "plan", str(bom), "--boards", "3", "--json").stdout)
    tank, trimmed = data["lines"]
    assert [a["bin"] for a in tank["allocations"]] == ["osc/T1"]
    assert any("tolerance not marked: parts to measure" in n for n in tank["notes"])
    assert [a["bin"] for a in trimmed["allocations"]] == ["osc/T2", "osc/T1"]
    assert any(n.startswith("osc/T1: filled with parts to measure") and "±2 %" in n for n in trimmed["notes"])
    assert not any(n.startswith("osc/T2: filled") for n in trimmed["notes"])


def test_plan_accepts_a_map_for_the_footprint_and_do_not_fit_columns(tmp_path):
    # common practice in CAD exports (headers of our own invention here); EIA chip sizes from
    # memory of the EIA / IEC 60115-8 designations
    db = tmp_path / "stock.db"
    store = open_store(db)
    add_bin(store, "cab/A1", "A1", part("104K 50V", 100000, tol="10", volts=50), 30)
    store.db.conn.execute("UPDATE parts SET package = '1206'")
    add_bin(store, "cab/A2", "A2", part("104K 50V", 100000, tol="10", volts=50), 10)
    store.db.conn.execute("UPDATE parts SET package = '0805' WHERE package IS NULL")
    store.close()
    bom = tmp_path / "board.csv"
    bom.write_text("Ref,Val,Land,Leave off\nC1,100n,C_0805_2012Metric,\nC2,100n,C_0805_2012Metric,yes\n",
                   encoding="utf-8")
    result = run(db, "plan", str(bom), "--boards", "2", "--map", "value=Val", "--map", "package=Land",
                 "--map", "dnp=Leave off", "--json")
    assert result.exit_code == 0, result.stderr
    data = json.loads(result.stdout)
    assert [a["bin"] for a in data["lines"][0]["allocations"]] == ["cab/A2"]
    assert data["not_fitted"] == [{"refs": ["C2"], "value": "100n", "kind": "capacitor", "row": 3,
                                   "reason": "marked do-not-fit in the 'Leave off' column"}]
    assert any("cab/A1 (104K 50V): 1206 part for 0805 pads" in n for n in data["lines"][0]["notes"])
