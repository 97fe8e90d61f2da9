"""Counts of parts as people type them in sheets: the one reader of a whole-number cell.

Bin sheets, BOM quantity columns and the stock-take sheet all read counts here, so ``25``,
``" 25 "``, ``25.0`` and a workbook's float ``25.0`` mean the same everywhere, and ``2.5``, ``-1``,
``²`` or ``1e30`` are refused everywhere with the same reason.

>>> read_quantity("25.0"), read_quantity(25.0), read_quantity("")
(25, 25, None)
"""

from __future__ import annotations

import re
from decimal import Decimal
from typing import Any

MAX_COUNT = 2**53  # larger is a typing slip, and no longer exact as a JSON number


def _shown(value: Any) -> str:
    if isinstance(value, float) and value.is_integer():
        return str(int(value))
    return str(value).strip()


_NUMBER = re.compile(r"^[+-]?(\d+(\.\d*)?|\.\d+)$")


def read_quantity(value: Any) -> int | None:
    """A count cell as a whole number; None for a blank. Raises ValueError with the reason.

    >>> read_quantity(10.0), read_quantity(" 25 "), read_quantity(None)
    (10, 25, None)
    """
    if type(value) is str and len(value) < 16 and value.isascii() and value.isdigit():
        return int(value)  # the usual cell ("25"), read without the general path below
    if value is None or (isinstance(value, str) and not value.strip()):
        return None
    if isinstance(value, bool):
        raise ValueError(f"quantity {_shown(value)!r} is not a number")
    if isinstance(value, int):
        number = value
    elif isinstance(value, float):
        if not value.is_integer():
            raise ValueError(f"quantity {_shown(value)!r} is not a whole number")
        number = int(value)
    else:
        text = str(value).strip()
        if not _NUMBER.match(text):
            raise ValueError(f"quantity {text!r} is not a number")
        exact = Decimal(text)
        if exact != exact.to_integral_value():
            raise ValueError(f"quantity {text!r} is not a whole number")
        number = int(exact)
    if number < 0:
        raise ValueError(f"quantity {_shown(value)!r} is negative")
    if number > MAX_COUNT:
        raise ValueError(f"quantity {_shown(value)!r} is too large to be a count")
    return number


__all__ = ["MAX_COUNT", "read_quantity"]
