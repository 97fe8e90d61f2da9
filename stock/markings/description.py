"""How a marking is told to people: the one-line summary, the short form, the dielectric in words.

One home for describing a decoded part, so every command says it the same way.

>>> summary(decode("104K 2A X7R"))
'100 nF ±10 %  100 V DC  X7R (−55…+125 °C, ±15 %)'
"""

from __future__ import annotations

from decimal import Decimal

from stock.decoded import Dielectric, Marking, Tolerance
from stock.markings.decoder import decode  # noqa: F401  (the examples decode)
from stock.markings.packages import read_package
from stock.units import (format_capacitance, format_number, format_temperature, format_temperature_range,
                         format_tolerance, format_voltage)


def describe_dielectric(d: Dielectric) -> str:
    """A dielectric in a few words: ``X7R (−55…+125 °C, ±15 %)``, ``C0G (0 ±30 ppm/K)``.

    >>> describe_dielectric(decode("N750").dielectric)
    'N750 (−750 ppm/K)'
    """
    parts = []
    if d.tempco_ppm_per_k is not None:
        tempco = format_number(d.tempco_ppm_per_k)
        if d.tempco_ppm_per_k > 0:
            tempco = "+" + tempco
        if d.tempco_tol_ppm_per_k is not None:
            tempco += f" ±{format_number(d.tempco_tol_ppm_per_k)}"
        parts.append(tempco + " ppm/K")
    if d.klass != 1 and d.temp_min_c is not None and d.temp_max_c is not None:
        parts.append(format_temperature_range(d.temp_min_c, d.temp_max_c))
    if d.change_minus_pct is not None and d.change_plus_pct is not None:
        parts.append(format_tolerance(Tolerance(d.change_minus_pct, d.change_plus_pct, "%")))
    if d.klass is None and d.family != d.code:
        parts.insert(0, d.family)
    return f"{d.code} ({', '.join(parts)})" if parts else d.code


def summary(m: Marking) -> str:
    """One line in engineering units: ``100 nF ±10 %  100 V DC  X7R (−55…+125 °C, ±15 %)``.

    >>> summary(decode("2200uF 25V 105C"))
    '2200 µF  25 V DC  105 °C rated'
    >>> summary(decode("47uF 63V elko"))
    '47 µF  63 V DC  aluminium-electrolytic (−40…+105 °C, +10/−20 %)  negative-marked'
    """
    parts = []
    if m.capacitance_pf is not None:
        value = format_capacitance(m.capacitance_pf)
        if m.tolerance is not None:
            value += " " + format_tolerance(m.tolerance)
        parts.append(value)
    elif m.tolerance is not None:
        parts.append(format_tolerance(m.tolerance))
    if m.voltage_v is not None:
        parts.append(format_voltage(m.voltage_v, m.voltage_kind))
    if m.dielectric is not None:
        parts.append(describe_dielectric(m.dielectric))
    if m.safety_class:
        parts.append(f"safety class {m.safety_class}")
    if m.rated_temp_c is not None:
        parts.append(f"{format_temperature(m.rated_temp_c, signed=False)} rated")
    if m.polarity:
        parts.append(m.polarity)
    if m.package:
        parts.append(read_package(m.package).describe())
    return "  ".join(parts) if parts else "(nothing decoded)"


def brief(m: Marking, separator: str = " ", missing_value: str = "no value") -> str:
    """The facts that tell parts apart, short: value, tolerance, voltage, dielectric code, class.

    The one short form (the full one is :func:`summary`): settling lists readings with it, the
    grade table and the duplicate finder name parts with it.

    >>> brief(decode("104K 2A X7R"))
    '100 nF ±10 % 100 V DC X7R'
    >>> brief(decode("X2 0.1uF 275VAC"), ", ")
    '100 nF, 275 V AC, X2'
    """
    return brief_facts(m.capacitance_pf, m.tolerance, m.voltage_v, m.voltage_kind,
                       m.dielectric.code if m.dielectric else None, m.safety_class, separator, missing_value)


def brief_facts(capacitance_pf: Decimal | None, tolerance: Tolerance | None, voltage_v: Decimal | None,
                voltage_kind: str | None, dielectric_code: str | None, safety_class: str | None = None,
                separator: str = " ", missing_value: str = "no value") -> str:
    """:func:`brief` from the facts themselves (a reading that is not a whole marking).

    >>> brief_facts(None, None, Decimal(50), "DC", "C0G")
    'no value 50 V DC C0G'
    """
    words = [format_capacitance(capacitance_pf) if capacitance_pf is not None else missing_value]
    if tolerance is not None:
        words.append(format_tolerance(tolerance))
    if voltage_v is not None:
        words.append(format_voltage(voltage_v, voltage_kind))
    if dielectric_code:
        words.append(dielectric_code)
    if safety_class:
        words.append(safety_class)
    return separator.join(w for w in words if w)


__all__ = ["brief", "brief_facts", "describe_dielectric", "summary"]
