"""Judge one part on the shelf as a stand-in for an original, and say what differs.

:class:`Need` is what :func:`stock.matching.replacement.implied_need` derives from the original;
:func:`judge` checks a shelf part against the parts of it the find machinery does not know
(voltage floor and kind, polarity, safety class coverage, mounting, the trade's substitution rules
and the stability bar) and returns the rule that admitted it or why none did. The value,
tolerance, derating at ``--volts``, job grade and quantity were checked by find already.

>>> from stock.markings.decoder import decode
>>> sorted(part_names(decode("471J C0G 100V")))
['C0G', 'ceramic', 'ceramic-1']
"""

from __future__ import annotations

from dataclasses import dataclass, field
from decimal import Decimal
from typing import Any

from stock.decoded import Marking
from stock.markings.description import describe_dielectric, summary
from stock.markings.safety_classes import read_safety_class
from stock.matching.requirement import Requirement, fmt
from stock.matching.part_checks import tolerance_pct
from stock.matching.search import Combination, Match
from stock.matching.substitutions import (MOUNTING_CHANGES, NEVER_STAND_INS, SAFETY, Substitution,
                                          candidate_rules)
from stock.physics import combining
from stock.physics.grading import Conditions, grade, kind_of, worst_case
from stock.physics.stability import is_polarised
from stock.units import format_capacitance, format_temperature_range, format_tolerance, format_voltage

_ROOT_TWO = Decimal(2).sqrt()
_C0G_TOL = Decimal(30)     # C0G = 0 ± 30 ppm/K (EIA-198, [parameters-page]); NP0 is the same characteristic ([parameters-page], [latvian-codes])
_RULE_RANK = {"like-for-like": 0, "mains-by-class": 0, "upgrade": 2, "fit-for-the-job": 2,
              "less-stable-on-request": 3}   # the trade's named rules rank 1
_GRADE_RANK = {"fit": 0, "marginal": 1, None: 2}
# Kinds chosen for stability, mostly found in tuned circuits (common practice, no published source).
TUNED_KINDS = frozenset({"mica", "polystyrene", "ceramic-1"})


@dataclass(frozen=True)
class Need:
    """What a stand-in must meet, derived from the original (see :mod:`stock.matching.replacement`)."""

    requirement: Requirement          # value, tolerance, --volts, job, safety class: for find
    value_band: tuple[Decimal, Decimal] | None   # the original's own band in pF (None: not marked)
    kind: str | None                  # the original's kind (grading table)
    names: frozenset[str]             # the names the original answers to (kind, code, C0G ...)
    voltage_floor: Decimal | None     # the rating a stand-in must reach, of voltage_kind
    voltage_kind: str | None
    bar_pct: Decimal | None           # the original's worst-case drift at the conditions
    bar_basis: str
    polarised: bool
    polarity: str | None
    mounting: str | None
    package: str | None               # the original bin's package cell, when it came from a bin
    safety_needed: str | None         # an IEC 60384-14 code such as X2 or X1Y2
    use: str | None
    mains: bool
    allow_less_stable: bool
    notes: tuple[str, ...]
    original: Marking

    @property
    def conditions(self) -> Conditions:
        return self.requirement.conditions

    def describe(self) -> str:
        """The need in words: "470 pF ±5 %, rated ≥ 500 V DC, drift ≤ ±0.5 % over 0…+50 °C, ..."."""
        req, o = self.requirement, self.original
        value = format_capacitance(req.capacitance_pf)
        words = [value + (f" {format_tolerance(o.tolerance)}" if self.value_band else " (the same nominal value)")]
        if req.application:
            words.append(f"fit for {req.application}")
        if req.working_v is not None:
            words.append(f"working {fmt(req.working_v)} V (derated)")
        if self.voltage_floor is not None:
            words.append(f"rated ≥ {format_voltage(self.voltage_floor, self.voltage_kind)}")
        c = self.conditions
        if self.bar_pct is not None:
            words.append(f"drift ≤ ±{fmt(self.bar_pct, 3)} % over {format_temperature_range(c.temp_min_c, c.temp_max_c)}"
                         + (" (not enforced: less stable allowed)" if self.allow_less_stable else ""))
        if self.mains:
            words.append(f"across the mains: an X/Y class covering {self.safety_needed}")
        if self.mounting:
            words.append(f"{self.mounting} mounting preferred")
        if self.polarised:
            words.append("polarised original: a non-polarised part may take its place")
        return ", ".join(words)

    def to_json(self) -> dict[str, Any]:
        def f(v: Decimal | None) -> float | None:
            return None if v is None else float(v)
        return {**self.requirement.to_json(), "description": self.describe(),
                "value_min_pf": f(self.value_band[0]) if self.value_band else None,
                "value_max_pf": f(self.value_band[1]) if self.value_band else None,
                "voltage_floor_v": f(self.voltage_floor), "voltage_kind": self.voltage_kind,
                "drift_bar_pct": f(self.bar_pct), "drift_bar_basis": self.bar_basis,
                "kind": self.kind, "polarised": self.polarised, "mounting": self.mounting,
                "package": self.package,
                "mains": self.mains, "safety_needed": self.safety_needed,
                "allow_less_stable": self.allow_less_stable, "notes": list(self.notes)}


