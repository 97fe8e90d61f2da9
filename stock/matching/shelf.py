"""Reading the shelf: a stored part with its stock, as search and the pair search read it."""

from __future__ import annotations

from decimal import Decimal
from typing import Any

from stock.inventory.bins import part_marking
from stock.matching.part_checks import Stocked

HUNDRED = Decimal(100)
GRADE_RANK = {"fit": 0, "marginal": 1, None: 2}   # fit parts first, then marginal, then ungraded

# A stored part with its bin and what plans not yet pulled hold of it (the bin_stock view).
SHELF_SELECT = (
    "SELECT b.id AS bin_id, b.bin_key, b.location, b.on_hand, p.decoded_json, p.settled_json,"
    " p.capacitance_pf, p.tol_minus, p.tol_plus, p.tol_unit, p.tempco_ppm_per_k,"
    " p.tempco_tol_ppm_per_k, p.voltage_v,"
    " s.held AS reserved"
    " FROM parts p JOIN bins b ON b.id = p.bin_id JOIN bin_stock s ON s.bin_id = b.id")


def stocked(row: dict[str, Any]) -> Stocked:
    """A row of :data:`SHELF_SELECT` as a :class:`~stock.matching.part_checks.Stocked`."""
    return Stocked(row["bin_id"], row["bin_key"], row["location"], row["on_hand"], int(row["reserved"]),
                   part_marking(row))


def value_error(c: Decimal, target: Decimal) -> Decimal:
    """How far a value is from the target, in % of the target."""
    return abs(c - target) * HUNDRED / target


__all__ = ["GRADE_RANK", "SHELF_SELECT", "stocked", "value_error"]
