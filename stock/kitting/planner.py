"""Planning a kit from stock: a BOM against the bins, with the parts reserved.

A plan turns a BOM and a board count into a need per line (quantity per board × boards, plus a
spare rounded up), chooses bins for each capacitor line and reserves those parts, so two plans
never promise the same parts. Everything a plan decides is written in one ``BEGIN IMMEDIATE``
transaction that reads availability inside it: a second planner waits, then sees the first
plan's reservations.

How a line's bins are chosen (common practice, no published source):

1. Candidates come from :func:`stock.search.candidates`; each is then checked again here
   (:func:`stock.kit_rules.check_part`) so the safety rules hold whatever the search returns: a mains line takes
   only parts carrying its X/Y class or a higher one, never anything else; a tuned line never
   takes a Class 2 ceramic; a polarised part goes only where the BOM says polarised (or a
   dielectric-free bulk, bypass or timing line of 1 µF or more). A looser
   tolerance or a lower dielectric class is refused unless ``allow`` names it.
2. Fit grade before marginal, the exact nominal value before a near one.
3. A bin whose package is known not to fit the line's footprint is never used; a bin whose
   package is not recorded comes after every bin known to fit, with a note to check it.
4. Among the bins left, the one that gives up least (:mod:`stock.kitting.bin_order`): no spare
   safety rating, the plainest dielectric, no tighter tolerance than asked, then the fullest bin,
   then location order; bins with open doubts after clean ones. The notes name a precious bin
   passed over, or used because nothing plainer was on hand, and every flagged bin used.
5. With ``combine``, what singles cannot cover may come from pairs (two parts per position); never
   on a mains line.

The stored plan, and what happens to it after planning (show, list, pull, undo, drop), live in
:mod:`stock.kit_plans`.
"""

from __future__ import annotations

import json
import math
from collections import defaultdict
from collections.abc import Iterable
from dataclasses import dataclass, replace
from decimal import Decimal
from pathlib import Path
from typing import Any

from stock.decoded import Marking
from stock.errors import BadValue
from stock.inventory.bins import part_marking
from stock.kitting.bin_order import capability, order_notes
from stock.kitting.bom import Bom, BomLine, BomProblem, read_bom
from stock.kitting.line_rules import ALLOWANCES, Candidate, Verdict, check_part, choose_bins
from stock.kitting.stored_plans import KitPlan, load_plan
from stock.markings.packages import fits, read_package
from stock.markings.safety_classes import read_safety_class
from stock.matching.search import Requirement, candidates, find
from stock.physics.grading import Conditions
from stock.store.database import Store, now
from stock.units import (
    format_capacitance,
    format_number,
    format_voltage,
    parse_percent,
    parse_temperature_range,
)

# Limits that keep every need inside SQLite's 64-bit INTEGER with room to spare (a plan for more
# than a million boards is a typo, not a build).
MAX_BOARDS = 1_000_000
MAX_SPARE_PCT = 1000


@dataclass(frozen=True)
class KitOptions:
    """How to plan: boards, spare (% of the need, rounded up), conditions, pairs and allowances."""
    boards: int
    spare_pct: Decimal = Decimal(0)
    temp_min_c: Decimal | None = None
    temp_max_c: Decimal | None = None
    combine: bool = False
    allow: frozenset[str] = frozenset()

    def __post_init__(self) -> None:
        if not 1 <= self.boards <= MAX_BOARDS:
            raise BadValue("--boards", str(self.boards),
                           f"a whole number of boards from 1 to {MAX_BOARDS:,}")
        if not self.spare_pct.is_finite() or not 0 <= self.spare_pct <= MAX_SPARE_PCT:
            raise BadValue("--spare", str(self.spare_pct),
                           f"a percentage from 0 to {MAX_SPARE_PCT}")
        unknown = set(self.allow) - set(ALLOWANCES)
        if unknown:
            raise BadValue("--allow", ", ".join(sorted(unknown)), "one of " + ", ".join(ALLOWANCES))

    def need(self, qty_per_board: int) -> int:
        """Parts to plan for one line: per board × boards, plus the spare rounded up.

        >>> KitOptions(boards=5, spare_pct=Decimal(5)).need(3)
        16
        """
        base = qty_per_board * self.boards
        return base + math.ceil(Decimal(base) * self.spare_pct / 100)

    def conditions(self) -> Any:
        if self.temp_min_c is None or self.temp_max_c is None:
            return Conditions()
        return Conditions(temp_min_c=self.temp_min_c, temp_max_c=self.temp_max_c)

    def to_json(self) -> dict[str, Any]:
        return {"boards": self.boards, "spare_pct": float(self.spare_pct),
                "temp_min_c": None if self.temp_min_c is None else float(self.temp_min_c),
                "temp_max_c": None if self.temp_max_c is None else float(self.temp_max_c),
                "combine": self.combine, "allow": sorted(self.allow)}


