"""How one capacitor's drift moves a circuit: a resonant tank's frequency, an RC timer's period.

- Resonance: f = 1 / (2π√(LC)). For a small change of the tank capacitance,
  Δf/f = −½ · ΔC_tank/C_tank, and a part holding a share C_part/C_tank of the tank moves it by
  Δf/f = −½ · (C_part/C_tank) · ΔC_part/C_part (first order, the coil held still).
  Worked example (derived in docs/sources.md: [lc-resonance]): a 10 MHz tank of C0G, ±30 ppm/K, moves
  ∓150 Hz per kelvin; of N750, +3.75 kHz per kelvin.
- RC timers: t ∝ R·C (a 555 monostable t = 1.1·R·C), so Δt/t = ΔC/C.

A part's ΔC/C over a temperature change comes from its linear tempco α ± tolerance when it has
one (Class 1 ceramics, mica, polystyrene ...). A Class 2 window is not linear in temperature: the
whole window is reported, with that said. A family window whose curve is roughly linear is scaled
by the change against the nearer end of its rated range.

>>> resonant_frequency_hz(Decimal("10E-6"), Decimal("253.3"))
Decimal('3162296')
"""

from __future__ import annotations

from dataclasses import dataclass
from decimal import Decimal, localcontext
from typing import Any

from stock.decoded import Marking
from stock.errors import BadValue
from stock.physics.stability import REFERENCE_C, assumed_tempco_tol, temperature_figures
from stock.units import (format_capacitance, format_number, parse_frequency, parse_inductance, parse_kelvin,
                         parse_period)

PI = Decimal("3.14159265358979323846264338327950288")


def format_frequency(hz: Decimal) -> str:
    """A frequency for people: ``10 MHz``, ``455 kHz``, ``−150 Hz``.

    >>> format_frequency(Decimal(10_000_000)), format_frequency(Decimal(455_000)), format_frequency(Decimal(-150))
    ('10 MHz', '455 kHz', '−150 Hz')
    """
    for exponent, unit in ((9, "GHz"), (6, "MHz"), (3, "kHz")):
        if abs(hz) >= Decimal(10) ** exponent:
            return f"{format_number(round(hz.scaleb(-exponent), 6))} {unit}"
    return f"{format_number(round(hz, 3))} Hz"


def resonant_frequency_hz(inductance_h: Decimal, capacitance_pf: Decimal) -> Decimal:
    """f = 1 / (2π√(LC)), rounded to 1 Hz.

    Args:
        inductance_h: the coil, in henry.
        capacitance_pf: the tank capacitance, in pF.

    Raises:
        BadValue: a value is not positive.

    >>> resonant_frequency_hz(Decimal("1E-6"), Decimal(100))   # 1 µH with 100 pF
    Decimal('15915494')
    """
    if inductance_h <= 0:
        raise BadValue("inductance", str(inductance_h), "a positive inductance in H")
    if capacitance_pf <= 0:
        raise BadValue("capacitance", str(capacitance_pf), "a positive capacitance in pF")
    with localcontext() as ctx:
        ctx.prec = 40
        value = 1 / (2 * PI * (inductance_h * capacitance_pf * Decimal("1E-12")).sqrt())
        return value.quantize(Decimal(1))


def tank_capacitance_pf(frequency_hz: Decimal, inductance_h: Decimal) -> Decimal:
    """The capacitance that tunes a coil to a frequency: C = 1 / ((2πf)²·L), in pF (4 decimals).

    >>> tank_capacitance_pf(Decimal("3.5E6"), Decimal("10E-6"))
    Decimal('206.7779')
    """
    if frequency_hz <= 0 or inductance_h <= 0:
        raise BadValue("frequency and inductance", f"{frequency_hz}, {inductance_h}", "positive values")
    with localcontext() as ctx:
        ctx.prec = 40
        return (Decimal("1E12") / ((2 * PI * frequency_hz) ** 2 * inductance_h)).quantize(Decimal("0.0001"))


