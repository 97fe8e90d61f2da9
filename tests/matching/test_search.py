"""Tests for stock.search: singles, pairs, tempco-compensating pairs, and explained empty answers.

Outside sources, named beside each block: the EIA-198 Class 1/2 code tables (C0G = 0 ±30 ppm/K,
U2J = −750 ±120, X7R ±15 % over −55…+125 °C), the textbook series/parallel capacitor formulas,
IEC 60384-14 for the safety subclasses, IEC 60063 for the value to buy.
"""

from __future__ import annotations

import json
from decimal import Decimal

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from stock.decoded import Dielectric, Marking, Tolerance
from stock.errors import BadValue
from stock.physics.grading import Conditions, grade
from stock.matching.search import Requirement, build_requirement, find, parse_tempco_window
from stock.store.database import Store, open_store
from tests.stored_rows import store_bin

D = Decimal

# Dielectrics built by hand from the EIA-198 tables (Class 1: nominal α ± tolerance in ppm/K;
# Class 2: change window over a temperature range); old names carry no tolerance on α, except NP0,
# which every source equates with C0G.
DIELECTRICS = {
    "C0G": Dielectric("C0G", "ceramic", 1, D(0), D(30), D(-55), D(125), source="EIA-198 Class 1"),
    "NP0": Dielectric("NP0", "ceramic", 1, D(0), D(30), D(-55), D(125), source="industry name"),
    "U2J": Dielectric("U2J", "ceramic", 1, D(-750), D(120), D(-55), D(125), source="EIA-198 Class 1"),
    "U2G": Dielectric("U2G", "ceramic", 1, D(-750), D(30), D(-55), D(125), source="EIA-198 Class 1"),
    "N750": Dielectric("N750", "ceramic", 1, D(-750), None, D(-55), D(125), source="industry name"),
    "S2H": Dielectric("S2H", "ceramic", 1, D(-330), D(60), D(-55), D(125), source="EIA-198 Class 1"),
    "X7R": Dielectric("X7R", "ceramic", 2, None, None, D(-55), D(125), D(15), D(15), source="EIA-198 Class 2"),
}


def part(text: str, pf: str, *, tol: str | None = None, volts: str | None = None, code: str | None = None,
         safety: str | None = None, kind: str = "DC") -> Marking:
    """A hand-built marking: value in pF, ± tolerance in %, rated volts, dielectric code."""
    return Marking(
        text=text, capacitance_pf=D(pf),
        tolerance=Tolerance(D(tol), D(tol), "%") if tol is not None else None,
        voltage_v=D(volts) if volts is not None else None, voltage_kind=kind if volts else None,
        dielectric=DIELECTRICS[code] if code else None, safety_class=safety)


def add_bin(store: Store, key: str, m: Marking, on_hand: int | None, location: str | None = None) -> int:
    """One bin and its part, stored through the importer's column mapping."""
    return store_bin(store, key, m, on_hand, location=location or key)


def reserve(store: Store, bin_id: int, qty: int, status: str = "reserved") -> None:
    """Hold ``qty`` parts of a bin for a plan (as the kit planner would)."""
    with store.writing() as db:
        plan = db.conn.execute("INSERT INTO plans (created_at, boards, status) VALUES (?, 1, ?)",
                               ("2026-12-01T00:00:00+00:00", status)).lastrowid
        line = db.conn.execute("INSERT INTO plan_lines (plan_id, line_no, need) VALUES (?, 1, ?)",
                               (plan, qty)).lastrowid
        db.conn.execute("INSERT INTO reservations (plan_id, line_id, bin_id, qty) VALUES (?,?,?,?)",
                        (plan, line, bin_id, qty))


def add_bins(store: Store, rows: list[tuple[str, Marking, int | None]]) -> list[int]:
    """Insert many bins at once (used by the benchmark and the property tests)."""
    with store.writing():
        return [add_bin(store, key, m, on_hand) for key, m, on_hand in rows]


# The fictional shop of these tests: the repair bench at "Gull Street Wireless".
@pytest.fixture
def shop(tmp_path):
    s = open_store(tmp_path / "gull-street.db")
    yield s
    s.close()


def _bins(result):
    return [m.bin_key for m in result.matches]


def req(**kw) -> Requirement:
    kw.setdefault("capacitance_pf", D(150))
    return Requirement(**kw)


