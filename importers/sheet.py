"""One shape for every sheet read: a header and lazily streamed rows with the user's row numbers.

``read_sheets(path)`` picks the reader by the file's extension *and* its first bytes, so a
workbook saved as ``.csv`` or a text file saved as ``.xlsx`` gets a clear one-line error instead
of a traceback. Both readers hand this module numbered rows of raw cells; it finds the header row,
names the columns and aligns the data rows, so CSV and XLSX come out the same.

How a sheet is shaped: :mod:`importers.raw_sheet`.
"""

from __future__ import annotations

from pathlib import Path

from importers.csv_sheet import read_text_sheet
from importers.raw_sheet import RawSheet
from importers.xlsx_sheet import read_workbook
from stock.errors import BadSheet

TEXT_EXTENSIONS = (".csv", ".tsv", ".txt")
WORKBOOK_EXTENSIONS = (".xlsx", ".xlsm")
ACCEPTED = ".csv, .tsv, .txt, .xlsx or .xlsm"

_ZIP_MAGIC = b"PK\x03\x04"
_EMPTY_ZIP_MAGIC = b"PK\x05\x06"
_OLE2_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"   # compound file: old .xls, or an encrypted .xlsx


def sniff_kind(path: Path) -> str:
    """Say which reader a file needs, from its extension and its first bytes.

    Returns "text" or "workbook"; raises BadSheet for anything else, with the reason.
    """
    file = str(path)
    if not path.exists():
        raise BadSheet(file, "no such file")
    if path.is_dir():
        raise BadSheet(file, "is a folder, not a file")
    try:
        with path.open("rb") as handle:
            head = handle.read(8)
    except OSError as exc:
        raise BadSheet(file, f"cannot be opened ({exc.strerror or exc})") from None
    ext = path.suffix.lower()
    is_zip = head.startswith(_ZIP_MAGIC) or head.startswith(_EMPTY_ZIP_MAGIC)
    if head.startswith(_OLE2_MAGIC):
        if ext == ".xls":
            raise BadSheet(file, "is an old binary .xls workbook, which is not read",
                           hint="the workbook saved as .xlsx or .csv")
        raise BadSheet(file, "is a password-protected (encrypted) workbook or an old .xls file",
                       hint="an unencrypted .xlsx, or the sheet saved as .csv")
    if ext in WORKBOOK_EXTENSIONS:
        if not is_zip:
            raise BadSheet(file, f"is not an XLSX workbook (a {ext} file is a zip archive; this one is not)",
                           hint="a workbook saved as .xlsx, or rename a text sheet to .csv")
        return "workbook"
    if ext in TEXT_EXTENSIONS:
        if is_zip:
            raise BadSheet(file, f"is a zip archive (perhaps a workbook), not a text sheet, despite its {ext} name",
                           hint="rename it to .xlsx if it is a workbook")
        return "text"
    if ext == ".xls":
        raise BadSheet(file, "is not a workbook this tool reads (.xls)", hint=ACCEPTED)
    raise BadSheet(file, f"has an extension this tool does not read ({ext or 'none'})", hint=ACCEPTED)


def read_sheets(path: str | Path, sheet: str | None = None) -> list[RawSheet]:
    """Read a CSV/TSV/text sheet or the worksheets of an XLSX/XLSM workbook.

    Args:
        path: the file.
        sheet: for a workbook, the one worksheet to read (default: every worksheet that has any
            cell filled). A text sheet has no worksheets; ``sheet`` is ignored for it.

    Returns:
        One RawSheet per worksheet read (one for a text sheet). Rows stream lazily: consume a
        sheet's rows before the file changes.

    Raises:
        BadSheet: the file is missing, empty, binary, of the wrong kind, corrupt or encrypted, has
            no such sheet, or no sheet holds anything. The message names file, sheet and row.
    """
    path = Path(path)
    kind = sniff_kind(path)
    if kind == "text":
        return [read_text_sheet(path)]
    return read_workbook(path, sheet)
