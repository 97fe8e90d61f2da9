"""Which of the bins that meet a line to take first, so that precious parts are saved.

Every candidate here already meets the line (:func:`stock.kitting.line_rules.check_part`) and fits
its footprint or has an unrecorded package. Among them the bin that gives up least goes first
(common practice, no published source):

1. bins whose package is known to fit before bins whose package is not recorded;
2. fit grade before marginal, the exact value before a near one;
3. bins with no open flags before bins with open doubts;
4. the least capable part that will do (:func:`capability`): no spare safety rating, then the
   ordinary dielectric (Class 2 ceramic or aluminium before film, C0G, compensating ceramics,
   polystyrene or mica), then no tighter tolerance than asked, then no far higher voltage rating;
5. the fullest bin, then location order (``A2`` before ``A10``).

>>> from stock.decoded import Marking
>>> c = lambda key, n, rank=(0, 0, 0, 0): Candidate(len(key), key, key, Marking("104"), Decimal(1), n,
...                                                  "fit", capability=rank)
>>> [(b.bin_key, q) for b, q in choose_bins(12, [c("a", 5), c("bb", 20), c("ccc", 15)])]
[('bb', 12)]
>>> [(b.bin_key, q) for b, q in choose_bins(12, [c("a", 500, (0, 2, 0, 0)), c("bb", 20)])]
[('bb', 12)]
"""

from __future__ import annotations

from dataclasses import dataclass
from decimal import Decimal
from typing import Any

from stock.decoded import Marking
from stock.inventory.bins import natural_key
from stock.kitting.requirement_reading import POLARISED_FAMILIES
from stock.units import format_number, format_voltage

GRADE_RANK = {"fit": 0, "marginal": 1, "unknown": 2}

# How far a dielectric is from the ordinary bypass and bulk stock; higher is more precious
# (common practice, no published source).
FAMILY_RANK: dict[str, tuple[int, str]] = {
    "aluminium-electrolytic": (0, ""),
    "paper": (0, ""),
    "tantalum": (1, "tantalum"),
    "tantalum-polymer": (1, "polymer tantalum"),
    "bipolar-electrolytic": (1, "bipolar electrolytic"),
    "double-layer": (1, "double-layer"),
    "polyester": (1, "polyester film"),
    "polycarbonate": (2, "polycarbonate film"),
    "polyethylene-naphthalate": (2, "PEN film"),
    "polyphenylene-sulfide": (2, "PPS film"),
    "polypropylene": (3, "polypropylene film"),
    "polystyrene": (3, "polystyrene film"),
    "mica": (3, "mica"),
    "ptfe": (3, "PTFE film"),
    "glass": (3, "glass"),
}
CLASS1_RANK = 2         # C0G / NP0: stable, kept for the positions that need it
COMPENSATING_RANK = 3   # N750, P100 ...: made to cancel a coil's drift, rarely restocked
EVERYDAY_CLASS1_PF = Decimal(1000)   # common practice, no published source
HIGH_RATING_V = Decimal(250)     # a rating this high and 4× what is asked is a special part
VERY_HIGH_RATING_V = Decimal(1000)


@dataclass(frozen=True)
class Candidate:
    """A bin that could feed a line: what it holds, how many are free, its grade and its standing."""
    bin_id: int
    bin_key: str
    location: str | None
    marking: Marking
    capacitance_pf: Decimal
    available: int
    grade: str | None = None
    grade_reasons: tuple[str, ...] = ()
    exact: bool = True
    doubts: tuple[str, ...] = ()    # open flags that question the part (shelf life, a conflict …)
    capability: tuple[int, ...] = (0, 0, 0, 0)   # see capability(); lower gives up less
    capability_words: tuple[str, ...] = ()
    package_doubt: str = ""         # why its fit to the footprint is not known
    package_fit: str = ""           # how it fits the footprint, when that was checked

    @property
    def tier(self) -> tuple[int, int, int, int]:
        """Known fit before unknown package, fit before marginal, exact before near, clean before
        doubted (lower sorts first)."""
        return (1 if self.package_doubt else 0, GRADE_RANK.get(self.grade or "fit", 1),
                0 if self.exact else 1, 1 if self.doubts else 0)

    def order(self) -> tuple[Any, ...]:
        return (self.tier, self.capability, -self.available, natural_key(self.location),
                natural_key(self.bin_key))

    @property
    def precious(self) -> bool:
        return any(self.capability)

    def words(self) -> str:
        return ", ".join(self.capability_words)


def _tightness(tol_pct: Decimal | None) -> int:
    """±5 % and looser are everyday tolerances; ±2 % and ±1 % are kept for who asks for them."""
    if tol_pct is None:
        return 0
    return 2 if tol_pct <= 1 else 1 if tol_pct <= 2 else 0


def _dielectric_rank(marking: Marking) -> tuple[int, str]:
    d = marking.dielectric
    if d is None:
        return 0, ""
    if d.family == "ceramic":
        if d.klass == 1:
            if d.tempco_ppm_per_k is not None and d.tempco_ppm_per_k != 0:
                return COMPENSATING_RANK, f"{d.code} temperature-compensating ceramic"
            if marking.capacitance_pf is not None and marking.capacitance_pf <= EVERYDAY_CLASS1_PF:
                return 0, ""        # up to 1 nF, C0G is the everyday ceramic
            return CLASS1_RANK, f"{d.code} (Class 1)"
        return 0, ""
    return FAMILY_RANK.get(d.family, (1, d.family.replace("-", " ")))


