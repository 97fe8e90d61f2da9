"""What a position needs: the requirement, read from what a user typed.

A :class:`Requirement` says what the circuit needs (value and tolerance, tempco window, working
voltage, application, safety class, family, quantity). :mod:`stock.matching.part_checks` judges
one stored part against it; :mod:`stock.matching.search` finds the parts and pairs that pass.

What "meets" means, constraint by constraint:

- **Value.** With a tolerance (``tol_pct``), the *delivered* value must stay inside the requirement
  whatever the part does within its own marked tolerance: the part's band
  ``[C·(1 − minus %), C·(1 + plus %)]`` must lie inside ``[T·(1 − tol), T·(1 + tol)]``. A part with no
  marked tolerance cannot promise that and is left out. Without a tolerance, the nominal value must be
  within :data:`NOMINAL_MATCH_PCT` of the target (closer than any two E96 neighbours, so a single part
  must carry the value asked for, while a pair may land 1 % off).
- **Tempco window.** The part's whole band ``α ± tol`` must lie in the window; a part whose tolerance
  on α is not marked (old names such as N750) takes the tolerance grading assumes (that of the
  EIA-198 code it is sold as, :func:`stock.markings.ceramic_codes.assumed_tempco_tolerance`), for
  single parts and pairs alike, and says so. A part with no linear tempco (Class 2 ceramics,
  electrolytics) never meets a window.
- **Voltage.** The rated voltage must reach the working voltage (for a series pair, each part's share,
  V₁ = V·C₂/(C₁ + C₂)), within the derating rules of :func:`stock.grading.worst_case`; "marginal"
  derating passes only with ``allow_marginal``.
- **Application.** The grade (:func:`stock.grading.grade`) must be "fit" ("marginal" too with
  ``allow_marginal``).
- **Safety.** A mains position or a named class never accepts a part without an X/Y class, and
  never a pair. A class stands in for another by the one IEC 60384-14 rule of
  :func:`stock.markings.safety_classes.covers` (Y may take X, never the reverse; impulse test at
  least as severe; AC rating reaching the position's). A mains position with no class named takes
  any X/Y part for line–line and a Y part for line–earth (``position``).
- **Quantity.** Available = on hand less reservations of plans not yet pulled or dropped, and it must
  cover the quantity; a pair takes ``qty`` of each part, or ``2 × qty`` from one bin used twice.

>>> parse_tempco_window("-750±120")
(Decimal('-870'), Decimal('-630'))
"""

from __future__ import annotations

import re
from dataclasses import dataclass, replace
from decimal import Decimal, InvalidOperation
from functools import cached_property
from typing import Any

from stock.decoded import FAMILIES, Dielectric, Tolerance
from stock.errors import BadValue
from stock.markings.ceramic_codes import assumed_tempco_tolerance, decode_dielectric, read_dielectric
from stock.markings.families import decode_family
from stock.markings.safety_classes import MAINS_CAUTION, POSITION_NAMES, SUBCLASSES, read_safety_class
from stock.markings.typed_values import parse_capacitance, parse_voltage
from stock.physics import combining
from stock.physics.grading import APPLICATIONS, POSITIONS, Conditions
from stock.units import format_capacitance, format_tolerance, parse_percent, parse_temperature_range

NOMINAL_MATCH_PCT = Decimal(1)  # common practice, no published source: "the same value" within 1 %
DEFAULT_BUY_TOL_PCT = Decimal(10)  # E12, when the requirement names no tolerance
_HUNDRED = Decimal(100)

_WINDOW = re.compile(r"^\s*([+\-−]?\d+(?:\.\d+)?)\s*(?:±|\+/-|\+-)\s*(\d+(?:\.\d+)?)\s*(?:ppm(?:/K)?)?\s*$",
                     re.IGNORECASE)
_RANGE = re.compile(r"^\s*([+\-−]?\d+(?:\.\d+)?)\s*(?:\.\.|…)\s*([+\-−]?\d+(?:\.\d+)?)\s*$")


def _dec(text: str) -> Decimal:
    return Decimal(text.replace("−", "-"))


