"""The drift of a tank or timer from one part named as a bin in the store or as a marking.

The physics is :mod:`stock.physics.drift`; this module only finds the part to put into it.
"""

from __future__ import annotations

from decimal import Decimal
from pathlib import Path

from stock.decoded import Marking
from stock.errors import BadValue, NotFound
from stock.inventory.stored_grades import bin_marking
from stock.markings.decoder import decode
from stock.physics.drift import TankDrift, TimerDrift, tank_capacitance_pf, tank_drift, timer_drift
from stock.store.database import open_store


def resolve_part(db_path: str | Path | None, text: str) -> Marking:
    """A bin in the database (by id, key, location or label) or, failing that, a marking to decode.

    Raises:
        BadValue: neither a bin nor a marking the decoder understands.
    """
    if db_path is not None and Path(db_path).is_file():
        with open_store(db_path, create=False) as store:
            try:
                return bin_marking(store, text)[1]
            except NotFound:
                pass
    marking = decode(text)
    if marking.dielectric is None:
        raise BadValue("--part", text, "a bin, or a marking naming its dielectric (e.g. '101J C0G')")
    return marking


def circuit_drift(db_path: str | Path | None, part: str, delta_t_k: Decimal, *, f0_hz: Decimal | None = None,
                  tank_pf: Decimal | None = None, coil_h: Decimal | None = None, part_pf: Decimal | None = None,
                  timer: bool = False, period_s: Decimal | None = None) -> TankDrift | TimerDrift:
    """The drift of a tank (``f0_hz`` and ``tank_pf`` or ``coil_h``) or a timer (``timer``) from one part.

    The tank capacitance, when a coil is given instead, is the one that tunes it to ``f0_hz``.

    Raises:
        BadValue: the part cannot be resolved, or the tank is not described.
    """
    marking = resolve_part(db_path, part)
    if timer:
        return timer_drift(marking, delta_t_k, period_s)
    if f0_hz is None:
        raise BadValue("--f0", "", "the tank's frequency such as 10MHz (or --timer for an RC timer)")
    if tank_pf is None:
        if coil_h is None:
            raise BadValue("--tank", "", "the total tank capacitance (or --coil to work it out from f0)")
        tank_pf = tank_capacitance_pf(f0_hz, coil_h)
    return tank_drift(marking, f0_hz, tank_pf, delta_t_k, part_pf)


__all__ = ["circuit_drift", "resolve_part"]
