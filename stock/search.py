"""Find parts on hand for a requirement: single parts first, then parallel and series pairs.

A :class:`Requirement` says what the circuit needs; :func:`find` answers with the single parts that
meet every constraint (:class:`Match`), optionally the two-part combinations that do
(:class:`Combination`), and, when nothing does, which constraint ruled out the nearest parts and the
preferred value to buy.

What "meets" means, constraint by constraint:

- **Value.** With a tolerance (``tol_pct``), the *delivered* value must stay inside the requirement
  whatever the part does within its own marked tolerance: the part's band
  ``[C·(1 − minus %), C·(1 + plus %)]`` must lie inside ``[T·(1 − tol), T·(1 + tol)]``. A part with no
  marked tolerance cannot promise that and is left out. Without a tolerance, the nominal value must be
  within :data:`NOMINAL_MATCH_PCT` of the target (closer than any two E96 neighbours, so a single part
  must carry the value asked for, while a pair may land 1 % off).
- **Tempco window.** The part's whole band ``α ± tol`` must lie in the window; a part whose tolerance
  on α is not marked (old names such as NP0 or N750) is judged on its nominal α, and says so. A part
  with no linear tempco (Class 2 ceramics, electrolytics) never meets a window.
- **Voltage.** The rated voltage must reach the working voltage (for a series pair, each part's share,
  V₁ = V·C₂/(C₁ + C₂)); derating is applied through :func:`stock.grading.grade` when an application
  is named.
- **Application.** The grade must be "fit" ("marginal" too with ``allow_marginal``).
- **Safety.** A mains position or a named class never accepts a part without an X/Y class. A class
  substitutes for another when its IEC 60384-14 impulse test is at least as severe for the same or a
  stricter position: X1 for X2/X3; a Y class for an X one (a Y part is tested for line-to-earth, the
  stricter position); Y1 for every Y; Y2 for Y3/Y4 (see :data:`SAFETY_SUBSTITUTES`).
- **Quantity.** Available = on hand less reservations of plans not yet pulled or dropped, and it must
  cover the quantity; a pair takes ``qty`` of each part, or ``2 × qty`` from one bin used twice.

Pairs are searched without an O(n²) scan: the parts are sorted by value, grouped by tempco when a
window is asked for, and for each part the complement (parallel C₂ = T − C₁, series
C₂ = C₁·T / (C₁ − T)) is looked up by bisection inside the interval that keeps the pair's value and
net tempco in bounds. The search runs in floats with a small margin; every pair it proposes is then
re-checked exactly (``Decimal``) before it is returned.

>>> parse_tempco_window("-750±120")
(Decimal('-870'), Decimal('-630'))
"""

from __future__ import annotations

import math
import re
from weakref import WeakKeyDictionary
from dataclasses import dataclass, replace
from decimal import Decimal, InvalidOperation
from typing import Any

from stock import combining
from stock.bins import part_marking
from stock.ceramic_codes import decode_dielectric, read_dielectric
from stock.decoded import FAMILIES, Dielectric, Marking, Tolerance
from stock.errors import BadValue
from stock.grading import APPLICATIONS, Conditions, grade, worst_case
from stock.preferred_values import nearest, series_for_tolerance
from stock.store import Store
from stock.units import format_capacitance, format_tolerance

NOMINAL_MATCH_PCT = Decimal(1)  # common practice, no published source: "the same value" within 1 %
DEFAULT_BUY_TOL_PCT = Decimal(10)  # E12, when the requirement names no tolerance
_HUNDRED = Decimal(100)
_GRADE_RANK = {"fit": 0, "marginal": 1, None: 2}

