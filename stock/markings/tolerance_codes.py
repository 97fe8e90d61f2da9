"""IEC 60062 tolerance letters, and tolerances written out (``±5%``, ``+80/-20%``, ``±0.25pF``).

Below about 10 pF a percentage is too fine to make, so the letters B, C, D, F and G then mean an
absolute tolerance in pF (B ±0.1 pF, C ±0.25 pF, D ±0.5 pF, F ±1 pF, G ±2 pF); above it they are
percentages. J ±5 %, K ±10 % and M ±20 % mean the same everywhere; Z is +80/−20 %. Several letters
(E H L N P W Y) mean different things in different tables: they decode to the majority reading
with the others as alternatives and a ``disputed-code`` flag.

>>> r = read_tolerance_letter("C", Decimal("1.5")); r.tolerance.minus, r.tolerance.unit
(Decimal('0.25'), 'pF')
>>> r = read_tolerance_letter("Z", Decimal(10000)); (r.tolerance.minus, r.tolerance.plus)
(Decimal('20'), Decimal('80'))
>>> read_explicit_tolerance("+80/-20%").plus
Decimal('80')
"""

from __future__ import annotations

import re
from functools import lru_cache
from dataclasses import dataclass
from decimal import Decimal

from stock.decoded import Alternative, Flag, Tolerance
from stock.units import format_tolerance

# The value at or below which B C D F G (and A) mean absolute pF. IEC 60062 practice, per the
# reference tables "C ≤ 10 pF" (docs/sources.md: [IEC 60062] tolerance letters).
ABSOLUTE_LIMIT_PF = Decimal(10)

# Absolute meanings for values ≤ 10 pF, ± pF. IEC 60062; A from memory.
ABSOLUTE_LETTERS: dict[str, Decimal] = {
    "A": Decimal("0.05"),   # from memory
    "B": Decimal("0.1"),
    "C": Decimal("0.25"),
    "D": Decimal("0.5"),
    "F": Decimal("1"),
    "G": Decimal("2"),
}

# Percentage meanings, (minus, plus) magnitudes. IEC 60062 / majority of the published tables.
PERCENT_LETTERS: dict[str, tuple[Decimal, Decimal]] = {
    "A": (Decimal("0.05"), Decimal("0.05")),
    "B": (Decimal("0.1"), Decimal("0.1")),
    "C": (Decimal("0.25"), Decimal("0.25")),
    "D": (Decimal("0.5"), Decimal("0.5")),
    "E": (Decimal("0.005"), Decimal("0.005")),   # IEC, from memory; disputed
    "F": (Decimal(1), Decimal(1)),
    "G": (Decimal(2), Decimal(2)),
    "H": (Decimal("2.5"), Decimal("2.5")),        # disputed
    "J": (Decimal(5), Decimal(5)),
    "K": (Decimal(10), Decimal(10)),
    "L": (Decimal(15), Decimal(15)),              # disputed
    "M": (Decimal(20), Decimal(20)),
    "N": (Decimal(30), Decimal(30)),              # disputed
    "P": (Decimal(0), Decimal(100)),              # disputed
    "Q": (Decimal(10), Decimal(30)),
    "R": (Decimal(20), Decimal(30)),
    "S": (Decimal(20), Decimal(50)),
    "T": (Decimal(10), Decimal(50)),
    "U": (Decimal(0), Decimal(80)),
    "V": (Decimal(10), Decimal(100)),
    "W": (Decimal("0.05"), Decimal("0.05")),      # IEC, from memory; disputed
    "X": (Decimal(20), Decimal(40)),
    "Y": (Decimal(0), Decimal(50)),               # disputed
    "Z": (Decimal(20), Decimal(80)),
}

# Other readings found in published tables for the disputed letters: (minus, plus, where).
DISPUTED_LETTERS: dict[str, tuple[tuple[Decimal, Decimal, str], ...]] = {
    "E": ((Decimal("0.5"), Decimal("0.5"), "several tutorial tables"),
          (Decimal("0.25"), Decimal("0.25"), "one forum table")),
    "H": ((Decimal(3), Decimal(3), "two tutorial tables"),),
    "L": ((Decimal("0.01"), Decimal("0.01"), "IEC 60062 resistor-style table, from memory"),),
    "N": ((Decimal(20), Decimal(40), "older US practice"),
          (Decimal("0.05"), Decimal("0.05"), "one amateur-radio table")),
    "P": ((Decimal(0), Decimal(80), "one design-reference table"),
          (Decimal(20), Decimal(80), "older US practice")),
    "W": ((Decimal(0), Decimal(200), "one forum table"),
          (Decimal(20), Decimal(40), "one maker's table"),
          (Decimal(0), Decimal(20), "one German table")),
    "Y": ((Decimal(20), Decimal(50), "one maker's table"),),
}

