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

Example:

    stock import shop-bins.xlsx --sheet "Cabinet 1" --map quantity="On hand" --dry-run
"""


def _overrides(pairs: list[str]) -> dict[str, str]:
    out: dict[str, str] = {}
    for pair in pairs:
        name, sep, header = pair.partition("=")
        if not sep or not name.strip() or not header.strip():
            raise typer.BadParameter(f"{pair!r} is not FIELD=HEADER (e.g. quantity=\"On hand\")",
                                     param_hint="--map")
        out[name.strip()] = header.strip()
    return out


def register(app: typer.Typer) -> None:
    @app.command("import", help=IMPORT_HELP)
    def import_command(
        ctx: typer.Context,
        paths: Annotated[list[Path], typer.Argument(help="CSV or XLSX files to import.",
                                                    show_default=False)],
        sheet: Annotated[str | None, typer.Option("--sheet", help="Only this sheet of a workbook.")] = None,
        mapping: Annotated[list[str] | None, typer.Option(
            "--map", metavar="FIELD=HEADER",
            help="Read FIELD from the column named HEADER (repeatable), e.g. --map value=\"Cap.\".")] = None,
        dry_run: Annotated[bool, typer.Option("--dry-run", help="Do everything, keep nothing; show what would change.")] = False,
        as_json: Annotated[bool, typer.Option("--json", help="Print the report as JSON.")] = False,
    ) -> None:
        from rich.console import Console
        from rich.progress import BarColumn, Progress, SpinnerColumn, TextColumn, TimeElapsedColumn

        from stock.inventory.intake import import_file
        from stock.inventory.stocktake import apply_count_sheet, is_count_sheet, preview_count_sheet
        from stock.store.database import open_store

        overrides = _overrides(mapping or [])
        err = Console(stderr=True)
        reports = []
        counts = []
        with open_store(state(ctx).db_path) as store:
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
                    report = import_file(store, path, sheet=sheet, overrides=overrides,
                                         dry_run=dry_run,
                                         progress=lambda n: bar.update(task, completed=n))
                reports.append(report)
                for s in report.sheets:
                    where = f"{path.name}" + (f" [{s.sheet}]" if s.sheet else "")
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
