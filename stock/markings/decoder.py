"""Decode the free text printed on a capacitor or typed on a bin label into a :class:`Marking`.

The text is split into tokens; each token is tried against the code tables (value codes, tolerance
letters, voltage codes, ceramic codes, family names, safety classes, rated temperature, polarity).
A token with more than one reading keeps the others as alternatives, and every doubt becomes a
flag. Nothing raises: text longer than :data:`MAX_MARKING_CHARS`, control characters and foreign
characters give an ``unreadable`` flag; tokens nobody understands are kept verbatim in
``unparsed``.

Flag kinds raised here: ``unreadable``, ``unparsed``, ``unit-assumed``, ``ambiguous-code``,
``tolerance-by-value``, ``disputed-code``, ``spelling-corrected``, ``conflicting-readings``,
``polarity-assumed``, ``voltage-kind-assumed``. How a decoded part is told to people is
:mod:`stock.markings.description`; the cautions it calls for, :mod:`stock.markings.cautions`.

>>> m = decode("104K 2A X7R")
>>> m.capacitance_pf, m.tolerance.plus, m.voltage_v, m.voltage_kind, m.dielectric.code
(Decimal('100000'), Decimal('10'), Decimal('100'), 'DC', 'X7R')
>>> decode("X2 0.1uF 275VAC").safety_class, decode("10uF 16V tantalum +").polarity
('X2', 'positive-marked')

Distributor descriptions are read word by word; the package words go to the package decoder:

>>> from stock.markings.description import summary
>>> summary(decode("CAP ALUM 100UF 20% 25V RADIAL"))
'100 µF ±20 %  25 V DC  aluminium-electrolytic (−40…+105 °C, +10/−20 %)  negative-marked  through-hole radial'

Text made only of colours goes to the colour decoder (:mod:`stock.colour_codes`):

>>> format_capacitance(decode("yellow violet brown").capacitance_pf)
'470 pF'
"""

from __future__ import annotations

import re
import unicodedata
from dataclasses import replace
from decimal import Decimal
from functools import lru_cache

from stock.markings.ceramic_codes import read_dielectric
from stock.markings.colour_codes import looks_like_colours
from stock.markings.colours import decode_colours
from stock.decoded import Flag, Marking
from stock.markings.facts import (Facts, settle_dielectric, settle_package, settle_temperature,
                                  settle_tolerance, settle_value, settle_voltage)
from stock.markings.families import PHRASE_WORDS, read_family, read_misspelt_family
from stock.markings.packages import CHIP_SIZES
from stock.markings.safety_classes import read_safety_class
from stock.markings.tolerance_codes import read_explicit_tolerance, read_tolerance_letter
from stock.units import format_capacitance, format_tolerance  # noqa: F401  (the examples print values with them)
from stock.markings.value_codes import read_value
from stock.markings.voltage_codes import read_voltage, voltage_code_value

# Longest text decoded. Real markings are under 40 characters; a cell holding more is a note or
# a paste accident, and refusing it keeps decoding fast on hostile sheets.
MAX_MARKING_CHARS = 200

# The family's usual polarity mark when the text shows none (common practice, no published source).
USUAL_POLARITY = {
    "aluminium-electrolytic": ("negative-marked", "aluminium electrolytics usually mark the negative lead"),
    "tantalum": ("positive-marked", "tantalums usually mark the positive lead"),
    "tantalum-polymer": ("positive-marked", "polymer tantalums usually mark the positive lead"),
}
POLARISED_FAMILIES = frozenset({"aluminium-electrolytic", "tantalum", "tantalum-polymer", "double-layer"})

_ALLOWED_EXTRA = frozenset("±°…")
_DECIMAL_COMMA = re.compile(r"(?<=\d),(?=\d)")
_SPACED_PLUS_MINUS = re.compile(r"±\s+")
_SPACED_PERCENT = re.compile(r"(?<=\d)\s+(?=%)")
_ASYMMETRIC = re.compile(r"\+\s*(\d+(?:\.\d+)?)\s*/?\s*-\s*(\d+(?:\.\d+)?)\s*%"
                         r"|-\s*(\d+(?:\.\d+)?)\s*/?\s*\+\s*(\d+(?:\.\d+)?)\s*%")
