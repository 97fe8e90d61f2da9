"""What a bin label says: the decoded facts in engineering units, the fit-for mark, the scan code.

A label is built from what the store knows (the settled reading where a person confirmed one, the
stored grades at the default conditions, the open flags) through the inventory's public
functions; :mod:`stock.labels.render` decides where each fact goes on the label.

The fit-for mark is one tag per application, always in the table's order (tuned, timing,
signal, bypass, bulk, mains), each drawn by its grade: a filled box for ``fit``, an outlined box
for ``marginal``, a dashed box for ``unknown`` and the bare tag for ``unfit``.

>>> from decimal import Decimal
>>> from stock.decoded import Dielectric
>>> dielectric_text(Dielectric("C0G", "ceramic", 1, Decimal(0), Decimal(30), source="EIA-198 Class 1"))
'C0G 0±30 ppm/K'
>>> dielectric_text(Dielectric("X7R", "ceramic", 2, temp_min_c=Decimal(-55), temp_max_c=Decimal(125),
...                            change_minus_pct=Decimal(15), change_plus_pct=Decimal(15)))
'X7R ±15 % −55…125 °C'
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from decimal import Decimal
from typing import Any

from stock.decoded import Dielectric, Marking, Tolerance
from stock.errors import BadValue, NotFound, Refused
from stock.inventory.bins import bin_parts, bins_changed_since, open_flag_kinds
from stock.inventory.stored_grades import refresh_stored_grades, stored_grade_words
from stock.physics.applications import load_rules
from stock.scan_codes import bin_payload
from stock.units import format_capacitance, format_number, format_tolerance, format_voltage

# Two letters per application for the fit-for mark; an application a shop adds gets its first two.
FIT_TAGS: dict[str, str] = {
    "tuned": "TU",
    "timing": "TI",
    "signal": "SI",
    "bypass": "BY",
    "bulk": "BU",
    "mains": "MA",
}
GRADE_WORDS = ("fit", "marginal", "unknown", "unfit")

POLARITY_TEXT = {"positive-marked": "+ lead marked", "negative-marked": "− lead marked"}


@dataclass(frozen=True)
class LabelFacts:
    """Everything printed on one bin's label, as text (``None`` where the store does not know)."""
    bin_id: int
    bin_key: str
    location: str | None
    payload: str                      # what the QR code carries (see stock.scan_codes)
    value: str                        # "100 nF", or "?" when no capacitance was read
    tolerance: str | None             # "±10 %"
    voltage: str | None               # "100 V DC", "275 V AC"
    safety_class: str | None          # "X2"
    dielectric: str | None            # "X7R ±15 % −55…125 °C", "C0G 0±30 ppm/K", "polypropylene"
    polarity: str | None              # "− lead marked"
    marking: str                      # as written on the part (or the sheet)
    fitness: tuple[tuple[str, str, str], ...]   # (application, tag, grade word), table order
    look: tuple[str, ...] = ()        # kinds of the open flags: the label says it needs a look

    def to_json(self) -> dict[str, Any]:
        return {"bin": self.bin_key, "location": self.location, "payload": self.payload,
                "value": self.value, "tolerance": self.tolerance, "voltage": self.voltage,
                "safety_class": self.safety_class, "dielectric": self.dielectric,
                "polarity": self.polarity, "marking": self.marking,
                "fit_for": {app: word for app, _, word in self.fitness}, "needs_a_look": list(self.look)}


def _range(low: Decimal, high: Decimal) -> str:
    return f"{format_number(low)}…{format_number(high)} °C"


def dielectric_text(d: Dielectric | None, rated_temp_c: Decimal | None = None) -> str | None:
    """The dielectric (or family) with the figure that matters: tempco, change window or rating.

    Class 1 shows its tempco, Class 2 its change window over its range; a family named in words
    shows its name, with ``typ.`` before figures that come from the family's typical table.

    >>> from stock.markings.families import family_dielectric
    >>> dielectric_text(family_dielectric("polypropylene"))
    'polypropylene typ. −200±100 ppm/K'
    >>> dielectric_text(family_dielectric("aluminium-electrolytic"), Decimal(105))
    'aluminium electrolytic 105 °C'
    """
    if d is None:
        return f"rated {format_number(rated_temp_c)} °C" if rated_temp_c is not None else None
    named_family = d.code == d.family
    parts = [d.code.replace("-", " ") if named_family else d.code]
    typical = "typ. " if named_family else ""
    if d.tempco_ppm_per_k is not None and (d.klass == 1 or named_family and d.family in _TEMPCO_FAMILIES):
        tol = f"±{format_number(d.tempco_tol_ppm_per_k)}" if d.tempco_tol_ppm_per_k else ""
        sign = "+" if d.tempco_ppm_per_k > 0 else ""
        parts.append(f"{typical}{sign}{format_number(d.tempco_ppm_per_k)}{tol} ppm/K")
    elif d.change_minus_pct is not None and d.change_plus_pct is not None and d.klass == 2:
        window = format_tolerance(Tolerance(d.change_minus_pct, d.change_plus_pct, "%"))
        parts.append(window)
        if d.temp_min_c is not None and d.temp_max_c is not None:
            parts.append(_range(d.temp_min_c, d.temp_max_c))
    if rated_temp_c is not None:
        parts.append(f"{format_number(rated_temp_c)} °C")
    return " ".join(parts)


