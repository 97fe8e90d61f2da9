"""The raw rows an import read, kept compactly: the header once per import, each row as an array.

``imports.headers_json`` holds the sheet's header texts; ``source_rows.raw_json`` holds one JSON
array of the row's cells in header order (blank cells ``null``, trailing blanks left off), and
when the row had filled cells right of the header, one last element: an object of those cells by
their synthetic names (``{"column 12": "spare"}``). Rows stored before this form hold an object by
header, which :func:`source_record` reads as it is. Nothing read is lost either way.

>>> encode_cells(("104", None, 5, None))
'["104",null,5]'
>>> source_record('["104",null,5,{"column 5":"x"}]', '["Marking","Label","Qty","Notes"]')
{'Marking': '104', 'Qty': 5, 'column 5': 'x'}
"""

from __future__ import annotations

import json
from functools import lru_cache
from json.encoder import encode_basestring  # what json.dumps(..., ensure_ascii=False) uses for text
from math import isfinite
from typing import Any


def _cell(value: Any) -> str:
    t = type(value)
    if value is None or (t is str and value == ""):
        return "null"
    if t is str:
        return encode_basestring(value)
    if t is int:
        return int.__repr__(value)
    if t is float and isfinite(value):
        return float.__repr__(value)
    return json.dumps(value, default=str, ensure_ascii=False)


def encode_cells(cells: tuple[Any, ...], extra: tuple[tuple[str, Any], ...] = ()) -> str:
    """One row's cells as a compact JSON array (see the module docstring)."""
    end = len(cells)
    while end and (cells[end - 1] is None or cells[end - 1] == ""):
        end -= 1
    body = ",".join([_cell(c) for c in cells[:end]])
    if extra:
        tail = json.dumps(dict(extra), default=str, ensure_ascii=False, separators=(",", ":"))
        if end < len(cells):      # the object must follow the last header's place, not a blank's
            body = ",".join([_cell(c) for c in cells])
        body = f"{body},{tail}" if body else tail
    return f"[{body}]"


@lru_cache(maxsize=256)
def _headers(headers_json: str) -> tuple[str, ...]:
    return tuple(json.loads(headers_json))


def source_record(raw_json: str, headers_json: str | None) -> dict[str, Any]:
    """A stored source row as header → value, blanks left out, extra cells included."""
    data = json.loads(raw_json)
    if isinstance(data, dict):
        return data
    headers = _headers(headers_json or "[]")
    extra = data.pop() if data and isinstance(data[-1], dict) else None   # a cell is never an object
    out = {h: v for h, v in zip(headers, data) if v is not None}
    if extra:
        out.update(extra)
    return out


def stored_source_record(conn: Any, source_row_id: int) -> dict[str, Any]:
    """The record of one ``source_rows`` row, by id (see :func:`source_record`)."""
    raw, headers = conn.execute("SELECT s.raw_json, i.headers_json FROM source_rows s"
                                " JOIN imports i ON i.id = s.import_id WHERE s.id = ?",
                                (source_row_id,)).fetchone()
    return source_record(raw, headers)


__all__ = ["encode_cells", "source_record", "stored_source_record"]
