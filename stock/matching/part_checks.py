"""Whether one stored part meets a requirement, constraint by constraint, and why not.

What "meets" means is set out in :mod:`stock.matching.requirement`; :mod:`stock.matching.search`
runs these checks over the shelf.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from decimal import Decimal
from functools import lru_cache

from stock.physics import combining
from stock.decoded import Dielectric, Marking
from stock.markings.ceramic_codes import assumed_tempco_tolerance
from stock.markings.safety_classes import (covers, positions_text,
                                           read_safety_class)
from stock.physics.grading import grade, worst_case
from stock.units import format_capacitance, format_tolerance

from stock.matching.requirement import Requirement, _signed, fmt, tempco_tolerance

_HUNDRED = Decimal(100)


@dataclass(frozen=True)
class Stocked:
    """A stored part with its bin and how many of it may be promised."""

    bin_id: int
    bin_key: str
    location: str | None
    on_hand: int | None
    reserved: int
    marking: Marking

    @property
    def available(self) -> int:
        return max(0, (self.on_hand or 0) - self.reserved)


@dataclass(frozen=True)
class Verdict:
    """The outcome of checking one part: passed, why (or which constraint failed first), grade."""

    ok: bool
    reasons: tuple[str, ...]
    failed: str | None = None       # short name of the first failed constraint, for explanations
    grade: str | None = None


# A pass with nothing to report (no tempco window, no per-part constraint asked for): one shared
# frozen value, since a plain value search meets it once per candidate row.
_PASSED = Verdict(True, ())


def _same_dielectric(wanted: Dielectric, have: Dielectric | None) -> bool:
    """Whether a part's dielectric is the one asked for or an equivalent (NP0 for C0G)."""
    if have is None:
        return False
    if have.code == wanted.code:
        return True
    if wanted.klass == 1 and have.klass == 1 and wanted.tempco_ppm_per_k is not None:
        if have.tempco_ppm_per_k != wanted.tempco_ppm_per_k:
            return False
        # An old name with no tolerance matches its EIA code; a wider stated tolerance does not.
        return (have.tempco_tol_ppm_per_k is None or wanted.tempco_tol_ppm_per_k is None
                or have.tempco_tol_ppm_per_k <= wanted.tempco_tol_ppm_per_k)
    return False


def check_part(m: Marking, req: Requirement, *, working_v: Decimal | None) -> Verdict:
    """Check everything a part must meet on its own, whatever it is combined with.

    Family, dielectric code, safety class, rated temperature, voltage (``working_v`` is what this part
    sees) and application grade. Value, tempco window and quantity are checked by the caller, since a
    pair meets them together.
    """
    reasons: list[str] = []
    diel = m.dielectric
    if req.family and (diel is None or diel.family != req.family):
        return Verdict(False, (f"{diel.family if diel else 'family not marked'}, not {req.family}",), "family")
    wanted = req.dielectric()
    if wanted is not None:
        if not _same_dielectric(wanted, diel):
            return Verdict(False, (f"{diel.code if diel else 'dielectric not marked'}, not {wanted.code}",),
                           "dielectric")
        reasons.append(f"{diel.code} serves as {wanted.code}" if diel.code != wanted.code else diel.code)
    if req.is_mains():
        refused = _safety_refusal(m, req)
        if refused is not None:
            return Verdict(False, (refused,), "safety")
        needed = req.needed_safety()
        if needed:
            reasons.append(covers(m.safety_class, needed, *_ac_ratings(m, req)).reason)
    cond = req.conditions
    if m.rated_temp_c is not None and cond.temp_max_c > m.rated_temp_c:
        return Verdict(False, (f"rated to {_signed(m.rated_temp_c)} °C, below {_signed(cond.temp_max_c)} °C",),
                       "temperature")
    if diel is not None and diel.klass == 2 and diel.temp_min_c is not None and diel.temp_max_c is not None:
        if cond.temp_min_c < diel.temp_min_c or cond.temp_max_c > diel.temp_max_c:
            return Verdict(False, (f"{diel.code} covers {_signed(diel.temp_min_c)}…{_signed(diel.temp_max_c)} °C only",),
                           "temperature")
    if working_v is not None:
        if m.voltage_v is None:
            return Verdict(False, ("rated voltage not marked",), "voltage")
        check = worst_case(m, replace(cond, working_v=working_v)).voltage
        if check is None or check.word == "unfit" or (check.word == "marginal" and not req.allow_marginal):
            why = check.reason if check else f"rated {fmt(m.voltage_v)} V"
            return Verdict(False, (why,), "voltage")
        reasons.append(check.reason)
    word = None
    if req.application:
        g = grade(m, req.application, replace(cond, working_v=working_v, position=req.mains_position()))
        word = g.word
        if word not in ("fit", "marginal") or (word == "marginal" and not req.allow_marginal):
            return Verdict(False, tuple(g.reasons[:2]) or (f"{word} for {req.application}",),
                           "application", word)
        reasons.append(g.reasons[0] if g.reasons else f"{word} for {req.application}")
        reasons.extend(f"doubt: {d}" for d in g.doubts)
    if not reasons and word is None:
        return _PASSED
    return Verdict(True, tuple(reasons), None, word)


