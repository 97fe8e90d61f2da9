"""Colour words as people type them: names, abbreviations, misspellings, and the words around them.

A colour marking arrives as free text: ``yel-vio-brn``, ``YEL/VIO/BRN``, ``bands: violet yellow
violet black green``, ``brown black orange, top dot black``. This module splits it into the value
colours (in written order), the colours named as a top dot, cap or wide band (the tempco), layout
words (bands, dots, mica, EIA, JAN, RMA, tubular, disc) and the words it could not read.
Misspellings are matched with rapidfuzz and every correction is reported.

>>> parse_colour_text("top band red violet, brown black red", {("red", "violet")}).tempco
('red', 'violet')
"""

from __future__ import annotations

import re
from collections.abc import Collection
from dataclasses import dataclass

COLOURS: tuple[str, ...] = ("black", "brown", "red", "orange", "yellow", "green", "blue", "violet",
                            "grey", "white", "gold", "silver", "none")

# Every spelling read as a colour. Full names with British and American spellings, the 3-letter
# abbreviations of parts lists (common practice, no published source), the IEC 60757 two-letter
# colour codes (from memory of IEC 60757), and "none" for a missing band or dot ([colour-tables-b],
# [rma-mica-page]).
_SPELLINGS: dict[str, tuple[str, ...]] = {
    "black": ("black", "blk", "bk"),
    "brown": ("brown", "brn", "bn"),
    "red": ("red", "rd"),
    "orange": ("orange", "orn", "org", "ora", "og"),
    "yellow": ("yellow", "yel", "ylw", "ye"),
    "green": ("green", "grn", "gn"),
    "blue": ("blue", "blu", "bu"),
    "violet": ("violet", "purple", "vio", "vlt", "pur", "vt"),
    "grey": ("grey", "gray", "gry", "gra", "gy"),
    "white": ("white", "wht", "wh"),
    "gold": ("gold", "gld", "gd"),
    "silver": ("silver", "slv", "sil", "sr"),
    "none": ("none", "blank", "nil"),
}
_ALIASES: dict[str, str] = {spelling: colour for colour, spellings in _SPELLINGS.items()
                            for spelling in spellings}
# Aliases of three letters or more are the fuzzy-match targets; two-letter codes match only exactly.
# "none" spellings match only exactly, so that "blak" is black and not blank.
_FUZZY_TARGETS: tuple[str, ...] = tuple(a for a, c in _ALIASES.items() if len(a) >= 3 and c != "none")
_FUZZY_CUTOFF = 75   # rapidfuzz ratio: "vilot"→"vio" 75, "orng"→"orn" 86, "read"→"red" 86

_SHADES = ("light", "dark")                           # TGL 7838 tells light red from red ([gdr-ceramics])
_TEMPCO_WORDS = ("top", "cap", "end", "wide", "head")  # the next colours give the tempco
_NOUNS = {"dot": "dots", "dots": "dots", "band": "bands", "bands": "bands", "stripe": "bands",
          "stripes": "bands", "ring": "bands", "rings": "bands"}
_VARIANT_WORDS = {"mica": "mica", "eia": "EIA", "rma": "RMA", "jan": "JAN", "aws": "JAN",
                  "military": "JAN", "mil": "JAN", "tubular": "tubular", "axial": "tubular",
                  "disc": "disc", "disk": "disc", "plate": "disc", "ceramic": "ceramic"}
_FILLERS = frozenset(("and", "then", "colour", "colours", "color", "colors", "code", "on", "the",
                      "of", "with", "is", "at", "a", "first", "row", "marking", "markings"))
_SEPARATORS = re.compile(r"[\s\-/:|+.&_]+")


@dataclass(frozen=True)
class ColourText:
    """A colour marking as typed, split into its parts."""

    sequence: tuple[str, ...]           # the value bands or dots, in written order
    tempco: tuple[str, ...]             # colours named as top dot / cap / wide band
    hints: frozenset[str]               # "bands", "dots", "mica", "EIA", "JAN", "RMA", "tubular", "disc"
    corrections: tuple[str, ...]        # "'orng' read as orange"
    unknown: tuple[str, ...]            # words that are neither colours nor known words


