"""Ceramic dielectric codes: EIA-198 Class 1 and Class 2, the old N/P names, IEC 60384-9 Class 2.

**EIA-198 Class 1** (letter · digit · letter): α (ppm/K, defined over +25…+85 °C) is the
significant figure of the first letter times the multiplier of the digit; the last letter is the
tolerance on α. ``C0G`` = 0.0 × −1 ± 30 = 0 ± 30 ppm/K; ``U2J`` = 7.5 × −100 ± 120 = −750 ± 120;
``P3K`` = 1.5 × −1000 ± 250 = −1500 ± 250. The sources disagree on digits 4, 5 and 9; those codes
decode with both readings and a ``disputed-code`` flag.

**EIA-198 Class 2/3** (letter · digit · letter): low temperature, high temperature, maximum
capacitance change over that range. ``X7R`` = −55…+125 °C, ±15 %; ``Z5U`` = +10…+85 °C, +22/−56 %;
``Y5V`` = −30…+85 °C, +22/−82 %. The sources disagree on S (±22 % or ±20 %).

**Old industry names**: NP0 (its letter-O spelling NPO decodes with a flag), N030 … N4700, P100 —
nominal α only, since the same name was sold with more than one tolerance.

**IEC 60384-9 Class 2** ("2" + change letter + range digit, e.g. ``2R1``, ``2E6``): from memory;
the standard's tables were not available.

>>> decode_dielectric("C0G").tempco_ppm_per_k, decode_dielectric("C0G").tempco_tol_ppm_per_k
(Decimal('0'), Decimal('30'))
>>> d = decode_dielectric("X7R"); (d.temp_min_c, d.temp_max_c, d.change_minus_pct, d.change_plus_pct)
(Decimal('-55'), Decimal('125'), Decimal('15'), Decimal('15'))
>>> decode_dielectric("N750").tempco_ppm_per_k
Decimal('-750')
"""

from __future__ import annotations

import re
from functools import lru_cache
from dataclasses import dataclass, replace
from decimal import Decimal

from stock.decoded import Alternative, Dielectric, Flag

# EIA-198 Class 1, first letter: significant figure of α. Confirmed by several sources ([EIA-198] Class 1
# figure letters).
CLASS1_FIGURE: dict[str, Decimal] = {
    "C": Decimal("0.0"),
    "B": Decimal("0.3"),
    "L": Decimal("0.8"),
    "A": Decimal("0.9"),
    "M": Decimal("1.0"),
    "P": Decimal("1.5"),
    "R": Decimal("2.2"),
    "S": Decimal("3.3"),
    "T": Decimal("4.7"),
    "V": Decimal("5.6"),
    "U": Decimal("7.5"),
}

# EIA-198 Class 1, digit: multiplier of α. Every source agrees on 0–3 and 6–8.
CLASS1_MULTIPLIER: dict[str, int] = {
    "0": -1,
    "1": -10,
    "2": -100,
    "3": -1000,
    "6": 10,
    "7": 100,
    "8": 1000,
}
# Digits the sources disagree on: (variant A of Wikipedia-derived tables, variant B of EIA-198-1
# as printed in a design reference book). None = the variant has no such digit.
CLASS1_DISPUTED_MULTIPLIER: dict[str, tuple[int | None, int | None]] = {
    "4": (1, -10000),
    "5": (None, 1),
    "9": (None, 10000),
}

# EIA-198 Class 1, last letter: tolerance on α in ppm/K ([EIA-198] Class 1 tolerance letters).
CLASS1_TOLERANCE: dict[str, Decimal] = {
    "G": Decimal(30),
    "H": Decimal(60),
    "J": Decimal(120),
    "K": Decimal(250),
    "L": Decimal(500),
    "M": Decimal(1000),
    "N": Decimal(2500),
}

