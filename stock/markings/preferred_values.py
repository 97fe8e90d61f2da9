"""IEC 60063 preferred numbers (the E series): membership, the series a value belongs to, nearest.

E3…E24 carry two significant figures and are listed as the standard prints them (eight E24 values,
2.7 3.0 3.3 3.6 3.9 4.3 4.7 8.2, depart from the rounded geometric rule). E48, E96 and E192 carry
three figures and follow ``round(10 ** (i / n), 2)``, except E192's 9.20 where the rule gives 9.19.
Values are significands in [1, 10); any power of ten scales them.

>>> lowest_series(Decimal("4700"))
'E3'
>>> lowest_series(Decimal("150"))
'E6'
>>> nearest(Decimal("150000"), "E12")  # 150 nF is already in E12
Decimal('1.5E+5')
>>> nearest(Decimal("140"), "E12")
Decimal('1.5E+2')
"""

from __future__ import annotations

from decimal import Decimal
from functools import cache

# IEC 60063, two-figure series as printed in the standard.
_E24 = tuple(Decimal(v) for v in (
    "1.0", "1.1", "1.2", "1.3", "1.5", "1.6", "1.8", "2.0", "2.2", "2.4", "2.7", "3.0",
    "3.3", "3.6", "3.9", "4.3", "4.7", "5.1", "5.6", "6.2", "6.8", "7.5", "8.2", "9.1",
))
_THREE_FIGURE_EXCEPTIONS = {("E192", 185): Decimal("9.20")}  # IEC 60063: 9.20, not the rule's 9.19

SERIES_TOLERANCE_PCT: dict[str, Decimal] = {   # the tolerance each series is associated with
    "E3": Decimal(40),    # IEC 60063 says "> 20 %"; sources give 40 % or 50 %
    "E6": Decimal(20),
    "E12": Decimal(10),
    "E24": Decimal(5),
    "E48": Decimal(2),
    "E96": Decimal(1),
    "E192": Decimal("0.5"),
}
SERIES_NAMES: tuple[str, ...] = tuple(SERIES_TOLERANCE_PCT)


@cache
def series(name: str) -> tuple[Decimal, ...]:
    """The significands of one E series, ascending, in [1, 10).

    >>> series("E6")
    (Decimal('1.0'), Decimal('1.5'), Decimal('2.2'), Decimal('3.3'), Decimal('4.7'), Decimal('6.8'))
    """
    if name not in SERIES_TOLERANCE_PCT:
        raise ValueError(f"unknown E series {name!r}; expected one of {', '.join(SERIES_NAMES)}")
    n = int(name[1:])
    if n <= 24:
        return _E24[:: 24 // n]
    return tuple(
        _THREE_FIGURE_EXCEPTIONS.get((name, i), Decimal(round(10 ** (i / n), 2)).quantize(Decimal("0.01")))
        for i in range(n)
    )


def significand(value: Decimal) -> tuple[Decimal, int]:
    """Split a positive value into a significand in [1, 10) and a power of ten.

    >>> significand(Decimal("4700"))
    (Decimal('4.7'), 3)
    """
    if value <= 0:
        raise ValueError(f"a preferred value must be positive, not {value}")
    exponent = value.adjusted()
    return value.scaleb(-exponent).normalize(), exponent


def in_series(value: Decimal, name: str) -> bool:
    """Whether a value (any decade) is one of the series' numbers.

    >>> in_series(Decimal("2.7"), "E12"), in_series(Decimal("2.7"), "E6")
    (True, False)
    """
    if value <= 0:
        return False
    sig, _ = significand(value)
    return any(sig == v for v in series(name))


def lowest_series(value: Decimal) -> str | None:
    """The coarsest series that contains the value, or None if none does.

    >>> lowest_series(Decimal("0.33")), lowest_series(Decimal("125")) is None
    ('E6', True)
    """
    for name in SERIES_NAMES:
        if in_series(value, name):
            return name
    return None


def nearest(value: Decimal, name: str) -> Decimal:
    """The series value nearest to ``value`` on a logarithmic scale (ratio, not difference).

    >>> nearest(Decimal("3.0"), "E6")
    Decimal('3.3')
    """
    sig, exponent = significand(value)
    candidates = list(series(name)) + [Decimal(10)]
    best = min(candidates, key=lambda v: max(v / sig, sig / v))
    return (best.scaleb(exponent)).normalize()


def series_for_tolerance(tolerance_pct: Decimal) -> str:
    """The series a buyer should pick values from for a given tolerance (±%).

    >>> series_for_tolerance(Decimal(10)), series_for_tolerance(Decimal(5)), series_for_tolerance(Decimal(1))
    ('E12', 'E24', 'E96')
    """
    for name in reversed(SERIES_NAMES):
        if tolerance_pct <= SERIES_TOLERANCE_PCT[name]:
            return name
    return "E3"


__all__ = ["SERIES_NAMES", "SERIES_TOLERANCE_PCT", "in_series", "lowest_series", "nearest",
           "series", "series_for_tolerance", "significand"]