_PPM_PER = re.compile(r"\s*ppm\s*/\s*[°º]?\s*[ck]\b", re.IGNORECASE)
_SIGNED = re.compile(r"[+-]?\d+(?:±\d+)?")
_DEGREES = re.compile(r"\s*[°º]\s*C\b", re.IGNORECASE)
_DUAL_SAFETY = re.compile(r"\b([XY][1-4])\s*[/+&]?\s*([XY][1-4])\b", re.IGNORECASE)
_SPLIT = re.compile(r"[\s,;|()\[\]{}/<>]+")
_NUMBER = re.compile(r"\d+(?:\.\d*)?|\.\d+")
_TEMPERATURE = re.compile(r"\+?(\d{2,3})(°)?C")
_CATEGORY = re.compile(r"(-\d{2,3})\s*(?:/|\.\.\.?|…|~|to)\s*\+?(\d{2,3})\s*(?:°\s*)?C\b", re.IGNORECASE)
_UNIT_WORDS = frozenset({"pf", "nf", "uf", "mf", "mfd", "mmfd", "mmf", "uuf", "ufd", "p", "n", "u",
                         "v", "vdc", "vac", "kv", "kvdc", "kvac", "wv", "wvdc", "v~", "vrms", "%",
                         "°c", "c"})
_KIND_WORDS = frozenset({"ac", "dc", "~"})
_POLARITY_TOKENS = {"+": "positive-marked", "(+)": "positive-marked", "+ve": "positive-marked",
                    "-": "negative-marked", "(-)": "negative-marked", "-ve": "negative-marked"}
_COMMON_RATED_TEMPS = frozenset({70, 85, 105, 125, 130, 135, 150, 175, 200})
_STRIP = "'\"*:_=!?#"
# EIA chip sizes printed on reels and typed in sheets: a size, never a value (common practice).
_CASE_SIZES = frozenset(CHIP_SIZES)
# Words that only say the thing is a capacitor (distributor descriptions: "CAP CER 0.1UF ...");
# "film" alone names no film kind, so it states no family. Common practice, no published source.
KIND_WORDS = frozenset({"cap", "caps", "capacitor", "capacitors", "condenser", "film", "films", "fixed"})
# A digit then a lower-case unit prefix ("1n", "1p") is a value as people type it; the EIA
# voltage codes are printed in capitals (EIA-198 code list, from memory).
_LOWER_UNIT_LETTERS = frozenset("pnu")
_O_AFTER_DIGIT = re.compile(r"(?<=[0-9])[Oo]")


def _clean(text: str) -> tuple[str, list[Flag]]:
    """NFKC-normalise, spell µ as u and minus as hyphen, drop control and foreign characters."""
    flags: list[Flag] = []
    if text.isascii() and text.isprintable():
        return text, flags   # the common case: nothing to normalise
    text = unicodedata.normalize("NFKC", text)
    text = text.replace("\u03bc", "u").replace("\u00b5", "u")
    for dash in "\u2212\u2013\u2014\u2010\u2011":
        text = text.replace(dash, "-")
    controls = sorted({c for c in text if unicodedata.category(c)[0] == "C" and c not in "\t\n\r"})
    foreign = sorted({c for c in text if ord(c) > 126 and c not in _ALLOWED_EXTRA
                      and unicodedata.category(c)[0] != "C"})
    if controls:
        names = ", ".join(f"U+{ord(c):04X}" for c in controls[:5])
        flags.append(Flag("unreadable", f"control characters removed ({names})"))
    if foreign:
        shown = "".join(foreign[:10])
        flags.append(Flag("unreadable", f"characters no marking uses were removed: {shown!r}"))
    if controls or foreign:
        bad = set(controls) | set(foreign)
        text = "".join(" " if c in bad else c for c in text)
    return text, flags


