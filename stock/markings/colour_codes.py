"""Colour bands and dots on capacitors: IEC 60062 colour figures, tempco bands and top dots.

The colour figures and multipliers are those of the IEC 60062 colour code as the capacitor tables
reproduce it (value in pF; the tutorial tables keyed [colour-tutorial-a], [colour-tables-b],
[colour-identification-c] in docs/sources.md). The layouts:

- three or four bands: two significant figures, a multiplier, then the tolerance. ``yellow violet
  brown`` is 47 × 10 = 470 pF; ``brown black orange silver`` is 10 nF ±10 %. With no tolerance band
  the tables read ±20 % ([colour-tables-b]).
- tubular ceramic, read from the (wide) tempco band: tempco, two figures, multiplier, tolerance.
  ``violet yellow violet black green`` is N750, 47 pF ±5 %. A tolerance colour means pF when the
  value is at most 10 pF and % above it (threshold 10 pF, as the
  [colour-tutorial-a]/[colour-tables-b]/[colour-identification-c] tables print it). A
  two-colour tempco (``red violet`` = P100) makes it six bands.
- disc or plate ceramic: the value bands plus a top dot or band for the tempco:
  ``brown black orange, top dot black`` is 10 nF NP0.
- five polyester film bands (the moulded C280 style, from memory): two figures, multiplier,
  tolerance, voltage. ``brown black yellow white red`` is 100 nF ±10 % 250 V.
- mica dots (EIA, JAN/AWS, RMA): :mod:`stock.markings.mica_codes`. Typed words:
  :mod:`stock.markings.colour_words`. The decoder that ranks every reading: :mod:`stock.markings.colours`.

Which end is first is rarely printed, so a sequence that reads from both ends is decoded both
ways; the value that is an E12 number (IEC 60063; E3 and E6 are inside E12) is preferred, then the
reading as written. Where the sources disagree on a colour (±0.25 pF is red or grey, brown tempco
−30 or −33 ppm/K ...), every reading is kept as an alternative and a ``disputed-code`` flag says so.

>>> looks_like_colours("YEL/VIO/BRN"), looks_like_colours("104K")
(True, False)
"""

from __future__ import annotations

from dataclasses import dataclass
from decimal import Decimal
from itertools import product

from stock.markings.colour_words import COLOURS, ColourText, base_colour, parse_colour_text
from stock.decoded import Dielectric, Flag, Tolerance
from stock.units import format_capacitance, format_tolerance

# IEC 60062 colour figures ([colour-tutorial-a], [colour-tables-b], [colour-identification-c]): black 0, brown
# 1 … white 9, in COLOURS order.
DIGIT: dict[str, int] = {colour: figure for figure, colour in enumerate(COLOURS[:10])}

# Multiplier in pF, ceramic reading ([colour-tutorial-a], [colour-tables-b]; green and blue from
# [colour-tutorial-a] only; violet has none).
MULTIPLIER: dict[str, Decimal] = {
    "black": Decimal(1),
    "brown": Decimal(10),
    "red": Decimal(100),
    "orange": Decimal(1000),
    "yellow": Decimal(10_000),
    "green": Decimal(100_000),
    "blue": Decimal(1_000_000),
    "grey": Decimal("0.01"),
    "white": Decimal("0.1"),
    "gold": Decimal("0.1"),
    "silver": Decimal("0.01"),
}
# Resistor-style reading of grey and white, printed in the first table of [colour-tables-b].
_RESISTOR_STYLE_MULTIPLIER: dict[str, Decimal] = {
    "grey": Decimal(100_000_000),
    "white": Decimal(1_000_000_000),
}

TOLERANCE_PF_THRESHOLD = Decimal(10)   # ≤ 10 pF: pF column; above: % column (the colour tables)


def pct(minus: str, plus: str | None = None) -> Tolerance:
    """A percentage tolerance from table text: ``pct("5")`` is ±5 %, ``pct("20", "80")`` +80/−20 %."""
    return Tolerance(Decimal(minus), Decimal(plus if plus is not None else minus), "%")


