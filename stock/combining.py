"""Two capacitors as one: the value, tempco, voltage share and worst case of a parallel or series pair.

Pure functions over ``Decimal``; no store, no grading. The formulas are the textbook ones:

- Parallel: C = C₁ + C₂. Each part sees the whole voltage.
- Series: 1/C = 1/C₁ + 1/C₂, so C = C₁·C₂ / (C₁ + C₂). The same charge sits on both parts, so the
  voltage splits inversely to capacitance: V₁ = V·C₂ / (C₁ + C₂), V₂ = V·C₁ / (C₁ + C₂).
- Net tempco of a parallel pair: the capacitance-weighted mean, α = (C₁α₁ + C₂α₂) / (C₁ + C₂)
  (differentiate C = C₁ + C₂ and divide by C).
- Net tempco of a series pair, derived: with Cᵢ(T) = Cᵢ(1 + αᵢΔT), differentiate 1/C = 1/C₁ + 1/C₂:
  −dC/C² = −dC₁/C₁² − dC₂/C₂², so dC/C = (C/C₁)·dC₁/C₁ + (C/C₂)·dC₂/C₂ = (C/C₁)·α₁dT + (C/C₂)·α₂dT.
  Since C/C₁ = C₂/(C₁ + C₂), α = (C₂α₁ + C₁α₂) / (C₁ + C₂): each tempco is weighted by the *other*
  part's capacitance, because the smaller part dominates a series pair.

Both values rise with each part's value, so a pair's worst case lies at the corners: both parts at
their low limits, or both at their high limits.

>>> parallel_value(Decimal(100), Decimal(47))
Decimal('147')
>>> series_value(Decimal(220000), Decimal(220000))
Decimal('110000')
>>> parallel_tempco(Decimal(40), Decimal(-750), Decimal(60), Decimal(0))
Decimal('-300')
"""

from __future__ import annotations

from decimal import Decimal
from typing import Literal

PairKind = Literal["parallel", "series"]
PAIR_KINDS: tuple[PairKind, ...] = ("parallel", "series")

_HUNDRED = Decimal(100)


def _positive(*values: Decimal) -> None:
    for v in values:
        if v <= 0:
            raise ValueError(f"a capacitance must be positive, not {v}")


def parallel_value(c1: Decimal, c2: Decimal) -> Decimal:
    """Capacitance of two parts in parallel, C₁ + C₂.

    >>> parallel_value(Decimal("4.7"), Decimal("3.3"))
    Decimal('8.0')
    """
    _positive(c1, c2)
    return c1 + c2


def series_value(c1: Decimal, c2: Decimal) -> Decimal:
    """Capacitance of two parts in series, C₁·C₂ / (C₁ + C₂).

    >>> series_value(Decimal(100), Decimal(100))
    Decimal('50')
    """
    _positive(c1, c2)
    return c1 * c2 / (c1 + c2)


def pair_value(kind: PairKind, c1: Decimal, c2: Decimal) -> Decimal:
    """The value of a pair of either kind.

    >>> pair_value("series", Decimal(30), Decimal(60))
    Decimal('20')
    """
    if kind == "parallel":
        return parallel_value(c1, c2)
    if kind == "series":
        return series_value(c1, c2)
    raise ValueError(f"pair kind {kind!r} is not one of {', '.join(PAIR_KINDS)}")


def parallel_tempco(c1: Decimal, tc1: Decimal, c2: Decimal, tc2: Decimal) -> Decimal:
    """Net tempco (ppm/K) of a parallel pair: the capacitance-weighted mean of the two.

    >>> parallel_tempco(Decimal(47), Decimal(-750), Decimal(100), Decimal(0)).quantize(Decimal(1))
    Decimal('-240')
    """
    _positive(c1, c2)
    return (c1 * tc1 + c2 * tc2) / (c1 + c2)


def series_tempco(c1: Decimal, tc1: Decimal, c2: Decimal, tc2: Decimal) -> Decimal:
    """Net tempco (ppm/K) of a series pair: each tempco weighted by the other part's capacitance.

    See the module docstring for the derivation from 1/C = 1/C₁ + 1/C₂.

    >>> series_tempco(Decimal(47), Decimal(-750), Decimal(100), Decimal(0)).quantize(Decimal(1))
    Decimal('-510')
    """
    _positive(c1, c2)
    return (c2 * tc1 + c1 * tc2) / (c1 + c2)


def pair_tempco(kind: PairKind, c1: Decimal, tc1: Decimal, c2: Decimal, tc2: Decimal) -> Decimal:
    """Net tempco of a pair of either kind."""
    if kind == "parallel":
        return parallel_tempco(c1, tc1, c2, tc2)
    return series_tempco(c1, tc1, c2, tc2)


def pair_tempco_spread(kind: PairKind, c1: Decimal, tol1: Decimal, c2: Decimal, tol2: Decimal) -> Decimal:
    """The ± tolerance (ppm/K) on a pair's net tempco from its parts' ± tempco tolerances.

    Net tempco is linear in each part's tempco with positive weights, so the tolerances combine with
    the same weights.

    >>> pair_tempco_spread("parallel", Decimal(40), Decimal(120), Decimal(60), Decimal(30))
    Decimal('66')
    """
    return pair_tempco(kind, c1, tol1, c2, tol2)


