"""Dielectric families named in words or by their trade abbreviations, with typical temperature figures.

Film, mica, glass, paper and electrolytic parts print their dielectric as a word (``polyester``,
``silver mica``, ``tantalum``) or as the DIN-style abbreviation makers use (``MKT`` metallised
polyester, ``MKP`` polypropylene, ``KS`` polystyrene film/foil). Each family carries its typical
tempco or capacitance change over its usual range: figures from the a film maker's comparison table and
(docs/sources.md: dielectric pages ([film-dielectrics-table] and others)), otherwise marked as from memory in
:data:`FAMILY_FIGURES`.

>>> decode_family("MKT").family, decode_family("MKT").tempco_ppm_per_k
('polyester', Decimal('400'))
>>> decode_family("silver mica").family
'mica'
>>> decode_family("tantalum").change_minus_pct
Decimal('10')
"""

from __future__ import annotations

import re
from functools import lru_cache
from dataclasses import dataclass
from decimal import Decimal

from stock.decoded import FAMILIES, Alternative, Dielectric, Flag


@dataclass(frozen=True)
class FamilyFigures:
    """Typical figures of a family: α ± tolerance (ppm/K) and/or a change window over a range.

    ``linear`` says whether the window may be scaled down to a narrower range (a roughly linear
    curve) or holds whole (the cold end of an electrolytic). The one table of these figures: the
    grading physics (:mod:`stock.physics.stability`) reads them from here.
    """

    tempco: Decimal | None
    tempco_tol: Decimal | None
    temp_min_c: Decimal | None
    temp_max_c: Decimal | None
    change_minus_pct: Decimal | None
    change_plus_pct: Decimal | None
    source: str
    linear: bool = True


def _d(text: str | None) -> Decimal | None:
    return None if text is None else Decimal(text)


def _figures(tempco, tol, low, high, minus, plus, source, linear=True) -> FamilyFigures:  # noqa: ANN001
    return FamilyFigures(_d(tempco), _d(tol), _d(low), _d(high), _d(minus), _d(plus), source, linear)


# family -> typical figures: (α, ±α, low °C, high °C, −ΔC %, +ΔC %, source). Sources are entries of
# docs/sources.md: [film-dielectrics-table], [polystyrene-article], [silver-mica-overview],
# [film-capacitor-text], [polystyrene-white-paper]. The source strings (shown to the user) still
# carry the short numbers of the research notes, mapped in the "was" column there. Where sources
# disagree the figure spans them all (a worst case), and the comment says so.
FAMILY_FIGURES: dict[str, FamilyFigures] = {
    "ceramic": _figures(None, None, None, None, None, None, "no class given"),
    # [polystyrene-article] −125 ppm/K; memory −100…−200: −150 ± 50 spans both. Max +85 °C:
    # [polystyrene-white-paper]; −40 °C from memory
    "polystyrene": _figures("-150", "50", "-40", "85", None, None,
                            "α −125 ppm/K (S33) and −100…−200 (memory): −150 ± 50 spans both; max +85 °C (S70)"),
    # [film-dielectrics-table] ΔC ±2.5 % over −55…+105 °C; linear, negative ([film-capacitor-text]);
    # α −200 ± 100 from memory (−100…−300)
    "polypropylene": _figures("-200", "100", "-55", "105", "2.5", "2.5",
                              "ΔC ±2.5 % over −55…+105 °C (S32); linear, negative (S68); α from memory"),
    # [film-dielectrics-table] ΔC ±5 %; α +400 ppm/K from memory, positive and only roughly linear
    "polyester": _figures("400", "200", "-55", "125", "5", "5",
                          "ΔC ±5 % over −55…+125 °C (S32); α +400 ± 200 ppm/K from memory"),
    "polyethylene-naphthalate": _figures("200", "100", "-55", "125", "5", "5",
                                         "ΔC ±5 % (S32); α +200 ± 100 ppm/K from memory"),
    "polyphenylene-sulfide": _figures("0", "100", "-55", "140", "1.5", "1.5",
                                      "ΔC ±1.5 % over −55…+140 °C (S32); α 0 ± 100 ppm/K from memory"),
    # memory: "small, ±50…+100 ppm/K, flat": +50 ± 100 spans −50…+150
    "polycarbonate": _figures("50", "100", "-55", "125", None, None,
                              "from memory (small and flat, about −50…+100 ppm/K): +50 ± 100"),
    # [film-capacitor-text] +1/−3 % over the range; the range is from memory: some parts are rated to +200 °C, but the
    # window is known only to +125 °C, so the rated range stops there
    "ptfe": _figures(None, None, "-55", "125", "3", "1",
                     "ΔC +1/−3 % over range (S68); range −55…+125 °C from memory"),
    # [silver-mica-overview] +35…+75 ppm/K typical; the old military characteristic E allows
    # −20…+100 ppm/K (from memory of [MIL-PRF-39001] Table I): +40 ± 60 spans it
    "mica": _figures("40", "60", "-55", "125", None, None,
                     "typical +35…+75 ppm/K (S34); characteristic E −20…+100 ppm/K (from memory): +40 ± 60"),
    "glass": _figures("140", "25", "-55", "125", None, None, "from memory (+140 ± 25 ppm/K)"),
    "paper": _figures(None, None, "-40", "85", "10", "10",
                      "common practice, no published source (paper/oil about ±10 % over range)", linear=False),
    "tantalum": _figures(None, None, "-55", "125", "10", "10",
                         "ΔC ±10 % over −55…+125 °C, roughly linear (S32)"),
    "tantalum-polymer": _figures(None, None, "-55", "105", "20", "20", "from memory (±10…20 %: the wider)"),
    "aluminium-electrolytic": _figures(None, None, "-40", "105", "20", "10",
                                       "from memory (−10…−20 % at −40 °C, +5…+10 % at +105 °C)", linear=False),
    "bipolar-electrolytic": _figures(None, None, "-40", "85", "20", "10", "from memory (as aluminium)",
                                     linear=False),
    # memory: large and non-linear, capacitance falls in the cold; the wider of two recollections
    "double-layer": _figures(None, None, "-25", "70", "30", "20",
                             "from memory (about −20…−30 % cold, +10…+20 % hot: the wider)", linear=False),
}