# EIA-198 Class 2/3, first letter: low end of the temperature range, °C ([EIA-198] Class 2).
CLASS2_LOW: dict[str, Decimal] = {
    "X": Decimal(-55),
    "Y": Decimal(-30),
    "Z": Decimal(10),
}
# EIA-198 Class 2/3, digit: high end of the temperature range, °C ([EIA-198] Class 2). 9 from one source only.
CLASS2_HIGH: dict[str, Decimal] = {
    "2": Decimal(45),
    "4": Decimal(65),
    "5": Decimal(85),
    "6": Decimal(105),
    "7": Decimal(125),
    "8": Decimal(150),
    "9": Decimal(200),
}
CLASS2_DISPUTED_HIGH: dict[str, Decimal] = {"3": Decimal(55)}   # from memory only, no source found

# EIA-198 Class 2/3, last letter: (minus %, plus %) magnitudes of the change over the range ([EIA-198] Class
# 2).
CLASS2_CHANGE: dict[str, tuple[Decimal, Decimal]] = {
    "A": (Decimal("1.0"), Decimal("1.0")),
    "B": (Decimal("1.5"), Decimal("1.5")),
    "C": (Decimal("2.2"), Decimal("2.2")),
    "D": (Decimal("3.3"), Decimal("3.3")),
    "E": (Decimal("4.7"), Decimal("4.7")),
    "F": (Decimal("7.5"), Decimal("7.5")),
    "P": (Decimal(10), Decimal(10)),
    "R": (Decimal(15), Decimal(15)),
    "L": (Decimal(40), Decimal(15)),   # ±15 % to +125 °C, +15/−40 % to +150 °C: the whole range kept
    "S": (Decimal(22), Decimal(22)),   # one source says ±20 %, see CLASS2_DISPUTED_CHANGE
    "T": (Decimal(33), Decimal(22)),
    "U": (Decimal(56), Decimal(22)),
    "V": (Decimal(82), Decimal(22)),
}
CLASS2_DISPUTED_CHANGE: dict[str, tuple[Decimal, Decimal]] = {"S": (Decimal(20), Decimal(20))}

# Old industry names -> nominal α ppm/K and the EIA code usually meant ([EIA-198] old names
# ([parameters-page], [latvian-codes])). Tolerance is left unknown except for NP0, which every
# source equates with C0G. N033 is S1G (3.3 × −10): the encyclopaedia-style "H2G" is no code, H
# being no EIA figure letter ([EIA-198] figure letters); derived from the table.
OLD_CLASS1_NAMES: dict[str, tuple[Decimal, str]] = {
    "P100": (Decimal(100), "M7G"),
    "NP0": (Decimal(0), "C0G"),
    "N030": (Decimal(-30), "B2G"),
    "N033": (Decimal(-33), "S1G"),
    "N075": (Decimal(-75), "U1G"),
    "N080": (Decimal(-80), "L2G"),
    "N150": (Decimal(-150), "P2G"),
    "N220": (Decimal(-220), "R2H"),
    "N330": (Decimal(-330), "S2H"),
    "N470": (Decimal(-470), "T2H"),
    "N750": (Decimal(-750), "U2J"),
    "N1000": (Decimal(-1000), "M3K"),
    "N1500": (Decimal(-1500), "P3K"),
    "N2200": (Decimal(-2200), "R3L"),
    "N3300": (Decimal(-3300), "S3L"),
    "N4700": (Decimal(-4700), "T3M"),
}
# Spellings seen on parts and in sheets -> the canonical name, with the reason for the correction.
SPELLINGS: dict[str, str] = {
    "NPO": "NP0",   # letter O for digit zero
    "COG": "C0G",
    "P0": "NP0",
    "N0": "NP0",
    "N30": "N030",
    "N33": "N033",
    "N75": "N075",
    "N80": "N080",
}

# IEC 60384-9 Class 2 (from memory): change letter -> (minus %, plus %) without DC bias.
IEC_CLASS2_CHANGE: dict[str, tuple[Decimal, Decimal]] = {
    "B": (Decimal(10), Decimal(10)),
    "C": (Decimal(20), Decimal(20)),
    "D": (Decimal(30), Decimal(20)),
    "E": (Decimal(56), Decimal(22)),
    "F": (Decimal(80), Decimal(30)),
    "R": (Decimal(15), Decimal(15)),
    "X": (Decimal(15), Decimal(15)),
}
# IEC 60384-9 Class 2 (from memory): range digit -> (low °C, high °C).
IEC_CLASS2_RANGE: dict[str, tuple[Decimal, Decimal]] = {
    "1": (Decimal(-55), Decimal(125)),
    "2": (Decimal(-55), Decimal(85)),
    "3": (Decimal(-40), Decimal(85)),
    "4": (Decimal(-25), Decimal(85)),
    "5": (Decimal(-10), Decimal(70)),
    "6": (Decimal(10), Decimal(85)),
}

