"""Replace a part: what on the shelf can stand in for the part in the repairer's hand.

The part is given as its marking (anything :func:`stock.markings.decoder.decode` reads, colour
codes included, plus the words ``axial``/``radial``/``tubular``/``SMD`` for its mounting) or as a
bin of the store. :func:`implied_need` turns it into what a stand-in must meet:

- **value**: within the original's marked tolerance (the tighter side of an asymmetric one); with no
  tolerance marked, the same nominal value (within 1 %, as :mod:`stock.matching.requirement` reads it);
- **voltage**: a rating at least the original's, of the same kind (an AC rating for an AC part; a
  DC part may take an AC-rated one whose peak, √2 × V, reaches it); ``--volts`` also derates for the
  circuit's own voltage; across the mains the bar is an AC rating of at least the mains voltage;
- **stability**: the stand-in drifts no more than the original over the same conditions
  (temperature, ageing and DC bias: :func:`stock.physics.grading.worst_case`), unless a rule of
  :mod:`stock.matching.substitutions` admits it by the job instead (mica ↔ C0G/NP0 for tuned work);
  ``--use`` asks for more (the stand-in must grade fit for the job); ``allow_less_stable`` drops the bar;
- **polarity**: a non-polarised part may replace a polarised one; a polarised part for a
  non-polarised one only with the caution and the orientation rule, never on AC or the mains;
- **safety**: across the mains only a part whose IEC 60384-14 class covers the original's
  (:meth:`stock.markings.safety_classes.SafetyClass.covers`), never a pair;
- **mounting**: the same when known, else a change the trade allows, with its note.

The shelf is searched by the find machinery (:func:`stock.matching.search.candidates` and
:func:`~stock.matching.search.find` for pairs); :mod:`stock.matching.stand_ins` judges each part
found against the rules and says what differs.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, replace
from decimal import Decimal
from typing import Any

from stock.decoded import Marking
from stock.errors import BadValue, NotFound
from stock.inventory.bins import part_marking, stored_marking
from stock.markings.decoder import decode
from stock.markings.description import summary
from stock.markings.cautions import DEFER_CAUTION, POLARISED_FOR_PLAIN_CAUTION, POLARITY_MARKS_CAUTION, RETUNE_CAUTION, cautions as marking_cautions
from stock.markings.families import family_dielectric
from stock.markings.preferred_values import nearest, series_for_tolerance
from stock.markings.safety_classes import CAUTION as MAINS_CAUTION, read_safety_class
from stock.markings.typed_values import parse_voltage
from stock.matching.requirement import DEFAULT_BUY_TOL_PCT, Requirement, fmt
from stock.matching.part_checks import tolerance_pct
from stock.matching.search import Combination, Match, candidates, find
from stock.matching.stand_ins import (TUNED_KINDS, Need, StandIn, judge, part_names, pair_stand_in,
                                      single_stand_in, stand_in_rank)
from stock.matching.substitutions import FIFTEEN_PCT_CLASS2, FILMS, NEVER_STAND_INS, rules_from
from stock.physics import combining
from stock.physics.grading import APPLICATIONS, Conditions, grade, kind_of, worst_case
from stock.physics.stability import SHELF_LIFE, is_polarised
from stock.store.database import Store
from stock.units import format_capacitance, format_voltage, parse_temperature_range

POSITIONS = ("line-line", "line-earth")
# Mounting words on a part or in a sheet's mounting/package cell. Common practice, no published source.
MOUNTING_WORDS: dict[str, str] = {
    "axial": "axial",
    "tubular": "axial",    # a tubular part has a lead at each end
    "radial": "radial",
    "snap-in": "radial",
    "smd": "smd",
    "smt": "smd",
    "chip": "smd",
}
_BODY_WORDS = frozenset({"can"})   # says the body, not the mounting: read and set aside
_CHIP_SIZE = re.compile(r"\b(0201|0402|0603|0805|1206|1210|1812|2220)\b")
_WORD = re.compile(r"[a-z\-]+")


@dataclass(frozen=True)
class Original:
    """The part to replace: its decoded marking, where it came from, its mounting when known."""

    text: str
    marking: Marking
    bin_key: str | None = None
    bin_id: int | None = None
    mounting: str | None = None
    notes: tuple[str, ...] = ()
    package: str | None = None

    def to_json(self) -> dict[str, Any]:
        return {"text": self.text, "bin": self.bin_key, "mounting": self.mounting, "package": self.package,
                "summary": summary(self.marking), "decoded": self.marking.to_json(), "notes": list(self.notes)}


def mounting_of(*texts: str | None) -> str | None:
    """The mounting a marking or a sheet's mounting/package cell names, if any.

    >>> mounting_of("47uF 25V axial can"), mounting_of(None, "0805"), mounting_of("104")
    ('axial', 'smd', None)
    """
    for text in texts:
        if not text:
            continue
        for word in _WORD.findall(text.lower()):
            if word in MOUNTING_WORDS:
                return MOUNTING_WORDS[word]
        if _CHIP_SIZE.search(text):
            return "smd"
    return None


def _strip_mounting(text: str) -> str:
    kept = [w for w in text.split() if w.lower().strip(",;") not in MOUNTING_WORDS
            and w.lower().strip(",;") not in _BODY_WORDS]
    return " ".join(kept)


def _bin_named(store: Store, text: str) -> dict[str, Any] | None:
    """The bin whose key or location is ``text``; labels and numbers are left out, since a label
    ("330p") or a number ("104") is more often the value the user means.

    Raises:
        NotFound: a location shared by several bins (their keys are named).
    """
    if text.isdigit():
        return None
    found = store.rows("SELECT * FROM bins WHERE bin_key = ? COLLATE NOCASE", (text,)) or \
        store.rows("SELECT * FROM bins WHERE location = ? COLLATE NOCASE", (text,))
    if len(found) > 1:
        raise NotFound("single bin", text, "one of " + ", ".join(r["bin_key"] for r in found[:6]))
    return found[0] if found else None


def read_original(store: Store | None, text: str) -> Original:
    """The part to replace, from a marking or a bin (by key or location, never by label or number).

    A text that names a bin and also reads as a marking is taken as the bin, and a note says so.

    Raises:
        BadValue: the text is neither a readable marking with a value nor a bin.
        NotFound: the text is a location several bins share.
    """
    raw = text.strip()
    marking = decode(_strip_mounting(raw))
    mounting = mounting_of(raw)
    found = _bin_named(store, raw) if store is not None and raw else None
    if found is not None:
        row = store.one("SELECT * FROM parts WHERE bin_id = ?", (found["id"],))
        if row is not None:
            notes = ()
            if marking.capacitance_pf is not None:
                notes = (f"{raw!r} names bin {found['bin_key']}; read as that bin's part",)
            return Original(raw, part_marking(row), found["bin_key"], found["id"],
                            mounting_of(row.get("mounting"), row.get("package"), row["marking"]), notes,
                            row.get("package"))
    if marking.capacitance_pf is None:
        raise BadValue("MARKING|BIN", raw, "a marking with a value, such as '470pF 5% silver mica 500V' or "
                                           "'white yellow violet red gold brown', or a bin key or location")
    return Original(raw, marking, mounting=mounting)


def _mains_class(original: Marking, position: str | None) -> tuple[str, tuple[str, ...]]:
    """The safety class a stand-in must cover across the mains, and why (IEC 60384-14)."""
    notes: list[str] = []
    have = read_safety_class(original.safety_class) if original.safety_class else None
    if have is None:
        if position is None:
            raise BadValue("--position", "", "line-line or line-earth: a mains position whose original "
                                             "carries no X/Y class needs its position named")
        code = "X2" if position == "line-line" else "Y1"
        notes.append(f"the original carries no X/Y class: a {position} position asks at least {code} "
                     + ("(IEC 60384-14, household mains)" if code == "X2" else
                        "(IEC 60384-14: Y1 is safe whether or not the set is earthed; a Y2 serves only "
                        "in earthed equipment)"))
        return code, tuple(notes)
    letter = {"line-line": "X", "line-earth": "Y"}.get(position or "")
    wanted = [c for c in have.classes if letter is None or c.startswith(letter)]
    if not wanted and letter == "Y":
        notes.append(f"the original's {have.code} is an X class but sits line–earth: that position needs "
                     "a Y class; asking Y1")
        wanted = ["Y1"]
    elif not wanted:
        wanted = list(have.classes)
    return read_safety_class("".join(wanted)).code, tuple(notes)


def _requirement_class(code: str) -> str:
    """The one subclass the find filter takes: the strictest Y if any, else the strictest X."""
    classes = sorted(read_safety_class(code).classes)
    ys = [c for c in classes if c.startswith("Y")]
    return (ys or classes)[0]


def _stability_bar(m: Marking, conditions: Conditions) -> tuple[Decimal | None, str]:
    """The original's worst-case drift at the conditions (largest side, %), and what it rests on."""
    budget = worst_case(m, conditions)
    basis = ""
    d = m.dielectric
    if budget.temperature is None and d is not None and d.family != "ceramic":
        budget = worst_case(replace(m, dielectric=family_dielectric(d.family)), conditions)
        basis = f"{d.code} states no tempco: judged by the family's typical figures; "
    if budget.temperature is None:
        return None, ("the original's stability is not known (" + ", ".join(budget.missing) + ")")
    drift = max(budget.drift_minus_pct, budget.drift_plus_pct)
    return drift, basis + budget.temperature.headline


