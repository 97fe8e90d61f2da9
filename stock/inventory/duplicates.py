"""The same part in several bins, probable mistyped copies, and moving one bin's stock into another.

Two kinds of duplicate, each raised as a ``duplicate`` flag naming the bins:

- **same part**: the decoded facts in force (settled reading if any) agree — capacitance,
  tolerance, voltage, dielectric code and family, safety class. Bins emptied by a merge are left
  out.
- **probable typo**: two bins with the same capacitance whose markings (or labels) differ by a
  character or two (rapidfuzz ``ratio`` ≥ :data:`TYPO_SCORE`, a label that is identical says
  nothing), or a marking the decoder could not fully read that is close to another bin's
  (≥ :data:`UNREAD_SCORE`): "104K 5OV" next to "104K 50V". Only parts whose stated facts do not
  contradict each other count (see :func:`compatible`): "104K 25V" and "104K 250V" are two parts.

:func:`merge` moves the whole quantity of one bin into another with two ``merge`` ledger
movements in one transaction, refuses parts whose facts differ unless forced, never puts parts
without a safety class into a safety-rated bin, and settles the duplicate flags naming both bins.

>>> same_facts_key({"capacitance_pf": 100000.0, "tol_minus": 10.0, "tol_plus": 10.0})[0]
100000.0
"""

from __future__ import annotations

import json
from collections import defaultdict
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any, Literal

from stock.decoded import Marking
from stock.errors import Refused
from stock.inventory.readings import current_marking, readings
from stock.inventory.stock_checks import FlagRun, sync_flags
from stock.store.database import Store
from stock.store.flag_records import close_flags, who
from stock.units import format_capacitance, format_tolerance, format_voltage

# Similarity cut-offs (rapidfuzz ratio, 0-100). One wrong character in a 12-character marking
# scores about 92, two score about 83; four-character codes that differ in one character
# ("104K"/"103K") score 75 and are different parts. # common practice, no published source
TYPO_SCORE = 90.0
UNREAD_SCORE = 80.0

# The facts two bins must share to hold "the same part" (flat parts columns).
_FACTS = ("capacitance_pf", "tol_minus", "tol_plus", "tol_unit", "voltage_v", "voltage_kind",
          "dielectric_code", "family", "safety_class")


def same_facts_key(part: Mapping[str, Any]) -> tuple[Any, ...]:
    """The decoded facts that make two parts the same part, as a hashable key."""
    return tuple(part.get(c) for c in _FACTS)


def compatible(a: Mapping[str, Any], b: Mapping[str, Any]) -> bool:
    """True when no fact stated by both parts disagrees (one may leave out what the other says).

    Two complete readings that differ (25 V and 250 V) are two parts, however alike the text.

    >>> compatible({"voltage_v": 50.0}, {"voltage_v": None}), compatible({"voltage_v": 25.0}, {"voltage_v": 250.0})
    (True, False)
    """
    return all(a.get(c) is None or b.get(c) is None or a.get(c) == b.get(c) for c in _FACTS)


def _norm(text: str | None) -> str:
    return " ".join((text or "").upper().split())


@dataclass(frozen=True)
class Duplicate:
    """Bins that hold the same part, or probably do (a typo)."""
    reason: Literal["same-part", "probable-typo"]
    bin_ids: tuple[int, ...]
    bin_keys: tuple[str, ...]
    message: str
    score: float | None = None

    @property
    def fingerprint(self) -> str:
        return f"duplicate|{self.reason}|" + "|".join(sorted(self.bin_keys))

    def to_json(self) -> dict[str, Any]:
        return {"reason": self.reason, "bins": list(self.bin_keys), "bin_ids": list(self.bin_ids),
                "message": self.message, "score": self.score}


_PARTS_SQL = f"""
SELECT b.id, b.bin_key, b.label, b.on_hand, p.marking, p.decoded_json, p.settled_json,
       {", ".join("p." + c for c in _FACTS)},
       (SELECT COUNT(*) FROM ledger l WHERE l.bin_id = b.id AND l.kind = 'merge' AND l.delta < 0)
           AS merged_out
FROM bins b JOIN parts p ON p.bin_id = b.id
ORDER BY b.id
"""