def base_colour(colour: str) -> str:
    """The colour without its shade: "light red" → "red"."""
    return colour.split()[-1]


def _fuzzy(word: str) -> tuple[str | None, str]:
    """The colour a misspelt word is closest to, or None; with a note when two colours tie."""
    from rapidfuzz import fuzz, process   # imported here: rapidfuzz costs ~70 ms to import

    matches = process.extract(word, _FUZZY_TARGETS, scorer=fuzz.ratio, score_cutoff=_FUZZY_CUTOFF,
                              limit=6)
    if not matches:
        return None, ""
    best = matches[0][1]
    colours = {_ALIASES[m[0]] for m in matches if m[1] == best}
    if len(colours) > 1:
        return None, f"{word!r} is as close to {' and '.join(sorted(colours))}"
    return _ALIASES[matches[0][0]], ""


def parse_colour_text(text: str, tempco_pairs: Collection[tuple[str, ...]] = ()) -> ColourText:
    """Split typed colours into value colours, tempco colours, layout words and the rest.

    >>> p = parse_colour_text("bands: orng vilot brn, top dot blk")
    >>> p.sequence, p.tempco, sorted(p.hints), p.corrections
    (('orange', 'violet', 'brown'), ('black',), ['bands'], ("'orng' read as orange", "'vilot' read as violet"))
    """
    items: list[tuple[str, bool]] = []      # (colour, named as tempco)
    hints: set[str] = set()
    corrections: list[str] = []
    unknown: list[str] = []
    in_tempco = False
    for clause in re.split(r"[,;]", text):
        shade = ""
        taken_in_clause = False
        words = _SEPARATORS.split(clause)
        for index, word in enumerate(words):
            low = word.lower()
            if not low:
                continue
            if low == "silver" and words[index + 1:index + 2] and words[index + 1].lower() == "mica":
                continue    # "silver mica" names the family, not a silver dot
            if low in _TEMPCO_WORDS:
                in_tempco, taken_in_clause = True, False
                continue
            if low in _NOUNS:
                if not in_tempco:
                    hints.add(_NOUNS[low])
                continue
            if low in _VARIANT_WORDS:
                hints.add(_VARIANT_WORDS[low])
                continue
            if low in _FILLERS:
                continue
            if low in _SHADES:
                shade = low + " "
                continue
            colour = _ALIASES.get(low)
            if colour is None and len(low) >= 3 and low.isalpha():
                colour, tie = _fuzzy(low)
                if colour is not None:
                    corrections.append(f"{word!r} read as {colour}")
                elif tie:
                    corrections.append(tie)
            if colour is None:
                unknown.append(word)
                continue
            items.append((shade + colour if colour != "none" else colour, in_tempco))
            taken_in_clause = taken_in_clause or in_tempco
            shade = ""
        if in_tempco and taken_in_clause:
            in_tempco = False   # a tempco group ends with its clause ("top dot black, ...")
    return _split_tempco(items, tempco_pairs, frozenset(hints), tuple(corrections), tuple(unknown))


def _split_tempco(items: list[tuple[str, bool]], tempco_pairs: Collection[tuple[str, ...]],
                  hints: frozenset[str], corrections: tuple[str, ...], unknown: tuple[str, ...]) -> ColourText:
    """Keep one colour (two if they form a two-colour tempco) per tempco group; the rest are bands."""
    sequence: list[str] = []
    tempco: list[str] = []
    i = 0
    while i < len(items):
        colour, is_tempco = items[i]
        if not is_tempco or tempco:
            sequence.append(colour)
            i += 1
            continue
        pair = tuple(c for c, _ in items[i:i + 2])
        if len(pair) == 2 and items[i + 1][1] and pair in tempco_pairs:
            tempco.extend(pair)
            i += 2
        else:
            tempco.append(colour)
            i += 1
    return ColourText(tuple(sequence), tuple(tempco), hints, corrections, unknown)


__all__ = ["COLOURS", "ColourText", "base_colour", "parse_colour_text"]
