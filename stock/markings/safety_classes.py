"""IEC 60384-14 safety classes of mains (EMI-suppression) capacitors: X1 X2 X3, Y1 Y2 Y3 Y4.

X capacitors sit line to line and may fail short (a fuse clears them); Y capacitors sit line to
earth, where a short could put mains on touchable metal, so they must fail open. A part may carry
a dual rating such as ``X1Y2`` (often printed ``X1/Y2`` or ``X1 Y2``), meaning it meets both.

This module is the one home of the substitution rule (:func:`covers`), used by grading, search,
kitting and the cautions. A part may stand in for a position's class only when

1. its kind may: a Y part may take an X position (it is tested for the stricter line–earth duty
   and fails open), an X part never takes a Y position;
2. its impulse test is at least as severe as the position's (a class with no impulse test, X3 or
   Y3, counts as 0 kV): Y2 (5 kV) covers X1 (4 kV), Y3 (none) never covers Y4 (2.5 kV);
3. its rated AC voltage reaches the position's: the marked ratings when known, else the class's
   range: Y4 (below 150 V AC) never covers an X2 position.

>>> read_safety_class("X2").classes
('X2',)
>>> read_safety_class("x1/y2").code
'X1Y2'
>>> read_safety_class("X7R") is None
True
>>> covers("Y2", "X1").ok, covers("Y4", "X2").ok, covers("X2", "Y2").reason
(True, False, 'X2 does not cover Y2: an X part never takes a line–earth (Y) position')
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from decimal import Decimal
from functools import lru_cache


@dataclass(frozen=True)
class SubclassFacts:
    """What one subclass is for, its impulse test and its rated AC voltage range ([IEC 60384-14]).

    ``ac_floor_v`` is the least AC voltage a position of this class is assumed to run at when no
    voltage is stated; ``ac_ceiling_v`` the most a part of the class is rated for (``below`` when
    the range stops short of it). None = the standard sets no bound.
    """

    use: str
    position: str                   # "line-line" (X) or "line-earth" (Y)
    impulse_kv: Decimal | None      # peak impulse test voltage, C ≤ 1 µF; None = no impulse test
    ac_floor_v: Decimal | None
    ac_ceiling_v: Decimal | None
    ceiling_below: bool = False     # True: rated strictly below the ceiling (Y4: < 150 V AC)
    source: str = ""

    def typical_rating(self) -> str:
        """The class's AC range in words: ``150 … 300 V AC``, ``< 150 V AC``, ``—``."""
        if self.ac_ceiling_v is None:
            return "—"
        top = f"{self.ac_ceiling_v:f} V AC"
        if self.ceiling_below:
            return f"< {top}"
        if self.ac_floor_v is not None and self.position == "line-earth":
            return f"{self.ac_floor_v:f} … {top}"
        return f"up to about {top}"


_150 = Decimal(150)
# [IEC 60384-14], as reproduced by the pages its entry in docs/sources.md names. Impulse tests:
# [safety-impulse-calculator], [safety-note] (X1, X2), [safety-impulse-calculator],
# [safety-parameters-page] (Y1, Y2, Y4); "no impulse test" for X3 from memory, for Y3
# [safety-parameters-page]. Rated AC ranges: Y1 ≤ 500, Y2 150…300, Y3 ≤ 250, Y4 < 150 V AC
# ([safety-parameters-page]); X1 ≤ 760 and X2 ≤ 310 V AC from memory. The floors are derived, not
# published: below 150 V AC is Y4's range, so a position of any other class named without a voltage
# is assumed to run on mains of at least 150 V AC (conservative).
SUBCLASSES: dict[str, SubclassFacts] = {
    "X1": SubclassFacts("line to line, peak pulses > 2.5 kV and ≤ 4 kV", "line-line", Decimal(4),
                        _150, Decimal(760),
                        source="[safety-impulse-calculator], [safety-note]; AC ceiling from memory"),
    "X2": SubclassFacts("line to line, peak pulses ≤ 2.5 kV", "line-line", Decimal("2.5"),
                        _150, Decimal(310),
                        source="[safety-impulse-calculator], [safety-note]; AC ceiling from memory"),
    "X3": SubclassFacts("line to line, peak pulses ≤ 1.2 kV", "line-line", None,
                        _150, None, source="[safety-note]; no impulse test from memory"),
    "Y1": SubclassFacts("line to earth, double or reinforced insulation", "line-earth", Decimal(8),
                        None, Decimal(500), source="[safety-impulse-calculator], [safety-parameters-page]"),
    "Y2": SubclassFacts("line to earth, basic insulation", "line-earth", Decimal(5),
                        _150, Decimal(300), source="[safety-impulse-calculator], [safety-parameters-page]"),
    "Y3": SubclassFacts("line to earth, basic insulation", "line-earth", None,
                        _150, Decimal(250), source="[safety-parameters-page]"),
    "Y4": SubclassFacts("line to earth, basic insulation", "line-earth", Decimal("2.5"),
                        None, _150, ceiling_below=True,
                        source="[safety-impulse-calculator], [safety-parameters-page]"),
}

