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
- DC bias: Class 2 ceramics lose capacitance under DC; :func:`dc_bias_loss_pct` is a rough linear
  model (loss grows with working/rated voltage). A datasheet curve always overrides it.
- Derating: :data:`DERATING` says what fraction of the rated voltage each family customarily
  carries.

>>> ageing_loss_pct("X7R", 2, Decimal(10))
Decimal('3.886')
>>> dc_bias_loss_pct("X7R", Decimal(100000), Decimal(25), Decimal(50))
Decimal('20.0')
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from decimal import Decimal
from typing import Any

from stock.decoded import Dielectric
from stock.units import format_number, format_temperature_range

REFERENCE_C = Decimal(25)     # the reference temperature of every tempco and window
HOURS_PER_YEAR = Decimal("8766")  # 365.25 days × 24 h

# Class 2 tolerances are stated at a referee time of 1000 h after the last heating (soldering
# resets the clock): from memory of EIA-521 / IEC 60384-9 ageing annex practice ([ageing-maker-notes]
# describes
# the logarithmic law and de-ageing). Ageing before that time is inside the tolerance.
AGEING_REFERENCE_HOURS = Decimal(1000)


@dataclass(frozen=True)
class FamilyDrift:
    """Typical temperature behaviour of a family named in words (not a ceramic code).

    Either a linear tempco (``tempco_ppm_per_k`` ± ``tempco_tol_ppm_per_k``) or a change window
    (``change_minus_pct``/``change_plus_pct``) over ``temp_min_c``…``temp_max_c``. ``linear`` says
    whether a window may be scaled down to a narrower range (roughly linear curve) or applies
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


def _d(text: str) -> Decimal:
    return Decimal(text)


# Typical temperature figures per family. Sources are the keys's list
# (docs/sources.md: dielectric pages ([film-dielectrics-table] and others)): [film-dielectrics-table] = a film
# maker's comparison table, [polystyrene-article] polystyrene article, [silver-mica-overview] silver
# mica overview, [film-capacitor-text] film capacitor text.
FAMILY_DRIFT: dict[str, FamilyDrift] = {
    # [polystyrene-article] gives −125 ppm/K, memory −100…−200: −150 ± 50 covers both; max +85 °C
    # ([polystyrene-white-paper])
    "polystyrene": FamilyDrift("polystyrene", _d("-40"), _d("85"), _d("-150"), _d("50"),
                               source="S33 (−125 ppm/K) and memory (−100…−200 ppm/K)"),
    # linear negative ([film-capacitor-text]); −200 ± 100 ppm/K from memory; [film-dielectrics-table] says
    # ±2.5 % over −55…+105 °C
    "polypropylene": FamilyDrift("polypropylene", _d("-55"), _d("105"), _d("-200"), _d("100"),
                                 source="S68 (linear, negative); α from memory"),
    # [film-dielectrics-table]: ±5 % over −55…+125 °C; positive and only roughly linear (memory)
    "polyester": FamilyDrift("polyester", _d("-55"), _d("125"), change_minus_pct=_d("5"),
                             change_plus_pct=_d("5"), source="S32 (±5 % over range)"),
    # [film-dielectrics-table]: ±5 % over −55…+125 °C
    "polyethylene-naphthalate": FamilyDrift("polyethylene-naphthalate", _d("-55"), _d("125"),
                                            change_minus_pct=_d("5"), change_plus_pct=_d("5"),
                                            source="S32 (±5 % over range)"),
    # [film-dielectrics-table]: ±1.5 % over −55…+140 °C, very flat
    "polyphenylene-sulfide": FamilyDrift("polyphenylene-sulfide", _d("-55"), _d("140"),
                                         change_minus_pct=_d("1.5"), change_plus_pct=_d("1.5"),
                                         source="S32 (±1.5 % over −55…+140 °C)"),
    # from memory: small and flat, 0…+100 ppm/K, taken as 0 ± 100
    "polycarbonate": FamilyDrift("polycarbonate", _d("-55"), _d("125"), _d("0"), _d("100"),
                                 source="from memory (0…+100 ppm/K)"),
    # [film-capacitor-text]: +1/−3 % over the range; range −55…+125 °C from memory
    "ptfe": FamilyDrift("ptfe", _d("-55"), _d("125"), change_minus_pct=_d("3"),
                        change_plus_pct=_d("1"), source="S68 (+1/−3 % over range)"),
    # [silver-mica-overview]: +35…+75 ppm/K, about +50 on average: +55 ± 20 covers the span
    "mica": FamilyDrift("mica", _d("-55"), _d("125"), _d("55"), _d("20"),
                        source="S34 (+35…+75 ppm/K)"),
    # from memory: glass (CY) +140 ± 25 ppm/K
    "glass": FamilyDrift("glass", _d("-55"), _d("125"), _d("140"), _d("25"),
                         source="from memory (+140 ± 25 ppm/K)"),
    # common practice, no published source: paper/oil about ±10 % over −40…+85 °C, non-linear
    "paper": FamilyDrift("paper", _d("-40"), _d("85"), change_minus_pct=_d("10"),
                         change_plus_pct=_d("10"), linear=False,
                         source="common practice, no published source"),
    # [film-dielectrics-table]: ±10 % over −55…+125 °C, roughly linear and positive
    "tantalum": FamilyDrift("tantalum", _d("-55"), _d("125"), change_minus_pct=_d("10"),
                            change_plus_pct=_d("10"), source="S32 (±10 % over −55…+125 °C)"),
    # from memory: similar to MnO2, ±10…20 %; the wider figure taken
    "tantalum-polymer": FamilyDrift("tantalum-polymer", _d("-55"), _d("105"),
                                    change_minus_pct=_d("20"), change_plus_pct=_d("20"),
                                    source="from memory (±10…20 %)"),
    # from memory: −10…−20 % at −40 °C, +5…+10 % at +105 °C; non-linear (cold end)
    "aluminium-electrolytic": FamilyDrift("aluminium-electrolytic", _d("-40"), _d("105"),
                                          change_minus_pct=_d("20"), change_plus_pct=_d("10"),
                                          linear=False, source="from memory (−20 % cold, +10 % hot)"),
    # from memory: as aluminium electrolytics
    "bipolar-electrolytic": FamilyDrift("bipolar-electrolytic", _d("-40"), _d("85"),
                                        change_minus_pct=_d("20"), change_plus_pct=_d("10"),
                                        linear=False, source="from memory (as aluminium)"),
    # from memory: double-layer parts about ±20 % over −25…+70 °C, capacitance falls in the cold
    "double-layer": FamilyDrift("double-layer", _d("-25"), _d("70"), change_minus_pct=_d("20"),
                                change_plus_pct=_d("10"), linear=False,
                                source="from memory (about −20/+10 %)"),
}

def temperature_figures(dielectric) -> FamilyDrift | None:
    """The temperature figures to use for a dielectric: its own, else its family's typical ones.

    A dielectric decoded with figures keeps them (the ``linear`` flag still comes from the family
    table); a family named without figures takes :data:`FAMILY_DRIFT`; None when neither exists.

    >>> from stock.decoded import Dielectric
    >>> temperature_figures(Dielectric("mica", "mica")).tempco_ppm_per_k
    Decimal('55')
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
    """A tempco tolerance for an α given without one (an old name: NP0, N750, P100).

    docs/sources.md: [EIA-198] old names ([parameters-page], [latvian-codes]): the old names map to α only.
    The widest tolerance customary for that α
    in EIA-198 codes is taken. Common practice, no published source.

    >>> assumed_tempco_tol(Decimal(0)), assumed_tempco_tol(Decimal(-750)), assumed_tempco_tol(Decimal(-1500))
    (Decimal('60'), Decimal('120'), Decimal('250'))
    """
    size = abs(alpha)
    return Decimal(60) if size <= 150 else Decimal(120) if size <= 750 else Decimal(250)


