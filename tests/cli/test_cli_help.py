"""Every command and sub-command has help with a real example.

Source: this project's own style rule (common practice for command-line tools, no published source).
"""

from __future__ import annotations

import pytest
import typer
from typer.testing import CliRunner

from stock.cli import app

ENV = {"COLUMNS": "200", "TERMINAL_WIDTH": "200", "_TYPER_FORCE_DISABLE_TERMINAL": "1", "NO_COLOR": "1"}


def _commands(group, prefix=()):
    for name, command in sorted(group.commands.items()):
        path = prefix + (name,)
        if hasattr(command, "commands"):
            yield from _commands(command, path)
        else:
            yield path


COMMANDS = list(_commands(typer.main.get_command(app)))


def test_the_command_tree_has_the_promised_commands():
    names = {" ".join(c) for c in COMMANDS}
    assert {"decode", "import", "bins", "show", "quarantine", "flags", "settle", "merge", "grade",
            "drift", "compensate", "find", "kit plan", "kit pull", "kit undo", "kit drop", "kit picklist",
            "export purchasing", "export inventory", "export count", "check", "demo", "labels"} <= names


@pytest.mark.parametrize("command", COMMANDS, ids=[" ".join(c) for c in COMMANDS])
def test_every_command_has_help_with_an_example(command):
    result = CliRunner().invoke(app, [*command, "--help"], env=ENV)
    assert result.exit_code == 0, result.output
    assert "stock " in result.stdout.split("Usage:", 1)[-1], "help shows an example `stock …` line"
    assert "xample" in result.stdout, f"`stock {' '.join(command)} --help` gives an example"


def test_a_stock_error_is_one_line_on_stderr_with_exit_code_1(tmp_path):
    result = CliRunner().invoke(app, ["--db", str(tmp_path / "none.db"), "bins"], env=ENV)
    assert result.exit_code == 1
    assert result.stderr.strip().count("\n") == 0
    assert result.stderr.startswith("stock: ") and "no stock database here" in result.stderr
