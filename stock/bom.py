"""Reading a bill of materials (BOM) into capacitor requirements, keeping every other line.

A BOM is a CSV or XLSX sheet read through the importers (``importers.sheet.read_sheets``) with
its headers mapped by ``importers.headers.map_headers(vocabulary="bom")``. Each row becomes a
:class:`BomLine`: the reference designators, the quantity per board, the value or marking as
written, and the requirement decoded from it and from the tolerance, voltage, dielectric (or
tempco window), application and notes columns.

- A capacitor line whose requirement cannot be read keeps its row, refs and quantity and carries
  a :class:`BomProblem` (row, column, raw text, reason), so a plan reports it short, never hides it.
- Lines for other parts (resistors, ICs ...) are kept with ``tracked=False`` and reported as not
  tracked: the bins hold capacitors only.
- ``X2``/``Y1``-style safety classes anywhere in the line make it a mains line; a line that says
  ``mains`` without a class is a problem, because the class decides which parts may go there.

Whether a line is a capacitor: a kind column that says so, else reference designators that start
with C (``C``, ``CX``, ``CY``, ``CE`` ..., the usual IEEE 315 / IEC 81346 letter), else a value with
an explicit farad unit. Ranges such as ``C1-C4`` expand to C1, C2, C3, C4 (common practice).

>>> expand_refs("C1-C3, C7 C9")
('C1', 'C2', 'C3', 'C7', 'C9')
>>> part_kind(("R4",), "10k")
'resistor'
"""

from __future__ import annotations

import re
from collections.abc import Iterable
from dataclasses import dataclass, field
from decimal import Decimal, InvalidOperation
from pathlib import Path
from typing import Any

from stock.decoded import Dielectric
from stock.errors import BadSheet, BadValue, StockError

# Reference-designator letters and the part kind they name; from memory of IEEE 315 and
# IEC 81346-2 usage in BOMs (common practice, no single published table for hobby BOMs).
REF_KINDS: tuple[tuple[str, str], ...] = (
    ("CX", "capacitor"),   # X-class (line to line) position
    ("CY", "capacitor"),   # Y-class (line to earth) position
    ("CE", "capacitor"),   # electrolytic
    ("CT", "trimmer capacitor"),
    ("VC", "trimmer capacitor"),
    ("C", "capacitor"),
    ("RV", "potentiometer"),
    ("VR", "potentiometer"),
    ("RN", "resistor network"),
    ("R", "resistor"),
    ("IC", "integrated circuit"),
    ("U", "integrated circuit"),
    ("Q", "transistor"),
    ("TR", "transistor"),
    ("LED", "LED"),
    ("D", "diode"),
    ("FB", "ferrite bead"),
    ("L", "inductor"),
    ("T", "transformer"),
    ("XTAL", "crystal"),
    ("Y", "crystal"),
    ("F", "fuse"),
    ("SW", "switch"),
    ("S", "switch"),
    ("K", "relay"),
    ("RL", "relay"),
    ("J", "connector"),
    ("P", "connector"),
    ("CN", "connector"),
    ("TP", "test point"),
    ("BT", "battery"),
)
CAPACITOR_KIND_WORDS = ("capacitor", "cap", "condenser", "kondensator")
SAFETY_CLASS_RE = re.compile(r"\b(X1Y[12]|X[123]|Y[1-4])\b", re.IGNORECASE)
_RANGE_RE = re.compile(r"^([A-Za-z]+)(\d+)\s*[-–…]\s*(?:\1)?(\d+)$")
_REF_RE = re.compile(r"^([A-Za-z]+)\d")
MAX_RANGE = 1000            # a "C1-C99999" typo must not expand into memory


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
        return tuple(line for line in self.lines if not line.tracked)

    @property
    def problems(self) -> tuple[BomProblem, ...]:
        return tuple(line.problem for line in self.lines if line.problem)


def expand_refs(text: str) -> tuple[str, ...]:
    """Reference designators from a cell: split on commas, spaces and semicolons, ranges expanded.

    >>> expand_refs("C10–C12")
    ('C10', 'C11', 'C12')
    >>> expand_refs("")
    ()
    """
    refs: list[str] = []
    for token in re.split(r"[,;\s]+(?![-–…])", text.strip()):
        token = token.strip()
        if not token:
            continue
        m = _RANGE_RE.match(token)
        if m and 0 <= int(m.group(3)) - int(m.group(2)) <= MAX_RANGE:
            refs.extend(f"{m.group(1)}{n}" for n in range(int(m.group(2)), int(m.group(3)) + 1))
        else:
            refs.append(token)
    return tuple(refs)


