"""`stock flags`, `stock settle` and `stock merge` on an imported messy sheet, end to end.

Sources: 104 = 100 nF (IEC 60062 three-digit code), 47K read as 47 pF ±10 % by IEC 60062 and
as 47 nF by older US makers' practice (from memory, [old-us-letter-codes]), 1832 a YYWW date
code (ISO 8601 weeks, Python's standard library); the 2-year shelf-life rule for aluminium electrolytics is common practice,
no published source; exit codes 1 (bad data) / 2 (bad usage) are common practice for
command-line tools.
"""

from __future__ import annotations

import json

import pytest
from typer.testing import CliRunner

from stock.cli import app
from stock.store.database import open_store

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1",
       "USER": "bench-ana"}

MESSY = """\
Drawer,Label,Marking/Code,Qty on hand,Minimum,Date code,Dielectric/Type
cab1/a1,10nF,104,25,,,
cab1/a2,,47K,10,,,
cab1/a3,,104K 50V X7R,5,20,,
cab1/a4,,104K 50V X7R,,,,
cab1/e1,,100uF 25V,8,,1832,aluminium electrolytic
cab1/a6,,Q?Z,2,,,
"""


@pytest.fixture
def runner():
    return CliRunner()


@pytest.fixture
def shop(tmp_path, runner):
    """A store filled by importing the messy sheet through the real importer."""
    sheet = tmp_path / "bins.csv"
    sheet.write_text(MESSY, encoding="utf-8")
    db = tmp_path / "stock.db"
    result = runner.invoke(app, ["--db", str(db), "import", str(sheet)], env=ENV)
    assert result.exit_code == 0, result.output
    return db, sheet


def cli(runner, db, *args, code=0):
    result = runner.invoke(app, ["--db", str(db), *args], env=ENV)
    assert result.exit_code == code, result.output
    return result


def open_flags(runner, db):
    return json.loads(cli(runner, db, "flags", "--json").stdout)["flags"]


@pytest.mark.parametrize("command", ["flags", "settle", "merge"])
def test_each_command_has_help_with_an_example(runner, command):
    result = runner.invoke(app, [command, "--help"], env=ENV)
    assert result.exit_code == 0 and "Example" in result.stdout


def test_every_flag_on_the_imported_sheet_is_explained(runner, shop):
    db, _ = shop
    flags = open_flags(runner, db)
    kinds = {(f["kind"], f["location"]) for f in flags}
    assert {("label-conflict", "cab1/a1"), ("ambiguous-code", "cab1/a2"),
            ("below-minimum", "cab1/a3"), ("unknown-quantity", "cab1/a4"),
            ("duplicate", "cab1/a3"), ("shelf-life", "cab1/e1")} <= kinds
    for f in flags:
        assert f["meaning"] and f["settle"] and "{" not in f["settle"]
        assert not f["meaning"].startswith("a flag kind this version does not document"), f["kind"]
    [conflict] = [f for f in flags if f["kind"] == "label-conflict"]
    assert [r["text"] for r in conflict["readings"]] == ["100 nF", "10 nF"]
    assert conflict["settle"].startswith("the label says 10nF (10 nF), the code 104 says 100 nF")


def test_human_output_lists_readings_and_what_would_settle_them(runner, shop):
    db, _ = shop
    out = cli(runner, db, "flags", "--kind", "ambiguous-code").stdout
    assert "reading 0: 47 pF ±10 %  (decoder's choice)" in out
    assert "to settle: measure it: 47 pF ±10 % or 47 nF ±10 %?" in out


