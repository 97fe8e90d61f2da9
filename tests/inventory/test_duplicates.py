"""Duplicate bins: the same decoded part in several bins, probable typos, and merging them.

Sources: the markings are IEC 60062 three-digit codes with tolerance letters (104K = 100 nF
±10 %, 473J = 47 nF ±5 %; from memory of IEC 60062); X2 is an IEC 60384-14 safety subclass
(a part without the class must never replace one that has it, from memory of IEC 60384-14).
The similarity cut-offs are common practice, no published source; rapidfuzz's ratio is the
normalised Indel similarity as its documentation defines it (reference library).
"""

from __future__ import annotations

import json
from decimal import Decimal

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from stock.decoded import Dielectric, Marking, Tolerance
from stock.inventory.duplicates import find_duplicates, merge, raise_duplicate_flags
from stock.errors import Refused
from stock.inventory.flag_list import list_flags
from stock.inventory.settling import settle
from stock.store.database import open_store
from tests.inventory.test_settling import X7R, add_bin  # the same hand-built bins and dielectric

TEN = Tolerance(Decimal(10), Decimal(10), "%", "K")


def ceramic(text, pf, volts=50, tol=TEN, safety=None, unparsed=()):
    return Marking(text, Decimal(pf), tol, Decimal(volts) if volts else None, "DC" if volts else None,
                   X7R, safety_class=safety, unparsed=unparsed)


def ledger_sum(store, bin_id):
    return store.one("SELECT COALESCE(SUM(delta), 0) AS n FROM ledger WHERE bin_id = ?", (bin_id,))["n"]


def test_the_same_decoded_part_in_two_bins_is_one_duplicate_naming_both(store):
    add_bin(store, "cab1/a1", ceramic("104K 50V X7R", 100000))
    add_bin(store, "cab2/c4", ceramic("0.1uF K 50V X7R", 100000))
    add_bin(store, "cab1/a2", ceramic("104K 100V X7R", 100000, volts=100))
    [dup] = find_duplicates(store)
    assert (dup.reason, dup.bin_keys) == ("same-part", ("cab1/a1", "cab2/c4"))
    assert dup.message == "bins cab1/a1, cab2/c4 hold the same part (100 nF ±10 % 50 V DC X7R)"


def test_a_duplicate_flag_names_the_bins_and_is_raised_once(store):
    add_bin(store, "cab1/a1", ceramic("104K 50V X7R", 100000))
    add_bin(store, "cab2/c4", ceramic("104K 50V X7R", 100000))
    assert raise_duplicate_flags(store).raised == 1
    assert raise_duplicate_flags(store).raised == 0
    [view] = list_flags(store)
    assert view.kind == "duplicate" and view.details["bins"] == ["cab1/a1", "cab2/c4"]
    assert view.hint.startswith("bins cab1/a1, cab2/c4: `stock merge FROM INTO`")


# Probable typos: one character wrong in a long marking; a marking the decoder could not read.
@pytest.mark.parametrize("first, second, flagged", [
    pytest.param(ceramic("104K 50V X7R", 100000), ceramic("104K 5OV X7R", 100000, volts=None,
                                                          unparsed=("5OV",)),
                 True, id="letter-O-for-zero-in-the-voltage"),
    pytest.param(ceramic("104K 50V X7R", 100000), Marking("1O4K 50V X7R"),
                 True, id="undecoded-marking-close-to-a-decoded-one"),
    pytest.param(ceramic("104K 50V X7R", 100000), ceramic("103K 50V X7R", 10000),
                 False, id="one-digit-apart-is-another-value"),
    pytest.param(ceramic("104K 50V X7R", 100000), ceramic("104K 63V X7R", 100000, volts=63),
                 False, id="same-value-other-voltage-is-another-part"),
    pytest.param(ceramic("104K 25V", 100000, volts=25), ceramic("104K 250V", 100000, volts=250),
                 False, id="one-inserted-digit-but-both-fully-read-is-another-part"),
])
def test_probable_typos_are_found_between_nearly_identical_markings(store, first, second, flagged):
    add_bin(store, "cab1/a1", first)
    add_bin(store, "cab1/a2", second)
    found = [d for d in find_duplicates(store) if d.reason == "probable-typo"]
    assert bool(found) == flagged
    if flagged:
        assert found[0].bin_keys == ("cab1/a1", "cab1/a2") and "may hold the same part" in found[0].message