# Class 2/3 ceramic ageing, % capacitance lost per decade of hours. [ageing-faq] (a maker's FAQ, maxima);
# disagreements: [mlcc-selection-article] gives X7R ~2.5 %, X5R 5–7 %; [ageing-blog] gives X7R 1–3 %. The
# [ageing-faq] maxima are used.
AGEING_PER_DECADE_PCT: dict[str, Decimal] = {
    "X7R": Decimal("2"),    # [ageing-faq]
    "X5R": Decimal("2.5"),  # [ageing-faq]
    "Z5U": Decimal("7"),    # [ageing-faq]
    "Y5V": Decimal("7"),    # [ageing-faq]
}

# By the EIA-198 change letter, for Class 2 codes not listed above: windows up to ±15 % age like
# X5R, wider windows like the high-K Z5U/Y5V. From memory of maker ageing tables ([mlcc-selection-article],
# [ageing-blog] ranges).
AGEING_BY_CHANGE_LETTER_PCT: dict[str, Decimal] = {
    "A": Decimal("2.5"), "B": Decimal("2.5"), "C": Decimal("2.5"), "D": Decimal("2.5"),
    "E": Decimal("2.5"), "F": Decimal("2.5"), "P": Decimal("2.5"), "R": Decimal("2.5"),
    "L": Decimal("2.5"),
    "S": Decimal("5"),      # ±22 %: between the two groups (from memory)
    "T": Decimal("5"),      # +22/−33 % (from memory)
    "U": Decimal("7"),      # +22/−56 % (as Z5U, [ageing-faq])
    "V": Decimal("7"),      # +22/−82 % (as Y5V, [ageing-faq])
}
AGEING_UNKNOWN_CLASS2_PCT = Decimal("7")  # a Class 2 part of unknown code: the worst listed rate


