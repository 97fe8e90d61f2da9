"""Engineering units: format exact values for people, and read the values people type.

Output follows the SI/IEC 80000 habit of a space between number and unit and a real minus sign:
``4.7 nF``, ``±10 %``, ``+80/−20 %``, ``100 V DC``, ``−55…+125 °C``. Capacitance picks pF below
1 nF, nF below 1 µF, µF below 1 F, then F.

Reading typed percentages, temperature ranges, frequencies, inductances, times and measured drifts
is here too; typed capacitances and voltages, which need the code tables, are read by
:mod:`stock.markings.typed_values`.

>>> format_capacitance(Decimal(4700)), format_capacitance(Decimal(100)), format_capacitance(Decimal(2200000))
('4.7 nF', '100 pF', '2.2 µF')
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


_SI = {"": 0, "k": 3, "K": 3, "M": 6, "m": -3, "u": -6, "µ": -6, "n": -9, "G": 9}
_QUANTITY = re.compile(r"\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*([kKMGmuµn]?)\s*(\w*)\s*")


def _quantity(text: str, units: tuple[str, ...], what: str, expected: str, *, signed: bool = False) -> Decimal:
    match = _QUANTITY.fullmatch(str(text).replace(MINUS, "-"))
    if not match or match[3].lower() not in units:
        raise BadValue(what, str(text), expected)
    try:
        value = Decimal(match[1]).scaleb(_SI[match[2]])
    except InvalidOperation:
        raise BadValue(what, str(text), expected) from None
    if not value.is_finite() or (not signed and value <= 0):
        raise BadValue(what, str(text), expected)
    return value


def parse_frequency(text: str, what: str = "--f0") -> Decimal:
    """A frequency typed by a user, in Hz: ``10MHz``, ``455k``, ``7.1 MHz``, ``1e6``.

    Raises:
        BadValue: the text is not a positive frequency.

    >>> parse_frequency("10MHz"), parse_frequency("455k")
    (Decimal('1.0E+7'), Decimal('4.55E+5'))
    """
    return _quantity(text, ("", "hz"), what, "a frequency above zero such as 10MHz, 455kHz or 1e6")


def parse_inductance(text: str, what: str = "--coil") -> Decimal:
    """An inductance typed by a user, in H: ``10uH``, ``2.2mH``, ``1e-6``.

    Raises:
        BadValue: the text is not a positive inductance.

    >>> parse_inductance("10uH")
    Decimal('0.000010')
    """
    return _quantity(text, ("", "h"), what, "an inductance above zero such as 10uH or 2.2mH")


def parse_period(text: str, what: str = "--period") -> Decimal:
    """A time typed by a user, in s: ``1.5s``, ``10ms``, ``2``.

    >>> parse_period("10ms")
    Decimal('0.010')
    """
    return _quantity(text, ("", "s"), what, "a time such as 1.5s or 10ms")


_KELVIN = re.compile(r"\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+))\s*(?:K|°C|C)?\s*", re.IGNORECASE)


def parse_kelvin(text: str, what: str = "--delta-t") -> Decimal:
    """A temperature change in K (``10``, ``-15``, ``10K``).

    >>> parse_kelvin("-15")
    Decimal('-15')
    """
    match = _KELVIN.fullmatch(str(text).replace(MINUS, "-"))
    if not match:
        raise BadValue(what, str(text), "a temperature change in K such as 10 or -15")
    return Decimal(match[1])


# A measured drift: a frequency shift (Hz with an SI prefix, or ppm of the frequency), per kelvin or
# over a stated temperature change. The prefix is case-sensitive (m milli, M mega); the unit is not.
_DRIFT = re.compile(r"([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)"
                    r"(?:([kMm]?)(hz)|(ppm))(/(?:k|°c|°k|c|degc|deg))?", re.IGNORECASE)
DRIFT_UNITS = ("Hz/K", "ppm/K", "Hz", "ppm")


def parse_drift(text: str, what: str = "--drift") -> tuple[Decimal, str]:
    """A measured drift typed by a user: ``-20Hz/K``, ``-3ppm/K``, ``-60Hz`` (over a stated change).

    Returns:
        (value, unit) with the unit one of :data:`DRIFT_UNITS`: a shift per kelvin (``Hz/K``,
        ``ppm/K``) or a whole shift (``Hz``, ``ppm``) that needs the temperature change beside it.

    Raises:
        BadValue: the text is not a number with one of those units (a bare number is refused:
            Hz and ppm differ by the frequency, a million-fold at 1 MHz).

    >>> parse_drift("-20Hz/K"), parse_drift("−3 ppm/°C"), parse_drift("0.06kHz")
    ((Decimal('-20'), 'Hz/K'), (Decimal('-3'), 'ppm/K'), (Decimal('60'), 'Hz'))
    """
    cleaned = str(text).strip().replace(MINUS, "-").replace("\u2013", "-").replace(" ", "")
    match = _DRIFT.fullmatch(cleaned)
    if not match:
        raise BadValue(what, str(text), "a drift with its unit, such as -20Hz/K, -3ppm/K, "
                                        "or -60Hz with --delta-t 3")
    value = Decimal(format(Decimal(match[1]).scaleb(_SI[match[2] or ""]), "f"))  # plain digits
    unit = ("Hz" if match[3] else "ppm") + ("/K" if match[5] else "")
    return value, unit


__all__ = ["DRIFT_UNITS", "MINUS", "clean_typed", "format_capacitance", "format_number", "format_temperature",
           "format_temperature_range", "format_tolerance", "format_voltage", "parse_drift", "parse_frequency",
           "parse_inductance", "parse_kelvin", "parse_percent", "parse_period", "parse_temperature_range"]
