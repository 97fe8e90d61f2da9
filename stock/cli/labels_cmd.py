"""`stock labels`: a PDF sheet of bin labels with the decoded facts, the fit-for mark and a QR code."""

from __future__ import annotations

import json
from pathlib import Path
from typing import Annotated

import typer

from stock.cli.context import state
from stock.labels.layouts import DEFAULT_LAYOUT, LAYOUTS

LABELS_HELP = f"""Write a PDF of bin labels, one per bin, laid out on label sheets.

Each label shows the value (large), tolerance, voltage (AC/DC), dielectric with its tempco or
change window, safety class, which lead is marked, the bin and its location, the fit-for mark
(TU tuned, TI timing, SI signal, BY bypass, BU bulk, MA mains: filled = fit, outlined = marginal,
dashed = unknown, grey = unfit), "needs a look" where flags are open, and a QR code a scanner
reads back into `stock show` or `stock kit pull --scan`.

BIN... names bins (id, key, location, label or a scanned code); without them every bin with a
part gets a label. --flagged and --changed-since narrow the choice.

Layouts (--layout): {", ".join(LAYOUTS)}; the default is {DEFAULT_LAYOUT["a4"]} on A4 and
{DEFAULT_LAYOUT["letter"]} on --paper letter. Or --size WxH in mm with --grid CxR (as many
as fit without it) and --gap XxY. --margins TOP,LEFT moves the grid (to correct a printer's offset).

Examples:

    stock labels drawer-a.pdf A1 A2 A11

    stock labels relabel.pdf --changed-since 2026-11-30 --layout a4-5x13-38x21

    stock labels odd.pdf --paper letter --size 60x30 --grid 3x8 --margins 12,8 --skip 4
"""


def register(app: typer.Typer) -> None:
    @app.command("labels", help=LABELS_HELP)
    def labels_command(
        ctx: typer.Context,
        out: Annotated[Path, typer.Argument(metavar="OUT.pdf", help="The PDF file to write.")],
        bins: Annotated[list[str] | None, typer.Argument(metavar="BIN", help="Bins to label (default: all).")] = None,
        flagged: Annotated[bool, typer.Option("--flagged", help="Only bins with open flags.")] = False,
        changed_since: Annotated[str | None, typer.Option("--changed-since", metavar="DATE",
                                                          help="Only bins changed since DATE (UTC), e.g. 2026-11-30.")] = None,
        layout: Annotated[str | None, typer.Option("--layout", help="A named sheet layout (see above).")] = None,
        paper: Annotated[str | None, typer.Option("--paper", help="a4 or letter.")] = None,
        size: Annotated[str | None, typer.Option("--size", metavar="WxH", help="Custom label size in mm, e.g. 70x37.")] = None,
        grid: Annotated[str | None, typer.Option("--grid", metavar="CxR", help="Columns x rows of custom labels.")] = None,
        gap: Annotated[str | None, typer.Option("--gap", metavar="XxY", help="Gaps between custom labels in mm.")] = None,
        margins: Annotated[str | None, typer.Option("--margins", metavar="TOP,LEFT",
                                                    help="Page margins to the first label, in mm.")] = None,
        skip: Annotated[int, typer.Option("--skip", help="Label positions already used on the first sheet.")] = 0,
        frames: Annotated[bool, typer.Option("--frames", help="Draw each label's outline (for plain paper).")] = False,
        as_json: Annotated[bool, typer.Option("--json", help="Print what was written as JSON.")] = False,
    ) -> None:
        from stock.labels import make_labels
        from stock.store.database import open_store

        with open_store(state(ctx).db_path, create=False) as store:
            sheet = make_labels(store, out, bins or (), flagged=flagged, changed_since=changed_since,
                                paper=paper, layout=layout, size=size, grid=grid, gap=gap,
                                margins=margins, skip=skip, frames=frames)
        if as_json:
            typer.echo(json.dumps(sheet.to_json(), ensure_ascii=False, indent=2))
            return
        typer.echo(f"wrote {out} ({len(sheet.labels)} labels on {sheet.pages} page"
                   f"{'s' if sheet.pages != 1 else ''}, {sheet.layout.describe()})")
        flagged_count = sum(1 for f in sheet.labels if f.look)
        if flagged_count:
            typer.echo(f"{flagged_count} labels say 'needs a look' (open flags: `stock flags`)")
        if sheet.trims:
            counts = ", ".join(f"{name} on {n}" for name, n in sheet.trim_counts().items())
            typer.echo(f"to fit, {len(sheet.trims)} labels leave out or shorten a line ({counts});"
                       " a larger --layout shows everything (--json lists them)", err=True)
