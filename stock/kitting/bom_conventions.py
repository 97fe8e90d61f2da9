"""How BOMs exported from CAD programs write things: designators, do-not-fit, quantities, values.

The conventions (common practice in BOM exports, no published source, except where named):

- Designators are listed with commas, spaces or semicolons (``"C1,C2,C5"``), and ranges are
  written ``C1-C4``, ``C1–C4``, ``C1..C4`` or ``C10-12``; a range expands to every designator.
- The designator letters name the kind of part (``C``, ``CX``, ``R``, ``U`` ..., from memory of
  IEEE 315 and IEC 81346-2 usage).
- A part that is on the board but not fitted in this build is marked do-not-fit: a ``DNP``/``DNF``
  column holding any mark, a ``Fitted``/``Populate`` column saying no, or a do-not-fit word
  (``DNP``, ``DNF``, ``DNI``, ``do not fit``, ``not fitted`` ...) written beside the value.
- A quantity column that disagrees with the designators listed is a BOM mistake to check.
- A value cell may carry the part's other facts (``100n 50V X7R``, ``22p/C0G``, ``100nF 0805``);
  the package words among them are the footprint's, the rest the requirement's.

>>> expand_refs("C1..C3, C7")
('C1', 'C2', 'C3', 'C7')
>>> do_not_fit_word("100n DNP")
('100n', 'DNP')
>>> split_package_words("100nF 0805 X7R")
('100nF X7R', '0805')
"""

from __future__ import annotations

import re
from collections.abc import Iterable

from stock.markings.packages import read_package

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
MAX_RANGE = 1000            # a "C1-C99999" typo must not expand into memory
_RANGE_RE = re.compile(r"^([A-Za-z]+)(\d+)(?:[-–…]|\.\.)(?:\1)?(\d+)$")
_REF_RE = re.compile(r"^([A-Za-z]+)\d")
# "100n", "4n7", "0.1u", "2µ2": a value only a capacitor carries (IEC 60062 letter-and-digit code).
_CAP_UNIT_RE = re.compile(r"^\s*\d+(?:[.,]\d+)?\s*[pnuµμ](?:\d+)?\b", re.IGNORECASE)

# Do-not-fit words, written in a value or a do-not-fit column (common practice in BOM exports).
_DNP_WORDS = re.compile(r"(?<![\w-])(DNP|DNF|DNI|DNM|do[\s-]*not[\s-]*(?:fit|place|populate|mount|"
                        r"install)|not[\s-]*(?:fitted|placed|populated|mounted)|no[\s-]*fit|"
                        r"unfitted|nofit)(?![\w-])", re.IGNORECASE)
# Cell texts of a do-not-fit column that mean "fitted after all"; any other mark means not fitted.
_FITTED_MARKS = frozenset({"", "no", "n", "0", "false", "fit", "fitted", "-", "place", "populate"})
# Cell texts of a fitted/populate column that mean "not fitted".
_NOT_FITTED_MARKS = frozenset({"no", "n", "0", "false", "x", "dnp", "dnf", "not fitted", "-",
                               "do not fit", "nf", "omit"})


def expand_refs(text: str) -> tuple[str, ...]:
    """Reference designators from a cell: split on commas, spaces and semicolons, ranges expanded.

    >>> expand_refs("C10–C12")
    ('C10', 'C11', 'C12')
    >>> expand_refs("")
    ()
    """
    refs: list[str] = []
    text = re.sub(r"\s*([-–…]|\.\.)\s*", r"\1", text.strip())     # "C1 - C4" is one range
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


def do_not_fit_word(value_text: str) -> tuple[str, str | None]:
    """The value without a do-not-fit word, and the word found (None when there is none).

    >>> do_not_fit_word("DNF"), do_not_fit_word("4n7 C0G")
    (('', 'DNF'), ('4n7 C0G', None))
    >>> do_not_fit_word("10u (not fitted)")
    ('10u', 'not fitted')
    """
    m = _DNP_WORDS.search(value_text)
    if m is None:
        return value_text, None
    rest = (value_text[:m.start()] + " " + value_text[m.end():])
    rest = re.sub(r"[()\[\]]", " ", rest)
    return " ".join(rest.split()).strip(" ,;/-"), m.group(1)


def not_fitted_reason(value_text: str, dnp_cell: str = "", fitted_cell: str = "",
                      dnp_header: str = "DNP", fitted_header: str = "Fitted") -> str | None:
    """Why a line is not fitted in this build, or None when it is fitted.

    >>> not_fitted_reason("100n", dnp_cell="x", dnp_header="DNP")
    "marked do-not-fit in the 'DNP' column"
    >>> not_fitted_reason("100n", fitted_cell="no", fitted_header="Populate")
    "the 'Populate' column says 'no'"
    >>> not_fitted_reason("100n DNP"), not_fitted_reason("100n", dnp_cell="no")
    ("the value says 'DNP'", None)
    """
    if dnp_cell.strip().casefold() not in _FITTED_MARKS:
        return f"marked do-not-fit in the {dnp_header!r} column"
    if fitted_cell.strip().casefold() in _NOT_FITTED_MARKS:
        return f"the {fitted_header!r} column says {fitted_cell.strip()!r}"
    word = do_not_fit_word(value_text)[1]
    if word is not None:
        return f"the value says {word!r}"
    return None


def quantity_remark(qty: int, refs: tuple[str, ...]) -> str | None:
    """A remark when the quantity column and the designators listed disagree.

    >>> quantity_remark(3, ("C1", "C2", "C3", "C4"))
    'the quantity says 3 but 4 designators are listed (C1 C2 C3 C4); planned 4 per board: check the BOM'
    >>> quantity_remark(2, ("C1", "C2")) is None
    True
    """
    if not refs or qty == len(refs):
        return None
    shown = " ".join(refs[:8]) + (" ..." if len(refs) > 8 else "")
    planned = max(qty, len(refs))
    return (f"the quantity says {qty} but {len(refs)} designator{'s are' if len(refs) != 1 else ' is'}"
            f" listed ({shown}); planned {planned} per board: check the BOM")


def split_package_words(value_text: str) -> tuple[str, str]:
    """(the value without its package words, the package words) of a value cell.

    A word is a package word when the package decoder reads a package fact from it (a chip size,
    a mounting word, a lead form); the rest stays for the requirement.

    >>> split_package_words("22p/C0G")
    ('22p C0G', '')
    >>> split_package_words("100u 25V radial")
    ('100u 25V', 'radial')
    """

    text = re.sub(r"/(?=[A-Za-z])", " ", value_text)      # "22p/C0G", but not "+80/-20%"
    keep, package = [], []
    for word in text.split():
        (package if read_package(word).known else keep).append(word)
    return " ".join(keep), " ".join(package)


__all__ = ["CAPACITOR_KIND_WORDS", "REF_KINDS", "do_not_fit_word", "expand_refs",
           "not_fitted_reason", "part_kind", "quantity_remark", "split_package_words"]