def find_duplicates(store: Store) -> list[Duplicate]:
    """Every group of bins holding the same part, then every probable-typo pair, in bin order."""
    from rapidfuzz import fuzz, process


    parts = [p for p in store.rows(_PARTS_SQL) if not (p["merged_out"] and p["on_hand"] == 0)]
    found: list[Duplicate] = []
    groups: dict[tuple[Any, ...], list[dict[str, Any]]] = defaultdict(list)
    for p in parts:
        if p["capacitance_pf"] is not None:
            groups[same_facts_key(p)].append(p)
    group_of: dict[int, tuple[Any, ...]] = {}
    for key, members in groups.items():
        for m in members:
            group_of[m["id"]] = key
        if len(members) > 1:
            keys = tuple(m["bin_key"] for m in members)
            words = _describe(current_marking(members[0]))
            found.append(Duplicate("same-part", tuple(m["id"] for m in members), keys,
                                   f"bins {', '.join(keys)} hold the same part ({words})"))

    by_value: dict[float, list[dict[str, Any]]] = defaultdict(list)
    for p in parts:
        if p["capacitance_pf"] is not None:
            by_value[p["capacitance_pf"]].append(p)
    pairs: dict[tuple[int, int], tuple[dict, dict, float, str]] = {}
    fits: dict[tuple[tuple[Any, ...], tuple[Any, ...]], bool] = {}
    for value, members in by_value.items():
        if len(members) < 2:
            continue
        why = f"same value ({format_capacitance(_dec(value))}), {{}} nearly alike"
        index = {m["id"]: m for m in members}
        for what, column in (("markings", "marking"), ("labels", "label")):
            texts = {m["id"]: _norm(m[column]) for m in members if m[column]}
            for a_id, text in texts.items():
                # rapidfuzz scores the whole group in C; the cut-off lets it stop early.
                for other_text, score, b_id in process.extract(
                        text, texts, scorer=fuzz.ratio, score_cutoff=TYPO_SCORE, limit=None):
                    a, b = index[a_id], index[b_id]
                    ka, kb = group_of[a_id], group_of[b_id]
                    if b_id <= a_id or ka == kb:
                        continue
                    if (ka, kb) not in fits:  # facts repeat across bins: judge each pair of keys once
                        fits[(ka, kb)] = compatible(a, b)
                    if not fits[(ka, kb)]:
                        continue
                    if what == "labels" and other_text == text:
                        continue  # an identical label says nothing about a typo
                    pairs.setdefault((a_id, b_id), (a, b, score, why.format(what)))

    unread = [p for p in parts if p["capacitance_pf"] is None
              or json.loads(p["settled_json"] or p["decoded_json"]).get("unparsed")]
    choices = {p["id"]: _norm(p["marking"]) for p in parts}
    by_id = {p["id"]: p for p in parts}
    for u in unread:
        others = {i: t for i, t in choices.items() if i != u["id"]}
        for _text, score, other_id in process.extract(_norm(u["marking"]), others, scorer=fuzz.ratio,
                                                      score_cutoff=UNREAD_SCORE, limit=3):
            a, b = sorted((u, by_id[other_id]), key=lambda r: r["id"])
            if (a["id"], b["id"]) not in pairs and compatible(a, b) and (
                    a["capacitance_pf"] is None or group_of.get(a["id"]) != group_of.get(b["id"])):
                pairs[(a["id"], b["id"])] = (a, b, score, "one marking is not fully read and"
                                             " is close to the other")
    for (_ia, _ib), (a, b, score, why) in sorted(pairs.items()):
        found.append(Duplicate(
            "probable-typo", (a["id"], b["id"]), (a["bin_key"], b["bin_key"]),
            f"bins {a['bin_key']} ({a['marking']!r}) and {b['bin_key']} ({b['marking']!r})"
            f" may hold the same part: {why} (score {score:.0f})", round(score, 1)))
    return found


def _dec(value: float):
    from decimal import Decimal

    return Decimal(str(value))


def _describe(m: Marking) -> str:
    return readings(m)[0].describe()


def raise_duplicate_flags(store: Store) -> FlagRun:
    """Raise a ``duplicate`` flag for each duplicate found; close open ones no longer true."""
    wanted = [dict(kind="duplicate", bin_id=d.bin_ids[0], fingerprint=d.fingerprint,
                   message=d.message, details=d.to_json()) for d in find_duplicates(store)]
    return sync_flags(store, ("duplicate",), wanted, "the bins no longer look alike",
                      per_bin=False)


def fact_differences(a: Marking, b: Marking) -> list[str]:
    """The decoded facts on which two parts differ, in words ("voltage: 25 V DC vs 50 V DC")."""
    def cap(m: Marking) -> str | None:
        return None if m.capacitance_pf is None else format_capacitance(m.capacitance_pf)

    def tol(m: Marking) -> str | None:
        return None if m.tolerance is None else format_tolerance(m.tolerance)

    def volt(m: Marking) -> str | None:
        return None if m.voltage_v is None else format_voltage(m.voltage_v, m.voltage_kind or "DC")

    def code(m: Marking) -> str | None:
        return m.dielectric.code if m.dielectric else None

    def family(m: Marking) -> str | None:
        return m.dielectric.family if m.dielectric else None

    facts = (("capacitance", cap), ("tolerance", tol), ("voltage", volt), ("dielectric", code),
             ("family", family), ("safety class", lambda m: m.safety_class),
             ("polarity", lambda m: m.polarity))
    return [f"{words}: {get(a) or 'not stated'} vs {get(b) or 'not stated'}"
            for words, get in facts if get(a) != get(b)]