def ageing_rate_pct(code: str | None, klass: int | None) -> Decimal:
    """% per decade-hour a ceramic loses with age; 0 for Class 1 ([ageing-faq]: C0G none).

    >>> ageing_rate_pct("X7R", 2), ageing_rate_pct("X6S", 2), ageing_rate_pct("C0G", 1)
    (Decimal('2'), Decimal('5'), Decimal('0'))
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
    Decimal('13.601')
    """
    return ageing_rate_pct(code, klass) * ageing_decades(years)


# DC-bias loss of Class 2 MLCCs at the full rated voltage, by capacitance. A rough model, from the
# spread in [dc-bias-note] (≤ 10 nF negligible at 2× margin; 10 µF 0805 loses 50 % at half rated),
# [dc-bias-article] (0603
# 4.7 nF 100 V keeps 30–50 % at rated: low authority) and [effective-capacitance-tool] (35–65 % loss at rated,
# general).
# Common practice, no published source for the exact breakpoints. Case size is unknown from a
# marking, so the figures lean to the small (worse) cases.
DC_BIAS_LOSS_AT_RATED_PCT: tuple[tuple[Decimal, Decimal], ...] = (
    (Decimal(10_000), Decimal(20)),        # ≤ 10 nF
    (Decimal(1_000_000), Decimal(40)),     # ≤ 1 µF
    (Decimal("Infinity"), Decimal(65)),    # larger: the top of [effective-capacitance-tool]'s range
)
# High-K codes (change letters U, V: Z5U, Y5V) lose more: from memory, 70–90 % at rated.
DC_BIAS_HIGH_K_AT_RATED_PCT = Decimal(80)
DC_BIAS_LIMITS = ("a rough linear model for Class 2 MLCCs (loss ∝ working/rated voltage);"
                  " real loss depends on case size, rated voltage and maker — a datasheet curve"
                  " overrides it")


def dc_bias_loss_pct(code: str | None, capacitance_pf: Decimal | None, working_v: Decimal,
                     rated_v: Decimal) -> Decimal:
    """Approximate % of capacitance a Class 2 MLCC loses at a DC working voltage.

    loss = loss_at_rated × min(working / rated, 1). Linear is conservative at low bias against the
    [dc-bias-note] data point (1206 10 µF keeps 93 % at half rated) and about right for small cases (0805
    keeps
    50 %). See :data:`DC_BIAS_LIMITS`.

    >>> dc_bias_loss_pct("Y5V", Decimal(100000), Decimal(16), Decimal(16))
    Decimal('80')
    """
    if rated_v <= 0:
        raise ValueError(f"rated voltage must be positive, got {rated_v}")
    ratio = min(max(working_v, Decimal(0)) / rated_v, Decimal(1))
    key = (code or "").upper()
    if len(key) == 3 and key[2] in "UV":
        at_rated = DC_BIAS_HIGH_K_AT_RATED_PCT
    else:
        cap = capacitance_pf if capacitance_pf is not None else Decimal("Infinity")
        at_rated = next(loss for limit, loss in DC_BIAS_LOSS_AT_RATED_PCT if cap <= limit)
    return (at_rated * ratio).quantize(Decimal("0.1")) if ratio != 1 else at_rated


@dataclass(frozen=True)
class Derating:
    """The fraction of rated voltage a family customarily carries, and where the rule comes from."""

    fraction: Decimal
    rule: str
    source: str


# Voltage derating per family (docs/sources.md: derating pages ([tantalum-derating-qa], [polymer-derating-qa],
# [dc-bias-note])). Keys are FAMILIES, plus "ceramic-1" and
# "ceramic-2" for the ceramic classes.
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
    "dc_bias_loss_pct", "derating_for", "is_polarised", "temperature_figures",
]
