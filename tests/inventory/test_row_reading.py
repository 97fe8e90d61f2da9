"""What one sheet row means: cell text, bin identity, the marking it states, a label's value, raw JSON.

Sources: 104 = 100 nF, 4n7 = 4.7 nF and "100" read as 10 pF or 100 pF (IEC 60062 three-digit code
and the literal reading common on small ceramics, from memory); X7R per EIA-198; the bin identity
rule (cabinet/location, case and spacing ignored) is this project's own.
"""

from __future__ import annotations

from datetime import date
from decimal import Decimal

import pytest

from importers.headers import map_headers
from stock.inventory.row_reading import (RowReader, agreed_by_claim, bin_key, cell_text, label_value,
                                         normalise, same_value, with_unit)
from stock.markings.decoder import decode


@pytest.mark.parametrize("cabinet, location, key", [
    pytest.param("Cabinet  1", " A2 ", "cabinet 1/a2", id="spacing-and-case-ignored"),
    pytest.param("", "B7", "/b7", id="no-cabinet"),
    pytest.param("CAB\t2", "Drawer  3", "cab 2/drawer 3", id="tabs-are-spaces"),
])
def test_a_bin_key_is_cabinet_and_location_normalised(cabinet, location, key):
    assert bin_key(cabinet, location) == key


def test_normalise_folds_case_beyond_lower_case():
    assert normalise("STRASSE") == normalise("straße") == "strasse"


# how a person reads a cell: floats as written, dates as ISO 8601, booleans as words
@pytest.mark.parametrize("value, text", [
    pytest.param(104.0, "104", id="an-integral-float"),
    pytest.param(2.2e-05, "0.000022", id="no-exponent"),
    pytest.param(0.1, "0.1", id="a-decimal-kept-short"),
    pytest.param(True, "yes", id="true"),
    pytest.param(False, "no", id="false"),
    pytest.param(date(2026, 3, 4), "2026-03-04", id="a-date"),
    pytest.param("  4n7 \n C0G ", "4n7 C0G", id="spacing-made-single"),
    pytest.param(None, "", id="blank"),
    pytest.param(25, "25", id="an-int"),
])
def test_cell_text_is_what_a_person_reads(value, text):
    assert cell_text(value) == text


@pytest.mark.parametrize("text, unit, result", [
    pytest.param("100", "µF", "100uF", id="micro-sign-as-u"),
    pytest.param("4.7", "nF", "4.7nF", id="decimal-number"),
    pytest.param("4n7", "pF", "4n7", id="a-code-keeps-its-own-unit"),
    pytest.param("100", None, "100", id="no-unit-in-the-header"),
    pytest.param("-5", "pF", "-5pF", id="signed-number"),
])
def test_a_bare_number_takes_the_unit_its_header_names(text, unit, result):
    assert with_unit(text, unit) == result


@pytest.mark.parametrize("a, b, same", [
    pytest.param(Decimal(4700), Decimal("4700.0000001"), True, id="within-one-part-in-1e9"),
    pytest.param(Decimal(4700), Decimal(4701), False, id="one-pF-apart"),
    pytest.param(Decimal(0), Decimal(0), True, id="zero-equals-zero"),
])
def test_same_value_allows_only_rounding(a, b, same):
    assert same_value(a, b) is same


# IEC 60062 codes and SI prefixes in labels
@pytest.mark.parametrize("label, found", [
    pytest.param("Box 4n7 C0G", ("4n7", Decimal(4700)), id="a-code-among-words"),
    pytest.param("10 nF ceramics", ("10nF", Decimal(10_000)), id="a-spaced-unit"),
    pytest.param("0.1uF 50V", ("0.1uF", Decimal(100_000)), id="micro"),
    pytest.param("drawer 12", None, id="a-number-is-no-capacitance"),
    pytest.param("spares", None, id="no-number"),
])
def test_a_label_states_a_capacitance_only_with_a_unit_or_code(label, found):
    assert label_value(label) == found


def test_a_label_that_agrees_with_the_reading_settles_its_value_doubt_and_says_so():
    m = decode("100")          # 10 x 10^0 = 10 pF by the code, or 100 pF printed literally
    assert m.capacitance_pf == Decimal(10)
    assert "ambiguous-code" in m.flag_kinds()
    agreed = agreed_by_claim(m, "the label", "10p")
    assert not {"ambiguous-code", "unit-assumed"} & agreed.flag_kinds()
    assert agreed.alternatives[-1].reason.endswith("agreeing with the reading chosen")
    assert len(agreed.alternatives) == len(m.alternatives) + 1     # nothing hidden


def test_a_marking_without_rival_values_is_left_as_it_is():
    m = decode("104K 50V X7R")
    assert agreed_by_claim(m, "the label", "100n") is m


def _reader(headers):
    return RowReader(map_headers(headers), list(headers))


def test_the_row_reader_joins_the_marking_columns_in_printed_order():
    reader = _reader(["Location", "Marking", "Voltage", "Dielectric", "Qty"])
    texts = reader.texts(("C4", " 104K ", "50V", "X7R", 12))
    assert texts["marking"] == "104K"
    assert "quantity" not in texts                  # counts are read apart, by the count reader
    text, marking, _ = reader.reading(texts)
    assert text.split() == ["104K", "X7R", "50V"]   # marking, dielectric, tolerance, voltage ...
    assert marking.capacitance_pf == Decimal(100_000)
    assert marking.dielectric.code == "X7R"


def test_a_value_column_with_a_unit_in_its_header_reads_a_bare_number_in_that_unit():
    reader = _reader(["Location", "Value (nF)", "Qty"])
    _, marking, _ = reader.reading(reader.texts(("C5", "4.7", 3)))
    assert marking.capacitance_pf == Decimal(4700)   # 4.7 nF
