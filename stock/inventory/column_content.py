"""What a sheet's columns hold, judged from their cells: values, bin locations, counts, references.

Headers are mapped first (alias table, then fuzzy, then ``--map``); this module looks at the
cells of the columns no header mapping claimed and gives them a field when their content leaves
little doubt. Each column is profiled over a bounded sample (the first :data:`SAMPLE_ROWS`
non-blank rows), so a big sheet costs no more than a small one:

* **value**: the share of cells that decode as a capacitance (``104``, ``4n7``, ``10uF 25V``)
  or as colour bands; a column of bare whole numbers only is a count, not a value, and a cell
  shaped like a drawer name (``K1``) counts as a location even if a code could read it.
* **location**: short codes of letters and digits (``A1``, ``B-12``, ``3/4``), mostly distinct.
* **count**: whole numbers of zero or more.
* **references**: reference designators (``C1``, ``C3, C7``, ``C10-C12``), the mark of a BOM.

The thresholds are judgement, tuned on sheets typed by people (no published source): a field is
given to a column only when at least :data:`VALUE_SHARE` (values) or :data:`LOCATION_SHARE` /
:data:`COUNT_SHARE` of its sampled cells look the part.

>>> p = profile_column(["104", "4n7", "10uF", "", "22p"])
>>> p.cells, round(p.value_share, 2), p.looks_like()
(4, 1.0, 'values')
>>> profile_column(["A1", "A2", "B7", "C12"]).looks_like()
'bin locations'
"""

from __future__ import annotations

import re
from dataclasses import dataclass, replace
from typing import Any, Iterable, Sequence

from importers.headers import guess_field
from stock.inventory.row_reading import cell_text, decode_cached
from stock.markings.colour_codes import looks_like_colours

SAMPLE_ROWS = 200          # non-blank rows looked at per sheet
VALUE_SHARE = 0.6          # share of a column's cells that must decode as values
WORDY_SHARE = 0.2          # ... of which this share must be more than a bare whole number
LOCATION_SHARE = 0.7
DISTINCT_SHARE = 0.6       # locations name one bin each, so they are mostly distinct
COUNT_SHARE = 0.9
REFERENCE_SHARE = 0.6
SHOWN_COLUMNS = 8          # columns described in a message
MIN_CELLS = 2              # a column with fewer filled cells is not judged

_WHOLE = re.compile(r"^\d{1,7}$")
_CODE = re.compile(r"^[1-9]\d[0-69]$")     # IEC 60062 three-digit code: two figures, a multiplier
_LOCATION = re.compile(r"^(?:[A-Za-z]{1,3}[-./ ]?\d{1,4}[A-Za-z]?|\d{1,3}[-./][A-Za-z0-9]{1,3}"
                       r"|[A-Za-z]{1,3}\d{0,3}[-./]\d{1,3})$")
_DESIGNATOR = r"[A-Z]{1,3}\d{1,4}"
_REFERENCES = re.compile(rf"^{_DESIGNATOR}(?:\s*(?:[,;]|\s|[-–]|\.\.)\s*(?:{_DESIGNATOR}|\d{{1,4}}))*$")
_REFERENCE_LIST = re.compile(rf"^{_DESIGNATOR}(?:\s*[,;]\s*{_DESIGNATOR}|\s+{_DESIGNATOR}|\s*[-–]\s*{_DESIGNATOR})+$")


