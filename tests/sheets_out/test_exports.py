"""Purchasing and inventory spreadsheets read back with openpyxl.

Sources: IEC 60063 for the preferred values (E12 for ±10 %, E24 for ±5 %), cross-checked with the
`eseries` reference library; EIA-198 for the X7R (±15 % over −55…+125 °C) and C0G (0 ± 30 ppm/K)
figures charted; the OWASP "CSV Injection" note for the formula guard.
"""

from __future__ import annotations

import csv
import json
from decimal import Decimal

import eseries
import pytest
from openpyxl import load_workbook

from stock.decoded import Dielectric, Marking, Tolerance
from stock.sheets_out.exports import export_inventory, export_purchasing, preferred_for
from tests.stored_rows import store_bin

C0G = Dielectric("C0G", "ceramic", 1, Decimal(0), Decimal(30), source="EIA-198 Class 1")
X7R = Dielectric("X7R", "ceramic", 2, None, None, Decimal(-55), Decimal(125), Decimal(15), Decimal(15),
                 source="EIA-198 Class 2")


def put_part(store, key, marking: Marking, on_hand=None, minimum=None, label=None):
    """A bin in cabinet 'cab', its part stored through the importer's column mapping."""
    return store_bin(store, key, marking, on_hand, location=key.split("/")[-1], label=label,
                     cabinet="cab", minimum=minimum)


def short_plan(store, requirement: dict, short: int, refs=("C1", "C2")):
    with store.writing() as db:
        pid = db.conn.execute("INSERT INTO plans (created_at, boards) VALUES ('now', 2)").lastrowid
        db.conn.execute("INSERT INTO plan_lines (plan_id, line_no, refs_json, need, short, requirement_json)"
                        " VALUES (?, 1, ?, ?, ?, ?)", (pid, json.dumps(list(refs)), short, short,
                                                       json.dumps(requirement)))
    return pid


# IEC 60063: values not in the series are rounded to the nearest one; eseries agrees.
@pytest.mark.parametrize("pf, tol, expected", [
    pytest.param("140", "10", "150", id="140p-at-10pct-buys-E12-150p"),
    pytest.param("4000", "10", "3900", id="4n0-at-10pct-buys-E12-3n9"),
    pytest.param("6000", "5", "6200", id="6n0-at-5pct-buys-E24-6n2"),
    pytest.param("4300", "5", None, id="4n3-is-already-E24"),
    pytest.param("150", "10", None, id="150p-is-already-E12"),
])
def test_the_preferred_value_is_the_nearest_in_the_series_for_the_tolerance(pf, tol, expected):
    got = preferred_for(Decimal(pf), Decimal(tol))
    assert (None if got is None else int(got)) == (None if expected is None else int(expected))
    if expected is not None:  # the eseries reference library picks the same value
        series = eseries.E24 if Decimal(tol) < 10 else eseries.E12
        assert eseries.find_nearest(series, float(pf)) == float(expected)


def test_the_purchasing_list_carries_shortfalls_with_spare_and_a_totals_row(store, tmp_path):
    short_plan(store, {"capacitance_pf": 140, "tol_pct": 10, "voltage_v": 50, "voltage_kind": "DC",
                       "dielectric": "C0G", "describe": "140 pF ±10 %, C0G, ≥ 50 V"}, short=9)
    put_part(store, "cab/A2", Marking("103K X7R", Decimal(10000), Tolerance(Decimal(10), Decimal(10), "%"),
                                      dielectric=X7R), on_hand=2, minimum=5)
    out = tmp_path / "order.xlsx"
    assert export_purchasing(store, out, below_minimum=True) == 2
    ws = load_workbook(out)["To order"]
    assert ws.freeze_panes == "A2" and ws.auto_filter.ref == "A1:N3"
    rows = list(ws.iter_rows(values_only=True))
    assert rows[0][:3] == ("Value", "Capacitance (pF)", "Tolerance")
    first = dict(zip(rows[0], rows[1]))
    assert first["Quantity"] == 10           # 9 short + 10 % spare, rounded up
    assert first["Preferred value"] == "150 pF"
    assert first["Dielectric / family"] == "C0G" and first["Voltage (V)"] == 50
    assert "plan 1 line 1 (C1,C2)" in first["Needed by"]
    second = dict(zip(rows[0], rows[2]))
    assert second["Quantity"] == 4           # minimum 5 − 2 on hand = 3, +10 % → 4
    assert rows[3][0] == "Total" and rows[3][10] == "=SUM(K2:K3)"
    assert ws["K2"].number_format == "#,##0"


