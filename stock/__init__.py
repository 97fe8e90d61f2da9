"""stock: capacitor bins — decode their markings, grade each part for the job, find, kit, export.

Sub-packages in layers; a module imports only from its own layer (in the order below) or from a
lower one, never upwards. An import-linter contract in ``pyproject.toml`` enforces it and the
test suite runs it (``tests/test_layers.py``).

====================  ===========================================================================
layer (top first)     what lives there
====================  ===========================================================================
``cli``               the ``stock`` command: one ``<name>_cmd.py`` per command group
``demo``              the demo shop, run end to end
``labels``            bin labels (PDF)
``sheets_out``        spreadsheets written: inventory, purchasing, count sheet
``kitting``           BOM reading, line rules, the planner, stored plans, pick lists
``matching``          requirements, the search of the shelf (find), stand-ins for a part (replace)
``inventory``         bins from sheets: intake, queries, stored grades, flags, settling
``physics``/``store`` grading physics and the application table / the SQLite store, its schema,
                      flag kinds and integrity check (the two never import each other)
``markings``          code tables, one module per standard, and the decoder
``decoded``, ``units``,  the frozen decoded values, engineering formatting, count cells, errors,
``counts``, ``errors``,  the text a bin label's QR code carries (and reading back a scan)
``scan_codes``
====================  ===========================================================================

``importers/`` (file readers) sits beside ``markings``: it imports only ``stock.errors``.

Public names, loaded on first use so that importing a reader loads no store:
``decode`` (from ``stock.markings.decoder``), ``open_store`` (from ``stock.store.database``) and
``Marking`` (from ``stock.decoded``).
"""

from __future__ import annotations

from typing import Any

__all__ = ["Marking", "__version__", "decode", "open_store"]
__version__ = "0.1.0"

_LAZY = {"Marking": "stock.decoded", "decode": "stock.markings.decoder", "open_store": "stock.store.database"}


def __getattr__(name: str) -> Any:
    if name in _LAZY:
        import importlib

        return getattr(importlib.import_module(_LAZY[name]), name)
    raise AttributeError(f"module 'stock' has no attribute {name!r}")