@dataclass(frozen=True)
class ColumnProfile:
    """What the sampled cells of one column look like (shares of its non-blank cells)."""
    cells: int = 0
    value_share: float = 0.0
    wordy_share: float = 0.0       # values written with more than bare digits (units, letters)
    location_share: float = 0.0
    distinct_share: float = 0.0
    count_share: float = 0.0
    reference_share: float = 0.0
    list_share: float = 0.0        # cells listing several designators ("C1, C2", "C3-C5")
    code_share: float = 0.0        # three-digit value codes typed as numbers ("104", 473)
    example: str = ""

    def holds_values(self, least: int = MIN_CELLS) -> bool:
        return self.cells >= least and self.value_share >= VALUE_SHARE and \
            self.wordy_share >= WORDY_SHARE

    def holds_locations(self, least: int = MIN_CELLS) -> bool:
        return self.cells >= least and self.location_share >= LOCATION_SHARE and \
            self.distinct_share >= DISTINCT_SHARE and self.list_share < 0.3

    def holds_counts(self, least: int = MIN_CELLS) -> bool:
        return self.cells >= least and self.count_share >= COUNT_SHARE

    def holds_references(self, least: int = MIN_CELLS) -> bool:
        return self.cells >= least and self.reference_share >= REFERENCE_SHARE

    def looks_like(self) -> str:
        """A few words on what the cells are, for messages."""
        if self.cells == 0:
            return "empty"
        if self.holds_values(1):
            return "values"
        if self.holds_references(1) and self.list_share:
            return "reference designators"
        if self.holds_counts(1):
            return "whole numbers"
        if self.holds_locations(1):
            return "bin locations"
        return f"text such as {self.example!r}" if self.example else "text"


def _text(cell: Any) -> str:
    return cell_text(cell)


def profile_column(cells: Iterable[Any]) -> ColumnProfile:
    """Profile one column's sampled cells (blank cells are left out of every share)."""
    texts = [t for t in (_text(c) for c in cells) if t]
    if not texts:
        return ColumnProfile()
    n = len(texts)
    values = wordy = locations = counts = references = lists = codes = 0
    for t in texts:
        whole = bool(_WHOLE.match(t))
        counts += whole
        codes += bool(_CODE.match(t))
        if _REFERENCES.match(t):
            references += 1
            lists += bool(_REFERENCE_LIST.match(t))
        if len(t) <= 12 and _LOCATION.match(t):
            locations += 1
            continue       # "K1", "A12": a drawer's name, even where a code would read it as a value
        if looks_like_colours(t) or decode_cached(t).capacitance_pf is not None:
            values += 1
            wordy += not whole
    return ColumnProfile(cells=n, value_share=values / n, wordy_share=wordy / max(values, 1),
                         location_share=locations / n, distinct_share=len(set(texts)) / n,
                         count_share=counts / n, reference_share=references / n, list_share=lists / n, code_share=codes / n,
                         example=texts[0][:30])


def profile_sheet(headers: Sequence[str], sample: Sequence[Sequence[Any]]) -> list[ColumnProfile]:
    """A profile per column, from the sampled rows' cells."""
    return [profile_column(row[i] if i < len(row) else None for row in sample)
            for i in range(len(headers))]


def _percent(share: float) -> str:
    return f"content {round(share * 100)} %"


def map_by_content(header_map: Any, profiles: Sequence[ColumnProfile]) -> Any:
    """Give fields to the columns no header claimed, by what their cells hold.

    Content never overrides an alias, a fuzzy match or ``--map``: only columns left unmapped
    are looked at, and only fields no column has yet. A value-like column is the marking when
    no column is; a further one is read too, after it (each row from the first filled).

    Returns:
        A new HeaderMap; the fields found are marked ``content NN %`` in ``how``.
    """
    index = dict(header_map.field_to_index)
    how, scores, also = dict(header_map.how), dict(header_map.scores), dict(header_map.also)
    taken = set(index.values()) | {i for cols in also.values() for i in cols}
    blocked = {f for f, h in header_map.how.items() if h == "blocked"}
    free = [i for i in range(len(header_map.headers)) if i not in taken]
    found_any = False

    def give(name: str, i: int, share: float) -> None:
        nonlocal found_any
        index[name] = i
        how[name], scores[name] = _percent(share), round(share * 100, 1)
        taken.add(i)
        free.remove(i)
        found_any = True

    readers = [i for i in free if profiles[i].holds_values()]
    if readers:
        readers.sort(key=lambda i: (-profiles[i].value_share, i))
        for i in readers:
            if "marking" not in index:
                give("marking", i, profiles[i].value_share)
                continue
            also["marking"] = tuple(sorted((*also.get("marking", ()), i)))
            how[f"marking@{i}"] = _percent(profiles[i].value_share)
            scores[f"marking@{i}"] = round(profiles[i].value_share * 100, 1)
            taken.add(i)
            free.remove(i)
            found_any = True
    if not any(f in index for f in ("marking", "value", "colours")):
        # codes typed into a spreadsheet become numbers: the column of codes, not of counts
        coded = [i for i in free if profiles[i].cells >= 1 and profiles[i].code_share >= VALUE_SHARE
                 and profiles[i].value_share >= VALUE_SHARE]
        if coded:
            best = max(coded, key=lambda i: (profiles[i].code_share, -i))
            give("marking", best, profiles[best].value_share)
    for name, test, share in (("location", ColumnProfile.holds_locations, "location_share"),
                              ("quantity", ColumnProfile.holds_counts, "count_share")):
        if name in index or name in blocked:
            continue
        fits = [i for i in free if test(profiles[i])]
        if fits:
            best = max(fits, key=lambda i: (getattr(profiles[i], share), -i))
            give(name, best, getattr(profiles[best], share))
    if not found_any:
        return header_map
    ordered = dict(sorted(index.items(), key=lambda kv: kv[1]))
    unmapped = tuple(h for i, h in enumerate(header_map.headers) if i not in taken)
    return replace(header_map, field_to_index=ordered, unmapped=unmapped, how=how, scores=scores,
                   also=also)


