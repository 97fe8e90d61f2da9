"""IEC 60384-14 safety classes: reading the marks, dual ratings, which class covers which.

Source: IEC 60384-14 subclasses and impulse voltages as reproduced in the capacitor-codes
docs/sources.md: [IEC 60384-14] ([safety-impulse-calculator], [safety-parameters-page], [safety-note]); dual
ratings such as X1 400 V AC / Y2 250 V AC per [safety-disc-slide].
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.markings.safety_classes import CAUTION, SUBCLASSES, describe, read_safety_class

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


# Common practice reading of IEC 60384-14: a stricter subclass covers a looser one; X never covers Y.
COVER_CASES = [
    pytest.param("X1", "X2", True, id="X1-covers-X2"),
    pytest.param("X2", "X1", False, id="X2-not-X1"),
    pytest.param("Y1", "Y2", True, id="Y1-covers-Y2"),
    pytest.param("X2", "Y2", False, id="X-never-Y"),
    pytest.param("X1Y2", "X2", True, id="dual-covers-X2"),
    pytest.param("X1Y2", "Y2", True, id="dual-covers-Y2"),
    pytest.param("X1Y2", "Y1", False, id="dual-not-Y1"),
    pytest.param("Y2", "X2", True, id="Y2-covers-X2"),
]


@pytest.mark.parametrize(("have", "need", "ok"), COVER_CASES)
def test_a_part_covers_a_position_of_the_same_or_looser_class(have, need, ok):
    assert read_safety_class(have).covers(need) is ok


def test_description_and_caution_name_the_standard_and_local_codes():
    assert describe("Y1").startswith("Y1: line to earth, double or reinforced insulation (impulse test 8 kV")
    assert "IEC 60384-14" in CAUTION and "local codes" in CAUTION