@dataclass(frozen=True)
class PartDrift:
    """A part's capacitance change for a temperature change: low and high bounds in ppm."""

    low_ppm: Decimal
    high_ppm: Decimal
    linear: bool        # False: a window, the same whatever the change
    basis: str

    def delta_pf(self, capacitance_pf: Decimal) -> tuple[Decimal, Decimal]:
        return capacitance_pf * self.low_ppm / 1_000_000, capacitance_pf * self.high_ppm / 1_000_000


def part_drift(marking: Marking, delta_t_k: Decimal) -> PartDrift:
    """ΔC/C of a part warmed by ``delta_t_k`` kelvin (negative: cooled), as ppm bounds.

    Raises:
        BadValue: the marking says nothing of its temperature behaviour.

    >>> from stock.decoded import Dielectric
    >>> n750 = Marking("104 N750", Decimal(100000), dielectric=Dielectric("N750", "ceramic", 1, Decimal(-750), Decimal(0)))
    >>> d = part_drift(n750, Decimal(5))
    >>> d.low_ppm, d.delta_pf(Decimal(100000))
    (Decimal('-3750'), (Decimal('-375'), Decimal('-375')))
    """
    d = marking.dielectric
    figures = temperature_figures(d)
    if d is None or figures is None:
        raise BadValue("--part", marking.text, "a part whose dielectric is known (C0G, N750, X7R, polystyrene ...)")
    if figures.tempco_ppm_per_k is not None and not (d.family == "ceramic" and d.klass == 2):
        alpha = figures.tempco_ppm_per_k
        tol = figures.tempco_tol_ppm_per_k
        note = ""
        if tol is None:
            tol = assumed_tempco_tol(alpha)
            note = f" (tolerance not marked: ±{format_number(tol)} ppm/K assumed)"
        ends = sorted(((alpha - tol) * delta_t_k, (alpha + tol) * delta_t_k))
        return PartDrift(ends[0], ends[1], True,
                         f"{d.code}: {format_number(alpha)} ± {format_number(tol)} ppm/K × "
                         f"{format_number(delta_t_k)} K{note}")
    if figures.change_minus_pct is None or figures.change_plus_pct is None:
        raise BadValue("--part", marking.text, "a part with a tempco or a temperature window")
    low, high = -figures.change_minus_pct * 10_000, figures.change_plus_pct * 10_000
    nearest = None
    if figures.temp_min_c is not None and figures.temp_max_c is not None:
        nearest = min(abs(figures.temp_min_c - REFERENCE_C), abs(figures.temp_max_c - REFERENCE_C))
    if figures.linear and nearest and abs(delta_t_k) < nearest:
        factor = abs(delta_t_k) / nearest
        return PartDrift(low * factor, high * factor, True,
                         f"{d.code}: its window scaled to {format_number(abs(delta_t_k))} of {format_number(nearest)} K"
                         " (roughly linear, typical figure)")
    return PartDrift(low, high, False,
                     f"{d.code}: not linear in temperature; its whole window applies, whatever the change")


@dataclass(frozen=True)
class TankDrift:
    """A resonant circuit's frequency shift from one part's drift."""

    marking: str
    f0_hz: Decimal
    tank_pf: Decimal
    part_pf: Decimal
    delta_t_k: Decimal
    part: PartDrift
    shift_low_hz: Decimal
    shift_high_hz: Decimal
    shift_low_ppm: Decimal
    shift_high_ppm: Decimal

    @property
    def share(self) -> Decimal:
        return self.part_pf / self.tank_pf

    def to_json(self) -> dict[str, Any]:
        return {"kind": "tank", "marking": self.marking, "f0_hz": float(self.f0_hz),
                "tank_pf": float(self.tank_pf), "part_pf": float(self.part_pf),
                "share": float(self.share), "delta_t_k": float(self.delta_t_k),
                "part_low_ppm": float(self.part.low_ppm), "part_high_ppm": float(self.part.high_ppm),
                "part_linear": self.part.linear, "basis": self.part.basis,
                "shift_low_hz": float(self.shift_low_hz), "shift_high_hz": float(self.shift_high_hz),
                "shift_low_ppm": float(self.shift_low_ppm), "shift_high_ppm": float(self.shift_high_ppm)}