def _pf(value: str) -> Tolerance:
    return Tolerance(Decimal(value), Decimal(value), "pF")


# Tolerance above 10 pF: every reading a source gives, preferred first.
TOLERANCE_ABOVE_10PF: dict[str, tuple[tuple[Tolerance, str], ...]] = {
    "black": ((pct("20"), "S19, S20, S21"),),
    "brown": ((pct("1"), "S19, S20, S21"),),
    "red": ((pct("2"), "S19, S20, S21"),),
    "orange": ((pct("3"), "S19"),),
    "yellow": ((pct("4"), "S19"),),
    "green": ((pct("5"), "S20, S21"), (pct("0.5"), "S22")),
    "grey": ((pct("20", "80"), "S19"),),
    "white": ((pct("10"), "S19, S20, S21"),),
    "gold": ((pct("5"), "S19, S20"), (_pf("0.5"), "S22")),
    "silver": ((pct("10"), "S19, S20, S22"),),
    "none": ((pct("20"), "S20: no band"),),
}
# Tolerance at 10 pF and below. Where a source gives the colour no pF meaning, the % reading stays.
TOLERANCE_AT_MOST_10PF: dict[str, tuple[tuple[Tolerance, str], ...]] = {
    "black": ((_pf("2"), "S19, S20, S21"),),
    "brown": ((_pf("0.1"), "S19"), (pct("1"), "S20, S21: % column only")),
    "red": ((_pf("0.25"), "S19"), (pct("2"), "S20, S21: % column only")),
    "green": ((_pf("0.5"), "S19, S20, S21"),),
    "grey": ((_pf("0.25"), "S20, S21"), (pct("20", "80"), "S19: % column only")),
    "white": ((_pf("1"), "S19, S20, S21"),),
}


@dataclass(frozen=True)
class Tempco:
    """One reading of a tempco colour: the old industry name and α in ppm/K."""

    code: str
    ppm_per_k: int
    source: str


# Class 1 ceramic tempco colour (cap, end band or top dot), every reading preferred first.
# Sources: [colour-tutorial-a]/[colour-tables-b]/[colour-identification-c] tutorial tables, [gdr-ceramics]
# (GDR TGL 7838), [capinfo-1993] (1993 text file), [tc-letter-colour-table] (letter and
# colour TC table); two-colour negative ones beyond N1500 from memory.
TEMPCO_COLOURS: dict[tuple[str, ...], tuple[Tempco, ...]] = {
    ("black",): (Tempco("NP0", 0, "S19, S20, S21, S28"),),
    ("brown",): (Tempco("N030", -30, "S20, S21"), Tempco("N033", -33, "S19, TGL 7838"),
                 Tempco("N150", -150, "S28, an outlier")),
    ("red",): (Tempco("N080", -80, "S20, S21"), Tempco("N075", -75, "S19")),
    ("orange",): (Tempco("N150", -150, "S19, S20, S21, S62, TGL 7838"),),
    ("yellow",): (Tempco("N220", -220, "S19, S20, S21, S62"),),
    ("green",): (Tempco("N330", -330, "S19, S20, S21, S62"),),
    ("blue",): (Tempco("N470", -470, "S19, S20, S21"),),
    ("violet",): (Tempco("N750", -750, "S19, S20, S21, TGL 7838, S28"),),
    ("grey",): (Tempco("P030", 30, "S20, S21, S62"),),
    ("white",): (Tempco("P500", 500, "S20, S21"),),
    ("gold",): (Tempco("P100", 100, "S62"),),
    ("light red",): (Tempco("N075", -75, "TGL 7838"),),
    ("light blue",): (Tempco("N470", -470, "TGL 7838"),),
    ("dark blue",): (Tempco("N1500", -1500, "TGL 7838"),),
    ("dark grey",): (Tempco("P033", 33, "TGL 7838"),),
    ("red", "violet"): (Tempco("P100", 100, "TGL 7838, S28"),),
    ("orange", "orange"): (Tempco("N1500", -1500, "from memory"),),
    ("brown", "red"): (Tempco("N1500", -1500, "S28"),),
    ("yellow", "orange"): (Tempco("N2200", -2200, "from memory"),),
    ("green", "orange"): (Tempco("N3300", -3300, "from memory"),),
    ("blue", "orange"): (Tempco("N4700", -4700, "from memory"),),
}
TEMPCO_PAIRS = frozenset(colours for colours in TEMPCO_COLOURS if len(colours) == 2)
# Readings some sources give that are not a tempco at all; said in the flag, not offered as values.
_TEMPCO_REMARKS: dict[str, str] = {
    "green": "S28 reads green as high-K (Class 2)",
    "grey": "from memory, grey is also used for general purpose",
    "white": "from memory, white is also used for general purpose (+100…−750 ppm/K)",
}


