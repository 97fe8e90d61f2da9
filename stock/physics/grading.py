"""Each part's fitness for each job, graded from its worst-case capacitance budget.

For a marking and the operating conditions (temperature range, default 0…+50 °C, reference
+25 °C; working voltage; service life, default 10 years) :func:`worst_case` sums, each term on its
own, in % of the nominal value:

- **tolerance**: the initial tolerance as marked;
- **temperature**: Class 1 (and families with a linear typical α): α ± its tolerance times the
  temperature offset, worst corner of α range × (T − 25 °C) range. Class 2: the code's whole change
  window: EIA-198 promises the window over the rated range and nothing tighter over part of it.
  Families with a typical window (films, tantalum) are scaled to the range when their curve is
  roughly linear (:mod:`stock.stability`), whole otherwise;
- **ageing**: Class 2 only, the rate per decade-hour times the decades from 1000 h to the end of
  the life;
- **DC bias**: Class 2 only, the approximate model of :func:`stock.stability.dc_bias_loss_pct`.

The terms add (a linear sum, conservative for small terms; a loss stops at 100 %). :func:`grade`
then checks the budget and the part's kind, polarity, temperature range, voltage margin and safety
class against one row of the application table (:mod:`stock.applications`). A grade is ``fit``, ``marginal``, ``unfit``
or ``unknown`` (a fact needed is missing: the reasons say which); a definite ``unfit`` outranks an
``unknown``. Stored grades (:func:`refresh_stored_grades`) are at the default conditions and carry
the table version: a hash of the table in force and :data:`stock.applications.MODEL_VERSION`.

>>> from stock.decoded import Dielectric, Marking, Tolerance
>>> x7r = Dielectric("X7R", "ceramic", 2, temp_min_c=Decimal(-55), temp_max_c=Decimal(125),
...                  change_minus_pct=Decimal(15), change_plus_pct=Decimal(15))
>>> part = Marking("104K X7R", Decimal(100000), Tolerance(Decimal(10), Decimal(10), "%"), dielectric=x7r)
>>> grade(part, "tuned").word, grade(part, "bypass").word
('unfit', 'fit')
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import cached_property
from decimal import Decimal
from typing import Any

from stock.physics.applications import Rule, Rules, load_rules
from stock.decoded import Marking
from stock.errors import BadValue
from stock.physics.stability import (
    AGEING_REFERENCE_HOURS, DC_BIAS_LIMITS, REFERENCE_C, Derating, SHELF_LIFE, Term, ageing_decades, ageing_rate_pct,
    dc_bias_loss_pct, derating_for, is_polarised, pct, pm, temperature_term,
)
from stock.units import format_capacitance, format_number, format_temperature_range, format_voltage

APPLICATIONS: tuple[str, ...] = ("tuned", "timing", "signal", "bypass", "bulk", "mains")
WORD_ORDER = ("fit", "marginal", "unfit")
MAINS_CAUTION = ("mains work can kill: use only a part whose X/Y class and AC rating match the"
                 " position, and defer to local electrical codes and licensed practice")


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

    def to_json(self) -> dict[str, Any]:
        return {"working_v": float(self.working_v), "rated_v": float(self.rated_v),
                "limit_fraction": float(self.limit_fraction), "rule": self.rule, "source": self.source,
                "word": self.word, "reason": self.reason}


@dataclass(frozen=True)
class Budget:
    """The worst-case deviation of a part's capacitance, term by term, at some conditions.

    A term is None when a fact it needs is missing; ``missing`` names those facts. Totals add the
    known terms. ``out_of_range`` says how the operating range passes the part's rated range.
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

    def _sum(self, names: tuple[str, ...], side: str) -> Decimal:
        return sum((getattr(t, side) for n, t in self.terms() if n in names and t is not None),
                   Decimal(0))

    # A part cannot lose more than all of its capacitance: the minus sums stop at 100 %.
    @cached_property
    def drift_minus_pct(self) -> Decimal:
        return min(self._sum(("temperature", "ageing", "dc_bias"), "minus_pct"), Decimal(100))

    @cached_property
    def drift_plus_pct(self) -> Decimal:
        return self._sum(("temperature", "ageing", "dc_bias"), "plus_pct")

    @cached_property
    def total_minus_pct(self) -> Decimal:
        return min(self._sum(("tolerance", "temperature", "ageing", "dc_bias"), "minus_pct"), Decimal(100))

    @cached_property
    def total_plus_pct(self) -> Decimal:
        return self._sum(("tolerance", "temperature", "ageing", "dc_bias"), "plus_pct")

    def to_json(self) -> dict[str, Any]:
        return {
            "conditions": self.conditions.to_json(),
            "terms": {n: (t.to_json() if t else None) for n, t in self.terms()},
            "drift_minus_pct": float(self.drift_minus_pct), "drift_plus_pct": float(self.drift_plus_pct),
            "total_minus_pct": float(self.total_minus_pct), "total_plus_pct": float(self.total_plus_pct),
            "missing": list(self.missing), "out_of_range": self.out_of_range,
            "over_temperature": self.over_temperature,
            "voltage": self.voltage.to_json() if self.voltage else None, "notes": list(self.notes),
        }