# IEC 60384-14 subclasses, each with the ones it may replace (impulse test at least as severe, same or
# stricter position: Y1 8 kV, Y2 5 kV, X1 4 kV, X2 and Y4 2.5 kV, X3 and Y3 none; figures from the
# reference tables of the standard's subclasses).
SAFETY_SUBSTITUTES: dict[str, frozenset[str]] = {
    "X1": frozenset({"X1", "X2", "X3"}),
    "X2": frozenset({"X2", "X3"}),
    "X3": frozenset({"X3"}),
    "Y1": frozenset({"Y1", "Y2", "Y3", "Y4", "X1", "X2", "X3"}),
    "Y2": frozenset({"Y2", "Y3", "Y4", "X1", "X2", "X3"}),
    "Y3": frozenset({"Y3", "X3"}),
    "Y4": frozenset({"Y4", "X2", "X3"}),
}
SAFETY_CAUTION = ("Mains position: use only X/Y safety-rated parts of the class the position needs, "
                  "discharge before handling, and defer to local codes and licensed practice.")

_WINDOW = re.compile(r"^\s*([+\-−]?\d+(?:\.\d+)?)\s*(?:±|\+/-|\+-)\s*(\d+(?:\.\d+)?)\s*(?:ppm(?:/K)?)?\s*$",
                     re.IGNORECASE)
_RANGE = re.compile(r"^\s*([+\-−]?\d+(?:\.\d+)?)\s*(?:\.\.|…)\s*([+\-−]?\d+(?:\.\d+)?)\s*$")
_SAFETY = re.compile(r"([XY])\s*([1-4])", re.IGNORECASE)


def _dec(text: str) -> Decimal:
    return Decimal(text.replace("−", "-"))


def _fmt(value: Decimal, places: int = 2) -> str:
    """A Decimal as plain digits, at most ``places`` decimals, no exponent: 1E+2 -> "100"."""
    q = value.quantize(Decimal(1).scaleb(-places)).normalize()
    text = format(q, "f")
    return text.replace("-", "−")


def _signed(value: Decimal) -> str:
    return ("+" if value > 0 else "") + _fmt(value)


def parse_tempco_window(text: str) -> tuple[Decimal, Decimal]:
    """A tempco window in ppm/K from ``0±30``, ``-750±120``, ``-100..100`` or a Class 1 code.

    A code (``C0G``, ``U2J``, ``NP0``, ``N750``) means its own nominal ± tolerance; an old industry
    name that states no tolerance (N750) takes the tolerance of the EIA-198 code it is usually sold
    as (U2J, ±120 ppm/K).

    Raises:
        BadValue: the text is neither a window nor a code with a linear tempco.

    >>> parse_tempco_window("0±30")
    (Decimal('-30'), Decimal('30'))
    >>> parse_tempco_window("-100..50")
    (Decimal('-100'), Decimal('50'))
    >>> parse_tempco_window("N750")
    (Decimal('-870'), Decimal('-630'))
    """
    expected = "a window such as 0±30, -750±120 or -100..100 (ppm/K), or a Class 1 code such as C0G"
    raw = text
    m = _WINDOW.match(text)
    if m:
        mid, half = _dec(m.group(1)), _dec(m.group(2))
        return mid - half, mid + half
    m = _RANGE.match(text)
    if m:
        lo, hi = _dec(m.group(1)), _dec(m.group(2))
        if lo > hi:
            raise BadValue("--tempco", raw, "a window whose low end is below its high end")
        return lo, hi
    reading = read_dielectric(text.strip())
    diel = reading.dielectric if reading else None
    if diel is None or diel.tempco_ppm_per_k is None:
        raise BadValue("--tempco", raw, expected)
    tol = diel.tempco_tol_ppm_per_k
    if tol is None:  # an old name: take the tolerance of the EIA code it is usually sold as
        tol = next((a.dielectric.tempco_tol_ppm_per_k for a in reading.alternatives
                    if a.dielectric is not None and a.dielectric.tempco_ppm_per_k == diel.tempco_ppm_per_k
                    and a.dielectric.tempco_tol_ppm_per_k is not None), None)
    if tol is None:
        raise BadValue("--tempco", raw, f"a window such as {_fmt(diel.tempco_ppm_per_k)}±60: "
                                        f"{text.strip()} names a tempco but no tolerance on it")
    return diel.tempco_ppm_per_k - tol, diel.tempco_ppm_per_k + tol