@dataclass(frozen=True)
class Verdict:
    """One shelf part judged: admitted (by which rule, with which extra notes) or why not."""

    ok: bool
    rule: Substitution | None = None
    why_not: str | None = None
    extra_rules: tuple[str, ...] = ()
    mounting_note: str | None = None
    drift_pct: Decimal | None = None
    polarised_for_plain: bool = False
    polarity_swap: bool = False


def part_names(m: Marking) -> set[str]:
    """The names a part answers to in the substitution table: kind, family, code, C0G, safety."""
    names: set[str] = set()
    kind = kind_of(m)
    if kind:
        names.add(kind)
    d = m.dielectric
    if d is not None:
        names.update((d.code, d.family))
        if d.klass == 1 and d.tempco_ppm_per_k == 0 and (d.tempco_tol_ppm_per_k or 0) <= _C0G_TOL:
            names.add("C0G")
    if m.safety_class:
        names.add(SAFETY)
    return names


def _drift(m: Marking, conditions: Conditions) -> Decimal | None:
    budget = worst_case(m, conditions)
    if budget.temperature is None:
        return None
    return max(budget.drift_minus_pct, budget.drift_plus_pct)


def _voltage_refusal(need: Need, m: Marking, in_series: bool) -> str | None:
    """Why the part's rating does not reach the original's (or the kind is wrong), else None."""
    if need.voltage_floor is None:
        return None
    floor, kind = need.voltage_floor, need.voltage_kind
    want = format_voltage(floor, kind)
    if m.voltage_v is None:
        return f"rated voltage not marked (the original's is {want})"
    have_kind = m.voltage_kind or "DC"
    have = format_voltage(m.voltage_v, have_kind)
    if kind == "AC" and have_kind != "AC":
        return f"rated {have}: the position needs an AC rating of at least {want}"
    if in_series:
        return None        # the pair's own rating is checked against the floor
    if kind == "AC" or have_kind == "DC":
        return None if m.voltage_v >= floor else f"rated {have}, below the original's {want}"
    peak = m.voltage_v * _ROOT_TWO     # an AC rating's peak must reach a DC rating: common practice
    return None if peak >= floor else f"rated {have} (peak {fmt(peak, 0)} V), below the original's {want}"


def _mounting(need: Need, mounting: str | None) -> tuple[bool, str | None]:
    """(allowed, note) for the part's mounting against the original's."""
    if need.mounting is None or mounting is None or mounting == need.mounting:
        return True, None
    key = (need.mounting, mounting)
    if key in MOUNTING_CHANGES and MOUNTING_CHANGES[key] is None:
        return False, f"{mounting} part for a {need.mounting} position: not offered"
    return True, MOUNTING_CHANGES.get(key) or f"{mounting} mounting where the original was {need.mounting}"


def _admits(rule: Substitution, need: Need, m: Marking, drift: Decimal | None) -> str | None:
    """None when the rule admits the part, else why not."""
    if rule.admits == "class":
        return None
    if rule.admits == "asked":
        return None if need.allow_less_stable else "less stable than the original (not offered unless asked)"
    if rule.admits == "job":
        return None if need.bar_pct is None and need.use else "the original's stability is known: it is the bar"
    if rule.admits.startswith("fit:"):
        job = rule.admits.removeprefix("fit:")
        g = grade(m, job, need.conditions)
        return None if g.word == "fit" else f"{rule.name} asks a part fit for {job}; this one is {g.word}"
    if need.bar_pct is None:
        return "cannot be compared with the original, whose stability is not known"
    if drift is None:
        return "its stability is not known (dielectric not marked)"
    if drift > need.bar_pct:
        c = need.conditions
        return (f"drifts up to ±{fmt(drift, 3)} % over {format_temperature_range(c.temp_min_c, c.temp_max_c)}, "
                f"more than the original's ±{fmt(need.bar_pct, 3)} % (less stable)")
    return None