def _ac_ratings(m: Marking, req: Requirement) -> tuple[Decimal | None, Decimal | None]:
    """The part's marked AC rating and the position's AC working voltage (a mains ``--volts``)."""
    part_ac = m.voltage_v if m.voltage_kind == "AC" else None
    return part_ac, req.working_v


def _safety_refusal(m: Marking, req: Requirement) -> str | None:
    """Why a part may not take this mains position (the real cause), or None when it may."""
    needed = req.needed_safety()
    if needed:
        verdict = covers(m.safety_class, needed, *_ac_ratings(m, req))
        return None if verdict.ok else verdict.reason
    have = read_safety_class(m.safety_class) if m.safety_class else None
    if have is None:
        return "no X/Y safety class (IEC 60384-14): never across the mains or to earth"
    where = req.mains_position()
    if where == "line-earth" and "line-earth" not in have.positions():
        return f"{have.code} is an X class: a line–earth position needs a Y class (IEC 60384-14)"
    part_ac = _ac_ratings(m, req)[0]
    if where == "line-line" and "line-line" not in have.positions(part_ac, req.working_v):
        return f"{have.code} may not take a line–line position: {positions_text(have.code, part_ac, req.working_v)}"
    return None


def tolerance_pct(m: Marking) -> tuple[Decimal, Decimal] | None:
    """A part's marked tolerance as (minus %, plus %), or None when not marked (or value unknown)."""
    if m.tolerance is None or m.capacitance_pf is None:
        return None
    return m.tolerance.as_percent(m.capacitance_pf)


# Part values repeat across bins (E-series): each reason's text is worked out once per value.
_cap_text = lru_cache(maxsize=8192)(format_capacitance)
_tol_text = lru_cache(maxsize=1024)(format_tolerance)


def check_value(m: Marking, req: Requirement) -> Verdict:
    """Whether a single part delivers the value: its whole tolerance band inside the requirement."""
    c = m.capacitance_pf
    if c is None:
        return Verdict(False, ("value not decoded",), "value")
    lo, hi = req.value_window()
    if req.tol_pct is None:
        if not lo <= c <= hi:
            return Verdict(False, (f"{_cap_text(c)} is not {_cap_text(req.capacitance_pf)}",),
                           "value")
        return Verdict(True, (f"{_cap_text(c)} nominal",))
    tol = tolerance_pct(m)
    if tol is None:
        return Verdict(False, (f"{_cap_text(c)} with no marked tolerance cannot promise "
                               f"±{fmt(req.tol_pct)} %",), "tolerance")
    p_lo, p_hi = combining.band(c, *tol)
    if p_lo < lo or p_hi > hi:
        return Verdict(False, (f"{_cap_text(c)} {_tol_text(m.tolerance)} may deliver "
                               f"{_cap_text(p_lo)}…{_cap_text(p_hi)}, outside "
                               f"{_cap_text(lo)}…{_cap_text(hi)}",), "tolerance")
    return Verdict(True, (f"{_cap_text(c)} {_tol_text(m.tolerance)} delivers "
                          f"{_cap_text(p_lo)}…{_cap_text(p_hi)}, within ±{fmt(req.tol_pct)} %",))


