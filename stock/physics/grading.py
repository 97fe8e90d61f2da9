"""Each part's fitness for each job, graded from its worst-case capacitance budget.

For a marking and the operating conditions (temperature range, default 0…+50 °C, reference
+25 °C; working voltage; service life, default 10 years) :func:`worst_case` works out each term on
its own, in % of the nominal value, down (loss) and up (gain):

- **tolerance**: the initial tolerance as marked;
- **temperature**: Class 1 (and families with a linear typical α): α ± its tolerance times the
  temperature offset, worst corner of α range × (T − 25 °C) range. Class 2: the code's whole change
  window: EIA-198 promises the window over the rated range and nothing tighter over part of it.
  Families with a typical window (films, tantalum) are scaled to the range when their curve is
  roughly linear (:mod:`stock.physics.stability`), whole otherwise;
- **ageing**: Class 2 only: down, the rate per decade-hour times the decades from the 1000 h
  referee time to the end of the life; up, the de-ageing after soldering (the part starts above
  its nominal);
- **DC bias**: Class 2 only, the case-size model of :func:`stock.physics.stability.dc_bias_loss_pct`.

The terms **compound**: the value at the worst corner is C·(1 − a)(1 − b)… on the loss side and
C·(1 + a)(1 + b)… on the gain side, so a loss never passes 100 % and two gains make more than their
sum. The linear sum is shown as a breakdown only. :func:`grade` then checks the budget and the
part's kind, polarity, temperature range, voltage margin and safety class against one row of the
application table (:mod:`stock.physics.applications`).

A grade answers "will this part's value stay where this job needs it": it is ``fit``,
``marginal``, ``unfit`` or ``unknown``. A fact that is not marked but cannot turn the answer by
itself becomes a **doubt** carried with the grade (an unmarked tolerance: "measure before
fitting"); a settled or measured value removes it, and a job whose row says
``needs_marked_tolerance`` makes it ``unknown`` instead. ``unknown`` stays for a missing fact that
could change the answer (no dielectric at all), and the reason says how to settle it. A definite
``unfit`` outranks an ``unknown``. Mains grades go by position (:mod:`stock.markings.safety_classes`):
with none given, a safety part is graded for the positions it may take, and the reason names them.

>>> from stock.decoded import Dielectric, Marking, Tolerance
>>> x7r = Dielectric("X7R", "ceramic", 2, temp_min_c=Decimal(-55), temp_max_c=Decimal(125),
...                  change_minus_pct=Decimal(15), change_plus_pct=Decimal(15))
>>> part = Marking("104K X7R", Decimal(100000), Tolerance(Decimal(10), Decimal(10), "%"), dielectric=x7r)
>>> grade(part, "tuned").word, grade(part, "bypass").word
('unfit', 'fit')
"""

from __future__ import annotations

from dataclasses import dataclass
from decimal import Decimal
from typing import Any

from stock.decoded import Marking
from stock.errors import BadValue
from stock.markings.safety_classes import MAINS_CAUTION, POSITION_NAMES, positions_text, read_safety_class
from stock.markings.typed_values import parse_voltage
from stock.physics.applications import POSITIONS, Rule, Rules, load_rules
from stock.physics.budget import Budget, Conditions, VoltageCheck, kind_of, worst_case
from stock.physics.stability import REFERENCE_C, Term, is_polarised, pct, pm
from stock.units import format_capacitance, format_number, format_temperature_range, parse_temperature_range

APPLICATIONS: tuple[str, ...] = ("tuned", "timing", "signal", "bypass", "bulk", "mains")
WORD_ORDER = ("fit", "marginal", "unfit")
TOLERANCE_DOUBT = "tolerance not marked: measure before fitting where the value matters"


@dataclass(frozen=True)
class Grade:
    """One part's grade for one application, with the reasons (numbers included) and the budget."""
    application: str
    word: str
    reasons: tuple[str, ...]
    budget: Budget | None = None
    deciding: int = 1       # how many of the leading reasons decided the word (the rest inform)
    doubts: tuple[str, ...] = ()    # facts not marked that did not decide the word: settle them

    def to_json(self) -> dict[str, Any]:
        return {"application": self.application, "grade": self.word, "reasons": list(self.reasons),
                "doubts": list(self.doubts)}


