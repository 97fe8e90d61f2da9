"""The README's tour is real output: every ```console block is run and compared line by line.

Regenerate the blocks after a change in output with ``python -m tests.test_readme --write``.
Source: the demo shop in demo_inventory/ (invented for the demo); the application table and
derating rules checked here against stock/applications.py and stock/stability.py (common
practice of the trade, no published source, as the README says).
"""

from __future__ import annotations

import os
import re
import shlex
import shutil
import sys
from pathlib import Path

import pytest
from typer.testing import CliRunner

from stock.cli import app

ROOT = Path(__file__).resolve().parent.parent
README = ROOT / "README.md"
BLOCK = re.compile(r"```console\n(.*?)```", re.DOTALL)
ENV = {"COLUMNS": "120", "TERMINAL_WIDTH": "120", "_TYPER_FORCE_DISABLE_TERMINAL": "1", "NO_COLOR": "1"}


def _blocks(text: str) -> list[list[tuple[str, list[str]]]]:
    """Each console block as (command, expected output lines) pairs."""
    blocks = []
    for match in BLOCK.finditer(text):
        steps: list[tuple[str, list[str]]] = []
        for line in match.group(1).splitlines():
            if line.startswith("$ "):
                steps.append((line[2:], []))
            elif steps:
                steps[-1][1].append(line)
        blocks.append(steps)
    return blocks


def _run_all(workdir: Path) -> list[list[tuple[str, list[str]]]]:
    """Run every block's commands in order in ``workdir``; returns the actual output."""
    shutil.copytree(ROOT / "demo_inventory", workdir / "demo_inventory")
    runner = CliRunner()
    actual = []
    old = Path.cwd()
    os.chdir(workdir)
    try:
        for steps in _blocks(README.read_text(encoding="utf-8")):
            done = []
            for command, _ in steps:
                words = shlex.split(command)
                assert words[0] == "stock", f"README console lines run `stock`, not {words[0]!r}"
                result = runner.invoke(app, words[1:], env=ENV)
                done.append((command, result.stdout.rstrip("\n").splitlines()))
            actual.append(done)
    finally:
        os.chdir(old)
    return actual


def test_every_readme_console_block_shows_real_output(tmp_path):
    expected = _blocks(README.read_text(encoding="utf-8"))
    assert expected, "the README has a tour"
    for want, got in zip(expected, _run_all(tmp_path)):
        for (command, want_lines), (_, got_lines) in zip(want, got):
            assert [w.rstrip() for w in want_lines] == [g.rstrip() for g in got_lines], command


def test_the_readme_application_table_matches_the_grading_table():
    from stock.physics.applications import DEFAULT_TABLE

    text = README.read_text(encoding="utf-8")
    for name, row in DEFAULT_TABLE.items():
        line = next((l for l in text.splitlines() if l.startswith(f"| `{name}` |")), None)
        assert line, f"README application table lacks {name}"
        cells = [c.strip() for c in line.strip("|").split("|")]
        assert cells[2] == f"{row['drift_fit_pct']} / {row['drift_marginal_pct']}", name
        assert cells[3] == f"{row['total_fit_pct']} / {row['total_marginal_pct']}", name


def _write() -> None:
    import tempfile

    text = README.read_text(encoding="utf-8")
    with tempfile.TemporaryDirectory() as tmp:
        actual = iter(_run_all(Path(tmp)))

        def fill(match: re.Match) -> str:
            steps = next(actual)
            body = "".join(f"$ {cmd}\n" + "".join(f"{line}\n" for line in lines) for cmd, lines in steps)
            return f"```console\n{body}```"

        README.write_text(BLOCK.sub(fill, text), encoding="utf-8")


if __name__ == "__main__":
    if "--write" in sys.argv:
        _write()
        print(f"rewrote the console blocks of {README}")
    else:
        sys.exit(pytest.main([__file__, "-q"]))