def tempco_dielectric(tempco: Tempco) -> Dielectric:
    """The Class 1 ceramic a tempco colour names (α only: colours carry no α tolerance).

    >>> tempco_dielectric(TEMPCO_COLOURS[("violet",)][0]).tempco_ppm_per_k
    Decimal('-750')
    """
    return Dielectric(code=tempco.code, family="ceramic", klass=1,
                      tempco_ppm_per_k=Decimal(tempco.ppm_per_k),
                      source=f"Class 1 ceramic tempco colour code ({tempco.source})")


@dataclass(frozen=True)
class Reading:
    """One consistent way to read the colours; the decoder ranks them and keeps the rest."""

    layout: str
    capacitance_pf: Decimal | None
    colours: tuple[str, ...]            # the sequence in the order this reading takes it
    tolerance: Tolerance | None = None
    dielectric: Dielectric | None = None
    voltage_v: Decimal | None = None
    reversed: bool = False
    family: str = "bands"               # "bands" or "mica": which layouts compete with each other
    notes: tuple[Flag, ...] = ()        # flags that hold when this reading is chosen


def looks_like_colours(text: str) -> bool:
    """Whether every word of a marking is a colour or a colour-code word (auto-detection).

    Needs three colours, or one named as a top dot, band or dot layout: a lone ``red`` is not a
    marking.

    >>> looks_like_colours("brown black orange, top dot black"), looks_like_colours("yel vio brn")
    (True, True)
    >>> looks_like_colours("red"), looks_like_colours("100n 63V"), looks_like_colours("")
    (False, False, False)
    """
    if not isinstance(text, str) or not text.strip() or any(ch.isdigit() for ch in text):
        return False
    parsed = parse_colour_text(text, TEMPCO_PAIRS)
    if parsed.unknown:
        return False
    count = len(parsed.sequence) + len(parsed.tempco)
    return len(parsed.sequence) >= 3 or (count >= 1 and bool(parsed.tempco or parsed.hints & {"bands", "dots"}))


def tolerance_readings(colour: str, capacitance_pf: Decimal) -> tuple[tuple[Tolerance, tuple[Flag, ...]], ...]:
    """Every reading of a tolerance colour at a given value, preferred first, with its flags.

    >>> [format_tolerance(t) for t, _ in tolerance_readings("white", Decimal("4.7"))]
    ['±1 pF']
    >>> [format_tolerance(t) for t, _ in tolerance_readings("white", Decimal("47"))]
    ['±10 %']
    """
    base = base_colour(colour)
    flags: list[Flag] = []
    options = TOLERANCE_ABOVE_10PF.get(base, ())
    if capacitance_pf <= TOLERANCE_PF_THRESHOLD:
        small = TOLERANCE_AT_MOST_10PF.get(base)
        if small:
            options = small
            flags.append(Flag("tolerance-by-value", (
                f"{format_capacitance(capacitance_pf)} is at most 10 pF, so the {base} tolerance "
                "colour is read in pF (threshold 10 pF: S19, S20, S21 colour tables)")))
        elif options:
            flags.append(Flag("tolerance-by-value", (
                f"{base} has no pF meaning at 10 pF and below in the colour tables (S19, S20, S21); "
                "read from the % column")))
    if len(options) > 1:
        said = "; ".join(f"{format_tolerance(t)} ({src})" for t, src in options)
        flags.append(Flag("disputed-code", f"the sources disagree on {base} as a tolerance: {said}"))
    return tuple((t, tuple(flags)) for t, _ in options)


