"""Whether one part meets a requirement: value bands, tempco windows, safety, family, quantity.

Sources (docs/sources.md): three-digit codes and tolerance letters J = ±5 %, K = ±10 %, and C as
±0.25 pF at 10 pF and below ([IEC 60062]); C0G = 0 ±30 ppm/K, U2J = −750 ±120 ppm/K, X7R a Class 2
dielectric with no linear tempco ([EIA-198]); X classes go line to line and Y classes line to earth,
and a part with no class goes in neither ([IEC 60384-14]). Bands below are hand arithmetic:
150 pF ±5 % is 142.5…157.5 pF.
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.markings.decoder import decode
from stock.matching.part_checks import (Stocked, check_nominal, check_part, check_single, check_tempco,
                                        check_value, tolerance_pct, window_text)
from stock.matching.requirement import Requirement

D = Decimal


@pytest.mark.parametrize("window, text", [
    pytest.param((D(-330), D(-270)), "−330…−270 ppm/K", id="both-ends"),
    pytest.param((D("-Infinity"), D(100)), "≤ 100 ppm/K", id="only-a-ceiling"),
    pytest.param((D(0), D("Infinity")), "≥ 0 ppm/K", id="only-a-floor"),
])
def test_a_window_in_words(window, text):
    assert window_text(window) == text


# 150 pF ±5 % is 142.5…157.5 pF (hand arithmetic); part bands by IEC 60062 letters
@pytest.mark.parametrize("marking, ok, failed", [
    pytest.param("151J", True, None, id="150pF-J-band-equals-the-window"),
    pytest.param("151K", False, "tolerance", id="150pF-K-may-deliver-135-to-165"),
    pytest.param("151", False, "tolerance", id="no-marked-tolerance-cannot-promise"),
    pytest.param("161J", False, "tolerance", id="160pF-J-reaches-168"),
])
def test_a_single_parts_whole_band_must_lie_inside_the_required_band(marking, ok, failed):
    verdict = check_value(decode(marking), Requirement(D(150), tol_pct=D(5)))
    assert (verdict.ok, verdict.failed) == (ok, failed)


def test_the_failed_band_is_explained_in_picofarads():
    verdict = check_value(decode("151K"), Requirement(D(150), tol_pct=D(5)))
    assert verdict.reasons == ("150 pF ±10 % may deliver 135 pF…165 pF, outside 142.5 pF…157.5 pF",)


def test_without_a_tolerance_the_nominal_must_be_within_one_percent():
    # common practice, no published source: "the same value" within 1 %
    assert check_value(decode("151"), Requirement(D(150))).ok
    verdict = check_value(decode("161J"), Requirement(D(150)))
    assert (verdict.ok, verdict.reasons) == (False, ("160 pF is not 150 pF",))


@pytest.mark.parametrize("marking, ok", [
    pytest.param("101J C0G", True, id="c0g-in-a-c0g-window"),
    pytest.param("101J U2J", False, id="u2j-outside-a-c0g-window"),
    pytest.param("104K 50V X7R", False, id="class-2-has-no-linear-tempco"),
])
def test_a_parts_tempco_band_must_lie_in_the_window(marking, ok):
    req = Requirement(D(100), tempco_min=D(-30), tempco_max=D(30))
    assert check_tempco(decode(marking), req).ok is ok


def test_a_part_without_a_safety_class_is_never_offered_for_mains():
    # IEC 60384-14: only X/Y rated parts go across the mains or to earth
    verdict = check_part(decode("104K 50V X7R"), Requirement(D(100_000), application="mains"), working_v=None)
    assert (verdict.ok, verdict.failed) == (False, "safety")
    assert "no X/Y safety class" in verdict.reasons[0]


def test_an_x_class_part_may_not_take_a_line_to_earth_position():
    req = Requirement(D(100_000), application="mains", position="line-earth")
    verdict = check_part(decode("X2 104K 275VAC"), req, working_v=None)
    assert verdict.failed == "safety"
    assert "line–earth position needs a Y class" in verdict.reasons[0]


def test_a_part_for_the_wrong_family_is_refused_naming_both():
    req = Requirement(D(100), family="ceramic", dielectric_code=None)
    verdict = check_part(decode("X2 104K 275VAC"), req, working_v=None)
    assert verdict.failed == "family"
    assert verdict.reasons[0].endswith("not ceramic")


def _stocked(marking, on_hand, reserved=0):
    return Stocked(bin_id=1, bin_key="/j1", location="J1", on_hand=on_hand, reserved=reserved,
                   marking=decode(marking))


@pytest.mark.parametrize("on_hand, reserved, qty, ok, reason", [
    pytest.param(5, 0, 4, True, "5 available", id="enough"),
    pytest.param(5, 3, 4, False, "2 available, 4 needed", id="reserved-parts-are-not-available"),
    pytest.param(None, 0, 1, False, "0 available, 1 needed", id="an-uncounted-bin-promises-nothing"),
    pytest.param(5, 1, 4, True, "4 available (1 reserved)", id="exactly-enough-after-reservations"),
])
def test_a_single_part_must_also_be_there_in_the_quantity_asked(on_hand, reserved, qty, ok, reason):
    verdict = check_single(_stocked("151J", on_hand, reserved), Requirement(D(150), tol_pct=D(5), qty=qty))
    assert verdict.ok is ok
    assert verdict.reasons[-1] == reason


@pytest.mark.parametrize("marking, band", [
    pytest.param("151K", (D(10), D(10)), id="K-is-10-percent"),
    pytest.param("1R0C", (D(25), D(25)), id="C-at-1pF-is-0.25pF-so-25-percent"),
    pytest.param("151", None, id="no-letter-no-band"),
])
def test_a_parts_marked_tolerance_reads_as_minus_and_plus_percent(marking, band):
    # [IEC 60062]: K = ±10 %; C = ±0.25 pF at 10 pF and below, so ±25 % of 1 pF (hand arithmetic)
    assert tolerance_pct(decode(marking)) == band


def test_an_old_name_without_a_tolerance_is_judged_at_the_assumed_one_and_says_so():
    # derived: N750 is judged as U2J, −750 ±120 = −870…−630 ppm/K ([EIA-198])
    wide = check_tempco(decode("47 N750"), Requirement(D(47), tempco_min=D(-900), tempco_max=D(-600)))
    narrow = check_tempco(decode("47 N750"), Requirement(D(47), tempco_min=D(-850), tempco_max=D(-600)))
    assert wide.ok and not narrow.ok
    assert narrow.failed == "tempco"
    assert "±120 assumed" in narrow.reasons[0]


@pytest.mark.parametrize("marking, ok", [
    pytest.param("151", True, id="150pF-nominal-in-142.5-to-157.5"),
    pytest.param("161", False, id="160pF-nominal-above-157.5"),
])
def test_a_part_with_no_marked_tolerance_is_offered_to_measure_when_its_nominal_is_in_the_band(marking, ok):
    verdict = check_nominal(decode(marking), Requirement(D(150), tol_pct=D(5)))
    assert verdict.ok is ok
    if ok:
        assert "it must read 142.5 pF…157.5 pF" in verdict.reasons[0]


def test_a_part_to_measure_passes_the_single_check_only_when_asked_to_be_measured():
    part = _stocked("151", on_hand=3)
    req = Requirement(D(150), tol_pct=D(5))
    assert check_single(part, req).failed == "tolerance"
    assert check_single(part, req, to_measure=True).ok