def kit_options(boards: int, *, temp: str | None = None, spare: str | None = None,
                combine: bool = False, allow: Iterable[str] = ()) -> KitOptions:
    """Options from the words a user typed (``--temp 0..50``, ``--spare 5%``, ``--allow ...``).

    Raises:
        BadValue: a value does not read, naming the option and what it accepts.

    >>> kit_options(5, temp="-10..60", spare="5%").to_json()["temp_min_c"]
    -10.0
    """

    low = high = None
    if temp:
        low, high = parse_temperature_range(temp, "--temp")
    words = frozenset(w.strip().lower() for item in allow for w in item.split(",") if w.strip())
    return KitOptions(boards=boards, spare_pct=parse_percent(spare, "--spare") if spare else Decimal(0),
                      temp_min_c=low, temp_max_c=high, combine=combine, allow=words)


def _search_requirement(line: BomLine, options: KitOptions) -> Any:
    """The requirement handed to the search: the BOM's limits less what ``allow`` relaxes.

    The rated voltage is checked here (the BOM gives a rating, not a working voltage), and so is
    the dielectric class, so those are not passed on. Marginal grades are let through and rank
    after fit ones (grading calls every X-only part marginal for mains, as it may not go
    line to earth; the class check here keeps it to the class the line names).
    """

    allow = options.allow
    lower_ok = "lower-class" in allow and line.application not in ("tuned", "mains")
    tol = line.tol_pct if "looser-tolerance" not in allow else None
    if tol is not None and not Decimal(0) < tol < 100:
        tol = None
    family = line.dielectric.family if line.dielectric is not None else None
    return Requirement(
        capacitance_pf=line.capacitance_pf, tol_pct=tol,
        tempco_min=None if lower_ok else line.tempco_min,
        tempco_max=None if lower_ok else line.tempco_max,
        application=line.application, allow_marginal=True,
        conditions=options.conditions(), family=family,
        safety_class=_search_safety(line.safety_class), qty=1)


def _search_safety(wanted: str | None) -> str | None:
    """One class for the search: of a dual marking (X1Y2) the Y class, which also covers X ones.

    :func:`stock.kit_rules.check_part` then checks every class named.
    """

    reading = read_safety_class(wanted) if wanted else None
    return reading.code if reading else None


def describe_line(line: BomLine, options: KitOptions, qty: int = 1) -> str:
    """The line's full requirement in words, for ordering what is short."""
    code = line.dielectric.code if line.dielectric is not None else None
    req = Requirement(
        capacitance_pf=line.capacitance_pf,
        tol_pct=line.tol_pct if line.tol_pct is not None and 0 < line.tol_pct < 100 else None,
        tempco_min=line.tempco_min, tempco_max=line.tempco_max,
        application=line.application, conditions=options.conditions(),
        safety_class=_search_safety(line.safety_class), qty=max(qty, 1))
    words = req.describe()
    extra = [code] if code and code not in words else []
    if line.voltage_v is not None:
        extra.append(f"rated ≥ {format_voltage(line.voltage_v, line.voltage_kind or 'DC')}")
    if line.polarised:
        extra.append("polarised")
    if line.package is not None and line.package.known:
        extra.append(line.package.describe())
    return ", ".join([words, *extra])


def _marking_of(store: Store, bin_id: int) -> tuple[Marking, str, dict[str, Any]] | None:
    row = store.one("SELECT p.*, b.bin_key, b.location FROM parts p JOIN bins b ON b.id = p.bin_id"
                    " WHERE p.bin_id = ?", (bin_id,))
    if row is None:
        return None
    return part_marking(row), row["marking"], row


# Open flags that question what a bin holds or its condition; such bins are used last.
DOUBT_KINDS = ("shelf-life", "label-conflict", "ambiguous-code", "disputed-code", "both-ends",
               "layout-ambiguous", "conflicting-readings", "unreadable", "duplicate", "unit-assumed",
               "tolerance-by-value", "spelling-corrected", "unparsed")


def _doubts(store: Store) -> dict[int, tuple[str, ...]]:
    found: dict[int, list[str]] = {}
    marks = ",".join("?" * len(DOUBT_KINDS))
    for row in store.rows(f"SELECT DISTINCT bin_id, kind FROM flags WHERE status = 'open'"
                          f" AND bin_id IS NOT NULL AND kind IN ({marks}) ORDER BY kind", DOUBT_KINDS):
        found.setdefault(row["bin_id"], []).append(row["kind"])
    return {k: tuple(v) for k, v in found.items()}


