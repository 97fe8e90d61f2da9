"""The pick list: one stop per bin in walking order, what to look for, how many, for which positions.

Sources (docs/sources.md): 104 = 100 nF, 473 = 47 nF, 101 = 100 pF ([IEC 60062] three-digit code);
natural order (A2 before A10, a bin with no location last) and the 50 V stored-charge caution are
common practice, no published source; counts are hand arithmetic (positions × boards).
"""

from __future__ import annotations

import pytest

from stock.errors import NotFound
from stock.inventory.intake import import_file
from stock.kitting.pick_list import pick_list, pick_list_text, plan_text
from stock.kitting.planner import kit_options, plan_kit
from stock.kitting.stored_plans import load_plan, pull_plan
from tests.helpers_procs import write_sheet as write


# 100 nF: C1–C3 need 3 × 2 = 6 and C5 needs 1 × 2 = 2, so both 100 nF bins (3 + 5 = 8) empty and
# neither alone holds the 6 of C1–C3; 47 nF: C4 needs 2; 100 pF: C6 needs 2 and 1 is on the shelf.
@pytest.fixture
def planned(store, tmp_path):
    import_file(store, write(tmp_path / "rack.csv", ["Location", "Marking", "Qty", "Package"],
                             [["A10", "473K 100V X7R", "20", "0805"], ["A9", "104K 50V X7R", "5", "0805"],
                              ["A2", "104K 50V X7R", "3", ""], ["", "101J 50V C0G", "1", ""]]))
    bom = write(tmp_path / "board.csv", ["Designator", "Qty", "Value", "Tolerance", "Voltage", "DNP"],
                [["C1,C2,C3", "3", "100n", "10%", "50V", ""], ["C4", "1", "47n", "10%", "50V", ""],
                 ["C5", "1", "100n", "10%", "50V", ""], ["C6", "1", "100p", "5%", "50V", ""],
                 ["C7", "1", "100n", "10%", "50V", "DNP"], ["R1", "1", "10k", "", "", ""]])
    return store, plan_kit(store, bom, kit_options(2)).id


def test_the_pick_list_has_one_row_per_bin_in_walking_order(planned):
    store, plan = planned
    rows = pick_list(store, plan).rows
    assert [(r.location, r.value, r.count) for r in rows] == [
        ("A2", "100 nF", 3), ("A9", "100 nF", 5), ("A10", "47 nF", 2), (None, "100 pF", 1)]


def test_a_bin_that_feeds_two_lines_names_the_positions_of_both(planned):
    store, plan = planned
    hundred_nf = [r for r in pick_list(store, plan).rows if r.value == "100 nF"]
    assert {ref for r in hundred_nf for ref in r.refs} == {"C1", "C2", "C3", "C5"}
    assert any({"C1", "C5"} <= set(r.refs) for r in hundred_nf)
    assert all(len(r.refs) == len(set(r.refs)) for r in hundred_nf)   # each position named once


def test_nothing_is_picked_for_resistors_or_positions_marked_do_not_fit(planned):
    store, plan = planned
    refs = {ref for r in pick_list(store, plan).rows for ref in r.refs}
    assert refs == {"C1", "C2", "C3", "C4", "C5", "C6"}


def test_the_pick_list_text_is_tab_separated_under_a_header_then_the_cautions(planned):
    store, plan = planned
    lines = pick_list_text(pick_list(store, plan)).splitlines()
    assert lines[0] == f"# pick list for plan {plan} (2 boards, reserved): 11 parts from 4 bins"
    assert lines[1] == "location\tbin\tmarking\tvalue\tcount\trefs\tpackage"
    assert lines[4] == "A10\track/a10\t473K 100V X7R\t47 nF\t2\tC4\t0805"
    assert lines[5].startswith("-\t")                     # the bin with no location
    assert lines[6].startswith("CAUTION: Parts rated above 50 V (rack/a10 (473K 100V X7R))")
    assert len(lines) == 7


def test_one_board_one_part_and_one_bin_are_said_in_the_singular(store, tmp_path):
    import_file(store, write(tmp_path / "rack.csv", ["Location", "Marking", "Qty"], [["A1", "104K 50V X7R", "4"]]))
    bom = write(tmp_path / "one.csv", ["Designator", "Qty", "Value"], [["C1", "1", "100n"]])
    plan = plan_kit(store, bom, kit_options(1)).id
    assert pick_list_text(pick_list(store, plan)).startswith(
        f"# pick list for plan {plan} (1 board, reserved): 1 part from 1 bin\n")


def test_the_pick_list_json_keeps_its_contract_keys(planned):
    store, plan = planned
    data = pick_list(store, plan).to_json()
    assert set(data) >= {"plan", "status", "boards", "rows", "total", "cautions"}
    assert (data["plan"], data["status"], data["boards"], data["total"]) == (plan, "reserved", 2, 11)
    assert set(data["rows"][0]) >= {"location", "bin", "marking", "value", "count", "refs", "package"}
    assert data["rows"][2]["refs"] == ["C4"]


def test_a_stored_plan_or_its_number_give_the_same_pick_list(planned):
    store, plan = planned
    assert pick_list(store, load_plan(store, plan)) == pick_list(store, plan)


def test_a_pulled_plan_says_so(planned):
    store, plan = planned
    pull_plan(store, plan)
    assert pick_list(store, plan).status == "pulled"


def test_a_part_rated_above_50_v_carries_the_stored_charge_caution(planned):
    store, plan = planned
    cautions = pick_list(store, plan).cautions
    assert len(cautions) == 1
    assert "above 50 V (rack/a10 (473K 100V X7R))" in cautions[0] and "discharge" in cautions[0]


def test_the_plan_text_names_each_line_its_need_and_what_is_short_untracked_or_not_fitted(planned):
    store, plan = planned
    lines = plan_text(load_plan(store, plan)).splitlines()
    assert lines[0] == f"plan {plan}: 2 boards, reserved, 4 capacitor lines, 1 short"
    by_refs = {line.split("\t")[1]: line.split("\t") for line in lines if line[:1].isdigit()}
    assert by_refs["C1 C2 C3"][3] == "need 6" and by_refs["C1 C2 C3"][5] == "ok"
    assert by_refs["C6"][3:] == ["need 2", "rack/101j 50v c0g ×1", "short 1"]
    untracked = lines.index("not tracked (no bins for these kinds):")
    assert lines[untracked + 1] == "\tR1\t10k\tresistor\t2"
    unfitted = lines.index("not fitted (marked do-not-fit; nothing taken):")
    assert lines[unfitted + 1].startswith("\tC7\t100n\tcapacitor\t")
    assert lines[-1].startswith("CAUTION: Parts rated above 50 V")


def test_a_pick_list_for_an_unknown_plan_is_refused(planned):
    store, _ = planned
    with pytest.raises(NotFound, match="no plan '404'"):
        pick_list(store, 404)
