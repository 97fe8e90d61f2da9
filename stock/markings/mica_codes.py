"""Mica capacitor colour dots: the EIA (RMA), JAN/AWS and older RMA codes, and how they disagree.

Dots are listed as read with the arrows pointing right: the top row left to right, then the bottom
row left to right ([navy-colour-code], [mica-mailing-list] in docs/sources.md). The variants:

- EIA (RMA) six dots, white first dot ([mica-colour-page], [navy-colour-code], [mica-mailing-list]): type dot,
  1st figure, 2nd figure,
  characteristic, tolerance, multiplier (bottom right = multiplier, bottom centre = tolerance:
  [navy-colour-code]).
  ``white brown red black blue red`` is 1200 pF ±2 % (the worked example of [navy-colour-code], a US Navy
  manual).
- the same white-first code as [mica-colour-page] (a code-chart page) prints it: three figures after the white
  dot,
  then the multiplier, the characteristic last.
- JAN/AWS (military) six dots, black first dot ([mica-colour-page], [mica-mailing-list]): as EIA; silver first
  = paper ([navy-colour-code]).
  ``black green brown red yellow black`` is 51 pF ±4 % characteristic C (the [mica-mailing-list] example).
- older RMA codes ([rma-mica-page]): three dots = 2 figures + number of zeros, 500 V DC, ±20 %; five dots add
  voltage and tolerance; six dots carry three figures (top row), then voltage, tolerance,
  multiplier (positions of the bottom row from memory of the RMA chart).

A white, black or silver first dot is a type dot, any other colour a figure (rule from
[navy-colour-code]-[rma-mica-page]).
Unless the text names the code (``mica EIA``, ``JAN``, ``RMA``), every consistent reading is
returned and a ``layout-ambiguous`` flag raised.

>>> readings, flags = mica_readings(("white", "brown", "red", "black", "blue", "red"), frozenset({"EIA"}))
>>> readings[0].capacitance_pf, readings[0].tolerance.plus, flags
(Decimal('1200'), Decimal('2'), ())
"""

from __future__ import annotations

from decimal import Decimal
from itertools import product

from stock.markings.colour_codes import DIGIT, Reading, figures, pct
from stock.decoded import Dielectric, Flag, Tolerance

_TYPE_DOTS = ("white", "black", "silver")

# Multiplier in pF ([navy-colour-code], [mica-mailing-list]; the ×0.1/×0.01 of grey/white are ceramic-only,
# [colour-tutorial-a]).
MICA_MULTIPLIER: dict[str, Decimal] = {
    "black": Decimal(1),
    "brown": Decimal(10),
    "red": Decimal(100),
    "orange": Decimal(1000),
    "yellow": Decimal(10_000),
    "green": Decimal(100_000),
    "blue": Decimal(1_000_000),
    "gold": Decimal("0.1"),
    "silver": Decimal("0.01"),
}


# Tolerance on EIA and JAN mica, every reading preferred first (general code
# [colour-tutorial-a]-[colour-identification-c]; [navy-colour-code], [mica-mailing-list]).
MICA_TOLERANCE: dict[str, tuple[tuple[Tolerance, str], ...]] = {
    "black": ((pct("20"), "general colour code"),),
    "brown": ((pct("1"), "general colour code"),),
    "red": ((pct("2"), "general colour code"),),
    "orange": ((pct("3"), "S19"),),
    "yellow": ((pct("4"), "one AWS chart, S25"),),      # blank in the other AWS chart ([mica-mailing-list])
    "green": ((pct("5"), "general colour code"),),
    "blue": ((pct("2"), "S24 worked example"),),       # the general code gives blue no tolerance
    "white": ((pct("10"), "general colour code"),),
    "gold": ((pct("5"), "general colour code"),),
    "silver": ((pct("10"), "general colour code"),),
    "none": ((pct("20"), "S26: no dot"),),
}
_TOLERANCE_DOUBTS: dict[str, str] = {
    "yellow": "yellow is ±4 % in one AWS chart and blank in another (S25)",
    "blue": "blue is ±2 % in the S24 worked example; the general code has red for ±2 % and no blue",
}

# Older RMA tolerance and voltage dots ([rma-mica-page]): a figure colour means that many %, or 100 V each.
RMA_TOLERANCE: dict[str, Tolerance] = {
    "brown": pct("1"),
    "red": pct("2"),
    "orange": pct("3"),
    "yellow": pct("4"),
    "green": pct("5"),
    "blue": pct("6"),
    "violet": pct("7"),
    "grey": pct("8"),
    "white": pct("9"),
    "gold": pct("5"),
    "silver": pct("10"),
    "none": pct("20"),
}
RMA_VOLTAGE: dict[str, Decimal] = {
    "brown": Decimal(100),
    "red": Decimal(200),
    "orange": Decimal(300),
    "yellow": Decimal(400),
    "green": Decimal(500),
    "blue": Decimal(600),
    "violet": Decimal(700),
    "grey": Decimal(800),
    "white": Decimal(900),
    "gold": Decimal(1000),
    "silver": Decimal(2000),
    "none": Decimal(500),
}

