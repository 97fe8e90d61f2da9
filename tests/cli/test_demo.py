"""`stock demo` runs the whole job on the demo shop without a failing step.

Source: the demo shop is invented (demo_inventory/make_demo.py); the promise checked here is
the README's: import, flags, grades, a find with pairs, kit plans, a pull, the workbooks.
"""

from __future__ import annotations

from openpyxl import load_workbook
from typer.testing import CliRunner

from stock.cli import app
from stock.demo import fresh_folder, tour
from stock.store.database import open_store


def test_the_demo_runs_every_step_and_leaves_a_sound_database(tmp_path):
    out = tmp_path / "lantern"
    result = CliRunner().invoke(app, ["demo", "--dir", str(out)], env={"COLUMNS": "120"})
    assert result.exit_code == 0, result.output
    steps = tour(tmp_path, out)
    assert result.stdout.count("\n── ") == len(steps)
    assert "(exit code" not in result.stdout
    assert "parallel: 1 × 100 pF" in result.stdout          # the padder pair is found
    assert "ok: " in result.stdout                          # stock check passes at the end
    for name in ("purchasing.xlsx", "inventory.xlsx", "count.xlsx", "flasher_pick_list.xlsx", "bin_labels.pdf"):
        assert (out / name).exists(), name
    assert len(load_workbook(out / "inventory.xlsx")["Drift charts"]._charts) == 2
    with open_store(out / "shop.db", create=False) as store:
        assert store.one("SELECT status FROM plans WHERE id = 2")["status"] == "pulled"
        assert store.one("SELECT COUNT(*) AS n FROM bins")["n"] >= 110


def test_the_default_demo_folder_is_new(tmp_path):
    (tmp_path / "stock-demo").mkdir()
    assert fresh_folder(tmp_path) == tmp_path / "stock-demo-2"


def test_the_demo_refuses_a_folder_that_exists_in_one_line(tmp_path):
    from typer.testing import CliRunner

    from stock.cli import app

    result = CliRunner().invoke(app, ["demo", "--dir", str(tmp_path)])
    assert result.exit_code == 2
    assert "a folder that does not exist yet" in result.stderr
