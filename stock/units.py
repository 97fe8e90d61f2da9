"""Engineering units: format exact values for people, and read the values people type.

Output follows the SI/IEC 80000 habit of a space between number and unit and a real minus sign:
``4.7 nF``, ``±10 %``, ``+80/−20 %``, ``100 V DC``, ``−55…+125 °C``. Capacitance picks pF below
1 nF, nF below 1 µF, µF below 1 F, then F.

Parsing accepts every syntax the marking decoder reads (``150p``, ``4n7``, ``0.1u``, ``104``,
``100nF``, ``.047MFD``), and raises :class:`~stock.errors.BadValue` naming what was typed.

>>> format_capacitance(Decimal(4700)), format_capacitance(Decimal(100)), format_capacitance(Decimal(2200000))
('4.7 nF', '100 pF', '2.2 µF')
>>> parse_capacitance("4n7")
Decimal('4700')
"""

from __future__ import annotations

import re
from decimal import Decimal, InvalidOperation

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


def _clean(text: str) -> str:
    return (text.strip().replace("\u00b5", "u").replace("\u03bc", "u").replace(MINUS, "-")
            .replace("\u2013", "-").replace(",", ".").replace(" ", ""))


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
    from stock.markings.value_codes import read_value   # value_codes formats with this module

    cleaned = _clean(str(text))
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


_PERCENT = re.compile(r"[±+]?(\d+(?:\.\d*)?|\.\d+)%?")


def parse_percent(text: str, what: str) -> Decimal:
    """A percentage typed by a user: ``5``, ``5%``, ``±5 %``, ``0.5``.

    Raises:
        BadValue: the text is not a non-negative percentage.

    >>> parse_percent("±5 %", "--tol"), parse_percent("0.5", "--tol")
    (Decimal('5'), Decimal('0.5'))
    """
    match = _PERCENT.fullmatch(_clean(str(text)))
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
    match = _TEMP_RANGE.fullmatch(_clean(str(text)).replace("\u2026", "…"))
    expected = "a range in °C such as 0..50 or -40..85"
    if not match:
        raise BadValue(what, str(text), expected)
    low, high = Decimal(match[1]), Decimal(match[2])
    if low > high:
        raise BadValue(what, str(text), expected + " (low end first)")
    return low, high


def parse_voltage(text: str, what: str = "--voltage") -> Decimal:
    """A voltage typed by a user: ``50``, ``50V``, ``1kV``, ``6V3``, ``250 VDC`` or a code such as ``2A``.

    Raises:
        BadValue: the text is not a voltage.

    >>> parse_voltage("1kV"), parse_voltage("6V3"), parse_voltage("2A"), parse_voltage("63")
    (Decimal('1000'), Decimal('6.3'), Decimal('100'), Decimal('63'))
    """
    from stock.markings.voltage_codes import read_voltage, voltage_code_value

    cleaned = _clean(str(text))
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


__all__ = ["MINUS", "format_capacitance", "format_number", "format_temperature",
           "format_temperature_range", "format_tolerance", "format_voltage", "parse_capacitance",
           "parse_percent", "parse_temperature_range", "parse_voltage"]
