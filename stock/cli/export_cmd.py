"""`stock export …`: purchasing list, inventory workbook, stock-take sheet."""

from __future__ import annotations

import json
from decimal import Decimal
from pathlib import Path
from typing import Annotated

import typer


export_app = typer.Typer(help="Write spreadsheets: what to order, what is on hand, a stock-take sheet.",
                         no_args_is_help=True)


def _store(ctx: typer.Context):
    from stock.cli.context import state

    from stock.store.database import open_store   # the store loads only when a command runs

    return open_store(state(ctx).db_path, create=False)


def _report(as_json: bool, what: str, out: Path, rows: int) -> None:
    if as_json:
        typer.echo(json.dumps({"export": what, "path": str(out), "rows": rows}))
    else:
        typer.echo(f"wrote {out} ({rows} row{'' if rows == 1 else 's'})")


@export_app.command("purchasing")
def purchasing(
    ctx: typer.Context,
    out: Annotated[Path, typer.Argument(help="OUT.xlsx or OUT.csv")],
    plan: Annotated[list[int], typer.Option("--plan", help="Only these plans' shortfalls (repeatable).")] = [],
    below_minimum: Annotated[bool, typer.Option("--below-minimum",
                                                help="Also bins under their minimum.")] = False,
    spare: Annotated[str, typer.Option("--spare", help="Spare margin added, rounded up.")] = "10%",
    as_json: Annotated[bool, typer.Option("--json")] = False,
) -> None:
    """A row per thing to order, written as a distributor's search needs it.

    Example: stock export purchasing order.xlsx --plan 3 --below-minimum
    """
    from stock.sheets_out.exports import export_purchasing
    from stock.units import parse_percent

    spare_pct = parse_percent(spare, "--spare")
    with _store(ctx) as store:
        rows = export_purchasing(store, out, plan, below_minimum, Decimal(spare_pct))
    _report(as_json, "purchasing", out, rows)


@export_app.command("inventory")
def inventory(
    ctx: typer.Context,
    out: Annotated[Path, typer.Argument(help="OUT.xlsx or OUT.csv")],
    as_json: Annotated[bool, typer.Option("--json")] = False,
) -> None:
    """Every bin with its decoded facts, grades per application, quantity and open flags.

    The XLSX adds a sheet charting how far each dielectric on hand may move with temperature.

    Example: stock export inventory shelves.xlsx
    """
    from stock.sheets_out.exports import export_inventory

    with _store(ctx) as store:
        rows = export_inventory(store, out)
    _report(as_json, "inventory", out, rows)


@export_app.command("count")
def count(
    ctx: typer.Context,
    out: Annotated[Path, typer.Argument(help="OUT.xlsx")],
    as_json: Annotated[bool, typer.Option("--json")] = False,
) -> None:
    """A stock-take sheet in location order with an empty Counted column; import it back when filled.

    Example: stock export count take.xlsx   (fill it in, then: stock import take.xlsx)
    """
    from stock.errors import BadValue
    from stock.sheets_out.count_sheet import export_count_sheet

    if out.suffix.lower() != ".xlsx":
        raise BadValue("output file", str(out), "a name ending in .xlsx (the sheet carries validation)")
    with _store(ctx) as store:
        rows = export_count_sheet(store, out)
    _report(as_json, "count", out, rows)


def register(app: typer.Typer) -> None:
    app.add_typer(export_app, name="export")
