"""Errors a user can meet, each naming the bad value and what would have been accepted.

Every error derives from :class:`StockError` and also from the builtin it resembles, so callers
may catch either. Each carries structured fields and composes its sentence from them; the CLI
prints that sentence on one line and exits 1 (bad data) or 2 (bad usage).
"""

from __future__ import annotations

from dataclasses import dataclass


class StockError(Exception):
    """Base of every error the tool raises on purpose.

    ``exit_code`` is 1 for bad data and 2 for bad usage.
    """

    exit_code = 1


def _where(file: str | None = None, sheet: str | None = None, row: int | None = None,
           column: str | None = None) -> str:
    parts = []
    if file:
        parts.append(str(file))
    if sheet:
        parts.append(f"sheet {sheet!r}")
    if row is not None:
        parts.append(f"row {row}")
    if column:
        parts.append(f"column {column!r}")
    return ", ".join(parts)


@dataclass
class BadSheet(StockError, ValueError):
    """A file that cannot be read as a sheet of parts (binary, corrupt, empty, no header ...).

    >>> print(BadSheet("bins.csv", "no header row found", hint="a row naming a value or marking column"))
    bins.csv: no header row found (expected a row naming a value or marking column)
    """

    file: str
    reason: str
    sheet: str | None = None
    row: int | None = None
    column: str | None = None
    hint: str | None = None

    def __str__(self) -> str:
        where = _where(self.file, self.sheet, self.row, self.column)
        text = f"{where}: {self.reason}"
        if self.hint:
            text += f" (expected {self.hint})"
        return text


@dataclass
class BadValue(StockError, ValueError):
    """A value given on the command line or in a BOM that does not parse.

    >>> print(BadValue("--value", "15x", "a capacitance such as 150p, 4n7, 0.1u or 104"))
    --value: cannot read '15x' (expected a capacitance such as 150p, 4n7, 0.1u or 104)
    """

    what: str
    raw: str
    expected: str
    exit_code = 2

    def __str__(self) -> str:
        return f"{self.what}: cannot read {self.raw!r} (expected {self.expected})"


@dataclass
class BadOptions(StockError, ValueError):
    """Options that do not go together, or one of a set that must be given and is not.

    >>> print(BadOptions(("--tank", "--coil"), "neither was given", "one of them, such as --tank 300p or --coil 4.7uH"))
    --tank/--coil: neither was given (expected one of them, such as --tank 300p or --coil 4.7uH)
    """

    options: tuple[str, ...]
    reason: str
    expected: str
    exit_code = 2

    def __str__(self) -> str:
        return f"{'/'.join(self.options)}: {self.reason} (expected {self.expected})"


@dataclass
class NotFound(StockError, LookupError):
    """A bin, plan or other named thing that is not in the store.

    >>> print(NotFound("bin", "A9", "a bin id or label listed by `stock bins`"))
    no bin 'A9' (expected a bin id or label listed by `stock bins`)
    """

    what: str
    key: str
    expected: str = ""

    def __str__(self) -> str:
        text = f"no {self.what} {self.key!r}"
        if self.expected:
            text += f" (expected {self.expected})"
        return text


@dataclass
class BadLayout(StockError, ValueError):
    """A label sheet layout that cannot be printed: labels off the page, negative margins, too small.

    >>> print(BadLayout("--grid 4x8", "4 labels of 70 mm and 3 gaps of 0 mm need 280 mm, the page is 210 mm wide",
    ...                 "at most 3 columns of 70 mm labels"))
    --grid 4x8: 4 labels of 70 mm and 3 gaps of 0 mm need 280 mm, the page is 210 mm wide (expected at most 3 columns of 70 mm labels)
    """

    what: str
    reason: str
    expected: str = ""
    exit_code = 2

    def __str__(self) -> str:
        text = f"{self.what}: {self.reason}"
        if self.expected:
            text += f" (expected {self.expected})"
        return text


@dataclass
class Refused(StockError, RuntimeError):
    """An action refused because of the state of the stock (double pull, not enough parts ...).

    >>> str(Refused("pull plan 3", "it was already pulled on 2026-12-01"))
    'cannot pull plan 3: it was already pulled on 2026-12-01'
    """

    action: str
    reason: str

    def __str__(self) -> str:
        return f"cannot {self.action}: {self.reason}"


@dataclass
class StoreProblem(StockError, OSError):
    """The database cannot be used: locked, read-only, full disk, not a stock database.

    >>> str(StoreProblem("stock.db", "the database is locked by another program", "try again when it has finished"))
    'stock.db: the database is locked by another program; try again when it has finished'
    """

    path: str
    reason: str
    advice: str = ""

    def __str__(self) -> str:
        text = f"{self.path}: {self.reason}"
        if self.advice:
            text += f"; {self.advice}"
        return text
