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

import bisect
import heapq
import math
from collections.abc import Iterable
from dataclasses import dataclass
from decimal import Decimal
from typing import Any, Literal, NamedTuple

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


class PairItem(NamedTuple):
    """One part as the pair index sees it: floats, for a fast first pass re-checked exactly later.

    Value first, so plain tuples of the same layout sort by value, then key.

    ``tol_minus``/``tol_plus`` are % magnitudes (None when not marked), ``alpha``/``alpha_tol`` ppm/K
    (``alpha`` None when the part has no linear tempco), ``volts`` the rating (None when not marked),
    ``double`` whether the same bin can give both parts of a pair.
    """

    c: float
    key: int
    tol_minus: float | None = None
    tol_plus: float | None = None
    alpha: float | None = None
    alpha_tol: float = 0.0
    volts: float | None = None
    double: bool = False


@dataclass(frozen=True)
class PairQuery:
    """What a proposed pair must meet: nominal inside [lo, hi] and, optionally, more."""

    kind: PairKind
    target: float
    lo: float
    hi: float
    worst_case: bool = False        # the tolerance bands' corners must stay inside [lo, hi] too
    tempco_lo: float = -math.inf    # the net tempco band must lie in [tempco_lo, tempco_hi]
    tempco_hi: float = math.inf
    working_v: float | None = None  # each part's share must not exceed its rating

    @property
    def wants_tempco(self) -> bool:
        return not (math.isinf(self.tempco_lo) and math.isinf(self.tempco_hi))


_BUDGET = 256  # partners looked at per part and group before moving on (bounds the worst case)
_SLACK = 1e-9  # relative margin so float rounding never drops a pair the exact check would keep
_EMPTY = (1.0, 0.0)


def _down(x: float) -> float:
    """x moved a little towards −∞ (a lower bound loosened, whatever its sign)."""
    return x - _SLACK * (abs(x) + 1.0)


def _up(x: float) -> float:
    """x moved a little towards +∞ (an upper bound loosened, whatever its sign)."""
    return x + _SLACK * (abs(x) + 1.0)


def _linear(a: float, b: float, lo: float, hi: float) -> tuple[float, float]:
    """Narrow [lo, hi] to the x with a·x + b ≤ 0, the bound loosened by the slack either way.

    With a > 0 the bound −b/a is an upper one, with a < 0 a lower one: each is moved outward, so
    float rounding never drops an x the exact check keeps (a pair exactly on the window's edge).
    """
    margin = _SLACK * (abs(b) + 1.0)
    if a > 0:
        return lo, min(hi, _up((-b + margin) / a))
    if a < 0:
        return max(lo, _down((-b + margin) / a)), hi
    return (lo, hi) if b <= margin else _EMPTY


def _tempco_interval(q: PairQuery, c1: float, a1: float, t1: float, a2: float, t2: float,
                     x_lo: float, x_hi: float) -> tuple[float, float]:
    """Narrow the partner interval to the C₂ that keep the net tempco band inside the window.

    Net = (w₁α₁ + w₂α₂)/(w₁ + w₂) with (w₁, w₂) = (C₁, C₂) in parallel and (C₂, C₁) in series, and
    the band's half-width combines the same way; each bound is therefore linear in C₂.
    """
    if not math.isinf(q.tempco_hi):
        h = q.tempco_hi
        if q.kind == "parallel":
            x_lo, x_hi = _linear(a2 + t2 - h, c1 * (a1 + t1 - h), x_lo, x_hi)
        else:
            x_lo, x_hi = _linear(a1 + t1 - h, c1 * (a2 + t2 - h), x_lo, x_hi)
    if not math.isinf(q.tempco_lo):
        w = q.tempco_lo
        if q.kind == "parallel":
            x_lo, x_hi = _linear(w - a2 + t2, c1 * (w - a1 + t1), x_lo, x_hi)
        else:
            x_lo, x_hi = _linear(w - a1 + t1, c1 * (w - a2 + t2), x_lo, x_hi)
    return x_lo, x_hi


# Tolerance steps (%) for grouping partners: the usual marked tolerances (IEC 60062 letters).
_TOLERANCE_STEPS = (0.5, 1.0, 2.0, 5.0, 10.0, 20.0, 50.0, 100.0)


