"""The house plan holds: the import-linter contracts in pyproject.toml pass, and they do catch an
upward import (shown on a copy of the source tree with one bad import added).

No decoded value or physics is checked here, so no standard applies: the layers are the
project's own plan in DEVELOPERS.md (common practice, no published source).
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]

pytest.importorskip("importlinter")


def _lint(tree: Path) -> subprocess.CompletedProcess[str]:
    env = dict(os.environ, PYTHONPATH=str(tree))
    return subprocess.run([sys.executable, "-c", "from importlinter.cli import lint_imports_command;"
                           " lint_imports_command()", "--no-cache", str(tree / "pyproject.toml")],
                          cwd=tree, env=env, capture_output=True, text=True, timeout=120)


def _copy_tree(dest: Path) -> Path:
    for name in ("stock", "importers"):
        shutil.copytree(ROOT / name, dest / name, ignore=shutil.ignore_patterns("__pycache__"))
    shutil.copy(ROOT / "pyproject.toml", dest / "pyproject.toml")
    return dest


def test_every_layer_contract_is_kept():
    result = _lint(ROOT)
    assert result.returncode == 0, result.stdout + result.stderr
    assert "0 broken" in result.stdout


@pytest.mark.parametrize("module, upward", [
    pytest.param("stock/markings/value_codes.py", "import stock.store.database", id="decoder-imports-store"),
    pytest.param("stock/store/database.py", "import stock.physics.grading", id="store-imports-physics"),
    pytest.param("importers/csv_sheet.py", "import stock.markings.decoder", id="reader-imports-decoder"),
    pytest.param("stock/inventory/bins.py", "import stock.inventory.intake", id="bins-imports-intake"),
])
def test_an_upward_import_breaks_a_contract(tmp_path, module, upward):
    tree = _copy_tree(tmp_path)
    path = tree / module
    path.write_text(path.read_text() + f"\n{upward}  # added by the test\n")
    result = _lint(tree)
    assert result.returncode != 0
    assert "BROKEN" in result.stdout
    assert upward.split()[-1] in result.stdout or upward.split()[-1].rsplit(".", 1)[0] in result.stdout
