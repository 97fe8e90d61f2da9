"""A CAD-exported BOM kitted against a mixed SMD and through-hole shelf, as a technician would.

The shelf and the BOM are our own invented build (a small bench power-supply controller), not the
demo shop. Sources: footprint naming (``C_0603_1608Metric``, ``CP_Radial_D5.0mm_P2.00mm``,
``C_Disc_D5.0mm_W2.5mm_P5.00mm``) and do-not-fit columns are common practice in CAD exports, no
published source; the EIA chip sizes from memory of the EIA / IEC 60115-8 designations; X2 as a
mains class from IEC 60384-14; the order in which bins are spent (plainest part that will do,
then the fullest bin, then location) is common practice, no published source.
"""

from __future__ import annotations

import csv

import pytest

from stock.inventory.intake import import_file
from stock.kitting.bom import read_bom
from stock.kitting.planner import KitOptions, plan_kit
from stock.kitting.pick_list import plan_text
from stock.kitting.stored_plans import pull_plan, undo_pull
from stock.store.database import open_store
from stock.store.integrity import check_store

# (location, marking, qty, package, mounting)
SHELF = [
    ("S1", "104K 50V X7R", 500, "0805", "SMD"),          # the ordinary bypass stock
    ("S2", "104J 50V C0G", 12, "0805", "SMD"),           # scarce and precious
    ("S3", "22pF 5% 50V C0G", 40, "0805", "SMD"),        # right part, wrong size for 0603 pads
    ("S4", "22pF 5% 50V C0G", 60, "C_0603_1608Metric", ""),  # the 0603 one
    ("S5", "106K 16V X5R", 80, "0805", "SMD"),
    ("S6", "100uF 25V electrolytic", 30, "radial 6.3x11 P2.5mm", "THT"),
    ("S7", "100uF 25V electrolytic", 25, "radial D5mm P2mm", "THT"),
    ("S8", "X2 104K 275VAC", 10, "box P15mm", "THT"),
    ("S9", "104J 630V polypropylene", 20, "radial P10mm", "THT"),
    ("S10", "102K 1KV Y5P", 30, "disc P5mm", "THT"),
    ("S11", "102K 50V X7R", 15, "", ""),                  # package never recorded
    ("S12", "102K 50V X7R", 100, "disc 5x2.5 P5mm", "THT"),
]

BOM_ROWS = [
    # Reference, Value, Footprint, Quantity, DNP
    ("C1,C2,C5", "100n", "Capacitor_SMD:C_0805_2012Metric", "3", ""),
    ("C3", "22p", "C_0603_1608Metric", "1", ""),
    ("C4", "100u", "CP_Radial_D5.0mm_P2.00mm", "1", ""),
    ("C6", "10u", "C_0805_2012Metric", "1", ""),
    ("C7", "1nF", "C_Disc_D5.0mm_W2.5mm_P5.00mm", "1", ""),
    ("C8", "100n", "C_0805_2012Metric", "1", "DNP"),
    ("C9..C10", "100nF 0805", "", "1", ""),
    ("R1", "10k", "R_0805_2012Metric", "1", ""),
]


@pytest.fixture
def shelf(tmp_path):
    path = tmp_path / "supply_shelf.csv"
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(["Bin", "Marking", "Qty", "Package", "Mounting"])
        w.writerows(SHELF)
    store = open_store(tmp_path / "shop.db")
    import_file(store, path)
    yield store
    store.close()


@pytest.fixture
def cad_bom(tmp_path):
    path = tmp_path / "supply_controller_bom.csv"
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(["Reference", "Value", "Footprint", "Quantity", "DNP"])
        w.writerows(BOM_ROWS)
    return path


def _bins(line) -> list[tuple[str, int]]:
    return [(a.bin_key.split("/")[-1], a.qty) for a in line.allocations]


def _line(kit, ref: str):
    return next(line for line in kit.lines if ref in line.refs)


