"""Stock checks as flags: unknown quantities, bins below their minimum, electrolytics past shelf life.

Each check states what is true now: :func:`raise_stock_flags` raises a flag for each bin the
check finds (unless that bin already has an open flag of the kind, or a person settled this very
condition) and closes open flags whose condition has gone (the bin was counted or refilled).
A flag about a bin below its minimum names the ledger movement where the bin went below, so
acknowledging one shortage does not silence the next.

>>> parse_date_code("0745").how
'read as 2007 week 45'
"""

from __future__ import annotations

import re
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from datetime import date
from typing import Any

from stock.store.flag_records import close_flags
from stock.store.database import Store


# Shelf life of aluminium electrolytics stored without voltage: after about two years the oxide
# may need reforming before full voltage is applied. # common practice, no published source
# (makers' datasheets state 1-3 years for their own series; check the part's datasheet).
SHELF_LIFE_YEARS = 2
SHELF_LIFE_FAMILIES = ("aluminium-electrolytic", "bipolar-electrolytic")


@dataclass(frozen=True)
class DateCode:
    """A date code read as a date (the first day of its week, month or year) and how it was read."""

    raw: str
    date: date | None
    how: str


def parse_date_code(raw: str, today: date | None = None) -> DateCode:
    """Read a YYWW, YYYY-MM or YYYY date code; four digits that fit both take the older date.

    >>> parse_date_code("1832").date
    datetime.date(2018, 8, 6)
    >>> parse_date_code("2019-04").date
    datetime.date(2019, 4, 1)
    >>> parse_date_code("2012", today=date(2026, 12, 1)).how
    'read as the year 2012 (it could also be 2020 week 12)'
    >>> parse_date_code("Q3").date is None
    True
    """
    today = today or date.today()
    text = raw.strip()
    m = re.fullmatch(r"(\d{4})[-/.](\d{1,2})", text)
    if m and 1 <= int(m[2]) <= 12:
        return DateCode(raw, date(int(m[1]), int(m[2]), 1), f"read as {m[1]}-{int(m[2]):02d}")
    if re.fullmatch(r"\d{4}", text):
        yy, ww = int(text[:2]), int(text[2:])
        year = 2000 + yy if 2000 + yy <= today.year else 1900 + yy
        week = None
        if 1 <= ww <= 53:
            try:
                week = date.fromisocalendar(year, ww, 1)
            except ValueError:
                week = None
        as_year = date(int(text), 1, 1) if 1950 <= int(text) <= today.year else None
        if week and as_year:
            older = min(week, as_year)
            if older == as_year:
                return DateCode(raw, as_year, f"read as the year {text} (it could also be {year} week {ww})")
            return DateCode(raw, week, f"read as {year} week {ww} (it could also be the year {text})")
        if week:
            return DateCode(raw, week, f"read as {year} week {ww}")
        if as_year:
            return DateCode(raw, as_year, f"read as the year {text}")
    return DateCode(raw, None, "not understood (expected YYWW, YYYY-MM or YYYY)")


def _age(since: date, today: date) -> str:
    months = (today.year - since.year) * 12 + today.month - since.month
    return f"about {months // 12} years {months % 12} months old" if months >= 12 else f"{months} months old"


@dataclass(frozen=True)
class FlagRun:
    """What a check did: flags raised (new), and flags closed because they are no longer true."""

    raised: int
    closed: int


def sync_flags(store: Store, kinds: Iterable[str], wanted: list[dict[str, Any]],
               reason: str, *, per_bin: bool) -> FlagRun:
    """Raise the wanted flags and close open flags of these kinds that are no longer wanted.

    Each wanted flag is a dict of :meth:`Store.raise_flag` arguments. A flag a person settled is
    not raised again (its fingerprint is known); an open one whose condition has gone is closed
    with a decision saying so. With ``per_bin`` a flag is "the same" when kind and bin match
    (so an open flag raised elsewhere, say by the import, under another fingerprint counts);
    otherwise only the fingerprint identifies it.
    """
    kinds = tuple(kinds)
    marks = ",".join("?" * len(kinds))
    raised = 0
    with store.writing():
        existing = store.rows(
            f"SELECT id, kind, bin_id, fingerprint FROM flags WHERE status = 'open' AND kind IN ({marks})",
            kinds)

        def same(w: Mapping[str, Any]) -> tuple[Any, ...]:
            return (w["kind"], w.get("bin_id")) if per_bin else (w["fingerprint"],)

        held = {same(r) for r in existing}
        for w in wanted:
            if same(w) not in held and store.raise_flag(**w) is not None:
                raised += 1
        keep = {same(w) for w in wanted}
        stale = [r["id"] for r in existing if same(r) not in keep]
        close_flags(store, stale, {"via": "check", "by": "stock", "note": reason})
        closed = len(stale)
    return FlagRun(raised, closed)