def test_all_flags_of_the_sheet_settle_and_stay_settled_after_reimport(runner, shop):
    db, sheet = shop
    assert len(open_flags(runner, db)) >= 7  # listing runs the stock and duplicate checks
    cli(runner, db, "settle", "cab1/a1", "--reading", "1", "--note", "measured 9.8 nF")
    cli(runner, db, "settle", "cab1/a2", "--value", "47n")
    cli(runner, db, "settle", "cab1/a4", "--count", "30")
    merged = json.loads(cli(runner, db, "merge", "cab1/a4", "cab1/a3", "--json").stdout)
    assert (merged["moved"], merged["into_on_hand"]) == (30, 35) and merged["settled_flags"]
    for f in open_flags(runner, db):
        cli(runner, db, "settle", f["location"], "--flag", str(f["id"]), "--note", "seen to")
    assert open_flags(runner, db) == []

    # The same file again, then an edited version of it (another sha256, so the import runs).
    cli(runner, db, "import", str(sheet))
    sheet.write_text(MESSY.replace("cab1/a2,,47K,10", "cab1/a2,,47K,12"), encoding="utf-8")
    report = json.loads(cli(runner, db, "import", str(sheet), "--json").stdout)
    assert report["files"][0]["rows"] == 6
    # No decision returns. The one open flag is new and true: the sheet still says cab1/a3 holds
    # 5, so the import counted it back down from the 35 the merge left, below its minimum again.
    assert [(f["kind"], f["location"]) for f in open_flags(runner, db)] == [("below-minimum", "cab1/a3")]

    with open_store(db) as store:
        part = store.one("SELECT p.* FROM parts p JOIN bins b ON b.id = p.bin_id WHERE b.location = 'cab1/a1'")
        assert part["capacitance_pf"] == 10000.0 and part["marking"] == "104"
        kinds = [r["kind"] for r in store.rows("SELECT kind FROM ledger WHERE delta = 0")]
        assert kinds.count("settle") >= 2
        actors = {r["actor"] for r in store.rows("SELECT actor FROM ledger WHERE kind = 'settle'")}
        assert actors == {"bench-ana"}


def test_settle_json_reports_the_old_and_new_reading(runner, shop):
    db, _ = shop
    out = json.loads(cli(runner, db, "settle", "cab1/a2", "--reading", "1", "--by", "ben", "--json").stdout)
    assert out["old"]["capacitance_pf"] == 47.0 and out["new"]["capacitance_pf"] == 47000.0
    assert out["decision"] == "reading 1" and len(out["closed"]) == 2  # unit-assumed and ambiguous-code


def test_a_settled_bin_can_be_reopened(runner, shop):
    db, _ = shop
    cli(runner, db, "settle", "cab1/a2", "--reading", "1")
    out = cli(runner, db, "settle", "cab1/a2", "--reopen", "--note", "wrong drawer").stdout
    assert out.startswith("bin ") and "decisions undone" in out
    assert {f["kind"] for f in open_flags(runner, db) if f["location"] == "cab1/a2"} >= {"ambiguous-code"}


@pytest.mark.parametrize("args, code, message", [
    pytest.param(["settle", "zz9"], 1, "stock: no bin 'zz9'", id="unknown-bin"),
    pytest.param(["settle", "cab1/a2", "--reading", "1", "--value", "47n"], 2,
                 "stock: --reading and --value: cannot read 'both'", id="two-decisions"),
    pytest.param(["settle", "cab1/a2", "--value", "lots"], 2, "stock: --value: cannot read 'lots'",
                 id="bad-value"),
    pytest.param(["merge", "cab1/a1", "cab1/a2"], 1,
                 "stock: cannot merge bin", id="parts-differ"),
    pytest.param(["settle", "cab1/a2", "--reopen", "--reading", "1"], 2,
                 "stock: --reopen: cannot read 'with a decision'", id="reopen-with-a-decision"),
])
def test_bad_decisions_get_one_line_and_an_exit_code(runner, shop, args, code, message):
    db, _ = shop
    result = cli(runner, db, *args, code=code)
    assert result.stderr.startswith(message) and result.stderr.count("\n") == 1


def test_settled_flags_are_listed_with_who_decided_what(runner, shop):
    db, _ = shop
    cli(runner, db, "settle", "cab1/a1", "--reading", "0", "--by", "ben", "--note", "code is right")
    [f] = json.loads(cli(runner, db, "flags", "--settled", "--json").stdout)["flags"]
    assert (f["kind"], f["decision"]["by"], f["decision"]["decision"]) == ("label-conflict", "ben", "reading 0")
    assert "settled by ben: reading 0 (code is right)" in cli(runner, db, "flags", "--settled").stdout


def test_flags_json_keeps_its_documented_keys(runner, shop):
    db, _ = shop
    f = open_flags(runner, db)[0]
    assert set(f) == {"id", "kind", "status", "message", "meaning", "settle", "settled_by", "bin",
                      "bin_id", "location", "label", "marking", "readings", "details", "opened_at",
                      "decision"}
    assert set(f["readings"][0]) == {"number", "capacitance_pf", "tolerance", "voltage_v",
                                     "dielectric", "reason", "text"}