# Value: the delivered value's worst case (nominal ± the part's marked tolerance) must stay within
# the requirement (hand-computed bands).
def test_a_c0g_part_whose_whole_band_fits_is_found(shop):
    add_bin(shop, "A1", part("150J", "150", tol="5", volts="100", code="C0G"), 20, "drawer 1")
    result = find(shop, req(tol_pct=D(5)))
    assert _bins(result) == ["A1"]
    m = result.matches[0]
    assert (m.location, m.marking, m.capacitance_pf, m.available) == ("drawer 1", "150J", D(150), 20)
    assert "142.5 pF…157.5 pF" in m.reasons[0]


def test_a_part_whose_tolerance_band_leaves_the_window_is_not_offered(shop):
    add_bin(shop, "A2", part("151K", "150", tol="10", code="C0G"), 20)  # 135…165 pF vs 142.5…157.5 pF
    result = find(shop, req(tol_pct=D(5)))
    assert result.matches == ()
    assert any("135 pF…165 pF" in line for line in result.explanation)


def test_a_part_with_no_marked_tolerance_cannot_promise_one(shop):
    add_bin(shop, "A3", part("150", "150", code="C0G"), 20)
    assert find(shop, req(tol_pct=D(5))).matches == ()
    assert _bins(find(shop, req())) == ["A3"]  # without --tol the nominal value is enough


def test_without_a_tolerance_the_nominal_value_must_match_within_one_percent(shop):
    add_bin(shop, "B1", part("150", "150", tol="5"), 5)
    add_bin(shop, "B2", part("151", "151", tol="5"), 5)   # 0.67 % off: within 1 %
    add_bin(shop, "B3", part("152", "152", tol="5"), 5)   # 1.33 % off
    assert _bins(find(shop, req())) == ["B1", "B2"]


def test_singles_rank_by_value_error_then_spare_quantity(shop):
    add_bin(shop, "C1", part("151", "151", tol="1", code="C0G"), 50)
    add_bin(shop, "C2", part("150a", "150", tol="1", code="C0G"), 3)
    add_bin(shop, "C3", part("150b", "150", tol="1", code="C0G"), 30)
    assert _bins(find(shop, req(tol_pct=D(2)))) == ["C3", "C2", "C1"]


# Availability: on hand less reservations of plans still reserved (pulled or dropped plans hold none).
def test_reserved_parts_are_not_promised_again(shop):
    b = add_bin(shop, "D1", part("150J", "150", tol="5", code="C0G"), 10)
    reserve(shop, b, 7)
    reserve(shop, b, 3, status="dropped")
    assert find(shop, req(qty=3)).matches[0].available == 3
    assert find(shop, req(qty=4)).matches == ()
    assert any("3 available, 4 needed" in line for line in find(shop, req(qty=4)).explanation)


def test_a_bin_whose_quantity_is_unknown_offers_nothing(shop):
    add_bin(shop, "D2", part("150J", "150", tol="5", code="C0G"), None)
    assert find(shop, req()).matches == ()


# Voltage: rating must reach the working voltage; grading's derating rules judge the margin
# (common practice: Class 1 ceramics at ≤ 80 % of rated).
def test_a_part_rated_below_the_working_voltage_is_ruled_out(shop):
    add_bin(shop, "E1", part("150J 50V", "150", tol="5", volts="50", code="C0G"), 10)
    add_bin(shop, "E2", part("150J 500V", "150", tol="5", volts="500", code="C0G"), 10)
    assert _bins(find(shop, req(working_v=D(100)))) == ["E2"]


def test_a_part_past_its_derating_needs_allow_marginal(shop):
    add_bin(shop, "E3", part("150J 100V", "150", tol="5", volts="100", code="C0G"), 10)
    assert find(shop, req(working_v=D(95))).matches == ()
    assert _bins(find(shop, req(working_v=D(95), allow_marginal=True))) == ["E3"]


# Application grades come from stock.grading; a Class 2 part never serves a tuned circuit (EIA-198
# Class 2 moves ±15 % over temperature).
def test_empty_answers_name_the_constraint_and_the_value_to_buy(shop):
    for key in ("F1", "F2", "F3"):
        add_bin(shop, key, part("151K X7R", "150", tol="5", volts="100", code="X7R"), 10)
    result = find(shop, req(tol_pct=D(5), application="tuned"))
    assert result.matches == ()
    assert result.explanation[0].startswith("3 parts at 150 pF, all X7R (bins F1, F2, F3): unfit for tuned")
    assert result.suggestion.startswith("buy 150 pF ±5 %")


