"""Two parts as one: the pairs on the shelf that meet a requirement, and the exact check of a pair.

Pairs are searched without an O(n²) scan (:class:`stock.physics.combining.PairIndex`): the parts
are sorted by value, grouped by tempco when a window is asked for, and for each anchor part the
complement (parallel C₂ = T − C₁, series C₂ = C₁·T / (C₁ − T)) is looked up by bisection inside the
interval that keeps the pair's value and net tempco in bounds. That pass runs in floats with a
small margin; every pair it proposes is then re-checked exactly (``Decimal``) by
:func:`check_pair`. No pair ever fills an X/Y safety position.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from decimal import Decimal
from typing import Any
from weakref import WeakKeyDictionary

from stock.physics import combining
from stock.markings.ceramic_codes import assumed_tempco_tolerance
from stock.matching.requirement import (Requirement,
                                        fmt, tempco_tolerance)
from stock.matching.part_checks import (Stocked, Verdict, check_part, tolerance_pct, window_text)
from stock.physics.stability import assumed_tempco_tol
from stock.matching.shelf import GRADE_RANK, SHELF_SELECT, stocked, value_error
from stock.store.database import Store
from stock.units import format_capacitance

_HUNDRED = Decimal(100)


@dataclass(frozen=True)
class PairPart:
    """One bin's share of a combination: ``count`` parts of ``capacitance_pf`` each."""

    bin_id: int
    bin_key: str
    capacitance_pf: Decimal
    count: int

    def to_json(self) -> dict[str, Any]:
        return {"bin": self.bin_key, "capacitance_pf": float(self.capacitance_pf), "count": self.count}


@dataclass(frozen=True)
class Combination:
    """Two parts wired in parallel or series that together meet the requirement.

    ``worst_case_pct`` is the largest deviation of the delivered value from the *requested* value
    when both parts sit anywhere in their marked tolerances (None when a tolerance is not marked);
    ``voltage_v`` is the highest voltage the pair stands with neither part over its rating.
    """

    kind: str
    parts: tuple[PairPart, ...]
    capacitance_pf: Decimal
    tempco_ppm_per_k: Decimal | None
    worst_case_pct: Decimal | None
    voltage_v: Decimal | None
    reasons: tuple[str, ...]
    grade: str | None = None
    value_error_pct: Decimal = Decimal(0)

    def to_json(self) -> dict[str, Any]:
        def f(v: Decimal | None) -> float | None:
            return None if v is None else float(v)
        return {"kind": self.kind, "parts": [p.to_json() for p in self.parts],
                "capacitance_pf": float(self.capacitance_pf),
                "tempco_ppm_per_k": f(self.tempco_ppm_per_k), "worst_case_pct": f(self.worst_case_pct),
                "voltage_v": f(self.voltage_v), "grade": self.grade, "reasons": list(self.reasons)}


# The pair index of each open store, rebuilt when the database changes: PRAGMA data_version moves
# when another connection commits, total_changes when this one writes. Kit planning asks for many
# lines in a row, and the index costs a full read of the parts table.
_POOLS: WeakKeyDictionary[Store, tuple[tuple[int, int], list[tuple[Any, ...]], dict[Any, combining.PairIndex]]]
_POOLS = WeakKeyDictionary()
_POOL_SQL = (
    "SELECT p.capacitance_pf, p.bin_id,"
    " CASE WHEN p.tol_unit = 'pF' THEN p.tol_minus * 100.0 / p.capacitance_pf ELSE p.tol_minus END,"
    " CASE WHEN p.tol_unit = 'pF' THEN p.tol_plus * 100.0 / p.capacitance_pf ELSE p.tol_plus END,"
    " p.tempco_ppm_per_k, p.tempco_tol_ppm_per_k, p.voltage_v,"
    " s.available, p.family, p.safety_class IS NOT NULL"
    " FROM parts p JOIN bin_stock s ON s.bin_id = p.bin_id"
    " WHERE p.capacitance_pf > 0 AND s.available > 0"
    " ORDER BY p.capacitance_pf, p.bin_id")


def pool_rows(store: Store) -> tuple[list[tuple[Any, ...]], dict[Any, combining.PairIndex]]:
    """Every available part's lean columns, by value, cached until the database changes."""
    conn = store.db.conn
    version = (conn.execute("PRAGMA data_version").fetchone()[0], conn.total_changes)
    cached = _POOLS.get(store)
    if cached is None or cached[0] != version:
        cached = (version, conn.execute(_POOL_SQL).fetchall(), {})
        _POOLS[store] = cached
    return cached[1], cached[2]


def _alpha_tol(alpha: float | None, tol: float | None) -> float:
    if tol is not None:
        return tol
    return 0.0 if alpha is None else float(assumed_tempco_tol(Decimal(str(alpha))))


