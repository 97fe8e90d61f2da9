"""Spreadsheets written for people: ``workbook`` (shared cells and safety against formula
injection), ``exports`` (inventory and purchasing), ``count_sheet`` (the stock-take sheet)."""
