"""`stock demo`: the whole job on the demo shop in one command."""

from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path
from typing import Annotated

import typer


def register(app: typer.Typer) -> None:
    @app.command("demo")
    def demo(
        out: Annotated[Path | None, typer.Option(
            "--dir", help="Folder to create for the demo database and workbooks"
                          " (default: a new stock-demo folder here).")] = None,
    ) -> None:
        """Run the whole job on a fictional shop: import, flags, grades, find, kits, pull, exports.

        Example: stock demo --dir /tmp/lantern
        """
        from stock.demo import fresh_folder, run_demo

        def run(args: Sequence[str]) -> int:
            command = typer.main.get_command(app)
            try:
                result = command.main(list(args), prog_name="stock", standalone_mode=False)
            except typer.Exit as done:
                return done.exit_code
            return int(result or 0)

        folder = out if out is not None else fresh_folder(Path.cwd())
        failed = run_demo(folder, typer.echo, run)
        if failed:
            typer.echo(f"{failed} step(s) of the demo failed", err=True)
            raise typer.Exit(code=1)
