"""The inventory workbook's drift charts: what each characteristic on hand promises, with its sign.

One series per distinct characteristic (NP0 and C0G are one: 0 ± 30 ppm/K), on two charts so each
stays legible:

- **Class 1 ceramics**: the line ΔC/C = α·(T − 25 °C), and the two edges of its tolerance band
  (α ± tol)·(T − 25 °C), over the Class 1 range. A negative α rises in the cold: N750 is +6 % at
  −55 °C (−750 ppm/K × −80 K) and −7.5 % at +125 °C (EIA-198; an old name's tolerance on α is the one
  grading assumes). An old name and the EIA-198 code it is sold as with the same figures are one
  series (``U2J / N750``).
- **Class 2 ceramics and the other families**: a Class 2 code as the two edges of its window
  (+plus % and −minus %) over its rated range only, nothing outside it (EIA-198 promises the
  window there and nothing else); a film, mica, glass or electrolytic family as its typical curve
  from the one family table (:mod:`stock.markings.families`), marked "typical": the α line where
  the family has one, else a curve through −minus % at the cold end, 0 at +25 °C and +plus % at
  the hot end (their capacitance rises with temperature; PTFE's falls).

>>> c = class1_curves([_C0G])[0]
>>> c.name, c.values[-55], c.values[125]
('C0G', 0.0, 0.0)
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from dataclasses import dataclass, field
from decimal import Decimal
from typing import Any

from stock.decoded import Dielectric
from stock.markings.ceramic_codes import CLASS1_RANGE
from stock.markings.families import FAMILY_FIGURES
from stock.physics.stability import REFERENCE_C, assumed_tempco_tol
from stock.units import format_number

TEMPERATURES: tuple[int, ...] = tuple(range(-55, 155, 5))   # °C: the widest EIA-198 Class 2 span
# Families whose capacitance falls as the temperature rises (from memory of film makers' curves:
# PTFE's +1/−3 % window is +1 % cold, −3 % hot).
FALLING_FAMILIES = frozenset({"ptfe"})
_EIA = re.compile(r"[A-Z]\d[A-Z]")


@dataclass(frozen=True)
class Curve:
    """One series: its legend name and ΔC/C in % per temperature (None where nothing is promised)."""

    name: str
    values: dict[int, float | None] = field(default_factory=dict)
    edge: bool = False      # a band or window edge of the curve before it (same colour, dashed)


def _in(t: int, low: Decimal | None, high: Decimal | None) -> bool:
    return (low is None or t >= low) and (high is None or t <= high)


def _line(slope_ppm: Decimal, low: Decimal | None, high: Decimal | None) -> dict[int, float | None]:
    return {t: float(slope_ppm * (t - REFERENCE_C) / Decimal(10_000)) + 0.0 if _in(t, low, high) else None
            for t in TEMPERATURES}  # + 0.0: no −0.0 in the sheet


def _ppm(value: Decimal) -> str:
    return ("+" if value > 0 else "") + format_number(value).replace("-", "−")


def class1_curves(dielectrics: Sequence[Dielectric]) -> list[Curve]:
    """Per distinct (α, tol): the α line and the two band edges, over the Class 1 range."""
    names: dict[tuple[Decimal, Decimal], list[str]] = {}
    for d in dielectrics:
        if d.family != "ceramic" or d.klass != 1 or d.tempco_ppm_per_k is None:
            continue
        alpha = d.tempco_ppm_per_k
        tol = d.tempco_tol_ppm_per_k if d.tempco_tol_ppm_per_k is not None else assumed_tempco_tol(alpha)
        group = names.setdefault((alpha, tol), [])
        if d.code not in group:
            group.append(d.code)
    low, high = d_range = CLASS1_RANGE
    curves = []
    for (alpha, tol), codes in sorted(names.items(), key=lambda item: (-item[0][0], item[0][1])):
        name = " / ".join(sorted(codes, key=lambda c: (not _EIA.fullmatch(c), c)))  # EIA code first
        curves.append(Curve(name, _line(alpha, low, high)))
        if tol:
            curves.append(Curve(f"{name} α{_ppm(alpha + tol)}", _line(alpha + tol, *d_range), edge=True))
            curves.append(Curve(f"{name} α{_ppm(alpha - tol)}", _line(alpha - tol, *d_range), edge=True))
    return curves


def _window(d: Dielectric) -> list[Curve]:
    edges = []
    for sign, pct in ((1, d.change_plus_pct), (-1, d.change_minus_pct)):
        value = float(sign * pct)
        edges.append(Curve(f"{d.code} {'+' if sign > 0 else '−'}{format_number(pct)} %",
                           {t: value if _in(t, d.temp_min_c, d.temp_max_c) else None for t in TEMPERATURES},
                           edge=sign < 0))
    return edges


def _typical(family: str) -> Curve | None:
    f = FAMILY_FIGURES.get(family)
    if f is None:
        return None
    name = f"{family.replace('-', ' ')} (typical)"
    if f.tempco is not None:
        return Curve(name, _line(f.tempco, f.temp_min_c, f.temp_max_c))
    if f.change_minus_pct is None or f.temp_min_c is None or f.temp_max_c is None:
        return None
    cold, hot = -f.change_minus_pct, f.change_plus_pct
    if family in FALLING_FAMILIES:
        cold, hot = f.change_plus_pct, -f.change_minus_pct
    values: dict[int, float | None] = {}
    for t in TEMPERATURES:
        if not _in(t, f.temp_min_c, f.temp_max_c):
            values[t] = None
        elif t <= REFERENCE_C:
            values[t] = float(cold * (REFERENCE_C - t) / (REFERENCE_C - f.temp_min_c))
        else:
            values[t] = float(hot * (t - REFERENCE_C) / (f.temp_max_c - REFERENCE_C))
    return Curve(name, values)


def other_curves(dielectrics: Sequence[Dielectric]) -> list[Curve]:
    """Class 2 windows (two edges each, one pair per distinct window) and typical family curves."""
    curves: list[Curve] = []
    windows: set[tuple[Any, ...]] = set()
    families: list[str] = []
    for d in sorted(dielectrics, key=lambda d: (d.family != "ceramic", d.code)):
        if d.family == "ceramic" and d.klass == 2 and d.change_minus_pct is not None:
            key = (d.temp_min_c, d.temp_max_c, d.change_minus_pct, d.change_plus_pct)
            if key not in windows:
                windows.add(key)
                curves += _window(d)
        elif d.family != "ceramic" and d.family not in families:
            families.append(d.family)
    curves += [c for c in (_typical(f) for f in families) if c is not None]
    return curves


# Distinct colours, one per characteristic (its band edges or window edges share it, dashed).
PALETTE = ("1F77B4", "D62728", "2CA02C", "9467BD", "FF7F0E", "8C564B", "E377C2", "17BECF", "7F7F7F",
           "BCBD22")


def _chart(charts: Any, ws: Any, anchor: str, title: str, first_col: int, curves: Sequence[Curve]) -> None:
    """One chart on the charts sheet, its series read from the table sheet ``ws``."""
    from openpyxl.chart import Reference, ScatterChart, Series  # heavy: only when a workbook is written

    chart = ScatterChart()
    chart.title = title
    chart.x_axis.title = "Temperature (°C)"
    chart.y_axis.title = "ΔC/C (%)"
    chart.x_axis.scaling.min, chart.x_axis.scaling.max = -60, 160   # round ticks around −55…+150 °C
    chart.x_axis.majorUnit = 20
    chart.x_axis.delete = chart.y_axis.delete = False
    chart.x_axis.tickLblPos = chart.y_axis.tickLblPos = "low"   # labels at the edge, not on the 0 line
    chart.y_axis.crosses = chart.x_axis.crosses = "min"         # the axes on the chart's edges
    chart.legend.position = "b"
    n = len(TEMPERATURES) + 1
    xs = Reference(ws, min_col=1, min_row=2, max_row=n)
    colour = -1
    for offset, curve in enumerate(curves):
        series = Series(Reference(ws, min_col=first_col + offset, min_row=1, max_row=n), xs, title_from_data=True)
        series.marker.symbol = "none"
        series.smooth = False
        if not curve.edge:
            colour += 1
        series.graphicalProperties.line.solidFill = PALETTE[colour % len(PALETTE)]
        series.graphicalProperties.line.width = 19050 if curve.edge else 28575   # EMU: 1.5 pt, 2.25 pt
        if curve.edge:
            series.graphicalProperties.line.dashStyle = "dash"
        chart.series.append(series)
    chart.width, chart.height = 25, 13
    charts.add_chart(chart, anchor)


CHART_SHEET = "Drift charts"


def add_drift_charts(wb: Any, dielectrics: Sequence[Dielectric], sheet_cell: Any) -> None:
    """A "Drift with temperature" sheet with the curves as a table, and a sheet with the two charts."""
    ws = wb.create_sheet("Drift with temperature")
    first, second = class1_curves(dielectrics), other_curves(dielectrics)
    curves = first + second
    ws.append([sheet_cell(ws, "Temperature (°C)", bold=True), *[sheet_cell(ws, c.name, bold=True) for c in curves]])
    for t in TEMPERATURES:
        ws.append([t, *[c.values[t] for c in curves]])
    if not curves:
        return
    charts = wb.create_sheet(CHART_SHEET)
    charts.page_setup.orientation = "landscape"          # in print: the two charts on one page
    charts.sheet_properties.pageSetUpPr.fitToPage = True
    charts.page_setup.fitToWidth = charts.page_setup.fitToHeight = 1
    if first:
        _chart(charts, ws, "A1", "Class 1 ceramics: ΔC/C = α·(T − 25 °C), dashed: the tolerance band on α",
               2, first)
    if second:
        _chart(charts, ws, "A28" if first else "A1",
               "Class 2 codes: window edges over the rated range; other families: typical curves",
               2 + len(first), second)


_C0G = Dielectric("C0G", "ceramic", 1, Decimal(0), Decimal(30))

__all__ = ["CHART_SHEET", "FALLING_FAMILIES", "TEMPERATURES", "Curve", "add_drift_charts", "class1_curves", "other_curves"]