def fmt(value: Decimal, places: int = 2) -> str:
    """A Decimal as plain digits, at most ``places`` decimals, no exponent, true minus sign.

    >>> fmt(Decimal("1E+2")), fmt(Decimal("-300.0")), fmt(Decimal("-0.001"))
    ('100', '−300', '0')
    """
    try:
        q = value.quantize(Decimal(1).scaleb(-places)).normalize()
    except InvalidOperation:        # too many digits to quantize (1e300 V): show it as it is
        q = value.normalize()
    if q.is_zero():
        return "0"
    return format(q, "f").replace("-", "−")


def _signed(value: Decimal) -> str:
    return ("+" if value > 0 else "") + fmt(value)


def tempco_tolerance(diel: Dielectric | None) -> Decimal:
    """The tolerance on α a check uses: the marked one, else the one assumed everywhere (never 0).

    >>> tempco_tolerance(decode_dielectric("N750")), tempco_tolerance(decode_dielectric("C0G"))
    (Decimal('120'), Decimal('30'))
    """
    if diel is None or diel.tempco_ppm_per_k is None:
        return Decimal(0)
    if diel.tempco_tol_ppm_per_k is not None:
        return diel.tempco_tol_ppm_per_k
    return assumed_tempco_tolerance(diel.tempco_ppm_per_k)[0]


def parse_tempco_window(text: str) -> tuple[Decimal, Decimal]:
    """A tempco window in ppm/K from ``0±30``, ``-750±120``, ``-100..100`` or a Class 1 code.

    A code (``C0G``, ``U2J``, ``NP0``, ``N750``) means its own nominal ± tolerance; an old industry
    name that states no tolerance (N750) takes the tolerance of the EIA-198 code it is usually sold
    as (U2J, ±120 ppm/K).

    Raises:
        BadValue: the text is neither a window nor a code with a linear tempco.

    >>> parse_tempco_window("0±30")
    (Decimal('-30'), Decimal('30'))
    >>> parse_tempco_window("-100..50")
    (Decimal('-100'), Decimal('50'))
    >>> parse_tempco_window("N750")
    (Decimal('-870'), Decimal('-630'))
    """
    expected = "a window such as 0±30, -750±120 or -100..100 (ppm/K), or a Class 1 code such as C0G"
    raw = text
    m = _WINDOW.match(text)
    if m:
        mid, half = _dec(m.group(1)), _dec(m.group(2))
        return mid - half, mid + half
    m = _RANGE.match(text)
    if m:
        lo, hi = _dec(m.group(1)), _dec(m.group(2))
        if lo > hi:
            raise BadValue("--tempco", raw, "a window whose low end is below its high end")
        return lo, hi
    reading = read_dielectric(text.strip())
    diel = reading.dielectric if reading else None
    if diel is None or diel.tempco_ppm_per_k is None:
        raise BadValue("--tempco", raw, expected)
    tol = tempco_tolerance(diel)  # an old name: the tolerance of the EIA code it is sold as
    return diel.tempco_ppm_per_k - tol, diel.tempco_ppm_per_k + tol


MAX_WORKING_V = Decimal(1_000_000)   # past 1 MV a working voltage is a typing slip (common practice)


