"""Queries over stored bins: the listing, one bin in full, quarantined rows, the part's marking.

Sources: "104" = 100 nF and "472" = 4.7 nF per IEC 60062 (three-digit code). Engineering
notation of the output ("100 nF") follows IEC 60027-1 unit symbols. Quantity rules are common
practice in stock-keeping, no published source.
"""

from __future__ import annotations

import csv
import json

import pytest

from stock.inventory.bins import bin_detail, list_bins, natural_key, part_marking, quarantined_rows
from stock.decoded import Marking
from stock.errors import NotFound
from stock.inventory.intake import import_file


def write_csv(path, rows, headers=("Location", "Label", "Marking", "Qty")):
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(headers)
        w.writerows(rows)
    return path


@pytest.fixture
def stocked(store, tmp_path):
    path = write_csv(tmp_path / "bench.csv", [
        ["A1", "100nF", "104", "25"],
        ["A2", "10nF", "104", "4"],      # label contradicts the code (IEC 60062: 104 = 100 nF)
        ["A3", "", "472", ""],
        ["A4", "", "what is this", "2"],
        ["A5", "", "222", "many"],
    ])
    import_file(store, path)
    return store


def test_the_listing_shows_every_stored_bin_with_value_and_quantity(stocked):
    rows = list_bins(stocked)
    assert [r["bin_key"] for r in rows] == ["bench/a1", "bench/a2", "bench/a3"]
    a1 = rows[0]
    assert (a1["value"], a1["on_hand"], a1["available"], a1["marking"]) == ("100 nF", 25, 25, "104")
    assert rows[2]["on_hand"] is None and rows[2]["available"] == 0


def test_the_listing_counts_open_flags(stocked):
    by_key = {r["bin_key"]: r for r in list_bins(stocked)}
    assert by_key["bench/a1"]["open_flags"] == 0
    assert by_key["bench/a2"]["open_flags"] >= 1  # label-conflict
    assert by_key["bench/a3"]["open_flags"] >= 1  # unknown-quantity


def test_available_is_on_hand_less_what_open_plans_hold(stocked):
    b = stocked.find_bin("bench/a1")
    with stocked.writing() as db:
        plan = db.conn.execute("INSERT INTO plans (created_at, boards) VALUES ('now', 1)").lastrowid
        line = db.conn.execute("INSERT INTO plan_lines (plan_id, line_no, need) VALUES (?, 1, 5)",
                               (plan,)).lastrowid
        db.conn.execute("INSERT INTO reservations (plan_id, line_id, bin_id, qty) VALUES (?, ?, ?, 5)",
                        (plan, line, b["id"]))
    a1 = next(r for r in list_bins(stocked) if r["bin_key"] == "bench/a1")
    assert (a1["on_hand"], a1["reserved"], a1["available"]) == (25, 5, 20)


def test_a_bins_detail_has_its_facts_flags_history_and_source_rows(stocked):
    d = bin_detail(stocked, "bench/a2")
    assert d["decoded"]["capacitance_pf"] == 100_000.0
    assert any(a["capacitance_pf"] == 10_000.0 for a in d["alternatives"])
    assert [f["kind"] for f in d["flags"]].count("label-conflict") == 1
    assert [(h["kind"], h["delta"], h["after"]) for h in d["history"]] == [("import", 4, 4)]
    assert d["source_rows"][0]["row"] == 3 and d["source_rows"][0]["file"] == "bench.csv"
    assert d["source_rows"][0]["raw"]["Label"] == "10nF"


def test_a_bin_is_found_by_its_location_too(stocked):
    assert bin_detail(stocked, "A3")["bin_key"] == "bench/a3"


def test_an_unknown_bin_is_not_found_with_a_hint(stocked):
    with pytest.raises(NotFound, match=r"no bin 'Z9' \(expected a bin id, key, location or label"):
        bin_detail(stocked, "Z9")


def test_quarantined_rows_say_why_and_how_to_fix(stocked):
    rows = quarantined_rows(stocked)
    assert [(r["row"], r["kind"]) for r in rows] == [(5, "no-capacitance"), (6, "bad-quantity")]
    assert rows[0]["reason"] == "no capacitance could be read from 'what is this'"
    assert rows[1]["reason"] == "quantity 'many' is not a number"
    assert "whole number" in rows[1]["fix"]
    assert rows[1]["raw"] == {"Location": "A5", "Marking": "222", "Qty": "many"}


def test_fixing_a_file_clears_its_old_quarantined_rows(stocked, tmp_path):
    write_csv(tmp_path / "bench.csv", [
        ["A1", "100nF", "104", "25"], ["A4", "", "473", "2"], ["A5", "", "222", "8"]])
    import_file(stocked, tmp_path / "bench.csv")
    assert quarantined_rows(stocked) == []


def test_part_marking_prefers_a_settled_reading():
    decoded = Marking(text="104").to_json() | {"capacitance_pf": 100000.0}
    settled = {"marking": Marking(text="104").to_json() | {"capacitance_pf": 10000.0},
               "by": "bench", "note": "measured 10.2 nF"}
    m = part_marking({"decoded_json": json.dumps(decoded), "settled_json": json.dumps(settled)})
    assert float(m.capacitance_pf) == 10000.0
    m = part_marking({"decoded_json": json.dumps(decoded), "settled_json": None})
    assert float(m.capacitance_pf) == 100000.0


# natural order, the way a person walks the drawers: common practice, no published source
@pytest.mark.parametrize("smaller, larger", [
    pytest.param("A2", "A10", id="A2-before-A10"),
    pytest.param("cab/A9", "cab/A10", id="inside-a-bin-key"),
    pytest.param("a1", "B1", id="case-does-not-matter"),
    pytest.param("Z99", None, id="no-location-last"),
])
def test_natural_order_counts_numbers_as_numbers(smaller, larger):
    assert natural_key(smaller) < natural_key(larger)
