"""Each sheet of an import planned on its own: --map per sheet, kept mappings, skipped sheets, BOMs.

Sources: IEC 60062 for the codes (``473`` = 47 nF, ``222`` = 2.2 nF); the rest is the import's own
contract (no outside source needed). Sheets are invented, headed with phrases people type.
"""

from __future__ import annotations

import csv

import pytest
from openpyxl import Workbook

from stock.errors import BadSheet, BadValue
from stock.inventory.intake import import_file
from stock.inventory.settling import settle
from stock.inventory.sheet_plan import MapRule, parse_map_rules


def write_csv(path, rows):
    with open(path, "w", newline="", encoding="utf-8") as fh:
        csv.writer(fh).writerows(rows)
    return path


def two_sheet_workbook(path):
    wb = Workbook()
    first = wb.active
    first.title = "Front desk"
    for row in (["Drawer", "Stamp on the body", "Count"], ["F1", "104", 10], ["F2", "4n7", 5]):
        first.append(row)
    second = wb.create_sheet("Back room")
    for row in (["Slot", "Code", "Pieces"], ["B1", "222", 3], ["B2", "473", 8]):
        second.append(row)
    wb.save(path)
    return path


def test_map_rules_read_plain_and_per_sheet_forms():
    assert parse_map_rules(["quantity=On hand", "Back room:marking=Code"]) == (
        MapRule(None, "quantity", "On hand"), MapRule("Back room", "marking", "Code"))
    with pytest.raises(BadValue):
        parse_map_rules(["quantity"])


def test_a_two_sheet_workbook_imports_with_one_map_that_only_one_sheet_has(store, tmp_path):
    path = two_sheet_workbook(tmp_path / "shop.xlsx")
    report = import_file(store, path, overrides=parse_map_rules(["marking=Stamp on the body"]))
    assert [s.stored for s in report.sheets] == [2, 2]
    assert "'Stamp on the body' → marking (--map)" in report.sheets[0].mapping


def test_a_map_aimed_at_one_sheet_is_used_there_only(store, tmp_path):
    path = two_sheet_workbook(tmp_path / "shop.xlsx")
    report = import_file(store, path, overrides=parse_map_rules(["Back room:quantity=Pieces"]))
    assert "'Pieces' → quantity (--map)" in report.sheets[1].mapping
    assert not any("--map" in line for line in report.sheets[0].mapping)


def test_a_map_no_sheet_has_is_refused_naming_the_headers(store, tmp_path):
    path = two_sheet_workbook(tmp_path / "shop.xlsx")
    with pytest.raises(BadValue, match="a header of some sheet of the import: 'Drawer'"):
        import_file(store, path, overrides=parse_map_rules(["quantity=How many"]))
    assert store.one("SELECT COUNT(*) AS n FROM bins")["n"] == 0


def test_a_sheet_without_values_is_skipped_and_said_so(store, tmp_path):
    wb = Workbook()
    wb.active.title = "Bins"
    for row in (["Bin", "Marking", "Qty"], ["A1", "104", 3], ["A2", "4n7", 2]):
        wb.active.append(row)
    notes = wb.create_sheet("Read me")
    for row in (["Who", "When"], ["Sam", "2026-11-02"], ["Jo", "2026-11-03"]):
        notes.append(row)
    path = tmp_path / "with_notes.xlsx"
    wb.save(path)
    report = import_file(store, path)
    assert [(s.sheet, s.stored) for s in report.sheets if not s.skipped] == [("Bins", 2)]
    skipped = [s for s in report.sheets if s.skipped]
    assert skipped[0].sheet == "Read me"
    assert skipped[0].skipped.startswith("no column carries a value or marking")


def test_a_bom_given_to_import_is_refused_with_a_hint_unless_forced(store, tmp_path):
    path = write_csv(tmp_path / "board.csv", [["Designators", "Qty", "Value"],
                                              ["C1, C2, C5", "3", "100n"], ["C3", "1", "4u7"]])
    with pytest.raises(BadSheet, match="looks like a BOM.*kit plan"):
        import_file(store, path)
    assert store.one("SELECT COUNT(*) AS n FROM bins")["n"] == 0
    import_file(store, path, force=True)
    assert store.one("SELECT COUNT(*) AS n FROM bins")["n"] == 2


