"""The facts the decoder's tokens have said, and how each is settled into one reading.

The decoder (:mod:`stock.markings.decoder`) classifies each token of a marking into
:class:`Facts`; the ``settle_*`` functions here choose among the readings a marking offers (the
value, the tolerance, the voltage, the dielectric, the rated temperature, the package) and keep
the others as alternatives with the doubts they leave.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from decimal import Decimal

from stock.decoded import Alternative, Dielectric, Flag, Tolerance
from stock.markings.packages import read_package
from stock.markings.tolerance_codes import read_tolerance_letter
from stock.units import (format_capacitance, format_tolerance, format_voltage)
from stock.markings.value_codes import ValueReading, read_value
from stock.markings.voltage_codes import DISPUTED_VOLTAGE_CODES

# Longest text decoded. Real markings are under 40 characters; a cell holding more is a note or
# a paste accident, and refusing it keeps decoding fast on hostile sheets.
@dataclass
class Facts:
    """What the tokens have said so far (mutable while decoding; frozen into a Marking at the end)."""

    values: list[tuple[str, ValueReading]] = field(default_factory=list)
    tolerance: Tolerance | None = None
    tolerance_flags: tuple[Flag, ...] = ()
    tolerance_alternatives: tuple[Alternative, ...] = ()
    letters: list[str] = field(default_factory=list)
    voltages: list[tuple[str, Decimal, str | None]] = field(default_factory=list)
    voltage_codes: list[tuple[str, Decimal]] = field(default_factory=list)
    dielectrics: list[tuple[str, Dielectric, tuple[Alternative, ...], tuple[Flag, ...]]] = \
        field(default_factory=list)
    safety: list[str] = field(default_factory=list)
    polarity: str | None = None
    temperatures: list[tuple[str, Decimal, bool]] = field(default_factory=list)
    unparsed: list[str] = field(default_factory=list)
    package_words: list[str] = field(default_factory=list)
    alternatives: list[Alternative] = field(default_factory=list)
    flags: list[Flag] = field(default_factory=list)


def value_without_neighbour(facts: Facts, family: str | None) -> bool:
    """A lone ``1N`` or ``1P``: a voltage code stands beside a value, so with no value beside it
    the token is read as the value its unit letter says, and the voltage code kept as a doubt."""
    for token, volts in facts.voltage_codes:
        value = read_value(token, family=family)
        if value is None or value.chosen.form != "with-unit":
            continue
        facts.values.append((token, value))
        facts.voltage_codes = [(t, v) for t, v in facts.voltage_codes if t != token]
        facts.alternatives.append(Alternative(reason=f"{token}: voltage code {format_voltage(volts, 'DC')}",
                                              voltage_v=volts))
        facts.flags.append(Flag("ambiguous-code", f"{token}: read as {format_capacitance(value.chosen.capacitance_pf)},"
                                                  f" since no value stands beside it; as a voltage code it"
                                                  f" is {format_voltage(volts, 'DC')}"))
        return True
    return False


FORM_RANK = {"with-unit": 0, "letter-and-digit": 1, "r-decimal": 1, "three-digit": 2, "literal-pF": 2,
              "unit-less": 3}


def settle_value(facts: Facts, family: str | None) -> tuple[Decimal | None, str | None]:
    """Choose the value among the value tokens (and ambiguous voltage-code tokens); return it and its letter."""
    voltage_known = bool(facts.voltages)
    if not facts.values and facts.voltage_codes and voltage_known:
        # A voltage is printed in full, so a two-character "voltage code" is more likely a value.
        for token, volts in facts.voltage_codes:
            value = read_value(token, family=family)
            if value is not None:
                facts.values.append((token, value))
                facts.alternatives.append(Alternative(reason=f"{token}: voltage code {format_voltage(volts, 'DC')}",
                                                      voltage_v=volts))
                if value.chosen.form == "with-unit":
                    continue    # "1F 5.5V": a value with its unit beside a printed voltage is no code
                facts.flags.append(Flag("ambiguous-code", f"{token}: read as a value, since the voltage is "
                                                          f"printed in full; as a voltage code it is "
                                                          f"{format_voltage(volts, None)}"))
        facts.voltage_codes = [(t, v) for t, v in facts.voltage_codes
                               if not any(t == vt for vt, _ in facts.values)]
    elif not facts.values and facts.voltage_codes and value_without_neighbour(facts, family):
        pass
    elif not facts.values and facts.voltage_codes:
        for token, volts in facts.voltage_codes:
            value = read_value(token, family=family)
            if value is not None and value.chosen.tolerance_letter:
                c = value.chosen
                facts.alternatives.append(Alternative(reason=f"{token}: {format_capacitance(c.capacitance_pf)} "
                                                      f"with tolerance letter {c.tolerance_letter}",
                                                      capacitance_pf=c.capacitance_pf))
                facts.flags.append(Flag("ambiguous-code", f"{token}: read as voltage code "
                                                          f"{format_voltage(volts, 'DC')}; it could also be "
                                                          f"{format_capacitance(c.capacitance_pf)} with "
                                                          f"tolerance letter {c.tolerance_letter}"))
    if not facts.values:
        return None, None
    ranked = sorted(facts.values, key=lambda tv: FORM_RANK.get(tv[1].chosen.form, 4))
    token, reading = ranked[0]
    chosen = reading.chosen
    facts.flags.extend(reading.flags)
    for other in reading.others:
        tolerance = None
        if other.tolerance_letter:
            tr = read_tolerance_letter(other.tolerance_letter, other.capacitance_pf)
            tolerance = tr.tolerance if tr else None
        facts.alternatives.append(Alternative(reason=other.reason, capacitance_pf=other.capacitance_pf,
                                              tolerance=tolerance))
    for other_token, other_reading in ranked[1:]:
        pf = other_reading.chosen.capacitance_pf
        if pf != chosen.capacitance_pf:
            facts.alternatives.append(Alternative(reason=f"{other_token}: another value on the same marking",
                                                  capacitance_pf=pf))
            facts.flags.append(Flag("conflicting-readings", f"{token} and {other_token} give different values "
                                                            f"({format_capacitance(chosen.capacitance_pf)} and "
                                                            f"{format_capacitance(pf)}); read as "
                                                            f"{format_capacitance(chosen.capacitance_pf)}"))
    return chosen.capacitance_pf, chosen.tolerance_letter


def settle_tolerance(facts: Facts, pf: Decimal | None, letter: str | None) -> Tolerance | None:
    letters = ([letter] if letter else []) + facts.letters
    if facts.tolerance is not None:
        for extra in letters:
            said = read_tolerance_letter(extra, pf)
            if said is not None and (said.tolerance.minus, said.tolerance.plus, said.tolerance.unit) == \
                    (facts.tolerance.minus, facts.tolerance.plus, facts.tolerance.unit):
                continue
            facts.flags.append(Flag("conflicting-readings", f"tolerance letter {extra} set aside for the "
                                                            f"written tolerance {format_tolerance(facts.tolerance)}"))
        return facts.tolerance
    if not letters:
        return None
    reading = read_tolerance_letter(letters[0], pf)
    if reading is None:
        facts.unparsed.append(letters[0])
        return None
    facts.alternatives.extend(reading.alternatives)
    facts.flags.extend(reading.flags)
    for extra in letters[1:]:
        facts.unparsed.append(extra)
    return reading.tolerance


def settle_voltage(facts: Facts, safety: str | None) -> tuple[Decimal | None, str | None]:
    if facts.voltages:
        token, volts, kind = facts.voltages[0]
        for other, v, _ in facts.voltages[1:]:
            facts.alternatives.append(Alternative(reason=f"{other}: a second voltage on the marking", voltage_v=v))
        for other, v in facts.voltage_codes:
            if v != volts:
                facts.unparsed.append(other)
        if kind is None:
            if safety:
                kind = "AC"
                facts.flags.append(Flag("voltage-kind-assumed", f"{token}: read as AC, the rating of a "
                                                                f"{safety} safety capacitor"))
            else:
                kind = "DC"   # IEC 60384: a rated voltage is DC unless marked AC
        return volts, kind
    if facts.voltage_codes:
        token, volts = facts.voltage_codes[0]
        facts.unparsed.extend(t for t, _ in facts.voltage_codes[1:])
        if token.upper() in DISPUTED_VOLTAGE_CODES:
            facts.flags.append(Flag("disputed-code", f"{token}: {DISPUTED_VOLTAGE_CODES[token.upper()][1]}; "
                                                     f"read as {format_voltage(volts, 'DC')}"))
        return volts, "DC"
    return None, None


def _disagree(a: Dielectric, b: Dielectric) -> bool:
    """Whether two dielectric readings of one marking contradict each other (a family word agrees
    with any code of its family; two codes must agree on class and tempco)."""
    if a.family != b.family:
        return True
    if a.klass is None or b.klass is None:
        return False
    return a.klass != b.klass or a.tempco_ppm_per_k != b.tempco_ppm_per_k or (
        a.klass == 2 and (a.change_minus_pct, a.change_plus_pct) != (b.change_minus_pct, b.change_plus_pct))


def settle_dielectric(facts: Facts) -> Dielectric | None:
    if not facts.dielectrics:
        return None
    # A code (ceramic class, old name) says more than a family word; "ceramic" alone says least.
    ranked = sorted(facts.dielectrics, key=lambda d: (d[1].klass is None, d[1].code == "ceramic"))
    token, chosen, alternatives, flags = ranked[0]
    facts.alternatives.extend(alternatives)
    facts.flags.extend(flags)
    for other_token, other, _, _ in ranked[1:]:
        if _disagree(chosen, other):
            facts.alternatives.append(Alternative(reason=f"{other_token}: another dielectric on the marking",
                                                  dielectric=other))
            facts.flags.append(Flag("conflicting-readings", f"{token} and {other_token} name different "
                                                            f"dielectrics; read as {chosen.code}"))
    return chosen


def settle_temperature(facts: Facts) -> Decimal | None:
    if not facts.temperatures:
        return None
    token, celsius, certain = facts.temperatures[0]
    if not certain and not facts.values:
        value = read_value(token)
        if value is not None:
            facts.alternatives.append(Alternative(reason=f"{token}: three-digit code with tolerance letter",
                                                  capacitance_pf=value.chosen.capacitance_pf))
            facts.flags.append(Flag("ambiguous-code", f"{token}: read as rated temperature {celsius} °C; "
                                                      "it could also be a value code with a tolerance letter"))
    facts.unparsed.extend(t for t, _, _ in facts.temperatures[1:])
    return celsius


def settle_package(facts: Facts) -> tuple[str | None, str | None]:
    """Chip sizes and the words no code table took, read by the package decoder.

    Words it uses (``RADIAL``, ``SMD``, ``5x11``, ``through hole``) leave ``unparsed``; the
    package is kept as those words, as written, and the mounting as ``SMD`` or ``THT``.
    """
    if not facts.unparsed:
        return None, None
    facts_read = read_package(" ".join(facts.unparsed))
    if not facts_read.known:
        if facts.package_words:   # a chip size the package decoder set aside (e.g. two sizes)
            facts.flags.append(Flag("unparsed", f"{' '.join(facts.package_words)}: an EIA chip size,"
                                                " not a value"))
        return None, None
    left = list(facts_read.unparsed)
    used, unparsed = [], []
    for word in facts.unparsed:
        if word not in facts.package_words and word.strip(".-") in left:
            left.remove(word.strip(".-"))
            unparsed.append(word)
        else:
            used.append(word)
    facts.unparsed = unparsed
    facts.alternatives.extend(Alternative(reason=f"package: {n}") for n in facts_read.notes
                              if "not used" in n)
    return " ".join(used), facts_read.mounting


__all__ = ["FORM_RANK", "Facts", "settle_dielectric", "settle_package", "settle_temperature",
           "settle_tolerance", "settle_value", "settle_voltage", "value_without_neighbour"]