def tempco_readings(colours: tuple[str, ...]) -> tuple[tuple[Dielectric, tuple[Flag, ...]], ...]:
    """Every reading of a tempco colour (or colour pair), preferred first, with its flags.

    >>> [d.code for d, _ in tempco_readings(("brown",))]
    ['N030', 'N033', 'N150']
    >>> [d.code for d, _ in tempco_readings(("red", "violet"))]
    ['P100']
    """
    options = TEMPCO_COLOURS.get(colours)
    if options is None:
        options = TEMPCO_COLOURS.get(tuple(base_colour(c) for c in colours), ())
    flags: list[Flag] = []
    if len(options) > 1:
        said = "; ".join(f"{t.code} ({t.source})" for t in options)
        flags.append(Flag("disputed-code",
                          f"the sources disagree on {' + '.join(colours)} as a tempco: {said}"))
    if len(colours) == 1 and colours[0] in _TEMPCO_REMARKS and options:
        flags.append(Flag("disputed-code", _TEMPCO_REMARKS[colours[0]]))
    return tuple((tempco_dielectric(t), tuple(flags)) for t in options)


def multiplier_readings(colour: str) -> tuple[tuple[Decimal, tuple[Flag, ...]], ...]:
    """Every multiplier a colour can mean, preferred first (ceramic tables before resistor-style).

    >>> [m for m, _ in multiplier_readings("orange")], [m for m, _ in multiplier_readings("white")]
    ([Decimal('1000')], [Decimal('0.1'), Decimal('1000000000')])
    """
    base = base_colour(colour)
    if base not in MULTIPLIER:
        return ()
    if base in _RESISTOR_STYLE_MULTIPLIER:
        flag = Flag("disputed-code", (
            f"{base} multiplies by {MULTIPLIER[base]} on ceramics (S19, S20) but by "
            f"{_RESISTOR_STYLE_MULTIPLIER[base]:,} in the resistor-style table (S20)"))
        return ((MULTIPLIER[base], (flag,)), (_RESISTOR_STYLE_MULTIPLIER[base], (flag,)))
    return ((MULTIPLIER[base], ()),)


def figures(colours: tuple[str, ...]) -> int | None:
    """The significant figures the colours spell, or None when one is no figure or the first is 0.

    >>> figures(("yellow", "violet")), figures(("black", "red")), figures(("gold", "red"))
    (47, None, None)
    """
    digits = [DIGIT.get(base_colour(c)) for c in colours]
    if any(d is None for d in digits) or digits[0] == 0:
        return None
    value = 0
    for d in digits:
        value = value * 10 + d
    return value


def _value_readings(layout: str, colours: tuple[str, ...], figure_count: int, *,
                    tolerance_at: int | None, dielectric_colours: tuple[str, ...] | None,
                    reversed_: bool = False, shown: tuple[str, ...] = ()) -> list[Reading]:
    """Readings of figures + multiplier (+ tolerance) at given positions; [] when inconsistent.

    Positions: figures from 0, then the multiplier; ``tolerance_at`` is the index of the tolerance
    colour (or None). ``dielectric_colours`` names a tempco colour group, if the layout has one.
    """
    significant = figures(colours[:figure_count])
    multipliers = multiplier_readings(colours[figure_count])
    if significant is None or not multipliers:
        return []
    dielectrics: tuple[tuple[Dielectric | None, tuple[Flag, ...]], ...] = ((None, ()),)
    if dielectric_colours:
        dielectrics = tempco_readings(dielectric_colours)
        if not dielectrics:
            return []
    readings = []
    for multiplier, m_flags in multipliers:
        value = Decimal(significant) * multiplier
        tolerances: tuple[tuple[Tolerance | None, tuple[Flag, ...]], ...]
        if tolerance_at is None:
            tolerances = ((pct("20"), (Flag("tolerance-assumed",
                                             "no tolerance band; the tables read none as ±20 % (S20)"),)),)
        else:
            tolerances = tolerance_readings(colours[tolerance_at], value)
            if not tolerances:
                return []
        for (diel, d_flags), (tol, t_flags) in product(dielectrics, tolerances):
            readings.append(Reading(layout, value, shown or colours, tolerance=tol, dielectric=diel,
                                    reversed=reversed_, notes=m_flags + d_flags + t_flags))
    return readings