def test_the_value_to_buy_is_the_nearest_e_series_value_for_the_tolerance():
    # eseries (IEC 60063 reference library) agrees: E24 value nearest 147 is 150.
    from eseries import E24, find_nearest
    s = open_store(":memory:")
    result = find(s, req(capacitance_pf=D(147), tol_pct=D(5)))
    assert result.explanation == ("no part between 73.5 pF and 294 pF is in stock",)
    assert result.suggestion == (f"buy {find_nearest(E24, 147):g} pF ±5 % (the E24 value nearest 147 pF)")


# Safety (IEC 60384-14): a mains position never takes a part without an X/Y class; a Y class may
# stand in for an X class, never the reverse.
SAFETY_FILM = Dielectric("polypropylene", "polypropylene", None, D(-200), D(100), D(-40), D(110),
                         source="typical film figures")


def _safety_part(text, cls):
    m = part(text, "100000", tol="20", volts="275", safety=cls, kind="AC")
    return Marking(**{**m.__dict__, "dielectric": SAFETY_FILM})


def test_a_mains_position_never_accepts_a_part_without_a_safety_class(shop):
    add_bin(shop, "G1", _safety_part("104K 630V", None), 50)
    add_bin(shop, "G2", _safety_part("X2 104M", "X2"), 5)
    for r in (req(capacitance_pf=D(100000), safety_class="X2"),
              req(capacitance_pf=D(100000), application="mains", allow_marginal=True)):
        result = find(shop, r, combine=True)
        assert "G1" not in _bins(result)
        assert all(p.bin_key != "G1" for c in result.combinations for p in c.parts)
        assert any("defer to local electrical codes and licensed practice" in c for c in result.cautions)


@pytest.mark.parametrize(("have", "need", "ok"), [
    pytest.param("Y2", "X2", True, id="Y2-stands-in-for-X2"),
    pytest.param("X1Y2", "X1", True, id="dual-rated-X1Y2-serves-X1"),
    pytest.param("X1", "X2", True, id="X1-stands-in-for-X2"),
    pytest.param("X2", "X1", False, id="X2-does-not-serve-X1"),
    pytest.param("X2", "Y2", False, id="X-class-never-serves-a-Y-position"),
    pytest.param("Y4", "Y2", False, id="Y4-does-not-serve-Y2"),
])
def test_safety_classes_substitute_only_upwards(shop, have, need, ok):
    add_bin(shop, "H1", _safety_part(f"{have} 104M", have), 5)
    assert bool(find(shop, req(capacitance_pf=D(100000), safety_class=need)).matches) is ok


def test_a_y4_part_rated_125_v_ac_is_never_offered_for_an_x2_position(shop):
    # [IEC 60384-14] ([safety-parameters-page]): Y4 is rated below 150 V AC; an X2 position named
    # without a voltage is assumed on mains of at least 150 V AC
    low = Marking(**{**_safety_part("Y4 1n 125VAC", "Y4").__dict__, "capacitance_pf": D(1000),
                     "voltage_v": D(125)})
    add_bin(shop, "Y4", low, 10)
    result = find(shop, req(capacitance_pf=D(1000), safety_class="X2"), combine=True)
    assert result.matches == () and result.combinations == ()
    assert "Y4 does not cover X2: rated 125 V AC, below the 150 V AC an X2 position may run at" in \
        " ".join(result.explanation)


def test_no_pair_is_ever_offered_for_a_mains_position(shop):
    # on AC a series pair's small part carries nearly all the voltage (V₁ = V·C₂/(C₁ + C₂)), and a
    # pair holds no IEC 60384-14 rating: one rated part per position
    add_bin(shop, "P1", Marking(**{**_safety_part("X2 1n", "X2").__dict__, "capacitance_pf": D(1000)}), 10)
    add_bin(shop, "P2", _safety_part("X2 100n", "X2"), 10)
    add_bin(shop, "P3", Marking(**{**_safety_part("X2 47n", "X2").__dict__, "capacitance_pf": D(47000)}), 10)
    for r in (req(capacitance_pf=D(990), safety_class="X2"), req(capacitance_pf=D(94000), application="mains"),
              req(capacitance_pf=D(94000), position="line-line")):
        result = find(shop, r, combine=True)
        assert result.combinations == ()
        assert any("no pair may fill an X/Y position" in e for e in result.explanation)


