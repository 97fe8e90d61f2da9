"""Kitting a build from its BOM.

``bom_conventions`` (how CAD exports write designators, do-not-fit, quantities), ``requirement_reading``
(a line's value and columns to a requirement), ``bom`` (BOM sheets to lines), ``bin_order`` (which of
the bins that meet a line goes first, so precious parts are saved), ``line_rules`` (what a line
accepts), ``planner`` (allocation of bins to lines), ``stored_plans`` (reserve, pull, undo, drop),
``pick_list``, ``pick_scan`` (picks confirmed by scanning bin labels, then the pull).
"""
