"""The worst-case capacitance budget of a part at some conditions: each term, compounded.

:func:`worst_case` works out the tolerance, temperature, ageing and DC-bias terms on their own and
the voltage check (family derating, and the category voltage of the families whose rated voltage
falls when hot); :class:`Budget` compounds them as factors, (1 − a)(1 − b)… for losses and
(1 + a)(1 + b)… for gains. The grades over a budget are :mod:`stock.physics.grading`.

>>> from stock.decoded import Dielectric, Marking, Tolerance
>>> c0g = Dielectric("C0G", "ceramic", 1, Decimal(0), Decimal(30))
>>> worst_case(Marking("101J C0G", Decimal(100), Tolerance(Decimal(5), Decimal(5), "%"), dielectric=c0g)).total_plus_pct
Decimal('5.07875')
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property
from decimal import Decimal
from typing import Any

from stock.decoded import Marking
from stock.errors import BadValue
from stock.physics.applications import POSITIONS
from stock.markings.safety_classes import POSITION_NAMES
from stock.physics.stability import (
    AGEING_REFERENCE_HOURS, DC_BIAS_LIMITS, DEAGEING_DECADES, REFERENCE_C, Derating, SHELF_LIFE, Term,
    ageing_decades, ageing_rate_pct, category_fraction, dc_bias_loss_at_rated_pct, dc_bias_loss_pct,
    derating_for, pm, read_case_size, temperature_term,
)
from stock.units import format_number, format_temperature_range, format_voltage


@dataclass(frozen=True)
class Conditions:
    """Where the part will work: temperature range (°C), DC working voltage, service life (years).

    ``position`` is the mains position when the build names one ("line-line" for an X class,
    "line-earth" for a Y class); None leaves it to the application table.
    """

    temp_min_c: Decimal = Decimal(0)
    temp_max_c: Decimal = Decimal(50)
    working_v: Decimal | None = None
    years: Decimal = Decimal(10)
    position: str | None = None

    def __post_init__(self) -> None:
        if self.position is not None and self.position not in POSITIONS:
            raise BadValue("--position", self.position, "one of " + ", ".join(POSITIONS))
        if self.temp_min_c > self.temp_max_c:
            raise BadValue("--temp", f"{self.temp_min_c}..{self.temp_max_c}",
                           "a range with its low end first, such as 0..50")
        if self.years < 0:
            raise BadValue("--years", str(self.years), "a service life of 0 years or more")
        if self.working_v is not None and self.working_v < 0:
            raise BadValue("--volts", str(self.working_v), "a working voltage of 0 V or more")

    def describe(self) -> str:
        """``0…+50 °C, 10 years`` (and the working voltage when given)."""
        text = f"{format_temperature_range(self.temp_min_c, self.temp_max_c)}, {format_number(self.years)} years"
        if self.working_v is not None:
            text += f", {format_voltage(self.working_v, None)} working"
        if self.position in POSITION_NAMES:
            text += f", mains {POSITION_NAMES[self.position]}"
        return text

    def to_json(self) -> dict[str, Any]:
        return {"temp_min_c": float(self.temp_min_c), "temp_max_c": float(self.temp_max_c),
                "working_v": None if self.working_v is None else float(self.working_v),
                "years": float(self.years), "reference_c": float(REFERENCE_C),
                "position": self.position}


@dataclass(frozen=True)
class VoltageCheck:
    """Working voltage against the rated voltage and the family's derating rule."""

    working_v: Decimal
    rated_v: Decimal
    limit_fraction: Decimal
    rule: str
    source: str
    word: str
    reason: str
    category_fraction: Decimal = Decimal(1)   # of rated, what the part may carry at all when hot

    def to_json(self) -> dict[str, Any]:
        return {"working_v": float(self.working_v), "rated_v": float(self.rated_v),
                "limit_fraction": float(self.limit_fraction), "rule": self.rule, "source": self.source,
                "word": self.word, "reason": self.reason,
                "category_fraction": float(self.category_fraction)}