def test_nearly_identical_labels_on_bins_of_the_same_value_are_a_probable_typo(store):
    add_bin(store, "cab1/a1", ceramic("104K 50V X7R", 100000), label="100nF X7R decoupling")
    add_bin(store, "cab1/a2", ceramic("100n", 100000, volts=None), label="100nF X7R decouplnig")
    [dup] = find_duplicates(store)
    assert dup.reason == "probable-typo" and "labels nearly alike" in dup.message


def test_a_duplicate_flag_is_settled_by_a_note_when_the_bins_really_differ(store):
    add_bin(store, "cab1/a1", ceramic("104K 50V X7R", 100000))
    add_bin(store, "cab2/c4", ceramic("104K 50V X7R", 100000))
    raise_duplicate_flags(store)
    [view] = list_flags(store)
    done = settle(store, "cab2/c4", flag_id=view.id, note="different makers, kept apart")
    assert done.closed == (view.id,)
    assert raise_duplicate_flags(store).raised == 0 and list_flags(store) == []


def test_a_duplicate_that_no_longer_holds_is_closed_by_the_check(store):
    add_bin(store, "cab1/a1", ceramic("47K 50V X7R", 47))
    add_bin(store, "cab2/c4", ceramic("47K 50V X7R", 47))
    raise_duplicate_flags(store)
    with store.writing():
        store.db.conn.execute("UPDATE parts SET capacitance_pf = 47000 WHERE bin_id = 2")
    assert raise_duplicate_flags(store).closed == 1


def test_merge_moves_the_stock_with_two_ledger_movements_and_settles_the_flag(store):
    a = add_bin(store, "cab2/c4", ceramic("104K 50V X7R", 100000), on_hand=30)
    b = add_bin(store, "cab1/a1", ceramic("104K 50V X7R", 100000), on_hand=12)
    raise_duplicate_flags(store)
    done = merge(store, "cab2/c4", "cab1/a1", note="one bin is enough", by="ana")
    assert (done.moved, done.into_on_hand) == (30, 42)
    moves = store.rows("SELECT bin_id, delta, kind, actor FROM ledger WHERE kind = 'merge' ORDER BY id")
    assert moves == [{"bin_id": a, "delta": -30, "kind": "merge", "actor": "ana"},
                     {"bin_id": b, "delta": 30, "kind": "merge", "actor": "ana"}]
    assert (ledger_sum(store, a), ledger_sum(store, b)) == (0, 42)
    assert done.settled_flags and list_flags(store) == []
    assert raise_duplicate_flags(store).raised == 0  # the emptied bin is not a duplicate any more


def test_merging_parts_whose_facts_differ_is_refused_unless_forced(store):
    add_bin(store, "cab2/c4", ceramic("104K 25V X7R", 100000, volts=25), on_hand=5)
    add_bin(store, "cab1/a1", ceramic("104K 50V X7R", 100000), on_hand=5)
    with pytest.raises(Refused, match=r"cannot merge bin cab2/c4 into cab1/a1: their parts differ"
                                      r" \(voltage: 25 V DC vs 50 V DC\)"):
        merge(store, "cab2/c4", "cab1/a1")
    assert store.one("SELECT COUNT(*) AS n FROM ledger WHERE kind = 'merge'")["n"] == 0
    done = merge(store, "cab2/c4", "cab1/a1", force=True)
    assert done.moved == 5
    assert any("parts rated 25 V DC now sit in a bin marked 50 V DC" in w for w in done.warnings)


def test_parts_without_a_safety_class_never_go_into_a_safety_rated_bin_even_forced(store):
    add_bin(store, "cab2/c4", ceramic("104K 275V", 100000, volts=275), on_hand=5)
    add_bin(store, "cab1/x2", ceramic("104K X2 275V", 100000, volts=275, safety="X2"), on_hand=5)
    with pytest.raises(Refused, match="holds X2 safety-rated parts and cab2/c4 does not carry that class"):
        merge(store, "cab2/c4", "cab1/x2", force=True)