def _tokens(text: str) -> list[str]:
    text = _DECIMAL_COMMA.sub(".", text)
    text = _SPACED_PLUS_MINUS.sub("±", text)
    text = _SPACED_PERCENT.sub("", text)
    text = _ASYMMETRIC.sub(lambda m: f"+{m[1]}-{m[2]}%" if m[1] else f"+{m[4]}-{m[3]}%", text)
    text = _PPM_PER.sub("ppm", text)
    text = _DEGREES.sub("°C", text)
    text = _CATEGORY.sub(lambda m: f"+{m[2]}°C", text)   # category range: the rated (upper) temperature
    text = _DUAL_SAFETY.sub(lambda m: m[1] + m[2] if m[1][0].upper() != m[2][0].upper() else m[0], text)
    raw = []
    for token in _SPLIT.split(text):
        token = token.strip(_STRIP).rstrip(".")
        if token.startswith(".") and not token[1:2].isdigit():
            token = token.lstrip(".")
        if token:
            raw.append(token)
    return _merge(raw)


def _merge(raw: list[str]) -> list[str]:
    """Join a number and the unit printed after a space (``.047 MFD``, ``1 kV``, ``85 °C``) and phrases."""
    merged: list[str] = []
    i = 0
    while i < len(raw):
        token = raw[i]
        nxt = raw[i + 1] if i + 1 < len(raw) else None
        if nxt is not None and _NUMBER.fullmatch(token) and nxt.lower() in _UNIT_WORDS:
            token, i = token + nxt, i + 1
            nxt = raw[i + 1] if i + 1 < len(raw) else None
        if nxt is not None and nxt.lower() == "ppm" and _SIGNED.fullmatch(token):
            token, i = token + nxt, i + 1
            nxt = raw[i + 1] if i + 1 < len(raw) else None
        if nxt is not None and nxt.lower() in _KIND_WORDS and read_voltage(token) is not None:
            token, i = token + nxt, i + 1
        if token.lower() in PHRASE_WORDS:
            for j in range(min(len(raw), i + 4), i + 1, -1):
                phrase = " ".join(raw[i:j])
                if all(w.lower() in PHRASE_WORDS for w in raw[i:j]) and read_family(phrase):
                    token, i = phrase, j - 1
                    break
        merged.append(token)
        i += 1
    return merged


def _context_family(tokens: list[str]) -> str | None:
    for token in tokens:
        reading = read_family(token)
        if reading is not None and reading.dielectric.family != "ceramic":
            return reading.dielectric.family
    return None


def _zero_for_letter_o(token: str) -> str | None:
    """``1OOn`` → ``100n``, ``1O4`` → ``104``: a letter O typed after a digit, when the result reads.

    Only when the token is no dielectric code (``NPO`` has its own spelling table) and the
    corrected text is a value or a voltage.
    """
    if not _O_AFTER_DIGIT.search(token) or read_dielectric(token) is not None:
        return None
    fixed = token
    while _O_AFTER_DIGIT.search(fixed):
        fixed = _O_AFTER_DIGIT.sub("0", fixed)
    if read_value(fixed) is None and read_voltage(fixed) is None:
        return None
    return fixed


