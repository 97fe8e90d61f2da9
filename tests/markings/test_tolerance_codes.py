"""IEC 60062 tolerance letters and written-out tolerances.

Sources: IEC 60062 as reproduced in docs/sources.md: [IEC 60062] tolerance letters ([german-marking-page],
[ceramic-markings-page] for the
absolute-pF letters; [parameters-page], [code-table-blog], [forum-letter-thread], [service-manual-codes] for
Z; [parameters-page], [german-training-page] for Q R S T Y).
"""

from __future__ import annotations

from decimal import Decimal

import pytest
from hypothesis import given
from hypothesis import strategies as st

from stock.markings.tolerance_codes import PERCENT_LETTERS, read_explicit_tolerance, read_tolerance_letter

D = Decimal

# IEC 60062, absolute meanings at or below 10 pF ([german-marking-page], [ceramic-markings-page]; A from
# memory).
ABSOLUTE_CASES = [
    pytest.param("B", D("0.1"), id="B-0.1pF"),
    pytest.param("C", D("0.25"), id="C-0.25pF"),
    pytest.param("D", D("0.5"), id="D-0.5pF"),
    pytest.param("F", D(1), id="F-1pF"),
    pytest.param("G", D(2), id="G-2pF"),
]


@pytest.mark.parametrize(("letter", "pf"), ABSOLUTE_CASES)
def test_small_values_read_bcdfg_as_absolute_picofarads(letter, pf):
    reading = read_tolerance_letter(letter, D("4.7"))
    assert (reading.tolerance.minus, reading.tolerance.plus, reading.tolerance.unit) == (pf, pf, "pF")
    assert "tolerance-by-value" in {f.kind for f in reading.flags}
    assert reading.alternatives[0].tolerance.unit == "%"


# IEC 60062, percentage meanings above 10 pF (all sources agree on F G J K M; Z per [parameters-page],
# [code-table-blog], [forum-letter-thread],
# [ceramic-markings-page], [service-manual-codes]; Q R S T per [parameters-page] and [german-training-page]; X
# per [forum-letter-thread]; U per [german-training-page]; V per [parameters-page]).
PERCENT_CASES = [
    pytest.param("F", D(1), D(1), id="F-1pc"),
    pytest.param("G", D(2), D(2), id="G-2pc"),
    pytest.param("J", D(5), D(5), id="J-5pc"),
    pytest.param("K", D(10), D(10), id="K-10pc"),
    pytest.param("M", D(20), D(20), id="M-20pc"),
    pytest.param("Z", D(20), D(80), id="Z-plus80-minus20"),
    pytest.param("Q", D(10), D(30), id="Q-plus30-minus10"),
    pytest.param("R", D(20), D(30), id="R-plus30-minus20"),
    pytest.param("S", D(20), D(50), id="S-plus50-minus20"),
    pytest.param("T", D(10), D(50), id="T-plus50-minus10"),
    pytest.param("U", D(0), D(80), id="U-plus80-minus0"),
    pytest.param("V", D(10), D(100), id="V-plus100-minus10"),
    pytest.param("X", D(20), D(40), id="X-plus40-minus20"),
]


@pytest.mark.parametrize(("letter", "minus", "plus"), PERCENT_CASES)
def test_larger_values_read_letters_as_percentages(letter, minus, plus):
    reading = read_tolerance_letter(letter, D(100000))
    assert (reading.tolerance.minus, reading.tolerance.plus, reading.tolerance.unit) == (minus, plus, "%")
    assert reading.tolerance.code == letter
    assert "tolerance-by-value" not in {f.kind for f in reading.flags}


# docs/sources.md: [IEC 60062] tolerance letters: "Flag E, H, L, N, P, W, Y as variant-dependent".
@pytest.mark.parametrize("letter", list("EHLNPWY"))
def test_disputed_letters_offer_every_published_reading(letter):
    reading = read_tolerance_letter(letter, D(10000))
    assert "disputed-code" in {f.kind for f in reading.flags}
    # the other readings are listed value by value in tests/markings/test_code_tables_from_the_standards.py
    assert reading.alternatives


def test_p_is_read_as_plus_100_minus_0_with_the_older_us_reading_kept():
    # [code-table-blog], [forum-letter-thread], [ceramic-markings-page], [service-manual-codes]: +100/−0 %;
    # [old-us-letter-codes] (older US makers): −20/+80 %
    reading = read_tolerance_letter("P", D(10000))
    assert (reading.tolerance.minus, reading.tolerance.plus) == (D(0), D(100))
    assert (D(20), D(80)) in {(a.tolerance.minus, a.tolerance.plus) for a in reading.alternatives}


def test_unknown_value_keeps_both_meanings_of_a_value_dependent_letter():
    reading = read_tolerance_letter("C", None)
    assert reading.tolerance.unit == "%"
    assert reading.alternatives[0].tolerance.unit == "pF"


@pytest.mark.parametrize("letter", ["I", "O", "1", "é"])
def test_letters_that_are_no_tolerance_give_none(letter):
    assert read_tolerance_letter(letter, D(100)) is None


# Written-out forms (common practice on film parts).
EXPLICIT_CASES = [
    pytest.param("±5%", D(5), D(5), "%", id="plus-minus-5"),
    pytest.param("5%", D(5), D(5), "%", id="bare-5-percent"),
    pytest.param("±0.25pF", D("0.25"), D("0.25"), "pF", id="plus-minus-0.25pF"),
    pytest.param("+80/-20%", D(20), D(80), "%", id="plus80-slash-minus20"),
    pytest.param("+80-20%", D(20), D(80), "%", id="plus80-minus20"),
    pytest.param("-20/+80%", D(20), D(80), "%", id="minus-first"),
    pytest.param("±.5%", D("0.5"), D("0.5"), "%", id="leading-point"),
]


@pytest.mark.parametrize(("text", "minus", "plus", "unit"), EXPLICIT_CASES)
def test_written_tolerances_are_read_as_magnitudes(text, minus, plus, unit):
    t = read_explicit_tolerance(text)
    assert (t.minus, t.plus, t.unit) == (minus, plus, unit)


@pytest.mark.parametrize("text", ["5", "±", "%", "+80%20", "abc"])
def test_text_that_is_no_tolerance_gives_none(text):
    assert read_explicit_tolerance(text) is None


# IEC 60062: the letters with an absolute meaning at or below 10 pF, typed from the published tables
# (docs/sources.md: [german-marking-page], [ceramic-markings-page]; A from memory of IEC 60062).
SMALL_VALUE_LETTERS = frozenset("ABCDFG")


@given(st.sampled_from(sorted(PERCENT_LETTERS)), st.decimals(min_value=D("0.1"), max_value=D("1E10"),
                                                              allow_nan=False, places=2))
def test_a_letter_means_pf_only_at_or_below_10pf_and_the_same_percentage_at_any_larger_value(letter, pf):
    t = read_tolerance_letter(letter, pf).tolerance
    if pf <= 10 and letter in SMALL_VALUE_LETTERS:
        assert t.unit == "pF"
    else:
        at_100nf = read_tolerance_letter(letter, D(100000)).tolerance
        assert (t.unit, t.minus, t.plus) == ("%", at_100nf.minus, at_100nf.plus)
