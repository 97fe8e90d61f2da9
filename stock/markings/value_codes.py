"""IEC 60062 capacitance codes: the three-digit code, the letter-and-digit code, values with units.

A token printed on a capacitor (or typed in a cell) can give its value in pF in several ways:

- **Three-digit code** (IEC 60062, EIA): two significant figures and a multiplier digit; 0–6 are
  powers of ten in pF, 8 is ×0.01 and 9 is ×0.1. ``104`` = 10 × 10⁴ pF = 100 nF, ``479`` = 4.7 pF.
  Digit 7 is "not used" in the general tables, but tantalum chips print ``476`` for 47 µF
  (×10⁷ pF would be 470 µF for ``477``), so 7 is read as ×10⁷ with a flag unless the part is polarised.
- **Letter-and-digit code** (IEC 60062 "RKM"): the letter p/n/u(µ)/m/F stands for the decimal
  point and the prefix: ``4n7`` = 4.7 nF, ``p47`` = 0.47 pF, ``u1`` = 0.1 µF. ``R`` is the decimal
  point in pF on small parts (``4R7`` = 4.7 pF, common practice). Older US practice used ``K`` as
  ×1000 pF (``3K3`` = 3.3 nF).
- **Value with unit**: pF, nF, µF/uF, mF (millifarad), and on older parts MFD/MF (microfarad) and
  MMFD/µµF (micro-microfarad = pF).
- **Unit-less number** by the old convention: a whole number is pF, a decimal below 1 is µF
  (``.047`` = 47 nF). Decoded, and flagged ``unit-assumed``.

Where a token has more than one reading (``470``: code 47 pF or 470 pF printed literally; ``47K``:
47 pF ±10 % or ERIE 47 nF), every reading is returned, ranked; E-series membership (IEC 60063) is
one ranking signal.

>>> read_value("104").chosen.capacitance_pf
Decimal('100000')
>>> read_value("4n7").chosen.capacitance_pf
Decimal('4700')
>>> [c.capacitance_pf for c in read_value("470").candidates]
[Decimal('47'), Decimal('470')]
"""

from __future__ import annotations

import re
from functools import lru_cache
from dataclasses import dataclass
from decimal import Decimal

from stock.decoded import Flag
from stock.markings.preferred_values import in_series
from stock.units import format_capacitance

# IEC 60062 three-digit code: multiplier digit -> power of ten applied to the two figures, in pF.
THREE_DIGIT_EXPONENT: dict[str, int] = {
    "0": 0,    # ×1        IEC 60062
    "1": 1,    # ×10       IEC 60062
    "2": 2,    # ×100      IEC 60062
    "3": 3,    # ×1000     IEC 60062
    "4": 4,    # ×10⁴      IEC 60062
    "5": 5,    # ×10⁵      IEC 60062
    "6": 6,    # ×10⁶      IEC 60062
    "7": 7,    # ×10⁷      tantalum-chip practice only (general tables say "not used")
    "8": -2,   # ×0.01     IEC 60062
    "9": -1,   # ×0.1      IEC 60062
}
DISPUTED_MULTIPLIER_DIGITS = frozenset("7")

# IEC 60062 letter-and-digit code: letter -> power of ten of its unit, expressed in pF.
RKM_EXPONENT: dict[str, int] = {
    "p": 0,    # pico   IEC 60062
    "n": 3,    # nano   IEC 60062
    "u": 6,    # micro (µ) IEC 60062
    "m": 9,    # milli  IEC 60062
    "f": 12,   # farad  IEC 60062
    "r": 0,    # decimal point in pF, common practice, no published standard
    "k": 3,    # ×1000 pF, older US practice (from memory of older US catalogue notes)
}

# Unit words after a number -> power of ten of the unit in pF. Keys are lower case.
UNIT_EXPONENT: dict[str, int] = {
    "pf": 0,      # picofarad
    "p": 0,
    "mmfd": 0,    # micro-microfarad, old US practice
    "mmf": 0,
    "uuf": 0,     # µµF, old practice
    "nf": 3,      # nanofarad
    "n": 3,
    "uf": 6,      # microfarad
    "u": 6,
    "ufd": 6,
    "mfd": 6,     # old US practice: MFD = microfarad
    "mf": 6,      # ambiguous: old MF = µF; modern mF = millifarad (see read_value)
    "f": 12,      # farad (double-layer parts)
}
_MILLIFARAD_EXPONENT = 9