def test_an_x_part_is_offered_line_to_line_and_refused_line_to_earth(shop):
    # IEC 60384-14: X line–line; a line–earth position needs a Y class
    add_bin(shop, "L1", _safety_part("X2 104M", "X2"), 5)
    add_bin(shop, "L2", part("104K X7R", "100000", tol="10", volts="275", code="X7R"), 50)
    mains = find(shop, req(capacitance_pf=D(100000), application="mains"))
    assert _bins(mains) == ["L1"]
    assert "fit line–line (X2); never line–earth" in " ".join(mains.matches[0].reasons)
    earth = find(shop, req(capacitance_pf=D(100000), application="mains", position="line-earth"))
    assert earth.matches == ()
    assert "X2 is an X class: a line–earth position needs a Y class" in " ".join(earth.explanation)


def test_a_refusal_names_the_real_cause_and_no_class_not_asked_for(shop):
    add_bin(shop, "W1", _safety_part("X2 104M", "X2"), 5)
    text = " ".join(find(shop, req(capacitance_pf=D(100000), safety_class="Y2")).explanation)
    assert "X2 does not cover Y2" in text and "no X/Y safety class" not in text
    passed = find(shop, req(capacitance_pf=D(100000), application="mains", allow_marginal=True))
    assert not any("X3" in r for r in passed.matches[0].reasons)


# A tolerance asked for is a requirement: a part that marks none is no proven match, but it is named
# after the matches as a part to measure (common practice: measure before fitting).
def test_an_unmarked_part_is_a_part_to_measure_when_a_tolerance_is_asked(shop):
    add_bin(shop, "M1", part("100p C0G", "100", volts="50", code="C0G"), 40)
    add_bin(shop, "M2", part("101G C0G", "100", tol="2", volts="50", code="C0G"), 3)
    plain = find(shop, req(capacitance_pf=D(100), application="tuned"))
    assert _bins(plain) == ["M1", "M2"] or sorted(_bins(plain)) == ["M1", "M2"]
    strict = find(shop, req(capacitance_pf=D(100), tol_pct=D(2), application="tuned"))
    assert _bins(strict) == ["M2"]
    assert [m.bin_key for m in strict.to_measure] == ["M1"]
    assert "measure it before fitting (it must read 98 pF…102 pF)" in strict.to_measure[0].reasons[0]
    data = strict.to_json()
    assert [m["bin"] for m in data["to_measure"]] == ["M1"] and [m["bin"] for m in data["matches"]] == ["M2"]


# Tempco windows (EIA-198 Class 1: C0G 0 ±30, U2J −750 ±120; old names carry no tolerance on α).
@pytest.mark.parametrize(("code", "window", "ok"), [
    pytest.param("C0G", "0±30", True, id="C0G-fits-0-30"),
    pytest.param("U2J", "0±30", False, id="U2J-misses-0-30"),
    pytest.param("U2J", "-750±120", True, id="U2J-fits-its-own-window"),
    pytest.param("N750", "-750±120", True, id="N750-with-the-assumed-120-of-U2J"),
    pytest.param("N750", "-750±60", False, id="N750-assumed-120-is-wider-than-60"),
    pytest.param("S2H", "-330±30", False, id="S2H-band-60-is-wider-than-30"),
    pytest.param("X7R", "-1000..1000", False, id="class-2-has-no-linear-tempco"),
])
def test_a_part_meets_a_tempco_window_only_with_its_whole_band(shop, code, window, ok):
    add_bin(shop, "T1", part(f"150 {code}", "150", tol="5", code=code), 5)
    lo, hi = parse_tempco_window(window)
    assert bool(find(shop, req(tempco_min=lo, tempco_max=hi)).matches) is ok


def test_max_tempco_limits_the_magnitude(shop):
    add_bin(shop, "T2", part("150 S2H", "150", tol="5", code="S2H"), 5)   # −390…−270
    add_bin(shop, "T3", part("150 C0G", "150", tol="5", code="C0G"), 5)   # −30…+30
    assert _bins(find(shop, req(max_abs_tempco=D(100)))) == ["T3"]


def test_a_c0g_requirement_accepts_np0_as_the_same_dielectric(shop):
    add_bin(shop, "T4", part("150 NP0", "150", tol="5", code="NP0"), 5)
    add_bin(shop, "T5", part("150 U2J", "150", tol="5", code="U2J"), 5)
    r = build_requirement(value="150p", tempco="C0G")
    result = find(shop, r)
    assert _bins(result) == ["T4"]
    assert "NP0 serves as C0G" in result.matches[0].reasons