def safety_classes(text: str | None) -> frozenset[str]:
    """The IEC 60384-14 subclasses a marking's safety text names: "X1Y2" -> {"X1", "Y2"}.

    >>> sorted(safety_classes("X1 Y2"))
    ['X1', 'Y2']
    """
    if not text:
        return frozenset()
    return frozenset(f"{a.upper()}{b}" for a, b in _SAFETY.findall(text))


def safety_covers(part_classes: frozenset[str], needed: str) -> bool:
    """Whether a part's classes include one that may stand in the needed position.

    >>> safety_covers(frozenset({"Y2"}), "X2"), safety_covers(frozenset({"X2"}), "Y2")
    (True, False)
    """
    return any(needed in SAFETY_SUBSTITUTES.get(c, frozenset()) for c in part_classes)


@dataclass(frozen=True)
class Requirement:
    """What a position in a circuit needs (see the module docstring for what each field demands)."""

    capacitance_pf: Decimal
    tol_pct: Decimal | None = None
    tempco_min: Decimal | None = None
    tempco_max: Decimal | None = None
    max_abs_tempco: Decimal | None = None
    working_v: Decimal | None = None
    application: str | None = None
    allow_marginal: bool = False
    conditions: Conditions = Conditions()
    family: str | None = None
    dielectric_code: str | None = None
    safety_class: str | None = None
    qty: int = 1

    def __post_init__(self) -> None:
        if self.capacitance_pf <= 0:
            raise BadValue("--value", str(self.capacitance_pf), "a capacitance above zero")
        if self.tol_pct is not None and not Decimal(0) < self.tol_pct < _HUNDRED:
            raise BadValue("--tol", str(self.tol_pct), "a tolerance between 0 and 100 %")
        if self.qty < 1:
            raise BadValue("--qty", str(self.qty), "a quantity of 1 or more")
        if self.application is not None and self.application not in APPLICATIONS:
            raise BadValue("--use", self.application, "one of " + ", ".join(APPLICATIONS))
        if self.family is not None and self.family not in FAMILIES:
            raise BadValue("--family", self.family, "one of " + ", ".join(FAMILIES))
        if self.safety_class is not None and self.safety_class not in SAFETY_SUBSTITUTES:
            raise BadValue("--safety", self.safety_class, "one of " + ", ".join(SAFETY_SUBSTITUTES))
        if (self.tempco_min is not None and self.tempco_max is not None
                and self.tempco_min > self.tempco_max):
            raise BadValue("--tempco", f"{self.tempco_min}..{self.tempco_max}",
                           "a window whose low end is below its high end")
        if self.max_abs_tempco is not None and self.max_abs_tempco < 0:
            raise BadValue("--max-tempco", str(self.max_abs_tempco), "a magnitude of 0 ppm/K or more")
        if self.dielectric_code is not None and self.dielectric() is None:
            raise BadValue("--tempco", self.dielectric_code, "a dielectric code such as C0G, N750 or X7R")

    def dielectric(self) -> Dielectric | None:
        """The decoded dielectric the requirement names, if any."""
        return decode_dielectric(self.dielectric_code) if self.dielectric_code else None

    def value_window(self) -> tuple[Decimal, Decimal]:
        """The (low, high) limits the delivered value must stay within, in pF."""
        pct = self.tol_pct if self.tol_pct is not None else NOMINAL_MATCH_PCT
        return combining.band(self.capacitance_pf, pct, pct)

    def tempco_window(self) -> tuple[Decimal, Decimal] | None:
        """The (low, high) window on α in ppm/K, from the window and the magnitude limit together."""
        lo, hi = self.tempco_min, self.tempco_max
        if self.max_abs_tempco is not None:
            lo = -self.max_abs_tempco if lo is None else max(lo, -self.max_abs_tempco)
            hi = self.max_abs_tempco if hi is None else min(hi, self.max_abs_tempco)
        if lo is None and hi is None:
            return None
        return (lo if lo is not None else Decimal("-Infinity"), hi if hi is not None else Decimal("Infinity"))

    def needed_safety(self) -> str | None:
        """The safety subclass a part must cover; a mains position with none named needs at least X3."""
        if self.safety_class:
            return self.safety_class
        return "X3" if self.application == "mains" else None

    def is_mains(self) -> bool:
        return self.application == "mains" or self.safety_class is not None

    def describe(self) -> str:
        """The requirement in words, for ordering: "150 pF ±5 %, 0±30 ppm/K, ≥ 50 V, fit for tuned"."""
        words = [format_capacitance(self.capacitance_pf)]
        if self.tol_pct is not None:
            words[0] += " " + format_tolerance(Tolerance(self.tol_pct, self.tol_pct, "%"))
        if self.qty > 1:
            words[0] = f"{self.qty} × {words[0]}"
        if self.dielectric_code:
            words.append(self.dielectric_code)
        if self.tempco_min is not None and self.tempco_max is not None:
            mid, half = (self.tempco_min + self.tempco_max) / 2, (self.tempco_max - self.tempco_min) / 2
            words.append(f"{_fmt(mid)}±{_fmt(half)} ppm/K")
        if self.max_abs_tempco is not None:
            words.append(f"|α| ≤ {_fmt(self.max_abs_tempco)} ppm/K")
        if self.family:
            words.append(self.family)
        if self.working_v is not None:
            words.append(f"≥ {_fmt(self.working_v)} V")
        if self.safety_class:
            words.append(f"safety class {self.safety_class}")
        if self.application:
            word = "fit or marginal" if self.allow_marginal else "fit"
            words.append(f"{word} for {self.application}")
        c = self.conditions
        if (c.temp_min_c, c.temp_max_c) != (Conditions().temp_min_c, Conditions().temp_max_c):
            words.append(f"{_signed(c.temp_min_c)}…{_signed(c.temp_max_c)} °C")
        return ", ".join(words)

    def to_json(self) -> dict[str, Any]:
        def f(v: Decimal | None) -> float | None:
            return None if v is None else float(v)
        return {
            "capacitance_pf": float(self.capacitance_pf), "tol_pct": f(self.tol_pct),
            "tempco_min": f(self.tempco_min), "tempco_max": f(self.tempco_max),
            "max_abs_tempco": f(self.max_abs_tempco), "working_v": f(self.working_v),
            "application": self.application, "allow_marginal": self.allow_marginal,
            "temp_min_c": f(self.conditions.temp_min_c), "temp_max_c": f(self.conditions.temp_max_c),
            "family": self.family, "dielectric_code": self.dielectric_code,
            "safety_class": self.safety_class, "qty": self.qty, "description": self.describe(),
        }


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


