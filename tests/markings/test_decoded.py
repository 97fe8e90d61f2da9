"""The decoded-value types: the JSON contract, and a lossless round trip.

Sources: the JSON shape is this project's published contract (README); the sample
markings' values are IEC 60062 three-digit and letter codes and EIA-198 dielectric codes.
"""

from __future__ import annotations

from decimal import Decimal

from hypothesis import given, settings
from hypothesis import strategies as st

from stock.decoded import Marking, Tolerance
from stock.markings.decoder import decode

CONTRACT_KEYS = {"text", "capacitance_pf", "tolerance", "voltage_v", "voltage_kind", "dielectric",
                 "safety_class", "polarity", "rated_temp_c", "alternatives", "flags", "unparsed"}
DIELECTRIC_KEYS = {"code", "family", "class", "tempco_ppm_per_k", "tempco_tol_ppm_per_k",
                   "temp_min_c", "temp_max_c", "change_minus_pct", "change_plus_pct"}


def test_the_json_carries_every_contract_key():
    data = decode("104K 2A X7R").to_json()       # IEC 60062: 104 = 100 nF, K = ±10 %
    assert CONTRACT_KEYS <= set(data)
    assert DIELECTRIC_KEYS <= set(data["dielectric"])
    assert data["tolerance"] == {"minus": 10.0, "plus": 10.0, "unit": "%"}


def test_an_asymmetric_tolerance_is_two_magnitudes():
    # IEC 60062: Z = +80/−20 %
    assert decode("223Z").to_json()["tolerance"] == {"minus": 20.0, "plus": 80.0, "unit": "%"}


def test_an_absolute_tolerance_converts_to_percent_of_the_value():
    tol = Tolerance(Decimal("0.25"), Decimal("0.25"), "pF")
    assert tol.as_percent(Decimal("2.5")) == (Decimal(10), Decimal(10))
    assert tol.as_percent(None) is None


@settings(max_examples=300, deadline=None)
@given(st.text(max_size=60))
def test_any_decoded_marking_survives_its_json_round_trip(text):
    m = decode(text)
    assert Marking.from_json(m.to_json()) == m


@settings(max_examples=200, deadline=None)
@given(st.sampled_from(["104K 2A X7R", "47K", "1R5C", "C0G G black µF white", "brn blk orng",
                        "dots: white yellow violet red gold brown", "X1Y2 472M 300VAC", "100"]))
def test_alternatives_keep_their_tolerance_letter_through_json(text):
    m = decode(text)
    again = Marking.from_json(m.to_json())
    assert [a.tolerance.code if a.tolerance else None for a in again.alternatives] == \
        [a.tolerance.code if a.tolerance else None for a in m.alternatives]