@dataclass(frozen=True)
class MergeResult:
    """What :func:`merge` moved and settled."""
    from_key: str
    into_key: str
    moved: int
    into_on_hand: int
    ledger_ids: tuple[int, int]
    settled_flags: tuple[int, ...]
    warnings: tuple[str, ...]

    def to_json(self) -> dict[str, Any]:
        return {"from": self.from_key, "into": self.into_key, "moved": self.moved,
                "into_on_hand": self.into_on_hand, "ledger_ids": list(self.ledger_ids),
                "settled_flags": list(self.settled_flags), "warnings": list(self.warnings)}


def merge(store: Store, from_ref: str, into_ref: str, *, force: bool = False,
          note: str | None = None, by: str | None = None) -> MergeResult:
    """Move every part in one bin into another and settle the duplicate flags naming both.

    Two ``merge`` movements (−n from FROM, +n into INTO) are written in one transaction.

    Raises:
        NotFound: either bin is unknown.
        Refused: the same bin twice; an unknown quantity; parts reserved for a plan; decoded
            facts that differ (unless ``force``); parts without the INTO bin's safety class
            (never, even with ``force``).
    """
    actor = who(by)
    src, dst = store.find_bin(from_ref), store.find_bin(into_ref)
    action = f"merge bin {src['bin_key']} into {dst['bin_key']}"
    if src["id"] == dst["id"]:
        raise Refused(action, "they are the same bin")
    for b in (src, dst):
        if b["on_hand"] is None:
            raise Refused(action, f"the quantity in {b['bin_key']} is unknown;"
                          f" count it first (stock settle {b['bin_key']} --count N)")
    if store.reserved(src["id"]):
        raise Refused(action, f"{store.reserved(src['id'])} parts in {src['bin_key']} are reserved"
                      " for a plan; pull or drop the plan first")
    pa = store.one("SELECT * FROM parts WHERE bin_id = ?", (src["id"],))
    pb = store.one("SELECT * FROM parts WHERE bin_id = ?", (dst["id"],))
    warnings: list[str] = []
    if pa is not None and pb is not None:
        ma, mb = current_marking(pa), current_marking(pb)
        if mb.safety_class and ma.safety_class != mb.safety_class:
            raise Refused(action, f"{dst['bin_key']} holds {mb.safety_class} safety-rated parts and"
                          f" {src['bin_key']} does not carry that class; a part without the"
                          " rating must never stand in for a mains safety capacitor")
        differ = fact_differences(ma, mb)
        if differ and not force:
            raise Refused(action, "their parts differ (" + "; ".join(differ)
                          + "); settle the wrong reading first, or merge with --force")
        if differ:
            warnings.append("merged although the parts differ: " + "; ".join(differ))
        if (ma.voltage_v is not None and mb.voltage_v is not None and ma.voltage_v < mb.voltage_v):

            warnings.append(f"parts rated {format_voltage(ma.voltage_v, ma.voltage_kind or 'DC')} now"
                            f" sit in a bin marked {format_voltage(mb.voltage_v, mb.voltage_kind or 'DC')};"
                            " relabel or keep them apart")
    elif not force:
        raise Refused(action, "one of the bins holds no decoded part; merge with --force")
    n = int(src["on_hand"])
    ref = f"merge:{src['bin_key']}->{dst['bin_key']}"
    text = json.dumps({"from": src["bin_key"], "into": dst["bin_key"], "moved": n, "note": note,
                       "forced": bool(force and warnings)}, ensure_ascii=False)
    flags = store.rows(
        "SELECT id, details_json FROM flags WHERE kind = 'duplicate' AND status = 'open'")
    settled = tuple(f["id"] for f in flags
                    if {src["id"], dst["id"]} <= set(json.loads(f["details_json"]).get("bin_ids", [])))
    with store.writing():
        store.move(src["id"], -n, "merge", ref=ref, note=text, actor=actor)
        out_id = store.one("SELECT MAX(id) AS id FROM ledger WHERE bin_id = ?", (src["id"],))["id"]
        into = store.move(dst["id"], n, "merge", ref=ref, note=text, actor=actor)
        in_id = store.one("SELECT MAX(id) AS id FROM ledger WHERE bin_id = ?", (dst["id"],))["id"]
        close_flags(store, settled, {"via": "merge", "by": actor, "note": note,
                                     "decision": ref, "ledger_ids": [out_id, in_id]})
    return MergeResult(src["bin_key"], dst["bin_key"], n, into, (out_id, in_id), settled,
                       tuple(warnings))


__all__ = ["TYPO_SCORE", "UNREAD_SCORE", "Duplicate", "MergeResult", "compatible", "fact_differences",
           "find_duplicates", "merge", "raise_duplicate_flags", "same_facts_key"]
