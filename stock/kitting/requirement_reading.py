"""A BOM line's requirement, read from its value or marking and its other columns.

The value column reads as a user value first (``100n``, ``4n7``, ``0.1uF``), then as a marking
(``104K 100V``, ``2u2 50V X7R``), whose tolerance, voltage, dielectric and safety class count unless
a column says otherwise. ``X2``/``Y1``-style safety classes anywhere in the line make it a mains
line; a line that says ``mains`` without a class cannot be read, because the class decides which
parts may go there. A cell that cannot be read raises :class:`Unreadable` naming its field.

>>> r = read_requirement("150p", "", {"tolerance": "5%", "voltage": "100V", "dielectric": "NP0"})
>>> r["capacitance_pf"], r["tol_pct"], r["voltage_v"], r["dielectric"].code
(Decimal('150'), Decimal('5'), Decimal('100'), 'NP0')
"""

from __future__ import annotations

import re
from decimal import Decimal
from typing import Any

from stock.decoded import Dielectric, Marking
from stock.errors import BadValue, StockError
from stock.markings.ceramic_codes import decode_dielectric
from stock.markings.decoder import decode
from stock.markings.families import decode_family
from stock.markings.tolerance_codes import read_explicit_tolerance, read_tolerance_letter
from stock.markings.typed_values import parse_capacitance, parse_voltage
from stock.matching.search import parse_tempco_window
from stock.physics.grading import APPLICATIONS
from stock.units import format_capacitance, parse_percent

SAFETY_CLASS_RE = re.compile(r"\b(X1Y[12]|X[123]|Y[1-4])\b", re.IGNORECASE)
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


class Unreadable(StockError, ValueError):
    """A requirement cell that does not read; ``column`` is the field name."""
    def __init__(self, column: str, raw: str, reason: str):
        super().__init__(f"{column}: {reason}")
        self.column, self.raw, self.reason = column, raw, reason


def _application(text: str) -> str:
    word = text.strip().lower()
    word = APPLICATION_WORDS.get(word, word)
    if word not in APPLICATIONS:
        raise Unreadable("application", text, f"unknown application {text!r} (expected one of "
                         f"{', '.join(APPLICATIONS)})")
    return word


def _dielectric_token(text: str) -> Dielectric | None:
    return decode_dielectric(text.strip()) or decode_family(text.strip())


def _tempco_window(text: str) -> tuple[Decimal, Decimal]:
    return parse_tempco_window(text)


def _tolerance_pct(text: str, capacitance_pf: Decimal) -> Decimal:
    """A tolerance cell as ± % of the value: ``5%``, ``±0.25pF``, ``+80/-20%``, ``5`` or a letter.

    An asymmetric tolerance counts by its larger side. A letter whose meaning tables dispute is
    refused: a plan must not rest on a guess.
    """

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


def _value_and_marking(value_text: str, marking_text: str) -> tuple[Decimal, Marking | None, list[str]]:
    """The capacitance the value and marking columns agree on, the marking read, remarks."""
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
            if decoded.capacitance_pf != value:
                # The whole cell is a typed value ("1n"): a marking reading of it ("1n" as a
                # voltage code) says nothing more about the line.
                decoded = Marking(text, capacitance_pf=value)
        except BadValue as exc:
            value = decoded.capacitance_pf
            if value is None:
                first_failure = first_failure or Unreadable(column, text, str(exc))
                continue
            remarks.extend(f.message for f in decoded.flags)
        if capacitance is not None and value != capacitance:
            raise Unreadable(column, text, f"marking {text!r} reads {format_capacitance(value)},"
                             f" the value says {format_capacitance(capacitance)}")
        capacitance = capacitance if capacitance is not None else value
        if marking is None or column == "marking":
            marking = decoded
    if capacitance is None:
        raise first_failure or Unreadable("value", value_text, "no value or marking given")
    if capacitance <= 0:
        raise Unreadable("value", value_text, "a capacitance must be more than zero")
    return capacitance, marking, remarks


def _from_marking(marking: Marking, capacitance: Decimal, out: dict[str, Any]) -> None:
    if marking.tolerance is not None:
        tol = marking.tolerance.as_percent(capacitance)
        out["tol_pct"] = max(tol) if tol else None
    out["voltage_v"] = marking.voltage_v
    out["voltage_kind"] = marking.voltage_kind if marking.voltage_v is not None else None
    out["dielectric"] = marking.dielectric
    out["safety_class"] = marking.safety_class
    out["polarised"] = marking.polarity is not None


def _voltage_column(text: str, out: dict[str, Any]) -> None:
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


def _dielectric_column(text: str, out: dict[str, Any]) -> None:
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
            out["tempco_min"], out["tempco_max"] = _tempco_window(token)
        except BadValue as exc:
            raise Unreadable("dielectric", text, f"cannot read {token!r} as a dielectric, tempco or"
                             " safety class (expected C0G, X7R, N750, 0±30, polypropylene,"
                             " X2 ...)") from exc


def _implied(out: dict[str, Any], value_text: str, notes: str) -> None:
    """What the dielectric implies: a Class 1 code's tempco window, a family's polarity."""
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


def _mains(out: dict[str, Any], columns: dict[str, str]) -> None:
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


def read_requirement(value_text: str, marking_text: str, columns: dict[str, str],
                     notes: str = "") -> dict[str, Any]:
    """The requirement fields of a capacitor line, from its value/marking and other columns.

    Returns a dict of :class:`stock.kitting.bom.BomLine` field values.

    Raises:
        Unreadable: a cell cannot be read; ``column`` names the field.
    """
    capacitance, marking, remarks = _value_and_marking(value_text, marking_text)
    out: dict[str, Any] = {"capacitance_pf": capacitance}
    if marking is not None:
        _from_marking(marking, capacitance, out)
    if columns.get("tolerance"):
        out["tol_pct"] = _tolerance_pct(columns["tolerance"], capacitance)
    if columns.get("voltage"):
        _voltage_column(columns["voltage"], out)
    if columns.get("dielectric"):
        _dielectric_column(columns["dielectric"], out)
    if columns.get("tempco"):
        try:
            out["tempco_min"], out["tempco_max"] = _tempco_window(columns["tempco"])
        except BadValue as exc:
            raise Unreadable("tempco", columns["tempco"], str(exc)) from exc
    _implied(out, value_text, notes)
    if columns.get("application"):
        out["application"] = _application(columns["application"])
    _mains(out, columns)
    out["remarks"] = tuple(remarks)
    return {k: v for k, v in out.items() if v is not None}


__all__ = ["APPLICATION_WORDS", "DOUBTFUL_FLAGS", "POLARISED_FAMILIES", "SAFETY_CLASS_RE",
           "Unreadable", "read_requirement"]