def _classify(token: str, facts: Facts, family: str | None) -> None:
    fixed = _zero_for_letter_o(token)
    if fixed is not None:
        facts.flags.append(Flag("spelling-corrected", f"{token}: read as {fixed} (letter O for digit zero)"))
        token = fixed
    upper = token.upper()
    safety = read_safety_class(token)
    if safety is not None:
        facts.safety.append(safety.code)
        return
    dielectric = read_dielectric(token)
    if dielectric is not None:
        facts.dielectrics.append((token, dielectric.dielectric, dielectric.alternatives, dielectric.flags))
        return
    fam = read_family(token)
    if fam is not None:
        facts.dielectrics.append((token, fam.dielectric, fam.alternatives, fam.flags))
        return
    voltage = read_voltage(token)
    if voltage is not None:
        facts.voltages.append((token, voltage[0], voltage[1]))
        return
    temperature = _TEMPERATURE.fullmatch(upper)
    if temperature and (temperature[2] or int(temperature[1]) in _COMMON_RATED_TEMPS):
        facts.temperatures.append((token, Decimal(temperature[1]), bool(temperature[2])))
        return
    tolerance = read_explicit_tolerance(token)
    if tolerance is not None:
        facts.tolerance = facts.tolerance or tolerance
        return
    if token.lower() in _POLARITY_TOKENS:
        facts.polarity = facts.polarity or _POLARITY_TOKENS[token.lower()]
        return
    code = voltage_code_value(upper)
    if code is not None:
        value = read_value(token, family=family) if token[-1] in _LOWER_UNIT_LETTERS else None
        if value is not None:
            facts.values.append((token, value))
        else:
            facts.voltage_codes.append((token, code))
        return
    if token in _CASE_SIZES:
        facts.package_words.append(token)
        facts.unparsed.append(token)     # in its place among the words the package decoder reads
        return
    value = read_value(token, family=family)
    if value is not None:
        facts.values.append((token, value))
        return
    if len(token) == 1 and token.isalpha() and read_tolerance_letter(token, None) is not None:
        facts.letters.append(upper)
        return
    if token.lower() in KIND_WORDS:
        return
    misspelt = read_misspelt_family(token)
    if misspelt is not None:
        facts.dielectrics.append((token, misspelt.dielectric, misspelt.alternatives, misspelt.flags))
        return
    facts.unparsed.append(token)


def _decode(text: str) -> Marking:
    if len(text) > MAX_MARKING_CHARS:
        return Marking(text=text[:MAX_MARKING_CHARS], flags=(Flag(
            "unreadable", f"marking is {len(text)} characters long; at most {MAX_MARKING_CHARS} are decoded"),))
    cleaned, flags = _clean(text)
    tokens = _tokens(cleaned)
    if not tokens:
        why = "nothing is left once those are removed" if flags else "the marking is empty"
        return Marking(text=text, flags=tuple(flags) + (Flag("unreadable", why),))
    facts = Facts(flags=list(flags))
    family = _context_family(tokens)
    for token in tokens:
        _classify(token, facts, family)
    pf, letter = settle_value(facts, family)
    tolerance = settle_tolerance(facts, pf, letter)
    safety = "".join(sorted(set(facts.safety))) if facts.safety else None
    if safety is not None and len(facts.safety) > 1:
        safety = read_safety_class(safety).code if read_safety_class(safety) else facts.safety[0]
    volts, kind = settle_voltage(facts, safety)
    dielectric = settle_dielectric(facts)
    rated = settle_temperature(facts)
    polarity = facts.polarity
    fam = dielectric.family if dielectric else None
    if polarity is None and fam in USUAL_POLARITY:
        polarity, why = USUAL_POLARITY[fam]
        facts.flags.append(Flag("polarity-assumed", f"no polarity mark in the text; {why} — check the part"))
    package, mounting = settle_package(facts)
    if facts.unparsed:
        facts.flags.append(Flag("unparsed", "not understood: " + " ".join(facts.unparsed)))
    if all(v is None for v in (pf, tolerance, volts, dielectric, safety, polarity, rated, package)):
        facts.flags.append(Flag("unreadable", "nothing in the marking could be read"))
    return Marking(text=text, capacitance_pf=pf, tolerance=tolerance, voltage_v=volts, voltage_kind=kind,
                   dielectric=dielectric, safety_class=safety, polarity=polarity, rated_temp_c=rated,
                   alternatives=tuple(facts.alternatives), flags=tuple(facts.flags),
                   unparsed=tuple(facts.unparsed), package=package, mounting=mounting)


