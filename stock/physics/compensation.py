"""Null a drifting oscillator: from a measured drift to the tempco slice that cancels it.

The LC resonance formula f = 1/(2π√(LC)), differentiated, gives Δf/f = −½·(ΔL/L + ΔC/C). A drift
measured on the whole oscillator therefore names the tank's effective tempco, with coil, wiring
and capacitors lumped as if the capacitance alone moved:

    TC_eff = −2·(Δf/f)/ΔT                                  (ppm/K)

Signs: a negative-tempco capacitor loses capacitance as it warms, so the frequency rises. A
negative drift (f falls as the box warms) means TC_eff > 0, cancelled by negative-tempco (N)
parts; a positive drift by positive-tempco (P) parts.

To cancel it, a slice Cx of the tank, now of tempco α_old (C0G, 0 ppm/K, unless told), is
replaced by parts of tempco α_new, keeping the total capacitance:

    Cx·(α_new − α_old) = −TC_eff·C_total

Fitting a value P of tempco α_P instead (the part on the shelf nearest Cx), with the total brought
back by taking out P of the old capacitance (a fixed part, or the trimmer), leaves

    residual = −½·(TC_eff + P·(α_P − α_old)/C_total)       (ppm/K of f; × f/10⁶ for Hz/K)

Worked by hand: 7 MHz, 300 pF, −20 Hz/K. Δf/f = −20/7 = −2.857 ppm/K, TC_eff = +5.714 ppm/K,
−TC_eff·C_total = −1714.3 pF·ppm/K, so N150 needs Cx = 11.43 pF and N750 2.286 pF. Fitting
12 pF of N150: residual = −½·(5.714 − 12·150/300) = +0.143 ppm/K = +1.0 Hz/K.

>>> tank = measure_tank(Decimal(7_000_000), Decimal(-20), "Hz/K", tank_pf=Decimal(300))
>>> tank.tc_eff_ppm_per_k.quantize(Decimal("0.001")), tank.slice_pf(Decimal(-150)).quantize(Decimal("0.01"))
(Decimal('5.714'), Decimal('11.43'))
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from decimal import Decimal, localcontext
from typing import Any

from stock.decoded import Dielectric
from stock.errors import BadOptions, BadValue
from stock.markings.ceramic_codes import OLD_CLASS1_NAMES, decode_dielectric, usual_tempco_tolerance
from stock.markings.preferred_values import series
from stock.physics.drift import tank_capacitance_pf
from stock.physics.stability import assumed_tempco_tol
from stock.units import DRIFT_UNITS, format_capacitance, format_number

_MILLION = Decimal(1_000_000)
BUY_SERIES = "E12"          # small N/P ceramics are sold in E12 values: common practice, no published source
USEFUL_SHARE = Decimal("0.5")  # an option "does it" when it at least halves the drift: common practice
MAX_BUY_SHARE = Decimal("0.5")  # a slice to buy stays within half the tank: common practice
SMALLEST_PART_PF = Decimal("0.5")  # tempco parts are not sold below about 0.5 pF: common practice


def _f(value: Decimal | None) -> float | None:
    return None if value is None else float(value)


@dataclass(frozen=True)
class Tank:
    """A tank whose oscillator was measured drifting, and the tempco of the slice to replace.

    ``drift_ppm_per_k`` is Δf/f per kelvin (ppm/K, negative: f falls as it warms);
    ``alpha_old`` the tempco (ppm/K) of the capacitance a slice would be taken from.
    """

    f0_hz: Decimal
    c_total_pf: Decimal
    drift_ppm_per_k: Decimal
    alpha_old: Decimal = Decimal(0)
    alpha_old_name: str = "C0G"
    coil_h: Decimal | None = None        # when the total was worked out from the coil
    measured: str = ""                   # the drift as typed, for the report
    delta_t_k: Decimal | None = None     # the warming a whole shift was measured over

    @property
    def drift_hz_per_k(self) -> Decimal:
        return self.hz(self.drift_ppm_per_k)

    @property
    def tc_eff_ppm_per_k(self) -> Decimal:
        """TC_eff = −2·(Δf/f)/ΔT: the tank's lumped tempco."""
        return -2 * self.drift_ppm_per_k

    @property
    def needed_pf_ppm(self) -> Decimal:
        """−TC_eff·C_total (pF·ppm/K): what Cx·(α_new − α_old) must equal."""
        return -self.tc_eff_ppm_per_k * self.c_total_pf

    def direction(self) -> str:
        """Which way the drift goes, and which kind of tempco cancels it, in words."""
        if self.drift_ppm_per_k == 0:
            return "no drift measured"
        falls = self.drift_ppm_per_k < 0
        if self.alpha_old == 0:
            parts = "negative-tempco (N) parts" if falls else "positive-tempco (P) parts"
        else:
            parts = f"parts of a tempco {'below' if falls else 'above'} the slice's {self.alpha_old_name}"
        return (f"the frequency {'falls' if falls else 'rises'} as the box warms: the tank acts as if its "
                f"capacitance {'rose' if falls else 'fell'}, so {parts} cancel it")

    def hz(self, ppm: Decimal) -> Decimal:
        """A drift in ppm/K of f as Hz/K at this tank's frequency."""
        return ppm * self.f0_hz / _MILLION

    def slice_pf(self, alpha_new: Decimal) -> Decimal | None:
        """Cx = −TC_eff·C_total / (α_new − α_old); None when that tempco cannot cancel the drift.

        >>> Tank(Decimal(7_000_000), Decimal(300), Decimal(-20) / 7).slice_pf(Decimal(100)) is None
        True
        """
        step = alpha_new - self.alpha_old
        if step == 0 or self.needed_pf_ppm == 0:
            return None
        cx = self.needed_pf_ppm / step
        return cx if cx > 0 else None

    def residual_ppm(self, value_pf: Decimal, alpha: Decimal) -> Decimal:
        """The drift left (ppm/K of f) after fitting ``value_pf`` of tempco ``alpha`` in its place."""
        return -(self.tc_eff_ppm_per_k + value_pf * (alpha - self.alpha_old) / self.c_total_pf) / 2

    def to_json(self) -> dict[str, Any]:
        return {"f0_hz": float(self.f0_hz), "c_total_pf": float(self.c_total_pf),
                "c_total_from": "coil" if self.coil_h is not None else "given",
                "coil_h": _f(self.coil_h), "measured": self.measured, "delta_t_k": _f(self.delta_t_k),
                "drift_hz_per_k": float(self.drift_hz_per_k), "drift_ppm_per_k": float(self.drift_ppm_per_k),
                "tc_eff_ppm_per_k": float(self.tc_eff_ppm_per_k),
                "needed_pf_ppm_per_k": float(self.needed_pf_ppm),
                "slice_tempco_ppm_per_k": float(self.alpha_old), "slice_tempco_name": self.alpha_old_name}


