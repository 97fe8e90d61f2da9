"""stock: capacitor bins — decode their markings, grade each part for the job, find, kit, export.

Data flows one way: file → ``importers`` → decoder → store → grading / search / kit → exports.
A lower layer never imports a higher one.

Values and errors
    ``errors`` (the errors a user can meet), ``decoded`` (the frozen ``Marking`` every decoder
    returns), ``units`` (engineering formatting and parsing of typed values).
Code tables, one module per standard
    ``value_codes`` (IEC 60062 value codes), ``tolerance_codes`` (IEC 60062 letters),
    ``voltage_codes`` (EIA voltage codes), ``ceramic_codes`` (EIA-198 Class 1/2, IEC letters),
    ``families`` (films, mica, electrolytics … by name), ``safety_classes`` (IEC 60384-14),
    ``colour_codes`` / ``colour_words`` / ``mica_codes`` (colour bands and dots),
    ``preferred_values`` (IEC 60063).
Decoding
    ``markings``: ``decode(text) -> Marking``, never raises.
Storing
    ``store`` (schema, migrations, ledger), ``intake`` + ``row_reading`` (rows → bins, parts,
    flags), ``bins`` (queries), ``check`` (verify a database).
Physics
    ``stability`` (dielectric figures), ``applications`` (the application table),
    ``grading`` (worst-case budget and grades), ``bin_grades`` (grades over the store),
    ``drift`` (tank and timer drift),
    ``combining`` (series and parallel pairs).
The jobs
    ``requirement`` + ``search`` (find), ``bom`` + ``kit`` (planning) + ``kit_plans`` (stored
    plans: pull, undo, drop) + ``kit_rules`` + ``pick_list`` (kitting), ``flag_kinds`` (what
    each flag means) + ``review`` + ``duplicates`` + ``stock_checks`` (flags), ``spreadsheet`` +
    ``exports`` + ``stocktake`` (spreadsheets out), ``demo`` (the demo shop).
The command
    ``cli``: one ``<name>_cmd.py`` per command group.

Public names: ``decode`` (from ``markings``), ``open_store`` (from ``store``) and ``Marking``.
"""

from stock.decoded import Marking
from stock.markings.decoder import decode
from stock.store.database import open_store

__all__ = ["Marking", "__version__", "decode", "open_store"]
__version__ = "0.1.0"
