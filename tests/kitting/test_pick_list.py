"""The pick list: one stop per bin in walking order, what to look for, how many, for which positions.

Sources: natural order (A2 before A10) is common practice, no published source; 104 = 100 nF,
473 = 47 nF (IEC 60062); counts are hand arithmetic (positions × boards); the 50 V stored-charge
caution is common practice.
"""

from __future__ import annotations

import csv

import pytest

from stock.errors import NotFound
from stock.inventory.intake import import_file
from stock.kitting.pick_list import natural_key, pick_list, pick_list_text, plan_text
from stock.kitting.planner import kit_options, plan_kit


def write(path, header, rows):
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(header)
        w.writerows(rows)
    return path


@pytest.fixture
def planned(store, tmp_path):
    import_file(store, write(tmp_path / "rack.csv", ["Location", "Marking", "Qty"],
                             [["A10", "473K 100V X7R", "20"], ["A9", "104K 50V X7R", "5"],
                              ["A2", "104K 50V X7R", "3"]]))
    bom = write(tmp_path / "board.csv", ["Designator", "Qty", "Value", "Tolerance", "Voltage"],
                [["C1,C2,C3", "3", "100n", "10%", "50V"], ["C4", "1", "47n", "10%", "50V"],
                 ["R1", "1", "10k", "", ""]])
    return store, plan_kit(store, bom, kit_options(2)).id


@pytest.mark.parametrize("smaller, larger", [
    pytest.param("A2", "A10", id="A2-before-A10"),
    pytest.param("cab/A9", "cab/A10", id="inside-a-bin-key"),
    pytest.param("a1", "B1", id="case-does-not-matter"),
])
def test_natural_order_counts_numbers_as_numbers(smaller, larger):
    assert natural_key(smaller) < natural_key(larger)


def test_the_pick_list_has_one_row_per_bin_in_walking_order(planned):
    store, plan = planned
    pl = pick_list(store, plan)
    # need: 3 positions x 2 boards = 6 of 100 nF (from A2 and A9 together: 3 + 5 on hand), 2 of 47 nF
    assert [r.location for r in pl.rows] == sorted((r.location for r in pl.rows), key=natural_key)
    by_value = {}
    for r in pl.rows:
        by_value[r.value] = by_value.get(r.value, 0) + r.count
    assert by_value == {"100 nF": 6, "47 nF": 2}
    assert pl.total == 8
    assert all(set(r.refs) <= {"C1", "C2", "C3", "C4"} for r in pl.rows)
    assert "R1" not in {ref for r in pl.rows for ref in r.refs}   # resistors are not kitted here


def test_the_pick_list_text_is_tab_separated_under_a_header_and_summary(planned):
    store, plan = planned
    pl = pick_list(store, plan)
    lines = pick_list_text(pl).splitlines()
    assert lines[0] == f"# pick list for plan {plan} (2 boards, reserved): 8 parts from {len(pl.rows)} bins"
    assert lines[1] == "location\tbin\tmarking\tvalue\tcount\trefs\tpackage"
    assert all(len(line.split("\t")) == 7 for line in lines[2:2 + len(pl.rows)])


def test_the_pick_list_json_keeps_its_contract_keys(planned):
    store, plan = planned
    data = pick_list(store, plan).to_json()
    assert set(data) >= {"plan", "status", "boards", "rows", "total", "cautions"}
    assert set(data["rows"][0]) >= {"location", "bin", "marking", "value", "count", "refs", "package"}


def test_a_part_rated_above_50_v_carries_the_stored_charge_caution(planned):
    store, plan = planned
    cautions = pick_list(store, plan).cautions
    assert any("above 50 V" in c and "discharge" in c for c in cautions)   # the 100 V 47 nF bin


def test_the_plan_text_names_each_line_its_need_and_what_is_not_tracked(planned):
    store, plan = planned
    from stock.kitting.stored_plans import load_plan

    text = plan_text(load_plan(store, plan))
    assert text.splitlines()[0] == f"plan {plan}: 2 boards, reserved, 2 capacitor lines, 0 short"
    assert "need 6" in text and "need 2" in text
    assert "not tracked" in text and "R1" in text


def test_a_pick_list_for_an_unknown_plan_is_refused(planned):
    store, _ = planned
    with pytest.raises(NotFound, match="no plan '404'"):
        pick_list(store, 404)