@dataclass(frozen=True)
class FindResult:
    """The answer to one requirement."""

    requirement: Requirement
    matches: tuple[Match, ...]
    combinations: tuple[Combination, ...]
    explanation: tuple[str, ...]
    suggestion: str | None
    cautions: tuple[str, ...] = ()

    def to_json(self) -> dict[str, Any]:
        """The ``stock find --json`` shape (stable contract)."""
        return {"requirement": self.requirement.to_json(),
                "matches": [m.to_json() for m in self.matches],
                "combinations": [c.to_json() for c in self.combinations],
                "explanation": list(self.explanation), "suggestion": self.suggestion,
                "cautions": list(self.cautions)}


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


_SELECT = (
    "SELECT b.id AS bin_id, b.bin_key, b.location, b.on_hand, p.decoded_json, p.settled_json,"
    " p.capacitance_pf, p.tol_minus, p.tol_plus, p.tol_unit, p.tempco_ppm_per_k,"
    " p.tempco_tol_ppm_per_k, p.voltage_v,"
    " (SELECT COALESCE(SUM(r.qty), 0) FROM reservations r JOIN plans pl ON pl.id = r.plan_id"
    "  WHERE r.bin_id = b.id AND pl.status = 'reserved') AS reserved"
    " FROM parts p JOIN bins b ON b.id = p.bin_id")