def _rule(need: Need, m: Marking, drift: Decimal | None) -> tuple[Substitution | None, str | None]:
    """The first substitution rule that fits and admits the part, or why none did."""
    first_refusal = None
    for rule in candidate_rules(set(need.names), need.kind, part_names(m), mains=need.mains, use=need.use):
        refusal = _admits(rule, need, m, drift)
        if refusal is None:
            return rule, None
        first_refusal = first_refusal or refusal
    return None, first_refusal or "no rule of the trade lets this kind stand in for the original"


def _band_refusal(need: Need, m: Marking) -> str | None:
    """Why a part's marked band may leave the original's band (asymmetric ones too), else None."""
    lo, hi = need.value_band
    tol = tolerance_pct(m)
    if tol is None or m.capacitance_pf is None:
        return "no marked tolerance: it cannot promise the original's band"
    p_lo, p_hi = combining.band(m.capacitance_pf, *tol)
    if p_lo < lo or p_hi > hi:
        return (f"may deliver {format_capacitance(p_lo)}…{format_capacitance(p_hi)}, outside the original's "
                f"{format_capacitance(lo)}…{format_capacitance(hi)}")
    return None


def judge(need: Need, m: Marking, mounting: str | None, *, in_series: bool = False,
          in_pair: bool = False) -> Verdict:
    """Whether a shelf part may stand in for the original, by which rule, or why not."""
    kind = kind_of(m)
    if kind in NEVER_STAND_INS:
        return Verdict(False, why_not=NEVER_STAND_INS[kind])
    family = m.dielectric.family if m.dielectric else None
    polarised = is_polarised(family, m.polarity)
    if polarised and not need.polarised and (need.mains or need.voltage_kind == "AC"):
        return Verdict(False, why_not="polarised: never on AC or across the mains")
    refusal = _voltage_refusal(need, m, in_series)
    if refusal:
        return Verdict(False, why_not=refusal)
    if need.safety_needed:
        have = read_safety_class(m.safety_class or "")
        if have is None:
            return Verdict(False, why_not="no X/Y safety class: never across the mains (IEC 60384-14)")
        if not have.covers(need.safety_needed):
            return Verdict(False, why_not=f"class {have.code} does not cover {need.safety_needed} (IEC 60384-14)")
    if need.value_band is not None and not in_pair:
        refusal = _band_refusal(need, m)
        if refusal:
            return Verdict(False, why_not=refusal)
    allowed, note = _mounting(need, mounting)
    if not allowed:
        return Verdict(False, why_not=note)
    drift = _drift(m, need.conditions)
    rule, why = _rule(need, m, drift)
    if rule is None:
        return Verdict(False, why_not=why)
    extra = ()
    if note and (need.mounting, mounting) in MOUNTING_CHANGES:
        extra = (f"{need.mounting}-to-{mounting}",)
    swap = bool(polarised and need.polarised and m.polarity and need.polarity and m.polarity != need.polarity)
    return Verdict(True, rule, None, extra, note, drift, polarised and not need.polarised, swap)


def _alpha(m: Marking) -> str | None:
    d = m.dielectric
    if d is None or d.tempco_ppm_per_k is None:
        return None
    text = ("+" if d.tempco_ppm_per_k > 0 else "") + fmt(d.tempco_ppm_per_k)
    return text + (f"±{fmt(d.tempco_tol_ppm_per_k)}" if d.tempco_tol_ppm_per_k is not None else "") + " ppm/K"


def _kind_text(m: Marking) -> str:
    d = m.dielectric
    if d is not None:
        return d.code
    return f"{m.safety_class} safety part (dielectric not marked)" if m.safety_class else "dielectric not marked"


