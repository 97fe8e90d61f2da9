"""Every error names where, the bad value, and what would have been accepted; and catches as its builtin.

Expected sentences are written by hand from the contract in STYLE.md ("an error names the bad
value and what would have been accepted") and the exit codes in DEVELOPERS.md (1 bad data, 2 bad usage).
No decoded value or physics is checked here, so no standard applies: the wording is the project's
own contract (common practice, no published source).
"""

from __future__ import annotations

import pytest

from stock.errors import (BadLayout, BadOptions, BadSheet, BadValue, NotFound, Refused, StockError,
                          StoreProblem)


# sentences written by hand from each error's fields
@pytest.mark.parametrize("error, sentence", [
    pytest.param(BadSheet("drawer.csv", "no header row found"),
                 "drawer.csv: no header row found", id="sheet-file-and-reason"),
    pytest.param(BadSheet("drawer.xlsx", "quantity is negative", sheet="Shelf 2", row=7, column="Qty",
                          hint="a whole number of parts, 0 or more"),
                 "drawer.xlsx, sheet 'Shelf 2', row 7, column 'Qty': quantity is negative "
                 "(expected a whole number of parts, 0 or more)", id="sheet-names-file-sheet-row-column"),
    pytest.param(BadSheet("a.csv", "blank", row=0), "a.csv, row 0: blank", id="sheet-row-zero-is-still-named"),
    pytest.param(BadValue("--value", "15x", "a capacitance such as 4n7"),
                 "--value: cannot read '15x' (expected a capacitance such as 4n7)", id="value"),
    pytest.param(BadOptions(("--a", "--b"), "both were given", "one of them"),
                 "--a/--b: both were given (expected one of them)", id="options"),
    pytest.param(NotFound("plan", "7"), "no plan '7'", id="not-found-without-expectation"),
    pytest.param(NotFound("bin", "Z9", "a bin id"), "no bin 'Z9' (expected a bin id)", id="not-found"),
    pytest.param(BadLayout("--grid 9x9", "labels overlap"), "--grid 9x9: labels overlap", id="layout"),
    pytest.param(Refused("undo plan 2", "it was never pulled"), "cannot undo plan 2: it was never pulled",
                 id="refused"),
    pytest.param(StoreProblem("s.db", "read-only"), "s.db: read-only", id="store-without-advice"),
    pytest.param(StoreProblem("s.db", "locked", "wait"), "s.db: locked; wait", id="store-with-advice"),
])
def test_each_error_composes_its_sentence_from_its_fields(error, sentence):
    assert str(error) == sentence


# exit codes: DEVELOPERS.md (1 bad data, 2 bad usage); builtins per STYLE.md
@pytest.mark.parametrize("error, builtin, exit_code", [
    pytest.param(BadSheet("f", "r"), ValueError, 1, id="sheet-is-bad-data"),
    pytest.param(BadValue("w", "r", "e"), ValueError, 2, id="value-is-bad-usage"),
    pytest.param(BadOptions(("--x",), "r", "e"), ValueError, 2, id="options-are-bad-usage"),
    pytest.param(NotFound("bin", "k"), LookupError, 1, id="not-found-is-bad-data"),
    pytest.param(BadLayout("w", "r"), ValueError, 2, id="layout-is-bad-usage"),
    pytest.param(Refused("a", "r"), RuntimeError, 1, id="refused-is-bad-data"),
    pytest.param(StoreProblem("p", "r"), OSError, 1, id="store-problem-is-bad-data"),
])
def test_each_error_is_a_stock_error_and_its_builtin_with_its_exit_code(error, builtin, exit_code):
    assert isinstance(error, StockError)
    assert isinstance(error, builtin)
    assert error.exit_code == exit_code
    with pytest.raises(builtin):
        raise error


def test_an_error_keeps_its_structured_fields_for_callers():
    e = BadSheet("drawer.csv", "bad count", row=4, column="Qty")
    assert (e.file, e.row, e.column, e.reason) == ("drawer.csv", 4, "Qty", "bad count")
