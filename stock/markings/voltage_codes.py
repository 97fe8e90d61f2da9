"""Rated voltage: the two-character EIA/JIS code and explicit voltages (``50V``, ``1kV``, ``275VAC``).

The two-character code used on film capacitors, MLCC reels and SMD electrolytics is a decade digit
and a mantissa letter: volts = mantissa × 10^digit. ``2A`` = 1.0 × 10² = 100 V, ``1H`` = 5.0 × 10 =
50 V, ``0J`` = 6.3 V, ``3A`` = 1 kV. The mantissa letters are the same on every published table
found (docs/sources.md: voltage-code tables ([code-table-blog], [decoder-guide], [coding-blog-voltage])); the
rule itself is from memory and agrees with every row.

Explicit voltages keep their kind: ``275VAC`` and ``250V~`` are AC; ``VDC``, ``WV`` and ``WVDC``
(working volts) are DC; a bare ``V`` is left for the caller to decide. ``6V3`` puts the V where the
decimal point is.

>>> voltage_code_value("2A"), voltage_code_value("0J"), voltage_code_value("3A")
(Decimal('100'), Decimal('6.3'), Decimal('1000'))
>>> read_voltage("275VAC")
(Decimal('275'), 'AC')
"""

from __future__ import annotations

import re
from functools import lru_cache
from decimal import Decimal

# Mantissa letter -> volts at decade 0. From memory of the EIA/JIS rule; each row is checked
# against a published table in tests/markings/test_voltage_codes.py.
VOLTAGE_MANTISSA: dict[str, Decimal] = {
    "A": Decimal("1.0"),
    "Q": Decimal("1.1"),
    "B": Decimal("1.25"),
    "T": Decimal("1.5"),
    "C": Decimal("1.6"),
    "Z": Decimal("1.8"),
    "D": Decimal("2.0"),
    "P": Decimal("2.2"),
    "E": Decimal("2.5"),
    "F": Decimal("3.15"),
    "V": Decimal("3.5"),
    "G": Decimal("4.0"),
    "W": Decimal("4.5"),
    "H": Decimal("5.0"),
    "L": Decimal("5.5"),
    "J": Decimal("6.3"),
    "N": Decimal("7.5"),
    "K": Decimal("8.0"),
}
# Published rows that break the letter rule: code -> (volts as published, why). [decoder-guide] prints 3L as
# 1.2 kV although L is 5.5 at every other decade; 1.2 kV is a common rating, 5.5 kV is not.
DISPUTED_VOLTAGE_CODES: dict[str, tuple[Decimal, str]] = {
    "3L": (Decimal(1200), "one published table gives 3L as 1.2 kV; the letter rule gives 5.5 kV"),
}
VOLTAGE_DECADES = range(0, 4)   # digit 0 … 3: volts × 1 … × 1000 (0E 2.5 V … 3H 5 kV)

_CODE = re.compile(r"([0-3])([A-Z])")
_EXPLICIT = re.compile(
    r"(?P<number>\d+(?:\.\d*)?|\.\d+)(?P<kilo>K)?(?:W\.?)?V(?P<frac>\d+)?"
    r"(?P<kind>DC|AC|~|RMS|=)?(?:W|WV)?",
    re.IGNORECASE,
)


def voltage_code_value(code: str) -> Decimal | None:
    """The volts of a two-character code, or None when ``code`` is not one.

    >>> voltage_code_value("1V"), voltage_code_value("2W"), voltage_code_value("2X") is None
    (Decimal('35'), Decimal('450'), True)
    """
    code = code.upper()
    if code in DISPUTED_VOLTAGE_CODES:
        return DISPUTED_VOLTAGE_CODES[code][0]
    match = _CODE.fullmatch(code)
    if not match or match[2] not in VOLTAGE_MANTISSA:
        return None
    volts = VOLTAGE_MANTISSA[match[2]].scaleb(int(match[1]))
    return volts.quantize(Decimal(1)) if volts == volts.to_integral_value() else volts.normalize()


def encode_voltage(volts: Decimal) -> str | None:
    """The two-character code of a voltage, or None when the table has none for it.

    >>> encode_voltage(Decimal(630)), encode_voltage(Decimal("6.3")), encode_voltage(Decimal(300)) is None
    ('2J', '0J', True)
    """
    for code, (published, _) in DISPUTED_VOLTAGE_CODES.items():
        if published == volts:
            return code
    for decade in VOLTAGE_DECADES:
        for letter, mantissa in VOLTAGE_MANTISSA.items():
            if mantissa.scaleb(decade) == volts and f"{decade}{letter}" not in DISPUTED_VOLTAGE_CODES:
                return f"{decade}{letter}"
    return None


@lru_cache(maxsize=4096)
def read_voltage(token: str) -> tuple[Decimal, str | None] | None:
    """An explicit voltage token as (volts, "AC" | "DC" | None), or None when it is not one.

    >>> read_voltage("1KV"), read_voltage("6V3"), read_voltage("250VDC"), read_voltage("63WV")
    ((Decimal('1000'), None), (Decimal('6.3'), None), (Decimal('250'), 'DC'), (Decimal('63'), 'DC'))
    >>> read_voltage("250V~")
    (Decimal('250'), 'AC')
    """
    match = _EXPLICIT.fullmatch(token)
    if not match:
        return None
    number = match["number"]
    if match["frac"]:
        if "." in number or match["kilo"]:
            return None
        number = f"{number}.{match['frac']}"
    volts = Decimal(number if not number.startswith(".") else "0" + number)
    if match["kilo"]:
        volts = volts.scaleb(3)
    if volts == 0:
        return None
    volts = volts.quantize(Decimal(1)) if volts == volts.to_integral_value() else volts.normalize()
    kind_text = (match["kind"] or "").upper()
    kind: str | None
    if kind_text in ("AC", "~", "RMS"):
        kind = "AC"
    elif kind_text in ("DC", "=") or "W" in token.upper():
        kind = "DC"
    else:
        kind = None
    return volts, kind


__all__ = ["DISPUTED_VOLTAGE_CODES", "VOLTAGE_DECADES", "VOLTAGE_MANTISSA", "encode_voltage", "read_voltage", "voltage_code_value"]
