"""Which part may go on which BOM line, which bins to take, and the cautions a kit carries.

The rules (common practice, no published source, except where a standard is named):

- A mains line takes only parts carrying its IEC 60384-14 class or one that covers it
  (:func:`stock.markings.safety_classes.covers`); a part without a class never goes there. No allowance
  relaxes this.
- A tuned line never takes a Class 2 ceramic, nor a part whose dielectric is unknown.
- A polarised part never goes on a CAD footprint named as unpolarised (``C_0805_2012Metric``;
  the libraries name polarised ones ``CP_…``): the board marks no polarity there. Otherwise it
  goes only where the BOM says the position is polarised (a polarised footprint says so), or,
  when the line names no dielectric, at a bulk, bypass or timing position of 1 µF or more
  (where electrolytics are the norm), with a note to fit it by the board's polarity mark.
- The rated voltage asked is a minimum: a higher rating is allowed and said so.
- A Class 1 code or tempco window needs a linear tempco inside the window (C0G for NP0 is the same
  characteristic); a Class 2 code takes Class 1 parts or Class 2 ones that cover its range and
  change window (X7R for X5R, not the reverse). ``lower-class`` relaxes this, never on tuned or
  mains lines.
- The whole tolerance band of the part must stay inside the line's tolerance; ``looser-tolerance``
  relaxes this to the nominal value alone.

- A part whose package is known not to fit the line's footprint is never used
  (:func:`stock.markings.packages.fits`); one whose package is not recorded comes after the rest.

Bins are then ordered by :mod:`stock.kitting.bin_order`, so the part that gives up least goes
first.
"""

from __future__ import annotations

from collections import defaultdict
from dataclasses import dataclass
from decimal import Decimal
from typing import Any

from stock.decoded import Marking
from stock.inventory.bins import natural_key, part_marking
from stock.kitting.bin_order import GRADE_RANK, Candidate, choose_bins
from stock.kitting.bom import POLARISED_FAMILIES, BomLine
from stock.markings.ceramic_codes import assumed_tempco_tolerance
from stock.markings.safety_classes import MAINS_CAUTION, covers
from stock.matching.requirement import tempco_tolerance
from stock.physics.combining import band
from stock.units import format_capacitance, format_number, format_voltage

ALLOWANCES = ("looser-tolerance", "lower-class")
POLARISED_FROM_PF = Decimal(1_000_000)   # 1 µF (common practice, no published source)
HIGH_VOLTAGE_V = Decimal(50)   # above this a charged part can hurt (common practice, no published source)


@dataclass(frozen=True)
class Verdict:
    """Whether a part may go on a line: ``refused`` is the reason it may not; ``notes`` explain."""
    refused: str | None
    notes: tuple[str, ...] = ()


def _fmt_pct(value: Decimal) -> str:
    return f"±{format_number(value)} %"


def _part_tol_pct(marking: Marking, capacitance_pf: Decimal) -> Decimal | None:
    if marking.tolerance is None:
        return None
    tol = marking.tolerance.as_percent(capacitance_pf)
    return max(tol) if tol else None