# Families whose tempco is the figure a bench chooses them by (films, mica, glass); for the others
# (electrolytics, paper, double-layer) the rated temperature says more.
_TEMPCO_FAMILIES = frozenset({"polystyrene", "polypropylene", "polyester", "polyethylene-naphthalate",
                              "polyphenylene-sulfide", "polycarbonate", "ptfe", "mica", "glass"})


def _polarity(marking: Marking) -> str | None:
    if marking.polarity:
        return POLARITY_TEXT[marking.polarity]
    if marking.dielectric is not None and marking.dielectric.family == "bipolar-electrolytic":
        return "non-polar, either way"
    return None


def fit_tag(application: str) -> str:
    """The application's tag in the fit-for mark.

    >>> fit_tag("bypass"), fit_tag("audio")
    ('BY', 'AU')
    """
    return FIT_TAGS.get(application, application[:2].upper())


def label_facts(row: dict[str, Any], marking: Marking, grades: dict[str, str],
                applications: Sequence[str], look: Iterable[str] = ()) -> LabelFacts:
    """One bin's label from its row (``id``, ``bin_key``, ``location``), marking and stored grades."""
    return LabelFacts(
        bin_id=row["id"], bin_key=row["bin_key"], location=row.get("location"),
        payload=bin_payload(row["bin_key"]),
        value=format_capacitance(marking.capacitance_pf) if marking.capacitance_pf is not None else "?",
        tolerance=format_tolerance(marking.tolerance) if marking.tolerance else None,
        voltage=format_voltage(marking.voltage_v, marking.voltage_kind) if marking.voltage_v else None,
        safety_class=marking.safety_class,
        dielectric=dielectric_text(marking.dielectric, marking.rated_temp_c),
        polarity=_polarity(marking),
        marking=row.get("marking") or marking.text,
        fitness=tuple((app, fit_tag(app), grades.get(app, "unknown")) for app in applications),
        look=tuple(look))


def _parse_since(text: str) -> str:
    from datetime import datetime, timezone

    try:
        when = datetime.fromisoformat(text.strip())
    except ValueError:
        raise BadValue("--changed-since", text, "a date or time such as 2026-11-30 or 2026-11-30T14:00") from None
    if when.tzinfo is not None:
        when = when.astimezone(timezone.utc).replace(tzinfo=None)
    return when.isoformat(timespec="seconds") if len(text.strip()) > 10 else when.date().isoformat()


def select_labels(store, refs: Sequence[str] = (), *, flagged: bool = False,
                  changed_since: str | None = None) -> list[LabelFacts]:
    """The labels of some bins: those named (in the order given), or every bin holding a part.

    ``flagged`` keeps bins with open flags; ``changed_since`` (a date or time, UTC) keeps bins
    with a ledger movement or a changed record since then. Both narrow what ``refs`` names.

    Raises:
        NotFound: a named bin does not exist or holds no part (all such are named).
        Refused: nothing is left to label.
        BadValue: ``changed_since`` is not a date.
    """

    wanted: list[int] | None = None
    if refs:
        wanted, missing = [], []
        for ref in refs:
            try:
                wanted.append(store.find_bin(ref)["id"])
            except NotFound:
                missing.append(ref)
        if missing:
            raise NotFound("bin" if len(missing) == 1 else "bins", ", ".join(missing),
                           "bin ids, keys, locations, labels or scanned codes listed by `stock bins`")
    parts = {row["id"]: (row, marking) for row, marking in bin_parts(store, wanted)}
    if wanted is not None:
        empty = [ref for ref, bin_id in zip(refs, wanted) if bin_id not in parts]
        if empty:
            raise NotFound("part in bin", ", ".join(empty), "bins that hold a decoded part")
    order = list(dict.fromkeys(wanted)) if wanted is not None else list(parts)
    flags = open_flag_kinds(store)
    if flagged:
        order = [i for i in order if i in flags]
    if changed_since is not None:
        changed = bins_changed_since(store, _parse_since(changed_since))
        order = [i for i in order if i in changed]
    if not order:
        why = " and ".join(w for w, on in (("has open flags", flagged),
                                            (f"changed since {changed_since}", changed_since)) if on)
        among = " of those named" if refs else ""
        raise Refused("write labels", f"no bin{among} {why}; nothing was written" if why
                      else "the database holds no parts yet; import a sheet first")
    refresh_stored_grades(store)
    grades = stored_grade_words(store)
    applications = list(load_rules(db_path=store.path))
    return [label_facts(parts[i][0], parts[i][1], grades.get(i, {}), applications, flags.get(i, ()))
            for i in order]


__all__ = ["FIT_TAGS", "GRADE_WORDS", "POLARITY_TEXT", "LabelFacts", "dielectric_text", "fit_tag",
           "label_facts", "select_labels"]
