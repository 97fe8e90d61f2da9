"""Which bin a line spends first: the one that gives up least.

Sources: the order (footprint known to fit, grade, exact value, no open doubts, plainest part, then
the fullest bin, then location) is common practice, no published source; X2 and X1Y2 classes from
IEC 60384-14; C0G 0±30 ppm/K and N750 −750 ppm/K from EIA-198 Class 1 tables; X7R from EIA-198
Class 2.
"""

from __future__ import annotations

from decimal import Decimal

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from stock.kitting.bin_order import Candidate, capability, choose_bins
from stock.kitting.planner import KitOptions, plan_kit
from tests.kitting.test_planner import add_bin, bom, line, part

D = Decimal


def _plan(store, bom_line, boards=4):
    kit = plan_kit(store, bom(bom_line), KitOptions(boards=boards))
    return [(a.bin_key, a.qty) for a in kit.lines[0].allocations], kit.lines[0].notes


def test_a_safety_part_is_not_spent_on_a_plain_position(store):
    add_bin(store, "cab/A1", "A1", part("X2 104K 275VAC", 100000, tol="10", volts=275, kind="AC",
                                        safety="X2"), 500)
    add_bin(store, "cab/A2", "A2", part("104K 50V X7R", 100000, tol="10", volts=50,
                                        dielectric="X7R"), 20)
    used, notes = _plan(store, line())
    assert used == [("cab/A2", 4)]
    assert any("kept cab/A1 (X2 104K 275VAC: safety-rated X2" in n for n in notes)


def test_an_x7r_goes_before_a_c0g_on_a_bypass_position(store):
    add_bin(store, "cab/A1", "A1", part("104J C0G", 100000, tol="5", dielectric="C0G"), 900)
    add_bin(store, "cab/A2", "A2", part("104K X7R", 100000, tol="10", dielectric="X7R"), 10)
    used, _ = _plan(store, line(application="bypass"))
    assert used == [("cab/A2", 4)]


def test_a_precious_bin_is_used_when_the_plain_ones_run_out_and_the_plan_says_so(store):
    add_bin(store, "cab/A1", "A1", part("104J C0G", 100000, tol="5", dielectric="C0G"), 900)
    add_bin(store, "cab/A2", "A2", part("104K X7R", 100000, tol="10", dielectric="X7R"), 3)
    used, notes = _plan(store, line(application="bypass"))
    assert used == [("cab/A2", 3), ("cab/A1", 1)]
    assert ("cab/A1: C0G (Class 1) used for this bypass position: the plainer bins (cab/A2) do not"
            " cover the need") in notes


def test_a_tight_tolerance_is_spent_only_when_the_line_asks_for_it(store):
    add_bin(store, "cab/A1", "A1", part("103F", 10000, tol="1", dielectric="C0G"), 200)
    add_bin(store, "cab/A2", "A2", part("103K", 10000, tol="10", dielectric="C0G"), 20)
    assert _plan(store, line(pf=10000, tol_pct=10))[0] == [("cab/A2", 4)]
    assert _plan(store, line(pf=10000, tol_pct=1), boards=1)[0] == [("cab/A1", 1)]


def test_a_compensating_ceramic_is_kept_when_a_c0g_will_do(store):
    add_bin(store, "cab/A1", "A1", part("101J N750", 100, tol="5", dielectric="N750"), 300)
    add_bin(store, "cab/A2", "A2", part("101J C0G", 100, tol="5", dielectric="C0G"), 30)
    assert _plan(store, line(pf=100, tol_pct=5))[0] == [("cab/A2", 4)]


def test_polystyrene_timing_stock_is_not_spent_on_a_plain_line(store):
    add_bin(store, "cab/A1", "A1", part("10n 5% polystyrene", 10000, tol="5",
                                        dielectric="polystyrene"), 15)
    add_bin(store, "cab/A2", "A2", part("103K X7R", 10000, tol="10", dielectric="X7R"), 12)
    assert _plan(store, line(pf=10000, tol_pct=10))[0] == [("cab/A2", 4)]


def test_a_far_higher_voltage_rating_is_kept_for_who_needs_it(store):
    add_bin(store, "cab/A1", "A1", part("102K 1KV X7R", 1000, tol="10", volts=1000,
                                        dielectric="X7R"), 300)
    add_bin(store, "cab/A2", "A2", part("102K 50V X7R", 1000, tol="10", volts=50,
                                        dielectric="X7R"), 10)
    assert _plan(store, line(pf=1000, tol_pct=10, voltage_v=25))[0] == [("cab/A2", 4)]


def test_on_a_mains_line_the_exact_class_goes_before_a_covering_one(store):
    add_bin(store, "cab/A1", "A1", part("X1Y2 104M 300VAC", 100000, tol="20", volts=300, kind="AC",
                                        safety="X1Y2"), 50)
    add_bin(store, "cab/A2", "A2", part("X2 104K 275VAC", 100000, tol="10", volts=275, kind="AC",
                                        safety="X2"), 5)
    used, _ = _plan(store, line(tol_pct=20, voltage_v=250, voltage_kind="AC", safety_class="X2"))
    assert used == [("cab/A2", 4)]