def _hold(store: Store, plan_id: int, line_id: int, bin_id: int, qty: int) -> None:
    store.db.conn.execute("INSERT INTO reservations (plan_id, line_id, bin_id, qty) VALUES (?,?,?,?)",
                          (plan_id, line_id, bin_id, qty))


def _packages(store: Store, bin_ids: list[int]) -> dict[int, Any]:
    """Each bin's package facts, read from the package and mounting the store holds for it."""
    found: dict[int, Any] = {}
    for start in range(0, len(bin_ids), 500):
        chunk = bin_ids[start:start + 500]
        for row in store.rows(f"SELECT bin_id, package, mounting FROM parts WHERE bin_id IN"
                              f" ({','.join('?' * len(chunk))})", chunk):
            text = " ".join(t for t in (row["package"], row["mounting"]) if t)
            found[row["bin_id"]] = read_package(text)
    return found


def _listed(what: str, items: list[str]) -> str:
    return f"{what}: " + "; ".join(items[:3]) + (" ..." if len(items) > 3 else "")


def _pool(store: Store, line: BomLine, options: KitOptions, req: Any,
          to_measure: bool = False) -> tuple[list[Candidate], list[str], list[str]]:
    """The bins that may feed a line, and why the others may not (the rules, the footprint).

    With ``to_measure``, the bins whose tolerance is not marked for a line that names one.
    """

    refused: list[str] = []
    misfits: list[str] = []
    pool: list[Candidate] = []
    doubts = _doubts(store)
    matches = candidates(store, req, to_measure=to_measure)
    packages = _packages(store, [m.bin_id for m in matches]) if line.package is not None else {}
    # a part to measure passes the line's tolerance rule as "tolerance unknown"; its note says so
    allow = options.allow | {"looser-tolerance"} if to_measure else options.allow
    for match in matches:
        marking = match.decoded if match.decoded is not None else _marking_of(store, match.bin_id)[0]
        verdict = check_part(line, marking, match.capacitance_pf, allow)
        if verdict.refused:
            refused.append(f"{match.bin_key} ({match.marking}): {verdict.refused}")
            continue
        fit, why, fit_note = True, "", ""
        if line.package is not None and match.bin_id in packages:
            held = packages[match.bin_id]
            fit, why = fits(held, line.package)
            if fit and held.known and line.package.known:
                fit_note = f"{held.describe()}, fits {line.package.describe_pads()}"
        if fit is False:
            misfits.append(f"{match.bin_key} ({match.marking}): {why}")
            continue
        free = store.available(match.bin_id)        # re-read inside this plan's transaction
        if free <= 0:
            continue
        rank, words = capability(line, marking, match.capacitance_pf)
        pool.append(Candidate(match.bin_id, match.bin_key, match.location, marking,
                              match.capacitance_pf, free, match.grade, tuple(match.reasons),
                              exact=match.capacitance_pf == line.capacitance_pf,
                              doubts=doubts.get(match.bin_id, ()), capability=rank,
                              capability_words=words, package_doubt=why if fit is None else "",
                              package_fit=fit_note))
    return pool, refused, misfits


def _tol_text(value: Decimal | None) -> str:
    return "no tolerance" if value is None else f"±{format_number(value)} %"


