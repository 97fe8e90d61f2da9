"""The shelf's answer to a drifting oscillator: which tempco parts on hand cancel the drift best.

For each tempco on hand (Class 1 ceramics grouped by their nominal α: N150 and P2H together) the
slice that would cancel the drift is worked out (:mod:`stock.compensation`), and the parts whose
value comes nearest it are tried: single parts, and with ``combine`` parallel and series pairs of
that tempco where they come nearer than any single part. A pair's value and net tempco come from
:mod:`stock.combining`, and its candidates from the same pair index :func:`stock.search.find` uses.

Options are ranked by the drift they leave (nominal, in magnitude), then fewest parts, then the
most stock on hand. An option "does it" when it at least halves the drift; when nothing on hand
does, the answer says why, tempco by tempco, and what to buy.
"""

from __future__ import annotations

from dataclasses import dataclass
from decimal import ROUND_HALF_UP, Decimal
from typing import Any

from stock.matching.part_checks import Stocked
from stock.matching.search import linear_tempco_parts
from stock.physics import combining
from stock.physics.compensation import (USEFUL_SHARE, Fit, Purchase, Tank, TempcoSpread, describe_slice, fit,
                                        tempco_spread, what_to_buy)
from stock.store.database import Store
from stock.units import MINUS, format_capacitance, format_number

_KIND_ORDER = {"single": 0, "parallel": 1, "series": 2}
LARGE_SHARE = Decimal("0.25")  # a slice past a quarter of the tank hints at a fault: common practice


@dataclass(frozen=True)
class SlicePart:
    """One bin's share of an option: ``count`` parts of ``capacitance_pf`` of one tempco."""

    bin_id: int
    bin_key: str
    location: str | None
    marking: str
    capacitance_pf: Decimal
    code: str
    tempco_ppm_per_k: Decimal
    spread: TempcoSpread
    count: int
    available: int

    def to_json(self) -> dict[str, Any]:
        return {"bin": self.bin_key, "location": self.location, "marking": self.marking,
                "capacitance_pf": float(self.capacitance_pf), "count": self.count,
                "tempco": self.code, "tempco_ppm_per_k": float(self.tempco_ppm_per_k),
                "tempco_tol_ppm_per_k": float(self.spread.tol_ppm_per_k),
                "tempco_tol_marked": self.spread.marked, "tempco_tol_basis": self.spread.basis,
                "available": self.available}