POSITION_NAMES = {"line-line": "line–line", "line-earth": "line–earth"}

_DUAL = re.compile(r"(X[1-3])[\s/+,&-]*(Y[1-4])|(Y[1-4])[\s/+,&-]*(X[1-3])|(X[1-3])|(Y[1-4])", re.IGNORECASE)
_ANY = re.compile(r"([XY])\s*([1-4])", re.IGNORECASE)

# The one mains caution, printed wherever a mains position or a safety part is concerned.
MAINS_CAUTION = ("mains work can kill: fit only a part whose IEC 60384-14 X/Y class covers the"
                 " position and whose AC rating reaches the mains; never an unrated part across the"
                 " mains or to earth; discharge before handling; defer to local electrical codes and"
                 " licensed practice")
CAUTION = MAINS_CAUTION  # the name the decoder has always used


@dataclass(frozen=True)
class Cover:
    """Whether a part's class may stand in a position, and why (the real cause, in words)."""

    ok: bool
    reason: str

    def __bool__(self) -> bool:
        return self.ok


@dataclass(frozen=True)
class SafetyClass:
    """One safety marking: its canonical code (``X2``, ``X1Y2``) and the subclasses it holds."""

    code: str
    classes: tuple[str, ...]

    def covers(self, required: str, part_ac_v: Decimal | None = None,
               position_ac_v: Decimal | None = None) -> bool:
        """Whether this part may sit where ``required`` (e.g. ``X2``) is asked for (:func:`covers`).

        >>> read_safety_class("X1Y2").covers("X2"), read_safety_class("X2").covers("Y2")
        (True, False)
        """
        return covers(self.code, required, part_ac_v, position_ac_v).ok

    def positions(self, part_ac_v: Decimal | None = None, mains_ac_v: Decimal | None = None) -> tuple[str, ...]:
        """The positions a part of this marking may take: line–earth with a Y class; line–line when it
        covers X3, the least X class (so a Y4 part, rated below 150 V AC, only on a lower mains).

        >>> read_safety_class("X2").positions(), read_safety_class("Y4").positions()
        (('line-line',), ('line-earth',))
        >>> read_safety_class("Y4").positions(Decimal(125), Decimal(120))
        ('line-line', 'line-earth')
        """
        out = []
        if covers(self.code, "X3", part_ac_v, mains_ac_v).ok:
            out.append("line-line")
        if any(c[0] == "Y" for c in self.classes):
            out.append("line-earth")
        return tuple(out)


def _v(value: Decimal) -> str:
    return f"{value.normalize():f}"


def _reaches(part: str, position: str, part_ac_v: Decimal | None, position_ac_v: Decimal | None) -> str | None:
    """None when the part's AC rating reaches the position's; else the reason it does not."""
    have, need = SUBCLASSES[part], SUBCLASSES[position]
    wanted = position_ac_v if position_ac_v is not None else need.ac_floor_v
    if wanted is None:
        return None
    what = (f"the position's {_v(wanted)} V AC" if position_ac_v is not None
            else f"the {_v(wanted)} V AC {'an' if position[0] == 'X' else 'a'} {position} position may run at")
    if part_ac_v is not None:
        return None if part_ac_v >= wanted else f"rated {_v(part_ac_v)} V AC, below {what}"
    if have.ac_ceiling_v is None:
        return None
    below = have.ac_ceiling_v <= wanted if have.ceiling_below else have.ac_ceiling_v < wanted
    return f"{part} is rated {have.typical_rating()}, below {what}" if below else None


