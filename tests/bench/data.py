"""Generated stock sheets and stores for the benchmarks (deterministic for a given seed).

The markings are the kinds a repair shop's sheet holds, written the way parts are printed:
IEC 60062 three-digit codes with tolerance letters and EIA voltage codes ("104K 2A X7R"),
letter-and-digit codes ("4n7 J 100V"), values with units and dielectric names ("47pF NP0"),
colour bands as words ("yellow violet orange"), electrolytics ("2200uF 25V 105C") and film parts
("220n 63V MKT"). Values are E12/E24 significands (IEC 60063, via :mod:`stock.preferred_values`).
Markings repeat, as in a real sheet, and a small share of rows is bad on purpose (unreadable
marking, "lots" as a count, a negative count, a blank marking) so the quarantine path is timed too.
The shop is fictional: "Harrow Lane Radio Repairs".
"""

from __future__ import annotations

import csv
import json
import math
import random
from decimal import Decimal
from pathlib import Path
from typing import Any, Iterator

from stock.markings.preferred_values import series

HEADERS = ("Cabinet", "Location", "Marking", "Qty", "Notes")
CABINETS = ("Harrow bench", "Back room", "Drawer wall", "Shelf 3")

_E12 = series("E12")
_E24 = series("E24")
_COLOURS = ("black", "brown", "red", "orange", "yellow", "green", "blue", "violet", "grey", "white")
_NOTES = ("", "", "", "", "from the Marconi chassis", "salvaged", "new stock", "check leads", "tape & reel")


def _sig_digits(sig: Decimal) -> str:
    """Two significant figures of an E-series value as written in a code ("4.7" → "47")."""
    return f"{int(sig * 10):02d}"


def _three_digit(rng: random.Random) -> str:
    sig = rng.choice(_E12 if rng.random() < 0.7 else _E24)
    exponent = rng.randrange(0, 6)  # 10 pF … 1 µF
    diel = rng.choice(("X7R", "X7R", "C0G", "NP0", "X5R", "Y5V", "", ""))
    tol = rng.choice("JK" if diel in ("C0G", "NP0") else "KKJZ") if diel != "Y5V" else "Z"
    volts = rng.choice(("1H", "2A", "1E", "2E", "50V", "100V", ""))
    return " ".join(p for p in (f"{_sig_digits(sig)}{exponent}{tol}", volts, diel) if p)


def _letter_digit(rng: random.Random) -> str:
    sig = rng.choice(_E12)
    prefix, scale = rng.choice((("p", 1), ("n", 1), ("n", 10), ("n", 100), ("u", 1)))
    value = sig * scale
    whole, frac = divmod(value, 1)
    code = f"{int(whole)}{prefix}{str(frac)[2:3].rstrip('0')}" if frac else f"{int(whole)}{prefix}"
    if code[0] == "0":
        code = f"{prefix}{str(frac)[2:3]}"
    tol = rng.choice(("J", "K", "", "M"))
    volts = rng.choice(("63V", "100V", "250V", "400V", ""))
    return " ".join(p for p in (code, tol, volts) if p)


def _with_unit(rng: random.Random) -> str:
    sig = rng.choice(_E24)
    value = sig * 10 ** rng.randrange(0, 3)  # 1 pF … 910 pF
    text = f"{value.normalize():f}pF"
    extra = rng.choice(("NP0", "C0G", "N750", "5% 500V", "N150 100V", ""))
    return f"{text} {extra}".strip()


