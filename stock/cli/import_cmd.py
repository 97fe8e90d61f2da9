"""`stock import`: read bin sheets (CSV/XLSX) into the store, one transaction per file."""

from __future__ import annotations

import json
from pathlib import Path
from typing import Annotated

import typer

from stock.cli.context import state
from stock.cli.bins_cmd import text_table

IMPORT_HELP = """Import bin sheets (CSV or XLSX) into the stock database.

Each file is one transaction: all of it is stored, or none. Every row is accounted for: stored, unchanged (already stored that way) or quarantined (see `stock quarantine`). Importing the same file again changes nothing; an edited file updates its bins and records count differences in the ledger.

Columns are found by their headers (known names, then near spellings), then by what their cells hold; the mapping is printed with how each column was found. Correct it with --map FIELD=HEADER (every sheet with that header) or --map SHEET:FIELD=HEADER (that sheet, or that file, only). A mapping given with --map is kept for sheets with the same headers and used next time (--keep-mapping keeps one found by content too; --forget-mapping drops it). A sheet with no column of values is skipped and said so; the store's own inventory export is read back by its columns.

Examples:

    stock import shop-bins.xlsx --sheet "Cabinet 1" --map quantity="On hand" --dry-run

    stock import drawers.xlsx --map "Back room:marking=What is printed on it"

Fields a bin sheet may carry:

\b
FIELDS
"""


def _field_lines() -> str:
    from importers.headers import FIELD_MEANINGS
    return "\n".join(f"  {name:<13} {meaning}" for name, meaning in FIELD_MEANINGS.items())


def _rules(pairs: list[str]):  # noqa: ANN202 - MapRule tuple, imported late
    from stock.errors import BadValue
    from stock.inventory.sheet_plan import parse_map_rules

    try:
        return parse_map_rules(pairs)
    except BadValue as exc:
        raise typer.BadParameter(str(exc), param_hint="--map") from None


def register(app: typer.Typer) -> None:
    @app.command("import", help=IMPORT_HELP.replace("FIELDS", _field_lines()))
    def import_command(
        ctx: typer.Context,
        paths: Annotated[list[Path], typer.Argument(help="CSV or XLSX files to import.",
                                                    show_default=False)],
        sheet: Annotated[str | None, typer.Option("--sheet", help="Only this sheet of a workbook.")] = None,
        mapping: Annotated[list[str] | None, typer.Option(
            "--map", metavar="[SHEET:]FIELD=HEADER",
            help="Read FIELD from the column named HEADER (repeatable), in every sheet that has it"
                 " or only in SHEET, e.g. --map value=\"Cap.\" --map \"Back room:quantity=How many\".")] = None,
        force: Annotated[bool, typer.Option("--force", help="Import a sheet that looks like a BOM all the same.")] = False,
        keep_mapping: Annotated[bool, typer.Option("--keep-mapping", help="Keep each sheet's mapping (found by content too) for sheets with the same headers.")] = False,
        forget_mapping: Annotated[bool, typer.Option("--forget-mapping", help="Drop the mapping kept for these sheets' headers before reading them.")] = False,
        dry_run: Annotated[bool, typer.Option("--dry-run", help="Do everything, keep nothing; show what would change.")] = False,
        as_json: Annotated[bool, typer.Option("--json", help="Print the report as JSON.")] = False,
    ) -> None:
        from rich.console import Console
        from rich.progress import BarColumn, Progress, SpinnerColumn, TextColumn, TimeElapsedColumn

        from stock.inventory.intake import import_file
        from stock.inventory.stocktake import apply_count_sheet, is_count_sheet, preview_count_sheet
        from stock.store.database import open_store

        rules = _rules(mapping or [])
        err = Console(stderr=True)
        reports = []
        counts = []
        with open_store(state(ctx).db_path) as store:
            if rules and len(paths) > 1:
                from stock.inventory.sheet_plan import check_rules_across
                check_rules_across(rules, paths, sheet)
            for path in paths:
                if is_count_sheet(path):  # our own stock-take sheet, filled in: counts, not bins
                    count = (preview_count_sheet if dry_run else apply_count_sheet)(store, path)
                    counts.append(count)
                    if not as_json:
                        typer.echo(f"{path.name}: stock-take sheet, {count.counted} bins counted,"
                                   f" {count.not_counted} not counted, {len(count.changes)} differences")
                        for c in count.changes:
                            was = "unknown" if c.expected is None else str(c.expected)
                            typer.echo(f"  {c.bin_key}: {was} → {c.counted} ({c.delta:+d})")
                    continue
                with Progress(SpinnerColumn(), TextColumn("{task.description}"), BarColumn(),
                              TextColumn("{task.completed} rows"), TimeElapsedColumn(),
                              console=err, transient=True,
                              disable=not err.is_terminal) as bar:
                    task = bar.add_task(f"importing {path.name}", total=None)
                    report = import_file(store, path, sheet=sheet, overrides=rules,
                                         dry_run=dry_run, force=force, keep_mapping=keep_mapping,
                                         forget_mapping=forget_mapping, check_map=len(paths) == 1,
                                         progress=lambda n: bar.update(task, completed=n))
                reports.append(report)
                for s in report.sheets:
                    where = f"{path.name}" + (f" [{s.sheet}]" if s.sheet else "")
                    if s.skipped:
                        typer.echo(f"skipped {where}: {s.skipped}", err=True)
                        continue
                    lines = [f"columns used in {where}:", *(f"  {m}" for m in s.mapping)]
                    typer.echo("\n".join(lines), err=as_json)
                    for note in s.notes:
                        typer.echo(f"note: {where}: {note}", err=True)
        if as_json:
            typer.echo(json.dumps({"files": [f for r in reports for f in r.to_json()["files"]],
                                   "counts": [c.to_json() for c in counts]},
                                  ensure_ascii=False, indent=2))
            return
        if not reports:
            if dry_run:
                typer.echo("dry run: nothing was written", err=True)
            return
        rows = []
        for r in reports:
            for s in r.sheets:
                if s.skipped:
                    continue
                rows.append([Path(s.path).name, s.sheet or "", s.rows, s.stored, s.quarantined,
                             s.flagged, s.unchanged,
                             "same file as before" if s.same_file else
                             f"{s.new_bins} new bins, {s.updated_bins} updated,"
                             f" {s.count_movements} count changes"])
        typer.echo(text_table(["file", "sheet", "rows", "stored", "quarantined", "flagged",
                               "unchanged", "changes"], rows))
        if dry_run:
            typer.echo("dry run: nothing was written", err=True)
        if any(s.quarantined for r in reports for s in r.sheets):
            typer.echo("some rows were quarantined: see `stock quarantine`", err=True)
