"""Engineering units: format exact values for people, and read the values people type.

Output follows the SI/IEC 80000 habit of a space between number and unit and a real minus sign:
``4.7 nF``, ``±10 %``, ``+80/−20 %``, ``100 V DC``, ``−55…+125 °C``. Capacitance picks pF below
1 nF, nF below 1 µF, µF below 1 F, then F.

Reading typed percentages and temperature ranges is here too; typed capacitances and voltages,
which need the code tables, are read by :mod:`stock.markings.typed_values`.

>>> format_capacitance(Decimal(4700)), format_capacitance(Decimal(100)), format_capacitance(Decimal(2200000))
('4.7 nF', '100 pF', '2.2 µF')
"""

from __future__ import annotations

import re
from decimal import Decimal

from stock.decoded import Tolerance
from stock.errors import BadValue

MINUS = "\u2212"   # the minus sign, not the hyphen

_CAP_STEPS: tuple[tuple[int, str], ...] = ((12, "F"), (6, "µF"), (3, "nF"), (0, "pF"))  # pF exponents


def format_number(value: Decimal) -> str:
    """A Decimal without exponent or trailing zeros, with a real minus sign.

    >>> format_number(Decimal("4.700")), format_number(Decimal("-750")), format_number(Decimal("1E+3"))
    ('4.7', '−750', '1000')
    """
    if value == 0:
        return "0"
    text = format(value.normalize(), "f")
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return text.replace("-", MINUS)


def format_capacitance(pf: Decimal) -> str:
    """A capacitance in pF as an engineering value.

    >>> format_capacitance(Decimal("0.47")), format_capacitance(Decimal(100000)), format_capacitance(Decimal("1E12"))
    ('0.47 pF', '100 nF', '1 F')
    """
    magnitude = abs(pf)
    for exponent, unit in _CAP_STEPS:
        if magnitude >= Decimal(10) ** exponent:
            return f"{format_number(pf.scaleb(-exponent))} {unit}"
    return f"{format_number(pf)} pF"


def format_tolerance(t: Tolerance) -> str:
    """A tolerance as ``±10 %``, ``+80/−20 %`` or ``±0.25 pF``.

    >>> format_tolerance(Tolerance(Decimal(20), Decimal(80), "%"))
    '+80/−20 %'
    >>> format_tolerance(Tolerance(Decimal("0.25"), Decimal("0.25"), "pF"))
    '±0.25 pF'
    """
    if t.minus == t.plus:
        return f"±{format_number(t.plus)} {t.unit}"
    return f"+{format_number(t.plus)}/{MINUS}{format_number(t.minus)} {t.unit}"


def format_voltage(v: Decimal, kind: str | None = "DC") -> str:
    """A voltage with its kind: ``100 V DC``, ``1 kV DC``, ``275 V AC``; no kind when it is unknown.

    >>> format_voltage(Decimal(100), "DC"), format_voltage(Decimal(1000), "DC"), format_voltage(Decimal("6.3"), None)
    ('100 V DC', '1 kV DC', '6.3 V')
    """
    text = f"{format_number(v / 1000)} kV" if abs(v) >= 1000 else f"{format_number(v)} V"
    return f"{text} {kind}" if kind else text


def format_temperature(c: Decimal, signed: bool = True) -> str:
    """A temperature as ``+125 °C`` / ``−55 °C`` (signed) or ``105 °C``.

    >>> format_temperature(Decimal(-55)), format_temperature(Decimal(105), signed=False)
    ('−55 °C', '105 °C')
    """
    sign = "+" if signed and c > 0 else ""
    return f"{sign}{format_number(c)} °C"


def format_temperature_range(low: Decimal, high: Decimal) -> str:
    """A range as ``−55…+125 °C``.

    >>> format_temperature_range(Decimal(-55), Decimal(125))
    '−55…+125 °C'
    """
    return f"{format_temperature(low)[:-3]}…{format_temperature(high)}"


def clean_typed(text: str) -> str:
    """Typed text with µ as u, the minus sign and en dash as -, a decimal comma as a point, no spaces."""
    return (text.strip().replace("\u00b5", "u").replace("\u03bc", "u").replace(MINUS, "-")
            .replace("\u2013", "-").replace(",", ".").replace(" ", ""))


_PERCENT = re.compile(r"[±+]?(\d+(?:\.\d*)?|\.\d+)%?")


def parse_percent(text: str, what: str) -> Decimal:
    """A percentage typed by a user: ``5``, ``5%``, ``±5 %``, ``0.5``.

    Raises:
        BadValue: the text is not a non-negative percentage.

    >>> parse_percent("±5 %", "--tol"), parse_percent("0.5", "--tol")
    (Decimal('5'), Decimal('0.5'))
    """
    match = _PERCENT.fullmatch(clean_typed(str(text)))
    if not match:
        raise BadValue(what, str(text), "a percentage such as 5, 5% or ±0.5 %")
    return Decimal(match[1] if not match[1].startswith(".") else "0" + match[1])


_TEMP = r"([+-]?\d+(?:\.\d+)?)"
_TEMP_RANGE = re.compile(_TEMP + r"(?:°?c)?(?:\.\.\.?|…|to|/|_)" + _TEMP + r"(?:°?c)?", re.IGNORECASE)


def parse_temperature_range(text: str, what: str = "--temp") -> tuple[Decimal, Decimal]:
    """A temperature range in °C: ``0..50``, ``-40..85``, ``−55…+125 °C``, ``-25 to 70``.

    Raises:
        BadValue: the text is not a range, or its low end is above its high end.

    >>> parse_temperature_range("0..50")
    (Decimal('0'), Decimal('50'))
    >>> parse_temperature_range("−55…+125 °C")
    (Decimal('-55'), Decimal('125'))
    """
    match = _TEMP_RANGE.fullmatch(clean_typed(str(text)).replace("\u2026", "…"))
    expected = "a range in °C such as 0..50 or -40..85"
    if not match:
        raise BadValue(what, str(text), expected)
    low, high = Decimal(match[1]), Decimal(match[2])
    if low > high:
        raise BadValue(what, str(text), expected + " (low end first)")
    return low, high


__all__ = ["MINUS", "format_capacitance", "format_number", "format_temperature",
           "format_temperature_range", "format_tolerance", "format_voltage", "clean_typed",
           "parse_percent", "parse_temperature_range"]
