"""Map the messy column headers of a shop sheet or a BOM onto our field names.

A header is first cleaned (case, punctuation, a capacitance unit such as ``(pF)`` taken out
and remembered), then looked up in an alias table; only when no alias matches exactly is it
compared fuzzily (rapidfuzz ``WRatio`` with a cutoff) against the aliases, and a fuzzy match is
refused when two different fields score almost the same. Fuzzy matching against field names
alone gets about two headers in three right; the alias table is what makes mapping work.

The aliases are common practice in shop sheets and BOM exports, no published source. Two trade
spellings are old but still met: ``MFD`` meant µF and ``MMFD`` (micro-micro-farad) meant pF.

>>> hm = map_headers(("Bin #", "Value (pF)", "Qty on hand", "Supplier"))
>>> hm.field_to_index["location"], hm.field_to_index["quantity"], hm.units
(0, 2, {'value': 'pF'})
>>> hm.describe()[1]
"'Value (pF)' → value (alias, unit pF)"
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from typing import Any, Iterable, Literal, Mapping, Sequence

from stock.errors import BadValue

Vocabulary = Literal["bins", "bom"]

FUZZY_CUTOFF = 85          # WRatio score a fuzzy match must reach (libraries.md: cutoff 85)
AMBIGUOUS_MARGIN = 3.0     # two fields scoring within this of each other: ask the user instead
MIN_PLAIN_RATIO = 70       # WRatio rewards containment ("part" in "supplier part number"); demand likeness too
MIN_FUZZY_LENGTH = 3       # very short aliases ("v", "c", "no") match exactly or not at all

# Aliases per field; common practice in shop sheets, no published source. The field's own name
# (with "_" as a space) is always an alias. Keep one spelling per line group, lower case.
BIN_ALIASES: dict[str, tuple[str, ...]] = {
    "marking": ("marking", "markings", "mark", "code", "marking code", "marking/code", "part marking",
                "printed code", "body code", "code on part", "text on part", "marking text",
                "cap code"),
    "value": ("value", "val", "capacitance", "cap", "capacity", "c", "nominal", "nominal value",
              "cap value", "farads", "capacitor value"),
    "tolerance": ("tolerance", "tol", "tolerance code", "accuracy", "precision", "tol code"),
    "voltage": ("voltage", "volts", "volt", "v", "wv", "wvdc", "vdc", "vac", "rated voltage",
                "voltage rating", "working voltage", "max voltage", "v rating", "v max", "vmax"),
    "dielectric": ("dielectric", "dielectric type", "dielectric/type", "material", "type", "kind",
                   "family", "construction", "tc", "tempco", "temp coefficient",
                   "temperature coefficient", "ceramic type", "film type"),
    "colours": ("colours", "colors", "colour", "color", "colour code", "color code", "bands",
                "colour bands", "color bands", "stripes", "dots"),
    "quantity": ("quantity", "qty", "qty on hand", "on hand", "count", "stock", "in stock", "amount",
                 "pcs", "pieces", "number", "no", "qty in bin", "how many", "total", "stock qty",
                 "quantity on hand"),
    "location": ("location", "loc", "bin", "bin #", "bin no", "bin number", "bin location", "drawer",
                 "drawer no", "slot", "box", "position", "pos", "place", "tray", "compartment", "where"),
    "label": ("label", "bin label", "drawer label", "tag", "name", "title", "description", "desc"),
    "cabinet": ("cabinet", "cab", "cupboard", "rack", "unit", "storage", "chest", "organiser",
                "organizer", "shelf", "sheet"),
    "notes": ("notes", "note", "comments", "comment", "remarks", "remark", "memo", "info", "misc"),
    "minimum": ("minimum", "min", "min qty", "min stock", "reorder", "reorder level", "reorder point",
                "reorder at", "safety stock", "low stock", "par level"),
    "package": ("package", "pkg", "case", "case size", "footprint", "size", "body", "body size",
                "smd size"),
    "mounting": ("mounting", "mount", "smd/tht", "smd tht", "tht/smd", "through hole", "leads",
                 "lead style", "style", "axial/radial", "radial/axial", "termination"),
    "date_code": ("date code", "datecode", "date", "dc", "lot", "batch", "year", "mfg date"),
    # (no "manufactured" / "date of manufacture": they fuzzily catch a "Manufacturer" column)
    "safety_class": ("safety class", "safety", "safety rating", "x/y class", "xy class", "x/y",
                     "mains class", "iec class"),
    "polarity": ("polarity", "polarised", "polarized", "polar", "pol", "+ lead", "bipolar"),
    "rated_temp": ("rated temp", "rated temperature", "temp", "temperature", "max temp", "temp rating",
                   "temp range", "operating temp", "°c", "degrees"),
    "bin_key": ("bin key",),      # the whole identity "<cabinet>/<location>", as exports write it
}

# One line per bin-sheet field, for `stock import --help`.
FIELD_MEANINGS: dict[str, str] = {
    "marking": "what is printed on the part: 104K 2A, 4n7 C0G, CAP CER 0.1UF 50V X7R 0603",
    "value": "the capacitance: 4.7nF, 0.1uF, 4700 (a unit in the header: 'Value (pF)')",
    "tolerance": "±5 %, 10%, J, K",
    "voltage": "rated voltage: 50, 50V, 275VAC",
    "dielectric": "C0G, X7R, polyester, MKP, tantalum, electrolytic",
    "colours": "colour bands or dots: yellow violet orange",
    "quantity": "pieces on hand (blank = not counted, not zero)",
    "location": "the bin within its cabinet: A1, drawer 12",
    "label": "the bin's label or a description (read for the value when nothing else is)",
    "cabinet": "the cabinet or rack (default: the sheet or file name)",
    "notes": "anything else about the bin",
    "minimum": "reorder when fewer are on hand",
    "package": "0805, radial 5x11, axial",
    "mounting": "SMD or through-hole",
    "date_code": "maker's date code: 1832, 2019-07",
    "safety_class": "mains safety class: X2, Y1",
    "polarity": "polarised or not, which lead is marked",
    "rated_temp": "rated temperature: 105 °C",
    "bin_key": "cabinet/location in one cell, as the inventory export writes it",
}

BOM_ALIASES: dict[str, tuple[str, ...]] = {
    "refs": ("refs", "ref", "reference", "references", "ref des", "refdes", "ref designators",
             "reference designator", "reference designators", "designator", "designators",
             "part ref", "parts", "positions", "circuit ref"),
    "qty": ("qty", "quantity", "qty per board", "qty/board", "per board", "count", "number", "no",
            "amount", "each", "pcs", "qty each", "quantity per board"),
    "value": BIN_ALIASES["value"],
    "marking": BIN_ALIASES["marking"],
    "tolerance": BIN_ALIASES["tolerance"],
    "voltage": BIN_ALIASES["voltage"] + ("min voltage", "rating"),
    "dielectric": ("dielectric", "dielectric type", "dielectric/type", "material", "family",
                   "construction", "ceramic type", "film type"),
    "tempco": ("tempco", "tc", "temp coefficient", "temperature coefficient", "ppm", "ppm/k",
               "ppm/°c", "ppm/c", "alpha", "tempco window", "drift"),
    "application": ("application", "use", "purpose", "function", "role", "usage", "job", "circuit",
                    "circuit use", "duty"),
    "part_type": ("part type", "type", "kind", "category", "component", "component type", "part",
                  "part kind", "class"),
    "notes": ("notes", "note", "comments", "comment", "remarks", "remark", "description", "desc",
              "memo", "info"),
    # CAD exports: the footprint, and whether the part is fitted in this build
    "package": BIN_ALIASES["package"] + ("footprint name", "pcb footprint", "land pattern", "pattern"),
    "mounting": BIN_ALIASES["mounting"],
    "dnp": ("dnp", "dnf", "dni", "do not fit", "do not place", "do not populate", "not fitted",
            "no fit", "exclude from board", "exclude"),
    "fitted": ("fitted", "fit", "populate", "populated", "place", "mount?", "fitted?"),
}

VOCABULARIES: dict[str, dict[str, tuple[str, ...]]] = {"bins": BIN_ALIASES, "bom": BOM_ALIASES}

BIN_FIELDS = tuple(BIN_ALIASES)
BOM_FIELDS = tuple(BOM_ALIASES)

# Capacitance units a header may name; "mfd"/"mmfd" are the old US spellings of µF and pF
# (from memory of mid-century parts catalogues). Both the micro sign and Greek mu are met.
_UNIT_WORDS: dict[str, str] = {
    "pf": "pF", "pico": "pF", "picofarad": "pF", "picofarads": "pF", "mmfd": "pF", "uuf": "pF",
    "nf": "nF", "nano": "nF", "nanofarad": "nF", "nanofarads": "nF",
    "uf": "µF", "µf": "µF", "μf": "µF", "mfd": "µF", "microfarad": "µF", "microfarads": "µF",
}
_UNIT_RE = re.compile(r"(?<![0-9a-zµμ])(" + "|".join(sorted(map(re.escape, _UNIT_WORDS), key=len, reverse=True))
                      + r")(?![0-9a-z])")
_NON_WORD = re.compile(r"[^0-9a-zµμ°#+/]+")
_BRACKETED = re.compile(r"[(\[{][^)\]}]*[)\]}]")
SYNTHETIC_HEADER = re.compile(r"^column \d+( \(\d+\))?$")  # made by the readers for blank headers


def normalise(header: str) -> str:
    """Clean a header for lookup: lower case, punctuation to single spaces, ends trimmed.

    ``#``, ``/``, ``+`` and ``°`` are kept because they carry meaning ("Bin #", "SMD/THT").

    >>> normalise("  Qty_on-hand ")
    'qty on hand'
    >>> normalise("Marking / Code")
    'marking/code'
    """
    text = str(header).lower().replace("_", " ")
    text = _NON_WORD.sub(" ", text)
    text = re.sub(r"\s*/\s*", "/", text)
    return re.sub(r"\s+", " ", text).strip()


def split_unit(header: str) -> tuple[str, str | None]:
    """Take a capacitance unit out of a header: ``"Value (pF)"`` → ``("value", "pF")``.

    >>> split_unit("Cap nF")
    ('cap', 'nF')
    >>> split_unit("uF")
    ('', 'µF')
    >>> split_unit("Tol %")
    ('tol', None)
    """
    text = normalise(header)
    unit = None
    found = _UNIT_RE.search(text)
    if found:
        unit = _UNIT_WORDS[found.group(1)]
        text = (text[:found.start()] + " " + text[found.end():])
    text = re.sub(r"\s+", " ", text).strip(" /")
    return text, unit


def _alias_index(vocabulary: Mapping[str, tuple[str, ...]]) -> dict[str, str]:
    index: dict[str, str] = {}
    for field_name, aliases in vocabulary.items():
        for alias in (field_name.replace("_", " "), *aliases):
            index.setdefault(normalise(alias), field_name)
    return index


_INDEXES: dict[str, dict[str, str]] = {name: _alias_index(v) for name, v in VOCABULARIES.items()}
_ALL_FIELDS_INDEX: dict[str, str] = {**_INDEXES["bom"], **_INDEXES["bins"]}


@dataclass(frozen=True)
class Guess:
    """How one header was read: the field (or None), the score and how it was found."""

    field: str | None
    score: float
    how: str                       # "alias", "fuzzy", "--map", "ambiguous", "none"
    unit: str | None = None
    rivals: tuple[str, ...] = ()   # fields that scored nearly as well (for "ambiguous")


def guess_field(header: str, vocabulary: Vocabulary = "bins") -> Guess:
    """Guess the field one header names, without looking at the other headers.

    >>> guess_field("Quantitiy")
    Guess(field='quantity', score=94.1, how='fuzzy', unit=None, rivals=())
    >>> guess_field("uF").field, guess_field("uF").unit
    ('value', 'µF')
    >>> guess_field("Supplier part number").field is None
    True
    """
    index = _index_for(vocabulary)
    return _guess(header, index)


def _index_for(vocabulary: str) -> dict[str, str]:
    if vocabulary not in _INDEXES:
        raise BadValue("vocabulary", str(vocabulary), "one of " + ", ".join(map(repr, VOCABULARIES)))
    return _INDEXES[vocabulary]


def _guess(header: str, index: Mapping[str, str]) -> Guess:
    from rapidfuzz import fuzz, process   # imported late: it costs start-up time (libraries.md A2)

    if SYNTHETIC_HEADER.match(str(header)):
        return Guess(None, 0.0, "none")
    text, unit = split_unit(header)
    if not text and unit:
        return Guess("value", 100.0, "alias", unit)      # a bare "uF" or "(pF)" column holds values
    if text in index:
        return Guess(index[text], 100.0, "alias", unit)
    unbracketed = split_unit(_BRACKETED.sub(" ", str(header)))[0]     # "Qty (pcs)" → "qty"
    for variant in (text.replace("/", " "), text.replace(" ", ""), unbracketed):   # "cap/code", "bin#"
        if variant in index:
            return Guess(index[variant], 100.0, "alias", unit)
    if len(text) < MIN_FUZZY_LENGTH:
        return Guess(None, 0.0, "none", unit)
    choices = _fuzzy_choices(index)
    best: dict[str, float] = {}
    # Plain ratio first: it is the cheap filter, and a WRatio match must pass it anyway.
    alike = [a for a, _, _ in process.extract(text, choices, scorer=fuzz.ratio, limit=None,
                                              score_cutoff=MIN_PLAIN_RATIO)]
    for alias, score, _ in process.extract(text, alike, scorer=fuzz.WRatio, limit=None,
                                           score_cutoff=FUZZY_CUTOFF):
        name = index[alias]
        best[name] = max(best.get(name, 0.0), score)
    if not best:
        return Guess(None, 0.0, "none", unit)
    ranked = sorted(best.items(), key=lambda kv: -kv[1])
    top_field, top_score = ranked[0]
    rivals = tuple(f for f, s in ranked[1:] if top_score - s < AMBIGUOUS_MARGIN)
    if rivals:
        return Guess(None, round(top_score, 1), "ambiguous", unit, (top_field, *rivals))
    return Guess(top_field, round(top_score, 1), "fuzzy", unit)


_CHOICES: dict[int, list[str]] = {}


def _fuzzy_choices(index: Mapping[str, str]) -> list[str]:
    key = id(index)
    if key not in _CHOICES:
        _CHOICES[key] = [a for a in index if len(a) >= MIN_FUZZY_LENGTH]
    return _CHOICES[key]


def header_row_score(cells: Sequence[Any], limit: int = 200) -> int:
    """Count the distinct fields (bins or BOM) a row's cells would map to; used to find the header.

    Only short text cells are looked at, and only the first ``limit`` of them, so a row of
    10 000 cells costs no more than one of 200.

    >>> header_row_score(("Bin #", "Cap.", "Qty", None, 104))
    3
    >>> header_row_score(("Kingsbridge Radio: capacitor drawers, 2026",))
    0
    """
    found: set[str] = set()
    looked = 0
    for cell in cells:
        if not isinstance(cell, str) or not cell.strip() or len(cell) > 60:
            continue
        looked += 1
        if looked > limit:
            break
        guess = _guess(cell, _ALL_FIELDS_INDEX)
        if guess.field is not None:
            found.add(guess.field)
    return len(found)


@dataclass(frozen=True)
class HeaderMap:
    """Which column holds which field, and how each header was read.

    Attributes:
        vocabulary: "bins" or "bom".
        headers: the headers as given.
        field_to_index: field name → 0-based column index into the headers (and row cells).
        unmapped: headers no field was given to, in column order.
        scores: field → score of the header chosen for it (100 for an alias or ``--map``).
        how: field → "alias", "fuzzy" or "--map".
        units: field → capacitance unit its header names ("pF", "nF" or "µF").
        notes: header → why it was left unmapped when that is worth saying (ambiguous, lost to
            another column for the same field, unmapped by ``--map FIELD=``).
        also: field → further columns that carry the same field (a second value or marking
            column); rows are read from the first filled one and the others cross-check it.
        column_units: column index → capacitance unit its header names, for every column.
    """

    vocabulary: str
    headers: tuple[str, ...]
    field_to_index: dict[str, int]
    unmapped: tuple[str, ...]
    scores: dict[str, float] = field(default_factory=dict)
    how: dict[str, str] = field(default_factory=dict)
    units: dict[str, str] = field(default_factory=dict)
    notes: dict[str, str] = field(default_factory=dict)
    also: dict[str, tuple[int, ...]] = field(default_factory=dict)
    column_units: dict[int, str] = field(default_factory=dict)
    label_is_value: bool = False       # the label column is read for the value when nothing else is

    def reading_order(self) -> tuple[tuple[str, int], ...]:
        """The columns a row's value is read from, in order: marking columns, then value columns.

        >>> map_headers(["Cap.", "Value (pF)", "Qty"]).reading_order()
        (('value', 0), ('value', 1))
        """
        out = []
        for name in READING_ORDER:
            if name in self.field_to_index:
                out.append((name, self.field_to_index[name]))
                out.extend((name, i) for i in self.also.get(name, ()))
        if self.label_is_value and "label" in self.field_to_index:
            out.append(("label", self.field_to_index["label"]))
        return tuple(out)

    def header_of(self, field_name: str) -> str | None:
        """The header mapped to a field, or None when no column carries it."""
        index = self.field_to_index.get(field_name)
        return None if index is None else self.headers[index]

    def value(self, cells: Sequence[Any], field_name: str) -> Any:
        """The cell of a row that holds ``field_name`` (None when unmapped or blank)."""
        index = self.field_to_index.get(field_name)
        return None if index is None or index >= len(cells) else cells[index]

    def describe(self) -> list[str]:
        """One line per header in column order, e.g. ``"'Cap.' → value (fuzzy 88)"``, then the
        order the value columns are read in when there is more than one."""
        by_index = {i: f for f, i in self.field_to_index.items()}
        order = self.reading_order()
        rank = {i: n for n, (_, i) in enumerate(order, start=1)}
        for name, columns in self.also.items():
            by_index.update({i: name for i in columns})
        lines = []
        for i, header in enumerate(self.headers):
            name = by_index.get(i)
            if name is None:
                why = self.notes.get(header)
                lines.append(f"{header!r} → not used" + (f" ({why})" if why else ""))
                continue
            how = self.how.get(f"{name}@{i}") or self.how.get(name, "alias")
            if self.field_to_index.get(name) != i:
                how = self.how.get(f"{name}@{i}", "alias")
            score = self.scores.get(f"{name}@{i}", self.scores.get(name, 0))
            detail = f"fuzzy {score:.0f}" if how == "fuzzy" else how
            if i in self.column_units:
                detail += f", unit {self.column_units[i]}"
            if len(order) > 1 and i in rank:
                detail += f", read {_ORDINALS.get(rank[i], str(rank[i]) + 'th')}"
            elif name == "label" and self.label_is_value:
                detail += ", read for the value"
            lines.append(f"{header!r} → {name} ({detail})")
        if len(order) > 1:
            names = " then ".join(repr(self.headers[i]) for _, i in order)
            lines.append(f"each row's value is read from {names}, the first one filled;"
                         " a second filled one is cross-checked")
        return lines


# Fields that carry a part's reading, in the order a row's columns are tried.
READING_ORDER = ("marking", "value")
_ORDINALS = {1: "1st", 2: "2nd", 3: "3rd"}


def map_headers(headers: Iterable[str], vocabulary: Vocabulary = "bins",
                overrides: Mapping[str, str] | None = None) -> HeaderMap:
    """Map headers onto the fields of a vocabulary ("bins" for shop sheets, "bom" for BOMs).

    Args:
        headers: the sheet's headers, in column order.
        vocabulary: "bins" or "bom".
        overrides: field → header, from ``--map FIELD=HEADER``; they win over any guess. An empty
            header (``--map notes=``) leaves that field unmapped. Headers are matched exactly,
            then ignoring case and punctuation.

    Returns:
        The HeaderMap. Each field gets at most one column: when two headers name the same field
        the better score wins (the leftmost on a tie) and the other is noted.

    Raises:
        BadValue: an override names a field not in the vocabulary, or a header not in the sheet,
            or the same header for two fields.

    >>> hm = map_headers(["Refs", "Qty", "Value", "Use", "Footprint", "Supplier"], "bom")
    >>> sorted(hm.field_to_index.items())
    [('application', 3), ('package', 4), ('qty', 1), ('refs', 0), ('value', 2)]
    >>> hm.unmapped
    ('Supplier',)
    """
    headers = tuple(str(h) for h in headers)
    index = _index_for(vocabulary)
    fields = VOCABULARIES[vocabulary]
    field_to_index: dict[str, int] = {}
    scores: dict[str, float] = {}
    how: dict[str, str] = {}
    units: dict[str, str] = {}
    notes: dict[str, str] = {}
    taken: set[int] = set()
    blocked: set[str] = set()
    also: dict[str, list[int]] = {}

    for field_name, header in (overrides or {}).items():
        if field_name not in fields:
            raise BadValue("--map", f"{field_name}={header}",
                           f"FIELD=HEADER with FIELD one of {', '.join(fields)}")
        if header is None or not str(header).strip():
            blocked.add(field_name)
            how[field_name] = "blocked"      # no column, by --map FIELD= (content mapping too)
            continue
        i = _find_header(headers, str(header), field_name)
        if i in taken:
            raise BadValue("--map", f"{field_name}={header}",
                           "a header not already given to another field by --map")
        field_to_index[field_name], scores[field_name], how[field_name] = i, 100.0, "--map"
        unit = split_unit(headers[i])[1]
        if unit:
            units[field_name] = unit
        taken.add(i)

    guesses: list[tuple[int, Guess]] = []
    for i, header in enumerate(headers):
        if i in taken:
            continue
        guess = _guess(header, index)
        if guess.how == "ambiguous":
            notes[header] = "could be " + " or ".join(guess.rivals) + "; use --map FIELD=HEADER"
        guesses.append((i, guess))
    # Better scores claim their field first; equal scores go left to right.
    for i, guess in sorted(guesses, key=lambda ig: (-ig[1].score, ig[0])):
        name = guess.field
        if name is None:
            continue
        if name in blocked:
            notes[headers[i]] = f"looks like {name}, but --map {name}= left it unmapped"
            continue
        if name in field_to_index:
            if vocabulary == "bins" and name in READING_ORDER:
                also.setdefault(name, []).append(i)     # every value-like column is read
                scores[f"{name}@{i}"], how[f"{name}@{i}"] = guess.score, guess.how
                taken.add(i)
                continue
            notes[headers[i]] = f"also looks like {name}; {headers[field_to_index[name]]!r} was used"
            continue
        field_to_index[name], scores[name], how[name] = i, guess.score, guess.how
        if guess.unit:
            units[name] = guess.unit
        taken.add(i)

    unmapped = tuple(h for i, h in enumerate(headers) if i not in taken)
    ordered = dict(sorted(field_to_index.items(), key=lambda kv: kv[1]))
    column_units = {i: u for i, h in enumerate(headers) if (u := split_unit(h)[1])}
    return HeaderMap(vocabulary, headers, ordered, unmapped, scores, how, units, notes,
                     {k: tuple(sorted(v)) for k, v in also.items()}, column_units)


def _find_header(headers: tuple[str, ...], wanted: str, field_name: str) -> int:
    if wanted in headers:
        return headers.index(wanted)
    loose = [i for i, h in enumerate(headers) if normalise(h) == normalise(wanted)]
    if len(loose) == 1:
        return loose[0]
    shown = ", ".join(repr(h) for h in headers[:20]) + (" ..." if len(headers) > 20 else "")
    if loose:
        raise BadValue("--map", f"{field_name}={wanted}",
                       f"one exact header; several match loosely: {', '.join(repr(headers[i]) for i in loose)}")
    raise BadValue("--map", f"{field_name}={wanted}", f"a header of this sheet: {shown}")