def check_part(line: BomLine, marking: Marking, capacitance_pf: Decimal | None,
               allow: frozenset[str] = frozenset(), *, in_pair: bool = False) -> Verdict:
    """May this part go on this line? The rules of the module docstring, one reason at a time.

    ``in_pair`` skips the value and tolerance checks, which apply to the pair as a whole.

    >>> from stock.decoded import Marking
    >>> line = BomLine(1, ("C1",), 1, "100n X2", True, "capacitor", capacitance_pf=Decimal(100000),
    ...                safety_class="X2", application="mains")
    >>> check_part(line, Marking("104", capacitance_pf=Decimal(100000)), Decimal(100000)).refused
    'not safety-rated; the mains line needs X2'
    """

    notes: list[str] = []
    dielectric = marking.dielectric
    # Mains and tuned rules first: no allowance relaxes them.
    if line.safety_class:

        if not marking.safety_class:
            return Verdict(f"not safety-rated; the mains line needs {line.safety_class}")
        cover = covers(marking.safety_class, line.safety_class,
                       marking.voltage_v if marking.voltage_kind == "AC" else None,
                       line.voltage_v if line.voltage_kind == "AC" else None)
        if not cover.ok:
            return Verdict(f"rated {marking.safety_class}: {cover.reason} (IEC 60384-14)")
        if marking.safety_class.upper() != line.safety_class.upper():
            notes.append(f"{marking.safety_class} for {line.safety_class}: a class that covers it"
                         " (IEC 60384-14)")
    if line.application == "tuned":
        if dielectric is None:
            return Verdict("dielectric unknown; a tuned circuit needs a known stable dielectric")
        if dielectric.klass == 2:
            return Verdict(f"{dielectric.code} is a Class 2 ceramic; never in a tuned circuit")
    polarised = marking.polarity is not None or (dielectric is not None
                                                 and dielectric.family in POLARISED_FAMILIES)
    pads = line.package
    if polarised and pads is not None and pads.cad_name and not pads.polarised_hint:
        return Verdict(f"polarised part for the unpolarised footprint {pads.raw!r}: the board marks"
                       " no polarity there")
    if polarised and not line.polarised:
        what = (dielectric.family if dielectric else marking.polarity or "").replace("-", " ")
        if not _polarised_fits(line):
            return Verdict(f"polarised ({what}); the BOM line does not say the position is"
                           " polarised")
        where = f"{line.application} positions" if line.application else "positions"
        notes.append(f"polarised ({what}) where the BOM names no dielectric: usual at {where} of"
                     " 1 µF and more; fit it by the board's polarity mark")
    if line.polarised and not polarised and line.dielectric is not None:
        return Verdict("not a polarised part; the BOM names "
                       f"{line.dielectric.family.replace('-', ' ')}")
    # Voltage: the rating asked is a minimum.
    if line.voltage_v is not None:
        if marking.voltage_v is None:
            return Verdict(f"voltage rating unknown; the line needs"
                           f" {format_voltage(line.voltage_v, line.voltage_kind or 'DC')}")
        if line.voltage_kind == "AC" and marking.voltage_kind != "AC":
            return Verdict("rated for DC only; the line needs an AC rating")
        if marking.voltage_v < line.voltage_v:
            return Verdict(f"rated {format_voltage(marking.voltage_v, marking.voltage_kind or 'DC')},"
                           f" below the {format_voltage(line.voltage_v, line.voltage_kind or 'DC')}"
                           " asked")
        if marking.voltage_v > line.voltage_v:
            notes.append(f"{format_voltage(marking.voltage_v, marking.voltage_kind or 'DC')} part for a"
                         f" {format_voltage(line.voltage_v, line.voltage_kind or 'DC')} line: a"
                         " higher voltage rating is allowed")
    refused = _dielectric_rule(line, marking, allow, notes)
    if refused:
        return Verdict(refused)
    if in_pair:
        return Verdict(None, tuple(notes))
    refused = _value_rule(line, marking, capacitance_pf, allow, notes, format_capacitance)
    return Verdict(refused, tuple(notes))


def _polarised_fits(line: BomLine) -> bool:
    """Whether a line that names no dielectric may take a polarised part.

    From 1 µF up, reservoir, bypass and timing positions are usually electrolytic or tantalum
    (common practice, no published source); tuned, mains and signal positions never assume it
    (a coupling part may see its DC either way round).
    """
    return (line.dielectric is None and line.tempco_min is None
            and line.application in (None, "bulk", "bypass", "timing")
            and line.capacitance_pf is not None and line.capacitance_pf >= POLARISED_FROM_PF)