class PairSearch:
    """Pairs for one requirement: a float index first, then exact checks (cached per part and voltage)."""

    def __init__(self, store: Store, req: Requirement):
        self.req = req
        self.store = store
        self.parts: dict[int, Stocked] = {}
        self.verdicts: dict[tuple[int, Decimal | None], Verdict] = {}
        self.nearest_rejected: tuple[float, str] | None = None  # (value error %, why), for explanations
        self.index = self._index()

    def _index(self) -> combining.PairIndex:
        req = self.req
        signature = (req.family, req.is_mains(), req.qty)
        rows, indexes = pool_rows(self.store)
        if signature not in indexes:
            qty, family, safety = req.qty, req.family, req.is_mains()
            # an α with no marked tolerance takes the one the exact check assumes (never 0)
            indexes[signature] = combining.PairIndex(
                (c, bin_id, t_minus, t_plus, alpha, _alpha_tol(alpha, alpha_tol), volts, available >= 2 * qty)
                for c, bin_id, t_minus, t_plus, alpha, alpha_tol, volts, available, fam, has_safety in rows
                if available >= qty and (family is None or fam == family) and (has_safety or not safety))
        return indexes[signature]

    def part(self, bin_id: int) -> Stocked:
        if bin_id not in self.parts:
            self.parts[bin_id] = stocked(self.store.one(f"{SHELF_SELECT} WHERE b.id = ?", (bin_id,)))
        return self.parts[bin_id]

    def verdict(self, part: Stocked, working_v: Decimal | None) -> Verdict:
        key = (part.bin_id, working_v)
        if key not in self.verdicts:
            self.verdicts[key] = check_part(part.marking, self.req, working_v=working_v)
        return self.verdicts[key]

    def search(self, kind: str, limit: int) -> list[Combination]:
        """Up to ``limit`` pairs of one kind, nearest the target first, each checked exactly."""
        req = self.req
        lo, hi = req.value_window()
        window = req.tempco_window()
        query = combining.PairQuery(
            kind=kind, target=float(req.capacitance_pf), lo=float(lo), hi=float(hi),
            worst_case=req.tol_pct is not None,
            tempco_lo=float(window[0]) if window else -math.inf,
            tempco_hi=float(window[1]) if window else math.inf,
            working_v=float(req.working_v) if req.working_v is not None else None)
        excluded: set[int] = set()
        seen: set[tuple[int, int]] = set()
        found: list[Combination] = []
        want = limit * 2
        while True:
            proposals = self.index.nearest(query, want, per_part=limit, exclude=excluded)
            for err, k1, k2 in proposals:
                if len(found) >= limit:
                    return found
                if (k1, k2) in seen or k1 in excluded or k2 in excluded:
                    continue
                seen.add((k1, k2))
                combo = check_pair(kind, self.part(k1), self.part(k2), req, verdict=self.verdict)
                if isinstance(combo, Combination):
                    found.append(combo)
                    continue
                if self.nearest_rejected is None or err < self.nearest_rejected[0]:
                    self.nearest_rejected = (err, f"nearest pair {self._name(kind, k1, k2)}: "
                                                  + "; ".join(combo.reasons[:2]))
                for k in (k1, k2):  # a part that fails on its own at full voltage never pairs
                    if not self.verdict(self.part(k), None if kind == "series" else req.working_v).ok:
                        excluded.add(k)
            if len(found) >= limit or len(proposals) < want or want >= 64 * limit:
                return found
            want *= 4

    def _name(self, kind: str, k1: int, k2: int) -> str:
        a, b = self.part(k1), self.part(k2)
        joint = " ∥ " if kind == "parallel" else " in series with "
        return (f"{format_capacitance(a.marking.capacitance_pf)} ({a.bin_key}){joint}"
                f"{format_capacitance(b.marking.capacitance_pf)} ({b.bin_key})")


def _pair_tempco(kind: str, c1: Decimal, d1: Any, c2: Decimal, d2: Any, req: Requirement,
                 reasons: list[str]) -> tuple[Decimal | None, Verdict | None]:
    """The pair's net tempco, and a refusal when it misses the window (reasons appended to).

    An unmarked tolerance on α takes the one assumed everywhere (never 0), and the reason says so.
    """
    a1 = d1.tempco_ppm_per_k if d1 else None
    a2 = d2.tempco_ppm_per_k if d2 else None
    net = combining.pair_tempco(kind, c1, a1, c2, a2) if a1 is not None and a2 is not None else None  # type: ignore[arg-type]
    window = req.tempco_window()
    if window is None:
        return net, None
    if net is None:
        return None, Verdict(False, ("a part has no linear tempco",), "tempco")
    t1, t2 = tempco_tolerance(d1), tempco_tolerance(d2)
    spread = combining.pair_tempco_spread(kind, c1, t1, c2, t2)  # type: ignore[arg-type]
    assumed = [f"{d.code} ±{fmt(t)} ppm/K assumed ({assumed_tempco_tolerance(d.tempco_ppm_per_k)[1]})"
               for d, t in ((d1, t1), (d2, t2)) if d.tempco_tol_ppm_per_k is None]
    if assumed:
        reasons.append("tolerance on α not marked: " + "; ".join(dict.fromkeys(assumed)))
    if net - spread < window[0] or net + spread > window[1]:
        return net, Verdict(False, (f"net tempco {fmt(net)}±{fmt(spread)} ppm/K outside {window_text(window)}",)
                            + tuple(reasons[-1:] if assumed else ()), "tempco")
    weights = (f"{fmt(c1)}·{fmt(a1)} + {fmt(c2)}·{fmt(a2)}" if kind == "parallel"
               else f"{fmt(c2)}·{fmt(a1)} + {fmt(c1)}·{fmt(a2)}")
    mix = f"{d1.code} with {d2.code}: " if d1.code != d2.code else ""
    reasons.append(f"{mix}net tempco ({weights}) / {fmt(c1 + c2)} = {fmt(net)}±{fmt(spread)} ppm/K, "
                   f"within {window_text(window)}")
    return net, None