# Characteristic dot → letter. [encyclopaedia-colour-code] (a colour-code encyclopedia table): brown B … green
# F. [mica-colour-page] names
# classes A to E instead; read here as the same colours one letter down (inference, unverified).
CHARACTERISTIC_LETTERS: dict[str, tuple[tuple[str, str], ...]] = {
    "brown": (("B", "S22"), ("A", "S23, inferred")),
    "red": (("C", "S22, S25"), ("B", "S23, inferred")),
    "orange": (("D", "S22"), ("C", "S23, inferred")),
    "yellow": (("E", "S22"), ("D", "S23, inferred")),
    "green": (("F", "S22"), ("E", "S23, inferred")),
}

# Characteristic letter → α window in ppm/K (MIL-C-5 / MIL-PRF-39001 "relative stability" table;
# C = ±200 ppm/K per [mica-mailing-list], the rest from memory of MIL-C-5). (centre, half-width); None = not
# specified.
CHARACTERISTIC_TEMPCO: dict[str, tuple[int, int] | None] = {
    "A": None,
    "B": None,
    "C": (0, 200),
    "D": (0, 100),
    "E": (40, 60),      # −20 … +100
    "F": (35, 35),      # 0 … +70
}


def characteristic_dielectric(letter: str, source: str) -> Dielectric:
    """The mica characteristic letter as a Dielectric (α window only; drift is not modelled).

    >>> characteristic_dielectric("C", "[mica-mailing-list]").tempco_tol_ppm_per_k
    Decimal('200')
    """
    window = CHARACTERISTIC_TEMPCO.get(letter)
    return Dielectric(
        code=f"mica char. {letter}", family="mica",
        tempco_ppm_per_k=None if window is None else Decimal(window[0]),
        tempco_tol_ppm_per_k=None if window is None else Decimal(window[1]),
        source=f"MIL-C-5 characteristic table, from memory ({source})")


def _mica_tolerances(colour: str) -> tuple[tuple[Tolerance, tuple[Flag, ...]], ...]:
    options = MICA_TOLERANCE.get(colour, ())
    doubt = _TOLERANCE_DOUBTS.get(colour)
    flags = (Flag("disputed-code", doubt),) if doubt else ()
    return tuple((t, flags) for t, _ in options)


def _characteristics(colour: str) -> tuple[tuple[Dielectric, tuple[Flag, ...]], ...]:
    options = CHARACTERISTIC_LETTERS.get(colour, ())
    if not options:
        unknown = Dielectric(code="mica", family="mica", source="mica colour code: type dot (S24)")
        return ((unknown, (Flag("unreadable", (
            f"the characteristic dot ({colour}) has no letter in the tables (S22: brown B … green F); "
            "characteristic unknown")),)),)
    said = "; ".join(f"{letter} ({src})" for letter, src in options)
    flags = (Flag("disputed-code", f"the sources disagree on {colour} as a mica characteristic: {said}"),)
    return tuple((characteristic_dielectric(letter, src), flags) for letter, src in options)


def _aws_voltage(value: Decimal) -> tuple[Decimal | None, tuple[Flag, ...]]:
    """AWS micas with three arrows: 500 V DC below 6800 pF, 300 V DC to 10 000 pF ([mica-mailing-list])."""
    if value < 6800:
        volts = Decimal(500)
    elif value <= 10_000:
        volts = Decimal(300)
    else:
        return None, ()
    return volts, (Flag("voltage-assumed",
                        f"AWS mica below 6800 pF is rated 500 V DC, 6800-10 000 pF 300 V DC (S25); "
                        f"read as {volts} V DC"),)


def _type_dot_readings(dots: tuple[str, ...]) -> list[Reading]:
    """White (EIA) or black/silver (JAN) first dot, figures, characteristic, tolerance, multiplier."""
    first = dots[0]
    significant = figures(dots[1:3])
    multiplier = MICA_MULTIPLIER.get(dots[5])
    if first not in _TYPE_DOTS or significant is None or multiplier is None:
        return []
    value = Decimal(significant) * multiplier
    tolerances = _mica_tolerances(dots[4])
    if not tolerances:
        return []
    if first == "silver":
        paper = Dielectric(code="paper", family="paper", source="JAN colour code: silver type dot (S24)")
        dielectrics: tuple[tuple[Dielectric | None, tuple[Flag, ...]], ...] = ((paper, ()),)
        layout = "JAN 6 dots (paper: silver type dot)"
    else:
        dielectrics = _characteristics(dots[3])
        if not dielectrics:
            return []
        layout = ("EIA 6 dots (white type dot, S24/S25 order)" if first == "white"
                  else "JAN/AWS 6 dots (black type dot)")
    volts, v_flags = _aws_voltage(value) if first == "black" else (None, ())
    return [Reading(layout, value, dots, tolerance=tol, dielectric=diel, voltage_v=volts, family="mica",
                    notes=d_flags + t_flags + v_flags)
            for (diel, d_flags), (tol, t_flags) in product(dielectrics, tolerances)]


