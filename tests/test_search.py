"""Tests for stock.search: singles, pairs, tempco-compensating pairs, and explained empty answers.

Outside sources, named beside each block: the EIA-198 Class 1/2 code tables (C0G = 0 ±30 ppm/K,
U2J = −750 ±120, X7R ±15 % over −55…+125 °C), the textbook series/parallel capacitor formulas,
IEC 60384-14 for the safety subclasses, IEC 60063 for the value to buy.
"""

from __future__ import annotations

import json
from decimal import Decimal

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from stock.decoded import Dielectric, Marking, Tolerance
from stock.errors import BadValue
from stock.grading import Conditions, grade
from stock.search import (Combination, Requirement, build_requirement, candidates, find,
                          parse_tempco_window)
from stock.store import Store, open_store

D = Decimal

# Dielectrics built by hand from the EIA-198 tables (Class 1: nominal α ± tolerance in ppm/K;
# Class 2: change window over a temperature range); old names carry no tolerance on α, except NP0,
# which every source equates with C0G.
DIELECTRICS = {
    "C0G": Dielectric("C0G", "ceramic", 1, D(0), D(30), D(-55), D(125), source="EIA-198 Class 1"),
    "NP0": Dielectric("NP0", "ceramic", 1, D(0), D(30), D(-55), D(125), source="industry name"),
    "U2J": Dielectric("U2J", "ceramic", 1, D(-750), D(120), D(-55), D(125), source="EIA-198 Class 1"),
    "N750": Dielectric("N750", "ceramic", 1, D(-750), None, D(-55), D(125), source="industry name"),
    "S2H": Dielectric("S2H", "ceramic", 1, D(-330), D(60), D(-55), D(125), source="EIA-198 Class 1"),
    "X7R": Dielectric("X7R", "ceramic", 2, None, None, D(-55), D(125), D(15), D(15), source="EIA-198 Class 2"),
}


def part(text: str, pf: str, *, tol: str | None = None, volts: str | None = None, code: str | None = None,
         safety: str | None = None, kind: str = "DC") -> Marking:
    """A hand-built marking: value in pF, ± tolerance in %, rated volts, dielectric code."""
    return Marking(
        text=text, capacitance_pf=D(pf),
        tolerance=Tolerance(D(tol), D(tol), "%") if tol is not None else None,
        voltage_v=D(volts) if volts is not None else None, voltage_kind=kind if volts else None,
        dielectric=DIELECTRICS[code] if code else None, safety_class=safety)


def add_bin(store: Store, key: str, m: Marking, on_hand: int | None, location: str | None = None) -> int:
    """Insert one bin and its part directly (no importer), flat columns taken from the marking."""
    def f(v):
        return None if v is None else float(v)
    tol, diel = m.tolerance, m.dielectric
    with store.writing() as db:
        cur = db.conn.execute(
            "INSERT INTO bins (bin_key, location, on_hand, created_at, updated_at) VALUES (?,?,?,?,?)",
            (key, location or key, on_hand, "2026-12-01T00:00:00+00:00", "2026-12-01T00:00:00+00:00"))
        bin_id = cur.lastrowid
        db.conn.execute(
            "INSERT INTO parts (bin_id, marking, capacitance_pf, tol_minus, tol_plus, tol_unit, voltage_v,"
            " voltage_kind, dielectric_code, family, class, tempco_ppm_per_k, tempco_tol_ppm_per_k,"
            " temp_min_c, temp_max_c, safety_class, decoded_json) VALUES (?,?,?,?,?,?,?,?,?,?,?,?,?,?,?,?,?)",
            (bin_id, m.text, f(m.capacitance_pf), f(tol.minus) if tol else None, f(tol.plus) if tol else None,
             tol.unit if tol else None, f(m.voltage_v), m.voltage_kind,
             diel.code if diel else None, diel.family if diel else None, diel.klass if diel else None,
             f(diel.tempco_ppm_per_k) if diel else None, f(diel.tempco_tol_ppm_per_k) if diel else None,
             f(diel.temp_min_c) if diel else None, f(diel.temp_max_c) if diel else None,
             m.safety_class, json.dumps(m.to_json())))
    return bin_id


def reserve(store: Store, bin_id: int, qty: int, status: str = "reserved") -> None:
    """Hold ``qty`` parts of a bin for a plan (as the kit planner would)."""
    with store.writing() as db:
        plan = db.conn.execute("INSERT INTO plans (created_at, boards, status) VALUES (?, 1, ?)",
                               ("2026-12-01T00:00:00+00:00", status)).lastrowid
        line = db.conn.execute("INSERT INTO plan_lines (plan_id, line_no, need) VALUES (?, 1, ?)",
                               (plan, qty)).lastrowid
        db.conn.execute("INSERT INTO reservations (plan_id, line_id, bin_id, qty) VALUES (?,?,?,?)",
                        (plan, line, bin_id, qty))


def add_bins(store: Store, rows: list[tuple[str, Marking, int | None]]) -> list[int]:
    """Insert many bins at once (used by the benchmark and the property tests)."""
    with store.writing():
        return [add_bin(store, key, m, on_hand) for key, m, on_hand in rows]