def measure_tank(f0_hz: Decimal, drift: Decimal, drift_unit: str, *, tank_pf: Decimal | None = None,
                 coil_h: Decimal | None = None, delta_t_k: Decimal | None = None,
                 alpha_old: Decimal = Decimal(0), alpha_old_name: str = "C0G", measured: str = "") -> Tank:
    """The tank from what was measured: its frequency, its capacitance (or coil) and the drift.

    Args:
        f0_hz: the oscillator's frequency.
        drift: the measured shift, in ``drift_unit`` (one of :data:`~stock.units.DRIFT_UNITS`).
        tank_pf: the total tank capacitance; or ``coil_h``, the coil, and C = 1/((2πf)²L).
        delta_t_k: the warming over which a whole shift (Hz, ppm) was measured.
        alpha_old: the tempco of the capacitance a slice is taken from (ppm/K).

    Raises:
        BadValue: a value is zero or negative, or the unit is not a drift.
        BadOptions: neither or both of tank and coil; a temperature change missing or not wanted.

    >>> t = measure_tank(Decimal(7_000_000), Decimal(-60), "Hz", tank_pf=Decimal(300), delta_t_k=Decimal(3))
    >>> t.drift_hz_per_k.quantize(Decimal("0.001"))
    Decimal('-20.000')
    """
    if f0_hz <= 0:
        raise BadValue("--f0", format_number(f0_hz), "a frequency above zero such as 7MHz")
    if (tank_pf is None) == (coil_h is None):
        raise BadOptions(("--tank", "--coil"), "both were given" if tank_pf is not None else "neither was given",
                         "one of them: the tank's total capacitance (--tank 300p) or its coil (--coil 4.7uH)")
    if tank_pf is not None and tank_pf <= 0:
        raise BadValue("--tank", format_number(tank_pf), "a capacitance above zero such as 300p")
    if coil_h is not None and coil_h <= 0:
        raise BadValue("--coil", format_number(coil_h), "an inductance above zero such as 4.7uH")
    if drift_unit not in DRIFT_UNITS:
        raise BadValue("--drift", drift_unit, "a drift unit: " + ", ".join(DRIFT_UNITS))
    per_kelvin = drift_unit.endswith("/K")
    if per_kelvin and delta_t_k is not None:
        raise BadOptions(("--drift", "--delta-t"), f"a drift per kelvin ({drift_unit}) needs no temperature change",
                         "either -20Hz/K alone, or a whole shift with its change: -60Hz --delta-t 3")
    if not per_kelvin and delta_t_k is None:
        raise BadOptions(("--drift", "--delta-t"), f"a whole shift ({drift_unit}) needs the warming it took",
                         f"--delta-t K, such as --drift -60{drift_unit} --delta-t 3, or a drift per kelvin")
    if delta_t_k is not None and delta_t_k == 0:
        raise BadValue("--delta-t", "0", "a temperature change other than zero, such as 3 (K)")
    c_total = tank_pf if tank_pf is not None else tank_capacitance_pf(f0_hz, coil_h)  # type: ignore[arg-type]
    with localcontext() as ctx:
        ctx.prec = 28
        per_k = drift if per_kelvin else drift / delta_t_k  # type: ignore[operator]
        ppm = per_k if drift_unit.startswith("ppm") else per_k * _MILLION / f0_hz
    return Tank(f0_hz, c_total, ppm, alpha_old, alpha_old_name, coil_h, measured, delta_t_k)