def _colour_bands(rng: random.Random) -> str:
    sig = int(rng.choice(_E12) * 10)
    bands = [_COLOURS[sig // 10], _COLOURS[sig % 10], _COLOURS[rng.randrange(1, 5)]]
    if rng.random() < 0.4:
        bands.append(rng.choice(("silver", "white", "black")))
    return " ".join(bands)


def _electrolytic(rng: random.Random) -> str:
    sig = rng.choice(_E12[::2])  # 1.0, 1.5, 2.2, 3.3, 4.7, 6.8
    value = sig * 10 ** rng.randrange(0, 4)
    volts = rng.choice(("6.3V", "10V", "16V", "25V", "35V", "50V", "63V", "100V", "450V"))
    temp = rng.choice(("85C", "105C", ""))
    family = rng.choice(("", "", "tantalum")) if value < 100 else ""
    return " ".join(p for p in (f"{value.normalize():f}uF", volts, temp, family) if p)


def _film(rng: random.Random) -> str:
    sig = rng.choice(_E12)
    value = sig * 10 ** rng.randrange(0, 3)  # 1 nF … 820 nF
    volts = rng.choice(("63V", "100V", "250V", "400V", "630V"))
    kind = rng.choice(("MKT", "MKP", "polyester", "polypropylene", "polystyrene"))
    return f"{value.normalize():f}n {volts} {kind}"


_BAD = ("???", "see label", "smudged", "")
_MAKERS = ((_three_digit, 0.40), (_letter_digit, 0.15), (_with_unit, 0.15), (_colour_bands, 0.08),
           (_electrolytic, 0.14), (_film, 0.08))


def marking(rng: random.Random) -> str:
    """One realistic marking text, drawn by kind with shop-like weights."""
    x = rng.random()
    for maker, weight in _MAKERS:
        if x < weight:
            return maker(rng)
        x -= weight
    return _three_digit(rng)


def sheet_rows(n: int, seed: int = 11, *, bad_share: float = 0.005,
               distinct: int = 3000) -> Iterator[tuple[str, ...]]:
    """``n`` data rows (cabinet, location, marking, qty, notes); markings drawn from a pool.

    A pool of up to ``distinct`` different markings is drawn first and rows pick from it with a
    skewed distribution (common parts are common), so a 100 000-row sheet repeats its markings as
    shops do (top marking about 5 % of rows).
    """
    rng = random.Random(seed)
    pool = list(dict.fromkeys(marking(rng) for _ in range(distinct * 2)))[:distinct]
    distinct = len(pool)
    for i in range(n):
        cabinet = CABINETS[i % len(CABINETS)]
        location = f"{chr(65 + (i // 1000) % 26)}{i // 26000}-{i % 1000:03d}"
        # half the rows log-uniform over the pool's ranks (a few parts are everywhere), half uniform
        text = pool[int(distinct ** rng.random()) - 1 if rng.random() < 0.5 else rng.randrange(distinct)]
        qty: str = str(rng.choice((0, 1, 2, 5, 10, 20, 25, 50, 100, 250, 1000)))
        x = rng.random()
        if x < bad_share:
            kind = rng.randrange(4)
            if kind == 0:
                text = rng.choice(_BAD)
            elif kind == 1:
                qty = "lots"
            elif kind == 2:
                qty = "-3"
            else:
                qty = ""  # not counted: stored with an unknown-quantity flag
        notes = rng.choice(_NOTES)
        yield (cabinet, location, text, qty, notes)


def write_csv(path: Path, n: int, seed: int = 11) -> Path:
    """A CSV sheet of ``n`` rows under :data:`HEADERS`."""
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(HEADERS)
        w.writerows(sheet_rows(n, seed))
    return path


def write_xlsx(path: Path, n: int, seed: int = 11) -> Path:
    """The same sheet as an XLSX workbook (openpyxl write-only; counts as numbers, as people type them)."""
    from openpyxl import Workbook

    wb = Workbook(write_only=True)
    ws = wb.create_sheet("Stock")
    ws.append(list(HEADERS))
    for cabinet, location, text, qty, notes in sheet_rows(n, seed):
        count: Any = int(qty) if qty.lstrip("-").isdigit() else (qty or None)
        ws.append([cabinet, location, text or None, count, notes or None])
    wb.save(path)
    return path


def log_uniform_values(n: int, seed: int, lo_pf: float = 1.0, hi_pf: float = 1e6) -> list[float]:
    """``n`` capacitances in pF, log-uniform between ``lo_pf`` and ``hi_pf``."""
    rng = random.Random(seed)
    a, b = math.log10(lo_pf), math.log10(hi_pf)
    return [float(f"{10 ** rng.uniform(a, b):.4g}") for _ in range(n)]


_STORE_BIN = ("INSERT INTO bins (id, bin_key, location, cabinet, on_hand, created_at, updated_at)"
              " VALUES (?, ?, ?, 'bench', ?, ?, ?)")


def fill_store(store: Any, n: int, seed: int = 5, *, distinct: int = 300,
               lo_pf: float = 1.0, hi_pf: float = 1e6) -> None:
    """Put ``n`` bins into an empty store by direct executemany (no importer).

    Each bin's part is one of ``distinct`` real decoded markings (valid ``decoded_json`` and flat
    columns made by the importer's own column function), with its capacitance moved to a log-uniform
    value so a value window returns rows in proportion to its width.
    """
    from stock.inventory.row_reading import PART_COLUMNS, decode_cached, part_columns

    rng = random.Random(seed)
    forms = []
    draw = random.Random(seed + 1)
    while len(forms) < distinct:
        m = decode_cached(marking(draw))
        if m.capacitance_pf is not None and m.capacitance_pf > 0:
            forms.append((m, part_columns(m), m.to_json()))
    stamp = "2026-12-01T00:00:00+00:00"
    conn = store.db.conn
    values = log_uniform_values(n, seed, lo_pf, hi_pf)
    placeholders = ", ".join("?" * (len(PART_COLUMNS) + 5))
    insert_part = (f"INSERT INTO parts (bin_id, marking, {', '.join(PART_COLUMNS)}, package, mounting,"
                   f" decoded_json) VALUES ({placeholders})")
    with store.writing():
        batch_bins: list[tuple] = []
        batch_parts: list[tuple] = []
        for i, value in enumerate(values, start=1):
            m, columns, data = forms[rng.randrange(distinct)]
            data = dict(data, capacitance_pf=value)
            batch_bins.append((i, f"bench/{i}", f"L{i}", rng.randint(1, 500), stamp, stamp))
            batch_parts.append((i, m.text, value, *columns[1:], None, None,
                                json.dumps(data, ensure_ascii=False)))
            if len(batch_bins) >= 20000:
                conn.executemany(_STORE_BIN, batch_bins)
                conn.executemany(insert_part, batch_parts)
                batch_bins.clear()
                batch_parts.clear()
        conn.executemany(_STORE_BIN, batch_bins)
        conn.executemany(insert_part, batch_parts)
    conn.execute("ANALYZE")

