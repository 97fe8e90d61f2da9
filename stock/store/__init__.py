"""The SQLite store: schema as migrations, the append-only ledger, flags, integrity.

``database`` (``open_store``, ``Store``, migrations), ``readings_migration`` (the step to each
distinct reading stored once), ``sql_script`` (a migration's SQL run statement by statement), ``flag_kinds`` (what each flag means and how it
is settled), ``flag_records`` (decisions written: who, ledger note, flags closed), ``integrity``
(``stock check``). Knows nothing of grading or of files.
"""
