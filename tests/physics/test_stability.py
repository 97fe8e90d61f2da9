"""Dielectric stability figures: ageing, DC bias, derating, typical drift per family.

Outside sources (keys of docs/sources.md): [ageing-faq] a maker's FAQ (ageing maxima per
decade-hour), [ageing-maker-notes] two makers' ageing notes (logarithmic law),
[tantalum-derating-qa]/[polymer-derating-qa] a maker's derating notes (tantalum MnO2 50 %, polymer
90/80 %), [dc-bias-note]/[dc-bias-article]/[effective-capacitance-tool] DC-bias notes,
[film-dielectrics-table] a film maker's table, [polystyrene-article]/[silver-mica-overview]
polystyrene and silver-mica pages. Figures marked "from memory" in stock.stability are checked only
for being present and sourced.
"""

from __future__ import annotations

import math
from decimal import Decimal as D

import pytest
from hypothesis import given
from hypothesis import strategies as st

from stock.decoded import FAMILIES, Dielectric
from stock.physics.stability import (
    AGEING_PER_DECADE_PCT, DERATING, FAMILY_DRIFT, SHELF_LIFE, ageing_decades, ageing_loss_pct,
    ageing_rate_pct, assumed_tempco_tol, dc_bias_loss_pct, derating_for, is_polarised,
    temperature_figures,
)


# The high end of the published ranges per decade-hour (maker ageing notes: [mlcc-selection-article],
# [ageing-blog], [ageing-maker-notes]: X7R/X5R 1.5…4 %, Z5U 4…6 %, Y5V 6…10 %) or [ageing-faq]'s
# maximum where it is higher (Z5U 7 %)
@pytest.mark.parametrize("code, rate", [
    pytest.param("X7R", D("4"), id="X7R-4pct"),
    pytest.param("X5R", D("4"), id="X5R-4pct"),
    pytest.param("Z5U", D("7"), id="Z5U-7pct-ageing-faq"),
    pytest.param("Y5V", D("10"), id="Y5V-10pct"),
])
def test_class2_ageing_rates_are_the_high_end_of_the_published_ranges(code, rate):
    assert ageing_rate_pct(code, 2) == rate == AGEING_PER_DECADE_PCT[code]


def test_class1_ceramics_do_not_age():
    # [ageing-faq], [mlcc-selection-article], [ageing-blog]: C0G ≈ 0
    assert ageing_rate_pct("C0G", 1) == 0


def test_a_class2_code_not_listed_ages_by_its_change_letter():
    # EIA-198 change letters: R (±15 %) like X5R, V (+22/−82 %) like Y5V (from memory of
    # [mlcc-selection-article]/[ageing-blog] ranges)
    assert ageing_rate_pct("X6R", 2) == D("4")
    assert ageing_rate_pct("Y6V", 2) == D("10")
    assert ageing_rate_pct(None, 2) == D("10")


@pytest.mark.parametrize("years, decades", [
    pytest.param(D(10), math.log10(10 * 8766 / 1000), id="10-years"),
    pytest.param(D(1), math.log10(8766 / 1000), id="1-year"),
    pytest.param(D("0.1"), 0.0, id="under-1000h-is-inside-the-tolerance"),
])
def test_decades_count_from_the_1000_hour_referee_time(years, decades):
    # logarithmic ageing law ([ageing-maker-notes]): loss = rate × log10(t / t_ref)
    assert float(ageing_decades(years)) == pytest.approx(decades, abs=0.001)


def test_ageing_loss_grows_with_service_life():
    assert ageing_loss_pct("X7R", 2, D(1)) < ageing_loss_pct("X7R", 2, D(10)) < ageing_loss_pct("X7R", 2, D(100))


# DC bias ([dc-bias-note]: 10 µF 10 V X7R at 5 V keeps 50 % in 0805, 93 % in 1206;
# [effective-capacitance-tool]: 35–65 % loss at rated, worse in small cases). A model from memory of published curves.
def test_dc_bias_in_0805_matches_the_published_point():
    # [dc-bias-note]: 50 % kept at half rated; the model gives 71 × √0.5 = 50.2 % lost
    assert dc_bias_loss_pct("X7R", D(10_000_000), D(5), D(10), "0805") == D("50.2")