def tank_shift_ppm(part_change_ppm: Decimal, part_pf: Decimal, tank_pf: Decimal) -> Decimal:
    """Δf/f in ppm = −½ · (C_part/C_tank) · ΔC_part/C_part.

    >>> tank_shift_ppm(Decimal(30), Decimal(100), Decimal(100))
    Decimal('-15')
    """
    return -part_change_ppm * part_pf / tank_pf / 2


def tank_drift(marking: Marking, f0_hz: Decimal, tank_pf: Decimal, delta_t_k: Decimal,
               part_pf: Decimal | None = None) -> TankDrift:
    """The frequency shift of a tank when one of its capacitors drifts with temperature.

    Args:
        marking: the part.
        f0_hz: the tank's frequency.
        tank_pf: the total tank capacitance (the part included).
        delta_t_k: the temperature change, K.
        part_pf: the part's capacitance; its marked value when omitted.

    Raises:
        BadValue: a value is missing, not positive, or the part is larger than the tank.
    """
    part_pf = part_pf if part_pf is not None else marking.capacitance_pf
    if part_pf is None:
        raise BadValue("--part", marking.text, "a part whose capacitance is known (or give --part-pf)")
    if f0_hz <= 0:
        raise BadValue("--f0", str(f0_hz), "a positive frequency such as 10MHz")
    if tank_pf <= 0 or part_pf > tank_pf:
        raise BadValue("--tank", format_capacitance(tank_pf),
                       f"a total tank capacitance of at least the part's {format_capacitance(part_pf)}")
    drift = part_drift(marking, delta_t_k)
    ppm = sorted((tank_shift_ppm(drift.low_ppm, part_pf, tank_pf), tank_shift_ppm(drift.high_ppm, part_pf, tank_pf)))
    return TankDrift(marking.text, f0_hz, tank_pf, part_pf, delta_t_k, drift,
                     f0_hz * ppm[0] / 1_000_000, f0_hz * ppm[1] / 1_000_000, ppm[0], ppm[1])


@dataclass(frozen=True)
class TimerDrift:
    """An RC timer's period shift from its capacitor's drift: Δt/t = ΔC/C."""

    marking: str
    delta_t_k: Decimal
    part: PartDrift
    period_s: Decimal | None

    @property
    def low_pct(self) -> Decimal:
        return self.part.low_ppm / 10_000

    @property
    def high_pct(self) -> Decimal:
        return self.part.high_ppm / 10_000

    def to_json(self) -> dict[str, Any]:
        return {"kind": "timer", "marking": self.marking, "delta_t_k": float(self.delta_t_k),
                "low_pct": float(self.low_pct), "high_pct": float(self.high_pct),
                "part_linear": self.part.linear, "basis": self.part.basis,
                "period_s": None if self.period_s is None else float(self.period_s),
                "shift_low_s": None if self.period_s is None else float(self.period_s * self.low_pct / 100),
                "shift_high_s": None if self.period_s is None else float(self.period_s * self.high_pct / 100)}


def timer_drift(marking: Marking, delta_t_k: Decimal, period_s: Decimal | None = None) -> TimerDrift:
    """The period shift of an RC timer (555, integrator) when its capacitor drifts.

    >>> from stock.decoded import Dielectric
    >>> c0g = Marking("C0G", Decimal(10000), dielectric=Dielectric("C0G", "ceramic", 1, Decimal(0), Decimal(30)))
    >>> t = timer_drift(c0g, Decimal(60))
    >>> t.low_pct, t.high_pct
    (Decimal('-0.18'), Decimal('0.18'))
    """
    return TimerDrift(marking.text, delta_t_k, part_drift(marking, delta_t_k), period_s)


__all__ = [
    "PartDrift", "format_frequency", "TankDrift", "TimerDrift", "parse_frequency", "parse_inductance",
    "parse_kelvin", "parse_period", "part_drift", "resonant_frequency_hz",
    "tank_capacitance_pf", "tank_drift", "tank_shift_ppm", "timer_drift",
]