def test_a_non_safety_part_never_serves_a_mains_line_however_many_there_are(store):
    add_bin(store, "cab/A1", "A1", part("104K 630V polypropylene", 100000, tol="10", volts=630,
                                        dielectric="polypropylene"), 1000)
    used, _ = _plan(store, line(tol_pct=20, voltage_v=250, voltage_kind="AC", safety_class="X2"))
    assert used == []


def _cand(key, n, *, rank=(0, 0, 0, 0), doubt="", flags=()):
    from stock.decoded import Marking

    return Candidate(hash(key) % 1000, key, key, Marking(key), D(1), n, "fit", capability=rank,
                     package_doubt=doubt, doubts=flags)


@pytest.mark.parametrize("need, cands, expected", [
    pytest.param(5, [_cand("a", 50, doubt="package not recorded"), _cand("b", 10)], [("b", 5)],
                 id="known-fit-before-unknown-package"),
    pytest.param(5, [_cand("a", 50, flags=("shelf-life",)), _cand("b", 10)], [("b", 5)],
                 id="clean-before-flagged"),
    pytest.param(5, [_cand("a", 50, rank=(0, 2, 0, 0)), _cand("b", 10)], [("b", 5)],
                 id="plain-before-precious"),
    pytest.param(5, [_cand("a", 10), _cand("b", 50)], [("b", 5)], id="fullest-bin-first"),
    pytest.param(5, [_cand("b", 10), _cand("a", 10)], [("a", 5)], id="then-location-order"),
])
def test_each_ordering_rule_decides_when_the_ones_before_it_tie(need, cands, expected):
    assert [(c.bin_key, q) for c, q in choose_bins(need, cands)] == expected


def test_the_capability_of_a_plain_part_is_zero_and_of_a_film_part_is_not():
    bom_line = line(pf=100000)
    assert capability(bom_line, part("104K X7R", 100000, tol="10", dielectric="X7R"), D(100000))[0] \
        == (0, 0, 0, 0)
    rank, words = capability(bom_line, part("104J MKP", 100000, tol="5", dielectric="polypropylene"),
                             D(100000))
    assert rank[1] > 0 and words == ("polypropylene film",)


SIZES = ("0402", "0603", "0805", "1206")


@settings(max_examples=30, deadline=None)
@given(shelf=st.lists(st.tuples(st.sampled_from(SIZES + ("", "radial")), st.integers(0, 40)),
                      min_size=1, max_size=6),
       pads=st.sampled_from(SIZES), boards=st.integers(1, 60))
def test_a_plan_never_takes_a_part_known_not_to_fit_and_never_more_than_is_free(shelf, pads, boards):
    # EIA chip sizes from memory of the EIA / IEC 60115-8 designations; the fit rule is common
    # practice: a chip goes only on pads of its own size
    from stock.kitting.bom import BomLine
    from stock.markings.packages import read_package
    from stock.store.database import open_store

    store = open_store(":memory:")
    for i, (package, n) in enumerate(shelf):
        bid = add_bin(store, f"cab/A{i}", f"A{i}", part("104K", 100000, tol="10"), n)
        store.db.conn.execute("UPDATE parts SET package = ? WHERE bin_id = ?", (package or None, bid))
    bom_line = BomLine(2, ("C1",), 1, "100n", True, "capacitor", capacitance_pf=D(100000),
                       package=read_package(f"C_{pads}"))
    kit = plan_kit(store, bom(bom_line), KitOptions(boards=boards))
    held = {f"cab/A{i}": (package, n) for i, (package, n) in enumerate(shelf)}
    taken = 0
    for alloc in kit.lines[0].allocations:
        package, n = held[alloc.bin_key]
        assert package in (pads, ""), (alloc.bin_key, package, pads)
        assert alloc.qty <= n
        taken += alloc.qty
    fitting = sum(n for package, n in shelf if package == pads)
    assert taken == min(boards, sum(n for package, n in shelf if package in (pads, "")))
    if fitting >= boards:       # bins of unknown package only once the fitting ones run out
        assert all(held[a.bin_key][0] == pads for a in kit.lines[0].allocations)
    store.close()


def test_a_fuller_bin_with_an_open_doubt_waits_for_the_clean_one_and_is_named_when_used(store):
    # common practice, no published source: a bin whose label contradicts its marking waits
    doubted = add_bin(store, "cab/A1", "A1", part("104K", 100000, tol="10"), 500)
    add_bin(store, "cab/A2", "A2", part("104K", 100000, tol="10"), 20)
    store.raise_flag(kind="label-conflict", message="label says 10n", fingerprint="cab/a1|lc|1",
                     bin_id=doubted)
    assert _plan(store, line(tol_pct=10), boards=5)[0] == [("cab/A2", 5)]
    used, notes = _plan(store, line(tol_pct=10), boards=30)
    assert used == [("cab/A2", 15), ("cab/A1", 15)]
    assert ("cab/A1: used although it has open flags (label-conflict); see `stock flags`") in notes
