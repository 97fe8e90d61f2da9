"""The colour decoder: every band and dot layout read, the readings ranked, the doubts kept.

Band layouts come from :mod:`stock.markings.colour_codes` (IEC 60062 colours, tempco bands, top
dots), mica dot codes from :mod:`stock.markings.mica_codes`. Which end is first is rarely printed,
so both ends are read; the value that is an E12 number (IEC 60063) is preferred, then the reading
as written, and every other consistent reading stays as an alternative.

>>> m = decode_colours("yel-vio-brn")
>>> m.capacitance_pf, m.tolerance.plus
(Decimal('470'), Decimal('20'))
>>> decode_colours("brown black orange, top dot black").dielectric.code
'NP0'
"""

from __future__ import annotations

from decimal import Decimal

from stock.decoded import Alternative, Flag, Marking
from stock.markings import mica_codes
from stock.markings.colour_codes import TEMPCO_PAIRS, Reading, band_readings, tempco_readings
from stock.markings.colour_words import ColourText, parse_colour_text
from stock.markings.preferred_values import in_series
from stock.units import format_capacitance, format_tolerance, format_voltage


def series_rank(value: Decimal | None) -> int:
    """0 for an E12 value (IEC 60063), 1 for E24, 2 otherwise.

    Capacitors are mostly made in E3/E6/E12 ([value-reading-tutorial]).

    >>> series_rank(Decimal(4700)), series_rank(Decimal(300)), series_rank(Decimal(170_000))
    (0, 1, 2)
    """
    if value is None or value <= 0:
        return 3
    if in_series(value, "E12"):
        return 0
    return 1 if in_series(value, "E24") else 2


_RANK_WORDS = ("an E12 value", "an E24 value", "in no E series up to E24", "no value")


def _describe(r: Reading) -> str:
    parts = [r.layout, "read from the other end" if r.reversed else "read as written",
             f"({' '.join(r.colours)})"]
    value = []
    if r.capacitance_pf is not None:
        value.append(format_capacitance(r.capacitance_pf))
    if r.tolerance is not None:
        value.append(format_tolerance(r.tolerance))
    if r.dielectric is not None:
        value.append(r.dielectric.code)
    if r.voltage_v is not None:
        value.append(format_voltage(r.voltage_v, "DC"))
    return " ".join(parts) + ": " + " ".join(value) + f", {_RANK_WORDS[series_rank(r.capacitance_pf)]}"


def _key(r: Reading) -> tuple:
    return (r.capacitance_pf, r.tolerance, r.dielectric, r.voltage_v)


def _choose(text: str, parsed: ColourText, readings: list[Reading], extra: tuple[Flag, ...] = ()) -> Marking:
    """Rank the readings (E12 first, then the order given) and build the Marking with its doubts."""
    flags = [Flag("spelling-corrected", c) for c in parsed.corrections if " read as " in c]
    flags += [Flag("unreadable", c) for c in parsed.corrections if " read as " not in c]
    if parsed.unknown:
        flags.append(Flag("unparsed", f"not colours: {', '.join(parsed.unknown)}"))
    if not readings:
        return _unreadable(text, parsed, flags)
    ranked = sorted(readings, key=lambda r: series_rank(r.capacitance_pf))
    best = ranked[0]
    rank = series_rank(best.capacitance_pf)
    flags += best.notes
    other_end = [r for r in ranked if r.reversed != best.reversed and series_rank(r.capacitance_pf) <= 1]
    if other_end and rank <= 1:
        flags.append(Flag("both-ends", (
            f"read from the {'written' if best.reversed else 'other'} end the colours give "
            f"{format_capacitance(other_end[0].capacitance_pf)} "
            f"({_RANK_WORDS[series_rank(other_end[0].capacitance_pf)]}); chose "
            f"{format_capacitance(best.capacitance_pf)} ({_RANK_WORDS[rank]}, IEC 60063)")))
    elif best.reversed and not [r for r in ranked if not r.reversed and series_rank(r.capacitance_pf) <= rank]:
        flags.append(Flag("both-ends", (
            f"read from the other end: as written the colours give no value as good as "
            f"{format_capacitance(best.capacitance_pf)} ({_RANK_WORDS[rank]})")))
    if best.family == "mica":
        flags += extra      # the mica decoder's own verdict on its codes
    rivals = [r for r in ranked if (r.family != best.family or best.family == "bands")
              and r.layout != best.layout and series_rank(r.capacitance_pf) <= rank]
    if rivals and "layout-ambiguous" not in {f.kind for f in flags}:
        flags.append(Flag("layout-ambiguous", f"the colours also fit {_describe(rivals[0])}"))
    alternatives = []
    seen = {_key(best)}
    for r in ranked[1:]:
        if _key(r) not in seen:
            seen.add(_key(r))
            alternatives.append(Alternative(reason=_describe(r), capacitance_pf=r.capacitance_pf,
                                            tolerance=r.tolerance, voltage_v=r.voltage_v,
                                            dielectric=r.dielectric))
    return Marking(text=text, capacitance_pf=best.capacitance_pf, tolerance=best.tolerance,
                   voltage_v=best.voltage_v, voltage_kind="DC" if best.voltage_v is not None else None,
                   dielectric=best.dielectric, alternatives=tuple(alternatives),
                   flags=_unique(flags), unparsed=parsed.unknown)


