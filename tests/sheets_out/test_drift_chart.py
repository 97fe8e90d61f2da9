"""The inventory workbook's drift charts, read back from the written file (and rendered when a
spreadsheet program is installed).

Sources: EIA-198 Class 1 (N750 = −750 ppm/K, sold as U2J ±120 ppm/K; C0G = NP0 = 0 ± 30 ppm/K) and
Class 2 (X7R ±15 % over −55…+125 °C, Y5V +22/−82 % over −30…+85 °C), [EIA-198] via
[parameters-page] and [latvian-codes]; ΔC/C = α·(T − 25 °C) is the definition of a linear tempco.
Typical family curves come from the one family table ([polystyrene-article] polystyrene −125 ppm/K
and memory; [film-dielectrics-table] tantalum ±10 %).
"""

from __future__ import annotations

import shutil
import subprocess

import pytest
from openpyxl import load_workbook

from stock.markings.decoder import decode
from stock.sheets_out.exports import export_inventory
from tests.sheets_out.test_exports import put_part

SHELF = ["47p N750 100V", "22p U2J 50V", "100p C0G 50V", "56p NP0 100V", "104K X7R 50V",
         "105Z Y5V 16V", "330p polystyrene 63V", "10uF 25V tantalum"]


@pytest.fixture
def workbook(store, tmp_path):
    for i, text in enumerate(SHELF):
        put_part(store, f"cab/D{i}", decode(text), on_hand=5)
    out = tmp_path / "drift.xlsx"
    export_inventory(store, out)
    return out


def _table(path):
    ws = load_workbook(path)["Drift with temperature"]
    names = [c.value for c in ws[1]][1:]
    rows = {r[0]: dict(zip(names, r[1:])) for r in ws.iter_rows(min_row=2, values_only=True)}
    return names, rows


def test_n750_rises_in_the_cold_and_falls_in_the_heat(workbook):
    # −750 ppm/K × (−55 − 25) K = +6 %; × (125 − 25) K = −7.5 % (EIA-198; not a loss both ways)
    names, rows = _table(workbook)
    assert "U2J / N750" in names           # the same characteristic: one series
    assert rows[-55]["U2J / N750"] == pytest.approx(6.0)
    assert rows[125]["U2J / N750"] == pytest.approx(-7.5)
    assert rows[25]["U2J / N750"] == 0
    # its band: (−750 ± 120) ppm/K × −80 K = +6.96 % and +5.04 %
    assert rows[-55]["U2J / N750 α−870"] == pytest.approx(6.96)
    assert rows[-55]["U2J / N750 α−630"] == pytest.approx(5.04)


def test_np0_and_c0g_are_one_series(workbook):
    names, _ = _table(workbook)
    assert "C0G / NP0" in names and "C0G" not in names and "NP0" not in names


def test_class2_codes_are_their_window_edges_over_the_rated_range_only(workbook):
    names, rows = _table(workbook)
    assert rows[-55]["X7R +15 %"] == 15 and rows[-55]["X7R −15 %"] == -15
    assert rows[25]["X7R −15 %"] == -15        # no spike to 0 at the reference temperature
    assert rows[130]["X7R +15 %"] is None      # nothing drawn past +125 °C
    assert rows[-30]["Y5V −82 %"] == -82 and rows[-35]["Y5V −82 %"] is None and rows[90]["Y5V +22 %"] is None


def test_other_families_are_their_typical_curves_and_say_so(workbook):
    names, rows = _table(workbook)
    assert "polystyrene (typical)" in names and "tantalum (typical)" in names
    # the family table's polystyrene α, −150 ppm/K, over its −40…+85 °C
    assert rows[85]["polystyrene (typical)"] == pytest.approx(-0.9)
    assert rows[90]["polystyrene (typical)"] is None
    assert rows[125]["tantalum (typical)"] == pytest.approx(10.0)     # [film-dielectrics-table]: ±10 % to +125 °C


def test_two_charts_with_temperature_and_percent_axes(workbook):
    charts = load_workbook(workbook)["Drift charts"]._charts
    assert len(charts) == 2
    class1, rest = charts
    assert len(class1.series) == 3 * 2          # (C0G / NP0, U2J / N750) × (α, α + tol, α − tol)
    assert len(rest.series) == 2 * 2 + 2        # X7R and Y5V edges, polystyrene and tantalum


@pytest.mark.skipif(shutil.which("soffice") is None or shutil.which("pdftoppm") is None,
                    reason="no spreadsheet program (soffice) or pdftoppm to render with")
def test_a_spreadsheet_program_renders_both_charts(workbook, tmp_path):
    from PIL import Image

    subprocess.run(["soffice", "--headless", "--convert-to", "pdf", "--outdir", str(tmp_path), str(workbook)],
                   check=True, capture_output=True, timeout=180)
    pdf = tmp_path / "drift.pdf"
    pages = int(next(line.split()[-1] for line in subprocess.run(
        ["pdfinfo", str(pdf)], capture_output=True, text=True, check=True).stdout.splitlines()
        if line.startswith("Pages:")))
    subprocess.run(["pdftoppm", "-r", "60", "-png", "-f", str(pages), "-l", str(pages), str(pdf),
                    str(tmp_path / "charts")], check=True, timeout=60)
    [png] = tmp_path.glob("charts*.png")
    image = Image.open(png).convert("RGB")
    width, height = image.size
    # the charts' coloured lines: many non-grey pixels in the top half and in the bottom half
    def coloured(box):
        return sum(1 for r, g, b in image.crop(box).get_flattened_data() if max(r, g, b) - min(r, g, b) > 60)
    assert coloured((0, 0, width, height // 2)) > 500
    assert coloured((0, height // 2, width, height)) > 500
