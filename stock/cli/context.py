"""The options every command shares (``--db``), read by the command modules."""

from __future__ import annotations

import os
from dataclasses import dataclass
from pathlib import Path

import typer


@dataclass
class CliState:
    """Options shared by every command."""

    db_path: Path


def state(ctx: typer.Context) -> CliState:
    """The shared options of the running command (``--db``)."""
    root = ctx.find_root()
    if isinstance(root.obj, CliState):
        return root.obj
    return CliState(db_path=Path(os.environ.get("STOCK_DB", "stock.db")))


__all__ = ["CliState", "state"]
