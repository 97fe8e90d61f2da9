"""The one reader of a count cell: bin sheets, BOM quantities and the stock-take sheet agree.

Whole numbers of parts are the only counts there are (common practice, no published source);
the cases below are the forms spreadsheets and people produce.
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.counts import MAX_COUNT, read_quantity
from stock.errors import BadSheet
from stock.inventory.stocktake import _whole
from stock.kitting.bom import _quantity


@pytest.mark.parametrize("cell, expected", [
    pytest.param("25", 25, id="plain-text"),
    pytest.param("25.0", 25, id="text-with-a-zero-fraction"),
    pytest.param(25.0, 25, id="a-workbook-float"),
    pytest.param(" 7 ", 7, id="spaces-around"),
    pytest.param(0, 0, id="zero"),
])
def test_every_reader_accepts_the_same_whole_numbers(cell, expected):
    assert read_quantity(cell) == expected
    assert _whole(cell, "count.xlsx", 2) == expected
    assert _quantity(str(cell).strip() if not isinstance(cell, float) else str(cell)) == expected


@pytest.mark.parametrize("cell", [
    pytest.param("2.5", id="a-fraction"),
    pytest.param("-1", id="negative"),
    pytest.param("\u00b2", id="a-superscript-digit"),
    pytest.param("many", id="words"),
])
def test_every_reader_refuses_the_same_cells(cell):
    with pytest.raises(ValueError):
        read_quantity(cell)
    with pytest.raises(BadSheet) as err:
        _whole(cell, "count.xlsx", 5)
    assert err.value.row == 5 and err.value.column == "Counted"
    with pytest.raises(ValueError, match="not a whole number of parts"):
        _quantity(cell)


def test_a_count_past_what_json_holds_exactly_is_refused_as_a_typing_slip():
    assert read_quantity(str(MAX_COUNT)) == MAX_COUNT
    with pytest.raises(ValueError, match="too large"):
        read_quantity(str(MAX_COUNT + 1))
    assert Decimal(MAX_COUNT) == Decimal(2) ** 53     # the largest integer a double holds exactly