@dataclass(frozen=True)
class Requirement:
    """What a position in a circuit needs (see the module docstring for what each field demands)."""
    capacitance_pf: Decimal
    tol_pct: Decimal | None = None
    tempco_min: Decimal | None = None
    tempco_max: Decimal | None = None
    max_abs_tempco: Decimal | None = None
    working_v: Decimal | None = None
    application: str | None = None
    allow_marginal: bool = False
    conditions: Conditions = Conditions()
    family: str | None = None
    dielectric_code: str | None = None
    safety_class: str | None = None
    qty: int = 1
    position: str | None = None     # "line-line" or "line-earth" for a mains position

    def __post_init__(self) -> None:
        if self.capacitance_pf <= 0:
            raise BadValue("--value", str(self.capacitance_pf), "a capacitance above zero")
        if self.tol_pct is not None and not Decimal(0) < self.tol_pct < _HUNDRED:
            raise BadValue("--tol", str(self.tol_pct), "a tolerance between 0 and 100 %")
        if not 1 <= self.qty <= 2**53:   # past 2**53 a count is a typing slip (and overflows SQLite)
            raise BadValue("--qty", str(self.qty), "a quantity of 1 or more")
        if self.working_v is not None and not abs(self.working_v) <= MAX_WORKING_V:
            raise BadValue("--volts", str(self.working_v), f"a working voltage up to {MAX_WORKING_V:,} V")
        if self.application is not None and self.application not in APPLICATIONS:
            raise BadValue("--use", self.application, "one of " + ", ".join(APPLICATIONS))
        if self.family is not None and self.family not in FAMILIES:
            raise BadValue("--family", self.family, "one of " + ", ".join(FAMILIES))
        if self.safety_class is not None and read_safety_class(self.safety_class) is None:
            raise BadValue("--safety", self.safety_class, "one of " + ", ".join(SUBCLASSES) + " or a dual class such as X1Y2")
        if self.position is not None and self.position not in POSITIONS:
            raise BadValue("--position", self.position, "one of " + ", ".join(POSITIONS))
        if (self.tempco_min is not None and self.tempco_max is not None
                and self.tempco_min > self.tempco_max):
            raise BadValue("--tempco", f"{self.tempco_min}..{self.tempco_max}",
                           "a window whose low end is below its high end")
        if self.max_abs_tempco is not None and self.max_abs_tempco < 0:
            raise BadValue("--max-tempco", str(self.max_abs_tempco), "a magnitude of 0 ppm/K or more")
        if self.dielectric_code is not None and self.dielectric() is None:
            raise BadValue("--tempco", self.dielectric_code, "a dielectric code such as C0G, N750 or X7R")

    # The derived values below are asked for once per candidate part: work them out once per
    # requirement (a frozen dataclass, so they never go stale; cached_property keeps them beside it).
    def dielectric(self) -> Dielectric | None:
        """The decoded dielectric the requirement names, if any."""
        return self._dielectric

    @cached_property
    def _dielectric(self) -> Dielectric | None:
        return decode_dielectric(self.dielectric_code) if self.dielectric_code else None

    def value_window(self) -> tuple[Decimal, Decimal]:
        """The (low, high) limits the delivered value must stay within, in pF."""
        return self._value_window

    @cached_property
    def _value_window(self) -> tuple[Decimal, Decimal]:
        pct = self.tol_pct if self.tol_pct is not None else NOMINAL_MATCH_PCT
        return combining.band(self.capacitance_pf, pct, pct)

    def tempco_window(self) -> tuple[Decimal, Decimal] | None:
        """The (low, high) window on α in ppm/K, from the window and the magnitude limit together."""
        return self._tempco_window

    @cached_property
    def _tempco_window(self) -> tuple[Decimal, Decimal] | None:
        lo, hi = self.tempco_min, self.tempco_max
        if self.max_abs_tempco is not None:
            lo = -self.max_abs_tempco if lo is None else max(lo, -self.max_abs_tempco)
            hi = self.max_abs_tempco if hi is None else min(hi, self.max_abs_tempco)
        if lo is None and hi is None:
            return None
        return (lo if lo is not None else Decimal("-Infinity"), hi if hi is not None else Decimal("Infinity"))

    def needed_safety(self) -> str | None:
        """The safety class a part must cover, when the requirement names one (``X2``, ``X1Y2``)."""
        if self.safety_class:
            return read_safety_class(self.safety_class).code
        return None

    def mains_position(self) -> str | None:
        """The mains position: as given, else the one a named class implies (X → line–line, Y →
        line–earth, IEC 60384-14); None for a mains job that names neither."""
        if self.position:
            return self.position
        if not self.safety_class:
            return None
        return "line-earth" if "Y" in self.safety_class.upper() else "line-line"

    def is_mains(self) -> bool:
        return self.application == "mains" or self.safety_class is not None or self.position is not None

    def describe(self) -> str:
        """The requirement in words, for ordering: "150 pF ±5 %, 0±30 ppm/K, ≥ 50 V, fit for tuned"."""
        words = [format_capacitance(self.capacitance_pf)]
        if self.tol_pct is not None:
            words[0] += " " + format_tolerance(Tolerance(self.tol_pct, self.tol_pct, "%"))
        if self.qty > 1:
            words[0] = f"{self.qty} × {words[0]}"
        if self.dielectric_code:
            words.append(self.dielectric_code)
        if self.tempco_min is not None and self.tempco_max is not None:
            mid, half = (self.tempco_min + self.tempco_max) / 2, (self.tempco_max - self.tempco_min) / 2
            words.append(f"{fmt(mid)}±{fmt(half)} ppm/K")
        if self.max_abs_tempco is not None:
            words.append(f"|α| ≤ {fmt(self.max_abs_tempco)} ppm/K")
        if self.family:
            words.append(self.family)
        if self.working_v is not None:
            words.append(f"≥ {fmt(self.working_v)} V")
        if self.safety_class:
            words.append(f"safety class {self.safety_class}")
        if self.position:
            words.append(POSITION_NAMES[self.position])
        if self.application:
            word = "fit or marginal" if self.allow_marginal else "fit"
            words.append(f"{word} for {self.application}")
        c = self.conditions
        if (c.temp_min_c, c.temp_max_c) != (Conditions().temp_min_c, Conditions().temp_max_c):
            words.append(f"{_signed(c.temp_min_c)}…{_signed(c.temp_max_c)} °C")
        return ", ".join(words)

    def to_json(self) -> dict[str, Any]:
        def f(v: Decimal | None) -> float | None:
            return None if v is None else float(v)
        return {
            "capacitance_pf": float(self.capacitance_pf), "tol_pct": f(self.tol_pct),
            "tempco_min": f(self.tempco_min), "tempco_max": f(self.tempco_max),
            "max_abs_tempco": f(self.max_abs_tempco), "working_v": f(self.working_v),
            "application": self.application, "allow_marginal": self.allow_marginal,
            "temp_min_c": f(self.conditions.temp_min_c), "temp_max_c": f(self.conditions.temp_max_c),
            "family": self.family, "dielectric_code": self.dielectric_code,
            "safety_class": self.safety_class, "qty": self.qty, "position": self.position,
            "description": self.describe(),
        }


