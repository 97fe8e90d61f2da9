"""Inputs that once broke something, kept so they never break it again.

Each entry says what failed, where, and what the right outcome is. The hostile-input suites
(tests/system/test_fuzz_*.py, tests/system/test_hostile_files.py) run every entry through the real code path.
Source: hostile inputs are common practice in fuzzing, no published source; each entry here was
found by this project's own fuzz tests.
"""

from __future__ import annotations

# Text given to stock.markings.decode and stock.colour_codes.decode_colours: each must give a
# Marking (never raise). Kept: inputs near the edges the decoders split on, and the shapes the
# fuzzers generate that are slowest or most tangled.
DECODER_TEXTS: tuple[str, ...] = (
    "",
    " ",
    "\x00",
    "\x00104\x00",
    "104\r\n472",
    "\u202e104K",                       # right-to-left override before a code
    "１０４Ｋ",                          # full-width digits and letter
    "٣٣٣",                             # Arabic-Indic digits match \d in Python regexes
    "²²³",                             # superscript digits do not
    "1" * 100_000,                      # a huge number, far past any multiplier table
    "brown " * 20_000,                  # a huge colour sequence
    "4n7" * 30_000,
    "9" * 400 + "pF",
    "1e999999 uF",
    "NaN pF",
    "inf uF",
    "-0 pF",
    "0.0000000000000000000000000001pF",
    "±±±%%%",
    "X1Y2Y1X2 250VAC 275 V~",
    "red red red red red red red red",
    "=104K",
    "104K '); DROP TABLE bins;--",
    "\udcff",                           # a lone surrogate (what errors="surrogateescape" leaves)
)

# CSV sheets (name -> file bytes) imported end to end with stock.intake.import_file; each must
# give a report or a StockError, and leave a store that passes stock.check.check_store.
CSV_SHEETS: dict[str, bytes] = {
    # OverflowError from sqlite3 ("Python int too large to convert to SQLite INTEGER") inside
    # stock.intake: a count past SQLite's 64-bit INTEGER got to the ledger insert. Right: the
    # row is quarantined as a bad quantity and the rest of the file is stored. (Fixed in
    # stock.intake.read_quantity, which now refuses counts above MAX_COUNT = 2**53.)
    "quantity-past-64-bits": b"Location,Marking,Qty\nA1,104,99999999999999999999\nA2,472,5\n",
    # Same failure for the minimum column. Right: the row is stored, the minimum left unknown
    # (a bad minimum is no reason to lose a row; the raw cell is kept).
    "minimum-past-64-bits": b"Location,Marking,Qty,Minimum\nA1,104,5,99999999999999999999\n",
    # Exactly 2**63: one past the largest SQLite INTEGER.
    "quantity-two-to-the-63": b"Location,Marking,Qty\nA1,104,9223372036854775808\n",
    # Largest SQLite INTEGER: past MAX_COUNT, so quarantined too, never an overflow.
    "quantity-largest-integer": b"Location,Marking,Qty\nA1,104,9223372036854775807\n",
    "headers-only": b"Location,Marking,Qty\n",
    "nul-bytes": b"Location,Mar\x00king,Qty\nA1,10\x004,5\n",
    "unicode-digits-in-quantity": "Location,Marking,Qty\nA1,104,٣\nA2,104,²\n".encode(),
}

# BOMs (name -> (file bytes, boards)) planned with stock.kit.plan_kit / `stock kit plan`: each
# must give a plan or a StockError (one line on the CLI), and leave a store that passes
# stock.check.check_store.
BOM_SHEETS: dict[str, tuple[bytes, int]] = {
    # OverflowError ("cannot convert Infinity to integer") in stock.bom: Decimal("inf") is
    # "integral", so int() of it was tried. Right: the line is kept with a quantity problem.
    "qty-infinity": (b"Refs,Qty,Value,Tolerance\nC1,inf,100n,10%\n", 1),
    "qty-1e400": (b"Refs,Qty,Value,Tolerance\nC1,1e400,100n,10%\n", 1),
    # OverflowError ("Python int too large to convert to SQLite INTEGER") in stock.kit when the
    # need of a line passed SQLite's 64-bit INTEGER. Right: a quantity problem on the line, or a
    # clear refusal.
    "qty-past-64-bits": (b"Refs,Qty,Value,Tolerance\nC1,99999999999999999999,100n,10%\n", 1),
    "need-past-64-bits": (b"Refs,Qty,Value,Tolerance\nC1,1000000000000,100n,10%\n", 100_000_000),
    "boards-past-64-bits": (b"Refs,Qty,Value,Tolerance\nC1,1,100n,10%\n", 99999999999999999999),
    "qty-nan": (b"Refs,Qty,Value,Tolerance\nC1,NaN,100n,10%\n", 1),
    "refs-range-typo": (b"Refs,Qty,Value\nC1-C99999999,,100n\n", 1),
}

# "Counted" cells of a filled-in stock-take sheet (stock.stocktake.apply_count_sheet): each must
# be refused with a BadSheet naming row and column, and nothing recorded. Found: OverflowError
# from sqlite3 for counts past 64 bits, ValueError from int("²") (str.isdigit accepts
# superscripts), and a message showing None instead of the boolean typed. Fixed in
# stock.stocktake._whole.
COUNT_CELLS: dict[str, object] = {
    "count-past-64-bits-as-text": "99999999999999999999",
    "count-past-64-bits-as-number": 1e300,
    "superscript-two": "²",
    "boolean": True,
    "negative": -1,
    "fraction": 1.5,
}

# Command lines with hostile values: each must end in one clear line and exit 1 or 2, never a
# traceback. Found: OverflowError from sqlite3 when a bin or plan number past 64 bits reached a
# query (stock.store.Store.find_bin, stock.kit_plans), ValueError from int("²") (str.isdigit accepts
# superscripts; fixed in Store.find_bin), OverflowError from `find --qty` past 64 bits.
CLI_ARGS: tuple[tuple[str, ...], ...] = (
    ("show", "99999999999999999999"),
    ("show", "²"),
    ("grade", "99999999999999999999"),
    ("kit", "pull", "99999999999999999999"),
    ("kit", "show", "plan:99999999999999999999"),
    ("kit", "undo", "²"),
    ("kit", "drop", "99999999999999999999"),
    ("find", "--value", "100n", "--qty", "99999999999999999999"),
    ("find", "--value", "1e400p"),
    ("show", "'); DROP TABLE bins;--"),
    # OverflowError from sqlite3 in Store.move (via stock.review.settle): fixed in stock.store,
    # which refuses a bin holding more than MAX_ON_HAND = 2**53.
    ("settle", "E1", "--count", "99999999999999999999"),
    # decimal.InvalidOperation from stock.requirement describing a 1e300 V requirement.
    ("find", "--value", "100n", "--volts", "1e300"),
)

# Bin locations that sorting must survive (count sheet, pick list: "A2 before A10"). Found:
# ValueError from int("²") in natural_key (fixed: isdecimal), once in stock.stocktake and
# stock.kit_rules, now one function in stock.bins.
LOCATIONS: tuple[str, ...] = ("²", "A²", "①", "٣", "A٣", "A10", "A2", "", "  ")

__all__ = ["BOM_SHEETS", "CLI_ARGS", "LOCATIONS", "COUNT_CELLS", "CSV_SHEETS", "DECODER_TEXTS"]