def _stocked(row: dict[str, Any]) -> Stocked:
    return Stocked(row["bin_id"], row["bin_key"], row["location"], row["on_hand"], int(row["reserved"]),
                   part_marking(row))


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
    if req.needed_safety():
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
    sql = f"SELECT * FROM ({_SELECT} WHERE {' AND '.join(where)})"
    if strict:
        sql += " WHERE COALESCE(on_hand, 0) - reserved >= ?"
        params.append(req.qty)
    return store.rows(sql, params)


def _reserved(store: Store) -> dict[int, int]:
    """Parts held per bin by plans not yet pulled or dropped."""
    return {r["bin_id"]: int(r["n"]) for r in store.rows(
        "SELECT r.bin_id, SUM(r.qty) AS n FROM reservations r JOIN plans pl ON pl.id = r.plan_id"
        " WHERE pl.status = 'reserved' GROUP BY r.bin_id")}


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
    needed = req.needed_safety()
    if needed:
        have = safety_classes(m.safety_class)
        if not safety_covers(have, needed):
            why = f"class {m.safety_class} does not cover {needed}" if have else "no X/Y safety class"
            return Verdict(False, (f"{why} (IEC 60384-14)",), "safety")
        reasons.append(f"safety class {m.safety_class} covers {needed} (IEC 60384-14)")
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
            why = check.reason if check else f"rated {_fmt(m.voltage_v)} V"
            return Verdict(False, (why,), "voltage")
        reasons.append(check.reason)
    word = None
    if req.application:
        g = grade(m, req.application, replace(cond, working_v=working_v))
        word = g.word
        if word not in ("fit", "marginal") or (word == "marginal" and not req.allow_marginal):
            return Verdict(False, tuple(g.reasons[:2]) or (f"{word} for {req.application}",),
                           "application", word)
        reasons.append(g.reasons[0] if g.reasons else f"{word} for {req.application}")
    return Verdict(True, tuple(reasons), None, word)


def _tolerance_pct(m: Marking) -> tuple[Decimal, Decimal] | None:
    if m.tolerance is None or m.capacitance_pf is None:
        return None
    return m.tolerance.as_percent(m.capacitance_pf)


def check_value(m: Marking, req: Requirement) -> Verdict:
    """Whether a single part delivers the value: its whole tolerance band inside the requirement."""
    c = m.capacitance_pf
    if c is None:
        return Verdict(False, ("value not decoded",), "value")
    lo, hi = req.value_window()
    if req.tol_pct is None:
        if not lo <= c <= hi:
            return Verdict(False, (f"{format_capacitance(c)} is not {format_capacitance(req.capacitance_pf)}",),
                           "value")
        return Verdict(True, (f"{format_capacitance(c)} nominal",))
    tol = _tolerance_pct(m)
    if tol is None:
        return Verdict(False, (f"{format_capacitance(c)} with no marked tolerance cannot promise "
                               f"±{_fmt(req.tol_pct)} %",), "tolerance")
    p_lo, p_hi = combining.band(c, *tol)
    if p_lo < lo or p_hi > hi:
        return Verdict(False, (f"{format_capacitance(c)} {format_tolerance(m.tolerance)} may deliver "
                               f"{format_capacitance(p_lo)}…{format_capacitance(p_hi)}, outside "
                               f"{format_capacitance(lo)}…{format_capacitance(hi)}",), "tolerance")
    return Verdict(True, (f"{format_capacitance(c)} {format_tolerance(m.tolerance)} delivers "
                          f"{format_capacitance(p_lo)}…{format_capacitance(p_hi)}, within ±{_fmt(req.tol_pct)} %",))


