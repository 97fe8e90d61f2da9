"""The decoded facts of a marking: frozen values that keep their raw text, alternatives and flags.

Every decoder (printed codes, colour codes) returns a :class:`Marking`. Numbers are exact
(``Decimal``); they become floats only in :meth:`Marking.to_json`, whose shape is a public
contract (see README, "JSON from `stock decode`"). :meth:`Marking.from_json` reads it back, so
the store can keep a decoded marking as JSON and rebuild it.

>>> m = Marking(text="104K", capacitance_pf=Decimal(100000),
...             tolerance=Tolerance(Decimal(10), Decimal(10), "%", code="K"))
>>> m.to_json()["capacitance_pf"], m.to_json()["tolerance"]
(100000.0, {'minus': 10.0, 'plus': 10.0, 'unit': '%'})
>>> Marking.from_json(m.to_json()) == m
True
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from decimal import Decimal
from typing import Any, Literal

# The dielectric families the tool knows, by one spelling each. Decoders map every other
# spelling (MKT, "poly film", Ta ...) onto these; grading and search key their tables on them.
FAMILIES: tuple[str, ...] = (
    "ceramic",                  # class says 1 (stable) or 2 (high-K; EIA class 3 reported as 2)
    "polystyrene",
    "polypropylene",
    "polyester",                # PET, Mylar
    "polyethylene-naphthalate",  # PEN
    "polyphenylene-sulfide",    # PPS
    "polycarbonate",
    "ptfe",
    "mica",                     # silver mica included
    "glass",
    "paper",
    "tantalum",                 # MnO2 cathode
    "tantalum-polymer",
    "aluminium-electrolytic",
    "bipolar-electrolytic",
    "double-layer",             # supercapacitor
)

ToleranceUnit = Literal["%", "pF"]
VoltageKind = Literal["DC", "AC"]
Polarity = Literal["positive-marked", "negative-marked"]


def _num(value: Decimal | None) -> float | None:
    return None if value is None else float(value)


def _dec(value: Any) -> Decimal | None:
    return None if value is None else Decimal(str(value))


@dataclass(frozen=True)
class Flag:
    """One uncertainty or problem, in words. ``kind`` is a short fixed word (see README table)."""

    kind: str
    message: str

    def to_json(self) -> dict[str, str]:
        return {"kind": self.kind, "message": self.message}


@dataclass(frozen=True)
class Tolerance:
    """Initial tolerance as two magnitudes: ±10 % is minus 10, plus 10; +80/−20 % is minus 20, plus 80.

    ``code`` keeps the letter as printed, if the tolerance came from one.
    """

    minus: Decimal
    plus: Decimal
    unit: ToleranceUnit
    code: str | None = None

    def as_percent(self, capacitance_pf: Decimal | None) -> tuple[Decimal, Decimal] | None:
        """(minus %, plus %) of a value; None when an absolute tolerance meets an unknown value.

        >>> Tolerance(Decimal("0.25"), Decimal("0.25"), "pF").as_percent(Decimal("1.5"))
        (Decimal('16.66666666666666666666666667'), Decimal('16.66666666666666666666666667'))
        """
        if self.unit == "%":
            return self.minus, self.plus
        if not capacitance_pf:
            return None
        return self.minus * 100 / capacitance_pf, self.plus * 100 / capacitance_pf

    def to_json(self) -> dict[str, Any]:
        return {"minus": float(self.minus), "plus": float(self.plus), "unit": self.unit}

    @classmethod
    def from_json(cls, data: dict[str, Any] | None, code: str | None = None) -> Tolerance | None:
        if data is None:
            return None
        return cls(Decimal(str(data["minus"])), Decimal(str(data["plus"])), data["unit"],
                   code=data.get("code", code))


@dataclass(frozen=True)
class Dielectric:
    """What the dielectric code or name says about temperature behaviour.

    Class 1 codes carry a linear tempco (``tempco_ppm_per_k`` ± ``tempco_tol_ppm_per_k``);
    Class 2 codes carry a change window (``change_minus_pct``/``change_plus_pct`` as magnitudes)
    over ``temp_min_c``…``temp_max_c``. Families named in words carry their typical figures.
    """

    code: str                   # canonical spelling: "C0G", "X7R", "N750", "polypropylene"
    family: str                 # one of FAMILIES
    klass: int | None = None    # ceramic class 1 or 2; None for non-ceramics
    tempco_ppm_per_k: Decimal | None = None
    tempco_tol_ppm_per_k: Decimal | None = None
    temp_min_c: Decimal | None = None
    temp_max_c: Decimal | None = None
    change_minus_pct: Decimal | None = None
    change_plus_pct: Decimal | None = None
    source: str = ""            # the table the figures came from, e.g. "EIA-198 Class 1"

    def to_json(self) -> dict[str, Any]:
        return {
            "code": self.code, "family": self.family, "class": self.klass,
            "tempco_ppm_per_k": _num(self.tempco_ppm_per_k),
            "tempco_tol_ppm_per_k": _num(self.tempco_tol_ppm_per_k),
            "temp_min_c": _num(self.temp_min_c), "temp_max_c": _num(self.temp_max_c),
            "change_minus_pct": _num(self.change_minus_pct),
            "change_plus_pct": _num(self.change_plus_pct),
            "source": self.source,
        }

    @classmethod
    def from_json(cls, data: dict[str, Any] | None) -> Dielectric | None:
        if data is None:
            return None
        return cls(
            code=data["code"], family=data["family"], klass=data.get("class"),
            tempco_ppm_per_k=_dec(data.get("tempco_ppm_per_k")),
            tempco_tol_ppm_per_k=_dec(data.get("tempco_tol_ppm_per_k")),
            temp_min_c=_dec(data.get("temp_min_c")), temp_max_c=_dec(data.get("temp_max_c")),
            change_minus_pct=_dec(data.get("change_minus_pct")),
            change_plus_pct=_dec(data.get("change_plus_pct")),
            source=data.get("source", ""),
        )


@dataclass(frozen=True)
class Alternative:
    """A reading considered and not chosen, with the reason it was set aside (or could be right)."""

    reason: str
    capacitance_pf: Decimal | None = None
    tolerance: Tolerance | None = None
    voltage_v: Decimal | None = None
    dielectric: Dielectric | None = None

    def to_json(self) -> dict[str, Any]:
        return {
            "capacitance_pf": _num(self.capacitance_pf),
            "tolerance": self.tolerance.to_json() if self.tolerance else None,
            "tolerance_code": self.tolerance.code if self.tolerance else None,
            "voltage_v": _num(self.voltage_v),
            "dielectric": self.dielectric.to_json() if self.dielectric else None,
            "reason": self.reason,
        }

    @classmethod
    def from_json(cls, data: dict[str, Any]) -> Alternative:
        return cls(
            reason=data["reason"], capacitance_pf=_dec(data.get("capacitance_pf")),
            tolerance=Tolerance.from_json(data.get("tolerance"), code=data.get("tolerance_code")),
            voltage_v=_dec(data.get("voltage_v")),
            dielectric=Dielectric.from_json(data.get("dielectric")),
        )


@dataclass(frozen=True)
class Marking:
    """Everything one marking says, the reading chosen, the readings not chosen, and the doubts."""

    text: str
    capacitance_pf: Decimal | None = None
    tolerance: Tolerance | None = None
    voltage_v: Decimal | None = None
    voltage_kind: VoltageKind | None = None
    dielectric: Dielectric | None = None
    safety_class: str | None = None     # "X2", "Y1", "X1Y2" (IEC 60384-14)
    polarity: Polarity | None = None
    rated_temp_c: Decimal | None = None
    alternatives: tuple[Alternative, ...] = ()
    flags: tuple[Flag, ...] = ()
    unparsed: tuple[str, ...] = ()
    package: str | None = None          # package words as written: "0603", "RADIAL 6.3x11"
    mounting: str | None = None         # "SMD" or "THT", read from the package words

    def with_flags(self, *extra: Flag) -> Marking:
        """A copy with more flags (frozen values are never changed in place)."""
        return replace(self, flags=self.flags + tuple(extra))

    def flag_kinds(self) -> set[str]:
        return {f.kind for f in self.flags}

    def to_json(self) -> dict[str, Any]:
        """The public JSON shape of a decoded marking (stable contract)."""
        return {
            "text": self.text,
            "capacitance_pf": _num(self.capacitance_pf),
            "tolerance": self.tolerance.to_json() if self.tolerance else None,
            "tolerance_code": self.tolerance.code if self.tolerance else None,
            "voltage_v": _num(self.voltage_v),
            "voltage_kind": self.voltage_kind,
            "dielectric": self.dielectric.to_json() if self.dielectric else None,
            "safety_class": self.safety_class,
            "polarity": self.polarity,
            "rated_temp_c": _num(self.rated_temp_c),
            "alternatives": [a.to_json() for a in self.alternatives],
            "flags": [f.to_json() for f in self.flags],
            "unparsed": list(self.unparsed),
            "package": self.package,
            "mounting": self.mounting,
        }

    @classmethod
    def from_json(cls, data: dict[str, Any]) -> Marking:
        """Rebuild a marking from :meth:`to_json` output (the store keeps that JSON)."""
        return cls(
            text=data["text"],
            capacitance_pf=_dec(data.get("capacitance_pf")),
            tolerance=Tolerance.from_json(data.get("tolerance"), code=data.get("tolerance_code")),
            voltage_v=_dec(data.get("voltage_v")),
            voltage_kind=data.get("voltage_kind"),
            dielectric=Dielectric.from_json(data.get("dielectric")),
            safety_class=data.get("safety_class"),
            polarity=data.get("polarity"),
            rated_temp_c=_dec(data.get("rated_temp_c")),
            alternatives=tuple(Alternative.from_json(a) for a in data.get("alternatives", [])),
            flags=tuple(Flag(f["kind"], f["message"]) for f in data.get("flags", [])),
            unparsed=tuple(data.get("unparsed", [])),
            package=data.get("package"),
            mounting=data.get("mounting"),
        )


__all__ = ["FAMILIES", "Alternative", "Dielectric", "Flag", "Marking", "Tolerance"]
