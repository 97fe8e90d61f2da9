"""Reading one sheet row: cell text, counts, bin identity, the marking it states, its raw record.

:mod:`stock.intake` stores rows; this module says what a row *means*. A :class:`RowReader` is made
once per sheet from its header mapping and answers, per row, the text of each mapped field, the
marking text to decode (marking, dielectric, tolerance, voltage ... columns joined in the order a
part is printed), its decoding (colour bands read as such), whether an explicit value column or the
bin label disagrees with it, and the row as raw JSON for ``source_rows``.

Sheets repeat their markings a lot (a shop holds the same 104 in many bins), so decodings are
remembered per distinct reading and the part columns per decoded marking: a 100 000-row sheet with
3 000 different markings decodes 3 000 times.

Quantity rules (common practice in stock-keeping, no published source): whole numbers only; a
blank cell means "not counted", never zero; a negative or non-numeric count is refused.

>>> bin_key("Cabinet  1", " A2 ")
'cabinet 1/a2'
"""

from __future__ import annotations

import re
from dataclasses import replace
from datetime import date, datetime
from decimal import Decimal
from functools import lru_cache
from typing import Any

from stock.counts import MAX_COUNT, read_quantity
from stock.decoded import Alternative, Flag, Marking
from stock.errors import BadValue
from stock.markings.colours import decode_colours
from stock.markings.decoder import decode, merge_colours
from stock.markings.packages import read_package
from stock.markings.typed_values import parse_capacitance
from stock.units import format_capacitance

# Fields of the "bins" vocabulary whose text joins the marking, in the order it is written.
MARKING_FIELDS = ("marking", "colours", "dielectric", "tolerance", "voltage", "safety_class",
                  "polarity", "rated_temp")
# Fields that can carry the part's reading; a sheet with none of them cannot be imported.
READING_FIELDS = ("marking", "value", "colours")
READINGS_REMEMBERED = 65536  # distinct readings kept per sheet (memory stays bounded)

# (where, text, value in pF or None) of each other value column filled in a row.
Claims = tuple[tuple[str, str, "Decimal | None"], ...]

# The flat parts columns, in the order of :func:`part_columns`.
PART_COLUMNS = ("capacitance_pf", "tol_minus", "tol_plus", "tol_unit", "tol_code", "voltage_v",
                "voltage_kind", "dielectric_code", "family", "class", "tempco_ppm_per_k",
                "tempco_tol_ppm_per_k", "temp_min_c", "temp_max_c", "change_minus_pct",
                "change_plus_pct", "safety_class", "polarity", "rated_temp_c")


def normalise(text: str) -> str:
    """Bin-key form of a name: trimmed, white space made single, lower case."""
    return " ".join(str(text).split()).casefold()


def bin_key(cabinet: str, location: str) -> str:
    """The identity of a bin: ``"<cabinet>/<location>"`` normalised (see :mod:`stock.intake`)."""
    return f"{normalise(cabinet)}/{normalise(location)}"


@lru_cache(maxsize=65536)
def decode_cached(text: str) -> Marking:
    """:func:`stock.markings.decode` remembered per text: sheets repeat their markings a lot."""
    return decode(text)


def cell_text(value: Any) -> str:
    """A cell as the text a person would read: 104.0 is "104", 2.2e-05 is "0.000022".

    >>> cell_text(104.0), cell_text(2.2e-05), cell_text("  4n7 "), cell_text(None)
    ('104', '0.000022', '4n7', '')
    """
    if value is None:
        return ""
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, float):
        if value.is_integer():
            return str(int(value))
        return format(Decimal(repr(value)), "f")
    if isinstance(value, (datetime, date)):
        return value.isoformat()
    return " ".join(str(value).split())


_NUMBER = re.compile(r"^[+-]?(\d+(\.\d*)?|\.\d+)$")