def _singles(store: Store, line: BomLine, options: KitOptions, need: int,
             notes: list[str]) -> dict[int, int]:
    """Bins and quantities of single parts for a line (at most ``need``), with their notes.

    Proven parts first; where a line names a tolerance and they fall short, parts whose tolerance
    is not marked fill the rest, each noted as a part to measure.
    """
    req = _search_requirement(line, options)
    pool, refused, misfits = _pool(store, line, options, req)
    taken: dict[int, int] = {}
    chosen = choose_bins(need, pool)
    left = need - sum(qty for _, qty in chosen)
    measured: list[tuple[Candidate, int]] = []
    if left > 0 and req.tol_pct is not None:
        extra, _, _ = _pool(store, line, options, req, to_measure=True)
        measured = choose_bins(left, extra) if extra else []
    for cand, qty in chosen + measured:
        taken[cand.bin_id] = qty
        if cand.package_doubt or cand.package_fit:
            notes.append(f"{cand.bin_key}: {cand.package_doubt or cand.package_fit}")
        if cand.doubts:
            notes.append(f"{cand.bin_key}: used although it has open flags ({', '.join(cand.doubts)});"
                         " see `stock flags`")
        if (cand, qty) in measured:
            notes.append(f"{cand.bin_key}: filled with parts to measure: its tolerance is not marked;"
                         f" measure each before fitting (the line asks {_tol_text(line.tol_pct)})")
            continue
        verdict = check_part(line, cand.marking, cand.capacitance_pf, options.allow)
        notes.extend(f"{cand.bin_key}: {note}" for note in verdict.notes)
        if cand.marking.tolerance is None and line.application not in ("bypass", "bulk", "mains"):
            notes.append(f"{cand.bin_key}: tolerance not marked: parts to measure before fitting where"
                         " the value matters")
        if cand.grade == "marginal":
            why = next((r for r in cand.grade_reasons if r.startswith("marginal")),
                       f"marginal for {line.application}")
            notes.append(f"{cand.bin_key}: {why}")
    notes.extend(order_notes(line, chosen, pool))
    if misfits:
        notes.append(_listed("does not fit the footprint", misfits))
    if sum(taken.values()) < need and refused:
        notes.append(_listed("not used", refused))
    elif not taken and not pool and not misfits:

        notes.extend(f"no single part: {why}" for why in find(store, req).explanation[:2])
    return taken


def _pair_text(combo: Any) -> str:
    parts = []
    for p in combo.parts:
        parts.append(f"{format_capacitance(p.capacitance_pf)} from {p.bin_key}"
                     + (f" ×{p.count}" if p.count > 1 else ""))
    worst = (f", worst case ±{combo.worst_case_pct:.2f} %" if combo.worst_case_pct is not None else "")
    return (f"{combo.kind} pair: {' + '.join(parts)} = {format_capacitance(combo.capacitance_pf)}"
            f"{worst}")