def check_tempco(m: Marking, req: Requirement) -> Verdict:
    """Whether a single part's α band lies in the requirement's tempco window."""
    window = req.tempco_window()
    if window is None:
        return _PASSED
    diel = m.dielectric
    if diel is None or diel.tempco_ppm_per_k is None:
        what = diel.code if diel else "dielectric not marked"
        return Verdict(False, (f"{what}: no linear tempco",), "tempco")
    alpha, tol = diel.tempco_ppm_per_k, tempco_tolerance(diel)
    a_lo, a_hi = alpha - tol, alpha + tol
    note = ("" if diel.tempco_tol_ppm_per_k is not None else
            f" (tolerance on α not marked: ±{fmt(tol)} assumed, {assumed_tempco_tolerance(alpha)[1]})")
    if a_lo < window[0] or a_hi > window[1]:
        return Verdict(False, (f"{diel.code} α {fmt(alpha)}±{fmt(tol)} ppm/K outside {window_text(window)}{note}",),
                       "tempco")
    return Verdict(True, (f"α {fmt(alpha)}±{fmt(tol)} ppm/K within {window_text(window)}{note}",))


@lru_cache(maxsize=256)
def window_text(window: tuple[Decimal, Decimal]) -> str:
    """A tempco window in words: "−330…−270 ppm/K", "≤ 100 ppm/K"."""
    lo, hi = window
    if lo.is_infinite():
        return f"≤ {fmt(hi)} ppm/K"
    if hi.is_infinite():
        return f"≥ {fmt(lo)} ppm/K"
    return f"{fmt(lo)}…{fmt(hi)} ppm/K"


def check_nominal(m: Marking, req: Requirement) -> Verdict:
    """For a part with no marked tolerance: whether its nominal lies in the requirement's window.

    Such a part is no proven match for a tolerance; it is a part to measure.
    """
    c = m.capacitance_pf
    lo, hi = req.value_window()
    if c is None or not lo <= c <= hi:
        return Verdict(False, ("value outside the window",), "value")
    return Verdict(True, (f"{_cap_text(c)} nominal, tolerance not marked: measure it before fitting"
                          f" (it must read {_cap_text(lo)}…{_cap_text(hi)})",))


def check_single(part: Stocked, req: Requirement, *, to_measure: bool = False) -> Verdict:
    """Every constraint a single part must meet, in the order an explanation reports them.

    With ``to_measure``, the value check is :func:`check_nominal` (a part with no marked tolerance).
    """
    reasons: list[str] = []
    word = None
    m = part.marking
    for check in ((check_nominal, check_tempco) if to_measure else (check_value, check_tempco)):
        verdict = check(m, req)
        if not verdict.ok:
            return verdict
        reasons.extend(verdict.reasons)
    verdict = check_part(m, req, working_v=req.working_v)
    if not verdict.ok:
        return verdict
    reasons.extend(verdict.reasons)
    word = verdict.grade
    available = part.available
    if available < req.qty:
        return Verdict(False, (f"{available} available, {req.qty} needed",), "quantity")
    reasons.append(f"{available} available" + (f" ({part.reserved} reserved)" if part.reserved else ""))
    return Verdict(True, tuple(reasons), None, word)


__all__ = ["Stocked", "Verdict", "check_nominal", "check_part", "check_single", "check_tempco", "check_value",
           "tolerance_pct", "window_text"]