def test_a_cad_bom_reads_its_footprints_do_not_fit_and_grouped_references(cad_bom):
    bom = read_bom(cad_bom)
    by_ref = {line.refs[0]: line for line in bom.lines}
    assert by_ref["C1"].refs == ("C1", "C2", "C5")
    assert by_ref["C1"].package.chip_size == "0805"
    assert by_ref["C4"].package.lead_form == "radial" and by_ref["C4"].polarised
    assert not by_ref["C8"].fitted and "DNP" in by_ref["C8"].not_fitted_reason
    assert by_ref["C9"].refs == ("C9", "C10")
    assert by_ref["C9"].package.chip_size == "0805"          # the size written in the value
    assert by_ref["C9"].capacitance_pf == 100000
    assert any("quantity says 1 but 2 designators" in r for r in by_ref["C9"].remarks)
    assert by_ref["C9"].qty_per_board == 2


def test_every_line_is_planned_on_a_part_of_the_right_size_and_mounting(shelf, cad_bom):
    kit = plan_kit(shelf, cad_bom, KitOptions(boards=2))
    assert _bins(_line(kit, "C1")) == [("s1", 6)]            # ordinary X7R, not the scarce C0G
    assert _bins(_line(kit, "C3")) == [("s4", 2)]            # the 0603 bin, not the 0805 one
    assert _bins(_line(kit, "C4")) == [("s7", 2)]            # the D5 can; the D6.3 will not fit
    assert _bins(_line(kit, "C6")) == [("s5", 2)]            # the 0805 X5R, not a radial can
    assert _bins(_line(kit, "C7")) == [("s12", 2)]           # a disc known to fit, before S11
    assert _bins(_line(kit, "C9")) == [("s1", 4)]
    assert all(line.short == 0 for line in kit.tracked_lines)


def test_the_scarce_precious_bin_is_untouched_when_an_ordinary_one_suffices(shelf, cad_bom):
    kit = plan_kit(shelf, cad_bom, KitOptions(boards=2))
    used = {a.bin_key.split("/")[-1] for line in kit.lines for a in line.allocations}
    assert not used & {"s2", "s8", "s9", "s10"}              # C0G, X2, polypropylene, 1 kV disc
    assert not any("s2" in n for n in _line(kit, "C1").notes)   # never in the running: no word


def test_a_precious_bin_passed_over_although_it_is_the_fullest_is_named(shelf, tmp_path):
    extra = tmp_path / "reel.csv"
    extra.write_text("Bin,Marking,Qty,Package\nR1,104J 50V C0G,4000,0805\n", encoding="utf-8")
    import_file(shelf, extra)
    bom = tmp_path / "one.csv"
    bom.write_text("Reference,Value,Footprint\nC1,100n,C_0805_2012Metric\n", encoding="utf-8")
    kit = plan_kit(shelf, bom, KitOptions(boards=2))
    assert _bins(kit.lines[0]) == [("s1", 2)]
    assert ("kept reel/r1 (104J 50V C0G: C0G (Class 1)) for the positions that need it; a plainer"
            " part does this one") in kit.lines[0].notes


def test_a_do_not_fit_line_takes_nothing_and_is_listed_as_not_fitted(shelf, cad_bom):
    kit = plan_kit(shelf, cad_bom, KitOptions(boards=2))
    dnp = _line(kit, "C8")
    assert dnp.allocations == () and not dnp.tracked
    assert [line.refs for line in kit.not_fitted] == [("C8",)]
    assert kit.to_json()["not_fitted"][0]["reason"] == "marked do-not-fit in the 'DNP' column"
    assert "not fitted (marked do-not-fit; nothing taken):" in plan_text(kit)


