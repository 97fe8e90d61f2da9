"""Tests for stock.compensation: a tank's lumped tempco from its drift, the slice, the residual, what to buy.

Outside source: the LC resonance formula f = 1/(2π√(LC)), whose derivative gives
Δf/f = −½·(ΔL/L + ΔC/C), so TC_eff = −2·(Δf/f)/ΔT and a slice Cx·(α_new − α_old) = −TC_eff·C_total
cancels it. Every expected number below is worked by hand from those formulas and written as a
literal with its arithmetic beside it. Tempco tolerances come from the EIA-198 Class 1 table
(G = ±30, H = ±60, J = ±120, K = ±250, L = ±500 ppm/K) and the old names' EIA equivalents in
the old names' EIA-198 codes ([EIA-198], [parameters-page]: P100 = M7G, N150 = P2G, N750 = U2J). The tank
examples
at 10 MHz are the worked ones of [lc-resonance] in docs/sources.md (N750 → +3.75 kHz/K, N150 → +750 Hz/K).
"""

from __future__ import annotations

from decimal import Decimal

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from stock.errors import BadOptions, BadValue
from stock.markings.ceramic_codes import decode_dielectric
from stock.physics.compensation import (Tank, fit, measure_tank, nearest_preferred, slice_tempco, tempco_spread,
                                        what_to_buy)

D = Decimal
MHZ7 = D(7_000_000)


def close(value: Decimal, expected: str, within: str = "0.001") -> bool:
    return abs(value - D(expected)) <= D(within)


def vfo(drift: str = "-20", unit: str = "Hz/K", **kw) -> Tank:
    """The worked example: 7 MHz, 300 pF of C0G, measured drift −20 Hz/K unless told."""
    kw.setdefault("tank_pf", D(300))
    return measure_tank(MHZ7, D(drift), unit, **kw)


def test_the_tanks_lumped_tempco_is_minus_twice_its_relative_drift():
    tank = vfo()
    # Δf/f = −20 / 7 000 000 = −2.857143 ppm/K; TC_eff = −2 × (−2.857143) = +5.714286 ppm/K
    assert close(tank.drift_ppm_per_k, "-2.857143")
    assert close(tank.tc_eff_ppm_per_k, "5.714286")
    # −TC_eff·C_total = −5.714286 × 300 = −1714.2857 pF·ppm/K
    assert close(tank.needed_pf_ppm, "-1714.2857", "0.001")


@pytest.mark.parametrize("drift, unit, delta_t, hz_per_k", [
    pytest.param("-20", "Hz/K", None, "-20", id="per-kelvin"),
    pytest.param("-60", "Hz", "3", "-20", id="60Hz-over-3K"),          # −60 / 3 = −20 Hz/K
    pytest.param("45", "Hz", "-3", "-15", id="cooled-and-rose"),       # +45 Hz on cooling 3 K: −15 Hz/K
    pytest.param("-3", "ppm/K", None, "-21", id="ppm-per-kelvin"),     # −3 ppm × 7 MHz = −21 Hz/K
    pytest.param("-9", "ppm", "3", "-21", id="ppm-over-3K"),           # −9 / 3 = −3 ppm/K = −21 Hz/K
])
def test_a_drift_reads_the_same_in_every_unit(drift, unit, delta_t, hz_per_k):
    tank = vfo(drift, unit, delta_t_k=D(delta_t) if delta_t else None)
    assert close(tank.drift_hz_per_k, hz_per_k)


def test_the_total_comes_from_the_coil_when_the_tank_is_not_given():
    tank = measure_tank(MHZ7, D(-20), "Hz/K", coil_h=D("4.7E-6"))
    # C = 1/((2π·7 MHz)²·4.7 µH) = 1/(1.934442e15 × 4.7e-6) = 1/9.091880e9 F = 109.988 pF
    assert close(tank.c_total_pf, "109.988", "0.001")


