"""How a dielectric's capacitance moves: temperature, ageing, DC bias, and the voltage it may carry.

The figures here are the physics the grading model (:mod:`stock.grading`) sums into a worst-case
budget. Each block names where its numbers come from; ``# from memory of ...`` marks a figure not
confirmed by a published page, ``# common practice, no published source`` a rule of thumb.

- Temperature: Class 1 and Class 2 ceramics carry their own figures in the decoded
  :class:`~stock.decoded.Dielectric` (EIA-198 α ± tolerance, or a change window over a rated range).
  Other families named in words have the typical figures of :data:`FAMILY_DRIFT`.
- Ageing: Class 2 ceramics lose capacitance logarithmically, a fixed percentage per decade of
  hours since their last heating above the Curie point (:data:`AGEING_PER_DECADE_PCT`).
  Counted from the 1000 h referee time at which makers state the tolerance
  (:data:`AGEING_REFERENCE_HOURS`): 10 years ≈ 87 660 h ≈ 1.94 decades past it.
- DC bias: Class 2 ceramics lose capacitance under DC; :func:`dc_bias_loss_pct` is a rough model
  by case size and the working/rated voltage ratio (steep at first, then flattening). A datasheet
  curve always overrides it.
- Derating: :data:`DERATING` says what fraction of the rated voltage each family customarily
  carries.

>>> ageing_loss_pct("X7R", 2, Decimal(10))
Decimal('7.772')
>>> dc_bias_loss_pct("X7R", Decimal(10_000_000), Decimal(5), Decimal(10), "0805")
Decimal('50.2')
>>> dc_bias_loss_pct("X7R", Decimal(10_000_000), Decimal(5), Decimal(10), "1206")
Decimal('21.2')
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, replace
from decimal import Decimal
from typing import Any

from stock.decoded import Dielectric
from stock.markings.ceramic_codes import assumed_tempco_tolerance
from stock.markings.families import FAMILY_FIGURES
from stock.units import format_number, format_temperature_range

REFERENCE_C = Decimal(25)     # the reference temperature of every tempco and window
HOURS_PER_YEAR = Decimal("8766")  # 365.25 days × 24 h

# Class 2 tolerances are stated at a referee time of 1000 h after the last heating ([EIA-198];
# from memory of EIA-521 / IEC 60384-9 ageing annex practice, [ageing-maker-notes] describes the
# logarithmic law and de-ageing). Soldering resets the clock: before 1000 h the part sits above
# its nominal (de-aged, see DEAGEING_DECADES), after it the ageing loss accrues below.
AGEING_REFERENCE_HOURS = Decimal(1000)


@dataclass(frozen=True)
class FamilyDrift:
    """Typical temperature behaviour of a family named in words (not a ceramic code).

    Either a linear tempco (``tempco_ppm_per_k`` ± ``tempco_tol_ppm_per_k``) or a change window
    (``change_minus_pct``/``change_plus_pct``) over ``temp_min_c``…``temp_max_c``, or both. ``linear``
    says whether a window may be scaled down to a narrower range (roughly linear curve) or applies
    whole (non-linear: the cold end of an electrolytic).
    """

    family: str
    temp_min_c: Decimal | None
    temp_max_c: Decimal | None
    tempco_ppm_per_k: Decimal | None = None
    tempco_tol_ppm_per_k: Decimal | None = None
    change_minus_pct: Decimal | None = None
    change_plus_pct: Decimal | None = None
    linear: bool = True
    source: str = ""


# The one family table lives with the names (stock.markings.families, each figure sourced there);
# this is the same table in the shape the budget reads.
FAMILY_DRIFT: dict[str, FamilyDrift] = {
    name: FamilyDrift(name, f.temp_min_c, f.temp_max_c, f.tempco, f.tempco_tol, f.change_minus_pct,
                      f.change_plus_pct, f.linear, f.source)
    for name, f in FAMILY_FIGURES.items() if name != "ceramic"
}

def temperature_figures(dielectric) -> FamilyDrift | None:
    """The temperature figures to use for a dielectric: its own, else its family's typical ones.

    A dielectric decoded with figures keeps them (the ``linear`` flag still comes from the family
    table); a family named without figures takes :data:`FAMILY_DRIFT`; None when neither exists.

    >>> from stock.decoded import Dielectric
    >>> temperature_figures(Dielectric("mica", "mica")).tempco_ppm_per_k
    Decimal('40')
    """
    if dielectric is None:
        return None
    typical = None if dielectric.family == "ceramic" else FAMILY_DRIFT.get(dielectric.family)
    d = dielectric
    if d.tempco_ppm_per_k is None and d.change_minus_pct is None:
        return typical
    return FamilyDrift(
        family=d.family,
        temp_min_c=d.temp_min_c if d.temp_min_c is not None else (typical.temp_min_c if typical else None),
        temp_max_c=d.temp_max_c if d.temp_max_c is not None else (typical.temp_max_c if typical else None),
        tempco_ppm_per_k=d.tempco_ppm_per_k, tempco_tol_ppm_per_k=d.tempco_tol_ppm_per_k,
        change_minus_pct=d.change_minus_pct, change_plus_pct=d.change_plus_pct,
        linear=d.family != "ceramic" and (typical is None or typical.linear),
        source=d.source)


def assumed_tempco_tol(alpha: Decimal) -> Decimal:
    """A tempco tolerance for an α given without one (an old name: N750, P100).

    The one table: :func:`stock.markings.ceramic_codes.assumed_tempco_tolerance` (the tolerance of
    the EIA-198 code the old name is sold as).

    >>> assumed_tempco_tol(Decimal(-150)), assumed_tempco_tol(Decimal(-750)), assumed_tempco_tol(Decimal(-2200))
    (Decimal('30'), Decimal('120'), Decimal('500'))
    """
    return assumed_tempco_tolerance(alpha)[0]


# Class 2/3 ceramic ageing, % capacitance lost per decade of hours. A worst-case budget takes the
# high end of the published ranges: X7R/X5R 1.5…4 %, Z5U 4…6 %, Y5V 6…10 % per decade-hour (maker
# ageing notes: [mlcc-selection-article], [ageing-blog], [ageing-maker-notes]); [ageing-faq] gives
# maxima X7R 2, X5R 2.5, Z5U 7, Y5V 7 %. The larger of the two is used: X7R 4, X5R 4, Z5U 7
# ([ageing-faq]), Y5V 10.
AGEING_PER_DECADE_PCT: dict[str, Decimal] = {
    "X7R": Decimal("4"),    # top of the published 1.5…4 % range
    "X5R": Decimal("4"),    # top of the published 1.5…4 % range ([mlcc-selection-article]: 5–7 %)
    "Z5U": Decimal("7"),    # [ageing-faq] maximum, above the 4…6 % range
    "Y5V": Decimal("10"),   # top of the published 6…10 % range
}

# By the EIA-198 change letter, for Class 2 codes not listed above: windows up to ±15 % age like
# X7R/X5R, wider windows like the high-K Z5U/Y5V. From memory of maker ageing tables
# ([mlcc-selection-article], [ageing-blog]).
AGEING_BY_CHANGE_LETTER_PCT: dict[str, Decimal] = {
    "A": Decimal("4"), "B": Decimal("4"), "C": Decimal("4"), "D": Decimal("4"),
    "E": Decimal("4"), "F": Decimal("4"), "P": Decimal("4"), "R": Decimal("4"),
    "L": Decimal("4"),
    "S": Decimal("6"),      # ±22 %: between the two groups (from memory)
    "T": Decimal("6"),      # +22/−33 % (from memory)
    "U": Decimal("7"),      # +22/−56 % (as Z5U)
    "V": Decimal("10"),     # +22/−82 % (as Y5V)
}
AGEING_UNKNOWN_CLASS2_PCT = Decimal("10")  # a Class 2 part of unknown code: the worst listed rate

# After soldering (heat above the Curie point) a Class 2 part is de-aged: its value starts above
# the 1000 h nominal and ages down. Maker post-solder limits of about +18/−10 % for a ±10 % X7R (from
# memory of maker ageing notes, [ageing-maker-notes]) put it up to about 8 % above nominal: taken
# as the ageing rate over the two decades from 10 h after soldering to the 1000 h referee time
# (8 % at X7R's 4 %).
DEAGEING_DECADES = Decimal(2)


def ageing_rate_pct(code: str | None, klass: int | None) -> Decimal:
    """% per decade-hour a ceramic loses with age; 0 for Class 1 ([ageing-faq]: C0G none).

    >>> ageing_rate_pct("X7R", 2), ageing_rate_pct("X6S", 2), ageing_rate_pct("C0G", 1)
    (Decimal('4'), Decimal('6'), Decimal('0'))
    """
    if klass != 2:
        return Decimal(0)
    key = (code or "").upper()
    if key in AGEING_PER_DECADE_PCT:
        return AGEING_PER_DECADE_PCT[key]
    if len(key) == 3 and key[2] in AGEING_BY_CHANGE_LETTER_PCT:
        return AGEING_BY_CHANGE_LETTER_PCT[key[2]]
    return AGEING_UNKNOWN_CLASS2_PCT


def ageing_decades(years: Decimal) -> Decimal:
    """Decades of hours from the 1000 h referee time to the end of the service life (≥ 0).

    >>> ageing_decades(Decimal(10))
    Decimal('1.943')
    """
    hours = years * HOURS_PER_YEAR
    if hours <= AGEING_REFERENCE_HOURS:
        return Decimal(0)
    return Decimal(str(round(math.log10(hours / AGEING_REFERENCE_HOURS), 3)))


def ageing_loss_pct(code: str | None, klass: int | None, years: Decimal) -> Decimal:
    """Capacitance lost to ageing over a service life, in % (Class 2 only).

    >>> ageing_loss_pct("Y5V", 2, Decimal(10))
    Decimal('19.430')
    """
    return ageing_rate_pct(code, klass) * ageing_decades(years)


# DC-bias loss of Class 2 MLCCs at the full rated voltage, by EIA case size (inch code). From memory
# of published maker DC-bias curves for high-capacitance X7R/X5R parts, anchored to [dc-bias-note]
# (10 µF 10 V X7R at 5 V: 0805 keeps 50 %, 1206 keeps 93 %) and [effective-capacitance-tool] (35–65 %
# loss at rated, worse in small cases). The 0805 figure meets [dc-bias-note]'s point; the larger
# cases stay well above its 1206 point (conservative: one part's curve is not every maker's). Not a published table.
DC_BIAS_LOSS_BY_CASE_PCT: dict[str, Decimal] = {
    "01005": Decimal(85), "0201": Decimal(85),
    "0402": Decimal(80),
    "0603": Decimal(75),
    "0805": Decimal(71),    # [dc-bias-note]: 50 % lost at half rated (71 × √0.5 ≈ 50)
    "1206": Decimal(30),    # [dc-bias-note]'s part keeps 93 % at half rated; 30 keeps a wide margin
    "1210": Decimal(25),
    "1808": Decimal(22), "1812": Decimal(20),
    "2220": Decimal(15), "2225": Decimal(15),
}
# Case unknown: the worst small case for the value (conservative). Parts of 10 nF or less lose
# little in any case ([dc-bias-note]: negligible at a 2× margin): 20 % at rated whatever the case.
DC_BIAS_UNKNOWN_CASE_PCT = Decimal(80)
DC_BIAS_SMALL_VALUE_PF = Decimal(10_000)
DC_BIAS_SMALL_VALUE_PCT = Decimal(20)
# High-K codes (change letters U, V: Z5U, Y5V) lose more: from memory, 70–90 % at rated.
DC_BIAS_HIGH_K_AT_RATED_PCT = Decimal(80)
DC_BIAS_LIMITS = ("a rough model for Class 2 MLCCs by case size, loss ∝ √(working/rated) up to the"
                  " case's loss at rated (from memory of published curves, anchored to two data points);"
                  " real loss depends on maker and part — a datasheet curve overrides it")

# metric case codes (mm) with an M or "metric": 1005M = 0402 inch (EIA/IEC 60115 pairs, from memory)
_METRIC = {"0402": "01005", "0603": "0201", "1005": "0402", "1608": "0603", "2012": "0805", "3216": "1206",
           "3225": "1210", "4520": "1808", "4532": "1812", "5750": "2220", "5763": "2225"}
_METRIC_CASE = re.compile(r"(\d{4})\s*(?:M|metric)", re.IGNORECASE)


def read_case_size(text: str | None) -> str | None:
    """The EIA inch case code a package text names (``0805``, ``SMD 1206``, ``2012M``); None if none.

    >>> read_case_size("0805"), read_case_size("SMD 1206"), read_case_size("3216 metric"), read_case_size("TO-220")
    ('0805', '1206', '1206', None)
    """
    if not text:
        return None
    metric = _METRIC_CASE.search(text)
    if metric and metric[1] in _METRIC:
        return _METRIC[metric[1]]
    found = re.search(r"(?<!\d)(01005|0201|0402|0603|0805|1206|1210|1808|1812|2220|2225)(?!\d)", text)
    return found[1] if found else None


def dc_bias_loss_at_rated_pct(code: str | None, capacitance_pf: Decimal | None,
                              case_size: str | None = None) -> tuple[Decimal, str]:
    """A Class 2 MLCC's DC-bias loss at its full rated voltage, in %, and what it was taken from.

    >>> dc_bias_loss_at_rated_pct("X7R", Decimal(10_000_000), "1206")
    (Decimal('30'), 'case 1206')
    >>> dc_bias_loss_at_rated_pct("X7R", Decimal(10_000_000))
    (Decimal('80'), 'case size unknown: the worst small case assumed')
    """
    key = (code or "").upper()
    high_k = len(key) == 3 and key[2] in "UV"
    if case_size in DC_BIAS_LOSS_BY_CASE_PCT:
        loss, basis = DC_BIAS_LOSS_BY_CASE_PCT[case_size], f"case {case_size}"
    else:
        loss, basis = DC_BIAS_UNKNOWN_CASE_PCT, "case size unknown: the worst small case assumed"
    if capacitance_pf is not None and capacitance_pf <= DC_BIAS_SMALL_VALUE_PF:
        loss, basis = min(loss, DC_BIAS_SMALL_VALUE_PCT), "10 nF or less (S41: little loss)"
    if high_k:
        loss, basis = max(loss, DC_BIAS_HIGH_K_AT_RATED_PCT), f"a high-K {key}"
    return loss, basis


def dc_bias_loss_pct(code: str | None, capacitance_pf: Decimal | None, working_v: Decimal,
                     rated_v: Decimal, case_size: str | None = None) -> Decimal:
    """Approximate % of capacitance a Class 2 MLCC loses at a DC working voltage.

    loss = loss_at_rated(case) × √min(working / rated, 1): steep at first, then flattening, as the
    published curves run. See :data:`DC_BIAS_LIMITS` and :func:`dc_bias_loss_at_rated_pct`.

    >>> dc_bias_loss_pct("Y5V", Decimal(100000), Decimal(16), Decimal(16))
    Decimal('80')
    """
    if rated_v <= 0:
        raise ValueError(f"rated voltage must be positive, got {rated_v}")
    ratio = min(max(working_v, Decimal(0)) / rated_v, Decimal(1))
    at_rated, _ = dc_bias_loss_at_rated_pct(code, capacitance_pf, case_size)
    if ratio == 1:
        return at_rated
    return (at_rated * ratio.sqrt()).quantize(Decimal("0.1"))


@dataclass(frozen=True)
class Derating:
    """The fraction of rated voltage a family customarily carries, and where the rule comes from."""

    fraction: Decimal
    rule: str
    source: str


# Voltage derating per family (docs/sources.md: derating pages ([tantalum-derating-qa],
# [polymer-derating-qa], [dc-bias-note])). Keys are FAMILIES, plus "ceramic-1" and "ceramic-2" for
# the ceramic classes.
DERATING: dict[str, Derating] = {
    "tantalum": Derating(Decimal("0.5"), "MnO₂ tantalum at ≤ 50 % of rated up to 85 °C",
                         "S39, S73 (common practice)"),
    "aluminium-electrolytic": Derating(Decimal("0.8"), "aluminium electrolytic at ≤ 80 % of rated",
                                       "from memory"),
    "bipolar-electrolytic": Derating(Decimal("0.8"), "bipolar electrolytic at ≤ 80 % of rated",
                                     "from memory (as aluminium)"),
    "ceramic-2": Derating(Decimal("0.5"), "Class 2 MLCC rated ≥ 2× working (to keep its capacitance)",
                          "S41, S42"),
    "ceramic-1": Derating(Decimal("0.8"), "C0G/Class 1 at ≤ 80 % of rated (50–80 % customary)",
                          "from memory"),
    "double-layer": Derating(Decimal("0.9"), "double-layer at ≤ 90 % of rated", "from memory"),
}
_FILM_DERATING = Derating(Decimal("0.8"), "film at ≤ 80 % of rated DC; check AC and pulse ratings",
                          "from memory")
_DEFAULT_DERATING = Derating(Decimal("0.8"), "≤ 80 % of rated", "common practice, no published source")


def derating_for(family: str | None, klass: int | None, rated_v: Decimal | None = None) -> Derating:
    """The derating rule for a family (polymer tantalum depends on the rated voltage: [polymer-derating-qa]).

    >>> derating_for("tantalum-polymer", None, Decimal(6)).fraction
    Decimal('0.9')
    >>> derating_for("tantalum-polymer", None, Decimal(16)).fraction
    Decimal('0.8')
    """
    if family == "tantalum-polymer":
        # [polymer-derating-qa]: derate 10 % if rated ≤ 10 V, 20 % above, to 105 °C
        if rated_v is not None and rated_v <= 10:
            return Derating(Decimal("0.9"), "polymer tantalum rated ≤ 10 V at ≤ 90 % of rated", "S40")
        return Derating(Decimal("0.8"), "polymer tantalum rated > 10 V at ≤ 80 % of rated", "S40")
    if family == "ceramic":
        return DERATING["ceramic-2" if klass == 2 else "ceramic-1"]
    if family in DERATING:
        return DERATING[family]
    if family in ("polystyrene", "polypropylene", "polyester", "polyethylene-naphthalate",
                  "polyphenylene-sulfide", "polycarbonate", "ptfe", "paper"):
        return _FILM_DERATING
    return _DEFAULT_DERATING


@dataclass(frozen=True)
class HotDerating:
    """Above ``knee_c`` the rated voltage itself falls, linearly, to ``fraction_at_end`` of it at ``end_c``."""

    knee_c: Decimal
    end_c: Decimal
    fraction_at_end: Decimal
    source: str


# The families whose rated voltage falls when hot (the "category voltage"). MnO₂ tantalum: about
# two thirds of rated at +125 °C from +85 °C ([tantalum-derating-qa], [forum-tantalum-derating]:
# common practice); polymer tantalum the same above +105 °C (from memory of maker notes,
# [polymer-derating-qa] stops at 105 °C); film parts rated at +85 °C
# (from memory: polypropylene about 70 % at +105 °C, polyester about half at +125 °C).
HOT_DERATING: dict[str, HotDerating] = {
    "tantalum": HotDerating(Decimal(85), Decimal(125), Decimal(2) / Decimal(3), "S39, S73 (common practice)"),
    "tantalum-polymer": HotDerating(Decimal(105), Decimal(125), Decimal(2) / Decimal(3), "from memory"),
    "polypropylene": HotDerating(Decimal(85), Decimal(105), Decimal("0.7"), "from memory"),
    "polyester": HotDerating(Decimal(85), Decimal(125), Decimal("0.5"), "from memory"),
}


def category_fraction(family: str | None, temp_max_c: Decimal) -> tuple[Decimal, HotDerating | None]:
    """The fraction of its rated voltage a part may carry at all at ``temp_max_c`` (1 below the knee).

    >>> category_fraction("tantalum", Decimal(125))[0].quantize(Decimal("0.001")), category_fraction("tantalum", Decimal(85))[0]
    (Decimal('0.667'), Decimal('1'))
    >>> category_fraction("tantalum", Decimal(105))[0].quantize(Decimal("0.001"))
    Decimal('0.833')
    """
    rule = HOT_DERATING.get(family or "")
    if rule is None or temp_max_c <= rule.knee_c:
        return Decimal(1), None
    share = min((temp_max_c - rule.knee_c) / (rule.end_c - rule.knee_c), Decimal(1))
    return 1 - share * (1 - rule.fraction_at_end), rule


# Shelf-life cautions per family: not in the budget, printed with the grade.
SHELF_LIFE: dict[str, str] = {
    # from memory of maker application notes: the oxide degrades unpowered
    "aluminium-electrolytic": "after years on the shelf, reform before use (bring up slowly through a"
                              " resistor); leakage is high at first",
    "bipolar-electrolytic": "after years on the shelf, reform before use; leakage is high at first",
    # from memory: old paper capacitors absorb moisture and leak
    "paper": "old paper parts take up moisture and leak; check leakage at working voltage",
    # [polystyrene-article]: irreversible shift if heated past about 70 °C
    "polystyrene": "polystyrene shifts for good if heated past about 70 °C: solder quickly and heat-sink"
                   " the leads",
    # [ageing-maker-notes]: de-aged by heating above the Curie point
    "ceramic-2": "soldering heat de-ages a Class 2 part: its value rises, then ages down again",
}


def is_polarised(family: str | None, polarity: str | None) -> bool:
    """True for parts that must see one polarity (electrolytics, tantalum, double-layer, any marked).

    >>> is_polarised("tantalum", None), is_polarised("bipolar-electrolytic", None)
    (True, False)
    """
    if family == "bipolar-electrolytic":
        return False
    return polarity is not None or family in (
        "tantalum", "tantalum-polymer", "aluminium-electrolytic", "double-layer")


@dataclass(frozen=True)
class Term:
    """One term of the budget: how far down (``minus_pct``) and up (``plus_pct``) it may move the value."""

    name: str
    minus_pct: Decimal
    plus_pct: Decimal
    basis: str
    headline: str = ""      # the short form a grade's reason quotes ("X7R may move ±15 % over …")

    def to_json(self) -> dict[str, Any]:
        return {"name": self.name, "minus_pct": float(self.minus_pct), "plus_pct": float(self.plus_pct),
                "basis": self.basis}



def pct(value: Decimal) -> str:
    """A percentage for people: 3 decimals below 1 %, 2 below 10 %, 1 above.

    >>> pct(Decimal("0.075")), pct(Decimal("3.886")), pct(Decimal("28.886"))
    ('0.075', '3.89', '28.9')
    """
    places = 3 if value < 1 else 2 if value < 10 else 1
    return format_number(round(value, places))


def pm(minus: Decimal, plus: Decimal) -> str:
    """``±15 %`` or ``+22/−82 %`` (``−3.89 %`` when only one side moves).

    >>> pm(Decimal(15), Decimal(15)), pm(Decimal(82), Decimal(22)), pm(Decimal("3.886"), Decimal(0))
    ('±15 %', '+22/−82 %', '−3.89 %')
    """
    if minus == plus:
        return f"±{pct(plus)} %"
    if plus == 0:
        return f"\u2212{pct(minus)} %"
    if minus == 0:
        return f"+{pct(plus)} %"
    return f"+{pct(plus)}/\u2212{pct(minus)} %"


def _ppm(value: Decimal) -> str:
    return format_number(value)



def _linear_term(code: str, alpha: Decimal, tol: Decimal, t_min: Decimal, t_max: Decimal,
                 basis_note: str) -> Term:
    offsets = (t_min - REFERENCE_C, t_max - REFERENCE_C)
    corners = [a * dt for a in (alpha - tol, alpha + tol) for dt in offsets]
    plus = max(max(corners), Decimal(0)) / 10_000       # ppm → %
    minus = max(-min(corners), Decimal(0)) / 10_000
    span = max(abs(o) for o in offsets)
    headline = f"{code} is {_ppm(alpha)} ± {_ppm(tol)} ppm/K{basis_note}"
    basis = (f"{headline}: over {format_temperature_range(t_min, t_max)} (up to"
             f" {format_number(span)} K from +25 °C) it moves {pm(minus, plus)}")
    return Term("temperature", minus, plus, basis, headline)


def _outside(t_min: Decimal, t_max: Decimal, low: Decimal | None, high: Decimal | None) -> bool:
    return (low is not None and t_min < low) or (high is not None and t_max > high)


def temperature_term(d: Dielectric | None, t_min: Decimal,
                     t_max: Decimal) -> tuple[Term | None, str | None, str | None]:
    """The temperature term of a budget over ``t_min``…``t_max`` °C, the fact missing, and how the
    range passes the rated one (each None when not so).

    Class 1 and linear typical α: worst corner of (α ± tol) × (T − 25 °C). A window: whole for
    ceramic codes (the code promises nothing tighter), scaled for roughly linear families.
    Figures from :func:`temperature_figures`. A family with both a linear α and
    a window gets the larger of the two (the α is a typical figure, the window a typical bound).
    """
    if d is None:
        return None, "dielectric (temperature behaviour)", None
    here = format_temperature_range(t_min, t_max)
    ceramic = d.family == "ceramic"
    src = temperature_figures(d)
    if src is None:
        what = "Class 2 code (temperature window)" if d.klass == 2 else f"temperature behaviour of {d.code}"
        return None, what, None
    low, high = src.temp_min_c, src.temp_max_c
    out = None
    if _outside(t_min, t_max, low, high):
        out = (f"{d.code} is rated for {format_temperature_range(low, high)} only; {here} runs past it,"
               " where its value is not characterised")
    note = "" if ceramic else " (typical for the family)"
    candidates: list[Term] = []
    if src.tempco_ppm_per_k is not None and not (ceramic and d.klass == 2):
        tol = src.tempco_tol_ppm_per_k
        if tol is None:
            tol = assumed_tempco_tol(src.tempco_ppm_per_k)
            note += f" (tempco tolerance not marked: ±{_ppm(tol)} ppm/K assumed)"
        candidates.append(_linear_term(d.code, src.tempco_ppm_per_k, tol, t_min, t_max, note))
    windowed = src.change_minus_pct is not None and src.change_plus_pct is not None
    if windowed and low is not None and high is not None and not (ceramic and candidates):
        candidates.append(_window_term(d.code, src.change_minus_pct, src.change_plus_pct, low, high,
                                       t_min, t_max, scalable=src.linear, note=note))
    if not candidates:
        what = "Class 2 code (temperature window)" if d.klass == 2 else f"temperature behaviour of {d.code}"
        return None, what, out
    chosen = max(candidates, key=lambda t: max(t.minus_pct, t.plus_pct))
    if src.source:
        chosen = replace(chosen, basis=f"{chosen.basis} [{src.source}]")
    return chosen, None, out


def _window_term(code: str, minus: Decimal, plus: Decimal, low: Decimal, high: Decimal, t_min: Decimal,
                 t_max: Decimal, *, scalable: bool, note: str = "") -> Term:
    rated = format_temperature_range(low, high)
    here = format_temperature_range(t_min, t_max)
    head = f"{code} may move {pm(minus, plus)} over {rated}{note}"
    nearest = min(abs(low - REFERENCE_C), abs(high - REFERENCE_C))
    span = max(abs(t_min - REFERENCE_C), abs(t_max - REFERENCE_C))
    if scalable and nearest > 0 and span < nearest:
        # a roughly linear curve: scale by the offset against the nearer rated end (conservative)
        factor = span / nearest
        m, p = minus * factor, plus * factor
        return Term("temperature", m, p,
                    f"{head}; roughly linear, so over {here} about {pm(m, p)}"
                    f" ({format_number(span)} of {format_number(nearest)} K, scaled)", head)
    return Term("temperature", minus, plus,
                f"{head}; the window is all that is promised, so over {here} the same {pm(minus, plus)}",
                head)



__all__ = [
    "AGEING_PER_DECADE_PCT", "AGEING_REFERENCE_HOURS", "DC_BIAS_LIMITS", "DERATING", "FAMILY_DRIFT",
    "REFERENCE_C", "SHELF_LIFE", "Derating", "FamilyDrift", "Term", "pct", "pm", "temperature_term",
    "ageing_decades", "assumed_tempco_tol", "ageing_loss_pct", "ageing_rate_pct",
    "DEAGEING_DECADES", "HOT_DERATING", "HotDerating", "category_fraction", "dc_bias_loss_at_rated_pct",
    "dc_bias_loss_pct", "derating_for", "is_polarised", "read_case_size", "temperature_figures",
]
