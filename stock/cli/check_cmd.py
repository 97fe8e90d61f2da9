"""`stock check`: verify a database and say what is wrong in words."""

from __future__ import annotations

import json
from typing import Annotated

import typer

from stock.cli.context import state


def register(app: typer.Typer) -> None:
    @app.command("check")
    def check(
        ctx: typer.Context,
        as_json: Annotated[bool, typer.Option("--json", help="Print one JSON object.")] = False,
    ) -> None:
        """Verify the database: integrity, ledger sums against on-hand, no orphan rows.

        Example: stock --db shop.db check
        """
        # the store loads only when the command runs (start-up time)
        from stock.store.database import open_store
        from stock.store.integrity import check_store

        with open_store(state(ctx).db_path, create=False) as store:
            report = check_store(store)
        if as_json:
            typer.echo(json.dumps(report.to_json()))
        elif report.ok:
            typer.echo(f"ok: {report.checked.get('bins', 0)} bins,"
                       f" {report.checked.get('ledger', 0)} ledger movements agree")
        else:
            for problem in report.problems:
                typer.echo(f"problem: {problem}")
        if not report.ok:
            raise typer.Exit(code=1)