def _three_figure_eia_readings(dots: tuple[str, ...]) -> list[Reading]:
    """White type dot, three figures, multiplier, characteristic last ([mica-colour-page]'s order)."""
    significant = figures(dots[1:4])
    multiplier = MICA_MULTIPLIER.get(dots[4])
    if dots[0] != "white" or significant is None or multiplier is None:
        return []
    return [Reading("EIA 6 dots (white type dot, S23 order: 3 figures, multiplier, characteristic)",
                    Decimal(significant) * multiplier, dots, dielectric=diel, family="mica", notes=flags)
            for diel, flags in _characteristics(dots[5])]


def _rma_readings(dots: tuple[str, ...]) -> list[Reading]:
    """Older RMA codes ([rma-mica-page]): 3, 5 or 6 dots with no type dot."""
    if not dots or dots[0] in _TYPE_DOTS:
        return []
    n = len(dots)
    if n == 3:
        significant, multiplier_colour, volt_colour, tol_colour = figures(dots[:2]), dots[2], "none", "none"
        layout = "RMA 3 dots (2 figures, zeros; 500 V, ±20 %)"
    elif n == 5:
        significant, multiplier_colour, volt_colour, tol_colour = figures(dots[:2]), dots[2], dots[3], dots[4]
        layout = "RMA 5 dots (2 figures, zeros, voltage, tolerance)"
    elif n == 6:
        significant, multiplier_colour, volt_colour, tol_colour = figures(dots[:3]), dots[5], dots[3], dots[4]
        layout = "RMA 6 dots (3 figures, voltage, tolerance, multiplier)"
    else:
        return []
    zeros = DIGIT.get(multiplier_colour)
    if significant is None or zeros is None or volt_colour not in RMA_VOLTAGE or tol_colour not in RMA_TOLERANCE:
        return []
    mica = Dielectric(code="mica", family="mica", source="RMA moulded-mica colour code (S26)")
    return [Reading(layout, Decimal(significant) * Decimal(10) ** zeros, dots,
                    tolerance=RMA_TOLERANCE[tol_colour], voltage_v=RMA_VOLTAGE[volt_colour],
                    dielectric=mica, family="mica")]


# Moulded mica parts run from about 1 pF to 0.1 µF (common practice, no published source); a reading
# outside that is not a consistent mica reading.
MICA_RANGE_PF = (Decimal(1), Decimal(100_000))


def _plausible(r: Reading) -> bool:
    if r.dielectric is not None and r.dielectric.family == "paper":
        return True
    return r.capacitance_pf is not None and MICA_RANGE_PF[0] <= r.capacitance_pf <= MICA_RANGE_PF[1]


_NAMED = {"EIA": ("EIA", "RMA 6"), "JAN": ("JAN",), "RMA": ("EIA", "RMA")}


def mica_readings(dots: tuple[str, ...], hints: frozenset[str]) -> tuple[list[Reading], tuple[Flag, ...]]:
    """Every consistent mica reading of the dots, and the flags that belong to the set as a whole.

    Args:
        dots: colours in reading order (top row left to right, then bottom row).
        hints: layout words found in the text ("mica", "EIA", "JAN", "RMA", "dots").

    Returns:
        (readings, flags): readings in order of preference; flags ``layout-ambiguous`` when several
        codes fit and the text names none, ``label-conflict`` when the named code does not fit.

    >>> rs, fl = mica_readings(("white", "red", "red", "brown", "black", "black"), frozenset())
    >>> rs[0].capacitance_pf, rs[0].dielectric.code, [f.kind for f in fl]
    (Decimal('22'), 'mica char. B', ['layout-ambiguous'])
    """
    n = len(dots)
    readings: list[Reading] = []
    if n == 6:
        readings += _type_dot_readings(dots) + _three_figure_eia_readings(dots)
    if n in (5, 6) or (n == 3 and hints & {"mica", "RMA"}):
        readings += _rma_readings(dots)
    readings = [r for r in readings if _plausible(r)]
    if not readings:
        return [], ()
    named = [v for v in ("EIA", "JAN", "RMA") if v in hints]
    flags: list[Flag] = []
    if named:
        prefixes = tuple(p for v in named for p in _NAMED[v])
        chosen = [r for r in readings if r.layout.startswith(prefixes)]
        if chosen:
            layouts = sorted({r.layout for r in chosen})
            if len(layouts) > 1:
                flags.append(Flag("disputed-code", f"the sources print {' / '.join(named)} two ways: "
                                                   + "; ".join(layouts)))
            return chosen, tuple(flags)
        flags.append(Flag("label-conflict", (
            f"the text names {' / '.join(named)} but the dots do not fit it; read by the codes they fit")))
    layouts = list(dict.fromkeys(r.layout for r in readings))
    if len(layouts) > 1:
        flags.append(Flag("layout-ambiguous", (
            "mica dot codes disagree and the text names none (say mica EIA, JAN or RMA); "
            "codes that fit: " + "; ".join(layouts))))
    return readings, tuple(flags)


__all__ = ["CHARACTERISTIC_LETTERS", "CHARACTERISTIC_TEMPCO", "MICA_MULTIPLIER", "MICA_TOLERANCE",
           "RMA_TOLERANCE", "RMA_VOLTAGE", "characteristic_dielectric", "mica_readings"]