_DRIFT = ("temperature", "ageing", "dc_bias")
_ALL = ("tolerance",) + _DRIFT


def _tidy(value: Decimal) -> Decimal:
    """A compounded percentage kept to 6 decimals (exact enough, and readable in JSON)."""
    return value.quantize(Decimal("0.000001")).normalize() if value else Decimal(0)


@dataclass(frozen=True)
class Budget:
    """The worst-case deviation of a part's capacitance, term by term, at some conditions.

    A term is None when a fact it needs is missing; ``missing`` names those facts. Drift and total
    compound the known terms as factors, (1 − a)(1 − b)… and (1 + a)(1 + b)…; ``linear_sum`` is the
    plain sum, for display. ``out_of_range`` says how the operating range passes the rated range.
    """

    conditions: Conditions
    tolerance: Term | None
    temperature: Term | None
    ageing: Term | None
    dc_bias: Term | None
    missing: tuple[str, ...] = ()
    out_of_range: str | None = None
    over_temperature: str | None = None
    voltage: VoltageCheck | None = None
    notes: tuple[str, ...] = ()

    def terms(self) -> tuple[tuple[str, Term | None], ...]:
        return (("tolerance", self.tolerance), ("temperature", self.temperature),
                ("ageing", self.ageing), ("dc_bias", self.dc_bias))

    def _known(self, names: tuple[str, ...]) -> list[Term]:
        return [t for n, t in self.terms() if n in names and t is not None]

    def _loss(self, names: tuple[str, ...]) -> Decimal:
        """1 − Π(1 − mᵢ): the losses compound, and stop at 100 %."""
        kept = Decimal(1)
        for t in self._known(names):
            kept *= max(Decimal(0), 1 - t.minus_pct / 100)
        return _tidy((1 - kept) * 100)

    def _gain(self, names: tuple[str, ...]) -> Decimal:
        """Π(1 + pᵢ) − 1: the gains compound too (more than their sum)."""
        grown = Decimal(1)
        for t in self._known(names):
            grown *= 1 + t.plus_pct / 100
        return _tidy((grown - 1) * 100)

    def linear_sum(self, names: tuple[str, ...] = _ALL, side: str = "minus_pct") -> Decimal:
        """The plain sum of the terms on one side: the displayed breakdown, not the budget."""
        return sum((getattr(t, side) for t in self._known(names)), Decimal(0))

    @cached_property
    def drift_minus_pct(self) -> Decimal:
        return self._loss(_DRIFT)

    @cached_property
    def drift_plus_pct(self) -> Decimal:
        return self._gain(_DRIFT)

    @cached_property
    def total_minus_pct(self) -> Decimal:
        return self._loss(_ALL)

    @cached_property
    def total_plus_pct(self) -> Decimal:
        return self._gain(_ALL)

    def to_json(self) -> dict[str, Any]:
        return {
            "conditions": self.conditions.to_json(),
            "terms": {n: (t.to_json() if t else None) for n, t in self.terms()},
            "drift_minus_pct": float(self.drift_minus_pct), "drift_plus_pct": float(self.drift_plus_pct),
            "total_minus_pct": float(self.total_minus_pct), "total_plus_pct": float(self.total_plus_pct),
            "combined": "compounded: (1 − a)(1 − b)… for losses, (1 + a)(1 + b)… for gains",
            "linear_minus_pct": float(self.linear_sum(_ALL, "minus_pct")),
            "linear_plus_pct": float(self.linear_sum(_ALL, "plus_pct")),
            "missing": list(self.missing), "out_of_range": self.out_of_range,
            "over_temperature": self.over_temperature,
            "voltage": self.voltage.to_json() if self.voltage else None, "notes": list(self.notes),
        }


def kind_of(marking: Marking) -> str | None:
    """The table's kind for a part: ``ceramic-1``, ``ceramic-2``, a family name, or None if unknown."""
    d = marking.dielectric
    if d is None:
        return None
    if d.family == "ceramic":
        if d.klass in (1, 2):
            return f"ceramic-{d.klass}"
        return None
    return d.family