def test_dc_bias_in_1206_is_below_0805_and_still_above_the_published_point():
    # [dc-bias-note]: 7 % lost in 1206 at half rated; the model keeps a margin above it (conservative)
    loss = dc_bias_loss_pct("X7R", D(10_000_000), D(5), D(10), "1206")
    assert D(7) < loss < dc_bias_loss_pct("X7R", D(10_000_000), D(5), D(10), "0805")


def test_dc_bias_with_no_case_size_assumes_the_worst_small_case():
    unknown = dc_bias_loss_pct("X5R", D(10_000_000), D(10), D(10))
    assert unknown == D(80) >= dc_bias_loss_pct("X5R", D(10_000_000), D(10), D(10), "0402")


def test_dc_bias_rises_steeply_at_first_then_flattens():
    # published curves: most of the loss comes in the first part of the voltage range
    quarter = dc_bias_loss_pct("X7R", D(10_000_000), D("2.5"), D(10), "0805")
    half = dc_bias_loss_pct("X7R", D(10_000_000), D(5), D(10), "0805")
    full = dc_bias_loss_pct("X7R", D(10_000_000), D(10), D(10), "0805")
    assert quarter - 0 > half - quarter > 0 and half - quarter > (full - half) / 2


@pytest.mark.parametrize("text, case", [
    pytest.param("0805", "0805", id="inch-code"),
    pytest.param("SMD 1206", "1206", id="in-words"),
    pytest.param("2012M", "0805", id="metric-2012-is-0805"),
    pytest.param("3216 metric", "1206", id="metric-3216-is-1206"),
    pytest.param("radial 5mm", None, id="leaded"),
    pytest.param("10805", None, id="not-a-case"),
])
def test_case_sizes_are_read_from_the_package_text(text, case):
    # EIA inch case codes and their metric pairs (from memory of EIA/IEC case tables)
    from stock.physics.stability import read_case_size

    assert read_case_size(text) == case


def test_dc_bias_loss_of_a_high_k_part_is_larger():
    # from memory: high-K codes lose 70–90 % at rated whatever the case
    assert dc_bias_loss_pct("Y5V", D(1_000_000), D(8), D(16), "1206") > dc_bias_loss_pct("X7R", D(1_000_000), D(8), D(16), "1206")


@given(st.integers(0, 200), st.integers(1, 100), st.integers(1, 10**9),
       st.sampled_from([None, "0402", "0805", "1206", "2220"]))
def test_dc_bias_loss_never_exceeds_the_loss_at_rated_and_never_falls_with_voltage(v, rated, cap, case):
    loss = dc_bias_loss_pct("X7R", D(cap), D(v), D(rated), case)
    higher = dc_bias_loss_pct("X7R", D(cap), D(v + 1), D(rated), case)
    assert D(0) <= loss <= higher <= D(80)


def test_dc_bias_refuses_a_zero_rating():
    with pytest.raises(ValueError, match="rated voltage must be positive"):
        dc_bias_loss_pct("X7R", D(1000), D(5), D(0))


# Derating rules (docs/sources.md: derating pages ([tantalum-derating-qa], [polymer-derating-qa],
# [dc-bias-note]))
@pytest.mark.parametrize("family, klass, rated, fraction", [
    pytest.param("tantalum", None, D(16), D("0.5"), id="tantalum-MnO2-50pct-tantalum-derating-qa"),
    pytest.param("tantalum-polymer", None, D(6), D("0.9"), id="polymer-le-10V-90pct-polymer-derating-qa"),
    pytest.param("tantalum-polymer", None, D(25), D("0.8"), id="polymer-over-10V-80pct-polymer-derating-qa"),
    pytest.param("aluminium-electrolytic", None, D(25), D("0.8"), id="aluminium-80pct-memory"),
    pytest.param("ceramic", 2, D(50), D("0.5"), id="class2-mlcc-2x-dc-bias-note"),
    pytest.param("polypropylene", None, D(100), D("0.8"), id="film-80pct-memory"),
])
def test_derating_follows_the_rules_of_thumb(family, klass, rated, fraction):
    assert derating_for(family, klass, rated).fraction == fraction


