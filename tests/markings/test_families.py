"""Dielectric families by name, with their typical figures.

Sources (docs/sources.md): a film maker's dielectric comparison table [film-dielectrics-table] and
the other dielectric pages ([polystyrene-article], [silver-mica-overview], [film-capacitor-text],
[polystyrene-white-paper]); the rest from memory, as the module says row by row.
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.decoded import FAMILIES
from stock.markings.families import FAMILY_FIGURES, FAMILY_NAMES, decode_family, family_dielectric, read_family

D = Decimal

# Names and maker abbreviations (from memory of maker catalogues; common practice).
NAME_CASES = [
    pytest.param("polystyrene", "polystyrene", id="polystyrene"),
    pytest.param("Styroflex", "polystyrene", id="styroflex"),
    pytest.param("KS", "polystyrene", id="KS"),
    pytest.param("polypropylene", "polypropylene", id="polypropylene"),
    pytest.param("MKP", "polypropylene", id="MKP"),
    pytest.param("polyester", "polyester", id="polyester"),
    pytest.param("MKT", "polyester", id="MKT"),
    pytest.param("Mylar", "polyester", id="mylar"),
    pytest.param("metallized polyester film", "polyester", id="metallized-film"),
    pytest.param("PEN", "polyethylene-naphthalate", id="PEN"),
    pytest.param("PPS", "polyphenylene-sulfide", id="PPS"),
    pytest.param("MKC", "polycarbonate", id="MKC"),
    pytest.param("PTFE", "ptfe", id="PTFE"),
    pytest.param("silver mica", "mica", id="silver-mica"),
    pytest.param("mica", "mica", id="mica"),
    pytest.param("glass", "glass", id="glass"),
    pytest.param("paper", "paper", id="paper"),
    pytest.param("wax paper", "paper", id="wax-paper"),   # common practice: old wax-impregnated paper tubulars
    pytest.param("tantalum", "tantalum", id="tantalum"),
    pytest.param("Ta", "tantalum", id="Ta"),
    pytest.param("polymer tantalum", "tantalum-polymer", id="polymer-tantalum"),
    pytest.param("aluminium electrolytic", "aluminium-electrolytic", id="aluminium-electrolytic"),
    pytest.param("aluminum-electrolytic", "aluminium-electrolytic", id="US-spelling"),
    pytest.param("bipolar", "bipolar-electrolytic", id="bipolar"),
    pytest.param("double layer", "double-layer", id="double-layer"),
    pytest.param("supercap", "double-layer", id="supercap"),
]


@pytest.mark.parametrize(("name", "family"), NAME_CASES)
def test_family_names_and_abbreviations_decode(name, family):
    assert decode_family(name).family == family


def test_every_family_in_the_vocabulary_has_figures_and_a_name():
    assert set(FAMILY_FIGURES) == set(FAMILIES)
    assert set(FAMILY_NAMES.values()) == set(FAMILIES)
    assert all(f.source for f in FAMILY_FIGURES.values())


# Typical figures (docs/sources.md: dielectric pages ([film-dielectrics-table] and others)): PP ±2.5 % over
# −55…+105 °C ([film-dielectrics-table]), polyester ±5 % ([film-dielectrics-table]),
# polystyrene −125 ppm/K to +85 °C ([polystyrene-article], [polystyrene-white-paper]), silver mica +35…+75
# ppm/K ([silver-mica-overview]), tantalum ±10 % ([film-dielectrics-table]),
# PTFE +1/−3 % ([film-capacitor-text]), PPS ±1.5 % to +140 °C ([film-dielectrics-table]).
FIGURE_CASES = [
    pytest.param("polypropylene", "change_minus_pct", D("2.5"), id="PP-2.5pc"),
    pytest.param("polypropylene", "temp_max_c", D(105), id="PP-105C"),
    pytest.param("polyester", "change_plus_pct", D(5), id="PET-5pc"),
    pytest.param("polystyrene", "tempco_ppm_per_k", D(-150), id="PS-minus150-spans-polystyrene-article-minus125"),
    pytest.param("polystyrene", "temp_max_c", D(85), id="PS-85C"),
    pytest.param("mica", "tempco_ppm_per_k", D(40), id="mica-plus40-spans-characteristic-E"),
    pytest.param("tantalum", "change_minus_pct", D(10), id="tantalum-10pc"),
    pytest.param("ptfe", "change_minus_pct", D(3), id="PTFE-minus3"),
    pytest.param("polyphenylene-sulfide", "temp_max_c", D(140), id="PPS-140C"),
]


@pytest.mark.parametrize(("family", "attribute", "expected"), FIGURE_CASES)
def test_family_figures_match_the_published_tables(family, attribute, expected):
    assert getattr(family_dielectric(family), attribute) == expected


def test_silver_mica_tempco_window_covers_the_published_range():
    d = family_dielectric("mica")   # [silver-mica-overview]: +35…+75 ppm/K
    assert d.tempco_ppm_per_k - d.tempco_tol_ppm_per_k <= 35
    assert d.tempco_ppm_per_k + d.tempco_tol_ppm_per_k >= 75


def test_mks_is_read_as_polyester_with_polystyrene_kept_as_an_alternative():
    reading = read_family("MKS")
    assert reading.dielectric.family == "polyester"
    assert reading.alternatives[0].dielectric.family == "polystyrene"
    assert [f.kind for f in reading.flags] == ["ambiguous-code"]


def test_unknown_family_raises_with_the_vocabulary():
    with pytest.raises(ValueError, match="unknown family 'plastic'; expected one of ceramic"):
        family_dielectric("plastic")


@pytest.mark.parametrize("token", ["X7R", "C0G", "104", "", "filmy"])
def test_tokens_that_name_no_family_give_none(token):
    assert decode_family(token) is None