def check_tempco(m: Marking, req: Requirement) -> Verdict:
    """Whether a single part's α band lies in the requirement's tempco window."""
    window = req.tempco_window()
    if window is None:
        return Verdict(True, ())
    diel = m.dielectric
    if diel is None or diel.tempco_ppm_per_k is None:
        what = diel.code if diel else "dielectric not marked"
        return Verdict(False, (f"{what}: no linear tempco",), "tempco")
    alpha, tol = diel.tempco_ppm_per_k, diel.tempco_tol_ppm_per_k
    a_lo, a_hi = alpha - (tol or 0), alpha + (tol or 0)
    if a_lo < window[0] or a_hi > window[1]:
        return Verdict(False, (f"{diel.code} α {_fmt(alpha)}" + (f"±{_fmt(tol)}" if tol is not None else "")
                               + f" ppm/K outside {_window_text(window)}",), "tempco")
    note = "" if tol is not None else " (no tolerance on α marked: nominal judged)"
    return Verdict(True, (f"α {_fmt(alpha)}" + (f"±{_fmt(tol)}" if tol is not None else "")
                          + f" ppm/K within {_window_text(window)}{note}",))


def _window_text(window: tuple[Decimal, Decimal]) -> str:
    lo, hi = window
    if lo.is_infinite():
        return f"≤ {_fmt(hi)} ppm/K"
    if hi.is_infinite():
        return f"≥ {_fmt(lo)} ppm/K"
    return f"{_fmt(lo)}…{_fmt(hi)} ppm/K"


def check_single(part: Stocked, req: Requirement) -> Verdict:
    """Every constraint a single part must meet, in the order an explanation reports them."""
    reasons: list[str] = []
    word = None
    for verdict in (check_value(part.marking, req), check_tempco(part.marking, req),
                    check_part(part.marking, req, working_v=req.working_v)):
        if not verdict.ok:
            return verdict
        reasons.extend(verdict.reasons)
        word = verdict.grade or word
    if part.available < req.qty:
        return Verdict(False, (f"{part.available} available, {req.qty} needed",), "quantity")
    reasons.append(f"{part.available} available" + (f" ({part.reserved} reserved)" if part.reserved else ""))
    return Verdict(True, tuple(reasons), None, word)


def _value_error(c: Decimal, target: Decimal) -> Decimal:
    return abs(c - target) * _HUNDRED / target


def candidates(store: Store, req: Requirement) -> list[Match]:
    """The single parts that meet the requirement, best first (value error, grade, spare, bin).

    The SQL pre-filter takes the capacitance window and the indexed per-part filters; every row is
    then checked exactly with :func:`check_single`.
    """
    lo, hi = req.value_window()
    rows = _query(store, req, float(lo), float(hi), strict=True)
    found = []
    for row in rows:
        part = _stocked(row)
        verdict = check_single(part, req)
        if verdict.ok:
            c = part.marking.capacitance_pf
            found.append(Match(part.bin_id, part.bin_key, part.location, part.marking.text, c,
                               part.available, verdict.grade, verdict.reasons, part.marking,
                               _value_error(c, req.capacitance_pf)))
    found.sort(key=lambda m: (m.value_error_pct, _GRADE_RANK[m.grade], -(m.available - req.qty),
                              m.bin_key))
    return found


# The pair index of each open store, rebuilt when the database changes: PRAGMA data_version moves
# when another connection commits, total_changes when this one writes. Kit planning asks for many
# lines in a row, and the index costs a full read of the parts table.
_POOLS: WeakKeyDictionary[Store, tuple[tuple[int, int], list[tuple[Any, ...]], dict[Any, combining.PairIndex]]]
_POOLS = WeakKeyDictionary()
_POOL_SQL = (
    "SELECT p.capacitance_pf, p.bin_id,"
    " CASE WHEN p.tol_unit = 'pF' THEN p.tol_minus * 100.0 / p.capacitance_pf ELSE p.tol_minus END,"
    " CASE WHEN p.tol_unit = 'pF' THEN p.tol_plus * 100.0 / p.capacitance_pf ELSE p.tol_plus END,"
    " p.tempco_ppm_per_k, COALESCE(p.tempco_tol_ppm_per_k, 0.0), p.voltage_v,"
    " COALESCE(b.on_hand, 0) - COALESCE(rv.n, 0), p.family, p.safety_class IS NOT NULL"
    " FROM parts p JOIN bins b ON b.id = p.bin_id LEFT JOIN (SELECT r.bin_id, SUM(r.qty) AS n"
    "  FROM reservations r JOIN plans pl ON pl.id = r.plan_id WHERE pl.status = 'reserved'"
    "  GROUP BY r.bin_id) rv ON rv.bin_id = p.bin_id"
    " WHERE p.capacitance_pf > 0 AND COALESCE(b.on_hand, 0) - COALESCE(rv.n, 0) > 0"
    " ORDER BY p.capacitance_pf, p.bin_id")