def _pairs(store: Store, plan_id: int, line_id: int, line: BomLine, options: KitOptions,
           left: int, notes: list[str]) -> int:
    """Pairs for up to ``left`` positions (two parts per position), held as they are chosen.

    Returns the positions filled.
    """

    filled = 0
    refused: list[str] = []
    for combo in find(store, _search_requirement(line, options), combine=True).combinations:
        if filled >= left:
            break
        per_position: dict[int, int] = defaultdict(int)
        for part in combo.parts:
            per_position[part.bin_id] += part.count
        verdicts = []
        for bin_id in per_position:
            found = _marking_of(store, bin_id)
            verdicts.append(check_part(line, found[0], None, options.allow, in_pair=True)
                            if found else Verdict("no part recorded"))
        why_not = next((f"{key}: {v.refused}" for key, v in
                        zip((p.bin_key for p in combo.parts), verdicts) if v.refused), None)
        if why_not:
            if len(refused) < 2:
                refused.append(f"{_pair_text(combo)} ({why_not})")
            continue
        if line.tol_pct is not None and "looser-tolerance" not in options.allow:
            if combo.worst_case_pct is None or combo.worst_case_pct > line.tol_pct:
                continue
        elif line.tol_pct is None and combo.capacitance_pf != line.capacitance_pf:
            continue
        positions = min(store.available(b) // n for b, n in per_position.items())
        use = min(positions, left - filled)
        if use <= 0:
            continue
        for bin_id, n in per_position.items():
            _hold(store, plan_id, line_id, bin_id, n * use)
        filled += use
        notes.append(f"{use} position{'' if use == 1 else 's'} from a {_pair_text(combo)}; two parts"
                     " per position")
        for v in verdicts:
            notes.extend(v.notes)
    if filled < left and refused:
        notes.append("pairs not used: " + "; ".join(refused))
    return filled


def _line_details(line: BomLine, describe: str) -> dict[str, Any]:
    def f(v: Decimal | None) -> float | None:
        return None if v is None else float(v)

    return {
        "row": line.row, "value": line.value_text, "kind": line.kind, "describe": describe,
        "capacitance_pf": f(line.capacitance_pf), "tol_pct": f(line.tol_pct),
        "voltage_v": f(line.voltage_v), "voltage_kind": line.voltage_kind,
        "dielectric": line.dielectric.code if line.dielectric else None,
        "family": line.dielectric.family if line.dielectric else None,
        "tempco_min": f(line.tempco_min), "tempco_max": f(line.tempco_max),
        "application": line.application, "safety_class": line.safety_class,
        "polarised": line.polarised, "qty_per_board": line.qty_per_board,
        "error": line.problem.to_json() if line.problem else None,
        "fitted": line.fitted, "not_fitted": line.not_fitted_reason or None,
        "package": line.package.to_json() if line.package is not None else None,
    }


def _plan_line(store: Store, plan_id: int, line_no: int, line: BomLine,
               options: KitOptions) -> None:
    conn = store.db.conn
    if not line.fitted:
        conn.execute("INSERT INTO plan_lines (plan_id, line_no, refs_json, need, short, tracked,"
                     " requirement_json, notes_json) VALUES (?,?,?,0,0,0,?,?)",
                     (plan_id, line_no, json.dumps(line.refs),
                      json.dumps(_line_details(line, f"not fitted: {line.value_text}")),
                      json.dumps([f"not fitted: {line.not_fitted_reason}; nothing taken"])))
        return
    if not line.tracked:
        need = line.qty_per_board * options.boards
        conn.execute("INSERT INTO plan_lines (plan_id, line_no, refs_json, need, short, tracked,"
                     " requirement_json, notes_json) VALUES (?,?,?,?,0,0,?,?)",
                     (plan_id, line_no, json.dumps(line.refs), need,
                      json.dumps(_line_details(line, f"{line.kind}: {line.value_text}")),
                      json.dumps([f"not tracked: {line.kind}"])))
        return
    need = options.need(line.qty_per_board)
    notes: list[str] = list(line.remarks)
    if line.problem is not None or line.capacitance_pf is None:
        problem = line.problem
        notes.append(f"cannot plan: {problem}" if problem else "cannot plan: no value")
        conn.execute("INSERT INTO plan_lines (plan_id, line_no, refs_json, need, short, tracked,"
                     " requirement_json, notes_json) VALUES (?,?,?,?,?,1,?,?)",
                     (plan_id, line_no, json.dumps(line.refs), need, need,
                      json.dumps(_line_details(line, f"unreadable: {line.value_text!r}")),
                      json.dumps(notes)))
        return
    describe = describe_line(line, options)
    cur = conn.execute("INSERT INTO plan_lines (plan_id, line_no, refs_json, need, short, tracked,"
                       " requirement_json, notes_json) VALUES (?,?,?,?,?,1,?,'[]')",
                       (plan_id, line_no, json.dumps(line.refs), need, need,
                        json.dumps(_line_details(line, describe))))
    line_id = cur.lastrowid
    filled = 0
    if need > 0:
        singles = _singles(store, line, options, need, notes)
        for bin_id, qty in singles.items():
            _hold(store, plan_id, line_id, bin_id, qty)
        filled = sum(singles.values())
        if filled < need and options.combine:
            if line.is_mains:
                notes.append("no pairs on a mains position: one rated part per position")
            else:
                filled += _pairs(store, plan_id, line_id, line, options, need - filled, notes)
    short = need - filled
    if short:
        notes.append(f"short {short}: order {describe_line(line, options, short)}")
    notes = list(dict.fromkeys(notes))      # the same substitution named once per line
    conn.execute("UPDATE plan_lines SET short = ?, notes_json = ? WHERE id = ?",
                 (short, json.dumps(notes), line_id))


def plan_kit(store: Store, bom: Bom | str | Path, options: KitOptions, *,
             sheet: str | None = None, overrides: dict[str, str] | None = None) -> KitPlan:
    """Make a numbered plan for a BOM and reserve its parts, all in one transaction.

    Args:
        store: the open stock database.
        bom: a BOM already read (:func:`stock.bom.read_bom`) or the path of one.
        options: boards, spare, temperature range, pairs, allowances.
        sheet, overrides: passed to :func:`stock.bom.read_bom` when ``bom`` is a path.

    Returns:
        The plan as stored (:func:`stock.kit_plans.load_plan`).

    Raises:
        BadSheet: the BOM cannot be read.
        StoreProblem: the database is locked past its timeout, read-only or full.
    """
    if not isinstance(bom, Bom):
        bom = read_bom(bom, sheet=sheet, overrides=overrides)
    with store.writing() as db:
        cur = db.conn.execute(
            "INSERT INTO plans (created_at, boards, bom_path, status, options_json)"
            " VALUES (?, ?, ?, 'reserved', ?)",
            (now(), options.boards, bom.file, json.dumps(options.to_json())))
        plan_id = cur.lastrowid
        for line_no, line in enumerate(bom.lines, start=1):
            try:
                with store.writing():          # a savepoint: a line that fails leaves no trace
                    _plan_line(store, plan_id, line_no, line, options)
            except BadValue as exc:
                problem = BomProblem(line.row, None, line.value_text, str(exc))
                _plan_line(store, plan_id, line_no, replace(line, problem=problem), options)
        return load_plan(store, plan_id)


__all__ = ["ALLOWANCES", "KitOptions", "describe_line", "kit_options", "plan_kit"]
