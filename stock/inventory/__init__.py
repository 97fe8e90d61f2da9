"""Bins from the shop's sheets into the store, and what the store then knows of them.

In import order (each module imports only those before it): ``row_reading`` (a sheet row to a
marking and part columns), ``column_content`` (what a column's cells hold: values, locations,
counts, designators), ``bins`` (queries), ``readings`` (the readings a person can choose),
``stored_grades`` (grades kept per bin), ``stock_checks`` (unknown quantity, below minimum,
shelf life), ``duplicates`` (the same part in several bins, merging), ``remembered_mappings``
(a sheet's mapping kept per header signature), ``own_exports`` (the inventory export read back
by its columns), ``sheet_plan`` (how each sheet is read: ``--map`` rules, mapping by header,
memory and content, sheets skipped or refused), ``intake`` (sheets into bins, parts, ledger and
flags), ``stocktake`` (the count sheet read back), ``flag_list`` (flags
as a person reads them), ``settling`` (a person's decision recorded), ``circuit_drift`` (the
drift of a named bin in a circuit).
"""