def _pool_rows(store: Store) -> tuple[list[tuple[Any, ...]], dict[Any, combining.PairIndex]]:
    """Every available part's lean columns, by value, cached until the database changes."""
    conn = store.db.conn
    version = (conn.execute("PRAGMA data_version").fetchone()[0], conn.total_changes)
    cached = _POOLS.get(store)
    if cached is None or cached[0] != version:
        cached = (version, conn.execute(_POOL_SQL).fetchall(), {})
        _POOLS[store] = cached
    return cached[1], cached[2]


class _PairSearch:
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
        signature = (req.family, req.needed_safety() is not None, req.qty)
        rows, indexes = _pool_rows(self.store)
        if signature not in indexes:
            qty, family, safety = req.qty, req.family, req.needed_safety() is not None
            indexes[signature] = combining.PairIndex(
                (c, bin_id, t_minus, t_plus, alpha, alpha_tol, volts, available >= 2 * qty)
                for c, bin_id, t_minus, t_plus, alpha, alpha_tol, volts, available, fam, has_safety in rows
                if available >= qty and (family is None or fam == family) and (has_safety or not safety))
        return indexes[signature]

    def part(self, bin_id: int) -> Stocked:
        if bin_id not in self.parts:
            self.parts[bin_id] = _stocked(self.store.one(f"{_SELECT} WHERE b.id = ?", (bin_id,)))
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
    tol1, tol2 = _tolerance_pct(a.marking), _tolerance_pct(b.marking)
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
                       f"within ±{_fmt(req.tol_pct)} %")
    elif not lo <= value <= hi:
        return Verdict(False, (f"{format_capacitance(value)} is not {format_capacitance(req.capacitance_pf)}",),
                       "value")
    d1, d2 = a.marking.dielectric, b.marking.dielectric
    a1 = d1.tempco_ppm_per_k if d1 else None
    a2 = d2.tempco_ppm_per_k if d2 else None
    net = combining.pair_tempco(kind, c1, a1, c2, a2) if a1 is not None and a2 is not None else None  # type: ignore[arg-type]
    window = req.tempco_window()
    if window is not None:
        if net is None:
            return Verdict(False, ("a part has no linear tempco",), "tempco")
        t1 = (d1.tempco_tol_ppm_per_k or Decimal(0)) if d1 else Decimal(0)
        t2 = (d2.tempco_tol_ppm_per_k or Decimal(0)) if d2 else Decimal(0)
        spread = combining.pair_tempco_spread(kind, c1, t1, c2, t2)  # type: ignore[arg-type]
        if net - spread < window[0] or net + spread > window[1]:
            return Verdict(False, (f"net tempco {_fmt(net)}±{_fmt(spread)} ppm/K outside {_window_text(window)}",),
                           "tempco")
        weights = (f"{_fmt(c1)}·{_fmt(a1)} + {_fmt(c2)}·{_fmt(a2)}" if kind == "parallel"
                   else f"{_fmt(c2)}·{_fmt(a1)} + {_fmt(c1)}·{_fmt(a2)}")
        mix = f"{d1.code} with {d2.code}: " if d1.code != d2.code else ""
        reasons.append(f"{mix}net tempco ({weights}) / {_fmt(c1 + c2)} = {_fmt(net)}±{_fmt(spread)} ppm/K, "
                       f"within {_window_text(window)}")
    v1 = v2 = req.working_v
    if req.working_v is not None and kind == "series":
        v1, v2 = combining.series_voltage_split(req.working_v, c1, c2)  # type: ignore[arg-type]
        reasons.append(f"{_fmt(req.working_v)} V splits {_fmt(v1)} V across {a.bin_key}, "
                       f"{_fmt(v2)} V across {b.bin_key} (V₁ = V·C₂ / (C₁ + C₂))")
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
    word = max(words, key=lambda w: _GRADE_RANK[w]) if req.application else None
    return Combination(kind, parts, value, net, worst, rating, tuple(reasons), word,
                       _value_error(value, req.capacitance_pf))