# Names and abbreviations (lower case, spaces and hyphens removed) -> family. Common practice
# among makers and repairers; the DIN-style letters are from memory of maker catalogues.
FAMILY_NAMES: dict[str, str] = {
    "ceramic": "ceramic", "cer": "ceramic", "mlcc": "ceramic", "disc": "ceramic", "disk": "ceramic",
    "polystyrene": "polystyrene", "styroflex": "polystyrene", "ks": "polystyrene", "ps": "polystyrene",
    "polypropylene": "polypropylene", "pp": "polypropylene", "mkp": "polypropylene", "kp": "polypropylene",
    "fkp": "polypropylene", "polyprop": "polypropylene",
    "polyester": "polyester", "pet": "polyester", "mkt": "polyester", "kt": "polyester",
    "mylar": "polyester", "fkt": "polyester", "mks": "polyester",
    "pen": "polyethylene-naphthalate", "mkn": "polyethylene-naphthalate", "kn": "polyethylene-naphthalate",
    "polyethylenenaphthalate": "polyethylene-naphthalate",
    "pps": "polyphenylene-sulfide", "mki": "polyphenylene-sulfide", "polyphenylenesulfide": "polyphenylene-sulfide",
    "polyphenylenesulphide": "polyphenylene-sulfide",
    "polycarbonate": "polycarbonate", "mkc": "polycarbonate", "kc": "polycarbonate", "pc": "polycarbonate",
    "ptfe": "ptfe", "teflon": "ptfe",
    "mica": "mica", "silvermica": "mica", "sm": "mica", "micas": "mica",
    "glass": "glass",
    "paper": "paper", "oilpaper": "paper", "mp": "paper", "paperinoil": "paper", "waxpaper": "paper",
    "metallisedpaper": "paper",
    "tantalum": "tantalum", "tant": "tantalum", "tantalium": "tantalum", "ta": "tantalum", "tantal": "tantalum",
    "mno2": "tantalum", "tantalummno2": "tantalum",
    "tantalumpolymer": "tantalum-polymer", "polymertantalum": "tantalum-polymer",
    "aluminiumelectrolytic": "aluminium-electrolytic", "aluminumelectrolytic": "aluminium-electrolytic",
    "electrolytic": "aluminium-electrolytic", "elco": "aluminium-electrolytic", "elko": "aluminium-electrolytic",
    "alu": "aluminium-electrolytic", "ecap": "aluminium-electrolytic", "elyt": "aluminium-electrolytic",
    # distributor descriptions: "CAP ALUM 100UF 25V", "CAP ELEC 47UF" (common practice, no published source)
    "alum": "aluminium-electrolytic", "aluminium": "aluminium-electrolytic",
    "aluminum": "aluminium-electrolytic", "elec": "aluminium-electrolytic",
    "electrolytics": "aluminium-electrolytic", "aluelectrolytic": "aluminium-electrolytic",
    "alel": "aluminium-electrolytic",
    "bipolar": "bipolar-electrolytic", "bipolarelectrolytic": "bipolar-electrolytic",
    "bp": "bipolar-electrolytic", "nonpolar": "bipolar-electrolytic", "np": "bipolar-electrolytic",
    "nonpolarelectrolytic": "bipolar-electrolytic",
    "doublelayer": "double-layer", "supercap": "double-layer", "supercapacitor": "double-layer",
    "edlc": "double-layer", "ultracap": "double-layer", "ultracapacitor": "double-layer",
    "goldcap": "double-layer",
}
# Abbreviations whose reading is disputed: name -> (other family, reason).
DISPUTED_NAMES: dict[str, tuple[str, str]] = {
    "mks": ("polystyrene", "MKS is one maker's metallised-polyester series; some tables list it as polystyrene"),
    "np": ("ceramic", "NP can mean a non-polar electrolytic or be a broken NP0"),
}