def band_readings(parsed: ColourText) -> list[Reading]:
    """Every band layout that fits the sequence, read from both ends, in order of preference."""
    seq = parsed.sequence
    top = parsed.tempco or None
    tubular_only = "tubular" in parsed.hints and not top
    out: list[Reading] = []
    for reversed_, colours in ((False, seq), (True, tuple(reversed(seq)))):
        if reversed_ and seq == colours:
            continue    # a palindrome reads the same from both ends
        n = len(colours)
        kw = {"reversed_": reversed_}
        if n == 3 and not tubular_only:
            out += _value_readings("3 bands (2 figures, multiplier)", colours, 2, tolerance_at=None,
                                   dielectric_colours=top, **kw)
        if n == 4 and not tubular_only:
            out += _value_readings("4 bands (2 figures, multiplier, tolerance)", colours, 2,
                                   tolerance_at=3, dielectric_colours=top, **kw)
        if top:
            continue    # the tempco is on top, so no band of the sequence is a tempco band
        if n == 4:
            out += _value_readings("tubular 4 bands (tempco, 2 figures, multiplier)", colours[1:], 2,
                                   tolerance_at=None, dielectric_colours=colours[:1], shown=colours, **kw)
        if n == 5:
            out += _value_readings("tubular 5 bands (tempco, 2 figures, multiplier, tolerance)",
                                   colours[1:], 2, tolerance_at=3, dielectric_colours=colours[:1],
                                   shown=colours, **kw)
            if not tubular_only:
                out += _polyester_readings(colours, reversed_)
        if n == 6 and colours[:2] in TEMPCO_COLOURS:
            out += _value_readings("tubular 6 bands (two-colour tempco, 2 figures, multiplier, tolerance)",
                                   colours[2:], 2, tolerance_at=3, dielectric_colours=colours[:2],
                                   shown=colours, **kw)
    return out


# Five-band polyester film capacitors (the moulded "C280" style): 2 figures, multiplier in pF,
# tolerance, voltage. From memory of that maker's colour code; only the colours remembered surely.
POLYESTER_TOLERANCE: dict[str, Tolerance] = {
    "black": pct("20"),
    "white": pct("10"),
}
POLYESTER_VOLTAGE: dict[str, Decimal] = {
    "red": Decimal(250),
    "yellow": Decimal(400),
}


def _polyester_readings(colours: tuple[str, ...], reversed_: bool) -> list[Reading]:
    significant = figures(colours[:2])
    multiplier = MULTIPLIER.get(base_colour(colours[2]))
    tolerance = POLYESTER_TOLERANCE.get(base_colour(colours[3]))
    volts = POLYESTER_VOLTAGE.get(base_colour(colours[4]))
    if significant is None or multiplier is None or multiplier < 1 or tolerance is None or volts is None:
        return []
    film = Dielectric(code="polyester", family="polyester",
                      source="polyester film colour code, from memory (C280 style)")
    note = Flag("unverified-code", "five-band polyester layout read from memory of the C280-style code "
                                 "(black ±20 %, white ±10 %; red 250 V, yellow 400 V); no published table")
    return [Reading("polyester 5 bands (2 figures, multiplier, tolerance, voltage)",
                    Decimal(significant) * multiplier, colours, tolerance=tolerance, dielectric=film,
                    voltage_v=volts, reversed=reversed_, notes=(note,))]



__all__ = ["COLOURS", "DIGIT", "MULTIPLIER", "TEMPCO_COLOURS", "TEMPCO_PAIRS", "TOLERANCE_ABOVE_10PF",
           "TOLERANCE_AT_MOST_10PF", "ColourText", "Reading", "Tempco", "band_readings",
           "looks_like_colours", "tempco_dielectric", "tempco_readings"]