def _safety(marking: Marking, rule: Rule, position: str | None = None,
            mains_ac_v: Decimal | None = None) -> tuple[str, str]:
    """The mains check by position (IEC 60384-14, :mod:`stock.markings.safety_classes`)."""
    position = position or (rule.position if rule.position != "any" else None)
    reading = read_safety_class(marking.safety_class) if marking.safety_class else None
    if reading is None:
        return "unfit", "no X/Y safety class (IEC 60384-14) marked: never across the mains or to earth"
    part_ac = marking.voltage_v if marking.voltage_kind == "AC" else None
    may = reading.positions(part_ac, mains_ac_v)
    where_text = positions_text(reading.code, part_ac, mains_ac_v)
    if position is None:
        if not may:
            return "unfit", f"{reading.code} may take no mains position here: {where_text}"
        if may == ("line-line", "line-earth"):
            return "fit", (f"fit {where_text}: a Y class may also take a line–line (X) position, being"
                           " tested harder and failing open (IEC 60384-14)")
        return "fit", f"fit {where_text} (IEC 60384-14)"
    where = POSITION_NAMES[position]
    if position not in may:
        if position == "line-earth":
            return "unfit", f"{reading.code} is an X class only: a {where} position needs a Y class (IEC 60384-14)"
        return "unfit", f"{reading.code} may not take a {where} position: {where_text}"
    return "fit", f"{reading.code} may take a {where} position (IEC 60384-14)"


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


SETTLE_HINT = "read it off the part or the maker's sheet and settle the bin (stock settle BIN --marking '…')"


def _budget_checks(marking: Marking, rule: Rule, budget: Budget, measured: bool,
                   out: list[tuple[str, str]], doubts: list[str]) -> None:
    """The drift check, then the whole-budget check (or the tolerance doubt), into ``out``."""
    c = budget.conditions
    here = format_temperature_range(c.temp_min_c, c.temp_max_c)
    loss_only = rule.sides == "loss"
    t = budget.temperature
    drift = budget.drift_minus_pct if loss_only else max(budget.drift_minus_pct, budget.drift_plus_pct)
    shown = pm(budget.drift_minus_pct, Decimal(0) if loss_only else budget.drift_plus_pct)
    word = _level(drift, rule.drift_fit_pct, rule.drift_marginal_pct)
    limit = rule.drift_fit_pct if word == "fit" else rule.drift_marginal_pct
    verdict = (f"within {rule.name}'s {pct(limit)} % for {word}" if word != "unfit"
               else f"past {rule.name}'s {pct(limit)} % for marginal")
    out.append((word, f"{t.headline}; over {here} for {format_number(c.years)} years expect a drift of up"
                f" to {shown} ({_breakdown(budget, loss_only)}, compounded), {verdict}"))
    if budget.tolerance is None:
        if not rule.value_critical:
            return
        if measured:
            out.append(("fit", "the value was measured or settled: no tolerance doubt"))
        elif rule.needs_marked_tolerance:
            out.append(("unknown", f"the tolerance is not marked, and {rule.name} demands a marked one"
                        " (needs_marked_tolerance): measure the part and settle it with --value"))
        else:
            doubts.append(TOLERANCE_DOUBT)
        return
    total = budget.total_minus_pct if loss_only else max(budget.total_minus_pct, budget.total_plus_pct)
    shown = pm(budget.total_minus_pct, Decimal(0) if loss_only else budget.total_plus_pct)
    word = _level(total, rule.total_fit_pct, rule.total_marginal_pct)
    limit = rule.total_fit_pct if word == "fit" else rule.total_marginal_pct
    verdict = (f"within {rule.name}'s {pct(limit)} % for {word}" if word != "unfit"
               else f"past {rule.name}'s {pct(limit)} % for marginal")
    out.append((word, f"with the tolerance ({budget.tolerance.basis}) up to {shown} in all"
                f" (compounded), {verdict}"))


def _kind_checks(marking: Marking, rule: Rule, out: list[tuple[str, str]]) -> None:
    kind = kind_of(marking)
    family = marking.dielectric.family if marking.dielectric else None
    if kind is None and family == "ceramic":
        # class unknown: the worse of the two classes, unless the value matters
        word = max((rule.kind_word("ceramic-1"), rule.kind_word("ceramic-2")), key=WORD_ORDER.index)
        if rule.value_critical and word != "unfit":
            out.append(("unknown", "a ceramic of unknown class (1 or 2): read its dielectric code (C0G,"
                        " X7R …) off the part or its sheet and settle the bin with --marking"))
        elif rule.value_critical:
            out.append(("unknown", "a ceramic of unknown class (1 or 2): Class 1 would do, Class 2 would"
                        " not; read its dielectric code and settle the bin with --marking"))
        else:
            out.append((word, f"a ceramic of unknown class: either class is {word} for {rule.name}"))
    elif kind is None:
        if not (rule.safety and marking.safety_class):
            out.append(("unknown", f"the dielectric or family is not known: {SETTLE_HINT}"))
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


