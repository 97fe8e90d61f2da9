"""Stock checks: unknown counts, bins below their minimum, old electrolytics; flags raised and closed.

Sources: YYWW date codes read as ISO 8601 weeks (the Monday of the week; Python's standard library
`date.fromisocalendar` is the oracle); the 2-year shelf-life rule for aluminium electrolytics is
common practice, no published source; 104 = 100 nF (IEC 60062).
"""

from __future__ import annotations

import csv
from datetime import date

import pytest

from stock.inventory.intake import import_file
from stock.inventory.stock_checks import SHELF_LIFE_YEARS, parse_date_code, raise_stock_flags

TODAY = date(2026, 12, 1)


# ISO 8601 weeks (stdlib oracle beside each) and calendar months
@pytest.mark.parametrize("raw, expected", [
    pytest.param("1832", date.fromisocalendar(2018, 32, 1), id="yyww-2018-week-32"),
    pytest.param("2401", date.fromisocalendar(2024, 1, 1), id="week-1-can-start-in-december"),
    pytest.param("9952", date.fromisocalendar(1999, 52, 1), id="a-future-yy-is-last-century"),
    pytest.param("2019-04", date(2019, 4, 1), id="year-month"),
    pytest.param("2019/4", date(2019, 4, 1), id="year-month-slash"),
    pytest.param("2012", date(2012, 1, 1), id="a-year-older-than-its-week-reading"),
    pytest.param("1960", date(1960, 1, 1), id="a-year-that-is-no-week"),
])
def test_a_date_code_reads_as_the_first_day_of_its_week_month_or_year(raw, expected):
    assert parse_date_code(raw, TODAY).date == expected


def test_four_digits_that_fit_both_say_the_other_reading():
    # 2012: the year 2012 or 2020 week 12; the older is taken (the cautious choice for shelf life)
    assert parse_date_code("2012", TODAY).how == "read as the year 2012 (it could also be 2020 week 12)"


@pytest.mark.parametrize("raw", [
    pytest.param("Q3", id="a-quarter"),
    pytest.param("0053", id="week-53-of-a-52-week-year"),
    pytest.param("2019-13", id="month-13"),
    pytest.param("", id="empty"),
])
def test_a_date_code_not_understood_has_no_date_and_says_what_is_accepted(raw):
    code = parse_date_code(raw, TODAY)
    assert code.date is None
    assert code.how == "not understood (expected YYWW, YYYY-MM or YYYY)"


def _import(store, tmp_path, rows, name="shelf.csv"):
    path = tmp_path / name
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(["Location", "Marking", "Qty", "Minimum", "Date code", "Type"])
        w.writerows(rows)
    import_file(store, path)


def _open(store, kind):
    return store.rows("SELECT b.location, f.message FROM flags f JOIN bins b ON b.id = f.bin_id"
                      " WHERE f.kind = ? AND f.status = 'open' ORDER BY b.location", (kind,))


def test_a_bin_below_its_minimum_is_flagged_with_both_numbers(store, tmp_path):
    _import(store, tmp_path, [["E1", "104", "5", "20", "", ""], ["E2", "104", "20", "20", "", ""]])
    raise_stock_flags(store, today=TODAY)
    (flag,) = _open(store, "below-minimum")       # 20 of 20 is not below
    assert flag["location"] == "E1"
    assert "holds 5, below its minimum of 20" in flag["message"]


def test_an_electrolytic_past_the_shelf_life_rule_is_flagged_and_a_young_one_is_not(store, tmp_path):
    assert SHELF_LIFE_YEARS == 2    # common practice, no published source
    _import(store, tmp_path, [["F1", "100uF 25V", "8", "", "1832", "aluminium electrolytic"],
                              ["F2", "100uF 25V", "8", "", "2640", "aluminium electrolytic"],
                              ["F3", "104", "8", "", "1832", ""]])
    raise_stock_flags(store, today=TODAY)
    (flag,) = _open(store, "shelf-life")          # 2026 week 40 is weeks old; F3 is no electrolytic
    assert flag["location"] == "F1"
    # 2018-08-06 to 2026-12-01: 8 years and 4 months (hand count of months)
    assert "about 8 years 4 months old" in flag["message"]
    assert "2018 week 32" in flag["message"]


def test_an_unreadable_date_code_on_an_electrolytic_is_flagged_as_age_unknown(store, tmp_path):
    _import(store, tmp_path, [["F1", "100uF 25V", "8", "", "Q3", "aluminium electrolytic"]])
    raise_stock_flags(store, today=TODAY)
    (flag,) = _open(store, "shelf-life")
    assert "'Q3'" in flag["message"] and "age is unknown" in flag["message"]


def test_a_flag_whose_condition_has_gone_is_closed_by_the_next_check(store, tmp_path):
    _import(store, tmp_path, [["E1", "104", "5", "20", "", ""]])
    raise_stock_flags(store, today=TODAY)       # the import may have raised it already
    assert len(_open(store, "below-minimum")) == 1
    again = raise_stock_flags(store, today=TODAY)
    assert (again.raised, again.closed) == (0, 0)     # nothing raised twice
    bin_id = store.one("SELECT id FROM bins")["id"]
    with store.writing():
        store.move(bin_id, 30, "adjust", ref="restocked")
    cleared = raise_stock_flags(store, today=TODAY)
    assert (cleared.raised, cleared.closed) == (0, 1)
    assert _open(store, "below-minimum") == []
    decision = store.one("SELECT decision_json FROM flags WHERE kind = 'below-minimum'")["decision_json"]
    assert "no longer true" in decision


def test_an_unknown_quantity_is_flagged_once_whoever_raised_it(store, tmp_path):
    _import(store, tmp_path, [["G1", "104", "", "", "", ""]])
    before = len(_open(store, "unknown-quantity"))
    run = raise_stock_flags(store, today=TODAY)
    assert len(_open(store, "unknown-quantity")) == 1
    assert run.raised == 1 - before
