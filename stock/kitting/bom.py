"""Reading a bill of materials (BOM) into capacitor requirements, keeping every other line.

A BOM is a CSV or XLSX sheet read through the importers (``importers.sheet.read_sheets``) with
its headers mapped by ``importers.headers.map_headers(vocabulary="bom")``. Each row becomes a
:class:`BomLine`: the reference designators, the quantity per board, the value or marking as
written, the footprint's package facts (:mod:`stock.markings.packages`), whether the part is
fitted, and the requirement decoded from the value and from the tolerance, voltage, dielectric
(or tempco window), application and notes columns (:mod:`stock.kitting.requirement_reading`).

- A capacitor line whose requirement cannot be read keeps its row, refs and quantity and carries
  a :class:`BomProblem` (row, column, raw text, reason), so a plan reports it short, never hides it.
- Lines for other parts (resistors, ICs ...) are kept with ``tracked=False`` and reported as not
  tracked: the bins hold capacitors only.
- Do-not-fit lines (a DNP column, or a do-not-fit word in the value) are kept with
  ``fitted=False`` and take nothing. The CAD conventions are in :mod:`stock.kitting.bom_conventions`.

Whether a line is a capacitor: a kind column that says so, else reference designators that start
with C (``C``, ``CX``, ``CY``, ``CE`` ..., the usual IEEE 315 / IEC 81346 letter), else a value with
an explicit farad unit.

>>> expand_refs("C1-C3, C7 C9")
('C1', 'C2', 'C3', 'C7', 'C9')
>>> part_kind(("R4",), "10k")
'resistor'
"""

from __future__ import annotations

import re
from collections.abc import Iterable
from dataclasses import dataclass, field
from decimal import Decimal
from pathlib import Path
from typing import Any

from importers.headers import map_headers
from importers.sheet import read_sheets
from stock.counts import read_quantity
from stock.decoded import Dielectric
from stock.errors import BadSheet, BadValue, StockError
from stock.kitting.bom_conventions import (
    CAPACITOR_KIND_WORDS,
    REF_KINDS,
    do_not_fit_word,
    expand_refs,
    not_fitted_reason,
    part_kind,
    quantity_remark,
    split_package_words,
)
from stock.kitting.requirement_reading import (
    APPLICATION_WORDS,
    DOUBTFUL_FLAGS,
    POLARISED_FAMILIES,
    SAFETY_CLASS_RE,
    Unreadable,
    read_requirement,
)
from stock.markings.packages import PackageFacts, read_package

MAX_QTY_PER_BOARD = 1_000_000   # beyond this a quantity is a typo (keeps every need in 64 bits)


@dataclass(frozen=True)
class BomProblem:
    """Why a requirement could not be read: where it is and what was written."""
    row: int
    column: str | None
    raw: str
    reason: str

    def __str__(self) -> str:
        where = f"row {self.row}" + (f", column {self.column!r}" if self.column else "")
        return f"{where}: {self.reason}"

    def to_json(self) -> dict[str, Any]:
        return {"row": self.row, "column": self.column, "raw": self.raw, "reason": self.reason}


@dataclass(frozen=True)
class BomLine:
    """One BOM row: what it asks for, per board, and the requirement read from it.

    The requirement fields are None where the BOM says nothing; ``dielectric`` is the dielectric
    code or family named (``C0G``, ``X7R``, ``polypropylene``), ``tempco_min``/``tempco_max`` the
    window on α in ppm/K, ``tol_pct`` the allowed tolerance (± %), ``voltage_v`` the rating asked.
    """

    row: int
    refs: tuple[str, ...]
    qty_per_board: int
    value_text: str
    tracked: bool
    kind: str
    capacitance_pf: Decimal | None = None
    tol_pct: Decimal | None = None
    voltage_v: Decimal | None = None
    voltage_kind: str | None = None
    dielectric: Dielectric | None = None
    tempco_min: Decimal | None = None
    tempco_max: Decimal | None = None
    application: str | None = None
    safety_class: str | None = None
    polarised: bool = False
    notes: str = ""
    remarks: tuple[str, ...] = ()         # what the reader noticed (assumed units, ambiguities)
    problem: BomProblem | None = None
    package: PackageFacts | None = None   # the footprint's facts (package column, value words)
    fitted: bool = True
    not_fitted_reason: str = ""           # why the line takes nothing in this build

    @property
    def is_mains(self) -> bool:
        return self.application == "mains" or self.safety_class is not None