def test_text_that_looks_like_a_formula_stays_text_in_xlsx_and_csv(store, tmp_path):
    put_part(store, "cab/=cmd", Marking("=HYPERLINK(\"x\")", Decimal(100)), on_hand=1,
             label="+SUM(A1)")
    xlsx, text = tmp_path / "inv.xlsx", tmp_path / "inv.csv"
    export_inventory(store, xlsx)
    export_inventory(store, text)
    ws = load_workbook(xlsx)["Bins"]
    assert ws["E2"].value == '=HYPERLINK("x")' and ws["E2"].data_type == "s"
    assert ws["D2"].data_type == "s" and ws["D2"].quotePrefix
    with open(text, encoding="utf-8-sig") as fh:
        rows = list(csv.reader(fh))
    assert rows[1][4] == "'=HYPERLINK(\"x\")" and rows[1][3] == "'+SUM(A1)"


def test_inventory_lists_grades_flags_and_charts_each_dielectric(store, tmp_path):
    a = put_part(store, "cab/A1", Marking("101J C0G", Decimal(100), Tolerance(Decimal(5), Decimal(5), "%"),
                                          dielectric=C0G), on_hand=20)
    put_part(store, "cab/A2", Marking("104K X7R", Decimal(100000), dielectric=X7R), on_hand=50)
    store.raise_flag(kind="duplicate", message="x", fingerprint="f", bin_id=a)
    out = tmp_path / "inv.xlsx"
    assert export_inventory(store, out) == 2
    wb = load_workbook(out)
    rows = list(wb["Bins"].iter_rows(values_only=True))
    first = dict(zip(rows[0], rows[1]))
    assert first["Tuned"] == "fit" and first["Open flags"] == "duplicate" and first["On hand"] == 20
    table = wb["Drift with temperature"]
    assert [c.value for c in table[1]] == ["Temperature (°C)", "C0G", "C0G α+30", "C0G α−30",
                                           "X7R +15 %", "X7R −15 %"]
    charts = wb["Drift charts"]._charts
    assert len(charts) == 2 and [len(c.series) for c in charts] == [3, 2]
    by_temp = {r[0]: r for r in table.iter_rows(min_row=2, values_only=True)}
    assert by_temp[125][2] == pytest.approx(0.3) and by_temp[125][3] == pytest.approx(-0.3)  # ±30 ppm/K × 100 K
    assert by_temp[0][4:] == (15, -15) and by_temp[150][4:] == (None, None)  # nothing past +125 °C


def test_a_pulled_plan_still_needs_its_shortfall_ordered_and_a_dropped_one_does_not(store):
    # common practice in purchasing, no published source
    from stock.sheets_out.exports import purchasing_lines

    pulled = short_plan(store, {"capacitance_pf": 1000, "describe": "1 nF"}, short=3)
    dropped = short_plan(store, {"capacitance_pf": 2200, "describe": "2.2 nF"}, short=4)
    store.db.conn.execute("UPDATE plans SET status = 'pulled' WHERE id = ?", (pulled,))
    store.db.conn.execute("UPDATE plans SET status = 'dropped' WHERE id = ?", (dropped,))
    lines = purchasing_lines(store)
    assert [(line.requirement, line.quantity) for line in lines] == [("1 nF", 4)]