def part_columns(m: Marking) -> tuple[Any, ...]:
    """The flat parts columns of a marking, in the order of :data:`PART_COLUMNS`."""
    tol, diel = m.tolerance, m.dielectric

    def f(v: Decimal | None) -> float | None:
        return None if v is None else float(v)

    return (
        f(m.capacitance_pf),
        f(tol.minus) if tol else None, f(tol.plus) if tol else None,
        tol.unit if tol else None, tol.code if tol else None,
        f(m.voltage_v), m.voltage_kind,
        diel.code if diel else None, diel.family if diel else None, diel.klass if diel else None,
        f(diel.tempco_ppm_per_k) if diel else None, f(diel.tempco_tol_ppm_per_k) if diel else None,
        f(diel.temp_min_c) if diel else None, f(diel.temp_max_c) if diel else None,
        f(diel.change_minus_pct) if diel else None, f(diel.change_plus_pct) if diel else None,
        m.safety_class, m.polarity, f(m.rated_temp_c),
    )


# A polarity column often says only whether the part is polarised, not which lead is marked:
# such words add nothing to the marking (the decoder assumes the family's usual mark and says so).
_POLARITY_WORDS = {w: "" for w in ("yes", "y", "true", "x", "1", "no", "n", "false", "0",
                                   "polarised", "polarized", "polar", "non-polar", "np")}


@lru_cache(maxsize=4096)
def _decode_colours_cached(text: str) -> Marking:
    return decode_colours(text)


def _colours_unused(colours: str) -> tuple[Flag, ...]:
    return (Flag("unparsed", f"the colours {colours!r} were not used: the printed marking gave"
                 " the value"),)


def with_unit(text: str, unit: str | None) -> str:
    """A bare number from a column whose header names a unit gets that unit ("100" + "pF").

    >>> with_unit("100", "µF"), with_unit("4n7", "pF")
    ('100uF', '4n7')
    """
    if unit and _NUMBER.match(text):
        return f"{text}{unit.replace('µ', 'u').replace('μ', 'u')}"  # ASCII: every decoder reads "uF"
    return text


def same_value(a: Decimal, b: Decimal) -> bool:
    """Two capacitances equal to within rounding (one part in 10⁹)."""
    return abs(a - b) <= abs(b) * Decimal("1e-9")


_VALUE_TOKEN = re.compile(r"\d[\d.,]*\s*(?:[pnuµμ]\s*F?|F)\b|\d+[pnuµμR]\d+", re.IGNORECASE)


@lru_cache(maxsize=4096)
def agreed_by_claim(marking: Marking, where: str, raw: str) -> Marking:
    """Drop the value doubts that a label or value column agreeing with the reading settles.

    A ``100`` code (10 pF, or 100 pF printed literally) in a drawer labelled ``10p`` is no longer
    in doubt about its value: the ``ambiguous-code`` and ``unit-assumed`` flags that name one of
    the other values go. The alternatives stay, with the agreement noted, so nothing is hidden;
    doubts about anything else (a voltage, a dielectric) are kept.

    >>> from stock.markings.decoder import decode
    >>> m = agreed_by_claim(decode("100"), "the label", "10p")
    >>> m.flag_kinds(), m.alternatives[-1].reason
    (set(), 'the label says 10p, agreeing with the reading chosen')
    """

    nominal = marking.capacitance_pf
    others = {format_capacitance(a.capacitance_pf) for a in marking.alternatives
              if a.capacitance_pf is not None and nominal is not None
              and not same_value(a.capacitance_pf, nominal)}
    if not others:
        return marking
    kept = tuple(f for f in marking.flags
                 if f.kind not in ("ambiguous-code", "unit-assumed")
                 or not any(o in f.message for o in others))
    if len(kept) == len(marking.flags):
        return marking
    note = Alternative(reason=f"{where} says {raw}, agreeing with the reading chosen", capacitance_pf=nominal)
    return replace(marking, flags=kept, alternatives=marking.alternatives + (note,))


