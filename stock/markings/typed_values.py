"""Values people type on the command line or in a BOM cell: capacitances and voltages.

Accepts every syntax the marking decoder reads (``150p``, ``4n7``, ``0.1u``, ``104``, ``100nF``,
``.047MFD``; ``50V``, ``6V3``, ``2A``) and raises :class:`~stock.errors.BadValue` naming what was
typed and what would have been accepted.

>>> parse_capacitance("4n7")
Decimal('4700')
"""

from __future__ import annotations

import re
from decimal import Decimal, InvalidOperation

from stock.errors import BadValue
from stock.markings.value_codes import read_value
from stock.markings.voltage_codes import read_voltage, voltage_code_value
from stock.units import clean_typed, format_capacitance


def parse_capacitance(text: str, what: str = "--value") -> Decimal:
    """A capacitance typed by a user, in pF; any syntax the marking decoder reads.

    Args:
        text: ``150p``, ``4n7``, ``0.1u``, ``104``, ``100 nF``, ``2,2µF``, ``.047 MFD``.
        what: the option or column the text came from, for the error message.

    Raises:
        BadValue: the text is not a capacitance.

    >>> parse_capacitance("0.1u"), parse_capacitance("150p"), parse_capacitance("104")
    (Decimal('100000'), Decimal('150'), Decimal('100000'))
    >>> parse_capacitance("147p")  # typed by a user, a lower-case p is the unit, not the letter P
    Decimal('147')
    """
    cleaned = clean_typed(str(text))
    if re.fullmatch(r"\d+(?:\.\d+)?p", cleaned):
        return Decimal(cleaned[:-1])
    reading = read_value(cleaned) if str(text).strip() else None
    if reading is None or reading.chosen.tolerance_letter:
        raise BadValue(what, str(text), "a capacitance such as 150p, 4n7, 0.1u, 100nF or 104")
    if any(f.kind == "ambiguous-code" for f in reading.flags):
        # A typed value that reads two ways ("100": 10 pF or 100 pF) must not be guessed at.
        spelled = " or ".join(format_capacitance(c.capacitance_pf).replace(" ", "")
                              for c in reading.candidates)
        raise BadValue(what, str(text), f"one value with its unit; this reads as {spelled}")
    return reading.chosen.capacitance_pf


def parse_voltage(text: str, what: str = "--voltage") -> Decimal:
    """A voltage typed by a user: ``50``, ``50V``, ``1kV``, ``6V3``, ``250 VDC`` or a code such as ``2A``.

    Raises:
        BadValue: the text is not a voltage.

    >>> parse_voltage("1kV"), parse_voltage("6V3"), parse_voltage("2A"), parse_voltage("63")
    (Decimal('1000'), Decimal('6.3'), Decimal('100'), Decimal('63'))
    """
    cleaned = clean_typed(str(text))
    reading = read_voltage(cleaned)
    if reading is not None:
        return reading[0]
    coded = voltage_code_value(cleaned)
    if coded is not None:
        return coded
    try:
        value = Decimal(cleaned)
    except InvalidOperation:
        value = None
    if value is None or not value.is_finite() or value <= 0:
        raise BadValue(what, str(text), "a voltage such as 50, 50V, 1kV, 6V3 or a code such as 2A")
    return value


__all__ = ["parse_capacitance", "parse_voltage"]