def _covers_one(part: str, position: str, part_ac_v: Decimal | None,
                position_ac_v: Decimal | None) -> Cover:
    have, need = SUBCLASSES[part], SUBCLASSES[position]
    if part == position:
        lacking = _reaches(part, position, part_ac_v, position_ac_v)
        return Cover(lacking is None, f"{part} is the class asked (IEC 60384-14)" if lacking is None
                     else f"{part} does not cover {position}: {lacking}")
    if have.position == "line-line" and need.position == "line-earth":
        return Cover(False, f"{part} does not cover {position}: an X part never takes a line–earth (Y) position")
    strength = have.impulse_kv or Decimal(0)
    needed = need.impulse_kv or Decimal(0)
    if strength < needed:
        tested = f"impulse-tested at {have.impulse_kv:f} kV" if have.impulse_kv else "has no impulse test"
        return Cover(False, f"{part} does not cover {position}: {part} {tested}, {position} at {needed:f} kV")
    lacking = _reaches(part, position, part_ac_v, position_ac_v)
    if lacking is not None:
        return Cover(False, f"{part} does not cover {position}: {lacking}")
    tests = (f"impulse test {have.impulse_kv or 0:f} kV ≥ {needed:f} kV" if needed else
             f"{position} has no impulse test")
    return Cover(True, f"{part} covers {position} ({tests}; IEC 60384-14)")


def covers(part_class: str | None, position_class: str, part_ac_v: Decimal | None = None,
           position_ac_v: Decimal | None = None) -> Cover:
    """Whether a part marked ``part_class`` may stand in a ``position_class`` position, and why.

    Every subclass the position names (``X1Y2`` names two) must be covered by one of the part's.
    ``part_ac_v`` is the part's marked AC rating, ``position_ac_v`` the AC voltage the position
    runs at; either may be unknown (the class's range then decides, see the module docstring).

    >>> covers("X1Y2", "X2").ok, covers("Y3", "Y4").reason
    (True, 'Y3 does not cover Y4: Y3 has no impulse test, Y4 at 2.5 kV')
    >>> covers(None, "X2").reason
    'no X/Y safety class (IEC 60384-14): never across the mains or to earth'
    """
    need = read_safety_class(position_class)
    if need is None:
        raise ValueError(f"{position_class!r} is not an IEC 60384-14 class (X1…X3, Y1…Y4)")
    have = read_safety_class(part_class) if part_class else None
    if have is None:
        return Cover(False, "no X/Y safety class (IEC 60384-14): never across the mains or to earth")
    reasons = []
    for wanted in need.classes:
        results = [_covers_one(c, wanted, part_ac_v, position_ac_v) for c in have.classes]
        good = next((r for r in results if r.ok), None)
        if good is None:
            # the nearest miss: the part's subclass of the same kind, else the first
            same = next((r for c, r in zip(have.classes, results) if c[0] == wanted[0]), results[0])
            return Cover(False, same.reason)
        reasons.append(good.reason)
    return Cover(True, "; ".join(reasons))


def positions_text(code: str, part_ac_v: Decimal | None = None, mains_ac_v: Decimal | None = None) -> str:
    """Where a safety part may go, in words: ``line–line (X2); never line–earth``.

    >>> positions_text("X2"), positions_text("X1Y2")
    ('line–line (X2); never line–earth', 'line–line or line–earth (X1Y2)')
    >>> positions_text("Y4")
    'line–earth (Y4); line–line only where its AC rating reaches the mains (Y4 does not cover X3: Y4 is rated < 150 V AC, below the 150 V AC an X3 position may run at)'
    """
    reading = read_safety_class(code)
    if reading is None:
        return "nowhere on the mains (no X/Y class)"
    where = reading.positions(part_ac_v, mains_ac_v)
    if where == ("line-line",):
        return f"line–line ({reading.code}); never line–earth"
    if where == ("line-earth",):
        why = covers(reading.code, "X3", part_ac_v, mains_ac_v).reason
        return f"line–earth ({reading.code}); line–line only where its AC rating reaches the mains ({why})"
    return f"line–line or line–earth ({reading.code})"


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


def subclasses_in(text: str | None) -> frozenset[str]:
    """The subclasses a free text names: ``"X1 Y2"`` → {X1, Y2} (for requirements typed by hand).

    >>> sorted(subclasses_in("X1 Y2"))
    ['X1', 'Y2']
    """
    if not text:
        return frozenset()
    return frozenset(f"{a.upper()}{b}" for a, b in _ANY.findall(text)
                     if f"{a.upper()}{b}" in SUBCLASSES)


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
        lines.append(f"{sub}: {facts.use} ({test}, typically {facts.typical_rating()})")
    return "; ".join(lines)


__all__ = ["CAUTION", "MAINS_CAUTION", "POSITION_NAMES", "SUBCLASSES", "Cover", "SafetyClass",
           "SubclassFacts", "covers", "describe", "positions_text", "read_safety_class", "subclasses_in"]
