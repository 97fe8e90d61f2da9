"""Rebuild the demo shop's files: python demo_inventory/make_demo.py

The shop is invented: Lantern Bench Instruments, a two-person bench that restores and builds
test gear. Its register is an XLSX workbook (a title row, a merged group header, a notes column,
one sheet per cabinet) plus a semicolon-separated cp1252 CSV typed on another machine for the
drawer cabinet by the window. The markings are of every kind the decoders read, with the typos,
ambiguous codes, a label that contradicts its marking, a duplicate bin and a few bad rows that
a real register has. Three BOMs of our own design go with it: a 7 MHz VFO board that needs
stable parts, a two-LED flasher with a 555 timer, and a mains inlet with an X2 position. A fourth,
exported from a CAD program (footprint names, grouped designators, a do-not-fit column), is the
control board of the bench's own supply; the SMD drawers bought for it record each part's package.
The tour ends with a repair of our own invention: an old receiver's oscillator whose silver mica (dots
white orange orange red gold brown, 330 pF) has failed, replaced from cabinets A and B.
"""

from __future__ import annotations

import csv
from pathlib import Path

HERE = Path(__file__).resolve().parent

# Cabinet A: ceramics. (location, label, marking, qty, min, notes)
CABINET_A = [
    ("A1", "1p5", "1R5C", 40, 10, "tiny trimmer helpers"),
    ("A2", "4p7", "4R7 C0G", 35, 10, ""),
    ("A3", "10p", "100", 60, 20, "marked just 100 - 10p or 100p?"),
    ("A4", "22p", "220J NP0", 80, 20, ""),
    ("A5", "33p", "N750 33p", 25, 5, "orange-top tubulars"),
    ("A6", "39p", "390J N750", 30, 5, "compensating"),
    ("A7", "47p", "47pF NP0", 120, 30, ""),
    ("A8", "56p", "560J C0G 100V", 50, 10, ""),
    ("A9", "62p", "620J 1H C0G", 40, 10, ""),
    ("A10", "68p", "680 NPO", 45, 10, "old stock, letter O on the bag"),
    ("A11", "100p", "101J C0G 2A", 150, 40, "VFO stock"),
    ("A12", "100p", "101K X7R", 200, 20, "bypass only"),
    ("A13", "150p", "151J 1H C0G", 60, 20, ""),
    ("A14", "150p", "151J P2H", 30, 5, "N150"),
    ("A15", "220p", "221J U2J", 25, 5, ""),
    ("A16", "330p", "331J 2A C0G", 70, 20, ""),
    ("A17", "470p", "471", 90, 20, ""),
    ("A18", "470p", "47K", 40, 10, "bag says 47K"),
    ("A19", "1n", "1n0 C0G 50V", 55, 10, ""),
    ("A20", "1n", "102K X7R", 300, 50, ""),
    ("A21", "2n2", "222K 2A X7R", 160, 40, ""),
    ("A22", "4n7", "4n7 J 100V", 80, 20, ""),
    ("A23", "10nF", "104", 500, 100, "drawer label and parts disagree?"),
    ("A24", "10n", "103K 1H X7R", 420, 100, ""),
    ("A25", "22n", "223Z", 150, 50, "Z5U discs"),
    ("A26", "47n", "473M 1H Y5V", 90, 20, ""),
    ("A27", "100n", "104K 2A X7R", 800, 200, "main bypass stock"),
    ("A28", "100n", "104K 2A X7R", 120, None, "second bag, same part"),
    ("A29", "100n", "0.1 50V Z5U", None, 50, "count unknown"),
    ("A30", "220n", "224K 1E X7R", 200, 40, ""),
    ("A31", "1u", "105K 1C X5R", 300, 50, ""),
    ("A32", "2u2", "2u2 1A X5R", 150, 30, ""),
    ("A33", "10u", "106M 0J X5R", 100, 20, ""),
    ("A34", "10u", "10uF 25V X7R 1210", 60, 10, ""),
    ("A35", "4n7", "0.01 1KV Z5U", 40, 10, "HV discs"),
    ("A36", "33p", "yellow violet black", 20, 5, "colour-coded, probably 47p"),
    ("A37", "47p", "yel-vio-blk, top dot black", 25, 5, "disc, black top"),
    ("A38", "1n", "brown black red", 35, 10, ""),
    ("A39", "10n", "brn blk orng", 30, 10, "typed fast"),
    ("A40", "68p", "bands: violet blue grey black green", 12, 2, "tubular, tempco band first"),
    ("A41", "1p", "1R0 B", 50, 10, ""),
    ("A42", "8p2", "8R2 D NP0", 30, 10, ""),
    ("A43", "", "X7RR 104", 20, 5, "typo on the label maker"),
    ("A44", "", "lots of little ones", "lots", None, "never counted"),
    ("A45", "470p", "471K 1KV Y5P", 50, 10, "HV"),
    ("A46", "1n5", "152J 2A C0G", 40, 10, ""),
    ("A47", "3n3", "332K 1H X7R", 120, 20, ""),
    ("A48", "6n8", "682K 1H X7R", 110, 20, ""),
    ("A49", "47p", "470J 1H C0G", 60, 10, "VFO stock, new reel"),
]

