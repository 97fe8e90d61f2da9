"""Tests for stock.compensating: the parts on a shelf that null a drifting oscillator, ranked.

The shelf is a CSV of our own (the bench of a fictional shop, Kestrel Row Radio), imported through
the real importer. Expected numbers are worked by hand from the LC resonance formula
(Δf/f = −½·ΔC/C, so residual = −½·(TC_eff + P·α/C_total), TC_eff = −2·(Δf/f)/ΔT), and the
textbook pair formulas (parallel C₁ + C₂; series C₁C₂/(C₁ + C₂)). Old names take the tolerance of
the EIA-198 code the old-name tables give for them ([EIA-198], [parameters-page], [latvian-codes]) (N150 = P2G
±30, N750 = U2J ±120, P100 =
M7G ±30 ppm/K).
"""

from __future__ import annotations

import json
from decimal import Decimal

import pytest

from stock.matching.compensating import compensate, headline
from stock.physics.compensation import measure_tank
from stock.inventory.intake import import_file
from stock.store.database import open_store

D = Decimal

KESTREL_SHELF = """Bin,Marking,Qty,Notes
K1,10p N150,12,orange-top discs
K2,12p N150,3,
K3,1p5 N150,7,
K4,2p2 N750,20,violet tubulars
K5,22p N750,4,
K6,15p P100,6,
K7,100J C0G,10,
K8,2p2 N750,2,a second bag of the same
K9,3p3 N750,0,used up
"""


@pytest.fixture
def shelf(tmp_path):
    sheet = tmp_path / "kestrel_row.csv"
    sheet.write_text(KESTREL_SHELF, encoding="utf-8")
    store = open_store(tmp_path / "kestrel.db")
    import_file(store, sheet)
    yield store
    store.close()


def vfo(drift: str, **kw):
    kw.setdefault("tank_pf", D(300))
    return measure_tank(D(7_000_000), D(drift), "Hz/K", **kw)


def close(value, expected: str, within: str = "0.01") -> bool:
    return abs(D(str(value)) - D(expected)) <= D(within)


def test_a_falling_drift_is_nulled_by_the_N750_part_nearest_its_slice(shelf):
    result = compensate(shelf, vfo("-20"))
    best = result.options[0]
    # N750 slice = 1714.2857 / 750 = 2.2857 pF; 2.2 pF leaves −½·(5.714286 − 2.2·750/300) = −0.107143
    # ppm/K = −0.75 Hz/K; band ±½·2.2·120/300 = ±0.44 ppm/K → −0.547 … +0.333 ppm/K = −3.83 … +2.33 Hz/K
    assert [p.code for p in best.parts] == ["N750"] and best.result.value_pf == D("2.2")
    assert close(best.result.residual_hz, "-0.75")
    assert close(best.result.residual_low_hz, "-3.83") and close(best.result.residual_high_hz, "2.33")
    assert close(best.cx_pf, "2.2857", "0.0001")
    # of the two 2.2 pF bins, the one with more on hand (20 against 2)
    assert best.parts[0].bin_key.endswith("k4")
    # next: 12 pF N150, −½·(5.714286 − 6) = +0.142857 ppm/K = +1.0 Hz/K; then 10 pF N150, −2.5 Hz/K
    assert [(o.parts[0].code, o.result.value_pf) for o in result.options[1:3]] == [("N150", 12), ("N150", 10)]
    assert close(result.options[1].result.residual_hz, "1.0")
    assert close(result.options[2].result.residual_hz, "-2.5")   # −½·(5.714286 − 5) = −0.357143 ppm/K
    assert result.purchase is None


def test_the_bench_line_says_what_to_take_out_and_fit(shelf):
    tank = vfo("-20")
    line = headline(tank, compensate(shelf, tank).options[0])
    assert line == ("take out 2.2 pF of C0G, fit 2.2 pF N750 from bin kestrel_row/k4: "
                    "drift −20 → −0.8 Hz/K (band −3.8 … +2.3)")   # −0.75 rounds away from zero


def test_a_pair_comes_nearer_than_any_single_part_when_combining(shelf):
    result = compensate(shelf, vfo("-20"), combine=True)
    best = result.options[0]
    # 10 pF ∥ 1.5 pF N150 = 11.5 pF against a slice of 11.43 pF: −½·(5.714286 − 11.5·150/300)
    # = −½·(−0.035714) = +0.017857 ppm/K = +0.125 Hz/K
    assert best.kind == "parallel" and best.result.value_pf == D("11.5")
    assert sorted(p.capacitance_pf for p in best.parts) == [D("1.5"), D(10)]
    assert close(best.result.residual_hz, "0.125")
    # the 12 pF fixed part taken out leaves 0.5 pF for the trimmer
    assert best.result.fixed_pf == 12 and best.result.trim_pf == D("0.5")


def test_options_rank_by_the_drift_they_leave(shelf):
    options = compensate(shelf, vfo("-20"), combine=True, limit=10).options
    left = [abs(o.result.residual_ppm) for o in options]
    assert left == sorted(left)


