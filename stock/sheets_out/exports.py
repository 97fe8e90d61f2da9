"""Spreadsheets out: the purchasing list and the inventory workbook with its drift chart.

The purchasing list has a row per thing to order, written as a distributor's search needs it
(value in engineering units, tolerance, voltage, dielectric, safety class), the quantity with a
spare margin rounded up, and the nearest IEC 60063 preferred value (E12 for ±10 % and looser,
E24 for tighter) when the value asked for is not one. The inventory workbook lists every bin with
its decoded facts and a grade per application, and charts how each characteristic on hand moves
with temperature, with its sign (:mod:`stock.sheets_out.drift_chart`): Class 1 as α·(T − 25 °C) with
its band, Class 2 as its code's window, other families as typical curves, so it is plain at a
glance why X7R does not belong in a tank circuit.
"""

from __future__ import annotations

import json
import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from decimal import Decimal
from pathlib import Path
from typing import Any

from stock.inventory.bins import part_marking
from stock.decoded import Dielectric, Marking
from stock.markings.preferred_values import in_series, nearest
from stock.sheets_out.workbook import (Column, add_table_sheet, new_workbook, output_kind, save_workbook,
                               sheet_cell, write_csv)
from stock.sheets_out.drift_chart import add_drift_charts
from stock.store.database import Store

APPLICATION_COLUMNS = ("tuned", "timing", "signal", "bypass", "bulk", "mains")


def _fmt_cap(pf: float | None) -> str:
    from stock.units import format_capacitance

    return "" if pf is None else format_capacitance(Decimal(str(pf)))


def _fmt_tol(m: Marking) -> str:
    from stock.units import format_tolerance

    return format_tolerance(m.tolerance) if m.tolerance else ""


def preferred_for(capacitance_pf: Decimal | None, tol_pct: Decimal | None) -> Decimal | None:
    """The nearest E12 (±10 % or looser, or unknown) or E24 value, or None when already preferred.

    >>> preferred_for(Decimal(140), Decimal(10))
    Decimal('1.5E+2')
    >>> preferred_for(Decimal(150), Decimal(10)) is None
    True
    """
    if not capacitance_pf or capacitance_pf <= 0:
        return None
    name = "E24" if tol_pct is not None and tol_pct < 10 else "E12"
    return None if in_series(capacitance_pf, name) else nearest(capacitance_pf, name)


@dataclass
class OrderLine:
    """One thing to order, with who needs it."""

    capacitance_pf: Decimal | None
    tol_pct: Decimal | None
    voltage_v: Decimal | None
    voltage_kind: str
    dielectric: str
    safety_class: str
    polarity: str
    quantity: int
    requirement: str
    needed_by: list[str] = field(default_factory=list)
    package: str = ""
    mounting: str = ""

    def key(self) -> tuple:
        return (self.capacitance_pf, self.tol_pct, self.voltage_v, self.voltage_kind, self.dielectric,
                self.safety_class, self.polarity, self.package, self.mounting, self.requirement)


def _dec(value: Any) -> Decimal | None:
    return None if value in (None, "") else Decimal(str(value))


MOUNTING_WORDS = {"SMD": "SMD", "THT": "through-hole"}


def _package_words(text: str | None) -> tuple[str, str]:
    """(package, mounting) in words from package or footprint text: ("0805", "SMD")."""
    from stock.markings.packages import read_package

    if not text:
        return "", ""
    facts = read_package(text)
    if not facts.known:
        return text, ""
    package = facts.describe()
    for word in ("through-hole ", "SMD ", "through-hole", "SMD"):    # the mounting has its column
        if package.startswith(word):
            package = package[len(word):].lstrip(" ,")
            break
    return package, MOUNTING_WORDS.get(facts.mounting or "", "")


def _plan_order_line(row: Any) -> tuple[OrderLine, int, str]:
    req = json.loads(row["requirement_json"] or "{}")
    refs = ",".join(json.loads(row["refs_json"] or "[]"))
    package, mounting = _package_words((req.get("package") or {}).get("raw"))
    line = OrderLine(
        capacitance_pf=_dec(req.get("capacitance_pf")), tol_pct=_dec(req.get("tol_pct")),
        voltage_v=_dec(req.get("voltage_v") or req.get("working_v")),
        voltage_kind=str(req.get("voltage_kind") or ""),
        dielectric=str(req.get("dielectric") or req.get("dielectric_code") or req.get("family") or ""),
        safety_class=str(req.get("safety_class") or ""),
        polarity="polarised" if req.get("polarised") else "", quantity=0,
        requirement=str(req.get("describe") or req.get("text") or ""),
        package=package, mounting=mounting)
    who = f"plan {row['plan_id']} line {row['line_no']}" + (f" ({refs})" if refs else "")
    return line, int(row["short"]), who