def label_holds_values(header_map: Any, profiles: Sequence[ColumnProfile]) -> bool:
    """Whether the label (or description) column's cells decode as values often enough to be read."""
    i = header_map.field_to_index.get("label")
    return i is not None and profiles[i].cells >= MIN_CELLS and profiles[i].value_share >= VALUE_SHARE


def describe_columns(headers: Sequence[str], profiles: Sequence[ColumnProfile]) -> str:
    """``'Where' (bin locations), 'How many' (whole numbers)`` for a refusal message."""
    shown = [f"{h!r} ({p.looks_like()})" for h, p in zip(headers, profiles)][:SHOWN_COLUMNS]
    more = len(headers) - len(shown)
    return (", ".join(shown) + (f" and {more} more" if more > 0 else "")) or "none"


def bom_evidence(headers: Sequence[str], profiles: Sequence[ColumnProfile]) -> str | None:
    """Why a sheet looks like a BOM rather than a bin sheet, or None.

    A column headed as the references of a BOM (``Refs``, ``Designator``), or one whose cells
    are reference designators, is what a BOM has and a bin sheet does not.
    """

    for header, profile in zip(headers, profiles):
        guess = guess_field(header, "bom")
        if guess.field == "refs" and guess.how == "alias" and (profile.cells == 0 or profile.holds_references()
                                                               or profile.reference_share > 0.3):
            return f"its column {header!r} holds reference designators"
    for header, profile in zip(headers, profiles):
        # single codes such as "A1" are bin locations as often as designators: a BOM lists them
        if guess_field(header, "bins").field in ("location", "cabinet", "bin_key"):
            continue
        if profile.holds_references() and profile.list_share >= 0.3 and not profile.holds_values():
            example = f" such as {profile.example!r}" if profile.example else ""
            return f"its column {header!r} holds reference designators{example}"
    return None


def bin_sheet_evidence(headers: Sequence[str], profiles: Sequence[ColumnProfile]) -> str | None:
    """Why a sheet looks like a bin sheet rather than a BOM (bins and counts, no references), or None."""
    if bom_evidence(headers, profiles) is not None:
        return None
    fields = {guess_field(h, "bins").field for h in headers}
    if "location" in fields or "cabinet" in fields:
        located = [h for h in headers if guess_field(h, "bins").field in ("location", "cabinet")]
        return f"it has bin columns ({', '.join(map(repr, located))}) and no references column"
    if any(p.holds_locations() for p in profiles):
        return "it has a column of bin locations and no references column"
    return None


__all__ = ["SAMPLE_ROWS", "ColumnProfile", "bin_sheet_evidence", "bom_evidence", "describe_columns",
           "label_holds_values", "map_by_content", "profile_column", "profile_sheet"]
