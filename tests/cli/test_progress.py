"""The progress line: drawn only on a terminal, never in --json, only for work that takes a while."""

from __future__ import annotations

import io

from stock.cli import progress as progress_module
from stock.cli.progress import RowProgress


def test_quick_work_draws_nothing_and_never_loads_rich(monkeypatch):
    opened = []
    monkeypatch.setattr(RowProgress, "_open", lambda self: opened.append(self))
    with RowProgress("importing bins.csv") as p:
        p(1000)
    assert opened == []


def test_json_mode_never_draws_even_for_long_work(monkeypatch):
    opened = []
    monkeypatch.setattr(RowProgress, "_open", lambda self: opened.append(self))
    monkeypatch.setattr(progress_module, "DELAY_S", 0.0)
    with RowProgress("importing bins.csv", quiet=True) as p:
        p(1000)
    assert opened == []


def test_long_work_off_a_terminal_stays_silent(monkeypatch, capsys):
    monkeypatch.setattr(progress_module, "DELAY_S", 0.0)
    with RowProgress("importing bins.csv") as p:
        p(1000)
        p(2000)
        assert p.quiet      # stderr here is captured, not a terminal: it gave up drawing
    assert capsys.readouterr().err == ""


def test_long_work_on_a_terminal_draws_the_rows_done(monkeypatch):
    monkeypatch.setattr(progress_module, "DELAY_S", 0.0)
    screen = io.StringIO()
    import rich.console

    real = rich.console.Console
    monkeypatch.setattr(rich.console, "Console",
                        lambda **kw: real(file=screen, force_terminal=True, width=80))
    with RowProgress("importing bins.csv") as p:
        p(12_000)
        p._bar.refresh()
    assert "importing bins.csv" in screen.getvalue() and "12,000 rows" in screen.getvalue()