def _dielectric_rule(line: BomLine, marking: Marking, allow: frozenset[str],
                     notes: list[str]) -> str | None:
    want, have = line.dielectric, marking.dielectric
    lower_ok = "lower-class" in allow and line.application not in ("tuned", "mains")
    window = (line.tempco_min, line.tempco_max) if line.tempco_min is not None else None
    if want is None and window is None:
        return None
    if have is None:
        return "dielectric unknown; the line names " + (want.code if want else "a tempco window")
    if want is not None and want.family != "ceramic":
        if have.family != want.family:
            return f"{have.family.replace('-', ' ')}; the line names {want.code}"
        return None
    if want is not None and have.family != "ceramic":
        return f"{have.family.replace('-', ' ')}; the line names a ceramic ({want.code})"
    if want is None and window is None:
        return None
    if window is not None or (want is not None and want.klass == 1):
        linear = have.tempco_ppm_per_k is not None and (have.klass == 1 or want is None)
        if not linear:
            if lower_ok:
                notes.append(f"{have.code} in place of {_want_text(line)}: a lower class, allowed by"
                             " --allow lower-class")
                return None
            return f"{have.code} has no linear tempco; the line needs {_want_text(line)}"
        if window is not None:
            # the same band the search judges a part by: an unmarked tolerance on α is assumed
            # from the one table (stock.markings.ceramic_codes), never taken as zero
            spread = tempco_tolerance(have)
            alpha = have.tempco_ppm_per_k
            judged = _tempco_text(have)
            if have.tempco_tol_ppm_per_k is None:
                judged = (f"{format_number(alpha)}±{format_number(spread)} ppm/K "
                          f"({assumed_tempco_tolerance(alpha)[1]}; no tolerance is marked)")
            if alpha - spread < window[0] or alpha + spread > window[1]:
                return f"{have.code} tempco {judged} lies outside {_want_text(line)}"
            if have.tempco_tol_ppm_per_k is None:
                notes.append(f"{have.code}: judged at {judged}")
        elif have.tempco_ppm_per_k != want.tempco_ppm_per_k:
            return f"{have.code} tempco {_tempco_text(have)}; the line names {want.code}"
        elif have.tempco_tol_ppm_per_k is None:
            # a code asked for: an old name matches its EIA code on the nominal (as the search does)
            notes.append(f"{have.code}: no tolerance on its tempco is marked; judged on its nominal"
                         f" {_tempco_text(have)}")
        if want is not None and have.code != want.code:
            if (have.tempco_ppm_per_k == want.tempco_ppm_per_k
                    and have.tempco_tol_ppm_per_k == want.tempco_tol_ppm_per_k):
                notes.append(f"{have.code} for {want.code}: the same characteristic"
                             f" ({_tempco_text(have)}, EIA-198 Class 1)")
            else:
                notes.append(f"{have.code} ({_tempco_text(have)}) lies within what {want.code}"
                             " allows")
        return None
    # A Class 2 code asked for: Class 1 is better; Class 2 must cover its range and window.
    if have.klass == 1:
        notes.append(f"{have.code} in place of {want.code}: a Class 1 part is more stable")
        return None
    if have.klass != 2:
        return f"{have.code}; the line names {want.code}"
    covers = (have.temp_min_c is not None and want.temp_min_c is not None
              and have.temp_min_c <= want.temp_min_c and have.temp_max_c >= want.temp_max_c
              and have.change_minus_pct <= want.change_minus_pct
              and have.change_plus_pct <= want.change_plus_pct)
    if covers:
        if have.code != want.code:
            notes.append(f"{have.code} for {want.code}: as stable over a range at least as wide")
        return None
    if lower_ok:
        notes.append(f"{have.code} in place of {want.code}: a lower class, allowed by --allow"
                     " lower-class")
        return None
    return f"{have.code} does not cover {want.code} (narrower range or wider change)"


def _tempco_text(d: Any) -> str:
    tol = f"±{format_number(d.tempco_tol_ppm_per_k)}" if d.tempco_tol_ppm_per_k is not None else ""
    return f"{format_number(d.tempco_ppm_per_k)}{tol} ppm/K"


def _want_text(line: BomLine) -> str:
    if line.tempco_min is not None:
        return f"{format_number(line.tempco_min)}…{format_number(line.tempco_max)} ppm/K"
    return line.dielectric.code if line.dielectric else "Class 1"


def _value_rule(line: BomLine, marking: Marking, capacitance_pf: Decimal | None,
                allow: frozenset[str], notes: list[str], fmt: Any) -> str | None:
    want = line.capacitance_pf
    if capacitance_pf is None:
        return "value unknown"
    part_tol = _part_tol_pct(marking, capacitance_pf)
    offset = abs(capacitance_pf - want) * 100 / want
    looser_ok = "looser-tolerance" in allow
    if line.tol_pct is None:
        if capacitance_pf != want:
            return f"nominal {fmt(capacitance_pf)}, not {fmt(want)} (the line gives no tolerance)"
        return None
    if part_tol is None:
        if looser_ok:
            notes.append("tolerance unknown, allowed by --allow looser-tolerance")
            return None if offset <= line.tol_pct else f"nominal {fmt(capacitance_pf)} is outside"
        return f"tolerance unknown; the line needs {_fmt_pct(line.tol_pct)}"
    # the part's whole band, each side from its own nominal, against the line's band
    p_lo, p_hi = band(capacitance_pf, *marking.tolerance.as_percent(capacitance_pf))
    w_lo, w_hi = band(want, line.tol_pct, line.tol_pct)
    if p_lo < w_lo or p_hi > w_hi:
        if looser_ok and offset <= line.tol_pct:
            notes.append(f"{_fmt_pct(part_tol)} where {_fmt_pct(line.tol_pct)} was asked: a looser"
                         " tolerance, allowed by --allow looser-tolerance")
            return None
        if offset:
            return (f"nominal {fmt(capacitance_pf)} {_fmt_pct(part_tol)} can stray outside"
                    f" {fmt(want)} {_fmt_pct(line.tol_pct)}")
        return f"{_fmt_pct(part_tol)} is looser than the {_fmt_pct(line.tol_pct)} asked"
    if offset:
        notes.append(f"nominal {fmt(capacitance_pf)} {_fmt_pct(part_tol)} stays within"
                     f" {fmt(want)} {_fmt_pct(line.tol_pct)}")
    elif part_tol < line.tol_pct:
        notes.append(f"{_fmt_pct(part_tol)} part for {_fmt_pct(line.tol_pct)}: a tighter tolerance"
                     " is allowed")
    return None