def series_voltage_split(volts: Decimal, c1: Decimal, c2: Decimal) -> tuple[Decimal, Decimal]:
    """The voltage across each part of a series pair: inversely to capacitance (same charge Q = CV).

    >>> series_voltage_split(Decimal(100), Decimal(10), Decimal(40))
    (Decimal('80'), Decimal('20'))
    """
    _positive(c1, c2)
    return volts * c2 / (c1 + c2), volts * c1 / (c1 + c2)


def part_voltages(kind: PairKind, volts: Decimal, c1: Decimal, c2: Decimal) -> tuple[Decimal, Decimal]:
    """The voltage each part of a pair must stand: all of it in parallel, its share in series."""
    if kind == "parallel":
        return volts, volts
    return series_voltage_split(volts, c1, c2)


def pair_voltage_rating(kind: PairKind, c1: Decimal, v1: Decimal, c2: Decimal, v2: Decimal) -> Decimal:
    """The highest voltage the pair stands without either part exceeding its own rating.

    Parallel: the lower rating. Series: the total at which the first part reaches its rating
    (V₁ = V·C₂/(C₁+C₂) ≤ v₁ ⇒ V ≤ v₁·(C₁+C₂)/C₂, likewise for the second). This ignores leakage
    imbalance, which for electrolytics calls for balancing resistors.

    >>> pair_voltage_rating("series", Decimal(10), Decimal(100), Decimal(10), Decimal(100))
    Decimal('200')
    >>> pair_voltage_rating("series", Decimal(10), Decimal(100), Decimal(40), Decimal(100))
    Decimal('125')
    """
    if kind == "parallel":
        return min(v1, v2)
    _positive(c1, c2)
    return min(v1 * (c1 + c2) / c2, v2 * (c1 + c2) / c1)


def band(nominal: Decimal, minus_pct: Decimal, plus_pct: Decimal) -> tuple[Decimal, Decimal]:
    """The (low, high) limits of a part from its nominal value and tolerance magnitudes in %.

    >>> band(Decimal(100), Decimal(10), Decimal(20))
    (Decimal('90.0'), Decimal('120.0'))
    """
    return nominal * (1 - minus_pct / _HUNDRED), nominal * (1 + plus_pct / _HUNDRED)


def pair_bounds(kind: PairKind, band1: tuple[Decimal, Decimal],
                band2: tuple[Decimal, Decimal]) -> tuple[Decimal, Decimal]:
    """The lowest and highest value a pair can take when each part may lie anywhere in its band.

    Both pair formulas rise with each part's value, so the extremes are at the corners.

    >>> pair_bounds("parallel", (Decimal(90), Decimal(110)), (Decimal(45), Decimal(55)))
    (Decimal('135'), Decimal('165'))
    """
    return pair_value(kind, band1[0], band2[0]), pair_value(kind, band1[1], band2[1])


def pair_tolerance_pct(kind: PairKind, c1: Decimal, tol1: tuple[Decimal, Decimal],
                       c2: Decimal, tol2: tuple[Decimal, Decimal]) -> tuple[Decimal, Decimal]:
    """A pair's worst-case tolerance (minus %, plus %) about its own nominal, from its parts' tolerances.

    Args:
        kind: "parallel" or "series".
        c1, c2: the parts' nominal values.
        tol1, tol2: each part's (minus %, plus %) magnitudes.

    Returns:
        (minus %, plus %) magnitudes of the pair about C = pair_value(kind, c1, c2). Two equal
        ±5 % parts give ±5 % either way; mixed tolerances give something between them.

    >>> pair_tolerance_pct("parallel", Decimal(100), (Decimal(5), Decimal(5)), Decimal(100), (Decimal(1), Decimal(1)))
    (Decimal('3.00'), Decimal('3.00'))
    """
    nominal = pair_value(kind, c1, c2)
    lo, hi = pair_bounds(kind, band(c1, *tol1), band(c2, *tol2))
    return (nominal - lo) * _HUNDRED / nominal, (hi - nominal) * _HUNDRED / nominal


def worst_deviation_pct(target: Decimal, low: Decimal, high: Decimal) -> Decimal:
    """The largest deviation (in % of ``target``) of any value in [low, high] from the target.

    >>> worst_deviation_pct(Decimal(100), Decimal(97), Decimal("101.5"))
    Decimal('3')
    """
    return max(abs(low - target), abs(high - target)) * _HUNDRED / target


def parallel_complement(target: Decimal, c1: Decimal) -> Decimal | None:
    """The C₂ that makes C₁ ∥ C₂ equal the target, or None when C₁ alone reaches it.

    >>> parallel_complement(Decimal(147), Decimal(100))
    Decimal('47')
    """
    c2 = target - c1
    return c2 if c2 > 0 else None


def series_complement(target: Decimal, c1: Decimal) -> Decimal | None:
    """The C₂ that makes C₁ in series with C₂ equal the target: C₂ = C₁·T / (C₁ − T).

    None when C₁ ≤ T: a series pair is always smaller than either part.

    >>> series_complement(Decimal(110000), Decimal(220000))
    Decimal('220000')
    """
    if c1 <= target:
        return None
    return c1 * target / (c1 - target)


__all__ = ["PAIR_KINDS", "PairKind", "band", "pair_bounds", "pair_tempco", "pair_tempco_spread",
           "pair_tolerance_pct", "pair_value", "pair_voltage_rating", "parallel_complement",
           "parallel_tempco", "parallel_value", "part_voltages", "series_complement", "series_tempco",
           "series_value", "series_voltage_split", "worst_deviation_pct"]