def implied_need(original: Original, *, use: str | None = None, temp: str | None = None,
                 volts: str | None = None, position: str | None = None,
                 allow_less_stable: bool = False) -> Need:
    """What a stand-in for this part must meet (see the module docstring, rule by rule).

    Raises:
        BadValue: an option does not read, or a mains position lacks its position or its voltage.
    """
    m = original.marking
    if position is not None and position not in POSITIONS:
        raise BadValue("--position", position, "line-line or line-earth")
    if use is not None and use not in APPLICATIONS:
        raise BadValue("--use", use, "one of " + ", ".join(APPLICATIONS))
    conditions = Conditions()
    if temp:
        low, high = parse_temperature_range(temp, "--temp")
        conditions = Conditions(low, high)
    working = parse_voltage(volts, "--volts") if volts else None
    notes: list[str] = list(original.notes)
    mains = bool(m.safety_class) or position is not None or use == "mains"
    if mains and use not in (None, "mains"):
        raise BadValue("--use", use, "mains, or no --use: the part sits across the mains")
    tol, value_band = None, None
    band = tolerance_pct(m)
    if band is None:
        notes.append("the original's tolerance is not marked: the same nominal value is asked")
    else:
        # find searches the wider side; the exact band (asymmetric ones too) is checked per part
        tol = max(band) if max(band) < 100 else (min(band) if min(band) > 0 else None)
        value_band = combining.band(m.capacitance_pf, *band)
    needed = None
    floor, floor_kind = m.voltage_v, m.voltage_kind or ("DC" if m.voltage_v is not None else None)
    if mains:
        needed, more = _mains_class(m, position)
        notes.extend(more)
        if floor_kind != "AC":
            if floor is not None:
                notes.append(f"the original's {format_voltage(floor, floor_kind)} rating says nothing of mains "
                             "duty: the bar is an AC rating")
            floor = None
        if working is not None:
            floor = working if floor is None else max(floor, working)
        if floor is None:
            raise BadValue("--volts", "", "the mains voltage, such as 230: the original carries no AC rating")
        floor_kind = "AC"
    elif floor is None:
        notes.append("the original's rating is not marked: "
                     + ("only the circuit's --volts is checked" if working else "give --volts to check ratings"))
    bar, basis = (None, "across the mains the class and the rating decide") if mains else \
        _stability_bar(m, conditions)
    family = m.dielectric.family if m.dielectric else None
    requirement = Requirement(capacitance_pf=m.capacitance_pf, tol_pct=tol, working_v=working,
                              application=use or ("mains" if mains else None), conditions=conditions,
                              safety_class=_requirement_class(needed) if needed else None)
    return Need(requirement=requirement, value_band=value_band, kind=kind_of(m), names=frozenset(part_names(m)),
                voltage_floor=floor, voltage_kind=floor_kind, bar_pct=bar, bar_basis=basis,
                polarised=is_polarised(family, m.polarity), polarity=m.polarity, mounting=original.mounting,
                package=original.package,
                safety_needed=needed, use=use, mains=mains, allow_less_stable=allow_less_stable,
                notes=tuple(notes), original=m)