# Operating range usually quoted for Class 1 parts; α itself is defined over +25…+85 °C.
# Common practice, no published source for the range as a rule.
CLASS1_RANGE = (Decimal(-55), Decimal(125))

_CLASS1 = re.compile(r"([A-Z])(\d)([A-Z])")
_CLASS2 = re.compile(r"([XYZ])(\d)([A-Z])")
_IEC2 = re.compile(r"2([A-Z])(\d)")
_PPM = re.compile(r"([+-]?\d{1,4})(?:±(\d{1,4}))?PPM(?:/°?[CK])?")


@dataclass(frozen=True)
class DielectricReading:
    """A dielectric token read: the reading chosen, the ones not chosen, and the doubts."""

    token: str
    dielectric: Dielectric
    alternatives: tuple[Alternative, ...] = ()
    flags: tuple[Flag, ...] = ()


def _ppm(figure: Decimal, multiplier: int) -> Decimal:
    value = figure * multiplier
    return Decimal(0) if value == 0 else value.quantize(Decimal(1)) if value == value.to_integral_value() \
        else value.normalize()


def _class1(code: str, multiplier: int, source: str) -> Dielectric:
    tempco = _ppm(CLASS1_FIGURE[code[0]], multiplier)
    return Dielectric(code=code, family="ceramic", klass=1, tempco_ppm_per_k=tempco,
                      tempco_tol_ppm_per_k=CLASS1_TOLERANCE[code[2]], temp_min_c=CLASS1_RANGE[0],
                      temp_max_c=CLASS1_RANGE[1], source=source)


def _read_class1(code: str) -> DielectricReading | None:
    match = _CLASS1.fullmatch(code)
    if not match or match[1] not in CLASS1_FIGURE or match[3] not in CLASS1_TOLERANCE:
        return None
    digit = match[2]
    if digit in CLASS1_MULTIPLIER:
        return DielectricReading(code, _class1(code, CLASS1_MULTIPLIER[digit], "EIA-198 Class 1"))
    if digit not in CLASS1_DISPUTED_MULTIPLIER:
        return None
    readings = [(m, name) for m, name in zip(CLASS1_DISPUTED_MULTIPLIER[digit],
                                              ("Wikipedia-derived tables", "EIA-198-1 as printed in a "
                                               "design reference book")) if m is not None]
    chosen = _class1(code, readings[-1][0], f"EIA-198 Class 1 (digit {digit} as in {readings[-1][1]})")
    alternatives = tuple(
        Alternative(reason=f"{code}: digit {digit} as ×{m} in {name}", dielectric=_class1(code, m, "EIA-198"))
        for m, name in readings[:-1])
    flag = Flag("disputed-code", f"{code}: the sources disagree on the Class 1 multiplier digit {digit}; "
                                 f"read as ×{readings[-1][0]} ({chosen.tempco_ppm_per_k} ppm/K)")
    return DielectricReading(code, chosen, alternatives, (flag,))


def _class2(code: str, low: Decimal, high: Decimal, change: tuple[Decimal, Decimal], source: str) -> Dielectric:
    return Dielectric(code=code, family="ceramic", klass=2, temp_min_c=low, temp_max_c=high,
                      change_minus_pct=change[0], change_plus_pct=change[1], source=source)