def _unique(flags: list[Flag]) -> tuple[Flag, ...]:
    return tuple(dict.fromkeys(flags))


def _unreadable(text: str, parsed: ColourText, flags: list[Flag]) -> Marking:
    """No layout fits: keep what the tempco colour alone says, and say why nothing else was read."""
    dielectric = None
    if parsed.tempco:
        options = tempco_readings(parsed.tempco)
        if options:
            dielectric = options[0][0]
            flags += options[0][1]
    n = len(parsed.sequence)
    if n == 0:
        why = "no value colours found"
    else:
        why = (f"{n} colour{'s' if n != 1 else ''} ({' '.join(parsed.sequence)}) fit no layout: "
               "3 or 4 value bands (first figure not black, a multiplier colour in place), tubular "
               "4 to 6 bands with a tempco band at one end, or 3, 5 or 6 mica dots")
    flags.append(Flag("unreadable", why))
    return Marking(text=text, dielectric=dielectric, flags=_unique(flags), unparsed=parsed.unknown)


def decode_colours(text: str) -> Marking:
    """Decode a colour-band or colour-dot marking; every consistent reading is kept.

    Never raises: text that is not colours gives a Marking with an ``unreadable`` flag.

    Args:
        text: the colours as typed, e.g. ``"brown black orange, top dot black"``.

    Returns:
        The preferred reading, the others as alternatives, and flags for every doubt.

    >>> m = decode_colours("bands: violet yellow violet black green")
    >>> m.capacitance_pf, m.tolerance.plus, m.tolerance.unit, m.dielectric.code
    (Decimal('47'), Decimal('5'), '%', 'N750')
    >>> m = decode_colours("orng wht red")
    >>> m.capacitance_pf, sorted(m.flag_kinds())
    (Decimal('3900'), ['spelling-corrected', 'tolerance-assumed'])
    """
    if not isinstance(text, str):
        text = "" if text is None else str(text)
    parsed = parse_colour_text(text, TEMPCO_PAIRS)
    mica: list[Reading] = []
    extra: tuple[Flag, ...] = ()
    mica_named = bool(parsed.hints & {"mica", "EIA", "JAN", "RMA"}) or (
        "dots" in parsed.hints and len(parsed.sequence) in (5, 6))
    if not parsed.tempco and (mica_named or "bands" not in parsed.hints):
        mica, extra = mica_codes.mica_readings(parsed.sequence, parsed.hints)
    if mica_named and mica:
        return _choose(text, parsed, mica, extra)
    # not said to be mica: band layouts first, mica codes as rivals of equal standing after them
    return _choose(text, parsed, band_readings(parsed) + mica, extra)



__all__ = ["decode_colours", "series_rank"]
