"""The flag kinds: what each flag means, what would settle it, and which decision closes it.

Every flag the decoder, the importer or a stock check raises carries one of these kinds. The
table is ours (common practice, no published source): for each kind, its meaning in a sentence,
a settle hint filled in from the flag's bin and readings, and whether a reading, a count or a
note settles it. :mod:`stock.review` lists flags with these words and settles them; the README
table of flag kinds is made from :data:`FLAG_KINDS`.

>>> FLAG_KINDS["ambiguous-code"].settled_by
'reading'
>>> flag_kind("no-such-kind").meaning.startswith("a flag kind this version")
True
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, replace
from typing import Literal

SettledBy = Literal["reading", "count", "note"]


@dataclass(frozen=True)
class FlagKind:
    """One kind of flag: what it means and what would settle it.

    ``settle`` is a template; ``{id}``, ``{choices}``, ``{claims}``, ``{marking}``, ``{label}``, ``{value}``,
    ``{unparsed}``, ``{bins}``, ``{bin}``, ``{on_hand}``, ``{minimum}``, ``{date_code}`` and
    ``{age}`` are filled from the flag's bin and readings. ``settled_by`` says which decision
    closes it: a reading (``--reading``/``--value``/``--marking``), a count, or a note.
    """

    kind: str
    meaning: str
    settle: str
    settled_by: SettledBy


_KINDS: tuple[FlagKind, ...] = (
    FlagKind("unit-assumed",
             "a number without a unit was read with the unit a convention assumes",
             "measure it: {choices}?", "reading"),
    FlagKind("ambiguous-code",
             "the code has more than one reading in use (e.g. 47K: 47 pF ±10 % or 47 nF)",
             "measure it: {choices}?", "reading"),
    FlagKind("tolerance-by-value",
             "the tolerance letter means pF or % depending on the value, or the sources differ",
             "check the maker's series, or measure it: {choices}?", "reading"),
    FlagKind("disputed-code",
             "published tables disagree on this code; the majority reading was taken",
             "check the maker's datasheet: {choices}?", "reading"),
    FlagKind("spelling-corrected",
             "the marking was read as a correction of what was typed (O for 0, u for µ ...)",
             "look at the part: does it say {marking}? (--reading 0 keeps the correction,"
             " --marking gives what it really says)", "reading"),
    FlagKind("unreadable",
             "nothing in the marking could be read as a capacitor value",
             "look at the part again and give --marking, or measure it and give --value", "reading"),
    FlagKind("unparsed",
             "part of the marking was not understood and was kept as written",
             "look at the part: what do {unparsed} mean? Give --marking with what it says,"
             " or --reading 0 if the rest is right", "reading"),
    FlagKind("both-ends",
             "a colour code reads as a valid value from either end",
             "check which end the bands start from: {choices}?", "reading"),
    FlagKind("layout-ambiguous",
             "the colour dots or bands fit more than one layout (EIA/military mica, 5-band tubular)",
             "check the layout (arrows, the wide band, the first dot): {choices}?", "reading"),
    FlagKind("conflicting-readings",
             "two parts of one marking give different facts (two values, a letter and a written"
             " tolerance, two dielectrics); one was chosen",
             "look at the part and measure it: {choices}?", "reading"),
    FlagKind("tolerance-assumed",
             "no tolerance was marked; the code's convention (e.g. ±20 % for no band) was assumed",
             "measure it or check the maker's series; `--reading 0` accepts {value}", "reading"),
    FlagKind("voltage-assumed",
             "no voltage was marked; the rating was taken from the code's convention",
             "check the maker's datasheet before working it near the assumed rating; then"
             " `stock settle {bin} --flag {id} --note ...`", "note"),
    FlagKind("voltage-kind-assumed",
             "the rating did not say AC or DC; the part's kind decided (safety capacitors: AC)",
             "check the printed rating (~, AC, DC) on the part; then"
             " `stock settle {bin} --flag {id} --note ...`", "note"),
    FlagKind("polarity-assumed",
             "no polarity mark was in the text; the family's usual marking was assumed",
             "look at the part: which lead does the stripe or + mark? Fitted the wrong way round"
             " an electrolytic can overheat and vent. Then `stock settle {bin} --flag {id} --note ...`",
             "note"),
    FlagKind("label-conflict",
             "the bin label or an explicit value column contradicts the decoded marking",
             "{claims}, the code {marking} says {value}: measure it, then --reading N for the"
             " reading that is right (or --value)", "reading"),
    FlagKind("duplicate",
             "the same part (or a probable mistyped copy) sits in several bins",
             "bins {bins}: `stock merge FROM INTO` moves the stock together; if they really"
             " differ, `stock settle BIN --flag {id} --note why`", "note"),
    FlagKind("unknown-quantity",
             "the sheet gave no quantity for this bin (blank is unknown, not zero)",
             "count the bin: `stock settle {bin} --count N`", "count"),
    FlagKind("below-minimum",
             "the bin holds fewer parts than its minimum",
             "holds {on_hand}, minimum {minimum}: reorder, then `stock settle {bin} --note ...`",
             "note"),
    FlagKind("shelf-life",
             "an aluminium electrolytic older than the shelf-life rule (or with an unreadable date"
             " code); its oxide may need reforming",
             "date code {date_code} ({age}): test the leakage current or reform it before use"
             " (slowly, through a series resistor, following the maker's procedure; it stores"
             " charge, so discharge it before handling), then `stock settle {bin} --note ...`",
             "note"),
)

#: Every flag kind this version knows, by kind (the README table is made from this).
FLAG_KINDS: Mapping[str, FlagKind] = {k.kind: k for k in _KINDS}

_UNKNOWN_KIND = FlagKind(
    "?", "a flag kind this version does not document; read its message",
    "read the message, then `stock settle {bin} --flag {id} --note ...`", "note")


def flag_kind(kind: str) -> FlagKind:
    """The documented kind, or a generic entry for a kind this version does not know.

    >>> flag_kind("both-ends").settle.startswith("check which end")
    True
    """
    return FLAG_KINDS.get(kind) or replace(_UNKNOWN_KIND, kind=kind)


# What to do about each reason a row is quarantined (kept raw, not stored as a bin).
QUARANTINE_FIXES: dict[str, str] = {
    "bad-quantity": "write the count as a whole number (or leave it blank if not counted), then import again",
    "no-capacitance": "correct the marking or value (e.g. 104, 4n7, 100pF, brown black red), then import again",
    "duplicate-row": "give each bin its own location (or merge the two rows into one), then import again",
}


__all__ = ["QUARANTINE_FIXES", "FLAG_KINDS", "FlagKind", "SettledBy", "flag_kind"]