# Pairs, by the textbook formulas.
def test_100p_in_parallel_with_47p_makes_147p(shop):
    add_bin(shop, "P1", part("101J", "100", tol="1", volts="100", code="C0G"), 4)
    add_bin(shop, "P2", part("470J", "47", tol="1", volts="100", code="C0G"), 4)
    result = find(shop, req(capacitance_pf=D(147), tol_pct=D(2)), combine=True)
    assert result.matches == ()
    combo = result.combinations[0]
    assert combo.kind == "parallel" and combo.capacitance_pf == D(147)
    assert {(p.bin_key, p.capacitance_pf, p.count) for p in combo.parts} == {("P1", D(100), 1), ("P2", D(47), 1)}
    assert combo.worst_case_pct == D(1)        # 99 + 46.53 … 101 + 47.47 → ±1 % of 147 p
    assert combo.voltage_v == D(100)
    assert combo.reasons[0] == "47 pF ∥ 100 pF = 147 pF (C₁ + C₂)"


def test_220n_in_series_with_220n_uses_one_bin_twice_only_if_it_holds_two(shop):
    b = add_bin(shop, "S1", part("224K", "220000", tol="10", volts="100", code="C0G"), 1)
    r = req(capacitance_pf=D(110000), tol_pct=D(10))
    assert find(shop, r, combine=True).combinations == ()
    with shop.writing():
        shop.move(b, 1, "adjust")
    combo = find(shop, r, combine=True).combinations[0]
    assert (combo.kind, combo.capacitance_pf) == ("series", D(110000))
    assert [(p.bin_key, p.count) for p in combo.parts] == [("S1", 2)]
    assert combo.worst_case_pct == D(10)


def test_a_series_pair_splits_the_working_voltage_inversely_to_capacitance(shop):
    # 10 n + 40 n in series = 8 n; at 60 V the 10 n part takes 48 V, the 40 n part 12 V.
    add_bin(shop, "V1", part("103 50V", "10000", tol="5", volts="50", code="C0G"), 5)
    add_bin(shop, "V2", part("403 50V", "40000", tol="5", volts="50", code="C0G"), 5)
    ok = find(shop, req(capacitance_pf=D(8000), tol_pct=D(5), working_v=D(60), allow_marginal=True), combine=True)
    combo = ok.combinations[0]
    assert combo.kind == "series" and combo.voltage_v == D("62.5")
    assert any("60 V splits 48 V across V1, 12 V across V2" in r for r in combo.reasons)
    too_much = find(shop, req(capacitance_pf=D(8000), tol_pct=D(5), working_v=D(70), allow_marginal=True),
                    combine=True)
    assert too_much.combinations == ()


def test_an_n750_part_beside_an_np0_part_takes_the_assumed_tempco_tolerance(shop):
    # 40 p N750 ∥ 60 p NP0: (40·(−750) + 60·0)/100 = −300 ppm/K (parallel net-tempco rule); N750 marks
    # no tolerance on α, so the ±120 ppm/K of U2J (EIA-198, the code it is sold as) is assumed, as in
    # grading: spread (40·120 + 60·30)/100 = ±66 ppm/K, outside −300±30, inside −300±70
    add_bin(shop, "N1", part("40 N750", "40", tol="2", volts="100", code="N750"), 5)
    add_bin(shop, "N2", part("60 NP0", "60", tol="2", volts="100", code="NP0"), 5)
    add_bin(shop, "N3", part("100 NP0", "100", tol="2", volts="100", code="NP0"), 5)
    tight = find(shop, build_requirement(value="100p", tempco="-300±30"), combine=True)
    assert tight.matches == () and tight.combinations == ()
    result = find(shop, build_requirement(value="100p", tempco="-300±70"), combine=True)
    assert result.matches == ()           # the 100 p NP0 is 0 ppm/K: outside the window
    combo = result.combinations[0]
    assert combo.tempco_ppm_per_k == D(-300)
    assert any(r.startswith("N750 with NP0: net tempco (40·−750 + 60·0) / 100 = −300±66 ppm/K")
               for r in combo.reasons)
    assert any("N750 ±120 ppm/K assumed (as U2J" in r for r in combo.reasons)