@lru_cache(maxsize=4096)
def package_facts(package: str | None, mounting: str | None, said_package: str | None,
                  said_mounting: str | None) -> tuple[str | None, str | None, str | None]:
    """The part's package and mounting from its columns and from its marking or description.

    Args:
        package, mounting: the package and mounting columns' text (None when blank).
        said_package, said_mounting: what the marking or description said (``Marking.package``).

    Returns:
        (package text, the mounting column as typed or else ``SMD``/``THT`` as decoded,
        disagreement or None). The columns win; a column and a description that disagree on mounting or chip size give
        the disagreement, to be raised as a flag.

    >>> package_facts("0805", None, None, None)
    ('0805', 'SMD', None)
    >>> package_facts(None, "THT", "0603", "SMD")[2]
    "the mounting column says THT, the marking or description says SMD ('0603')"
    """

    column = read_package(" ".join(t for t in (package, mounting) if t)) if (package or mounting) else None
    said = read_package(said_package) if said_package else None
    # a mounting column is kept as typed ("radial" says more than THT); else the decoded mounting
    chosen_mounting = mounting or (column.mounting if column is not None else None) or said_mounting
    conflict = None
    if column is not None and said is not None:
        where = "mounting" if mounting else "package"
        if column.mounting and said_mounting and column.mounting != said_mounting:
            conflict = (f"the {where} column says {column.mounting}, the marking or description says"
                        f" {said_mounting} ({said_package!r})")
        elif column.chip_size and said.chip_size and column.chip_size != said.chip_size:
            conflict = (f"the package column says {column.chip_size}, the marking or description says"
                        f" {said.chip_size}")
    return package or said_package, chosen_mounting, conflict


def label_value(label: str) -> tuple[str, Decimal] | None:
    """A capacitance written in a bin label ("10nF", "Box 4n7 C0G"), if it states one.

    >>> label_value("Box 4n7 C0G")
    ('4n7', Decimal('4700'))
    """
    for match in _VALUE_TOKEN.finditer(label):
        token = match.group(0).replace(" ", "")
        try:
            return token, parse_capacitance(token, what="label")
        except (BadValue, ValueError):
            continue
    return None