@pytest.mark.parametrize("alpha, cx", [
    pytest.param("-150", "11.428571", id="N150"),    # 1714.2857 / 150
    pytest.param("-750", "2.285714", id="N750"),     # 1714.2857 / 750
    pytest.param("-1500", "1.142857", id="N1500"),   # 1714.2857 / 1500
    pytest.param("-220", "7.792208", id="N220"),     # 1714.2857 / 220
])
def test_a_falling_frequency_needs_a_slice_of_negative_tempco(alpha, cx):
    assert close(vfo().slice_pf(D(alpha)), cx, "0.00001")


def test_a_positive_tempco_cannot_cancel_a_falling_frequency():
    # Cx = −1714.29 / (+100 − 0) < 0: no slice of P100 helps, it adds to the drift.
    assert vfo().slice_pf(D(100)) is None
    assert vfo().slice_pf(D(0)) is None   # swapping C0G for C0G changes nothing


def test_a_rising_frequency_needs_a_positive_tempco():
    tank = vfo("20")
    # TC_eff = −2 × (+2.857143) = −5.714286; Cx·(100 − 0) = +1714.2857 → Cx = 17.142857 pF of P100
    assert close(tank.slice_pf(D(100)), "17.142857", "0.00001")
    assert tank.slice_pf(D(-150)) is None
    assert "positive-tempco (P) parts" in tank.direction()
    assert "negative-tempco (N) parts" in vfo().direction()


def test_a_negative_tempco_capacitor_raises_the_frequency_as_it_warms():
    # A 10 MHz tank wholly of N750 (docs/sources.md: [lc-resonance] worked example): Δf/f = −½·(−750) =
    # +375 ppm/K, +3750 Hz per kelvin. Here as the residual of a tank that did not drift before.
    tank = Tank(D(10_000_000), D(100), D(0))
    result = fit(tank, D(100), D(-750), D(0))
    assert close(result.residual_ppm, "375")
    assert close(result.residual_hz, "3750")
    # N150 alone ([lc-resonance]): −½·(−150) = +75 ppm/K = +750 Hz/K
    assert close(fit(tank, D(100), D(-150), D(0)).residual_hz, "750")
    # and a positive one lowers it: 100 pF of P100 alone, −½·(+100) = −50 ppm/K = −500 Hz/K
    assert close(fit(tank, D(100), D(100), D(0)).residual_hz, "-500")


def test_fitting_12pF_of_N150_leaves_one_hertz_per_kelvin():
    result = fit(vfo(), D(12), D(-150), D(30))
    # residual = −½·(5.714286 + 12·(−150)/300) = −½·(5.714286 − 6) = +0.142857 ppm/K; × 7 = +1.0 Hz/K
    assert close(result.residual_ppm, "0.142857")
    assert close(result.residual_hz, "1.0")
    # band: α = −180 → 12·180/300 = 7.2 → −½·(5.714286 − 7.2) = +0.742857 ppm/K = +5.2 Hz/K
    #       α = −120 → 12·120/300 = 4.8 → −½·(5.714286 − 4.8) = −0.457143 ppm/K = −3.2 Hz/K
    assert close(result.residual_low_hz, "-3.2") and close(result.residual_high_hz, "5.2")
    # 12 pF is an E12 value: take out a 12 pF C0G part and the total stays 300 pF
    assert result.take_out_pf == 12 and result.fixed_pf == 12 and result.trim_pf == 0
    assert result.new_total_pf == 300


def test_a_slice_between_preferred_values_leaves_the_rest_to_the_trimmer():
    result = fit(vfo(), D("11.5"), D(-150), D(30))
    # nearest E12 fixed part to 11.5 pF is 12 pF; taking it out and fitting 11.5 pF gives 299.5 pF,
    # so 0.5 pF goes back on the trimmer
    assert result.fixed_pf == 12 and result.trim_pf == D("0.5")
    assert result.total_before_trim_pf == D("299.5")
    # residual = −½·(5.714286 − 11.5·150/300) = −½·(5.714286 − 5.75) = +0.017857 ppm/K = +0.125 Hz/K
    assert close(result.residual_hz, "0.125")