def _asked_rank(line: Any) -> int:
    """The dielectric rank a line itself asks for: a part no more special than that gives up nothing."""
    if getattr(line, "dielectric", None) is not None:
        return _dielectric_rank(Marking("", dielectric=line.dielectric))[0]
    if getattr(line, "tempco_min", None) is not None:
        zero_inside = line.tempco_min <= 0 <= line.tempco_max
        return CLASS1_RANK if zero_inside else COMPENSATING_RANK
    if getattr(line, "application", None) in ("tuned", "timing"):
        return CLASS1_RANK      # these positions need a stable part
    return 0


def capability(line: Any, marking: Marking, capacitance_pf: Decimal | None) -> tuple[tuple[int, ...],
                                                                                  tuple[str, ...]]:
    """How much more a part can do than the line needs, as a rank (lower gives up less) and words.

    The rank compares, in order: a safety rating the line does not need (any class off mains, a
    covering class above the one asked on mains), the dielectric, a tolerance tighter than asked,
    a voltage rating far above what is asked.

    >>> from stock.kitting.bom import BomLine
    >>> from stock.markings.decoder import decode
    >>> line = BomLine(1, ("C1",), 1, "100n", True, "capacitor", capacitance_pf=Decimal(100000))
    >>> capability(line, decode("104K 50V X7R"), Decimal(100000))
    ((0, 0, 0, 0), ())
    >>> capability(line, decode("X2 104K 275VAC"), Decimal(100000))[1]
    ('safety-rated X2', '275 V AC rating')
    """

    words: list[str] = []
    safety = 0
    if marking.safety_class:
        wanted = getattr(line, "safety_class", None)
        if not wanted:
            safety = 2
            words.append(f"safety-rated {marking.safety_class}")
        elif marking.safety_class.upper() != wanted.upper():
            safety = 1
            words.append(f"{marking.safety_class}, a class above the {wanted} asked")
    dielectric, why = _dielectric_rank(marking)
    dielectric = max(0, dielectric - _asked_rank(line))
    if getattr(line, "polarised", False) and marking.dielectric is not None \
            and marking.dielectric.family in POLARISED_FAMILIES:
        dielectric = 0          # a polarised position asked for this kind of part
    if why and dielectric:
        words.append(why)
    tolerance = 0
    if marking.tolerance is not None and capacitance_pf:
        sides = marking.tolerance.as_percent(capacitance_pf)
        part_tol = max(sides) if sides else None
        tolerance = max(0, _tightness(part_tol) - _tightness(line.tol_pct))
        if tolerance and part_tol is not None:
            words.append(f"±{format_number(part_tol)} % tolerance")
    voltage = 0
    rating = marking.voltage_v
    asked = line.voltage_v if line.voltage_v is not None else Decimal(50)
    if rating is not None and rating >= HIGH_RATING_V and rating >= 4 * asked:
        voltage = 2 if rating >= VERY_HIGH_RATING_V else 1
        words.append(f"{format_voltage(rating, marking.voltage_kind or 'DC')} rating")
    return (safety, dielectric, tolerance, voltage), tuple(words)


def choose_bins(need: int, candidates: list[Candidate]) -> list[tuple[Candidate, int]]:
    """Bins and quantities for ``need`` parts in the order of the module docstring.

    Never more than a bin has free; a bin is emptied before the next is opened.

    >>> from stock.decoded import Marking
    >>> c = lambda key, n: Candidate(len(key), key, key, Marking("104"), Decimal(1), n, "fit")
    >>> [(b.bin_key, q) for b, q in choose_bins(30, [c("a", 5), c("bb", 20), c("ccc", 15)])]
    [('bb', 20), ('ccc', 10)]
    """
    chosen: list[tuple[Candidate, int]] = []
    left = need
    for cand in sorted((c for c in candidates if c.available > 0), key=Candidate.order):
        if left <= 0:
            break
        take = min(left, cand.available)
        chosen.append((cand, take))
        left -= take
    return chosen


def order_notes(line: Any, chosen: list[tuple[Candidate, int]], pool: list[Candidate]) -> list[str]:
    """What the plan says about precious bins: the ones passed over, the ones that had to be used."""
    notes: list[str] = []
    used = {c.bin_id for c, _ in chosen}
    if not chosen:
        return notes
    plainest = min(c.capability for c, _ in chosen)
    what = f"{line.application} position" if getattr(line, "application", None) else "position"
    # Passed over for its standing alone: a bin of no later tier that size and place would have
    # put first.
    first = chosen[0][0]
    reach = max(c.tier for c, _ in chosen)
    kept = [c for c in pool if c.bin_id not in used and c.capability > plainest and c.available > 0
            and c.tier <= reach and c.order()[2:] < first.order()[2:]]
    for cand in sorted(kept, key=Candidate.order)[:2]:
        notes.append(f"kept {cand.bin_key} ({cand.marking.text}: {cand.words()}) for the positions"
                     " that need it; a plainer part does this one")
    for cand, _ in chosen:
        if not cand.precious:
            continue
        plainer = [c for c in pool if c.capability < cand.capability and c.tier <= cand.tier]
        if plainer:
            notes.append(f"{cand.bin_key}: {cand.words()} used for this {what}: the plainer bins"
                         f" ({', '.join(c.bin_key for c in plainer[:3])}) do not cover the need")
        else:
            notes.append(f"{cand.bin_key}: {cand.words()} used for this {what}: no plainer part"
                         " that fits is on hand")
    return notes


__all__ = ["CLASS1_RANK", "COMPENSATING_RANK", "Candidate", "FAMILY_RANK", "GRADE_RANK", "capability",
           "choose_bins", "order_notes"]
