"""Circuit drift: resonance, a tank's frequency shift, an RC timer's period shift.

Outside sources: f = 1/(2π√(LC)) (the resonance formula of every radio handbook; [lc-resonance] calculator
page);
the worked examples of docs/sources.md: [lc-resonance]: 10 MHz tank with C0G ±30 ppm/K → ∓150 Hz/K, N750 →
+3.75 kHz/K, N150 → +750 Hz/K (derived), 100 nF N750 warmed 5 K → 99.625 nF ([ham-list-n750], Elecraft list),
555 timing drift Δt/t ≈ ΔC/C with C0G over 60 K → ±0.18 % (derived from [timer-555]–[timer-555]).
"""

from __future__ import annotations

import math
from decimal import Decimal as D

import pytest

from stock.decoded import Dielectric, Marking
from stock.inventory.circuit_drift import circuit_drift
from stock.physics.drift import (
    parse_frequency, parse_inductance, parse_kelvin, parse_period, part_drift,
    resonant_frequency_hz, tank_capacitance_pf, tank_drift, tank_shift_ppm, timer_drift,
)
from stock.errors import BadValue

C0G = Dielectric("C0G", "ceramic", 1, D(0), D(30), D(-55), D(125))
N750 = Dielectric("N750", "ceramic", 1, D(-750), D(0), D(-55), D(125))   # α alone, as in the worked examples
N150 = Dielectric("N150", "ceramic", 1, D(-150), D(0), D(-55), D(125))
X7R = Dielectric("X7R", "ceramic", 2, temp_min_c=D(-55), temp_max_c=D(125),
                 change_minus_pct=D(15), change_plus_pct=D(15))


def part(dielectric: Dielectric, pf: str = "100") -> Marking:
    return Marking(f"{pf}p {dielectric.code}", D(pf), dielectric=dielectric)


# Resonance: handbook form f = 1/(2π√(LC)); the float oracle is math.sqrt/math.pi
@pytest.mark.parametrize("henry, pf, hz", [
    pytest.param(D("10E-6"), D("253.3"), 3_162_296, id="10uH-253.3pF-is-3.162MHz"),
    pytest.param(D("1E-6"), D(100), 15_915_494, id="1uH-100pF-is-15.9MHz"),
    pytest.param(D("100E-6"), D(500), 711_763, id="100uH-500pF-broadcast-band"),
])
def test_resonant_frequency_follows_the_handbook_formula(henry, pf, hz):
    assert resonant_frequency_hz(henry, pf) == hz
    assert hz == round(1 / (2 * math.pi * math.sqrt(float(henry) * float(pf) * 1e-12)))


def test_tank_capacitance_inverts_the_resonance_formula():
    c = tank_capacitance_pf(D(3_162_296), D("10E-6"))
    assert abs(c - D("253.3")) < D("0.001")


def test_resonance_refuses_a_zero_coil():
    with pytest.raises(BadValue, match="inductance: cannot read '0'"):
        resonant_frequency_hz(D(0), D(100))


# docs/sources.md: [lc-resonance]: 10 MHz tank, the whole tank of one part, per kelvin
@pytest.mark.parametrize("dielectric, low_hz, high_hz", [
    pytest.param(C0G, D(-150), D(150), id="C0G-150Hz-per-K"),
    pytest.param(N750, D(3750), D(3750), id="N750-plus-3.75kHz-per-K"),
    pytest.param(N150, D(750), D(750), id="N150-plus-750Hz-per-K"),
])
def test_a_10mhz_tank_moves_as_the_worked_examples(dielectric, low_hz, high_hz):
    shift = tank_drift(part(dielectric), D(10_000_000), D(100), D(1))
    assert (shift.shift_low_hz, shift.shift_high_hz) == (low_hz, high_hz)


def test_a_part_holding_a_third_of_the_tank_moves_it_a_third_as_much():
    # Δf/f = −½ · (C_part/C_tank) · ΔC/C: 50 pF N750 in a 150 pF tank, +10 K
    shift = tank_drift(part(N750, "50"), D(10_000_000), D(150), D(10))
    assert shift.shift_low_ppm == D(1250)            # −½ × ⅓ × −7500 ppm
    assert shift.shift_low_hz == D(12500)
    assert tank_shift_ppm(D(-7500), D(50), D(150)) == D(1250)