# Words that may make up a family name printed over two or more tokens, e.g. "silver mica".
PHRASE_WORDS = frozenset({"silver", "mica", "aluminium", "aluminum", "electrolytic", "polymer", "tantalum",
                          "double", "layer", "paper", "oil", "wax", "in", "bipolar", "non", "polar", "mno2", "film",
                          "metallised", "metallized", "polyester", "polypropylene", "polystyrene", "polyethylene",
                          "naphthalate", "polyphenylene", "sulfide", "sulphide"})
_DROP_WORDS = ("film", "metallised", "metallized", "capacitor", "cap")
_SEPARATORS = re.compile(r"[\s\-_/.]+")


@dataclass(frozen=True)
class FamilyReading:
    """A family name read, with alternatives and flags."""

    token: str
    dielectric: Dielectric
    alternatives: tuple[Alternative, ...] = ()
    flags: tuple[Flag, ...] = ()


def family_dielectric(family: str) -> Dielectric:
    """The typical figures of a family as a :class:`Dielectric` (code = the family name).

    Raises:
        ValueError: ``family`` is not one of :data:`stock.decoded.FAMILIES`.

    >>> family_dielectric("polypropylene").tempco_ppm_per_k
    Decimal('-200')
    """
    if family not in FAMILIES:
        raise ValueError(f"unknown family {family!r}; expected one of {', '.join(FAMILIES)}")
    f = FAMILY_FIGURES[family]
    return Dielectric(code=family, family=family, klass=None, tempco_ppm_per_k=f.tempco,
                      tempco_tol_ppm_per_k=f.tempco_tol, temp_min_c=f.temp_min_c, temp_max_c=f.temp_max_c,
                      change_minus_pct=f.change_minus_pct, change_plus_pct=f.change_plus_pct, source=f.source)


def _key(text: str) -> str:
    key = _SEPARATORS.sub("", text.lower())
    if key in FAMILY_NAMES:
        return key
    for word in _DROP_WORDS:
        if key.endswith(word) and key != word:
            key = key[: -len(word)]
        if key.startswith(word) and key != word:
            key = key[len(word):]
    return key


# A misspelt family word is matched against the longer names only (short abbreviations such as
# "pp" or "ks" are too close to every other short word). The cutoff is a judgement call.
FUZZY_MIN_LENGTH = 5
FUZZY_CUTOFF = 85


@lru_cache(maxsize=4096)
def read_misspelt_family(token: str) -> FamilyReading | None:
    """A family word with a typing slip (``elctrolytic``), read with rapidfuzz and flagged.

    Only whole words of letters, at least :data:`FUZZY_MIN_LENGTH` long, are compared, and only
    against names as long; None when no name is close enough.

    >>> r = read_misspelt_family("elctrolytic")
    >>> r.dielectric.family, r.flags[0].kind
    ('aluminium-electrolytic', 'spelling-corrected')
    >>> read_misspelt_family("plastic") is None
    True
    """
    from rapidfuzz import fuzz, process   # imported late: it costs start-up time

    word = token.lower()
    if len(word) < FUZZY_MIN_LENGTH or not word.isalpha() or word in FAMILY_NAMES:
        return None
    found = process.extractOne(word, _FUZZY_NAMES, scorer=fuzz.ratio, score_cutoff=FUZZY_CUTOFF)
    if found is None:
        return None
    name = found[0]
    reading = read_family(name)
    assert reading is not None
    flag = Flag("spelling-corrected", f"{token}: read as {name} ({reading.dielectric.family})")
    return FamilyReading(token, reading.dielectric, reading.alternatives, (flag, *reading.flags))


@lru_cache(maxsize=4096)
def read_family(token: str) -> FamilyReading | None:
    """A family name or abbreviation, with alternatives and flags; None when it names no family.

    >>> r = read_family("MKS"); r.dielectric.family, [a.dielectric.family for a in r.alternatives]
    ('polyester', ['polystyrene'])
    >>> read_family("metallized polyester film").dielectric.family
    'polyester'
    """
    key = _key(token)
    family = FAMILY_NAMES.get(key)
    if family is None:
        return None
    chosen = family_dielectric(family)
    if key in DISPUTED_NAMES:
        other, why = DISPUTED_NAMES[key]
        return FamilyReading(token, chosen,
                             (Alternative(reason=f"{token}: {why}", dielectric=family_dielectric(other)),),
                             (Flag("ambiguous-code", f"{token}: read as {family}; {why}"),))
    return FamilyReading(token, chosen)


_FUZZY_NAMES = [n for n in FAMILY_NAMES if len(n) >= FUZZY_MIN_LENGTH]


def decode_family(token: str) -> Dielectric | None:
    """The family a name or abbreviation stands for, with its typical figures; None when it is none.

    >>> decode_family("polypropylene").temp_max_c, decode_family("X7R") is None
    (Decimal('105'), True)
    """
    reading = read_family(token)
    return reading.dielectric if reading else None


__all__ = ["DISPUTED_NAMES", "FAMILY_FIGURES", "FAMILY_NAMES", "FamilyFigures", "FamilyReading",
           "decode_family", "family_dielectric", "read_family", "read_misspelt_family"]