UNITLESS_WHOLE_MAX_DIGITS = 7   # a longer bare number is not read as a value

_THREE_DIGIT = re.compile(r"(\d\d)(\d)")
_RKM = re.compile(r"(\d*)([pnumfrk])(\d*)", re.IGNORECASE)
_WITH_UNIT = re.compile(r"(\d+(?:\.\d*)?|\.\d+)(pf|mmfd|mmf|uuf|nf|ufd|uf|mfd|mf|f|p|n|u)", re.IGNORECASE)
_NUMBER = re.compile(r"\d+(?:\.\d*)?|\.\d+")
_TRAILING_LETTER = re.compile(r"(.*?\d)([A-Za-z])")

_POLARISED = frozenset({"tantalum", "tantalum-polymer", "aluminium-electrolytic",
                        "bipolar-electrolytic", "double-layer"})


@dataclass(frozen=True)
class ValueCandidate:
    """One way to read a value token: the value in pF, the form read, a trailing tolerance letter."""

    capacitance_pf: Decimal
    form: str                      # "three-digit", "letter-and-digit", "with-unit", "unit-less", ...
    reason: str                    # why this reading exists, in words
    tolerance_letter: str | None = None


@dataclass(frozen=True)
class ValueReading:
    """Every reading of one token, best first, and the doubts that go with the first."""

    token: str
    candidates: tuple[ValueCandidate, ...]
    flags: tuple[Flag, ...] = ()

    @property
    def chosen(self) -> ValueCandidate:
        return self.candidates[0]

    @property
    def others(self) -> tuple[ValueCandidate, ...]:
        return self.candidates[1:]


def _fmt(pf: Decimal) -> str:
    return format_capacitance(pf)


def _exact(text: str) -> Decimal:
    return Decimal(text if not text.startswith(".") else "0" + text)


def _scaled(number: Decimal, exponent: int) -> Decimal:
    value = number.scaleb(exponent)
    return value.normalize() if value != value.to_integral_value() else value.quantize(Decimal(1))


def _e_rank(pf: Decimal) -> int:
    """0 for an E6 value, 1 for E12, 2 for E24, 3 otherwise (IEC 60063)."""
    for rank, name in enumerate(("E6", "E12", "E24")):
        if in_series(pf, name):
            return rank
    return 3


def three_digit_value(code: str) -> Decimal | None:
    """The value in pF of a three-digit code, or None when ``code`` is not three digits.

    >>> three_digit_value("223"), three_digit_value("479"), three_digit_value("108")
    (Decimal('22000'), Decimal('4.7'), Decimal('0.1'))
    """
    match = _THREE_DIGIT.fullmatch(code)
    if not match:
        return None
    return _scaled(Decimal(match[1]), THREE_DIGIT_EXPONENT[match[2]])


def encode_three_digit(pf: Decimal) -> str:
    """The three-digit code of a value with at most two significant figures (IEC 60062).

    >>> encode_three_digit(Decimal(100000)), encode_three_digit(Decimal("4.7")), encode_three_digit(Decimal(10))
    ('104', '479', '100')

    Raises:
        ValueError: the value needs more than two figures or lies outside 0.1 pF … 99 µF.
    """
    for digit, exponent in sorted(THREE_DIGIT_EXPONENT.items(), key=lambda kv: kv[1]):
        if digit in DISPUTED_MULTIPLIER_DIGITS:
            continue
        figures = pf.scaleb(-exponent)
        if figures == figures.to_integral_value() and 10 <= figures <= 99:
            return f"{int(figures):02d}{digit}"
    raise ValueError(f"{pf} pF has no three-digit code (two figures, 0.1 pF … 99 µF)")


def _split_letter(token: str) -> tuple[str, str | None]:
    match = _TRAILING_LETTER.fullmatch(token)
    if match:
        return match[1], match[2].upper()
    return token, None


