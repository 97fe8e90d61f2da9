"""``python -m tests.bench [--quick] [--only NAMES] [--work DIR]``: run the benchmarks.

Prints one JSON object per line. ``--quick`` uses small sizes (CI smoke run, well under a minute).
"""

from __future__ import annotations

import argparse
import shutil
import sys
import tempfile
from pathlib import Path

from tests.bench import imports, queries
from tests.bench.timing import emit

FULL = {"memory": 100_000, "csv_import": 100_000, "xlsx_import": 50_000, "wide_import": 10_000,
        "find": 1_000_000, "pairs": (5_000, 20_000, 80_000)}
QUICK = {"memory": 5_000, "csv_import": 5_000, "xlsx_import": 2_000, "wide_import": 1_000,
         "find": 20_000, "pairs": (1_000, 4_000)}
ORDER = ("memory", "csv_import", "xlsx_import", "wide_import", "find", "pairs")  # memory first: see imports.memory


def run(names: list[str], sizes: dict, work: Path, repeats: int, quick: bool) -> None:
    for name in names:
        if name == "memory":
            emit(imports.memory(sizes[name], work))
        elif name == "csv_import":
            emit(imports.csv_import(sizes[name], work, repeats))
        elif name == "xlsx_import":
            emit(imports.xlsx_import(sizes[name], work, repeats))
        elif name == "wide_import":
            emit(imports.wide_import(sizes[name], work, repeats))
        elif name == "find":
            emit(queries.find(sizes[name], work, queries=200))
        elif name == "pairs":
            for result in queries.pairs(sizes[name], work, searches=30 if quick else 100):
                emit(result)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="python -m tests.bench", description=__doc__)
    parser.add_argument("--quick", action="store_true", help="small sizes (a smoke run for CI)")
    parser.add_argument("--only", default=",".join(ORDER),
                        help=f"comma-separated benchmarks to run, of {', '.join(ORDER)}")
    parser.add_argument("--repeats", type=int, default=None,
                        help="interleaved runs per import benchmark (default 3; 1 with --quick)")
    parser.add_argument("--work", type=Path, default=None, help="folder for generated files (kept)")
    args = parser.parse_args(argv)
    names = [n.strip() for n in args.only.split(",") if n.strip()]
    unknown = [n for n in names if n not in ORDER]
    if unknown:
        parser.error(f"unknown benchmark {unknown[0]!r}; choose from {', '.join(ORDER)}")
    names = [n for n in ORDER if n in names]
    repeats = args.repeats or (1 if args.quick else 3)
    work = args.work or Path(tempfile.mkdtemp(prefix="stock-bench-"))
    work.mkdir(parents=True, exist_ok=True)
    try:
        run(names, QUICK if args.quick else FULL, work, repeats, args.quick)
    finally:
        if args.work is None:
            shutil.rmtree(work, ignore_errors=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