@dataclass(frozen=True)
class Option:
    """Parts from the shelf fitted as the slice, and what they leave of the drift."""

    kind: str                      # "single", "parallel" or "series"
    parts: tuple[SlicePart, ...]
    cx_pf: Decimal                 # the slice this tempco needs
    result: Fit
    useful: bool                   # at least halves the drift

    @property
    def part_count(self) -> int:
        return sum(p.count for p in self.parts)

    @property
    def spare(self) -> int:
        """How many times over the shelf could supply this option."""
        return min(p.available // p.count for p in self.parts)

    def rank(self) -> tuple[Any, ...]:
        return (abs(self.result.residual_ppm), self.part_count, -self.spare, _KIND_ORDER[self.kind],
                tuple(p.bin_key for p in self.parts))

    def to_json(self) -> dict[str, Any]:
        return {"kind": self.kind, "parts": [p.to_json() for p in self.parts], "cx_pf": float(self.cx_pf),
                "useful": self.useful, **self.result.to_json()}


@dataclass(frozen=True)
class TempcoOnHand:
    """One tempco on the shelf: its codes, how many bins, the slice it needs (None: it cannot help)."""

    alpha: Decimal
    codes: tuple[str, ...]
    bins: int
    cx_pf: Decimal | None
    note: str

    def to_json(self) -> dict[str, Any]:
        return {"tempco_ppm_per_k": float(self.alpha), "codes": list(self.codes), "bins": self.bins,
                "cx_pf": None if self.cx_pf is None else float(self.cx_pf), "note": self.note}


@dataclass(frozen=True)
class Compensation:
    """The whole answer: the tank, the tempcos on hand, the options ranked, and what to buy."""

    tank: Tank
    tempcos: tuple[TempcoOnHand, ...]
    options: tuple[Option, ...]
    purchase: Purchase | None
    explanation: tuple[str, ...]
    assumptions: tuple[str, ...]
    cautions: tuple[str, ...]

    def to_json(self) -> dict[str, Any]:
        """The ``stock compensate --json`` shape (stable contract)."""
        return {"tank": self.tank.to_json(), "tempcos": [t.to_json() for t in self.tempcos],
                "options": [{**o.to_json(), "text": headline(self.tank, o)} for o in self.options],
                "buy": None if self.purchase is None else self.purchase.to_json(),
                "explanation": list(self.explanation), "assumptions": list(self.assumptions),
                "cautions": list(self.cautions)}


def _slice_part(part: Stocked, count: int = 1) -> SlicePart:
    d = part.marking.dielectric
    assert d is not None and d.tempco_ppm_per_k is not None  # linear_tempco_parts gives no other
    return SlicePart(part.bin_id, part.bin_key, part.location, part.marking.text,
                     part.marking.capacitance_pf, d.code, d.tempco_ppm_per_k, tempco_spread(d),  # type: ignore[arg-type]
                     count, part.available)


def _worst(result: Fit) -> Decimal:
    return max(abs(result.residual_low_ppm), abs(result.residual_high_ppm))


def _better(bought: Fit, on_hand: Fit) -> bool:
    """A part to buy is worth naming when it beats the shelf's best both nominally and at worst."""
    return abs(bought.residual_ppm) < abs(on_hand.residual_ppm) and _worst(bought) < _worst(on_hand)


def _useful(tank: Tank, result: Fit) -> bool:
    return abs(result.residual_ppm) <= abs(tank.drift_ppm_per_k) * USEFUL_SHARE


def _singles(tank: Tank, parts: list[Stocked], cx: Decimal, keep: int) -> list[Option]:
    """The single parts nearest the slice: one bin per value and code (the one with most to spare)."""
    best: dict[tuple[Decimal, str], Stocked] = {}
    for part in parts:
        c = part.marking.capacitance_pf
        if c is None or c >= 2 * cx or c >= tank.c_total_pf:  # from 2·Cx on, the drift is no smaller
            continue
        key = (c, part.marking.dielectric.code)  # type: ignore[union-attr]
        if key not in best or part.available > best[key].available:
            best[key] = part
    options = []
    for part in best.values():
        sp = _slice_part(part)
        result = fit(tank, sp.capacitance_pf, sp.tempco_ppm_per_k, sp.spread.tol_ppm_per_k)
        options.append(Option("single", (sp,), cx, result, _useful(tank, result)))
    options.sort(key=Option.rank)
    return options[:keep]


def _pairs(tank: Tank, parts: list[Stocked], cx: Decimal, within: Decimal, keep: int) -> list[Option]:
    """Pairs of one tempco whose value comes nearer the slice than ``within`` pF (the best single's miss)."""
    if within <= 0:
        return []
    by_id = {p.bin_id: p for p in parts}
    index = combining.PairIndex(combining.PairItem(float(p.marking.capacitance_pf), p.bin_id,  # type: ignore[arg-type]
                                                   double=p.available >= 2) for p in parts)
    lo, hi = max(cx - within, cx / 1000), min(cx + within, tank.c_total_pf * Decimal("0.999"))
    options = []
    for kind in combining.PAIR_KINDS:
        query = combining.PairQuery(kind, float(cx), float(lo), float(hi))
        for _, k1, k2 in index.nearest(query, keep):
            a, b = by_id[k1], by_id[k2]
            options.append(_pair_option(tank, kind, a, b, cx))
    return [o for o in options if abs(o.result.value_pf - cx) < within]


def _pair_option(tank: Tank, kind: str, a: Stocked, b: Stocked, cx: Decimal) -> Option:
    pieces = (_slice_part(a, 2),) if a.bin_id == b.bin_id else (_slice_part(a), _slice_part(b))
    one, two = (pieces[0], pieces[0]) if len(pieces) == 1 else pieces
    c1, c2 = one.capacitance_pf, two.capacitance_pf
    value = combining.pair_value(kind, c1, c2)  # type: ignore[arg-type]
    alpha = combining.pair_tempco(kind, c1, one.tempco_ppm_per_k, c2, two.tempco_ppm_per_k)  # type: ignore[arg-type]
    spread = combining.pair_tempco_spread(kind, c1, one.spread.tol_ppm_per_k, c2,  # type: ignore[arg-type]
                                          two.spread.tol_ppm_per_k)
    result = fit(tank, value, alpha, spread)
    return Option(kind, pieces, cx, result, _useful(tank, result))


def _group(parts: list[Stocked]) -> dict[Decimal, list[Stocked]]:
    groups: dict[Decimal, list[Stocked]] = {}
    for part in parts:
        groups.setdefault(part.marking.dielectric.tempco_ppm_per_k, []).append(part)  # type: ignore[union-attr]
    return groups


def _tempco_note(tank: Tank, alpha: Decimal, cx: Decimal | None, found: list[Option]) -> str:
    if alpha == tank.alpha_old:
        return f"the same tempco as the slice ({tank.alpha_old_name}): swapping changes nothing"
    if cx is None:
        if tank.alpha_old == 0:
            return ("adds to this drift: cancelling it needs a "
                    f"{'negative' if tank.needed_pf_ppm < 0 else 'positive'} tempco")
        side = "below" if tank.needed_pf_ppm < 0 else "above"
        return f"adds to this drift: cancelling it needs a tempco {side} the slice's {tank.alpha_old_name}"
    if cx >= tank.c_total_pf:
        return f"would need {describe_slice(cx)}, more than the whole tank"
    if not found:
        return f"slice {describe_slice(cx)}: no part on hand under {describe_slice(2 * cx)} (twice the slice)"
    return f"slice {describe_slice(cx)}"


def compensate(store: Store, tank: Tank, *, combine: bool = False, limit: int = 6,
               per_tempco: int = 2) -> Compensation:
    """The tempco parts on hand that cancel a tank's measured drift, best first.

    Args:
        store: the open store.
        tank: the tank and its drift (:func:`stock.compensation.measure_tank`).
        combine: also try parallel and series pairs of one tempco.
        limit: options returned at most.
        per_tempco: singles (and pairs of each kind) kept per tempco before ranking.
    """
    tempcos, options = [], []
    for alpha, parts in sorted(_group(linear_tempco_parts(store)).items()):
        cx = tank.slice_pf(alpha)
        found: list[Option] = []
        if cx is not None and cx < tank.c_total_pf:
            found = _singles(tank, parts, cx, per_tempco)
            if combine:
                miss = abs(found[0].result.value_pf - cx) if found else cx
                found += _pairs(tank, parts, cx, miss, per_tempco)
        codes = tuple(sorted({p.marking.dielectric.code for p in parts}))  # type: ignore[union-attr]
        tempcos.append(TempcoOnHand(alpha, codes, len(parts), cx, _tempco_note(tank, alpha, cx, found)))
        options += [o for o in found if abs(o.result.residual_ppm) < abs(tank.drift_ppm_per_k)]
    options.sort(key=Option.rank)
    options = options[:limit]
    purchase = what_to_buy(tank) if tank.drift_ppm_per_k != 0 else None
    if purchase is not None and options and not _better(purchase.result, options[0].result):
        purchase = None  # the shelf already does as well as anything to buy
    return Compensation(tank, tuple(tempcos), tuple(options), purchase,
                        _explain(tank, tuple(tempcos), options, purchase), assumptions(tank), cautions(tank))


def _explain(tank: Tank, tempcos: tuple[TempcoOnHand, ...], options: list[Option],
             purchase: Purchase | None) -> tuple[str, ...]:
    if tank.drift_ppm_per_k == 0:
        return ("the measured drift is zero: nothing to cancel",)
    lines = []
    done = any(o.useful for o in options)
    if not tempcos:
        lines.append("no Class 1 ceramic with a stated tempco is on hand")
    elif not options:
        lines.append("no part on hand makes the drift smaller (each tempco's reason is above)")
    if purchase is not None:
        lines.append(f"{'closer still, ' if done else ''}to buy: {purchase_line(tank, purchase)}")
    if purchase is None and not done or purchase is not None and purchase.cx_pf > tank.c_total_pf * LARGE_SHARE:
        lines.append("a drift this large is seldom the capacitors alone: look for a Class 2 part in the tank, "
                     "a loose winding or a warm coil former first")
    return tuple(lines)


def assumptions(tank: Tank) -> tuple[str, ...]:
    """What every answer rests on, in words."""
    over = f" ({format_number(tank.delta_t_k)} K)" if tank.delta_t_k is not None else ""
    return (
        f"the drift is linear over the range measured{over}",
        "TC_eff lumps coil, wiring and capacitors; the swap changes only the slice, the rest keeps its drift",
        f"the slice taken out is {tank.alpha_old_name} ({_signed(tank.alpha_old, 0)} ppm/K)",
        "tempco tolerances as marked; an unmarked one takes the tolerance of the EIA-198 code the name is "
        "usually sold as (the tempco table in ceramic_codes), said beside each part",
        "the band counts the tempco tolerances only; a part's value tolerance moves its correction by the "
        "same share",
        "only Class 1 ceramics with a stated tempco are offered (film and mica tempcos are typical figures, "
        "not marked ones)",
    )


def cautions(tank: Tank) -> tuple[str, ...]:
    """What the builder must do after fitting the slice."""
    return (
        "warm the box again and measure: the parts' tempcos lie anywhere in their band, and the drift "
        "need not be linear beyond the range measured",
        f"the tank may need re-trimming to bring it back to {_frequency(tank.f0_hz)}: a fixed part taken out "
        "rarely matches the slice fitted",
    )


def _frequency(hz: Decimal) -> str:
    from stock.physics.drift import format_frequency  # the one frequency formatter, beside the tank physics
    return format_frequency(hz)


def _signed(value: Decimal, places: int) -> str:
    # Settle the division's last digits first, so an exact −0.75 prints −0.8 and not −0.7.
    q = value.quantize(Decimal("1E-12")).quantize(Decimal(1).scaleb(-places), rounding=ROUND_HALF_UP)
    text = f"{q:+.{places}f}"
    return text.replace("-", MINUS) if value != 0 or places else "0"


def _places(tank: Tank) -> int:
    size = abs(tank.drift_hz_per_k)
    return 1 if size >= 5 else 2 if size >= Decimal("0.5") else 3


def drift_change(tank: Tank, result: Fit) -> str:
    """``drift −20 → +1.0 Hz/K (band −3.2 … +5.2)``."""
    n = _places(tank)
    before = ("+" if tank.drift_hz_per_k > 0 else "") + format_number(round(tank.drift_hz_per_k, n))
    return (f"drift {before} → {_signed(result.residual_hz, n)} Hz/K "
            f"(band {_signed(result.residual_low_hz, n)} … {_signed(result.residual_high_hz, n)})")


def take_out_text(tank: Tank, result: Fit) -> str:
    """``take out 12 pF of C0G`` or, when no preferred fixed part matches, the trimmer's share."""
    text = f"take out {format_capacitance(result.take_out_pf)} of {tank.alpha_old_name}"
    if result.trim_pf > 0:
        text += (f" (a {format_capacitance(result.fixed_pf)} part, then "
                 f"{format_capacitance(result.trim_pf)} more on the trimmer)")
    elif result.trim_pf < 0:
        text += (f" (a {format_capacitance(result.fixed_pf)} part, then "
                 f"{format_capacitance(-result.trim_pf)} less on the trimmer)")
    return text


def fitted_text(option: Option) -> str:
    """``12 pF N150 from bin A3``, or a pair with its bins and value."""
    if option.kind == "single":
        p = option.parts[0]
        return f"{format_capacitance(p.capacitance_pf)} {p.code} from bin {p.bin_key}"
    joint = " ∥ " if option.kind == "parallel" else " in series with "
    if len(option.parts) == 1:
        p = option.parts[0]
        return (f"2 × {format_capacitance(p.capacitance_pf)} {p.code} in {option.kind} from bin {p.bin_key} "
                f"= {format_capacitance(option.result.value_pf)}")
    a, b = option.parts
    return (f"{format_capacitance(a.capacitance_pf)} {a.code} (bin {a.bin_key}){joint}"
            f"{format_capacitance(b.capacitance_pf)} {b.code} (bin {b.bin_key}) "
            f"= {format_capacitance(option.result.value_pf)}")


def headline(tank: Tank, option: Option) -> str:
    """The bench line: ``take out 12 pF of C0G, fit 12 pF N150 from bin A3: drift −20 → +1.0 Hz/K (…)``."""
    return f"{take_out_text(tank, option.result)}, fit {fitted_text(option)}: {drift_change(tank, option.result)}"


def purchase_line(tank: Tank, purchase: Purchase) -> str:
    """``2.2 pF N750 (sold as U2J, ±120 ppm/K), the E12 value nearest the 2.29 pF slice: drift …``."""
    r = purchase.result
    return (f"{format_capacitance(r.value_pf)} {purchase.code} (sold as {purchase.sold_as}, "
            f"±{format_number(r.alpha_tol)} ppm/K), the E12 value nearest the {describe_slice(purchase.cx_pf)} "
            f"slice; then {take_out_text(tank, r)}: {drift_change(tank, r)}")


__all__ = ["Compensation", "Option", "SlicePart", "TempcoOnHand", "assumptions", "cautions", "compensate",
           "drift_change", "fitted_text", "headline", "purchase_line", "take_out_text"]