@dataclass(frozen=True)
class Bom:
    """A whole BOM: its lines in file order and how its headers were understood."""
    file: str
    sheet: str | None
    lines: tuple[BomLine, ...]
    header_notes: tuple[str, ...] = field(default=())

    @property
    def capacitor_lines(self) -> tuple[BomLine, ...]:
        return tuple(line for line in self.lines if line.tracked)

    @property
    def not_tracked(self) -> tuple[BomLine, ...]:
        return tuple(line for line in self.lines if not line.tracked and line.fitted)

    @property
    def not_fitted(self) -> tuple[BomLine, ...]:
        return tuple(line for line in self.lines if not line.fitted)

    @property
    def problems(self) -> tuple[BomProblem, ...]:
        return tuple(line.problem for line in self.lines if line.problem)


def _cell_text(value: Any) -> str:
    if value is None:
        return ""
    if isinstance(value, float) and value.is_integer():
        return str(int(value))
    return str(value).strip()


def _quantity(text: str) -> int:
    try:
        number = read_quantity(text)
    except ValueError as exc:
        if "too large" not in str(exc):
            raise ValueError(f"{text!r} is not a whole number of parts") from None
        number = MAX_QTY_PER_BOARD + 1
    if number is None:
        raise ValueError(f"{text!r} is not a whole number of parts")
    if number > MAX_QTY_PER_BOARD:
        raise ValueError(f"{text!r} is more than {MAX_QTY_PER_BOARD:,} parts per board; check the"
                         " quantity")
    return number


class _LineReader:
    """Turns the cells of one row into a :class:`BomLine` (one object per BOM, holding the map)."""
    def __init__(self, field_to_index: dict[str, int], headers: tuple[str, ...],
                 units: dict[str, str]):
        self.index = field_to_index
        self.headers = headers
        self.units = units

    def header(self, name: str) -> str | None:
        i = self.index.get(name)
        return self.headers[i] if i is not None and i < len(self.headers) else None

    def cell(self, cells: tuple[Any, ...], name: str) -> str:
        i = self.index.get(name)
        return _cell_text(cells[i]) if i is not None and i < len(cells) else ""

    def value(self, cells: tuple[Any, ...], name: str) -> str:
        """A value cell, with the unit its header names ("Value (nF)") put after a bare number."""
        text = self.cell(cells, name)
        unit = self.units.get(name)
        if text and unit and re.fullmatch(r"\d+(?:[.,]\d+)?", text):
            text += unit.replace("µ", "u")
        return text

    def footprint(self, cells: tuple[Any, ...], value_words: str) -> PackageFacts | None:
        """The footprint's facts: the package and mounting columns, and package words in the value."""
        text = " ".join(t for t in (self.cell(cells, "package"), self.cell(cells, "mounting"),
                                    value_words) if t)
        return read_package(text) if text else None

    def read(self, number: int, cells: tuple[Any, ...]) -> BomLine | None:
        refs_text = self.cell(cells, "refs")
        qty_text = self.cell(cells, "qty")
        written = self.value(cells, "value")
        marking_text = self.value(cells, "marking")
        kind_text = self.cell(cells, "part_type")
        notes = self.cell(cells, "notes")
        if not (refs_text or qty_text or written or marking_text or kind_text or notes):
            return None                     # an empty row carries nothing to lose
        unfitted = not_fitted_reason(written, self.cell(cells, "dnp"), self.cell(cells, "fitted"),
                                     self.header("dnp") or "DNP", self.header("fitted") or "Fitted")
        value_text, package_words = split_package_words(do_not_fit_word(written)[0])
        package = self.footprint(cells, package_words)
        shown = written or marking_text
        refs = expand_refs(refs_text)
        kind = part_kind(refs, value_text or marking_text, kind_text)
        if kind == "unknown" and notes:     # "Description: ceramic capacitor" in the notes column
            kind = "capacitor" if any(w in notes.lower() for w in CAPACITOR_KIND_WORDS) else kind
        base = {"notes": notes, "package": package}
        try:
            qty = _quantity(qty_text) if qty_text else len(refs)
        except ValueError as exc:
            return BomLine(number, refs, len(refs), shown, kind == "capacitor", kind, **base,
                           problem=BomProblem(number, self.header("qty"), qty_text, str(exc)))
        remarks = []
        if qty_text and quantity_remark(qty, refs):
            remarks.append(quantity_remark(qty, refs))
            qty = max(qty, len(refs))       # short positions stop a build; a spare part does not
        if unfitted:
            return BomLine(number, refs, qty, shown, kind == "capacitor", kind, **base,
                           fitted=False, not_fitted_reason=unfitted)
        if kind != "capacitor":
            return BomLine(number, refs, qty, shown, False, kind, **base)
        if qty == 0 and not refs:
            return BomLine(number, refs, qty, shown, True, kind, **base,
                           problem=BomProblem(number, self.header("qty"), qty_text,
                                              "no quantity and no designators"))
        if package is not None:
            remarks.extend(f"footprint {package.raw!r}: {n}" for n in package.conflicts)
        columns = {name: self.cell(cells, name) for name in
                   ("tolerance", "voltage", "dielectric", "tempco", "application")}
        try:
            need = read_requirement(value_text, marking_text, columns, notes)
        except Unreadable as exc:
            return BomLine(number, refs, qty, shown, True, "capacitor", **base,
                           remarks=tuple(remarks),
                           problem=BomProblem(number, self.header(exc.column) or exc.column,
                                              exc.raw, exc.reason))
        if package is not None and package.polarised_hint:
            need["polarised"] = True        # a polarised footprint takes a polarised part
        need["remarks"] = tuple(remarks) + need.get("remarks", ())
        return BomLine(number, refs, qty, shown, True, "capacitor", **base, **need)