def test_a_mapping_given_once_is_remembered_and_can_be_forgotten(store, tmp_path):
    rows = [["Spot", "Scribbled on the bag", "Left"], ["Z1", "104", "4"], ["Z2", "4n7", "6"]]
    first = write_csv(tmp_path / "week1.csv", rows)
    import_file(store, first, overrides=parse_map_rules(["quantity=Left"]))
    second = write_csv(tmp_path / "week2.csv", rows[:1] + [["Z3", "222", "9"]])
    report = import_file(store, second)
    assert "'Left' → quantity (remembered)" in report.sheets[0].mapping
    third = write_csv(tmp_path / "week3.csv", rows[:1] + [["Z4", "473", "1"]])
    report = import_file(store, third, forget_mapping=True)
    assert not any("remembered" in line for line in report.sheets[0].mapping)


def test_a_code_column_and_a_value_column_are_both_read_and_cross_checked(store, tmp_path):
    path = write_csv(tmp_path / "two.csv", [
        ["Drawer", "Cap.", "Value (pF)", "Tol", "How many"],
        ["A1", "473", "", "5%", "10"],          # code only
        ["A2", "", "4700", "5%", "3"],          # value only: not quarantined for the tolerance
        ["A3", "", "150", "10%", "7"],
        ["A4", "104", "100000", "", "2"],       # both, agreeing
        ["A5", "222", "4700", "", "5"],         # both, disagreeing: a label-conflict
    ])
    report = import_file(store, path)
    assert report.sheets[0].stored == 5 and report.sheets[0].quarantined == 0
    values = {r["location"]: r["capacitance_pf"] for r in store.rows(
        "SELECT b.location, p.capacitance_pf FROM bins b JOIN parts p ON p.bin_id = b.id")}
    assert values == {"A1": 47000, "A2": 4700, "A3": 150, "A4": 100000, "A5": 2200}
    flags = store.rows("SELECT kind, message FROM flags WHERE status = 'open'")
    assert [f["kind"] for f in flags] == ["label-conflict"]
    assert "4.7 nF" in flags[0]["message"] and "2.2 nF" in flags[0]["message"]
    settle(store, "A5", reading=1, note="measured 4.69 nF")
    edited = write_csv(tmp_path / "two.csv", [
        ["Drawer", "Cap.", "Value (pF)", "Tol", "How many"],
        ["A5", "222", "4700", "", "4"]])
    import_file(store, edited)
    assert store.one("SELECT COUNT(*) AS n FROM flags WHERE status = 'open' AND kind = 'label-conflict'")["n"] == 0
    assert store.one("SELECT p.capacitance_pf FROM parts p JOIN bins b ON b.id = p.bin_id"
                     " WHERE b.location = 'A5'")["capacitance_pf"] == 4700


def test_a_description_sheet_imports_with_packages_and_families(store, tmp_path):
    path = write_csv(tmp_path / "bags.csv", [
        ["What the bag says", "Box", "Left"],
        ["CAP CER 0.1UF 50V X7R 0603", "K1", "100"],
        ["CAP ALUM 100UF 20% 25V RADIAL", "K2", "20"],
        ["CAP FILM 0.1UF 275VAC X2 RADIAL", "K3", "5"],
        ["1k", "K4", "50"],                      # a resistor: quarantined, never stored without a value
    ])
    report = import_file(store, path)
    assert (report.sheets[0].stored, report.sheets[0].quarantined) == (3, 1)
    parts = {r["location"]: r for r in store.rows(
        "SELECT b.location, p.family, p.polarity, p.package, p.mounting, p.safety_class, p.decoded_json"
        " FROM bins b JOIN parts p ON p.bin_id = b.id")}
    assert (parts["K1"]["package"], parts["K1"]["mounting"]) == ("0603", "SMD")
    assert parts["K2"]["family"] == "aluminium-electrolytic" and parts["K2"]["polarity"] == "negative-marked"
    assert parts["K2"]["mounting"] == "THT" and parts["K3"]["safety_class"] == "X2"
    assert all('"unparsed": []' in p["decoded_json"] for p in parts.values())


def test_a_package_column_that_disagrees_with_the_description_is_flagged(store, tmp_path):
    path = write_csv(tmp_path / "mixed.csv", [["Bin", "Marking", "Package", "Qty"],
                                              ["P1", "CAP CER 0.1UF 50V X7R 0603", "radial", "5"]])
    import_file(store, path)
    flags = store.rows("SELECT kind, message FROM flags")
    assert any(f["kind"] == "conflicting-readings" and "THT" in f["message"] and "SMD" in f["message"]
               for f in flags)