def _below_since(store: Store) -> dict[int, int | None]:
    """For each bin below its minimum, the ledger id where it last went below (None: always was)."""
    rows = store.rows("""
        WITH run AS (SELECT bin_id, id, SUM(delta) OVER (PARTITION BY bin_id ORDER BY id) AS total
                     FROM ledger)
        SELECT b.id AS bin_id,
               (SELECT MIN(r.id) FROM run r WHERE r.bin_id = b.id AND r.id >
                   COALESCE((SELECT MAX(r2.id) FROM run r2 WHERE r2.bin_id = b.id
                             AND r2.total >= b.minimum), 0)) AS since
        FROM bins b WHERE b.minimum IS NOT NULL AND b.on_hand IS NOT NULL AND b.on_hand < b.minimum
    """)
    return {r["bin_id"]: r["since"] for r in rows}


def raise_stock_flags(store: Store, *, today: date | None = None) -> FlagRun:
    """Flag unknown quantities, bins below their minimum and electrolytics past their shelf life.

    Open flags whose condition no longer holds (the bin was counted, refilled, restocked with a
    newer date code) are closed with a note saying so.
    """
    today = today or date.today()
    wanted: list[dict[str, Any]] = []
    for b in store.rows("SELECT id, bin_key FROM bins WHERE on_hand IS NULL ORDER BY id"):
        wanted.append(dict(kind="unknown-quantity", bin_id=b["id"],
                           fingerprint=f"{b['bin_key']}|unknown-quantity",
                           message=f"bin {b['bin_key']}: the quantity is unknown"))
    since = _below_since(store)
    for b in store.rows("SELECT id, bin_key, on_hand, minimum FROM bins WHERE minimum IS NOT NULL"
                        " AND on_hand IS NOT NULL AND on_hand < minimum ORDER BY id"):
        episode = since.get(b["id"]) or "start"
        wanted.append(dict(
            kind="below-minimum", bin_id=b["id"],
            fingerprint=f"{b['bin_key']}|below-minimum|{b['minimum']}|{episode}",
            message=f"bin {b['bin_key']} holds {b['on_hand']}, below its minimum of {b['minimum']}",
            details={"on_hand": b["on_hand"], "minimum": b["minimum"]}))
    families = ",".join("?" * len(SHELF_LIFE_FAMILIES))
    for b in store.rows(
            f"SELECT b.id, b.bin_key, b.date_code, p.family FROM bins b JOIN parts p ON p.bin_id = b.id"
            f" WHERE b.date_code IS NOT NULL AND TRIM(b.date_code) != '' AND p.family IN ({families})"
            " ORDER BY b.id", SHELF_LIFE_FAMILIES):
        code = parse_date_code(b["date_code"], today)
        if code.date is None:
            message = f"bin {b['bin_key']}: date code {b['date_code']!r} {code.how}; its age is unknown"
            age = "age unknown"
        else:
            limit = code.date.replace(year=code.date.year + SHELF_LIFE_YEARS,
                                      day=min(code.date.day, 28))
            if today < limit:
                continue
            age = _age(code.date, today)
            message = (f"bin {b['bin_key']}: {b['family']} with date code {b['date_code']}"
                       f" ({code.how}) is {age}, past the {SHELF_LIFE_YEARS}-year shelf-life rule")
        wanted.append(dict(kind="shelf-life", bin_id=b["id"],
                           fingerprint=f"{b['bin_key']}|shelf-life|{b['date_code']}",
                           message=message,
                           details={"date_code": b["date_code"], "read": code.how, "age": age,
                                    "rule_years": SHELF_LIFE_YEARS}))
    return sync_flags(store, ("unknown-quantity", "below-minimum", "shelf-life"), wanted,
                      "no longer true at the last stock check", per_bin=True)


__all__ = ["SHELF_LIFE_FAMILIES", "SHELF_LIFE_YEARS", "DateCode", "FlagRun", "parse_date_code",
           "raise_stock_flags", "sync_flags"]
