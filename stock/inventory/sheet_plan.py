"""How one sheet of an import is to be read: its column mapping, or why it is skipped or refused.

For each sheet the import makes a plan before any row is stored:

1. ``--map`` rules that apply to it: a plain ``FIELD=HEADER`` rule applies to every sheet that
   has that header; ``SHEET:FIELD=HEADER`` (a sheet name, or a file name for a text sheet) to
   that sheet only. Spreadsheet programs allow no ``:`` in a sheet name, so the form is never
   ambiguous. With no rule for a sheet, a mapping remembered for its headers is used.
2. The headers are mapped (alias, fuzzy, ``--map``); a store's own inventory export is
   recognised by its headers and read by them (bin key, facts in their own columns).
3. A bounded sample of rows is read and the columns no header claimed are mapped by what they
   hold (:mod:`stock.inventory.column_content`).
4. A sheet with no column that plausibly holds values is skipped (the import goes on with the
   other sheets) and refused only when no sheet of the file can be read; a sheet that looks like
   a BOM is refused unless forced, with a hint to plan a kit with it instead.

>>> parse_map_rules(["quantity=On hand", "Cabinet 2:value=Cap."])
(MapRule(sheet=None, field='quantity', header='On hand'), MapRule(sheet='Cabinet 2', field='value', header='Cap.'))
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from itertools import chain, islice
from pathlib import Path
from typing import Any, Sequence

from importers.headers import map_headers, normalise
from importers.sheet import read_sheets
from stock.errors import BadSheet, BadValue
from stock.inventory.column_content import (
    SAMPLE_ROWS,
    bin_sheet_evidence,
    bom_evidence,
    describe_columns,
    label_holds_values,
    map_by_content,
    profile_sheet,
)
from stock.inventory.own_exports import export_overrides, is_own_export
from stock.inventory.remembered_mappings import remembered_mapping
from stock.inventory.row_reading import cell_text


@dataclass(frozen=True)
class MapRule:
    """One ``--map`` rule: read ``field`` from ``header`` (in ``sheet`` only, when given)."""
    sheet: str | None
    field: str
    header: str


def parse_map_rules(pairs: Sequence[str]) -> tuple[MapRule, ...]:
    """Parse ``FIELD=HEADER`` and ``SHEET:FIELD=HEADER`` rules.

    Raises:
        BadValue: a rule without ``=`` or without a field.
    """
    rules = []
    for pair in pairs:
        name, sep, header = pair.partition("=")
        sheet, colon, field_name = name.rpartition(":")
        if not sep or not field_name.strip() or (colon and not sheet.strip()):
            raise BadValue("--map", pair, 'FIELD=HEADER or SHEET:FIELD=HEADER, e.g. quantity="On hand"')
        rules.append(MapRule(sheet.strip() if colon else None, field_name.strip(), header.strip()))
    return tuple(rules)


def _names_sheet(rule: MapRule, path: Path, sheet: str | None) -> bool:
    wanted = rule.sheet.casefold() if rule.sheet else ""
    names = {path.name.casefold(), path.stem.casefold()} | ({sheet.casefold()} if sheet else set())
    return wanted in names


def rules_for(rules: Sequence[MapRule], path: Path, sheet: str | None,
              headers: Sequence[str]) -> dict[str, str]:
    """The ``{field: header}`` overrides that apply to one sheet (targeted rules win)."""
    present = {normalise(h) for h in headers} | set(headers)
    out: dict[str, str] = {}
    for rule in rules:
        if rule.sheet is None and (not rule.header or rule.header in present
                                   or normalise(rule.header) in present):
            out[rule.field] = rule.header
    for rule in rules:
        if rule.sheet is not None and _names_sheet(rule, path, sheet):
            out[rule.field] = rule.header
    return out


def unmatched_rules(rules: Sequence[MapRule], seen: Sequence[tuple[Path, str | None, Sequence[str]]]
                    ) -> list[MapRule]:
    """Rules that no sheet seen applies to (a header no sheet has, a sheet not read)."""
    left = []
    for rule in rules:
        if not any(rule.field in rules_for([rule], p, s, h) for p, s, h in seen):
            left.append(rule)
    return left


def unmatched_error(rule: MapRule, seen: Sequence[tuple[Path, str | None, Sequence[str]]]) -> BadValue:
    """The error for a rule that applies to no sheet, naming what the sheets have."""
    if rule.sheet is not None:
        names = ", ".join(repr(s or p.name) for p, s, _ in seen)
        return BadValue("--map", f"{rule.sheet}:{rule.field}={rule.header}", f"a sheet of the import: {names}")
    headers = list(dict.fromkeys(h for _, _, hs in seen for h in hs))
    shown = ", ".join(repr(h) for h in headers[:20]) + (" ..." if len(headers) > 20 else "")
    return BadValue("--map", f"{rule.field}={rule.header}", f"a header of some sheet of the import: {shown}")


def check_rules_across(rules: Sequence[MapRule], paths: Sequence[Path], sheet: str | None = None) -> None:
    """Refuse a ``--map`` rule that no sheet of any of the files has (headers read, rows not).

    Raises:
        BadValue: naming the rule and the headers (or sheets) there are.
        BadSheet: a file cannot be read.
    """

    seen = [(Path(p), s.sheet, s.headers) for p in paths for s in read_sheets(Path(p), sheet)]
    left = unmatched_rules(rules, seen)
    if left:
        raise unmatched_error(left[0], seen)


def refuse_bin_sheet_as_bom(path: str | Path, sheet: str | None = None) -> None:
    """Refuse a bin sheet given where a BOM is wanted (``kit plan``), naming why it looks like one.

    Reads the headers and a bounded sample of rows of the first sheet only.

    Raises:
        BadSheet: the sheet has bin columns and no references column.
    """

    sheets = read_sheets(Path(path), sheet)
    if not sheets:
        return
    raw = sheets[0]
    headers = [cell_text(h) for h in raw.headers]
    sample = [r.cells for r in islice(raw.rows, SAMPLE_ROWS)]
    why = bin_sheet_evidence(headers, profile_sheet(headers, sample))
    if why is not None:
        raise BadSheet(str(path), f"looks like a bin sheet, not a BOM: {why}", sheet=raw.sheet,
                       row=raw.header_row,
                       hint="import it with `stock import FILE`, or plan with it anyway with --force")


@dataclass(frozen=True)
class SheetPlan:
    """How a sheet is read: its header map and rows, or why it is skipped.

    Attributes:
        sheet: the RawSheet, its rows intact (the sample is put back in front).
        header_map: the mapping to read rows by (None when skipped).
        skip: why the sheet is not read, or None.
        exported: the sheet is the store's own inventory export.
        remembered: the mapping came from the store.
        keep: the mapping should be kept for these headers after the import.
    """

    sheet: Any
    header_map: Any = None
    skip: str | None = None
    exported: bool = False
    remembered: bool = False
    keep: bool = False


def plan_sheet(store: Any, path: Path, raw_sheet: Any, rules: Sequence[MapRule] = (), *,
               force: bool = False, keep_mapping: bool = False) -> SheetPlan:
    """Make the plan for one sheet (see the module docstring).

    Raises:
        BadSheet: the sheet looks like a BOM (unless ``force``).
        BadValue: a ``--map`` rule names an unknown field or a header twice.
    """

    headers = [cell_text(h) for h in raw_sheet.headers]
    rows = iter(raw_sheet.rows)
    sample = list(islice(rows, SAMPLE_ROWS))
    sheet = replace(raw_sheet, rows=chain(sample, rows))
    cells = [r.cells for r in sample]
    overrides = rules_for(rules, path, raw_sheet.sheet, headers)
    exported = is_own_export(headers)
    remembered = False
    if exported:
        overrides = {**export_overrides(headers), **overrides}
    elif not overrides:
        overrides = remembered_mapping(store, headers)
        remembered = bool(overrides)
    profiles = profile_sheet(headers, cells)
    if not force and not exported:
        why = bom_evidence(headers, profiles)
        if why is not None:
            raise BadSheet(str(path), f"looks like a BOM, not a bin sheet: {why}", sheet=raw_sheet.sheet,
                           row=raw_sheet.header_row,
                           hint="plan a kit with it (`stock kit plan FILE`), or import it anyway with --force")
    header_map = map_headers(raw_sheet.headers, vocabulary="bins", overrides=overrides)
    if remembered:
        header_map = replace(header_map, how={k: ("remembered" if v == "--map" else v)
                                              for k, v in header_map.how.items()})
    if not exported:
        header_map = map_by_content(header_map, profiles)
    readable = any(f in header_map.field_to_index for f in ("marking", "value", "colours"))
    if not exported and label_holds_values(header_map, profiles):
        header_map = replace(header_map, label_is_value=True)    # a description column: read it
        readable = True
    if not readable:
        why = f"no column carries a value or marking (headers found: {describe_columns(headers, profiles)})"
        return SheetPlan(sheet, None, skip=why)
    given = bool(rules_for(rules, path, raw_sheet.sheet, headers))
    return SheetPlan(sheet, header_map, exported=exported, remembered=remembered,
                     keep=(given or keep_mapping) and not exported)


def refuse_unreadable(path: Path, plans: Sequence[SheetPlan]) -> None:
    """Refuse a file none of whose sheets can be read, naming what each sheet's columns hold."""
    if any(p.skip is None for p in plans):
        return
    first = plans[0]
    raise BadSheet(str(path), first.skip or "nothing to read", sheet=first.sheet.sheet,
                   row=first.sheet.header_row,
                   hint="a column of markings or values (e.g. 'Marking', 'Value', 'Colours'),"
                        " or --map marking=HEADER")


__all__ = ["MapRule", "SheetPlan", "check_rules_across", "refuse_bin_sheet_as_bom", "parse_map_rules", "plan_sheet", "refuse_unreadable", "rules_for",
           "unmatched_error", "unmatched_rules"]
