"""Find parts on hand for a requirement: single parts first, then parallel and series pairs.

:func:`find` answers a :class:`~stock.requirement.Requirement` (re-exported here) with the single
parts that meet every constraint (:class:`Match`), optionally the two-part combinations that do
(:class:`Combination`), and, when nothing does, which constraint ruled out the nearest parts and the
preferred value (IEC 60063) to buy. What "meets" means is set out in :mod:`stock.requirement`.

Singles: an indexed SQL pre-filter (capacitance window, family, safety class, voltage, tolerance
and tempco bands, quantity), then every row is checked exactly. Pairs: :mod:`stock.matching.pairs`.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from decimal import Decimal
from typing import Any

from stock.physics import combining
from stock.inventory.bins import stored_marking
from stock.decoded import Marking
from stock.errors import BadValue
from stock.markings.preferred_values import nearest, series_for_tolerance
from stock.matching.requirement import (DEFAULT_BUY_TOL_PCT, NOMINAL_MATCH_PCT, SAFETY_CAUTION, Requirement,
                                        build_requirement, parse_tempco_window)
from stock.matching.part_checks import (Stocked, Verdict, check_part, check_single, check_tempco, check_value,
                                        tolerance_pct)
from stock.matching.shelf import GRADE_RANK, SHELF_SELECT, stocked, value_error
from stock.matching.pairs import Combination, PairPart, PairSearch, check_pair
from stock.store.database import Store
from stock.units import format_capacitance

_HUNDRED = Decimal(100)


@dataclass(frozen=True)
class Match:
    """One bin whose part meets the requirement on its own."""

    bin_id: int
    bin_key: str
    location: str | None
    marking: str
    capacitance_pf: Decimal
    available: int
    grade: str | None               # "fit"/"marginal" for the application; None when none was named
    reasons: tuple[str, ...]        # why it qualifies
    decoded: Marking | None = None  # the part's full marking (polarity, class ...) for callers
    value_error_pct: Decimal = Decimal(0)

    def to_json(self) -> dict[str, Any]:
        return {"bin": self.bin_key, "location": self.location, "marking": self.marking,
                "capacitance_pf": float(self.capacitance_pf), "available": self.available,
                "grade": self.grade, "reasons": list(self.reasons)}


@dataclass(frozen=True)
class FindResult:
    """The answer to one requirement."""

    requirement: Requirement
    matches: tuple[Match, ...]
    combinations: tuple[Combination, ...]
    explanation: tuple[str, ...]
    suggestion: str | None
    cautions: tuple[str, ...] = ()
    to_measure: tuple[Match, ...] = ()   # no marked tolerance: not proven, named after the matches

    def to_json(self) -> dict[str, Any]:
        """The ``stock find --json`` shape (stable contract)."""
        return {"requirement": self.requirement.to_json(),
                "matches": [m.to_json() for m in self.matches],
                "to_measure": [m.to_json() for m in self.to_measure],
                "combinations": [c.to_json() for c in self.combinations],
                "explanation": list(self.explanation), "suggestion": self.suggestion,
                "cautions": list(self.cautions)}


_TIGHT = 1e-9  # relative slack on SQL pre-filters: floats there, exact checks after


def _where(req: Requirement, lo: float | None, hi: float | None, *, strict: bool,
           single: bool) -> tuple[list[str], list[Any]]:
    """SQL conditions every qualifying part meets (necessary, never sufficient: exact checks follow).

    ``strict`` adds the per-part filters; ``single`` also the ones only a lone part must meet (its
    whole tolerance band inside the value window, its α band inside the tempco window, its rating).
    """
    where, params = ["p.capacitance_pf IS NOT NULL"], []
    if lo is not None:
        where.append("p.capacitance_pf >= ?")
        params.append(lo * (1 - _TIGHT))
    if hi is not None:
        where.append("p.capacitance_pf <= ?")
        params.append(hi * (1 + _TIGHT))
    if not strict:
        return where, params
    if req.family:
        where.append("p.family = ?")
        params.append(req.family)
    if req.is_mains():
        where.append("p.safety_class IS NOT NULL")
    window = req.tempco_window()
    if window is not None:
        where.append("p.tempco_ppm_per_k IS NOT NULL")
    if req.tol_pct is not None:
        where.append("p.tol_minus IS NOT NULL AND p.tol_plus IS NOT NULL")
    where.append("COALESCE(b.on_hand, 0) >= ?")
    params.append(req.qty)
    if single:
        if req.tol_pct is not None and lo is not None and hi is not None:
            where.append("((p.tol_unit = '%' AND p.capacitance_pf * (1 - p.tol_minus / 100.0) >= ?"
                         " AND p.capacitance_pf * (1 + p.tol_plus / 100.0) <= ?) OR (p.tol_unit = 'pF'"
                         " AND p.capacitance_pf - p.tol_minus >= ? AND p.capacitance_pf + p.tol_plus <= ?))")
            band = [lo * (1 - _TIGHT), hi * (1 + _TIGHT)]
            params.extend(band + band)
        if window is not None:
            if window[0].is_finite():
                where.append("p.tempco_ppm_per_k - COALESCE(p.tempco_tol_ppm_per_k, 0) >= ?")
                params.append(float(window[0]) - 1e-6)
            if window[1].is_finite():
                where.append("p.tempco_ppm_per_k + COALESCE(p.tempco_tol_ppm_per_k, 0) <= ?")
                params.append(float(window[1]) + 1e-6)
        if req.working_v is not None:
            where.append("p.voltage_v >= ?")
            params.append(float(req.working_v) * (1 - _TIGHT))
    return where, params


def _query(store: Store, req: Requirement, lo: float | None, hi: float | None, *,
           strict: bool) -> list[dict[str, Any]]:
    """Whole rows (with the decoded JSON) of the parts in a value range that may qualify alone."""
    where, params = _where(req, lo, hi, strict=strict, single=True)
    sql = f"SELECT * FROM ({SHELF_SELECT} WHERE {' AND '.join(where)})"
    if strict:
        sql += " WHERE COALESCE(on_hand, 0) - reserved >= ?"
        params.append(req.qty)
    return store.rows(sql, params)


# The columns a single-part search needs, as plain tuples (no dict per row): bin, JSON, reserved.
_CANDIDATE_SELECT = (
    "SELECT b.id, b.bin_key, b.location, b.on_hand, p.decoded_json, p.settled_json,"
    " s.held AS reserved"
    " FROM parts p JOIN bins b ON b.id = p.bin_id JOIN bin_stock s ON s.bin_id = b.id")


def candidates(store: Store, req: Requirement, *, to_measure: bool = False) -> list[Match]:
    """The single parts that meet the requirement, best first (value error, grade, spare, bin).

    The SQL pre-filter takes the capacitance window and the indexed per-part filters; every row is
    then checked exactly with :func:`check_single`. With ``to_measure`` (a requirement with a
    tolerance only), the parts whose tolerance is not marked but whose nominal is in the window:
    no proven matches, parts to measure.
    """
    lo, hi = req.value_window()
    if to_measure:
        if req.tol_pct is None:
            return []
        where, params = _where(replace(req, tol_pct=None), float(lo), float(hi), strict=True, single=True)
        where.append("(p.tol_minus IS NULL OR p.tol_plus IS NULL)")
    else:
        where, params = _where(req, float(lo), float(hi), strict=True, single=True)
    sql = (f"SELECT * FROM ({_CANDIDATE_SELECT} WHERE {' AND '.join(where)})"
           " WHERE COALESCE(on_hand, 0) - reserved >= ?")
    target, qty = req.capacitance_pf, req.qty
    found = []
    for bin_id, bin_key, location, on_hand, decoded, settled, reserved in store.db.conn.execute(
            sql, (*params, qty)):
        part = Stocked(bin_id, bin_key, location, on_hand, int(reserved), stored_marking(decoded, settled))
        if to_measure and tolerance_pct(part.marking) is not None:
            continue
        verdict = check_single(part, req, to_measure=to_measure)
        if verdict.ok:
            c = part.marking.capacitance_pf
            found.append(Match(bin_id, bin_key, location, part.marking.text, c, part.available,
                               verdict.grade, verdict.reasons, part.marking, value_error(c, target)))
    found.sort(key=lambda m: (m.value_error_pct, GRADE_RANK[m.grade], -(m.available - qty), m.bin_key))
    return found


def linear_tempco_parts(store: Store) -> list[Stocked]:
    """Every Class 1 ceramic on hand with a stated tempco and at least one part available, by value.

    The flat columns pre-filter; the stored marking (a settled reading wins) has the last word.
    """
    sql = (f"{SHELF_SELECT} WHERE p.class = 1 AND p.tempco_ppm_per_k IS NOT NULL AND p.capacitance_pf > 0"
           " AND s.available > 0 ORDER BY p.capacitance_pf, b.bin_key")
    found = []
    for row in store.rows(sql):
        part = stocked(row)
        d = part.marking.dielectric
        if (d is not None and d.klass == 1 and d.tempco_ppm_per_k is not None
                and part.marking.capacitance_pf is not None and part.marking.capacitance_pf > 0):
            found.append(part)
    return found


def _explain(store: Store, req: Requirement, pairs: PairSearch | None) -> tuple[str, ...]:
    """Which constraints ruled out the parts nearest in value (grouped by value, then by cause)."""
    target = req.capacitance_pf
    rows = _query(store, req, float(target) / 2, float(target) * 2, strict=False)
    if not rows:
        return (f"no part between {format_capacitance(target / 2)} and {format_capacitance(target * 2)} "
                "is in stock",)
    rows.sort(key=lambda r: (max(r["capacitance_pf"] / float(target), float(target) / r["capacitance_pf"]),
                             r["bin_key"]))
    groups: dict[Decimal, list[tuple[Stocked, Verdict]]] = {}
    for row in rows:
        part = stocked(row)
        c = part.marking.capacitance_pf
        if c is None:
            continue
        if c not in groups and len(groups) >= 3:
            break
        groups.setdefault(c, []).append((part, check_single(part, req)))
    lines = []
    for c, checked in groups.items():
        causes: dict[str, list[tuple[Stocked, Verdict]]] = {}
        for part, verdict in checked:
            cause = verdict.failed or "none"
            if cause == "safety":   # each safety reason names its own cause: never group them
                cause = f"safety: {verdict.reasons[0]}"
            causes.setdefault(cause, []).append((part, verdict))
        for cause, members in causes.items():
            n = len(members)
            codes = sorted({p.marking.dielectric.code if p.marking.dielectric else "dielectric not marked"
                            for p, _ in members})
            what = (f"all {codes[0]}" if len(codes) == 1 and n > 1 else ", ".join(codes))
            if cause == "none":
                lines.append(f"{n} part{'s' if n > 1 else ''} at {format_capacitance(c)} ({what}) would do")
                continue
            reason = members[0][1].reasons[0] if members[0][1].reasons else cause
            bins = ", ".join(p.bin_key for p, _ in members[:5]) + (" …" if n > 5 else "")
            lines.append(f"{n} part{'s' if n > 1 else ''} at {format_capacitance(c)}, {what} "
                         f"(bin{'s' if n > 1 else ''} {bins}): {reason}")
    if req.is_mains():
        lines.append("no pair may fill an X/Y position: in series on AC the smaller part carries nearly"
                     " all the voltage, and a pair carries no safety rating (IEC 60384-14)")
    elif pairs is not None:
        if pairs.nearest_rejected is not None:
            lines.append(pairs.nearest_rejected[1])
        else:
            lo, hi = req.value_window()
            lines.append(f"no two parts on hand make {format_capacitance(lo)}…{format_capacitance(hi)} in "
                         "parallel or series while meeting the per-part constraints"
                         + (" and the tempco window" if req.tempco_window() else ""))
    return tuple(lines)


def _suggestion(req: Requirement) -> str:
    tol = req.tol_pct if req.tol_pct is not None else DEFAULT_BUY_TOL_PCT
    name = series_for_tolerance(tol)
    value = nearest(req.capacitance_pf, name)
    buy = replace(req, capacitance_pf=value)
    note = "" if value == req.capacitance_pf else f" (the {name} value nearest {format_capacitance(req.capacitance_pf)})"
    return f"buy {buy.describe()}{note}"


def _cautions(req: Requirement, matches: tuple[Match, ...]) -> tuple[str, ...]:
    out = []
    if req.is_mains():
        out.append(SAFETY_CAUTION)
    if req.working_v is not None and req.working_v > 50:
        out.append("Above 50 V a capacitor can hold a dangerous charge: discharge it before handling.")
    if any(m.decoded is not None and m.decoded.polarity for m in matches):
        out.append("Polarised parts among these: fit them the way the band marks (check the family's convention).")
    return tuple(out)


def find(store: Store, req: Requirement, *, combine: bool = False, limit: int = 10) -> FindResult:
    """Single parts, and with ``combine`` parallel/series pairs, that meet the requirement.

    When nothing is found, :attr:`FindResult.explanation` says which constraint ruled out the parts
    nearest in value, and :attr:`FindResult.suggestion` names the preferred (IEC 60063) value to buy.

    Raises:
        BadValue: ``limit`` is below 1.
    """
    if limit < 1:
        raise BadValue("--limit", str(limit), "a number of results of 1 or more")
    matches = tuple(candidates(store, req)[:limit])
    to_measure = tuple(candidates(store, req, to_measure=True)[:limit])
    combos: list[Combination] = []
    search = None
    if combine and not req.is_mains():   # never a pair on an X/Y position (see _explain)
        search = PairSearch(store, req)
        for kind in combining.PAIR_KINDS:
            combos.extend(search.search(kind, limit))
        combos.sort(key=lambda c: (c.value_error_pct, GRADE_RANK[c.grade], len(c.parts),
                                   c.kind, tuple(p.bin_key for p in c.parts)))
    combos = combos[:limit]
    explanation: tuple[str, ...] = ()
    suggestion = None
    if not matches and not combos:
        explanation = _explain(store, req, search)
        suggestion = _suggestion(req)
    return FindResult(req, matches, tuple(combos), explanation, suggestion, _cautions(req, matches),
                      to_measure)


__all__ = ["DEFAULT_BUY_TOL_PCT", "NOMINAL_MATCH_PCT", "SAFETY_CAUTION",
           "Combination", "FindResult", "Match", "PairPart", "Requirement", "Stocked", "Verdict",
           "build_requirement", "candidates", "check_pair", "check_part", "check_single", "check_tempco",
           "check_value", "find", "linear_tempco_parts", "parse_tempco_window"]