def build_requirement(*, value: str, tol: str | None = None, tempco: str | None = None,
                      max_tempco: str | None = None, volts: str | None = None, use: str | None = None,
                      allow_marginal: bool = False, temp: str | None = None, family: str | None = None,
                      safety: str | None = None, qty: int = 1, position: str | None = None) -> Requirement:
    """A requirement from the words a user typed (``stock find`` options), each checked.

    ``tempco`` given as a code (C0G, N750) also asks for that dielectric or its equivalent.

    Raises:
        BadValue: an option that does not read, naming it and what it accepts.

    >>> build_requirement(value="150p", tol="5%", tempco="C0G", volts="50", use="tuned").describe()
    '150 pF ±5 %, C0G, 0±30 ppm/K, ≥ 50 V, fit for tuned'
    """
    window = parse_tempco_window(tempco) if tempco else (None, None)
    code = None
    if tempco and not (_WINDOW.match(tempco) or _RANGE.match(tempco)):
        code = tempco.strip()
    fam = None
    if family:
        diel = decode_family(family) or decode_dielectric(family)
        fam = diel.family if diel else family.strip().lower()
    conditions = Conditions()
    if temp:
        low, high = parse_temperature_range(temp, "--temp")
        conditions = replace(conditions, temp_min_c=low, temp_max_c=high)
    if volts:
        conditions = replace(conditions, working_v=parse_voltage(volts, "--volts"))
    max_abs = None
    if max_tempco:
        try:
            max_abs = abs(_dec(max_tempco.strip().removesuffix("ppm/K").removesuffix("ppm").strip()))
        except InvalidOperation:
            raise BadValue("--max-tempco", max_tempco, "a magnitude in ppm/K such as 100") from None
    return Requirement(
        capacitance_pf=parse_capacitance(value, "--value"),
        tol_pct=parse_percent(tol, "--tol") if tol else None,
        tempco_min=window[0], tempco_max=window[1], max_abs_tempco=max_abs,
        working_v=conditions.working_v, application=use.strip().lower() if use else None,
        allow_marginal=allow_marginal, conditions=replace(conditions, working_v=None),
        family=fam, dielectric_code=code,
        safety_class=safety.strip().upper() if safety else None, qty=qty,
        position=position.strip().lower() if position else None)


SAFETY_CAUTION = MAINS_CAUTION  # one caution text per hazard: the safety table's

__all__ = ["DEFAULT_BUY_TOL_PCT", "NOMINAL_MATCH_PCT", "SAFETY_CAUTION", "Requirement", "build_requirement",
           "fmt", "parse_tempco_window", "tempco_tolerance"]
