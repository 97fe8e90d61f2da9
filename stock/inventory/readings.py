"""The readings of a marking a person can choose from, and the reading in force for a part.

Readings are numbered: 0 is the decoder's own choice, 1…n its alternatives in order. A chosen
reading keeps the facts the alternative leaves out and drops the doubts a choice settles.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, replace
from decimal import Decimal
from typing import Any

from stock.decoded import Marking, Tolerance
from stock.errors import BadValue
from stock.inventory.bins import part_marking
from stock.markings.description import brief_facts
from stock.inventory.row_reading import PART_COLUMNS, part_columns as columns_in_order
from stock.store.flag_kinds import flag_kind


@dataclass(frozen=True)
class Reading:
    """One reading of a marking: number 0 is the decoder's choice, 1…n its alternatives."""

    number: int
    capacitance_pf: Decimal | None
    tolerance: Tolerance | None
    voltage_v: Decimal | None
    dielectric_code: str | None
    reason: str

    def describe(self) -> str:
        """The reading in engineering units, e.g. ``"47 pF ±10 %"``; "no value" when none."""
        return brief_facts(self.capacitance_pf, self.tolerance, self.voltage_v, "DC", self.dielectric_code)

    def to_json(self) -> dict[str, Any]:
        return {
            "number": self.number,
            "capacitance_pf": None if self.capacitance_pf is None else float(self.capacitance_pf),
            "tolerance": self.tolerance.to_json() if self.tolerance else None,
            "voltage_v": None if self.voltage_v is None else float(self.voltage_v),
            "dielectric": self.dielectric_code,
            "reason": self.reason,
            "text": self.describe(),
        }


def readings(marking: Marking) -> tuple[Reading, ...]:
    """The decoder's reading (number 0) and each alternative, filled in from the chosen reading
    where the alternative leaves a fact out."""
    found = [Reading(0, marking.capacitance_pf, marking.tolerance, marking.voltage_v,
                     marking.dielectric.code if marking.dielectric else None,
                     "the decoder's reading")]
    for n, alt in enumerate(marking.alternatives, start=1):
        picked = pick_reading(marking, n)
        found.append(Reading(n, picked.capacitance_pf, picked.tolerance, picked.voltage_v,
                             picked.dielectric.code if picked.dielectric else None, alt.reason))
    return tuple(found)


def pick_reading(marking: Marking, number: int) -> Marking:
    """The marking as it reads with alternative ``number`` chosen (0 keeps the decoder's choice).

    The alternative's facts replace the chosen ones; facts it leaves out stay as decoded. The
    result has no alternatives left and loses the flags a reading decision settles.

    Raises:
        BadValue: no such reading.
    """
    if not 0 <= number <= len(marking.alternatives):
        choices = "0" if not marking.alternatives else f"0 to {len(marking.alternatives)}"
        raise BadValue("--reading", str(number), f"a reading number {choices} as listed by `stock flags`")
    chosen = marking
    if number:
        alt = marking.alternatives[number - 1]
        chosen = replace(
            marking,
            capacitance_pf=alt.capacitance_pf if alt.capacitance_pf is not None else marking.capacitance_pf,
            tolerance=alt.tolerance or marking.tolerance,
            voltage_v=alt.voltage_v if alt.voltage_v is not None else marking.voltage_v,
            dielectric=alt.dielectric or marking.dielectric)
    return decided(chosen)


def decided(marking: Marking) -> Marking:
    keep = tuple(f for f in marking.flags if flag_kind(f.kind).settled_by != "reading")
    return replace(marking, alternatives=(), flags=keep)


def current_marking(part: Mapping[str, Any]) -> Marking:
    """The reading in force for a ``parts`` row: the settled one if a human chose, else the decoder's."""
    return part_marking(dict(part))


def part_columns(marking: Marking) -> dict[str, Any]:
    """The flat ``parts`` columns that follow a marking, by name: the same values import writes
    (:func:`stock.inventory.row_reading.part_columns`), so search sees a settled reading as it sees an
    imported one."""
    return dict(zip(PART_COLUMNS, columns_in_order(marking)))


def reading_summary(marking: Marking) -> dict[str, Any]:
    """A short JSON record of a reading, as the ledger keeps it."""
    data = marking.to_json()
    return {"text": data["text"], "capacitance_pf": data["capacitance_pf"],
            "tolerance": data["tolerance"], "voltage_v": data["voltage_v"],
            "dielectric": marking.dielectric.code if marking.dielectric else None,
            "safety_class": data["safety_class"]}


def describe_summary(summary: Mapping[str, Any]) -> str:
    """A :func:`reading_summary` in engineering units, e.g. ``"47 nF ±10 % 50 V DC X7R"``."""
    def dec(v: Any) -> Decimal | None:
        return None if v is None else Decimal(str(v))

    return Reading(0, dec(summary.get("capacitance_pf")), Tolerance.from_json(summary.get("tolerance")),
                   dec(summary.get("voltage_v")), summary.get("dielectric"), "").describe()


__all__ = ["Reading", "current_marking", "decided", "describe_summary", "part_columns", "pick_reading",
           "reading_summary", "readings"]
