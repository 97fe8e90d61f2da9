"""Tests for stock.combining: two capacitors as one.

Outside sources: the textbook capacitor formulas (parallel C = C₁ + C₂; series 1/C = 1/C₁ + 1/C₂;
charge Q = C·V shared by parts in series), the parallel net-tempco rule TC = Σ(Cᵢ·TCᵢ)/ΣCᵢ and the
series rule TC = (C₂·TC₁ + C₁·TC₂)/(C₁ + C₂) with the worked numbers of the reference tables
(47 pF N750 ∥ 100 pF NP0 → −240 ppm/K; in series → 32 pF, −510 ppm/K), and the EIA-198 tempcos
(N750 = −750 ppm/K, NP0 = 0).
"""

from __future__ import annotations

import itertools
from decimal import Decimal, localcontext

import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st

from stock.physics import combining as cb

D = Decimal


# Textbook formulas: parallel C₁ + C₂, series C₁·C₂/(C₁ + C₂); values worked by hand.
@pytest.mark.parametrize(("kind", "c1", "c2", "expected"), [
    pytest.param("parallel", "100", "47", "147", id="100p-parallel-47p-is-147p"),
    pytest.param("parallel", "4.7", "3.3", "8.0", id="4p7-parallel-3p3-is-8p"),
    pytest.param("series", "220000", "220000", "110000", id="220n-series-220n-is-110n"),
    pytest.param("series", "30", "60", "20", id="30p-series-60p-is-20p"),
    pytest.param("series", "100", "100", "50", id="equal-parts-in-series-halve"),
])
def test_pair_value_follows_the_textbook_formula(kind, c1, c2, expected):
    assert cb.pair_value(kind, D(c1), D(c2)) == D(expected)


# Net tempco rules (docs/sources.md: [combination-formulas]): parallel weights each TC by its own C, series by
# the other C.
@pytest.mark.parametrize(("kind", "c1", "tc1", "c2", "tc2", "expected"), [
    pytest.param("parallel", "40", "-750", "60", "0", "-300", id="40p-N750-parallel-60p-NP0-is-minus-300"),
    pytest.param("parallel", "47", "-750", "100", "0", "-240", id="47p-N750-parallel-100p-NP0-is-minus-240"),
    pytest.param("series", "47", "-750", "100", "0", "-510", id="47p-N750-series-100p-NP0-is-minus-510"),
    pytest.param("series", "100", "-750", "100", "0", "-375", id="equal-series-parts-average-their-tempcos"),
    pytest.param("series", "60", "-750", "40", "0", "-300", id="series-weights-by-the-other-part"),
])
def test_net_tempco_matches_the_worked_examples(kind, c1, tc1, c2, tc2, expected):
    assert cb.pair_tempco(kind, D(c1), D(tc1), D(c2), D(tc2)).quantize(D(1)) == D(expected)


def test_series_of_47p_and_100p_is_32p_as_the_reference_table_says():
    # docs/sources.md: [combination-formulas]: "47 pF N750 in series with 100 pF NP0 → 32 pF"
    assert cb.series_value(D(47), D(100)).quantize(D(1)) == D(32)


@given(c1=st.integers(1, 10**6), c2=st.integers(1, 10**6),
       tc1=st.integers(-5000, 500), tc2=st.integers(-5000, 500))
def test_series_tempco_formula_agrees_with_heating_the_pair_by_one_kelvin(c1, c2, tc1, tc2):
    # Derivation check without the formula: warm each part by ΔT (Cᵢ(1 + αᵢΔT)), recompute the
    # series value from 1/C = 1/C₁ + 1/C₂, and read the tempco off the change.
    c1, c2, tc1, tc2 = D(c1), D(c2), D(tc1), D(tc2)
    with localcontext() as ctx:
        ctx.prec = 50
        dt = D("1e-6")
        warm1, warm2 = c1 * (1 + tc1 * D("1e-6") * dt), c2 * (1 + tc2 * D("1e-6") * dt)
        cold = cb.series_value(c1, c2)
        measured = (cb.series_value(warm1, warm2) - cold) / cold / dt * D("1e6")
        assert abs(measured - cb.series_tempco(c1, tc1, c2, tc2)) < D("1e-3")


@given(c1=st.integers(1, 10**6), c2=st.integers(1, 10**6),
       tc1=st.integers(-5000, 500), tc2=st.integers(-5000, 500))
def test_parallel_tempco_formula_agrees_with_heating_the_pair(c1, c2, tc1, tc2):
    c1, c2, tc1, tc2 = D(c1), D(c2), D(tc1), D(tc2)
    with localcontext() as ctx:
        ctx.prec = 50
        warm = c1 * (1 + tc1 * D("1e-6")) + c2 * (1 + tc2 * D("1e-6"))
        measured = (warm - (c1 + c2)) / (c1 + c2) * D("1e6")
        assert abs(measured - cb.parallel_tempco(c1, tc1, c2, tc2)) < D("1e-9")