def part_kind(refs: Iterable[str], value_text: str = "", kind_text: str = "") -> str:
    """The kind of part a line is: from its kind column, else its designators, else its value.

    >>> part_kind(("CX1",), "100n X2")
    'capacitor'
    >>> part_kind((), "4.7uF")
    'capacitor'
    >>> part_kind((), "LM317")
    'unknown'
    """
    words = kind_text.strip().lower()
    if words:
        if any(w in words for w in CAPACITOR_KIND_WORDS):
            return "capacitor"
        return words
    kinds = set()
    for ref in refs:
        m = _REF_RE.match(ref)
        if not m:
            continue
        letters = m.group(1).upper()
        kinds.add(next((k for prefix, k in REF_KINDS if letters == prefix), "unknown"))
    if len(kinds) == 1:
        return kinds.pop()
    if kinds:
        return "mixed"
    if re.search(r"\d\s*[pnuµμm]?\s*F\b", value_text, re.IGNORECASE):
        return "capacitor"
    return "unknown"


def _cell_text(value: Any) -> str:
    if value is None:
        return ""
    if isinstance(value, float) and value.is_integer():
        return str(int(value))
    return str(value).strip()


def _quantity(text: str) -> int:
    try:
        number = Decimal(text)
    except InvalidOperation:
        raise ValueError(f"{text!r} is not a whole number of parts") from None
    if number != number.to_integral_value() or number < 0:
        raise ValueError(f"{text!r} is not a whole number of parts")
    return int(number)


class _LineReader:
    """Turns the cells of one row into a :class:`BomLine` (one object per BOM, holding the map)."""

    def __init__(self, field_to_index: dict[str, int], headers: tuple[str, ...]):
        self.index = field_to_index
        self.headers = headers

    def header(self, name: str) -> str | None:
        i = self.index.get(name)
        return self.headers[i] if i is not None and i < len(self.headers) else None

    def cell(self, cells: tuple[Any, ...], *names: str) -> tuple[str, str | None]:
        for name in names:
            i = self.index.get(name)
            if i is not None and i < len(cells):
                text = _cell_text(cells[i])
                if text:
                    return text, name
        return "", None

    def read(self, number: int, cells: tuple[Any, ...]) -> BomLine | None:
        refs_text, _ = self.cell(cells, "refs")
        qty_text, _ = self.cell(cells, "qty")
        value_text, value_col = self.cell(cells, "value", "marking")
        marking_text, marking_col = self.cell(cells, "marking")
        kind_text, _ = self.cell(cells, "kind", "description")
        notes, _ = self.cell(cells, "notes")
        if not (refs_text or qty_text or value_text or kind_text or notes):
            return None                     # an empty row carries nothing to lose
        refs = expand_refs(refs_text)
        kind = part_kind(refs, value_text, kind_text if self.index.get("kind") is not None else "")
        if kind in ("unknown", "mixed") and self.index.get("description") is not None:
            kind = part_kind((), value_text, kind_text) if kind_text else kind
        try:
            qty = _quantity(qty_text) if qty_text else len(refs)
        except ValueError as exc:
            return BomLine(number, refs, len(refs), value_text, kind == "capacitor", kind,
                           notes=notes, problem=BomProblem(number, "qty", qty_text, str(exc)))
        if kind != "capacitor":
            return BomLine(number, refs, qty, value_text or marking_text, False, kind, notes=notes)
        columns = {name: self.cell(cells, name)[0] for name in
                   ("tolerance", "voltage", "dielectric", "tempco", "application", "safety")}
        names = {name: self.header(name) for name in ("value", "marking", *columns)}
        try:
            need = read_requirement(value_text, marking_text if marking_col != value_col else "",
                                    columns, notes)
        except Unreadable as exc:
            return BomLine(number, refs, qty, value_text, True, "capacitor", notes=notes,
                           problem=BomProblem(number, names.get(exc.column) or exc.column,
                                              exc.raw, exc.reason))
        return BomLine(number, refs, qty, value_text, True, "capacitor", notes=notes, **need)


def read_bom(path: str | Path, *, sheet: str | None = None,
             overrides: dict[str, str] | None = None) -> Bom:
    """Read a BOM file (CSV or XLSX) into lines, every row kept.

    Args:
        path: the BOM file.
        sheet: the sheet of a workbook to read (default: the first).
        overrides: header → field mappings that override the fuzzy header match.

    Raises:
        BadSheet: the file cannot be read, or no column holds a value or marking.
    """
    from importers.headers import map_headers
    from importers.sheet import read_sheets

    sheets = read_sheets(path, sheet)
    if not sheets:
        raise BadSheet(str(path), "no sheet in the file", hint="a CSV or an XLSX workbook")
    raw = sheets[0]
    mapping = map_headers(raw.headers, vocabulary="bom", overrides=overrides or {})
    index = dict(mapping.field_to_index)
    if "value" not in index and "marking" not in index:
        raise BadSheet(raw.file, "no column holds the value or marking", sheet=raw.sheet,
                       row=raw.header_row,
                       hint="a header such as Value, Marking or Capacitance (or --map HEADER=value)")
    if "refs" not in index and "qty" not in index:
        raise BadSheet(raw.file, "no column holds the designators or a quantity", sheet=raw.sheet,
                       row=raw.header_row,
                       hint="a header such as Designator, Refs, Qty or Quantity")
    reader = _LineReader(index, tuple(raw.headers))
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


__all__ = ["Bom", "BomLine", "BomProblem", "REF_KINDS", "expand_refs", "part_kind", "read_bom"]