# Cabinet B: film, mica, electrolytics, safety.
CABINET_B = [
    ("B1", "10n", "10n 100V polyester", 120, 20, "MKT boxes"),
    ("B2", "22n", "223J 2A MKT", 80, 20, ""),
    ("B3", "47n", "u047 250V polypropylene", 40, 10, ""),
    ("B4", "100n", "u1 63V polyester", 200, 40, ""),
    ("B5", "100n", "104J 2J MKP", 60, 10, "audio crossovers"),
    ("B6", "220n", "224K 2A polyester", 90, 20, ""),
    ("B7", "470n", "474J 1J MKP", 40, 10, ""),
    ("B8", "1u", "1u0 63V polyester", 50, 10, ""),
    ("B9", "330p", "330pF 1% polystyrene", 30, 10, "filter work"),
    ("B10", "1n", "1000 pF 2.5% polystyrene", 25, 5, ""),
    ("B11", "100p", "100pF 5% silver mica 500V", 40, 10, "VFO"),
    ("B12", "470p", "dots: white yellow violet red gold brown", 15, 2, "old mica, EIA dots"),
    ("B13", "250p", "250 mmfd mica", 10, 2, "from a radio, old"),
    ("B14", "47n", ".047 MFD 600V paper", 8, None, "do not use in mains work"),
    ("B15", "100n", "X2 0.1uF 275VAC", 30, 10, "mains filter"),
    ("B16", "470n", "X2 474K 310VAC", 20, 5, ""),
    ("B17", "2n2", "Y2 222M 250VAC", 40, 10, "line-earth"),
    ("B18", "4n7", "X1Y2 472M 300VAC", 25, 5, ""),
    ("B19", "1u", "1uF 16V tantalum +", 60, 10, ""),
    ("B20", "10u", "10uF 16V tantalum +", 80, 20, ""),
    ("B21", "10u", "106K 1E tantalum", 40, 10, "timing stock"),
    ("B22", "47u", "47uF 10V tantalum polymer", 30, 5, ""),
    ("B23", "1u", "1uF 50V electrolytic", 100, 20, ""),
    ("B24", "10u", "10uF 25V 85C electrolytic", 150, 30, ""),
    ("B25", "100u", "100uF 25V 105C", 120, 20, ""),
    ("B26", "470u", "470uF 35V 105C electrolytic", 45, 10, "PSU reservoir"),
    ("B27", "2200u", "2200uF 25V 105C", 18, 5, ""),
    ("B28", "1000u", "1000uF 63V electrolytic", 12, 4, ""),
    ("B29", "4u7", "4.7uF 50V bipolar electrolytic", 30, 5, "speaker crossovers"),
    ("B30", "1F", "1F 5.5V double layer", 4, 1, "memory backup"),
    ("B31", "100u", "100uF 16V electrolytic", 6, 20, "low!"),
    ("B32", "22u", "22uF 50V electrolytic", -3, 5, "miscounted?"),
    ("B33", "10n", "10n 400V polypropylene", 35, 5, ""),
    ("B34", "2n2", "222J 630V polypropylene", 25, 5, ""),
    ("B35", "150p", "150pF 2% polystyrene", 20, 5, ""),
    ("B36", "39p", "39pF silver mica", 15, 5, ""),
    ("B37", "", "", 12, None, "unlabelled bag of axials"),
    ("B38", "220u", "220uF 6V3 105C", 60, 10, ""),
    ("B39", "33u", "33uF 16V tantalum", 25, 5, ""),
    ("B40", "4n7", "4n7 1kV X7R", 20, 5, ""),
]