_PPM_NUMBER = re.compile(r"\s*([+\-−]?\d+(?:\.\d+)?)\s*(?:ppm(?:/°?[CK])?)?\s*", re.IGNORECASE)


def slice_tempco(text: str, what: str = "--tank-tempco") -> tuple[Decimal, str]:
    """The tempco of the capacitance a slice is taken from: a number in ppm/K or a Class 1 code.

    Raises:
        BadValue: neither a number nor a code with a linear tempco.

    >>> slice_tempco("C0G"), slice_tempco("-150ppm/K"), slice_tempco("N150")
    ((Decimal('0'), 'C0G'), (Decimal('-150'), '−150 ppm/K'), (Decimal('-150'), 'N150'))
    """
    match = _PPM_NUMBER.fullmatch(str(text))
    if match:
        alpha = Decimal(match[1].replace("−", "-"))
        return alpha, f"{'+' if alpha > 0 else ''}{format_number(alpha)} ppm/K"
    d = decode_dielectric(str(text))
    if d is None or d.tempco_ppm_per_k is None or d.klass == 2:
        raise BadValue(what, str(text), "a tempco in ppm/K such as 0 or -150, or a Class 1 code such as C0G or N150")
    return d.tempco_ppm_per_k, d.code


@dataclass(frozen=True)
class TempcoSpread:
    """The ± tolerance on a part's tempco, and where it came from (marked, or the code's usual)."""

    tol_ppm_per_k: Decimal
    marked: bool
    basis: str


def tempco_spread(d: Dielectric) -> TempcoSpread:
    """The tolerance on α a part carries: as marked, else the usual one of its code.

    An old name (N150) takes the tolerance of the EIA-198 code it is usually sold as (P2G, ±30);
    a tempco with neither takes the widest customary for its size (common practice).

    >>> tempco_spread(decode_dielectric("N750")).basis
    'N750 marks no tolerance: ±120 ppm/K, that of U2J, the EIA-198 code it is usually sold as'
    """
    if d.tempco_tol_ppm_per_k is not None:
        return TempcoSpread(d.tempco_tol_ppm_per_k, True,
                            f"{d.code}: ±{format_number(d.tempco_tol_ppm_per_k)} ppm/K as marked")
    usual = usual_tempco_tolerance(d.code)
    if usual is not None:
        return TempcoSpread(usual[0], False, f"{d.code} marks no tolerance: ±{format_number(usual[0])} ppm/K, "
                                             f"that of {usual[1]}, the EIA-198 code it is usually sold as")
    tol = assumed_tempco_tol(d.tempco_ppm_per_k or Decimal(0))
    return TempcoSpread(tol, False, f"{d.code} marks no tolerance: ±{format_number(tol)} ppm/K, the widest "
                                    "customary for that tempco")


@dataclass(frozen=True)
class Fit:
    """What fitting a value P of net tempco α_P ± tol in the slice's place leaves of the drift."""

    value_pf: Decimal
    alpha: Decimal
    alpha_tol: Decimal
    residual_ppm: Decimal
    residual_low_ppm: Decimal
    residual_high_ppm: Decimal
    residual_hz: Decimal
    residual_low_hz: Decimal
    residual_high_hz: Decimal
    take_out_pf: Decimal          # of the old capacitance, to keep the total
    fixed_pf: Decimal             # the nearest preferred fixed part to take out instead
    trim_pf: Decimal              # then the trimmer: + add this much, − take this much out
    total_before_trim_pf: Decimal  # the tank after the swap with the fixed part, before trimming
    new_total_pf: Decimal         # after trimming: the total kept

    def to_json(self) -> dict[str, Any]:
        return {"value_pf": float(self.value_pf), "tempco_ppm_per_k": float(self.alpha),
                "tempco_tol_ppm_per_k": float(self.alpha_tol),
                "residual_hz_per_k": float(self.residual_hz),
                "residual_band_hz_per_k": [float(self.residual_low_hz), float(self.residual_high_hz)],
                "residual_ppm_per_k": float(self.residual_ppm),
                "residual_band_ppm_per_k": [float(self.residual_low_ppm), float(self.residual_high_ppm)],
                "take_out_pf": float(self.take_out_pf), "take_out_fixed_pf": float(self.fixed_pf),
                "trimmer_pf": float(self.trim_pf), "total_before_trim_pf": float(self.total_before_trim_pf),
                "new_total_pf": float(self.new_total_pf)}