def differences(need: Need, m: Marking, verdict: Verdict) -> tuple[str, ...]:
    """What differs from the original: kind, tempco, drift, tolerance, value, voltage, polarity, mounting."""
    o = need.original
    out: list[str] = []
    if kind_of(m) != kind_of(o) or kind_of(m) is None:
        if _kind_text(m) != _kind_text(o):
            out.append(f"{_kind_text(m)} in place of {_kind_text(o)}")
    a_new, a_old = _alpha(m), _alpha(o)
    if a_new and a_old and a_new != a_old:
        shift = m.dielectric.tempco_ppm_per_k - o.dielectric.tempco_ppm_per_k
        out.append(f"tempco {a_new} against the original's {a_old}"
                   + (f" (a shift of {'+' if shift > 0 else ''}{fmt(shift)} ppm/K: check the alignment)"
                      if shift and (need.kind in TUNED_KINDS or need.use == "tuned") else ""))
    elif m.dielectric and o.dielectric and m.dielectric.code != o.dielectric.code and not a_new:
        out.append(f"{describe_dielectric(m.dielectric)} against the original's {describe_dielectric(o.dielectric)}")
    if verdict.drift_pct is not None and need.bar_pct is not None and verdict.drift_pct != need.bar_pct:
        c = need.conditions
        out.append(f"drift ±{fmt(verdict.drift_pct, 3)} % against the original's ±{fmt(need.bar_pct, 3)} % "
                   f"over {format_temperature_range(c.temp_min_c, c.temp_max_c)}")
    t_new = format_tolerance(m.tolerance) if m.tolerance else "not marked"
    t_old = format_tolerance(o.tolerance) if o.tolerance else "not marked"
    if t_new != t_old:
        out.append(f"tolerance {t_new} against {t_old}")
    if m.capacitance_pf != o.capacitance_pf and m.capacitance_pf is not None:
        out.append(f"{format_capacitance(m.capacitance_pf)} nominal against {format_capacitance(o.capacitance_pf)}")
    out.extend(_rating_differences(need, m))
    out.extend(_polarity_differences(need, m, verdict))
    if verdict.mounting_note:
        out.append(verdict.mounting_note)
    if m.safety_class and o.safety_class and m.safety_class != o.safety_class:
        out.append(f"class {m.safety_class} against {o.safety_class}")
    return tuple(out)


def _rating_differences(need: Need, m: Marking) -> list[str]:
    o, out = need.original, []
    if m.voltage_v is not None and (m.voltage_v, m.voltage_kind) != (o.voltage_v, o.voltage_kind):
        have = format_voltage(m.voltage_v, m.voltage_kind)
        if o.voltage_v is None:
            out.append(f"rated {have}; the original's rating was not marked")
        else:
            larger = m.voltage_v > o.voltage_v and m.voltage_kind == o.voltage_kind
            out.append(f"rated {have} against the original's {format_voltage(o.voltage_v, o.voltage_kind)}"
                       + (" (higher is allowed; the body may be larger)" if larger else ""))
    if m.rated_temp_c is not None and o.rated_temp_c is not None and m.rated_temp_c < o.rated_temp_c:
        out.append(f"rated to {fmt(m.rated_temp_c)} °C against the original's {fmt(o.rated_temp_c)} °C")
    return out


def _polarity_differences(need: Need, m: Marking, verdict: Verdict) -> list[str]:
    family = m.dielectric.family if m.dielectric else None
    polarised = is_polarised(family, m.polarity)
    if need.polarised and not polarised:
        return ["not polarised: it fits either way round"]
    if verdict.polarised_for_plain:
        return ["polarised where the original was not: see the cautions"]
    if verdict.polarity_swap:
        return [f"{m.polarity} where the original was {need.polarity}: fit it by the circuit's polarity"]
    return []


@dataclass(frozen=True)
class PartUse:
    """One shelf bin's part in a stand-in: how many, and its facts."""

    bin_key: str
    location: str | None
    marking: Marking
    count: int
    available: int | None = None
    mounting: str | None = None
    package: str | None = None

    def to_json(self) -> dict[str, Any]:
        return {"bin": self.bin_key, "location": self.location, "marking": self.marking.text,
                "summary": summary(self.marking), "facts": self.marking.to_json(), "count": self.count,
                "available": self.available, "mounting": self.mounting, "package": self.package}