def _three_digit_candidates(body: str, letter: str | None, family: str | None,
                            flags: list[Flag]) -> list[ValueCandidate]:
    match = _THREE_DIGIT.fullmatch(body)
    if not match:
        return []
    figures, digit = match[1], match[2]
    code_pf = _scaled(Decimal(figures), THREE_DIGIT_EXPONENT[digit])
    if code_pf == 0:
        return []
    polarised = family in _POLARISED
    if digit in DISPUTED_MULTIPLIER_DIGITS and not polarised:
        flags.append(Flag("disputed-code", f"{body}: multiplier digit 7 is not in the general IEC 60062 "
                                           f"table; read as ×10⁷ pF as on tantalum chips ({_fmt(code_pf)})"))
    code = ValueCandidate(code_pf, "three-digit", f"three-digit code {body}: {figures} × 10^"
                          f"{THREE_DIGIT_EXPONENT[digit]} pF (IEC 60062)", letter)
    if digit != "0":
        return [code]
    literal_pf = Decimal(body.lstrip("0") or "0")
    literal = ValueCandidate(literal_pf, "literal-pF", f"{body} printed literally as {_fmt(literal_pf)} "
                             "(whole number = pF)", letter)
    # A code ending in 0 is also a plain number of pF: rank by E-series membership, code first on a tie.
    # Both readings share a significand, so E-series membership (IEC 60063) ties them unless
    # one is not a preferred value at all; on a tie the standard's code reading comes first.
    ranked = sorted([code, literal], key=lambda c: _e_rank(c.capacitance_pf))
    series = "both preferred values" if _e_rank(code_pf) < 3 else "neither a preferred value"
    flags.append(Flag("ambiguous-code", f"{body}: three-digit code {_fmt(code_pf)} or {_fmt(literal_pf)} "
                                        f"printed literally ({series}); read as "
                                        f"{_fmt(ranked[0].capacitance_pf)}"))
    return ranked


def _rkm_candidates(body: str, letter: str | None) -> list[ValueCandidate]:
    match = _RKM.fullmatch(body)
    if not match or not (match[1] or match[3]):
        return []
    whole, unit, fraction = match[1] or "0", match[2].lower(), match[3]
    number = Decimal(f"{whole}.{fraction}" if fraction else whole)
    if number == 0:
        return []
    pf = _scaled(number, RKM_EXPONENT[unit])
    if unit == "k":
        if not fraction:
            return []   # "47K" is a value-plus-tolerance question, handled by the caller
        return [ValueCandidate(pf, "letter-and-digit", f"{body}: K as ×1000 pF (older US practice)", letter)]
    if unit == "f" and match[2] == "f":
        return []       # lower-case f alone is not the farad letter
    if match[2] == "M" and not fraction:
        return []       # "473M": a trailing capital M is the ±20 % tolerance letter, not milli
    if match[2] == "F" and not fraction and _THREE_DIGIT.fullmatch(whole):
        return []       # "101F": the code 101 with the ±1 % letter F (IEC 60062), not 101 farads
    form = "r-decimal" if unit == "r" else "letter-and-digit"
    source = "R as the decimal point in pF" if unit == "r" else "IEC 60062 letter-and-digit code"
    return [ValueCandidate(pf, form, f"{body}: {source}", letter)]


def _unit_candidates(token: str, flags: list[Flag]) -> list[ValueCandidate]:
    match = _WITH_UNIT.fullmatch(token)
    if not match:
        return []
    number, unit = _exact(match[1]), match[2]
    if number == 0:
        return []
    key = unit.lower()
    if key == "mf":
        micro = _scaled(number, UNIT_EXPONENT["mf"])
        milli = _scaled(number, _MILLIFARAD_EXPONENT)
        if unit == "mF":
            return [ValueCandidate(milli, "with-unit", f"{token}: mF = millifarad (SI)"),
                    ValueCandidate(micro, "with-unit", f"{token}: MF = microfarad on older parts")]
        flags.append(Flag("ambiguous-code", f"{token}: MF read as microfarad (older parts); "
                                            "in SI mF would be millifarad"))
        return [ValueCandidate(micro, "with-unit", f"{token}: MF = microfarad on older parts"),
                ValueCandidate(milli, "with-unit", f"{token}: mF = millifarad (SI)")]
    if key in ("f",) and unit == "f":
        return []
    if unit == "F" and _THREE_DIGIT.fullmatch(match[1]):
        return []       # "101F": the code 101 with the ±1 % letter F (IEC 60062), not 101 farads
    return [ValueCandidate(_scaled(number, UNIT_EXPONENT[key]), "with-unit", f"{token}: value with unit")]


