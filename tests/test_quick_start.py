"""The README's Quick start is exactly two commands, and CI runs the second one verbatim.

No decoded value or physics is checked here, so no standard applies: the rule is the project's own,
in DEVELOPERS.md (common practice, no published source).
"""

from __future__ import annotations

import re
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def _quick_start_commands() -> list[str]:
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    section = text.split("## Quick start", 1)[1].split("\n## ", 1)[0]
    block = re.search(r"```bash\n(.*?)```", section, re.S)
    assert block, "the Quick start has a bash block"
    return [line for line in block[1].splitlines() if line.strip()]


def test_the_quick_start_is_two_commands_each_in_a_virtual_environment():
    commands = _quick_start_commands()
    assert len(commands) == 2
    for command in commands:
        assert command.startswith("python3 -m venv .venv && ")    # PEP 668: never the system site
    assert commands[0].endswith("stock demo")
    assert "pytest" in commands[1] and "[test]" in commands[1]


def test_ci_runs_the_second_quick_start_command_verbatim():
    ci = (ROOT / ".ci" / "run").read_text(encoding="utf-8").splitlines()
    assert _quick_start_commands()[1] in ci
