"""File readers: each turns one kind of sheet into plain rows with their row numbers.

The lowest layer of the data flow (file → importer rows → decoder → store): nothing here imports
from ``stock`` except ``stock.errors``, and nothing is decoded — cells come out as read.

* ``importers.sheet`` — ``read_sheets(path, sheet=None) -> list[RawSheet]``, the one entry point:
  picks the reader by extension and first bytes, finds the header row, names and aligns columns.
  ``RawSheet`` / ``RawRow`` are the shapes every reader produces (rows stream lazily).
* ``importers.csv_sheet`` — delimited text: encoding and delimiter detection, RFC 4180 quoting.
* ``importers.xlsx_sheet`` — XLSX/XLSM through openpyxl read-only, with merged header cells.
* ``importers.headers`` — ``map_headers(headers, "bins"|"bom", overrides) -> HeaderMap``: the field
  vocabularies, their alias tables and the fuzzy matching (rapidfuzz) of messy headers.

Every failure to read is a ``stock.errors.BadSheet`` naming file, sheet, row and column.
"""