def test_the_notes_say_why_a_bin_did_not_fit(shelf, cad_bom):
    kit = plan_kit(shelf, cad_bom, KitOptions(boards=2))
    c3 = " | ".join(_line(kit, "C3").notes)
    assert "s3 (22pF 5% 50V C0G): 0805 part for 0603 pads" in c3
    c4 = " | ".join(_line(kit, "C4").notes)
    assert "D6.3 mm body for a D5 mm outline" in c4
    c6 = " | ".join(_line(kit, "C6").notes)
    assert "polarised" not in c6 or "does not fit" in c6


def test_a_bin_with_no_recorded_package_is_used_after_the_known_ones_with_a_note(shelf, tmp_path):
    path = tmp_path / "disc_bom.csv"
    path.write_text("Reference,Value,Footprint\nC1,1nF,C_Disc_D5.0mm_W2.5mm_P5.00mm\n",
                    encoding="utf-8")
    kit = plan_kit(shelf, path, KitOptions(boards=140))
    # the plain disc, then the 1 kV disc (known to fit), only then the bin of unknown package
    assert _bins(kit.lines[0]) == [("s12", 100), ("s10", 30), ("s11", 10)]
    notes = " | ".join(kit.lines[0].notes)
    assert "s11: package not recorded; check it fits a through-hole radial footprint" in notes
    assert ("s10: 1 kV DC rating used for this position: the plainer bins (supply_shelf/s12) do not"
            " cover the need") in notes


def test_a_polarised_footprint_takes_a_polarised_part_with_the_orientation_caution(shelf, cad_bom):
    kit = plan_kit(shelf, cad_bom, KitOptions(boards=1))
    assert _bins(_line(kit, "C4")) == [("s7", 1)]
    assert any("Polarised parts (" in c and "C4" in c for c in kit.cautions)


def test_pull_and_undo_of_a_cad_plan_still_reconcile(shelf, cad_bom):
    kit = plan_kit(shelf, cad_bom, KitOptions(boards=2))
    pull_plan(shelf, kit.id)
    assert check_store(shelf).ok
    undo_pull(shelf, kit.id)
    assert check_store(shelf).ok


def test_a_polarised_part_never_goes_on_an_unpolarised_cad_footprint(shelf, tmp_path):
    # CAD libraries name polarised footprints CP_...; C_1206 has no polarity mark on the board
    extra = tmp_path / "tantalum_drawer.csv"
    extra.write_text("Bin,Marking,Qty,Package\nT1,10uF 16V tantalum,100,1206\n", encoding="utf-8")
    import_file(shelf, extra)
    bom = tmp_path / "tant_bom.csv"
    bom.write_text("Reference,Value,Footprint\nC1,10u,C_1206_3216Metric\n"
                   "C2,10u,CP_Tantalum_Case-A_EIA-3216-18\n", encoding="utf-8")
    kit = plan_kit(shelf, bom, KitOptions(boards=1))
    first, second = kit.lines
    assert first.allocations == () and first.short == 1
    assert any("polarised part for the unpolarised footprint 'C_1206_3216Metric'" in n
               for n in first.notes)
    assert _bins(second) == [("t1", 1)]


def test_a_lone_value_like_1n_is_a_value_not_a_voltage_code(tmp_path):
    # IEC 60062: 1n is 1 nF; a two-character voltage code stands beside a value, not alone
    path = tmp_path / "one_n.csv"
    path.write_text("Reference,Value\nC1,1n\n", encoding="utf-8")
    (line,) = read_bom(path).lines
    assert line.capacitance_pf == 1000 and line.voltage_v is None


def test_the_pick_list_names_each_bin_package_for_the_picker(shelf, cad_bom):
    from stock.kitting.pick_list import pick_list, pick_list_text

    kit = plan_kit(shelf, cad_bom, KitOptions(boards=1))
    rows = {r.bin_key.split("/")[-1]: r for r in pick_list(shelf, kit).rows}
    assert rows["s4"].package == "0603" and rows["s1"].package == "0805"
    assert rows["s7"].package == "through-hole radial, D5 mm, 2 mm pitch"
    assert "\t0603" in pick_list_text(pick_list(shelf, kit))
