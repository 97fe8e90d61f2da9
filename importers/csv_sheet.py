"""Read a delimited text sheet (CSV, TSV, text export) as a stream of numbered rows.

What is detected, and how:

* **Encoding.** A byte-order mark says UTF-8 or UTF-16. Otherwise the whole file is checked as
  UTF-8 in chunks (strict; it costs milliseconds, holds no memory). A file that is not UTF-8 is read
  as Windows code page 1252, which is what spreadsheet programs on Windows write and what the WHATWG
  encoding standard means by "latin-1"; bytes cp1252 leaves undefined (0x81, 0x8D, 0x8F, 0x90,
  0x9D) mean it is ISO-8859-1 instead. In all three, "µ" (0xB5) survives. UTF-16 without a mark is
  recognised by its NUL bytes at every other position.
* **Binary junk.** A file whose first 64 KiB hold control bytes (other than tab, line breaks, form
  feed, NUL and Ctrl-Z) in more than 1 % of positions (and at least four), or a known binary signature, is refused as
  "not a text sheet". Stray NUL bytes and a DOS end-of-file Ctrl-Z are dropped from the text.
* **Delimiter.** Each of ``,`` ``;`` tab ``|`` is tried on the first 50 records; the one giving the
  most records with the same number of fields (more than one) wins; a tie goes to the larger field
  count, then to tab for ``.tsv`` and to comma otherwise.
* **Records.** Python's csv module with universal line endings: quoted fields may hold delimiters and
  line breaks, and ``\\r\\n``, ``\\n`` and ``\\r`` may be mixed. A row number is the record number as a
  spreadsheet program shows it (a quoted field spanning lines is still one row). Cells up to
  ``FIELD_LIMIT`` characters are read.
"""

from __future__ import annotations

import codecs
import csv
import io
from pathlib import Path
from typing import Any, Iterator

from importers.raw_sheet import RawSheet, clean_cell, shape_sheet
from stock.errors import BadSheet

SAMPLE_BYTES = 64 * 1024
MAX_SAMPLE_BYTES = 8 * 1024 * 1024     # a header line of 10 000 columns can pass 64 KiB
SNIFF_RECORDS = 50
FIELD_LIMIT = 64 * 1024 * 1024          # csv's default is 128 KiB; a pasted 1 MB note must still read
CHUNK = 1024 * 1024
DELIMITERS = (",", ";", "\t", "|")

# Signatures of files people mistake for sheets; the names are for the message only.
_SIGNATURES: tuple[tuple[bytes, str], ...] = (
    (b"%PDF", "a PDF document"),
    (b"\x89PNG", "a PNG image"),
    (b"\xff\xd8\xff", "a JPEG image"),
    (b"GIF8", "a GIF image"),
    (b"\x1f\x8b", "a gzip archive"),
    (b"7z\xbc\xaf", "a 7-Zip archive"),
    (b"Rar!", "a RAR archive"),
    (b"SQLite format 3\x00", "an SQLite database"),
    (b"{\\rtf", "an RTF document"),
)
_CONTROL = frozenset(range(0x01, 0x09)) | frozenset(range(0x0E, 0x20)) - {0x1A} | {0x7F}
_DROPPED = {0: None, 0x1A: None}         # str.translate table: NUL and Ctrl-Z removed


def detect_encoding(path: Path) -> str:
    """Name the codec to read a text sheet with; raise BadSheet if it is not text at all.

    Returns one of "utf-8-sig", "utf-16", "utf-16-le", "utf-16-be", "utf-8", "cp1252", "latin-1".
    """
    file = str(path)
    with path.open("rb") as handle:
        sample = handle.read(SAMPLE_BYTES)
    if not sample.strip(b" \t\r\n\x00\x1a\x0c"):
        raise BadSheet(file, "is empty", hint="a header row naming the columns, then one row per bin")
    if sample.startswith(codecs.BOM_UTF8):
        return _checked(path, "utf-8-sig")
    if sample.startswith((codecs.BOM_UTF16_LE, codecs.BOM_UTF16_BE)):
        return _checked(path, "utf-16")
    utf16 = _utf16_without_mark(sample)
    if utf16:
        return _checked(path, utf16)
    for signature, what in _SIGNATURES:
        if sample.startswith(signature):
            raise BadSheet(file, f"is {what}, not a text sheet", hint="a .csv, .tsv, .txt or .xlsx sheet")
    text_bytes = sample.replace(b"\x00", b"")
    controls = sum(1 for b in text_bytes if b in _CONTROL)
    if controls > 0.01 * len(text_bytes) and controls >= 4:   # a stray control byte or two is still text
        raise BadSheet(file, "is not a text sheet (it holds binary data)",
                       hint="a .csv, .tsv, .txt or .xlsx sheet")
    if _decodes(path, "utf-8"):
        return "utf-8"
    high = sum(1 for b in text_bytes if b >= 0x80)
    if high > 0.3 * len(text_bytes):
        raise BadSheet(file, "is not a text sheet (it is neither UTF-8 nor Windows-1252 text)",
                       hint="a .csv, .tsv, .txt or .xlsx sheet")
    return "cp1252" if _decodes(path, "cp1252") else "latin-1"