# Which lead the band or sign marks, by family (from memory of maker datasheets; always check the
# maker's own marking).
POLARITY_MARKS: dict[str, str] = {
    "aluminium-electrolytic": "aluminium electrolytics usually mark the negative lead (a stripe of"
                              " minus signs); on a new part the longer lead is positive",
    "tantalum": "tantalums usually mark the positive lead (a band, a + sign or the longer lead)",
    "tantalum-polymer": "polymer tantalums usually mark the positive lead (a band or bar)",
    "double-layer": "double-layer (super) capacitors usually mark the negative lead with a stripe",
}
MARKED_LEAD = {"positive-marked": "the positive lead", "negative-marked": "the negative lead"}


def cautions_for(store: Any, lines: Any) -> tuple[str, ...]:
    """The cautions a plan carries: polarity, stored charge above 50 V, mains positions.

    Read from the parts held for the plan (their stored markings) and from what the lines ask
    (a polarised or mains line carries its caution even when it is short).
    """

    families: dict[str, list[str]] = defaultdict(list)
    marked: list[str] = []
    high_voltage: list[str] = []
    mains: list[str] = []
    seen: set[int] = set()
    for line in lines:
        if not line.tracked:
            continue
        refs = " ".join(line.refs) or f"line {line.line_no}"
        if line.details.get("safety_class") or line.details.get("application") == "mains":
            mains.append(f"{refs} ({line.details.get('safety_class') or 'class not given'})")
        polar_line = line.details.get("polarised")
        if polar_line and line.details.get("family") in POLARITY_MARKS:
            families[line.details["family"]].append(refs)
        elif polar_line and not line.allocations:
            families["unknown"].append(refs)
        for alloc in line.allocations:
            row = store.one("SELECT * FROM parts WHERE bin_id = ?", (alloc.bin_id,))
            if row is None:
                continue
            marking = part_marking(row)
            family = marking.dielectric.family if marking.dielectric else None
            if family in POLARITY_MARKS or marking.polarity:
                if refs not in families[family or "unknown"]:
                    families[family or "unknown"].append(refs)
                if marking.polarity and alloc.bin_id not in seen:
                    marked.append(f"{alloc.bin_key} is marked at {MARKED_LEAD[marking.polarity]}")
            if (marking.voltage_v is not None and marking.voltage_v > HIGH_VOLTAGE_V
                    and alloc.bin_id not in seen):
                high_voltage.append(f"{alloc.bin_key} ({marking.text})")
            seen.add(alloc.bin_id)
    cautions = []
    if families:
        where = "; ".join(f"{refs}" for fam in families for refs in families[fam])
        how = [POLARITY_MARKS[f] for f in POLARITY_MARKS if f in families]
        if how:
            how[0] = how[0][0].upper() + how[0][1:]
        cautions.append("Polarised parts (" + where + "): fit each the right way round. "
                        + ("; ".join(how) + ". " if how else "")
                        + (", ".join(marked) + ". " if marked else "")
                        + "Check each maker's marking and the board's silkscreen; a reversed"
                        " electrolytic or tantalum can overheat, vent or burst.")
    if high_voltage:
        cautions.append("Parts rated above 50 V (" + ", ".join(high_voltage) + "): in a circuit"
                        " they can hold a dangerous charge long after power is removed; discharge"
                        " each through a suitable resistor and check with a meter before handling.")
    if mains:

        cautions.append("Mains positions (" + "; ".join(mains) + "): " + MAINS_CAUTION + ".")
    return tuple(cautions)


# Candidate, choose_bins and GRADE_RANK live in bin_order and natural_key in inventory.bins; they
# are named here too for the callers that know them from this module.
__all__ = ["ALLOWANCES", "GRADE_RANK", "HIGH_VOLTAGE_V", "MARKED_LEAD", "POLARISED_FROM_PF",
           "POLARITY_MARKS", "Candidate", "Verdict", "cautions_for", "check_part", "choose_bins",
           "natural_key"]
