"""The `stock` command: a thin shell over the library, one file per command group.

Each command module exposes ``register(app)`` and is listed in :data:`COMMAND_MODULES`; the
library does the work, the command formats and prints. Command modules read the shared options
through :mod:`stock.cli.context`, never from this module, so nothing imports back up. :class:`_Boundary` turns every
:class:`~stock.errors.StockError` into one line on stderr and its exit code.
"""

from __future__ import annotations

import importlib
from pathlib import Path
from typing import Annotated

import typer
from typer.core import TyperGroup

from stock.cli.context import CliState
from stock.errors import StockError

# Command modules in the order their commands appear in `stock --help`.
COMMAND_MODULES: tuple[str, ...] = (
    "stock.cli.demo_cmd",
    "stock.cli.decode_cmd",
    "stock.cli.import_cmd",
    "stock.cli.bins_cmd",
    "stock.cli.flags_cmd",
    "stock.cli.grade_cmd",
    "stock.cli.find_cmd",
    "stock.cli.replace_cmd",
    "stock.cli.compensate_cmd",
    "stock.cli.kit_cmd",
    "stock.cli.export_cmd",
    "stock.cli.labels_cmd",
    "stock.cli.check_cmd",
)


class _Boundary(TyperGroup):
    """The one place a user error becomes a message and an exit code, never a traceback."""

    def invoke(self, ctx):  # type: ignore[override]
        try:
            return super().invoke(ctx)
        except StockError as exc:
            typer.echo(f"stock: {exc}", err=True)
            raise typer.Exit(code=exc.exit_code) from None


app = typer.Typer(
    cls=_Boundary,
    no_args_is_help=True,
    add_completion=False,
    pretty_exceptions_show_locals=False,
    help="Capacitor bins: decode markings, grade parts for the job, find, kit and export.",
)


@app.callback()
def _global_options(
    ctx: typer.Context,
    db: Annotated[Path, typer.Option("--db", envvar="STOCK_DB",
                                     help="The stock database file (SQLite).")] = Path("stock.db"),
) -> None:
    ctx.obj = CliState(db_path=db)


for _name in COMMAND_MODULES:
    importlib.import_module(_name).register(app)


def main() -> None:
    """Console-script entry point."""
    app()
