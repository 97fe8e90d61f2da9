"""A tank's or timer's drift from one part named as a bin or a marking; errors say what is missing.

Sources: C0G is 0 ±30 ppm/K (EIA-198); 101 = 100 pF (IEC 60062 three-digit code); a tank's
Δf/f = −½ · (C_part/C_tank) · ΔC/C for small changes (first-order from f = 1/(2π√(LC)), any circuits
handbook); an RC timer's Δt/t = ΔC/C (t ∝ RC). Numbers below are hand arithmetic.
"""

from __future__ import annotations

import csv
from decimal import Decimal

import pytest

from stock.errors import BadValue
from stock.inventory.circuit_drift import circuit_drift, resolve_part
from stock.inventory.intake import import_file
from stock.physics.drift import TankDrift, TimerDrift


@pytest.fixture
def shop(store, tmp_path):
    path = tmp_path / "osc.csv"
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(["Location", "Label", "Marking", "Qty"])
        w.writerow(["T1", "tank cap", "101J C0G", "8"])
    import_file(store, path)
    return store.path


def test_a_bin_in_the_store_is_found_by_its_location(shop):
    m = resolve_part(shop, "T1")
    assert m.dielectric.code == "C0G"
    assert m.capacitance_pf == Decimal(100)      # 101 = 10 x 10^1 pF


def test_a_marking_is_decoded_when_no_bin_has_that_name(shop):
    assert resolve_part(shop, "471J C0G").capacitance_pf == Decimal(470)   # 47 x 10^1 pF


def test_a_marking_is_decoded_when_there_is_no_database(tmp_path):
    assert resolve_part(tmp_path / "none.db", "101J C0G").dielectric.code == "C0G"
    assert resolve_part(None, "101J C0G").dielectric.code == "C0G"
    assert not (tmp_path / "none.db").exists()


@pytest.mark.parametrize("text", [
    pytest.param("104", id="a-value-without-a-dielectric"),
    pytest.param("nonsense", id="no-marking-at-all"),
])
def test_a_part_that_names_no_dielectric_is_refused_with_an_example(text):
    with pytest.raises(BadValue) as info:
        resolve_part(None, text)
    message = str(info.value)
    assert f"--part: cannot read {text!r}" in message
    assert "'101J C0G'" in message


def test_a_c0g_part_alone_in_a_10_mhz_tank_moves_it_by_1500_hz_over_10_k(shop):
    # ΔC/C = ±30 ppm/K x 10 K = ±300 ppm; Δf/f = −½ x 1 x ±300 = ∓150 ppm; 10 MHz x 150 ppm = 1500 Hz
    d = circuit_drift(shop, "T1", Decimal(10), f0_hz=Decimal(10_000_000), tank_pf=Decimal(100))
    assert isinstance(d, TankDrift)
    assert (d.shift_low_ppm, d.shift_high_ppm) == (Decimal(-150), Decimal(150))
    assert (d.shift_low_hz, d.shift_high_hz) == (Decimal(-1500), Decimal(1500))


def test_a_coil_instead_of_a_tank_capacitance_works_the_tank_out_from_f0():
    # f0 = 1/(2π√(LC)): 10 µH and 253.3 pF resonate at about 3.162 MHz; the tank is then ≈ 253.3 pF
    d = circuit_drift(None, "101J C0G", Decimal(10), f0_hz=Decimal(3_162_296), coil_h=Decimal("10E-6"))
    assert abs(d.tank_pf - Decimal("253.3")) < Decimal("0.1")


def test_a_c0g_timer_drifts_by_0_18_percent_over_60_k():
    # Δt/t = ΔC/C = ±30 ppm/K x 60 K = ±1800 ppm = ±0.18 %
    d = circuit_drift(None, "101J C0G", Decimal(60), timer=True)
    assert isinstance(d, TimerDrift)
    assert (d.low_pct, d.high_pct) == (Decimal("-0.18"), Decimal("0.18"))


@pytest.mark.parametrize("options, option, accepted", [
    pytest.param({}, "--f0", "10MHz", id="no-frequency"),
    pytest.param({"f0_hz": Decimal(1_000_000)}, "--tank", "--coil", id="neither-tank-nor-coil"),
])
def test_a_tank_that_is_not_described_is_refused_naming_the_missing_option(options, option, accepted):
    with pytest.raises(BadValue) as info:
        circuit_drift(None, "101J C0G", Decimal(10), **options)
    assert str(info.value).startswith(f"{option}: ")
    assert accepted in str(info.value)