# Drawer cabinet C, typed on another machine: semicolon-separated, cp1252, µ in the values.
# (drawer, value, code, WV, type, tol, qty, date code, remarks)
CABINET_C = [
    ("C01", "4,7µF", "", "63V", "electrolytic", "", "40", "1998", "radio spares, old"),
    ("C02", "0,22µF", "224", "100V", "polyester", "K", "60", "", ""),
    ("C03", "47pF", "470", "500V", "silver mica", "J", "25", "", "470 on the case"),
    ("C04", "100µF", "", "35V", "electrolytic", "", "30", "2009", ""),
    ("C05", "10nF", "103", "50V", "X7R", "K", "400", "", ""),
    ("C06", "1µF", "105", "35V", "tantalum", "M", "35", "", "band = +"),
    ("C07", "3,3nF", "332", "100V", "C0G", "J", "45", "", ""),
    ("C08", "220pF", "221", "50V", "NP0", "G", "40", "", ""),
    ("C09", "680pF", "681", "50V", "N1500", "K", "10", "", "old tubular"),
    ("C10", "100nF", "104", "275VAC", "X2", "K", "15", "", "mains"),
    ("C11", "2,2µF", "225", "250V", "polypropylene", "J", "20", "", ""),
    ("C12", "33µF", "", "450V", "electrolytic", "", "6", "2004", "valve amp HT — discharge!"),
    ("C13", "15pF", "150", "50V", "C0G", "J", "50", "", ""),
    ("C14", "27pF", "270", "50V", "NP0", "J", "", "", "not counted yet"),
    ("C15", "1,5nF", "152", "63V", "polystyrene", "J", "30", "", ""),
    ("C16", "68nF", "683", "100V", "MKT", "J", "70", "", ""),
    ("C17", "470µF", "", "16V", "electrolytic", "", "55", "2021", ""),
    ("C18", "12pF", "120", "50V", "C0G", "J", "45", "", ""),
    ("C19", "18pF", "180", "50V", "C0G", "J", "45", "", ""),
    ("C20", "820pF", "821", "100V", "C0G", "J", "30", "", ""),
    ("C21", "1,8nF", "182", "100V", "C0G", "J", "30", "", ""),
    ("C22", "22pF", "220", "50V", "N750", "J", "20", "", "compensating"),
    ("C23", "4,7nF", "472", "2kV", "Z5U", "M", "25", "", "HV"),
    ("C24", "1nF", "102", "1kV", "Y5P", "K", "30", "", ""),
    ("C25", "47µF", "", "25V", "bipolar electrolytic", "", "20", "", ""),
    ("C26", "10µF", "", "350V", "electrolytic", "", "12", "1996", "old HT caps"),
    ("C27", "100nF", "104", "63V", "X7R", "K", "abc", "", "typo in qty"),
    ("C28", "220nF", "224", "63V", "MKT", "J", "80", "", ""),
    ("C29", "39pF", "390", "50V", "C0G", "J", "35", "", ""),
    ("C30", "5,6nF", "562", "100V", "C0G", "J", "25", "", ""),
]

# The SMD drawers, with a package and mounting per bin (and a few through-hole cans).
# (drawer, value, code, WV, dielectric, tol, package, mounting, qty, notes)
SMD_DRAWERS = [
    ("D1", "100nF", "104", "50V", "X7R", "K", "0805", "SMD", "400", ""),
    ("D2", "100nF", "104", "50V", "C0G", "J", "0805", "SMD", "1000", "reel, for the filter boards"),
    ("D3", "22pF", "220", "50V", "C0G", "J", "0805", "SMD", "150", ""),
    ("D4", "22pF", "220", "50V", "C0G", "J", "0603", "SMD", "200", ""),
    ("D5", "10uF", "106", "16V", "X5R", "K", "0805", "SMD", "300", ""),
    ("D6", "1uF", "105", "25V", "X7R", "K", "0603", "SMD", "400", ""),
    ("D7", "10nF", "103", "50V", "X7R", "K", "0603", "SMD", "500", ""),
    ("D8", "100uF", "", "25V", "electrolytic", "", "radial 6.3x11 P2.5mm", "THT", "60", ""),
    ("D9", "100uF", "", "35V", "electrolytic", "", "radial D8mm P3.5mm", "THT", "40", ""),
    ("D10", "1uF", "105", "35V", "tantalum", "K", "case A", "SMD", "50", "band = +"),
]
SMD_HEADERS = ["Drawer", "Value", "Code", "WV", "Dielectric", "Tol", "Package", "Mounting", "Qty", "Notes"]