def _bin_order_line(row: Any) -> tuple[OrderLine, int, str]:
    m = part_marking(row)
    tol = m.tolerance.as_percent(m.capacitance_pf) if m.tolerance else None
    package, mounting = _package_words(" ".join(t for t in (row.get("package"), row.get("mounting"))
                                                if t))
    line = OrderLine(
        capacitance_pf=m.capacitance_pf, tol_pct=max(tol) if tol else None,
        voltage_v=m.voltage_v, voltage_kind=m.voltage_kind or "",
        dielectric=(m.dielectric.code if m.dielectric else ""),
        safety_class=m.safety_class or "", polarity=m.polarity or "",
        quantity=0, requirement=f"like bin {row['bin_key']}: {row['marking']}",
        package=package, mounting=mounting)
    held = "an unknown count" if row["on_hand"] is None else str(row["on_hand"])
    return (line, int(row["minimum"]) - int(row["on_hand"] or 0),
            f"bin {row['bin_key']} (holds {held}, minimum {row['minimum']})")


def purchasing_lines(store: Store, plan_ids: Sequence[int] = (), below_minimum: bool = False,
                     spare_pct: Decimal = Decimal(10)) -> list[OrderLine]:
    """What to order: the shortfalls of plans (every plan held or pulled, unless ids are given) and, with
    ``below_minimum``, bins under their minimum. Equal requirements are merged."""
    lines: dict[tuple, OrderLine] = {}

    def add(line: OrderLine, need: int, who: str) -> None:
        qty = math.ceil(Decimal(need) * (1 + spare_pct / 100))
        line.quantity = qty
        existing = lines.get(line.key())
        if existing:
            existing.quantity += qty
            existing.needed_by.append(who)
        else:
            line.needed_by.append(who)
            lines[line.key()] = line

    if plan_ids:
        marks = ",".join("?" * len(plan_ids))
        plan_rows = store.rows(f"SELECT * FROM plan_lines WHERE short > 0 AND plan_id IN ({marks})"
                               " ORDER BY plan_id, line_no", tuple(plan_ids))
    else:
        plan_rows = store.rows("SELECT l.* FROM plan_lines l JOIN plans p ON p.id = l.plan_id"
                               " WHERE l.short > 0 AND p.status IN ('reserved', 'pulled')"
                               " ORDER BY l.plan_id, l.line_no")
    for row in plan_rows:
        add(*_plan_order_line(row))
    if below_minimum:
        for row in store.rows(
                "SELECT b.bin_key, b.on_hand, b.minimum, p.* FROM bins b JOIN parts p ON p.bin_id = b.id"
                " WHERE b.minimum IS NOT NULL AND COALESCE(b.on_hand, 0) < b.minimum ORDER BY b.bin_key"):
            add(*_bin_order_line(row))
    return list(lines.values())


PURCHASING_COLUMNS = (
    Column("Value", 12), Column("Capacitance (pF)", 16, "0.###"), Column("Tolerance", 11),
    Column("Voltage (V)", 11, "0.#"), Column("AC/DC", 7), Column("Dielectric / family", 18),
    Column("Safety class", 12), Column("Polarity", 12), Column("Package", 16), Column("Mounting", 13),
    Column("Quantity", 10, "#,##0"), Column("Preferred value", 15), Column("Needed by", 40),
    Column("Requirement", 50),
)
QUANTITY_COLUMN = 10


def preferred_text(capacitance_pf: Decimal | None, tol_pct: Decimal | None) -> str:
    """The nearest preferred value to buy, or which series the value is already in.

    >>> preferred_text(Decimal(250), Decimal(5)), preferred_text(Decimal(22), None)
    ('240 pF', 'in E12')
    """
    if not capacitance_pf or capacitance_pf <= 0:
        return ""
    preferred = preferred_for(capacitance_pf, tol_pct)
    if preferred is not None:
        return _fmt_cap(float(preferred))
    return "in E24" if tol_pct is not None and tol_pct < 10 else "in E12"


def plain_number(value: Decimal | float | None) -> int | float | None:
    """A number as a sheet should hold it: whole numbers as integers (470000000, not 470000000.0).

    >>> plain_number(Decimal("470000000")), plain_number(2.5), plain_number(None)
    (470000000, 2.5, None)
    """
    if value is None:
        return None
    if isinstance(value, Decimal):
        return int(value) if value == value.to_integral_value() else float(value)
    return int(value) if float(value).is_integer() else value


def _purchasing_row(line: OrderLine) -> list[Any]:
    from stock.decoded import Tolerance
    from stock.units import format_tolerance

    tol = (format_tolerance(Tolerance(line.tol_pct, line.tol_pct, "%"))
           if line.tol_pct is not None else "")
    return [
        _fmt_cap(float(line.capacitance_pf)) if line.capacitance_pf else "",
        plain_number(line.capacitance_pf) if line.capacitance_pf else None,
        tol, plain_number(line.voltage_v) if line.voltage_v else None, line.voltage_kind,
        line.dielectric, line.safety_class, line.polarity, line.package, line.mounting,
        line.quantity, preferred_text(line.capacitance_pf, line.tol_pct),
        "; ".join(line.needed_by), line.requirement,
    ]