def _read_class2(code: str) -> DielectricReading | None:
    match = _CLASS2.fullmatch(code)
    if not match or match[3] not in CLASS2_CHANGE:
        return None
    low = CLASS2_LOW[match[1]]
    flags: list[Flag] = []
    alternatives: list[Alternative] = []
    if match[2] in CLASS2_HIGH:
        high = CLASS2_HIGH[match[2]]
    elif match[2] in CLASS2_DISPUTED_HIGH:
        high = CLASS2_DISPUTED_HIGH[match[2]]
        flags.append(Flag("disputed-code", f"{code}: high-temperature digit {match[2]} is not in the "
                                           f"published tables; read as +{high} °C from memory"))
    else:
        return None
    chosen = _class2(code, low, high, CLASS2_CHANGE[match[3]], "EIA-198 Class 2")
    if match[3] in CLASS2_DISPUTED_CHANGE:
        other = CLASS2_DISPUTED_CHANGE[match[3]]
        alternatives.append(Alternative(reason=f"{code}: one source gives {match[3]} as ±{other[1]} %",
                                        dielectric=_class2(code, low, high, other, "EIA-198 Class 2 (variant)")))
        flags.append(Flag("disputed-code", f"{code}: change letter {match[3]} is ±22 % in most sources, "
                                           "±20 % in one; read as ±22 %"))
    return DielectricReading(code, chosen, tuple(alternatives), tuple(flags))


def _read_old_name(code: str) -> DielectricReading | None:
    if code not in OLD_CLASS1_NAMES:
        return None
    tempco, eia = OLD_CLASS1_NAMES[code]
    tolerance = CLASS1_TOLERANCE["G"] if code == "NP0" else None
    chosen = Dielectric(code=code, family="ceramic", klass=1, tempco_ppm_per_k=tempco,
                        tempco_tol_ppm_per_k=tolerance, temp_min_c=CLASS1_RANGE[0],
                        temp_max_c=CLASS1_RANGE[1], source="industry name (EIA-198 equivalents)")
    if tolerance is not None:
        return DielectricReading(code, chosen)
    nearest = _read_class1(eia)
    alternatives = (Alternative(reason=f"{code}: often sold as EIA {eia}", dielectric=nearest.dielectric),) \
        if nearest else ()
    return DielectricReading(code, chosen, alternatives)


def assumed_tempco_tolerance(alpha: Decimal) -> tuple[Decimal, str]:
    """The tolerance on α a worst case assumes for a tempco given without one, and why.

    The one table for it: an old name's EIA-198 equivalent (:data:`OLD_CLASS1_NAMES`, the published
    one where a second is only remembered: N150 is P2G in [parameters-page], P2H from memory); an α no name
    carries takes the tolerance of the next name of larger magnitude (common practice, no
    published source), ±1000 ppm/K past N4700. :func:`usual_tempco_tolerance` reads the same table.

    >>> assumed_tempco_tolerance(Decimal(-750)), assumed_tempco_tolerance(Decimal(-2200))[0]
    ((Decimal('120'), 'as U2J, the EIA-198 code N750 is sold as'), Decimal('500'))
    >>> assumed_tempco_tolerance(Decimal(-150))[0], assumed_tempco_tolerance(Decimal(-4700))[0]
    (Decimal('30'), Decimal('1000'))
    """
    by_size = sorted(OLD_CLASS1_NAMES.items(), key=lambda item: abs(item[1][0]))
    for name, (tempco, eia) in by_size:
        if abs(tempco) >= abs(alpha):
            how = (f"as {eia}, the EIA-198 code {name} is sold as" if tempco == alpha
                   else f"as {eia} ({name}), the next old name in size")
            return CLASS1_TOLERANCE[eia[2]], how
    return CLASS1_TOLERANCE["M"], "±1000 ppm/K past N4700 (common practice, no published source)"


def usual_tempco_tolerance(code: str) -> tuple[Decimal, str] | None:
    """The tolerance on α an old name is usually sold with: that of its EIA-198 equivalent.

    Returns (± ppm/K, the EIA code) for a name in :data:`OLD_CLASS1_NAMES`, or for a bare tempco
    that one of them names (``-750 ppm/K``); None for anything else.

    The same table as :func:`assumed_tempco_tolerance` (grading, search and compensation agree).

    >>> usual_tempco_tolerance("N150"), usual_tempco_tolerance("N750"), usual_tempco_tolerance("P100")
    ((Decimal('30'), 'P2G'), (Decimal('120'), 'U2J'), (Decimal('30'), 'M7G'))
    >>> usual_tempco_tolerance("X7R") is None
    True
    """
    name = SPELLINGS.get(code.strip().upper(), code.strip().upper())
    if name not in OLD_CLASS1_NAMES:
        reading = _read_ppm(name.replace(" ", "").replace("/K", "").upper()) if "PPM" in name else None
        tempco = reading.dielectric.tempco_ppm_per_k if reading else None
        name = next((n for n, (a, _) in OLD_CLASS1_NAMES.items() if tempco is not None and a == tempco), "")
    if name not in OLD_CLASS1_NAMES:
        return None
    eia = OLD_CLASS1_NAMES[name][1]
    return CLASS1_TOLERANCE[eia[2]], eia