def merge_colours(bands: Marking, rest: Marking | None, text: str) -> Marking:
    """Colour bands read beside printed or typed facts (a tolerance, a voltage) as one marking.

    The bands give the value; the rest fills in what the bands do not say, and a tolerance
    stated in words wins over the one three bands leave to be assumed.

    >>> m = merge_colours(decode("yellow violet brown"), decode("5%"), "yellow violet brown 5%")
    >>> format_capacitance(m.capacitance_pf), format_tolerance(m.tolerance)
    ('470 pF', '±5 %')
    """
    if rest is None:
        return replace(bands, text=text)
    assumed = "tolerance-assumed" in bands.flag_kinds()
    tolerance = (rest.tolerance or bands.tolerance) if assumed else (bands.tolerance or rest.tolerance)
    flags = tuple(f for f in bands.flags if not (assumed and rest.tolerance and f.kind == "tolerance-assumed"))
    return replace(
        bands, text=text, tolerance=tolerance,
        voltage_v=bands.voltage_v or rest.voltage_v,
        voltage_kind=bands.voltage_kind or rest.voltage_kind,
        dielectric=bands.dielectric or rest.dielectric,
        safety_class=bands.safety_class or rest.safety_class,
        polarity=bands.polarity or rest.polarity,
        rated_temp_c=bands.rated_temp_c or rest.rated_temp_c,
        flags=flags + tuple(x for x in rest.flags if x.kind not in ("unreadable",)),
        unparsed=bands.unparsed + rest.unparsed,
        package=rest.package, mounting=rest.mounting)


_COLOUR_RUN_MIN = 3


def _colour_run(text: str) -> tuple[str, str] | None:
    """(colour words, the rest) when a run of colour words stands among other words."""
    words = text.split()
    if len(words) <= _COLOUR_RUN_MIN:
        return None
    for size in range(len(words) - 1, _COLOUR_RUN_MIN - 1, -1):
        for start in range(0, len(words) - size + 1):
            run = " ".join(words[start:start + size])
            if looks_like_colours(run):
                return run, " ".join(words[:start] + words[start + size:])
    return None


def _decode_mixed(text: str) -> Marking | None:
    """``5% yellow violet brown``: colour bands joined with typed facts, as a sheet's columns are."""
    found = _colour_run(text)
    if found is None:
        return None
    bands = decode_colours(found[0])
    if bands.capacitance_pf is None:
        return None
    return merge_colours(bands, _decode(found[1]), text)


@lru_cache(maxsize=8192)
def _decode_cached(text: str) -> Marking:
    try:
        if looks_like_colours(text):  # every word a colour: the colour code, not the printed codes
            return decode_colours(text)
        marking = _decode(text)
        if marking.capacitance_pf is None and marking.unparsed:
            return _decode_mixed(text) or marking
        return marking
    except Exception as exc:  # noqa: BLE001 - a decoder fault must not stop an import of many rows
        return Marking(text=text[:MAX_MARKING_CHARS],
                       flags=(Flag("unreadable", f"the decoder failed on this text ({type(exc).__name__})"),))


def decode(text: str) -> Marking:
    """Decode one marking. Never raises; doubts are flags, other readings are alternatives.

    Args:
        text: the marking as printed or typed, e.g. ``4n7 J 100V`` or ``2200uF 25V 105C``.

    Returns:
        The decoded :class:`~stock.decoded.Marking`.

    >>> m = decode("4n7 J 100V"); format_capacitance(m.capacitance_pf), format_tolerance(m.tolerance)
    ('4.7 nF', '±5 %')
    >>> sorted(decode("100").flag_kinds())
    ['ambiguous-code']
    >>> decode("\\x00\\x07").flag_kinds() == {"unreadable"}
    True
    """
    if not isinstance(text, str):
        text = "" if text is None else str(text)
    return _decode_cached(text)


__all__ = ["MAX_MARKING_CHARS", "POLARISED_FAMILIES", "USUAL_POLARITY", "decode", "merge_colours"]