# The bench supply's control board as a CAD program exports it.
# (Reference, Value, Footprint, Quantity, DNP)
BOM_SUPPLY = [
    ("C1,C2,C5,C8", "100n", "Capacitor_SMD:C_0805_2012Metric", "4", ""),
    ("C3", "22p", "Capacitor_SMD:C_0603_1608Metric", "1", ""),
    ("C4", "100u 25V", "Capacitor_THT:CP_Radial_D6.3mm_P2.50mm", "1", ""),
    ("C6", "10u", "Capacitor_SMD:C_0805_2012Metric", "1", ""),
    ("C7", "1u", "Capacitor_Tantalum_SMD:CP_EIA-3216-18_Case-A", "1", ""),
    ("C9", "10nF 0603", "", "1", ""),
    ("C10", "100n", "Capacitor_SMD:C_0805_2012Metric", "1", "DNP"),
    ("C11..C12", "100n 50V X7R", "Capacitor_SMD:C_0805_2012Metric", "1", ""),
    ("R1-R4", "10k", "Resistor_SMD:R_0805_2012Metric", "4", ""),
]
SUPPLY_HEADERS = ["Reference", "Value", "Footprint", "Quantity", "DNP"]

# Three boards. (refs, qty per board, value, tolerance, voltage, dielectric, use, type, notes)
BOM_VFO = [
    ("C1", 1, "100p", "5%", "50V", "C0G", "tuned", "capacitor", "main tank"),
    ("C2,C3", 2, "330p", "5%", "50V", "C0G", "tuned", "capacitor", "Colpitts divider"),
    ("C4", 1, "250p", "5%", "50V", "NP0", "tuned", "capacitor", "padder: no such value, pair it"),
    ("C5", 1, "100p", "5%", "50V", "N150", "tuned", "capacitor", "coil compensation"),
    ("C6", 1, "47p", "5%", "50V", "C0G", "tuned", "capacitor", "buffer coupling"),
    ("C7,C8,C9,C10", 4, "100n", "", "16V", "X7R", "bypass", "capacitor", ""),
    ("C11", 1, "10n", "10%", "50V", "", "signal", "capacitor", "output coupling"),
    ("C12", 1, "10u", "", "16V", "", "bulk", "capacitor", "supply reservoir"),
    ("L1", 1, "4.7uH", "", "", "", "", "inductor", "T50-6 toroid"),
    ("Q1,Q2", 2, "J310", "", "", "", "", "transistor", ""),
    ("R1", 1, "100k", "5%", "", "", "", "resistor", ""),
]
BOM_FLASHER = [
    ("C1", 1, "10u", "10%", "9V", "", "timing", "capacitor", "sets ~1 Hz with R1/R2"),
    ("C2", 1, "10n", "10%", "9V", "", "bypass", "capacitor", "555 control pin"),
    ("C3", 1, "100u", "", "9V", "", "bulk", "capacitor", "battery reservoir"),
    ("C4", 1, "100n", "", "9V", "", "bypass", "capacitor", ""),
    ("U1", 1, "NE555", "", "", "", "", "IC", ""),
    ("R1,R2", 2, "47k", "5%", "", "", "", "resistor", ""),
    ("D1,D2", 2, "LED red", "", "", "", "", "LED", ""),
]
BOM_MAINS = [
    ("CX1", 1, "100n", "20%", "250VAC", "X2", "mains", "capacitor", "across the line"),
    ("CY1,CY2", 2, "2n2", "20%", "250VAC", "Y2", "mains", "capacitor", "line to earth"),
    ("C3", 1, "470u", "", "25V", "", "bulk", "capacitor", "after the bridge"),
    ("C4", 1, "100n", "", "25V", "", "bypass", "capacitor", ""),
    ("F1", 1, "T500mA", "", "", "", "", "fuse", "5x20 slow"),
    ("BR1", 1, "W04", "", "", "", "", "bridge rectifier", ""),
]
# The back shelf: bags bought from distributors, kept in boxes, listed by a helper who typed the
# headers in his own words and copied each bag's description (typing slips included).
BACK_SHELF_HEADERS = ["What the bag says", "Which box", "How many left", "Bought for"]
BACK_SHELF = [
    ["CAP CER 0.1UF 50V X7R 0805", "K1", 180, "decoupling"],
    ["CAP CER 22PF 50V C0G 0603", "K2", 95, "crystal loads"],
    ["CAP CER 4.7NF 100V X7R 1206", "K3", 60, ""],
    ["CAP ALUM 220UF 20% 35V RADIAL 8x11.5", "K4", 14, "supply rebuilds"],
    ["CAP ALUM 1000UF 20% 16V RADIAL 10x20", "K5", 6, ""],
    ["CAP TANT 10UF 10% 16V 1206", "K6", 25, ""],
    ["CAP FILM 0.47UF 275VAC X2 RADIAL", "K7", 8, "mains filter"],
    ["CAP FILM 10NF 5% 100V POLYESTER RADIAL", "K8", 40, ""],
    ["CAP MICA 100PF 5% 500V", "K9", 12, "transmitter"],
    ["Capacitor 4n7 2.5% 63V polystyrene axial", "K10", 20, ""],
    ["47uF 25V elctrolytic radial", "K11", 30, ""],
    ["1OOn 63V MKT", "K12", 50, ""],
    ["1k", "K13", 100, "resistors, wrong shelf"],
]