def test_fitting_15pF_of_P100_against_a_rising_drift():
    result = fit(vfo("20"), D(15), D(100), D(30))
    # −½·(−5.714286 + 15·100/300) = −½·(−0.714286) = +0.357143 ppm/K = +2.5 Hz/K
    assert close(result.residual_hz, "2.5")
    # α 70 → 3.5: −½·(−2.214286) = +1.107143 ppm/K = +7.75 Hz/K; α 130 → 6.5: −0.392857 = −2.75 Hz/K
    assert close(result.residual_low_hz, "-2.75") and close(result.residual_high_hz, "7.75")


def test_a_slice_taken_from_N150_counts_the_step_between_the_tempcos():
    tank = vfo(alpha_old=D(-150), alpha_old_name="N150")
    # Cx·(−750 − (−150)) = −1714.2857 → Cx = 1714.2857 / 600 = 2.857143 pF of N750
    assert close(tank.slice_pf(D(-750)), "2.857143", "0.00001")
    # a rising drift can be cancelled by C0G in place of N150: Cx·(0 + 150) = +1714.2857 → 11.428571 pF
    rising = vfo("20", alpha_old=D(-150), alpha_old_name="N150")
    assert close(rising.slice_pf(D(0)), "11.428571", "0.00001")
    assert "above the slice's N150" in rising.direction()


@pytest.mark.parametrize("code, tol, marked, words", [
    pytest.param("N150", "30", False, "that of P2G", id="N150-as-P2G"),     # G = ±30 ppm/K
    pytest.param("N750", "120", False, "that of U2J", id="N750-as-U2J"),    # J = ±120 ppm/K
    pytest.param("P100", "30", False, "that of M7G", id="P100-as-M7G"),     # G = ±30 ppm/K
    pytest.param("P2H", "60", True, "as marked", id="P2H-marked"),          # H = ±60 ppm/K
    pytest.param("U2J", "120", True, "as marked", id="U2J-marked"),
])
def test_a_tempco_tolerance_is_as_marked_or_the_usual_one_of_its_code(code, tol, marked, words):
    spread = tempco_spread(decode_dielectric(code))
    assert spread.tol_ppm_per_k == D(tol) and spread.marked is marked
    assert words in spread.basis


@pytest.mark.parametrize("value, expected", [
    pytest.param("11.43", "12", id="11.43-to-12"),   # E12 (IEC 60063): … 10, 12, 15 …
    pytest.param("2.286", "2.2", id="2.286-to-2.2"),  # … 1.8, 2.2, 2.7 …
    pytest.param("17.14", "18", id="17.14-to-18"),   # … 15, 18, 22 …
    pytest.param("57.14", "56", id="57.14-to-56"),   # … 47, 56, 68 …
])
def test_the_fixed_part_to_take_out_is_the_nearest_E12_value(value, expected):
    assert nearest_preferred(D(value)) == D(expected)


def test_what_to_buy_has_the_smallest_worst_case():
    purchase = what_to_buy(vfo())
    # Worst case over each name's usual tolerance, at its E12 value nearest the slice:
    #   N750 2.2 pF: −½·(5.714 − 5.5) = −0.107, ± ½·2.2·120/300 = 0.44  → 0.547 ppm/K
    #   N470 3.9 pF: −½·(5.714 − 6.11) = +0.198, ± ½·3.9·60/300 = 0.39  → 0.588
    #   N1500 1.2 pF: −½·(5.714 − 6.0) = +0.143, ± ½·1.2·250/300 = 0.5  → 0.643
    #   N150 12 pF:  +0.143 ± 0.6 → 0.743; N330 5.6 pF: +0.223 ± 0.56 → 0.783
    assert (purchase.code, purchase.sold_as, purchase.result.value_pf) == ("N750", "U2J", D("2.2"))
    # −0.107143 ppm/K × 7 = −0.75 Hz/K
    assert close(purchase.result.residual_hz, "-0.75")


def test_what_to_buy_for_a_drift_too_large_for_small_parts():
    purchase = what_to_buy(vfo("-500"))
    # TC_eff = −2·(−500/7) = +142.857 ppm/K; N750 slice = 142.857·300/750 = 57.14 pF → E12 56 pF:
    # −½·(142.857 − 56·750/300) = −½·(2.857) = −1.4286 ppm/K = −10 Hz/K
    assert (purchase.code, purchase.result.value_pf) == ("N750", D(56))
    assert close(purchase.result.residual_hz, "-10")