def _read_iec_class2(code: str) -> DielectricReading | None:
    match = _IEC2.fullmatch(code)
    if not match or match[1] not in IEC_CLASS2_CHANGE or match[2] not in IEC_CLASS2_RANGE:
        return None
    low, high = IEC_CLASS2_RANGE[match[2]]
    return DielectricReading(code, _class2(code, low, high, IEC_CLASS2_CHANGE[match[1]],
                                           "IEC 60384-9 Class 2 (from memory)"))


@lru_cache(maxsize=4096)
def _read_ppm(code: str) -> DielectricReading | None:
    """A tempco printed in ppm/K (``-750PPM``, ``0±30PPM/K``): a Class 1 ceramic by that figure."""
    match = _PPM.fullmatch(code)
    if not match:
        return None
    tempco = Decimal(match[1])
    tolerance = Decimal(match[2]) if match[2] else None
    name = f"{tempco:+}" if tempco else "0"
    name += f"±{tolerance}" if tolerance is not None else ""
    return DielectricReading(code, Dielectric(code=f"{name} ppm/K", family="ceramic", klass=1,
                                              tempco_ppm_per_k=tempco, tempco_tol_ppm_per_k=tolerance,
                                              temp_min_c=CLASS1_RANGE[0], temp_max_c=CLASS1_RANGE[1],
                                              source="tempco printed in ppm/K"))


def read_dielectric(token: str) -> DielectricReading | None:
    """A ceramic dielectric code or old name, with alternatives and flags; None when it is not one.

    >>> r = read_dielectric("npo"); r.dielectric.code, [f.kind for f in r.flags]
    ('NP0', ['spelling-corrected'])
    >>> r = read_dielectric("X7S"); r.dielectric.change_plus_pct, [f.kind for f in r.flags]
    (Decimal('22'), ['disputed-code'])
    >>> read_dielectric("U2J").dielectric.tempco_ppm_per_k
    Decimal('-750')
    """
    code = token.upper()
    flags: tuple[Flag, ...] = ()
    if code in SPELLINGS:
        corrected = SPELLINGS[code]
        flags = (Flag("spelling-corrected", f"{token}: read as {corrected}"
                                            + (" (letter O for digit zero)" if "O" in code else "")),)
        code = corrected
    for reader in (_read_old_name, _read_class2, _read_class1, _read_iec_class2, _read_ppm):
        reading = reader(code)
        if reading is not None:
            return replace(reading, token=token, flags=flags + reading.flags)
    return None


def decode_dielectric(token: str) -> Dielectric | None:
    """The dielectric a ceramic code or old name stands for, or None when the token is not one.

    Use :func:`read_dielectric` to see the alternatives and flags as well.

    >>> decode_dielectric("P2H").tempco_ppm_per_k, decode_dielectric("P2H").tempco_tol_ppm_per_k
    (Decimal('-150'), Decimal('60'))
    >>> decode_dielectric("Z5U").change_minus_pct, decode_dielectric("Z5U").temp_min_c
    (Decimal('56'), Decimal('10'))
    >>> decode_dielectric("polyester") is None
    True
    """
    reading = read_dielectric(token.strip())
    return reading.dielectric if reading else None


__all__ = ["CLASS1_FIGURE", "CLASS1_MULTIPLIER", "CLASS1_TOLERANCE", "CLASS2_CHANGE", "CLASS2_HIGH",
           "CLASS2_LOW", "OLD_CLASS1_NAMES", "DielectricReading",
           "assumed_tempco_tolerance", "decode_dielectric", "read_dielectric", "usual_tempco_tolerance"]