def nearest_preferred(value_pf: Decimal, name: str = BUY_SERIES) -> Decimal:
    """The value of a preferred series nearest ``value_pf`` by difference (the residual is linear in it).

    >>> nearest_preferred(Decimal("11.43")), nearest_preferred(Decimal("2.286")), nearest_preferred(Decimal("17.14"))
    (Decimal('12'), Decimal('2.2'), Decimal('18'))
    """
    exponent = value_pf.adjusted()
    values = [v.scaleb(e) for e in (exponent - 1, exponent, exponent + 1) for v in series(name)]
    return min(values, key=lambda v: (abs(v - value_pf), v)).normalize()


def fit(tank: Tank, value_pf: Decimal, alpha: Decimal, alpha_tol: Decimal) -> Fit:
    """The residual drift and its band, and the old capacitance to take out, for one fitted value.

    >>> f = fit(Tank(Decimal(7_000_000), Decimal(300), Decimal(-20) / 7), Decimal(12), Decimal(-150), Decimal(30))
    >>> [format_number(round(x, 2)) for x in (f.residual_hz, f.residual_low_hz, f.residual_high_hz)]
    ['1', '−3.2', '5.2']
    """
    ends = sorted((tank.residual_ppm(value_pf, alpha - alpha_tol), tank.residual_ppm(value_pf, alpha + alpha_tol)))
    nominal = tank.residual_ppm(value_pf, alpha)
    fixed = nearest_preferred(value_pf)
    return Fit(value_pf, alpha, alpha_tol, nominal, ends[0], ends[1], tank.hz(nominal), tank.hz(ends[0]),
               tank.hz(ends[1]), value_pf, fixed, fixed - value_pf, tank.c_total_pf - fixed + value_pf,
               tank.c_total_pf)  # taking out as much as is fitted keeps the total


@dataclass(frozen=True)
class Purchase:
    """The part to buy when nothing on hand does it: a tempco name, a preferred value and the result."""

    code: str
    sold_as: str
    cx_pf: Decimal
    result: Fit

    def to_json(self) -> dict[str, Any]:
        return {"code": self.code, "sold_as": self.sold_as, "cx_pf": float(self.cx_pf),
                "value_pf": float(self.result.value_pf), "series": BUY_SERIES, **self.result.to_json()}


def what_to_buy(tank: Tank) -> Purchase | None:
    """The old-name tempco and E12 value that come nearest to cancelling the drift (None: none can).

    Every name of the tempco table (:data:`~stock.ceramic_codes.OLD_CLASS1_NAMES`) whose slice is
    positive, at least 0.5 pF and at most half the tank is tried at its nearest E12 value, with the
    tolerance of the EIA-198 code it is sold as. The smallest worst case over that tolerance band
    wins (a nominal near miss with a wide band is worth less), then the smaller tempco.

    >>> p = what_to_buy(Tank(Decimal(7_000_000), Decimal(300), Decimal(-20) / 7))
    >>> p.code, p.sold_as, p.result.value_pf
    ('N750', 'U2J', Decimal('2.2'))
    """
    best: tuple[tuple[Decimal, Decimal], Purchase] | None = None
    for name, (alpha, eia) in OLD_CLASS1_NAMES.items():
        cx = tank.slice_pf(alpha)
        if cx is None or cx > tank.c_total_pf * MAX_BUY_SHARE or cx < SMALLEST_PART_PF:
            continue
        value = nearest_preferred(cx)
        if value > tank.c_total_pf * MAX_BUY_SHARE:
            continue
        tol = usual_tempco_tolerance(name)
        result = fit(tank, value, alpha, tol[0] if tol else assumed_tempco_tol(alpha))
        key = (max(abs(result.residual_low_ppm), abs(result.residual_high_ppm)), abs(alpha))
        if best is None or key < best[0]:
            best = (key, Purchase(name, eia, cx, result))
    return best[1] if best else None


def describe_slice(cx_pf: Decimal) -> str:
    """A slice value for people, to three significant figures (``11.4 pF``)."""
    return format_capacitance(Decimal(f"{cx_pf:.3g}"))


__all__ = ["BUY_SERIES", "Fit", "MAX_BUY_SHARE", "Purchase", "Tank", "TempcoSpread", "USEFUL_SHARE",
           "describe_slice", "fit", "measure_tank", "nearest_preferred", "slice_tempco", "tempco_spread",
           "what_to_buy"]