@dataclass(frozen=True)
class Grade:
    """One part's grade for one application, with the reasons (numbers included) and the budget."""

    application: str
    word: str
    reasons: tuple[str, ...]
    budget: Budget | None = None
    deciding: int = 1       # how many of the leading reasons decided the word (the rest inform)

    def to_json(self) -> dict[str, Any]:
        return {"application": self.application, "grade": self.word, "reasons": list(self.reasons)}


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
    rule = derating_for(d.family if d else None, d.klass if d else None, marking.voltage_v)
    if marking.safety_class and marking.voltage_kind == "AC":
        # from memory of IEC 60384-14: X/Y parts are rated for continuous mains at their AC rating
        rule = Derating(Decimal(1), "X/Y parts at up to their rated AC voltage",
                        "from memory of IEC 60384-14")
    limit = marking.voltage_v * rule.fraction
    working, rated = format_voltage(c.working_v, None), format_voltage(marking.voltage_v, marking.voltage_kind)
    share = format_number(round(c.working_v * 100 / marking.voltage_v, 1))
    if c.working_v > marking.voltage_v:
        word, reason = "unfit", f"{working} working is above the rated {rated}"
    elif c.working_v > limit:
        word, reason = "marginal", (f"{working} working is {share} % of the rated {rated}, past the"
                                    f" customary {rule.rule} ({rule.source})")
    else:
        word, reason = "fit", f"{working} working is {share} % of the rated {rated} ({rule.rule})"
    return VoltageCheck(c.working_v, marking.voltage_v, rule.fraction, rule.rule, rule.source, word,
                        reason), None