def test_a_pair_exactly_on_a_negative_tempco_edge_is_found(shop):
    # EIA-198: U2G = 7.5 × −100 ± 30 = −750 ± 30; 40 p U2G ∥ 60 p C0G = −300 ± 30 ppm/K exactly,
    # the edge of the window −330…−270: the float pre-filter must not drop it
    add_bin(shop, "E1", part("40 U2G", "40", tol="2", volts="100", code="U2G"), 5)
    add_bin(shop, "E2", part("60 C0G", "60", tol="2", volts="100", code="C0G"), 5)
    result = find(shop, build_requirement(value="100p", tempco="-300±30"), combine=True)
    [combo] = [c for c in result.combinations if c.kind == "parallel"]
    assert combo.tempco_ppm_per_k == D(-300)
    assert any("−300±30 ppm/K, within −330…−270 ppm/K" in r for r in combo.reasons)


def test_find_json_has_the_contract_shape(shop):
    add_bin(shop, "J1", part("101J", "100", tol="1", volts="100", code="C0G"), 4)
    add_bin(shop, "J2", part("470J", "47", tol="1", volts="100", code="C0G"), 4)
    add_bin(shop, "J3", part("147F", "147", tol="1", volts="100", code="C0G"), 4)
    data = find(shop, req(capacitance_pf=D(147), tol_pct=D(2)), combine=True).to_json()
    json.dumps(data)
    assert {"requirement", "matches", "combinations"} <= set(data)
    assert set(data["matches"][0]) == {"bin", "location", "marking", "capacitance_pf", "available",
                                       "grade", "reasons"}
    assert {"kind", "parts", "capacitance_pf", "tempco_ppm_per_k", "worst_case_pct",
            "voltage_v"} <= set(data["combinations"][0])
    assert set(data["combinations"][0]["parts"][0]) == {"bin", "capacitance_pf", "count"}
    assert data["matches"][0]["capacitance_pf"] == 147.0


# Requirement parsing (EIA-198 codes for --tempco; windows written as nominal ± tolerance).
@pytest.mark.parametrize(("text", "expected"), [
    pytest.param("0±30", (D(-30), D(30)), id="zero-plus-minus-30"),
    pytest.param("-750±120", (D(-870), D(-630)), id="minus-750-plus-minus-120"),
    pytest.param("-100..100", (D(-100), D(100)), id="range"),
    pytest.param("C0G", (D(-30), D(30)), id="C0G-is-0-30"),
    pytest.param("U2J", (D(-870), D(-630)), id="U2J-is-minus-750-120"),
    pytest.param("N750", (D(-870), D(-630)), id="N750-takes-U2J-tolerance"),
    pytest.param("X7R", BadValue, id="class-2-is-no-window"),
    pytest.param("warm", BadValue, id="junk"),
])
def test_parse_tempco_window(text, expected):
    if expected is BadValue:
        with pytest.raises(BadValue, match=r"--tempco: cannot read"):
            parse_tempco_window(text)
    else:
        assert parse_tempco_window(text) == expected


@pytest.mark.parametrize(("options", "message"), [
    pytest.param({"use": "radio"}, "--use: cannot read 'radio' (expected one of tuned, timing,", id="bad-use"),
    pytest.param({"safety": "Z9"}, "--safety: cannot read 'Z9'", id="bad-safety"),
    pytest.param({"qty": 0}, "--qty: cannot read '0' (expected a quantity of 1 or more)", id="zero-qty"),
    pytest.param({"max_tempco": "lots"}, "--max-tempco: cannot read 'lots'", id="bad-max-tempco"),
])
def test_bad_requirements_name_the_option_and_what_it_accepts(options, message):
    with pytest.raises(BadValue) as caught:
        build_requirement(value="150p", **options)
    assert str(caught.value).startswith(message)


def test_build_requirement_reads_every_option():
    r = build_requirement(value="4n7", tol="10%", volts="63", use="timing", temp="-20..70",
                          family="MKT", qty=3, max_tempco="500")
    assert r.capacitance_pf == D(4700) and r.tol_pct == D(10) and r.working_v == D(63)
    assert (r.conditions.temp_min_c, r.conditions.temp_max_c) == (D(-20), D(70))
    assert r.family == "polyester" and r.qty == 3 and r.max_abs_tempco == D(500)
    assert r.describe() == "3 × 4.7 nF ±10 %, |α| ≤ 500 ppm/K, polyester, ≥ 63 V, fit for timing, −20…+70 °C"


