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


# [ageing-faq] (a maker's FAQ): maximum ageing per decade-hour
@pytest.mark.parametrize("code, rate", [
    pytest.param("X7R", D("2"), id="X7R-2pct"),
    pytest.param("X5R", D("2.5"), id="X5R-2.5pct"),
    pytest.param("Z5U", D("7"), id="Z5U-7pct"),
    pytest.param("Y5V", D("7"), id="Y5V-7pct"),
])
def test_class2_ageing_rates_are_the_published_maxima(code, rate):
    assert ageing_rate_pct(code, 2) == rate == AGEING_PER_DECADE_PCT[code]


def test_class1_ceramics_do_not_age():
    # [ageing-faq], [mlcc-selection-article], [ageing-blog]: C0G ≈ 0
    assert ageing_rate_pct("C0G", 1) == 0


def test_a_class2_code_not_listed_ages_by_its_change_letter():
    # EIA-198 change letters: R (±15 %) like X5R, V (+22/−82 %) like Y5V (from memory of
    # [mlcc-selection-article]/[ageing-blog] ranges)
    assert ageing_rate_pct("X6R", 2) == D("2.5")
    assert ageing_rate_pct("Y6V", 2) == D("7")
    assert ageing_rate_pct(None, 2) == D("7")


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


# DC bias ([dc-bias-note]: 0805 10 µF 10 V X7R keeps 50 % at 5 V; [effective-capacitance-tool]: 35–65 % loss
# at rated). Common practice model.
def test_dc_bias_loss_of_a_large_part_at_rated_is_the_top_of_the_published_range():
    assert dc_bias_loss_pct("X5R", D(10_000_000), D(10), D(10)) == D(65)


def test_dc_bias_loss_of_a_high_k_part_is_larger():
    assert dc_bias_loss_pct("Y5V", D(1_000_000), D(8), D(16)) > dc_bias_loss_pct("X7R", D(1_000_000), D(8), D(16))


@given(st.integers(0, 200), st.integers(1, 100), st.integers(1, 10**9))
def test_dc_bias_loss_never_exceeds_the_loss_at_rated_and_never_falls_with_voltage(v, rated, cap):
    loss = dc_bias_loss_pct("X7R", D(cap), D(v), D(rated))
    higher = dc_bias_loss_pct("X7R", D(cap), D(v + 1), D(rated))
    assert D(0) <= loss <= higher <= D(65)


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


def test_silver_mica_typical_tempco_covers_the_published_35_to_75_ppm():
    # [silver-mica-overview]: +35…+75 ppm/K
    mica = FAMILY_DRIFT["mica"]
    assert mica.tempco_ppm_per_k - mica.tempco_tol_ppm_per_k == 35
    assert mica.tempco_ppm_per_k + mica.tempco_tol_ppm_per_k == 75


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
    pytest.param(D(0), D(60), id="NP0-assumed-60"),
    pytest.param(D(-150), D(60), id="N150-P2G-or-P2H-assumed-60"),
    pytest.param(D(-750), D(120), id="N750-as-U2J-120"),
    pytest.param(D(-1500), D(250), id="N1500-as-P3K-250"),
])
def test_an_old_name_takes_the_widest_customary_tempco_tolerance(alpha, tol):
    # docs/sources.md: [EIA-198] old names ([parameters-page], [latvian-codes]) (EIA-198 equivalents; P2G vs
    # P2H disagreement → the wider)
    assert assumed_tempco_tol(alpha) == tol


def test_polarity_follows_the_family_and_any_polarity_mark():
    assert is_polarised("aluminium-electrolytic", None)
    assert is_polarised(None, "negative-marked")
    assert not is_polarised("bipolar-electrolytic", None)
    assert not is_polarised("polypropylene", None)


def test_shelf_life_notes_exist_for_the_parts_that_need_reforming():
    # from memory of maker notes: aged aluminium electrolytics need reforming
    assert "reform" in SHELF_LIFE["aluminium-electrolytic"]
