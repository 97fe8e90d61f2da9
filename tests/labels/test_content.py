"""What a label says, from the store: facts in engineering units, grades, flags, the choice of bins.

Sources: C0G = 0 ± 30 ppm/K, U2J = −750 ± 120 ppm/K, X7R = ±15 % over −55…+125 °C and Y5V =
+22/−82 % over −30…+85 °C are EIA-198 (Class 1 and Class 2 tables); X2 is an IEC 60384-14
class; tolerance letter J = ±5 %, K = ±10 %, M = ±20 % and the voltage code 2A = 100 V are
IEC 60062 / EIA; which lead a family marks (aluminium electrolytics the negative, tantalums the
positive) is common practice, no published source. The grades compared against are those
`stock grade` computes (grade_bins), a separate path from the stored table the labels read.
"""

from __future__ import annotations

import time

import pytest

from stock.errors import BadValue, NotFound, Refused
from stock.inventory.stored_grades import grade_bins
from stock.labels.content import dielectric_text, select_labels
from stock.markings.decoder import decode
from stock.store.database import now


def _by_key(labels):
    return {f.bin_key: f for f in labels}


@pytest.mark.parametrize("marking, expected", [
    pytest.param("101J C0G", "C0G 0±30 ppm/K", id="C0G"),
    pytest.param("221J U2J", "U2J −750±120 ppm/K", id="U2J"),
    pytest.param("104K X7R", "X7R ±15 % −55…125 °C", id="X7R"),
    pytest.param("473M Y5V", "Y5V +22/−82 % −30…85 °C", id="Y5V"),
])
def test_a_dielectric_is_shown_with_its_tempco_or_change_window(marking, expected):
    assert dielectric_text(decode(marking).dielectric) == expected


def test_each_label_carries_the_decoded_facts_in_engineering_units(shelf):
    labels = _by_key(select_labels(shelf))
    t1, t2, t3 = labels["tidewater bench/t1"], labels["tidewater bench/t2"], labels["tidewater bench/t3"]
    assert (t1.value, t1.tolerance, t1.voltage, t1.dielectric) == ("100 pF", "±5 %", "100 V DC", "C0G 0±30 ppm/K")
    assert (t2.value, t2.tolerance, t2.voltage) == ("100 nF", "±10 %", "100 V DC")
    assert (t3.value, t3.voltage, t3.safety_class) == ("470 nF", "310 V AC", "X2")
    assert labels["tidewater bench/t4"].polarity == "− lead marked"
    assert labels["tidewater bench/t5"].polarity == "+ lead marked"
    assert labels["tidewater bench/t9"].polarity.startswith("non-polar")
    assert labels["tidewater bench/t3"].payload == "BIN:TIDEWATER BENCH/T3"


def test_the_fit_for_mark_agrees_with_the_grades_computed_afresh(shelf):
    labels = select_labels(shelf)
    fresh = {g.bin_key: {app: grade.word for app, grade in g.grades.items()} for g in grade_bins(shelf)}
    for facts in labels:
        assert [app for app, _, _ in facts.fitness] == ["tuned", "timing", "signal", "bypass", "bulk", "mains"]
        assert {app: word for app, _, word in facts.fitness} == fresh[facts.bin_key], facts.bin_key


def test_named_bins_come_in_the_order_given_and_unknown_ones_are_all_named(shelf):
    labels = select_labels(shelf, ["T3", "BIN:TIDEWATER BENCH/T1", "tidewater bench/t2"])
    assert [f.bin_key for f in labels] == ["tidewater bench/t3", "tidewater bench/t1", "tidewater bench/t2"]
    with pytest.raises(NotFound) as caught:
        select_labels(shelf, ["T3", "Z9", "Q4"])
    assert str(caught.value).startswith("no bins 'Z9, Q4'")


def test_flagged_keeps_only_bins_with_open_flags_and_says_why(shelf):
    flagged = select_labels(shelf, flagged=True)
    assert flagged and all(f.look for f in flagged)
    assert "tidewater bench/t7" in _by_key(flagged)              # 47K reads two ways
    assert "ambiguous-code" in _by_key(flagged)["tidewater bench/t7"].look
    with pytest.raises(Refused, match="no bin of those named has open flags"):
        select_labels(shelf, ["T1"], flagged=True)


def test_changed_since_keeps_bins_counted_or_changed_after_the_date(shelf):
    time.sleep(1.05)          # the tables keep whole seconds: the import must be a second earlier
    stamp = now()
    row = shelf.find_bin("T6")
    with shelf.writing():
        shelf.set_count(row["id"], 55, "count", ref="stock-take")
    assert [f.bin_key for f in select_labels(shelf, changed_since=stamp)] == ["tidewater bench/t6"]
    assert len(select_labels(shelf, changed_since="2000-01-01")) == 12
    with pytest.raises(Refused, match="changed since 2999-01-01"):
        select_labels(shelf, changed_since="2999-01-01")
    with pytest.raises(BadValue, match="--changed-since"):
        select_labels(shelf, changed_since="last tuesday")


def test_an_empty_store_has_nothing_to_label(store):
    with pytest.raises(Refused, match="import a sheet first"):
        select_labels(store)