# Charge Q = C·V is the same on both parts of a series pair, so the smaller part takes more voltage.
@pytest.mark.parametrize(("volts", "c1", "c2", "v1", "v2"), [
    pytest.param("100", "10", "40", "80", "20", id="10p-takes-four-fifths-beside-40p"),
    pytest.param("50", "220000", "220000", "25", "25", id="equal-parts-split-evenly"),
])
def test_series_voltage_splits_inversely_to_capacitance(volts, c1, c2, v1, v2):
    assert cb.series_voltage_split(D(volts), D(c1), D(c2)) == (D(v1), D(v2))


@given(v=st.integers(1, 1000), c1=st.integers(1, 10**6), c2=st.integers(1, 10**6))
def test_series_parts_carry_equal_charge_and_their_voltages_add_up(v, c1, c2):
    with localcontext() as ctx:
        ctx.prec = 50
        v1, v2 = cb.series_voltage_split(D(v), D(c1), D(c2))
        assert abs(v1 + v2 - v) < D("1e-30")
        assert abs(D(c1) * v1 - D(c2) * v2) < D("1e-25")


def test_a_pairs_voltage_rating_is_set_by_the_part_that_reaches_its_rating_first():
    # parallel: the lower rating; series: 10 p + 40 p at 100 V each → the 10 p part sees 4/5 of V.
    assert cb.pair_voltage_rating("parallel", D(10), D(50), D(40), D(100)) == D(50)
    assert cb.pair_voltage_rating("series", D(10), D(100), D(40), D(100)) == D(125)


def test_pair_worst_case_comes_from_the_corners_of_both_bands():
    # 100 p ±5 % ∥ 100 p ±1 %: 95 + 99 = 194 … 105 + 101 = 206 → ±3 % of 200 p (hand-computed)
    assert cb.pair_tolerance_pct("parallel", D(100), (D(5), D(5)), D(100), (D(1), D(1))) == (D(3), D(3))
    # series 220 n ±10 % twice: 99 n … 121 n, i.e. ±10 % of 110 n
    minus, plus = cb.pair_tolerance_pct("series", D(220000), (D(10), D(10)), D(220000), (D(10), D(10)))
    assert (minus, plus) == (D(10), D(10))


# Complements: parallel C₂ = T − C₁, series C₂ = C₁·T/(C₁ − T) (solve 1/T = 1/C₁ + 1/C₂ for C₂).
@pytest.mark.parametrize(("kind", "target", "c1", "expected"), [
    pytest.param("parallel", "147", "100", "47", id="parallel-complement-of-100p-for-147p"),
    pytest.param("parallel", "100", "100", None, id="no-parallel-complement-when-c1-reaches-target"),
    pytest.param("series", "110000", "220000", "220000", id="series-complement-of-220n-for-110n"),
    pytest.param("series", "20", "30", "60", id="series-complement-of-30p-for-20p"),
    pytest.param("series", "100", "100", None, id="no-series-complement-at-or-below-target"),
])
def test_complement_inverts_the_pair_formula(kind, target, c1, expected):
    fn = cb.parallel_complement if kind == "parallel" else cb.series_complement
    got = fn(D(target), D(c1))
    assert got == (None if expected is None else D(expected))
    if got is not None:
        assert cb.pair_value(kind, D(c1), got) == D(target)


positive = st.decimals(min_value=D("0.1"), max_value=D(10**7), places=2)
tolerance = st.tuples(st.decimals(0, 50, places=1), st.decimals(0, 80, places=1))


@given(kind=st.sampled_from(cb.PAIR_KINDS), c1=positive, c2=positive, t1=tolerance, t2=tolerance)
def test_a_combination_lies_between_its_parts_bounds(kind, c1, c2, t1, t2):
    # Parallel exceeds either part, series is below either; the worst-case band holds the nominal.
    value = cb.pair_value(kind, c1, c2)
    if kind == "parallel":
        assert value >= max(c1, c2)
    else:
        assert value <= min(c1, c2)
    lo, hi = cb.pair_bounds(kind, cb.band(c1, *t1), cb.band(c2, *t2))
    assert lo <= value <= hi
    # Each corner combination of the two bands lies inside [lo, hi] (the formulas are monotone).
    for x, y in itertools.product(cb.band(c1, *t1), cb.band(c2, *t2)):
        assert lo <= cb.pair_value(kind, x, y) <= hi


def _brute_force(kind, items, q):
    """Every pair, checked one by one (the O(n²) answer the index must agree with)."""
    best = None
    for a, b in itertools.combinations_with_replacement(items, 2):
        if a[1] == b[1] and not a[7]:
            continue
        value = a[0] + b[0] if kind == "parallel" else a[0] * b[0] / (a[0] + b[0])
        if not q.lo <= value <= q.hi:
            continue
        if q.worst_case:
            f = (lambda x, y: x + y) if kind == "parallel" else (lambda x, y: x * y / (x + y))
            if (f(a[0] * (1 - a[2] / 100), b[0] * (1 - b[2] / 100)) < q.lo
                    or f(a[0] * (1 + a[3] / 100), b[0] * (1 + b[3] / 100)) > q.hi):
                continue
        if q.wants_tempco:
            wa, wb = (a[0], b[0]) if kind == "parallel" else (b[0], a[0])
            net = (wa * a[4] + wb * b[4]) / (wa + wb)
            spread = (wa * a[5] + wb * b[5]) / (wa + wb)
            if net - spread < q.tempco_lo - 1e-6 or net + spread > q.tempco_hi + 1e-6:
                continue
        err = abs(value - q.target) * 100 / q.target
        best = err if best is None else min(best, err)
    return best


