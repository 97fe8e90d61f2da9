"""Package facts from package, footprint or description text: chip size, mounting, body, pitch.

One decoder for every place a package is written: a bin sheet's package or mounting column, a
distributor-style description (``CAP CER 0.1UF 50V X7R 0603``) and a BOM's CAD footprint name
(``C_0805_2012Metric``, ``CP_Radial_D5.0mm_P2.00mm``, ``C_Disc_D5.0mm_W2.5mm_P5.00mm``).
:func:`read_package` never raises; it keeps the raw text and the words it did not use.

Chip sizes are the EIA names, kept as the imperial code (length and width in hundredths of an
inch: ``0805`` is 0.08 × 0.05 in); the metric name (tenths of a millimetre: ``2012``) is
recognised and turned into the imperial code, so a footprint naming both (``C_0805_2012Metric``)
is one size. Two codes are both an imperial and a metric name (``0603`` and ``0402``): a bare
four-digit size is read as imperial, as the trade mostly writes it (common practice, no
published source), and ``0603M``, ``0603 metric`` or ``0603Metric`` mark the metric name.

Mounting is ``SMD`` or ``THT``; the lead form says how a through-hole part's leads leave it
(``radial``: disc, box, dipped and radial cans all have both leads at one end; ``axial``;
``snap-in``; ``screw-terminal``) and an SMD part is a ``chip`` or a ``can``. Body sizes and lead
pitch come from the dimensions a name gives (``D6.3mm``, ``L7.2mm``, ``W2.5mm``, ``P5.00mm``,
``5x11``, ``pitch 5mm``, ``RM5``). CAD polarised-capacitor names (a name starting ``CP``, or
``Elec``, ``Tantalum``, ``Pol`` in it) set :attr:`PackageFacts.polarised_hint`. The footprint
naming conventions are common practice in CAD libraries, no published source.

>>> p = read_package("C_0805_2012Metric")
>>> p.chip_size, p.mounting, p.unparsed
('0805', 'SMD', ())
>>> p = read_package("CP_Radial_D5.0mm_P2.00mm")
>>> p.mounting, p.lead_form, p.body.diameter_mm, p.pitch_mm, p.polarised_hint
('THT', 'radial', Decimal('5.0'), Decimal('2.00'), True)
>>> fits(read_package("0805"), read_package("C_0603_1608Metric"))
(False, '0805 part for 0603 pads')
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from decimal import Decimal
from functools import lru_cache
from typing import Any

# EIA chip sizes: imperial code -> metric name (from memory of the EIA / IEC 60115-8 chip size
# designations; each pair is checked in the tests against inch = 25.4 mm).
CHIP_SIZES: dict[str, str] = {
    "01005": "0402",  # 0.4 × 0.2 mm
    "0201": "0603",   # 0.6 × 0.3 mm
    "0402": "1005",   # 1.0 × 0.5 mm
    "0603": "1608",   # 1.6 × 0.8 mm
    "0805": "2012",   # 2.0 × 1.25 mm
    "1206": "3216",   # 3.2 × 1.6 mm
    "1210": "3225",   # 3.2 × 2.5 mm
    "1806": "4516",   # 4.5 × 1.6 mm
    "1808": "4520",   # 4.5 × 2.0 mm
    "1812": "4532",   # 4.5 × 3.2 mm
    "1825": "4564",   # 4.5 × 6.4 mm
    "2010": "5025",   # 5.0 × 2.5 mm
    "2220": "5750",   # 5.7 × 5.0 mm
    "2225": "5664",   # 5.6 × 6.4 mm
    "2512": "6332",   # 6.3 × 3.2 mm
    # moulded tantalum bodies, named by their metric size (from memory of EIA-535 case codes)
    "1411": "3528",   # 3.5 × 2.8 mm
    "2312": "6032",   # 6.0 × 3.2 mm
    "2917": "7343",   # 7.3 × 4.3 mm
}
TANTALUM_ONLY = frozenset({"1411", "2312", "2917"})
METRIC_TO_IMPERIAL: dict[str, str] = {metric: imperial for imperial, metric in CHIP_SIZES.items()}
# Moulded tantalum case letters -> metric body (from memory of EIA-535; makers add their own).
TANTALUM_CASES: dict[str, str] = {
    "a": "3216",  # EIA 3216-18
    "b": "3528",  # EIA 3528-21
    "c": "6032",  # EIA 6032-28
    "d": "7343",  # EIA 7343-31
}

# Words and what they say (common practice in CAD libraries and distributor text).
SMD_WORDS = frozenset({"smd", "smt", "chip", "surface-mount", "smdcap"})
THT_WORDS = frozenset({"tht", "th", "pth", "through-hole", "leaded", "thru-hole"})
LEAD_FORMS: dict[str, str] = {
    "radial": "radial", "disc": "radial", "disk": "radial", "rect": "radial", "box": "radial",
    "dipped": "radial", "axial": "axial", "snap-in": "snap-in", "screw-terminal": "screw-terminal",
}
BODY_STYLES: dict[str, str] = {"disc": "disc", "disk": "disc", "rect": "box", "box": "box",
                               "dipped": "dipped"}
POLARISED_WORDS = frozenset({"cp", "cpol", "elec", "electrolytic", "tantalum", "tantal", "tant",
                             "pol", "polarized", "polarised", "polar"})
# Words that say the part has no polarity (a bipolar electrolytic is still "electrolytic").
UNPOLARISED_WORDS = frozenset({"bipolar", "non-polar", "nonpolar", "np", "bp", "unpolarised",
                               "unpolarized", "non-polarised", "non-polarized"})
# Words understood that state no fact of their own (kind of part, solder process, orientation).
UNDERSTOOD_WORDS = frozenset({"c", "cap", "capacitor", "capacitors", "metric", "handsolder",
                              "reflow", "wave", "horizontal", "vertical", "package", "footprint",
                              "pkg", "case", "eia", "mm", "lead", "leads", "pitch", "mount",
                              "mounting", "type"})
PITCH_MATCH_MM = Decimal("0.1")   # 2.5 mm and 2.54 mm (0.1 in) are the same holes for two leads
BODY_SLACK_MM = Decimal("0.05")

# Phrases joined into one word before splitting.
_PHRASES = (
    (re.compile(r"through[\s-]*holes?|thru[\s-]*holes?", re.I), " through-hole "),
    (re.compile(r"surface[\s-]*mount(?:ed)?", re.I), " surface-mount "),
    (re.compile(r"snap[\s-]*in", re.I), " snap-in "),
    (re.compile(r"non[\s-]+polar(?:i[sz]ed)?", re.I), " non-polar "),
    (re.compile(r"screw[\s-]*terminals?|screw[\s-]*type", re.I), " screw-terminal "),
    (re.compile(r"case[\s-]+([a-e])\b", re.I), r" case-\1 "),
    (re.compile(r"\b(\d{4,5})\s+metric\b", re.I), r" \1M "),
    (re.compile(r"(?:[Øø]|\bdia\.?)\s*(?=\d)", re.I), " D"),
)
_PITCH = re.compile(r"(?:\bpitch|\bLS|\bRM|\bP\s*=)\s*(\d+(?:[.,]\d+)?)\s*(?:mm)?\b"
                    r"|\b(\d+(?:[.,]\d+)?)\s*mm\s+(?:pitch|lead\s+spacing)\b", re.I)
_SPLIT = re.compile(r"[\s_:,;/()\[\]]+")
_DIMENSION = re.compile(r"^([dlwhp])(\d+(?:\.\d+)?)(?:mm)?$")
_BOX = re.compile(r"^(\d+(?:\.\d+)?)(?:mm)?[x×*](\d+(?:\.\d+)?)(?:(?:mm)?[x×*](\d+(?:\.\d+)?))?(?:mm)?$")
_PAD = re.compile(r"^pad\d+(?:\.\d+)?(?:x\d+(?:\.\d+)?)?(?:mm)?$")
_CHIP = re.compile(r"^(\d{4,5})(m|metric)?$")
_EIA = re.compile(r"^eia-?(\d{4})(?:-\d+)?$")


@dataclass(frozen=True)
class Body:
    """A body's sizes in mm where the text gives them (diameter of a can or disc; a box's sides)."""

    diameter_mm: Decimal | None = None
    length_mm: Decimal | None = None
    width_mm: Decimal | None = None
    height_mm: Decimal | None = None

    def text(self) -> str:
        """``D5 × L11 mm``, ``L7.2 × W2.5 mm``.

        >>> Body(diameter_mm=Decimal("6.3"), length_mm=Decimal(11)).text()
        'D6.3 × L11 mm'
        """
        parts = [f"{letter}{_num(v)}" for letter, v in (("D", self.diameter_mm), ("L", self.length_mm),
                                                         ("W", self.width_mm), ("H", self.height_mm))
                 if v is not None]
        return " × ".join(parts) + " mm" if parts else ""


@dataclass(frozen=True)
class PackageFacts:
    """What a package, footprint or description says about a part's body and how it mounts.

    Attributes:
        raw: the text read.
        chip_size: the EIA chip size as its imperial code (``0805``), or None.
        mounting: ``SMD`` or ``THT``, or None.
        lead_form: ``chip``/``can`` (SMD); ``radial``/``axial``/``snap-in``/``screw-terminal`` (THT).
        style: a body style named (``disc``, ``box``, ``dipped``), or None.
        body: the body sizes given, or None.
        pitch_mm: the lead pitch (through-hole), or None.
        polarised_hint: the name is a polarised-capacitor footprint or says polarised.
        cad_name: the text is a CAD capacitor footprint name (``C_…``, ``CP_…``), whose library
            names polarised footprints as such: one without the hint has no polarity mark.
        notes: how a reading was chosen.
        conflicts: disagreements inside the text (two sizes, SMD and through-hole ...); the
            facts in dispute are left unset.
        unparsed: the words not used, as written.
    """

    raw: str
    chip_size: str | None = None
    mounting: str | None = None
    lead_form: str | None = None
    style: str | None = None
    body: Body | None = None
    pitch_mm: Decimal | None = None
    polarised_hint: bool = False
    notes: tuple[str, ...] = ()
    unparsed: tuple[str, ...] = field(default=())
    conflicts: tuple[str, ...] = ()
    cad_name: bool = False

    @property
    def known(self) -> bool:
        """Whether the text says anything about size or mounting."""
        return any(v is not None for v in (self.chip_size, self.mounting, self.lead_form,
                                           self.body, self.pitch_mm))

    def describe(self) -> str:
        """The facts in a few words: ``0805``, ``through-hole radial, D5 mm, 2 mm pitch``.

        >>> read_package("CP_Radial_D5.0mm_P2.00mm").describe()
        'through-hole radial, D5 mm, 2 mm pitch'
        >>> read_package("").describe()
        'package not recorded'
        """
        if self.chip_size:
            if self.chip_size in TANTALUM_ONLY:     # moulded bodies are known by the metric name
                return f"{CHIP_SIZES[self.chip_size]} metric"
            return self.chip_size
        head, extra = self._words()
        text = ", ".join(x for x in (head, *extra) if x)
        return text or "package not recorded"

    def _words(self) -> tuple[str, list[str]]:
        words = {"SMD": "SMD", "THT": "through-hole"}.get(self.mounting or "", "")
        form = self.lead_form if self.lead_form not in (None, "chip") else ""
        extra = []
        if self.body is not None and self.body.text():
            extra.append(self.body.text())
        if self.pitch_mm is not None:
            extra.append(f"{_num(self.pitch_mm)} mm pitch")
        return " ".join(w for w in (words, form) if w), extra

    def describe_pads(self) -> str:
        """The footprint as the place a part goes: ``0603 pads``, ``a through-hole radial footprint (D5 mm)``.

        >>> read_package("CP_Radial_D5.0mm_P2.00mm").describe_pads()
        'a through-hole radial footprint (D5 mm, 2 mm pitch)'
        """
        if self.chip_size:
            return f"{self.describe()} pads"
        if not self.known:
            return "the footprint"
        head, extra = self._words()
        return f"a {head or 'sized'} footprint" + (f" ({', '.join(extra)})" if extra else "")

    def to_json(self) -> dict[str, Any]:
        body = self.body
        return {
            "raw": self.raw, "chip_size": self.chip_size,
            "metric_size": CHIP_SIZES.get(self.chip_size or ""), "mounting": self.mounting,
            "lead_form": self.lead_form, "style": self.style,
            "body": None if body is None else {
                k: None if v is None else float(v) for k, v in
                (("diameter_mm", body.diameter_mm), ("length_mm", body.length_mm),
                 ("width_mm", body.width_mm), ("height_mm", body.height_mm))},
            "pitch_mm": None if self.pitch_mm is None else float(self.pitch_mm),
            "polarised_hint": self.polarised_hint, "notes": list(self.notes),
            "conflicts": list(self.conflicts), "unparsed": list(self.unparsed),
            "cad_name": self.cad_name,
        }


def _num(value: Decimal) -> str:
    text = format(value.normalize(), "f")
    return text


def _decimal(text: str) -> Decimal:
    return Decimal(text.replace(",", "."))


class _Reading:
    """The facts gathered while the words of one text are read."""

    def __init__(self) -> None:
        self.sizes: list[tuple[str, str]] = []      # (imperial code, how it was written)
        self.mounting: set[str] = set()
        self.lead_forms: list[str] = []
        self.style: str | None = None
        self.dims: dict[str, Decimal] = {}
        self.pairs: list[tuple[Decimal, ...]] = []
        self.pitch: Decimal | None = None
        self.polarised = False
        self.notes: list[str] = []
        self.unparsed: list[str] = []
        self.elec = False
        self.unpolarised = False


def _read_size(word: str, token: str, r: _Reading) -> bool:
    m = _CHIP.match(word)
    if m:
        code, metric = m.group(1), m.group(2)
        if metric:
            if code in METRIC_TO_IMPERIAL:
                r.sizes.append((METRIC_TO_IMPERIAL[code], token))
                return True
            return False
        if code in CHIP_SIZES:
            r.sizes.append((code, token))
            if code in METRIC_TO_IMPERIAL:
                r.notes.append(f"{code} read as the imperial size (a bare size is imperial, common"
                               f" practice); the metric {code} would be {METRIC_TO_IMPERIAL[code]}")
            return True
        if code in METRIC_TO_IMPERIAL:
            r.sizes.append((METRIC_TO_IMPERIAL[code], token))
            return True
        return False
    m = _EIA.match(word)
    if m and m.group(1) in METRIC_TO_IMPERIAL:
        r.sizes.append((METRIC_TO_IMPERIAL[m.group(1)], token))
        return True
    if word.startswith("case-") and word[5:] in TANTALUM_CASES:
        r.sizes.append((METRIC_TO_IMPERIAL[TANTALUM_CASES[word[5:]]], token))
        r.polarised = True      # lettered moulded cases are tantalum bodies
        return True
    return False


def _read_word(token: str, r: _Reading) -> None:
    word = token.casefold()
    if not word:
        return
    if word in SMD_WORDS:
        r.mounting.add("SMD")
    elif word in THT_WORDS:
        r.mounting.add("THT")
    elif word in LEAD_FORMS:
        r.lead_forms.append(LEAD_FORMS[word])
        r.style = BODY_STYLES.get(word, r.style)
    elif word in UNPOLARISED_WORDS:
        r.unpolarised = True
    elif word in POLARISED_WORDS:
        r.polarised = True
        r.elec = r.elec or word == "elec"
    elif word in UNDERSTOOD_WORDS or _PAD.match(word):
        pass
    elif _read_size(word, token, r):
        pass
    elif m := _DIMENSION.match(word):
        letter, value = m.group(1), Decimal(m.group(2))
        if letter == "p":
            r.pitch = value
        else:
            r.dims[letter] = value
    elif m := _BOX.match(word):
        r.pairs.append(tuple(Decimal(g) for g in m.groups() if g is not None))
    else:
        r.unparsed.append(token)


def _body(r: _Reading, lead_form: str | None) -> Body | None:
    dims = dict(r.dims)
    for pair in r.pairs:
        # "5x11" on a can is diameter × length; "7.2x2.5(x5)" on a box is its sides.
        if lead_form in ("radial", "can", "snap-in", "screw-terminal", "axial") and r.style != "box" \
                and len(pair) == 2:
            dims.setdefault("d", pair[0])
            dims.setdefault("l", pair[1])
        else:
            for letter, value in zip("lwh", pair):
                dims.setdefault(letter, value)
    if not dims:
        return None
    return Body(diameter_mm=dims.get("d"), length_mm=dims.get("l"), width_mm=dims.get("w"),
                height_mm=dims.get("h"))


def _resolve(raw: str, r: _Reading, cad_name: bool) -> PackageFacts:
    notes = list(dict.fromkeys(r.notes))
    conflicts: list[str] = []
    chip = None
    codes = list(dict.fromkeys(code for code, _ in r.sizes))
    if len(codes) == 1:
        chip = codes[0]
        if len(r.sizes) > 1:    # "0603" then "1608Metric": the bare reading is confirmed
            notes = [n for n in notes if not n.startswith(f"{chip} read as")]
    elif codes:
        written = " and ".join(dict.fromkeys(t for _, t in r.sizes))
        conflicts.append(f"names {written}, which are different sizes ({', '.join(codes)}); size not used")
    lead_forms = list(dict.fromkeys(r.lead_forms))
    lead_form = lead_forms[0] if len(lead_forms) == 1 else None
    if len(lead_forms) > 1:
        conflicts.append(f"names {' and '.join(lead_forms)} leads; lead form not used")
    mounting = None
    if len(r.mounting) == 1:
        mounting = next(iter(r.mounting))
    elif r.mounting:
        conflicts.append("says both SMD and through-hole; mounting not used")
    implied = "THT" if lead_form in ("radial", "axial", "snap-in", "screw-terminal") else None
    if r.sizes:
        implied = implied or "SMD"     # even when the sizes disagree, a chip size is an SMD body
    if chip is not None:
        if implied == "THT":
            conflicts.append(f"names chip size {chip} and {lead_form} leads; mounting not used")
            implied, chip = None, None
    if lead_form is None and chip is not None:
        lead_form = "chip"
    # CAD libraries name SMD aluminium cans "CP_Elec_<D>x<H>" (common practice, no published source).
    if cad_name and r.elec and lead_form is None and implied is None and "THT" not in r.mounting:
        lead_form, implied = "can", "SMD"
    if mounting is None and not r.mounting:
        mounting = implied
    elif implied is not None and mounting is not None and implied != mounting:
        conflicts.append(f"says {mounting} but names {lead_form or chip}; mounting not used")
        mounting = None
    return PackageFacts(raw=raw, chip_size=chip, mounting=mounting, lead_form=lead_form,
                        style=r.style, body=_body(r, lead_form), pitch_mm=r.pitch,
                        polarised_hint=r.polarised and not r.unpolarised, notes=tuple(notes),
                        unparsed=tuple(r.unparsed),
                        conflicts=tuple(conflicts), cad_name=cad_name)


@lru_cache(maxsize=4096)
def read_package(text: str | None) -> PackageFacts:
    """The package facts a package, footprint or description text states; never raises.

    >>> p = read_package("CAP ALUM 100UF 20% 25V RADIAL 6.3x11")
    >>> p.mounting, p.lead_form, p.body.text(), p.unparsed
    ('THT', 'radial', 'D6.3 × L11 mm', ('ALUM', '100UF', '20%', '25V'))
    >>> read_package("0603M").chip_size, read_package("1608").chip_size
    ('0201', '0603')
    >>> read_package("C_Disc_D5.0mm_W2.5mm_P5.00mm").describe()
    'through-hole radial, D5 × W2.5 mm, 5 mm pitch'
    >>> read_package("CP_Elec_5x5.4").describe(), read_package("C_0805_1608Metric").chip_size
    ('SMD can, D5 × L5.4 mm', None)
    """
    raw = "" if text is None else str(text)
    try:
        r = _Reading()
        work = raw
        for pattern, replacement in _PHRASES:
            work = pattern.sub(replacement, work)
        pitch = _PITCH.search(work)
        if pitch:
            r.pitch = _decimal(pitch.group(1) or pitch.group(2))
            work = work[:pitch.start()] + " " + work[pitch.end():]
        words = [w for w in _SPLIT.split(work) if w]
        for token in words:
            _read_word(token.strip(".-"), r)
        name = _SPLIT.split(raw.rpartition(":")[2].strip())   # after a CAD library's name
        first = name[0].casefold() if name else ""
        cad_name = "_" in raw and first in ("c", "cp", "cpol")
        if cad_name and first in ("cp", "cpol"):
            r.polarised = True
        return _resolve(raw, r, cad_name)
    except Exception as exc:   # noqa: BLE001 - a decoder never raises; the text is kept whole
        return PackageFacts(raw=raw, conflicts=(f"could not be read ({type(exc).__name__})",),
                            unparsed=(raw,) if raw else ())


def fits(part: PackageFacts, pads: PackageFacts) -> tuple[bool | None, str]:
    """Whether a part (a bin's package) fits a footprint (a BOM line's): True, False or None.

    None means the part's package is not recorded well enough to tell; the reason then says what
    to check. A line whose footprint says nothing takes any part. Smaller bodies fit a larger
    outline; pitches must agree within 0.1 mm (2.5 and 2.54 mm are the same holes); an axial body
    must be shorter than the hole spacing (common practice, no published source).

    >>> fits(read_package("radial 5x11"), read_package("C_0805_2012Metric"))
    (False, 'through-hole radial part for 0805 pads')
    >>> fits(read_package("SMD 0805"), read_package("C_0805_2012Metric"))
    (True, '')
    >>> fits(read_package(""), read_package("C_0603_1608Metric"))
    (None, 'package not recorded; check it fits 0603 pads')
    >>> fits(read_package("radial D6.3mm"), read_package("CP_Radial_D5.0mm_P2.00mm"))[1]
    'D6.3 mm body for a D5 mm outline'
    """
    if not pads.known:
        return True, ""
    where = pads.describe_pads()
    if not part.known:
        return None, f"package not recorded; check it fits {where}"
    if pads.mounting and part.mounting and pads.mounting != part.mounting:
        return False, f"{_part_words(part)} part for {where}"
    if pads.chip_size:
        if part.chip_size is None:
            return None, f"{part.describe()}, size not recorded; check it fits {where}"
        if part.chip_size != pads.chip_size:
            return False, f"{part.describe()} part for {where}"
        return True, ""
    if pads.lead_form and part.lead_form and pads.lead_form != part.lead_form:
        return False, f"{_part_words(part)} part for {where}"
    if pads.mounting and part.mounting is None:
        return None, f"{part.describe()}, mounting not recorded; check it fits {where}"
    refused = _outline(part, pads)
    if refused:
        return False, refused
    return _pitch(part, pads, where)


def _part_words(part: PackageFacts) -> str:
    if part.mounting == "SMD":
        return f"SMD {part.chip_size}" if part.chip_size else (
            "SMD can" if part.lead_form == "can" else "SMD")
    form = part.lead_form if part.lead_form not in (None, "chip") else ""
    return " ".join(w for w in ("through-hole" if part.mounting == "THT" else "", form) if w) or \
        part.describe()


def _outline(part: PackageFacts, pads: PackageFacts) -> str | None:
    have, room = part.body, pads.body
    if have is None or room is None:
        return None
    for letter, a, b in (("D", have.diameter_mm, room.diameter_mm), ("L", have.length_mm, room.length_mm),
                         ("W", have.width_mm, room.width_mm)):
        if letter == "L" and pads.lead_form in ("radial", "can", "snap-in", "screw-terminal"):
            continue    # a can's length stands off the board; only its diameter takes board room
        if a is not None and b is not None and a > b + BODY_SLACK_MM:
            return f"{letter}{_num(a)} mm body for a {letter}{_num(b)} mm outline"
    return None


def _pitch(part: PackageFacts, pads: PackageFacts, where: str) -> tuple[bool | None, str]:
    if pads.pitch_mm is None:
        return True, ""
    if pads.lead_form == "axial":
        length = part.body.length_mm if part.body is not None else None
        if length is not None and length >= pads.pitch_mm:
            return False, (f"L{_num(length)} mm axial body for holes {_num(pads.pitch_mm)} mm apart")
        return True, ""     # axial leads are bent to the hole spacing
    if part.pitch_mm is None:
        return None, f"lead pitch not recorded; check it fits {where}"
    if abs(part.pitch_mm - pads.pitch_mm) > PITCH_MATCH_MM:
        return False, f"{_num(part.pitch_mm)} mm pitch part for {where}"
    return True, ""


__all__ = ["BODY_STYLES", "Body", "CHIP_SIZES", "LEAD_FORMS", "METRIC_TO_IMPERIAL", "PackageFacts",
           "TANTALUM_CASES", "fits", "read_package"]
