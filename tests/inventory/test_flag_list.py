"""The flag list a person works through: where, what, the readings to choose from, how to settle.

Sources: 47K read as 47 pF ±10 % by IEC 60062 and as 47 nF by older US practice (from memory);
104 = 100 nF (IEC 60062); the settle wording is the project's table (stock/store/flag_kinds.py).
"""

from __future__ import annotations

import csv
import json
from datetime import date

import pytest

from stock.errors import BadValue
from stock.inventory.flag_list import list_flags
from stock.inventory.intake import import_file
from stock.store.flag_records import close_flags


@pytest.fixture
def shop(store, tmp_path):
    path = tmp_path / "drawer.csv"
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(["Location", "Marking", "Qty", "Minimum"])
        w.writerows([["H2", "47K", "10", ""], ["H1", "104", "", ""], ["H3", "104", "3", "10"]])
    import_file(store, path)
    return store


def test_an_ambiguous_code_lists_its_readings_and_the_choice_to_make(shop):
    (view,) = list_flags(shop, kind="ambiguous-code")
    assert view.location == "H2" and view.marking == "47K"
    assert view.readings[0].describe() == "47 pF ±10 %"
    assert view.readings[1].capacitance_pf == 47_000
    assert view.settled_by == "reading"
    assert view.hint.startswith("measure it: 47 pF ±10 % or 47 nF")


def test_an_unknown_quantity_says_which_bin_to_count(shop):
    (view,) = list_flags(shop, kind="unknown-quantity")
    assert view.location == "H1"
    assert view.readings == ()                       # a count, not a reading, settles it
    assert view.hint == f"count the bin: `stock settle {view.bin_key} --count N`"


def test_check_raises_the_stock_flags_first_so_below_minimum_is_listed(shop):
    views = list_flags(shop, kind="below-minimum", check=True, today=date(2026, 12, 1))
    (view,) = views
    assert view.location == "H3"
    assert view.hint.startswith("holds 3, minimum 10")


def test_flags_are_listed_by_bin_then_by_age(shop):
    keys = [v.bin_key for v in list_flags(shop)]
    assert keys == sorted(keys)


def test_settled_flags_are_listed_apart_with_their_decision(shop):
    (view,) = list_flags(shop, kind="unknown-quantity")
    with shop.writing():
        close_flags(shop, [view.id], {"count": 4, "by": "kim"})
    assert list_flags(shop, kind="unknown-quantity") == []
    (settled,) = list_flags(shop, kind="unknown-quantity", status="settled")
    assert settled.decision == {"count": 4, "by": "kim"}
    data = settled.to_json()
    assert data["status"] == "settled" and data["settle"] == settled.hint
    json.dumps(data)        # the --json contract is plain JSON


def test_the_json_view_keeps_its_contract_keys(shop):
    data = list_flags(shop, kind="ambiguous-code")[0].to_json()
    assert {"id", "kind", "status", "message", "meaning", "settle", "settled_by", "bin", "bin_id",
            "location", "label", "marking", "readings", "details", "opened_at", "decision"} <= set(data)


@pytest.mark.parametrize("status", ["closed", "OPEN", ""])
def test_a_status_other_than_open_or_settled_is_refused_naming_both(shop, status):
    with pytest.raises(BadValue) as info:
        list_flags(shop, status=status)
    assert str(info.value) == f"--status: cannot read {status!r} (expected open or settled)"