@dataclass(frozen=True)
class StandIn:
    """A stand-in: one part, or a parallel/series pair, with the rule that allowed it and what differs."""

    arrangement: str                     # "single", "parallel" or "series"
    parts: tuple[PartUse, ...]
    capacitance_pf: Decimal
    rule: Substitution
    differences: tuple[str, ...]
    checks: tuple[str, ...]              # find's reasons (value, rating, grade, quantity)
    grade: str | None = None
    value_error_pct: Decimal = Decimal(0)
    extra_rules: tuple[str, ...] = ()
    polarised_for_plain: bool = False
    polarity_swap: bool = False
    mounting_differs: bool = False
    drift_pct: Decimal | None = None
    pair_rules: tuple[Substitution, ...] = field(default=())

    def to_json(self) -> dict[str, Any]:
        first = self.parts[0]
        return {"arrangement": self.arrangement, "bin": first.bin_key, "marking": first.marking.text,
                "facts": first.marking.to_json(), "parts": [p.to_json() for p in self.parts],
                "capacitance_pf": float(self.capacitance_pf), "grade": self.grade,
                "rule": self.rule.to_json(), "rules": [r.to_json() for r in (self.pair_rules or (self.rule,))],
                "other_rules": list(self.extra_rules), "differences": list(self.differences),
                "checks": list(self.checks),
                "drift_pct": None if self.drift_pct is None else float(self.drift_pct)}


def _package_difference(need: Need, package: str | None) -> tuple[str, ...]:
    """The size the sheets give, when both the original's bin and the stand-in's name one."""
    if need.package and package and need.package.strip().lower() != package.strip().lower():
        return (f"package {package} against the original's {need.package}: check that it fits",)
    return ()


def single_stand_in(match: Match, m: Marking, mounting: str | None, verdict: Verdict, need: Need,
                    package: str | None = None) -> StandIn:
    part = PartUse(match.bin_key, match.location, m, 1, match.available, mounting, package)
    return StandIn("single", (part,), m.capacitance_pf, verdict.rule,
                   differences(need, m, verdict) + _package_difference(need, package),
                   match.reasons, match.grade, match.value_error_pct, verdict.extra_rules,
                   verdict.polarised_for_plain, verdict.polarity_swap, verdict.mounting_note is not None,
                   verdict.drift_pct)


def pair_stand_in(combo: Combination, shelf: list[tuple[Marking, str | None, str | None]],
                  verdicts: list[Verdict], need: Need) -> StandIn:
    parts = tuple(PartUse(p.bin_key, None, m, p.count, None, mount, package)
                  for p, (m, mount, package) in zip(combo.parts, shelf))
    diffs: list[str] = []
    for part, verdict in zip(parts, verdicts):
        diffs.extend(f"{part.bin_key}: {d}" for d in differences(need, part.marking, verdict)
                     if "nominal against" not in d)
    drifts = [v.drift_pct for v in verdicts]
    rules = tuple(dict.fromkeys(v.rule for v in verdicts))
    rank_rule = max(rules, key=lambda r: _RULE_RANK.get(r.name, 1))
    return StandIn(combo.kind, parts, combo.capacitance_pf, rank_rule, tuple(dict.fromkeys(diffs)),
                   combo.reasons, combo.grade, combo.value_error_pct,
                   tuple(dict.fromkeys(e for v in verdicts for e in v.extra_rules)),
                   any(v.polarised_for_plain for v in verdicts), any(v.polarity_swap for v in verdicts),
                   any(v.mounting_note for v in verdicts),
                   None if None in drifts else max(drifts), rules)


def stand_in_rank(s: StandIn) -> tuple[Any, ...]:
    """Best first: no polarity worry, best grade, like for like before the trade's rules before
    upgrades, nearest value, same mounting, least drift, nearest rating, bin."""
    volts = min((p.marking.voltage_v for p in s.parts if p.marking.voltage_v is not None), default=None)
    return (s.polarised_for_plain, _GRADE_RANK.get(s.grade, 2), _RULE_RANK.get(s.rule.name, 1),
            s.value_error_pct, s.mounting_differs, s.drift_pct if s.drift_pct is not None else Decimal("Infinity"),
            volts if volts is not None else Decimal("Infinity"), tuple(p.bin_key for p in s.parts))


__all__ = ["TUNED_KINDS", "Need", "PartUse", "StandIn", "Verdict", "differences", "judge", "pair_stand_in", "part_names",
           "single_stand_in", "stand_in_rank"]