def test_a_bin_with_nothing_available_is_not_offered(shelf):
    options = compensate(shelf, vfo("-20"), limit=20).options
    assert all(not p.bin_key.endswith("k9") for o in options for p in o.parts)


def test_a_rising_drift_takes_the_P100_part_and_refuses_the_N_parts(shelf):
    result = compensate(shelf, vfo("20"))
    # P100 slice = 1714.2857 / 100 = 17.14 pF; 15 pF leaves −½·(−5.714286 + 5) = +0.357 ppm/K = +2.5 Hz/K
    assert [(o.parts[0].code, o.result.value_pf) for o in result.options] == [("P100", 15)]
    assert close(result.options[0].result.residual_hz, "2.5")
    notes = {t.codes: t.note for t in result.tempcos}
    assert "needs a positive tempco" in notes[("N750",)]
    assert "needs a positive tempco" in notes[("N150",)]
    assert "changes nothing" in notes[("C0G",)]


def test_a_drift_too_large_for_the_shelf_says_what_to_buy(shelf):
    result = compensate(shelf, vfo("-500"))
    # TC_eff = +142.857 ppm/K; N750 slice 57.14 pF, N150 285.7 pF. The best on hand, 22 pF N750, leaves
    # −500·(1 − 22/57.14) = −307.5 Hz/K, less than half off: nothing on hand does it.
    assert not any(o.useful for o in result.options)
    assert close(result.options[0].result.residual_hz, "-307.5", "0.1")
    # To buy: 56 pF N750 (E12 nearest 57.14): −½·(142.857 − 140) = −1.4286 ppm/K = −10 Hz/K,
    # band ±½·56·120/300 = ±11.2 ppm/K → −12.63 … +9.77 ppm/K = −88.4 … +68.4 Hz/K
    buy = result.purchase
    assert (buy.code, buy.sold_as, buy.result.value_pf) == ("N750", "U2J", D(56))
    assert close(buy.result.residual_hz, "-10")
    assert close(buy.result.residual_low_hz, "-88.4", "0.05") and close(buy.result.residual_high_hz, "68.4", "0.05")
    assert any(line.startswith("to buy: 56 pF N750 (sold as U2J, ±120 ppm/K)") for line in result.explanation)


def test_an_empty_shelf_explains_itself_and_names_what_to_buy(tmp_path):
    with open_store(tmp_path / "empty.db") as store:
        result = compensate(store, vfo("-20"))
    assert result.options == ()
    assert result.explanation[0] == "no Class 1 ceramic with a stated tempco is on hand"
    assert result.purchase.code == "N750"


def test_no_drift_means_nothing_to_do(shelf):
    result = compensate(shelf, vfo("0"))
    assert result.options == () and result.purchase is None
    assert result.explanation == ("the measured drift is zero: nothing to cancel",)


def test_the_json_answer_carries_each_options_parts_slice_and_band(shelf):
    data = json.loads(json.dumps(compensate(shelf, vfo("-20"), combine=True).to_json()))
    assert data["tank"]["c_total_pf"] == 300 and close(data["tank"]["tc_eff_ppm_per_k"], "5.714286", "0.000001")
    option = data["options"][0]
    assert {"kind", "parts", "cx_pf", "residual_hz_per_k", "residual_band_hz_per_k", "residual_ppm_per_k",
            "residual_band_ppm_per_k", "take_out_pf", "new_total_pf", "useful", "text"} <= option.keys()
    part = option["parts"][0]
    assert {"bin", "capacitance_pf", "tempco", "tempco_ppm_per_k", "tempco_tol_ppm_per_k",
            "tempco_tol_marked", "tempco_tol_basis", "count"} <= part.keys()
    assert part["tempco"] == "N150" and part["tempco_tol_ppm_per_k"] == 30 and not part["tempco_tol_marked"]
    assert data["assumptions"] and data["cautions"]


def test_a_slice_taken_from_N150_is_replaced_by_C0G_against_a_rising_drift(shelf):
    tank = vfo("20", alpha_old=D(-150), alpha_old_name="N150")
    result = compensate(shelf, tank)
    # Cx·(0 − (−150)) = +1714.2857 → Cx = 11.43 pF of C0G; 10 pF leaves −½·(−5.714286 + 10·150/300)
    # = +0.357143 ppm/K = +2.5 Hz/K. P100 would need 1714.2857/250 = 6.86 pF: its 15 pF part is too big.
    assert [(o.parts[0].code, o.result.value_pf) for o in result.options] == [("C0G", 10)]
    assert close(result.options[0].result.residual_hz, "2.5")
    assert headline(tank, result.options[0]).startswith("take out 10 pF of N150, fit 10 pF C0G from bin")
    notes = {t.codes: t.note for t in result.tempcos}
    assert "changes nothing" in notes[("N150",)]
    assert "needs a tempco above the slice's N150" in notes[("N750",)]


def test_a_part_to_buy_is_named_only_when_it_beats_the_shelf(shelf):
    # With pairs the shelf leaves +0.125 Hz/K (band −3.9 … +4.15); the best buy, 2.2 pF N750, leaves
    # −0.75 Hz/K: not better, so nothing to buy.
    assert compensate(shelf, vfo("-20"), combine=True).purchase is None