item_strategy = st.builds(
    lambda c, key, alpha, tol, double, m, p: cb.PairItem(float(c), key, float(m), float(p), float(alpha),
                                                         float(tol), None, double),
    st.integers(1, 400), st.integers(0, 10**6), st.sampled_from([0, -150, -330, -750]),
    st.sampled_from([0, 30, 60]), st.booleans(), st.sampled_from([0, 1, 2, 5, 10, 20]),
    st.sampled_from([0, 1, 2, 5, 10, 20, 80]))


@given(items=st.lists(item_strategy, min_size=1, max_size=25, unique_by=lambda it: it[1]),
       kind=st.sampled_from(cb.PAIR_KINDS), target=st.integers(5, 500),
       tempco=st.sampled_from([None, (-330.0, -270.0), (-100.0, 100.0)]), worst=st.booleans())
def test_the_index_finds_the_same_best_pair_as_checking_every_pair(items, kind, target, tempco, worst):
    lo, hi = target * 0.9, target * 1.1
    q = cb.PairQuery(kind, float(target), lo, hi, worst_case=worst,
                     tempco_lo=tempco[0] if tempco else float("-inf"),
                     tempco_hi=tempco[1] if tempco else float("inf"))
    found = cb.PairIndex(items).nearest(q, 5)
    expected = _brute_force(kind, items, q)
    if expected is None:
        assert found == []
    else:
        assert found and found[0][0] == pytest.approx(expected, abs=1e-9)


# The float pre-filter of the pair index is only a first pass: every pair the exact (Decimal)
# check accepts must come through it, also exactly on a window's edge and for negative tempcos
# (parallel net tempco = Σ Cᵢαᵢ / Σ Cᵢ, series weighted by the other part: textbook rules).
_VALUES = [D(v) for v in ("10", "22", "33", "40", "47", "56", "60", "68", "82", "100", "150")]
_ALPHAS = [(D(0), D(30)), (D(-750), D(30)), (D(-750), D(120)), (D(-150), D(60)), (D(100), D(30)),
           (D(-330), D(60))]


@settings(max_examples=150, deadline=None)
@given(st.lists(st.tuples(st.sampled_from(_VALUES), st.sampled_from(_ALPHAS),
                          st.sampled_from([D(1), D(2), D(5)])), min_size=2, max_size=9),
       st.sampled_from(["parallel", "series"]), st.sampled_from(_VALUES),
       st.integers(-800, 100), st.sampled_from([D(0), D(30), D(60)]), st.booleans())
@example([(D(40), (D(-750), D(30)), D(2)), (D(60), (D(0), D(30)), D(2))], "parallel", D(100), -300, D(30), False)
@example([(D(40), (D(-750), D(30)), D(2)), (D(60), (D(0), D(30)), D(2))], "parallel", D(100), -300, D(30), True)
def test_the_pair_prefilter_never_rejects_a_pair_the_exact_check_accepts(parts, kind, target, mid, half, worst):
    from stock.physics.combining import (PairIndex, PairItem, PairQuery, band, pair_bounds, pair_tempco,
                                         pair_tempco_spread, pair_value)

    tol = D(5)
    lo, hi = target * (1 - tol / 100), target * (1 + tol / 100)
    w_lo, w_hi = D(mid) - half, D(mid) + half
    accepted = set()
    for i, (c1, (a1, t1), m1) in enumerate(parts):
        for j, (c2, (a2, t2), m2) in enumerate(parts):
            if j <= i:
                continue
            value = pair_value(kind, c1, c2)
            if worst:
                p_lo, p_hi = pair_bounds(kind, band(c1, m1, m1), band(c2, m2, m2))
                if p_lo < lo or p_hi > hi:
                    continue
            elif not lo <= value <= hi:
                continue
            net, spread = pair_tempco(kind, c1, a1, c2, a2), pair_tempco_spread(kind, c1, t1, c2, t2)
            if net - spread < w_lo or net + spread > w_hi:
                continue
            accepted.add(frozenset((i, j)))
    index = PairIndex(PairItem(float(c), k, float(m), float(m), float(a), float(t))
                      for k, (c, (a, t), m) in enumerate(parts))
    query = PairQuery(kind, float(target), float(lo), float(hi), worst_case=worst,
                      tempco_lo=float(w_lo), tempco_hi=float(w_hi))
    proposed = {frozenset((k1, k2)) for _, k1, k2 in index.nearest(query, 10_000, per_part=10_000)}
    assert accepted <= proposed
