"""The pick list of a plan: where to go, what marking to look for, how many, for which positions.

Rows are one per bin, sorted by location in natural order (``A2`` before ``A10``, the way a
person walks the drawers), then by bin key. Each row names the marking printed on the parts, the
count to take and the reference designators it feeds. Written as text (tab-separated, so it
pipes) or as an XLSX sheet (openpyxl write-only, through :mod:`stock.spreadsheet`, so no cell
text is ever taken for a formula). The plan's cautions come with both.

>>> natural_key("Cab2/A10") > natural_key("Cab2/A9")
True
"""

from __future__ import annotations

from collections import OrderedDict
from dataclasses import dataclass
from typing import Any

from stock.kitting.line_rules import natural_key
from stock.kitting.stored_plans import KitPlan, load_plan
from stock.markings.packages import read_package
from stock.store.database import Store
from stock.units import format_capacitance


@dataclass(frozen=True)
class PickRow:
    """One stop on the walk: a bin, what it is marked, how many to take, for which positions."""
    location: str | None
    bin_key: str
    marking: str
    value: str
    count: int
    refs: tuple[str, ...]
    package: str = ""               # the bin's package in words ("0805", "through-hole radial …")

    def to_json(self) -> dict[str, Any]:
        return {"location": self.location, "bin": self.bin_key, "marking": self.marking,
                "value": self.value, "count": self.count, "refs": list(self.refs),
                "package": self.package}


@dataclass(frozen=True)
class PickList:
    """The rows of a plan's pick list and the cautions to read before handling the parts."""
    plan: int
    status: str
    boards: int
    rows: tuple[PickRow, ...]
    cautions: tuple[str, ...]

    @property
    def total(self) -> int:
        return sum(r.count for r in self.rows)

    def to_json(self) -> dict[str, Any]:
        return {"plan": self.plan, "status": self.status, "boards": self.boards,
                "rows": [r.to_json() for r in self.rows], "total": self.total,
                "cautions": list(self.cautions)}


def _package_words(part: Any) -> str:
    """A bin's package as the picker reads it: the decoded facts, else the text as given."""
    text = " ".join(t for t in ((part or {}).get("package"), (part or {}).get("mounting")) if t)
    if not text:
        return ""
    facts = read_package(text)
    return facts.describe() if facts.known else text


def pick_list(store: Store, plan: int | str | KitPlan) -> PickList:
    """The pick list of a plan, one row per bin in natural location order.

    Raises:
        NotFound: no such plan.
    """

    kit = plan if isinstance(plan, KitPlan) else load_plan(store, plan)
    by_bin: OrderedDict[int, dict[str, Any]] = OrderedDict()
    for line in kit.tracked_lines:
        for alloc in line.allocations:
            entry = by_bin.setdefault(alloc.bin_id, {"alloc": alloc, "count": 0, "refs": []})
            entry["count"] += alloc.qty
            entry["refs"].extend(r for r in line.refs if r not in entry["refs"])
    rows = []
    for bin_id, entry in by_bin.items():
        alloc = entry["alloc"]
        part = store.one("SELECT capacitance_pf, package, mounting FROM parts WHERE bin_id = ?",
                         (bin_id,))
        value = ""
        if part and part["capacitance_pf"] is not None:
            from decimal import Decimal

            value = format_capacitance(Decimal(str(part["capacitance_pf"])))
        rows.append(PickRow(alloc.location, alloc.bin_key, alloc.marking, value, entry["count"],
                            tuple(entry["refs"]), _package_words(part)))
    rows.sort(key=lambda r: (natural_key(r.location), natural_key(r.bin_key)))
    return PickList(kit.id, kit.status, kit.boards, tuple(rows), kit.cautions)


def pick_list_text(pl: PickList) -> str:
    """Tab-separated rows under a header, then the cautions."""
    out = [f"# pick list for plan {pl.plan} ({pl.boards} board{'s' if pl.boards != 1 else ''},"
           f" {pl.status}): {pl.total} part{'s' if pl.total != 1 else ''} from {len(pl.rows)}"
           f" bin{'s' if len(pl.rows) != 1 else ''}",
           "location\tbin\tmarking\tvalue\tcount\trefs\tpackage"]
    for r in pl.rows:
        out.append(f"{r.location or '-'}\t{r.bin_key}\t{r.marking}\t{r.value}\t{r.count}\t"
                   f"{' '.join(r.refs)}\t{r.package}")
    out.extend(f"CAUTION: {c}" for c in pl.cautions)
    return "\n".join(out)


def _count(n: int, noun: str) -> str:
    return f"{n} {noun}{'' if n == 1 else 's'}"


def plan_text(kit: KitPlan) -> str:
    """A plan in words: each line with its bins, notes and shortfall, then not tracked, cautions."""
    out = [f"plan {kit.id}: {kit.boards} board{'s' if kit.boards != 1 else ''}, {kit.status},"
           f" {_count(len(kit.tracked_lines), 'capacitor line')}, {kit.short_lines} short"]
    for line in kit.tracked_lines:
        refs = " ".join(line.refs) or f"(row {line.row})"
        bins = ", ".join(f"{a.bin_key} ×{a.qty}" for a in line.allocations) or "nothing on hand"
        status = f"short {line.short}" if line.short else "ok"
        out.append(f"{line.line_no}\t{refs}\t{line.value}\tneed {line.need}\t{bins}\t{status}")
        out.extend(f"\t- {note}" for note in line.notes)
    if kit.not_tracked:
        out.append("not tracked (no bins for these kinds):")
        out.extend(f"\t{' '.join(l.refs) or '(row ' + str(l.row) + ')'}\t{l.value}\t{l.kind}"
                   f"\t{l.need}" for l in kit.not_tracked)
    if kit.not_fitted:
        out.append("not fitted (marked do-not-fit; nothing taken):")
        out.extend(f"\t{' '.join(l.refs) or '(row ' + str(l.row) + ')'}\t{l.value}\t{l.kind}"
                   f"\t{l.details.get('not_fitted') or ''}" for l in kit.not_fitted)
    out.extend(f"CAUTION: {c}" for c in kit.cautions)
    return "\n".join(out)


__all__ = ["PickList", "PickRow", "natural_key", "pick_list", "pick_list_text", "plan_text"]
