"""The SQLite store: schema as migrations, the append-only ledger, flags, integrity.

``database`` (``open_store``, ``Store``, migrations), ``flag_kinds`` (what each flag means and how it
is settled), ``flag_records`` (decisions written: who, ledger note, flags closed), ``integrity``
(``stock check``). Knows nothing of grading or of files.
"""