@dataclass(frozen=True)
class ReplaceResult:
    """The answer: the original, what it implies, the stand-ins (singles, then pairs) and cautions."""

    original: Original
    need: Need
    stand_ins: tuple[StandIn, ...]
    pairs: tuple[StandIn, ...]
    cautions: tuple[str, ...]
    explanation: tuple[str, ...] = ()
    buy: dict[str, Any] | None = None

    @property
    def suggestion(self) -> str | None:
        return self.buy["text"] if self.buy else None

    def to_json(self) -> dict[str, Any]:
        """The ``stock replace --json`` shape (stable contract)."""
        return {"original": self.original.to_json(), "requirement": self.need.to_json(),
                "stand_ins": [s.to_json() for s in self.stand_ins], "pairs": [p.to_json() for p in self.pairs],
                "cautions": list(self.cautions), "explanation": list(self.explanation),
                "suggestion": self.suggestion, "buy": self.buy}


def _shelf_rows(store: Store, bin_ids: list[int]) -> dict[int, tuple[Marking, str | None, str | None]]:
    """Each bin's stored marking, mounting (from its mounting or package cell, else its marking)
    and package cell."""
    if not bin_ids:
        return {}
    marks = ",".join("?" * len(bin_ids))
    rows = store.db.conn.execute(
        f"SELECT bin_id, decoded_json, settled_json, mounting, package, marking FROM parts"
        f" WHERE bin_id IN ({marks})", bin_ids).fetchall()
    return {r[0]: (stored_marking(r[1], r[2]), mounting_of(r[3], r[4], r[5]), r[4]) for r in rows}