def _voltage(marking: Marking, c: Conditions) -> tuple[VoltageCheck | None, str | None]:
    if c.working_v is None:
        return None, None
    if marking.voltage_v is None:
        return None, "rated voltage"
    d = marking.dielectric
    family = d.family if d else None
    rule = derating_for(family, d.klass if d else None, marking.voltage_v)
    category, hot = category_fraction(family, c.temp_max_c)
    if marking.safety_class and marking.voltage_kind == "AC":
        # from memory of IEC 60384-14: X/Y parts are rated for continuous mains at their AC rating
        rule = Derating(Decimal(1), "X/Y parts at up to their rated AC voltage",
                        "from memory of IEC 60384-14")
        category, hot = Decimal(1), None
    ceiling = marking.voltage_v * category
    limit = ceiling * rule.fraction
    working, rated = format_voltage(c.working_v, None), format_voltage(marking.voltage_v, marking.voltage_kind)
    share = format_number(round(c.working_v * 100 / marking.voltage_v, 1))
    hot_text = ""
    if hot is not None:
        hot_text = (f"; at +{format_number(c.temp_max_c)} °C a {family.replace('-', ' ')} part may carry only"
                    f" {format_voltage(round(ceiling, 1), None)} ({format_number(round(category * 100, 1))} % of"
                    f" rated, falling from +{format_number(hot.knee_c)} °C to {format_number(round(hot.fraction_at_end * 100, 1))} %"
                    f" at +{format_number(hot.end_c)} °C: {hot.source})")
    if c.working_v > marking.voltage_v:
        word, reason = "unfit", f"{working} working is above the rated {rated}"
    elif c.working_v > ceiling:
        word, reason = "unfit", f"{working} working is above what the part may carry when hot{hot_text}"
    elif c.working_v > limit:
        word, reason = "marginal", (f"{working} working is {share} % of the rated {rated}, past the"
                                    f" customary {rule.rule} ({rule.source}){hot_text}")
    else:
        word, reason = "fit", f"{working} working is {share} % of the rated {rated} ({rule.rule}){hot_text}"
    return VoltageCheck(c.working_v, marking.voltage_v, rule.fraction * category, rule.rule, rule.source, word,
                        reason, category), None


def _ageing_term(d, years: Decimal) -> Term:  # noqa: ANN001  (a Class 2 Dielectric)
    rate = ageing_rate_pct(d.code, 2)
    decades = ageing_decades(years)
    loss, gain = rate * decades, rate * DEAGEING_DECADES
    return Term("ageing", loss, gain,
                f"{d.code} ages up to {format_number(rate)} % per decade-hour (the high end of the published"
                f" ranges); {format_number(years)} years is {format_number(decades)} decades past the"
                f" {format_number(AGEING_REFERENCE_HOURS)} h referee time: {pm(loss, Decimal(0))}; freshly"
                f" soldered it starts de-aged, up to {pm(Decimal(0), gain)} above nominal")


def _dc_bias_term(marking: Marking, c: Conditions, bias_loss_pct: Decimal | None,
                  case_size: str | None) -> tuple[Term | None, str | None, str | None]:
    """The DC-bias term of a Class 2 part, the fact missing, and a note."""
    d = marking.dielectric
    if bias_loss_pct is not None:
        return Term("dc_bias", bias_loss_pct, Decimal(0),
                    f"{pm(bias_loss_pct, Decimal(0))} from the datasheet curve"), None, None
    if c.working_v is None:
        return (Term("dc_bias", Decimal(0), Decimal(0), "no working voltage given: DC-bias loss not counted"),
                None, "give --volts to count the DC-bias loss of this Class 2 part")
    if marking.voltage_v is None:
        return None, "rated voltage (for the DC-bias loss)", None
    case = read_case_size(case_size)
    loss = dc_bias_loss_pct(d.code, marking.capacitance_pf, c.working_v, marking.voltage_v, case)
    at_rated, basis = dc_bias_loss_at_rated_pct(d.code, marking.capacitance_pf, case)
    return Term("dc_bias", loss, Decimal(0),
                f"{format_voltage(c.working_v, None)} on a {format_voltage(marking.voltage_v, None)} part,"
                f" {basis}: {pm(at_rated, Decimal(0))} at rated × √(working/rated) = about"
                f" {pm(loss, Decimal(0))} ({DC_BIAS_LIMITS})"), None, None


