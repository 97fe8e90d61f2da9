"""A stored plan read back, pulled, undone and dropped: exact ledger movements, refusals that say why.

Sources: 104 = 100 nF, 473 = 47 nF, K = ±10 % (IEC 60062); the plan life (reserved → pulled →
returned, or reserved → dropped) is this project's own; the quantities are hand arithmetic:
two boards of a BOM line with two positions need 2 × 2 = 4 parts.
"""

from __future__ import annotations

import pytest

from stock.errors import NotFound, Refused
from stock.inventory.intake import import_file
from stock.kitting.planner import kit_options, plan_kit
from stock.kitting.stored_plans import drop_plan, list_plans, load_plan, pull_plan, undo_pull
from tests.helpers_procs import write_sheet as write


@pytest.fixture
def planned(store, tmp_path):
    """A shelf of two bins imported, and a plan for two boards reserving from both."""
    import_file(store, write(tmp_path / "shelf.csv", ["Location", "Marking", "Qty"],
                             [["P1", "104K 50V X7R", "10"], ["P2", "473K 100V X7R", "3"]]))
    bom = write(tmp_path / "amp.csv", ["Designator", "Qty", "Value", "Tolerance", "Voltage"],
                [["C1,C2", "2", "100n", "10%", "50V"], ["C7", "1", "47n", "10%", "50V"]])
    kit = plan_kit(store, bom, kit_options(2))
    return store, kit.id


def on_hand(store, location):
    return store.one("SELECT on_hand FROM bins WHERE location = ?", (location,))["on_hand"]


def test_a_plan_reads_back_with_its_lines_needs_and_bins(planned):
    store, plan = planned
    kit = load_plan(store, plan)
    assert (kit.id, kit.boards, kit.status) == (plan, 2, "reserved")
    first, second = kit.tracked_lines
    assert first.refs == ("C1", "C2") and first.need == 4          # 2 positions x 2 boards
    assert [(a.location, a.qty) for a in first.allocations] == [("P1", 4)]
    assert second.need == 2 and [(a.location, a.qty) for a in second.allocations] == [("P2", 2)]


@pytest.mark.parametrize("ref", ["{n}", "plan:{n}", "#{n}", " {n} "])
def test_a_plan_is_found_by_its_number_in_the_forms_people_type(planned, ref):
    store, plan = planned
    assert load_plan(store, ref.format(n=plan)).id == plan


@pytest.mark.parametrize("ref", ["999", "two", "²", "", "1" * 30])
def test_an_unknown_plan_is_refused_naming_it_and_where_numbers_are_shown(planned, ref):
    store, _ = planned
    with pytest.raises(NotFound) as info:
        load_plan(store, ref)
    assert str(info.value) == f"no plan {ref!r} (expected a plan number shown by `stock kit plan`)"


def test_a_pull_takes_the_reserved_parts_with_one_movement_per_bin(planned):
    store, plan = planned
    action = pull_plan(store, plan, actor="kim")
    assert action.status == "pulled"
    # the cabinet is the sheet's file name when no column names one (the import's bin identity rule)
    assert sorted(action.moves) == [("shelf/p1", -4), ("shelf/p2", -2)]
    assert (on_hand(store, "P1"), on_hand(store, "P2")) == (6, 1)   # 10 − 4, 3 − 2
    pulls = store.rows("SELECT delta, actor FROM ledger WHERE kind = 'pull' AND ref = ?", (f"plan:{plan}",))
    assert sorted(p["delta"] for p in pulls) == [-4, -2]
    assert {p["actor"] for p in pulls} == {"kim"}


def test_a_second_pull_is_refused_and_takes_nothing(planned):
    store, plan = planned
    pull_plan(store, plan)
    with pytest.raises(Refused) as info:
        pull_plan(store, plan)
    assert str(info.value).startswith(f"cannot pull plan {plan}: it was already pulled at ")
    assert (on_hand(store, "P1"), on_hand(store, "P2")) == (6, 1)


def test_an_undo_puts_back_exactly_what_was_pulled(planned):
    store, plan = planned
    pull_plan(store, plan)
    action = undo_pull(store, plan)
    assert action.status == "returned"
    assert (on_hand(store, "P1"), on_hand(store, "P2")) == (10, 3)
    with pytest.raises(Refused, match="it was pulled and its parts returned"):
        undo_pull(store, plan)


def test_undoing_a_plan_never_pulled_is_refused(planned):
    store, plan = planned
    with pytest.raises(Refused) as info:
        undo_pull(store, plan)
    assert str(info.value) == f"cannot undo plan {plan}: it has not been pulled"


def test_a_drop_frees_the_reservation_without_moving_parts(planned):
    store, plan = planned
    before = store.one("SELECT COUNT(*) AS n FROM ledger")["n"]
    assert store.available(store.find_bin("P1")["id"]) == 6          # 10 on hand, 4 held
    assert drop_plan(store, plan).status == "dropped"
    assert store.one("SELECT COUNT(*) AS n FROM ledger")["n"] == before
    assert store.available(store.find_bin("P1")["id"]) == 10
    with pytest.raises(Refused, match="it was dropped"):
        pull_plan(store, plan)


def test_dropping_a_pulled_plan_says_to_undo_it_instead(planned):
    store, plan = planned
    pull_plan(store, plan)
    with pytest.raises(Refused) as info:
        drop_plan(store, plan)
    assert f"`stock kit undo {plan}`" in str(info.value)


def test_a_pull_from_a_bin_counted_down_since_is_refused_and_takes_nothing(planned):
    store, plan = planned
    with store.writing():
        store.set_count(store.find_bin("P2")["id"], 1)      # 2 reserved, 1 left
    with pytest.raises(Refused) as info:
        pull_plan(store, plan)
    assert "holds 1, fewer than the 2 reserved" in str(info.value)
    assert on_hand(store, "P1") == 10                        # nothing was taken from P1 either
    assert load_plan(store, plan).status == "reserved"


def test_plans_are_listed_newest_first_with_their_line_counts(planned, tmp_path):
    store, plan = planned
    bom = write(tmp_path / "one.csv", ["Designator", "Qty", "Value"], [["C9", "1", "100n"]])
    second = plan_kit(store, bom, kit_options(1)).id
    listed = list_plans(store)
    assert [p["plan"] for p in listed] == [second, plan]
    assert listed[1]["lines"] == 2 and listed[1]["short_lines"] == 0