# Property tests: whatever find returns meets every constraint when re-checked here, with the
# textbook formulas written out again and grades taken straight from stock.grading.
E12 = ("10", "12", "15", "18", "22", "27", "33", "39", "47", "56", "68", "82")  # IEC 60063 E12
stored_part = st.fixed_dictionaries({
    "pf": st.sampled_from(E12).flatmap(lambda v: st.sampled_from([v, str(int(v) * 10)])),
    "tol": st.sampled_from(["5", "1", "2", "10", None]),
    "volts": st.sampled_from(["100", "50", "25", None]),
    "code": st.sampled_from(["C0G", "NP0", "U2J", "N750", "S2H", "X7R", None]),
    "safety": st.sampled_from([None, None, None, "X2", "Y2"]),
    "on_hand": st.sampled_from([10, 6, 3, 2, 0, None]),
    "reserved": st.sampled_from([0, 0, 1, 2]),
})
requirement = st.fixed_dictionaries({
    "tol_pct": st.sampled_from([None, D(2), D(5), D(10), D(20)]),
    "window": st.sampled_from([None, None, (D(-30), D(30)), (D(-330), D(-270)), (D(-870), D(-630))]),
    "working_v": st.sampled_from([None, None, D(25), D(50)]),
    "application": st.sampled_from([None, None, "tuned", "signal"]),
    "allow_marginal": st.booleans(),
    "safety_class": st.sampled_from([None, None, None, "X2", "Y2"]),
    "qty": st.sampled_from([1, 1, 2, 3]),
})


def _targets(parts) -> list[Decimal]:
    """Values the stock can make: each part alone, and each pair in parallel and in series."""
    values = [D(p["pf"]) for p in parts]
    pairs = {v for a in values for b in values for v in (a + b, (a * b / (a + b)).quantize(D("0.01")))}
    return sorted(set(values)) + sorted(pairs - set(values))


def _covers(classes: str | None, need: str) -> bool:
    # IEC 60384-14: a Y part (tested harder, line–earth) serves an X position; an X part never a Y one.
    have = set((classes or "").replace("X1Y2", "X1 Y2").split())
    return bool(have & ({"X1", "X2", "Y1", "Y2"} if need == "X2" else {"Y1", "Y2"}))


def _part_ok(m: Marking, r: Requirement, volts: Decimal | None) -> bool:
    if r.safety_class and not _covers(m.safety_class, r.safety_class):
        return False
    if volts is not None and (m.voltage_v is None or m.voltage_v < volts):
        return False
    if r.application:
        word = grade(m, r.application, Conditions(working_v=volts)).word
        if word != "fit" and not (word == "marginal" and r.allow_marginal):
            return False
    return True


def _in_window(alpha_lo: Decimal, alpha_hi: Decimal, r: Requirement) -> bool:
    return r.tempco_min is None or (alpha_lo >= r.tempco_min and alpha_hi <= r.tempco_max)


# The tempco tolerance a part carries when none is marked: an old-name N750 is sold as EIA-198
# U2J, J = ±120 ppm/K (docs/sources.md: [EIA-198], [parameters-page]). Typed here, not read
# from the code.
USUAL_TEMPCO_TOLERANCE = {"N750": D(120)}


def _tempco_tolerance(d: Dielectric, unmarked_at_usual: bool) -> Decimal | None:
    """The ± ppm/K to judge a part by; None when it is not marked and not to be assumed."""
    if d.tempco_tol_ppm_per_k is not None:
        return d.tempco_tol_ppm_per_k
    return USUAL_TEMPCO_TOLERANCE[d.code] if unmarked_at_usual else None


@pytest.mark.parametrize("unmarked_at_usual", [
    pytest.param(False, id="unmarked-judged-on-nominal"),
    pytest.param(True, id="unmarked-at-usual-tolerance"),
])
@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(parts=st.lists(stored_part, min_size=1, max_size=14), wanted=requirement, data=st.data())
def test_every_result_meets_every_constraint_when_rechecked(unmarked_at_usual, parts, wanted, data):
    # a fresh store per example: the ledger is append-only, so a shared one cannot be emptied
    with open_store(":memory:") as store:
        _check_every_result(store, parts, wanted, data, unmarked_at_usual)