def _singles(store: Store, need: Need, original: Original) -> tuple[list[StandIn], list[str]]:
    found: list[Match] = [m for m in candidates(store, need.requirement) if m.bin_id != original.bin_id]
    shelf = _shelf_rows(store, [m.bin_id for m in found])
    offered, refused = [], []
    for match in found:
        marking, mounting, package = shelf[match.bin_id]
        verdict = judge(need, marking, mounting)
        if verdict.ok:
            offered.append(single_stand_in(match, marking, mounting, verdict, need, package))
        else:
            refused.append(f"bin {match.bin_key} ({match.marking}): {verdict.why_not}")
    return offered, refused


def _pairs(store: Store, need: Need, original: Original, limit: int) -> tuple[list[StandIn], list[str]]:
    result = find(store, need.requirement, combine=True, limit=limit * 3)
    combos: list[Combination] = list(result.combinations)
    shelf = _shelf_rows(store, sorted({p.bin_id for c in combos for p in c.parts}))
    offered, refused = [], []
    lo, hi = need.requirement.value_window()
    for combo in combos:
        if any(p.bin_id == original.bin_id for p in combo.parts):
            continue
        if any(lo <= shelf[p.bin_id][0].capacitance_pf <= hi for p in combo.parts):
            continue    # one part alone already has the value: the other adds nothing a repair needs
        verdicts = [judge(need, shelf[p.bin_id][0], shelf[p.bin_id][1], in_series=combo.kind == "series",
                          in_pair=True)
                    for p in combo.parts]
        bad = next((v for v in verdicts if not v.ok), None)
        if bad is None and need.value_band is not None and (
                combo.worst_case_pct is None or combo.worst_case_pct > min(tolerance_pct(need.original))):
            refused.append(f"{combo.kind} pair {'+'.join(p.bin_key for p in combo.parts)}: may leave the "
                           "original's tolerance band")
            continue
        if bad is None and combo.kind == "series" and need.voltage_floor is not None and (
                combo.voltage_v is None or combo.voltage_v < need.voltage_floor):
            bad_text = (f"the pair stands {fmt(combo.voltage_v or Decimal(0))} V, below the original's "
                        f"{format_voltage(need.voltage_floor, need.voltage_kind)}")
            refused.append(f"{combo.kind} pair {'+'.join(p.bin_key for p in combo.parts)}: {bad_text}")
            continue
        if bad is not None:
            refused.append(f"{combo.kind} pair {'+'.join(p.bin_key for p in combo.parts)}: {bad.why_not}")
            continue
        offered.append(pair_stand_in(combo, [shelf[p.bin_id] for p in combo.parts], verdicts, need))
    return offered, refused


_KIND_WORDS = {"C0G": "C0G/NP0 ceramic", "aluminium-electrolytic": "aluminium electrolytic",
               "tantalum-polymer": "polymer tantalum", "ceramic-1": "Class 1 ceramic",
               "ceramic-2": "Class 2 ceramic"}


def _kinds_to_buy(need: Need) -> list[str]:
    """The kinds a buyer should look for: the trade's named stand-ins first, then the original's own."""
    words: list[str] = []
    for rule in rules_from(set(need.names), mains=need.mains, use=need.use):
        tokens = rule.stand_ins
        if tokens == FILMS:
            words.append("film (polypropylene or polyester)")
        elif tokens == FIFTEEN_PCT_CLASS2:
            words.append("X7R or better")
        else:
            words.extend(_KIND_WORDS.get(t, t.replace("-", " ")) for t in sorted(tokens) if t != "safety")
    own_fit = need.use is None or grade(need.original, need.use, need.conditions).word == "fit"
    if need.kind and need.kind not in NEVER_STAND_INS and own_fit:
        own = need.original.dielectric.code if need.kind == "ceramic-2" and need.original.dielectric else need.kind
        words.insert(0, _KIND_WORDS.get(own, own.replace("-", " ")))
    return list(dict.fromkeys(words))