def _explain(store: Store, req: Requirement, pairs: _PairSearch | None) -> tuple[str, ...]:
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
        part = _stocked(row)
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
            causes.setdefault(verdict.failed or "none", []).append((part, verdict))
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
    if pairs is not None:
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
    combos: list[Combination] = []
    search = None
    if combine:
        search = _PairSearch(store, req)
        for kind in combining.PAIR_KINDS:
            combos.extend(search.search(kind, limit))
        combos.sort(key=lambda c: (c.value_error_pct, _GRADE_RANK[c.grade], len(c.parts),
                                   c.kind, tuple(p.bin_key for p in c.parts)))
    combos = combos[:limit]
    explanation: tuple[str, ...] = ()
    suggestion = None
    if not matches and not combos:
        explanation = _explain(store, req, search)
        suggestion = _suggestion(req)
    return FindResult(req, matches, tuple(combos), explanation, suggestion, _cautions(req, matches))


def build_requirement(*, value: str, tol: str | None = None, tempco: str | None = None,
                      max_tempco: str | None = None, volts: str | None = None, use: str | None = None,
                      allow_marginal: bool = False, temp: str | None = None, family: str | None = None,
                      safety: str | None = None, qty: int = 1) -> Requirement:
    """A requirement from the words a user typed (``stock find`` options), each checked.

    ``tempco`` given as a code (C0G, N750) also asks for that dielectric or its equivalent.

    Raises:
        BadValue: an option that does not read, naming it and what it accepts.

    >>> build_requirement(value="150p", tol="5%", tempco="C0G", volts="50", use="tuned").describe()
    '150 pF ±5 %, C0G, 0±30 ppm/K, ≥ 50 V, fit for tuned'
    """
    from stock.families import decode_family
    from stock.units import parse_capacitance, parse_percent, parse_temperature_range, parse_voltage
    window = parse_tempco_window(tempco) if tempco else (None, None)
    code = None
    if tempco and not (_WINDOW.match(tempco) or _RANGE.match(tempco)):
        code = tempco.strip()
    fam = None
    if family:
        diel = decode_family(family) or decode_dielectric(family)
        fam = diel.family if diel else family.strip().lower()
    conditions = Conditions()
    if temp:
        low, high = parse_temperature_range(temp, "--temp")
        conditions = replace(conditions, temp_min_c=low, temp_max_c=high)
    if volts:
        conditions = replace(conditions, working_v=parse_voltage(volts, "--volts"))
    max_abs = None
    if max_tempco:
        try:
            max_abs = abs(_dec(max_tempco.strip().removesuffix("ppm/K").removesuffix("ppm").strip()))
        except InvalidOperation:
            raise BadValue("--max-tempco", max_tempco, "a magnitude in ppm/K such as 100") from None
    return Requirement(
        capacitance_pf=parse_capacitance(value, "--value"),
        tol_pct=parse_percent(tol, "--tol") if tol else None,
        tempco_min=window[0], tempco_max=window[1], max_abs_tempco=max_abs,
        working_v=conditions.working_v, application=use.strip().lower() if use else None,
        allow_marginal=allow_marginal, conditions=replace(conditions, working_v=None),
        family=fam, dielectric_code=code,
        safety_class=safety.strip().upper() if safety else None, qty=qty)


__all__ = ["DEFAULT_BUY_TOL_PCT", "NOMINAL_MATCH_PCT", "SAFETY_CAUTION", "SAFETY_SUBSTITUTES",
           "Combination", "FindResult", "Match", "PairPart", "Requirement", "Stocked", "Verdict",
           "build_requirement", "candidates", "check_pair", "check_part", "check_single", "check_tempco",
           "check_value", "find", "parse_tempco_window", "safety_classes", "safety_covers"]