def _tolerance_interval(parallel: bool, c1: float, m1: float, p1: float, m2: float, p2: float,
                        lo: float, hi: float, x_lo: float, x_hi: float) -> tuple[float, float]:
    """Narrow the partner interval to the C₂ whose worst case could stay in [lo, hi].

    ``m2``/``p2`` are the tightest tolerances in the partner group, so the bound is never tighter
    than any member's own (each member is still checked on its own tolerance).
    """
    lo1, hi1 = c1 * (1 - m1 / 100), c1 * (1 + p1 / 100)
    f_lo, f_hi = 1 - m2 / 100, 1 + p2 / 100
    if f_lo <= 0:
        return _EMPTY
    if parallel:  # lo1 + C₂·f_lo ≥ lo and hi1 + C₂·f_hi ≤ hi
        return max(x_lo, _down((lo - lo1) / f_lo)), min(x_hi, _up((hi - hi1) / f_hi))
    if lo1 <= lo:  # the low corner of a series pair is below either part's low limit
        return _EMPTY
    x_lo = max(x_lo, _down(lo1 * lo / (lo1 - lo) / f_lo))
    if hi1 > hi:
        x_hi = min(x_hi, _up(hi1 * hi / (hi1 - hi) / f_hi))
    return x_lo, x_hi


def _value(kind: PairKind, c1: float, c2: float) -> float:
    return c1 + c2 if kind == "parallel" else c1 * c2 / (c1 + c2)