BOM_HEADERS = ["Ref", "Qty", "Value", "Tol", "Voltage", "Dielectric", "Use", "Type", "Notes"]


def _cabinet_sheet(wb, title: str, subtitle: str, rows) -> None:
    from openpyxl.styles import Alignment, Font

    ws = wb.create_sheet(title)
    ws["A1"] = "Lantern Bench Instruments — parts register"
    ws["A1"].font = Font(bold=True, size=14)
    ws["A2"] = subtitle
    # row 3 left blank, as people leave it
    ws["A4"] = "Where"
    ws.merge_cells("A4:B4")
    ws["C4"] = "Part"
    ws.merge_cells("C4:C4")
    ws["D4"] = "Stock"
    ws.merge_cells("D4:E4")
    for cell in ("A4", "C4", "D4"):
        ws[cell].alignment = Alignment(horizontal="center")
        ws[cell].font = Font(bold=True)
    ws.append(["Bin #", "Label", "Marking/Code", "Qty on hand", "Min", "Notes"])
    for loc, label, marking, qty, minimum, notes in rows:
        code: object = marking
        if marking.isdigit():
            code = int(marking)            # a code typed into Excel becomes a number
        ws.append([loc, label, code, qty, minimum, notes])
    ws.column_dimensions["C"].width = 40
    ws.column_dimensions["F"].width = 36


def build(out: Path = HERE) -> list[Path]:
    """Write every demo file into ``out``; returns their paths."""
    from openpyxl import Workbook

    out.mkdir(parents=True, exist_ok=True)
    wb = Workbook()
    wb.remove(wb.active)
    _cabinet_sheet(wb, "Cabinet A", "Cabinet A: ceramics (recounted Nov 2026)", CABINET_A)
    _cabinet_sheet(wb, "Cabinet B", "Cabinet B: film, mica, electrolytics, safety", CABINET_B)
    register = out / "lantern_register.xlsx"
    wb.save(register)

    drawers = out / "drawer_cabinet_c.csv"
    with open(drawers, "w", newline="", encoding="cp1252") as fh:
        w = csv.writer(fh, delimiter=";")
        w.writerow(["Drawer", "Value", "Code", "WV", "Dielectric/Type", "Tol", "Qty", "Date code", "Remarks"])
        w.writerows(CABINET_C)

    shelf = out / "back_shelf.csv"
    with open(shelf, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(BACK_SHELF_HEADERS)
        w.writerows(BACK_SHELF)

    smd = out / "smd_drawers.csv"
    with open(smd, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(SMD_HEADERS)
        w.writerows(SMD_DRAWERS)
    supply = out / "bench_supply_bom.csv"
    with open(supply, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(SUPPLY_HEADERS)
        w.writerows(BOM_SUPPLY)

    written = [register, drawers, shelf, smd, supply]
    for name, rows in (("vfo_7mhz_bom.csv", BOM_VFO), ("mains_inlet_bom.csv", BOM_MAINS)):
        path = out / name
        with open(path, "w", newline="", encoding="utf-8") as fh:
            w = csv.writer(fh)
            w.writerow(BOM_HEADERS)
            w.writerows(rows)
        written.append(path)
    flasher = Workbook()
    ws = flasher.active
    ws.title = "BOM"
    ws.append(["Two-LED flasher, rev B"])
    ws.append([])
    ws.append(BOM_HEADERS)
    for row in BOM_FLASHER:
        ws.append(list(row))
    path = out / "led_flasher_bom.xlsx"
    flasher.save(path)
    written.append(path)
    return written


if __name__ == "__main__":
    for p in build():
        print(p)
