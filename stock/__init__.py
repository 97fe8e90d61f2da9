"""stock: capacitor bins — decode their markings, grade each part for the job, find, kit, export.

Modules (data flows one way: file → importers → decoder → store → grading/search/kit → export):

- ``stock.errors``: the error types a user can meet.
- ``stock.decoded``: the frozen values every decoder returns (``Marking`` and its parts).
- ``stock.store``: the SQLite database, its migrations and the append-only ledger.
- ``stock.cli``: the ``stock`` command, one file per command group.
"""

__all__ = ["__version__"]
__version__ = "0.1.0"
