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
from decimal import Decimal
from pathlib import Path
from typing import Any

from stock.decoded import Dielectric
from stock.counts import read_quantity
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
# "100n", "4n7", "0.1u", "2µ2": a value only a capacitor carries (IEC 60062 letter-and-digit code).
_CAP_UNIT_RE = re.compile(r"^\s*\d+(?:[.,]\d+)?\s*[pnuµμ](?:\d+)?\b", re.IGNORECASE)
MAX_RANGE = 1000            # a "C1-C99999" typo must not expand into memory
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
    text = re.sub(r"\s*([-–…])\s*", r"\1", text.strip())     # "C1 - C4" is one range
    for token in re.split(r"[,;\s]+", text):
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
    >>> part_kind((), "4n7"), part_kind((), "LM317"), part_kind((), "10k")
    ('capacitor', 'unknown', 'unknown')
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
    if re.search(r"\d\s*[pnuµμm]?\s*F\b", value_text, re.IGNORECASE) or _CAP_UNIT_RE.match(value_text):
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


class Unreadable(StockError, ValueError):
    """A requirement cell that does not read; ``column`` is the field name."""

    def __init__(self, column: str, raw: str, reason: str):
        super().__init__(f"{column}: {reason}")
        self.column, self.raw, self.reason = column, raw, reason


# Words BOMs use for the job a part does, mapped onto grading's applications
# (common practice, no published source).
APPLICATION_WORDS: dict[str, str] = {
    "tank": "tuned", "resonant": "tuned", "rf": "tuned", "oscillator": "tuned",
    "timer": "timing", "rc": "timing",
    "coupling": "signal", "audio": "signal", "filter": "signal",
    "decoupling": "bypass", "decouple": "bypass",
    "reservoir": "bulk", "smoothing": "bulk", "storage": "bulk",
    "safety": "mains", "line": "mains", "emi": "mains",
}
# Decoder doubts that make a BOM value unusable for planning (a guess would pick parts).
DOUBTFUL_FLAGS = ("ambiguous-code", "disputed-code", "unparsed", "unreadable")
# Families whose parts have a polarity (from memory of maker datasheets).
POLARISED_FAMILIES = ("tantalum", "tantalum-polymer", "aluminium-electrolytic", "double-layer")
_POLAR_WORDS = re.compile(r"\b(polari[sz]ed|electrolytic|elko|elco|tantalum|tant)\b", re.IGNORECASE)


def _application(text: str) -> str:
    from stock.physics.grading import APPLICATIONS

    word = text.strip().lower()
    word = APPLICATION_WORDS.get(word, word)
    if word not in APPLICATIONS:
        raise Unreadable("application", text, f"unknown application {text!r} (expected one of "
                         f"{', '.join(APPLICATIONS)})")
    return word


def _dielectric_token(text: str) -> Dielectric | None:
    from stock.markings.ceramic_codes import decode_dielectric
    from stock.markings.families import decode_family

    return decode_dielectric(text.strip()) or decode_family(text.strip())


def _tolerance_pct(text: str, capacitance_pf: Decimal) -> Decimal:
    """A tolerance cell as ± % of the value: ``5%``, ``±0.25pF``, ``+80/-20%``, ``5`` or a letter.

    An asymmetric tolerance counts by its larger side. A letter whose meaning tables dispute is
    refused: a plan must not rest on a guess.
    """
    from stock.markings.tolerance_codes import read_explicit_tolerance, read_tolerance_letter
    from stock.units import parse_percent

    token = text.strip().replace(" ", "").replace("+/-", "±").replace("+-", "±")
    tol = read_explicit_tolerance(token) or read_explicit_tolerance("±" + token.lstrip("±"))
    if tol is None and re.fullmatch(r"[A-Za-z]", token):
        reading = read_tolerance_letter(token, capacitance_pf)
        if reading is not None:
            doubt = next((f for f in reading.flags if f.kind in DOUBTFUL_FLAGS), None)
            if doubt is not None:
                raise Unreadable("tolerance", text, f"{doubt.message}; write it out (±5 %, ±10 %)")
            tol = reading.tolerance
    if tol is None:
        try:
            return parse_percent(token, "tolerance")
        except BadValue:
            raise Unreadable("tolerance", text, f"cannot read tolerance {text!r} (expected ±5 %, 10%,"
                             " +80/-20 %, ±0.25 pF or a letter code such as J or K)") from None
    return max(tol.as_percent(capacitance_pf))