@pytest.mark.parametrize("from_qty, into_qty, message", [
    pytest.param(None, 5, "the quantity in cab2/c4 is unknown", id="unknown-from"),
    pytest.param(5, None, "the quantity in cab1/a1 is unknown", id="unknown-into"),
])
def test_merging_an_uncounted_bin_is_refused(store, from_qty, into_qty, message):
    add_bin(store, "cab2/c4", ceramic("104K 50V X7R", 100000), on_hand=from_qty)
    add_bin(store, "cab1/a1", ceramic("104K 50V X7R", 100000), on_hand=into_qty)
    with pytest.raises(Refused, match=message):
        merge(store, "cab2/c4", "cab1/a1")


def test_merging_a_bin_into_itself_is_refused(store):
    add_bin(store, "cab1/a1", ceramic("104K 50V X7R", 100000))
    with pytest.raises(Refused, match="they are the same bin"):
        merge(store, "cab1/a1", "cab1/a1")


def test_a_failed_merge_writes_nothing(store, monkeypatch):
    add_bin(store, "cab2/c4", ceramic("104K 50V X7R", 100000), on_hand=7)
    add_bin(store, "cab1/a1", ceramic("104K 50V X7R", 100000), on_hand=3)
    import stock.inventory.duplicates as dup

    def broken(*args, **kwargs):
        raise RuntimeError("disk pulled out")

    monkeypatch.setattr(dup, "close_flags", broken)
    with pytest.raises(RuntimeError):
        merge(store, "cab2/c4", "cab1/a1")
    assert store.rows("SELECT on_hand FROM bins ORDER BY id") == [{"on_hand": 7}, {"on_hand": 3}]
    assert store.one("SELECT COUNT(*) AS n FROM ledger WHERE kind = 'merge'")["n"] == 0


# Invariant (this project's ledger promise): a merge keeps the total and each ledger sum equal
# to its bin's on-hand.
@settings(max_examples=25, deadline=None)
@given(st.integers(0, 10_000), st.integers(0, 10_000))
def test_merging_keeps_the_total_and_the_ledger_in_step(tmp_path_factory, a_qty, b_qty):
    store = open_store(tmp_path_factory.mktemp("m") / "s.db")
    try:
        a = add_bin(store, "cab2/c4", ceramic("104K 50V X7R", 100000), on_hand=a_qty)
        b = add_bin(store, "cab1/a1", ceramic("104K 50V X7R", 100000), on_hand=b_qty)
        merge(store, "cab2/c4", "cab1/a1")
        rows = {r["id"]: r["on_hand"] for r in store.rows("SELECT id, on_hand FROM bins")}
        assert rows == {a: 0, b: a_qty + b_qty}
        assert (ledger_sum(store, a), ledger_sum(store, b)) == (0, a_qty + b_qty)
    finally:
        store.close()


def test_the_merge_note_is_json_naming_both_bins(store):
    add_bin(store, "cab2/c4", ceramic("104K 50V X7R", 100000), on_hand=2)
    add_bin(store, "cab1/a1", ceramic("104K 50V X7R", 100000), on_hand=2)
    merge(store, "cab2/c4", "cab1/a1", note="tidy")
    note = json.loads(store.one("SELECT note FROM ledger WHERE kind = 'merge' LIMIT 1")["note"])
    assert note == {"from": "cab2/c4", "into": "cab1/a1", "moved": 2, "note": "tidy", "forced": False}


def test_dielectric_family_alone_tells_parts_apart(store):
    film = Dielectric("polyester", "polyester")
    add_bin(store, "cab1/a1", Marking("104K 100V", Decimal(100000), TEN, Decimal(100), "DC", film))
    add_bin(store, "cab1/a2", Marking("104K 100V", Decimal(100000), TEN, Decimal(100), "DC", X7R))
    assert all(d.reason != "same-part" for d in find_duplicates(store))