class RowReader:
    """What the rows of one sheet say, given its header mapping.

    Args:
        header_map: the sheet's :class:`importers.headers.HeaderMap`.
        headers: the sheet's header texts (unique), in column order.
    """

    def __init__(self, header_map: Any, headers: list[str]):
        self.units: dict[str, str] = dict(getattr(header_map, "units", None) or {})
        self.index: dict[str, int] = dict(header_map.field_to_index)
        self.headers = headers
        self._text_fields = [(n, i) for n, i in self.index.items() if n not in ("quantity", "minimum")]
        column_units = dict(getattr(header_map, "column_units", None) or {})
        # Every column that may carry the value, in the order tried: (field name in texts(),
        # is it a marking column, its unit, how a cross-check names it).
        self._order: list[tuple[str, bool, str | None, str]] = []
        order = header_map.reading_order() if hasattr(header_map, "reading_order") else \
            tuple((n, self.index[n]) for n in ("marking", "value") if n in self.index)
        for n, i in order:
            name = n if self.index.get(n) == i else f"{n}@{i}"
            if name != n:
                self._text_fields.append((name, i))
            unit = self.units.get(n) if name == n else column_units.get(i)
            where = {"value": "the value column", "label": "the label"}.get(name, f"the {headers[i]!r} column")
            self._order.append((name, n == "marking", unit, where))
        self._reading_fields = tuple(n for n in (*MARKING_FIELDS, "value") if n in self.index) + \
            tuple(name for name, _, _, _ in self._order if "@" in name or name == "label")
        self._readings: dict[tuple[str | None, ...], tuple[str, Marking | None, Claims]] = {}

    def texts(self, cells: tuple[Any, ...]) -> dict[str, str]:
        """The non-blank text of each mapped field of a row (the hot path: one pass, no lookups)."""
        out: dict[str, str] = {}
        for name, i in self._text_fields:
            v = cells[i] if i < len(cells) else None
            if v is None:
                continue
            if type(v) is str:
                t = v.strip()
                if "  " in t or "\n" in t or "\t" in t:
                    t = " ".join(t.split())
            else:
                t = cell_text(v)
            if t:
                out[name] = t
        return out

    def raw_cell(self, cells: tuple[Any, ...], name: str) -> Any:
        i = self.index.get(name)
        return None if i is None or i >= len(cells) else cells[i]

    def reading(self, f: dict[str, str]) -> tuple[str, Marking | None, Claims]:
        """(marking text, its decoding or None, the other value columns' claims).

        Each claim is (where, the text, its value in pF or None). Remembered per distinct
        combination of the reading fields' texts, so the decoding of a repeated marking is one
        and the same object (the store turns it into columns once).
        """
        key = tuple(f.get(n) for n in self._reading_fields)
        found = self._readings.get(key)
        if found is None:
            text, colours, claimed = self.marking_text(f)
            text, marking = self.decode(text, colours)
            claims = tuple((where, raw, decode_cached(raw).capacitance_pf) for where, raw in claimed)
            found = (text, marking, claims)
            if len(self._readings) < READINGS_REMEMBERED:
                self._readings[key] = found
        return found

    def marking_text(self, f: dict[str, str]) -> tuple[str, str, tuple[tuple[str, str], ...]]:
        """(marking text to decode, the colours column's text or "", the other value columns).

        The first filled column of the reading order (marking columns, then value columns) is
        the marking; every other filled one is a claim, (where, text), to cross-check it with.
        """
        pieces = []
        for name in MARKING_FIELDS:
            text = f.get(name)
            if not text or name in ("colours", "marking"):
                continue
            if name == "voltage":
                text = with_unit(text, self.units.get(name) or "V")
            elif name == "tolerance":
                text = with_unit(text, self.units.get(name) or "%")
            elif name == "rated_temp":
                text = with_unit(text, "°C")
            elif name == "polarity":
                text = _POLARITY_WORDS.get(text.casefold(), text)
                if not text:
                    continue
            pieces.append(text)
        filled = [(is_marking, with_unit(t, unit), where)
                  for name, is_marking, unit, where in self._order if (t := f.get(name))]
        if len(filled) > 1 and filled[-1][2] == "the label":
            filled.pop()       # a label is read only when nothing else is; otherwise it cross-checks
        colours = f.get("colours", "")
        if not filled or (colours and not filled[0][0]):
            # colour bands give the value; every value column cross-checks them
            return " ".join(pieces), colours, tuple((w, t) for _, t, w in filled)
        first = filled[0][1]
        return " ".join([first, *pieces]), colours, tuple((w, t) for _, t, w in filled[1:])

    @staticmethod
    def decode(text: str, colours: str) -> tuple[str, Marking | None]:
        """Decode a row's text; a colours column is read as colour bands, the rest fills in."""
        if not colours:
            return text, decode_cached(text) if text else None
        full = f"{text} {colours}".strip() if text else colours
        rest = decode_cached(text) if text else None
        if rest is not None and rest.capacitance_pf is not None:
            return full, rest.with_flags(*_colours_unused(colours))
        return full, merge_colours(_decode_colours_cached(colours), rest, full)

    @staticmethod
    def cross_check(key: str, text: str, marking: Marking, claimed: Claims,
                    label: str) -> tuple[Marking, list[tuple[str, str, str]]]:
        """Compare the marking's reading with the other value columns and a label; keep the marking's.

        Returns the marking (with an alternative and a ``label-conflict`` flag per disagreement)
        and the (kind, message, fingerprint) of each disagreement.
        """
        found: list[tuple[str, str, str]] = []
        nominal = marking.capacitance_pf
        if nominal is None:
            return marking, found
        claims: list[tuple[str, str, Decimal]] = [(w, raw, pf) for w, raw, pf in claimed if pf is not None]
        if label:
            said = label_value(label)
            if said is not None:
                claims.append(("the label", said[0], said[1]))
        for where, raw, other in claims:
            if same_value(other, nominal):
                marking = agreed_by_claim(marking, where, raw)
                continue
            message = (f"{where} says {format_capacitance(other)} ({raw!r}), the marking {text!r}"
                       f" says {format_capacitance(nominal)}; kept the marking's reading")
            marking = replace(marking, alternatives=marking.alternatives + (
                Alternative(reason=f"{where} says {raw}", capacitance_pf=other),),
                flags=marking.flags + (Flag("label-conflict", message),))
            found.append(("label-conflict", message, f"{key}|label-conflict|{text}|{raw}"))
        return marking, found


__all__ = ["MARKING_FIELDS", "MAX_COUNT", "PART_COLUMNS", "READING_FIELDS", "RowReader", "bin_key",
           "cell_text", "decode_cached", "label_value", "normalise", "package_facts", "part_columns",
           "read_quantity",
           "same_value", "with_unit"]