def _judge(marking: Marking, rule: Rule, budget: Budget,
           measured: bool = False) -> tuple[list[tuple[str, str]], list[str]]:
    """Every check as (word, reason), the most telling first, and the doubts; the worst word decides."""
    out: list[tuple[str, str]] = []
    doubts: list[str] = []
    c = budget.conditions
    if rule.safety:
        out.append(_safety(marking, rule, c.position, c.working_v))
    if budget.over_temperature:
        out.append(("unfit", budget.over_temperature))
    if budget.out_of_range:
        out.append(("unfit" if rule.value_critical else "marginal",
                    budget.out_of_range + ("" if rule.value_critical else "; the value there is a guess")))
    family = marking.dielectric.family if marking.dielectric else None
    if budget.temperature is None:
        if rule.value_critical or (family is None and not (rule.safety and marking.safety_class)):
            fact = next((m for m in budget.missing if "dielectric" in m or "temperature" in m
                         or "Class 2" in m), "dielectric")
            out.append(("unknown", f"not known how it moves with temperature: {fact} missing; {SETTLE_HINT}"))
    else:
        _budget_checks(marking, rule, budget, measured, out, doubts)
    if rule.min_capacitance_pf is not None:
        if marking.capacitance_pf is None:
            out.append(("unknown", f"the capacitance is not known: {SETTLE_HINT}, or measure it (--value)"))
        elif marking.capacitance_pf < rule.min_capacitance_pf:
            out.append(("unfit", f"{format_capacitance(marking.capacitance_pf)} is too small for {rule.name}"
                        f" (at least {format_capacitance(rule.min_capacitance_pf)})"))
    _kind_checks(marking, rule, out)
    if budget.voltage is not None:
        out.append((budget.voltage.word, budget.voltage.reason))
    elif c.working_v is not None and marking.voltage_v is None:
        out.append(("unknown", f"the rated voltage is not marked: {SETTLE_HINT}"))
    return out, doubts


def _decide(checks: list[tuple[str, str]]) -> str:
    words = {w for w, _ in checks}
    if "unfit" in words:
        return "unfit"
    if "unknown" in words:
        return "unknown"
    return "marginal" if "marginal" in words else "fit"


def grade(marking: Marking, application: str, conditions: Conditions = Conditions(), *,
          rules: Rules | None = None, budget: Budget | None = None, measured: bool = False,
          case_size: str | None = None) -> Grade:
    """Grade one part for one application.

    The first reason reads ``"<word> for <application>: ..."``; the reasons that decided come
    first, then the rest, then the doubts. Mains grades always carry the safety caution.

    Args:
        measured: the value was settled or measured: an unmarked tolerance is no doubt.
        case_size: the part's package (``0805``), for the DC-bias model.

    Raises:
        BadValue: the application is not one of :data:`APPLICATIONS`.
    """
    rules = rules or load_rules()
    if application not in rules.rows:
        raise BadValue("application", application, "one of " + ", ".join(rules.rows))
    rule = rules[application]
    budget = budget or worst_case(marking, conditions, case_size=case_size)
    checks, doubts = _judge(marking, rule, budget, measured)
    word = _decide(checks)
    if word not in ("fit", "marginal"):
        doubts = []   # a doubt matters only where the part would otherwise serve
    deciding = [r for w, r in checks if w == word]
    others = [r for w, r in checks if w != word]
    if not deciding:  # every check passed: lead with the budget line
        deciding, others = others[:1], others[1:]
    reasons = [f"{word} for {application}: {deciding[0]}"] + deciding[1:] + others
    reasons += [f"doubt: {d}" for d in doubts]
    reasons += list(budget.notes)
    if rule.safety:
        reasons.append(MAINS_CAUTION)
    return Grade(application, word, tuple(reasons), budget, deciding=len(deciding), doubts=tuple(doubts))


def grade_all(marking: Marking, conditions: Conditions = Conditions(), *,
              rules: Rules | None = None, measured: bool = False,
              case_size: str | None = None) -> dict[str, Grade]:
    """Grades for every application, in :data:`APPLICATIONS` order (one budget shared)."""
    rules = rules or load_rules()
    budget = worst_case(marking, conditions, case_size=case_size)
    return {name: grade(marking, name, conditions, rules=rules, budget=budget, measured=measured)
            for name in rules.rows}


def conditions_from_text(temp: str | None = None, volts: str | None = None,
                         years: str | None = None, position: str | None = None) -> Conditions:
    """Conditions from what a user typed (``--temp 0..50``, ``--volts 12``, ``--years 10``).

    Raises:
        BadValue: a value does not parse, naming the option.

    >>> conditions_from_text("-20..60", "12", "5").describe()
    '−20…+60 °C, 5 years, 12 V working'
    """

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
    return Conditions(low, high, working, life, position.strip().lower() if position else None)


__all__ = [
    "APPLICATIONS", "MAINS_CAUTION", "POSITIONS", "REFERENCE_C", "TOLERANCE_DOUBT", "Budget", "Conditions", "Grade",
    "Term", "VoltageCheck", "conditions_from_text", "grade", "grade_all", "kind_of", "worst_case",
]