class PairIndex:
    """Parts sorted by value for the complement search, grouped by tempco when a window applies.

    Build it once from :class:`PairItem` tuples (any order) and ask :meth:`nearest` for each pair
    kind; the grouping is computed once per kind of question (with or without a tempco window).
    """

    def __init__(self, items: Iterable[PairItem]):
        self.items = sorted(items)  # by value, then key (keys are unique, so no further field compares)
        self._groups: dict[tuple[bool, bool], list[tuple[float, float, list[PairItem], list[float]]]] = {}

    def groups(self, tempco: bool, worst_case: bool) -> list[tuple[Any, ...]]:
        """The partner groups: (α, α tolerance, tightest minus %, tightest plus %, members, values).

        With a tempco window, one group per (α, tolerance on α). Without one, when the pair's worst
        case counts, one group per tolerance step (see :data:`_TOLERANCE_STEPS`), so a bound
        computed from a group's tightest member excludes few of the others.
        """
        key = (tempco, worst_case)
        if key not in self._groups:
            grouped: dict[tuple[Any, ...], list[PairItem]] = {}
            for it in self.items:
                if (tempco and it[4] is None) or (worst_case and (it[2] is None or it[3] is None)):
                    continue
                # Split by tolerance only without a tempco window: tempco groups times tolerance
                # steps would cost more per anchor than the walks they save.
                step = (bisect.bisect_left(_TOLERANCE_STEPS, max(it[2], it[3]))
                        if worst_case and not tempco else 0)
                grouped.setdefault((it[4], it[5], step) if tempco else (0.0, 0.0, step), []).append(it)
            self._groups[key] = [
                (a, t, min(it[2] for it in members) if worst_case else 0.0,
                 min(it[3] for it in members) if worst_case else 0.0, members, [it[0] for it in members])
                for (a, t, _), members in grouped.items()]
        return self._groups[key]

    def nearest(self, q: PairQuery, limit: int, *, per_part: int | None = None,
                exclude: frozenset[int] | set[int] = frozenset()) -> list[tuple[float, int, int]]:
        """The pairs whose value comes nearest the target, as (error %, key₁, key₂), best first.

        Not O(n²). Only the parts that can be the *anchor* of a pair are visited: the larger part of
        a parallel pair, which lies in [lo/2, hi], and the smaller part of a series pair, in
        (lo, 2·hi]. For each anchor the complement (parallel C₂ = T − C₁, series
        C₂ = C₁·T/(C₁ − T)) is found by bisection in each group, and partners are taken outward from
        it in order of the pair's error, inside the interval that keeps the nominal value and the
        net tempco band in bounds. At most ``per_part`` partners (default ``limit``) are kept per
        anchor and group, looking at no more than a fixed budget, and the best ``limit`` pairs
        overall. A first pass in floats: the caller re-checks every pair exactly. Cost: O(a·g·log n)
        for a anchors and g tempco groups, after the O(n log n) sort.

        >>> index = PairIndex([PairItem(100.0, 1), PairItem(47.0, 2), PairItem(50.0, 3)])
        >>> index.nearest(PairQuery("parallel", 147.0, 140.0, 155.0), 5)
        [(0.0, 1, 2), (2.0408163265306123, 1, 3)]
        """
        per_part = per_part or limit
        tempco = q.wants_tempco
        table = self.groups(tempco, q.worst_case)
        target, lo, hi = q.target, q.lo * (1 - _SLACK), q.hi * (1 + _SLACK)
        parallel = q.kind == "parallel"
        band_lo, band_hi = (lo / 2, hi) if parallel else (lo, 2 * hi)
        worst, volts_needed = q.worst_case, q.working_v
        anchors = [it for *_, members, caps in table
                   for it in members[bisect.bisect_left(caps, band_lo):bisect.bisect_right(caps, band_hi)]
                   if it[1] not in exclude]
        best: list[tuple[float, int, int]] = []  # heap of (−error, −key₁, −key₂): the worst kept on top
        for one in anchors:
            c1, k1, m1, p1, a1, t1, v1, double1 = one
            if parallel:
                ideal, x_lo, x_hi = target - c1, lo - c1, min(hi - c1, c1)
            else:
                if c1 <= lo:
                    continue
                ideal = c1 * target / (c1 - target) if c1 > target else math.inf
                x_lo = max(c1 * lo / (c1 - lo), c1)
                x_hi = c1 * hi / (c1 - hi) if c1 > hi else math.inf
            for a2, t2, m2, p2, members, caps in table:
                y_lo, y_hi = _tempco_interval(q, c1, a1, t1, a2, t2, x_lo, x_hi) if tempco else (x_lo, x_hi)
                if worst:
                    y_lo, y_hi = _tolerance_interval(parallel, c1, m1, p1, m2, p2, lo, hi, y_lo, y_hi)
                if y_lo > y_hi:
                    continue
                start, stop = bisect.bisect_left(caps, y_lo), bisect.bisect_right(caps, y_hi)
                if start >= stop:
                    continue
                mid = min(max(bisect.bisect_left(caps, ideal), start), stop)
                left, right, taken, looked = mid - 1, mid, 0, 0
                while taken < per_part and looked < _BUDGET and (left >= start or right < stop):
                    # The pair's value rises with C₂, so its error grows away from the complement
                    # on either side; stepping to the nearer side walks partners in order of error.
                    if parallel:
                        err_l = abs(c1 + caps[left] - target) if left >= start else math.inf
                        err_r = abs(c1 + caps[right] - target) if right < stop else math.inf
                    else:
                        err_l = abs(c1 * caps[left] / (c1 + caps[left]) - target) if left >= start else math.inf
                        err_r = abs(c1 * caps[right] / (c1 + caps[right]) - target) if right < stop else math.inf
                    if err_l <= err_r:
                        two, err, left = members[left], err_l, left - 1
                    else:
                        two, err, right = members[right], err_r, right + 1
                    err = err * 100 / target
                    if len(best) >= limit and -best[0][0] <= err:
                        break  # every partner further out is worse than all pairs kept
                    looked += 1
                    c2, k2, n2, q2, _, _, v2, _ = two
                    # Each unordered pair once: the partner is the smaller (parallel) or the larger
                    # (series) part, ties broken by key; the same bin twice only if it holds enough.
                    if ((c2, k2) > (c1, k1)) if parallel else ((c2, k2) < (c1, k1)):
                        continue
                    if (k1 == k2 and not double1) or k2 in exclude:
                        continue
                    if worst:
                        low = _value(q.kind, c1 * (1 - m1 / 100), c2 * (1 - n2 / 100))
                        high = _value(q.kind, c1 * (1 + p1 / 100), c2 * (1 + q2 / 100))
                        if low < lo or high > hi:
                            continue
                    if volts_needed is not None:
                        if v1 is None or v2 is None:
                            continue
                        share1 = volts_needed if parallel else volts_needed * c2 / (c1 + c2)
                        share2 = volts_needed if parallel else volts_needed * c1 / (c1 + c2)
                        if v1 < share1 * (1 - _SLACK) or v2 < share2 * (1 - _SLACK):
                            continue
                    taken += 1
                    entry = (-err, -k1, -k2)
                    if len(best) < limit:
                        heapq.heappush(best, entry)
                    else:
                        heapq.heapreplace(best, entry)
        return sorted((-e, -k1, -k2) for e, k1, k2 in best)


__all__ = ["PAIR_KINDS", "PairIndex", "PairItem", "PairKind", "PairQuery", "band", "pair_bounds",
           "pair_tempco", "pair_tempco_spread", "pair_tolerance_pct", "pair_value", "pair_voltage_rating",
           "parallel_complement", "parallel_tempco", "parallel_value", "part_voltages",
           "series_complement", "series_tempco", "series_value", "series_voltage_split",
           "worst_deviation_pct"]