def _check_every_result(store: Store, parts, wanted, data, unmarked_at_usual: bool) -> None:
    stock: dict[str, tuple[Marking, int]] = {}
    for i, p in enumerate(parts):
        m = part(f"p{i}", p["pf"], tol=p["tol"], volts=p["volts"], code=p["code"], safety=p["safety"])
        bin_id = add_bin(store, f"K{i}", m, p["on_hand"])
        held = min(p["reserved"], p["on_hand"] or 0)
        if held:
            reserve(store, bin_id, held)
        stock[f"K{i}"] = (m, max(0, (p["on_hand"] or 0) - held))
    window = wanted.pop("window")
    target = data.draw(st.sampled_from(_targets(parts)), label="target")
    r = Requirement(capacitance_pf=target, **wanted, tempco_min=window[0] if window else None,
                    tempco_max=window[1] if window else None)
    t, tol = r.capacitance_pf, r.tol_pct
    lo, hi = (t * (1 - tol / 100), t * (1 + tol / 100)) if tol is not None else (t * D("0.99"), t * D("1.01"))
    result = find(store, r, combine=True, limit=5)

    for match in result.matches:
        m, available = stock[match.bin_key]
        assert match.available == available >= r.qty
        c = m.capacitance_pf
        if tol is not None:
            assert m.tolerance is not None
            assert c * (1 - m.tolerance.minus / 100) >= lo and c * (1 + m.tolerance.plus / 100) <= hi
        else:
            assert lo <= c <= hi
        if window:
            d = m.dielectric
            assert d is not None and d.tempco_ppm_per_k is not None
            # a single part with no marked tolerance on α is judged on its nominal, and says so
            spread = _tempco_tolerance(d, unmarked_at_usual=False)
            if spread is None:
                assert _in_window(d.tempco_ppm_per_k, d.tempco_ppm_per_k, r)
                assert any("nominal judged" in reason for reason in match.reasons), match.reasons
            else:
                assert _in_window(d.tempco_ppm_per_k - spread, d.tempco_ppm_per_k + spread, r)
        assert _part_ok(m, r, r.working_v)

    for combo in result.combinations:
        keys = [p.bin_key for p in combo.parts]
        if len(keys) == 1:
            (m1, avail), = [stock[keys[0]]]
            m2 = m1
            assert combo.parts[0].count == 2 * r.qty <= avail
        else:
            (m1, a1), (m2, a2) = stock[keys[0]], stock[keys[1]]
            assert all(p.count == r.qty for p in combo.parts) and a1 >= r.qty and a2 >= r.qty
        c1, c2 = m1.capacitance_pf, m2.capacitance_pf
        if combo.kind == "parallel":     # C = C₁ + C₂, each part sees the whole voltage
            value, w1, w2, v1, v2 = c1 + c2, c1, c2, r.working_v, r.working_v
            assert value >= max(c1, c2)
        else:                            # 1/C = 1/C₁ + 1/C₂, same charge on both parts
            value, w1, w2 = c1 * c2 / (c1 + c2), c2, c1
            v1 = v2 = None
            if r.working_v is not None:
                v1, v2 = r.working_v * c2 / (c1 + c2), r.working_v * c1 / (c1 + c2)
            assert value <= min(c1, c2)
        assert combo.capacitance_pf == value
        if tol is not None:
            corners = []
            for f1, f2 in ((1 - m1.tolerance.minus / 100, 1 - m2.tolerance.minus / 100),
                           (1 + m1.tolerance.plus / 100, 1 + m2.tolerance.plus / 100)):
                x, y = c1 * f1, c2 * f2
                corners.append(x + y if combo.kind == "parallel" else x * y / (x + y))
            assert corners[0] >= lo and corners[1] <= hi
        else:
            assert lo <= value <= hi
        if window:
            d1, d2 = m1.dielectric, m2.dielectric
            net = (w1 * d1.tempco_ppm_per_k + w2 * d2.tempco_ppm_per_k) / (w1 + w2)
            t1, t2 = _tempco_tolerance(d1, unmarked_at_usual), _tempco_tolerance(d2, unmarked_at_usual)
            if t1 is not None and t2 is not None:
                spread = (w1 * t1 + w2 * t2) / (w1 + w2)      # the same weights as the tempco
                assert _in_window(net - spread, net + spread, r)
            else:                                        # an unmarked part: its nominal at least
                assert _in_window(net, net, r)
        assert _part_ok(m1, r, v1) and _part_ok(m2, r, v2)