def _unitless_candidates(body: str, letter: str | None, family: str | None,
                         flags: list[Flag]) -> list[ValueCandidate]:
    if not _NUMBER.fullmatch(body):
        return []
    number = _exact(body)
    if number == 0:
        return []
    polarised = family in _POLARISED
    if "." in body:
        pf = _scaled(number, 6)
        flags.append(Flag("unit-assumed", f"{body}: no unit; a decimal number is read as µF "
                                          f"({_fmt(pf)})"))
        return [ValueCandidate(pf, "unit-less", f"{body}: decimal without unit = µF (old convention)",
                               letter)]
    if len(body.lstrip("0")) > UNITLESS_WHOLE_MAX_DIGITS:
        return []
    if polarised:
        pf = _scaled(number, 6)
        flags.append(Flag("unit-assumed", f"{body}: no unit; on a {family} part a whole number is read as µF"))
        return [ValueCandidate(pf, "unit-less", f"{body}: whole number on a {family} part = µF", letter),
                ValueCandidate(number, "unit-less", f"{body}: whole number = pF (old convention)", letter)]
    flags.append(Flag("unit-assumed", f"{body}: no unit; a whole number is read as pF"))
    return [ValueCandidate(number, "unit-less", f"{body}: whole number without unit = pF (old convention)",
                           letter)]


def _k_multiplier_candidates(body: str, letter: str | None, flags: list[Flag],
                             primary: list[ValueCandidate]) -> list[ValueCandidate]:
    """``47K``: IEC reads 47 pF ±10 %; older US practice reads K as ×1000 pF (47 nF)."""
    if letter != "K" or not body.isdigit() or len(body) > 3 or (len(body) == 3 and body[2] != "0"):
        return []
    k_reading = _scaled(Decimal(body), 3)
    flags.append(Flag("ambiguous-code", f"{body}K: read as {_fmt(primary[0].capacitance_pf)} ±10 % "
                                        f"(IEC 60062); older US practice reads K as ×1000 pF ({_fmt(k_reading)})"))
    return [ValueCandidate(k_reading, "letter-and-digit", f"{body}K: K as ×1000 pF (older US practice)")]


@lru_cache(maxsize=8192)
def read_value(token: str, *, family: str | None = None) -> ValueReading | None:
    """Every reading of one token as a capacitance, best first.

    Args:
        token: one whitespace-free token, e.g. ``104K``, ``4n7``, ``0.1uF``, ``.047MFD``, ``470``.
        family: the dielectric family already read from the marking, if any; on polarised parts
            a bare whole number is µF and multiplier digit 7 is the tantalum-chip ×10⁷.

    Returns:
        The readings, or None when the token is not a capacitance in any form (the caller then
        tries the token as something else and finally keeps it as unparsed).

    >>> r = read_value("47K")
    >>> [(c.capacitance_pf, c.tolerance_letter) for c in r.candidates]
    [(Decimal('47'), 'K'), (Decimal('47000'), None)]
    >>> read_value("1R5C").chosen.capacitance_pf, read_value("1R5C").chosen.tolerance_letter
    (Decimal('1.5'), 'C')
    >>> read_value("X7R") is None
    True
    """
    flags: list[Flag] = []
    candidates = _unit_candidates(token, flags)
    if candidates and token[-1] in "pP" and _THREE_DIGIT.fullmatch(token[:-1]) and token[-2] != "0":
        # "104P": nobody prints 104 pF; it is the code 104 with tolerance letter P.
        code = _three_digit_candidates(token[:-1], "P", family, flags)
        flags.append(Flag("ambiguous-code", f"{token}: read as code {token[:-1]} with tolerance letter P; "
                                            f"{token[:-1]} pF printed literally is not a preferred value"))
        candidates = code + candidates
    if not candidates:
        body, letter = _split_letter(token)
        for body, letter in ((token, None), (body, letter)) if letter else ((token, None),):
            candidates = (_three_digit_candidates(body, letter, family, flags)
                          or _rkm_candidates(body, letter)
                          or _unitless_candidates(body, letter, family, flags))
            if candidates:
                candidates += _k_multiplier_candidates(body, letter, flags, candidates)
                break
    if not candidates:
        return None
    return ValueReading(token, tuple(candidates), tuple(flags))


__all__ = ["RKM_EXPONENT", "THREE_DIGIT_EXPONENT", "UNIT_EXPONENT", "ValueCandidate", "ValueReading",
           "encode_three_digit", "read_value", "three_digit_value"]