def worst_case(marking: Marking, conditions: Conditions = Conditions(), *,
               bias_loss_pct: Decimal | None = None, case_size: str | None = None) -> Budget:
    """The worst-case capacitance budget of a part at some conditions, each term on its own.

    Args:
        marking: the decoded part.
        conditions: temperature range, working voltage, service life.
        bias_loss_pct: a DC-bias loss read off the maker's curve; replaces the approximate model.
        case_size: the part's package as typed (``0805``, ``1206``); sets the DC-bias model's case.

    >>> from stock.decoded import Dielectric, Marking, Tolerance
    >>> c0g = Dielectric("C0G", "ceramic", 1, Decimal(0), Decimal(30))
    >>> b = worst_case(Marking("101J C0G", Decimal(100), Tolerance(Decimal(5), Decimal(5), "%"), dielectric=c0g))
    >>> b.temperature.minus_pct, b.temperature.plus_pct, b.total_plus_pct
    (Decimal('0.075'), Decimal('0.075'), Decimal('5.07875'))
    """
    c = conditions
    missing: list[str] = []
    notes: list[str] = []
    d = marking.dielectric
    klass2 = d is not None and d.family == "ceramic" and d.klass == 2

    tolerance = None
    if marking.tolerance is None:
        missing.append("tolerance")
    else:
        as_pct = marking.tolerance.as_percent(marking.capacitance_pf)
        if as_pct is None:
            missing.append("capacitance (to turn a pF tolerance into %)")
        else:
            tolerance = Term("tolerance", as_pct[0], as_pct[1], f"marked {pm(*as_pct)}")

    temperature, lacking, out = temperature_term(marking.dielectric, c.temp_min_c, c.temp_max_c)
    if lacking:
        missing.append(lacking)

    over = None
    if marking.rated_temp_c is not None and c.temp_max_c > marking.rated_temp_c:
        over = (f"{format_temperature_range(c.temp_min_c, c.temp_max_c)} runs above the part's rated"
                f" {format_number(marking.rated_temp_c)} °C")

    unknown_class = d is not None and d.family == "ceramic" and d.klass not in (1, 2)
    if unknown_class:
        missing.append("ceramic class (1 or 2)")
    if d is None or unknown_class:
        ageing = None
    elif klass2:
        ageing = _ageing_term(d, c.years)
    elif d.family == "ceramic":
        ageing = Term("ageing", Decimal(0), Decimal(0), "Class 1 ceramics do not age (S35)")
    else:
        ageing = Term("ageing", Decimal(0), Decimal(0), f"no logarithmic ageing counted for {d.family}")

    if d is None or unknown_class:
        dc_bias = None
    elif not klass2:
        dc_bias = Term("dc_bias", Decimal(0), Decimal(0),
                       "no DC-bias loss for Class 1 (S32, S35)" if d.family == "ceramic"
                       else f"no DC-bias loss counted for {d.family}")
    else:
        dc_bias, lacking_bias, note = _dc_bias_term(marking, c, bias_loss_pct, case_size)
        if lacking_bias:
            missing.append(lacking_bias)
        if note:
            notes.append(note)

    voltage, lacking_v = _voltage(marking, c)
    if lacking_v and lacking_v not in " ".join(missing):
        missing.append(lacking_v)

    kind = kind_of(marking)
    if kind in SHELF_LIFE:
        notes.append(SHELF_LIFE[kind])
    return Budget(c, tolerance, temperature, ageing, dc_bias, tuple(missing), out, over, voltage, tuple(notes))


__all__ = ["Budget", "Conditions", "VoltageCheck", "kind_of", "worst_case"]