def test_nothing_to_buy_when_no_slice_within_half_the_tank_cancels_it():
    # +2000 Hz/K at 7 MHz: TC_eff = −571.4 ppm/K; only P100 is positive: Cx = 571.4·300/100 = 1714 pF
    assert what_to_buy(vfo("2000")) is None


@pytest.mark.parametrize("kwargs, error, words", [
    pytest.param({}, BadOptions, "--tank/--coil: neither was given", id="no-tank-no-coil"),
    pytest.param({"tank_pf": D(300), "coil_h": D("4.7E-6")}, BadOptions, "both were given", id="both"),
    pytest.param({"tank_pf": D(0)}, BadValue, "--tank: cannot read '0'", id="zero-tank"),
    pytest.param({"tank_pf": D(300), "delta_t_k": D(3)}, BadOptions, "needs no temperature change",
                 id="per-kelvin-with-delta-t"),
])
def test_a_tank_badly_described_is_one_clear_error(kwargs, error, words):
    with pytest.raises(error) as caught:
        measure_tank(MHZ7, D(-20), "Hz/K", **kwargs)
    assert words in str(caught.value)
    assert caught.value.exit_code == 2


def test_a_whole_shift_needs_its_temperature_change_and_a_frequency_above_zero():
    with pytest.raises(BadOptions, match="needs the warming it took"):
        measure_tank(MHZ7, D(-60), "Hz", tank_pf=D(300))
    with pytest.raises(BadValue, match="--delta-t"):
        measure_tank(MHZ7, D(-60), "Hz", tank_pf=D(300), delta_t_k=D(0))
    with pytest.raises(BadValue, match="--f0: cannot read '0'"):
        measure_tank(D(0), D(-20), "Hz/K", tank_pf=D(300))
    with pytest.raises(BadValue, match="--f0"):
        measure_tank(D(-7), D(-20), "Hz/K", tank_pf=D(300))


@pytest.mark.parametrize("text, alpha, name", [
    pytest.param("C0G", "0", "C0G", id="C0G"),             # EIA-198: C0G = 0 ± 30 ppm/K
    pytest.param("NP0", "0", "NP0", id="NP0"),
    pytest.param("N150", "-150", "N150", id="N150"),
    pytest.param("-150ppm/K", "-150", "−150 ppm/K", id="number-with-unit"),
    pytest.param("+55", "55", "+55 ppm/K", id="mica-figure"),
])
def test_the_slices_own_tempco_is_a_code_or_a_number(text, alpha, name):
    assert slice_tempco(text) == (D(alpha), name)


def test_a_class_2_code_is_no_tempco_for_a_slice():
    with pytest.raises(BadValue, match="--tank-tempco: cannot read 'X7R'"):
        slice_tempco("X7R")


# Invariants of the formula itself (LC resonance formula, as above): fitting exactly the slice leaves
# no drift, and the band over the tempco tolerance always holds the nominal residual.
_frequencies = st.integers(min_value=100_000, max_value=500_000_000).map(D)
_tanks = st.integers(min_value=10, max_value=5_000).map(D)
_drifts = st.integers(min_value=-2_000, max_value=2_000).filter(bool).map(lambda n: D(n) / 10)
_alphas = st.sampled_from([D(-4700), D(-1500), D(-750), D(-470), D(-150), D(-33), D(100)])


@settings(max_examples=200, deadline=None)
@given(_frequencies, _tanks, _drifts, _alphas, st.integers(min_value=0, max_value=500).map(D))
def test_the_exact_slice_leaves_no_drift_and_the_band_holds_the_nominal(f0, c, drift, alpha, tol):
    tank = measure_tank(f0, drift, "Hz/K", tank_pf=c)
    cx = tank.slice_pf(alpha)
    if cx is None:
        # no slice only when the tempco pushes the same way as the drift
        assert (alpha < 0) == (drift > 0)
        return
    assert abs(tank.residual_ppm(cx, alpha)) < D("1E-18")
    result = fit(tank, cx, alpha, tol)
    assert result.residual_low_ppm <= result.residual_ppm <= result.residual_high_ppm