def _utf16_without_mark(sample: bytes) -> str | None:
    pairs = len(sample) // 2
    if pairs < 2:
        return None
    even_nul = sample[0:pairs * 2:2].count(0)
    odd_nul = sample[1:pairs * 2:2].count(0)
    if odd_nul > 0.4 * pairs and even_nul < 0.05 * pairs:
        return "utf-16-le"
    if even_nul > 0.4 * pairs and odd_nul < 0.05 * pairs:
        return "utf-16-be"
    return None


def _decodes(path: Path, encoding: str) -> bool:
    decoder = codecs.getincrementaldecoder(encoding)(errors="strict")
    try:
        with path.open("rb") as handle:
            while chunk := handle.read(CHUNK):
                decoder.decode(chunk)
        decoder.decode(b"", final=True)
    except UnicodeDecodeError:
        return False
    return True


def _checked(path: Path, encoding: str) -> str:
    if not _decodes(path, encoding):
        raise BadSheet(str(path), f"claims to be {encoding.upper()} text but does not decode as it",
                       hint="a file saved again as UTF-8 CSV")
    return encoding


def _sample_text(path: Path, encoding: str) -> str:
    """Up to SAMPLE_BYTES of decoded text, cut after the last complete line (more if needed)."""
    size = SAMPLE_BYTES
    while True:
        with path.open("r", encoding=encoding, errors="replace", newline="") as handle:
            text = handle.read(size)
            whole = not handle.read(1)
        text = text.translate(_DROPPED)
        if whole:
            return text
        cut = max(text.rfind("\n"), text.rfind("\r"))
        if cut > 0 and text.count("\n", 0, cut) + text.count("\r", 0, cut) >= 2 or size >= MAX_SAMPLE_BYTES:
            return text[:cut + 1] if cut > 0 else text
        size *= 4


def sniff_delimiter(sample: str, prefer_tab: bool = False) -> str:
    """Pick the delimiter that splits the sample into the most equally wide records.

    >>> sniff_delimiter("Bin;Marking;Qty\\nA1;104;20\\nA2;\\"4,7n\\";5\\n")
    ';'
    >>> sniff_delimiter("Bin,Marking\\tQty\\n")
    ','
    >>> sniff_delimiter("Bin\\tMarking\\tQty\\nA1\\t104\\t20\\n")
    '\\t'
    """
    order = ("\t", ",", ";", "|") if prefer_tab else DELIMITERS
    best, best_key = order[0] if prefer_tab else ",", (0, 0, 0)
    for rank, delimiter in enumerate(order):
        widths: list[int] = []
        try:
            for record in csv.reader(io.StringIO(sample, newline=""), delimiter=delimiter):
                if record:
                    widths.append(len(record))
                if len(widths) >= SNIFF_RECORDS:
                    break
        except csv.Error:
            continue
        if not widths:
            continue
        modal = max(set(widths), key=lambda w: (widths.count(w), w))
        agreeing = widths.count(modal) if modal > 1 else 0
        key = (agreeing, modal if agreeing else 0, -rank)
        if key > best_key:
            best, best_key = delimiter, key
    return best


def read_text_sheet(path: Path) -> RawSheet:
    """Read one text sheet; the rows stream as they are consumed.

    Raises:
        BadSheet: empty, binary or undecodable file, no header row, or a record the csv reader
            cannot parse (named by row).
    """
    file = str(path)
    encoding = detect_encoding(path)
    delimiter = sniff_delimiter(_sample_text(path, encoding), prefer_tab=path.suffix.lower() == ".tsv")
    if csv.field_size_limit() < FIELD_LIMIT:
        csv.field_size_limit(FIELD_LIMIT)   # process-wide setting of the csv module; only ever raised
    sheet = shape_sheet(file, None, _records(path, encoding, delimiter), encoding=encoding, delimiter=delimiter)
    if sheet is None:
        raise BadSheet(file, "has no rows with anything in them",
                       hint="a header row naming the columns, then one row per bin")
    return sheet


def _records(path: Path, encoding: str, delimiter: str) -> Iterator[tuple[int, tuple[Any, ...]]]:
    file = str(path)
    number = 0
    try:
        with path.open("r", encoding=encoding, errors="strict", newline="") as handle:
            lines = (line.translate(_DROPPED) for line in handle)
            for record in csv.reader(lines, delimiter=delimiter):
                number += 1
                yield number, tuple(clean_cell(c) for c in record)
    except csv.Error as exc:
        raise BadSheet(file, f"cannot be read as delimited text: {exc}", row=number + 1) from None
    except UnicodeDecodeError as exc:
        raise BadSheet(file, f"stops being {encoding} text ({exc.reason})", row=number + 1) from None
    except OSError as exc:
        raise BadSheet(file, f"could not be read ({exc.strerror or exc})", row=number + 1) from None