def read_requirement(value_text: str, marking_text: str, columns: dict[str, str],
                     notes: str = "") -> dict[str, Any]:
    """The requirement fields of a capacitor line, from its value/marking and other columns.

    Returns a dict of :class:`BomLine` field values. The value column reads as a user value first
    (``100n``, ``4n7``, ``0.1uF``), then as a marking (``104K 100V``, ``2u2 50V X7R``), whose
    tolerance, voltage, dielectric and safety class count unless a column says otherwise.

    Raises:
        Unreadable: a cell cannot be read; ``column`` names the field.

    >>> r = read_requirement("150p", "", {"tolerance": "5%", "voltage": "100V", "dielectric": "NP0"})
    >>> r["capacitance_pf"], r["tol_pct"], r["voltage_v"], r["dielectric"].code
    (Decimal('150'), Decimal('5'), Decimal('100'), 'NP0')
    """
    from stock.markings.decoder import decode
    from stock.markings.typed_values import parse_capacitance, parse_voltage

    out: dict[str, Any] = {}
    remarks: list[str] = []
    marking = None
    capacitance: Decimal | None = None
    first_failure: Unreadable | None = None
    for text, column in ((value_text, "value"), (marking_text, "marking")):
        if not text:
            continue
        decoded = decode(text)
        doubt = next((f for f in decoded.flags if f.kind in DOUBTFUL_FLAGS), None)
        if doubt is not None:
            # A plan built on a guessed value could pull the wrong part: ask for a clear one.
            raise Unreadable(column, text, f"{doubt.message}; write the value with its unit"
                             " (150p, 4n7, 0.1u)")
        try:
            value = parse_capacitance(text, what=column)
        except BadValue as exc:
            value = decoded.capacitance_pf
            if value is None:
                first_failure = first_failure or Unreadable(column, text, str(exc))
                continue
            remarks.extend(f.message for f in decoded.flags)
        if capacitance is not None and value != capacitance:
            from stock.units import format_capacitance

            raise Unreadable(column, text, f"marking {text!r} reads {format_capacitance(value)},"
                             f" the value says {format_capacitance(capacitance)}")
        capacitance = capacitance if capacitance is not None else value
        if marking is None or column == "marking":
            marking = decoded
    if capacitance is None:
        raise first_failure or Unreadable("value", value_text, "no value or marking given")
    if capacitance <= 0:
        raise Unreadable("value", value_text, "a capacitance must be more than zero")
    out["capacitance_pf"] = capacitance
    if marking is not None:
        if marking.tolerance is not None:
            tol = marking.tolerance.as_percent(capacitance)
            out["tol_pct"] = max(tol) if tol else None
        out["voltage_v"] = marking.voltage_v
        out["voltage_kind"] = marking.voltage_kind if marking.voltage_v is not None else None
        out["dielectric"] = marking.dielectric
        out["safety_class"] = marking.safety_class
        out["polarised"] = marking.polarity is not None
    if columns.get("tolerance"):
        out["tol_pct"] = _tolerance_pct(columns["tolerance"], capacitance)
    if columns.get("voltage"):
        text = columns["voltage"]
        safety = SAFETY_CLASS_RE.search(text)     # "275VAC X2" in one cell
        if safety:
            out["safety_class"] = safety.group(1).upper()
            text = (text[:safety.start()] + text[safety.end():]).strip()
        try:
            out["voltage_v"] = parse_voltage(text, "voltage")
        except BadValue as exc:
            raise Unreadable("voltage", text, f"cannot read voltage {text!r} (expected 50V,"
                             " 250 V AC, 1kV)") from exc
        out["voltage_kind"] = "AC" if re.search(r"AC|~|VAC", text, re.IGNORECASE) else "DC"
    for column in ("dielectric",):
        text = columns.get(column, "")
        if not text:
            continue
        for token in re.split(r"[,;/\s]+", text):
            if not token:
                continue
            safety = SAFETY_CLASS_RE.fullmatch(token)
            if safety:
                out["safety_class"] = safety.group(1).upper()
                continue
            dielectric = _dielectric_token(token)
            if dielectric is not None:
                out["dielectric"] = dielectric
                continue
            if _POLAR_WORDS.fullmatch(token):
                out["polarised"] = True
                continue
            try:
                window = _tempco_window(token)
            except BadValue as exc:
                raise Unreadable(column, text, f"cannot read {token!r} as a dielectric, tempco or"
                                 " safety class (expected C0G, X7R, N750, 0±30, polypropylene,"
                                 " X2 ...)") from exc
            out["tempco_min"], out["tempco_max"] = window
    if columns.get("tempco"):
        try:
            out["tempco_min"], out["tempco_max"] = _tempco_window(columns["tempco"])
        except BadValue as exc:
            raise Unreadable("tempco", columns["tempco"], str(exc)) from exc
    dielectric = out.get("dielectric")
    if (dielectric is not None and dielectric.klass == 1 and "tempco_min" not in out
            and dielectric.tempco_ppm_per_k is not None and dielectric.tempco_tol_ppm_per_k is not None):
        out["tempco_min"] = dielectric.tempco_ppm_per_k - dielectric.tempco_tol_ppm_per_k
        out["tempco_max"] = dielectric.tempco_ppm_per_k + dielectric.tempco_tol_ppm_per_k
    if dielectric is not None and dielectric.family in POLARISED_FAMILIES:
        out["polarised"] = True
    if _POLAR_WORDS.search(f"{value_text} {notes}") and not (dielectric and dielectric.family in
                                                             ("bipolar-electrolytic",)):
        out["polarised"] = True
    if columns.get("application"):
        out["application"] = _application(columns["application"])
    if out.get("safety_class") and out.get("application") in (None, "mains"):
        out["application"] = "mains"
    elif out.get("safety_class"):
        raise Unreadable("application", columns.get("application", ""),
                         f"a {out['safety_class']} safety part is a mains part, not "
                         f"{out['application']!r}")
    if out.get("application") == "mains" and not out.get("safety_class"):
        raise Unreadable("application", columns.get("application", "mains"),
                         "a mains line must name its safety class (X1, X2, Y1, Y2 ...): the class"
                         " decides which parts may go there")
    out["remarks"] = tuple(remarks)
    return {k: v for k, v in out.items() if v is not None}


