"""The shared --db option: given on the command line, else STOCK_DB, else stock.db in the folder."""

from __future__ import annotations

from pathlib import Path

import click
import typer

from stock.cli.context import CliState, state


def _ctx(obj=None):
    ctx = typer.Context(click.Command("stock"))
    ctx.obj = obj
    return ctx


def test_the_state_set_by_the_root_command_is_returned():
    given = CliState(db_path=Path("/shop/parts.db"))
    root = _ctx(given)
    child = typer.Context(click.Command("check"), parent=root)
    assert state(child) is given


def test_without_a_root_state_the_environment_names_the_database(monkeypatch):
    monkeypatch.setenv("STOCK_DB", "/bench/other.db")
    assert state(_ctx()).db_path == Path("/bench/other.db")


def test_without_state_or_environment_the_database_is_stock_db(monkeypatch):
    monkeypatch.delenv("STOCK_DB", raising=False)
    assert state(_ctx()).db_path == Path("stock.db")


def test_an_unrelated_object_on_the_context_is_not_taken_for_the_state(monkeypatch):
    monkeypatch.delenv("STOCK_DB", raising=False)
    assert state(_ctx({"db": "x"})).db_path == Path("stock.db")
