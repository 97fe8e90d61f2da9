"""Reading BOMs: designators, quantities, requirements, other parts kept, bad rows reported.

Sources: reference-designator letters (C, R, U, CX/CY ...) from memory of IEEE 315 and
IEC 81346-2 usage; tolerance letters J = ±5 %, K = ±10 % from IEC 60062; C0G and NP0 both
0±30 ppm/K from EIA-198 Class 1 tables; X2/Y2 classes from IEC 60384-14; header spellings and
designator ranges (C1-C4) are common practice in BOM exports, no published source.
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.kitting.bom import expand_refs, part_kind, read_bom, read_requirement, Unreadable
from stock.errors import BadSheet

D = Decimal


def write_csv(path, text: str):
    path.write_text(text, encoding="utf-8")
    return path


def write_xlsx(path, rows):
    from openpyxl import Workbook

    wb = Workbook()
    ws = wb.active
    ws.title = "BOM"
    for row in rows:
        ws.append(row)
    wb.save(path)
    return path


# Designator lists and ranges (common practice in BOM exports).
@pytest.mark.parametrize("text, refs", [
    pytest.param("C1, C2,C3", ("C1", "C2", "C3"), id="commas"),
    pytest.param("C1 C2;C3", ("C1", "C2", "C3"), id="spaces-and-semicolons"),
    pytest.param("C1-C4", ("C1", "C2", "C3", "C4"), id="range"),
    pytest.param("C1 - C3, C7", ("C1", "C2", "C3", "C7"), id="range-with-spaces"),
    pytest.param("C10–12", ("C10", "C11", "C12"), id="en-dash-range-short-form"),
    pytest.param("C1-C99999", ("C1-C99999",), id="absurd-range-kept-as-written"),
    pytest.param("", (), id="empty"),
])
def test_designators_are_split_and_ranges_expanded(text, refs):
    assert expand_refs(text) == refs


# Part kinds from designator letters (from memory of IEEE 315 / IEC 81346-2 usage).
@pytest.mark.parametrize("refs, value, kind_text, kind", [
    pytest.param(("C1", "C2"), "100n", "", "capacitor", id="C-is-capacitor"),
    pytest.param(("CX1",), "100n", "", "capacitor", id="CX-is-capacitor"),
    pytest.param(("R4",), "10k", "", "resistor", id="R-is-resistor"),
    pytest.param(("U1",), "NE555", "", "integrated circuit", id="U-is-ic"),
    pytest.param(("C1", "R1"), "x", "", "mixed", id="mixed-refs"),
    pytest.param((), "4.7uF", "", "capacitor", id="farad-unit-without-refs"),
    pytest.param((), "100n", "", "capacitor", id="letter-and-digit-value-without-refs"),
    pytest.param((), "10k", "", "unknown", id="resistor-value-without-refs"),
    pytest.param(("X1",), "100n", "Capacitor", "capacitor", id="kind-column-wins"),
    pytest.param(("C1",), "LM7805", "regulator", "regulator", id="kind-column-says-otherwise"),
])
def test_the_kind_of_part_is_read_from_kind_refs_or_value(refs, value, kind_text, kind):
    assert part_kind(refs, value, kind_text) == kind


# Requirements: IEC 60062 letters, EIA-198 codes, IEC 60384-14 classes.
@pytest.mark.parametrize("value, columns, expected", [
    pytest.param("150p", {"tolerance": "J"}, {"capacitance_pf": D(150), "tol_pct": D(5)},
                 id="tolerance-letter-J-is-5pct"),
    pytest.param("10p", {"tolerance": "±0.25pF"}, {"tol_pct": D("2.5")},
                 id="absolute-tolerance-becomes-percent"),
    pytest.param("100n", {"tolerance": "+80/-20%"}, {"tol_pct": D(80)},
                 id="asymmetric-tolerance-counts-its-larger-side"),
    pytest.param("100n", {"tolerance": "10"}, {"tol_pct": D(10)}, id="bare-number-is-percent"),
    pytest.param("104K", {}, {"capacitance_pf": D(100000), "tol_pct": D(10)},
                 id="marking-in-the-value-column"),
    pytest.param("2u2 50V X7R", {}, {"voltage_v": D(50), "voltage_kind": "DC"},
                 id="voltage-from-the-marking"),
    pytest.param("100n", {"voltage": "275VAC", "dielectric": "X2"},
                 {"safety_class": "X2", "application": "mains", "voltage_kind": "AC"},
                 id="x2-makes-a-mains-line"),
    pytest.param("150p", {"dielectric": "NP0"},
                 {"tempco_min": D(-30), "tempco_max": D(30)}, id="np0-window-0pm30"),
    pytest.param("150p", {"tempco": "-750±120"},
                 {"tempco_min": D(-870), "tempco_max": D(-630)}, id="tempco-window"),
    pytest.param("10u", {"dielectric": "tantalum"}, {"polarised": True}, id="tantalum-is-polarised"),
    pytest.param("47u electrolytic", {}, {"polarised": True}, id="electrolytic-word-is-polarised"),
    pytest.param("100n", {"application": "decoupling"}, {"application": "bypass"},
                 id="decoupling-means-bypass"),
])
def test_requirements_are_read_from_the_value_and_columns(value, columns, expected):
    got = read_requirement(value, "", columns)
    for key, want in expected.items():
        assert got[key] == want, key


@pytest.mark.parametrize("value, columns, column, reason", [
    pytest.param("abc", {}, "value", "not understood: abc", id="unreadable-value"),
    pytest.param("100", {}, "value", "three-digit code 10 pF or 100 pF", id="ambiguous-100"),
    pytest.param("", {}, "value", "no value or marking given", id="no-value"),
    pytest.param("100n", {"tolerance": "tight"}, "tolerance", "cannot read tolerance 'tight'",
                 id="bad-tolerance"),
    pytest.param("100n", {"tolerance": "E"}, "tolerance", "read differently by different tables",
                 id="disputed-tolerance-letter"),
    pytest.param("100n", {"voltage": "lots"}, "voltage", "cannot read voltage 'lots'",
                 id="bad-voltage"),
    pytest.param("100n", {"dielectric": "unobtainium"}, "dielectric",
                 "cannot read 'unobtainium' as a dielectric", id="bad-dielectric"),
    pytest.param("100n", {"application": "magic"}, "application",
                 "unknown application 'magic' (expected one of tuned, timing", id="bad-application"),
    pytest.param("100n", {"application": "mains"}, "application",
                 "a mains line must name its safety class", id="mains-without-class"),
])
def test_unreadable_requirements_name_the_column_and_the_reason(value, columns, column, reason):
    with pytest.raises(Unreadable) as exc:
        read_requirement(value, "", columns)
    assert exc.value.column == column
    assert reason in exc.value.reason


def test_a_csv_bom_keeps_every_line_and_reports_bad_rows_with_row_and_header(tmp_path):
    path = write_csv(tmp_path / "amp.csv", (
        "Designator,Qty,Value,Tol,Voltage,Dielectric,Use,Notes\n"
        '"C1, C2",2,100n,10%,50V,X7R,bypass,\n'
        "C3,1,150p,5%,,NP0,tuned,input tank\n"
        "R1-R3,3,10k,,,,,\n"
        "U1,1,NE555,,,,,\n"
        "\n"
        "C9,1,abc,,,,,\n"
        "CX1,1,100n,,275VAC,X2,,\n"
        "C12,two,100n,,,,,\n"))
    result = read_bom(path)
    rows = {l.row: l for l in result.lines}
    assert sorted(rows) == [2, 3, 4, 5, 7, 8, 9]
    assert rows[2].refs == ("C1", "C2") and rows[2].qty_per_board == 2
    assert rows[2].capacitance_pf == D(100000) and rows[2].dielectric.code == "X7R"
    assert rows[3].application == "tuned" and rows[3].notes == "input tank"
    assert [(l.row, l.kind) for l in result.not_tracked] == [(4, "resistor"),
                                                            (5, "integrated circuit")]
    assert rows[4].refs == ("R1", "R2", "R3")
    assert rows[8].safety_class == "X2" and rows[8].is_mains
    problems = {p.row: p for p in result.problems}
    assert problems[7].column == "Value" and problems[7].raw == "abc"
    assert problems[9].column == "Qty" and "'two' is not a whole number" in problems[9].reason
    assert rows[9].qty_per_board == 1      # counted from its designators, still reported


@pytest.mark.parametrize("qty, reason", [
    pytest.param("inf", "'inf' is not a whole number of parts", id="infinity"),
    pytest.param("NaN", "'NaN' is not a whole number of parts", id="nan"),
    pytest.param("2.5", "'2.5' is not a whole number of parts", id="fraction"),
    pytest.param("-1", "'-1' is not a whole number of parts", id="negative"),
    pytest.param("99999999999999999999", "is more than 1,000,000 parts per board", id="past-64-bits"),
])
def test_an_impossible_quantity_is_a_problem_on_its_line(tmp_path, qty, reason):
    path = write_csv(tmp_path / "q.csv", f"Refs,Qty,Value\nC1,{qty},100n\n")
    only = read_bom(path).lines[0]
    assert only.problem is not None and only.problem.column == "Qty"
    assert reason in only.problem.reason
    assert only.qty_per_board == 1


def test_an_xlsx_bom_reads_like_the_csv(tmp_path):
    path = write_xlsx(tmp_path / "tuner.xlsx", [
        ["Tuner board, rev B"],
        ["Ref Des", "Quantity", "Capacitance", "Tolerance", "Tempco", "Application"],
        ["C1-C3", 3, "47p", "2%", "0±30", "tuned"],
        ["C4", 1, "4u7", None, None, "bulk"],
        ["L1", 1, "10uH", None, None, None],
    ])
    result = read_bom(path)
    first = result.lines[0]
    assert first.row == 3 and first.refs == ("C1", "C2", "C3") and first.qty_per_board == 3
    assert first.capacitance_pf == D(47) and first.tol_pct == D(2)
    assert (first.tempco_min, first.tempco_max) == (D(-30), D(30))
    assert result.lines[1].capacitance_pf == D(4700000)
    assert [l.kind for l in result.not_tracked] == ["inductor"]


def test_a_header_unit_applies_to_bare_numbers(tmp_path):
    path = write_csv(tmp_path / "nf.csv", "Refs,Qty,Value (nF)\nC1,1,100\nC2,1,4.7\n")
    values = [l.capacitance_pf for l in read_bom(path).lines]
    assert values == [D(100000), D(4700)]


def test_a_bom_without_a_value_column_is_refused_naming_the_file(tmp_path):
    path = write_csv(tmp_path / "odd.csv", "Refs,Qty,Footprint\nC1,1,0805\n")
    with pytest.raises(BadSheet) as exc:
        read_bom(path)
    assert str(exc.value).startswith(f"{path}")
    assert "no column holds the value or marking" in str(exc.value)


def test_a_map_override_names_the_value_column(tmp_path):
    path = write_csv(tmp_path / "odd.csv", "Refs,Qty,Wert\nC1,1,100n\n")
    assert read_bom(path, overrides={"value": "Wert"}).lines[0].capacitance_pf == D(100000)


# CAD export conventions (common practice in BOM exports, no published source).
@pytest.mark.parametrize("text, refs", [
    pytest.param("C1..C4", ("C1", "C2", "C3", "C4"), id="dotted-range"),
    pytest.param('C1,C2,C5', ("C1", "C2", "C5"), id="grouped-without-spaces"),
    pytest.param("C3 .. C5", ("C3", "C4", "C5"), id="dotted-range-with-spaces"),
])
def test_cad_designator_ranges_and_groups_expand(text, refs):
    assert expand_refs(text) == refs


@pytest.mark.parametrize("value, dnp, fitted, expected", [
    pytest.param("100n", "DNP", "", "marked do-not-fit in the 'DNP' column", id="dnp-column-mark"),
    pytest.param("100n", "x", "", "marked do-not-fit in the 'DNP' column", id="dnp-column-cross"),
    pytest.param("100n", "no", "", None, id="dnp-column-says-no"),
    pytest.param("100n", "", "", None, id="fitted"),
    pytest.param("100n", "", "No", "the 'Fitted' column says 'No'", id="fitted-column-says-no"),
    pytest.param("DNF", "", "", "the value says 'DNF'", id="dnf-value"),
    pytest.param("4n7 (do not fit)", "", "", "the value says 'do not fit'", id="do-not-fit-words"),
    pytest.param("10u not fitted", "", "", "the value says 'not fitted'", id="not-fitted-words"),
    pytest.param("100NF", "", "", None, id="nanofarad-is-not-a-do-not-fit-word"),
])
def test_do_not_fit_is_read_from_its_column_or_the_value(value, dnp, fitted, expected):
    from stock.kitting.bom_conventions import not_fitted_reason

    assert not_fitted_reason(value, dnp, fitted) == expected


@pytest.mark.parametrize("value, rest, package", [
    pytest.param("100nF 0805", "100nF", "0805", id="chip-size-in-the-value"),
    pytest.param("22p/C0G", "22p C0G", "", id="slash-joined-dielectric"),
    pytest.param("100u 25V radial", "100u 25V", "radial", id="mounting-word"),
    pytest.param("100n 50V X7R", "100n 50V X7R", "", id="no-package-words"),
    pytest.param("100n +80/-20%", "100n +80/-20%", "", id="asymmetric-tolerance-kept-whole"),
])
def test_package_words_are_taken_out_of_the_value(value, rest, package):
    from stock.kitting.bom_conventions import split_package_words

    assert split_package_words(value) == (rest, package)


def test_a_cad_bom_line_with_extra_words_in_its_value_reads_them_all(tmp_path):
    # EIA-198 X7R; IEC 60062 letter-and-digit values
    path = write_csv(tmp_path / "cad.csv", "Reference,Value,Footprint,Quantity,DNP\n"
                     '"C1,C2",100nF 50V X7R 0603,,2,\n'
                     "C3,22p/C0G,C_0402_1005Metric,1,\n"
                     "C4-C6,4n7,C_0603_1608Metric,2,\n"
                     "C7,DNP,C_0603_1608Metric,1,\n")
    one, two, three, four = read_bom(path).lines
    assert (one.capacitance_pf, one.voltage_v, one.dielectric.code, one.package.chip_size) == \
        (D(100000), D(50), "X7R", "0603")
    assert (two.dielectric.code, two.package.chip_size) == ("C0G", "0402")
    assert three.qty_per_board == 3 and "quantity says 2 but 3 designators" in three.remarks[0]
    assert not four.fitted and four.problem is None