def _tempco_window(text: str) -> tuple[Decimal, Decimal]:
    from stock.matching.search import parse_tempco_window

    return parse_tempco_window(text)


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

    def read(self, number: int, cells: tuple[Any, ...]) -> BomLine | None:
        refs_text = self.cell(cells, "refs")
        qty_text = self.cell(cells, "qty")
        value_text = self.value(cells, "value")
        marking_text = self.value(cells, "marking")
        kind_text = self.cell(cells, "part_type")
        notes = self.cell(cells, "notes")
        if not (refs_text or qty_text or value_text or marking_text or kind_text or notes):
            return None                     # an empty row carries nothing to lose
        shown = value_text or marking_text
        refs = expand_refs(refs_text)
        kind = part_kind(refs, shown, kind_text)
        if kind == "unknown" and notes:     # "Description: ceramic capacitor" in the notes column
            kind = "capacitor" if any(w in notes.lower() for w in CAPACITOR_KIND_WORDS) else kind
        try:
            qty = _quantity(qty_text) if qty_text else len(refs)
        except ValueError as exc:
            return BomLine(number, refs, len(refs), shown, kind == "capacitor", kind,
                           notes=notes, problem=BomProblem(number, self.header("qty"), qty_text,
                                                           str(exc)))
        if kind != "capacitor":
            return BomLine(number, refs, qty, shown, False, kind, notes=notes)
        if qty == 0 and not refs:
            return BomLine(number, refs, qty, shown, True, kind, notes=notes,
                           problem=BomProblem(number, self.header("qty"), qty_text,
                                              "no quantity and no designators"))
        columns = {name: self.cell(cells, name) for name in
                   ("tolerance", "voltage", "dielectric", "tempco", "application")}
        try:
            need = read_requirement(value_text, marking_text, columns, notes)
        except Unreadable as exc:
            return BomLine(number, refs, qty, shown, True, "capacitor", notes=notes,
                           problem=BomProblem(number, self.header(exc.column) or exc.column,
                                              exc.raw, exc.reason))
        return BomLine(number, refs, qty, shown, True, "capacitor", notes=notes, **need)


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


__all__ = ["Bom", "BomLine", "BomProblem", "REF_KINDS", "Unreadable", "expand_refs", "parse_mappings",
           "part_kind", "read_bom", "read_requirement"]
