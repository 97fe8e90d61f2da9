"""IEC 60384-14 safety classes of mains (EMI-suppression) capacitors: X1 X2 X3, Y1 Y2 Y3 Y4.

X capacitors sit line to line and may fail short (a fuse clears them); Y capacitors sit line to
earth, where a short could put mains on touchable metal, so they must fail open. A part may carry
a dual rating such as ``X1Y2`` (often printed ``X1/Y2`` or ``X1 Y2``), meaning it meets both.
A Y1 part is accepted in a Y2 position, X1 in X2, and a Y rating covers an X position of the same
voltage (common practice; defer to local codes).

>>> read_safety_class("X2").classes
('X2',)
>>> read_safety_class("x1/y2").code
'X1Y2'
>>> read_safety_class("X7R") is None
True
"""

from __future__ import annotations

import re
from functools import lru_cache
from dataclasses import dataclass
from decimal import Decimal


@dataclass(frozen=True)
class SubclassFacts:
    """What one subclass is for, per IEC 60384-14 as summarised in the reference ([IEC 60384-14])."""

    use: str
    impulse_kv: Decimal | None     # peak impulse test voltage, C ≤ 1 µF; None = no impulse test
    typical_rating: str


# IEC 60384-14, via docs/sources.md: [IEC 60384-14] (impulse figures confirmed by two pages;
# the typical ratings and "no test" for X3 are from memory).
SUBCLASSES: dict[str, SubclassFacts] = {
    "X1": SubclassFacts("line to line, peak pulses > 2.5 kV and ≤ 4 kV", Decimal(4), "up to about 760 V AC"),
    "X2": SubclassFacts("line to line, peak pulses ≤ 2.5 kV", Decimal("2.5"), "up to about 310 V AC"),
    "X3": SubclassFacts("line to line, peak pulses ≤ 1.2 kV", None, "—"),
    "Y1": SubclassFacts("line to earth, double or reinforced insulation", Decimal(8), "≤ 500 V AC"),
    "Y2": SubclassFacts("line to earth, basic insulation", Decimal(5), "150 … 300 V AC"),
    "Y3": SubclassFacts("line to earth, basic insulation", None, "≤ 250 V AC"),
    "Y4": SubclassFacts("line to earth, basic insulation", Decimal("2.5"), "< 150 V AC"),
}

# Within X and within Y a lower digit is the stricter subclass (common practice reading of
# IEC 60384-14: X1 passes X2's tests, Y1 passes Y2's).
_DUAL = re.compile(r"(X[1-3])[\s/+,&-]*(Y[1-4])|(Y[1-4])[\s/+,&-]*(X[1-3])|(X[1-3])|(Y[1-4])", re.IGNORECASE)

CAUTION = ("Mains safety capacitor: replace only with a part of the same or a stricter IEC 60384-14 "
           "class and at least the same AC rating; never fit an unrated part across the mains or to "
           "earth. Follow local codes and licensed practice.")


@dataclass(frozen=True)
class SafetyClass:
    """One safety marking: its canonical code (``X2``, ``X1Y2``) and the subclasses it holds."""

    code: str
    classes: tuple[str, ...]

    def covers(self, required: str) -> bool:
        """Whether this part may sit where ``required`` (e.g. ``X2``) is asked for.

        >>> read_safety_class("X1Y2").covers("X2"), read_safety_class("X2").covers("Y2")
        (True, False)
        """
        needed = read_safety_class(required)
        if needed is None:
            return False
        return all(any(_covers(have, need) for have in self.classes) for need in needed.classes)


def _covers(have: str, need: str) -> bool:
    if have[0] == need[0]:
        return int(have[1]) <= int(need[1])
    # A Y part meets the X tests of its pulse level in common practice: Y1 ⊇ X1, Y2 ⊇ X2.
    return have[0] == "Y" and need[0] == "X" and int(have[1]) <= int(need[1]) and have in ("Y1", "Y2")


@lru_cache(maxsize=1024)
def read_safety_class(token: str) -> SafetyClass | None:
    """A safety-class token (``X2``, ``Y1``, ``X1Y2``, ``X1/Y2``); None when it is not one.

    >>> read_safety_class("Y2X1").code, read_safety_class("Y5") is None
    ('X1Y2', True)
    """
    match = _DUAL.fullmatch(token.strip())
    if not match:
        return None
    parts = tuple(sorted(p.upper() for p in match.groups() if p))
    return SafetyClass("".join(parts), parts)


def describe(code: str) -> str:
    """One line on what a safety class is for.

    >>> describe("X2")
    'X2: line to line, peak pulses ≤ 2.5 kV (impulse test 2.5 kV, typically up to about 310 V AC)'
    """
    reading = read_safety_class(code)
    if reading is None:
        return f"{code}: not an IEC 60384-14 class"
    lines = []
    for sub in reading.classes:
        facts = SUBCLASSES[sub]
        test = f"impulse test {facts.impulse_kv} kV" if facts.impulse_kv else "no impulse test"
        lines.append(f"{sub}: {facts.use} ({test}, typically {facts.typical_rating})")
    return "; ".join(lines)


__all__ = ["CAUTION", "SUBCLASSES", "SafetyClass", "SubclassFacts", "describe", "read_safety_class"]