def check_pair(kind: str, a: Stocked, b: Stocked, req: Requirement, *,
               verdict: Any = None) -> Combination | Verdict:
    """Check a pair exactly against every constraint; a :class:`Combination` if it meets them all.

    ``verdict(part, working_v)`` may be given to reuse per-part checks; by default
    :func:`check_part` runs afresh.
    """
    judge = verdict or (lambda part, v: check_part(part.marking, req, working_v=v))
    c1, c2 = a.marking.capacitance_pf, b.marking.capacitance_pf
    if c1 is None or c2 is None or c1 <= 0 or c2 <= 0:
        return Verdict(False, ("value not decoded",), "value")
    if (c1, a.bin_key) > (c2, b.bin_key):  # smaller part first, in reasons and in the JSON
        a, b, c1, c2 = b, a, c2, c1
    same = a.bin_id == b.bin_id
    if same and a.available < 2 * req.qty:
        return Verdict(False, (f"bin {a.bin_key} holds {a.available} available, {2 * req.qty} needed",),
                       "quantity")
    if not same and (a.available < req.qty or b.available < req.qty):
        return Verdict(False, ("not enough available",), "quantity")
    symbol = " ∥ " if kind == "parallel" else " in series with "
    value = combining.pair_value(kind, c1, c2)  # type: ignore[arg-type]
    lo, hi = req.value_window()
    reasons = [f"{format_capacitance(c1)}{symbol}{format_capacitance(c2)} = {format_capacitance(value)}"
               + (" (C₁ + C₂)" if kind == "parallel" else " (C₁·C₂ / (C₁ + C₂))")]
    tol1, tol2 = tolerance_pct(a.marking), tolerance_pct(b.marking)
    worst = None
    if tol1 is not None and tol2 is not None:
        p_lo, p_hi = combining.pair_bounds(kind, combining.band(c1, *tol1), combining.band(c2, *tol2))  # type: ignore[arg-type]
        worst = combining.worst_deviation_pct(req.capacitance_pf, p_lo, p_hi)
    if req.tol_pct is not None:
        if tol1 is None or tol2 is None:
            return Verdict(False, ("a part's tolerance is not marked",), "tolerance")
        if p_lo < lo or p_hi > hi:
            return Verdict(False, (f"the pair may deliver {format_capacitance(p_lo)}…{format_capacitance(p_hi)}",),
                           "tolerance")
        reasons.append(f"worst case {format_capacitance(p_lo)}…{format_capacitance(p_hi)}, "
                       f"within ±{fmt(req.tol_pct)} %")
    elif not lo <= value <= hi:
        return Verdict(False, (f"{format_capacitance(value)} is not {format_capacitance(req.capacitance_pf)}",),
                       "value")
    d1, d2 = a.marking.dielectric, b.marking.dielectric
    net, failed = _pair_tempco(kind, c1, d1, c2, d2, req, reasons)
    if failed is not None:
        return failed
    v1 = v2 = req.working_v
    if req.working_v is not None and kind == "series":
        v1, v2 = combining.series_voltage_split(req.working_v, c1, c2)  # type: ignore[arg-type]
        reasons.append(f"{fmt(req.working_v)} V splits {fmt(v1)} V across {a.bin_key}, "
                       f"{fmt(v2)} V across {b.bin_key} (V₁ = V·C₂ / (C₁ + C₂))")
    words = []
    for part, v in ((a, v1), (b, v2)) if not same else ((a, v1),):
        checked = judge(part, v)
        if not checked.ok:
            return Verdict(False, tuple(f"{part.bin_key}: {r}" for r in checked.reasons), checked.failed,
                           checked.grade)
        reasons.extend(f"{part.bin_key}: {r}" for r in checked.reasons)
        words.append(checked.grade)
    rating = None
    if a.marking.voltage_v is not None and b.marking.voltage_v is not None:
        rating = combining.pair_voltage_rating(kind, c1, a.marking.voltage_v, c2, b.marking.voltage_v)  # type: ignore[arg-type]
    if same:
        parts = (PairPart(a.bin_id, a.bin_key, c1, 2 * req.qty),)
    else:
        parts = (PairPart(a.bin_id, a.bin_key, c1, req.qty), PairPart(b.bin_id, b.bin_key, c2, req.qty))
    word = max(words, key=lambda w: GRADE_RANK[w]) if req.application else None
    return Combination(kind, parts, value, net, worst, rating, tuple(reasons), word,
                       value_error(value, req.capacitance_pf))


__all__ = ["Combination", "PairPart", "PairSearch", "check_pair", "pool_rows"]
