"""Kitting a build from its BOM.

``bom`` (BOM sheets to requirement lines), ``line_rules`` (what a line accepts), ``planner``
(allocation of bins to lines), ``stored_plans`` (reserve, pull, undo, drop), ``pick_list``.
"""