def worst_case(marking: Marking, conditions: Conditions = Conditions(), *,
               bias_loss_pct: Decimal | None = None) -> Budget:
    """The worst-case capacitance budget of a part at some conditions, each term on its own.

    Args:
        marking: the decoded part.
        conditions: temperature range, working voltage, service life.
        bias_loss_pct: a DC-bias loss read off the maker's curve; replaces the approximate model.

    >>> from stock.decoded import Dielectric, Marking, Tolerance
    >>> c0g = Dielectric("C0G", "ceramic", 1, Decimal(0), Decimal(30))
    >>> b = worst_case(Marking("101J C0G", Decimal(100), Tolerance(Decimal(5), Decimal(5), "%"), dielectric=c0g))
    >>> b.temperature.minus_pct, b.temperature.plus_pct, b.total_plus_pct
    (Decimal('0.075'), Decimal('0.075'), Decimal('5.075'))
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
        rate = ageing_rate_pct(d.code, 2)
        decades = ageing_decades(c.years)
        loss = rate * decades
        ageing = Term("ageing", loss, Decimal(0),
                      f"{d.code} ages {format_number(rate)} % per decade-hour; {format_number(c.years)} years"
                      f" is {format_number(decades)} decades past the {format_number(AGEING_REFERENCE_HOURS)} h"
                      f" reference: {pm(loss, Decimal(0))} (S35 maxima; soldering heat resets it)")
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
    elif bias_loss_pct is not None:
        dc_bias = Term("dc_bias", bias_loss_pct, Decimal(0), f"{pm(bias_loss_pct, Decimal(0))} from the datasheet curve")
    elif c.working_v is None:
        dc_bias = Term("dc_bias", Decimal(0), Decimal(0), "no working voltage given: DC-bias loss not counted")
        notes.append("give --volts to count the DC-bias loss of this Class 2 part")
    elif marking.voltage_v is None:
        dc_bias = None
        missing.append("rated voltage (for the DC-bias loss)")
    else:
        loss = dc_bias_loss_pct(d.code, marking.capacitance_pf, c.working_v, marking.voltage_v)
        dc_bias = Term("dc_bias", loss, Decimal(0),
                       f"{format_voltage(c.working_v, None)} on a {format_voltage(marking.voltage_v, None)} part:"
                       f" about {pm(loss, Decimal(0))} ({DC_BIAS_LIMITS})")

    voltage, lacking_v = _voltage(marking, c)
    if lacking_v and lacking_v not in " ".join(missing):
        missing.append(lacking_v)

    kind = kind_of(marking)
    if kind in SHELF_LIFE:
        notes.append(SHELF_LIFE[kind])
    return Budget(c, tolerance, temperature, ageing, dc_bias, tuple(missing), out, over, voltage, tuple(notes))


_SAFETY = re.compile(r"([XY])([1-4])", re.IGNORECASE)


def _safety(marking: Marking, rule: Rule, position: str | None = None) -> tuple[str, str]:
    position = position or rule.position
    found = {m[0].upper() for m in _SAFETY.findall(marking.safety_class or "")}
    if not found:
        return "unfit", "no X/Y safety class (IEC 60384-14) marked: never use it across the mains"
    cls = (marking.safety_class or "").upper()
    if "Y" in found:
        return "fit", (f"{cls} is a Y class: it may serve line–earth and, being tested harder and"
                       " failing open, a line–line (X) position too")
    if position == "line-earth":
        return "unfit", f"{cls} is an X class only: a line–earth position needs a Y class"
    if position == "line-line":
        return "fit", f"{cls} is an X class: line–line positions only"
    return "marginal", f"{cls} serves line–line (X) positions only; never put it line–earth (needs Y)"


def _level(value: Decimal, fit: Decimal, marginal: Decimal) -> str:
    return "fit" if value <= fit else "marginal" if value <= marginal else "unfit"


KIND_NAMES = {"ceramic-1": "a Class 1 ceramic", "ceramic-2": "a Class 2 ceramic"}


def _kind_name(kind: str) -> str:
    return KIND_NAMES.get(kind, kind.replace("-", " "))


def _breakdown(budget: Budget, loss_only: bool) -> str:
    parts = []
    for name, term in budget.terms()[1:]:
        if term is not None and (term.minus_pct or (term.plus_pct and not loss_only)):
            shown = pm(term.minus_pct, Decimal(0) if loss_only else term.plus_pct)
            parts.append(f"{name.replace('dc_bias', 'DC bias')} {shown}")
    return ", ".join(parts) or "no drift counted"


def _judge(marking: Marking, rule: Rule, budget: Budget) -> list[tuple[str, str]]:
    """Every check as (word, reason), the most telling first; the worst word decides."""
    out: list[tuple[str, str]] = []
    c = budget.conditions
    here = format_temperature_range(c.temp_min_c, c.temp_max_c)
    if rule.safety:
        out.append(_safety(marking, rule, c.position))
    if budget.over_temperature:
        out.append(("unfit", budget.over_temperature))
    if budget.out_of_range:
        out.append(("unfit" if rule.value_critical else "marginal",
                    budget.out_of_range + ("" if rule.value_critical else "; the value there is a guess")))

    kind = kind_of(marking)
    loss_only = rule.sides == "loss"
    t = budget.temperature
    family = marking.dielectric.family if marking.dielectric else None
    if t is None:
        if rule.value_critical or (family is None and not (rule.safety and marking.safety_class)):
            fact = next((m for m in budget.missing if "dielectric" in m or "temperature" in m), "dielectric")
            out.append(("unknown", f"not known how it moves with temperature: {fact} missing"))
    else:
        drift = budget.drift_minus_pct if loss_only else max(budget.drift_minus_pct, budget.drift_plus_pct)
        shown = pm(budget.drift_minus_pct, Decimal(0) if loss_only else budget.drift_plus_pct)
        word = _level(drift, rule.drift_fit_pct, rule.drift_marginal_pct)
        limit = rule.drift_fit_pct if word == "fit" else rule.drift_marginal_pct
        verdict = (f"within {rule.name}'s {pct(limit)} % for {word}" if word != "unfit"
                   else f"past {rule.name}'s {pct(limit)} % for marginal")
        out.append((word, f"{t.headline}; over {here} for {format_number(c.years)} years expect a drift of up"
                    f" to {shown} ({_breakdown(budget, loss_only)}), {verdict}"))
        if budget.tolerance is None:
            if rule.value_critical:
                out.append(("unknown", "the tolerance is not marked"))
        else:
            total = budget.total_minus_pct if loss_only else max(budget.total_minus_pct, budget.total_plus_pct)
            shown = pm(budget.total_minus_pct, Decimal(0) if loss_only else budget.total_plus_pct)
            word = _level(total, rule.total_fit_pct, rule.total_marginal_pct)
            limit = rule.total_fit_pct if word == "fit" else rule.total_marginal_pct
            verdict = (f"within {rule.name}'s {pct(limit)} % for {word}" if word != "unfit"
                       else f"past {rule.name}'s {pct(limit)} % for marginal")
            out.append((word, f"with the tolerance ({budget.tolerance.basis}) up to {shown} in all, {verdict}"))

    if rule.min_capacitance_pf is not None:
        if marking.capacitance_pf is None:
            out.append(("unknown", "the capacitance is not known"))
        elif marking.capacitance_pf < rule.min_capacitance_pf:
            out.append(("unfit", f"{format_capacitance(marking.capacitance_pf)} is too small for {rule.name}"
                        f" (at least {format_capacitance(rule.min_capacitance_pf)})"))
    if kind is None and family == "ceramic":
        # class unknown: the worse of the two classes, unless the value matters
        word = max((rule.kind_word("ceramic-1"), rule.kind_word("ceramic-2")), key=WORD_ORDER.index)
        if rule.value_critical:
            out.append(("unknown", "a ceramic of unknown class (1 or 2): mark its dielectric code"))
        else:
            out.append((word, f"a ceramic of unknown class: either class is {word} for {rule.name}"))
    elif kind is None:
        if not (rule.safety and marking.safety_class):
            out.append(("unknown", "the dielectric or family is not known"))
    else:
        word = rule.kind_word(kind)
        if word == "unfit":
            out.append((word, f"{_kind_name(kind)} does not belong in {rule.name} ({rule.description})"))
        elif word == "marginal":
            out.append((word, f"{_kind_name(kind)} is at best marginal for {rule.name} ({rule.description})"))
    if is_polarised(family, marking.polarity):
        if rule.polarised == "unfit":
            out.append(("unfit", f"polarised part: {rule.name} puts AC or reversal on it"))
        elif rule.polarised == "marginal":
            out.append(("marginal", "polarised part: only where a steady DC bias keeps it the right way round"))
        else:
            out.append(("fit", "polarised part: observe the polarity"))
    if budget.voltage is not None:
        out.append((budget.voltage.word, budget.voltage.reason))
    elif c.working_v is not None and marking.voltage_v is None:
        out.append(("unknown", "the rated voltage is not marked"))
    return out


def _decide(checks: list[tuple[str, str]]) -> str:
    words = {w for w, _ in checks}
    if "unfit" in words:
        return "unfit"
    if "unknown" in words:
        return "unknown"
    return "marginal" if "marginal" in words else "fit"


def grade(marking: Marking, application: str, conditions: Conditions = Conditions(), *,
          rules: Rules | None = None, budget: Budget | None = None) -> Grade:
    """Grade one part for one application.

    The first reason reads ``"<word> for <application>: ..."``; the reasons that decided come
    first, then the rest. Mains grades always carry the safety caution.

    Raises:
        BadValue: the application is not one of :data:`APPLICATIONS`.
    """
    rules = rules or load_rules()
    if application not in rules.rows:
        raise BadValue("application", application, "one of " + ", ".join(rules.rows))
    rule = rules[application]
    budget = budget or worst_case(marking, conditions)
    checks = _judge(marking, rule, budget)
    word = _decide(checks)
    deciding = [r for w, r in checks if w == word]
    others = [r for w, r in checks if w != word]
    if not deciding:  # every check passed: lead with the budget line
        deciding, others = others[:1], others[1:]
    reasons = [f"{word} for {application}: {deciding[0]}"] + deciding[1:] + others
    reasons += list(budget.notes)
    if rule.safety:
        reasons.append(MAINS_CAUTION)
    return Grade(application, word, tuple(reasons), budget, deciding=len(deciding))


def grade_all(marking: Marking, conditions: Conditions = Conditions(), *,
              rules: Rules | None = None) -> dict[str, Grade]:
    """Grades for every application, in :data:`APPLICATIONS` order (one budget shared)."""
    rules = rules or load_rules()
    budget = worst_case(marking, conditions)
    return {name: grade(marking, name, conditions, rules=rules, budget=budget) for name in rules.rows}


def conditions_from_text(temp: str | None = None, volts: str | None = None,
                         years: str | None = None) -> Conditions:
    """Conditions from what a user typed (``--temp 0..50``, ``--volts 12``, ``--years 10``).

    Raises:
        BadValue: a value does not parse, naming the option.

    >>> conditions_from_text("-20..60", "12", "5").describe()
    '−20…+60 °C, 5 years, 12 V working'
    """
    from stock.units import parse_temperature_range
    from stock.markings.typed_values import parse_voltage

    low, high = parse_temperature_range(temp, "--temp") if temp else (Decimal(0), Decimal(50))
    working = parse_voltage(volts, "--volts") if volts else None
    life = Decimal(10)
    if years is not None:
        try:
            life = Decimal(str(years).strip())
        except ArithmeticError:
            raise BadValue("--years", str(years), "a service life in years such as 10 or 2.5") from None
        if not life.is_finite() or life < 0:
            raise BadValue("--years", str(years), "a service life in years such as 10 or 2.5")
    return Conditions(low, high, working, life)


__all__ = [
    "APPLICATIONS", "MAINS_CAUTION", "REFERENCE_C", "Budget", "Conditions", "Grade",
    "Term", "VoltageCheck", "conditions_from_text", "grade", "grade_all", "kind_of", "worst_case",
]