_PLUS_MINUS = re.compile(r"±(\d+(?:\.\d*)?|\.\d+)(%|pf)", re.IGNORECASE)
_ASYMMETRIC = re.compile(r"\+(\d+(?:\.\d*)?)/?-(\d+(?:\.\d*)?)%|-(\d+(?:\.\d*)?)/?\+(\d+(?:\.\d*)?)%")
_PLAIN_PERCENT = re.compile(r"(\d+(?:\.\d*)?|\.\d+)%")


@dataclass(frozen=True)
class ToleranceReading:
    """A tolerance read from a letter or from text, with readings not chosen and doubts."""

    tolerance: Tolerance
    alternatives: tuple[Alternative, ...] = ()
    flags: tuple[Flag, ...] = ()


def _pct(letter: str, minus: Decimal, plus: Decimal) -> Tolerance:
    return Tolerance(minus, plus, "%", code=letter)


def _describe(t: Tolerance) -> str:
    return format_tolerance(t)


@lru_cache(maxsize=4096)
def read_tolerance_letter(letter: str, capacitance_pf: Decimal | None) -> ToleranceReading | None:
    """The tolerance a letter stands for on a part of the given value; None for a non-tolerance letter.

    Args:
        letter: one letter, any case.
        capacitance_pf: the value read from the same marking, or None when unknown.

    >>> r = read_tolerance_letter("F", None); r.tolerance.unit, [f.kind for f in r.flags]
    ('%', ['tolerance-by-value'])
    >>> read_tolerance_letter("K", Decimal(100000)).tolerance.plus
    Decimal('10')
    """
    letter = letter.upper()
    if letter not in PERCENT_LETTERS:
        return None
    percent = _pct(letter, *PERCENT_LETTERS[letter])
    alternatives: list[Alternative] = []
    flags: list[Flag] = []
    chosen = percent
    if letter in ABSOLUTE_LETTERS:
        absolute = Tolerance(ABSOLUTE_LETTERS[letter], ABSOLUTE_LETTERS[letter], "pF", code=letter)
        small = capacitance_pf is not None and capacitance_pf <= ABSOLUTE_LIMIT_PF
        if small or capacitance_pf is None:
            chosen, other = (absolute, percent) if small else (percent, absolute)
            alternatives.append(Alternative(reason=f"{letter}: {_describe(other)} "
                                            + ("above" if small else "at or below")
                                            + f" {ABSOLUTE_LIMIT_PF} pF", tolerance=other))
            value = "the value is unknown" if capacitance_pf is None else f"the value is ≤ {ABSOLUTE_LIMIT_PF} pF"
            flags.append(Flag("tolerance-by-value", f"{letter}: {_describe(absolute)} at or below "
                                                    f"{ABSOLUTE_LIMIT_PF} pF, {_describe(percent)} above; "
                                                    f"{value}, read as {_describe(chosen)}"))
    if letter in DISPUTED_LETTERS:
        for minus, plus, where in DISPUTED_LETTERS[letter]:
            alternatives.append(Alternative(reason=f"{letter}: {_describe(_pct(letter, minus, plus))} "
                                                   f"in {where}", tolerance=_pct(letter, minus, plus)))
        flags.append(Flag("disputed-code", f"{letter}: tolerance letter read differently by different "
                                           f"tables; read as {_describe(chosen)}"))
    return ToleranceReading(chosen, tuple(alternatives), tuple(flags))


def read_explicit_tolerance(token: str) -> Tolerance | None:
    """A written-out tolerance: ``±5%``, ``5%``, ``+80/-20%``, ``-20+80%``, ``±0.25pF``; else None.

    >>> read_explicit_tolerance("±0.25pF")
    Tolerance(minus=Decimal('0.25'), plus=Decimal('0.25'), unit='pF', code=None)
    >>> read_explicit_tolerance("-20/+80%").minus, read_explicit_tolerance("10%").plus
    (Decimal('20'), Decimal('10'))
    """
    match = _PLUS_MINUS.fullmatch(token)
    if match:
        value = Decimal(match[1] if not match[1].startswith(".") else "0" + match[1])
        return Tolerance(value, value, "pF" if match[2].lower() == "pf" else "%")
    match = _ASYMMETRIC.fullmatch(token)
    if match:
        plus, minus = (match[1], match[2]) if match[1] else (match[4], match[3])
        return Tolerance(Decimal(minus), Decimal(plus), "%")
    match = _PLAIN_PERCENT.fullmatch(token)
    if match:
        value = Decimal(match[1] if not match[1].startswith(".") else "0" + match[1])
        return Tolerance(value, value, "%")
    return None


__all__ = ["ABSOLUTE_LETTERS", "ABSOLUTE_LIMIT_PF", "DISPUTED_LETTERS", "PERCENT_LETTERS",
           "ToleranceReading", "read_explicit_tolerance", "read_tolerance_letter"]