def parse_mappings(pairs: Iterable[str]) -> dict[str, str]:
    """``--map FIELD=HEADER`` options as a dict; ``FIELD=`` leaves a field unmapped.

    Raises:
        BadValue: an item is not FIELD=HEADER.

    >>> parse_mappings(["value=Cap.", "notes="])
    {'value': 'Cap.', 'notes': ''}
    """
    out: dict[str, str] = {}
    for pair in pairs:
        name, sep, header = pair.partition("=")
        if not sep or not name.strip():
            raise BadValue("--map", pair, 'FIELD=HEADER, e.g. value="Cap." or refs=Designator')
        out[name.strip()] = header.strip()
    return out


def read_bom(path: str | Path, *, sheet: str | None = None,
             overrides: dict[str, str] | None = None) -> Bom:
    """Read a BOM file (CSV or XLSX) into lines, every row kept.

    Args:
        path: the BOM file.
        sheet: the sheet of a workbook to read (default: the first).
        overrides: field → header mappings (``--map FIELD=HEADER``) that win over the guess.

    Raises:
        BadSheet: the file cannot be read, or no column holds a value or marking.
    """

    sheets = read_sheets(path, sheet)
    if not sheets:
        raise BadSheet(str(path), "no sheet in the file", hint="a CSV or an XLSX workbook")
    raw = sheets[0]
    mapping = map_headers(raw.headers, vocabulary="bom", overrides=overrides or {})
    index = dict(mapping.field_to_index)
    if "value" not in index and "marking" not in index:
        raise BadSheet(raw.file, "no column holds the value or marking", sheet=raw.sheet,
                       row=raw.header_row,
                       hint="a header such as Value, Marking or Capacitance, or --map value=HEADER")
    if "refs" not in index and "qty" not in index:
        raise BadSheet(raw.file, "no column holds the designators or a quantity", sheet=raw.sheet,
                       row=raw.header_row,
                       hint="a header such as Designator, Refs, Qty or Quantity")
    reader = _LineReader(index, tuple(raw.headers), dict(mapping.units))
    lines: list[BomLine] = []
    for row in raw.rows:
        try:
            line = reader.read(row.number, tuple(row.cells))
        except StockError as exc:           # never lose a row to an unexpected decoder refusal
            line = BomLine(row.number, (), 0, "", True, "capacitor",
                           problem=BomProblem(row.number, None, repr(row.cells), str(exc)))
        if line is not None:
            lines.append(line)
    return Bom(file=raw.file, sheet=raw.sheet, lines=tuple(lines),
               header_notes=tuple(mapping.describe()))


__all__ = ["APPLICATION_WORDS", "DOUBTFUL_FLAGS", "POLARISED_FAMILIES", "REF_KINDS", "SAFETY_CLASS_RE",
           "Bom", "BomLine", "BomProblem", "Unreadable", "expand_refs", "parse_mappings", "part_kind",
           "read_bom", "read_requirement"]