def _buy(need: Need) -> dict[str, Any]:
    """What to buy when nothing on the shelf will do: the IEC 60063 value nearest, the kind, the rating."""
    req = need.requirement
    band = tolerance_pct(need.original)
    tol = min(band) if band is not None and min(band) > 0 else DEFAULT_BUY_TOL_PCT   # the tighter side
    name = series_for_tolerance(tol)
    value = nearest(req.capacitance_pf, name)
    if need.mains:
        kinds = [f"an X/Y safety capacitor of class {need.safety_needed} or one that covers it"]
    else:
        kinds = _kinds_to_buy(need) or ["a part whose dielectric you know"]
    words = [f"{format_capacitance(value)} ±{fmt(tol)} %", " or ".join(kinds)]
    if need.voltage_floor is not None:
        words.append(f"rated ≥ {format_voltage(need.voltage_floor, need.voltage_kind)}")
    text = "buy " + ", ".join(words)
    if value != req.capacitance_pf:
        text += f" (the {name} value nearest {format_capacitance(req.capacitance_pf)})"
    return {"text": text, "capacitance_pf": float(value), "series": name, "tol_pct": float(tol),
            "kinds": kinds, "voltage_v": None if need.voltage_floor is None else float(need.voltage_floor),
            "voltage_kind": need.voltage_kind}


def _cautions(need: Need, original: Original, offered: list[StandIn]) -> tuple[str, ...]:
    out = list(marking_cautions(original.marking))
    if need.mains:
        out.insert(0, MAINS_CAUTION)
    for stand_in in offered:
        for part in stand_in.parts:
            out.extend(marking_cautions(part.marking))
            kind = kind_of(part.marking)
            if kind in ("aluminium-electrolytic", "bipolar-electrolytic", "polystyrene"):
                out.append(f"{kind.replace('-', ' ').capitalize()}: {SHELF_LIFE[kind]}.")
        if stand_in.polarity_swap:
            out.append(POLARITY_MARKS_CAUTION)
        if stand_in.polarised_for_plain:
            out.append(POLARISED_FOR_PLAIN_CAUTION)
    if need.use == "tuned" or need.kind in TUNED_KINDS:
        out.append(RETUNE_CAUTION)
    out.append(DEFER_CAUTION)
    return tuple(dict.fromkeys(out))


def replace_part(store: Store, text: str, *, use: str | None = None, temp: str | None = None,
                 volts: str | None = None, position: str | None = None, combine: bool = False,
                 allow_less_stable: bool = False, limit: int = 10) -> ReplaceResult:
    """The stand-ins on the shelf for a part, ranked (singles first, then pairs with ``combine``).

    Never a pair across the mains. With nothing to offer, the answer says what ruled out the parts
    nearest in value and what to buy (the IEC 60063 value nearest and the kind).

    Raises:
        BadValue: the part does not read, an option is wrong, or ``limit`` is below 1.
    """
    if limit < 1:
        raise BadValue("--limit", str(limit), "a number of stand-ins of 1 or more")
    original = read_original(store, text)
    need = implied_need(original, use=use, temp=temp, volts=volts, position=position,
                        allow_less_stable=allow_less_stable)
    singles, refused = _singles(store, need, original)
    pairs: list[StandIn] = []
    if combine and not need.mains:
        pairs, refused_pairs = _pairs(store, need, original, limit)
        refused.extend(refused_pairs)
    singles.sort(key=stand_in_rank)
    pairs.sort(key=stand_in_rank)
    singles, pairs = singles[:limit], pairs[:limit]
    explanation: tuple[str, ...] = ()
    buy = None
    if not singles and not pairs:
        searched = find(store, need.requirement, combine=combine and not need.mains)
        explanation = tuple(refused[:6]) + searched.explanation
        if need.bar_pct is None and not need.mains and not need.use:
            explanation = (f"{need.bar_basis}: add the dielectric to the marking (e.g. X7R, mica, "
                           "electrolytic), or name the job with --use",) + explanation
        if not explanation:
            explanation = ("no part on the shelf meets the value, tolerance, rating and job",)
        buy = _buy(need)
    return ReplaceResult(original, need, tuple(singles), tuple(pairs),
                         _cautions(need, original, singles + pairs), explanation, buy)


__all__ = ["MOUNTING_WORDS", "POSITIONS", "Original", "ReplaceResult", "implied_need", "mounting_of",
           "read_original", "replace_part"]
