"""`stock labels`, `stock show` with a scanned code, and `stock kit pull --scan`, from the command line.

Sources: exit codes and the one-line error rule are this project's own (1 bad data, 2 bad
usage); the payload form is this project's own (see stock.scan_codes); PDFs are read back with
pypdf (a reader independent of the writer).
"""

from __future__ import annotations

import json
import os

import pytest
from pypdf import PdfReader
from typer.testing import CliRunner

from stock.cli import app
from tests.labels.conftest import SHELF_CSV

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1", "NO_COLOR": "1"}
runner = CliRunner()


@pytest.fixture
def db(tmp_path):
    sheet = tmp_path / "tidewater_shelf.csv"
    sheet.write_text(SHELF_CSV, encoding="utf-8")
    path = tmp_path / "stock.db"
    result = runner.invoke(app, ["--db", str(path), "import", str(sheet)], env=ENV)
    assert result.exit_code == 0, result.stderr
    return path


def run(db, *args, **kwargs):
    return runner.invoke(app, ["--db", str(db), *args], env=ENV, **kwargs)


def test_labels_writes_a_pdf_and_says_what_it_wrote(db, tmp_path):
    out = tmp_path / "shelf.pdf"
    result = run(db, "labels", str(out))
    assert result.exit_code == 0, result.stderr
    assert result.stdout.startswith(f"wrote {out} (12 labels on 1 page, A4, 3 × 8 labels of 70 × 37 mm)")
    text = PdfReader(out).pages[0].extract_text()
    assert "100 pF" in text and "bin tidewater bench/t1" in text


def test_labels_json_lists_each_label_and_its_payload(db, tmp_path):
    result = run(db, "labels", str(tmp_path / "a.pdf"), "T3", "T1", "--layout", "letter-2x10-102x25", "--json")
    assert result.exit_code == 0, result.stderr
    data = json.loads(result.stdout)
    assert data["layout"] == "letter-2x10-102x25" and data["paper"] == "letter" and data["pages"] == 1
    assert [label["bin"] for label in data["labels"]] == ["tidewater bench/t3", "tidewater bench/t1"]
    assert data["labels"][0]["payload"] == "BIN:TIDEWATER BENCH/T3"
    assert data["labels"][0]["safety_class"] == "X2" and data["labels"][0]["fit_for"]["mains"] in ("fit", "marginal")


def test_the_smallest_layout_says_which_lines_it_had_to_leave_out(db, tmp_path):
    result = run(db, "labels", str(tmp_path / "small.pdf"), "--layout", "a4-5x13-38x21")
    assert result.exit_code == 0
    assert "to fit, " in result.stderr and "marking on" in result.stderr


@pytest.mark.parametrize("args, code, words", [
    pytest.param(["T1", "Z9"], 1, "no bin 'Z9'", id="unknown-bin"),
    pytest.param(["--size", "250x40"], 2, "larger than an A4 page", id="label-larger-than-page"),
    pytest.param(["--size", "70x37", "--grid", "3x9"], 2, "at most 8 rows", id="grid-does-not-fit"),
    pytest.param(["--margins", "-3"], 2, "margins cannot be negative", id="negative-margins"),
    pytest.param(["--changed-since", "soon"], 2, "--changed-since: cannot read 'soon'", id="bad-date"),
    pytest.param(["--flagged", "T1"], 1, "no bin of those named has open flags", id="nothing-left"),
])
def test_bad_input_is_one_line_and_writes_nothing(db, tmp_path, args, code, words):
    out = tmp_path / "labels.pdf"
    result = run(db, "labels", str(out), *args)
    assert result.exit_code == code, result.output
    assert result.stderr.count("\n") == 1 and words in result.stderr
    assert not out.exists() and not [p for p in tmp_path.iterdir() if p.name.startswith(".labels")]


@pytest.mark.skipif(os.geteuid() == 0, reason="root may write anywhere")
def test_an_unwritable_folder_is_one_line(db, tmp_path):
    locked = tmp_path / "locked"
    locked.mkdir()
    locked.chmod(0o500)
    result = run(db, "labels", str(locked / "labels.pdf"))
    locked.chmod(0o700)
    assert result.exit_code == 1 and "cannot be written to" in result.stderr


def test_a_missing_folder_is_one_line_and_nothing_is_written(db, tmp_path):
    result = run(db, "labels", str(tmp_path / "no such folder" / "labels.pdf"))
    assert result.exit_code == 1 and "does not exist" in result.stderr and result.stderr.count("\n") == 1


def test_show_takes_what_the_scanner_types(db):
    result = run(db, "show", "BIN:TIDEWATER BENCH/T3\r\n", "--json")
    assert result.exit_code == 0, result.stderr
    assert json.loads(result.stdout)["bin_key"] == "tidewater bench/t3"


def _plan(db, tmp_path):
    bom = tmp_path / "preamp.csv"
    bom.write_text("Designator,Qty,Value,Tolerance,Voltage,Dielectric\n"
                   "C1,2,100p,5%,50V,C0G\n"
                   "C2,1,100n,10%,25V,X7R\n", encoding="utf-8")
    result = run(db, "kit", "plan", str(bom), "--boards", "2", "--json")
    assert result.exit_code == 0, result.stderr
    plan = json.loads(result.stdout)
    return str(plan["plan"]), sorted({a["bin"] for line in plan["lines"] for a in line["allocations"]})


def test_kit_pull_scan_pulls_once_every_bin_is_scanned_and_names_a_stranger(db, tmp_path):
    plan, bins = _plan(db, tmp_path)
    assert bins == ["tidewater bench/t1", "tidewater bench/t2"]
    scans = "BIN:TIDEWATER BENCH/T1\nBIN:TIDEWATER BENCH/T6\nbin:tidewater bench/t2\r\n"
    result = run(db, "kit", "pull", plan, "--scan", input=scans)
    assert result.exit_code == 0, result.stderr
    assert "not this\tbin tidewater bench/t6 is not in this plan" in result.stderr
    assert result.stdout.splitlines()[0] == f"plan {plan}: pulled"
    shown = json.loads(run(db, "show", "T1", "--json").stdout)
    assert shown["on_hand"] == 36                                # 40 less 2 boards × 2


def test_kit_pull_scan_takes_nothing_when_a_bin_was_not_scanned(db, tmp_path):
    plan, _ = _plan(db, tmp_path)
    result = run(db, "kit", "pull", plan, "--scan", input="BIN:TIDEWATER BENCH/T1\n")
    assert result.exit_code == 1
    assert "not confirmed by a scan: tidewater bench/t2; nothing was taken" in result.stderr
    assert json.loads(run(db, "show", "T1", "--json").stdout)["on_hand"] == 40
