"""The cautions printed where a part can hurt someone: one text per hazard.

The mains caution is :data:`stock.markings.safety_classes.MAINS_CAUTION`; the shelf-life and
soldering hazards of a family are in :data:`stock.physics.stability.SHELF_LIFE`.
"""

from __future__ import annotations

from stock.decoded import Marking
from stock.markings.decoder import POLARISED_FAMILIES
from stock.markings.safety_classes import MAINS_CAUTION


# Common practice, no published source.
POLARISED_CAUTION = ("Polarised part: fit it the right way round and never above its rated voltage; "
                     "reversed or overvolted it can vent or burst.")
CHARGE_CAUTION = ("High-voltage part: it can hold a dangerous charge after power is removed; discharge "
                  "it through a suitable resistor and check with a meter before touching.")
POLARITY_MARKS_CAUTION = ("Tantalums mark the positive lead, aluminium electrolytics the negative: when "
                          "one replaces the other, fit it by the circuit's polarity, not by where the old "
                          "part's stripe was.")
POLARISED_FOR_PLAIN_CAUTION = ("A polarised part where the original was not: only where a steady DC voltage "
                               "keeps it the right way round (measure it first); its positive lead goes to "
                               "the more positive side.")
RETUNE_CAUTION = ("A new part in a tuned circuit may shift its frequency: check the alignment against the "
                  "service information and re-align where needed.")
DEFER_CAUTION = "Defer to the equipment's service information and to local codes."


def cautions(m: Marking) -> tuple[str, ...]:
    """The safety cautions a person handling this part should read (mains, polarity, stored charge).

    >>> from stock.markings.decoder import decode
    >>> cautions(decode("X2 0.1uF 275VAC"))[0].startswith("mains work can kill")
    True
    """
    out = []
    if m.safety_class:
        out.append(MAINS_CAUTION)
    family = m.dielectric.family if m.dielectric else None
    if family in POLARISED_FAMILIES or m.polarity:
        out.append(POLARISED_CAUTION)
    if m.voltage_v is not None and (m.voltage_v >= 250 or m.voltage_kind == "AC"):
        out.append(CHARGE_CAUTION)
    return tuple(out)


__all__ = ["CHARGE_CAUTION", "DEFER_CAUTION", "POLARISED_CAUTION", "POLARISED_FOR_PLAIN_CAUTION",
           "POLARITY_MARKS_CAUTION", "RETUNE_CAUTION", "cautions"]