def export_purchasing(store: Store, out: Path, plan_ids: Sequence[int] = (),
                      below_minimum: bool = False, spare_pct: Decimal = Decimal(10)) -> int:
    """Write the purchasing list; returns the number of rows to order."""
    kind = output_kind(out)
    rows = [_purchasing_row(line) for line in purchasing_lines(store, plan_ids, below_minimum, spare_pct)]
    if kind == "csv":
        return write_csv(out, PURCHASING_COLUMNS, rows)
    wb = new_workbook()
    add_table_sheet(wb, "To order", PURCHASING_COLUMNS, rows,
                    totals={0: "Total", QUANTITY_COLUMN: "sum"})
    save_workbook(wb, out)
    return len(rows)


def inventory_rows(store: Store) -> list[list[Any]]:
    """Every bin with its decoded facts, quantities, grades per application and open flags."""
    grades: dict[int, dict[str, str]] = {}
    for g in store.rows("SELECT bin_id, application, grade FROM grades"):
        grades.setdefault(g["bin_id"], {})[g["application"]] = g["grade"]
    flags: dict[int, list[str]] = {}
    for f in store.rows("SELECT bin_id, kind FROM flags WHERE status = 'open' AND bin_id IS NOT NULL"
                        " ORDER BY id"):
        flags.setdefault(f["bin_id"], []).append(f["kind"])
    available = {r["bin_id"]: r["available"] for r in store.rows(
        "SELECT bin_id, available FROM bin_stock WHERE on_hand IS NOT NULL")}
    out = []
    for row in store.rows("SELECT b.id AS bid, b.bin_key, b.location, b.cabinet, b.label, b.on_hand,"
                          " b.minimum, b.notes AS bin_notes, b.date_code, p.*"
                          " FROM bins b JOIN parts p ON p.bin_id = b.id ORDER BY b.bin_key"):
        m = part_marking(row)
        d = m.dielectric
        on_hand = row["on_hand"]
        out.append([
            row["bin_key"], row["location"], row["cabinet"], row["label"], row["marking"],
            _fmt_cap(float(m.capacitance_pf)) if m.capacitance_pf else "",
            plain_number(m.capacitance_pf) if m.capacitance_pf else None, _fmt_tol(m),
            plain_number(m.voltage_v) if m.voltage_v else None, m.voltage_kind or "",
            d.code if d else "", d.family if d else "", d.klass if d else None,
            plain_number(d.tempco_ppm_per_k) if d and d.tempco_ppm_per_k is not None else None,
            m.safety_class or "", m.polarity or "", plain_number(m.rated_temp_c),
            row["package"] or "", row["mounting"] or "",
            on_hand, available.get(row["bid"]), row["minimum"],
            *[grades.get(row["bid"], {}).get(app, "") for app in APPLICATION_COLUMNS],
            row["date_code"] or "", row["bin_notes"] or "", ", ".join(flags.get(row["bid"], [])),
        ])
    return out


INVENTORY_COLUMNS = (
    Column("Bin", 16), Column("Location", 10), Column("Cabinet", 12), Column("Label", 12),
    Column("Marking", 22), Column("Value", 10), Column("Capacitance (pF)", 16, "0.###"),
    Column("Tolerance", 11), Column("Voltage (V)", 11, "0.#"), Column("AC/DC", 7),
    Column("Dielectric", 14), Column("Family", 20), Column("Class", 7, "0"),
    Column("Tempco (ppm/K)", 14, "0"), Column("Safety class", 12), Column("Polarity", 16),
    Column("Rated temp (°C)", 14, "0"), Column("Package", 16), Column("Mounting", 12),
    Column("On hand", 9, "#,##0"), Column("Available", 10, "#,##0"), Column("Minimum", 9, "#,##0"),
    *[Column(app.capitalize(), 9) for app in APPLICATION_COLUMNS], Column("Date code", 10),
    Column("Notes", 30), Column("Open flags", 30),
)


def _dielectrics_on_hand(store: Store) -> list[Dielectric]:
    seen: dict[str, Dielectric] = {}
    for row in store.rows("SELECT decoded_json, settled_json FROM parts WHERE dielectric_code IS NOT NULL"):
        d = part_marking(row).dielectric
        if d and d.code not in seen and (d.tempco_ppm_per_k is not None or d.change_minus_pct is not None):
            seen[d.code] = d
    return sorted(seen.values(), key=lambda d: (d.klass or 9, d.code))


def export_inventory(store: Store, out: Path) -> int:
    """Write the inventory (XLSX with a drift chart sheet, or CSV); returns the number of bins."""
    from stock.inventory.stored_grades import refresh_stored_grades

    kind = output_kind(out)
    refresh_stored_grades(store)    # nothing to do unless the grading table changed since
    rows = inventory_rows(store)
    if kind == "csv":
        return write_csv(out, INVENTORY_COLUMNS, rows)
    wb = new_workbook()
    add_table_sheet(wb, "Bins", INVENTORY_COLUMNS, rows)
    add_drift_charts(wb, _dielectrics_on_hand(store), sheet_cell)
    save_workbook(wb, out)
    return len(rows)


__all__ = ["OrderLine", "export_inventory", "export_purchasing", "inventory_rows", "plain_number",
           "preferred_for", "preferred_text", "purchasing_lines"]
