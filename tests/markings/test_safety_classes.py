"""IEC 60384-14 safety classes: reading the marks, dual ratings, which class covers which.

Source: IEC 60384-14 subclasses and impulse voltages as reproduced by the pages docs/sources.md
names under [IEC 60384-14] ([safety-impulse-calculator], [safety-parameters-page], [safety-note]); dual
ratings such as X1 400 V AC / Y2 250 V AC per [safety-disc-slide].
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.markings.safety_classes import CAUTION, SUBCLASSES, covers, describe, positions_text, read_safety_class

# IEC 60384-14 subclasses and the dual-rating spellings seen on parts ([safety-disc-slide]; common practice).
READ_CASES = [
    pytest.param("X1", "X1", id="X1"),
    pytest.param("X2", "X2", id="X2"),
    pytest.param("X3", "X3", id="X3"),
    pytest.param("Y1", "Y1", id="Y1"),
    pytest.param("Y2", "Y2", id="Y2"),
    pytest.param("Y3", "Y3", id="Y3"),
    pytest.param("Y4", "Y4", id="Y4"),
    pytest.param("x2", "X2", id="lower-case"),
    pytest.param("X1Y2", "X1Y2", id="dual"),
    pytest.param("X1/Y2", "X1Y2", id="dual-slash"),
    pytest.param("Y2X1", "X1Y2", id="dual-reversed"),
    pytest.param("X1 Y1", "X1Y1", id="dual-space"),
]


@pytest.mark.parametrize(("token", "code"), READ_CASES)
def test_safety_marks_are_read_to_one_canonical_code(token, code):
    assert read_safety_class(token).code == code


@pytest.mark.parametrize("token", ["X4", "Y5", "X7R", "Z2", "XY", "X", "X1X2"])
def test_tokens_that_are_no_safety_class_give_none(token):
    assert read_safety_class(token) is None


# IEC 60384-14 impulse test voltages ([safety-impulse-calculator], [safety-parameters-page]): X1 4 kV, X2 2.5
# kV, Y1 8 kV, Y2 5 kV, Y4 2.5 kV.
@pytest.mark.parametrize(("sub", "kv"), [
    pytest.param("X1", Decimal(4), id="X1-4kV"),
    pytest.param("X2", Decimal("2.5"), id="X2-2.5kV"),
    pytest.param("Y1", Decimal(8), id="Y1-8kV"),
    pytest.param("Y2", Decimal(5), id="Y2-5kV"),
    pytest.param("Y4", Decimal("2.5"), id="Y4-2.5kV"),
])
def test_impulse_test_voltages_match_the_standard(sub, kv):
    assert SUBCLASSES[sub].impulse_kv == kv


# Every (part, position) pair, worked by hand from [IEC 60384-14] as its pages reproduce it: impulse
# tests X1 4 kV, X2 2.5 kV, Y1 8 kV, Y2 5 kV, Y4 2.5 kV ([safety-impulse-calculator],
# [safety-parameters-page], [safety-note]), X3 and Y3 none ([safety-parameters-page]; X3 from
# memory); rated AC Y1 ≤ 500, Y2 150…300, Y3 ≤ 250, Y4 < 150 V AC ([safety-parameters-page]). Rule: Y may
# take X, X never Y; impulse at least as severe; AC rating reaching the position's (≥ 150 V AC
# assumed when none is stated: derived, Y4's range lies below it).
COVER_CASES = [
    pytest.param("X1", "X1", True, id="X1-is-X1"),
    pytest.param("X1", "X2", True, id="X1-covers-X2:4kV>=2.5kV"),
    pytest.param("X1", "X3", True, id="X1-covers-X3:X3-untested"),
    pytest.param("X1", "Y1", False, id="X1-not-Y1:X-never-Y"),
    pytest.param("X1", "Y2", False, id="X1-not-Y2:X-never-Y"),
    pytest.param("X1", "Y3", False, id="X1-not-Y3:X-never-Y"),
    pytest.param("X1", "Y4", False, id="X1-not-Y4:X-never-Y"),
    pytest.param("X2", "X1", False, id="X2-not-X1:2.5kV<4kV"),
    pytest.param("X2", "X2", True, id="X2-is-X2"),
    pytest.param("X2", "X3", True, id="X2-covers-X3"),
    pytest.param("X2", "Y1", False, id="X2-not-Y1:X-never-Y"),
    pytest.param("X2", "Y2", False, id="X2-not-Y2:X-never-Y"),
    pytest.param("X2", "Y3", False, id="X2-not-Y3:X-never-Y"),
    pytest.param("X2", "Y4", False, id="X2-not-Y4:X-never-Y"),
    pytest.param("X3", "X1", False, id="X3-not-X1:no-test<4kV"),
    pytest.param("X3", "X2", False, id="X3-not-X2:no-test<2.5kV"),
    pytest.param("X3", "X3", True, id="X3-is-X3"),
    pytest.param("X3", "Y1", False, id="X3-not-Y1:X-never-Y"),
    pytest.param("X3", "Y2", False, id="X3-not-Y2:X-never-Y"),
    pytest.param("X3", "Y3", False, id="X3-not-Y3:X-never-Y"),
    pytest.param("X3", "Y4", False, id="X3-not-Y4:X-never-Y"),
    pytest.param("Y1", "X1", True, id="Y1-covers-X1:8kV>=4kV"),
    pytest.param("Y1", "X2", True, id="Y1-covers-X2"),
    pytest.param("Y1", "X3", True, id="Y1-covers-X3"),
    pytest.param("Y1", "Y1", True, id="Y1-is-Y1"),
    pytest.param("Y1", "Y2", True, id="Y1-covers-Y2:8kV>=5kV,500V>=150V"),
    pytest.param("Y1", "Y3", True, id="Y1-covers-Y3"),
    pytest.param("Y1", "Y4", True, id="Y1-covers-Y4"),
    pytest.param("Y2", "X1", True, id="Y2-covers-X1:5kV>=4kV"),
    pytest.param("Y2", "X2", True, id="Y2-covers-X2"),
    pytest.param("Y2", "X3", True, id="Y2-covers-X3"),
    pytest.param("Y2", "Y1", False, id="Y2-not-Y1:5kV<8kV"),
    pytest.param("Y2", "Y2", True, id="Y2-is-Y2"),
    pytest.param("Y2", "Y3", True, id="Y2-covers-Y3"),
    pytest.param("Y2", "Y4", True, id="Y2-covers-Y4:5kV>=2.5kV"),
    pytest.param("Y3", "X1", False, id="Y3-not-X1:no-test<4kV"),
    pytest.param("Y3", "X2", False, id="Y3-not-X2:no-test<2.5kV"),
    pytest.param("Y3", "X3", True, id="Y3-covers-X3:neither-tested,250V>=150V"),
    pytest.param("Y3", "Y1", False, id="Y3-not-Y1"),
    pytest.param("Y3", "Y2", False, id="Y3-not-Y2"),
    pytest.param("Y3", "Y3", True, id="Y3-is-Y3"),
    pytest.param("Y3", "Y4", False, id="Y3-not-Y4:no-test<2.5kV"),
    pytest.param("Y4", "X1", False, id="Y4-not-X1:2.5kV<4kV"),
    pytest.param("Y4", "X2", False, id="Y4-not-X2:below-150VAC"),
    pytest.param("Y4", "X3", False, id="Y4-not-X3:below-150VAC"),
    pytest.param("Y4", "Y1", False, id="Y4-not-Y1"),
    pytest.param("Y4", "Y2", False, id="Y4-not-Y2:2.5kV<5kV"),
    pytest.param("Y4", "Y3", False, id="Y4-not-Y3:below-150VAC"),
    pytest.param("Y4", "Y4", True, id="Y4-is-Y4"),
    # dual ratings ([safety-disc-slide]): each class the position names must be covered
    pytest.param("X1Y2", "X2", True, id="dual-covers-X2"),
    pytest.param("X1Y2", "Y2", True, id="dual-covers-Y2"),
    pytest.param("X1Y2", "Y1", False, id="dual-not-Y1"),
    pytest.param("Y2", "X1Y2", True, id="Y2-covers-dual-X1Y2"),
    pytest.param("X1", "X1Y2", False, id="X1-not-dual-X1Y2"),
]


@pytest.mark.parametrize(("have", "need", "ok"), COVER_CASES)
def test_a_part_stands_in_only_with_as_severe_an_impulse_test_and_enough_ac_rating(have, need, ok):
    assert covers(have, need).ok is ok
    assert read_safety_class(have).covers(need) is ok


def test_every_pair_of_subclasses_is_in_the_table():
    pairs = {(p.values[0], p.values[1]) for p in COVER_CASES}
    assert {(a, b) for a in SUBCLASSES for b in SUBCLASSES} <= pairs


# [safety-parameters-page]: Y2 is rated 150…300 V AC; a part's marked AC rating below the position's refuses it.
def test_a_marked_ac_rating_below_the_positions_refuses_the_part():
    assert covers("Y2", "X2", Decimal(250), Decimal(230)).ok
    refused = covers("X2", "X2", Decimal(125), Decimal(230))
    assert not refused.ok and refused.reason == "X2 does not cover X2: rated 125 V AC, below the position's 230 V AC"
    # a Y4 part on a 120 V AC line-line position: its rating reaches it ([safety-parameters-page]: Y4 < 150 V AC)
    assert covers("Y4", "X2", Decimal(125), Decimal(120)).ok   # 2.5 kV ≥ 2.5 kV, 125 V ≥ 120 V
    assert not covers("Y4", "X2", Decimal(125)).ok             # no voltage stated: ≥ 150 V AC assumed


# The reason names the real cause and only the classes asked about.
def test_refusal_reasons_name_the_real_cause():
    assert covers("X2", "Y2").reason == "X2 does not cover Y2: an X part never takes a line–earth (Y) position"
    assert covers("Y3", "Y4").reason == "Y3 does not cover Y4: Y3 has no impulse test, Y4 at 2.5 kV"
    assert "X3" not in covers("X2", "Y2").reason
    assert covers(None, "X2").reason.startswith("no X/Y safety class")


def test_a_y_part_may_take_either_position_and_an_x_part_line_to_line_only():
    # [IEC 60384-14] ([safety-classes-blog]): X line–line, Y line–earth; Y may serve line–line too
    assert read_safety_class("X2").positions() == ("line-line",)
    assert read_safety_class("Y2").positions() == ("line-line", "line-earth")
    assert positions_text("X2") == "line–line (X2); never line–earth"


def test_description_and_caution_name_the_standard_and_local_codes():
    assert describe("Y1").startswith("Y1: line to earth, double or reinforced insulation (impulse test 8 kV")
    assert "IEC 60384-14" in CAUTION and "local electrical codes" in CAUTION