def test_every_derating_rule_names_its_source():
    for rule in DERATING.values():
        assert rule.source and rule.rule


# Typical temperature figures per family ([film-dielectrics-table], [polystyrene-article],
# [silver-mica-overview], [film-capacitor-text] and memory)
def test_every_family_but_ceramic_has_typical_temperature_figures_with_a_source():
    for family in FAMILIES:
        if family == "ceramic":
            continue
        figures = FAMILY_DRIFT[family]
        assert figures.source
        assert figures.tempco_ppm_per_k is not None or figures.change_minus_pct is not None


def test_silver_mica_tempco_band_covers_the_typical_range_and_characteristic_e():
    # [silver-mica-overview]: +35…+75 ppm/K typical; characteristic E −20…+100 ppm/K (from memory
    # of [MIL-PRF-39001])
    mica = FAMILY_DRIFT["mica"]
    assert mica.tempco_ppm_per_k - mica.tempco_tol_ppm_per_k == -20
    assert mica.tempco_ppm_per_k + mica.tempco_tol_ppm_per_k == 100


def test_the_family_figures_have_one_home():
    # the grading table is the names table, figure for figure
    from stock.markings.families import FAMILY_FIGURES

    for name, drift in FAMILY_DRIFT.items():
        f = FAMILY_FIGURES[name]
        assert (drift.tempco_ppm_per_k, drift.tempco_tol_ppm_per_k, drift.temp_max_c, drift.change_minus_pct) == \
            (f.tempco, f.tempco_tol, f.temp_max_c, f.change_minus_pct)


def test_tantalum_window_is_the_published_10_percent():
    # [film-dielectrics-table]: ±10 % over −55…+125 °C
    t = FAMILY_DRIFT["tantalum"]
    assert (t.change_minus_pct, t.change_plus_pct, t.temp_min_c, t.temp_max_c) == (D(10), D(10), D(-55), D(125))


def test_a_dielectric_with_its_own_figures_keeps_them():
    own = Dielectric("polyester", "polyester", None, D(400), D(200), D(-55), D(125), D(5), D(5), source="a film maker's table")
    figures = temperature_figures(own)
    assert figures.tempco_ppm_per_k == D(400) and figures.source == "a film maker's table"


def test_a_family_named_without_figures_takes_the_typical_ones():
    assert temperature_figures(Dielectric("mica", "mica")) is FAMILY_DRIFT["mica"]
    assert temperature_figures(Dielectric("X7R", "ceramic", 2)) is None


def test_electrolytic_windows_are_not_scaled_to_a_narrow_range():
    # from memory: the loss is at the cold end, not linear
    assert FAMILY_DRIFT["aluminium-electrolytic"].linear is False


@pytest.mark.parametrize("alpha, tol", [
    pytest.param(D(0), D(30), id="NP0-as-C0G-30"),
    pytest.param(D(-150), D(30), id="N150-as-P2G-30-parameters-page"),
    pytest.param(D(-750), D(120), id="N750-as-U2J-120"),
    pytest.param(D(-1500), D(250), id="N1500-as-P3K-250"),
    pytest.param(D(-2200), D(500), id="N2200-as-R3L-500"),
    pytest.param(D(-3300), D(500), id="N3300-as-S3L-500"),
    pytest.param(D(-4700), D(1000), id="N4700-as-T3M-1000"),
])
def test_an_old_name_takes_the_tempco_tolerance_of_its_eia_equivalent(alpha, tol):
    # [EIA-198] old names ([parameters-page], [latvian-codes]): the EIA-198 equivalents; N150 = P2G
    # per [parameters-page], P2H only from memory
    assert assumed_tempco_tol(alpha) == tol


def test_polarity_follows_the_family_and_any_polarity_mark():
    assert is_polarised("aluminium-electrolytic", None)
    assert is_polarised(None, "negative-marked")
    assert not is_polarised("bipolar-electrolytic", None)
    assert not is_polarised("polypropylene", None)


def test_shelf_life_notes_exist_for_the_parts_that_need_reforming():
    # from memory of maker notes: aged aluminium electrolytics need reforming
    assert "reform" in SHELF_LIFE["aluminium-electrolytic"]