def test_a_part_larger_than_its_tank_is_refused():
    with pytest.raises(BadValue, match="--tank: cannot read '100 pF'"):
        tank_drift(part(C0G, "150"), D(10_000_000), D(100), D(1))


def test_a_100nf_n750_warmed_5_kelvin_loses_375_pf():
    # [ham-list-n750] (Elecraft list): 750·10⁻⁶ × 100 nF × 5 = 375 pF → 99.625 nF
    drift = part_drift(part(N750, "100000"), D(5))
    assert drift.delta_pf(D(100000)) == (D(-375), D(-375))


def test_a_c0g_timer_over_60_kelvin_moves_018_pct():
    # docs/sources.md: [timer-555] (555 timing drift): Δt/t ≈ ΔC/C; C0G over 60 K → ±0.18 %
    timer = timer_drift(part(C0G), D(60), D(1))
    assert (timer.low_pct, timer.high_pct) == (D("-0.18"), D("0.18"))
    assert timer.to_json()["shift_high_s"] == pytest.approx(0.0018)


def test_an_x7r_timer_moves_by_its_whole_window_whatever_the_change():
    # EIA-198: X7R ±15 % over −55…+125 °C, not a slope
    timer = timer_drift(part(X7R), D(2))
    assert (timer.low_pct, timer.high_pct) == (D(-15), D(15))
    assert not timer.part.linear


def test_a_roughly_linear_family_window_scales_with_the_change():
    # [film-dielectrics-table]: tantalum ±10 % over −55…+125 °C; 10 K of the nearer 80 K → ±1.25 %
    tant = Marking("10u tant", D(10_000_000), dielectric=Dielectric("tantalum", "tantalum"))
    timer = timer_drift(tant, D(10))
    assert (timer.low_pct, timer.high_pct) == (D("-1.25"), D("1.25"))


def test_a_part_of_unknown_dielectric_cannot_drift():
    with pytest.raises(BadValue, match=r"--part: cannot read '104' \(expected a part whose dielectric is known"):
        part_drift(Marking("104", D(100000)), D(10))


def test_circuit_drift_works_from_a_marking_without_a_database():
    # uses the project's decoder: "47p N750" decodes to α = −750 ppm/K (EIA-198 equivalents)
    result = circuit_drift(None, "47p N750", D(10), f0_hz=D(10_000_000), tank_pf=D(150))
    assert result.part_pf == D(47)
    assert result.shift_low_hz > 0                    # a negative tempco raises the frequency when warm


def test_circuit_drift_needs_a_tank_description():
    with pytest.raises(BadValue, match="--f0: cannot read ''"):
        circuit_drift(None, "101J C0G", D(10))


# Parsing what users type (SI prefixes, IEC 80000)
@pytest.mark.parametrize("parse, text, value", [
    pytest.param(parse_frequency, "10MHz", D(10_000_000), id="10MHz"),
    pytest.param(parse_frequency, "455 kHz", D(455_000), id="455kHz"),
    pytest.param(parse_frequency, "1e6", D(1_000_000), id="1e6"),
    pytest.param(parse_inductance, "10uH", D("0.00001"), id="10uH"),
    pytest.param(parse_inductance, "2.2mH", D("0.0022"), id="2.2mH"),
    pytest.param(parse_period, "10ms", D("0.01"), id="10ms"),
    pytest.param(parse_kelvin, "-15", D(-15), id="minus-15K"),
    pytest.param(parse_kelvin, "\u221215K", D(-15), id="real-minus-sign"),
])
def test_user_quantities_parse_with_si_prefixes(parse, text, value):
    assert parse(text) == value


@pytest.mark.parametrize("parse, text, message", [
    pytest.param(parse_frequency, "fast", "--f0: cannot read 'fast' (expected a frequency", id="words"),
    pytest.param(parse_frequency, "10MV", "--f0: cannot read '10MV'", id="wrong-unit"),
    pytest.param(parse_frequency, "0", "--f0: cannot read '0'", id="zero"),
    pytest.param(parse_period, "-1s", "--period: cannot read '-1s'", id="negative-time"),
])
def test_bad_user_quantities_are_refused_naming_the_option(parse, text, message):
    with pytest.raises(BadValue) as caught:
        parse(text)
    assert str(caught.value).startswith(message)