def test_the_inventory_grades_follow_a_changed_grading_table(store, tmp_path):
    # the grading table is this project's (common practice, no published source); a shop's
    # stock-grading.toml next to the database overrides a row, and the export must follow it
    put_part(store, "cab/A1", Marking("101J C0G", Decimal(100), Tolerance(Decimal(5), Decimal(5), "%"),
                                      dielectric=C0G), on_hand=3)
    out = tmp_path / "inv.xlsx"
    export_inventory(store, out)
    first = dict(zip(*list(load_workbook(out)["Bins"].iter_rows(values_only=True))[:2]))
    assert first["Bulk"] == "unfit"         # 100 pF is below bulk's 1 µF
    (tmp_path / "stock-grading.toml").write_text("[bulk]\nmin_capacitance_pf = 10\n", encoding="utf-8")
    export_inventory(store, out)
    again = dict(zip(*list(load_workbook(out)["Bins"].iter_rows(values_only=True))[:2]))
    assert again["Bulk"] == "fit"


def _csv_rows(path):
    with open(path, encoding="utf-8-sig") as fh:
        return list(csv.DictReader(fh))


def test_the_purchasing_csv_names_every_fact_a_buyer_needs_in_plain_numbers(store, tmp_path):
    # IEC 60063: 250 pF at ±5 % is off E24, whose nearest value is 240 pF (eseries agrees below);
    # a 22 pF or a 470 µF part is already a preferred value.
    short_plan(store, {"capacitance_pf": 250.0, "tol_pct": 5, "voltage_v": 50.0, "voltage_kind": "DC",
                       "dielectric": "C0G", "describe": "250 pF ±5 %",
                       "package": {"raw": "C_0603_1608Metric"}}, short=2)
    short_plan(store, {"capacitance_pf": 470000000.0, "voltage_v": 25.0, "voltage_kind": "DC",
                       "family": "aluminium-electrolytic", "polarised": True, "describe": "470 µF",
                       "package": {"raw": "CP_Radial_D10.0mm_P5.00mm"}}, short=1)
    out = tmp_path / "order.csv"
    export_purchasing(store, out)
    first, second = _csv_rows(out)
    assert (first["Capacitance (pF)"], first["Tolerance"], first["Voltage (V)"], first["AC/DC"],
            first["Dielectric / family"], first["Package"], first["Mounting"],
            first["Preferred value"]) == ("250", "±5 %", "50", "DC", "C0G", "0603", "SMD", "240 pF")
    assert eseries.find_nearest(eseries.E24, 250) == 240
    assert second["Capacitance (pF)"] == "470000000"
    assert second["Dielectric / family"] == "aluminium-electrolytic"
    assert second["Package"].startswith("radial, ") and "5 mm pitch" in second["Package"]
    assert second["Mounting"] == "through-hole" and second["Polarity"] == "polarised"
    assert second["Preferred value"] == "in E12"


def test_the_inventory_export_keeps_every_field_the_sheet_gave(store, tmp_path):
    sheet = tmp_path / "bins.csv"
    sheet.write_text("Bin,Marking,Qty,Min,Package,Mounting,Date code,Notes,Rated temp\n"
                     "A1,104K 50V X7R,40,10,0805,SMD,2318,reel end,125\n", encoding="utf-8")
    from stock.inventory.intake import import_file

    import_file(store, sheet)
    out = tmp_path / "inv.csv"
    export_inventory(store, out)
    (row,) = _csv_rows(out)
    assert (row["Package"], row["Mounting"], row["Minimum"], row["Date code"], row["Notes"]) == \
        ("0805", "SMD", "10", "2318", "reel end")
    assert row["Capacitance (pF)"] == "100000" and row["Voltage (V)"] == "50"
    assert row["Rated temp (°C)"] == "125"
